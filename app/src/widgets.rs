//! Building blocks shared by the views: a labelled number field that explains what is
//! wrong in place, a result line, a chart panel with PNG and CSV export, and the caution
//! about model estimates.

use crate::browser;
use crate::chart::{self, ChartSpec};
use leptos::html;
use leptos::prelude::*;

/// A labelled text field for a number as engineers type it. The raw text is bound to
/// `value`; the parsed number lives elsewhere (in a memo), and `error` is that parse's
/// complaint. An invalid field is marked with `aria-invalid` and its message.
#[component]
pub fn NumberField(
    /// Element id and `data-testid`; the message gets `<id>-error`.
    #[prop(into)]
    id: String,
    /// The label (visible unless `hide_label`).
    label: &'static str,
    /// Units accepted, shown under the field.
    #[prop(optional)]
    hint: &'static str,
    /// Keep the label for assistive technology only (rows under a shared column heading).
    #[prop(optional)]
    hide_label: bool,
    /// Row number, added to a hidden label ("Density, row 2").
    #[prop(optional)]
    row: Option<usize>,
    /// The text as typed.
    value: Memo<String>,
    /// Receives the text on every keystroke.
    on_input: Callback<String>,
    /// Why the text cannot be used, if it cannot.
    error: Signal<Option<String>>,
) -> impl IntoView {
    let message_id = format!("{id}-error");
    let hint_id = format!("{id}-hint");
    let described_by = if hint.is_empty() {
        message_id.clone()
    } else {
        format!("{hint_id} {message_id}")
    };
    let label_text = row_label(label, row);
    view! {
        <div class="field" class:invalid=move || error.with(Option::is_some)>
            <label for=id.clone() class:sr-only=hide_label>{label_text}</label>
            <input
                id=id.clone()
                data-testid=id
                type="text"
                inputmode="decimal"
                autocomplete="off"
                spellcheck="false"
                aria-invalid=move || if error.with(Option::is_some) { "true" } else { "false" }
                aria-describedby=described_by
                prop:value=move || value.get()
                on:input=move |ev| on_input.run(event_target_value(&ev))
            />
            {(!hint.is_empty()).then(|| view! { <span class="hint" id=hint_id>{hint}</span> })}
            <span class="message" id=message_id.clone() data-testid=message_id aria-live="polite">
                {move || error.get().unwrap_or_default()}
            </span>
        </div>
    }
}

/// A field label, with its row number when the field belongs to a numbered row.
fn row_label(label: &str, row: Option<usize>) -> String {
    row.map(|r| format!("{label}, row {r}"))
        .unwrap_or_else(|| label.to_string())
}

/// One `<option>` of a select: value and visible text.
pub type Choice = (String, String);

/// A labelled drop-down list.
#[component]
pub fn SelectField(
    /// Element id and `data-testid`.
    #[prop(into)]
    id: String,
    /// The label (visible unless `hide_label`).
    label: &'static str,
    /// Keep the label for assistive technology only.
    #[prop(optional)]
    hide_label: bool,
    /// Row number, added to a hidden label.
    #[prop(optional)]
    row: Option<usize>,
    /// The selectable values with their visible text.
    choices: Signal<Vec<Choice>>,
    /// The selected value.
    value: Memo<String>,
    /// Receives the new value.
    on_change: Callback<String>,
    /// Why the value cannot be used, if it cannot.
    #[prop(optional, into)]
    error: Option<Signal<Option<String>>>,
) -> impl IntoView {
    let error = error.unwrap_or_else(|| Signal::derive(|| None));
    let message_id = format!("{id}-error");
    let label_text = row_label(label, row);
    view! {
        <div class="field" class:invalid=move || error.with(Option::is_some)>
            <label for=id.clone() class:sr-only=hide_label>{label_text}</label>
            <select
                id=id.clone()
                data-testid=id
                aria-describedby=message_id.clone()
                aria-invalid=move || if error.with(Option::is_some) { "true" } else { "false" }
                on:change=move |ev| on_change.run(event_target_value(&ev))
                prop:value=move || value.get()
            >
                {move || {
                    let selected = value.get();
                    choices
                        .get()
                        .into_iter()
                        .map(|(v, text)| {
                            let is_selected = v == selected;
                            view! { <option value=v selected=is_selected>{text}</option> }
                        })
                        .collect_view()
                }}
            </select>
            <span class="message" id=message_id.clone() data-testid=message_id aria-live="polite">
                {move || error.get().unwrap_or_default()}
            </span>
        </div>
    }
}

/// One line of a result list: a term, its value (with `data-testid`) and its unit.
#[component]
pub fn ResultLine(
    /// `data-testid` of the value.
    id: &'static str,
    /// The quantity's name, with its symbol.
    term: &'static str,
    /// The formatted value.
    value: Signal<String>,
    /// The unit shown after the value.
    #[prop(optional)]
    unit: &'static str,
) -> impl IntoView {
    view! {
        <div class="result">
            <dt>{term}</dt>
            <dd>
                <span class="value" data-testid=id>{move || value.get()}</span>
                {(!unit.is_empty()).then(|| view! { <span class="unit">{unit}</span> })}
            </dd>
        </div>
    }
}

/// A chart on a `<canvas>`, redrawn whenever `spec` or the layout changes, with buttons
/// to save it as PNG and its data as CSV.
#[component]
pub fn ChartPanel(
    /// `data-testid` of the canvas; the buttons get `<id>-png` and `<id>-csv`.
    id: &'static str,
    /// What to draw; `None` while nothing valid has been computed.
    spec: Signal<Option<ChartSpec>>,
    /// Any change of this value forces a redraw (window resize).
    layout: ReadSignal<u32>,
    /// Time at which the input that caused this redraw arrived (ms since page load).
    input_at: ReadSignal<f64>,
) -> impl IntoView {
    let canvas = NodeRef::<html::Canvas>::new();
    let failure = RwSignal::new(None::<String>);
    // The only place a chart touches the DOM: redraw after every change of what it shows.
    Effect::new(move |_| {
        layout.track();
        let Some(element) = canvas.get() else { return };
        let Some(spec) = spec.get() else { return };
        let result = browser::draw_chart(&element, &spec);
        browser::publish_redraw_ms(browser::now_ms() - input_at.get_untracked());
        failure.set(result.err());
    });
    let save_png = move |_| {
        if let (Some(element), Some(spec)) = (canvas.get_untracked(), spec.get_untracked()) {
            failure.set(browser::download_png(&element, &spec.file_stem).err());
        }
    };
    let save_csv = move |_| {
        if let Some(spec) = spec.get_untracked() {
            let csv = chart::to_csv(&spec);
            failure.set(
                browser::download_text(&csv, "text/csv", &format!("{}.csv", spec.file_stem)).err(),
            );
        }
    };
    let title = move || spec.with(|s| s.as_ref().map(|s| s.title.clone()).unwrap_or_default());
    // A chart of many categories keeps its least width per category; its box then scrolls
    // sideways, and the PNG is the whole canvas.
    let min_width = move || {
        spec.with(|s| s.as_ref().and_then(ChartSpec::min_width_css))
            .map(|w| format!("{w}px"))
    };
    view! {
        <figure class="chart">
            <div class="chart-scroll" data-testid=format!("{id}-scroll")>
                <canvas node_ref=canvas data-testid=id role="img" aria-label=title
                    style:min-width=min_width></canvas>
            </div>
            <figcaption>
                <button type="button" data-testid=format!("{id}-png") on:click=save_png
                    aria-label=move || format!("Save chart '{}' as PNG image", title())>"PNG"</button>
                <button type="button" data-testid=format!("{id}-csv") on:click=save_csv
                    aria-label=move || format!("Save the data of chart '{}' as CSV", title())>"CSV"</button>
                {move || failure.get().map(|f| view! { <span class="message">{f}</span> })}
            </figcaption>
        </figure>
    }
}

/// The caution beside every result: these are model estimates; which models and sources
/// produced them; the fab's specifications and the governing standards decide.
#[component]
pub fn Caution(
    /// `(quantity, model, source)` for each model actually used.
    models: Signal<Vec<(String, String, String)>>,
) -> impl IntoView {
    view! {
        <aside class="caution" data-testid="caution" aria-label="About these values">
            <p>
                <strong>"Model estimates. "</strong>
                "These values come from published models, not from a measurement of your wafer. "
                "Your fab's own specifications and the governing standards decide acceptance."
            </p>
            <ul class="models" data-testid="models-used">
                {move || {
                    models
                        .get()
                        .into_iter()
                        .map(|(quantity, model, source)| {
                            view! {
                                <li>
                                    <span class="quantity">{quantity}</span>": "{model}
                                    {(!source.is_empty()).then(|| view! { <span class="source">" (" {source} ")"</span> })}
                                </li>
                            }
                        })
                        .collect_view()
                }}
            </ul>
        </aside>
    }
}
