//! Property checks of the conversions: monotonicity, round trips, limits and the stated
//! self-consistency of the empirical relations.

use bandgauge_core::compare::ConversionModel;
use bandgauge_core::empirical::{self, EmpiricalError, EmpiricalRelation};
use bandgauge_core::materials;
use bandgauge_core::mobility::{self, MobilityModel};
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::probe::{self, ProbeGeometry, THIN_SHEET_FACTOR};
use bandgauge_core::resistivity::{self, PhysicsOptions, ROUND_TRIP_TOLERANCE, ResistivityError};
use bandgauge_core::uncertainty::{self, Measured, MeasuredInput, UncertaintyRequest};
use proptest::prelude::*;

/// Source: ASTM F723 (after Thurber et al. 1980/1981), stated agreement of the round trip
/// rho -> N -> rho: 3 % for boron over 1e-4..1e4 ohm cm.
const BORON_SELF_CONSISTENCY: f64 = 0.03;
/// Same source: 4.5 % for phosphorus over 2e-4..4000 ohm cm (N <= 5e20 cm^-3).
const PHOSPHORUS_SELF_CONSISTENCY: f64 = 0.045;

fn log_uniform(lo: f64, hi: f64) -> impl Strategy<Value = f64> {
    (lo.log10()..=hi.log10()).prop_map(|e| 10f64.powf(e))
}

/// (material, mobility model, dopant) cases of the physics model.
fn physics_case() -> impl Strategy<Value = (&'static str, MobilityModel, &'static str)> {
    prop_oneof![
        Just(("si", MobilityModel::Masetti, "P")),
        Just(("si", MobilityModel::Masetti, "As")),
        Just(("si", MobilityModel::Masetti, "B")),
        Just(("si", MobilityModel::Arora, "Sb")),
        Just(("si", MobilityModel::Arora, "B")),
        Just(("si", MobilityModel::Arora, "Ga")),
        Just(("gaas", MobilityModel::CaugheyThomas, "Si")),
        Just(("gaas", MobilityModel::CaugheyThomas, "Zn")),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    #[test]
    fn boron_round_trip_meets_the_stated_consistency(rho in log_uniform(1e-4, 1e4)) {
        let n = empirical::density_from_resistivity_cm3(EmpiricalRelation::Boron, rho).unwrap();
        let back = empirical::resistivity_from_density_ohm_cm(EmpiricalRelation::Boron, n).unwrap();
        prop_assert!((back / rho - 1.0).abs() <= BORON_SELF_CONSISTENCY, "{rho} -> {n} -> {back}");
    }

    #[test]
    fn phosphorus_round_trip_meets_the_stated_consistency(rho in log_uniform(2e-4, 4000.0)) {
        match empirical::density_from_resistivity_cm3(EmpiricalRelation::Phosphorus, rho) {
            Ok(n) => match empirical::resistivity_from_density_ohm_cm(EmpiricalRelation::Phosphorus, n) {
                Ok(back) => prop_assert!(
                    (back / rho - 1.0).abs() <= PHOSPHORUS_SELF_CONSISTENCY,
                    "{rho} -> {n} -> {back}"
                ),
                // Near 4000 ohm cm the density can fall just below the density range (which the
                // density -> resistivity equation defines): the two equations differ there.
                Err(e) => prop_assert!(rho * (1.0 + PHOSPHORUS_SELF_CONSISTENCY) > 4000.0, "{rho}: {e}"),
            },
            // Only the lowest resistivities map above the 5e20 cm^-3 breakdown limit.
            Err(EmpiricalError::DensityOutOfRange { value_cm3, .. }) => {
                prop_assert!(value_cm3 > 5e20 && rho < 2.5e-4, "{rho} -> {value_cm3:e}")
            }
            Err(e) => prop_assert!(false, "{rho}: {e}"),
        }
    }

    #[test]
    fn empirical_relations_decrease(a in log_uniform(1.4e12, 4.9e20), factor in 1.001..100.0f64) {
        let b = (a * factor).min(5e20);
        for relation in [EmpiricalRelation::Boron, EmpiricalRelation::Phosphorus] {
            let ra = empirical::resistivity_from_density_ohm_cm(relation, a).unwrap();
            let rb = empirical::resistivity_from_density_ohm_cm(relation, b).unwrap();
            prop_assert!(ra > rb);
            let na = empirical::density_from_resistivity_cm3(relation, ra.clamp(2.1e-4, 4000.0)).unwrap();
            let nb = empirical::density_from_resistivity_cm3(relation, rb.clamp(2.1e-4, 4000.0)).unwrap();
            prop_assert!(na <= nb);
        }
    }

    #[test]
    fn physics_round_trip_from_density(
        (material, model, dopant) in physics_case(),
        n in log_uniform(1e11, 1e20),
        t in 250.0..450.0f64,
    ) {
        let si = materials::by_id(material).unwrap();
        let options = PhysicsOptions::with_mobility(model);
        let forward = resistivity::resistivity_from_density(&si, dopant, n, t, &options).unwrap();
        match resistivity::density_from_resistivity(&si, dopant, forward.resistivity_ohm_cm, t, &options) {
            Ok(back) => {
                let rho_err = (back.resistivity_ohm_cm / forward.resistivity_ohm_cm - 1.0).abs();
                prop_assert!(rho_err <= ROUND_TRIP_TOLERANCE, "rho mismatch {rho_err:e}");
                // Where the resistivity is far from intrinsic the density is recovered too.
                if n > 1e3 * back.intrinsic_cm3 {
                    prop_assert!((back.density_cm3 / n - 1.0).abs() <= 1e-6,
                        "{n:e} -> {:e}", back.density_cm3);
                }
            }
            // Near-intrinsic donor doping below 1e-6 ni is indistinguishable from undoped.
            Err(ResistivityError::AboveReachable { .. }) => prop_assert!(n < 1e-3 * forward.intrinsic_cm3),
            Err(e) => prop_assert!(false, "{e}"),
        }
    }

    #[test]
    fn physics_round_trip_from_resistivity(
        (material, model, dopant) in physics_case(),
        rho in log_uniform(1e-3, 1e5),
        t in 250.0..450.0f64,
    ) {
        let si = materials::by_id(material).unwrap();
        let options = PhysicsOptions::with_mobility(model);
        match resistivity::density_from_resistivity(&si, dopant, rho, t, &options) {
            Ok(p) => prop_assert!((p.resistivity_ohm_cm / rho - 1.0).abs() <= ROUND_TRIP_TOLERANCE),
            Err(ResistivityError::AboveReachable { max_ohm_cm, .. }) => prop_assert!(rho > max_ohm_cm),
            Err(ResistivityError::BelowReachable { min_ohm_cm, .. }) => prop_assert!(rho < min_ohm_cm),
            // Where a Pearson-Bardeen level merges with its band (Sb, Ga in silicon) rho(N)
            // steps down; a value inside the step has no density.
            Err(ResistivityError::InIonizationStep { below_step_ohm_cm, above_step_ohm_cm, .. }) => {
                prop_assert!(above_step_ohm_cm < rho && rho < below_step_ohm_cm)
            }
            Err(e) => prop_assert!(false, "{e}"),
        }
    }

    #[test]
    fn physics_resistivity_decreases_with_doping(
        (material, model, dopant) in physics_case(),
        a in log_uniform(1e12, 1e20),
        factor in 1.01..10.0f64,
    ) {
        let si = materials::by_id(material).unwrap();
        let options = PhysicsOptions::with_mobility(model);
        let b = (a * factor).min(1e20);
        prop_assume!(b > a);
        let ra = resistivity::resistivity_from_density(&si, dopant, a, 300.0, &options).unwrap();
        let rb = resistivity::resistivity_from_density(&si, dopant, b, 300.0, &options).unwrap();
        prop_assert!(ra.resistivity_ohm_cm > rb.resistivity_ohm_cm);
    }

    #[test]
    fn mobility_decreases_with_density_and_temperature(
        n in log_uniform(1e13, 1e20),
        factor in 1.01..10.0f64,
        t in 250.0..450.0f64,
    ) {
        for (model, material, dopant) in [
            (MobilityModel::Masetti, "si", "P"),
            (MobilityModel::Masetti, "si", "As"),
            (MobilityModel::Masetti, "si", "B"),
            (MobilityModel::Arora, "si", "B"),
            (MobilityModel::CaugheyThomas, "gaas", "Si"),
        ] {
            let lo = mobility::mobility(model, material, dopant, n, t).unwrap();
            let hi = mobility::mobility(model, material, dopant, (n * factor).min(1e20), t).unwrap();
            prop_assert!(hi.electrons_cm2_per_v_s <= lo.electrons_cm2_per_v_s);
            prop_assert!(hi.holes_cm2_per_v_s <= lo.holes_cm2_per_v_s);
            let warm = mobility::mobility(model, material, dopant, n, t + 10.0).unwrap();
            // Lattice scattering grows with temperature; at low density it dominates.
            if n < 1e16 {
                prop_assert!(warm.electrons_cm2_per_v_s < lo.electrons_cm2_per_v_s);
            }
        }
    }

    #[test]
    fn thickness_factor_decreases_and_stays_in_range(x in log_uniform(1e-3, 1e3), factor in 1.01..4.0f64) {
        let a = probe::thickness_correction(x, 1.0).unwrap();
        let b = probe::thickness_correction(x * factor, 1.0).unwrap();
        prop_assert!(b.thin_sheet_factor <= a.thin_sheet_factor * (1.0 + 1e-14));
        prop_assert!(a.thin_sheet_factor <= 1.0 + 1e-14 && a.thin_sheet_factor > 0.0);
        prop_assert!(a.bulk_factor <= b.bulk_factor * (1.0 + 1e-14) && b.bulk_factor <= 1.0 + 1e-14);
    }

    #[test]
    fn diameter_factor_rises_towards_the_thin_sheet_factor(r in 1.8..1e4f64, factor in 1.01..4.0f64) {
        let a = probe::diameter_correction(r, 1.0).unwrap();
        let b = probe::diameter_correction(r * factor, 1.0).unwrap();
        prop_assert!(a.sheet_factor < b.sheet_factor && b.sheet_factor < THIN_SHEET_FACTOR);
    }

    #[test]
    fn sheet_resistance_round_trip(rho in log_uniform(1e-4, 1e5), t in log_uniform(1e-6, 0.1)) {
        let rs = probe::sheet_resistance_ohm_sq(rho, t).unwrap();
        let back = probe::resistivity_from_sheet_ohm_cm(rs, t).unwrap();
        prop_assert!((back / rho - 1.0).abs() <= 4.0 * f64::EPSILON);
    }

    #[test]
    fn interval_contains_the_value_and_widens_with_the_tolerance(
        rho in log_uniform(0.01, 100.0),
        u in 0.001..0.1f64,
    ) {
        let request = |u: f64| UncertaintyRequest {
            material: materials::silicon(),
            dopant: "B".into(),
            input: MeasuredInput::Resistivity(Measured::relative(rho, u)),
            temperature_k: Measured::absolute(296.15, 0.5),
            model: ConversionModel::Empirical,
            solve: SolveOptions::default(),
            include_model_spread: true,
        };
        let narrow = uncertainty::propagate(&request(u)).unwrap();
        let wide = uncertainty::propagate(&request(2.0 * u)).unwrap();
        prop_assert!(narrow.low <= narrow.value && narrow.value <= narrow.high);
        prop_assert!(wide.low < narrow.low && wide.high > narrow.high);
    }
}

#[test]
fn zero_tolerances_without_spread_give_a_point() {
    let request = UncertaintyRequest {
        material: materials::silicon(),
        dopant: "P".into(),
        input: MeasuredInput::Resistivity(Measured::exact(1.0)),
        temperature_k: Measured::exact(296.15),
        model: ConversionModel::Empirical,
        solve: SolveOptions::default(),
        include_model_spread: false,
    };
    let i = uncertainty::propagate(&request).unwrap();
    assert_eq!((i.low, i.high), (i.value, i.value));
    assert_eq!(i.dominant, "none");
}

#[test]
fn probe_uncertainty_runs_through_the_whole_chain() {
    use bandgauge_core::empirical::EMPIRICAL_TEMPERATURE_K;
    // A thin boron-doped layer at 23 C: V +/- 1 %, I +/- 0.2 %, s exact, t +/- 0.5 %.
    let request = UncertaintyRequest {
        material: materials::silicon(),
        dopant: "B".into(),
        input: MeasuredInput::Probe {
            volts: Measured::relative(0.0125, 0.01),
            amps: Measured::relative(0.001, 0.002),
            spacing_cm: Measured::exact(0.1),
            geometry: ProbeGeometry::ThinLayer,
            thickness_cm: Some(Measured::relative(0.002, 0.005)),
            diameter_cm: None,
        },
        temperature_k: Measured::exact(EMPIRICAL_TEMPERATURE_K),
        model: ConversionModel::Empirical,
        solve: SolveOptions::default(),
        include_model_spread: false,
    };
    let i = uncertainty::propagate(&request).unwrap();
    let sources: Vec<&str> = i.contributions.iter().map(|c| c.source.as_str()).collect();
    assert_eq!(sources, ["volts", "amps", "thickness_cm"]);
    assert_eq!(i.dominant, "volts");
    // The volts contribution is the empirical relation's own change between rho (1 -/+ 1 %).
    let rho = i.resistivity_ohm_cm.unwrap();
    let thin = probe::thickness_correction(0.002, 0.1)
        .unwrap()
        .thin_sheet_factor;
    let expected_rho = THIN_SHEET_FACTOR * 12.5 * thin * 0.002;
    assert!((rho / expected_rho - 1.0).abs() < 1e-14);
    let n = |r: f64| empirical::density_from_resistivity_cm3(EmpiricalRelation::Boron, r).unwrap();
    let expected = 0.5 * (n(rho * 0.99).ln() - n(rho * 1.01).ln());
    assert!((i.contributions[0].relative_half_width / expected - 1.0).abs() < 1e-9);
    // Quadrature: the combined width is below the plain sum and above the largest part.
    let sum: f64 = i.contributions.iter().map(|c| c.relative_half_width).sum();
    assert!(i.measurement_relative_half_width < sum);
    assert!(i.measurement_relative_half_width > i.contributions[0].relative_half_width);
}
