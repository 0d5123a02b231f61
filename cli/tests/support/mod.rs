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

/// A command line for the binary: either one string, split at white space with single
/// quotes keeping a value that holds spaces together (`--amps '1 mA'`), or the
/// arguments one by one in an array or slice.
pub trait CommandLine {
    /// The arguments after the program name.
    fn arguments(&self) -> Vec<String>;
}

impl CommandLine for str {
    fn arguments(&self) -> Vec<String> {
        let mut words = Vec::new();
        let mut word: Option<String> = None;
        let mut quoted = false;
        for c in self.chars() {
            match c {
                '\'' => {
                    quoted = !quoted;
                    word.get_or_insert_with(String::new);
                }
                c if c.is_whitespace() && !quoted => words.extend(word.take()),
                c => word.get_or_insert_with(String::new).push(c),
            }
        }
        assert!(!quoted, "unclosed quote in {self:?}");
        words.extend(word);
        words
    }
}

impl CommandLine for String {
    fn arguments(&self) -> Vec<String> {
        self.as_str().arguments()
    }
}

impl CommandLine for [&str] {
    fn arguments(&self) -> Vec<String> {
        self.iter().map(|a| (*a).to_owned()).collect()
    }
}

impl<const N: usize> CommandLine for [&str; N] {
    fn arguments(&self) -> Vec<String> {
        self[..].arguments()
    }
}

fn run<C: CommandLine + ?Sized>(command: &C) -> (Vec<String>, Run) {
    let arguments = command.arguments();
    let run = bandgauge(&arguments.iter().map(String::as_str).collect::<Vec<_>>());
    (arguments, run)
}

/// Runs `bandgauge` with `command`, expects success and returns stdout.
pub fn success<C: CommandLine + ?Sized>(command: &C) -> String {
    let (args, run) = run(command);
    assert_eq!(run.code, 0, "bandgauge {args:?} failed: {}", run.stderr);
    assert!(
        run.stderr.is_empty(),
        "bandgauge {args:?} wrote to stderr: {}",
        run.stderr
    );
    run.stdout
}

/// Runs `bandgauge` with `command` and parses stdout as JSON.
pub fn json<C: CommandLine + ?Sized>(command: &C) -> Value {
    let stdout = success(command);
    serde_json::from_str(&stdout).unwrap_or_else(|e| {
        panic!(
            "bandgauge {:?}: not JSON ({e}): {stdout}",
            command.arguments()
        )
    })
}

/// Expects `command` to be refused with exit code 2 and nothing on stdout; returns
/// stderr for checks of its own (a usage error from clap, an operating-system message).
pub fn refusal<C: CommandLine + ?Sized>(command: &C) -> String {
    let (args, run) = run(command);
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
    run.stderr
}

/// Expects the input to be refused with exit code 2, nothing on stdout, and
/// exactly `message` (one line, "error: " prefix added here) on stderr.
pub fn refused<C: CommandLine + ?Sized>(command: &C, message: &str) {
    assert_eq!(
        refusal(command),
        format!("error: {message}\n"),
        "bandgauge {:?}",
        command.arguments()
    );
}

/// Expects a usage error: refused (exit code 2, nothing on stdout) with an "error: " line.
pub fn usage_error<C: CommandLine + ?Sized>(command: &C) {
    let stderr = refusal(command);
    assert!(stderr.starts_with("error: "), "{stderr}");
}

/// A number from a JSON object, panicking with the key when absent.
pub fn number(value: &Value, key: &str) -> f64 {
    value[key]
        .as_f64()
        .unwrap_or_else(|| panic!("no number {key:?} in {value}"))
}

/// Expects the number `key` of `value` to lie within the relative `tolerance` of `expected`.
pub fn assert_near(value: &Value, key: &str, expected: f64, tolerance: f64) {
    let actual = number(value, key);
    assert!(
        relative_difference(actual, expected) < tolerance,
        "{key}: {actual}, expected {expected} within a relative {tolerance:e}"
    );
}

/// Relative difference |a - b| / |b|.
pub fn relative_difference(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}
