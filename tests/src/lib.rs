//! Shared harness for bandgauge's cross-crate and browser tests.

pub mod browser;
pub mod lot_rows;
pub mod static_files;
pub mod ui;
