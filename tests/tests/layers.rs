//! The core's one-way layers as a test: every module of `core/src` has a place in [`LAYERS`],
//! and no module uses (`use crate::x`, a `crate::x::` path, or `super::` out of its own file)
//! a module above it. The table is read bottom-up; DEVELOPERS.md draws it.
//!
//! Only code is checked: comments (doc links may point anywhere) and the `#[cfg(test)]` module
//! at the end of a file (tests may use whatever they check against) are skipped.

use std::path::{Path, PathBuf};

/// The core's modules bottom-up, by layer. A module may use every module listed before it
/// (in a lower layer, or earlier in its own layer) and none listed after it. A new module goes
/// into the layer of what it is, after everything it uses; `lots::x` names `core/src/lots/x.rs`.
const LAYERS: &[(&str, &[&str])] = &[
    (
        "foundation",
        &["order", "constants", "units", "fermi_dirac"],
    ),
    ("data", &["params", "materials", "errors"]),
    (
        "models",
        &[
            "bandgap",
            "dos",
            "bgn",
            "ionization",
            "intrinsic",
            "mobility",
        ],
    ),
    ("solver", &["neutrality", "sweep"]),
    (
        "conversions",
        &[
            "empirical",
            "resistivity",
            "compare",
            "probe",
            "uncertainty",
            "vdp",
            "hall",
        ],
    ),
    (
        "lots",
        &[
            "lots::columns",
            "lots::verdict",
            "lots::stats",
            "lots::map",
            "lots::reader",
            "lots::book",
            "lots",
        ],
    ),
];

fn core_src() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("tests/ has a parent")
        .join("core/src")
}

/// Position of `module` in the bottom-up order, with its layer's name.
fn rank(module: &str) -> Option<(usize, &'static str)> {
    LAYERS
        .iter()
        .flat_map(|&(layer, modules)| modules.iter().map(move |&m| (m, layer)))
        .enumerate()
        .find(|(_, (m, _))| *m == module)
        .map(|(i, (_, layer))| (i, layer))
}

/// Every module file of the core as (module path, file), without the crate root `lib.rs`.
fn core_modules() -> Vec<(String, PathBuf)> {
    fn walk(dir: &Path, prefix: &str, out: &mut Vec<(String, PathBuf)>) {
        let mut entries: Vec<PathBuf> = std::fs::read_dir(dir)
            .unwrap_or_else(|e| panic!("cannot list {}: {e}", dir.display()))
            .flatten()
            .map(|e| e.path())
            .collect();
        entries.sort();
        for path in entries {
            let name = path.file_name().and_then(|n| n.to_str()).unwrap_or("");
            if path.is_dir() {
                walk(&path, &format!("{prefix}{name}::"), out);
            } else if let Some(stem) = name.strip_suffix(".rs") {
                let module = match (prefix, stem) {
                    ("", "lib") => continue,
                    (_, "mod") => prefix.trim_end_matches("::").to_owned(),
                    _ => format!("{prefix}{stem}"),
                };
                out.push((module, path));
            }
        }
    }
    let mut out = Vec::new();
    walk(&core_src(), "", &mut out);
    assert!(out.len() >= 20, "found only {} core modules", out.len());
    out
}

/// The identifier path that starts `text` ("a::b::C" of "a::b::C;"), as segments.
fn path_segments(text: &str) -> Vec<&str> {
    let mut segments = Vec::new();
    let mut rest = text;
    loop {
        let end = rest
            .find(|c: char| !(c.is_alphanumeric() || c == '_'))
            .unwrap_or(rest.len());
        if end == 0 {
            break;
        }
        segments.push(&rest[..end]);
        match rest[end..].strip_prefix("::") {
            Some(next) => rest = next,
            None => break,
        }
    }
    segments
}

/// The module of the table a crate-relative path lands in: the longest table entry it starts
/// with ("lots::book" for `lots::book::LotBook`, "lots" for `lots::read_str`).
fn target_module(segments: &[&str]) -> Option<String> {
    (1..=segments.len().min(2))
        .rev()
        .map(|n| segments[..n].join("::"))
        .find(|m| rank(m).is_some())
}

/// Every use of a module above `module` in `text` (the source of `file`), as messages naming
/// the file and line.
fn upward_uses(file: &str, module: &str, text: &str) -> Vec<String> {
    let (own_rank, own_layer) =
        rank(module).unwrap_or_else(|| panic!("{file}: module {module} is not in LAYERS"));
    let parent: Vec<&str> = {
        let mut p: Vec<&str> = module.split("::").collect();
        p.pop();
        p
    };
    let lines: Vec<&str> = text.lines().collect();
    let mut found = Vec::new();
    for (index, raw) in lines.iter().enumerate() {
        let trimmed = raw.trim();
        let next = lines[index + 1..]
            .iter()
            .map(|l| l.trim())
            .find(|l| !l.is_empty())
            .unwrap_or("");
        if trimmed == "#[cfg(test)]" && next.starts_with("mod ") {
            break;
        }
        let code = match raw.find("//") {
            Some(comment) => &raw[..comment],
            None => raw,
        };
        for (keyword, base) in [("crate::", Vec::new()), ("super::", parent.clone())] {
            let mut from = 0;
            while let Some(at) = code[from..].find(keyword) {
                let start = from + at;
                from = start + keyword.len();
                let before = code[..start].chars().next_back();
                if before.is_some_and(|c| c.is_alphanumeric() || c == '_' || c == '$') {
                    continue;
                }
                let mut segments: Vec<&str> = base.clone();
                segments.extend(path_segments(&code[from..]));
                let place = format!("{file}:{}", index + 1);
                let Some(target) = target_module(&segments) else {
                    found.push(format!(
                        "{place}: `{}` names `crate::{}`, which is no module of the layer table; \
                         name the module that defines the item (and put a new module into \
                         LAYERS in tests/tests/layers.rs)",
                        trimmed,
                        segments.join("::")
                    ));
                    continue;
                };
                let (target_rank, target_layer) = rank(&target).expect("target is in the table");
                if target_rank > own_rank {
                    found.push(format!(
                        "{place}: `{trimmed}`: {module} (layer {own_layer}) uses {target} \
                         (layer {target_layer}), which stands above it; move what both need \
                         down, or pass it in as an argument"
                    ));
                }
            }
        }
    }
    found
}

#[test]
fn every_core_module_is_in_the_layer_table_and_every_entry_exists() {
    let modules: Vec<String> = core_modules().into_iter().map(|(m, _)| m).collect();
    let missing: Vec<&String> = modules.iter().filter(|m| rank(m).is_none()).collect();
    assert!(
        missing.is_empty(),
        "core modules missing from LAYERS in tests/tests/layers.rs (add each to the layer it \
         belongs to, after the modules it uses): {missing:?}"
    );
    let stale: Vec<&str> = LAYERS
        .iter()
        .flat_map(|(_, m)| m.iter().copied())
        .filter(|entry| !modules.iter().any(|m| m == entry))
        .collect();
    assert!(
        stale.is_empty(),
        "LAYERS in tests/tests/layers.rs names modules that no longer exist: {stale:?}"
    );
}

#[test]
fn no_core_module_uses_a_layer_above_it() {
    let root = core_src();
    let mut found = Vec::new();
    for (module, path) in core_modules() {
        let text = std::fs::read_to_string(&path)
            .unwrap_or_else(|e| panic!("cannot read {}: {e}", path.display()));
        let file = format!(
            "core/src/{}",
            path.strip_prefix(&root).unwrap_or(&path).display()
        );
        found.extend(upward_uses(&file, &module, &text));
    }
    assert!(
        found.is_empty(),
        "imports against the layer order (see LAYERS in tests/tests/layers.rs and the layer \
         map in DEVELOPERS.md):\n{}",
        found.join("\n")
    );
}

#[test]
fn the_check_names_the_file_and_line_of_an_upward_use() {
    // A model taking its error type from the solver above it, as the core once did.
    let text = "//! Header.\n\nuse crate::constants::thermal_energy_ev;\n\
                use crate::neutrality::CarrierError;\n";
    let found = upward_uses("core/src/intrinsic.rs", "intrinsic", text);
    assert_eq!(found.len(), 1, "{found:?}");
    assert!(
        found[0].starts_with("core/src/intrinsic.rs:4: `use crate::neutrality::CarrierError;`"),
        "{}",
        found[0]
    );
    assert!(found[0].contains("intrinsic (layer models) uses neutrality (layer solver)"));

    // A full path in code, and `super::` out of a lots file into a sibling above it.
    let text = "fn f() { crate::lots::book::LotBook::new(); }\nuse super::book::LotBook;\n";
    let found = upward_uses("core/src/lots/reader.rs", "lots::reader", text);
    assert_eq!(found.len(), 2, "{found:?}");
    assert!(found[0].starts_with("core/src/lots/reader.rs:1:"));
    assert!(found[1].starts_with("core/src/lots/reader.rs:2:"));
    assert!(found[1].contains("uses lots::book (layer lots)"));

    // An item through the crate root hides its module.
    let found = upward_uses("core/src/units.rs", "units", "use crate::Material;\n");
    assert_eq!(found.len(), 1, "{found:?}");
    assert!(found[0].contains("no module of the layer table"));
}

#[test]
fn comments_and_the_test_module_are_not_checked() {
    let text = "/// See [`crate::neutrality::solve`].\nfn f() {} // crate::lots::LotBook\n\
                #[cfg(test)]\nmod tests {\n    use crate::neutrality::solve;\n}\n";
    assert_eq!(
        upward_uses("core/src/intrinsic.rs", "intrinsic", text),
        Vec::<String>::new()
    );
    // A downward use and a use of the module itself pass.
    let text = "use crate::materials::Material;\nfn g() { crate::lots::read_str; }\n";
    assert!(upward_uses("core/src/lots/mod.rs", "lots", text).is_empty());
}
