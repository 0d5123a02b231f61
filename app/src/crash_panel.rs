//! The page's last resort after a panic: a panel built with plain DOM calls (Leptos may be
//! unusable once the WebAssembly has stopped) that says what happened in plain words and
//! offers a reload or a fresh start with default inputs.
//!
//! The release build aborts on panic, so nothing in the app runs after this hook; the
//! panel's two buttons only touch storage and the address, which works on a stopped app.

use crate::browser;
use wasm_bindgen::JsCast;
use wasm_bindgen::prelude::Closure;
use web_sys::{Document, Element};

/// Query key that makes the app panic on purpose right after it has mounted
/// (`?panic-drill`), so the panel can be seen and tested. It does no harm: it shows the
/// panel, and its "Start over" clears what a user would clear anyway.
pub const DRILL_KEY: &str = "panic-drill";

/// Id of the panel element (one panel per page, for the first panic).
const PANEL_ID: &str = "crash-panel";

/// What the panel says.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PanelText {
    /// The heading.
    pub title: &'static str,
    /// What happened and what is safe, in plain words.
    pub explanation: &'static str,
    /// What each button does.
    pub choices: &'static str,
    /// The panic message with its source location, for a bug report.
    pub detail: String,
}

/// The words of the panel for a panic described by `panic_report` (the hook's Display text).
pub fn panel_text(panic_report: &str) -> PanelText {
    PanelText {
        title: "bandgauge stopped working",
        explanation: "An internal error stopped the calculations on this page, so the numbers \
                      on screen may be out of date. Nothing you typed has left this browser.",
        choices: "Reload opens the page again with the same inputs. If the error comes back, \
                  Start over: it forgets the inputs this browser keeps for bandgauge and opens \
                  the page with default inputs.",
        detail: panic_report.trim().to_string(),
    }
}

/// Whether the query string (without `?`) asks for the panic drill: `panic-drill` as a key,
/// with or without a value.
pub fn drill_requested(query: &str) -> bool {
    query
        .trim_start_matches('?')
        .split('&')
        .any(|pair| pair.split('=').next() == Some(DRILL_KEY))
}

/// Replaces the panic hook: the console message stays (as `console_error_panic_hook` writes
/// it), then the panel appears.
pub fn install() {
    std::panic::set_hook(Box::new(|info| {
        console_error_panic_hook::hook(info);
        show(&panel_text(&info.to_string()));
    }));
}

/// Shows the panel for the first panic of the page; later panics only reach the console.
fn show(text: &PanelText) {
    let Some(document) = web_sys::window().and_then(|w| w.document()) else {
        return;
    };
    if document.get_element_by_id(PANEL_ID).is_some() {
        return;
    }
    // A failure to build the panel leaves the console message, the best there is then.
    let _ = build(&document, text);
}

fn build(document: &Document, text: &PanelText) -> Result<(), wasm_bindgen::JsValue> {
    let panel = document.create_element("div")?;
    panel.set_id(PANEL_ID);
    panel.set_class_name("crash-panel");
    for (name, value) in [
        ("role", "alertdialog"),
        ("aria-modal", "true"),
        ("aria-labelledby", "crash-title"),
        ("aria-describedby", "crash-what"),
        ("data-testid", "crash-panel"),
    ] {
        panel.set_attribute(name, value)?;
    }
    let card = append(document, &panel, "div", "crash-card", None)?;
    append(document, &card, "h2", "", Some(text.title))?.set_id("crash-title");
    append(document, &card, "p", "", Some(text.explanation))?.set_id("crash-what");
    append(document, &card, "p", "", Some(text.choices))?;
    let actions = append(document, &card, "div", "crash-actions", None)?;
    let reload = button(
        document,
        &actions,
        "Reload",
        "crash-reload",
        browser::reload,
    )?;
    button(
        document,
        &actions,
        "Start over with default inputs",
        "crash-reset",
        || {
            browser::forget_saved();
            browser::open_without_inputs();
        },
    )?;
    let details = append(document, &card, "details", "", None)?;
    append(
        document,
        &details,
        "summary",
        "",
        Some("Details for a bug report"),
    )?;
    append(document, &details, "pre", "", Some(&text.detail))?;
    let host: Element = match document.body() {
        Some(body) => body.into(),
        None => document
            .document_element()
            .ok_or_else(|| wasm_bindgen::JsValue::from_str("no document element"))?,
    };
    host.append_child(&panel)?;
    if let Ok(reload) = reload.dyn_into::<web_sys::HtmlElement>() {
        let _ = reload.focus();
    }
    Ok(())
}

/// Appends a `<tag class=class>` with optional text to `parent` and returns it.
fn append(
    document: &Document,
    parent: &Element,
    tag: &str,
    class: &str,
    text: Option<&str>,
) -> Result<Element, wasm_bindgen::JsValue> {
    let element = document.create_element(tag)?;
    if !class.is_empty() {
        element.set_class_name(class);
    }
    if text.is_some() {
        element.set_text_content(text);
    }
    parent.append_child(&element)?;
    Ok(element)
}

/// Appends a button that runs `action` when clicked.
fn button(
    document: &Document,
    parent: &Element,
    label: &str,
    test_id: &str,
    action: impl Fn() + 'static,
) -> Result<Element, wasm_bindgen::JsValue> {
    let element = append(document, parent, "button", "", Some(label))?;
    element.set_attribute("type", "button")?;
    element.set_attribute("data-testid", test_id)?;
    let on_click = Closure::<dyn Fn()>::new(action);
    element.add_event_listener_with_callback("click", on_click.as_ref().unchecked_ref())?;
    // The page ends with a reload; the listener lives as long as the page.
    on_click.forget();
    Ok(element)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn drill_key_is_found_with_or_without_a_value_and_nowhere_else() {
        assert!(drill_requested("panic-drill"));
        assert!(drill_requested("?panic-drill=1"));
        assert!(drill_requested("view=sweep&panic-drill"));
        assert!(!drill_requested(""));
        assert!(!drill_requested("view=sweep"));
        assert!(!drill_requested("no-panic-drill=1"));
        assert!(!drill_requested("lot=panic-drill"));
    }

    #[test]
    fn panel_says_what_happened_and_keeps_the_report() {
        let text = panel_text("panicked at app/src/x.rs:1:2:\nboom\n");
        assert_eq!(text.detail, "panicked at app/src/x.rs:1:2:\nboom");
        assert!(
            text.explanation
                .contains("Nothing you typed has left this browser")
        );
        assert!(text.choices.contains("Reload") && text.choices.contains("Start over"));
    }
}
