//! `bandgauge materials`: the built-in materials and dopants with their parameters and sources.

use std::io::Write;

use bandgauge_core::materials::{self, Material};

use crate::error::CliError;
use crate::output::{self, Table};

/// Reference temperature for the derived columns (band gap and ni), K.
const LISTING_TEMPERATURE_K: f64 = 300.0;

/// Writes the listing: a JSON array of material objects (each one usable as a
/// `--material-file`), or readable tables.
///
/// # Errors
/// [`CliError::Failure`] on write errors.
pub fn run(json: bool, out: &mut impl Write) -> Result<(), CliError> {
    let all = materials::builtin();
    if json {
        writeln!(out, "{}", serde_json::to_string_pretty(&all)?)?;
        return Ok(());
    }
    for (index, material) in all.iter().enumerate() {
        if index > 0 {
            writeln!(out)?;
        }
        write!(out, "{}", describe(material))?;
    }
    writeln!(out)?;
    writeln!(
        out,
        "{}",
        output::caution("published parameter sets as listed, each with its source")
    )?;
    Ok(())
}

fn describe(material: &Material) -> String {
    let mut text = format!("{} ({})\n", material.name, material.id);
    let mut table = Table::new(
        &["parameter", "value", "unit", "source"],
        &[false, true, false, false],
    );
    let v = &material.varshni;
    let band_gap_source: &str = &material.sources.band_gap;
    table.row([
        "Varshni Eg(0)",
        &output::number(v.eg0_ev),
        "eV",
        band_gap_source,
    ]);
    table.row([
        "Varshni alpha",
        &output::number(v.alpha_ev_per_k),
        "eV/K",
        band_gap_source,
    ]);
    table.row([
        "Varshni beta",
        &output::number(v.beta_k),
        "K",
        band_gap_source,
    ]);
    table.row([
        "Eg(300 K)",
        &output::number(v.band_gap_ev(LISTING_TEMPERATURE_K)),
        "eV",
        "computed from the Varshni parameters",
    ]);
    let dos_source: &str = &material.sources.density_of_states;
    table.row([
        "Nc(300 K)",
        &output::number(material.nc.at_300k_cm3),
        "cm^-3",
        dos_source,
    ]);
    table.row([
        "Nc exponent of T",
        &output::number(material.nc.exponent),
        "",
        dos_source,
    ]);
    table.row([
        "Nv(300 K)",
        &output::number(material.nv.at_300k_cm3),
        "cm^-3",
        dos_source,
    ]);
    table.row([
        "Nv exponent of T",
        &output::number(material.nv.exponent),
        "",
        dos_source,
    ]);
    table.row([
        "ni(300 K), density of states",
        &output::number(material.intrinsic_density_cm3(LISTING_TEMPERATURE_K)),
        "cm^-3",
        "computed: sqrt(Nc Nv) exp(-Eg/2kT)",
    ]);
    if let Some(fit) = &material.intrinsic_fit {
        table.row([
            "ni(300 K), direct fit".to_owned(),
            output::number(fit.ln_density_cm3(LISTING_TEMPERATURE_K).exp()),
            "cm^-3".to_owned(),
            format!(
                "{} ({}-{} K): {}",
                fit.name, fit.min_temperature_k, fit.max_temperature_k, fit.source
            ),
        ]);
    }
    table.row([
        "relative permittivity",
        &output::number(material.relative_permittivity),
        "",
        &*material.sources.permittivity,
    ]);
    if let Some(bgn) = &material.band_gap_narrowing {
        table.row([
            "band-gap narrowing".to_owned(),
            bgn.name.to_string(),
            String::new(),
            bgn.source.to_string(),
        ]);
    }
    text.push_str(&table.render());
    let mut dopants = Table::new(
        &["dopant", "kind", "ionization meV", "degeneracy", "source"],
        &[false, false, true, true, false],
    );
    for dopant in &material.dopants {
        dopants.row([
            dopant.symbol.to_string(),
            dopant.kind.to_string(),
            output::number(dopant.ionization_energy_ev * 1e3),
            output::number(dopant.degeneracy),
            dopant.source.to_string(),
        ]);
    }
    text.push('\n');
    text.push_str(&dopants.render());
    text
}
