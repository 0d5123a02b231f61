//! `cargo xtask fuzz [--seconds N] [TARGET...]`: runs the cargo-fuzz targets in `fuzz/` for a
//! bounded time each and prints one table (executions, exec/s, corpus, findings).
//!
//! libFuzzer needs a nightly compiler: the `nightly` rustup toolchain when there is one, else
//! the stable one with `RUSTC_BOOTSTRAP=1`. Targets are built without a sanitizer: bandgauge
//! forbids unsafe code, the invariants are what the targets check, and AddressSanitizer would
//! halve the executions. `fuzz/dict/<target>.dict`, when present, is passed as the libFuzzer
//! dictionary. Each run reads the committed corpus `fuzz/corpus/<target>/` and writes
//! what it learns to `fuzz/target/work-corpus/<target>/`, so a routine run leaves the repository
//! unchanged (DEVELOPERS.md says how to fold new inputs into the committed corpus). A crashing
//! input is saved under `fuzz/artifacts/<target>/` and makes the command fail.

use crate::shell::{self, root};
use crate::tools::cargo_bin_dir;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::Instant;

/// The cargo-fuzz release installed when missing (builds with the pinned stable toolchain).
const CARGO_FUZZ_VERSION: &str = "0.13.2";
const DEFAULT_SECONDS: u64 = 60;
/// Seconds one input may run before libFuzzer reports it as a hang.
const INPUT_TIMEOUT_S: u64 = 10;

struct Options {
    seconds: u64,
    targets: Vec<String>,
}

/// One target's run, as the table shows it.
struct Row {
    target: String,
    seconds: f64,
    executions: Option<u64>,
    exec_per_s: Option<u64>,
    corpus: Option<u64>,
    findings: Vec<PathBuf>,
    failure: Option<String>,
}

pub fn run(args: &[String]) -> Result<(), String> {
    let options = parse_args(args)?;
    ensure_cargo_fuzz()?;
    let toolchain = Toolchain::pick()?;
    eprintln!("xtask: fuzzing with {}", toolchain.describe());
    let known = list_targets(&toolchain)?;
    let targets = if options.targets.is_empty() {
        known.clone()
    } else {
        for t in &options.targets {
            if !known.contains(t) {
                return Err(format!(
                    "unknown fuzz target '{t}'; the targets are: {}",
                    known.join(", ")
                ));
            }
        }
        options.targets.clone()
    };
    // One build of every target with output shown (the first takes several minutes); the
    // runs below then start at once.
    shell::run(
        toolchain
            .cargo_fuzz()
            .args(["build", "--sanitizer", "none"]),
    )?;
    let mut rows = Vec::new();
    for target in &targets {
        rows.push(run_target(&toolchain, target, options.seconds)?);
    }
    print_table(&rows);
    let mut problems = Vec::new();
    for row in &rows {
        for path in &row.findings {
            problems.push(format!(
                "{}: crashing input saved at {} (reproduce: cd fuzz && cargo +nightly fuzz run \
                 --sanitizer none {} {})",
                row.target,
                path.display(),
                row.target,
                path.display()
            ));
        }
        if let Some(failure) = &row.failure {
            problems.push(format!("{}: {failure}", row.target));
        }
    }
    if problems.is_empty() {
        Ok(())
    } else {
        Err(format!(
            "fuzzing found problems:\n  {}",
            problems.join("\n  ")
        ))
    }
}

fn parse_args(args: &[String]) -> Result<Options, String> {
    let mut options = Options {
        seconds: DEFAULT_SECONDS,
        targets: Vec::new(),
    };
    let mut args = args.iter();
    while let Some(arg) = args.next() {
        if arg == "--seconds" {
            let value = args.next().ok_or("--seconds needs a number of seconds")?;
            options.seconds = value
                .parse()
                .ok()
                .filter(|s| *s > 0)
                .ok_or_else(|| format!("--seconds: '{value}' is not a whole number > 0"))?;
        } else if arg.starts_with('-') {
            return Err(format!(
                "fuzz: unknown option '{arg}'; usage: cargo xtask fuzz [--seconds N] [TARGET...]"
            ));
        } else {
            options.targets.push(arg.clone());
        }
    }
    Ok(options)
}

/// cargo-fuzz from crates.io, built from source once per machine.
fn ensure_cargo_fuzz() -> Result<(), String> {
    let bin = cargo_bin_dir().join("cargo-fuzz");
    if shell::version_of(&bin, "--version").is_some() {
        return Ok(());
    }
    eprintln!(
        "xtask: installing cargo-fuzz {CARGO_FUZZ_VERSION} from crates.io (this takes several \
         minutes; done once per machine)"
    );
    let started = Instant::now();
    shell::run(shell::cargo().args([
        "install",
        "cargo-fuzz",
        "--locked",
        "--version",
        CARGO_FUZZ_VERSION,
    ]))?;
    eprintln!(
        "xtask: cargo-fuzz installed in {:.0} s",
        started.elapsed().as_secs_f64()
    );
    Ok(())
}

/// The compiler that builds the targets.
enum Toolchain {
    Nightly,
    StableBootstrap,
}

impl Toolchain {
    fn pick() -> Result<Toolchain, String> {
        let out = shell::capture(Command::new("rustup").args(["toolchain", "list"]))?;
        let listed = String::from_utf8_lossy(&out.stdout).into_owned();
        Ok(if listed.lines().any(|l| l.starts_with("nightly")) {
            Toolchain::Nightly
        } else {
            Toolchain::StableBootstrap
        })
    }

    fn describe(&self) -> &'static str {
        match self {
            Toolchain::Nightly => "the nightly toolchain",
            Toolchain::StableBootstrap => {
                "the stable toolchain with RUSTC_BOOTSTRAP=1 (no nightly toolchain installed)"
            }
        }
    }

    /// `cargo fuzz` in `fuzz/`, through rustup's cargo so that `+toolchain` works.
    fn cargo_fuzz(&self) -> Command {
        let rustup_cargo = cargo_bin_dir().join("cargo");
        let mut cmd = Command::new(if rustup_cargo.exists() {
            rustup_cargo
        } else {
            PathBuf::from("cargo")
        });
        // The outer `cargo xtask` pins its own toolchain and tools through these.
        for var in ["RUSTUP_TOOLCHAIN", "CARGO", "RUSTC", "RUSTDOC"] {
            cmd.env_remove(var);
        }
        match self {
            Toolchain::Nightly => {
                cmd.arg("+nightly");
            }
            Toolchain::StableBootstrap => {
                cmd.arg("+stable").env("RUSTC_BOOTSTRAP", "1");
            }
        }
        cmd.arg("fuzz").current_dir(fuzz_dir());
        cmd
    }
}

fn fuzz_dir() -> PathBuf {
    root().join("fuzz")
}

fn list_targets(toolchain: &Toolchain) -> Result<Vec<String>, String> {
    let out = shell::capture(toolchain.cargo_fuzz().arg("list"))?;
    if !out.status.success() {
        return Err(format!(
            "'cargo fuzz list' failed: {}",
            String::from_utf8_lossy(&out.stderr)
        ));
    }
    let targets: Vec<String> = String::from_utf8_lossy(&out.stdout)
        .lines()
        .map(str::trim)
        .filter(|l| !l.is_empty())
        .map(str::to_owned)
        .collect();
    if targets.is_empty() {
        return Err("fuzz/Cargo.toml declares no fuzz target".into());
    }
    Ok(targets)
}

fn run_target(toolchain: &Toolchain, target: &str, seconds: u64) -> Result<Row, String> {
    let work = fuzz_dir().join("target").join("work-corpus").join(target);
    let seeds = fuzz_dir().join("corpus").join(target);
    let logs = fuzz_dir().join("target").join("logs");
    for dir in [&work, &seeds, &logs] {
        std::fs::create_dir_all(dir)
            .map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
    }
    let log_path = logs.join(format!("{target}.log"));
    let log = std::fs::File::create(&log_path)
        .map_err(|e| format!("cannot create {}: {e}", log_path.display()))?;
    let log_err = log
        .try_clone()
        .map_err(|e| format!("cannot share {}: {e}", log_path.display()))?;
    let mut cmd = toolchain.cargo_fuzz();
    cmd.args(["run", "--sanitizer", "none", target])
        .arg(&work)
        .arg(&seeds)
        .arg("--")
        .arg(format!("-max_total_time={seconds}"))
        .arg(format!("-timeout={INPUT_TIMEOUT_S}"))
        .arg("-print_final_stats=1");
    // Tokens of the input format (numbers at the edge of f64, units, column and query keys)
    // that coverage feedback alone finds slowly.
    let dict = fuzz_dir().join("dict").join(format!("{target}.dict"));
    if dict.exists() {
        cmd.arg(format!("-dict={}", dict.display()));
    }
    cmd.stdin(Stdio::null()).stdout(log).stderr(log_err);
    eprintln!(
        "xtask: fuzzing {target} for {seconds} s (libFuzzer log: {})",
        log_path.display()
    );
    let started = Instant::now();
    let status = cmd
        .status()
        .map_err(|e| format!("cannot start '{}': {e}", shell::describe(&cmd)))?;
    let elapsed = started.elapsed().as_secs_f64();
    let text = std::fs::read_to_string(&log_path).unwrap_or_default();
    let findings = artifacts_written(&text);
    let failure = if status.success() || !findings.is_empty() {
        None
    } else {
        let tail: Vec<&str> = text.lines().rev().take(15).collect();
        let tail: Vec<&str> = tail.into_iter().rev().collect();
        Some(format!(
            "libFuzzer stopped ({status}) without saving an input; last lines of {}:\n{}",
            log_path.display(),
            tail.join("\n")
        ))
    };
    Ok(Row {
        target: target.to_owned(),
        // libFuzzer's own count leaves out the build, which cargo fuzz redoes when a source
        // changed since the build above.
        seconds: fuzzing_seconds(&text).unwrap_or(elapsed),
        executions: stat(&text, "stat::number_of_executed_units:"),
        exec_per_s: stat(&text, "stat::average_exec_per_sec:"),
        corpus: corpus_size(&text).or_else(|| count_files(&work)),
        findings,
        failure,
    })
}

/// Paths of the inputs libFuzzer saved (`Test unit written to <path>`).
fn artifacts_written(log: &str) -> Vec<PathBuf> {
    log.lines()
        .filter_map(|l| l.split_once("Test unit written to "))
        .map(|(_, path)| {
            let path = Path::new(path.trim());
            if path.is_absolute() {
                path.to_path_buf()
            } else {
                fuzz_dir().join(path)
            }
        })
        .collect()
}

/// A `stat::name: value` line of `-print_final_stats=1`.
fn stat(log: &str, name: &str) -> Option<u64> {
    log.lines()
        .rev()
        .find_map(|l| l.trim().strip_prefix(name))
        .and_then(|v| v.trim().parse().ok())
}

/// Seconds spent fuzzing, from libFuzzer's `Done N runs in S second(s)`.
fn fuzzing_seconds(log: &str) -> Option<f64> {
    log.lines().rev().find_map(|l| {
        let after = &l[l.find(" runs in ")? + " runs in ".len()..];
        after.split_whitespace().next()?.parse().ok()
    })
}

/// Entries of the in-memory corpus on libFuzzer's last status line (`corp: 45/3kb`).
fn corpus_size(log: &str) -> Option<u64> {
    log.lines().rev().find_map(|l| {
        let after = &l[l.find("corp: ")? + "corp: ".len()..];
        after.split('/').next()?.trim().parse().ok()
    })
}

fn count_files(dir: &Path) -> Option<u64> {
    Some(std::fs::read_dir(dir).ok()?.flatten().count() as u64)
}

fn print_table(rows: &[Row]) {
    let show = |v: Option<u64>| v.map_or_else(|| "-".to_owned(), |v| v.to_string());
    println!();
    println!(
        "{:<12} {:>8} {:>14} {:>10} {:>8} {:>9}",
        "target", "seconds", "executions", "exec/s", "corpus", "findings"
    );
    for row in rows {
        let findings = row.findings.len() + usize::from(row.failure.is_some());
        println!(
            "{:<12} {:>8.0} {:>14} {:>10} {:>8} {:>9}",
            row.target,
            row.seconds,
            show(row.executions),
            show(row.exec_per_s),
            show(row.corpus),
            findings
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Source: libFuzzer's own output format (`-print_final_stats=1` and its status lines),
    // common practice, no source.
    const LOG: &str = "\
#2048\tpulse  cov: 120 ft: 300 corp: 40/1210b lim: 21 exec/s: 1024 rss: 50Mb
#9001\tDONE   cov: 130 ft: 333 corp: 45/1337b lim: 30 exec/s: 3000 rss: 51Mb
Done 9001 runs in 3 second(s)
stat::number_of_executed_units: 9001
stat::average_exec_per_sec:     3000
stat::new_units_added:          5
";

    #[test]
    fn reads_libfuzzer_statistics() {
        assert_eq!(stat(LOG, "stat::number_of_executed_units:"), Some(9001));
        assert_eq!(stat(LOG, "stat::average_exec_per_sec:"), Some(3000));
        assert_eq!(corpus_size(LOG), Some(45));
        assert_eq!(fuzzing_seconds(LOG), Some(3.0));
        assert!(artifacts_written(LOG).is_empty());
    }

    #[test]
    fn finds_the_saved_crash() {
        let log = "==1== ERROR: libFuzzer: deadly signal\nartifact_prefix='/w/fuzz/artifacts/units/'; \
                   Test unit written to /w/fuzz/artifacts/units/crash-0a1b\nBase64: AAE=\n";
        assert_eq!(
            artifacts_written(log),
            [PathBuf::from("/w/fuzz/artifacts/units/crash-0a1b")]
        );
    }

    #[test]
    fn parses_options() {
        let args: Vec<String> = ["--seconds", "600", "units", "lot_reader"]
            .map(String::from)
            .to_vec();
        let options = parse_args(&args).unwrap();
        assert_eq!(options.seconds, 600);
        assert_eq!(options.targets, ["units", "lot_reader"]);
        assert!(parse_args(&["--seconds".into(), "0".into()]).is_err());
        assert!(parse_args(&["--fast".into()]).is_err());
        assert_eq!(parse_args(&[]).unwrap().seconds, DEFAULT_SECONDS);
    }
}
