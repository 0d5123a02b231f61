//! The sign-off record: one calculation (its inputs as typed, its results as shown, the models
//! and sources used, the bandgauge version and build) as a JSON file that bandgauge reads back
//! and recomputes, with a SHA-256 digest that tells an edited or damaged file from the original.
//!
//! Plain Rust, tested natively. Writing: [`capture`] computes the results from the inputs with
//! the views' own functions and [`to_json`] writes the file. Reading: [`read_record`] checks the
//! format, the version and the digest; [`replay`] recomputes every result and compares. A
//! record is applied to the page only after both succeed, so it is never half applied.
//!
//! The digest is SHA-256 over the record without its `digest` member, written as compact JSON
//! with object keys sorted by their bytes (see [`canonical_json`]). It detects edits and
//! corruption; it is not a signature: anyone can edit a record and compute a new digest. Who
//! wrote a record is for the fab's own document control to establish.

use std::fmt;

use bandgauge_core::compare::ConversionModel;
use bandgauge_core::empirical::{self, EmpiricalInput, EmpiricalRelation};
use bandgauge_core::materials::DopantKind;
use bandgauge_core::units::QuantityKind;
use serde::{Deserialize, Serialize};
use serde_json::Value;
use sha2::{Digest, Sha256};

use crate::carriers;
use crate::entry;
use crate::format;
use crate::lots_view::{self, LotsWork};
use crate::resistivity;
use crate::state::{Given, View, Workbench};
use crate::sweep;

/// What a sign-off record says it is, in its `format` member.
pub const RECORD_FORMAT: &str = "bandgauge sign-off record";
/// The record layout this bandgauge writes and reads.
pub const RECORD_VERSION: u32 = 1;
/// This bandgauge's version.
pub const APP_VERSION: &str = env!("CARGO_PKG_VERSION");
/// The commit this bandgauge was built from (`cargo xtask` passes it), or "unknown".
pub const BUILD_COMMIT: &str = match option_env!("BANDGAUGE_BUILD_COMMIT") {
    Some(commit) => commit,
    None => "unknown",
};

/// Which calculation a record holds.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum RecordedView {
    /// Carriers, Fermi level and resistivity at one temperature (the carriers view).
    PointCalculation,
    /// The carriers-view sample over a temperature range (the sweep view).
    TemperatureSweep,
    /// Resistivity-density conversion and four-point probe (the resistivity view).
    Conversion,
    /// Wafer lots judged against a spec window (the lots view).
    LotComparison,
}

impl RecordedView {
    /// The record kind of a view.
    pub fn of(view: View) -> RecordedView {
        match view {
            View::Carriers => RecordedView::PointCalculation,
            View::Sweep => RecordedView::TemperatureSweep,
            View::Resistivity => RecordedView::Conversion,
            View::Lots => RecordedView::LotComparison,
        }
    }

    /// The view that shows this kind.
    pub fn view(self) -> View {
        match self {
            RecordedView::PointCalculation => View::Carriers,
            RecordedView::TemperatureSweep => View::Sweep,
            RecordedView::Conversion => View::Resistivity,
            RecordedView::LotComparison => View::Lots,
        }
    }

    /// The title of a report of this kind.
    pub fn title(self) -> &'static str {
        match self {
            RecordedView::PointCalculation => "Point calculation",
            RecordedView::TemperatureSweep => "Temperature sweep",
            RecordedView::Conversion => "Resistivity conversion and four-point probe",
            RecordedView::LotComparison => "Wafer-lot comparison",
        }
    }
}

/// One lot file as read: its name and its whole text.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LotFile {
    /// File name as picked.
    pub name: String,
    /// The whole text, exactly as read.
    pub text: String,
}

/// The lots view's inputs: the files with the dopant they were read with, and the spec window.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LotInputs {
    /// Dopant given to rows without one ("" for none).
    pub default_dopant: String,
    /// What the limits are on: "resistivity" or "density".
    pub spec_quantity: String,
    /// Lower limit as typed ("" for none).
    pub spec_min: String,
    /// Upper limit as typed ("" for none).
    pub spec_max: String,
    /// The files, in reading order.
    pub files: Vec<LotFile>,
}

/// Everything typed or loaded that the results depend on.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RecordInputs {
    /// The workbench inputs as typed (all views; the recorded view uses its own).
    pub workbench: Workbench,
    /// The lots view's inputs, for a lot comparison only.
    pub lots: Option<LotInputs>,
}

/// One shown value: the text as shown and the number behind it.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ResultCell {
    /// As shown on the page and in the report.
    pub shown: String,
    /// The full value: the shortest decimal that reads back as the same f64 (`1.0761e10`),
    /// or the text itself for words (a regime, a verdict).
    pub exact: String,
    /// Unit shown after the value ("" when the column heading carries it).
    pub unit: String,
}

/// One row of a result table.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ResultRow {
    /// What the row is about (a quantity, a lot, a wafer, a model).
    pub label: String,
    /// One cell per column after the first.
    pub cells: Vec<ResultCell>,
}

/// A table of results, as the report prints it.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ResultSection {
    /// Heading.
    pub title: String,
    /// Column headings, the first over the row labels; units in the headings where shared.
    pub columns: Vec<String>,
    /// The rows.
    pub rows: Vec<ResultRow>,
}

/// One model or parameter set a result depends on.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ModelLine {
    /// What it gives ("band gap", "mobility").
    pub quantity: String,
    /// Which model.
    pub model: String,
    /// Its published source ("" for notes).
    pub source: String,
}

/// The results of a calculation, as shown.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RecordResults {
    /// Result tables.
    pub sections: Vec<ResultSection>,
    /// The models and parameter sources used.
    pub models: Vec<ModelLine>,
    /// Remarks a reader must see (files that could not be read, definitions).
    pub notes: Vec<String>,
}

impl RecordResults {
    /// How many values the tables hold.
    pub fn value_count(&self) -> usize {
        self.sections
            .iter()
            .flat_map(|s| &s.rows)
            .map(|r| r.cells.len())
            .sum()
    }
}

/// A sign-off record (see the module documentation).
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SignoffRecord {
    /// Always [`RECORD_FORMAT`].
    pub format: String,
    /// The layout version, [`RECORD_VERSION`] when written by this bandgauge.
    pub format_version: u32,
    /// Version of the bandgauge that wrote it.
    pub app_version: String,
    /// Build commit of the bandgauge that wrote it.
    pub build_commit: String,
    /// When it was written, ISO 8601 UTC, from the computer's clock.
    pub created_utc: String,
    /// Which calculation.
    pub view: RecordedView,
    /// The inputs as typed.
    pub inputs: RecordInputs,
    /// The results as shown.
    pub results: RecordResults,
    /// SHA-256 (hex) of the canonical JSON of everything else.
    pub digest: String,
}

/// The top-level members of a version-1 record, in the order written.
const MEMBERS: [&str; 9] = [
    "format",
    "format_version",
    "app_version",
    "build_commit",
    "created_utc",
    "view",
    "inputs",
    "results",
    "digest",
];

/// Why a record could not be written, read or reproduced.
#[non_exhaustive]
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum RecordError {
    /// The file holds nothing (or only white space).
    Empty,
    /// The text is not JSON.
    NotJson {
        /// The JSON reader's complaint.
        detail: String,
    },
    /// The text ends inside the JSON (a file cut short).
    Truncated {
        /// Line where the text ends.
        line: usize,
    },
    /// JSON, but not a sign-off record.
    NotARecord {
        /// What is missing or wrong.
        detail: String,
    },
    /// `format` names another format.
    UnknownFormat {
        /// The format given.
        found: String,
    },
    /// Written by a newer bandgauge, in a layout this one does not know.
    NewerVersion {
        /// The record's version.
        found: u64,
        /// The app version the record names, if any.
        app_version: Option<String>,
    },
    /// A version number this bandgauge never wrote (0, negative, not a whole number).
    UnsupportedVersion {
        /// The version given, as written.
        found: String,
    },
    /// A member every record has is missing.
    MissingField {
        /// The member.
        field: String,
    },
    /// A member has a value a record cannot have.
    BadField {
        /// The member.
        field: String,
        /// What is wrong and what is allowed.
        detail: String,
    },
    /// The digest does not match the contents.
    Changed {
        /// The digest the record carries.
        stored: String,
        /// The digest of its contents.
        computed: String,
    },
    /// The recorded inputs cannot be computed (on reading) or the shown inputs are not valid
    /// (on writing).
    Inputs {
        /// The field's message.
        reason: String,
    },
    /// A recomputed result differs from the recorded one.
    ResultDiffers {
        /// Section, row and column of the first difference.
        place: String,
        /// The recorded value, as shown, with its unit.
        recorded: String,
        /// The recomputed value.
        recomputed: String,
        /// Version and build commit of the bandgauge that wrote the record.
        written_by: String,
    },
    /// A record cannot be written of what the page holds.
    NotRecordable {
        /// Why.
        reason: String,
    },
}

impl fmt::Display for RecordError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RecordError::Empty => write!(
                f,
                "the file is empty; a sign-off record is the JSON file bandgauge saves with \
                 'Save record'"
            ),
            RecordError::NotJson { detail } => write!(
                f,
                "the file is not a sign-off record: it is not JSON text ({detail})"
            ),
            RecordError::Truncated { line } => write!(
                f,
                "the file is not a complete sign-off record: its text ends early, at line {line} \
                 (cut short while copying or saving?)"
            ),
            RecordError::NotARecord { detail } => write!(
                f,
                "the file is JSON but not a sign-off record: {detail}; a record is an object \
                 whose format is \"{RECORD_FORMAT}\""
            ),
            RecordError::UnknownFormat { found } => write!(
                f,
                "format: \"{found}\" is not a format bandgauge reads; it reads \"{RECORD_FORMAT}\""
            ),
            RecordError::NewerVersion { found, app_version } => {
                write!(
                    f,
                    "format_version: the record was made by a newer bandgauge (record version \
                     {found}); this bandgauge ({APP_VERSION}) reads record version \
                     {RECORD_VERSION} only; open it with "
                )?;
                match app_version {
                    Some(v) => write!(f, "bandgauge {v} or later"),
                    None => write!(f, "a newer bandgauge"),
                }
            }
            RecordError::UnsupportedVersion { found } => write!(
                f,
                "format_version: {found} is not a record version bandgauge ever wrote; this \
                 bandgauge reads record version {RECORD_VERSION}"
            ),
            RecordError::MissingField { field } => {
                write!(f, "{field}: missing; every sign-off record has it")
            }
            RecordError::BadField { field, detail } => write!(f, "{field}: {detail}"),
            RecordError::Changed { stored, computed } => write!(
                f,
                "digest: the record was changed after it was written (its contents give digest \
                 {}, the record says {}); ask its author for the original file",
                short(computed),
                short(stored)
            ),
            RecordError::Inputs { reason } => write!(f, "inputs: {reason}"),
            RecordError::ResultDiffers {
                place,
                recorded,
                recomputed,
                written_by,
            } => write!(
                f,
                "result {place}: the record says {recorded}, this bandgauge ({APP_VERSION}, \
                 build {BUILD_COMMIT}) computes {recomputed}; the record was written by \
                 bandgauge {written_by}"
            ),
            RecordError::NotRecordable { reason } => write!(f, "no record written: {reason}"),
        }
    }
}

impl std::error::Error for RecordError {}

/// The first 12 hex digits of a digest, enough to tell two apart in a message.
fn short(digest: &str) -> String {
    let head: String = digest.chars().take(12).collect();
    if digest.chars().count() > 12 {
        format!("{head}…")
    } else {
        head
    }
}

// ---------------------------------------------------------------------------------------------
// Writing

/// A record of `inputs` (the view is `inputs.workbench.view`), written at `created_utc`: the
/// results are computed here from the inputs, with the views' own functions.
///
/// # Errors
/// [`RecordError::Inputs`] when an input is not valid (the page then shows the last valid
/// result, which these inputs would not reproduce); [`RecordError::NotRecordable`] when a lot
/// comparison has no files.
pub fn capture(inputs: RecordInputs, created_utc: &str) -> Result<SignoffRecord, RecordError> {
    let view = RecordedView::of(inputs.workbench.view);
    if view == RecordedView::LotComparison
        && inputs.lots.as_ref().is_none_or(|l| l.files.is_empty())
    {
        return Err(RecordError::NotRecordable {
            reason: "no lot files are read; pick files or load the demo lots first".into(),
        });
    }
    let results = compute(view, &inputs).map_err(|reason| RecordError::Inputs { reason })?;
    let mut record = SignoffRecord {
        format: RECORD_FORMAT.into(),
        format_version: RECORD_VERSION,
        app_version: APP_VERSION.into(),
        build_commit: BUILD_COMMIT.into(),
        created_utc: created_utc.into(),
        view,
        inputs,
        results,
        digest: String::new(),
    };
    record.digest = digest_of(&record);
    Ok(record)
}

/// The record as the JSON text of its file (indented, members in a fixed order).
pub fn to_json(record: &SignoffRecord) -> String {
    // Serialising plain strings, numbers and vectors cannot fail.
    serde_json::to_string_pretty(record).unwrap_or_default()
}

/// A file name for the record: kind and time, no characters a file system refuses.
pub fn file_name(record: &SignoffRecord) -> String {
    let kind = match record.view {
        RecordedView::PointCalculation => "point",
        RecordedView::TemperatureSweep => "sweep",
        RecordedView::Conversion => "conversion",
        RecordedView::LotComparison => "lots",
    };
    let time: String = record
        .created_utc
        .chars()
        .filter(char::is_ascii_alphanumeric)
        .collect();
    format!("bandgauge-record-{kind}-{time}.json")
}

/// The digest a record should carry: SHA-256, in lower-case hex, of [`canonical_json`] of the
/// record without its `digest` member.
pub fn digest_of(record: &SignoffRecord) -> String {
    let mut value = serde_json::to_value(record).unwrap_or(Value::Null);
    if let Value::Object(members) = &mut value {
        members.remove("digest");
    }
    digest_of_value(&value)
}

fn digest_of_value(value: &Value) -> String {
    let mut text = String::new();
    canonical_json(value, &mut text);
    sha256_hex(&text)
}

fn digest_of_members(members: &serde_json::Map<String, Value>) -> String {
    let mut text = String::new();
    canonical_object(members, &mut text);
    sha256_hex(&text)
}

fn sha256_hex(text: &str) -> String {
    Sha256::digest(text.as_bytes())
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect()
}

/// Compact JSON with every object's keys sorted by their UTF-8 bytes and strings escaped as
/// `serde_json` escapes them; the same text as Python's
/// `json.dumps(v, sort_keys=True, separators=(",", ":"), ensure_ascii=False)` gives for a record,
/// so a reviewer can check a digest without bandgauge.
pub fn canonical_json(value: &Value, out: &mut String) {
    match value {
        Value::Array(items) => {
            out.push('[');
            for (i, item) in items.iter().enumerate() {
                if i > 0 {
                    out.push(',');
                }
                canonical_json(item, out);
            }
            out.push(']');
        }
        Value::Object(members) => canonical_object(members, out),
        scalar => out.push_str(&scalar.to_string()),
    }
}

fn canonical_object(members: &serde_json::Map<String, Value>, out: &mut String) {
    let mut sorted: Vec<(&String, &Value)> = members.iter().collect();
    sorted.sort_by(|a, b| a.0.cmp(b.0));
    out.push('{');
    for (i, (key, value)) in sorted.into_iter().enumerate() {
        if i > 0 {
            out.push(',');
        }
        out.push_str(&Value::String(key.clone()).to_string());
        out.push(':');
        canonical_json(value, out);
    }
    out.push('}');
}

// ---------------------------------------------------------------------------------------------
// Reading

/// Reads a record: JSON, the format, the version, the digest, then every member.
///
/// # Errors
/// Every [`RecordError`] but `Inputs`, `ResultDiffers` and `NotRecordable`, with a message
/// naming the member and what is allowed. Never panics, on any text of any size: the JSON
/// reader refuses nesting deeper than 128 levels.
pub fn read_record(text: &str) -> Result<SignoffRecord, RecordError> {
    if text.trim().is_empty() {
        return Err(RecordError::Empty);
    }
    let value: Value = serde_json::from_str(text).map_err(|e| match e.classify() {
        serde_json::error::Category::Eof => RecordError::Truncated { line: e.line() },
        _ => RecordError::NotJson {
            detail: e.to_string(),
        },
    })?;
    let Value::Object(mut members) = value else {
        return Err(RecordError::NotARecord {
            detail: format!("it is {}, not an object", json_kind(&value)),
        });
    };
    match members.get("format") {
        None => {
            return Err(RecordError::NotARecord {
                detail: "it has no \"format\" member".into(),
            });
        }
        Some(Value::String(f)) if f == RECORD_FORMAT => {}
        Some(Value::String(f)) => return Err(RecordError::UnknownFormat { found: f.clone() }),
        Some(other) => {
            return Err(RecordError::UnknownFormat {
                found: other.to_string(),
            });
        }
    }
    check_version(&members)?;
    let stored = match members.remove("digest") {
        None => {
            return Err(RecordError::MissingField {
                field: "digest".into(),
            });
        }
        Some(Value::String(d)) => d,
        Some(other) => {
            return Err(RecordError::BadField {
                field: "digest".into(),
                detail: format!(
                    "{} is not allowed; give the 64 hex digits of a SHA-256",
                    json_kind(&other)
                ),
            });
        }
    };
    let computed = digest_of_members(&members);
    if !stored.eq_ignore_ascii_case(&computed) {
        return Err(RecordError::Changed { stored, computed });
    }
    if let Some(extra) = members.keys().find(|k| !MEMBERS.contains(&k.as_str())) {
        return Err(RecordError::BadField {
            field: extra.clone(),
            detail: format!(
                "is not a member of a version {RECORD_VERSION} record; its members are {}",
                MEMBERS.join(", ")
            ),
        });
    }
    let mut take = |field: &str| {
        members
            .remove(field)
            .ok_or_else(|| RecordError::MissingField {
                field: field.into(),
            })
    };
    let record = SignoffRecord {
        format: RECORD_FORMAT.into(),
        format_version: RECORD_VERSION,
        app_version: decode("app_version", &[], take("app_version")?)?,
        build_commit: decode("build_commit", &[], take("build_commit")?)?,
        created_utc: decode("created_utc", &[], take("created_utc")?)?,
        view: decode("view", &[], take("view")?)?,
        inputs: decode("inputs", &["workbench", "lots"], take("inputs")?)?,
        results: decode(
            "results",
            &["sections", "models", "notes"],
            take("results")?,
        )?,
        digest: stored,
    };
    check_consistent(&record)?;
    Ok(record)
}

fn check_version(members: &serde_json::Map<String, Value>) -> Result<(), RecordError> {
    let app_version = members
        .get("app_version")
        .and_then(Value::as_str)
        .map(str::to_owned);
    match members.get("format_version") {
        None => Err(RecordError::MissingField {
            field: "format_version".into(),
        }),
        Some(Value::Number(n)) => match n.as_u64() {
            Some(v) if v == u64::from(RECORD_VERSION) => Ok(()),
            Some(v) if v > u64::from(RECORD_VERSION) => Err(RecordError::NewerVersion {
                found: v,
                app_version,
            }),
            _ => Err(RecordError::UnsupportedVersion {
                found: n.to_string(),
            }),
        },
        Some(other) => Err(RecordError::UnsupportedVersion {
            found: other.to_string(),
        }),
    }
}

/// One member, decoded; the serde complaint is kept, prefixed with the member's name. A
/// member missing right inside it (one of `direct`) is named by its path; one missing deeper
/// is named alone (serde does not say where).
fn decode<T: serde::de::DeserializeOwned>(
    field: &str,
    direct: &[&str],
    value: Value,
) -> Result<T, RecordError> {
    serde_json::from_value(value).map_err(|e| {
        let detail = e.to_string();
        match detail
            .strip_prefix("missing field `")
            .and_then(|rest| rest.split_once('`'))
        {
            Some((inner, _)) if direct.contains(&inner) => RecordError::MissingField {
                field: format!("{field}.{inner}"),
            },
            Some((inner, _)) => RecordError::BadField {
                field: field.into(),
                detail: format!(
                    "a member \"{inner}\" is missing inside it; every sign-off record has it"
                ),
            },
            None => RecordError::BadField {
                field: field.into(),
                detail: format!("{detail}; a version {RECORD_VERSION} record cannot have it"),
            },
        }
    })
}

fn check_consistent(record: &SignoffRecord) -> Result<(), RecordError> {
    if RecordedView::of(record.inputs.workbench.view) != record.view {
        return Err(RecordError::BadField {
            field: "inputs.workbench.view".into(),
            detail: format!(
                "{:?} does not match the record's view; a record of a {} has view {:?}",
                record.inputs.workbench.view,
                record.view.title().to_lowercase(),
                record.view.view()
            ),
        });
    }
    let lots = record.view == RecordedView::LotComparison;
    match (&record.inputs.lots, lots) {
        (None, true) => Err(RecordError::MissingField {
            field: "inputs.lots".into(),
        }),
        (Some(_), false) => Err(RecordError::BadField {
            field: "inputs.lots".into(),
            detail: "only a lot comparison carries lot files; give null".into(),
        }),
        _ => Ok(()),
    }
}

fn json_kind(value: &Value) -> &'static str {
    match value {
        Value::Null => "null",
        Value::Bool(_) => "true or false",
        Value::Number(_) => "a number",
        Value::String(_) => "text",
        Value::Array(_) => "a list",
        Value::Object(_) => "an object",
    }
}

// ---------------------------------------------------------------------------------------------
// Replaying

/// A record recomputed: every result identical.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Replayed {
    /// How many values were compared (all identical).
    pub values: usize,
    /// The recomputed results (identical to the record's).
    pub results: RecordResults,
}

/// Recomputes every result of `record` from its inputs and compares it with the recorded one:
/// the exact value, the text shown and the unit, then the models and the notes.
///
/// # Errors
/// [`RecordError::Inputs`] when the inputs cannot be computed; [`RecordError::ResultDiffers`]
/// naming the first result that differs, from what to what.
pub fn replay(record: &SignoffRecord) -> Result<Replayed, RecordError> {
    let results = compute(record.view, &record.inputs).map_err(|reason| RecordError::Inputs {
        reason: format!("this bandgauge cannot compute the recorded inputs: {reason}"),
    })?;
    compare(&record.results, &results, record)?;
    Ok(Replayed {
        values: results.value_count(),
        results,
    })
}

fn compare(
    recorded: &RecordResults,
    now: &RecordResults,
    record: &SignoffRecord,
) -> Result<(), RecordError> {
    let differs = |place: String, recorded: String, recomputed: String| {
        Err(RecordError::ResultDiffers {
            place,
            recorded,
            recomputed,
            written_by: format!("{} (build {})", record.app_version, record.build_commit),
        })
    };
    let none = || "nothing".to_string();
    let longest = recorded.sections.len().max(now.sections.len());
    for i in 0..longest {
        let (a, b) = (recorded.sections.get(i), now.sections.get(i));
        let (Some(a), Some(b)) = (a, b) else {
            return differs(
                format!("table {}", i + 1),
                a.map_or_else(none, |s| format!("table '{}'", s.title)),
                b.map_or_else(none, |s| format!("table '{}'", s.title)),
            );
        };
        if a.title != b.title || a.columns != b.columns {
            return differs(
                format!("table {}", i + 1),
                format!("'{}' ({})", a.title, a.columns.join(", ")),
                format!("'{}' ({})", b.title, b.columns.join(", ")),
            );
        }
        for j in 0..a.rows.len().max(b.rows.len()) {
            let (ra, rb) = (a.rows.get(j), b.rows.get(j));
            let (Some(ra), Some(rb)) = (ra, rb) else {
                return differs(
                    format!("'{}', row {}", a.title, j + 1),
                    ra.map_or_else(none, |r| format!("row '{}'", r.label)),
                    rb.map_or_else(none, |r| format!("row '{}'", r.label)),
                );
            };
            if ra.label != rb.label || ra.cells.len() != rb.cells.len() {
                return differs(
                    format!("'{}', row {}", a.title, j + 1),
                    format!("row '{}' of {} values", ra.label, ra.cells.len()),
                    format!("row '{}' of {} values", rb.label, rb.cells.len()),
                );
            }
            for (k, (ca, cb)) in ra.cells.iter().zip(&rb.cells).enumerate() {
                if ca != cb {
                    let column = a.columns.get(k + 1).map_or("value", String::as_str);
                    return differs(
                        format!("'{}' › '{}' › '{}'", a.title, ra.label, column),
                        cell_text(ca),
                        cell_text(cb),
                    );
                }
            }
        }
    }
    if recorded.models != now.models {
        let line = |m: Option<&ModelLine>| {
            m.map_or_else(none, |m| {
                format!("{}: {} ({})", m.quantity, m.model, m.source)
            })
        };
        let at = (0..)
            .find(|&i| recorded.models.get(i) != now.models.get(i))
            .unwrap_or(0);
        return differs(
            format!("models used, line {}", at + 1),
            line(recorded.models.get(at)),
            line(now.models.get(at)),
        );
    }
    if recorded.notes != now.notes {
        let at = (0..)
            .find(|&i| recorded.notes.get(i) != now.notes.get(i))
            .unwrap_or(0);
        return differs(
            format!("notes, line {}", at + 1),
            recorded.notes.get(at).cloned().unwrap_or_else(none),
            now.notes.get(at).cloned().unwrap_or_else(none),
        );
    }
    Ok(())
}

fn cell_text(c: &ResultCell) -> String {
    let unit = if c.unit.is_empty() {
        String::new()
    } else {
        format!(" {}", c.unit)
    };
    if c.shown == c.exact {
        format!("{}{unit}", c.shown)
    } else {
        format!("{}{unit} (exactly {})", c.shown, c.exact)
    }
}

// ---------------------------------------------------------------------------------------------
// Computing: the views' functions, laid out as the report's tables

/// The results of `view` for `inputs`, or the first input's message.
pub fn compute(view: RecordedView, inputs: &RecordInputs) -> Result<RecordResults, String> {
    let w = &inputs.workbench;
    match view {
        RecordedView::PointCalculation => point_calculation(w),
        RecordedView::TemperatureSweep => temperature_sweep(w),
        RecordedView::Conversion => conversion(w),
        RecordedView::LotComparison => lot_comparison(
            inputs
                .lots
                .as_ref()
                .ok_or("a lot comparison needs its lot files")?,
        ),
    }
}

/// The full value of a number: the shortest decimal that reads back as the same f64.
pub fn exact(value: f64) -> String {
    if value.is_finite() {
        format!("{value:e}")
    } else {
        value.to_string()
    }
}

fn number(shown: String, value: f64, unit: &str) -> ResultCell {
    ResultCell {
        shown,
        exact: exact(value),
        unit: unit.into(),
    }
}

fn optional(value: Option<f64>, show: impl Fn(f64) -> String) -> ResultCell {
    match value {
        Some(v) => number(show(v), v, ""),
        None => words(""),
    }
}

fn words(text: impl Into<String>) -> ResultCell {
    let text = text.into();
    ResultCell {
        shown: text.clone(),
        exact: text,
        unit: String::new(),
    }
}

fn row(label: impl Into<String>, cells: Vec<ResultCell>) -> ResultRow {
    ResultRow {
        label: label.into(),
        cells,
    }
}

fn section(title: &str, columns: &[&str], rows: Vec<ResultRow>) -> ResultSection {
    ResultSection {
        title: title.into(),
        columns: columns.iter().map(|c| (*c).to_owned()).collect(),
        rows,
    }
}

fn model_lines(list: Vec<(String, String, String)>) -> Vec<ModelLine> {
    list.into_iter()
        .map(|(quantity, model, source)| ModelLine {
            quantity,
            model,
            source,
        })
        .collect()
}

/// The number behind a result line of the carriers view, by its test id.
fn line_value(id: &str, o: &carriers::Outcome) -> Option<f64> {
    let eq = &o.equilibrium;
    let t = o.transport.as_ref().ok();
    match id {
        "eg" => Some(eq.band_gap_ev),
        "nc" => Some(eq.nc_cm3),
        "nv" => Some(eq.nv_cm3),
        "ni" => Some(eq.intrinsic_cm3),
        "n" => Some(eq.electrons_cm3),
        "p" => Some(eq.holes_cm3),
        "ef-ev" => Some(eq.fermi_minus_valence_ev),
        "ef-ec" => Some(eq.fermi_minus_conduction_ev),
        "ef-mid" => Some(eq.fermi_minus_midgap_ev),
        "mu-n" => t.map(|t| t.electron_mobility_cm2_per_v_s),
        "mu-p" => t.map(|t| t.hole_mobility_cm2_per_v_s),
        "resistivity" => t.map(|t| t.resistivity_ohm_cm),
        "sheet-resistance" => o.sheet_ohm_sq.as_ref().ok().copied(),
        _ => None,
    }
}

fn lines_section(title: &str, lines: &[carriers::Line], o: &carriers::Outcome) -> ResultSection {
    let rows = lines
        .iter()
        .map(|&(id, term, unit, show)| {
            let shown = show(o);
            let cell = match line_value(id, o) {
                Some(v) => number(shown, v, unit),
                None => ResultCell {
                    unit: unit.into(),
                    ..words(shown)
                },
            };
            row(term, vec![cell])
        })
        .collect();
    section(title, &["Quantity", "Value"], rows)
}

fn point_calculation(w: &Workbench) -> Result<RecordResults, String> {
    let request = carriers::request_from_inputs(&w.carriers)?;
    let o = carriers::evaluate(&request)?;
    let species = o
        .equilibrium
        .species
        .iter()
        .map(|s| {
            let level_ev = s.level_from_band_edge_ev;
            let level = match s.kind {
                DopantKind::Donor => format!("Ec − {:.0} meV", 1e3 * level_ev),
                DopantKind::Acceptor => format!("Ev + {:.0} meV", 1e3 * level_ev),
            };
            row(
                format!("{} ({})", s.symbol, s.kind),
                vec![
                    number(level, level_ev, ""),
                    words(s.level_model.id()),
                    number(format::sci(s.density_cm3), s.density_cm3, ""),
                    number(format::sci(s.ionized_cm3), s.ionized_cm3, ""),
                    number(
                        format::percent(s.ionized_fraction, 2),
                        s.ionized_fraction,
                        "",
                    ),
                ],
            )
        })
        .collect();
    let mut notes = Vec::new();
    if let Err(e) = &o.transport {
        notes.push(format!("transport: {e}"));
    }
    Ok(RecordResults {
        sections: vec![
            lines_section("Bands and carriers", &carriers::BAND_LINES, &o),
            lines_section("Transport", &carriers::TRANSPORT_LINES, &o),
            section(
                "Ionization by species",
                &[
                    "Species",
                    "Level (eV from its band edge)",
                    "Level model",
                    "Density (cm⁻³)",
                    "Ionized (cm⁻³)",
                    "Ionized fraction",
                ],
                species,
            ),
        ],
        models: model_lines(carriers::models_used(&o)),
        notes,
    })
}

fn temperature_sweep(w: &Workbench) -> Result<RecordResults, String> {
    let (material, doping, options) = carriers::problem_from_inputs(&w.carriers)?;
    let from_k = entry::temperature_k("from", &w.sweep.from)?;
    let to_k = entry::temperature_k("to", &w.sweep.to)?;
    let count = entry::count("points", &w.sweep.points, 2, sweep::MAX_POINTS)?;
    let s = sweep::evaluate(&material, &doping, &options, from_k, to_k, count)?;
    let species: Vec<String> = s
        .points
        .first()
        .map(|e| {
            e.species
                .iter()
                .map(|sp| format!("{} ionized fraction", sp.symbol))
                .collect()
        })
        .unwrap_or_default();
    let mut columns = vec![
        "T (K)",
        "n (cm⁻³)",
        "p (cm⁻³)",
        "ni (cm⁻³)",
        "EF − Ev (eV)",
        "Regime",
    ];
    columns.extend(species.iter().map(String::as_str));
    let rows = s
        .points
        .iter()
        .map(|e| {
            let mut cells = vec![
                number(format::sci(e.electrons_cm3), e.electrons_cm3, ""),
                number(format::sci(e.holes_cm3), e.holes_cm3, ""),
                number(format::sci(e.intrinsic_cm3), e.intrinsic_cm3, ""),
                number(
                    format::fixed(e.fermi_minus_valence_ev, 4),
                    e.fermi_minus_valence_ev,
                    "",
                ),
                words(e.regime.to_string()),
            ];
            cells.extend(e.species.iter().map(|sp| {
                number(
                    format::fixed(sp.ionized_fraction, 4),
                    sp.ionized_fraction,
                    "",
                )
            }));
            ResultRow {
                label: format::linear_tick(e.temperature_k),
                cells,
            }
        })
        .collect();
    let models = s
        .points
        .first()
        .map(|e| {
            e.models
                .iter()
                .map(|m| ModelLine {
                    quantity: m.quantity.to_string(),
                    model: m.model.to_string(),
                    source: m.source.to_string(),
                })
                .collect()
        })
        .unwrap_or_default();
    let notes = s
        .failures
        .iter()
        .map(|(n, why)| {
            format!(
                "{n} of {} temperatures could not be solved and are left out: {why}",
                s.temperatures_k.len()
            )
        })
        .collect();
    Ok(RecordResults {
        sections: vec![section(
            "Carriers and Fermi level by temperature",
            &columns,
            rows,
        )],
        models,
        notes,
    })
}

fn conversion(w: &Workbench) -> Result<RecordResults, String> {
    let c = &w.conversion;
    let value = match c.given {
        Given::Resistivity => {
            entry::positive("resistivity", &c.value, QuantityKind::Resistivity, "ohm-cm")?
        }
        Given::Density => entry::positive("density", &c.value, QuantityKind::Density, "cm^-3")?,
    };
    if !EmpiricalRelation::applicable("si", &c.dopant) {
        return Err(format!(
            "species: '{}' has no resistivity relation; choose B, P, As or Sb",
            c.dopant
        ));
    }
    let comparison = resistivity::compare_at_23c(c.given, value, &c.dopant)?;
    let reference = comparison
        .answers
        .iter()
        .find(|a| a.model == ConversionModel::Empirical)
        .and_then(|a| resistivity::answer_value(a, c.given));
    let mut rows: Vec<ResultRow> = comparison
        .answers
        .iter()
        .map(|a| {
            let value = resistivity::answer_value(a, c.given);
            let deviation = match (value, reference) {
                (Some(v), Some(r)) if a.model != ConversionModel::Empirical => {
                    let d = 100.0 * (v / r - 1.0);
                    number(format!("{d:+.1} %"), d, "")
                }
                _ => words(""),
            };
            let mut remarks = Vec::new();
            if let Some(e) = &a.error {
                remarks.push(e.clone());
            }
            if a.model == ConversionModel::Empirical {
                remarks.push(empirical::EMPIRICAL_REFERENCE.to_string());
            } else if let ConversionModel::Physics(m) = a.model {
                remarks.push(m.reference().to_string());
            }
            remarks.extend(a.notes.iter().cloned());
            row(
                a.model_name.clone(),
                vec![
                    value.map_or_else(|| words("—"), |v| number(format::auto(v), v, "")),
                    deviation,
                    words(remarks.join("; ")),
                ],
            )
        })
        .collect();
    rows.push(row(
        "Spread: largest / smallest",
        vec![
            comparison.spread.as_ref().map_or_else(
                || words("—"),
                |s| {
                    number(
                        format!("{} ({} models)", format::fixed(s.ratio, 3), s.models),
                        s.ratio,
                        "",
                    )
                },
            ),
            words(""),
            words("How far the published models disagree for this sample."),
        ],
    ));
    let answer_column = match c.given {
        Given::Density => "Resistivity (Ω·cm)",
        Given::Resistivity => "Dopant density (cm⁻³)",
    };

    let probe_inputs = resistivity::read_probe(c);
    let probe = match resistivity::evaluate_probe(&probe_inputs, &c.dopant) {
        Some(r) => r?,
        None => return Err(first_probe_problem(&probe_inputs)),
    };
    let density = empirical::convert(
        "si",
        &c.dopant,
        EmpiricalInput::ResistivityOhmCm(probe.resistivity_ohm_cm),
    );
    let probe_rows = vec![
        row(
            "Sheet resistance Rs",
            vec![match probe.sheet_resistance_ohm_sq {
                Some(v) => number(format::auto(v), v, "Ω/□"),
                None => words("— (bulk)"),
            }],
        ),
        row(
            "Resistivity ρ (23 C)",
            vec![number(
                format::auto(probe.resistivity_ohm_cm),
                probe.resistivity_ohm_cm,
                "Ω·cm",
            )],
        ),
        row("Geometry", vec![words(probe.geometry)]),
        row(
            "Dopant density (empirical)",
            vec![match &density {
                Ok(d) => number(format::sci(d.density_cm3), d.density_cm3, "cm⁻³"),
                Err(_) => words("out of range"),
            }],
        ),
    ];
    let corrections = probe
        .corrections
        .iter()
        .map(|f| {
            row(
                f.name,
                vec![
                    number(format::fixed(f.value, 5), f.value, ""),
                    words(f.source.clone()),
                ],
            )
        })
        .collect();
    Ok(RecordResults {
        sections: vec![
            section(
                "Every model side by side (silicon, 23 C)",
                &["Model", answer_column, "vs empirical", "Source and remarks"],
                rows,
            ),
            section(
                "Four-point probe result",
                &["Quantity", "Value"],
                probe_rows,
            ),
            section(
                "Probe corrections applied",
                &["Correction", "Factor", "Basis"],
                corrections,
            ),
        ],
        models: model_lines(resistivity::models_used(Some(&probe))),
        notes: Vec::new(),
    })
}

fn first_probe_problem(p: &resistivity::ProbeInputs) -> String {
    [
        p.amps.as_ref().err(),
        p.volts.as_ref().err(),
        p.spacing_cm.as_ref().err(),
        p.thickness_cm.as_ref().err(),
        p.diameter_cm.as_ref().err(),
        p.temperature_c.as_ref().err(),
    ]
    .into_iter()
    .flatten()
    .next()
    .cloned()
    .unwrap_or_else(|| "probe: an input is not valid".into())
}

fn lot_comparison(lots: &LotInputs) -> Result<RecordResults, String> {
    let dopant = (!lots.default_dopant.is_empty()).then(|| lots.default_dopant.clone());
    let mut work = LotsWork::new(dopant);
    for f in &lots.files {
        work.read_text(&f.name, &f.text);
    }
    let spec = lots_view::spec_from_inputs(&lots.spec_quantity, &lots.spec_min, &lots.spec_max)
        .map_err(|e| format!("spec window: {e}"))?;
    let report = work.report(spec.as_ref());
    let unit = match spec.as_ref().map(|s| s.quantity()) {
        Some(bandgauge_core::lots::SpecQuantity::Density) => "cm^-3",
        _ => "ohm cm",
    };
    let margin = format!("margin, {unit}");
    let count = |n: u64| number(n.to_string(), n as f64, "");

    let files = work
        .files
        .iter()
        .map(|f| {
            row(
                f.name.clone(),
                vec![
                    count(f.counts.read),
                    count(f.counts.converted),
                    count(f.counts.rejected),
                    words(f.error.clone().unwrap_or_default()),
                ],
            )
        })
        .collect();
    let window = row(
        "Spec window",
        vec![words(spec.as_ref().map_or_else(
            || "none (no verdicts)".to_owned(),
            ToString::to_string,
        ))],
    );
    let lot_rows = report
        .lots
        .iter()
        .map(|l| {
            let r = &l.resistivity_ohm_cm;
            row(
                l.lot.clone(),
                vec![
                    words(format!("{} ({})", l.dopant, l.conductivity_type.as_str())),
                    count(l.wafers as u64),
                    count(l.sites),
                    number(format::auto(r.mean), r.mean, ""),
                    number(format::auto(r.median), r.median, ""),
                    optional(r.std, format::auto),
                    optional(r.nonuniformity_percent, |p| format::fixed(p, 2)),
                    number(format::sci(l.density_cm3.mean), l.density_cm3.mean, ""),
                    words(l.verdict.map(|v| v.as_str()).unwrap_or("")),
                    optional(l.margin, format::auto),
                    words(l.worst_wafer.clone().unwrap_or_default()),
                    optional(l.cpk, |c| format::fixed(c, 2)),
                ],
            )
        })
        .collect();
    let wafer_rows = report
        .lots
        .iter()
        .flat_map(|l| {
            l.wafer_results.iter().map(move |w| {
                let r = &w.resistivity_ohm_cm;
                row(
                    format!("{} / {}", l.lot, w.wafer),
                    vec![
                        count(w.sites),
                        number(format::auto(r.mean), r.mean, ""),
                        optional(r.nonuniformity_percent, |p| format::fixed(p, 2)),
                        number(format::sci(w.density_cm3.mean), w.density_cm3.mean, ""),
                        words(w.judgement.map(|j| j.verdict.as_str()).unwrap_or("")),
                        optional(w.judgement.map(|j| j.margin), format::auto),
                        w.sites_outside.map_or_else(|| words(""), &count),
                    ],
                )
            })
        })
        .collect();
    let differences = lots_view::difference_lines(&report, None)
        .into_iter()
        .enumerate()
        .map(|(i, line)| row((i + 1).to_string(), vec![words(line)]))
        .collect();
    let rejected = work
        .rejected
        .iter()
        .map(|r| {
            let reason = if r.column.is_empty() {
                r.reason.clone()
            } else {
                format!("{}: {}", r.column, r.reason)
            };
            row(format!("{}, line {}", r.file, r.line), vec![words(reason)])
        })
        .collect();
    let mut notes: Vec<String> = work
        .files
        .iter()
        .flat_map(|f| f.notes.iter().map(move |n| format!("{}: {n}", f.name)))
        .collect();
    notes.extend(report.notes.iter().cloned());
    let d = report.definitions;
    notes.extend(
        [
            d.nonuniformity,
            d.std,
            d.median,
            d.wafer_verdict,
            d.lot_verdict,
            d.uncertainty,
            d.cpk,
            d.lot_difference,
        ]
        .map(str::to_owned),
    );
    let total = work.counts();
    let mut file_rows: Vec<ResultRow> = files;
    file_rows.push(row(
        "all files",
        vec![
            count(total.read),
            count(total.converted),
            count(total.rejected),
            words(""),
        ],
    ));
    Ok(RecordResults {
        sections: vec![
            section(
                "Files read",
                &[
                    "File",
                    "Rows read",
                    "Converted",
                    "Rejected",
                    "Could not be read",
                ],
                file_rows,
            ),
            section("Spec window", &["", "As read"], vec![window]),
            section(
                "Lots",
                &[
                    "Lot",
                    "Dopant",
                    "Wafers",
                    "Sites",
                    "Mean, ohm cm",
                    "Median, ohm cm",
                    "Std, ohm cm",
                    "Std/mean, %",
                    "Mean, cm^-3",
                    "Verdict",
                    &margin,
                    "Worst wafer",
                    "Cpk",
                ],
                lot_rows,
            ),
            section(
                "Wafers",
                &[
                    "Lot / wafer",
                    "Sites",
                    "Mean, ohm cm",
                    "Std/mean, %",
                    "Mean, cm^-3",
                    "Verdict",
                    &margin,
                    "Sites outside",
                ],
                wafer_rows,
            ),
            section("Do the lots differ?", &["", "Test"], differences),
            section("Rejected rows", &["File and line", "Reason"], rejected),
        ],
        models: model_lines(lots_view::models_used(&report)),
        notes,
    })
}

/// The lot inputs of a record from what the lots view holds, or why there can be none.
pub fn lot_inputs(snapshot: &lots_view::LotsSnapshot) -> Result<LotInputs, RecordError> {
    let refuse = |reason: String| Err(RecordError::NotRecordable { reason });
    if snapshot.busy {
        return refuse("lot files are being read; wait until reading ends".into());
    }
    let Some(files) = &snapshot.files else {
        return refuse(format!(
            "the lot files are larger than a record carries ({} MiB in all at most)",
            lots_view::MAX_RECORDED_BYTES / (1024 * 1024)
        ));
    };
    let mut out = Vec::with_capacity(files.len());
    for (name, bytes) in files {
        match String::from_utf8(bytes.clone()) {
            Ok(text) => out.push(LotFile {
                name: name.clone(),
                text,
            }),
            Err(_) => {
                return refuse(format!(
                    "{name} is not UTF-8 text; a record carries text files only"
                ));
            }
        }
    }
    Ok(LotInputs {
        default_dopant: snapshot.read_dopant.clone(),
        spec_quantity: snapshot.inputs.quantity.clone(),
        spec_min: snapshot.inputs.spec_min.clone(),
        spec_max: snapshot.inputs.spec_max.clone(),
        files: out,
    })
}

/// The inputs of a record as the report lists them: `(label, as typed)`.
pub fn input_lines(record: &SignoffRecord) -> Vec<(String, String)> {
    let w = &record.inputs.workbench;
    let c = &w.carriers;
    let mut lines: Vec<(String, String)> = Vec::new();
    let mut push = |label: &str, value: &str| lines.push((label.to_owned(), value.to_owned()));
    let carriers_lines = |push: &mut dyn FnMut(&str, &str)| {
        push("Material", &c.material);
        push("Temperature", &c.temperature);
        if c.dopants.is_empty() {
            push("Dopants", "none (intrinsic)");
        }
        for (i, d) in c.dopants.iter().enumerate() {
            push(
                &format!("Dopant {}", i + 1),
                &format!("{} {}", d.species, d.density),
            );
        }
        push("Layer thickness", &c.thickness);
        push("Intrinsic density model", &c.intrinsic_model);
        push("Dopant-level model", &c.ionization_model);
        push(
            "Band-gap narrowing",
            if c.band_gap_narrowing { "on" } else { "off" },
        );
        let mobility = if c.mobility_model.is_empty() {
            "first that applies"
        } else {
            &c.mobility_model
        };
        push("Mobility model", mobility);
    };
    match record.view {
        RecordedView::PointCalculation => carriers_lines(&mut push),
        RecordedView::TemperatureSweep => {
            carriers_lines(&mut push);
            push("Sweep from", &w.sweep.from);
            push("Sweep to", &w.sweep.to);
            push("Temperatures", &w.sweep.points);
        }
        RecordedView::Conversion => {
            let v = &w.conversion;
            let given = match v.given {
                Given::Resistivity => "Resistivity given",
                Given::Density => "Dopant density given",
            };
            push(given, &v.value);
            push("Dopant", &v.dopant);
            push("Probe current", &v.probe_current);
            push("Probe voltage", &v.probe_voltage);
            push("Probe spacing", &v.probe_spacing);
            push("Sample thickness", &v.sample_thickness);
            push("Wafer diameter", &v.wafer_diameter);
            push("Temperature of the reading", &v.probe_temperature);
        }
        RecordedView::LotComparison => {
            if let Some(l) = &record.inputs.lots {
                push("Spec limits on", &l.spec_quantity);
                push("Lower limit", &l.spec_min);
                push("Upper limit", &l.spec_max);
                let dopant = if l.default_dopant.is_empty() {
                    "none (files must say)"
                } else {
                    &l.default_dopant
                };
                push("Dopant for rows without one", dopant);
                for f in &l.files {
                    let sha: String = Sha256::digest(f.text.as_bytes())
                        .iter()
                        .take(8)
                        .map(|b| format!("{b:02x}"))
                        .collect();
                    push(
                        "Lot file",
                        &format!(
                            "{} ({} bytes, {} lines, SHA-256 {sha}…)",
                            f.name,
                            f.text.len(),
                            f.text.lines().count()
                        ),
                    );
                }
            }
        }
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::state::DopantRow;

    const CREATED: &str = "2025-03-14T09:26:53Z";

    fn workbench(view: View) -> Workbench {
        let mut w = Workbench {
            view,
            ..Workbench::default()
        };
        w.carriers.dopants = vec![DopantRow::new("P", "1e16"), DopantRow::new("B", "2e15")];
        w.sweep.points = "21".into();
        w
    }

    fn demo_lots() -> LotInputs {
        LotInputs {
            default_dopant: String::new(),
            spec_quantity: "resistivity".into(),
            spec_min: lots_view::DEMO_SPEC.0.into(),
            spec_max: lots_view::DEMO_SPEC.1.into(),
            files: lots_view::DEMO_FILES
                .iter()
                .map(|(name, text)| LotFile {
                    name: (*name).into(),
                    text: (*text).into(),
                })
                .collect(),
        }
    }

    fn record(view: View) -> SignoffRecord {
        let lots = (view == View::Lots).then(demo_lots);
        capture(
            RecordInputs {
                workbench: workbench(view),
                lots,
            },
            CREATED,
        )
        .expect("valid inputs")
    }

    fn written(view: View) -> String {
        to_json(&record(view))
    }

    /// A record's text with one member replaced and the digest recomputed, as someone who
    /// knows the format could do.
    fn redigested(text: &str, change: impl FnOnce(&mut Value)) -> String {
        let mut value: Value = serde_json::from_str(text).expect("json");
        change(&mut value);
        let members = value.as_object_mut().expect("object");
        members.remove("digest");
        let digest = digest_of_value(&value);
        value["digest"] = Value::String(digest);
        value.to_string()
    }

    fn refused(text: &str) -> String {
        match read_record(text) {
            Ok(_) => panic!("read a bad record"),
            Err(e) => e.to_string(),
        }
    }

    #[test]
    fn every_view_round_trips_to_identical_results() {
        for view in View::ALL {
            let original = record(view);
            let text = to_json(&original);
            let back = read_record(&text).unwrap_or_else(|e| panic!("{view:?}: {e}"));
            assert_eq!(back, original, "{view:?}");
            let replayed = replay(&back).unwrap_or_else(|e| panic!("{view:?}: {e}"));
            assert_eq!(replayed.results, original.results, "{view:?}");
            assert!(replayed.values > 5, "{view:?}: {}", replayed.values);
        }
    }

    #[test]
    fn records_hold_what_each_view_shows() {
        let point = record(View::Carriers);
        let titles: Vec<&str> = point
            .results
            .sections
            .iter()
            .map(|s| s.title.as_str())
            .collect();
        assert_eq!(
            titles,
            ["Bands and carriers", "Transport", "Ionization by species"]
        );
        // The same outcome the carriers view shows, value for value.
        let request = carriers::request_from_inputs(&point.inputs.workbench.carriers).unwrap();
        let o = carriers::evaluate(&request).unwrap();
        let n = &point.results.sections[0].rows[4];
        assert_eq!(n.label, "Electrons n");
        assert_eq!(n.cells[0].exact, exact(o.equilibrium.electrons_cm3));
        assert_eq!(n.cells[0].shown, format::sci(o.equilibrium.electrons_cm3));
        assert_eq!(n.cells[0].unit, "cm⁻³");
        assert_eq!(
            exact(o.equilibrium.electrons_cm3).parse::<f64>(),
            Ok(o.equilibrium.electrons_cm3)
        );
        assert!(
            point
                .results
                .models
                .iter()
                .any(|m| m.quantity.contains("mobility"))
        );

        let sweep = record(View::Sweep);
        assert_eq!(sweep.results.sections[0].rows.len(), 21);

        let lots = record(View::Lots);
        let verdicts: Vec<(&str, &str)> = lots.results.sections[2]
            .rows
            .iter()
            .map(|r| (r.label.as_str(), r.cells[8].shown.as_str()))
            .collect();
        // Source: the demo scenario, demo-wafers/README.md (invented data).
        assert_eq!(
            verdicts,
            [
                ("C2-4417", "pass"),
                ("C2-4418", "pass"),
                ("C2-4421", "fail"),
                ("C2-4425", "marginal")
            ]
        );
        assert_eq!(
            lots.results.sections[1].rows[0].cells[0].shown,
            "resistivity 8 to 12 ohm-cm"
        );
    }

    #[test]
    fn invalid_inputs_are_not_recorded() {
        let mut w = workbench(View::Carriers);
        w.carriers.temperature = "-5 K".into();
        let err = capture(
            RecordInputs {
                workbench: w,
                lots: None,
            },
            CREATED,
        )
        .unwrap_err();
        assert_eq!(
            err.to_string(),
            "inputs: temperature: -5 K is not allowed; give a temperature above 0 K (-273.15 C)"
        );
        let err = capture(
            RecordInputs {
                workbench: workbench(View::Lots),
                lots: None,
            },
            CREATED,
        )
        .unwrap_err();
        assert_eq!(
            err.to_string(),
            "no record written: no lot files are read; pick files or load the demo lots first"
        );
    }

    #[test]
    fn tampered_input_is_refused_by_the_digest() {
        let text = written(View::Carriers).replace("\"1e16\"", "\"2e16\"");
        assert!(refused(&text).starts_with(
            "digest: the record was changed after it was written (its contents give digest "
        ));
        assert!(refused(&text).ends_with("; ask its author for the original file"));
    }

    #[test]
    fn tampered_result_is_refused_by_the_digest() {
        let original = record(View::Carriers);
        let shown = &original.results.sections[0].rows[4].cells[0].exact;
        let text = to_json(&original).replacen(shown.as_str(), "1.5e16", 1);
        assert_ne!(text, to_json(&original));
        let message = refused(&text);
        assert!(
            message.starts_with("digest: the record was changed"),
            "{message}"
        );
        assert!(message.contains(&short(&original.digest)), "{message}");
    }

    #[test]
    fn tampered_digest_is_refused() {
        let original = record(View::Resistivity);
        let text = to_json(&original).replace(&original.digest, &"0".repeat(64));
        let message = refused(&text);
        assert_eq!(
            message,
            format!(
                "digest: the record was changed after it was written (its contents give digest \
                 {}, the record says 000000000000…); ask its author for the original file",
                short(&original.digest)
            )
        );
    }

    #[test]
    fn a_result_edited_with_a_new_digest_is_caught_by_the_replay() {
        let text = redigested(&written(View::Carriers), |v| {
            v["results"]["sections"][0]["rows"][4]["cells"][0]["shown"] =
                Value::String("9.999e15".into());
        });
        let record = read_record(&text).expect("a consistent record");
        let message = replay(&record).unwrap_err().to_string();
        assert!(
            message.starts_with(
                "result 'Bands and carriers' › 'Electrons n' › 'Value': the record says 9.999e15 cm⁻³ (exactly "
            ),
            "{message}"
        );
        assert!(
            message.ends_with(&format!(
                "; the record was written by bandgauge {APP_VERSION} (build {BUILD_COMMIT})"
            )),
            "{message}"
        );
    }

    #[test]
    fn an_input_edited_with_a_new_digest_is_caught_by_the_replay() {
        let text = redigested(&written(View::Lots), |v| {
            v["inputs"]["lots"]["spec_max"] = Value::String("10".into());
        });
        let record = read_record(&text).expect("a consistent record");
        let message = replay(&record).unwrap_err().to_string();
        assert!(
            message.starts_with("result 'Spec window' › 'Spec window' › 'As read': the record says resistivity 8 to 12 ohm-cm, this bandgauge"),
            "{message}"
        );
        assert!(
            message.contains("computes resistivity 8 to 10 ohm-cm;"),
            "{message}"
        );
    }

    #[test]
    fn newer_version_is_refused_naming_both_versions() {
        let text = redigested(&written(View::Carriers), |v| {
            v["format_version"] = Value::from(2);
            v["app_version"] = Value::String("9.1.0".into());
        });
        assert_eq!(
            refused(&text),
            format!(
                "format_version: the record was made by a newer bandgauge (record version 2); \
                 this bandgauge ({APP_VERSION}) reads record version 1 only; open it with \
                 bandgauge 9.1.0 or later"
            )
        );
        // A newer record is refused before its digest is looked at: its layout may differ.
        let text =
            written(View::Carriers).replacen("\"format_version\": 1", "\"format_version\": 7", 1);
        assert!(refused(&text).contains("(record version 7)"));
    }

    #[test]
    fn unknown_and_older_versions_are_refused() {
        for (version, shown) in [("0", "0"), ("-1", "-1"), ("1.5", "1.5"), ("\"1\"", "\"1\"")] {
            let text = written(View::Carriers).replacen(
                "\"format_version\": 1",
                &format!("\"format_version\": {version}"),
                1,
            );
            assert_eq!(
                refused(&text),
                format!(
                    "format_version: {shown} is not a record version bandgauge ever wrote; this \
                     bandgauge reads record version 1"
                )
            );
        }
    }

    #[test]
    fn unknown_format_is_refused() {
        let text = written(View::Carriers).replacen(RECORD_FORMAT, "lab notebook page", 1);
        assert_eq!(
            refused(&text),
            "format: \"lab notebook page\" is not a format bandgauge reads; it reads \
             \"bandgauge sign-off record\""
        );
        assert_eq!(
            refused("{\"version\": 1}"),
            "the file is JSON but not a sign-off record: it has no \"format\" member; a record \
             is an object whose format is \"bandgauge sign-off record\""
        );
        assert_eq!(
            refused("[1, 2]"),
            "the file is JSON but not a sign-off record: it is a list, not an object; a record \
             is an object whose format is \"bandgauge sign-off record\""
        );
    }

    #[test]
    fn truncated_empty_and_junk_files_are_refused() {
        let text = written(View::Carriers);
        let cut = &text[..text.len() / 2];
        let line = cut.lines().count();
        assert_eq!(
            refused(cut),
            format!(
                "the file is not a complete sign-off record: its text ends early, at line \
                 {line} (cut short while copying or saving?)"
            )
        );
        let empty = "the file is empty; a sign-off record is the JSON file bandgauge saves with \
                     'Save record'";
        assert_eq!(refused(""), empty);
        assert_eq!(refused(" \n\t"), empty);
        // Binary junk as a browser hands it over: invalid bytes become U+FFFD.
        let junk = String::from_utf8_lossy(&[0x89, b'P', b'N', b'G', 0x0d, 0x0a, 0x1a, 0, 0xff]);
        assert_eq!(
            refused(&junk),
            "the file is not a sign-off record: it is not JSON text (expected value at line 1 \
             column 1)"
        );
    }

    #[test]
    fn missing_and_unknown_members_are_named() {
        let text = redigested(&written(View::Carriers), |v| {
            v.as_object_mut().unwrap().remove("created_utc");
        });
        assert_eq!(
            refused(&text),
            "created_utc: missing; every sign-off record has it"
        );
        let text = redigested(&written(View::Carriers), |v| {
            v["results"].as_object_mut().unwrap().remove("models");
        });
        assert_eq!(
            refused(&text),
            "results.models: missing; every sign-off record has it"
        );
        let text = redigested(&written(View::Carriers), |v| {
            v["inputs"]["workbench"]
                .as_object_mut()
                .unwrap()
                .remove("carriers");
        });
        assert_eq!(
            refused(&text),
            "inputs: a member \"carriers\" is missing inside it; every sign-off record has it"
        );
        let text = redigested(&written(View::Carriers), |v| {
            v["results"]["sections"][0]["rows"][0]["cells"][0]["exact"] = Value::from(1.1112);
        });
        assert_eq!(
            refused(&text),
            "results: invalid type: floating point `1.1112`, expected a string; a version 1 \
             record cannot have it"
        );
        let text = redigested(&written(View::Carriers), |v| {
            v["signed_by"] = Value::String("me".into());
        });
        assert!(refused(&text).starts_with("signed_by: is not a member of a version 1 record"));
        let text = written(View::Carriers);
        let no_digest = {
            let mut v: Value = serde_json::from_str(&text).unwrap();
            v.as_object_mut().unwrap().remove("digest");
            v.to_string()
        };
        assert_eq!(
            refused(&no_digest),
            "digest: missing; every sign-off record has it"
        );
        let text = redigested(&written(View::Carriers), |v| {
            v["view"] = Value::String("lot_comparison".into());
        });
        assert!(refused(&text).starts_with("inputs.workbench.view: Carriers does not match"));
    }

    #[test]
    fn deep_nesting_and_large_junk_never_panic() {
        for depth in [127, 128, 129, 10_000, 1_000_000] {
            let text = format!("{}{}", "[".repeat(depth), "]".repeat(depth));
            assert!(read_record(&text).is_err());
            let text = format!("{}1{}", "{\"a\":".repeat(depth), "}".repeat(depth));
            assert!(read_record(&text).is_err());
        }
        let big = format!("{{\"format\":\"{}\"}}", "x".repeat(10_000_000));
        assert!(matches!(
            read_record(&big),
            Err(RecordError::UnknownFormat { .. })
        ));
    }

    #[test]
    fn canonical_form_sorts_keys_and_escapes_like_json() {
        let v: Value = serde_json::from_str(
            "{\"b\":[1,{\"z\":null,\"a\":true}],\"a\":\"x\\n\\u0001é\",\"ä\":1,\"B\":2}",
        )
        .unwrap();
        let mut out = String::new();
        canonical_json(&v, &mut out);
        assert_eq!(
            out,
            "{\"B\":2,\"a\":\"x\\n\\u0001é\",\"b\":[1,{\"a\":true,\"z\":null}],\"ä\":1}"
        );
    }

    #[test]
    fn digest_is_sha256_of_the_canonical_text() {
        // Source: FIPS 180-2, appendix B.1: SHA-256("abc").
        assert_eq!(
            Sha256::digest(b"abc")
                .iter()
                .map(|b| format!("{b:02x}"))
                .collect::<String>(),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
        let r = record(View::Carriers);
        let mut v = serde_json::to_value(&r).unwrap();
        v.as_object_mut().unwrap().remove("digest");
        let mut text = String::new();
        canonical_json(&v, &mut text);
        let hex: String = Sha256::digest(text.as_bytes())
            .iter()
            .map(|b| format!("{b:02x}"))
            .collect();
        assert_eq!(r.digest, hex);
        assert_eq!(r.digest.len(), 64);
    }

    #[test]
    fn file_names_carry_kind_and_time() {
        assert_eq!(
            file_name(&record(View::Lots)),
            "bandgauge-record-lots-20250314T092653Z.json"
        );
    }

    #[test]
    fn input_lines_list_what_was_typed() {
        let lines = input_lines(&record(View::Carriers));
        assert!(lines.contains(&("Dopant 1".into(), "P 1e16".into())));
        assert!(lines.contains(&("Temperature".into(), "300 K".into())));
        let lines = input_lines(&record(View::Lots));
        assert_eq!(lines.iter().filter(|l| l.0 == "Lot file").count(), 4);
        assert!(lines.contains(&("Lower limit".into(), "8".into())));
    }
}
