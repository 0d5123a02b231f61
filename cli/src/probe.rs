//! `bandgauge probe`: a four-point-probe reading to sheet resistance and resistivity, and with a dopant to a density with its interval.

use std::io::Write;

use bandgauge_core::compare::{ConversionError, ConversionModel};
use bandgauge_core::constants::ZERO_CELSIUS_K;
use bandgauge_core::empirical::EMPIRICAL_TEMPERATURE_K;
use bandgauge_core::materials::Material;
use bandgauge_core::mobility::{ConductivityType, MobilityModel};
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::probe::{
    self, ProbeError, ProbeGeometry, ProbeReading, ProbeResult, ReadingTemperature,
};
use bandgauge_core::uncertainty::{
    self, Interval, Measured, MeasuredInput, UncertaintyError, UncertaintyRequest,
};
use bandgauge_core::units::QuantityKind;
use serde_json::{Map, Value, json};

use crate::args::ProbeArgs;
use crate::error::{BadInput, CliError};
use crate::output::{self, Table};
use crate::request::{self, measured};

/// The sample's dopant, for the temperature correction and the density.
#[derive(Debug, Clone)]
pub struct Sample {
    /// The material.
    pub material: Material,
    /// Dopant symbol as the material spells it.
    pub dopant: String,
    /// n or p.
    pub conductivity_type: ConductivityType,
    /// Model of the density conversion.
    pub model: ConversionModel,
}

/// A validated `probe` request.
#[derive(Debug, Clone)]
pub struct ProbeRequest {
    /// The reading, with the temperature correction when a temperature was given.
    pub reading: ProbeReading,
    /// Voltage, V, with its uncertainty.
    pub volts: Measured,
    /// Current, A, with its uncertainty.
    pub amps: Measured,
    /// Probe spacing, cm, with its uncertainty.
    pub spacing_cm: Measured,
    /// Thickness, cm, with its uncertainty.
    pub thickness_cm: Option<Measured>,
    /// Wafer temperature, K, with its uncertainty (23 C when not given).
    pub temperature_k: Measured,
    /// The dopant, when given.
    pub sample: Option<Sample>,
    /// JSON instead of the table.
    pub json: bool,
}

impl ProbeRequest {
    /// Validates the raw arguments.
    ///
    /// # Errors
    /// [`BadInput`] naming the first refused argument.
    pub fn from_args(args: &ProbeArgs) -> Result<ProbeRequest, BadInput> {
        use QuantityKind::{Current, Length, Voltage};
        // Each length or electrical value is > 0, with its uncertainty in `<option>-uncertainty`.
        let read = |argument, text, uncertainty: &Option<String>, kind| {
            request::positive_measured(argument, text, uncertainty.as_deref(), kind)
        };
        let volts = read("--volts", &args.volts, &args.volts_uncertainty, Voltage)?;
        let amps = read("--amps", &args.amps, &args.amps_uncertainty, Current)?;
        let spacing_cm = read(
            "--spacing",
            &args.spacing,
            &args.spacing_uncertainty,
            Length,
        )?;
        let geometry = ProbeGeometry::from_id(&args.geometry).ok_or_else(|| {
            BadInput::new(
                "--geometry",
                format!(
                    "{:?} is not a sample geometry; allowed: thin-layer (sheet resistance of a \
                     layer or thin wafer; resistivity with --thickness) or bulk (semi-infinite \
                     sample: resistivity)",
                    args.geometry
                ),
            )
        })?;
        if geometry == ProbeGeometry::Bulk && args.diameter.is_some() {
            return Err(BadInput::new(
                "--diameter",
                "the diameter correction (Smits 1958) is for a thin layer or wafer, not a bulk \
                 sample; leave --diameter out or use --geometry thin-layer",
            ));
        }
        let thickness_cm = match &args.thickness {
            Some(text) => Some(read(
                "--thickness",
                text,
                &args.thickness_uncertainty,
                Length,
            )?),
            None => None,
        };
        let diameter_cm = match &args.diameter {
            Some(text) => Some(request::positive("--diameter", text, QuantityKind::Length)?),
            None => None,
        };
        let temperature_c = match &args.temperature_c {
            Some(text) => {
                Some(request::temperature_c_in_k("--temperature-c", text)? - ZERO_CELSIUS_K)
            }
            None => None,
        };
        let temperature_k = measured(
            temperature_c.map_or(EMPIRICAL_TEMPERATURE_K, |c| c + ZERO_CELSIUS_K),
            "--temperature-uncertainty",
            args.temperature_uncertainty.as_deref(),
            QuantityKind::Temperature,
        )?;
        let sample = match &args.dopant {
            Some(symbol) => Some(sample(args, symbol, temperature_k.value)?),
            None => None,
        };
        let temperature = match (temperature_c, &sample) {
            (Some(temperature_c), Some(sample)) => Some(ReadingTemperature {
                temperature_c,
                material: sample.material.clone(),
                dopant: sample.dopant.clone(),
                mobility: correction_mobility(sample, temperature_k.value)?,
            }),
            _ => None,
        };
        if geometry == ProbeGeometry::ThinLayer && args.thickness.is_none() && args.dopant.is_some()
        {
            return Err(BadInput::new(
                "--dopant",
                "a dopant density needs the resistivity, which a thin layer gives only with its \
                 thickness: add --thickness, or --geometry bulk for a bulk sample",
            ));
        }
        Ok(ProbeRequest {
            reading: ProbeReading {
                volts: volts.value,
                amps: amps.value,
                spacing_cm: spacing_cm.value,
                geometry,
                thickness_cm: thickness_cm.map(|t| t.value),
                diameter_cm,
                temperature,
            },
            volts,
            amps,
            spacing_cm,
            thickness_cm,
            temperature_k,
            sample,
            json: args.json,
        })
    }
}

fn sample(args: &ProbeArgs, symbol: &str, temperature_k: f64) -> Result<Sample, BadInput> {
    let material = request::material("--material", &args.material)?;
    let dopant = material
        .dopant(symbol)
        .map_err(|error| request::material_error("--dopant", &error))?;
    let conductivity_type = match dopant.kind {
        bandgauge_core::materials::DopantKind::Donor => ConductivityType::N,
        bandgauge_core::materials::DopantKind::Acceptor => ConductivityType::P,
    };
    let dopant = dopant.symbol.to_string();
    let model = match &args.model {
        Some(id) => request::covering_model(
            ConversionModel::from_id(id)
                .map_err(|error| BadInput::new("--model", error_text(&error)))?,
            id,
            &material,
            &dopant,
        )?,
        None => {
            ConversionModel::default_for(&material.id, &dopant, temperature_k).ok_or_else(|| {
                let models = request::models_covering(&material, &dopant);
                if models.is_empty() {
                    BadInput::new(
                        "--dopant",
                        format!("no conversion model covers {dopant} in {}", material.id),
                    )
                } else {
                    BadInput::new(
                        "--temperature-c",
                        format!(
                            "{} C is outside the range of every model for {dopant} in {} that \
                             could be chosen by default; name one with --model ({})",
                            output::temperature(temperature_k - ZERO_CELSIUS_K),
                            material.id,
                            models.join(", ")
                        ),
                    )
                }
            })?
        }
    };
    Ok(Sample {
        material,
        dopant,
        conductivity_type,
        model,
    })
}

/// The mobility model of the temperature correction: the one named with --model when
/// it is a physics model, else the first impurity-aware model that covers the dopant
/// at the reading's temperature (the order the core's comparison uses).
fn correction_mobility(sample: &Sample, temperature_k: f64) -> Result<MobilityModel, BadInput> {
    if let ConversionModel::Physics(mobility) = sample.model {
        return Ok(mobility);
    }
    [
        MobilityModel::Masetti,
        MobilityModel::Arora,
        MobilityModel::CaugheyThomas,
    ]
    .into_iter()
    .find(|m| {
        m.applicable(&sample.material.id, &sample.dopant)
            && m.temperature_range_k(&sample.material.id)
                .is_some_and(|(lo, hi)| (lo..=hi).contains(&temperature_k))
    })
    .ok_or_else(|| {
        BadInput::new(
            "--temperature-c",
            format!(
                "no mobility model covers {} in {} at {temperature_k} K, so the reading cannot \
                     be corrected to 23 C",
                sample.dopant, sample.material.id
            ),
        )
    })
}

/// A core message without its leading field name (the argument is named instead).
fn error_text(error: &dyn std::fmt::Display) -> String {
    request::without_field_name(&error.to_string()).to_owned()
}

fn probe_error(error: ProbeError) -> BadInput {
    let argument = match &error {
        ProbeError::NotPositive { field, .. } => match *field {
            "volts" => "--volts",
            "amps" => "--amps",
            "thickness_cm" | "thickness_cm / spacing_cm" => "--thickness",
            "diameter_cm" => "--diameter",
            "resistivity_ohm_cm" => "--volts",
            _ => "--spacing",
        },
        ProbeError::DiameterTooSmall { .. } | ProbeError::DiameterOnBulk { .. } => "--diameter",
        ProbeError::ResistivityNeedsThickness { .. } => "--thickness",
        // The voltage over the current sets the scale of every result.
        ProbeError::OutOfRange { .. } => "--volts",
        _ => "--temperature-c",
    };
    BadInput::new(argument, error_text(&error))
}

fn uncertainty_error(error: UncertaintyError) -> BadInput {
    match error {
        UncertaintyError::Probe(error) => probe_error(error),
        UncertaintyError::Conversion { at, error } if at == "value" => conversion_error(&error),
        other => request::uncertainty_refusal(other, uncertainty_argument, "--volts-uncertainty"),
    }
}

fn conversion_error(error: &ConversionError) -> BadInput {
    let argument = match error {
        ConversionError::EmpiricalTemperature { .. } => "--temperature-c",
        ConversionError::UnknownModel { .. } | ConversionError::NotApplicable { .. } => "--model",
        ConversionError::NoApplicableModel { .. } | ConversionError::Dopant(_) => "--dopant",
        _ => "--volts",
    };
    let message = if argument == "--volts" {
        format!("the reading's resistivity cannot be converted: {error}")
    } else {
        error_text(error)
    };
    BadInput::new(argument, message)
}

fn uncertainty_argument(field: &str) -> &'static str {
    match field {
        "volts" => "--volts-uncertainty",
        "amps" => "--amps-uncertainty",
        "spacing_cm" => "--spacing-uncertainty",
        "thickness_cm" => "--thickness-uncertainty",
        _ => "--temperature-uncertainty",
    }
}

/// Runs the request, writing to `out`.
///
/// # Errors
/// [`CliError::BadInput`] when the core refuses the reading; [`CliError::Failure`] on write errors.
pub fn run(request: &ProbeRequest, out: &mut impl Write) -> Result<(), CliError> {
    let result = probe::evaluate(&request.reading).map_err(probe_error)?;
    let interval = match &request.sample {
        Some(sample) => Some(
            uncertainty::propagate(&UncertaintyRequest {
                material: sample.material.clone(),
                dopant: sample.dopant.clone(),
                input: MeasuredInput::Probe {
                    volts: request.volts,
                    amps: request.amps,
                    spacing_cm: request.spacing_cm,
                    geometry: request.reading.geometry,
                    thickness_cm: request.thickness_cm,
                    diameter_cm: request.reading.diameter_cm,
                },
                temperature_k: request.temperature_k,
                model: sample.model,
                solve: SolveOptions::default(),
                include_model_spread: true,
            })
            .map_err(uncertainty_error)?,
        ),
        None => None,
    };
    if request.json {
        writeln!(
            out,
            "{}",
            serde_json::to_string_pretty(&to_json(request, &result, interval.as_ref())?)?
        )?;
    } else {
        write!(out, "{}", table(request, &result, interval.as_ref()))?;
    }
    Ok(())
}

fn to_json(
    request: &ProbeRequest,
    result: &ProbeResult,
    interval: Option<&Interval>,
) -> Result<Value, serde_json::Error> {
    let r = &request.reading;
    let corrections: Map<String, Value> = result
        .corrections
        .iter()
        .map(|c| {
            (
                c.name.to_owned(),
                json!({ "factor": c.value, "source": c.source }),
            )
        })
        .collect();
    let mut value = json!({
        "volts": r.volts,
        "amps": r.amps,
        "spacing_cm": r.spacing_cm,
        "thickness_cm": r.thickness_cm,
        "diameter_cm": r.diameter_cm,
        "temperature_c": r.temperature.as_ref().map(|t| t.temperature_c),
        "geometry": result.geometry,
        "geometry_meaning": result.geometry.describe(),
        "sheet_resistance_ohm_sq": result.sheet_resistance_ohm_sq,
        "resistivity_ohm_cm": result.resistivity_ohm_cm,
        "corrections": corrections,
        "notes": result.notes,
        "caution": caution(result, request.sample.as_ref()),
    });
    if let (Some(sample), Some(interval), Value::Object(map)) =
        (&request.sample, interval, &mut value)
    {
        map.insert("material".into(), json!(sample.material.id));
        map.insert("dopant".into(), json!(sample.dopant));
        map.insert(
            "type".into(),
            serde_json::to_value(sample.conductivity_type)?,
        );
        map.insert("model".into(), serde_json::to_value(sample.model)?);
        map.insert("density_cm3".into(), json!(interval.value));
        map.insert("interval".into(), serde_json::to_value(interval)?);
    }
    Ok(value)
}

fn caution(result: &ProbeResult, sample: Option<&Sample>) -> String {
    let mut models = vec![format!(
        "four-point probe on a {}",
        result.geometry.describe()
    )];
    for c in &result.corrections {
        models.push(format!("{} correction as listed", c.name));
    }
    if let Some(sample) = sample {
        models.push(format!("density by {}", sample.model.id()));
    }
    output::caution(&models.join("; "))
}

fn table(request: &ProbeRequest, result: &ProbeResult, interval: Option<&Interval>) -> String {
    let r = &request.reading;
    let mut heading = format!(
        "Four-point probe: V {} V, I {} A, spacing {} cm",
        output::number(r.volts),
        output::number(r.amps),
        output::number(r.spacing_cm)
    );
    if let Some(t) = r.thickness_cm {
        heading.push_str(&format!(", thickness {} cm", output::number(t)));
    }
    if let Some(d) = r.diameter_cm {
        heading.push_str(&format!(", diameter {} cm", output::number(d)));
    }
    if let Some(t) = &r.temperature {
        heading.push_str(&format!(", at {} C", output::temperature(t.temperature_c)));
    }
    let mut text = format!("{heading}\n\n");
    let mut values = Table::new(&["result", "value", "unit"], &[false, true, false]);
    values.value_row("V/I", r.volts / r.amps, "ohm");
    if let Some(sheet) = result.sheet_resistance_ohm_sq {
        values.value_row("sheet resistance", sheet, "ohm/sq");
    }
    let at = if r.temperature.is_some() {
        "resistivity at 23 C"
    } else {
        "resistivity"
    };
    if let Some(rho) = result.resistivity_ohm_cm {
        values.value_row(at, rho, "ohm-cm");
    }
    if let (Some(sample), Some(interval)) = (&request.sample, interval) {
        values.value_row(
            format!("{} density", sample.dopant),
            interval.value,
            "cm^-3",
        );
        values.value_row("density interval low", interval.low, "cm^-3");
        values.value_row("density interval high", interval.high, "cm^-3");
    }
    text.push_str(&values.render());
    text.push_str(&format!(
        "  geometry: {} ({})\n",
        result.geometry,
        result.geometry.describe()
    ));
    if let (Some(sample), Some(interval)) = (&request.sample, interval) {
        text.push_str(&format!(
            "  density model: {} ({}-type), interval driven by: {}\n",
            sample.model.id(),
            sample.conductivity_type.as_str(),
            interval.dominant
        ));
    }
    if !result.corrections.is_empty() {
        text.push_str("\nCorrections applied\n");
        let mut corrections =
            Table::new(&["correction", "factor", "source"], &[false, true, false]);
        for c in &result.corrections {
            corrections.row([c.name.to_owned(), output::number(c.value), c.source.clone()]);
        }
        text.push_str(&corrections.render());
    }
    if let Some(interval) = interval {
        text.push_str("\nInterval contributions (density)\n");
        let mut contributions =
            Table::new(&["source", "half-width %", "remark"], &[false, true, false]);
        for k in &interval.contributions {
            contributions.row([
                k.source.clone(),
                output::number(100.0 * k.relative_half_width),
                k.note.clone().unwrap_or_default(),
            ]);
        }
        text.push_str(&contributions.render());
    }
    text.push_str(&output::closing(
        result
            .notes
            .iter()
            .chain(interval.iter().flat_map(|i| &i.notes)),
        &caution(result, request.sample.as_ref()),
    ));
    text
}
