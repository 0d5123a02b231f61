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

/// The lot-difference lines the view lists (only those involving `shown` when a lot is
/// picked; the all-lots test only when none is): Welch per pair, Kruskal-Wallis for all.
pub fn difference_lines(r: &LotReport, shown: Option<&str>) -> Vec<String> {
    let mut lines: Vec<String> = r
        .differences
        .iter()
        .filter(|d| shown.is_none_or(|f| f == d.lot_a || f == d.lot_b))
        .map(|d| {
            format!(
                "{} vs {}: {:+.1} % dopant density (95 % CI {:+.1} to {:+.1} %), \
                 Welch p = {}: {}",
                d.lot_b,
                d.lot_a,
                d.percent,
                d.percent_ci95[0],
                d.percent_ci95[1],
                format::auto(d.test.p_value),
                if d.significant {
                    "significant"
                } else {
                    "not significant"
                }
            )
        })
        .collect();
    if let (Some(k), None) = (&r.kruskal_wallis, shown) {
        lines.push(format!(
            "All {} lots together: Kruskal-Wallis H = {}, p = {}: {}",
            k.lots.len(),
            format::auto(k.test.h),
            format::auto(k.test.p_value),
            if k.significant {
                "the lots differ"
            } else {
                "no significant difference"
            }
        ));
    }
    lines
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
            "Welch's t-test on ln density, Kruskal-Wallis, Cpk".to_string(),
            "Welch 1947; Kruskal & Wallis 1952; Cpk common practice".to_string(),
        ),
    ]
}
