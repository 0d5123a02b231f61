//! Parameter sets of the carrier models as plain data, with the published sets the built-in
//! materials carry.
//!
//! Each set is a struct of numbers (and its source), the check of its fields, and nothing
//! more: the formula that evaluates a set is an `impl` block in the module of its model
//! ([`crate::bandgap`], [`crate::dos`], [`crate::bgn`], [`crate::intrinsic`],
//! [`crate::ionization`]). So [`crate::materials`] can hold the sets without depending on any
//! model, and every model stands on the data below it. Each type is also re-exported from its
//! model module (`bandgap::Varshni`, `ionization::AltermattParameters`, ...).

use std::borrow::Cow;

use serde::{Deserialize, Serialize};

/// Varshni parameters: Eg(T) = Eg0 - alpha T^2 / (T + beta).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Varshni {
    /// Band gap at 0 K, eV.
    pub eg0_ev: f64,
    /// alpha, eV/K.
    pub alpha_ev_per_k: f64,
    /// beta, K.
    pub beta_k: f64,
}

impl Varshni {
    /// The fields that break the formula, as (field name, value, what is allowed).
    ///
    /// Eg0 must be finite and > 0, alpha finite (either sign: a few
    /// materials have a gap that grows with temperature), beta finite and >= 0
    /// so that T + beta never vanishes for T > 0.
    pub(crate) fn invalid_field(&self) -> Option<(&'static str, f64, &'static str)> {
        if !(self.eg0_ev.is_finite() && self.eg0_ev > 0.0) {
            return Some(("varshni.eg0_ev", self.eg0_ev, "a finite value > 0 eV"));
        }
        if !self.alpha_ev_per_k.is_finite() {
            return Some((
                "varshni.alpha_ev_per_k",
                self.alpha_ev_per_k,
                "a finite value in eV/K",
            ));
        }
        if !(self.beta_k.is_finite() && self.beta_k >= 0.0) {
            return Some(("varshni.beta_k", self.beta_k, "a finite value >= 0 K"));
        }
        None
    }
}

/// Reference temperature of the power laws, K.
pub const REFERENCE_TEMPERATURE_K: f64 = 300.0;

/// A power law N(T) = N300 (T/300)^exponent, the usual way published
/// effective densities of states are stated.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct PowerLaw {
    /// Value at 300 K, cm^-3.
    pub at_300k_cm3: f64,
    /// Temperature exponent (1.5 for a temperature-independent effective mass).
    pub exponent: f64,
}

impl PowerLaw {
    pub(crate) fn invalid_field(&self) -> Option<(&'static str, f64, &'static str)> {
        if !(self.at_300k_cm3.is_finite() && self.at_300k_cm3 > 0.0) {
            return Some(("at_300k_cm3", self.at_300k_cm3, "a finite value > 0 cm^-3"));
        }
        if !self.exponent.is_finite() {
            return Some(("exponent", self.exponent, "a finite number"));
        }
        None
    }
}

/// Parameters of the Slotboom form dEg = E1 [ln(N/N0) + sqrt(ln^2(N/N0) + C)].
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SlotboomParams {
    /// Short name of the set, e.g. "Slotboom-de Graaff 1977".
    pub name: Cow<'static, str>,
    /// E1, eV.
    pub e1_ev: f64,
    /// N0, cm^-3.
    pub n0_cm3: f64,
    /// C (dimensionless).
    pub c: f64,
    /// Where the set is published.
    pub source: Cow<'static, str>,
}

impl SlotboomParams {
    pub(crate) fn invalid_field(&self) -> Option<(&'static str, f64, &'static str)> {
        if !(self.e1_ev.is_finite() && self.e1_ev >= 0.0) {
            return Some(("e1_ev", self.e1_ev, "a finite value >= 0 eV"));
        }
        if !(self.n0_cm3.is_finite() && self.n0_cm3 > 0.0) {
            return Some(("n0_cm3", self.n0_cm3, "a finite value > 0 cm^-3"));
        }
        if !(self.c.is_finite() && self.c > 0.0) {
            return Some(("c", self.c, "a finite value > 0"));
        }
        None
    }
}

/// The Slotboom & de Graaff 1977 set for silicon.
///
/// # References
/// Slotboom & de Graaff, IEEE Trans. Electron Devices 24, 1123 (1977):
/// E1 = 6.92 meV, N0 = 1.3e17 cm^-3, C = 0.5.
pub fn slotboom_de_graaff_1977() -> SlotboomParams {
    SlotboomParams {
        name: "Slotboom-de Graaff 1977".into(),
        // Source: Slotboom & de Graaff, IEEE Trans. Electron Devices 24, 1123 (1977).
        e1_ev: 6.92e-3,
        n0_cm3: 1.3e17,
        c: 0.5,
        source: "SlotboomDeGraaff1977: Slotboom & de Graaff, IEEE Trans. Electron Devices 24, \
                 1123 (1977)"
            .into(),
    }
}

/// A published direct fit ni(T) = A (T/300 K)^b exp(-c/T).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct IntrinsicFit {
    /// Short name of the fit, e.g. "Misiakos-Tsamakis 1993".
    pub name: Cow<'static, str>,
    /// A, cm^-3.
    pub prefactor_cm3: f64,
    /// b (dimensionless).
    pub exponent: f64,
    /// c, K.
    pub activation_k: f64,
    /// Lowest temperature of the fitted data, K.
    pub min_temperature_k: f64,
    /// Highest temperature of the fitted data, K.
    pub max_temperature_k: f64,
    /// Where the fit is published.
    pub source: Cow<'static, str>,
}

impl IntrinsicFit {
    pub(crate) fn invalid_field(&self) -> Option<(&'static str, f64, &'static str)> {
        if !(self.prefactor_cm3.is_finite() && self.prefactor_cm3 > 0.0) {
            return Some((
                "prefactor_cm3",
                self.prefactor_cm3,
                "a finite value > 0 cm^-3",
            ));
        }
        if !self.exponent.is_finite() {
            return Some(("exponent", self.exponent, "a finite number"));
        }
        if !(self.activation_k.is_finite() && self.activation_k >= 0.0) {
            return Some(("activation_k", self.activation_k, "a finite value >= 0 K"));
        }
        if !(self.min_temperature_k.is_finite() && self.min_temperature_k > 0.0) {
            return Some((
                "min_temperature_k",
                self.min_temperature_k,
                "a finite value > 0 K",
            ));
        }
        if !(self.max_temperature_k.is_finite() && self.max_temperature_k >= self.min_temperature_k)
        {
            return Some((
                "max_temperature_k",
                self.max_temperature_k,
                "a finite value >= min_temperature_k",
            ));
        }
        None
    }
}

/// The Misiakos & Tsamakis direct fit for silicon.
///
/// # Formula
/// ni = 5.29e19 (T/300)^2.54 exp(-6726/T) cm^-3.
///
/// # Validity
/// 78-340 K (the range of their capacitance measurements).
///
/// # References
/// Misiakos & Tsamakis, J. Appl. Phys. 74, 3293 (1993).
pub fn misiakos_tsamakis_1993() -> IntrinsicFit {
    IntrinsicFit {
        name: "Misiakos-Tsamakis 1993".into(),
        // Source: Misiakos & Tsamakis, J. Appl. Phys. 74, 3293 (1993): 5.29e19, 2.54, 6726 K, 78-340 K.
        prefactor_cm3: 5.29e19,
        exponent: 2.54,
        activation_k: 6726.0,
        min_temperature_k: 78.0,
        max_temperature_k: 340.0,
        source: "MisiakosTsamakis1993: Misiakos & Tsamakis, J. Appl. Phys. 74, 3293 (1993)".into(),
    }
}

/// Citation of the Altermatt model and its parameter table.
pub const ALTERMATT_SOURCE: &str = "Altermatt2006: Altermatt, Schenk, Schmithuesen, Heiser, J. Appl. \
     Phys. 100, 113714 (2006) (Si:P) and 113715 (2006) (Si:As, Si:B), Table 1";
/// Citation of the Pearson-Bardeen lowering and of the alpha values.
pub const PEARSON_BARDEEN_SOURCE: &str = "PearsonBardeen1949: Pearson, Bardeen, Phys. Rev. 75, 865 \
     (1949); alpha 3.1e-8 eV cm (donors), 3.037e-8 eV cm (acceptors): widely used defaults \
     (from memory)";

/// One parameter set of the Altermatt et al. (2006) ionization model, carried by the dopant
/// it belongs to ([`Dopant::altermatt`](crate::materials::Dopant::altermatt)).
///
/// # Formula
/// E(N) = E0 / (1 + (N/N_ref)^c) (eV, from the band edge); b(N) = 1 / (1 + (N/N_b)^d), the
/// fraction of the dopants that stays localized; N in cm^-3.
///
/// # References
/// Altermatt, Schenk, Schmithuesen, Heiser, J. Appl. Phys. 100, 113714 and 113715 (2006),
/// Table 1 (the values). The way the two functions enter the ionized density (the localized
/// fraction b follows Fermi-Dirac occupancy of the level E(N) with the usual g, the rest
/// 1 - b counts as ionized at every temperature) is this module's reading of their
/// simplified model for device simulation, from memory; it reproduces their statement that
/// incomplete ionization at 300 K peaks near the Mott transition (about a quarter of Si:P
/// neutral near 2e18 cm^-3).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AltermattParameters {
    /// E0, the dilute-limit level, eV (the set's own, which may differ from the dopant's
    /// `ionization_energy_ev`).
    pub e0_ev: f64,
    /// N_ref, cm^-3.
    pub n_ref_cm3: f64,
    /// c, dimensionless.
    pub c: f64,
    /// N_b, cm^-3.
    pub n_b_cm3: f64,
    /// d, dimensionless.
    pub d: f64,
    /// Where the set comes from.
    pub source: Cow<'static, str>,
}

// Source: Altermatt et al., J. Appl. Phys. 100, 113715 (2006), Table 1 (P from part I, 113714):
// E0, N_ref, c, N_b, d.
/// Phosphorus in silicon: 45.5 meV, 3e18 cm^-3, 2, 6e18 cm^-3, 2.3.
pub const ALTERMATT_SI_PHOSPHORUS: AltermattParameters = AltermattParameters {
    e0_ev: 0.0455,
    n_ref_cm3: 3e18,
    c: 2.0,
    n_b_cm3: 6e18,
    d: 2.3,
    source: Cow::Borrowed(ALTERMATT_SOURCE),
};
/// Arsenic in silicon: 53.7 meV, 4e18 cm^-3, 1.5, 1.4e19 cm^-3, 3.
pub const ALTERMATT_SI_ARSENIC: AltermattParameters = AltermattParameters {
    e0_ev: 0.0537,
    n_ref_cm3: 4e18,
    c: 1.5,
    n_b_cm3: 1.4e19,
    d: 3.0,
    source: Cow::Borrowed(ALTERMATT_SOURCE),
};
/// Boron in silicon: 44.39 meV, 1.7e18 cm^-3, 1.4, 6e18 cm^-3, 2.4.
pub const ALTERMATT_SI_BORON: AltermattParameters = AltermattParameters {
    e0_ev: 0.04439,
    n_ref_cm3: 1.7e18,
    c: 1.4,
    n_b_cm3: 6e18,
    d: 2.4,
    source: Cow::Borrowed(ALTERMATT_SOURCE),
};

impl AltermattParameters {
    /// The first field outside its allowed range: (name, value, what is allowed).
    pub fn invalid_field(&self) -> Option<(&'static str, f64, &'static str)> {
        // Plain tests in field order (every solve validates its dopants).
        let positive = |v: f64| v.is_finite() && v > 0.0;
        if !(self.e0_ev.is_finite() && self.e0_ev >= 0.0) {
            Some(("e0_ev", self.e0_ev, "a finite value >= 0 eV"))
        } else if !positive(self.n_ref_cm3) {
            Some(("n_ref_cm3", self.n_ref_cm3, "a finite value > 0 cm^-3"))
        } else if !positive(self.c) {
            Some(("c", self.c, "a finite value > 0"))
        } else if !positive(self.n_b_cm3) {
            Some(("n_b_cm3", self.n_b_cm3, "a finite value > 0 cm^-3"))
        } else if !positive(self.d) {
            Some(("d", self.d, "a finite value > 0"))
        } else {
            None
        }
    }
}

/// The Pearson-Bardeen alpha values of a host material ([`Material::pearson_bardeen`](crate::materials::Material::pearson_bardeen)).
///
/// # Formula
/// E(N) = E0 - alpha N^(1/3), alpha in eV cm, N in cm^-3 ([`pearson_bardeen_level_ev`](crate::ionization::pearson_bardeen_level_ev)).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct PearsonBardeenParameters {
    /// alpha for donors, eV cm.
    pub donor_alpha_ev_cm: f64,
    /// alpha for acceptors, eV cm.
    pub acceptor_alpha_ev_cm: f64,
    /// Where the values come from.
    pub source: Cow<'static, str>,
}

/// Silicon: alpha 3.1e-8 eV cm for donors, 3.037e-8 eV cm for acceptors (widely used
/// defaults, from memory; the form is Pearson & Bardeen's, Phys. Rev. 75, 865 (1949)).
pub const PEARSON_BARDEEN_SILICON: PearsonBardeenParameters = PearsonBardeenParameters {
    donor_alpha_ev_cm: 3.1e-8,
    acceptor_alpha_ev_cm: 3.037e-8,
    source: Cow::Borrowed(PEARSON_BARDEEN_SOURCE),
};

impl PearsonBardeenParameters {
    /// The first field outside its allowed range: (name, value, what is allowed).
    pub fn invalid_field(&self) -> Option<(&'static str, f64, &'static str)> {
        [
            ("donor_alpha_ev_cm", self.donor_alpha_ev_cm),
            ("acceptor_alpha_ev_cm", self.acceptor_alpha_ev_cm),
        ]
        .into_iter()
        .find(|&(_, v)| !(v.is_finite() && v >= 0.0))
        .map(|(name, v)| (name, v, "a finite value >= 0 eV cm"))
    }
}
