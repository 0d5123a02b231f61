//! The spec window on resistivity or on dopant density, the pass / marginal / fail verdict of
//! a value with its uncertainty interval, the margin to the nearer limit, and the process
//! capability index Cpk.

use std::fmt;

use serde::Serialize;

use crate::units::{QuantityKind, parse_quantity};

/// The quantity a spec window limits.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SpecQuantity {
    /// Resistivity, ohm cm.
    Resistivity,
    /// Dopant density, cm^-3.
    Density,
}

impl SpecQuantity {
    /// Field name with unit: "resistivity_ohm_cm" or "density_cm3".
    pub fn field(self) -> &'static str {
        match self {
            SpecQuantity::Resistivity => "resistivity_ohm_cm",
            SpecQuantity::Density => "density_cm3",
        }
    }

    /// Plain name for reports: "resistivity" or "dopant density".
    pub fn label(self) -> &'static str {
        match self {
            SpecQuantity::Resistivity => "resistivity",
            SpecQuantity::Density => "dopant density",
        }
    }

    /// Unit symbol: "ohm-cm" or "cm^-3".
    pub fn unit(self) -> &'static str {
        match self {
            SpecQuantity::Resistivity => "ohm-cm",
            SpecQuantity::Density => "cm^-3",
        }
    }

    fn kind(self) -> QuantityKind {
        match self {
            SpecQuantity::Resistivity => QuantityKind::Resistivity,
            SpecQuantity::Density => QuantityKind::Density,
        }
    }
}

/// Why a spec window was refused.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum SpecError {
    /// Not of the form MIN:MAX.
    Form {
        /// Text given.
        given: String,
    },
    /// Neither limit was given.
    NoLimit,
    /// A limit is not a number > 0 in an accepted unit.
    Limit {
        /// "MIN" or "MAX".
        side: &'static str,
        /// What is wrong.
        message: String,
    },
    /// MIN is not below MAX.
    Order {
        /// Lower limit given.
        min: f64,
        /// Upper limit given.
        max: f64,
    },
}

impl fmt::Display for SpecError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            SpecError::Form { given } => write!(
                f,
                "{given:?} is not a window; give MIN:MAX (either side may be left empty for a \
                 one-sided limit), e.g. 8:12 or 1e15:2e15"
            ),
            SpecError::NoLimit => {
                f.write_str("both limits are empty; give MIN:MAX with at least one of them")
            }
            SpecError::Limit { side, message } => write!(f, "{side}: {message}"),
            SpecError::Order { min, max } => write!(
                f,
                "MIN {} is not below MAX {}; give the lower limit first",
                short(*min),
                short(*max)
            ),
        }
    }
}

impl std::error::Error for SpecError {}

/// A limit as an engineer writes it: plain from 1e-3 to 1e6 (`12`, `0.8`), else with an
/// exponent (`1e15`, `3.5e14`).
fn short(value: f64) -> String {
    if value == 0.0 || (1e-3..1e6).contains(&value.abs()) {
        format!("{value}")
    } else {
        format!("{value:e}")
    }
}

/// The acceptance window on one quantity; either limit may be open.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SpecWindow {
    quantity: SpecQuantity,
    min: Option<f64>,
    max: Option<f64>,
}

impl SpecWindow {
    /// A window on `quantity` from `min` to `max` (in ohm cm or cm^-3), limits included.
    ///
    /// # Errors
    /// [`SpecError::NoLimit`], [`SpecError::Limit`] for a limit that is not finite and > 0,
    /// [`SpecError::Order`] when min >= max.
    pub fn new(
        quantity: SpecQuantity,
        min: Option<f64>,
        max: Option<f64>,
    ) -> Result<SpecWindow, SpecError> {
        for (side, value) in [("MIN", min), ("MAX", max)] {
            if let Some(v) = value
                && !(v.is_finite() && v > 0.0)
            {
                let unit = quantity.unit();
                return Err(SpecError::Limit {
                    side,
                    message: format!(
                        "{} {unit} is not allowed; give a finite value > 0 {unit}",
                        short(v)
                    ),
                });
            }
        }
        match (min, max) {
            (None, None) => Err(SpecError::NoLimit),
            (Some(lo), Some(hi)) if lo >= hi => Err(SpecError::Order { min: lo, max: hi }),
            _ => Ok(SpecWindow { quantity, min, max }),
        }
    }

    /// Reads `MIN:MAX`, each side a number with an optional unit (`8:12`, `800mohm-cm:1.2`,
    /// `1e15:2e15`, `:12` for an upper limit only).
    ///
    /// # Errors
    /// [`SpecError::Form`] without exactly one colon, otherwise as [`SpecWindow::new`].
    pub fn parse(quantity: SpecQuantity, text: &str) -> Result<SpecWindow, SpecError> {
        let mut parts = text.split(':');
        let (Some(low), Some(high), None) = (parts.next(), parts.next(), parts.next()) else {
            return Err(SpecError::Form {
                given: text.to_owned(),
            });
        };
        let side = |side: &'static str, part: &str| -> Result<Option<f64>, SpecError> {
            if part.trim().is_empty() {
                return Ok(None);
            }
            parse_quantity(part, quantity.kind())
                .map(Some)
                .map_err(|e| SpecError::Limit {
                    side,
                    message: e.to_string(),
                })
        };
        SpecWindow::new(quantity, side("MIN", low)?, side("MAX", high)?)
    }

    /// The limited quantity.
    pub fn quantity(&self) -> SpecQuantity {
        self.quantity
    }

    /// Lower limit.
    pub fn min(&self) -> Option<f64> {
        self.min
    }

    /// Upper limit.
    pub fn max(&self) -> Option<f64> {
        self.max
    }

    /// Whether `value` lies in the window (limits included).
    pub fn contains(&self, value: f64) -> bool {
        self.min.is_none_or(|lo| value >= lo) && self.max.is_none_or(|hi| value <= hi)
    }

    /// The verdict on `value` whose uncertainty interval is `[low, high]`.
    ///
    /// # Formula
    /// Pass: the whole interval lies in the window. Fail: the whole interval lies outside it.
    /// Marginal: the interval straddles a limit. Margin = min(value - MIN, MAX - value) over
    /// the limits given: positive inside, negative outside; margin_percent = 100 margin / that
    /// limit.
    pub fn judge(&self, value: f64, low: f64, high: f64) -> Judgement {
        let (low, high) = (low.min(value), high.max(value));
        let inside = self.contains(low) && self.contains(high);
        let outside = self.min.is_some_and(|lo| high < lo) || self.max.is_some_and(|hi| low > hi);
        let verdict = if inside {
            Verdict::Pass
        } else if outside {
            Verdict::Fail
        } else {
            Verdict::Marginal
        };
        let candidates = [
            self.min.map(|lo| (value - lo, lo)),
            self.max.map(|hi| (hi - value, hi)),
        ];
        let (margin, limit) = candidates
            .into_iter()
            .flatten()
            .min_by(|a, b| a.0.total_cmp(&b.0))
            .unwrap_or((f64::NAN, f64::NAN));
        Judgement {
            verdict,
            value,
            low,
            high,
            margin,
            margin_percent: 100.0 * margin / limit,
            nearer_limit: limit,
        }
    }

    /// Process capability index of a population with `mean` and standard deviation `std`.
    ///
    /// # Formula
    /// Cpk = min(MAX - mean, mean - MIN) / (3 std), over the limits given (common practice,
    /// no source).
    ///
    /// # Validity
    /// `None` when std is not > 0 or not finite. Cpk assumes roughly normal site values.
    pub fn cpk(&self, mean: f64, std: f64) -> Option<f64> {
        if !(std > 0.0 && std.is_finite() && mean.is_finite()) {
            return None;
        }
        [self.max.map(|hi| hi - mean), self.min.map(|lo| mean - lo)]
            .into_iter()
            .flatten()
            .min_by(f64::total_cmp)
            .map(|distance| distance / (3.0 * std))
    }
}

impl fmt::Display for SpecWindow {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        // Densities read as 3.6e14, resistivities as 8 or 0.012: exponent form only when
        // the plain form would be long.
        let number = |v: f64| {
            if v != 0.0 && !(1e-3..1e5).contains(&v.abs()) {
                format!("{v:e}")
            } else {
                format!("{v}")
            }
        };
        let side = |v: Option<f64>| v.map_or_else(|| "open".to_owned(), number);
        write!(
            f,
            "{} {} to {} {}",
            self.quantity.label(),
            side(self.min),
            side(self.max),
            self.quantity.unit()
        )
    }
}

/// Pass, marginal or fail; ordered from best to worst.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Verdict {
    /// The value and its whole uncertainty interval lie in the window.
    Pass,
    /// The uncertainty interval straddles a limit.
    Marginal,
    /// The value and its whole uncertainty interval lie outside the window.
    Fail,
}

impl Verdict {
    /// "pass", "marginal" or "fail".
    pub fn as_str(self) -> &'static str {
        match self {
            Verdict::Pass => "pass",
            Verdict::Marginal => "marginal",
            Verdict::Fail => "fail",
        }
    }
}

impl fmt::Display for Verdict {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.as_str())
    }
}

/// A verdict with the numbers behind it, in the window's quantity.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Judgement {
    /// The verdict.
    pub verdict: Verdict,
    /// The judged value.
    pub value: f64,
    /// Lower end of its uncertainty interval.
    pub low: f64,
    /// Upper end of its uncertainty interval.
    pub high: f64,
    /// Signed distance to the nearer limit: > 0 inside, < 0 outside.
    pub margin: f64,
    /// The margin as a percentage of that limit.
    pub margin_percent: f64,
    /// The nearer limit.
    pub nearer_limit: f64,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn windows_print_their_quantity_limits_and_unit() {
        let shown = |q, text| SpecWindow::parse(q, text).unwrap().to_string();
        assert_eq!(
            shown(SpecQuantity::Resistivity, "8:12"),
            "resistivity 8 to 12 ohm-cm"
        );
        assert_eq!(
            shown(SpecQuantity::Density, "3.6e14:5.6e14"),
            "dopant density 3.6e14 to 5.6e14 cm^-3"
        );
        assert_eq!(
            shown(SpecQuantity::Resistivity, "0.0005:"),
            "resistivity 5e-4 to open ohm-cm"
        );
    }

    #[test]
    fn refusals_show_the_limits_as_written_with_their_unit() {
        let message = |q, text| SpecWindow::parse(q, text).unwrap_err().to_string();
        assert_eq!(
            message(SpecQuantity::Resistivity, "12:8"),
            "MIN 12 is not below MAX 8; give the lower limit first"
        );
        assert_eq!(
            message(SpecQuantity::Density, "5.5e14:3.5e14"),
            "MIN 5.5e14 is not below MAX 3.5e14; give the lower limit first"
        );
        assert_eq!(
            message(SpecQuantity::Resistivity, "0:5"),
            "MIN: 0 ohm-cm is not allowed; give a finite value > 0 ohm-cm"
        );
        assert_eq!(
            message(SpecQuantity::Density, ":-1e15"),
            "MAX: -1e15 cm^-3 is not allowed; give a finite value > 0 cm^-3"
        );
    }
}
