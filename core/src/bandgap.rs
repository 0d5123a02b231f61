//! Temperature dependence of the band gap (Varshni form).

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
    /// Band gap in eV at `temperature_k`.
    ///
    /// # Formula
    /// Eg(T) = Eg0 - alpha T^2 / (T + beta), T in K, Eg in eV.
    ///
    /// # Validity
    /// The fitted range of each parameter set (see the material's source);
    /// the caller validates T > 0.
    ///
    /// # References
    /// Varshni, Physica 34, 149 (1967).
    pub fn band_gap_ev(&self, temperature_k: f64) -> f64 {
        let t = temperature_k;
        self.eg0_ev - self.alpha_ev_per_k * t * t / (t + self.beta_k)
    }
}
