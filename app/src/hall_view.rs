//! The van der Pauw and Hall view: R_A and R_B to the sheet resistance, the Hall voltage to
//! carrier type, density and mobility, and beside them what every conversion model predicts
//! for the same layer.

use bandgauge_core::hall::{
    self, CrossCheck, HallReading, HallResult, HallVoltage, ScatteringFactor,
};
use bandgauge_core::materials;
use bandgauge_core::mobility::ConductivityType;
use bandgauge_core::neutrality::SolveOptions;
use bandgauge_core::units::QuantityKind;
use bandgauge_core::vdp::{self, Configuration, VdpReadings, VdpResult};
use leptos::prelude::*;

use crate::Bench;
use crate::entry;
use crate::format;
use crate::state::HallInputs;
use crate::widgets::{Caution, Choice, NumberField, ResultLine, SelectField};

/// Everything the view shows for one set of inputs.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    /// The van der Pauw result.
    pub vdp: VdpResult,
    /// The Hall result.
    pub hall: HallResult,
    /// The cross-check against every conversion model.
    pub check: CrossCheck,
}

/// The inputs read into numbers: each field's value or its message.
#[derive(Debug, Clone, PartialEq)]
pub struct Parsed {
    r_a: Result<f64, String>,
    r_b: Result<f64, String>,
    thickness: Result<f64, String>,
    hall_voltage: Result<f64, String>,
    current: Result<f64, String>,
    field: Result<f64, String>,
    scattering: Result<ScatteringFactor, String>,
    temperature: Result<f64, String>,
}

/// Reads every field (each message names its field).
pub fn read(h: &HallInputs) -> Parsed {
    Parsed {
        r_a: entry::positive("R_A", &h.r_a, QuantityKind::Resistance, "ohm"),
        r_b: entry::positive("R_B", &h.r_b, QuantityKind::Resistance, "ohm"),
        thickness: entry::positive("thickness", &h.thickness, QuantityKind::Length, "cm"),
        hall_voltage: entry::quantity("Hall voltage", &h.hall_voltage, QuantityKind::Voltage),
        current: entry::positive("current", &h.current, QuantityKind::Current, "A"),
        field: entry::positive("field", &h.field, QuantityKind::MagneticField, "T"),
        scattering: ScatteringFactor::parse(&h.scattering).map_err(|e| e.to_string()),
        temperature: entry::temperature_k("temperature", &h.temperature),
    }
}

/// The first field's message, if any field is refused.
pub fn first_problem(p: &Parsed) -> Option<String> {
    [
        p.r_a.as_ref().err(),
        p.r_b.as_ref().err(),
        p.thickness.as_ref().err(),
        p.hall_voltage.as_ref().err(),
        p.current.as_ref().err(),
        p.field.as_ref().err(),
        p.scattering.as_ref().err(),
        p.temperature.as_ref().err(),
    ]
    .into_iter()
    .flatten()
    .next()
    .cloned()
}

/// Computes the view's results (the record replays this same function).
///
/// # Errors
/// The first refused field's message, or the core's refusal.
pub fn evaluate(h: &HallInputs) -> Result<Outcome, String> {
    let p = read(h);
    if let Some(problem) = first_problem(&p) {
        return Err(problem);
    }
    let (r_a, r_b, t) = (p.r_a?, p.r_b?, p.thickness?);
    let vdp = vdp::evaluate(&VdpReadings {
        a: Configuration::single(r_a),
        b: Configuration::single(r_b),
        thickness_cm: Some(t),
    })
    .map_err(|e| e.to_string())?;
    let hall = hall::evaluate(&HallReading {
        voltage: HallVoltage::Net(p.hall_voltage?),
        current_a: p.current?,
        field_t: p.field?,
        sheet_resistance_ohm_sq: vdp.solution.sheet_resistance_ohm_sq,
        thickness_cm: Some(t),
        scattering: p.scattering?,
    })
    .map_err(|e| e.to_string())?;
    let check = hall::cross_check(
        &materials::silicon(),
        &h.dopant,
        vdp.resistivity_ohm_cm.unwrap_or(f64::NAN),
        &hall,
        p.temperature?,
        &SolveOptions::default(),
    )
    .map_err(|e| e.to_string())?;
    Ok(Outcome { vdp, hall, check })
}

/// The models and sources behind the results, for the caution and the report.
pub fn models_used(o: Option<&Outcome>) -> Vec<(String, String, String)> {
    let mut list = vec![(
        "sheet resistance".to_string(),
        "van der Pauw equation exp(-pi R_A/Rs) + exp(-pi R_B/Rs) = 1".to_string(),
        "van der Pauw, Philips Res. Rep. 13, 1 (1958)".to_string(),
    )];
    if let Some(o) = o {
        list.push((
            "Hall analysis".to_string(),
            format!(
                "n_s = r_H I B/(q |V_H|), r_H = {}",
                format::fixed(o.hall.scattering_factor, 4)
            ),
            o.hall.scattering_source.clone(),
        ));
        let ids: Vec<&str> = o.check.rows.iter().map(|r| r.model.id()).collect();
        list.push((
            "cross-check".to_string(),
            format!(
                "{} with charge neutrality at the measurement temperature",
                ids.join(", ")
            ),
            "REFERENCES.md".to_string(),
        ));
        list.extend(
            o.vdp
                .warnings
                .iter()
                .chain(&o.hall.notes)
                .chain(&o.check.notes)
                .map(|n| ("note".to_string(), n.clone(), String::new())),
        );
    }
    list
}

/// The carrier type in words.
pub fn type_words(t: ConductivityType) -> &'static str {
    match t {
        ConductivityType::N => "n (electrons)",
        ConductivityType::P => "p (holes)",
    }
}

/// A signed percentage as shown.
pub fn percent(v: Option<f64>) -> String {
    v.map_or_else(|| "—".into(), |v| format!("{v:+.1} %"))
}

fn dopant_choices() -> Vec<Choice> {
    materials::silicon()
        .dopants
        .iter()
        .map(|d| (d.symbol.to_string(), format!("{} ({})", d.symbol, d.kind)))
        .collect()
}

fn scattering_choices() -> Vec<Choice> {
    ScatteringFactor::NAMED
        .iter()
        .map(|f| {
            (
                f.id().to_string(),
                format!("{} (r_H = {})", f.id(), format::fixed(f.value(), 3)),
            )
        })
        .collect()
}

/// The view.
#[component]
pub fn HallView(
    /// The shared inputs and layout handles.
    bench: Bench,
) -> impl IntoView {
    let inputs = bench.inputs;
    let (r_a, set_r_a) = bench.text(|w| &w.hall.r_a, |w| &mut w.hall.r_a);
    let (r_b, set_r_b) = bench.text(|w| &w.hall.r_b, |w| &mut w.hall.r_b);
    let (thickness, set_thickness) = bench.text(|w| &w.hall.thickness, |w| &mut w.hall.thickness);
    let (voltage, set_voltage) = bench.text(|w| &w.hall.hall_voltage, |w| &mut w.hall.hall_voltage);
    let (current, set_current) = bench.text(|w| &w.hall.current, |w| &mut w.hall.current);
    let (field, set_field) = bench.text(|w| &w.hall.field, |w| &mut w.hall.field);
    let (scattering, set_scattering) =
        bench.text(|w| &w.hall.scattering, |w| &mut w.hall.scattering);
    let (dopant, set_dopant) = bench.text(|w| &w.hall.dopant, |w| &mut w.hall.dopant);
    let (temperature, set_temperature) =
        bench.text(|w| &w.hall.temperature, |w| &mut w.hall.temperature);
    let parsed = Memo::new(move |_| inputs.with(|w| read(&w.hall)));
    let outcome = Memo::new(move |_| inputs.with(|w| evaluate(&w.hall)));
    // The last valid result stays on screen while a field is being corrected.
    let shown = Memo::new(
        move |previous: Option<&Option<Outcome>>| match outcome.get() {
            Ok(o) => Some(o),
            Err(_) => previous.cloned().flatten(),
        },
    );
    let status = Memo::new(move |_| {
        outcome
            .get()
            .err()
            .map(|e| format!("Cannot compute: {e}. Showing the last valid result."))
    });
    let error = move |f: fn(&Parsed) -> Option<String>| Signal::derive(move || parsed.with(f));
    let value = move |f: fn(&Outcome) -> String| {
        Signal::derive(move || shown.with(|o| o.as_ref().map(f).unwrap_or_else(|| "—".into())))
    };
    let models = Signal::derive(move || shown.with(|o| models_used(o.as_ref())));
    let dopant_error = Signal::derive(|| None::<String>);
    let scattering_error = error(|p| p.scattering.clone().err());

    view! {
        <div class="workspace">
            <section class="inputs" aria-label="Structure readings">
                <h2>"Van der Pauw structure"</h2>
                <NumberField id="hall-ra" label="R_A = V/I" hint="ohm, mohm, kohm" value=r_a on_input=set_r_a
                    error=error(|p| p.r_a.clone().err()) />
                <NumberField id="hall-rb" label="R_B = V/I (turned one contact)" hint="ohm, mohm, kohm" value=r_b
                    on_input=set_r_b error=error(|p| p.r_b.clone().err()) />
                <NumberField id="hall-thickness" label="Layer thickness" hint="um, nm, cm" value=thickness
                    on_input=set_thickness error=error(|p| p.thickness.clone().err()) />
                <h2>"Hall measurement"</h2>
                <NumberField id="hall-voltage" label="Hall voltage V2 - V4 (averaged)" hint="V, mV, uV; > 0 holes, < 0 electrons"
                    value=voltage on_input=set_voltage error=error(|p| p.hall_voltage.clone().err()) />
                <NumberField id="hall-current" label="Current" hint="A, mA, uA" value=current on_input=set_current
                    error=error(|p| p.current.clone().err()) />
                <NumberField id="hall-field" label="Magnetic field" hint="T, mT, G, kG" value=field on_input=set_field
                    error=error(|p| p.field.clone().err()) />
                <SelectField id="hall-factor" label="Hall scattering factor r_H" choices=Signal::derive(scattering_choices)
                    value=scattering on_change=set_scattering error=scattering_error />
                <h2>"Cross-check (silicon)"</h2>
                <SelectField id="hall-dopant" label="Dopant" choices=Signal::derive(dopant_choices)
                    value=dopant on_change=set_dopant error=dopant_error />
                <NumberField id="hall-temperature" label="Temperature of the measurement" hint="K or C"
                    value=temperature on_input=set_temperature error=error(|p| p.temperature.clone().err()) />
                <p class="note">"Contacts 1-4 counter-clockwise seen with the field pointing at you, current into 1 and out of 3, Hall voltage V2 - V4."</p>
            </section>
            <section class="outputs" aria-label="Results">
                <div class="status" role="status" data-testid="hall-status">
                    {move || status.get().map(|p| view! { <p class="stale">{p}</p> })}
                </div>
                <div class="panel">
                    <h2>"Sheet resistance"</h2>
                    <dl class="results big-results">
                        <ResultLine id="hall-sheet" term="Sheet resistance Rs" unit="Ω/□"
                            value=value(|o| format::auto(o.vdp.solution.sheet_resistance_ohm_sq)) />
                        <ResultLine id="hall-resistivity" term="Resistivity ρ" unit="Ω·cm"
                            value=value(|o| o.vdp.resistivity_ohm_cm.map(format::auto).unwrap_or_default()) />
                        <ResultLine id="hall-ratio" term="Symmetry R_A/R_B"
                            value=value(|o| format::fixed(o.vdp.solution.ratio, 4)) />
                        <ResultLine id="hall-f" term="Correction factor f"
                            value=value(|o| format::fixed(o.vdp.solution.correction_factor, 5)) />
                    </dl>
                </div>
                <div class="panel">
                    <h2>"Carriers from the Hall voltage"</h2>
                    <dl class="results big-results">
                        <ResultLine id="hall-type" term="Carrier type" value=value(|o| type_words(o.hall.conductivity_type).to_string()) />
                        <ResultLine id="hall-sheet-density" term="Sheet density n_s" unit="cm⁻²"
                            value=value(|o| format::sci(o.hall.sheet_density_cm2)) />
                        <ResultLine id="hall-density" term="Carrier density n" unit="cm⁻³"
                            value=value(|o| o.hall.volume_density_cm3.map(format::sci).unwrap_or_default()) />
                        <ResultLine id="hall-mobility" term="Hall mobility μ_H" unit="cm²/V·s"
                            value=value(|o| format::auto(o.hall.hall_mobility_cm2_per_v_s)) />
                        <ResultLine id="hall-drift-mobility" term="Drift mobility μ = μ_H/r_H" unit="cm²/V·s"
                            value=value(|o| format::auto(o.hall.drift_mobility_cm2_per_v_s)) />
                    </dl>
                </div>
                <table class="models-table" data-testid="hall-check">
                    <caption>"What each conversion model predicts for this layer"</caption>
                    <thead><tr>
                        <th scope="col">"Model"</th><th scope="col">"Dopant density (cm⁻³)"</th>
                        <th scope="col">"Free carriers (cm⁻³)"</th><th scope="col">"Hall vs model"</th>
                        <th scope="col">"Mobility (cm²/V·s)"</th><th scope="col">"Hall vs model"</th>
                        <th scope="col" class="left">"Remark"</th>
                    </tr></thead>
                    <tbody>
                        {move || shown.get().map(|o| o.check.rows.into_iter().map(|r| {
                            let id = r.model.id();
                            let cell = |v: Option<f64>, show: fn(f64) -> String| v.map_or_else(|| "—".to_string(), show);
                            view! {
                                <tr data-testid=format!("hall-check-{id}")>
                                    <th scope="row">{id}</th>
                                    <td data-testid=format!("hall-check-{id}-dopant")>{cell(r.dopant_density_cm3, format::sci)}</td>
                                    <td data-testid=format!("hall-check-{id}-carriers")>{cell(r.carriers_cm3, format::sci)}</td>
                                    <td data-testid=format!("hall-check-{id}-carriers-diff")>{percent(r.carriers_difference_percent)}</td>
                                    <td data-testid=format!("hall-check-{id}-mobility")>{cell(r.mobility_cm2_per_v_s, format::auto)}</td>
                                    <td data-testid=format!("hall-check-{id}-mobility-diff")>{percent(r.mobility_difference_percent)}</td>
                                    <td class="note">{r.error.unwrap_or_default()}</td>
                                </tr>
                            }
                        }).collect_view())}
                    </tbody>
                </table>
                <Caution models=models />
            </section>
        </div>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn default_inputs_give_an_n_type_layer_near_1e16() {
        let o = evaluate(&HallInputs::default()).expect("defaults compute");
        assert_eq!(o.hall.conductivity_type, ConductivityType::N);
        // n_s = I B/(q |V_H|) = 1e-5 A x 0.5 T / (1.602176634e-19 C x 1.56e-3 V), in cm^-2.
        let n_s = 1e-5 * 0.5 / (1.602_176_634e-19 * 1.56e-3) * 1e-4;
        let close = |a: f64, b: f64| (a - b).abs() <= 1e-12 * b.abs();
        assert!(
            close(o.hall.sheet_density_cm2, n_s),
            "{}",
            o.hall.sheet_density_cm2
        );
        assert!(close(o.hall.volume_density_cm3.unwrap(), n_s / 2e-4));
        assert_eq!(o.check.rows.len(), 3, "thurber, masetti, arora");
    }

    #[test]
    fn a_refused_field_is_named() {
        let inputs = HallInputs {
            field: "5000 ohm".into(),
            ..HallInputs::default()
        };
        let message = evaluate(&inputs).unwrap_err();
        assert!(message.starts_with("field: "), "{message}");
        let zero = HallInputs {
            hall_voltage: "0".into(),
            ..HallInputs::default()
        };
        assert!(
            evaluate(&zero)
                .unwrap_err()
                .contains("net Hall voltage is 0")
        );
    }
}
