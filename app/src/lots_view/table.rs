//! The wafer table's rows, which of them are shown and in what order: plain data, tested
//! natively. The component keeps the rows in a memo (rebuilt only when the report changes) and
//! the order in another (rebuilt when the filter or the sort changes), so neither a click nor a
//! keystroke re-reads a file.

use std::cmp::Ordering;

use bandgauge_core::lots::{LotReport, Verdict};
use bandgauge_core::order;

/// One wafer as the table shows it.
#[derive(Clone, Debug, PartialEq)]
pub struct WaferRow {
    /// Lot identifier.
    pub lot: String,
    /// Wafer identifier.
    pub wafer: String,
    /// Sites converted.
    pub sites: u64,
    /// Mean resistivity of the sites, ohm cm.
    pub mean_ohm_cm: f64,
    /// 100 x standard deviation / mean of the sites' resistivity, when there are two or more.
    pub nonuniformity_percent: Option<f64>,
    /// Mean dopant density of the sites, cm^-3.
    pub mean_cm3: f64,
    /// Verdict against the spec window, when one is given.
    pub verdict: Option<Verdict>,
    /// Distance of the mean to the nearer limit, in the window's unit, when a window is given.
    pub margin: Option<f64>,
    /// Sites outside the window, when one is given.
    pub sites_outside: Option<u64>,
}

/// The rows of every wafer of the lots shown (all, or the one `lot_filter` names), in the
/// report's order.
pub fn wafer_rows(report: &LotReport, lot_filter: Option<&str>) -> Vec<WaferRow> {
    report
        .lots
        .iter()
        .filter(|l| lot_filter.is_none_or(|f| f == l.lot))
        .flat_map(|l| {
            l.wafer_results.iter().map(|w| WaferRow {
                lot: l.lot.clone(),
                wafer: w.wafer.clone(),
                sites: w.sites,
                mean_ohm_cm: w.resistivity_ohm_cm.mean,
                nonuniformity_percent: w.resistivity_ohm_cm.nonuniformity_percent,
                mean_cm3: w.density_cm3.mean,
                verdict: w.judgement.map(|j| j.verdict),
                margin: w.judgement.map(|j| j.margin),
                sites_outside: w.sites_outside,
            })
        })
        .collect()
}

/// Which wafers the table shows.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum WaferFilter {
    /// Every wafer.
    #[default]
    All,
    /// Wafers whose verdict is fail.
    Failing,
    /// Wafers whose verdict is fail or marginal.
    FailingOrMarginal,
}

impl WaferFilter {
    /// Every filter, in the order the page offers them.
    pub const ALL: [WaferFilter; 3] = [
        WaferFilter::All,
        WaferFilter::Failing,
        WaferFilter::FailingOrMarginal,
    ];

    /// The option's value in the page.
    pub fn id(self) -> &'static str {
        match self {
            WaferFilter::All => "all",
            WaferFilter::Failing => "fail",
            WaferFilter::FailingOrMarginal => "fail-marginal",
        }
    }

    /// The option's text.
    pub fn text(self) -> &'static str {
        match self {
            WaferFilter::All => "all wafers",
            WaferFilter::Failing => "failing wafers",
            WaferFilter::FailingOrMarginal => "failing and marginal wafers",
        }
    }

    /// The filter with this id; anything else shows every wafer.
    pub fn from_id(id: &str) -> WaferFilter {
        WaferFilter::ALL
            .into_iter()
            .find(|f| f.id() == id)
            .unwrap_or_default()
    }

    fn keeps(self, row: &WaferRow) -> bool {
        match self {
            WaferFilter::All => true,
            WaferFilter::Failing => row.verdict == Some(Verdict::Fail),
            WaferFilter::FailingOrMarginal => {
                matches!(row.verdict, Some(Verdict::Fail | Verdict::Marginal))
            }
        }
    }
}

/// A column of the wafer table.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum WaferColumn {
    /// Lot identifier.
    Lot,
    /// Wafer identifier.
    Wafer,
    /// Sites converted.
    Sites,
    /// Mean resistivity.
    MeanResistivity,
    /// Non-uniformity, percent.
    Nonuniformity,
    /// Mean dopant density.
    MeanDensity,
    /// Verdict.
    Verdict,
    /// Margin to the nearer limit.
    Margin,
    /// Sites outside the window.
    SitesOutside,
}

impl WaferColumn {
    /// Every column, left to right.
    pub const ALL: [WaferColumn; 9] = [
        WaferColumn::Lot,
        WaferColumn::Wafer,
        WaferColumn::Sites,
        WaferColumn::MeanResistivity,
        WaferColumn::Nonuniformity,
        WaferColumn::MeanDensity,
        WaferColumn::Verdict,
        WaferColumn::Margin,
        WaferColumn::SitesOutside,
    ];

    /// The column's id in `data-testid` (`wafers-sort-<id>`).
    pub fn id(self) -> &'static str {
        match self {
            WaferColumn::Lot => "lot",
            WaferColumn::Wafer => "wafer",
            WaferColumn::Sites => "sites",
            WaferColumn::MeanResistivity => "mean",
            WaferColumn::Nonuniformity => "nonuniformity",
            WaferColumn::MeanDensity => "density",
            WaferColumn::Verdict => "verdict",
            WaferColumn::Margin => "margin",
            WaferColumn::SitesOutside => "outside",
        }
    }

    /// Text columns are left-aligned.
    pub fn is_text(self) -> bool {
        matches!(
            self,
            WaferColumn::Lot | WaferColumn::Wafer | WaferColumn::Verdict
        )
    }

    /// The two rows' order by this column, ascending; a missing value is `None` and is placed
    /// last by [`shown_order`] whatever the direction.
    fn compare(self, a: &WaferRow, b: &WaferRow) -> Option<Ordering> {
        let numbers = |x: Option<f64>, y: Option<f64>| Some(x?.total_cmp(&y?));
        match self {
            WaferColumn::Lot => Some(identifiers(&a.lot, &b.lot)),
            WaferColumn::Wafer => Some(identifiers(&a.wafer, &b.wafer)),
            WaferColumn::Sites => Some(a.sites.cmp(&b.sites)),
            WaferColumn::MeanResistivity => numbers(Some(a.mean_ohm_cm), Some(b.mean_ohm_cm)),
            WaferColumn::Nonuniformity => numbers(a.nonuniformity_percent, b.nonuniformity_percent),
            WaferColumn::MeanDensity => numbers(Some(a.mean_cm3), Some(b.mean_cm3)),
            WaferColumn::Verdict => Some(severity(a.verdict?).cmp(&severity(b.verdict?))),
            WaferColumn::Margin => numbers(a.margin, b.margin),
            WaferColumn::SitesOutside => Some(a.sites_outside?.cmp(&b.sites_outside?)),
        }
    }

    /// Whether the row has a value in this column.
    fn has_value(self, row: &WaferRow) -> bool {
        match self {
            WaferColumn::Nonuniformity => row.nonuniformity_percent.is_some(),
            WaferColumn::Verdict => row.verdict.is_some(),
            WaferColumn::Margin => row.margin.is_some(),
            WaferColumn::SitesOutside => row.sites_outside.is_some(),
            _ => true,
        }
    }
}

/// Verdicts from best to worst, so an ascending sort lists passing wafers first.
fn severity(verdict: Verdict) -> u8 {
    match verdict {
        Verdict::Pass => 0,
        Verdict::Marginal => 1,
        _ => 2,
    }
}

/// Identifiers in the order people expect: numbers by value (wafer 2 before wafer 10), other
/// text by its characters, ignoring ASCII case.
fn identifiers(a: &str, b: &str) -> Ordering {
    match (a.trim().parse::<f64>(), b.trim().parse::<f64>()) {
        (Ok(x), Ok(y)) => x.total_cmp(&y).then_with(|| a.cmp(b)),
        _ => a
            .bytes()
            .map(|c| c.to_ascii_lowercase())
            .cmp(b.bytes().map(|c| c.to_ascii_lowercase()))
            .then_with(|| a.cmp(b)),
    }
}

/// The table's sort: a column and a direction.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct WaferSort {
    /// The column sorted by.
    pub column: WaferColumn,
    /// Largest (or worst, or last) first.
    pub descending: bool,
}

impl WaferSort {
    /// The sort after a click on `column`'s header: the same column again reverses it, another
    /// column sorts by that one, ascending.
    pub fn clicked(current: Option<WaferSort>, column: WaferColumn) -> WaferSort {
        match current {
            Some(s) if s.column == column => WaferSort {
                column,
                descending: !s.descending,
            },
            _ => WaferSort {
                column,
                descending: false,
            },
        }
    }

    /// The header's `aria-sort` value for `column`.
    pub fn aria(current: Option<WaferSort>, column: WaferColumn) -> &'static str {
        match current {
            Some(s) if s.column == column && s.descending => "descending",
            Some(s) if s.column == column => "ascending",
            _ => "none",
        }
    }
}

/// The indices of the rows shown, in the order shown: those `filter` keeps, sorted by `sort`
/// (stable: equal rows keep the report's order; rows without a value in the sorted column come
/// last in either direction), or in the report's order without a sort.
pub fn shown_order(rows: &[WaferRow], filter: WaferFilter, sort: Option<WaferSort>) -> Vec<usize> {
    let mut order: Vec<usize> = (0..rows.len())
        .filter(|&i| filter.keeps(&rows[i]))
        .collect();
    if let Some(WaferSort { column, descending }) = sort {
        order::sort_positions(&mut order, &|i, j| {
            let (a, b) = (&rows[i], &rows[j]);
            match (column.has_value(a), column.has_value(b)) {
                (true, false) => Ordering::Less,
                (false, true) => Ordering::Greater,
                (false, false) => Ordering::Equal,
                (true, true) => {
                    let ascending = column.compare(a, b).unwrap_or(Ordering::Equal);
                    if descending {
                        ascending.reverse()
                    } else {
                        ascending
                    }
                }
            }
        });
    }
    order
}

#[cfg(test)]
mod tests {
    use super::*;

    fn row(lot: &str, wafer: &str, mean: f64, verdict: Option<Verdict>) -> WaferRow {
        WaferRow {
            lot: lot.into(),
            wafer: wafer.into(),
            sites: 13,
            mean_ohm_cm: mean,
            nonuniformity_percent: None,
            mean_cm3: 4.4e15 / mean,
            verdict,
            margin: verdict.map(|_| mean - 8.0),
            sites_outside: verdict.map(|_| 0),
        }
    }

    fn lots_and_wafers(rows: &[WaferRow], order: &[usize]) -> Vec<String> {
        order
            .iter()
            .map(|&i| format!("{}/{}", rows[i].lot, rows[i].wafer))
            .collect()
    }

    fn rows() -> Vec<WaferRow> {
        use Verdict::{Fail, Marginal, Pass};
        vec![
            row("A", "10", 9.0, Some(Pass)),
            row("A", "2", 7.5, Some(Fail)),
            row("B", "1", 8.05, Some(Marginal)),
            row("b", "3", 9.0, Some(Pass)),
            row("C", "1", 10.0, None),
        ]
    }

    #[test]
    fn filters_keep_failing_then_failing_and_marginal_wafers() {
        let rows = rows();
        let shown = |f| lots_and_wafers(&rows, &shown_order(&rows, f, None));
        assert_eq!(shown(WaferFilter::All).len(), 5);
        assert_eq!(shown(WaferFilter::Failing), ["A/2"]);
        assert_eq!(shown(WaferFilter::FailingOrMarginal), ["A/2", "B/1"]);
        for f in WaferFilter::ALL {
            assert_eq!(WaferFilter::from_id(f.id()), f);
        }
        assert_eq!(WaferFilter::from_id("nonsense"), WaferFilter::All);
    }

    #[test]
    fn numbers_sort_by_value_stably_and_a_second_click_reverses() {
        let rows = rows();
        let by_mean = WaferSort::clicked(None, WaferColumn::MeanResistivity);
        assert_eq!(
            lots_and_wafers(&rows, &shown_order(&rows, WaferFilter::All, Some(by_mean))),
            // The two wafers at 9.0 keep the report's order.
            ["A/2", "B/1", "A/10", "b/3", "C/1"]
        );
        let reversed = WaferSort::clicked(Some(by_mean), WaferColumn::MeanResistivity);
        assert!(reversed.descending);
        assert_eq!(
            lots_and_wafers(&rows, &shown_order(&rows, WaferFilter::All, Some(reversed))),
            ["C/1", "A/10", "b/3", "B/1", "A/2"]
        );
        assert_eq!(
            WaferSort::aria(Some(reversed), WaferColumn::MeanResistivity),
            "descending"
        );
        assert_eq!(WaferSort::aria(Some(reversed), WaferColumn::Lot), "none");
        assert_eq!(
            WaferSort::clicked(Some(reversed), WaferColumn::Lot),
            WaferSort {
                column: WaferColumn::Lot,
                descending: false
            }
        );
    }

    #[test]
    fn identifiers_sort_numerically_when_they_are_numbers() {
        let rows = rows();
        let by_wafer = Some(WaferSort::clicked(None, WaferColumn::Wafer));
        assert_eq!(
            lots_and_wafers(&rows, &shown_order(&rows, WaferFilter::All, by_wafer)),
            ["B/1", "C/1", "A/2", "b/3", "A/10"]
        );
        let by_lot = Some(WaferSort::clicked(None, WaferColumn::Lot));
        assert_eq!(
            lots_and_wafers(&rows, &shown_order(&rows, WaferFilter::All, by_lot)),
            ["A/10", "A/2", "B/1", "b/3", "C/1"]
        );
    }

    #[test]
    fn missing_values_come_last_in_both_directions() {
        let rows = rows();
        for descending in [false, true] {
            let sort = WaferSort {
                column: WaferColumn::Verdict,
                descending,
            };
            let shown = lots_and_wafers(&rows, &shown_order(&rows, WaferFilter::All, Some(sort)));
            assert_eq!(shown.last().map(String::as_str), Some("C/1"), "{shown:?}");
            // Worst first when descending.
            assert_eq!(shown[0], if descending { "A/2" } else { "A/10" });
        }
    }
}
