//! `bandgauge probe`: table and JSON against bandgauge-core and the published probe formulas and tables; refused input.

mod support;

use std::f64::consts::{LN_2, PI};

use bandgauge_core::materials;
use bandgauge_core::mobility::MobilityModel;
use bandgauge_core::probe::{self, ProbeGeometry, ProbeReading, ReadingTemperature};
use serde_json::Value;
use support::{assert_near, json, number, refused, relative_difference, success, usage_error};

/// Closed-form probe formulas evaluated twice in f64: a few ulp.
const FORMULA_ROUNDING: f64 = 1e-14;
/// Same computation in a differently optimised build (the binary versus this test).
const SAME_CODE_OTHER_BUILD: f64 = 1e-9;
/// Smits's tables print four decimals.
const FOUR_DECIMAL_TABLE: f64 = 1e-4;
/// His formula and printed table agree to about 1e-4 (rounding of the table).
const SMITS_TABLE_AGREEMENT: f64 = 2e-4;

/// The binary's number `key` equals the core's own result up to the build difference.
fn assert_same_as_core(output: &Value, key: &str, core: f64) {
    assert_near(output, key, core, SAME_CODE_OTHER_BUILD);
}

fn reading(thickness_cm: Option<f64>, diameter_cm: Option<f64>) -> ProbeReading {
    ProbeReading {
        volts: 0.0125,
        amps: 0.001,
        spacing_cm: 0.1,
        geometry: ProbeGeometry::ThinLayer,
        thickness_cm,
        diameter_cm,
        temperature: None,
    }
}

#[test]
fn thin_layer_is_the_default_and_gives_the_sheet_resistance() {
    let output = json("probe --volts 0.01 --amps 0.001 --spacing 0.1 --json");
    // Source: Valdes, Proc. IRE 42, 420 (1954): R_s = (pi/ln 2) V/I on a thin sheet,
    // pi/ln 2 = 4.5324, so 10 ohm gives 45.32 ohm/sq.
    assert_near(&output, "sheet_resistance_ohm_sq", 45.324, 1e-5);
    assert_eq!(
        format!("{:.2}", number(&output, "sheet_resistance_ohm_sq")),
        "45.32"
    );
    assert!(
        output["resistivity_ohm_cm"].is_null(),
        "no thickness, no resistivity"
    );
    assert_eq!(output["geometry"], "thin-layer");
    assert!(
        output["geometry_meaning"]
            .as_str()
            .unwrap()
            .starts_with("thin layer or wafer")
    );
    assert!(output["caution"].as_str().unwrap().contains("thin layer"));
    let notes = output["notes"].as_array().unwrap();
    assert!(
        notes
            .iter()
            .any(|n| n.as_str().unwrap().contains("thin-layer assumption"))
    );
    assert_eq!(output["corrections"], serde_json::json!({}));
    // The table says the same.
    let text = success("probe --volts 0.01 --amps 0.001 --spacing 0.1");
    assert!(text.contains("sheet resistance  45.32  ohm/sq"), "{text}");
    assert!(
        text.contains("geometry: thin-layer (thin layer or wafer"),
        "{text}"
    );
    assert!(
        !text
            .lines()
            .any(|l| l.trim_start().starts_with("resistivity")),
        "{text}"
    );
}

#[test]
fn a_diameter_without_a_thickness_corrects_the_sheet_resistance() {
    let output = json("probe --volts 0.01 --amps 0.001 --spacing 0.1 --diameter 1 --json");
    // Source: Smits, Bell Syst. Tech. J. 37, 711 (1958), closed form for a centred probe on a
    // circular slice, C = pi / (ln 2 + ln((D^2 + 3)/(D^2 - 3))); at D = d/s = 10, C = 4.17119,
    // so R_s = C V/I = 41.7119 ohm/sq (thin-layer assumption: no thickness given).
    assert_near(&output, "sheet_resistance_ohm_sq", 41.7119, 3e-6);
    assert!(output["resistivity_ohm_cm"].is_null());
    assert_eq!(output["geometry"], "thin-layer");
    let corrections = output["corrections"].as_object().unwrap();
    assert_eq!(corrections.keys().collect::<Vec<_>>(), ["diameter"]);
}

#[test]
fn bulk_sample() {
    let output = json("probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --json");
    // Source: Valdes, Proc. IRE 42, 420 (1954): rho = 2 pi s V/I for a semi-infinite body:
    // 2 pi x 0.1 cm x 10 ohm = 6.283 ohm cm.
    assert_near(
        &output,
        "resistivity_ohm_cm",
        2.0 * PI * 0.1 * 10.0,
        FORMULA_ROUNDING,
    );
    assert_eq!(
        format!("{:.3}", number(&output, "resistivity_ohm_cm")),
        "6.283"
    );
    assert!(output["sheet_resistance_ohm_sq"].is_null());
    assert_eq!(output["geometry"], "bulk");
    assert!(output["caution"].as_str().unwrap().contains("bulk sample"));
    // With a thickness the bulk form carries the same image series: the same resistivity as a
    // thin layer of that thickness (Valdes 1954; Uhlir 1955), and a sheet resistance rho/t.
    let bulk = json(
        "probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.0525 --geometry bulk --json",
    );
    let layer = json("probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.0525 --json");
    for key in ["resistivity_ohm_cm", "sheet_resistance_ohm_sq"] {
        assert!(
            relative_difference(number(&bulk, key), number(&layer, key)) < 1e-12,
            "{key}"
        );
    }
    // The density and its interval work on a bulk sample without a thickness.
    let with_dopant = json(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --dopant B \
         --volts-uncertainty 1% --json",
    );
    let density = number(&with_dopant, "density_cm3");
    assert!(
        number(&with_dopant["interval"], "low") < density
            && density < number(&with_dopant["interval"], "high")
    );
}

#[test]
fn thin_layer_tends_to_pi_over_ln_2() {
    // t/s = 0.001: the thickness factor differs from 1 by far less than the tolerance.
    let output = json("probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 1e-4 --json");
    // Source: Smits, Bell Syst. Tech. J. 37, 711 (1958) (and Valdes 1954): R_s = (pi/ln 2) V/I
    // = 4.532 V/I for an infinitely thin, infinitely large sheet.
    let expected = PI / LN_2 * 12.5;
    assert_near(&output, "sheet_resistance_ohm_sq", expected, 1e-6);
    assert_near(&output, "resistivity_ohm_cm", expected * 1e-4, 1e-6);
}

#[test]
fn json_has_every_correction_by_name_and_equals_the_core_result() {
    let output =
        json("probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.1 --diameter 4 --json");
    let core = probe::evaluate(&reading(Some(0.1), Some(4.0))).unwrap();
    assert_same_as_core(
        &output,
        "sheet_resistance_ohm_sq",
        core.sheet_resistance_ohm_sq.unwrap(),
    );
    assert_same_as_core(
        &output,
        "resistivity_ohm_cm",
        core.resistivity_ohm_cm.unwrap(),
    );
    let corrections = output["corrections"].as_object().unwrap();
    assert_eq!(
        corrections.keys().collect::<Vec<_>>(),
        ["diameter", "thickness"]
    );
    // Source: Smits, Bell Syst. Tech. J. 37, 711 (1958), table of the thickness factor
    // F(w/s): F(1.0) = 0.9214 (from memory; the image series of Valdes 1954 gives 0.92146).
    assert!((number(&corrections["thickness"], "factor") - 0.9214).abs() < FOUR_DECIMAL_TABLE);
    // Source: Smits 1958, circular slice with the probe at the centre:
    // C = pi / (ln 2 + ln((D^2 + 3)/(D^2 - 3))), D = d/s; at D = 40, C = 4.50797, i.e. a
    // factor C/(pi/ln 2) on the infinite-sheet value.
    let expected_diameter = 4.50797 / (PI / LN_2);
    assert!(
        (number(&corrections["diameter"], "factor") - expected_diameter).abs()
            < SMITS_TABLE_AGREEMENT
    );
    assert!(
        corrections["diameter"]["source"]
            .as_str()
            .unwrap()
            .contains("Smits 1958")
    );
}

#[test]
fn lengths_with_units_are_read() {
    let plain = json("probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.0525 --json");
    let units = json("probe --volts 12.5mV --amps '1 mA' --spacing 1mm --thickness 525um --json");
    for key in ["sheet_resistance_ohm_sq", "resistivity_ohm_cm"] {
        assert!(
            relative_difference(number(&units, key), number(&plain, key)) < 1e-12,
            "{key}"
        );
    }
}

#[test]
fn temperature_correction_to_23_c() {
    let output = json(
        "probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.0525 \
         --temperature-c 25 --dopant B --json",
    );
    let mut with_temperature = reading(Some(0.0525), None);
    with_temperature.temperature = Some(ReadingTemperature {
        temperature_c: 25.0,
        material: materials::silicon(),
        dopant: "B".into(),
        mobility: MobilityModel::Masetti,
    });
    let core = probe::evaluate(&with_temperature).unwrap();
    assert_same_as_core(
        &output,
        "resistivity_ohm_cm",
        core.resistivity_ohm_cm.unwrap(),
    );
    let factor = number(&output["corrections"]["temperature"], "factor");
    // Common practice, no source: silicon near room temperature is lattice-scattering
    // limited, so a reading 2 K above 23 C is a little high and is corrected downwards.
    assert!((0.95..1.0).contains(&factor), "{factor}");
    assert_eq!(number(&output, "temperature_c"), 25.0);
    // With a dopant the density and its interval come too.
    assert_eq!(output["type"], "p");
    assert_eq!(output["model"], "masetti");
    let density = number(&output, "density_cm3");
    assert!(
        number(&output["interval"], "low") <= density
            && density <= number(&output["interval"], "high")
    );
}

#[test]
fn uncertainties_give_a_density_interval() {
    let output = json(
        "probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.0525 --dopant P \
         --volts-uncertainty 1% --thickness-uncertainty 10um --json",
    );
    let interval = &output["interval"];
    assert_eq!(interval["quantity"], "density_cm3");
    let sources: Vec<&str> = interval["contributions"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["source"].as_str().unwrap())
        .collect();
    assert_eq!(sources, ["volts", "thickness_cm", "model spread"]);
    // 10 um on 525 um is 1.9 %: the thickness dominates the 1 % voltage.
    let half_width = |source: &str| {
        let c = interval["contributions"]
            .as_array()
            .unwrap()
            .iter()
            .find(|c| c["source"] == source)
            .unwrap();
        number(c, "relative_half_width")
    };
    assert!(half_width("thickness_cm") > half_width("volts"));
}

#[test]
fn table_shows_the_results_and_the_caution() {
    let text =
        success("probe --volts 0.0125 --amps 0.001 --spacing 0.1 --thickness 0.0525 --diameter 15");
    let core = probe::evaluate(&reading(Some(0.0525), Some(15.0))).unwrap();
    assert!(text.starts_with("Four-point probe: V 0.01250 V, I 0.001000 A, spacing 0.1000 cm, thickness 0.05250 cm, diameter 15.00 cm\n"));
    let sheet = text
        .lines()
        .find(|l| l.trim_start().starts_with("sheet resistance"))
        .unwrap();
    assert!(
        sheet.ends_with(&format!(
            "{:.2}  ohm/sq",
            core.sheet_resistance_ohm_sq.unwrap()
        )),
        "{sheet}"
    );
    assert!(text.contains("\nCorrections applied\n"));
    assert!(
        text.lines()
            .any(|l| l.trim_start().starts_with("thickness "))
    );
    assert!(
        text.lines()
            .any(|l| l.trim_start().starts_with("diameter "))
    );
    let caution = text.lines().last().unwrap();
    assert!(caution.starts_with(
        "Caution: model estimates (four-point probe on a thin layer or wafer: sheet resistance R_s \
         = (pi/ln 2) V/I x corrections, resistivity R_s t only with a thickness (Valdes 1954)"
    ));
    assert!(
        caution.ends_with(
            "the fab's own specifications and the governing standards decide acceptance."
        )
    );
}

#[test]
fn refused_readings() {
    refused(
        "probe --volts 0.01 --amps 0 --spacing 0.1",
        "--amps: \"0\" is not allowed; give a current > 0 A",
    );
    refused(
        "probe --volts abc --amps 0.001 --spacing 0.1",
        "--volts: \"abc\" is not a number; give a voltage such as 0.0125 or 12.5 mV; units: V (default), mV, uV, µV",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing -1",
        "--spacing: \"-1\" is not allowed; give a length > 0 cm",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --thickness 3in",
        "--thickness: \"3in\": \"in\" is not an accepted length unit; allowed: cm (default), mm, um, µm, nm, m",
    );
}

#[test]
fn refused_geometries() {
    // Source: Smits 1958: the outer probes must lie on the slice, d/s > sqrt 3.
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --thickness 0.05 --diameter 0.15",
        "--diameter: 0.15 cm is too small for probe spacing 0.1 cm; the diameter correction needs diameter > sqrt(3) x spacing = 0.1732 cm",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --diameter 15",
        "--diameter: the diameter correction (Smits 1958) is for a thin layer or wafer, not a bulk sample; leave --diameter out or use --geometry thin-layer",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry slab",
        "--geometry: \"slab\" is not a sample geometry; allowed: thin-layer (sheet resistance of a layer or thin wafer; resistivity with --thickness) or bulk (semi-infinite sample: resistivity)",
    );
    // A density needs a resistivity: a thin layer without a thickness has none.
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --dopant B",
        "--dopant: a dopant density needs the resistivity, which a thin layer gives only with its thickness: add --thickness, or --geometry bulk for a bulk sample",
    );
    // A thickness-to-spacing ratio beyond f64 is one the thickness correction cannot handle.
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 1e-10 --thickness 1e300",
        "--thickness: thickness_cm / spacing_cm: inf is not allowed; give a finite value > 0",
    );
}

#[test]
fn refused_temperatures_dopants_and_models() {
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --temperature-c -300 --dopant B",
        "--temperature-c: \"-300\" is -26.85 K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --temperature-c 400 --dopant B",
        "--temperature-c: 400 C is outside the range of every model for B in si that could be chosen by default; \
         name one with --model (thurber, masetti, arora, lattice)",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --dopant B --model thurber \
         --temperature-c 30",
        "--temperature-c: 303.15 is not allowed for the empirical relation, which holds at 23 C; give 295.15 to 297.15 K, \
         correct the reading to 23 C first, or choose a physics model",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --dopant Xx",
        "--dopant: \"Xx\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In",
    );
    refused(
        "probe --volts 0.01 --amps 0.001 --spacing 0.1 --geometry bulk --dopant B --volts-uncertainty 0.02",
        "--volts-uncertainty: 0.02000 V reaches the value itself (0.01000 V); give an uncertainty smaller than the value",
    );
    // Outside the empirical relation's range: stated 1e-4 to 1e4 ohm cm for boron (ASTM F723).
    refused(
        "probe --volts 1e-9 --amps 1 --spacing 0.1 --geometry bulk --dopant B",
        "--volts: the reading's resistivity cannot be converted: resistivity_ohm_cm: 6.283185307179587e-10 ohm cm is \
         outside the boron relation (ASTM F723, 23 C); give 1e-4 to 1e4 ohm cm",
    );
}

#[test]
fn options_that_need_a_dopant_are_usage_errors() {
    usage_error("probe --volts 0.01 --amps 0.001 --spacing 0.1 --temperature-c 25");
    usage_error("probe --volts 0.01 --amps 0.001 --spacing 0.1 --volts-uncertainty 1%");
    usage_error("probe --volts 0.01 --amps 0.001");
}
