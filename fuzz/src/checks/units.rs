//! Invariants of the number-with-unit parser (`bandgauge_core::units`), on raw text.
//!
//! The input is the text as typed, read as every [`QuantityKind`]:
//! - nothing panics;
//! - an accepted value is finite, is what `parse_quantity_bare_in` gives with the default
//!   unit as the bare unit, and reads back exactly from `format_quantity` in the default unit;
//! - a text with a comma is never accepted (decimal commas are the lot reader's job);
//! - an accepted spread is finite and >= 0;
//! - every error message is non-empty, is one line, and names the kind or quotes the text.

use bandgauge_core::units::{
    QuantityKind, Spread, UnitError, format_quantity, parse_quantity, parse_quantity_bare_in,
    parse_spread,
};

/// Checks one input; panics with a message naming the broken invariant.
pub fn check(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    for kind in QuantityKind::ALL {
        check_kind(&text, kind);
    }
}

fn check_kind(text: &str, kind: QuantityKind) {
    match parse_quantity(text, kind) {
        Ok(value) => {
            assert!(value.is_finite(), "{text:?} as {kind}: accepted {value}");
            assert!(
                !text.contains(','),
                "{text:?} as {kind}: a comma was accepted as {value}"
            );
            let bare = parse_quantity_bare_in(text, kind, kind.default_unit());
            assert_eq!(
                bare,
                Ok(value),
                "{text:?} as {kind}: parse_quantity_bare_in with the default unit differs"
            );
            let written = format_quantity(value, kind, kind.default_unit())
                .unwrap_or_else(|e| panic!("{kind}: default unit refused: {e}"));
            assert_eq!(
                parse_quantity(&written, kind),
                Ok(value),
                "{text:?} as {kind}: {value} written as {written:?} does not read back"
            );
        }
        Err(error) => check_message(text, kind, &error),
    }
    for unit in kind.units() {
        match parse_quantity_bare_in(text, kind, unit.symbol) {
            Ok(value) => assert!(
                value.is_finite(),
                "{text:?} as {kind}, bare in {}: accepted {value}",
                unit.symbol
            ),
            Err(error) => check_message(text, kind, &error),
        }
    }
    match parse_spread(text, kind) {
        Ok(Spread::Relative(value) | Spread::Absolute(value)) => assert!(
            value.is_finite() && value >= 0.0,
            "{text:?} as a {kind} spread: accepted {value}"
        ),
        Err(error) => check_message(text, kind, &error),
    }
}

fn check_message(text: &str, kind: QuantityKind, error: &UnitError) {
    let message = error.to_string();
    assert!(
        !message.trim().is_empty(),
        "{text:?} as {kind}: empty error"
    );
    assert!(
        !message.contains('\n'),
        "{text:?} as {kind}: the error spans lines: {message:?}"
    );
    let quoted = format!("{text:?}");
    assert!(
        message.contains(kind.name()) || message.contains(&quoted),
        "{text:?} as {kind}: the error names neither the {kind} nor the text: {message:?}"
    );
}
