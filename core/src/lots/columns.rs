//! The columns of a lot file: their names, units, which may be set for a whole file, and the
//! header line that maps them to positions.
//!
//! Names are matched case-insensitively after trimming; spaces and hyphens count as
//! underscores (`Sheet Resistance` is `sheet_resistance`). A unit may follow the name in
//! square brackets or parentheses (`thickness [um]`, `resistivity (ohm-cm)`); a bare number
//! in that column is then read in that unit, and a number written with its own unit keeps it.

use std::fmt;

use crate::units::{QuantityKind, Unit, UnitError, parse_quantity_bare_in};

/// One column bandgauge reads from a lot file.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Column {
    /// Lot identifier (text).
    Lot,
    /// Wafer identifier within the lot (text).
    Wafer,
    /// Site identifier within the wafer (text, optional).
    Site,
    /// Site x position on the wafer; bare numbers in mm.
    X,
    /// Site y position on the wafer; bare numbers in mm.
    Y,
    /// Dopant symbol or name: B, P, As, Sb (boron, phosphorus, arsenic, antimony).
    Dopant,
    /// Conductivity type: n or p (n-type, p-type).
    Type,
    /// Measured resistivity; bare numbers in ohm cm.
    Resistivity,
    /// Measured sheet resistance; bare numbers in ohm/sq; needs a thickness.
    SheetResistance,
    /// Wafer or layer thickness; bare numbers in um.
    Thickness,
    /// Four-point-probe voltage between the inner probes; bare numbers in V.
    Volts,
    /// Four-point-probe current through the outer probes; bare numbers in A.
    Amps,
    /// Four-point-probe spacing (equal, collinear); bare numbers in mm.
    Spacing,
    /// Van der Pauw four-terminal resistance R_A (V/I); bare numbers in ohm; needs `r_b` and a
    /// thickness.
    RA,
    /// Van der Pauw four-terminal resistance R_B, the configuration turned by one contact.
    RB,
    /// Relative half-width of the measured value's uncertainty, in percent.
    Uncertainty,
    /// The sample geometry of a probe reading: thin-layer (default) or bulk.
    Geometry,
}

impl Column {
    /// Every column, in the order the documentation lists them.
    pub const ALL: [Column; 17] = [
        Column::Lot,
        Column::Wafer,
        Column::Site,
        Column::X,
        Column::Y,
        Column::Dopant,
        Column::Type,
        Column::Resistivity,
        Column::SheetResistance,
        Column::Thickness,
        Column::Volts,
        Column::Amps,
        Column::Spacing,
        Column::RA,
        Column::RB,
        Column::Uncertainty,
        Column::Geometry,
    ];

    /// The name as written in a header (lower case, underscores).
    pub fn name(self) -> &'static str {
        match self {
            Column::Lot => "lot",
            Column::Wafer => "wafer",
            Column::Site => "site",
            Column::X => "x",
            Column::Y => "y",
            Column::Dopant => "dopant",
            Column::Type => "type",
            Column::Resistivity => "resistivity",
            Column::SheetResistance => "sheet_resistance",
            Column::Thickness => "thickness",
            Column::Volts => "volts",
            Column::Amps => "amps",
            Column::Spacing => "spacing",
            Column::RA => "r_a",
            Column::RB => "r_b",
            Column::Uncertainty => "uncertainty",
            Column::Geometry => "geometry",
        }
    }

    /// The physical kind of a numeric column (`None` for text columns and `uncertainty`).
    pub fn kind(self) -> Option<QuantityKind> {
        match self {
            Column::X | Column::Y | Column::Thickness | Column::Spacing => {
                Some(QuantityKind::Length)
            }
            Column::Resistivity => Some(QuantityKind::Resistivity),
            Column::SheetResistance => Some(QuantityKind::SheetResistance),
            Column::Volts => Some(QuantityKind::Voltage),
            Column::Amps => Some(QuantityKind::Current),
            Column::RA | Column::RB => Some(QuantityKind::Resistance),
            _ => None,
        }
    }

    /// The unit of a bare number when the header names none.
    pub fn bare_unit(self) -> Option<&'static str> {
        match self {
            Column::X | Column::Y | Column::Spacing => Some("mm"),
            Column::Thickness => Some("um"),
            Column::Resistivity => Some("ohm-cm"),
            Column::SheetResistance => Some("ohm/sq"),
            Column::Volts => Some("V"),
            Column::Amps => Some("A"),
            Column::RA | Column::RB => Some("ohm"),
            Column::Uncertainty => Some("%"),
            _ => None,
        }
    }

    /// Whether a `# name: value` line before the header may give this column's value for
    /// every row of the file.
    pub fn settable(self) -> bool {
        matches!(
            self,
            Column::Lot
                | Column::Wafer
                | Column::Dopant
                | Column::Type
                | Column::Thickness
                | Column::Spacing
                | Column::Uncertainty
                | Column::Geometry
        )
    }

    /// The column called `name` (case-insensitive; spaces and hyphens read as underscores).
    pub fn from_name(name: &str) -> Option<Column> {
        let normalised = normalise_name(name);
        Column::ALL.into_iter().find(|c| c.name() == normalised)
    }
}

impl fmt::Display for Column {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// ASCII lower case (every name matched against is ASCII; the Unicode case tables would add
/// about 16 KB to the page), trimmed, runs of spaces, hyphens and underscores folded to one
/// underscore.
pub(crate) fn normalise_name(name: &str) -> String {
    let mut out = String::with_capacity(name.len());
    let mut pending_separator = false;
    for c in name.trim().chars() {
        if c == ' ' || c == '-' || c == '_' || c == '\t' {
            pending_separator = true;
        } else {
            if pending_separator && !out.is_empty() {
                out.push('_');
            }
            pending_separator = false;
            out.push(c.to_ascii_lowercase());
        }
    }
    out
}

/// A header cell split into its name and the unit in brackets, if any:
/// `"thickness [um]"` gives `("thickness", Some("um"))`.
pub(crate) fn split_name_and_unit(cell: &str) -> (&str, Option<&str>) {
    let cell = cell.trim();
    for (open, close) in [('[', ']'), ('(', ')')] {
        if let Some(start) = cell.find(open)
            && cell.ends_with(close)
        {
            let unit = cell[start + 1..cell.len() - 1].trim();
            return (cell[..start].trim(), Some(unit));
        }
    }
    (cell, None)
}

/// The unit a column's bare numbers are read in: the header's, else the column's default.
/// Checks that the header's unit is one the column accepts.
pub(crate) fn header_unit(column: Column, unit: Option<&str>) -> Result<Option<String>, String> {
    let Some(unit) = unit else {
        return Ok(column.bare_unit().map(str::to_owned));
    };
    if column == Column::Uncertainty {
        return if unit == "%" {
            Ok(Some(unit.to_owned()))
        } else {
            Err(format!(
                "column {column}: unit [{unit}] is not allowed; uncertainty is a percentage: \
                 write [%] or no unit"
            ))
        };
    }
    let Some(kind) = column.kind() else {
        return Err(format!(
            "column {column}: unit [{unit}] is not allowed; {column} is text and takes no unit"
        ));
    };
    match parse_quantity_bare_in("1", kind, unit) {
        Ok(_) => Ok(Some(unit.to_owned())),
        Err(UnitError::UnknownUnit { .. }) => Err(format!(
            "column {column}: unit [{unit}] is not an accepted {kind} unit; allowed: {}",
            kind.allowed_units()
        )),
        Err(other) => Err(format!("column {column}: unit [{unit}]: {other}")),
    }
}

/// The unit table entry that `unit_text` names for `kind` (`None` if it names none), so that
/// bare numbers can be scaled without parsing the unit text again on every row.
pub(crate) fn unit_entry(kind: QuantityKind, unit_text: &str) -> Option<&'static Unit> {
    let factor = parse_quantity_bare_in("1", kind, unit_text).ok()?;
    // Every unit of a kind has its own power of ten, so the factor identifies it.
    kind.units().iter().find(|u| u.to_default(1.0) == factor)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_fold_case_spaces_and_hyphens() {
        assert_eq!(
            Column::from_name(" Sheet  Resistance "),
            Some(Column::SheetResistance)
        );
        assert_eq!(
            Column::from_name("sheet-resistance"),
            Some(Column::SheetResistance)
        );
        assert_eq!(Column::from_name("LOT"), Some(Column::Lot));
        assert_eq!(Column::from_name("operator"), None);
    }

    #[test]
    fn units_come_from_brackets_or_parentheses() {
        assert_eq!(
            split_name_and_unit("thickness [um]"),
            ("thickness", Some("um"))
        );
        assert_eq!(
            split_name_and_unit("resistivity (ohm-cm)"),
            ("resistivity", Some("ohm-cm"))
        );
        assert_eq!(split_name_and_unit("lot"), ("lot", None));
        assert!(header_unit(Column::Thickness, Some("in")).is_err());
        assert!(header_unit(Column::Lot, Some("mm")).is_err());
        assert_eq!(
            header_unit(Column::Thickness, None),
            Ok(Some("um".to_owned()))
        );
    }
}
