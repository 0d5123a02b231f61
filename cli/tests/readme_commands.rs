//! Every `bandgauge` command the READMEs show runs as written: each line of a fenced shell
//! block in `README.md` and `demo-wafers/README.md` that invokes the CLI
//! (`cargo run -q -p bandgauge-cli -- ...` or `bandgauge ...`) is run through `sh -c` (so
//! globs and redirections work as in a shell) against the binary cargo built for these tests,
//! from a scratch copy of the repository root, and fails on a refusal (exit 2), a panic
//! (exit 101) or a signal, naming the README line. Documentation that drifts from behaviour is
//! then a red test run.
//!
//! `cargo xtask ...` lines are out of scope here: they build, serve or test the whole project,
//! and CI runs `cargo xtask test` itself.
//!
//! The scratch root is a temporary folder holding a symbolic link to every top-level entry of
//! the repository (except `target` and `.git`), so relative paths and globs such as
//! `demo-wafers/*` resolve exactly as in the repository root, while files a command writes
//! (`> sweep.csv`) land in the scratch folder and the checkout stays clean.

#![cfg(unix)]

use std::path::{Path, PathBuf};
use std::process::Command;

/// The exit code of refused input.
const EXIT_BAD_INPUT: i32 = 2;
/// The exit code of a Rust panic.
const EXIT_PANIC: i32 = 101;

/// How the READMEs invoke the CLI: the prefix is replaced by the built binary.
const INVOCATIONS: [&str; 2] = ["cargo run -q -p bandgauge-cli -- ", "bandgauge "];

fn repository_root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("cli/ has a parent")
        .to_path_buf()
}

/// One command found in a README.
#[derive(Debug)]
struct Documented {
    /// `README.md:57`.
    place: String,
    /// The line as written.
    line: String,
    /// The arguments after the invocation prefix, as shell text.
    arguments: String,
}

/// The CLI commands of the fenced shell blocks (` ```sh `, or no language given) of `readme`.
fn documented_commands(readme: &str) -> Vec<Documented> {
    let path = repository_root().join(readme);
    let text = std::fs::read_to_string(&path)
        .unwrap_or_else(|e| panic!("{}: cannot read: {e}", path.display()));
    let mut commands = Vec::new();
    let mut in_shell_block = false;
    let mut in_other_block = false;
    for (index, raw) in text.lines().enumerate() {
        let line = raw.trim();
        if let Some(info) = line.strip_prefix("```") {
            if in_shell_block || in_other_block {
                in_shell_block = false;
                in_other_block = false;
            } else if matches!(info.trim(), "" | "sh" | "shell" | "bash") {
                in_shell_block = true;
            } else {
                in_other_block = true;
            }
            continue;
        }
        if !in_shell_block || line.is_empty() {
            continue;
        }
        let place = format!("{readme}:{}", index + 1);
        // `cargo xtask` lines are run by CI itself (see the module header).
        if line.starts_with("cargo xtask") {
            continue;
        }
        let arguments = INVOCATIONS
            .iter()
            .find_map(|prefix| line.strip_prefix(prefix))
            .unwrap_or_else(|| {
                panic!(
                    "{place}: {line:?} is in a shell block but is neither `cargo xtask ...` nor \
                     a CLI invocation ({INVOCATIONS:?}); teach this test about it"
                )
            });
        commands.push(Documented {
            place,
            line: line.to_owned(),
            arguments: arguments.to_owned(),
        });
    }
    commands
}

/// A scratch folder that looks like the repository root (see the module header).
fn scratch_root() -> PathBuf {
    let scratch = std::env::temp_dir().join(format!("bandgauge-readme-{}", std::process::id()));
    if scratch.exists() {
        std::fs::remove_dir_all(&scratch).expect("old scratch folder removed");
    }
    std::fs::create_dir_all(&scratch).expect("scratch folder");
    let root = repository_root();
    for entry in std::fs::read_dir(&root)
        .expect("repository root lists")
        .flatten()
    {
        let name = entry.file_name();
        if name == "target" || name == ".git" {
            continue;
        }
        std::os::unix::fs::symlink(entry.path(), scratch.join(&name)).expect("symlink");
    }
    scratch
}

/// Single-quotes `text` for `sh`.
fn shell_quoted(text: &str) -> String {
    format!("'{}'", text.replace('\'', r"'\''"))
}

#[test]
fn every_readme_command_runs_as_written() {
    let mut commands = documented_commands("README.md");
    commands.extend(documented_commands("demo-wafers/README.md"));
    // The READMEs show one command per CLI subcommand at least; an empty list would mean the
    // parser lost them.
    for subcommand in ["carriers ", "convert ", "probe ", "lots ", "materials"] {
        assert!(
            commands.iter().any(|c| c.arguments.starts_with(subcommand)),
            "no documented `{subcommand}` command found in {commands:#?}"
        );
    }
    let binary = shell_quoted(env!("CARGO_BIN_EXE_bandgauge"));
    let scratch = scratch_root();
    let mut failures = Vec::new();
    for command in &commands {
        let output = Command::new("sh")
            .arg("-c")
            .arg(format!("{binary} {}", command.arguments))
            .current_dir(&scratch)
            .output()
            .expect("sh runs");
        let stderr = String::from_utf8_lossy(&output.stderr);
        match output.status.code() {
            Some(EXIT_BAD_INPUT) => failures.push(format!(
                "{}: `{}` was refused (exit 2): {stderr}",
                command.place, command.line
            )),
            Some(EXIT_PANIC) => failures.push(format!(
                "{}: `{}` panicked (exit 101): {stderr}",
                command.place, command.line
            )),
            None => failures.push(format!(
                "{}: `{}` was killed by a signal",
                command.place, command.line
            )),
            Some(_) => {}
        }
    }
    std::fs::remove_dir_all(&scratch).ok();
    assert!(
        failures.is_empty(),
        "documented commands that do not run:\n{}",
        failures.join("\n")
    );
}

#[test]
fn the_readme_parser_finds_shell_blocks_only() {
    // The commands of README.md's command-line tour, each with its line.
    let commands = documented_commands("README.md");
    assert!(commands.len() >= 7, "{commands:#?}");
    assert!(commands.iter().all(|c| c.place.starts_with("README.md:")));
    assert!(
        commands
            .iter()
            .any(|c| c.arguments == "lots demo-wafers/* --spec-resistivity 8:12")
    );
    // demo-wafers/README.md shows `bandgauge lots ...`.
    let demo = documented_commands("demo-wafers/README.md");
    assert!(
        demo.iter()
            .all(|c| c.arguments.starts_with("lots demo-wafers/")),
        "{demo:#?}"
    );
    assert_eq!(demo.len(), 2, "{demo:#?}");
}
