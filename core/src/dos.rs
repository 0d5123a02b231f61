//! Effective densities of states of the conduction and valence bands.

use serde::{Deserialize, Serialize};

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
    /// N(T) in cm^-3.
    ///
    /// # Formula
    /// N(T) = N300 (T / 300 K)^exponent.
    pub fn at(&self, temperature_k: f64) -> f64 {
        self.at_300k_cm3 * (temperature_k / 300.0).powf(self.exponent)
    }
}
