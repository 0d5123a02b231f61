//! Band-gap narrowing at heavy doping (Slotboom form).
//!
//! The parameter set [`SlotboomParams`] and the published silicon set are data in
//! [`crate::params`]; this module evaluates the form and names the model choice.

use serde::{Deserialize, Serialize};

pub use crate::params::{SlotboomParams, slotboom_de_graaff_1977};

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
