//! Replays every fuzz corpus and regression input on stable, through the same invariant
//! checks as the fuzz targets (`fuzz/src/checks/`, included here by path, so that this test
//! needs neither libFuzzer nor nightly, and the fuzz build never sees fantoccini or tokio).
//!
//! Inputs: `fuzz/corpus/<target>/*` (seeds and minimised finds) and
//! `fuzz/regressions/<target>/*` (inputs that once broke an invariant and were fixed).

#[path = "../../fuzz/src/checks/mod.rs"]
mod checks;

use std::panic::{AssertUnwindSafe, catch_unwind};
use std::path::{Path, PathBuf};

/// A corpus smaller than this means the seeds went missing, not that all is well.
const MIN_CORPUS_FILES: usize = 5;

fn fuzz_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("tests/ has a parent")
        .join("fuzz")
}

fn files_in(dir: &Path) -> Vec<PathBuf> {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return Vec::new();
    };
    let mut files: Vec<PathBuf> = entries
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.is_file())
        .collect();
    files.sort();
    files
}

/// Runs `check` on every input of `target`; fails naming each input that breaks it.
fn replay(target: &str, check: fn(&[u8])) {
    let corpus = files_in(&fuzz_dir().join("corpus").join(target));
    assert!(
        corpus.len() >= MIN_CORPUS_FILES,
        "fuzz/corpus/{target} has {} files; expected at least {MIN_CORPUS_FILES}",
        corpus.len()
    );
    let regressions = files_in(&fuzz_dir().join("regressions").join(target));
    let mut failures = Vec::new();
    for path in corpus.iter().chain(&regressions) {
        let data = std::fs::read(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        if let Err(panic) = catch_unwind(AssertUnwindSafe(|| check(&data))) {
            let message = panic
                .downcast_ref::<String>()
                .cloned()
                .or_else(|| panic.downcast_ref::<&str>().map(|s| (*s).to_owned()))
                .unwrap_or_default();
            failures.push(format!("{}: {message}", path.display()));
        }
    }
    assert!(
        failures.is_empty(),
        "{} of {} {target} inputs break an invariant:\n{}",
        failures.len(),
        corpus.len() + regressions.len(),
        failures.join("\n")
    );
}

#[test]
fn units_corpus_keeps_its_invariants() {
    replay("units", checks::units::check);
}

#[test]
fn lot_reader_corpus_keeps_its_invariants() {
    replay("lot_reader", checks::lot_reader::check);
}

#[test]
fn url_state_corpus_keeps_its_invariants() {
    replay("url_state", checks::url_state::check);
}

#[test]
fn record_corpus_keeps_its_invariants() {
    replay("record", checks::record::check);
}

/// Records of every view, as this bandgauge writes them, read back and replay exactly. With
/// `BANDGAUGE_WRITE_RECORD_SEEDS=1` they are also written to `fuzz/corpus/record/` as seeds
/// (run it after a change to the record layout, then minimise the corpus).
#[test]
fn records_of_every_view_replay_and_seed_the_record_corpus() {
    use bandgauge_app::record::{LotFile, LotInputs, RecordInputs, capture, read_record, to_json};
    use bandgauge_app::state::{View, Workbench};
    let demo = fuzz_dir().join("../demo-wafers/c2-4425-with-bad-rows.csv");
    let demo = std::fs::read_to_string(&demo).unwrap_or_else(|e| panic!("{demo:?}: {e}"));
    // The first 20 lines: settings, the header, good rows and the first bad one.
    let demo: String = demo.lines().take(20).map(|l| format!("{l}\n")).collect();
    let write = std::env::var_os("BANDGAUGE_WRITE_RECORD_SEEDS").is_some();
    for view in View::ALL {
        let lots = (view == View::Lots).then(|| LotInputs {
            default_dopant: String::new(),
            spec_quantity: "resistivity".into(),
            spec_min: "3.5".into(),
            spec_max: "4.5".into(),
            files: vec![LotFile {
                name: "c2-4425-with-bad-rows.csv".into(),
                text: demo.clone(),
            }],
        });
        let mut workbench = Workbench {
            view,
            ..Workbench::default()
        };
        // Few temperatures keep the sweep seed small (fuzz inputs stay short).
        workbench.sweep.points = "4".into();
        let record = capture(RecordInputs { workbench, lots }, "2026-05-20T12:00:00Z")
            .unwrap_or_else(|e| panic!("{view:?}: {e}"));
        let json = to_json(&record);
        assert_eq!(read_record(&json).as_ref(), Ok(&record), "{view:?}");
        let replayed =
            bandgauge_app::record::replay(&record).unwrap_or_else(|e| panic!("{view:?}: {e}"));
        assert!(replayed.values > 0, "{view:?}: a record without values");
        if write {
            let path = fuzz_dir()
                .join("corpus/record")
                .join(format!("seed-{}.json", view.key()));
            std::fs::write(&path, &json).unwrap_or_else(|e| panic!("{path:?}: {e}"));
        }
    }
}

#[test]
fn the_checks_catch_a_broken_invariant() {
    // The replay is only worth something if a check can fail: a NaN hidden in a nested value
    // must be found, even where serde_json would write it as null.
    #[derive(Debug)]
    #[allow(dead_code)] // read through Debug only
    struct Figures {
        mean: f64,
        std: Option<f64>,
        by_wafer: Vec<(String, f64)>,
    }
    let figures = Figures {
        mean: 1.0,
        std: Some(f64::NAN),
        by_wafer: vec![("01".into(), 2.0), ("02".into(), f64::INFINITY)],
    };
    assert_eq!(checks::finite::non_finite_tokens(&figures), ["NaN", "inf"]);
}
