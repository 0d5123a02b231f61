//! Browser tests of the sign-off report and its record: the report printed to PDF by Chromium
//! (through WebDriver's print command) holds the inputs, the models, the results and the
//! caution; a lot comparison's PDF holds the spec window and every verdict; a saved record opens
//! in a fresh page to identical results, and a tampered or newer record is refused with its
//! message while nothing on the page changes.
//!
//! Expected numbers come from `bandgauge_core` on the same inputs, the verdicts also from the
//! demo scenario (demo-wafers/README.md), which is the specification of the demo lots.

use bandgauge_core::materials;
use bandgauge_core::neutrality::{self, SolveOptions};
use bandgauge_tests::browser::{by_testid, retype, screenshot, text_until, with_browser};
use bandgauge_tests::ui::{
    TempFile, click, downloads, last_blob_text, record_downloads, run_script, text_of, value_of,
};
use fantoccini::Client;
use fantoccini::wd::{PrintConfiguration, PrintSize};
use serde_json::Value;
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

/// Smaller of the two windows the app must serve.
const LAPTOP: (u32, u32) = (1366, 768);

/// How long the demo lots may take to be read on a slow, shared test machine.
const READ_WAIT: Duration = Duration::from_secs(60);

/// The app's version, which the record and the refusal of a newer record name (one workspace
/// version for every crate).
const APP_VERSION: &str = env!("CARGO_PKG_VERSION");

/// The inputs of the point calculation typed in the first test.
const TEMPERATURE: &str = "350 K";
const DONOR_DENSITY: &str = "3e15";
/// An acceptor row, so the report has two species.
const ACCEPTOR_DENSITY: &str = "4e14";

fn artifacts() -> PathBuf {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("artifacts");
    std::fs::create_dir_all(&dir).expect("create tests/artifacts");
    dir
}

/// Prints the page to an A4 PDF, saves it under `tests/artifacts/<name>.pdf` and returns its
/// text as `pdf-extract` reads it, with runs of white space made single spaces and the
/// typographic ligatures Chromium's fonts use (ﬁ, ﬀ, ...) spelled out.
async fn print_pdf(client: &Client, name: &str) -> String {
    let config = PrintConfiguration::builder()
        .size(PrintSize::A4)
        .build()
        .expect("print settings");
    let pdf = client.print(config).await.expect("print to PDF");
    assert!(pdf.starts_with(b"%PDF-"), "the print command gave no PDF");
    std::fs::write(artifacts().join(format!("{name}.pdf")), &pdf).expect("save the PDF");
    let text = pdf_extract::extract_text_from_mem(&pdf).expect("PDF text");
    let text = [
        ("\u{FB00}", "ff"),
        ("\u{FB01}", "fi"),
        ("\u{FB02}", "fl"),
        ("\u{FB03}", "ffi"),
        ("\u{FB04}", "ffl"),
    ]
    .iter()
    .fold(text, |t, (ligature, letters)| t.replace(ligature, letters));
    text.split_whitespace().collect::<Vec<_>>().join(" ")
}

/// The text without any white space: the PDF's text layer puts spaces where glyphs sit
/// apart, also inside words ("Thur mond") and numbers, so phrases are compared without them.
fn squash(text: &str) -> String {
    text.split_whitespace().collect()
}

/// Fails with the PDF text when `needle` is not in it (white space aside, see [`squash`]).
fn assert_has(text: &str, needle: &str) {
    assert!(
        squash(text).contains(&squash(needle)),
        "the printed report lacks '{needle}'; its text: {text}"
    );
}

/// The shown text of every cell of the report's result tables, row by row.
async fn report_results(client: &Client) -> Vec<Vec<String>> {
    by_testid(client, "report-results").await;
    let script = "return Array.from(document.querySelectorAll('[data-testid=\"report-results\"] \
                  tbody tr')).map(r => Array.from(r.cells).map(c => c.textContent.trim()));";
    let v = client.execute(script, vec![]).await.expect("read report");
    serde_json::from_value(v).expect("rows of cell texts")
}

/// The notices shown, one per line.
async fn notices(client: &Client) -> Vec<String> {
    let v = client
        .execute(
            "return Array.from(document.querySelectorAll('[data-testid=\"notices\"] li')).map(l => l.textContent);",
            vec![],
        )
        .await
        .expect("read notices");
    serde_json::from_value(v).expect("notice texts")
}

/// Waits for a new notice (the `count`+1-th) and returns it.
async fn next_notice(client: &Client, count: usize) -> String {
    let deadline = Instant::now() + READ_WAIT;
    loop {
        let all = notices(client).await;
        if all.len() > count {
            return all[count].clone();
        }
        assert!(
            Instant::now() < deadline,
            "no notice came; notices: {all:?}"
        );
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
}

/// Opens a record file through the header's file input, as a user picking it would.
async fn open_record_file(client: &Client, name: &str, text: &str) -> String {
    let before = notices(client).await.len();
    let file = TempFile::new("record", name, text);
    by_testid(client, "record-file")
        .await
        .send_keys(&file.path())
        .await
        .expect("pick the record");
    next_notice(client, before).await
}

/// Types the point calculation of the first test into the carriers view.
async fn type_point_inputs(client: &Client) {
    retype(client, "temperature", TEMPERATURE).await;
    retype(client, "dopant-0-density", DONOR_DENSITY).await;
    click(client, "add-acceptor").await;
    retype(client, "dopant-1-density", ACCEPTOR_DENSITY).await;
}

/// n at 350 K for P 3e15 and B 4e14 in silicon, from the core, as the page shows it
/// (four significant digits, e-notation).
fn expected_electrons() -> String {
    let si = materials::silicon();
    let doping = [("P", 3e15), ("B", 4e14)]
        .map(|(s, n)| materials::DopantDensity {
            dopant: si.dopant(s).expect("species"),
            density_cm3: n,
        })
        .to_vec();
    let eq = neutrality::solve(&si, 350.0, &doping, &SolveOptions::default()).expect("solve");
    format!("{:.3e}", eq.electrons_cm3)
}

#[tokio::test(flavor = "multi_thread")]
async fn point_calculation_report_prints_inputs_models_results_and_caution() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        client.goto(&base).await.expect("open app");
        type_point_inputs(&client).await;
        let n = expected_electrons();
        text_until(&client, "n", |t| t == n).await;
        assert_eq!(text_of(&client, "n").await, n, "the view shows another n");

        click(&client, "report-open").await;
        by_testid(&client, "report").await;
        // The report is the record's: the value shown in the view, the models, the caution.
        let rows = report_results(&client).await;
        let n_row = rows
            .iter()
            .find(|r| r[0] == "Electrons n")
            .expect("an 'Electrons n' row");
        assert_eq!(n_row[1], format!("{n} cm⁻³"));
        screenshot(&client, "report-point-1366").await;

        let text = print_pdf(&client, "report-point").await;
        // Inputs as typed.
        for typed in [
            "350 K",
            "P 3e15",
            "B 4e14",
            "Dopant-level model",
            "altermatt",
        ] {
            assert_has(&text, typed);
        }
        // Results with units, as the core computes them.
        assert_has(&text, &format!("{n} cm"));
        assert_has(&text, "Resistivity");
        assert_has(&text, "Ionization by species");
        // The models and their sources (names from the core's published-model list).
        for model in ["Varshni", "Masetti"] {
            assert_has(&text, model);
        }
        // The caution, version and build.
        assert_has(&text, "Model estimates.");
        assert_has(
            &text,
            "specifications and the governing standards decide acceptance",
        );
        assert_has(&text, &format!("bandgauge version {APP_VERSION}"));
        assert_has(&text, "Build commit");
        assert_has(&text, "SHA-256 digest");
        // Only the report is printed: no tabs, no buttons.
        for absent in [
            "Wafer lots",
            "Forget saved inputs",
            "Print or save as PDF",
            "Close",
        ] {
            assert!(
                !squash(&text).contains(&squash(absent)),
                "the printed report shows '{absent}': {text}"
            );
        }
        // The band diagram is on the page as a drawn image.
        assert_eq!(image_count(&client, "report-chart", 1).await, 1);
    })
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn lot_comparison_report_prints_the_spec_window_and_every_verdict() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        client.goto(&base).await.expect("open app");
        click(&client, "tab-lots").await;
        click(&client, "lots-demo").await;
        let deadline = Instant::now() + READ_WAIT;
        while !text_of(&client, "lots-status")
            .await
            .contains("1046 rows read")
        {
            assert!(Instant::now() < deadline, "the demo lots were not read");
            tokio::time::sleep(Duration::from_millis(100)).await;
        }
        click(&client, "report-open").await;
        by_testid(&client, "report").await;
        // The distribution chart, and one wafer map per lot: the wafer that decides its verdict.
        assert_eq!(image_count(&client, "report-chart", 1).await, 1);
        assert_eq!(image_count(&client, "report-map", 6).await, 6);
        let titles = client
            .execute(
                "return Array.from(document.querySelectorAll('[data-testid=\"report-map\"]')) \
                 .map(i => i.alt);",
                vec![],
            )
            .await
            .expect("read the chart titles");
        let titles: Vec<&str> = titles
            .as_array()
            .expect("a list of titles")
            .iter()
            .filter_map(|t| t.as_str())
            .collect();
        // Source: demo-wafers/README.md (the invented scenario): wafer 07 decides C2-4425.
        assert!(
            titles.contains(
                &"Wafer 07 of lot C2-4425, resistivity: the wafer that decides the lot's verdict"
            ),
            "report charts: {titles:?}"
        );
        screenshot(&client, "report-lots-1366").await;

        let rows = report_results(&client).await;
        // Source: demo-wafers/README.md, the demo scenario (invented data).
        let scenario = [
            ("C2-4417", "pass"),
            ("C2-4418", "pass"),
            ("C2-4421", "fail"),
            ("C2-4425", "marginal"),
            ("C2-4429", "pass"),
            ("C2-4432", "pass"),
        ];
        for (lot, verdict) in scenario {
            let row = rows
                .iter()
                .find(|r| r[0] == lot)
                .unwrap_or_else(|| panic!("no report row for lot {lot}"));
            assert_eq!(row[9], verdict, "lot {lot}: {row:?}");
        }

        let text = print_pdf(&client, "report-lots").await;
        assert_has(&text, "Spec window");
        assert_has(&text, "resistivity 8 to 12 ohm-cm");
        assert_has(&text, "Lower limit 8");
        assert_has(&text, "Upper limit 12");
        // Each lot's row prints as one line of the lots table: the lot, its dopant, its
        // figures, its verdict, up to the next lot's row.
        let flat = squash(&text);
        for (lot, verdict) in scenario {
            let from = flat
                .find(&format!("{lot}P(n)"))
                .unwrap_or_else(|| panic!("no lot row for {lot} in the PDF: {text}"));
            let row = &flat[from + lot.len()..];
            let row = &row[..row.find("C2-44").unwrap_or(row.len())];
            assert!(
                row.contains(verdict),
                "lot {lot}: printed row '{row}' lacks '{verdict}'"
            );
            for other in ["pass", "marginal", "fail"]
                .iter()
                .filter(|w| **w != verdict)
            {
                assert!(
                    !row.contains(other),
                    "lot {lot}: printed row '{row}' says '{other}'"
                );
            }
        }
        for name in [
            "c2-4417.csv",
            "c2-4418.csv",
            "c2-4421.tsv",
            "c2-4425-with-bad-rows.csv",
        ] {
            assert_has(&text, name);
        }
        assert_has(&text, "Model estimates.");

        // The lot record opens in a fresh page with nothing read and gives the same report.
        record_downloads(&client).await;
        click(&client, "report-save").await;
        let json = last_blob_text(&client).await;
        let saved = downloads(&client).await;
        assert!(
            saved
                .last()
                .is_some_and(|(name, _)| name.starts_with("bandgauge-record-lots-")
                    && name.ends_with(".json")),
            "{saved:?}"
        );
        client.goto(&base).await.expect("reload");
        let notice = open_record_file(&client, "lots-record.json", &json).await;
        assert!(
            notice.starts_with("record reproduced: ") && notice.contains(" results identical"),
            "{notice}"
        );
        for (lot, verdict) in scenario {
            let shown =
                text_until(&client, &format!("verdict-{lot}"), |t| t.contains(verdict)).await;
            assert!(
                shown.contains(verdict),
                "lot {lot} shows '{shown}' after opening"
            );
        }
        click(&client, "report-open").await;
        assert_eq!(report_results(&client).await, rows);
    })
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn a_saved_record_reopens_identically_and_a_changed_one_is_refused() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        client.goto(&base).await.expect("open app");
        type_point_inputs(&client).await;
        let n = expected_electrons();
        text_until(&client, "n", |t| t == n).await;
        record_downloads(&client).await;
        click(&client, "report-open").await;
        let shown = report_results(&client).await;
        click(&client, "report-save").await;
        let json = last_blob_text(&client).await;
        std::fs::write(artifacts().join("report-point-record.json"), &json).expect("save");
        let record: Value = serde_json::from_str(&json).expect("the record is JSON");
        assert_eq!(record["format"], "bandgauge sign-off record");
        assert_eq!(record["format_version"], 2);
        assert_eq!(record["app_version"], APP_VERSION);
        assert_eq!(record["inputs"]["workbench"]["carriers"]["temperature"], TEMPERATURE);

        // A fresh page with other inputs: the record brings back its inputs and its results.
        client
            .goto(&format!("{base}?t=77&dop=B%2C1e17"))
            .await
            .expect("open other inputs");
        assert_eq!(value_of(&client, "temperature").await, "77");
        let notice = open_record_file(&client, "point-record.json", &json).await;
        let values: usize = shown.iter().map(|r| r.len() - 1).sum();
        assert_eq!(
            notice,
            format!(
                "record reproduced: {values} results identical (point calculation, written {} \
                 by bandgauge {APP_VERSION}); its inputs are applied",
                record["created_utc"].as_str().expect("created_utc")
            )
        );
        assert_eq!(value_of(&client, "temperature").await, TEMPERATURE);
        assert_eq!(value_of(&client, "dopant-1-density").await, ACCEPTOR_DENSITY);
        assert_eq!(text_of(&client, "n").await, n);
        click(&client, "report-open").await;
        assert_eq!(report_results(&client).await, shown, "results differ after opening");
        click(&client, "report-close").await;
        // The keyboard focus goes back to the button that opened the report: W3C WAI-ARIA
        // Authoring Practices Guide, dialog (modal) pattern (from memory).
        let focused = client
            .execute(
                "const e = document.activeElement; return e ? e.dataset.testid || '' : '';",
                vec![],
            )
            .await
            .expect("read the focused element");
        assert_eq!(focused.as_str(), Some("report-open"), "focus after Close");

        // Now the page holds something else; refused records must leave it so.
        retype(&client, "temperature", "400 K").await;
        text_until(&client, "n", |t| t != n).await;
        let n_at_400 = text_of(&client, "n").await;

        // One number of the results changed.
        let exact = record["results"]["sections"][0]["rows"][4]["cells"][0]["exact"]
            .as_str()
            .expect("the exact n")
            .to_string();
        let tampered = json.replacen(&format!("\"{exact}\""), "\"1.5e15\"", 1);
        assert_ne!(tampered, json, "the exact n was not found in the record");
        let notice = open_record_file(&client, "tampered.json", &tampered).await;
        let digest = record["digest"].as_str().expect("digest");
        assert!(
            notice.starts_with(
                "record not opened: digest: the record was changed after it was written (its \
                 contents give digest "
            ) && notice.ends_with(&format!(
                ", the record says {}…); ask its author for the original file. Nothing was changed.",
                &digest[..12]
            )),
            "{notice}"
        );
        assert_eq!(value_of(&client, "temperature").await, "400 K");
        assert_eq!(text_of(&client, "n").await, n_at_400);

        // A record of a newer layout.
        let mut newer = record.clone();
        newer["format_version"] = Value::from(3);
        newer["app_version"] = Value::from("9.0.0");
        let notice = open_record_file(&client, "newer.json", &newer.to_string()).await;
        assert_eq!(
            notice,
            format!(
                "record not opened: format_version: the record was made by a newer bandgauge \
                 (record version 3); this bandgauge ({APP_VERSION}) reads record version 2 \
                 only; open it with bandgauge 9.0.0 or later. Nothing was changed."
            )
        );
        // Not a record at all.
        let notice = open_record_file(&client, "notes.json", "{\"lot\": \"C2-4417\"}").await;
        assert_eq!(
            notice,
            "record not opened: the file is JSON but not a sign-off record: it has no \"format\" \
             member; a record is an object whose format is \"bandgauge sign-off record\". \
             Nothing was changed."
        );
        assert_eq!(value_of(&client, "temperature").await, "400 K");
        assert_eq!(text_of(&client, "n").await, n_at_400);
        run_script(&client, "window.scrollTo(0, 0);").await;
        screenshot(&client, "report-refused-1366").await;
    })
    .await;
}

/// The number of decoded images `[data-testid=testid]` (at least 600 pixels wide) in the open
/// report, polled until it reaches `wanted` or 10 s pass.
async fn image_count(client: &Client, testid: &str, wanted: u64) -> u64 {
    let deadline = Instant::now() + Duration::from_secs(10);
    loop {
        let v = client
            .execute(
                "return Array.from(document.querySelectorAll('[data-testid=\"' + arguments[0] + '\"]')) \
                 .filter(i => i.complete && i.naturalWidth > 600).length;",
                vec![serde_json::json!(testid)],
            )
            .await
            .expect("count chart images");
        let count = v.as_u64().unwrap_or(0);
        if count >= wanted || Instant::now() > deadline {
            return count;
        }
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
}

#[tokio::test(flavor = "multi_thread")]
async fn sweep_and_conversion_reports_carry_their_tables_and_charts() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        // A sweep of 11 temperatures: one table row each, and the view's three charts.
        client
            .goto(&format!("{base}?view=sweep&from=100&to=600&pts=11"))
            .await
            .expect("open the sweep");
        click(&client, "report-open").await;
        let rows = report_results(&client).await;
        let temperatures: Vec<&str> = rows.iter().map(|r| r[0].as_str()).collect();
        assert_eq!(
            temperatures,
            [
                "100", "150", "200", "250", "300", "350", "400", "450", "500", "550", "600"
            ]
        );
        assert_eq!(image_count(&client, "report-chart", 3).await, 3);
        screenshot(&client, "report-sweep-1366").await;
        let text = print_pdf(&client, "report-sweep").await;
        assert_has(&text, "Carriers and Fermi level by temperature");
        assert_has(&text, "Sweep from 100");
        assert_has(&text, "Model estimates.");
        click(&client, "report-close").await;

        // The conversion and probe view: the comparison, the probe result as the view shows it.
        click(&client, "tab-resistivity").await;
        let sheet = text_until(&client, "probe-sheet", |t| t != "—").await;
        click(&client, "report-open").await;
        let rows = report_results(&client).await;
        let probe = rows
            .iter()
            .find(|r| r[0] == "Sheet resistance Rs")
            .expect("a sheet-resistance row");
        assert_eq!(probe[1], format!("{sheet} Ω/□"));
        assert!(
            rows.iter().any(|r| r[0] == "Spread: largest / smallest"),
            "{rows:?}"
        );
        assert_eq!(image_count(&client, "report-chart", 1).await, 1);
        let text = print_pdf(&client, "report-conversion").await;
        assert_has(&text, "Every model side by side (silicon, 23 C)");
        assert_has(&text, "Four-point probe result");
        assert_has(&text, &format!("{sheet} Ω/"));
        assert_has(&text, "Probe current 1 mA");
        assert_has(&text, "ASTM F723");
    })
    .await;
}
