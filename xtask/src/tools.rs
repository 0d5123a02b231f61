//! Idempotent installation of everything the build and the tests need.
//!
//! Versions that work together here (see DEVELOPERS.md): trunk 0.21.14 (0.22 needs a
//! newer rustc), wasm-bindgen-cli at exactly the version Cargo.lock resolves (installed
//! without `--locked`), wasm-opt from the npm package `binaryen@132.0.0` (Debian's
//! binaryen 108 produces broken modules), Debian's chromium and chromium-driver.
//! Nothing here downloads a prebuilt binary from outside the package registries.

use crate::shell::{self, root, version_of};
use std::path::PathBuf;
use std::process::Command;
use std::time::Instant;

/// The trunk release that builds with the pinned toolchain.
pub const TRUNK_VERSION: &str = "0.21.14";
/// The binaryen (wasm-opt) release installed from npm; must match Trunk.toml `[tools] wasm_opt`.
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

/// PATH with the cargo bin folder and the wasm-opt folder first, for trunk.
pub fn tool_path() -> std::ffi::OsString {
    let mut dirs = vec![binaryen_bin_dir(), cargo_bin_dir()];
    if let Some(path) = std::env::var_os("PATH") {
        dirs.extend(std::env::split_paths(&path));
    }
    std::env::join_paths(dirs).expect("PATH entries contain no separator")
}

/// The wasm-bindgen version Cargo.lock resolves; the CLI must match it exactly.
pub fn locked_wasm_bindgen_version() -> Result<String, String> {
    let lock_path = root().join("Cargo.lock");
    let lock = std::fs::read_to_string(&lock_path)
        .map_err(|e| format!("cannot read {}: {e}", lock_path.display()))?;
    let mut lines = lock.lines();
    while let Some(line) = lines.next() {
        if line.trim() == "name = \"wasm-bindgen\""
            && let Some(v) = lines
                .next()
                .and_then(|l| l.trim().strip_prefix("version = \""))
        {
            return Ok(v.trim_end_matches('"').to_string());
        }
    }
    Err("Cargo.lock has no wasm-bindgen entry".into())
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

/// trunk, the wasm bundler, at the version that builds with this toolchain.
pub fn ensure_trunk() -> Result<(), String> {
    let trunk = cargo_bin_dir().join("trunk");
    if version_of(&trunk, "--version").as_deref() == Some(&format!("trunk {TRUNK_VERSION}")) {
        return Ok(());
    }
    let t = announce(
        &format!("trunk {TRUNK_VERSION} from crates.io"),
        "about 7 minutes",
    );
    shell::run(shell::cargo().args(["install", "trunk", "--locked", "--version", TRUNK_VERSION]))?;
    done("trunk", t);
    Ok(())
}

/// wasm-bindgen-cli at exactly the version in Cargo.lock (without `--locked`:
/// its own lock pins a crate version the registry does not serve).
pub fn ensure_wasm_bindgen() -> Result<(), String> {
    let version = locked_wasm_bindgen_version()?;
    let bin = cargo_bin_dir().join("wasm-bindgen");
    if version_of(&bin, "--version").as_deref() == Some(&format!("wasm-bindgen {version}")) {
        return Ok(());
    }
    let t = announce(
        &format!("wasm-bindgen-cli {version} from crates.io"),
        "about 4 minutes",
    );
    shell::run(shell::cargo().args(["install", "wasm-bindgen-cli", "--version", &version]))?;
    done("wasm-bindgen-cli", t);
    Ok(())
}

/// wasm-opt from the npm package binaryen (never Debian's binaryen 108).
pub fn ensure_wasm_opt() -> Result<(), String> {
    let bin = binaryen_bin_dir().join("wasm-opt");
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

/// Everything `trunk build` needs, then the crates it builds offline.
pub fn ensure_build_tools() -> Result<(), String> {
    ensure_wasm_target()?;
    ensure_wasm_opt()?;
    ensure_trunk()?;
    ensure_wasm_bindgen()?;
    // trunk builds offline (Trunk.toml), so every crate must be in the local registry first.
    shell::run(shell::cargo().args(["fetch", "--locked"]))
}

/// A trunk command with the installed tools first on PATH.
pub fn trunk() -> Command {
    let mut cmd = Command::new(cargo_bin_dir().join("trunk"));
    cmd.current_dir(root())
        .env("PATH", tool_path())
        .env("TRUNK_SKIP_VERSION_CHECK", "true")
        .env("BANDGAUGE_BUILD_COMMIT", build_commit());
    cmd
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
