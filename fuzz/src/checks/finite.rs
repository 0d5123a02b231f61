//! Finds every NaN or infinite float inside any `Debug` value.
//!
//! serde_json writes a NaN as `null`, the same as `None`, so a JSON round trip cannot tell "no
//! value" from "a broken value". The `Debug` text can: a float prints as `NaN`, `inf` or
//! `-inf`. Used by the fuzz checks and by the physics-extremes test
//! (`tests/tests/extremes.rs`, which includes this file with `#[path]`).

use std::fmt::Debug;

/// The NaN and infinity tokens in the `Debug` text of `value`, outside quoted strings (a
/// source text may say "info"; an `f64` field prints as `NaN`, `inf` or `-inf`). Empty when
/// every number is finite.
pub fn non_finite_tokens(value: &impl Debug) -> Vec<String> {
    let text = format!("{value:?}");
    let mut found = Vec::new();
    let mut token = String::new();
    let mut in_string = false;
    let mut escaped = false;
    let mut flush = |token: &mut String| {
        if token == "NaN" || token == "inf" {
            found.push(token.clone());
        }
        token.clear();
    };
    for c in text.chars() {
        if in_string {
            match (escaped, c) {
                (true, _) => escaped = false,
                (false, '\\') => escaped = true,
                (false, '"') => in_string = false,
                _ => {}
            }
            continue;
        }
        if c == '"' {
            flush(&mut token);
            in_string = true;
        } else if c.is_alphanumeric() || c == '_' {
            token.push(c);
        } else {
            flush(&mut token);
        }
    }
    flush(&mut token);
    found
}
