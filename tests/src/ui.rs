//! Helpers for driving the bandgauge workbench in the browser tests: reading displayed numbers,
//! choosing options, inspecting chart canvases and capturing downloads.

use crate::browser::by_testid;
use fantoccini::Client;
use std::time::{Duration, Instant};

/// How long a displayed value may take to follow an input (the app recomputes in a microtask;
/// this only bounds a slow, shared test machine).
const SETTLE: Duration = Duration::from_secs(10);

/// Polls `[data-testid=id]` until its text parses as a number accepted by `accept`, or
/// [`SETTLE`] passes; panics with the last text in the latter case.
pub async fn number_until(client: &Client, id: &str, accept: impl Fn(f64) -> bool) -> f64 {
    let deadline = Instant::now() + SETTLE;
    loop {
        let text = by_testid(client, id).await.text().await.unwrap_or_default();
        match text.trim().parse::<f64>() {
            Ok(v) if accept(v) => return v,
            _ if Instant::now() > deadline => {
                panic!("[data-testid={id}] shows '{text}', not an accepted number")
            }
            _ => tokio::time::sleep(Duration::from_millis(50)).await,
        }
    }
}

/// Polls until `[data-testid=id]` shows a number within `rel_tol` (relative) of `expected`.
pub async fn number_near(client: &Client, id: &str, expected: f64, rel_tol: f64) -> f64 {
    let deadline = Instant::now() + SETTLE;
    loop {
        let text = by_testid(client, id).await.text().await.unwrap_or_default();
        if let Ok(v) = text.trim().parse::<f64>()
            && ((v - expected) / expected).abs() <= rel_tol
        {
            return v;
        }
        if Instant::now() > deadline {
            panic!(
                "[data-testid={id}] shows '{text}'; expected {expected:e} within {rel_tol:e} relative"
            );
        }
        tokio::time::sleep(Duration::from_millis(50)).await;
    }
}

/// The text of `[data-testid=id]` right now.
pub async fn text_of(client: &Client, id: &str) -> String {
    by_testid(client, id).await.text().await.unwrap_or_default()
}

/// Chooses the option with `value` in the `<select>` `[data-testid=id]`.
pub async fn choose(client: &Client, id: &str, value: &str) {
    by_testid(client, id)
        .await
        .select_by_value(value)
        .await
        .unwrap_or_else(|e| panic!("choose {value} in {id}: {e}"));
}

/// Clicks `[data-testid=id]`.
pub async fn click(client: &Client, id: &str) {
    by_testid(client, id)
        .await
        .click()
        .await
        .unwrap_or_else(|e| panic!("click {id}: {e}"));
}

/// The value of an attribute of `[data-testid=id]`.
pub async fn attr_of(client: &Client, id: &str, name: &str) -> Option<String> {
    by_testid(client, id).await.attr(name).await.unwrap_or(None)
}

/// What a chart canvas holds: pixels that are not near-white, its backing-store size and its
/// CSS size and the device pixel ratio.
#[derive(Debug, Clone, Copy)]
pub struct CanvasInk {
    /// Pixels darker than light grey in any channel.
    pub inked_pixels: u64,
    /// Backing-store width, px.
    pub width: u64,
    /// CSS width, px.
    pub css_width: f64,
    /// window.devicePixelRatio.
    pub device_pixel_ratio: f64,
}

/// Reads the canvas `[data-testid=id]`.
pub async fn canvas_ink(client: &Client, id: &str) -> CanvasInk {
    by_testid(client, id).await;
    let script = r#"
        const c = document.querySelector('[data-testid="' + arguments[0] + '"]');
        const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 0; i < d.length; i += 4) { if (d[i] < 200 || d[i + 1] < 200 || d[i + 2] < 200) n++; }
        return [n, c.width, c.getBoundingClientRect().width, window.devicePixelRatio];
    "#;
    let v = client
        .execute(script, vec![serde_json::json!(id)])
        .await
        .expect("read canvas pixels");
    let n = |i: usize| v[i].as_f64().unwrap_or(0.0);
    CanvasInk {
        inked_pixels: n(0) as u64,
        width: n(1) as u64,
        css_width: n(2),
        device_pixel_ratio: n(3),
    }
}

/// Polls the canvas until at least `min_pixels` are inked (the chart has been drawn).
pub async fn canvas_drawn(client: &Client, id: &str, min_pixels: u64) -> CanvasInk {
    let deadline = Instant::now() + SETTLE;
    loop {
        let ink = canvas_ink(client, id).await;
        if ink.inked_pixels >= min_pixels {
            return ink;
        }
        assert!(
            Instant::now() < deadline,
            "canvas {id} stays blank: {ink:?}"
        );
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
}

/// Replaces the page's download mechanism with a recorder: link clicks are logged with their
/// file name and URL, and blobs are kept so their text can be read back.
pub async fn record_downloads(client: &Client) {
    let script = r#"
        window.__downloads = [];
        window.__blobs = [];
        HTMLAnchorElement.prototype.click = function () { window.__downloads.push([this.download, this.href]); };
        URL.createObjectURL = function (b) { window.__blobs.push(b); return 'blob:recorded-' + window.__blobs.length; };
        URL.revokeObjectURL = function () {};
    "#;
    client
        .execute(script, vec![])
        .await
        .expect("install download recorder");
}

/// The downloads recorded so far: (file name, URL).
pub async fn downloads(client: &Client) -> Vec<(String, String)> {
    let v = client
        .execute("return window.__downloads || [];", vec![])
        .await
        .expect("read downloads");
    v.as_array()
        .map(|a| {
            a.iter()
                .map(|d| {
                    (
                        d[0].as_str().unwrap_or("").to_string(),
                        d[1].as_str().unwrap_or("").to_string(),
                    )
                })
                .collect()
        })
        .unwrap_or_default()
}

/// The text of the last recorded blob download.
pub async fn last_blob_text(client: &Client) -> String {
    let script = r#"
        const done = arguments[arguments.length - 1];
        const b = window.__blobs[window.__blobs.length - 1];
        b.text().then(done);
    "#;
    let v = client
        .execute_async(script, vec![])
        .await
        .expect("read blob");
    v.as_str().unwrap_or("").to_string()
}

/// The query string of the page (without `?`).
pub async fn query(client: &Client) -> String {
    let url = client.current_url().await.expect("current url");
    url.query().unwrap_or("").to_string()
}

/// Runs a script in the page and ignores its result.
pub async fn run_script(client: &Client, script: &str) {
    client
        .execute(script, vec![])
        .await
        .unwrap_or_else(|e| panic!("script failed: {e}"));
}

/// The value of the input `[data-testid=id]` (empty when it has none).
pub async fn value_of(client: &Client, id: &str) -> String {
    by_testid(client, id)
        .await
        .prop("value")
        .await
        .ok()
        .flatten()
        .unwrap_or_default()
}

/// A file written under the temp folder for the page to open through a file input;
/// removed (with its folder, once empty) when dropped.
pub struct TempFile(std::path::PathBuf);

impl TempFile {
    /// Writes `text` to `<temp>/bandgauge-<purpose>-<pid>-<n>/<name>`, `n` counting the files
    /// of this process: tests running in parallel that write the same name (the 1366 and 1920
    /// px runs of one test) get folders of their own, so one's clean-up never removes the
    /// other's file.
    pub fn new(purpose: &str, name: &str, text: &str) -> TempFile {
        static MADE: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
        let n = MADE.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        let dir =
            std::env::temp_dir().join(format!("bandgauge-{purpose}-{}-{n}", std::process::id()));
        std::fs::create_dir_all(&dir).expect("create temp folder");
        let path = dir.join(name);
        std::fs::write(&path, text).unwrap_or_else(|e| panic!("write {}: {e}", path.display()));
        TempFile(path)
    }

    /// The path as text, for `send_keys` into a file input.
    pub fn path(&self) -> String {
        self.0.to_str().expect("a UTF-8 temp path").to_string()
    }
}

impl Drop for TempFile {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.0);
        // The folder goes with its last file (removing a folder still in use fails harmlessly).
        if let Some(dir) = self.0.parent() {
            let _ = std::fs::remove_dir(dir);
        }
    }
}
