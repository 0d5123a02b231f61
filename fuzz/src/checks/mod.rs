//! The invariants each fuzz target checks, shared with the corpus replay test.
//!
//! One module per target, each with `check(data: &[u8])` that panics with a message naming
//! the broken invariant. The fuzz targets call it through this crate's library; the stable
//! test `tests/tests/fuzz_corpus.rs` includes this folder with `#[path]` and replays every
//! corpus and regression file through the same functions. So this code may use only
//! bandgauge-core, bandgauge-app, serde, serde_json and arbitrary (all of which the test crate has), and
//! nothing of libFuzzer.

pub mod build;
pub mod finite;
pub mod lot_reader;
pub mod record;
pub mod units;
pub mod url_state;
