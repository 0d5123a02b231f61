//! Van der Pauw and Hall analysis against sources outside the project: the symmetric case, the
//! correction factor f(R_A/R_B) from an independent mpmath solution of van der Pauw's eq. (5),
//! round trips R_s -> (R_A, R_B) -> R_s, a textbook Hall example, and the cross-check closing
//! the loop with the physics conversion.

// The reference values are written with every digit the generating script printed.
#![allow(clippy::excessive_precision)]

use std::f64::consts::{LN_2, PI};

use approx::assert_relative_eq;
use bandgauge_core::hall::{
    self, HallReading, HallVoltage, MeasuredHall, MeasuredStructure, ScatteringFactor,
};
use bandgauge_core::materials;
use bandgauge_core::mobility::{ConductivityType, MobilityModel};
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::resistivity::{self, PhysicsOptions};
use bandgauge_core::uncertainty::Measured;
use bandgauge_core::vdp::{self, RESIDUAL_LIMIT};
use proptest::prelude::*;

/// The mpmath values carry 20 digits; the solver stops at a relative width of about 1e-15 in
/// R_s, so 1e-13 leaves room for rounding in f.
const MPMATH_TOLERANCE: f64 = 1e-13;

/// Round trips R_s -> (R_A, R_B) -> R_s (the issue asks for 1e-12).
const ROUND_TRIP_TOLERANCE: f64 = 1e-12;

/// The textbook uses q = 1.6e-19 C; bandgauge uses 1.602176634e-19 C (SI 2019): 0.14 %.
const TEXTBOOK_CHARGE_TOLERANCE: f64 = 1.5e-3;

#[test]
fn symmetric_structure_gives_pi_over_ln2() {
    // Source: van der Pauw, Philips Res. Rep. 13, 1 (1958), eq. (4): R_s = pi R / ln 2 for
    // R_A = R_B = R; pi/ln 2 = 4.5323601418271938096 (mpmath 1.4.1, gen_vdp_reference.py).
    for r in [1e-3, 1.0, 10.2, 4.7e5] {
        let s = vdp::solve(r, r).unwrap();
        assert_relative_eq!(
            s.sheet_resistance_ohm_sq,
            4.532_360_141_827_193_8 * r,
            max_relative = MPMATH_TOLERANCE
        );
        assert_relative_eq!(
            s.sheet_resistance_ohm_sq,
            PI * r / LN_2,
            max_relative = 1e-15
        );
        assert_eq!(s.correction_factor, 1.0);
        assert!(s.relative_residual <= RESIDUAL_LIMIT);
    }
}

#[test]
fn correction_factor_matches_an_independent_solution() {
    // Source: mpmath 1.4.1, core/tests/data/gen_vdp_reference.py: van der Pauw's eq. (5),
    // cosh(((r-1)/(r+1)) ln2/f) = exp(ln2/f)/2, at 50 digits. Van der Pauw's Fig. 5 curve reads
    // about 0.96 at r = 2 and 0.70 at r = 10 (from memory), as these values do.
    let table = [
        (1.0, 1.0),
        (1.5, 0.985_986_102_189_266_59),
        (2.0, 0.960_280_060_275_037_65),
        (3.0, 0.906_678_995_017_895_35),
        (5.0, 0.821_655_085_157_722_16),
        (10.0, 0.699_259_455_239_415_12),
        (20.0, 0.588_535_948_374_517_19),
        (50.0, 0.471_559_507_509_627_44),
        (100.0, 0.403_849_004_164_254_25),
        (1000.0, 0.263_701_478_129_127_10),
    ];
    for (r, f) in table {
        assert_relative_eq!(
            vdp::correction_factor(r).unwrap(),
            f,
            max_relative = MPMATH_TOLERANCE
        );
        // f(r) = f(1/r): the labelling of the two configurations does not matter.
        assert_relative_eq!(
            vdp::correction_factor(1.0 / r).unwrap(),
            f,
            max_relative = MPMATH_TOLERANCE
        );
    }
    // Source: the same script, R_s / R_B at r = 1000: 598.19262944109225516.
    let s = vdp::solve(1000.0, 1.0).unwrap();
    assert_relative_eq!(
        s.sheet_resistance_ohm_sq,
        598.192_629_441_092_26,
        max_relative = MPMATH_TOLERANCE
    );
    assert!(s.relative_residual <= RESIDUAL_LIMIT, "{s:?}");
}

#[test]
fn extreme_ratios_still_solve() {
    for r in [1e6, 1e12, 1e100, 1e300] {
        let s = vdp::solve(r, 1.0).unwrap();
        assert!(s.relative_residual <= RESIDUAL_LIMIT, "r = {r:e}: {s:?}");
        // The closed-form inverse gives back the larger resistance.
        assert_relative_eq!(
            vdp::resistances_for(s.sheet_resistance_ohm_sq, 1.0).unwrap(),
            r,
            max_relative = 1e-12
        );
    }
}

proptest! {
    #[test]
    fn round_trip_sheet_to_readings_to_sheet(
        log_sheet in -3.0f64..7.0,
        // y = pi R_B / R_s from ln 2 (ratio 1) down to y(1000) = 0.0052518 (mpmath 1.4.1).
        y in 0.005_251_807_693_660_601f64..LN_2,
    ) {
        let sheet = 10f64.powf(log_sheet);
        let r_b = sheet * y / PI;
        let r_a = vdp::resistances_for(sheet, r_b).unwrap();
        let ratio = r_a / r_b;
        prop_assert!((1.0..=1000.0 * (1.0 + 1e-12)).contains(&ratio), "ratio {ratio}");
        let s = vdp::solve(r_a, r_b).unwrap();
        prop_assert!((s.sheet_resistance_ohm_sq - sheet).abs() <= ROUND_TRIP_TOLERANCE * sheet,
            "{sheet} -> ({r_a}, {r_b}) -> {}", s.sheet_resistance_ohm_sq);
        let swapped = vdp::solve(r_b, r_a).unwrap();
        prop_assert!((swapped.sheet_resistance_ohm_sq - sheet).abs() <= ROUND_TRIP_TOLERANCE * sheet);
        prop_assert!(s.relative_residual <= RESIDUAL_LIMIT);
    }

    #[test]
    fn correction_factor_falls_with_asymmetry(a in 1.0f64..1e3, b in 1.0f64..1e3) {
        let (lo, hi) = if a < b { (a, b) } else { (b, a) };
        prop_assert!(vdp::correction_factor(hi).unwrap() <= vdp::correction_factor(lo).unwrap() + 1e-15);
        prop_assert!(vdp::correction_factor(hi).unwrap() <= 1.0);
    }
}

/// The textbook bar expressed as a sheet: rho = V W d/(I L) = 12.5 V x 1e-2 cm x 1e-3 cm /
/// (1e-3 A x 1e-1 cm) = 1.25 ohm cm, R_s = rho/d = 1250 ohm/sq.
fn textbook_reading(scattering: ScatteringFactor) -> HallReading {
    HallReading {
        voltage: HallVoltage::Net(-6.25e-3),
        current_a: 1e-3,
        // 500 G.
        field_t: 5e-2,
        sheet_resistance_ohm_sq: 1250.0,
        thickness_cm: Some(1e-3),
        scattering,
    }
}

#[test]
fn textbook_hall_example() {
    // Source: D. A. Neamen, Semiconductor Physics and Devices, ch. 5, Hall-effect example
    // (from memory): I = 1 mA, B = 500 G, d = 1e-3 cm, W = 1e-2 cm, L = 0.1 cm, V_x = 12.5 V,
    // V_H = -6.25 mV give an n-type bar with n = 5e15 cm^-3 and mu_n = 1000 cm^2/V s
    // (computed there with q = 1.6e-19 C).
    let r = hall::evaluate(&textbook_reading(ScatteringFactor::Unity)).unwrap();
    assert_eq!(r.conductivity_type, ConductivityType::N);
    assert_relative_eq!(
        r.volume_density_cm3.unwrap(),
        5e15,
        max_relative = TEXTBOOK_CHARGE_TOLERANCE
    );
    assert_relative_eq!(
        r.sheet_density_cm2,
        5e12,
        max_relative = TEXTBOOK_CHARGE_TOLERANCE
    );
    assert_relative_eq!(
        r.hall_mobility_cm2_per_v_s,
        1000.0,
        max_relative = TEXTBOOK_CHARGE_TOLERANCE
    );
    // Exactly, with q = 1.602176634e-19 C: n_s = I B / (q |V_H|) = 4.99321...e12 cm^-2.
    assert_relative_eq!(
        r.sheet_density_cm2,
        1e-3 * 5e-2 / (1.602_176_634e-19 * 6.25e-3) * 1e-4,
        max_relative = 1e-15
    );
}

#[test]
fn scattering_factor_scales_density_up_and_mobility_down() {
    // Source: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), ch. 1 (from memory):
    // r_H = 3 pi/8 = 1.18 for acoustic-phonon scattering; n = r_H/(q R_H), mu = mu_H / r_H.
    let unity = hall::evaluate(&textbook_reading(ScatteringFactor::Unity)).unwrap();
    let phonon = hall::evaluate(&textbook_reading(ScatteringFactor::AcousticPhonon)).unwrap();
    assert_relative_eq!(
        phonon.scattering_factor,
        1.178_097_245_096_172_5,
        max_relative = 1e-15
    );
    assert_relative_eq!(
        phonon.sheet_density_cm2,
        unity.sheet_density_cm2 * 1.178_097_245_096_172_5,
        max_relative = 1e-15
    );
    assert_eq!(
        phonon.hall_mobility_cm2_per_v_s,
        unity.hall_mobility_cm2_per_v_s
    );
    // R_s = 1/(q n_s mu) holds with the drift values.
    assert_relative_eq!(
        1.0 / (1.602_176_634e-19 * phonon.sheet_density_cm2 * phonon.drift_mobility_cm2_per_v_s),
        1250.0,
        max_relative = 1e-14
    );
}

#[test]
fn cross_check_of_a_layer_made_by_the_physics_model_agrees_with_it() {
    // A layer built from the Masetti physics point at 1e16 cm^-3 P, 300 K: its measured carriers
    // and mobility are the model's, so the Masetti row must show 0 % and the dopant density back.
    let si = materials::silicon();
    let options = PhysicsOptions::with_mobility(MobilityModel::Masetti);
    let point = resistivity::resistivity_from_density(&si, "P", 1e16, 300.0, &options).unwrap();
    let thickness = 2e-4;
    let sheet = point.resistivity_ohm_cm / thickness;
    let n_s = point.electrons_cm3 * thickness;
    // V_H = -I B/(q n_s) with I = 100 uA, B = 0.5 T (n_s in m^-2).
    let v_h = -1e-4 * 0.5 / (1.602_176_634e-19 * n_s * 1e4);
    let measured = hall::evaluate(&HallReading {
        voltage: HallVoltage::Net(v_h),
        current_a: 1e-4,
        field_t: 0.5,
        sheet_resistance_ohm_sq: sheet,
        thickness_cm: Some(thickness),
        scattering: ScatteringFactor::Unity,
    })
    .unwrap();
    assert_relative_eq!(
        measured.drift_mobility_cm2_per_v_s,
        point.electron_mobility_cm2_per_v_s,
        max_relative = 1e-6
    );
    let check = hall::cross_check(
        &si,
        "P",
        point.resistivity_ohm_cm,
        &measured,
        300.0,
        &SolveOptions::default(),
    )
    .unwrap();
    assert!(check.notes.is_empty(), "{:?}", check.notes);
    let masetti = check
        .rows
        .iter()
        .find(|r| r.model.id() == "masetti")
        .expect("Masetti covers P in silicon");
    assert_relative_eq!(
        masetti.dopant_density_cm3.unwrap(),
        1e16,
        max_relative = 1e-6
    );
    assert!(
        masetti.carriers_difference_percent.unwrap().abs() < 1e-4,
        "{masetti:?}"
    );
    assert!(
        masetti.mobility_difference_percent.unwrap().abs() < 1e-4,
        "{masetti:?}"
    );
    // The empirical relation holds at 23 C only: at 300 K its row says why it is empty.
    let thurber = check
        .rows
        .iter()
        .find(|r| r.model.id() == "thurber")
        .unwrap();
    assert!(
        thurber.error.as_deref().is_some_and(|e| e.contains("23 C")),
        "{thurber:?}"
    );
    // A p-type dopant against an n-type Hall sign is named.
    let wrong = hall::cross_check(
        &si,
        "B",
        point.resistivity_ohm_cm,
        &measured,
        300.0,
        &SolveOptions::default(),
    )
    .unwrap();
    assert!(wrong.notes[0].contains("n-type"), "{:?}", wrong.notes);
}

#[test]
fn intervals_follow_the_readings() {
    // 1 % on the Hall voltage alone moves n and mu by 1 % each (n ~ 1/V_H, mu ~ V_H) and R_s
    // not at all; 1 % on both resistances moves R_s by sqrt(2)/2 % each for a symmetric
    // structure (R_s is homogeneous of degree one in R_A, R_B, half from each).
    let structure = MeasuredStructure {
        r_a_ohm: Measured::relative(100.0, 0.01),
        r_b_ohm: Measured::relative(100.0, 0.01),
        thickness_cm: Some(Measured::exact(1e-4)),
        hall: Some(MeasuredHall {
            voltage_v: Measured::relative(-2e-3, 0.01),
            current_a: Measured::exact(1e-4),
            field_t: Measured::exact(0.5),
        }),
        scattering: ScatteringFactor::Unity,
    };
    let intervals = hall::intervals(&structure).unwrap();
    assert_eq!(intervals.len(), 3);
    let half = |i: usize, source: &str| {
        intervals[i]
            .contributions
            .iter()
            .find(|c| c.source == source)
            .map(|c| c.relative_half_width)
            .unwrap()
    };
    assert_relative_eq!(half(0, "r_a_ohm"), 0.005, max_relative = 1e-3);
    assert_relative_eq!(half(0, "hall_voltage_v"), 0.0, epsilon = 1e-15);
    assert_relative_eq!(half(1, "hall_voltage_v"), 0.01, max_relative = 1e-3);
    assert_relative_eq!(half(2, "hall_voltage_v"), 0.01, max_relative = 1e-3);
    assert_eq!(intervals[1].quantity, "volume_density_cm3");
    assert!(intervals[1].low < intervals[1].value && intervals[1].value < intervals[1].high);
}
