//! The CLI's streaming of lot files: the release `bandgauge lots` over generated files of
//! 100,000 and 10,000,000 rows (the same lots and wafers, more sites per wafer), with the wall
//! time and the peak resident memory of each run. Memory that stays flat while the rows grow a
//! hundredfold shows the reader streams: what it keeps grows with lots and wafers, not rows.
//!
//! The peak is the kernel's high-water mark (`VmHWM` in `/proc/<pid>/status`), read every few
//! milliseconds while the command runs; the mark only rises, so the last reading before the
//! process ends is its peak to within what it allocated in its last few milliseconds.

use crate::shell::{self, root};
// The same generator as the browser test and benchmark (plain std, so it is shared by path);
// xtask writes its files row by row and leaves the in-memory helpers to the tests.
#[allow(dead_code)]
#[path = "../../../tests/src/lot_rows.rs"]
mod lot_rows;
use lot_rows::LotRows;
use std::io::Write as _;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

/// Lots and wafers of both generated files; only the sites per wafer differ.
const LOTS: usize = 8;
const WAFERS: usize = 25;
/// Rows of the two files.
const SIZES: [usize; 2] = [100_000, 10_000_000];
/// Runs per file; the wall time reported is their median, the peak their largest.
pub const RUNS: usize = 3;
/// How often the high-water mark is read.
const POLL: Duration = Duration::from_millis(5);

/// The measured runs of the CLI over one file.
pub struct Run {
    pub rows: usize,
    pub bytes: u64,
    /// Median wall time of [`RUNS`] runs.
    pub wall: Duration,
    /// Largest peak resident memory of the runs, KiB.
    pub peak_kib: u64,
}

/// Builds the release CLI, generates the files (kept in `target/bench-lots/` between runs) and
/// measures [`RUNS`] runs of each.
pub fn measure() -> Result<Vec<Run>, String> {
    shell::run(shell::cargo().args(["build", "--release", "-p", "bandgauge-cli"]))?;
    let exe = root().join("target").join("release").join("bandgauge");
    let dir = root().join("target").join("bench-lots");
    std::fs::create_dir_all(&dir).map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
    SIZES
        .iter()
        .map(|&rows| {
            let file = generated(&dir, rows)?;
            let runs = (0..RUNS)
                .map(|_| run_once(&exe, &file, rows))
                .collect::<Result<Vec<_>, _>>()?;
            let mut walls: Vec<Duration> = runs.iter().map(|r| r.wall).collect();
            walls.sort();
            Ok(Run {
                rows,
                bytes: runs[0].bytes,
                wall: walls[walls.len() / 2],
                peak_kib: runs.iter().map(|r| r.peak_kib).max().unwrap_or(0),
            })
        })
        .collect()
}

/// The generated file of `rows` rows, written once.
fn generated(dir: &Path, rows: usize) -> Result<PathBuf, String> {
    let path = dir.join(format!("lots-{rows}-rows.csv"));
    if std::fs::metadata(&path).is_ok_and(|m| m.len() > 0) {
        return Ok(path);
    }
    eprintln!("xtask: writing {} ({rows} rows)", path.display());
    let partial = path.with_extension("partial");
    let file = std::fs::File::create(&partial)
        .map_err(|e| format!("cannot create {}: {e}", partial.display()))?;
    let mut out = std::io::BufWriter::new(file);
    let fail = |e: std::io::Error| format!("cannot write {}: {e}", partial.display());
    LotRows {
        lots: LOTS,
        wafers: WAFERS,
        sites_per_wafer: rows / (LOTS * WAFERS),
        dopant: "P",
        lot_prefix: "BX",
    }
    .write_to(&mut out)
    .map_err(fail)?;
    out.flush().map_err(fail)?;
    drop(out);
    std::fs::rename(&partial, &path)
        .map_err(|e| format!("cannot rename {}: {e}", partial.display()))?;
    Ok(path)
}

/// Runs `bandgauge lots FILE` once, reading its high-water mark while it runs.
fn run_once(exe: &Path, file: &Path, rows: usize) -> Result<Run, String> {
    let bytes = std::fs::metadata(file).map(|m| m.len()).unwrap_or(0);
    // The summary goes to a file: a pipe read only at the end could fill and stall the run.
    let summary_path = file.with_extension("summary.txt");
    let summary_file = std::fs::File::create(&summary_path)
        .map_err(|e| format!("cannot create {}: {e}", summary_path.display()))?;
    let started = Instant::now();
    let mut child = Command::new(exe)
        .arg("lots")
        .arg(file)
        .stdin(Stdio::null())
        .stdout(summary_file)
        .stderr(Stdio::null())
        .spawn()
        .map_err(|e| format!("cannot start {}: {e}", exe.display()))?;
    let status_file = format!("/proc/{}/status", child.id());
    let mut peak_kib = 0;
    let status = loop {
        if let Some(kib) = std::fs::read_to_string(&status_file)
            .ok()
            .and_then(|s| high_water_kib(&s))
        {
            peak_kib = peak_kib.max(kib);
        }
        match child.try_wait() {
            Ok(Some(status)) => break status,
            Ok(None) => std::thread::sleep(POLL),
            Err(e) => return Err(format!("waiting for {}: {e}", exe.display())),
        }
    };
    let wall = started.elapsed();
    let summary = std::fs::read_to_string(&summary_path).unwrap_or_default();
    let wanted = format!("{rows} rows read, {rows} converted, 0 rejected");
    if !status.success() || !summary.contains(&wanted) {
        return Err(format!(
            "bandgauge lots {} did not convert every row ({status}):\n{summary}",
            file.display()
        ));
    }
    if peak_kib == 0 {
        return Err(format!("no VmHWM could be read from {status_file}"));
    }
    Ok(Run {
        rows,
        bytes,
        wall,
        peak_kib,
    })
}

/// `VmHWM:    7520 kB` from a `/proc/<pid>/status` text, in KiB.
fn high_water_kib(status: &str) -> Option<u64> {
    status
        .lines()
        .find_map(|l| l.strip_prefix("VmHWM:"))?
        .trim()
        .trim_end_matches("kB")
        .trim()
        .parse()
        .ok()
}

#[cfg(test)]
mod tests {
    use super::high_water_kib;

    #[test]
    fn reads_the_high_water_mark() {
        // Layout of /proc/<pid>/status: proc(5), common practice, no source.
        let text =
            "Name:\tbandgauge\nVmPeak:\t   12000 kB\nVmHWM:\t    7520 kB\nVmRSS:\t    7000 kB\n";
        assert_eq!(high_water_kib(text), Some(7520));
        assert_eq!(high_water_kib("Name:\tzombie\n"), None);
    }
}
