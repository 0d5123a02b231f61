//! Invariants of the lot-file reader (`bandgauge_core::lots`), read whole and in chunks.
//!
//! Input layout: byte 0 chooses the options (bits 0-1: default dopant none, B, P or
//! "arsenic"; bits 2-3: no spec window, 8:12 ohm cm, 1e14:1e15 cm^-3 or :5 ohm cm; bit 4:
//! read the file twice into one book), byte 1 gives how many chunk sizes follow (0 to 7),
//! then the chunk sizes (a 0 counts as 1), then the file's bytes. With no sizes the file is
//! fed one byte at a time, as the worst split the browser could make.
//!
//! Checked:
//! - nothing panics;
//! - the whole text, the chunked bytes and `read_str` give the same outcomes, counts, notes,
//!   errors and report: results do not depend on where the text is split;
//! - every data line after the header gets exactly one outcome, with its own line number,
//!   in file order; blank, comment and setting lines get none;
//! - `read == converted + rejected` for the reader, the book and the report;
//! - accepted rows and every figure of the report are finite (no NaN, no infinity);
//! - error, rejection and note texts are non-empty and name their line.

use super::finite::non_finite_tokens;
use bandgauge_core::lots::{
    LotBook, LotFileError, LotReader, LotReport, Measurement, ReadOptions, RowCounts, RowOutcome,
    Site, SpecQuantity, SpecWindow, read_str,
};
use bandgauge_core::probe::ProbeGeometry;

/// Checks one input; panics with a message naming the broken invariant.
pub fn check(data: &[u8]) {
    let Some((&control, rest)) = data.split_first() else {
        return;
    };
    let (count, rest) = rest.split_first().map_or((0, rest), |(n, r)| (*n % 8, r));
    let count = usize::from(count).min(rest.len());
    let sizes: Vec<usize> = rest[..count]
        .iter()
        .map(|&b| usize::from(b).max(1))
        .collect();
    let file = &rest[count..];
    let options = ReadOptions {
        default_dopant: match control & 3 {
            0 => None,
            1 => Some("B".to_owned()),
            2 => Some("P".to_owned()),
            _ => Some("arsenic".to_owned()),
        },
    };
    let spec = match (control >> 2) & 3 {
        0 => None,
        1 => Some(SpecWindow::parse(SpecQuantity::Resistivity, "8:12")),
        2 => Some(SpecWindow::parse(SpecQuantity::Density, "1e14:1e15")),
        _ => Some(SpecWindow::parse(SpecQuantity::Resistivity, ":5")),
    }
    .map(|w| w.expect("the fixed spec windows are valid"));
    let passes = if control & 0x10 != 0 { 2 } else { 1 };

    let whole = read(file, &options, spec.as_ref(), passes, &[file.len().max(1)]);
    let one_byte = [1];
    let chunked = read(
        file,
        &options,
        spec.as_ref(),
        passes,
        if sizes.is_empty() { &one_byte } else { &sizes },
    );
    assert_eq!(
        whole, chunked,
        "results differ between the whole text and chunks of {sizes:?} bytes"
    );
    if let Ok(text) = std::str::from_utf8(file) {
        let mut book = LotBook::new();
        let mut outcomes = Vec::new();
        let mut result = Ok(RowCounts::default());
        for _ in 0..passes {
            result = read_str(text, &options, &mut book, &mut |o| {
                outcomes.push(describe(&o))
            });
            if result.is_err() {
                break;
            }
        }
        assert_eq!(
            (&whole.outcomes, &whole.result),
            (&outcomes, &result),
            "read_str differs from LotReader::feed"
        );
    }
    check_one_pass(file, &whole);
}

/// Everything one way of reading produced, comparable between ways.
#[derive(Debug, PartialEq)]
struct Reading {
    /// Every row's outcome, as text, over all passes.
    outcomes: Vec<String>,
    /// Line numbers of the first pass's outcomes (converted or not).
    first_pass_lines: Vec<(u64, bool)>,
    result: Result<RowCounts, LotFileError>,
    notes: Vec<String>,
    lines: u64,
    book_counts: RowCounts,
    report: String,
}

fn read(
    file: &[u8],
    options: &ReadOptions,
    spec: Option<&SpecWindow>,
    passes: usize,
    sizes: &[usize],
) -> Reading {
    let mut book = LotBook::new();
    let mut outcomes = Vec::new();
    let mut first_pass_lines = Vec::new();
    let mut result = Ok(RowCounts::default());
    let mut notes = Vec::new();
    let mut lines = 0;
    let mut total = RowCounts::default();
    for pass in 0..passes {
        let mut reader = LotReader::new(options.clone());
        let mut on_row = |outcome: RowOutcome<'_, '_>| {
            check_outcome(&outcome);
            if pass == 0 {
                first_pass_lines.push(match outcome {
                    RowOutcome::Converted(site) => (site.line, true),
                    RowOutcome::Rejected(rejection) => (rejection.line, false),
                });
            }
            outcomes.push(describe(&outcome));
        };
        let mut offset = 0;
        let mut fed = Ok(());
        for &size in sizes.iter().cycle() {
            if offset >= file.len() {
                break;
            }
            let end = (offset + size).min(file.len());
            fed = reader.feed(&file[offset..end], &mut book, &mut on_row);
            if fed.is_err() {
                break;
            }
            offset = end;
        }
        result = fed.and_then(|()| reader.finish(&mut book, &mut on_row));
        notes.extend(reader.notes().iter().cloned());
        lines = reader.lines();
        match &result {
            Ok(counts) => {
                assert_eq!(*counts, reader.counts(), "finish() and counts() differ");
                total.add(*counts);
            }
            Err(_) => break,
        }
    }
    if result.is_ok() {
        assert_eq!(
            book.counts(),
            total,
            "the book's counts differ from the files'"
        );
    }
    let report = book.report(spec);
    check_report(&report, book.counts());
    Reading {
        outcomes,
        first_pass_lines,
        result,
        notes,
        lines,
        book_counts: book.counts(),
        report: format!("{report:?}"),
    }
}

fn describe(outcome: &RowOutcome<'_, '_>) -> String {
    match outcome {
        RowOutcome::Converted(site) => format!("{site:?}"),
        RowOutcome::Rejected(rejection) => format!("{rejection:?}"),
    }
}

fn check_outcome(outcome: &RowOutcome<'_, '_>) {
    match outcome {
        RowOutcome::Converted(site) => check_site(site),
        RowOutcome::Rejected(rejection) => {
            assert!(
                rejection.line >= 1,
                "rejection without a line: {rejection:?}"
            );
            assert!(
                !rejection.reason.trim().is_empty(),
                "rejection without a reason: {rejection:?}"
            );
            let shown = rejection.to_string();
            assert!(
                shown.starts_with(&format!("line {}: ", rejection.line)),
                "rejection does not name its line: {shown:?}"
            );
        }
    }
}

fn check_site(site: &Site<'_>) {
    let positive = |name: &str, v: f64| {
        assert!(
            v.is_finite() && v > 0.0,
            "line {}: {name} = {v} in an accepted row",
            site.line
        );
    };
    positive("resistivity_ohm_cm", site.resistivity_ohm_cm);
    positive("density_cm3", site.density_cm3);
    assert!(site.line >= 1, "accepted row without a line: {site:?}");
    assert!(
        !site.lot.is_empty() && !site.wafer.is_empty(),
        "accepted row without lot or wafer: {site:?}"
    );
    assert_eq!(
        site.x_mm.is_some(),
        site.y_mm.is_some(),
        "line {}: one coordinate without the other",
        site.line
    );
    for (name, v) in [("x_mm", site.x_mm), ("y_mm", site.y_mm)] {
        if let Some(v) = v {
            assert!(v.is_finite(), "line {}: {name} = {v}", site.line);
        }
    }
    if let Some(u) = site.uncertainty {
        assert!(
            u.is_finite() && (0.0..1.0).contains(&u),
            "line {}: uncertainty {u}",
            site.line
        );
    }
    match site.measurement {
        Measurement::Resistivity => {}
        Measurement::SheetResistance {
            sheet_resistance_ohm_sq,
            thickness_cm,
        } => {
            positive("sheet_resistance_ohm_sq", sheet_resistance_ohm_sq);
            positive("thickness_cm", thickness_cm);
        }
        Measurement::Probe {
            volts,
            amps,
            spacing_cm,
            geometry,
            thickness_cm,
            sheet_resistance_ohm_sq,
        } => {
            positive("volts", volts);
            positive("amps", amps);
            positive("spacing_cm", spacing_cm);
            // A thin layer converts only with its thickness; a sheet resistance comes with a
            // thin layer or a thickness, and only then.
            assert!(
                geometry == ProbeGeometry::Bulk || thickness_cm.is_some(),
                "line {}: a thin-layer probe row converted without a thickness",
                site.line
            );
            assert_eq!(
                sheet_resistance_ohm_sq.is_some(),
                geometry == ProbeGeometry::ThinLayer || thickness_cm.is_some(),
                "line {}: sheet resistance present or absent against the geometry",
                site.line
            );
            thickness_cm
                .into_iter()
                .for_each(|t| positive("thickness_cm", t));
            sheet_resistance_ohm_sq
                .into_iter()
                .for_each(|r| positive("sheet_resistance_ohm_sq", r));
        }
        Measurement::VanDerPauw {
            r_a_ohm,
            r_b_ohm,
            thickness_cm,
            sheet_resistance_ohm_sq,
        } => {
            positive("r_a_ohm", r_a_ohm);
            positive("r_b_ohm", r_b_ohm);
            positive("thickness_cm", thickness_cm);
            positive("sheet_resistance_ohm_sq", sheet_resistance_ohm_sq);
        }
    }
}

fn check_report(report: &LotReport, counts: RowCounts) {
    assert_eq!(
        report.counts, counts,
        "the report's counts differ from the book's"
    );
    assert_eq!(
        counts.read,
        counts.converted + counts.rejected,
        "counts do not add up: {counts:?}"
    );
    let sites: u64 = report.lots.iter().map(|l| l.sites).sum();
    assert_eq!(sites, counts.converted, "lot site counts do not add up");
    for lot in &report.lots {
        let wafer_sites: u64 = lot.wafer_results.iter().map(|w| w.sites).sum();
        assert_eq!(
            wafer_sites, lot.sites,
            "lot {}: wafer sites do not add up",
            lot.lot
        );
        assert_eq!(
            lot.wafers,
            lot.wafer_results.len(),
            "lot {}: wafer count",
            lot.lot
        );
    }
    let broken = non_finite_tokens(report);
    assert!(
        broken.is_empty(),
        "non-finite figures in the report: {broken:?}"
    );
    for note in &report.notes {
        assert!(!note.trim().is_empty(), "empty report note");
    }
}

/// The line-level bookkeeping of the first pass, against an independent split of the file.
fn check_one_pass(file: &[u8], reading: &Reading) {
    let mut lines: Vec<&[u8]> = file.split(|&b| b == b'\n').collect();
    if lines.last().is_some_and(|l| l.is_empty()) {
        lines.pop();
    }
    let total = lines.len() as u64;
    for note in &reading.notes {
        assert!(!note.trim().is_empty(), "empty note");
    }
    let header = match &reading.result {
        Err(error) => {
            let shown = error.to_string();
            assert!(!shown.trim().is_empty(), "empty error for {error:?}");
            if let Some(line) = error_line(error) {
                assert!(
                    (1..=total.max(1)).contains(&line),
                    "error names line {line} of {total}: {shown}"
                );
                assert!(shown.starts_with(&format!("line {line}: ")), "{shown:?}");
            }
            let too_long = matches!(error, LotFileError::LineTooLong { .. });
            assert!(
                too_long || reading.first_pass_lines.is_empty(),
                "rows were read before the error {error:?}"
            );
            return;
        }
        Ok(counts) => {
            let converted = reading.first_pass_lines.iter().filter(|l| l.1).count() as u64;
            assert_eq!(
                counts.read,
                reading.first_pass_lines.len() as u64,
                "rows read"
            );
            assert_eq!(counts.converted, converted, "rows converted");
            assert_eq!(reading.lines, total, "lines consumed");
            // The header is the first line that is text, not blank and not a comment.
            lines
                .iter()
                .enumerate()
                .position(|(i, l)| {
                    let text = std::str::from_utf8(strip(l, i == 0)).unwrap_or("#");
                    let t = text.trim();
                    !t.is_empty() && !t.starts_with('#')
                })
                .expect("a file read without error has a header") as u64
                + 1
        }
    };
    let mut outcomes = reading.first_pass_lines.iter().map(|l| l.0).peekable();
    for (index, raw) in lines.iter().enumerate() {
        let number = index as u64 + 1;
        let has_outcome = outcomes.next_if_eq(&number).is_some();
        if number <= header {
            assert!(
                !has_outcome,
                "line {number} (the header or before) has a row outcome"
            );
            continue;
        }
        let must = match std::str::from_utf8(strip(raw, index == 0)) {
            Err(_) => Some(true),
            Ok(text) => {
                let t = text.trim();
                if t.is_empty() || t.starts_with('#') {
                    Some(false)
                } else if t.chars().all(|c| c.is_whitespace() || ",;\"".contains(c)) {
                    None // only delimiters and quotes: an empty row, or a malformed one
                } else {
                    Some(true)
                }
            }
        };
        if let Some(must) = must {
            assert_eq!(
                has_outcome,
                must,
                "line {number} {:?}: row outcome expected: {must}",
                String::from_utf8_lossy(raw)
            );
        }
    }
    assert!(
        outcomes.next().is_none(),
        "row outcomes out of order or beyond the last line: {:?}",
        reading.first_pass_lines
    );
}

fn strip(raw: &[u8], first: bool) -> &[u8] {
    let raw = if first {
        raw.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(raw)
    } else {
        raw
    };
    raw.strip_suffix(b"\r").unwrap_or(raw)
}

fn error_line(error: &LotFileError) -> Option<u64> {
    match error {
        LotFileError::NotAHeader { line, .. }
        | LotFileError::Header { line, .. }
        | LotFileError::Setting { line, .. }
        | LotFileError::NotText { line }
        | LotFileError::LineTooLong { line } => Some(*line),
        _ => None,
    }
}
