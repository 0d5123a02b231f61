//! Lots view unit tests: the demo scenario's verdicts, chunked reading, exports and charts.

use bandgauge_core::lots::{SpecQuantity, SpecWindow, Verdict};

use super::charts::site_side;
use super::*;
use crate::chart::Mark;

fn demo_work() -> LotsWork {
    let mut work = LotsWork::new(None);
    for (name, text) in DEMO_FILES {
        work.read_text(name, text);
    }
    work
}

#[test]
fn demo_lots_get_the_scenario_verdicts() {
    let work = demo_work();
    let spec = spec_from_inputs("resistivity", DEMO_SPEC.0, DEMO_SPEC.1).unwrap();
    let report = work.report(spec.as_ref());
    let verdicts: Vec<(&str, Option<Verdict>)> = report
        .lots
        .iter()
        .map(|l| (l.lot.as_str(), l.verdict))
        .collect();
    assert_eq!(
        verdicts,
        [
            ("C2-4417", Some(Verdict::Pass)),
            ("C2-4418", Some(Verdict::Pass)),
            ("C2-4421", Some(Verdict::Fail)),
            ("C2-4425", Some(Verdict::Marginal)),
        ]
    );
    let c = work.counts();
    assert_eq!((c.read, c.converted, c.rejected), (605, 598, 7));
}

#[test]
fn bad_rows_are_listed_with_file_and_line() {
    let work = demo_work();
    let lines: Vec<u64> = work.rejected.iter().map(|r| r.line).collect();
    assert_eq!(lines, [12, 28, 42, 57, 72, 100, 115]);
    assert!(
        work.rejected
            .iter()
            .all(|r| r.file == "c2-4425-with-bad-rows.csv")
    );
    assert_eq!(work.rejected[1].column, "wafer");
}

#[test]
fn chunks_of_any_size_give_the_same_result() {
    let (name, text) = DEMO_FILES[1];
    let mut whole = LotsWork::new(None);
    whole.read_text(name, text);
    let mut pieces = LotsWork::new(None);
    pieces.begin_file(name, text.len() as u64);
    for chunk in text.as_bytes().chunks(97) {
        pieces.feed(chunk);
    }
    pieces.end_file();
    assert_eq!(pieces.sites, whole.sites);
    assert_eq!(pieces.files[0].bytes_read, text.len() as u64);
    assert_eq!(pieces.counts(), whole.counts());
}

#[test]
fn a_file_that_is_not_a_lot_file_is_skipped_among_several() {
    let mut work = demo_work();
    work.read_text("README.md", "# Demo wafer lots\n\nInvented data.\n");
    let readme = work.files.last().expect("read");
    assert!(readme.not_a_lot_file);
    let problem = work.file_problem(readme).expect("a problem");
    assert!(
        problem.starts_with("skipped README.md: not a lot file: line 3: "),
        "{problem}"
    );
    assert_eq!(work.skipped_files(), 1);
    assert!(
        work.status_line(5, false)
            .contains("4 file(s) read, 1 skipped")
    );
    assert_eq!(
        work.report(None).lots.len(),
        4,
        "the other files are summarised"
    );
    // Alone it is refused, as `bandgauge lots` refuses it.
    let mut alone = LotsWork::new(None);
    alone.read_text("README.md", "# Demo wafer lots\n\nInvented data.\n");
    let problem = alone.file_problem(&alone.files[0]).expect("a problem");
    assert!(problem.starts_with("README.md: line 3: "), "{problem}");
    assert_eq!(alone.skipped_files(), 0);
    // A lot file with a fault is never skipped.
    let mut faulty = demo_work();
    faulty.read_text("no-dopant.csv", "lot,wafer,resistivity\nA,1,10\n");
    let status = faulty.files.last().expect("read");
    assert!(!status.not_a_lot_file);
    assert!(
        faulty
            .file_problem(status)
            .expect("a problem")
            .starts_with("no-dopant.csv: ")
    );
}

#[test]
fn lot_differences_show_raw_and_holm_adjusted_p() {
    let report = demo_work().report(None);
    let rows = difference_rows(&report, None);
    // Four demo lots: six pairs and the all-lots test.
    assert_eq!(rows.len(), 7);
    for d in &rows[..6] {
        let adjusted = d.p_adjusted.expect("pairs are adjusted");
        assert!(d.p_raw <= adjusted, "{d:?}");
        assert_eq!(d.significant, adjusted < 0.05);
    }
    assert_eq!(rows[6].p_adjusted, None);
    // Source: Holm, Scand. J. Statist. 6, 65-70 (1979): the smallest of m = 6 p-values is
    // multiplied by 6.
    let smallest = rows[..6]
        .iter()
        .min_by(|a, b| a.p_raw.total_cmp(&b.p_raw))
        .expect("six");
    let ratio = smallest.p_adjusted.expect("adjusted") / smallest.p_raw;
    assert!((ratio - 6.0).abs() < 1e-12, "{ratio}");
    let picked = difference_rows(&report, Some("C2-4417"));
    assert_eq!(
        picked.len(),
        3,
        "the pairs with the picked lot, no all-lots test"
    );
}

#[test]
fn unusable_files_are_reported_not_summarised() {
    let mut work = LotsWork::new(None);
    work.read_text("no-dopant.csv", "lot,wafer,resistivity\nA,1,10\n");
    assert!(
        work.files[0]
            .error
            .as_deref()
            .unwrap_or("")
            .contains("no dopant")
    );
    assert_eq!(work.counts().read, 0);
    let mut work = LotsWork::new(Some("B".to_owned()));
    work.read_text("no-dopant.csv", "lot,wafer,resistivity\nA,1,10\n");
    assert_eq!(work.counts().converted, 1);
}

#[test]
fn status_and_progress_follow_the_reading() {
    let (name, text) = DEMO_FILES[0];
    let mut work = LotsWork::new(None);
    assert_eq!(work.status_line(2, false), "");
    work.begin_file(name, text.len() as u64);
    let half = text.len() / 2;
    work.feed(&text.as_bytes()[..half]);
    // Half of the first of two files: a quarter of the job.
    let expected = 0.5 * half as f64 / text.len() as f64;
    assert!((work.progress_fraction(2) - expected).abs() < 1e-12);
    let status = work.status_line(2, true);
    assert!(
        status.starts_with(&format!("Reading {name} (file 1 of 2, 50 %): ")),
        "{status}"
    );
    work.feed(&text.as_bytes()[half..]);
    work.end_file();
    let c = work.counts();
    assert_eq!(
        work.status_line(2, false),
        format!(
            "1 file(s) read: {} rows read, {} converted, {} rejected",
            c.read, c.converted, c.rejected
        )
    );
}

#[test]
fn a_file_left_half_read_is_marked_and_closed() {
    let (name, text) = DEMO_FILES[1];
    let mut work = LotsWork::new(None);
    work.begin_file(name, text.len() as u64);
    work.feed(&text.as_bytes()[..text.len() / 3]);
    assert!(work.reading());
    let counted = work.counts().read;
    work.interrupt();
    assert!(!work.reading());
    assert!(work.current_failed());
    assert!(
        work.files[0]
            .error
            .as_deref()
            .is_some_and(|e| e.contains("pick the file again"))
    );
    // Nothing more is read into a closed file, and what was counted stays.
    work.feed(&text.as_bytes()[text.len() / 3..]);
    work.end_file();
    assert_eq!(work.counts().read, counted);
    // A finished file is left alone.
    let mut done = LotsWork::new(None);
    done.read_text(name, text);
    done.interrupt();
    assert_eq!(done.files[0].error, None);
}

#[test]
fn verdicts_and_outside_sites_are_written_not_only_coloured() {
    let work = demo_work();
    let spec = spec_from_inputs("resistivity", DEMO_SPEC.0, DEMO_SPEC.1).unwrap();
    let report = work.report(spec.as_ref());
    let chart = distribution_chart(&report, spec.as_ref(), None).unwrap();
    let labels: Vec<&str> = chart
        .marks
        .iter()
        .filter_map(|m| match m {
            Mark::Point { label, .. } if !label.is_empty() => Some(label.as_str()),
            _ => None,
        })
        .collect();
    assert_eq!(labels.len(), 4);
    for (label, word) in labels.iter().zip(["pass", "pass", "fail", "marginal"]) {
        assert!(label.ends_with(word), "{label}");
    }
    // Every site of C2-4421 wafer 11 lies below 8 ohm cm.
    let map = wafer_map(&work.sites, "C2-4421", "11", spec.as_ref()).unwrap();
    assert!(map.marks.iter().all(|m| match m {
        Mark::Point { label, .. } => label.ends_with(" low"),
        Mark::Vertical { .. } => false,
    }));
    let window = SpecWindow::parse(SpecQuantity::Resistivity, "8:12").unwrap();
    assert_eq!(site_side(&window, 7.9), "low");
    assert_eq!(site_side(&window, 12.1), "high");
    assert_eq!(site_side(&window, 10.0), "");
}

#[test]
fn exports_charts_and_spec_inputs() {
    let work = demo_work();
    let spec = spec_from_inputs("resistivity", "8", "12").unwrap();
    let report = work.report(spec.as_ref());
    let summary = summary_csv(&report);
    // One line per lot and per wafer, after the header.
    assert_eq!(summary.lines().count(), 1 + 4 + 46);
    let rows = work.rows_csv(spec.as_ref());
    assert_eq!(rows.lines().count(), 1 + 598);
    let chart = distribution_chart(&report, spec.as_ref(), None).unwrap();
    assert_eq!(
        chart
            .series
            .iter()
            .filter(|s| s.name.starts_with("spec"))
            .count(),
        2
    );
    assert!(distribution_chart(&report, spec.as_ref(), Some("C2-4421")).is_some());
    let map = wafer_map(&work.sites, "C2-4417", "01", spec.as_ref()).unwrap();
    assert_eq!(map.marks.len(), 13);
    assert_eq!(spec_from_inputs("density", "", "").unwrap(), None);
    assert!(spec_from_inputs("resistivity", "12", "8").is_err());
}
