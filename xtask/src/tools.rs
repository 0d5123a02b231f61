//! Idempotent installation of everything the build and the tests need.
//!
//! What the build needs besides xtask itself: the wasm32 standard library (rustup),
//! wasm-opt from the npm package `binaryen@132.0.0` (Debian's binaryen 108 produces broken
//! modules), and for the browser tests Debian's chromium and chromium-driver. wasm-bindgen
//! runs inside xtask as a library (`dist::bindgen`), so there is no bundler or
//! wasm-bindgen-cli to compile. Nothing here downloads a prebuilt binary from outside the
//! package registries.

use crate::shell::{self, root, version_of};
use std::path::PathBuf;
use std::process::Command;
use std::time::Instant;

/// The binaryen (wasm-opt) release installed from npm.
pub const BINARYEN_VERSION: &str = "132.0.0";
const WASM_TARGET: &str = "wasm32-unknown-unknown";

/// Where `cargo install` puts binaries.
pub fn cargo_bin_dir() -> PathBuf {
    let home = std::env::var_os("CARGO_HOME")
        .map(PathBuf::from)
        .unwrap_or_else(|| home_dir().join(".cargo"));
    home.join("bin")
}

fn home_dir() -> PathBuf {
    std::env::var_os("HOME")
        .map(PathBuf::from)
        .unwrap_or_else(|| PathBuf::from("/root"))
}

/// A per-user cache for tools that are not cargo binaries (binaryen from npm).
fn cache_dir() -> PathBuf {
    std::env::var_os("XDG_CACHE_HOME")
        .map(PathBuf::from)
        .unwrap_or_else(|| home_dir().join(".cache"))
        .join("bandgauge")
}

fn binaryen_bin_dir() -> PathBuf {
    cache_dir()
        .join(format!("binaryen-{BINARYEN_VERSION}"))
        .join("node_modules")
        .join(".bin")
}

/// The wasm-opt program `ensure_wasm_opt` installs.
pub fn wasm_opt() -> PathBuf {
    binaryen_bin_dir().join("wasm-opt")
}

fn announce(what: &str, how_long: &str) -> Instant {
    eprintln!("xtask: installing {what} (this takes {how_long}; done once per machine)");
    Instant::now()
}

fn done(what: &str, started: Instant) {
    eprintln!(
        "xtask: {what} installed in {:.0} s",
        started.elapsed().as_secs_f64()
    );
}

/// The wasm32 standard library for the active toolchain.
pub fn ensure_wasm_target() -> Result<(), String> {
    let out = shell::capture(Command::new("rustup").args(["target", "list", "--installed"]))?;
    if String::from_utf8_lossy(&out.stdout)
        .lines()
        .any(|l| l.trim() == WASM_TARGET)
    {
        return Ok(());
    }
    let t = announce("the wasm32-unknown-unknown target", "under a minute");
    shell::run(Command::new("rustup").args(["target", "add", WASM_TARGET]))?;
    done("wasm32 target", t);
    Ok(())
}

/// wasm-opt from the npm package binaryen (never Debian's binaryen 108).
pub fn ensure_wasm_opt() -> Result<(), String> {
    let bin = wasm_opt();
    let major = BINARYEN_VERSION.split('.').next().unwrap_or_default();
    if version_of(&bin, "--version").is_some_and(|v| v.contains(&format!("version {major}"))) {
        return Ok(());
    }
    let prefix = binaryen_bin_dir()
        .parent()
        .and_then(|p| p.parent())
        .map(PathBuf::from);
    let prefix = prefix.ok_or("binaryen cache folder has no parent")?;
    std::fs::create_dir_all(&prefix)
        .map_err(|e| format!("cannot create {}: {e}", prefix.display()))?;
    let t = announce(
        &format!("wasm-opt (npm binaryen@{BINARYEN_VERSION})"),
        "a few seconds",
    );
    shell::run(
        Command::new("npm")
            .arg("install")
            .arg("--no-audit")
            .arg("--no-fund")
            .arg("--prefix")
            .arg(&prefix)
            .arg(format!("binaryen@{BINARYEN_VERSION}")),
    )?;
    done("wasm-opt", t);
    Ok(())
}

/// Debian's chromium and chromium-driver, for the browser tests.
pub fn ensure_chromium() -> Result<(), String> {
    let have = |p: &str| std::path::Path::new(p).exists();
    if have("/usr/bin/chromium") && have("/usr/bin/chromedriver") {
        return Ok(());
    }
    let t = announce("Debian's chromium and chromium-driver", "under a minute");
    shell::run(Command::new("apt-get").arg("update").arg("-qq"))?;
    shell::run(
        Command::new("apt-get")
            .args(["install", "-y", "-qq", "chromium", "chromium-driver"])
            .env("DEBIAN_FRONTEND", "noninteractive"),
    )?;
    done("chromium", t);
    Ok(())
}

/// Everything the app build needs (`dist`).
pub fn ensure_build_tools() -> Result<(), String> {
    ensure_wasm_target()?;
    ensure_wasm_opt()
}

/// The commit the app is built from, as the report prints it: the short hash, with
/// `-modified` when the work tree has uncommitted changes, or `unknown` outside git.
pub fn build_commit() -> String {
    let git = |args: &[&str]| {
        Command::new("git")
            .args(args)
            .current_dir(root())
            .output()
            .ok()
            .filter(|o| o.status.success())
            .map(|o| String::from_utf8_lossy(&o.stdout).trim().to_string())
    };
    match git(&["rev-parse", "--short=12", "HEAD"]) {
        Some(hash) if !hash.is_empty() => {
            let dirty = git(&["status", "--porcelain", "--untracked-files=no"])
                .is_some_and(|s| !s.is_empty());
            if dirty {
                format!("{hash}-modified")
            } else {
                hash
            }
        }
        _ => "unknown".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use crate::shell::root;

    /// The version Cargo.lock resolves for the package `name` (its first entry).
    fn locked_version(name: &str) -> Result<String, String> {
        let lock_path = root().join("Cargo.lock");
        let lock = std::fs::read_to_string(&lock_path)
            .map_err(|e| format!("cannot read {}: {e}", lock_path.display()))?;
        let mut lines = lock.lines();
        let wanted = format!("name = \"{name}\"");
        while let Some(line) = lines.next() {
            if line.trim() == wanted
                && let Some(v) = lines
                    .next()
                    .and_then(|l| l.trim().strip_prefix("version = \""))
            {
                return Ok(v.trim_end_matches('"').to_string());
            }
        }
        Err(format!("Cargo.lock has no {name} entry"))
    }

    #[test]
    fn the_bindgen_library_matches_the_apps_wasm_bindgen() {
        // The glue and the module's custom section must come from one wasm-bindgen version:
        // wasm-bindgen refuses a module built against another (common practice, no source).
        let app = locked_version("wasm-bindgen").unwrap();
        let step = locked_version("wasm-bindgen-cli-support").unwrap();
        assert_eq!(
            app, step,
            "bump wasm-bindgen-cli-support in xtask/Cargo.toml with wasm-bindgen"
        );
    }
}
