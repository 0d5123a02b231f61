//! Checks of the lot statistics against `statrs` (an independent general-purpose statistics
//! crate used only as a test oracle), closed forms worked by hand, published tables and SciPy.

use bandgauge_core::lots::stats::{
    EXACT_MEDIAN_LIMIT, MEDIAN_BIN_RELATIVE_WIDTH, MedianSketch, Moments, StatsError, Summary,
    chi_squared_survival, holm_adjusted, kruskal_wallis, ln_gamma, quartiles, regularized_gamma_q,
    regularized_incomplete_beta, student_t_cdf, student_t_pdf, student_t_quantile,
    student_t_two_sided_p, welch_t_test,
};
use bandgauge_core::lots::{
    ALL_PAIRS_LOT_LIMIT, LotBook, ReadOptions, SpecQuantity, SpecWindow, Verdict, read_str,
};
use statrs::distribution::{ChiSquared, ContinuousCDF, StudentsT};
use statrs::statistics::{Data, Distribution, Max, Median, Min};

/// Agreement with statrs: both sides are double-precision implementations of the same special
/// functions by different methods; 1e-12 relative leaves room for their rounding.
const ORACLE_RELATIVE: f64 = 1e-12;
/// Agreement with closed forms evaluated in f64.
const CLOSED_FORM_RELATIVE: f64 = 1e-13;
/// SciPy values are printed to 16-17 digits; the tests compare to 1e-10 relative.
const SCIPY_RELATIVE: f64 = 1e-10;
/// Published tables print 4 significant figures.
const TABLE_4_FIGURES: f64 = 5e-4;

fn close(actual: f64, expected: f64, relative: f64, what: &str) {
    let scale = expected.abs().max(f64::MIN_POSITIVE);
    assert!(
        (actual - expected).abs() <= relative * scale,
        "{what}: got {actual:e}, expected {expected:e} (relative {relative:e})"
    );
}

#[test]
fn ln_gamma_matches_factorials_and_statrs() {
    // Source: Gamma(n) = (n - 1)! and Gamma(1/2) = sqrt(pi), closed forms.
    close(
        ln_gamma(5.0),
        24f64.ln(),
        CLOSED_FORM_RELATIVE,
        "ln Gamma(5)",
    );
    close(
        ln_gamma(11.0),
        3_628_800f64.ln(),
        CLOSED_FORM_RELATIVE,
        "ln Gamma(11)",
    );
    close(
        ln_gamma(0.5),
        std::f64::consts::PI.sqrt().ln(),
        CLOSED_FORM_RELATIVE,
        "ln Gamma(1/2)",
    );
    for x in [0.1, 0.3, 0.7, 1.5, 2.5, 7.25, 33.0, 150.5, 1e4] {
        close(
            ln_gamma(x),
            statrs::function::gamma::ln_gamma(x),
            ORACLE_RELATIVE,
            &format!("ln Gamma({x})"),
        );
    }
    assert!(ln_gamma(0.0).is_nan() && ln_gamma(-1.0).is_nan() && ln_gamma(f64::NAN).is_nan());
}

#[test]
fn incomplete_beta_matches_closed_forms_and_statrs() {
    // Source: I_x(1, 1) = x and I_x(a, 1) = x^a (A&S 26.5.1 with B(a, 1) = 1/a), by hand.
    for x in [0.0, 0.1, 0.5, 0.9, 1.0] {
        close(
            regularized_incomplete_beta(1.0, 1.0, x),
            x,
            CLOSED_FORM_RELATIVE,
            "I_x(1,1)",
        );
        close(
            regularized_incomplete_beta(3.5, 1.0, x),
            x.powf(3.5),
            CLOSED_FORM_RELATIVE,
            "I_x(3.5,1)",
        );
    }
    for (a, b) in [
        (0.5, 0.5),
        (2.0, 3.0),
        (5.0, 0.5),
        (24.0, 0.5),
        (150.0, 0.5),
        (0.7, 12.0),
    ] {
        for x in [0.01, 0.2, 0.5, 0.77, 0.99] {
            close(
                regularized_incomplete_beta(a, b, x),
                statrs::function::beta::beta_reg(a, b, x),
                ORACLE_RELATIVE,
                &format!("I_{x}({a},{b})"),
            );
        }
    }
    assert!(regularized_incomplete_beta(-1.0, 1.0, 0.5).is_nan());
    assert!(regularized_incomplete_beta(1.0, 1.0, 1.5).is_nan());
}

#[test]
fn student_t_matches_closed_forms_table_and_statrs() {
    for t in [-30.0, -2.5, -0.3, 0.0, 0.4, 1.0, 3.0, 12.0] {
        // Source: dof 1 is the Cauchy distribution, F(t) = 1/2 + atan(t)/pi; dof 2 has
        // F(t) = 1/2 + t / (2 sqrt(2 + t^2)) (A&S 26.7.3 for small dof), by hand.
        let cauchy = 0.5 + f64::atan(t) / std::f64::consts::PI;
        close(
            student_t_cdf(t, 1.0),
            cauchy,
            CLOSED_FORM_RELATIVE,
            "t cdf dof 1",
        );
        let two = 0.5 + t / (2.0 * (2.0 + t * t).sqrt());
        close(
            student_t_cdf(t, 2.0),
            two,
            CLOSED_FORM_RELATIVE,
            "t cdf dof 2",
        );
        for dof in [1.5, 3.0, 4.41, 10.0, 47.3, 400.0] {
            let oracle = StudentsT::new(0.0, 1.0, dof).expect("valid");
            close(
                student_t_cdf(t, dof),
                oracle.cdf(t),
                ORACLE_RELATIVE,
                &format!("t cdf {t} dof {dof}"),
            );
            close(
                student_t_two_sided_p(t, dof),
                2.0 * oracle.cdf(-t.abs()),
                ORACLE_RELATIVE,
                &format!("two-sided p {t} dof {dof}"),
            );
        }
    }
    for (t, dof) in [
        (0.0, 1.0),
        (1.3, 2.0),
        (-2.2, 4.41),
        (5.0, 30.0),
        (0.7, 1e4),
    ] {
        close(
            student_t_pdf(t, dof),
            statrs::distribution::Continuous::pdf(&StudentsT::new(0.0, 1.0, dof).unwrap(), t),
            ORACLE_RELATIVE,
            &format!("t pdf {t} dof {dof}"),
        );
    }
    // Source: Abramowitz & Stegun, Handbook of Mathematical Functions (1964), Table 26.10:
    // t(0.975) = 2.228 for 10 degrees of freedom, 2.042 for 30, 12.706 for 1.
    close(
        student_t_quantile(0.975, 10.0),
        2.228,
        TABLE_4_FIGURES,
        "t 0.975 dof 10",
    );
    close(
        student_t_quantile(0.975, 30.0),
        2.042,
        TABLE_4_FIGURES,
        "t 0.975 dof 30",
    );
    close(
        student_t_quantile(0.975, 1.0),
        12.706,
        TABLE_4_FIGURES,
        "t 0.975 dof 1",
    );
    // Source: SciPy 1.17.1, scipy.stats.t.ppf(0.975, 4.411764705882353) = 2.677173578465619.
    close(
        student_t_quantile(0.975, 4.411_764_705_882_353),
        2.677_173_578_465_619,
        SCIPY_RELATIVE,
        "t 0.975 dof 4.41",
    );
    // Small p-values keep their precision (no 1 - cdf cancellation).
    let tiny = student_t_two_sided_p(40.0, 20.0);
    close(
        tiny,
        2.0 * StudentsT::new(0.0, 1.0, 20.0).unwrap().cdf(-40.0),
        1e-10,
        "tiny p",
    );
    assert!(tiny > 0.0 && tiny < 1e-19);
    assert!(student_t_cdf(f64::NAN, 3.0).is_nan() && student_t_cdf(1.0, 0.0).is_nan());
}

#[test]
fn chi_squared_matches_closed_form_table_and_statrs() {
    for x in [0.01, 0.5, 2.0, 7.2, 30.0] {
        // Source: for 2 degrees of freedom the chi-square survival is exp(-x/2), by hand.
        close(
            chi_squared_survival(x, 2.0),
            (-x / 2.0).exp(),
            CLOSED_FORM_RELATIVE,
            "chi2 k=2",
        );
        for k in [1.0, 3.0, 4.0, 9.0, 24.0] {
            let oracle = ChiSquared::new(k).expect("valid");
            close(
                chi_squared_survival(x, k),
                oracle.sf(x),
                ORACLE_RELATIVE,
                &format!("chi2 sf {x} k {k}"),
            );
        }
    }
    // Source: Abramowitz & Stegun (1964), Table 26.8: the 0.05 point of chi-square with 2
    // degrees of freedom is 5.991; with 4 it is 9.488.
    close(
        chi_squared_survival(5.991, 2.0),
        0.05,
        1e-3,
        "chi2 5%, 2 dof",
    );
    close(
        chi_squared_survival(9.488, 4.0),
        0.05,
        1e-3,
        "chi2 5%, 4 dof",
    );
    for (a, x) in [(0.5, 0.1), (3.0, 1.0), (3.0, 9.0), (50.0, 45.0)] {
        close(
            regularized_gamma_q(a, x),
            statrs::function::gamma::gamma_ur(a, x),
            ORACLE_RELATIVE,
            &format!("Q({a},{x})"),
        );
    }
}

#[test]
fn moments_and_summary_match_statrs() {
    let values = [9.81, 10.02, 10.4, 9.95, 10.11, 9.7, 10.25, 10.05, 9.9];
    let moments = Moments::of(&values);
    let mut sketch = MedianSketch::new();
    values.iter().for_each(|v| sketch.push(*v));
    let summary = Summary::from_parts(&moments, &sketch).expect("values given");
    let data = Data::new(values.to_vec());
    close(summary.mean, data.mean().unwrap(), ORACLE_RELATIVE, "mean");
    close(
        summary.std.unwrap(),
        data.std_dev().unwrap(),
        1e-12,
        "sample std",
    );
    close(summary.median, data.median(), 0.0, "median (odd count)");
    assert_eq!(summary.min, data.min());
    assert_eq!(summary.max, data.max());
    close(
        summary.nonuniformity_percent.unwrap(),
        100.0 * data.std_dev().unwrap() / data.mean().unwrap(),
        1e-12,
        "non-uniformity",
    );
    // Source: by hand, values 1, 2, 3, 4: mean 2.5, sample variance 5/3, median 2.5.
    let moments = Moments::of(&[4.0, 1.0, 3.0, 2.0]);
    let mut sketch = MedianSketch::new();
    [4.0, 1.0, 3.0, 2.0].iter().for_each(|v| sketch.push(*v));
    let summary = Summary::from_parts(&moments, &sketch).unwrap();
    close(summary.mean, 2.5, CLOSED_FORM_RELATIVE, "mean 1..4");
    close(
        summary.std.unwrap(),
        (5.0f64 / 3.0).sqrt(),
        CLOSED_FORM_RELATIVE,
        "std 1..4",
    );
    assert_eq!(summary.median, 2.5);
    // One value: no standard deviation, no non-uniformity.
    let single = Summary::from_parts(&Moments::of(&[7.0]), &{
        let mut s = MedianSketch::new();
        s.push(7.0);
        s
    })
    .unwrap();
    assert_eq!((single.std, single.nonuniformity_percent), (None, None));
    assert!(Summary::from_parts(&Moments::new(), &MedianSketch::new()).is_none());
}

#[test]
fn welford_stays_accurate_for_large_offsets() {
    // Source: by hand, 1e9 + {4, 7, 13, 16} has mean 1e9 + 10 and sample variance 30 (the
    // classic cancellation example for the naive sum-of-squares formula).
    let moments = Moments::of(&[1e9 + 4.0, 1e9 + 7.0, 1e9 + 13.0, 1e9 + 16.0]);
    close(moments.mean().unwrap(), 1e9 + 10.0, 1e-15, "mean");
    close(moments.sample_std().unwrap(), 30f64.sqrt(), 1e-9, "std");
}

#[test]
fn median_sketch_is_exact_up_to_the_limit_and_close_beyond() {
    let mut values = Vec::new();
    let mut state = 12345u64;
    for _ in 0..(3 * EXACT_MEDIAN_LIMIT + 1) {
        state = state
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1);
        values.push(10.0 * (1.0 + 0.05 * ((state >> 11) as f64 / (1u64 << 53) as f64 - 0.5)));
    }
    let mut sketch = MedianSketch::new();
    for (i, v) in values.iter().enumerate() {
        sketch.push(*v);
        if i + 1 == EXACT_MEDIAN_LIMIT {
            assert!(sketch.is_exact());
            let exact = Data::new(values[..=i].to_vec()).median();
            assert_eq!(sketch.median(), Some(exact));
        }
    }
    assert!(!sketch.is_exact());
    let exact = Data::new(values.clone()).median();
    let got = sketch.median().unwrap();
    // Half a bin in ln(value) is the most a bin centre can be off.
    close(
        got,
        exact,
        MEDIAN_BIN_RELATIVE_WIDTH / 2.0 + 1e-12,
        "binned median",
    );
    // Merging exact sketches stays exact.
    let mut a = MedianSketch::new();
    let mut b = MedianSketch::new();
    [1.0, 5.0, 3.0].iter().for_each(|v| a.push(*v));
    [2.0, 4.0].iter().for_each(|v| b.push(*v));
    let merged = MedianSketch::merged([&a, &b]);
    assert_eq!((merged.median(), merged.is_exact()), (Some(3.0), true));
    assert_eq!(merged.count_where(|v| v > 3.5), 2);
}

#[test]
fn welch_matches_hand_work_and_scipy() {
    // Source: by hand, a = 1, 2, 3, 4 and b = 2, 4, 6, 8: means 2.5 and 5, variances 5/3 and
    // 20/3; s^2/n = 5/12 and 20/12; t = 2.5 / sqrt(25/12) = sqrt(3);
    // dof = (25/12)^2 / ((5/12)^2/3 + (20/12)^2/3) = 75/17 = 4.41176...
    let test = welch_t_test(&[1.0, 2.0, 3.0, 4.0], &[2.0, 4.0, 6.0, 8.0]).unwrap();
    close(test.t, 3f64.sqrt(), CLOSED_FORM_RELATIVE, "t");
    close(test.dof, 75.0 / 17.0, CLOSED_FORM_RELATIVE, "dof");
    close(test.difference, 2.5, CLOSED_FORM_RELATIVE, "difference");
    // Source: SciPy 1.17.1, scipy.stats.ttest_ind([2,4,6,8], [1,2,3,4], equal_var=False):
    // statistic 1.7320508075688774, p 0.15158050484530375.
    close(test.p_value, 0.151_580_504_845_303_75, SCIPY_RELATIVE, "p");
    // The same p from statrs' Student t.
    let oracle = StudentsT::new(0.0, 1.0, 75.0 / 17.0).unwrap();
    close(
        test.p_value,
        2.0 * oracle.cdf(-3f64.sqrt()),
        ORACLE_RELATIVE,
        "p vs statrs",
    );
    // 95 % interval: difference -/+ t(0.975, dof) se, t from SciPy (above).
    let half = 2.677_173_578_465_619 * (25.0f64 / 12.0).sqrt();
    close(test.ci95_low, 2.5 - half, 1e-9, "ci low");
    close(test.ci95_high, 2.5 + half, 1e-9, "ci high");

    // Source: SciPy 1.17.1, ttest_ind(ln b, ln a, equal_var=False) for the lot-like values
    // below: statistic 6.677074117378237, p 0.00021095565972716906, df 7.484395548294289.
    let a: Vec<f64> = [1.02e15, 1.05e15, 0.99e15, 1.01e15, 1.03e15]
        .map(f64::ln)
        .to_vec();
    let b: Vec<f64> = [1.10e15, 1.12e15, 1.08e15, 1.13e15, 1.09e15, 1.11e15]
        .map(f64::ln)
        .to_vec();
    let test = welch_t_test(&a, &b).unwrap();
    close(test.t, 6.677_074_117_378_237, SCIPY_RELATIVE, "lot t");
    close(test.dof, 7.484_395_548_294_289, SCIPY_RELATIVE, "lot dof");
    close(
        test.p_value,
        0.000_210_955_659_727_169_06,
        SCIPY_RELATIVE,
        "lot p",
    );

    assert!(matches!(
        welch_t_test(&[1.0], &[1.0, 2.0]),
        Err(StatsError::TooFewValues { group: 0, .. })
    ));
    assert_eq!(
        welch_t_test(&[1.0, 1.0], &[2.0, 2.0]),
        Err(StatsError::NoSpread)
    );
    assert_eq!(
        welch_t_test(&[1.0, f64::NAN], &[2.0, 3.0]),
        Err(StatsError::NotFinite)
    );
}

#[test]
fn kruskal_wallis_matches_hand_work_and_scipy() {
    // Source: by hand, groups {1,2,3}, {4,5,6}, {7,8,9}: ranks equal the values, rank sums 6,
    // 15, 24; H = 12/(9 x 10) (36/3 + 225/3 + 576/3) - 3 x 10 = 7.2; with 2 degrees of freedom
    // p = exp(-7.2/2) = 0.0273237...
    let test = kruskal_wallis(&[&[1.0, 2.0, 3.0], &[4.0, 5.0, 6.0], &[7.0, 8.0, 9.0]]).unwrap();
    close(test.h, 7.2, CLOSED_FORM_RELATIVE, "H");
    close(test.p_value, (-3.6f64).exp(), 1e-12, "p");
    assert_eq!((test.groups, test.values, test.dof), (3, 9, 2.0));
    // Source: SciPy 1.17.1, scipy.stats.kruskal([1,2,2,3], [2,3,4,4,5], [5,6,6,7]) with ties:
    // statistic 9.264606741573035, p 0.009732316132360391.
    let test = kruskal_wallis(&[
        &[1.0, 2.0, 2.0, 3.0],
        &[2.0, 3.0, 4.0, 4.0, 5.0],
        &[5.0, 6.0, 6.0, 7.0],
    ])
    .unwrap();
    close(test.h, 9.264_606_741_573_035, SCIPY_RELATIVE, "H with ties");
    close(
        test.p_value,
        0.009_732_316_132_360_391,
        SCIPY_RELATIVE,
        "p with ties",
    );
    assert!(matches!(
        kruskal_wallis(&[&[1.0]]),
        Err(StatsError::TooFewGroups { .. })
    ));
    assert_eq!(
        kruskal_wallis(&[&[2.0, 2.0], &[2.0]]),
        Err(StatsError::NoSpread)
    );
}

#[test]
fn spec_windows_parse_judge_and_give_cpk() {
    let window = SpecWindow::parse(SpecQuantity::Resistivity, "8:12").unwrap();
    assert_eq!((window.min(), window.max()), (Some(8.0), Some(12.0)));
    let milli = SpecWindow::parse(SpecQuantity::Resistivity, "800 mohm-cm:1.2").unwrap();
    assert_eq!((milli.min(), milli.max()), (Some(0.8), Some(1.2)));
    let upper = SpecWindow::parse(SpecQuantity::Density, ":2e15").unwrap();
    assert_eq!((upper.min(), upper.max()), (None, Some(2e15)));
    for bad in ["", "8", "8:12:14", "12:8", "a:12", ":", "-1:5", "8 in:12"] {
        assert!(
            SpecWindow::parse(SpecQuantity::Resistivity, bad).is_err(),
            "{bad:?} was accepted"
        );
    }
    // Source: by hand against 8..12: 10 +/- 1 % lies inside; both limits are 2 away and the
    // lower one, listed first, is reported: margin 2, 25 % of 8.
    let pass = window.judge(10.0, 9.9, 10.1);
    assert_eq!(pass.verdict, Verdict::Pass);
    assert_eq!(pass.margin, 2.0);
    assert_eq!((pass.nearer_limit, pass.margin_percent), (8.0, 25.0));
    // 11.9 with +/- 2 % straddles 12: marginal, margin 0.1.
    let marginal = window.judge(11.9, 11.9 * 0.98, 11.9 * 1.02);
    assert_eq!(marginal.verdict, Verdict::Marginal);
    close(marginal.margin, 0.1, 1e-12, "margin");
    close(
        marginal.margin_percent,
        100.0 * 0.1 / 12.0,
        1e-12,
        "margin %",
    );
    assert_eq!(marginal.nearer_limit, 12.0);
    // 12.1 outside, its interval reaching back inside: still marginal; 13 +/- 1 %: fail.
    assert_eq!(window.judge(12.1, 11.9, 12.3).verdict, Verdict::Marginal);
    let fail = window.judge(13.0, 12.87, 13.13);
    assert_eq!(fail.verdict, Verdict::Fail);
    assert_eq!(fail.margin, -1.0);
    // Without an interval a value on the limit passes (limits are included).
    assert_eq!(window.judge(12.0, 12.0, 12.0).verdict, Verdict::Pass);
    // Source: Cpk = min(USL - mean, mean - LSL) / (3 s), common practice; by hand, mean 10.5,
    // s 0.25 in 8..12: min(1.5, 2.5) / 0.75 = 2.
    close(
        window.cpk(10.5, 0.25).unwrap(),
        2.0,
        CLOSED_FORM_RELATIVE,
        "Cpk",
    );
    close(
        upper.cpk(1.5e15, 1e14).unwrap(),
        5e14 / 3e14,
        CLOSED_FORM_RELATIVE,
        "one-sided Cpk",
    );
    assert_eq!(window.cpk(10.0, 0.0), None);
}

/// Reads `text` into a fresh book with boron as the default dopant.
fn book_of(text: &str) -> LotBook {
    let mut book = LotBook::new();
    let options = ReadOptions {
        default_dopant: Some("B".to_owned()),
    };
    read_str(text, &options, &mut book, &mut |_| {}).expect("test file reads");
    book
}

#[test]
fn report_statistics_match_statrs_on_the_same_sites() {
    let lot_a = [
        [10.1, 10.3, 9.9, 10.0],
        [10.4, 10.2, 10.6, 10.5],
        [9.8, 9.7, 10.0, 9.9],
    ];
    let lot_b = [
        [9.2, 9.1, 9.3, 9.4],
        [9.0, 9.2, 9.1, 8.9],
        [9.3, 9.5, 9.4, 9.2],
    ];
    let mut text = String::from("lot,wafer,site,resistivity [ohm-cm],uncertainty [%]\n");
    for (lot, wafers) in [("A", &lot_a), ("B", &lot_b)] {
        for (w, sites) in wafers.iter().enumerate() {
            for (s, rho) in sites.iter().enumerate() {
                text.push_str(&format!("{lot},{},{},{rho},1\n", w + 1, s + 1));
            }
        }
    }
    let book = book_of(&text);
    let window = SpecWindow::parse(SpecQuantity::Resistivity, "9.5:11").unwrap();
    let report = book.report(Some(&window));
    assert_eq!(report.lots.len(), 2);
    for (summary, wafers) in report.lots.iter().zip([&lot_a, &lot_b]) {
        let all: Vec<f64> = wafers.iter().flatten().copied().collect();
        let data = Data::new(all.clone());
        let r = &summary.resistivity_ohm_cm;
        close(r.mean, data.mean().unwrap(), 1e-13, "lot mean");
        close(r.std.unwrap(), data.std_dev().unwrap(), 1e-12, "lot std");
        close(r.median, data.median(), 0.0, "lot median");
        assert_eq!((r.min, r.max, r.count), (data.min(), data.max(), 12));
        for (wafer, sites) in summary.wafer_results.iter().zip(wafers.iter()) {
            let data = Data::new(sites.to_vec());
            close(
                wafer.resistivity_ohm_cm.mean,
                data.mean().unwrap(),
                1e-13,
                "wafer mean",
            );
            close(
                wafer.resistivity_ohm_cm.median,
                data.median(),
                0.0,
                "wafer median",
            );
        }
        // Cpk over the lot's sites in the window's quantity.
        let (mean, s) = (data.mean().unwrap(), data.std_dev().unwrap());
        let expected = (11.0 - mean).min(mean - 9.5) / (3.0 * s);
        close(summary.cpk.unwrap(), expected, 1e-12, "Cpk");
    }
    // Lot A's wafers average 10.075, 10.425 and 9.85 ohm cm: all inside 9.5..11 with 1 %.
    assert_eq!(report.lots[0].verdict, Some(Verdict::Pass));
    // Lot B's wafers average 9.25, 9.05, 9.35: the whole lot is below 9.5 beyond 1 %.
    assert_eq!(report.lots[1].verdict, Some(Verdict::Fail));
    assert_eq!(report.lots[1].worst_wafer.as_deref(), Some("2"));
    // The lot-to-lot test is Welch's t-test on ln of the wafer mean densities.
    let ln_means = |lot: usize| -> Vec<f64> {
        report.lots[lot]
            .wafer_results
            .iter()
            .map(|w| w.density_cm3.mean.ln())
            .collect()
    };
    let expected = welch_t_test(&ln_means(0), &ln_means(1)).unwrap();
    let difference = &report.differences[0];
    assert_eq!(
        (difference.lot_a.as_str(), difference.lot_b.as_str()),
        ("A", "B")
    );
    close(difference.test.p_value, expected.p_value, 1e-12, "lot p");
    assert!(
        difference.significant && difference.percent > 0.0,
        "B is doped heavier"
    );
    assert!(report.kruskal_wallis.is_none(), "two lots: Welch only");
    assert_eq!(report.counts.read, 24);
}

#[test]
fn density_windows_include_the_model_spread() {
    let text = "lot,wafer,resistivity\nA,1,10\nA,1,10.2\nA,2,9.9\nA,2,10.1\n";
    let book = book_of(text);
    let report = book.report(None);
    let n = report.lots[0].density_cm3.mean;
    // A window just below the mean density: without a model part the mean fails; the physics
    // models of the comparison differ from the empirical relation by about 1 % at 10 ohm cm
    // (boron), so the interval must be wider than the value itself.
    let window = SpecWindow::new(SpecQuantity::Density, None, Some(n * 0.999)).unwrap();
    let judged = book.report(Some(&window));
    let wafer = judged.lots[0].wafer_results[0].judgement.unwrap();
    assert!(
        wafer.low < wafer.value,
        "model spread widens the interval: {wafer:?}"
    );
    assert_ne!(judged.lots[0].verdict, Some(Verdict::Pass));
}

#[test]
fn many_lots_are_compared_with_the_first_and_few_lots_pairwise() {
    let file = |lots: usize| {
        let mut text = String::from("lot,wafer,resistivity\n");
        for lot in 0..lots {
            for wafer in 0..3 {
                let rho = 10.0 + lot as f64 * 0.1 + wafer as f64 * 0.05;
                text.push_str(&format!("L{lot},{wafer},{rho}\n"));
            }
        }
        text
    };
    let few = book_of(&file(4)).report(None);
    assert_eq!(few.differences.len(), 6, "4 lots: every pair");
    assert!(
        few.kruskal_wallis.is_some(),
        "3 or more lots: Kruskal-Wallis"
    );
    let lots = ALL_PAIRS_LOT_LIMIT + 2;
    let many = book_of(&file(lots)).report(None);
    assert_eq!(many.differences.len(), lots - 1, "each against the first");
    assert!(many.differences.iter().all(|d| d.lot_a == "L0"));
    // One-wafer lots are left out, with a note.
    let single = book_of("lot,wafer,resistivity\nA,1,10\nA,2,10.1\nB,1,9\n").report(None);
    assert!(single.differences.is_empty());
    assert!(
        single.notes.iter().any(|n| n.contains("one wafer")),
        "{:?}",
        single.notes
    );
}

/// statsmodels prints its adjusted p-values to 16-17 digits; the Welch p-values behind them
/// agree with SciPy to 1e-10 (above), so the comparison allows the same.
const STATSMODELS_RELATIVE: f64 = 1e-10;

#[test]
fn holm_adjustment_matches_statsmodels() {
    // Source: statsmodels 0.15.0, multipletests(p, method="holm") (core/tests/data/
    // gen_holm_reference.py): [0.009, 0.04, 0.03, 0.005, 0.04, 0.5] gives
    // [0.045, 0.12, 0.12, 0.03, 0.12, 0.5] (ties share the step-down maximum; the order given
    // is kept). Formula: Holm, Scand. J. Statist. 6, 65-70 (1979).
    let adjusted = holm_adjusted(&[0.009, 0.04, 0.03, 0.005, 0.04, 0.5]);
    for (got, expected) in adjusted.iter().zip([0.045, 0.12, 0.12, 0.03, 0.12, 0.5]) {
        close(*got, expected, CLOSED_FORM_RELATIVE, "holm");
    }
    assert_eq!(adjusted.len(), 6);
    // The cap at 1 and the empty family.
    assert_eq!(holm_adjusted(&[0.6, 0.7]), vec![1.0, 1.0]);
    assert!(holm_adjusted(&[]).is_empty());
    // A NaN stays NaN and does not lower the others' adjustment.
    let with_nan = holm_adjusted(&[0.01, f64::NAN]);
    close(with_nan[0], 0.02, CLOSED_FORM_RELATIVE, "holm with NaN");
    assert!(with_nan[1].is_nan());

    // Source: statsmodels 0.15.0 (same script): Welch's t-test (ttest_ind, usevar="unequal")
    // on ln density for every pair of four invented lots, then multipletests(method="holm").
    let lot = |values: &[f64]| values.iter().map(|v| v.ln()).collect::<Vec<f64>>();
    let lots = [
        lot(&[1.02e15, 1.05e15, 0.99e15, 1.01e15, 1.03e15]),
        lot(&[1.04e15, 1.00e15, 1.06e15, 1.02e15]),
        lot(&[1.10e15, 1.12e15, 1.08e15, 1.13e15, 1.09e15, 1.11e15]),
        lot(&[1.01e15, 1.09e15, 0.97e15, 1.06e15, 1.03e15]),
    ];
    let mut raw = Vec::new();
    for i in 0..4 {
        for j in i + 1..4 {
            raw.push(welch_t_test(&lots[i], &lots[j]).unwrap().p_value);
        }
    }
    // (raw, adjusted) for a-b, a-c, a-d, b-c, b-d, c-d.
    let expected = [
        (0.563_813_141_999_308_4, 1.0),
        (0.000_210_955_659_727_169_06, 0.001_265_733_958_363_014_4),
        (0.637_035_100_210_106, 1.0),
        (0.004_830_130_130_625_148, 0.024_150_650_653_125_74),
        (0.955_296_218_326_263_7, 1.0),
        (0.022_739_069_985_842_287, 0.090_956_279_943_369_15),
    ];
    let adjusted = holm_adjusted(&raw);
    for ((p, q), (p_expected, q_expected)) in raw.iter().zip(&adjusted).zip(expected) {
        close(*p, p_expected, STATSMODELS_RELATIVE, "welch p");
        close(*q, q_expected, STATSMODELS_RELATIVE, "holm p");
    }
    // c-d is below 0.05 raw but not after the adjustment: the case the correction is for.
    assert!(raw[5] < 0.05 && adjusted[5] >= 0.05);
}

#[test]
fn lot_pairs_are_called_significant_on_the_holm_adjusted_p() {
    // Four lots, three wafers each; lot C is doped about 12 % heavier (lower resistivity).
    let mut text = String::from("lot,wafer,resistivity,dopant\n");
    let wafers: [(&str, [f64; 3]); 4] = [
        ("A", [10.0, 10.3, 9.8]),
        ("B", [10.1, 9.9, 10.4]),
        ("C", [8.9, 9.0, 8.85]),
        ("D", [10.2, 9.7, 10.0]),
    ];
    for (lot, means) in wafers {
        for (w, mean) in means.iter().enumerate() {
            for offset in [-0.05, 0.0, 0.05] {
                text.push_str(&format!("{lot},{w},{},B\n", mean + offset));
            }
        }
    }
    let report = book_of(&text).report(None);
    assert_eq!(report.differences.len(), 6, "every pair of four lots");
    // Second implementation of the step-down rule (Holm 1979), on the report's raw p-values.
    let raw: Vec<f64> = report.differences.iter().map(|d| d.test.p_value).collect();
    let mut order: Vec<usize> = (0..raw.len()).collect();
    order.sort_by(|a, b| raw[*a].total_cmp(&raw[*b]));
    let mut floor = 0.0_f64;
    for (k, &i) in order.iter().enumerate() {
        floor = floor.max(((6 - k) as f64 * raw[i]).min(1.0));
        let d = &report.differences[i];
        close(d.p_adjusted, floor, CLOSED_FORM_RELATIVE, "adjusted p");
        assert!(d.p_adjusted >= d.test.p_value);
        assert_eq!(
            d.significant,
            d.p_adjusted < 0.05,
            "{} vs {}",
            d.lot_a,
            d.lot_b
        );
    }
    let with_c = |d: &&bandgauge_core::lots::LotDifference| d.lot_a == "C" || d.lot_b == "C";
    assert!(
        report
            .differences
            .iter()
            .filter(with_c)
            .all(|d| d.significant)
    );
    assert!(
        report
            .differences
            .iter()
            .filter(|d| !with_c(d))
            .all(|d| !d.significant)
    );
}

#[test]
fn quartiles_follow_the_inclusive_linear_definition() {
    // Source: Python 3.11.7 statistics.quantiles(data, n=4, method="inclusive") (definition 7 of
    // Hyndman and Fan, The American Statistician 50, 361 (1996)), run here.
    let cases: [(&[f64], [f64; 3]); 3] = [
        (&[7.0, 1.0, 3.0, 2.0, 5.0], [2.0, 3.0, 5.0]),
        (
            &[10.2, 9.8, 10.5, 10.1],
            [10.024999999999999, 10.149999999999999, 10.274999999999999],
        ),
        (&[4.0], [4.0, 4.0, 4.0]),
    ];
    for (values, expected) in cases {
        let (q1, q2, q3) = quartiles(values).expect("finite values");
        for (got, want) in [q1, q2, q3].into_iter().zip(expected) {
            close(
                got,
                want,
                CLOSED_FORM_RELATIVE,
                &format!("quartiles of {values:?}"),
            );
        }
    }
    // Non-finite values are left out; nothing finite gives no quartiles.
    assert_eq!(
        quartiles(&[f64::NAN, 2.0, f64::INFINITY]),
        Some((2.0, 2.0, 2.0))
    );
    assert_eq!(quartiles(&[f64::NAN]), None);
    assert_eq!(quartiles(&[]), None);
}
