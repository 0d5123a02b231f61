//! The lot-file reader: a push parser that takes a file in chunks of bytes of any size, finds
//! the settings lines, the header and the delimiter, and turns every row into a converted
//! [`Site`] or a [`RowRejection`] with its line number, column and reason.
//!
//! Memory stays bounded by the longest line: nothing of a row is kept once it has been handed
//! on. Rows are independent lines; a quoted field may hold the delimiter but not a line break.

use std::fmt;

use crate::empirical::{EmpiricalRelation, density_from_resistivity_cm3};
use crate::lots::columns::{Column, header_unit, normalise_name, split_name_and_unit, unit_entry};
use crate::lots::map::{Orientation, OrientationMark, WaferOutline};
use crate::mobility::ConductivityType;
use crate::probe::{self, ProbeGeometry, ProbeReading};
use crate::units::{QuantityKind, Unit, UnitError, parse_quantity_bare_in};
use crate::vdp::{self, Configuration, VdpError, VdpReadings};

/// Longest line accepted, bytes: a lot file's lines are short; a longer one means the input
/// is not a lot file (for example a binary file) and reading stops rather than buffering it.
pub const MAX_LINE_BYTES: usize = 1 << 20;

const UTF8_BOM: &[u8] = b"\xEF\xBB\xBF";

/// Choices made outside the file.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ReadOptions {
    /// Dopant (B, P, As, Sb or their names) for rows that name neither a dopant nor a type and
    /// whose file sets neither.
    pub default_dopant: Option<String>,
}

/// What was measured at a site, as read (lengths in cm).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Measurement {
    /// Resistivity read directly.
    Resistivity,
    /// Sheet resistance times thickness.
    SheetResistance {
        /// Sheet resistance, ohm/sq.
        sheet_resistance_ohm_sq: f64,
        /// Thickness, cm.
        thickness_cm: f64,
    },
    /// Four-point-probe reading with the finite-thickness correction.
    Probe {
        /// Voltage, V.
        volts: f64,
        /// Current, A.
        amps: f64,
        /// Probe spacing, cm.
        spacing_cm: f64,
        /// The sample geometry the reading was evaluated for.
        geometry: ProbeGeometry,
        /// Thickness, cm (always for a thin layer; a bulk sample may leave it out).
        thickness_cm: Option<f64>,
        /// Sheet resistance after the corrections, ohm/sq (`None` for a bulk sample without a
        /// thickness).
        sheet_resistance_ohm_sq: Option<f64>,
    },
    /// Van der Pauw structure: R_A and R_B to the sheet resistance, times the thickness.
    VanDerPauw {
        /// R_A, ohm.
        r_a_ohm: f64,
        /// R_B, ohm.
        r_b_ohm: f64,
        /// Thickness, cm.
        thickness_cm: f64,
        /// Sheet resistance from the van der Pauw equation, ohm/sq.
        sheet_resistance_ohm_sq: f64,
    },
}

impl Measurement {
    /// "resistivity", "sheet_resistance", "four_point_probe" or "van_der_pauw".
    pub fn name(&self) -> &'static str {
        match self {
            Measurement::Resistivity => "resistivity",
            Measurement::SheetResistance { .. } => "sheet_resistance",
            Measurement::Probe { .. } => "four_point_probe",
            Measurement::VanDerPauw { .. } => "van_der_pauw",
        }
    }
}

/// One converted site. Text fields borrow from the reader and live only for the call that
/// hands the site on.
#[derive(Debug, Clone, PartialEq)]
pub struct Site<'a> {
    /// Line number in the file (1-based, counting every line).
    pub line: u64,
    /// Lot identifier.
    pub lot: &'a str,
    /// Wafer identifier.
    pub wafer: &'a str,
    /// Site identifier ("" when the file has none).
    pub site: &'a str,
    /// x position, mm.
    pub x_mm: Option<f64>,
    /// y position, mm.
    pub y_mm: Option<f64>,
    /// Dopant symbol: B, P, As or Sb.
    pub dopant: &'static str,
    /// Whether the dopant was inferred from a conductivity type (n: P, p: B).
    pub dopant_from_type: bool,
    /// The empirical relation used.
    pub relation: EmpiricalRelation,
    /// What was measured.
    pub measurement: Measurement,
    /// Resistivity, ohm cm.
    pub resistivity_ohm_cm: f64,
    /// Dopant density, cm^-3.
    pub density_cm3: f64,
    /// Relative half-width of the resistivity's uncertainty (0.02 = 2 %), when given.
    pub uncertainty: Option<f64>,
    /// The wafer outline the file states (`# diameter:`, `# notch:`, `# flat:`).
    pub outline: WaferOutline,
}

/// A row that did not convert.
#[derive(Debug, Clone, PartialEq)]
pub struct RowRejection {
    /// Line number in the file (1-based, counting every line).
    pub line: u64,
    /// The column at fault, when one is.
    pub column: Option<Column>,
    /// What is wrong and what is allowed.
    pub reason: String,
}

impl RowRejection {
    fn new(line: u64, column: Option<Column>, reason: impl Into<String>) -> RowRejection {
        RowRejection {
            line,
            column,
            reason: reason.into(),
        }
    }
}

impl fmt::Display for RowRejection {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.column {
            Some(column) => write!(f, "line {}: {column}: {}", self.line, self.reason),
            None => write!(f, "line {}: {}", self.line, self.reason),
        }
    }
}

/// What happened to one row.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum RowOutcome<'r, 's> {
    /// The row converted and was added to the book.
    Converted(&'r Site<'s>),
    /// The row was rejected.
    Rejected(&'r RowRejection),
}

/// Rows counted so far. `read == converted + rejected` at every moment.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, serde::Serialize)]
pub struct RowCounts {
    /// Data rows read (blank lines, comments, settings and the header are not rows).
    pub read: u64,
    /// Rows converted.
    pub converted: u64,
    /// Rows rejected.
    pub rejected: u64,
}

impl RowCounts {
    /// Adds another file's counts.
    pub fn add(&mut self, other: RowCounts) {
        self.read += other.read;
        self.converted += other.converted;
        self.rejected += other.rejected;
    }
}

/// Where a [`LotReader`] puts the rows it reads: the reader produces sites, the sink collects
/// them. [`LotBook`](crate::lots::LotBook) is the sink this crate provides.
pub trait SiteSink {
    /// Takes one converted site, or refuses it with the reason (the row is then counted as
    /// rejected).
    ///
    /// # Errors
    /// A [`RowRejection`] when the site cannot join what was collected so far.
    fn accept(&mut self, site: &Site<'_>) -> Result<(), RowRejection>;

    /// Counts one row the reader rejected itself (the site never reached [`SiteSink::accept`]).
    fn count_rejected(&mut self);
}

/// Why a file cannot be read at all.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum LotFileError {
    /// The file ended before any header line.
    NoHeader,
    /// The first line that is not blank, a comment or a setting names none of our columns.
    NotAHeader {
        /// Its line number.
        line: u64,
        /// The line (shortened).
        text: String,
    },
    /// The header names our columns but cannot be used as it is.
    Header {
        /// Its line number.
        line: u64,
        /// What is wrong and what is allowed.
        message: String,
    },
    /// A setting line (`# name: value`) before the header is not usable.
    Setting {
        /// Its line number.
        line: u64,
        /// What is wrong and what is allowed.
        message: String,
    },
    /// Bytes before the header are not UTF-8 text.
    NotText {
        /// The line number.
        line: u64,
    },
    /// A line is longer than [`MAX_LINE_BYTES`].
    LineTooLong {
        /// The line number.
        line: u64,
    },
}

impl LotFileError {
    /// Whether the file is not a lot file at all (no header line, a first line naming none of
    /// our columns, or bytes before any header that are not text), as opposed to a lot file
    /// with a fault: among several files such a file can be skipped (a notes or summary file in
    /// a folder of exports) without losing anything, since nothing of it was read.
    pub fn is_not_a_lot_file(&self) -> bool {
        matches!(
            self,
            LotFileError::NoHeader | LotFileError::NotAHeader { .. } | LotFileError::NotText { .. }
        )
    }
}

impl fmt::Display for LotFileError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            LotFileError::NoHeader => write!(
                f,
                "no header line: the file is empty or holds only blank and comment lines; the \
                 first other line must name the columns, e.g. lot,wafer,site,resistivity [ohm-cm]"
            ),
            LotFileError::NotAHeader { line, text } => write!(
                f,
                "line {line}: {text:?} is not a header: it names none of the columns {}",
                column_list()
            ),
            LotFileError::Header { line, message } => write!(f, "line {line}: header: {message}"),
            LotFileError::Setting { line, message } => {
                write!(f, "line {line}: setting: {message}")
            }
            LotFileError::NotText { line } => write!(
                f,
                "line {line}: not UTF-8 text; save the file as UTF-8 (or plain ASCII) CSV"
            ),
            LotFileError::LineTooLong { line } => write!(
                f,
                "line {line}: longer than {MAX_LINE_BYTES} bytes; this does not look like a lot \
                 file"
            ),
        }
    }
}

impl std::error::Error for LotFileError {}

fn column_list() -> String {
    Column::ALL
        .iter()
        .map(|c| c.name())
        .collect::<Vec<_>>()
        .join(", ")
}

/// Values set for a whole file by `# name: value` lines before the header.
#[derive(Debug, Clone, Default, PartialEq)]
struct Settings {
    lot: Option<String>,
    wafer: Option<String>,
    dopant: Option<(&'static str, EmpiricalRelation)>,
    conductivity_type: Option<ConductivityType>,
    thickness_cm: Option<f64>,
    spacing_cm: Option<f64>,
    uncertainty: Option<f64>,
    geometry: Option<ProbeGeometry>,
    outline: WaferOutline,
    /// The line of the `# notch:` or `# flat:` setting, to name it when both are given.
    orientation_line: Option<u64>,
}

/// Where each of our columns sits, its unit, and how the file writes numbers.
#[derive(Debug, Clone, PartialEq)]
struct Header {
    line: u64,
    delimiter: u8,
    /// Decimal commas are read (delimiter `;` or tab).
    decimal_comma: bool,
    width: usize,
    positions: [Option<usize>; Column::ALL.len()],
    units: [Option<String>; Column::ALL.len()],
    /// The unit entries of `units`, for reading bare numbers quickly.
    unit_entries: [Option<&'static Unit>; Column::ALL.len()],
}

impl Header {
    fn position(&self, column: Column) -> Option<usize> {
        self.positions[column as usize]
    }

    fn unit(&self, column: Column) -> &str {
        self.units[column as usize]
            .as_deref()
            .or(column.bare_unit())
            .unwrap_or("")
    }

    fn unit_entry(&self, column: Column) -> Option<&'static Unit> {
        self.unit_entries[column as usize]
    }

    fn has(&self, column: Column) -> bool {
        self.position(column).is_some()
    }
}

/// The fields of the current line, unquoted, in one reused buffer.
#[derive(Debug, Default)]
struct Fields {
    text: String,
    ends: Vec<usize>,
}

impl Fields {
    fn len(&self) -> usize {
        self.ends.len()
    }

    fn get(&self, index: usize) -> &str {
        let start = if index == 0 { 0 } else { self.ends[index - 1] };
        self.text[start..self.ends[index]].trim()
    }

    fn all_empty(&self) -> bool {
        (0..self.len()).all(|i| self.get(i).is_empty())
    }
}

/// Reads one lot file pushed in chunks; see the module documentation.
#[derive(Debug)]
pub struct LotReader {
    options: ReadOptions,
    pending: Vec<u8>,
    line: u64,
    header: Option<Header>,
    settings: Settings,
    fields: Fields,
    number: String,
    counts: RowCounts,
    notes: Vec<String>,
}

impl LotReader {
    /// A reader for one file.
    pub fn new(options: ReadOptions) -> LotReader {
        LotReader {
            options,
            pending: Vec::new(),
            line: 0,
            header: None,
            settings: Settings::default(),
            fields: Fields::default(),
            number: String::new(),
            counts: RowCounts::default(),
            notes: Vec::new(),
        }
    }

    /// Rows counted so far in this file.
    pub fn counts(&self) -> RowCounts {
        self.counts
    }

    /// Remarks about the file as a whole: ignored columns, unknown settings, how numbers were
    /// read.
    pub fn notes(&self) -> &[String] {
        &self.notes
    }

    /// Lines consumed so far.
    pub fn lines(&self) -> u64 {
        self.line
    }

    /// Pushes the next chunk of the file. Every complete line in it is read; converted sites
    /// are added to `book`, and every row's outcome is passed to `on_row` in file order.
    ///
    /// # Errors
    /// A [`LotFileError`] when the file cannot be read at all (before or at its header, or a
    /// line longer than [`MAX_LINE_BYTES`]). Rows after a usable header are never errors:
    /// they are rejected through `on_row`.
    pub fn feed(
        &mut self,
        chunk: &[u8],
        book: &mut dyn SiteSink,
        on_row: &mut dyn FnMut(RowOutcome<'_, '_>),
    ) -> Result<(), LotFileError> {
        let mut rest = chunk;
        if !self.pending.is_empty() {
            match rest.iter().position(|&b| b == b'\n') {
                Some(end) => {
                    let mut line = std::mem::take(&mut self.pending);
                    line.extend_from_slice(&rest[..end]);
                    let result = self.take_line(&line, book, on_row);
                    line.clear();
                    self.pending = line;
                    result?;
                    rest = &rest[end + 1..];
                }
                None => {
                    self.pending.extend_from_slice(rest);
                    return self.check_pending_length();
                }
            }
        }
        while let Some(end) = rest.iter().position(|&b| b == b'\n') {
            self.take_line(&rest[..end], book, on_row)?;
            rest = &rest[end + 1..];
        }
        self.pending.extend_from_slice(rest);
        self.check_pending_length()
    }

    /// Reads the last line (one without a final line break) and ends the file.
    ///
    /// # Errors
    /// [`LotFileError::NoHeader`] when the file had no header; otherwise as [`LotReader::feed`].
    pub fn finish(
        &mut self,
        book: &mut dyn SiteSink,
        on_row: &mut dyn FnMut(RowOutcome<'_, '_>),
    ) -> Result<RowCounts, LotFileError> {
        if !self.pending.is_empty() {
            let line = std::mem::take(&mut self.pending);
            self.take_line(&line, book, on_row)?;
        }
        if self.header.is_none() {
            return Err(LotFileError::NoHeader);
        }
        Ok(self.counts)
    }

    fn check_pending_length(&self) -> Result<(), LotFileError> {
        if self.pending.len() > MAX_LINE_BYTES {
            return Err(LotFileError::LineTooLong {
                line: self.line + 1,
            });
        }
        Ok(())
    }

    fn take_line(
        &mut self,
        raw: &[u8],
        book: &mut dyn SiteSink,
        on_row: &mut dyn FnMut(RowOutcome<'_, '_>),
    ) -> Result<(), LotFileError> {
        self.line += 1;
        let line_number = self.line;
        if raw.len() > MAX_LINE_BYTES {
            return Err(LotFileError::LineTooLong { line: line_number });
        }
        let mut bytes = raw;
        if line_number == 1 {
            bytes = bytes.strip_prefix(UTF8_BOM).unwrap_or(bytes);
        }
        bytes = bytes.strip_suffix(b"\r").unwrap_or(bytes);
        let text = match std::str::from_utf8(bytes) {
            Ok(text) => text,
            Err(error) => {
                if self.header.is_none() {
                    return Err(LotFileError::NotText { line: line_number });
                }
                let rejection = RowRejection::new(
                    line_number,
                    None,
                    format!(
                        "not UTF-8 text (bad byte at position {}); save the file as UTF-8",
                        error.valid_up_to() + 1
                    ),
                );
                self.reject(rejection, book, on_row);
                return Ok(());
            }
        };
        let trimmed = text.trim();
        if trimmed.is_empty() {
            return Ok(());
        }
        if trimmed.starts_with('#') {
            if self.header.is_none() {
                self.read_setting(line_number, trimmed)?;
            }
            return Ok(());
        }
        let Some(header) = &self.header else {
            let header = read_header(line_number, text, &self.settings, &self.options)?;
            self.notes.extend(header.1);
            self.header = Some(header.0);
            return Ok(());
        };
        if let Err(reason) = split_fields(text, header.delimiter, &mut self.fields) {
            self.reject(RowRejection::new(line_number, None, reason), book, on_row);
            return Ok(());
        }
        if self.fields.all_empty() {
            return Ok(());
        }
        match read_row(
            line_number,
            header,
            &self.settings,
            &self.options,
            &self.fields,
            &mut self.number,
        ) {
            Ok(site) => match book.accept(&site) {
                Ok(()) => {
                    on_row(RowOutcome::Converted(&site));
                    self.counts.read += 1;
                    self.counts.converted += 1;
                }
                Err(rejection) => {
                    on_row(RowOutcome::Rejected(&rejection));
                    self.counts.read += 1;
                    self.counts.rejected += 1;
                }
            },
            Err(rejection) => self.reject(rejection, book, on_row),
        }
        Ok(())
    }

    fn reject(
        &mut self,
        rejection: RowRejection,
        book: &mut dyn SiteSink,
        on_row: &mut dyn FnMut(RowOutcome<'_, '_>),
    ) {
        book.count_rejected();
        on_row(RowOutcome::Rejected(&rejection));
        self.counts.read += 1;
        self.counts.rejected += 1;
    }

    fn read_setting(&mut self, line: u64, trimmed: &str) -> Result<(), LotFileError> {
        let body = trimmed.trim_start_matches('#').trim();
        let Some(split) = body.find([':', '=']) else {
            return Ok(());
        };
        let name = body[..split].trim();
        let value = unquote(body[split + 1..].trim());
        if let Some(outcome) = self.read_outline_setting(line, name, value) {
            return outcome;
        }
        let Some(column) = Column::from_name(name) else {
            if !name.is_empty() && !name.contains(char::is_whitespace) {
                self.notes.push(format!(
                    "line {line}: '{name}' is not a setting bandgauge knows; the line is read as \
                     a comment (settings: {SETTING_NAMES})"
                ));
            }
            return Ok(());
        };
        let fail = |message: String| LotFileError::Setting { line, message };
        if !column.settable() {
            return Err(fail(format!(
                "{column} cannot be set for a whole file; it belongs in a column (settings: \
                 {SETTING_NAMES})"
            )));
        }
        if value.is_empty() {
            return Err(fail(format!("{column}: no value after the name")));
        }
        let s = &mut self.settings;
        match column {
            Column::Lot => s.lot = Some(value.to_owned()),
            Column::Wafer => s.wafer = Some(value.to_owned()),
            Column::Dopant => s.dopant = Some(parse_dopant(value).map_err(fail)?),
            Column::Type => s.conductivity_type = Some(parse_type(value).map_err(fail)?),
            Column::Geometry => s.geometry = Some(parse_geometry(value).map_err(fail)?),
            Column::Thickness | Column::Spacing | Column::Uncertainty => {
                let number = parse_number(column, value, None, None, true, &mut self.number)
                    .map_err(|reason| fail(format!("{column}: {reason}")))?;
                match column {
                    Column::Thickness => s.thickness_cm = Some(number),
                    Column::Spacing => s.spacing_cm = Some(number),
                    _ => s.uncertainty = Some(number),
                }
            }
            _ => unreachable!("settable() admits only the columns above"),
        }
        Ok(())
    }
}

/// Every name a `# name: value` line may set, for messages.
const SETTING_NAMES: &str =
    "lot, wafer, dopant, type, thickness, spacing, uncertainty, geometry, diameter, notch, flat";

/// Wafers larger than this (mm) are refused as a diameter setting: the largest standard wafer
/// is 450 mm.
const MAX_DIAMETER_MM: f64 = 1000.0;

impl LotReader {
    /// Reads `# diameter:`, `# notch:` or `# flat:` (`None` when `name` is none of them).
    fn read_outline_setting(
        &mut self,
        line: u64,
        name: &str,
        value: &str,
    ) -> Option<Result<(), LotFileError>> {
        let fail = |message: String| Err(LotFileError::Setting { line, message });
        let name = normalise_name(name);
        let mark = match name.as_str() {
            "diameter" => {
                return Some(match parse_diameter_mm(value) {
                    Ok(d) => {
                        self.settings.outline.diameter_mm = Some(d);
                        Ok(())
                    }
                    Err(message) => fail(format!("diameter: {message}")),
                });
            }
            "notch" => OrientationMark::Notch,
            "flat" => OrientationMark::Flat,
            _ => return None,
        };
        let label = mark.as_str();
        if let (Some(earlier), Some(o)) = (
            self.settings.orientation_line,
            self.settings.outline.orientation,
        ) {
            return Some(fail(format!(
                "{label}: the {} is already given on line {earlier}; a wafer has a notch or a \
                 flat, give only one",
                o.mark.as_str()
            )));
        }
        Some(match parse_angle_deg(value) {
            Ok(angle_deg) => {
                self.settings.outline.orientation = Some(Orientation { mark, angle_deg });
                self.settings.orientation_line = Some(line);
                Ok(())
            }
            Err(message) => fail(format!("{label}: {message}")),
        })
    }
}

/// A wafer diameter in mm, as the `# diameter:` setting and the app's diameter field take it: a
/// length, bare numbers in mm, more than 0 and at most 1000 mm.
///
/// # Errors
/// A message naming the text and what is allowed.
pub fn parse_diameter_mm(value: &str) -> Result<f64, String> {
    if value.is_empty() {
        return Err("no value after the name; give the wafer diameter, e.g. 150 mm".to_owned());
    }
    let cm = parse_quantity_bare_in(value, QuantityKind::Length, "mm").map_err(|e| match e {
        UnitError::UnknownUnit { .. } => format!(
            "{value:?}: not a length unit bandgauge reads; allowed: mm (for a bare number), cm, \
             um, nm, m"
        ),
        _ => format!("{value:?} is not a length; give the wafer diameter, e.g. 150 mm"),
    })?;
    let mm = cm * 10.0;
    if !(mm > 0.0 && mm <= MAX_DIAMETER_MM) {
        return Err(format!(
            "{value:?} is {mm} mm; a wafer diameter is more than 0 and at most \
             {MAX_DIAMETER_MM} mm (standard: 100, 150, 200, 300 mm)"
        ));
    }
    Ok(mm)
}

/// An orientation angle in degrees, 0 <= a < 360 (a trailing `deg` or `°` is allowed).
fn parse_angle_deg(value: &str) -> Result<f64, String> {
    let number = value
        .trim()
        .trim_end_matches("deg")
        .trim_end_matches('°')
        .trim();
    match number.parse::<f64>() {
        Ok(a) if (0.0..360.0).contains(&a) => Ok(a),
        Ok(_) => Err(format!(
            "{value:?} is outside 0 to 360; give the direction from the wafer centre in \
             degrees anticlockwise from +x, 0 <= angle < 360 (270 = at the bottom)"
        )),
        Err(_) => Err(format!(
            "{value:?} is not a number; give the direction from the wafer centre in degrees \
             anticlockwise from +x, 0 <= angle < 360 (270 = at the bottom)"
        )),
    }
}

fn unquote(text: &str) -> &str {
    text.strip_prefix('"')
        .and_then(|t| t.strip_suffix('"'))
        .unwrap_or(text)
}

/// Counts each candidate delimiter outside quotes; tab wins over semicolon over comma.
fn sniff_delimiter(line: &str) -> u8 {
    let mut counts = [0usize; 3];
    let mut quoted = false;
    for b in line.bytes() {
        match b {
            b'"' => quoted = !quoted,
            b'\t' if !quoted => counts[0] += 1,
            b';' if !quoted => counts[1] += 1,
            b',' if !quoted => counts[2] += 1,
            _ => {}
        }
    }
    if counts[0] > 0 {
        b'\t'
    } else if counts[1] > 0 {
        b';'
    } else {
        b','
    }
}

/// Splits `line` at `delimiter` into `fields`. A field that starts with a double quote (after
/// spaces) runs to the matching quote; `""` inside it is one quote.
fn split_fields(line: &str, delimiter: u8, fields: &mut Fields) -> Result<(), String> {
    fields.text.clear();
    fields.ends.clear();
    let bytes = line.as_bytes();
    let mut i = 0;
    loop {
        let mut start = i;
        while start < bytes.len()
            && (bytes[start] == b' ' || bytes[start] == b'\t')
            && bytes[start] != delimiter
        {
            start += 1;
        }
        if start < bytes.len() && bytes[start] == b'"' {
            let mut j = start + 1;
            let mut segment_start = j;
            loop {
                let Some(offset) = line[j..].find('"') else {
                    return Err(format!(
                        "field {}: the quote opened here is not closed on this line (a field \
                         may not span lines)",
                        fields.ends.len() + 1
                    ));
                };
                let quote = j + offset;
                fields.text.push_str(&line[segment_start..quote]);
                if bytes.get(quote + 1) == Some(&b'"') {
                    fields.text.push('"');
                    j = quote + 2;
                    segment_start = j;
                } else {
                    j = quote + 1;
                    break;
                }
            }
            while j < bytes.len() && bytes[j] != delimiter {
                if !bytes[j].is_ascii_whitespace() {
                    return Err(format!(
                        "field {}: text after the closing quote; quote the whole field",
                        fields.ends.len() + 1
                    ));
                }
                j += 1;
            }
            fields.ends.push(fields.text.len());
            if j >= bytes.len() {
                return Ok(());
            }
            i = j + 1;
        } else {
            let end = line[i..]
                .bytes()
                .position(|b| b == delimiter)
                .map_or(bytes.len(), |p| i + p);
            fields.text.push_str(&line[i..end]);
            fields.ends.push(fields.text.len());
            if end >= bytes.len() {
                return Ok(());
            }
            i = end + 1;
        }
    }
}

type HeaderAndNotes = (Header, Vec<String>);

fn read_header(
    line: u64,
    text: &str,
    settings: &Settings,
    options: &ReadOptions,
) -> Result<HeaderAndNotes, LotFileError> {
    let delimiter = sniff_delimiter(text);
    let mut fields = Fields::default();
    let fail = |message: String| LotFileError::Header { line, message };
    split_fields(text, delimiter, &mut fields).map_err(fail)?;
    let mut positions = [None; Column::ALL.len()];
    let mut units: [Option<String>; Column::ALL.len()] = Default::default();
    let mut ignored = Vec::new();
    for index in 0..fields.len() {
        let cell = fields.get(index);
        let (name, unit) = split_name_and_unit(cell);
        let Some(column) = Column::from_name(name) else {
            if !cell.is_empty() {
                ignored.push(cell.to_owned());
            }
            continue;
        };
        if positions[column as usize].is_some() {
            return Err(fail(format!("column {column} appears twice; keep one")));
        }
        positions[column as usize] = Some(index);
        units[column as usize] = header_unit(column, unit).map_err(fail)?;
    }
    if positions.iter().all(Option::is_none) {
        let mut shown: String = text.chars().take(80).collect();
        if shown.len() < text.len() {
            shown.push_str("...");
        }
        return Err(LotFileError::NotAHeader { line, text: shown });
    }
    let mut unit_entries = [None; Column::ALL.len()];
    for column in Column::ALL {
        if let (Some(kind), Some(unit)) = (column.kind(), &units[column as usize]) {
            unit_entries[column as usize] = unit_entry(kind, unit);
        }
    }
    let header = Header {
        line,
        delimiter,
        decimal_comma: delimiter != b',',
        width: fields.len(),
        positions,
        units,
        unit_entries,
    };
    check_header(&header, settings, options).map_err(fail)?;
    let mut notes = Vec::new();
    if !ignored.is_empty() {
        notes.push(format!(
            "line {line}: column(s) {} are not ours and are ignored",
            ignored.join(", ")
        ));
    }
    Ok((header, notes))
}

/// The header must locate a lot, a wafer, one measurement with what it needs, and a dopant.
fn check_header(header: &Header, settings: &Settings, options: &ReadOptions) -> Result<(), String> {
    let has = |c: Column| header.has(c);
    if !has(Column::Lot) && settings.lot.is_none() {
        return Err(
            "no lot column; add one, or give the lot for the whole file with a line \
                    '# lot: NAME' before the header"
                .to_owned(),
        );
    }
    if !has(Column::Wafer) && settings.wafer.is_none() {
        return Err(
            "no wafer column; add one, or give '# wafer: NAME' before the header".to_owned(),
        );
    }
    if has(Column::X) != has(Column::Y) {
        return Err("x and y come as a pair; give both columns or neither".to_owned());
    }
    if has(Column::Volts) != has(Column::Amps) {
        return Err("volts and amps come as a pair; give both columns or neither".to_owned());
    }
    if has(Column::RA) != has(Column::RB) {
        return Err("r_a and r_b come as a pair; give both columns or neither".to_owned());
    }
    let probe = has(Column::Volts);
    let van_der_pauw = has(Column::RA);
    if !has(Column::Resistivity) && !has(Column::SheetResistance) && !probe && !van_der_pauw {
        return Err(
            "no measurement column; give resistivity, sheet_resistance (with \
                    thickness), volts and amps (with spacing and thickness) or r_a and r_b \
                    (with thickness)"
                .to_owned(),
        );
    }
    let thickness = has(Column::Thickness) || settings.thickness_cm.is_some();
    if has(Column::SheetResistance) && !thickness {
        return Err(
            "sheet_resistance needs a thickness: add a thickness column or a line \
                    '# thickness: 525 um' before the header"
                .to_owned(),
        );
    }
    let bulk_possible = has(Column::Geometry) || settings.geometry == Some(ProbeGeometry::Bulk);
    if probe && !thickness && !bulk_possible {
        return Err(
            "volts and amps on a thin layer need a thickness: add a thickness column or a line \
                    '# thickness: 525 um' before the header, or '# geometry: bulk' for a bulk \
                    sample"
                .to_owned(),
        );
    }
    if van_der_pauw && !thickness {
        return Err(
            "r_a and r_b need a thickness: add a thickness column or a line \
                    '# thickness: 2 um' before the header"
                .to_owned(),
        );
    }
    if probe && !(has(Column::Spacing) || settings.spacing_cm.is_some()) {
        return Err(
            "volts and amps need the probe spacing: add a spacing column or a line \
                    '# spacing: 1 mm' before the header"
                .to_owned(),
        );
    }
    let dopant_known = has(Column::Dopant)
        || has(Column::Type)
        || settings.dopant.is_some()
        || settings.conductivity_type.is_some()
        || options.default_dopant.is_some();
    if !dopant_known {
        return Err(
            "no dopant: add a dopant or type column, a line '# dopant: B' before the \
                    header, or name the dopant for all files (--dopant)"
                .to_owned(),
        );
    }
    Ok(())
}

/// A probe geometry id: thin-layer or bulk (any case; a space or underscore for the hyphen).
///
/// # Errors
/// A message naming the text and the accepted geometries.
pub fn parse_geometry(text: &str) -> Result<ProbeGeometry, String> {
    ProbeGeometry::from_id(text).ok_or_else(|| {
        format!(
            "{:?} is not a probe geometry; give thin-layer (sheet resistance of a layer or \
             wafer; resistivity with its thickness) or bulk (semi-infinite sample)",
            text.trim()
        )
    })
}

/// Dopant symbol or name (B, P, As, Sb; boron, phosphorus, arsenic, antimony; any case) to the
/// symbol and the empirical relation that converts it.
///
/// # Errors
/// A message naming the text and the accepted dopants.
pub fn parse_dopant(text: &str) -> Result<(&'static str, EmpiricalRelation), String> {
    const KNOWN: [(&str, &str, &str, EmpiricalRelation); 4] = [
        ("b", "boron", "B", EmpiricalRelation::Boron),
        ("p", "phosphorus", "P", EmpiricalRelation::Phosphorus),
        ("as", "arsenic", "As", EmpiricalRelation::Phosphorus),
        ("sb", "antimony", "Sb", EmpiricalRelation::Phosphorus),
    ];
    let given = text.trim();
    KNOWN
        .iter()
        .find(|(symbol, name, _, _)| {
            given.eq_ignore_ascii_case(symbol) || given.eq_ignore_ascii_case(name)
        })
        .map(|(_, _, symbol, relation)| (*symbol, *relation))
        .ok_or_else(|| {
            format!(
                "dopant '{given}' has no empirical silicon relation; give B, P, As or Sb (or \
                 boron, phosphorus, arsenic, antimony)"
            )
        })
}

/// n or p (also "n-type", "p-type").
fn parse_type(text: &str) -> Result<ConductivityType, String> {
    let given = text.trim();
    if given.eq_ignore_ascii_case("n") {
        return Ok(ConductivityType::N);
    }
    if given.eq_ignore_ascii_case("p") {
        return Ok(ConductivityType::P);
    }
    match normalise_name(given).as_str() {
        "n_type" | "ntype" => Ok(ConductivityType::N),
        "p_type" | "ptype" => Ok(ConductivityType::P),
        _ => Err(format!(
            "type '{}' is not a conductivity type; give n or p (n-type, p-type)",
            text.trim()
        )),
    }
}

fn relation_for_type(conductivity_type: ConductivityType) -> (&'static str, EmpiricalRelation) {
    match conductivity_type {
        ConductivityType::N => ("P", EmpiricalRelation::Phosphorus),
        ConductivityType::P => ("B", EmpiricalRelation::Boron),
    }
}

/// Reads a number of `column`, in `unit` when bare (the column's default unit when `None`),
/// with a decimal comma read as a point when `decimal_comma`. Lengths come back in cm;
/// uncertainty as a fraction.
fn parse_number(
    column: Column,
    text: &str,
    unit: Option<&str>,
    unit_entry: Option<&Unit>,
    decimal_comma: bool,
    buffer: &mut String,
) -> Result<f64, String> {
    let mut text = text.trim();
    if decimal_comma && text.contains(',') {
        if text.contains('.') || text.matches(',').count() > 1 {
            return Err(format!(
                "{text:?} mixes commas and points or has several commas; write one decimal \
                 mark and no thousands separators"
            ));
        }
        buffer.clear();
        buffer.push_str(text);
        // The comma is ASCII, so its index is a char boundary.
        let comma = buffer.find(',').unwrap_or(0);
        buffer.replace_range(comma..=comma, ".");
        text = buffer.as_str();
    }
    let unit = unit.or(column.bare_unit()).unwrap_or("");
    if column == Column::Uncertainty {
        return parse_percent(text);
    }
    // Fast path for a bare number: Rust's float syntax is a subset of what the unit parser
    // reads, and anything else (a unit in the cell, NaN, infinity) takes the full path below.
    if let Some(entry) = unit_entry
        && let Ok(value) = text.parse::<f64>()
    {
        let converted = entry.to_default(value);
        if converted.is_finite() {
            return Ok(converted);
        }
    }
    let kind = column
        .kind()
        .expect("parse_number is called for numeric columns only");
    parse_quantity_bare_in(text, kind, unit).map_err(|error| {
        let mut message = error.to_string();
        if !decimal_comma && text.contains(',') {
            message.push_str(
                " (decimal commas are read only in files delimited by semicolons or tabs)",
            );
        }
        message
    })
}

fn parse_percent(text: &str) -> Result<f64, String> {
    let body = text.strip_suffix('%').unwrap_or(text).trim();
    let value: f64 = body.parse().map_err(|_| {
        format!("{text:?} is not a percentage; give a number such as 2 or 2 % (a half-width)")
    })?;
    if !(value.is_finite() && (0.0..100.0).contains(&value)) {
        return Err(format!(
            "{text:?} is not allowed; give a percentage >= 0 and < 100"
        ));
    }
    Ok(value / 100.0)
}

/// One data row to a [`Site`], or the reason it cannot be one.
fn read_row<'a>(
    line: u64,
    header: &Header,
    settings: &'a Settings,
    options: &ReadOptions,
    fields: &'a Fields,
    buffer: &mut String,
) -> Result<Site<'a>, RowRejection> {
    let reject = |column: Option<Column>, reason: String| RowRejection::new(line, column, reason);
    if fields.len() > header.width {
        let extra_filled = (header.width..fields.len()).any(|i| !fields.get(i).is_empty());
        if extra_filled {
            return Err(reject(
                None,
                format!(
                    "{} fields, but the header (line {}) has {}; check for an unquoted \
                     delimiter in a value",
                    fields.len(),
                    header.line,
                    header.width
                ),
            ));
        }
    }
    let cell = |column: Column| -> &'a str {
        match header.position(column) {
            Some(index) if index < fields.len() => fields.get(index),
            _ => "",
        }
    };
    let number = |column: Column, buffer: &mut String| -> Result<Option<f64>, RowRejection> {
        let text = cell(column);
        if text.is_empty() {
            return Ok(None);
        }
        parse_number(
            column,
            text,
            Some(header.unit(column)),
            header.unit_entry(column),
            header.decimal_comma,
            buffer,
        )
        .map(Some)
        .map_err(|reason| reject(Some(column), reason))
    };
    let lot = non_empty_text(cell(Column::Lot), settings.lot.as_deref())
        .ok_or_else(|| reject(Some(Column::Lot), "empty; every row needs a lot".to_owned()))?;
    let wafer =
        non_empty_text(cell(Column::Wafer), settings.wafer.as_deref()).ok_or_else(|| {
            reject(
                Some(Column::Wafer),
                "empty; every row needs a wafer".to_owned(),
            )
        })?;
    let site = cell(Column::Site);

    let x_cm = number(Column::X, buffer)?;
    let y_cm = number(Column::Y, buffer)?;
    if x_cm.is_some() != y_cm.is_some() {
        let missing = if x_cm.is_none() { Column::X } else { Column::Y };
        return Err(reject(
            Some(missing),
            "empty while the other coordinate is given; give both x and y or neither".to_owned(),
        ));
    }
    // Positions are reported in mm: a length finite in cm can overflow on the way.
    let in_mm = |column: Column, cm: Option<f64>| match cm.map(|v| v * 10.0) {
        Some(mm) if !mm.is_finite() => Err(reject(
            Some(column),
            format!(
                "{:?} is not a finite position in mm; give a finite number (about 1e308 mm \
                 at most)",
                cell(column)
            ),
        )),
        mm => Ok(mm),
    };
    let x_mm = in_mm(Column::X, x_cm)?;
    let y_mm = in_mm(Column::Y, y_cm)?;

    let (dopant, dopant_from_type, relation) =
        resolve_dopant(cell(Column::Dopant), cell(Column::Type), settings, options)
            .map_err(|(column, reason)| reject(column, reason))?;

    let uncertainty = match number(Column::Uncertainty, buffer)? {
        Some(u) => Some(u),
        None => settings.uncertainty,
    };

    let rho = number(Column::Resistivity, buffer)?;
    let sheet = number(Column::SheetResistance, buffer)?;
    let volts = number(Column::Volts, buffer)?;
    let amps = number(Column::Amps, buffer)?;
    let r_a = number(Column::RA, buffer)?;
    let r_b = number(Column::RB, buffer)?;
    let given = [
        rho.is_some(),
        sheet.is_some(),
        volts.is_some() || amps.is_some(),
        r_a.is_some() || r_b.is_some(),
    ];
    let count = given.iter().filter(|g| **g).count();
    if count == 0 {
        return Err(reject(
            None,
            "no measurement; fill resistivity, sheet_resistance, volts and amps, or r_a and r_b"
                .to_owned(),
        ));
    }
    if count > 1 {
        return Err(reject(
            None,
            "more than one measurement filled (resistivity, sheet_resistance, volts/amps, \
             r_a/r_b); give one per row"
                .to_owned(),
        ));
    }
    let thickness = |buffer: &mut String| -> Result<f64, RowRejection> {
        number(Column::Thickness, buffer)?
            .or(settings.thickness_cm)
            .ok_or_else(|| {
                reject(
                    Some(Column::Thickness),
                    "empty; this measurement needs the thickness".to_owned(),
                )
            })
    };
    let (measurement, resistivity_ohm_cm, rho_column) = if let Some(rho) = rho {
        (Measurement::Resistivity, rho, Column::Resistivity)
    } else if let Some(sheet) = sheet {
        let thickness_cm = thickness(buffer)?;
        let rho = probe::resistivity_from_sheet_ohm_cm(sheet, thickness_cm)
            .map_err(|e| reject(Some(Column::SheetResistance), e.to_string()))?;
        (
            Measurement::SheetResistance {
                sheet_resistance_ohm_sq: sheet,
                thickness_cm,
            },
            rho,
            Column::SheetResistance,
        )
    } else if r_a.is_some() || r_b.is_some() {
        let (Some(r_a_ohm), Some(r_b_ohm)) = (r_a, r_b) else {
            let missing = if r_a.is_none() {
                Column::RA
            } else {
                Column::RB
            };
            return Err(reject(
                Some(missing),
                "empty; a van der Pauw reading needs both r_a and r_b".to_owned(),
            ));
        };
        let thickness_cm = thickness(buffer)?;
        let column = |e: &VdpError| match e {
            VdpError::NotPositive { field, .. } if field.starts_with("r_b") => Column::RB,
            VdpError::NotPositive { field, .. } if field.starts_with("thickness") => {
                Column::Thickness
            }
            _ => Column::RA,
        };
        let result = vdp::evaluate(&VdpReadings {
            a: Configuration::single(r_a_ohm),
            b: Configuration::single(r_b_ohm),
            thickness_cm: Some(thickness_cm),
        })
        .map_err(|e| reject(Some(column(&e)), e.to_string()))?;
        (
            Measurement::VanDerPauw {
                r_a_ohm,
                r_b_ohm,
                thickness_cm,
                sheet_resistance_ohm_sq: result.solution.sheet_resistance_ohm_sq,
            },
            result.resistivity_ohm_cm.unwrap_or(f64::NAN),
            Column::RA,
        )
    } else {
        let (Some(volts), Some(amps)) = (volts, amps) else {
            let missing = if volts.is_none() {
                Column::Volts
            } else {
                Column::Amps
            };
            return Err(reject(
                Some(missing),
                "empty; a probe reading needs both volts and amps".to_owned(),
            ));
        };
        let geometry = match cell(Column::Geometry) {
            "" => settings.geometry.unwrap_or_default(),
            text => {
                parse_geometry(text).map_err(|reason| reject(Some(Column::Geometry), reason))?
            }
        };
        let thickness_cm = match geometry {
            ProbeGeometry::ThinLayer => Some(thickness(buffer)?),
            ProbeGeometry::Bulk => number(Column::Thickness, buffer)?.or(settings.thickness_cm),
        };
        let spacing_cm = number(Column::Spacing, buffer)?
            .or(settings.spacing_cm)
            .ok_or_else(|| {
                reject(
                    Some(Column::Spacing),
                    "empty; a probe reading needs the probe spacing".to_owned(),
                )
            })?;
        let reading = ProbeReading {
            volts,
            amps,
            spacing_cm,
            geometry,
            thickness_cm,
            diameter_cm: None,
            temperature: None,
        };
        let result = probe::evaluate(&reading).map_err(|e| reject(None, e.to_string()))?;
        let rho = result.resistivity_ohm_cm.ok_or_else(|| {
            reject(
                Some(Column::Thickness),
                "empty; a thin layer has a resistivity only with its thickness".to_owned(),
            )
        })?;
        (
            Measurement::Probe {
                volts,
                amps,
                spacing_cm,
                geometry,
                thickness_cm,
                sheet_resistance_ohm_sq: result.sheet_resistance_ohm_sq,
            },
            rho,
            Column::Volts,
        )
    };
    let density_cm3 = density_from_resistivity_cm3(relation, resistivity_ohm_cm)
        .map_err(|e| reject(Some(rho_column), e.to_string()))?;
    Ok(Site {
        line,
        lot,
        wafer,
        site,
        x_mm,
        y_mm,
        dopant,
        dopant_from_type,
        relation,
        measurement,
        resistivity_ohm_cm,
        density_cm3,
        uncertainty,
        outline: settings.outline,
    })
}

fn non_empty_text<'a>(cell: &'a str, setting: Option<&'a str>) -> Option<&'a str> {
    if cell.is_empty() { setting } else { Some(cell) }
}

type DopantChoice = (&'static str, bool, EmpiricalRelation);

/// The row's dopant: its dopant cell, else its type cell, else the file's settings, else the
/// reader's default. A dopant and a type that disagree reject the row.
fn resolve_dopant(
    dopant_cell: &str,
    type_cell: &str,
    settings: &Settings,
    options: &ReadOptions,
) -> Result<DopantChoice, (Option<Column>, String)> {
    let row_type = if type_cell.is_empty() {
        None
    } else {
        Some(parse_type(type_cell).map_err(|e| (Some(Column::Type), e))?)
    };
    if !dopant_cell.is_empty() {
        let (symbol, relation) =
            parse_dopant(dopant_cell).map_err(|e| (Some(Column::Dopant), e))?;
        if let Some(t) = row_type
            && t != relation.conductivity_type()
        {
            return Err((
                Some(Column::Type),
                format!(
                    "type {} contradicts dopant {symbol}, which makes silicon {}-type",
                    t.as_str(),
                    relation.conductivity_type().as_str()
                ),
            ));
        }
        return Ok((symbol, false, relation));
    }
    if let Some(t) = row_type {
        let (symbol, relation) = relation_for_type(t);
        return Ok((symbol, true, relation));
    }
    if let Some((symbol, relation)) = settings.dopant {
        return Ok((symbol, false, relation));
    }
    if let Some(t) = settings.conductivity_type {
        let (symbol, relation) = relation_for_type(t);
        return Ok((symbol, true, relation));
    }
    match &options.default_dopant {
        Some(text) => {
            let (symbol, relation) = parse_dopant(text).map_err(|e| (None, e))?;
            Ok((symbol, false, relation))
        }
        None => Err((
            Some(Column::Dopant),
            "empty, and no type, file setting or default dopant is given".to_owned(),
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lots::LotBook;

    fn split(line: &str, delimiter: u8) -> Result<Vec<String>, String> {
        let mut fields = Fields::default();
        split_fields(line, delimiter, &mut fields)?;
        Ok((0..fields.len())
            .map(|i| fields.get(i).to_owned())
            .collect())
    }

    #[test]
    fn quoted_fields_hold_delimiters_and_doubled_quotes() {
        assert_eq!(
            split(r#"a,"b,c","say ""hi""",d"#, b',').unwrap(),
            ["a", "b,c", r#"say "hi""#, "d"]
        );
        assert_eq!(split("a;;c;", b';').unwrap(), ["a", "", "c", ""]);
        assert!(split(r#"a,"b"#, b',').is_err());
        assert!(split(r#"a,"b"x,c"#, b',').is_err());
    }

    #[test]
    fn delimiter_sniffing_prefers_tab_then_semicolon() {
        assert_eq!(sniff_delimiter("lot\twafer,x"), b'\t');
        assert_eq!(sniff_delimiter("lot;wafer;resistivity [ohm,cm]"), b';');
        assert_eq!(sniff_delimiter("lot,wafer"), b',');
        assert_eq!(sniff_delimiter(r#""lot;a",wafer"#), b',');
    }

    #[test]
    fn positions_that_overflow_in_mm_are_rejected() {
        // Fuzz finding (lot_reader): "1.7e308 cm" is a finite length, but x_mm = 10 x_cm was
        // infinite in an accepted row.
        let text = "lot,wafer,x,y,resistivity\nA,1,1.7e308 cm,0,10\nA,1,0,-2e307 cm,10\nA,1,1e307 cm,0,10\n";
        let mut rejected = Vec::new();
        let mut book = LotBook::new();
        let options = ReadOptions {
            default_dopant: Some("B".into()),
        };
        let counts = crate::lots::read_str(text, &options, &mut book, &mut |o| {
            if let RowOutcome::Rejected(r) = o {
                rejected.push(r.to_string());
            }
        })
        .unwrap();
        assert_eq!((counts.converted, counts.rejected), (1, 2));
        assert_eq!(
            rejected,
            [
                "line 2: x: \"1.7e308 cm\" is not a finite position in mm; give a finite number \
                 (about 1e308 mm at most)",
                "line 3: y: \"-2e307 cm\" is not a finite position in mm; give a finite number \
                 (about 1e308 mm at most)"
            ]
        );
    }

    #[test]
    fn percentages() {
        assert_eq!(parse_percent("2"), Ok(0.02));
        assert_eq!(parse_percent("2 %"), Ok(0.02));
        assert!(parse_percent("-1").is_err());
        assert!(parse_percent("100").is_err());
        assert!(parse_percent("NaN").is_err());
    }
}
