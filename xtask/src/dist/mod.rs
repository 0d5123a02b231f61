//! `cargo xtask dist [--out DIR]`: release build of the app into `dist/` (a static
//! folder for any web server) plus the self-contained single HTML file beside it.
//!
//! The steps, all in xtask: cargo builds the app for wasm32; wasm-bindgen (as a library,
//! `bindgen`) writes the JS glue; wasm-opt (npm binaryen) shrinks the module in release
//! builds; `page` writes `index.html` and its content-hashed files; `single_file` the
//! self-contained page. Then what only the final files can tell: the Content-Security-Policy
//! of the served page (it hashes the inline loader, `policy`) and the offline worker's file
//! list and build id (`offline_worker`).

mod bindgen;
pub mod offline_worker;
pub mod page;
pub mod policy;
pub mod single_file;

use crate::shell::{self, root};
use crate::tools;
use std::path::{Path, PathBuf};
use std::process::Command;

/// The app's binary target, as `app/Cargo.toml` names it.
const APP_BIN: &str = "bandgauge-app";
const WASM_TARGET: &str = "wasm32-unknown-unknown";

/// How to build: the release page (size-optimised, with the single file) or a quick
/// development page for `cargo xtask serve`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Profile {
    Release,
    Dev,
}

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
    build(Profile::Release, &out)?;
    Ok(out)
}

/// The release build into `dist/` (tools already present).
pub fn build_release() -> Result<PathBuf, String> {
    let dist = root().join("dist");
    build(Profile::Release, &dist)?;
    Ok(dist)
}

/// Builds the app into `dist`, which is emptied first.
pub fn build(profile: Profile, dist: &Path) -> Result<(), String> {
    let module = compile(profile)?;
    let bound = bindgen::bind(&module)?;
    let wasm = match profile {
        Profile::Release => optimise(&bound.wasm)?,
        Profile::Dev => bound.wasm,
    };
    let public = root().join("public");
    let sources = page::Sources::read(&public, bound.glue, wasm)?;
    empty_build_folder(dist)?;
    std::fs::create_dir_all(dist).map_err(|e| format!("cannot create {}: {e}", dist.display()))?;
    page::write(dist, &public, &sources)?;
    for w in wasm_files(dist)? {
        let size = std::fs::metadata(&w).map(|m| m.len()).unwrap_or(0);
        eprintln!("xtask: {} is {:.0} KB", w.display(), size as f64 / 1024.0);
    }
    let mut skip = Vec::new();
    if profile == Profile::Release {
        let single = single_file::build(dist, &sources)?;
        let size = std::fs::metadata(&single).map(|m| m.len()).unwrap_or(0);
        eprintln!(
            "xtask: self-contained {} is {:.0} KB",
            single.display(),
            size as f64 / 1024.0
        );
        skip.push(single_file::FILE_NAME);
    }
    secure_index(dist)?;
    // Last: the build id covers the final index.html.
    let build_id = offline_worker::finish(dist, &skip)?;
    eprintln!("xtask: offline worker keeps build {build_id}");
    Ok(())
}

/// Removes an earlier build from `dist`; refuses a folder that holds anything else, so a
/// mistyped `--out` never deletes a user's files.
fn empty_build_folder(dist: &Path) -> Result<(), String> {
    let Ok(entries) = std::fs::read_dir(dist) else {
        return Ok(()); // not there yet
    };
    let names: Vec<String> = entries
        .filter_map(|e| e.ok())
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    let earlier_build = names.iter().any(|n| n == "index.html")
        && names.iter().any(|n| n == offline_worker::WORKER_FILE);
    if names.is_empty() {
        Ok(())
    } else if earlier_build {
        std::fs::remove_dir_all(dist).map_err(|e| format!("cannot empty {}: {e}", dist.display()))
    } else {
        Err(format!(
            "{} is not empty and holds no earlier bandgauge build; give a new or empty folder",
            dist.display()
        ))
    }
}

/// `cargo build` of the app for wasm32; returns the module rustc wrote.
fn compile(profile: Profile) -> Result<PathBuf, String> {
    let mut cargo = shell::cargo();
    cargo
        .args(["build", "--locked", "--target", WASM_TARGET])
        .args(["-p", APP_BIN, "--bin", APP_BIN])
        .env("BANDGAUGE_BUILD_COMMIT", tools::build_commit());
    if profile == Profile::Release {
        // The release profile with the core at opt-level "s" (Cargo.toml, `[profile.page]`).
        cargo.args(["--profile", "page"]);
    }
    shell::run(&mut cargo)?;
    let folder = match profile {
        Profile::Release => "page",
        Profile::Dev => "debug",
    };
    let module = target_dir()
        .join(WASM_TARGET)
        .join(folder)
        .join(format!("{APP_BIN}.wasm"));
    if module.is_file() {
        Ok(module)
    } else {
        Err(format!("cargo built no {}", module.display()))
    }
}

/// The bound module (before wasm-opt) that a release build leaves in
/// `<target>/bandgauge-dist/` (`cargo xtask size` optimises it again with names kept).
pub const BOUND_FILE: &str = "bound.wasm";

/// The cargo target folder (`CARGO_TARGET_DIR` when set).
pub fn target_dir() -> PathBuf {
    match std::env::var_os("CARGO_TARGET_DIR") {
        Some(dir) => root().join(dir),
        None => root().join("target"),
    }
}

/// `wasm-opt -Oz` over the bound module (the npm binaryen that `tools` installs).
fn optimise(wasm: &[u8]) -> Result<Vec<u8>, String> {
    let work = target_dir().join("bandgauge-dist");
    std::fs::create_dir_all(&work).map_err(|e| format!("cannot create {}: {e}", work.display()))?;
    let input = work.join(BOUND_FILE);
    let output = work.join("optimised.wasm");
    std::fs::write(&input, wasm).map_err(|e| format!("cannot write {}: {e}", input.display()))?;
    shell::run(
        Command::new(tools::wasm_opt())
            .arg(format!("--output={}", output.display()))
            .arg("-Oz")
            .arg(&input),
    )?;
    std::fs::read(&output).map_err(|e| format!("cannot read {}: {e}", output.display()))
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
