//! Runs the built `bandgauge` binary and checks its exit code, stdout and stderr.

#![allow(dead_code)] // each test file uses its own subset of these helpers

use std::process::Command;

use serde_json::Value;

/// Exit code for refused input (clap's usage errors use the same code).
pub const EXIT_BAD_INPUT: i32 = 2;

/// What one run of the binary gave.
#[derive(Debug)]
pub struct Run {
    /// Exit code.
    pub code: i32,
    /// Standard output.
    pub stdout: String,
    /// Standard error.
    pub stderr: String,
}

/// Runs `bandgauge` with `args`.
pub fn bandgauge(args: &[&str]) -> Run {
    let output = Command::new(env!("CARGO_BIN_EXE_bandgauge"))
        .args(args)
        .output()
        .expect("the bandgauge binary runs");
    Run {
        code: output
            .status
            .code()
            .expect("exited normally, not by a signal"),
        stdout: String::from_utf8(output.stdout).expect("stdout is UTF-8"),
        stderr: String::from_utf8(output.stderr).expect("stderr is UTF-8"),
    }
}

/// Runs `bandgauge` with `args`, expects success and returns stdout.
pub fn success(args: &[&str]) -> String {
    let run = bandgauge(args);
    assert_eq!(run.code, 0, "bandgauge {args:?} failed: {}", run.stderr);
    assert!(
        run.stderr.is_empty(),
        "bandgauge {args:?} wrote to stderr: {}",
        run.stderr
    );
    run.stdout
}

/// Runs `bandgauge` with `args` and parses stdout as JSON.
pub fn json(args: &[&str]) -> Value {
    let stdout = success(args);
    serde_json::from_str(&stdout)
        .unwrap_or_else(|e| panic!("bandgauge {args:?}: not JSON ({e}): {stdout}"))
}

/// Expects the input to be refused with exit code 2, nothing on stdout, and
/// exactly `message` (one line, "error: " prefix added here) on stderr.
pub fn refused(args: &[&str], message: &str) {
    let run = bandgauge(args);
    assert_eq!(
        run.code, EXIT_BAD_INPUT,
        "bandgauge {args:?}: stderr {}",
        run.stderr
    );
    assert!(
        run.stdout.is_empty(),
        "bandgauge {args:?} wrote to stdout: {}",
        run.stdout
    );
    assert_eq!(
        run.stderr,
        format!("error: {message}\n"),
        "bandgauge {args:?}"
    );
}

/// A number from a JSON object, panicking with the key when absent.
pub fn number(value: &Value, key: &str) -> f64 {
    value[key]
        .as_f64()
        .unwrap_or_else(|| panic!("no number {key:?} in {value}"))
}

/// Relative difference |a - b| / |b|.
pub fn relative_difference(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}
