//! Lots view unit tests: the demo scenario's verdicts, chunked reading, exports and charts.

use bandgauge_core::lots::{SpecQuantity, SpecWindow, Verdict};

use super::charts::site_side;
use super::*;
use crate::chart::{Mark, Shape};
use crate::wafer_map::Side;

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
            ("C2-4429", Some(Verdict::Pass)),
            ("C2-4432", Some(Verdict::Pass)),
        ]
    );
    // The patterned lots pass on their wafer means, but their sites say what is wrong: the
    // outer ring of C2-4429 wafer 04 lies below 8 ohm cm (23 sites), and the hot spot of
    // C2-4432 lifts one site above 12 ohm cm on wafers 01 and 04.
    let outside = |lot: &str| {
        report
            .lots
            .iter()
            .find(|l| l.lot == lot)
            .and_then(|l| l.sites_outside)
    };
    assert_eq!(outside("C2-4429"), Some(23));
    assert_eq!(outside("C2-4432"), Some(2));
    let c = work.counts();
    assert_eq!((c.read, c.converted, c.rejected), (1046, 1039, 7));
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
            .contains("6 file(s) read, 1 skipped")
    );
    assert_eq!(
        work.report(None).lots.len(),
        6,
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
    // Six demo lots: fifteen pairs and the all-lots test.
    assert_eq!(rows.len(), 16);
    for d in &rows[..15] {
        let adjusted = d.p_adjusted.expect("pairs are adjusted");
        assert!(d.p_raw <= adjusted, "{d:?}");
        assert_eq!(d.significant, adjusted < 0.05);
    }
    assert_eq!(rows[15].p_adjusted, None);
    // Source: Holm, Scand. J. Statist. 6, 65-70 (1979): the smallest of m = 15 p-values is
    // multiplied by 15.
    let smallest = rows[..15]
        .iter()
        .min_by(|a, b| a.p_raw.total_cmp(&b.p_raw))
        .expect("fifteen");
    let ratio = smallest.p_adjusted.expect("adjusted") / smallest.p_raw;
    assert!((ratio - 15.0).abs() < 1e-12, "{ratio}");
    let picked = difference_rows(&report, Some("C2-4417"));
    assert_eq!(
        picked.len(),
        5,
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
    // The lot names are the axis' labels, not text beside points.
    assert_eq!(
        chart.x.categories,
        [
            "C2-4417", "C2-4418", "C2-4421", "C2-4425", "C2-4429", "C2-4432"
        ]
    );
    // Each lot median's marker tells the verdict by shape as well as colour, and its key in
    // words.
    let medians: Vec<(Shape, &str)> = chart
        .marks
        .iter()
        .filter_map(|m| match m {
            Mark::Symbol {
                large: true,
                shape,
                key,
                ..
            } => Some((*shape, key.as_str())),
            _ => None,
        })
        .collect();
    assert_eq!(
        medians,
        [
            (Shape::Circle, "lot median, pass"),
            (Shape::Circle, "lot median, pass"),
            (Shape::Cross, "lot median, fail"),
            (Shape::Triangle, "lot median, marginal"),
            (Shape::Circle, "lot median, pass"),
            (Shape::Circle, "lot median, pass"),
        ]
    );
    // One small marker per wafer mean, one box per lot, no text on the plot.
    let count = |f: fn(&Mark) -> bool| chart.marks.iter().filter(|m| f(m)).count();
    assert_eq!(
        count(|m| matches!(m, Mark::Symbol { large: false, .. })),
        55
    );
    assert_eq!(count(|m| matches!(m, Mark::Span { .. })), 6);
    assert_eq!(count(|m| matches!(m, Mark::Point { .. })), 0);
    // And in words, one line per lot.
    let lines = distribution_lines(&report, spec.as_ref(), None);
    assert_eq!(lines.len(), 6);
    for (line, start) in lines.iter().zip([
        "C2-4417: pass;",
        "C2-4418: pass;",
        "C2-4421: fail;",
        "C2-4425: marginal;",
        "C2-4429: pass;",
        "C2-4432: pass;",
    ]) {
        assert!(line.starts_with(start), "{line}");
        assert!(line.contains("middle half of the wafer means"), "{line}");
    }
    // Every site of C2-4421 wafer 11 lies below 8 ohm cm.
    let map = wafer_map(
        &work.sites,
        "C2-4421",
        "11",
        spec.as_ref(),
        MapQuantity::Resistivity,
        None,
    )
    .unwrap()
    .unwrap();
    assert!(!map.sites.is_empty());
    assert!(map.sites.iter().all(|s| s.side == Side::Low));
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
    assert_eq!(summary.lines().count(), 1 + 6 + 55);
    let rows = work.rows_csv(spec.as_ref());
    assert_eq!(rows.lines().count(), 1 + 1039);
    let chart = distribution_chart(&report, spec.as_ref(), None).unwrap();
    assert_eq!(
        chart
            .series
            .iter()
            .filter(|s| s.name.starts_with("spec"))
            .count(),
        2
    );
    // The chart's CSV names each lot rather than its place on the chart.
    let csv = crate::chart::to_csv(&chart);
    assert!(csv.contains("\nC2-4417 site range,C2-4417,"), "{csv}");
    assert!(distribution_chart(&report, spec.as_ref(), Some("C2-4421")).is_some());
    let map = wafer_map(
        &work.sites,
        "C2-4417",
        "01",
        spec.as_ref(),
        MapQuantity::Resistivity,
        None,
    )
    .unwrap()
    .unwrap();
    assert_eq!(map.sites.len(), 13);
    assert_eq!(crate::wafer_map::to_csv(&map).lines().count(), 1 + 13);
    assert_eq!(spec_from_inputs("density", "", "").unwrap(), None);
    assert!(spec_from_inputs("resistivity", "12", "8").is_err());
}
