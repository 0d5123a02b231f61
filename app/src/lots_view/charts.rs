//! The lots view's charts: the lot distribution with the spec window (and the same in words),
//! and the wafer map.

use bandgauge_core::lots::stats::{Summary, quartiles};
use bandgauge_core::lots::{LotReport, LotSummary, SpecQuantity, SpecWindow, Verdict};

use crate::chart::{Axis, ChartSpec, Color, Corner, Mark, Series, Shape, palette};
use crate::format;

/// Verdict colours: told apart by hue, and by [`verdict_shape`] on the lot chart and the word
/// in the tables.
fn verdict_color(verdict: Option<Verdict>) -> Color {
    match verdict {
        Some(Verdict::Pass) => Color(0x1b, 0x6e, 0x3a),
        Some(Verdict::Marginal) => Color(0x9a, 0x5b, 0x00),
        Some(Verdict::Fail) => Color(0xb0, 0x1e, 0x2d),
        _ => Color(0x44, 0x44, 0x44),
    }
}

/// Verdict shapes: a verdict read in greyscale or by a colour-blind reader is still told apart.
fn verdict_shape(verdict: Option<Verdict>) -> Shape {
    match verdict {
        Some(Verdict::Pass) => Shape::Circle,
        Some(Verdict::Marginal) => Shape::Triangle,
        Some(Verdict::Fail) => Shape::Cross,
        _ => Shape::Diamond,
    }
}

/// The key-row text of a lot median's marker.
fn verdict_key(verdict: Option<Verdict>) -> String {
    match verdict {
        Some(v) => format!("lot median, {}", v.as_str()),
        None => "lot median, no verdict".to_owned(),
    }
}

/// The lots a chart shows: all, or the one `lot_filter` names.
fn shown_lots<'a>(report: &'a LotReport, lot_filter: Option<&str>) -> Vec<&'a LotSummary> {
    report
        .lots
        .iter()
        .filter(|l| lot_filter.is_none_or(|f| f == l.lot))
        .collect()
}

/// What the lot chart shows of one lot, in the quantity of the window.
struct LotFigures {
    /// The lowest and highest site value.
    site_range: (f64, f64),
    /// The lot's median over all sites.
    median: f64,
    /// Every wafer's mean with the wafer's verdict, in file order.
    wafer_means: Vec<(f64, Option<Verdict>)>,
    /// Lower quartile, median and upper quartile of the wafer means.
    quartiles: Option<(f64, f64, f64)>,
}

impl LotFigures {
    fn of(lot: &LotSummary, quantity: SpecQuantity) -> LotFigures {
        let pick = |r: &Summary, d: &Summary| match quantity {
            SpecQuantity::Density => *d,
            _ => *r,
        };
        let sites = pick(&lot.resistivity_ohm_cm, &lot.density_cm3);
        let wafer_means: Vec<(f64, Option<Verdict>)> = lot
            .wafer_results
            .iter()
            .map(|w| {
                let mean = pick(&w.resistivity_ohm_cm, &w.density_cm3).mean;
                (mean, w.judgement.map(|j| j.verdict))
            })
            .collect();
        let means: Vec<f64> = wafer_means.iter().map(|m| m.0).collect();
        LotFigures {
            site_range: (sites.min, sites.max),
            median: sites.median,
            quartiles: quartiles(&means),
            wafer_means,
        }
    }
}

/// Per lot (filtered by `lot_filter` when given), at its place on a category axis named by the
/// lots: the site range as a whisker, the middle half of the wafer means as a box with a tick at
/// the lot median, the lot median as a marker whose shape and colour give the lot verdict, and
/// the wafer means as small markers (shape and colour: the wafer verdict) spread sideways left
/// of the box; the spec window as dashed lines labelled in the right margin.
pub fn distribution_chart(
    report: &LotReport,
    spec: Option<&SpecWindow>,
    lot_filter: Option<&str>,
) -> Option<ChartSpec> {
    let quantity = spec.map_or(SpecQuantity::Resistivity, SpecWindow::quantity);
    let lots = shown_lots(report, lot_filter);
    if lots.is_empty() {
        return None;
    }
    let mut series = Vec::new();
    let mut marks = Vec::new();
    for (i, lot) in lots.iter().enumerate() {
        let x = (i + 1) as f64;
        let figures = LotFigures::of(lot, quantity);
        // One neutral colour for every whisker and box: colour on this chart means a verdict.
        let mut range = Series::line(
            &format!("{} site range", lot.lot),
            vec![(x, figures.site_range.0), (x, figures.site_range.1)],
            palette::INTRINSIC,
        );
        range.in_legend = false;
        series.push(range);
        if let Some((q1, _, q3)) = figures.quartiles {
            marks.push(Mark::Span {
                x,
                half_width: BOX_HALF_WIDTH,
                lo: q1,
                hi: q3,
                mid: Some(figures.median),
                color: palette::INTRINSIC,
            });
        }
        for (k, (mean, verdict)) in figures.wafer_means.iter().enumerate() {
            marks.push(Mark::Symbol {
                x: x - WAFER_MEANS_OFFSET + spread(k),
                y: *mean,
                shape: verdict_shape(*verdict),
                color: verdict_color(*verdict),
                large: false,
                key: String::new(),
            });
        }
        marks.push(Mark::Symbol {
            x,
            y: figures.median,
            shape: verdict_shape(lot.verdict),
            color: verdict_color(lot.verdict),
            large: true,
            key: verdict_key(lot.verdict),
        });
    }
    let right = lots.len() as f64 + 0.5;
    if let Some(window) = spec {
        for (name, limit) in [("MIN", window.min()), ("MAX", window.max())] {
            if let Some(v) = limit {
                // The line ends at the plot's right edge, so its label sits in the margin.
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
        title: "Per lot: site range (whisker), wafer means (dots), their middle half (box)"
            .to_owned(),
        file_stem: "bandgauge-lots".to_owned(),
        x: Axis::categories("lot", lots.iter().map(|l| l.lot.clone()).collect()),
        y: Axis::linear(y_label),
        series,
        marks,
        legend: Corner::TopRight,
    })
}

/// The lot chart in words, one line per lot shown: what a reader who cannot see the chart, or
/// points at one lot, needs from it (the page lists these under the chart).
pub fn distribution_lines(
    report: &LotReport,
    spec: Option<&SpecWindow>,
    lot_filter: Option<&str>,
) -> Vec<String> {
    let quantity = spec.map_or(SpecQuantity::Resistivity, SpecWindow::quantity);
    let unit = match quantity {
        SpecQuantity::Density => "cm^-3",
        _ => "ohm cm",
    };
    shown_lots(report, lot_filter)
        .into_iter()
        .map(|lot| {
            let f = LotFigures::of(lot, quantity);
            let verdict = lot.verdict.map_or("no verdict", Verdict::as_str);
            let middle = f
                .quartiles
                .map(|(q1, _, q3)| {
                    format!(
                        ", middle half of the wafer means {} to {}",
                        format::auto(q1),
                        format::auto(q3)
                    )
                })
                .unwrap_or_default();
            format!(
                "{}: {verdict}; median {} {unit}; sites {} to {}{middle}; {} wafer(s)",
                lot.lot,
                format::auto(f.median),
                format::auto(f.site_range.0),
                format::auto(f.site_range.1),
                f.wafer_means.len(),
            )
        })
        .collect()
}

/// The sideways place of the `k`-th wafer mean within its strip, in lot positions: a
/// low-discrepancy (golden-ratio) sequence, so any number of wafers spread evenly and the same
/// file always draws the same.
fn spread(k: usize) -> f64 {
    let golden = 0.618_033_988_749_895;
    ((k as f64 * golden).fract() - 0.5) * WAFER_MEANS_WIDTH
}

/// Half the width of a lot's box, in lot positions.
const BOX_HALF_WIDTH: f64 = 0.14;
/// How far left of its lot's box the strip of wafer means is centred, in lot positions.
const WAFER_MEANS_OFFSET: f64 = 0.32;
/// Width of the strip of wafer means, in lot positions.
const WAFER_MEANS_WIDTH: f64 = 0.26;
/// The spec limits' colour: a dark violet, apart from the three verdict colours.
const SPEC_LINE_COLOR: Color = Color(0x5b, 0x2a, 0x86);

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
