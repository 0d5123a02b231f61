//! The "Resistivity & probe" view: resistivity <-> dopant density for silicon with every
//! model side by side and their spread, the resistivity-versus-density curves of n- and
//! p-type silicon with the sample marked, and the four-point-probe calculator.

use crate::Bench;
use crate::chart::{Axis, ChartSpec, Color, Corner, Mark, Series, palette};
use crate::entry;
use crate::format;
use crate::state::Given;
use crate::widgets::{Caution, ChartPanel, Choice, NumberField, ResultLine, SelectField};
use bandgauge_core::compare::{self, Comparison, ConversionInput, ConversionModel, ModelAnswer};
use bandgauge_core::empirical::{
    self, EMPIRICAL_REFERENCE, EMPIRICAL_TEMPERATURE_K, EmpiricalInput, EmpiricalRelation,
};
use bandgauge_core::materials;
use bandgauge_core::mobility::MobilityModel;
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::probe::{self, ProbeGeometry, ProbeReading, ProbeResult, ReadingTemperature};
use bandgauge_core::resistivity::{self, PhysicsOptions};
use bandgauge_core::units::QuantityKind;
use leptos::prelude::*;

/// The given quantity as the core's conversion input.
pub fn conversion_input(given: Given, value: f64) -> ConversionInput {
    match given {
        Given::Resistivity => ConversionInput::ResistivityOhmCm(value),
        Given::Density => ConversionInput::DensityCm3(value),
    }
}

/// The computed (not the given) quantity of one answer.
pub fn answer_value(answer: &ModelAnswer, given: Given) -> Option<f64> {
    match given {
        Given::Resistivity => answer.density_cm3,
        Given::Density => answer.resistivity_ohm_cm,
    }
}

/// Every applicable model's answer for a silicon sample at 23 C, the temperature of the
/// empirical relation, so that all models are compared on equal terms.
pub fn compare_at_23c(given: Given, value: f64, dopant: &str) -> Result<Comparison, String> {
    compare::compare(
        &materials::silicon(),
        dopant,
        conversion_input(given, value),
        EMPIRICAL_TEMPERATURE_K,
        &SolveOptions::default(),
    )
    .map_err(|e| e.to_string())
}

/// Points per curve of the resistivity chart: smooth at any chart width.
const CURVE_POINTS: usize = 61;

/// `points` densities evenly spaced in log between `lo` and `hi`, cm^-3.
fn log_grid(lo: f64, hi: f64, points: usize) -> Vec<f64> {
    let (a, b) = (lo.log10(), hi.log10());
    (0..points)
        .map(|i| 10f64.powf(a + (b - a) * i as f64 / (points - 1) as f64))
        .collect()
}

/// The resistivity-versus-density curves of P- and B-doped silicon at 23 C: the empirical
/// relation over its stated range, and the physics model with Masetti mobility.
pub fn curves() -> Vec<Series> {
    let silicon = materials::silicon();
    let mut series = Vec::new();
    for (relation, dopant, color, label) in [
        (
            EmpiricalRelation::Phosphorus,
            "P",
            palette::ELECTRONS,
            "n-type (P)",
        ),
        (EmpiricalRelation::Boron, "B", palette::HOLES, "p-type (B)"),
    ] {
        let range = relation.valid_range();
        let empirical: Vec<(f64, f64)> =
            log_grid(range.density_min_cm3, range.density_max_cm3, CURVE_POINTS)
                .into_iter()
                .filter_map(|n| {
                    empirical::resistivity_from_density_ohm_cm(relation, n)
                        .ok()
                        .map(|rho| (n, rho))
                })
                .collect();
        series.push(Series::line(
            &format!("{label}, empirical"),
            empirical,
            color,
        ));
        let options = PhysicsOptions::with_mobility(MobilityModel::Masetti);
        let physics: Vec<(f64, f64)> =
            log_grid(range.density_min_cm3, range.density_max_cm3, CURVE_POINTS)
                .into_iter()
                .filter_map(|n| {
                    resistivity::resistivity_from_density(
                        &silicon,
                        dopant,
                        n,
                        EMPIRICAL_TEMPERATURE_K,
                        &options,
                    )
                    .ok()
                    .map(|p| (n, p.resistivity_ohm_cm))
                })
                .collect();
        series
            .push(Series::line(&format!("{label}, neutrality + Masetti"), physics, color).dashed());
    }
    series
}

/// The chart with the sample marked at its empirical (or first available) answer.
pub fn chart(curves: &[Series], sample: Option<(f64, f64, Color)>) -> ChartSpec {
    ChartSpec {
        title: "Resistivity versus dopant density, silicon at 23 C".into(),
        file_stem: "bandgauge-resistivity-vs-density".into(),
        x: Axis::log("Dopant density (cm⁻³)"),
        y: Axis::log("Resistivity (Ω·cm)"),
        series: curves.to_vec(),
        marks: sample
            .map(|(n, rho, color)| Mark::Point {
                x: n,
                y: rho,
                label: format!(
                    "sample: {} Ω·cm, {} cm⁻³",
                    format::auto(rho),
                    format::sci(n)
                ),
                color,
            })
            .into_iter()
            .collect(),
        legend: Corner::TopRight,
    }
}

/// A field that may be left empty (no correction); otherwise a positive quantity.
fn optional_positive(
    field: &str,
    text: &str,
    kind: QuantityKind,
    unit: &str,
) -> Result<Option<f64>, String> {
    if text.trim().is_empty() {
        Ok(None)
    } else {
        entry::positive(field, text, kind, unit).map(Some)
    }
}

/// The probe inputs, read.
#[derive(Clone, Debug, PartialEq)]
pub struct ProbeInputs {
    /// Current, A.
    pub amps: entry::Parsed,
    /// Voltage, V.
    pub volts: entry::Parsed,
    /// Spacing, cm.
    pub spacing_cm: entry::Parsed,
    /// The sample geometry.
    pub geometry: Result<ProbeGeometry, String>,
    /// Thickness, cm; `None` when not known (a thin layer then gives only its sheet
    /// resistance, a bulk sample is taken as semi-infinite).
    pub thickness_cm: Result<Option<f64>, String>,
    /// Wafer diameter, cm (thin layers); `None` for no edge correction.
    pub diameter_cm: Result<Option<f64>, String>,
    /// Temperature of the reading, C; `None` for 23 C.
    pub temperature_c: Result<Option<f64>, String>,
}

/// Reads the probe fields.
pub fn read_probe(c: &crate::state::ConversionInputs) -> ProbeInputs {
    let temperature_c = if c.probe_temperature.trim().is_empty() {
        Ok(None)
    } else {
        entry::temperature_k("temperature", &c.probe_temperature)
            .map(|k| Some(k - bandgauge_core::constants::ZERO_CELSIUS_K))
    };
    ProbeInputs {
        amps: entry::positive("current", &c.probe_current, QuantityKind::Current, "A"),
        volts: entry::positive("voltage", &c.probe_voltage, QuantityKind::Voltage, "V"),
        spacing_cm: entry::positive(
            "probe spacing",
            &c.probe_spacing,
            QuantityKind::Length,
            "cm",
        ),
        geometry: ProbeGeometry::from_id(&c.probe_geometry).ok_or_else(|| {
            format!(
                "sample geometry: '{}' is not known; choose thin layer or bulk",
                c.probe_geometry
            )
        }),
        thickness_cm: optional_positive(
            "thickness",
            &c.sample_thickness,
            QuantityKind::Length,
            "cm",
        ),
        diameter_cm: optional_positive(
            "wafer diameter",
            &c.wafer_diameter,
            QuantityKind::Length,
            "cm",
        ),
        temperature_c,
    }
}

/// Evaluates a probe reading on silicon doped with `dopant`; the temperature correction (when
/// the reading is not at 23 C) uses the first impurity-aware mobility model that applies.
pub fn evaluate_probe(p: &ProbeInputs, dopant: &str) -> Option<Result<ProbeResult, String>> {
    let silicon = materials::silicon();
    let temperature = match p.temperature_c.clone().ok()? {
        Some(t) if (t - 23.0).abs() > 1e-9 => {
            // The first impurity-aware model with parameters for the dopant (Masetti, then Arora);
            // the core refuses a temperature outside its range with a message.
            let Some(mobility) = MobilityModel::ALL
                .into_iter()
                .find(|m| *m != MobilityModel::Lattice && m.applicable(&silicon.id, dopant))
            else {
                return Some(Err(format!(
                    "temperature correction: no mobility model for silicon with {dopant}"
                )));
            };
            Some(ReadingTemperature {
                temperature_c: t,
                material: silicon,
                dopant: dopant.into(),
                mobility,
            })
        }
        _ => None,
    };
    let reading = ProbeReading {
        volts: p.volts.clone().ok()?,
        amps: p.amps.clone().ok()?,
        spacing_cm: p.spacing_cm.clone().ok()?,
        geometry: p.geometry.clone().ok()?,
        thickness_cm: p.thickness_cm.clone().ok()?,
        diameter_cm: p.diameter_cm.clone().ok()?,
        temperature,
    };
    Some(probe::evaluate(&reading).map_err(|e| e.to_string()))
}

/// `(quantity, model, source)` of the conversion and of the probe corrections applied, with
/// the probe's notes: what the caution lists and the sign-off report prints.
pub fn models_used(probe: Option<&ProbeResult>) -> Vec<(String, String, String)> {
    let mut list = vec![(
        "conversion".to_string(),
        "empirical relation and charge neutrality with each mobility model, silicon at 23 C"
            .to_string(),
        EMPIRICAL_REFERENCE.to_string(),
    )];
    if let Some(r) = probe {
        list.push((
            "probe geometry".to_string(),
            r.geometry.id().to_string(),
            r.geometry.describe().to_string(),
        ));
        list.extend(r.corrections.iter().map(|c| {
            (
                format!("probe {} correction", c.name),
                format::fixed(c.value, 5),
                c.source.clone(),
            )
        }));
        list.extend(
            r.notes
                .iter()
                .map(|n| ("probe note".to_string(), n.clone(), String::new())),
        );
    }
    list
}

/// The sample geometries of the probe, as select choices.
fn geometry_choices() -> Vec<Choice> {
    ProbeGeometry::ALL
        .into_iter()
        .map(|g| {
            let text = match g {
                ProbeGeometry::ThinLayer => "Thin layer or wafer (sheet resistance)",
                ProbeGeometry::Bulk => "Bulk sample, semi-infinite (resistivity)",
            };
            (g.id().to_string(), text.to_string())
        })
        .collect()
}

/// What the chosen geometry computes, one line under the choice.
fn geometry_hint(geometry: Result<ProbeGeometry, String>) -> String {
    match geometry {
        Ok(ProbeGeometry::ThinLayer) => "Rs = (π/ln 2)·V/I × corrections; ρ = Rs·t only with a \
                                         thickness; the diameter corrects Rs (Smits)"
            .to_string(),
        Ok(ProbeGeometry::Bulk) => "ρ = 2π·s·V/I (ingot, thick piece); a thickness adds the \
                                    finite-thickness factor; no diameter correction"
            .to_string(),
        Err(_) => String::new(),
    }
}

/// The dopant species the conversion covers: silicon species with an empirical relation.
fn dopant_choices() -> Vec<Choice> {
    materials::silicon()
        .dopants
        .iter()
        .filter(|d| EmpiricalRelation::applicable("si", &d.symbol))
        .map(|d| {
            (
                d.symbol.to_string(),
                format!(
                    "{} ({}, {}-type)",
                    d.symbol,
                    d.kind,
                    if d.kind == materials::DopantKind::Donor {
                        "n"
                    } else {
                        "p"
                    }
                ),
            )
        })
        .collect()
}

/// The view.
#[component]
pub fn ResistivityView(
    /// The shared inputs and layout handles.
    bench: Bench,
) -> impl IntoView {
    let inputs = bench.inputs;
    let given = Memo::new(move |_| inputs.with(|w| w.conversion.given));
    let (value, set_value) = bench.text(|w| &w.conversion.value, |w| &mut w.conversion.value);
    let (dopant, set_dopant) = bench.text(|w| &w.conversion.dopant, |w| &mut w.conversion.dopant);
    let dopant_error = Signal::derive(move || {
        let d = dopant.get();
        (!EmpiricalRelation::applicable("si", &d))
            .then(|| format!("species: '{d}' has no resistivity relation; choose B, P, As or Sb"))
    });
    let parsed = Memo::new(move |_| {
        let text = value.get();
        match given.get() {
            Given::Resistivity => {
                entry::positive("resistivity", &text, QuantityKind::Resistivity, "ohm-cm")
            }
            Given::Density => entry::positive("density", &text, QuantityKind::Density, "cm^-3"),
        }
    });
    let comparison = Memo::new(move |_| {
        let v = parsed.get().ok()?;
        dopant_error
            .get()
            .is_none()
            .then(|| compare_at_23c(given.get(), v, &dopant.get()))
    });
    let shown =
        Memo::new(
            move |previous: Option<&Option<(Given, Comparison)>>| match comparison.get() {
                Some(Ok(c)) => Some((given.get(), c)),
                _ => previous.cloned().flatten(),
            },
        );
    // Computed once: the curves do not depend on the inputs.
    let curves = StoredValue::new(curves());
    let sample = Memo::new(move |_| {
        let (_, comparison) = shown.get()?;
        let a = comparison
            .answers
            .iter()
            .find(|a| a.density_cm3.is_some() && a.resistivity_ohm_cm.is_some())?;
        let color = if EmpiricalRelation::for_dopant("si", &dopant.get()).map(|r| r.0)
            == Ok(EmpiricalRelation::Boron)
        {
            palette::HOLES
        } else {
            palette::ELECTRONS
        };
        Some((a.density_cm3?, a.resistivity_ohm_cm?, color))
    });
    let chart_spec = Signal::derive(move || Some(curves.with_value(|c| chart(c, sample.get()))));

    let (probe_current, set_probe_current) = bench.text(
        |w| &w.conversion.probe_current,
        |w| &mut w.conversion.probe_current,
    );
    let (probe_voltage, set_probe_voltage) = bench.text(
        |w| &w.conversion.probe_voltage,
        |w| &mut w.conversion.probe_voltage,
    );
    let (probe_spacing, set_probe_spacing) = bench.text(
        |w| &w.conversion.probe_spacing,
        |w| &mut w.conversion.probe_spacing,
    );
    let (probe_geometry, set_probe_geometry) = bench.text(
        |w| &w.conversion.probe_geometry,
        |w| &mut w.conversion.probe_geometry,
    );
    let (thickness, set_thickness) = bench.text(
        |w| &w.conversion.sample_thickness,
        |w| &mut w.conversion.sample_thickness,
    );
    let (diameter, set_diameter) = bench.text(
        |w| &w.conversion.wafer_diameter,
        |w| &mut w.conversion.wafer_diameter,
    );
    let (probe_temperature, set_probe_temperature) = bench.text(
        |w| &w.conversion.probe_temperature,
        |w| &mut w.conversion.probe_temperature,
    );
    let probe_inputs = Memo::new(move |_| inputs.with(|w| read_probe(&w.conversion)));
    let probe_outcome = Memo::new(move |_| evaluate_probe(&probe_inputs.get(), &dopant.get()));
    let probe_shown = Memo::new(
        move |previous: Option<&Option<ProbeResult>>| match probe_outcome.get() {
            Some(Ok(r)) => Some(r),
            _ => previous.cloned().flatten(),
        },
    );
    let probe_density = Memo::new(move |_| {
        let rho = probe_shown.get()?.resistivity_ohm_cm?;
        Some(
            empirical::convert("si", &dopant.get(), EmpiricalInput::ResistivityOhmCm(rho))
                .map_err(|e| e.to_string()),
        )
    });
    let probe_status = Memo::new(move |_| match probe_outcome.get() {
        None => Some(
            "Showing the last valid probe result: correct the marked field to update.".to_string(),
        ),
        Some(Err(e)) => Some(format!(
            "Cannot compute: {e}. Showing the last valid probe result."
        )),
        Some(Ok(_)) => None,
    });
    let status = Memo::new(move |_| match comparison.get() {
        Some(Ok(_)) => None,
        Some(Err(e)) => Some(format!(
            "Cannot compare: {e}. Showing the last valid comparison."
        )),
        None => Some(
            "Showing the last valid comparison: correct the marked field to update.".to_string(),
        ),
    });

    let field_error =
        move |f: fn(&ProbeInputs) -> Option<String>| Signal::derive(move || probe_inputs.with(f));
    let set_given = move |g: Given| {
        bench.edit(|w| {
            if w.conversion.given != g {
                w.conversion.given = g;
                // Offer the last answer as the new given value, so the direction flips in place.
                if let Some(v) = shown
                    .get_untracked()
                    .and_then(|(old, c)| c.answers.first().and_then(|a| answer_value(a, old)))
                {
                    w.conversion.value = match g {
                        Given::Resistivity => format!("{} ohm-cm", format::sci(v)),
                        Given::Density => format!("{} cm^-3", format::sci(v)),
                    };
                }
            }
        })
    };
    let value_label = move || match given.get() {
        Given::Resistivity => "Resistivity",
        Given::Density => "Dopant density",
    };
    let probe_value = move |f: fn(&ProbeResult) -> String| {
        Signal::derive(move || {
            probe_shown.with(|r| r.as_ref().map(f).unwrap_or_else(|| "—".into()))
        })
    };
    let models = Signal::derive(move || probe_shown.with(|r| models_used(r.as_ref())));

    view! {
        <div class="workspace">
            <section class="inputs" aria-label="Sample and probe reading">
                <h2>"Conversion (silicon, 23 C)"</h2>
                <div class="radio-group" role="radiogroup" aria-label="Given quantity">
                    <label>
                        <input type="radio" name="given" data-testid="given-resistivity"
                            prop:checked=move || given.get() == Given::Resistivity
                            on:change=move |_| set_given(Given::Resistivity) />
                        "Resistivity given"
                    </label>
                    <label>
                        <input type="radio" name="given" data-testid="given-density"
                            prop:checked=move || given.get() == Given::Density
                            on:change=move |_| set_given(Given::Density) />
                        "Density given"
                    </label>
                </div>
                <ValueField value=value set_value=set_value label=value_label given=given
                    error=Signal::derive(move || parsed.get().err()) />
                <SelectField id="convert-dopant" label="Dopant" choices=Signal::derive(dopant_choices)
                    value=dopant on_change=set_dopant error=dopant_error />
                <h2>"Four-point probe"</h2>
                <NumberField id="probe-current" label="Current" hint="A, mA, uA" value=probe_current on_input=set_probe_current
                    error=field_error(|p| p.amps.clone().err()) />
                <NumberField id="probe-voltage" label="Voltage" hint="V, mV, uV" value=probe_voltage on_input=set_probe_voltage
                    error=field_error(|p| p.volts.clone().err()) />
                <NumberField id="probe-spacing" label="Probe spacing" hint="mm, um, cm" value=probe_spacing on_input=set_probe_spacing
                    error=field_error(|p| p.spacing_cm.clone().err()) />
                <SelectField id="probe-geometry-choice" label="Sample geometry" choices=Signal::derive(geometry_choices)
                    value=probe_geometry on_change=set_probe_geometry error=field_error(|p| p.geometry.clone().err()) />
                <p class="hint" data-testid="probe-geometry-hint">
                    {move || probe_inputs.with(|p| geometry_hint(p.geometry.clone()))}
                </p>
                <NumberField id="probe-thickness" label="Sample thickness" hint="um, mm, cm; empty: a thin layer gives Rs only, a bulk sample is semi-infinite" value=thickness
                    on_input=set_thickness error=field_error(|p| p.thickness_cm.clone().err()) />
                <NumberField id="probe-diameter" label="Wafer diameter" hint="thin layer only (Smits); empty for no edge correction" value=diameter
                    on_input=set_diameter error=field_error(|p| p.diameter_cm.clone().err()) />
                <NumberField id="probe-temperature" label="Temperature of the reading" hint="C or K; corrected to 23 C"
                    value=probe_temperature on_input=set_probe_temperature error=field_error(|p| p.temperature_c.clone().err()) />
            </section>
            <section class="outputs" aria-label="Results">
                <div class="status" role="status" data-testid="status">
                    {move || status.get().map(|p| view! { <p class="stale">{p}</p> })}
                </div>
                <ComparisonTable shown=shown />
                <ChartPanel id="chart-resistivity" spec=chart_spec layout=bench.layout input_at=bench.input_at />
                <div class="panel">
                    <h2>"Four-point probe result"</h2>
                    <div class="status" role="status" data-testid="probe-status">
                        {move || probe_status.get().map(|p| view! { <p class="stale">{p}</p> })}
                    </div>
                    <dl class="results big-results">
                        <ResultLine id="probe-sheet" term="Sheet resistance Rs" unit="Ω/□"
                            value=probe_value(|r| r.sheet_resistance_ohm_sq.map(format::auto).unwrap_or_else(|| "— (bulk, no thickness)".into())) />
                        <ResultLine id="probe-resistivity" term="Resistivity ρ (23 C)" unit="Ω·cm"
                            value=probe_value(|r| r.resistivity_ohm_cm.map(format::auto).unwrap_or_else(|| "— (thin layer: give its thickness)".into())) />
                        <ResultLine id="probe-geometry" term="Geometry" value=probe_value(|r| geometry_words(r.geometry).to_string()) />
                        <ResultLine id="probe-density" term="Dopant density (empirical)" unit="cm⁻³"
                            value=Signal::derive(move || match probe_density.get() {
                                Some(Ok(c)) => format::sci(c.density_cm3),
                                Some(Err(_)) => "out of range".into(),
                                None => "—".into(),
                            }) />
                    </dl>
                    <table class="models-table" data-testid="probe-corrections">
                        <caption>"Corrections applied"</caption>
                        <thead><tr><th scope="col">"Correction"</th><th scope="col">"Factor"</th><th scope="col" class="left">"Basis"</th></tr></thead>
                        <tbody>
                            {move || probe_shown.get().map(|r| r.corrections.into_iter().map(|c| view! {
                                <tr>
                                    <th scope="row">{c.name}</th>
                                    <td data-testid=format!("probe-factor-{}", c.name)>{format::fixed(c.value, 5)}</td>
                                    <td class="note">{c.source}</td>
                                </tr>
                            }).collect_view())}
                        </tbody>
                    </table>
                </div>
                <Caution models=models />
            </section>
        </div>
    }
}

/// The given value's field, whose label and units follow the given quantity.
#[component]
fn ValueField(
    value: Memo<String>,
    set_value: Callback<String>,
    label: impl Fn() -> &'static str + Send + Sync + Copy + 'static,
    given: Memo<Given>,
    error: Signal<Option<String>>,
) -> impl IntoView {
    let hint = move || match given.get() {
        Given::Resistivity => "ohm-cm, mohm-cm, kohm-cm",
        Given::Density => "cm^-3 or m^-3 (e.g. 2.3x10^15)",
    };
    view! {
        <div class="field" class:invalid=move || error.with(Option::is_some)>
            <label for="convert-value">{label}</label>
            <input id="convert-value" data-testid="convert-value" type="text" inputmode="decimal" autocomplete="off"
                spellcheck="false" aria-describedby="convert-value-hint convert-value-error"
                aria-invalid=move || if error.with(Option::is_some) { "true" } else { "false" }
                prop:value=move || value.get()
                on:input=move |ev| set_value.run(event_target_value(&ev)) />
            <span class="hint" id="convert-value-hint">{hint}</span>
            <span class="message" id="convert-value-error" data-testid="convert-value-error" aria-live="polite">
                {move || error.get().unwrap_or_default()}
            </span>
        </div>
    }
}

/// The row of the comparison that is a bound rather than a conversion.
pub const PHONON_LIMIT: ConversionModel = ConversionModel::Physics(MobilityModel::Lattice);

/// What the phonon-limit row says instead of the core's answer or refusal.
pub const PHONON_LIMIT_REMARK: &str = "phonon limit: lattice scattering only, a bound for pure silicon; not a conversion, not in the spread";

/// The remark of one row of the side-by-side table, and whether the row is the phonon limit
/// (a bound, shown in grey with one short line in place of the core's answer or refusal; the
/// other rows keep their error, source and notes).
pub fn model_remark(a: &ModelAnswer) -> (String, bool) {
    if a.model == PHONON_LIMIT {
        return (PHONON_LIMIT_REMARK.to_string(), true);
    }
    let mut remarks = Vec::new();
    if let Some(e) = &a.error {
        remarks.push(e.clone());
    }
    if a.model == ConversionModel::Empirical {
        remarks.push(EMPIRICAL_REFERENCE.to_string());
    } else if let ConversionModel::Physics(m) = a.model {
        remarks.push(m.reference().to_string());
    }
    remarks.extend(a.notes.iter().cloned());
    (remarks.join("; "), false)
}

/// The geometry of a probe result in words, for the result line.
pub fn geometry_words(geometry: ProbeGeometry) -> &'static str {
    match geometry {
        ProbeGeometry::ThinLayer => "thin layer or wafer",
        ProbeGeometry::Bulk => "bulk sample (semi-infinite)",
    }
}

/// Every model's answer side by side, with the deviation from the empirical relation.
#[component]
fn ComparisonTable(shown: Memo<Option<(Given, Comparison)>>) -> impl IntoView {
    let header = move || match shown.get().map(|s| s.0) {
        Some(Given::Density) => "Resistivity (Ω·cm)",
        _ => "Dopant density (cm⁻³)",
    };
    let spread_text = move || {
        shown
            .get()
            .and_then(|(_, c)| c.spread)
            .map(|s| format!("{} ({} models)", format::fixed(s.ratio, 3), s.models))
            .unwrap_or_else(|| "—".into())
    };
    view! {
        <table class="models-table" data-testid="comparison">
            <caption>"Every model side by side (silicon, 23 C)"</caption>
            <thead>
                <tr>
                    <th scope="col">"Model"</th>
                    <th scope="col">{header}</th>
                    <th scope="col">"vs empirical"</th>
                    <th scope="col" class="left">"Source and remarks"</th>
                </tr>
            </thead>
            <tbody>
                {move || {
                    let Some((given, comparison)) = shown.get() else { return Vec::new() };
                    let reference = comparison
                        .answers
                        .iter()
                        .find(|a| a.model == ConversionModel::Empirical)
                        .and_then(|a| answer_value(a, given));
                    comparison
                        .answers
                        .into_iter()
                        .map(|a| {
                            let value = answer_value(&a, given);
                            let deviation = match (value, reference) {
                                (Some(v), Some(r)) if a.model != ConversionModel::Empirical => {
                                    format!("{:+.1} %", 100.0 * (v / r - 1.0))
                                }
                                _ => String::new(),
                            };
                            let (remark, bound) = model_remark(&a);
                            let bad = a.error.is_some() && !bound;
                            let deviation = if bound { String::new() } else { deviation };
                            view! {
                                <tr class:bound=bound>
                                    <th scope="row">{a.model_name.clone()}</th>
                                    <td data-testid=format!("model-{}", a.model.id())>
                                        {value.map(format::auto).unwrap_or_else(|| "—".into())}
                                    </td>
                                    <td>{deviation}</td>
                                    <td class:note=!bad class:bad=bad data-testid=format!("model-{}-remark", a.model.id())>
                                        {remark}
                                    </td>
                                </tr>
                            }
                        })
                        .collect::<Vec<_>>()
                }}
                <tr>
                    <th scope="row">"Spread: largest / smallest"</th>
                    <td data-testid="model-spread">{spread_text}</td>
                    <td></td>
                    <td class="note">"How far the published models disagree for this sample."</td>
                </tr>
            </tbody>
        </table>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn comparison_is_the_cores_at_23c() {
        let c = compare_at_23c(Given::Resistivity, 10.0, "B").expect("compares");
        assert_eq!(c.answers[0].model, ConversionModel::Empirical);
        let direct =
            empirical::convert("si", "B", EmpiricalInput::ResistivityOhmCm(10.0)).expect("core");
        assert_eq!(
            answer_value(&c.answers[0], Given::Resistivity),
            Some(direct.density_cm3)
        );
        assert_eq!(c.temperature_k, EMPIRICAL_TEMPERATURE_K);
        assert!(c.spread.is_some());
    }

    #[test]
    fn the_lattice_row_is_the_phonon_limit_not_an_error() {
        // 10 ohm cm of boron is below what lattice-only mobility reaches: the core refuses it,
        // and the table shows the bound in one grey line instead of the refusal.
        let c = compare_at_23c(Given::Resistivity, 10.0, "B").expect("compares");
        let lattice = c
            .answers
            .iter()
            .find(|a| a.model == PHONON_LIMIT)
            .expect("listed");
        assert!(lattice.error.is_some());
        assert_eq!(
            model_remark(lattice),
            (PHONON_LIMIT_REMARK.to_string(), true)
        );
        // Real refusals keep their message.
        let c = compare_at_23c(Given::Resistivity, 1e6, "P").expect("compares");
        let (remark, bound) = model_remark(&c.answers[0]);
        assert!(!bound && remark.contains("outside"), "{remark}");
    }

    #[test]
    fn out_of_range_models_report_their_reason() {
        let c = compare_at_23c(Given::Resistivity, 1e6, "P").expect("compares");
        assert!(c.answers[0].error.is_some());
        assert!(c.answers[0].density_cm3.is_none());
        assert!(compare_at_23c(Given::Density, 1e16, "Xx").is_err());
    }

    #[test]
    fn curves_cover_both_types_and_mark_the_sample() {
        let c = curves();
        assert_eq!(c.len(), 4);
        assert!(
            c.iter().all(|s| s.points.len() > CURVE_POINTS / 2),
            "{:?}",
            c.iter().map(|s| s.points.len()).collect::<Vec<_>>()
        );
        let spec = chart(&c, Some((1e15, 13.0, palette::HOLES)));
        assert_eq!(spec.marks.len(), 1);
    }

    #[test]
    fn probe_fields_may_be_empty_for_no_correction() {
        let mut c = crate::state::ConversionInputs {
            sample_thickness: String::new(),
            wafer_diameter: String::new(),
            probe_temperature: String::new(),
            ..Default::default()
        };
        let p = read_probe(&c);
        assert_eq!(p.thickness_cm, Ok(None));
        let r = evaluate_probe(&p, "B").expect("valid").expect("evaluates");
        assert_eq!(r.geometry, ProbeGeometry::ThinLayer);
        assert_eq!(
            r.resistivity_ohm_cm, None,
            "a thin layer without thickness: Rs only"
        );
        c.probe_geometry = "bulk".into();
        let r = evaluate_probe(&read_probe(&c), "B")
            .expect("valid")
            .expect("evaluates");
        assert_eq!(r.geometry, ProbeGeometry::Bulk);
        assert_eq!(r.sheet_resistance_ohm_sq, None);
        c.probe_geometry = "slab".into();
        assert!(read_probe(&c).geometry.is_err());
        assert_eq!(evaluate_probe(&read_probe(&c), "B"), None);
        c.probe_current = "0".into();
        assert!(read_probe(&c).amps.is_err());
    }

    #[test]
    fn probe_result_is_the_cores() {
        let c = crate::state::ConversionInputs::default();
        let p = read_probe(&c);
        let r = evaluate_probe(&p, "B").expect("valid").expect("evaluates");
        let direct = probe::evaluate(&ProbeReading {
            volts: p.volts.clone().expect("V"),
            amps: p.amps.clone().expect("A"),
            spacing_cm: 0.1,
            geometry: ProbeGeometry::ThinLayer,
            thickness_cm: Some(0.0525),
            diameter_cm: Some(15.0),
            temperature: None,
        })
        .expect("core");
        assert_eq!(r, direct);
    }
}
