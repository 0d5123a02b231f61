//! The plain state of the lots view: [`LotsWork`] reads lot text into the core's lot book and keeps
//! what the page lists (files, rejected rows, sites, the bytes a record carries); tested natively.

use std::fmt::Write as _;
use std::rc::Rc;

use bandgauge_core::lots::map::WaferOutline;
use bandgauge_core::lots::{
    LotBook, LotFileError, LotReader, LotReport, Measurement, ReadOptions, RowCounts, RowOutcome,
    SpecQuantity, SpecWindow,
};

use super::summary::csv_field;
use super::{CHUNK_BYTES, MAX_KEPT_SITES, MAX_LISTED_REJECTIONS, MAX_RECORDED_BYTES};
use crate::format;

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
    /// The file is not a lot file at all (no header naming our columns, or not text): among
    /// several files it is skipped, as `bandgauge lots` does.
    pub not_a_lot_file: bool,
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
    /// Sheet resistance, ohm/sq, when the row gives one (sheet-resistance, four-point-probe
    /// and van der Pauw rows).
    pub sheet_ohm_sq: Option<f64>,
    /// What the file says about the wafer outline (diameter, notch or flat).
    pub outline: WaferOutline,
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
            not_a_lot_file: false,
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
                status.not_a_lot_file = error.is_not_a_lot_file();
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
                    sheet_ohm_sq: sheet_resistance(&site.measurement),
                    outline: site.outline,
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

/// The sheet resistance a row gives, ohm/sq.
fn sheet_resistance(measurement: &Measurement) -> Option<f64> {
    match *measurement {
        Measurement::Resistivity => None,
        Measurement::SheetResistance {
            sheet_resistance_ohm_sq,
            ..
        }
        | Measurement::VanDerPauw {
            sheet_resistance_ohm_sq,
            ..
        } => Some(sheet_resistance_ohm_sq),
        Measurement::Probe {
            sheet_resistance_ohm_sq,
            ..
        } => sheet_resistance_ohm_sq,
    }
}

fn spec_value(window: &SpecWindow, resistivity_ohm_cm: f64, density_cm3: f64) -> f64 {
    match window.quantity() {
        SpecQuantity::Density => density_cm3,
        _ => resistivity_ohm_cm,
    }
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

    /// What went wrong with file `f`, as the page and the record list it (`None` when it was
    /// read): among several files one that is not a lot file is skipped and the others are read
    /// and summarised, the way `bandgauge lots` treats a notes file among prober exports; a
    /// single such file, or a lot file with a fault, is named with the reason it was refused.
    pub fn file_problem(&self, f: &FileStatus) -> Option<String> {
        let error = f.error.as_ref()?;
        Some(if f.not_a_lot_file && self.files.len() > 1 {
            format!("skipped {}: not a lot file: {error}", f.name)
        } else {
            format!("{}: {error}", f.name)
        })
    }

    /// Files skipped as not lot files (only among several).
    pub fn skipped_files(&self) -> usize {
        if self.files.len() > 1 {
            self.files.iter().filter(|f| f.not_a_lot_file).count()
        } else {
            0
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
            Some(_) => match self.skipped_files() {
                0 => format!("{} file(s) read: {counts}", self.files.len()),
                skipped => format!(
                    "{} file(s) read, {skipped} skipped (not lot files, named below): {counts}",
                    self.files.len() - skipped
                ),
            },
        }
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
