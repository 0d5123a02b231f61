//! Computing a record's results: each view's own functions, laid out as the report's tables
//! (values as shown and exact, the models used, the notes).

use bandgauge_core::compare::ConversionModel;
use bandgauge_core::empirical::{self, EmpiricalInput, EmpiricalRelation};
use bandgauge_core::materials::DopantKind;
use bandgauge_core::units::QuantityKind;

use super::{
    LotInputs, ModelLine, RecordInputs, RecordResults, RecordedView, ResultCell, ResultRow,
    ResultSection,
};
use crate::carriers;
use crate::entry;
use crate::format;
use crate::hall_view;
use crate::lots_view::{self, LotsWork};
use crate::resistivity;
use crate::state::{Given, Workbench};
use crate::sweep;

/// The results of `view` for `inputs`, or the first input's message.
pub fn compute(view: RecordedView, inputs: &RecordInputs) -> Result<RecordResults, String> {
    let w = &inputs.workbench;
    match view {
        RecordedView::PointCalculation => point_calculation(w),
        RecordedView::TemperatureSweep => temperature_sweep(w),
        RecordedView::Conversion => conversion(w),
        RecordedView::HallAnalysis => hall_analysis(w),
        RecordedView::LotComparison => lot_comparison(
            inputs
                .lots
                .as_ref()
                .ok_or("a lot comparison needs its lot files")?,
        ),
    }
}

/// The full value of a number: the shortest decimal that reads back as the same f64.
pub fn exact(value: f64) -> String {
    if value.is_finite() {
        format!("{value:e}")
    } else {
        value.to_string()
    }
}

fn number(shown: String, value: f64, unit: &str) -> ResultCell {
    ResultCell {
        shown,
        exact: exact(value),
        unit: unit.into(),
    }
}

fn optional(value: Option<f64>, show: impl Fn(f64) -> String) -> ResultCell {
    match value {
        Some(v) => number(show(v), v, ""),
        None => words(""),
    }
}

fn words(text: impl Into<String>) -> ResultCell {
    let text = text.into();
    ResultCell {
        shown: text.clone(),
        exact: text,
        unit: String::new(),
    }
}

fn row(label: impl Into<String>, cells: Vec<ResultCell>) -> ResultRow {
    ResultRow {
        label: label.into(),
        cells,
    }
}

fn section(title: &str, columns: &[&str], rows: Vec<ResultRow>) -> ResultSection {
    ResultSection {
        title: title.into(),
        columns: columns.iter().map(|c| (*c).to_owned()).collect(),
        rows,
    }
}

fn model_lines(list: Vec<(String, String, String)>) -> Vec<ModelLine> {
    list.into_iter()
        .map(|(quantity, model, source)| ModelLine {
            quantity,
            model,
            source,
        })
        .collect()
}

/// The number behind a result line of the carriers view, by its test id.
fn line_value(id: &str, o: &carriers::Outcome) -> Option<f64> {
    let eq = &o.equilibrium;
    let t = o.transport.as_ref().ok();
    match id {
        "eg" => Some(eq.band_gap_ev),
        "nc" => Some(eq.nc_cm3),
        "nv" => Some(eq.nv_cm3),
        "ni" => Some(eq.intrinsic_cm3),
        "n" => Some(eq.electrons_cm3),
        "p" => Some(eq.holes_cm3),
        "ef-ev" => Some(eq.fermi_minus_valence_ev),
        "ef-ec" => Some(eq.fermi_minus_conduction_ev),
        "ef-mid" => Some(eq.fermi_minus_midgap_ev),
        "mu-n" => t.map(|t| t.electron_mobility_cm2_per_v_s),
        "mu-p" => t.map(|t| t.hole_mobility_cm2_per_v_s),
        "resistivity" => t.map(|t| t.resistivity_ohm_cm),
        "sheet-resistance" => o.sheet_ohm_sq.as_ref().ok().copied(),
        _ => None,
    }
}

fn lines_section(title: &str, lines: &[carriers::Line], o: &carriers::Outcome) -> ResultSection {
    let rows = lines
        .iter()
        .map(|&(id, term, unit, show)| {
            let shown = show(o);
            let cell = match line_value(id, o) {
                Some(v) => number(shown, v, unit),
                None => ResultCell {
                    unit: unit.into(),
                    ..words(shown)
                },
            };
            row(term, vec![cell])
        })
        .collect();
    section(title, &["Quantity", "Value"], rows)
}

fn point_calculation(w: &Workbench) -> Result<RecordResults, String> {
    let request = carriers::request_from_inputs(&w.carriers)?;
    let o = carriers::evaluate(&request)?;
    let species = o
        .equilibrium
        .species
        .iter()
        .map(|s| {
            let level_ev = s.level_from_band_edge_ev;
            let level = match s.kind {
                DopantKind::Donor => format!("Ec − {:.0} meV", 1e3 * level_ev),
                DopantKind::Acceptor => format!("Ev + {:.0} meV", 1e3 * level_ev),
            };
            row(
                format!("{} ({})", s.symbol, s.kind),
                vec![
                    number(level, level_ev, ""),
                    words(s.level_model.id()),
                    number(format::sci(s.density_cm3), s.density_cm3, ""),
                    number(format::sci(s.ionized_cm3), s.ionized_cm3, ""),
                    number(
                        format::percent(s.ionized_fraction, 2),
                        s.ionized_fraction,
                        "",
                    ),
                ],
            )
        })
        .collect();
    let mut notes = Vec::new();
    if let Err(e) = &o.transport {
        notes.push(format!("transport: {e}"));
    }
    Ok(RecordResults {
        sections: vec![
            lines_section("Bands and carriers", &carriers::BAND_LINES, &o),
            lines_section("Transport", &carriers::TRANSPORT_LINES, &o),
            section(
                "Ionization by species",
                &[
                    "Species",
                    "Level (eV from its band edge)",
                    "Level model",
                    "Density (cm⁻³)",
                    "Ionized (cm⁻³)",
                    "Ionized fraction",
                ],
                species,
            ),
        ],
        models: model_lines(carriers::models_used(&o)),
        notes,
    })
}

fn temperature_sweep(w: &Workbench) -> Result<RecordResults, String> {
    let (material, doping, options) = carriers::problem_from_inputs(&w.carriers)?;
    let from_k = entry::temperature_k("from", &w.sweep.from)?;
    let to_k = entry::temperature_k("to", &w.sweep.to)?;
    let count = entry::count("points", &w.sweep.points, 2, sweep::MAX_POINTS)?;
    let s = sweep::evaluate(&material, &doping, &options, from_k, to_k, count)?;
    let species: Vec<String> = s
        .points
        .first()
        .map(|e| {
            e.species
                .iter()
                .map(|sp| format!("{} ionized fraction", sp.symbol))
                .collect()
        })
        .unwrap_or_default();
    let mut columns = vec![
        "T (K)",
        "n (cm⁻³)",
        "p (cm⁻³)",
        "ni (cm⁻³)",
        "EF − Ev (eV)",
        "Regime",
    ];
    columns.extend(species.iter().map(String::as_str));
    let rows = s
        .points
        .iter()
        .map(|e| {
            let mut cells = vec![
                number(format::sci(e.electrons_cm3), e.electrons_cm3, ""),
                number(format::sci(e.holes_cm3), e.holes_cm3, ""),
                number(format::sci(e.intrinsic_cm3), e.intrinsic_cm3, ""),
                number(
                    format::fixed(e.fermi_minus_valence_ev, 4),
                    e.fermi_minus_valence_ev,
                    "",
                ),
                words(e.regime.to_string()),
            ];
            cells.extend(e.species.iter().map(|sp| {
                number(
                    format::fixed(sp.ionized_fraction, 4),
                    sp.ionized_fraction,
                    "",
                )
            }));
            ResultRow {
                label: format::linear_tick(e.temperature_k),
                cells,
            }
        })
        .collect();
    let models = s
        .points
        .first()
        .map(|e| {
            e.models
                .iter()
                .map(|m| ModelLine {
                    quantity: m.quantity.to_string(),
                    model: m.model.to_string(),
                    source: m.source.to_string(),
                })
                .collect()
        })
        .unwrap_or_default();
    let notes = s
        .failures
        .iter()
        .map(|(n, why)| {
            format!(
                "{n} of {} temperatures could not be solved and are left out: {why}",
                s.temperatures_k.len()
            )
        })
        .collect();
    Ok(RecordResults {
        sections: vec![section(
            "Carriers and Fermi level by temperature",
            &columns,
            rows,
        )],
        models,
        notes,
    })
}

fn hall_analysis(w: &Workbench) -> Result<RecordResults, String> {
    let o = hall_view::evaluate(&w.hall)?;
    let s = &o.vdp.solution;
    let h = &o.hall;
    let rho = o.vdp.resistivity_ohm_cm.unwrap_or(f64::NAN);
    let n = h.volume_density_cm3.unwrap_or(f64::NAN);
    let sheet_rows = vec![
        row(
            "Sheet resistance Rs",
            vec![number(
                format::auto(s.sheet_resistance_ohm_sq),
                s.sheet_resistance_ohm_sq,
                "Ω/□",
            )],
        ),
        row(
            "Resistivity ρ",
            vec![number(format::auto(rho), rho, "Ω·cm")],
        ),
        row(
            "Symmetry R_A/R_B",
            vec![number(format::fixed(s.ratio, 4), s.ratio, "")],
        ),
        row(
            "Correction factor f",
            vec![number(
                format::fixed(s.correction_factor, 5),
                s.correction_factor,
                "",
            )],
        ),
    ];
    let hall_rows = vec![
        row(
            "Carrier type",
            vec![words(hall_view::type_words(h.conductivity_type))],
        ),
        row(
            "Sheet density n_s",
            vec![number(
                format::sci(h.sheet_density_cm2),
                h.sheet_density_cm2,
                "cm⁻²",
            )],
        ),
        row("Carrier density n", vec![number(format::sci(n), n, "cm⁻³")]),
        row(
            "Hall mobility μ_H",
            vec![number(
                format::auto(h.hall_mobility_cm2_per_v_s),
                h.hall_mobility_cm2_per_v_s,
                "cm²/V·s",
            )],
        ),
        row(
            "Drift mobility μ = μ_H/r_H",
            vec![number(
                format::auto(h.drift_mobility_cm2_per_v_s),
                h.drift_mobility_cm2_per_v_s,
                "cm²/V·s",
            )],
        ),
    ];
    let cell = |v: Option<f64>, show: fn(f64) -> String, unit: &str| match v {
        Some(v) => number(show(v), v, unit),
        None => words("—"),
    };
    let percent = |v: Option<f64>| match v {
        Some(v) => number(hall_view::percent(Some(v)), v, "%"),
        None => words("—"),
    };
    let check_rows = o
        .check
        .rows
        .iter()
        .map(|r| {
            row(
                r.model.id(),
                vec![
                    cell(r.dopant_density_cm3, format::sci, "cm⁻³"),
                    cell(r.carriers_cm3, format::sci, "cm⁻³"),
                    percent(r.carriers_difference_percent),
                    cell(r.mobility_cm2_per_v_s, format::auto, "cm²/V·s"),
                    percent(r.mobility_difference_percent),
                    words(r.error.clone().unwrap_or_default()),
                ],
            )
        })
        .collect();
    Ok(RecordResults {
        sections: vec![
            section("Sheet resistance", &["Quantity", "Value"], sheet_rows),
            section(
                "Carriers from the Hall voltage",
                &["Quantity", "Value"],
                hall_rows,
            ),
            section(
                "What each conversion model predicts for this layer",
                &[
                    "Model",
                    "Dopant density",
                    "Free carriers",
                    "Hall vs model",
                    "Mobility",
                    "Hall vs model",
                    "Remark",
                ],
                check_rows,
            ),
        ],
        models: model_lines(hall_view::models_used(Some(&o))),
        notes: Vec::new(),
    })
}

fn conversion(w: &Workbench) -> Result<RecordResults, String> {
    let c = &w.conversion;
    let value = match c.given {
        Given::Resistivity => {
            entry::positive("resistivity", &c.value, QuantityKind::Resistivity, "ohm-cm")?
        }
        Given::Density => entry::positive("density", &c.value, QuantityKind::Density, "cm^-3")?,
    };
    if !EmpiricalRelation::applicable("si", &c.dopant) {
        return Err(format!(
            "species: '{}' has no resistivity relation; choose B, P, As or Sb",
            c.dopant
        ));
    }
    let comparison = resistivity::compare_at_23c(c.given, value, &c.dopant)?;
    let reference = comparison
        .answers
        .iter()
        .find(|a| a.model == ConversionModel::Empirical)
        .and_then(|a| resistivity::answer_value(a, c.given));
    let mut rows: Vec<ResultRow> = comparison
        .answers
        .iter()
        .map(|a| {
            let value = resistivity::answer_value(a, c.given);
            let deviation = match (value, reference) {
                (Some(v), Some(r)) if a.model != ConversionModel::Empirical => {
                    let d = 100.0 * (v / r - 1.0);
                    number(format!("{d:+.1} %"), d, "")
                }
                _ => words(""),
            };
            let (remark, bound) = resistivity::model_remark(a);
            row(
                a.model_name.clone(),
                vec![
                    value.map_or_else(|| words("—"), |v| number(format::auto(v), v, "")),
                    if bound { words("") } else { deviation },
                    words(remark),
                ],
            )
        })
        .collect();
    rows.push(row(
        "Spread: largest / smallest",
        vec![
            comparison.spread.as_ref().map_or_else(
                || words("—"),
                |s| {
                    number(
                        format!("{} ({} models)", format::fixed(s.ratio, 3), s.models),
                        s.ratio,
                        "",
                    )
                },
            ),
            words(""),
            words("How far the published models disagree for this sample."),
        ],
    ));
    let answer_column = match c.given {
        Given::Density => "Resistivity (Ω·cm)",
        Given::Resistivity => "Dopant density (cm⁻³)",
    };

    let probe_inputs = resistivity::read_probe(c);
    let probe = match resistivity::evaluate_probe(&probe_inputs, &c.dopant) {
        Some(r) => r?,
        None => return Err(first_probe_problem(&probe_inputs)),
    };
    let density = probe
        .resistivity_ohm_cm
        .map(|rho| empirical::convert("si", &c.dopant, EmpiricalInput::ResistivityOhmCm(rho)));
    let probe_rows = vec![
        row(
            "Sheet resistance Rs",
            vec![match probe.sheet_resistance_ohm_sq {
                Some(v) => number(format::auto(v), v, "Ω/□"),
                None => words("— (bulk, no thickness)"),
            }],
        ),
        row(
            "Resistivity ρ (23 C)",
            vec![match probe.resistivity_ohm_cm {
                Some(v) => number(format::auto(v), v, "Ω·cm"),
                None => words("— (thin layer: give its thickness)"),
            }],
        ),
        row(
            "Geometry",
            vec![words(format!(
                "{}: {}",
                resistivity::geometry_words(probe.geometry),
                probe.geometry.describe()
            ))],
        ),
        row(
            "Dopant density (empirical)",
            vec![match &density {
                Some(Ok(d)) => number(format::sci(d.density_cm3), d.density_cm3, "cm⁻³"),
                Some(Err(_)) => words("out of range"),
                None => words("—"),
            }],
        ),
    ];
    let corrections = probe
        .corrections
        .iter()
        .map(|f| {
            row(
                f.name,
                vec![
                    number(format::fixed(f.value, 5), f.value, ""),
                    words(f.source.clone()),
                ],
            )
        })
        .collect();
    Ok(RecordResults {
        sections: vec![
            section(
                "Every model side by side (silicon, 23 C)",
                &["Model", answer_column, "vs empirical", "Source and remarks"],
                rows,
            ),
            section(
                "Four-point probe result",
                &["Quantity", "Value"],
                probe_rows,
            ),
            section(
                "Probe corrections applied",
                &["Correction", "Factor", "Basis"],
                corrections,
            ),
        ],
        models: model_lines(resistivity::models_used(Some(&probe))),
        notes: Vec::new(),
    })
}

fn first_probe_problem(p: &resistivity::ProbeInputs) -> String {
    [
        p.amps.as_ref().err(),
        p.volts.as_ref().err(),
        p.spacing_cm.as_ref().err(),
        p.thickness_cm.as_ref().err(),
        p.diameter_cm.as_ref().err(),
        p.temperature_c.as_ref().err(),
    ]
    .into_iter()
    .flatten()
    .next()
    .cloned()
    .unwrap_or_else(|| "probe: an input is not valid".into())
}

fn lot_comparison(lots: &LotInputs) -> Result<RecordResults, String> {
    let dopant = (!lots.default_dopant.is_empty()).then(|| lots.default_dopant.clone());
    let mut work = LotsWork::new(dopant);
    for f in &lots.files {
        work.read_text(&f.name, &f.text);
    }
    let spec = lots_view::spec_from_inputs(&lots.spec_quantity, &lots.spec_min, &lots.spec_max)
        .map_err(|e| format!("spec window: {e}"))?;
    let report = work.report(spec.as_ref());
    let unit = match spec.as_ref().map(|s| s.quantity()) {
        Some(bandgauge_core::lots::SpecQuantity::Density) => "cm^-3",
        _ => "ohm cm",
    };
    let margin = format!("margin, {unit}");
    let count = |n: u64| number(n.to_string(), n as f64, "");

    let files = work
        .files
        .iter()
        .map(|f| {
            row(
                f.name.clone(),
                vec![
                    count(f.counts.read),
                    count(f.counts.converted),
                    count(f.counts.rejected),
                    words(work.file_problem(f).unwrap_or_default()),
                ],
            )
        })
        .collect();
    let window = row(
        "Spec window",
        vec![words(spec.as_ref().map_or_else(
            || "none (no verdicts)".to_owned(),
            ToString::to_string,
        ))],
    );
    let lot_rows = report
        .lots
        .iter()
        .map(|l| {
            let r = &l.resistivity_ohm_cm;
            row(
                l.lot.clone(),
                vec![
                    words(format!("{} ({})", l.dopant, l.conductivity_type.as_str())),
                    count(l.wafers as u64),
                    count(l.sites),
                    number(format::auto(r.mean), r.mean, ""),
                    number(format::auto(r.median), r.median, ""),
                    optional(r.std, format::auto),
                    optional(r.nonuniformity_percent, |p| format::fixed(p, 2)),
                    number(format::sci(l.density_cm3.mean), l.density_cm3.mean, ""),
                    words(l.verdict.map(|v| v.as_str()).unwrap_or("")),
                    optional(l.margin, format::auto),
                    words(l.worst_wafer.clone().unwrap_or_default()),
                    optional(l.cpk, |c| format::fixed(c, 2)),
                ],
            )
        })
        .collect();
    let wafer_rows = report
        .lots
        .iter()
        .flat_map(|l| {
            l.wafer_results.iter().map(move |w| {
                let r = &w.resistivity_ohm_cm;
                row(
                    format!("{} / {}", l.lot, w.wafer),
                    vec![
                        count(w.sites),
                        number(format::auto(r.mean), r.mean, ""),
                        optional(r.nonuniformity_percent, |p| format::fixed(p, 2)),
                        number(format::sci(w.density_cm3.mean), w.density_cm3.mean, ""),
                        words(w.judgement.map(|j| j.verdict.as_str()).unwrap_or("")),
                        optional(w.judgement.map(|j| j.margin), format::auto),
                        w.sites_outside.map_or_else(|| words(""), &count),
                    ],
                )
            })
        })
        .collect();
    let differences = lots_view::difference_rows(&report, None)
        .into_iter()
        .map(|d| {
            row(
                d.lots.clone(),
                vec![
                    words(d.test),
                    optional(d.percent, |p| format!("{p:+.1} %")),
                    words(
                        d.percent_ci95
                            .map(|c| format!("{:+.1} to {:+.1} %", c[0], c[1]))
                            .unwrap_or_default(),
                    ),
                    number(format::auto(d.p_raw), d.p_raw, ""),
                    optional(d.p_adjusted, format::auto),
                    words(d.verdict()),
                ],
            )
        })
        .collect();
    let rejected = work
        .rejected
        .iter()
        .map(|r| {
            let reason = if r.column.is_empty() {
                r.reason.clone()
            } else {
                format!("{}: {}", r.column, r.reason)
            };
            row(format!("{}, line {}", r.file, r.line), vec![words(reason)])
        })
        .collect();
    let mut notes: Vec<String> = work
        .files
        .iter()
        .flat_map(|f| f.notes.iter().map(move |n| format!("{}: {n}", f.name)))
        .collect();
    notes.extend(report.notes.iter().cloned());
    let d = report.definitions;
    notes.extend(
        [
            d.nonuniformity,
            d.std,
            d.median,
            d.wafer_verdict,
            d.lot_verdict,
            d.uncertainty,
            d.cpk,
            d.lot_difference,
        ]
        .map(str::to_owned),
    );
    let total = work.counts();
    let mut file_rows: Vec<ResultRow> = files;
    file_rows.push(row(
        "all files",
        vec![
            count(total.read),
            count(total.converted),
            count(total.rejected),
            words(""),
        ],
    ));
    Ok(RecordResults {
        sections: vec![
            section(
                "Files read",
                &[
                    "File",
                    "Rows read",
                    "Converted",
                    "Rejected",
                    "Could not be read",
                ],
                file_rows,
            ),
            section("Spec window", &["", "As read"], vec![window]),
            section(
                "Lots",
                &[
                    "Lot",
                    "Dopant",
                    "Wafers",
                    "Sites",
                    "Mean, ohm cm",
                    "Median, ohm cm",
                    "Std, ohm cm",
                    "Std/mean, %",
                    "Mean, cm^-3",
                    "Verdict",
                    &margin,
                    "Worst wafer",
                    "Cpk",
                ],
                lot_rows,
            ),
            section(
                "Wafers",
                &[
                    "Lot / wafer",
                    "Sites",
                    "Mean, ohm cm",
                    "Std/mean, %",
                    "Mean, cm^-3",
                    "Verdict",
                    &margin,
                    "Sites outside",
                ],
                wafer_rows,
            ),
            section(
                "Do the lots differ?",
                &[
                    "Lots",
                    "Test",
                    "Density difference",
                    "95 % CI",
                    "p (raw)",
                    "p (Holm-adjusted)",
                    "Result",
                ],
                differences,
            ),
            section("Rejected rows", &["File and line", "Reason"], rejected),
        ],
        models: model_lines(lots_view::models_used(&report)),
        notes,
    })
}
