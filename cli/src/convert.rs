//! `bandgauge convert`: resistivity to dopant density or back, every applicable model side by side, with an interval.

use std::io::Write;

use bandgauge_core::compare::{
    self, Comparison, Conversion, ConversionError, ConversionInput, ConversionModel,
};
use bandgauge_core::materials::Material;
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::uncertainty::{
    self, Interval, Measured, MeasuredInput, UncertaintyError, UncertaintyRequest,
};
use bandgauge_core::units::QuantityKind;
use serde_json::{Value, json};

use crate::args::ConvertArgs;
use crate::error::{BadInput, CliError};
use crate::output::{self, Table};
use crate::request::{self, measured};

/// Which way the conversion goes, with the given value.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Given {
    /// A resistivity, ohm cm, with its uncertainty.
    Resistivity(Measured),
    /// A dopant density, cm^-3, with its uncertainty.
    Density(Measured),
}

impl Given {
    /// The command-line argument that carried the value.
    pub fn argument(self) -> &'static str {
        match self {
            Given::Resistivity(_) => "--resistivity",
            Given::Density(_) => "--density",
        }
    }

    fn input(self) -> ConversionInput {
        match self {
            Given::Resistivity(m) => ConversionInput::ResistivityOhmCm(m.value),
            Given::Density(m) => ConversionInput::DensityCm3(m.value),
        }
    }
}

/// A validated `convert` request.
#[derive(Debug, Clone)]
pub struct ConvertRequest {
    /// The material.
    pub material: Material,
    /// Dopant symbol as the material spells it.
    pub dopant: String,
    /// The value to convert.
    pub given: Given,
    /// Temperature, K, with its uncertainty.
    pub temperature_k: Measured,
    /// The model whose answer comes first.
    pub model: ConversionModel,
    /// Carrier-statistics options of the physics models (the dopant-level model).
    pub solve: SolveOptions,
    /// JSON instead of the table.
    pub json: bool,
}

impl ConvertRequest {
    /// Validates the raw arguments.
    ///
    /// # Errors
    /// [`BadInput`] naming the first refused argument.
    pub fn from_args(args: &ConvertArgs) -> Result<ConvertRequest, BadInput> {
        let material = request::material("--material", &args.material)?;
        let dopant = material
            .dopant(&args.dopant)
            .map_err(|error| request::material_error("--dopant", &error))?
            .symbol
            .to_string();
        let misplaced = match (
            &args.resistivity,
            &args.density_uncertainty,
            &args.resistivity_uncertainty,
        ) {
            (Some(_), Some(_), _) => Some((
                "--density-uncertainty",
                "--resistivity-uncertainty with --resistivity",
            )),
            (None, _, Some(_)) => Some((
                "--resistivity-uncertainty",
                "--density-uncertainty with --density",
            )),
            _ => None,
        };
        if let Some((argument, instead)) = misplaced {
            return Err(BadInput::new(
                argument,
                format!("applies only to the value converted from; give {instead}"),
            ));
        }
        let given = match (&args.resistivity, &args.density) {
            (Some(text), None) => Given::Resistivity(request::positive_measured(
                "--resistivity",
                text,
                args.resistivity_uncertainty.as_deref(),
                QuantityKind::Resistivity,
            )?),
            (None, Some(text)) => Given::Density(request::positive_measured(
                "--density",
                text,
                args.density_uncertainty.as_deref(),
                QuantityKind::Density,
            )?),
            // clap's argument group makes exactly one of the two present.
            _ => {
                return Err(BadInput::new(
                    "--resistivity",
                    "give exactly one of --resistivity and --density",
                ));
            }
        };
        let temperature_k = measured(
            request::temperature_k("--temperature", &args.temperature)?,
            "--temperature-uncertainty",
            args.temperature_uncertainty.as_deref(),
            QuantityKind::Temperature,
        )?;
        let model = match &args.model {
            Some(id) => request::covering_model(
                ConversionModel::from_id(id).map_err(|error| conversion_error(given, error))?,
                id,
                &material,
                &dopant,
            )?,
            None => ConversionModel::default_for(&material.id, &dopant, temperature_k.value)
                .ok_or_else(|| no_model(&material, &dopant, temperature_k.value))?,
        };
        Ok(ConvertRequest {
            material,
            dopant,
            given,
            temperature_k,
            model,
            solve: SolveOptions {
                ionization_model: request::ionization_model(
                    "--ionization-model",
                    args.ionization_model.as_deref(),
                )?,
                ..SolveOptions::default()
            },
            json: args.json,
        })
    }
}

fn no_model(material: &Material, dopant: &str, temperature_k: f64) -> BadInput {
    let applicable = request::models_covering(material, dopant);
    if applicable.is_empty() {
        BadInput::new(
            "--dopant",
            format!(
                "no conversion model covers {dopant} in {}; see `bandgauge materials`",
                material.id
            ),
        )
    } else {
        BadInput::new(
            "--temperature",
            format!(
                "{temperature_k} K is outside the range of every model for {dopant} in {} that \
                 could be chosen by default; name one with --model ({})",
                material.id,
                applicable.join(", ")
            ),
        )
    }
}

/// The argument a core conversion refusal concerns.
fn conversion_argument(given: Given, error: &ConversionError) -> &'static str {
    use bandgauge_core::empirical::EmpiricalError as E;
    use bandgauge_core::mobility::MobilityError as M;
    use bandgauge_core::resistivity::ResistivityError as R;
    match error {
        ConversionError::UnknownModel { .. } | ConversionError::NotApplicable { .. } => "--model",
        ConversionError::NoApplicableModel { .. } | ConversionError::Dopant(_) => "--dopant",
        ConversionError::EmpiricalTemperature { .. } => "--temperature",
        ConversionError::Empirical(E::NotApplicable { .. }) => "--dopant",
        ConversionError::Physics(R::Dopant(_)) => "--dopant",
        ConversionError::Physics(R::Mobility(M::NotApplicable { .. } | M::UnknownModel { .. })) => {
            "--model"
        }
        ConversionError::Physics(R::Mobility(
            M::TemperatureOutOfRange { .. } | M::InvalidTemperature { .. },
        )) => "--temperature",
        _ => given.argument(),
    }
}

/// A core conversion refusal in the command line's words: the argument named first,
/// the core's own field name dropped where it is that argument.
fn conversion_error(given: Given, error: ConversionError) -> BadInput {
    let argument = conversion_argument(given, &error);
    BadInput::new(
        argument,
        without_matching_field(argument, &error.to_string()),
    )
}

/// Drops the core's leading field name when it names the same thing as `argument`.
fn without_matching_field(argument: &str, message: &str) -> String {
    let fields: &[&str] = match argument {
        "--resistivity" => &["resistivity_ohm_cm"],
        "--density" => &["density_cm3"],
        "--temperature" => &["temperature_k"],
        "--model" => &["model", "mobility model"],
        "--dopant" => &["dopant"],
        _ => &[],
    };
    for field in fields {
        if let Some(rest) = message
            .strip_prefix(field)
            .and_then(|rest| rest.strip_prefix(": "))
        {
            return rest.to_owned();
        }
    }
    message.to_owned()
}

fn uncertainty_error(request: &ConvertRequest, error: UncertaintyError) -> BadInput {
    match error {
        UncertaintyError::Conversion { at, error } if at == "value" => {
            conversion_error(request.given, error)
        }
        other => {
            request::uncertainty_refusal(other, uncertainty_argument, uncertainty_argument(""))
        }
    }
}

fn uncertainty_argument(field: &str) -> &'static str {
    match field {
        "resistivity_ohm_cm" => "--resistivity-uncertainty",
        "density_cm3" => "--density-uncertainty",
        _ => "--temperature-uncertainty",
    }
}

/// Everything the command prints.
struct Answer {
    conversion: Conversion,
    comparison: Comparison,
    interval: Interval,
}

fn solve(request: &ConvertRequest) -> Result<Answer, BadInput> {
    let solve = request.solve.clone();
    let input = request.given.input();
    let t = request.temperature_k.value;
    let conversion = compare::convert(
        &request.material,
        &request.dopant,
        input,
        t,
        request.model,
        &solve,
    )
    .map_err(|error| conversion_error(request.given, error))?;
    let comparison = compare::compare(&request.material, &request.dopant, input, t, &solve)
        .map_err(|error| conversion_error(request.given, error))?;
    let interval = uncertainty::propagate(&UncertaintyRequest {
        material: request.material.clone(),
        dopant: request.dopant.clone(),
        input: match request.given {
            Given::Resistivity(m) => MeasuredInput::Resistivity(m),
            Given::Density(m) => MeasuredInput::Density(m),
        },
        temperature_k: request.temperature_k,
        model: request.model,
        solve,
        include_model_spread: true,
    })
    .map_err(|error| uncertainty_error(request, error))?;
    Ok(Answer {
        conversion,
        comparison,
        interval,
    })
}

/// Runs the request, writing to `out`.
///
/// # Errors
/// [`CliError::BadInput`] when a model refuses the input; [`CliError::Failure`] on write errors.
pub fn run(request: &ConvertRequest, out: &mut impl Write) -> Result<(), CliError> {
    let answer = solve(request)?;
    if request.json {
        writeln!(
            out,
            "{}",
            serde_json::to_string_pretty(&to_json(request, &answer)?)?
        )?;
    } else {
        write!(out, "{}", table(request, &answer))?;
    }
    Ok(())
}

fn to_json(request: &ConvertRequest, answer: &Answer) -> Result<Value, serde_json::Error> {
    let c = &answer.conversion;
    Ok(json!({
        "material": request.material.id,
        "dopant": request.dopant,
        "given": match request.given {
            Given::Resistivity(_) => "resistivity_ohm_cm",
            Given::Density(_) => "density_cm3",
        },
        "temperature_k": request.temperature_k.value,
        "type": c.conductivity_type,
        "model": c.model,
        "model_name": c.model_name,
        "model_temperature_k": c.temperature_k,
        "density_cm3": c.density_cm3,
        "resistivity_ohm_cm": c.resistivity_ohm_cm,
        "notes": c.notes,
        "interval": answer.interval,
        "models": answer.comparison.answers,
        "spread": answer.comparison.spread,
        "physics": c.physics,
        "caution": caution(c),
    }))
}

fn caution(conversion: &Conversion) -> String {
    output::caution(&format!(
        "{}: {}",
        conversion.model.id(),
        conversion.model_name
    ))
}

fn table(request: &ConvertRequest, answer: &Answer) -> String {
    let c = &answer.conversion;
    let given = match request.given {
        Given::Resistivity(m) => format!("resistivity {} ohm-cm", output::number(m.value)),
        Given::Density(m) => format!("density {} cm^-3", output::number(m.value)),
    };
    let mut text = format!(
        "{} ({}) doped with {}, {}-type, at {} K: {given}\n\n",
        request.material.name,
        request.material.id,
        request.dopant,
        c.conductivity_type.as_str(),
        output::temperature(request.temperature_k.value)
    );
    let interval = &answer.interval;
    let unit = match request.given {
        Given::Resistivity(_) => "cm^-3",
        Given::Density(_) => "ohm-cm",
    };
    let mut result = Table::new(&["result", "value", "unit"], &[false, true, false]);
    result.value_row("density", c.density_cm3, "cm^-3");
    result.value_row("resistivity", c.resistivity_ohm_cm, "ohm-cm");
    result.value_row("interval low", interval.low, unit);
    result.value_row("interval high", interval.high, unit);
    text.push_str(&result.render());
    text.push_str(&format!(
        "  model: {} ({}), at {} K\n  interval driven by: {}\n",
        c.model.id(),
        c.model_name,
        output::temperature(c.temperature_k),
        interval.dominant
    ));

    text.push_str("\nModels side by side\n");
    let mut models = Table::new(
        &[
            "model",
            "density cm^-3",
            "resistivity ohm-cm",
            "at K",
            "in spread",
            "remark",
        ],
        &[false, true, true, true, false, false],
    );
    for a in &answer.comparison.answers {
        let remark = a.error.clone().unwrap_or_else(|| a.notes.join("; "));
        models.row([
            a.model.id().to_owned(),
            a.density_cm3.map_or_else(|| "-".to_owned(), output::number),
            a.resistivity_ohm_cm
                .map_or_else(|| "-".to_owned(), output::number),
            output::temperature(a.temperature_k),
            if a.in_spread { "yes" } else { "no" }.to_owned(),
            remark,
        ]);
    }
    text.push_str(&models.render());
    match &answer.comparison.spread {
        Some(s) => text.push_str(&format!(
            "  spread: {} (largest over smallest of {} models: {} to {})\n",
            output::number(s.ratio),
            s.models,
            s.lowest_model.id(),
            s.highest_model.id()
        )),
        None => text.push_str("  spread: fewer than two models answer here\n"),
    }

    text.push_str("\nInterval contributions\n");
    let mut contributions = Table::new(
        &["source", "half-width %", "low", "high", "remark"],
        &[false, true, true, true, false],
    );
    for k in &interval.contributions {
        contributions.row([
            k.source.clone(),
            output::number(100.0 * k.relative_half_width),
            output::number(k.low),
            output::number(k.high),
            k.note.clone().unwrap_or_default(),
        ]);
    }
    text.push_str(&contributions.render());

    text.push_str(&output::closing(
        c.notes.iter().chain(&interval.notes),
        &caution(c),
    ));
    text
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn field_names_are_dropped_only_where_they_match() {
        assert_eq!(
            without_matching_field("--resistivity", "resistivity_ohm_cm: 1e9 is above"),
            "1e9 is above"
        );
        assert_eq!(
            without_matching_field("--resistivity", "density_cm3: 6e20 is outside"),
            "density_cm3: 6e20 is outside"
        );
        assert_eq!(
            without_matching_field("--model", "mobility model arora: no parameters"),
            "mobility model arora: no parameters"
        );
    }
}
