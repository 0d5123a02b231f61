//! `cargo xtask size [--top N]`: where the page's bytes go, as a table.
//!
//! Builds the release page, then optimises the same bound module once more with wasm-opt's
//! `-g` (the shipped module carries no function names) and attributes every function body
//! to a part of the program: our views by module, the physics core, Leptos, the Rust
//! standard library, each other crate. Each part is gzipped (level 9) on its own, so a
//! part's gzip column says what it would cost alone; the parts do not add up exactly to the
//! whole module, whose size as shipped closes the table. Data is split into text (printable
//! runs of six bytes or more) and binary data (number tables, vtables).

use crate::bench::gzip_len as gzip9;
use crate::dist;
use crate::shell;
use crate::tools;
use std::collections::BTreeMap;
use std::process::Command;
use wasmparser::{KnownCustom, Name, Parser, Payload, TypeRef};

const USAGE: &str =
    "size takes only [--top N] (the number of largest functions listed, default 20)";

/// Runs the command.
pub fn run(args: &[String]) -> Result<(), String> {
    let top = match args {
        [] => 20,
        [flag, n] if flag == "--top" => n
            .parse::<usize>()
            .map_err(|_| format!("--top: '{n}' is not a whole number; {USAGE}"))?,
        _ => return Err(format!("{USAGE}, got: {}", args.join(" "))),
    };
    tools::ensure_build_tools()?;
    let dist_dir = dist::build_release()?;
    let shipped = dist::wasm_files(&dist_dir)?;
    let shipped = std::fs::read(&shipped[0])
        .map_err(|e| format!("cannot read {}: {e}", shipped[0].display()))?;
    let work = dist::target_dir().join("bandgauge-dist");
    let named = work.join("named.wasm");
    shell::run(
        Command::new(tools::wasm_opt())
            .arg(format!("--output={}", named.display()))
            .args(["-Oz", "-g"])
            .arg(work.join(dist::BOUND_FILE)),
    )?;
    let named =
        std::fs::read(&named).map_err(|e| format!("cannot read {}: {e}", named.display()))?;
    let module = Module::read(&named)?;
    print!("{}", table(&module, &shipped, top)?);
    Ok(())
}

/// The function bodies (with their names) and data of a module.
#[derive(Debug, Default)]
pub struct Module {
    /// Each defined function's name (or `function N` without one) and its body's bytes.
    pub functions: Vec<(String, Vec<u8>)>,
    /// Every data segment's bytes, one after the other.
    pub data: Vec<u8>,
}

impl Module {
    /// Reads a module; function names come from its `name` section.
    pub fn read(bytes: &[u8]) -> Result<Module, String> {
        let bad = |e: wasmparser::BinaryReaderError| format!("not a readable wasm module: {e}");
        let mut imported = 0u32;
        let mut bodies = Vec::new();
        let mut names = BTreeMap::new();
        let mut data = Vec::new();
        for payload in Parser::new(0).parse_all(bytes) {
            match payload.map_err(bad)? {
                Payload::ImportSection(reader) => {
                    for import in reader.into_imports() {
                        if matches!(import.map_err(bad)?.ty, TypeRef::Func(_)) {
                            imported += 1;
                        }
                    }
                }
                Payload::CodeSectionEntry(body) => bodies.push(bytes[body.range()].to_vec()),
                Payload::DataSection(reader) => {
                    for segment in reader {
                        data.extend_from_slice(segment.map_err(bad)?.data);
                    }
                }
                Payload::CustomSection(section) => {
                    if let KnownCustom::Name(reader) = section.as_known() {
                        for part in reader {
                            if let Name::Function(map) = part.map_err(bad)? {
                                for naming in map {
                                    let naming = naming.map_err(bad)?;
                                    names.insert(naming.index, naming.name.to_string());
                                }
                            }
                        }
                    }
                }
                _ => {}
            }
        }
        let functions = bodies
            .into_iter()
            .enumerate()
            .map(|(i, body)| {
                let index = imported + i as u32;
                let name = names
                    .remove(&index)
                    .unwrap_or_else(|| format!("function {index}"));
                (name, body)
            })
            .collect();
        Ok(Module { functions, data })
    }
}

/// The part of the program a function belongs to, from its (demangled) name.
pub fn part_of(name: &str) -> String {
    let name = without_disambiguators(name);
    if name.starts_with("core::ptr::drop_in_place") || name.starts_with("core::ops::function::") {
        return "closures and drop glue (all crates)".into();
    }
    if name
        .strip_prefix("function ")
        .is_some_and(|n| n.bytes().all(|b| b.is_ascii_digit()))
    {
        return "unnamed".into();
    }
    const BINDING_PREFIXES: [&str; 5] = [
        "__wbindgen",
        "__wbg",
        "__externref",
        "Closure(",
        "intounderlying",
    ];
    if BINDING_PREFIXES.iter().any(|p| name.starts_with(p)) || name.ends_with("externref shim") {
        return BINDINGS.into();
    }
    // Methods of primitive types (`<char>::escape_debug_ext`, `<[u8]>::x`) and the C-named
    // runtime functions (`memcmp`, `hypot`, `__multi3`, the `main` entry shim).
    if primitive_method(&name) || !name.contains("::") {
        return STD.into();
    }
    let owner = owning_path(&name);
    let mut segments = owner.split("::");
    let krate = segments.next().unwrap_or_default();
    match krate {
        "bandgauge_app" => match segments.next() {
            Some(module)
                if module
                    .chars()
                    .next()
                    .is_some_and(|c| c.is_ascii_lowercase()) =>
            {
                if module == "main" {
                    SHELL.into()
                } else {
                    format!("views: {module}")
                }
            }
            _ => SHELL.into(),
        },
        "bandgauge_core" => "physics core (bandgauge-core)".into(),
        "reactive_graph" | "tachys" | "leptos" | "leptos_dom" | "leptos_macro" | "any_spawner"
        | "throw_error" | "or_poisoned" | "send_wrapper" => LEPTOS.into(),
        "core" | "alloc" | "std" | "compiler_builtins" | "dlmalloc" | "hashbrown" | "__rustc"
        | "panic_abort" | "rustc_demangle" => STD.into(),
        "serde" | "serde_core" | "serde_json" | "zmij" | "itoa" | "ryu" => {
            "serde, serde_json".into()
        }
        "plotters" | "plotters_backend" | "plotters_canvas" => "plotters".into(),
        "wasm_bindgen"
        | "js_sys"
        | "web_sys"
        | "console_error_panic_hook"
        | "wasm_bindgen_futures" => BINDINGS.into(),
        other => other.to_string(),
    }
}

/// `<char>::x`, `<[u8]>::x`, `<f64>::x`: an inherent method of a primitive type (whose
/// code is the standard library's), not `<indexmap::IndexMap<..>>::x` or `<T as ..>::x`.
fn primitive_method(name: &str) -> bool {
    const PRIMITIVES: [&str; 16] = [
        "bool", "char", "str", "u8", "u16", "u32", "u64", "u128", "usize", "i8", "i16", "i32",
        "i64", "i128", "isize", "f32",
    ];
    let Some(inner) = name.strip_prefix('<') else {
        return false;
    };
    inner.starts_with('[')
        || inner
            .split_once(">::")
            .is_some_and(|(ty, _)| ty == "f64" || PRIMITIVES.contains(&ty))
}

/// The root component, its helpers and the mount (`main`); the compiler inlines most of the
/// five views' bodies into the root's view switch, so this part holds much of their code.
const SHELL: &str = "views: app shell (App, main, inlined views)";
const STD: &str = "Rust standard library";
const LEPTOS: &str = "Leptos (reactive_graph, tachys, leptos)";
const BINDINGS: &str = "browser bindings (wasm-bindgen, js-sys, web-sys)";

/// `core[c5930c85a12de822]::fmt` -> `core::fmt`: the standard library's crate hashes.
fn without_disambiguators(name: &str) -> String {
    let mut out = String::with_capacity(name.len());
    let mut rest = name;
    while let Some(open) = rest.find('[') {
        out.push_str(&rest[..open]);
        let after = &rest[open + 1..];
        match after.find(']') {
            Some(close) if close > 0 && after[..close].bytes().all(|b| b.is_ascii_hexdigit()) => {
                rest = &after[close + 1..];
            }
            _ => {
                out.push('[');
                rest = after;
            }
        }
    }
    out.push_str(rest);
    out
}

/// The path that says whose code a function is. `<A as B>::f` belongs to A's crate when A
/// is a named type and to B's (the trait's) when A is a generic parameter, a reference, a
/// tuple or a slice; `<A>::f` to A's; a plain path to itself.
fn owning_path(name: &str) -> &str {
    let Some(inner) = name.strip_prefix('<') else {
        return name;
    };
    let (first, second) = match inner.split_once(" as ") {
        Some((a, b)) => (a, Some(b)),
        None => (inner, None),
    };
    let named = |s: &str| {
        s.split("::").next().is_some_and(|k| {
            k.len() > 1
                && k.bytes()
                    .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit() || b == b'_')
        }) && s.contains("::")
    };
    if named(first) {
        first
    } else {
        second.filter(|b| named(b)).unwrap_or(first)
    }
}

/// Parts below this many gzipped bytes share one row.
const SMALL_PART_GZIP: usize = 1024;

/// Splits data into printable text runs (at least six bytes of ASCII letters, digits,
/// punctuation, spaces, tabs or newlines) and the rest.
pub fn split_text(data: &[u8]) -> (Vec<u8>, Vec<u8>) {
    const RUN: usize = 6;
    let printable = |b: u8| (0x20..0x7f).contains(&b) || b == b'\n' || b == b'\t';
    let (mut text, mut binary) = (Vec::new(), Vec::new());
    let mut start = 0;
    while start < data.len() {
        let end = data[start..]
            .iter()
            .position(|&b| !printable(b))
            .map_or(data.len(), |p| start + p);
        if end - start >= RUN {
            text.extend_from_slice(&data[start..end]);
        } else {
            binary.extend_from_slice(&data[start..end]);
        }
        if end < data.len() {
            binary.push(data[end]);
        }
        start = end + 1;
    }
    (text, binary)
}

/// The table `run` prints.
pub fn table(module: &Module, shipped: &[u8], top: usize) -> Result<String, String> {
    let mut parts: BTreeMap<String, (usize, Vec<u8>)> = BTreeMap::new();
    for (name, body) in &module.functions {
        let entry = parts.entry(part_of(name)).or_default();
        entry.0 += 1;
        entry.1.extend_from_slice(body);
    }
    let mut rows = Vec::new();
    let (mut small_count, mut small_parts, mut small_bytes) = (0, 0, Vec::new());
    for (part, (count, bytes)) in &parts {
        let gz = gzip9(bytes)?;
        if gz < SMALL_PART_GZIP {
            small_parts += 1;
            small_count += count;
            small_bytes.extend_from_slice(bytes);
        } else {
            rows.push((gz, bytes.len(), format!("{count}"), part.clone()));
        }
    }
    if small_parts > 0 {
        let label = format!("{small_parts} smaller parts, each under 1 KB gzipped");
        rows.push((
            gzip9(&small_bytes)?,
            small_bytes.len(),
            format!("{small_count}"),
            label,
        ));
    }
    let (text, binary) = split_text(&module.data);
    rows.push((gzip9(&text)?, text.len(), "-".into(), "data: text".into()));
    rows.push((
        gzip9(&binary)?,
        binary.len(),
        "-".into(),
        "data: binary (tables, vtables)".into(),
    ));
    rows.sort_by_key(|row| std::cmp::Reverse(row.0));
    let mut out = String::from(
        "where the release wasm's bytes go (functions named by a wasm-opt -Oz -g build of the \
         same module;\neach part gzipped on its own, so the parts do not add up exactly)\n\n",
    );
    out.push_str(&format!(
        "{:<52} {:>9} {:>9} {:>11}\n",
        "part", "functions", "raw KB", "gzip -9 KB"
    ));
    let kb = |n: usize| n as f64 / 1024.0;
    let (mut sum_raw, mut sum_gz) = (0, 0);
    for (gz, raw, count, part) in &rows {
        sum_raw += raw;
        sum_gz += gz;
        out.push_str(&format!(
            "{part:<52} {count:>9} {:>9.1} {:>11.1}\n",
            kb(*raw),
            kb(*gz)
        ));
    }
    out.push_str(&format!(
        "{:<52} {:>9} {:>9.1} {:>11.1}\n",
        "sum of the parts",
        module.functions.len(),
        kb(sum_raw),
        kb(sum_gz)
    ));
    out.push_str(&format!(
        "{:<52} {:>9} {:>9.1} {:>11.1}\n",
        "whole module as shipped",
        "",
        kb(shipped.len()),
        kb(gzip9(shipped)?)
    ));
    let mut by_size: Vec<usize> = (0..module.functions.len()).collect();
    by_size.sort_by_key(|&i| std::cmp::Reverse(module.functions[i].1.len()));
    out.push_str(&format!(
        "\n{top} largest functions\n{:>9}  name\n",
        "raw KB"
    ));
    for &i in by_size.iter().take(top) {
        let (name, body) = &module.functions[i];
        let name = without_disambiguators(name);
        let shown: String = name.chars().take(110).collect();
        out.push_str(&format!("{:>9.1}  {shown}\n", kb(body.len())));
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A module written by hand after the WebAssembly core specification (binary format,
    /// sections 5.5.1 to 5.5.14, and the `name` custom section of appendix 7.4; section
    /// numbers from memory): one imported
    /// function, two defined ones (the first named `demo::first`, the second unnamed) and
    /// one data segment.
    fn tiny_module() -> Vec<u8> {
        let mut m = vec![0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00];
        // type section: one type, func () -> ()
        m.extend_from_slice(&[0x01, 0x04, 0x01, 0x60, 0x00, 0x00]);
        // import section: "m" "f", a function of type 0
        m.extend_from_slice(&[0x02, 0x07, 0x01, 0x01, b'm', 0x01, b'f', 0x00, 0x00]);
        // function section: two functions of type 0
        m.extend_from_slice(&[0x03, 0x03, 0x02, 0x00, 0x00]);
        // memory section: one memory of at least one page (data needs one)
        m.extend_from_slice(&[0x05, 0x03, 0x01, 0x00, 0x01]);
        // code section: bodies of 2 bytes (no locals, end) and 4 bytes (nop, nop)
        m.extend_from_slice(&[
            0x0a, 0x09, 0x02, 0x02, 0x00, 0x0b, 0x04, 0x00, 0x01, 0x01, 0x0b,
        ]);
        // data section: one active segment at offset 0 holding "hello!\x01"
        m.extend_from_slice(&[0x0b, 0x0d, 0x01, 0x00, 0x41, 0x00, 0x0b, 0x07]);
        m.extend_from_slice(b"hello!\x01");
        // name section: function names, index 1 (the first defined function) "demo::first"
        let mut names = vec![0x04, b'n', b'a', b'm', b'e', 0x01, 0x0e, 0x01, 0x01, 0x0b];
        names.extend_from_slice(b"demo::first");
        m.push(0x00);
        m.push(names.len() as u8);
        m.extend_from_slice(&names);
        m
    }

    #[test]
    fn a_module_is_read_into_named_bodies_and_data() {
        let module = Module::read(&tiny_module()).expect("the hand-written module reads");
        assert_eq!(module.functions.len(), 2);
        assert_eq!(module.functions[0].0, "demo::first");
        assert_eq!(module.functions[0].1, vec![0x00, 0x0b]);
        // Import counted: the second defined function is index 2.
        assert_eq!(module.functions[1].0, "function 2");
        assert_eq!(module.functions[1].1.len(), 4);
        assert_eq!(module.data, b"hello!\x01");
    }

    #[test]
    fn bytes_that_are_not_a_module_are_refused_with_a_reason() {
        let err = Module::read(b"not wasm").unwrap_err();
        assert!(err.starts_with("not a readable wasm module:"), "{err}");
    }

    #[test]
    fn functions_are_attributed_to_the_crate_whose_code_they_are() {
        let cases = [
            (
                "bandgauge_app::report::__component_report_page::hb82e0b4eb0254275",
                "views: report",
            ),
            ("bandgauge_app::__component_app::{{closure}}::hbf50", SHELL),
            ("bandgauge_app::main::h360ee04f9d9f8591", SHELL),
            ("<char>::escape_debug_ext", STD),
            ("<[u8]>::to_vec_in::h1", STD),
            ("<f64>::powi::h1", STD),
            (
                "<indexmap::map::IndexMap<K,V,S>>::insert_full::h1",
                "indexmap",
            ),
            ("<itoa::Buffer>::format::h1", "serde, serde_json"),
            ("memcmp", STD),
            ("intounderlyingsink_write externref shim", BINDINGS),
            (
                "bandgauge_core::neutrality::Problem::solve_at::hbf85",
                "physics core (bandgauge-core)",
            ),
            (
                "<bandgauge_app::state::Workbench as serde_core::de::Deserialize>::deserialize::h8",
                "views: state",
            ),
            (
                "<T as tachys::view::any_view::IntoAny>::into_any::build::h1",
                LEPTOS,
            ),
            (
                "<&mut serde_json::de::Deserializer<R> as serde_core::de::Deserializer>::x",
                "serde, serde_json",
            ),
            (
                "core[c5930c85a12de822]::num::flt2dec::strategy::dragon::format_shortest",
                "Rust standard library",
            ),
            (
                "<f64 as core[c5930c85a12de822]::str::traits::FromStr>::from_str",
                "Rust standard library",
            ),
            (
                "core::ptr::drop_in_place<leptos::x>::h1",
                "closures and drop glue (all crates)",
            ),
            ("sha2::sha256::compress256::hcfec", "sha2"),
            ("__wbindgen_malloc", BINDINGS),
            ("function 17", "unnamed"),
        ];
        for (name, part) in cases {
            assert_eq!(part_of(name), part, "{name}");
        }
    }

    #[test]
    fn hashes_in_brackets_go_and_other_brackets_stay() {
        assert_eq!(
            without_disambiguators("core[c59a]::fmt[0f]::x"),
            "core::fmt::x"
        );
        assert_eq!(without_disambiguators("elem[0]"), "elem");
        assert_eq!(without_disambiguators("a[x]::b[]"), "a[x]::b[]");
    }

    #[test]
    fn data_is_split_into_text_runs_and_the_rest() {
        let (text, binary) = split_text(b"\x01\x02short\x00a long sentence\x00\x7f");
        assert_eq!(text, b"a long sentence");
        assert_eq!(binary, b"\x01\x02short\x00\x00\x7f");
    }

    #[test]
    fn the_table_lists_every_part_and_the_largest_functions() {
        // Bytes that do not compress (a linear congruential sequence with Numerical Recipes'
        // constants, from memory; any full-period pair would do), so the three large
        // parts stay above the 1 KB row threshold once gzipped.
        let noise = |n: usize, seed: u32| -> Vec<u8> {
            let mut x = seed;
            (0..n)
                .map(|_| {
                    x = x.wrapping_mul(1_664_525).wrapping_add(1_013_904_223);
                    (x >> 24) as u8
                })
                .collect()
        };
        let module = Module {
            functions: vec![
                ("bandgauge_core::a::f".into(), noise(3000, 1)),
                ("bandgauge_app::carriers::g".into(), noise(2000, 2)),
                ("core::fmt::h".into(), noise(1500, 3)),
                ("roots::brent".into(), vec![4; 10]),
                ("slotmap::x".into(), vec![5; 10]),
            ],
            data: [b"some text here".as_slice(), &noise(2000, 4)].concat(),
        };
        let out = table(&module, &[0u8; 64], 2).expect("table");
        for part in [
            "physics core",
            "views: carriers",
            "Rust standard library",
            "data: text",
            "2 smaller parts, each under 1 KB gzipped",
        ] {
            assert!(out.contains(part), "{part} missing:\n{out}");
        }
        assert!(out.contains("2 largest functions"), "{out}");
        let listed = out.split("largest functions").nth(1).unwrap();
        assert!(listed.contains("bandgauge_core::a::f") && listed.contains("carriers::g"));
        assert!(!listed.contains("core::fmt::h"), "only the top 2:\n{out}");
    }
}
