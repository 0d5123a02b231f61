//! The command line as clap reads it: raw text only, validated later in `request`.
//!
//! Every value that carries a physical quantity is taken as a string here so that
//! one place (`request`) turns it into numbers in default units, with messages
//! that name the argument, the text given and what is allowed.

use clap::{ArgGroup, Args, Parser, Subcommand};

/// Carrier statistics, resistivity and four-point-probe conversions for silicon
/// and other semiconductors, from published models with their sources named.
#[derive(Debug, Parser)]
#[command(
    name = "bandgauge",
    version,
    long_about = None,
    after_help = "Values are model estimates; the fab's own specifications and the governing \
                  standards decide acceptance."
)]
pub struct Cli {
    /// What to compute.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Free electrons and holes, Fermi level and dopant ionization at one
    /// temperature or over a temperature range (charge neutrality).
    Carriers(CarriersArgs),
    /// List the built-in materials and their dopants, with parameters and sources.
    Materials(MaterialsArgs),
    /// Resistivity to dopant density or back, every applicable model side by side.
    Convert(ConvertArgs),
    /// Four-point-probe reading (voltage and current) to sheet resistance and
    /// resistivity, with thickness, wafer-size and temperature corrections.
    Probe(ProbeArgs),
    /// Van der Pauw structure: four-terminal resistances to sheet resistance and, with a
    /// Hall voltage, carrier type, density and mobility checked against the doping conversion.
    Hall(HallArgs),
    /// Wafer-lot files: convert every site, summarise per lot and wafer, judge against a
    /// spec window, and test whether lots differ.
    Lots(crate::lots::LotsArgs),
}

/// `bandgauge carriers`.
#[derive(Debug, Args)]
pub struct CarriersArgs {
    /// Material id (see `bandgauge materials`).
    #[arg(long, value_name = "ID", default_value = "si")]
    pub material: String,

    /// A material not built in: a JSON file holding one object in the form that
    /// `bandgauge materials --json` lists, every parameter given.
    #[arg(long, value_name = "FILE", conflicts_with = "material")]
    pub material_file: Option<std::path::PathBuf>,

    /// Temperature: 300, 300K or 27C.
    #[arg(
        long,
        value_name = "T",
        allow_hyphen_values = true,
        default_value = "300",
        conflicts_with = "sweep"
    )]
    pub temperature: String,

    /// Donor species and density, e.g. P:1e15 or P:2.3x10^15cm^-3 (repeatable).
    /// A dopant not in the material's list is given in full as
    /// NAME:DENSITY:IONIZATION_EV:DEGENERACY.
    #[arg(long, value_name = "SPECIES:DENSITY")]
    pub donor: Vec<String>,

    /// Acceptor species and density, e.g. B:1e14 (repeatable); same forms as --donor.
    #[arg(long, value_name = "SPECIES:DENSITY")]
    pub acceptor: Vec<String>,

    /// Temperature sweep START:STOP:POINTS (kelvin unless a unit is given),
    /// evenly spaced, written as CSV (or a JSON array with --json).
    #[arg(long, value_name = "START:STOP:POINTS", allow_hyphen_values = true)]
    pub sweep: Option<String>,

    /// Intrinsic-density model: density-of-states (default: from the band gap and
    /// the effective densities of states) or direct-fit (the material's published
    /// direct fit of ni(T), where one exists).
    #[arg(long, value_name = "MODEL")]
    pub intrinsic_model: Option<String>,

    /// Apply the material's published band-gap narrowing model (off by default).
    #[arg(long)]
    pub gap_narrowing: bool,

    /// Dopant-level model: altermatt (default: levels and localized fraction lowered with
    /// density, Altermatt et al. 2006), pearson-bardeen (level lowered with density) or
    /// dilute (constant levels).
    #[arg(long, value_name = "MODEL")]
    pub ionization_model: Option<String>,

    /// Write one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// `bandgauge materials`.
#[derive(Debug, Args)]
pub struct MaterialsArgs {
    /// Write JSON instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// `bandgauge convert`.
#[derive(Debug, Args)]
#[command(group(ArgGroup::new("given").required(true).args(["resistivity", "density"])))]
pub struct ConvertArgs {
    /// Material id (see `bandgauge materials`).
    #[arg(long, value_name = "ID", default_value = "si")]
    pub material: String,

    /// Dopant species, e.g. B or P; decides the conductivity type.
    #[arg(long, value_name = "SPECIES")]
    pub dopant: String,

    /// Resistivity to convert to a dopant density: 10, 10ohm-cm, 850mohm-cm, 0.1ohm-m.
    #[arg(long, value_name = "RHO", allow_hyphen_values = true)]
    pub resistivity: Option<String>,

    /// Dopant density to convert to a resistivity: 1e16, 1e16cm^-3, 1e22m^-3.
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub density: Option<String>,

    /// Temperature: 296.15, 296.15K or 23C.
    #[arg(
        long,
        value_name = "T",
        allow_hyphen_values = true,
        default_value = "296.15"
    )]
    pub temperature: String,

    /// Model whose answer is reported first (default: the first applicable one;
    /// every applicable model is listed either way).
    #[arg(long, value_name = "NAME")]
    pub model: Option<String>,

    /// Uncertainty of the given resistivity: 2% or an amount such as 0.1ohm-cm.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub resistivity_uncertainty: Option<String>,

    /// Uncertainty of the given density: 5% or an amount such as 1e14.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub density_uncertainty: Option<String>,

    /// Uncertainty of the temperature: 0.5K, 0.5C or 0.2%.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub temperature_uncertainty: Option<String>,

    /// Dopant-level model: altermatt (default: levels and localized fraction lowered with
    /// density, Altermatt et al. 2006), pearson-bardeen (level lowered with density) or
    /// dilute (constant levels).
    #[arg(long, value_name = "MODEL")]
    pub ionization_model: Option<String>,

    /// Write one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// `bandgauge probe`.
#[derive(Debug, Args)]
pub struct ProbeArgs {
    /// Voltage across the inner probes: 0.0125, 12.5mV.
    #[arg(long, value_name = "V", allow_hyphen_values = true)]
    pub volts: String,

    /// Current through the outer probes: 0.001, 1mA.
    #[arg(long, value_name = "I", allow_hyphen_values = true)]
    pub amps: String,

    /// Probe spacing (equal, collinear): 0.1, 1mm.
    #[arg(long, value_name = "S", allow_hyphen_values = true)]
    pub spacing: String,

    /// Sample geometry: thin-layer (default; a diffused, implanted or deposited
    /// layer or a thin wafer: sheet resistance Rs = (pi/ln 2) V/I times the
    /// corrections, resistivity Rs x thickness only with --thickness) or bulk
    /// (ingot or thick piece, semi-infinite: resistivity = 2 pi s V/I).
    #[arg(long, value_name = "GEOMETRY", default_value = "thin-layer")]
    pub geometry: String,

    /// Layer or wafer thickness: 0.0525, 525um. Applies the exact
    /// finite-thickness correction; on a thin layer it also gives the
    /// resistivity (without it only the sheet resistance is given).
    #[arg(long, value_name = "T", allow_hyphen_values = true)]
    pub thickness: Option<String>,

    /// Wafer diameter, probe at the centre: 15, 150mm (thin layers only).
    /// Corrects the sheet resistance for the wafer's edge (Smits 1958), with or
    /// without a thickness. Without it the layer is taken as laterally infinite.
    #[arg(long, value_name = "D", allow_hyphen_values = true)]
    pub diameter: Option<String>,

    /// Wafer temperature during the reading in degrees Celsius (25, 25C or
    /// 298.15K); the resistivity is then corrected to 23 C (needs --dopant).
    #[arg(
        long,
        value_name = "T",
        allow_hyphen_values = true,
        requires = "dopant"
    )]
    pub temperature_c: Option<String>,

    /// Material of the sample, for the temperature correction and the density.
    #[arg(long, value_name = "ID", default_value = "si")]
    pub material: String,

    /// Dopant species of the sample, e.g. B or P: needed for the temperature
    /// correction; with it the dopant density and its interval are given too
    /// (both need a resistivity: --thickness on a thin layer, or --geometry bulk).
    #[arg(long, value_name = "SPECIES")]
    pub dopant: Option<String>,

    /// Conversion model for the density (see `bandgauge convert --help`); a
    /// physics model also sets the mobility model of the temperature correction.
    #[arg(long, value_name = "NAME", requires = "dopant")]
    pub model: Option<String>,

    /// Uncertainty of the voltage: 0.5% or an amount such as 0.05mV. The
    /// uncertainties give an interval on the dopant density, so they need --dopant.
    #[arg(
        long,
        value_name = "SPREAD",
        allow_hyphen_values = true,
        requires = "dopant"
    )]
    pub volts_uncertainty: Option<String>,

    /// Uncertainty of the current: 0.5% or an amount such as 1uA.
    #[arg(
        long,
        value_name = "SPREAD",
        allow_hyphen_values = true,
        requires = "dopant"
    )]
    pub amps_uncertainty: Option<String>,

    /// Uncertainty of the probe spacing: 1% or an amount such as 2um.
    #[arg(
        long,
        value_name = "SPREAD",
        allow_hyphen_values = true,
        requires = "dopant"
    )]
    pub spacing_uncertainty: Option<String>,

    /// Uncertainty of the thickness: 2% or an amount such as 10um.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true, requires_all = ["thickness", "dopant"])]
    pub thickness_uncertainty: Option<String>,

    /// Uncertainty of the wafer temperature: 0.5C, 0.5K or 0.2%.
    #[arg(
        long,
        value_name = "SPREAD",
        allow_hyphen_values = true,
        requires = "dopant"
    )]
    pub temperature_uncertainty: Option<String>,

    /// Write one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// `bandgauge hall`.
#[derive(Debug, Args)]
#[command(
    after_help = "Sign convention: contacts 1-4 counter-clockwise seen with the field \
                  pointing at you, current into 1 and out of 3, Hall voltage V2 - V4: positive \
                  means holes (p-type), negative electrons (n-type)."
)]
pub struct HallArgs {
    /// R_A = V/I of the first configuration (current along one edge, voltage across the
    /// opposite edge): 10.2, 10.2ohm, 850mohm.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub ra: String,

    /// R_A read with the current reversed (V/I, > 0).
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub ra_reversed: Option<String>,

    /// R_A read with current and voltage contacts swapped (the reciprocal reading).
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub ra_reciprocal: Option<String>,

    /// The reciprocal R_A reading with the current reversed.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub ra_reciprocal_reversed: Option<String>,

    /// R_B = V/I of the configuration turned by one contact.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub rb: String,

    /// R_B read with the current reversed.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub rb_reversed: Option<String>,

    /// R_B read with current and voltage contacts swapped.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub rb_reciprocal: Option<String>,

    /// The reciprocal R_B reading with the current reversed.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub rb_reciprocal_reversed: Option<String>,

    /// Layer thickness: 2um, 0.0002. Gives the resistivity and the volume carrier density, and
    /// is needed for the cross-check.
    #[arg(long, value_name = "T", allow_hyphen_values = true)]
    pub thickness: Option<String>,

    /// Net Hall voltage V2 - V4, already averaged over field and current reversal: -6.25mV.
    #[arg(
        long,
        value_name = "V",
        allow_hyphen_values = true,
        conflicts_with = "hall_readings"
    )]
    pub hall_voltage: Option<String>,

    /// The four Hall readings V2 - V4 at (+B,+I), (+B,-I), (-B,+I), (-B,-I), comma-separated:
    /// 7.1mV,-2.9mV,3.1mV,-6.9mV. Averaged as (V1 - V2 - V3 + V4)/4.
    #[arg(long, value_name = "V1,V2,V3,V4", allow_hyphen_values = true)]
    pub hall_readings: Option<String>,

    /// Current of the Hall measurement (magnitude): 100uA.
    #[arg(long, value_name = "I", allow_hyphen_values = true)]
    pub current: Option<String>,

    /// Magnetic field (magnitude): 0.5T, 500mT or 5000G.
    #[arg(long, value_name = "B", allow_hyphen_values = true)]
    pub field: Option<String>,

    /// Hall scattering factor r_H: unity (default), acoustic-phonon (3 pi/8),
    /// ionized-impurity (315 pi/512), or a number between 0.1 and 10.
    #[arg(long, value_name = "R_H")]
    pub hall_factor: Option<String>,

    /// Material of the layer, for the cross-check.
    #[arg(long, value_name = "ID", default_value = "si")]
    pub material: String,

    /// Dopant of the layer for the cross-check (default: the material's first dopant of the
    /// type the Hall voltage shows that a conversion model covers, e.g. P or B in silicon).
    #[arg(long, value_name = "SPECIES")]
    pub dopant: Option<String>,

    /// Temperature of the measurement, for the cross-check: 296.15, 300K or 23C.
    #[arg(
        long,
        value_name = "T",
        allow_hyphen_values = true,
        default_value = "296.15"
    )]
    pub temperature: String,

    /// Uncertainty of each of R_A and R_B (after averaging): 0.5% or an amount such as 0.05ohm.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub resistance_uncertainty: Option<String>,

    /// Uncertainty of the thickness: 2% or an amount such as 0.05um.
    #[arg(
        long,
        value_name = "SPREAD",
        allow_hyphen_values = true,
        requires = "thickness"
    )]
    pub thickness_uncertainty: Option<String>,

    /// Uncertainty of the net Hall voltage: 1% or an amount such as 20uV.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub hall_voltage_uncertainty: Option<String>,

    /// Uncertainty of the current: 0.1% or an amount such as 0.1uA.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub current_uncertainty: Option<String>,

    /// Uncertainty of the field: 1% or an amount such as 5mT.
    #[arg(long, value_name = "SPREAD", allow_hyphen_values = true)]
    pub field_uncertainty: Option<String>,

    /// Write one JSON object instead of the table.
    #[arg(long)]
    pub json: bool,
}
