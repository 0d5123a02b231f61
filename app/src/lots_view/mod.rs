//! The "Wafer lots" view: lot files picked or dropped (or the demo lots), read in chunks with
//! progress, a summary per lot and wafer with verdicts against a spec window, the lot
//! distribution chart with the window drawn, a wafer map, rejected rows with their lines, and
//! CSV exports. All numbers come from `bandgauge_core::lots`.
//!
//! [`LotsWork`] (`work.rs`) is the plain state, tested natively; the component (`view.rs`) only
//! displays it, with the charts of `charts.rs`, the text of `summary.rs` and the wafer table's
//! filter and sort order of `table.rs`. `reading.rs` reads
//! files in the page (Blob slices through a `FileReader`); `snapshot.rs` keeps what the view
//! holds while another view is shown and hands it to the sign-off record.

mod charts;
pub mod map;
mod reading;
mod snapshot;
mod summary;
mod table;
mod view;
mod work;

#[cfg(test)]
mod tests;

pub use charts::{distribution_chart, distribution_lines};
pub use map::{MapQuantity, radial_chart, wafer_map};
pub use snapshot::{LotsInputs, LotsSnapshot, install, is_reading, snapshot};
pub use summary::{DifferenceRow, HOLM_ADJUSTMENT, difference_rows, models_used, summary_csv};
pub use view::LotsView;
pub use work::{FileStatus, LotsWork, RejectedRow, SitePoint, spec_from_inputs};

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
pub const DEMO_FILES: [(&str, &str); 6] = [
    (
        "c2-4417.csv",
        include_str!("../../../demo-wafers/c2-4417.csv"),
    ),
    (
        "c2-4418.csv",
        include_str!("../../../demo-wafers/c2-4418.csv"),
    ),
    (
        "c2-4421.tsv",
        include_str!("../../../demo-wafers/c2-4421.tsv"),
    ),
    (
        "c2-4425-with-bad-rows.csv",
        include_str!("../../../demo-wafers/c2-4425-with-bad-rows.csv"),
    ),
    (
        "c2-4429-radial.csv",
        include_str!("../../../demo-wafers/c2-4429-radial.csv"),
    ),
    (
        "c2-4432-hot-spot.csv",
        include_str!("../../../demo-wafers/c2-4432-hot-spot.csv"),
    ),
];
/// The spec window of the demo scenario (demo-wafers/README.md), ohm cm.
pub const DEMO_SPEC: (&str, &str) = ("8", "12");
