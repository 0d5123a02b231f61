//! `cargo xtask dist [--out DIR]`: release build of the app into `dist/` (a static
//! folder for any web server) plus the self-contained single HTML file beside it.
//!
//! After trunk, the build writes what only the final files can tell: the
//! Content-Security-Policy of each page (it hashes their inline scripts, `policy`) and the
//! offline worker's file list and build id (`offline_worker`).

pub mod offline_worker;
pub mod policy;

use crate::shell::{self, root};
use crate::tools;
use std::path::{Path, PathBuf};

/// Builds the release app and returns the dist folder.
pub fn run(args: &[String]) -> Result<PathBuf, String> {
    let out = match args {
        [] => root().join("dist"),
        [flag, dir] if flag == "--out" => std::path::absolute(dir)
            .map_err(|e| format!("--out: '{dir}' is not a usable folder: {e}"))?,
        _ => {
            return Err(format!(
                "dist takes only [--out DIR], got: {}",
                args.join(" ")
            ));
        }
    };
    tools::ensure_build_tools()?;
    build_release_into(out)
}

/// The release build into `dist/` (tools already present).
pub fn build_release() -> Result<PathBuf, String> {
    build_release_into(root().join("dist"))
}

fn build_release_into(dist: PathBuf) -> Result<PathBuf, String> {
    shell::run(
        tools::trunk()
            .args(["build", "--release", "--dist"])
            .arg(&dist),
    )?;
    let wasm = wasm_files(&dist)?;
    for w in &wasm {
        let size = std::fs::metadata(w).map(|m| m.len()).unwrap_or(0);
        eprintln!("xtask: {} is {:.0} KB", w.display(), size as f64 / 1024.0);
    }
    // The single file is made from trunk's page and carries its own policy.
    let single = crate::single_file::build(&dist)?;
    let size = std::fs::metadata(&single).map(|m| m.len()).unwrap_or(0);
    eprintln!(
        "xtask: self-contained {} is {:.0} KB",
        single.display(),
        size as f64 / 1024.0
    );
    secure_index(&dist)?;
    // Last: the build id covers the final index.html.
    let build_id = offline_worker::finish(&dist, &[crate::single_file::FILE_NAME])?;
    eprintln!("xtask: offline worker keeps build {build_id}");
    Ok(dist)
}

/// Writes the served page's Content-Security-Policy into `dist/index.html`.
fn secure_index(dist: &Path) -> Result<(), String> {
    let path = dist.join("index.html");
    let html = std::fs::read_to_string(&path)
        .map_err(|e| format!("cannot read {}: {e}", path.display()))?;
    let csp = policy::for_page(&html, policy::Delivery::Served)?;
    let html = policy::insert(&html, &csp)?;
    std::fs::write(&path, html).map_err(|e| format!("cannot write {}: {e}", path.display()))?;
    eprintln!("xtask: {} allows: {csp}", path.display());
    Ok(())
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
