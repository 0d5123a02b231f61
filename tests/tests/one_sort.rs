//! The page carries one copy of the standard library's sort for positions and one for numbers
//! (`bandgauge_core::order`): a `sort_by` with a closure of its own in the core or the app
//! compiles to another copy, about 5 KB of wasm (DEVELOPERS.md, "Page size"). This test names
//! the file and line of any direct sort call outside `core/src/order.rs`; code in `#[cfg(test)]`
//! modules and `tests.rs` files is not shipped and not checked.

use std::fs;
use std::path::{Path, PathBuf};

const DIRECT_SORTS: [&str; 6] = [
    ".sort()",
    ".sort_by(",
    ".sort_by_key(",
    ".sort_by_cached_key(",
    ".sort_unstable",
    ".select_nth_unstable",
];

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    for entry in fs::read_dir(dir).expect("source folder is readable") {
        let path = entry.expect("folder entry").path();
        if path.is_dir() {
            rust_files(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs") {
            out.push(path);
        }
    }
}

/// Lines of shipped code: up to the first `#[cfg(test)]`, comments dropped.
fn shipped_lines(text: &str) -> impl Iterator<Item = (usize, &str)> {
    text.lines()
        .enumerate()
        .take_while(|(_, line)| line.trim() != "#[cfg(test)]")
        .map(|(i, line)| (i + 1, line.split("//").next().unwrap_or("")))
}

fn direct_sorts(root: &Path) -> Vec<String> {
    let mut files = Vec::new();
    for crate_dir in ["core/src", "app/src"] {
        rust_files(&root.join(crate_dir), &mut files);
    }
    let mut found = Vec::new();
    for file in files {
        let name = file
            .strip_prefix(root)
            .unwrap_or(&file)
            .display()
            .to_string();
        if name.ends_with("core/src/order.rs") || name.ends_with("tests.rs") {
            continue;
        }
        let text = fs::read_to_string(&file).expect("source file is readable");
        for (line, code) in shipped_lines(&text) {
            if let Some(call) = DIRECT_SORTS.iter().find(|c| code.contains(*c)) {
                found.push(format!(
                    "{name}:{line}: {call} (sort through bandgauge_core::order)"
                ));
            }
        }
    }
    found
}

#[test]
fn the_core_and_the_app_sort_only_through_core_order() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let found = direct_sorts(&root);
    assert!(found.is_empty(), "direct sorts:\n{}", found.join("\n"));
}

#[test]
fn a_direct_sort_is_found() {
    let text = "fn f(v: &mut Vec<u8>) {\n    v.sort_by(|a, b| a.cmp(b)); // here\n}\n#[cfg(test)]\nmod tests { fn g(v: &mut Vec<u8>) { v.sort(); } }\n";
    let hits: Vec<(usize, &str)> = shipped_lines(text)
        .filter(|(_, code)| DIRECT_SORTS.iter().any(|c| code.contains(c)))
        .collect();
    assert_eq!(hits.len(), 1);
    assert_eq!(hits[0].0, 2);
}
