//! Reading the number fields: the core's unit parser, plus the range each field needs,
//! with messages that name the field as the engineer sees it.

use bandgauge_core::units::{QuantityKind, parse_quantity};

/// A field's parsed value, or the sentence shown under the field.
pub type Parsed = Result<f64, String>;

/// Reads `text` as a quantity of `kind` in the core's default unit.
pub fn quantity(field: &str, text: &str, kind: QuantityKind) -> Parsed {
    parse_quantity(text, kind).map_err(|e| format!("{field}: {e}"))
}

/// Reads a quantity that must be finite and > 0 (densities, lengths, resistivities).
pub fn positive(field: &str, text: &str, kind: QuantityKind, unit: &str) -> Parsed {
    let v = quantity(field, text, kind)?;
    if v > 0.0 {
        Ok(v)
    } else {
        Err(format!(
            "{field}: {} {unit} is not allowed; give a value > 0",
            trim_number(v)
        ))
    }
}

/// Reads a density that may be zero (a dopant row kept for later), in cm^-3.
pub fn density_cm3(field: &str, text: &str) -> Parsed {
    let v = quantity(field, text, QuantityKind::Density)?;
    if v >= 0.0 {
        Ok(v)
    } else {
        Err(format!(
            "{field}: {} cm^-3 is not allowed; give a density >= 0",
            trim_number(v)
        ))
    }
}

/// Reads a temperature (K by default, `C` for Celsius) that must be above 0 K.
pub fn temperature_k(field: &str, text: &str) -> Parsed {
    let v = quantity(field, text, QuantityKind::Temperature)?;
    if v > 0.0 {
        Ok(v)
    } else {
        Err(format!(
            "{field}: {} K is not allowed; give a temperature above 0 K (-273.15 C)",
            trim_number(v)
        ))
    }
}

/// Reads a whole count within `[min, max]`.
pub fn count(field: &str, text: &str, min: usize, max: usize) -> Result<usize, String> {
    let allowed = format!("give a whole number from {min} to {max}");
    match text.trim().parse::<usize>() {
        Ok(v) if (min..=max).contains(&v) => Ok(v),
        Ok(v) => Err(format!("{field}: {v} is not allowed; {allowed}")),
        Err(_) => Err(format!(
            "{field}: {text:?} is not a whole number; {allowed}"
        )),
    }
}

/// A number for a message, to six significant digits without trailing zeros
/// (`-5`, `-26.85`, `1e-7`): float noise such as `-26.850000000000023` helps nobody.
fn trim_number(v: f64) -> String {
    let trim = |t: String| t.trim_end_matches('0').trim_end_matches('.').to_string();
    let a = v.abs();
    if a == 0.0 || (1e-3..1e6).contains(&a) {
        let decimals = (5 - a.log10().floor().max(-3.0) as i32).max(0) as usize;
        let t = trim(format!("{v:.decimals$}"));
        if t == "-0" { "0".into() } else { t }
    } else {
        let t = format!("{v:.5e}");
        let (mantissa, exponent) = t.split_once('e').unwrap_or((&t, "0"));
        format!("{}e{exponent}", trim(mantissa.to_string()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_numbers_as_engineers_type_them() {
        assert_eq!(density_cm3("donor", "2.3x10^15"), Ok(2.3e15));
        assert_eq!(density_cm3("donor", "1E21 m^-3"), Ok(1e15));
        assert_eq!(
            positive("rho", "10 mohm-cm", QuantityKind::Resistivity, "ohm-cm"),
            Ok(0.01)
        );
        let t = temperature_k("temperature", "27 C").expect("27 C");
        assert!((t - 300.15).abs() < 1e-9);
    }

    #[test]
    fn messages_name_the_field_and_the_value() {
        let e = temperature_k("temperature", "-5").expect_err("-5 K");
        assert!(e.starts_with("temperature: -5 K is not allowed"), "{e}");
        let e = temperature_k("temperature", "-300 C").expect_err("-300 C");
        assert!(e.contains("-26.85") && e.contains("not allowed"), "{e}");
        let e = density_cm3("P density", "abc").expect_err("abc");
        assert!(e.starts_with("P density: "), "{e}");
        let e = positive("thickness", "0", QuantityKind::Length, "cm").expect_err("0");
        assert!(e.contains("thickness: 0 cm is not allowed"), "{e}");
        assert_eq!(density_cm3("d", "0"), Ok(0.0));
    }

    #[test]
    fn numbers_in_messages_are_short() {
        assert_eq!(trim_number(-5.0), "-5");
        assert_eq!(trim_number(-300.0 + 273.15), "-26.85");
        assert_eq!(trim_number(1e-7), "1e-7");
        assert_eq!(trim_number(-2.5e22), "-2.5e22");
        assert_eq!(trim_number(0.0), "0");
        assert_eq!(trim_number(123456.0), "123456");
    }

    #[test]
    fn counts_are_whole_and_bounded() {
        assert_eq!(count("points", "121", 2, 400), Ok(121));
        assert!(count("points", "1", 2, 400).is_err());
        assert!(count("points", "2.5", 2, 400).is_err());
        assert!(
            count("points", "1000000", 2, 400)
                .unwrap_err()
                .contains("from 2 to 400")
        );
        assert!(
            count("points", "ten", 2, 400)
                .unwrap_err()
                .contains("not a whole number")
        );
    }
}
