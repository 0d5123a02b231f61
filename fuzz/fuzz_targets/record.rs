//! Fuzz target `record`: the invariants in `bandgauge_fuzz::checks::record`.

#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| bandgauge_fuzz::checks::record::check(data));
