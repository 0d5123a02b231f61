//! Reference checks of the Fermi-Dirac integrals F_1/2, F_-1/2, ln F_1/2 and the inverses against mpmath.
//!
//! Source of every value: `data/fermi_dirac_half.csv`, computed by mpmath 1.3.0 at
//! 40 significant digits from the exact form F_j(eta) = -Re Li_(j+1)(-exp(eta))
//! (NIST DLMF section 25.12(iii)) and rounded to 17 significant digits;
//! regenerate with `python3 core/tests/data/gen_fermi_dirac.py csv`. The script
//! checks the polylogarithm form against direct quadrature before writing.

use bandgauge_core::fermi_dirac::{
    f_half, f_half_inverse, f_minus_half, ln_f_half, ln_f_half_inverse,
};

/// Accuracy promised by the API contract for every function (relative in F,
/// absolute in ln F, relative in u for the inverses).
const CONTRACT_REL_TOL: f64 = 1e-10;
/// Design goal: the tables are exact to about 2e-16 in f64 and the reference
/// is rounded to 17 digits (5e-18), so 1e-12 leaves a wide margin for exp, ln
/// and the rounding of eta itself (|eta| <= 1000 moves ln F by < 2e-13).
const GOAL_REL_TOL: f64 = 1e-12;

/// One line of the reference table.
struct Row {
    eta: f64,
    f_half: f64,
    f_minus_half: f64,
}

fn rows() -> Vec<Row> {
    include_str!("data/fermi_dirac_half.csv")
        .lines()
        .filter(|line| !line.starts_with('#') && !line.starts_with("eta"))
        .map(|line| {
            let v: Vec<f64> = line
                .split(',')
                .map(|field| field.parse().expect("reference CSV holds numbers"))
                .collect();
            assert_eq!(v.len(), 3, "reference CSV line {line:?}");
            Row {
                eta: v[0],
                f_half: v[1],
                f_minus_half: v[2],
            }
        })
        .collect()
}

/// Asserts that the worst error over the table is below both tolerances and
/// names the worst row; `error` maps a row to the error of one function.
fn check(function: &str, error: impl Fn(&Row) -> f64) {
    let table = rows();
    let (worst_eta, worst) =
        table
            .iter()
            .map(|row| (row.eta, error(row)))
            .fold((f64::NAN, 0.0_f64), |acc, (eta, e)| {
                assert!(!e.is_nan(), "{function}: NaN error at eta = {eta}");
                if e > acc.1 { (eta, e) } else { acc }
            });
    assert!(
        worst < CONTRACT_REL_TOL,
        "{function}: error {worst:e} at eta = {worst_eta} breaks the contract"
    );
    assert!(
        worst < GOAL_REL_TOL,
        "{function}: error {worst:e} at eta = {worst_eta} misses the design goal"
    );
}

fn relative(got: f64, expected: f64) -> f64 {
    ((got - expected) / expected).abs()
}

#[test]
fn table_covers_the_documented_range() {
    let table = rows();
    assert!(table.len() >= 200, "only {} reference rows", table.len());
    assert_eq!(table.first().map(|r| r.eta), Some(-200.0));
    assert_eq!(table.last().map(|r| r.eta), Some(1000.0));
    let dense = table
        .iter()
        .filter(|r| (-5.0..=40.0).contains(&r.eta))
        .count();
    assert!(dense >= 150, "only {dense} rows in -5..40");
}

#[test]
fn f_half_matches_mpmath() {
    check("f_half", |r| relative(f_half(r.eta), r.f_half));
}

#[test]
fn f_minus_half_matches_mpmath() {
    check("f_minus_half", |r| {
        relative(f_minus_half(r.eta), r.f_minus_half)
    });
}

#[test]
fn ln_f_half_matches_mpmath() {
    // Absolute error in ln F is the relative error in F.
    check("ln_f_half", |r| (ln_f_half(r.eta) - r.f_half.ln()).abs());
}

/// Relative error in u implied by an error in eta: d ln F_1/2 / d eta = F_-1/2 / F_1/2.
fn implied_u_error(row: &Row, eta: f64) -> f64 {
    (eta - row.eta).abs() * row.f_minus_half / row.f_half
}

#[test]
fn f_half_inverse_recovers_eta() {
    check("f_half_inverse", |r| {
        let eta = f_half_inverse(r.f_half).expect("reference u is positive and finite");
        implied_u_error(r, eta)
    });
}

#[test]
fn ln_f_half_inverse_recovers_eta() {
    check("ln_f_half_inverse", |r| {
        let eta = ln_f_half_inverse(r.f_half.ln()).expect("reference ln u is in range");
        implied_u_error(r, eta)
    });
}
