//! Descriptive statistics of site values (running moments, medians in bounded memory), and
//! the tests that say whether lots differ: Welch's t-test and the Kruskal-Wallis test, with the
//! Student-t and chi-square distributions computed here from the regularized incomplete beta
//! and gamma functions.
//!
//! # Public API
//! - [`Moments`]: count, mean, sample standard deviation, min, max in one pass (Welford).
//! - [`MedianSketch`]: exact median up to [`EXACT_MEDIAN_LIMIT`] values, log-binned beyond.
//! - [`Summary`]: the figures reported per wafer and per lot.
//! - [`ln_gamma`], [`regularized_incomplete_beta`], [`regularized_gamma_q`],
//!   [`student_t_cdf`], [`student_t_pdf`], [`student_t_two_sided_p`], [`student_t_quantile`],
//!   [`chi_squared_survival`].
//! - [`welch_t_test`] -> [`WelchTest`]; [`kruskal_wallis`] -> [`KruskalWallis`]; [`StatsError`].
//! - [`holm_adjusted`]: Holm's step-down family-wise adjustment of a family of p-values.
//! - [`quartiles`]: the lower quartile, median and upper quartile of a few values.

use std::collections::BTreeMap;
use std::fmt;

use serde::Serialize;

/// Values kept per wafer (and merged per lot) for an exact median; beyond this a wafer's values
/// go into logarithmic bins and the median is within [`MEDIAN_BIN_RELATIVE_WIDTH`] / 2 of the
/// exact one. Real wafer maps have at most a few hundred sites, so their medians stay exact.
pub const EXACT_MEDIAN_LIMIT: usize = 4096;

/// Width of a median bin in ln(value): 1e-4, so a binned median is within 0.005 % of the exact
/// one, far below the 0.1-1 % repeatability of resistivity measurements.
pub const MEDIAN_BIN_RELATIVE_WIDTH: f64 = 1e-4;

/// Relative accuracy the continued fractions iterate to.
const SERIES_EPSILON: f64 = 1e-15;
/// Smallest magnitude Lentz's method lets a denominator take.
const LENTZ_TINY: f64 = 1e-300;
/// Iteration cap of the continued fractions and series; they converge in well under 100
/// iterations for the arguments used here (degrees of freedom up to about 1e6).
const MAX_ITERATIONS: usize = 10_000;
/// Step cap of the quantile search: Newton needs under 10; bisection alone under 200.
const MAX_QUANTILE_STEPS: usize = 200;
/// Relative step at which the quantile search stops (a few ulps above rounding).
const QUANTILE_TOLERANCE: f64 = 1e-14;

/// Running count, mean, sum of squared deviations, min and max.
///
/// # Formula
/// Welford's update: d = x - mean; mean += d / n; m2 += d (x - mean).
/// Sample standard deviation s = sqrt(m2 / (n - 1)).
///
/// # References
/// Welford, Technometrics 4, 419 (1962).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Moments {
    count: u64,
    mean: f64,
    m2: f64,
    min: f64,
    max: f64,
}

impl Default for Moments {
    fn default() -> Moments {
        Moments::new()
    }
}

impl Moments {
    /// No values yet.
    pub fn new() -> Moments {
        Moments {
            count: 0,
            mean: 0.0,
            m2: 0.0,
            min: f64::INFINITY,
            max: f64::NEG_INFINITY,
        }
    }

    /// The moments of `values`.
    pub fn of(values: &[f64]) -> Moments {
        let mut moments = Moments::new();
        for &v in values {
            moments.push(v);
        }
        moments
    }

    /// Adds one value.
    pub fn push(&mut self, value: f64) {
        self.count += 1;
        let delta = value - self.mean;
        self.mean += delta / self.count as f64;
        self.m2 += delta * (value - self.mean);
        self.min = self.min.min(value);
        self.max = self.max.max(value);
    }

    /// Number of values.
    pub fn count(&self) -> u64 {
        self.count
    }

    /// Arithmetic mean (`None` without values).
    pub fn mean(&self) -> Option<f64> {
        (self.count > 0).then_some(self.mean)
    }

    /// Sample standard deviation, n - 1 in the denominator (`None` below two values).
    pub fn sample_std(&self) -> Option<f64> {
        (self.count > 1).then(|| (self.m2.max(0.0) / (self.count - 1) as f64).sqrt())
    }

    /// Smallest value (`None` without values).
    pub fn min(&self) -> Option<f64> {
        (self.count > 0).then_some(self.min)
    }

    /// Largest value (`None` without values).
    pub fn max(&self) -> Option<f64> {
        (self.count > 0).then_some(self.max)
    }
}

/// The values of one group, kept for its median in bounded memory.
///
/// Up to [`EXACT_MEDIAN_LIMIT`] values are kept as they are. Past that, every value moves to a
/// bin of width [`MEDIAN_BIN_RELATIVE_WIDTH`] in ln(value), so memory is bounded by the spread
/// of the values, not their number. Values must be > 0 (resistivities and densities are).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct MedianSketch {
    exact: Vec<f64>,
    bins: BTreeMap<i64, u64>,
    binned: u64,
}

impl MedianSketch {
    /// Empty.
    pub fn new() -> MedianSketch {
        MedianSketch::default()
    }

    /// Number of values.
    pub fn count(&self) -> u64 {
        self.exact.len() as u64 + self.binned
    }

    /// Whether the median is exact (no value has been binned).
    pub fn is_exact(&self) -> bool {
        self.binned == 0
    }

    /// Adds one value (> 0).
    pub fn push(&mut self, value: f64) {
        if self.binned == 0 && self.exact.len() < EXACT_MEDIAN_LIMIT {
            self.exact.push(value);
            return;
        }
        if self.binned == 0 {
            for v in std::mem::take(&mut self.exact) {
                self.push_binned(v, 1);
            }
        }
        self.push_binned(value, 1);
    }

    fn push_binned(&mut self, value: f64, count: u64) {
        *self.bins.entry(bin_of(value)).or_insert(0) += count;
        self.binned += count;
    }

    /// All the values of several sketches in one (exact while they fit).
    pub fn merged<'a>(sketches: impl IntoIterator<Item = &'a MedianSketch>) -> MedianSketch {
        let mut out = MedianSketch::new();
        for sketch in sketches {
            for &v in &sketch.exact {
                out.push(v);
            }
            for (&bin, &count) in &sketch.bins {
                if out.binned == 0 {
                    for v in std::mem::take(&mut out.exact) {
                        out.push_binned(v, 1);
                    }
                }
                *out.bins.entry(bin).or_insert(0) += count;
                out.binned += count;
            }
        }
        out
    }

    /// The median: the middle value, or the mean of the two middle values for an even count.
    /// `None` without values.
    pub fn median(&self) -> Option<f64> {
        let n = self.count();
        if n == 0 {
            return None;
        }
        let lower = (n - 1) / 2;
        let upper = n / 2;
        if self.is_exact() {
            let mut sorted = self.exact.clone();
            crate::order::sort_floats(&mut sorted);
            return Some(0.5 * (sorted[lower as usize] + sorted[upper as usize]));
        }
        Some(0.5 * (self.binned_rank(lower) + self.binned_rank(upper)))
    }

    fn binned_rank(&self, rank: u64) -> f64 {
        let mut seen = 0;
        for (&bin, &count) in &self.bins {
            seen += count;
            if seen > rank {
                return bin_centre(bin);
            }
        }
        // Unreachable for rank < count; the last bin is the honest answer otherwise.
        self.bins
            .keys()
            .next_back()
            .map_or(f64::NAN, |&b| bin_centre(b))
    }

    /// Counts the values for which `outside` is true (binned values by their bin centre).
    pub fn count_where(&self, outside: impl Fn(f64) -> bool) -> u64 {
        let exact = self.exact.iter().filter(|v| outside(**v)).count() as u64;
        let binned: u64 = self
            .bins
            .iter()
            .filter(|(bin, _)| outside(bin_centre(**bin)))
            .map(|(_, count)| *count)
            .sum();
        exact + binned
    }
}

/// True for a number > 0 (false for NaN).
fn is_positive(x: f64) -> bool {
    x > 0.0
}

fn bin_of(value: f64) -> i64 {
    (value.ln() / MEDIAN_BIN_RELATIVE_WIDTH).floor() as i64
}

fn bin_centre(bin: i64) -> f64 {
    ((bin as f64 + 0.5) * MEDIAN_BIN_RELATIVE_WIDTH).exp()
}

/// The figures reported for one quantity of one wafer or lot.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Summary {
    /// Number of sites.
    pub count: u64,
    /// Arithmetic mean.
    pub mean: f64,
    /// Median (exact unless `median_exact` is false).
    pub median: f64,
    /// Sample standard deviation, n - 1 (`None` for one site).
    pub std: Option<f64>,
    /// Smallest value.
    pub min: f64,
    /// Largest value.
    pub max: f64,
    /// Non-uniformity: 100 std / mean, percent (`None` for one site).
    pub nonuniformity_percent: Option<f64>,
    /// Whether the median is exact (see [`EXACT_MEDIAN_LIMIT`]).
    pub median_exact: bool,
}

impl Summary {
    /// The summary of a group from its moments and its median sketch (`None` without values).
    pub fn from_parts(moments: &Moments, sketch: &MedianSketch) -> Option<Summary> {
        let mean = moments.mean()?;
        let std = moments.sample_std();
        Some(Summary {
            count: moments.count(),
            mean,
            median: sketch.median()?,
            std,
            min: moments.min()?,
            max: moments.max()?,
            nonuniformity_percent: std.map(|s| 100.0 * s / mean),
            median_exact: sketch.is_exact(),
        })
    }
}

/// Why a statistical test gave no answer.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum StatsError {
    /// A group has too few values.
    TooFewValues {
        /// Which group (0-based).
        group: usize,
        /// Values it has.
        given: usize,
        /// Values needed.
        needed: usize,
    },
    /// Fewer groups than the test needs.
    TooFewGroups {
        /// Groups given.
        given: usize,
        /// Groups needed.
        needed: usize,
    },
    /// No group varies and the test statistic is undefined.
    NoSpread,
    /// A value is NaN or infinite, or the values are so large that a statistic of them
    /// overflows.
    NotFinite,
}

impl fmt::Display for StatsError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            StatsError::TooFewValues {
                group,
                given,
                needed,
            } => write!(
                f,
                "group {}: {given} value(s) given; the test needs at least {needed}",
                group + 1
            ),
            StatsError::TooFewGroups { given, needed } => write!(
                f,
                "{given} group(s) given; the test needs at least {needed}"
            ),
            StatsError::NoSpread => f.write_str(
                "all values are equal within each group; the test statistic is undefined",
            ),
            StatsError::NotFinite => f.write_str(
                "a value is not finite, or the values are too large for the test (their \
                 variance overflows); give finite values below about 1e150",
            ),
        }
    }
}

impl std::error::Error for StatsError {}

/// ln Gamma(x) for x > 0 (NaN otherwise).
///
/// # Formula
/// Lanczos: Gamma(x + 1) = sqrt(2 pi) (x + g + 1/2)^(x + 1/2) e^-(x + g + 1/2) A_g(x) with
/// g = 7 and the nine-term series A_g.
///
/// # Validity
/// x > 0; relative error of Gamma about 1e-15.
///
/// # References
/// Lanczos, SIAM J. Numer. Anal. B 1, 86 (1964); the g = 7, n = 9 coefficients of
/// P. Godfrey (2001), as widely tabulated (from memory; checked against `statrs` in the tests).
pub fn ln_gamma(x: f64) -> f64 {
    const G: f64 = 7.0;
    const COEFFICIENTS: [f64; 9] = [
        0.999_999_999_999_809_9,
        676.520_368_121_885_1,
        -1_259.139_216_722_402_8,
        771.323_428_777_653_1,
        -176.615_029_162_140_6,
        12.507_343_278_686_905,
        -0.138_571_095_265_720_12,
        9.984_369_578_019_572e-6,
        1.505_632_735_149_311_6e-7,
    ];
    if !(x > 0.0 && x.is_finite()) {
        return if x == f64::INFINITY { x } else { f64::NAN };
    }
    if x < 0.5 {
        // Gamma(x) = Gamma(1 + x) / x keeps the series in its accurate range; unlike the
        // reflection formula pi / sin(pi x) it does not overflow for a subnormal x.
        return ln_gamma(1.0 + x) - x.ln();
    }
    let z = x - 1.0;
    let mut series = COEFFICIENTS[0];
    for (i, c) in COEFFICIENTS.iter().enumerate().skip(1) {
        series += c / (z + i as f64);
    }
    let t = z + G + 0.5;
    0.5 * (2.0 * std::f64::consts::PI).ln() + (z + 0.5) * t.ln() - t + series.ln()
}

/// Regularized incomplete beta function I_x(a, b) for a, b > 0 and 0 <= x <= 1 (NaN outside).
///
/// # Formula
/// I_x(a, b) = x^a (1 - x)^b / (a B(a, b)) * 1/(1 + d1/(1 + d2/(1 + ...))), with
/// d_{2m+1} = -(a + m)(a + b + m) x / ((a + 2m)(a + 2m + 1)) and
/// d_{2m} = m (b - m) x / ((a + 2m - 1)(a + 2m)), evaluated by the modified Lentz method;
/// for x > (a + 1)/(a + b + 2) through I_x(a, b) = 1 - I_{1-x}(b, a), where the fraction
/// converges fast.
///
/// # References
/// Abramowitz & Stegun, Handbook of Mathematical Functions (1964), 26.5.8; Lentz, Appl. Opt.
/// 15, 668 (1976); Thompson & Barnett, J. Comput. Phys. 64, 490 (1986).
pub fn regularized_incomplete_beta(a: f64, b: f64, x: f64) -> f64 {
    if !(a > 0.0 && b > 0.0 && (0.0..=1.0).contains(&x) && a.is_finite() && b.is_finite()) {
        return f64::NAN;
    }
    if x == 0.0 || x == 1.0 {
        return x;
    }
    let ln_front = ln_gamma(a + b) - ln_gamma(a) - ln_gamma(b) + a * x.ln() + b * (1.0 - x).ln();
    if x < (a + 1.0) / (a + b + 2.0) {
        ln_front.exp() * beta_fraction(a, b, x) / a
    } else {
        1.0 - ln_front.exp() * beta_fraction(b, a, 1.0 - x) / b
    }
}

/// The continued fraction of A&S 26.5.8 by the modified Lentz method.
fn beta_fraction(a: f64, b: f64, x: f64) -> f64 {
    let tiny = |v: f64| if v.abs() < LENTZ_TINY { LENTZ_TINY } else { v };
    let mut c = 1.0;
    let mut d = 1.0 / tiny(1.0 - (a + b) * x / (a + 1.0));
    let mut h = d;
    for m in 1..MAX_ITERATIONS {
        let m = m as f64;
        let even = m * (b - m) * x / ((a + 2.0 * m - 1.0) * (a + 2.0 * m));
        d = 1.0 / tiny(1.0 + even * d);
        c = tiny(1.0 + even / c);
        h *= d * c;
        let odd = -(a + m) * (a + b + m) * x / ((a + 2.0 * m) * (a + 2.0 * m + 1.0));
        d = 1.0 / tiny(1.0 + odd * d);
        c = tiny(1.0 + odd / c);
        let step = d * c;
        h *= step;
        if (step - 1.0).abs() < SERIES_EPSILON {
            break;
        }
    }
    h
}

/// Upper regularized incomplete gamma function Q(a, x) = Gamma(a, x) / Gamma(a), for a > 0 and
/// x >= 0 (NaN otherwise).
///
/// # Formula
/// For x < a + 1 the series P(a, x) = e^-x x^a sum_n x^n / Gamma(a + n + 1) and Q = 1 - P;
/// otherwise Legendre's continued fraction for Q by the modified Lentz method.
///
/// # References
/// Abramowitz & Stegun (1964), 6.5.29 (series) and 6.5.31 (continued fraction).
pub fn regularized_gamma_q(a: f64, x: f64) -> f64 {
    if !(a > 0.0 && a.is_finite() && x >= 0.0) {
        return f64::NAN;
    }
    if x == 0.0 {
        return 1.0;
    }
    if x == f64::INFINITY {
        return 0.0;
    }
    let ln_front = a * x.ln() - x - ln_gamma(a);
    if x < a + 1.0 {
        // The series is summed times a (its first term 1/a overflows for a subnormal a) and the
        // factor 1/a goes into the exponent.
        let mut term = 1.0;
        let mut sum = term;
        let mut n = a;
        for _ in 0..MAX_ITERATIONS {
            n += 1.0;
            term *= x / n;
            sum += term;
            if term.abs() < sum.abs() * SERIES_EPSILON {
                break;
            }
        }
        1.0 - sum * (ln_front - a.ln()).exp()
    } else {
        let tiny = |v: f64| if v.abs() < LENTZ_TINY { LENTZ_TINY } else { v };
        let mut b = x + 1.0 - a;
        let mut c = 1.0 / LENTZ_TINY;
        let mut d = 1.0 / b;
        let mut h = d;
        for i in 1..MAX_ITERATIONS {
            let an = -(i as f64) * (i as f64 - a);
            b += 2.0;
            d = 1.0 / tiny(an * d + b);
            c = tiny(b + an / c);
            let step = d * c;
            h *= step;
            if (step - 1.0).abs() < SERIES_EPSILON {
                break;
            }
        }
        ln_front.exp() * h
    }
}

/// Cumulative distribution function of Student's t with `dof` > 0 degrees of freedom (not
/// necessarily an integer). NaN for a NaN argument or `dof` not > 0, and for a subnormal
/// `dof` (below 2.2e-308, where dof/2 underflows to 0).
///
/// # Formula
/// With x = dof / (dof + t^2): P(T <= t) = 1 - I_x(dof/2, 1/2)/2 for t > 0 and
/// I_x(dof/2, 1/2)/2 for t <= 0.
///
/// # References
/// Abramowitz & Stegun (1964), 26.7.1 and 26.5.27.
pub fn student_t_cdf(t: f64, dof: f64) -> f64 {
    if t.is_nan() || !is_positive(dof) {
        return f64::NAN;
    }
    if t.is_infinite() {
        return if t > 0.0 { 1.0 } else { 0.0 };
    }
    if dof > LARGE_DOF {
        return large_dof_cdf(t, dof);
    }
    let tail = 0.5 * regularized_incomplete_beta(0.5 * dof, 0.5, dof / (dof + t * t));
    if t > 0.0 { 1.0 - tail } else { tail }
}

/// Degrees of freedom above which Student's t is evaluated by its expansion about the normal
/// distribution. The exact formulas take the difference of ln Gamma at dof/2 and (dof + 1)/2,
/// which loses the digits of an ulp of ln Gamma(dof/2) (6e-11 at 1e5, all of them near 1e16,
/// NaN near 1e219); the expansion's first omitted term is of order dof^-3, below 1e-15 here.
const LARGE_DOF: f64 = 1e5;

/// Student's t cdf for dof > [`LARGE_DOF`]: F(t) = Phi(t) - phi(t) [(t^3 + t) / (4 dof) +
/// (5 t^5 + 16 t^3 + 3 t) / (96 dof^2)] (Abramowitz & Stegun 1964, 26.7.5), with Phi from
/// [`regularized_gamma_q`] (Phi(t) = 1 - Q(1/2, t^2/2)/2 for t >= 0, A&S 26.2.30 and 6.5.17).
fn large_dof_cdf(t: f64, dof: f64) -> f64 {
    let lower_normal_tail = 0.5 * regularized_gamma_q(0.5, 0.5 * t * t);
    let t2 = t * t;
    let phi = normal_pdf(t);
    // phi is 0 beyond |t| of about 38.6, before the powers of t can overflow.
    let correction = if phi == 0.0 {
        0.0
    } else {
        phi * ((t2 * t + t) / (4.0 * dof)
            + (5.0 * t2 * t2 * t + 16.0 * t2 * t + 3.0 * t) / (96.0 * dof * dof))
    };
    if t >= 0.0 {
        1.0 - lower_normal_tail - correction
    } else {
        lower_normal_tail - correction
    }
}

/// The standard normal density.
fn normal_pdf(t: f64) -> f64 {
    (-0.5 * t * t).exp() / (2.0 * std::f64::consts::PI).sqrt()
}

/// Two-sided p-value P(|T| >= |t|) of Student's t with `dof` degrees of freedom, computed
/// directly (not as 1 - cdf) so that small p-values keep their precision.
///
/// # Formula
/// p = I_x(dof/2, 1/2), x = dof / (dof + t^2).
///
/// # References
/// Abramowitz & Stegun (1964), 26.7.1 and 26.5.27.
pub fn student_t_two_sided_p(t: f64, dof: f64) -> f64 {
    if t.is_nan() || !is_positive(dof) {
        return f64::NAN;
    }
    if t.is_infinite() {
        return 0.0;
    }
    if dof > LARGE_DOF {
        return 2.0 * large_dof_cdf(-t.abs(), dof);
    }
    regularized_incomplete_beta(0.5 * dof, 0.5, dof / (dof + t * t))
}

/// Probability density of Student's t with `dof` > 0 degrees of freedom.
///
/// # Formula
/// f(t) = Gamma((dof + 1)/2) / (sqrt(dof pi) Gamma(dof/2)) (1 + t^2/dof)^(-(dof + 1)/2).
///
/// # References
/// Abramowitz & Stegun (1964), 26.7.1.
pub fn student_t_pdf(t: f64, dof: f64) -> f64 {
    if t.is_nan() || !is_positive(dof) {
        return f64::NAN;
    }
    if dof > LARGE_DOF {
        // The derivative of the expansion in `large_dof_cdf` to order 1/dof (A&S 26.7.5).
        let (t2, phi) = (t * t, normal_pdf(t));
        return if phi == 0.0 {
            0.0
        } else {
            phi * (1.0 + (t2 * t2 - 2.0 * t2 - 1.0) / (4.0 * dof))
        };
    }
    let ln_norm =
        ln_gamma(0.5 * (dof + 1.0)) - ln_gamma(0.5 * dof) - 0.5 * (dof * std::f64::consts::PI).ln();
    (ln_norm - 0.5 * (dof + 1.0) * (t * t / dof).ln_1p()).exp()
}

/// The t with P(T <= t) = `probability` for Student's t with `dof` degrees of freedom (NaN
/// unless 0 < probability < 1 and dof > 0).
///
/// # Formula
/// Newton's method on [`student_t_cdf`] with [`student_t_pdf`] as the derivative, kept inside
/// a bracket that bisection narrows whenever a Newton step would leave it.
pub fn student_t_quantile(probability: f64, dof: f64) -> f64 {
    if !(probability > 0.0 && probability < 1.0 && dof > 0.0) {
        return f64::NAN;
    }
    let mut low = -1.0;
    let mut high = 1.0;
    while student_t_cdf(low, dof) > probability {
        low *= 2.0;
    }
    while student_t_cdf(high, dof) < probability {
        high *= 2.0;
    }
    let mut t = 0.5 * (low + high);
    for _ in 0..MAX_QUANTILE_STEPS {
        let excess = student_t_cdf(t, dof) - probability;
        if excess == 0.0 {
            return t;
        }
        if excess < 0.0 {
            low = t;
        } else {
            high = t;
        }
        let mut next = t - excess / student_t_pdf(t, dof);
        if !(next > low && next < high) {
            next = 0.5 * (low + high);
        }
        let step = (next - t).abs();
        t = next;
        if step <= QUANTILE_TOLERANCE * t.abs().max(1.0) {
            break;
        }
    }
    t
}

/// Survival function P(X >= x) of the chi-square distribution with `dof` > 0 degrees of
/// freedom (NaN for a subnormal `dof`, below 2.2e-308, where dof/2 underflows to 0).
///
/// # Formula
/// Q(dof/2, x/2) ([`regularized_gamma_q`]); 1 for x <= 0.
///
/// # References
/// Abramowitz & Stegun (1964), 26.4.19.
pub fn chi_squared_survival(x: f64, dof: f64) -> f64 {
    if x.is_nan() || !is_positive(dof) {
        return f64::NAN;
    }
    if x <= 0.0 {
        return 1.0;
    }
    regularized_gamma_q(0.5 * dof, 0.5 * x)
}

/// Result of Welch's unequal-variance t-test of `b` against `a`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct WelchTest {
    /// mean(b) - mean(a).
    pub difference: f64,
    /// Standard error of the difference, sqrt(s_a^2/n_a + s_b^2/n_b).
    pub standard_error: f64,
    /// t = difference / standard_error.
    pub t: f64,
    /// Welch-Satterthwaite degrees of freedom.
    pub dof: f64,
    /// Two-sided p-value.
    pub p_value: f64,
    /// Lower end of the 95 % confidence interval of the difference.
    pub ci95_low: f64,
    /// Upper end of the 95 % confidence interval of the difference.
    pub ci95_high: f64,
}

/// Welch's t-test: do two groups have different means, without assuming equal variances?
///
/// # Formula
/// t = (mean_b - mean_a) / sqrt(s_a^2/n_a + s_b^2/n_b);
/// dof = (s_a^2/n_a + s_b^2/n_b)^2 / ((s_a^2/n_a)^2/(n_a - 1) + (s_b^2/n_b)^2/(n_b - 1));
/// p = P(|T_dof| >= |t|); 95 % interval: difference -/+ t_{0.975, dof} * standard error.
///
/// # References
/// Welch, Biometrika 34, 28 (1947); Satterthwaite, Biometrics Bull. 2, 110 (1946).
///
/// # Errors
/// [`StatsError::TooFewValues`] below two values in a group, [`StatsError::NoSpread`] when
/// both groups are constant, [`StatsError::NotFinite`].
pub fn welch_t_test(a: &[f64], b: &[f64]) -> Result<WelchTest, StatsError> {
    for (group, values) in [a, b].into_iter().enumerate() {
        if values.len() < 2 {
            return Err(StatsError::TooFewValues {
                group,
                given: values.len(),
                needed: 2,
            });
        }
        if values.iter().any(|v| !v.is_finite()) {
            return Err(StatsError::NotFinite);
        }
    }
    let (ma, mb) = (Moments::of(a), Moments::of(b));
    let va = ma.sample_std().unwrap_or(0.0).powi(2) / a.len() as f64;
    let vb = mb.sample_std().unwrap_or(0.0).powi(2) / b.len() as f64;
    let variance = va + vb;
    let difference = mb.mean().unwrap_or(0.0) - ma.mean().unwrap_or(0.0);
    if !(variance.is_finite() && difference.is_finite()) {
        return Err(StatsError::NotFinite);
    }
    if !is_positive(variance) {
        return Err(StatsError::NoSpread);
    }
    let standard_error = variance.sqrt();
    let t = difference / standard_error;
    // The Welch-Satterthwaite formula with each variance divided by their sum, so that no
    // square of a variance is formed (it overflows for values above about 1e77).
    let (wa, wb) = (va / variance, vb / variance);
    let dof = 1.0 / (wa * wa / (a.len() - 1) as f64 + wb * wb / (b.len() - 1) as f64);
    let half_width = student_t_quantile(0.975, dof) * standard_error;
    Ok(WelchTest {
        difference,
        standard_error,
        t,
        dof,
        p_value: student_t_two_sided_p(t, dof),
        ci95_low: difference - half_width,
        ci95_high: difference + half_width,
    })
}

/// Holm's step-down adjustment of the p-values of a family of tests, in the order given.
///
/// # Formula
/// With m tests and the p-values sorted ascending, p_(1) <= ... <= p_(m):
/// adjusted p_(i) = max over j <= i of min(1, (m - j + 1) p_(j)). Rejecting every hypothesis
/// whose adjusted p is below alpha keeps the family-wise error rate at most alpha, whatever the
/// dependence between the tests.
///
/// # Validity
/// Any family of valid p-values; a NaN p-value stays NaN and is ordered last (it rejects
/// nothing).
///
/// # References
/// Holm, Scand. J. Statist. 6, 65-70 (1979).
///
/// # Errors
/// None.
pub fn holm_adjusted(p_values: &[f64]) -> Vec<f64> {
    let m = p_values.len();
    let order = crate::order::sorted_positions(m, &|a, b| {
        let (pa, pb) = (p_values[a], p_values[b]);
        pa.is_nan().cmp(&pb.is_nan()).then(pa.total_cmp(&pb))
    });
    let mut adjusted = vec![f64::NAN; m];
    let mut running = 0.0_f64;
    for (rank, &index) in order.iter().enumerate() {
        let p = p_values[index];
        if p.is_nan() {
            continue;
        }
        running = running.max(((m - rank) as f64 * p).min(1.0));
        adjusted[index] = running;
    }
    adjusted
}

/// Result of the Kruskal-Wallis test.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct KruskalWallis {
    /// H statistic, corrected for ties.
    pub h: f64,
    /// Degrees of freedom: groups - 1.
    pub dof: f64,
    /// p-value from the chi-square approximation.
    pub p_value: f64,
    /// Number of groups.
    pub groups: usize,
    /// Number of values in all groups.
    pub values: usize,
}

/// Kruskal-Wallis rank test: do several groups come from the same distribution?
///
/// # Formula
/// Rank all N values together (ties get their average rank); R_i is the rank sum of group i
/// with n_i values. H = [12 / (N (N + 1)) sum R_i^2 / n_i - 3 (N + 1)] / C with the tie
/// correction C = 1 - sum (t^3 - t) / (N^3 - N) over groups of t tied values;
/// p = P(chi-square with k - 1 degrees of freedom >= H).
///
/// # Validity
/// The chi-square approximation wants about five or more values per group; with fewer the
/// p-value is approximate.
///
/// # References
/// Kruskal & Wallis, J. Am. Stat. Assoc. 47, 583 (1952).
///
/// # Errors
/// [`StatsError::TooFewGroups`] below two groups, [`StatsError::TooFewValues`] for an empty
/// group, [`StatsError::NoSpread`] when every value is equal, [`StatsError::NotFinite`].
pub fn kruskal_wallis(groups: &[&[f64]]) -> Result<KruskalWallis, StatsError> {
    if groups.len() < 2 {
        return Err(StatsError::TooFewGroups {
            given: groups.len(),
            needed: 2,
        });
    }
    let mut all: Vec<(f64, usize)> = Vec::new();
    for (group, values) in groups.iter().enumerate() {
        if values.is_empty() {
            return Err(StatsError::TooFewValues {
                group,
                given: 0,
                needed: 1,
            });
        }
        for &v in *values {
            if !v.is_finite() {
                return Err(StatsError::NotFinite);
            }
            all.push((v, group));
        }
    }
    crate::order::sort_by(&mut all, &|x, y| x.0.total_cmp(&y.0));
    let n = all.len() as f64;
    let mut rank_sums = vec![0.0; groups.len()];
    let mut tie_sum = 0.0;
    let mut start = 0;
    while start < all.len() {
        let mut end = start + 1;
        while end < all.len() && all[end].0 == all[start].0 {
            end += 1;
        }
        // Ranks start + 1 ..= end share their average.
        let average_rank = 0.5 * ((start + 1) + end) as f64;
        for &(_, group) in &all[start..end] {
            rank_sums[group] += average_rank;
        }
        let tied = (end - start) as f64;
        tie_sum += tied * tied * tied - tied;
        start = end;
    }
    let correction = 1.0 - tie_sum / (n * n * n - n);
    if !is_positive(correction) {
        return Err(StatsError::NoSpread);
    }
    let sum: f64 = rank_sums
        .iter()
        .zip(groups)
        .map(|(r, g)| r * r / g.len() as f64)
        .sum();
    let h = (12.0 / (n * (n + 1.0)) * sum - 3.0 * (n + 1.0)) / correction;
    // Rounding can leave a tiny negative H when all groups have the same mean rank.
    let h = h.max(0.0);
    let dof = (groups.len() - 1) as f64;
    Ok(KruskalWallis {
        h,
        dof,
        p_value: chi_squared_survival(h, dof),
        groups: groups.len(),
        values: all.len(),
    })
}

/// The lower quartile, median and upper quartile of `values` (any order; non-finite values
/// are left out), or `None` when no finite value is given. Used for the middle half of the
/// wafer means of a lot, a few hundred values at most: the values are copied and sorted.
///
/// # Formula
/// For sorted values x_1..x_n, Q(p) = x_j + g (x_{j+1} - x_j) with h = (n - 1) p,
/// j = floor(h) + 1 and g = h - floor(h): linear interpolation between order statistics
/// (definition 7 of Hyndman and Fan; the default of R, NumPy and Python's
/// `statistics.quantiles(method="inclusive")`).
///
/// # Validity
/// Exact for every n >= 1 (n = 1 gives the value three times).
///
/// # References
/// Hyndman and Fan, The American Statistician 50, 361 (1996), definition 7.
///
/// # Errors
/// None; `None` for no finite value.
pub fn quartiles(values: &[f64]) -> Option<(f64, f64, f64)> {
    let mut sorted: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
    if sorted.is_empty() {
        return None;
    }
    crate::order::sort_floats(&mut sorted);
    let at = |p: f64| {
        let h = (sorted.len() - 1) as f64 * p;
        let j = h.floor() as usize;
        let next = sorted[(j + 1).min(sorted.len() - 1)];
        sorted[j] + (h - h.floor()) * (next - sorted[j])
    };
    Some((at(0.25), at(0.5), at(0.75)))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn welch_refuses_values_whose_variance_overflows() {
        // Each value is finite, but their squares are not: the test has no finite answer.
        let huge = [0.0, 1e200];
        assert_eq!(welch_t_test(&[0.0, 1.0], &huge), Err(StatsError::NotFinite));
        let large = welch_t_test(&[0.0, 1.0], &[0.0, 1e150]).expect("finite variance");
        // One group dominates the variance: dof is that group's n - 1.
        assert_eq!(large.dof, 1.0);
        assert!(large.p_value.is_finite() && large.ci95_high.is_finite());
    }

    #[test]
    fn student_t_with_very_many_degrees_of_freedom_is_the_normal_distribution() {
        // Source: Abramowitz & Stegun (1964), Table 26.1: Phi(1) = 0.8413447461,
        // Phi(-3) = 0.0013498980 (1 - 0.9986501020); the t distribution tends to it as dof grows.
        for dof in [1e10, 1e15, 1e20, 1e219, 1e300] {
            assert!(
                (student_t_cdf(1.0, dof) - 0.841_344_746_1).abs() < 1e-9,
                "{dof:e}"
            );
            assert!(
                (student_t_cdf(-3.0, dof) - 0.001_349_898_0).abs() < 1e-9,
                "{dof:e}"
            );
            // Source: A&S Table 26.1, the 0.975 point of the normal distribution: 1.959964.
            assert!(
                (student_t_quantile(0.975, dof) - 1.959_964).abs() < 1e-6,
                "{dof:e}"
            );
            assert!(
                (student_t_two_sided_p(1.959_964, dof) - 0.05).abs() < 1e-6,
                "{dof:e}"
            );
        }
        // Far in the tails the density is 0 and the powers of t must not make it NaN.
        assert_eq!(student_t_cdf(9.2e153, 2.8e219), 1.0);
        assert_eq!(student_t_pdf(9.2e153, 2.8e219), 0.0);
        // Both sides of the switch agree to the precision of the exact formula there.
        for t in [-4.0, -1.0, 0.3, 2.5] {
            let below = student_t_cdf(t, LARGE_DOF);
            let above = student_t_cdf(t, LARGE_DOF * (1.0 + 1e-9));
            assert!((below - above).abs() < 1e-10, "t {t}: {below} {above}");
            let (p_below, p_above) = (
                student_t_pdf(t, LARGE_DOF),
                student_t_pdf(t, LARGE_DOF * (1.0 + 1e-9)),
            );
            assert!(
                (p_below - p_above).abs() < 1e-10,
                "pdf t {t}: {p_below} {p_above}"
            );
        }
    }

    #[test]
    fn ln_gamma_of_tiny_arguments_is_minus_ln_x() {
        // Gamma(x) -> 1/x as x -> 0 (A&S 6.1.34: 1/Gamma(x) = x + gamma x^2 + ...).
        for x in [5e-324, 1e-310, 1e-100] {
            let expected = -f64::ln(x);
            assert!((ln_gamma(x) - expected).abs() <= 1e-12 * expected, "{x:e}");
        }
        // Gamma(0.25) = 3.6256099082219083 (A&S Table 6.1, 4 Gamma(5/4)).
        assert!((ln_gamma(0.25) - 3.625_609_908_221_908_f64.ln()).abs() < 1e-14);
    }

    #[test]
    fn upper_gamma_takes_a_subnormal_shape() {
        // For small a and x, P(a, x) = x^a e^-x / Gamma(a + 1) (1 + O(x)) (A&S 6.5.29), so
        // Q = 1 - P is about -a ln x: 6.7e-322 here, 0 to double precision.
        let q = regularized_gamma_q(5e-324, 2.4e-59);
        assert!(q.abs() < 1e-300, "{q}");
        // The rewritten series gives the same value as before at ordinary arguments:
        // Q(1, x) = e^-x (A&S 6.5.2 with a = 1).
        assert!((regularized_gamma_q(1.0, 0.5) - (-0.5f64).exp()).abs() < 1e-15);
    }
}
