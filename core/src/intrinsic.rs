//! Intrinsic carrier density.

use crate::constants::thermal_energy_ev;

/// Intrinsic density from the effective densities of states and the gap.
///
/// # Formula
/// ni = sqrt(Nc Nv) exp(-Eg / 2kT), Boltzmann statistics, cm^-3.
pub fn from_dos_cm3(nc_cm3: f64, nv_cm3: f64, band_gap_ev: f64, temperature_k: f64) -> f64 {
    (nc_cm3 * nv_cm3).sqrt() * (-band_gap_ev / (2.0 * thermal_energy_ev(temperature_k))).exp()
}
