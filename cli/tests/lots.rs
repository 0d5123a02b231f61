//! `bandgauge lots` on the demo lots: JSON keys and verdicts, rejected rows on stderr with file
//! and line, exit codes 0 / 3 / 2, the `--rows` export, and statistics recomputed here.
//!
//! Check values: verdicts, wafer and site counts and rejected lines are those of the invented
//! demo scenario (`demo-wafers/README.md`, invented data, no published source); statistics are
//! recomputed here from the `--rows` export; exit codes are the CLI's documented contract.

mod support;

use std::path::PathBuf;

use serde_json::Value;
use support::{EXIT_BAD_INPUT, bandgauge, number, relative_difference};

/// Exit code when some rows were rejected.
const EXIT_ROWS_REJECTED: i32 = 3;
/// The summary is computed in one pass (Welford) and here in two: a few ulps apart.
const TWO_WAYS_OF_SUMMING: f64 = 1e-12;

/// Keys the issue requires in every lot object.
const REQUIRED_KEYS: [&str; 6] = [
    "lot",
    "wafers",
    "sites",
    "verdict",
    "resistivity_ohm_cm",
    "density_cm3",
];
const STATISTIC_KEYS: [&str; 5] = ["mean", "median", "std", "min", "max"];

fn demo(name: &str) -> String {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("../demo-wafers")
        .join(name);
    path.to_string_lossy().into_owned()
}

const CLEAN: [&str; 3] = ["c2-4417.csv", "c2-4418.csv", "c2-4421.tsv"];
const WITH_BAD_ROWS: &str = "c2-4425-with-bad-rows.csv";

fn all_demo_files() -> Vec<String> {
    CLEAN
        .iter()
        .chain(std::iter::once(&WITH_BAD_ROWS))
        .map(|n| demo(n))
        .collect()
}

fn lot<'a>(lots: &'a Value, id: &str) -> &'a Value {
    lots.as_array()
        .expect("an array of lots")
        .iter()
        .find(|l| l["lot"] == id)
        .unwrap_or_else(|| panic!("no lot {id} in {lots}"))
}

/// A scratch file under the system temporary directory, named for this test process.
fn scratch(name: &str, contents: &str) -> String {
    let path = std::env::temp_dir().join(format!("bandgauge-lots-{}-{name}", std::process::id()));
    std::fs::write(&path, contents).expect("temp file");
    path.to_string_lossy().into_owned()
}

#[test]
fn demo_lots_as_json_with_verdicts_and_rejected_rows() {
    let files = all_demo_files();
    let mut args: Vec<&str> = vec!["lots"];
    args.extend(files.iter().map(String::as_str));
    args.extend(["--spec-resistivity", "8:12", "--json"]);
    let run = bandgauge(&args);
    assert_eq!(run.code, EXIT_ROWS_REJECTED, "stderr: {}", run.stderr);
    let lots: Value = serde_json::from_str(&run.stdout).expect("JSON on stdout");
    assert_eq!(lots.as_array().map(Vec::len), Some(4));
    for entry in lots.as_array().unwrap() {
        for key in REQUIRED_KEYS {
            assert!(entry.get(key).is_some(), "{key} missing in {entry}");
        }
        for quantity in ["resistivity_ohm_cm", "density_cm3"] {
            for key in STATISTIC_KEYS {
                assert!(
                    entry[quantity][key].is_number(),
                    "{quantity}.{key} in {entry}"
                );
            }
        }
        assert!(entry["model"].as_str().unwrap().contains("ASTM F723"));
    }
    // The scenario of demo-wafers/README.md: two lots pass, C2-4421 fails, one wafer of
    // C2-4425 sits within its uncertainty of the lower limit.
    let verdicts: Vec<(&str, &str)> = ["C2-4417", "C2-4418", "C2-4421", "C2-4425"]
        .iter()
        .map(|id| (*id, lot(&lots, id)["verdict"].as_str().unwrap()))
        .collect();
    assert_eq!(
        verdicts,
        [
            ("C2-4417", "pass"),
            ("C2-4418", "pass"),
            ("C2-4421", "fail"),
            ("C2-4425", "marginal")
        ]
    );
    assert_eq!(lot(&lots, "C2-4425")["worst_wafer"], "07");
    assert_eq!(lot(&lots, "C2-4417")["wafers"], 12);
    assert_eq!(lot(&lots, "C2-4425")["sites"], 130);
    // C2-4418 runs heavier than C2-4417 and that is not noise.
    let versus = lot(&lots, "C2-4418")["versus"]
        .as_array()
        .unwrap()
        .iter()
        .find(|v| v["lot"] == "C2-4417")
        .expect("compared with C2-4417");
    assert!(number(versus, "percent") > 5.0 && versus["significant"] == true);

    // Every rejected row of the bad-rows file on stderr, with file and line.
    let expected_lines = [12, 28, 42, 57, 72, 100, 115];
    let rejected: Vec<&str> = run
        .stderr
        .lines()
        .filter(|l| !l.starts_with("note:"))
        .collect();
    assert_eq!(rejected.len(), expected_lines.len(), "{}", run.stderr);
    for (line, number) in rejected.iter().zip(expected_lines) {
        let prefix = format!("{}:{number}: ", demo(WITH_BAD_ROWS));
        assert!(
            line.starts_with(&prefix),
            "{line:?} should start with {prefix:?}"
        );
    }
}

#[test]
fn clean_files_exit_0_and_the_statistics_match_a_recomputation() {
    let path = demo("c2-4417.csv");
    let run = bandgauge(&["lots", &path, "--json"]);
    assert_eq!(run.code, 0, "stderr: {}", run.stderr);
    assert!(run.stderr.is_empty(), "{}", run.stderr);
    let lots: Value = serde_json::from_str(&run.stdout).unwrap();
    let entry = lot(&lots, "C2-4417");
    assert!(entry["verdict"].is_null(), "no window, no verdict");
    // Recompute from the file: mean, sample standard deviation (n - 1), median, min, max.
    let text = std::fs::read_to_string(&path).unwrap();
    let mut values: Vec<f64> = text
        .lines()
        .skip(1)
        .map(|l| l.split(',').nth(6).unwrap().parse().unwrap())
        .collect();
    let n = values.len() as f64;
    let mean = values.iter().sum::<f64>() / n;
    let std = (values.iter().map(|v| (v - mean).powi(2)).sum::<f64>() / (n - 1.0)).sqrt();
    values.sort_by(f64::total_cmp);
    let middle = values.len() / 2;
    let median = if values.len().is_multiple_of(2) {
        0.5 * (values[middle - 1] + values[middle])
    } else {
        values[middle]
    };
    let rho = &entry["resistivity_ohm_cm"];
    assert!(relative_difference(number(rho, "mean"), mean) < TWO_WAYS_OF_SUMMING);
    assert!(relative_difference(number(rho, "std"), std) < 1e-10);
    assert_eq!(number(rho, "median"), median);
    assert_eq!(number(rho, "min"), values[0]);
    assert_eq!(number(rho, "max"), *values.last().unwrap());
    assert_eq!(number(entry, "sites"), n);
}

#[test]
fn table_output_states_the_model_once_and_the_verdicts() {
    let files = all_demo_files();
    let mut args: Vec<&str> = vec!["lots"];
    args.extend(files.iter().map(String::as_str));
    args.extend(["--spec-density", "3.6e14:5.6e14"]);
    let run = bandgauge(&args);
    assert_eq!(run.code, EXIT_ROWS_REJECTED);
    assert_eq!(run.stdout.matches("Model: ").count(), 1, "{}", run.stdout);
    assert!(
        run.stdout
            .contains("605 rows read, 598 converted, 7 rejected")
    );
    assert!(
        run.stdout
            .contains("Spec window: dopant density 3.6e14 to 5.6e14 cm^-3")
    );
    for id in ["C2-4417", "C2-4418", "C2-4421", "C2-4425"] {
        assert!(run.stdout.contains(id), "{id}");
    }
    assert!(run.stdout.contains("fail") && run.stdout.contains("Welch t ="));
}

#[test]
fn rows_export_holds_every_converted_row() {
    let out = std::env::temp_dir().join(format!("bandgauge-lots-{}-rows.csv", std::process::id()));
    let out_text = out.to_string_lossy().into_owned();
    let bad = demo(WITH_BAD_ROWS);
    let run = bandgauge(&[
        "lots",
        &bad,
        "--spec-resistivity",
        "8:12",
        "--rows",
        &out_text,
    ]);
    assert_eq!(run.code, EXIT_ROWS_REJECTED);
    let csv = std::fs::read_to_string(&out).expect("rows written");
    let mut lines = csv.lines();
    let header = lines.next().unwrap();
    assert!(header.starts_with("file,line,lot,wafer,site,x_mm,y_mm,dopant,measurement"));
    let rows: Vec<&str> = lines.collect();
    assert_eq!(rows.len(), 130, "137 rows read, 7 rejected");
    assert!(rows.iter().all(|r| r.contains(",four_point_probe,")));
    assert!(
        rows.iter().any(|r| r.ends_with(",no")),
        "wafer 07 has sites below 8 ohm cm"
    );
    std::fs::remove_file(out).ok();
}

#[test]
fn unusable_input_exits_2() {
    let missing = demo("no-such-lot.csv");
    let run = bandgauge(&["lots", &missing]);
    assert_eq!(run.code, EXIT_BAD_INPUT);
    assert!(run.stderr.contains("cannot open"), "{}", run.stderr);
    assert!(run.stdout.is_empty());

    let headerless = scratch("headerless.csv", "A1,1,10.5\nA1,2,10.4\n");
    let run = bandgauge(&["lots", &headerless, "--dopant", "B"]);
    assert_eq!(run.code, EXIT_BAD_INPUT);
    assert!(run.stderr.contains("is not a header"), "{}", run.stderr);

    let no_dopant = scratch("no-dopant.csv", "lot,wafer,resistivity\nA,1,10\n");
    let run = bandgauge(&["lots", &no_dopant]);
    assert_eq!(run.code, EXIT_BAD_INPUT);
    assert!(run.stderr.contains("no dopant"), "{}", run.stderr);
    // The same file with --dopant converts.
    assert_eq!(bandgauge(&["lots", &no_dopant, "--dopant", "B"]).code, 0);

    for args in [
        vec!["lots", &no_dopant, "--dopant", "Ga"],
        vec![
            "lots",
            &no_dopant,
            "--dopant",
            "B",
            "--spec-resistivity",
            "12:8",
        ],
        vec![
            "lots",
            &no_dopant,
            "--dopant",
            "B",
            "--spec-density",
            "x:1e15",
        ],
        vec![
            "lots",
            &no_dopant,
            "--spec-resistivity",
            "8:12",
            "--spec-density",
            "1e14:1e15",
        ],
    ] {
        let run = bandgauge(&args);
        assert_eq!(run.code, EXIT_BAD_INPUT, "{args:?}: {}", run.stderr);
        assert!(run.stdout.is_empty());
    }
    std::fs::remove_file(headerless).ok();
    std::fs::remove_file(no_dopant).ok();
}

#[test]
fn a_file_that_is_not_a_lot_file_is_skipped_among_several() {
    // `lots demo-wafers/*` as the README writes it: the folder's README.md is named as skipped
    // and the four lots are still summarised, exit 3.
    let mut files = all_demo_files();
    files.push(demo("README.md"));
    let mut args: Vec<&str> = vec!["lots"];
    args.extend(files.iter().map(String::as_str));
    args.extend(["--spec-resistivity", "8:12"]);
    let run = bandgauge(&args);
    assert_eq!(run.code, EXIT_ROWS_REJECTED, "stderr: {}", run.stderr);
    let skipped = format!("skipped {}: not a lot file: line 3: ", demo("README.md"));
    assert!(
        run.stderr.lines().any(|l| l.starts_with(&skipped)),
        "{}",
        run.stderr
    );
    assert!(
        run.stdout
            .starts_with("Lots from 4 file(s) (1 other file(s) skipped"),
        "{}",
        run.stdout
    );
    assert!(
        run.stdout.contains(&format!("  - {skipped}")),
        "{}",
        run.stdout
    );
    for id in ["C2-4417", "C2-4418", "C2-4421", "C2-4425"] {
        assert!(
            run.stdout.contains(&format!("\n  {id} ")),
            "{id}: {}",
            run.stdout
        );
    }

    // Files without any rejected row: the skipped file alone makes the exit code 3.
    let notes = scratch("notes.txt", "Shift notes: furnace 3 back in service.\n");
    let empty = scratch("empty.csv", "");
    let run = bandgauge(&["lots", &demo("c2-4417.csv"), &notes, &empty]);
    assert_eq!(run.code, EXIT_ROWS_REJECTED, "{}", run.stderr);
    assert!(
        run.stderr
            .contains(&format!("skipped {notes}: not a lot file")),
        "{}",
        run.stderr
    );
    assert!(
        run.stderr
            .contains(&format!("skipped {empty}: not a lot file: no header line")),
        "{}",
        run.stderr
    );
    assert!(run.stdout.contains("C2-4417"));

    // A single file that is not a lot file, or only such files, still exits 2.
    let run = bandgauge(&["lots", &notes]);
    assert_eq!(run.code, EXIT_BAD_INPUT);
    assert!(
        run.stderr.starts_with(&format!("error: {notes}: line 1: ")),
        "{}",
        run.stderr
    );
    assert!(run.stdout.is_empty());
    let run = bandgauge(&["lots", &notes, &empty]);
    assert_eq!(run.code, EXIT_BAD_INPUT);
    assert!(
        run.stderr
            .contains("error: none of the 2 files is a lot file"),
        "{}",
        run.stderr
    );
    assert!(run.stdout.is_empty());

    // A lot file with a fault in its header is not skipped: the batch is refused, exit 2.
    let faulty = scratch("faulty.csv", "lot,wafer,resistivity\nA,1,10\n");
    let run = bandgauge(&["lots", &demo("c2-4417.csv"), &faulty]);
    assert_eq!(run.code, EXIT_BAD_INPUT);
    assert!(run.stderr.contains("no dopant"), "{}", run.stderr);
    for file in [notes, empty, faulty] {
        std::fs::remove_file(file).ok();
    }
}

#[test]
fn pairwise_p_values_are_shown_raw_and_holm_adjusted() {
    let files = all_demo_files();
    let mut args: Vec<&str> = vec!["lots"];
    args.extend(files.iter().map(String::as_str));
    args.push("--json");
    let run = bandgauge(&args);
    let lots: Value = serde_json::from_str(&run.stdout).expect("JSON on stdout");
    let mut pairs = 0;
    for entry in lots.as_array().unwrap() {
        for versus in entry["versus"].as_array().unwrap() {
            let (raw, adjusted) = (number(versus, "p_value"), number(versus, "p_adjusted"));
            assert!(raw <= adjusted && adjusted <= 1.0, "{versus}");
            assert_eq!(versus["significant"], adjusted < 0.05, "{versus}");
            assert!(
                versus["adjustment"]
                    .as_str()
                    .unwrap()
                    .contains("Holm (1979)")
            );
            pairs += 1;
        }
    }
    // Four lots: six pairs, each listed under both of its lots.
    assert_eq!(pairs, 12);
    // Source: Holm, Scand. J. Statist. 6, 65-70 (1979): the smallest of m p-values is
    // multiplied by m. Here m = 6 and the smallest is C2-4421 against C2-4417.
    let versus = lot(&lots, "C2-4421")["versus"]
        .as_array()
        .unwrap()
        .iter()
        .find(|v| v["lot"] == "C2-4417")
        .unwrap()
        .clone();
    assert!(
        relative_difference(
            number(&versus, "p_adjusted"),
            6.0 * number(&versus, "p_value")
        ) < 1e-12
    );
    // The table shows both p-values, the rule and the source.
    args.pop();
    let text = bandgauge(&args).stdout;
    assert!(text.contains(", Holm-adjusted p = "), "{text}");
    assert!(
        text.contains("(6 pairs; a pair is significant when its adjusted p < 0.05; Holm step-down"),
        "{text}"
    );
    assert!(text.contains("Holm (1979), Scand. J. Statist. 6, 65-70"));
}

#[test]
fn per_wafer_uniformity_and_centre_to_edge_in_json_and_table() {
    // Synthetic: the C2-4429 demo lot is centre-high by 11 % with 0.4 % noise per site
    // (demo-wafers/make_patterned_lots.py).
    let path = demo("c2-4429-radial.csv");
    let run = bandgauge(&["lots", &path, "--json"]);
    assert_eq!(run.code, 0, "stderr: {}", run.stderr);
    let lots: Value = serde_json::from_str(&run.stdout).unwrap();
    let entry = lot(&lots, "C2-4429");
    // The demo file states its outline (`# diameter: 150 mm`, `# notch: 270`, demo README).
    assert_eq!(
        entry["outline"]["diameter_mm"], 150.0,
        "{}",
        entry["outline"]
    );
    assert_eq!(entry["outline"]["orientation"]["mark"], "notch");
    assert_eq!(entry["outline"]["orientation"]["angle_deg"], 270.0);
    for wafer in entry["wafer_results"].as_array().unwrap() {
        let rho = &wafer["resistivity_ohm_cm"];
        let u = &wafer["uniformity"];
        let (min, max, mean) = (number(rho, "min"), number(rho, "max"), number(rho, "mean"));
        // Source: the definitions, recomputed from the wafer's own min, max and mean.
        let range_over_sum = 100.0 * (max - min) / (max + min);
        assert!(relative_difference(number(u, "range_over_sum_percent"), range_over_sum) < 1e-12);
        let range_over_mean = 100.0 * (max - min) / mean;
        assert!(relative_difference(number(u, "range_over_mean_percent"), range_over_mean) < 1e-12);
        let std_over_mean = number(rho, "nonuniformity_percent");
        assert!(relative_difference(number(u, "std_over_mean_percent"), std_over_mean) < 1e-12);
        let c2e = number(wafer, "centre_to_edge_percent");
        assert!((9.0..13.0).contains(&c2e), "{c2e}");
    }
    let run = bandgauge(&["lots", &path]);
    assert_eq!(run.code, 0);
    for text in [
        "std/mean %",
        "range/sum %",
        "range/mean %",
        "centre-edge %",
        "centre-to-edge = ",
    ] {
        assert!(
            run.stdout.contains(text),
            "{text} missing in {}",
            run.stdout
        );
    }
}

#[test]
fn outline_settings_reach_the_json() {
    let path = scratch(
        "outline.csv",
        "# diameter: 200 mm\n# notch: 270\nlot,wafer,x,y,dopant,resistivity\nA,1,0,0,B,10\nA,1,90,0,B,11\n",
    );
    let run = bandgauge(&["lots", &path, "--json"]);
    assert_eq!(run.code, 0, "stderr: {}", run.stderr);
    let lots: Value = serde_json::from_str(&run.stdout).unwrap();
    let outline = &lot(&lots, "A")["outline"];
    assert_eq!(outline["diameter_mm"], 200.0);
    assert_eq!(outline["orientation"]["mark"], "notch");
    assert_eq!(outline["orientation"]["angle_deg"], 270.0);
    // Two sites: uniformity, and the centre (0,0) against the edge (90 mm): -1/11.
    let wafer = &lot(&lots, "A")["wafer_results"][0];
    let c2e = number(wafer, "centre_to_edge_percent");
    assert!(relative_difference(c2e, -100.0 / 11.0) < 1e-12, "{c2e}");
}
