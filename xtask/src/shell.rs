//! Running commands: echo what runs, and fail with a message that names the command.

use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};

/// The workspace root (the parent of this crate's folder).
pub fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("xtask lives one level below the workspace root")
        .to_path_buf()
}

/// Describes a command for messages.
pub fn describe(cmd: &Command) -> String {
    let mut s = cmd.get_program().to_string_lossy().into_owned();
    for a in cmd.get_args() {
        s.push(' ');
        s.push_str(&a.to_string_lossy());
    }
    s
}

/// Runs a command with inherited output; Err if it cannot start or exits non-zero.
pub fn run(cmd: &mut Command) -> Result<(), String> {
    let what = describe(cmd);
    eprintln!("$ {what}");
    let status = cmd
        .status()
        .map_err(|e| format!("cannot start '{what}': {e}"))?;
    if status.success() {
        Ok(())
    } else {
        Err(format!("'{what}' failed ({status})"))
    }
}

/// Runs a command, captures its output and returns it whatever the exit status.
pub fn capture(cmd: &mut Command) -> Result<Output, String> {
    let what = describe(cmd);
    cmd.stdin(Stdio::null())
        .output()
        .map_err(|e| format!("cannot start '{what}': {e}"))
}

/// The first line a program prints for `--version`, or None when it is missing.
pub fn version_of(program: &Path, arg: &str) -> Option<String> {
    let out = Command::new(program)
        .arg(arg)
        .stdin(Stdio::null())
        .output()
        .ok()?;
    if !out.status.success() {
        return None;
    }
    let text = String::from_utf8_lossy(&out.stdout).into_owned();
    Some(text.lines().next().unwrap_or("").trim().to_string())
}

/// A `cargo` command from the toolchain that runs xtask.
pub fn cargo() -> Command {
    let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".into());
    let mut cmd = Command::new(cargo);
    cmd.current_dir(root());
    cmd
}
