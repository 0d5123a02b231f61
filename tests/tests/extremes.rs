//! Physics extremes: every public function of `bandgauge-core`, fed temperatures from 1e-3 to
//! 1e4 K, densities from 0 to 1e23 cm^-3, resistivities over many decades and the awkward
//! floats (NaN, infinities, -0, subnormals, negatives), answers with finite numbers or a typed
//! error, and never panics.
//!
//! # The rule checked
//! - A fallible function (one that returns `Result`) gives `Ok` with no NaN or infinity
//!   anywhere in its output, nested vectors and options included, or an `Err` whose message
//!   can be shown.
//! - An infallible scalar helper (band gap, Nc(T), F_1/2, ionized fraction, ...) has no error
//!   channel: it never panics, gives a finite value for finite input in its physical domain,
//!   and may only pass a NaN given to it back out (NaN in, NaN out: the fallible functions
//!   that call it refuse NaN before it gets there, which the first rule checks).
//!
//! # Coverage, module by module (`core/src/lib.rs` order)
//! - `bandgap`: `Varshni::band_gap_ev`. `bgn`: `SlotboomParams::narrowing_ev`.
//!   `constants`: `thermal_energy_ev`. `dos`: `PowerLaw::{at, ln_at, from_effective_mass}`,
//!   `effective_density_cm3`.
//! - `compare`: `convert`, `compare`, `ConversionModel::{default_for, from_id}`.
//! - `empirical`: `density_from_resistivity_cm3`, `resistivity_from_density_ohm_cm`, `convert`,
//!   `EmpiricalRelation::{for_dopant, valid_range}`.
//! - `fermi_dirac`: `f_half`, `ln_f_half`, `f_minus_half`, `f_half_inverse`,
//!   `ln_f_half_inverse`.
//! - `intrinsic`: `intrinsic_density`, `from_dos_cm3`, `ln_from_dos`,
//!   `IntrinsicFit::{density_cm3, ln_density_cm3}`.
//! - `ionization`: `donor_ionized_fraction`, `acceptor_ionized_fraction`,
//!   `pearson_bardeen_level_ev`, `effective_level`, `AltermattParameters::{level_ev,
//!   localized_fraction, delocalized_fraction}`, `PearsonBardeenParameters::alpha_ev_cm`.
//! - `lots`: `read_str` (so `LotReader::{feed, finish}` and `LotBook::accept`),
//!   `LotBook::report`, `parse_dopant`, `SpecWindow::{new, parse, contains, judge, cpk}`;
//!   `lots::stats`: `ln_gamma`, `regularized_incomplete_beta`, `regularized_gamma_q`,
//!   `student_t_{cdf, two_sided_p, pdf, quantile}`, `chi_squared_survival`, `welch_t_test`,
//!   `kruskal_wallis`, `Moments::{of, mean, sample_std, min, max}`,
//!   `MedianSketch::{push, merged, median, count_where}`, `Summary::from_parts`.
//! - `materials`: `by_id`, `Material::{validate, validate_parameters, dopant, dopant_of_kind,
//!   intrinsic_density_cm3}`, `Dopant::new` (and so `Dopant::validate`).
//! - `mobility`: `mobility`, `masetti_cm2_per_v_s`, `arora_cm2_per_v_s`,
//!   `caughey_thomas_cm2_per_v_s`, `lattice_cm2_per_v_s`, `CarrierMobilities::of`,
//!   `MobilityModel::{max_density_cm3, temperature_range_k}`.
//! - `neutrality`: `solve`. `sweep`: `linear_grid_k`, `temperature_sweep`.
//! - `probe`: `sheet_resistance_ohm_sq`, `resistivity_from_sheet_ohm_cm`,
//!   `thin_sheet_resistance_ohm_sq`, `semi_infinite_resistivity_ohm_cm`,
//!   `thickness_correction`, `diameter_correction`, `temperature_correction_to_23c`,
//!   `evaluate`.
//! - `resistivity`: `resistivity_from_density`, `density_from_resistivity`, `reachable_range`,
//!   `mobility_species`, `resistivity_of_mix`, `resistivity_of_equilibrium`.
//! - `uncertainty`: `propagate`. `units`: `parse_quantity`, `parse_quantity_bare_in`,
//!   `parse_spread`, `format_quantity`, `Unit::{to_default, from_default}`.
//!
//! Not called here, and why:
//! - Names and fixed-table lookups (`id`, `name`, `reference`, `as_str`, `field`, `unit`,
//!   `output_name`, `value`, `applicable`, `kind`, `bare_unit`, `settable`, `from_name`,
//!   `examples`, `default_unit`, `allowed_units`, `units`, `majority`, `IonizationModel::from_id`,
//!   `MobilityModel::from_id`, `invalid_field`) and counters (`count`, `lot_count`,
//!   `wafer_count`, `counts`, `notes`, `lines`, `quantity`, `min`, `max`, `is_exact`): they
//!   take no number, or return a field or a table entry.
//! - Constructors that only store their arguments (`Measured::exact/absolute/relative`,
//!   `PhysicsOptions::with_mobility`, `LotBook::new`, `LotReader::new`, `Moments::new`,
//!   `Moments::push`, `MedianSketch::new`, `RowCounts::add`): the functions that read what
//!   they store are called here with the same extreme values.
//! - Parameter sets returned by value (`materials::silicon()` and the others, `builtin`,
//!   `slotboom_de_graaff_1977`, `misiakos_tsamakis_1993`, `ConversionModel::all`): they take
//!   no input; they are the inputs here, and `validate` is checked on each.

use bandgauge_core::bgn;
use bandgauge_core::compare::{self, ConversionInput, ConversionModel};
use bandgauge_core::constants;
use bandgauge_core::dos::{self, PowerLaw};
use bandgauge_core::empirical::{self, EmpiricalInput, EmpiricalRelation};
use bandgauge_core::fermi_dirac;
use bandgauge_core::intrinsic::{self, IntrinsicModel};
use bandgauge_core::ionization::{self, IonizationModel};
use bandgauge_core::lots::{self, LotBook, ReadOptions, SpecQuantity, SpecWindow, stats};
use bandgauge_core::materials::{self, Dopant, DopantDensity, DopantKind, Material};
use bandgauge_core::mobility::{self, Carrier, ConductivityType, MobilityModel};
use bandgauge_core::neutrality::{self, SolveOptions};
use bandgauge_core::probe::{self, ProbeGeometry, ProbeReading, ReadingTemperature};
use bandgauge_core::resistivity::{self, PhysicsOptions};
use bandgauge_core::sweep;
use bandgauge_core::uncertainty::{self, Measured, MeasuredInput, UncertaintyRequest};
use bandgauge_core::units::{self, QuantityKind};
use bandgauge_core::{BgnModel, lots::stats::MedianSketch, lots::stats::Moments};
use proptest::prelude::*;
use std::fmt::Debug;

#[path = "../../fuzz/src/checks/finite.rs"]
mod finite;
use finite::non_finite_tokens;

// ---------------------------------------------------------------------------------------------
// Strategies: the awkward floats mixed with log-uniform ranges
// ---------------------------------------------------------------------------------------------

/// Floats that break naive code: NaN, both infinities, both zeros, subnormals, the extremes of
/// the f64 range and plain negatives.
fn special() -> impl Strategy<Value = f64> {
    prop::sample::select(vec![
        f64::NAN,
        -f64::NAN,
        f64::INFINITY,
        f64::NEG_INFINITY,
        0.0,
        -0.0,
        f64::MIN_POSITIVE,
        5e-324,
        -5e-324,
        1e-310,
        f64::MAX,
        f64::MIN,
        -1.0,
        -300.0,
        1.0,
    ])
}

/// 10^x with x uniform in [lo, hi]: every decade is as likely as every other.
fn log_uniform(lo_decade: f64, hi_decade: f64) -> impl Strategy<Value = f64> {
    (lo_decade..=hi_decade).prop_map(|x| 10f64.powf(x))
}

/// Temperatures, K: 1e-3 to 1e4 K, plus the special values, plus 200-500 K (where every
/// mobility model holds, so that the conversions get past their range checks).
fn temperature_k() -> impl Strategy<Value = f64> {
    prop_oneof![1 => special(), 4 => log_uniform(-3.0, 4.0), 8 => 200.0..500.0f64]
}

/// Densities, cm^-3: 0 and 1 to 1e23 cm^-3, plus the special values, plus the doping range
/// of the models (1e12 to 1e21 cm^-3).
fn density_cm3() -> impl Strategy<Value = f64> {
    prop_oneof![
        1 => special(),
        1 => Just(0.0),
        4 => log_uniform(0.0, 23.0),
        8 => log_uniform(12.0, 21.0),
    ]
}

/// Resistivities, ohm cm: 1e-8 to 1e10 ohm cm (far past any material), plus the specials,
/// plus the range of doped silicon (1e-3 to 1e4 ohm cm).
fn resistivity_ohm_cm() -> impl Strategy<Value = f64> {
    prop_oneof![1 => special(), 4 => log_uniform(-8.0, 10.0), 8 => log_uniform(-3.0, 4.0)]
}

/// Any size and sign: 1e-300 to 1e300 of either sign, plus the specials.
fn any_real() -> impl Strategy<Value = f64> {
    prop_oneof![
        1 => special(),
        2 => log_uniform(-300.0, 300.0),
        1 => log_uniform(-300.0, 300.0).prop_map(|v| -v),
        2 => -50.0..50.0f64,
    ]
}

/// Lengths, cm (thickness, spacing, diameter): 1e-9 to 1e5 cm, plus the specials, plus wafer
/// and probe sizes (0.01 to 30 cm).
fn length_cm() -> impl Strategy<Value = f64> {
    prop_oneof![1 => special(), 4 => log_uniform(-9.0, 5.0), 8 => log_uniform(-2.0, 1.5)]
}

/// Either probe geometry.
fn geometry() -> impl Strategy<Value = ProbeGeometry> {
    prop::sample::select(ProbeGeometry::ALL.to_vec())
}

/// Electrical readings (V, A): 1e-15 to 1e6, plus the specials, plus bench values (1e-6 to
/// 1e-1).
fn reading() -> impl Strategy<Value = f64> {
    prop_oneof![1 => special(), 4 => log_uniform(-15.0, 6.0), 8 => log_uniform(-6.0, -1.0)]
}

/// Temperatures in degrees Celsius: -300 to 1e4 C, plus the specials, plus the bench range.
fn temperature_c() -> impl Strategy<Value = f64> {
    prop_oneof![
        1 => special(),
        2 => -300.0..400.0f64,
        1 => log_uniform(-3.0, 4.0),
        2 => 15.0..40.0f64,
    ]
}

/// Energies in eV: -10 to 10 eV, plus the specials.
fn energy_ev() -> impl Strategy<Value = f64> {
    prop_oneof![1 => special(), 4 => -10.0..10.0f64]
}

/// A built-in material that shows as its id in a failure report (the full parameter set
/// would bury the values that failed).
#[derive(Clone)]
struct Mat(Material);

impl Debug for Mat {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}", self.0.id)
    }
}

impl std::ops::Deref for Mat {
    type Target = Material;
    fn deref(&self) -> &Material {
        &self.0
    }
}

fn material() -> impl Strategy<Value = Mat> {
    prop::sample::select(
        materials::builtin()
            .into_iter()
            .map(Mat)
            .collect::<Vec<_>>(),
    )
}

/// A material with its own dopant symbols, or a symbol none of them has.
fn material_and_dopant() -> impl Strategy<Value = (Mat, String)> {
    material().prop_flat_map(|m| {
        let symbols: Vec<String> = m.dopants.iter().map(|d| d.symbol.to_string()).collect();
        let unknown = vec!["Xx".to_owned(), String::new()];
        (
            Just(m),
            prop_oneof![6 => prop::sample::select(symbols), 1 => prop::sample::select(unknown)],
        )
    })
}

/// A doping list of up to three species of the material, densities from `density_cm3`.
fn doping(material: &Material) -> impl Strategy<Value = Vec<Doped>> + use<> {
    let dopants = material.dopants.clone();
    prop::collection::vec((prop::sample::select(dopants), density_cm3()), 0..=3).prop_map(|rows| {
        rows.into_iter()
            .map(|(dopant, density_cm3)| {
                Doped(DopantDensity {
                    dopant,
                    density_cm3,
                })
            })
            .collect()
    })
}

/// A dopant density that shows as `symbol:density` in a failure report.
#[derive(Clone)]
struct Doped(DopantDensity);

impl Debug for Doped {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}:{:e}", self.0.dopant.symbol, self.0.density_cm3)
    }
}

fn plain(doping: &[Doped]) -> Vec<DopantDensity> {
    doping.iter().map(|d| d.0.clone()).collect()
}

/// Mostly the default options (which every material takes), else any combination.
fn solve_options() -> impl Strategy<Value = SolveOptions> {
    prop_oneof![2 => Just(SolveOptions::default()), 1 => any_solve_options()]
}

fn any_solve_options() -> impl Strategy<Value = SolveOptions> {
    (
        prop::sample::select(vec![
            IntrinsicModel::DensityOfStates,
            IntrinsicModel::DirectFit,
        ]),
        prop::option::of(Just(BgnModel::MaterialSet)),
        prop::sample::select(IonizationModel::ALL.to_vec()),
    )
        .prop_map(
            |(intrinsic_model, band_gap_narrowing, ionization_model)| SolveOptions {
                intrinsic_model,
                band_gap_narrowing,
                ionization_model,
            },
        )
}

fn mobility_model() -> impl Strategy<Value = MobilityModel> {
    prop::sample::select(MobilityModel::ALL.to_vec())
}

fn conversion_model() -> impl Strategy<Value = ConversionModel> {
    prop::sample::select(ConversionModel::all())
}

fn physics_options() -> impl Strategy<Value = PhysicsOptions> {
    (mobility_model(), solve_options())
        .prop_map(|(mobility, solve)| PhysicsOptions { mobility, solve })
}

/// Mostly a material, dopant and conversion model where the model covers the dopant (so that
/// the conversion gets past its applicability check), else any combination.
fn covered_conversion() -> impl Strategy<Value = (Mat, String, ConversionModel)> {
    let mut covered = Vec::new();
    for m in materials::builtin() {
        for d in &m.dopants {
            for model in ConversionModel::all() {
                if model.applicable(&m.id, &d.symbol) {
                    covered.push((Mat(m.clone()), d.symbol.to_string(), model));
                }
            }
        }
    }
    prop_oneof![
        4 => prop::sample::select(covered),
        1 => (material_and_dopant(), conversion_model()).prop_map(|((m, d), model)| (m, d, model)),
    ]
}

/// As [`covered_conversion`] for the physics models, with their solve options.
fn covered_physics() -> impl Strategy<Value = (Mat, String, PhysicsOptions)> {
    (covered_conversion(), mobility_model(), solve_options()).prop_map(
        |((m, d, model), fallback, solve)| {
            let mobility = match model {
                ConversionModel::Physics(mobility) => mobility,
                _ => fallback,
            };
            (m, d, PhysicsOptions { mobility, solve })
        },
    )
}

fn relation() -> impl Strategy<Value = EmpiricalRelation> {
    prop::sample::select(vec![
        EmpiricalRelation::Boron,
        EmpiricalRelation::Phosphorus,
    ])
}

/// A value with no uncertainty, a usual one (up to 30 %, relative or absolute), or any
/// half-width at all.
fn measured(value: impl Strategy<Value = f64>) -> impl Strategy<Value = Measured> {
    let tolerance = prop_oneof![
        1 => Just(None),
        3 => (any::<bool>(), 0.0..0.3f64).prop_map(|(relative, f)| Some((relative, f, true))),
        1 => (any::<bool>(), any_real()).prop_map(|(relative, u)| Some((relative, u, false))),
    ];
    (value, tolerance).prop_map(|(value, tolerance)| match tolerance {
        None => Measured::exact(value),
        Some((true, fraction, _)) => Measured::relative(value, fraction),
        Some((false, fraction, true)) => Measured::absolute(value, fraction * value.abs()),
        Some((false, half_width, false)) => Measured::absolute(value, half_width),
    })
}

// ---------------------------------------------------------------------------------------------
// The checks
// ---------------------------------------------------------------------------------------------

/// The rule for fallible functions: Ok with every number finite, or an error with a message.
fn check_result<T: Debug, E: std::fmt::Display + Debug>(
    what: &str,
    result: &Result<T, E>,
) -> Result<(), TestCaseError> {
    match result {
        Ok(value) => {
            let bad = non_finite_tokens(value);
            prop_assert!(bad.is_empty(), "{what}: Ok holds {bad:?}: {value:?}");
        }
        Err(error) => {
            let message = error.to_string();
            prop_assert!(
                !message.trim().is_empty(),
                "{what}: empty message: {error:?}"
            );
        }
    }
    Ok(())
}

/// The rule for an `Option` result: `None`, or `Some` with every number finite.
fn check_option<T: Debug>(what: &str, value: &Option<T>) -> Result<(), TestCaseError> {
    if let Some(v) = value {
        let bad = non_finite_tokens(v);
        prop_assert!(bad.is_empty(), "{what}: Some holds {bad:?}: {v:?}");
    }
    Ok(())
}

/// The rule for infallible scalar helpers: finite output for finite input in the physical
/// domain. Outside it (a negative density, an infinite temperature, NaN) the helper has no
/// error channel and may give NaN; that it did not panic is what the call checks.
fn check_scalar(
    what: &str,
    inputs: &[f64],
    in_domain: bool,
    out: f64,
) -> Result<(), TestCaseError> {
    let finite_in = inputs.iter().all(|v| v.is_finite());
    if in_domain && finite_in {
        prop_assert!(out.is_finite(), "{what}{inputs:?} = {out}");
    }
    Ok(())
}

fn in_range(value: f64, lo: f64, hi: f64) -> bool {
    (lo..=hi).contains(&value)
}

/// Temperatures inside the sampled physical range.
fn physical_t(t: f64) -> bool {
    in_range(t, 1e-3, 1e4)
}

fn physical_n(n: f64) -> bool {
    in_range(n, 0.0, 1e23)
}

// ---------------------------------------------------------------------------------------------
// Infallible scalar helpers: bandgap, bgn, constants, dos, fermi_dirac, intrinsic, ionization
// ---------------------------------------------------------------------------------------------

proptest! {
    #![proptest_config(ProptestConfig::with_cases(512))]

    #[test]
    fn thermal_energy_band_gap_and_densities_of_states(
        m in material(),
        t in temperature_k(),
        mass in any_real(),
    ) {
        let domain = physical_t(t);
        check_scalar("thermal_energy_ev", &[t], domain, constants::thermal_energy_ev(t))?;
        // Varshni: Eg0 - alpha T^2/(T + beta), finite for every T >= 0.
        check_scalar("band_gap_ev", &[t], domain, m.varshni.band_gap_ev(t))?;
        check_scalar("nc.at", &[t], domain, m.nc.at(t))?;
        check_scalar("nv.ln_at", &[t], domain, m.nv.ln_at(t))?;
        check_scalar(
            "effective_density_cm3",
            &[mass, t],
            domain && in_range(mass, 1e-3, 1e3),
            dos::effective_density_cm3(mass, t),
        )?;
        let law = PowerLaw::from_effective_mass(mass);
        check_scalar("from_effective_mass", &[mass], in_range(mass, 1e-3, 1e3), law.at_300k_cm3)?;
        let ln_ni = m.nc.ln_at(t) + m.nv.ln_at(t);
        check_scalar(
            "ln_from_dos",
            &[t],
            domain,
            intrinsic::ln_from_dos(m.nc.ln_at(t), m.nv.ln_at(t), m.varshni.band_gap_ev(t), t),
        )?;
        prop_assert!(!ln_ni.is_nan() || t.is_nan() || t < 0.0);
        // ni itself underflows to 0 at cryogenic temperatures: finite, not NaN.
        check_scalar("intrinsic_density_cm3", &[t], domain, m.intrinsic_density_cm3(t))?;
        check_scalar(
            "from_dos_cm3",
            &[t],
            domain,
            intrinsic::from_dos_cm3(m.nc.at(t), m.nv.at(t), m.varshni.band_gap_ev(t), t),
        )?;
        if let Some(fit) = &m.intrinsic_fit {
            check_scalar("fit.ln_density_cm3", &[t], domain, fit.ln_density_cm3(t))?;
            check_result("fit.density_cm3", &fit.density_cm3(t))?;
        }
    }

    #[test]
    fn gap_narrowing_and_dopant_levels(
        m in material(),
        n in density_cm3(),
        e0 in energy_ev(),
        alpha in any_real(),
    ) {
        let domain = physical_n(n);
        if let Some(p) = &m.band_gap_narrowing {
            check_scalar("narrowing_ev", &[n], domain, p.narrowing_ev(n))?;
        }
        check_scalar(
            "slotboom narrowing_ev",
            &[n],
            domain,
            bgn::slotboom_de_graaff_1977().narrowing_ev(n),
        )?;
        for p in [
            ionization::ALTERMATT_SI_PHOSPHORUS,
            ionization::ALTERMATT_SI_ARSENIC,
            ionization::ALTERMATT_SI_BORON,
        ] {
            check_scalar("altermatt level_ev", &[n], domain, p.level_ev(n))?;
            let b = p.localized_fraction(n);
            check_scalar("localized_fraction", &[n], domain, b)?;
            check_scalar("delocalized_fraction", &[n], domain, p.delocalized_fraction(n))?;
            if domain {
                prop_assert!((0.0..=1.0).contains(&b), "b({n}) = {b}");
            }
        }
        let pb = ionization::PEARSON_BARDEEN_SILICON;
        for kind in [DopantKind::Donor, DopantKind::Acceptor] {
            check_scalar("alpha_ev_cm", &[], true, pb.alpha_ev_cm(kind))?;
        }
        check_scalar(
            "pearson_bardeen_level_ev",
            &[e0, alpha, n],
            domain && e0.is_finite() && in_range(alpha.abs(), 0.0, 1e-3),
            ionization::pearson_bardeen_level_ev(e0, alpha, n),
        )?;
        for dopant in &m.dopants {
            for model in IonizationModel::ALL {
                let level = ionization::effective_level(&m, dopant, n, model);
                if domain {
                    let bad = non_finite_tokens(&level);
                    prop_assert!(bad.is_empty(), "effective_level({n}) = {level:?}");
                }
            }
        }
    }

    #[test]
    fn fermi_dirac_integrals_and_occupancies(
        eta in any_real(),
        u in any_real(),
        g in any_real(),
        t in temperature_k(),
        de in energy_ev(),
    ) {
        // F_1/2 overflows f64 only for eta near 1e205; F_-1/2 is finite everywhere.
        let moderate = in_range(eta, -1e200, 1e200);
        check_scalar("f_half", &[eta], moderate, fermi_dirac::f_half(eta))?;
        check_scalar("ln_f_half", &[eta], eta.is_finite(), fermi_dirac::ln_f_half(eta))?;
        check_scalar("f_minus_half", &[eta], moderate, fermi_dirac::f_minus_half(eta))?;
        check_result("f_half_inverse", &fermi_dirac::f_half_inverse(u))?;
        check_result("ln_f_half_inverse", &fermi_dirac::ln_f_half_inverse(u))?;
        let domain = physical_t(t) && de.is_finite() && in_range(g, 1e-3, 1e3);
        let fd = ionization::donor_ionized_fraction(de, g, t);
        let fa = ionization::acceptor_ionized_fraction(de, g, t);
        check_scalar("donor_ionized_fraction", &[de, g, t], domain, fd)?;
        check_scalar("acceptor_ionized_fraction", &[de, g, t], domain, fa)?;
        if domain {
            prop_assert!((0.0..=1.0).contains(&fd) && (0.0..=1.0).contains(&fa), "{fd} {fa}");
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Fallible functions: intrinsic, materials, mobility, neutrality, sweep
// ---------------------------------------------------------------------------------------------

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    #[test]
    fn intrinsic_density_of_every_model(
        m in material(),
        t in temperature_k(),
        model in prop::sample::select(vec![IntrinsicModel::DensityOfStates, IntrinsicModel::DirectFit]),
    ) {
        check_result("intrinsic_density", &intrinsic::intrinsic_density(&m, t, model))?;
    }

    #[test]
    fn materials_validate_and_refuse_bad_parameters(
        m in material(),
        e in any_real(),
        g in any_real(),
        mass in any_real(),
        eg0 in any_real(),
    ) {
        prop_assert!(m.validate().is_ok());
        check_result("by_id", &materials::by_id(&m.id))?;
        for d in &m.dopants {
            check_result("dopant", &m.dopant(&d.symbol))?;
            check_result("dopant_of_kind", &m.dopant_of_kind(&d.symbol, DopantKind::Donor))?;
        }
        let made = Dopant::new("Q", DopantKind::Donor, e, g, "extreme test");
        check_result("Dopant::new", &made)?;
        if made.is_ok() {
            prop_assert!(e.is_finite() && e >= 0.0 && g.is_finite() && g > 0.0);
        }
        let mut odd = m.0.clone();
        odd.nc = PowerLaw::from_effective_mass(mass);
        odd.varshni.eg0_ev = eg0;
        let checked = odd.validate();
        check_result("validate", &checked)?;
        check_result("validate_parameters", &odd.validate_parameters())?;
    }

    #[test]
    fn mobility_of_every_model_material_and_dopant(
        (m, symbol) in material_and_dopant(),
        model in mobility_model(),
        n in density_cm3(),
        t in temperature_k(),
    ) {
        let result = mobility::mobility(model, &m.id, &symbol, n, t);
        check_result("mobility", &result)?;
        if let Ok(mu) = &result {
            check_scalar("of(Electron)", &[], true, mu.of(Carrier::Electron))?;
            check_scalar("of(Hole)", &[], true, mu.of(Carrier::Hole))?;
        }
        check_option("max_density_cm3", &model.max_density_cm3(&m.id, &symbol))?;
        check_option("temperature_range_k", &model.temperature_range_k(&m.id))?;
        check_result("masetti", &mobility::masetti_cm2_per_v_s(&mobility::MASETTI_HOLES_BORON, n))?;
        check_result("arora", &mobility::arora_cm2_per_v_s(&mobility::ARORA_ELECTRONS, n, t))?;
        check_result(
            "caughey_thomas",
            &mobility::caughey_thomas_cm2_per_v_s(&mobility::SOTOODEH_GAAS_ELECTRONS, n, t),
        )?;
        check_result(
            "lattice",
            &mobility::lattice_cm2_per_v_s(&mobility::SILICON_LATTICE_HOLES, n, t),
        )?;
    }

    #[test]
    fn neutrality_solves_or_refuses(
        (m, doping, options) in material().prop_flat_map(|m| {
            let d = doping(&m);
            (Just(m), d, solve_options())
        }),
        t in temperature_k(),
    ) {
        let doping = plain(&doping);
        check_result("neutrality::solve", &neutrality::solve(&m, t, &doping, &options))?;
    }

    #[test]
    fn sweeps_and_grids(
        (m, doping, options) in material().prop_flat_map(|m| {
            let d = doping(&m);
            (Just(m), d, solve_options())
        }),
        start in temperature_k(),
        stop in temperature_k(),
        points in prop_oneof![Just(0usize), Just(1), 2..6usize, Just(sweep::MAX_GRID_POINTS + 1)],
    ) {
        let doping = plain(&doping);
        let grid = sweep::linear_grid_k(start, stop, points);
        check_result("linear_grid_k", &grid)?;
        let temperatures = grid.unwrap_or_else(|_| vec![start, stop]);
        for (i, result) in sweep::temperature_sweep(&m, &temperatures, &doping, &options)
            .iter()
            .enumerate()
        {
            check_result(&format!("temperature_sweep[{i}]"), result)?;
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Fallible functions: empirical, resistivity, compare, probe, uncertainty
// ---------------------------------------------------------------------------------------------

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    #[test]
    fn empirical_relations_both_ways(
        relation in relation(),
        (m, symbol) in material_and_dopant(),
        rho in resistivity_ohm_cm(),
        n in density_cm3(),
    ) {
        check_result(
            "density_from_resistivity_cm3",
            &empirical::density_from_resistivity_cm3(relation, rho),
        )?;
        check_result(
            "resistivity_from_density_ohm_cm",
            &empirical::resistivity_from_density_ohm_cm(relation, n),
        )?;
        check_result("for_dopant", &empirical::EmpiricalRelation::for_dopant(&m.id, &symbol))?;
        check_result(
            "empirical::convert rho",
            &empirical::convert(&m.id, &symbol, EmpiricalInput::ResistivityOhmCm(rho)),
        )?;
        check_result(
            "empirical::convert n",
            &empirical::convert(&m.id, &symbol, EmpiricalInput::DensityCm3(n)),
        )?;
        let range = relation.valid_range();
        prop_assert!(non_finite_tokens(&range).is_empty());
    }

    #[test]
    fn physics_resistivity_both_ways(
        (m, symbol, options) in covered_physics(),
        rho in resistivity_ohm_cm(),
        n in density_cm3(),
        t in temperature_k(),
    ) {
        check_result(
            "resistivity_from_density",
            &resistivity::resistivity_from_density(&m, &symbol, n, t, &options),
        )?;
        check_result(
            "density_from_resistivity",
            &resistivity::density_from_resistivity(&m, &symbol, rho, t, &options),
        )?;
        check_result(
            "reachable_range",
            &resistivity::reachable_range(&m, &symbol, t, &options),
        )?;
    }

    #[test]
    fn resistivity_of_mixtures(
        (m, doping, options) in material().prop_flat_map(|m| {
            let d = doping(&m);
            (Just(m), d, physics_options())
        }),
        t in temperature_k(),
        majority in prop::sample::select(vec![ConductivityType::N, ConductivityType::P]),
    ) {
        let doping = plain(&doping);
        let species = resistivity::mobility_species(&m, &doping, majority);
        check_option("mobility_species", &species)?;
        check_result(
            "resistivity_of_mix",
            &resistivity::resistivity_of_mix(&m, t, &doping, &options),
        )?;
        if let Ok(eq) = neutrality::solve(&m, t, &doping, &options.solve) {
            check_result(
                "resistivity_of_equilibrium",
                &resistivity::resistivity_of_equilibrium(&m, &doping, eq, &options),
            )?;
        }
    }

    #[test]
    fn conversions_and_comparisons(
        (m, symbol, model) in covered_conversion(),
        solve in solve_options(),
        value in prop_oneof![resistivity_ohm_cm(), density_cm3()],
        by_density in any::<bool>(),
        t in temperature_k(),
    ) {
        let input = if by_density {
            ConversionInput::DensityCm3(value)
        } else {
            ConversionInput::ResistivityOhmCm(value)
        };
        check_result(
            "compare::convert",
            &compare::convert(&m, &symbol, input, t, model, &solve),
        )?;
        check_result("compare::compare", &compare::compare(&m, &symbol, input, t, &solve))?;
        check_option("default_for", &ConversionModel::default_for(&m.id, &symbol, t))?;
        check_result("from_id", &ConversionModel::from_id(model.id()))?;
    }

    #[test]
    fn probe_formulas(
        volts in reading(),
        amps in reading(),
        spacing in length_cm(),
        thickness in length_cm(),
        diameter in length_cm(),
        rho in resistivity_ohm_cm(),
        sheet in any_real(),
    ) {
        check_result("sheet_resistance_ohm_sq", &probe::sheet_resistance_ohm_sq(rho, thickness))?;
        check_result(
            "resistivity_from_sheet_ohm_cm",
            &probe::resistivity_from_sheet_ohm_cm(sheet, thickness),
        )?;
        check_result(
            "thin_sheet_resistance_ohm_sq",
            &probe::thin_sheet_resistance_ohm_sq(volts, amps),
        )?;
        check_result(
            "semi_infinite_resistivity_ohm_cm",
            &probe::semi_infinite_resistivity_ohm_cm(volts, amps, spacing),
        )?;
        check_result("thickness_correction", &probe::thickness_correction(thickness, spacing))?;
        check_result("diameter_correction", &probe::diameter_correction(diameter, spacing))?;
    }

    #[test]
    fn probe_readings_with_temperature_correction(
        (m, symbol, options) in covered_physics(),
        volts in reading(),
        amps in reading(),
        spacing in length_cm(),
        geometry in geometry(),
        thickness in prop::option::of(length_cm()),
        diameter in prop::option::of(length_cm()),
        rho in resistivity_ohm_cm(),
        tc in temperature_c(),
        corrected in any::<bool>(),
    ) {
        check_result(
            "temperature_correction_to_23c",
            &probe::temperature_correction_to_23c(&m, &symbol, rho, tc, &options),
        )?;
        let reading = ProbeReading {
            volts,
            amps,
            spacing_cm: spacing,
            geometry,
            thickness_cm: thickness,
            diameter_cm: diameter,
            temperature: corrected.then(|| ReadingTemperature {
                temperature_c: tc,
                material: m.0.clone(),
                dopant: symbol.clone(),
                mobility: options.mobility,
            }),
        };
        check_result("probe::evaluate", &probe::evaluate(&reading))?;
    }

    #[test]
    fn uncertainty_intervals(
        (m, symbol, model) in covered_conversion(),
        solve in solve_options(),
        kind in 0..3u8,
        value in measured(prop_oneof![resistivity_ohm_cm(), density_cm3()]),
        volts in measured(reading()),
        amps in measured(reading()),
        spacing in measured(length_cm()),
        geometry in geometry(),
        thickness in prop::option::of(measured(length_cm())),
        diameter in prop::option::of(length_cm()),
        t in measured(temperature_k()),
        spread in any::<bool>(),
    ) {
        let input = match kind {
            0 => MeasuredInput::Resistivity(value),
            1 => MeasuredInput::Density(value),
            _ => MeasuredInput::Probe {
                volts,
                amps,
                spacing_cm: spacing,
                geometry,
                thickness_cm: thickness,
                diameter_cm: diameter,
            },
        };
        let request = UncertaintyRequest {
            material: m.0,
            dopant: symbol,
            input,
            temperature_k: t,
            model,
            solve,
            include_model_spread: spread,
        };
        check_result("uncertainty::propagate", &uncertainty::propagate(&request))?;
    }
}

// ---------------------------------------------------------------------------------------------
// units, lots (reader, book, verdicts, statistics)
// ---------------------------------------------------------------------------------------------

/// A number written the ways a person or an export might write it.
fn number_text() -> impl Strategy<Value = String> {
    prop_oneof![
        any_real().prop_map(|v| format!("{v}")),
        any_real().prop_map(|v| format!("{v:e}")),
        prop::sample::select(vec![
            "NaN",
            "inf",
            "-inf",
            "infinity",
            "1e999",
            "-1e999",
            "1e-999",
            "0x10",
            "1_000",
            "2,5",
            "--1",
            "+-1",
            "1e",
            "e5",
            ".",
            "-.",
            "1.2.3",
            "10^400",
            "2x10^-400",
            "",
            " ",
        ])
        .prop_map(str::to_owned),
    ]
}

fn unit_text() -> impl Strategy<Value = String> {
    prop::sample::select(vec![
        "", " K", "C", " °C", "cm^-3", " m^-3", "ohm-cm", " mohm-cm", "kohm-cm", "ohm-m", "um",
        " mm", "nm", " m", "mV", "uA", "nA", " ohm/sq", "kohm/sq", "%", " furlong", "Ω·cm",
    ])
    .prop_map(str::to_owned)
}

fn quantity_kind() -> impl Strategy<Value = QuantityKind> {
    prop::sample::select(QuantityKind::ALL.to_vec())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(512))]

    #[test]
    fn unit_parsing_and_formatting(
        number in number_text(),
        unit in unit_text(),
        kind in quantity_kind(),
        value in any_real(),
    ) {
        let text = format!("{number}{unit}");
        check_result("parse_quantity", &units::parse_quantity(&text, kind))?;
        check_result("parse_spread", &units::parse_spread(&text, kind))?;
        let bare = kind.default_unit();
        check_result(
            "parse_quantity_bare_in",
            &units::parse_quantity_bare_in(&text, kind, bare),
        )?;
        check_result(
            "format_quantity",
            &units::format_quantity(value, kind, unit.trim()),
        )?;
        for u in kind.units() {
            let there = u.to_default(value);
            let back = u.from_default(value);
            // Unit scaling is by powers of ten up to 1e9: finite stays finite below 1e299.
            let domain = value.abs() < 1e290;
            check_scalar("to_default", &[value], domain, there)?;
            check_scalar("from_default", &[value], domain, back)?;
        }
    }

    #[test]
    fn spec_windows_verdicts_and_cpk(
        min in prop::option::of(any_real()),
        max in prop::option::of(any_real()),
        density in any::<bool>(),
        value in any_real(),
        low in any_real(),
        high in any_real(),
        mean in any_real(),
        std in any_real(),
        min_text in number_text(),
        max_text in number_text(),
    ) {
        let quantity = if density { SpecQuantity::Density } else { SpecQuantity::Resistivity };
        let window = SpecWindow::new(quantity, min, max);
        check_result("SpecWindow::new", &window)?;
        check_result(
            "SpecWindow::parse",
            &SpecWindow::parse(quantity, &format!("{min_text}:{max_text}")),
        )?;
        if let Ok(w) = window {
            let _ = w.contains(value);
            let j = w.judge(value, low, high);
            let cpk = w.cpk(mean, std);
            let _ = w.to_string();
            // judge and cpk are infallible: they take the site statistics of a lot book, which
            // are resistivities or densities. Within 1e-100 to 1e100 (limits, values, spreads)
            // their ratios cannot overflow, and the answer must be finite.
            let moderate = |v: f64| v == 0.0 || (1e-100..=1e100).contains(&v.abs());
            let limits_moderate = [w.min(), w.max()].into_iter().flatten().all(moderate);
            if limits_moderate && [value, low, high].into_iter().all(moderate) {
                prop_assert!(non_finite_tokens(&j).is_empty(), "judge: {j:?}");
            }
            if limits_moderate && moderate(mean) && moderate(std) {
                check_option("cpk", &cpk)?;
            }
        }
    }

    #[test]
    fn statistics_functions(
        a in any_real(),
        b in any_real(),
        x in any_real(),
        p in prop_oneof![any_real(), 0.0..=1.0f64],
        dof in prop_oneof![any_real(), 1.0..1e6f64],
    ) {
        // Distribution functions are defined on their domain; outside it they give NaN, never
        // panic. Inside it (with moderate arguments) they are finite.
        let ln_gamma_domain = x > 0.0 && x < 1e300;
        check_scalar("ln_gamma", &[x], ln_gamma_domain, stats::ln_gamma(x))?;
        let beta_domain = a > 0.0 && b > 0.0 && a < 1e6 && b < 1e6 && (0.0..=1.0).contains(&x);
        check_scalar_nan_ok("regularized_incomplete_beta", beta_domain, stats::regularized_incomplete_beta(a, b, x))?;
        let gamma_domain = a > 0.0 && a < 1e6 && (0.0..1e300).contains(&x);
        check_scalar_nan_ok("regularized_gamma_q", gamma_domain, stats::regularized_gamma_q(a, x))?;
        // A subnormal dof is outside the domain (documented: dof/2 underflows to 0).
        let t_domain = (f64::MIN_POSITIVE..1e300).contains(&dof) && x.is_finite();
        check_scalar_nan_ok("student_t_cdf", t_domain, stats::student_t_cdf(x, dof))?;
        check_scalar_nan_ok("student_t_two_sided_p", t_domain, stats::student_t_two_sided_p(x, dof))?;
        check_scalar_nan_ok("student_t_pdf", t_domain, stats::student_t_pdf(x, dof))?;
        let q_domain = (f64::MIN_POSITIVE..1e300).contains(&dof) && p > 0.0 && p < 1.0;
        check_scalar_nan_ok("student_t_quantile", q_domain, stats::student_t_quantile(p, dof))?;
        let chi_domain = (f64::MIN_POSITIVE..1e6).contains(&dof) && (0.0..1e300).contains(&x);
        check_scalar_nan_ok("chi_squared_survival", chi_domain, stats::chi_squared_survival(x, dof))?;
    }

    #[test]
    fn statistics_of_groups(
        first in prop::collection::vec(any_real(), 0..12),
        second in prop::collection::vec(any_real(), 0..12),
        third in prop::collection::vec(resistivity_ohm_cm(), 0..12),
    ) {
        check_result("welch_t_test", &stats::welch_t_test(&first, &second))?;
        check_result(
            "kruskal_wallis",
            &stats::kruskal_wallis(&[first.as_slice(), second.as_slice(), third.as_slice()]),
        )?;
        let moments = Moments::of(&third);
        let mut sketch = MedianSketch::new();
        let mut many = MedianSketch::new();
        for v in &third {
            sketch.push(*v);
        }
        // Past the exact limit the sketch bins ln(value): zero, negative and non-finite
        // values must not panic there either.
        for i in 0..(stats::EXACT_MEDIAN_LIMIT + 10) {
            many.push(third.get(i % third.len().max(1)).copied().unwrap_or(1.0));
        }
        let merged = MedianSketch::merged([&sketch, &many]);
        let _ = (moments.mean(), moments.sample_std(), moments.min(), moments.max());
        let _ = (sketch.median(), many.median(), merged.median());
        let _ = many.count_where(|v| v > 1.0);
        let all_positive_finite = third.iter().all(|v| v.is_finite() && *v > 0.0 && *v < 1e300);
        if all_positive_finite {
            check_option("Summary::from_parts", &stats::Summary::from_parts(&moments, &sketch))?;
            check_option("median", &many.median())?;
        }
    }
}

/// Like [`check_scalar`] for statistics, which may give NaN outside their domain by design.
fn check_scalar_nan_ok(what: &str, in_domain: bool, out: f64) -> Result<(), TestCaseError> {
    if in_domain {
        prop_assert!(out.is_finite(), "{what} = {out} inside its domain");
    }
    Ok(())
}

/// One data row of a lot file with awkward numbers in its measurement columns.
fn lot_row() -> impl Strategy<Value = String> {
    (
        number_text(),
        unit_text(),
        number_text(),
        number_text(),
        number_text(),
        number_text(),
        number_text(),
        prop::sample::select(vec!["B", "P", "As", "Sb", "n", "p", "Q", ""]),
    )
        .prop_map(|(rho, unit, sheet, thick, volts, amps, unc, dopant)| {
            let rho = if rho.contains(',') {
                format!("\"{rho}\"")
            } else {
                rho
            };
            let quote = |t: String| {
                if t.contains(',') {
                    format!("\"{t}\"")
                } else {
                    t
                }
            };
            format!(
                "L1,W1,s,{dopant},{rho}{unit},{},{},{},{},1 mm,{}",
                quote(sheet),
                quote(thick),
                quote(volts),
                quote(amps),
                quote(unc)
            )
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(256))]

    #[test]
    fn lot_files_with_extreme_numbers(
        rows in prop::collection::vec(lot_row(), 1..8),
        window in prop::option::of((any_real(), any_real())),
    ) {
        let header = "lot,wafer,site,dopant,resistivity,sheet_resistance,thickness,volts,amps,spacing,uncertainty";
        let text = format!("{header}\n{}\n", rows.join("\n"));
        let mut book = LotBook::new();
        let mut sites = Vec::new();
        let counts = lots::read_str(
            &text,
            &ReadOptions { default_dopant: Some("B".into()) },
            &mut book,
            &mut |outcome| {
                if let lots::RowOutcome::Converted(site) = outcome {
                    sites.push(format!("{site:?}"));
                }
            },
        );
        check_result("read_str", &counts)?;
        for site in &sites {
            // A converted site carries finite numbers only (Site borrows from the reader, so
            // its Debug text is checked).
            let bad = non_finite_tokens(site);
            prop_assert!(bad.is_empty(), "site with {bad:?}: {site}");
        }
        let spec = window.and_then(|(lo, hi)| {
            SpecWindow::new(SpecQuantity::Resistivity, Some(lo.abs().min(hi.abs())), Some(lo.abs().max(hi.abs()))).ok()
        });
        let report = book.report(spec.as_ref());
        let bad = non_finite_tokens(&report);
        prop_assert!(bad.is_empty(), "report with {bad:?}: {report:?}");
        prop_assert_eq!(counts.map(|c| c.read).unwrap_or(0), book.counts().read);
    }

    #[test]
    fn dopant_names_and_lot_settings(
        name in "[A-Za-z]{0,10}",
        thickness in number_text(),
        unit in unit_text(),
        uncertainty in number_text(),
    ) {
        check_result("parse_dopant", &lots::parse_dopant(&name))?;
        let text = format!(
            "# lot: A\n# thickness: {thickness}{unit}\n# uncertainty: {uncertainty}\n\
             wafer,dopant,sheet_resistance\n1,B,100\n"
        );
        let mut book = LotBook::new();
        let counts = lots::read_str(&text, &ReadOptions::default(), &mut book, &mut |_| {});
        check_result("read_str with settings", &counts)?;
        let report = book.report(None);
        prop_assert!(non_finite_tokens(&report).is_empty(), "{report:?}");
    }
}

// ---------------------------------------------------------------------------------------------
// Exact cases that the strategies reach only by luck
// ---------------------------------------------------------------------------------------------

#[test]
fn the_token_scan_finds_non_finite_fields_and_ignores_text() {
    #[derive(Debug)]
    #[allow(dead_code)] // read through Debug only
    struct Probe {
        a: f64,
        b: Vec<Option<f64>>,
        note: &'static str,
    }
    let clean = Probe {
        a: 1.0,
        b: vec![Some(2.0), None],
        note: "inf NaN info",
    };
    assert!(non_finite_tokens(&clean).is_empty());
    let nested = Probe {
        a: 1.0,
        b: vec![None, Some(f64::NAN)],
        note: "",
    };
    assert_eq!(non_finite_tokens(&nested), ["NaN"]);
    let negative = Probe {
        a: f64::NEG_INFINITY,
        b: vec![],
        note: "\"quoted\" inf",
    };
    assert_eq!(non_finite_tokens(&negative), ["inf"]);
}

#[test]
fn every_builtin_material_solves_at_the_edges_of_the_temperature_range() {
    for m in materials::builtin() {
        for t in [
            bandgauge_core::neutrality::MIN_TEMPERATURE_K,
            1e-3,
            1e-2,
            1.0,
            1e4,
        ] {
            for d in &m.dopants {
                for n in [0.0, 1.0, 1e23] {
                    let doping = [DopantDensity {
                        dopant: d.clone(),
                        density_cm3: n,
                    }];
                    for model in IonizationModel::ALL {
                        let options = SolveOptions {
                            ionization_model: model,
                            ..SolveOptions::default()
                        };
                        let result = neutrality::solve(&m, t, &doping, &options);
                        let bad = result.as_ref().map(non_finite_tokens).unwrap_or_default();
                        assert!(
                            bad.is_empty(),
                            "{} {} {n:e} at {t} K ({model:?}): {result:?}",
                            m.id,
                            d.symbol
                        );
                    }
                }
            }
        }
    }
}
