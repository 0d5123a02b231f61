//! How numbers are shown: result cells, chart tick labels and CSV cells.
//!
//! Results are shown in the same e-notation engineers type (`1.076e10`), so a value can
//! be copied from the page into a field, a spreadsheet or a run card unchanged.

/// Significant digits of a displayed result: four, enough to compare with handbook
/// tables, few enough not to suggest a precision the models do not have.
pub const RESULT_DIGITS: usize = 4;

/// A result in e-notation with [`RESULT_DIGITS`] significant digits (`1.076e10`);
/// an em dash for a value that is not finite.
pub fn sci(value: f64) -> String {
    if !value.is_finite() {
        return "—".into();
    }
    format!("{value:.prec$e}", prec = RESULT_DIGITS - 1)
}

/// A result with a fixed number of decimals (energies in eV, percentages).
pub fn fixed(value: f64, decimals: usize) -> String {
    if !value.is_finite() {
        return "—".into();
    }
    let text = format!("{value:.decimals$}");
    // "-0.000" reads as a sign error to an engineer; show zero plainly.
    if text
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        text.trim_start_matches('-').to_string()
    } else {
        text
    }
}

/// A number that can be either ordinary (`23.5`, `0.0125`) or huge/tiny (`1.2e18`):
/// plain decimals between 1e-3 and 1e5, e-notation otherwise.
pub fn auto(value: f64) -> String {
    let a = value.abs();
    if !value.is_finite() {
        "—".into()
    } else if a == 0.0 || (1e-3..1e5).contains(&a) {
        let digits = if a == 0.0 {
            0
        } else {
            (RESULT_DIGITS as i32 - 1 - a.log10().floor() as i32).max(0) as usize
        };
        fixed(value, digits)
    } else {
        sci(value)
    }
}

/// A fraction as a percentage with `decimals` decimals (`0.9987` -> `99.87 %`).
pub fn percent(fraction: f64, decimals: usize) -> String {
    format!("{} %", fixed(100.0 * fraction, decimals))
}

const SUPERSCRIPT_DIGITS: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];

/// `10` to an integer power with superscript digits (`10¹⁶`, `10⁻³`).
pub fn power_of_ten(exponent: i32) -> String {
    let mut out = String::from("10");
    if exponent < 0 {
        out.push('⁻');
    }
    for d in exponent.unsigned_abs().to_string().bytes() {
        out.push(SUPERSCRIPT_DIGITS[(d - b'0') as usize]);
    }
    out
}

/// The tick label of a log axis at `log10_value`: a power of ten at whole decades,
/// otherwise the value with two significant digits (`3.2×10¹⁶`).
pub fn log_tick(log10_value: f64) -> String {
    let rounded = log10_value.round();
    if (log10_value - rounded).abs() < 1e-6 {
        return power_of_ten(rounded as i32);
    }
    let exponent = log10_value.floor() as i32;
    let mantissa = 10f64.powf(log10_value - f64::from(exponent));
    format!("{mantissa:.1}×{}", power_of_ten(exponent))
}

/// The tick label of a linear axis: as few digits as the tick spacing needs.
pub fn linear_tick(value: f64) -> String {
    let a = value.abs();
    if a != 0.0 && !(1e-3..1e5).contains(&a) {
        return format!("{value:.1e}");
    }
    // Ticks sit on round numbers; trimming zeros removes the float noise.
    let text = format!("{value:.4}");
    let text = text.trim_end_matches('0').trim_end_matches('.');
    if text == "-0" {
        "0".into()
    } else {
        text.into()
    }
}

/// A number for a CSV cell: the shortest text that reads back as the same f64.
pub fn csv_number(value: f64) -> String {
    if value.is_finite() {
        format!("{value:e}")
    } else {
        String::new()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn results_use_four_significant_digits() {
        assert_eq!(sci(1.0761e10), "1.076e10");
        assert_eq!(sci(-2.5e-3), "-2.500e-3");
        assert_eq!(sci(f64::NAN), "—");
        assert_eq!("1.076e10".parse::<f64>(), Ok(1.076e10));
    }

    #[test]
    fn fixed_hides_negative_zero() {
        assert_eq!(fixed(-0.00001, 3), "0.000");
        assert_eq!(fixed(-0.25, 3), "-0.250");
        assert_eq!(fixed(f64::INFINITY, 2), "—");
    }

    #[test]
    fn auto_switches_to_e_notation_outside_ordinary_range() {
        assert_eq!(auto(23.456), "23.46");
        assert_eq!(auto(0.012345), "0.01235");
        assert_eq!(auto(1234.6), "1235");
        assert_eq!(auto(2.0e18), "2.000e18");
        assert_eq!(auto(0.0), "0");
        assert_eq!(auto(3.0e-5), "3.000e-5");
    }

    #[test]
    fn percentages() {
        assert_eq!(percent(0.99874, 2), "99.87 %");
    }

    #[test]
    fn powers_of_ten_use_superscripts() {
        assert_eq!(power_of_ten(16), "10¹⁶");
        assert_eq!(power_of_ten(-3), "10⁻³");
        assert_eq!(power_of_ten(0), "10⁰");
        assert_eq!(log_tick(16.0), "10¹⁶");
        assert_eq!(log_tick(16.0 + 2f64.log10()), "2.0×10¹⁶");
        assert_eq!(log_tick(-2.5), "3.2×10⁻³");
    }

    #[test]
    fn linear_ticks_are_short() {
        assert_eq!(linear_tick(300.0), "300");
        assert_eq!(linear_tick(0.25), "0.25");
        assert_eq!(linear_tick(-0.0), "0");
        assert_eq!(linear_tick(2.0e6), "2.0e6");
    }

    #[test]
    fn csv_numbers_read_back_exactly() {
        for v in [1.0761e10, 0.1 + 0.2, -3.5e-7, 300.0] {
            assert_eq!(csv_number(v).parse::<f64>(), Ok(v));
        }
        assert_eq!(csv_number(f64::NAN), "");
    }
}
