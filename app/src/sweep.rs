//! The "Temperature sweep" view: the carriers-view sample solved over a temperature range;
//! carriers versus 1000/T, the Fermi level between the band edges versus T, and the
//! ionized fraction of each species versus T, with the carriers-view temperature marked.

use crate::Bench;
use crate::carriers::Reading;
use crate::chart::{Axis, ChartSpec, Corner, Mark, Series, palette};
use crate::entry;
use crate::format;
use crate::state::View;
use crate::widgets::{Caution, ChartPanel, NumberField};
use bandgauge_core::materials::{DopantDensity, Material};
use bandgauge_core::neutrality::{Equilibrium, SolveOptions};
use bandgauge_core::sweep;
use leptos::prelude::*;

/// Most temperatures a sweep may have: enough for smooth curves, few enough to stay
/// well inside one animation frame.
pub const MAX_POINTS: usize = 1000;

/// Decades shown below the largest density on the carriers chart: minority carriers
/// at low temperature fall hundreds of decades and would flatten everything else.
pub const DENSITY_DECADES_SHOWN: f64 = 16.0;

/// Headroom above the largest density (a decade and a half) keeps the marked-temperature
/// label off the majority-carrier curve.
pub const DENSITY_HEADROOM: f64 = 30.0;

/// A solved sweep: every temperature with its result.
#[derive(Clone, Debug, PartialEq)]
pub struct SweepOutcome {
    /// Temperatures, K.
    pub temperatures_k: Vec<f64>,
    /// The solved points (temperatures that failed are left out).
    pub points: Vec<Equilibrium>,
    /// How many temperatures failed, and the first reason.
    pub failures: Option<(usize, String)>,
}

/// Solves the sweep with the core.
pub fn evaluate(
    material: &Material,
    doping: &[DopantDensity],
    options: &SolveOptions,
    from_k: f64,
    to_k: f64,
    points: usize,
) -> Result<SweepOutcome, String> {
    let temperatures_k = sweep::linear_grid_k(from_k, to_k, points).map_err(|e| e.to_string())?;
    let results = sweep::temperature_sweep(material, &temperatures_k, doping, options);
    let mut solved = Vec::with_capacity(results.len());
    let mut failures: Option<(usize, String)> = None;
    for r in results {
        match r {
            Ok(eq) => solved.push(eq),
            Err(e) => {
                let f = failures.get_or_insert((0, e.to_string()));
                f.0 += 1;
            }
        }
    }
    if solved.is_empty() {
        let reason = failures
            .map(|f| f.1)
            .unwrap_or_else(|| "no temperatures".into());
        return Err(format!(
            "no temperature in the range could be solved: {reason}"
        ));
    }
    Ok(SweepOutcome {
        temperatures_k,
        points: solved,
        failures,
    })
}

fn temperature_mark(marked_k: Option<f64>, x: impl Fn(f64) -> f64) -> Vec<Mark> {
    marked_k
        .map(|t| Mark::Vertical {
            x: x(t),
            label: format!("{} K", format::linear_tick(t)),
        })
        .into_iter()
        .collect()
}

/// n, p and ni versus 1000/T, log scale.
pub fn carriers_chart(s: &SweepOutcome, marked_k: Option<f64>) -> ChartSpec {
    let inv = |t: f64| 1000.0 / t;
    let curve = |f: fn(&Equilibrium) -> f64| {
        s.points
            .iter()
            .map(|e| (inv(e.temperature_k), f(e)))
            .collect::<Vec<_>>()
    };
    let top = s
        .points
        .iter()
        .flat_map(|e| [e.electrons_cm3, e.holes_cm3, e.intrinsic_cm3])
        .filter(|v| v.is_finite() && *v > 0.0)
        .fold(f64::NEG_INFINITY, f64::max);
    let bottom = s
        .points
        .iter()
        .flat_map(|e| [e.electrons_cm3, e.holes_cm3, e.intrinsic_cm3])
        .filter(|v| v.is_finite() && *v > 0.0)
        .fold(f64::INFINITY, f64::min);
    let mut y = Axis::log("Density (cm⁻³)");
    if top.is_finite() && bottom.is_finite() {
        let lo = bottom.max(top / 10f64.powf(DENSITY_DECADES_SHOWN));
        y = y.with_range(lo / 2.0, top * DENSITY_HEADROOM);
    }
    ChartSpec {
        title: "Carrier densities versus 1000/T".into(),
        file_stem: "bandgauge-carriers-vs-inverse-temperature".into(),
        x: Axis::linear("1000/T (1/K)"),
        y,
        series: vec![
            Series::line(
                "electrons n",
                curve(|e| e.electrons_cm3),
                palette::ELECTRONS,
            ),
            Series::line("holes p", curve(|e| e.holes_cm3), palette::HOLES),
            Series::line(
                "intrinsic ni",
                curve(|e| e.intrinsic_cm3),
                palette::INTRINSIC,
            )
            .dashed(),
        ],
        marks: temperature_mark(marked_k, inv),
        // Minority carriers and ni fall away to the lower left; the lower right stays free.
        legend: Corner::BottomRight,
    }
}

fn labelled(mut s: Series) -> Series {
    s.end_label = Some(s.name.clone());
    s.in_legend = false;
    s
}

/// E_F with Ec, Ev and midgap versus T; energies above Ev.
pub fn fermi_chart(s: &SweepOutcome, marked_k: Option<f64>) -> ChartSpec {
    let curve = |f: fn(&Equilibrium) -> f64| {
        s.points
            .iter()
            .map(|e| (e.temperature_k, f(e)))
            .collect::<Vec<_>>()
    };
    ChartSpec {
        title: "Fermi level and band edges versus T".into(),
        file_stem: "bandgauge-fermi-level-vs-temperature".into(),
        x: Axis::linear("Temperature (K)"),
        y: Axis::linear("Energy above Ev (eV)"),
        // Labels at the curve ends instead of a legend: EF wanders over the whole plot.
        series: vec![
            labelled(Series::line("Ec", curve(|e| e.band_gap_ev), palette::BAND)),
            labelled(Series::line(
                "EF",
                curve(|e| e.fermi_minus_valence_ev),
                palette::FERMI,
            )),
            labelled(
                Series::line(
                    "midgap",
                    curve(|e| e.fermi_minus_valence_ev - e.fermi_minus_midgap_ev),
                    palette::INTRINSIC,
                )
                .dashed(),
            ),
            labelled(Series::line("Ev", curve(|_| 0.0), palette::BAND)),
        ],
        marks: temperature_mark(marked_k, |t| t),
        legend: Corner::BottomLeft,
    }
}

/// Ionized fraction of each species versus T.
pub fn ionization_chart(s: &SweepOutcome, marked_k: Option<f64>) -> ChartSpec {
    let count = s.points.first().map(|e| e.species.len()).unwrap_or(0);
    let series = (0..count)
        .map(|i| {
            let first = &s.points[0].species[i];
            let name = format!(
                "{} ({}, {})",
                first.symbol,
                first.kind,
                format::sci(first.density_cm3)
            );
            let points = s
                .points
                .iter()
                .filter_map(|e| {
                    e.species
                        .get(i)
                        .map(|sp| (e.temperature_k, sp.ionized_fraction))
                })
                .collect();
            let line = Series::line(&name, points, palette::nth(i));
            // Fully ionized species all sit at 1: dashes let the curve underneath show through.
            if first.kind == bandgauge_core::materials::DopantKind::Acceptor {
                line.dashed()
            } else {
                line
            }
        })
        .collect();
    ChartSpec {
        title: "Ionized fraction versus T".into(),
        file_stem: "bandgauge-ionized-fraction-vs-temperature".into(),
        x: Axis::linear("Temperature (K)"),
        y: Axis::linear("Ionized fraction").with_range(0.0, 1.05),
        series,
        marks: temperature_mark(marked_k, |t| t),
        legend: Corner::BottomRight,
    }
}

/// The view.
#[component]
pub fn SweepView(
    /// The shared inputs and layout handles.
    bench: Bench,
) -> impl IntoView {
    let inputs = bench.inputs;
    let reading = Reading::new(bench);
    let (from, set_from) = bench.text(|w| &w.sweep.from, |w| &mut w.sweep.from);
    let (to, set_to) = bench.text(|w| &w.sweep.to, |w| &mut w.sweep.to);
    let (points, set_points) = bench.text(|w| &w.sweep.points, |w| &mut w.sweep.points);
    let (marked, set_marked) =
        bench.text(|w| &w.carriers.temperature, |w| &mut w.carriers.temperature);
    let from_k = Memo::new(move |_| entry::temperature_k("from", &from.get()));
    let to_k = Memo::new(move |_| entry::temperature_k("to", &to.get()));
    let count = Memo::new(move |_| entry::count("points", &points.get(), 2, MAX_POINTS));
    let outcome = Memo::new(move |_| {
        let (material, doping, options) = reading.problem.get()?;
        let (from, to, n) = (from_k.get().ok()?, to_k.get().ok()?, count.get().ok()?);
        Some(evaluate(&material, &doping, &options, from, to, n))
    });
    let shown = Memo::new(
        move |previous: Option<&Option<SweepOutcome>>| match outcome.get() {
            Some(Ok(o)) => Some(o),
            _ => previous.cloned().flatten(),
        },
    );
    let marked_k = Memo::new(move |_| reading.temperature_k.get().ok());
    let status = Memo::new(move |_| {
        match outcome.get() {
        None if reading.problem.with(Option::is_none) => {
            Some("The sample in the carriers view has an invalid field; fix it there. Showing the last valid sweep.".to_string())
        }
        None => Some("Showing the last valid sweep: correct the marked field to update.".to_string()),
        Some(Err(e)) => Some(format!("Cannot compute: {e}. Showing the last valid sweep.")),
        Some(Ok(o)) => o.failures.map(|(n, why)| format!("{n} of {} temperatures could not be solved and are left out: {why}", o.temperatures_k.len())),
    }
    });
    let chart = move |build: fn(&SweepOutcome, Option<f64>) -> ChartSpec| {
        Signal::derive(move || shown.with(|s| s.as_ref().map(|s| build(s, marked_k.get()))))
    };
    let sample = move || {
        let material = reading.material.get().map(|m| m.name).unwrap_or_else(|e| e);
        let doping = inputs.with(|w| {
            w.carriers
                .dopants
                .iter()
                .map(|d| format!("{} {}", d.species, d.density))
                .collect::<Vec<_>>()
                .join(", ")
        });
        let doping = if doping.is_empty() {
            "undoped".to_string()
        } else {
            doping
        };
        format!("{material}; {doping}")
    };
    let models = Signal::derive(move || {
        shown.with(|s| {
            s.as_ref()
                .and_then(|s| s.points.first())
                .map(|e| {
                    e.models
                        .iter()
                        .map(|m| {
                            (
                                m.quantity.to_string(),
                                m.model.to_string(),
                                m.source.to_string(),
                            )
                        })
                        .collect()
                })
                .unwrap_or_default()
        })
    });
    let error_of = |m: Memo<entry::Parsed>| Signal::derive(move || m.get().err());
    view! {
        <div class="workspace">
            <section class="inputs" aria-label="Temperature range">
                <h2>"Range"</h2>
                <NumberField id="sweep-from" label="From" hint="K, or C" value=from on_input=set_from error=error_of(from_k) />
                <NumberField id="sweep-to" label="To" hint="K, or C" value=to on_input=set_to error=error_of(to_k) />
                <NumberField id="sweep-points" label="Temperatures" hint="2 to 1000, evenly spaced" value=points on_input=set_points
                    error=Signal::derive(move || count.get().err()) />
                <NumberField id="marked-temperature" label="Marked temperature" hint="same as the carriers view"
                    value=marked on_input=set_marked error=error_of(reading.temperature_k) />
                <h2>"Sample"</h2>
                <p class="sample" data-testid="sweep-sample">{sample}</p>
                <button type="button" class="link" data-testid="edit-sample"
                    on:click=move |_| bench.edit(|w| w.view = View::Carriers)>"Edit material, dopants and models"</button>
            </section>
            <section class="outputs" aria-label="Charts">
                <div class="status" role="status" data-testid="status">
                    {move || status.get().map(|p| view! { <p class="stale">{p}</p> })}
                </div>
                <div class="chart-grid">
                    <ChartPanel id="chart-carriers" spec=chart(carriers_chart) layout=bench.layout input_at=bench.input_at />
                    <ChartPanel id="chart-fermi" spec=chart(fermi_chart) layout=bench.layout input_at=bench.input_at />
                    <ChartPanel id="chart-ionization" spec=chart(ionization_chart) layout=bench.layout input_at=bench.input_at />
                </div>
                <Caution models=models />
            </section>
        </div>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use bandgauge_core::materials;

    fn silicon_sweep() -> SweepOutcome {
        let m = materials::silicon();
        let doping = vec![DopantDensity {
            dopant: m.dopant("P").expect("P"),
            density_cm3: 1e15,
        }];
        evaluate(&m, &doping, &SolveOptions::default(), 100.0, 600.0, 11).expect("sweep")
    }

    #[test]
    fn sweep_agrees_with_single_solves() {
        let m = materials::silicon();
        let doping = vec![DopantDensity {
            dopant: m.dopant("P").expect("P"),
            density_cm3: 1e15,
        }];
        let s = silicon_sweep();
        assert_eq!(s.points.len(), 11);
        let single =
            bandgauge_core::neutrality::solve(&m, 350.0, &doping, &SolveOptions::default())
                .expect("solve");
        let at = s
            .points
            .iter()
            .find(|e| e.temperature_k == 350.0)
            .expect("350 K on the grid");
        // Same solver, different starting point: agreement to the solver's own tolerance.
        assert!((at.electrons_cm3 / single.electrons_cm3 - 1.0).abs() < 1e-9);
    }

    #[test]
    fn charts_carry_every_point_and_the_mark() {
        let s = silicon_sweep();
        let c = carriers_chart(&s, Some(250.0));
        assert_eq!(c.series.len(), 3);
        assert!(c.series.iter().all(|x| x.points.len() == 11));
        assert_eq!(c.series[0].points[0].0, 10.0);
        assert_eq!(
            c.marks,
            vec![Mark::Vertical {
                x: 4.0,
                label: "250 K".into()
            }]
        );
        let (lo, hi) = c.y.range.expect("range");
        assert!(
            hi / lo <= 10f64.powf(DENSITY_DECADES_SHOWN) * DENSITY_HEADROOM * 2.0 * (1.0 + 1e-12)
        );
        assert!(hi / lo > 10f64.powf(DENSITY_DECADES_SHOWN));
        assert_eq!(fermi_chart(&s, None).marks, vec![]);
        let ion = ionization_chart(&s, Some(300.0));
        assert_eq!(ion.series.len(), 1);
        assert!(ion.series[0].name.starts_with("P (donor"));
    }

    #[test]
    fn bad_grid_is_reported() {
        let m = materials::silicon();
        assert!(evaluate(&m, &[], &SolveOptions::default(), 100.0, 600.0, 0).is_err());
    }
}
