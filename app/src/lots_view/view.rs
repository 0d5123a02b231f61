//! The "Wafer lots" component: inputs, progress, the summary tables, charts, rejected rows and
//! exports, all displayed from [`LotsWork`].

use bandgauge_core::lots::SpecQuantity;
use leptos::prelude::*;

use super::charts::{distribution_chart, distribution_lines};
use super::map::{MapPanel, MapQuantity, map_definitions, parse_diameter, radial_chart, wafer_map};
use super::reading::{Handles, Source, files_of, read_sources};
use super::snapshot::{KEPT, LIVE, Live, LotsInputs};
use super::summary::{HOLM_ADJUSTMENT, difference_rows, models_used, summary_csv};
use super::table::{WaferColumn, WaferFilter, WaferRow, WaferSort, shown_order, wafer_rows};
use super::work::{LotsWork, spec_from_inputs};
use super::{DEMO_FILES, DEMO_SPEC};
use crate::Bench;
use crate::browser;
use crate::format;
use crate::widgets::{Caution, ChartPanel};

/// The view.
#[component]
pub fn LotsView(
    /// The shared handles (layout and timing for the charts).
    bench: Bench,
) -> impl IntoView {
    let (mut kept_work, kept_inputs) = KEPT
        .with(|k| k.borrow_mut().take())
        .unwrap_or_else(|| (LotsWork::new(None), LotsInputs::default()));
    kept_work.interrupt();
    let work = StoredValue::new_local(kept_work);
    // Bumped after every chunk, so progress redraws; the report follows `finished`.
    let progress = RwSignal::new(0u64);
    let finished = RwSignal::new(0u64);
    let busy = RwSignal::new(false);
    let job_files = RwSignal::new(0usize);
    let dragging = RwSignal::new(false);
    let dopant = RwSignal::new(kept_inputs.dopant);
    let quantity = RwSignal::new(if kept_inputs.quantity.is_empty() {
        "resistivity".to_owned()
    } else {
        kept_inputs.quantity
    });
    let spec_min = RwSignal::new(kept_inputs.spec_min);
    let spec_max = RwSignal::new(kept_inputs.spec_max);
    let lot_filter = RwSignal::new(kept_inputs.lot_filter);
    let map_wafer = RwSignal::new(kept_inputs.map_wafer);
    let map_quantity = RwSignal::new(MapQuantity::from_id(&kept_inputs.map_quantity));
    let map_diameter = RwSignal::new(kept_inputs.map_diameter);
    let export_error = RwSignal::new(None::<String>);
    let wafers_shown = RwSignal::new(WaferFilter::All);
    let wafers_sort = RwSignal::new(None::<WaferSort>);
    let handles = Handles {
        work,
        progress,
        finished,
        busy,
    };

    LIVE.with(|l| {
        l.set(Some(Live {
            handles,
            job_files,
            dopant,
            quantity,
            spec_min,
            spec_max,
            lot_filter,
            map_wafer,
        }))
    });
    // Leaving the view keeps what was read and typed for when it is shown again.
    on_cleanup(move || {
        LIVE.with(|l| l.set(None));
        let inputs = LotsInputs {
            dopant: dopant.get_untracked(),
            quantity: quantity.get_untracked(),
            spec_min: spec_min.get_untracked(),
            spec_max: spec_max.get_untracked(),
            lot_filter: lot_filter.get_untracked(),
            map_wafer: map_wafer.get_untracked(),
            map_quantity: map_quantity.get_untracked().id().to_owned(),
            map_diameter: map_diameter.get_untracked(),
        };
        if let Some(w) = work.try_update_value(std::mem::take) {
            KEPT.with(|k| *k.borrow_mut() = Some((w, inputs)));
        }
    });

    // Memos, so that typing in a limit re-judges without re-reading any file.
    let spec =
        Memo::new(move |_| spec_from_inputs(&quantity.get(), &spec_min.get(), &spec_max.get()));
    let report = Memo::new(move |_| {
        finished.track();
        let window = spec.get().ok().flatten();
        work.with_value(|w| w.report(window.as_ref()))
    });
    let filter = move || {
        let f = lot_filter.get();
        (!f.is_empty()).then_some(f)
    };
    let has_data = Memo::new(move |_| {
        progress.track();
        finished.track();
        work.with_value(|w| !w.files.is_empty())
    });
    let unit = move || {
        spec.with(|s| match s {
            Ok(Some(w)) if w.quantity() == SpecQuantity::Density => "cm^-3",
            _ => "ohm cm",
        })
    };

    let start = move |files: Vec<Source>| {
        if files.is_empty() || busy.get_untracked() {
            return;
        }
        let default = dopant.get_untracked();
        work.set_value(LotsWork::new((!default.is_empty()).then_some(default)));
        lot_filter.set(String::new());
        map_wafer.set(String::new());
        job_files.set(files.len());
        busy.set(true);
        read_sources(files, handles);
    };
    let load_demo = move |_| {
        if spec_min.get_untracked().is_empty() && spec_max.get_untracked().is_empty() {
            quantity.set("resistivity".to_owned());
            spec_min.set(DEMO_SPEC.0.to_owned());
            spec_max.set(DEMO_SPEC.1.to_owned());
        }
        start(
            DEMO_FILES
                .iter()
                .map(|(name, text)| Source::Text((*name).to_owned(), (*text).to_owned()))
                .collect(),
        );
    };
    let on_pick = move |ev: leptos::ev::Event| {
        let input = event_target::<web_sys::HtmlInputElement>(&ev);
        start(files_of(input.files()));
        input.set_value("");
    };
    let on_drop = move |ev: leptos::ev::DragEvent| {
        ev.prevent_default();
        dragging.set(false);
        start(files_of(ev.data_transfer().and_then(|d| d.files())));
    };
    let on_drag_over = move |ev: leptos::ev::DragEvent| {
        ev.prevent_default();
        dragging.set(true);
    };

    let status_line = move || {
        progress.track();
        finished.track();
        let (total, reading) = (job_files.get(), busy.get());
        work.with_value(|w| w.status_line(total, reading))
    };
    let progress_value = move || {
        progress.track();
        let total = job_files.get();
        work.with_value(|w| w.progress_fraction(total))
    };
    let messages = move || {
        finished.track();
        let mut out = work.with_value(|w| {
            w.files
                .iter()
                .filter_map(|f| w.file_problem(f))
                .chain(
                    w.files
                        .iter()
                        .flat_map(|f| f.notes.iter().map(move |n| format!("{}: {n}", f.name))),
                )
                .collect::<Vec<_>>()
        });
        out.extend(report.with(|r| r.notes.clone()));
        out
    };
    let lot_choices =
        move || report.with(|r| r.lots.iter().map(|l| l.lot.clone()).collect::<Vec<_>>());
    let chart = Signal::derive(move || {
        let window = spec.get().ok().flatten();
        report.with(|r| distribution_chart(r, window.as_ref(), filter().as_deref()))
    });
    // The lot chart in words, listed under it.
    let chart_lines = move || {
        let window = spec.get().ok().flatten();
        report.with(|r| distribution_lines(r, window.as_ref(), filter().as_deref()))
    };
    // Memos: the rows follow the report, the order follows the filter and sort too; a click
    // re-sorts indices and re-reads nothing.
    let wafer_table = Memo::new(move |_| report.with(|r| wafer_rows(r, filter().as_deref())));
    let wafer_order = Memo::new(move |_| {
        wafer_table.with(|rows| shown_order(rows, wafers_shown.get(), wafers_sort.get()))
    });
    let map_choices = move || {
        report.with(|r| {
            r.lots
                .iter()
                .filter(|l| filter().is_none_or(|f| f == l.lot))
                .flat_map(|l| {
                    l.wafer_results
                        .iter()
                        .filter(|w| w.sites_with_position > 0)
                        .map(move |w| format!("{}|{}", l.lot, w.wafer))
                })
                .collect::<Vec<_>>()
        })
    };
    // The wafer chosen, or the first one shown when the choice is gone (other lot, new files).
    let map_choice = Memo::new(move |_| {
        let choices = map_choices();
        let chosen = map_wafer.get();
        if choices.contains(&chosen) {
            Some(chosen)
        } else {
            choices.into_iter().next()
        }
    });
    let diameter_setting = Memo::new(move |_| map_diameter.with(|t| parse_diameter(t)));
    // The map, or why it cannot be drawn (no such quantity, sites beyond any standard wafer).
    let map_result = Memo::new(move |_| {
        finished.track();
        let window = spec.get().ok().flatten();
        let choice = map_choice.get()?;
        let (lot, wafer) = choice.split_once('|')?;
        let setting = diameter_setting.get().ok().flatten();
        let quantity = map_quantity.get();
        work.with_value(|w| wafer_map(&w.sites, lot, wafer, window.as_ref(), quantity, setting))
            .transpose()
    });
    let map = Signal::derive(move || map_result.get().and_then(Result::ok));
    let map_problem = move || map_result.get().and_then(Result::err);
    let radial = Signal::derive(move || {
        finished.track();
        let choice = map_choice.get()?;
        let (lot, wafer) = choice.split_once('|')?;
        let quantity = map_quantity.get();
        work.with_value(|w| radial_chart(&w.sites, lot, wafer, quantity))
    });
    let export_rows = move |_| {
        let window = spec.get_untracked().ok().flatten();
        let csv = work.with_value(|w| w.rows_csv(window.as_ref()));
        export_error.set(browser::download_text(&csv, "text/csv", "bandgauge-lot-rows.csv").err());
    };
    let export_summary = move |_| {
        let csv = report.with_untracked(summary_csv);
        export_error
            .set(browser::download_text(&csv, "text/csv", "bandgauge-lot-summary.csv").err());
    };
    let differences = move || report.with(|r| difference_rows(r, filter().as_deref()));
    let rejected_count = move || {
        progress.track();
        finished.track();
        work.with_value(|w| w.counts().rejected)
    };

    view! {
        <section class="view lots" aria-label="Wafer lots">
            <div class="inputs lots-inputs">
                <div
                    class="dropzone"
                    class:dragging=move || dragging.get()
                    data-testid="lots-drop"
                    on:dragover=on_drag_over
                    on:dragleave=move |_| dragging.set(false)
                    on:drop=on_drop
                >
                    <p class="drop-title">"Drop lot files here"</p>
                    <p class="hint">
                        "CSV or TSV with a header row: lot, wafer, site, x, y, dopant or type, and a "
                        "resistivity, a sheet resistance with thickness, or probe volts and amps."
                    </p>
                    <div class="drop-actions">
                        <label for="lots-files">"or pick files:"</label>
                        <input id="lots-files" data-testid="lots-files" type="file" multiple
                            accept=".csv,.tsv,.txt" on:change=on_pick prop:disabled=move || busy.get() />
                        <button type="button" class="demo" data-testid="lots-demo" on:click=load_demo
                            prop:disabled=move || busy.get()>
                            "Load the demo lots"
                        </button>
                    </div>
                </div>
                <div class="lots-settings">
                    <div class="field">
                        <label for="lots-dopant">"Dopant for rows without one"</label>
                        <select id="lots-dopant" data-testid="lots-dopant" prop:value=move || dopant.get()
                            on:change=move |ev| dopant.set(event_target_value(&ev))>
                            <option value="" selected=dopant.get_untracked().is_empty()>"none (files must say)"</option>
                            <option value="B">"B (p-type)"</option>
                            <option value="P">"P (n-type)"</option>
                            <option value="As">"As (n-type)"</option>
                            <option value="Sb">"Sb (n-type)"</option>
                        </select>
                        <span class="hint">"Applies to files read after a change."</span>
                    </div>
                    <div class="field">
                        <label for="lots-filter">"Lots shown"</label>
                        <select id="lots-filter" data-testid="lots-filter" on:change=move |ev| lot_filter.set(event_target_value(&ev))>
                            <option value="" selected=move || lot_filter.get().is_empty()>"all lots"</option>
                            {move || lot_choices().into_iter().map(|l| {
                                let selected = l == lot_filter.get();
                                view! { <option value=l.clone() selected=selected>{l.clone()}</option> }
                            }).collect_view()}
                        </select>
                    </div>
                </div>
                <fieldset class="spec-window">
                    <legend>"Spec window"</legend>
                    <div class="field">
                        <label for="lots-spec-quantity">"Limits on"</label>
                        <select id="lots-spec-quantity" data-testid="lots-spec-quantity"
                            prop:value=move || quantity.get() on:change=move |ev| quantity.set(event_target_value(&ev))>
                            <option value="resistivity">"resistivity, ohm cm"</option>
                            <option value="density">"dopant density, cm^-3"</option>
                        </select>
                    </div>
                    <div class="field" class:invalid=move || spec.with(Result::is_err)>
                        <label for="lots-spec-min">"Lower limit"</label>
                        <input type="text" id="lots-spec-min" data-testid="lots-spec-min" placeholder="none"
                            inputmode="decimal" autocomplete="off" spellcheck="false"
                            prop:value=move || spec_min.get() on:input=move |ev| spec_min.set(event_target_value(&ev)) />
                    </div>
                    <div class="field" class:invalid=move || spec.with(Result::is_err)>
                        <label for="lots-spec-max">"Upper limit"</label>
                        <input type="text" id="lots-spec-max" data-testid="lots-spec-max" placeholder="none"
                            inputmode="decimal" autocomplete="off" spellcheck="false"
                            prop:value=move || spec_max.get() on:input=move |ev| spec_max.set(event_target_value(&ev)) />
                    </div>
                    <p class="hint">"Numbers in the unit above, or with their own (800 mohm-cm). Leave one empty for a one-sided window."</p>
                    {move || spec.get().err().map(|e| view! { <p class="message" data-testid="lots-spec-error" role="alert">{e}</p> })}
                </fieldset>
            </div>
            <div class="lots-progress" role="status" aria-live="polite">
                <p class="status" data-testid="lots-status">{status_line}</p>
                <Show when=move || busy.get()>
                    <progress data-testid="lots-progress" max="1" prop:value=progress_value
                        aria-label="Reading progress"></progress>
                </Show>
            </div>
            <Show
                when=move || has_data.get()
                fallback=|| view! {
                    <p class="lots-empty" data-testid="lots-empty">
                        "Nothing read yet. Drop lot files above, pick them, or load the demo lots "
                        "(six invented lots from two weeks of a production line)."
                    </p>
                }
            >
                <ul class="messages" data-testid="lots-file-messages">
                    {move || messages().into_iter().map(|m| view! { <li>{m}</li> }).collect_view()}
                </ul>
                <div class="panel lots-panel">
                    <h2>"Lots"</h2>
                    <div class="table-scroll">
                        <table class="lots-summary" data-testid="lots-summary">
                            <thead><tr>
                                <th scope="col">"lot"</th><th scope="col" class="left">"dopant"</th>
                                <th scope="col">"wafers"</th><th scope="col">"sites"</th>
                                <th scope="col">"mean, ohm cm"</th><th scope="col">"median"</th>
                                <th scope="col">"std"</th><th scope="col" title="100 x standard deviation / mean of the sites">"std/mean, %"</th>
                                <th scope="col">"mean, cm^-3"</th><th scope="col" class="left">"verdict"</th>
                                <th scope="col">{move || format!("margin, {}", unit())}</th>
                                <th scope="col" class="left">"worst wafer"</th><th scope="col">"Cpk"</th>
                            </tr></thead>
                            <tbody>
                                {move || report.with(|r| r.lots.iter().filter(|l| filter().is_none_or(|f| f == l.lot)).map(|l| {
                                    let verdict = l.verdict.map(|v| v.as_str()).unwrap_or("");
                                    view! {
                                        <tr data-testid=format!("lot-{}", l.lot)>
                                            <th scope="row">{l.lot.clone()}</th>
                                            <td class="left">{format!("{} ({})", l.dopant, l.conductivity_type.as_str())}</td>
                                            <td>{l.wafers}</td>
                                            <td>{l.sites}</td>
                                            <td>{format::auto(l.resistivity_ohm_cm.mean)}</td>
                                            <td>{format::auto(l.resistivity_ohm_cm.median)}</td>
                                            <td>{l.resistivity_ohm_cm.std.map(format::auto).unwrap_or_default()}</td>
                                            <td>{l.resistivity_ohm_cm.nonuniformity_percent.map(|p| format::fixed(p, 2)).unwrap_or_default()}</td>
                                            <td>{format::sci(l.density_cm3.mean)}</td>
                                            <td class=format!("left verdict {verdict}") data-testid=format!("verdict-{}", l.lot)>{verdict}</td>
                                            <td>{l.margin.map(format::auto).unwrap_or_default()}</td>
                                            <td class="left">{l.worst_wafer.clone().unwrap_or_default()}</td>
                                            <td>{l.cpk.map(|c| format::fixed(c, 2)).unwrap_or_default()}</td>
                                        </tr>
                                    }
                                }).collect_view())}
                            </tbody>
                        </table>
                    </div>
                    {move || spec.with(|s| matches!(s, Ok(None))).then(|| view! {
                        <p class="hint" data-testid="lots-no-window">
                            "No spec window given, so no verdicts, margins or Cpk: give a lower or upper limit above."
                        </p>
                    })}
                    <p class="model hint" data-testid="lots-model">
                        {move || report.with(|r| format!("Conversion: {} ({})", r.model, r.model_reference))}
                    </p>
                    <h3>"Do the lots differ?"</h3>
                    {move || {
                        let rows = differences();
                        if rows.is_empty() {
                            view! {
                                <p class="hint" data-testid="lots-differences">
                                    "Two or more lots with two or more wafers each are needed for a test."
                                </p>
                            }.into_any()
                        } else {
                            view! {
                                <table class="models-table differences" data-testid="lots-differences">
                                    <thead><tr>
                                        <th scope="col">"Lots"</th>
                                        <th scope="col">"Density difference"</th>
                                        <th scope="col">"95 % CI"</th>
                                        <th scope="col">"p (raw)"</th>
                                        <th scope="col">"p (Holm-adjusted)"</th>
                                        <th scope="col" class="left">"Result"</th>
                                    </tr></thead>
                                    <tbody>
                                        {rows.into_iter().enumerate().map(|(i, d)| view! {
                                            <tr data-testid=format!("lots-difference-{i}")>
                                                <th scope="row">{d.lots.clone()}<br /><span class="note">{d.test}</span></th>
                                                <td>{d.percent.map(|p| format!("{p:+.1} %")).unwrap_or_default()}</td>
                                                <td>{d.percent_ci95.map(|c| format!("{:+.1} to {:+.1} %", c[0], c[1])).unwrap_or_default()}</td>
                                                <td data-testid=format!("lots-difference-{i}-p")>{format::auto(d.p_raw)}</td>
                                                <td data-testid=format!("lots-difference-{i}-p-adjusted")>
                                                    {d.p_adjusted.map(format::auto).unwrap_or_else(|| "— (one test)".into())}
                                                </td>
                                                <td class="note" data-testid=format!("lots-difference-{i}-verdict")>{d.verdict()}</td>
                                            </tr>
                                        }).collect_view()}
                                    </tbody>
                                    <caption class="note" data-testid="lots-differences-method">{HOLM_ADJUSTMENT}</caption>
                                </table>
                            }.into_any()
                        }
                    }}
                    <Caution models=Signal::derive(move || report.with(models_used)) />
                </div>
                <div class="lots-charts">
                    <div class="lots-distribution">
                        <ChartPanel id="lots-chart" spec=chart layout=bench.layout input_at=bench.input_at />
                        <details class="chart-values" data-testid="lots-chart-values">
                            <summary>"The lot chart in words"</summary>
                            <ul>
                                {move || chart_lines().into_iter().map(|l| view! { <li>{l}</li> }).collect_view()}
                            </ul>
                        </details>
                    </div>
                    <div class="lots-map">
                        <div class="map-controls">
                            <div class="field">
                                <label for="lots-map-wafer">"Wafer map"</label>
                                <select id="lots-map-wafer" data-testid="lots-map-wafer"
                                    prop:value=move || map_choice.get().unwrap_or_default()
                                    on:change=move |ev| map_wafer.set(event_target_value(&ev))>
                                    {move || {
                                        let current = map_choice.get().unwrap_or_default();
                                        map_choices().into_iter().map(|c| {
                                            let text = c.replacen('|', ", wafer ", 1);
                                            let selected = c == current;
                                            view! { <option value=c selected=selected>{text}</option> }
                                        }).collect_view()
                                    }}
                                </select>
                            </div>
                            <div class="field">
                                <label for="lots-map-quantity">"Colour by"</label>
                                <select id="lots-map-quantity" data-testid="lots-map-quantity"
                                    on:change=move |ev| map_quantity.set(MapQuantity::from_id(&event_target_value(&ev)))>
                                    {MapQuantity::ALL.into_iter().map(|q| view! {
                                        <option value=q.id() selected=move || map_quantity.get() == q>{format!("{}, {}", q.name(), q.unit())}</option>
                                    }).collect_view()}
                                </select>
                            </div>
                            <div class="field">
                                <label for="lots-map-diameter">"Wafer diameter, mm"</label>
                                <input id="lots-map-diameter" data-testid="lots-map-diameter" type="text"
                                    inputmode="decimal" placeholder="from the file"
                                    prop:value=move || map_diameter.get()
                                    on:input=move |ev| map_diameter.set(event_target_value(&ev))
                                    aria-describedby="lots-map-diameter-error" />
                                <span class="message" id="lots-map-diameter-error" data-testid="lots-map-diameter-error" role="alert">
                                    {move || diameter_setting.get().err()}
                                </span>
                            </div>
                        </div>
                        <p class="hint">"Hover over a site, or move to it with Tab, for its value; the sites are also listed as a table under the map."</p>
                        {move || map_choices().is_empty().then(|| view! {
                            <p class="hint" data-testid="lots-map-none">"No site positions (x, y) in these files."</p>
                        })}
                        {move || map_problem().map(|p| view! { <p class="message" data-testid="lots-map-problem">{p}</p> })}
                        // Nothing stale: without a map (no such quantity) neither picture shows.
                        <Show when=move || map.with(Option::is_some)>
                            <MapPanel spec=map layout=bench.layout input_at=bench.input_at />
                        </Show>
                        <Show when=move || radial.with(Option::is_some)>
                            <ChartPanel id="lots-radial" spec=radial layout=bench.layout input_at=bench.input_at />
                        </Show>
                    </div>
                </div>
                <div class="panel lots-panel">
                    <h2>"Wafers"</h2>
                    <div class="wafer-table-controls">
                        <label for="lots-wafers-show">"Show"</label>
                        <select id="lots-wafers-show" data-testid="wafers-show"
                            on:change=move |ev| wafers_shown.set(WaferFilter::from_id(&event_target_value(&ev)))>
                            {WaferFilter::ALL.into_iter().map(|f| view! {
                                <option value=f.id() selected=move || wafers_shown.get() == f>{f.text()}</option>
                            }).collect_view()}
                        </select>
                        <span class="hint" data-testid="wafers-count" role="status" aria-live="polite">
                            {move || format!("showing {} of {} wafers", wafer_order.with(Vec::len), wafer_table.with(Vec::len))}
                        </span>
                        <span class="hint">"Sort by any column: click its name; again to reverse."</span>
                    </div>
                    <div class="table-scroll tall">
                        <table class="lots-wafers" data-testid="lots-wafers">
                            <thead><tr>
                                {WaferColumn::ALL.into_iter().map(|c| {
                                    let heading = move || match c {
                                        WaferColumn::Lot => "lot".to_owned(),
                                        WaferColumn::Wafer => "wafer".to_owned(),
                                        WaferColumn::Sites => "sites".to_owned(),
                                        WaferColumn::MeanResistivity => "mean, ohm cm".to_owned(),
                                        WaferColumn::Nonuniformity => "std/mean, %".to_owned(),
                                        WaferColumn::MeanDensity => "mean, cm^-3".to_owned(),
                                        WaferColumn::Verdict => "verdict".to_owned(),
                                        WaferColumn::Margin => format!("margin, {}", unit()),
                                        WaferColumn::SitesOutside => "sites outside".to_owned(),
                                    };
                                    view! {
                                        <th scope="col" class:left=c.is_text()
                                            aria-sort=move || WaferSort::aria(wafers_sort.get(), c)>
                                            <button type="button" class="sort" data-testid=format!("wafers-sort-{}", c.id())
                                                on:click=move |_| wafers_sort.update(|s| *s = Some(WaferSort::clicked(*s, c)))>
                                                {heading}
                                                <span class="sort-sign" aria-hidden="true">
                                                    {move || match WaferSort::aria(wafers_sort.get(), c) {
                                                        "ascending" => " \u{25b2}",
                                                        "descending" => " \u{25bc}",
                                                        _ => "",
                                                    }}
                                                </span>
                                            </button>
                                        </th>
                                    }
                                }).collect_view()}
                            </tr></thead>
                            <tbody>
                                {move || wafer_table.with(|rows| wafer_order.get().into_iter().map(|i| wafer_row(&rows[i])).collect_view())}
                            </tbody>
                        </table>
                    </div>
                </div>
                <div class="panel lots-panel">
                    <h2>{move || format!("Rejected rows ({})", rejected_count())}</h2>
                    {move || (rejected_count() == 0).then(|| view! { <p>"None: every row read was converted."</p> })}
                    {move || {
                        let shown = work.with_value(|w| w.rejected.len() as u64);
                        (rejected_count() > shown).then(|| view! {
                            <p class="hint">{format!("The first {shown} are listed; all are counted.")}</p>
                        })
                    }}
                    <ul class="rejected" data-testid="lots-rejected">
                        {move || {
                            finished.track();
                            progress.track();
                            work.with_value(|w| w.rejected.iter().map(|r| {
                                let place = format!("{}, line {}", r.file, r.line);
                                let reason = if r.column.is_empty() {
                                    format!(": {}", r.reason)
                                } else {
                                    format!(": {}: {}", r.column, r.reason)
                                };
                                view! { <li data-testid=format!("rejected-line-{}", r.line)><strong>{place}</strong>{reason}</li> }
                            }).collect_view())
                        }}
                    </ul>
                </div>
                <div class="panel lots-panel exports">
                    <button type="button" data-testid="lots-export-rows" on:click=export_rows>"Converted rows as CSV"</button>
                    <button type="button" data-testid="lots-export-summary" on:click=export_summary>"Summary as CSV"</button>
                    {move || export_error.get().map(|e| view! { <span class="message">{e}</span> })}
                    <details class="definitions">
                        <summary>"How the figures are defined"</summary>
                        <ul>
                            {move || report.with(|r| {
                                let d = r.definitions;
                                [d.nonuniformity, d.std, d.median, d.wafer_verdict, d.lot_verdict, d.uncertainty, d.cpk, d.lot_difference]
                                    .into_iter()
                                    .map(|t| view! { <li>{t}</li> })
                                    .collect_view()
                            })}
                            {map_definitions().into_iter().map(|(term, text)| view! {
                                <li data-testid="lots-map-definition">{format!("{term}: {text}")}</li>
                            }).collect_view()}
                        </ul>
                    </details>
                </div>
            </Show>
        </section>
    }
}

/// One row of the wafer table.
fn wafer_row(w: &WaferRow) -> impl IntoView + use<> {
    let verdict = w.verdict.map(|v| v.as_str()).unwrap_or("");
    view! {
        <tr data-testid=format!("wafer-{}-{}", w.lot, w.wafer)>
            <th scope="row" class="left">{w.lot.clone()}</th><td class="left">{w.wafer.clone()}</td><td>{w.sites}</td>
            <td>{format::auto(w.mean_ohm_cm)}</td>
            <td>{w.nonuniformity_percent.map(|p| format::fixed(p, 2)).unwrap_or_default()}</td>
            <td>{format::sci(w.mean_cm3)}</td>
            <td class=format!("left verdict {verdict}")>{verdict}</td>
            <td>{w.margin.map(format::auto).unwrap_or_default()}</td>
            <td>{w.sites_outside.map(|s| s.to_string()).unwrap_or_default()}</td>
        </tr>
    }
}
