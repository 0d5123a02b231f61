//! The Fermi level from charge neutrality with Fermi-Dirac carriers and incomplete ionization.
//!
//! # Equation
//! n + sum N_A- = p + sum N_D+ with
//! n = Nc F_1/2((E_F - E_C)/kT), p = Nv F_1/2((E_V - E_F)/kT),
//! N_D+ = N_D [(1 - b_D) + b_D / (1 + g_D exp((E_F - E_D)/kT))],
//! N_A- = N_A [(1 - b_A) + b_A / (1 + g_A exp((E_A - E_F)/kT))],
//! for any number of donor and acceptor species, each with its own level and degeneracy.
//!
//! # Dopant levels at high density
//! The level E_C - E_D (E_A - E_V) and the localized fraction b of each species come from the
//! selected [`IonizationModel`] ([`SolveOptions::ionization_model`]) at the total density of
//! the species' kind; see [`crate::ionization`]. Default: `altermatt` (Altermatt et al. 2006)
//! for silicon P, As and B, `pearson-bardeen` for every other dopant in silicon, `dilute` (the
//! dopant's own constant level, b = 1) in every other material; the result names the model
//! used per species ([`SpeciesState::level_model`]) and in `models`. Why: with constant levels
//! heavily doped silicon comes out mostly neutral at 300 K (1e20 cm^-3 P only 13 % ionized),
//! whereas measured silicon is metallic there (Mott transition near 4e18 cm^-3 P); Altermatt
//! et al. fitted their model to silicon data, and Pearson-Bardeen is the standard level
//! lowering where no such fit exists. Both levels are independent of temperature, so a
//! temperature sweep prepares them once.
//!
//! # Method
//! The unknown is u = (E_F - E_V)/kT. The solver compares logarithms,
//! h(u) = ln(p + sum N_D+) - ln(n + sum N_A-), which is the relative charge
//! residual for small h. h is strictly decreasing and unbounded both ways, so
//! there is exactly one root. Where every term is a normal f64 (all reduced
//! levels above -700, which covers silicon from about 20 K up) the sums are
//! formed in cm^-3 with [`crate::fermi_dirac::f_half`]; elsewhere each sum is
//! a log-sum-exp of log terms with [`crate::fermi_dirac::ln_f_half`], so
//! nothing over- or underflows at 5 K or 2000 K, at zero doping or 1e21 cm^-3.
//! The iteration is Newton on h with its analytic derivative, safeguarded by a
//! bracket: while only one side is known, steps are capped (the cap grows fourfold);
//! once the root is bracketed, any Newton step that leaves the bracket or does
//! not halve the residual is replaced by bisection, so convergence is guaranteed.
//! It stops when |h| <= 1e-12 (relative charge residual about 1e-12), when the
//! Newton step or the bracket is below the f64 resolution of u, or (never
//! observed) after 300 iterations with [`CarrierError::NotConverged`].

use std::borrow::Cow;
use std::fmt;

use serde::{Deserialize, Serialize};
use smallvec::SmallVec;
use std::sync::Arc;

use crate::bandgap::band_gap_checked;
use crate::bgn::BgnModel;
use crate::constants::thermal_energy_ev;
use crate::dos::REFERENCE_TEMPERATURE_K;
use crate::errors::check_temperature;
use crate::fermi_dirac as fd;
use crate::intrinsic::{self, IntrinsicModel};
use crate::ionization::{
    self, IonizationModel, effective_level, logistic_complement, softplus_and_logistic,
};
use crate::materials::{Dopant, DopantDensity, DopantKind, Material, MaterialError};

pub use crate::errors::{CarrierError, MAX_DENSITY_CM3, MIN_TEMPERATURE_K};

/// Model choices for a neutrality solve.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct SolveOptions {
    /// Intrinsic-density model (default: from Nc, Nv and the Varshni gap; see
    /// [`crate::intrinsic`] for the convention).
    pub intrinsic_model: IntrinsicModel,
    /// Band-gap narrowing, off (None) by default.
    pub band_gap_narrowing: Option<BgnModel>,
    /// How dopant levels depend on dopant density (default `altermatt`, with the per-species
    /// fallback described in [`crate::ionization`]).
    #[serde(default)]
    pub ionization_model: IonizationModel,
}

/// The solved equilibrium state.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Equilibrium {
    /// Temperature, K.
    pub temperature_k: f64,
    /// Thermal energy kT, eV.
    pub thermal_energy_ev: f64,
    /// Band gap used, eV (after narrowing when narrowing is on).
    pub band_gap_ev: f64,
    /// Band-gap narrowing applied, eV (0 when off). Split equally between the
    /// two band edges; the dopant levels move with their band edge.
    pub band_gap_narrowing_ev: f64,
    /// Effective density of states of the conduction band used, cm^-3 (scaled
    /// with Nv by a common factor when the direct ni fit is selected).
    pub nc_cm3: f64,
    /// Effective density of states of the valence band used, cm^-3.
    pub nv_cm3: f64,
    /// Intrinsic density of the selected model (undoped, no narrowing), cm^-3.
    pub intrinsic_cm3: f64,
    /// sqrt(Nc Nv) exp(-Eg/2kT) with the gap actually used (includes narrowing), cm^-3.
    pub effective_intrinsic_cm3: f64,
    /// Free electrons, cm^-3 (0 when below the f64 range; see `log10_electrons_cm3`).
    pub electrons_cm3: f64,
    /// Free holes, cm^-3.
    pub holes_cm3: f64,
    /// log10 of the electron density, finite even where `electrons_cm3` underflows.
    pub log10_electrons_cm3: f64,
    /// log10 of the hole density.
    pub log10_holes_cm3: f64,
    /// E_F - E_V, eV.
    pub fermi_minus_valence_ev: f64,
    /// E_F - E_C, eV.
    pub fermi_minus_conduction_ev: f64,
    /// E_F - (E_C + E_V)/2, eV.
    pub fermi_minus_midgap_ev: f64,
    /// E_F - E_i with E_i = midgap + (kT/2) ln(Nv/Nc) (Boltzmann intrinsic level), eV.
    pub fermi_minus_intrinsic_ev: f64,
    /// Sum of ionized donors, cm^-3.
    pub ionized_donors_cm3: f64,
    /// Sum of ionized acceptors, cm^-3.
    pub ionized_acceptors_cm3: f64,
    /// Every species given, in input order.
    pub species: Vec<SpeciesState>,
    /// Freeze-out, extrinsic or intrinsic; see [`Regime`] for the definitions.
    pub regime: Regime,
    /// True when E_F is within 3 kT of a band edge or beyond it.
    pub degenerate: bool,
    /// |positive - negative charge| / max of the two at the solution.
    pub relative_residual: f64,
    /// Every model and parameter source the result depends on (shared: every point of a
    /// sweep names the same models).
    pub models: Arc<[ModelUsed]>,
}

/// Ionization state of one dopant species.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesState {
    /// Chemical symbol (borrowed from the dopant's when it is built in).
    pub symbol: Cow<'static, str>,
    /// Donor or acceptor.
    pub kind: DopantKind,
    /// Total density, cm^-3.
    pub density_cm3: f64,
    /// Ionized density, cm^-3.
    pub ionized_cm3: f64,
    /// Ionized fraction, 0..1 (defined also for zero density: the occupancy of the level).
    pub ionized_fraction: f64,
    /// Distance of the level from its band edge, eV (E_C - E_D or E_A - E_V), as used: lowered
    /// by the density of the species' kind under `altermatt` or `pearson-bardeen`; 0 when a
    /// Pearson-Bardeen level has merged with the band.
    pub level_from_band_edge_ev: f64,
    /// The ionization model used for this species (the selected one or its fallback).
    pub level_model: IonizationModel,
    /// Fraction of the species that follows the occupancy of its level (b(N) of Altermatt et
    /// al.; 0 for a Pearson-Bardeen level merged with the band; 1 otherwise); the rest is
    /// always ionized.
    pub localized_fraction: f64,
}

/// Conduction regime.
///
/// Definitions (checked in this order):
/// - `Intrinsic`: the effective intrinsic density exceeds the net ionized
///   doping, ni > |sum N_D+ - sum N_A-| (includes undoped and exactly
///   compensated material).
/// - `FreezeOut`: fewer than half ([`FREEZE_OUT_IONIZED_FRACTION`]) of the
///   majority dopant kind (the kind with the larger total density) is ionized:
///   most majority dopants hold their carrier.
/// - `Extrinsic`: otherwise.
///
/// The threshold is one half, not "nearly all": measured silicon keeps part of
/// its dopants neutral at 300 K near the Mott transition (the default Altermatt
/// model leaves at most about a quarter to a third of P, As or B neutral, near
/// 2e18-4e18 cm^-3), which is incomplete ionization of doped material, not
/// freeze-out; each species' `ionized_fraction` shows it. With the `dilute`
/// model heavy doping does come out frozen out (1e19 cm^-3 P, 38 % ionized at
/// 300 K), and the regime says so.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Regime {
    /// Most of the majority dopants hold their carrier.
    FreezeOut,
    /// Carriers come from the (mostly ionized) net doping.
    Extrinsic,
    /// Thermally generated carriers dominate.
    Intrinsic,
}

impl fmt::Display for Regime {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Regime::FreezeOut => "freeze-out",
            Regime::Extrinsic => "extrinsic",
            Regime::Intrinsic => "intrinsic",
        })
    }
}

/// Ionized fraction of the majority dopant below which the regime is freeze-out.
pub const FREEZE_OUT_IONIZED_FRACTION: f64 = 0.5;

/// Distance from a band edge, in kT, within which the result is called degenerate.
pub const DEGENERACY_MARGIN_KT: f64 = 3.0;

/// One model or parameter set a result depends on.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ModelUsed {
    /// What it gives, e.g. "band gap".
    pub quantity: Cow<'static, str>,
    /// Which model, with parameters where short.
    pub model: Cow<'static, str>,
    /// Published source (citation key and reference).
    pub source: Cow<'static, str>,
}

/// Solves charge neutrality for `material` at `temperature_k` with `doping`.
///
/// # Formula
/// See the module documentation. Species with zero density are allowed and
/// reported; an empty `doping` gives intrinsic material.
///
/// # Validity
/// Single-level dopants whose level and localized fraction depend on the
/// density of their kind as the selected [`IonizationModel`] says (no
/// impurity-band density of states beyond that), parabolic bands (F_1/2), the
/// material's parameter ranges; see [`crate::ionization::effective_level`] for
/// the range of the Altermatt fit.
/// The result is accurate to a relative charge residual below 1e-9 (in
/// practice about 1e-12) wherever Eg/kT is below about 1e6 (silicon above
/// 0.02 K); beyond that the rounding of the reduced energies in f64 limits
/// the residual to about 8e-16 Eg/kT.
///
/// # References
/// Fermi-Dirac statistics and the ionization formula: Sze, Physics of
/// Semiconductor Devices, 2nd ed. (1981), ch. 1 (from memory); the level
/// models: [`crate::ionization`]; parameter sources per material and species
/// in `models`.
///
/// # Errors
/// [`CarrierError::InvalidTemperature`], [`CarrierError::InvalidDensity`],
/// [`CarrierError::InvalidMaterial`] (material or dopant fields),
/// [`CarrierError::NonPositiveBandGap`], [`CarrierError::LevelOutsideGap`],
/// [`CarrierError::ModelNotAvailable`], [`CarrierError::OutsideModelRange`].
pub fn solve(
    material: &Material,
    temperature_k: f64,
    doping: &[DopantDensity],
    options: &SolveOptions,
) -> Result<Equilibrium, CarrierError> {
    let problem = Problem::new(material, doping, options)?;
    problem.solve_at(temperature_k, None, problem.models_used())
}

/// One dopant species in the form the solver needs.
#[derive(Debug, Clone, Copy)]
struct Level {
    kind: DopantKind,
    /// b N, the part that follows the occupancy of the level, cm^-3.
    localized: f64,
    ln_degeneracy: f64,
    /// E(N) from the band edge, eV.
    ionization_energy_ev: f64,
    /// The level model and fractions, for the result.
    effective: ionization::EffectiveLevel,
}

/// Everything that does not depend on temperature, prepared once (a sweep
/// reuses it for every point).
pub(crate) struct Problem<'a> {
    material: &'a Material,
    doping: &'a [DopantDensity],
    options: &'a SolveOptions,
    /// One per species, in input order.
    levels: Vec<Level>,
    donors_cm3: f64,
    acceptors_cm3: f64,
    /// Donors counted as always ionized, sum (1 - b) N_D, cm^-3.
    fixed_donors_cm3: f64,
    /// Acceptors counted as always ionized, cm^-3.
    fixed_acceptors_cm3: f64,
    narrowing_ev: f64,
    deepest_level_ev: f64,
    ln_nc_300k: f64,
    ln_nv_300k: f64,
}

/// h(u) and its derivative, with the pieces the result needs.
#[derive(Debug, Clone, Copy)]
struct Evaluation {
    h: f64,
    dh: f64,
    carriers: Carriers,
}

/// n and p at the evaluated point, in whichever form the evaluation produced.
#[derive(Debug, Clone, Copy)]
enum Carriers {
    /// Both are normal f64 numbers, cm^-3; with exp(eta) of both bands.
    Linear {
        electrons: f64,
        holes: f64,
        t_n: f64,
        t_p: f64,
    },
    /// Natural logarithms, for densities outside the f64 range.
    Log { ln_electrons: f64, ln_holes: f64 },
}

/// Per-temperature constants of h(u).
struct Frame {
    kt_ev: f64,
    /// Eg / kT with the gap used.
    gap: f64,
    ln_nc: f64,
    ln_nv: f64,
    /// Nc, Nv in cm^-3 (may overflow to +inf for absurd user parameters;
    /// the linear evaluation then falls back to the logarithmic one).
    nc: f64,
    nv: f64,
    ln_ni_model: f64,
    band_gap_ev: f64,
    /// g exp(E_level/kT) of each level, so that a level's occupancy term is this factor times
    /// exp(eta) of its band: the linear evaluation then needs two exponentials however many
    /// species there are.
    level_factors: SmallVec<[f64; INLINE_SPECIES]>,
    /// Every factor of a level that follows its occupancy is finite (below about 1 K for
    /// shallow levels it is not; the logarithmic evaluation then takes over).
    level_factors_finite: bool,
}

/// Species whose per-temperature factors a frame holds without a heap allocation.
const INLINE_SPECIES: usize = 4;

const MAX_ITERATIONS: usize = 300;
/// |h| below which the solve stops: h = ln(positive/negative charge), so this
/// is the relative charge residual; 1e-12 is 1000 times below the 1e-9
/// guarantee and about 100 times above the rounding noise of h (|ln N| < 60).
const RESIDUAL_TOLERANCE: f64 = 1e-12;
/// Below this reduced Fermi level the F_-1/2 / F_1/2 ratio in the Newton
/// derivative is taken as 1 (its true value is 1 - 0.354 e^eta): the
/// derivative is then exact to 2e-9, which costs nothing in convergence.
const BOLTZMANN_DERIVATIVE_ETA: f64 = -20.0;
/// Lowest reduced level at which the linear evaluation is used: F_1/2 is
/// then above e^-700, a normal f64 with full relative precision.
const LINEAR_MIN_ETA: f64 = -700.0;
/// See [`fd_ratio`].
const SERIES_DERIVATIVE_ETA: f64 = -8.0;
/// See [`ln_f_half`].
const BOLTZMANN_LN_ETA: f64 = -37.0;
/// Above this reduced Fermi level the ratio is taken from the leading
/// Sommerfeld terms, 3/(2 eta) (relative error about 0.4 eta^-2 < 1e-8),
/// so that F_1/2 never overflows in the ratio.
const SOMMERFELD_DERIVATIVE_ETA: f64 = 1e4;
/// First cap on a one-sided Newton step, in kT.
const FIRST_STEP_CAP: f64 = 16.0;

impl<'a> Problem<'a> {
    pub(crate) fn new(
        material: &'a Material,
        doping: &'a [DopantDensity],
        options: &'a SolveOptions,
    ) -> Result<Problem<'a>, CarrierError> {
        material.validate_parameters()?;
        let (mut donors_cm3, mut acceptors_cm3) = (0.0, 0.0);
        for d in doping {
            d.dopant.validate()?;
            let n = d.density_cm3;
            if !(n.is_finite() && (0.0..=MAX_DENSITY_CM3).contains(&n)) {
                return Err(CarrierError::InvalidDensity {
                    symbol: d.dopant.symbol.to_string(),
                    value: n,
                });
            }
            match d.dopant.kind {
                DopantKind::Donor => donors_cm3 += n,
                DopantKind::Acceptor => acceptors_cm3 += n,
            }
        }
        let mut levels = Vec::with_capacity(doping.len());
        let (mut fixed_donors_cm3, mut fixed_acceptors_cm3) = (0.0, 0.0);
        let mut deepest_level_ev: f64 = 0.0;
        for d in doping {
            let kind_density_cm3 = match d.dopant.kind {
                DopantKind::Donor => donors_cm3,
                DopantKind::Acceptor => acceptors_cm3,
            };
            let effective = effective_level(
                material,
                &d.dopant,
                kind_density_cm3,
                options.ionization_model,
            );
            let n = d.density_cm3;
            let fixed = n * effective.delocalized_fraction;
            match d.dopant.kind {
                DopantKind::Donor => fixed_donors_cm3 += fixed,
                DopantKind::Acceptor => fixed_acceptors_cm3 += fixed,
            }
            let localized = n * effective.localized_fraction;
            let ionization_energy_ev = effective.level_from_band_edge_ev;
            deepest_level_ev = deepest_level_ev.max(ionization_energy_ev);
            levels.push(Level {
                kind: d.dopant.kind,
                localized,
                ln_degeneracy: d.dopant.degeneracy.ln(),
                ionization_energy_ev,
                effective,
            });
        }
        let narrowing_ev = match &options.band_gap_narrowing {
            None => 0.0,
            Some(BgnModel::MaterialSet) => match &material.band_gap_narrowing {
                Some(p) => p.narrowing_ev(donors_cm3 + acceptors_cm3),
                None => {
                    return Err(CarrierError::ModelNotAvailable {
                        model: "band_gap_narrowing: material_set",
                        material: material.id.clone(),
                    });
                }
            },
            Some(BgnModel::Slotboom(p)) => {
                if let Some((f, v, a)) = p.invalid_field() {
                    return Err(CarrierError::InvalidMaterial(
                        MaterialError::InvalidParameter {
                            field: format!("band_gap_narrowing.{f}"),
                            value: v,
                            allowed: a,
                        },
                    ));
                }
                p.narrowing_ev(donors_cm3 + acceptors_cm3)
            }
        };
        if options.intrinsic_model == IntrinsicModel::DirectFit && material.intrinsic_fit.is_none()
        {
            return Err(CarrierError::ModelNotAvailable {
                model: "intrinsic_model: direct_fit",
                material: material.id.clone(),
            });
        }
        Ok(Problem {
            material,
            doping,
            options,
            levels,
            donors_cm3,
            acceptors_cm3,
            fixed_donors_cm3,
            fixed_acceptors_cm3,
            narrowing_ev,
            deepest_level_ev,
            ln_nc_300k: material.nc.at_300k_cm3.ln(),
            ln_nv_300k: material.nv.at_300k_cm3.ln(),
        })
    }

    fn frame(&self, temperature_k: f64) -> Result<Frame, CarrierError> {
        check_temperature(temperature_k)?;
        let m = self.material;
        let eg_varshni = band_gap_checked(m, temperature_k)?;
        let band_gap_ev = eg_varshni - self.narrowing_ev;
        if band_gap_ev <= 0.0 {
            return Err(CarrierError::NonPositiveBandGap {
                material: m.id.clone(),
                temperature_k,
                band_gap_ev,
            });
        }
        if self.deepest_level_ev >= band_gap_ev {
            let culprit = self
                .doping
                .iter()
                .zip(&self.levels)
                .find(|(_, l)| l.ionization_energy_ev >= band_gap_ev)
                .map(|(d, _)| d.dopant.symbol.to_string())
                .unwrap_or_default();
            return Err(CarrierError::LevelOutsideGap {
                symbol: culprit,
                ionization_energy_ev: self.deepest_level_ev,
                band_gap_ev,
            });
        }
        let kt_ev = thermal_energy_ev(temperature_k);
        let ln_t_ratio = (temperature_k / REFERENCE_TEMPERATURE_K).ln();
        let mut ln_nc = self.ln_nc_300k + m.nc.exponent * ln_t_ratio;
        let mut ln_nv = self.ln_nv_300k + m.nv.exponent * ln_t_ratio;
        let ln_ni_dos = intrinsic::ln_from_dos(ln_nc, ln_nv, eg_varshni, temperature_k);
        let ln_ni_model = match (self.options.intrinsic_model, &m.intrinsic_fit) {
            (IntrinsicModel::DirectFit, Some(fit)) => {
                fit.check_range(temperature_k)?;
                let ln_fit = fit.ln_density_cm3(temperature_k);
                // Scale Nc and Nv by the same factor so that n p = ni_fit^2
                // in the non-degenerate limit.
                let ln_scale = ln_fit - ln_ni_dos;
                ln_nc += ln_scale;
                ln_nv += ln_scale;
                ln_fit
            }
            _ => ln_ni_dos,
        };
        let inverse_kt = 1.0 / kt_ev;
        let mut level_factors = SmallVec::with_capacity(self.levels.len());
        let mut level_factors_finite = true;
        for l in &self.levels {
            let factor = (l.ln_degeneracy + l.ionization_energy_ev * inverse_kt).exp();
            level_factors_finite &= factor.is_finite() || l.localized == 0.0;
            level_factors.push(factor);
        }
        Ok(Frame {
            kt_ev,
            gap: band_gap_ev / kt_ev,
            ln_nc,
            ln_nv,
            nc: ln_nc.exp(),
            nv: ln_nv.exp(),
            ln_ni_model,
            band_gap_ev,
            level_factors,
            level_factors_finite,
        })
    }

    /// h(u) = ln(positive charge) - ln(negative charge) and dh/du.
    ///
    /// Two equivalent forms: the linear one (densities in cm^-3, about half
    /// the exponentials and logarithms) wherever every reduced level is above
    /// [`LINEAR_MIN_ETA`] and both sums are normal f64 numbers, and the
    /// logarithmic one everywhere else (deep cryogenic temperatures, absurd
    /// user parameters).
    fn evaluate(&self, f: &Frame, u: f64) -> Evaluation {
        self.evaluate_linear(f, u)
            .unwrap_or_else(|| self.evaluate_log(f, u))
    }

    fn evaluate_linear(&self, f: &Frame, u: f64) -> Option<Evaluation> {
        let eta_p = -u;
        let eta_n = u - f.gap;
        if eta_p < LINEAR_MIN_ETA || eta_n < LINEAR_MIN_ETA || !f.level_factors_finite {
            return None;
        }
        // e^eta of each band (+inf far above the band edge, which every use below handles).
        let (t_p, t_n) = (eta_p.exp(), eta_n.exp());
        let holes = f.nv * fd::f_half_with_exp(eta_p, t_p);
        let electrons = f.nc * fd::f_half_with_exp(eta_n, t_n);
        let (mut pos, mut dpos) = (
            holes + self.fixed_donors_cm3,
            -holes * fd_ratio_with(eta_p, || t_p),
        );
        let (mut neg, mut dneg) = (
            electrons + self.fixed_acceptors_cm3,
            electrons * fd_ratio_with(eta_n, || t_n),
        );
        for (l, &factor) in self.levels.iter().zip(&f.level_factors) {
            if l.localized == 0.0 {
                continue;
            }
            match l.kind {
                DopantKind::Donor => {
                    // g exp((E_F - E_D)/kT)
                    let x = factor * t_n;
                    let ionized = l.localized / (1.0 + x);
                    pos += ionized;
                    // d/du of N/(1 + x) = -N x / (1 + x)^2; 1/(1 + 1/x) stays finite for x = inf.
                    dpos -= ionized / (1.0 + 1.0 / x);
                }
                DopantKind::Acceptor => {
                    // g exp((E_A - E_F)/kT)
                    let y = factor * t_p;
                    let ionized = l.localized / (1.0 + y);
                    neg += ionized;
                    dneg += ionized / (1.0 + 1.0 / y);
                }
            }
        }
        if !(pos.is_normal() && neg.is_normal() && holes.is_normal() && electrons.is_normal()) {
            return None;
        }
        Some(Evaluation {
            h: (pos / neg).ln(),
            dh: dpos / pos - dneg / neg,
            carriers: Carriers::Linear {
                electrons,
                holes,
                t_n,
                t_p,
            },
        })
    }

    fn evaluate_log(&self, f: &Frame, u: f64) -> Evaluation {
        let eta_p = -u;
        let eta_n = u - f.gap;
        let ln_holes = f.ln_nv + ln_f_half(eta_p);
        let ln_electrons = f.ln_nc + ln_f_half(eta_n);
        let mut pos = LogSum::new(ln_holes, -fd_ratio(eta_p));
        let mut neg = LogSum::new(ln_electrons, fd_ratio(eta_n));
        // Always-ionized dopants: constant terms (slope 0). Their logarithms are taken here,
        // not when the problem is prepared: this form is the rare one.
        if self.fixed_donors_cm3 > 0.0 {
            pos.add(self.fixed_donors_cm3.ln(), 0.0);
        }
        if self.fixed_acceptors_cm3 > 0.0 {
            neg.add(self.fixed_acceptors_cm3.ln(), 0.0);
        }
        for l in &self.levels {
            if l.localized == 0.0 {
                continue;
            }
            // Taken here, not when the problem is prepared: this form is the rare one.
            let ln_localized = l.localized.ln();
            let e = l.ionization_energy_ev / f.kt_ev;
            match l.kind {
                DopantKind::Donor => {
                    // (E_F - E_D)/kT = u - gap + e
                    let (sp, lg) = softplus_and_logistic(l.ln_degeneracy + eta_n + e);
                    pos.add(ln_localized - sp, -lg);
                }
                DopantKind::Acceptor => {
                    // (E_A - E_F)/kT = e - u
                    let (sp, lg) = softplus_and_logistic(l.ln_degeneracy + e + eta_p);
                    neg.add(ln_localized - sp, lg);
                }
            }
        }
        // ln(P/N) with one logarithm: (max_P - max_N) + ln(sum_P / sum_N).
        Evaluation {
            h: (pos.max - neg.max) + (pos.sum / neg.sum).ln(),
            dh: pos.slope_sum / pos.sum - neg.slope_sum / neg.sum,
            carriers: Carriers::Log {
                ln_electrons,
                ln_holes,
            },
        }
    }

    /// A close starting u for non-degenerate material in the linear range: charge neutrality
    /// with one majority level and every minority dopant ionized, solved in closed form.
    ///
    /// The majority dopants that follow their levels act as one level holding L = sum L_i
    /// with the L-weighted mean factor G = sum L_i G_i / L (G_i = g exp(E_level/kT)), exact to
    /// first order in G t where most are ionized; with t = n/Nc (Boltzmann), neutrality
    /// Nc t + M = F + L/(1 + G t) (M the minority dopants, F the always-ionized majority) is
    /// the quadratic Nc G t^2 + (Nc + (M - F) G) t - net = 0. Then the intrinsic carriers,
    /// n = n_x/2 + sqrt(n_x^2/4 + ni^2), and Fermi-Dirac statistics by the inverse of Joyce &
    /// Dixon, Appl. Phys. Lett. 31, 354 (1977), with u = n/Nc: eta = ln u + u/sqrt(8) - ...
    /// ([`fd::joyce_dixon`]; the occupancies take e^eta, so the quadratic is solved a second
    /// time with the first-order correction). In silicon at 300 K
    /// this lands within 1e-7 of the root in h up to 1e17 cm^-3 (1e-11 at 1e15), so the first
    /// evaluation or one Newton step finishes; None (the general guess below takes over) for
    /// degenerate, undoped or out-of-range cases.
    fn nondegenerate_guess(&self, f: &Frame) -> Option<f64> {
        let net = self.donors_cm3 - self.acceptors_cm3;
        if net == 0.0 || !f.level_factors_finite {
            return None;
        }
        let (kind, band, fixed, minority) = if net > 0.0 {
            (
                DopantKind::Donor,
                f.nc,
                self.fixed_donors_cm3,
                self.acceptors_cm3,
            )
        } else {
            (
                DopantKind::Acceptor,
                f.nv,
                self.fixed_acceptors_cm3,
                self.donors_cm3,
            )
        };
        let net = net.abs();
        let (mut localized, mut weighted) = (0.0, 0.0);
        for (l, &factor) in self.levels.iter().zip(&f.level_factors) {
            if l.kind == kind {
                localized += l.localized;
                weighted += l.localized * factor;
            }
        }
        let mean_factor = if localized > 0.0 {
            weighted / localized
        } else {
            0.0
        };
        let ni_squared = f.nc * f.nv * (-f.gap).exp();
        // The occupancy goes with e^eta = (n/Nc)(1 + (n/Nc)/sqrt(8) + ...), not with n/Nc: a
        // second pass solves the quadratic again with the factor scaled by that correction.
        let mut reduced = 0.0;
        for _ in 0..2 {
            // A_1 = 1/sqrt(8), the first-order Fermi-Dirac term of the Joyce-Dixon inverse.
            let factor = mean_factor * (1.0 + reduced * fd::JOYCE_DIXON[0]);
            let t = if factor > 0.0 {
                let a = band * factor;
                let b = band + (minority - fixed) * factor;
                let root = (b * b + 4.0 * a * net).sqrt();
                if b >= 0.0 {
                    2.0 * net / (b + root)
                } else {
                    (root - b) / (2.0 * a)
                }
            } else {
                net / band
            };
            let extrinsic = band * t;
            let majority = 0.5 * extrinsic + (0.25 * extrinsic * extrinsic + ni_squared).sqrt();
            reduced = majority / band;
            // Past 0.1 the Joyce-Dixon terms used below lose accuracy; such material is near
            // degenerate.
            if !(reduced.is_normal() && reduced < 0.1) {
                return None;
            }
        }
        let eta = fd::joyce_dixon(reduced.ln(), reduced);
        Some(if kind == DopantKind::Donor {
            f.gap + eta
        } else {
            -eta
        })
    }

    /// A starting u from Boltzmann statistics. The majority density is taken
    /// as the smallest of three limits (each the solution in its own regime,
    /// with the shallowest majority level, K = (N_band / g) exp(-E_level/kT)):
    /// complete ionization with ni, net/2 + sqrt(net^2/4 + ni^2); uncompensated
    /// freeze-out, sqrt(K net); compensated freeze-out, K net / N_minority;
    /// but never below the always-ionized majority dopants less every minority
    /// dopant, which no temperature freezes out.
    fn initial_guess(&self, f: &Frame) -> f64 {
        let u_intrinsic = 0.5 * (f.gap + f.ln_nv - f.ln_nc);
        let net = self.donors_cm3 - self.acceptors_cm3;
        if net == 0.0 {
            return u_intrinsic;
        }
        let (kind, ln_band, minority) = if net > 0.0 {
            (DopantKind::Donor, f.ln_nc, self.acceptors_cm3)
        } else {
            (DopantKind::Acceptor, f.ln_nv, self.donors_cm3)
        };
        let ln_net = net.abs().ln();
        let ln_half_net = ln_net - std::f64::consts::LN_2;
        let ln_ni = 0.5 * (f.ln_nc + f.ln_nv - f.gap);
        // net/2 + sqrt((net/2)^2 + ni^2), in logs.
        let d = ln_ni - ln_half_net;
        let mut ln_majority = if d < 0.0 {
            ln_half_net + (1.0 + (1.0 + (2.0 * d).exp()).sqrt()).ln()
        } else {
            ln_ni + ((-d).exp() + ((-2.0 * d).exp() + 1.0).sqrt()).ln()
        };
        let shallowest = self
            .levels
            .iter()
            .filter(|l| l.kind == kind && l.localized > 0.0)
            .map(|l| l.ionization_energy_ev / f.kt_ev - l.ln_degeneracy)
            .fold(f64::INFINITY, f64::min);
        if shallowest.is_finite() {
            let ln_k = ln_band - shallowest;
            ln_majority = ln_majority.min(0.5 * (ln_k + ln_net));
            if minority > 0.0 {
                ln_majority = ln_majority.min(ln_k + ln_net - minority.ln());
            }
        }
        let fixed_majority = if net > 0.0 {
            self.fixed_donors_cm3 - minority
        } else {
            self.fixed_acceptors_cm3 - minority
        };
        if fixed_majority > 0.0 {
            ln_majority = ln_majority.max(fixed_majority.ln());
        }
        if net > 0.0 {
            f.gap + ln_majority - f.ln_nc
        } else {
            f.ln_nv - ln_majority
        }
    }

    /// Finds the root of h: bracketed, safeguarded Newton.
    fn find_root(&self, f: &Frame, guess: f64) -> Option<(f64, Evaluation)> {
        let mut lo = f64::NEG_INFINITY; // h(lo) > 0
        let mut hi = f64::INFINITY; // h(hi) < 0
        let mut u = guess;
        // The root lies within a few gap widths of any Boltzmann guess, so the
        // first cap scales with the gap (in kT); it grows fourfold per step.
        let mut cap = FIRST_STEP_CAP.max(0.25 * f.gap);
        let mut last_abs_h = f64::INFINITY;
        for _ in 0..MAX_ITERATIONS {
            let e = self.evaluate(f, u);
            if !e.h.is_finite() {
                return None;
            }
            // Neither u nor h can be resolved more finely than the rounding of
            // the reduced energies (|eta| <= |u| + gap); |dh| <= 2.
            let resolution = 4.0 * f64::EPSILON * (u.abs() + f.gap);
            let newton_step = if e.dh < 0.0 && e.dh.is_finite() {
                -e.h / e.dh
            } else {
                f64::NAN
            };
            if e.h.abs() <= RESIDUAL_TOLERANCE || newton_step.abs() <= resolution {
                return Some((u, e));
            }
            if e.h > 0.0 {
                lo = u;
            } else {
                hi = u;
            }
            let bracketed = lo.is_finite() && hi.is_finite();
            if bracketed && hi - lo <= resolution {
                return Some((u, e));
            }
            let next = if bracketed {
                let newton = u + newton_step;
                // Newton while it stays inside and at least halves |h|.
                if newton > lo && newton < hi && e.h.abs() <= 0.5 * last_abs_h {
                    newton
                } else {
                    0.5 * (lo + hi)
                }
            } else {
                // One side unknown: step away from the known side, Newton-sized
                // but capped; the cap grows so that any root is reached.
                let direction = if e.h > 0.0 { 1.0 } else { -1.0 };
                let size = if newton_step.is_finite() {
                    newton_step.abs()
                } else {
                    cap
                };
                cap *= 4.0;
                u + direction * size.min(cap).max(resolution)
            };
            last_abs_h = e.h.abs();
            if next == u {
                return Some((u, e));
            }
            u = next;
        }
        None
    }

    pub(crate) fn solve_at(
        &self,
        temperature_k: f64,
        hint_fermi_minus_valence_ev: Option<f64>,
        models: Arc<[ModelUsed]>,
    ) -> Result<Equilibrium, CarrierError> {
        let f = self.frame(temperature_k)?;
        let guess = match hint_fermi_minus_valence_ev {
            Some(ev) if ev.is_finite() => ev / f.kt_ev,
            _ => self
                .nondegenerate_guess(&f)
                .unwrap_or_else(|| self.initial_guess(&f)),
        };
        let (u, e) = self
            .find_root(&f, guess)
            .ok_or(CarrierError::NotConverged { temperature_k })?;
        Ok(self.result(temperature_k, &f, u, e, models))
    }

    fn result(
        &self,
        temperature_k: f64,
        f: &Frame,
        u: f64,
        e: Evaluation,
        models: Arc<[ModelUsed]>,
    ) -> Equilibrium {
        let kt = f.kt_ev;
        let eta_n = u - f.gap;
        let eta_p = -u;
        let (electrons, holes, ln_n, ln_p, band_exps) = match e.carriers {
            Carriers::Linear {
                electrons,
                holes,
                t_n,
                t_p,
            } => (
                electrons,
                holes,
                electrons.ln(),
                holes.ln(),
                Some((t_n, t_p)),
            ),
            Carriers::Log {
                ln_electrons,
                ln_holes,
            } => (
                ln_electrons.exp(),
                ln_holes.exp(),
                ln_electrons,
                ln_holes,
                None,
            ),
        };
        let mut species = Vec::with_capacity(self.doping.len());
        let (mut ionized_donors, mut ionized_acceptors) = (0.0, 0.0);
        for ((d, l), &factor) in self.doping.iter().zip(&self.levels).zip(&f.level_factors) {
            // 1/(1 + g exp(+-(E_F - E_level)/kT)): from the evaluation's exponentials where it
            // had them, else in one exponential.
            let occupancy = match (band_exps, l.kind) {
                (Some((t_n, _)), DopantKind::Donor) => 1.0 / (1.0 + factor * t_n),
                (Some((_, t_p)), DopantKind::Acceptor) => 1.0 / (1.0 + factor * t_p),
                (None, kind) => {
                    let e_level = l.ionization_energy_ev / kt;
                    logistic_complement(match kind {
                        DopantKind::Donor => l.ln_degeneracy + eta_n + e_level,
                        DopantKind::Acceptor => l.ln_degeneracy + e_level + eta_p,
                    })
                }
            };
            // b + (1 - b) may round to 1 + 1 ulp: the min keeps the fraction a fraction.
            let fraction = (l.effective.delocalized_fraction
                + l.effective.localized_fraction * occupancy)
                .min(1.0);
            let ionized = d.density_cm3 * fraction;
            match l.kind {
                DopantKind::Donor => ionized_donors += ionized,
                DopantKind::Acceptor => ionized_acceptors += ionized,
            }
            species.push(SpeciesState {
                symbol: d.dopant.symbol.clone(),
                kind: l.kind,
                density_cm3: d.density_cm3,
                ionized_cm3: ionized,
                ionized_fraction: fraction,
                level_from_band_edge_ev: l.ionization_energy_ev,
                level_model: l.effective.model,
                localized_fraction: l.effective.localized_fraction,
            });
        }
        let ln_ni_effective = 0.5 * (f.ln_nc + f.ln_nv - f.gap);
        let net_ionized = (ionized_donors - ionized_acceptors).abs();
        let effective_intrinsic_cm3 = ln_ni_effective.exp();
        // Compared in logarithms where the intrinsic density leaves the f64 range.
        let intrinsic_wins =
            if effective_intrinsic_cm3.is_normal() && effective_intrinsic_cm3.is_finite() {
                effective_intrinsic_cm3 > net_ionized
            } else {
                ln_ni_effective > net_ionized.ln()
            };
        let regime = if intrinsic_wins {
            Regime::Intrinsic
        } else {
            let (total, ionized) = if self.donors_cm3 >= self.acceptors_cm3 {
                (self.donors_cm3, ionized_donors)
            } else {
                (self.acceptors_cm3, ionized_acceptors)
            };
            if ionized < FREEZE_OUT_IONIZED_FRACTION * total {
                Regime::FreezeOut
            } else {
                Regime::Extrinsic
            }
        };
        let u_intrinsic = 0.5 * (f.gap + f.ln_nv - f.ln_nc);
        Equilibrium {
            temperature_k,
            thermal_energy_ev: kt,
            band_gap_ev: f.band_gap_ev,
            band_gap_narrowing_ev: self.narrowing_ev,
            nc_cm3: f.nc,
            nv_cm3: f.nv,
            intrinsic_cm3: f.ln_ni_model.exp(),
            effective_intrinsic_cm3,
            electrons_cm3: electrons,
            holes_cm3: holes,
            log10_electrons_cm3: ln_n * std::f64::consts::LOG10_E,
            log10_holes_cm3: ln_p * std::f64::consts::LOG10_E,
            fermi_minus_valence_ev: u * kt,
            fermi_minus_conduction_ev: eta_n * kt,
            fermi_minus_midgap_ev: (u - 0.5 * f.gap) * kt,
            fermi_minus_intrinsic_ev: (u - u_intrinsic) * kt,
            ionized_donors_cm3: ionized_donors,
            ionized_acceptors_cm3: ionized_acceptors,
            species,
            regime,
            degenerate: eta_n > -DEGENERACY_MARGIN_KT || eta_p > -DEGENERACY_MARGIN_KT,
            relative_residual: -(-e.h.abs()).exp_m1(),
            models,
        }
    }

    /// Every model the results of this problem depend on, in one allocation; a sweep builds it
    /// once and every point shares it.
    pub(crate) fn models_used(&self) -> Arc<[ModelUsed]> {
        let m = self.material;
        let mut models = ModelList::default();
        models.push(ModelUsed {
            quantity: "band gap".into(),
            model: "Varshni".into(),
            source: m.sources.band_gap.clone(),
        });
        models.push(ModelUsed {
            quantity: "effective densities of states".into(),
            model: "power law N300 (T/300)^x".into(),
            source: m.sources.density_of_states.clone(),
        });
        match (self.options.intrinsic_model, &m.intrinsic_fit) {
            (IntrinsicModel::DirectFit, Some(fit)) => models.push(ModelUsed {
                quantity: "intrinsic density".into(),
                model: Cow::Owned(format!(
                    "{} direct fit; Nc and Nv scaled by ni_fit/ni_dos so that n p = ni_fit^2",
                    fit.name
                )),
                source: fit.source.clone(),
            }),
            _ => models.push(ModelUsed {
                quantity: "intrinsic density".into(),
                model: "sqrt(Nc Nv) exp(-Eg/2kT)".into(),
                source: "from the band gap and density-of-states sources above".into(),
            }),
        }
        models.push(ModelUsed {
            quantity: "carrier statistics".into(),
            model: "Fermi-Dirac, F_1/2".into(),
            source: "see the fermi_dirac module of bandgauge-core".into(),
        });
        for model in IonizationModel::ALL {
            if let Some(entry) = self.ionization_entry(model) {
                models.push(entry);
            }
        }
        if let Some(bgn) = &self.options.band_gap_narrowing {
            let p = match bgn {
                BgnModel::Slotboom(p) => Some(p),
                BgnModel::MaterialSet => m.band_gap_narrowing.as_ref(),
            };
            if let Some(p) = p {
                models.push(ModelUsed {
                    quantity: "band-gap narrowing".into(),
                    model: Cow::Owned(format!(
                        "{} (E1 {} eV, N0 {:e} cm^-3, C {}), N = total doping, split equally \
                         between the band edges",
                        p.name, p.e1_ev, p.n0_cm3, p.c
                    )),
                    source: p.source.clone(),
                });
            }
        }
        models.into_shared()
    }

    /// The `models` entry of one ionization model (None when no species used it). The model
    /// text is static: which species used which model is in each [`SpeciesState::level_model`],
    /// so a one-shot solve copies no text (built-in sources are borrowed too).
    fn ionization_entry(&self, model: IonizationModel) -> Option<ModelUsed> {
        self.species_with(model).next()?;
        let text = match model {
            IonizationModel::Altermatt => ALTERMATT_DESCRIPTION,
            IonizationModel::PearsonBardeen => PEARSON_BARDEEN_DESCRIPTION,
            IonizationModel::Dilute => DILUTE_DESCRIPTION,
        };
        let source = match model {
            IonizationModel::Altermatt => {
                self.distinct_sources(model, |d| d.altermatt.as_ref().map(|p| &p.source))
            }
            IonizationModel::PearsonBardeen => {
                let levels = self.distinct_sources(model, |d| Some(&d.source));
                let mut text = String::with_capacity(256);
                if let Some(p) = &self.material.pearson_bardeen {
                    text.push_str(&p.source);
                }
                text.push_str("; E0: ");
                text.push_str(&levels);
                Cow::Owned(text)
            }
            IonizationModel::Dilute => self.distinct_sources(model, |d| Some(&d.source)),
        };
        Some(ModelUsed {
            quantity: "dopant ionization".into(),
            model: Cow::Borrowed(text),
            source,
        })
    }

    /// The species (dopant and prepared level) whose level comes from `model`, in input order.
    fn species_with(
        &self,
        model: IonizationModel,
    ) -> impl Iterator<Item = (&Dopant, &Level)> + Clone {
        self.doping
            .iter()
            .zip(&self.levels)
            .filter(move |(_, l)| l.effective.model == model)
            .map(|(d, l)| (&d.dopant, l))
    }

    /// The distinct `source` texts of the species whose level comes from `model`, separated
    /// by "; ". One distinct text (the usual case) is shared, not copied.
    fn distinct_sources<'s, T>(
        &'s self,
        model: IonizationModel,
        source: impl Fn(&'s Dopant) -> Option<&'s T>,
    ) -> Cow<'static, str>
    where
        T: AsRef<str> + Clone + Into<Cow<'static, str>> + 's,
    {
        let used = self.species_with(model);
        let mut distinct = used.clone().enumerate().filter_map(|(i, (d, _))| {
            let text = source(d)?;
            let seen = used
                .clone()
                .take(i)
                .any(|(e, _)| source(e).is_some_and(|t| t.as_ref() == text.as_ref()));
            (!seen).then_some(text)
        });
        let Some(first) = distinct.next() else {
            return Cow::Borrowed("");
        };
        let Some(second) = distinct.next() else {
            return first.clone().into();
        };
        let mut out = String::with_capacity(256);
        out.push_str(first.as_ref());
        for text in std::iter::once(second).chain(distinct) {
            out.push_str("; ");
            out.push_str(text.as_ref());
        }
        Cow::Owned(out)
    }
}

/// The most `models` entries a result can have: band gap, densities of states, intrinsic
/// density, statistics, one per ionization model, band-gap narrowing.
const MAX_MODELS: usize = 4 + IonizationModel::ALL.len() + 1;

/// The `models` of a problem while they are collected: on the stack, so that the shared list
/// is the only allocation (an `Arc` collected from a `Vec` would copy it into a second one).
#[derive(Default)]
struct ModelList {
    slots: [Option<ModelUsed>; MAX_MODELS],
    len: usize,
}

impl ModelList {
    fn push(&mut self, model: ModelUsed) {
        self.slots[self.len] = Some(model);
        self.len += 1;
    }

    /// The entries in order. `take` and `map` keep the exact length known, so the `Arc` is
    /// allocated once at its final size.
    fn into_shared(self) -> Arc<[ModelUsed]> {
        let len = self.len;
        self.slots
            .into_iter()
            .take(len)
            .map(|m| m.expect("every slot below len is filled"))
            .collect()
    }
}

/// `models` text of the Altermatt model.
const ALTERMATT_DESCRIPTION: &str = "Altermatt et al. 2006: level E0/(1 + (N/N_ref)^c) from the \
     band edge, a fraction 1/(1 + (N/N_b)^d) localized with occupancy \
     1/(1 + g exp(+-(E_F - E_level)/kT)), the rest always ionized; N = density of all dopants \
     of the same kind";
/// `models` text of the Pearson-Bardeen model.
const PEARSON_BARDEEN_DESCRIPTION: &str = "Pearson-Bardeen: level E0 - alpha N^(1/3) from the \
     band edge (E0 the dopant's dilute level), occupancy 1/(1 + g exp(+-(E_F - E_level)/kT)); \
     N = density of all dopants of the same kind; where E0 - alpha N^(1/3) <= 0 the level has \
     merged with the band (level 0 eV) and the species counts as fully ionized";
/// `models` text of the constant level.
const DILUTE_DESCRIPTION: &str = "dilute: constant level, 1/(1 + g exp(+-(E_F - E_level)/kT))";

/// Online log-sum-exp: the sum is e^max * sum, and slope_sum / sum is the
/// term-weighted mean of the terms' d ln / du.
struct LogSum {
    max: f64,
    sum: f64,
    slope_sum: f64,
}

impl LogSum {
    /// Starts with one finite term.
    fn new(ln_term: f64, slope: f64) -> LogSum {
        LogSum {
            max: ln_term,
            sum: 1.0,
            slope_sum: slope,
        }
    }

    #[inline]
    fn add(&mut self, ln_term: f64, slope: f64) {
        if ln_term <= self.max {
            let w = (ln_term - self.max).exp();
            self.sum += w;
            self.slope_sum += w * slope;
        } else {
            let w = (self.max - ln_term).exp();
            self.sum = self.sum * w + 1.0;
            self.slope_sum = self.slope_sum * w + slope;
            self.max = ln_term;
        }
    }
}

/// ln F_1/2(eta). Below [`BOLTZMANN_LN_ETA`] this is eta itself: the
/// first correction, ln(1 - e^eta / 2^1.5), is then below 3e-17 in absolute
/// terms, under the rounding of eta, so the call to the series is skipped.
#[inline]
fn ln_f_half(eta: f64) -> f64 {
    if eta < BOLTZMANN_LN_ETA {
        eta
    } else {
        fd::ln_f_half(eta)
    }
}

/// d ln F_1/2(eta) / d eta = F_-1/2(eta) / F_1/2(eta).
///
/// For eta < [`SERIES_DERIVATIVE_ETA`] the two leading terms of the
/// polylogarithm series of both integrals give the ratio to about t^3 < 4e-11
/// relative (t = e^eta), plenty for a Newton slope, with one exponential.
#[inline]
fn fd_ratio(eta: f64) -> f64 {
    fd_ratio_with(eta, || eta.exp())
}

/// [`fd_ratio`] with `exp(eta)` from the caller (asked for only where the series needs it).
#[inline]
fn fd_ratio_with(eta: f64, exp_eta: impl FnOnce() -> f64) -> f64 {
    if eta < BOLTZMANN_DERIVATIVE_ETA {
        1.0
    } else if eta < SERIES_DERIVATIVE_ETA {
        let t = exp_eta();
        // F_j = t (1 - t / 2^(j+1) + t^2 / 3^(j+1) - ...)
        (1.0 - t * std::f64::consts::FRAC_1_SQRT_2 + t * t * 0.577_350_269_189_625_8)
            / (1.0 - t * 0.353_553_390_593_273_8 + t * t * 0.192_450_089_729_875_3)
    } else if eta > SOMMERFELD_DERIVATIVE_ETA {
        1.5 / eta
    } else {
        fd::f_minus_half(eta) / fd::f_half(eta)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_temperature_below_the_floor_is_refused_and_says_why() {
        let si = crate::materials::silicon();
        let boron = si.dopant("B").expect("B in si");
        let doping = [DopantDensity {
            dopant: boron,
            density_cm3: 4.5e20,
        }];
        for t in [1e-310, f64::MIN_POSITIVE, 1e-301] {
            let error =
                solve(&si, t, &doping, &SolveOptions::default()).expect_err("below 1e-300 K");
            assert_eq!(
                error.to_string(),
                format!(
                    "temperature_k: {t:e} is not allowed; give a finite value > 0 K, at least \
                     1e-300 K (below it E/kT overflows the floating-point range)"
                )
            );
        }
        let eq =
            solve(&si, MIN_TEMPERATURE_K, &doping, &SolveOptions::default()).expect("1e-300 K");
        assert!(eq.fermi_minus_conduction_ev.is_finite());
        assert!(eq.log10_electrons_cm3.is_finite());
    }
    use crate::bandgap::Varshni;
    use crate::materials::{self, Dopant};

    fn doping(m: &Material, list: &[(&str, f64)]) -> Vec<DopantDensity> {
        list.iter()
            .map(|&(s, n)| DopantDensity {
                dopant: m.dopant(s).unwrap(),
                density_cm3: n,
            })
            .collect()
    }

    #[test]
    fn derivative_shortcuts_match_the_integrals() {
        // The Newton slope needs a few digits; the shortcuts give far more.
        for eta in [-19.9, -12.0, -8.1] {
            let exact = fd::f_minus_half(eta) / fd::f_half(eta);
            assert!((fd_ratio(eta) / exact - 1.0).abs() < 1e-10, "{eta}");
        }
        let exact = fd::f_minus_half(2e4) / fd::f_half(2e4);
        assert!((fd_ratio(2e4) / exact - 1.0).abs() < 1e-8);
        assert!((ln_f_half(-37.5) - fd::ln_f_half(-37.5)).abs() < 1e-15);
    }

    #[test]
    fn linear_and_logarithmic_evaluations_agree() {
        let m = materials::silicon();
        // Altermatt with a tiny and with a large always-ionized part, and a merged
        // Pearson-Bardeen level (Ga at 2e19 acceptors).
        for list in [
            &[("P", 1e17), ("B", 3e16), ("In", 1e15)][..],
            &[("P", 1e19), ("Ga", 2e19), ("B", 1e15)][..],
        ] {
            let d = doping(&m, list);
            for options in [
                SolveOptions::default(),
                SolveOptions {
                    ionization_model: IonizationModel::Dilute,
                    ..Default::default()
                },
            ] {
                evaluations_agree(&m, &d, &options);
            }
        }
    }

    fn evaluations_agree(m: &Material, d: &[DopantDensity], options: &SolveOptions) {
        let problem = Problem::new(m, d, options).unwrap();
        for t in [20.0, 77.0, 300.0, 900.0] {
            let f = problem.frame(t).unwrap();
            for u in [
                -5.0,
                0.0,
                0.3 * f.gap,
                0.5 * f.gap,
                f.gap - 1.0,
                f.gap + 8.0,
            ] {
                let linear = problem.evaluate_linear(&f, u).unwrap();
                let log = problem.evaluate_log(&f, u);
                // Both are exact to rounding of ln terms of size < 60 (h) and
                // to the derivative shortcuts (dh, 1e-10).
                assert!((linear.h - log.h).abs() < 1e-12, "{t} K, u = {u}");
                assert!((linear.dh - log.dh).abs() < 1e-9, "{t} K, u = {u}");
            }
        }
    }

    #[test]
    fn the_closed_form_guess_lands_next_to_the_root_at_room_temperature() {
        // The guess is checked against the solver's own h (the relative charge residual), so
        // this holds the claim in `nondegenerate_guess`: at most one Newton step then finishes.
        let m = materials::silicon();
        for (majority, minority) in [("P", "B"), ("As", "B"), ("B", "P")] {
            for n in [1e13, 1e15, 1e16, 1e17] {
                let d = doping(&m, &[(majority, n), (minority, 0.1 * n)]);
                let options = SolveOptions::default();
                let problem = Problem::new(&m, &d, &options).unwrap();
                let f = problem.frame(300.0).unwrap();
                let u = problem
                    .nondegenerate_guess(&f)
                    .expect("non-degenerate at 300 K");
                let h = problem.evaluate(&f, u).h;
                let limit = if n <= 1e15 { 1e-11 } else { 1e-7 };
                assert!(h.abs() < limit, "{majority} {n:e}: h = {h:e}");
            }
        }
    }

    #[test]
    fn extreme_temperatures_converge_or_are_refused() {
        // Invented material with a temperature-independent gap, for the range test only.
        let mut m = materials::silicon();
        m.varshni = Varshni {
            eg0_ev: 1.1,
            alpha_ev_per_k: 0.0,
            beta_k: 0.0,
        };
        m.dopants
            .push(Dopant::new("Deep", DopantKind::Donor, 0.5, 2.0, "demo").unwrap());
        let d = doping(&m, &[("P", 1e16), ("B", 1e15), ("Deep", 1e17)]);
        for t in [1e-3, 0.1, 1.0, 5.0, 1e4, 1e6, 1e12] {
            let e = solve(&m, t, &d, &SolveOptions::default()).unwrap();
            assert!(e.fermi_minus_valence_ev.is_finite(), "{t} K");
            // At 1 mK, Eg/kT = 1.3e7: f64 resolves h only to about 8 eps Eg/kT = 2e-8.
            let limit = if t < 0.01 { 5e-8 } else { 1e-9 };
            assert!(
                e.relative_residual < limit,
                "{t} K: {}",
                e.relative_residual
            );
        }
    }

    #[test]
    fn always_ionized_dopants_keep_carriers_at_any_temperature() {
        // 1e20 cm^-3 P is metallic: b = 0.0015 (Altermatt et al. 2006, P set, formula
        // evaluated), so n stays at (1 - b) N = 0.9985e20 down to 1 K, through the logarithmic
        // evaluation.
        let m = materials::silicon();
        let d = doping(&m, &[("P", 1e20), ("B", 1e15)]);
        for t in [1.0, 5.0, 30.0] {
            let e = solve(&m, t, &d, &SolveOptions::default()).unwrap();
            assert!(e.relative_residual < 1e-9, "{t} K");
            let b = e.species[0].localized_fraction;
            assert!((1e-3..2e-3).contains(&b), "{b}");
            // At 1 K the localized donors are all neutral and n sits on the floor itself,
            // up to the solver's 1e-12 residual.
            let floor = ((1.0 - b) * 1e20 - 1e15) * (1.0 - 1e-11);
            assert!(
                e.electrons_cm3 >= floor && e.electrons_cm3 < 1e20,
                "{t} K: {}",
                e.electrons_cm3
            );
            assert_eq!(e.regime, Regime::Extrinsic, "{t} K");
        }
    }

    #[test]
    fn exact_compensation_is_intrinsic_like() {
        let m = materials::silicon();
        let e = solve(
            &m,
            300.0,
            &doping(&m, &[("P", 1e16), ("B", 1e16)]),
            &SolveOptions::default(),
        )
        .unwrap();
        assert!(e.relative_residual < 1e-9);
        assert_eq!(e.regime, Regime::Intrinsic);
        // Phosphorus and boron have the same 45 meV depth; n and p stay near ni.
        assert!(e.electrons_cm3 < 1e12 && e.holes_cm3 < 1e12);
    }

    #[test]
    fn zero_density_species_are_reported_and_ignored() {
        let m = materials::silicon();
        let with_zero = solve(
            &m,
            300.0,
            &doping(&m, &[("P", 1e15), ("In", 0.0)]),
            &SolveOptions::default(),
        )
        .unwrap();
        let without = solve(
            &m,
            300.0,
            &doping(&m, &[("P", 1e15)]),
            &SolveOptions::default(),
        )
        .unwrap();
        assert_eq!(with_zero.species.len(), 2);
        assert_eq!(with_zero.species[1].ionized_cm3, 0.0);
        assert_eq!(
            with_zero.fermi_minus_valence_ev,
            without.fermi_minus_valence_ev
        );
    }
}
