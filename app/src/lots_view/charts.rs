//! The lots view's charts: the lot distribution with the spec window, and the wafer map.

use bandgauge_core::lots::{LotReport, SpecQuantity, SpecWindow, Verdict};

use super::work::SitePoint;
use crate::chart::{Axis, ChartSpec, Color, Corner, Mark, Series, palette};
use crate::format;

/// Verdict colours: told apart by hue and by the word printed beside them.
fn verdict_color(verdict: Option<Verdict>) -> Color {
    match verdict {
        Some(Verdict::Pass) => Color(0x1b, 0x6e, 0x3a),
        Some(Verdict::Marginal) => Color(0x9a, 0x5b, 0x00),
        Some(Verdict::Fail) => Color(0xb0, 0x1e, 0x2d),
        _ => Color(0x44, 0x44, 0x44),
    }
}

/// Per lot (filtered by `lot_filter` when given): the min-max range of site values as a line,
/// every wafer mean as a point, and the spec window as dashed lines.
pub fn distribution_chart(
    report: &LotReport,
    spec: Option<&SpecWindow>,
    lot_filter: Option<&str>,
) -> Option<ChartSpec> {
    let quantity = spec.map_or(SpecQuantity::Resistivity, SpecWindow::quantity);
    let lots: Vec<_> = report
        .lots
        .iter()
        .filter(|l| lot_filter.is_none_or(|f| f == l.lot))
        .collect();
    if lots.is_empty() {
        return None;
    }
    let pick = |r: &bandgauge_core::lots::Summary, d: &bandgauge_core::lots::Summary| match quantity
    {
        SpecQuantity::Density => (d.min, d.max, d.median),
        _ => (r.min, r.max, r.median),
    };
    let mut series = Vec::new();
    let mut marks = Vec::new();
    for (i, lot) in lots.iter().enumerate() {
        let x = (i + 1) as f64;
        let (min, max, median) = pick(&lot.resistivity_ohm_cm, &lot.density_cm3);
        // One neutral colour for every range: colour on this chart means a verdict.
        let mut range = Series::line(
            &format!("{} site range", lot.lot),
            vec![(x, min), (x, max)],
            palette::INTRINSIC,
        );
        range.in_legend = false;
        series.push(range);
        // The verdict is written beside the median, so it is not told by colour alone.
        let verdict = lot
            .verdict
            .map(|v| format!(" {}", v.as_str()))
            .unwrap_or_default();
        marks.push(Mark::Point {
            x,
            y: median,
            label: format!("{} {}{verdict}", lot.lot, format::auto(median)),
            color: verdict_color(lot.verdict),
        });
        // Wafer means to the left of the range, clear of the median's label on the right.
        for wafer in &lot.wafer_results {
            let mean = match quantity {
                SpecQuantity::Density => wafer.density_cm3.mean,
                _ => wafer.resistivity_ohm_cm.mean,
            };
            marks.push(Mark::Point {
                x: x - WAFER_MEAN_OFFSET,
                y: mean,
                label: String::new(),
                color: verdict_color(wafer.judgement.map(|j| j.verdict)),
            });
        }
    }
    // Room on the right for the last lot's label.
    let right = lots.len() as f64 + LABEL_ROOM;
    if let Some(window) = spec {
        for (name, limit) in [("MIN", window.min()), ("MAX", window.max())] {
            if let Some(v) = limit {
                let mut line = Series::line(
                    &format!("spec {name}"),
                    vec![(0.5, v), (right, v)],
                    SPEC_LINE_COLOR,
                )
                .dashed();
                line.end_label = Some(format!("{name} {}", format::auto(v)));
                line.in_legend = false;
                series.push(line);
            }
        }
    }
    let y_label = match quantity {
        SpecQuantity::Density => "dopant density, cm^-3",
        _ => "resistivity, ohm cm",
    };
    Some(ChartSpec {
        title: "Lots: site range (line), wafer means (left), lot median (labelled)".to_owned(),
        file_stem: "bandgauge-lots".to_owned(),
        x: categories_axis(right),
        y: Axis::linear(y_label),
        series,
        marks,
        legend: Corner::TopRight,
    })
}

/// How far left of its lot's range the wafer means sit, in lot positions.
const WAFER_MEAN_OFFSET: f64 = 0.15;
/// Room right of the last lot, in lot positions, for its label.
const LABEL_ROOM: f64 = 1.0;
/// The spec limits' colour: a dark violet, apart from the three verdict colours.
const SPEC_LINE_COLOR: Color = Color(0x5b, 0x2a, 0x86);

/// The lots' axis: positions 1, 2, ... carry no meaning as numbers (ticks such as 1.5 would
/// mislead), so it is drawn without ticks; each lot is named beside its median instead.
fn categories_axis(right: f64) -> Axis {
    let mut axis = Axis::linear("lot position").with_range(0.5, right);
    axis.hidden = true;
    axis
}

/// The sites of one wafer at their x/y positions, each labelled with its value and coloured by
/// whether it lies in the window. `None` when the wafer has no positioned sites.
pub fn wafer_map(
    sites: &[SitePoint],
    lot: &str,
    wafer: &str,
    spec: Option<&SpecWindow>,
) -> Option<ChartSpec> {
    let quantity = spec.map_or(SpecQuantity::Resistivity, SpecWindow::quantity);
    let marks: Vec<Mark> = sites
        .iter()
        .filter(|s| *s.lot == *lot && *s.wafer == *wafer)
        .filter_map(|s| {
            let (x, y) = (s.x_mm?, s.y_mm?);
            let value = match quantity {
                SpecQuantity::Density => s.density_cm3,
                _ => s.resistivity_ohm_cm,
            };
            let side = spec.map(|w| site_side(w, value));
            let verdict = side.map(|s| {
                if s.is_empty() {
                    Verdict::Pass
                } else {
                    Verdict::Fail
                }
            });
            // A site outside the window says so in words, not only in colour.
            let label = match side {
                Some(s) if !s.is_empty() => format!("{} {s}", format::auto(value)),
                _ => format::auto(value),
            };
            Some(Mark::Point {
                x,
                y,
                label,
                color: verdict_color(verdict),
            })
        })
        .collect();
    if marks.is_empty() {
        return None;
    }
    let reach = sites
        .iter()
        .filter_map(|s| Some(s.x_mm?.abs().max(s.y_mm?.abs())))
        .fold(10.0f64, f64::max);
    // Labels sit above and right of their points: more room on those sides.
    Some(ChartSpec {
        title: format!("Wafer {wafer} of lot {lot}"),
        file_stem: format!("bandgauge-wafer-{lot}-{wafer}"),
        x: Axis::linear("x, mm").with_range(-1.15 * reach, 1.5 * reach),
        y: Axis::linear("y, mm").with_range(-1.15 * reach, 1.3 * reach),
        series: Vec::new(),
        marks,
        legend: Corner::TopRight,
    })
}

/// Where a site value lies against the window: "low", "high", or "" inside.
pub(super) fn site_side(window: &SpecWindow, value: f64) -> &'static str {
    if window.contains(value) {
        ""
    } else if window.min().is_some_and(|m| value < m) {
        "low"
    } else {
        "high"
    }
}
