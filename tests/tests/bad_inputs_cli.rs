//! Bad-input catalogue, command line: every kind of bad argument and file `bandgauge` can be
//! given, one test per case, each with its exit code and the exact text on stderr.
//!
//! The CLI crate has no library, so these tests run its built binary. [`binary`] finds it beside
//! this test's own executable (`<target>/<profile>/bandgauge`) after asking cargo (the one
//! running these tests, `$CARGO`) to build it with the same profile: a no-op when
//! `cargo test --workspace` has built it already, and never a stale binary when only
//! `cargo test -p bandgauge-tests` runs. `BANDGAUGE_BIN` names a binary to use instead.
//!
//! Exit codes (cli/src/main.rs, cli/src/lots.rs): 2 input refused, 1 the answer could not be
//! written, 3 some lot rows rejected (the rest summarised).

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::sync::OnceLock;

/// The `bandgauge` binary, built on first use.
fn binary() -> &'static Path {
    static BINARY: OnceLock<PathBuf> = OnceLock::new();
    BINARY.get_or_init(|| {
        if let Some(path) = std::env::var_os("BANDGAUGE_BIN") {
            return PathBuf::from(path);
        }
        let exe = std::env::current_exe().expect("the test executable's path");
        // <target>/<profile>/deps/bad_inputs_cli-<hash>
        let profile_dir = exe
            .parent()
            .and_then(Path::parent)
            .expect("the test executable sits in <target>/<profile>/deps");
        let target_dir = profile_dir.parent().expect("<target>");
        let profile = match profile_dir.file_name().and_then(|n| n.to_str()) {
            // `cargo test` builds into target/debug with the test profile.
            Some("debug") => "test".to_owned(),
            Some(other) => other.to_owned(),
            None => panic!("no profile folder in {}", exe.display()),
        };
        let cargo = std::env::var_os("CARGO").unwrap_or_else(|| "cargo".into());
        let status = Command::new(cargo)
            .args([
                "build",
                "--quiet",
                "-p",
                "bandgauge-cli",
                "--profile",
                &profile,
            ])
            .arg("--target-dir")
            .arg(target_dir)
            .status()
            .expect("run cargo to build bandgauge-cli");
        assert!(status.success(), "cargo build -p bandgauge-cli failed");
        let path = profile_dir.join(format!("bandgauge{}", std::env::consts::EXE_SUFFIX));
        assert!(path.is_file(), "no binary at {}", path.display());
        path
    })
}

/// A folder of its own for one test's files, removed afterwards.
struct Scratch(PathBuf);

impl Scratch {
    fn new(test: &str) -> Scratch {
        let dir = std::env::temp_dir().join(format!(
            "bandgauge-bad-inputs-cli-{}-{test}",
            std::process::id()
        ));
        std::fs::create_dir_all(&dir).expect("create scratch folder");
        Scratch(dir)
    }

    fn write(&self, name: &str, text: &str) {
        let path = self.0.join(name);
        if name.ends_with('/') {
            std::fs::create_dir_all(&path).expect("create folder");
        } else {
            std::fs::write(&path, text).expect("write scratch file");
        }
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// What one run gave.
struct Run {
    code: i32,
    stdout: String,
    stderr: String,
}

/// Runs `bandgauge args` in `dir`, stdout to `stdout`.
fn run_in(dir: &Path, args: &[&str], stdout: Stdio) -> Run {
    let output = Command::new(binary())
        .args(args)
        .current_dir(dir)
        .stdout(stdout)
        .output()
        .expect("run bandgauge");
    Run {
        code: output.status.code().expect("exited, not killed"),
        stdout: String::from_utf8(output.stdout).expect("UTF-8 stdout"),
        stderr: String::from_utf8(output.stderr).expect("UTF-8 stderr"),
    }
}

/// Runs `args` in a scratch folder holding `files` and checks the exit code, that nothing
/// went to stdout, and the exact stderr.
fn check(test: &str, files: &[(&str, &str)], args: &[&str], code: i32, stderr: &str) {
    let scratch = Scratch::new(test);
    for (name, text) in files {
        scratch.write(name, text);
    }
    let run = run_in(&scratch.0, args, Stdio::piped());
    assert_eq!(run.stderr, stderr, "bandgauge {args:?}");
    assert_eq!(run.code, code, "bandgauge {args:?}");
    assert_eq!(run.stdout, "", "bandgauge {args:?} wrote to stdout");
}

/// The usage lines clap prints after a usage error.
fn usage(line: &str) -> String {
    format!("\nUsage: {line}\n\nFor more information, try '--help'.\n")
}

/// One `#[test]` per refused command line: `name: [args] (files) => exit code, stderr`.
macro_rules! catalogue {
    ($($name:ident: [$($arg:expr),* $(,)?] $(files [$(($file:expr, $text:expr)),* $(,)?])? => $code:expr, $stderr:expr;)+) => {
        $(
            #[test]
            fn $name() {
                let files: &[(&str, &str)] = &[$($(($file, $text)),*)?];
                check(stringify!($name), files, &[$($arg),*], $code, &$stderr);
            }
        )+
    };
}

/// Exit code of refused input.
const REFUSED: i32 = 2;

/// Allowed units, as the messages list them.
const TEMPERATURE_UNITS: &str = "K (default), C, °C";
const RESISTIVITY_UNITS: &str = "ohm-cm (default), mohm-cm, kohm-cm, ohm-m";
const LENGTH_UNITS: &str = "cm (default), mm, um, µm, nm, m";
const DENSITY_UNITS: &str = "cm^-3 (default), cm-3, /cm3, /cm^3, cm⁻³, m^-3, m-3, /m3, /m^3, m⁻³";

/// A lot file every check of `lots` but the one under test accepts.
const LOTS: &str = "lot,wafer,site,dopant,resistivity [ohm-cm]\nA1,1,1,B,10.1\nA1,1,2,B,9.9\n";

// ---------------------------------------------------------------------------------------------
// The command line as a whole (clap's usage errors)
// ---------------------------------------------------------------------------------------------

catalogue! {
    unknown_command: ["frobnicate"] => REFUSED,
        format!("error: unrecognized subcommand 'frobnicate'\n{}", usage("bandgauge <COMMAND>"));
    unknown_option: ["carriers", "--frob"] => REFUSED,
        format!("error: unexpected argument '--frob' found\n{}", usage("bandgauge carriers [OPTIONS]"));
    stray_argument: ["materials", "extra"] => REFUSED,
        format!("error: unexpected argument 'extra' found\n{}", usage("bandgauge materials [OPTIONS]"));
    option_given_twice: ["carriers", "--json", "--json"] => REFUSED,
        format!(
            "error: the argument '--json' cannot be used multiple times\n{}",
            usage("bandgauge carriers [OPTIONS]")
        );
    option_without_its_value: ["carriers", "--temperature"] => REFUSED,
        "error: a value is required for '--temperature <T>' but none was supplied\n\nFor more \
         information, try '--help'.\n";
}

#[test]
fn no_command_prints_the_help_and_refuses() {
    let scratch = Scratch::new("no_command");
    let run = run_in(&scratch.0, &[], Stdio::piped());
    assert_eq!(run.code, REFUSED);
    assert_eq!(run.stdout, "");
    assert!(
        run.stderr
            .contains("\nUsage: bandgauge <COMMAND>\n\nCommands:\n  carriers "),
        "{}",
        run.stderr
    );
}

// ---------------------------------------------------------------------------------------------
// carriers
// ---------------------------------------------------------------------------------------------

catalogue! {
    temperature_not_a_number: ["carriers", "--temperature", "warm"] => REFUSED,
        format!(
            "error: --temperature: \"warm\" is not a number; give a temperature such as 300, 300K \
             or 27C; units: {TEMPERATURE_UNITS}\n"
        );
    temperature_in_fahrenheit: ["carriers", "--temperature", "300F"] => REFUSED,
        format!(
            "error: --temperature: \"300F\": \"F\" is not an accepted temperature unit; allowed: \
             {TEMPERATURE_UNITS}\n"
        );
    temperature_negative: ["carriers", "--temperature", "-5"] => REFUSED,
        "error: --temperature: \"-5\" is -5 K, not allowed; give a temperature > 0 K, e.g. 300, \
         300K or 27C\n";
    temperature_zero: ["carriers", "--temperature", "0"] => REFUSED,
        "error: --temperature: \"0\" is 0 K, not allowed; give a temperature > 0 K, e.g. 300, 300K \
         or 27C\n";
    temperature_below_absolute_zero_in_celsius: ["carriers", "--temperature", "-300C"] => REFUSED,
        "error: --temperature: \"-300C\" is -26.85 K, not allowed; give a temperature > 0 K, e.g. \
         300, 300K or 27C\n";
    temperature_nan: ["carriers", "--temperature", "NaN"] => REFUSED,
        format!(
            "error: --temperature: \"NaN\" is not a number; give a temperature such as 300, 300K or \
             27C; units: {TEMPERATURE_UNITS}\n"
        );
    temperature_infinite: ["carriers", "--temperature", "inf"] => REFUSED,
        format!(
            "error: --temperature: \"inf\" is not a number; give a temperature such as 300, 300K or \
             27C; units: {TEMPERATURE_UNITS}\n"
        );
    temperature_overflows: ["carriers", "--temperature", "1e999"] => REFUSED,
        "error: --temperature: \"1e999\" is not a finite temperature; give a finite number (about \
         1e308 at most)\n";
    temperature_with_a_decimal_comma: ["carriers", "--temperature", "300,5"] => REFUSED,
        "error: --temperature: \"300,5\" contains a comma; write decimals with a point (2.5, not \
         2,5) and no thousands separators\n";
    temperature_empty: ["carriers", "--temperature", ""] => REFUSED,
        format!(
            "error: --temperature: nothing was given; give a temperature as a number, optionally \
             with a unit: {TEMPERATURE_UNITS}\n"
        );
    temperature_where_the_gap_closes: ["carriers", "--temperature", "1e5"] => REFUSED,
        "error: --temperature: 100000 K is not allowed for si: the band gap model gives -45.8311 \
         eV there; give a temperature where the gap is > 0\n";
    material_unknown: ["carriers", "--material", "sic"] => REFUSED,
        "error: --material: \"sic\" is not a known material; choose one of si, ge, gaas, gan\n";
    material_file_missing: ["carriers", "--material-file", "none.json"] => REFUSED,
        "error: --material-file: \"none.json\" cannot be read: No such file or directory (os error \
         2)\n";
    material_file_is_a_folder: ["carriers", "--material-file", "folder"] files [("folder/", "")] => REFUSED,
        "error: --material-file: \"folder\" cannot be read: Is a directory (os error 21)\n";
    material_file_empty: ["carriers", "--material-file", "m.json"] files [("m.json", "")] => REFUSED,
        "error: --material-file: \"m.json\" is not a material in the form `bandgauge materials \
         --json` lists (one object): EOF while parsing a value at line 1 column 0\n";
    material_file_not_json: ["carriers", "--material-file", "m.json"] files [("m.json", "{\"id\": \"x\"\n")] => REFUSED,
        "error: --material-file: \"m.json\" is not a material in the form `bandgauge materials \
         --json` lists (one object): EOF while parsing an object at line 2 column 0\n";
    material_and_material_file: ["carriers", "--material", "si", "--material-file", "m.json"] => REFUSED,
        format!(
            "error: the argument '--material <ID>' cannot be used with '--material-file <FILE>'\n{}",
            usage("bandgauge carriers --material <ID>")
        );
    donor_unknown: ["carriers", "--donor", "Q:1e15"] => REFUSED,
        "error: --donor: \"Q\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In \
         (or give a dopant in full as NAME:DENSITY:IONIZATION_EV:DEGENERACY)\n";
    donor_without_density: ["carriers", "--donor", "P"] => REFUSED,
        "error: --donor: \"P\" is not in a form bandgauge reads; give SPECIES:DENSITY such as \
         P:1e15, or NAME:DENSITY:IONIZATION_EV:DEGENERACY\n";
    donor_density_not_a_number: ["carriers", "--donor", "P:lots"] => REFUSED,
        format!(
            "error: --donor: density of P: \"lots\" is not a number; give a density such as 1e15 or \
             2.3x10^15 cm^-3; units: {DENSITY_UNITS}\n"
        );
    donor_density_negative: ["carriers", "--donor", "P:-1e15"] => REFUSED,
        "error: --donor: density of P: \"-1e15\" is not allowed; give a density >= 0 cm^-3\n";
    donor_density_above_any_solid: ["carriers", "--donor", "P:1e30"] => REFUSED,
        "error: --donor: density of P: 1e30 cm^-3 is not allowed; give a density from 0 to 1e24 \
         cm^-3\n";
    donor_is_an_acceptor: ["carriers", "--donor", "B:1e15"] => REFUSED,
        "error: --donor: B in si is an acceptor: give it with --acceptor\n";
    acceptor_is_a_donor: ["carriers", "--acceptor", "P:1e15"] => REFUSED,
        "error: --acceptor: P in si is a donor: give it with --donor\n";
    dopant_in_full_with_a_bad_level: ["carriers", "--donor", "X:1e15:deep:2"] => REFUSED,
        "error: --donor: \"X:1e15:deep:2\": IONIZATION_EV \"deep\" is not a finite number; give the \
         level's distance from its band edge in eV, e.g. 0.045\n";
    dopant_in_full_with_a_bad_degeneracy: ["carriers", "--acceptor", "X:1e15:0.05:inf"] => REFUSED,
        "error: --acceptor: \"X:1e15:0.05:inf\": DEGENERACY \"inf\" is not a finite number; give \
         the level's degeneracy factor, e.g. 2 for a donor or 4 for an acceptor\n";
    dopant_in_full_with_a_negative_level: ["carriers", "--donor", "X:1e15:-0.1:2"] => REFUSED,
        "error: --donor: \"X:1e15:-0.1:2\": dopant X: ionization_energy_ev: -0.1 is not allowed; \
         give a finite value >= 0 eV\n";
    dopant_in_full_with_a_level_outside_the_gap: ["carriers", "--donor", "X:1e15:5:2"] => REFUSED,
        "error: --donor: dopant X: ionization_energy_ev 4.9969 is not allowed here; give a value \
         below the band gap (1.1245 eV at this temperature)\n";
    sweep_and_temperature: ["carriers", "--temperature", "300", "--sweep", "10:100:5"] => REFUSED,
        format!(
            "error: the argument '--temperature <T>' cannot be used with '--sweep \
             <START:STOP:POINTS>'\n{}",
            usage("bandgauge carriers --temperature <T>")
        );
    sweep_in_a_wrong_form: ["carriers", "--sweep", "10:100"] => REFUSED,
        "error: --sweep: \"10:100\" is not in a form bandgauge reads; give START:STOP:POINTS such \
         as 10:1000:200 (kelvin unless a unit is given)\n";
    sweep_points_not_whole: ["carriers", "--sweep", "10:100:2.5"] => REFUSED,
        "error: --sweep: POINTS \"2.5\" is not a whole number; give 2 to 100000 points\n";
    sweep_of_one_point: ["carriers", "--sweep", "10:100:1"] => REFUSED,
        "error: --sweep: POINTS 1 is not allowed; give 2 to 100000 points (1 only when start equals \
         stop)\n";
    sweep_of_too_many_points: ["carriers", "--sweep", "10:100:100001"] => REFUSED,
        "error: --sweep: POINTS 100001 is not allowed; give 2 to 100000 points (1 only when start \
         equals stop)\n";
    sweep_start_negative: ["carriers", "--sweep", "-5:100:5"] => REFUSED,
        "error: --sweep: START \"-5\" is -5 K, not allowed; give a temperature > 0 K, e.g. 300, \
         300K or 27C\n";
    sweep_stop_in_fahrenheit: ["carriers", "--sweep", "10:100F:5"] => REFUSED,
        format!(
            "error: --sweep: STOP \"100F\": \"F\" is not an accepted temperature unit; allowed: \
             {TEMPERATURE_UNITS}\n"
        );
    intrinsic_model_unknown: ["carriers", "--intrinsic-model", "fit"] => REFUSED,
        "error: --intrinsic-model: \"fit\" is not a model bandgauge knows; give density-of-states or \
         direct-fit\n";
    intrinsic_fit_missing_for_the_material: ["carriers", "--material", "gaas", "--intrinsic-model", "direct-fit"] => REFUSED,
        "error: --intrinsic-model: \"direct-fit\" is not available for gaas: it has no published \
         direct fit here; give density-of-states\n";
    intrinsic_fit_outside_its_range: ["carriers", "--intrinsic-model", "direct-fit", "--temperature", "500"] => REFUSED,
        "error: --temperature: 500 K is outside the range of Misiakos-Tsamakis 1993; give 78-340 K \
         or leave out --intrinsic-model\n";
    gap_narrowing_missing_for_the_material: ["carriers", "--material", "gaas", "--gap-narrowing"] => REFUSED,
        "error: --gap-narrowing: gaas carries no band-gap narrowing model; leave the option out\n";
    ionization_model_unknown: ["carriers", "--ionization-model", "hydrogenic"] => REFUSED,
        "error: --ionization-model: \"hydrogenic\" is not a model bandgauge knows; give one of \
         altermatt, pearson-bardeen, dilute\n";
}

/// `bandgauge materials --json` with silicon's phosphorus degeneracy set to 0.
fn material_with_a_bad_parameter() -> String {
    let listing = Command::new(binary())
        .args(["materials", "--json"])
        .output()
        .expect("run bandgauge materials --json");
    let all: serde_json::Value = serde_json::from_slice(&listing.stdout).expect("JSON listing");
    let mut si = all
        .as_array()
        .and_then(|a| a.iter().find(|m| m["id"] == "si"))
        .cloned()
        .expect("si in the listing");
    let dopants = si["dopants"].as_array_mut().expect("dopants");
    let p = dopants
        .iter_mut()
        .find(|d| d["symbol"] == "P")
        .expect("P in si");
    p["degeneracy"] = serde_json::json!(0.0);
    si["id"] = serde_json::json!("si-edited");
    si.to_string()
}

#[test]
fn material_file_with_an_invalid_parameter() {
    let text = material_with_a_bad_parameter();
    check(
        "material_file_with_an_invalid_parameter",
        &[("m.json", &text)],
        &["carriers", "--material-file", "m.json"],
        REFUSED,
        "error: --material-file: \"m.json\": dopant P: degeneracy: 0 is not allowed; give a finite \
         value > 0\n",
    );
}

// ---------------------------------------------------------------------------------------------
// convert
// ---------------------------------------------------------------------------------------------

catalogue! {
    convert_without_a_value: ["convert", "--dopant", "B"] => REFUSED,
        format!(
            "error: the following required arguments were not provided:\n  <--resistivity \
             <RHO>|--density <N>>\n{}",
            usage("bandgauge convert --dopant <SPECIES> <--resistivity <RHO>|--density <N>>")
        );
    convert_without_a_dopant: ["convert", "--resistivity", "10"] => REFUSED,
        format!(
            "error: the following required arguments were not provided:\n  --dopant <SPECIES>\n{}",
            usage("bandgauge convert --dopant <SPECIES> <--resistivity <RHO>|--density <N>>")
        );
    convert_both_ways_at_once: ["convert", "--dopant", "B", "--resistivity", "10", "--density", "1e15"] => REFUSED,
        format!(
            "error: the argument '--resistivity <RHO>' cannot be used with '--density <N>'\n{}",
            usage("bandgauge convert --dopant <SPECIES> <--resistivity <RHO>|--density <N>>")
        );
    resistivity_not_a_number: ["convert", "--dopant", "B", "--resistivity", "high"] => REFUSED,
        format!(
            "error: --resistivity: \"high\" is not a number; give a resistivity such as 10 or 850 \
             mohm-cm; units: {RESISTIVITY_UNITS}\n"
        );
    resistivity_in_an_unknown_unit: ["convert", "--dopant", "B", "--resistivity", "10 ohm-in"] => REFUSED,
        format!(
            "error: --resistivity: \"10 ohm-in\": \"ohm-in\" is not an accepted resistivity unit; \
             allowed: {RESISTIVITY_UNITS}\n"
        );
    resistivity_zero: ["convert", "--dopant", "B", "--resistivity", "0"] => REFUSED,
        "error: --resistivity: \"0\" is not allowed; give a resistivity > 0 ohm-cm\n";
    resistivity_negative: ["convert", "--dopant", "B", "--resistivity", "-3"] => REFUSED,
        "error: --resistivity: \"-3\" is not allowed; give a resistivity > 0 ohm-cm\n";
    resistivity_nan: ["convert", "--dopant", "B", "--resistivity", "nan"] => REFUSED,
        format!(
            "error: --resistivity: \"nan\" is not a number; give a resistivity such as 10 or 850 \
             mohm-cm; units: {RESISTIVITY_UNITS}\n"
        );
    resistivity_overflows: ["convert", "--dopant", "B", "--resistivity", "1e400"] => REFUSED,
        "error: --resistivity: \"1e400\" is not a finite resistivity; give a finite number (about \
         1e308 at most)\n";
    resistivity_outside_the_relation: ["convert", "--dopant", "B", "--resistivity", "1e6"] => REFUSED,
        "error: --resistivity: 1e6 ohm cm is outside the boron relation (ASTM F723, 23 C); give \
         1e-4 to 1e4 ohm cm\n";
    density_zero: ["convert", "--dopant", "B", "--density", "0"] => REFUSED,
        "error: --density: \"0\" is not allowed; give a density > 0 cm^-3\n";
    density_outside_the_relation: ["convert", "--dopant", "P", "--density", "1e22"] => REFUSED,
        "error: --density: 1.0000e22 cm^-3 is outside the phosphorus relation (ASTM F723, 23 C); \
         give 1.066e12 to 5.000e20 cm^-3 (the phosphorus relations break down above 5e20 cm^-3)\n";
    convert_dopant_unknown: ["convert", "--dopant", "Q", "--density", "1e15"] => REFUSED,
        "error: --dopant: \"Q\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In\n";
    convert_dopant_without_a_model: ["convert", "--material", "ge", "--dopant", "P", "--density", "1e15"] => REFUSED,
        "error: --dopant: no conversion model covers P in ge; see `bandgauge materials`\n";
    convert_material_unknown: ["convert", "--material", "sic", "--dopant", "B", "--density", "1e15"] => REFUSED,
        "error: --material: \"sic\" is not a known material; choose one of si, ge, gaas, gan\n";
    convert_temperature_beyond_every_default_model: ["convert", "--dopant", "B", "--density", "1e15", "--temperature", "5000"] => REFUSED,
        "error: --temperature: 5000 K is outside the range of every model for B in si that could be \
         chosen by default; name one with --model (thurber, masetti, arora, lattice)\n";
    convert_model_unknown: ["convert", "--dopant", "B", "--density", "1e15", "--model", "irvin"] => REFUSED,
        "error: --model: 'irvin' is not known; use one of thurber, masetti, arora, caughey-thomas, \
         lattice\n";
    convert_model_not_covering_the_dopant: ["convert", "--dopant", "B", "--density", "1e15", "--model", "caughey-thomas"] => REFUSED,
        "error: --model: \"caughey-thomas\" does not cover B in si; give one of thurber, masetti, \
         arora, lattice\n";
    convert_model_outside_its_temperatures: ["convert", "--dopant", "B", "--density", "1e15", "--model", "masetti", "--temperature", "10"] => REFUSED,
        "error: --temperature: 10 K is outside the range of the masetti mobility model; give 200 to \
         500 K\n";
    convert_empirical_model_away_from_23c: ["convert", "--dopant", "B", "--resistivity", "10", "--model", "thurber", "--temperature", "350"] => REFUSED,
        "error: --temperature: 350 is not allowed for the empirical relation, which holds at 23 C; \
         give 295.15 to 297.15 K, correct the reading to 23 C first, or choose a physics model\n";
    convert_uncertainty_negative: ["convert", "--dopant", "B", "--resistivity", "10", "--resistivity-uncertainty", "-2%"] => REFUSED,
        format!(
            "error: --resistivity-uncertainty: \"-2%\" is negative; give a resistivity uncertainty \
             >= 0, as a percentage (2%) or an amount in {RESISTIVITY_UNITS}\n"
        );
    convert_uncertainty_reaching_the_value: ["convert", "--dopant", "B", "--resistivity", "10", "--resistivity-uncertainty", "20ohm-cm"] => REFUSED,
        "error: --resistivity-uncertainty: 20.00 ohm-cm reaches the value itself (10.00 ohm-cm); \
         give an uncertainty smaller than the value\n";
    convert_uncertainty_on_the_other_quantity: ["convert", "--dopant", "B", "--resistivity", "10", "--density-uncertainty", "5%"] => REFUSED,
        "error: --density-uncertainty: applies only to the value converted from; give \
         --resistivity-uncertainty with --resistivity\n";
    convert_temperature_uncertainty_in_fahrenheit: ["convert", "--dopant", "B", "--resistivity", "10", "--temperature-uncertainty", "2F"] => REFUSED,
        format!(
            "error: --temperature-uncertainty: \"2F\": \"F\" is not an accepted temperature unit; \
             allowed: {TEMPERATURE_UNITS}\n"
        );
    convert_ionization_model_unknown: ["convert", "--dopant", "B", "--density", "1e15", "--ionization-model", "x"] => REFUSED,
        "error: --ionization-model: \"x\" is not a model bandgauge knows; give one of altermatt, \
         pearson-bardeen, dilute\n";
}

// ---------------------------------------------------------------------------------------------
// probe
// ---------------------------------------------------------------------------------------------

catalogue! {
    probe_without_its_reading: ["probe", "--volts", "12.5mV"] => REFUSED,
        format!(
            "error: the following required arguments were not provided:\n  --amps <I>\n  --spacing \
             <S>\n{}",
            usage("bandgauge probe --volts <V> --amps <I> --spacing <S>")
        );
    volts_not_a_number: ["probe", "--volts", "abc", "--amps", "1mA", "--spacing", "1mm"] => REFUSED,
        "error: --volts: \"abc\" is not a number; give a voltage such as 0.0125 or 12.5 mV; units: V \
         (default), mV, uV, µV\n";
    volts_zero: ["probe", "--volts", "0", "--amps", "1mA", "--spacing", "1mm"] => REFUSED,
        "error: --volts: \"0\" is not allowed; give a voltage > 0 V\n";
    amps_negative: ["probe", "--volts", "12.5mV", "--amps", "-1mA", "--spacing", "1mm"] => REFUSED,
        "error: --amps: \"-1mA\" is not allowed; give a current > 0 A\n";
    spacing_in_an_unknown_unit: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "40mil"] => REFUSED,
        format!(
            "error: --spacing: \"40mil\": \"mil\" is not an accepted length unit; allowed: \
             {LENGTH_UNITS}\n"
        );
    thickness_zero: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--thickness", "0"] => REFUSED,
        "error: --thickness: \"0\" is not allowed; give a length > 0 cm\n";
    thickness_overflows: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--thickness", "1e400um"] => REFUSED,
        "error: --thickness: \"1e400um\" is not a finite length; give a finite number (about 1e308 \
         at most)\n";
    diameter_negative: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--diameter", "-1"] => REFUSED,
        "error: --diameter: \"-1\" is not allowed; give a length > 0 cm\n";
    diameter_on_a_bulk_sample: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--geometry", "bulk", "--diameter", "150mm"] => REFUSED,
        "error: --diameter: the diameter correction (Smits 1958) is for a thin layer or wafer, not \
         a bulk sample; leave --diameter out or use --geometry thin-layer\n";
    geometry_unknown: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--geometry", "semi-infinite"] => REFUSED,
        "error: --geometry: \"semi-infinite\" is not a sample geometry; allowed: thin-layer (sheet \
         resistance of a layer or thin wafer; resistivity with --thickness) or bulk (semi-infinite \
         sample: resistivity)\n";
    density_of_a_thin_layer_without_its_thickness: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--dopant", "B"] => REFUSED,
        "error: --dopant: a dopant density needs the resistivity, which a thin layer gives only with \
         its thickness: add --thickness, or --geometry bulk for a bulk sample\n";
    diameter_smaller_than_the_probe: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--thickness", "525um", "--diameter", "1mm"] => REFUSED,
        "error: --diameter: 0.1 cm is too small for probe spacing 0.1 cm; the diameter correction \
         needs diameter > sqrt(3) x spacing = 0.1732 cm\n";
    reading_outside_the_float_range: ["probe", "--volts", "1e300", "--amps", "1e-300", "--spacing", "1mm"] => REFUSED,
        "error: --volts: volts / amps: the inputs give inf, outside the range of floating-point \
         numbers; check the units of the voltage, current and lengths\n";
    temperature_without_a_dopant: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--temperature-c", "25"] => REFUSED,
        format!(
            "error: the following required arguments were not provided:\n  --dopant <SPECIES>\n{}",
            usage(
                "bandgauge probe --volts <V> --amps <I> --spacing <S> --dopant <SPECIES> \
                 --temperature-c <T>"
            )
        );
    temperature_below_absolute_zero: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--dopant", "B", "--temperature-c", "-300"] => REFUSED,
        "error: --temperature-c: \"-300\" is -26.85 K, not allowed; give a temperature > 0 K, e.g. \
         300, 300K or 27C\n";
    temperature_beyond_every_model: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--dopant", "B", "--temperature-c", "500"] => REFUSED,
        "error: --temperature-c: 500 C is outside the range of every model for B in si that could be \
         chosen by default; name one with --model (thurber, masetti, arora, lattice)\n";
    probe_dopant_unknown: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--dopant", "Q"] => REFUSED,
        "error: --dopant: \"Q\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In\n";
    probe_model_without_a_dopant: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--model", "thurber"] => REFUSED,
        format!(
            "error: the following required arguments were not provided:\n  --dopant <SPECIES>\n{}",
            usage("bandgauge probe --volts <V> --amps <I> --spacing <S> --dopant <SPECIES> --model <NAME>")
        );
    probe_model_unknown: ["probe", "--volts", "12.5mV", "--amps", "1mA", "--spacing", "1mm", "--dopant", "B", "--model", "irvin"] => REFUSED,
        "error: --model: 'irvin' is not known; use one of thurber, masetti, arora, caughey-thomas, \
         lattice\n";
    probe_uncertainty_reaching_the_value: ["probe", "--volts", "10mV", "--amps", "1mA", "--spacing", "1mm", "--geometry", "bulk", "--dopant", "B", "--amps-uncertainty", "2mA"] => REFUSED,
        "error: --amps-uncertainty: 0.002000 A reaches the value itself (0.001000 A); give an \
         uncertainty smaller than the value\n";
    probe_material_unknown: ["probe", "--volts", "10mV", "--amps", "1mA", "--spacing", "1mm", "--dopant", "B", "--material", "sic"] => REFUSED,
        "error: --material: \"sic\" is not a known material; choose one of si, ge, gaas, gan\n";
}

// ---------------------------------------------------------------------------------------------
// hall (van der Pauw and Hall)
// ---------------------------------------------------------------------------------------------

/// Allowed units of the van der Pauw and Hall values, as the messages list them.
const RESISTANCE_UNITS: &str = "ohm (default), mohm, kohm, Mohm";
const FIELD_UNITS: &str = "T (default), tesla, mT, G, gauss, Gs, kG, kgauss";

catalogue! {
    hall_resistance_zero: ["hall", "--ra", "0", "--rb", "10"] => REFUSED,
        "error: --ra: \"0\" is not allowed; give a resistance > 0 ohm\n";
    hall_resistance_negative: ["hall", "--ra", "10", "--rb", "-5ohm"] => REFUSED,
        "error: --rb: \"-5ohm\" is not allowed; give a resistance > 0 ohm\n";
    hall_reversed_reading_negative: ["hall", "--ra", "10", "--ra-reversed", "-10", "--rb", "10"] => REFUSED,
        "error: --ra-reversed: \"-10\" is not allowed; give a resistance > 0 ohm\n";
    hall_ratio_without_solution: ["hall", "--ra", "1e300", "--rb", "1e-300"] => REFUSED,
        "error: --ra: the ratio R_A/R_B = inf has no van der Pauw solution in floating point; give \
         two resistances whose ratio is between 1e-300 and 1e300 (a real structure gives a ratio \
         near 1)\n";
    hall_resistance_in_a_field_unit: ["hall", "--ra", "10T", "--rb", "10"] => REFUSED,
        format!(
            "error: --ra: \"10T\": \"T\" is not an accepted resistance unit; allowed: \
             {RESISTANCE_UNITS}\n"
        );
    hall_field_in_a_resistance_unit: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "-1mV", "--current", "1mA", "--field", "5000ohm"] => REFUSED,
        format!(
            "error: --field: \"5000ohm\": \"ohm\" is not an accepted magnetic field unit; allowed: \
             {FIELD_UNITS}\n"
        );
    hall_voltage_without_field: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "-1mV", "--current", "1mA"] => REFUSED,
        "error: --field: the Hall analysis needs the magnetic field; give it, e.g. --field 0.5T or \
         5000G\n";
    hall_voltage_without_current: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "-1mV", "--field", "0.5T"] => REFUSED,
        "error: --current: the Hall analysis needs the current; give it, e.g. --current 100uA\n";
    hall_field_without_voltage: ["hall", "--ra", "10", "--rb", "10", "--field", "0.5T"] => REFUSED,
        "error: --field: given without a Hall voltage; give --hall-voltage or --hall-readings too, \
         or leave it out for the sheet resistance only\n";
    hall_field_zero: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "1mV", "--current", "1mA", "--field", "0"] => REFUSED,
        "error: --field: \"0\" is not allowed; give a magnetic field > 0 T\n";
    hall_cross_check_without_thickness: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "-1mV", "--current", "1mA", "--field", "0.5T", "--dopant", "P"] => REFUSED,
        "error: --thickness: the cross-check with --dopant needs the layer thickness (the \
         resistivity and the volume carrier density come from it); give it, e.g. --thickness 2um\n";
    hall_three_readings: ["hall", "--ra", "10", "--rb", "10", "--hall-readings", "1mV,2mV,3mV", "--current", "1mA", "--field", "0.5T"] => REFUSED,
        "error: --hall-readings: \"1mV,2mV,3mV\" has 3 value(s); give four voltages separated by \
         commas, in the order (+B,+I), (+B,-I), (-B,+I), (-B,-I), e.g. 7.1mV,-2.9mV,3.1mV,-6.9mV\n";
    hall_reading_in_a_current_unit: ["hall", "--ra", "10", "--rb", "10", "--hall-readings", "1mV,2mA,3mV,4mV", "--current", "1mA", "--field", "0.5T"] => REFUSED,
        "error: --hall-readings: reading 2: \"2mA\": \"mA\" is not an accepted voltage unit; \
         allowed: V (default), mV, uV, µV\n";
    hall_readings_without_hall_signal: ["hall", "--ra", "10", "--rb", "10", "--hall-readings", "1mV,1mV,1mV,1mV", "--current", "1mA", "--field", "0.5T"] => REFUSED,
        "error: --hall-readings: the net Hall voltage is 0, so neither the carrier type nor the \
         density can be found; check the field, the current and the Hall contacts\n";
    hall_readings_overflow: ["hall", "--ra", "10", "--rb", "10", "--hall-readings", "1e308,-1e308,-1e308,1e308", "--current", "1mA", "--field", "0.5T"] => REFUSED,
        "error: --hall-readings: the readings' average overflows; check their units\n";
    hall_factor_unknown: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "1mV", "--current", "1mA", "--field", "0.5T", "--hall-factor", "phonon"] => REFUSED,
        "error: --hall-factor: \"phonon\" is not known; give one of unity, acoustic-phonon, \
         ionized-impurity or a number between 0.1 and 10\n";
    hall_factor_out_of_range: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "1mV", "--current", "1mA", "--field", "0.5T", "--hall-factor", "50"] => REFUSED,
        "error: --hall-factor: 50 is not allowed; give r_H between 0.1 and 10 or one of unity, \
         acoustic-phonon, ionized-impurity\n";
    hall_thickness_uncertainty_reaches_the_value: ["hall", "--ra", "10", "--rb", "10", "--thickness", "2um", "--thickness-uncertainty", "3um"] => REFUSED,
        "error: --thickness-uncertainty: 3.000e-4 cm reaches the value itself (2.000e-4 cm); give an \
         uncertainty smaller than the value\n";
    hall_unknown_dopant: ["hall", "--ra", "10", "--rb", "10", "--hall-voltage", "1mV", "--current", "1mA", "--field", "0.5T", "--thickness", "1um", "--dopant", "Xx"] => REFUSED,
        "error: --dopant: \"Xx\" is not a known dopant of si; choose one of P, As, Sb, B, Al, Ga, In\n";
}

// ---------------------------------------------------------------------------------------------
// lots
// ---------------------------------------------------------------------------------------------

catalogue! {
    lots_without_a_file: ["lots"] => REFUSED,
        format!(
            "error: the following required arguments were not provided:\n  <FILE>...\n{}",
            usage("bandgauge lots <FILE>...")
        );
    lots_file_missing: ["lots", "none.csv"] => REFUSED,
        "error: none.csv: cannot open: No such file or directory (os error 2)\n";
    lots_second_file_missing: ["lots", "a.csv", "none.csv"] files [("a.csv", LOTS)] => REFUSED,
        "error: none.csv: cannot open: No such file or directory (os error 2)\n";
    lots_file_is_a_folder: ["lots", "folder"] files [("folder/", "")] => REFUSED,
        "error: folder: cannot read: Is a directory (os error 21)\n";
    lots_file_empty: ["lots", "a.csv"] files [("a.csv", "")] => REFUSED,
        "error: a.csv: no header line: the file is empty or holds only blank and comment lines; the \
         first other line must name the columns, e.g. lot,wafer,site,resistivity [ohm-cm]\n";
    lots_file_without_a_header: ["lots", "a.csv"] files [("a.csv", "10.1\n9.9\n")] => REFUSED,
        "error: a.csv: line 1: \"10.1\" is not a header: it names none of the columns lot, wafer, \
         site, x, y, dopant, type, resistivity, sheet_resistance, thickness, volts, amps, spacing, \
         r_a, r_b, uncertainty, geometry\n";
    lots_file_without_a_dopant: ["lots", "a.csv"] files [("a.csv", "lot,wafer,resistivity\nA1,1,10\n")] => REFUSED,
        "error: a.csv: line 1: header: no dopant: add a dopant or type column, a line '# dopant: B' \
         before the header, or name the dopant for all files (--dopant)\n";
    lots_dopant_unknown: ["lots", "a.csv", "--dopant", "Ga"] files [("a.csv", LOTS)] => REFUSED,
        "error: --dopant: dopant 'Ga' has no empirical silicon relation; give B, P, As or Sb (or \
         boron, phosphorus, arsenic, antimony)\n";
    lots_spec_reversed: ["lots", "a.csv", "--spec-resistivity", "12:8"] files [("a.csv", LOTS)] => REFUSED,
        "error: --spec-resistivity: MIN 12 is not below MAX 8; give the lower limit first\n";
    lots_spec_density_reversed: ["lots", "a.csv", "--spec-density", "5.5e14:3.5e14"] files [("a.csv", LOTS)] => REFUSED,
        "error: --spec-density: MIN 5.5e14 is not below MAX 3.5e14; give the lower limit first\n";
    lots_spec_not_a_window: ["lots", "a.csv", "--spec-resistivity", "8-12"] files [("a.csv", LOTS)] => REFUSED,
        "error: --spec-resistivity: \"8-12\" is not a window; give MIN:MAX (either side may be left \
         empty for a one-sided limit), e.g. 8:12 or 1e15:2e15\n";
    lots_spec_without_limits: ["lots", "a.csv", "--spec-resistivity", ":"] files [("a.csv", LOTS)] => REFUSED,
        "error: --spec-resistivity: both limits are empty; give MIN:MAX with at least one of them\n";
    lots_spec_limit_zero: ["lots", "a.csv", "--spec-resistivity", "0:5"] files [("a.csv", LOTS)] => REFUSED,
        "error: --spec-resistivity: MIN: 0 ohm-cm is not allowed; give a finite value > 0 ohm-cm\n";
    lots_spec_limit_not_a_number: ["lots", "a.csv", "--spec-resistivity", "1:high"] files [("a.csv", LOTS)] => REFUSED,
        format!(
            "error: --spec-resistivity: MAX: \"high\" is not a number; give a resistivity such as 10 \
             or 850 mohm-cm; units: {RESISTIVITY_UNITS}\n"
        );
    lots_spec_limit_in_a_wrong_unit: ["lots", "a.csv", "--spec-density", "1e15:2e15 ohm-cm"] files [("a.csv", LOTS)] => REFUSED,
        format!(
            "error: --spec-density: MAX: \"2e15 ohm-cm\": \"ohm-cm\" is not an accepted density unit; \
             allowed: {DENSITY_UNITS}\n"
        );
    lots_two_spec_windows: ["lots", "a.csv", "--spec-resistivity", "8:12", "--spec-density", "1e15:2e15"] files [("a.csv", LOTS)] => REFUSED,
        format!(
            "error: the argument '--spec-resistivity <MIN:MAX>' cannot be used with '--spec-density \
             <MIN:MAX>'\n{}",
            usage("bandgauge lots --spec-resistivity <MIN:MAX> <FILE>...")
        );
    lots_rows_file_cannot_be_created: ["lots", "a.csv", "--rows", "no-such-folder/rows.csv"] files [("a.csv", LOTS)] => REFUSED,
        "error: --rows: no-such-folder/rows.csv: cannot create: No such file or directory (os error \
         2)\n";
}

#[test]
fn lots_with_rejected_rows_lists_them_and_exits_3() {
    let scratch = Scratch::new("lots_with_rejected_rows");
    scratch.write(
        "a.csv",
        "lot,wafer,site,dopant,resistivity [ohm-cm]\nA1,1,1,B,10.1\nA1,1,2,B,ten\nA1,1,3,Ga,9.9\n\
         A1,1,4,B,10.0\n",
    );
    let run = run_in(&scratch.0, &["lots", "a.csv"], Stdio::piped());
    assert_eq!(
        run.stderr,
        format!(
            "a.csv:3: resistivity: \"ten\" is not a number; give a resistivity such as 10 or 850 \
             mohm-cm; units: {RESISTIVITY_UNITS}\n\
             a.csv:4: dopant: dopant 'Ga' has no empirical silicon relation; give B, P, As or Sb \
             (or boron, phosphorus, arsenic, antimony)\n"
        )
    );
    assert_eq!(run.code, 3, "some rows rejected");
    assert!(
        run.stdout.contains("A1"),
        "the good rows are summarised: {}",
        run.stdout
    );
}

#[test]
fn lots_file_of_latin1_text_is_refused() {
    let scratch = Scratch::new("lots_file_of_latin1_text");
    std::fs::write(
        scratch.0.join("a.csv"),
        b"# Messung bei 23 \xB0C\nlot,wafer,dopant,resistivity\nA1,1,B,10\n",
    )
    .expect("write");
    let run = run_in(&scratch.0, &["lots", "a.csv"], Stdio::piped());
    assert_eq!(
        run.stderr,
        "error: a.csv: line 1: not UTF-8 text; save the file as UTF-8 (or plain ASCII) CSV\n"
    );
    assert_eq!(run.code, REFUSED);
    assert_eq!(run.stdout, "");
}

// ---------------------------------------------------------------------------------------------
// An answer that cannot be written: exit code 1
// ---------------------------------------------------------------------------------------------

/// Runs `args` with stdout on /dev/full, where every write fails with "no space left".
fn with_full_stdout(test: &str, files: &[(&str, &str)], args: &[&str]) -> Run {
    let scratch = Scratch::new(test);
    for (name, text) in files {
        scratch.write(name, text);
    }
    let full = std::fs::OpenOptions::new()
        .write(true)
        .open("/dev/full")
        .expect("/dev/full exists on Linux");
    run_in(&scratch.0, args, Stdio::from(full))
}

#[test]
fn answer_that_cannot_be_written_exits_1() {
    let run = with_full_stdout("answer_that_cannot_be_written", &[], &["materials"]);
    assert_eq!(
        run.stderr,
        "error: writing the answer: No space left on device (os error 28)\n"
    );
    assert_eq!(run.code, 1);
}

#[test]
fn lots_summary_that_cannot_be_written_exits_1() {
    let run = with_full_stdout(
        "lots_summary_that_cannot_be_written",
        &[("a.csv", LOTS)],
        &["lots", "a.csv"],
    );
    assert_eq!(
        run.stderr,
        "error: writing the answer: No space left on device (os error 28)\n"
    );
    assert_eq!(run.code, 1);
}
