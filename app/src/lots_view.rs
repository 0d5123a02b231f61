//! The "Wafer lots" view: lot files picked or dropped (or the demo lots), read in chunks with
//! progress, a summary per lot and wafer with verdicts against a spec window, the lot
//! distribution chart with the window drawn, a wafer map, rejected rows with their lines, and
//! CSV exports. All numbers come from `bandgauge_core::lots`.
//!
//! [`LotsWork`] is the plain state (tested natively); the components below only display it.
//! The file reading (Blob slices through a `FileReader`) sits at the end of this module.

use std::cell::RefCell;
use std::fmt::Write as _;
use std::rc::Rc;

use bandgauge_core::lots::{
    LotBook, LotFileError, LotReader, LotReport, ReadOptions, RowCounts, RowOutcome, SpecQuantity,
    SpecWindow, Verdict,
};
use leptos::prelude::*;
use wasm_bindgen::{JsCast, JsValue, closure::Closure};

use crate::Bench;
use crate::browser;
use crate::chart::{Axis, ChartSpec, Color, Corner, Mark, Series, palette};
use crate::format;
use crate::widgets::{Caution, ChartPanel};

/// Bytes read per step: the page handles events between steps, so it never freezes.
pub const CHUNK_BYTES: usize = 256 * 1024;
/// Rejected rows listed on the page (all are counted).
pub const MAX_LISTED_REJECTIONS: usize = 1000;
/// Converted sites kept for the wafer map and the row export (all are summarised).
pub const MAX_KEPT_SITES: usize = 500_000;

/// Bytes of lot files kept for a sign-off record; larger jobs are summarised as usual, but a
/// record of them is refused (the record would be as large as the files, twice in memory).
pub const MAX_RECORDED_BYTES: usize = 64 * 1024 * 1024;

/// The demo lots of `demo-wafers/`, built into the page.
pub const DEMO_FILES: [(&str, &str); 4] = [
    ("c2-4417.csv", include_str!("../../demo-wafers/c2-4417.csv")),
    ("c2-4418.csv", include_str!("../../demo-wafers/c2-4418.csv")),
    ("c2-4421.tsv", include_str!("../../demo-wafers/c2-4421.tsv")),
    (
        "c2-4425-with-bad-rows.csv",
        include_str!("../../demo-wafers/c2-4425-with-bad-rows.csv"),
    ),
];
/// The spec window of the demo scenario (demo-wafers/README.md), ohm cm.
pub const DEMO_SPEC: (&str, &str) = ("8", "12");

/// One file read (or being read).
#[derive(Debug, Clone, PartialEq)]
pub struct FileStatus {
    /// File name.
    pub name: String,
    /// Size, bytes.
    pub bytes_total: u64,
    /// Bytes read so far.
    pub bytes_read: u64,
    /// Rows counted so far.
    pub counts: RowCounts,
    /// Why the file could not be read, if it could not.
    pub error: Option<String>,
    /// Remarks on the file (ignored columns, unknown settings).
    pub notes: Vec<String>,
}

/// A rejected row, for the list.
#[derive(Debug, Clone, PartialEq)]
pub struct RejectedRow {
    /// File name.
    pub file: String,
    /// Line number.
    pub line: u64,
    /// Column at fault ("" when none).
    pub column: String,
    /// Why.
    pub reason: String,
}

/// A converted site kept for the map and the export.
#[derive(Debug, Clone, PartialEq)]
pub struct SitePoint {
    /// File name index into [`LotsWork::files`].
    pub file: usize,
    /// Line number.
    pub line: u64,
    /// Lot (shared by the sites of a lot read in a row: one allocation per run, not per site).
    pub lot: Rc<str>,
    /// Wafer (shared likewise).
    pub wafer: Rc<str>,
    /// Site.
    pub site: String,
    /// x, mm.
    pub x_mm: Option<f64>,
    /// y, mm.
    pub y_mm: Option<f64>,
    /// Dopant symbol.
    pub dopant: &'static str,
    /// Resistivity, ohm cm.
    pub resistivity_ohm_cm: f64,
    /// Density, cm^-3.
    pub density_cm3: f64,
}

/// Everything read so far: the core's lot book, the file in progress, and what the page lists.
#[derive(Debug, Default)]
pub struct LotsWork {
    book: LotBook,
    reader: Option<LotReader>,
    options: ReadOptions,
    /// Every file started, in order.
    pub files: Vec<FileStatus>,
    /// Rejected rows (the first [`MAX_LISTED_REJECTIONS`]).
    pub rejected: Vec<RejectedRow>,
    /// Converted sites (the first [`MAX_KEPT_SITES`]).
    pub sites: Vec<SitePoint>,
    /// The bytes of every file as read, in `files` order, so a sign-off record can carry
    /// them and reproduce the comparison (`crate::record`).
    texts: Vec<Vec<u8>>,
    /// Set when the files outgrew [`MAX_RECORDED_BYTES`] and their bytes were let go.
    texts_dropped: bool,
}

impl LotsWork {
    /// Nothing read; rows without a dopant get `default_dopant`.
    pub fn new(default_dopant: Option<String>) -> LotsWork {
        LotsWork {
            options: ReadOptions { default_dopant },
            ..LotsWork::default()
        }
    }

    /// Rows counted over every file.
    pub fn counts(&self) -> RowCounts {
        self.book.counts()
    }

    /// Starts a file of `bytes_total` bytes.
    pub fn begin_file(&mut self, name: &str, bytes_total: u64) {
        self.files.push(FileStatus {
            name: name.to_owned(),
            bytes_total,
            bytes_read: 0,
            counts: RowCounts::default(),
            error: None,
            notes: Vec::new(),
        });
        if !self.texts_dropped {
            self.texts.push(Vec::new());
        }
        self.reader = Some(LotReader::new(self.options.clone()));
    }

    /// Reads the next chunk of the current file.
    pub fn feed(&mut self, chunk: &[u8]) {
        let Some(mut reader) = self.reader.take() else {
            return;
        };
        let kept: usize = self.texts.iter().map(Vec::len).sum();
        if kept + chunk.len() > MAX_RECORDED_BYTES {
            self.texts_dropped = true;
            self.texts = Vec::new();
        } else if let Some(text) = self.texts.last_mut() {
            text.extend_from_slice(chunk);
        }
        let result = reader.feed(
            chunk,
            &mut self.book,
            &mut collect(
                &mut self.rejected,
                &mut self.sites,
                self.files.len() - 1,
                &self.files,
            ),
        );
        self.after_step(&reader, chunk.len() as u64, result);
        if self.files.last().is_some_and(|f| f.error.is_none()) {
            self.reader = Some(reader);
        }
    }

    /// Ends the current file.
    pub fn end_file(&mut self) {
        let Some(mut reader) = self.reader.take() else {
            return;
        };
        let result = reader
            .finish(
                &mut self.book,
                &mut collect(
                    &mut self.rejected,
                    &mut self.sites,
                    self.files.len() - 1,
                    &self.files,
                ),
            )
            .map(|_| ());
        self.after_step(&reader, 0, result);
    }

    fn after_step(&mut self, reader: &LotReader, bytes: u64, result: Result<(), LotFileError>) {
        if let Some(status) = self.files.last_mut() {
            status.bytes_read += bytes;
            status.counts = reader.counts();
            status.notes = reader.notes().to_vec();
            if let Err(error) = result {
                status.error = Some(error.to_string());
            }
        }
    }

    /// Reads a whole text as one file.
    pub fn read_text(&mut self, name: &str, text: &str) {
        self.begin_file(name, text.len() as u64);
        for chunk in text.as_bytes().chunks(CHUNK_BYTES) {
            self.feed(chunk);
        }
        self.end_file();
    }

    /// The dopant given to rows without one when these files were read.
    pub fn default_dopant(&self) -> Option<&str> {
        self.options.default_dopant.as_deref()
    }

    /// Every file's name and bytes as read so far, in reading order; `None` when the files
    /// outgrew [`MAX_RECORDED_BYTES`] and were not kept.
    pub fn file_texts(&self) -> Option<Vec<(&str, &[u8])>> {
        (!self.texts_dropped).then(|| {
            self.files
                .iter()
                .map(|f| f.name.as_str())
                .zip(self.texts.iter().map(Vec::as_slice))
                .collect()
        })
    }

    /// The summary judged against `spec`.
    pub fn report(&self, spec: Option<&SpecWindow>) -> LotReport {
        self.book.report(spec)
    }

    /// The kept sites as CSV.
    pub fn rows_csv(&self, spec: Option<&SpecWindow>) -> String {
        let mut out = String::from(
            "file,line,lot,wafer,site,x_mm,y_mm,dopant,resistivity_ohm_cm,density_cm3,in_window\n",
        );
        for s in &self.sites {
            let optional = |v: Option<f64>| v.map(format::csv_number).unwrap_or_default();
            let in_window = spec.map_or("", |w| {
                if w.contains(spec_value(w, s.resistivity_ohm_cm, s.density_cm3)) {
                    "yes"
                } else {
                    "no"
                }
            });
            let _ = writeln!(
                out,
                "{},{},{},{},{},{},{},{},{},{},{}",
                csv_field(self.files.get(s.file).map_or("", |f| f.name.as_str())),
                s.line,
                csv_field(&s.lot),
                csv_field(&s.wafer),
                csv_field(&s.site),
                optional(s.x_mm),
                optional(s.y_mm),
                s.dopant,
                format::csv_number(s.resistivity_ohm_cm),
                format::csv_number(s.density_cm3),
                in_window
            );
        }
        out
    }
}

/// The callback that records rejected rows and kept sites for file `file`.
fn collect<'a>(
    rejected: &'a mut Vec<RejectedRow>,
    sites: &'a mut Vec<SitePoint>,
    file: usize,
    files: &'a [FileStatus],
) -> impl FnMut(RowOutcome<'_, '_>) + 'a {
    move |outcome| match outcome {
        RowOutcome::Converted(site) => {
            if sites.len() < MAX_KEPT_SITES {
                // Files list a lot's and a wafer's sites together: share the previous site's
                // text when it is the same.
                let previous = sites.last();
                let lot = match previous {
                    Some(p) if *p.lot == *site.lot => Rc::clone(&p.lot),
                    _ => Rc::from(site.lot),
                };
                let wafer = match previous {
                    Some(p) if *p.wafer == *site.wafer => Rc::clone(&p.wafer),
                    _ => Rc::from(site.wafer),
                };
                sites.push(SitePoint {
                    file,
                    line: site.line,
                    lot,
                    wafer,
                    site: site.site.to_owned(),
                    x_mm: site.x_mm,
                    y_mm: site.y_mm,
                    dopant: site.dopant,
                    resistivity_ohm_cm: site.resistivity_ohm_cm,
                    density_cm3: site.density_cm3,
                });
            }
        }
        RowOutcome::Rejected(rejection) => {
            if rejected.len() < MAX_LISTED_REJECTIONS {
                rejected.push(RejectedRow {
                    file: files.get(file).map_or_else(String::new, |f| f.name.clone()),
                    line: rejection.line,
                    column: rejection
                        .column
                        .map(|c| c.name().to_owned())
                        .unwrap_or_default(),
                    reason: rejection.reason.clone(),
                });
            }
        }
    }
}

fn spec_value(window: &SpecWindow, resistivity_ohm_cm: f64, density_cm3: f64) -> f64 {
    match window.quantity() {
        SpecQuantity::Density => density_cm3,
        _ => resistivity_ohm_cm,
    }
}

fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

/// The summary per lot and per wafer as CSV.
pub fn summary_csv(report: &LotReport) -> String {
    let mut out = String::from(
        "lot,wafer,dopant,sites,resistivity_mean_ohm_cm,resistivity_median_ohm_cm,\
         resistivity_std_ohm_cm,resistivity_min_ohm_cm,resistivity_max_ohm_cm,\
         nonuniformity_percent,density_mean_cm3,density_median_cm3,density_std_cm3,\
         density_min_cm3,density_max_cm3,verdict,margin,cpk\n",
    );
    let n = |v: f64| format::csv_number(v);
    let o = |v: Option<f64>| v.map(format::csv_number).unwrap_or_default();
    for lot in &report.lots {
        let (r, d) = (&lot.resistivity_ohm_cm, &lot.density_cm3);
        let _ = writeln!(
            out,
            "{},,{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}",
            csv_field(&lot.lot),
            lot.dopant,
            lot.sites,
            n(r.mean),
            n(r.median),
            o(r.std),
            n(r.min),
            n(r.max),
            o(r.nonuniformity_percent),
            n(d.mean),
            n(d.median),
            o(d.std),
            n(d.min),
            n(d.max),
            lot.verdict.map(|v| v.as_str()).unwrap_or(""),
            o(lot.margin),
            o(lot.cpk)
        );
        for w in &lot.wafer_results {
            let (r, d) = (&w.resistivity_ohm_cm, &w.density_cm3);
            let _ = writeln!(
                out,
                "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},",
                csv_field(&lot.lot),
                csv_field(&w.wafer),
                lot.dopant,
                w.sites,
                n(r.mean),
                n(r.median),
                o(r.std),
                n(r.min),
                n(r.max),
                o(r.nonuniformity_percent),
                n(d.mean),
                n(d.median),
                o(d.std),
                n(d.min),
                n(d.max),
                w.judgement.map(|j| j.verdict.as_str()).unwrap_or(""),
                o(w.judgement.map(|j| j.margin))
            );
        }
    }
    out
}

/// The lot-difference lines the view lists (only those involving `shown` when a lot is
/// picked; the all-lots test only when none is): Welch per pair, Kruskal-Wallis for all.
pub fn difference_lines(r: &LotReport, shown: Option<&str>) -> Vec<String> {
    let mut lines: Vec<String> = r
        .differences
        .iter()
        .filter(|d| shown.is_none_or(|f| f == d.lot_a || f == d.lot_b))
        .map(|d| {
            format!(
                "{} vs {}: {:+.1} % dopant density (95 % CI {:+.1} to {:+.1} %), \
                 Welch p = {}: {}",
                d.lot_b,
                d.lot_a,
                d.percent,
                d.percent_ci95[0],
                d.percent_ci95[1],
                format::auto(d.test.p_value),
                if d.significant {
                    "significant"
                } else {
                    "not significant"
                }
            )
        })
        .collect();
    if let (Some(k), None) = (&r.kruskal_wallis, shown) {
        lines.push(format!(
            "All {} lots together: Kruskal-Wallis H = {}, p = {}: {}",
            k.lots.len(),
            format::auto(k.test.h),
            format::auto(k.test.p_value),
            if k.significant {
                "the lots differ"
            } else {
                "no significant difference"
            }
        ));
    }
    lines
}

/// `(quantity, model, source)` of the conversion and the statistics behind a lot report:
/// what the caution lists and the sign-off report prints.
pub fn models_used(r: &LotReport) -> Vec<(String, String, String)> {
    vec![
        (
            "resistivity to dopant density".to_string(),
            r.model.clone(),
            r.model_reference.to_string(),
        ),
        (
            "lot statistics".to_string(),
            "Welch's t-test on ln density, Kruskal-Wallis, Cpk".to_string(),
            "Welch 1947; Kruskal & Wallis 1952; Cpk common practice".to_string(),
        ),
    ]
}

/// Verdict colours: told apart by hue and by the word printed beside them.
fn verdict_color(verdict: Option<Verdict>) -> Color {
    match verdict {
        Some(Verdict::Pass) => Color(0x1b, 0x6e, 0x3a),
        Some(Verdict::Marginal) => Color(0x9a, 0x5b, 0x00),
        Some(Verdict::Fail) => Color(0xb0, 0x1e, 0x2d),
        _ => Color(0x44, 0x44, 0x44),
    }
}

/// Per lot (filtered by `lot_filter` when given): the min-max range of site values as a line,
/// every wafer mean as a point, and the spec window as dashed lines.
pub fn distribution_chart(
    report: &LotReport,
    spec: Option<&SpecWindow>,
    lot_filter: Option<&str>,
) -> Option<ChartSpec> {
    let quantity = spec.map_or(SpecQuantity::Resistivity, SpecWindow::quantity);
    let lots: Vec<_> = report
        .lots
        .iter()
        .filter(|l| lot_filter.is_none_or(|f| f == l.lot))
        .collect();
    if lots.is_empty() {
        return None;
    }
    let pick = |r: &bandgauge_core::lots::Summary, d: &bandgauge_core::lots::Summary| match quantity
    {
        SpecQuantity::Density => (d.min, d.max, d.median),
        _ => (r.min, r.max, r.median),
    };
    let mut series = Vec::new();
    let mut marks = Vec::new();
    for (i, lot) in lots.iter().enumerate() {
        let x = (i + 1) as f64;
        let (min, max, median) = pick(&lot.resistivity_ohm_cm, &lot.density_cm3);
        // One neutral colour for every range: colour on this chart means a verdict.
        let mut range = Series::line(
            &format!("{} site range", lot.lot),
            vec![(x, min), (x, max)],
            palette::INTRINSIC,
        );
        range.in_legend = false;
        series.push(range);
        // The verdict is written beside the median, so it is not told by colour alone.
        let verdict = lot
            .verdict
            .map(|v| format!(" {}", v.as_str()))
            .unwrap_or_default();
        marks.push(Mark::Point {
            x,
            y: median,
            label: format!("{} {}{verdict}", lot.lot, format::auto(median)),
            color: verdict_color(lot.verdict),
        });
        // Wafer means to the left of the range, clear of the median's label on the right.
        for wafer in &lot.wafer_results {
            let mean = match quantity {
                SpecQuantity::Density => wafer.density_cm3.mean,
                _ => wafer.resistivity_ohm_cm.mean,
            };
            marks.push(Mark::Point {
                x: x - WAFER_MEAN_OFFSET,
                y: mean,
                label: String::new(),
                color: verdict_color(wafer.judgement.map(|j| j.verdict)),
            });
        }
    }
    // Room on the right for the last lot's label.
    let right = lots.len() as f64 + LABEL_ROOM;
    if let Some(window) = spec {
        for (name, limit) in [("MIN", window.min()), ("MAX", window.max())] {
            if let Some(v) = limit {
                let mut line = Series::line(
                    &format!("spec {name}"),
                    vec![(0.5, v), (right, v)],
                    SPEC_LINE_COLOR,
                )
                .dashed();
                line.end_label = Some(format!("{name} {}", format::auto(v)));
                line.in_legend = false;
                series.push(line);
            }
        }
    }
    let y_label = match quantity {
        SpecQuantity::Density => "dopant density, cm^-3",
        _ => "resistivity, ohm cm",
    };
    Some(ChartSpec {
        title: "Lots: site range (line), wafer means (left), lot median (labelled)".to_owned(),
        file_stem: "bandgauge-lots".to_owned(),
        x: categories_axis(right),
        y: Axis::linear(y_label),
        series,
        marks,
        legend: Corner::TopRight,
    })
}

/// How far left of its lot's range the wafer means sit, in lot positions.
const WAFER_MEAN_OFFSET: f64 = 0.15;
/// Room right of the last lot, in lot positions, for its label.
const LABEL_ROOM: f64 = 1.0;
/// The spec limits' colour: a dark violet, apart from the three verdict colours.
const SPEC_LINE_COLOR: Color = Color(0x5b, 0x2a, 0x86);

/// The lots' axis: positions 1, 2, ... carry no meaning as numbers (ticks such as 1.5 would
/// mislead), so it is drawn without ticks; each lot is named beside its median instead.
fn categories_axis(right: f64) -> Axis {
    let mut axis = Axis::linear("lot position").with_range(0.5, right);
    axis.hidden = true;
    axis
}

/// The sites of one wafer at their x/y positions, each labelled with its value and coloured by
/// whether it lies in the window. `None` when the wafer has no positioned sites.
pub fn wafer_map(
    sites: &[SitePoint],
    lot: &str,
    wafer: &str,
    spec: Option<&SpecWindow>,
) -> Option<ChartSpec> {
    let quantity = spec.map_or(SpecQuantity::Resistivity, SpecWindow::quantity);
    let marks: Vec<Mark> = sites
        .iter()
        .filter(|s| *s.lot == *lot && *s.wafer == *wafer)
        .filter_map(|s| {
            let (x, y) = (s.x_mm?, s.y_mm?);
            let value = match quantity {
                SpecQuantity::Density => s.density_cm3,
                _ => s.resistivity_ohm_cm,
            };
            let side = spec.map(|w| site_side(w, value));
            let verdict = side.map(|s| {
                if s.is_empty() {
                    Verdict::Pass
                } else {
                    Verdict::Fail
                }
            });
            // A site outside the window says so in words, not only in colour.
            let label = match side {
                Some(s) if !s.is_empty() => format!("{} {s}", format::auto(value)),
                _ => format::auto(value),
            };
            Some(Mark::Point {
                x,
                y,
                label,
                color: verdict_color(verdict),
            })
        })
        .collect();
    if marks.is_empty() {
        return None;
    }
    let reach = sites
        .iter()
        .filter_map(|s| Some(s.x_mm?.abs().max(s.y_mm?.abs())))
        .fold(10.0f64, f64::max);
    // Labels sit above and right of their points: more room on those sides.
    Some(ChartSpec {
        title: format!("Wafer {wafer} of lot {lot}"),
        file_stem: format!("bandgauge-wafer-{lot}-{wafer}"),
        x: Axis::linear("x, mm").with_range(-1.15 * reach, 1.5 * reach),
        y: Axis::linear("y, mm").with_range(-1.15 * reach, 1.3 * reach),
        series: Vec::new(),
        marks,
        legend: Corner::TopRight,
    })
}

/// Where a site value lies against the window: "low", "high", or "" inside.
fn site_side(window: &SpecWindow, value: f64) -> &'static str {
    if window.contains(value) {
        ""
    } else if window.min().is_some_and(|m| value < m) {
        "low"
    } else {
        "high"
    }
}

/// The spec window from the page's inputs: `None` when both limits are empty.
pub fn spec_from_inputs(
    quantity: &str,
    min: &str,
    max: &str,
) -> Result<Option<SpecWindow>, String> {
    if min.trim().is_empty() && max.trim().is_empty() {
        return Ok(None);
    }
    let quantity = if quantity == "density" {
        SpecQuantity::Density
    } else {
        SpecQuantity::Resistivity
    };
    SpecWindow::parse(quantity, &format!("{}:{}", min.trim(), max.trim()))
        .map(Some)
        .map_err(|e| e.to_string())
}

/// The view's inputs as typed, kept with the work while another view is shown.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct LotsInputs {
    /// Dopant symbol for rows without one ("" for none).
    pub dopant: String,
    /// "resistivity" or "density".
    pub quantity: String,
    /// Lower limit as typed.
    pub spec_min: String,
    /// Upper limit as typed.
    pub spec_max: String,
    /// Lot shown ("" for all).
    pub lot_filter: String,
    /// Wafer on the map, as `lot|wafer` ("" for the first).
    pub map_wafer: String,
}

thread_local! {
    /// What the view held when another view was opened; taken back when it is shown again.
    static KEPT: RefCell<Option<(LotsWork, LotsInputs)>> = const { RefCell::new(None) };
    /// The shown view's handles, so the sign-off report can read what it shows and an opened
    /// record can put its lot files back ([`snapshot`], [`install`]).
    static LIVE: std::cell::Cell<Option<Live>> = const { std::cell::Cell::new(None) };
}

/// The handles of the shown view that [`snapshot`] reads and [`install`] sets.
#[derive(Clone, Copy)]
struct Live {
    handles: Handles,
    job_files: RwSignal<usize>,
    dopant: RwSignal<String>,
    quantity: RwSignal<String>,
    spec_min: RwSignal<String>,
    spec_max: RwSignal<String>,
    lot_filter: RwSignal<String>,
    map_wafer: RwSignal<String>,
}

/// What the lots view holds, for a sign-off record: the spec inputs as typed and the files as
/// read, with the dopant they were read with.
#[derive(Debug, Clone, PartialEq)]
pub struct LotsSnapshot {
    /// The dopant given to rows without one when the files were read ("" for none).
    pub read_dopant: String,
    /// The spec inputs as typed.
    pub inputs: LotsInputs,
    /// Every file's name and bytes, or `None` when they outgrew [`MAX_RECORDED_BYTES`].
    pub files: Option<Vec<(String, Vec<u8>)>>,
    /// Rows counted, as shown.
    pub counts: RowCounts,
    /// A file is being read.
    pub busy: bool,
    /// Why files could not be read, as shown (`name: reason`).
    pub file_errors: Vec<String>,
}

fn snapshot_of(work: &LotsWork, inputs: LotsInputs, busy: bool) -> LotsSnapshot {
    LotsSnapshot {
        read_dopant: work.default_dopant().unwrap_or_default().to_owned(),
        inputs,
        files: work.file_texts().map(|files| {
            files
                .into_iter()
                .map(|(name, bytes)| (name.to_owned(), bytes.to_vec()))
                .collect()
        }),
        counts: work.counts(),
        busy,
        file_errors: work
            .files
            .iter()
            .filter_map(|f| f.error.as_ref().map(|e| format!("{}: {e}", f.name)))
            .collect(),
    }
}

/// What the lots view holds now (shown or kept while another view is shown).
pub fn snapshot() -> LotsSnapshot {
    if let Some(live) = LIVE.with(std::cell::Cell::get) {
        let inputs = LotsInputs {
            dopant: live.dopant.get_untracked(),
            quantity: live.quantity.get_untracked(),
            spec_min: live.spec_min.get_untracked(),
            spec_max: live.spec_max.get_untracked(),
            lot_filter: live.lot_filter.get_untracked(),
            map_wafer: live.map_wafer.get_untracked(),
        };
        let busy = live.handles.busy.get_untracked();
        if let Some(s) = live
            .handles
            .work
            .try_with_value(|w| snapshot_of(w, inputs, busy))
        {
            return s;
        }
    }
    KEPT.with(|k| match &*k.borrow() {
        Some((work, inputs)) => snapshot_of(work, inputs.clone(), false),
        None => snapshot_of(&LotsWork::new(None), LotsInputs::default(), false),
    })
}

/// Whether lot files are being read now.
pub fn is_reading() -> bool {
    LIVE.with(std::cell::Cell::get)
        .is_some_and(|l| l.handles.busy.get_untracked())
}

/// Puts read files and spec inputs in the lots view (shown now or when next opened). Refused
/// while files are being read.
pub fn install(work: LotsWork, inputs: LotsInputs) -> Result<(), String> {
    let Some(live) = LIVE.with(std::cell::Cell::get) else {
        KEPT.with(|k| *k.borrow_mut() = Some((work, inputs)));
        return Ok(());
    };
    if live.handles.busy.get_untracked() {
        return Err("lot files are being read; wait until reading ends".to_owned());
    }
    let files = work.files.len();
    live.handles.work.set_value(work);
    live.dopant.set(inputs.dopant);
    live.quantity.set(inputs.quantity);
    live.spec_min.set(inputs.spec_min);
    live.spec_max.set(inputs.spec_max);
    live.lot_filter.set(inputs.lot_filter);
    live.map_wafer.set(inputs.map_wafer);
    live.job_files.set(files);
    live.handles.progress.update(|n| *n += 1);
    live.handles.finished.update(|n| *n += 1);
    Ok(())
}

impl LotsWork {
    /// Whether a file is being read (a reader is open).
    pub fn reading(&self) -> bool {
        self.reader.is_some()
    }

    /// Whether the current file could not be read (no use reading the rest of it).
    pub fn current_failed(&self) -> bool {
        self.files.last().is_some_and(|f| f.error.is_some())
    }

    /// Gives up the current file with `reason`.
    pub fn fail_file(&mut self, reason: &str) {
        self.reader = None;
        if let Some(status) = self.files.last_mut() {
            status.error = Some(reason.to_owned());
        }
    }

    /// Gives up a file left half read (the view was closed while reading), saying so.
    pub fn interrupt(&mut self) {
        if self.reading() {
            self.fail_file(
                "reading stopped when another view was opened; its rows so far are counted; \
                 pick the file again to read all of it",
            );
        }
    }

    /// Progress of a job of `total_files` files, 0 to 1: files done plus the current fraction.
    pub fn progress_fraction(&self, total_files: usize) -> f64 {
        if total_files == 0 {
            return 1.0;
        }
        let done = self.files.len().saturating_sub(1) as f64;
        let current = self.files.last().map_or(0.0, |f| {
            if f.bytes_total > 0 {
                (f.bytes_read as f64 / f.bytes_total as f64).min(1.0)
            } else {
                1.0
            }
        });
        ((done + current) / total_files as f64).clamp(0.0, 1.0)
    }

    /// The status line: what is being read and the counts so far.
    pub fn status_line(&self, total_files: usize, busy: bool) -> String {
        let c = self.counts();
        let counts = format!(
            "{} rows read, {} converted, {} rejected",
            c.read, c.converted, c.rejected
        );
        match self.files.last() {
            None => String::new(),
            Some(f) if busy => {
                let percent = if f.bytes_total > 0 {
                    100.0 * f.bytes_read as f64 / f.bytes_total as f64
                } else {
                    100.0
                };
                format!(
                    "Reading {} (file {} of {}, {percent:.0} %): {counts}",
                    f.name,
                    self.files.len(),
                    total_files.max(self.files.len())
                )
            }
            Some(_) => format!("{} file(s) read: {counts}", self.files.len()),
        }
    }
}

/// The view.
#[component]
pub fn LotsView(
    /// The shared handles (layout and timing for the charts).
    bench: Bench,
) -> impl IntoView {
    let (mut kept_work, kept_inputs) = KEPT
        .with(|k| k.borrow_mut().take())
        .unwrap_or_else(|| (LotsWork::new(None), LotsInputs::default()));
    kept_work.interrupt();
    let work = StoredValue::new_local(kept_work);
    // Bumped after every chunk, so progress redraws; the report follows `finished`.
    let progress = RwSignal::new(0u64);
    let finished = RwSignal::new(0u64);
    let busy = RwSignal::new(false);
    let job_files = RwSignal::new(0usize);
    let dragging = RwSignal::new(false);
    let dopant = RwSignal::new(kept_inputs.dopant);
    let quantity = RwSignal::new(if kept_inputs.quantity.is_empty() {
        "resistivity".to_owned()
    } else {
        kept_inputs.quantity
    });
    let spec_min = RwSignal::new(kept_inputs.spec_min);
    let spec_max = RwSignal::new(kept_inputs.spec_max);
    let lot_filter = RwSignal::new(kept_inputs.lot_filter);
    let map_wafer = RwSignal::new(kept_inputs.map_wafer);
    let export_error = RwSignal::new(None::<String>);
    let handles = Handles {
        work,
        progress,
        finished,
        busy,
    };

    LIVE.with(|l| {
        l.set(Some(Live {
            handles,
            job_files,
            dopant,
            quantity,
            spec_min,
            spec_max,
            lot_filter,
            map_wafer,
        }))
    });
    // Leaving the view keeps what was read and typed for when it is shown again.
    on_cleanup(move || {
        LIVE.with(|l| l.set(None));
        let inputs = LotsInputs {
            dopant: dopant.get_untracked(),
            quantity: quantity.get_untracked(),
            spec_min: spec_min.get_untracked(),
            spec_max: spec_max.get_untracked(),
            lot_filter: lot_filter.get_untracked(),
            map_wafer: map_wafer.get_untracked(),
        };
        if let Some(w) = work.try_update_value(std::mem::take) {
            KEPT.with(|k| *k.borrow_mut() = Some((w, inputs)));
        }
    });

    // Memos, so that typing in a limit re-judges without re-reading any file.
    let spec =
        Memo::new(move |_| spec_from_inputs(&quantity.get(), &spec_min.get(), &spec_max.get()));
    let report = Memo::new(move |_| {
        finished.track();
        let window = spec.get().ok().flatten();
        work.with_value(|w| w.report(window.as_ref()))
    });
    let filter = move || {
        let f = lot_filter.get();
        (!f.is_empty()).then_some(f)
    };
    let has_data = Memo::new(move |_| {
        progress.track();
        finished.track();
        work.with_value(|w| !w.files.is_empty())
    });
    let unit = move || {
        spec.with(|s| match s {
            Ok(Some(w)) if w.quantity() == SpecQuantity::Density => "cm^-3",
            _ => "ohm cm",
        })
    };

    let start = move |files: Vec<Source>| {
        if files.is_empty() || busy.get_untracked() {
            return;
        }
        let default = dopant.get_untracked();
        work.set_value(LotsWork::new((!default.is_empty()).then_some(default)));
        lot_filter.set(String::new());
        map_wafer.set(String::new());
        job_files.set(files.len());
        busy.set(true);
        read_sources(files, handles);
    };
    let load_demo = move |_| {
        if spec_min.get_untracked().is_empty() && spec_max.get_untracked().is_empty() {
            quantity.set("resistivity".to_owned());
            spec_min.set(DEMO_SPEC.0.to_owned());
            spec_max.set(DEMO_SPEC.1.to_owned());
        }
        start(
            DEMO_FILES
                .iter()
                .map(|(name, text)| Source::Text((*name).to_owned(), (*text).to_owned()))
                .collect(),
        );
    };
    let on_pick = move |ev: leptos::ev::Event| {
        let input = event_target::<web_sys::HtmlInputElement>(&ev);
        start(files_of(input.files()));
        input.set_value("");
    };
    let on_drop = move |ev: leptos::ev::DragEvent| {
        ev.prevent_default();
        dragging.set(false);
        start(files_of(ev.data_transfer().and_then(|d| d.files())));
    };
    let on_drag_over = move |ev: leptos::ev::DragEvent| {
        ev.prevent_default();
        dragging.set(true);
    };

    let status_line = move || {
        progress.track();
        finished.track();
        let (total, reading) = (job_files.get(), busy.get());
        work.with_value(|w| w.status_line(total, reading))
    };
    let progress_value = move || {
        progress.track();
        let total = job_files.get();
        work.with_value(|w| w.progress_fraction(total))
    };
    let messages = move || {
        finished.track();
        let mut out = work.with_value(|w| {
            w.files
                .iter()
                .filter_map(|f| f.error.as_ref().map(|e| format!("{}: {e}", f.name)))
                .chain(
                    w.files
                        .iter()
                        .flat_map(|f| f.notes.iter().map(move |n| format!("{}: {n}", f.name))),
                )
                .collect::<Vec<_>>()
        });
        out.extend(report.with(|r| r.notes.clone()));
        out
    };
    let lot_choices =
        move || report.with(|r| r.lots.iter().map(|l| l.lot.clone()).collect::<Vec<_>>());
    let chart = Signal::derive(move || {
        let window = spec.get().ok().flatten();
        report.with(|r| distribution_chart(r, window.as_ref(), filter().as_deref()))
    });
    let map_choices = move || {
        report.with(|r| {
            r.lots
                .iter()
                .filter(|l| filter().is_none_or(|f| f == l.lot))
                .flat_map(|l| {
                    l.wafer_results
                        .iter()
                        .filter(|w| w.sites_with_position > 0)
                        .map(move |w| format!("{}|{}", l.lot, w.wafer))
                })
                .collect::<Vec<_>>()
        })
    };
    // The wafer chosen, or the first one shown when the choice is gone (other lot, new files).
    let map_choice = Memo::new(move |_| {
        let choices = map_choices();
        let chosen = map_wafer.get();
        if choices.contains(&chosen) {
            Some(chosen)
        } else {
            choices.into_iter().next()
        }
    });
    let map = Signal::derive(move || {
        finished.track();
        let window = spec.get().ok().flatten();
        let choice = map_choice.get()?;
        let (lot, wafer) = choice.split_once('|')?;
        work.with_value(|w| wafer_map(&w.sites, lot, wafer, window.as_ref()))
    });
    let export_rows = move |_| {
        let window = spec.get_untracked().ok().flatten();
        let csv = work.with_value(|w| w.rows_csv(window.as_ref()));
        export_error.set(browser::download_text(&csv, "text/csv", "bandgauge-lot-rows.csv").err());
    };
    let export_summary = move |_| {
        let csv = report.with_untracked(summary_csv);
        export_error
            .set(browser::download_text(&csv, "text/csv", "bandgauge-lot-summary.csv").err());
    };
    let differences = move || report.with(|r| difference_lines(r, filter().as_deref()));
    let rejected_count = move || {
        progress.track();
        finished.track();
        work.with_value(|w| w.counts().rejected)
    };

    view! {
        <section class="view lots" aria-label="Wafer lots">
            <div class="inputs lots-inputs">
                <div
                    class="dropzone"
                    class:dragging=move || dragging.get()
                    data-testid="lots-drop"
                    on:dragover=on_drag_over
                    on:dragleave=move |_| dragging.set(false)
                    on:drop=on_drop
                >
                    <p class="drop-title">"Drop lot files here"</p>
                    <p class="hint">
                        "CSV or TSV with a header row: lot, wafer, site, x, y, dopant or type, and a "
                        "resistivity, a sheet resistance with thickness, or probe volts and amps."
                    </p>
                    <div class="drop-actions">
                        <label for="lots-files">"or pick files:"</label>
                        <input id="lots-files" data-testid="lots-files" type="file" multiple
                            accept=".csv,.tsv,.txt" on:change=on_pick prop:disabled=move || busy.get() />
                        <button type="button" class="demo" data-testid="lots-demo" on:click=load_demo
                            prop:disabled=move || busy.get()>
                            "Load the demo lots"
                        </button>
                    </div>
                </div>
                <div class="lots-settings">
                    <div class="field">
                        <label for="lots-dopant">"Dopant for rows without one"</label>
                        <select id="lots-dopant" data-testid="lots-dopant" prop:value=move || dopant.get()
                            on:change=move |ev| dopant.set(event_target_value(&ev))>
                            <option value="" selected=dopant.get_untracked().is_empty()>"none (files must say)"</option>
                            <option value="B">"B (p-type)"</option>
                            <option value="P">"P (n-type)"</option>
                            <option value="As">"As (n-type)"</option>
                            <option value="Sb">"Sb (n-type)"</option>
                        </select>
                        <span class="hint">"Applies to files read after a change."</span>
                    </div>
                    <div class="field">
                        <label for="lots-filter">"Lots shown"</label>
                        <select id="lots-filter" data-testid="lots-filter" on:change=move |ev| lot_filter.set(event_target_value(&ev))>
                            <option value="" selected=move || lot_filter.get().is_empty()>"all lots"</option>
                            {move || lot_choices().into_iter().map(|l| {
                                let selected = l == lot_filter.get();
                                view! { <option value=l.clone() selected=selected>{l.clone()}</option> }
                            }).collect_view()}
                        </select>
                    </div>
                </div>
                <fieldset class="spec-window">
                    <legend>"Spec window"</legend>
                    <div class="field">
                        <label for="lots-spec-quantity">"Limits on"</label>
                        <select id="lots-spec-quantity" data-testid="lots-spec-quantity"
                            prop:value=move || quantity.get() on:change=move |ev| quantity.set(event_target_value(&ev))>
                            <option value="resistivity">"resistivity, ohm cm"</option>
                            <option value="density">"dopant density, cm^-3"</option>
                        </select>
                    </div>
                    <div class="field" class:invalid=move || spec.with(Result::is_err)>
                        <label for="lots-spec-min">"Lower limit"</label>
                        <input type="text" id="lots-spec-min" data-testid="lots-spec-min" placeholder="none"
                            inputmode="decimal" autocomplete="off" spellcheck="false"
                            prop:value=move || spec_min.get() on:input=move |ev| spec_min.set(event_target_value(&ev)) />
                    </div>
                    <div class="field" class:invalid=move || spec.with(Result::is_err)>
                        <label for="lots-spec-max">"Upper limit"</label>
                        <input type="text" id="lots-spec-max" data-testid="lots-spec-max" placeholder="none"
                            inputmode="decimal" autocomplete="off" spellcheck="false"
                            prop:value=move || spec_max.get() on:input=move |ev| spec_max.set(event_target_value(&ev)) />
                    </div>
                    <p class="hint">"Numbers in the unit above, or with their own (800 mohm-cm). Leave one empty for a one-sided window."</p>
                    {move || spec.get().err().map(|e| view! { <p class="message" data-testid="lots-spec-error" role="alert">{e}</p> })}
                </fieldset>
            </div>
            <div class="lots-progress" role="status" aria-live="polite">
                <p class="status" data-testid="lots-status">{status_line}</p>
                <Show when=move || busy.get()>
                    <progress data-testid="lots-progress" max="1" prop:value=progress_value
                        aria-label="Reading progress"></progress>
                </Show>
            </div>
            <Show
                when=move || has_data.get()
                fallback=|| view! {
                    <p class="lots-empty" data-testid="lots-empty">
                        "Nothing read yet. Drop lot files above, pick them, or load the demo lots "
                        "(four invented lots from one week of a production line)."
                    </p>
                }
            >
                <ul class="messages" data-testid="lots-file-messages">
                    {move || messages().into_iter().map(|m| view! { <li>{m}</li> }).collect_view()}
                </ul>
                <div class="panel lots-panel">
                    <h2>"Lots"</h2>
                    <div class="table-scroll">
                        <table class="lots-summary" data-testid="lots-summary">
                            <thead><tr>
                                <th scope="col">"lot"</th><th scope="col" class="left">"dopant"</th>
                                <th scope="col">"wafers"</th><th scope="col">"sites"</th>
                                <th scope="col">"mean, ohm cm"</th><th scope="col">"median"</th>
                                <th scope="col">"std"</th><th scope="col" title="100 x standard deviation / mean of the sites">"std/mean, %"</th>
                                <th scope="col">"mean, cm^-3"</th><th scope="col" class="left">"verdict"</th>
                                <th scope="col">{move || format!("margin, {}", unit())}</th>
                                <th scope="col" class="left">"worst wafer"</th><th scope="col">"Cpk"</th>
                            </tr></thead>
                            <tbody>
                                {move || report.with(|r| r.lots.iter().filter(|l| filter().is_none_or(|f| f == l.lot)).map(|l| {
                                    let verdict = l.verdict.map(|v| v.as_str()).unwrap_or("");
                                    view! {
                                        <tr data-testid=format!("lot-{}", l.lot)>
                                            <th scope="row">{l.lot.clone()}</th>
                                            <td class="left">{format!("{} ({})", l.dopant, l.conductivity_type.as_str())}</td>
                                            <td>{l.wafers}</td>
                                            <td>{l.sites}</td>
                                            <td>{format::auto(l.resistivity_ohm_cm.mean)}</td>
                                            <td>{format::auto(l.resistivity_ohm_cm.median)}</td>
                                            <td>{l.resistivity_ohm_cm.std.map(format::auto).unwrap_or_default()}</td>
                                            <td>{l.resistivity_ohm_cm.nonuniformity_percent.map(|p| format::fixed(p, 2)).unwrap_or_default()}</td>
                                            <td>{format::sci(l.density_cm3.mean)}</td>
                                            <td class=format!("left verdict {verdict}") data-testid=format!("verdict-{}", l.lot)>{verdict}</td>
                                            <td>{l.margin.map(format::auto).unwrap_or_default()}</td>
                                            <td class="left">{l.worst_wafer.clone().unwrap_or_default()}</td>
                                            <td>{l.cpk.map(|c| format::fixed(c, 2)).unwrap_or_default()}</td>
                                        </tr>
                                    }
                                }).collect_view())}
                            </tbody>
                        </table>
                    </div>
                    {move || spec.with(|s| matches!(s, Ok(None))).then(|| view! {
                        <p class="hint" data-testid="lots-no-window">
                            "No spec window given, so no verdicts, margins or Cpk: give a lower or upper limit above."
                        </p>
                    })}
                    <p class="model hint" data-testid="lots-model">
                        {move || report.with(|r| format!("Conversion: {} ({})", r.model, r.model_reference))}
                    </p>
                    <h3>"Do the lots differ?"</h3>
                    <ul class="differences" data-testid="lots-differences">
                        {move || {
                            let lines = differences();
                            if lines.is_empty() {
                                view! { <li>"Two or more lots with two or more wafers each are needed for a test."</li> }.into_any()
                            } else {
                                lines.into_iter().map(|t| view! { <li>{t}</li> }).collect_view().into_any()
                            }
                        }}
                    </ul>
                    <Caution models=Signal::derive(move || report.with(models_used)) />
                </div>
                <div class="lots-charts">
                    <ChartPanel id="lots-chart" spec=chart layout=bench.layout input_at=bench.input_at />
                    <div class="lots-map">
                        <div class="field">
                            <label for="lots-map-wafer">"Wafer map"</label>
                            <select id="lots-map-wafer" data-testid="lots-map-wafer"
                                prop:value=move || map_choice.get().unwrap_or_default()
                                on:change=move |ev| map_wafer.set(event_target_value(&ev))>
                                {move || {
                                    let current = map_choice.get().unwrap_or_default();
                                    map_choices().into_iter().map(|c| {
                                        let text = c.replacen('|', ", wafer ", 1);
                                        let selected = c == current;
                                        view! { <option value=c selected=selected>{text}</option> }
                                    }).collect_view()
                                }}
                            </select>
                            <span class="hint">"Site values at their x, y; outside the window marked low or high."</span>
                        </div>
                        {move || map_choices().is_empty().then(|| view! {
                            <p class="hint" data-testid="lots-map-none">"No site positions (x, y) in these files."</p>
                        })}
                        <ChartPanel id="lots-map" spec=map layout=bench.layout input_at=bench.input_at />
                    </div>
                </div>
                <div class="panel lots-panel">
                    <h2>"Wafers"</h2>
                    <div class="table-scroll tall">
                        <table class="lots-wafers" data-testid="lots-wafers">
                            <thead><tr>
                                <th scope="col">"lot"</th><th scope="col" class="left">"wafer"</th><th scope="col">"sites"</th>
                                <th scope="col">"mean, ohm cm"</th><th scope="col">"std/mean, %"</th>
                                <th scope="col">"mean, cm^-3"</th><th scope="col" class="left">"verdict"</th>
                                <th scope="col">{move || format!("margin, {}", unit())}</th><th scope="col">"sites outside"</th>
                            </tr></thead>
                            <tbody>
                                {move || report.with(|r| r.lots.iter().filter(|l| filter().is_none_or(|f| f == l.lot)).flat_map(|l| {
                                    l.wafer_results.iter().map(|w| {
                                        let verdict = w.judgement.map(|j| j.verdict.as_str()).unwrap_or("");
                                        view! {
                                            <tr>
                                                <th scope="row">{l.lot.clone()}</th><td class="left">{w.wafer.clone()}</td><td>{w.sites}</td>
                                                <td>{format::auto(w.resistivity_ohm_cm.mean)}</td>
                                                <td>{w.resistivity_ohm_cm.nonuniformity_percent.map(|p| format::fixed(p, 2)).unwrap_or_default()}</td>
                                                <td>{format::sci(w.density_cm3.mean)}</td>
                                                <td class=format!("left verdict {verdict}")>{verdict}</td>
                                                <td>{w.judgement.map(|j| format::auto(j.margin)).unwrap_or_default()}</td>
                                                <td>{w.sites_outside.map(|s| s.to_string()).unwrap_or_default()}</td>
                                            </tr>
                                        }
                                    }).collect::<Vec<_>>()
                                }).collect_view())}
                            </tbody>
                        </table>
                    </div>
                </div>
                <div class="panel lots-panel">
                    <h2>{move || format!("Rejected rows ({})", rejected_count())}</h2>
                    {move || (rejected_count() == 0).then(|| view! { <p>"None: every row read was converted."</p> })}
                    {move || {
                        let shown = work.with_value(|w| w.rejected.len() as u64);
                        (rejected_count() > shown).then(|| view! {
                            <p class="hint">{format!("The first {shown} are listed; all are counted.")}</p>
                        })
                    }}
                    <ul class="rejected" data-testid="lots-rejected">
                        {move || {
                            finished.track();
                            progress.track();
                            work.with_value(|w| w.rejected.iter().map(|r| {
                                let place = format!("{}, line {}", r.file, r.line);
                                let reason = if r.column.is_empty() {
                                    format!(": {}", r.reason)
                                } else {
                                    format!(": {}: {}", r.column, r.reason)
                                };
                                view! { <li data-testid=format!("rejected-line-{}", r.line)><strong>{place}</strong>{reason}</li> }
                            }).collect_view())
                        }}
                    </ul>
                </div>
                <div class="panel lots-panel exports">
                    <button type="button" data-testid="lots-export-rows" on:click=export_rows>"Converted rows as CSV"</button>
                    <button type="button" data-testid="lots-export-summary" on:click=export_summary>"Summary as CSV"</button>
                    {move || export_error.get().map(|e| view! { <span class="message">{e}</span> })}
                    <details class="definitions">
                        <summary>"How the figures are defined"</summary>
                        <ul>
                            {move || report.with(|r| {
                                let d = r.definitions;
                                [d.nonuniformity, d.std, d.median, d.wafer_verdict, d.lot_verdict, d.uncertainty, d.cpk, d.lot_difference]
                                    .into_iter()
                                    .map(|t| view! { <li>{t}</li> })
                                    .collect_view()
                            })}
                        </ul>
                    </details>
                </div>
            </Show>
        </section>
    }
}

/// Something to read: a picked or dropped file, or a built-in text.
enum Source {
    File(web_sys::File),
    Text(String, String),
}

impl Source {
    fn size(&self) -> f64 {
        match self {
            Source::File(file) => file.size(),
            Source::Text(_, text) => text.len() as f64,
        }
    }
}

fn files_of(list: Option<web_sys::FileList>) -> Vec<Source> {
    let Some(list) = list else { return Vec::new() };
    (0..list.length())
        .filter_map(|i| list.get(i))
        .map(Source::File)
        .collect()
}

/// The view's handles a reading job updates.
#[derive(Clone, Copy)]
struct Handles {
    work: StoredValue<LotsWork, LocalStorage>,
    progress: RwSignal<u64>,
    finished: RwSignal<u64>,
    busy: RwSignal<bool>,
}

/// The reading job shared by the chunk callbacks.
struct Job {
    sources: Vec<Source>,
    index: usize,
    offset: f64,
}

impl Job {
    /// Moves on to the next source.
    fn next_source(&mut self) {
        self.index += 1;
        self.offset = 0.0;
    }
}

/// Reads every source in turn, one chunk per event-loop turn, then marks the work finished.
fn read_sources(sources: Vec<Source>, handles: Handles) {
    let job = Rc::new(RefCell::new(Job {
        sources,
        index: 0,
        offset: 0.0,
    }));
    step(job, handles);
}

/// What the next step of a reading job does.
enum Next {
    /// Every source is read.
    Done,
    /// A piece was read; go on once the page has handled its events.
    Yield {
        /// The piece ended its source.
        file_done: bool,
    },
    /// Read this slice of the current file.
    Read(web_sys::Blob),
    /// The view is gone.
    Stop,
}

/// Takes the next piece of the job: reads a chunk of a built-in text at once, or cuts the next
/// slice of a file for the `FileReader`.
fn next_piece(job: &mut Job, work: StoredValue<LotsWork, LocalStorage>) -> Next {
    let offset = job.offset;
    let Some(source) = job.sources.get(job.index) else {
        return Next::Done;
    };
    let size = source.size();
    if offset == 0.0 {
        let name = match source {
            Source::File(file) => file.name(),
            Source::Text(name, _) => name.clone(),
        };
        if work
            .try_update_value(|w| w.begin_file(&name, size as u64))
            .is_none()
        {
            return Next::Stop;
        }
    }
    let end = (offset + CHUNK_BYTES as f64).min(size);
    match source {
        Source::Text(_, text) => {
            let piece = &text.as_bytes()[offset as usize..end as usize];
            let file_done = end >= size;
            let alive = work.try_update_value(|w| {
                w.feed(piece);
                if file_done || w.current_failed() {
                    w.end_file();
                    true
                } else {
                    false
                }
            });
            match alive {
                None => Next::Stop,
                Some(done) => {
                    if done {
                        job.next_source();
                    } else {
                        job.offset = end;
                    }
                    Next::Yield { file_done: done }
                }
            }
        }
        Source::File(file) => match file.slice_with_f64_and_f64(offset, end) {
            Ok(blob) => {
                job.offset = end;
                Next::Read(blob)
            }
            Err(_) => {
                work.update_value(|w| w.fail_file("the browser could not cut the file in parts"));
                job.next_source();
                Next::Yield { file_done: true }
            }
        },
    }
}

/// Reads one piece and schedules the next, so the page handles its events between pieces.
fn step(job: Rc<RefCell<Job>>, handles: Handles) {
    let next = next_piece(&mut job.borrow_mut(), handles.work);
    match next {
        Next::Done => {
            handles.busy.set(false);
            handles.finished.update(|n| *n += 1);
        }
        Next::Stop => {}
        Next::Yield { file_done } => {
            after_piece(file_done, handles);
            set_timeout(move || step(job, handles), std::time::Duration::ZERO);
        }
        Next::Read(blob) => {
            let Ok(reader) = web_sys::FileReader::new() else {
                handles
                    .work
                    .update_value(|w| w.fail_file("the browser cannot read files here"));
                job.borrow_mut().next_source();
                after_piece(true, handles);
                step(job, handles);
                return;
            };
            let reader_in_callback = reader.clone();
            let job_here = job.clone();
            // `loadend` comes after a successful read and after a failed one alike.
            let on_loadend = Closure::once_into_js(move |_: JsValue| {
                let bytes = reader_in_callback
                    .result()
                    .ok()
                    .filter(|r| !r.is_null() && !r.is_undefined())
                    .map(|buffer| js_sys::Uint8Array::new(&buffer).to_vec());
                let file_done = {
                    let mut j = job.borrow_mut();
                    let size = j.sources.get(j.index).map_or(0.0, Source::size);
                    let at_end = j.offset >= size;
                    let done = handles.work.try_update_value(|w| {
                        match &bytes {
                            Some(b) => w.feed(b),
                            None => w.fail_file("the browser could not read the file"),
                        }
                        let done = at_end || w.current_failed();
                        if done {
                            w.end_file();
                        }
                        done
                    });
                    let Some(done) = done else { return };
                    if done {
                        j.next_source();
                    }
                    done
                };
                after_piece(file_done, handles);
                step(job, handles);
            });
            reader.set_onloadend(Some(on_loadend.unchecked_ref()));
            if reader.read_as_array_buffer(&blob).is_err() {
                reader.set_onloadend(None);
                handles
                    .work
                    .update_value(|w| w.fail_file("the browser could not read the file"));
                job_here.borrow_mut().next_source();
                after_piece(true, handles);
                step(job_here, handles);
            }
        }
    }
}

/// Tells the page a piece was read (and a file finished, if it was).
fn after_piece(file_done: bool, handles: Handles) {
    handles.progress.update(|n| *n += 1);
    if file_done {
        handles.finished.update(|n| *n += 1);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
}
