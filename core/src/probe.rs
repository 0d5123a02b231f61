//! Collinear equal-spacing four-point probe: V/I to sheet resistance and resistivity, with the
//! thickness, wafer-diameter and temperature corrections; sheet resistance <-> resistivity.
//!
//! # Public API
//! - [`THIN_SHEET_FACTOR`] (pi/ln 2), [`sheet_resistance_ohm_sq`], [`resistivity_from_sheet_ohm_cm`].
//! - [`thin_sheet_resistance_ohm_sq`]: R_s = (pi/ln 2) V/I;
//!   [`semi_infinite_resistivity_ohm_cm`]: rho = 2 pi s V/I.
//! - [`thickness_correction`] -> [`ThicknessCorrection`]: exact image series for a layer of
//!   thickness t with non-conducting faces.
//! - [`diameter_correction`] -> [`DiameterCorrection`]: centred probe on a circular thin wafer.
//! - [`temperature_correction_to_23c`] -> [`TemperatureCorrection`]: derived from the physics
//!   model's temperature dependence (no published coefficient table was available).
//! - [`ProbeGeometry`]: the sample a reading is taken on, a thin layer or wafer (the default:
//!   sheet resistance, resistivity only with a thickness) or a bulk sample (semi-infinite).
//! - [`evaluate`]: a whole [`ProbeReading`] to a [`ProbeResult`] naming the geometry and every
//!   factor applied as a [`CorrectionFactor`].
//! - [`ProbeError`]: refusals naming the field, the value and the allowed range.

use std::f64::consts::{LN_2, PI};
use std::fmt;

use serde::{Deserialize, Serialize};

use crate::constants::ZERO_CELSIUS_K;
use crate::empirical::EMPIRICAL_TEMPERATURE_K;
use crate::materials::Material;
use crate::mobility::MobilityModel;
use crate::resistivity::{self, PhysicsOptions, ResistivityError};

/// pi / ln 2 = 4.532360...: R_s = (pi/ln 2) V/I for an infinite thin sheet.
pub const THIN_SHEET_FACTOR: f64 = PI / LN_2;

/// Terms of the image series summed directly before the Euler-Maclaurin tail takes over.
const DIRECT_TERMS: usize = 64;

/// Why a probe quantity cannot be computed.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum ProbeError {
    /// A length, voltage, current or resistance is not finite or not > 0.
    NotPositive {
        /// Field name, e.g. "thickness_cm".
        field: &'static str,
        /// Value given.
        value: f64,
    },
    /// The wafer is too small for the Smits formula (d/s must exceed sqrt 3).
    DiameterTooSmall {
        /// Diameter given, cm.
        diameter_cm: f64,
        /// Probe spacing, cm.
        spacing_cm: f64,
    },
    /// A diameter correction was asked for on a bulk sample (it applies to thin layers).
    DiameterOnBulk {
        /// Diameter given, cm.
        diameter_cm: f64,
    },
    /// A thin layer without a thickness has no resistivity, and `purpose` needs one.
    ResistivityNeedsThickness {
        /// What needs the resistivity, e.g. "the temperature correction".
        purpose: &'static str,
    },
    /// The temperature is not finite or below absolute zero.
    InvalidTemperature {
        /// Value given, C.
        value_c: f64,
    },
    /// The temperature correction's physics model refused.
    Model(ResistivityError),
    /// The inputs are each finite and > 0, but a result computed from them is not (it
    /// overflows to infinity or underflows to zero): the inputs are in the wrong units or far
    /// outside any measurement.
    OutOfRange {
        /// The computed quantity, e.g. "resistivity_ohm_cm".
        quantity: &'static str,
        /// The value computed.
        value: f64,
    },
}

impl fmt::Display for ProbeError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ProbeError::NotPositive { field, value } => {
                write!(
                    f,
                    "{field}: {value:e} is not allowed; give a finite value > 0"
                )
            }
            ProbeError::DiameterTooSmall {
                diameter_cm,
                spacing_cm,
            } => write!(
                f,
                "diameter_cm: {diameter_cm} cm is too small for probe spacing {spacing_cm} cm; the \
                 diameter correction needs diameter > sqrt(3) x spacing = {:.4} cm",
                3f64.sqrt() * spacing_cm
            ),
            ProbeError::DiameterOnBulk { diameter_cm } => write!(
                f,
                "diameter_cm: {diameter_cm} cm given for a bulk sample; the diameter correction \
                 (Smits 1958) is for a thin layer or wafer: choose the thin-layer geometry or \
                 leave the diameter out"
            ),
            ProbeError::ResistivityNeedsThickness { purpose } => write!(
                f,
                "thickness_cm: not given; a thin layer has a resistivity only with its thickness, \
                 and {purpose} needs the resistivity: give the thickness or choose the bulk \
                 geometry"
            ),
            ProbeError::InvalidTemperature { value_c } => write!(
                f,
                "temperature_c: {value_c} is not allowed; give a finite value above -273.15 C"
            ),
            ProbeError::Model(e) => write!(f, "temperature correction: {e}"),
            ProbeError::OutOfRange { quantity, value } => write!(
                f,
                "{quantity}: the inputs give {value:e}, outside the range of floating-point \
                 numbers; check the units of the voltage, current and lengths"
            ),
        }
    }
}

impl std::error::Error for ProbeError {}

/// A computed `value` when it is finite and > 0, else [`ProbeError::OutOfRange`].
fn in_range(quantity: &'static str, value: f64) -> Result<f64, ProbeError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(ProbeError::OutOfRange { quantity, value })
    }
}

fn positive(field: &'static str, value: f64) -> Result<f64, ProbeError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(ProbeError::NotPositive { field, value })
    }
}

/// Sheet resistance of a layer, ohm per square.
///
/// # Formula
/// R_s = rho / t (rho in ohm cm, t in cm).
///
/// # Validity
/// Uniform resistivity through the thickness.
///
/// # Errors
/// [`ProbeError::NotPositive`] for `resistivity_ohm_cm` or `thickness_cm`.
pub fn sheet_resistance_ohm_sq(
    resistivity_ohm_cm: f64,
    thickness_cm: f64,
) -> Result<f64, ProbeError> {
    in_range(
        "sheet_resistance_ohm_sq",
        positive("resistivity_ohm_cm", resistivity_ohm_cm)?
            / positive("thickness_cm", thickness_cm)?,
    )
}

/// Resistivity of a layer from its sheet resistance, ohm cm.
///
/// # Formula
/// rho = R_s t.
///
/// # Errors
/// [`ProbeError::NotPositive`] for `sheet_resistance_ohm_sq` or `thickness_cm`.
pub fn resistivity_from_sheet_ohm_cm(
    sheet_resistance_ohm_sq: f64,
    thickness_cm: f64,
) -> Result<f64, ProbeError> {
    in_range(
        "resistivity_ohm_cm",
        positive("sheet_resistance_ohm_sq", sheet_resistance_ohm_sq)?
            * positive("thickness_cm", thickness_cm)?,
    )
}

/// Sheet resistance of an infinite thin sheet from a collinear equal-spacing reading.
///
/// # Formula
/// R_s = (pi / ln 2) V / I.
///
/// # Validity
/// Thickness much smaller than the spacing (t/s < 0.4 keeps the thickness correction above
/// 0.9995) and a sheet much larger than the probe.
///
/// # References
/// Valdes, Proc. IRE 42, 420 (1954); Smits, Bell Syst. Tech. J. 37, 711 (1958).
///
/// # Errors
/// [`ProbeError::NotPositive`] for `volts` or `amps`.
pub fn thin_sheet_resistance_ohm_sq(volts: f64, amps: f64) -> Result<f64, ProbeError> {
    in_range(
        "sheet_resistance_ohm_sq",
        THIN_SHEET_FACTOR * positive("volts", volts)? / positive("amps", amps)?,
    )
}

/// Resistivity of a semi-infinite body from a collinear equal-spacing reading.
///
/// # Formula
/// rho = 2 pi s V / I (s in cm).
///
/// # Validity
/// Thickness and distance to any edge much larger than s.
///
/// # References
/// Valdes, Proc. IRE 42, 420 (1954).
///
/// # Errors
/// [`ProbeError::NotPositive`] for `volts`, `amps` or `spacing_cm`.
pub fn semi_infinite_resistivity_ohm_cm(
    volts: f64,
    amps: f64,
    spacing_cm: f64,
) -> Result<f64, ProbeError> {
    in_range(
        "resistivity_ohm_cm",
        2.0 * PI * positive("spacing_cm", spacing_cm)? * positive("volts", volts)?
            / positive("amps", amps)?,
    )
}

/// The finite-thickness correction for one thickness-to-spacing ratio.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ThicknessCorrection {
    /// t / s.
    pub thickness_over_spacing: f64,
    /// C in rho = 2 pi s (V/I) C (1 for a semi-infinite body, -> t/(2 s ln 2) for thin layers).
    pub bulk_factor: f64,
    /// F in rho = (pi/ln 2) t (V/I) F (1 for a thin sheet).
    pub thin_sheet_factor: f64,
}

/// Finite-thickness correction of a collinear equal-spacing probe on a layer with
/// non-conducting top and bottom faces, laterally infinite.
///
/// # Formula
/// x = t/s. rho = 2 pi s (V/I) C(x) with
/// 1/C = 2 [f(0) + 2 sum_{n>=1} f(n)], f(n) = 1/sqrt(1 + (2 n x)^2) - 1/sqrt(4 + (2 n x)^2)
/// (the images of the current sources in the two faces); F(x) = 2 ln 2 C(x) / x so that
/// rho = (pi/ln 2) t (V/I) F(x). The first terms are summed directly and the rest by the
/// Euler-Maclaurin formula with the exact integral
/// int_N^inf f = [ln 2 - asinh(2 N x) + asinh(N x)] / (2 x) and derivative corrections up to
/// f^(5),
/// which is accurate to about 1e-15 for every x > 0 (the series itself converges only as n^-3).
///
/// # Validity
/// Any t/s > 0; non-conducting faces (no conducting substrate), laterally infinite layer,
/// probe far from edges.
///
/// # References
/// Valdes, Proc. IRE 42, 420 (1954); Uhlir, Bell Syst. Tech. J. 34, 105 (1955).
///
/// # Errors
/// [`ProbeError::NotPositive`] for `thickness_cm` or `spacing_cm`.
pub fn thickness_correction(
    thickness_cm: f64,
    spacing_cm: f64,
) -> Result<ThicknessCorrection, ProbeError> {
    let x = positive("thickness_cm", thickness_cm)? / positive("spacing_cm", spacing_cm)?;
    if !(x.is_finite() && x > 0.0) {
        return Err(ProbeError::NotPositive {
            field: "thickness_cm / spacing_cm",
            value: x,
        });
    }
    // Past SEMI_INFINITE_RATIO the image sum is below 1e-18 and cannot change the factor in
    // f64; the series itself overflows for t/s beyond about 1e60.
    let images = if x > SEMI_INFINITE_RATIO {
        0.0
    } else {
        image_sum(x)
    };
    let bulk_factor = 1.0 / (2.0 * (0.5 + 2.0 * images));
    Ok(ThicknessCorrection {
        thickness_over_spacing: x,
        bulk_factor,
        thin_sheet_factor: 2.0 * LN_2 * bulk_factor / x,
    })
}

/// sum_{n>=1} [g1(2 n x) - g4(2 n x)], g_a(u) = (a + u^2)^-1/2.
/// t/s above which a layer is a semi-infinite body to f64 precision: the image sum is about
/// 3 zeta(3) / (16 (t/s)^3), 2.3e-19 at 1e6, less than half an ulp of the bulk factor's 1.
const SEMI_INFINITE_RATIO: f64 = 1e6;

fn image_sum(x: f64) -> f64 {
    let f = |n: f64| image_term(x, n, 0);
    let mut direct = 0.0;
    for n in 1..DIRECT_TERMS {
        direct += f(n as f64);
    }
    // Euler-Maclaurin from N: sum_{n>=N} f(n) = int_N^inf f + f(N)/2 - f'(N)/12 + f'''(N)/720
    // - f^(5)(N)/30240 + ... (Bernoulli numbers B2, B4, B6).
    let big_n = DIRECT_TERMS as f64;
    let integral = (LN_2 - ((2.0 * big_n * x).asinh() - (big_n * x).asinh())) / (2.0 * x);
    direct + integral + 0.5 * f(big_n) - image_term(x, big_n, 1) / 12.0
        + image_term(x, big_n, 3) / 720.0
        - image_term(x, big_n, 5) / 30240.0
}

/// The k-th derivative (k = 0, 1, 3, 5) with respect to n of f(n) = g1(2 n x) - g4(2 n x).
fn image_term(x: f64, n: f64, k: u8) -> f64 {
    let u = 2.0 * n * x;
    let g = |a: f64| {
        let r = a + u * u;
        match k {
            0 => r.powf(-0.5),
            1 => -u * r.powf(-1.5),
            3 => u * (9.0 * a - 6.0 * u * u) * r.powf(-3.5),
            _ => -15.0 * u * (15.0 * a * a - 40.0 * a * u * u + 8.0 * u.powi(4)) * r.powf(-5.5),
        }
    };
    (2.0 * x).powi(i32::from(k)) * (g(1.0) - g(4.0))
}

/// The finite-diameter correction for a centred probe on a circular thin wafer.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct DiameterCorrection {
    /// d / s.
    pub diameter_over_spacing: f64,
    /// C in R_s = C V/I (tends to pi/ln 2 for an infinite sheet).
    pub sheet_factor: f64,
    /// C / (pi/ln 2): the factor multiplying the infinite-sheet result (< 1).
    pub relative_factor: f64,
}

/// Finite-diameter correction of a collinear equal-spacing probe at the centre of a circular
/// thin wafer, probe line along a diameter.
///
/// # Formula
/// R_s = C V/I, C = pi / (ln 2 + ln(((d/s)^2 + 3) / ((d/s)^2 - 3))).
///
/// # Validity
/// d/s > sqrt(3) (outer probes inside the wafer); thin wafer (t much less than s); probe at the
/// centre.
///
/// # References
/// Smits, Bell Syst. Tech. J. 37, 711 (1958).
///
/// # Errors
/// [`ProbeError::NotPositive`], [`ProbeError::DiameterTooSmall`].
pub fn diameter_correction(
    diameter_cm: f64,
    spacing_cm: f64,
) -> Result<DiameterCorrection, ProbeError> {
    let ratio = positive("diameter_cm", diameter_cm)? / positive("spacing_cm", spacing_cm)?;
    let r2 = ratio * ratio;
    if !(r2 > 3.0 && r2.is_finite()) {
        return Err(ProbeError::DiameterTooSmall {
            diameter_cm,
            spacing_cm,
        });
    }
    // ln((r2 + 3)/(r2 - 3)) written with ln_1p to keep precision for large wafers.
    let sheet_factor = PI / (LN_2 + (6.0 / (r2 - 3.0)).ln_1p());
    Ok(DiameterCorrection {
        diameter_over_spacing: ratio,
        sheet_factor,
        relative_factor: sheet_factor / THIN_SHEET_FACTOR,
    })
}

/// The correction of a resistivity read at another temperature to 23 C.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TemperatureCorrection {
    /// Temperature of the reading, C.
    pub temperature_c: f64,
    /// rho(23 C) / rho(T): multiply the reading by this.
    pub factor: f64,
    /// The same in the customary form rho23 = rhoT [1 - C_T (T - 23)], C_T in 1/K
    /// (`None` when T is 23 C exactly).
    pub coefficient_per_k: Option<f64>,
    /// Dopant density the model assigns to the reading, cm^-3.
    pub density_cm3: f64,
    /// How the factor was obtained.
    pub method: String,
}

/// Corrects a resistivity read at `temperature_c` to 23 C.
///
/// # Formula
/// N = the physics model's density for `resistivity_ohm_cm` at T
/// ([`resistivity::density_from_resistivity`]); factor = rho(N, 23 C) / rho(N, T), both from
/// [`resistivity::resistivity_from_density`]; rho23 = factor rhoT. The coefficient
/// C_T = (1 - factor)/(T - 23 C).
///
/// # Validity
/// The physics model's range. This factor is derived from the temperature dependence of the
/// physics model (mobility model and carrier statistics), not from a published coefficient
/// table: the tabulated coefficients of the standard practice for this correction were not
/// available to this project.
///
/// # References
/// See [`resistivity::resistivity_from_density`] and the mobility model's reference.
///
/// # Errors
/// [`ProbeError::InvalidTemperature`], [`ProbeError::NotPositive`], [`ProbeError::Model`].
pub fn temperature_correction_to_23c(
    material: &Material,
    dopant_symbol: &str,
    resistivity_ohm_cm: f64,
    temperature_c: f64,
    options: &PhysicsOptions,
) -> Result<TemperatureCorrection, ProbeError> {
    if !(temperature_c.is_finite() && temperature_c > -ZERO_CELSIUS_K) {
        return Err(ProbeError::InvalidTemperature {
            value_c: temperature_c,
        });
    }
    positive("resistivity_ohm_cm", resistivity_ohm_cm)?;
    let t_k = temperature_c + ZERO_CELSIUS_K;
    let reading = resistivity::density_from_resistivity(
        material,
        dopant_symbol,
        resistivity_ohm_cm,
        t_k,
        options,
    )
    .map_err(ProbeError::Model)?;
    let at_23 = resistivity::resistivity_from_density(
        material,
        dopant_symbol,
        reading.density_cm3,
        EMPIRICAL_TEMPERATURE_K,
        options,
    )
    .map_err(ProbeError::Model)?;
    let factor = at_23.resistivity_ohm_cm / reading.resistivity_ohm_cm;
    let delta = t_k - EMPIRICAL_TEMPERATURE_K;
    Ok(TemperatureCorrection {
        temperature_c,
        factor,
        coefficient_per_k: (delta != 0.0).then(|| (1.0 - factor) / delta),
        density_cm3: reading.density_cm3,
        method: format!(
            "derived from the temperature dependence of the physics model ({} mobility, carriers \
             from charge neutrality); no published coefficient table used",
            options.mobility.id()
        ),
    })
}

/// One correction factor applied to a reading.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CorrectionFactor {
    /// Stable name, e.g. "thickness", "diameter", "temperature".
    pub name: &'static str,
    /// The factor (multiplies the uncorrected result).
    pub value: f64,
    /// Formula or source.
    pub source: String,
}

/// The sample a four-point-probe reading is taken on.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum ProbeGeometry {
    /// A thin layer or wafer: a diffused, implanted or deposited layer, or a wafer thin against
    /// the probe spacing. Gives the sheet resistance R_s = (pi/ln 2) V/I times the corrections;
    /// the resistivity R_s t only when the thickness t is known.
    #[default]
    #[serde(rename = "thin-layer")]
    ThinLayer,
    /// A bulk sample (ingot, slug, thick piece), semi-infinite against the probe spacing:
    /// rho = 2 pi s V/I.
    #[serde(rename = "bulk")]
    Bulk,
}

impl ProbeGeometry {
    /// Every geometry, the default first.
    pub const ALL: [ProbeGeometry; 2] = [ProbeGeometry::ThinLayer, ProbeGeometry::Bulk];

    /// Stable id: "thin-layer" or "bulk" (the CLI's `--geometry`, the lot files' `geometry`).
    pub fn id(self) -> &'static str {
        match self {
            ProbeGeometry::ThinLayer => "thin-layer",
            ProbeGeometry::Bulk => "bulk",
        }
    }

    /// The geometry named `text`: its id, ignoring case, with a space or underscore for the
    /// hyphen (`thin layer`, `THIN_LAYER`).
    pub fn from_id(text: &str) -> Option<ProbeGeometry> {
        let folded = text.trim().to_ascii_lowercase().replace([' ', '_'], "-");
        ProbeGeometry::ALL.into_iter().find(|g| g.id() == folded)
    }

    /// What a result on this geometry is, in a line.
    pub fn describe(self) -> &'static str {
        match self {
            ProbeGeometry::ThinLayer => {
                "thin layer or wafer: sheet resistance R_s = (pi/ln 2) V/I x corrections, \
                 resistivity R_s t only with a thickness (Valdes 1954)"
            }
            ProbeGeometry::Bulk => {
                "bulk sample, semi-infinite: resistivity rho = 2 pi s V/I (Valdes 1954)"
            }
        }
    }
}

impl fmt::Display for ProbeGeometry {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.id())
    }
}

/// What the engineer read and knows about the sample.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ProbeReading {
    /// Voltage between the inner probes, V.
    pub volts: f64,
    /// Current through the outer probes, A.
    pub amps: f64,
    /// Probe spacing, cm.
    pub spacing_cm: f64,
    /// The sample geometry.
    pub geometry: ProbeGeometry,
    /// Layer or wafer thickness, cm: the finite-thickness correction, and a thin layer's
    /// resistivity; `None` when unknown.
    pub thickness_cm: Option<f64>,
    /// Wafer diameter, cm (thin layers only); `None` for a laterally infinite sample.
    pub diameter_cm: Option<f64>,
    /// Temperature of the reading; `None` when it was taken at 23 C.
    pub temperature: Option<ReadingTemperature>,
}

/// Temperature of a reading and the model that corrects it to 23 C.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ReadingTemperature {
    /// Temperature, C.
    pub temperature_c: f64,
    /// Material of the sample.
    pub material: Material,
    /// Dopant symbol.
    pub dopant: String,
    /// Mobility model of the correction.
    pub mobility: MobilityModel,
}

/// The evaluated reading.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ProbeResult {
    /// Sheet resistance, ohm/sq: always for a thin layer; for a bulk sample only with a
    /// thickness (rho / t).
    pub sheet_resistance_ohm_sq: Option<f64>,
    /// Resistivity, ohm cm (at 23 C when a temperature correction was applied): always for a
    /// bulk sample; for a thin layer only with a thickness (R_s t).
    pub resistivity_ohm_cm: Option<f64>,
    /// The geometry the reading was evaluated for.
    pub geometry: ProbeGeometry,
    /// Every factor applied, by name, in the order applied.
    pub corrections: Vec<CorrectionFactor>,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
}

/// Evaluates a four-point-probe reading.
///
/// # Formula
/// Thin layer: R_s = (pi/ln 2) (V/I) F(t/s) [C_d / (pi/ln 2)], rho = R_s t, where F is
/// [`ThicknessCorrection::thin_sheet_factor`] (1 without a thickness: the thin-layer
/// assumption) and the bracket is [`DiameterCorrection::relative_factor`] when a diameter is
/// given (the two corrections are multiplied, common practice, no source).
/// Bulk: rho = 2 pi s (V/I) C(t/s), C = [`ThicknessCorrection::bulk_factor`] (1 without a
/// thickness: semi-infinite), R_s = rho / t with a thickness.
/// With a thickness both give the same resistivity (the same image series). A temperature
/// correction multiplies both results by [`TemperatureCorrection::factor`].
///
/// # Validity
/// See the individual corrections. Without a thickness a thin layer is taken as much thinner
/// than the spacing and a bulk sample as much thicker; the diameter correction assumes a thin
/// wafer, and a note is added when t/s > 0.5.
///
/// # References
/// Valdes (1954), Uhlir (1955), Smits (1958).
///
/// # Errors
/// Any [`ProbeError`]; [`ProbeError::DiameterOnBulk`] for a diameter on a bulk sample,
/// [`ProbeError::ResistivityNeedsThickness`] for a temperature correction on a thin layer
/// without a thickness.
pub fn evaluate(reading: &ProbeReading) -> Result<ProbeResult, ProbeError> {
    let v_over_i = in_range(
        "volts / amps",
        positive("volts", reading.volts)? / positive("amps", reading.amps)?,
    )?;
    let s = positive("spacing_cm", reading.spacing_cm)?;
    let thickness = match reading.thickness_cm {
        Some(t) => Some((t, thickness_correction(t, s)?)),
        None => None,
    };
    let mut corrections = Vec::new();
    let mut notes = Vec::new();
    let thickness_source = |tc: &ThicknessCorrection| {
        format!(
            "image series, non-conducting faces, t/s = {:.4} (Valdes 1954; Uhlir 1955)",
            tc.thickness_over_spacing
        )
    };
    let (mut sheet, mut rho) = match reading.geometry {
        ProbeGeometry::ThinLayer => {
            let mut sheet = THIN_SHEET_FACTOR * v_over_i;
            match &thickness {
                Some((_, tc)) => {
                    corrections.push(CorrectionFactor {
                        name: "thickness",
                        value: tc.thin_sheet_factor,
                        source: thickness_source(tc),
                    });
                    sheet *= tc.thin_sheet_factor;
                }
                None => notes.push(
                    "thin-layer assumption: the layer is taken as much thinner than the probe \
                     spacing (no thickness correction); the resistivity needs the thickness"
                        .to_owned(),
                ),
            }
            if let Some(d) = reading.diameter_cm {
                let dc = diameter_correction(d, s)?;
                corrections.push(CorrectionFactor {
                    name: "diameter",
                    value: dc.relative_factor,
                    source: format!(
                        "centred probe on a circular thin wafer, d/s = {:.4} (Smits 1958)",
                        dc.diameter_over_spacing
                    ),
                });
                if let Some((_, tc)) = &thickness
                    && tc.thickness_over_spacing > 0.5
                {
                    notes.push(format!(
                        "the diameter correction is for thin wafers; at t/s = {:.3} it is \
                         approximate",
                        tc.thickness_over_spacing
                    ));
                }
                sheet *= dc.relative_factor;
            }
            (Some(sheet), thickness.map(|(t, _)| sheet * t))
        }
        ProbeGeometry::Bulk => {
            if let Some(d) = reading.diameter_cm {
                return Err(ProbeError::DiameterOnBulk { diameter_cm: d });
            }
            let mut rho = 2.0 * PI * s * v_over_i;
            if let Some((_, tc)) = &thickness {
                corrections.push(CorrectionFactor {
                    name: "thickness",
                    value: tc.bulk_factor,
                    source: thickness_source(tc),
                });
                rho *= tc.bulk_factor;
            }
            (thickness.map(|(t, _)| rho / t), Some(rho))
        }
    };
    if let Some(sheet) = sheet {
        in_range("sheet_resistance_ohm_sq", sheet)?;
    }
    if let Some(rho) = rho {
        in_range("resistivity_ohm_cm", rho)?;
    }
    if let Some(rt) = &reading.temperature {
        let Some(at_reading) = rho else {
            return Err(ProbeError::ResistivityNeedsThickness {
                purpose: "the temperature correction",
            });
        };
        let options = PhysicsOptions::with_mobility(rt.mobility);
        let tc = temperature_correction_to_23c(
            &rt.material,
            &rt.dopant,
            at_reading,
            rt.temperature_c,
            &options,
        )?;
        corrections.push(CorrectionFactor {
            name: "temperature",
            value: tc.factor,
            source: format!("to 23 C from {} C: {}", rt.temperature_c, tc.method),
        });
        rho = rho.map(|r| r * tc.factor);
        sheet = sheet.map(|r| r * tc.factor);
    }
    Ok(ProbeResult {
        sheet_resistance_ohm_sq: sheet,
        resistivity_ohm_cm: rho,
        geometry: reading.geometry,
        corrections,
        notes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_layer_far_thicker_than_the_spacing_is_a_semi_infinite_body() {
        for x in [1e6 * (1.0 + f64::EPSILON), 1e60, 1e200] {
            let tc = thickness_correction(x, 1.0).expect("finite ratio");
            assert_eq!(tc.bulk_factor, 1.0, "t/s = {x:e}");
            assert!(tc.thin_sheet_factor.is_finite() && tc.thin_sheet_factor > 0.0);
        }
        // Just below the switch the series gives the same bulk factor to f64 precision.
        let below = thickness_correction(1e6, 1.0).expect("finite ratio");
        assert!(
            (below.bulk_factor - 1.0).abs() <= f64::EPSILON,
            "{}",
            below.bulk_factor
        );
    }

    #[test]
    fn results_beyond_the_float_range_are_refused() {
        let out_of_range = |result: Result<f64, ProbeError>| matches!(result, Err(ProbeError::OutOfRange { value, .. }) if !(value.is_finite() && value > 0.0));
        assert!(out_of_range(sheet_resistance_ohm_sq(
            6e6,
            f64::MIN_POSITIVE
        )));
        assert!(out_of_range(resistivity_from_sheet_ohm_cm(1e-300, 1e-300)));
        assert!(out_of_range(thin_sheet_resistance_ohm_sq(1e300, 1e-300)));
        assert!(out_of_range(semi_infinite_resistivity_ohm_cm(
            1e300, 1e-300, 1.0
        )));
        let reading = ProbeReading {
            volts: 1e-300,
            amps: 1e300,
            spacing_cm: 0.1,
            geometry: ProbeGeometry::Bulk,
            thickness_cm: None,
            diameter_cm: None,
            temperature: None,
        };
        assert!(matches!(
            evaluate(&reading),
            Err(ProbeError::OutOfRange {
                quantity: "volts / amps",
                ..
            })
        ));
        let thick = ProbeReading {
            volts: 1e300,
            amps: 1e-8,
            thickness_cm: Some(0.05),
            ..reading
        };
        assert!(matches!(
            evaluate(&thick),
            Err(ProbeError::OutOfRange {
                quantity: "sheet_resistance_ohm_sq",
                ..
            })
        ));
    }

    #[test]
    fn euler_maclaurin_tail_matches_a_long_direct_sum() {
        // Check of the summation method only: 2e6 direct terms (summed smallest first) plus the
        // leading tail sum_{n>N} 3/(16 x^3 n^3) = 3/(32 x^3 N^2) against the Euler-Maclaurin result.
        let x = 0.7;
        let mut direct = 0.0;
        let n_max = 2_000_000;
        for n in (1..=n_max).rev() {
            direct += image_term(x, n as f64, 0);
        }
        let tail = 3.0 / (32.0 * x * x * x * (n_max as f64) * (n_max as f64));
        approx::assert_relative_eq!(direct + tail, image_sum(x), max_relative = 1e-12);
    }

    #[test]
    fn refuses_bad_geometry() {
        assert!(matches!(
            thickness_correction(0.0, 0.1),
            Err(ProbeError::NotPositive { .. })
        ));
        assert!(matches!(
            diameter_correction(0.17, 0.1),
            Err(ProbeError::DiameterTooSmall { .. })
        ));
        let reading = ProbeReading {
            volts: 0.01,
            amps: 0.001,
            spacing_cm: 0.1,
            geometry: ProbeGeometry::Bulk,
            thickness_cm: None,
            diameter_cm: Some(15.0),
            temperature: None,
        };
        assert!(matches!(
            evaluate(&reading),
            Err(ProbeError::DiameterOnBulk { .. })
        ));
        let warm_layer = ProbeReading {
            geometry: ProbeGeometry::ThinLayer,
            diameter_cm: None,
            temperature: Some(ReadingTemperature {
                temperature_c: 30.0,
                material: crate::materials::silicon(),
                dopant: "B".to_owned(),
                mobility: MobilityModel::Masetti,
            }),
            ..reading
        };
        assert!(matches!(
            evaluate(&warm_layer),
            Err(ProbeError::ResistivityNeedsThickness { .. })
        ));
    }
}
