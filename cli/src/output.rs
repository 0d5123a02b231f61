//! Plain-text rendering: aligned tables, number formats and the caution line.

use std::fmt::Write as _;

/// Significant digits shown in tables; JSON and CSV carry full precision.
const TABLE_SIGNIFICANT_DIGITS: usize = 4;

/// Formats `value` for a table: 4 significant digits, fixed notation between
/// 0.001 and 100000, scientific otherwise.
pub fn number(value: f64) -> String {
    if !value.is_finite() {
        return value.to_string();
    }
    if value == 0.0 {
        return "0".to_owned();
    }
    let precision = TABLE_SIGNIFICANT_DIGITS - 1;
    let scientific = format!("{value:.precision$e}");
    // The exponent after rounding, so that 9.9996 counts as 10.00 (exponent 1).
    let exponent: i32 = scientific
        .rsplit_once('e')
        .and_then(|(_, e)| e.parse().ok())
        .unwrap_or(0);
    if (-3..5).contains(&exponent) {
        let decimals = (precision as i32 - exponent).max(0) as usize;
        format!("{value:.decimals$}")
    } else {
        scientific
    }
}

/// Formats a temperature in kelvin or Celsius: up to two decimals, trailing zeros dropped
/// (296.15, 300, 77.5), so that 23 C = 296.15 K shows in full.
pub fn temperature(value: f64) -> String {
    let text = format!("{value:.2}");
    text.trim_end_matches('0').trim_end_matches('.').to_owned()
}

/// Full-precision text for CSV: the shortest form that reads back to the same f64.
pub fn exact(value: f64) -> String {
    format!("{value:e}")
}

/// The unit of a core field name, e.g. "cm" for "thickness_cm".
pub fn unit_of_field(field: &str) -> &'static str {
    match field {
        "resistivity_ohm_cm" => "ohm-cm",
        "density_cm3" => "cm^-3",
        "temperature_k" => "K",
        "volts" => "V",
        "amps" => "A",
        _ => "cm",
    }
}

/// A table of text cells printed with aligned columns. Columns listed in
/// `right_aligned` (numbers) are padded on the left.
#[derive(Debug, Default)]
pub struct Table {
    header: Vec<String>,
    rows: Vec<Vec<String>>,
    right_aligned: Vec<bool>,
}

impl Table {
    /// A table with these column titles; `right_aligned[i]` for numeric columns.
    pub fn new(header: &[&str], right_aligned: &[bool]) -> Table {
        Table {
            header: header.iter().map(|h| (*h).to_owned()).collect(),
            rows: Vec::new(),
            right_aligned: right_aligned.to_vec(),
        }
    }

    /// Appends one row (missing cells print empty).
    pub fn row<S: Into<String>>(&mut self, cells: impl IntoIterator<Item = S>) {
        self.rows.push(cells.into_iter().map(Into::into).collect());
    }

    /// Appends a row of a label, a number as tables show it, and its unit.
    pub fn value_row(&mut self, label: impl Into<String>, value: f64, unit: &str) {
        self.row([label.into(), number(value), unit.to_owned()]);
    }

    /// The table as lines of text, each ending in a newline, indented by two spaces.
    pub fn render(&self) -> String {
        let columns = self
            .header
            .len()
            .max(self.rows.iter().map(Vec::len).max().unwrap_or(0));
        let mut widths = vec![0; columns];
        for row in std::iter::once(&self.header).chain(&self.rows) {
            for (index, cell) in row.iter().enumerate() {
                widths[index] = widths[index].max(cell.chars().count());
            }
        }
        let mut out = String::new();
        for row in std::iter::once(&self.header).chain(&self.rows) {
            let mut line = String::from("  ");
            for (index, width) in widths.iter().enumerate() {
                let cell = row.get(index).map_or("", String::as_str);
                let pad = width - cell.chars().count();
                if index > 0 {
                    line.push_str("  ");
                }
                if self.right_aligned.get(index).copied().unwrap_or(false) {
                    line.push_str(&" ".repeat(pad));
                    line.push_str(cell);
                } else {
                    line.push_str(cell);
                    line.push_str(&" ".repeat(pad));
                }
            }
            let _ = writeln!(out, "{}", line.trim_end());
        }
        out
    }
}

/// The one-line caution printed under every table.
pub fn caution(models: &str) -> String {
    format!(
        "Caution: model estimates ({models}); the fab's own specifications and the \
         governing standards decide acceptance."
    )
}

/// The end of every table view: the notes, if any, under a heading, then the caution
/// line after a blank line.
pub fn closing<'a>(notes: impl IntoIterator<Item = &'a String>, caution: &str) -> String {
    let mut text = String::new();
    let mut notes = notes.into_iter().peekable();
    if notes.peek().is_some() {
        text.push_str("\nNotes\n");
        for note in notes {
            let _ = writeln!(text, "  - {note}");
        }
    }
    let _ = writeln!(text, "\n{caution}");
    text
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_have_four_significant_digits() {
        for (value, shown) in [
            (1.0e15, "1.000e15"),
            (1.44, "1.440"),
            (0.0258520, "0.02585"),
            (300.0, "300.0"),
            (-0.2, "-0.2000"),
            (12345.6, "12346"),
            (123456.0, "1.235e5"),
            (0.0, "0"),
            (9.65e9, "9.650e9"),
            (9.99996, "10.00"),
            (99999.7, "1.000e5"),
            (0.00099996, "0.001000"),
        ] {
            assert_eq!(number(value), shown, "{value}");
        }
    }

    #[test]
    fn temperatures_show_two_decimals_at_most() {
        for (value, shown) in [
            (296.15, "296.15"),
            (300.0, "300"),
            (77.5, "77.5"),
            (25.0, "25"),
        ] {
            assert_eq!(temperature(value), shown, "{value}");
        }
    }

    #[test]
    fn exact_reads_back() {
        for value in [1.0e15, 0.1, 1.0 / 3.0, 6.02214076e23] {
            assert_eq!(exact(value).parse::<f64>().unwrap(), value);
        }
    }

    #[test]
    fn table_columns_align() {
        let mut table = Table::new(&["quantity", "value", "unit"], &[false, true, false]);
        table.row(["band gap", "1.125", "eV"]);
        table.row(["electrons", "1.000e15", "cm^-3"]);
        assert_eq!(
            table.render(),
            "  quantity      value  unit\n  band gap      1.125  eV\n  electrons  1.000e15  cm^-3\n"
        );
    }

    #[test]
    fn closing_lists_notes_only_when_there_are_some() {
        assert_eq!(closing([], "Caution."), "\nCaution.\n");
        let notes = ["one".to_owned(), "two".to_owned()];
        assert_eq!(
            closing(&notes, "Caution."),
            "\nNotes\n  - one\n  - two\n\nCaution.\n"
        );
    }
}
