//! The lot book: running tallies per lot and wafer as sites arrive from any number of files,
//! and the report made from them on demand (statistics, verdicts, Cpk, lot-to-lot tests).
//!
//! Memory grows with the number of lots and wafers: per wafer a few running sums and the
//! median sketches (at most [`EXACT_MEDIAN_LIMIT`](crate::lots::stats::EXACT_MEDIAN_LIMIT)
//! values, then bins).

use std::collections::HashMap;

use serde::Serialize;

use crate::compare::{self, ConversionInput, ConversionModel};
use crate::empirical::{
    EMPIRICAL_REFERENCE, EMPIRICAL_TEMPERATURE_K, EmpiricalRelation, density_from_resistivity_cm3,
};
use crate::lots::columns::Column;
use crate::lots::map::{Uniformity, WaferOutline, radial_profile};
use crate::lots::reader::{Measurement, RowCounts, RowRejection, Site, SiteSink};
use crate::lots::stats::{
    KruskalWallis, MedianSketch, Moments, Summary, WelchTest, holm_adjusted, kruskal_wallis,
    welch_t_test,
};
use crate::lots::verdict::{Judgement, SpecQuantity, SpecWindow, Verdict};
use crate::materials;
use crate::mobility::ConductivityType;
use crate::neutrality::SolveOptions;
use crate::probe::ProbeGeometry;

/// Family-wise level below which a lot-to-lot difference is called significant: the pairwise
/// tests' Holm-adjusted p-values and the single Kruskal-Wallis p-value are compared with it
/// (common practice, no source).
pub const SIGNIFICANCE_LEVEL: f64 = 0.05;

/// Up to this many lots every pair is tested; beyond it each lot is tested against the first
/// lot only, so the number of tests grows with the lots, not their square.
pub const ALL_PAIRS_LOT_LIMIT: usize = 10;

/// Per wafer the book keeps the positions and resistivities of at most this many sites for
/// the centre-to-edge figure; a wafer with more positioned sites gets none (and a note), so
/// memory stays bounded on very large files.
pub const MAP_SITE_LIMIT: usize = 2000;

/// How the report's figures are defined; printed with every result.
pub const DEFINITIONS: Definitions = Definitions {
    nonuniformity: "within-wafer non-uniformity = 100 x sample standard deviation / mean of the \
                    wafer's sites (percent, 1 sigma)",
    std: "sample standard deviation (n - 1 in the denominator)",
    median: "exact while a group has at most 4096 sites; beyond that from bins 0.01 % wide in \
             ln(value), within 0.005 %",
    wafer_verdict: "wafer mean against the window: pass when its uncertainty interval lies \
                    inside, fail when it lies outside, marginal when it straddles a limit",
    lot_verdict: "the worst of the lot's wafer verdicts; its margin is that wafer's",
    uncertainty: "resistivity window: mean x (1 -/+ u), u = largest uncertainty given for the \
                  wafer's sites; density window: the same interval carried through the \
                  relation, widened to the envelope of the other applicable conversion models \
                  at the wafer's mean resistivity (to 0.001 decade)",
    cpk: "Cpk = min(MAX - mean, mean - MIN) / (3 s) over all sites of the lot, in the window's \
          quantity (common practice)",
    lot_difference: "Welch's t-test on ln(wafer mean density), wafers as the units, for every \
                     pair of lots (each lot against the first when there are more than 10); \
                     ratio = exp(difference of means), i.e. the ratio of geometric means; \
                     the pairwise p-values are adjusted for the number of pairs tested by \
                     Holm's step-down method (Holm (1979), Scand. J. Statist. 6, 65-70) and a \
                     pair is significant when its adjusted p < 0.05. Kruskal-Wallis on the wafer mean densities when three or \
                     more lots are compared",
};

/// The definitions used in a report, in words.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Definitions {
    /// Non-uniformity.
    pub nonuniformity: &'static str,
    /// Standard deviation.
    pub std: &'static str,
    /// Median.
    pub median: &'static str,
    /// Wafer verdict.
    pub wafer_verdict: &'static str,
    /// Lot verdict.
    pub lot_verdict: &'static str,
    /// Uncertainty interval.
    pub uncertainty: &'static str,
    /// Cpk.
    pub cpk: &'static str,
    /// Lot-to-lot tests.
    pub lot_difference: &'static str,
}

#[derive(Debug, Clone, Default)]
struct Tally {
    resistivity: Moments,
    density: Moments,
}

impl Tally {
    fn push(&mut self, site: &Site<'_>) {
        self.resistivity.push(site.resistivity_ohm_cm);
        self.density.push(site.density_cm3);
    }
}

#[derive(Debug, Clone)]
struct WaferTally {
    id: String,
    tally: Tally,
    resistivity_sketch: MedianSketch,
    density_sketch: MedianSketch,
    largest_uncertainty: Option<f64>,
    sites_with_position: u64,
    /// (x mm, y mm, resistivity) of positioned sites, up to [`MAP_SITE_LIMIT`].
    positioned: Vec<(f64, f64, f64)>,
}

#[derive(Debug, Clone)]
struct LotTally {
    id: String,
    dopant: &'static str,
    relation: EmpiricalRelation,
    dopant_from_type: bool,
    tally: Tally,
    wafers: Vec<WaferTally>,
    wafer_index: HashMap<String, usize>,
    outline: WaferOutline,
}

/// Running tallies of every lot and wafer; see the module documentation.
#[derive(Debug, Clone, Default)]
pub struct LotBook {
    lots: Vec<LotTally>,
    lot_index: HashMap<String, usize>,
    last: Option<(usize, usize)>,
    counts: RowCounts,
    used_phosphorus_for_other: bool,
    probe_rows: ProbeRowCounts,
}

/// Four-point-probe rows converted, by the geometry they were evaluated for.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Serialize)]
pub struct ProbeRowCounts {
    /// Rows evaluated as a thin layer or wafer.
    pub thin_layer: u64,
    /// Rows evaluated as a bulk sample.
    pub bulk: u64,
}

impl LotBook {
    /// An empty book.
    pub fn new() -> LotBook {
        LotBook::default()
    }

    /// Rows counted over every file read into the book.
    pub fn counts(&self) -> RowCounts {
        self.counts
    }

    /// Number of lots so far.
    pub fn lot_count(&self) -> usize {
        self.lots.len()
    }

    /// Number of wafers so far.
    pub fn wafer_count(&self) -> usize {
        self.lots.iter().map(|l| l.wafers.len()).sum()
    }

    pub(crate) fn count_rejected(&mut self) {
        self.counts.read += 1;
        self.counts.rejected += 1;
    }

    /// Adds a converted site.
    ///
    /// # Errors
    /// A [`RowRejection`] when the site's relation differs from its lot's (a lot holds one
    /// conductivity type); the row is then counted as rejected.
    pub fn accept(&mut self, site: &Site<'_>) -> Result<(), RowRejection> {
        let (lot_index, wafer_index) = self.locate(site);
        let lot = &mut self.lots[lot_index];
        if lot.relation != site.relation {
            self.counts.read += 1;
            self.counts.rejected += 1;
            let column = if site.dopant_from_type {
                Column::Type
            } else {
                Column::Dopant
            };
            let t = |r: EmpiricalRelation| r.conductivity_type().as_str();
            return Err(RowRejection {
                line: site.line,
                column: Some(column),
                reason: format!(
                    "lot {} is {}-type ({}) from its first row; this row is {}-type ({}); a lot \
                     holds one conductivity type",
                    lot.id,
                    t(lot.relation),
                    lot.dopant,
                    t(site.relation),
                    site.dopant
                ),
            });
        }
        let wafer_index = match wafer_index {
            Some(i) => i,
            None => {
                lot.wafers.push(WaferTally {
                    id: site.wafer.to_owned(),
                    tally: Tally::default(),
                    resistivity_sketch: MedianSketch::new(),
                    density_sketch: MedianSketch::new(),
                    largest_uncertainty: None,
                    sites_with_position: 0,
                    positioned: Vec::new(),
                });
                let i = lot.wafers.len() - 1;
                lot.wafer_index.insert(site.wafer.to_owned(), i);
                i
            }
        };
        lot.tally.push(site);
        lot.dopant_from_type &= site.dopant_from_type;
        let wafer = &mut lot.wafers[wafer_index];
        wafer.tally.push(site);
        wafer.resistivity_sketch.push(site.resistivity_ohm_cm);
        wafer.density_sketch.push(site.density_cm3);
        if let Some(u) = site.uncertainty {
            wafer.largest_uncertainty = Some(wafer.largest_uncertainty.map_or(u, |w| w.max(u)));
        }
        if let (Some(x), Some(y)) = (site.x_mm, site.y_mm) {
            wafer.sites_with_position += 1;
            if wafer.positioned.len() < MAP_SITE_LIMIT {
                wafer.positioned.push((x, y, site.resistivity_ohm_cm));
            }
        }
        if site.dopant == "As" || site.dopant == "Sb" {
            self.used_phosphorus_for_other = true;
        }
        if let Measurement::Probe { geometry, .. } = site.measurement {
            match geometry {
                ProbeGeometry::ThinLayer => self.probe_rows.thin_layer += 1,
                ProbeGeometry::Bulk => self.probe_rows.bulk += 1,
            }
        }
        self.last = Some((lot_index, wafer_index));
        self.counts.read += 1;
        self.counts.converted += 1;
        Ok(())
    }

    /// The lot's index (created if new) and the wafer's index if it exists.
    fn locate(&mut self, site: &Site<'_>) -> (usize, Option<usize>) {
        if let Some((l, w)) = self.last {
            let lot = &self.lots[l];
            if lot.id == site.lot {
                if lot.wafers[w].id == site.wafer {
                    return (l, Some(w));
                }
                return (l, lot.wafer_index.get(site.wafer).copied());
            }
        }
        if let Some(&l) = self.lot_index.get(site.lot) {
            return (l, self.lots[l].wafer_index.get(site.wafer).copied());
        }
        self.lots.push(LotTally {
            id: site.lot.to_owned(),
            dopant: site.dopant,
            relation: site.relation,
            dopant_from_type: site.dopant_from_type,
            tally: Tally::default(),
            wafers: Vec::new(),
            wafer_index: HashMap::new(),
            outline: site.outline,
        });
        let l = self.lots.len() - 1;
        self.lot_index.insert(site.lot.to_owned(), l);
        (l, None)
    }

    /// The report on everything read so far, judged against `spec` when given.
    pub fn report(&self, spec: Option<&SpecWindow>) -> LotReport {
        let mut notes = Vec::new();
        let mut model_spread = ModelSpread::new();
        let lots: Vec<LotSummary> = self
            .lots
            .iter()
            .map(|lot| summarise_lot(lot, spec, &mut model_spread, &mut notes))
            .collect();
        if self.lots.iter().any(|l| l.dopant_from_type) {
            notes.push(
                "lots given only a conductivity type are converted with the boron relation \
                 (p-type) or the phosphorus relation (n-type)"
                    .to_owned(),
            );
        }
        if self.used_phosphorus_for_other {
            notes.push(
                "As and Sb are converted with the phosphorus relation, as the standard \
                 suggests (not near solid solubility)"
                    .to_owned(),
            );
        }
        let probe = self.probe_rows;
        for (rows, geometry) in [
            (probe.thin_layer, ProbeGeometry::ThinLayer),
            (probe.bulk, ProbeGeometry::Bulk),
        ] {
            if rows > 0 {
                notes.push(format!(
                    "{rows} four-point-probe row(s) evaluated with geometry {}: {}; the exact \
                     finite-thickness correction (Uhlir 1955) applied where a thickness is given",
                    geometry.id(),
                    geometry.describe()
                ));
            }
        }
        notes.extend(model_spread.notes);
        let (differences, kruskal_wallis) = compare_lots(&self.lots, &mut notes);
        LotReport {
            counts: self.counts,
            model: ConversionModel::Empirical.name(),
            model_reference: EMPIRICAL_REFERENCE,
            temperature_k: EMPIRICAL_TEMPERATURE_K,
            definitions: DEFINITIONS,
            spec: spec.copied(),
            lots,
            differences,
            kruskal_wallis,
            probe_rows: self.probe_rows,
            notes,
        }
    }
}

/// The book collects what a [`LotReader`](crate::lots::LotReader) reads.
impl SiteSink for LotBook {
    fn accept(&mut self, site: &Site<'_>) -> Result<(), RowRejection> {
        LotBook::accept(self, site)
    }

    fn count_rejected(&mut self) {
        LotBook::count_rejected(self);
    }
}

/// Everything the book knows, summarised.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LotReport {
    /// Rows read, converted and rejected over all files.
    pub counts: RowCounts,
    /// The conversion model, stated once for the whole result.
    pub model: String,
    /// Its published source.
    pub model_reference: &'static str,
    /// Temperature the conversion holds at, K (readings are taken as made at 23 C).
    pub temperature_k: f64,
    /// How the figures are defined.
    pub definitions: Definitions,
    /// The spec window judged against.
    pub spec: Option<SpecWindow>,
    /// One summary per lot, in the order lots first appeared.
    pub lots: Vec<LotSummary>,
    /// Welch's t-test for every pair of lots of the same type with two or more wafers each.
    pub differences: Vec<LotDifference>,
    /// Kruskal-Wallis over all such lots, when there are three or more.
    pub kruskal_wallis: Option<LotRankTest>,
    /// Four-point-probe rows by geometry.
    pub probe_rows: ProbeRowCounts,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
}

/// One lot.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LotSummary {
    /// Lot identifier.
    pub lot: String,
    /// Dopant symbol of its first row.
    pub dopant: &'static str,
    /// n or p.
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Number of wafers.
    pub wafers: usize,
    /// Number of sites.
    pub sites: u64,
    /// The lot verdict (worst wafer), `None` without a spec window.
    pub verdict: Option<Verdict>,
    /// Margin of the worst wafer to its nearer limit, in the window's quantity.
    pub margin: Option<f64>,
    /// That margin as a percentage of the limit.
    pub margin_percent: Option<f64>,
    /// The wafer that decides the verdict.
    pub worst_wafer: Option<String>,
    /// Wafers passing, marginal and failing.
    pub wafer_verdicts: Option<VerdictCounts>,
    /// Sites outside the window, over all wafers (no uncertainty applied).
    pub sites_outside: Option<u64>,
    /// Process capability index against the window.
    pub cpk: Option<f64>,
    /// Resistivity over all sites, ohm cm.
    pub resistivity_ohm_cm: Summary,
    /// Dopant density over all sites, cm^-3.
    pub density_cm3: Summary,
    /// One entry per wafer, in the order wafers first appeared.
    pub wafer_results: Vec<WaferSummary>,
    /// The wafer outline stated by the file of the lot's first site.
    pub outline: WaferOutline,
}

/// How many wafers got each verdict.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Serialize)]
pub struct VerdictCounts {
    /// Passing wafers.
    pub pass: usize,
    /// Marginal wafers.
    pub marginal: usize,
    /// Failing wafers.
    pub fail: usize,
}

/// One wafer.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WaferSummary {
    /// Wafer identifier.
    pub wafer: String,
    /// Number of sites.
    pub sites: u64,
    /// Sites with an x/y position.
    pub sites_with_position: u64,
    /// Resistivity, ohm cm.
    pub resistivity_ohm_cm: Summary,
    /// Dopant density, cm^-3.
    pub density_cm3: Summary,
    /// Largest measurement uncertainty given for its sites (relative half-width).
    pub uncertainty: Option<f64>,
    /// The verdict on the wafer mean, `None` without a spec window.
    pub judgement: Option<Judgement>,
    /// Sites outside the window (no uncertainty applied).
    pub sites_outside: Option<u64>,
    /// The uniformity figures of the sites' resistivity (`None` for one site).
    pub uniformity: Option<Uniformity>,
    /// 100 (centre - edge) / edge of the resistivity over the positioned sites
    /// ([`radial_profile`](crate::lots::map::radial_profile)); `None` without sites near the
    /// centre and at the edge, or beyond [`MAP_SITE_LIMIT`] positioned sites.
    pub centre_to_edge_percent: Option<f64>,
}

/// Welch's t-test between two lots.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LotDifference {
    /// The reference lot.
    pub lot_a: String,
    /// The lot compared with it.
    pub lot_b: String,
    /// Wafers in lot a.
    pub wafers_a: usize,
    /// Wafers in lot b.
    pub wafers_b: usize,
    /// Geometric mean of lot b's wafer mean densities over lot a's.
    pub density_ratio: f64,
    /// 100 (ratio - 1): how much heavier (> 0) or lighter lot b is doped, percent.
    pub percent: f64,
    /// 95 % confidence interval of `percent`.
    pub percent_ci95: [f64; 2],
    /// The test on ln density (its `p_value` is the raw, unadjusted one).
    pub test: WelchTest,
    /// The p-value adjusted for all pairs tested (Holm 1979).
    pub p_adjusted: f64,
    /// Adjusted p < [`SIGNIFICANCE_LEVEL`].
    pub significant: bool,
}

/// The Kruskal-Wallis test over several lots.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LotRankTest {
    /// The lots compared.
    pub lots: Vec<String>,
    /// The test on the wafer mean densities.
    pub test: KruskalWallis,
    /// p < [`SIGNIFICANCE_LEVEL`].
    pub significant: bool,
}

/// Resolution at which the model envelope is evaluated, decades of resistivity: wafer means are
/// rounded to the centre of a 0.001-decade (0.23 %) step, over which the envelope changes far
/// less than its own size, and each step is evaluated once per dopant.
const MODEL_SPREAD_STEP_DECADES: f64 = 1e-3;

/// Relative envelope of the other conversion models, evaluated once per resistivity step.
struct ModelSpread {
    silicon: materials::Material,
    solve: SolveOptions,
    cache: HashMap<(&'static str, i64), (f64, f64)>,
    notes: Vec<String>,
}

impl ModelSpread {
    fn new() -> ModelSpread {
        ModelSpread {
            silicon: materials::silicon(),
            solve: SolveOptions::default(),
            cache: HashMap::new(),
            notes: Vec::new(),
        }
    }

    /// (lowest, highest) density of the applicable models over the empirical one, both
    /// bracketing 1, at `resistivity_ohm_cm` rounded to [`MODEL_SPREAD_STEP_DECADES`].
    fn factors(
        &mut self,
        dopant: &'static str,
        resistivity_ohm_cm: f64,
        relation: EmpiricalRelation,
    ) -> (f64, f64) {
        let step = (resistivity_ohm_cm.log10() / MODEL_SPREAD_STEP_DECADES).floor();
        let key = (dopant, step as i64);
        if let Some(&factors) = self.cache.get(&key) {
            return factors;
        }
        let centre = 10f64.powf((step + 0.5) * MODEL_SPREAD_STEP_DECADES);
        let factors = self.evaluate(dopant, centre, relation);
        self.cache.insert(key, factors);
        factors
    }

    fn evaluate(
        &mut self,
        dopant: &str,
        resistivity_ohm_cm: f64,
        relation: EmpiricalRelation,
    ) -> (f64, f64) {
        let Ok(reference) = density_from_resistivity_cm3(relation, resistivity_ohm_cm) else {
            return (1.0, 1.0);
        };
        match compare::compare(
            &self.silicon,
            dopant,
            ConversionInput::ResistivityOhmCm(resistivity_ohm_cm),
            EMPIRICAL_TEMPERATURE_K,
            &self.solve,
        ) {
            Ok(comparison) => {
                let mut low: f64 = 1.0;
                let mut high: f64 = 1.0;
                for answer in comparison.answers.iter().filter(|a| a.in_spread) {
                    if let Some(n) = answer.density_cm3 {
                        low = low.min(n / reference);
                        high = high.max(n / reference);
                    }
                }
                (low, high)
            }
            Err(error) => {
                let note = format!("model spread not available for {dopant}: {error}");
                if !self.notes.contains(&note) {
                    self.notes.push(note);
                }
                (1.0, 1.0)
            }
        }
    }
}

fn summarise_lot(
    lot: &LotTally,
    spec: Option<&SpecWindow>,
    model_spread: &mut ModelSpread,
    notes: &mut Vec<String>,
) -> LotSummary {
    let wafer_results: Vec<WaferSummary> = lot
        .wafers
        .iter()
        .map(|w| summarise_wafer(lot, w, spec, model_spread))
        .collect();
    let resistivity_sketch = MedianSketch::merged(lot.wafers.iter().map(|w| &w.resistivity_sketch));
    let density_sketch = MedianSketch::merged(lot.wafers.iter().map(|w| &w.density_sketch));
    let resistivity = Summary::from_parts(&lot.tally.resistivity, &resistivity_sketch)
        .expect("a lot exists only once it has a site");
    let density = Summary::from_parts(&lot.tally.density, &density_sketch)
        .expect("a lot exists only once it has a site");
    let beyond_limit = lot
        .wafers
        .iter()
        .filter(|w| w.sites_with_position > MAP_SITE_LIMIT as u64)
        .count();
    if beyond_limit > 0 {
        notes.push(format!(
            "lot {}: {beyond_limit} wafer(s) have more than {MAP_SITE_LIMIT} sites with a \
             position; their centre-to-edge figure is not computed",
            lot.id
        ));
    }
    if spec.is_some() && wafer_results.iter().any(|w| w.uncertainty.is_none()) {
        notes.push(format!(
            "lot {}: some wafers have no measurement uncertainty; their verdict intervals hold \
             only the model spread (density windows) or nothing (resistivity windows)",
            lot.id
        ));
    }
    let mut summary = LotSummary {
        lot: lot.id.clone(),
        dopant: lot.dopant,
        conductivity_type: lot.relation.conductivity_type(),
        wafers: lot.wafers.len(),
        sites: lot.tally.resistivity.count(),
        verdict: None,
        margin: None,
        margin_percent: None,
        worst_wafer: None,
        wafer_verdicts: None,
        sites_outside: None,
        cpk: None,
        resistivity_ohm_cm: resistivity,
        density_cm3: density,
        wafer_results,
        outline: lot.outline,
    };
    if let Some(window) = spec {
        let worst = summary
            .wafer_results
            .iter()
            .filter_map(|w| w.judgement.map(|j| (w, j)))
            .max_by(|(_, a), (_, b)| {
                a.verdict
                    .cmp(&b.verdict)
                    .then(b.margin.total_cmp(&a.margin))
            });
        if let Some((wafer, judgement)) = worst {
            summary.verdict = Some(judgement.verdict);
            summary.margin = Some(judgement.margin);
            summary.margin_percent = Some(judgement.margin_percent);
            summary.worst_wafer = Some(wafer.wafer.clone());
        }
        let mut counts = VerdictCounts::default();
        for j in summary.wafer_results.iter().filter_map(|w| w.judgement) {
            match j.verdict {
                Verdict::Pass => counts.pass += 1,
                Verdict::Marginal => counts.marginal += 1,
                Verdict::Fail => counts.fail += 1,
            }
        }
        summary.wafer_verdicts = Some(counts);
        summary.sites_outside = Some(
            summary
                .wafer_results
                .iter()
                .filter_map(|w| w.sites_outside)
                .sum(),
        );
        let moments = match window.quantity() {
            SpecQuantity::Resistivity => &lot.tally.resistivity,
            SpecQuantity::Density => &lot.tally.density,
        };
        summary.cpk = match (moments.mean(), moments.sample_std()) {
            (Some(mean), Some(std)) => window.cpk(mean, std),
            _ => None,
        };
    }
    summary
}

fn summarise_wafer(
    lot: &LotTally,
    wafer: &WaferTally,
    spec: Option<&SpecWindow>,
    model_spread: &mut ModelSpread,
) -> WaferSummary {
    let resistivity = Summary::from_parts(&wafer.tally.resistivity, &wafer.resistivity_sketch)
        .expect("a wafer exists only once it has a site");
    let density = Summary::from_parts(&wafer.tally.density, &wafer.density_sketch)
        .expect("a wafer exists only once it has a site");
    let uncertainty = wafer.largest_uncertainty;
    let u = uncertainty.unwrap_or(0.0);
    let (judgement, sites_outside) = match spec {
        None => (None, None),
        Some(window) => match window.quantity() {
            SpecQuantity::Resistivity => {
                let m = resistivity.mean;
                (
                    Some(window.judge(m, m * (1.0 - u), m * (1.0 + u))),
                    Some(
                        wafer
                            .resistivity_sketch
                            .count_where(|v| !window.contains(v)),
                    ),
                )
            }
            SpecQuantity::Density => {
                let m = resistivity.mean;
                let (measured_low, measured_high) = density_factors(lot.relation, m, u);
                let (model_low, model_high) = model_spread.factors(lot.dopant, m, lot.relation);
                let n = density.mean;
                (
                    Some(window.judge(
                        n,
                        n * model_low * measured_low,
                        n * model_high * measured_high,
                    )),
                    Some(wafer.density_sketch.count_where(|v| !window.contains(v))),
                )
            }
        },
    };
    let uniformity = resistivity.std.and_then(|std| {
        Uniformity::from_moments(
            usize::try_from(resistivity.count).unwrap_or(usize::MAX),
            resistivity.mean,
            std,
            resistivity.min,
            resistivity.max,
        )
    });
    let centre_to_edge_percent = if wafer.sites_with_position > MAP_SITE_LIMIT as u64 {
        None
    } else {
        radial_profile(&wafer.positioned).map(|p| p.centre_to_edge_percent)
    };
    WaferSummary {
        wafer: wafer.id.clone(),
        sites: wafer.tally.resistivity.count(),
        sites_with_position: wafer.sites_with_position,
        resistivity_ohm_cm: resistivity,
        density_cm3: density,
        uncertainty,
        judgement,
        sites_outside,
        uniformity,
        centre_to_edge_percent,
    }
}

/// Density at resistivity rho (1 -/+ u) over density at rho: (low, high) factors. Where an end
/// falls outside the relation's range, N proportional to 1/rho is used for that end (the
/// relations approach it at low doping).
fn density_factors(relation: EmpiricalRelation, rho: f64, u: f64) -> (f64, f64) {
    if u == 0.0 {
        return (1.0, 1.0);
    }
    let at = |r: f64| density_from_resistivity_cm3(relation, r).ok();
    let centre = at(rho);
    let ratio = |r: f64, fallback: f64| match (centre, at(r)) {
        (Some(c), Some(n)) => n / c,
        _ => fallback,
    };
    let low = ratio(rho * (1.0 + u), 1.0 / (1.0 + u));
    let high = ratio(rho * (1.0 - u), 1.0 / (1.0 - u));
    (low.min(high), low.max(high))
}

fn compare_lots(
    lots: &[LotTally],
    notes: &mut Vec<String>,
) -> (Vec<LotDifference>, Option<LotRankTest>) {
    let ln_means = |lot: &LotTally| -> Vec<f64> {
        lot.wafers
            .iter()
            .filter_map(|w| w.tally.density.mean())
            .map(f64::ln)
            .collect()
    };
    let eligible: Vec<&LotTally> = lots.iter().filter(|l| l.wafers.len() >= 2).collect();
    let single: Vec<&str> = lots
        .iter()
        .filter(|l| l.wafers.len() < 2)
        .map(|l| l.id.as_str())
        .collect();
    if lots.len() >= 2 && !single.is_empty() {
        notes.push(format!(
            "lot(s) {} have one wafer and are left out of the lot-to-lot tests (wafers are the \
             units; sites of one wafer are not independent samples of the lot)",
            single.join(", ")
        ));
    }
    let mut differences = Vec::new();
    let references = if eligible.len() > ALL_PAIRS_LOT_LIMIT {
        notes.push(format!(
            "{} lots: each is compared with the first, {}, rather than every pair",
            eligible.len(),
            eligible[0].id
        ));
        1
    } else {
        eligible.len()
    };
    for (i, a) in eligible.iter().enumerate().take(references) {
        for b in &eligible[i + 1..] {
            if a.relation.conductivity_type() != b.relation.conductivity_type() {
                continue;
            }
            let Ok(test) = welch_t_test(&ln_means(a), &ln_means(b)) else {
                notes.push(format!(
                    "lots {} and {}: no wafer-to-wafer spread, so no t-test",
                    a.id, b.id
                ));
                continue;
            };
            let ratio = test.difference.exp();
            differences.push(LotDifference {
                lot_a: a.id.clone(),
                lot_b: b.id.clone(),
                wafers_a: a.wafers.len(),
                wafers_b: b.wafers.len(),
                density_ratio: ratio,
                percent: 100.0 * (ratio - 1.0),
                percent_ci95: [
                    100.0 * (test.ci95_low.exp() - 1.0),
                    100.0 * (test.ci95_high.exp() - 1.0),
                ],
                p_adjusted: test.p_value,
                significant: false,
                test,
            });
        }
    }
    let raw: Vec<f64> = differences.iter().map(|d| d.test.p_value).collect();
    for (d, adjusted) in differences.iter_mut().zip(holm_adjusted(&raw)) {
        d.p_adjusted = adjusted;
        d.significant = adjusted < SIGNIFICANCE_LEVEL;
    }
    let types: Vec<ConductivityType> = eligible
        .iter()
        .map(|l| l.relation.conductivity_type())
        .collect();
    let mixed = types.windows(2).any(|w| w[0] != w[1]);
    if mixed && eligible.len() >= 2 {
        notes.push(
            "lots of different conductivity types are not compared with each other".to_owned(),
        );
    }
    let rank_test = if eligible.len() >= 3 && !mixed {
        let values: Vec<Vec<f64>> = eligible.iter().map(|l| ln_means(l)).collect();
        let groups: Vec<&[f64]> = values.iter().map(Vec::as_slice).collect();
        kruskal_wallis(&groups).ok().map(|test| LotRankTest {
            lots: eligible.iter().map(|l| l.id.clone()).collect(),
            significant: test.p_value < SIGNIFICANCE_LEVEL,
            test,
        })
    } else {
        None
    };
    (differences, rank_test)
}
