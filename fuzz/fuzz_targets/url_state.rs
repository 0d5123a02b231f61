//! Fuzz target `url_state`: the invariants in `bandgauge_fuzz::checks::url_state`.

#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| bandgauge_fuzz::checks::url_state::check(data));
