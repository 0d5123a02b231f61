//! In-browser benchmark: time from an input change to every visible chart redrawn, per view,
//! in real headless Chromium, plus nothing else. Run by `cargo xtask bench` after a release
//! build; prints `browser_redraw_<view>_ms=<median>` lines that xtask puts in its table.
//!
//! The page publishes the time of its last redraw (performance.now from the input event to the
//! last chart drawn) in `<body data-redraw-ms>`. Other processes on a shared machine only ever
//! add time, so each view is measured in three rounds of 21 inputs and the best median is kept.

use bandgauge_tests::browser::with_browser;
use bandgauge_tests::ui::{canvas_drawn, click};

/// Pixels a drawn chart has at least (axes, labels and a curve), to know it is on screen.
const MIN_INKED_PIXELS: u64 = 2000;
/// The window size of the measurement (a common desktop screen).
const DESKTOP: (u32, u32) = (1920, 1080);

/// Types each of `values` into `[data-testid=id]` through real input events and returns the
/// redraw times the app publishes (ms from the input event to the last chart drawn).
async fn redraw_times(client: &fantoccini::Client, id: &str, values: &[String]) -> Vec<f64> {
    let script = r#"
        const [id, values] = [arguments[0], arguments[1]];
        const done = arguments[arguments.length - 1];
        const el = document.querySelector('[data-testid="' + id + '"]');
        const times = [];
        let i = 0;
        function step() {
            if (i >= values.length) { done(times); return; }
            document.body.removeAttribute('data-redraw-ms');
            el.value = values[i++];
            el.dispatchEvent(new Event('input', { bubbles: true }));
            setTimeout(() => { times.push(parseFloat(document.body.dataset.redrawMs)); step(); }, 60);
        }
        step();
    "#;
    let v = client
        .execute_async(
            script,
            vec![serde_json::json!(id), serde_json::json!(values)],
        )
        .await
        .expect("timing script");
    v.as_array()
        .expect("times")
        .iter()
        .map(|t| t.as_f64().unwrap_or(f64::NAN))
        .collect()
}

fn median(mut v: Vec<f64>) -> f64 {
    assert!(
        v.iter().all(|t| t.is_finite()),
        "a redraw was not published: {v:?}"
    );
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

fn series(n: usize, f: impl Fn(usize) -> String) -> Vec<String> {
    (0..n).map(f).collect()
}

#[tokio::main(flavor = "multi_thread")]
async fn main() {
    with_browser(DESKTOP.0, DESKTOP.1, |client, base| async move {
        client.goto(&base).await.expect("open app");
        let temperatures = series(21, |i| format!("{} K", 250 + 5 * i));
        let points = series(21, |i| format!("{}", 120 + i));
        let resistivities = series(21, |i| format!("{} ohm-cm", 1 + i));
        let mut best = [f64::INFINITY; 4];
        for _round in 0..3 {
            click(&client, "tab-carriers").await;
            canvas_drawn(&client, "band-diagram", MIN_INKED_PIXELS).await;
            let carriers = median(redraw_times(&client, "temperature", &temperatures).await);
            click(&client, "tab-sweep").await;
            canvas_drawn(&client, "chart-ionization", MIN_INKED_PIXELS).await;
            let marked = median(redraw_times(&client, "marked-temperature", &temperatures).await);
            let grid = median(redraw_times(&client, "sweep-points", &points).await);
            click(&client, "tab-resistivity").await;
            canvas_drawn(&client, "chart-resistivity", MIN_INKED_PIXELS).await;
            let conversion = median(redraw_times(&client, "convert-value", &resistivities).await);
            for (b, m) in best.iter_mut().zip([carriers, marked, grid, conversion]) {
                *b = b.min(m);
            }
        }
        for (view, ms) in ["carriers", "sweep_marker", "sweep_grid", "resistivity"]
            .into_iter()
            .zip(best)
        {
            println!("browser_redraw_{view}_ms={ms:.3}");
        }
    })
    .await;
}
