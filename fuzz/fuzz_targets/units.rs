//! Fuzz target `units`: the invariants in `bandgauge_fuzz::checks::units`.

#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| bandgauge_fuzz::checks::units::check(data));
