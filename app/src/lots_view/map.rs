//! The wafer map of the lots view: which quantity it colours, the wafer outline (diameter from
//! the setting, the file, or the site positions), the radial profile chart, the uniformity
//! figures, and the [`MapPanel`] component (canvas, focusable sites, table alternative).

use bandgauge_core::lots::map::{
    self, MAP_DEFINITIONS, RadialProfile, Uniformity, infer_diameter_mm, radial_profile, uniformity,
};
use bandgauge_core::lots::{SpecQuantity, SpecWindow, parse_diameter_mm};
use bandgauge_core::order;
use leptos::prelude::*;

use super::charts::site_side;
use super::work::SitePoint;
use crate::browser;
use crate::chart::{Axis, ChartSpec, Color, Corner, Mark, Series, Shape, palette};
use crate::colormap;
use crate::format;
use crate::wafer_map::{self, MapSite, MapSpec, Side};

/// What the map colours.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum MapQuantity {
    /// Resistivity, ohm cm.
    #[default]
    Resistivity,
    /// Sheet resistance, ohm/sq (rows that give one).
    SheetResistance,
    /// Dopant density, cm^-3.
    Density,
}

impl MapQuantity {
    /// Every choice, in menu order.
    pub const ALL: [MapQuantity; 3] = [
        MapQuantity::Resistivity,
        MapQuantity::SheetResistance,
        MapQuantity::Density,
    ];

    /// The menu value.
    pub fn id(self) -> &'static str {
        match self {
            MapQuantity::Resistivity => "resistivity",
            MapQuantity::SheetResistance => "sheet-resistance",
            MapQuantity::Density => "density",
        }
    }

    /// From a menu value (anything else: resistivity).
    pub fn from_id(id: &str) -> MapQuantity {
        MapQuantity::ALL
            .into_iter()
            .find(|q| q.id() == id)
            .unwrap_or_default()
    }

    /// Name as shown.
    pub fn name(self) -> &'static str {
        match self {
            MapQuantity::Resistivity => "Resistivity",
            MapQuantity::SheetResistance => "Sheet resistance",
            MapQuantity::Density => "Dopant density",
        }
    }

    /// Unit as shown.
    pub fn unit(self) -> &'static str {
        match self {
            MapQuantity::Resistivity => "ohm cm",
            MapQuantity::SheetResistance => "ohm/sq",
            MapQuantity::Density => "cm^-3",
        }
    }

    /// The value of a site, when it has one.
    pub fn of(self, s: &SitePoint) -> Option<f64> {
        match self {
            MapQuantity::Resistivity => Some(s.resistivity_ohm_cm),
            MapQuantity::SheetResistance => s.sheet_ohm_sq,
            MapQuantity::Density => Some(s.density_cm3),
        }
    }

    /// The spec window's quantity, when it is this one.
    fn spec_quantity(self) -> Option<SpecQuantity> {
        match self {
            MapQuantity::Resistivity => Some(SpecQuantity::Resistivity),
            MapQuantity::Density => Some(SpecQuantity::Density),
            MapQuantity::SheetResistance => None,
        }
    }
}

/// The definitions of the map's figures, as shown under "How the figures are defined".
pub fn map_definitions() -> [(&'static str, &'static str); 6] {
    [
        ("std/mean", MAP_DEFINITIONS.std_over_mean),
        ("(max-min)/(max+min)", MAP_DEFINITIONS.range_over_sum),
        ("(max-min)/mean", MAP_DEFINITIONS.range_over_mean),
        ("centre to edge", MAP_DEFINITIONS.centre_to_edge),
        ("filled surface", MAP_DEFINITIONS.interpolation),
        ("colour scale", colormap::DESCRIPTION),
    ]
}

/// The positioned sites of one wafer with a value of `quantity`: (site, x, y, value).
fn wafer_sites<'a>(
    sites: &'a [SitePoint],
    lot: &'a str,
    wafer: &'a str,
    quantity: MapQuantity,
) -> impl Iterator<Item = (&'a SitePoint, f64, f64, f64)> + 'a {
    sites
        .iter()
        .filter(move |s| *s.lot == *lot && *s.wafer == *wafer)
        .filter_map(move |s| Some((s, s.x_mm?, s.y_mm?, quantity.of(s)?)))
}

/// Reads the diameter field: empty for none (the file's or the inferred one), else as the lot
/// files' `# diameter:` setting (`lots::parse_diameter_mm`: bare numbers in mm).
pub fn parse_diameter(text: &str) -> Result<Option<f64>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    parse_diameter_mm(t).map(Some).map_err(|e| {
        format!("Wafer diameter: {e}; or leave it empty for the file's or the inferred diameter")
    })
}

/// Where the map's diameter comes from.
fn diameter(
    setting: Option<f64>,
    from_file: Option<f64>,
    xy: &[(f64, f64)],
) -> Option<(f64, &'static str)> {
    setting
        .map(|d| (d, "as set"))
        .or(from_file.map(|d| (d, "from the file")))
        .or_else(|| infer_diameter_mm(xy).map(|d| (d, "inferred from the site positions")))
}

/// The map of one wafer: `Ok(None)` when it has no positioned sites, `Err` when none of them
/// has a value of `quantity`.
pub fn wafer_map(
    sites: &[SitePoint],
    lot: &str,
    wafer: &str,
    window: Option<&SpecWindow>,
    quantity: MapQuantity,
    diameter_setting: Option<f64>,
) -> Result<Option<MapSpec>, String> {
    let positioned = sites
        .iter()
        .filter(|s| *s.lot == *lot && *s.wafer == *wafer && s.x_mm.is_some() && s.y_mm.is_some())
        .count();
    if positioned == 0 {
        return Ok(None);
    }
    let mut map_sites = Vec::new();
    let mut outline = None;
    for (s, x, y, value) in wafer_sites(sites, lot, wafer, quantity) {
        outline.get_or_insert(s.outline);
        let side = window.map_or(Side::Unjudged, |w| {
            let judged = match w.quantity() {
                SpecQuantity::Density => s.density_cm3,
                _ => s.resistivity_ohm_cm,
            };
            match site_side(w, judged) {
                "low" => Side::Low,
                "high" => Side::High,
                _ => Side::Inside,
            }
        });
        map_sites.push(MapSite {
            name: s.site.clone(),
            x_mm: x,
            y_mm: y,
            value,
            side,
        });
    }
    if map_sites.is_empty() {
        return Err(format!(
            "wafer {wafer} of lot {lot} has no {} in its rows; choose another quantity",
            quantity.name().to_ascii_lowercase()
        ));
    }
    let outline = outline.unwrap_or_default();
    let xy: Vec<(f64, f64)> = map_sites.iter().map(|s| (s.x_mm, s.y_mm)).collect();
    let Some((diameter_mm, source)) = diameter(diameter_setting, outline.diameter_mm, &xy) else {
        return Err(format!(
            "the sites of wafer {wafer} lie farther out than a 450 mm wafer; set the diameter"
        ));
    };
    let limits = match (window, quantity.spec_quantity()) {
        (Some(w), Some(q)) if w.quantity() == q => (w.min(), w.max()),
        _ => (None, None),
    };
    let mark = outline.orientation.map_or(String::new(), |o| {
        format!(
            ", {} at {}°",
            match o.mark {
                map::OrientationMark::Notch => "notch",
                map::OrientationMark::Flat => "flat",
            },
            format::linear_tick(o.angle_deg)
        )
    });
    Ok(Some(MapSpec {
        title: format!(
            "Wafer {wafer} of lot {lot}, {}",
            quantity.name().to_ascii_lowercase()
        ),
        file_stem: format!("bandgauge-wafer-map-{lot}-{wafer}"),
        quantity: quantity.name().into(),
        unit: quantity.unit().into(),
        diameter_mm,
        orientation: outline.orientation,
        sites: map_sites,
        limits,
        caption: format!(
            "{} mm wafer ({source}{mark}); filled: Delaunay triangles, linear between sites",
            format::linear_tick(diameter_mm)
        ),
    }))
}

/// The uniformity figures and the radial profile of a map's sites.
pub fn figures(map: &MapSpec) -> (Option<Uniformity>, Option<RadialProfile>) {
    let values: Vec<f64> = map.sites.iter().map(|s| s.value).collect();
    let points: Vec<(f64, f64, f64)> = map
        .sites
        .iter()
        .map(|s| (s.x_mm, s.y_mm, s.value))
        .collect();
    (uniformity(&values), radial_profile(&points))
}

/// The figures as lines of text.
pub fn figure_lines(map: &MapSpec) -> Vec<String> {
    let (u, r) = figures(map);
    let mut lines = Vec::new();
    if let Some(u) = u {
        lines.push(format!(
            "{} sites: mean {} {}, from {} to {}",
            u.count,
            format::auto(u.mean),
            map.unit,
            format::auto(u.min),
            format::auto(u.max)
        ));
        lines.push(format!(
            "std/mean {:.2} %; (max-min)/(max+min) {:.2} %; (max-min)/mean {:.2} %",
            u.std_over_mean_percent, u.range_over_sum_percent, u.range_over_mean_percent
        ));
    }
    match r {
        Some(r) => lines.push(format!(
            "centre to edge {:+.1} % (centre {}, edge {} {} at {} mm)",
            r.centre_to_edge_percent,
            format::auto(r.centre),
            format::auto(r.edge),
            map.unit,
            format::linear_tick((r.outer_radius_mm * 10.0).round() / 10.0)
        )),
        None => lines.push("centre to edge: needs a site at the centre and sites off it".into()),
    }
    let outside = map
        .sites
        .iter()
        .filter(|s| matches!(s.side, Side::Low | Side::High))
        .count();
    if map.sites.iter().any(|s| s.side != Side::Unjudged) {
        lines.push(format!(
            "{outside} of {} sites outside the spec window",
            map.sites.len()
        ));
    }
    lines
}

/// (x mm, y mm, value) of each positioned site of one wafer.
type Points = Vec<(f64, f64, f64)>;

/// Rounds a radius to a ring: sites within 0.5 mm of each other's radius share a ring.
fn ring_key(r: f64) -> i64 {
    (r * 2.0).round() as i64
}

/// Value against radius: every wafer of the lot as a thin grey line through its ring means,
/// the chosen wafer in colour with a symbol at each site; the title gives its centre-to-edge
/// change.
pub fn radial_chart(
    sites: &[SitePoint],
    lot: &str,
    wafer: &str,
    quantity: MapQuantity,
) -> Option<ChartSpec> {
    // One pass over the sites: each wafer's positioned values, wafers in file order (a lot's
    // sites come wafer by wafer, so the last group is nearly always the one to extend).
    let mut groups: Vec<(&str, Points)> = Vec::new();
    for s in sites.iter().filter(|s| *s.lot == *lot) {
        let (Some(x), Some(y), Some(v)) = (s.x_mm, s.y_mm, quantity.of(s)) else {
            continue;
        };
        let at = match groups.iter().rposition(|g| g.0 == &*s.wafer) {
            Some(i) => i,
            None => {
                groups.push((&s.wafer, Vec::new()));
                groups.len() - 1
            }
        };
        groups[at].1.push((x, y, v));
    }
    let mut series = Vec::new();
    let mut marks = Vec::new();
    let mut chosen_profile = None;
    for (w, points) in groups.iter().map(|(w, p)| (*w, p.as_slice())) {
        let mut rings: Vec<(i64, f64, usize)> = Vec::new();
        for &(x, y, v) in points {
            let key = ring_key(x.hypot(y));
            match rings.iter_mut().find(|r| r.0 == key) {
                Some(r) => {
                    r.1 += v;
                    r.2 += 1;
                }
                None => rings.push((key, v, 1)),
            }
        }
        order::sort_by(&mut rings, &|a, b| a.0.cmp(&b.0));
        let line: Vec<(f64, f64)> = rings
            .iter()
            .map(|&(k, sum, n)| (k as f64 / 2.0, sum / n as f64))
            .collect();
        if w == wafer {
            chosen_profile = radial_profile(points);
            for &(x, y, v) in points {
                marks.push(Mark::Symbol {
                    x: x.hypot(y),
                    y: v,
                    shape: Shape::Circle,
                    color: palette::ELECTRONS,
                    large: false,
                    key: format!("a site of wafer {wafer}"),
                });
            }
            series.push(Series::line(
                &format!("wafer {w}, ring means"),
                line,
                palette::ELECTRONS,
            ));
        } else {
            let mut s = Series::line(&format!("wafer {w}"), line, Color(0xb4, 0xb4, 0xb4));
            s.in_legend = false;
            series.insert(0, s);
        }
    }
    if marks.is_empty() {
        return None;
    }
    let change = chosen_profile.map_or(String::new(), |p| {
        format!(", centre to edge {:+.1} %", p.centre_to_edge_percent)
    });
    Some(ChartSpec {
        title: format!(
            "Radial profile, wafer {wafer} of lot {lot}{change} (grey: the lot's other wafers)"
        ),
        file_stem: format!("bandgauge-radial-{lot}-{wafer}"),
        x: Axis::linear("radius, mm"),
        y: Axis::linear(&format!(
            "{}, {}",
            quantity.name().to_ascii_lowercase(),
            quantity.unit()
        )),
        series,
        marks,
        legend: Corner::TopRight,
    })
}

/// The map on a canvas with each site a focusable button over it (hover or focus shows its
/// value), PNG and CSV buttons, the figures, and the sites as a table for screen readers.
#[component]
pub fn MapPanel(
    /// The map; `None` while nothing can be drawn.
    spec: Signal<Option<MapSpec>>,
    /// Any change forces a redraw (window resize).
    layout: ReadSignal<u32>,
    /// Time at which the input that caused this redraw arrived (ms since page load).
    input_at: ReadSignal<f64>,
) -> impl IntoView {
    let canvas = NodeRef::<leptos::html::Canvas>::new();
    let failure = RwSignal::new(None::<String>);
    // Each site's place on the canvas, CSS pixels, after the last draw.
    let places = RwSignal::new(Vec::<(f64, f64)>::new());
    let tip = RwSignal::new(None::<usize>);
    Effect::new(move |_| {
        layout.track();
        let Some(element) = canvas.get() else { return };
        let Some(spec) = spec.get() else { return };
        let started = browser::now_ms();
        match browser::draw_map(&element, &spec) {
            Ok(p) => {
                places.set(p);
                failure.set(None);
            }
            Err(e) => failure.set(Some(e)),
        }
        browser::publish_map_ms(browser::now_ms() - started);
        browser::publish_redraw_ms(browser::now_ms() - input_at.get_untracked());
    });
    let save_png = move |_| {
        if let (Some(element), Some(spec)) = (canvas.get_untracked(), spec.get_untracked()) {
            failure.set(browser::download_png(&element, &spec.file_stem).err());
        }
    };
    let save_csv = move |_| {
        if let Some(spec) = spec.get_untracked() {
            let csv = wafer_map::to_csv(&spec);
            failure.set(
                browser::download_text(&csv, "text/csv", &format!("{}.csv", spec.file_stem)).err(),
            );
        }
    };
    let title = move || spec.with(|s| s.as_ref().map(|s| s.title.clone()).unwrap_or_default());
    let describe = move |i: usize| {
        spec.with(|s| {
            let s = s.as_ref()?;
            let site = s.sites.get(i)?;
            let side = match site.side.words() {
                "" => String::new(),
                w => format!(", {w}"),
            };
            Some(format!(
                "site {}: {} {} at x {} mm, y {} mm{side}",
                site.name,
                format::auto(site.value),
                s.unit,
                format::auto(site.x_mm),
                format::auto(site.y_mm)
            ))
        })
    };
    let buttons = move || {
        let p = places.get();
        p.into_iter()
            .enumerate()
            .map(|(i, (x, y))| {
                let label = describe(i).unwrap_or_default();
                view! {
                    <button type="button" class="map-site" data-testid="lots-map-site"
                        style:left=format!("{x:.1}px") style:top=format!("{y:.1}px")
                        aria-label=label
                        on:mouseenter=move |_| tip.set(Some(i))
                        on:focus=move |_| tip.set(Some(i))
                        on:mouseleave=move |_| tip.set(None)
                        on:blur=move |_| tip.set(None)></button>
                }
            })
            .collect_view()
    };
    let tip_view = move || {
        let i = tip.get()?;
        let (x, y) = places.with(|p| p.get(i).copied())?;
        let text = describe(i)?;
        Some(view! {
            <div class="map-tip" role="status" data-testid="lots-map-tip"
                style:left=format!("{:.1}px", x + 12.0) style:top=format!("{:.1}px", y - 12.0)>{text}</div>
        })
    };
    let lines = move || spec.with(|s| s.as_ref().map(figure_lines).unwrap_or_default());
    let rows = move || {
        spec.with(|s| {
            s.as_ref()
                .map(|s| {
                    s.sites
                        .iter()
                        .map(|site| {
                            view! {
                                <tr>
                                    <th scope="row">{site.name.clone()}</th>
                                    <td>{format::auto(site.x_mm)}</td>
                                    <td>{format::auto(site.y_mm)}</td>
                                    <td>{format::auto(site.value)}</td>
                                    <td>{site.side.words()}</td>
                                </tr>
                            }
                        })
                        .collect_view()
                })
                .unwrap_or_default()
        })
    };
    let unit = move || {
        spec.with(|s| {
            s.as_ref()
                .map(|s| format!("{}, {}", s.quantity, s.unit))
                .unwrap_or_default()
        })
    };
    view! {
        <figure class="chart wafer-map">
            <div class="map-stage">
                <canvas node_ref=canvas data-testid="lots-map" role="img" aria-label=title></canvas>
                {buttons}
                {tip_view}
            </div>
            <figcaption>
                <button type="button" data-testid="lots-map-png" on:click=save_png
                    aria-label=move || format!("Save the map '{}' as PNG image", title())>"PNG"</button>
                <button type="button" data-testid="lots-map-csv" on:click=save_csv
                    aria-label=move || format!("Save the sites of map '{}' as CSV", title())>"CSV"</button>
                {move || failure.get().map(|f| view! { <span class="message">{f}</span> })}
            </figcaption>
            <ul class="map-figures" data-testid="lots-map-figures">
                {move || lines().into_iter().map(|l| view! { <li>{l}</li> }).collect_view()}
            </ul>
            <details class="chart-values">
                <summary>"The map's sites as a table"</summary>
                <div class="table-scroll">
                    <table data-testid="lots-map-table">
                        <thead><tr>
                            <th scope="col">"Site"</th><th scope="col">"x, mm"</th><th scope="col">"y, mm"</th>
                            <th scope="col">{unit}</th><th scope="col">"Spec window"</th>
                        </tr></thead>
                        <tbody>{rows}</tbody>
                    </table>
                </div>
            </details>
        </figure>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::lots_view::DEMO_FILES;
    use crate::lots_view::LotsWork;

    fn demo() -> LotsWork {
        let mut work = LotsWork::new(None);
        for (name, text) in DEMO_FILES {
            work.read_text(name, text);
        }
        work
    }

    #[test]
    fn the_radial_demo_wafer_maps_with_its_outline_and_figures() {
        let work = demo();
        let window = SpecWindow::parse(SpecQuantity::Resistivity, "8:12").unwrap();
        let map = wafer_map(
            &work.sites,
            "C2-4429",
            "04",
            Some(&window),
            MapQuantity::Resistivity,
            None,
        )
        .unwrap()
        .unwrap();
        assert_eq!(map.sites.len(), 49);
        // The demo file says `# diameter: 150 mm` and `# notch: 270` (demo-wafers/README.md).
        assert_eq!(map.diameter_mm, 150.0);
        assert!(map.caption.contains("from the file"));
        assert_eq!(map.orientation.map(|o| o.angle_deg), Some(270.0));
        // Wafer 04 runs low: its 23 outer-ring sites read below 8 ohm cm (demo README).
        let low = map.sites.iter().filter(|s| s.side == Side::Low).count();
        assert!(low >= 20, "{low}");
        assert_eq!(map.limits, (Some(8.0), Some(12.0)));
        let (u, r) = figures(&map);
        let u = u.unwrap();
        assert_eq!(u.count, 49);
        // Invented centre-high pattern: about +11 % from centre to the outer ring.
        let r = r.unwrap();
        assert!(
            (8.0..14.0).contains(&r.centre_to_edge_percent),
            "{}",
            r.centre_to_edge_percent
        );
        assert!(
            figure_lines(&map)
                .iter()
                .any(|l| l.contains("outside the spec window"))
        );
    }

    #[test]
    fn quantity_choice_and_diameter_setting() {
        let work = demo();
        // The 13-site lots give no diameter: it is inferred (150 mm for sites out to 65 mm).
        let map = wafer_map(
            &work.sites,
            "C2-4417",
            "01",
            None,
            MapQuantity::Density,
            None,
        )
        .unwrap()
        .unwrap();
        assert_eq!(map.diameter_mm, 150.0);
        assert!(map.caption.contains("inferred"));
        assert_eq!(map.unit, "cm^-3");
        let set = wafer_map(
            &work.sites,
            "C2-4417",
            "01",
            None,
            MapQuantity::Density,
            Some(200.0),
        )
        .unwrap()
        .unwrap();
        assert_eq!(set.diameter_mm, 200.0);
        assert!(set.caption.contains("as set"));
        // C2-4417 gives resistivity only: no sheet resistance to map.
        let err = wafer_map(
            &work.sites,
            "C2-4417",
            "01",
            None,
            MapQuantity::SheetResistance,
            None,
        )
        .unwrap_err();
        assert!(err.contains("sheet resistance"), "{err}");
        // C2-4418 gives sheet resistance with a thickness.
        let sheet = wafer_map(
            &work.sites,
            "C2-4418",
            "01",
            None,
            MapQuantity::SheetResistance,
            None,
        )
        .unwrap()
        .unwrap();
        assert_eq!(sheet.unit, "ohm/sq");
        assert_eq!(
            MapQuantity::from_id("sheet-resistance"),
            MapQuantity::SheetResistance
        );
        assert_eq!(MapQuantity::from_id("nonsense"), MapQuantity::Resistivity);
        assert_eq!(parse_diameter(" "), Ok(None));
        assert_eq!(parse_diameter("200 mm"), Ok(Some(200.0)));
        assert_eq!(parse_diameter("20 cm"), Ok(Some(200.0)));
        for bad in ["0", "-150", "abc", "1200", "NaN", "6 in", "150,0"] {
            let e = parse_diameter(bad).unwrap_err();
            assert!(
                e.starts_with("Wafer diameter:") && e.contains("leave it empty"),
                "{e}"
            );
        }
    }

    #[test]
    fn the_radial_chart_overlays_the_lot() {
        let work = demo();
        let chart = radial_chart(&work.sites, "C2-4429", "02", MapQuantity::Resistivity).unwrap();
        // Four wafers in the lot: three grey lines and the chosen wafer's line.
        assert_eq!(chart.series.len(), 4);
        assert_eq!(chart.marks.len(), 49);
        assert!(chart.title.contains("centre to edge +"), "{}", chart.title);
        // Ring means: centre, 22, 44, 66 mm.
        let chosen = chart.series.last().unwrap();
        let radii: Vec<f64> = chosen.points.iter().map(|p| p.0).collect();
        assert_eq!(radii, [0.0, 22.0, 44.0, 66.0]);
        assert!(chosen.points[0].1 > chosen.points[3].1);
    }
}
