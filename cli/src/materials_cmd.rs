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
    let dos_source: &str = &material.sources.density_of_states;
    let rows: [(&str, f64, &str, &str); 9] = [
        ("Varshni Eg(0)", v.eg0_ev, "eV", band_gap_source),
        ("Varshni alpha", v.alpha_ev_per_k, "eV/K", band_gap_source),
        ("Varshni beta", v.beta_k, "K", band_gap_source),
        (
            "Eg(300 K)",
            v.band_gap_ev(LISTING_TEMPERATURE_K),
            "eV",
            "computed from the Varshni parameters",
        ),
        ("Nc(300 K)", material.nc.at_300k_cm3, "cm^-3", dos_source),
        ("Nc exponent of T", material.nc.exponent, "", dos_source),
        ("Nv(300 K)", material.nv.at_300k_cm3, "cm^-3", dos_source),
        ("Nv exponent of T", material.nv.exponent, "", dos_source),
        (
            "ni(300 K), density of states",
            material.intrinsic_density_cm3(LISTING_TEMPERATURE_K),
            "cm^-3",
            "computed: sqrt(Nc Nv) exp(-Eg/2kT)",
        ),
    ];
    for (parameter, value, unit, source) in rows {
        table.row([parameter, &output::number(value), unit, source]);
    }
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
