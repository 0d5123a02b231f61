//! `cargo xtask dist`: release build of the app into `dist/`.

use crate::shell::{self, root};
use crate::tools;
use std::path::PathBuf;

/// Builds the release app and returns the dist folder.
pub fn run(_args: &[String]) -> Result<PathBuf, String> {
    tools::ensure_build_tools()?;
    build_release()
}

/// The release build alone (tools already present).
pub fn build_release() -> Result<PathBuf, String> {
    shell::run(tools::trunk().args(["build", "--release"]))?;
    let dist = root().join("dist");
    let wasm = wasm_files(&dist)?;
    for w in &wasm {
        let size = std::fs::metadata(w).map(|m| m.len()).unwrap_or(0);
        eprintln!("xtask: {} is {:.0} KB", w.display(), size as f64 / 1024.0);
    }
    Ok(dist)
}

/// The .wasm files of a dist folder (there must be at least one).
pub fn wasm_files(dist: &std::path::Path) -> Result<Vec<PathBuf>, String> {
    let entries =
        std::fs::read_dir(dist).map_err(|e| format!("cannot read {}: {e}", dist.display()))?;
    let wasm: Vec<PathBuf> = entries
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "wasm"))
        .collect();
    if wasm.is_empty() {
        return Err(format!(
            "{} holds no .wasm file after the build",
            dist.display()
        ));
    }
    Ok(wasm)
}
