//! Low-field drift mobility of electrons and holes versus ionized-impurity density and temperature.
//!
//! # Public API
//! - [`Carrier`]: electron or hole; [`ConductivityType`]: n or p.
//! - [`MobilityModel`]: the models, with stable string ids (`"masetti"`, `"arora"`,
//!   `"caughey-thomas"`, `"lattice"`), [`MobilityModel::applicable`] and the validity ranges.
//! - [`MasettiParameters`] and [`masetti_cm2_per_v_s`]: Masetti et al. (1983), silicon, 300 K.
//! - [`AroraParameters`] and [`arora_cm2_per_v_s`]: Arora et al. (1982), silicon, with temperature.
//! - [`CaugheyThomasParameters`] and [`caughey_thomas_cm2_per_v_s`]: the Caughey-Thomas form with
//!   temperature exponents; parameter set for GaAs from Sotoodeh et al. (2000).
//! - [`LatticeParameters`] and [`lattice_cm2_per_v_s`]: phonon-limited mobility mu_L (T/300)^-gamma.
//! - [`mobility`]: both carriers for one model, material, dopant, density and temperature, as a
//!   [`CarrierMobilities`] that names the parameter sets used and every extension applied.
//! - [`MobilityError`]: what can go wrong, each message naming the field, the value and the range.
//!
//! Germanium has no mobility model here: no parameter set with a primary source was available
//! to this project, so every model reports [`MobilityError::NotApplicable`] for it.

use std::fmt;

use serde::{Deserialize, Serialize};

/// Reference temperature of every parameter set in this module, K.
pub const REFERENCE_TEMPERATURE_K: f64 = 300.0;

/// A charge carrier.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Carrier {
    /// Conduction-band electron.
    Electron,
    /// Valence-band hole.
    Hole,
}

impl fmt::Display for Carrier {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Carrier::Electron => "electrons",
            Carrier::Hole => "holes",
        })
    }
}

/// Conductivity type of a doped semiconductor: which carrier is in the majority.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum ConductivityType {
    /// Electrons in the majority (donor-doped); serialised as "n".
    #[serde(rename = "n")]
    N,
    /// Holes in the majority (acceptor-doped); serialised as "p".
    #[serde(rename = "p")]
    P,
}

impl ConductivityType {
    /// The majority carrier.
    pub fn majority(self) -> Carrier {
        match self {
            ConductivityType::N => Carrier::Electron,
            ConductivityType::P => Carrier::Hole,
        }
    }

    /// "n" or "p".
    pub fn as_str(self) -> &'static str {
        match self {
            ConductivityType::N => "n",
            ConductivityType::P => "p",
        }
    }
}

impl fmt::Display for ConductivityType {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.as_str())
    }
}

/// A low-field mobility model.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum MobilityModel {
    /// Masetti, Severi, Solmi (1983): silicon, dopant-specific sets (As, P for electrons; B for holes).
    Masetti,
    /// Arora, Hauser, Roulston (1982): silicon, density and temperature.
    Arora,
    /// Caughey-Thomas form with temperature exponents; GaAs set of Sotoodeh et al. (2000).
    CaugheyThomas,
    /// Phonon-limited (lattice-only) mobility, no impurity scattering.
    Lattice,
}

impl MobilityModel {
    /// Every model, in the order a comparison lists them.
    pub const ALL: [MobilityModel; 4] = [
        MobilityModel::Masetti,
        MobilityModel::Arora,
        MobilityModel::CaugheyThomas,
        MobilityModel::Lattice,
    ];

    /// Stable identifier for command lines, files and the UI.
    pub fn id(self) -> &'static str {
        match self {
            MobilityModel::Masetti => "masetti",
            MobilityModel::Arora => "arora",
            MobilityModel::CaugheyThomas => "caughey-thomas",
            MobilityModel::Lattice => "lattice",
        }
    }

    /// The model with identifier `id` (case-insensitive).
    ///
    /// # Errors
    /// [`MobilityError::UnknownModel`] for any other text.
    pub fn from_id(id: &str) -> Result<MobilityModel, MobilityError> {
        MobilityModel::ALL
            .into_iter()
            .find(|m| m.id().eq_ignore_ascii_case(id.trim()))
            .ok_or_else(|| MobilityError::UnknownModel { id: id.to_string() })
    }

    /// Human-readable name.
    pub fn name(self) -> &'static str {
        match self {
            MobilityModel::Masetti => "Masetti et al. (1983)",
            MobilityModel::Arora => "Arora et al. (1982)",
            MobilityModel::CaugheyThomas => "Caughey-Thomas form (Sotoodeh et al. 2000 parameters)",
            MobilityModel::Lattice => "lattice-only (phonon-limited)",
        }
    }

    /// Short citation of the primary source.
    pub fn reference(self) -> &'static str {
        match self {
            MobilityModel::Masetti => {
                "Masetti, Severi, Solmi, IEEE Trans. Electron Devices 30, 764 (1983)"
            }
            MobilityModel::Arora => {
                "Arora, Hauser, Roulston, IEEE Trans. Electron Devices 29, 292 (1982)"
            }
            MobilityModel::CaugheyThomas => {
                "Caughey, Thomas, Proc. IEEE 55, 2192 (1967); GaAs parameters: Sotoodeh, Khalid, \
                 Rezazadeh, J. Appl. Phys. 87, 2890 (2000)"
            }
            MobilityModel::Lattice => {
                "silicon: mu_L of Masetti et al. (1983) with gamma of Lombardi et al., IEEE Trans. \
                 Computer-Aided Design 7, 1164 (1988) (from memory); GaAs: lattice term of Sotoodeh \
                 et al. (2000)"
            }
        }
    }

    /// Whether this model has parameters for `material_id` doped with `dopant_symbol`
    /// (both case-insensitive), so that [`mobility`] can succeed for some density and temperature.
    ///
    /// Masetti applies to silicon doped with As, P or B only (the species of its parameter
    /// sets); Arora and the lattice model to silicon with any dopant; Caughey-Thomas to GaAs
    /// with any dopant; lattice also to GaAs. Germanium: none.
    pub fn applicable(self, material_id: &str, dopant_symbol: &str) -> bool {
        let dopant = dopant_symbol.trim();
        if dopant.is_empty() {
            return false;
        }
        match (self, material_key(material_id)) {
            (MobilityModel::Masetti, Some(MaterialKey::Silicon)) => {
                masetti_dopant(dopant).is_some()
            }
            (MobilityModel::Arora, Some(MaterialKey::Silicon)) => true,
            (MobilityModel::CaugheyThomas, Some(MaterialKey::GalliumArsenide)) => true,
            (MobilityModel::Lattice, Some(_)) => true,
            _ => false,
        }
    }

    /// Highest ionized-impurity density (cm^-3) this model accepts for `material_id` doped with
    /// `dopant_symbol` (the majority carrier's parameter set), or `None` if not applicable.
    pub fn max_density_cm3(self, material_id: &str, dopant_symbol: &str) -> Option<f64> {
        if !self.applicable(material_id, dopant_symbol) {
            return None;
        }
        match (self, material_key(material_id)?) {
            (MobilityModel::Masetti, MaterialKey::Silicon) => {
                match masetti_dopant(dopant_symbol.trim())? {
                    MasettiDopant::Arsenic => Some(MASETTI_ELECTRONS_ARSENIC.max_cm3),
                    MasettiDopant::Phosphorus => Some(MASETTI_ELECTRONS_PHOSPHORUS.max_cm3),
                    MasettiDopant::Boron => Some(MASETTI_HOLES_BORON.max_cm3),
                }
            }
            (MobilityModel::Arora, MaterialKey::Silicon) => {
                Some(ARORA_ELECTRONS.max_cm3.min(ARORA_HOLES.max_cm3))
            }
            (MobilityModel::CaugheyThomas, MaterialKey::GalliumArsenide) => Some(
                SOTOODEH_GAAS_ELECTRONS
                    .max_cm3
                    .min(SOTOODEH_GAAS_HOLES.max_cm3),
            ),
            (MobilityModel::Lattice, key) => {
                let (e, h) = lattice_sets(key);
                Some(e.max_cm3.min(h.max_cm3))
            }
            _ => None,
        }
    }

    /// Temperature range (inclusive, K) in which this model is evaluated for `material_id`,
    /// or `None` if it does not apply to that material.
    ///
    /// Masetti is published at 300 K only; this crate extends it to this range by scaling
    /// mu_max (see [`mobility`]). The ranges of Arora (200-500 K), Sotoodeh (100-500 K) and of
    /// the lattice power law (200-500 K) are from memory of the sources.
    pub fn temperature_range_k(self, material_id: &str) -> Option<(f64, f64)> {
        match (self, material_key(material_id)?) {
            (MobilityModel::Masetti, MaterialKey::Silicon) => Some(MASETTI_EXTENSION_RANGE_K),
            (MobilityModel::Arora, MaterialKey::Silicon) => Some(ARORA_RANGE_K),
            (MobilityModel::CaugheyThomas, MaterialKey::GalliumArsenide) => Some(SOTOODEH_RANGE_K),
            (MobilityModel::Lattice, MaterialKey::Silicon) => Some(SILICON_LATTICE_RANGE_K),
            (MobilityModel::Lattice, MaterialKey::GalliumArsenide) => Some(SOTOODEH_RANGE_K),
            _ => None,
        }
    }
}

impl fmt::Display for MobilityModel {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.id())
    }
}

/// Why a mobility cannot be given.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum MobilityError {
    /// The model id is not one of [`MobilityModel::ALL`].
    UnknownModel {
        /// The text given.
        id: String,
    },
    /// The model has no parameters for this material and dopant.
    NotApplicable {
        /// Model id.
        model: &'static str,
        /// Material id given.
        material_id: String,
        /// Dopant symbol given.
        dopant: String,
        /// What the model does cover.
        covers: &'static str,
    },
    /// The ionized-impurity density is negative or not finite.
    InvalidDensity {
        /// The value given, cm^-3.
        value_cm3: f64,
    },
    /// The density is above the range of the parameter set.
    DensityOutOfRange {
        /// Model id.
        model: &'static str,
        /// Parameter set used.
        parameter_set: &'static str,
        /// The value given, cm^-3.
        value_cm3: f64,
        /// Largest density allowed, cm^-3.
        max_cm3: f64,
    },
    /// The temperature is not finite or not > 0 K.
    InvalidTemperature {
        /// The value given, K.
        value_k: f64,
    },
    /// The temperature is outside the model's range.
    TemperatureOutOfRange {
        /// Model id.
        model: &'static str,
        /// The value given, K.
        value_k: f64,
        /// Lowest temperature allowed, K.
        min_k: f64,
        /// Highest temperature allowed, K.
        max_k: f64,
    },
    /// A power law in T leaves the floating-point range: the temperature is far outside any
    /// parameter set's range (only the functions that take a parameter set check no range).
    OutsideFloatRange {
        /// Model id.
        model: &'static str,
        /// The value given, K.
        value_k: f64,
    },
}

impl fmt::Display for MobilityError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MobilityError::UnknownModel { id } => write!(
                f,
                "mobility model: '{id}' is not known; use one of {}",
                MobilityModel::ALL.map(MobilityModel::id).join(", ")
            ),
            MobilityError::NotApplicable {
                model,
                material_id,
                dopant,
                covers,
            } => write!(
                f,
                "mobility model {model}: no parameters for material '{material_id}' with dopant \
                 '{dopant}'; it covers {covers}"
            ),
            MobilityError::InvalidDensity { value_cm3 } => write!(
                f,
                "ionized_impurity_cm3: {value_cm3:e} is not allowed; give a finite value >= 0 cm^-3"
            ),
            MobilityError::DensityOutOfRange {
                model,
                parameter_set,
                value_cm3,
                max_cm3,
            } => {
                write!(
                    f,
                    "ionized_impurity_cm3: {value_cm3:e} is outside the {model} model ({parameter_set}); \
                     give 0 to {max_cm3:e} cm^-3"
                )
            }
            MobilityError::InvalidTemperature { value_k } => write!(
                f,
                "temperature_k: {value_k} is not allowed; give a finite value > 0 K"
            ),
            MobilityError::TemperatureOutOfRange {
                model,
                value_k,
                min_k,
                max_k,
            } => write!(
                f,
                "temperature_k: {value_k} K is outside the range of the {model} mobility model; \
                 give {min_k} to {max_k} K"
            ),
            MobilityError::OutsideFloatRange { model, value_k } => write!(
                f,
                "temperature_k: {value_k:e} K is far outside the {model} mobility model, whose \
                 power laws in T overflow there; give a temperature in the range of its \
                 parameter set (about 100 to 500 K for the published sets)"
            ),
        }
    }
}

impl std::error::Error for MobilityError {}

// ---------------------------------------------------------------------------------------------
// Masetti et al. (1983)
// ---------------------------------------------------------------------------------------------

/// One parameter set of the Masetti model (mobilities in cm^2/V s, densities in cm^-3).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MasettiParameters {
    /// Which carrier and dopant the set was fitted to, e.g. "electrons in P-doped Si".
    pub label: &'static str,
    /// mu_max, the lattice-limited mobility at 300 K.
    pub mu_max: f64,
    /// mu_min1, the prefactor of the exp(-Pc/N) term.
    pub mu_min1: f64,
    /// mu_min2, subtracted from mu_max in the Caughey-Thomas term.
    pub mu_min2: f64,
    /// mu1, the amplitude of the high-density correction.
    pub mu1: f64,
    /// Pc, cm^-3.
    pub pc_cm3: f64,
    /// Cr, cm^-3.
    pub cr_cm3: f64,
    /// Cs, cm^-3.
    pub cs_cm3: f64,
    /// alpha.
    pub alpha: f64,
    /// beta.
    pub beta: f64,
    /// Lowest density of the fitted data, cm^-3 (below it the formula tends to mu_max).
    pub data_min_cm3: f64,
    /// Highest density of the stated validity, cm^-3.
    pub max_cm3: f64,
}

/// Masetti et al. (1983), Table I, electrons in arsenic-doped silicon; stated validity
/// 1e13 to 4e21 cm^-3 at 300 K.
pub const MASETTI_ELECTRONS_ARSENIC: MasettiParameters = MasettiParameters {
    label: "Masetti electrons, As-doped Si",
    mu_max: 1417.0,
    mu_min1: 52.2,
    mu_min2: 52.2,
    mu1: 43.4,
    pc_cm3: 0.0,
    cr_cm3: 9.68e16,
    cs_cm3: 3.43e20,
    alpha: 0.680,
    beta: 2.0,
    data_min_cm3: 1e13,
    max_cm3: 4e21,
};

/// Masetti et al. (1983), Table I, electrons in phosphorus-doped silicon; stated validity
/// 1e13 to 5e21 cm^-3 at 300 K.
pub const MASETTI_ELECTRONS_PHOSPHORUS: MasettiParameters = MasettiParameters {
    label: "Masetti electrons, P-doped Si",
    mu_max: 1414.0,
    mu_min1: 68.5,
    mu_min2: 68.5,
    mu1: 56.1,
    pc_cm3: 0.0,
    cr_cm3: 9.20e16,
    cs_cm3: 3.41e20,
    alpha: 0.711,
    beta: 1.98,
    data_min_cm3: 1e13,
    max_cm3: 5e21,
};

/// Masetti et al. (1983), Table I, holes in boron-doped silicon; stated validity
/// 1e14 to 1.2e21 cm^-3 at 300 K.
pub const MASETTI_HOLES_BORON: MasettiParameters = MasettiParameters {
    label: "Masetti holes, B-doped Si",
    mu_max: 470.5,
    mu_min1: 44.9,
    mu_min2: 0.0,
    mu1: 29.0,
    pc_cm3: 9.23e16,
    cr_cm3: 2.23e17,
    cs_cm3: 6.10e20,
    alpha: 0.719,
    beta: 2.0,
    data_min_cm3: 1e14,
    max_cm3: 1.2e21,
};

/// Temperature exponents used to extend Masetti's mu_max away from 300 K, and for the silicon
/// lattice model: electrons 2.5, holes 2.2 (Lombardi et al. 1988, from memory).
pub const SILICON_LATTICE_GAMMA_ELECTRONS: f64 = 2.5;
/// See [`SILICON_LATTICE_GAMMA_ELECTRONS`].
pub const SILICON_LATTICE_GAMMA_HOLES: f64 = 2.2;

const MASETTI_EXTENSION_RANGE_K: (f64, f64) = (200.0, 500.0);
const ARORA_RANGE_K: (f64, f64) = (200.0, 500.0);
const SOTOODEH_RANGE_K: (f64, f64) = (100.0, 500.0);
const SILICON_LATTICE_RANGE_K: (f64, f64) = (200.0, 500.0);

/// Masetti mobility at 300 K, cm^2/V s.
///
/// # Formula
/// mu(N) = mu_min1 exp(-Pc/N) + (mu_max - mu_min2) / (1 + (N/Cr)^alpha) - mu1 / (1 + (Cs/N)^beta),
/// N = total ionized-impurity density in cm^-3. At N = 0 the exponential and the last term vanish
/// and mu = mu_min1 [Pc = 0] + mu_max - mu_min2, i.e. mu_max.
///
/// # Validity
/// 300 K; densities up to `params.max_cm3` (P 5e21, As 4e21, B 1.2e21 cm^-3). Below the lowest
/// density of the fitted data (`params.data_min_cm3`) the formula approaches mu_max, the
/// lattice-limited value, within 0.2 % (impurity scattering is negligible there); such densities
/// are accepted and [`mobility`] says so in its notes.
///
/// # References
/// Masetti, Severi, Solmi, IEEE Trans. Electron Devices 30, 764 (1983), eq. and Table I.
///
/// # Errors
/// [`MobilityError::InvalidDensity`] for negative or non-finite N;
/// [`MobilityError::DensityOutOfRange`] above `params.max_cm3`.
pub fn masetti_cm2_per_v_s(
    params: &MasettiParameters,
    ionized_impurity_cm3: f64,
) -> Result<f64, MobilityError> {
    check_density(
        "masetti",
        params.label,
        ionized_impurity_cm3,
        params.max_cm3,
    )?;
    Ok(masetti_at_300k(params, params.mu_max, ionized_impurity_cm3))
}

/// The Masetti formula with mu_max replaced by `mu_max` (used by the temperature extension).
fn masetti_at_300k(params: &MasettiParameters, mu_max: f64, n: f64) -> f64 {
    if n == 0.0 {
        // Pc/N and Cs/N are infinite: the first term is mu_min1 only when Pc = 0.
        let first = if params.pc_cm3 == 0.0 {
            params.mu_min1
        } else {
            0.0
        };
        return first + mu_max - params.mu_min2;
    }
    let first = params.mu_min1 * (-params.pc_cm3 / n).exp();
    let middle = (mu_max - params.mu_min2) / (1.0 + (n / params.cr_cm3).powf(params.alpha));
    let last = params.mu1 / (1.0 + (params.cs_cm3 / n).powf(params.beta));
    first + middle - last
}

fn masetti_dopant(dopant: &str) -> Option<MasettiDopant> {
    if dopant.eq_ignore_ascii_case("as") {
        Some(MasettiDopant::Arsenic)
    } else if dopant.eq_ignore_ascii_case("p") {
        Some(MasettiDopant::Phosphorus)
    } else if dopant.eq_ignore_ascii_case("b") {
        Some(MasettiDopant::Boron)
    } else {
        None
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum MasettiDopant {
    Arsenic,
    Phosphorus,
    Boron,
}

// ---------------------------------------------------------------------------------------------
// Arora et al. (1982)
// ---------------------------------------------------------------------------------------------

/// One carrier's parameters of the Arora model.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct AroraParameters {
    /// Label, e.g. "Arora electrons, Si".
    pub label: &'static str,
    /// mu_min at 300 K, cm^2/V s.
    pub mu_min: f64,
    /// mu_0 at 300 K, cm^2/V s.
    pub mu_0: f64,
    /// Exponent of Tn on mu_0.
    pub beta2: f64,
    /// N_ref at 300 K, cm^-3.
    pub n_ref_cm3: f64,
    /// Highest density accepted, cm^-3 (from memory of the fitted data range).
    pub max_cm3: f64,
}

/// Arora et al. (1982), electrons in silicon.
pub const ARORA_ELECTRONS: AroraParameters = AroraParameters {
    label: "Arora electrons, Si",
    mu_min: 88.0,
    mu_0: 1252.0,
    beta2: -2.33,
    n_ref_cm3: 1.26e17,
    max_cm3: 1e20,
};

/// Arora et al. (1982), holes in silicon.
pub const ARORA_HOLES: AroraParameters = AroraParameters {
    label: "Arora holes, Si",
    mu_min: 54.3,
    mu_0: 407.0,
    beta2: -2.23,
    n_ref_cm3: 2.35e17,
    max_cm3: 1e20,
};

/// Arora mobility, cm^2/V s.
///
/// # Formula
/// Tn = T / 300 K; mu = mu_min Tn^-0.57 + mu_0 Tn^beta2 / (1 + (N / (N_ref Tn^2.4))^(0.88 Tn^-0.146)).
///
/// # Validity
/// About 200-500 K and N up to 1e20 cm^-3 (both from memory of the fitted data).
///
/// # References
/// Arora, Hauser, Roulston, IEEE Trans. Electron Devices 29, 292 (1982).
///
/// # Errors
/// [`MobilityError::InvalidDensity`], [`MobilityError::DensityOutOfRange`] (N > 1e20),
/// [`MobilityError::InvalidTemperature`], [`MobilityError::TemperatureOutOfRange`].
pub fn arora_cm2_per_v_s(
    params: &AroraParameters,
    ionized_impurity_cm3: f64,
    temperature_k: f64,
) -> Result<f64, MobilityError> {
    check_density("arora", params.label, ionized_impurity_cm3, params.max_cm3)?;
    check_temperature("arora", temperature_k, ARORA_RANGE_K)?;
    let tn = temperature_k / REFERENCE_TEMPERATURE_K;
    let alpha = 0.88 * tn.powf(-0.146);
    let n_ref = params.n_ref_cm3 * tn.powf(2.4);
    Ok(params.mu_min * tn.powf(-0.57)
        + params.mu_0 * tn.powf(params.beta2) / (1.0 + (ionized_impurity_cm3 / n_ref).powf(alpha)))
}

// ---------------------------------------------------------------------------------------------
// Caughey-Thomas form
// ---------------------------------------------------------------------------------------------

/// Parameters of the Caughey-Thomas form with the temperature exponents of Sotoodeh et al.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct CaugheyThomasParameters {
    /// Label, e.g. "Sotoodeh electrons, GaAs".
    pub label: &'static str,
    /// mu_max at 300 K, cm^2/V s.
    pub mu_max: f64,
    /// mu_min, cm^2/V s.
    pub mu_min: f64,
    /// N_ref at 300 K, cm^-3.
    pub n_ref_cm3: f64,
    /// Exponent lambda (often called alpha).
    pub lambda: f64,
    /// theta1: mu_max scales as (300/T)^theta1.
    pub theta1: f64,
    /// theta2: N_ref scales as (T/300)^theta2.
    pub theta2: f64,
    /// Highest density accepted, cm^-3.
    pub max_cm3: f64,
}

/// Sotoodeh, Khalid, Rezazadeh, J. Appl. Phys. 87, 2890 (2000), Table, electrons in GaAs
/// (values from memory, confirmed against a public copy of the table).
pub const SOTOODEH_GAAS_ELECTRONS: CaugheyThomasParameters = CaugheyThomasParameters {
    label: "Sotoodeh electrons, GaAs",
    mu_max: 9400.0,
    mu_min: 500.0,
    n_ref_cm3: 6e16,
    lambda: 0.394,
    theta1: 2.1,
    theta2: 3.0,
    max_cm3: 1e20,
};

/// Sotoodeh et al. (2000), holes in GaAs (as [`SOTOODEH_GAAS_ELECTRONS`]).
pub const SOTOODEH_GAAS_HOLES: CaugheyThomasParameters = CaugheyThomasParameters {
    label: "Sotoodeh holes, GaAs",
    mu_max: 491.5,
    mu_min: 20.0,
    n_ref_cm3: 1.48e17,
    lambda: 0.38,
    theta1: 2.2,
    theta2: 3.0,
    max_cm3: 1e20,
};

/// Caughey-Thomas mobility, cm^2/V s.
///
/// # Formula
/// mu = mu_min + (mu_max (300/T)^theta1 - mu_min) / (1 + (N / (N_ref (T/300)^theta2))^lambda).
/// With theta1 = theta2 = 0 this is the original Caughey-Thomas form at one temperature.
///
/// # Validity
/// That of the parameter set; for the Sotoodeh GaAs sets about 100-500 K and N up to 1e20 cm^-3
/// (from memory). This function checks density and temperature > 0 only; [`mobility`] also
/// checks the model's temperature range.
///
/// # References
/// Caughey, Thomas, Proc. IEEE 55, 2192 (1967); Sotoodeh, Khalid, Rezazadeh,
/// J. Appl. Phys. 87, 2890 (2000).
///
/// # Errors
/// [`MobilityError::InvalidDensity`], [`MobilityError::DensityOutOfRange`],
/// [`MobilityError::InvalidTemperature`].
pub fn caughey_thomas_cm2_per_v_s(
    params: &CaugheyThomasParameters,
    ionized_impurity_cm3: f64,
    temperature_k: f64,
) -> Result<f64, MobilityError> {
    check_density(
        "caughey-thomas",
        params.label,
        ionized_impurity_cm3,
        params.max_cm3,
    )?;
    check_positive_temperature(temperature_k)?;
    let tn = temperature_k / REFERENCE_TEMPERATURE_K;
    let mu_lattice = params.mu_max * tn.powf(-params.theta1);
    let n_ref = params.n_ref_cm3 * tn.powf(params.theta2);
    finite_mobility(
        "caughey-thomas",
        temperature_k,
        params.mu_min
            + (mu_lattice - params.mu_min)
                / (1.0 + (ionized_impurity_cm3 / n_ref).powf(params.lambda)),
    )
}

// ---------------------------------------------------------------------------------------------
// Lattice-only mobility
// ---------------------------------------------------------------------------------------------

/// Phonon-limited mobility parameters: mu_L(T) = mu_300 (T/300)^-gamma.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LatticeParameters {
    /// Label.
    pub label: &'static str,
    /// Mobility at 300 K, cm^2/V s.
    pub mu_300: f64,
    /// Temperature exponent gamma.
    pub gamma: f64,
    /// Highest ionized-impurity density at which impurity scattering is negligible, cm^-3.
    pub max_cm3: f64,
}

/// Silicon electrons: Masetti's mu_max for As (1417) with gamma 2.5 (Lombardi et al. 1988,
/// from memory). Impurity scattering lowers the mobility by less than 5 % up to 1e15 cm^-3
/// according to Masetti's formula, hence the density limit.
pub const SILICON_LATTICE_ELECTRONS: LatticeParameters = LatticeParameters {
    label: "lattice electrons, Si",
    mu_300: 1417.0,
    gamma: SILICON_LATTICE_GAMMA_ELECTRONS,
    max_cm3: 1e15,
};

/// Silicon holes: Masetti's mu_max for B (470.5) with gamma 2.2 (Lombardi et al. 1988, from
/// memory); density limit as for electrons.
pub const SILICON_LATTICE_HOLES: LatticeParameters = LatticeParameters {
    label: "lattice holes, Si",
    mu_300: 470.5,
    gamma: SILICON_LATTICE_GAMMA_HOLES,
    max_cm3: 1e15,
};

/// GaAs electrons: the lattice term of Sotoodeh et al. (2000). Impurity scattering lowers the
/// mobility by less than 5 % up to about 4e13 cm^-3 by the same model, hence the limit 1e13.
pub const GAAS_LATTICE_ELECTRONS: LatticeParameters = LatticeParameters {
    label: "lattice electrons, GaAs (Sotoodeh)",
    mu_300: 9400.0,
    gamma: 2.1,
    max_cm3: 1e13,
};

/// GaAs holes: the lattice term of Sotoodeh et al. (2000), limit as for electrons.
pub const GAAS_LATTICE_HOLES: LatticeParameters = LatticeParameters {
    label: "lattice holes, GaAs (Sotoodeh)",
    mu_300: 491.5,
    gamma: 2.2,
    max_cm3: 1e13,
};

/// Lattice-only (phonon-limited) mobility, cm^2/V s.
///
/// # Formula
/// mu_L(T) = mu_300 (T / 300 K)^-gamma.
///
/// # Validity
/// Lightly doped material only: the density must not exceed `params.max_cm3`, where impurity
/// scattering stays below about 5 %; temperature > 0 (the model's range is checked by [`mobility`]).
///
/// # References
/// See [`MobilityModel::reference`] for [`MobilityModel::Lattice`].
///
/// # Errors
/// [`MobilityError::InvalidDensity`], [`MobilityError::DensityOutOfRange`],
/// [`MobilityError::InvalidTemperature`].
pub fn lattice_cm2_per_v_s(
    params: &LatticeParameters,
    ionized_impurity_cm3: f64,
    temperature_k: f64,
) -> Result<f64, MobilityError> {
    check_density(
        "lattice",
        params.label,
        ionized_impurity_cm3,
        params.max_cm3,
    )?;
    check_positive_temperature(temperature_k)?;
    finite_mobility(
        "lattice",
        temperature_k,
        params.mu_300 * (temperature_k / REFERENCE_TEMPERATURE_K).powf(-params.gamma),
    )
}

// ---------------------------------------------------------------------------------------------
// Both carriers for one material and dopant
// ---------------------------------------------------------------------------------------------

/// Electron and hole mobilities of one model, with the parameter sets used and every
/// extension or substitution applied.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CarrierMobilities {
    /// Model used.
    pub model: MobilityModel,
    /// Electron mobility, cm^2/V s.
    pub electrons_cm2_per_v_s: f64,
    /// Hole mobility, cm^2/V s.
    pub holes_cm2_per_v_s: f64,
    /// Parameter set used for electrons.
    pub electron_parameters: &'static str,
    /// Parameter set used for holes.
    pub hole_parameters: &'static str,
    /// Extensions, substitutions and range remarks a reader must see.
    pub notes: Vec<String>,
}

impl CarrierMobilities {
    /// The mobility of `carrier`.
    pub fn of(&self, carrier: Carrier) -> f64 {
        match carrier {
            Carrier::Electron => self.electrons_cm2_per_v_s,
            Carrier::Hole => self.holes_cm2_per_v_s,
        }
    }
}

/// Electron and hole mobilities in `material_id` doped with `dopant_symbol`.
///
/// # Formula
/// Per model: [`masetti_cm2_per_v_s`], [`arora_cm2_per_v_s`], [`caughey_thomas_cm2_per_v_s`],
/// [`lattice_cm2_per_v_s`], all at the total ionized-impurity density N = N_D+ + N_A-.
///
/// Masetti away from 300 K (an extension, not part of the 1983 paper, reported in `notes`):
/// mu_max is replaced by mu_max (T/300)^-gamma (gamma 2.5 electrons, 2.2 holes, from memory
/// of Lombardi et al. 1988) and the other parameters keep their 300 K values.
///
/// Masetti parameter sets: electrons use the As set in As-doped silicon and the P set otherwise
/// (also as minority carriers in B-doped silicon); holes always use the B set. Both
/// substitutions for minority carriers are reported in `notes`.
///
/// # Validity
/// See [`MobilityModel::temperature_range_k`] and each formula function.
///
/// # References
/// See [`MobilityModel::reference`].
///
/// # Errors
/// [`MobilityError::NotApplicable`] when [`MobilityModel::applicable`] is false, and the errors
/// of the formula functions.
pub fn mobility(
    model: MobilityModel,
    material_id: &str,
    dopant_symbol: &str,
    ionized_impurity_cm3: f64,
    temperature_k: f64,
) -> Result<CarrierMobilities, MobilityError> {
    let mut notes = Vec::new();
    let (values, labels) = compute(
        model,
        material_id,
        dopant_symbol,
        ionized_impurity_cm3,
        temperature_k,
        Some(&mut notes),
    )?;
    Ok(CarrierMobilities {
        model,
        electrons_cm2_per_v_s: values.0,
        holes_cm2_per_v_s: values.1,
        electron_parameters: labels.0,
        hole_parameters: labels.1,
        notes,
    })
}

/// (electron, hole) mobility in cm^2/V s as [`mobility`] gives them, without building notes:
/// for inner loops such as the resistivity inversion.
///
/// # Errors
/// As [`mobility`].
pub(crate) fn mobility_values(
    model: MobilityModel,
    material_id: &str,
    dopant_symbol: &str,
    ionized_impurity_cm3: f64,
    temperature_k: f64,
) -> Result<(f64, f64), MobilityError> {
    compute(
        model,
        material_id,
        dopant_symbol,
        ionized_impurity_cm3,
        temperature_k,
        None,
    )
    .map(|(values, _)| values)
}

/// Collects notes only when a caller wants them.
struct Notes<'a>(Option<&'a mut Vec<String>>);

impl Notes<'_> {
    fn push(&mut self, note: impl FnOnce() -> String) {
        if let Some(v) = self.0.as_mut() {
            v.push(note());
        }
    }
}

type Pair<T> = (T, T);

fn compute(
    model: MobilityModel,
    material_id: &str,
    dopant_symbol: &str,
    ionized_impurity_cm3: f64,
    temperature_k: f64,
    notes: Option<&mut Vec<String>>,
) -> Result<(Pair<f64>, Pair<&'static str>), MobilityError> {
    let mut notes = Notes(notes);
    let not_applicable = || MobilityError::NotApplicable {
        model: model.id(),
        material_id: material_id.to_string(),
        dopant: dopant_symbol.to_string(),
        covers: covers(model),
    };
    if !model.applicable(material_id, dopant_symbol) {
        return Err(not_applicable());
    }
    let material = material_key(material_id).ok_or_else(not_applicable)?;
    check_density_value(ionized_impurity_cm3)?;
    check_positive_temperature(temperature_k)?;
    let range = model
        .temperature_range_k(material_id)
        .ok_or_else(not_applicable)?;
    check_temperature(model.id(), temperature_k, range)?;

    let n = ionized_impurity_cm3;
    match (model, material) {
        (MobilityModel::Masetti, MaterialKey::Silicon) => {
            let dopant = masetti_dopant(dopant_symbol.trim()).ok_or_else(not_applicable)?;
            let e_set = if dopant == MasettiDopant::Arsenic {
                &MASETTI_ELECTRONS_ARSENIC
            } else {
                &MASETTI_ELECTRONS_PHOSPHORUS
            };
            let h_set = &MASETTI_HOLES_BORON;
            if dopant == MasettiDopant::Boron {
                notes.push(|| {
                    "minority electrons in B-doped Si use Masetti's P set (no set for electrons \
                     in B-doped Si)"
                        .to_string()
                });
            } else {
                notes.push(|| {
                    "minority holes in n-type Si use Masetti's B set (no set for holes in \
                     donor-doped Si)"
                        .to_string()
                });
            }
            let values = masetti_pair(
                e_set,
                h_set,
                dopant == MasettiDopant::Boron,
                n,
                temperature_k,
                &mut notes,
            )?;
            Ok((values, (e_set.label, h_set.label)))
        }
        (MobilityModel::Arora, MaterialKey::Silicon) => Ok((
            (
                arora_cm2_per_v_s(&ARORA_ELECTRONS, n, temperature_k)?,
                arora_cm2_per_v_s(&ARORA_HOLES, n, temperature_k)?,
            ),
            (ARORA_ELECTRONS.label, ARORA_HOLES.label),
        )),
        (MobilityModel::CaugheyThomas, MaterialKey::GalliumArsenide) => Ok((
            (
                caughey_thomas_cm2_per_v_s(&SOTOODEH_GAAS_ELECTRONS, n, temperature_k)?,
                caughey_thomas_cm2_per_v_s(&SOTOODEH_GAAS_HOLES, n, temperature_k)?,
            ),
            (SOTOODEH_GAAS_ELECTRONS.label, SOTOODEH_GAAS_HOLES.label),
        )),
        (MobilityModel::Lattice, key) => {
            let (e_set, h_set) = lattice_sets(key);
            Ok((
                (
                    lattice_cm2_per_v_s(e_set, n, temperature_k)?,
                    lattice_cm2_per_v_s(h_set, n, temperature_k)?,
                ),
                (e_set.label, h_set.label),
            ))
        }
        _ => Err(not_applicable()),
    }
}

fn lattice_sets(key: MaterialKey) -> (&'static LatticeParameters, &'static LatticeParameters) {
    match key {
        MaterialKey::Silicon => (&SILICON_LATTICE_ELECTRONS, &SILICON_LATTICE_HOLES),
        MaterialKey::GalliumArsenide => (&GAAS_LATTICE_ELECTRONS, &GAAS_LATTICE_HOLES),
    }
}

fn masetti_pair(
    e_set: &MasettiParameters,
    h_set: &MasettiParameters,
    majority_is_holes: bool,
    n: f64,
    temperature_k: f64,
    notes: &mut Notes<'_>,
) -> Result<(f64, f64), MobilityError> {
    // The majority carrier's set limits the density; the minority set is evaluated beyond its
    // own range only with a note (its share of the conductivity is then negligible).
    let (majority, minority) = if majority_is_holes {
        (h_set, e_set)
    } else {
        (e_set, h_set)
    };
    masetti_cm2_per_v_s(majority, n)?;
    if n > minority.max_cm3 {
        notes.push(|| {
            format!(
                "minority-carrier set '{}' evaluated above its stated range ({:e} cm^-3); \
                 minority carriers carry a negligible share of the current at this density",
                minority.label, minority.max_cm3
            )
        });
    }
    let tn = temperature_k / REFERENCE_TEMPERATURE_K;
    if temperature_k != REFERENCE_TEMPERATURE_K {
        notes.push(|| {
            format!(
                "Masetti is published at 300 K; extended to {temperature_k} K by scaling mu_max \
                 with (T/300)^-gamma, gamma {SILICON_LATTICE_GAMMA_ELECTRONS} electrons, \
                 {SILICON_LATTICE_GAMMA_HOLES} holes (from memory, Lombardi et al. 1988)"
            )
        });
    }
    let data_min = majority.data_min_cm3;
    if n < data_min {
        notes.push(|| {
            format!(
                "ionized-impurity density {n:e} cm^-3 is below Masetti's data ({data_min:e} \
                 cm^-3); the formula gives the lattice limit there (impurity scattering < 0.2 %)"
            )
        });
    }
    let mu_e = masetti_at_300k(
        e_set,
        e_set.mu_max * tn.powf(-SILICON_LATTICE_GAMMA_ELECTRONS),
        n,
    );
    let mu_h = masetti_at_300k(
        h_set,
        h_set.mu_max * tn.powf(-SILICON_LATTICE_GAMMA_HOLES),
        n,
    );
    Ok((mu_e, mu_h))
}

fn covers(model: MobilityModel) -> &'static str {
    match model {
        MobilityModel::Masetti => "silicon doped with As, P or B",
        MobilityModel::Arora => "silicon with any dopant",
        MobilityModel::CaugheyThomas => "GaAs with any dopant (Sotoodeh et al. 2000)",
        MobilityModel::Lattice => "silicon and GaAs",
        // Future models must state their coverage.
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum MaterialKey {
    Silicon,
    GalliumArsenide,
}

fn material_key(material_id: &str) -> Option<MaterialKey> {
    let id = material_id.trim();
    if id.eq_ignore_ascii_case("si") {
        Some(MaterialKey::Silicon)
    } else if id.eq_ignore_ascii_case("gaas") {
        Some(MaterialKey::GalliumArsenide)
    } else {
        None
    }
}

fn check_density_value(n: f64) -> Result<(), MobilityError> {
    if n.is_finite() && n >= 0.0 {
        Ok(())
    } else {
        Err(MobilityError::InvalidDensity { value_cm3: n })
    }
}

fn check_density(
    model: &'static str,
    parameter_set: &'static str,
    n: f64,
    max_cm3: f64,
) -> Result<(), MobilityError> {
    check_density_value(n)?;
    if n > max_cm3 {
        return Err(MobilityError::DensityOutOfRange {
            model,
            parameter_set,
            value_cm3: n,
            max_cm3,
        });
    }
    Ok(())
}

fn check_positive_temperature(t: f64) -> Result<(), MobilityError> {
    if t.is_finite() && t > 0.0 {
        Ok(())
    } else {
        Err(MobilityError::InvalidTemperature { value_k: t })
    }
}

/// `mu` when it is a finite number, else [`MobilityError::OutsideFloatRange`] at `t`.
fn finite_mobility(model: &'static str, t: f64, mu: f64) -> Result<f64, MobilityError> {
    if mu.is_finite() {
        Ok(mu)
    } else {
        Err(MobilityError::OutsideFloatRange { model, value_k: t })
    }
}

fn check_temperature(
    model: &'static str,
    t: f64,
    (min_k, max_k): (f64, f64),
) -> Result<(), MobilityError> {
    check_positive_temperature(t)?;
    if t < min_k || t > max_k {
        return Err(MobilityError::TemperatureOutOfRange {
            model,
            value_k: t,
            min_k,
            max_k,
        });
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn power_laws_that_overflow_are_refused_not_returned() {
        // (T/300)^-2.1 overflows f64 for T near the smallest normal float.
        let t = f64::MIN_POSITIVE;
        for result in [
            caughey_thomas_cm2_per_v_s(&SOTOODEH_GAAS_ELECTRONS, 0.0, t),
            lattice_cm2_per_v_s(&SILICON_LATTICE_HOLES, 0.0, t),
        ] {
            assert!(
                matches!(result, Err(MobilityError::OutsideFloatRange { value_k, .. }) if value_k == t),
                "{result:?}"
            );
        }
        assert!(caughey_thomas_cm2_per_v_s(&SOTOODEH_GAAS_ELECTRONS, 0.0, 1e-3).is_ok());
    }

    #[test]
    fn ids_round_trip() {
        for m in MobilityModel::ALL {
            assert_eq!(MobilityModel::from_id(m.id()), Ok(m));
            assert_eq!(MobilityModel::from_id(&m.id().to_uppercase()), Ok(m));
        }
        assert!(matches!(
            MobilityModel::from_id("nope"),
            Err(MobilityError::UnknownModel { .. })
        ));
    }

    #[test]
    fn masetti_at_zero_density_is_mu_max() {
        // Source: Masetti et al. 1983 formula: all impurity terms vanish at N = 0.
        for set in [
            MASETTI_ELECTRONS_ARSENIC,
            MASETTI_ELECTRONS_PHOSPHORUS,
            MASETTI_HOLES_BORON,
        ] {
            assert_eq!(masetti_cm2_per_v_s(&set, 0.0), Ok(set.mu_max));
        }
    }

    #[test]
    fn applicability() {
        assert!(MobilityModel::Masetti.applicable("Si", "as"));
        assert!(!MobilityModel::Masetti.applicable("si", "Sb"));
        assert!(!MobilityModel::Masetti.applicable("gaas", "Si"));
        assert!(MobilityModel::Arora.applicable("si", "Sb"));
        assert!(MobilityModel::CaugheyThomas.applicable("gaas", "Zn"));
        assert!(!MobilityModel::CaugheyThomas.applicable("si", "P"));
        assert!(!MobilityModel::Lattice.applicable("ge", "P"));
        assert!(!MobilityModel::Arora.applicable("si", ""));
    }

    #[test]
    fn non_finite_inputs_are_errors() {
        for bad in [f64::NAN, f64::INFINITY, -1.0] {
            assert!(mobility(MobilityModel::Masetti, "si", "P", bad, 300.0).is_err());
            assert!(mobility(MobilityModel::Arora, "si", "P", 1e16, bad).is_err());
        }
    }
}
