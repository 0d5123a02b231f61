//! `cargo xtask bench`: criterion benchmarks of the core, printed as one table.

use crate::shell::{self, root};

pub fn run(_args: &[String]) -> Result<(), String> {
    shell::run(shell::cargo().args(["bench", "-p", "bandgauge-core"]))?;
    let dir = root().join("target").join("criterion");
    println!("{:<48} {:>14}", "benchmark", "median");
    let mut rows = Vec::new();
    collect(&dir, &mut rows);
    rows.sort_by(|a, b| a.0.cmp(&b.0));
    for (name, median_ns) in rows {
        println!("{name:<48} {:>14}", format_ns(median_ns));
    }
    Ok(())
}

/// Finds `<bench>/new/estimates.json` files and reads their median point estimate.
fn collect(dir: &std::path::Path, rows: &mut Vec<(String, f64)>) {
    let Ok(entries) = std::fs::read_dir(dir) else { return };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            let est = path.join("new").join("estimates.json");
            if let Some(median) = std::fs::read_to_string(&est).ok().and_then(|t| median_ns(&t)) {
                let name = path.strip_prefix(root().join("target").join("criterion")).unwrap_or(&path);
                rows.push((name.display().to_string(), median));
            } else {
                collect(&path, rows);
            }
        }
    }
}

/// Extracts `"median":{"confidence_interval":...,"point_estimate":X` without a JSON dependency.
fn median_ns(json: &str) -> Option<f64> {
    let median = &json[json.find("\"median\"")?..];
    let pe = &median[median.find("\"point_estimate\":")? + "\"point_estimate\":".len()..];
    let end = pe.find([',', '}'])?;
    pe[..end].trim().parse().ok()
}

fn format_ns(ns: f64) -> String {
    if ns < 1e3 {
        format!("{ns:.1} ns")
    } else if ns < 1e6 {
        format!("{:.2} us", ns / 1e3)
    } else {
        format!("{:.2} ms", ns / 1e6)
    }
}
