//! Physical constants, each with its unit in the name and its source.
//!
//! Source: SI 2019 redefinition (exact values) and CODATA 2018 recommended
//! values (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)).

/// Boltzmann constant in eV/K (exact since SI 2019: 1.380649e-23 J/K divided by q).
pub const BOLTZMANN_EV_PER_K: f64 = 8.617_333_262e-5;
/// Elementary charge in coulomb (exact since SI 2019).
pub const ELEMENTARY_CHARGE_C: f64 = 1.602_176_634e-19;
/// Planck constant in J s (exact since SI 2019).
pub const PLANCK_J_S: f64 = 6.626_070_15e-34;
/// Boltzmann constant in J/K (exact since SI 2019).
pub const BOLTZMANN_J_PER_K: f64 = 1.380_649e-23;
/// Electron rest mass in kg (CODATA 2018).
pub const ELECTRON_MASS_KG: f64 = 9.109_383_701_5e-31;
/// Vacuum permittivity in F/cm (CODATA 2018: 8.8541878128e-12 F/m).
pub const VACUUM_PERMITTIVITY_F_PER_CM: f64 = 8.854_187_812_8e-14;
/// 0 degrees Celsius in kelvin (definition of the Celsius scale).
pub const ZERO_CELSIUS_K: f64 = 273.15;

/// Thermal energy kT in eV at `temperature_k`.
#[inline]
pub fn thermal_energy_ev(temperature_k: f64) -> f64 {
    BOLTZMANN_EV_PER_K * temperature_k
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn kt_at_300_k() {
        // Source: CODATA 2018 k = 8.617333262e-5 eV/K, so kT(300 K) = 0.02585200 eV.
        approx::assert_relative_eq!(thermal_energy_ev(300.0), 0.025_852_0, max_relative = 1e-6);
    }
}
