//! Browser tests of the wafer map in the lots view: the demo's centre-high wafer drawn to scale
//! with its colour scale, sites reachable by keyboard with their values, the quantity and
//! diameter choices, the radial profile, and the PNG and CSV exports, at both window sizes.
//!
//! Expected site values come from `bandgauge_core::lots` reading the same demo file; the
//! expected colour of a site from the app's colour scale (`bandgauge_app::colormap`); the
//! pattern (centre about 11 % above the outer ring) is the invented demo scenario
//! (demo-wafers/README.md, make_patterned_lots.py).

use bandgauge_app::colormap;
use bandgauge_core::lots::{ReadOptions, RowOutcome, read_str};
use bandgauge_tests::browser::{by_testid, retype, screenshot, text_until, with_browser};
use bandgauge_tests::ui::{
    canvas_drawn, choose, click, downloads, last_blob_text, record_downloads, run_script, text_of,
};
use fantoccini::key::Key;
use fantoccini::{Client, Locator};
use std::path::Path;
use std::time::{Duration, Instant};

/// Smaller of the two windows the app must serve.
const LAPTOP: (u32, u32) = (1366, 768);
/// Larger window.
const DESKTOP: (u32, u32) = (1920, 1080);
/// A drawn map: the filled wafer alone inks tens of thousands of pixels.
const MIN_INKED_PIXELS: u64 = 20_000;
/// How long the demo may take to be read on a slow, shared test machine.
const READ_WAIT: Duration = Duration::from_secs(60);
/// The wafer with the clearest pattern: C2-4429 wafer 04 (centre-high, outer ring below 8).
const WAFER: &str = "C2-4429|04";

/// (site, x, y, resistivity) of C2-4429 wafer 04 as the core reads the demo file.
fn core_sites() -> Vec<(String, f64, f64, f64)> {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("../demo-wafers/c2-4429-radial.csv");
    let text = std::fs::read_to_string(path).expect("demo file");
    let mut out = Vec::new();
    let mut book = bandgauge_core::lots::LotBook::new();
    read_str(&text, &ReadOptions::default(), &mut book, &mut |o| {
        if let RowOutcome::Converted(s) = o
            && s.wafer == "04"
        {
            out.push((
                s.site.to_owned(),
                s.x_mm.unwrap(),
                s.y_mm.unwrap(),
                s.resistivity_ohm_cm,
            ));
        }
    })
    .expect("core reads the demo file");
    out
}

async fn open_demo_map(client: &Client, base: &str) {
    client.goto(base).await.expect("open app");
    click(client, "tab-lots").await;
    click(client, "lots-demo").await;
    let deadline = Instant::now() + READ_WAIT;
    while by_testid(client, "lots-map-wafer")
        .await
        .find_all(Locator::Css("option"))
        .await
        .map_or(0, |o| o.len())
        < 40
    {
        assert!(Instant::now() < deadline, "the demo lots were not read");
        tokio::time::sleep(Duration::from_millis(200)).await;
    }
    choose(client, "lots-map-wafer", WAFER).await;
    text_until(client, "lots-map-figures", |t| t.contains("49 sites")).await;
    canvas_drawn(client, "lots-map", MIN_INKED_PIXELS).await;
    run_script(
        client,
        "document.querySelector('[data-testid=\"lots-map\"]').scrollIntoView({block: 'center'});",
    )
    .await;
}

/// CSS positions (relative to the canvas) of the site buttons, in page order.
async fn site_places(client: &Client) -> Vec<(f64, f64)> {
    let v = client
        .execute(
            "const c = document.querySelector('[data-testid=\"lots-map\"]').getBoundingClientRect();
             return [...document.querySelectorAll('[data-testid=\"lots-map-site\"]')].map(b => {
               const r = b.getBoundingClientRect();
               return [r.left + r.width / 2 - c.left, r.top + r.height / 2 - c.top]; });",
            vec![],
        )
        .await
        .expect("site places");
    v.as_array()
        .expect("array")
        .iter()
        .map(|p| (p[0].as_f64().unwrap(), p[1].as_f64().unwrap()))
        .collect()
}

/// The canvas pixel at CSS position (x, y).
async fn pixel(client: &Client, x: f64, y: f64) -> [u8; 3] {
    let v = client
        .execute(
            "const c = document.querySelector('[data-testid=\"lots-map\"]');
             const k = c.width / c.getBoundingClientRect().width;
             const d = c.getContext('2d').getImageData(Math.round(arguments[0] * k), Math.round(arguments[1] * k), 1, 1).data;
             return [d[0], d[1], d[2]];",
            vec![serde_json::json!(x), serde_json::json!(y)],
        )
        .await
        .expect("read pixel");
    std::array::from_fn(|i| v[i].as_u64().unwrap() as u8)
}

async fn map_at(size: (u32, u32), name: &'static str) {
    with_browser(size.0, size.1, move |client, base| async move {
        open_demo_map(&client, &base).await;
        let sites = core_sites();
        assert_eq!(sites.len(), 49);
        let places = site_places(&client).await;
        assert_eq!(places.len(), 49, "one focusable button per site");

        // Site colours match their values: the disc at each site has the scale's colour of
        // its value, the scale running from the wafer's smallest to its largest value.
        let lo = sites.iter().map(|s| s.3).fold(f64::INFINITY, f64::min);
        let hi = sites.iter().map(|s| s.3).fold(f64::NEG_INFINITY, f64::max);
        for (i, s) in sites.iter().enumerate().step_by(6) {
            let want = colormap::at((s.3 - lo) / (hi - lo));
            let got = pixel(&client, places[i].0, places[i].1).await;
            // Sites outside the window carry a triangle whose centre is still the colour.
            for c in 0..3 {
                assert!(
                    (i32::from(got[c]) - i32::from(want[c])).abs() <= 8,
                    "site {}: pixel {got:?}, scale colour {want:?}",
                    s.0
                );
            }
        }

        // The outline to scale: site 26 sits at (66, 0) mm, so the wafer edge (75 mm) lies
        // 75/66 of that distance from the centre; just inside it is wafer, just outside white.
        let (cx, cy) = places[0];
        let per_mm = (places[25].0 - cx) / 66.0;
        assert!(per_mm > 0.5, "{per_mm} px per mm");
        let inside = pixel(&client, cx - 73.0 * per_mm, cy).await;
        let outside = pixel(&client, cx - 77.5 * per_mm, cy).await;
        assert_ne!(inside, [255, 255, 255], "the wafer reaches 73 mm");
        assert_eq!(outside, [255, 255, 255], "nothing drawn beyond the 75 mm edge");

        // The centre-high pattern shows: the surface is lighter (higher) near the centre.
        let near = colormap::luminance(pixel(&client, cx + 11.0 * per_mm, cy + 0.0).await);
        let far = colormap::luminance(pixel(&client, cx + 55.0 * per_mm, cy).await);
        assert!(near > far, "centre {near} vs edge {far}");

        // Keyboard: Tab from the diameter field reaches the first site; its value shows.
        by_testid(&client, "lots-map-diameter").await.click().await.expect("focus diameter");
        client.active_element().await.expect("active").send_keys(&Key::Tab.to_string()).await.expect("tab");
        let tip = text_of(&client, "lots-map-tip").await;
        let value: f64 = tip
            .split(": ")
            .nth(1)
            .and_then(|t| t.split(' ').next())
            .and_then(|t| t.parse().ok())
            .unwrap_or_else(|| panic!("no value in the tip '{tip}'"));
        assert!(tip.starts_with(&format!("site {}:", sites[0].0)), "{tip}");
        approx::assert_relative_eq!(value, sites[0].3, max_relative = 6e-4);
        screenshot(&client, &format!("map-{name}")).await;

        // The table alternative lists every site.
        let rows = by_testid(&client, "lots-map-table").await.find_all(Locator::Css("tbody tr")).await.expect("rows");
        assert_eq!(rows.len(), 49);
        // The radial profile is drawn and names the change.
        canvas_drawn(&client, "lots-radial", 2000).await;
        let figures = text_of(&client, "lots-map-figures").await;
        assert!(figures.contains("centre to edge +"), "{figures}");
        assert!(figures.contains("std/mean"), "{figures}");
        run_script(
            &client,
            "document.querySelector('[data-testid=\"lots-radial\"]').scrollIntoView({block: 'center'});",
        )
        .await;
        screenshot(&client, &format!("map-radial-{name}")).await;
    })
    .await;
}

#[tokio::test(flavor = "multi_thread")]
async fn map_at_laptop_size() {
    map_at(LAPTOP, "1366").await;
}

#[tokio::test(flavor = "multi_thread")]
async fn map_at_desktop_size() {
    map_at(DESKTOP, "1920").await;
}

#[tokio::test(flavor = "multi_thread")]
async fn map_choices_bad_diameter_and_exports() {
    with_browser(DESKTOP.0, DESKTOP.1, |client, base| async move {
        open_demo_map(&client, &base).await;
        record_downloads(&client).await;

        // PNG of the map: a PNG data URL under the wafer's name.
        click(&client, "lots-map-png").await;
        let d = downloads(&client).await;
        let (file, url) = d.last().expect("a download");
        assert_eq!(file, "bandgauge-wafer-map-C2-4429-04.png");
        assert!(
            url.starts_with("data:image/png;base64,") && url.len() > 20_000,
            "{}",
            url.len()
        );

        // CSV of the map: a header and the 49 sites.
        click(&client, "lots-map-csv").await;
        let csv = last_blob_text(&client).await;
        assert_eq!(csv.lines().count(), 50, "{csv}");
        assert!(csv.starts_with("site,x_mm,y_mm,resistivity [ohm cm],outside_window"));
        assert!(csv.contains(",below min"));

        // Each figure and the surface's scheme are defined under "How the figures are defined".
        let definitions = client
            .find_all(Locator::Css("[data-testid=\"lots-map-definition\"]"))
            .await
            .expect("definitions");
        let mut texts = Vec::new();
        for d in definitions {
            texts.push(d.prop("textContent").await.ok().flatten().unwrap_or_default());
        }
        assert_eq!(texts.len(), 6, "{texts:?}");
        for term in ["std/mean", "(max-min)/(max+min)", "(max-min)/mean", "centre to edge"] {
            assert!(texts.iter().any(|t| t.starts_with(term)), "{term} in {texts:?}");
        }
        assert!(texts.iter().any(|t| t.contains("Delaunay")), "{texts:?}");
        assert!(texts.iter().any(|t| t.contains("Oklab")), "{texts:?}");

        // Dopant density: the figures follow, in cm^-3.
        choose(&client, "lots-map-quantity", "density").await;
        text_until(&client, "lots-map-figures", |t| t.contains("cm^-3")).await;

        // A bad diameter names the field and what is allowed; the map stays.
        retype(&client, "lots-map-diameter", "abc").await;
        let e = text_until(&client, "lots-map-diameter-error", |t| !t.is_empty()).await;
        assert!(
            e.contains("Wafer diameter") && e.contains("e.g. 150 mm"),
            "{e}"
        );
        canvas_drawn(&client, "lots-map", MIN_INKED_PIXELS).await;
        // A larger wafer set by hand: the sites move towards the centre.
        let before = site_places(&client).await;
        retype(&client, "lots-map-diameter", "200").await;
        text_until(&client, "lots-map-diameter-error", str::is_empty).await;
        let deadline = Instant::now() + Duration::from_secs(10);
        loop {
            let after = site_places(&client).await;
            let spread = |p: &[(f64, f64)]| (p[25].0 - p[0].0).abs();
            if spread(&after) < 0.9 * spread(&before) {
                break;
            }
            assert!(
                Instant::now() < deadline,
                "the sites did not move for a 200 mm wafer"
            );
            tokio::time::sleep(Duration::from_millis(100)).await;
        }
        // Sheet resistance on a lot that gives none: said in words.
        choose(&client, "lots-map-quantity", "sheet-resistance").await;
        let p = text_of(&client, "lots-map-problem").await;
        assert!(p.contains("no sheet resistance"), "{p}");
        // And no stale map of the previous quantity stays beside the message.
        let deadline = Instant::now() + Duration::from_secs(10);
        while !client
            .find_all(Locator::Css("[data-testid=\"lots-map\"]"))
            .await
            .expect("query")
            .is_empty()
        {
            assert!(Instant::now() < deadline, "the density map stays on screen");
            tokio::time::sleep(Duration::from_millis(100)).await;
        }
        screenshot(&client, "map-choices-1920").await;

        // The hot-spot lot: on wafer 01 the outer-ring site at 135 degrees (site 35: 26 + 9 of
        // 24) reads above 12 ohm cm (demo-wafers/README.md, the invented scenario).
        choose(&client, "lots-map-quantity", "resistivity").await;
        retype(&client, "lots-map-diameter", "150").await;
        choose(&client, "lots-map-wafer", "C2-4432|01").await;
        text_until(&client, "lots-map-figures", |t| t.contains("1 of 49 sites outside")).await;
        let rows = by_testid(&client, "lots-map-table").await.find_all(Locator::Css("tbody tr")).await.expect("rows");
        let mut above = Vec::new();
        for r in rows {
            let text = r.prop("textContent").await.ok().flatten().unwrap_or_default();
            if text.ends_with("above max") {
                above.push(text);
            }
        }
        assert_eq!(above.len(), 1, "{above:?}");
        assert!(above[0].starts_with("35"), "{above:?}");
        run_script(
            &client,
            "document.querySelector('[data-testid=\"lots-map\"]').scrollIntoView({block: 'center'});",
        )
        .await;
        screenshot(&client, "map-hot-spot-1920").await;
    })
    .await;
}
