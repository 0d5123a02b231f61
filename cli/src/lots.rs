//! `bandgauge lots`: streams wafer-lot files through the core's lot reader, prints the summary
//! per lot and wafer with verdicts and lot-to-lot tests, writes converted rows on request.
//!
//! Exit codes (its own, so it is dispatched from `main` before the other commands): 0 every
//! row converted; 3 some rows were rejected (each listed on stderr with file and line) or, among
//! several files, some were not lot files and were skipped (each named on stderr with the
//! reason); 2 unusable input (bad option, missing file, a lot file without a usable header, a
//! single file that is not a lot file, or no lot file among several); 1 a write failed.

use std::fmt::Write as _;
use std::fs::File;
use std::io::{self, BufWriter, Read, Write};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use bandgauge_core::lots::{
    LotBook, LotReader, LotReport, LotSummary, Measurement, ReadOptions, RowOutcome, Site,
    SpecQuantity, SpecWindow, map::MAP_DEFINITIONS, parse_dopant,
};
use clap::{ArgGroup, Args};
use serde_json::{Value, json};

use crate::error::{BadInput, EXIT_BAD_INPUT, EXIT_FAILURE};
use crate::output::{self, Table};

/// Exit code when some rows were rejected but the rest were summarised.
pub const EXIT_ROWS_REJECTED: u8 = 3;

/// The multiplicity adjustment of the pairwise p-values, named beside every result.
const HOLM: &str = "Holm step-down adjustment over all pairs tested, Holm (1979), Scand. J. \
                    Statist. 6, 65-70";

/// Bytes read from a file per step: large enough for speed, small enough that memory does not
/// depend on the file.
const READ_CHUNK_BYTES: usize = 256 * 1024;

/// `bandgauge lots`.
#[derive(Debug, Args)]
#[command(group(ArgGroup::new("spec").args(["spec_resistivity", "spec_density"])))]
pub struct LotsArgs {
    /// Lot files: CSV or TSV with a header (columns: see demo-wafers/README.md).
    #[arg(required = true, value_name = "FILE")]
    pub files: Vec<PathBuf>,

    /// Dopant for rows whose file names neither a dopant nor a type: B, P, As or Sb.
    #[arg(long, value_name = "SPECIES")]
    pub dopant: Option<String>,

    /// Spec window on resistivity, MIN:MAX in ohm cm (units allowed: 8:12, 800mohm-cm:1.2;
    /// leave a side empty for a one-sided limit).
    #[arg(long, value_name = "MIN:MAX")]
    pub spec_resistivity: Option<String>,

    /// Spec window on dopant density, MIN:MAX in cm^-3 (e.g. 3.5e14:5.5e14).
    #[arg(long, value_name = "MIN:MAX")]
    pub spec_density: Option<String>,

    /// Write a JSON array of lots instead of the tables.
    #[arg(long)]
    pub json: bool,

    /// Write every converted row to this CSV file.
    #[arg(long, value_name = "OUT.csv")]
    pub rows: Option<PathBuf>,
}

/// A validated `lots` request.
#[derive(Debug, Clone)]
struct LotsRequest {
    files: Vec<PathBuf>,
    options: ReadOptions,
    spec: Option<SpecWindow>,
    json: bool,
    rows: Option<PathBuf>,
}

impl LotsRequest {
    fn from_args(args: &LotsArgs) -> Result<LotsRequest, BadInput> {
        if let Some(dopant) = &args.dopant {
            parse_dopant(dopant).map_err(|message| BadInput::new("--dopant", message))?;
        }
        let spec = match (&args.spec_resistivity, &args.spec_density) {
            (Some(text), _) => Some(
                SpecWindow::parse(SpecQuantity::Resistivity, text)
                    .map_err(|e| BadInput::new("--spec-resistivity", e.to_string()))?,
            ),
            (None, Some(text)) => Some(
                SpecWindow::parse(SpecQuantity::Density, text)
                    .map_err(|e| BadInput::new("--spec-density", e.to_string()))?,
            ),
            (None, None) => None,
        };
        Ok(LotsRequest {
            files: args.files.clone(),
            options: ReadOptions {
                default_dopant: args.dopant.clone(),
            },
            spec,
            json: args.json,
            rows: args.rows.clone(),
        })
    }
}

/// Why the command stopped early.
enum Stop {
    /// Unusable input: exit code 2.
    Unusable(String),
    /// The file is not a lot file at all (nothing of it was read): skipped among several
    /// files, else exit code 2.
    NotALotFile(String),
    /// A write failed: exit code 1.
    Write(io::Error),
}

impl From<io::Error> for Stop {
    fn from(error: io::Error) -> Stop {
        Stop::Write(error)
    }
}

/// Runs `bandgauge lots` and gives its exit code.
pub fn main(args: &LotsArgs) -> ExitCode {
    let request = match LotsRequest::from_args(args) {
        Ok(request) => request,
        Err(error) => {
            eprintln!("error: {error}");
            return ExitCode::from(EXIT_BAD_INPUT);
        }
    };
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    let result = run(&request, &mut out).and_then(|rejected| {
        out.flush()?;
        Ok(rejected)
    });
    match result {
        Ok(0) => ExitCode::SUCCESS,
        Ok(_) => ExitCode::from(EXIT_ROWS_REJECTED),
        Err(Stop::Unusable(message) | Stop::NotALotFile(message)) => {
            eprintln!("error: {message}");
            ExitCode::from(EXIT_BAD_INPUT)
        }
        Err(Stop::Write(error)) => {
            if error.kind() != io::ErrorKind::BrokenPipe {
                eprintln!("error: writing the answer: {error}");
            }
            ExitCode::from(EXIT_FAILURE)
        }
    }
}

/// Reads every file, prints the summary, and gives the number of rejected rows plus skipped
/// files.
fn run(request: &LotsRequest, out: &mut impl Write) -> Result<u64, Stop> {
    // Open every file first, so that a missing one stops the command before any output.
    let mut files = Vec::new();
    for path in &request.files {
        let file = File::open(path)
            .map_err(|e| Stop::Unusable(format!("{}: cannot open: {e}", path.display())))?;
        files.push((path.as_path(), file));
    }
    let mut rows_out = match &request.rows {
        Some(path) => {
            let file = File::create(path).map_err(|e| {
                Stop::Unusable(format!("--rows: {}: cannot create: {e}", path.display()))
            })?;
            let mut writer = BufWriter::new(file);
            writeln!(writer, "{}", ROWS_HEADER.join(","))?;
            Some(writer)
        }
        None => None,
    };
    let mut book = LotBook::new();
    let stderr = io::stderr();
    let mut err = BufWriter::new(stderr.lock());
    let mut notes = Vec::new();
    let several = files.len() > 1;
    let mut skipped = 0;
    for (path, file) in files {
        match read_file(path, file, request, &mut book, rows_out.as_mut(), &mut err) {
            Ok(file_notes) => notes.extend(file_notes),
            Err(Stop::NotALotFile(reason)) if several => {
                let message = format!("skipped {}: not a lot file: {reason}", path.display());
                writeln!(err, "{message}")?;
                notes.push(message);
                skipped += 1;
            }
            Err(Stop::NotALotFile(reason)) => {
                return Err(Stop::Unusable(format!("{}: {reason}", path.display())));
            }
            Err(stop) => return Err(stop),
        }
    }
    if skipped == request.files.len() {
        return Err(Stop::Unusable(format!(
            "none of the {skipped} files is a lot file (each is named above with the reason)"
        )));
    }
    if let Some(writer) = rows_out.as_mut() {
        writer.flush()?;
    }
    let report = book.report(request.spec.as_ref());
    notes.extend(report.notes.iter().cloned());
    if request.json {
        for note in &notes {
            writeln!(err, "note: {note}")?;
        }
        serde_json::to_writer_pretty(&mut *out, &json_lots(&report))
            .map_err(|e| Stop::Write(io::Error::other(e)))?;
        writeln!(out)?;
    } else {
        write!(
            out,
            "{}",
            tables(&report, request.files.len() - skipped, skipped, &notes)
        )?;
    }
    err.flush()?;
    Ok(report.counts.rejected + skipped as u64)
}

/// Streams one file into the book; returns its notes (prefixed with the file name).
fn read_file(
    path: &Path,
    mut file: File,
    request: &LotsRequest,
    book: &mut LotBook,
    mut rows_out: Option<&mut BufWriter<File>>,
    err: &mut impl Write,
) -> Result<Vec<String>, Stop> {
    let name = path.display().to_string();
    let mut reader = LotReader::new(request.options.clone());
    let mut buffer = vec![0u8; READ_CHUNK_BYTES];
    let mut write_error: Option<io::Error> = None;
    let spec = request.spec;
    let mut on_row = |outcome: RowOutcome<'_, '_>| {
        let written = match outcome {
            RowOutcome::Converted(site) => match rows_out.as_mut() {
                Some(writer) => write_row(writer, &name, site, spec.as_ref()),
                None => Ok(()),
            },
            RowOutcome::Rejected(rejection) => match rejection.column {
                Some(column) => writeln!(
                    err,
                    "{name}:{}: {column}: {}",
                    rejection.line, rejection.reason
                ),
                None => writeln!(err, "{name}:{}: {}", rejection.line, rejection.reason),
            },
        };
        if let Err(error) = written
            && write_error.is_none()
        {
            write_error = Some(error);
        }
    };
    let unusable = |e: bandgauge_core::lots::LotFileError| {
        if e.is_not_a_lot_file() {
            Stop::NotALotFile(e.to_string())
        } else {
            Stop::Unusable(format!("{name}: {e}"))
        }
    };
    loop {
        let read = file
            .read(&mut buffer)
            .map_err(|e| Stop::Unusable(format!("{name}: cannot read: {e}")))?;
        if read == 0 {
            break;
        }
        reader
            .feed(&buffer[..read], book, &mut on_row)
            .map_err(unusable)?;
    }
    reader.finish(book, &mut on_row).map_err(unusable)?;
    if let Some(error) = write_error {
        return Err(Stop::Write(error));
    }
    Ok(reader
        .notes()
        .iter()
        .map(|note| format!("{name}: {note}"))
        .collect())
}

/// Columns of the `--rows` CSV file.
const ROWS_HEADER: [&str; 15] = [
    "file",
    "line",
    "lot",
    "wafer",
    "site",
    "x_mm",
    "y_mm",
    "dopant",
    "measurement",
    "probe_geometry",
    "sheet_resistance_ohm_sq",
    "resistivity_ohm_cm",
    "density_cm3",
    "uncertainty_percent",
    "in_window",
];

fn write_row(
    writer: &mut impl Write,
    file: &str,
    site: &Site<'_>,
    spec: Option<&SpecWindow>,
) -> io::Result<()> {
    let optional = |v: Option<f64>| v.map(output::exact).unwrap_or_default();
    let (sheet, geometry) = match site.measurement {
        Measurement::Resistivity => (None, ""),
        Measurement::SheetResistance {
            sheet_resistance_ohm_sq,
            ..
        } => (Some(sheet_resistance_ohm_sq), ""),
        Measurement::Probe {
            sheet_resistance_ohm_sq,
            geometry,
            ..
        } => (sheet_resistance_ohm_sq, geometry.id()),
        Measurement::VanDerPauw {
            sheet_resistance_ohm_sq,
            ..
        } => (Some(sheet_resistance_ohm_sq), ""),
    };
    let in_window = spec.map_or("", |window| {
        let value = match window.quantity() {
            SpecQuantity::Density => site.density_cm3,
            _ => site.resistivity_ohm_cm,
        };
        if window.contains(value) { "yes" } else { "no" }
    });
    writeln!(
        writer,
        "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}",
        csv_field(file),
        site.line,
        csv_field(site.lot),
        csv_field(site.wafer),
        csv_field(site.site),
        optional(site.x_mm),
        optional(site.y_mm),
        site.dopant,
        site.measurement.name(),
        geometry,
        optional(sheet),
        output::exact(site.resistivity_ohm_cm),
        output::exact(site.density_cm3),
        optional(site.uncertainty.map(|u| 100.0 * u)),
        in_window
    )
}

/// Quotes a CSV field when it holds a comma, a quote or a line break.
fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

/// The JSON array: one object per lot with the core's summary, its model, the spec, and the
/// tests that involve it.
fn json_lots(report: &LotReport) -> Value {
    let lots = report
        .lots
        .iter()
        .map(|lot| {
            let mut value = serde_json::to_value(lot).unwrap_or(Value::Null);
            let versus: Vec<Value> = report
                .differences
                .iter()
                .filter_map(|d| {
                    // Each lot sees the others relative to itself: percent > 0 means this lot
                    // is doped heavier than the other.
                    let (other, sign) = if d.lot_b == lot.lot {
                        (&d.lot_a, 1.0)
                    } else if d.lot_a == lot.lot {
                        (&d.lot_b, -1.0)
                    } else {
                        return None;
                    };
                    let ratio = d.density_ratio.powf(sign);
                    let ci = if sign > 0.0 {
                        d.percent_ci95
                    } else {
                        [
                            100.0 * (1.0 / (1.0 + d.percent_ci95[1] / 100.0) - 1.0),
                            100.0 * (1.0 / (1.0 + d.percent_ci95[0] / 100.0) - 1.0),
                        ]
                    };
                    Some(json!({
                        "lot": other,
                        "density_ratio": ratio,
                        "percent": 100.0 * (ratio - 1.0),
                        "percent_ci95": ci,
                        "test": "welch_t_on_ln_wafer_mean_density",
                        "t": sign * d.test.t,
                        "dof": d.test.dof,
                        "p_value": d.test.p_value,
                        "p_adjusted": d.p_adjusted,
                        "adjustment": HOLM,
                        "significant": d.significant,
                    }))
                })
                .collect();
            // The test itself, without the list of lots (which is this array).
            let rank_test = report
                .kruskal_wallis
                .as_ref()
                .filter(|k| k.lots.contains(&lot.lot))
                .map(|k| json!({ "test": k.test, "significant": k.significant }));
            if let Value::Object(map) = &mut value {
                map.insert("model".into(), json!(model_for(report, lot)));
                map.insert("model_reference".into(), json!(report.model_reference));
                map.insert("spec".into(), json!(report.spec));
                map.insert("versus".into(), Value::Array(versus));
                map.insert("kruskal_wallis".into(), json!(rank_test));
            }
            value
        })
        .collect();
    Value::Array(lots)
}

fn model_for(report: &LotReport, lot: &LotSummary) -> String {
    let relation = match lot.conductivity_type.as_str() {
        "p" => "boron",
        _ => "phosphorus",
    };
    format!("{}, {relation} relation", report.model)
}

/// The text report.
fn tables(report: &LotReport, files: usize, skipped: usize, notes: &[String]) -> String {
    let mut out = String::new();
    let c = report.counts;
    let skipped = if skipped > 0 {
        format!(" ({skipped} other file(s) skipped: not lot files, see the notes)")
    } else {
        String::new()
    };
    let _ = writeln!(
        out,
        "Lots from {files} file(s){skipped}: {} rows read, {} converted, {} rejected",
        c.read, c.converted, c.rejected
    );
    let _ = writeln!(out, "Model: {}", report.model);
    let _ = writeln!(out, "  {}", report.model_reference);
    match &report.spec {
        Some(spec) => {
            let _ = writeln!(out, "Spec window: {spec}");
        }
        None => {
            let _ = writeln!(out, "Spec window: none given (no verdicts)");
        }
    }
    if report.lots.is_empty() {
        let _ = writeln!(out, "\nNo rows converted.");
        return out;
    }

    let _ = writeln!(out, "\nResistivity per lot, ohm-cm");
    let mut table = Table::new(
        &[
            "lot",
            "dopant",
            "wafers",
            "sites",
            "mean",
            "median",
            "std",
            "min",
            "max",
            "std/mean %",
        ],
        &[false, false, true, true, true, true, true, true, true, true],
    );
    for lot in &report.lots {
        let r = &lot.resistivity_ohm_cm;
        table.row([
            lot.lot.clone(),
            format!("{} ({})", lot.dopant, lot.conductivity_type.as_str()),
            lot.wafers.to_string(),
            lot.sites.to_string(),
            output::number(r.mean),
            output::number(r.median),
            optional(r.std),
            output::number(r.min),
            output::number(r.max),
            optional(r.nonuniformity_percent),
        ]);
    }
    out.push_str(&table.render());

    let _ = writeln!(out, "\nDopant density per lot, cm^-3");
    let mut table = Table::new(
        &["lot", "mean", "median", "std", "min", "max"],
        &[false, true, true, true, true, true],
    );
    for lot in &report.lots {
        let n = &lot.density_cm3;
        table.row([
            lot.lot.clone(),
            output::number(n.mean),
            output::number(n.median),
            optional(n.std),
            output::number(n.min),
            output::number(n.max),
        ]);
    }
    out.push_str(&table.render());

    if let Some(spec) = &report.spec {
        let unit = spec.quantity().unit();
        let _ = writeln!(
            out,
            "\nVerdicts per lot (the worst wafer decides; margin in {unit})"
        );
        let mut table = Table::new(
            &[
                "lot",
                "verdict",
                "margin",
                "margin %",
                "worst wafer",
                "pass/marg/fail",
                "sites out",
                "Cpk",
            ],
            &[false, false, true, true, false, true, true, true],
        );
        for lot in &report.lots {
            let counts = lot
                .wafer_verdicts
                .map(|v| format!("{}/{}/{}", v.pass, v.marginal, v.fail))
                .unwrap_or_default();
            table.row([
                lot.lot.clone(),
                lot.verdict.map(|v| v.to_string()).unwrap_or_default(),
                optional(lot.margin),
                lot.margin_percent
                    .map(|m| format!("{m:.1}"))
                    .unwrap_or_default(),
                lot.worst_wafer.clone().unwrap_or_default(),
                counts,
                lot.sites_outside.map(|s| s.to_string()).unwrap_or_default(),
                lot.cpk.map(|v| format!("{v:.2}")).unwrap_or_default(),
            ]);
        }
        out.push_str(&table.render());
    }

    let _ = writeln!(out, "\nPer wafer");
    let mut header = vec![
        "lot",
        "wafer",
        "sites",
        "mean ohm-cm",
        "std/mean %",
        "range/sum %",
        "range/mean %",
        "centre-edge %",
        "mean cm^-3",
    ];
    if report.spec.is_some() {
        header.extend(["verdict", "margin", "interval"]);
    }
    let mut table = Table::new(
        &header,
        &[
            false, false, true, true, true, true, true, true, true, false, true, false,
        ],
    );
    for lot in &report.lots {
        for wafer in &lot.wafer_results {
            let mut cells = vec![
                lot.lot.clone(),
                wafer.wafer.clone(),
                wafer.sites.to_string(),
                output::number(wafer.resistivity_ohm_cm.mean),
                optional(wafer.resistivity_ohm_cm.nonuniformity_percent),
                percent(wafer.uniformity.map(|u| u.range_over_sum_percent)),
                percent(wafer.uniformity.map(|u| u.range_over_mean_percent)),
                percent(wafer.centre_to_edge_percent),
                output::number(wafer.density_cm3.mean),
            ];
            if let Some(j) = wafer.judgement {
                cells.extend([
                    j.verdict.to_string(),
                    output::number(j.margin),
                    format!("{} .. {}", output::number(j.low), output::number(j.high)),
                ]);
            }
            table.row(cells);
        }
    }
    out.push_str(&table.render());

    if !report.differences.is_empty() || report.kruskal_wallis.is_some() {
        let _ = writeln!(
            out,
            "\nLot-to-lot differences in dopant density (wafers as units)"
        );
        for d in &report.differences {
            let direction = if d.percent >= 0.0 {
                "heavier"
            } else {
                "lighter"
            };
            let _ = writeln!(
                out,
                "  {} vs {}: {:.1} % {direction} (95 % CI {:+.1} to {:+.1} %); Welch t = {:.2}, \
                 df = {:.1}, p = {}, Holm-adjusted p = {}: {}",
                d.lot_b,
                d.lot_a,
                d.percent.abs(),
                d.percent_ci95[0],
                d.percent_ci95[1],
                d.test.t,
                d.test.dof,
                output::number(d.test.p_value),
                output::number(d.p_adjusted),
                if d.significant {
                    "significant"
                } else {
                    "not significant"
                }
            );
        }
        if !report.differences.is_empty() {
            let _ = writeln!(
                out,
                "  ({} pairs; a pair is significant when its adjusted p < 0.05; {HOLM})",
                report.differences.len()
            );
        }
        if let Some(k) = &report.kruskal_wallis {
            let _ = writeln!(
                out,
                "  all of {}: Kruskal-Wallis H = {:.2}, df = {}, p = {}: {}",
                k.lots.join(", "),
                k.test.h,
                k.test.dof,
                output::number(k.test.p_value),
                if k.significant {
                    "the lots differ"
                } else {
                    "no significant difference"
                }
            );
        }
    }

    let d = &report.definitions;
    let _ = writeln!(out, "\nDefinitions");
    let map = &MAP_DEFINITIONS;
    for line in [
        d.nonuniformity,
        map.range_over_sum,
        map.range_over_mean,
        map.centre_to_edge,
        d.wafer_verdict,
        d.lot_verdict,
        d.uncertainty,
        d.cpk,
        d.lot_difference,
    ] {
        let _ = writeln!(out, "  - {line}");
    }
    if !notes.is_empty() {
        let _ = writeln!(out, "\nNotes");
        for note in notes {
            let _ = writeln!(out, "  - {note}");
        }
    }
    let _ = writeln!(
        out,
        "\n{}",
        output::caution(
            "Thurber et al. empirical relation; lot-to-lot p-values adjusted by Holm (1979), \
             Scand. J. Statist. 6, 65-70"
        )
    );
    out
}

/// A percentage to one decimal, empty when there is none.
fn percent(value: Option<f64>) -> String {
    value.map(|v| format!("{v:.1}")).unwrap_or_default()
}

fn optional(value: Option<f64>) -> String {
    value.map(output::number).unwrap_or_default()
}
