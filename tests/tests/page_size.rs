//! The page's download budget: the release build's WebAssembly, compressed as a web server
//! sends it (gzip at level 9), stays under a committed number of bytes, so a change that
//! bloats the page fails here instead of on a slow fab-floor network share.
//!
//! Needs the release build (`cargo xtask dist`); `cargo xtask test` runs it after building.

use std::io::Write as _;

/// The committed budget for the gzipped release wasm, in bytes. Measured at the commit that
/// set it (see DEVELOPERS.md, "Page size"); lower it when a change makes the page smaller,
/// never raise it without saying why in the commit. Raised from 440 KiB: the van der Pauw &
/// Hall view, the probe geometry and the Holm tables added 34,238 bytes (473,901). Raised from
/// 470 KiB: the lot chart at scale, the sortable wafer table and the two patterned demo lots
/// added 14,831 bytes (488,732). Lowered from 478 KiB (489,472) to the measured size plus 2 %:
/// the saved state read through one JSON deserializer per input type (about 479,600). Raised
/// from 489,200: the wafer map (Delaunay surface, colour scale, outline, focusable sites, radial
/// profile, report maps) added about 43,500 bytes (523,713). Lowered from 534,200 to the
/// measured 501,596 plus 2 %: every sort through `core::order`, ASCII case folding and the
/// app's own chart legends (no Unicode case tables). Lowered from 511,600 to the measured
/// 494,170 plus 2 %: the core at opt-level "s" in the page's build profile. Lowered from
/// 504,100 to the measured 488,368 plus 2 %: the workbench and the four views' inputs read
/// through one shared routine instead of a derived visitor each.
const WASM_GZIP_BUDGET_BYTES: usize = 498_200;

fn gzip9_len(bytes: &[u8]) -> usize {
    let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::best());
    gz.write_all(bytes).expect("gzip into memory");
    gz.finish().expect("gzip into memory").len()
}

#[test]
fn release_wasm_fits_the_gzip_budget() {
    let dist = bandgauge_tests::browser::dist_dir();
    let wasm: Vec<_> = std::fs::read_dir(&dist)
        .unwrap_or_else(|e| panic!("cannot read {}: {e} (run cargo xtask dist)", dist.display()))
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "wasm"))
        .collect();
    assert_eq!(wasm.len(), 1, "one .wasm in {}: {wasm:?}", dist.display());
    let bytes = std::fs::read(&wasm[0]).expect("the wasm reads");
    let gz = gzip9_len(&bytes);
    eprintln!(
        "release wasm: {} bytes raw, {gz} bytes gzip -9 (budget {WASM_GZIP_BUDGET_BYTES})",
        bytes.len()
    );
    assert!(
        gz <= WASM_GZIP_BUDGET_BYTES,
        "the release wasm is {gz} bytes gzipped, over the budget of {WASM_GZIP_BUDGET_BYTES}"
    );
}

#[test]
fn gzip_length_is_measured_not_assumed() {
    // Source: RFC 1952 (gzip member: 10-byte header, 8-byte trailer), common practice, no
    // source: an empty input still costs a header, a trailer and an empty deflate block.
    let empty = gzip9_len(b"");
    assert!((18..=25).contains(&empty), "{empty}");
    // 100 kB of one byte compresses to well under a kilobyte.
    assert!(gzip9_len(&[b'a'; 100_000]) < 1024);
}
