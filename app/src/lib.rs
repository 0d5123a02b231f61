//! bandgauge-app: the browser workbench. Views only; every physical number comes from
//! `bandgauge-core`.
//!
//! Layout: `state` holds the inputs as typed (plain structs, URL and storage encodings);
//! `entry` reads number fields; `chart` describes and draws charts; `browser` is the
//! only module that talks to the page (besides `crash_panel`, the plain-DOM error panel
//! shown after a panic); `widgets` are shared components; one module per view:
//! `carriers`, `sweep`, `resistivity`.

pub mod browser;
pub mod carriers;
pub mod chart;
pub mod colormap;
pub mod crash_panel;
pub mod entry;
pub mod format;
pub mod hall_view;
pub mod lots_view;
pub mod record;
pub mod report;
pub mod resistivity;
pub mod state;
pub mod sweep;
pub mod wafer_map;
pub mod widgets;

use leptos::prelude::*;
use state::{View, Workbench};

/// The shared handles every view works with.
#[derive(Clone, Copy)]
pub struct Bench {
    /// All inputs, as typed.
    pub inputs: RwSignal<Workbench>,
    /// Bumped on window resize, so charts redraw at their new size.
    pub layout: ReadSignal<u32>,
    /// When the latest input arrived (ms since page load), for the redraw timing.
    pub input_at: ReadSignal<f64>,
    set_input_at: WriteSignal<f64>,
}

impl Bench {
    /// Changes the inputs, recording when the change arrived.
    pub fn edit(&self, change: impl FnOnce(&mut Workbench)) {
        self.set_input_at.set(browser::now_ms());
        self.inputs.update(change);
    }

    /// A text input's value and its setter, for the field picked by `get` and `set`.
    pub fn text(
        &self,
        get: fn(&Workbench) -> &String,
        set: fn(&mut Workbench) -> &mut String,
    ) -> (Memo<String>, Callback<String>) {
        let inputs = self.inputs;
        let bench = *self;
        // A memo, so a keystroke in one field does not re-render every other field.
        let value = Memo::new(move |_| inputs.with(|w| get(w).clone()));
        let on_input = Callback::new(move |text: String| bench.edit(|w| *set(w) = text));
        (value, on_input)
    }
}

/// The root view: header, view tabs, notices and the active view.
#[component]
pub fn App() -> impl IntoView {
    let saved = browser::load_saved();
    let (initial, first_notices) = state::initial(&browser::query(), saved.as_deref());
    let inputs = RwSignal::new(initial);
    let notices = RwSignal::new(first_notices);
    let (layout, set_layout) = signal(0u32);
    let (input_at, set_input_at) = signal(0.0f64);
    let bench = Bench {
        inputs,
        layout,
        input_at,
        set_input_at,
    };

    // Charts size themselves to their box; a resize must redraw them.
    let resize = window_event_listener(leptos::ev::resize, move |_| {
        set_layout.update(|n| *n = n.wrapping_add(1))
    });
    on_cleanup(move || resize.remove());

    // The one effect that syncs storage: the address bar and the saved inputs follow
    // every change, so a copied link or a reload reproduces the calculation. Defaults are
    // not worth keeping: then nothing is stored, which is also what "forget" leaves behind.
    Effect::new(move |_| {
        let w = inputs.get();
        browser::replace_query(&state::to_query(&w));
        if w == Workbench::default() {
            browser::forget_saved();
        } else {
            browser::save(&state::to_saved_json(&w));
        }
    });
    // Privacy in one step: the stored inputs go, every field returns to its default, and a
    // notice says what was done (and what never was stored).
    let forget = move |_| {
        browser::forget_saved();
        bench.edit(|w| *w = Workbench::default());
        notices.set(vec![FORGOTTEN.to_string()]);
    };

    let report_open: report::OpenReport = RwSignal::new(None);
    let current = Memo::new(move |_| inputs.with(|w| w.view));
    let select = move |view: View| bench.edit(|w| w.view = view);
    // Arrow keys move between tabs, as in any tab strip.
    let on_tab_key = move |ev: leptos::ev::KeyboardEvent| {
        let all = View::ALL;
        let at = all
            .iter()
            .position(|v| *v == current.get_untracked())
            .unwrap_or(0);
        let next = match ev.key().as_str() {
            "ArrowRight" => all[(at + 1) % all.len()],
            "ArrowLeft" => all[(at + all.len() - 1) % all.len()],
            "Home" => all[0],
            "End" => all[all.len() - 1],
            _ => return,
        };
        ev.prevent_default();
        select(next);
        focus_tab(next);
    };

    view! {
        <header class="top">
            <div class="brand">
                <span class="name">"bandgauge"</span>
                <span class="tagline">"carriers, Fermi level and resistivity from published models"</span>
                <button
                    type="button"
                    class="forget"
                    data-testid="forget-saved"
                    title="Inputs are kept only in this browser, so that a reload keeps them. This removes them and resets every field."
                    on:click=forget
                >
                    "Forget saved inputs"
                </button>
                <report::RecordTools bench=bench notices=notices open=report_open />
            </div>
            <nav class="tabs" role="tablist" aria-label="Views" on:keydown=on_tab_key>
                {View::ALL
                    .into_iter()
                    .map(|v| {
                        let selected = move || current.get() == v;
                        view! {
                            <button
                                type="button"
                                role="tab"
                                id=format!("tab-{}", v.key())
                                data-testid=format!("tab-{}", v.key())
                                aria-controls="view-panel"
                                aria-selected=move || if selected() { "true" } else { "false" }
                                tabindex=move || if selected() { "0" } else { "-1" }
                                class:active=selected
                                on:click=move |_| select(v)
                            >
                                {v.title()}
                            </button>
                        }
                    })
                    .collect_view()}
            </nav>
        </header>
        <Notices notices=notices />
        <main id="view-panel" role="tabpanel" aria-labelledby=move || format!("tab-{}", current.get().key())>
            {move || match current.get() {
                View::Carriers => view! { <carriers::CarriersView bench=bench /> }.into_any(),
                View::Sweep => view! { <sweep::SweepView bench=bench /> }.into_any(),
                View::Resistivity => view! { <resistivity::ResistivityView bench=bench /> }.into_any(),
                View::Lots => view! { <lots_view::LotsView bench=bench /> }.into_any(),
                View::Hall => view! { <hall_view::HallView bench=bench /> }.into_any(),
            }}
        </main>
        <report::ReportOverlay open=report_open />
    }
}

/// What the "Forget saved inputs" control did, in the notice it leaves.
const FORGOTTEN: &str = "Saved inputs forgotten: this browser no longer keeps any bandgauge \
    inputs, and every field is back to its default. Lot files are never stored; the offline \
    copy of the app holds only the app's own files.";

fn focus_tab(view: View) {
    let element = web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| d.get_element_by_id(&format!("tab-{}", view.key())));
    if let Some(el) =
        element.and_then(|e| wasm_bindgen::JsCast::dyn_into::<web_sys::HtmlElement>(e).ok())
    {
        let _ = el.focus();
    }
}

/// Notices about the page itself (a saved state that could not be read, a link with an
/// unknown value), each dismissable.
#[component]
fn Notices(notices: RwSignal<Vec<String>>) -> impl IntoView {
    view! {
        <Show when=move || notices.with(|n| !n.is_empty())>
            <div class="notices" role="status" data-testid="notices">
                <ul>
                    {move || notices.get().into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}
                </ul>
                <button type="button" data-testid="notices-dismiss" on:click=move |_| notices.set(Vec::new())>
                    "Dismiss"
                </button>
            </div>
        </Show>
    }
}
