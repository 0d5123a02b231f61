//! Chart descriptions (plain data), their drawing with plotters on any backend, and their
//! CSV export. The views build a [`ChartSpec`]; `canvas.rs` puts it on a `<canvas>`.
//!
//! Log axes are drawn as linear axes over log10 of the data with decade labels: one code
//! path for every axis kind, and the clipping of curves that run off the bottom of a log
//! axis (minority carriers at low temperature) stays in our hands.

use crate::format;
use bandgauge_core::order;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::Color as _;

/// An sRGB colour.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Color(pub u8, pub u8, pub u8);

impl Color {
    fn rgb(self) -> RGBColor {
        RGBColor(self.0, self.1, self.2)
    }
}

/// The workbench palette: dark enough for 4.5:1 contrast on white, told apart by hue
/// and, where two curves may touch, by stroke as well.
pub mod palette {
    use super::Color;
    /// Electrons, n-type.
    pub const ELECTRONS: Color = Color(0x1c, 0x5a, 0xa6);
    /// Holes, p-type.
    pub const HOLES: Color = Color(0xb0, 0x32, 0x28);
    /// Intrinsic density, mid-gap.
    pub const INTRINSIC: Color = Color(0x59, 0x59, 0x59);
    /// The Fermi level.
    pub const FERMI: Color = Color(0x1b, 0x7a, 0x36);
    /// Band edges.
    pub const BAND: Color = Color(0x1a, 0x1a, 0x1a);
    /// Colours for a list of species or models, in order.
    pub const CYCLE: [Color; 6] = [
        Color(0x1c, 0x5a, 0xa6),
        Color(0xb0, 0x32, 0x28),
        Color(0x1b, 0x7a, 0x36),
        Color(0x7a, 0x3e, 0x9d),
        Color(0x9a, 0x5b, 0x00),
        Color(0x00, 0x74, 0x7a),
    ];

    /// The `i`-th colour of [`CYCLE`], wrapping.
    pub fn nth(i: usize) -> Color {
        CYCLE[i % CYCLE.len()]
    }
}

/// One axis.
#[derive(Clone, Debug, PartialEq)]
pub struct Axis {
    /// Label with unit, e.g. `1000/T (1/K)`.
    pub label: String,
    /// Logarithmic (base 10) axis.
    pub log: bool,
    /// Fixed range in data units; `None` fits the data.
    pub range: Option<(f64, f64)>,
    /// Hide ticks and labels (the position axis of the band diagram has no meaning).
    pub hidden: bool,
    /// Names of the categories at positions 1, 2, ... n, written as the tick labels instead of
    /// numbers (every k-th when they would overlap); empty for a numeric axis.
    pub categories: Vec<String>,
}

impl Axis {
    /// A linear axis fitted to the data.
    pub fn linear(label: &str) -> Axis {
        Axis {
            label: label.into(),
            log: false,
            range: None,
            hidden: false,
            categories: Vec::new(),
        }
    }

    /// A category axis: `names` at positions 1, 2, ... n (range 0.5 to n + 0.5), each written
    /// under its position.
    pub fn categories(label: &str, names: Vec<String>) -> Axis {
        let right = names.len() as f64 + 0.5;
        Axis {
            categories: names,
            ..Axis::linear(label)
        }
        .with_range(0.5, right)
    }

    /// A log axis fitted to the data.
    pub fn log(label: &str) -> Axis {
        Axis {
            label: label.into(),
            log: true,
            range: None,
            hidden: false,
            categories: Vec::new(),
        }
    }

    /// The same axis with a fixed range.
    pub fn with_range(mut self, lo: f64, hi: f64) -> Axis {
        self.range = Some((lo, hi));
        self
    }

    /// A data value on the drawn (possibly log10) scale; `None` if it cannot be drawn.
    fn to_scale(&self, v: f64) -> Option<f64> {
        let s = if self.log {
            if v > 0.0 { v.log10() } else { return None }
        } else {
            v
        };
        s.is_finite().then_some(s)
    }
}

/// Line style of a series.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Stroke {
    /// Continuous line.
    Solid,
    /// Dashed line.
    Dashed,
}

/// One curve (or, with two points, one level line).
#[derive(Clone, Debug, PartialEq)]
pub struct Series {
    /// Legend and CSV column name.
    pub name: String,
    /// Data points in data units.
    pub points: Vec<(f64, f64)>,
    /// Colour.
    pub color: Color,
    /// Stroke.
    pub stroke: Stroke,
    /// Text written at the right end of the curve (band diagram levels).
    pub end_label: Option<String>,
    /// Listed in the legend.
    pub in_legend: bool,
}

impl Series {
    /// A solid curve listed in the legend.
    pub fn line(name: &str, points: Vec<(f64, f64)>, color: Color) -> Series {
        Series {
            name: name.into(),
            points,
            color,
            stroke: Stroke::Solid,
            end_label: None,
            in_legend: true,
        }
    }

    /// The same series dashed.
    pub fn dashed(mut self) -> Series {
        self.stroke = Stroke::Dashed;
        self
    }
}

/// The shape of a [`Mark::Symbol`]: shapes that stay apart in greyscale and for colour-blind
/// readers, so a meaning given by colour is also given by shape.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Shape {
    /// A filled disc.
    Circle,
    /// A filled triangle, point up.
    Triangle,
    /// A diagonal cross.
    Cross,
    /// An open diamond.
    Diamond,
}

/// An annotation that is not a data series.
#[derive(Clone, Debug, PartialEq)]
pub enum Mark {
    /// A vertical line across the plot at `x` (the current temperature).
    Vertical {
        /// Position in data units.
        x: f64,
        /// Text beside the line.
        label: String,
    },
    /// A single emphasised point (the current sample on a curve).
    Point {
        /// x in data units.
        x: f64,
        /// y in data units.
        y: f64,
        /// Text beside the point.
        label: String,
        /// Colour.
        color: Color,
    },
    /// A symbol without text: its shape and colour carry its meaning, told in words by `key`
    /// in the key row under the plot (symbols sharing a key are listed once).
    Symbol {
        /// x in data units.
        x: f64,
        /// y in data units.
        y: f64,
        /// Shape.
        shape: Shape,
        /// Colour.
        color: Color,
        /// Drawn large (a lot's median) rather than small (one wafer among many).
        large: bool,
        /// Meaning, for the key row; empty: not in the key.
        key: String,
    },
    /// A box from `lo` to `hi` centred on `x`, with a tick across it at `mid`.
    Span {
        /// Centre in data units.
        x: f64,
        /// Half the box width in data units.
        half_width: f64,
        /// Lower end in data units.
        lo: f64,
        /// Upper end in data units.
        hi: f64,
        /// The tick across the box, if any.
        mid: Option<f64>,
        /// Colour.
        color: Color,
    },
}

/// Least width (CSS pixels) per category of a category axis; a chart with more categories than
/// fit at this width is drawn wider than its panel, which then scrolls.
pub const MIN_CATEGORY_PX: u32 = 56;
/// Room (CSS pixels) around the plot of a category chart: the y axis and the right margin.
const CATEGORY_CHART_FRAME_PX: u32 = 180;

impl ChartSpec {
    /// The least width (CSS pixels) at which every category keeps [`MIN_CATEGORY_PX`]; `None`
    /// for a chart without a category axis.
    pub fn min_width_css(&self) -> Option<u32> {
        let n = u32::try_from(self.x.categories.len()).ok()?;
        (n > 0).then(|| n.saturating_mul(MIN_CATEGORY_PX) + CATEGORY_CHART_FRAME_PX)
    }
}

/// Every how many categories a label is written so that labels `widest` pixels wide (gap
/// included) never overlap when categories are `slot` pixels apart: 1 when they all fit.
fn category_step(widest: i32, slot: i32) -> usize {
    if slot <= 0 {
        return usize::MAX;
    }
    usize::try_from((widest + slot - 1) / slot)
        .unwrap_or(1)
        .max(1)
}

/// The distinct keys of the symbols, in the order they first appear.
fn symbol_keys(marks: &[Mark]) -> Vec<(&str, Shape, Color)> {
    let mut keys: Vec<(&str, Shape, Color)> = Vec::new();
    for mark in marks {
        if let Mark::Symbol {
            key, shape, color, ..
        } = mark
            && !key.is_empty()
            && !keys.iter().any(|k| k.0 == key)
        {
            keys.push((key.as_str(), *shape, *color));
        }
    }
    keys
}

/// Draws a symbol centred at `at` (pixels), `r` pixels from centre to edge.
fn draw_symbol<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    at: (i32, i32),
    shape: Shape,
    r: i32,
    color: Color,
    stroke: u32,
) -> Result<(), DrawingAreaErrorKind<DB::ErrorType>> {
    let c = color.rgb();
    let line = ShapeStyle::from(&c).stroke_width(stroke);
    let (x, y) = at;
    match shape {
        Shape::Circle => area.draw(&Circle::new(at, r, ShapeStyle::from(&c).filled())),
        Shape::Triangle => {
            // A little larger than the disc, so both cover about the same area.
            let t = r * 6 / 5;
            area.draw(&Polygon::new(
                vec![
                    (x, y - t),
                    (x + t * 7 / 8, y + t / 2),
                    (x - t * 7 / 8, y + t / 2),
                ],
                ShapeStyle::from(&c).filled(),
            ))
        }
        Shape::Cross => {
            area.draw(&PathElement::new(
                vec![(x - r, y - r), (x + r, y + r)],
                line,
            ))?;
            area.draw(&PathElement::new(
                vec![(x - r, y + r), (x + r, y - r)],
                line,
            ))
        }
        Shape::Diamond => {
            let corners = vec![(x, y - r), (x + r, y), (x, y + r), (x - r, y), (x, y - r)];
            area.draw(&Polygon::new(
                corners.clone(),
                ShapeStyle::from(&WHITE).filled(),
            ))?;
            area.draw(&PathElement::new(corners, line))
        }
    }
}

/// Where the legend sits.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Corner {
    /// Upper left.
    TopLeft,
    /// Upper right.
    TopRight,
    /// Lower left.
    BottomLeft,
    /// Lower right.
    BottomRight,
}

/// Everything needed to draw a chart and export its data.
#[derive(Clone, Debug, PartialEq)]
pub struct ChartSpec {
    /// Title above the plot.
    pub title: String,
    /// File name stem for PNG and CSV downloads.
    pub file_stem: String,
    /// Horizontal axis.
    pub x: Axis,
    /// Vertical axis.
    pub y: Axis,
    /// Curves.
    pub series: Vec<Series>,
    /// Annotations.
    pub marks: Vec<Mark>,
    /// Legend position.
    pub legend: Corner,
}

/// The drawn range of an axis over the spec's data, on the drawn scale.
fn scale_range(axis: &Axis, values: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    if let Some((lo, hi)) = axis.range {
        return Some((axis.to_scale(lo)?, axis.to_scale(hi)?));
    }
    let (lo, hi) = values
        .filter_map(|v| axis.to_scale(v))
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
            (lo.min(v), hi.max(v))
        });
    if !(lo.is_finite() && hi.is_finite()) {
        return None;
    }
    // A flat curve still needs a visible range: half a decade or 5 % around the value.
    let pad = if hi > lo {
        0.04 * (hi - lo)
    } else if axis.log {
        0.5
    } else {
        0.05 * lo.abs().max(1e-3)
    };
    Some((lo - pad, hi + pad))
}

/// Splits a curve (on the drawn scale) into pieces inside `[lo, hi]` vertically, with the
/// crossing points interpolated, so a curve leaving the plot ends at its edge.
fn clip_vertically(points: &[(f64, f64)], lo: f64, hi: f64) -> Vec<Vec<(f64, f64)>> {
    let inside = |y: f64| (lo..=hi).contains(&y);
    let cross = |a: (f64, f64), b: (f64, f64)| {
        let edge = if a.1.max(b.1) > hi && (a.1 > hi) != (b.1 > hi) {
            hi
        } else {
            lo
        };
        let t = (edge - a.1) / (b.1 - a.1);
        (a.0 + t * (b.0 - a.0), edge)
    };
    let mut pieces = Vec::new();
    let mut current: Vec<(f64, f64)> = Vec::new();
    let mut previous: Option<(f64, f64)> = None;
    for &p in points {
        match previous {
            Some(q) if inside(q.1) && !inside(p.1) => {
                current.push(cross(q, p));
                pieces.push(std::mem::take(&mut current));
            }
            Some(q) if !inside(q.1) && inside(p.1) => {
                current.push(cross(q, p));
                current.push(p);
            }
            _ if inside(p.1) => current.push(p),
            _ => {}
        }
        previous = Some(p);
    }
    if !current.is_empty() {
        pieces.push(current);
    }
    pieces
}

/// The curves of a series on the drawn scale, clipped to the vertical range.
fn drawn_pieces(spec: &ChartSpec, series: &Series, y_range: (f64, f64)) -> Vec<Vec<(f64, f64)>> {
    let mut pieces = Vec::new();
    let mut run = Vec::new();
    // A point that cannot be drawn (zero on a log axis, NaN) breaks the curve.
    for &(x, y) in &series.points {
        match (spec.x.to_scale(x), spec.y.to_scale(y)) {
            (Some(x), Some(y)) => run.push((x, y)),
            _ => pieces.push(std::mem::take(&mut run)),
        }
    }
    pieces.push(run);
    pieces
        .iter()
        .flat_map(|p| clip_vertically(p, y_range.0, y_range.1))
        .filter(|p| !p.is_empty())
        .collect()
}

/// Draws `spec` on `area`; `px` is the number of backend pixels per CSS pixel, so text,
/// lines and margins keep their size on high-DPI screens.
pub fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &ChartSpec,
    px: f64,
) -> Result<(), String> {
    let err = |e: DrawingAreaErrorKind<DB::ErrorType>| format!("chart '{}': {e}", spec.title);
    let size = |css: f64| (css * px).round() as u32;
    let font = |css: f64| (FontFamily::SansSerif, css * px);
    area.fill(&WHITE).map_err(err)?;

    let xs = spec
        .series
        .iter()
        .flat_map(|s| s.points.iter().map(|p| p.0));
    let ys = spec
        .series
        .iter()
        .flat_map(|s| s.points.iter().map(|p| p.1));
    let marks_x = spec.marks.iter().map(|m| match m {
        Mark::Vertical { x, .. }
        | Mark::Point { x, .. }
        | Mark::Symbol { x, .. }
        | Mark::Span { x, .. } => *x,
    });
    let (Some(x_range), Some(y_range)) = (
        scale_range(&spec.x, xs.chain(marks_x)),
        scale_range(&spec.y, ys),
    ) else {
        let style = TextStyle::from(font(14.0)).color(&BLACK);
        area.draw_text(
            &format!("{}: no data to draw", spec.title),
            &style,
            (size(12.0) as i32, size(12.0) as i32),
        )
        .map_err(err)?;
        return Ok(());
    };

    let keys = symbol_keys(&spec.marks);
    let categories = !spec.x.categories.is_empty();
    let x_label_room = if spec.x.hidden {
        8.0
    } else if categories {
        // One row of names; the axis name is left out (the names say what they are).
        24.0
    } else {
        44.0
    } + if keys.is_empty() { 0.0 } else { KEY_ROW_PX };
    let mut builder = ChartBuilder::on(area);
    builder
        .margin(size(10.0))
        .margin_right(size(if spec.series.iter().any(|s| s.end_label.is_some()) {
            90.0
        } else {
            18.0
        }))
        .x_label_area_size(size(x_label_room))
        .y_label_area_size(size(72.0));
    if categories {
        // A category chart may be wider than its panel: its title starts at the left, where
        // the panel opens, instead of centred out of view.
        builder.margin_top(size(10.0 + TITLE_ROW_PX));
        let style = TextStyle::from(font(15.0)).color(&BLACK);
        area.draw_text(&spec.title, &style, (size(12.0) as i32, size(10.0) as i32))
            .map_err(err)?;
    } else {
        builder.caption(&spec.title, font(15.0));
    }
    let mut chart = builder
        .build_cartesian_2d(x_range.0..x_range.1, y_range.0..y_range.1)
        .map_err(err)?;

    let x_fmt = |v: &f64| {
        if spec.x.log {
            format::log_tick(*v)
        } else {
            format::linear_tick(*v)
        }
    };
    let y_fmt = |v: &f64| {
        if spec.y.log {
            format::log_tick(*v)
        } else {
            format::linear_tick(*v)
        }
    };
    let mut mesh = chart.configure_mesh();
    mesh.x_desc(&spec.x.label)
        .y_desc(&spec.y.label)
        .x_label_formatter(&x_fmt)
        .y_label_formatter(&y_fmt)
        .x_labels(if spec.x.log { 12 } else { 8 })
        .y_labels(if spec.y.log { 12 } else { 8 })
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        // Major grid lines only: the minor ones crowd a chart this size.
        .max_light_lines(0)
        .bold_line_style(RGBColor(0xdd, 0xdd, 0xdd))
        .axis_style(ShapeStyle::from(&RGBColor(0x33, 0x33, 0x33)).stroke_width(size(1.0).max(1)));
    if spec.x.hidden {
        mesh.disable_x_axis().disable_x_mesh();
    }
    if categories {
        // The names are written below, one per category, instead of numeric ticks.
        mesh.disable_x_mesh().x_labels(0).x_desc("");
    }
    mesh.draw().map_err(err)?;

    if categories {
        let style = TextStyle::from(font(12.0)).color(&RGBColor(0x22, 0x22, 0x22));
        let first = chart.backend_coord(&(1.0, y_range.0));
        let slot = chart.backend_coord(&(2.0, y_range.0)).0 - first.0;
        let widths = spec
            .x
            .categories
            .iter()
            .map(|name| {
                area.estimate_text_size(name, &style)
                    .map(|(w, _)| i32::try_from(w).unwrap_or(i32::MAX))
            })
            .collect::<Result<Vec<i32>, _>>()
            .map_err(err)?;
        let widest = widths.iter().copied().max().unwrap_or(0) + size(8.0) as i32;
        let step = if widths.len() > 1 {
            category_step(widest, slot)
        } else {
            1
        };
        for (i, (name, w)) in spec.x.categories.iter().zip(&widths).enumerate() {
            if i % step != 0 {
                continue;
            }
            let at = chart.backend_coord(&((i + 1) as f64, y_range.0));
            area.draw_text(name, &style, (at.0 - w / 2, at.1 + size(6.0) as i32))
                .map_err(err)?;
        }
    }
    if !keys.is_empty() {
        let style = TextStyle::from(font(12.0)).color(&RGBColor(0x22, 0x22, 0x22));
        let (left, _) = chart.backend_coord(&(x_range.0, y_range.0));
        let (_, height) = area.dim_in_pixel();
        let y = i32::try_from(height).unwrap_or(i32::MAX) - size(KEY_ROW_PX / 2.0) as i32;
        let r = size(5.0) as i32;
        let mut x = left;
        for (text, shape, color) in &keys {
            draw_symbol(area, (x + r, y), *shape, r, *color, size(2.0).max(1)).map_err(err)?;
            area.draw_text(
                text,
                &style,
                (x + 2 * r + size(5.0) as i32, y - size(7.0) as i32),
            )
            .map_err(err)?;
            let (w, _) = area.estimate_text_size(text, &style).map_err(err)?;
            x += 2 * r + size(5.0 + 16.0) as i32 + i32::try_from(w).unwrap_or(0);
        }
    }

    let line_width = size(2.0).max(1);
    let mut end_labels: Vec<(&str, Color, (i32, i32))> = Vec::new();
    let mut legend: Vec<(&str, Color, bool)> = Vec::new();
    for series in &spec.series {
        let style = ShapeStyle::from(&series.color.rgb()).stroke_width(line_width);
        let pieces = drawn_pieces(spec, series, y_range);
        let mut first = true;
        for piece in &pieces {
            match series.stroke {
                Stroke::Solid => chart
                    .draw_series(LineSeries::new(piece.iter().copied(), style))
                    .map_err(err)?,
                Stroke::Dashed => chart
                    .draw_series(DashedLineSeries::new(
                        piece.iter().copied(),
                        size(7.0),
                        size(4.0),
                        style,
                    ))
                    .map_err(err)?,
            };
            if first && series.in_legend {
                legend.push((
                    series.name.as_str(),
                    series.color,
                    series.stroke == Stroke::Dashed,
                ));
                first = false;
            }
        }
        if let (Some(text), Some(last)) = (&series.end_label, pieces.last().and_then(|p| p.last()))
        {
            end_labels.push((text.as_str(), series.color, chart.backend_coord(last)));
        }
    }

    // Curves that end close together (EF meeting midgap when hot) would stack their labels.
    let tops: Vec<i32> = end_labels
        .iter()
        .map(|l| l.2.1 - size(7.0) as i32)
        .collect();
    let tops = spread_apart(&tops, size(14.0) as i32);
    for ((text, color, pos), top) in end_labels.iter().zip(tops) {
        let color = color.rgb();
        let style = TextStyle::from(font(12.0)).color(&color);
        area.draw_text(text, &style, (pos.0 + size(6.0) as i32, top))
            .map_err(err)?;
    }

    for mark in &spec.marks {
        match mark {
            Mark::Vertical { x, label } => {
                let Some(x) = spec.x.to_scale(*x) else {
                    continue;
                };
                let style =
                    ShapeStyle::from(&RGBColor(0x44, 0x44, 0x44)).stroke_width(size(1.0).max(1));
                chart
                    .draw_series(DashedLineSeries::new(
                        [(x, y_range.0), (x, y_range.1)],
                        size(4.0),
                        size(4.0),
                        style,
                    ))
                    .map_err(err)?;
                let pos = chart.backend_coord(&(x, y_range.1));
                let text = TextStyle::from(font(12.0)).color(&RGBColor(0x22, 0x22, 0x22));
                area.draw_text(
                    label,
                    &text,
                    (pos.0 + size(4.0) as i32, pos.1 + size(3.0) as i32),
                )
                .map_err(err)?;
            }
            Mark::Point { x, y, label, color } => {
                let (Some(x), Some(y)) = (spec.x.to_scale(*x), spec.y.to_scale(*y)) else {
                    continue;
                };
                let c = color.rgb();
                chart
                    .draw_series([
                        Circle::new((x, y), size(6.0), ShapeStyle::from(&WHITE).filled()),
                        Circle::new(
                            (x, y),
                            size(6.0),
                            ShapeStyle::from(&c).stroke_width(size(2.5).max(1)),
                        ),
                    ])
                    .map_err(err)?;
                let pos = chart.backend_coord(&(x, y));
                let text = TextStyle::from(font(12.0)).color(&c);
                area.draw_text(
                    label,
                    &text,
                    (pos.0 + size(9.0) as i32, pos.1 - size(18.0) as i32),
                )
                .map_err(err)?;
            }
            Mark::Span {
                x,
                half_width,
                lo,
                hi,
                mid,
                color,
            } => {
                let (Some(x), Some(lo), Some(hi)) = (
                    spec.x.to_scale(*x),
                    spec.y.to_scale(*lo),
                    spec.y.to_scale(*hi),
                ) else {
                    continue;
                };
                let c = color.rgb();
                let corners = [(x - half_width, lo), (x + half_width, hi)];
                chart
                    .draw_series([
                        Rectangle::new(corners, ShapeStyle::from(&WHITE).filled()),
                        Rectangle::new(corners, c.mix(0.18).filled()),
                        Rectangle::new(corners, ShapeStyle::from(&c).stroke_width(line_width)),
                    ])
                    .map_err(err)?;
                if let Some(m) = mid.and_then(|m| spec.y.to_scale(m)) {
                    let style = ShapeStyle::from(&c).stroke_width(size(3.0).max(1));
                    chart
                        .draw_series(LineSeries::new(
                            [(x - half_width, m), (x + half_width, m)],
                            style,
                        ))
                        .map_err(err)?;
                }
            }
            Mark::Symbol {
                x,
                y,
                shape,
                color,
                large,
                ..
            } => {
                let (Some(x), Some(y)) = (spec.x.to_scale(*x), spec.y.to_scale(*y)) else {
                    continue;
                };
                let (r, stroke) = if *large { (6.0, 2.5) } else { (3.0, 1.5) };
                let at = chart.backend_coord(&(x, y));
                draw_symbol(
                    area,
                    at,
                    *shape,
                    size(r) as i32,
                    *color,
                    size(stroke).max(1),
                )
                .map_err(err)?;
            }
        }
    }

    if !legend.is_empty() {
        draw_legend(
            &chart.plotting_area().strip_coord_spec(),
            &legend,
            spec.legend,
            &TextStyle::from(font(12.0)),
            (
                size(8.0) as i32,
                size(26.0) as i32,
                line_width,
                size(20.0) as i32,
            ),
        )?;
    }
    Ok(())
}

/// The legend box in a corner of the plot: a line sample and the name of each listed series, in a
/// bordered white box. Drawn here rather than by plotters's series labels, whose default font is
/// looked up by a Unicode lower-casing of its name (about 16 KB of case tables in the page).
/// `sizes` are the margin, the sample column's width, the line width and the sample's length,
/// in device pixels.
fn draw_legend<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    entries: &[(&str, Color, bool)],
    corner: Corner,
    font: &TextStyle,
    sizes: (i32, i32, u32, i32),
) -> Result<(), String> {
    let (margin, sample_width, line_width, sample) = sizes;
    let err = |e: DrawingAreaErrorKind<DB::ErrorType>| format!("legend: {e}");
    let mut text = MultiLineText::<_, &str>::new((0, 0), font);
    for (name, _, _) in entries {
        text.push_line(*name);
    }
    let font_error = |e: plotters::style::FontError| format!("legend: {e}");
    let (w, h) = text.estimate_dimension().map_err(font_error)?;
    let (w, h) = (w + sample_width + 2 * margin, h + 2 * margin);
    let (area_w, area_h) = area.dim_in_pixel();
    let (area_w, area_h) = (
        i32::try_from(area_w).unwrap_or(i32::MAX),
        i32::try_from(area_h).unwrap_or(i32::MAX),
    );
    let x = match corner {
        Corner::TopLeft | Corner::BottomLeft => 5,
        Corner::TopRight | Corner::BottomRight => area_w - w - 5,
    };
    let y = match corner {
        Corner::TopLeft | Corner::TopRight => 5,
        Corner::BottomLeft | Corner::BottomRight => area_h - h - 5,
    };
    text.relocate((x + sample_width + margin, y + margin));
    let corners = [(x, y), (x + w, y + h)];
    area.draw(&Rectangle::new(corners, WHITE.mix(0.9).filled()))
        .map_err(err)?;
    area.draw(&Rectangle::new(corners, RGBColor(0x99, 0x99, 0x99)))
        .map_err(err)?;
    area.draw(&text).map_err(err)?;
    let rows = text.compute_line_layout().map_err(font_error)?;
    for (((_, y0), (_, y1)), (_, color, dashed)) in rows.into_iter().zip(entries) {
        let (x, y) = (x + margin, (y0 + y1) / 2);
        let style = ShapeStyle::from(&color.rgb()).stroke_width(line_width);
        if *dashed {
            area.draw(&PathElement::new(vec![(x, y), (x + sample / 3, y)], style))
                .map_err(err)?;
            area.draw(&PathElement::new(
                vec![(x + 2 * sample / 3, y), (x + sample, y)],
                style,
            ))
            .map_err(err)?;
        } else {
            area.draw(&PathElement::new(vec![(x, y), (x + sample, y)], style))
                .map_err(err)?;
        }
    }
    Ok(())
}

/// Height (CSS pixels) of the key row under a plot whose symbols carry keys.
const KEY_ROW_PX: f64 = 24.0;
/// Height (CSS pixels) of the title row of a category chart.
const TITLE_ROW_PX: f64 = 22.0;

/// Moves label tops (pixels, any order) the least needed so that any two are at least `gap`
/// apart, keeping their order; returns them in the given order.
fn spread_apart(tops: &[i32], gap: i32) -> Vec<i32> {
    let order = order::sorted_positions(tops.len(), &|i, j| tops[i].cmp(&tops[j]));
    let mut placed = tops.to_vec();
    // Push down any label that crowds the one above it, then centre each crowded run on
    // where its labels wanted to be, so a pair of labels moves apart symmetrically.
    let mut run_start = 0;
    for k in 0..order.len() {
        if k > 0 && placed[order[k]] < placed[order[k - 1]] + gap {
            placed[order[k]] = placed[order[k - 1]] + gap;
        } else {
            run_start = k;
        }
        let run = &order[run_start..=k];
        let wanted: i32 = run.iter().map(|&i| tops[i]).sum::<i32>() / run.len() as i32;
        let now: i32 = run.iter().map(|&i| placed[i]).sum::<i32>() / run.len() as i32;
        let shift = (now - wanted).min(
            placed[run[0]]
                - if run_start > 0 {
                    placed[order[run_start - 1]] + gap
                } else {
                    i32::MIN / 2
                },
        );
        for &i in run {
            placed[i] -= shift.max(0);
        }
    }
    placed
}

/// Quotes a CSV cell when it holds a comma, quote or line break.
fn csv_cell(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.into()
    }
}

/// An x value as a CSV cell: on a category axis the category's name at its position (a
/// spreadsheet wants the lot, not its place on the chart), otherwise the number.
fn x_cell(spec: &ChartSpec, x: f64) -> String {
    let names = &spec.x.categories;
    if x.fract() == 0.0 && x >= 1.0 && x <= names.len() as f64 {
        csv_cell(&names[x as usize - 1])
    } else {
        format::csv_number(x)
    }
}

/// The chart's data as CSV. Series that share their x values become columns of one table
/// (what a spreadsheet wants); otherwise one row per point with the series name.
pub fn to_csv(spec: &ChartSpec) -> String {
    let data: Vec<&Series> = spec
        .series
        .iter()
        .filter(|s| !s.points.is_empty())
        .collect();
    let mut out = String::new();
    let shared_x = data.windows(2).all(|w| {
        w[0].points.len() == w[1].points.len()
            && w[0]
                .points
                .iter()
                .zip(&w[1].points)
                .all(|(a, b)| a.0 == b.0)
    });
    if shared_x && !data.is_empty() {
        let mut header = vec![csv_cell(&spec.x.label)];
        header.extend(
            data.iter()
                .map(|s| csv_cell(&format!("{} [{}]", s.name, spec.y.label))),
        );
        out.push_str(&header.join(","));
        out.push('\n');
        for (i, (x, _)) in data[0].points.iter().enumerate() {
            let mut row = vec![x_cell(spec, *x)];
            row.extend(data.iter().map(|s| format::csv_number(s.points[i].1)));
            out.push_str(&row.join(","));
            out.push('\n');
        }
    } else {
        out.push_str(&format!(
            "series,{},{}\n",
            csv_cell(&spec.x.label),
            csv_cell(&spec.y.label)
        ));
        for s in &data {
            for (x, y) in &s.points {
                out.push_str(&format!(
                    "{},{},{}\n",
                    csv_cell(&s.name),
                    x_cell(spec, *x),
                    format::csv_number(*y)
                ));
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(series: Vec<Series>) -> ChartSpec {
        ChartSpec {
            title: "t".into(),
            file_stem: "t".into(),
            x: Axis::linear("T (K)"),
            y: Axis::log("n (cm^-3)"),
            series,
            marks: vec![],
            legend: Corner::TopRight,
        }
    }

    #[test]
    fn csv_uses_columns_when_x_is_shared() {
        let s = spec(vec![
            Series::line("n", vec![(100.0, 1e15), (200.0, 2e15)], palette::ELECTRONS),
            Series::line("p, holes", vec![(100.0, 1.0), (200.0, 2.5)], palette::HOLES),
        ]);
        assert_eq!(
            to_csv(&s),
            "T (K),n [n (cm^-3)],\"p, holes [n (cm^-3)]\"\n1e2,1e15,1e0\n2e2,2e15,2.5e0\n"
        );
    }

    #[test]
    fn csv_uses_rows_when_x_differs() {
        let s = spec(vec![
            Series::line("a", vec![(1.0, 2.0)], palette::ELECTRONS),
            Series::line("b", vec![(3.0, 4.0), (5.0, 6.0)], palette::HOLES),
        ]);
        assert_eq!(
            to_csv(&s),
            "series,T (K),n (cm^-3)\na,1e0,2e0\nb,3e0,4e0\nb,5e0,6e0\n"
        );
    }

    #[test]
    fn csv_names_the_categories_at_their_positions() {
        let mut s = spec(vec![
            Series::line("a range", vec![(1.0, 2.0), (1.0, 3.0)], palette::BAND),
            Series::line("limit", vec![(0.5, 4.0), (2.5, 4.0)], palette::BAND),
        ]);
        s.x = Axis::categories("lot", vec!["A, 1".into(), "B".into()]);
        assert_eq!(
            to_csv(&s),
            "series,lot,n (cm^-3)\na range,\"A, 1\",2e0\na range,\"A, 1\",3e0\nlimit,5e-1,4e0\nlimit,2.5e0,4e0\n"
        );
    }

    #[test]
    fn csv_of_an_empty_chart_is_empty() {
        assert_eq!(to_csv(&spec(vec![])), "series,T (K),n (cm^-3)\n");
    }

    #[test]
    fn log_axis_range_ignores_values_it_cannot_draw() {
        let axis = Axis::log("n");
        let (lo, hi) =
            scale_range(&axis, [0.0, -1.0, 1e10, 1e20, f64::NAN].into_iter()).expect("range");
        assert!(lo < 10.0 && lo > 9.0 && hi > 20.0 && hi < 21.0, "{lo} {hi}");
        assert_eq!(scale_range(&axis, [0.0].into_iter()), None);
    }

    #[test]
    fn flat_data_gets_a_visible_range() {
        let (lo, hi) = scale_range(&Axis::linear("E"), [0.5, 0.5].into_iter()).expect("range");
        assert!(lo < 0.5 && hi > 0.5);
        let (lo, hi) = scale_range(&Axis::log("n"), [1e15].into_iter()).expect("range");
        assert!(lo < 15.0 && hi > 15.0);
    }

    #[test]
    fn clipping_interpolates_the_edge_crossing() {
        let pieces = clip_vertically(
            &[(0.0, 5.0), (1.0, -5.0), (2.0, -5.0), (3.0, 5.0)],
            0.0,
            10.0,
        );
        assert_eq!(
            pieces,
            vec![vec![(0.0, 5.0), (0.5, 0.0)], vec![(2.5, 0.0), (3.0, 5.0)]]
        );
        let pieces = clip_vertically(&[(0.0, 5.0), (1.0, 15.0)], 0.0, 10.0);
        assert_eq!(pieces, vec![vec![(0.0, 5.0), (0.5, 10.0)]]);
        assert!(clip_vertically(&[(0.0, -1.0), (1.0, -2.0)], 0.0, 10.0).is_empty());
    }

    #[test]
    fn crowded_labels_move_apart_and_keep_their_order() {
        assert_eq!(
            spread_apart(&[100, 50], 14),
            vec![100, 50],
            "far apart: untouched"
        );
        let placed = spread_apart(&[100, 104], 14);
        assert_eq!(placed[1] - placed[0], 14);
        assert!(
            placed[0] < 100 && placed[1] > 104,
            "a pair moves apart symmetrically: {placed:?}"
        );
        let placed = spread_apart(&[30, 10, 12, 11], 14);
        let mut sorted = placed.clone();
        sorted.sort();
        assert!(sorted.windows(2).all(|w| w[1] - w[0] >= 14), "{placed:?}");
        assert!(
            placed[1] < placed[3] && placed[3] < placed[2],
            "order kept: {placed:?}"
        );
    }

    #[test]
    fn category_labels_are_thinned_until_none_overlap() {
        // Labels 50 px wide: every one fits 60 px apart, every second 30 px apart.
        assert_eq!(category_step(50, 60), 1);
        assert_eq!(category_step(50, 50), 1);
        assert_eq!(category_step(50, 30), 2);
        assert_eq!(category_step(50, 7), 8);
        for (widest, slot) in [(50, 30), (83, 11), (120, 56), (5, 1)] {
            let step = category_step(widest, slot);
            assert!(step as i32 * slot >= widest, "{widest} {slot} -> {step}");
            assert!(step == 1 || (step as i32 - 1) * slot < widest, "least step");
        }
        assert_eq!(category_step(50, 0), usize::MAX);
    }

    #[test]
    fn a_category_axis_spans_its_names_and_asks_for_room() {
        let names: Vec<String> = (1..=24).map(|i| format!("L-{i}")).collect();
        let mut s = spec(vec![]);
        s.x = Axis::categories("lot", names);
        assert_eq!(s.x.range, Some((0.5, 24.5)));
        assert_eq!(
            s.min_width_css(),
            Some(24 * MIN_CATEGORY_PX + CATEGORY_CHART_FRAME_PX)
        );
        assert_eq!(spec(vec![]).min_width_css(), None);
    }

    #[test]
    fn symbols_sharing_a_key_are_listed_once_in_order() {
        let symbol = |key: &str, shape| Mark::Symbol {
            x: 1.0,
            y: 1.0,
            shape,
            color: palette::BAND,
            large: true,
            key: key.into(),
        };
        let marks = [
            symbol("fail", Shape::Cross),
            symbol("", Shape::Circle),
            symbol("pass", Shape::Circle),
            symbol("fail", Shape::Cross),
        ];
        let keys: Vec<&str> = symbol_keys(&marks).into_iter().map(|k| k.0).collect();
        assert_eq!(keys, ["fail", "pass"]);
    }

    #[test]
    fn undrawable_points_break_the_curve() {
        let s = spec(vec![Series::line(
            "n",
            vec![(1.0, 1e3), (2.0, 0.0), (3.0, 1e4), (4.0, 1e5)],
            palette::ELECTRONS,
        )]);
        let pieces = drawn_pieces(&s, &s.series[0], (0.0, 10.0));
        assert_eq!(pieces, vec![vec![(1.0, 3.0)], vec![(3.0, 4.0), (4.0, 5.0)]]);
    }
}
