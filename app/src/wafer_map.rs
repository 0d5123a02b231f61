//! The wafer map as plain data ([`MapSpec`]) and its drawing: the wafer outline to scale with
//! its notch or flat, the filled surface between the sites (Delaunay-linear, from
//! `bandgauge_core::lots::map::SurfaceFit`), the sites coloured on the [`crate::colormap`]
//! scale, sites outside the spec window marked by shape, and a labelled colour bar.
//!
//! The surface is a pixel image ([`surface_pixels`], tested natively) that the browser puts on
//! the canvas first; [`draw`] then draws everything else over it with plotters.

use bandgauge_core::lots::map::{Grid, Orientation, OrientationMark, SurfaceFit};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::colormap::{self, Ramp};
use crate::format;

/// Where a site lies against the spec window.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Side {
    /// Inside the window.
    Inside,
    /// Below its minimum.
    Low,
    /// Above its maximum.
    High,
    /// No window set.
    Unjudged,
}

impl Side {
    /// "below min", "above max" or "".
    pub fn words(self) -> &'static str {
        match self {
            Side::Low => "below min",
            Side::High => "above max",
            _ => "",
        }
    }
}

/// One site of the map.
#[derive(Clone, Debug, PartialEq)]
pub struct MapSite {
    /// Site name from the file.
    pub name: String,
    /// x, mm (wafer centre at 0).
    pub x_mm: f64,
    /// y, mm.
    pub y_mm: f64,
    /// The value shown.
    pub value: f64,
    /// Against the spec window (judged on the window's own quantity).
    pub side: Side,
}

/// Everything one wafer map shows.
#[derive(Clone, Debug, PartialEq)]
pub struct MapSpec {
    /// Title over the map.
    pub title: String,
    /// File name stem for the PNG and CSV.
    pub file_stem: String,
    /// What the colour shows ("Resistivity").
    pub quantity: String,
    /// Its unit ("ohm cm").
    pub unit: String,
    /// Wafer diameter, mm.
    pub diameter_mm: f64,
    /// Notch or flat, when the file gives it.
    pub orientation: Option<Orientation>,
    /// The sites.
    pub sites: Vec<MapSite>,
    /// Spec limits in the shown quantity, when the window is on that quantity.
    pub limits: (Option<f64>, Option<f64>),
    /// The line under the map: where the diameter came from, the interpolation, the scale.
    pub caption: String,
}

impl MapSpec {
    /// The colour scale's range: the smallest and largest site value (widened by 0.5 % each
    /// way when they are equal, so a flat wafer still has a scale).
    pub fn range(&self) -> (f64, f64) {
        let (lo, hi) = self
            .sites
            .iter()
            .map(|s| s.value)
            .filter(|v| v.is_finite())
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
                (lo.min(v), hi.max(v))
            });
        if !lo.is_finite() {
            return (0.0, 1.0);
        }
        if hi - lo <= 1e-12 * hi.abs().max(1e-300) {
            let pad = 0.005 * lo.abs().max(1e-300);
            return (lo - pad, hi + pad);
        }
        (lo, hi)
    }

    /// The fitted surface, when the sites allow one (3 or more, not all on a line).
    pub fn surface(&self) -> Option<SurfaceFit> {
        let points: Vec<(f64, f64, f64)> = self
            .sites
            .iter()
            .map(|s| (s.x_mm, s.y_mm, s.value))
            .collect();
        SurfaceFit::new(&points).ok()
    }
}

/// Where the parts of a map go on a canvas, in device pixels.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MapLayout {
    /// Left edge of the map square.
    pub left: i32,
    /// Top edge of the map square.
    pub top: i32,
    /// Side of the map square (the wafer fills it but for a small margin).
    pub side: u32,
    /// Left edge of the colour bar.
    pub bar_left: i32,
    /// Top of the colour bar.
    pub bar_top: i32,
    /// Height of the colour bar.
    pub bar_height: u32,
    /// Width of the colour bar.
    pub bar_width: u32,
    /// Device pixels per CSS pixel.
    pub px: f64,
}

/// Room for the title (CSS px).
const TITLE_CSS: f64 = 30.0;
/// Room for the key and caption under the map (CSS px).
const FOOT_CSS: f64 = 44.0;
/// Room for the colour bar and its labels (CSS px).
const BAR_ROOM_CSS: f64 = 150.0;
/// The wafer's diameter is this fraction of the map square (room for the notch).
const WAFER_FILL: f64 = 0.94;

impl MapLayout {
    /// The layout on a canvas of `width` x `height` device pixels at `px` per CSS pixel.
    pub fn new(width: u32, height: u32, px: f64) -> MapLayout {
        let d = |css: f64| css * px;
        let free_w = (f64::from(width) - d(BAR_ROOM_CSS) - d(16.0)).max(d(60.0));
        let free_h = (f64::from(height) - d(TITLE_CSS) - d(FOOT_CSS)).max(d(60.0));
        let side = free_w.min(free_h).floor();
        let left = d(12.0) + ((free_w - side) / 2.0).max(0.0);
        let top = d(TITLE_CSS);
        let bar_height = (side * 0.8).max(d(40.0));
        MapLayout {
            left: left as i32,
            top: top as i32,
            side: side as u32,
            bar_left: (left + side + d(28.0)) as i32,
            bar_top: (top + (side - bar_height) / 2.0 + d(10.0)) as i32,
            bar_height: bar_height as u32,
            bar_width: d(16.0).round() as u32,
            px,
        }
    }

    /// Device pixels per mm on the wafer.
    pub fn scale(&self, diameter_mm: f64) -> f64 {
        f64::from(self.side) * WAFER_FILL / diameter_mm
    }

    /// The canvas pixel that holds the wafer point (x, y) mm.
    pub fn to_pixel(&self, diameter_mm: f64, x_mm: f64, y_mm: f64) -> (i32, i32) {
        let s = self.scale(diameter_mm);
        let half = f64::from(self.side) / 2.0;
        (
            (f64::from(self.left) + half + x_mm * s).floor() as i32,
            (f64::from(self.top) + half - y_mm * s).floor() as i32,
        )
    }
}

/// Whether the wafer point (x, y) mm lies on the wafer: inside the circle and, for a flat, on
/// the centre's side of it.
pub fn on_wafer(spec: &MapSpec, x: f64, y: f64) -> bool {
    WaferShape::of(spec).contains(x, y)
}

/// The wafer's shape, worked out once for the many pixels it is asked about.
struct WaferShape {
    /// Radius squared, mm^2.
    r2: f64,
    /// For a flat: the unit vector towards it and the centre's distance to its chord.
    flat: Option<(f64, f64, f64)>,
}

impl WaferShape {
    fn of(spec: &MapSpec) -> WaferShape {
        let r = spec.diameter_mm / 2.0;
        let flat = spec
            .orientation
            .filter(|o| o.mark == OrientationMark::Flat)
            .map(|o| {
                let (dx, dy) = unit(o.angle_deg);
                (dx, dy, flat_distance(r))
            });
        WaferShape { r2: r * r, flat }
    }

    fn contains(&self, x: f64, y: f64) -> bool {
        x * x + y * y <= self.r2
            && self
                .flat
                .is_none_or(|(dx, dy, distance)| x * dx + y * dy <= distance)
    }
}

/// Unit vector at `angle_deg` anticlockwise from +x.
fn unit(angle_deg: f64) -> (f64, f64) {
    let a = angle_deg.to_radians();
    (a.cos(), a.sin())
}

/// Distance from the centre to a flat's chord: the chord is 0.2 diameters long, a drawing
/// convention (common practice, no source; SEMI M1 sets each size's flat length).
fn flat_distance(r: f64) -> f64 {
    let half_chord = 0.2 * r;
    (r * r - half_chord * half_chord).sqrt()
}

/// The surface as RGBA pixels for the map square of `layout` (row 0 at the top): the scale's
/// colour inside the sites' hull, a light grey on the wafer outside it, white off the wafer.
pub fn surface_pixels(spec: &MapSpec, layout: &MapLayout, ramp: &Ramp) -> Vec<u8> {
    let n = layout.side as usize;
    let mut rgba = vec![255u8; n * n * 4];
    let s = layout.scale(spec.diameter_mm);
    let step = 1.0 / s;
    let half = n as f64 / 2.0;
    let grid = Grid {
        x0: (0.5 - half) * step,
        y0: (0.5 - half) * step,
        step,
        nx: n,
        ny: n,
    };
    let values = spec
        .surface()
        .map(|fit| fit.raster(&grid))
        .unwrap_or_else(|| vec![f64::NAN; n * n]);
    let (lo, hi) = spec.range();
    let span = hi - lo;
    let shape = WaferShape::of(spec);
    for j in 0..n {
        let y = grid.y0 + j as f64 * step;
        let row = n - 1 - j;
        for i in 0..n {
            let x = grid.x0 + i as f64 * step;
            if !shape.contains(x, y) {
                continue;
            }
            let v = values[j * n + i];
            let rgb = if v.is_finite() {
                ramp.color((v - lo) / span)
            } else {
                OFF_HULL
            };
            let at = (row * n + i) * 4;
            rgba[at..at + 3].copy_from_slice(&rgb);
        }
    }
    rgba
}

/// The wafer's colour where no interpolation is drawn (outside the sites' convex hull).
pub const OFF_HULL: [u8; 3] = [0xe9, 0xe9, 0xe9];

/// Draws the map (all but the surface image, which the caller put under it) on `area`, at
/// `layout`. Returns nothing but errors as text.
pub fn draw<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &MapSpec,
    layout: &MapLayout,
) -> Result<(), String> {
    let err = |e: DrawingAreaErrorKind<DB::ErrorType>| format!("map '{}': {e}", spec.title);
    let px = layout.px;
    let d = |css: f64| (css * px).round() as i32;
    let font = |css: f64| (FontFamily::SansSerif, css * px);
    let ink = RGBColor(0x1a, 0x1a, 0x1a);
    let (_, height) = area.dim_in_pixel();

    area.draw_text(
        &spec.title,
        &TextStyle::from(font(15.0)).color(&ink),
        (d(12.0), d(8.0)),
    )
    .map_err(err)?;

    // The outline: circle, with the flat's chord or the notch's V.
    let r_mm = spec.diameter_mm / 2.0;
    let centre = layout.to_pixel(spec.diameter_mm, 0.0, 0.0);
    let r_px = (r_mm * layout.scale(spec.diameter_mm)).round() as i32;
    let outline = ShapeStyle::from(&ink).stroke_width(d(1.5).max(1) as u32);
    match spec.orientation {
        Some(o) if o.mark == OrientationMark::Flat => {
            // Arc from one end of the chord round to the other, then the chord.
            let half_angle = (0.2f64).asin().to_degrees();
            let points: Vec<(i32, i32)> = (0..=180)
                .map(|k| {
                    let a = o.angle_deg
                        + half_angle
                        + (360.0 - 2.0 * half_angle) * f64::from(k) / 180.0;
                    let (ux, uy) = unit(a);
                    layout.to_pixel(spec.diameter_mm, r_mm * ux, r_mm * uy)
                })
                .collect();
            let mut closed = points.clone();
            closed.push(points[0]);
            area.draw(&PathElement::new(closed, outline)).map_err(err)?;
        }
        _ => {
            area.draw(&Circle::new(centre, r_px, outline))
                .map_err(err)?;
        }
    }
    if let Some(o) = spec
        .orientation
        .filter(|o| o.mark == OrientationMark::Notch)
    {
        // A small V cut into the edge, 2 % of the diameter deep.
        let depth = 0.02 * spec.diameter_mm;
        let (ux, uy) = unit(o.angle_deg);
        let (vx, vy) = (-uy, ux);
        let tip = (ux * (r_mm - depth), uy * (r_mm - depth));
        let w = depth * 0.9;
        let a = (ux * r_mm + vx * w, uy * r_mm + vy * w);
        let b = (ux * r_mm - vx * w, uy * r_mm - vy * w);
        let to = |p: (f64, f64)| layout.to_pixel(spec.diameter_mm, p.0, p.1);
        area.draw(&Polygon::new(vec![to(a), to(tip), to(b)], WHITE.filled()))
            .map_err(err)?;
        area.draw(&PathElement::new(vec![to(a), to(tip), to(b)], outline))
            .map_err(err)?;
    }

    // The sites: a disc in the scale's colour; outside the window, a triangle (up: above max,
    // down: below min) drawn black on white, so it survives greyscale printing.
    let (lo, hi) = spec.range();
    let dot = d(4.0).max(2);
    for s in &spec.sites {
        let p = layout.to_pixel(spec.diameter_mm, s.x_mm, s.y_mm);
        let [r, g, b] = colormap::at((s.value - lo) / (hi - lo));
        match s.side {
            Side::Low | Side::High => {
                let k = f64::from(d(9.0));
                let sign = if s.side == Side::High { 1.0 } else { -1.0 };
                let tri = |scale: f64| -> Vec<(i32, i32)> {
                    [(0.0, -1.0), (0.87, 0.5), (-0.87, 0.5)]
                        .iter()
                        .map(|(x, y)| {
                            (
                                p.0 + (x * k * scale).round() as i32,
                                p.1 + (y * k * scale * sign).round() as i32,
                            )
                        })
                        .collect()
                };
                area.draw(&Polygon::new(tri(1.25), WHITE.filled()))
                    .map_err(err)?;
                area.draw(&Polygon::new(tri(1.0), ink.filled()))
                    .map_err(err)?;
                area.draw(&Polygon::new(tri(0.55), RGBColor(r, g, b).filled()))
                    .map_err(err)?;
            }
            _ => {
                area.draw(&Circle::new(p, dot + d(1.0).max(1), WHITE.filled()))
                    .map_err(err)?;
                area.draw(&Circle::new(p, dot, RGBColor(r, g, b).filled()))
                    .map_err(err)?;
                area.draw(&Circle::new(p, dot, ShapeStyle::from(&ink).stroke_width(1)))
                    .map_err(err)?;
            }
        }
    }

    draw_bar(area, spec, layout).map_err(err)?;

    // The key and the caption.
    let foot = TextStyle::from(font(11.5)).color(&ink);
    let key = if spec.sites.iter().any(|s| s.side != Side::Unjudged) {
        "● site inside the window   ▲ above max   ▼ below min   grey: outside the sites' hull, not interpolated"
    } else {
        "● site (no spec window)   grey: outside the sites' hull, not interpolated"
    };
    let y_foot = i32::try_from(height).unwrap_or(i32::MAX) - d(FOOT_CSS) + d(6.0);
    area.draw_text(key, &foot, (d(12.0), y_foot)).map_err(err)?;
    area.draw_text(&spec.caption, &foot, (d(12.0), y_foot + d(17.0)))
        .map_err(err)?;
    Ok(())
}

/// The colour bar with its quantity over it (unit on its own line), ticks, and the spec limits.
fn draw_bar<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    spec: &MapSpec,
    layout: &MapLayout,
) -> Result<(), DrawingAreaErrorKind<DB::ErrorType>> {
    let px = layout.px;
    let d = |css: f64| (css * px).round() as i32;
    let font = |css: f64| (FontFamily::SansSerif, css * px);
    let ink = RGBColor(0x1a, 0x1a, 0x1a);
    let (x0, y0) = (layout.bar_left, layout.bar_top);
    let (w, h) = (layout.bar_width as i32, layout.bar_height as i32);
    let label = TextStyle::from(font(12.0)).color(&ink);
    area.draw_text(&spec.quantity, &label, (x0, y0 - d(34.0)))?;
    area.draw_text(&spec.unit, &label, (x0, y0 - d(19.0)))?;
    // High values at the top, one band per device pixel row.
    for k in 0..h {
        let t = 1.0 - f64::from(k) / f64::from((h - 1).max(1));
        let [r, g, b] = colormap::at(t);
        area.draw(&Rectangle::new(
            [(x0, y0 + k), (x0 + w, y0 + k + 1)],
            RGBColor(r, g, b).filled(),
        ))?;
    }
    area.draw(&Rectangle::new(
        [(x0, y0), (x0 + w, y0 + h)],
        ink.stroke_width(1),
    ))?;
    let (lo, hi) = spec.range();
    let y_of = |v: f64| y0 + ((1.0 - (v - lo) / (hi - lo)) * f64::from(h - 1)).round() as i32;
    let tick_style = TextStyle::from(font(11.0))
        .color(&ink)
        .pos(Pos::new(HPos::Left, VPos::Center));
    for k in 0..=4 {
        let v = lo + (hi - lo) * f64::from(k) / 4.0;
        let y = y_of(v);
        area.draw(&PathElement::new(
            vec![(x0 + w, y), (x0 + w + d(4.0), y)],
            ink,
        ))?;
        area.draw_text(&format::auto(v), &tick_style, (x0 + w + d(7.0), y))?;
    }
    // Spec limits inside the scale: a dashed-looking double tick across the bar and a word.
    let limit_style = TextStyle::from(font(11.0))
        .color(&ink)
        .pos(Pos::new(HPos::Right, VPos::Center));
    for (limit, word) in [(spec.limits.0, "min"), (spec.limits.1, "max")] {
        if let Some(v) = limit.filter(|v| (lo..=hi).contains(v)) {
            let y = y_of(v);
            area.draw(&Rectangle::new(
                [(x0 - d(5.0), y - 1), (x0 + w + d(2.0), y + 1)],
                ink.filled(),
            ))?;
            area.draw_text(word, &limit_style, (x0 - d(7.0), y))?;
        }
    }
    Ok(())
}

/// The map's data as CSV: one row per site with its position, value and side of the window.
pub fn to_csv(spec: &MapSpec) -> String {
    let mut out = format!(
        "site,x_mm,y_mm,{} [{}],outside_window\n",
        spec.quantity.to_ascii_lowercase(),
        spec.unit
    );
    for s in &spec.sites {
        let name = if s.name.contains([',', '"']) {
            format!("\"{}\"", s.name.replace('"', "\"\""))
        } else {
            s.name.clone()
        };
        out.push_str(&format!(
            "{name},{},{},{},{}\n",
            s.x_mm,
            s.y_mm,
            s.value,
            s.side.words()
        ));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(sites: Vec<MapSite>, orientation: Option<Orientation>) -> MapSpec {
        MapSpec {
            title: "t".into(),
            file_stem: "t".into(),
            quantity: "Resistivity".into(),
            unit: "ohm cm".into(),
            diameter_mm: 150.0,
            orientation,
            sites,
            limits: (None, None),
            caption: String::new(),
        }
    }

    fn site(x: f64, y: f64, value: f64) -> MapSite {
        MapSite {
            name: format!("{x},{y}"),
            x_mm: x,
            y_mm: y,
            value,
            side: Side::Unjudged,
        }
    }

    /// The 49-site polar pattern of the demo lots (centre, 8 at 22 mm, 16 at 44 mm, 24 at
    /// 66 mm), with a planar field.
    fn polar(field: impl Fn(f64, f64) -> f64) -> Vec<MapSite> {
        let mut out = vec![site(0.0, 0.0, field(0.0, 0.0))];
        for (r, n) in [(22.0, 8), (44.0, 16), (66.0, 24)] {
            for k in 0..n {
                let a = std::f64::consts::TAU * f64::from(k) / f64::from(n);
                let (x, y) = (r * a.cos(), r * a.sin());
                out.push(site(x, y, field(x, y)));
            }
        }
        out
    }

    fn pixel(rgba: &[u8], n: usize, col: i32, row: i32) -> [u8; 3] {
        let at = (row as usize * n + col as usize) * 4;
        [rgba[at], rgba[at + 1], rgba[at + 2]]
    }

    #[test]
    fn site_colours_match_their_values() {
        // At a site the linear surface equals the site's value, so the pixel under each site
        // has the scale colour of its own value (to one table step and one pixel's slope). A
        // site on the hull's edge may have its pixel's centre just outside the hull: the pixel
        // one step towards the wafer centre is read instead.
        let s = spec(polar(|x, y| 10.0 + 0.02 * x - 0.01 * y), None);
        let layout = MapLayout::new(700, 520, 1.0);
        let ramp = Ramp::new();
        let rgba = surface_pixels(&s, &layout, &ramp);
        let n = layout.side as usize;
        let (lo, hi) = s.range();
        for site in &s.sites {
            let (px, py) = layout.to_pixel(s.diameter_mm, site.x_mm, site.y_mm);
            let inward = |v: f64| {
                if v.abs() > 1e-9 {
                    -(v.signum() as i32)
                } else {
                    0
                }
            };
            let (px, py) = (px + inward(site.x_mm), py - inward(site.y_mm));
            let got = pixel(&rgba, n, px - layout.left, py - layout.top);
            let want = colormap::at((site.value - lo) / (hi - lo));
            for c in 0..3 {
                assert!(
                    (i32::from(got[c]) - i32::from(want[c])).abs() <= 4,
                    "site {}: {got:?} vs {want:?}",
                    site.name
                );
            }
        }
    }

    #[test]
    fn outline_radius_matches_the_diameter() {
        // The wafer edge: the last pixel on the wafer along +x sits half a diameter from the
        // centre, in the layout's scale, to within one pixel.
        let s = spec(polar(|_, _| 1.0), None);
        let layout = MapLayout::new(800, 600, 1.0);
        let rgba = surface_pixels(&s, &layout, &Ramp::new());
        let n = layout.side as usize;
        let mid = (n / 2) as i32;
        let last_on = (mid..n as i32)
            .take_while(|&c| pixel(&rgba, n, c, mid) != [255, 255, 255])
            .last()
            .unwrap();
        let radius_px = f64::from(last_on - mid) + 0.5;
        let want = 75.0 * layout.scale(150.0);
        assert!((radius_px - want).abs() <= 1.0, "{radius_px} vs {want}");
    }

    #[test]
    fn off_the_hull_is_grey_and_a_flat_cuts_the_wafer() {
        // Sites only within 20 mm: the wafer at 60 mm is grey, not coloured.
        let sites = vec![
            site(0.0, 0.0, 1.0),
            site(20.0, 0.0, 2.0),
            site(0.0, 20.0, 3.0),
            site(-20.0, -20.0, 4.0),
        ];
        let flat = Orientation {
            mark: OrientationMark::Flat,
            angle_deg: 270.0,
        };
        let s = spec(sites, Some(flat));
        let layout = MapLayout::new(600, 500, 1.0);
        let rgba = surface_pixels(&s, &layout, &Ramp::new());
        let n = layout.side as usize;
        let at = |x: f64, y: f64| {
            let (px, py) = layout.to_pixel(150.0, x, y);
            pixel(&rgba, n, px - layout.left, py - layout.top)
        };
        assert_eq!(at(60.0, 0.0), OFF_HULL);
        // Beyond the flat at the bottom (y = -74 mm lies inside the circle but past the chord).
        assert_eq!(at(0.0, -74.0), [255, 255, 255]);
        assert_eq!(at(0.0, 74.0), OFF_HULL);
        assert!(on_wafer(&s, 0.0, -73.0));
        assert!(!on_wafer(&s, 0.0, -73.6));
    }

    #[test]
    fn too_few_sites_leave_the_wafer_grey() {
        let s = spec(vec![site(0.0, 0.0, 1.0), site(10.0, 0.0, 2.0)], None);
        assert!(s.surface().is_none());
        let layout = MapLayout::new(400, 400, 1.0);
        let rgba = surface_pixels(&s, &layout, &Ramp::new());
        let n = layout.side as usize;
        assert_eq!(pixel(&rgba, n, (n / 2) as i32, (n / 2) as i32), OFF_HULL);
    }

    #[test]
    fn a_flat_wafer_still_has_a_scale_and_the_csv_lists_every_site() {
        let mut s = spec(polar(|_, _| 5.0), None);
        let (lo, hi) = s.range();
        assert!(lo < 5.0 && hi > 5.0);
        s.sites[3].side = Side::High;
        s.sites[4].name = "edge, left".into();
        let csv = to_csv(&s);
        assert_eq!(csv.lines().count(), 1 + 49);
        assert!(csv.starts_with("site,x_mm,y_mm,resistivity [ohm cm],outside_window\n"));
        assert!(csv.lines().nth(4).unwrap().ends_with(",above max"));
        assert!(csv.contains("\"edge, left\","));
    }

    #[test]
    fn the_layout_keeps_the_map_square_and_the_bar_beside_it() {
        for (w, h, px) in [(1366u32, 560u32, 1.0), (1920, 700, 1.0), (700, 520, 2.0)] {
            let l = MapLayout::new(w, h, px);
            assert!(l.left >= 0 && l.top >= 0);
            assert!(l.left + l.side as i32 <= l.bar_left);
            assert!(l.top + l.side as i32 <= h as i32);
            assert!(l.bar_left + l.bar_width as i32 <= w as i32);
        }
    }
}
