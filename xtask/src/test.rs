//! `cargo xtask test`: every check the project has, ending with one summary line
//! `N passed, N failed[, N skipped]` and a non-zero exit on any failure.
//!
//! Gates (fmt, clippy, wasm build) count as one check each; test suites count
//! their individual tests as cargo's harness reports them.

use crate::shell::{self, root};
use crate::{dist, tools};
use std::io::{BufRead, BufReader};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

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

/// How long each step took, printed as a table at the end (steps that ran alongside each
/// other say so).
#[derive(Default)]
struct Clock {
    steps: Vec<(String, Duration)>,
}

impl Clock {
    fn time<T>(&mut self, name: &str, step: impl FnOnce() -> T) -> T {
        let started = Instant::now();
        let result = step();
        self.record(name, started.elapsed());
        result
    }

    fn record(&mut self, name: &str, took: Duration) {
        eprintln!("xtask: step '{name}' took {:.0} s", took.as_secs_f64());
        self.steps.push((name.to_string(), took));
    }

    fn print(&self, total: Duration) {
        let width = self.steps.iter().map(|(n, _)| n.len()).max().unwrap_or(0);
        eprintln!("xtask: step times");
        for (name, took) in &self.steps {
            eprintln!("  {name:<width$} {:>6.0} s", took.as_secs_f64());
        }
        eprintln!(
            "  {:<width$} {:>6.0} s",
            "total (wall)",
            total.as_secs_f64()
        );
    }
}

pub fn run(args: &[String]) -> Result<(), String> {
    if !args.is_empty() {
        return Err(format!("test takes no arguments, got: {}", args.join(" ")));
    }
    let started = Instant::now();
    warn_when_disk_is_short();
    let mut tally = Tally::default();
    let mut clock = Clock::default();
    // Chromium comes from apt (network and disk, hardly any CPU): installed alongside the
    // builds, needed only by the test run at the end.
    let chromium = std::thread::spawn(|| {
        let t = Instant::now();
        (tools::ensure_chromium(), t.elapsed())
    });
    let tools_ok = clock.time("install build tools", || {
        tally.gate("install build tools", tools::ensure_build_tools())
    });
    clock.time("rustfmt", || {
        tally.gate(
            "rustfmt",
            shell::run(shell::cargo().args(["fmt", "--all", "--check"])),
        )
    });
    // The release page builds alongside clippy and the test build: its own target folders
    // (wasm32 release, host release for the macros), so neither waits for the other's lock,
    // and its long single-threaded link (LTO, one codegen unit) and wasm-opt fill the cores
    // the debug builds leave idle.
    let release = tools_ok.then(|| {
        std::thread::spawn(|| {
            let t = Instant::now();
            (dist::build_release(), t.elapsed())
        })
    });
    clock.time("clippy native", || {
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
        )
    });
    clock.time("clippy wasm32", || {
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
        )
    });
    // Every test binary, the browser ones included, in one build with one feature set: the
    // run below then compiles nothing (no second build of the dependencies for the feature).
    let test_build = clock.time("build test binaries", || {
        tally.gate(
            "build test binaries",
            shell::run(shell::cargo().args(TEST_ALL).arg("--no-run")),
        )
    });
    let waited = Instant::now();
    let dist = match release.map(|h| h.join()) {
        Some(Ok((dist, took))) => {
            clock.record(
                "wasm release build (alongside clippy and the test build)",
                took,
            );
            dist
        }
        Some(Err(_)) => Err("the release build thread panicked".to_string()),
        None => Err("not run: the build tools are missing".to_string()),
    };
    clock.record("waiting for the release build", waited.elapsed());
    let built = tally.gate(
        "wasm release build",
        dist.as_ref().map(|_| ()).map_err(Clone::clone),
    );
    let (chromium, took) = chromium
        .join()
        .unwrap_or_else(|_| (Err("the install thread panicked".into()), Duration::ZERO));
    clock.record("install chromium (alongside)", took);
    tally.gate("install chromium", chromium);
    match (built, dist) {
        (true, Ok(dist)) if test_build => clock.time("unit, reference and browser tests", || {
            tally.suite(
                "cargo test --workspace --all-features",
                shell::cargo()
                    .args(TEST_ALL)
                    .arg("--no-fail-fast")
                    .env("BANDGAUGE_DIST", dist)
                    .env("BANDGAUGE_ROOT", root()),
            )
        }),
        (built, _) => {
            // Without the page (or with a test build that failed) the unit and reference
            // tests still run, and the browser tests count as failed.
            clock.time("unit and reference tests", || {
                tally.suite(
                    "cargo test --workspace",
                    shell::cargo().args(["test", "--workspace", "--no-fail-fast"]),
                )
            });
            if !built {
                tally.failed += 1;
                tally
                    .failures
                    .push("browser tests: not run, the wasm build failed".into());
            }
        }
    }
    for f in &tally.failures {
        eprintln!("xtask: failure: {f}");
    }
    clock.print(started.elapsed());
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

/// `cargo test` over every package and feature: the unit, reference and hygiene tests and,
/// with the `browser` feature of bandgauge-tests, every browser test file it declares.
const TEST_ALL: [&str; 3] = ["test", "--workspace", "--all-features"];

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
