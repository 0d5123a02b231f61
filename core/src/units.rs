//! Physical quantities as engineers type them: a number with an optional exponent and unit suffix, read into bandgauge's default units.
//!
//! The default units are the ones the rest of the core uses: cm^-3 for densities,
//! ohm cm for resistivity, cm for lengths, kelvin for temperatures, volt, ampere and
//! ohm per square. A text without a unit is taken to be in the default unit.
//!
//! Accepted number forms: `1e15`, `1.5E16`, `-3.2e-4`, `.5`, `2.3x10^15`,
//! `2.3×10^15`, `2.3*10^15`, `10^15`, with or without a space before the unit
//! (`1e15cm^-3`, `1e15 cm^-3`). A decimal comma (`2,5`) is rejected here: it is
//! ambiguous with a thousands separator, and reading lot files written with a
//! decimal comma is the lot reader's job. Infinite and NaN values are rejected,
//! also when a finite number overflows on conversion.
//!
//! Signs are kept: whether a negative value is allowed is decided by the physics
//! that receives it, not by the parser.
//!
//! # Examples
//! ```
//! use bandgauge_core::units::{parse_quantity, QuantityKind};
//! assert_eq!(parse_quantity("2.3x10^15", QuantityKind::Density).unwrap(), 2.3e15);
//! assert_eq!(parse_quantity("525 um", QuantityKind::Length).unwrap(), 0.0525);
//! assert_eq!(parse_quantity("27C", QuantityKind::Temperature).unwrap(), 300.15);
//! assert!(parse_quantity("3 in", QuantityKind::Length).is_err());
//! ```

use crate::constants::ZERO_CELSIUS_K;
use std::fmt;

/// What a quantity measures; decides the default unit and the accepted units.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum QuantityKind {
    /// Number density of dopants or carriers; default unit cm^-3.
    Density,
    /// Electrical resistivity; default unit ohm cm.
    Resistivity,
    /// Length (thickness, probe spacing, wafer diameter); default unit cm.
    Length,
    /// Absolute temperature; default unit K.
    Temperature,
    /// Voltage; default unit V.
    Voltage,
    /// Current; default unit A.
    Current,
    /// Sheet resistance; default unit ohm/sq.
    SheetResistance,
    /// Four-terminal resistance V/I of a van der Pauw or Hall structure; default unit ohm.
    Resistance,
    /// Magnetic flux density (the field of a Hall measurement); default unit tesla.
    MagneticField,
}

impl QuantityKind {
    /// Every kind, in a stable order (for listings and tests).
    pub const ALL: [QuantityKind; 9] = [
        QuantityKind::Density,
        QuantityKind::Resistivity,
        QuantityKind::Length,
        QuantityKind::Temperature,
        QuantityKind::Voltage,
        QuantityKind::Current,
        QuantityKind::SheetResistance,
        QuantityKind::Resistance,
        QuantityKind::MagneticField,
    ];

    /// Lower-case name used in messages, e.g. "density".
    pub fn name(self) -> &'static str {
        match self {
            QuantityKind::Density => "density",
            QuantityKind::Resistivity => "resistivity",
            QuantityKind::Length => "length",
            QuantityKind::Temperature => "temperature",
            QuantityKind::Voltage => "voltage",
            QuantityKind::Current => "current",
            QuantityKind::SheetResistance => "sheet resistance",
            QuantityKind::Resistance => "resistance",
            QuantityKind::MagneticField => "magnetic field",
        }
    }

    /// The units accepted for this kind; the first one is the default unit.
    pub fn units(self) -> &'static [Unit] {
        match self {
            QuantityKind::Density => DENSITY_UNITS,
            QuantityKind::Resistivity => RESISTIVITY_UNITS,
            QuantityKind::Length => LENGTH_UNITS,
            QuantityKind::Temperature => TEMPERATURE_UNITS,
            QuantityKind::Voltage => VOLTAGE_UNITS,
            QuantityKind::Current => CURRENT_UNITS,
            QuantityKind::SheetResistance => SHEET_RESISTANCE_UNITS,
            QuantityKind::Resistance => RESISTANCE_UNITS,
            QuantityKind::MagneticField => MAGNETIC_FIELD_UNITS,
        }
    }

    /// Two typical ways to write a value of this kind, for messages.
    pub fn examples(self) -> &'static str {
        match self {
            QuantityKind::Density => "1e15 or 2.3x10^15 cm^-3",
            QuantityKind::Resistivity => "10 or 850 mohm-cm",
            QuantityKind::Length => "0.0525 or 525 um",
            QuantityKind::Temperature => "300, 300K or 27C",
            QuantityKind::Voltage => "0.0125 or 12.5 mV",
            QuantityKind::Current => "0.001 or 1 mA",
            QuantityKind::SheetResistance => "45.3 or 45.3 ohm/sq",
            QuantityKind::Resistance => "10.2 or 10.2 ohm",
            QuantityKind::MagneticField => "0.5 or 5000 G",
        }
    }

    /// The default unit's symbol, e.g. "cm^-3".
    pub fn default_unit(self) -> &'static str {
        self.units()[0].symbol
    }

    /// The accepted units as one readable list, e.g. "cm (default), mm, um, µm, nm, m".
    pub fn allowed_units(self) -> String {
        let mut out = String::new();
        for (index, unit) in self.units().iter().enumerate() {
            if index > 0 {
                out.push_str(", ");
            }
            out.push_str(unit.symbol);
            if index == 0 {
                out.push_str(" (default)");
            }
            for alias in unit.aliases {
                out.push_str(", ");
                out.push_str(alias);
            }
        }
        out
    }
}

impl fmt::Display for QuantityKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// One accepted unit: `value_in_default_unit = value * 10^power_of_ten + offset`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Unit {
    /// The symbol bandgauge prints, e.g. "mohm-cm".
    pub symbol: &'static str,
    /// Other spellings of the same unit, e.g. "/cm3" for "cm^-3".
    pub aliases: &'static [&'static str],
    /// Decimal exponent of the factor from this unit to the default unit (every
    /// accepted unit is a power of ten of its default unit).
    pub power_of_ten: i32,
    /// Offset added after scaling (non-zero only for degrees Celsius).
    pub offset: f64,
}

impl Unit {
    const fn scaled(
        symbol: &'static str,
        aliases: &'static [&'static str],
        power_of_ten: i32,
    ) -> Unit {
        Unit {
            symbol,
            aliases,
            power_of_ten,
            offset: 0.0,
        }
    }

    fn is_spelled(&self, text: &str) -> bool {
        self.symbol == text || self.aliases.contains(&text)
    }

    /// Multiplies by 10^power_of_ten in one correctly rounded operation, so that
    /// "525 um" is exactly the f64 nearest 0.0525 cm. Powers of ten up to 1e22 are
    /// exact in f64; the table stays far inside that.
    fn scale(&self, value: f64) -> f64 {
        let factor = 10f64.powi(self.power_of_ten.abs());
        if self.power_of_ten >= 0 {
            value * factor
        } else {
            value / factor
        }
    }

    fn unscale(&self, value: f64) -> f64 {
        let factor = 10f64.powi(self.power_of_ten.abs());
        if self.power_of_ten >= 0 {
            value / factor
        } else {
            value * factor
        }
    }

    /// Converts `value` in this unit to the default unit.
    pub fn to_default(&self, value: f64) -> f64 {
        self.scale(value) + self.offset
    }

    /// Converts `value` in the default unit to this unit.
    pub fn from_default(&self, value: f64) -> f64 {
        self.unscale(value - self.offset)
    }
}

// Resistivity spellings are normalised before lookup (see `normalise_unit`): "Ω", "Ohm"
// and "ohms" become "ohm", and the joiner between "ohm" and the length ("*", ".", "·",
// a space or nothing) becomes "-". The tables therefore list the normalised forms only.
const DENSITY_UNITS: &[Unit] = &[
    Unit::scaled("cm^-3", &["cm-3", "/cm3", "/cm^3", "cm⁻³"], 0),
    // 1 m^-3 = 1e-6 cm^-3.
    Unit::scaled("m^-3", &["m-3", "/m3", "/m^3", "m⁻³"], -6),
];

const RESISTIVITY_UNITS: &[Unit] = &[
    Unit::scaled("ohm-cm", &[], 0),
    Unit::scaled("mohm-cm", &[], -3),
    Unit::scaled("kohm-cm", &[], 3),
    // 1 ohm m = 100 ohm cm.
    Unit::scaled("ohm-m", &[], 2),
];

const LENGTH_UNITS: &[Unit] = &[
    Unit::scaled("cm", &[], 0),
    Unit::scaled("mm", &[], -1),
    Unit::scaled("um", &["µm"], -4),
    Unit::scaled("nm", &[], -7),
    Unit::scaled("m", &[], 2),
];

const TEMPERATURE_UNITS: &[Unit] = &[
    Unit::scaled("K", &[], 0),
    Unit {
        symbol: "C",
        aliases: &["°C"],
        power_of_ten: 0,
        offset: ZERO_CELSIUS_K,
    },
];

const VOLTAGE_UNITS: &[Unit] = &[
    Unit::scaled("V", &[], 0),
    Unit::scaled("mV", &[], -3),
    Unit::scaled("uV", &["µV"], -6),
];

const CURRENT_UNITS: &[Unit] = &[
    Unit::scaled("A", &[], 0),
    Unit::scaled("mA", &[], -3),
    Unit::scaled("uA", &["µA"], -6),
    Unit::scaled("nA", &[], -9),
];

const SHEET_RESISTANCE_UNITS: &[Unit] = &[
    Unit::scaled("ohm/sq", &["ohm/□"], 0),
    Unit::scaled("kohm/sq", &["kohm/□"], 3),
];

// "Ω" and "ohms" are folded onto "ohm" by `normalise_unit`.
const RESISTANCE_UNITS: &[Unit] = &[
    Unit::scaled("ohm", &[], 0),
    Unit::scaled("mohm", &[], -3),
    Unit::scaled("kohm", &[], 3),
    Unit::scaled("Mohm", &[], 6),
];

// 1 G = 1e-4 T exactly (CGS-Gaussian unit of flux density; SI Brochure, 9th ed. (2019),
// table 9, from memory).
const MAGNETIC_FIELD_UNITS: &[Unit] = &[
    Unit::scaled("T", &["tesla"], 0),
    Unit::scaled("mT", &[], -3),
    Unit::scaled("G", &["gauss", "Gs"], -4),
    Unit::scaled("kG", &["kgauss"], -1),
];

/// Why a text could not be read as a quantity. Every message quotes the text given
/// and says what is allowed; the caller prefixes the name of its field.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum UnitError {
    /// The text was empty or only whitespace.
    Empty {
        /// What was being read.
        kind: QuantityKind,
    },
    /// The text does not start with a number in an accepted form.
    NotANumber {
        /// What was being read.
        kind: QuantityKind,
        /// The text as given.
        given: String,
    },
    /// The number uses a comma, which is read neither as a decimal mark nor as a
    /// thousands separator here.
    DecimalComma {
        /// What was being read.
        kind: QuantityKind,
        /// The text as given.
        given: String,
    },
    /// The number, or its conversion to the default unit, is infinite or NaN.
    NonFinite {
        /// What was being read.
        kind: QuantityKind,
        /// The text as given.
        given: String,
    },
    /// The number is followed by a unit that this kind does not accept.
    UnknownUnit {
        /// What was being read.
        kind: QuantityKind,
        /// The text as given.
        given: String,
        /// The unit part of the text.
        unit: String,
    },
    /// A spread (uncertainty) was negative.
    NegativeSpread {
        /// What was being read.
        kind: QuantityKind,
        /// The text as given.
        given: String,
    },
}

impl fmt::Display for UnitError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            UnitError::Empty { kind } => write!(
                f,
                "nothing was given; give a {kind} as a number, optionally with a unit: {}",
                kind.allowed_units()
            ),
            UnitError::NotANumber { kind, given } => write!(
                f,
                "{given:?} is not a number; give a {kind} such as {}; units: {}",
                kind.examples(),
                kind.allowed_units()
            ),
            UnitError::DecimalComma { given, .. } => write!(
                f,
                "{given:?} contains a comma; write decimals with a point (2.5, not 2,5) \
                 and no thousands separators"
            ),
            UnitError::NonFinite { kind, given } => write!(
                f,
                "{given:?} is not a finite {kind}; give a finite number (about 1e308 at most)"
            ),
            UnitError::UnknownUnit { kind, given, unit } => write!(
                f,
                "{given:?}: {unit:?} is not an accepted {kind} unit; allowed: {}",
                kind.allowed_units()
            ),
            UnitError::NegativeSpread { kind, given } => write!(
                f,
                "{given:?} is negative; give a {kind} uncertainty >= 0, as a percentage \
                 (2%) or an amount in {}",
                kind.allowed_units()
            ),
        }
    }
}

impl std::error::Error for UnitError {}

/// Reads `text` as a quantity of `kind` and returns it in the default unit of `kind`.
///
/// # Errors
/// [`UnitError`] when the text is empty, is not a number in an accepted form,
/// uses a decimal comma, carries a unit not accepted for `kind`, or is (or
/// converts to) an infinite or NaN value.
pub fn parse_quantity(text: &str, kind: QuantityKind) -> Result<f64, UnitError> {
    let (value, unit) = parse_number_and_unit(text, kind)?;
    finite(unit.to_default(value), text, kind)
}

/// Reads `text` as a quantity of `kind` like [`parse_quantity`], except that a bare
/// number (no unit) is read in `bare_unit` instead of the default unit. For fields
/// whose name carries their unit, such as a temperature given in degrees Celsius.
/// The result is in the default unit of `kind`.
///
/// # Errors
/// As [`parse_quantity`]; [`UnitError::UnknownUnit`] also when `bare_unit` itself
/// is not a unit of `kind`.
pub fn parse_quantity_bare_in(
    text: &str,
    kind: QuantityKind,
    bare_unit: &str,
) -> Result<f64, UnitError> {
    let trimmed = text.trim();
    if trimmed.is_empty() {
        return Err(UnitError::Empty { kind });
    }
    let (value, rest) = split_number(trimmed, kind, text)?;
    let unit_text = if rest.trim().is_empty() {
        bare_unit
    } else {
        rest.trim()
    };
    let unit = find_unit(unit_text, kind).ok_or_else(|| UnitError::UnknownUnit {
        kind,
        given: text.to_owned(),
        unit: unit_text.to_owned(),
    })?;
    finite(unit.to_default(value), text, kind)
}

/// An uncertainty given either relative to the value or as an amount.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Spread {
    /// A fraction of the value (2% is stored as 0.02).
    Relative(f64),
    /// An amount in the default unit of the kind (a temperature spread in kelvin,
    /// so "1C" and "1K" are the same spread).
    Absolute(f64),
}

/// Reads an uncertainty: a percentage (`2%`, `±2%`, `+/-0.5 %`) or an amount with an
/// optional unit (`0.1`, `5 um`, `1C`). Temperature amounts are differences: no
/// Celsius offset is applied.
///
/// # Errors
/// As [`parse_quantity`], and [`UnitError::NegativeSpread`] for a negative value.
pub fn parse_spread(text: &str, kind: QuantityKind) -> Result<Spread, UnitError> {
    let trimmed = text.trim();
    let body = trimmed
        .strip_prefix('±')
        .or_else(|| trimmed.strip_prefix("+/-"))
        .unwrap_or(trimmed)
        .trim_start();
    let spread = if let Some(percent) = body.strip_suffix('%') {
        let (value, rest) = split_number(percent.trim(), kind, text)?;
        if !rest.trim().is_empty() {
            return Err(UnitError::NotANumber {
                kind,
                given: text.to_owned(),
            });
        }
        Spread::Relative(finite(value / 100.0, text, kind)?)
    } else {
        let (value, unit) =
            parse_number_and_unit(body, kind).map_err(|error| regiven(error, text))?;
        Spread::Absolute(finite(unit.scale(value), text, kind)?)
    };
    let value = match spread {
        Spread::Relative(value) | Spread::Absolute(value) => value,
    };
    if value < 0.0 {
        return Err(UnitError::NegativeSpread {
            kind,
            given: text.to_owned(),
        });
    }
    Ok(spread)
}

/// Writes `value` (in the default unit of `kind`) in the unit spelled `unit`, so
/// that [`parse_quantity`] reads it back to `value` within rounding.
///
/// # Errors
/// [`UnitError::UnknownUnit`] when `unit` is not accepted for `kind`.
pub fn format_quantity(value: f64, kind: QuantityKind, unit: &str) -> Result<String, UnitError> {
    let found = find_unit(unit, kind).ok_or_else(|| UnitError::UnknownUnit {
        kind,
        given: unit.to_owned(),
        unit: unit.to_owned(),
    })?;
    let converted = found.from_default(value);
    // `{:e}` is Rust's shortest representation that reads back to the same f64.
    Ok(format!("{converted:e} {}", found.symbol))
}

fn finite(value: f64, given: &str, kind: QuantityKind) -> Result<f64, UnitError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(UnitError::NonFinite {
            kind,
            given: given.to_owned(),
        })
    }
}

/// Puts the caller's full text into an error raised on part of it.
fn regiven(error: UnitError, text: &str) -> UnitError {
    let text = text.to_owned();
    match error {
        UnitError::NotANumber { kind, .. } => UnitError::NotANumber { kind, given: text },
        UnitError::DecimalComma { kind, .. } => UnitError::DecimalComma { kind, given: text },
        UnitError::NonFinite { kind, .. } => UnitError::NonFinite { kind, given: text },
        UnitError::UnknownUnit { kind, unit, .. } => UnitError::UnknownUnit {
            kind,
            given: text,
            unit,
        },
        other => other,
    }
}

fn parse_number_and_unit(
    text: &str,
    kind: QuantityKind,
) -> Result<(f64, &'static Unit), UnitError> {
    let trimmed = text.trim();
    if trimmed.is_empty() {
        return Err(UnitError::Empty { kind });
    }
    let (value, rest) = split_number(trimmed, kind, text)?;
    let unit_text = rest.trim();
    let unit = if unit_text.is_empty() {
        &kind.units()[0]
    } else {
        find_unit(unit_text, kind).ok_or_else(|| UnitError::UnknownUnit {
            kind,
            given: text.to_owned(),
            unit: unit_text.to_owned(),
        })?
    };
    Ok((value, unit))
}

fn find_unit(unit_text: &str, kind: QuantityKind) -> Option<&'static Unit> {
    let normalised = normalise_unit(unit_text.trim(), kind);
    kind.units()
        .iter()
        .find(|unit| unit.is_spelled(&normalised))
}

/// Folds equivalent spellings onto the table forms: micro sign, ohm sign and the
/// joiner inside "ohm cm".
fn normalise_unit(unit_text: &str, kind: QuantityKind) -> String {
    // U+03BC GREEK SMALL LETTER MU and U+00B5 MICRO SIGN look alike; keep the micro sign.
    let mut text = unit_text.replace('\u{3bc}', "\u{b5}");
    if matches!(
        kind,
        QuantityKind::Resistivity | QuantityKind::SheetResistance | QuantityKind::Resistance
    ) {
        // U+2126 OHM SIGN and U+03A9 GREEK CAPITAL OMEGA.
        text = text
            .replace(['\u{2126}', '\u{3a9}'], "ohm")
            .replace("Ohm", "ohm")
            .replace("ohms", "ohm")
            .replace("/square", "/sq");
    }
    if kind == QuantityKind::Resistivity
        && let Some(position) = text.find("ohm")
    {
        let (head, tail) = text.split_at(position + "ohm".len());
        let mut chars = tail.chars();
        let joined = match chars.next() {
            Some(' ' | '*' | '.' | '\u{b7}' | '\u{22c5}' | '-') => chars.as_str(),
            _ => tail,
        };
        // Exactly one joiner (or none) before the length unit; "ohm--cm" stays unknown.
        if joined.starts_with(char::is_alphanumeric) {
            text = format!("{head}-{joined}");
        }
    }
    text
}

/// Splits `text` (already trimmed) into a number and the rest.
fn split_number<'a>(
    text: &'a str,
    kind: QuantityKind,
    given: &str,
) -> Result<(f64, &'a str), UnitError> {
    let not_a_number = || UnitError::NotANumber {
        kind,
        given: given.to_owned(),
    };
    let bytes = text.as_bytes();
    let mut end = 0;
    if matches!(bytes.first(), Some(b'+' | b'-')) {
        end += 1;
    }
    let integer_start = end;
    end += count_digits(&bytes[end..]);
    let integer_digits = end - integer_start;
    let mut fraction_digits = 0;
    if bytes.get(end) == Some(&b'.') {
        let after_point = count_digits(&bytes[end + 1..]);
        if integer_digits > 0 || after_point > 0 {
            fraction_digits = after_point;
            end += 1 + after_point;
        }
    }
    if integer_digits + fraction_digits == 0 {
        return Err(not_a_number());
    }
    if bytes.get(end) == Some(&b',') && bytes.get(end + 1).is_some_and(u8::is_ascii_digit) {
        return Err(UnitError::DecimalComma {
            kind,
            given: given.to_owned(),
        });
    }
    let mantissa = &text[..end];
    let mut exponent_text: Option<&str> = None;
    let mut rest = &text[end..];

    // "1e15", "1.5E-3": the exponent is part of Rust's float syntax.
    if let Some(after_e) = rest.strip_prefix(['e', 'E']) {
        let digits = signed_integer_len(after_e);
        if digits > 0 {
            exponent_text = Some(&after_e[..digits]);
            rest = &after_e[digits..];
        }
    } else if let Some(after_times) = strip_times_ten(rest) {
        // "2.3x10^15", "2.3 × 10^-4", "2.3*10^15".
        let digits = signed_integer_len(after_times);
        if digits == 0 {
            return Err(not_a_number());
        }
        exponent_text = Some(&after_times[..digits]);
        rest = &after_times[digits..];
    } else if mantissa.trim_start_matches(['+', '-']) == "10"
        && let Some(after_caret) = rest.strip_prefix('^')
    {
        // "10^15" alone.
        let digits = signed_integer_len(after_caret);
        if digits == 0 {
            return Err(not_a_number());
        }
        let sign = if mantissa.starts_with('-') { "-" } else { "" };
        let value = format!("{sign}1e{}", &after_caret[..digits])
            .parse::<f64>()
            .map_err(|_| not_a_number())?;
        return Ok((value, &after_caret[digits..]));
    }
    if rest.starts_with(|c: char| c.is_ascii_digit() || c == '.' || c == ',') {
        return Err(if rest.starts_with(',') {
            UnitError::DecimalComma {
                kind,
                given: given.to_owned(),
            }
        } else {
            not_a_number()
        });
    }
    let literal = match exponent_text {
        Some(exponent) => format!("{mantissa}e{exponent}"),
        None => mantissa.to_owned(),
    };
    // The grammar above only lets through text Rust's float parser accepts; a huge
    // exponent parses to infinity and is rejected by the caller as non-finite.
    let value = literal.parse::<f64>().map_err(|_| not_a_number())?;
    Ok((value, rest))
}

fn count_digits(bytes: &[u8]) -> usize {
    bytes.iter().take_while(|b| b.is_ascii_digit()).count()
}

/// Length of an optionally signed run of digits at the start of `text` (0 if none).
fn signed_integer_len(text: &str) -> usize {
    let bytes = text.as_bytes();
    let sign = usize::from(matches!(bytes.first(), Some(b'+' | b'-')));
    let digits = count_digits(&bytes[sign..]);
    if digits == 0 { 0 } else { sign + digits }
}

/// Strips "x10^", "×10^" or "*10^" (spaces allowed around the sign) and returns
/// the text after the caret.
fn strip_times_ten(text: &str) -> Option<&str> {
    let after_sign = text.trim_start().strip_prefix(['x', '\u{d7}', '*'])?;
    after_sign.trim_start().strip_prefix("10^")
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    /// Unit factors are powers of ten applied in f64: a few ulps of rounding.
    const CONVERSION_RELATIVE_TOLERANCE: f64 = 1e-15;

    fn check(text: &str, kind: QuantityKind, expected: f64) {
        let value = parse_quantity(text, kind).unwrap_or_else(|e| panic!("{text:?}: {e}"));
        let scale = expected.abs().max(f64::MIN_POSITIVE);
        assert!(
            (value - expected).abs() <= CONVERSION_RELATIVE_TOLERANCE * scale,
            "{text:?} as {kind}: got {value}, expected {expected}"
        );
    }

    fn check_error(text: &str, kind: QuantityKind, expected_message: &str) {
        match parse_quantity(text, kind) {
            Ok(value) => panic!("{text:?} as {kind} was accepted as {value}"),
            Err(error) => assert_eq!(error.to_string(), expected_message, "{text:?}"),
        }
    }

    #[test]
    fn number_forms() {
        use QuantityKind::Density as D;
        check("1e15", D, 1e15);
        check("1.5E16", D, 1.5e16);
        check("1.5e+16", D, 1.5e16);
        check("2.3x10^15", D, 2.3e15);
        check("2.3×10^15", D, 2.3e15);
        check("2.3*10^15", D, 2.3e15);
        check("2.3 x 10^15", D, 2.3e15);
        check("2.3x10^-4", D, 2.3e-4);
        check("10^15", D, 1e15);
        check("10^-3", D, 1e-3);
        check("-1.25", D, -1.25);
        check("+7", D, 7.0);
        check(".5", D, 0.5);
        check("5.", D, 5.0);
        check("  42  ", D, 42.0);
        check("0", D, 0.0);
    }

    #[test]
    fn mantissa_times_power_is_exact() {
        // 2.3x10^15 is the decimal literal 2.3e15, not 2.3 * 1e15 rounded twice.
        assert_eq!(
            parse_quantity("2.3x10^15", QuantityKind::Density),
            Ok(2.3e15)
        );
        assert_eq!(
            parse_quantity("9.65x10^9", QuantityKind::Density),
            Ok(9.65e9)
        );
    }

    #[test]
    fn density_units() {
        use QuantityKind::Density as D;
        for text in [
            "1e15 cm^-3",
            "1e15cm^-3",
            "1e15 cm-3",
            "1e15/cm3",
            "1e15 /cm^3",
            "1e15 cm⁻³",
        ] {
            check(text, D, 1e15);
        }
        for text in ["1e21 m^-3", "1e21m-3", "1e21 /m3", "1e21/m^3"] {
            check(text, D, 1e15);
        }
    }

    #[test]
    fn resistivity_units() {
        use QuantityKind::Resistivity as R;
        for text in [
            "10",
            "10 ohm-cm",
            "10ohm-cm",
            "10 ohm*cm",
            "10 ohm.cm",
            "10 ohm·cm",
            "10 ohm cm",
            "10 ohmcm",
            "10 Ω·cm",
            "10 Ωcm",
            "10 Ω-cm",
            "10 Ohm-cm",
            "10 ohms-cm",
            "10 \u{2126}cm",
        ] {
            check(text, R, 10.0);
        }
        check("5 mohm-cm", R, 5e-3);
        check("5mΩ·cm", R, 5e-3);
        check("2 kohm-cm", R, 2e3);
        check("0.1 ohm-m", R, 10.0);
        check("0.1 Ω·m", R, 10.0);
    }

    #[test]
    fn length_units() {
        use QuantityKind::Length as L;
        check("0.0525", L, 0.0525);
        check("0.0525 cm", L, 0.0525);
        check("525 um", L, 0.0525);
        check("525um", L, 0.0525);
        check("525 µm", L, 0.0525);
        check("525 μm", L, 0.0525); // Greek mu
        check("1 mm", L, 0.1);
        check("150 mm", L, 15.0);
        check("100 nm", L, 1e-5);
        check("0.3 m", L, 30.0);
    }

    #[test]
    fn temperature_units() {
        use QuantityKind::Temperature as T;
        check("300", T, 300.0);
        check("300K", T, 300.0);
        check("300 K", T, 300.0);
        // Source: the Celsius scale is defined by 0 C = 273.15 K (SI Brochure, 9th ed., 2019).
        check("27C", T, 300.15);
        check("27 °C", T, 300.15);
        check("23C", T, 296.15);
        check("-40C", T, 233.15);
    }

    #[test]
    fn electrical_units() {
        check("0.0125", QuantityKind::Voltage, 0.0125);
        check("12.5 mV", QuantityKind::Voltage, 0.0125);
        check("12.5mV", QuantityKind::Voltage, 0.0125);
        check("125 uV", QuantityKind::Voltage, 1.25e-4);
        check("125 µV", QuantityKind::Voltage, 1.25e-4);
        check("1 A", QuantityKind::Current, 1.0);
        check("1mA", QuantityKind::Current, 1e-3);
        check("10 uA", QuantityKind::Current, 1e-5);
        check("10 nA", QuantityKind::Current, 1e-8);
        check("45.3", QuantityKind::SheetResistance, 45.3);
        check("45.3 ohm/sq", QuantityKind::SheetResistance, 45.3);
        check("45.3 Ω/□", QuantityKind::SheetResistance, 45.3);
        check("45.3 ohms/square", QuantityKind::SheetResistance, 45.3);
        check("1.2 kohm/sq", QuantityKind::SheetResistance, 1200.0);
        check("10.2", QuantityKind::Resistance, 10.2);
        check("10.2 ohm", QuantityKind::Resistance, 10.2);
        check("10.2 Ω", QuantityKind::Resistance, 10.2);
        check("10.2 ohms", QuantityKind::Resistance, 10.2);
        check("850 mohm", QuantityKind::Resistance, 0.85);
        check("1.5 kohm", QuantityKind::Resistance, 1500.0);
        check("2 Mohm", QuantityKind::Resistance, 2e6);
    }

    #[test]
    fn magnetic_field_units() {
        use QuantityKind::MagneticField as B;
        check("0.5", B, 0.5);
        check("0.5 T", B, 0.5);
        check("500 mT", B, 0.5);
        // Source: 1 G = 1e-4 T (definition of the gauss), so 5000 G = 0.5 T.
        check("5000 G", B, 0.5);
        check("5000 gauss", B, 0.5);
        check("5 kG", B, 0.5);
        check_error(
            "0.5 Wb",
            B,
            r#""0.5 Wb": "Wb" is not an accepted magnetic field unit; allowed: T (default), tesla, mT, G, gauss, Gs, kG, kgauss"#,
        );
        // A field is not a resistance: "ohm" is refused with the list of field units.
        assert!(parse_quantity("5 ohm", B).is_err());
        assert!(parse_quantity("5 T", QuantityKind::Resistance).is_err());
    }

    #[test]
    fn unknown_units_are_rejected_with_the_allowed_list() {
        check_error(
            "3 in",
            QuantityKind::Length,
            r#""3 in": "in" is not an accepted length unit; allowed: cm (default), mm, um, µm, nm, m"#,
        );
        check_error(
            "300F",
            QuantityKind::Temperature,
            r#""300F": "F" is not an accepted temperature unit; allowed: K (default), C, °C"#,
        );
        check_error(
            "10 ohm",
            QuantityKind::Resistivity,
            r#""10 ohm": "ohm" is not an accepted resistivity unit; allowed: ohm-cm (default), mohm-cm, kohm-cm, ohm-m"#,
        );
        check_error(
            "1e15 cm^3",
            QuantityKind::Density,
            r#""1e15 cm^3": "cm^3" is not an accepted density unit; allowed: cm^-3 (default), cm-3, /cm3, /cm^3, cm⁻³, m^-3, m-3, /m3, /m^3, m⁻³"#,
        );
        // Units are case-sensitive: "MV" would be megavolt, "k" is not kelvin.
        assert!(parse_quantity("5 MV", QuantityKind::Voltage).is_err());
        assert!(parse_quantity("300k", QuantityKind::Temperature).is_err());
        // A unit of another kind is not silently reinterpreted.
        assert!(parse_quantity("10 mV", QuantityKind::Current).is_err());
        assert!(parse_quantity("10 ohm--cm", QuantityKind::Resistivity).is_err());
        assert!(parse_quantity("10 ohm/sq", QuantityKind::Resistivity).is_err());
    }

    #[test]
    fn malformed_numbers_are_rejected() {
        let kind = QuantityKind::Resistivity;
        check_error(
            "abc",
            kind,
            "\"abc\" is not a number; give a resistivity such as 10 or 850 mohm-cm; \
             units: ohm-cm (default), mohm-cm, kohm-cm, ohm-m",
        );
        for text in [
            "inf", "NaN", "infinity", "-", ".", "e5", "x10^3", "1.2.3", "1e", "2x10^", "10^", "1 2",
        ] {
            let error = parse_quantity(text, kind).expect_err(text);
            assert!(
                matches!(
                    error,
                    UnitError::NotANumber { .. } | UnitError::UnknownUnit { .. }
                ),
                "{text:?}: {error:?}"
            );
        }
        check_error(
            "",
            kind,
            "nothing was given; give a resistivity as a number, optionally with a unit: \
             ohm-cm (default), mohm-cm, kohm-cm, ohm-m",
        );
        check_error(
            "   ",
            kind,
            &parse_quantity("", kind).unwrap_err().to_string(),
        );
    }

    #[test]
    fn decimal_comma_is_rejected() {
        let message = r#""2,5" contains a comma; write decimals with a point (2.5, not 2,5) and no thousands separators"#;
        check_error("2,5", QuantityKind::Resistivity, message);
        assert!(matches!(
            parse_quantity("1,000 um", QuantityKind::Length),
            Err(UnitError::DecimalComma { .. })
        ));
        assert!(matches!(
            parse_quantity("1e15,5", QuantityKind::Density),
            Err(UnitError::DecimalComma { .. })
        ));
    }

    #[test]
    fn non_finite_values_are_rejected() {
        check_error(
            "1e400",
            QuantityKind::Density,
            r#""1e400" is not a finite density; give a finite number (about 1e308 at most)"#,
        );
        assert!(matches!(
            parse_quantity("2x10^309", QuantityKind::Density),
            Err(UnitError::NonFinite { .. })
        ));
        // Finite as typed, infinite after conversion to ohm cm.
        assert!(matches!(
            parse_quantity("1e307 ohm-m", QuantityKind::Resistivity),
            Err(UnitError::NonFinite { .. })
        ));
    }

    #[test]
    fn bare_numbers_in_another_unit() {
        use QuantityKind::Temperature as T;
        // Source: 0 C = 273.15 K by definition (SI Brochure, 9th ed., 2019).
        assert_eq!(parse_quantity_bare_in("25", T, "C"), Ok(298.15));
        assert_eq!(parse_quantity_bare_in("25 C", T, "C"), Ok(298.15));
        assert_eq!(parse_quantity_bare_in("300K", T, "C"), Ok(300.0));
        assert_eq!(
            parse_quantity_bare_in("525", QuantityKind::Length, "um"),
            Ok(0.0525)
        );
        assert!(matches!(
            parse_quantity_bare_in("25 F", T, "C"),
            Err(UnitError::UnknownUnit { .. })
        ));
        assert!(matches!(
            parse_quantity_bare_in("", T, "C"),
            Err(UnitError::Empty { .. })
        ));
        assert!(matches!(
            parse_quantity_bare_in("1e999", T, "C"),
            Err(UnitError::NonFinite { .. })
        ));
    }

    #[test]
    fn spreads() {
        use QuantityKind::*;
        assert_eq!(parse_spread("2%", Resistivity), Ok(Spread::Relative(0.02)));
        assert_eq!(
            parse_spread("±2 %", Resistivity),
            Ok(Spread::Relative(0.02))
        );
        assert_eq!(
            parse_spread("+/-0.5%", Voltage),
            Ok(Spread::Relative(0.005))
        );
        assert_eq!(parse_spread("0.1", Resistivity), Ok(Spread::Absolute(0.1)));
        assert_eq!(parse_spread("5 um", Length), Ok(Spread::Absolute(5e-4)));
        // A temperature spread is a difference: 1 C is 1 K, no 273.15 offset.
        assert_eq!(parse_spread("1C", Temperature), Ok(Spread::Absolute(1.0)));
        assert_eq!(parse_spread("0", Current), Ok(Spread::Absolute(0.0)));
        assert_eq!(
            parse_spread("-2%", Resistivity).unwrap_err().to_string(),
            r#""-2%" is negative; give a resistivity uncertainty >= 0, as a percentage (2%) or an amount in ohm-cm (default), mohm-cm, kohm-cm, ohm-m"#
        );
        assert!(
            matches!(parse_spread("2 in", Length), Err(UnitError::UnknownUnit { given, .. }) if given == "2 in")
        );
        assert!(parse_spread("2%%", Length).is_err());
        assert!(parse_spread("NaN%", Length).is_err());
    }

    #[test]
    fn every_unit_symbol_and_alias_is_readable() {
        for kind in QuantityKind::ALL {
            for unit in kind.units() {
                for spelling in std::iter::once(&unit.symbol).chain(unit.aliases) {
                    let text = format!("2 {spelling}");
                    check(&text, kind, unit.to_default(2.0));
                }
            }
        }
    }

    #[test]
    fn format_rejects_unknown_unit() {
        assert!(format_quantity(1.0, QuantityKind::Length, "in").is_err());
        assert_eq!(
            format_quantity(0.0525, QuantityKind::Length, "cm").as_deref(),
            Ok("5.25e-2 cm")
        );
        assert_eq!(
            format_quantity(300.15, QuantityKind::Temperature, "K").as_deref(),
            Ok("3.0015e2 K")
        );
    }

    fn any_kind_and_unit() -> impl Strategy<Value = (QuantityKind, &'static Unit)> {
        proptest::sample::select(QuantityKind::ALL.to_vec()).prop_flat_map(|kind| {
            proptest::sample::select(kind.units().iter().collect::<Vec<_>>())
                .prop_map(move |unit| (kind, unit))
        })
    }

    proptest! {
        #[test]
        fn format_then_parse_round_trips(
            (kind, unit) in any_kind_and_unit(),
            mantissa in -9.999f64..9.999,
            exponent in -30i32..30,
        ) {
            let value_in_unit = mantissa * 10f64.powi(exponent);
            let value = unit.to_default(value_in_unit);
            let text = format_quantity(value, kind, unit.symbol).unwrap();
            let back = parse_quantity(&text, kind).unwrap();
            // Two conversions, each a few ulps; Celsius adds the cancellation of 273.15.
            let scale = value.abs().max(unit.offset.abs()).max(f64::MIN_POSITIVE);
            prop_assert!((back - value).abs() <= 4.0 * CONVERSION_RELATIVE_TOLERANCE * scale,
                "{value} -> {text:?} -> {back}");
        }

        #[test]
        fn default_unit_round_trip_is_exact(value in proptest::num::f64::NORMAL | proptest::num::f64::ZERO) {
            for kind in QuantityKind::ALL {
                let text = format_quantity(value, kind, kind.default_unit()).unwrap();
                prop_assert_eq!(parse_quantity(&text, kind).unwrap(), value);
            }
        }

        #[test]
        fn parser_never_panics(text in "\\PC{0,24}") {
            for kind in QuantityKind::ALL {
                if let Ok(value) = parse_quantity(&text, kind) {
                    prop_assert!(value.is_finite());
                }
            }
        }
    }
}
