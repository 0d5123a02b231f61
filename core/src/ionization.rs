//! Ionization of dopant levels: occupancy with a ground-state degeneracy factor, in stable forms.

use crate::constants::thermal_energy_ev;

/// Fraction of donors that are ionized (positive).
///
/// # Formula
/// N_D+ / N_D = 1 / (1 + g_D exp((E_F - E_D)/kT)), evaluated as
/// 1 / (1 + exp(ln g_D + (E_F - E_D)/kT)); an overflowing exponential gives
/// the correct limit 0, never NaN.
///
/// # Validity
/// A single level per species, non-interacting dopants (no impurity band, no
/// concentration-dependent lowering of the level).
///
/// # References
/// Sze, Physics of Semiconductor Devices, 2nd ed. (1981), ch. 1 (from memory);
/// the degeneracy factor convention g_D = 2, g_A = 4 is common practice.
pub fn donor_ionized_fraction(
    fermi_minus_level_ev: f64,
    degeneracy: f64,
    temperature_k: f64,
) -> f64 {
    let z = degeneracy.ln() + fermi_minus_level_ev / thermal_energy_ev(temperature_k);
    logistic_complement(z)
}

/// Fraction of acceptors that are ionized (negative).
///
/// # Formula
/// N_A- / N_A = 1 / (1 + g_A exp((E_A - E_F)/kT)), evaluated in the same
/// stable form as [`donor_ionized_fraction`].
///
/// # Validity
/// As for [`donor_ionized_fraction`].
///
/// # References
/// Sze 1981, ch. 1 (from memory).
pub fn acceptor_ionized_fraction(
    level_minus_fermi_ev: f64,
    degeneracy: f64,
    temperature_k: f64,
) -> f64 {
    donor_ionized_fraction(level_minus_fermi_ev, degeneracy, temperature_k)
}

/// ln(1 + e^x) and the logistic function e^x / (1 + e^x) = d softplus / dx,
/// sharing one exponential. Beyond |x| = 37 the e^-|x| corrections are below
/// the rounding of the result and are left out; below x = -11.5 (e^x < 1e-5)
/// ln(1 + e) is its series e - e^2/2 + e^3/3, whose remainder e^4/4 is below
/// 2.5e-16 of the result.
#[inline]
pub(crate) fn softplus_and_logistic(x: f64) -> (f64, f64) {
    if x > 37.0 {
        (x, 1.0)
    } else if x < -37.0 {
        let e = x.exp();
        (e, e)
    } else if x < -11.5 {
        let e = x.exp();
        (e * (1.0 - e * (0.5 - e / 3.0)), e / (1.0 + e))
    } else if x > 0.0 {
        let e = (-x).exp();
        (x + e.ln_1p(), 1.0 / (1.0 + e))
    } else {
        let e = x.exp();
        (e.ln_1p(), e / (1.0 + e))
    }
}

/// 1 / (1 + e^x), the ionized fraction for x = ln g + (distance to the level)/kT.
/// Exact to rounding for every x (e^x overflows to +inf above 709, giving 0).
#[inline]
pub(crate) fn logistic_complement(x: f64) -> f64 {
    1.0 / (1.0 + x.exp())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fermi_level_at_the_donor_level_ionizes_one_third() {
        // Source: the occupancy formula with g_D = 2 at E_F = E_D gives 1/(1 + 2) (formula evaluated).
        approx::assert_relative_eq!(
            donor_ionized_fraction(0.0, 2.0, 300.0),
            1.0 / 3.0,
            max_relative = 1e-15
        );
        approx::assert_relative_eq!(
            acceptor_ionized_fraction(0.0, 4.0, 77.0),
            0.2,
            max_relative = 1e-15
        );
    }

    #[test]
    fn extreme_arguments_stay_finite() {
        assert_eq!(donor_ionized_fraction(-10.0, 2.0, 5.0), 1.0);
        assert_eq!(donor_ionized_fraction(10.0, 2.0, 5.0), 0.0);
        assert_eq!(softplus_and_logistic(1e308), (1e308, 1.0));
        assert_eq!(softplus_and_logistic(-1e308), (0.0, 0.0));
        let (s, l) = softplus_and_logistic(-800.0);
        assert!(s >= 0.0 && (0.0..1e-300).contains(&l));
        assert_eq!(logistic_complement(1000.0), 0.0);
        assert_eq!(logistic_complement(-1000.0), 1.0);
    }

    #[test]
    fn softplus_branches_agree_with_the_direct_formula() {
        for x in [-36.9, -20.0, -11.6, -11.4, -1.0, 0.0, 1.0, 20.0, 36.9] {
            let (s, l) = softplus_and_logistic(x);
            let direct = x.exp().ln_1p();
            assert!((s - direct).abs() <= 4e-16 * direct.abs(), "softplus({x})");
            assert!(
                (l - 1.0 / (1.0 + (-x).exp())).abs() <= 4e-16,
                "logistic({x})"
            );
        }
    }
}
