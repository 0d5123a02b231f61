//! The page's dealings with the browser: the address bar, saved inputs, drawing a chart
//! on a `<canvas>`, file downloads and timing. Everything else in the app is plain Rust.

use crate::chart::{self, ChartSpec};
use plotters::prelude::IntoDrawingArea;
use plotters_canvas::CanvasBackend;
use wasm_bindgen::{JsCast, JsValue};
use web_sys::HtmlCanvasElement;

/// The storage key of the saved inputs.
const STORAGE_KEY: &str = "bandgauge.workbench";

fn window() -> Option<web_sys::Window> {
    web_sys::window()
}

/// The current query string, without the leading `?`.
pub fn query() -> String {
    window()
        .and_then(|w| w.location().search().ok())
        .map(|s| s.trim_start_matches('?').to_string())
        .unwrap_or_default()
}

/// Replaces the query string without adding a history entry (typing is not navigation).
pub fn replace_query(query: &str) {
    let Some(history) = window().and_then(|w| w.history().ok()) else {
        return;
    };
    let _ = history.replace_state_with_url(&JsValue::NULL, "", Some(&format!("?{query}")));
}

fn storage() -> Option<web_sys::Storage> {
    window().and_then(|w| w.local_storage().ok().flatten())
}

/// The saved inputs, if any (private browsing may have no storage at all).
pub fn load_saved() -> Option<String> {
    storage().and_then(|s| s.get_item(STORAGE_KEY).ok().flatten())
}

/// Saves the inputs; a full or missing storage only loses persistence, so it is ignored.
pub fn save(text: &str) {
    if let Some(s) = storage() {
        let _ = s.set_item(STORAGE_KEY, text);
    }
}

/// Milliseconds since page load, for the redraw timing.
pub fn now_ms() -> f64 {
    window()
        .and_then(|w| w.performance())
        .map(|p| p.now())
        .unwrap_or(0.0)
}

/// Publishes the latest redraw time as `data-redraw-ms` on `<body>` for benchmarks.
pub fn publish_redraw_ms(ms: f64) {
    if let Some(body) = window().and_then(|w| w.document()).and_then(|d| d.body()) {
        let _ = body.set_attribute("data-redraw-ms", &format!("{ms:.3}"));
    }
}

/// Draws `spec` on `canvas`, sizing the backing store by the device pixel ratio so the
/// chart stays crisp on high-DPI screens. The CSS size is left to the stylesheet.
pub fn draw_chart(canvas: &HtmlCanvasElement, spec: &ChartSpec) -> Result<(), String> {
    let ratio = window()
        .map(|w| w.device_pixel_ratio())
        .unwrap_or(1.0)
        .max(1.0);
    // A canvas not laid out yet (hidden tab) reports 0; draw at a sensible size anyway.
    let css_width = match canvas.client_width() {
        w if w > 0 => f64::from(w),
        _ => 640.0,
    };
    let css_height = match canvas.client_height() {
        h if h > 0 => f64::from(h),
        _ => 360.0,
    };
    let (width, height) = (
        (css_width * ratio).round() as u32,
        (css_height * ratio).round() as u32,
    );
    if canvas.width() != width {
        canvas.set_width(width);
    }
    if canvas.height() != height {
        canvas.set_height(height);
    }
    let backend =
        CanvasBackend::with_canvas_object(canvas.clone()).ok_or("the canvas has no 2d context")?;
    let area = backend.into_drawing_area();
    chart::draw(&area, spec, ratio)?;
    area.present()
        .map_err(|e| format!("chart '{}': {e}", spec.title))
}

/// Starts a download of `url` under `file_name`.
fn download(url: &str, file_name: &str) -> Result<(), String> {
    let document = window().and_then(|w| w.document()).ok_or("no document")?;
    let anchor: web_sys::HtmlAnchorElement = document
        .create_element("a")
        .map_err(|_| "cannot create a link")?
        .dyn_into()
        .map_err(|_| "cannot create a link")?;
    anchor.set_href(url);
    anchor.set_download(file_name);
    let body = document.body().ok_or("no body")?;
    let _ = body.append_child(&anchor);
    anchor.click();
    anchor.remove();
    Ok(())
}

/// Downloads the canvas as a PNG image.
pub fn download_png(canvas: &HtmlCanvasElement, file_stem: &str) -> Result<(), String> {
    let url = canvas
        .to_data_url()
        .map_err(|_| "the chart cannot be exported (canvas is tainted)")?;
    download(&url, &format!("{file_stem}.png"))
}

/// Downloads `text` as a file of MIME type `mime`.
pub fn download_text(text: &str, mime: &str, file_name: &str) -> Result<(), String> {
    let parts = js_sys::Array::of1(&JsValue::from_str(text));
    let options = web_sys::BlobPropertyBag::new();
    options.set_type(mime);
    let blob = web_sys::Blob::new_with_str_sequence_and_options(&parts, &options)
        .map_err(|_| "cannot build the file")?;
    let url =
        web_sys::Url::create_object_url_with_blob(&blob).map_err(|_| "cannot build the file")?;
    let result = download(&url, file_name);
    let _ = web_sys::Url::revoke_object_url(&url);
    result
}
