//! `cargo xtask test`: every check the project has, ending with one summary line
//! `N passed, N failed[, N skipped]` and a non-zero exit on any failure.
//!
//! Gates (fmt, clippy, wasm build) count as one check each; test suites count
//! their individual tests as cargo's harness reports them.

use crate::shell::{self, root};
use crate::{dist, tools};
use std::io::{BufRead, BufReader};
use std::process::{Command, Stdio};

#[derive(Default)]
struct Tally {
    passed: u64,
    failed: u64,
    skipped: u64,
    failures: Vec<String>,
}

impl Tally {
    fn gate(&mut self, name: &str, result: Result<(), String>) -> bool {
        match result {
            Ok(()) => {
                self.passed += 1;
                eprintln!("xtask: gate '{name}' passed");
                true
            }
            Err(e) => {
                self.failed += 1;
                self.failures.push(format!("{name}: {e}"));
                eprintln!("xtask: gate '{name}' FAILED: {e}");
                false
            }
        }
    }

    /// Runs a cargo test command, echoes its output and adds the harness counts.
    fn suite(&mut self, name: &str, cmd: &mut Command) {
        eprintln!("$ {}", shell::describe(cmd));
        let child = cmd.stdout(Stdio::piped()).stdin(Stdio::null()).spawn();
        let mut child = match child {
            Ok(c) => c,
            Err(e) => {
                self.failed += 1;
                self.failures.push(format!("{name}: cannot start: {e}"));
                return;
            }
        };
        let mut seen_result = false;
        if let Some(out) = child.stdout.take() {
            for line in BufReader::new(out).lines().map_while(Result::ok) {
                println!("{line}");
                if let Some(counts) = parse_result_line(&line) {
                    seen_result = true;
                    self.passed += counts.0;
                    self.failed += counts.1;
                    self.skipped += counts.2;
                }
            }
        }
        let status = child.wait().map(|s| s.success()).unwrap_or(false);
        if !status {
            // A compile error or a failing harness: make sure it counts as a failure.
            if !seen_result || self.failed == 0 {
                self.failed += 1;
            }
            self.failures.push(format!("{name}: exited with failure"));
        }
    }
}

/// Parses `test result: ok. 3 passed; 0 failed; 1 ignored; ...` into (passed, failed, ignored).
fn parse_result_line(line: &str) -> Option<(u64, u64, u64)> {
    let rest = line.trim().strip_prefix("test result: ")?;
    let count = |label: &str| -> u64 {
        rest.split(';')
            .find_map(|part| {
                let part = part
                    .trim()
                    .trim_start_matches("ok.")
                    .trim_start_matches("FAILED.")
                    .trim();
                part.strip_suffix(label).and_then(|n| n.trim().parse().ok())
            })
            .unwrap_or(0)
    };
    Some((count("passed"), count("failed"), count("ignored")))
}

pub fn run(args: &[String]) -> Result<(), String> {
    if !args.is_empty() {
        return Err(format!("test takes no arguments, got: {}", args.join(" ")));
    }
    warn_when_disk_is_short();
    let mut tally = Tally::default();
    tally.gate("install build tools", tools::ensure_build_tools());
    tally.gate("install chromium", tools::ensure_chromium());
    tally.gate(
        "rustfmt",
        shell::run(shell::cargo().args(["fmt", "--all", "--check"])),
    );
    tally.gate(
        "clippy native",
        shell::run(shell::cargo().args([
            "clippy",
            "--workspace",
            "--all-targets",
            "--all-features",
            "--",
            "-D",
            "warnings",
        ])),
    );
    tally.gate(
        "clippy wasm32",
        shell::run(shell::cargo().args([
            "clippy",
            "-p",
            "bandgauge-app",
            "--target",
            "wasm32-unknown-unknown",
            "--",
            "-D",
            "warnings",
        ])),
    );
    tally.suite(
        "cargo test --workspace",
        shell::cargo().args(["test", "--workspace"]),
    );
    let dist = dist::build_release();
    let built = tally.gate(
        "wasm release build",
        dist.as_ref().map(|_| ()).map_err(Clone::clone),
    );
    if let (true, Ok(dist)) = (built, dist) {
        tally.suite(
            "browser tests",
            shell::cargo()
                .args(["test", "-p", "bandgauge-tests", "--features", "browser"])
                .args(
                    browser_test_targets()
                        .iter()
                        .flat_map(|t| ["--test", t.as_str()]),
                )
                .env("BANDGAUGE_DIST", dist)
                .env("BANDGAUGE_ROOT", root()),
        );
    } else {
        tally.failed += 1;
        tally
            .failures
            .push("browser tests: not run, the wasm build failed".into());
    }
    for f in &tally.failures {
        eprintln!("xtask: failure: {f}");
    }
    let mut summary = format!("{} passed, {} failed", tally.passed, tally.failed);
    if tally.skipped > 0 {
        summary.push_str(&format!(", {} skipped", tally.skipped));
    }
    println!("{summary}");
    if tally.failed > 0 {
        Err(format!("{} check(s) failed", tally.failed))
    } else {
        Ok(())
    }
}

/// Disk a clean run takes: target/ measured 2.5 GB after a clean-clone run, plus the
/// temporary lot files and browser profiles of the browser tests.
const DISK_NEEDED_GB: f64 = 3.5;

/// Warns up front when the disk that holds the workspace has less free space than a clean
/// run takes, so a full disk reads as such and not as a compiler crash twelve minutes in.
/// Not a gate: an already built target/ needs far less.
fn warn_when_disk_is_short() {
    let out = shell::capture(Command::new("df").args(["-Pk"]).arg(root()));
    let Some(free_gb) = out
        .ok()
        .and_then(|o| free_gb_from_df(&String::from_utf8_lossy(&o.stdout)))
    else {
        return;
    };
    if free_gb < DISK_NEEDED_GB {
        eprintln!(
            "xtask: warning: {free_gb:.1} GB free on the disk that holds {}; a clean run \
             needs about {DISK_NEEDED_GB} GB (compiles may fail with 'No space left on device')",
            root().display()
        );
    }
}

/// Free gigabytes (10^9 bytes) from `df -Pk` output: the fourth field of the second line.
fn free_gb_from_df(text: &str) -> Option<f64> {
    let kib: f64 = text
        .lines()
        .nth(1)?
        .split_whitespace()
        .nth(3)?
        .parse()
        .ok()?;
    Some(kib * 1024.0 / 1e9)
}

#[cfg(test)]
mod tests {
    use super::{free_gb_from_df, parse_result_line};

    #[test]
    fn reads_free_space_from_df() {
        // Source: the POSIX `df -P` output format (1024-byte blocks with -k), common
        // practice, no source.
        let out = "Filesystem     1024-blocks      Used Available Capacity Mounted on\n\
                   /dev/vda         263174212  89128532 161278128      36% /\n";
        let gb = free_gb_from_df(out).expect("a free figure");
        assert!((gb - 161_278_128.0 * 1024.0 / 1e9).abs() < 1e-9);
        assert_eq!(free_gb_from_df("Filesystem\n"), None);
    }

    #[test]
    fn parses_harness_lines() {
        // Source: the libtest summary format, common practice, no source.
        let ok = "test result: ok. 12 passed; 0 failed; 1 ignored; 0 measured; 0 filtered out; finished in 0.01s";
        assert_eq!(parse_result_line(ok), Some((12, 0, 1)));
        let bad = "test result: FAILED. 3 passed; 2 failed; 0 ignored; 0 measured; 0 filtered out";
        assert_eq!(parse_result_line(bad), Some((3, 2, 0)));
        assert_eq!(parse_result_line("running 3 tests"), None);
    }
}

/// The test targets of tests/Cargo.toml that need the `browser` feature: every
/// `[[test]]` table whose `required-features` names it, so a new browser test file
/// declared there is run without editing this list.
fn browser_test_targets() -> Vec<String> {
    let manifest = std::fs::read_to_string(root().join("tests/Cargo.toml")).unwrap_or_default();
    manifest
        .split("[[")
        .filter(|table| table.starts_with("test]]"))
        .filter(|table| {
            table
                .lines()
                .any(|l| l.starts_with("required-features") && l.contains("\"browser\""))
        })
        .filter_map(|table| {
            table.lines().find_map(|l| {
                let value = l.strip_prefix("name")?.trim_start().strip_prefix('=')?;
                Some(value.trim().trim_matches('"').to_string())
            })
        })
        .collect()
}

#[cfg(test)]
mod browser_targets_tests {
    use super::browser_test_targets;

    #[test]
    fn every_declared_browser_test_is_run() {
        let targets = browser_test_targets();
        // The browser test files of tests/tests/ (common practice, no source: the list is the repo's own).
        for name in ["browser", "offline", "lots_browser", "shell_browser"] {
            assert!(
                targets.iter().any(|t| t == name),
                "{name} missing from {targets:?}"
            );
        }
        assert!(
            !targets.iter().any(|t| t == "hygiene"),
            "hygiene needs no browser"
        );
    }
}
