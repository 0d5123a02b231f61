//! The wafer map's figures against outside sources: the interpolated surface against SciPy's
//! `LinearNDInterpolator`, the uniformity figures against NumPy (both from
//! `core/tests/data/gen_map_reference.py`), and the diameter inference and radial profile on
//! the demo site patterns (synthetic, stated with each test).

use std::f64::consts::PI;

use bandgauge_core::lots::map::{
    MAP_DEFINITIONS, STANDARD_DIAMETERS_MM, SurfaceFit, Uniformity, infer_diameter_mm,
    radial_profile, uniformity,
};
use bandgauge_core::lots::{LotBook, ReadOptions, read_str};

/// SciPy's and NumPy's values are written with 17 significant digits; the interpolants are the
/// same formula on the same (unique) triangulation, evaluated in a different order.
const SCIPY_RELATIVE: f64 = 1e-9;
/// Closed forms evaluated in f64.
const CLOSED_FORM_RELATIVE: f64 = 1e-12;

fn close(actual: f64, expected: f64, relative: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= relative * expected.abs().max(1e-300),
        "{what}: got {actual:e}, expected {expected:e}"
    );
}

#[test]
fn surface_matches_scipy_linear_nd_interpolator() {
    // Source: SciPy 1.17.1 LinearNDInterpolator (gen_map_reference.py, map_reference.csv).
    let text = include_str!("data/map_reference.csv");
    let mut sites = Vec::new();
    let mut queries = Vec::new();
    for line in text.lines().filter(|l| !l.starts_with('#')).skip(1) {
        let cells: Vec<&str> = line.split(',').collect();
        let number = |i: usize| cells[i].parse::<f64>().unwrap();
        let row = (number(1), number(2), number(3));
        match cells[0] {
            "site" => sites.push(row),
            "query" => queries.push(row),
            other => panic!("unknown row kind {other}"),
        }
    }
    assert_eq!((sites.len(), queries.len()), (30, 200));
    let fit = SurfaceFit::new(&sites).unwrap();
    let mut inside = 0;
    for &(x, y, expected) in &queries {
        match fit.value_at(x, y) {
            Some(v) => {
                assert!(!expected.is_nan(), "({x}, {y}): {v}, SciPy has none");
                close(v, expected, SCIPY_RELATIVE, &format!("value at ({x}, {y})"));
                inside += 1;
            }
            None => assert!(expected.is_nan(), "({x}, {y}): none, SciPy has {expected}"),
        }
    }
    assert_eq!(inside, 178);
}

#[test]
fn uniformity_matches_numpy() {
    // Source: NumPy 2.4.6, mean and std(ddof=1) of this set (gen_map_reference.py output).
    let values = [9.87, 10.02, 10.15, 9.94, 10.31, 9.78, 10.05];
    let u = uniformity(&values).unwrap();
    assert_eq!(u.count, 7);
    close(u.mean, 10.017142857142858, SCIPY_RELATIVE, "mean");
    close(u.std, 0.1771735764454631, SCIPY_RELATIVE, "std");
    close(
        u.std_over_mean_percent,
        1.7687037009672586,
        SCIPY_RELATIVE,
        "std/mean",
    );
    close(
        u.range_over_sum_percent,
        2.638128422100553,
        SCIPY_RELATIVE,
        "range/sum",
    );
    close(
        u.range_over_mean_percent,
        5.2909298345693205,
        SCIPY_RELATIVE,
        "range/mean",
    );
    assert_eq!((u.min, u.max), (9.78, 10.31));
    // The running-tally form gives the same figures.
    assert_eq!(
        Uniformity::from_moments(7, u.mean, u.std, u.min, u.max),
        Some(u)
    );
}

#[test]
fn uniformity_refuses_what_has_no_figures() {
    assert_eq!(uniformity(&[]), None);
    assert_eq!(uniformity(&[10.0]), None);
    assert_eq!(uniformity(&[10.0, f64::NAN]), None);
    assert_eq!(uniformity(&[10.0, f64::INFINITY]), None);
    assert_eq!(uniformity(&[-1.0, 1.0]), None);
    // Source: closed form; 1 and 3: mean 2, s = sqrt(2), range 2, sum 4.
    let u = uniformity(&[1.0, 3.0]).unwrap();
    close(
        u.std_over_mean_percent,
        50.0 * 2f64.sqrt(),
        CLOSED_FORM_RELATIVE,
        "std/mean",
    );
    close(
        u.range_over_sum_percent,
        50.0,
        CLOSED_FORM_RELATIVE,
        "range/sum",
    );
    close(
        u.range_over_mean_percent,
        100.0,
        CLOSED_FORM_RELATIVE,
        "range/mean",
    );
}

/// The demo lots' 49-site polar pattern: centre, 8 at 22 mm, 16 at 44 mm, 24 at 66 mm, each
/// ring from +x (synthetic; demo-wafers/make_patterned_lots.py).
fn polar_49() -> Vec<(f64, f64)> {
    let mut sites = vec![(0.0, 0.0)];
    for (count, radius) in [(8, 22.0), (16, 44.0), (24, 66.0)] {
        for k in 0..count {
            let a = 2.0 * PI * k as f64 / count as f64;
            sites.push((radius * a.cos(), radius * a.sin()));
        }
    }
    sites
}

#[test]
fn diameter_is_the_smallest_standard_wafer_holding_the_sites() {
    // Source: SEMI M1 nominal diameters (STANDARD_DIAMETERS_MM); the demo lots are 150 mm
    // wafers with the outer ring at 66 mm (synthetic).
    assert_eq!(infer_diameter_mm(&polar_49()), Some(150.0));
    assert_eq!(infer_diameter_mm(&[(0.0, 20.0)]), Some(50.8));
    assert_eq!(infer_diameter_mm(&[(30.0, 40.0)]), Some(125.0)); // r = 50: 100 mm is not > 50
    assert_eq!(infer_diameter_mm(&[(0.0, 75.0)]), Some(200.0));
    assert_eq!(infer_diameter_mm(&[(0.0, 224.0)]), Some(450.0));
    assert_eq!(infer_diameter_mm(&[(0.0, 225.0)]), None);
    assert_eq!(infer_diameter_mm(&[]), None);
    assert_eq!(infer_diameter_mm(&[(f64::NAN, 0.0)]), None);
    assert_eq!(STANDARD_DIAMETERS_MM[0], 50.8); // 2 in = 50.8 mm exactly (from memory)
}

#[test]
fn radial_profile_of_the_centre_high_pattern() {
    // Synthetic: the C2-4429 demo profile without noise, rho = 10 (1 + 0.11 (1 - (r/66)^2)):
    // centre (r <= 6.6 mm: the centre site) 11.1, edge (r >= 62.7 mm: the outer ring) 10.0,
    // so centre-to-edge = 11 %.
    let points: Vec<(f64, f64, f64)> = polar_49()
        .into_iter()
        .map(|(x, y)| {
            let r = x.hypot(y);
            (x, y, 10.0 * (1.0 + 0.11 * (1.0 - (r / 66.0).powi(2))))
        })
        .collect();
    let profile = radial_profile(&points).unwrap();
    assert_eq!(profile.points.len(), 49);
    assert!(
        profile
            .points
            .windows(2)
            .all(|w| w[0].radius_mm <= w[1].radius_mm)
    );
    close(
        profile.outer_radius_mm,
        66.0,
        CLOSED_FORM_RELATIVE,
        "outer radius",
    );
    close(profile.centre, 11.1, CLOSED_FORM_RELATIVE, "centre");
    close(profile.edge, 10.0, CLOSED_FORM_RELATIVE, "edge");
    close(
        profile.centre_to_edge_percent,
        11.0,
        1e-10,
        "centre-to-edge",
    );

    // Without the centre site nothing is within 10 % of 66 mm; with only the centre site
    // nothing is off-centre; an edge of zero has no ratio.
    assert_eq!(radial_profile(&points[1..]), None);
    assert_eq!(radial_profile(&points[..1]), None);
    assert_eq!(radial_profile(&[(0.0, 0.0, 1.0), (5.0, 0.0, 0.0)]), None);
    assert_eq!(radial_profile(&[]), None);
    assert_eq!(
        radial_profile(&[(0.0, 0.0, f64::NAN), (5.0, 0.0, 1.0)]),
        None
    );
}

#[test]
fn the_lot_report_carries_uniformity_and_centre_to_edge() {
    // Synthetic: the C2-4429 demo lot is centre-high by 11 % with 0.4 % noise per site
    // (demo-wafers/make_patterned_lots.py), so each wafer's centre-to-edge is 11 % within a few
    // percent of noise.
    let text = include_str!("../../demo-wafers/c2-4429-radial.csv");
    let mut book = LotBook::new();
    read_str(text, &ReadOptions::default(), &mut book, &mut |_| {}).unwrap();
    let report = book.report(None);
    for wafer in &report.lots[0].wafer_results {
        let c2e = wafer.centre_to_edge_percent.unwrap();
        assert!((9.0..13.0).contains(&c2e), "wafer {}: {c2e}", wafer.wafer);
        let u = wafer.uniformity.unwrap();
        let r = &wafer.resistivity_ohm_cm;
        close(
            u.std_over_mean_percent,
            r.nonuniformity_percent.unwrap(),
            1e-12,
            "std/mean",
        );
        close(
            u.range_over_mean_percent,
            100.0 * (r.max - r.min) / r.mean,
            1e-12,
            "range/mean",
        );
    }
}

#[test]
fn definitions_name_the_method() {
    assert!(MAP_DEFINITIONS.interpolation.contains("Delaunay"));
    assert!(MAP_DEFINITIONS.interpolation.contains("convex hull"));
    assert!(
        MAP_DEFINITIONS
            .range_over_sum
            .contains("(max - min) / (max + min)")
    );
}
