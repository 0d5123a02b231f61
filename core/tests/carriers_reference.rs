//! Reference checks of the carrier-statistics core: band gaps, intrinsic density, worked examples, ionization models, freeze-out, errors.
//!
//! Every check value sits under a comment naming its source. Values marked
//! "mpmath reference" were computed by an independent implementation of the
//! same equations at 40 significant digits with mpmath 1.3.0 (polylogarithm
//! for F_1/2): `python3 core/benches/python/neutrality_scipy.py --reference`
//! (constant dopant levels) and `python3 core/tests/data/gen_ionization_reference.py`
//! (the density-dependent levels of Altermatt et al. 2006 and Pearson & Bardeen 1949).

// The mpmath reference values keep all 17 digits the reference printed.
#![allow(clippy::excessive_precision)]

use bandgauge_core::bgn::BgnModel;
use bandgauge_core::intrinsic::{self, IntrinsicModel};
use bandgauge_core::ionization::{self, IonizationModel};
use bandgauge_core::materials::{self, Dopant, DopantDensity, DopantKind, Material};
use bandgauge_core::neutrality::{self, CarrierError, Equilibrium, Regime, SolveOptions};
use bandgauge_core::sweep;

/// Published band gaps are quoted to 1 meV or better; the Varshni formula
/// evaluated is checked to rounding of the quoted digits.
const QUOTED_GAP_EV: f64 = 1e-6;
/// Textbook round values (0.66, 1.42 eV) agree with the fits to about 10 meV.
const TEXTBOOK_GAP_EV: f64 = 0.01;
/// The mpmath reference is exact to far below f64; the solver stops at a
/// relative charge residual of 1e-12, which moves E_F by < 1e-12 kT. The
/// limit is set by f64 rounding of u = E_F/kT (|u| up to ~2700 at 5 K).
const REFERENCE_EF_EV: f64 = 1e-12;
/// log10 densities from the reference: rounding of ln N (|ln N| < 2600).
const REFERENCE_LOG10: f64 = 1e-11;

fn si() -> Material {
    materials::silicon()
}

fn doped(material: &Material, list: &[(&str, f64)]) -> Vec<DopantDensity> {
    list.iter()
        .map(|&(symbol, density_cm3)| DopantDensity {
            dopant: material.dopant(symbol).expect("known dopant"),
            density_cm3,
        })
        .collect()
}

fn solve(material: &Material, t: f64, list: &[(&str, f64)]) -> Equilibrium {
    neutrality::solve(
        material,
        t,
        &doped(material, list),
        &SolveOptions::default(),
    )
    .expect("valid input solves")
}

/// Options with constant (dilute-limit) dopant levels: the model of the single-level textbook
/// formulas and of the first mpmath reference.
fn dilute() -> SolveOptions {
    SolveOptions {
        ionization_model: IonizationModel::Dilute,
        ..Default::default()
    }
}

fn solve_with(
    material: &Material,
    t: f64,
    list: &[(&str, f64)],
    options: &SolveOptions,
) -> Equilibrium {
    neutrality::solve(material, t, &doped(material, list), options).expect("valid input solves")
}

fn close(actual: f64, expected: f64, tolerance: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= tolerance,
        "{what}: got {actual}, expected {expected} +- {tolerance}"
    );
}

fn close_rel(actual: f64, expected: f64, relative: f64, what: &str) {
    assert!(
        ((actual - expected) / expected).abs() <= relative,
        "{what}: got {actual:e}, expected {expected:e} within {relative:e} relative"
    );
}

// ---------------------------------------------------------------- band gaps

#[test]
fn silicon_band_gap() {
    let v = si().varshni;
    // Source: Thurmond, J. Electrochem. Soc. 122, 1133 (1975): Eg(0) = 1.17 eV.
    close(v.band_gap_ev(0.0), 1.17, QUOTED_GAP_EV, "Si Eg(0)");
    // Source: Thurmond 1975 formula evaluated at 300 K: 1.124519 eV (published formula evaluated).
    close(v.band_gap_ev(300.0), 1.124_519, QUOTED_GAP_EV, "Si Eg(300)");
    // Source: Green, J. Appl. Phys. 67, 2944 (1990), tabulated Eg(300 K) = 1.1242 eV,
    // an independent fit; the two agree to 0.5 meV.
    close(
        v.band_gap_ev(300.0),
        1.1242,
        5e-4,
        "Si Eg(300) vs Green 1990",
    );
}

#[test]
fn germanium_band_gap() {
    let v = materials::germanium().varshni;
    // Source: Thurmond 1975, Eg(0) = 0.7437 eV (from memory).
    close(v.band_gap_ev(0.0), 0.7437, QUOTED_GAP_EV, "Ge Eg(0)");
    // Source: Thurmond 1975 formula evaluated at 300 K: 0.66339 eV (published formula evaluated).
    close(v.band_gap_ev(300.0), 0.663_39, 1e-5, "Ge Eg(300)");
    // Source: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), Appendix G: 0.66 eV (from memory).
    close(
        v.band_gap_ev(300.0),
        0.66,
        TEXTBOOK_GAP_EV,
        "Ge Eg(300) vs Sze",
    );
}

#[test]
fn gallium_arsenide_band_gap() {
    let v = materials::gallium_arsenide().varshni;
    // Source: Vurgaftman, Meyer, Ram-Mohan, J. Appl. Phys. 89, 5815 (2001), Table III: 1.519 eV.
    close(v.band_gap_ev(0.0), 1.519, QUOTED_GAP_EV, "GaAs Eg(0)");
    // Source: Vurgaftman 2001 formula evaluated: 1.422482 eV at 300 K, 1.507596 eV at 77 K.
    close(
        v.band_gap_ev(300.0),
        1.422_482,
        QUOTED_GAP_EV,
        "GaAs Eg(300)",
    );
    close(v.band_gap_ev(77.0), 1.507_596, QUOTED_GAP_EV, "GaAs Eg(77)");
    // Source: Sze 1981, Appendix G: 1.42 eV (from memory).
    close(
        v.band_gap_ev(300.0),
        1.42,
        TEXTBOOK_GAP_EV,
        "GaAs Eg(300) vs Sze",
    );
}

#[test]
fn gallium_nitride_band_gap() {
    // Source: Vurgaftman & Meyer in Piprek (ed.), Nitride Semiconductor Devices (2007):
    // Eg(0) = 3.510 eV; formula evaluated at 300 K: 3.43688 eV.
    let v = materials::gallium_nitride().varshni;
    close(v.band_gap_ev(0.0), 3.510, QUOTED_GAP_EV, "GaN Eg(0)");
    close(v.band_gap_ev(300.0), 3.436_88, 1e-5, "GaN Eg(300)");
}

// ------------------------------------------------------- intrinsic density

/// The Misiakos-Tsamakis fit and the Altermatt value are independent
/// determinations; they agree to 0.5 %.
const FIT_VS_MEASUREMENT: f64 = 0.01;

#[test]
fn silicon_intrinsic_density_at_300_k() {
    let fit = intrinsic::intrinsic_density(&si(), 300.0, IntrinsicModel::DirectFit).unwrap();
    // Source: Altermatt et al., J. Appl. Phys. 93, 1598 (2003): ni(300 K) = 9.65e9 cm^-3.
    close_rel(fit, 9.65e9, FIT_VS_MEASUREMENT, "ni fit vs Altermatt 2003");
    // Source: Sproul & Green, J. Appl. Phys. 70, 846 (1991): 9.15e19 (T/300)^2 exp(-6880/T)
    // evaluated at 300 K = 1.006e10 (published formula evaluated); agreement about 4 %.
    close_rel(fit, 1.006e10, 0.05, "ni fit vs Sproul-Green 1991");
    let dos = intrinsic::intrinsic_density(&si(), 300.0, IntrinsicModel::DensityOfStates).unwrap();
    // Source: Altermatt 2003, 9.65e9. The default density-of-states model (Green 1990
    // Nc, Nv with the Thurmond 1975 gap) sits about 10 % higher, as does sqrt(Nc Nv)
    // exp(-Eg/2kT) with Green's own gap, 1.08e10 (published formula evaluated). Allowed: 12 %.
    close_rel(dos, 9.65e9, 0.12, "ni DOS model vs Altermatt 2003");
    assert!(dos > fit, "the DOS model is the higher of the two at 300 K");
}

/// Formula evaluated vs the same formula in f64: rounding only.
const FORMULA_EVALUATED: f64 = 1e-3;

#[test]
fn misiakos_fit_over_its_range() {
    // Source: Misiakos & Tsamakis, J. Appl. Phys. 74, 3293 (1993): 5.29e19 (T/300)^2.54
    // exp(-6726/T), 78-340 K; evaluated: 200 K 4.687e4, 300 K 9.70e9 (published formula evaluated).
    let at = |t| intrinsic::intrinsic_density(&si(), t, IntrinsicModel::DirectFit).unwrap();
    close_rel(at(200.0), 4.687e4, FORMULA_EVALUATED, "fit at 200 K");
    close_rel(at(300.0), 9.70e9, FORMULA_EVALUATED, "fit at 300 K");
    for t in [77.9, 340.1, 600.0] {
        let e = intrinsic::intrinsic_density(&si(), t, IntrinsicModel::DirectFit).unwrap_err();
        assert!(
            matches!(e, CarrierError::OutsideModelRange { .. }),
            "{t} K: {e}"
        );
    }
    assert!(
        intrinsic::intrinsic_density(&materials::germanium(), 300.0, IntrinsicModel::DirectFit)
            .is_err()
    );
}

/// In undoped silicon the carriers are non-degenerate (eta about -20), so the
/// Fermi-Dirac n p differs from Boltzmann ni^2 by about e^-20: below 1e-8.
const NON_DEGENERATE_NP: f64 = 1e-8;

#[test]
fn solver_keeps_n_p_equal_to_the_fit_squared() {
    let options = SolveOptions {
        intrinsic_model: IntrinsicModel::DirectFit,
        ..Default::default()
    };
    for t in [78.0, 200.0, 300.0, 340.0] {
        let e = neutrality::solve(&si(), t, &[], &options).unwrap();
        let fit = intrinsic::intrinsic_density(&si(), t, IntrinsicModel::DirectFit).unwrap();
        // Source: Misiakos & Tsamakis 1993 fit (published formula evaluated) and the
        // mass-action law n p = ni^2 (common practice, no source).
        let np = (e.log10_electrons_cm3 + e.log10_holes_cm3) * std::f64::consts::LN_10;
        close_rel(np.exp(), fit * fit, NON_DEGENERATE_NP, "n p vs ni_fit^2");
        assert!(
            e.models.iter().any(|m| m.model.contains("scaled")),
            "{:?}",
            e.models
        );
        assert_eq!(e.regime, Regime::Intrinsic);
    }
}

// ------------------------------------------------- worked textbook examples

/// n ~ Nd holds to within the un-ionized fraction of phosphorus at 1e16 and
/// 300 K (about 0.4 %).
const COMPLETE_IONIZATION: f64 = 0.01;
/// Fermi-Dirac vs Boltzmann at eta = -8: relative difference e^-8 / 2^1.5 = 1.2e-4.
const BOLTZMANN_AT_ETA_MINUS_8: f64 = 3e-4;

#[test]
fn phosphorus_1e16_at_300_k() {
    let e = solve(&si(), 300.0, &[("P", 1e16)]);
    // Source: textbook worked example (e.g. Pierret, Semiconductor Device Fundamentals
    // (1996), ch. 2): n = Nd, p = ni^2/n, EF - Ei = kT ln(n/ni) (from memory).
    close_rel(e.electrons_cm3, 1e16, COMPLETE_IONIZATION, "n ~ Nd");
    let ni = e.effective_intrinsic_cm3;
    close_rel(
        e.holes_cm3,
        ni * ni / e.electrons_cm3,
        BOLTZMANN_AT_ETA_MINUS_8,
        "p = ni^2/n",
    );
    close(
        e.fermi_minus_intrinsic_ev,
        e.thermal_energy_ev * (e.electrons_cm3 / ni).ln(),
        e.thermal_energy_ev * BOLTZMANN_AT_ETA_MINUS_8,
        "EF - Ei = kT ln(n/ni)",
    );
    assert_eq!(e.regime, Regime::Extrinsic);
    assert!(!e.degenerate);
    // Source: same example with ni = 1e10: EF - Ei = 0.0259 ln(1e6) = 0.358 eV (from memory);
    // ni differs by 6 % here, which moves EF by kT ln(1.06) = 1.5 meV.
    close(e.fermi_minus_intrinsic_ev, 0.358, 0.003, "EF - Ei textbook");
}

#[test]
fn compensated_silicon_at_300_k() {
    let e = solve(&si(), 300.0, &[("P", 1e16), ("B", 3e15)]);
    // Source: textbook compensated example (e.g. Neamen, Semiconductor Physics and
    // Devices, ch. 4): n = Nd - Na = 7e15 cm^-3 at 300 K (from memory).
    close_rel(e.electrons_cm3, 7e15, COMPLETE_IONIZATION, "n = Nd - Na");
    // Source: charge neutrality itself (common practice, no source).
    close_rel(
        e.electrons_cm3 + e.ionized_acceptors_cm3,
        e.holes_cm3 + e.ionized_donors_cm3,
        1e-9,
        "neutrality",
    );
    let p_type = solve(&si(), 300.0, &[("B", 1e16), ("P", 3e15)]);
    close_rel(p_type.holes_cm3, 7e15, COMPLETE_IONIZATION, "p = Na - Nd");
    assert!(p_type.fermi_minus_intrinsic_ev < 0.0);
}

// ---------------------------------------- independent high-precision solutions

struct Reference {
    material: fn() -> Material,
    temperature_k: f64,
    doping: &'static [(&'static str, f64)],
    direct_fit: bool,
    fermi_minus_valence_ev: f64,
    log10_electrons: f64,
    log10_holes: f64,
}

#[test]
fn matches_mpmath_reference_solutions() {
    // Source: mpmath reference (see the file header), 40 digits, rounded to 17.
    let cases = [
        Reference {
            material: materials::silicon,
            temperature_k: 300.0,
            doping: &[("P", 1e15), ("B", 1e14)],
            direct_fit: false,
            fermi_minus_valence_ev: 0.856_513_879_318_820_06,
            log10_electrons: 14.954_069_457_127_628,
            log10_holes: 5.102_561_812_164_981_8,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 300.0,
            doping: &[("P", 1e16)],
            direct_fit: false,
            fermi_minus_valence_ev: 0.918_674_815_720_650_13,
            log10_electrons: 15.998_278_583_082_622,
            log10_holes: 4.058_304_041_287_489_8,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 30.0,
            doping: &[("P", 1e16)],
            direct_fit: false,
            fermi_minus_valence_ev: 1.140_378_870_325_609_1,
            log10_electrons: 13.007_612_241_612_562,
            log10_holes: -173.933_856_765_544_38,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 300.0,
            doping: &[("P", 1e20)],
            direct_fit: false,
            fermi_minus_valence_ev: 1.109_508_837_136_616_2,
            log10_electrons: 19.131_932_805_865_178,
            log10_holes: 0.852_433_580_726_708_71,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 77.0,
            doping: &[("B", 1e17), ("P", 1e15)],
            direct_fit: false,
            fermi_minus_valence_ev: 0.038_489_584_423_760_323,
            log10_electrons: -55.278_631_924_753_833,
            log10_holes: 15.879_023_804_554_531,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 600.0,
            doping: &[("P", 1e14)],
            direct_fit: false,
            fermi_minus_valence_ev: 0.523_610_046_315_684_97,
            log10_electrons: 15.659_740_363_841_475,
            log10_holes: 15.650_130_231_601_289,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 5.0,
            doping: &[("P", 1e16), ("B", 1e14)],
            direct_fit: false,
            fermi_minus_valence_ev: 1.126_662_782_205_737_4,
            log10_electrons: -27.016_511_412_327_108,
            log10_holes: -1_119.424_320_536_480_7,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 1500.0,
            doping: &[],
            direct_fit: false,
            fermi_minus_valence_ev: 0.370_030_989_164_085_77,
            log10_electrons: 19.532_615_503_352_582,
            log10_holes: 19.532_615_503_352_582,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 300.0,
            doping: &[("P", 1e17), ("As", 5e16), ("B", 2e16), ("In", 1e16)],
            direct_fit: false,
            fermi_minus_valence_ev: 0.981_427_095_962_799_91,
            log10_electrons: 17.051_918_950_146_696,
            log10_holes: 3.004_112_131_121_577_1,
        },
        Reference {
            material: materials::germanium,
            temperature_k: 300.0,
            doping: &[("Sb", 1e15)],
            direct_fit: false,
            fermi_minus_valence_ev: 0.424_275_305_150_692_67,
            log10_electrons: 15.000_073_206_453_501,
            log10_holes: 11.650_639_813_898_88,
        },
        Reference {
            material: materials::gallium_arsenide,
            temperature_k: 300.0,
            doping: &[("Si", 1e17), ("Zn", 1e16)],
            direct_fit: false,
            fermi_minus_valence_ev: 1.372_069_505_632_068_4,
            log10_electrons: 16.804_418_412_183_773,
            log10_holes: -4.204_655_171_202_561_1,
        },
        Reference {
            material: materials::silicon,
            temperature_k: 200.0,
            doping: &[("B", 1e13)],
            direct_fit: true,
            fermi_minus_valence_ev: 0.242_899_959_850_241_04,
            log10_electrons: -3.658_261_315_942_267_7,
            log10_holes: 12.999_982_094_937_252,
        },
    ];
    for c in cases {
        let m = (c.material)();
        // The reference uses constant levels (P 45 meV, B 45 meV, ...).
        let options = SolveOptions {
            intrinsic_model: if c.direct_fit {
                IntrinsicModel::DirectFit
            } else {
                IntrinsicModel::DensityOfStates
            },
            ionization_model: IonizationModel::Dilute,
            ..Default::default()
        };
        let e = neutrality::solve(&m, c.temperature_k, &doped(&m, c.doping), &options).unwrap();
        let what = format!("{} {} K {:?}", m.id, c.temperature_k, c.doping);
        let ef_tolerance =
            REFERENCE_EF_EV.max(1e-15 * c.fermi_minus_valence_ev.abs() / e.thermal_energy_ev);
        close(
            e.fermi_minus_valence_ev,
            c.fermi_minus_valence_ev,
            ef_tolerance * 10.0,
            &what,
        );
        close(
            e.log10_electrons_cm3,
            c.log10_electrons,
            REFERENCE_LOG10,
            &what,
        );
        close(
            e.log10_holes_cm3,
            c.log10_holes,
            REFERENCE_LOG10.max(1e-14 * c.log10_holes.abs()),
            &what,
        );
    }
}

// ------------------------------------------------ freeze-out and intrinsic

/// At 30 K phosphorus is 0.1 % ionized; the analytic limit neglects n/Nd
/// (1e-3) inside the square root, a relative error of about n/2Nd = 5e-4.
const FREEZE_OUT_LIMIT: f64 = 2e-3;

#[test]
fn freeze_out_of_phosphorus() {
    // The formulas below are those of one constant 45 meV level: solve with that model.
    let m = si();
    for t in [30.0, 40.0, 50.0] {
        let e = solve_with(&m, t, &[("P", 1e16)], &dilute());
        assert_eq!(e.regime, Regime::FreezeOut, "{t} K");
        assert!(
            e.species[0].ionized_fraction < 0.5,
            "{t} K: mostly un-ionized"
        );
        // Exact Boltzmann solution for one uncompensated donor without holes:
        // n^2 g/Nc' + n - Nd = 0, Nc' = Nc exp(-Ed/kT) (common practice, no source).
        let kt = e.thermal_energy_ev;
        let nc_prime = e.nc_cm3 * (-0.045 / kt).exp();
        let exact = nc_prime / 4.0 * ((1.0 + 8.0 * 1e16 / nc_prime).sqrt() - 1.0);
        close_rel(
            e.electrons_cm3,
            exact,
            1e-4,
            "quadratic freeze-out solution",
        );
    }
    // Source: low-temperature limit n = sqrt(Nc Nd / g_D) exp(-Ed/2kT) (e.g. Sze 1981,
    // ch. 1, from memory), independent of the solver.
    let e = solve_with(&m, 30.0, &[("P", 1e16)], &dilute());
    let limit = (e.nc_cm3 * 1e16 / 2.0).sqrt() * (-0.045 / (2.0 * e.thermal_energy_ev)).exp();
    close_rel(
        e.electrons_cm3,
        limit,
        FREEZE_OUT_LIMIT,
        "n ~ sqrt(Nc Nd/2) exp(-Ed/2kT)",
    );
}

#[test]
fn intrinsic_at_high_temperature() {
    let e = solve(&si(), 700.0, &[("P", 1e14)]);
    assert_eq!(e.regime, Regime::Intrinsic);
    // n - p = Nd+ (neutrality); both far above the doping.
    assert!(e.holes_cm3 > 10.0 * 1e14);
    close_rel(
        e.electrons_cm3 - e.holes_cm3,
        e.ionized_donors_cm3,
        1e-6,
        "n - p = Nd+",
    );
    let cold = solve(&si(), 300.0, &[("P", 1e14)]);
    assert_eq!(cold.regime, Regime::Extrinsic);
}

#[test]
fn heavy_doping_is_degenerate() {
    let e = solve(&si(), 300.0, &[("P", 1e20)]);
    assert!(e.degenerate);
    assert!(e.fermi_minus_conduction_ev > -3.0 * e.thermal_energy_ev);
    let light = solve(&si(), 300.0, &[("P", 1e15)]);
    assert!(!light.degenerate);
}

// ------------------------------------------------ dopant levels at high density

/// The published formulas evaluated by hand at the points where they are exact (N = N_ref
/// halves the level, N = N_b halves the localized fraction): rounding only.
const EXACT_FORMULA: f64 = 1e-15;
/// The mpmath reference of the Altermatt model (40 digits): E_F to rounding of u = E_F/kT (as
/// for the constant-level reference), log10 densities and fractions to rounding of ln N.
const ALTERMATT_REFERENCE_EF_EV: f64 = 1e-11;
/// See [`ALTERMATT_REFERENCE_EF_EV`].
const ALTERMATT_REFERENCE_LOG10: f64 = 1e-11;
/// See [`ALTERMATT_REFERENCE_EF_EV`]; the fraction is a ratio of densities known to 1e-12.
const ALTERMATT_REFERENCE_FRACTION: f64 = 1e-10;

#[test]
fn altermatt_formulas_at_their_reference_densities() {
    // Source: Altermatt et al., J. Appl. Phys. 100, 113714 and 113715 (2006), Table 1 and
    // E(N) = E0/(1 + (N/N_ref)^c), b(N) = 1/(1 + (N/N_b)^d) (published formula evaluated):
    // E(N_ref) = E0/2 and b(N_b) = 1/2 for every set; E(0) = E0, b(0) = 1.
    for (set, e0, n_ref, n_b) in [
        (ionization::ALTERMATT_SI_PHOSPHORUS, 0.0455, 3e18, 6e18),
        (ionization::ALTERMATT_SI_ARSENIC, 0.0537, 4e18, 1.4e19),
        (ionization::ALTERMATT_SI_BORON, 0.04439, 1.7e18, 6e18),
    ] {
        close(set.level_ev(0.0), e0, EXACT_FORMULA, &set.source);
        close(set.level_ev(n_ref), e0 / 2.0, EXACT_FORMULA, &set.source);
        close(set.localized_fraction(0.0), 1.0, EXACT_FORMULA, &set.source);
        close(set.localized_fraction(n_b), 0.5, EXACT_FORMULA, &set.source);
        close(
            set.delocalized_fraction(n_b),
            0.5,
            EXACT_FORMULA,
            &set.source,
        );
    }
    // Source: same formula, P at 1e16: 1 - b = (1e16/6e18)^2.3 / (1 + ...) = 4.0762e-7
    // (published formula evaluated); the complement keeps its relative precision.
    let p = ionization::ALTERMATT_SI_PHOSPHORUS;
    let x = (1e16f64 / 6e18).powf(2.3);
    close_rel(p.delocalized_fraction(1e16), x / (1.0 + x), 1e-15, "1 - b");
    close_rel(x, 4.0762e-7, 1e-4, "1 - b at 1e16");
}

struct LevelReference {
    temperature_k: f64,
    doping: &'static [(&'static str, f64)],
    model: IonizationModel,
    fermi_minus_valence_ev: f64,
    log10_electrons: f64,
    log10_holes: f64,
    first_species_fraction: f64,
}

#[test]
fn density_dependent_levels_match_mpmath_reference_solutions() {
    use IonizationModel::{Altermatt, Dilute, PearsonBardeen};
    // Source: mpmath reference, core/tests/data/gen_ionization_reference.py (an independent
    // implementation of Altermatt et al., J. Appl. Phys. 100, 113714/113715 (2006), Table 1,
    // and of Pearson & Bardeen, Phys. Rev. 75, 865 (1949) with alpha 3.1e-8/3.037e-8 eV cm),
    // 40 digits, printed to 17: (E_F - E_V, log10 n, log10 p, ionized fraction of the first
    // species).
    let cases = [
        (
            300.0,
            &[("P", 1e17)][..],
            Altermatt,
            0.977_340_105_743_816_43,
            16.983_348_897_995_183,
            3.072_770_544_953_775_3,
            0.962_385_116_660_141_03,
        ),
        (
            300.0,
            &[("P", 1e18)][..],
            Altermatt,
            1.031_975_058_055_546_2,
            17.897_454_367_625_011,
            2.154_943_742_213_310_9,
            0.789_685_870_830_033_91,
        ),
        (
            300.0,
            &[("P", 3e18)][..],
            Altermatt,
            1.059_988_635_607_288_4,
            18.360_014_012_735_277,
            1.684_336_352_077_134,
            0.763_647_189_995_232_27,
        ),
        (
            300.0,
            &[("P", 1e19)][..],
            Altermatt,
            1.097_319_684_856_721_8,
            18.951_614_849_985_386,
            1.057_202_326_589_972_4,
            0.894_571_071_642_123_86,
        ),
        (
            300.0,
            &[("P", 1e20)][..],
            Altermatt,
            1.187_340_162_062_569_4,
            19.999_356_566_996_726,
            -0.455_075_130_953_910_2,
            0.998_519_537_725_406_25,
        ),
        (
            300.0,
            &[("As", 3e18)][..],
            Altermatt,
            1.056_415_585_856_273_2,
            18.301_535_656_791_438,
            1.744_360_946_045_762,
            0.667_443_337_244_613_89,
        ),
        (
            300.0,
            &[("B", 1e18)][..],
            Altermatt,
            0.095_571_060_177_975_488,
            2.170_797_552_882_267_3,
            17.882_064_625_122_151,
            0.762_192_419_510_505_22,
        ),
        (
            300.0,
            &[("B", 1e19)][..],
            Altermatt,
            0.030_383_728_132_260_733,
            1.075_698_572_849_770_1,
            18.938_148_187_378_729,
            0.867_257_745_805_011_11,
        ),
        (
            300.0,
            &[("B", 1e20)][..],
            Altermatt,
            -0.058_486_805_100_589_646,
            -0.417_260_676_195_555_5,
            19.999_505_698_795_227,
            0.998_862_476_884_914_36,
        ),
        (
            77.0,
            &[("P", 1e18)][..],
            Altermatt,
            1.140_022_896_756_667_9,
            16.815_547_615_143_652,
            -56.217_701_226_789_356,
            0.065_395_462_429_922_899,
        ),
        (
            30.0,
            &[("P", 1e16)][..],
            Altermatt,
            1.140_129_813_682_408_4,
            12.965_772_757_815_844,
            -173.892_017_090_966_47,
            0.000_924_214_457_298_295_27,
        ),
        (
            300.0,
            &[("P", 2e18), ("As", 2e18), ("B", 1e17)][..],
            Altermatt,
            1.065_275_719_149_064_2,
            18.446_141_917_519_349,
            1.595_517_257_749_345_1,
            0.802_014_661_223_778_59,
        ),
        (
            300.0,
            &[("Sb", 1e18)][..],
            PearsonBardeen,
            1.035_927_184_231_297_4,
            17.963_155_307_850_398,
            2.088_550_944_591_377_8,
            0.918_661_059_709_324_74,
        ),
        (
            300.0,
            &[("Ga", 2e19), ("P", 1e17)][..],
            PearsonBardeen,
            0.005_643_758_676_899_129_9,
            0.660_085_378_286_109_05,
            19.298_853_076_409_707,
            1.0,
        ),
        (
            300.0,
            &[("P", 1e18)][..],
            PearsonBardeen,
            1.035_427_804_023_521_7,
            17.954_859_325_703_81,
            2.096_940_162_849_307_5,
            0.901_279_152_899_606_41,
        ),
        (
            300.0,
            &[("P", 1e19)][..],
            Dilute,
            1.073_828_245_944_221,
            18.584_222_694_814_838,
            1.451_841_131_174_496_9,
            0.383_904_050_953_673_38,
        ),
        (
            300.0,
            &[("P", 1e20)][..],
            Dilute,
            1.109_508_837_136_616_2,
            19.131_932_805_865_178,
            0.852_433_580_726_707_39,
            0.135_497_975_337_592,
        ),
    ];
    let m = si();
    for (temperature_k, doping, model, ef, log10_n, log10_p, fraction) in cases {
        let c = LevelReference {
            temperature_k,
            doping,
            model,
            fermi_minus_valence_ev: ef,
            log10_electrons: log10_n,
            log10_holes: log10_p,
            first_species_fraction: fraction,
        };
        let options = SolveOptions {
            ionization_model: c.model,
            ..Default::default()
        };
        let e = solve_with(&m, c.temperature_k, c.doping, &options);
        let what = format!("{} {} K {:?}", c.model, c.temperature_k, c.doping);
        assert!(e.relative_residual < 1e-9, "{what}");
        close(
            e.fermi_minus_valence_ev,
            c.fermi_minus_valence_ev,
            ALTERMATT_REFERENCE_EF_EV,
            &what,
        );
        close(
            e.log10_electrons_cm3,
            c.log10_electrons,
            ALTERMATT_REFERENCE_LOG10,
            &what,
        );
        close(
            e.log10_holes_cm3,
            c.log10_holes,
            ALTERMATT_REFERENCE_LOG10,
            &what,
        );
        close(
            e.species[0].ionized_fraction,
            c.first_species_fraction,
            ALTERMATT_REFERENCE_FRACTION,
            &what,
        );
    }
}

#[test]
fn default_model_ionizes_heavy_silicon_doping() {
    let m = si();
    for symbol in ["P", "B"] {
        let e = solve(&m, 300.0, &[(symbol, 1e20)]);
        // Source: Altermatt et al. 2006 (published formula evaluated, mpmath reference above):
        // P 99.85 %, B 99.89 % ionized at 1e20 cm^-3 and 300 K.
        assert!(
            e.species[0].ionized_fraction > 0.998,
            "{symbol}: {:?}",
            e.species[0]
        );
        assert_eq!(e.species[0].level_model, IonizationModel::Altermatt);
        assert_eq!(e.regime, Regime::Extrinsic, "{symbol}");
        // Source: same formula: at 1e19 cm^-3 the model still holds 10.5 % (P) and 13.3 % (B)
        // neutral, so the level lies near the band edge but is not yet gone.
        let e = solve(&m, 300.0, &[(symbol, 1e19)]);
        assert!(
            (0.85..0.9).contains(&e.species[0].ionized_fraction),
            "{symbol}: {:?}",
            e.species[0]
        );
        assert_eq!(e.regime, Regime::Extrinsic, "{symbol}");
        // The constant level (before this model existed): 38 % of 1e19 P, 14 % of 1e20 P.
        let old = solve_with(&m, 300.0, &[(symbol, 1e20)], &dilute());
        assert!(old.species[0].ionized_fraction < 0.15, "{symbol}");
        assert_eq!(old.regime, Regime::FreezeOut, "{symbol}");
    }
}

#[test]
fn neutral_phosphorus_peaks_near_the_mott_transition() {
    // Source: Altermatt et al., J. Appl. Phys. 100, 113714 (2006) (published formula evaluated,
    // core/tests/data/gen_ionization_reference.py on a 40-per-decade grid): at 300 K the
    // neutral fraction of P is 3.8 % at 1e17, 21.0 % at 1e18 and largest, 24.67 %, near
    // 2.1e18 cm^-3, below the Mott transition (about 4e18 cm^-3), then falls to 0.15 % at 1e20.
    let m = si();
    let neutral = |n: f64| 1.0 - solve(&m, 300.0, &[("P", n)]).species[0].ionized_fraction;
    close(neutral(1e17), 0.0376, 5e-4, "neutral at 1e17");
    close(neutral(1e18), 0.2103, 5e-4, "neutral at 1e18");
    let grid: Vec<f64> = (0..=120)
        .map(|i| 10f64.powf(17.0 + f64::from(i) / 40.0))
        .collect();
    let (at, largest) = grid
        .iter()
        .map(|&n| (n, neutral(n)))
        .fold((0.0, 0.0), |best, x| if x.1 > best.1 { x } else { best });
    // Grid of 40 points per decade, as the reference: the same point wins.
    close_rel(
        at,
        2.113e18,
        1e-3,
        "position of the largest neutral fraction",
    );
    close(largest, 0.2467, 1e-4, "largest neutral fraction");
    assert!(neutral(1e20) < 2e-3);
}

#[test]
fn no_freeze_out_at_300_k_for_shallow_silicon_dopants() {
    // Source: room-temperature silicon with P, As or B is extrinsic at any practical doping
    // (common practice, no source); at 30 K 1e16 cm^-3 P is frozen out with any model (see the
    // reference solutions above: 0.09 % ionized).
    let m = si();
    for symbol in ["P", "As", "B"] {
        for exponent in 14..=21 {
            let e = solve(&m, 300.0, &[(symbol, 10f64.powi(exponent))]);
            assert_eq!(e.regime, Regime::Extrinsic, "{symbol} 1e{exponent}");
        }
    }
    for options in [SolveOptions::default(), dilute()] {
        let e = solve_with(&m, 30.0, &[("P", 1e16)], &options);
        assert_eq!(
            e.regime,
            Regime::FreezeOut,
            "{:?}",
            options.ionization_model
        );
    }
}

#[test]
fn each_species_names_the_level_model_used() {
    let m = si();
    let e = solve(
        &m,
        300.0,
        &[("P", 1e17), ("Sb", 1e16), ("Ga", 2e19), ("In", 1e15)],
    );
    let used: Vec<IonizationModel> = e.species.iter().map(|s| s.level_model).collect();
    assert_eq!(
        used,
        [
            IonizationModel::Altermatt,
            IonizationModel::PearsonBardeen,
            IonizationModel::PearsonBardeen,
            IonizationModel::PearsonBardeen
        ]
    );
    // Source: Pearson & Bardeen, Phys. Rev. 75, 865 (1949) (published formula evaluated), alpha
    // 3.1e-8 eV cm for donors, 3.037e-8 for acceptors (widely used defaults, from memory):
    // Sb at 1.1e17 donors, 39 meV - 3.1e-8 (1.1e17)^(1/3) = 24.78 meV; Ga at 2e19 acceptors,
    // 72 meV - 3.037e-8 (2e19)^(1/3) = -10.4 meV: merged with the band.
    close(
        e.species[1].level_from_band_edge_ev,
        0.039 - 3.1e-8 * 1.1e17f64.cbrt(),
        1e-15,
        "Sb level",
    );
    assert_eq!(e.species[2].ionized_fraction, 1.0);
    assert_eq!(e.species[2].localized_fraction, 0.0);
    assert_eq!(e.species[2].level_from_band_edge_ev, 0.0);
    // One entry per model used, in fallback order; which species used which is in `species`.
    let ionization: Vec<(&str, &str)> = e
        .models
        .iter()
        .filter(|u| u.quantity == "dopant ionization")
        .map(|u| (u.model.as_ref(), u.source.as_ref()))
        .collect();
    assert_eq!(ionization.len(), 2, "{ionization:?}");
    let [(altermatt, altermatt_source), (lowering, lowering_source)] = ionization[..] else {
        unreachable!("two entries")
    };
    assert!(altermatt.starts_with("Altermatt"), "{altermatt}");
    assert!(
        altermatt_source.starts_with("Altermatt2006"),
        "{altermatt_source}"
    );
    assert!(
        lowering.starts_with("Pearson-Bardeen") && lowering.contains("merged"),
        "{lowering}"
    );
    // Pearson-Bardeen names its alpha source and the source of every E0 used (Sze for Sb,
    // Ga and In).
    assert!(
        lowering_source.starts_with("PearsonBardeen1949") && lowering_source.contains("; E0: Sze"),
        "{lowering_source}"
    );
    // Other materials keep the constant level, and `dilute` applies it everywhere.
    let gaas = materials::gallium_arsenide();
    let e = solve(&gaas, 300.0, &[("Si", 1e18)]);
    assert_eq!(e.species[0].level_model, IonizationModel::Dilute);
    assert_eq!(e.species[0].level_from_band_edge_ev, 0.0058);
    let e = solve_with(&m, 300.0, &[("P", 1e19)], &dilute());
    assert_eq!(e.species[0].level_model, IonizationModel::Dilute);
    assert_eq!(e.species[0].level_from_band_edge_ev, 0.045);
}

#[test]
fn the_density_is_that_of_the_whole_kind() {
    // Splitting the donors between P entries, or moving them to As, changes nothing for P's
    // level: it depends on all donors (see ionization.rs, "Density used").
    let m = si();
    let one = solve(&m, 300.0, &[("P", 4e18), ("B", 1e16)]);
    let two = solve(&m, 300.0, &[("P", 3e18), ("P", 1e18), ("B", 1e16)]);
    close(
        one.fermi_minus_valence_ev,
        two.fermi_minus_valence_ev,
        1e-12,
        "split species",
    );
    // Source: Altermatt et al. 2006, P set (published formula evaluated): at 4e18 donors
    // E = 45.5 meV/(1 + (4/3)^2) = 16.38 meV, whatever the acceptors.
    close(
        two.species[0].level_from_band_edge_ev,
        0.0455 / (1.0 + (4.0f64 / 3.0).powi(2)),
        1e-15,
        "P level at 4e18 donors",
    );
    let mixed = solve(&m, 300.0, &[("P", 1e18), ("As", 3e18)]);
    close(
        mixed.species[0].level_from_band_edge_ev,
        two.species[0].level_from_band_edge_ev,
        1e-15,
        "P level with As",
    );
}

#[test]
fn a_copy_of_silicon_keeps_its_level_models() {
    // The model parameters travel with the material: a copy under another id, written to
    // JSON and read back as a user-defined material, gives the same state.
    let mut copy = si();
    copy.id = "my-si".into();
    let copy: Material = serde_json::from_str(&serde_json::to_string(&copy).unwrap()).unwrap();
    let list = [("P", 3e18), ("Ga", 2e19), ("B", 1e17)];
    let original = solve(&si(), 300.0, &list);
    let copied = solve(&copy, 300.0, &list);
    assert_eq!(
        copied.fermi_minus_valence_ev,
        original.fermi_minus_valence_ev
    );
    assert_eq!(copied.species, original.species);
    // A bad set in a user file is refused with the field named.
    let mut bad = si();
    bad.dopants[0].altermatt.as_mut().unwrap().n_b_cm3 = 0.0;
    let e = neutrality::solve(
        &bad,
        300.0,
        &doped(&bad, &[("P", 1e16)]),
        &SolveOptions::default(),
    )
    .unwrap_err();
    assert_eq!(
        e.to_string(),
        "dopant P: altermatt.n_b_cm3: 0 is not allowed; give a finite value > 0 cm^-3"
    );
    bad.pearson_bardeen.as_mut().unwrap().donor_alpha_ev_cm = f64::NAN;
    let e = bad.validate().unwrap_err();
    assert!(
        e.to_string()
            .starts_with("material si: pearson_bardeen.donor_alpha_ev_cm: NaN"),
        "{e}"
    );
}

#[test]
fn ionization_model_ids_are_stable() {
    for (model, id) in [
        (IonizationModel::Altermatt, "altermatt"),
        (IonizationModel::PearsonBardeen, "pearson-bardeen"),
        (IonizationModel::Dilute, "dilute"),
    ] {
        assert_eq!(model.id(), id);
        assert_eq!(IonizationModel::from_id(&id.to_uppercase()), Ok(model));
        assert_eq!(serde_json::to_value(model).unwrap(), id);
    }
    assert_eq!(IonizationModel::default(), IonizationModel::Altermatt);
    let e = IonizationModel::from_id("hydrogenic").unwrap_err();
    assert_eq!(
        e.to_string(),
        "ionization model: 'hydrogenic' is not known; use one of altermatt, pearson-bardeen, dilute"
    );
    // Options written before the field existed still read, with the default model.
    let old: SolveOptions = serde_json::from_str(
        r#"{"intrinsic_model":"density_of_states","band_gap_narrowing":null}"#,
    )
    .unwrap();
    assert_eq!(old.ionization_model, IonizationModel::Altermatt);
}

// ----------------------------------------------------- band-gap narrowing

#[test]
fn band_gap_narrowing_is_off_by_default_and_named_when_on() {
    let m = si();
    let doping = doped(&m, &[("P", 1e19)]);
    let off = neutrality::solve(&m, 300.0, &doping, &SolveOptions::default()).unwrap();
    assert_eq!(off.band_gap_narrowing_ev, 0.0);
    assert!(
        !off.models
            .iter()
            .any(|u| u.quantity == "band-gap narrowing")
    );
    let options = SolveOptions {
        band_gap_narrowing: Some(BgnModel::MaterialSet),
        ..Default::default()
    };
    let on = neutrality::solve(&m, 300.0, &doping, &options).unwrap();
    // Source: Slotboom & de Graaff, IEEE Trans. Electron Devices 24, 1123 (1977), formula
    // evaluated at 1e19 cm^-3: 60.50 meV.
    close(on.band_gap_narrowing_ev, 60.50e-3, 1e-5, "dEg(1e19)");
    close(
        on.band_gap_ev,
        off.band_gap_ev - 60.50e-3,
        1e-5,
        "narrowed gap",
    );
    assert!(on.models.iter().any(|u| u.source.contains("Slotboom")));
    // Not available for a material without a fitted set.
    let gaas = materials::gallium_arsenide();
    let e = neutrality::solve(&gaas, 300.0, &[], &options).unwrap_err();
    assert!(matches!(e, CarrierError::ModelNotAvailable { .. }), "{e}");
}

#[test]
fn narrowing_raises_n_p_by_exp_deg_over_kt() {
    let m = si();
    let options = SolveOptions {
        band_gap_narrowing: Some(BgnModel::MaterialSet),
        ..Default::default()
    };
    let e = neutrality::solve(&m, 300.0, &doped(&m, &[("B", 1e17)]), &options).unwrap();
    let plain = solve(&m, 300.0, &[]);
    let ratio = e.electrons_cm3 * e.holes_cm3 / (plain.electrons_cm3 * plain.holes_cm3);
    // Source: Slotboom & de Graaff 1977: n p = ni^2 exp(dEg/kT) (Boltzmann); holes at
    // 1e17 have eta = -5.7, so Fermi-Dirac lowers n p by about e^-5.7 / 2.8 = 1.2e-3.
    close_rel(
        ratio,
        (e.band_gap_narrowing_ev / e.thermal_energy_ev).exp(),
        3e-3,
        "n p ratio",
    );
}

// ------------------------------------------------- user-defined materials

#[test]
fn user_defined_material_and_dopant_work_like_builtin_ones() {
    // Invented data for a demo material; checked only for self-consistency.
    let mut m = si();
    m.id = "demo".into();
    m.name = "Demo semiconductor".into();
    m.intrinsic_fit = None;
    m.band_gap_narrowing = None;
    m.dopants = vec![Dopant::new("X", DopantKind::Donor, 0.1, 2.0, "invented for a demo").unwrap()];
    m.validate().unwrap();
    let json = serde_json::to_string(&m).unwrap();
    let back: Material = serde_json::from_str(&json).unwrap();
    assert_eq!(back, m);
    let e = neutrality::solve(
        &back,
        300.0,
        &doped(&back, &[("x", 1e16)]),
        &SolveOptions::default(),
    )
    .unwrap();
    assert!(e.species[0].ionized_fraction < 0.99 && e.species[0].ionized_fraction > 0.5);
    assert!(e.relative_residual < 1e-9);
    // A dopant from another material may be used too (it carries its own level).
    let ge_sb = materials::germanium().dopant("Sb").unwrap();
    let mixed = [DopantDensity {
        dopant: ge_sb,
        density_cm3: 1e15,
    }];
    assert!(neutrality::solve(&si(), 300.0, &mixed, &SolveOptions::default()).is_ok());
}

// ------------------------------------------------------------- bad input

#[test]
fn bad_input_is_refused_with_the_field_named() {
    let m = si();
    let opts = SolveOptions::default();
    let ok = doped(&m, &[("P", 1e15)]);
    for t in [0.0, -5.0, f64::NAN, f64::INFINITY] {
        let e = neutrality::solve(&m, t, &ok, &opts).unwrap_err();
        assert!(matches!(e, CarrierError::InvalidTemperature { .. }));
        assert!(e.to_string().starts_with("temperature_k: "), "{e}");
    }
    assert_eq!(
        neutrality::solve(&m, -5.0, &ok, &opts)
            .unwrap_err()
            .to_string(),
        "temperature_k: -5 is not allowed; give a finite value > 0 K"
    );
    for n in [-1.0, f64::NAN, f64::INFINITY, 1e30] {
        let e = neutrality::solve(&m, 300.0, &doped(&m, &[("P", n)]), &opts).unwrap_err();
        assert!(matches!(e, CarrierError::InvalidDensity { .. }), "{e}");
        assert!(e.to_string().starts_with("density_cm3 of P: "), "{e}");
    }
    let mut bad = doped(&m, &[("B", 1e15)]);
    bad[0].dopant.degeneracy = 0.0;
    let e = neutrality::solve(&m, 300.0, &bad, &opts).unwrap_err();
    assert!(
        e.to_string().contains("degeneracy: 0 is not allowed"),
        "{e}"
    );
    // Germanium's Varshni gap closes near 1770 K.
    let e = neutrality::solve(&materials::germanium(), 1900.0, &[], &opts).unwrap_err();
    assert!(matches!(e, CarrierError::NonPositiveBandGap { .. }), "{e}");
    let fit = SolveOptions {
        intrinsic_model: IntrinsicModel::DirectFit,
        ..Default::default()
    };
    let e = neutrality::solve(&m, 500.0, &ok, &fit).unwrap_err();
    assert!(matches!(e, CarrierError::OutsideModelRange { .. }), "{e}");
}

// ------------------------------------------------------------------ sweep

#[test]
fn sweep_matches_single_solves_and_keeps_errors_per_point() {
    let m = si();
    let doping = doped(&m, &[("P", 1e15), ("B", 1e14)]);
    let grid = sweep::linear_grid_k(10.0, 1000.0, 200).unwrap();
    let options = SolveOptions::default();
    let results = sweep::temperature_sweep(&m, &grid, &doping, &options);
    assert_eq!(results.len(), 200);
    for (t, r) in grid.iter().zip(&results) {
        let s = neutrality::solve(&m, *t, &doping, &options).unwrap();
        let r = r.as_ref().unwrap();
        close(
            r.fermi_minus_valence_ev,
            s.fermi_minus_valence_ev,
            1e-11,
            "sweep vs solve",
        );
    }
    let fit = SolveOptions {
        intrinsic_model: IntrinsicModel::DirectFit,
        ..Default::default()
    };
    let mixed = sweep::temperature_sweep(&m, &[50.0, 300.0, 400.0], &doping, &fit);
    assert!(mixed[0].is_err() && mixed[1].is_ok() && mixed[2].is_err());
}
