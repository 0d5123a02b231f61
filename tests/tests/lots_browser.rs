//! Browser tests of the wafer-lot view: demo lots, verdicts and rejected rows in real Chromium.
//!
//! The expected verdicts, counts and rejected lines are computed here with `bandgauge_core::lots`
//! on the same files the page reads, and the demo scenario's intended outcome
//! (demo-wafers/README.md) is asserted as well, since the scenario is the specification.

use bandgauge_core::lots::{
    LotBook, ReadOptions, RowCounts, RowOutcome, SpecQuantity, SpecWindow, Verdict, read_str,
};
use bandgauge_tests::browser::{by_testid, retype, screenshot, text_until, with_browser};
use bandgauge_tests::lot_rows::LotRows;
use bandgauge_tests::ui::{
    TempFile, canvas_drawn, choose, click, record_downloads, run_script, text_of,
};
use fantoccini::{Client, Locator};
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

/// A drawn chart has axes, tick labels and marks: thousands of inked pixels; a blank or
/// background-only canvas has none.
const MIN_INKED_PIXELS: u64 = 2000;

/// Smaller of the two windows the app must serve.
const LAPTOP: (u32, u32) = (1366, 768);
/// Larger window.
const DESKTOP: (u32, u32) = (1920, 1080);

/// How long a file may take to be read on a slow, shared test machine.
const READ_WAIT: Duration = Duration::from_secs(60);

/// The demo scenario's spec window (demo-wafers/README.md: 8.0 to 12.0 ohm cm).
const DEMO_WINDOW: &str = "8:12";

/// The demo files, in the order the page reads them.
const DEMO_FILES: [&str; 6] = [
    "c2-4417.csv",
    "c2-4418.csv",
    "c2-4421.tsv",
    "c2-4425-with-bad-rows.csv",
    "c2-4429-radial.csv",
    "c2-4432-hot-spot.csv",
];

fn demo_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .parent()
        .expect("tests/ has a parent")
        .join("demo-wafers")
}

/// What the core makes of some files: counts, rejected (file, line) and the lots' verdicts.
struct Expected {
    counts: RowCounts,
    rejected: Vec<(String, u64)>,
    verdicts: Vec<(String, Option<Verdict>)>,
    sites: Vec<(String, u64, usize)>,
    /// (lot, wafer, verdict word or "") in report order.
    wafer_verdicts: Vec<(String, String, String)>,
}

fn expected_for(files: &[(String, String)], window: Option<&SpecWindow>) -> Expected {
    let mut book = LotBook::new();
    let mut rejected = Vec::new();
    for (name, text) in files {
        read_str(text, &ReadOptions::default(), &mut book, &mut |outcome| {
            if let RowOutcome::Rejected(r) = outcome {
                rejected.push((name.clone(), r.line));
            }
        })
        .unwrap_or_else(|e| panic!("core cannot read {name}: {e}"));
    }
    let report = book.report(window);
    Expected {
        counts: book.counts(),
        rejected,
        verdicts: report
            .lots
            .iter()
            .map(|l| (l.lot.clone(), l.verdict))
            .collect(),
        sites: report
            .lots
            .iter()
            .map(|l| (l.lot.clone(), l.sites, l.wafers))
            .collect(),
        wafer_verdicts: report
            .lots
            .iter()
            .flat_map(|l| {
                l.wafer_results.iter().map(|w| {
                    (
                        l.lot.clone(),
                        w.wafer.clone(),
                        w.judgement
                            .map(|j| j.verdict.as_str().to_string())
                            .unwrap_or_default(),
                    )
                })
            })
            .collect(),
    }
}

fn demo_texts() -> Vec<(String, String)> {
    DEMO_FILES
        .iter()
        .map(|name| {
            let path = demo_dir().join(name);
            let text = std::fs::read_to_string(&path)
                .unwrap_or_else(|e| panic!("read {}: {e}", path.display()));
            (name.to_string(), text)
        })
        .collect()
}

/// Polls `[data-testid=lots-status]` until the page is done reading and has read `rows` rows.
async fn wait_until_read(client: &Client, rows: u64) -> String {
    let deadline = Instant::now() + READ_WAIT;
    let wanted = format!(": {rows} rows read");
    loop {
        let text = text_of(client, "lots-status").await;
        if text.contains(&wanted) && !text.contains("Reading") {
            return text;
        }
        assert!(
            Instant::now() < deadline,
            "the page did not finish reading {rows} rows; status: {text}"
        );
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
}

/// The `data-testid`s of the rejected rows listed, in page order.
async fn listed_rejections(client: &Client) -> Vec<(String, String)> {
    let list = by_testid(client, "lots-rejected").await;
    let mut out = Vec::new();
    for item in list
        .find_all(Locator::Css("li"))
        .await
        .expect("rejected items")
    {
        let id = item.attr("data-testid").await.ok().flatten();
        let text = item.text().await.unwrap_or_default();
        out.push((id.unwrap_or_default(), text));
    }
    out
}

/// The text of the cells of the summary row of `lot` (its heading cell first).
async fn summary_cells(client: &Client, lot: &str) -> Vec<String> {
    let row = by_testid(client, &format!("lot-{lot}")).await;
    let mut out = Vec::new();
    for cell in row.find_all(Locator::Css("th, td")).await.expect("cells") {
        out.push(cell.text().await.unwrap_or_default());
    }
    out
}

/// The cells of every body row of the table `[data-testid=id]`, as text.
async fn table_cells(client: &Client, id: &str) -> Vec<Vec<String>> {
    by_testid(client, id).await;
    let script = "return Array.from(document.querySelectorAll('[data-testid=\"' + arguments[0] + \
                  '\"] tbody tr')).map(r => Array.from(r.cells).map(c => c.textContent.trim()));";
    let v = client
        .execute(script, vec![serde_json::json!(id)])
        .await
        .expect("read table");
    serde_json::from_value(v).expect("rows of cell texts")
}

async fn open_lots(client: &Client, base: &str) {
    client.goto(base).await.expect("open app");
    click(client, "tab-lots").await;
    by_testid(client, "lots-demo").await;
    // A fresh page has read nothing and says how to start.
    let empty = text_of(client, "lots-empty").await;
    assert!(empty.contains("demo lots"), "empty view says '{empty}'");
}

async fn load_demo(client: &Client) -> Expected {
    let window = SpecWindow::parse(SpecQuantity::Resistivity, DEMO_WINDOW).expect("window");
    let expected = expected_for(&demo_texts(), Some(&window));
    click(client, "lots-demo").await;
    wait_until_read(client, expected.counts.read).await;
    expected
}

/// Scrolls so that `[data-testid=id]` is at the top of the window.
async fn scroll_to(client: &Client, id: &str) {
    run_script(
        client,
        &format!(
            "document.querySelector('[data-testid=\"{id}\"]').scrollIntoView({{block: 'start'}});"
        ),
    )
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn demo_lots_show_the_scenario_verdicts_and_rejected_lines() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        open_lots(&client, &base).await;
        screenshot(&client, "lots-empty-1366").await;
        let expected = load_demo(&client).await;

        // The scenario is the specification: pass, pass, fail, marginal, pass, pass, 7 bad rows.
        // Source: demo-wafers/README.md (invented scenario of this project).
        let intended = [
            ("C2-4417", Verdict::Pass),
            ("C2-4418", Verdict::Pass),
            ("C2-4421", Verdict::Fail),
            ("C2-4425", Verdict::Marginal),
            ("C2-4429", Verdict::Pass),
            ("C2-4432", Verdict::Pass),
        ];
        let core: Vec<(String, Option<Verdict>)> = intended
            .iter()
            .map(|(lot, v)| (lot.to_string(), Some(*v)))
            .collect();
        assert_eq!(
            expected.verdicts, core,
            "the core disagrees with the scenario"
        );
        for (lot, verdict) in intended {
            let shown = text_until(&client, &format!("verdict-{lot}"), |t| {
                t.contains(verdict.as_str())
            })
            .await;
            assert!(
                shown.split_whitespace().any(|w| w == verdict.as_str()),
                "lot {lot}: verdict shown '{shown}', expected '{}'",
                verdict.as_str()
            );
        }
        // The demo fills in the scenario's window when none was typed.
        for (id, value) in [("lots-spec-min", "8"), ("lots-spec-max", "12")] {
            let input = by_testid(&client, id).await;
            assert_eq!(
                input.prop("value").await.ok().flatten().as_deref(),
                Some(value)
            );
        }

        let status = text_of(&client, "lots-status").await;
        let c = expected.counts;
        assert_eq!((c.read, c.converted, c.rejected), (1046, 1039, 7));
        assert!(
            status.contains(&format!(
                "{} rows read, {} converted, {} rejected",
                c.read, c.converted, c.rejected
            )),
            "status: {status}"
        );

        // Every wafer's verdict as the core has it; the scenario's: every C2-4421 wafer fails,
        // C2-4425 wafer 07 is marginal and the rest of C2-4425 pass.
        let shown: Vec<(String, String, String)> = table_cells(&client, "lots-wafers")
            .await
            .into_iter()
            .map(|r| (r[0].clone(), r[1].clone(), r[6].clone()))
            .collect();
        assert_eq!(shown, expected.wafer_verdicts);
        for (lot, wafer, verdict) in &shown {
            let intended = match (lot.as_str(), wafer.as_str()) {
                ("C2-4421", _) => "fail",
                ("C2-4425", "07") => "marginal",
                _ => "pass",
            };
            assert_eq!(verdict, intended, "lot {lot} wafer {wafer}");
        }

        // Source: demo-wafers/README.md, the bad rows of c2-4425-with-bad-rows.csv.
        let intended_lines = [12u64, 28, 42, 57, 72, 100, 115];
        let core_lines: Vec<u64> = expected.rejected.iter().map(|(_, l)| *l).collect();
        assert_eq!(core_lines, intended_lines);
        let listed = listed_rejections(&client).await;
        let listed_ids: Vec<String> = listed.iter().map(|(id, _)| id.clone()).collect();
        let wanted_ids: Vec<String> = intended_lines
            .iter()
            .map(|l| format!("rejected-line-{l}"))
            .collect();
        assert_eq!(listed_ids, wanted_ids);
        for ((_, text), line) in listed.iter().zip(intended_lines) {
            assert!(
                text.contains("c2-4425-with-bad-rows.csv")
                    && text.contains(&format!("line {line}")),
                "rejected row shown as '{text}'"
            );
        }
        // The results carry the caution and name the conversion model and its source
        // (project rule: values are model estimates; the fab's specifications decide).
        let caution = text_of(&client, "caution").await;
        assert!(
            caution.contains("Model estimates")
                && caution.contains("specifications")
                && caution.contains("Thurber"),
            "caution shown as '{caution}'"
        );
        screenshot(&client, "lots-demo-1366").await;
        scroll_to(&client, "lots-chart").await;
        screenshot(&client, "lots-demo-1366-chart").await;
        scroll_to(&client, "lots-map").await;
        screenshot(&client, "lots-demo-1366-map").await;
        scroll_to(&client, "lots-rejected").await;
        screenshot(&client, "lots-demo-1366-rejected").await;
    })
    .await;
}

/// The `toDataURL()` of the canvas `[data-testid=id]`, to see whether a redraw changed it.
async fn canvas_url(client: &Client, id: &str) -> String {
    by_testid(client, id).await;
    let v = client
        .execute(
            "return document.querySelector('[data-testid=\"' + arguments[0] + '\"]').toDataURL();",
            vec![serde_json::json!(id)],
        )
        .await
        .expect("read canvas");
    v.as_str().unwrap_or("").to_string()
}

/// Polls until the canvas differs from `before` (it was redrawn with something else).
async fn canvas_changes_from(client: &Client, id: &str, before: &str) {
    let deadline = Instant::now() + READ_WAIT;
    while canvas_url(client, id).await == before {
        assert!(Instant::now() < deadline, "canvas {id} was not redrawn");
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
}

/// Number of rows in the body of the table `[data-testid=id]`.
async fn body_rows(client: &Client, id: &str) -> usize {
    by_testid(client, id)
        .await
        .find_all(Locator::Css("tbody tr"))
        .await
        .expect("table rows")
        .len()
}

#[tokio::test(flavor = "multi_thread")]
async fn demo_charts_and_wafer_map_are_drawn_and_follow_the_choices() {
    with_browser(DESKTOP.0, DESKTOP.1, |client, base| async move {
        open_lots(&client, &base).await;
        load_demo(&client).await;
        let chart = canvas_drawn(&client, "lots-chart", MIN_INKED_PIXELS).await;
        let map = canvas_drawn(&client, "lots-map", MIN_INKED_PIXELS).await;
        assert!(chart.width > 0 && map.width > 0);
        screenshot(&client, "lots-demo-1920").await;
        scroll_to(&client, "lots-chart").await;
        screenshot(&client, "lots-demo-1920-chart").await;

        // Another wafer on the map: the map is redrawn.
        let map_before = canvas_url(&client, "lots-map").await;
        choose(&client, "lots-map-wafer", "C2-4421|11").await;
        canvas_changes_from(&client, "lots-map", &map_before).await;
        canvas_drawn(&client, "lots-map", MIN_INKED_PIXELS).await;
        screenshot(&client, "lots-map-low-1920").await;

        // One lot shown: one summary row, its wafers only, the chart redrawn, the map on it.
        let chart_before = canvas_url(&client, "lots-chart").await;
        choose(&client, "lots-filter", "C2-4418").await;
        canvas_changes_from(&client, "lots-chart", &chart_before).await;
        canvas_drawn(&client, "lots-chart", MIN_INKED_PIXELS).await;
        assert_eq!(body_rows(&client, "lots-summary").await, 1);
        let expected = expected_for(&demo_texts(), None);
        let c2_4418 = expected
            .sites
            .iter()
            .find(|(lot, ..)| lot == "C2-4418")
            .expect("lot C2-4418 in the core's report");
        assert_eq!(body_rows(&client, "lots-wafers").await, c2_4418.2);
        let map_wafer = by_testid(&client, "lots-map-wafer")
            .await
            .prop("value")
            .await
            .ok()
            .flatten()
            .unwrap_or_default();
        assert!(
            map_wafer.starts_with("C2-4418|"),
            "the map still shows '{map_wafer}' while only C2-4418 is shown"
        );
        screenshot(&client, "lots-filtered-1920").await;
    })
    .await;
}

/// A small lot file with three bad rows (lines 4, 6 and 9) between good ones.
const FILE_WITH_BAD_ROWS: &str = "\
lot,wafer,site,x [mm],y [mm],dopant,resistivity [ohm-cm]
K9-0101,01,1,0,0,B,10.2
K9-0101,01,2,40,0,B,10.5
K9-0101,01,3,0,40,B,ten
K9-0101,01,4,-40,0,B,9.9
K9-0101,,5,0,-40,B,10.0
K9-0101,02,1,0,0,B,9.7
K9-0101,02,2,40,0,B,9.6
K9-0101,02,3,0,40,B,-3
K9-0101,02,4,-40,0,B,9.8
";

/// A displayed value has four significant digits: within half a unit of the last digit,
/// 5e-4 relative, of the core's value; a little more for the rounding of 9.9995.
const DISPLAY_REL_TOL: f64 = 6e-4;

#[tokio::test(flavor = "multi_thread")]
async fn imported_file_lists_bad_rows_by_line_and_summarises_the_good_ones() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        let name = "k9-0101-bad-rows.csv";
        let file = TempFile::new("lots", name, FILE_WITH_BAD_ROWS);
        let expected = expected_for(&[(name.to_string(), FILE_WITH_BAD_ROWS.to_string())], None);
        // By construction of the file above: lines 4 (not a number), 6 (no wafer), 9 (negative).
        let lines: Vec<u64> = expected.rejected.iter().map(|(_, l)| *l).collect();
        assert_eq!(lines, [4, 6, 9]);
        let c = expected.counts;
        assert_eq!((c.read, c.converted, c.rejected), (9, 6, 3));

        open_lots(&client, &base).await;
        by_testid(&client, "lots-files")
            .await
            .send_keys(&file.path())
            .await
            .expect("give the file input a path");
        let status = wait_until_read(&client, c.read).await;
        assert!(
            status.contains(&format!(
                "{} converted, {} rejected",
                c.converted, c.rejected
            )),
            "status: {status}"
        );
        let listed = listed_rejections(&client).await;
        let ids: Vec<String> = listed.iter().map(|(id, _)| id.clone()).collect();
        assert_eq!(
            ids,
            ["rejected-line-4", "rejected-line-6", "rejected-line-9"]
        );
        for ((_, text), line) in listed.iter().zip(lines) {
            assert!(
                text.starts_with(&format!("{name}, line {line}: ")),
                "rejected row shown as '{text}'"
            );
        }
        assert!(
            listed[1].1.contains("wafer"),
            "line 6 lacks a wafer: {}",
            listed[1].1
        );

        // The good rows are summarised: wafers, sites and mean as the core has them.
        let window = None;
        let mut book = LotBook::new();
        read_str(
            FILE_WITH_BAD_ROWS,
            &ReadOptions::default(),
            &mut book,
            &mut |_| {},
        )
        .expect("core reads the file");
        let report = book.report(window);
        let lot = &report.lots[0];
        assert_eq!((lot.lot.as_str(), lot.wafers, lot.sites), ("K9-0101", 2, 6));
        let cells = summary_cells(&client, "K9-0101").await;
        assert_eq!(cells[0], "K9-0101");
        assert_eq!(cells[2], lot.wafers.to_string());
        assert_eq!(cells[3], lot.sites.to_string());
        let mean: f64 = cells[4]
            .parse()
            .unwrap_or_else(|_| panic!("mean shown as '{}'", cells[4]));
        let core_mean = lot.resistivity_ohm_cm.mean;
        assert!(
            ((mean - core_mean) / core_mean).abs() <= DISPLAY_REL_TOL,
            "mean shown {mean}, core {core_mean}"
        );
        canvas_drawn(&client, "lots-chart", MIN_INKED_PIXELS).await;
        canvas_drawn(&client, "lots-map", MIN_INKED_PIXELS).await;
        screenshot(&client, "lots-import-1366").await;

        // Another view and back: what was read is still there.
        click(&client, "tab-carriers").await;
        by_testid(&client, "temperature").await;
        click(&client, "tab-lots").await;
        let again = wait_until_read(&client, c.read).await;
        assert_eq!(again, status);
        let ids_again: Vec<String> = listed_rejections(&client)
            .await
            .into_iter()
            .map(|(id, _)| id)
            .collect();
        assert_eq!(ids_again, ids);
        assert_eq!(summary_cells(&client, "K9-0101").await, cells);
    })
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn a_notes_file_among_lot_files_is_skipped_and_pairs_show_holm_adjusted_p() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        // The demo folder as a user picks it: six lot files and the folder's README.md.
        let texts = demo_texts();
        let files: Vec<TempFile> = texts
            .iter()
            .map(|(name, text)| TempFile::new("skip", name, text))
            .collect();
        let readme_text =
            std::fs::read_to_string(demo_dir().join("README.md")).expect("demo README");
        let readme = TempFile::new("skip", "README.md", &readme_text);
        let expected = expected_for(&texts, None);
        open_lots(&client, &base).await;
        let paths: Vec<String> = files
            .iter()
            .chain(std::iter::once(&readme))
            .map(TempFile::path)
            .collect();
        by_testid(&client, "lots-files")
            .await
            .send_keys(&paths.join("\n"))
            .await
            .expect("give the file input the paths");
        let status = wait_until_read(&client, expected.counts.read).await;
        assert!(
            status.starts_with("6 file(s) read, 1 skipped (not lot files, named below)"),
            "status: {status}"
        );
        let messages = text_of(&client, "lots-file-messages").await;
        assert!(
            messages.contains("skipped README.md: not a lot file: line 3: "),
            "messages: {messages}"
        );
        // The six lots are summarised as without the README.
        for lot in [
            "C2-4417", "C2-4418", "C2-4421", "C2-4425", "C2-4429", "C2-4432",
        ] {
            assert_eq!(summary_cells(&client, lot).await[0], lot);
        }

        // Every pair with its raw and Holm-adjusted p, as the core computes them.
        let rows = table_cells(&client, "lots-differences").await;
        assert_eq!(
            rows.len(),
            16,
            "fifteen pairs and the all-lots test: {rows:?}"
        );
        let mut book = LotBook::new();
        for (_, text) in &texts {
            read_str(text, &ReadOptions::default(), &mut book, &mut |_| {}).expect("core reads");
        }
        let report = book.report(None);
        for (i, d) in report.differences.iter().enumerate() {
            let raw: f64 = text_of(&client, &format!("lots-difference-{i}-p"))
                .await
                .parse()
                .expect("raw p");
            let adjusted: f64 = text_of(&client, &format!("lots-difference-{i}-p-adjusted"))
                .await
                .parse()
                .expect("adjusted p");
            assert!(((raw - d.test.p_value) / d.test.p_value).abs() <= DISPLAY_REL_TOL);
            assert!(((adjusted - d.p_adjusted) / d.p_adjusted).abs() <= DISPLAY_REL_TOL);
            let verdict = text_of(&client, &format!("lots-difference-{i}-verdict")).await;
            assert_eq!(verdict == "significant", d.p_adjusted < 0.05, "{verdict}");
        }
        let method = text_of(&client, "lots-differences-method").await;
        assert!(
            method.contains("Holm (1979), Scand. J. Statist. 6, 65-70"),
            "{method}"
        );
        scroll_to(&client, "lots-differences").await;
        screenshot(&client, "lots-skipped-and-holm-1366").await;
    })
    .await;
}

/// A lot identifier that is HTML markup; it must appear as text and never run.
const MARKUP_LOT: &str = "<img src=x onerror=alert(1)>";

#[tokio::test(flavor = "multi_thread")]
async fn markup_in_a_lot_id_is_shown_as_text() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        let text = format!(
            "lot,wafer,site,x [mm],y [mm],dopant,resistivity [ohm-cm]\n\
             {MARKUP_LOT},01,1,0,0,P,10.1\n{MARKUP_LOT},01,2,30,0,P,10.3\n\
             {MARKUP_LOT},02,1,0,0,P,10.2\n{MARKUP_LOT},02,2,30,0,P,9.9\n"
        );
        let file = TempFile::new("lots", "markup-lot.csv", &text);
        open_lots(&client, &base).await;
        run_script(
            &client,
            "window.__alerts = 0; window.alert = function () { window.__alerts += 1; };",
        )
        .await;
        by_testid(&client, "lots-files")
            .await
            .send_keys(&file.path())
            .await
            .expect("give the file input a path");
        wait_until_read(&client, 4).await;
        let cells = summary_cells(&client, MARKUP_LOT).await;
        assert_eq!(cells[0], MARKUP_LOT, "the lot id is not shown literally");
        let filter = text_of(&client, "lots-filter").await;
        assert!(filter.contains(MARKUP_LOT), "lot filter shows '{filter}'");
        let map_choice = text_of(&client, "lots-map-wafer").await;
        assert!(
            map_choice.contains(MARKUP_LOT),
            "map choice shows '{map_choice}'"
        );
        // Give a broken image's error handler time to run, had one been created.
        tokio::time::sleep(Duration::from_millis(300)).await;
        let found = client
            .execute(
                "return [document.querySelectorAll('section.lots img').length, window.__alerts];",
                vec![],
            )
            .await
            .expect("inspect page");
        assert_eq!(
            found,
            serde_json::json!([0, 0]),
            "markup from a lot id was run"
        );
        screenshot(&client, "lots-markup-1366").await;
    })
    .await;
}

/// The large generated file: 4 lots x 25 wafers x 1000 sites = 100,000 rows.
const LARGE: LotRows = LotRows {
    lots: 4,
    wafers: 25,
    sites_per_wafer: 1000,
    dopant: "P",
    lot_prefix: "L",
};
/// A file read in pieces shows at least this many distinct percentages before it is done.
const MIN_PROGRESS_STEPS: usize = 3;

#[tokio::test(flavor = "multi_thread")]
async fn a_large_file_is_read_in_pieces_with_visible_progress() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        let text = LARGE.text();
        let rows = LARGE.rows() as u64;
        let file = TempFile::new("lots", "large-lots.csv", &text);
        open_lots(&client, &base).await;
        // Record every status the page shows, whether the progress bar is there, and how many
        // timer callbacks the page ran (it can only run them between pieces of work).
        run_script(
            &client,
            r#"
            window.__ticks = 0;
            window.__seen = [];
            window.__timer = setInterval(function () { window.__ticks += 1; }, 0);
            const box = document.querySelector('.lots-progress');
            new MutationObserver(function () {
                window.__seen.push([
                    document.querySelector('[data-testid="lots-status"]').textContent,
                    !!document.querySelector('[data-testid="lots-progress"]'),
                    window.__ticks,
                    performance.now()
                ]);
            }).observe(box, { subtree: true, childList: true, characterData: true, attributes: true });
            "#,
        )
        .await;
        by_testid(&client, "lots-files")
            .await
            .send_keys(&file.path())
            .await
            .expect("give the file input a path");
        wait_until_read(&client, rows).await;
        let seen = client
            .execute("clearInterval(window.__timer); return window.__seen;", vec![])
            .await
            .expect("read the recorded statuses");
        let seen = seen.as_array().cloned().unwrap_or_default();
        let reading: Vec<&serde_json::Value> = seen
            .iter()
            .filter(|s| s[0].as_str().is_some_and(|t| t.starts_with("Reading")))
            .collect();
        let mut percents: Vec<String> = reading
            .iter()
            .filter_map(|s| {
                let t = s[0].as_str()?;
                let p = t.split(", ").nth(1)?.split(" %").next()?.to_string();
                Some(p)
            })
            .collect();
        percents.dedup();
        assert!(
            percents.len() >= MIN_PROGRESS_STEPS,
            "progress seen: {percents:?}"
        );
        assert!(
            reading.iter().any(|s| s[1].as_bool() == Some(true)),
            "no progress bar while reading"
        );
        let ticks = |s: &serde_json::Value| s[2].as_f64().unwrap_or(0.0);
        let (first, last) = (reading[0], reading[reading.len() - 1]);
        assert!(
            ticks(last) > ticks(first),
            "no timer ran while the file was read: the page was blocked"
        );
        let ms = last[3].as_f64().unwrap_or(0.0) - first[3].as_f64().unwrap_or(0.0);
        eprintln!(
            "large file: {rows} rows, {} bytes, {} progress steps seen, {} timer turns in {ms:.0} ms of reading",
            text.len(),
            percents.len(),
            ticks(last) - ticks(first)
        );
        let cells = summary_cells(&client, "L0").await;
        assert_eq!(cells[3], (LARGE.wafers * LARGE.sites_per_wafer).to_string());
        screenshot(&client, "lots-large-1366").await;
    })
    .await;
}

/// Size of the generated file of the 50 MB test, bytes (50 MiB).
const FIFTY_MB: usize = 50 * 1024 * 1024;
/// How long the 50 MB file may take on a slow, shared test machine before the test gives up.
const FIFTY_MB_READ_WAIT: Duration = Duration::from_secs(600);
/// Responsiveness: the longest the page may go without running a timer callback while it
/// reads. A page that stays under this still answers a click or a key within a second; a page
/// that read the whole file in one go would block for the whole read. A property, not a speed
/// target: the read itself may take as long as the machine needs.
const MAX_TIMER_GAP_MS: f64 = 1000.0;
/// Lots and wafers of the 50 MB file; sites per wafer grow until the file reaches its size.
const FIFTY_MB_LOTS: usize = 6;
const FIFTY_MB_WAFERS: usize = 25;

/// A lot file of at least `bytes` bytes: `FIFTY_MB_LOTS` lots of `FIFTY_MB_WAFERS` wafers with
/// the same number of sites each, positions and invented resistivities (demo data). Returns
/// the text and the sites per wafer.
fn file_of_at_least(bytes: usize) -> (String, usize) {
    let header = "lot,wafer,site,x [mm],y [mm],dopant,resistivity [ohm-cm]\n";
    let row = |lot: usize, wafer: usize, site: usize| {
        // Invented values: lots 0.3 ohm cm apart, wafers 0.02 apart, sites over 0.5.
        let value =
            9.0 + lot as f64 * 0.3 + wafer as f64 * 0.02 + ((site * 31) % 1000) as f64 / 2000.0;
        let x = (site % 100) as f64 * 1.5 - 75.0;
        let y = ((site / 100) % 100) as f64 * 1.5 - 75.0;
        format!("L{lot}-88,{wafer:02},{site},{x},{y},B,{value:.3}\n")
    };
    let build = |sites: usize| {
        let mut text = String::with_capacity(bytes + bytes / 10);
        text.push_str(header);
        for lot in 0..FIFTY_MB_LOTS {
            for wafer in 0..FIFTY_MB_WAFERS {
                for site in 0..sites {
                    text.push_str(&row(lot, wafer, site));
                }
            }
        }
        text
    };
    // Estimate the sites per wafer from a sample of rows, then grow until the size is reached.
    let sample: usize = (0..1000).map(|s| row(3, 12, s).len()).sum();
    let mut sites = bytes * 1000 / (sample * FIFTY_MB_LOTS * FIFTY_MB_WAFERS) + 1;
    let mut text = build(sites);
    while text.len() < bytes {
        sites = sites * bytes / text.len() + 1;
        text = build(sites);
    }
    assert!(text.len() >= bytes, "generated {} bytes", text.len());
    (text, sites)
}

#[tokio::test(flavor = "multi_thread")]
async fn a_50_mb_file_is_read_with_progress_and_the_page_stays_responsive() {
    with_browser(LAPTOP.0, LAPTOP.1, |client, base| async move {
        let (text, sites) = file_of_at_least(FIFTY_MB);
        let rows = (FIFTY_MB_LOTS * FIFTY_MB_WAFERS * sites) as u64;
        // What the core makes of the same text: the page must show the same counts.
        let expected = expected_for(&[("fifty.csv".to_owned(), text.clone())], None);
        assert_eq!(expected.counts.read, rows);
        assert_eq!(expected.counts.rejected, 0);
        let size = text.len();
        let file = TempFile::new("lots", "fifty-mb-lots.csv", &text);
        drop(text);
        open_lots(&client, &base).await;
        // Every timer callback records the longest pause since the one before, and every status
        // the page shows is kept with the time and the progress bar's value.
        run_script(
            &client,
            r#"
            window.__gap = 0; window.__gap_all = 0; window.__last = 0; window.__ticks = 0;
            window.__seen = []; window.__was_reading = false;
            window.__timer = setInterval(function () {
                const now = performance.now();
                if (window.__last > 0) {
                    // A pause between two pieces: the page said "Reading" at both ends.
                    if (window.__reading && window.__was_reading) {
                        window.__gap = Math.max(window.__gap, now - window.__last);
                    }
                    window.__gap_all = Math.max(window.__gap_all, now - window.__last);
                }
                window.__was_reading = !!window.__reading;
                window.__last = now;
                window.__ticks += 1;
            }, 0);
            const box = document.querySelector('.lots-progress');
            new MutationObserver(function () {
                const status = document.querySelector('[data-testid="lots-status"]').textContent;
                const bar = document.querySelector('[data-testid="lots-progress"]');
                window.__reading = status.startsWith('Reading');
                window.__seen.push([status, bar ? bar.value : -1, window.__ticks, performance.now()]);
            }).observe(box, { subtree: true, childList: true, characterData: true, attributes: true });
            "#,
        )
        .await;
        let started = Instant::now();
        by_testid(&client, "lots-files")
            .await
            .send_keys(&file.path())
            .await
            .expect("give the file input a path");
        let deadline = Instant::now() + FIFTY_MB_READ_WAIT;
        let wanted = format!("1 file(s) read: {rows} rows read, {rows} converted, 0 rejected");
        loop {
            let status = text_of(&client, "lots-status").await;
            if status == wanted {
                break;
            }
            assert!(
                Instant::now() < deadline,
                "not read within {FIFTY_MB_READ_WAIT:?}; status: {status}"
            );
            tokio::time::sleep(Duration::from_millis(200)).await;
        }
        let wall = started.elapsed();
        let seen = client
            .execute(
                "clearInterval(window.__timer); \
                 return [window.__seen, window.__gap, window.__gap_all];",
                vec![],
            )
            .await
            .expect("read the recorded statuses");
        let gap_ms = seen[1].as_f64().unwrap_or(f64::INFINITY);
        // Any pause, the summary's first drawing after the last piece included (reported only:
        // it is one step of its own, not a piece of the read).
        let gap_all_ms = seen[2].as_f64().unwrap_or(f64::INFINITY);
        let seen = seen[0].as_array().cloned().unwrap_or_default();
        let reading: Vec<&serde_json::Value> = seen
            .iter()
            .filter(|s| s[0].as_str().is_some_and(|t| t.starts_with("Reading")))
            .collect();
        // Progress is shown and advances: the bar's value and the percentage both grow.
        let bar: Vec<f64> = reading.iter().filter_map(|s| s[1].as_f64()).collect();
        assert!(bar.iter().all(|v| (0.0..=1.0).contains(v)), "bar values {bar:?}");
        assert!(
            bar.windows(2).all(|w| w[1] >= w[0]),
            "the progress bar went back: {bar:?}"
        );
        let mut percents: Vec<String> = reading
            .iter()
            .filter_map(|s| {
                let t = s[0].as_str()?;
                Some(t.split(", ").nth(1)?.split(" %").next()?.to_string())
            })
            .collect();
        percents.dedup();
        assert!(
            percents.len() >= 10,
            "only {} progress steps seen: {percents:?}",
            percents.len()
        );
        // Responsive: timers kept running between pieces, never paused for long.
        let ticks = |s: &serde_json::Value| s[2].as_f64().unwrap_or(0.0);
        let (first, last) = (reading[0], reading[reading.len() - 1]);
        assert!(ticks(last) > ticks(first), "no timer ran while the file was read");
        assert!(
            gap_ms < MAX_TIMER_GAP_MS,
            "the page went {gap_ms:.0} ms without a timer callback while reading"
        );
        // All rows read, and the summary is the core's.
        for (lot, sites_of_lot, wafers) in &expected.sites {
            let cells = summary_cells(&client, lot).await;
            assert_eq!(cells[3], sites_of_lot.to_string(), "sites of {lot}: {cells:?}");
            assert_eq!(*wafers, FIFTY_MB_WAFERS);
        }
        eprintln!(
            "50 MB file: {size} bytes, {rows} rows, read in {:.1} s (wall, file pick to summary); \
             {} progress steps; longest pause between timer callbacks {gap_ms:.0} ms between \
             pieces, {gap_all_ms:.0} ms with the summary's drawing; {} timer turns while reading",
            wall.as_secs_f64(),
            percents.len(),
            ticks(last) - ticks(first)
        );
        screenshot(&client, "lots-50mb-1366").await;
    })
    .await;
}

/// The cells of column `col` of the wafer table, top to bottom.
async fn wafer_column(client: &Client, col: usize) -> Vec<String> {
    table_cells(client, "lots-wafers")
        .await
        .into_iter()
        .map(|r| r[col].clone())
        .collect()
}

/// The `aria-sort` of the header cell holding the sort button `[data-testid=id]`.
async fn aria_sort(client: &Client, id: &str) -> String {
    let v = client
        .execute(
            "return document.querySelector('[data-testid=\"' + arguments[0] + '\"]') \
             .closest('th').getAttribute('aria-sort');",
            vec![serde_json::json!(id)],
        )
        .await
        .expect("read aria-sort");
    v.as_str().unwrap_or("").to_string()
}

/// Filters and sorts of the wafer table on the demo lots, checked against the core's report.
async fn wafer_table_filters_and_sorts(size: (u32, u32)) {
    with_browser(size.0, size.1, move |client, base| async move {
        open_lots(&client, &base).await;
        let expected = load_demo(&client).await;
        let total = expected.wafer_verdicts.len();
        let count = |shown: usize| format!("showing {shown} of {total} wafers");
        assert_eq!(text_of(&client, "wafers-count").await, count(total));

        // Failing wafers only, then failing and marginal ones, as the core judges them.
        for (filter, words) in [
            ("fail", &["fail"][..]),
            ("fail-marginal", &["fail", "marginal"]),
        ] {
            choose(&client, "wafers-show", filter).await;
            let wanted: Vec<(String, String)> = expected
                .wafer_verdicts
                .iter()
                .filter(|(.., v)| words.contains(&v.as_str()))
                .map(|(l, w, _)| (l.clone(), w.clone()))
                .collect();
            text_until(&client, "wafers-count", |t| t == count(wanted.len())).await;
            let shown: Vec<(String, String)> = table_cells(&client, "lots-wafers")
                .await
                .into_iter()
                .map(|r| (r[0].clone(), r[1].clone()))
                .collect();
            assert_eq!(shown, wanted, "filter {filter}");
        }
        // Source: demo-wafers/README.md (invented scenario): the 12 wafers of C2-4421 fail and
        // wafer 07 of C2-4425 is marginal.
        assert_eq!(body_rows(&client, "lots-wafers").await, 13);
        screenshot(&client, &format!("lots-wafers-failing-{}", size.0)).await;
        choose(&client, "wafers-show", "all").await;
        text_until(&client, "wafers-count", |t| t == count(total)).await;

        // Sorting by the mean: numerically ascending, a second click descending.
        let numbers = |cells: Vec<String>| -> Vec<f64> {
            cells
                .iter()
                .map(|c| c.parse().unwrap_or_else(|_| panic!("not a number: {c}")))
                .collect()
        };
        assert_eq!(aria_sort(&client, "wafers-sort-mean").await, "none");
        click(&client, "wafers-sort-mean").await;
        assert_eq!(aria_sort(&client, "wafers-sort-mean").await, "ascending");
        let means = numbers(wafer_column(&client, 3).await);
        assert_eq!(means.len(), total);
        assert!(means.windows(2).all(|w| w[0] <= w[1]), "{means:?}");
        click(&client, "wafers-sort-mean").await;
        assert_eq!(aria_sort(&client, "wafers-sort-mean").await, "descending");
        let means = numbers(wafer_column(&client, 3).await);
        assert!(means.windows(2).all(|w| w[0] >= w[1]), "{means:?}");
        scroll_to(&client, "lots-wafers").await;
        screenshot(&client, &format!("lots-wafers-sorted-{}", size.0)).await;

        // From the keyboard: Enter on a focused header button sorts by that column, and the
        // other header goes back to unsorted. Sites outside sort as numbers (0, 1, 13, 23).
        let button = by_testid(&client, "wafers-sort-outside").await;
        run_script(
            &client,
            "document.querySelector('[data-testid=\"wafers-sort-outside\"]').focus();",
        )
        .await;
        button.send_keys("\u{e007}").await.expect("press Enter");
        assert_eq!(aria_sort(&client, "wafers-sort-outside").await, "ascending");
        assert_eq!(aria_sort(&client, "wafers-sort-mean").await, "none");
        let outside = numbers(wafer_column(&client, 8).await);
        assert!(outside.windows(2).all(|w| w[0] <= w[1]), "{outside:?}");
        assert_eq!(outside.last().copied(), Some(23.0), "{outside:?}");
    })
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn wafer_table_filters_and_sorts_at_1366() {
    wafer_table_filters_and_sorts(LAPTOP).await;
}

#[tokio::test(flavor = "multi_thread")]
async fn wafer_table_filters_and_sorts_at_1920() {
    wafer_table_filters_and_sorts(DESKTOP).await;
}

/// A week of production: 24 lots x 25 wafers x 5 sites (invented values, 0.3 ohm cm apart from
/// lot to lot, so the later lots run above the 12 ohm cm limit).
const MANY_LOTS: LotRows = LotRows {
    lots: 24,
    wafers: 25,
    sites_per_wafer: 5,
    dopant: "P",
    lot_prefix: "K4-5",
};

/// The 24-lot file, read through the file input: the chart keeps its room per lot (wider than
/// its panel, which scrolls), names every lot on its axis or in the list under it, and its PNG
/// is the whole chart.
async fn many_lots_stay_legible(size: (u32, u32)) {
    with_browser(size.0, size.1, move |client, base| async move {
        let text = MANY_LOTS.text();
        let file = TempFile::new("many-lots", "k4-week.csv", &text);
        let window = SpecWindow::parse(SpecQuantity::Resistivity, DEMO_WINDOW).expect("window");
        let expected = expected_for(&[("k4-week.csv".into(), text.clone())], Some(&window));
        assert_eq!(expected.verdicts.len(), 24);
        open_lots(&client, &base).await;
        retype(&client, "lots-spec-min", "8").await;
        retype(&client, "lots-spec-max", "12").await;
        by_testid(&client, "lots-files")
            .await
            .send_keys(&file.path())
            .await
            .expect("give the file input a path");
        wait_until_read(&client, MANY_LOTS.rows() as u64).await;
        text_until(&client, "wafers-count", |t| t == "showing 600 of 600 wafers").await;

        let ink = canvas_drawn(&client, "lots-chart", MIN_INKED_PIXELS).await;
        // 56 CSS px per lot plus 180 for the axis and the limit labels (chart.rs).
        let least = f64::from(24 * 56 + 180);
        assert!(ink.css_width >= least, "chart {:?} narrower than {least}", ink);
        let scroll = client
            .execute(
                "const b = document.querySelector('[data-testid=\"lots-chart-scroll\"]'); \
                 return [b.scrollWidth, b.clientWidth];",
                vec![],
            )
            .await
            .expect("read the scroll box");
        let (inner, outer) = (scroll[0].as_f64().unwrap_or(0.0), scroll[1].as_f64().unwrap_or(0.0));
        assert!(
            inner >= least && outer < inner,
            "the chart box does not scroll: {inner} in {outer}"
        );

        // Every lot in words, with the core's verdict.
        let items = client
            .execute(
                "return Array.from(document.querySelectorAll('[data-testid=\"lots-chart-values\"] li')) \
                 .map(l => l.textContent);",
                vec![],
            )
            .await
            .expect("read the chart's list");
        let items: Vec<String> = serde_json::from_value(items).expect("texts");
        assert_eq!(items.len(), 24);
        for (item, (lot, verdict)) in items.iter().zip(&expected.verdicts) {
            let word = verdict.map_or("no verdict", Verdict::as_str);
            assert!(item.starts_with(&format!("{lot}: {word};")), "{item}");
        }
        // The later lots run above the window, the first ones inside (by construction above).
        assert_eq!(expected.verdicts[0].1, Some(Verdict::Pass));
        assert_eq!(expected.verdicts[23].1, Some(Verdict::Fail));

        // The PNG is the whole chart, not the part in view.
        record_downloads(&client).await;
        click(&client, "lots-chart-png").await;
        let png_width = client
            .execute_async(
                "const done = arguments[arguments.length - 1]; \
                 const d = window.__downloads[window.__downloads.length - 1]; \
                 const i = new Image(); i.onload = () => done(i.naturalWidth); i.src = d[1];",
                vec![],
            )
            .await
            .expect("read the PNG");
        assert_eq!(png_width.as_u64(), Some(ink.width), "PNG width");

        scroll_to(&client, "lots-chart").await;
        screenshot(&client, &format!("lots-many-{}", size.0)).await;
        run_script(
            &client,
            "const b = document.querySelector('[data-testid=\"lots-chart-scroll\"]'); \
             b.scrollLeft = b.scrollWidth;",
        )
        .await;
        screenshot(&client, &format!("lots-many-{}-right", size.0)).await;
    })
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn many_lots_stay_legible_at_1366() {
    many_lots_stay_legible(LAPTOP).await;
}

#[tokio::test(flavor = "multi_thread")]
async fn many_lots_stay_legible_at_1920() {
    many_lots_stay_legible(DESKTOP).await;
}
