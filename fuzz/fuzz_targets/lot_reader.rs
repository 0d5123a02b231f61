//! Fuzz target `lot_reader`: the invariants in `bandgauge_fuzz::checks::lot_reader`.

#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| bandgauge_fuzz::checks::lot_reader::check(data));
