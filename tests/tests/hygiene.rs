//! Repository hygiene as a test: every Rust file opens with a `//!` header saying what
//! it owns, no test is switched off with an ignore attribute, and nothing cites
//! material this project is not allowed to cite.

use std::path::{Path, PathBuf};

fn workspace_root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("tests/ has a parent")
        .to_path_buf()
}

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        let name = path.file_name().and_then(|n| n.to_str()).unwrap_or("");
        if path.is_dir() {
            if !matches!(
                name,
                "target" | "dist" | "artifacts" | "node_modules" | ".git"
            ) {
                rust_files(&path, out);
            }
        } else if name.ends_with(".rs") {
            out.push(path);
        }
    }
}

fn all_rust_files() -> Vec<PathBuf> {
    let mut files = Vec::new();
    for krate in ["core", "app", "cli", "tests", "xtask"] {
        rust_files(&workspace_root().join(krate), &mut files);
    }
    assert!(
        files.len() >= 10,
        "hygiene scan found only {} Rust files",
        files.len()
    );
    files
}

#[test]
fn every_rust_file_has_a_module_header() {
    let missing: Vec<String> = all_rust_files()
        .into_iter()
        .filter(|p| {
            let text = std::fs::read_to_string(p).unwrap_or_default();
            !text.trim_start().starts_with("//!")
        })
        .map(|p| p.display().to_string())
        .collect();
    assert!(
        missing.is_empty(),
        "files without a //! header: {missing:#?}"
    );
}

#[test]
fn no_test_is_ignored() {
    let needle = ["#[", "ignore"].concat();
    let offenders: Vec<String> = all_rust_files()
        .into_iter()
        .filter(|p| {
            std::fs::read_to_string(p)
                .unwrap_or_default()
                .contains(&needle)
        })
        .map(|p| p.display().to_string())
        .collect();
    assert!(offenders.is_empty(), "ignored tests in: {offenders:#?}");
}
