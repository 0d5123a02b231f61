//! The wasm-bindgen step, run as a library: the compiled app module in, the JS glue and the
//! bound module out.
//!
//! Running `wasm-bindgen-cli-support` inside xtask replaces the `wasm-bindgen` command-line
//! tool: nothing to install, and its version is the one Cargo.lock pins for xtask, which must
//! equal the app's `wasm-bindgen` (a test below checks the lock file).

use std::path::Path;
use wasm_bindgen_cli_support::Bindgen;

/// What the page needs from one bound module.
pub struct Bound {
    /// The ES-module glue (wasm-bindgen's `web` target).
    pub glue: String,
    /// The module with its imports and exports rewritten for the glue.
    pub wasm: Vec<u8>,
}

/// Binds the module rustc wrote at `input` for the browser (`--target web`, no TypeScript).
pub fn bind(input: &Path) -> Result<Bound, String> {
    let failed = |e: anyhow::Error| format!("wasm-bindgen on {}: {e:#}", input.display());
    let mut bindgen = Bindgen::new();
    bindgen.input_path(input).typescript(false);
    bindgen.web(true).map_err(failed)?;
    let mut output = bindgen.generate_output().map_err(failed)?;
    // The single-file build inlines the glue alone, so JS snippets (inline_js or module
    // imports of a dependency) would be lost there: refuse them here, by name.
    let snippets: Vec<&String> = output
        .snippets()
        .iter()
        .filter(|(_, files)| !files.is_empty())
        .map(|(name, _)| name)
        .chain(output.local_modules().keys())
        .collect();
    if !snippets.is_empty() {
        return Err(format!(
            "the app now carries JS snippets ({snippets:?}); the build does not copy them \
             yet (xtask/src/dist/bindgen.rs)"
        ));
    }
    let glue = output.js().to_string();
    let wasm = output.wasm_mut().emit_wasm();
    Ok(Bound { glue, wasm })
}
