//! Wafer-lot comparison: lot files of site measurements read in a stream, every site converted
//! to dopant density, statistics per wafer and lot, verdicts against a spec window, Cpk, and
//! tests of whether lots differ.
//!
//! # Public API
//! - [`LotReader`] (push parser, fed chunks of bytes) with [`ReadOptions`]; every row becomes a
//!   [`Site`] or a [`RowRejection`], reported through [`RowOutcome`]; [`RowCounts`] always add
//!   up; [`LotFileError`] when a file cannot be read at all. [`read_str`] reads a whole text.
//! - [`Column`]: the file columns (lot, wafer, site, x, y, dopant, type, resistivity,
//!   sheet_resistance, thickness, volts, amps, spacing, r_a, r_b, uncertainty).
//! - [`LotBook`]: running tallies over any number of files; [`LotBook::report`] gives a
//!   [`LotReport`] of [`LotSummary`] and [`WaferSummary`] with [`Summary`] statistics,
//!   [`Judgement`]s against a [`SpecWindow`], Cpk, [`LotDifference`] (Welch) and
//!   [`LotRankTest`] (Kruskal-Wallis).
//! - [`stats`]: the statistics and the distributions behind them.
//! - [`map`]: the wafer map's mathematics: the outline a file states ([`map::WaferOutline`]),
//!   a surface through the sites ([`map::SurfaceFit`], Delaunay triangulation and linear
//!   interpolation) and its raster, the uniformity figures and the radial profile.
//!
//! # Conversion
//! Every site goes through the empirical silicon relations of Thurber et al. (ASTM F723) at
//! 23 C ([`crate::empirical`]); four-point-probe readings through [`crate::probe::evaluate`]
//! with the finite-thickness correction; sheet resistance times thickness.
//!
//! # Example
//! ```
//! use bandgauge_core::lots::{LotBook, ReadOptions, SpecQuantity, SpecWindow, read_str};
//! let text = "lot,wafer,site,resistivity [ohm-cm]\nA1,1,1,10.1\nA1,1,2,9.9\n";
//! let mut book = LotBook::new();
//! let options = ReadOptions { default_dopant: Some("B".into()) };
//! let counts = read_str(text, &options, &mut book, &mut |_| {}).unwrap();
//! assert_eq!((counts.read, counts.converted, counts.rejected), (2, 2, 0));
//! let window = SpecWindow::parse(SpecQuantity::Resistivity, "8:12").unwrap();
//! let report = book.report(Some(&window));
//! assert_eq!(report.lots[0].verdict.unwrap().as_str(), "pass");
//! ```

mod book;
mod columns;
pub mod map;
mod reader;
pub mod stats;
mod verdict;

pub use book::{
    ALL_PAIRS_LOT_LIMIT, DEFINITIONS, Definitions, LotBook, LotDifference, LotRankTest, LotReport,
    LotSummary, MAP_SITE_LIMIT, SIGNIFICANCE_LEVEL, VerdictCounts, WaferSummary,
};
pub use columns::Column;
pub use reader::{
    LotFileError, LotReader, MAX_LINE_BYTES, Measurement, ReadOptions, RowCounts, RowOutcome,
    RowRejection, Site, SiteSink, parse_diameter_mm, parse_dopant,
};
pub use stats::Summary;
pub use verdict::{Judgement, SpecError, SpecQuantity, SpecWindow, Verdict};

/// Reads a whole file held in memory (as [`LotReader::feed`] then [`LotReader::finish`]).
///
/// # Errors
/// As [`LotReader::finish`].
pub fn read_str(
    text: &str,
    options: &ReadOptions,
    book: &mut LotBook,
    on_row: &mut dyn FnMut(RowOutcome<'_, '_>),
) -> Result<RowCounts, LotFileError> {
    let mut reader = LotReader::new(options.clone());
    reader.feed(text.as_bytes(), book, on_row)?;
    reader.finish(book, on_row)
}
