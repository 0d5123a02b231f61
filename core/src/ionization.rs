//! Ionization of dopant levels: occupancy with a ground-state degeneracy factor, and how the level depends on dopant density.
//!
//! # Public API
//! - [`donor_ionized_fraction`], [`acceptor_ionized_fraction`]: occupancy of one level.
//! - [`IonizationModel`]: how a species' level depends on the density of its kind, with stable
//!   ids `altermatt`, `pearson-bardeen`, `dilute` ([`IonizationModel::id`],
//!   [`IonizationModel::from_id`]).
//! - [`AltermattParameters`] (carried by a [`Dopant`]) with the published silicon sets
//!   [`ALTERMATT_SI_PHOSPHORUS`], [`ALTERMATT_SI_ARSENIC`], [`ALTERMATT_SI_BORON`];
//!   [`PearsonBardeenParameters`] (carried by a [`Material`]) with [`PEARSON_BARDEEN_SILICON`];
//!   [`pearson_bardeen_level_ev`]. The sets are data in [`crate::params`] (re-exported here);
//!   this module holds the formulas that evaluate them.
//! - [`effective_level`]: the level, localized fraction and model a solve uses for one species.
//! - [`IonizationError`].
//!
//! # Which model applies to which species
//! The selected model is used for every species it has parameters for; any other species uses
//! the next model in the order `altermatt` -> `pearson-bardeen` -> `dilute`, and every result
//! names the model actually used per species. The parameters travel with the data, so a
//! material read from a file keeps them: `altermatt` needs the dopant's
//! [`Dopant::altermatt`] set (built in for P, As and B in silicon); `pearson-bardeen` needs
//! the host's [`Material::pearson_bardeen`] alpha values (built in for silicon, where they
//! apply to any dopant, user-defined ones included); `dilute` needs nothing. So the default
//! (`altermatt`) gives Altermatt for Si:P, Si:As, Si:B, Pearson-Bardeen for Sb, Al, Ga, In and
//! user-defined dopants in silicon, and the constant (dilute) level in every other built-in
//! material.
//!
//! # Density used
//! N in E(N) and b(N) is the total density of all dopants of the same kind as the species (all
//! donors for a donor, all acceptors for an acceptor), not the total doping and not only the
//! species itself. The impurity band and the Mott transition come from the overlap of the bound
//! states of like dopants, whatever their element; dopants of the other kind bind no carrier of
//! the same sign and do not join that band. For singly doped material, the case the published
//! parameters were fitted to, the three choices coincide; summing over the kind also makes a
//! species split into two entries give the same answer.

use std::fmt;

use serde::{Deserialize, Serialize};

use crate::constants::thermal_energy_ev;
use crate::materials::{Dopant, DopantKind, Material};

pub use crate::params::{
    ALTERMATT_SI_ARSENIC, ALTERMATT_SI_BORON, ALTERMATT_SI_PHOSPHORUS, ALTERMATT_SOURCE,
    AltermattParameters, PEARSON_BARDEEN_SILICON, PEARSON_BARDEEN_SOURCE, PearsonBardeenParameters,
};

/// Fraction of donors that are ionized (positive).
///
/// # Formula
/// N_D+ / N_D = 1 / (1 + g_D exp((E_F - E_D)/kT)), evaluated as
/// 1 / (1 + exp(ln g_D + (E_F - E_D)/kT)); an overflowing exponential gives
/// the correct limit 0, never NaN.
///
/// # Validity
/// A single level per species. How the level and the part of the species that
/// follows it depend on dopant density is the business of [`effective_level`]; this
/// function is the occupancy of whatever level it is given.
///
/// # References
/// Sze, Physics of Semiconductor Devices, 2nd ed. (1981), ch. 1 (from memory);
/// the degeneracy factor convention g_D = 2, g_A = 4 is common practice.
pub fn donor_ionized_fraction(
    fermi_minus_level_ev: f64,
    degeneracy: f64,
    temperature_k: f64,
) -> f64 {
    let z = degeneracy.ln() + fermi_minus_level_ev / thermal_energy_ev(temperature_k);
    logistic_complement(z)
}

/// Fraction of acceptors that are ionized (negative).
///
/// # Formula
/// N_A- / N_A = 1 / (1 + g_A exp((E_A - E_F)/kT)), evaluated in the same
/// stable form as [`donor_ionized_fraction`].
///
/// # Validity
/// As for [`donor_ionized_fraction`].
///
/// # References
/// Sze 1981, ch. 1 (from memory).
pub fn acceptor_ionized_fraction(
    level_minus_fermi_ev: f64,
    degeneracy: f64,
    temperature_k: f64,
) -> f64 {
    donor_ionized_fraction(level_minus_fermi_ev, degeneracy, temperature_k)
}

/// ln(1 + e^x) and the logistic function e^x / (1 + e^x) = d softplus / dx,
/// sharing one exponential. Beyond |x| = 37 the e^-|x| corrections are below
/// the rounding of the result and are left out; below x = -11.5 (e^x < 1e-5)
/// ln(1 + e) is its series e - e^2/2 + e^3/3, whose remainder e^4/4 is below
/// 2.5e-16 of the result.
#[inline]
pub(crate) fn softplus_and_logistic(x: f64) -> (f64, f64) {
    if x > 37.0 {
        (x, 1.0)
    } else if x < -37.0 {
        let e = x.exp();
        (e, e)
    } else if x < -11.5 {
        let e = x.exp();
        (e * (1.0 - e * (0.5 - e / 3.0)), e / (1.0 + e))
    } else if x > 0.0 {
        let e = (-x).exp();
        (x + e.ln_1p(), 1.0 / (1.0 + e))
    } else {
        let e = x.exp();
        (e.ln_1p(), e / (1.0 + e))
    }
}

/// 1 / (1 + e^x), the ionized fraction for x = ln g + (distance to the level)/kT.
/// Exact to rounding for every x (e^x overflows to +inf above 709, giving 0).
#[inline]
pub(crate) fn logistic_complement(x: f64) -> f64 {
    1.0 / (1.0 + x.exp())
}

/// How a dopant level depends on the density of dopants of its kind.
///
/// See the module documentation for which species each model covers and the fallback order.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum IonizationModel {
    /// Altermatt et al. (2006): the level moves towards its band edge, E(N) = E0/(1 + (N/N_ref)^c),
    /// and only a fraction b(N) = 1/(1 + (N/N_b)^d) of the dopants stays localized and follows
    /// the occupancy of that level; the rest is always ionized. Silicon P, As, B.
    #[default]
    Altermatt,
    /// Pearson & Bardeen (1949): E(N) = E0 - alpha N^(1/3); where that is <= 0 the level has
    /// merged with the band and the species is taken as fully ionized. Any dopant in silicon.
    PearsonBardeen,
    /// A constant level at the dopant's own (dilute-limit) ionization energy.
    Dilute,
}

impl IonizationModel {
    /// Every model, in fallback order.
    pub const ALL: [IonizationModel; 3] = [
        IonizationModel::Altermatt,
        IonizationModel::PearsonBardeen,
        IonizationModel::Dilute,
    ];

    /// Stable identifier for command lines, files and the UI.
    pub fn id(self) -> &'static str {
        match self {
            IonizationModel::Altermatt => "altermatt",
            IonizationModel::PearsonBardeen => "pearson-bardeen",
            IonizationModel::Dilute => "dilute",
        }
    }

    /// The model with identifier `id` (case-insensitive, surrounding spaces ignored).
    ///
    /// # Errors
    /// [`IonizationError::UnknownModel`] for any other text.
    pub fn from_id(id: &str) -> Result<IonizationModel, IonizationError> {
        IonizationModel::ALL
            .into_iter()
            .find(|m| m.id().eq_ignore_ascii_case(id.trim()))
            .ok_or_else(|| IonizationError::UnknownModel { id: id.to_string() })
    }

    /// Human-readable name.
    pub fn name(self) -> &'static str {
        match self {
            IonizationModel::Altermatt => "Altermatt et al. (2006) incomplete ionization",
            IonizationModel::PearsonBardeen => "Pearson-Bardeen level lowering",
            IonizationModel::Dilute => "dilute (constant) level",
        }
    }

    /// Short citation of the primary source.
    pub fn reference(self) -> &'static str {
        match self {
            IonizationModel::Altermatt => ALTERMATT_SOURCE,
            IonizationModel::PearsonBardeen => PEARSON_BARDEEN_SOURCE,
            IonizationModel::Dilute => {
                "each dopant's own ionization energy (see the dopant's source)"
            }
        }
    }
}

impl fmt::Display for IonizationModel {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.id())
    }
}

/// Why an ionization-model request was refused.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum IonizationError {
    /// No ionization model has this id.
    UnknownModel {
        /// The id given.
        id: String,
    },
}

impl fmt::Display for IonizationError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            IonizationError::UnknownModel { id } => write!(
                f,
                "ionization model: '{id}' is not known; use one of {}",
                IonizationModel::ALL.map(IonizationModel::id).join(", ")
            ),
        }
    }
}

impl std::error::Error for IonizationError {}

impl AltermattParameters {
    /// E(N) = E0 / (1 + (N/N_ref)^c), eV; E0 at N = 0, > 0 for every finite N.
    ///
    /// # Validity
    /// Fitted near room temperature (see [`effective_level`]).
    pub fn level_ev(&self, density_cm3: f64) -> f64 {
        self.e0_ev / (1.0 + ratio_power(density_cm3, self.n_ref_cm3, self.c))
    }

    /// b(N) = 1 / (1 + (N/N_b)^d): the localized fraction, 1 at N = 0, falling to 0.
    pub fn localized_fraction(&self, density_cm3: f64) -> f64 {
        1.0 / (1.0 + ratio_power(density_cm3, self.n_b_cm3, self.d))
    }

    /// 1 - b(N) = x/(1 + x), x = (N/N_b)^d, without the cancellation of 1 - b at low N.
    pub fn delocalized_fraction(&self, density_cm3: f64) -> f64 {
        fractions(ratio_power(density_cm3, self.n_b_cm3, self.d)).1
    }
}

/// (N / N_ref)^p for N >= 0 and N_ref, p > 0, as exp(p ln(N / N_ref)): a logarithm and an
/// exponential take about half the time of a general power, and every solve prepares its species
/// with two of them. The relative error is about |p ln(N / N_ref)| ulp; where the power is not
/// negligible beside 1 (N within a few decades of N_ref) that is a few ulp, far under the
/// precision of the fitted parameters. N = 0 gives 0 and N = inf gives inf, as the power does.
fn ratio_power(density_cm3: f64, reference_cm3: f64, exponent: f64) -> f64 {
    (exponent * (density_cm3 / reference_cm3).ln()).exp()
}

/// (b, 1 - b) from x = (N/N_b)^d: 1/(1 + x) and x/(1 + x), exact to rounding for any x >= 0.
fn fractions(x: f64) -> (f64, f64) {
    if x.is_infinite() {
        (0.0, 1.0)
    } else {
        let inverse = 1.0 / (1.0 + x);
        (inverse, x * inverse)
    }
}

impl PearsonBardeenParameters {
    /// alpha for `kind`, eV cm.
    pub fn alpha_ev_cm(&self, kind: DopantKind) -> f64 {
        match kind {
            DopantKind::Donor => self.donor_alpha_ev_cm,
            DopantKind::Acceptor => self.acceptor_alpha_ev_cm,
        }
    }
}

/// The Pearson-Bardeen level E0 - alpha N^(1/3), eV; it may be zero or negative.
///
/// # Formula
/// E(N) = E0 - alpha N^(1/3), E0 in eV, alpha in eV cm, N in cm^-3.
///
/// # Validity
/// A value <= 0 means the level has merged with the band: [`effective_level`] then counts the
/// species as fully ionized (localized fraction 0) and reports the level as 0. This is a step,
/// not a smooth limit: just below the merging density the occupancy of a level at the band edge
/// still leaves a part of the dopants neutral.
///
/// # References
/// Pearson, Bardeen, Phys. Rev. 75, 865 (1949); alpha values: widely used defaults (from memory).
pub fn pearson_bardeen_level_ev(e0_ev: f64, alpha_ev_cm: f64, density_cm3: f64) -> f64 {
    e0_ev - alpha_ev_cm * density_cm3.cbrt()
}

/// The level a solve uses for one species.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EffectiveLevel {
    /// The model actually used for this species.
    pub model: IonizationModel,
    /// Distance of the level from its band edge, eV (0 when merged with the band).
    pub level_from_band_edge_ev: f64,
    /// Fraction of the dopants that follow the occupancy of the level (b(N) for Altermatt, 0 for
    /// a Pearson-Bardeen level merged with the band, 1 otherwise); the rest is always ionized.
    pub localized_fraction: f64,
    /// 1 - localized_fraction, computed without cancellation.
    pub delocalized_fraction: f64,
    /// True when a Pearson-Bardeen level has merged with the band.
    pub merged_with_band: bool,
}

/// The level of `dopant` in `material` at a density `kind_density_cm3` of its kind, with
/// `requested` as the preferred model.
///
/// # Formula
/// Altermatt: E(N) and b(N) of the dopant's [`AltermattParameters`] (their own E0, not the
/// dopant's dilute level); Pearson-Bardeen: [`pearson_bardeen_level_ev`] with the dopant's
/// dilute level as E0 and the material's alpha; dilute: the dopant's level, b = 1. The ionized
/// density is then N [(1 - b) + b / (1 + g exp(+-(E_F - E_level)/kT))].
///
/// # Validity
/// Altermatt et al. fitted their sets to silicon near room temperature. At cryogenic
/// temperatures the always-ionized part (1 - b) N (4e9 cm^-3 of 1e16 cm^-3 phosphorus) sets a
/// floor under the free-carrier density that lightly doped silicon does not show; choose
/// `dilute` (or `pearson-bardeen`) for freeze-out studies of light doping.
///
/// # References
/// [`ALTERMATT_SOURCE`], [`PEARSON_BARDEEN_SOURCE`].
pub fn effective_level(
    material: &Material,
    dopant: &Dopant,
    kind_density_cm3: f64,
    requested: IonizationModel,
) -> EffectiveLevel {
    let n = kind_density_cm3;
    if requested == IonizationModel::Altermatt
        && let Some(p) = &dopant.altermatt
    {
        // One power for both fractions (a solve prepares every species, so this is on the
        // hot path).
        let (localized, delocalized) = fractions(ratio_power(n, p.n_b_cm3, p.d));
        return EffectiveLevel {
            model: IonizationModel::Altermatt,
            level_from_band_edge_ev: p.level_ev(n),
            localized_fraction: localized,
            delocalized_fraction: delocalized,
            merged_with_band: false,
        };
    }
    if requested != IonizationModel::Dilute
        && let Some(pb) = &material.pearson_bardeen
    {
        let e =
            pearson_bardeen_level_ev(dopant.ionization_energy_ev, pb.alpha_ev_cm(dopant.kind), n);
        let merged = e <= 0.0;
        return EffectiveLevel {
            model: IonizationModel::PearsonBardeen,
            level_from_band_edge_ev: if merged { 0.0 } else { e },
            localized_fraction: if merged { 0.0 } else { 1.0 },
            delocalized_fraction: if merged { 1.0 } else { 0.0 },
            merged_with_band: merged,
        };
    }
    EffectiveLevel {
        model: IonizationModel::Dilute,
        level_from_band_edge_ev: dopant.ionization_energy_ev,
        localized_fraction: 1.0,
        delocalized_fraction: 0.0,
        merged_with_band: false,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fermi_level_at_the_donor_level_ionizes_one_third() {
        // Source: the occupancy formula with g_D = 2 at E_F = E_D gives 1/(1 + 2) (formula evaluated).
        approx::assert_relative_eq!(
            donor_ionized_fraction(0.0, 2.0, 300.0),
            1.0 / 3.0,
            max_relative = 1e-15
        );
        approx::assert_relative_eq!(
            acceptor_ionized_fraction(0.0, 4.0, 77.0),
            0.2,
            max_relative = 1e-15
        );
    }

    #[test]
    fn extreme_arguments_stay_finite() {
        assert_eq!(donor_ionized_fraction(-10.0, 2.0, 5.0), 1.0);
        assert_eq!(donor_ionized_fraction(10.0, 2.0, 5.0), 0.0);
        assert_eq!(softplus_and_logistic(1e308), (1e308, 1.0));
        assert_eq!(softplus_and_logistic(-1e308), (0.0, 0.0));
        let (s, l) = softplus_and_logistic(-800.0);
        assert!(s >= 0.0 && (0.0..1e-300).contains(&l));
        assert_eq!(logistic_complement(1000.0), 0.0);
        assert_eq!(logistic_complement(-1000.0), 1.0);
    }

    #[test]
    fn each_model_falls_back_in_order() {
        use crate::materials::{self, DopantKind};
        let si = materials::silicon();
        let ge = materials::germanium();
        let p = si.dopant("P").unwrap();
        let level = |m: &Material, d: &Dopant, model| effective_level(m, d, 1e18, model);
        let a = level(&si, &p, IonizationModel::Altermatt);
        assert_eq!(a.model, IonizationModel::Altermatt);
        // Source: Pearson & Bardeen 1949 form with the dopant's own 45 meV (Sze 1981):
        // 45 meV - 3.1e-8 eV cm * 1e6 cm^-1 = 14 meV (formula evaluated).
        let pb = level(&si, &p, IonizationModel::PearsonBardeen);
        assert_eq!(pb.model, IonizationModel::PearsonBardeen);
        assert!((pb.level_from_band_edge_ev - 0.014).abs() < 1e-15);
        let dilute = level(&si, &p, IonizationModel::Dilute);
        assert_eq!(dilute.level_from_band_edge_ev, 0.045);
        // No Altermatt set: Sb in silicon, or a user-defined dopant; no host alpha: germanium.
        let sb = si.dopant("Sb").unwrap();
        let sb_level = level(&si, &sb, IonizationModel::Altermatt);
        assert_eq!(sb_level.model, IonizationModel::PearsonBardeen);
        let user = Dopant::new("X", DopantKind::Acceptor, 0.045, 4.0, "demo").unwrap();
        let user_level = level(&si, &user, IonizationModel::Altermatt);
        assert_eq!(user_level.model, IonizationModel::PearsonBardeen);
        let ge_p = ge.dopant("P").unwrap();
        for model in IonizationModel::ALL {
            assert_eq!(level(&ge, &ge_p, model).model, IonizationModel::Dilute);
        }
        // Merged: E0 - alpha N^(1/3) <= 0 means fully ionized, level reported as 0.
        let merged = effective_level(&si, &sb, 1e19, IonizationModel::PearsonBardeen);
        assert!(merged.merged_with_band);
        assert_eq!(
            (
                merged.level_from_band_edge_ev,
                merged.localized_fraction,
                merged.delocalized_fraction
            ),
            (0.0, 0.0, 1.0)
        );
        assert!(pearson_bardeen_level_ev(0.039, 3.1e-8, 1e19) < 0.0);
    }

    #[test]
    fn bad_parameter_sets_are_named() {
        let mut p = ALTERMATT_SI_BORON;
        assert_eq!(p.invalid_field(), None);
        p.d = f64::NAN;
        assert_eq!(p.invalid_field().map(|f| f.0), Some("d"));
        let mut pb = PEARSON_BARDEEN_SILICON;
        pb.acceptor_alpha_ev_cm = -1.0;
        assert_eq!(
            pb.invalid_field(),
            Some(("acceptor_alpha_ev_cm", -1.0, "a finite value >= 0 eV cm"))
        );
    }

    #[test]
    fn softplus_branches_agree_with_the_direct_formula() {
        for x in [-36.9, -20.0, -11.6, -11.4, -1.0, 0.0, 1.0, 20.0, 36.9] {
            let (s, l) = softplus_and_logistic(x);
            let direct = x.exp().ln_1p();
            assert!((s - direct).abs() <= 4e-16 * direct.abs(), "softplus({x})");
            assert!(
                (l - 1.0 / (1.0 + (-x).exp())).abs() <= 4e-16,
                "logistic({x})"
            );
        }
    }
}
