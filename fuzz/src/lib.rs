//! bandgauge-fuzz: the shared invariants of the fuzz targets in `fuzz_targets/`.
//!
//! See `checks` (also replayed on stable by `tests/tests/fuzz_corpus.rs`).

#![forbid(unsafe_code)]

pub mod checks;
