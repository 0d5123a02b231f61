//! bandgauge-app: the browser workbench. Views only; every number comes from `bandgauge-core`.

use leptos::prelude::*;

/// Parses a temperature as typed by an engineer: `300`, `300 K`, `27 C`.
fn parse_temperature_k(text: &str) -> Result<f64, String> {
    let t = text.trim();
    let (num, celsius) = if let Some(n) = t.strip_suffix(['C', 'c']) {
        (n.trim(), true)
    } else if let Some(n) = t.strip_suffix(['K', 'k']) {
        (n.trim(), false)
    } else {
        (t, false)
    };
    let v: f64 = num.parse().map_err(|_| format!("temperature: '{text}' is not a number"))?;
    let k = if celsius { v + 273.15 } else { v };
    if !(k.is_finite() && k > 0.0) {
        return Err(format!("temperature: {k} K is not allowed; give T > 0 K"));
    }
    Ok(k)
}

/// The root view.
#[component]
pub fn App() -> impl IntoView {
    let (text, set_text) = signal(String::from("300"));
    // Derived with a memo: parsing is cheap but several views read it.
    let parsed = Memo::new(move |_| parse_temperature_k(&text.get()));
    let silicon = bandgauge_core::materials::silicon();
    let ni = move || parsed.get().map(|t| silicon.intrinsic_density_cm3(t));
    view! {
        <main>
            <h1>"bandgauge"</h1>
            <label for="temperature">"Temperature (K or C)"</label>
            <input id="temperature" data-testid="temperature" prop:value=move || text.get()
                on:input=move |ev| set_text.set(event_target_value(&ev)) />
            <p data-testid="ni">{move || match ni() {
                Ok(v) => format!("{v:.4e}"),
                Err(e) => e,
            }}</p>
        </main>
    }
}
