//! The sign-off report: a print view of the calculation on screen (inputs as typed, results
//! with units, charts, models and sources, the caution, bandgauge's version and build), with
//! its JSON record to save, and the opening of a saved record, which is applied only after it
//! reads and recomputes to identical results (`crate::record`).
//!
//! The report is drawn from the record, not from the view, so the paper and the file say the
//! same. Charts are drawn again from the record's inputs onto images, which print.

use bandgauge_core::empirical::EmpiricalRelation;
use bandgauge_core::lots::{LotReport, SpecQuantity, SpecWindow, WaferSummary};
use leptos::prelude::*;

use crate::Bench;
use crate::browser;
use crate::carriers;
use crate::chart::{ChartSpec, palette};
use crate::entry;
use crate::lots_view::{self, LotsInputs, LotsWork, MapQuantity};
use crate::record::{self, RecordError, RecordInputs, RecordedView, Replayed, SignoffRecord};
use crate::resistivity;
use crate::state::View;
use crate::sweep;
use crate::wafer_map::MapSpec;
use crate::widgets::Caution;

/// Size of a chart image in the report, CSS pixels: the width of an A4 or Letter page
/// inside its margins at 96 px per inch, and a 16:9-ish height.
const CHART_CSS: (u32, u32) = (680, 360);
/// Device pixels per CSS pixel of a chart image: sharp on paper without a huge image.
const CHART_SCALE: f64 = 2.0;

/// Longest row label kept on one line in a result table, characters.
const SHORT_LABEL: usize = 24;

/// The report shown (`None` while closed), shared by the header controls and the overlay.
pub type OpenReport = RwSignal<Option<SignoffRecord>>;

/// A record of what the page shows now, written at `created_utc`.
///
/// # Errors
/// The record's refusal: invalid inputs, no lot files, files still being read, files too
/// large or not UTF-8, or lot files that were not read completely (the figures on screen
/// would not be those the record reproduces).
pub fn record_of_page(
    workbench: crate::state::Workbench,
    lots: Option<&lots_view::LotsSnapshot>,
    created_utc: &str,
) -> Result<SignoffRecord, RecordError> {
    let lot_inputs = match (workbench.view, lots) {
        (View::Lots, Some(snapshot)) => Some(record::lot_inputs(snapshot)?),
        _ => None,
    };
    let record = record::capture(
        RecordInputs {
            workbench,
            lots: lot_inputs,
        },
        created_utc,
    )?;
    if let Some(snapshot) = lots.filter(|_| record.view == RecordedView::LotComparison) {
        let shown = snapshot.counts;
        let recorded = lot_totals(&record);
        if recorded != Some((shown.read, shown.converted, shown.rejected)) {
            let mut reason = format!(
                "the lot files on screen were not read completely ({} rows read; read whole, \
                 they give {}); pick them again, then write the record",
                shown.read,
                recorded.map_or_else(|| "none".to_string(), |r| r.0.to_string())
            );
            if let Some(e) = snapshot.file_errors.first() {
                reason.push_str(&format!(" ({e})"));
            }
            return Err(RecordError::NotRecordable { reason });
        }
    }
    Ok(record)
}

/// Rows read, converted and rejected over all files of a lot record.
fn lot_totals(record: &SignoffRecord) -> Option<(u64, u64, u64)> {
    let files = record
        .results
        .sections
        .iter()
        .find(|s| s.title == "Files read")?;
    let all = files.rows.iter().find(|r| r.label == "all files")?;
    let count = |i: usize| -> Option<u64> {
        all.cells
            .get(i)
            .and_then(|c| c.exact.parse::<f64>().ok())
            .map(|v| v as u64)
    };
    Some((count(0)?, count(1)?, count(2)?))
}

/// Reads and recomputes a record's text: the record and its replay, or why it is refused.
pub fn open_record(text: &str) -> Result<(SignoffRecord, Replayed), RecordError> {
    let record = record::read_record(text)?;
    let replayed = record::replay(&record)?;
    Ok((record, replayed))
}

/// The notice after a record is applied.
pub fn reproduced_notice(record: &SignoffRecord, replayed: &Replayed) -> String {
    format!(
        "record reproduced: {} results identical ({}, written {} by bandgauge {}); its inputs \
         are applied",
        replayed.values,
        record.view.title().to_ascii_lowercase(),
        record.created_utc,
        record.app_version
    )
}

/// The notice after a record is refused.
pub fn refused_notice(error: &str) -> String {
    format!("record not opened: {error}. Nothing was changed.")
}

/// The lots view's inputs of a lot record, with its files read.
fn lots_of(record: &SignoffRecord) -> Option<(LotsWork, LotsInputs)> {
    let l = record.inputs.lots.as_ref()?;
    let dopant = (!l.default_dopant.is_empty()).then(|| l.default_dopant.clone());
    let mut work = LotsWork::new(dopant);
    for f in &l.files {
        work.read_text(&f.name, &f.text);
    }
    Some((
        work,
        LotsInputs {
            dopant: l.default_dopant.clone(),
            quantity: l.spec_quantity.clone(),
            spec_min: l.spec_min.clone(),
            spec_max: l.spec_max.clone(),
            lot_filter: String::new(),
            map_wafer: String::new(),
            ..LotsInputs::default()
        },
    ))
}

/// The charts of a record's view, drawn from its inputs (empty when they cannot be computed).
pub fn charts(record: &SignoffRecord) -> Vec<ChartSpec> {
    let w = &record.inputs.workbench;
    match record.view {
        RecordedView::PointCalculation => carriers::request_from_inputs(&w.carriers)
            .and_then(|r| carriers::evaluate(&r))
            .map(|o| vec![carriers::band_diagram(&o)])
            .unwrap_or_default(),
        RecordedView::TemperatureSweep => {
            let solved = carriers::problem_from_inputs(&w.carriers).and_then(|(m, d, o)| {
                let from = entry::temperature_k("from", &w.sweep.from)?;
                let to = entry::temperature_k("to", &w.sweep.to)?;
                let n = entry::count("points", &w.sweep.points, 2, sweep::MAX_POINTS)?;
                sweep::evaluate(&m, &d, &o, from, to, n)
            });
            let marked = entry::temperature_k("temperature", &w.carriers.temperature).ok();
            solved
                .map(|s| {
                    vec![
                        sweep::carriers_chart(&s, marked),
                        sweep::fermi_chart(&s, marked),
                        sweep::ionization_chart(&s, marked),
                    ]
                })
                .unwrap_or_default()
        }
        RecordedView::Conversion => {
            let c = &w.conversion;
            let value = match c.given {
                crate::state::Given::Resistivity => entry::positive(
                    "resistivity",
                    &c.value,
                    bandgauge_core::units::QuantityKind::Resistivity,
                    "ohm-cm",
                ),
                crate::state::Given::Density => entry::positive(
                    "density",
                    &c.value,
                    bandgauge_core::units::QuantityKind::Density,
                    "cm^-3",
                ),
            };
            let sample = value
                .and_then(|v| resistivity::compare_at_23c(c.given, v, &c.dopant))
                .ok()
                .and_then(|comparison| {
                    let a = comparison
                        .answers
                        .iter()
                        .find(|a| a.density_cm3.is_some() && a.resistivity_ohm_cm.is_some())?;
                    let color = if EmpiricalRelation::for_dopant("si", &c.dopant).map(|r| r.0)
                        == Ok(EmpiricalRelation::Boron)
                    {
                        palette::HOLES
                    } else {
                        palette::ELECTRONS
                    };
                    Some((a.density_cm3?, a.resistivity_ohm_cm?, color))
                });
            vec![resistivity::chart(&resistivity::curves(), sample)]
        }
        // The Hall view draws no chart.
        RecordedView::HallAnalysis => Vec::new(),
        RecordedView::LotComparison => lot_pictures(record).0,
    }
}

/// A wafer map with its uniformity figures as lines of text.
pub type MapFigure = (MapSpec, Vec<String>);

/// The charts and the wafer maps of a record; a lot record's files are read once for both.
pub fn pictures(record: &SignoffRecord) -> (Vec<ChartSpec>, Vec<MapFigure>) {
    match record.view {
        RecordedView::LotComparison => lot_pictures(record),
        _ => (charts(record), Vec::new()),
    }
}

/// A lot record's distribution chart and its wafer maps: per lot the wafer that decides its
/// verdict (without a spec window, its first wafer), in the quantity of the spec window
/// (resistivity without one), each with its uniformity figures.
fn lot_pictures(record: &SignoffRecord) -> (Vec<ChartSpec>, Vec<MapFigure>) {
    let Some((work, inputs)) = lots_of(record) else {
        return (Vec::new(), Vec::new());
    };
    let spec = lots_view::spec_from_inputs(&inputs.quantity, &inputs.spec_min, &inputs.spec_max)
        .ok()
        .flatten();
    let quantity = match spec.as_ref().map(SpecWindow::quantity) {
        Some(SpecQuantity::Density) => MapQuantity::Density,
        _ => MapQuantity::Resistivity,
    };
    let report = work.report(spec.as_ref());
    let chart = lots_view::distribution_chart(&report, spec.as_ref(), None);
    // Each map says why it is in the report.
    let why = if spec.is_some() {
        "the wafer that decides the lot's verdict"
    } else {
        "the lot's first wafer"
    };
    let maps = report_wafers(&report)
        .into_iter()
        .filter_map(|(lot, wafer)| {
            let mut map =
                lots_view::wafer_map(&work.sites, lot, wafer, spec.as_ref(), quantity, None)
                    .ok()
                    .flatten()?;
            let lines = lots_view::map::figure_lines(&map);
            map.title = format!("{}: {why}", map.title);
            Some((map, lines))
        })
        .collect();
    (chart.into_iter().collect(), maps)
}

/// Most wafer maps one report prints.
const MAX_REPORT_WAFER_MAPS: usize = 8;

/// The wafers a lot report maps: per lot, in the report's order, the wafer that decides its
/// verdict (without a spec window, its first wafer), when it has sites with positions; at most
/// [`MAX_REPORT_WAFER_MAPS`].
fn report_wafers(report: &LotReport) -> Vec<(&str, &str)> {
    report
        .lots
        .iter()
        .filter_map(|l| {
            let mapped = |w: &&WaferSummary| w.sites_with_position > 0;
            let wafer = match &l.worst_wafer {
                Some(worst) => l.wafer_results.iter().find(|w| &w.wafer == worst),
                None => l.wafer_results.first(),
            }
            .filter(mapped)?;
            Some((l.lot.as_str(), wafer.wafer.as_str()))
        })
        .take(MAX_REPORT_WAFER_MAPS)
        .collect()
}

/// Applies an opened record to the page: lot files first (the one step that can be refused),
/// then the inputs. Nothing is changed when it is refused.
fn apply(bench: Bench, record: &SignoffRecord) -> Result<(), String> {
    if let Some((work, inputs)) = lots_of(record) {
        if lots_view::is_reading() {
            return Err(
                "lot files are being read; wait until reading ends, then open the \
                        record again"
                    .into(),
            );
        }
        lots_view::install(work, inputs)?;
    }
    let workbench = record.inputs.workbench.clone();
    bench.edit(|w| *w = workbench);
    Ok(())
}

/// The header's controls: write a report of the view shown, open a saved record.
#[component]
pub fn RecordTools(
    /// The shared inputs.
    bench: Bench,
    /// The page's notices, where the outcome of opening a record is told.
    notices: RwSignal<Vec<String>>,
    /// The report shown.
    open: OpenReport,
) -> impl IntoView {
    let tell = move |text: String| notices.update(|n| n.push(text));
    let write_report = move |_| {
        let workbench = bench.inputs.get_untracked();
        let lots = (workbench.view == View::Lots).then(lots_view::snapshot);
        match record_of_page(workbench, lots.as_ref(), &browser::now_iso_utc()) {
            Ok(record) => open.set(Some(record)),
            Err(e) => tell(format!("sign-off report: {e}")),
        }
    };
    let on_pick = move |ev: leptos::ev::Event| {
        let input = event_target::<web_sys::HtmlInputElement>(&ev);
        let file = input.files().and_then(|f| f.get(0));
        // Cleared, so that picking the same file again is a change.
        input.set_value("");
        let Some(file) = file else { return };
        browser::read_text_file(&file, move |text| {
            let outcome = text.map_err(|e| e.to_string()).and_then(|text| {
                let (record, replayed) = open_record(&text).map_err(|e| e.to_string())?;
                apply(bench, &record)?;
                Ok(reproduced_notice(&record, &replayed))
            });
            tell(outcome.unwrap_or_else(|e| refused_notice(&e)));
        });
    };
    view! {
        <div class="record-tools">
            <button type="button" id=REPORT_BUTTON_ID data-testid="report-open" on:click=write_report
                title="A page to print or save as PDF, and the record file that reproduces it">
                "Sign-off report"
            </button>
            <input type="file" id="record-file" class="sr-only" data-testid="record-file"
                accept=".json,application/json" on:change=on_pick />
            <label class="record-file" for="record-file"
                title="Open a saved record: its inputs are applied once its results are reproduced">
                "Open record…"
            </label>
        </div>
    }
}

/// The `id` of the button that opens the report (focus returns to it when the report closes).
const REPORT_BUTTON_ID: &str = "report-open";

/// The report page over the workbench, while one is open.
#[component]
pub fn ReportOverlay(
    /// The report shown.
    open: OpenReport,
) -> impl IntoView {
    // Keyboard users go back to where they opened it.
    let close = Callback::new(move |()| {
        open.set(None);
        browser::focus_element(REPORT_BUTTON_ID);
    });
    move || {
        open.get()
            .map(|record| view! { <ReportPage record=record on_close=close /> })
    }
}

/// One chart as an image, or why it could not be drawn.
fn chart_figure(spec: &ChartSpec) -> impl IntoView + use<> {
    let title = spec.title.clone();
    match browser::chart_image(spec, CHART_CSS.0, CHART_CSS.1, CHART_SCALE) {
        Ok(url) => view! {
            <figure class="signoff-chart">
                <img src=url alt=title data-testid="report-chart" />
            </figure>
        }
        .into_any(),
        Err(e) => view! { <p class="message">{e}</p> }.into_any(),
    }
}

/// Size of a wafer map in the report, CSS pixels.
const MAP_CSS: (u32, u32) = (680, 470);

/// One wafer map as an image with its figures under it, or why it could not be drawn.
fn map_figure((spec, lines): &MapFigure) -> impl IntoView + use<> {
    let title = spec.title.clone();
    let lines = lines.clone();
    match browser::map_image(spec, MAP_CSS.0, MAP_CSS.1, CHART_SCALE) {
        Ok(url) => view! {
            <figure class="signoff-chart">
                <img src=url alt=title data-testid="report-map" />
                <figcaption class="note">{lines.join("; ")}</figcaption>
            </figure>
        }
        .into_any(),
        Err(e) => view! { <p class="message">{e}</p> }.into_any(),
    }
}

/// One result table; words (regimes, verdicts, remarks) are set left, numbers right, and a
/// verdict carries its sign as on the lots view.
fn result_table(s: record::ResultSection) -> impl IntoView {
    let verdict_column = s.columns.iter().position(|c| c == "Verdict");
    // A column of words only (remarks, tests, reasons) is set left, its heading too.
    let words_column: Vec<bool> = (0..s.columns.len())
        .map(|i| {
            i == 0
                || s.rows.iter().all(|r| {
                    r.cells
                        .get(i - 1)
                        .is_none_or(|c| c.exact.parse::<f64>().is_err())
                })
        })
        .collect();
    let class = if s.columns.len() <= 2 {
        "signoff-results narrow"
    } else {
        "signoff-results"
    };
    view! {
        <table class=class>
            <caption>{s.title}</caption>
            <thead><tr>{s.columns.into_iter().zip(words_column).map(|(c, words)| view! {
                <th scope="col" class:words=words>{c}</th>
            }).collect_view()}</tr></thead>
            <tbody>
                {s.rows.into_iter().map(|r| {
                    let short = r.label.chars().count() <= SHORT_LABEL;
                    view! {
                    <tr>
                        // Short labels (lots, quantities) on one line; long ones may wrap.
                        <th scope="row" class:nowrap=short>{r.label}</th>
                        {r.cells.into_iter().enumerate().map(|(i, c)| {
                            let mut class = String::new();
                            if c.exact.parse::<f64>().is_err() {
                                class.push_str("words");
                            }
                            if verdict_column == Some(i + 1) && !c.shown.is_empty() {
                                class.push_str(&format!(" verdict {}", c.shown));
                            }
                            let text = if c.unit.is_empty() { c.shown } else { format!("{} {}", c.shown, c.unit) };
                            view! { <td class=class>{text}</td> }
                        }).collect_view()}
                    </tr>
                    }
                }).collect_view()}
            </tbody>
        </table>
    }
}

/// The report itself.
#[component]
fn ReportPage(record: SignoffRecord, on_close: Callback<()>) -> impl IntoView {
    let json = record::to_json(&record);
    let file_name = record::file_name(&record);
    let save_error = RwSignal::new(None::<String>);
    let save = move |_| {
        save_error.set(browser::download_text(&json, "application/json", &file_name).err());
    };
    let on_key = move |ev: leptos::ev::KeyboardEvent| {
        if ev.key() == "Escape" {
            on_close.run(());
        }
    };
    let heading = NodeRef::<leptos::html::H1>::new();
    // Keyboard users land on the report, not behind it.
    Effect::new(move |_| {
        if let Some(h) = heading.get() {
            let _ = h.focus();
        }
    });
    let inputs = record::input_lines(&record);
    let (figures, wafer_maps) = pictures(&record);
    let models: Vec<(String, String, String)> = record
        .results
        .models
        .iter()
        .map(|m| (m.quantity.clone(), m.model.clone(), m.source.clone()))
        .collect();
    let results = record.results.clone();
    let mut other_tables = results.sections.into_iter();
    let first_table = other_tables.next();
    view! {
        <div class="signoff" role="dialog" aria-modal="true" aria-labelledby="signoff-title"
            data-testid="report" on:keydown=on_key>
            <div class="signoff-actions">
                <button type="button" class="primary" data-testid="report-print" on:click=|_| browser::print()>
                    "Print or save as PDF"
                </button>
                <button type="button" data-testid="report-save" on:click=save>"Save record (JSON)"</button>
                <button type="button" data-testid="report-close" on:click=move |_| on_close.run(())>"Close"</button>
                {move || save_error.get().map(|e| view! { <span class="message">{e}</span> })}
            </div>
            <article class="signoff-page">
                <h1 id="signoff-title" tabindex="-1" node_ref=heading>
                    "bandgauge sign-off report: " {record.view.title()}
                </h1>
                <table class="signoff-meta" data-testid="report-meta">
                    <tbody>
                        <tr><th scope="row">"Written (UTC)"</th><td>{record.created_utc.clone()}</td></tr>
                        <tr><th scope="row">"bandgauge version"</th><td>{record.app_version.clone()}</td></tr>
                        <tr><th scope="row">"Build commit"</th><td>{record.build_commit.clone()}</td></tr>
                        <tr>
                            <th scope="row">"Record"</th>
                            <td>
                                {format!("{}, version {}; SHA-256 digest ", record.format, record.format_version)}
                                <code class="digest" data-testid="report-digest">{record.digest.clone()}</code>
                            </td>
                        </tr>
                    </tbody>
                </table>
                <p class="signoff-hint">
                    "The record file saved with this report reproduces every figure below when opened in "
                    "bandgauge; its digest shows whether it was changed after it was written."
                </p>
                <section class="signoff-section">
                    <h2>"Inputs, as typed"</h2>
                    <table class="signoff-inputs" data-testid="report-inputs">
                        <tbody>
                            {inputs.into_iter().map(|(label, value)| view! {
                                <tr><th scope="row">{label}</th><td>{value}</td></tr>
                            }).collect_view()}
                        </tbody>
                    </table>
                </section>
                <section class="signoff-section" data-testid="report-results">
                    // A heading is printed with the table or chart under it, never alone at
                    // the foot of a page.
                    <div class="keep-together">
                        <h2>"Results"</h2>
                        {first_table.map(result_table)}
                    </div>
                    {other_tables.map(result_table).collect_view()}
                    {(!results.notes.is_empty()).then(|| view! {
                        <ul class="signoff-notes">
                            {results.notes.into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}
                        </ul>
                    })}
                </section>
                {(!figures.is_empty()).then(|| view! {
                    <section class="signoff-section signoff-charts">
                        <div class="keep-together">
                            <h2>"Charts"</h2>
                            {figures.first().map(chart_figure)}
                        </div>
                        {figures.iter().skip(1).map(chart_figure).collect_view()}
                    </section>
                })}
                {(!wafer_maps.is_empty()).then(|| view! {
                    <section class="signoff-section signoff-charts">
                        <div class="keep-together">
                            <h2>"Wafer maps"</h2>
                            {wafer_maps.first().map(map_figure)}
                        </div>
                        {wafer_maps.iter().skip(1).map(map_figure).collect_view()}
                    </section>
                })}
                <section class="signoff-section">
                    <h2>"Models and parameter sources"</h2>
                    <Caution models=Signal::derive(move || models.clone()) />
                </section>
            </article>
        </div>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lots_view::{DEMO_FILES, DEMO_SPEC, LotsSnapshot};
    use crate::state::Workbench;

    const CREATED: &str = "2025-03-14T09:26:53.120Z";

    #[test]
    fn a_lot_report_maps_the_wafer_that_decides_each_lot() {
        let mut work = LotsWork::new(None);
        for (name, text) in DEMO_FILES {
            work.read_text(name, text);
        }
        let spec = lots_view::spec_from_inputs("resistivity", DEMO_SPEC.0, DEMO_SPEC.1).unwrap();
        let report = work.report(spec.as_ref());
        let wafers = report_wafers(&report);
        let lots: Vec<&str> = wafers.iter().map(|(lot, _)| *lot).collect();
        assert_eq!(
            lots,
            [
                "C2-4417", "C2-4418", "C2-4421", "C2-4425", "C2-4429", "C2-4432"
            ]
        );
        // Source: demo-wafers/README.md (the invented scenario): wafer 07 decides C2-4425.
        assert_eq!(wafers[3], ("C2-4425", "07"));
        for (l, (lot, wafer)) in report.lots.iter().zip(&wafers) {
            assert_eq!(l.worst_wafer.as_deref(), Some(*wafer), "{lot}");
        }
        // Without a window no wafer decides anything: each lot's first wafer is mapped.
        let plain = work.report(None);
        let first: Vec<(&str, &str)> = report_wafers(&plain);
        assert_eq!(first[0], ("C2-4417", "01"));
        assert_eq!(first.len(), 6);
    }

    fn demo_snapshot(read_whole: bool) -> LotsSnapshot {
        let mut work = LotsWork::new(None);
        for (name, text) in DEMO_FILES {
            if read_whole {
                work.read_text(name, text);
            } else {
                work.begin_file(name, text.len() as u64);
                work.feed(&text.as_bytes()[..text.len() / 2]);
                work.interrupt();
            }
        }
        LotsSnapshot {
            read_dopant: String::new(),
            inputs: LotsInputs {
                quantity: "resistivity".into(),
                spec_min: DEMO_SPEC.0.into(),
                spec_max: DEMO_SPEC.1.into(),
                ..LotsInputs::default()
            },
            files: work.file_texts().map(|f| {
                f.into_iter()
                    .map(|(n, b)| (n.to_owned(), b.to_vec()))
                    .collect()
            }),
            counts: work.counts(),
            busy: false,
            file_errors: Vec::new(),
        }
    }

    fn lots_workbench() -> Workbench {
        Workbench {
            view: View::Lots,
            ..Workbench::default()
        }
    }

    #[test]
    fn a_lot_report_records_the_files_as_read() {
        let snapshot = demo_snapshot(true);
        let record = record_of_page(lots_workbench(), Some(&snapshot), CREATED).expect("record");
        let files = &record.inputs.lots.as_ref().expect("lots").files;
        assert_eq!(files.len(), 6);
        assert_eq!(files[2].text, DEMO_FILES[2].1);
        assert_eq!(lot_totals(&record), Some((1046, 1039, 7)));
        let (back, replayed) = open_record(&record::to_json(&record)).expect("reopens");
        assert_eq!(back, record);
        assert_eq!(
            reproduced_notice(&back, &replayed),
            format!(
                "record reproduced: {} results identical (wafer-lot comparison, written \
                 {CREATED} by bandgauge {}); its inputs are applied",
                replayed.values,
                record::APP_VERSION
            )
        );
    }

    #[test]
    fn half_read_lot_files_are_not_recorded() {
        let snapshot = demo_snapshot(false);
        let err = record_of_page(lots_workbench(), Some(&snapshot), CREATED).unwrap_err();
        assert!(
            err.to_string().starts_with(
                "no record written: the lot files on screen were not read completely ("
            ),
            "{err}"
        );
        let busy = LotsSnapshot {
            busy: true,
            ..demo_snapshot(true)
        };
        assert_eq!(
            record_of_page(lots_workbench(), Some(&busy), CREATED)
                .unwrap_err()
                .to_string(),
            "no record written: lot files are being read; wait until reading ends"
        );
        let not_text = LotsSnapshot {
            files: Some(vec![("scan.csv".into(), vec![0xff, 0xfe, b'a'])]),
            ..demo_snapshot(true)
        };
        assert_eq!(
            record_of_page(lots_workbench(), Some(&not_text), CREATED)
                .unwrap_err()
                .to_string(),
            "no record written: scan.csv is not UTF-8 text; a record carries text files only"
        );
    }

    #[test]
    fn every_view_has_its_charts() {
        for (view, count) in [
            (View::Carriers, 1),
            (View::Sweep, 3),
            (View::Resistivity, 1),
            // The distribution chart (the wafer maps are apart, `pictures`).
            (View::Lots, 1),
        ] {
            let snapshot = demo_snapshot(true);
            let lots = (view == View::Lots).then_some(&snapshot);
            let workbench = Workbench {
                view,
                ..Workbench::default()
            };
            let record = record_of_page(workbench, lots, CREATED).expect("record");
            assert_eq!(charts(&record).len(), count, "{view:?}");
        }
    }

    #[test]
    fn a_lot_record_maps_the_deciding_wafer_of_each_lot() {
        let snapshot = demo_snapshot(true);
        let workbench = Workbench {
            view: View::Lots,
            ..Workbench::default()
        };
        let record = record_of_page(workbench, Some(&snapshot), CREATED).expect("record");
        let (charts, maps) = pictures(&record);
        assert_eq!(charts.len(), 1);
        // A wafer map for each of the six demo lots, each with its figures.
        assert_eq!(maps.len(), 6);
        for (map, lines) in &maps {
            assert!(
                map.title.contains("decides the lot's verdict"),
                "{}",
                map.title
            );
            assert!(lines.iter().any(|l| l.starts_with("std/mean")), "{lines:?}");
        }
    }

    #[test]
    fn refusals_say_nothing_changed() {
        assert_eq!(
            refused_notice("format: \"x\" is not a format bandgauge reads"),
            "record not opened: format: \"x\" is not a format bandgauge reads. Nothing was changed."
        );
    }
}
