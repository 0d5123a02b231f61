//! The error type and input checks the carrier models share, below every model that uses them.
//!
//! [`CarrierError`] is what the band-gap, intrinsic-density and neutrality computations refuse
//! input with; [`MIN_TEMPERATURE_K`] and [`MAX_DENSITY_CM3`] are the limits they check against.
//! All three are re-exported from [`crate::neutrality`], where callers have always found them.

use std::fmt;

use crate::materials::MaterialError;

/// Lowest temperature accepted, K: below about 1e-304 K the thermal energy kT is not a normal
/// floating-point number and the reduced energies E/kT overflow. Far below any physical
/// temperature; every temperature from here up solves.
pub const MIN_TEMPERATURE_K: f64 = 1e-300;

/// Largest dopant density accepted, cm^-3: above the atomic density of any
/// solid (silicon has 5.0e22 atoms per cm^3), so nothing physical is refused.
pub const MAX_DENSITY_CM3: f64 = 1e24;

/// Why a carrier computation was refused.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum CarrierError {
    /// Temperature not finite or not > 0.
    InvalidTemperature {
        /// The value given, K.
        value: f64,
    },
    /// A dopant density not finite, negative or above [`MAX_DENSITY_CM3`].
    InvalidDensity {
        /// The species.
        symbol: String,
        /// The value given, cm^-3.
        value: f64,
    },
    /// The material or a dopant failed validation.
    InvalidMaterial(MaterialError),
    /// The Varshni gap (after narrowing) is zero or negative at this temperature.
    NonPositiveBandGap {
        /// Material id.
        material: String,
        /// Temperature, K.
        temperature_k: f64,
        /// The gap the model gives, eV.
        band_gap_ev: f64,
    },
    /// A dopant level would lie outside the gap (ionization energy >= gap).
    LevelOutsideGap {
        /// The species.
        symbol: String,
        /// Its ionization energy, eV.
        ionization_energy_ev: f64,
        /// The gap at this temperature, eV.
        band_gap_ev: f64,
    },
    /// The selected model has no parameters for this material.
    ModelNotAvailable {
        /// The option, e.g. "intrinsic_model: direct_fit".
        model: &'static str,
        /// Material id.
        material: String,
    },
    /// The temperature is outside the stated range of a fitted model.
    OutsideModelRange {
        /// Model name.
        model: String,
        /// The temperature given, K.
        temperature_k: f64,
        /// Lowest temperature of the fit, K.
        min_k: f64,
        /// Highest temperature of the fit, K.
        max_k: f64,
    },
    /// A sweep grid specification is unusable.
    InvalidGrid {
        /// Which part, e.g. "points".
        field: &'static str,
        /// The value given.
        value: f64,
        /// What is allowed.
        allowed: &'static str,
    },
    /// The iteration did not converge (not expected: the method is bracketed).
    NotConverged {
        /// Temperature, K.
        temperature_k: f64,
    },
}

impl fmt::Display for CarrierError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CarrierError::InvalidTemperature { value }
                if *value > 0.0 && *value < MIN_TEMPERATURE_K =>
            {
                write!(
                    f,
                    "temperature_k: {value:e} is not allowed; give a finite value > 0 K, at least \
                 {MIN_TEMPERATURE_K:e} K (below it E/kT overflows the floating-point range)"
                )
            }
            CarrierError::InvalidTemperature { value } => write!(
                f,
                "temperature_k: {value} is not allowed; give a finite value > 0 K"
            ),
            CarrierError::InvalidDensity { symbol, value } => write!(
                f,
                "density_cm3 of {symbol}: {value} is not allowed; give a finite value \
                 from 0 to {MAX_DENSITY_CM3:e} cm^-3"
            ),
            CarrierError::InvalidMaterial(e) => e.fmt(f),
            CarrierError::NonPositiveBandGap {
                material,
                temperature_k,
                band_gap_ev,
            } => write!(
                f,
                "temperature_k: {temperature_k} is not allowed for {material}: the band gap \
                 model gives {band_gap_ev:.4} eV there; give a temperature where the gap is > 0"
            ),
            CarrierError::LevelOutsideGap {
                symbol,
                ionization_energy_ev,
                band_gap_ev,
            } => write!(
                f,
                "dopant {symbol}: ionization_energy_ev {ionization_energy_ev} is not allowed \
                 here; give a value below the band gap ({band_gap_ev:.4} eV at this temperature)"
            ),
            CarrierError::ModelNotAvailable { model, material } => write!(
                f,
                "{model} is not available for {material}: the material carries no parameters \
                 for it; choose another model"
            ),
            CarrierError::OutsideModelRange {
                model,
                temperature_k,
                min_k,
                max_k,
            } => write!(
                f,
                "temperature_k: {temperature_k} is outside the range of {model}; give \
                 {min_k}-{max_k} K or choose another model"
            ),
            CarrierError::InvalidGrid {
                field,
                value,
                allowed,
            } => {
                write!(f, "{field}: {value} is not allowed; give {allowed}")
            }
            CarrierError::NotConverged { temperature_k } => write!(
                f,
                "the neutrality solve at {temperature_k} K did not converge; please report \
                 the input"
            ),
        }
    }
}

impl std::error::Error for CarrierError {}

impl From<MaterialError> for CarrierError {
    fn from(e: MaterialError) -> Self {
        CarrierError::InvalidMaterial(e)
    }
}

/// `temperature_k` if it is finite and at least [`MIN_TEMPERATURE_K`].
pub(crate) fn check_temperature(temperature_k: f64) -> Result<(), CarrierError> {
    if temperature_k.is_finite() && temperature_k >= MIN_TEMPERATURE_K {
        Ok(())
    } else {
        Err(CarrierError::InvalidTemperature {
            value: temperature_k,
        })
    }
}
