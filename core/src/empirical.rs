//! The published empirical resistivity <-> dopant-density conversion for boron- and
//! phosphorus-doped silicon at 23 C (Thurber et al., NBS; standardised as ASTM F723).
//!
//! # Public API
//! - [`EMPIRICAL_TEMPERATURE_K`]: 296.15 K, the temperature of the relations.
//! - [`EmpiricalRelation`]: the boron and the phosphorus pair of equations;
//!   [`EmpiricalRelation::for_dopant`] picks one for a material and dopant (As and Sb use the
//!   phosphorus relation, as the standard suggests, with a note);
//!   [`EmpiricalRelation::valid_range`] gives the stated range as an [`EmpiricalRange`].
//! - [`density_from_resistivity_cm3`] and [`resistivity_from_density_ohm_cm`]: the two
//!   directions, checked against the stated range.
//! - [`convert`] with an [`EmpiricalInput`]: either direction for a material and dopant, as an
//!   [`EmpiricalConversion`] carrying the relation, the temperature and the notes.
//! - [`EmpiricalError`]: out-of-range and inapplicable inputs; nothing is extrapolated.

use std::fmt;

use serde::Serialize;

use crate::mobility::ConductivityType;

/// Temperature at which the relations hold: 23 C, K.
pub const EMPIRICAL_TEMPERATURE_K: f64 = 296.15;

/// Citation of the relations.
pub const EMPIRICAL_REFERENCE: &str = "Thurber, Mattis, Liu, Filliben, J. Electrochem. Soc. 127, \
     1807 (phosphorus) and 2291 (boron) (1980) (pages from memory); NBS Special Publication 400-64 \
     (1981); standardised as ASTM F723 (now SEMI MF723)";

/// Stated resistivity range of the boron relations, ohm cm.
const BORON_RESISTIVITY_RANGE_OHM_CM: (f64, f64) = (1e-4, 1e4);
/// Stated resistivity range of the phosphorus relations, ohm cm.
const PHOSPHORUS_RESISTIVITY_RANGE_OHM_CM: (f64, f64) = (2e-4, 4000.0);
/// Density above which the phosphorus relations break down, cm^-3.
const PHOSPHORUS_DENSITY_LIMIT_CM3: f64 = 5e20;

/// One of the two published pairs of equations.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum EmpiricalRelation {
    /// Boron-doped (p-type) silicon.
    Boron,
    /// Phosphorus-doped (n-type) silicon; also suggested for As and Sb.
    Phosphorus,
}

/// The stated valid range of one relation, in both variables.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct EmpiricalRange {
    /// Lowest resistivity, ohm cm (stated).
    pub resistivity_min_ohm_cm: f64,
    /// Highest resistivity, ohm cm (stated).
    pub resistivity_max_ohm_cm: f64,
    /// Lowest density, cm^-3: where the density -> resistivity equation reaches the highest
    /// stated resistivity (computed).
    pub density_min_cm3: f64,
    /// Highest density, cm^-3: where the density -> resistivity equation reaches the lowest
    /// stated resistivity (computed), or 5e20 for phosphorus (stated breakdown).
    pub density_max_cm3: f64,
}

impl EmpiricalRelation {
    /// The relation for `material_id` doped with `dopant_symbol` (both case-insensitive), and a
    /// note when it is used for a species it was not measured on.
    ///
    /// # Errors
    /// [`EmpiricalError::NotApplicable`] for any material other than silicon, and for dopants
    /// other than B, P, As and Sb.
    pub fn for_dopant(
        material_id: &str,
        dopant_symbol: &str,
    ) -> Result<(EmpiricalRelation, Option<&'static str>), EmpiricalError> {
        let dopant = dopant_symbol.trim();
        if material_id.trim().eq_ignore_ascii_case("si") {
            if dopant.eq_ignore_ascii_case("b") {
                return Ok((EmpiricalRelation::Boron, None));
            }
            if dopant.eq_ignore_ascii_case("p") {
                return Ok((EmpiricalRelation::Phosphorus, None));
            }
            if dopant.eq_ignore_ascii_case("as") || dopant.eq_ignore_ascii_case("sb") {
                return Ok((
                    EmpiricalRelation::Phosphorus,
                    Some(
                        "phosphorus relation used for As/Sb, as the standard suggests (not near \
                         solid solubility)",
                    ),
                ));
            }
        }
        Err(EmpiricalError::NotApplicable {
            material_id: material_id.to_string(),
            dopant: dopant_symbol.to_string(),
        })
    }

    /// Whether [`EmpiricalRelation::for_dopant`] succeeds.
    pub fn applicable(material_id: &str, dopant_symbol: &str) -> bool {
        EmpiricalRelation::for_dopant(material_id, dopant_symbol).is_ok()
    }

    /// Stable id.
    pub fn id(self) -> &'static str {
        match self {
            EmpiricalRelation::Boron => "boron",
            EmpiricalRelation::Phosphorus => "phosphorus",
        }
    }

    /// n for phosphorus, p for boron.
    pub fn conductivity_type(self) -> ConductivityType {
        match self {
            EmpiricalRelation::Boron => ConductivityType::P,
            EmpiricalRelation::Phosphorus => ConductivityType::N,
        }
    }

    /// The stated valid range, with the corresponding density limits.
    ///
    /// The density limits come from the density -> resistivity equation. Because the two
    /// equations of a pair agree only to 3 % (boron) or 4.5 % (phosphorus), a resistivity within
    /// that margin of a range end can give a density just outside the density range, which then
    /// does not convert back; both directions report it rather than extrapolate.
    ///
    /// # References
    /// Resistivity limits and the phosphorus breakdown above 5e20 cm^-3: ASTM F723 scope, after
    /// Thurber et al. (1980, 1981). The density limits are computed here from the
    /// density -> resistivity equation (about 1.3e12 to 1.2e21 cm^-3 for boron,
    /// 1.0e12 to 5e20 cm^-3 for phosphorus).
    pub fn valid_range(self) -> EmpiricalRange {
        let (rho_min, rho_max) = self.resistivity_range();
        let density_min = self.density_at_resistivity(rho_max);
        let density_max = match self {
            EmpiricalRelation::Boron => self.density_at_resistivity(rho_min),
            EmpiricalRelation::Phosphorus => PHOSPHORUS_DENSITY_LIMIT_CM3,
        };
        EmpiricalRange {
            resistivity_min_ohm_cm: rho_min,
            resistivity_max_ohm_cm: rho_max,
            density_min_cm3: density_min,
            density_max_cm3: density_max,
        }
    }

    fn resistivity_range(self) -> (f64, f64) {
        match self {
            EmpiricalRelation::Boron => BORON_RESISTIVITY_RANGE_OHM_CM,
            EmpiricalRelation::Phosphorus => PHOSPHORUS_RESISTIVITY_RANGE_OHM_CM,
        }
    }

    /// Solves rho(N) = `resistivity_ohm_cm` with the density -> resistivity equation by
    /// bisection in log10 N (the equation decreases monotonically over 1e10..1e22 for boron and
    /// 1e10..1e21 for phosphorus).
    fn density_at_resistivity(self, resistivity_ohm_cm: f64) -> f64 {
        let (mut lo, mut hi) = match self {
            EmpiricalRelation::Boron => (10.0_f64, 22.0_f64),
            EmpiricalRelation::Phosphorus => (10.0_f64, 21.0_f64),
        };
        let target = resistivity_ohm_cm.ln();
        for _ in 0..100 {
            let mid = 0.5 * (lo + hi);
            if self.raw_resistivity(10f64.powf(mid)).ln() > target {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        10f64.powf(0.5 * (lo + hi))
    }

    fn raw_density(self, rho: f64) -> f64 {
        match self {
            EmpiricalRelation::Boron => boron_density(rho),
            EmpiricalRelation::Phosphorus => phosphorus_density(rho),
        }
    }

    fn raw_resistivity(self, n: f64) -> f64 {
        match self {
            EmpiricalRelation::Boron => boron_resistivity(n),
            EmpiricalRelation::Phosphorus => phosphorus_resistivity(n),
        }
    }
}

impl fmt::Display for EmpiricalRelation {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.id())
    }
}

/// Why the empirical conversion gives no answer.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum EmpiricalError {
    /// Not silicon, or a dopant without a relation.
    NotApplicable {
        /// Material id given.
        material_id: String,
        /// Dopant symbol given.
        dopant: String,
    },
    /// Resistivity not finite or not > 0.
    InvalidResistivity {
        /// Value given, ohm cm.
        value_ohm_cm: f64,
    },
    /// Density not finite or not > 0.
    InvalidDensity {
        /// Value given, cm^-3.
        value_cm3: f64,
    },
    /// Resistivity outside the stated range.
    ResistivityOutOfRange {
        /// Relation.
        relation: EmpiricalRelation,
        /// Value given, ohm cm.
        value_ohm_cm: f64,
        /// The stated range.
        range: EmpiricalRange,
    },
    /// Density outside the range (or the resistivity maps to a density above the phosphorus
    /// breakdown limit).
    DensityOutOfRange {
        /// Relation.
        relation: EmpiricalRelation,
        /// The density given or reached, cm^-3.
        value_cm3: f64,
        /// The stated range.
        range: EmpiricalRange,
    },
}

impl fmt::Display for EmpiricalError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            EmpiricalError::NotApplicable {
                material_id,
                dopant,
            } => write!(
                f,
                "dopant: '{dopant}' in material '{material_id}' has no empirical (ASTM F723) \
                 relation; it covers silicon doped with B or P (P relation also used for As, Sb)"
            ),
            EmpiricalError::InvalidResistivity { value_ohm_cm } => write!(
                f,
                "resistivity_ohm_cm: {value_ohm_cm:e} is not allowed; give a finite value > 0 ohm cm"
            ),
            EmpiricalError::InvalidDensity { value_cm3 } => write!(
                f,
                "density_cm3: {value_cm3:e} is not allowed; give a finite value > 0 cm^-3"
            ),
            EmpiricalError::ResistivityOutOfRange {
                relation,
                value_ohm_cm,
                range,
            } => write!(
                f,
                "resistivity_ohm_cm: {value_ohm_cm:e} ohm cm is outside the {relation} relation \
                 (ASTM F723, 23 C); give {:e} to {:e} ohm cm",
                range.resistivity_min_ohm_cm, range.resistivity_max_ohm_cm
            ),
            EmpiricalError::DensityOutOfRange {
                relation,
                value_cm3,
                range,
            } => write!(
                f,
                "density_cm3: {value_cm3:.4e} cm^-3 is outside the {relation} relation (ASTM \
                 F723, 23 C); give {:.3e} to {:.3e} cm^-3{}",
                range.density_min_cm3,
                range.density_max_cm3,
                if *relation == EmpiricalRelation::Phosphorus {
                    " (the phosphorus relations break down above 5e20 cm^-3)"
                } else {
                    ""
                }
            ),
        }
    }
}

impl std::error::Error for EmpiricalError {}

/// Boron: N = 1.330e16/rho + 1.082e17 / (rho [1 + (54.56 rho)^1.105]).
fn boron_density(rho: f64) -> f64 {
    1.330e16 / rho + 1.082e17 / (rho * (1.0 + (54.56 * rho).powf(1.105)))
}

/// Boron: rho = 1.305e16/N + 1.133e17 / (N [1 + (2.58e-19 N)^-0.737]).
fn boron_resistivity(n: f64) -> f64 {
    1.305e16 / n + 1.133e17 / (n * (1.0 + (2.58e-19 * n).powf(-0.737)))
}

/// Ratio of two cubics in `x`: (a0 + a1 x + a2 x^2 + a3 x^3) / (1 + b1 x + b2 x^2 + b3 x^3).
fn rational_cubic(a: &[f64; 4], b: &[f64; 3], x: f64) -> f64 {
    let num = a[0] + x * (a[1] + x * (a[2] + x * a[3]));
    let den = 1.0 + x * (b[0] + x * (b[1] + x * b[2]));
    num / den
}

/// Phosphorus: N = (6.242e18/rho) 10^Z(log10 rho).
fn phosphorus_density(rho: f64) -> f64 {
    const A: [f64; 4] = [-3.1083, -3.2626, -1.2196, -0.13923];
    const B: [f64; 3] = [1.0265, 0.38755, 0.041833];
    6.242e18 / rho * 10f64.powf(rational_cubic(&A, &B, rho.log10()))
}

/// Phosphorus: rho = (6.242e18/N) 10^Z(log10 N - 16).
fn phosphorus_resistivity(n: f64) -> f64 {
    const A: [f64; 4] = [-3.0769, 2.2108, -0.62272, 0.057501];
    const B: [f64; 3] = [-0.68157, 0.19833, -0.018376];
    6.242e18 / n * 10f64.powf(rational_cubic(&A, &B, n.log10() - 16.0))
}

/// Dopant density from resistivity at 23 C, cm^-3.
///
/// # Formula
/// Boron: N = 1.330e16/rho + 1.082e17 / (rho [1 + (54.56 rho)^1.105]).
/// Phosphorus: N = (6.242e18/rho) 10^Z, x = log10 rho,
/// Z = (A0 + A1 x + A2 x^2 + A3 x^3)/(1 + B1 x + B2 x^2 + B3 x^3),
/// A = -3.1083, -3.2626, -1.2196, -0.13923; B = 1.0265, 0.38755, 0.041833.
/// rho in ohm cm, N in cm^-3.
///
/// # Validity
/// 23 C. Boron 1e-4 to 1e4 ohm cm; phosphorus 2e-4 to 4000 ohm cm and N <= 5e20 cm^-3. The
/// two directions are not exact inverses: the stated round-trip agreement in resistivity is
/// 3 % (boron) and 4.5 % (phosphorus).
///
/// # References
/// See [`EMPIRICAL_REFERENCE`] (coefficients as published in the standard; from memory,
/// checked against the handbook table of Hull (ed.), Properties of Crystalline Silicon,
/// EMIS Datareviews 20 (1999)).
///
/// # Errors
/// [`EmpiricalError::InvalidResistivity`], [`EmpiricalError::ResistivityOutOfRange`], and
/// [`EmpiricalError::DensityOutOfRange`] when phosphorus maps above 5e20 cm^-3.
pub fn density_from_resistivity_cm3(
    relation: EmpiricalRelation,
    resistivity_ohm_cm: f64,
) -> Result<f64, EmpiricalError> {
    if !(resistivity_ohm_cm.is_finite() && resistivity_ohm_cm > 0.0) {
        return Err(EmpiricalError::InvalidResistivity {
            value_ohm_cm: resistivity_ohm_cm,
        });
    }
    let (rho_min, rho_max) = relation.resistivity_range();
    if !(rho_min..=rho_max).contains(&resistivity_ohm_cm) {
        return Err(EmpiricalError::ResistivityOutOfRange {
            relation,
            value_ohm_cm: resistivity_ohm_cm,
            range: relation.valid_range(),
        });
    }
    let n = relation.raw_density(resistivity_ohm_cm);
    if relation == EmpiricalRelation::Phosphorus && n > PHOSPHORUS_DENSITY_LIMIT_CM3 {
        return Err(EmpiricalError::DensityOutOfRange {
            relation,
            value_cm3: n,
            range: relation.valid_range(),
        });
    }
    Ok(n)
}

/// Resistivity from dopant density at 23 C, ohm cm.
///
/// # Formula
/// Boron: rho = 1.305e16/N + 1.133e17 / (N [1 + (2.58e-19 N)^-0.737]).
/// Phosphorus: rho = (6.242e18/N) 10^Z, y = log10 N - 16,
/// Z = (A0 + A1 y + A2 y^2 + A3 y^3)/(1 + B1 y + B2 y^2 + B3 y^3),
/// A = -3.0769, 2.2108, -0.62272, 0.057501; B = -0.68157, 0.19833, -0.018376.
///
/// # Validity
/// 23 C; the density range of [`EmpiricalRelation::valid_range`]: the densities whose
/// resistivity lies in the stated resistivity range, and N <= 5e20 cm^-3 for phosphorus.
///
/// # References
/// See [`density_from_resistivity_cm3`].
///
/// # Errors
/// [`EmpiricalError::InvalidDensity`], [`EmpiricalError::DensityOutOfRange`].
pub fn resistivity_from_density_ohm_cm(
    relation: EmpiricalRelation,
    density_cm3: f64,
) -> Result<f64, EmpiricalError> {
    if !(density_cm3.is_finite() && density_cm3 > 0.0) {
        return Err(EmpiricalError::InvalidDensity {
            value_cm3: density_cm3,
        });
    }
    let out_of_range = || EmpiricalError::DensityOutOfRange {
        relation,
        value_cm3: density_cm3,
        range: relation.valid_range(),
    };
    if relation == EmpiricalRelation::Phosphorus && density_cm3 > PHOSPHORUS_DENSITY_LIMIT_CM3 {
        return Err(out_of_range());
    }
    // The equation decreases monotonically, so the density range is exactly the set of
    // densities whose resistivity lies in the stated resistivity range. Guard the far ends
    // first so the rational cubic is never evaluated where it turns over.
    if !(1e10..=1e22).contains(&density_cm3) {
        return Err(out_of_range());
    }
    let rho = relation.raw_resistivity(density_cm3);
    let (rho_min, rho_max) = relation.resistivity_range();
    if !(rho_min..=rho_max).contains(&rho) {
        return Err(out_of_range());
    }
    Ok(rho)
}

/// Input of [`convert`].
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum EmpiricalInput {
    /// Resistivity in ohm cm, converted to density.
    ResistivityOhmCm(f64),
    /// Density in cm^-3, converted to resistivity.
    DensityCm3(f64),
}

/// One empirical conversion with its context.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EmpiricalConversion {
    /// The relation used.
    pub relation: EmpiricalRelation,
    /// n or p.
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Dopant density, cm^-3 (given or computed).
    pub density_cm3: f64,
    /// Resistivity, ohm cm (given or computed).
    pub resistivity_ohm_cm: f64,
    /// Temperature of the relation: always 296.15 K.
    pub temperature_k: f64,
    /// Substitutions a reader must see.
    pub notes: Vec<String>,
}

/// Either direction for a material and dopant.
///
/// # Formula
/// [`density_from_resistivity_cm3`] or [`resistivity_from_density_ohm_cm`].
///
/// # Validity
/// Silicon at 23 C, the stated range of the relation; see [`EmpiricalRelation::for_dopant`]
/// for the dopants.
///
/// # References
/// See [`EMPIRICAL_REFERENCE`].
///
/// # Errors
/// Any [`EmpiricalError`].
pub fn convert(
    material_id: &str,
    dopant_symbol: &str,
    input: EmpiricalInput,
) -> Result<EmpiricalConversion, EmpiricalError> {
    let (relation, note) = EmpiricalRelation::for_dopant(material_id, dopant_symbol)?;
    let (density_cm3, resistivity_ohm_cm) = match input {
        EmpiricalInput::ResistivityOhmCm(rho) => {
            (density_from_resistivity_cm3(relation, rho)?, rho)
        }
        EmpiricalInput::DensityCm3(n) => (n, resistivity_from_density_ohm_cm(relation, n)?),
    };
    Ok(EmpiricalConversion {
        relation,
        conductivity_type: relation.conductivity_type(),
        density_cm3,
        resistivity_ohm_cm,
        temperature_k: EMPIRICAL_TEMPERATURE_K,
        notes: note.map(str::to_string).into_iter().collect(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn edges_are_inclusive_and_beyond_is_error() {
        assert!(density_from_resistivity_cm3(EmpiricalRelation::Boron, 1e4).is_ok());
        assert!(density_from_resistivity_cm3(EmpiricalRelation::Boron, 1e-4).is_ok());
        assert!(matches!(
            density_from_resistivity_cm3(EmpiricalRelation::Boron, 1.0001e4),
            Err(EmpiricalError::ResistivityOutOfRange { .. })
        ));
        // 2e-4 ohm cm maps above 5e20 cm^-3 with the phosphorus equation: refused.
        assert!(matches!(
            density_from_resistivity_cm3(EmpiricalRelation::Phosphorus, 2e-4),
            Err(EmpiricalError::DensityOutOfRange { .. })
        ));
        assert!(resistivity_from_density_ohm_cm(EmpiricalRelation::Phosphorus, 5e20).is_ok());
        assert!(resistivity_from_density_ohm_cm(EmpiricalRelation::Phosphorus, 5.01e20).is_err());
    }

    #[test]
    fn range_limits_are_consistent() {
        for relation in [EmpiricalRelation::Boron, EmpiricalRelation::Phosphorus] {
            let r = relation.valid_range();
            let rho_at_min = relation.raw_resistivity(r.density_min_cm3);
            approx::assert_relative_eq!(rho_at_min, r.resistivity_max_ohm_cm, max_relative = 1e-9);
            assert!(r.density_min_cm3 > 1e12 && r.density_min_cm3 < 2e12);
        }
    }

    #[test]
    fn bad_inputs_are_errors() {
        for bad in [0.0, -1.0, f64::NAN, f64::INFINITY] {
            assert!(density_from_resistivity_cm3(EmpiricalRelation::Boron, bad).is_err());
            assert!(resistivity_from_density_ohm_cm(EmpiricalRelation::Phosphorus, bad).is_err());
        }
        assert!(convert("ge", "B", EmpiricalInput::DensityCm3(1e16)).is_err());
        assert!(convert("si", "Ga", EmpiricalInput::DensityCm3(1e16)).is_err());
        let sb = convert("si", "sb", EmpiricalInput::DensityCm3(1e16)).unwrap();
        assert_eq!(sb.relation, EmpiricalRelation::Phosphorus);
        assert_eq!(sb.notes.len(), 1);
    }
}
