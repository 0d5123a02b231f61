//! The sign-off record: one calculation (its inputs as typed, its results as shown, the models
//! and sources used, the bandgauge version and build) as a JSON file that bandgauge reads back
//! and recomputes, with a SHA-256 digest that tells an edited or damaged file from the original.
//!
//! Plain Rust, tested natively. Writing: [`capture`] computes the results from the inputs with
//! the views' own functions and [`to_json`] writes the file. Reading: [`read_record`] checks the
//! format, the version and the digest; [`replay`] recomputes every result and compares. A
//! record is applied to the page only after both succeed, so it is never half applied.
//!
//! One file per step: `write.rs`, `digest.rs`, `read.rs`, `replay.rs`; `compute.rs` lays out
//! each view's results as the report's tables; `inputs.rs` takes the lot files from the lots
//! view and lists the inputs for the report; `error.rs` says why a step failed.
//!
//! The digest is SHA-256 over the record without its `digest` member, written as compact JSON
//! with object keys sorted by their bytes (see [`canonical_json`]). It detects edits and
//! corruption; it is not a signature: anyone can edit a record and compute a new digest. Who
//! wrote a record is for the fab's own document control to establish.

mod compute;
mod digest;
mod error;
mod inputs;
mod read;
mod replay;
mod write;

#[cfg(test)]
mod tests;

use serde::{Deserialize, Serialize};

use crate::state::{View, Workbench};

pub use compute::{compute, exact};
pub use digest::{canonical_json, digest_of};
pub use error::RecordError;
pub use inputs::{input_lines, lot_inputs};
pub use read::read_record;
pub use replay::{Replayed, replay};
pub use write::{capture, file_name, to_json};

/// What a sign-off record says it is, in its `format` member.
pub const RECORD_FORMAT: &str = "bandgauge sign-off record";
/// The record layout this bandgauge writes and reads.
pub const RECORD_VERSION: u32 = 2;
/// [`RECORD_VERSION`] as the number read from JSON.
pub(crate) const RECORD_VERSION_U64: u64 = RECORD_VERSION as u64;
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
    /// Van der Pauw sheet resistance and Hall analysis with the cross-check (the Hall view).
    HallAnalysis,
}

impl RecordedView {
    /// The record kind of a view.
    pub fn of(view: View) -> RecordedView {
        match view {
            View::Carriers => RecordedView::PointCalculation,
            View::Sweep => RecordedView::TemperatureSweep,
            View::Resistivity => RecordedView::Conversion,
            View::Lots => RecordedView::LotComparison,
            View::Hall => RecordedView::HallAnalysis,
        }
    }

    /// The view that shows this kind.
    pub fn view(self) -> View {
        match self {
            RecordedView::PointCalculation => View::Carriers,
            RecordedView::TemperatureSweep => View::Sweep,
            RecordedView::Conversion => View::Resistivity,
            RecordedView::LotComparison => View::Lots,
            RecordedView::HallAnalysis => View::Hall,
        }
    }

    /// The title of a report of this kind.
    pub fn title(self) -> &'static str {
        match self {
            RecordedView::PointCalculation => "Point calculation",
            RecordedView::TemperatureSweep => "Temperature sweep",
            RecordedView::Conversion => "Resistivity conversion and four-point probe",
            RecordedView::LotComparison => "Wafer-lot comparison",
            RecordedView::HallAnalysis => "Van der Pauw sheet resistance and Hall analysis",
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
