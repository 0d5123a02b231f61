//! Hall-effect analysis of a van der Pauw structure: Hall voltage to carrier type, sheet and
//! volume carrier density, Hall and drift mobility, and the cross-check of those measured
//! carriers against what the doping conversion and the carrier statistics predict.
//!
//! # Public API
//! - [`HallVoltage`] (one net value or the four readings), [`ScatteringFactor`] (r_H),
//!   [`HallReading`] -> [`evaluate`] -> [`HallResult`].
//! - [`cross_check`] -> [`CrossCheck`] of [`CrossCheckRow`]s: per conversion model, the dopant
//!   density from the measured resistivity, the free majority carriers from charge neutrality at
//!   the measurement temperature and the model mobility, with the differences in percent.
//! - [`MeasuredStructure`] and [`intervals`]: intervals on R_s, n and mu from the readings'
//!   uncertainties ([`crate::uncertainty::one_at_a_time`]).
//! - [`HallError`].
//!
//! # Sign convention
//! Contacts 1-4 numbered counter-clockwise as seen from the side the field +B points to
//! (the field towards the viewer), current I into contact 1 and out of contact 3, Hall voltage
//! V_H = V_2 - V_4. Then holes give V_H > 0 (p-type) and electrons V_H < 0 (n-type): the
//! Lorentz force q v x B pushes both towards contact 2, with their own charge.
//!
//! # Hall scattering factor
//! r_H = <tau^2>/<tau>^2 relates the Hall coefficient to the carrier density,
//! R_H = r_H/(q p) or -r_H/(q n). The Hall density n_H = 1/(q |R_H|) is what the readings give
//! with r_H = 1; the carrier density is n = r_H n_H, the Hall mobility mu_H = |R_H|/rho
//! (= 1/(q R_s n_H,s)) and the drift mobility mu = mu_H/r_H (= 1/(q R_s n_s)).

use std::f64::consts::PI;
use std::fmt;

use serde::Serialize;

use crate::compare::{self, ConversionError, ConversionInput, ConversionModel};
use crate::constants::ELEMENTARY_CHARGE_C;
use crate::materials::{DopantKind, Material};
use crate::mobility::{ConductivityType, MobilityModel};
use crate::neutrality::SolveOptions;
use crate::resistivity::{self, PhysicsOptions, ResistivityPoint};
use crate::uncertainty::{self, Measured, OutputInterval, UncertaintyError};
use crate::vdp::{self, VdpError};

/// m^2 in cm^2.
const CM2_PER_M2: f64 = 1e4;

/// The Hall scattering factor r_H.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ScatteringFactor {
    /// r_H = 1: the Hall density is reported as the carrier density (the usual default).
    Unity,
    /// r_H = 3 pi/8 = 1.178: nondegenerate carriers scattered by acoustic phonons (lattice).
    AcousticPhonon,
    /// r_H = 315 pi/512 = 1.933: nondegenerate carriers scattered by ionized impurities.
    IonizedImpurity,
    /// A value the user gives (from the fab's own calibration or a published table).
    Value(f64),
}

impl ScatteringFactor {
    /// The named choices, in the order lists show them.
    pub const NAMED: [ScatteringFactor; 3] = [
        ScatteringFactor::Unity,
        ScatteringFactor::AcousticPhonon,
        ScatteringFactor::IonizedImpurity,
    ];

    /// Stable id: "unity", "acoustic-phonon", "ionized-impurity" or "value".
    pub fn id(self) -> &'static str {
        match self {
            ScatteringFactor::Unity => "unity",
            ScatteringFactor::AcousticPhonon => "acoustic-phonon",
            ScatteringFactor::IonizedImpurity => "ionized-impurity",
            ScatteringFactor::Value(_) => "value",
        }
    }

    /// r_H.
    pub fn value(self) -> f64 {
        match self {
            ScatteringFactor::Unity => 1.0,
            ScatteringFactor::AcousticPhonon => 3.0 * PI / 8.0,
            ScatteringFactor::IonizedImpurity => 315.0 * PI / 512.0,
            ScatteringFactor::Value(v) => v,
        }
    }

    /// Where the value comes from.
    pub fn source(self) -> String {
        match self {
            ScatteringFactor::Unity => "r_H = 1 (Hall density taken as the carrier density; \
                                       common practice, no source)"
                .to_string(),
            ScatteringFactor::AcousticPhonon => {
                "r_H = 3 pi/8, acoustic-phonon scattering, nondegenerate carriers (Sze 1981, \
                 ch. 1, from memory)"
                    .to_string()
            }
            ScatteringFactor::IonizedImpurity => {
                "r_H = 315 pi/512, ionized-impurity scattering, nondegenerate carriers (Sze \
                 1981, ch. 1, from memory)"
                    .to_string()
            }
            ScatteringFactor::Value(v) => format!("r_H = {v} as given"),
        }
    }

    /// Reads an id (case-insensitive) or a number in 0.1..10.
    ///
    /// # Errors
    /// [`HallError::UnknownScatteringFactor`], [`HallError::InvalidScatteringFactor`].
    pub fn parse(text: &str) -> Result<ScatteringFactor, HallError> {
        let t = text.trim();
        if let Some(named) = Self::NAMED.iter().find(|f| f.id().eq_ignore_ascii_case(t)) {
            return Ok(*named);
        }
        match t.parse::<f64>() {
            Ok(v) => ScatteringFactor::Value(v).validated(),
            Err(_) => Err(HallError::UnknownScatteringFactor {
                given: text.to_string(),
            }),
        }
    }

    fn validated(self) -> Result<ScatteringFactor, HallError> {
        let v = self.value();
        if v.is_finite() && (SCATTERING_FACTOR_RANGE.0..=SCATTERING_FACTOR_RANGE.1).contains(&v) {
            Ok(self)
        } else {
            Err(HallError::InvalidScatteringFactor { value: v })
        }
    }
}

/// Accepted r_H: published values lie between about 0.5 and 2; 0.1..10 refuses typing slips
/// (a percentage, a density) without refusing anything physical. This project's choice.
pub const SCATTERING_FACTOR_RANGE: (f64, f64) = (0.1, 10.0);

/// The Hall voltage as read.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum HallVoltage {
    /// V_H already averaged over field and current reversal, V.
    Net(f64),
    /// V_2 - V_4 at (+B, +I), (+B, -I), (-B, +I), (-B, -I), V.
    Readings([f64; 4]),
}

impl HallVoltage {
    /// V_H and, from four readings, the offset that reverses with the current but not with the
    /// field (contact misalignment).
    ///
    /// # Formula
    /// V_H = [V(+B,+I) - V(+B,-I) - V(-B,+I) + V(-B,-I)]/4;
    /// offset = [V(+B,+I) - V(+B,-I) + V(-B,+I) - V(-B,-I)]/4. Offsets that do not reverse
    /// with the current (thermoelectric) cancel from both (common practice, no source).
    pub fn net(self) -> (f64, Option<f64>) {
        match self {
            HallVoltage::Net(v) => (v, None),
            HallVoltage::Readings([pp, pm, mp, mm]) => {
                (0.25 * (pp - pm - mp + mm), Some(0.25 * (pp - pm + mp - mm)))
            }
        }
    }
}

/// A Hall measurement on a structure whose sheet resistance is known.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct HallReading {
    /// The Hall voltage.
    pub voltage: HallVoltage,
    /// Current magnitude, A.
    pub current_a: f64,
    /// Field magnitude, T.
    pub field_t: f64,
    /// Sheet resistance from the van der Pauw readings, ohm/sq.
    pub sheet_resistance_ohm_sq: f64,
    /// Layer thickness, cm (`None`: sheet quantities only).
    pub thickness_cm: Option<f64>,
    /// r_H.
    pub scattering: ScatteringFactor,
}

/// The evaluated Hall measurement.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HallResult {
    /// V_H, V (signed; see the module's sign convention).
    pub hall_voltage_v: f64,
    /// Misalignment offset from four readings, V.
    pub offset_v: Option<f64>,
    /// Sheet Hall coefficient R_H,s = V_H/(I B), cm^2/C (signed).
    pub sheet_hall_coefficient_cm2_per_c: f64,
    /// n (electrons, V_H < 0) or p (holes, V_H > 0).
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Hall sheet density 1/(q |R_H,s|), cm^-2 (the density for r_H = 1).
    pub hall_sheet_density_cm2: f64,
    /// Sheet carrier density n_s = r_H/(q |R_H,s|), cm^-2.
    pub sheet_density_cm2: f64,
    /// n = n_s / t, cm^-3, with a thickness.
    pub volume_density_cm3: Option<f64>,
    /// mu_H = |R_H,s| / R_s, cm^2/V s.
    pub hall_mobility_cm2_per_v_s: f64,
    /// mu = mu_H / r_H, cm^2/V s.
    pub drift_mobility_cm2_per_v_s: f64,
    /// r_H used.
    pub scattering_factor: f64,
    /// Id of the r_H choice.
    pub scattering_id: &'static str,
    /// Where r_H comes from.
    pub scattering_source: String,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
}

/// Why a Hall quantity cannot be computed.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum HallError {
    /// A current, field, sheet resistance or thickness is not finite or not > 0.
    NotPositive {
        /// Field name, e.g. "field_t".
        field: &'static str,
        /// Value given.
        value: f64,
    },
    /// A Hall voltage reading is not finite.
    NotFinite {
        /// Field name.
        field: &'static str,
        /// Value given.
        value: f64,
    },
    /// The net Hall voltage is zero: no type, no density.
    ZeroHallVoltage,
    /// r_H outside [`SCATTERING_FACTOR_RANGE`].
    InvalidScatteringFactor {
        /// Value given.
        value: f64,
    },
    /// r_H text that is neither an id nor a number.
    UnknownScatteringFactor {
        /// Text given.
        given: String,
    },
    /// A result is outside the floating-point range.
    OutOfRange {
        /// The computed quantity.
        quantity: &'static str,
        /// Its value.
        value: f64,
    },
    /// The van der Pauw part refused.
    Vdp(VdpError),
    /// A half-width was refused.
    Uncertainty(UncertaintyError),
    /// The cross-check's dopant is not a dopant of the material, or no model covers it.
    CrossCheck(ConversionError),
}

impl fmt::Display for HallError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            HallError::NotPositive { field, value } => {
                write!(
                    f,
                    "{field}: {value:e} is not allowed; give a finite value > 0"
                )
            }
            HallError::NotFinite { field, value } => {
                write!(f, "{field}: {value} is not allowed; give a finite voltage")
            }
            HallError::ZeroHallVoltage => write!(
                f,
                "hall_voltage_v: the net Hall voltage is 0, so neither the carrier type nor the \
                 density can be found; check the field, the current and the Hall contacts"
            ),
            HallError::InvalidScatteringFactor { value } => write!(
                f,
                "scattering_factor: {value} is not allowed; give r_H between {} and {} or one \
                 of {}",
                SCATTERING_FACTOR_RANGE.0,
                SCATTERING_FACTOR_RANGE.1,
                scattering_ids()
            ),
            HallError::UnknownScatteringFactor { given } => write!(
                f,
                "scattering_factor: {given:?} is not known; give one of {} or a number between \
                 {} and {}",
                scattering_ids(),
                SCATTERING_FACTOR_RANGE.0,
                SCATTERING_FACTOR_RANGE.1
            ),
            HallError::OutOfRange { quantity, value } => write!(
                f,
                "{quantity}: the inputs give {value:e}, outside the range of floating-point \
                 numbers; check the units of the voltage, current and field"
            ),
            HallError::Vdp(e) => e.fmt(f),
            HallError::Uncertainty(e) => e.fmt(f),
            HallError::CrossCheck(e) => write!(f, "cross-check: {e}"),
        }
    }
}

impl std::error::Error for HallError {}

impl From<UncertaintyError> for HallError {
    fn from(error: UncertaintyError) -> HallError {
        HallError::Uncertainty(error)
    }
}

impl From<VdpError> for HallError {
    fn from(error: VdpError) -> HallError {
        HallError::Vdp(error)
    }
}

fn scattering_ids() -> String {
    ScatteringFactor::NAMED
        .iter()
        .map(|f| f.id())
        .collect::<Vec<_>>()
        .join(", ")
}

fn positive(field: &'static str, value: f64) -> Result<f64, HallError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(HallError::NotPositive { field, value })
    }
}

fn finite_result(quantity: &'static str, value: f64) -> Result<f64, HallError> {
    if value.is_finite() && value != 0.0 {
        Ok(value)
    } else {
        Err(HallError::OutOfRange { quantity, value })
    }
}

/// Evaluates a Hall measurement.
///
/// # Formula
/// V_H from [`HallVoltage::net`]; R_H,s = V_H/(I B) (m^2/C, reported in cm^2/C);
/// type p when V_H > 0, n when V_H < 0 (module sign convention);
/// n_H,s = 1/(q |R_H,s|); n_s = r_H n_H,s; n = n_s/t; mu_H = |R_H,s|/R_s = 1/(q R_s n_H,s);
/// mu = mu_H/r_H. q = 1.602176634e-19 C (SI 2019).
///
/// # Validity
/// One carrier type dominating the conduction (a mixed-conduction layer gives a Hall density
/// that is neither n nor p), a uniform layer, weak field (mu B << 1, B in T, mu in m^2/V s).
///
/// # References
/// L. J. van der Pauw, Philips Res. Rep. 13, 1 (1958) (Hall measurement on the same
/// structure); Sze 1981, ch. 1 (Hall effect, r_H; from memory).
///
/// # Errors
/// [`HallError::NotPositive`], [`HallError::NotFinite`], [`HallError::ZeroHallVoltage`],
/// [`HallError::InvalidScatteringFactor`], [`HallError::OutOfRange`].
pub fn evaluate(reading: &HallReading) -> Result<HallResult, HallError> {
    let fields = [
        "hall_plus_field_plus_current_v",
        "hall_plus_field_minus_current_v",
        "hall_minus_field_plus_current_v",
        "hall_minus_field_minus_current_v",
    ];
    match reading.voltage {
        HallVoltage::Net(v) if !v.is_finite() => {
            return Err(HallError::NotFinite {
                field: "hall_voltage_v",
                value: v,
            });
        }
        HallVoltage::Readings(values) => {
            if let Some((field, value)) =
                fields.into_iter().zip(values).find(|(_, v)| !v.is_finite())
            {
                return Err(HallError::NotFinite { field, value });
            }
        }
        HallVoltage::Net(_) => {}
    }
    let current = positive("current_a", reading.current_a)?;
    let field = positive("field_t", reading.field_t)?;
    let sheet = positive("sheet_resistance_ohm_sq", reading.sheet_resistance_ohm_sq)?;
    let thickness = reading
        .thickness_cm
        .map(|t| positive("thickness_cm", t))
        .transpose()?;
    let scattering = reading.scattering.validated()?;
    let r_h = scattering.value();
    let (hall_voltage_v, offset_v) = reading.voltage.net();
    if hall_voltage_v == 0.0 {
        return Err(HallError::ZeroHallVoltage);
    }
    let coefficient = finite_result(
        "sheet_hall_coefficient_cm2_per_c",
        hall_voltage_v / (current * field) * CM2_PER_M2,
    )?;
    let hall_sheet = finite_result(
        "hall_sheet_density_cm2",
        1.0 / (ELEMENTARY_CHARGE_C * coefficient.abs()),
    )?;
    let sheet_density = finite_result("sheet_density_cm2", r_h * hall_sheet)?;
    let hall_mobility = finite_result("hall_mobility_cm2_per_v_s", coefficient.abs() / sheet)?;
    let mut notes = Vec::new();
    if let Some(offset) = offset_v
        && offset.abs() > hall_voltage_v.abs()
    {
        notes.push(format!(
            "the misalignment offset ({offset:.3e} V) exceeds the Hall voltage \
             ({hall_voltage_v:.3e} V): the four-reading average removes it, but a small Hall \
             signal on a large offset is sensitive to drift between the readings"
        ));
    }
    let mu_b = hall_mobility * 1e-4 * field;
    if mu_b > 0.1 {
        notes.push(format!(
            "mu_H B = {mu_b:.2}: not a weak field (mu B << 1); the Hall coefficient depends on \
             the field here"
        ));
    }
    Ok(HallResult {
        hall_voltage_v,
        offset_v,
        sheet_hall_coefficient_cm2_per_c: coefficient,
        conductivity_type: if hall_voltage_v > 0.0 {
            ConductivityType::P
        } else {
            ConductivityType::N
        },
        hall_sheet_density_cm2: hall_sheet,
        sheet_density_cm2: sheet_density,
        volume_density_cm3: thickness
            .map(|t| finite_result("volume_density_cm3", sheet_density / t))
            .transpose()?,
        hall_mobility_cm2_per_v_s: hall_mobility,
        drift_mobility_cm2_per_v_s: hall_mobility / r_h,
        scattering_factor: r_h,
        scattering_id: scattering.id(),
        scattering_source: scattering.source(),
        notes,
    })
}

/// One conversion model's prediction beside the measurement.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CrossCheckRow {
    /// The conversion model.
    pub model: ConversionModel,
    /// Dopant density the model gives for the measured resistivity, cm^-3.
    pub dopant_density_cm3: Option<f64>,
    /// Free majority carriers from charge neutrality at that density, cm^-3.
    pub carriers_cm3: Option<f64>,
    /// Majority-carrier mobility of the mobility model at that density, cm^2/V s.
    pub mobility_cm2_per_v_s: Option<f64>,
    /// The mobility model behind the carriers and mobility (for the empirical relation, the
    /// default physics model at the empirical density).
    pub mobility_model: Option<MobilityModel>,
    /// 100 (measured - model)/model for the carrier density.
    pub carriers_difference_percent: Option<f64>,
    /// 100 (measured - model)/model for the drift mobility.
    pub mobility_difference_percent: Option<f64>,
    /// Why the row is empty, when it is.
    pub error: Option<String>,
    /// Remarks from the model.
    pub notes: Vec<String>,
}

/// The measured carriers beside every applicable model's prediction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CrossCheck {
    /// Material id.
    pub material_id: String,
    /// Dopant symbol.
    pub dopant: String,
    /// The dopant's type.
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Temperature of the measurement, K.
    pub temperature_k: f64,
    /// Measured resistivity, ohm cm.
    pub resistivity_ohm_cm: f64,
    /// Measured carrier density, cm^-3.
    pub measured_carriers_cm3: f64,
    /// Measured drift mobility, cm^2/V s.
    pub measured_mobility_cm2_per_v_s: f64,
    /// One row per applicable model (the lattice-only mobility is left out: it ignores impurity
    /// scattering, so it converts no doped layer).
    pub rows: Vec<CrossCheckRow>,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
}

/// What the doping conversion and the carrier statistics predict for a measured layer.
///
/// # Formula
/// For each applicable model m: N_m = the model's density for rho ([`compare::convert`]); the
/// free majority carriers and the majority mobility at N_m and T from the physics chain
/// ([`resistivity::resistivity_from_density`]: charge neutrality, then the mobility model;
/// the empirical relation has neither, so its N is evaluated with the default physics model and
/// the row names it); differences 100 (measured - model)/model.
///
/// # Validity
/// The models' ranges; a singly doped, uncompensated layer (compensation lowers the carriers
/// and the mobility for the same dopant density, and shows here as a difference).
///
/// # References
/// See [`compare::convert`] and [`resistivity::resistivity_from_density`].
///
/// # Errors
/// [`HallError::CrossCheck`] when the dopant is unknown to the material or no model covers it;
/// a model that refuses leaves its row empty with the reason.
pub fn cross_check(
    material: &Material,
    dopant_symbol: &str,
    resistivity_ohm_cm: f64,
    measured: &HallResult,
    temperature_k: f64,
    solve: &SolveOptions,
) -> Result<CrossCheck, HallError> {
    let rho = positive("resistivity_ohm_cm", resistivity_ohm_cm)?;
    let Some(carriers) = measured.volume_density_cm3 else {
        return Err(HallError::NotPositive {
            field: "thickness_cm",
            value: f64::NAN,
        });
    };
    let dopant = material
        .dopant(dopant_symbol)
        .map_err(|e| HallError::CrossCheck(ConversionError::Dopant(e)))?;
    let dopant_type = match dopant.kind {
        DopantKind::Donor => ConductivityType::N,
        DopantKind::Acceptor => ConductivityType::P,
    };
    let models: Vec<ConversionModel> = ConversionModel::all()
        .into_iter()
        .filter(|m| {
            *m != ConversionModel::Physics(MobilityModel::Lattice)
                && m.applicable(&material.id, &dopant.symbol)
        })
        .collect();
    if models.is_empty() {
        return Err(HallError::CrossCheck(ConversionError::NoApplicableModel {
            material_id: material.id.clone(),
            dopant: dopant.symbol.to_string(),
        }));
    }
    let mobility = measured.drift_mobility_cm2_per_v_s;
    let rows = models
        .into_iter()
        .map(|model| {
            row(
                material,
                &dopant.symbol,
                rho,
                temperature_k,
                model,
                solve,
                carriers,
                mobility,
            )
        })
        .collect();
    let mut notes = Vec::new();
    if dopant_type != measured.conductivity_type {
        notes.push(format!(
            "the Hall voltage says {}-type but {} is a {}: check the sign convention and the \
             field direction, or the layer is compensated or inverted",
            measured.conductivity_type.as_str(),
            dopant.symbol,
            dopant.kind
        ));
    }
    Ok(CrossCheck {
        material_id: material.id.clone(),
        dopant: dopant.symbol.to_string(),
        conductivity_type: dopant_type,
        temperature_k,
        resistivity_ohm_cm: rho,
        measured_carriers_cm3: carriers,
        measured_mobility_cm2_per_v_s: mobility,
        rows,
        notes,
    })
}

#[allow(clippy::too_many_arguments)]
fn row(
    material: &Material,
    dopant: &str,
    rho: f64,
    temperature_k: f64,
    model: ConversionModel,
    solve: &SolveOptions,
    carriers: f64,
    mobility: f64,
) -> CrossCheckRow {
    let empty = |error: String, notes: Vec<String>| CrossCheckRow {
        model,
        dopant_density_cm3: None,
        carriers_cm3: None,
        mobility_cm2_per_v_s: None,
        mobility_model: None,
        carriers_difference_percent: None,
        mobility_difference_percent: None,
        error: Some(error),
        notes,
    };
    let conversion = match compare::convert(
        material,
        dopant,
        ConversionInput::ResistivityOhmCm(rho),
        temperature_k,
        model,
        solve,
    ) {
        Ok(c) => c,
        Err(e) => return empty(e.to_string(), Vec::new()),
    };
    let mut notes = conversion.notes.clone();
    let point: ResistivityPoint = match conversion.physics {
        Some(point) => point,
        None => {
            let Some(physics) = compare::default_physics(&material.id, dopant, temperature_k)
            else {
                return empty(
                    "no physics model covers this dopant at this temperature for the carriers"
                        .to_string(),
                    notes,
                );
            };
            notes.push(format!(
                "carriers and mobility at the {} density from charge neutrality and {} mobility",
                model.id(),
                physics.id()
            ));
            let options = PhysicsOptions {
                mobility: physics,
                solve: solve.clone(),
            };
            match resistivity::resistivity_from_density(
                material,
                dopant,
                conversion.density_cm3,
                temperature_k,
                &options,
            ) {
                Ok(point) => point,
                Err(e) => {
                    let mut row = empty(e.to_string(), notes);
                    row.dopant_density_cm3 = Some(conversion.density_cm3);
                    return row;
                }
            }
        }
    };
    let (model_carriers, model_mobility) = match point.conductivity_type {
        ConductivityType::N => (point.electrons_cm3, point.electron_mobility_cm2_per_v_s),
        ConductivityType::P => (point.holes_cm3, point.hole_mobility_cm2_per_v_s),
    };
    let percent = |measured: f64, model: f64| 100.0 * (measured - model) / model;
    CrossCheckRow {
        model,
        dopant_density_cm3: Some(conversion.density_cm3),
        carriers_cm3: Some(model_carriers),
        mobility_cm2_per_v_s: Some(model_mobility),
        mobility_model: Some(point.mobility_model),
        carriers_difference_percent: Some(percent(carriers, model_carriers)),
        mobility_difference_percent: Some(percent(mobility, model_mobility)),
        error: None,
        notes,
    }
}

/// A van der Pauw and Hall measurement with the half-widths of its inputs.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MeasuredStructure {
    /// R_A (averaged), ohm.
    pub r_a_ohm: Measured,
    /// R_B (averaged), ohm.
    pub r_b_ohm: Measured,
    /// Thickness, cm.
    pub thickness_cm: Option<Measured>,
    /// Net Hall voltage (signed), current and field; `None` for a sheet resistance only.
    pub hall: Option<MeasuredHall>,
    /// r_H (taken as exact: a model choice, not a reading).
    pub scattering: ScatteringFactor,
}

/// The Hall part of a [`MeasuredStructure`].
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MeasuredHall {
    /// Net Hall voltage, V.
    pub voltage_v: Measured,
    /// Current, A.
    pub current_a: Measured,
    /// Field, T.
    pub field_t: Measured,
}

/// Intervals on R_s, the carrier density (volume with a thickness, else sheet) and the drift
/// mobility from the half-widths of the readings.
///
/// # Formula
/// [`uncertainty::one_at_a_time`] through [`vdp::solve`] and [`evaluate`].
///
/// # Errors
/// Any [`HallError`] of the chain at the values or at the ends of an input's range.
pub fn intervals(structure: &MeasuredStructure) -> Result<Vec<OutputInterval>, HallError> {
    let mut inputs = vec![
        ("r_a_ohm", structure.r_a_ohm),
        ("r_b_ohm", structure.r_b_ohm),
    ];
    let mut outputs = vec!["sheet_resistance_ohm_sq"];
    if let Some(t) = structure.thickness_cm {
        inputs.push(("thickness_cm", t));
    }
    if let Some(h) = &structure.hall {
        inputs.push(("hall_voltage_v", h.voltage_v));
        inputs.push(("current_a", h.current_a));
        inputs.push(("field_t", h.field_t));
        outputs.push(if structure.thickness_cm.is_some() {
            "volume_density_cm3"
        } else {
            "sheet_density_cm2"
        });
        outputs.push("drift_mobility_cm2_per_v_s");
    }
    let thick = structure.thickness_cm.is_some();
    uncertainty::one_at_a_time(&inputs, &outputs, |x: &[f64]| {
        let sheet = vdp::solve(x[0], x[1])?.sheet_resistance_ohm_sq;
        let mut out = vec![sheet];
        if structure.hall.is_some() {
            let offset = usize::from(thick);
            let result = evaluate(&HallReading {
                voltage: HallVoltage::Net(x[2 + offset]),
                current_a: x[3 + offset],
                field_t: x[4 + offset],
                sheet_resistance_ohm_sq: sheet,
                thickness_cm: thick.then(|| x[2]),
                scattering: structure.scattering,
            })?;
            out.push(
                result
                    .volume_density_cm3
                    .unwrap_or(result.sheet_density_cm2),
            );
            out.push(result.drift_mobility_cm2_per_v_s);
        }
        Ok(out)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn four_readings_average_out_offsets() {
        // V_H = 2 mV, misalignment 5 mV (reverses with I), thermoelectric 0.3 mV (constant).
        let (vh, offset, thermal) = (2e-3, 5e-3, 3e-4);
        let readings = HallVoltage::Readings([
            vh + offset + thermal,
            -vh - offset + thermal,
            -vh + offset + thermal,
            vh - offset + thermal,
        ]);
        let (net, off) = readings.net();
        approx::assert_relative_eq!(net, vh, max_relative = 1e-12);
        approx::assert_relative_eq!(off.unwrap(), offset, max_relative = 1e-12);
    }

    #[test]
    fn scattering_factor_ids_and_numbers() {
        assert_eq!(
            ScatteringFactor::parse("Unity"),
            Ok(ScatteringFactor::Unity)
        );
        assert_eq!(
            ScatteringFactor::parse("acoustic-phonon"),
            Ok(ScatteringFactor::AcousticPhonon)
        );
        assert_eq!(
            ScatteringFactor::parse("1.1"),
            Ok(ScatteringFactor::Value(1.1))
        );
        assert_eq!(
            ScatteringFactor::parse("115").unwrap_err().to_string(),
            "scattering_factor: 115 is not allowed; give r_H between 0.1 and 10 or one of \
             unity, acoustic-phonon, ionized-impurity"
        );
        assert!(matches!(
            ScatteringFactor::parse("phonons"),
            Err(HallError::UnknownScatteringFactor { .. })
        ));
    }

    #[test]
    fn zero_and_bad_readings_are_refused_by_name() {
        let reading = HallReading {
            voltage: HallVoltage::Readings([1e-3, 1e-3, 1e-3, 1e-3]),
            current_a: 1e-3,
            field_t: 0.5,
            sheet_resistance_ohm_sq: 100.0,
            thickness_cm: None,
            scattering: ScatteringFactor::Unity,
        };
        assert_eq!(evaluate(&reading), Err(HallError::ZeroHallVoltage));
        let no_field = HallReading {
            voltage: HallVoltage::Net(1e-3),
            field_t: 0.0,
            ..reading
        };
        assert!(matches!(
            evaluate(&no_field),
            Err(HallError::NotPositive {
                field: "field_t",
                ..
            })
        ));
        let nan = HallReading {
            voltage: HallVoltage::Readings([1e-3, f64::NAN, 0.0, 0.0]),
            ..reading
        };
        assert!(matches!(
            evaluate(&nan),
            Err(HallError::NotFinite {
                field: "hall_plus_field_minus_current_v",
                ..
            })
        ));
    }
}
