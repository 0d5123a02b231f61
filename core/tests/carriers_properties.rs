//! Property tests of the neutrality solver over random materials, temperatures (5-2000 K), doping (0-1e21 cm^-3) and ionization models.

use bandgauge_core::bandgap::Varshni;
use bandgauge_core::dos::PowerLaw;
use bandgauge_core::ionization::{AltermattParameters, IonizationModel, PearsonBardeenParameters};
use bandgauge_core::materials::{
    self, Dopant, DopantDensity, DopantKind, Material, MaterialSources,
};
use bandgauge_core::neutrality::{self, CarrierError, Equilibrium, SolveOptions};
use proptest::prelude::*;

/// The solver's guarantee on the relative charge residual.
const RESIDUAL_GUARANTEE: f64 = 1e-9;
/// Recomputing the residual from the linear outputs adds the rounding of
/// exp(ln N) (|ln N| < 60, so < 2e-14) to each term: far below the guarantee.
const RECOMPUTED_RESIDUAL: f64 = 1e-9;
/// Below this the linear densities lose relative precision (subnormal range).
const SMALLEST_NORMAL_SUM: f64 = 1e-290;
/// Monotonicity is checked on log10 n: equal inputs give equal outputs to the
/// solver's precision in E_F (about 1e-12 kT), i.e. about 1e-12 in log10 n.
const MONOTONIC_SLACK_LOG10: f64 = 1e-9;

fn temperature_k() -> impl Strategy<Value = f64> {
    (5f64.ln()..2000f64.ln()).prop_map(f64::exp)
}

/// 0 (a fifth of the time) or log-uniform 1..1e21 cm^-3.
fn density_cm3() -> impl Strategy<Value = f64> {
    prop_oneof![1 => Just(0.0), 4 => (0.0f64..21.0).prop_map(|e| 10f64.powf(e))]
}

/// A random Altermatt-form set (test data, not a published one).
fn user_altermatt() -> impl Strategy<Value = AltermattParameters> {
    (
        0.001f64..0.3,
        16.0f64..21.0,
        0.5f64..3.0,
        16.0f64..21.0,
        0.5f64..4.0,
    )
        .prop_map(|(e0, n_ref, c, n_b, d)| AltermattParameters {
            e0_ev: e0,
            n_ref_cm3: 10f64.powf(n_ref),
            c,
            n_b_cm3: 10f64.powf(n_b),
            d,
            source: "random test data".into(),
        })
}

fn user_dopant(kind: DopantKind, index: usize) -> impl Strategy<Value = Dopant> {
    (
        0.001f64..0.3,
        1.0f64..4.0,
        prop::option::of(user_altermatt()),
    )
        .prop_map(move |(e, g, altermatt)| Dopant {
            symbol: format!("{kind}{index}").into(),
            kind,
            ionization_energy_ev: e,
            degeneracy: g,
            source: "random test data".into(),
            altermatt,
        })
}

/// Random Pearson-Bardeen alpha values, up to ten times silicon's (test data).
fn user_pearson_bardeen() -> impl Strategy<Value = PearsonBardeenParameters> {
    (0.0f64..3e-7, 0.0f64..3e-7).prop_map(|(donor, acceptor)| PearsonBardeenParameters {
        donor_alpha_ev_cm: donor,
        acceptor_alpha_ev_cm: acceptor,
        source: "random test data".into(),
    })
}

/// A random but physically shaped material (test data, not a real one).
fn user_material() -> impl Strategy<Value = Material> {
    (
        (0.3f64..4.0, 0.0f64..1e-3, 0.0f64..1000.0),
        (17.0f64..20.0, 1.0f64..2.0, 17.0f64..20.0, 1.0f64..2.0),
        user_dopant(DopantKind::Donor, 1),
        user_dopant(DopantKind::Donor, 2),
        user_dopant(DopantKind::Acceptor, 1),
        user_dopant(DopantKind::Acceptor, 2),
        prop::option::of(user_pearson_bardeen()),
    )
        .prop_map(
            |((eg0, a, b), (nc, xc, nv, xv), d1, d2, a1, a2, pb)| Material {
                id: "random".into(),
                name: "Random test material".into(),
                varshni: Varshni {
                    eg0_ev: eg0,
                    alpha_ev_per_k: a,
                    beta_k: b,
                },
                nc: PowerLaw {
                    at_300k_cm3: 10f64.powf(nc),
                    exponent: xc,
                },
                nv: PowerLaw {
                    at_300k_cm3: 10f64.powf(nv),
                    exponent: xv,
                },
                relative_permittivity: 10.0,
                dopants: vec![d1, d2, a1, a2],
                sources: MaterialSources::default(),
                pearson_bardeen: pb,
                intrinsic_fit: None,
                band_gap_narrowing: None,
            },
        )
}

fn any_material() -> impl Strategy<Value = Material> {
    prop_oneof![
        1 => (0usize..4).prop_map(|i| materials::builtin().swap_remove(i)),
        1 => user_material(),
    ]
}

fn any_options() -> impl Strategy<Value = SolveOptions> {
    prop::sample::select(IonizationModel::ALL.to_vec()).prop_map(|model| SolveOptions {
        ionization_model: model,
        ..Default::default()
    })
}

/// A material with up to four of its species at random densities.
fn problem() -> impl Strategy<Value = (Material, f64, Vec<DopantDensity>)> {
    (
        any_material(),
        temperature_k(),
        prop::collection::vec((any::<prop::sample::Index>(), density_cm3()), 0..5),
    )
        .prop_map(|(m, t, picks)| {
            let doping = picks
                .into_iter()
                .map(|(i, n)| DopantDensity {
                    dopant: i.get(&m.dopants).clone(),
                    density_cm3: n,
                })
                .collect();
            (m, t, doping)
        })
}

/// Solves, allowing only the refusals that are physical for the input.
fn solve_or_physical_refusal(
    m: &Material,
    t: f64,
    doping: &[DopantDensity],
    options: &SolveOptions,
) -> Result<Option<Equilibrium>, TestCaseError> {
    match neutrality::solve(m, t, doping, options) {
        Ok(e) => Ok(Some(e)),
        Err(CarrierError::NonPositiveBandGap { .. } | CarrierError::LevelOutsideGap { .. }) => {
            Ok(None)
        }
        Err(e) => Err(TestCaseError::fail(format!("unexpected error: {e}"))),
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(512))]

    #[test]
    fn residual_is_small_and_outputs_finite((m, t, doping) in problem(), options in any_options()) {
        let Some(e) = solve_or_physical_refusal(&m, t, &doping, &options)? else { return Ok(()) };
        prop_assert!(e.relative_residual < RESIDUAL_GUARANTEE, "residual {}", e.relative_residual);
        let numbers = [
            e.band_gap_ev, e.nc_cm3, e.nv_cm3, e.intrinsic_cm3, e.effective_intrinsic_cm3,
            e.electrons_cm3, e.holes_cm3, e.log10_electrons_cm3, e.log10_holes_cm3,
            e.fermi_minus_valence_ev, e.fermi_minus_conduction_ev, e.fermi_minus_midgap_ev,
            e.fermi_minus_intrinsic_ev, e.ionized_donors_cm3, e.ionized_acceptors_cm3,
        ];
        prop_assert!(numbers.iter().all(|x| x.is_finite()), "{:?}", numbers);
        for s in &e.species {
            prop_assert!((0.0..=1.0).contains(&s.ionized_fraction));
            prop_assert!((0.0..=1.0).contains(&s.localized_fraction));
            prop_assert!(s.ionized_cm3 <= s.density_cm3);
            prop_assert!(s.level_from_band_edge_ev >= 0.0 && s.level_from_band_edge_ev.is_finite());
        }
        // E_F - E_V - (E_F - E_C) = E_C - E_V.
        let gap = e.fermi_minus_valence_ev - e.fermi_minus_conduction_ev;
        prop_assert!((gap - e.band_gap_ev).abs() <= 1e-9 * (1.0 + e.fermi_minus_valence_ev.abs()));
        // Independent recomputation of the charge balance from the outputs.
        let positive = e.holes_cm3 + e.ionized_donors_cm3;
        let negative = e.electrons_cm3 + e.ionized_acceptors_cm3;
        let largest = positive.max(negative);
        if largest > SMALLEST_NORMAL_SUM {
            prop_assert!(
                (positive - negative).abs() / largest < RECOMPUTED_RESIDUAL,
                "positive {positive:e}, negative {negative:e}"
            );
        }
    }

    #[test]
    fn electrons_increase_with_donor_density(
        (m, t, doping) in problem(),
        factor in 1.0f64..1e6,
        extra in density_cm3(),
        options in any_options(),
    ) {
        let Some(base) = solve_or_physical_refusal(&m, t, &doping, &options)? else { return Ok(()) };
        let donor = m.dopants.iter().find(|d| d.kind == DopantKind::Donor).cloned();
        let Some(donor) = donor else { return Ok(()) };
        let mut more = doping.clone();
        for d in more.iter_mut().filter(|d| d.dopant.kind == DopantKind::Donor) {
            d.density_cm3 = (d.density_cm3 * factor).min(1e21);
        }
        more.push(DopantDensity { dopant: donor, density_cm3: extra });
        let Some(after) = solve_or_physical_refusal(&m, t, &more, &options)? else { return Ok(()) };
        prop_assert!(
            after.log10_electrons_cm3 >= base.log10_electrons_cm3 - MONOTONIC_SLACK_LOG10,
            "log10 n fell from {} to {}", base.log10_electrons_cm3, after.log10_electrons_cm3
        );
        prop_assert!(after.fermi_minus_valence_ev >= base.fermi_minus_valence_ev - 1e-9);
    }

    #[test]
    fn non_finite_or_negative_input_is_refused(t in prop_oneof![
        Just(f64::NAN), Just(f64::INFINITY), Just(f64::NEG_INFINITY), Just(0.0), -1e300f64..0.0
    ]) {
        let si = materials::silicon();
        let e = neutrality::solve(&si, t, &[], &SolveOptions::default()).unwrap_err();
        let is_temperature_error = matches!(e, CarrierError::InvalidTemperature { .. });
        prop_assert!(is_temperature_error);
    }
}
