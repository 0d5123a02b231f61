//! Van der Pauw sheet resistance: the two four-terminal resistances of a structure of any shape
//! (contacts small and on its edge) to the sheet resistance, with the averaging of reciprocal and
//! reversed-polarity readings and the checks a reviewer asks for.
//!
//! # Public API
//! - [`solve`]: R_A, R_B -> [`VdpSolution`] (R_s, the symmetry ratio, the correction factor f,
//!   the residual of the van der Pauw equation).
//! - [`correction_factor`]: f(R_A/R_B) alone; [`resistances_for`]: the R_A that goes with a
//!   sheet resistance and R_B (the equation solved the other way, in closed form).
//! - [`VdpReadings`] of two [`Configuration`]s -> [`evaluate`] -> [`VdpResult`]: averaged R_A and
//!   R_B, R_s, resistivity with a thickness, reciprocity and polarity differences, warnings.
//! - [`RECIPROCITY_TOLERANCE`], [`ASYMMETRY_LIMIT`], [`RESIDUAL_LIMIT`]; [`VdpError`].
//!
//! # The bracket
//! With R_A >= R_B, r = R_A/R_B and y = pi R_B / R_s the equation reads
//! g(y) = e^-y + e^-(r y) - 1 = 0, and g falls strictly with y. Two bounds hold for every r >= 1:
//! - y <= ln 2: e^-(r y) <= e^-y, so 1 <= 2 e^-y; equality at r = 1. In R_s: R_s >= pi R_B/ln 2.
//! - y >= 2 ln 2/(1 + r): e^-x is convex, so 1/2 = (e^-y + e^-(r y))/2 >= e^-((1 + r) y/2). In
//!   R_s: R_s <= pi (R_A + R_B)/(2 ln 2), i.e. van der Pauw's f <= 1.
//!
//! The equation is solved in logarithms, h(y) = -r y - ln(1 - e^-y) = 0, with 1 - e^-y as
//! -expm1(-y) so that it keeps its digits when y is small (large ratios: y is about 1e-297 at
//! r = 1e300). h is convex and falling, so Newton's method started from a closed-form guess
//! and clamped to the lower bound rises monotonically to the root inside the bracket (two to
//! four steps, about 0.2 us). Brent's method (the `roots` crate) on u = ln y over the whole
//! bracket, where a tolerance on u is a relative one on R_s, is the fallback should Newton
//! not settle; the tests check that both give the same root.

use std::f64::consts::{LN_2, PI};
use std::fmt;

use serde::Serialize;

/// Reciprocal readings (current and voltage contact pairs swapped) that differ by more than
/// this fraction of their mean raise a warning: 3 %. By reciprocity the two are equal for
/// linear (ohmic) contacts on a uniform layer; a larger difference points to rectifying or
/// drifting contacts, heating, or a reading taken before it settled. The figure is common
/// practice, no source (this project's choice).
pub const RECIPROCITY_TOLERANCE: f64 = 0.03;

/// Above this R_A/R_B (either way round) a warning says that the structure is far from
/// symmetric: 10, where van der Pauw's f is 0.7 and R_s rests mostly on the larger
/// resistance, whose value depends on where the contacts sit; small contact misplacements then
/// move R_s more than they would on a symmetric structure. This project's choice, no source.
pub const ASYMMETRY_LIMIT: f64 = 10.0;

/// Largest accepted relative residual of the van der Pauw equation at the solution,
/// |e^-(pi R_A/R_s) + e^-(pi R_B/R_s) - 1| / (1 - e^-(pi R_B/R_s)), R_A >= R_B (the
/// residual relative to the size of the terms, which is what a large ratio makes small).
pub const RESIDUAL_LIMIT: f64 = 1e-12;

/// Brent iterations allowed; the bracket on ln y is at most about 700 wide, and bisection alone
/// reaches 4 ulp in about 60 steps.
const MAX_ITERATIONS: usize = 200;

/// Why a van der Pauw quantity cannot be computed.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum VdpError {
    /// A resistance or thickness is not finite or not > 0.
    NotPositive {
        /// Field name, e.g. "r_a_ohm".
        field: &'static str,
        /// Value given.
        value: f64,
    },
    /// The equation has no solution in floating point for these resistances (their ratio
    /// overflows, or the solver could not reach the residual limit).
    NoSolution {
        /// R_A / R_B as given.
        ratio: f64,
    },
    /// The inputs are each finite and > 0, but a result computed from them is not.
    OutOfRange {
        /// The computed quantity, e.g. "sheet_resistance_ohm_sq".
        quantity: &'static str,
        /// The value computed.
        value: f64,
    },
}

impl fmt::Display for VdpError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            VdpError::NotPositive { field, value } => write!(
                f,
                "{field}: {value:e} is not allowed; give a finite resistance V/I > 0 (for a \
                 reversed-polarity reading divide the reversed voltage by the reversed current)"
            ),
            VdpError::NoSolution { ratio } => write!(
                f,
                "r_a_ohm: the ratio R_A/R_B = {ratio:e} has no van der Pauw solution in \
                 floating point; give two resistances whose ratio is between 1e-300 and 1e300 \
                 (a real structure gives a ratio near 1)"
            ),
            VdpError::OutOfRange { quantity, value } => write!(
                f,
                "{quantity}: the inputs give {value:e}, outside the range of floating-point \
                 numbers; check the units of the resistances and the thickness"
            ),
        }
    }
}

impl std::error::Error for VdpError {}

fn positive(field: &'static str, value: f64) -> Result<f64, VdpError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(VdpError::NotPositive { field, value })
    }
}

fn in_range(quantity: &'static str, value: f64) -> Result<f64, VdpError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(VdpError::OutOfRange { quantity, value })
    }
}

/// The van der Pauw solution for one pair of resistances.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct VdpSolution {
    /// Sheet resistance R_s, ohm/sq.
    pub sheet_resistance_ohm_sq: f64,
    /// R_A / R_B as given (the symmetry ratio; 1 for a symmetric structure).
    pub ratio: f64,
    /// Van der Pauw's f in R_s = pi (R_A + R_B) f / (2 ln 2); 1 at ratio 1, < 1 otherwise.
    pub correction_factor: f64,
    /// Relative residual of the equation at R_s (see [`RESIDUAL_LIMIT`]).
    pub relative_residual: f64,
}

/// h(y) = -r y - ln(1 - e^-y): the van der Pauw equation e^-(r y) = 1 - e^-y in logarithms,
/// falling with y, O(1) near the root whatever the ratio (g itself is about y there, 1e-298 at
/// r = 1e300, where products of two g values underflow and hide a sign change).
fn log_equation(ratio: f64, y: f64) -> f64 {
    -ratio * y - (-(-y).exp_m1()).ln()
}

/// The root y = pi R_small / R_s of e^-y + e^-(r y) = 1 for r >= 1, with its relative residual
/// |e^-(r y) - (1 - e^-y)| / (1 - e^-y) = |expm1(h(y))|.
fn reduced_root(ratio: f64) -> Option<(f64, f64)> {
    let (lo, hi) = (2.0 * LN_2 / (1.0 + ratio), LN_2);
    let y = if log_equation(ratio, hi) >= 0.0 {
        // r = 1, or so close to it that h(ln 2) = (1 - r) ln 2 rounds to >= 0: the root is
        // ln 2 to rounding.
        hi
    } else {
        newton_from_the_left(ratio, lo, hi).or_else(|| brent_on_log(ratio, lo, hi))?
    };
    let residual = log_equation(ratio, y).exp_m1().abs();
    residual.is_finite().then_some((y, residual))
}

/// Newton's method on h(y), h' = -r - e^-y/(1 - e^-y). h is convex and falling, so its tangent
/// lies below it: a Newton step from anywhere lands at or left of the root (clamped to the
/// lower bound), and from the left the iterates rise monotonically to the root without
/// overshooting. The start is a closed-form guess: van der Pauw's f to order q^4,
/// q = (r - 1)/(r + 1), below r = 4 (within 0.4 % of the root), and y = W(r)/r with the
/// asymptotic W(r) = L1 - L2 + L2/L1 (L1 = ln r, L2 = ln L1) above (within 2 %). Two to four
/// steps then reach a relative step of 4 ulp. `None` if that takes more than
/// [`MAX_NEWTON_STEPS`] (never seen; Brent's method takes over).
fn newton_from_the_left(ratio: f64, lo: f64, hi: f64) -> Option<f64> {
    let guess = if ratio < 4.0 {
        let q = (ratio - 1.0) / (ratio + 1.0);
        let q2 = q * q;
        let f = 1.0 - q2 * (0.5 * LN_2 + q2 * (0.25 * LN_2 * LN_2 - LN_2.powi(3) / 12.0));
        2.0 * LN_2 / (f * (1.0 + ratio))
    } else {
        let l1 = ratio.ln();
        let l2 = l1.ln();
        (l1 - l2 + l2 / l1) / ratio
    };
    let mut y = guess.clamp(lo, hi);
    for _ in 0..MAX_NEWTON_STEPS {
        // e = e^-y - 1 < 0; 1 - e^-y = -e keeps its digits for small y.
        let e = (-y).exp_m1();
        let h = -ratio * y - (-e).ln();
        let slope = -ratio - (1.0 + e) / -e;
        let next = (y - h / slope).max(lo);
        if (next - y).abs() <= 4.0 * f64::EPSILON * y {
            return Some(next);
        }
        y = next;
    }
    None
}

/// Newton steps allowed before Brent's method takes over.
const MAX_NEWTON_STEPS: usize = 40;

/// Brent's method (the `roots` crate) on u = ln y over the whole bracket: the safe fallback.
fn brent_on_log(ratio: f64, lo: f64, hi: f64) -> Option<f64> {
    let h = |u: f64| log_equation(ratio, u.exp());
    let (lo, hi) = (lo.ln(), hi.ln());
    if h(lo) <= 0.0 {
        // The bracket is narrower than the rounding of h (r within a few ulp of 1).
        return Some(lo.exp());
    }
    // `find_root_brent` answers with its previous iterate once the bracket has closed; the
    // point of smallest |h| it evaluated is at least as good, so that one is kept.
    let mut best = (hi, f64::INFINITY);
    let mut convergence = LogConvergence;
    let returned = roots::find_root_brent(
        lo,
        hi,
        |u| {
            let value = h(u);
            if value.abs() < best.1 {
                best = (u, value.abs());
            }
            value
        },
        &mut convergence,
    )
    .ok()?;
    let u = if h(returned).abs() <= best.1 {
        returned
    } else {
        best.0
    };
    // Rounding u = ln y costs |u| ulp in y, which for large ratios (u near -684 at r = 1e300)
    // moves r y by about 5e-11: finish with Newton from there.
    newton_polish(ratio, u.exp())
}

/// Newton steps on h(y) from `y`, kept while they lower |h|.
fn newton_polish(ratio: f64, mut y: f64) -> Option<f64> {
    let mut value = log_equation(ratio, y);
    for _ in 0..4 {
        let next = y + value / (ratio + 1.0 / y.exp_m1());
        let next_value = log_equation(ratio, next);
        // A NaN step fails the comparison and stops the polish too.
        if next_value.abs().partial_cmp(&value.abs()) != Some(std::cmp::Ordering::Less) {
            break;
        }
        (y, value) = (next, next_value);
    }
    y.is_finite().then_some(y)
}

/// Stops Brent's method when the bracket on u = ln y is 4 ulp of a number near 1 wide (a
/// relative width of about 1e-15 on y and R_s), or when g is exactly zero.
struct LogConvergence;

impl roots::Convergency<f64> for LogConvergence {
    fn is_root_found(&mut self, y: f64) -> bool {
        y == 0.0
    }

    fn is_converged(&mut self, x1: f64, x2: f64) -> bool {
        (x1 - x2).abs() <= 4.0 * f64::EPSILON * x1.abs().max(x2.abs()).max(1.0)
    }

    fn is_iteration_limit_reached(&mut self, iter: usize) -> bool {
        iter >= MAX_ITERATIONS
    }
}

/// Sheet resistance from the two four-terminal resistances of a van der Pauw structure.
///
/// # Formula
/// exp(-pi R_A / R_s) + exp(-pi R_B / R_s) = 1, solved for R_s inside the bracket derived in
/// the module documentation (safeguarded Newton, Brent's method as the fallback). Symmetric case R_A = R_B = R:
/// R_s = pi R / ln 2 = 4.53236 R. The correction factor is f = 2 ln 2 R_s / (pi (R_A + R_B)).
///
/// # Validity
/// A uniform layer of uniform thickness without holes; contacts small and on the edge (the
/// error grows with contact size); any ratio R_A/R_B. The relative residual is below
/// [`RESIDUAL_LIMIT`] (in practice a few 1e-16).
///
/// # References
/// L. J. van der Pauw, Philips Res. Rep. 13, 1 (1958), eq. (1)-(4); Brent (1973), ch. 4.
///
/// # Errors
/// [`VdpError::NotPositive`] (`r_a_ohm`, `r_b_ohm`), [`VdpError::NoSolution`],
/// [`VdpError::OutOfRange`].
pub fn solve(r_a_ohm: f64, r_b_ohm: f64) -> Result<VdpSolution, VdpError> {
    let a = positive("r_a_ohm", r_a_ohm)?;
    let b = positive("r_b_ohm", r_b_ohm)?;
    let ratio = a / b;
    let (large, small) = if a >= b { (a, b) } else { (b, a) };
    let r = large / small;
    if !(r.is_finite() && ratio > 0.0) {
        return Err(VdpError::NoSolution { ratio });
    }
    let (y, residual) = reduced_root(r).ok_or(VdpError::NoSolution { ratio })?;
    if residual > RESIDUAL_LIMIT {
        return Err(VdpError::NoSolution { ratio });
    }
    let sheet = in_range("sheet_resistance_ohm_sq", PI * small / y)?;
    Ok(VdpSolution {
        sheet_resistance_ohm_sq: sheet,
        ratio,
        correction_factor: 2.0 * LN_2 / (y * (1.0 + r)),
        relative_residual: residual,
    })
}

/// Van der Pauw's correction factor f for a ratio R_A/R_B.
///
/// # Formula
/// f in R_s = pi (R_A + R_B) f / (2 ln 2); equivalently
/// cosh(((r - 1)/(r + 1)) ln 2 / f) = exp(ln 2 / f) / 2 with r = R_A/R_B. f(r) = f(1/r).
///
/// # References
/// L. J. van der Pauw, Philips Res. Rep. 13, 1 (1958), eq. (5) and Fig. 5.
///
/// # Errors
/// [`VdpError::NotPositive`] (`r_a_ohm / r_b_ohm`), [`VdpError::NoSolution`].
pub fn correction_factor(ratio: f64) -> Result<f64, VdpError> {
    positive("r_a_ohm / r_b_ohm", ratio)?;
    solve(ratio, 1.0).map(|s| s.correction_factor)
}

/// The other resistance of a structure with sheet resistance `sheet_ohm_sq` whose smaller
/// resistance is `r_small_ohm`: the van der Pauw equation solved for R_A in closed form.
///
/// # Formula
/// R_A = -(R_s/pi) ln(1 - exp(-pi R_B/R_s)); R_A >= R_B when R_B <= R_s ln 2 / pi.
///
/// # Errors
/// [`VdpError::NotPositive`] (`sheet_resistance_ohm_sq`, `r_b_ohm`); [`VdpError::NoSolution`]
/// when R_B > R_s ln 2 / pi (then R_B would be the larger of the two: swap them).
pub fn resistances_for(sheet_ohm_sq: f64, r_small_ohm: f64) -> Result<f64, VdpError> {
    let sheet = positive("sheet_resistance_ohm_sq", sheet_ohm_sq)?;
    let small = positive("r_b_ohm", r_small_ohm)?;
    if small > sheet * LN_2 / PI {
        return Err(VdpError::NoSolution { ratio: f64::NAN });
    }
    let y = PI * small / sheet;
    in_range("r_a_ohm", -(sheet / PI) * (-(-y).exp_m1()).ln())
}

/// The readings of one configuration (R_A: current along one edge, voltage across the
/// opposite one; R_B: the same turned by one contact), each a resistance V/I > 0.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Configuration {
    /// V/I with the current one way, ohm.
    pub forward_ohm: f64,
    /// V/I with the current reversed (both signs flip, so V/I stays > 0), ohm.
    pub reversed_ohm: Option<f64>,
    /// V/I with the current and voltage contact pairs swapped (the reciprocal reading), ohm.
    pub reciprocal_ohm: Option<f64>,
    /// The reciprocal reading with the current reversed, ohm.
    pub reciprocal_reversed_ohm: Option<f64>,
}

impl Configuration {
    /// A configuration read once.
    pub fn single(forward_ohm: f64) -> Configuration {
        Configuration {
            forward_ohm,
            reversed_ohm: None,
            reciprocal_ohm: None,
            reciprocal_reversed_ohm: None,
        }
    }
}

/// Everything read on a van der Pauw structure.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct VdpReadings {
    /// Configuration A.
    pub a: Configuration,
    /// Configuration B (contacts turned by one position).
    pub b: Configuration,
    /// Layer thickness, cm (`None`: sheet resistance only).
    pub thickness_cm: Option<f64>,
}

/// Averages and checks of one configuration.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ConfigurationSummary {
    /// The mean of every reading given, ohm.
    pub mean_ohm: f64,
    /// Readings averaged.
    pub readings: usize,
    /// |direct - reciprocal| / their mean, each side averaged over its polarities (`None`
    /// without a reciprocal reading).
    pub reciprocity_difference: Option<f64>,
    /// |forward - reversed| / their mean over the directions given (`None` without a reversed
    /// reading).
    pub polarity_difference: Option<f64>,
}

/// The evaluated structure.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct VdpResult {
    /// Configuration A.
    pub a: ConfigurationSummary,
    /// Configuration B.
    pub b: ConfigurationSummary,
    /// R_s, the ratio, f and the residual from the averaged R_A, R_B.
    pub solution: VdpSolution,
    /// rho = R_s t, ohm cm, when a thickness was given.
    pub resistivity_ohm_cm: Option<f64>,
    /// Warnings a reader must see (reciprocity, asymmetry).
    pub warnings: Vec<String>,
}

/// Field names of one configuration's readings, for messages.
const FIELDS: [[&str; 4]; 2] = [
    [
        "r_a_ohm",
        "r_a_reversed_ohm",
        "r_a_reciprocal_ohm",
        "r_a_reciprocal_reversed_ohm",
    ],
    [
        "r_b_ohm",
        "r_b_reversed_ohm",
        "r_b_reciprocal_ohm",
        "r_b_reciprocal_reversed_ohm",
    ],
];

fn mean(values: &[f64]) -> f64 {
    values.iter().sum::<f64>() / values.len() as f64
}

fn relative_difference(x: f64, y: f64) -> f64 {
    (x - y).abs() / (0.5 * (x + y))
}

fn summarise(
    c: &Configuration,
    fields: [&'static str; 4],
) -> Result<ConfigurationSummary, VdpError> {
    let forward = positive(fields[0], c.forward_ohm)?;
    let check = |field, v: Option<f64>| v.map(|v| positive(field, v)).transpose();
    let reversed = check(fields[1], c.reversed_ohm)?;
    let reciprocal = check(fields[2], c.reciprocal_ohm)?;
    let reciprocal_reversed = check(fields[3], c.reciprocal_reversed_ohm)?;
    let side = |one: Option<f64>, other: Option<f64>| -> Option<f64> {
        match (one, other) {
            (Some(x), Some(y)) => Some(0.5 * (x + y)),
            (x, y) => x.or(y),
        }
    };
    let direct = side(Some(forward), reversed).unwrap_or(forward);
    let swapped = side(reciprocal, reciprocal_reversed);
    let all: Vec<f64> = [Some(forward), reversed, reciprocal, reciprocal_reversed]
        .into_iter()
        .flatten()
        .collect();
    let polarity_difference = match (reversed, reciprocal, reciprocal_reversed) {
        (Some(rev), Some(rec), Some(rec_rev)) => {
            Some(relative_difference(forward + rec, rev + rec_rev))
        }
        (Some(rev), _, _) => Some(relative_difference(forward, rev)),
        (None, Some(rec), Some(rec_rev)) => Some(relative_difference(rec, rec_rev)),
        _ => None,
    };
    Ok(ConfigurationSummary {
        mean_ohm: in_range(fields[0], mean(&all))?,
        readings: all.len(),
        reciprocity_difference: swapped.map(|s| relative_difference(direct, s)),
        polarity_difference,
    })
}

/// Evaluates a van der Pauw structure.
///
/// # Formula
/// R_A, R_B = the means of every reading given for each configuration (forward, reversed
/// polarity, reciprocal, reciprocal reversed: common practice, no source); R_s by [`solve`];
/// rho = R_s t.
///
/// # Validity
/// As [`solve`]. Warnings: reciprocal readings differing by more than
/// [`RECIPROCITY_TOLERANCE`]; R_A/R_B or R_B/R_A above [`ASYMMETRY_LIMIT`].
///
/// # References
/// L. J. van der Pauw, Philips Res. Rep. 13, 1 (1958).
///
/// # Errors
/// [`VdpError::NotPositive`] naming the reading or `thickness_cm`; [`VdpError::NoSolution`];
/// [`VdpError::OutOfRange`].
pub fn evaluate(readings: &VdpReadings) -> Result<VdpResult, VdpError> {
    let a = summarise(&readings.a, FIELDS[0])?;
    let b = summarise(&readings.b, FIELDS[1])?;
    let thickness = readings
        .thickness_cm
        .map(|t| positive("thickness_cm", t))
        .transpose()?;
    let solution = solve(a.mean_ohm, b.mean_ohm)?;
    let resistivity_ohm_cm = thickness
        .map(|t| in_range("resistivity_ohm_cm", solution.sheet_resistance_ohm_sq * t))
        .transpose()?;
    let mut warnings = Vec::new();
    for (name, summary) in [("R_A", &a), ("R_B", &b)] {
        if let Some(d) = summary.reciprocity_difference
            && d > RECIPROCITY_TOLERANCE
        {
            warnings.push(format!(
                "{name}: the reciprocal readings differ by {:.1} %, more than the {:.0} % \
                 tolerance; check the contacts (ohmic, settled) before relying on R_s",
                100.0 * d,
                100.0 * RECIPROCITY_TOLERANCE
            ));
        }
    }
    let asymmetry = solution.ratio.max(1.0 / solution.ratio);
    if asymmetry > ASYMMETRY_LIMIT {
        warnings.push(format!(
            "R_A/R_B = {:.3}: beyond {ASYMMETRY_LIMIT} the structure is far from symmetric \
             (f = {:.3}) and the result depends mostly on where the contacts sit",
            solution.ratio, solution.correction_factor
        ));
    }
    Ok(VdpResult {
        a,
        b,
        solution,
        resistivity_ohm_cm,
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bracket_holds_the_root_at_its_ends() {
        // The two bounds of the module documentation are tight at r = 1 and r -> infinity.
        for r in [1.001, 1.5, 10.0, 1e3, 1e100, 1e300] {
            let lo = (2.0 * LN_2 / (1.0 + r)).ln();
            assert!(log_equation(r, lo.exp()) > 0.0, "r = {r:e}");
            assert!(log_equation(r, LN_2) < 0.0, "r = {r:e}");
        }
    }

    #[test]
    fn newton_and_the_brent_fallback_agree() {
        for r in [1.0001, 1.5, 3.99, 4.0, 10.0, 1e3, 1e6, 1e100, 1e300] {
            let (lo, hi) = (2.0 * LN_2 / (1.0 + r), LN_2);
            let newton = newton_from_the_left(r, lo, hi).unwrap();
            let brent = brent_on_log(r, lo, hi).unwrap();
            approx::assert_relative_eq!(newton, brent, max_relative = 1e-14);
            assert!(
                log_equation(r, newton).exp_m1().abs() <= RESIDUAL_LIMIT,
                "r = {r:e}"
            );
        }
    }

    #[test]
    fn ratios_next_to_one_solve() {
        for r in [1.0, 1.0 + f64::EPSILON, 1.0 + 1e-12, 1.0 - 1e-12] {
            let s = solve(r, 1.0).unwrap();
            approx::assert_relative_eq!(s.sheet_resistance_ohm_sq, PI / LN_2, max_relative = 1e-11);
            assert!(s.relative_residual <= RESIDUAL_LIMIT, "{s:?}");
        }
    }

    #[test]
    fn refuses_bad_resistances_by_name() {
        assert_eq!(
            solve(0.0, 1.0),
            Err(VdpError::NotPositive {
                field: "r_a_ohm",
                value: 0.0
            })
        );
        assert!(matches!(
            solve(1.0, -2.0),
            Err(VdpError::NotPositive {
                field: "r_b_ohm",
                ..
            })
        ));
        assert!(matches!(
            solve(1e300, 1e-300),
            Err(VdpError::NoSolution { .. })
        ));
        let readings = VdpReadings {
            a: Configuration {
                reciprocal_ohm: Some(f64::NAN),
                ..Configuration::single(1.0)
            },
            b: Configuration::single(1.0),
            thickness_cm: None,
        };
        assert!(matches!(
            evaluate(&readings),
            Err(VdpError::NotPositive {
                field: "r_a_reciprocal_ohm",
                ..
            })
        ));
    }

    #[test]
    fn reciprocity_and_asymmetry_warnings() {
        let readings = VdpReadings {
            a: Configuration {
                forward_ohm: 10.0,
                reversed_ohm: Some(10.0),
                reciprocal_ohm: Some(10.5),
                reciprocal_reversed_ohm: Some(10.5),
            },
            b: Configuration::single(10.0),
            thickness_cm: Some(1e-4),
        };
        let result = evaluate(&readings).unwrap();
        assert_eq!(result.a.readings, 4);
        approx::assert_relative_eq!(result.a.mean_ohm, 10.25);
        approx::assert_relative_eq!(
            result.a.reciprocity_difference.unwrap(),
            0.5 / 10.25,
            max_relative = 1e-15
        );
        assert_eq!(result.a.polarity_difference, Some(0.0));
        assert_eq!(result.warnings.len(), 1, "{:?}", result.warnings);
        assert!(result.warnings[0].starts_with("R_A: the reciprocal readings differ by 4.9 %"));
        let skewed = VdpReadings {
            a: Configuration::single(1.0),
            b: Configuration::single(11.0),
            thickness_cm: None,
        };
        let result = evaluate(&skewed).unwrap();
        assert!(
            result.warnings[0].contains("far from symmetric"),
            "{:?}",
            result.warnings
        );
        assert_eq!(result.resistivity_ohm_cm, None);
    }
}
