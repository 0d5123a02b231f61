//! `bandgauge convert`: table and JSON against bandgauge-core and the published handbook table; refused input.

mod support;

use bandgauge_core::compare::{self, ConversionInput, ConversionModel};
use bandgauge_core::materials;
use bandgauge_core::neutrality::SolveOptions;
use serde_json::Value;
use support::{assert_near, json, number, refused, relative_difference, success, usage_error};

/// The handbook prints three significant digits: half a unit in the third digit of
/// the smallest mantissa used here (1.44) is 0.35 %.
const HANDBOOK_THREE_DIGITS: f64 = 4e-3;
/// The physics models are not fitted to the handbook table; at 1e15-1e16 cm^-3 the
/// Masetti mobility with full carrier statistics lands within 3 % of it.
const PHYSICS_VERSUS_HANDBOOK: f64 = 3e-2;
/// Same computation in a differently optimised build (the binary versus this test):
/// a few ulp, amplified at most by the inversion's tolerance (1e-9).
const SAME_CODE_OTHER_BUILD: f64 = 1e-9;

/// The binary's number `key` equals the core's own result up to the build difference.
fn assert_same_as_core(output: &Value, key: &str, core: f64) {
    assert_near(output, key, core, SAME_CODE_OTHER_BUILD);
}

fn core_conversion(
    dopant: &str,
    input: ConversionInput,
    temperature_k: f64,
    model: ConversionModel,
) -> compare::Conversion {
    compare::convert(
        &materials::silicon(),
        dopant,
        input,
        temperature_k,
        model,
        &SolveOptions::default(),
    )
    .unwrap()
}

#[test]
fn json_has_the_required_keys_and_equals_the_core_result() {
    let output = json("convert --material si --dopant B --density 1e16 --json");
    for key in [
        "density_cm3",
        "resistivity_ohm_cm",
        "type",
        "model",
        "interval",
        "models",
    ] {
        assert!(output.get(key).is_some(), "missing {key}");
    }
    assert_eq!(output["type"], "p");
    // At the default 23 C the empirical relation is the default model.
    assert_eq!(output["model"], "thurber");
    let core = core_conversion(
        "B",
        ConversionInput::DensityCm3(1e16),
        296.15,
        ConversionModel::Empirical,
    );
    assert_same_as_core(&output, "resistivity_ohm_cm", core.resistivity_ohm_cm);

    // Source: Hull (ed.), Properties of Crystalline Silicon, EMIS Datareviews 20 (1999),
    // resistivity-density table: p-type (boron) 1e16 cm^-3 -> 1.44 ohm cm.
    assert_near(&output, "resistivity_ohm_cm", 1.44, HANDBOOK_THREE_DIGITS);

    // models[]: one entry per applicable model, each {model, density_cm3, resistivity_ohm_cm}.
    let models = output["models"].as_array().unwrap();
    let ids: Vec<&str> = models
        .iter()
        .map(|m| m["model"].as_str().unwrap())
        .collect();
    assert_eq!(ids, ["thurber", "masetti", "arora", "lattice"]);
    for m in models {
        assert!(m.get("density_cm3").is_some() && m.get("resistivity_ohm_cm").is_some());
    }
    let masetti = &models[1];
    let core_masetti = core_conversion(
        "B",
        ConversionInput::DensityCm3(1e16),
        296.15,
        ConversionModel::Physics(bandgauge_core::mobility::MobilityModel::Masetti),
    );
    assert_same_as_core(
        masetti,
        "resistivity_ohm_cm",
        core_masetti.resistivity_ohm_cm,
    );
    // Source: Hull 1999 table as above, 1.44 ohm cm; the physics model is independent of it.
    assert_near(masetti, "resistivity_ohm_cm", 1.44, PHYSICS_VERSUS_HANDBOOK);
    // The lattice-only model cannot reach 1e16 cm^-3 and is listed with its reason.
    assert!(models[3]["resistivity_ohm_cm"].is_null());
    assert!(models[3]["error"].is_string());

    // The interval is on the resistivity and contains every model in the spread.
    let interval = &output["interval"];
    assert_eq!(interval["quantity"], "resistivity_ohm_cm");
    let (low, high) = (number(interval, "low"), number(interval, "high"));
    for m in models.iter().filter(|m| m["in_spread"] == true) {
        let rho = number(m, "resistivity_ohm_cm");
        assert!(low <= rho && rho <= high, "{rho} outside [{low}, {high}]");
    }
    assert_eq!(interval["dominant"], "model spread");
}

#[test]
fn phosphorus_both_directions_against_the_handbook() {
    // Source: Hull (ed.), Properties of Crystalline Silicon, EMIS Datareviews 20 (1999):
    // n-type (phosphorus) 1e16 cm^-3 -> 0.523 ohm cm; 1e15 -> 4.48 ohm cm.
    let forward = json("convert --dopant P --density 1e16 --json");
    assert_eq!(forward["type"], "n");
    assert_near(&forward, "resistivity_ohm_cm", 0.523, HANDBOOK_THREE_DIGITS);
    let back = json("convert --dopant P --resistivity 4.48 --json");
    let core = core_conversion(
        "P",
        ConversionInput::ResistivityOhmCm(4.48),
        296.15,
        ConversionModel::Empirical,
    );
    assert_same_as_core(&back, "density_cm3", core.density_cm3);
    // Source: ASTM F723 states round-trip self-consistency within 4.5 % for phosphorus;
    // the handbook's 4.48 ohm cm belongs to 1e15 cm^-3.
    assert_near(&back, "density_cm3", 1e15, 0.045);
}

#[test]
fn units_on_the_input_are_read() {
    let plain = json("convert --dopant B --resistivity 0.85 --json");
    for text in [
        "850 mohm-cm",
        "850mohm-cm",
        "0.85ohm-cm",
        "0.0085 ohm-m",
        "0.85 Ω·cm",
    ] {
        let other = json(&format!("convert --dopant B --resistivity '{text}' --json"));
        assert!(
            relative_difference(number(&other, "density_cm3"), number(&plain, "density_cm3"))
                < 1e-12,
            "{text}"
        );
    }
    let per_m3 = json("convert --dopant B --density 1e22m^-3 --json");
    assert_eq!(number(&per_m3, "density_cm3"), 1e16);
}

#[test]
fn a_named_model_and_temperature_are_used() {
    let output = json("convert --dopant P --density 1e15 --model masetti --temperature 300 --json");
    assert_eq!(output["model"], "masetti");
    assert_eq!(number(&output, "temperature_k"), 300.0);
    let core = core_conversion(
        "P",
        ConversionInput::DensityCm3(1e15),
        300.0,
        ConversionModel::Physics(bandgauge_core::mobility::MobilityModel::Masetti),
    );
    assert_same_as_core(&output, "resistivity_ohm_cm", core.resistivity_ohm_cm);
    // At 300 K the empirical relation (23 C only) is listed but not counted in the spread.
    let thurber = output["models"]
        .as_array()
        .unwrap()
        .iter()
        .find(|m| m["model"] == "thurber")
        .unwrap();
    assert_eq!(thurber["in_spread"], false);
    // Celsius is read too: 27C is 300.15 K.
    let celsius =
        json("convert --dopant P --density 1e15 --model masetti --temperature 27C --json");
    assert_eq!(number(&celsius, "temperature_k"), 300.15);
}

#[test]
fn uncertainty_widens_the_interval_and_names_what_drives_it() {
    let without = json("convert --dopant B --resistivity 10 --json");
    let with = json("convert --dopant B --resistivity 10 --resistivity-uncertainty 5% --json");
    let width = |v: &Value| number(&v["interval"], "high") / number(&v["interval"], "low");
    assert!(width(&with) > width(&without));
    assert_eq!(with["interval"]["quantity"], "density_cm3");
    assert_eq!(with["interval"]["dominant"], "resistivity_ohm_cm");
    // Away from heavy doping N ~ 1/rho, so a 5 % resistivity half-width gives about 5 % on N.
    let contribution = with["interval"]["contributions"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["source"] == "resistivity_ohm_cm")
        .unwrap();
    let half_width = number(contribution, "relative_half_width");
    assert!((0.045..0.06).contains(&half_width), "{half_width}");
    // An amount in a unit means the same as the percentage.
    let absolute =
        json("convert --dopant B --resistivity 10 --resistivity-uncertainty 500mohm-cm --json");
    assert_eq!(absolute["interval"], with["interval"]);
}

#[test]
fn table_lists_every_model_and_ends_with_the_caution() {
    let text = success("convert --dopant B --resistivity 10");
    assert!(
        text.starts_with(
            "Silicon (si) doped with B, p-type, at 296.15 K: resistivity 10.00 ohm-cm\n"
        ),
        "{text}"
    );
    let core = core_conversion(
        "B",
        ConversionInput::ResistivityOhmCm(10.0),
        296.15,
        ConversionModel::Empirical,
    );
    let density_row = text
        .lines()
        .find(|l| l.trim_start().starts_with("density "))
        .unwrap();
    assert!(
        density_row.contains(&format!("{:.3e}", core.density_cm3)),
        "{density_row}"
    );
    let models_at = text
        .lines()
        .position(|l| l == "Models side by side")
        .unwrap();
    let listed: Vec<&str> = text
        .lines()
        .skip(models_at + 2)
        .take(4)
        .map(|l| l.split_whitespace().next().unwrap())
        .collect();
    assert_eq!(listed, ["thurber", "masetti", "arora", "lattice"]);
    assert!(text.contains("  spread: "));
    assert_eq!(
        text.lines().last().unwrap(),
        "Caution: model estimates (thurber: Thurber et al. empirical relation (ASTM F723), 23 C); \
         the fab's own specifications and the governing standards decide acceptance."
    );
}

#[test]
fn refused_values() {
    refused(
        "convert --dopant B --resistivity 0",
        "--resistivity: \"0\" is not allowed; give a resistivity > 0 ohm-cm",
    );
    refused(
        "convert --dopant B --resistivity -5",
        "--resistivity: \"-5\" is not allowed; give a resistivity > 0 ohm-cm",
    );
    refused(
        "convert --dopant B --resistivity 2,5",
        "--resistivity: \"2,5\" contains a comma; write decimals with a point (2.5, not 2,5) and no thousands separators",
    );
    refused(
        "convert --dopant B --resistivity '10 ohm'",
        "--resistivity: \"10 ohm\": \"ohm\" is not an accepted resistivity unit; allowed: ohm-cm (default), mohm-cm, kohm-cm, ohm-m",
    );
    refused(
        "convert --dopant B --resistivity inf",
        "--resistivity: \"inf\" is not a number; give a resistivity such as 10 or 850 mohm-cm; units: ohm-cm (default), mohm-cm, kohm-cm, ohm-m",
    );
    refused(
        "convert --dopant P --density -1e15",
        "--density: \"-1e15\" is not allowed; give a density > 0 cm^-3",
    );
}

#[test]
fn refused_outside_a_model_validity() {
    // Source: the stated range of the boron relation, 1e-4 to 1e4 ohm cm (ASTM F723).
    refused(
        "convert --dopant B --resistivity 1e6",
        "--resistivity: 1e6 ohm cm is outside the boron relation (ASTM F723, 23 C); give 1e-4 to 1e4 ohm cm",
    );
    refused(
        "convert --dopant P --density 1e22",
        "--density: 1.0000e22 cm^-3 is outside the phosphorus relation (ASTM F723, 23 C); give 1.066e12 to 5.000e20 cm^-3 \
         (the phosphorus relations break down above 5e20 cm^-3)",
    );
    refused(
        "convert --dopant B --resistivity 10 --model thurber --temperature 350",
        "--temperature: 350 is not allowed for the empirical relation, which holds at 23 C; give 295.15 to 297.15 K, \
         correct the reading to 23 C first, or choose a physics model",
    );
    refused(
        "convert --dopant B --resistivity 10 --temperature 600",
        "--temperature: 600 K is outside the range of every model for B in si that could be chosen by default; \
         name one with --model (thurber, masetti, arora, lattice)",
    );
    refused(
        "convert --dopant B --resistivity 1e-4 --resistivity-uncertainty 10%",
        "--resistivity-uncertainty: at the resistivity_ohm_cm low end of the uncertainty: resistivity_ohm_cm: 9e-5 \
         ohm cm is outside the boron relation (ASTM F723, 23 C); give 1e-4 to 1e4 ohm cm",
    );
}

#[test]
fn refused_dopants_models_and_uncertainties() {
    refused(
        "convert --dopant Xx --resistivity 10",
        "--dopant: \"Xx\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In",
    );
    refused(
        "convert --material ge --dopant P --resistivity 10",
        "--dopant: no conversion model covers P in ge; see `bandgauge materials`",
    );
    refused(
        "convert --dopant B --resistivity 10 --model foo",
        "--model: 'foo' is not known; use one of thurber, masetti, arora, caughey-thomas, lattice",
    );
    refused(
        "convert --dopant B --resistivity 10 --model caughey-thomas",
        "--model: \"caughey-thomas\" does not cover B in si; give one of thurber, masetti, arora, lattice",
    );
    refused(
        "convert --dopant B --resistivity 10 --resistivity-uncertainty -2%",
        "--resistivity-uncertainty: \"-2%\" is negative; give a resistivity uncertainty >= 0, as a percentage (2%) \
         or an amount in ohm-cm (default), mohm-cm, kohm-cm, ohm-m",
    );
    refused(
        "convert --dopant B --resistivity 10 --resistivity-uncertainty 100%",
        "--resistivity-uncertainty: 10.00 ohm-cm reaches the value itself (10.00 ohm-cm); give an uncertainty smaller than the value",
    );
}

#[test]
fn an_uncertainty_must_belong_to_the_given_value() {
    refused(
        "convert --dopant B --density 1e16 --resistivity-uncertainty 2%",
        "--resistivity-uncertainty: applies only to the value converted from; give --density-uncertainty with --density",
    );
    refused(
        "convert --dopant B --resistivity 10 --density-uncertainty 2%",
        "--density-uncertainty: applies only to the value converted from; give --resistivity-uncertainty with --resistivity",
    );
}

#[test]
fn usage_errors_exit_with_code_2() {
    usage_error("convert --dopant B --resistivity 10 --density 1e15");
    usage_error("convert --dopant B");
    usage_error("convert --resistivity 10");
}

#[test]
fn ionization_model_option_reaches_the_physics_models() {
    let output = json(
        "convert --dopant P --density 1e19 --model masetti --temperature 300 \
         --ionization-model dilute --json",
    );
    let core = compare::convert(
        &materials::silicon(),
        "P",
        ConversionInput::DensityCm3(1e19),
        300.0,
        ConversionModel::Physics(bandgauge_core::mobility::MobilityModel::Masetti),
        &SolveOptions {
            ionization_model: bandgauge_core::ionization::IonizationModel::Dilute,
            ..SolveOptions::default()
        },
    )
    .unwrap();
    assert_same_as_core(&output, "resistivity_ohm_cm", core.resistivity_ohm_cm);
    refused(
        "convert --dopant P --density 1e19 --ionization-model none",
        "--ionization-model: \"none\" is not a model bandgauge knows; give one of altermatt, \
         pearson-bardeen, dilute",
    );
}
