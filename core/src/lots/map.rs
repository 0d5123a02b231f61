//! Wafer-map mathematics: the wafer outline a lot file states (diameter, notch or flat), the
//! standard diameters, a surface through the sites (Delaunay triangulation by Bowyer-Watson,
//! linear within each triangle), its raster on a regular grid, the uniformity figures of one
//! wafer and its radial profile. The app draws; this module only computes.
//!
//! # Triangulation
//! Sites are inserted one at a time into a super-triangle far outside them ([Bowyer1981],
//! [Watson1981]): the triangles whose circumcircle holds the new site strictly inside form a
//! cavity, which is replaced by a fan of triangles from the site. Two safeguards keep the
//! result a valid triangulation when sites are co-circular (rings of equally spaced sites
//! are): the cavity is grown from the triangle holding the site across shared edges only, and
//! a cavity triangle whose outer edge the new site does not see strictly from inside is given
//! back, so the fan never folds over. After the super-triangle's vertices are removed, any
//! sliver between the triangles and the convex hull (where a super vertex lay inside a very
//! flat hull triangle's circumcircle) is filled, so the triangles cover the hull exactly.

use std::fmt;

use serde::Serialize;

/// Which mark shows the crystal orientation.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum OrientationMark {
    /// A V-shaped notch in the rim (common on 200 mm and larger wafers).
    Notch,
    /// A straight flat cut along the rim (common on 150 mm and smaller wafers).
    Flat,
}

impl OrientationMark {
    /// "notch" or "flat", as the lot-file setting is called.
    pub fn as_str(self) -> &'static str {
        match self {
            OrientationMark::Notch => "notch",
            OrientationMark::Flat => "flat",
        }
    }
}

/// The orientation mark and its direction from the wafer centre, degrees anticlockwise from +x
/// (270 = at the bottom, -y).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Orientation {
    /// Notch or flat.
    pub mark: OrientationMark,
    /// Direction of the mark from the centre, degrees anticlockwise from +x, 0 <= a < 360.
    pub angle_deg: f64,
}

/// What a lot file says about the wafer outline (`# diameter:`, `# notch:` or `# flat:`
/// before the header); `None` where it says nothing.
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize)]
pub struct WaferOutline {
    /// Wafer diameter, mm.
    pub diameter_mm: Option<f64>,
    /// The orientation mark.
    pub orientation: Option<Orientation>,
}

/// Standard wafer diameters, mm (SEMI M1 names 2, 3 in, 100, 125, 150, 200, 300, 450 mm).
///
/// # References
/// SEMI M1, specification for polished single crystal silicon wafers (the nominal diameters;
/// 2 in = 50.8 mm and 3 in = 76.2 mm by the exact inch, from memory).
pub const STANDARD_DIAMETERS_MM: [f64; 8] = [50.8, 76.2, 100.0, 125.0, 150.0, 200.0, 300.0, 450.0];

/// The smallest standard diameter whose radius exceeds the farthest site from (0,0);
/// None without sites or when every standard wafer is too small.
///
/// # Formula
/// The smallest D in [`STANDARD_DIAMETERS_MM`] with D / 2 > max over sites of sqrt(x^2 + y^2)
/// (positions in mm, the wafer centre at (0,0)).
///
/// # Errors
/// None (no result) also when a position is not finite.
pub fn infer_diameter_mm(xy: &[(f64, f64)]) -> Option<f64> {
    let mut farthest: Option<f64> = None;
    for &(x, y) in xy {
        let r = x.hypot(y);
        if !r.is_finite() {
            return None;
        }
        farthest = Some(farthest.map_or(r, |f| f.max(r)));
    }
    let farthest = farthest?;
    STANDARD_DIAMETERS_MM
        .into_iter()
        .find(|&d| d / 2.0 > farthest)
}

/// Why a surface cannot be fitted through a wafer's sites.
#[derive(Debug, Clone, PartialEq)]
pub enum MapError {
    /// Fewer than three sites at distinct positions.
    TooFewSites {
        /// Sites at distinct positions.
        distinct: usize,
    },
    /// Every site lies on one straight line: there is no area to fill.
    Collinear,
    /// A position or value is NaN or infinite.
    NotFinite {
        /// Index of the first such point in the input.
        index: usize,
    },
}

impl fmt::Display for MapError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MapError::TooFewSites { distinct } => write!(
                f,
                "a map needs at least 3 sites at distinct positions; this wafer has {distinct}"
            ),
            MapError::Collinear => write!(
                f,
                "a map needs sites that span an area; every site of this wafer lies on one \
                 straight line"
            ),
            MapError::NotFinite { index } => write!(
                f,
                "site {} (counting from 1) has a position or value that is not a finite \
                 number; x, y and the value must be finite",
                index + 1
            ),
        }
    }
}

impl std::error::Error for MapError {}

/// Sites closer than this (mm) are one site.
const MERGE_DISTANCE_MM: f64 = 1e-9;
/// Sites closer than this fraction of the pattern's extent are one site too: f64 cannot tell
/// them apart in the triangulation's unit frame. For any pattern up to 1000 mm wide this is
/// below [`MERGE_DISTANCE_MM`] and changes nothing.
const MERGE_RELATIVE: f64 = 1e-12;
/// The super-triangle's vertices lie this many site extents from the sites' centre.
const SUPER_TRIANGLE_SCALE: f64 = 1.0e4;
/// Relative tolerance of the in-circle test: a site counts as inside a circumcircle only
/// when the determinant exceeds this fraction of the sum of its terms' magnitudes, so that
/// co-circular sites (a tie) leave the triangle as it is.
const IN_CIRCLE_TOLERANCE: f64 = 1e-12;
/// Relative tolerance of the barycentric inside test of [`SurfaceFit::value_at`] and
/// [`SurfaceFit::raster`], so that points on a shared edge belong to a triangle.
const BARYCENTRIC_TOLERANCE: f64 = 1e-10;

/// Delaunay triangulation (Bowyer-Watson) of the sites and piecewise-linear interpolation
/// on its triangles (the scheme of scipy.interpolate.LinearNDInterpolator).
///
/// # Formula
/// Inside a triangle with vertices (x_k, y_k, v_k), the value at (x, y) is
/// sum_k lambda_k v_k with the barycentric coordinates lambda_k (sum 1, each >= 0); outside
/// the convex hull of the sites there is no value.
///
/// # References
/// A. Bowyer, "Computing Dirichlet tessellations", Comput. J. 24, 162-166 (1981) [Bowyer1981];
/// D. F. Watson, "Computing the n-dimensional Delaunay tessellation with application to
/// Voronoi polytopes", Comput. J. 24, 167-172 (1981) [Watson1981].
#[derive(Debug, Clone, PartialEq)]
pub struct SurfaceFit {
    points: Vec<(f64, f64, f64)>,
    triangles: Vec<[usize; 3]>,
}

impl SurfaceFit {
    /// points: (x mm, y mm, value). Sites at the same position (within 1e-9 mm) are merged
    /// into one with the mean value (for patterns wider than 1000 mm, within 1e-12 of the
    /// width, the resolution of f64 at that scale).
    ///
    /// # Errors
    /// [`MapError::NotFinite`] for a NaN or infinite coordinate or value,
    /// [`MapError::TooFewSites`] for fewer than 3 distinct positions, [`MapError::Collinear`]
    /// when all sites lie on one line.
    pub fn new(points: &[(f64, f64, f64)]) -> Result<SurfaceFit, MapError> {
        if let Some(index) = points
            .iter()
            .position(|&(x, y, v)| !(x.is_finite() && y.is_finite() && v.is_finite()))
        {
            return Err(MapError::NotFinite { index });
        }
        let merge_distance = MERGE_DISTANCE_MM.max(MERGE_RELATIVE * extent_of(points));
        let points = merge_close(points, merge_distance);
        if points.len() < 3 {
            return Err(MapError::TooFewSites {
                distinct: points.len(),
            });
        }
        let xy: Vec<(f64, f64)> = points.iter().map(|&(x, y, _)| (x, y)).collect();
        let frame = Frame::of(&xy).ok_or(MapError::Collinear)?;
        let local: Vec<(f64, f64)> = xy.iter().map(|&p| frame.local(p)).collect();
        if is_collinear(&local) {
            return Err(MapError::Collinear);
        }
        let triangles = triangulate(&local);
        if triangles.is_empty() {
            return Err(MapError::Collinear);
        }
        Ok(SurfaceFit { points, triangles })
    }

    /// The sites after merging: (x mm, y mm, value).
    pub fn points(&self) -> &[(f64, f64, f64)] {
        &self.points
    }

    /// The triangles, as indices into [`points`](Self::points), each anticlockwise.
    pub fn triangles(&self) -> &[[usize; 3]] {
        &self.triangles
    }

    /// Linear interpolation inside the convex hull of the sites; None outside it.
    ///
    /// # Formula
    /// See [`SurfaceFit`]; a point on an edge shared by two triangles gets the same value from
    /// either.
    pub fn value_at(&self, x: f64, y: f64) -> Option<f64> {
        if !(x.is_finite() && y.is_finite()) {
            return None;
        }
        self.triangles
            .iter()
            .find_map(|t| self.plane(t).value_if_inside(x, y))
    }

    /// The value at every cell centre of `grid` (row-major, row 0 is the LOWEST y), NaN
    /// outside the convex hull.
    ///
    /// Triangle by triangle: each visits only the cells of its bounding box and takes those
    /// whose centre passes the barycentric test (with a small tolerance, so that centres on a
    /// shared edge are not lost).
    pub fn raster(&self, grid: &Grid) -> Vec<f64> {
        let cells = grid.nx.saturating_mul(grid.ny);
        let mut out = vec![f64::NAN; cells];
        if cells == 0 || !(grid.step > 0.0 && grid.step.is_finite()) {
            return out;
        }
        if !(grid.x0.is_finite() && grid.y0.is_finite()) {
            return out;
        }
        // Cell index range [lo, hi] whose centres fall within [min, max].
        let span = |min: f64, max: f64, origin: f64, n: usize| -> Option<(usize, usize)> {
            let lo = ((min - origin) / grid.step).ceil().max(0.0);
            let hi = ((max - origin) / grid.step).floor().min(n as f64 - 1.0);
            (lo <= hi).then_some((lo as usize, hi as usize))
        };
        for t in &self.triangles {
            let plane = self.plane(t);
            let pad = plane.pad;
            let Some((i0, i1)) = span(plane.min_x - pad, plane.max_x + pad, grid.x0, grid.nx)
            else {
                continue;
            };
            let Some((j0, j1)) = span(plane.min_y - pad, plane.max_y + pad, grid.y0, grid.ny)
            else {
                continue;
            };
            for j in j0..=j1 {
                let y = grid.y0 + j as f64 * grid.step;
                let row = j * grid.nx;
                for i in i0..=i1 {
                    let cell = &mut out[row + i];
                    if !cell.is_nan() {
                        continue;
                    }
                    let x = grid.x0 + i as f64 * grid.step;
                    if let Some(v) = plane.value_if_inside(x, y) {
                        *cell = v;
                    }
                }
            }
        }
        out
    }

    fn plane(&self, t: &[usize; 3]) -> Plane {
        Plane::new(self.points[t[0]], self.points[t[1]], self.points[t[2]])
    }
}

/// One triangle ready for barycentric evaluation.
struct Plane {
    a: (f64, f64, f64),
    b: (f64, f64, f64),
    c: (f64, f64, f64),
    twice_area: f64,
    tolerance: f64,
    pad: f64,
    min_x: f64,
    max_x: f64,
    min_y: f64,
    max_y: f64,
}

impl Plane {
    fn new(a: (f64, f64, f64), b: (f64, f64, f64), c: (f64, f64, f64)) -> Plane {
        let twice_area = (b.0 - a.0) * (c.1 - a.1) - (b.1 - a.1) * (c.0 - a.0);
        let min_x = a.0.min(b.0).min(c.0);
        let max_x = a.0.max(b.0).max(c.0);
        let min_y = a.1.min(b.1).min(c.1);
        let max_y = a.1.max(b.1).max(c.1);
        let extent = (max_x - min_x).max(max_y - min_y);
        Plane {
            a,
            b,
            c,
            twice_area,
            tolerance: BARYCENTRIC_TOLERANCE * twice_area.abs(),
            pad: BARYCENTRIC_TOLERANCE * extent,
            min_x,
            max_x,
            min_y,
            max_y,
        }
    }

    /// The interpolated value at (x, y) when the point lies in the triangle (within the
    /// tolerance).
    fn value_if_inside(&self, x: f64, y: f64) -> Option<f64> {
        let (a, b, c) = (self.a, self.b, self.c);
        // Twice the signed areas of the sub-triangles opposite each vertex.
        let wa = (b.0 - x) * (c.1 - y) - (b.1 - y) * (c.0 - x);
        let wb = (c.0 - x) * (a.1 - y) - (c.1 - y) * (a.0 - x);
        let wc = (a.0 - x) * (b.1 - y) - (a.1 - y) * (b.0 - x);
        let tol = -self.tolerance;
        if wa < tol || wb < tol || wc < tol || self.twice_area <= 0.0 {
            return None;
        }
        // Clamped weights keep a point just outside an edge within the edge's value range.
        let (wa, wb, wc) = (wa.max(0.0), wb.max(0.0), wc.max(0.0));
        let sum = wa + wb + wc;
        if sum <= 0.0 {
            return None;
        }
        Some((wa * a.2 + wb * b.2 + wc * c.2) / sum)
    }
}

/// The larger side of the sites' bounding box, mm (0 without sites).
fn extent_of(points: &[(f64, f64, f64)]) -> f64 {
    let (mut min_x, mut max_x, mut min_y, mut max_y) = (
        f64::INFINITY,
        f64::NEG_INFINITY,
        f64::INFINITY,
        f64::NEG_INFINITY,
    );
    for &(x, y, _) in points {
        min_x = min_x.min(x);
        max_x = max_x.max(x);
        min_y = min_y.min(y);
        max_y = max_y.max(y);
    }
    let extent = (max_x - min_x).max(max_y - min_y);
    if extent.is_finite() { extent } else { 0.0 }
}

/// Merges sites within `distance` into one at the first one's position with the mean value,
/// keeping the order of first appearance.
fn merge_close(points: &[(f64, f64, f64)], distance: f64) -> Vec<(f64, f64, f64)> {
    let order =
        crate::order::sorted_positions(points.len(), &|i, j| points[i].0.total_cmp(&points[j].0));
    let mut group = vec![usize::MAX; points.len()];
    let mut groups: Vec<(usize, f64, usize)> = Vec::new(); // (first index, sum, count)
    for (k, &i) in order.iter().enumerate() {
        if group[i] != usize::MAX {
            continue;
        }
        let g = groups.len();
        group[i] = g;
        let (xi, yi, vi) = points[i];
        let mut sum = vi;
        let mut count = 1;
        let mut first = i;
        for &j in &order[k + 1..] {
            let (xj, yj, vj) = points[j];
            if xj - xi > distance {
                break;
            }
            if group[j] == usize::MAX && (xj - xi).hypot(yj - yi) <= distance {
                group[j] = g;
                sum += vj;
                count += 1;
                first = first.min(j);
            }
        }
        groups.push((first, sum, count));
    }
    crate::order::sort_by(&mut groups, &|a, b| a.0.cmp(&b.0));
    groups
        .into_iter()
        .map(|(first, sum, count)| {
            let (x, y, _) = points[first];
            (x, y, sum / count as f64)
        })
        .collect()
}

/// Translation and scale that put the sites into about [-0.5, 0.5]^2, where the predicates
/// are best conditioned.
struct Frame {
    cx: f64,
    cy: f64,
    scale: f64,
}

impl Frame {
    fn of(xy: &[(f64, f64)]) -> Option<Frame> {
        let (mut min_x, mut max_x, mut min_y, mut max_y) = (
            f64::INFINITY,
            f64::NEG_INFINITY,
            f64::INFINITY,
            f64::NEG_INFINITY,
        );
        for &(x, y) in xy {
            min_x = min_x.min(x);
            max_x = max_x.max(x);
            min_y = min_y.min(y);
            max_y = max_y.max(y);
        }
        let extent = (max_x - min_x).max(max_y - min_y);
        (extent > 0.0 && extent.is_finite()).then(|| Frame {
            cx: 0.5 * (min_x + max_x),
            cy: 0.5 * (min_y + max_y),
            scale: 1.0 / extent,
        })
    }

    fn local(&self, (x, y): (f64, f64)) -> (f64, f64) {
        ((x - self.cx) * self.scale, (y - self.cy) * self.scale)
    }
}

/// Twice the signed area of (a, b, c): positive when anticlockwise.
fn orient(a: (f64, f64), b: (f64, f64), c: (f64, f64)) -> f64 {
    (b.0 - a.0) * (c.1 - a.1) - (b.1 - a.1) * (c.0 - a.0)
}

/// Whether every site lies on one line (in the unit frame, within rounding).
fn is_collinear(local: &[(f64, f64)]) -> bool {
    // The farthest pair from the first site spans the line; any site well off it is enough.
    let a = local[0];
    let far = |from: (f64, f64)| {
        local
            .iter()
            .copied()
            .max_by(|p, q| {
                let d = |r: &(f64, f64)| (r.0 - from.0).hypot(r.1 - from.1);
                d(p).total_cmp(&d(q))
            })
            .unwrap_or(from)
    };
    let b = far(a);
    let c = far(b);
    let length = (c.0 - b.0).hypot(c.1 - b.1);
    if length == 0.0 {
        return true;
    }
    local
        .iter()
        .all(|&p| (orient(b, c, p) / length).abs() <= 1e-12)
}

/// Whether `p` lies strictly inside the circumcircle of the anticlockwise triangle (a, b, c),
/// with a relative tolerance that calls a tie "not inside".
fn in_circle(a: (f64, f64), b: (f64, f64), c: (f64, f64), p: (f64, f64)) -> bool {
    let (adx, ady) = (a.0 - p.0, a.1 - p.1);
    let (bdx, bdy) = (b.0 - p.0, b.1 - p.1);
    let (cdx, cdy) = (c.0 - p.0, c.1 - p.1);
    let t1 = (adx * adx + ady * ady) * (bdx * cdy - cdx * bdy);
    let t2 = (bdx * bdx + bdy * bdy) * (cdx * ady - adx * cdy);
    let t3 = (cdx * cdx + cdy * cdy) * (adx * bdy - bdx * ady);
    let det = t1 + t2 + t3;
    det > IN_CIRCLE_TOLERANCE * (t1.abs() + t2.abs() + t3.abs())
}

/// A triangle of the working triangulation: vertices anticlockwise, and across edge k (from
/// vertex k to vertex k+1) the neighbour, if any.
#[derive(Debug, Clone, Copy)]
struct Tri {
    v: [usize; 3],
    n: [Option<usize>; 3],
    alive: bool,
}

/// Bowyer-Watson over the sites in the unit frame; the triangles of real sites, anticlockwise.
fn triangulate(local: &[(f64, f64)]) -> Vec<[usize; 3]> {
    let n = local.len();
    let mut pts = local.to_vec();
    let m = SUPER_TRIANGLE_SCALE;
    // An equilateral-ish triangle around the unit square, anticlockwise.
    pts.extend([(-m, -m), (m, -m), (0.0, m)]);
    let mut tris = vec![Tri {
        v: [n, n + 1, n + 2],
        n: [None; 3],
        alive: true,
    }];
    let mut cavity: Vec<usize> = Vec::new();
    let mut in_cavity: Vec<bool> = vec![false];
    for p_index in 0..n {
        let p = pts[p_index];
        let Some(start) = locate(&tris, &pts, p) else {
            continue;
        };
        grow_cavity(&tris, &pts, p, start, &mut cavity, &mut in_cavity);
        make_star_shaped(&tris, &pts, p, start, &mut cavity, &mut in_cavity);
        // The cavity's boundary: (a, b, outside neighbour) with the cavity on the left of a->b.
        let mut boundary: Vec<(usize, usize, Option<usize>)> = Vec::new();
        for &t in &cavity {
            let tri = tris[t];
            for k in 0..3 {
                let outside = tri.n[k];
                if outside.is_none_or(|o| !in_cavity[o]) {
                    boundary.push((tri.v[k], tri.v[(k + 1) % 3], outside));
                }
            }
        }
        for &t in &cavity {
            tris[t].alive = false;
            in_cavity[t] = false;
        }
        let first_new = tris.len();
        for &(a, b, outside) in &boundary {
            let id = tris.len();
            tris.push(Tri {
                v: [a, b, p_index],
                n: [outside, None, None],
                alive: true,
            });
            in_cavity.push(false);
            if let Some(o) = outside {
                for k in 0..3 {
                    let ov = tris[o].v;
                    if ov[k] == b && ov[(k + 1) % 3] == a {
                        tris[o].n[k] = Some(id);
                    }
                }
            }
        }
        // Link the fan: edge b->p of (a, b, p) meets edge p->b of (b, c, p).
        for id in first_new..tris.len() {
            let b = tris[id].v[1];
            if let Some(next) = (first_new..tris.len()).find(|&j| tris[j].v[0] == b) {
                tris[id].n[1] = Some(next);
                tris[next].n[2] = Some(id);
            }
        }
        cavity.clear();
    }
    let mut real: Vec<[usize; 3]> = tris
        .iter()
        .filter(|t| t.alive && t.v.iter().all(|&v| v < n))
        .map(|t| t.v)
        .collect();
    fill_to_hull(&mut real, local);
    real
}

/// The live triangle holding `p` (the one where `p` is farthest inside all three edges).
fn locate(tris: &[Tri], pts: &[(f64, f64)], p: (f64, f64)) -> Option<usize> {
    let mut best: Option<(usize, f64)> = None;
    for (i, t) in tris.iter().enumerate() {
        if !t.alive {
            continue;
        }
        let [a, b, c] = t.v.map(|v| pts[v]);
        let worst = orient(a, b, p).min(orient(b, c, p)).min(orient(c, a, p));
        if best.is_none_or(|(_, w)| worst > w) {
            best = Some((i, worst));
        }
    }
    best.map(|(i, _)| i)
}

/// Collects, from `start` across shared edges, the triangles whose circumcircle holds `p`.
fn grow_cavity(
    tris: &[Tri],
    pts: &[(f64, f64)],
    p: (f64, f64),
    start: usize,
    cavity: &mut Vec<usize>,
    in_cavity: &mut [bool],
) {
    cavity.clear();
    cavity.push(start);
    in_cavity[start] = true;
    let mut k = 0;
    while k < cavity.len() {
        let t = tris[cavity[k]];
        k += 1;
        for neighbour in t.n.into_iter().flatten() {
            if in_cavity[neighbour] {
                continue;
            }
            let [a, b, c] = tris[neighbour].v.map(|v| pts[v]);
            if in_circle(a, b, c, p) {
                in_cavity[neighbour] = true;
                cavity.push(neighbour);
            }
        }
    }
}

/// Gives back cavity triangles until `p` sees every boundary edge strictly from inside, and
/// keeps the cavity connected to `start`; the fan from `p` then covers it without overlap.
fn make_star_shaped(
    tris: &[Tri],
    pts: &[(f64, f64)],
    p: (f64, f64),
    start: usize,
    cavity: &mut Vec<usize>,
    in_cavity: &mut [bool],
) {
    loop {
        let offending = cavity.iter().copied().find(|&t| {
            t != start && {
                let tri = tris[t];
                (0..3).any(|k| {
                    let outside = tri.n[k];
                    outside.is_none_or(|o| !in_cavity[o])
                        && orient(pts[tri.v[k]], pts[tri.v[(k + 1) % 3]], p) <= 0.0
                })
            }
        });
        let Some(bad) = offending else {
            return;
        };
        in_cavity[bad] = false;
        // Keep only what is still connected to the start triangle.
        let members: Vec<usize> = cavity.iter().copied().filter(|&t| t != bad).collect();
        for &t in &members {
            in_cavity[t] = false;
        }
        let mut keep = vec![start];
        let member = |t: usize| members.contains(&t);
        in_cavity[start] = true;
        let mut k = 0;
        while k < keep.len() {
            let t = tris[keep[k]];
            k += 1;
            for neighbour in t.n.into_iter().flatten() {
                if !in_cavity[neighbour] && member(neighbour) {
                    in_cavity[neighbour] = true;
                    keep.push(neighbour);
                }
            }
        }
        *cavity = keep;
    }
}

/// Adds triangles where the outline of `triangles` bends inwards, until it is the convex
/// hull: at consecutive boundary edges a->b, b->c turning clockwise, the triangle (a, c, b)
/// is added when no site lies inside it.
fn fill_to_hull(triangles: &mut Vec<[usize; 3]>, pts: &[(f64, f64)]) {
    use std::collections::HashSet;
    for _round in 0..pts.len() {
        let edges: HashSet<(usize, usize)> = triangles
            .iter()
            .flat_map(|t| [(t[0], t[1]), (t[1], t[2]), (t[2], t[0])])
            .collect();
        let boundary: Vec<(usize, usize)> = edges
            .iter()
            .copied()
            .filter(|&(a, b)| !edges.contains(&(b, a)))
            .collect();
        let mut added = false;
        for &(a, b) in &boundary {
            for &(b2, c) in &boundary {
                if b2 != b || c == a {
                    continue;
                }
                let (pa, pb, pc) = (pts[a], pts[b], pts[c]);
                let scale = (pc.0 - pa.0).hypot(pc.1 - pa.1);
                if orient(pa, pb, pc) >= -1e-12 * scale {
                    continue;
                }
                let blocked = pts.iter().enumerate().any(|(i, &q)| {
                    i != a
                        && i != b
                        && i != c
                        && orient(pa, pc, q) > 0.0
                        && orient(pc, pb, q) > 0.0
                        && orient(pb, pa, q) > 0.0
                });
                if !blocked {
                    triangles.push([a, c, b]);
                    added = true;
                    break;
                }
            }
            if added {
                break;
            }
        }
        if !added {
            return;
        }
    }
}

/// A regular grid of cell centres: cell (i, j) at (x0 + i step, y0 + j step), i < nx, j < ny.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Grid {
    /// x of the centre of column 0, mm.
    pub x0: f64,
    /// y of the centre of row 0 (the lowest row), mm.
    pub y0: f64,
    /// Distance between neighbouring cell centres, mm.
    pub step: f64,
    /// Number of columns.
    pub nx: usize,
    /// Number of rows.
    pub ny: usize,
}

impl Grid {
    /// A square grid of n x n cells covering the disc of `radius_mm` about (0,0).
    ///
    /// # Formula
    /// step = 2 r / n, x0 = y0 = -r + step / 2: the cells tile the square [-r, r]^2.
    pub fn covering(radius_mm: f64, n: usize) -> Grid {
        let step = if n == 0 {
            0.0
        } else {
            2.0 * radius_mm / n as f64
        };
        Grid {
            x0: -radius_mm + step / 2.0,
            y0: -radius_mm + step / 2.0,
            step,
            nx: n,
            ny: n,
        }
    }

    /// The centre of cell (i, j), mm.
    pub fn centre(&self, i: usize, j: usize) -> (f64, f64) {
        (
            self.x0 + i as f64 * self.step,
            self.y0 + j as f64 * self.step,
        )
    }
}

/// The trade's uniformity figures of one wafer's values.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Uniformity {
    /// Number of values.
    pub count: usize,
    /// Arithmetic mean.
    pub mean: f64,
    /// Sample standard deviation (n - 1 in the denominator).
    pub std: f64,
    /// Smallest value.
    pub min: f64,
    /// Largest value.
    pub max: f64,
    /// 100 std / mean, percent.
    pub std_over_mean_percent: f64,
    /// 100 (max - min) / (max + min), percent.
    pub range_over_sum_percent: f64,
    /// 100 (max - min) / mean, percent.
    pub range_over_mean_percent: f64,
}

impl Uniformity {
    /// The figures from a group's count, mean, sample standard deviation, minimum and maximum
    /// (as a running tally keeps them), so a caller need not hold the values.
    ///
    /// # Formula
    /// As [`uniformity`].
    ///
    /// # Errors
    /// None for a count below 2, a non-finite input, a zero mean, or a figure that is not
    /// finite (max + min = 0).
    pub fn from_moments(count: usize, mean: f64, std: f64, min: f64, max: f64) -> Option<Self> {
        if count < 2 || mean == 0.0 || ![mean, std, min, max].iter().all(|v| v.is_finite()) {
            return None;
        }
        let range = max - min;
        let u = Uniformity {
            count,
            mean,
            std,
            min,
            max,
            std_over_mean_percent: 100.0 * std / mean,
            range_over_sum_percent: 100.0 * range / (max + min),
            range_over_mean_percent: 100.0 * range / mean,
        };
        [
            u.std_over_mean_percent,
            u.range_over_sum_percent,
            u.range_over_mean_percent,
        ]
        .iter()
        .all(|v| v.is_finite())
        .then_some(u)
    }
}

/// The trade's uniformity figures of one wafer's values.
///
/// # Formula
/// mean = sum v / n; std = sqrt(sum (v - mean)^2 / (n - 1)); std_over_mean = 100 std / mean;
/// range_over_sum = 100 (max - min) / (max + min); range_over_mean = 100 (max - min) / mean
/// (all in percent; common practice, no source).
///
/// # Errors
/// None for fewer than 2 values, a non-finite value or a mean of zero (and when max + min is
/// zero, which leaves range_over_sum undefined).
pub fn uniformity(values: &[f64]) -> Option<Uniformity> {
    if values.len() < 2 || values.iter().any(|v| !v.is_finite()) {
        return None;
    }
    let n = values.len() as f64;
    let mean = values.iter().sum::<f64>() / n;
    let squares: f64 = values.iter().map(|v| (v - mean) * (v - mean)).sum();
    let std = (squares / (n - 1.0)).sqrt();
    let min = values.iter().copied().fold(f64::INFINITY, f64::min);
    let max = values.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    Uniformity::from_moments(values.len(), mean, std, min, max)
}

/// One site of a radial profile.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RadialPoint {
    /// Distance from the wafer centre (0,0), mm.
    pub radius_mm: f64,
    /// The site's value.
    pub value: f64,
}

/// The values against distance from the wafer centre, and the centre-to-edge change.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RadialProfile {
    /// Every site, sorted by radius.
    pub points: Vec<RadialPoint>,
    /// The outermost site's radius, mm.
    pub outer_radius_mm: f64,
    /// Mean of the sites within 10 % of the outer radius from the centre.
    pub centre: f64,
    /// Mean of the sites at 95 % or more of the outer radius.
    pub edge: f64,
    /// 100 (centre - edge) / edge, percent.
    pub centre_to_edge_percent: f64,
}

/// Sites within this fraction of the outer radius count as the centre.
const CENTRE_FRACTION: f64 = 0.10;
/// Sites at this fraction of the outer radius or beyond count as the edge.
const EDGE_FRACTION: f64 = 0.95;

/// centre = mean of the sites within 10 % of the outermost site radius from (0,0);
/// edge = mean of the sites at 95 % or more of the outermost radius;
/// centre_to_edge_percent = 100 (centre - edge) / edge. None when no site is near the
/// centre, no site is off-centre, or edge is zero. Points (x, y, value).
///
/// # Formula
/// r = sqrt(x^2 + y^2), R = max r; centre = mean of v over r <= 0.1 R; edge = mean of v over
/// r >= 0.95 R; centre-to-edge = 100 (centre - edge) / edge (common practice, no source).
///
/// # Errors
/// None also when a coordinate or value is not finite.
pub fn radial_profile(points: &[(f64, f64, f64)]) -> Option<RadialProfile> {
    let mut profile: Vec<RadialPoint> = Vec::with_capacity(points.len());
    for &(x, y, value) in points {
        let radius_mm = x.hypot(y);
        if !(radius_mm.is_finite() && value.is_finite()) {
            return None;
        }
        profile.push(RadialPoint { radius_mm, value });
    }
    crate::order::sort_by(&mut profile, &|a, b| a.radius_mm.total_cmp(&b.radius_mm));
    let outer = profile.last()?.radius_mm;
    if outer <= 0.0 {
        return None;
    }
    let mean_where = |keep: &dyn Fn(f64) -> bool| {
        let (sum, count) = profile
            .iter()
            .filter(|p| keep(p.radius_mm))
            .fold((0.0, 0usize), |(s, c), p| (s + p.value, c + 1));
        (count > 0).then(|| sum / count as f64)
    };
    let centre = mean_where(&|r| r <= CENTRE_FRACTION * outer)?;
    let edge = mean_where(&|r| r >= EDGE_FRACTION * outer)?;
    if edge == 0.0 {
        return None;
    }
    let centre_to_edge_percent = 100.0 * (centre - edge) / edge;
    centre_to_edge_percent.is_finite().then_some(RadialProfile {
        points: profile,
        outer_radius_mm: outer,
        centre,
        edge,
        centre_to_edge_percent,
    })
}

/// The definitions the app shows under "How the figures are defined" (plain words, one
/// sentence each, formulas in ASCII). The colour scale is the app's to describe.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MapDefinitions {
    /// Standard deviation over mean.
    pub std_over_mean: &'static str,
    /// Range over sum.
    pub range_over_sum: &'static str,
    /// Range over mean.
    pub range_over_mean: &'static str,
    /// Centre-to-edge change.
    pub centre_to_edge: &'static str,
    /// How the filled map between the sites is made.
    pub interpolation: &'static str,
}

/// The definitions of the map's figures, in words.
pub const MAP_DEFINITIONS: MapDefinitions = MapDefinitions {
    std_over_mean: "std/mean = 100 x s / mean, with s the sample standard deviation of the \
                    wafer's sites (n - 1 in the denominator), in percent",
    range_over_sum: "range/sum = 100 x (max - min) / (max + min) over the wafer's sites, in \
                     percent",
    range_over_mean: "range/mean = 100 x (max - min) / mean over the wafer's sites, in percent",
    centre_to_edge: "centre-to-edge = 100 x (centre - edge) / edge, where centre is the mean of \
                     the sites within 10 % of the outermost site's radius from the wafer centre \
                     and edge the mean of the sites at 95 % of that radius or more, in percent",
    interpolation: "the filled map is a Delaunay triangulation of the sites (Bowyer 1981, \
                    Watson 1981) with the value linear within each triangle, and nothing is \
                    drawn outside the convex hull of the sites",
};

#[cfg(test)]
mod tests {
    use super::*;

    /// The 49-site polar pattern: centre, 8 at 22 mm, 16 at 44 mm, 24 at 66 mm (synthetic).
    pub(crate) fn polar_49() -> Vec<(f64, f64)> {
        let mut sites = vec![(0.0, 0.0)];
        for (count, radius) in [(8, 22.0), (16, 44.0), (24, 66.0)] {
            for k in 0..count {
                let a = 2.0 * std::f64::consts::PI * k as f64 / count as f64;
                sites.push((radius * a.cos(), radius * a.sin()));
            }
        }
        sites
    }

    #[test]
    fn merging_averages_values_at_one_position() {
        let merged = merge_close(
            &[(0.0, 0.0, 1.0), (1.0, 0.0, 5.0), (0.0, 5e-10, 3.0)],
            MERGE_DISTANCE_MM,
        );
        assert_eq!(merged, vec![(0.0, 0.0, 2.0), (1.0, 0.0, 5.0)]);
    }

    #[test]
    fn in_circle_calls_a_tie_outside() {
        // The four corners of a unit square are co-circular.
        let (a, b, c, d) = ((0.0, 0.0), (1.0, 0.0), (1.0, 1.0), (0.0, 1.0));
        assert!(!in_circle(a, b, c, d));
        assert!(in_circle(a, b, c, (0.5, 0.5)));
        assert!(!in_circle(a, b, c, (2.0, 2.0)));
    }

    #[test]
    fn polar_triangulation_covers_the_hull() {
        let points: Vec<(f64, f64, f64)> = polar_49().iter().map(|&(x, y)| (x, y, 1.0)).collect();
        let fit = SurfaceFit::new(&points).unwrap();
        // Euler: a triangulation of n points with h on the hull has 2n - 2 - h triangles.
        assert_eq!(fit.triangles().len(), 2 * 49 - 2 - 24);
    }
}
