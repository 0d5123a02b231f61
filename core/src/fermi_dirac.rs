//! Fermi-Dirac integrals of order 1/2 and -1/2 (normalised) and the inverse of F_1/2.
//!
//! The carrier density in a parabolic band is `n = Nc F_1/2(eta)` with
//! `eta = (E_F - E_C) / kT`; the neutrality solver evaluates these functions a
//! few dozen times per solve, so each call is a table look-up plus one short
//! polynomial, never a quadrature.
//!
//! # Normalisation
//!
//! `F_j(eta) = (1 / Gamma(j + 1)) int_0^inf x^j / (1 + exp(x - eta)) dx`, so
//! `F_j(eta) -> exp(eta)` as `eta -> -inf` and `d F_j / d eta = F_(j-1)`.
//! Exactly, `F_j(eta) = -Li_(j+1)(-exp(eta))` (polylogarithm; NIST DLMF
//! section 25.12(iii), from memory).
//!
//! # Method
//!
//! Piecewise approximation in three regions, in the spirit of Fukushima's
//! piecewise minimax rational approximations (Appl. Math. Comput. 259, 708
//! (2015)) but with truncated Chebyshev polynomials of our own, generated with
//! mpmath by `core/tests/data/gen_fermi_dirac.py`:
//!
//! * `eta < -2`: `F_j(eta) = t P_j(t)` with `t = exp(eta) <= 0.135`, where
//!   `P_j(t) = sum_k (-1)^(k+1) t^(k-1) / k^(j+1)` (the polylogarithm series),
//!   replaced by its truncated Chebyshev interpolant on `[0, exp(-2)]`
//!   (11 terms).
//! * `-2 <= eta < 40`: 84 pieces of width 1/2, each a truncated Chebyshev
//!   interpolant of `F_j` rewritten in powers of `eta - centre`
//!   (at most 13 terms, 6 at large eta; stored padded with zeros).
//! * `eta >= 40`: the Sommerfeld expansion
//!   `F_j(eta) = eta^(j+1) / Gamma(j+2) [1 + sum_k 2 (1 - 2^(1-2k)) zeta(2k)
//!   (j+1)(j)...(j+2-2k) eta^(-2k)]` (Sommerfeld, Z. Phys. 47, 1 (1928)).
//!   The exact expansion also carries a term `cos(pi j) F_j(-eta)` (Dingle,
//!   Appl. Sci. Res. B 6, 225 (1957), from memory), which vanishes for `j = +-1/2`; the
//!   generator verifies against mpmath that the truncated series is exact to
//!   below 1e-17 for `eta >= 40`.
//!
//! The generator also evaluates the tables in f64 exactly as this module does
//! and records the resulting error in the generated block (about 2e-16);
//! `core/tests/fermi_dirac_reference.rs` checks the functions against an
//! independent mpmath table of about 250 points.
//!
//! The inverse starts from Joyce & Dixon, Appl. Phys. Lett. 31, 354 (1977)
//! (or the leading Sommerfeld terms for large `u`) and takes Newton steps on
//! `ln F_1/2`, which is concave in `eta` (checked with mpmath on -15..50; the
//! slope `F_-1/2 / F_1/2` falls from 1 to `1.5 / eta`), so the iteration
//! converges monotonically from any start: usually in one step, at most three.

use std::fmt;

/// `1 / Gamma(5/2) = 4 / (3 sqrt(pi))`, the large-eta prefactor of `F_1/2`.
const INV_GAMMA_5_2: f64 = 0.752_252_778_063_675_1;
/// `ln(1 / Gamma(5/2))`.
const LN_INV_GAMMA_5_2: f64 = -0.284_682_870_472_919_2;
/// `1 / Gamma(3/2) = 2 / sqrt(pi)`, the large-eta prefactor of `F_-1/2`.
const INV_GAMMA_3_2: f64 = std::f64::consts::FRAC_2_SQRT_PI;

/// Largest `ln_u` whose solution `eta` is a finite f64:
/// `ln F_1/2(f64::MAX) = ln(1/Gamma(5/2)) + 1.5 ln(f64::MAX) = 1064.3893864696...`
/// (mpmath), rounded down.
pub const LN_U_MAX: f64 = 1064.389;

/// Joyce & Dixon, Appl. Phys. Lett. 31, 354 (1977): `eta = ln u + sum_i A_i u^i`,
/// `|error| <= 4e-3` for `u <= 8.46`. `A_1 = 1/sqrt(8)`.
pub(crate) const JOYCE_DIXON: [f64; 4] = [
    std::f64::consts::FRAC_1_SQRT_2 / 2.0,
    -4.950_09e-3,
    1.483_86e-4,
    -4.425_63e-6,
];
/// `ln 8.46`: the upper end of the Joyce-Dixon range.
const LN_JOYCE_DIXON_MAX: f64 = 2.135_349_173_618_132;
/// `pi^2 / 12`: first correction of the inverted Sommerfeld series,
/// `eta = x - pi^2 / (12 x)` with `x = (u Gamma(5/2))^(2/3)`.
const PI_SQUARED_OVER_12: f64 = 0.822_467_033_424_113_2;

/// Newton stops once a step is below this fraction of `max(1, |eta|)`; the
/// error left after such a step is about its square (< 1e-18 relative).
const NEWTON_STEP_TOL: f64 = 1e-9;
/// Step budget of the inverse. At most three steps are needed and the
/// iteration is monotone, so reaching it would mean a defect (reported, never
/// hidden).
const MAX_NEWTON_STEPS: usize = 40;

/// Why an inverse Fermi-Dirac integral could not be computed.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum FermiDiracError {
    /// `u` was zero, negative, NaN or infinite; `F_1/2` is positive and finite
    /// for every finite `eta`.
    ReducedDensityNotPositive {
        /// The value given.
        u: f64,
    },
    /// `ln_u` was NaN or infinite.
    LnReducedDensityNotFinite {
        /// The value given.
        ln_u: f64,
    },
    /// `ln_u` exceeds [`LN_U_MAX`]: the solution `eta` would be beyond the f64 range.
    EtaBeyondRange {
        /// The value given.
        ln_u: f64,
    },
    /// Newton's method used its whole step budget without meeting its
    /// tolerance. Not expected for any input; kept so that a defect surfaces
    /// as an error instead of an inaccurate number.
    NoConvergence {
        /// The value given.
        ln_u: f64,
        /// The last iterate.
        eta: f64,
    },
}

impl fmt::Display for FermiDiracError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::ReducedDensityNotPositive { u } => write!(
                f,
                "u: {u} is not allowed; give a finite reduced density u = n/Nc > 0"
            ),
            Self::LnReducedDensityNotFinite { ln_u } => write!(
                f,
                "ln_u: {ln_u} is not allowed; give a finite value <= {LN_U_MAX}"
            ),
            Self::EtaBeyondRange { ln_u } => write!(
                f,
                "ln_u: {ln_u} is not allowed; give a value <= {LN_U_MAX} \
                 (beyond it the reduced Fermi level eta exceeds the f64 range)"
            ),
            Self::NoConvergence { ln_u, eta } => write!(
                f,
                "ln_u: {ln_u}: the inverse of F_1/2 did not converge within \
                 {MAX_NEWTON_STEPS} Newton steps (last eta = {eta}); please report this input"
            ),
        }
    }
}

impl std::error::Error for FermiDiracError {}

/// Normalised Fermi-Dirac integral of order 1/2.
///
/// # Formula
/// `F_1/2(eta) = (2 / sqrt(pi)) int_0^inf sqrt(x) / (1 + exp(x - eta)) dx`,
/// `eta` = reduced Fermi level (dimensionless, e.g. `(E_F - E_C) / kT`).
/// Limits: `exp(eta)` as `eta -> -inf`; `(4 / (3 sqrt(pi))) eta^(3/2)` as `eta -> +inf`.
///
/// # Validity
/// Every `eta`. Relative error below 1e-15 wherever the result is a normal
/// f64 (checked against mpmath). The result underflows gradually below
/// `eta = -708` (subnormal, reduced relative accuracy) and is 0 below about
/// `eta = -745`; it is `+inf` for `eta > 3.9e205` and only there, because the
/// true value then exceeds `f64::MAX`. Use [`ln_f_half`] at such extremes.
/// NaN gives NaN.
///
/// # References
/// Method and tables: see the module documentation (Sommerfeld 1928,
/// Dingle 1957, tables generated with mpmath).
///
/// # Examples
/// ```
/// use bandgauge_core::fermi_dirac::f_half;
/// // F_1/2(0) = (1 - 2^-1/2) zeta(3/2)
/// assert!((f_half(0.0) - 0.765_147_024_625_407_9).abs() < 1e-15);
/// ```
pub fn f_half(eta: f64) -> f64 {
    if eta.is_nan() {
        eta
    } else if eta < LOWER_ETA_MAX {
        lower_half(eta, eta.exp())
    } else if eta < UPPER_ETA_MIN {
        let (piece, d) = mid_piece(eta);
        polynomial(&MID_HALF[piece], d)
    } else {
        let y = 1.0 / (eta * eta);
        // Multiplied in this order so the product overflows only when the
        // true value does.
        INV_GAMMA_5_2 * eta * eta.sqrt() * (1.0 + y * polynomial(&SOMMERFELD_HALF, y))
    }
}

/// [`f_half`] for a caller that has `t = exp(eta)` at hand anyway (the neutrality solver needs
/// it for the dopant occupancies): the same value, one exponential fewer.
#[inline]
pub(crate) fn f_half_with_exp(eta: f64, t: f64) -> f64 {
    if eta < LOWER_ETA_MAX {
        lower_half(eta, t)
    } else {
        f_half(eta)
    }
}

/// `F_1/2(eta)` for `eta < -2`, `t = exp(eta)`. Far below -2 a few terms of the series itself
/// are already exact (see [`SHORT_SERIES_ETA`]); a shorter Horner chain is a shorter wait in
/// the solver.
#[inline]
fn lower_half(eta: f64, t: f64) -> f64 {
    if eta < TWO_TERM_ETA {
        t * polynomial(&SERIES_HALF_2, t)
    } else if eta < SHORT_SERIES_ETA {
        t * polynomial(&SERIES_HALF_5, t)
    } else {
        t * polynomial(&LOWER_HALF, t)
    }
}

/// Natural logarithm of [`f_half`], finite for every finite `eta`.
///
/// # Formula
/// `ln F_1/2(eta)`; for `eta < -2` computed as `eta + ln(F_1/2(eta) e^-eta)` and
/// for `eta >= 40` as `ln(1/Gamma(5/2)) + 1.5 ln eta + ln(1 + Sommerfeld terms)`,
/// so neither underflow nor overflow occurs (`ln_f_half(-1e300) = -1e300`).
///
/// # Validity
/// Every `eta`; absolute error below 1e-15 plus the rounding of `eta` itself
/// (which is `ulp(eta)` for very negative `eta`). `+-inf` give `+-inf`, NaN gives NaN.
///
/// # References
/// As [`f_half`].
pub fn ln_f_half(eta: f64) -> f64 {
    if eta.is_nan() {
        eta
    } else if eta < LOWER_ETA_MAX {
        eta + polynomial(&LOWER_HALF, eta.exp()).ln()
    } else if eta < UPPER_ETA_MIN {
        let (piece, d) = mid_piece(eta);
        polynomial(&MID_HALF[piece], d).ln()
    } else {
        let y = 1.0 / (eta * eta);
        LN_INV_GAMMA_5_2 + 1.5 * eta.ln() + (y * polynomial(&SOMMERFELD_HALF, y)).ln_1p()
    }
}

/// Normalised Fermi-Dirac integral of order -1/2, the derivative of [`f_half`].
///
/// # Formula
/// `F_-1/2(eta) = (1 / sqrt(pi)) int_0^inf x^(-1/2) / (1 + exp(x - eta)) dx
/// = d F_1/2 / d eta`.
/// Limits: `exp(eta)` as `eta -> -inf`; `(2 / sqrt(pi)) eta^(1/2)` as `eta -> +inf`.
///
/// # Validity
/// Every `eta`; relative error below 1e-15 wherever the result is a normal
/// f64; 0 below about `eta = -745`; finite for every finite `eta`. NaN gives NaN.
///
/// # References
/// As [`f_half`].
pub fn f_minus_half(eta: f64) -> f64 {
    if eta.is_nan() {
        eta
    } else if eta < LOWER_ETA_MAX {
        let t = eta.exp();
        t * polynomial(&LOWER_MINUS_HALF, t)
    } else if eta < UPPER_ETA_MIN {
        let (piece, d) = mid_piece(eta);
        polynomial(&MID_MINUS_HALF[piece], d)
    } else {
        let y = 1.0 / (eta * eta);
        INV_GAMMA_3_2 * eta.sqrt() * (1.0 + y * polynomial(&SOMMERFELD_MINUS_HALF, y))
    }
}

/// Reduced Fermi level `eta` with `f_half(eta) = u`.
///
/// # Formula
/// Solves `F_1/2(eta) = u` (for electrons `u = n / Nc`). Start: Joyce & Dixon
/// `eta = ln u + u/sqrt(8) - 4.95009e-3 u^2 + 1.48386e-4 u^3 - 4.42563e-6 u^4`
/// for `u <= 8.46`, otherwise `x - pi^2/(12 x)` with `x = (3 sqrt(pi) u / 4)^(2/3)`;
/// then Newton steps on `ln F_1/2(eta) = ln u` with slope `F_-1/2 / F_1/2`.
///
/// # Validity
/// Every finite `u > 0`, subnormal values included. The returned `eta`
/// reproduces `u` to a relative error of about `1e-15 (1 + |ln u| / 10)`
/// (the rounding of `ln u` dominates for tiny `u`).
///
/// # References
/// Joyce & Dixon, Appl. Phys. Lett. 31, 354 (1977) for the start; the forward
/// function as in [`f_half`].
///
/// # Errors
/// [`FermiDiracError::ReducedDensityNotPositive`] unless `u` is finite and > 0;
/// [`FermiDiracError::NoConvergence`] is reserved for a defect (never observed).
///
/// # Examples
/// ```
/// use bandgauge_core::fermi_dirac::{f_half, f_half_inverse};
/// let eta = f_half_inverse(1.0).unwrap();
/// assert!((f_half(eta) - 1.0).abs() < 1e-14);
/// ```
pub fn f_half_inverse(u: f64) -> Result<f64, FermiDiracError> {
    if !(u.is_finite() && u > 0.0) {
        return Err(FermiDiracError::ReducedDensityNotPositive { u });
    }
    solve_ln_f_half(u.ln())
}

/// Reduced Fermi level `eta` with `ln_f_half(eta) = ln_u`, for densities far
/// outside the f64 range (strong non-degeneracy, e.g. `ln_u = -5000`).
///
/// # Formula
/// As [`f_half_inverse`] with `u = exp(ln_u)`, working on logarithms throughout.
///
/// # Validity
/// `ln_u` finite and at most [`LN_U_MAX`] (about 1064.39). Absolute error of
/// `ln_f_half(eta)` against `ln_u` about 1e-15 plus the rounding of `eta`.
///
/// # References
/// As [`f_half_inverse`].
///
/// # Errors
/// [`FermiDiracError::LnReducedDensityNotFinite`] for NaN or infinite `ln_u`;
/// [`FermiDiracError::EtaBeyondRange`] for `ln_u > LN_U_MAX`;
/// [`FermiDiracError::NoConvergence`] is reserved for a defect (never observed).
pub fn ln_f_half_inverse(ln_u: f64) -> Result<f64, FermiDiracError> {
    if !ln_u.is_finite() {
        return Err(FermiDiracError::LnReducedDensityNotFinite { ln_u });
    }
    if ln_u > LN_U_MAX {
        return Err(FermiDiracError::EtaBeyondRange { ln_u });
    }
    solve_ln_f_half(ln_u)
}

/// Newton on `ln F_1/2(eta) - ln_u`; `ln_u` finite and `<= LN_U_MAX`.
fn solve_ln_f_half(ln_u: f64) -> Result<f64, FermiDiracError> {
    newton_ln_f_half(ln_u).map(|(eta, _steps)| eta)
}

/// The Newton iteration, also returning the number of steps taken.
fn newton_ln_f_half(ln_u: f64) -> Result<(f64, usize), FermiDiracError> {
    let mut eta = starting_eta(ln_u);
    for step_count in 1..=MAX_NEWTON_STEPS {
        let (ln_f, slope) = ln_f_half_and_slope(eta);
        let step = (ln_f - ln_u) / slope;
        eta -= step;
        if step.abs() <= NEWTON_STEP_TOL * eta.abs().max(1.0) {
            return Ok((eta, step_count));
        }
    }
    Err(FermiDiracError::NoConvergence { ln_u, eta })
}

/// Joyce-Dixon start for `u <= 8.46`, inverted two-term Sommerfeld series above.
fn starting_eta(ln_u: f64) -> f64 {
    if ln_u <= LN_JOYCE_DIXON_MAX {
        joyce_dixon(ln_u, ln_u.exp())
    } else {
        let x = ((ln_u - LN_INV_GAMMA_5_2) * (2.0 / 3.0))
            .exp()
            .min(f64::MAX);
        x - PI_SQUARED_OVER_12 / x
    }
}

/// The Joyce-Dixon inverse `eta = ln u + sum_i A_i u^i` ([`JOYCE_DIXON`]), with `ln u` from the
/// caller; `|error| <= 4e-3` for `u <= 8.46`, and far smaller for `u << 1`.
#[inline]
pub(crate) fn joyce_dixon(ln_u: f64, u: f64) -> f64 {
    ln_u + u * polynomial(&JOYCE_DIXON, u)
}

/// `ln F_1/2(eta)` and its slope `F_-1/2(eta) / F_1/2(eta)`, both without
/// underflow or overflow for any finite `eta`.
fn ln_f_half_and_slope(eta: f64) -> (f64, f64) {
    if eta < LOWER_ETA_MAX {
        let t = eta.exp();
        let half = polynomial(&LOWER_HALF, t);
        (eta + half.ln(), polynomial(&LOWER_MINUS_HALF, t) / half)
    } else if eta < UPPER_ETA_MIN {
        let (piece, d) = mid_piece(eta);
        let half = polynomial(&MID_HALF[piece], d);
        (half.ln(), polynomial(&MID_MINUS_HALF[piece], d) / half)
    } else {
        let y = 1.0 / (eta * eta);
        let series = y * polynomial(&SOMMERFELD_HALF, y);
        let ln_f = LN_INV_GAMMA_5_2 + 1.5 * eta.ln() + series.ln_1p();
        // F_-1/2 / F_1/2 = (3 / (2 eta)) (1 + sum b_k y^k) / (1 + sum a_k y^k)
        let ratio = (1.0 + y * polynomial(&SOMMERFELD_MINUS_HALF, y)) / (1.0 + series);
        (ln_f, 1.5 / eta * ratio)
    }
}

/// Index of the table piece holding `eta` (`LOWER_ETA_MAX <= eta < UPPER_ETA_MIN`)
/// and the offset of `eta` from that piece's centre.
#[inline]
fn mid_piece(eta: f64) -> (usize, f64) {
    // `min` guards the last piece against `eta - LOWER_ETA_MAX` rounding up to
    // the upper end; the polynomial is then used 1 ulp outside its piece.
    let piece = (((eta - LOWER_ETA_MAX) / MID_WIDTH) as usize).min(MID_COUNT - 1);
    let centre = LOWER_ETA_MAX + (piece as f64 + 0.5) * MID_WIDTH;
    (piece, eta - centre)
}

/// Below this eta, `F_1/2 = t (1 - t/2^1.5)`: the first term left out, `t^2 / 3^1.5`, is
/// below 8e-19 relative (`t < 2.1e-9`).
const TWO_TERM_ETA: f64 = -20.0;
/// Below this eta (and from [`TWO_TERM_ETA`] up), the first five terms of the polylogarithm
/// series `sum_k (-1)^(k+1) t^k / k^(3/2)`: the first term left out, `t^5 / 6^1.5`, is below
/// 3e-19 relative (`t < 3.4e-4`), far under the rounding of the sum.
const SHORT_SERIES_ETA: f64 = -8.0;
/// `1, -1/2^1.5`: the series of `F_1/2 / t`, two terms.
const SERIES_HALF_2: [f64; 2] = [1.0, -0.353_553_390_593_273_8];
/// `(-1)^k / (k+1)^1.5`, k = 0..4: the series of `F_1/2 / t`, five terms.
const SERIES_HALF_5: [f64; 5] = [
    1.0,
    -0.353_553_390_593_273_8,
    0.192_450_089_729_875_25,
    -0.125,
    0.089_442_719_099_991_59,
];

/// `sum_k coeffs[k] x^k` by Horner's rule.
#[inline]
fn polynomial<const N: usize>(coeffs: &[f64; N], x: f64) -> f64 {
    coeffs.iter().rev().fold(0.0, |acc, &c| acc * x + c)
}

// BEGIN GENERATED by core/tests/data/gen_fermi_dirac.py (do not edit by hand)
// Relative error of these tables evaluated in f64 (sampled against mpmath):
// F_1/2 2.1e-16, F_-1/2 2.0e-16.

/// Below this eta, F_j = t P_j(t) with t = exp(eta).
const LOWER_ETA_MAX: f64 = -2.0;
/// From this eta up, the Sommerfeld series.
const UPPER_ETA_MIN: f64 = 40.0;
/// Width of one table piece between the two, in eta.
const MID_WIDTH: f64 = 0.5;
/// Number of table pieces.
const MID_COUNT: usize = 84;
/// Coefficients per piece (shorter pieces are padded with zeros).
const MID_TERMS: usize = 13;

/// P_1/2(t), powers of t from t^0, for eta < LOWER_ETA_MAX.
#[rustfmt::skip]
const LOWER_HALF: [f64; 11] = [
    1.0, -0.3535533905932708, 0.19245008972898883, -0.124999999896987,
    0.08944271294786504, -0.06804116676940922, 0.05399022056259647, -0.04412758227833291,
    0.03642363698649901, -0.028022888128100887, 0.014701664507340775,
];

/// P_-1/2(t), powers of t from t^0, for eta < LOWER_ETA_MAX.
#[rustfmt::skip]
const LOWER_MINUS_HALF: [f64; 12] = [
    1.0, -0.7071067811865462, 0.5773502691891901, -0.49999999993943073,
    0.44721359114250675, -0.4082481050611433, 0.3779594546430616, -0.35346349420460266,
    0.3322497140717684, -0.3074671141538221, 0.2552041801205966, -0.13734059321606693,
];

/// F_1/2 on each piece, powers of (eta - centre) from the 0th.
#[rustfmt::skip]
const MID_HALF: [[f64; MID_TERMS]; MID_COUNT] = [
    // -2.0 <= eta < -1.5
    [
        0.16400598217411014, 0.15505606435473704, 0.06931557675509051, 0.01829578188031668,
        0.0026041970341241795, -5.0639132230618376e-05, -0.00011551231688528186, -2.2568051404088226e-05,
        7.261215776749802e-07, 1.346992263638056e-06, 2.667110602286872e-07, -1.4048676012071301e-08,
        0.0,
    ],
    // -1.5 <= eta < -1.0
    [
        0.26130908564286676, 0.23935572210360231, 0.1004798842579226, 0.023042703558405556,
        0.0019549831906017744, -0.0004980718654136185, -0.00017223880811399075, -4.316370750364357e-06,
        8.846035590109615e-06, 1.8701180234776143e-06, -2.0346946330528877e-07, -1.56443817131977e-07,
        0.0,
    ],
    // -1.0 <= eta < -0.5
    [
        0.4090911903855376, 0.3579073242216916, 0.13719386116177532, 0.025285091665985762,
        9.000377357553899e-05, -0.0009635763482997254, -0.0001108145859900787, 4.147991938256474e-05,
        1.1633992406900915e-05, -1.2951598294354458e-06, -9.361122958368427e-07, -2.4597241298321456e-08,
        0.0,
    ],
    // -0.5 <= eta < 0.0
    [
        0.6254781023007524, 0.5137933107879051, 0.17397992735992315, 0.022887644395168934,
        -0.002510257753489326, -0.0010142264348642145, 9.040847262216352e-05, 6.33591493455435e-05,
        -3.197761563877925e-06, -4.450186701979769e-06, 3.9602213888717554e-08, 3.254742576855694e-07,
        0.0,
    ],
    // 0.0 <= eta < 0.5
    [
        0.9285439960386521, 0.7033904262554944, 0.2034019528531008, 0.015684990937698613,
        -0.0044601476223880615, -0.00046517241620185924, 0.0002481415725265313, 1.7502417476221734e-05,
        -1.663168417476314e-05, -4.962362184976976e-07, 1.1901484285420725e-06, 0.0,
        0.0,
    ],
    // 0.5 <= eta < 1.0
    [
        1.332760974545192, 0.916228088973455, 0.219894660156263, 0.006231734288381442,
        -0.0046869307541357865, 0.00025969937831145487, 0.00020222531021606014, -3.76495618033116e-05,
        -7.94130676692894e-06, 3.395241889324238e-06, 1.2815520044012765e-07, -2.511037421664099e-07,
        0.0,
    ],
    // 1.0 <= eta < 1.5
    [
        1.8463456745399363, 1.138567662773306, 0.2226988456227619, -0.0020791482701476914,
        -0.003465612778805961, 0.0006392138868114621, 4.8969527139681154e-05, -4.1355275213020064e-05,
        4.644315665867662e-06, 1.6032285912670396e-06, -5.78834601599533e-07, 0.0,
        0.0,
    ],
    // 1.5 <= eta < 2.0
    [
        2.470848161207425, 1.358179089157821, 0.21520187360002033, -0.007370679203283206,
        -0.0018400838351995698, 0.0006097696902501201, -5.3586867494447395e-05, -1.628251439438727e-05,
        6.2482607934467535e-06, -5.442674418181947e-07, -2.1518060648438596e-07, 0.0,
        0.0,
    ],
    // 2.0 <= eta < 2.5
    [
        3.202719947998832, 1.5671120036529183, 0.2020895658142391, -0.009685955899642372,
        -0.0005632129120938421, 0.0004017222703568271, -7.44546557914812e-05, 1.9354039280588442e-06,
        2.7221449196667692e-06, -7.695044450152982e-07, 6.72146280219211e-08, 0.0,
        0.0,
    ],
    // 2.5 <= eta < 3.0
    [
        4.035563810771534, 1.7617674302205864, 0.1871504216764977, -0.009986155403191192,
        0.00017948403985396018, 0.00020212698180135894, -5.5657088475458025e-05, 7.132737499760297e-06,
        2.145730438179054e-07, -3.3614770308215773e-07, 8.085245866571892e-08, 0.0,
        0.0,
    ],
    // 3.0 <= eta < 3.5
    [
        4.962003582437428, 1.9415714896094096, 0.172645588691498, -0.009245403346831261,
        0.000507157077481095, 7.20435424441841e-05, -3.176795938415794e-05, 6.012849721661099e-06,
        -5.622008975550824e-07, -5.238238804759557e-08, 3.352193605586131e-08, 0.0,
        0.0,
    ],
    // 3.5 <= eta < 4.0
    [
        5.974828546008469, 2.1075537827352457, 0.15960218193196493, -0.00811827131019943,
        0.0005918732795773249, 4.183769878590601e-06, -1.4851377663524976e-05, 3.67367012454121e-06,
        -5.416833273556741e-07, 3.6791619452546e-08, 0.0, 0.0,
        0.0,
    ],
    // 4.0 <= eta < 4.5
    [
        7.067528116374257, 2.261362089921236, 0.14830607619762645, -0.006954054064062032,
        0.000560499116339249, -2.4557035637043232e-05, -5.352817764299133e-06, 1.8856797416090261e-06,
        -3.485699368542716e-07, 4.2301283663617674e-08, 0.0, 0.0,
        0.0,
    ],
    // 4.5 <= eta < 5.0
    [
        8.234450617227683, 2.4047243833238503, 0.13868112582269018, -0.005904261626972355,
        0.0004859186089984936, -3.2839053724766194e-05, -7.786164855060679e-07, 8.353929990929341e-07,
        -1.8810770736331485e-07, 2.8367070442014043e-08, 0.0, 0.0,
        0.0,
    ],
    // 5.0 <= eta < 5.5
    [
        9.470774395014374, 2.5392099446152723, 0.1305123061042075, -0.005014935070695981,
        0.0004038372740413513, -3.190163286224095e-05, 1.0927713576250166e-06, 2.9873799044232595e-07,
        -9.047056707594762e-08, 1.578195213769798e-08, 0.0, 0.0,
        0.0,
    ],
    // 5.5 <= eta < 6.0
    [
        10.772404838952738, 2.6661532312408083, 0.12355696752322604, -0.004283768111691295,
        0.00032914938877438263, -2.757681585569769e-05, 1.6485040814092692e-06, 5.408069280770939e-08,
        -3.878716778944344e-08, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 6.0 <= eta < 6.5
    [
        12.135854961537909, 2.7866536423649726, 0.11759213384763442, -0.003690232341352251,
        0.00026647978059765083, -2.2569508544967378e-05, 1.6331216620684086e-06, -4.476655898485703e-08,
        -1.377677839337652e-08, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 6.5 <= eta < 7.0
    [
        13.558134511946308, 2.90160458940173, 0.11242978942454551, -0.003209732420688955,
        0.00021593488447818038, -1.797910073843722e-05, 1.4103496856442768e-06, -7.449084900345598e-08,
        -2.6497329803572284e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 7.0 <= eta < 7.5
    [
        15.036655992979988, 3.011729684641966, 0.10791789167566197, -0.00281945072482211,
        0.00017594290516622534, -1.4148433536986268e-05, 1.1434732283542616e-06, -7.484622873906528e-08,
        1.7396628905126913e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 7.5 <= eta < 8.0
    [
        16.569158448461646, 3.117616744675201, 0.10393596814674284, -0.002500237524229384,
        0.00014454150844343222, -1.1095685204724662e-05, 8.977742512630435e-07, -6.460865314234801e-08,
        3.059394373260954e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 8.0 <= eta < 8.5
    [
        18.153646983784522, 3.219746499490444, 0.10038935513436517, -0.002236785186364735,
        0.00011989990200111411, -8.719696586124576e-06, 6.935833597411161e-07, -5.205605342422355e-08,
        3.0922770642757836e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 8.5 <= eta < 9.0
    [
        19.788345205860953, 3.318515615325799, 0.09720374499814828, -0.002017159202632259,
        0.00010048712742714363, -6.891153945755728e-06, 5.322168436552385e-07, -4.046908170167277e-08,
        2.6641658122703854e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 9.0 <= eta < 9.5
    [
        21.471657877979975, 3.414254676528419, 0.09432059648119444, -0.0018321662731035694,
        8.508925991812597e-05, -5.489150039338379e-06, 4.083197008078636e-07, -3.0868805093863914e-08,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 9.5 <= eta < 10.0
    [
        23.202141497266652, 3.5072420508450275, 0.0916934827429704, -0.0016747543808547116,
        7.277049608068738e-05, -4.412914751934717e-06, 3.140381645153633e-07, -2.3327571478755596e-08,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 10.0 <= eta < 10.5
    [
        24.978480964057916, 3.597714530411399, 0.08928527039504933, -0.0015395093237155987,
        6.28199100520184e-05, -3.583038327598166e-06, 2.4292612581980136e-07, -1.7572770208181942e-08,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 10.5 <= eta < 11.0
    [
        26.799470926132486, 3.6858755027457435, 0.08706597408039031, -0.001422256501397884,
        5.470101555044028e-05, -2.93881051300961e-06, 1.8934757291276076e-07, -1.3250423439954551e-08,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 11.0 <= eta < 11.5
    [
        28.664000718795485, 3.771901250670238, 0.08501113644933327, -0.0013197558268133946,
        4.8009511667080064e-05, -2.4345832100559226e-06, 1.4888141595151795e-07, -1.002987116564467e-08,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 11.5 <= eta < 12.0
    [
        30.571042085527758, 3.855945841043983, 0.08310060695966899, -0.0012294720424257041,
        4.244003452355052e-05, -2.036323280450762e-06, 1.1816860455458231e-07, -7.63709611844012e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 12.0 <= eta < 12.5
    [
        32.519639064439254, 3.9381449489799505, 0.08131761947679514, -0.001149403355972373,
        3.7760845748189524e-05, -1.71873722779784e-06, 9.470294265158334e-08, -5.85804714340485e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 12.5 <= eta < 13.0
    [
        34.508899576156054, 4.01861887638866, 0.079648092350154, -0.0010779540355750018,
        3.379492491347535e-05, -1.463017216137635e-06, 7.663308008398727e-08, -4.530934772057869e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 13.0 <= eta < 13.5
    [
        36.537988360809614, 4.097474957366308, 0.07808009387295045, -0.001013839661523191,
        3.0405992401216063e-05, -1.2551338770215869e-06, 6.259771394776432e-08, -3.535799915309466e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 13.5 <= eta < 14.0
    [
        38.60612099510584, 4.174809493618957, 0.0766034308848425, -0.0009560164534877507,
        2.748822791524897e-05, -1.084568898428317e-06, 5.159679600253483e-08, -2.7846776185172056e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 14.0 <= eta < 14.5
    [
        40.71255878248611, 4.250709326726232, 0.07520932943143571, -0.0009036282931871392,
        2.495871610038972e-05, -9.433849174613174e-07, 4.28943670900121e-08, -2.2134346254284813e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 14.5 <= eta < 15.0
    [
        42.85660435576262, 4.325253127293646, 0.07389018463495386, -0.0008559667562702802,
        2.2751886978551112e-05, -8.255470893919016e-07, 3.59467711643502e-08, -1.775409907995477e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 15.0 <= eta < 15.5
    [
        45.03759786646624, 4.398512461371114, 0.07263936296251444, -0.0008124407334109361,
        2.0815409456277667e-05, -7.264293701146956e-07, 3.035027876528201e-08, -1.436633835327498e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 15.5 <= eta < 16.0
    [
        47.25491366152609, 4.4705526800156665, 0.07145104447409201, -0.0007725531510732584,
        1.910714229931365e-05, -6.424550591205151e-07, 2.5803140767540633e-08, -1.17231077677025e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 16.0 <= eta < 16.5
    [
        49.507957368022375, 4.541433667142619, 0.0703200958317627, -0.0007358829792404882,
        1.759285581375302e-05, -5.708344311505517e-07, 2.2078187061833482e-08, -9.642652141901971e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 16.5 <= eta < 17.0
    [
        51.79616332223167, 4.611210472818155, 0.06924196718375988, -0.0007020712030634901,
        1.6244517100859964e-05, -5.093724427588007e-07, 1.90030506388078e-08, -7.991018786100585e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 17.0 <= eta < 17.5
    [
        54.118992291191496, 4.679933853156419, 0.06821260774192575, -0.0006708097866111517,
        1.5038989375604791e-05, -4.5639998216452845e-07, 1.6445873127163686e-08, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 17.5 <= eta < 18.0
    [
        56.47592944441003, 4.7476507334610245, 0.06722839612364018, -0.0006418329285181484,
        1.3957037279213095e-05, -4.103653739176022e-07, 1.4304939829282346e-08, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 18.0 <= eta < 18.5
    [
        58.866482540767166, 4.814404607807325, 0.06628608245467861, -0.0006149100439794926,
        1.2982559830824661e-05, -3.702307597668142e-07, 1.250113070614098e-08, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 18.5 <= eta < 19.0
    [
        61.29018030156238, 4.880235885619764, 0.06538273991766243, -0.0005898401273800418,
        1.2101993959809426e-05, -3.3508148248442347e-07, 1.097239233556793e-08, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 19.0 <= eta < 19.5
    [
        63.74657094540862, 4.945182193752594, 0.06451572394630763, -0.0005664471600246148,
        1.1303846844467578e-05, -3.0416869931505967e-07, 9.669664585395655e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 19.5 <= eta < 20.0
    [
        66.23522086451112, 5.009278640986454, 0.06368263765483136, -0.0005445763535005979,
        1.0578326283581418e-05, -2.768751534456656e-07, 8.553858725607606e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 20.0 <= eta < 20.5
    [
        68.75571342499916, 5.072558050597158, 0.0628813023879519, -0.0005240910538210559,
        9.91704627719367e-06, -2.526888061244827e-07, 7.59359935131437e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 20.5 <= eta < 21.0
    [
        71.30764787654931, 5.135051165657005, 0.062109732503980865, -0.000504870173796426,
        9.312790766972141e-06, -2.3118236338121875e-07, 6.763524397104751e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 21.0 <= eta < 21.5
    [
        73.8906383586617, 5.196786830932857, 0.06136611367903423, -0.00048680605074612524,
        8.759322704362253e-06, -2.119972565433651e-07, 6.0429955362795214e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 21.5 <= eta < 22.0
    [
        76.50431299271781, 5.25779215460445, 0.060648784157143996, -0.00046980264906730263,
        8.251228715424947e-06, -1.948310136877844e-07, 5.415112407803587e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 22.0 <= eta < 22.5
    [
        79.14831305042533, 5.318092652506994, 0.05995621847841276, -0.0004537740442316788,
        7.783791926188783e-06, -1.7942723250752306e-07, 4.865953379839339e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 22.5 <= eta < 23.0
    [
        81.82229219049813, 5.377712377178333, 0.05928701330226138, -0.0004386431378605449,
        7.35288722295133e-06, -1.6556756389616908e-07, 4.38398644956457e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 23.0 <= eta < 23.5
    [
        84.52591575646998, 5.436674033643076, 0.058639875010443855, -0.000424340563634325,
        6.954894506293007e-06, -1.53065261072178e-07, 3.959608858277762e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 23.5 <= eta < 24.0
    [
        87.25886012943263, 5.494999083578874, 0.05801360882872704, -0.00041080375165967667,
        6.586626468918211e-06, -1.4175995627567213e-07, 3.5847847966857416e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 24.0 <= eta < 24.5
    [
        90.02081213024998, 5.552707839271546, 0.057407109249888226, -0.00039797612508380375,
        6.2452681674554754e-06, -1.3151340659654223e-07, 3.252758400337032e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 24.5 <= eta < 25.0
    [
        92.81146846645245, 5.609819548566821, 0.0568193515762071, -0.0003858064076128599,
        5.928326226190325e-06, -1.2220600989610838e-07, 2.9578249415352548e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 25.0 <= eta < 25.5
    [
        95.63053521957626, 5.666352471859563, 0.05624938442863373, -0.000374248024457999,
        5.633585949502105e-06, -1.1373393646944129e-07, 2.695147312067715e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 25.5 <= eta < 26.0
    [
        98.47772736919686, 5.7223239520208855, 0.05569632309362515, -0.0003632585823236163,
        5.359074961174427e-06, -1.0600675594442104e-07, 2.4606079850683275e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 26.0 <= eta < 26.5
    [
        101.35276835032553, 5.777750478044648, 0.0551593435982908, -0.0003527994165378786,
        5.103032256119907e-06, -9.894546473185848e-08, 2.250688945482996e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 26.5 <= eta < 27.0
    [
        104.25538964120273, 5.83264774309386, 0.05463767742077638, -0.00034283519543559375,
        4.8638817607811796e-06, -9.248083916723387e-08, 2.0623738016758896e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 27.0 <= eta < 27.5
    [
        107.18533037883999, 5.887030697541465, 0.05413060675638376, -0.0003333335737374934,
        4.640209665550129e-06, -8.655205480971375e-08, 1.8930675896254685e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 27.5 <= eta < 28.0
    [
        110.14233699994081, 5.9409135975262926, 0.05363746027127343, -0.00032426488800511914,
        4.430744925789289e-06, -8.110552428535721e-08, 1.7405307668353686e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 28.0 <= eta < 28.5
    [
        113.12616290507479, 5.994310049481724, 0.053157609285128984, -0.0003156018883466113,
        4.234342434880502e-06, -7.609391539162688e-08, 1.6028246459358887e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 28.5 <= eta < 29.0
    [
        116.13656814419423, 6.047233051040123, 0.05269046433220006, -0.000307319501452675,
        4.049968458845219e-06, -7.147531852550022e-08, 1.478266096616818e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 29.0 <= eta < 29.5
    [
        119.17331912177201, 6.099695028669002, 0.05223547205694279, -0.0002993946207907296,
        3.876687991842053e-06, -6.721253831241642e-08, 1.3653897920417517e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 29.5 <= eta < 30.0
    [
        122.23618832000695, 6.151707872354082, 0.0517921124062533, -0.0002918059204079339,
        3.7136537486243065e-06, -6.327248894146002e-08, 1.2629166240216711e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 30.0 <= eta < 30.5
    [
        125.32495403869119, 6.203282967608906, 0.05135989608521244, -0.00028453368931365434,
        3.5600965564573984e-06, -5.962567641460654e-08, 1.1697271835810728e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 30.5 <= eta < 31.0
    [
        128.43940015046667, 6.254431225059761, 0.0509383622474676, -0.0002775596838475991,
        3.4153169471056228e-06, -5.624575389412904e-08, 1.0848394177863959e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 31.0 <= eta < 31.5
    [
        131.57931587031442, 6.3051631078276476, 0.0505270763949858, -0.0002708669958062022,
        3.2786777809139167e-06, -5.310913873590667e-08, 1.0073897431046043e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 31.5 <= eta < 32.0
    [
        134.74449553822583, 6.355488656905324, 0.05012562846501473, -0.00026443993440898323,
        3.149597761009144e-06, -5.0194681746147e-08, 9.366170301712413e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 32.0 <= eta < 32.5
    [
        137.93473841409877, 6.405417514706705, 0.04973363108476442, -0.00025826392044830016,
        3.0275457172407682e-06, -4.748338078730586e-08, 8.718489823247397e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 32.5 <= eta < 33.0
    [
        141.14984848398456, 6.454958946947546, 0.04935071797663565, -0.00025232539118813323,
        2.9120355574820155e-06, -4.495813215799646e-08, 8.124905164667633e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 33.0 <= eta < 33.5
    [
        144.3896342768885, 6.504121863000246, 0.04897654249882735, -0.0002466117147667949,
        2.802621798968691e-06, -4.260351423819285e-08, 7.580138242482478e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 33.5 <= eta < 34.0
    [
        147.65390869139324, 6.552914834851281, 0.04861077630789825, -0.00024111111302010674,
        2.6988956049865404e-06, -4.040559876988614e-08, 7.079498477495268e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 34.0 <= eta < 34.5
    [
        150.94248883143604, 6.601346114777153, 0.04825310813137691, -0.00023581259178002658,
        2.6004812628521206e-06, -3.835178587011768e-08, 6.618809494372135e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 34.5 <= eta < 35.0
    [
        154.25519585062534, 6.649423651843525, 0.04790324263984034, -0.0002307058778225895,
        2.5070330481099367e-06, -3.643065947634257e-08, 6.194345933644016e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 35.0 <= eta < 35.5
    [
        157.59185480453309, 6.697155107322189, 0.04756089940904182, -0.0002257813617413715,
        2.418232427469843e-06, -3.463186042605922e-08, 5.802778850027636e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 35.5 <= eta < 36.0
    [
        160.9522945104425, 6.744547869111657, 0.047225811963686665, -0.00022103004611100804,
        2.3337855594623667e-06, -3.294597479181182e-08, 5.441128420719073e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 36.0 <= eta < 36.5
    [
        164.336347414074, 6.7916090652391805, 0.04689772689534891, -0.000216443498381704,
        2.2534210572835455e-06, -3.136443544374351e-08, 5.106722893063622e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 36.5 <= eta < 37.0
    [
        167.74384946284673, 6.8383455765149295, 0.04657640304780976, -0.0002120138080119173,
        2.176887982989858e-06, -2.987943510676264e-08, 4.797162871042626e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 37.0 <= eta < 37.5
    [
        171.17463998526935, 6.8847640484026895, 0.04626161076379373, -0.00020773354740396172,
        2.103954046215807e-06, -2.848384942776501e-08, 4.510290180977173e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 37.5 <= eta < 38.0
    [
        174.62856157608226, 6.9308709021657116, 0.04595313118769279, -0.00020359573625740033,
        2.0344039840276404e-06, -2.7171168778127978e-08, 4.244160674052386e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 38.0 <= eta < 38.5
    [
        178.10545998680274, 6.9766723453412265, 0.04565075561941289, -0.0001995938089988432,
        1.96803810148476e-06, -2.5935437694318814e-08, 3.997020420999185e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 38.5 <= eta < 39.0
    [
        181.6051840213502, 7.022174381592537, 0.04535428491496018, -0.00019572158498500742,
        1.904670955029038e-06, -2.477120101024411e-08, 3.767284835994746e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 39.0 <= eta < 39.5
    [
        185.12758543645077, 7.067382819983385, 0.04506352892981317, -0.0001919732412094037,
        1.8441301630229898e-06, -2.36734558632763e-08, 3.5535203353645945e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 39.5 <= eta < 40.0
    [
        188.67251884654362, 7.112303283715592, 0.04477830600077188, -0.0001883432872724211,
        1.7862867774263828e-06, -2.263760886533465e-08, 0.0, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
];

/// F_-1/2 on each piece, powers of (eta - centre) from the 0th.
#[rustfmt::skip]
const MID_MINUS_HALF: [[f64; MID_TERMS]; MID_COUNT] = [
    // -2.0 <= eta < -1.5
    [
        0.15505606435473704, 0.13863115351018226, 0.05488734564094938, 0.010416788136024058,
        -0.0002531956610536888, -0.0006930738529112971, -0.00015797636491805543, 5.806981290904529e-06,
        1.212303506974954e-05, 2.702512033314655e-06, -1.5527994818282613e-07, -2.2656915857780703e-07,
        0.0,
    ],
    // -1.5 <= eta < -1.0
    [
        0.23935572210360231, 0.20095976851584632, 0.06912811067521478, 0.007819932761997371,
        -0.002490359326666352, -0.0010334328067280359, -3.021462610619096e-05, 7.076655853492231e-05,
        1.6832120050400028e-05, -2.004006882748838e-06, -1.7374312935063118e-06, -1.9640160194591777e-07,
        9.628686577201421e-08,
    ],
    // -1.0 <= eta < -0.5
    [
        0.3579073242216916, 0.2743877223235463, 0.07585527499795909, 0.0003600150959164143,
        -0.00481788174176914, -0.0006648876812405221, 0.00029035944952818775, 9.30787401715484e-05,
        -1.1656723384030175e-05, -9.482028137765184e-06, -2.6854356282438096e-07, 7.737931481392484e-07,
        0.0,
    ],
    // -0.5 <= eta < 0.0
    [
        0.5137933107879051, 0.34795985471984553, 0.0686629331855131, -0.01004103101367614,
        -0.0050711321756636805, 0.0005424508069417978, 0.0004435141485310663, -2.5580907959477893e-05,
        -4.005521559536371e-05, 3.749634447448499e-07, 3.6355242877019623e-06, 1.347756425108844e-07,
        -3.217888183895195e-07,
    ],
    // 0.0 <= eta < 0.5
    [
        0.7033904262554945, 0.4068039057062076, 0.04705497281294971, -0.017840590491792544,
        -0.0023258620591870434, 0.0014888496645657683, 0.00012251580503421582, -0.00013306291184026837,
        -4.443141522989456e-06, 1.2069278812767435e-05, -1.634449314831782e-07, -1.0738849750189418e-06,
        0.0,
    ],
    // 0.5 <= eta < 1.0
    [
        0.916228088973455, 0.4397893203125245, 0.018695202865147188, -0.01874772301598894,
        0.001298496891129974, 0.0012133518045458955, -0.0002635469107453993, -6.35281192591425e-05,
        3.055672694669104e-05, 1.2400430925967275e-06, -2.758940756882182e-06, 2.6565703554911293e-07,
        0.0,
    ],
    // 1.0 <= eta < 1.5
    [
        1.138567662773306, 0.4453976912455213, -0.0062374448103832405, -0.013862451114298053,
        0.0031960694251221954, 0.0002938170680371992, -0.0002894864690132607, 3.715842570632304e-05,
        1.4419646347877728e-05, -5.85768609389313e-06, 6.692247840445992e-08, 4.4377649854591816e-07,
        0.0,
    ],
    // 1.5 <= eta < 2.0
    [
        1.35817908915782, 0.4304037472000411, -0.022112037609053163, -0.007360335340962625,
        0.0030488483323134045, -0.0003215211881377023, -0.00011397151117627378, 4.998539395516961e-05,
        -5.023678427641012e-06, -2.139496866543144e-06, 8.908192090827344e-07, -7.877886912457813e-08,
        0.0,
    ],
    // 2.0 <= eta < 2.5
    [
        1.567112003652918, 0.4041791316284788, -0.029057867698726706, -0.002252851648594555,
        0.0020086113218561815, -0.0004467279123041489, 1.3549359807660117e-05, 2.177623591667623e-05,
        -6.957061836529378e-06, 6.885630030267991e-07, 2.2415524545204978e-07, -1.0506702596856365e-07,
        0.0,
    ],
    // 2.5 <= eta < 3.0
    [
        1.7617674302205866, 0.37430084335299535, -0.029958466209650605, 0.0007179361594350645,
        0.001010634920510072, -0.0003339425321445843, 4.992857353051319e-05, 1.7166158467395905e-06,
        -3.0132134185280005e-06, 8.08272617086413e-07, -8.615757661453801e-08, 0.0,
        0.0,
    ],
    // 3.0 <= eta < 3.5
    [
        1.9415714896094096, 0.34529117738299603, -0.027736210040565746, 0.0020286283099130178,
        0.0003602177229673472, -0.0001906077555413736, 4.208939783457765e-05, -4.497625797102434e-06,
        -4.6012274168459936e-07, 3.353682938528069e-07, -8.048889417785455e-08, 0.0,
        0.0,
    ],
    // 3.5 <= eta < 4.0
    [
        2.1075537827352457, 0.3192043638639487, -0.024354813930626155, 0.002367493113497594,
        2.09188535543663e-05, -8.910794263453808e-05, 2.571547780742769e-05, -4.341350117189552e-06,
        3.3550761335181443e-07, 6.30679867532755e-08, -3.116827220551464e-08, 0.0,
        0.0,
    ],
    // 4.0 <= eta < 4.5
    [
        2.2613620899212354, 0.2966121523952468, -0.02086216219218233, 0.002241996466921241,
        -0.00012278517854699456, -3.211701170305763e-05, 1.3199768996378164e-05, -2.7859966358546718e-06,
        3.806127633498817e-07, -2.0502871836008347e-08, 0.0, 0.0,
        0.0,
    ],
    // 4.5 <= eta < 5.0
    [
        2.4047243833238503, 0.27736225164537165, -0.017712784880917692, 0.0019436744382251168,
        -0.00016419526856380182, -4.671848845805089e-06, 5.84774920078013e-06, -1.501206155212961e-06,
        2.5532002593615476e-07, -2.9244029548462313e-08, 0.0, 0.0,
        0.0,
    ],
    // 5.0 <= eta < 5.5
    [
        2.5392099446152723, 0.26102461220840895, -0.015044805212089138, 0.0016153490977189803,
        -0.00015950816419667976, 6.556523745492776e-06, 2.091162512616226e-06, -7.212191589052096e-07,
        1.420688421997905e-07, -2.0363021618970023e-08, 0.0, 0.0,
        0.0,
    ],
    // 5.5 <= eta < 6.0
    [
        2.6661532312408127, 0.2471139350464486, -0.012851304337792965, 0.001316597555980759,
        -0.00013788381824711795, 9.890965135511422e-06, 3.7076871272217337e-07, -3.0885026100951134e-07,
        7.127896623352994e-08, -1.1576650448289687e-08, 0.0, 0.0,
        0.0,
    ],
    // 6.0 <= eta < 6.5
    [
        2.7866536423649744, 0.23518426769526707, -0.011070697025314309, 0.0010659191228451072,
        -0.00011284742199936122, 9.79869942975191e-06, -3.169715804340756e-07, -1.0946956804354808e-07,
        3.296610322355561e-08, -5.957272827712684e-09, 0.0, 0.0,
        0.0,
    ],
    // 6.5 <= eta < 7.0
    [
        2.901604589401731, 0.22485957884909016, -0.009629197262595045, 0.0008637395381315736,
        -8.989545298690709e-05, 8.462083407008579e-06, -5.229503406906114e-07, -2.083929666067082e-08,
        1.3845921521550191e-08, -2.8685374574960618e-09, 0.0, 0.0,
        0.0,
    ],
    // 7.0 <= eta < 7.5
    [
        3.0117296846419666, 0.21583578335132425, -0.008458352174652553, 0.000703771620615412,
        -7.07421498075964e-05, 6.8608412705198966e-06, -5.244575375767249e-07, 1.3897032251283526e-08,
        4.881704258449225e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 7.5 <= eta < 8.0
    [
        3.117616744675201, 0.20787193629348583, -0.007500712572724843, 0.0005781660337531938,
        -5.547842250133141e-05, 5.386646296125471e-06, -4.523657711143775e-07, 2.4466743815852087e-08,
        9.618205068928494e-10, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 8.0 <= eta < 8.5
    [
        3.219746499490444, 0.2007787102687304, -0.006710355559072444, 0.00047959960799726,
        -4.3598485019708293e-05, 4.161500434789506e-06, -3.6432997995189733e-07, 2.4735268857568666e-08,
        -5.704595901025176e-10, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 8.5 <= eta < 9.0
    [
        3.3185156153257984, 0.19440748999629656, -0.006051477607857501, 0.0004019485097071549,
        -3.4455773499327185e-05, 3.1933011164446913e-06, -2.8317095819521467e-07, 2.1312745023389255e-08,
        -1.0296111222375254e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 9.0 <= eta < 9.5
    [
        3.414254676528419, 0.18864119296212822, -0.005496498819270948, 0.000340357081378439,
        -2.7445754013657124e-05, 2.4483166969399083e-06, -2.1596763562896529e-07, 1.7082751010913495e-08,
        -1.0422859710365284e-09, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 9.5 <= eta < 10.0
    [
        3.5072420508450275, 0.18338696548573968, -0.005024263142529961, 0.0002910820165030356,
        -2.2064577040284452e-05, 1.882993264106944e-06, -1.6319501944009814e-07, 1.3181045175849375e-08,
        -8.958254737466717e-10, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 10.0 <= eta < 10.5
    [
        3.597714530411399, 0.1785705407899467, -0.004618527971119526, 0.00025127966452267314,
        -1.7915194255967588e-05, 1.4566230742973175e-06, -1.2293120121807532e-07, 9.959259962567017e-09,
        -7.148821869557722e-10, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 10.5 <= eta < 11.0
    [
        3.6858755027457435, 0.1741319481606671, -0.004266769504172733, 0.0002188040803689445,
        -1.4694054573210292e-05, 1.13538781763432e-06, -9.269298696739438e-08, 7.441278317276176e-09,
        -5.483621694854613e-10, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 11.0 <= eta < 11.5
    [
        3.771901250670238, 0.17002227289858213, -0.003959267480449598, 0.0001920380601749091,
        -1.2172915548191344e-05, 8.927698426980078e-07, -7.021552488935089e-08, 5.532298785065842e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 11.5 <= eta < 12.0
    [
        3.855945841043983, 0.16620121391927528, -0.003688416127284085, 0.00016976014812803892,
        -1.018161603036476e-05, 7.086263279935591e-07, -5.346443300892837e-08, 4.109859561970467e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 12.0 <= eta < 12.5
    [
        3.9381449489799505, 0.1626352389535436, -0.0034482100679222505, 0.0001510433904632283,
        -8.593685865292443e-06, 5.679307898528559e-07, -4.1009833322331576e-08, 3.059904604203895e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 12.5 <= eta < 13.0
    [
        4.01861887638866, 0.1592961847002731, -0.003233862106728774, 0.00013517970524032515,
        -7.315085879697011e-06, 4.595839618325255e-07, -3.1719116091301316e-08, 2.288199161580336e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 13.0 <= eta < 13.5
    [
        4.097474957366308, 0.15616018774587465, -0.003041518984572343, 0.00012162397380747568,
        -6.2756692373865376e-06, 3.7542490340725715e-07, -2.475249024105109e-08, 1.721389646173641e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 13.5 <= eta < 14.0
    [
        4.174809493618957, 0.1532068617696651, -0.002868049360465294, 0.00010995291484524042,
        -5.422844383238993e-06, 3.0945850102481286e-07, -1.9494137282808356e-08, 1.3042665642252355e-09,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 14.0 <= eta < 14.5
    [
        4.250709326726232, 0.1504186588628562, -0.00271088487956293, 9.983486683344681e-05,
        -4.7169245066401946e-06, 2.572728180434615e-07, -1.5495074907819408e-08, 9.961012971849122e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 14.5 <= eta < 15.0
    [
        4.325253127293646, 0.14778036926989602, -0.0025679002688119676, 9.10075497872635e-05,
        -4.127735386847858e-06, 2.1560870151855985e-07, -1.242863878509043e-08, 7.672049871076923e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 15.0 <= eta < 15.5
    [
        4.398512461371114, 0.1452787259250198, -0.0024373222002336543, 8.32616392803855e-05,
        -3.6321468054663456e-06, 1.8204579003791642e-07, -1.0057014218590075e-08, 5.96080573606715e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 15.5 <= eta < 16.0
    [
        4.4705526800156665, 0.14290208894817688, -0.002317659453220415, 7.642857033790342e-05,
        -3.2122752614956698e-06, 1.547750436905815e-07, -8.206612005790854e-09, 4.672097563981253e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 16.0 <= eta < 16.5
    [
        4.541433667142619, 0.14064019166351976, -0.002207648937721952, 7.037142415685356e-05,
        -2.854172129754824e-06, 1.324344916584857e-07, -6.7501892728966555e-09, 3.693942668285243e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 16.5 <= eta < 17.0
    [
        4.611210472818155, 0.13848393436751527, -0.0021062136091908453, 6.497806912253101e-05,
        -2.546862193812071e-06, 1.1399069073223184e-07, -5.593968919005732e-09, 2.945397398930107e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 17.0 <= eta < 17.5
    [
        4.679933853156437, 0.1364252154838479, -0.002012429366671929, 6.015595808048632e-05,
        -2.281635192220445e-06, 9.865304098428188e-08, -4.668398108126568e-09, 2.367763061358237e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 17.5 <= eta < 18.0
    [
        4.74765073346104, 0.13445679224727744, -0.0019254987912988692, 5.582814958518254e-05,
        -2.0515205003062282e-06, 8.581165509770074e-08, -3.9215268068224095e-09, 1.91828031928822e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 18.0 <= eta < 18.5
    [
        4.8144046078073375, 0.13257216490935483, -0.001844730136793351, 5.19302397055324e-05,
        -1.8508948722508113e-06, 7.499210646087183e-08, -3.3142602657279863e-09, 1.5656294372319168e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 18.5 <= eta < 19.0
    [
        4.880235885619775, 0.1307654798353229, -0.001769520386266513, 4.840797615337976e-05,
        -1.6751873384215097e-06, 6.582229095843631e-08, -2.816947207776763e-09, 1.2867258636024443e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 19.0 <= eta < 19.5
    [
        4.945182193752603, 0.12903144789261364, -0.001699341483599605, 4.521538763774295e-05,
        -1.5206554560236262e-06, 5.800800840304651e-08, -2.406919061402215e-09, 1.0644383282585185e-10,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 19.5 <= eta < 20.0
    [
        5.009278640986462, 0.12736527530966135, -0.0016337290635291962, 4.231330535062482e-05,
        -1.3842143057540992e-06, 5.1314846466518904e-08, -2.0667068701295325e-09, 8.859612935185171e-11,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 20.0 <= eta < 20.5
    [
        5.072558050597165, 0.12576260477590268, -0.0015722731640746062, 3.9668185289841766e-05,
        -1.2633047538911365e-06, 4.555464313195269e-08, -1.7827421603470228e-09, 7.416507662445749e-11,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 20.5 <= eta < 21.0
    [
        5.1350511656570115, 0.12421946500796244, -0.0015146105236515893, 3.725116300693268e-05,
        -1.1557911602966268e-06, 4.058212167679729e-08, -1.5444046011764433e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 21.0 <= eta < 21.5
    [
        5.196786830932862, 0.12273222735806907, -0.0014604181542061286, 3.50372907658887e-05,
        -1.0598813359002704e-06, 3.625879818264293e-08, -1.3433192519054596e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 21.5 <= eta < 22.0
    [
        5.257792154604455, 0.1212975683142885, -0.001409407948919927, 3.300491481788074e-05,
        -9.740634407542918e-07, 3.249137555157963e-08, -1.1728343632667167e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 22.0 <= eta < 22.5
    [
        5.318092652506998, 0.11991243695682596, -0.0013613221342003545, 3.1135167667349845e-05,
        -8.970558789011392e-07, 2.9196318763576777e-08, -1.0276305468946414e-09, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 22.5 <= eta < 23.0
    [
        5.3777123771783355, 0.11857402660452314, -0.0013159294149050129, 2.9411548859741785e-05,
        -8.277672393148918e-07, 2.6304431713919407e-08, -9.03426124206739e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 23.0 <= eta < 23.5
    [
        5.4366740336430786, 0.11727975002088804, -0.0012730216920700942, 2.7819577997579346e-05,
        -7.652640590048402e-07, 2.3758094632605978e-08, -7.967533574374508e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 23.5 <= eta < 24.0
    [
        5.494999083578876, 0.11602721765745436, -0.0012324112560114333, 2.6346505851839473e-05,
        -7.087447198723125e-07, 2.150909011407511e-08, -7.047872774161886e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 24.0 <= eta < 24.5
    [
        5.552707839271549, 0.11481421849977669, -0.0011939283761672518, 2.498107264916338e-05,
        -6.575181881535908e-07, 1.9516880938311223e-08, -6.252138127402871e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 24.5 <= eta < 25.0
    [
        5.609819548566824, 0.11363870315241442, -0.0011574192236532197, 2.371330488679513e-05,
        -6.10986602020184e-07, 1.7747237107908486e-08, -5.561274925806989e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 25.0 <= eta < 25.5
    [
        5.666352471859565, 0.11249876885726764, -0.0011227440741004885, 2.2534343782334358e-05,
        -5.686309361316474e-07, 1.6171134657427338e-08, -4.959515591557664e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 25.5 <= eta < 26.0
    [
        5.722323952020887, 0.11139264618725046, -0.0010897757476203242, 2.143629983098224e-05,
        -5.299991410362685e-07, 1.4763867357943557e-08, -4.4337517870978225e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 26.0 <= eta < 26.5
    [
        5.777750478044649, 0.11031868719658174, -0.0010583982501956239, 2.0412129012443656e-05,
        -4.946962843009474e-07, 1.3504326248482357e-08, -3.9730378681533416e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 26.5 <= eta < 27.0
    [
        5.832647743093861, 0.10927535484155289, -0.0010285055868294662, 1.9455527032533733e-05,
        -4.6237631930576495e-07, 1.237441226581286e-08, -3.568195891766155e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 27.0 <= eta < 27.5
    [
        5.887030697541466, 0.10826121351276762, -0.0010000007216829146, 1.856083865285672e-05,
        -4.3273518420758845e-07, 1.1358555038521973e-08, -3.2114996454787727e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 27.5 <= eta < 28.0
    [
        5.940913597526293, 0.10727492054254696, -0.0009727946644396378, 1.7722979694893093e-05,
        -4.055049931413227e-07, 1.0443316826055703e-08, -2.8964205393127267e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 28.0 <= eta < 28.5
    [
        5.994310049481725, 0.10631521857025805, -0.0009468056654232454, 1.693736973219542e-05,
        -3.8044912834710765e-07, 9.617065101038722e-09, -2.6174222114229205e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 28.5 <= eta < 29.0
    [
        6.0472330510401235, 0.1053809286644002, -0.0009219585047051626, 1.619987382887051e-05,
        -3.573580786141578e-07, 8.869700745553945e-09, -2.369793707938649e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 29.0 <= eta < 29.5
    [
        6.099695028669003, 0.10447094411388565, -0.0008981838626870589, 1.550675196157039e-05,
        -3.3604589848886956e-07, 8.19243151740172e-09, -2.149513371204358e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 29.5 <= eta < 30.0
    [
        6.151707872354083, 0.10358422481250666, -0.0008754177615099058, 1.4854614989323025e-05,
        -3.1634718582215067e-07, 7.57758253133322e-09, -1.95313729912696e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 30.0 <= eta < 30.5
    [
        6.2032829676089065, 0.10271979217042494, -0.0008536010682013694, 1.4240386221202527e-05,
        -2.981144937327173e-07, 7.018437134542035e-09, -1.777707560378452e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 30.5 <= eta < 31.0
    [
        6.254431225059761, 0.10187672449493526, -0.000832679051780201, 1.3661267784276583e-05,
        -2.8121610793652525e-07, 6.5091028412345534e-09, -1.6206763673527474e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 31.0 <= eta < 31.5
    [
        6.3051631078276476, 0.10105415278997164, -0.0008126009876353805, 1.3114711119933857e-05,
        -2.65534132404566e-07, 6.0443980075774415e-09, -1.4798431958202952e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 31.5 <= eta < 32.0
    [
        6.355488656905325, 0.1002512569300295, -0.0007933198034251874, 1.2598391040689386e-05,
        -2.509628360553243e-07, 5.619755736057204e-09, -1.3533024525686876e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 32.0 <= eta < 32.5
    [
        6.405417514706705, 0.09946726216952888, -0.0007747917615264532, 1.2110182865947495e-05,
        -2.3740722112581635e-07, 5.231142143203586e-09, -1.2393997712569053e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 32.5 <= eta < 33.0
    [
        6.454958946947547, 0.09870143595327134, -0.0007569761737309078, 1.164814222720662e-05,
        -2.2478178035722286e-07, 4.874986641886545e-09, -1.1366953932060195e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 33.0 <= eta < 33.5
    [
        6.504121863000247, 0.09795308499765473, -0.0007398351444533046, 1.1210487193414729e-05,
        -2.1300941546137638e-07, 4.5481223060669e-09, -1.043933387248494e-10, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 33.5 <= eta < 34.0
    [
        6.552914834851281, 0.09722155261579651, -0.0007233333392009475, 1.0795582417718885e-05,
        -2.0202049372678407e-07, 4.247734722917171e-09, -9.600156987694199e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 34.0 <= eta < 34.5
    [
        6.601346114777153, 0.09650621626275385, -0.000707437775469569, 1.0401925049388837e-05,
        -1.9175202325522745e-07, 3.971318010933709e-09, -8.839802062000397e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 34.5 <= eta < 35.0
    [
        6.649423651843525, 0.09580648527968069, -0.0006921176335871505, 1.0028132190605648e-05,
        -1.8214693033394862e-07, 3.716636905779374e-09, -8.149821138199516e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 35.0 <= eta < 35.5
    [
        6.697155107322189, 0.09512179881808365, -0.0006773440853343115, 9.672929708211363e-06,
        -1.7315342495739948e-07, 3.4816939981398294e-09, -7.52278130768026e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 35.5 <= eta < 36.0
    [
        6.744547869111657, 0.09445162392737334, -0.000663090138434862, 9.335142236330384e-06,
        -1.6472444260762292e-07, 3.264701357746469e-09, -6.952129838324594e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 36.0 <= eta < 36.5
    [
        6.7916090652391805, 0.09379545379069783, -0.0006493304952393319, 9.013684227748848e-06,
        -1.568171521570715e-07, 3.0640559011764396e-09, -6.432078906960486e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 36.5 <= eta < 37.0
    [
        6.8383455765149295, 0.09315280609561953, -0.0006360414241230201, 8.707551930694404e-06,
        -1.4939252123158966e-07, 2.8783179630683116e-09, -5.957506846127402e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 37.0 <= eta < 37.5
    [
        6.88476404840269, 0.09252322152758748, -0.0006232006422928013, 8.41581618370658e-06,
        -1.4241493161277866e-07, 2.7061926149721855e-09, -5.5238733393748874e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 37.5 <= eta < 38.0
    [
        6.9308709021657116, 0.0919062623753856, -0.0006107872088473057, 8.137615935051689e-06,
        -1.358518383074926e-07, 2.54651334637916e-09, -5.127146428509378e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 38.0 <= eta < 38.5
    [
        6.9766723453412265, 0.09130151123882578, -0.000598781427066311, 7.872152404968508e-06,
        -1.2967346680007177e-07, 2.3982277811180425e-09, -4.76373954856286e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 38.5 <= eta < 39.0
    [
        7.022174381592537, 0.09070856982992037, -0.0005871647550199215, 7.618683819225542e-06,
        -1.2385254375661398e-07, 2.260385151344285e-09, -4.430457096426899e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 39.0 <= eta < 39.5
    [
        7.067382819983385, 0.09012705785962635, -0.0005759197236886277, 7.376520651273757e-06,
        -1.1836405709194496e-07, 2.132125292461193e-09, -4.1244472787640753e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
    // 39.5 <= eta < 40.0
    [
        7.112303283715592, 0.08955661200301787, -0.0005650298618735596, 7.145021317895727e-06,
        -1.1318504185699877e-07, 2.0126689568761662e-09, -3.8431611833342374e-11, 0.0,
        0.0, 0.0, 0.0, 0.0,
        0.0,
    ],
];

/// a_k of F_1/2 = eta^(3/2)/Gamma(5/2) (1 + sum_k a_k eta^-2k), k = 1...
#[rustfmt::skip]
const SOMMERFELD_HALF: [f64; 12] = [
    1.2337005501361697, 1.0654119331844016, 9.701518554959128, 242.71504814667833,
    11865.691745445623, 958843.3951441107, 115801357.47490658, 19542370099.7268,
    4392197855056.5605, 1268250756252705.5, 4.575217874470742e+17, 2.016527638699229e+20,
];

/// b_k of F_-1/2 = eta^(1/2)/Gamma(3/2) (1 + sum_k b_k eta^-2k), k = 1...
#[rustfmt::skip]
const SOMMERFELD_MINUS_HALF: [f64; 12] = [
    -0.4112335167120566, -1.775686555307336, -29.10455566487738, -1051.765208635606,
    -67238.91989085854, -6711903.766008775, -965011312.2908882, -188909577630.6924,
    -48314176405622.164, -1.5641759327116702e+16, -6.25279776177668e+18, -3.024791458048843e+21,
];

// END GENERATED

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    /// The tables are exact to ~2e-16 in f64 (generator's own check); a few
    /// ulp more for exp, ln and the final multiplication.
    const TABLE_REL_TOL: f64 = 2e-15;
    /// Round trips lose the rounding of u = F(eta) (1 ulp) divided by the
    /// slope d ln F / d eta (>= 1.5 / eta), i.e. a few ulp of max(1, |eta|).
    const ROUND_TRIP_TOL: f64 = 1e-13;
    /// A central difference with h = 1e-5 max(1, eta) has relative truncation
    /// error ~h^2 / max(1, eta)^2 and rounding error ~1e-16 max(1, eta) / h:
    /// both far below 1e-7.
    const FINITE_DIFFERENCE_TOL: f64 = 1e-7;

    fn relative(got: f64, expected: f64) -> f64 {
        ((got - expected) / expected).abs()
    }

    #[test]
    fn f_half_at_zero_is_the_closed_form() {
        // Source: closed form F_1/2(0) = -Li_3/2(-1) = (1 - 2^-1/2) zeta(3/2)
        // (Dirichlet eta function, NIST DLMF 25.2.3, from memory);
        // 0.765147024625407945... evaluated with mpmath at 30 digits.
        assert!(relative(f_half(0.0), 0.765_147_024_625_407_9) < TABLE_REL_TOL);
    }

    #[test]
    fn f_minus_half_at_zero_is_the_closed_form() {
        // Source: closed form F_-1/2(0) = (1 - 2^1/2) zeta(1/2) (as above,
        // from memory); 0.604898643421630370... evaluated with mpmath.
        assert!(relative(f_minus_half(0.0), 0.604_898_643_421_630_4) < TABLE_REL_TOL);
    }

    #[test]
    fn non_degenerate_limit_is_the_boltzmann_series() {
        // Source: polylogarithm series F_j(eta) = sum_k (-1)^(k+1) e^(k eta) / k^(j+1)
        // (NIST DLMF 25.12.10, from memory); the terms after the second are below
        // e^(2 eta) < 1e-16 relative for eta <= -19.
        for eta in [-700.0, -200.0, -40.0, -25.0, -19.0] {
            let t = f64::exp(eta);
            let half = t * (1.0 - t / 8f64.sqrt());
            let minus_half = t * (1.0 - t / 2f64.sqrt());
            assert!(relative(f_half(eta), half) < TABLE_REL_TOL, "eta = {eta}");
            assert!(
                relative(f_minus_half(eta), minus_half) < TABLE_REL_TOL,
                "eta = {eta}"
            );
            assert!(
                relative(ln_f_half(eta), half.ln()) < TABLE_REL_TOL,
                "eta = {eta}"
            );
        }
    }

    #[test]
    fn degenerate_limit_is_the_sommerfeld_law() {
        // Source: Sommerfeld, Z. Phys. 47, 1 (1928): F_1/2 = (4 / (3 sqrt(pi)))
        // eta^(3/2) (1 + pi^2 / (8 eta^2) + ...), F_-1/2 = (2 / sqrt(pi))
        // eta^(1/2) (1 - pi^2 / (24 eta^2) + ...); the next terms are < 1e-15
        // relative for eta >= 1e4.
        let pi2 = std::f64::consts::PI.powi(2);
        for eta in [1e4, 1e6, 1e50, 1e150] {
            let half = 4.0 / (3.0 * std::f64::consts::PI.sqrt()) * eta * eta.sqrt();
            let minus_half = 2.0 / std::f64::consts::PI.sqrt() * eta.sqrt();
            let y = 1.0 / (eta * eta);
            assert!(relative(f_half(eta), half * (1.0 + pi2 / 8.0 * y)) < TABLE_REL_TOL);
            assert!(
                relative(f_minus_half(eta), minus_half * (1.0 - pi2 / 24.0 * y)) < TABLE_REL_TOL
            );
            let ln_half = half.ln() + (pi2 / 8.0 * y).ln_1p();
            assert!(relative(ln_f_half(eta), ln_half) < TABLE_REL_TOL);
        }
    }

    #[test]
    fn extreme_arguments_give_finite_sensible_values() {
        for eta in [-1e300, -745.0, -50.0, 0.0, 50.0, 1e6, 1e150] {
            for (name, value) in [("f_half", f_half(eta)), ("f_minus_half", f_minus_half(eta))] {
                assert!(value.is_finite() && value >= 0.0, "{name}({eta}) = {value}");
            }
            assert!(ln_f_half(eta).is_finite(), "ln_f_half({eta})");
        }
        // The true values overflow f64 only beyond eta ~ 3.9e205.
        assert!(f_half(1e150) > 7.5e224 && f_half(1e150) < 7.6e224);
        assert!(f_half(3.8e205).is_finite());
        assert_eq!(f_half(1e300), f64::INFINITY);
        assert!(f_minus_half(f64::MAX).is_finite());
        assert!(relative(ln_f_half(1e300), LN_INV_GAMMA_5_2 + 450.0 * 10f64.ln()) < 1e-15);
        assert_eq!(ln_f_half(-1e300), -1e300);
        assert_eq!(f_half(-1e300), 0.0);
    }

    #[test]
    fn non_finite_arguments() {
        assert!(f_half(f64::NAN).is_nan());
        assert!(f_minus_half(f64::NAN).is_nan());
        assert!(ln_f_half(f64::NAN).is_nan());
        assert_eq!(f_half(f64::NEG_INFINITY), 0.0);
        assert_eq!(f_minus_half(f64::NEG_INFINITY), 0.0);
        assert_eq!(ln_f_half(f64::NEG_INFINITY), f64::NEG_INFINITY);
        assert_eq!(f_half(f64::INFINITY), f64::INFINITY);
        assert_eq!(f_minus_half(f64::INFINITY), f64::INFINITY);
        assert_eq!(ln_f_half(f64::INFINITY), f64::INFINITY);
    }

    #[test]
    fn pieces_join_without_steps() {
        let mut boundaries: Vec<f64> = (0..=MID_COUNT)
            .map(|k| LOWER_ETA_MAX + k as f64 * MID_WIDTH)
            .collect();
        boundaries.push(UPPER_ETA_MIN);
        for b in boundaries {
            let below = b.next_down();
            for (name, f) in [
                ("f_half", f_half as fn(f64) -> f64),
                ("f_minus_half", f_minus_half),
            ] {
                assert!(relative(f(below), f(b)) < TABLE_REL_TOL, "{name} at {b}");
            }
            assert!(
                (ln_f_half(below) - ln_f_half(b)).abs() < TABLE_REL_TOL,
                "ln_f_half at {b}"
            );
        }
    }

    #[test]
    fn newton_needs_few_steps() {
        // The cost claim of the inverse: the start is within ~4e-3 in eta, so
        // Newton meets its step tolerance within three steps everywhere.
        let mut worst = 0;
        let mut ln_u = -800.0;
        while ln_u <= LN_U_MAX {
            let (eta, steps) = newton_ln_f_half(ln_u).expect("converges");
            assert!((ln_f_half(eta) - ln_u).abs() <= 1e-15 * ln_u.abs().max(1.0) * 4.0);
            worst = worst.max(steps);
            ln_u += 0.0371;
        }
        assert!(worst <= 3, "{worst} Newton steps");
    }

    #[test]
    fn inverse_rejects_what_has_no_solution() {
        for u in [0.0, -1.0, f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
            let err = f_half_inverse(u).unwrap_err();
            assert!(matches!(
                err,
                FermiDiracError::ReducedDensityNotPositive { .. }
            ));
            assert!(err.to_string().starts_with("u: "), "{err}");
        }
        for ln_u in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
            let err = ln_f_half_inverse(ln_u).unwrap_err();
            assert!(matches!(
                err,
                FermiDiracError::LnReducedDensityNotFinite { .. }
            ));
            assert!(err.to_string().starts_with("ln_u: "), "{err}");
        }
        let err = ln_f_half_inverse(2000.0).unwrap_err();
        assert_eq!(err, FermiDiracError::EtaBeyondRange { ln_u: 2000.0 });
        assert_eq!(
            err.to_string(),
            "ln_u: 2000 is not allowed; give a value <= 1064.389 \
             (beyond it the reduced Fermi level eta exceeds the f64 range)"
        );
        assert_eq!(
            FermiDiracError::ReducedDensityNotPositive { u: -1.0 }.to_string(),
            "u: -1 is not allowed; give a finite reduced density u = n/Nc > 0"
        );
    }

    #[test]
    fn ln_u_max_is_the_edge_of_the_f64_range() {
        assert!(ln_f_half(f64::MAX) >= LN_U_MAX);
        let eta = ln_f_half_inverse(LN_U_MAX).expect("in range");
        assert!(eta.is_finite() && eta > 3e205);
        assert!(ln_f_half_inverse(LN_U_MAX + 0.01).is_err());
    }

    #[test]
    fn inverse_of_extreme_densities() {
        assert_eq!(ln_f_half_inverse(-1e300), Ok(-1e300));
        // The smallest positive f64 (subnormal) still has an exact logarithm.
        let tiny = f64::from_bits(1);
        assert!((f_half_inverse(tiny).unwrap() - tiny.ln()).abs() < 1e-12);
        let eta = f_half_inverse(f64::MAX).unwrap();
        assert!(relative(f_half(eta), f64::MAX) < 1e-13);
    }

    proptest! {
        #[test]
        fn f_half_increases(eta in -700.0..1e4_f64, step in 1e-8..1.0_f64) {
            let next = eta + step * eta.abs().max(1.0);
            prop_assert!(f_half(next) > f_half(eta));
            prop_assert!(ln_f_half(next) > ln_f_half(eta));
        }

        #[test]
        fn f_minus_half_is_positive(eta in -700.0..1e6_f64) {
            prop_assert!(f_minus_half(eta) > 0.0);
        }

        #[test]
        fn inverse_round_trips(eta in -700.0..1e4_f64) {
            let back = f_half_inverse(f_half(eta)).unwrap();
            prop_assert!((back - eta).abs() <= ROUND_TRIP_TOL * eta.abs().max(1.0),
                "eta = {eta}, back = {back}");
        }

        #[test]
        fn ln_inverse_round_trips(eta in -1e6..1e10_f64) {
            let back = ln_f_half_inverse(ln_f_half(eta)).unwrap();
            prop_assert!((back - eta).abs() <= ROUND_TRIP_TOL * eta.abs().max(1.0),
                "eta = {eta}, back = {back}");
        }

        #[test]
        fn f_minus_half_is_the_derivative(eta in -700.0..1e4_f64) {
            let h = 1e-5 * eta.max(1.0);
            // Divide by the spacing actually represented, not by 2 h.
            let (below, above) = (eta - h, eta + h);
            let slope = (f_half(above) - f_half(below)) / (above - below);
            prop_assert!(relative(slope, f_minus_half(eta)) < FINITE_DIFFERENCE_TOL,
                "eta = {eta}: {slope} vs {}", f_minus_half(eta));
        }
    }
}
