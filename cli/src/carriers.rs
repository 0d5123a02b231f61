//! `bandgauge carriers`: charge neutrality at one temperature (table or JSON) or over a sweep (CSV or JSON).

use std::io::Write;

use bandgauge_core::bgn::BgnModel;
use bandgauge_core::intrinsic::IntrinsicModel;
use bandgauge_core::materials::{DopantDensity, DopantKind, Material};
use bandgauge_core::neutrality::{self, CarrierError, Equilibrium, SolveOptions};
use bandgauge_core::sweep;
use serde_json::{Value, json};

use crate::args::CarriersArgs;
use crate::error::{BadInput, CliError};
use crate::output::{self, Table};
use crate::request;

/// Columns of the sweep CSV (and keys of each JSON object): the required keys first.
const SWEEP_COLUMNS: [&str; 13] = [
    "temperature_k",
    "band_gap_ev",
    "nc_cm3",
    "nv_cm3",
    "intrinsic_cm3",
    "electrons_cm3",
    "holes_cm3",
    "fermi_minus_valence_ev",
    "fermi_minus_conduction_ev",
    "ionized_donors_cm3",
    "ionized_acceptors_cm3",
    "regime",
    "degenerate",
];

/// At one temperature or over a grid.
#[derive(Debug, Clone, PartialEq)]
pub enum Temperatures {
    /// One temperature, K.
    One(f64),
    /// A sweep grid, K.
    Sweep(Vec<f64>),
}

/// A validated `carriers` request.
#[derive(Debug, Clone)]
pub struct CarriersRequest {
    /// The material.
    pub material: Material,
    /// Where to solve.
    pub temperatures: Temperatures,
    /// Donors then acceptors, in the order given.
    pub doping: Vec<DopantDensity>,
    /// Model choices.
    pub options: SolveOptions,
    /// JSON instead of a table (or CSV for a sweep).
    pub json: bool,
    /// The material came from --material-file.
    pub from_file: bool,
}

impl CarriersRequest {
    /// Validates the raw arguments.
    ///
    /// # Errors
    /// [`BadInput`] naming the first refused argument.
    pub fn from_args(args: &CarriersArgs) -> Result<CarriersRequest, BadInput> {
        let material = match &args.material_file {
            Some(path) => request::material_from_file("--material-file", path)?,
            None => request::material("--material", &args.material)?,
        };
        let temperatures = match &args.sweep {
            Some(text) => Temperatures::Sweep(sweep_temperatures_k("--sweep", text)?),
            None => Temperatures::One(request::temperature_k("--temperature", &args.temperature)?),
        };
        let mut doping = Vec::new();
        for text in &args.donor {
            doping.push(request::dopant_density(
                "--donor",
                text,
                &material,
                DopantKind::Donor,
            )?);
        }
        for text in &args.acceptor {
            doping.push(request::dopant_density(
                "--acceptor",
                text,
                &material,
                DopantKind::Acceptor,
            )?);
        }
        let intrinsic_model = match args.intrinsic_model.as_deref().map(str::trim) {
            None | Some("density-of-states") => IntrinsicModel::DensityOfStates,
            Some("direct-fit") => {
                if material.intrinsic_fit.is_none() {
                    return Err(BadInput::new(
                        "--intrinsic-model",
                        format!(
                            "\"direct-fit\" is not available for {}: it has no published direct fit \
                             here; give density-of-states",
                            material.id
                        ),
                    ));
                }
                IntrinsicModel::DirectFit
            }
            Some(other) => {
                return Err(BadInput::new(
                    "--intrinsic-model",
                    format!(
                        "{other:?} is not a model bandgauge knows; give density-of-states or direct-fit"
                    ),
                ));
            }
        };
        if args.gap_narrowing && material.band_gap_narrowing.is_none() {
            return Err(BadInput::new(
                "--gap-narrowing",
                format!(
                    "{} carries no band-gap narrowing model; leave the option out",
                    material.id
                ),
            ));
        }
        let options = SolveOptions {
            intrinsic_model,
            band_gap_narrowing: args.gap_narrowing.then_some(BgnModel::MaterialSet),
            ionization_model: request::ionization_model(
                "--ionization-model",
                args.ionization_model.as_deref(),
            )?,
        };
        Ok(CarriersRequest {
            material,
            temperatures,
            doping,
            options,
            json: args.json,
            from_file: args.material_file.is_some(),
        })
    }
}

/// Reads `START:STOP:POINTS`; the grid itself comes from the core.
fn sweep_temperatures_k(argument: &str, text: &str) -> Result<Vec<f64>, BadInput> {
    let [start, stop, points] = text.split(':').collect::<Vec<_>>()[..] else {
        return Err(BadInput::new(
            argument,
            format!(
                "{text:?} is not in a form bandgauge reads; give START:STOP:POINTS such as \
                 10:1000:200 (kelvin unless a unit is given)"
            ),
        ));
    };
    let start_k = request::temperature_k(argument, start).map_err(|e| e.prefixed("START"))?;
    let stop_k = request::temperature_k(argument, stop).map_err(|e| e.prefixed("STOP"))?;
    let count: usize = points.trim().parse().map_err(|_| {
        BadInput::new(
            argument,
            format!(
                "POINTS {points:?} is not a whole number; give 2 to {} points",
                sweep::MAX_GRID_POINTS
            ),
        )
    })?;
    sweep::linear_grid_k(start_k, stop_k, count).map_err(|error| match error {
        CarrierError::InvalidGrid {
            field,
            value,
            allowed,
        } => {
            let part = match field {
                "start_k" => "START",
                "stop_k" => "STOP",
                _ => "POINTS",
            };
            BadInput::new(
                argument,
                format!("{part} {value} is not allowed; give {allowed}"),
            )
        }
        other => BadInput::new(argument, other.to_string()),
    })
}

/// Maps a core refusal to the argument it concerns, in the command line's words.
fn carrier_error(request: &CarriersRequest, error: CarrierError) -> BadInput {
    let temperature_argument = match request.temperatures {
        Temperatures::One(_) => "--temperature",
        Temperatures::Sweep(_) => "--sweep",
    };
    match &error {
        CarrierError::OutsideModelRange {
            model,
            temperature_k,
            min_k,
            max_k,
        } => BadInput::new(
            temperature_argument,
            format!(
                "{temperature_k} K is outside the range of {model}; give {min_k}-{max_k} K \
                 or leave out --intrinsic-model"
            ),
        ),
        CarrierError::NonPositiveBandGap {
            material,
            temperature_k,
            band_gap_ev,
        } => BadInput::new(
            temperature_argument,
            format!(
                "{temperature_k} K is not allowed for {material}: the band gap model gives \
                 {band_gap_ev:.4} eV there; give a temperature where the gap is > 0"
            ),
        ),
        CarrierError::InvalidDensity { symbol, value } => BadInput::new(
            dopant_argument(request, symbol),
            format!(
                "density of {symbol}: {value:e} cm^-3 is not allowed; give a density from 0 \
                 to {:e} cm^-3",
                neutrality::MAX_DENSITY_CM3
            ),
        ),
        CarrierError::LevelOutsideGap { symbol, .. } => {
            BadInput::new(dopant_argument(request, symbol), error.to_string())
        }
        CarrierError::ModelNotAvailable { .. } => {
            BadInput::new("--intrinsic-model", error.to_string())
        }
        CarrierError::InvalidTemperature { .. } => BadInput::new(
            temperature_argument,
            request::without_field_name(&error.to_string()).to_owned(),
        ),
        _ => BadInput::new(
            if request.from_file {
                "--material-file"
            } else {
                "--material"
            },
            error.to_string(),
        ),
    }
}

fn dopant_argument(request: &CarriersRequest, symbol: &str) -> &'static str {
    match request
        .doping
        .iter()
        .find(|d| d.dopant.symbol == symbol)
        .map(|d| d.dopant.kind)
    {
        Some(DopantKind::Acceptor) => "--acceptor",
        _ => "--donor",
    }
}

/// Runs the request, writing to `out`.
///
/// # Errors
/// [`CliError::BadInput`] when the core refuses the input; [`CliError::Failure`] on write errors.
pub fn run(request: &CarriersRequest, out: &mut impl Write) -> Result<(), CliError> {
    match &request.temperatures {
        Temperatures::One(temperature_k) => {
            let state = neutrality::solve(
                &request.material,
                *temperature_k,
                &request.doping,
                &request.options,
            )
            .map_err(|error| carrier_error(request, error))?;
            if request.json {
                let mut value = serde_json::to_value(&state)?;
                if let Value::Object(map) = &mut value {
                    map.insert("material".into(), json!(request.material.id));
                    map.insert("caution".into(), json!(caution(&state)));
                }
                writeln!(out, "{}", serde_json::to_string_pretty(&value)?)?;
            } else {
                write!(out, "{}", table(request, &state))?;
            }
        }
        Temperatures::Sweep(grid) => {
            let results = sweep::temperature_sweep(
                &request.material,
                grid,
                &request.doping,
                &request.options,
            );
            let states = results
                .into_iter()
                .collect::<Result<Vec<_>, _>>()
                .map_err(|error| carrier_error(request, error))?;
            if request.json {
                let rows: Vec<Value> = states
                    .iter()
                    .map(sweep_row_json)
                    .collect::<Result<_, _>>()?;
                writeln!(out, "{}", serde_json::to_string_pretty(&rows)?)?;
            } else {
                writeln!(out, "{}", SWEEP_COLUMNS.join(","))?;
                for state in &states {
                    writeln!(out, "{}", sweep_row_csv(state)?.join(","))?;
                }
            }
        }
    }
    Ok(())
}

fn sweep_row_json(state: &Equilibrium) -> Result<Value, serde_json::Error> {
    let full = serde_json::to_value(state)?;
    Ok(Value::Object(
        SWEEP_COLUMNS
            .iter()
            .map(|key| {
                (
                    (*key).to_owned(),
                    full.get(*key).cloned().unwrap_or(Value::Null),
                )
            })
            .collect(),
    ))
}

fn sweep_row_csv(state: &Equilibrium) -> Result<Vec<String>, serde_json::Error> {
    let row = sweep_row_json(state)?;
    Ok(SWEEP_COLUMNS
        .iter()
        .map(|key| match &row[*key] {
            Value::Number(number) => number.as_f64().map_or_else(String::new, output::exact),
            Value::String(text) => text.clone(),
            other => other.to_string(),
        })
        .collect())
}

/// The caution line, naming the model and the citation keys of its sources.
fn caution(state: &Equilibrium) -> String {
    let mut keys: Vec<&str> = Vec::new();
    for model in state.models.iter() {
        if let Some(key) = citation_key(&model.source)
            && !keys.contains(&key)
        {
            keys.push(key);
        }
    }
    output::caution(&format!(
        "charge neutrality with Fermi-Dirac statistics; sources {}",
        keys.join(", ")
    ))
}

/// The citation key that starts a core source string ("Thurmond1975: ..."), if any.
pub fn citation_key(source: &str) -> Option<&str> {
    let (key, _) = source.split_once(':')?;
    (!key.is_empty()
        && key
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || c == '-' || c == '_'))
    .then_some(key)
}

fn table(request: &CarriersRequest, state: &Equilibrium) -> String {
    let mut text = format!(
        "{} ({}) at {} K{}\n\n",
        request.material.name,
        request.material.id,
        output::temperature(state.temperature_k),
        doping_summary(&request.doping)
    );
    let mut table = Table::new(&["quantity", "value", "unit"], &[false, true, false]);
    let rows: [(&str, f64, &str); 13] = [
        ("band gap", state.band_gap_ev, "eV"),
        ("band-gap narrowing", state.band_gap_narrowing_ev, "eV"),
        ("Nc", state.nc_cm3, "cm^-3"),
        ("Nv", state.nv_cm3, "cm^-3"),
        ("intrinsic density", state.intrinsic_cm3, "cm^-3"),
        ("electrons", state.electrons_cm3, "cm^-3"),
        ("holes", state.holes_cm3, "cm^-3"),
        ("EF - Ev", state.fermi_minus_valence_ev, "eV"),
        ("EF - Ec", state.fermi_minus_conduction_ev, "eV"),
        ("EF - midgap", state.fermi_minus_midgap_ev, "eV"),
        ("ionized donors", state.ionized_donors_cm3, "cm^-3"),
        ("ionized acceptors", state.ionized_acceptors_cm3, "cm^-3"),
        ("kT", state.thermal_energy_ev, "eV"),
    ];
    for (label, value, unit) in rows {
        table.value_row(label, value, unit);
    }
    table.row(["regime".to_owned(), state.regime.to_string(), String::new()]);
    table.row([
        "degenerate".to_owned(),
        if state.degenerate { "yes" } else { "no" }.to_owned(),
        String::new(),
    ]);
    text.push_str(&table.render());

    if !state.species.is_empty() {
        text.push('\n');
        let mut species = Table::new(
            &[
                "species",
                "kind",
                "density cm^-3",
                "ionized cm^-3",
                "ionized %",
                "level from band edge eV",
                "level model",
            ],
            &[false, false, true, true, true, true, false],
        );
        for s in &state.species {
            species.row([
                s.symbol.to_string(),
                s.kind.to_string(),
                output::number(s.density_cm3),
                output::number(s.ionized_cm3),
                output::number(100.0 * s.ionized_fraction),
                output::number(s.level_from_band_edge_ev),
                s.level_model.id().to_owned(),
            ]);
        }
        text.push_str(&species.render());
    }

    text.push_str("\nModels\n");
    let mut models = Table::new(&["quantity", "model", "source"], &[false, false, false]);
    for model in state.models.iter() {
        models.row([
            model.quantity.to_string(),
            model.model.to_string(),
            model.source.to_string(),
        ]);
    }
    text.push_str(&models.render());
    text.push_str(&output::closing([], &caution(state)));
    text
}

fn doping_summary(doping: &[DopantDensity]) -> String {
    if doping.is_empty() {
        return ", undoped".to_owned();
    }
    let parts: Vec<String> = doping
        .iter()
        .map(|d| {
            format!(
                "{} {} {} cm^-3",
                d.dopant.kind,
                d.dopant.symbol,
                output::number(d.density_cm3)
            )
        })
        .collect();
    format!(", {}", parts.join(", "))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn citation_keys() {
        assert_eq!(
            citation_key("Thurmond1975: Thurmond, J. ..."),
            Some("Thurmond1975")
        );
        assert_eq!(
            citation_key("from the band gap and density-of-states sources above"),
            None
        );
        assert_eq!(citation_key("see the fermi_dirac module: x"), None);
    }

    #[test]
    fn sweep_refusals_name_the_part() {
        let refuse = |text: &str| {
            sweep_temperatures_k("--sweep", text)
                .unwrap_err()
                .to_string()
        };
        assert_eq!(
            refuse("10:1000"),
            "--sweep: \"10:1000\" is not in a form bandgauge reads; give START:STOP:POINTS such as \
             10:1000:200 (kelvin unless a unit is given)"
        );
        assert_eq!(
            refuse("0:1000:10"),
            "--sweep: START \"0\" is 0 K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C"
        );
        assert_eq!(
            refuse("10:1000:2.5"),
            "--sweep: POINTS \"2.5\" is not a whole number; give 2 to 100000 points"
        );
        assert!(refuse("10:1000:1").starts_with("--sweep: POINTS 1 is not allowed; give "));
        let grid = sweep_temperatures_k("--sweep", "-50C:150C:3").unwrap();
        assert!((grid[1] - 323.15).abs() < 1e-9);
    }
}
