//! `cargo xtask bench`: criterion benchmarks of the core, the same neutrality and van der
//! Pauw problems scripted in Python with SciPy for speed ratios, the release wasm size (raw,
//! gzip -9 and brotli quality 11), the in-browser timings (headless Chromium: input to charts
//! redrawn, a 100,000-row lot file read), and the CLI streaming 100,000 and 10,000,000 lot rows with its peak memory, printed
//! as one table.
//!
//! Machines here are noisy: every figure is a median, and comparisons are ratios
//! measured in the same run.

mod streaming;

use crate::shell::{self, root};
use std::process::Command;

/// Each criterion benchmark compared with a Python script of the same problem: (criterion
/// name, script, what the script does).
const PYTHON_COMPARISONS: [(&str, &str, &str); 2] = [
    (
        "neutrality/solve_si_p1e15_300k",
        "core/benches/python/neutrality_scipy.py",
        "neutrality solve",
    ),
    (
        "vdp/solve_ratio_1p5",
        "core/benches/python/vdp_scipy.py",
        "van der Pauw solve",
    ),
];

pub fn run(_args: &[String]) -> Result<(), String> {
    shell::run(shell::cargo().args(["bench", "-p", "bandgauge-core"]))?;
    let dir = root().join("target").join("criterion");
    let mut medians = Vec::new();
    collect(&dir, &mut medians);
    medians.sort_by(|a, b| a.0.cmp(&b.0));
    let mut table: Vec<(String, String)> = medians
        .iter()
        .map(|(name, ns)| (name.clone(), format_ns(*ns)))
        .collect();
    for (bench, script, what) in PYTHON_COMPARISONS {
        let ns = medians.iter().find(|(n, _)| n == bench).map(|(_, ns)| *ns);
        match (python_us_per_solve(script), ns) {
            (Ok(py_us), Some(ns)) => {
                table.push((
                    format!("python scipy brentq, same {what}"),
                    format_ns(py_us * 1e3),
                ));
                table.push((
                    format!("speed ratio python / bandgauge, {what}"),
                    format!("{:.0}x", py_us * 1e3 / ns),
                ));
            }
            (Err(e), _) => table.push((format!("python {what}"), format!("not run: {e}"))),
            (_, None) => table.push((
                format!("python {what}"),
                format!("not run: no criterion result named {bench}"),
            )),
        }
    }
    let streamed = streaming::measure().map(|runs| {
        for run in runs {
            table.push((
                format!(
                    "cli lots, {} rows ({:.0} MB): wall (median of {}) / peak RSS",
                    run.rows,
                    run.bytes as f64 / 1e6,
                    streaming::RUNS
                ),
                format!(
                    "{} / {:.1} MB",
                    format_ns(run.wall.as_secs_f64() * 1e9),
                    run.peak_kib as f64 / 1024.0
                ),
            ));
        }
    });
    let browser = browser_rows(&mut table);
    println!();
    // Wide enough for the longest name, so that every value lines up.
    let width = table
        .iter()
        .map(|(name, _)| name.len())
        .max()
        .unwrap_or(0)
        .max(56);
    println!("{:<width$} {:>24}", "benchmark (median)", "time");
    for (name, value) in &table {
        println!("{name:<width$} {value:>24}");
    }
    streamed.and(browser)
}

/// Release build, its wasm size raw and gzipped, and the in-browser redraw medians.
fn browser_rows(table: &mut Vec<(String, String)>) -> Result<(), String> {
    crate::tools::ensure_build_tools()?;
    crate::tools::ensure_chromium()?;
    let dist = crate::dist::build_release()?;
    for wasm in crate::dist::wasm_files(&dist)? {
        let bytes =
            std::fs::read(&wasm).map_err(|e| format!("cannot read {}: {e}", wasm.display()))?;
        let gz = gzip_len(&bytes)?;
        table.push((
            "release wasm, raw".into(),
            format!("{:.0} KB", bytes.len() as f64 / 1024.0),
        ));
        table.push((
            "release wasm, gzip -9".into(),
            format!("{:.0} KB", gz as f64 / 1024.0),
        ));
        table.push((
            "release wasm, brotli quality 11".into(),
            match brotli_len(&wasm) {
                Ok(br) => format!("{:.0} KB", br as f64 / 1024.0),
                Err(e) => format!("not measured: {e}"),
            },
        ));
    }
    let out = shell::capture(
        shell::cargo()
            .args([
                "bench",
                "-p",
                "bandgauge-tests",
                "--features",
                "browser",
                "--bench",
                "browser_redraw",
            ])
            .env("BANDGAUGE_DIST", &dist),
    )?;
    let text = String::from_utf8_lossy(&out.stdout);
    let mut any = false;
    for (name, value) in text.lines().filter_map(|l| l.trim().split_once('=')) {
        let Ok(ms) = value.parse::<f64>() else {
            continue;
        };
        let label = if let Some(view) = name.strip_prefix("browser_redraw_") {
            format!(
                "browser: input to charts redrawn, {}",
                view.trim_end_matches("_ms")
            )
        } else if name == "browser_map_121_sites_ms" {
            "browser: wafer map of 121 sites with its surface drawn (target 16 ms)".into()
        } else if name == "browser_lot_switch_100_wafers_ms" {
            "browser: lots view switched between two lots of 100 wafers (target 50 ms)".into()
        } else if let Some(what) = name.strip_prefix("browser_lots_") {
            format!(
                "browser: lot file read, converted, summarised, {}",
                what.trim_end_matches("_ms").replace('_', " ")
            )
        } else {
            continue;
        };
        any = true;
        table.push((label, format_ns(ms * 1e6)));
    }
    if !any {
        return Err(format!(
            "the browser benchmark printed no timings:\n{text}\n{}",
            String::from_utf8_lossy(&out.stderr)
        ));
    }
    Ok(())
}

pub(crate) fn gzip_len(bytes: &[u8]) -> Result<usize, String> {
    use std::io::Write as _;
    let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::best());
    gz.write_all(bytes).map_err(|e| format!("gzip: {e}"))?;
    gz.finish()
        .map(|v| v.len())
        .map_err(|e| format!("gzip: {e}"))
}

/// The brotli size (quality 11, as servers precompress) of a file, from Python's `brotli`
/// package (installed from PyPI when missing): xtask itself stays free of a brotli encoder,
/// which only this table needs.
fn brotli_len(file: &std::path::Path) -> Result<usize, String> {
    const MEASURE: &str = "import brotli, sys; \
        print(len(brotli.compress(open(sys.argv[1], 'rb').read(), quality=11)))";
    let have = Command::new("python3")
        .args(["-c", "import brotli"])
        .status();
    if !have.is_ok_and(|s| s.success()) {
        eprintln!("xtask: installing brotli from PyPI for the page size row (a few seconds)");
        shell::run(Command::new("python3").args(["-m", "pip", "install", "--quiet", "brotli"]))?;
    }
    let out = shell::capture(Command::new("python3").args(["-c", MEASURE]).arg(file))?;
    let text = String::from_utf8_lossy(&out.stdout);
    text.trim()
        .parse()
        .map_err(|_| format!("python3 brotli printed {text:?}"))
}

/// Runs the Python reference script (installing SciPy and mpmath from PyPI when missing)
/// and reads its `python_us_per_solve=<x>` line.
fn python_us_per_solve(script_path: &str) -> Result<f64, String> {
    let script = root().join(script_path);
    if !script.exists() {
        return Err(format!("{} is missing", script.display()));
    }
    let have = Command::new("python3")
        .args(["-c", "import scipy, mpmath"])
        .status();
    if !have.is_ok_and(|s| s.success()) {
        eprintln!(
            "xtask: installing scipy and mpmath from PyPI for the comparison (about a minute)"
        );
        shell::run(
            Command::new("python3").args(["-m", "pip", "install", "--quiet", "scipy", "mpmath"]),
        )?;
    }
    let out = shell::capture(Command::new("python3").arg(&script))?;
    let text = String::from_utf8_lossy(&out.stdout);
    text.lines()
        .find_map(|l| l.trim().strip_prefix("python_us_per_solve="))
        .and_then(|v| v.trim().parse().ok())
        .ok_or_else(|| format!("{script_path} printed no python_us_per_solve line: {text}"))
}

/// Finds `<bench>/new/estimates.json` files and reads their median point estimate.
fn collect(dir: &std::path::Path, rows: &mut Vec<(String, f64)>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        if !path.is_dir() {
            continue;
        }
        let est = path.join("new").join("estimates.json");
        if let Some(median) = std::fs::read_to_string(&est)
            .ok()
            .and_then(|t| median_ns(&t))
        {
            let base = root().join("target").join("criterion");
            let name = path.strip_prefix(&base).unwrap_or(&path);
            rows.push((name.display().to_string(), median));
        } else {
            collect(&path, rows);
        }
    }
}

/// Extracts `"median":{...,"point_estimate":X` without a JSON dependency.
fn median_ns(json: &str) -> Option<f64> {
    let median = &json[json.find("\"median\"")?..];
    let key = "\"point_estimate\":";
    let pe = &median[median.find(key)? + key.len()..];
    let end = pe.find([',', '}'])?;
    pe[..end].trim().parse().ok()
}

fn format_ns(ns: f64) -> String {
    if ns >= 1e9 {
        format!("{:.2} s", ns / 1e9)
    } else if ns < 1e3 {
        format!("{ns:.1} ns")
    } else if ns < 1e6 {
        format!("{:.2} us", ns / 1e3)
    } else {
        format!("{:.2} ms", ns / 1e6)
    }
}

#[cfg(test)]
mod tests {
    use super::median_ns;

    #[test]
    fn reads_criterion_median() {
        // Source: criterion's estimates.json layout, common practice, no source.
        let json = r#"{"mean":{"point_estimate":5.0},"median":{"confidence_interval":{"lower_bound":1.0},"point_estimate":42.5,"standard_error":0.1}}"#;
        assert_eq!(median_ns(json), Some(42.5));
    }
}
