//! Temperature dependence of the band gap (Varshni form).
//!
//! The parameter set [`Varshni`] is data in [`crate::params`]; this module evaluates it and
//! refuses a gap that is not positive.

use crate::errors::CarrierError;
use crate::materials::Material;

pub use crate::params::Varshni;

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
}

/// The Varshni gap of `material`, refused where it is not positive.
pub(crate) fn band_gap_checked(
    material: &Material,
    temperature_k: f64,
) -> Result<f64, CarrierError> {
    let eg = material.varshni.band_gap_ev(temperature_k);
    if eg > 0.0 {
        Ok(eg)
    } else {
        Err(CarrierError::NonPositiveBandGap {
            material: material.id.clone(),
            temperature_k,
            band_gap_ev: eg,
        })
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
