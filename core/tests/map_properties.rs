//! Properties of the wafer map's surface (`lots::map::SurfaceFit`): the triangulation is valid
//! (anticlockwise triangles that cover the convex hull exactly once, every site a vertex, the
//! empty-circumcircle property of Delaunay within rounding) on the polar and grid site patterns,
//! whose co-circular sites are the hard case, and on random and lattice site sets; a planar
//! field is reproduced exactly (the linear interpolant's defining property; common practice, no
//! source); the raster agrees with `value_at` cell by cell; odd inputs give errors, not panics.

use std::f64::consts::PI;

use bandgauge_core::lots::map::{
    Grid, MapError, SurfaceFit, infer_diameter_mm, radial_profile, uniformity,
};
use proptest::prelude::*;

/// Reproduction of a planar field: exact but for rounding in the barycentric weights.
const PLANE_RELATIVE: f64 = 1e-9;
/// Triangle areas summed against the hull's area, both in f64.
const AREA_RELATIVE: f64 = 1e-9;
/// A site counts as inside a circumcircle only beyond this fraction of the radius squared
/// (co-circular sites are ties either way).
const CIRCLE_RELATIVE: f64 = 1e-9;

/// Centre, then rings of `counts[k]` sites at `radii[k]` mm, each from +x anticlockwise
/// (synthetic).
fn polar(rings: &[(usize, f64)]) -> Vec<(f64, f64)> {
    let mut sites = vec![(0.0, 0.0)];
    for &(count, radius) in rings {
        for k in 0..count {
            let a = 2.0 * PI * k as f64 / count as f64;
            sites.push((radius * a.cos(), radius * a.sin()));
        }
    }
    sites
}

/// The 49-site polar pattern: centre, 8 at 22 mm, 16 at 44 mm, 24 at 66 mm (synthetic).
fn polar_49() -> Vec<(f64, f64)> {
    polar(&[(8, 22.0), (16, 44.0), (24, 66.0)])
}

/// A 121-site polar pattern: centre and rings of 8, 16, 24, 32, 40 at 14 mm steps (synthetic).
fn polar_121() -> Vec<(f64, f64)> {
    polar(&[(8, 14.0), (16, 28.0), (24, 42.0), (32, 56.0), (40, 70.0)])
}

/// An 11 x 11 square grid at 12 mm pitch (121 sites; every cell's corners are co-circular and
/// every row is collinear; synthetic).
fn grid_121() -> Vec<(f64, f64)> {
    (0..121)
        .map(|k| ((k % 11) as f64 * 12.0 - 60.0, (k / 11) as f64 * 12.0 - 60.0))
        .collect()
}

fn with_values(xy: &[(f64, f64)], f: impl Fn(f64, f64) -> f64) -> Vec<(f64, f64, f64)> {
    xy.iter().map(|&(x, y)| (x, y, f(x, y))).collect()
}

fn cross(o: (f64, f64), a: (f64, f64), b: (f64, f64)) -> f64 {
    (a.0 - o.0) * (b.1 - o.1) - (a.1 - o.1) * (b.0 - o.0)
}

/// Area of the convex hull (Andrew's monotone chain).
fn hull_area(points: &[(f64, f64)]) -> f64 {
    let mut p = points.to_vec();
    p.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.total_cmp(&b.1)));
    let mut hull: Vec<(f64, f64)> = Vec::new();
    for pass in 0..2 {
        let start = hull.len();
        let iter: Box<dyn Iterator<Item = &(f64, f64)>> = if pass == 0 {
            Box::new(p.iter())
        } else {
            Box::new(p.iter().rev())
        };
        for &q in iter {
            while hull.len() >= start + 2
                && cross(hull[hull.len() - 2], hull[hull.len() - 1], q) <= 0.0
            {
                hull.pop();
            }
            hull.push(q);
        }
        hull.pop();
    }
    let n = hull.len();
    (0..n)
        .map(|i| {
            let (a, b) = (hull[i], hull[(i + 1) % n]);
            a.0 * b.1 - b.0 * a.1
        })
        .sum::<f64>()
        / 2.0
}

/// Fails naming what is wrong with the triangulation of `fit`.
fn check_valid(fit: &SurfaceFit, delaunay: bool) -> Result<(), String> {
    let pts: Vec<(f64, f64)> = fit.points().iter().map(|&(x, y, _)| (x, y)).collect();
    let mut area = 0.0;
    let mut edges = std::collections::HashSet::new();
    let mut used = vec![false; pts.len()];
    for t in fit.triangles() {
        let [a, b, c] = t.map(|i| pts[i]);
        let twice = cross(a, b, c);
        if twice <= 0.0 {
            return Err(format!(
                "triangle {t:?} is not anticlockwise (2A = {twice:e})"
            ));
        }
        area += twice / 2.0;
        for (u, v) in [(t[0], t[1]), (t[1], t[2]), (t[2], t[0])] {
            if !edges.insert((u, v)) {
                return Err(format!("edge {u}->{v} in two triangles: they overlap"));
            }
        }
        for &i in t {
            used[i] = true;
        }
    }
    if let Some(i) = used.iter().position(|u| !u) {
        return Err(format!("site {i} is in no triangle"));
    }
    let hull = hull_area(&pts);
    if (area - hull).abs() > AREA_RELATIVE * hull {
        return Err(format!("triangles cover {area}, the hull is {hull}"));
    }
    if delaunay {
        for t in fit.triangles() {
            let [a, b, c] = t.map(|i| pts[i]);
            // Circumcentre and radius squared.
            let d = 2.0 * (a.0 * (b.1 - c.1) + b.0 * (c.1 - a.1) + c.0 * (a.1 - b.1));
            let sq = |p: (f64, f64)| p.0 * p.0 + p.1 * p.1;
            let ux = (sq(a) * (b.1 - c.1) + sq(b) * (c.1 - a.1) + sq(c) * (a.1 - b.1)) / d;
            let uy = (sq(a) * (c.0 - b.0) + sq(b) * (a.0 - c.0) + sq(c) * (b.0 - a.0)) / d;
            let r2 = (a.0 - ux).powi(2) + (a.1 - uy).powi(2);
            for (i, &p) in pts.iter().enumerate() {
                let d2 = (p.0 - ux).powi(2) + (p.1 - uy).powi(2);
                if d2 < r2 * (1.0 - CIRCLE_RELATIVE) {
                    return Err(format!("site {i} lies inside the circumcircle of {t:?}"));
                }
            }
        }
    }
    Ok(())
}

#[test]
fn polar_49_triangulation_is_valid_and_delaunay() {
    let fit = SurfaceFit::new(&with_values(&polar_49(), |x, _| x)).unwrap();
    check_valid(&fit, true).unwrap();
    // Euler's formula for a triangulation of n sites, h of them on the hull: 2n - 2 - h.
    assert_eq!(fit.triangles().len(), 2 * 49 - 2 - 24);
}

#[test]
fn polar_121_triangulation_is_valid_and_delaunay() {
    let fit = SurfaceFit::new(&with_values(&polar_121(), |x, y| x * y)).unwrap();
    check_valid(&fit, true).unwrap();
    assert_eq!(fit.triangles().len(), 2 * 121 - 2 - 40);
}

#[test]
fn square_grid_triangulation_is_valid_and_delaunay() {
    let fit = SurfaceFit::new(&with_values(&grid_121(), |x, _| x)).unwrap();
    check_valid(&fit, true).unwrap();
    // Two triangles per grid cell.
    assert_eq!(fit.triangles().len(), 2 * 10 * 10);
}

#[test]
fn a_plane_is_reproduced_on_the_polar_pattern() {
    let plane = |x: f64, y: f64| 10.0 + 0.03 * x - 0.02 * y;
    let fit = SurfaceFit::new(&with_values(&polar_49(), plane)).unwrap();
    let grid = Grid::covering(75.0, 60);
    let raster = fit.raster(&grid);
    let mut inside = 0;
    for j in 0..grid.ny {
        for i in 0..grid.nx {
            let (x, y) = grid.centre(i, j);
            let v = raster[j * grid.nx + i];
            // The 24-gon of the outer ring: inside when within its inscribed circle.
            let r = x.hypot(y);
            if r < 66.0 * (PI / 24.0).cos() - 1e-6 {
                assert!(!v.is_nan(), "cell ({i}, {j}) at r = {r} has no value");
            }
            if r > 66.0 + 1e-6 {
                assert!(v.is_nan(), "cell ({i}, {j}) at r = {r} outside has a value");
            }
            if !v.is_nan() {
                inside += 1;
                assert!((v - plane(x, y)).abs() <= PLANE_RELATIVE * 12.0);
            }
        }
    }
    assert!(inside > 1000);
}

#[test]
fn raster_rows_start_at_the_lowest_y() {
    // Value y: row 0 must read low, the last row high.
    let fit = SurfaceFit::new(&with_values(&grid_121(), |_, y| y)).unwrap();
    let grid = Grid::covering(60.0, 10);
    let raster = fit.raster(&grid);
    assert!((raster[5] - grid.y0).abs() < 1e-9);
    assert!((raster[9 * 10 + 5] - (grid.y0 + 9.0 * grid.step)).abs() < 1e-9);
    assert!((grid.y0 - (-54.0)).abs() < 1e-12 && (grid.step - 12.0).abs() < 1e-12);
}

#[test]
fn odd_inputs_give_errors_not_panics() {
    assert_eq!(
        SurfaceFit::new(&[]).unwrap_err(),
        MapError::TooFewSites { distinct: 0 }
    );
    assert_eq!(
        SurfaceFit::new(&[(1.0, 1.0, 2.0)]).unwrap_err(),
        MapError::TooFewSites { distinct: 1 }
    );
    // Three sites, two at one position (within 1e-9 mm).
    let err = SurfaceFit::new(&[(0.0, 0.0, 1.0), (5.0, 0.0, 1.0), (5.0, 1e-10, 3.0)]).unwrap_err();
    assert_eq!(err, MapError::TooFewSites { distinct: 2 });
    assert_eq!(
        err.to_string(),
        "a map needs at least 3 sites at distinct positions; this wafer has 2"
    );
    assert_eq!(
        SurfaceFit::new(&[
            (0.0, 0.0, 1.0),
            (1.0, 1.0, 1.0),
            (2.0, 2.0, 1.0),
            (3.0, 3.0, 1.0)
        ])
        .unwrap_err(),
        MapError::Collinear
    );
    for bad in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
        let points = [
            (0.0, 0.0, 1.0),
            (1.0, 0.0, 1.0),
            (0.0, bad, 1.0),
            (1.0, 1.0, bad),
        ];
        assert_eq!(
            SurfaceFit::new(&points).unwrap_err(),
            MapError::NotFinite { index: 2 }
        );
    }
    let fit = SurfaceFit::new(&[(0.0, 0.0, 1.0), (1.0, 0.0, 2.0), (0.0, 1.0, 3.0)]).unwrap();
    assert_eq!(fit.value_at(f64::NAN, 0.0), None);
    assert_eq!(fit.value_at(2.0, 2.0), None);
    assert_eq!(fit.value_at(0.0, 0.0), Some(1.0));
    // Degenerate grids give all-NaN or empty rasters, not panics.
    assert!(fit.raster(&Grid::covering(1.0, 0)).is_empty());
    for step in [0.0, -1.0, f64::NAN] {
        let grid = Grid {
            x0: 0.0,
            y0: 0.0,
            step,
            nx: 3,
            ny: 2,
        };
        assert!(fit.raster(&grid).iter().all(|v| v.is_nan()));
    }
}

#[test]
fn duplicates_merge_into_their_mean() {
    let fit = SurfaceFit::new(&[
        (0.0, 0.0, 1.0),
        (10.0, 0.0, 2.0),
        (0.0, 10.0, 3.0),
        (0.0, 0.0, 5.0),
    ])
    .unwrap();
    assert_eq!(
        fit.points(),
        &[(0.0, 0.0, 3.0), (10.0, 0.0, 2.0), (0.0, 10.0, 3.0)]
    );
    assert_eq!(fit.value_at(0.0, 0.0), Some(3.0));
}

fn random_sites(max: usize) -> impl Strategy<Value = Vec<(f64, f64)>> {
    prop::collection::vec((-100.0..100.0f64, -100.0..100.0f64), 3..max)
}

/// Sites on a small integer lattice: many collinear and co-circular, with duplicates.
fn lattice_sites() -> impl Strategy<Value = Vec<(f64, f64)>> {
    prop::collection::vec((-4i32..=4, -4i32..=4), 3..60).prop_map(|v| {
        v.into_iter()
            .map(|(x, y)| (x as f64 * 7.5, y as f64 * 7.5))
            .collect()
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn planes_are_reproduced_at_interior_points(
        sites in random_sites(60),
        a in -100.0..100.0f64, b in -2.0..2.0f64, c in -2.0..2.0f64,
        queries in prop::collection::vec((-100.0..100.0f64, -100.0..100.0f64), 50),
    ) {
        let plane = |x: f64, y: f64| a + b * x + c * y;
        let fit = match SurfaceFit::new(&with_values(&sites, plane)) {
            Ok(fit) => fit,
            Err(MapError::Collinear | MapError::TooFewSites { .. }) => return Ok(()),
            Err(e) => return Err(TestCaseError::fail(e.to_string())),
        };
        check_valid(&fit, true).map_err(TestCaseError::fail)?;
        for (x, y) in queries {
            if let Some(v) = fit.value_at(x, y) {
                let scale = a.abs() + (b * x).abs() + (c * y).abs();
                prop_assert!((v - plane(x, y)).abs() <= PLANE_RELATIVE * scale,
                    "at ({x}, {y}): {v} vs {}", plane(x, y));
            }
        }
        // Every site's centroid-side interior point of a triangle has a value.
        for t in fit.triangles() {
            let p = fit.points();
            let (x, y) = ((p[t[0]].0 + p[t[1]].0 + p[t[2]].0) / 3.0, (p[t[0]].1 + p[t[1]].1 + p[t[2]].1) / 3.0);
            prop_assert!(fit.value_at(x, y).is_some());
        }
    }

    #[test]
    fn raster_agrees_with_value_at(sites in random_sites(40), n in 1usize..50) {
        let fit = match SurfaceFit::new(&with_values(&sites, |x, y| (x / 30.0).sin() + y * y / 1e3)) {
            Ok(fit) => fit,
            Err(_) => return Ok(()),
        };
        let grid = Grid::covering(110.0, n);
        let raster = fit.raster(&grid);
        prop_assert_eq!(raster.len(), n * n);
        for j in 0..n {
            for i in 0..n {
                let (x, y) = grid.centre(i, j);
                let cell = raster[j * n + i];
                match fit.value_at(x, y) {
                    Some(v) => prop_assert!((cell - v).abs() <= 1e-9 * v.abs().max(1.0),
                        "cell ({}, {}): raster {} value_at {}", i, j, cell, v),
                    None => prop_assert!(cell.is_nan(), "cell ({}, {}) outside has {}", i, j, cell),
                }
            }
        }
    }

    #[test]
    fn lattice_sites_triangulate_validly(sites in lattice_sites()) {
        match SurfaceFit::new(&with_values(&sites, |x, y| x - y)) {
            Ok(fit) => check_valid(&fit, true).map_err(TestCaseError::fail)?,
            Err(MapError::Collinear | MapError::TooFewSites { .. }) => {}
            Err(e) => return Err(TestCaseError::fail(e.to_string())),
        }
    }

    #[test]
    fn rotated_rings_triangulate_validly(turn in 0.0..1.0f64, counts in prop::collection::vec(3usize..40, 1..5)) {
        // Co-circular rings at any rotation, with and without a centre site.
        let mut sites = vec![(0.0, 0.0)];
        for (k, &count) in counts.iter().enumerate() {
            let radius = 15.0 * (k + 1) as f64;
            for s in 0..count {
                let a = 2.0 * PI * (s as f64 / count as f64 + turn);
                sites.push((radius * a.cos(), radius * a.sin()));
            }
        }
        for sites in [&sites[..], &sites[1..]] {
            match SurfaceFit::new(&with_values(sites, |x, _| x)) {
                Ok(fit) => check_valid(&fit, true).map_err(TestCaseError::fail)?,
                Err(e) => return Err(TestCaseError::fail(e.to_string())),
            }
        }
    }

    #[test]
    fn any_numbers_give_a_result_or_an_error_never_a_panic(
        points in prop::collection::vec((any::<f64>(), any::<f64>(), any::<f64>()), 0..12),
        tiny in prop::collection::vec((-1e-6..1e-6f64, -1e-6..1e-6f64, any::<f64>()), 0..12),
    ) {
        for set in [&points, &tiny] {
            let xy: Vec<(f64, f64)> = set.iter().map(|&(x, y, _)| (x, y)).collect();
            let values: Vec<f64> = set.iter().map(|&(_, _, v)| v).collect();
            let _ = infer_diameter_mm(&xy);
            let _ = radial_profile(set);
            let _ = uniformity(&values);
            if let Ok(fit) = SurfaceFit::new(set) {
                // Areas of sites beyond 1e100 mm overflow in the check itself.
                if xy.iter().all(|&(x, y)| x.abs() < 1e100 && y.abs() < 1e100) {
                    check_valid(&fit, false).map_err(TestCaseError::fail)?;
                }
                let _ = fit.value_at(0.0, 0.0);
                let _ = fit.raster(&Grid::covering(1e-6, 8));
            }
        }
    }
}
