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
    /// the caller validates T > 0. The result can be zero or negative far
    /// above a parameter set's range (germanium above about 1770 K); the
    /// neutrality solver rejects such temperatures with a typed error.
    ///
    /// # References
    /// Varshni, Physica 34, 149 (1967).
    pub fn band_gap_ev(&self, temperature_k: f64) -> f64 {
        let t = temperature_k;
        self.eg0_ev - self.alpha_ev_per_k * t * t / (t + self.beta_k)
    }

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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zero_kelvin_gives_eg0() {
        let v = Varshni {
            eg0_ev: 1.17,
            alpha_ev_per_k: 4.73e-4,
            beta_k: 636.0,
        };
        // Source: the Varshni form itself: the T^2 term vanishes at T = 0.
        assert_eq!(v.band_gap_ev(0.0), 1.17);
    }

    #[test]
    fn negative_beta_is_rejected() {
        let v = Varshni {
            eg0_ev: 1.0,
            alpha_ev_per_k: 1e-4,
            beta_k: -1.0,
        };
        assert_eq!(v.invalid_field().map(|f| f.0), Some("varshni.beta_k"));
    }
}
