//! Effective densities of states of the conduction and valence bands.
//!
//! The power law [`PowerLaw`] is data in [`crate::params`]; this module evaluates it.

use crate::constants::{BOLTZMANN_J_PER_K, ELECTRON_MASS_KG, PLANCK_J_S};

pub use crate::params::{PowerLaw, REFERENCE_TEMPERATURE_K};

impl PowerLaw {
    /// N(T) in cm^-3.
    ///
    /// # Formula
    /// N(T) = N300 (T / 300 K)^exponent.
    pub fn at(&self, temperature_k: f64) -> f64 {
        self.at_300k_cm3 * (temperature_k / REFERENCE_TEMPERATURE_K).powf(self.exponent)
    }

    /// ln N(T), finite wherever T > 0 (no overflow for extreme temperatures).
    pub fn ln_at(&self, temperature_k: f64) -> f64 {
        self.at_300k_cm3.ln() + self.exponent * (temperature_k / REFERENCE_TEMPERATURE_K).ln()
    }

    /// The power law of a parabolic band with a temperature-independent
    /// density-of-states effective mass `mass_ratio` (m*/m0).
    ///
    /// # Formula
    /// N(T) = 2 (2 pi m* k T / h^2)^(3/2), so N300 = N(300 K) and exponent 3/2.
    ///
    /// # References
    /// Any solid-state text, e.g. Sze, Physics of Semiconductor Devices,
    /// 2nd ed. (1981), ch. 1.
    pub fn from_effective_mass(mass_ratio: f64) -> PowerLaw {
        PowerLaw {
            at_300k_cm3: effective_density_cm3(mass_ratio, REFERENCE_TEMPERATURE_K),
            exponent: 1.5,
        }
    }
}

/// Effective density of states of a parabolic band, cm^-3.
///
/// # Formula
/// N = 2 (2 pi m* m0 k T / h^2)^(3/2), m* = `mass_ratio`, converted from m^-3 to cm^-3.
///
/// # Validity
/// Parabolic band, non-degenerate reference; returns NaN for negative inputs.
///
/// # References
/// Sze, Physics of Semiconductor Devices, 2nd ed. (1981), ch. 1 (from memory);
/// constants CODATA 2018.
pub fn effective_density_cm3(mass_ratio: f64, temperature_k: f64) -> f64 {
    let m = mass_ratio * ELECTRON_MASS_KG;
    let per_m3 = 2.0
        * (2.0 * std::f64::consts::PI * m * BOLTZMANN_J_PER_K * temperature_k
            / (PLANCK_J_S * PLANCK_J_S))
            .powf(1.5);
    per_m3 * 1e-6
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Reference value is quoted to 6 significant figures.
    const SIX_FIGURES: f64 = 1e-5;

    #[test]
    fn free_electron_mass_at_300_k() {
        // Source: N = 2 (2 pi m0 k T / h^2)^(3/2) evaluated with CODATA 2018
        // constants at 300 K: 2.50941e19 cm^-3 (published formula evaluated).
        approx::assert_relative_eq!(
            effective_density_cm3(1.0, 300.0),
            2.50941e19,
            max_relative = SIX_FIGURES
        );
    }

    #[test]
    fn ln_at_matches_at() {
        let p = PowerLaw {
            at_300k_cm3: 2.86e19,
            exponent: 1.58,
        };
        approx::assert_relative_eq!(p.ln_at(77.0).exp(), p.at(77.0), max_relative = 1e-13);
    }
}
