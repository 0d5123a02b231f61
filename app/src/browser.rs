//! The page's dealings with the browser: the address bar, saved inputs, drawing a chart
//! on a `<canvas>`, file downloads, timing and the offline worker. Everything else in the
//! app is plain Rust (the panic panel, `crash_panel`, builds its own DOM).

use crate::chart::{self, ChartSpec};
use crate::colormap::Ramp;
use crate::wafer_map::{self, MapLayout, MapSpec};
use plotters::prelude::{IntoDrawingArea, WHITE};
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

/// Removes the saved inputs from this browser's storage (nothing else of the page's is
/// stored there). Missing storage means there is nothing to remove.
pub fn forget_saved() {
    if let Some(s) = storage() {
        let _ = s.remove_item(STORAGE_KEY);
    }
}

/// Reloads the page as it is, inputs in the address included.
pub fn reload() {
    if let Some(w) = window() {
        let _ = w.location().reload();
    }
}

/// Opens the page again without the inputs in its address (replacing the history entry,
/// so Back does not return to the inputs that were left behind).
pub fn open_without_inputs() {
    if let Some(location) = window().map(|w| w.location()) {
        let path = location.pathname().unwrap_or_else(|_| "./".into());
        let _ = location.replace(&path);
    }
}

/// Registers the offline worker (`sw.js`, see `public/sw.js`) when the page is served over
/// http(s) from the folder build. Not from disk (`file://` has no service workers) and not
/// from the single-file build (its page says so in a `<meta name="bandgauge-delivery">`).
/// A browser without service workers, or a registration that fails, only loses offline use:
/// nothing is shown, one line goes to the console.
pub fn register_offline_worker() {
    let Some(w) = window() else {
        return;
    };
    let protocol = w.location().protocol().unwrap_or_default();
    if protocol != "http:" && protocol != "https:" {
        return;
    }
    let single_file = w
        .document()
        .and_then(|d| {
            d.query_selector("meta[name=\"bandgauge-delivery\"][content=\"single-file\"]")
                .ok()
                .flatten()
        })
        .is_some();
    if single_file {
        return;
    }
    // Absent outside secure contexts (plain http on a non-local host): check before use.
    let navigator = w.navigator();
    let has_workers = js_sys::Reflect::get(&navigator, &JsValue::from_str("serviceWorker"))
        .is_ok_and(|v| !v.is_undefined() && !v.is_null());
    if !has_workers {
        return;
    }
    let on_failure = wasm_bindgen::closure::Closure::<dyn FnMut(JsValue)>::new(|reason| {
        web_sys::console::warn_2(
            &JsValue::from_str("bandgauge: offline use is not available:"),
            &reason,
        );
    });
    let _ = navigator
        .service_worker()
        .register("sw.js")
        .catch(&on_failure);
    // Called at most once, late; one small closure per page load.
    on_failure.forget();
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

/// Sizes the canvas's backing store to its CSS size times the device pixel ratio (a canvas not
/// laid out yet, in a hidden tab, reports 0: it gets 640 x `default_css_height`) and returns
/// the ratio.
fn fit_backing_store(canvas: &HtmlCanvasElement, default_css_height: f64) -> f64 {
    let ratio = window()
        .map(|w| w.device_pixel_ratio())
        .unwrap_or(1.0)
        .max(1.0);
    let css_width = match canvas.client_width() {
        w if w > 0 => f64::from(w),
        _ => 640.0,
    };
    let css_height = match canvas.client_height() {
        h if h > 0 => f64::from(h),
        _ => default_css_height,
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
    ratio
}

/// Draws `spec` on `canvas`, sizing the backing store by the device pixel ratio so the
/// chart stays crisp on high-DPI screens. The CSS size is left to the stylesheet.
pub fn draw_chart(canvas: &HtmlCanvasElement, spec: &ChartSpec) -> Result<(), String> {
    let ratio = fit_backing_store(canvas, 360.0);
    let backend =
        CanvasBackend::with_canvas_object(canvas.clone()).ok_or("the canvas has no 2d context")?;
    let area = backend.into_drawing_area();
    chart::draw(&area, spec, ratio)?;
    area.present()
        .map_err(|e| format!("chart '{}': {e}", spec.title))
}

/// Publishes the latest wafer-map drawing time (surface, outline, sites and bar) as
/// `data-map-ms` on `<body>` for benchmarks.
pub fn publish_map_ms(ms: f64) {
    if let Some(body) = window().and_then(|w| w.document()).and_then(|d| d.body()) {
        let _ = body.set_attribute("data-map-ms", &format!("{ms:.3}"));
    }
}

/// Draws the wafer map `spec` on `canvas` (backing store sized by the device pixel ratio, as
/// [`draw_chart`]) and returns where each site landed, in CSS pixels from the canvas's top
/// left corner, for the focusable site buttons over it.
pub fn draw_map(canvas: &HtmlCanvasElement, spec: &MapSpec) -> Result<Vec<(f64, f64)>, String> {
    let ratio = fit_backing_store(canvas, 480.0);
    let layout = paint_map(canvas, spec, ratio)?;
    Ok(spec
        .sites
        .iter()
        .map(|s| {
            let (x, y) = layout.to_pixel(spec.diameter_mm, s.x_mm, s.y_mm);
            (f64::from(x) / ratio, f64::from(y) / ratio)
        })
        .collect())
}

/// Paints the map on a canvas already sized: white, then the surface as an image, then the
/// outline, sites, colour bar and key with plotters.
fn paint_map(canvas: &HtmlCanvasElement, spec: &MapSpec, ratio: f64) -> Result<MapLayout, String> {
    let layout = MapLayout::new(canvas.width(), canvas.height(), ratio);
    let context: web_sys::CanvasRenderingContext2d = canvas
        .get_context("2d")
        .ok()
        .flatten()
        .and_then(|c| c.dyn_into().ok())
        .ok_or("the canvas has no 2d context")?;
    let backend =
        CanvasBackend::with_canvas_object(canvas.clone()).ok_or("the canvas has no 2d context")?;
    let area = backend.into_drawing_area();
    area.fill(&WHITE)
        .map_err(|e| format!("map '{}': {e}", spec.title))?;
    let pixels = wafer_map::surface_pixels(spec, &layout, &Ramp::new());
    let image = web_sys::ImageData::new_with_u8_clamped_array_and_sh(
        wasm_bindgen::Clamped(&pixels),
        layout.side,
        layout.side,
    )
    .map_err(|_| format!("map '{}': the surface image cannot be made", spec.title))?;
    context
        .put_image_data(&image, f64::from(layout.left), f64::from(layout.top))
        .map_err(|_| format!("map '{}': the surface image cannot be drawn", spec.title))?;
    wafer_map::draw(&area, spec, &layout)?;
    area.present()
        .map_err(|e| format!("map '{}': {e}", spec.title))?;
    Ok(layout)
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

/// The computer's clock now, as ISO 8601 UTC (`2025-03-14T09:26:53.120Z`), for a record.
pub fn now_iso_utc() -> String {
    String::from(js_sys::Date::new_0().to_iso_string())
}

/// Moves the keyboard focus to the element with this `id`, when it is on the page.
pub fn focus_element(id: &str) {
    let element = window()
        .and_then(|w| w.document())
        .and_then(|d| d.get_element_by_id(id))
        .and_then(|e| e.dyn_into::<web_sys::HtmlElement>().ok());
    if let Some(e) = element {
        let _ = e.focus();
    }
}

/// Opens the browser's print dialog (print to paper or to PDF).
pub fn print() {
    if let Some(w) = window() {
        let _ = w.print();
    }
}

/// Draws `spec` on a fresh canvas of `css_width` x `css_height` CSS pixels at `scale` device
/// pixels per CSS pixel and returns it as a PNG `data:` URL, for an `<img>` that prints.
pub fn chart_image(
    spec: &ChartSpec,
    css_width: u32,
    css_height: u32,
    scale: f64,
) -> Result<String, String> {
    let canvas = fresh_canvas(css_width, css_height, scale)?;
    let backend =
        CanvasBackend::with_canvas_object(canvas.clone()).ok_or("the canvas has no 2d context")?;
    let area = backend.into_drawing_area();
    chart::draw(&area, spec, scale)?;
    area.present()
        .map_err(|e| format!("chart '{}': {e}", spec.title))?;
    canvas
        .to_data_url()
        .map_err(|_| format!("chart '{}' cannot be turned into an image", spec.title))
}

/// Draws the wafer map `spec` on a fresh canvas (as [`chart_image`]) and returns it as a PNG
/// `data:` URL.
pub fn map_image(
    spec: &MapSpec,
    css_width: u32,
    css_height: u32,
    scale: f64,
) -> Result<String, String> {
    let canvas = fresh_canvas(css_width, css_height, scale)?;
    paint_map(&canvas, spec, scale)?;
    canvas
        .to_data_url()
        .map_err(|_| format!("map '{}' cannot be turned into an image", spec.title))
}

/// A canvas not on the page, `css_width` x `css_height` at `scale` device pixels each.
fn fresh_canvas(css_width: u32, css_height: u32, scale: f64) -> Result<HtmlCanvasElement, String> {
    let document = window().and_then(|w| w.document()).ok_or("no document")?;
    let canvas: HtmlCanvasElement = document
        .create_element("canvas")
        .map_err(|_| "cannot create a canvas")?
        .dyn_into()
        .map_err(|_| "cannot create a canvas")?;
    canvas.set_width((f64::from(css_width) * scale).round() as u32);
    canvas.set_height((f64::from(css_height) * scale).round() as u32);
    Ok(canvas)
}

/// Reads a picked file as UTF-8 text (invalid bytes become U+FFFD) and hands the text, or
/// why it could not be read, to `done`.
pub fn read_text_file(file: &web_sys::File, done: impl FnOnce(Result<String, String>) + 'static) {
    let Ok(reader) = web_sys::FileReader::new() else {
        done(Err("the browser cannot read files here".into()));
        return;
    };
    let done = std::rc::Rc::new(std::cell::RefCell::new(Some(done)));
    let finish = {
        let done = done.clone();
        move |result: Result<String, String>| {
            if let Some(done) = done.borrow_mut().take() {
                done(result);
            }
        }
    };
    let reader_in_callback = reader.clone();
    let finish_here = finish.clone();
    // `loadend` comes after a successful read and after a failed one alike.
    let on_loadend = wasm_bindgen::closure::Closure::once_into_js(move |_: JsValue| {
        let text = reader_in_callback
            .result()
            .ok()
            .and_then(|r| r.as_string())
            .ok_or_else(|| "the browser could not read the file".to_string());
        finish_here(text);
    });
    reader.set_onloadend(Some(on_loadend.unchecked_ref()));
    if reader.read_as_text(file).is_err() {
        reader.set_onloadend(None);
        finish(Err("the browser could not read the file".into()));
    }
}
