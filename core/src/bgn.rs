//! Band-gap narrowing at heavy doping (Slotboom form).

use std::borrow::Cow;

use serde::{Deserialize, Serialize};

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
    /// Narrowing in eV at total dopant density `total_doping_cm3`.
    ///
    /// # Formula
    /// dEg = E1 [x + sqrt(x^2 + C)], x = ln(N/N0); evaluated as
    /// E1 C / (sqrt(x^2 + C) - x) for x < 0 so that dEg -> 0 smoothly as N -> 0
    /// (N = 0 gives exactly 0).
    ///
    /// # Validity
    /// Apparent narrowing in silicon, 1e17 to about 1e20 cm^-3 for the 1977
    /// set; it is tied to the intrinsic density and statistics it was fitted
    /// with (Boltzmann, ni about 1.4e10 at 300 K), so treat it as an estimate
    /// when combined with Fermi-Dirac statistics.
    ///
    /// # References
    /// Slotboom & de Graaff, Solid-State Electron. 19, 857 (1976); revised
    /// parameters in IEEE Trans. Electron Devices 24, 1123 (1977).
    pub fn narrowing_ev(&self, total_doping_cm3: f64) -> f64 {
        if total_doping_cm3 <= 0.0 {
            return 0.0;
        }
        let x = (total_doping_cm3 / self.n0_cm3).ln();
        let root = (x * x + self.c).sqrt();
        let bracket = if x >= 0.0 {
            x + root
        } else {
            self.c / (root - x)
        };
        self.e1_ev * bracket
    }

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

/// Which band-gap narrowing model to apply.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
#[non_exhaustive]
pub enum BgnModel {
    /// The Slotboom-form set stored with the material
    /// ([`crate::materials::Material::band_gap_narrowing`]; silicon:
    /// Slotboom & de Graaff 1977). An error for a material without one.
    MaterialSet,
    /// An explicit Slotboom-form set (for user-defined materials).
    Slotboom(SlotboomParams),
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

#[cfg(test)]
mod tests {
    use super::*;

    /// The check value is quoted to four significant figures.
    const FOUR_FIGURES: f64 = 1e-4;

    #[test]
    fn silicon_set_at_1e19() {
        // Source: Slotboom & de Graaff 1977 formula evaluated at N = 1e19 cm^-3:
        // 6.92 meV [ln(76.92) + sqrt(ln^2(76.92) + 0.5)] = 60.50 meV (published formula evaluated).
        approx::assert_relative_eq!(
            slotboom_de_graaff_1977().narrowing_ev(1e19),
            60.50e-3,
            max_relative = FOUR_FIGURES
        );
    }

    #[test]
    fn vanishes_without_doping_and_is_smooth_below_n0() {
        let p = slotboom_de_graaff_1977();
        assert_eq!(p.narrowing_ev(0.0), 0.0);
        // Both branches of the evaluation agree at N = N0: E1 sqrt(C).
        approx::assert_relative_eq!(
            p.narrowing_ev(1.3e17),
            6.92e-3 * 0.5f64.sqrt(),
            max_relative = 1e-14
        );
        // Far below N0 the form tends to E1 C / (2 |ln(N/N0)|) (formula expanded): 0.109 meV at 1e10.
        let x = (1e10f64 / 1.3e17).ln().abs();
        approx::assert_relative_eq!(
            p.narrowing_ev(1e10),
            6.92e-3 * 0.5 / (2.0 * x),
            max_relative = 1e-3
        );
    }
}
