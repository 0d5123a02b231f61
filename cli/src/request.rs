//! Turning raw argument text into validated values, each refusal naming its argument.
//!
//! The command modules build their request types from these checks before any
//! physics runs. Limits that belong to a model (its validity range) are left to
//! the core, whose errors the commands map back to the argument concerned.

use bandgauge_core::compare::ConversionModel;
use bandgauge_core::ionization::IonizationModel;
use bandgauge_core::materials::{self, Dopant, DopantDensity, DopantKind, Material, MaterialError};
use bandgauge_core::uncertainty::{Measured, UncertaintyError};
use bandgauge_core::units::{self, QuantityKind, Spread};
use std::fs;
use std::path::Path;

use crate::error::BadInput;
use crate::output;

/// Reads the dopant-level model; without the option, the core's default.
pub fn ionization_model(argument: &str, text: Option<&str>) -> Result<IonizationModel, BadInput> {
    let Some(text) = text else {
        return Ok(IonizationModel::default());
    };
    IonizationModel::from_id(text).map_err(|_| {
        BadInput::new(
            argument,
            format!(
                "{text:?} is not a model bandgauge knows; give one of {}",
                IonizationModel::ALL.map(IonizationModel::id).join(", ")
            ),
        )
    })
}

/// Reads a quantity of `kind` in its default unit.
pub fn quantity(argument: &str, text: &str, kind: QuantityKind) -> Result<f64, BadInput> {
    units::parse_quantity(text, kind).map_err(|error| BadInput::new(argument, error.to_string()))
}

/// Reads a quantity that must be > 0.
pub fn positive(argument: &str, text: &str, kind: QuantityKind) -> Result<f64, BadInput> {
    above_zero(argument, quantity(argument, text, kind)?, || {
        format!(
            "{text:?} is not allowed; give a {kind} > 0 {}",
            kind.default_unit()
        )
    })
}

/// Reads a quantity that must be > 0, with the uncertainty given for it in the option
/// of the same name ending in `-uncertainty` (`--volts` and `--volts-uncertainty`).
pub fn positive_measured(
    argument: &str,
    text: &str,
    uncertainty_text: Option<&str>,
    kind: QuantityKind,
) -> Result<Measured, BadInput> {
    measured(
        positive(argument, text, kind)?,
        &format!("{argument}-uncertainty"),
        uncertainty_text,
        kind,
    )
}

/// Reads an absolute temperature (bare numbers in kelvin) that must be > 0 K.
pub fn temperature_k(argument: &str, text: &str) -> Result<f64, BadInput> {
    let value = quantity(argument, text, QuantityKind::Temperature)?;
    temperature_above_zero(argument, text, value)
}

/// Reads a temperature whose bare numbers are in degrees Celsius; result in kelvin, > 0 K.
pub fn temperature_c_in_k(argument: &str, text: &str) -> Result<f64, BadInput> {
    let value = units::parse_quantity_bare_in(text, QuantityKind::Temperature, "C")
        .map_err(|error| BadInput::new(argument, error.to_string()))?;
    temperature_above_zero(argument, text, value)
}

fn temperature_above_zero(argument: &str, text: &str, value_k: f64) -> Result<f64, BadInput> {
    above_zero(argument, value_k, || {
        format!(
            "{text:?} is {} K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C",
            output::temperature(value_k)
        )
    })
}

/// `value` when it is > 0 (NaN is not), else a refusal of `argument` saying `refusal()`.
fn above_zero(
    argument: &str,
    value: f64,
    refusal: impl FnOnce() -> String,
) -> Result<f64, BadInput> {
    if value > 0.0 {
        Ok(value)
    } else {
        Err(BadInput::new(argument, refusal()))
    }
}

/// Reads an uncertainty (percentage or amount).
pub fn spread(argument: &str, text: &str, kind: QuantityKind) -> Result<Spread, BadInput> {
    units::parse_spread(text, kind).map_err(|error| BadInput::new(argument, error.to_string()))
}

/// A validated value with the uncertainty given for it (none when `spread_text` is absent).
pub fn measured(
    value: f64,
    spread_argument: &str,
    spread_text: Option<&str>,
    kind: QuantityKind,
) -> Result<Measured, BadInput> {
    Ok(match spread_text {
        None => Measured::exact(value),
        Some(text) => match spread(spread_argument, text, kind)? {
            Spread::Relative(fraction) => Measured::relative(value, fraction),
            Spread::Absolute(half_width) => Measured::absolute(value, half_width),
        },
    })
}

/// An uncertainty the core refused, in the command line's words: a model that refuses an
/// end of the interval, or a half-width that reaches the value. `option_for` names the
/// command's uncertainty option of a core field ("volts" gives "--volts-uncertainty");
/// any other refusal is put on `otherwise`. A refusal of the value itself is the
/// command's to word, before it calls this.
pub fn uncertainty_refusal(
    error: UncertaintyError,
    option_for: fn(&str) -> &'static str,
    otherwise: &str,
) -> BadInput {
    match error {
        UncertaintyError::Conversion { at, error } => BadInput::new(
            option_for(at.split(' ').next().unwrap_or_default()),
            format!("at the {at} end of the uncertainty: {error}"),
        ),
        UncertaintyError::ToleranceTooLarge {
            field,
            value,
            half_width,
        } => {
            let unit = output::unit_of_field(field);
            BadInput::new(
                option_for(field),
                format!(
                    "{} {unit} reaches the value itself ({} {unit}); give an uncertainty \
                     smaller than the value",
                    output::number(half_width),
                    output::number(value)
                ),
            )
        }
        other => BadInput::new(otherwise, other.to_string()),
    }
}

/// Drops a leading core field name ("temperature_k: ") where the argument is named instead.
pub fn without_field_name(message: &str) -> &str {
    match message.split_once(": ") {
        Some((field, rest)) if field.chars().all(|c| c.is_ascii_lowercase() || c == '_') => rest,
        _ => message,
    }
}

/// The ids of the conversion models that cover `dopant` in `material`, in the core's order.
pub fn models_covering(material: &Material, dopant: &str) -> Vec<&'static str> {
    ConversionModel::all()
        .into_iter()
        .filter(|m| m.applicable(&material.id, dopant))
        .map(|m| m.id())
        .collect()
}

/// `model`, named `id` with --model, refused when it does not cover `dopant` in `material`.
pub fn covering_model(
    model: ConversionModel,
    id: &str,
    material: &Material,
    dopant: &str,
) -> Result<ConversionModel, BadInput> {
    if model.applicable(&material.id, dopant) {
        return Ok(model);
    }
    let covering = models_covering(material, dopant);
    Err(BadInput::new(
        "--model",
        format!(
            "{id:?} does not cover {dopant} in {}; give one of {}",
            material.id,
            if covering.is_empty() {
                "none: no model covers it".to_owned()
            } else {
                covering.join(", ")
            }
        ),
    ))
}

/// Looks up a built-in material.
pub fn material(argument: &str, id: &str) -> Result<Material, BadInput> {
    materials::by_id(id).map_err(|error| material_error(argument, &error))
}

/// Reads a user-defined material from a JSON file (one object in the form that
/// `bandgauge materials --json` lists) and validates every parameter.
pub fn material_from_file(argument: &str, path: &Path) -> Result<Material, BadInput> {
    let shown = path.display();
    let text = fs::read_to_string(path)
        .map_err(|error| BadInput::new(argument, format!("\"{shown}\" cannot be read: {error}")))?;
    let material: Material = serde_json::from_str(&text).map_err(|error| {
        BadInput::new(
            argument,
            format!(
                "\"{shown}\" is not a material in the form `bandgauge materials --json` lists \
                 (one object): {error}"
            ),
        )
    })?;
    material
        .validate()
        .map_err(|error| BadInput::new(argument, format!("\"{shown}\": {error}")))?;
    Ok(material)
}

/// Rewrites a core material error for the command line: the core names its own
/// field ("material", "dopant"); here the argument is named instead.
pub fn material_error(argument: &str, error: &MaterialError) -> BadInput {
    let message = match error {
        MaterialError::UnknownMaterial { id, known } => {
            format!(
                "{id:?} is not a known material; choose one of {}",
                known.join(", ")
            )
        }
        MaterialError::UnknownDopant {
            material,
            symbol,
            known,
        } => format!(
            "{symbol:?} is not a known dopant of {material}; choose one of {}",
            known.join(", ")
        ),
        MaterialError::WrongKind {
            material,
            symbol,
            actual,
            ..
        } => {
            let article = match actual {
                DopantKind::Donor => "a donor: give it with --donor",
                DopantKind::Acceptor => "an acceptor: give it with --acceptor",
            };
            format!("{symbol} in {material} is {article}")
        }
        other => other.to_string(),
    };
    BadInput::new(argument, message)
}

/// Reads `SPECIES:DENSITY` (a dopant of `material`) or
/// `NAME:DENSITY:IONIZATION_EV:DEGENERACY` (a dopant given in full) for `--donor`
/// or `--acceptor`.
pub fn dopant_density(
    argument: &str,
    text: &str,
    material: &Material,
    kind: DopantKind,
) -> Result<DopantDensity, BadInput> {
    let form = "give SPECIES:DENSITY such as P:1e15, or NAME:DENSITY:IONIZATION_EV:DEGENERACY";
    let parts: Vec<&str> = text.split(':').collect();
    let dopant = match parts.as_slice() {
        [symbol, _] => material.dopant_of_kind(symbol.trim(), kind).map_err(|error| {
            let refusal = material_error(argument, &error);
            match error {
                MaterialError::UnknownDopant { .. } => BadInput {
                    message: format!(
                        "{} (or give a dopant in full as NAME:DENSITY:IONIZATION_EV:DEGENERACY)",
                        refusal.message
                    ),
                    ..refusal
                },
                _ => refusal,
            }
        })?,
        [name, _, energy, degeneracy] => {
            let ionization_energy_ev = plain_number(
                argument,
                text,
                energy,
                "IONIZATION_EV",
                "the level's distance from its band edge in eV, e.g. 0.045",
            )?;
            let degeneracy = plain_number(
                argument,
                text,
                degeneracy,
                "DEGENERACY",
                "the level's degeneracy factor, e.g. 2 for a donor or 4 for an acceptor",
            )?;
            Dopant::new(
                name.trim(),
                kind,
                ionization_energy_ev,
                degeneracy,
                "given on the command line",
            )
            .map_err(|error| BadInput::new(argument, format!("{text:?}: {error}")))?
        }
        _ => {
            return Err(BadInput::new(
                argument,
                format!("{text:?} is not in a form bandgauge reads; {form}"),
            ));
        }
    };
    let density_text = parts[1];
    let density_cm3 =
        units::parse_quantity(density_text, QuantityKind::Density).map_err(|error| {
            BadInput::new(argument, format!("density of {}: {error}", dopant.symbol))
        })?;
    if density_cm3 < 0.0 {
        return Err(BadInput::new(
            argument,
            format!(
                "density of {}: {density_text:?} is not allowed; give a density >= 0 cm^-3",
                dopant.symbol
            ),
        ));
    }
    Ok(DopantDensity {
        dopant,
        density_cm3,
    })
}

fn plain_number(
    argument: &str,
    text: &str,
    part: &str,
    name: &str,
    allowed: &str,
) -> Result<f64, BadInput> {
    match part.trim().parse::<f64>() {
        Ok(value) if value.is_finite() => Ok(value),
        _ => Err(BadInput::new(
            argument,
            format!("{text:?}: {name} {part:?} is not a finite number; give {allowed}"),
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn message(result: Result<impl std::fmt::Debug, BadInput>) -> String {
        result.expect_err("should be refused").to_string()
    }

    #[test]
    fn temperatures() {
        assert_eq!(temperature_k("--temperature", "27C"), Ok(300.15));
        assert_eq!(temperature_c_in_k("--temperature-c", "25"), Ok(298.15));
        assert_eq!(
            message(temperature_k("--temperature", "-5")),
            "--temperature: \"-5\" is -5 K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C"
        );
    }
}
