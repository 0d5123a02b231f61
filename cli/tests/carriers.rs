//! `bandgauge carriers`: table, JSON and sweep output against bandgauge-core and published values; refused input.

mod support;

use bandgauge_core::intrinsic::IntrinsicModel;
use bandgauge_core::ionization::IonizationModel;
use bandgauge_core::materials::{self, DopantDensity, DopantKind};
use bandgauge_core::neutrality::{self, Equilibrium, SolveOptions};
use bandgauge_core::sweep;
use serde_json::Value;
use support::{json, number, refusal, refused, relative_difference, success};

/// Keys the issue requires in the JSON object.
const REQUIRED_KEYS: [&str; 12] = [
    "temperature_k",
    "band_gap_ev",
    "nc_cm3",
    "nv_cm3",
    "intrinsic_cm3",
    "electrons_cm3",
    "holes_cm3",
    "fermi_minus_valence_ev",
    "ionized_donors_cm3",
    "ionized_acceptors_cm3",
    "regime",
    "models",
];

/// Same computation in a differently optimised build: a few ulp, amplified at most
/// by the solver's relative stopping test (1e-12).
const SAME_CODE_OTHER_BUILD: f64 = 1e-11;
/// The compensated example below: P is 99.96 % ionized at 1e15 cm^-3 and 300 K in
/// this model, so n sits 0.04 % under N_D - N_A; 0.2 % leaves room for that.
const COMPENSATION_TOLERANCE: f64 = 2e-3;
/// Green's tabulated gap and the Thurmond Varshni fit differ by 0.3 meV at 300 K.
const BAND_GAP_FIT_TOLERANCE_EV: f64 = 5e-4;
/// The direct fit evaluated at 300 K against its authors' rounded 300 K value (2 digits).
const ROUNDED_TWO_DIGITS: f64 = 6e-3;

fn silicon_state(
    temperature_k: f64,
    doping: &[(&str, f64)],
    options: &SolveOptions,
) -> Equilibrium {
    let si = materials::silicon();
    let doping: Vec<DopantDensity> = doping
        .iter()
        .map(|(symbol, density_cm3)| DopantDensity {
            dopant: si.dopant(symbol).unwrap(),
            density_cm3: *density_cm3,
        })
        .collect();
    neutrality::solve(&si, temperature_k, &doping, options).unwrap()
}

/// Every required key of the CLI's JSON equals the core's own result. serde_json
/// writes f64 in shortest round-trip form, so only the build differs: the binary
/// is compiled at another optimisation level than this test, which may move
/// library functions (powf, exp) by an ulp or two, and the solver's stopping test
/// passes that on.
fn assert_matches_core(output: &Value, state: &Equilibrium) {
    let core = serde_json::to_value(state).unwrap();
    for key in REQUIRED_KEYS {
        match (output[key].as_f64(), core[key].as_f64()) {
            (Some(cli), Some(lib)) => assert!(
                cli == lib || relative_difference(cli, lib) < SAME_CODE_OTHER_BUILD,
                "key {key}: cli {cli}, core {lib}"
            ),
            _ => assert_eq!(output[key], core[key], "key {key}"),
        }
    }
}

#[test]
fn json_has_the_required_keys_and_equals_the_core_result() {
    let output =
        json("carriers --material si --temperature 300 --donor P:1e15 --acceptor B:1e14 --json");
    let state = silicon_state(300.0, &[("P", 1e15), ("B", 1e14)], &SolveOptions::default());
    assert_matches_core(&output, &state);
    assert_eq!(output["material"], "si");
    assert_eq!(output["regime"], "extrinsic");
    let models = output["models"].as_array().unwrap();
    assert!(
        models
            .iter()
            .all(|m| m["model"].is_string() && m["source"].is_string())
    );
    assert!(
        output["caution"]
            .as_str()
            .unwrap()
            .contains("model estimates")
    );

    // Source: for N_D - N_A >> ni and full ionization, n = N_D - N_A (Sze, Physics of
    // Semiconductor Devices, 2nd ed. (1981), ch. 1; from memory): 9.0e14 cm^-3 here.
    assert!(relative_difference(number(&output, "electrons_cm3"), 9.0e14) < COMPENSATION_TOLERANCE);
}

#[test]
fn temperature_accepts_kelvin_and_celsius() {
    for (text, expected_k) in [
        ("300", 300.0),
        ("300K", 300.0),
        ("300 K", 300.0),
        ("27C", 300.15),
    ] {
        let output = json(&format!(
            "carriers --temperature '{text}' --donor P:1e15 --json"
        ));
        assert_eq!(number(&output, "temperature_k"), expected_k, "{text}");
    }
}

#[test]
fn density_units_and_number_forms_reach_the_core_unchanged() {
    let plain = json("carriers --donor P:1e16 --json");
    for text in [
        "P:1e16cm^-3",
        "P:1x10^16",
        "P:1.0E16 /cm3",
        "P:1e22m^-3",
        "p:1e16",
    ] {
        assert_eq!(
            json(&format!("carriers --donor '{text}' --json")),
            plain,
            "{text}"
        );
    }
}

#[test]
fn band_gap_of_silicon_at_300_k() {
    let output = json("carriers --json");
    // Source: Green, J. Appl. Phys. 67, 2944 (1990), Table: Eg(300 K) = 1.1242 eV.
    assert!((number(&output, "band_gap_ev") - 1.1242).abs() < BAND_GAP_FIT_TOLERANCE_EV);
    assert_eq!(output["regime"], "intrinsic");
    // Undoped: n = p up to the solver's residual.
    let (n, p) = (
        number(&output, "electrons_cm3"),
        number(&output, "holes_cm3"),
    );
    assert!(relative_difference(n, p) < 1e-9, "n {n}, p {p}");
}

#[test]
fn direct_fit_of_the_intrinsic_density() {
    let output = json("carriers --intrinsic-model direct-fit --json");
    let options = SolveOptions {
        intrinsic_model: IntrinsicModel::DirectFit,
        ..SolveOptions::default()
    };
    assert_matches_core(&output, &silicon_state(300.0, &[], &options));
    // Source: Misiakos & Tsamakis, J. Appl. Phys. 74, 3293 (1993): ni(300 K) = 9.7e9 cm^-3 (from memory).
    assert!(relative_difference(number(&output, "intrinsic_cm3"), 9.7e9) < ROUNDED_TWO_DIGITS);
}

#[test]
fn repeated_donors_add_up() {
    let output = json("carriers --donor P:1e15 --donor As:2e15 --json");
    let state = silicon_state(
        300.0,
        &[("P", 1e15), ("As", 2e15)],
        &SolveOptions::default(),
    );
    assert_matches_core(&output, &state);
    let species = output["species"].as_array().unwrap();
    assert_eq!(species.len(), 2);
    let sum: f64 = species.iter().map(|s| number(s, "ionized_cm3")).sum();
    assert!(relative_difference(sum, number(&output, "ionized_donors_cm3")) < 1e-12);
}

#[test]
fn freeze_out_and_intrinsic_regimes() {
    // Common practice, no source: at 20 K shallow donors in silicon hold most of their
    // electrons; at 1000 K thermal generation swamps 1e15 cm^-3 of doping.
    let cold = json("carriers --temperature 20 --donor P:1e16 --json");
    assert_eq!(cold["regime"], "freeze_out");
    let hot = json("carriers --temperature 1000 --donor P:1e15 --json");
    assert_eq!(hot["regime"], "intrinsic");
}

#[test]
fn user_defined_dopant_works_like_a_built_in_one() {
    // A dopant given in full (45 meV, g = 2, like P) reaches the core unchanged. It carries no
    // Altermatt set (built-in P does), so in silicon its level follows the Pearson-Bardeen
    // fallback of the default ionization model: compare with the core's own solve of the same
    // user-defined dopant, every key but the sources.
    let given = json("carriers --donor Px:1e16:0.045:2 --json");
    let si = materials::silicon();
    let px = materials::Dopant::new("Px", DopantKind::Donor, 0.045, 2.0, "user").unwrap();
    let doping = [DopantDensity {
        dopant: px,
        density_cm3: 1e16,
    }];
    let state = neutrality::solve(&si, 300.0, &doping, &SolveOptions::default()).unwrap();
    let core = serde_json::to_value(&state).unwrap();
    for key in REQUIRED_KEYS.iter().filter(|k| **k != "models") {
        match (given[key].as_f64(), core[key].as_f64()) {
            (Some(cli), Some(lib)) => assert!(
                cli == lib || relative_difference(cli, lib) < SAME_CODE_OTHER_BUILD,
                "{key}: cli {cli}, core {lib}"
            ),
            _ => assert_eq!(given[key], core[key], "{key}"),
        }
    }
    assert_eq!(given["species"][0]["level_model"], "pearson-bardeen");
}

#[test]
fn user_defined_material_from_a_file_works_like_a_built_in_one() {
    let mut silicon: Value = json("materials --json")[0].clone();
    silicon["id"] = "my-si".into();
    silicon["name"] = "Silicon copy".into();
    let path = std::env::temp_dir().join(format!("bandgauge-cli-test-{}.json", std::process::id()));
    std::fs::write(&path, silicon.to_string()).unwrap();
    let path_text = path.to_str().unwrap();
    let from_file = json(&format!(
        "carriers --material-file '{path_text}' --donor P:1e15 --json"
    ));
    std::fs::remove_file(&path).unwrap();
    let built_in = json("carriers --donor P:1e15 --json");
    assert_eq!(from_file["material"], "my-si");
    for key in REQUIRED_KEYS.iter().filter(|k| **k != "models") {
        assert_eq!(from_file[key], built_in[key], "{key}");
    }
}

#[test]
fn table_is_aligned_and_ends_with_the_caution() {
    let text = success("carriers --donor P:1e15 --acceptor B:1e14");
    let state = silicon_state(300.0, &[("P", 1e15), ("B", 1e14)], &SolveOptions::default());
    assert!(
        text.starts_with(
            "Silicon (si) at 300 K, donor P 1.000e15 cm^-3, acceptor B 1.000e14 cm^-3\n"
        )
    );
    // The value column is right-aligned: every row of the first table ends its value
    // at the same column as the header "value".
    let rows: Vec<&str> = text.lines().skip(2).take_while(|l| !l.is_empty()).collect();
    let value_end = rows[0].find("value").unwrap() + "value".len();
    let electrons = rows
        .iter()
        .find(|r| r.trim_start().starts_with("electrons"))
        .unwrap();
    let shown = format!("{:.3e}", state.electrons_cm3);
    assert_eq!(
        electrons.find(&shown).unwrap() + shown.len(),
        value_end,
        "{electrons}"
    );
    let caution = text.lines().last().unwrap();
    assert!(caution.starts_with("Caution: model estimates (charge neutrality with Fermi-Dirac statistics; sources Thurmond1975"));
    assert!(
        caution.ends_with(
            "the fab's own specifications and the governing standards decide acceptance."
        )
    );
}

#[test]
fn sweep_writes_csv_equal_to_the_core_sweep() {
    let text = success("carriers --donor P:1e15 --sweep 10:1000:200");
    let mut lines = text.lines();
    assert_eq!(
        lines.next().unwrap(),
        "temperature_k,band_gap_ev,nc_cm3,nv_cm3,intrinsic_cm3,electrons_cm3,holes_cm3,\
         fermi_minus_valence_ev,fermi_minus_conduction_ev,ionized_donors_cm3,ionized_acceptors_cm3,regime,degenerate"
    );
    let rows: Vec<Vec<&str>> = lines.map(|l| l.split(',').collect()).collect();
    assert_eq!(rows.len(), 200);
    let si = materials::silicon();
    let doping = [DopantDensity {
        dopant: si.dopant_of_kind("P", DopantKind::Donor).unwrap(),
        density_cm3: 1e15,
    }];
    let grid = sweep::linear_grid_k(10.0, 1000.0, 200).unwrap();
    let states = sweep::temperature_sweep(&si, &grid, &doping, &SolveOptions::default());
    for (row, state) in rows.iter().zip(states) {
        let state = state.unwrap();
        let value = |i: usize| row[i].parse::<f64>().unwrap();
        assert_eq!(value(0), state.temperature_k);
        for (column, expected) in [
            (5, state.electrons_cm3),
            (6, state.holes_cm3),
            (7, state.fermi_minus_valence_ev),
            (9, state.ionized_donors_cm3),
        ] {
            let shown = value(column);
            assert!(
                shown == expected || relative_difference(shown, expected) < SAME_CODE_OTHER_BUILD,
                "column {column} at {} K: csv {shown}, core {expected}",
                state.temperature_k
            );
        }
    }
    assert_eq!(rows[0][0].parse::<f64>().unwrap(), 10.0);
    assert_eq!(rows[199][0].parse::<f64>().unwrap(), 1000.0);
    // Same regime sequence as separate solves: freeze-out first, intrinsic last.
    assert_eq!(rows[0][11], "freeze_out");
    assert_eq!(rows[199][11], "intrinsic");
}

#[test]
fn sweep_points_equal_single_solves() {
    // A sweep is only a faster way to do the single solves: compare the two paths.
    let sweep_rows: Value = json("carriers --donor P:1e16 --sweep 100:700:4 --json");
    for row in sweep_rows.as_array().unwrap() {
        let t = number(row, "temperature_k").to_string();
        let single = json(&format!("carriers --donor P:1e16 --temperature {t} --json"));
        for key in ["electrons_cm3", "holes_cm3", "fermi_minus_valence_ev"] {
            assert!(
                relative_difference(number(row, key), number(&single, key)) < 1e-9,
                "{key} at {t} K: sweep {} single {}",
                row[key],
                single[key]
            );
        }
    }
}

#[test]
fn refused_temperatures() {
    refused(
        "carriers --temperature -5",
        "--temperature: \"-5\" is -5 K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C",
    );
    refused(
        "carriers --temperature 0",
        "--temperature: \"0\" is 0 K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C",
    );
    refused(
        "carriers --temperature abc",
        "--temperature: \"abc\" is not a number; give a temperature such as 300, 300K or 27C; units: K (default), C, °C",
    );
    refused(
        "carriers --temperature inf",
        "--temperature: \"inf\" is not a number; give a temperature such as 300, 300K or 27C; units: K (default), C, °C",
    );
    refused(
        "carriers --temperature 300F",
        "--temperature: \"300F\": \"F\" is not an accepted temperature unit; allowed: K (default), C, °C",
    );
    refused(
        "carriers --temperature 2,5",
        "--temperature: \"2,5\" contains a comma; write decimals with a point (2.5, not 2,5) and no thousands separators",
    );
    refused(
        "carriers --temperature 5000",
        "--temperature: 5000 K is not allowed for si: the band gap model gives -0.9281 eV there; give a temperature where the gap is > 0",
    );
    refused(
        "carriers --intrinsic-model direct-fit --temperature 500",
        "--temperature: 500 K is outside the range of Misiakos-Tsamakis 1993; give 78-340 K or leave out --intrinsic-model",
    );
}

#[test]
fn refused_densities() {
    refused(
        "carriers --donor P:-1e15",
        "--donor: density of P: \"-1e15\" is not allowed; give a density >= 0 cm^-3",
    );
    let units = "units: cm^-3 (default), cm-3, /cm3, /cm^3, cm⁻³, m^-3, m-3, /m3, /m^3, m⁻³";
    refused(
        "carriers --donor P:abc",
        &format!(
            "--donor: density of P: \"abc\" is not a number; give a density such as 1e15 or 2.3x10^15 cm^-3; {units}"
        ),
    );
    refused(
        "carriers --acceptor B:NaN",
        &format!(
            "--acceptor: density of B: \"NaN\" is not a number; give a density such as 1e15 or 2.3x10^15 cm^-3; {units}"
        ),
    );
    refused(
        "carriers --donor P:1e400",
        "--donor: density of P: \"1e400\" is not a finite density; give a finite number (about 1e308 at most)",
    );
    refused(
        "carriers --donor P:1e25",
        "--donor: density of P: 1e25 cm^-3 is not allowed; give a density from 0 to 1e24 cm^-3",
    );
    refused(
        "carriers --donor 'P:1e15 in^-3'",
        &format!(
            "--donor: density of P: \"1e15 in^-3\": \"in^-3\" is not an accepted density unit; allowed: {}",
            &units[7..]
        ),
    );
}

#[test]
fn refused_materials_and_species() {
    refused(
        "carriers --material xx",
        "--material: \"xx\" is not a known material; choose one of si, ge, gaas, gan",
    );
    refused(
        "carriers --donor X:1e15",
        "--donor: \"X\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In \
         (or give a dopant in full as NAME:DENSITY:IONIZATION_EV:DEGENERACY)",
    );
    refused(
        "carriers --donor B:1e15",
        "--donor: B in si is an acceptor: give it with --acceptor",
    );
    refused(
        "carriers --acceptor P:1e15",
        "--acceptor: P in si is a donor: give it with --donor",
    );
    refused(
        "carriers --donor P",
        "--donor: \"P\" is not in a form bandgauge reads; give SPECIES:DENSITY such as P:1e15, or NAME:DENSITY:IONIZATION_EV:DEGENERACY",
    );
    refused(
        "carriers --donor Q:1e15:-0.1:2",
        "--donor: \"Q:1e15:-0.1:2\": dopant Q: ionization_energy_ev: -0.1 is not allowed; give a finite value >= 0 eV",
    );
    refused(
        "carriers --material ge --intrinsic-model direct-fit",
        "--intrinsic-model: \"direct-fit\" is not available for ge: it has no published direct fit here; give density-of-states",
    );
    refused(
        "carriers --intrinsic-model fast",
        "--intrinsic-model: \"fast\" is not a model bandgauge knows; give density-of-states or direct-fit",
    );
    // The rest of the message is the operating system's own.
    let missing = refusal("carriers --material-file /nonexistent/bandgauge.json");
    assert!(
        missing.starts_with(
            "error: --material-file: \"/nonexistent/bandgauge.json\" cannot be read: "
        ),
        "{missing}"
    );
}

#[test]
fn refused_sweeps() {
    refused(
        "carriers --sweep 10:1000",
        "--sweep: \"10:1000\" is not in a form bandgauge reads; give START:STOP:POINTS such as 10:1000:200 (kelvin unless a unit is given)",
    );
    refused(
        "carriers --sweep 0:1000:10",
        "--sweep: START \"0\" is 0 K, not allowed; give a temperature > 0 K, e.g. 300, 300K or 27C",
    );
    refused(
        "carriers --sweep 10:1000:2.5",
        "--sweep: POINTS \"2.5\" is not a whole number; give 2 to 100000 points",
    );
    refused(
        "carriers --sweep 10:1000:1",
        "--sweep: POINTS 1 is not allowed; give 2 to 100000 points (1 only when start equals stop)",
    );
    // --sweep replaces --temperature: both at once is a usage error (clap, exit 2).
    let both = refusal("carriers --temperature 300 --sweep 10:1000:5");
    assert!(both.contains("--sweep"), "{both}");
}

/// Heavy doping where the dopant-level models part: with constant levels 1e19 cm^-3 P is
/// 38 % ionized at 300 K, with the default (Altermatt et al. 2006) levels most of it is, so
/// the two electron densities differ by far more than this.
const LEVEL_MODELS_DIFFER: f64 = 0.2;

#[test]
fn ionization_model_option_reaches_the_core() {
    for id in ["altermatt", "pearson-bardeen", "dilute", " Dilute "] {
        let output = json(&format!(
            "carriers --donor P:1e19 --ionization-model '{id}' --json"
        ));
        let options = SolveOptions {
            ionization_model: IonizationModel::from_id(id).unwrap(),
            ..SolveOptions::default()
        };
        assert_matches_core(&output, &silicon_state(300.0, &[("P", 1e19)], &options));
    }
    // Source: Altermatt et al., J. Appl. Phys. 100, 113714 (2006) against constant Sze 1981
    // levels: heavy P keeps far fewer carriers neutral with the density-dependent levels.
    let dilute = json("carriers --donor P:1e19 --ionization-model dilute --json");
    let default = json("carriers --donor P:1e19 --json");
    assert!(
        relative_difference(
            number(&dilute, "electrons_cm3"),
            number(&default, "electrons_cm3")
        ) > LEVEL_MODELS_DIFFER
    );
    refused(
        "carriers --donor P:1e15 --ionization-model hydrogenic",
        "--ionization-model: \"hydrogenic\" is not a model bandgauge knows; give one of \
         altermatt, pearson-bardeen, dilute",
    );
}
