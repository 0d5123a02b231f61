//! What the view and the report derive from a lot report as text: the summary CSV, the
//! lot-difference lines and the models used.

use std::fmt::Write as _;

use bandgauge_core::lots::LotReport;

use crate::format;

pub(super) fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_owned()
    }
}

/// The summary per lot and per wafer as CSV.
pub fn summary_csv(report: &LotReport) -> String {
    let mut out = String::from(
        "lot,wafer,dopant,sites,resistivity_mean_ohm_cm,resistivity_median_ohm_cm,\
         resistivity_std_ohm_cm,resistivity_min_ohm_cm,resistivity_max_ohm_cm,\
         nonuniformity_percent,density_mean_cm3,density_median_cm3,density_std_cm3,\
         density_min_cm3,density_max_cm3,verdict,margin,cpk\n",
    );
    let n = |v: f64| format::csv_number(v);
    let o = |v: Option<f64>| v.map(format::csv_number).unwrap_or_default();
    for lot in &report.lots {
        let (r, d) = (&lot.resistivity_ohm_cm, &lot.density_cm3);
        let _ = writeln!(
            out,
            "{},,{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}",
            csv_field(&lot.lot),
            lot.dopant,
            lot.sites,
            n(r.mean),
            n(r.median),
            o(r.std),
            n(r.min),
            n(r.max),
            o(r.nonuniformity_percent),
            n(d.mean),
            n(d.median),
            o(d.std),
            n(d.min),
            n(d.max),
            lot.verdict.map(|v| v.as_str()).unwrap_or(""),
            o(lot.margin),
            o(lot.cpk)
        );
        for w in &lot.wafer_results {
            let (r, d) = (&w.resistivity_ohm_cm, &w.density_cm3);
            let _ = writeln!(
                out,
                "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},",
                csv_field(&lot.lot),
                csv_field(&w.wafer),
                lot.dopant,
                w.sites,
                n(r.mean),
                n(r.median),
                o(r.std),
                n(r.min),
                n(r.max),
                o(r.nonuniformity_percent),
                n(d.mean),
                n(d.median),
                o(d.std),
                n(d.min),
                n(d.max),
                w.judgement.map(|j| j.verdict.as_str()).unwrap_or(""),
                o(w.judgement.map(|j| j.margin))
            );
        }
    }
    out
}

/// The multiplicity adjustment of the pairwise p-values, named beside the table.
pub const HOLM_ADJUSTMENT: &str = "p-values adjusted for the number of pairs tested by Holm's \
                                   step-down method, Holm (1979), Scand. J. Statist. 6, 65-70; a \
                                   pair is significant when its adjusted p < 0.05";

/// One row of the lot-difference table.
#[derive(Debug, Clone, PartialEq)]
pub struct DifferenceRow {
    /// "B vs A" for a pair, "all N lots" for the Kruskal-Wallis test.
    pub lots: String,
    /// The test, in words.
    pub test: &'static str,
    /// How much heavier (> 0) lot B is doped, percent (pairs only).
    pub percent: Option<f64>,
    /// Its 95 % confidence interval (pairs only).
    pub percent_ci95: Option<[f64; 2]>,
    /// The test's own p-value.
    pub p_raw: f64,
    /// The Holm-adjusted p-value (pairs only; the all-lots test is a single test).
    pub p_adjusted: Option<f64>,
    /// Whether the (adjusted, for pairs) p is below 0.05.
    pub significant: bool,
}

impl DifferenceRow {
    /// The verdict in words.
    pub fn verdict(&self) -> &'static str {
        match (self.significant, self.p_adjusted.is_some()) {
            (true, true) => "significant",
            (false, true) => "not significant",
            (true, false) => "the lots differ",
            (false, false) => "no significant difference",
        }
    }
}

/// The lot-difference rows the view lists (only those involving `shown` when a lot is picked;
/// the all-lots test only when none is): Welch per pair with raw and Holm-adjusted p,
/// Kruskal-Wallis for all.
pub fn difference_rows(r: &LotReport, shown: Option<&str>) -> Vec<DifferenceRow> {
    let mut rows: Vec<DifferenceRow> = r
        .differences
        .iter()
        .filter(|d| shown.is_none_or(|f| f == d.lot_a || f == d.lot_b))
        .map(|d| DifferenceRow {
            lots: format!("{} vs {}", d.lot_b, d.lot_a),
            test: "Welch t on ln density",
            percent: Some(d.percent),
            percent_ci95: Some(d.percent_ci95),
            p_raw: d.test.p_value,
            p_adjusted: Some(d.p_adjusted),
            significant: d.significant,
        })
        .collect();
    if let (Some(k), None) = (&r.kruskal_wallis, shown) {
        rows.push(DifferenceRow {
            lots: format!("all {} lots", k.lots.len()),
            test: "Kruskal-Wallis",
            percent: None,
            percent_ci95: None,
            p_raw: k.test.p_value,
            p_adjusted: None,
            significant: k.significant,
        });
    }
    rows
}

/// `(quantity, model, source)` of the conversion and the statistics behind a lot report:
/// what the caution lists and the sign-off report prints.
pub fn models_used(r: &LotReport) -> Vec<(String, String, String)> {
    vec![
        (
            "resistivity to dopant density".to_string(),
            r.model.clone(),
            r.model_reference.to_string(),
        ),
        (
            "lot statistics".to_string(),
            "Welch's t-test on ln density with Holm-adjusted p-values over all pairs, \
             Kruskal-Wallis, Cpk"
                .to_string(),
            "Welch 1947; Holm (1979), Scand. J. Statist. 6, 65-70; Kruskal & Wallis 1952; Cpk \
             common practice"
                .to_string(),
        ),
    ]
}
