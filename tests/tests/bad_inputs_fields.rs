//! Bad-input catalogue, page fields: every kind of bad value a field of the page can hold, one
//! test per case, each with the exact sentence the page shows under the field (or in the
//! view's "Cannot compute" line). The page's parsers are plain Rust in `bandgauge-app`, so these
//! run natively, with the field labels the views pass them.

use bandgauge_app::carriers::{self, Request};
use bandgauge_app::entry;
use bandgauge_app::lots_view::{self, LotsWork};
use bandgauge_app::resistivity;
use bandgauge_app::state::{ConversionInputs, DopantRow};
use bandgauge_app::sweep;
use bandgauge_core::materials::{self, DopantDensity};
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::units::QuantityKind;

/// The sentence of a refused value; panics if the value was taken.
fn refused<T: std::fmt::Debug>(result: Result<T, String>) -> String {
    match result {
        Err(message) => message,
        Ok(value) => panic!("the field took the value ({value:?}); expected a refusal"),
    }
}

/// One `#[test]` per refused field value: `name: parse call => exact sentence`.
macro_rules! fields {
    ($($name:ident: $parse:expr => $message:expr;)+) => {
        $(
            #[test]
            fn $name() {
                assert_eq!(refused($parse), $message);
            }
        )+
    };
}

const TEMPERATURE_UNITS: &str = "K (default), C, °C";
const DENSITY_UNITS: &str = "cm^-3 (default), cm-3, /cm3, /cm^3, cm⁻³, m^-3, m-3, /m3, /m^3, m⁻³";
const RESISTIVITY_UNITS: &str = "ohm-cm (default), mohm-cm, kohm-cm, ohm-m";
const LENGTH_UNITS: &str = "cm (default), mm, um, µm, nm, m";

// ---------------------------------------------------------------------------------------------
// Number fields (entry.rs): temperature, densities, lengths, counts
// ---------------------------------------------------------------------------------------------

fields! {
    temperature_empty: entry::temperature_k("temperature", "  ") =>
        format!("temperature: nothing was given; give a temperature as a number, optionally with a unit: {TEMPERATURE_UNITS}");
    temperature_not_a_number: entry::temperature_k("temperature", "room") =>
        format!("temperature: \"room\" is not a number; give a temperature such as 300, 300K or 27C; units: {TEMPERATURE_UNITS}");
    temperature_in_fahrenheit: entry::temperature_k("temperature", "77 F") =>
        format!("temperature: \"77 F\": \"F\" is not an accepted temperature unit; allowed: {TEMPERATURE_UNITS}");
    temperature_negative_kelvin: entry::temperature_k("temperature", "-5") =>
        "temperature: -5 K is not allowed; give a temperature above 0 K (-273.15 C)";
    temperature_zero: entry::temperature_k("temperature", "0 K") =>
        "temperature: 0 K is not allowed; give a temperature above 0 K (-273.15 C)";
    temperature_below_absolute_zero_in_celsius: entry::temperature_k("temperature", "-300 C") =>
        "temperature: -26.85 K is not allowed; give a temperature above 0 K (-273.15 C)";
    temperature_nan: entry::temperature_k("temperature", "NaN") =>
        format!("temperature: \"NaN\" is not a number; give a temperature such as 300, 300K or 27C; units: {TEMPERATURE_UNITS}");
    temperature_overflows: entry::temperature_k("temperature", "1e999") =>
        "temperature: \"1e999\" is not a finite temperature; give a finite number (about 1e308 at most)";
    temperature_with_a_decimal_comma: entry::temperature_k("temperature", "300,5") =>
        "temperature: \"300,5\" contains a comma; write decimals with a point (2.5, not 2,5) and no thousands separators";
    sweep_from_negative: entry::temperature_k("from", "-1e-3") =>
        "from: -0.001 K is not allowed; give a temperature above 0 K (-273.15 C)";
    sweep_to_not_a_number: entry::temperature_k("to", "hot") =>
        format!("to: \"hot\" is not a number; give a temperature such as 300, 300K or 27C; units: {TEMPERATURE_UNITS}");
    dopant_density_negative: entry::density_cm3("P density", "-1e15") =>
        "P density: -1e15 cm^-3 is not allowed; give a density >= 0";
    dopant_density_in_a_wrong_unit: entry::density_cm3("P density", "1e15 cm^-2") =>
        format!("P density: \"1e15 cm^-2\": \"cm^-2\" is not an accepted density unit; allowed: {DENSITY_UNITS}");
    dopant_density_not_a_number: entry::density_cm3("B density", "1e15x") =>
        format!("B density: \"1e15x\": \"x\" is not an accepted density unit; allowed: {DENSITY_UNITS}");
    dopant_density_infinite: entry::density_cm3("B density", "-inf") =>
        format!("B density: \"-inf\" is not a number; give a density such as 1e15 or 2.3x10^15 cm^-3; units: {DENSITY_UNITS}");
    dopant_density_empty: entry::density_cm3("B density", "") =>
        format!("B density: nothing was given; give a density as a number, optionally with a unit: {DENSITY_UNITS}");
    thickness_zero: entry::positive("thickness", "0 um", QuantityKind::Length, "cm") =>
        "thickness: 0 cm is not allowed; give a value > 0";
    thickness_negative: entry::positive("thickness", "-525 um", QuantityKind::Length, "cm") =>
        "thickness: -0.0525 cm is not allowed; give a value > 0";
    thickness_in_inches: entry::positive("thickness", "0.02 in", QuantityKind::Length, "cm") =>
        format!("thickness: \"0.02 in\": \"in\" is not an accepted length unit; allowed: {LENGTH_UNITS}");
    sweep_points_not_whole: entry::count("points", "12.5", 2, sweep::MAX_POINTS) =>
        "points: \"12.5\" is not a whole number; give a whole number from 2 to 1000";
    sweep_points_too_few: entry::count("points", "1", 2, sweep::MAX_POINTS) =>
        "points: 1 is not allowed; give a whole number from 2 to 1000";
    sweep_points_too_many: entry::count("points", "100000", 2, sweep::MAX_POINTS) =>
        "points: 100000 is not allowed; give a whole number from 2 to 1000";
    sweep_points_negative: entry::count("points", "-3", 2, sweep::MAX_POINTS) =>
        "points: \"-3\" is not a whole number; give a whole number from 2 to 1000";
    sweep_points_empty: entry::count("points", "", 2, sweep::MAX_POINTS) =>
        "points: \"\" is not a whole number; give a whole number from 2 to 1000";
}

// ---------------------------------------------------------------------------------------------
// Carriers view: material, dopant rows, model choices
// ---------------------------------------------------------------------------------------------

fn si() -> materials::Material {
    materials::silicon()
}

/// The messages of one dopant row: (species, density).
fn row(species: &str, density: &str) -> (Option<String>, Option<String>) {
    let read = carriers::read_rows(&si(), &[DopantRow::new(species, density)]);
    let r = read.into_iter().next().expect("one row read");
    (r.species.err(), r.density_cm3.err())
}

#[test]
fn dopant_row_unknown_species() {
    assert_eq!(
        row("Q", "1e15"),
        (
            Some(
                "species: dopant: 'Q' is not a known dopant of si; choose one of P, As, Sb, B, \
                 Al, Ga, In"
                    .to_owned()
            ),
            None
        )
    );
}

#[test]
fn dopant_row_empty_species_and_density() {
    // With no species the density field is labelled "density" alone.
    assert_eq!(
        row("", ""),
        (
            Some(
                "species: dopant: '' is not a known dopant of si; choose one of P, As, Sb, B, \
                 Al, Ga, In"
                    .to_owned()
            ),
            Some(format!(
                "density: nothing was given; give a density as a number, optionally with a \
                 unit: {DENSITY_UNITS}"
            ))
        )
    );
}

#[test]
fn dopant_row_bad_density_names_its_species() {
    assert_eq!(
        row("As", "2,3e15"),
        (
            None,
            Some(
                "As density: \"2,3e15\" contains a comma; write decimals with a point (2.5, not \
                 2,5) and no thousands separators"
                    .to_owned()
            )
        )
    );
}

fields! {
    material_unknown: carriers::material_of("sic") =>
        "material: 'sic' is not a known material; choose one of si, ge, gaas, gan";
    intrinsic_model_unknown: carriers::intrinsic_model("exact", &si()) =>
        "intrinsic model: 'exact' is unknown; choose dos or fit";
    intrinsic_fit_missing: carriers::intrinsic_model("fit", &materials::gallium_arsenide()) =>
        "intrinsic model: Gallium arsenide has no published direct fit of ni(T)";
    ionization_model_unknown: carriers::ionization_model("hydrogenic") =>
        "dopant levels: ionization model: 'hydrogenic' is not known; use one of altermatt, pearson-bardeen, dilute";
    gap_narrowing_missing: carriers::band_gap_narrowing(true, &materials::germanium()) =>
        "band-gap narrowing: no parameter set for Germanium; switch it off";
    mobility_model_unknown: carriers::mobility_model("irvin", &si(), "P") =>
        "mobility model: 'irvin' is not known; use one of masetti, arora, caughey-thomas, lattice";
    mobility_model_without_parameters: carriers::mobility_model("caughey-thomas", &si(), "P") =>
        "mobility model: Caughey-Thomas form (Sotoodeh et al. 2000 parameters) has no parameters for Silicon doped with P";
}

/// A carriers request with every field valid but the temperature.
fn request_at(temperature_k: f64, doping: Vec<DopantDensity>) -> Request {
    Request {
        material: si(),
        temperature_k,
        doping,
        options: SolveOptions::default(),
        mobility_key: String::new(),
        thickness_cm: 0.0525,
    }
}

fields! {
    carriers_where_the_gap_closes: carriers::evaluate(&request_at(1e5, Vec::new())).map(|_| ()) =>
        "temperature_k: 100000 is not allowed for si: the band gap model gives -45.8311 eV there; \
         give a temperature where the gap is > 0";
}

// ---------------------------------------------------------------------------------------------
// Sweep view
// ---------------------------------------------------------------------------------------------

fields! {
    sweep_where_the_gap_closes: sweep::evaluate(&si(), &[], &SolveOptions::default(), 1e5, 2e5, 3).map(|_| ()) =>
        "no temperature in the range could be solved: temperature_k: 100000 is not allowed for si: \
         the band gap model gives -45.8311 eV there; give a temperature where the gap is > 0";
}

// ---------------------------------------------------------------------------------------------
// Resistivity & probe view
// ---------------------------------------------------------------------------------------------

fields! {
    resistivity_zero: entry::positive("resistivity", "0", QuantityKind::Resistivity, "ohm-cm") =>
        "resistivity: 0 ohm-cm is not allowed; give a value > 0";
    resistivity_in_ohm_per_square: entry::positive("resistivity", "45 ohm/sq", QuantityKind::Resistivity, "ohm-cm") =>
        format!("resistivity: \"45 ohm/sq\": \"ohm/sq\" is not an accepted resistivity unit; allowed: {RESISTIVITY_UNITS}");
    density_negative: entry::positive("density", "-1e16", QuantityKind::Density, "cm^-3") =>
        "density: -1e16 cm^-3 is not allowed; give a value > 0";
    resistivity_outside_every_model: resistivity::compare_at_23c(bandgauge_app::state::Given::Resistivity, 1e9, "B").and_then(|c| {
        // Every model refuses 1e9 ohm cm: the view then has nothing to show but the reasons.
        c.answers.iter().find_map(|a| a.error.clone()).map_or(Ok(()), Err)
    }) =>
        "resistivity_ohm_cm: 1e9 ohm cm is outside the boron relation (ASTM F723, 23 C); give \
         1e-4 to 1e4 ohm cm";
}

/// The probe inputs of the page's defaults with `change` applied.
fn probe(change: impl FnOnce(&mut ConversionInputs)) -> resistivity::ProbeInputs {
    let mut inputs = ConversionInputs::default();
    change(&mut inputs);
    resistivity::read_probe(&inputs)
}

fields! {
    probe_current_zero: probe(|c| c.probe_current = "0 mA".into()).amps =>
        "current: 0 A is not allowed; give a value > 0";
    probe_current_in_volts: probe(|c| c.probe_current = "1 mV".into()).amps =>
        "current: \"1 mV\": \"mV\" is not an accepted current unit; allowed: A (default), mA, uA, µA, nA";
    probe_voltage_negative: probe(|c| c.probe_voltage = "-4.5 mV".into()).volts =>
        "voltage: -0.0045 V is not allowed; give a value > 0";
    probe_spacing_empty: probe(|c| c.probe_spacing = String::new()).spacing_cm =>
        format!("probe spacing: nothing was given; give a length as a number, optionally with a unit: {LENGTH_UNITS}");
    probe_thickness_negative: probe(|c| c.sample_thickness = "-1 mm".into()).thickness_cm =>
        "thickness: -0.1 cm is not allowed; give a value > 0";
    probe_diameter_not_a_number: probe(|c| c.wafer_diameter = "six inch".into()).diameter_cm =>
        format!("wafer diameter: \"six inch\" is not a number; give a length such as 0.0525 or 525 um; units: {LENGTH_UNITS}");
    probe_temperature_below_absolute_zero: probe(|c| c.probe_temperature = "-280 C".into()).temperature_c =>
        "temperature: -6.85 K is not allowed; give a temperature above 0 K (-273.15 C)";
    probe_diameter_smaller_than_the_probe: resistivity::evaluate_probe(&probe(|c| c.wafer_diameter = "1 mm".into()), "B").expect("all fields valid") =>
        "diameter_cm: 0.1 cm is too small for probe spacing 0.1 cm; the diameter correction needs \
         diameter > sqrt(3) x spacing = 0.1732 cm";
    probe_temperature_beyond_the_mobility_models: resistivity::evaluate_probe(&probe(|c| c.probe_temperature = "400 C".into()), "B").expect("all fields valid") =>
        "temperature correction: temperature_k: 673.15 K is outside the range of the masetti mobility model; give 200 to 500 K";
    probe_reading_outside_the_float_range: resistivity::evaluate_probe(&probe(|c| { c.probe_voltage = "1e300".into(); c.probe_current = "1e-300".into(); }), "B").expect("all fields valid") =>
        "volts / amps: the inputs give inf, outside the range of floating-point numbers; check the \
         units of the voltage, current and lengths";
}

// ---------------------------------------------------------------------------------------------
// Wafer-lots view: the spec window and what a file read shows
// ---------------------------------------------------------------------------------------------

fields! {
    spec_limits_reversed: lots_view::spec_from_inputs("resistivity", "12", "8") =>
        "MIN 12 is not below MAX 8; give the lower limit first";
    spec_density_limits_reversed: lots_view::spec_from_inputs("density", "5.5e14", "3.5e14") =>
        "MIN 5.5e14 is not below MAX 3.5e14; give the lower limit first";
    spec_limit_zero: lots_view::spec_from_inputs("resistivity", "0", "12") =>
        "MIN: 0 ohm-cm is not allowed; give a finite value > 0 ohm-cm";
    spec_limit_not_a_number: lots_view::spec_from_inputs("resistivity", "8", "twelve") =>
        format!("MAX: \"twelve\" is not a number; give a resistivity such as 10 or 850 mohm-cm; units: {RESISTIVITY_UNITS}");
    spec_limit_in_a_wrong_unit: lots_view::spec_from_inputs("density", "1e15 ohm-cm", "") =>
        format!("MIN: \"1e15 ohm-cm\": \"ohm-cm\" is not an accepted density unit; allowed: {DENSITY_UNITS}");
    spec_limit_with_a_colon: lots_view::spec_from_inputs("resistivity", "8:9", "12") =>
        "\"8:9:12\" is not a window; give MIN:MAX (either side may be left empty for a one-sided \
         limit), e.g. 8:12 or 1e15:2e15";
}

/// What the page lists for a file read by the lots view: "name: message".
fn file_message(name: &str, text: &str) -> Result<(), String> {
    let mut work = LotsWork::new(None);
    work.read_text(name, text);
    match &work.files[0].error {
        Some(error) => Err(format!("{name}: {error}")),
        None => Ok(()),
    }
}

fields! {
    lot_file_empty: file_message("lots.csv", "") =>
        "lots.csv: no header line: the file is empty or holds only blank and comment lines; the \
         first other line must name the columns, e.g. lot,wafer,site,resistivity [ohm-cm]";
    lot_file_without_a_dopant: file_message("lots.csv", "lot,wafer,resistivity\nA1,1,10\n") =>
        "lots.csv: line 1: header: no dopant: add a dopant or type column, a line '# dopant: B' \
         before the header, or name the dopant for all files (--dopant)";
}

#[test]
fn lot_file_left_half_read_says_so() {
    let mut work = LotsWork::new(Some("B".into()));
    work.begin_file("big.csv", 1_000_000);
    work.feed(b"lot,wafer,resistivity\nA1,1,10\n");
    work.interrupt();
    assert_eq!(
        work.files[0].error.as_deref(),
        Some(
            "reading stopped when another view was opened; its rows so far are counted; pick the \
             file again to read all of it"
        )
    );
}
