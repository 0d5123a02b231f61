//! Intrinsic carrier density: from the densities of states and the gap, or a published direct fit.
//!
//! # Convention
//! The default model is [`IntrinsicModel::DensityOfStates`]: ni = sqrt(Nc Nv)
//! exp(-Eg/2kT) with the material's own Varshni gap and Nc(T), Nv(T). It
//! applies to every material and every temperature at which the gap is
//! positive, and it is the model the Fermi-Dirac neutrality solver uses
//! natively. For silicon it gives 1.07e10 cm^-3 at 300 K (Green 1990 Nc, Nv
//! with the Thurmond 1975 gap), about 10 % above the re-evaluated measurement
//! of Altermatt et al. (2003), 9.65e9 cm^-3. Choose
//! [`IntrinsicModel::DirectFit`] to use the material's published direct fit
//! instead (silicon: Misiakos & Tsamakis 1993, 9.70e9 cm^-3 at 300 K, valid
//! 78-340 K); the solver then scales Nc and Nv by one common factor so that
//! n p = ni_fit^2 in the non-degenerate limit.
//!
//! The fit's parameter set [`IntrinsicFit`] and the published silicon fit are data in
//! [`crate::params`]; this module evaluates them.

use serde::{Deserialize, Serialize};

use crate::bandgap::band_gap_checked;
use crate::constants::thermal_energy_ev;
use crate::errors::{CarrierError, check_temperature};
use crate::materials::Material;

pub use crate::params::{IntrinsicFit, misiakos_tsamakis_1993};

/// Which intrinsic-density model to use.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
#[non_exhaustive]
pub enum IntrinsicModel {
    /// ni = sqrt(Nc Nv) exp(-Eg/2kT) from the material's Varshni gap and
    /// density-of-states power laws (the default; see the module docs).
    #[default]
    DensityOfStates,
    /// The material's published direct fit of ni(T) ([`Material::intrinsic_fit`]),
    /// only within the fit's stated temperature range.
    DirectFit,
}

impl IntrinsicFit {
    /// ln ni(T) of the fit, without range check.
    ///
    /// # Formula
    /// ln ni = ln A + b ln(T/300) - c/T.
    pub fn ln_density_cm3(&self, temperature_k: f64) -> f64 {
        self.prefactor_cm3.ln() + self.exponent * (temperature_k / 300.0).ln()
            - self.activation_k / temperature_k
    }

    /// ni(T) in cm^-3 within the fit's stated range.
    ///
    /// # Errors
    /// [`CarrierError::InvalidTemperature`] for T not finite or <= 0;
    /// [`CarrierError::OutsideModelRange`] outside [min, max] of the fit.
    pub fn density_cm3(&self, temperature_k: f64) -> Result<f64, CarrierError> {
        self.check_range(temperature_k)?;
        Ok(self.ln_density_cm3(temperature_k).exp())
    }

    pub(crate) fn check_range(&self, temperature_k: f64) -> Result<(), CarrierError> {
        check_temperature(temperature_k)?;
        if temperature_k < self.min_temperature_k || temperature_k > self.max_temperature_k {
            return Err(CarrierError::OutsideModelRange {
                model: self.name.to_string(),
                temperature_k,
                min_k: self.min_temperature_k,
                max_k: self.max_temperature_k,
            });
        }
        Ok(())
    }
}

/// Intrinsic density from the effective densities of states and the gap.
///
/// # Formula
/// ni = sqrt(Nc Nv) exp(-Eg / 2kT), Boltzmann statistics, cm^-3.
///
/// # Validity
/// Non-degenerate intrinsic material (always true unless Eg is a few kT or less).
/// Underflows to 0 below about 20 K for silicon; use [`ln_from_dos`] there.
pub fn from_dos_cm3(nc_cm3: f64, nv_cm3: f64, band_gap_ev: f64, temperature_k: f64) -> f64 {
    (nc_cm3 * nv_cm3).sqrt() * (-band_gap_ev / (2.0 * thermal_energy_ev(temperature_k))).exp()
}

/// ln ni from ln Nc, ln Nv and the gap: finite at any T > 0.
///
/// # Formula
/// ln ni = (ln Nc + ln Nv)/2 - Eg / 2kT.
pub fn ln_from_dos(ln_nc_cm3: f64, ln_nv_cm3: f64, band_gap_ev: f64, temperature_k: f64) -> f64 {
    0.5 * (ln_nc_cm3 + ln_nv_cm3) - band_gap_ev / (2.0 * thermal_energy_ev(temperature_k))
}

/// Intrinsic density of `material` at `temperature_k` with `model`, cm^-3.
///
/// # Formula
/// See [`IntrinsicModel`].
///
/// # Errors
/// [`CarrierError::InvalidTemperature`]; [`CarrierError::InvalidMaterial`];
/// [`CarrierError::NonPositiveBandGap`] where the Varshni gap is <= 0;
/// [`CarrierError::ModelNotAvailable`] when `DirectFit` is asked of a material
/// without a fit; [`CarrierError::OutsideModelRange`] outside the fit's range.
pub fn intrinsic_density(
    material: &Material,
    temperature_k: f64,
    model: IntrinsicModel,
) -> Result<f64, CarrierError> {
    check_temperature(temperature_k)?;
    material.validate().map_err(CarrierError::InvalidMaterial)?;
    let eg = band_gap_checked(material, temperature_k)?;
    match model {
        IntrinsicModel::DensityOfStates => Ok(ln_from_dos(
            material.nc.ln_at(temperature_k),
            material.nv.ln_at(temperature_k),
            eg,
            temperature_k,
        )
        .exp()),
        IntrinsicModel::DirectFit => match &material.intrinsic_fit {
            Some(fit) => fit.density_cm3(temperature_k),
            None => Err(CarrierError::ModelNotAvailable {
                model: "intrinsic_model: direct_fit",
                material: material.id.clone(),
            }),
        },
    }
}

impl Material {
    /// Intrinsic density in cm^-3 at `temperature_k` from the Varshni gap and
    /// Nc, Nv (Boltzmann statistics, no validation; NaN or 0 outside T > 0).
    ///
    /// # Formula
    /// ni = sqrt(Nc(T) Nv(T)) exp(-Eg(T) / 2kT).
    ///
    /// For the selectable models and validated input use
    /// [`intrinsic_density`].
    pub fn intrinsic_density_cm3(&self, temperature_k: f64) -> f64 {
        from_dos_cm3(
            self.nc.at(temperature_k),
            self.nv.at(temperature_k),
            self.varshni.band_gap_ev(temperature_k),
            temperature_k,
        )
    }
}
