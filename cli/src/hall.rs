//! `bandgauge hall`: van der Pauw readings to sheet resistance, and with a Hall voltage to
//! carrier type, density and mobility, with intervals and the cross-check against the doping
//! conversion.

use std::io::Write;

use bandgauge_core::hall::{
    self, CrossCheck, HallError, HallReading, HallResult, HallVoltage, MeasuredHall,
    MeasuredStructure, ScatteringFactor,
};
use bandgauge_core::materials::{DopantKind, Material};
use bandgauge_core::mobility::ConductivityType;
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::uncertainty::{Measured, OutputInterval};
use bandgauge_core::units::QuantityKind;
use bandgauge_core::vdp::{self, Configuration, VdpError, VdpReadings, VdpResult};
use serde_json::json;

use crate::args::HallArgs;
use crate::error::{BadInput, CliError};
use crate::output::{self, Table};
use crate::request::{self, measured};

/// The Hall part of a request.
#[derive(Debug, Clone)]
pub struct HallPart {
    /// The voltage as given (net or four readings).
    pub voltage: HallVoltage,
    /// Net voltage, current and field with their uncertainties.
    pub measured: MeasuredHall,
}

/// A validated `hall` request.
#[derive(Debug, Clone)]
pub struct HallRequest {
    /// The van der Pauw readings.
    pub readings: VdpReadings,
    /// Uncertainty of R_A and R_B (applied to each mean).
    pub resistance_spread: Option<String>,
    /// Thickness with its uncertainty.
    pub thickness_cm: Option<Measured>,
    /// The Hall measurement, when given.
    pub hall: Option<HallPart>,
    /// r_H.
    pub scattering: ScatteringFactor,
    /// Material of the cross-check.
    pub material: Material,
    /// Dopant named with --dopant.
    pub dopant: Option<String>,
    /// Temperature of the cross-check, K.
    pub temperature_k: f64,
    /// JSON instead of the table.
    pub json: bool,
}

fn resistance(argument: &str, text: &Option<String>) -> Result<Option<f64>, BadInput> {
    text.as_deref()
        .map(|t| request::positive(argument, t, QuantityKind::Resistance))
        .transpose()
}

fn configuration(
    names: [&str; 4],
    values: [&Option<String>; 3],
    forward: &str,
) -> Result<Configuration, BadInput> {
    Ok(Configuration {
        forward_ohm: request::positive(names[0], forward, QuantityKind::Resistance)?,
        reversed_ohm: resistance(names[1], values[0])?,
        reciprocal_ohm: resistance(names[2], values[1])?,
        reciprocal_reversed_ohm: resistance(names[3], values[2])?,
    })
}

fn hall_voltage(args: &HallArgs) -> Result<Option<HallVoltage>, BadInput> {
    if let Some(text) = &args.hall_voltage {
        let v = request::quantity("--hall-voltage", text, QuantityKind::Voltage)?;
        return Ok(Some(HallVoltage::Net(v)));
    }
    let Some(text) = &args.hall_readings else {
        return Ok(None);
    };
    let parts: Vec<&str> = text.split(',').collect();
    if parts.len() != 4 {
        return Err(BadInput::new(
            "--hall-readings",
            format!(
                "{text:?} has {} value(s); give four voltages separated by commas, in the order \
                 (+B,+I), (+B,-I), (-B,+I), (-B,-I), e.g. 7.1mV,-2.9mV,3.1mV,-6.9mV",
                parts.len()
            ),
        ));
    }
    let mut values = [0.0; 4];
    for (index, part) in parts.iter().enumerate() {
        values[index] = request::quantity("--hall-readings", part, QuantityKind::Voltage)
            .map_err(|e| e.prefixed(&format!("reading {}:", index + 1)))?;
    }
    Ok(Some(HallVoltage::Readings(values)))
}

impl HallRequest {
    /// Validates the raw arguments.
    ///
    /// # Errors
    /// [`BadInput`] naming the first refused argument.
    pub fn from_args(args: &HallArgs) -> Result<HallRequest, BadInput> {
        let a = configuration(
            [
                "--ra",
                "--ra-reversed",
                "--ra-reciprocal",
                "--ra-reciprocal-reversed",
            ],
            [
                &args.ra_reversed,
                &args.ra_reciprocal,
                &args.ra_reciprocal_reversed,
            ],
            &args.ra,
        )?;
        let b = configuration(
            [
                "--rb",
                "--rb-reversed",
                "--rb-reciprocal",
                "--rb-reciprocal-reversed",
            ],
            [
                &args.rb_reversed,
                &args.rb_reciprocal,
                &args.rb_reciprocal_reversed,
            ],
            &args.rb,
        )?;
        if let Some(text) = &args.resistance_uncertainty {
            request::spread("--resistance-uncertainty", text, QuantityKind::Resistance)?;
        }
        let thickness_cm = args
            .thickness
            .as_deref()
            .map(|text| {
                request::positive_measured(
                    "--thickness",
                    text,
                    args.thickness_uncertainty.as_deref(),
                    QuantityKind::Length,
                )
            })
            .transpose()?;
        let voltage = hall_voltage(args)?;
        let hall = match voltage {
            None => {
                for (given, argument) in [
                    (&args.current, "--current"),
                    (&args.field, "--field"),
                    (&args.hall_voltage_uncertainty, "--hall-voltage-uncertainty"),
                ] {
                    if given.is_some() {
                        return Err(BadInput::new(
                            argument,
                            "given without a Hall voltage; give --hall-voltage or \
                             --hall-readings too, or leave it out for the sheet resistance only",
                        ));
                    }
                }
                None
            }
            Some(voltage) => {
                let needed = |text: &Option<String>, argument: &str, what: &str| {
                    text.clone().ok_or_else(|| {
                        BadInput::new(
                            argument,
                            format!(
                                "the Hall analysis needs the {what}; give it, e.g. {argument} {}",
                                match argument {
                                    "--field" => "0.5T or 5000G",
                                    _ => "100uA",
                                }
                            ),
                        )
                    })
                };
                let current_text = needed(&args.current, "--current", "current")?;
                let field_text = needed(&args.field, "--field", "magnetic field")?;
                let current = request::positive_measured(
                    "--current",
                    &current_text,
                    args.current_uncertainty.as_deref(),
                    QuantityKind::Current,
                )?;
                let field = request::positive_measured(
                    "--field",
                    &field_text,
                    args.field_uncertainty.as_deref(),
                    QuantityKind::MagneticField,
                )?;
                let net = voltage.net().0;
                if !net.is_finite() {
                    return Err(BadInput::new(
                        "--hall-readings",
                        "the readings' average overflows; check their units",
                    ));
                }
                let voltage_v = measured(
                    net,
                    "--hall-voltage-uncertainty",
                    args.hall_voltage_uncertainty.as_deref(),
                    QuantityKind::Voltage,
                )?;
                Some(HallPart {
                    voltage,
                    measured: MeasuredHall {
                        voltage_v,
                        current_a: current,
                        field_t: field,
                    },
                })
            }
        };
        let scattering = match &args.hall_factor {
            None => ScatteringFactor::Unity,
            Some(text) => ScatteringFactor::parse(text).map_err(|e| {
                BadInput::new("--hall-factor", request::without_field_name(&e.to_string()))
            })?,
        };
        let material = request::material("--material", &args.material)?;
        if let Some(symbol) = &args.dopant {
            material
                .dopant(symbol)
                .map_err(|error| request::material_error("--dopant", &error))?;
            if hall.is_none() {
                return Err(BadInput::new(
                    "--dopant",
                    "is for the cross-check of a Hall measurement; give --hall-voltage or \
                     --hall-readings, --current and --field too",
                ));
            }
            if thickness_cm.is_none() {
                return Err(BadInput::new(
                    "--thickness",
                    "the cross-check with --dopant needs the layer thickness (the resistivity \
                     and the volume carrier density come from it); give it, e.g. --thickness 2um",
                ));
            }
        }
        Ok(HallRequest {
            readings: VdpReadings {
                a,
                b,
                thickness_cm: thickness_cm.map(|t| t.value),
            },
            resistance_spread: args.resistance_uncertainty.clone(),
            thickness_cm,
            hall,
            scattering,
            material,
            dopant: args.dopant.clone(),
            temperature_k: request::temperature_k("--temperature", &args.temperature)?,
            json: args.json,
        })
    }
}

fn vdp_error(error: &VdpError) -> BadInput {
    let argument = match error {
        VdpError::NotPositive { field, .. } => match *field {
            "thickness_cm" => "--thickness",
            f if f.starts_with("r_b") => "--rb",
            _ => "--ra",
        },
        VdpError::NoSolution { .. } => "--ra",
        _ => "--ra",
    };
    BadInput::new(argument, request::without_field_name(&error.to_string()))
}

fn hall_error(error: &HallError) -> BadInput {
    let argument = match error {
        HallError::Vdp(e) => return vdp_error(e),
        HallError::NotPositive { field, .. } => match *field {
            "current_a" => "--current",
            "field_t" => "--field",
            "thickness_cm" => "--thickness",
            _ => "--ra",
        },
        HallError::ZeroHallVoltage | HallError::NotFinite { .. } | HallError::OutOfRange { .. } => {
            "--hall-voltage"
        }
        HallError::InvalidScatteringFactor { .. } | HallError::UnknownScatteringFactor { .. } => {
            "--hall-factor"
        }
        HallError::CrossCheck(_) => "--dopant",
        HallError::Uncertainty(e) => {
            return request::uncertainty_refusal(
                e.clone(),
                uncertainty_argument,
                "--resistance-uncertainty",
            );
        }
        _ => "--hall-voltage",
    };
    BadInput::new(argument, request::without_field_name(&error.to_string()))
}

fn uncertainty_argument(field: &str) -> &'static str {
    match field {
        "thickness_cm" => "--thickness-uncertainty",
        "hall_voltage_v" => "--hall-voltage-uncertainty",
        "current_a" => "--current-uncertainty",
        "field_t" => "--field-uncertainty",
        _ => "--resistance-uncertainty",
    }
}

/// The dopant of the cross-check: the one named, else the material's first dopant of the
/// measured type that a conversion model covers.
fn cross_check_dopant(request: &HallRequest, measured: ConductivityType) -> Option<String> {
    if let Some(d) = &request.dopant {
        return Some(d.clone());
    }
    let kind = match measured {
        ConductivityType::N => DopantKind::Donor,
        ConductivityType::P => DopantKind::Acceptor,
    };
    request
        .material
        .dopants
        .iter()
        .find(|d| {
            d.kind == kind && !request::models_covering(&request.material, &d.symbol).is_empty()
        })
        .map(|d| d.symbol.to_string())
}

/// Everything computed for one request.
struct Answer {
    vdp: VdpResult,
    hall: Option<HallResult>,
    intervals: Vec<OutputInterval>,
    cross_check: Option<CrossCheck>,
    notes: Vec<String>,
}

fn compute(request: &HallRequest) -> Result<Answer, BadInput> {
    let vdp = vdp::evaluate(&request.readings).map_err(|e| vdp_error(&e))?;
    let sheet = vdp.solution.sheet_resistance_ohm_sq;
    let hall = request
        .hall
        .as_ref()
        .map(|part| {
            hall::evaluate(&HallReading {
                voltage: part.voltage,
                current_a: part.measured.current_a.value,
                field_t: part.measured.field_t.value,
                sheet_resistance_ohm_sq: sheet,
                thickness_cm: request.readings.thickness_cm,
                scattering: request.scattering,
            })
            .map_err(|e| match (&e, part.voltage) {
                (HallError::ZeroHallVoltage, HallVoltage::Readings(_)) => BadInput::new(
                    "--hall-readings",
                    request::without_field_name(&e.to_string()),
                ),
                _ => hall_error(&e),
            })
        })
        .transpose()?;
    let resistance = |value: f64| {
        measured(
            value,
            "--resistance-uncertainty",
            request.resistance_spread.as_deref(),
            QuantityKind::Resistance,
        )
    };
    let structure = MeasuredStructure {
        r_a_ohm: resistance(vdp.a.mean_ohm)?,
        r_b_ohm: resistance(vdp.b.mean_ohm)?,
        thickness_cm: request.thickness_cm,
        hall: request.hall.as_ref().map(|h| h.measured),
        scattering: request.scattering,
    };
    let any_spread = [Some(structure.r_a_ohm), structure.thickness_cm]
        .into_iter()
        .flatten()
        .chain(
            structure
                .hall
                .iter()
                .flat_map(|h| [h.voltage_v, h.current_a, h.field_t]),
        )
        .any(|m| m.tolerance.is_some());
    let intervals = if any_spread {
        hall::intervals(&structure).map_err(|e| hall_error(&e))?
    } else {
        Vec::new()
    };
    let mut notes = Vec::new();
    let cross_check = match (&hall, vdp.resistivity_ohm_cm) {
        (Some(h), Some(rho)) => match cross_check_dopant(request, h.conductivity_type) {
            Some(dopant) => Some(
                hall::cross_check(
                    &request.material,
                    &dopant,
                    rho,
                    h,
                    request.temperature_k,
                    &SolveOptions::default(),
                )
                .map_err(|e| hall_error(&e))?,
            ),
            None => {
                notes.push(format!(
                    "no cross-check: no conversion model covers a {}-type dopant of {}",
                    h.conductivity_type.as_str(),
                    request.material.id
                ));
                None
            }
        },
        (Some(_), None) => {
            notes.push(
                "no cross-check: give --thickness for the resistivity and the volume density"
                    .into(),
            );
            None
        }
        _ => None,
    };
    Ok(Answer {
        vdp,
        hall,
        intervals,
        cross_check,
        notes,
    })
}

/// Runs the request, writing to `out`.
///
/// # Errors
/// [`CliError::BadInput`] when the core refuses the readings; [`CliError::Failure`] on write
/// errors.
pub fn run(request: &HallRequest, out: &mut impl Write) -> Result<(), CliError> {
    let answer = compute(request)?;
    if request.json {
        let value = json!({
            "van_der_pauw": answer.vdp,
            "hall": answer.hall,
            "intervals": answer.intervals,
            "cross_check": answer.cross_check,
            "notes": answer.notes,
            "caution": caution(&answer),
        });
        writeln!(out, "{}", serde_json::to_string_pretty(&value)?)?;
    } else {
        write!(out, "{}", table(&answer))?;
    }
    Ok(())
}

fn caution(answer: &Answer) -> String {
    let mut models =
        vec!["sheet resistance by the van der Pauw equation (van der Pauw 1958)".to_string()];
    if let Some(h) = &answer.hall {
        models.push(format!("Hall analysis with {}", h.scattering_source));
    }
    if let Some(c) = &answer.cross_check {
        let ids: Vec<&str> = c.rows.iter().map(|r| r.model.id()).collect();
        models.push(format!(
            "cross-check by {} with charge neutrality (REFERENCES.md)",
            ids.join(", ")
        ));
    }
    output::caution(&models.join("; "))
}

fn percent(value: Option<f64>) -> String {
    value.map_or_else(String::new, |v| format!("{v:+.1}"))
}

fn table(answer: &Answer) -> String {
    let v = &answer.vdp;
    let mut text = format!(
        "Van der Pauw structure: R_A from {} reading(s), R_B from {}\n\n",
        v.a.readings, v.b.readings
    );
    let mut values = Table::new(&["result", "value", "unit"], &[false, true, false]);
    values.value_row("R_A", v.a.mean_ohm, "ohm");
    values.value_row("R_B", v.b.mean_ohm, "ohm");
    values.value_row("R_A/R_B", v.solution.ratio, "");
    values.value_row("correction factor f", v.solution.correction_factor, "");
    values.value_row(
        "sheet resistance",
        v.solution.sheet_resistance_ohm_sq,
        "ohm/sq",
    );
    if let Some(rho) = v.resistivity_ohm_cm {
        values.value_row("resistivity", rho, "ohm-cm");
    }
    for (name, summary) in [("R_A", &v.a), ("R_B", &v.b)] {
        if let Some(d) = summary.reciprocity_difference {
            values.value_row(format!("{name} reciprocal difference"), 100.0 * d, "%");
        }
        if let Some(d) = summary.polarity_difference {
            values.value_row(format!("{name} polarity difference"), 100.0 * d, "%");
        }
    }
    if let Some(h) = &answer.hall {
        values.value_row("Hall voltage", h.hall_voltage_v, "V");
        if let Some(offset) = h.offset_v {
            values.value_row("misalignment offset", offset, "V");
        }
        values.row([
            "carrier type".to_string(),
            match h.conductivity_type {
                ConductivityType::N => "n (electrons)".to_string(),
                ConductivityType::P => "p (holes)".to_string(),
            },
            String::new(),
        ]);
        values.value_row(
            "Hall sheet density (r_H = 1)",
            h.hall_sheet_density_cm2,
            "cm^-2",
        );
        values.value_row("r_H", h.scattering_factor, "");
        values.value_row("sheet carrier density", h.sheet_density_cm2, "cm^-2");
        if let Some(n) = h.volume_density_cm3 {
            values.value_row("carrier density", n, "cm^-3");
        }
        values.value_row("Hall mobility", h.hall_mobility_cm2_per_v_s, "cm^2/V s");
        values.value_row("drift mobility", h.drift_mobility_cm2_per_v_s, "cm^2/V s");
    }
    text.push_str(&values.render());
    if !answer.intervals.is_empty() {
        text.push_str("\nIntervals (first order, inputs in quadrature)\n");
        let mut t = Table::new(
            &[
                "quantity",
                "value",
                "low",
                "high",
                "half-width %",
                "driven by",
            ],
            &[false, true, true, true, true, false],
        );
        for i in &answer.intervals {
            t.row([
                i.quantity.to_string(),
                output::number(i.value.abs()),
                output::number(i.low),
                output::number(i.high),
                output::number(100.0 * i.relative_half_width),
                i.dominant.clone(),
            ]);
        }
        text.push_str(&t.render());
    }
    if let Some(c) = &answer.cross_check {
        text.push_str(&format!(
            "\nCross-check: {} in {} at {} K, measured {} cm^-3 and {} cm^2/V s\n",
            c.dopant,
            c.material_id,
            output::temperature(c.temperature_k),
            output::number(c.measured_carriers_cm3),
            output::number(c.measured_mobility_cm2_per_v_s)
        ));
        let mut t = Table::new(
            &[
                "model",
                "dopant cm^-3",
                "carriers cm^-3",
                "carriers diff %",
                "mobility cm^2/V s",
                "mobility diff %",
                "remark",
            ],
            &[false, true, true, true, true, true, false],
        );
        for r in &c.rows {
            let n = |v: Option<f64>| v.map_or_else(String::new, output::number);
            t.row([
                r.model.id().to_string(),
                n(r.dopant_density_cm3),
                n(r.carriers_cm3),
                percent(r.carriers_difference_percent),
                n(r.mobility_cm2_per_v_s),
                percent(r.mobility_difference_percent),
                r.error.clone().unwrap_or_default(),
            ]);
        }
        text.push_str(&t.render());
    }
    // Model remarks carry the model's id: several rows may say similar things.
    let model_notes = answer.cross_check.iter().flat_map(|c| {
        c.notes.iter().cloned().chain(c.rows.iter().flat_map(|r| {
            r.notes
                .iter()
                .map(move |note| format!("{}: {note}", r.model.id()))
        }))
    });
    let notes: Vec<String> = v
        .warnings
        .iter()
        .chain(answer.hall.iter().flat_map(|h| &h.notes))
        .cloned()
        .chain(model_notes)
        .chain(answer.notes.iter().cloned())
        .collect();
    text.push_str(&output::closing(&notes, &caution(answer)));
    text
}
