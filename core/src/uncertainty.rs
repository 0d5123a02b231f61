//! Propagation of measurement uncertainties and model spread into an interval on the converted
//! density (or resistivity), with each contribution and the dominant one.
//!
//! # Public API
//! - Inputs: [`Tolerance`] (absolute or relative half-width), [`Measured`] (value and optional
//!   tolerance), [`MeasuredInput`] (a resistivity, a density, or a probe reading V, I, s, t, d).
//! - [`UncertaintyRequest`] and [`propagate`] -> [`Interval`] with its [`Contribution`]s.
//! - [`one_at_a_time`] -> [`OutputInterval`]s: the same first-order method for any chain of
//!   positive outputs (the van der Pauw and Hall analysis uses it for R_s, n and mu).
//! - [`UncertaintyError`].
//!
//! # Method
//! First order, one input at a time, through the real model chain: for input x_i with half-width
//! u_i the output y is evaluated at x_i - u_i and x_i + u_i with every other input at its value
//! (central finite differences at the stated width, so curvature over that width is kept), and
//! the relative half-width is d_i = |ln y(x_i + u_i) - ln y(x_i - u_i)| / 2. Independent
//! inputs are combined in quadrature, d = sqrt(sum d_i^2) (as in the GUM's law of propagation,
//! JCGM 100:2008, applied to ln y). The model spread is not a random error: the interval is the
//! envelope [min over models, max over models] (which contains the chosen model's value) widened
//! by exp(-d) and exp(+d). The half-widths are whatever coverage the user states (e.g. 95 %);
//! the interval has that same coverage for the measurement part.

use std::fmt;

use serde::Serialize;

use crate::compare::{self, ConversionError, ConversionInput, ConversionModel};
use crate::materials::Material;
use crate::neutrality::SolveOptions;
use crate::probe::{self, ProbeError, ProbeGeometry, ProbeReading};

/// A half-width of uncertainty.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Tolerance {
    /// In the unit of the value.
    Absolute(f64),
    /// As a fraction of the value (0.01 = 1 %).
    Relative(f64),
}

/// A measured value with an optional half-width.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Measured {
    /// The value.
    pub value: f64,
    /// Its half-width, if known.
    pub tolerance: Option<Tolerance>,
}

impl Measured {
    /// A value with no stated uncertainty.
    pub fn exact(value: f64) -> Measured {
        Measured {
            value,
            tolerance: None,
        }
    }

    /// A value with an absolute half-width.
    pub fn absolute(value: f64, half_width: f64) -> Measured {
        Measured {
            value,
            tolerance: Some(Tolerance::Absolute(half_width)),
        }
    }

    /// A value with a relative half-width.
    pub fn relative(value: f64, fraction: f64) -> Measured {
        Measured {
            value,
            tolerance: Some(Tolerance::Relative(fraction)),
        }
    }

    /// The half-width to perturb by: `None` when it is zero; refused when it reaches the value
    /// (value - half-width would not be a valid input).
    fn perturbation(&self, field: &'static str) -> Result<Option<f64>, UncertaintyError> {
        let u = self.half_width(field)?;
        if u == 0.0 {
            return Ok(None);
        }
        if u >= self.value.abs() {
            return Err(UncertaintyError::ToleranceTooLarge {
                field,
                value: self.value,
                half_width: u,
            });
        }
        Ok(Some(u))
    }

    /// The absolute half-width (0 when none is stated).
    fn half_width(&self, field: &'static str) -> Result<f64, UncertaintyError> {
        let u = match self.tolerance {
            None => return Ok(0.0),
            Some(Tolerance::Absolute(u)) => u,
            Some(Tolerance::Relative(r)) => r * self.value.abs(),
        };
        if !(u.is_finite() && u >= 0.0) {
            return Err(UncertaintyError::InvalidTolerance { field, value: u });
        }
        Ok(u)
    }
}

/// What the user measured.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum MeasuredInput {
    /// A resistivity, ohm cm: the interval is on the density.
    Resistivity(Measured),
    /// A dopant density, cm^-3: the interval is on the resistivity.
    Density(Measured),
    /// A four-point-probe reading: the interval is on the density.
    Probe {
        /// Voltage, V.
        volts: Measured,
        /// Current, A.
        amps: Measured,
        /// Probe spacing, cm.
        spacing_cm: Measured,
        /// The sample geometry.
        geometry: ProbeGeometry,
        /// Thickness, cm (`None`: unknown; a thin layer then has no resistivity and is
        /// refused).
        thickness_cm: Option<Measured>,
        /// Wafer diameter, cm (taken as exact).
        diameter_cm: Option<f64>,
    },
}

/// Everything [`propagate`] needs.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UncertaintyRequest {
    /// The material.
    pub material: Material,
    /// Dopant symbol.
    pub dopant: String,
    /// The measurement.
    pub input: MeasuredInput,
    /// Sample temperature, K, with its half-width.
    pub temperature_k: Measured,
    /// The model the central value comes from.
    pub model: ConversionModel,
    /// Neutrality-solver options of the physics models.
    pub solve: SolveOptions,
    /// Whether to widen the interval by the spread of all applicable models.
    pub include_model_spread: bool,
}

/// One contribution to the interval.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Contribution {
    /// What it comes from: an input field name or "model spread".
    pub source: String,
    /// Relative half-width it causes on the output (0.02 = 2 %).
    pub relative_half_width: f64,
    /// Output at the low end of this contribution alone.
    pub low: f64,
    /// Output at the high end of this contribution alone.
    pub high: f64,
    /// How it was obtained, when not the plain one-at-a-time evaluation.
    pub note: Option<String>,
}

/// The interval on the converted quantity.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Interval {
    /// "density_cm3" or "resistivity_ohm_cm".
    pub quantity: &'static str,
    /// Central value from the chosen model.
    pub value: f64,
    /// Lower end.
    pub low: f64,
    /// Upper end.
    pub high: f64,
    /// The resistivity the measurement gives (probe readings) or was given, ohm cm, at the
    /// sample temperature.
    pub resistivity_ohm_cm: Option<f64>,
    /// The chosen model.
    pub model: ConversionModel,
    /// Every contribution, measurement inputs first, then the model spread.
    pub contributions: Vec<Contribution>,
    /// Source of the largest contribution ("none" if all are zero).
    pub dominant: String,
    /// Combined measurement half-width (quadrature), relative.
    pub measurement_relative_half_width: f64,
    /// The method, in words.
    pub method: &'static str,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
}

const METHOD: &str = "first order, one input at a time: output evaluated at value -/+ half-width \
                      through the full model chain; inputs combined in quadrature on ln(output); \
                      model spread added as an envelope";

/// Why no interval was given.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum UncertaintyError {
    /// A half-width is negative or not finite.
    InvalidTolerance {
        /// Field.
        field: &'static str,
        /// The absolute half-width it gives.
        value: f64,
    },
    /// A half-width reaches the value itself, so value - half-width is not a valid input.
    ToleranceTooLarge {
        /// Field.
        field: &'static str,
        /// The value.
        value: f64,
        /// The half-width.
        half_width: f64,
    },
    /// The probe evaluation refused.
    Probe(ProbeError),
    /// The conversion refused (at the value or at an end of an input's range).
    Conversion {
        /// Which evaluation: "value" or "`<field> low` or `<field> high`".
        at: String,
        /// The refusal.
        error: ConversionError,
    },
}

impl fmt::Display for UncertaintyError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            UncertaintyError::InvalidTolerance { field, value } => write!(
                f,
                "{field} uncertainty: {value} is not allowed; give a finite half-width >= 0"
            ),
            UncertaintyError::ToleranceTooLarge {
                field,
                value,
                half_width,
            } => write!(
                f,
                "{field} uncertainty: {half_width} is not allowed for the value {value}; give a \
                 half-width smaller than the value"
            ),
            UncertaintyError::Probe(e) => e.fmt(f),
            UncertaintyError::Conversion { at, error } => {
                if at == "value" {
                    error.fmt(f)
                } else {
                    write!(f, "at the {at} end of its uncertainty: {error}")
                }
            }
        }
    }
}

impl std::error::Error for UncertaintyError {}

/// The inputs as plain numbers, perturbed one at a time.
#[derive(Debug, Clone, Copy)]
struct Point {
    primary: f64,
    volts: f64,
    amps: f64,
    spacing_cm: f64,
    thickness_cm: Option<f64>,
    temperature_k: f64,
}

/// Which input a perturbation moves.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Field {
    Primary,
    Volts,
    Amps,
    Spacing,
    Thickness,
    Temperature,
}

impl Point {
    fn with(mut self, field: Field, value: f64) -> Point {
        match field {
            Field::Primary => self.primary = value,
            Field::Volts => self.volts = value,
            Field::Amps => self.amps = value,
            Field::Spacing => self.spacing_cm = value,
            Field::Thickness => self.thickness_cm = Some(value),
            Field::Temperature => self.temperature_k = value,
        }
        self
    }
}

/// An interval on the converted quantity from the uncertainties of the inputs and the model
/// spread.
///
/// # Formula
/// See the module documentation: d_i = |ln y(x_i + u_i) - ln y(x_i - u_i)|/2,
/// d = sqrt(sum d_i^2), [low, high] = [min(y, y_models) e^-d, max(y, y_models) e^d].
///
/// # Validity
/// First order in each input (interactions between inputs are neglected); the models' ranges
/// must hold at both ends of every input's range. The empirical relation has no temperature
/// dependence: its temperature contribution is the sensitivity of the default physics model
/// (labelled in the contribution's note).
///
/// # References
/// JCGM 100:2008 (GUM), section 5.1 (law of propagation of uncertainty).
///
/// # Errors
/// [`UncertaintyError::InvalidTolerance`], [`UncertaintyError::ToleranceTooLarge`],
/// [`UncertaintyError::Probe`], [`UncertaintyError::Conversion`].
pub fn propagate(request: &UncertaintyRequest) -> Result<Interval, UncertaintyError> {
    let r = request;
    let mut inputs: Vec<(Field, &'static str, Measured)> = Vec::new();
    let (primary, quantity) = match &r.input {
        MeasuredInput::Resistivity(m) => {
            inputs.push((Field::Primary, "resistivity_ohm_cm", *m));
            (m.value, "density_cm3")
        }
        MeasuredInput::Density(m) => {
            inputs.push((Field::Primary, "density_cm3", *m));
            (m.value, "resistivity_ohm_cm")
        }
        MeasuredInput::Probe {
            volts,
            amps,
            spacing_cm,
            thickness_cm,
            ..
        } => {
            inputs.push((Field::Volts, "volts", *volts));
            inputs.push((Field::Amps, "amps", *amps));
            inputs.push((Field::Spacing, "spacing_cm", *spacing_cm));
            if let Some(t) = thickness_cm {
                inputs.push((Field::Thickness, "thickness_cm", *t));
            }
            (f64::NAN, "density_cm3")
        }
    };
    inputs.push((Field::Temperature, "temperature_k", r.temperature_k));
    let (volts, amps, spacing_cm, thickness_cm) = match &r.input {
        MeasuredInput::Probe {
            volts,
            amps,
            spacing_cm,
            thickness_cm,
            ..
        } => (
            volts.value,
            amps.value,
            spacing_cm.value,
            thickness_cm.map(|t| t.value),
        ),
        _ => (f64::NAN, f64::NAN, f64::NAN, None),
    };
    let nominal = Point {
        primary,
        volts,
        amps,
        spacing_cm,
        thickness_cm,
        temperature_k: r.temperature_k.value,
    };

    let (value, resistivity) = output(r, &nominal, r.model, "value")?;
    let mut notes = Vec::new();
    let mut contributions = Vec::new();
    for (field, name, measured) in inputs {
        let Some(u) = measured.perturbation(name)? else {
            continue;
        };
        let (low_point, high_point) = (
            nominal.with(field, measured.value - u),
            nominal.with(field, measured.value + u),
        );
        let empirical_temperature =
            field == Field::Temperature && r.model == ConversionModel::Empirical;
        let (y_low, y_high, note) = if empirical_temperature {
            empirical_temperature_ends(r, &nominal, value, &low_point, &high_point, name)?
        } else {
            (
                output(r, &low_point, r.model, &format!("{name} low"))?.0,
                output(r, &high_point, r.model, &format!("{name} high"))?.0,
                None,
            )
        };
        contributions.push(Contribution {
            source: name.to_string(),
            relative_half_width: 0.5 * (y_high.ln() - y_low.ln()).abs(),
            low: y_low.min(y_high),
            high: y_low.max(y_high),
            note,
        });
    }
    let measurement = contributions
        .iter()
        .map(|c| c.relative_half_width * c.relative_half_width)
        .sum::<f64>()
        .sqrt();

    let (mut low, mut high) = (value, value);
    if r.include_model_spread {
        let input = match &r.input {
            MeasuredInput::Density(_) => ConversionInput::DensityCm3(primary),
            _ => ConversionInput::ResistivityOhmCm(resistivity),
        };
        let comparison = compare::compare(
            &r.material,
            &r.dopant,
            input,
            r.temperature_k.value,
            &r.solve,
        )
        .map_err(|error| UncertaintyError::Conversion {
            at: "value".into(),
            error,
        })?;
        if let Some(s) = &comparison.spread {
            low = low.min(s.lowest);
            high = high.max(s.highest);
            contributions.push(Contribution {
                source: "model spread".to_string(),
                relative_half_width: 0.5 * (high / low).ln(),
                low,
                high,
                note: Some(format!(
                    "{} models at {} K: lowest {}, highest {}",
                    s.models,
                    r.temperature_k.value,
                    s.lowest_model.id(),
                    s.highest_model.id()
                )),
            });
        } else {
            notes.push("fewer than two models apply here: no model spread".to_string());
        }
    }
    let dominant = contributions
        .iter()
        .filter(|c| c.relative_half_width > 0.0)
        .max_by(|a, b| a.relative_half_width.total_cmp(&b.relative_half_width))
        .map_or_else(|| "none".to_string(), |c| c.source.clone());
    Ok(Interval {
        quantity,
        value,
        low: low * (-measurement).exp(),
        high: high * measurement.exp(),
        resistivity_ohm_cm: match &r.input {
            MeasuredInput::Density(_) => None,
            _ => Some(resistivity),
        },
        model: r.model,
        contributions,
        dominant,
        measurement_relative_half_width: measurement,
        method: METHOD,
        notes,
    })
}

/// The interval on one output of [`one_at_a_time`].
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OutputInterval {
    /// Output name, e.g. "sheet_resistance_ohm_sq".
    pub quantity: &'static str,
    /// Value at the inputs as given.
    pub value: f64,
    /// value e^-d.
    pub low: f64,
    /// value e^d.
    pub high: f64,
    /// d = sqrt(sum d_i^2), relative.
    pub relative_half_width: f64,
    /// Each input's share, in input order (inputs without a half-width are left out).
    pub contributions: Vec<Contribution>,
    /// Source of the largest contribution ("none" if all are zero).
    pub dominant: String,
}

/// Intervals on positive outputs from the half-widths of the inputs, one input at a time.
///
/// # Formula
/// For input x_i with half-width u_i, each output y_k is evaluated at x_i - u_i and x_i + u_i
/// with the other inputs at their values; d_ik = |ln y_k(x_i + u_i) - ln y_k(x_i - u_i)|/2,
/// d_k = sqrt(sum_i d_ik^2), [low, high] = [y_k e^-d_k, y_k e^d_k]. Outputs enter by their
/// magnitude.
///
/// # Validity
/// First order in each input, independent inputs (as [`propagate`]).
///
/// # References
/// JCGM 100:2008 (GUM), section 5.1.
///
/// # Errors
/// [`UncertaintyError::InvalidTolerance`], [`UncertaintyError::ToleranceTooLarge`] (converted
/// into `E`), and whatever `evaluate` returns.
pub fn one_at_a_time<E: From<UncertaintyError>>(
    inputs: &[(&'static str, Measured)],
    outputs: &[&'static str],
    evaluate: impl Fn(&[f64]) -> Result<Vec<f64>, E>,
) -> Result<Vec<OutputInterval>, E> {
    let nominal: Vec<f64> = inputs.iter().map(|(_, m)| m.value).collect();
    let values = evaluate(&nominal)?;
    let mut contributions: Vec<Vec<Contribution>> = vec![Vec::new(); outputs.len()];
    for (index, (name, measured)) in inputs.iter().enumerate() {
        let Some(u) = measured.perturbation(name)? else {
            continue;
        };
        let mut point = nominal.clone();
        point[index] = measured.value - u;
        let low = evaluate(&point)?;
        point[index] = measured.value + u;
        let high = evaluate(&point)?;
        for (k, list) in contributions.iter_mut().enumerate() {
            let (l, h) = (low[k].abs(), high[k].abs());
            list.push(Contribution {
                source: (*name).to_string(),
                relative_half_width: 0.5 * (h.ln() - l.ln()).abs(),
                low: l.min(h),
                high: l.max(h),
                note: None,
            });
        }
    }
    Ok(outputs
        .iter()
        .zip(values)
        .zip(contributions)
        .map(|((quantity, value), contributions)| {
            let d = contributions
                .iter()
                .map(|c| c.relative_half_width * c.relative_half_width)
                .sum::<f64>()
                .sqrt();
            let dominant = contributions
                .iter()
                .filter(|c| c.relative_half_width > 0.0)
                .max_by(|a, b| a.relative_half_width.total_cmp(&b.relative_half_width))
                .map_or_else(|| "none".to_string(), |c| c.source.clone());
            let magnitude = value.abs();
            OutputInterval {
                quantity,
                value,
                low: magnitude * (-d).exp(),
                high: magnitude * d.exp(),
                relative_half_width: d,
                contributions,
                dominant,
            }
        })
        .collect())
}

/// The converted output at `p` and the resistivity at the sample temperature (the input one for
/// a resistivity, the probe's for a reading, the output for a density).
fn output(
    r: &UncertaintyRequest,
    p: &Point,
    model: ConversionModel,
    at: &str,
) -> Result<(f64, f64), UncertaintyError> {
    let input = match &r.input {
        MeasuredInput::Resistivity(_) => ConversionInput::ResistivityOhmCm(p.primary),
        MeasuredInput::Density(_) => ConversionInput::DensityCm3(p.primary),
        MeasuredInput::Probe {
            diameter_cm,
            geometry,
            ..
        } => {
            let reading = ProbeReading {
                volts: p.volts,
                amps: p.amps,
                spacing_cm: p.spacing_cm,
                geometry: *geometry,
                thickness_cm: p.thickness_cm,
                diameter_cm: *diameter_cm,
                temperature: None,
            };
            let result = probe::evaluate(&reading).map_err(UncertaintyError::Probe)?;
            let rho = result.resistivity_ohm_cm.ok_or(UncertaintyError::Probe(
                ProbeError::ResistivityNeedsThickness {
                    purpose: "the dopant density",
                },
            ))?;
            ConversionInput::ResistivityOhmCm(rho)
        }
    };
    let c = compare::convert(
        &r.material,
        &r.dopant,
        input,
        p.temperature_k,
        model,
        &r.solve,
    )
    .map_err(|error| UncertaintyError::Conversion {
        at: at.to_string(),
        error,
    })?;
    Ok(match input {
        ConversionInput::ResistivityOhmCm(rho) => (c.density_cm3, rho),
        ConversionInput::DensityCm3(_) => (c.resistivity_ohm_cm, c.resistivity_ohm_cm),
    })
}

/// Temperature ends for the empirical relation: it has no temperature dependence, so the
/// relative change the default physics model shows between T - u and T + u is applied to the
/// empirical value.
fn empirical_temperature_ends(
    r: &UncertaintyRequest,
    nominal: &Point,
    value: f64,
    low_point: &Point,
    high_point: &Point,
    name: &'static str,
) -> Result<(f64, f64, Option<String>), UncertaintyError> {
    let Some(physics) = compare::default_physics(&r.material.id, &r.dopant, nominal.temperature_k)
    else {
        return Ok((
            value,
            value,
            Some("no physics model applies: temperature sensitivity not evaluated".to_string()),
        ));
    };
    let model = ConversionModel::Physics(physics);
    let centre = output(r, nominal, model, "value")?.0;
    let low = output(r, low_point, model, &format!("{name} low"))?.0;
    let high = output(r, high_point, model, &format!("{name} high"))?.0;
    Ok((
        value * low / centre,
        value * high / centre,
        Some(format!(
            "the empirical relation has no temperature dependence; sensitivity taken from the \
             physics model with {} mobility",
            physics.id()
        )),
    ))
}
