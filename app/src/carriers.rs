//! The "Carriers at one temperature" view: material, temperature, dopants and models in;
//! band quantities, carriers, Fermi level, ionization, mobility and resistivity out, with a
//! band-edge diagram drawn to scale. Also the parsing of these inputs, which the sweep
//! view shares.

use crate::chart::{Axis, ChartSpec, Color, Corner, Series, palette};
use crate::entry;
use crate::format;
use crate::widgets::{Caution, ChartPanel, Choice, NumberField, ResultLine, SelectField};
use crate::{
    Bench,
    state::{CarrierInputs, DopantRow},
};
use bandgauge_core::bgn::BgnModel;
use bandgauge_core::intrinsic::IntrinsicModel;
use bandgauge_core::ionization::IonizationModel;
use bandgauge_core::materials::{self, Dopant, DopantDensity, DopantKind, Material};
use bandgauge_core::mobility::{ConductivityType, MobilityModel};
use bandgauge_core::neutrality::{self, Equilibrium, SolveOptions};
use bandgauge_core::probe;
use bandgauge_core::resistivity::{self, MixResistivity, PhysicsOptions};
use leptos::prelude::*;

/// Key of the intrinsic model computed from Nc, Nv and the gap.
pub const INTRINSIC_FROM_DOS: &str = "dos";
/// Key of the material's published direct fit of ni(T).
pub const INTRINSIC_DIRECT_FIT: &str = "fit";

/// The intrinsic model for a state key ("" is the default).
pub fn intrinsic_model(key: &str, material: &Material) -> Result<IntrinsicModel, String> {
    match key {
        "" | INTRINSIC_FROM_DOS => Ok(IntrinsicModel::DensityOfStates),
        INTRINSIC_DIRECT_FIT if material.intrinsic_fit.is_some() => Ok(IntrinsicModel::DirectFit),
        INTRINSIC_DIRECT_FIT => Err(format!(
            "intrinsic model: {} has no published direct fit of ni(T)",
            material.name
        )),
        other => Err(format!(
            "intrinsic model: '{other}' is unknown; choose {INTRINSIC_FROM_DOS} or {INTRINSIC_DIRECT_FIT}"
        )),
    }
}

/// The selectable intrinsic models of a material.
pub fn intrinsic_choices(material: &Material) -> Vec<Choice> {
    let mut choices = vec![(
        INTRINSIC_FROM_DOS.to_string(),
        "From Nc, Nv and the band gap".to_string(),
    )];
    if let Some(fit) = &material.intrinsic_fit {
        choices.push((
            INTRINSIC_DIRECT_FIT.into(),
            format!("Direct fit: {}", fit.name),
        ));
    }
    choices
}

/// The dopant-level model for a state key ("" is the core's default).
pub fn ionization_model(key: &str) -> Result<IonizationModel, String> {
    if key.is_empty() {
        return Ok(IonizationModel::default());
    }
    IonizationModel::from_id(key).map_err(|e| format!("dopant levels: {e}"))
}

/// The selectable dopant-level models.
pub fn ionization_choices() -> Vec<Choice> {
    IonizationModel::ALL
        .into_iter()
        .map(|m| (m.id().to_string(), m.name().to_string()))
        .collect()
}

/// The band-gap narrowing option for the checkbox state.
pub fn band_gap_narrowing(on: bool, material: &Material) -> Result<Option<BgnModel>, String> {
    match (on, &material.band_gap_narrowing) {
        (false, _) => Ok(None),
        (true, Some(_)) => Ok(Some(BgnModel::MaterialSet)),
        (true, None) => Err(format!(
            "band-gap narrowing: no parameter set for {}; switch it off",
            material.name
        )),
    }
}

/// The mobility model for a state key: "" picks the first model that applies to `species`
/// (the species whose parameter sets the core uses, [`resistivity::mobility_species`]).
pub fn mobility_model(
    key: &str,
    material: &Material,
    species: &str,
) -> Result<Option<MobilityModel>, String> {
    if key.is_empty() {
        return Ok(MobilityModel::ALL
            .into_iter()
            .find(|m| m.applicable(&material.id, species)));
    }
    let model = MobilityModel::from_id(key).map_err(|e| e.to_string())?;
    if model.applicable(&material.id, species) {
        Ok(Some(model))
    } else {
        Err(format!(
            "mobility model: {} has no parameters for {} doped with {species}",
            model.name(),
            material.name
        ))
    }
}

/// One dopant row as read.
#[derive(Clone, Debug, PartialEq)]
pub struct RowReading {
    /// The species, or why it is unknown.
    pub species: Result<Dopant, String>,
    /// The density in cm^-3, or the message for the field.
    pub density_cm3: entry::Parsed,
}

/// The material for an id; the core's message already names the `material` field.
pub fn material_of(id: &str) -> Result<Material, String> {
    materials::by_id(id).map_err(|e| e.to_string())
}

/// The label of a dopant row's density field: "P density", or "density" when no species is set.
fn density_label(species: &str) -> String {
    match species.trim() {
        "" => "density".to_string(),
        s => format!("{s} density"),
    }
}

/// Reads the dopant rows against a material.
pub fn read_rows(material: &Material, rows: &[DopantRow]) -> Vec<RowReading> {
    rows.iter()
        .map(|row| RowReading {
            species: material
                .dopant(&row.species)
                .map_err(|e| format!("species: {e}")),
            density_cm3: entry::density_cm3(&density_label(&row.species), &row.density),
        })
        .collect()
}

/// Everything needed for one neutrality solve, all inputs valid.
#[derive(Clone, Debug, PartialEq)]
pub struct Request {
    /// The material.
    pub material: Material,
    /// Temperature, K.
    pub temperature_k: f64,
    /// The doping.
    pub doping: Vec<DopantDensity>,
    /// Solver options.
    pub options: SolveOptions,
    /// Mobility model key as stored ("" for automatic).
    pub mobility_key: String,
    /// Layer thickness, cm.
    pub thickness_cm: f64,
}

/// The carriers, mobilities and resistivity for a request.
#[derive(Clone, Debug, PartialEq)]
pub struct Outcome {
    /// The request this answers.
    pub request: Request,
    /// The equilibrium state.
    pub equilibrium: Equilibrium,
    /// Mobilities and resistivity of the whole mix from the core, or why there are none.
    pub transport: Result<MixResistivity, String>,
    /// Sheet resistance of the layer, ohm/sq, or why there is none.
    pub sheet_ohm_sq: Result<f64, String>,
}

/// Solves a request with the core.
pub fn evaluate(request: &Request) -> Result<Outcome, String> {
    let r = request;
    let equilibrium = neutrality::solve(&r.material, r.temperature_k, &r.doping, &r.options)
        .map_err(|e| e.to_string())?;
    let majority = if equilibrium.electrons_cm3 >= equilibrium.holes_cm3 {
        ConductivityType::N
    } else {
        ConductivityType::P
    };
    // The core picks the parameter species; it is needed here only for the "first that
    // applies" choice of model.
    let species = resistivity::mobility_species(&r.material, &r.doping, majority)
        .map(|d| d.symbol)
        .unwrap_or_default();
    let transport = mobility_model(&r.mobility_key, &r.material, &species).and_then(|model| {
        let model = model
            .ok_or_else(|| format!("mobility: no model has parameters for {}", r.material.name))?;
        let options = PhysicsOptions {
            mobility: model,
            solve: r.options.clone(),
        };
        resistivity::resistivity_of_equilibrium(
            &r.material,
            &r.doping,
            equilibrium.clone(),
            &options,
        )
        .map_err(|e| e.to_string())
    });
    let sheet_ohm_sq = transport.as_ref().map_err(Clone::clone).and_then(|t| {
        probe::sheet_resistance_ohm_sq(t.resistivity_ohm_cm, r.thickness_cm)
            .map_err(|e| e.to_string())
    });
    Ok(Outcome {
        request: request.clone(),
        equilibrium,
        transport,
        sheet_ohm_sq,
    })
}

/// The band-edge diagram: Ev at 0, Ec at Eg, E_F, midgap and every dopant level, to scale.
pub fn band_diagram(outcome: &Outcome) -> ChartSpec {
    let eq = &outcome.equilibrium;
    let eg = eq.band_gap_ev;
    let ef = eq.fermi_minus_valence_ev;
    let mid = ef - eq.fermi_minus_midgap_ev;
    let level = |name: &str, y: f64, x0: f64, x1: f64, color: Color, label: String| Series {
        name: name.into(),
        points: vec![(x0, y), (x1, y)],
        color,
        stroke: crate::chart::Stroke::Solid,
        end_label: Some(label),
        in_legend: false,
    };
    let mut series = vec![
        level(
            "Ec",
            eg,
            0.0,
            1.0,
            palette::BAND,
            format!("Ec  {}", format::fixed(eg, 3)),
        ),
        level("Ev", 0.0, 0.0, 1.0, palette::BAND, "Ev  0".into()),
        Series {
            stroke: crate::chart::Stroke::Dashed,
            ..level("midgap", mid, 0.0, 1.0, palette::INTRINSIC, "midgap".into())
        },
        Series {
            stroke: crate::chart::Stroke::Dashed,
            ..level(
                "EF",
                ef,
                0.0,
                1.0,
                palette::FERMI,
                format!("EF  {}", format::fixed(ef, 3)),
            )
        },
    ];
    // Donor levels on the left half, acceptor levels on the right, so labels do not collide.
    for (i, s) in eq.species.iter().enumerate() {
        let (y, x0, x1, color) = match s.kind {
            DopantKind::Donor => (
                eg - s.level_from_band_edge_ev,
                0.06,
                0.36,
                palette::ELECTRONS,
            ),
            DopantKind::Acceptor => (s.level_from_band_edge_ev, 0.42, 0.72, palette::HOLES),
        };
        let label = format!("{} {:.0} meV", s.symbol, 1e3 * s.level_from_band_edge_ev);
        series.push(level(
            &format!("{} level ({})", s.symbol, i + 1),
            y,
            x0,
            x1,
            color,
            label,
        ));
    }
    ChartSpec {
        title: format!("Band edges at {} K", format::linear_tick(eq.temperature_k)),
        file_stem: "bandgauge-band-edges".into(),
        x: Axis {
            label: String::new(),
            log: false,
            range: Some((0.0, 1.0)),
            hidden: true,
            categories: Vec::new(),
        },
        y: Axis::linear("Energy above Ev (eV)"),
        series,
        marks: vec![],
        legend: Corner::TopRight,
    }
}

/// The material, doping and solver options of the carriers inputs as typed, or the first
/// field's message. The same reading as [`Reading`], in one call, for the sign-off record
/// (`crate::record`), which recomputes a calculation from its inputs.
pub fn problem_from_inputs(
    c: &CarrierInputs,
) -> Result<(Material, Vec<DopantDensity>, SolveOptions), String> {
    let material = material_of(&c.material)?;
    let doping = read_rows(&material, &c.dopants)
        .into_iter()
        .map(|r| {
            Ok(DopantDensity {
                dopant: r.species?,
                density_cm3: r.density_cm3?,
            })
        })
        .collect::<Result<Vec<_>, String>>()?;
    let options = SolveOptions {
        intrinsic_model: intrinsic_model(&c.intrinsic_model, &material)?,
        band_gap_narrowing: band_gap_narrowing(c.band_gap_narrowing, &material)?,
        ionization_model: ionization_model(&c.ionization_model)?,
    };
    Ok((material, doping, options))
}

/// The full request of the carriers inputs as typed, or the first field's message (see
/// [`problem_from_inputs`]).
pub fn request_from_inputs(c: &CarrierInputs) -> Result<Request, String> {
    let (material, doping, options) = problem_from_inputs(c)?;
    Ok(Request {
        material,
        temperature_k: entry::temperature_k("temperature", &c.temperature)?,
        doping,
        options,
        mobility_key: c.mobility_model.clone(),
        thickness_cm: entry::positive(
            "thickness",
            &c.thickness,
            bandgauge_core::units::QuantityKind::Length,
            "cm",
        )?,
    })
}

/// `(quantity, model, source)` of every model an outcome used, with the mobility notes: what
/// the caution lists and the sign-off report prints.
pub fn models_used(o: &Outcome) -> Vec<(String, String, String)> {
    let used: &[_] = match &o.transport {
        Ok(t) => &t.models,
        Err(_) => &o.equilibrium.models,
    };
    let mut list: Vec<(String, String, String)> = used
        .iter()
        .map(|m| {
            (
                m.quantity.to_string(),
                m.model.to_string(),
                m.source.to_string(),
            )
        })
        .collect();
    if let Ok(t) = &o.transport {
        list.extend(
            t.notes
                .iter()
                .map(|n| ("mobility note".into(), n.clone(), String::new())),
        );
    }
    list
}

/// The carriers-view inputs, read into core types (memos, shared with the sweep view).
#[derive(Clone, Copy)]
pub struct Reading {
    /// The material, or the message for its field.
    pub material: Memo<Result<Material, String>>,
    /// Temperature in K, or the message.
    pub temperature_k: Memo<entry::Parsed>,
    /// Dopant rows.
    pub rows: Memo<Vec<RowReading>>,
    /// Intrinsic model, or the message.
    pub intrinsic: Memo<Result<IntrinsicModel, String>>,
    /// Band-gap narrowing option, or the message.
    pub bgn: Memo<Result<Option<BgnModel>, String>>,
    /// Dopant-level model, or the message.
    pub ionization: Memo<Result<IonizationModel, String>>,
    /// Thickness in cm, or the message.
    pub thickness_cm: Memo<entry::Parsed>,
    /// The material, doping and options when all of them are valid (the sweep needs no more).
    pub problem: Memo<Option<(Material, Vec<DopantDensity>, SolveOptions)>>,
    /// The full request when every input is valid.
    pub request: Memo<Option<Request>>,
}

impl Reading {
    /// Memos reading the carriers inputs of `bench`.
    pub fn new(bench: Bench) -> Reading {
        let inputs = bench.inputs;
        let material = Memo::new(move |_| inputs.with(|w| material_of(&w.carriers.material)));
        let temperature_k = Memo::new(move |_| {
            inputs.with(|w| entry::temperature_k("temperature", &w.carriers.temperature))
        });
        let rows = Memo::new(move |_| match material.get() {
            Ok(m) => inputs.with(|w| read_rows(&m, &w.carriers.dopants)),
            Err(_) => Vec::new(),
        });
        let intrinsic = Memo::new(move |_| {
            let key = inputs.with(|w| w.carriers.intrinsic_model.clone());
            material.with(|m| {
                m.as_ref()
                    .map_err(Clone::clone)
                    .and_then(|m| intrinsic_model(&key, m))
            })
        });
        let bgn = Memo::new(move |_| {
            let on = inputs.with(|w| w.carriers.band_gap_narrowing);
            material.with(|m| {
                m.as_ref()
                    .map_err(Clone::clone)
                    .and_then(|m| band_gap_narrowing(on, m))
            })
        });
        let ionization =
            Memo::new(move |_| inputs.with(|w| ionization_model(&w.carriers.ionization_model)));
        let thickness_cm = Memo::new(move |_| {
            inputs.with(|w| {
                entry::positive(
                    "thickness",
                    &w.carriers.thickness,
                    bandgauge_core::units::QuantityKind::Length,
                    "cm",
                )
            })
        });
        let problem = Memo::new(move |_| {
            let material = material.get().ok()?;
            let doping = rows
                .get()
                .into_iter()
                .map(|r| {
                    Some(DopantDensity {
                        dopant: r.species.ok()?,
                        density_cm3: r.density_cm3.ok()?,
                    })
                })
                .collect::<Option<Vec<_>>>()?;
            let options = SolveOptions {
                intrinsic_model: intrinsic.get().ok()?,
                band_gap_narrowing: bgn.get().ok()?,
                ionization_model: ionization.get().ok()?,
            };
            Some((material, doping, options))
        });
        let request = Memo::new(move |_| {
            let (material, doping, options) = problem.get()?;
            Some(Request {
                material,
                temperature_k: temperature_k.get().ok()?,
                doping,
                options,
                mobility_key: inputs.with(|w| w.carriers.mobility_model.clone()),
                thickness_cm: thickness_cm.get().ok()?,
            })
        });
        Reading {
            material,
            temperature_k,
            rows,
            intrinsic,
            bgn,
            ionization,
            thickness_cm,
            problem,
            request,
        }
    }
}

/// The view.
#[component]
pub fn CarriersView(
    /// The shared inputs and layout handles.
    bench: Bench,
) -> impl IntoView {
    let inputs = bench.inputs;
    let reading = Reading::new(bench);
    let outcome = Memo::new(move |_| reading.request.get().map(|r| evaluate(&r)));
    // The last valid outcome stays on screen while a field is being fixed.
    let shown = Memo::new(
        move |previous: Option<&Option<Outcome>>| match outcome.get() {
            Some(Ok(o)) => Some(o),
            _ => previous.cloned().flatten(),
        },
    );
    let problem = Memo::new(move |_| match outcome.get() {
        None => {
            Some("Showing the last valid result: correct the marked field to update.".to_string())
        }
        Some(Err(e)) => Some(format!(
            "Cannot compute: {e}. Showing the last valid result."
        )),
        Some(Ok(_)) => None,
    });

    let (temperature, set_temperature) =
        bench.text(|w| &w.carriers.temperature, |w| &mut w.carriers.temperature);
    let (thickness, set_thickness) =
        bench.text(|w| &w.carriers.thickness, |w| &mut w.carriers.thickness);
    let (material_key, set_material) =
        bench.text(|w| &w.carriers.material, |w| &mut w.carriers.material);
    let (intrinsic_key, set_intrinsic) = bench.text(
        |w| &w.carriers.intrinsic_model,
        |w| &mut w.carriers.intrinsic_model,
    );
    let (ionization_key, set_ionization) = bench.text(
        |w| &w.carriers.ionization_model,
        |w| &mut w.carriers.ionization_model,
    );
    let ionization_error = Signal::derive(move || reading.ionization.get().err());
    let (mobility_key, set_mobility) = bench.text(
        |w| &w.carriers.mobility_model,
        |w| &mut w.carriers.mobility_model,
    );

    let material_choices = Signal::derive(|| {
        materials::builtin()
            .into_iter()
            .map(|m| (m.id, m.name))
            .collect()
    });
    let intrinsic_choices = Signal::derive(move || {
        reading
            .material
            .get()
            .map(|m| intrinsic_choices(&m))
            .unwrap_or_default()
    });
    // Models with parameters for this material and at least one of its species.
    let mobility_choices = Signal::derive(move || {
        let Ok(m) = reading.material.get() else {
            return Vec::new();
        };
        let mut choices = vec![(String::new(), "First that applies".to_string())];
        choices.extend(
            MobilityModel::ALL
                .into_iter()
                .filter(|model| m.dopants.iter().any(|d| model.applicable(&m.id, &d.symbol)))
                .map(|model| (model.id().to_string(), model.name().to_string())),
        );
        choices
    });
    let error_of = |m: Memo<entry::Parsed>| Signal::derive(move || m.get().err());
    let material_error = Signal::derive(move || reading.material.get().err());
    let intrinsic_error = Signal::derive(move || reading.intrinsic.get().err());
    let bgn_error = Signal::derive(move || reading.bgn.get().err());
    let mobility_error = Signal::derive(move || match outcome.get() {
        Some(Ok(o)) => o.transport.err(),
        _ => None,
    });
    let transport_problem = Memo::new(move |_| {
        shown.with(|o| {
            let o = o.as_ref()?;
            o.transport.as_ref().err().cloned()
        })
    });
    let bgn_on = Memo::new(move |_| inputs.with(|w| w.carriers.band_gap_narrowing));
    let bgn_label = move || {
        reading
            .material
            .get()
            .ok()
            .and_then(|m| {
                m.band_gap_narrowing
                    .map(|b| format!("Band-gap narrowing ({})", b.name))
            })
            .unwrap_or_else(|| "Band-gap narrowing".into())
    };

    let diagram = Signal::derive(move || shown.with(|o| o.as_ref().map(band_diagram)));
    let models =
        Signal::derive(move || shown.with(|o| o.as_ref().map(models_used).unwrap_or_default()));

    view! {
        <div class="workspace">
            <section class="inputs" aria-label="Sample and models">
                <h2>"Sample"</h2>
                <SelectField id="material" label="Material" choices=material_choices value=material_key
                    on_change=set_material error=material_error />
                <NumberField id="temperature" label="Temperature" hint="K, or C (e.g. 300, 27 C)"
                    value=temperature on_input=set_temperature error=error_of(reading.temperature_k) />
                <DopantRows bench=bench reading=reading />
                <NumberField id="thickness" label="Layer thickness (for sheet resistance)" hint="um, mm or cm"
                    value=thickness on_input=set_thickness error=error_of(reading.thickness_cm) />
                <h2>"Models"</h2>
                <SelectField id="intrinsic-model" label="Intrinsic density" choices=intrinsic_choices
                    value=intrinsic_key on_change=set_intrinsic error=intrinsic_error />
                <SelectField id="ionization-model" label="Dopant levels" choices=Signal::derive(ionization_choices)
                    value=ionization_key on_change=set_ionization error=ionization_error />
                <div class="field check" class:invalid=move || bgn_error.with(Option::is_some)>
                    <div class="check-line">
                        <input type="checkbox" id="bgn" data-testid="bgn"
                            aria-describedby="bgn-error"
                            prop:checked=move || bgn_on.get()
                            on:change=move |ev| { let on = event_target_checked(&ev); bench.edit(|w| w.carriers.band_gap_narrowing = on) } />
                        <label for="bgn">{bgn_label}</label>
                    </div>
                    <span class="message" id="bgn-error" data-testid="bgn-error" aria-live="polite">
                        {move || bgn_error.get().unwrap_or_default()}
                    </span>
                </div>
                <SelectField id="mobility-model" label="Mobility" choices=mobility_choices
                    value=mobility_key on_change=set_mobility error=mobility_error />
            </section>
            <section class="outputs" aria-label="Results">
                <div class="status" role="status" data-testid="status">
                    {move || problem.get().map(|p| view! { <p class="stale">{p}</p> })}
                </div>
                <div class="result-grid">
                    <div class="result-column">
                        <h2>"Bands and carriers"</h2>
                        <dl class="results">{result_lines(shown, &BAND_LINES)}</dl>
                        <h2>"Transport"</h2>
                        <dl class="results">{result_lines(shown, &TRANSPORT_LINES)}</dl>
                        {move || {
                            transport_problem.get().map(|t| view! { <p class="hint" data-testid="transport-note">{t}</p> })
                        }}
                    </div>
                    <div class="result-column">
                        <ChartPanel id="band-diagram" spec=diagram layout=bench.layout input_at=bench.input_at />
                        <SpeciesTable shown=shown />
                    </div>
                </div>
                <Caution models=models />
            </section>
        </div>
    }
}

/// One result line: test id, term, unit and the formatting of the value.
pub type Line = (
    &'static str,
    &'static str,
    &'static str,
    fn(&Outcome) -> String,
);

/// Band quantities, carriers and the Fermi level.
pub const BAND_LINES: [Line; 10] = [
    ("eg", "Band gap Eg", "eV", |o| {
        format::fixed(o.equilibrium.band_gap_ev, 4)
    }),
    ("nc", "Nc", "cm⁻³", |o| format::sci(o.equilibrium.nc_cm3)),
    ("nv", "Nv", "cm⁻³", |o| format::sci(o.equilibrium.nv_cm3)),
    ("ni", "Intrinsic density ni", "cm⁻³", |o| {
        format::sci(o.equilibrium.intrinsic_cm3)
    }),
    ("n", "Electrons n", "cm⁻³", |o| {
        format::sci(o.equilibrium.electrons_cm3)
    }),
    ("p", "Holes p", "cm⁻³", |o| {
        format::sci(o.equilibrium.holes_cm3)
    }),
    ("ef-ev", "EF − Ev", "eV", |o| {
        format::fixed(o.equilibrium.fermi_minus_valence_ev, 4)
    }),
    ("ef-ec", "EF − Ec", "eV", |o| {
        format::fixed(o.equilibrium.fermi_minus_conduction_ev, 4)
    }),
    ("ef-mid", "EF − midgap", "eV", |o| {
        format::fixed(o.equilibrium.fermi_minus_midgap_ev, 4)
    }),
    ("regime", "Regime", "", |o| regime_text(&o.equilibrium)),
];

/// Mobilities, resistivity and sheet resistance ("—" where the core gives none).
pub const TRANSPORT_LINES: [Line; 4] = [
    ("mu-n", "Electron mobility μn", "cm²/V·s", |o| {
        o.transport.as_ref().map_or("—".into(), |t| {
            format::auto(t.electron_mobility_cm2_per_v_s)
        })
    }),
    ("mu-p", "Hole mobility μp", "cm²/V·s", |o| {
        o.transport
            .as_ref()
            .map_or("—".into(), |t| format::auto(t.hole_mobility_cm2_per_v_s))
    }),
    ("resistivity", "Resistivity ρ", "Ω·cm", |o| {
        o.transport
            .as_ref()
            .map_or("—".into(), |t| format::auto(t.resistivity_ohm_cm))
    }),
    ("sheet-resistance", "Sheet resistance Rs", "Ω/□", |o| {
        o.sheet_ohm_sq
            .as_ref()
            .map_or("—".into(), |v| format::auto(*v))
    }),
];

/// The result lines of a list, showing `shown` (an em dash before the first valid result).
fn result_lines(shown: Memo<Option<Outcome>>, lines: &'static [Line]) -> impl IntoView + use<> {
    lines
        .iter()
        .map(|&(id, term, unit, format)| {
            let value = Signal::derive(move || {
                shown.with(|o| o.as_ref().map_or_else(|| "—".into(), format))
            });
            view! { <ResultLine id=id term=term unit=unit value=value /> }
        })
        .collect_view()
}

fn regime_text(eq: &Equilibrium) -> String {
    let regime = eq.regime.to_string();
    if eq.degenerate {
        format!("{regime}, degenerate")
    } else {
        regime
    }
}

/// The ionization of each species, with the level model it used (a species without a
/// parameter set of the chosen model falls back to another, see `bandgauge_core::ionization`).
#[component]
fn SpeciesTable(shown: Memo<Option<Outcome>>) -> impl IntoView {
    view! {
        <table class="species" data-testid="species-table">
            <caption>"Ionization by species"</caption>
            <thead>
                <tr>
                    <th scope="col">"Species"</th>
                    <th scope="col">"Level"</th>
                    <th scope="col">"Level model"</th>
                    <th scope="col">"Density (cm⁻³)"</th>
                    <th scope="col">"Ionized (cm⁻³)"</th>
                    <th scope="col">"Ionized fraction"</th>
                </tr>
            </thead>
            <tbody>
                {move || {
                    shown.with(|o| {
                        o.as_ref()
                            .map(|o| {
                                o.equilibrium
                                    .species
                                    .iter()
                                    .enumerate()
                                    .map(|(i, s)| {
                                        let level = match s.kind {
                                            DopantKind::Donor => format!("Ec − {:.0} meV", 1e3 * s.level_from_band_edge_ev),
                                            DopantKind::Acceptor => format!("Ev + {:.0} meV", 1e3 * s.level_from_band_edge_ev),
                                        };
                                        view! {
                                            <tr>
                                                <th scope="row">{format!("{} ({})", s.symbol, s.kind)}</th>
                                                <td>{level}</td>
                                                <td title=s.level_model.name() data-testid=format!("species-{i}-level-model")>{s.level_model.id()}</td>
                                                <td>{format::sci(s.density_cm3)}</td>
                                                <td>{format::sci(s.ionized_cm3)}</td>
                                                <td data-testid=format!("species-{i}-fraction")>{format::percent(s.ionized_fraction, 2)}</td>
                                            </tr>
                                        }
                                    })
                                    .collect_view()
                            })
                            .unwrap_or_default()
                    })
                }}
            </tbody>
        </table>
    }
}

/// The editable list of dopant rows.
#[component]
fn DopantRows(bench: Bench, reading: Reading) -> impl IntoView {
    let inputs = bench.inputs;
    let count = Memo::new(move |_| inputs.with(|w| w.carriers.dopants.len()));
    let species_choices = Signal::derive(move || {
        reading
            .material
            .get()
            .map(|m| {
                m.dopants
                    .iter()
                    .map(|d| (d.symbol.to_string(), format!("{} ({})", d.symbol, d.kind)))
                    .collect::<Vec<Choice>>()
            })
            .unwrap_or_default()
    });
    let add = move |kind: DopantKind| {
        let symbol = reading
            .material
            .get_untracked()
            .ok()
            .and_then(|m| {
                m.dopants
                    .iter()
                    .find(|d| d.kind == kind)
                    .map(|d| d.symbol.clone())
            })
            .unwrap_or_default();
        bench.edit(|w| {
            w.carriers
                .dopants
                .push(DopantRow::new(&symbol, "1e15 cm^-3"))
        });
    };
    let row = move |i: usize| {
        let species = Memo::new(move |_| {
            inputs.with(|w| {
                w.carriers
                    .dopants
                    .get(i)
                    .map(|r| r.species.clone())
                    .unwrap_or_default()
            })
        });
        let density = Memo::new(move |_| {
            inputs.with(|w| {
                w.carriers
                    .dopants
                    .get(i)
                    .map(|r| r.density.clone())
                    .unwrap_or_default()
            })
        });
        let set_species = Callback::new(move |s: String| {
            bench.edit(|w| {
                if let Some(r) = w.carriers.dopants.get_mut(i) {
                    r.species = s
                }
            })
        });
        let set_density = Callback::new(move |s: String| {
            bench.edit(|w| {
                if let Some(r) = w.carriers.dopants.get_mut(i) {
                    r.density = s
                }
            })
        });
        let species_error = Signal::derive(move || {
            reading
                .rows
                .with(|r| r.get(i).and_then(|r| r.species.clone().err()))
        });
        let density_error = Signal::derive(move || {
            reading
                .rows
                .with(|r| r.get(i).and_then(|r| r.density_cm3.clone().err()))
        });
        let remove = move |_| {
            bench.edit(|w| {
                if i < w.carriers.dopants.len() {
                    w.carriers.dopants.remove(i);
                }
            })
        };
        let species_id = format!("dopant-{i}-species");
        let density_id = format!("dopant-{i}-density");
        view! {
            <div class="dopant-row">
                <SelectField id=species_id label="Species" hide_label=true row=i + 1 choices=species_choices value=species
                    on_change=set_species error=species_error />
                <NumberField id=density_id label="Density" hide_label=true row=i + 1 value=density on_input=set_density
                    error=density_error />
                <button type="button" class="remove" data-testid=format!("dopant-{i}-remove") on:click=remove
                    aria-label=move || format!("Remove dopant row {} ({})", i + 1, species.get())>"✕"</button>
            </div>
        }
    };
    view! {
        <fieldset class="dopants">
            <legend>"Dopants"</legend>
            <div class="dopant-head" aria-hidden="true">
                <span>"Species"</span>
                <span>"Density"</span>
            </div>
            {move || (0..count.get()).map(row).collect_view()}
            <p class="hint">
                {move || if count.get() == 0 { "No dopants: intrinsic material." } else { "cm^-3 (default) or m^-3; 1e15, 2.3x10^15" }}
            </p>
            <div class="row-buttons">
                <button type="button" data-testid="add-donor" on:click=move |_| add(DopantKind::Donor)>"+ Donor"</button>
                <button type="button" data-testid="add-acceptor" on:click=move |_| add(DopantKind::Acceptor)>"+ Acceptor"</button>
            </div>
        </fieldset>
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn si() -> Material {
        materials::silicon()
    }

    fn request(rows: &[(&str, f64)], temperature_k: f64) -> Request {
        let m = si();
        Request {
            doping: rows
                .iter()
                .map(|(s, n)| DopantDensity {
                    dopant: m.dopant(s).expect("species"),
                    density_cm3: *n,
                })
                .collect(),
            material: m,
            temperature_k,
            options: SolveOptions::default(),
            mobility_key: String::new(),
            thickness_cm: 0.0525,
        }
    }

    #[test]
    fn outcome_matches_the_core_solver() {
        let r = request(&[("P", 1e15), ("B", 1e14)], 300.0);
        let o = evaluate(&r).expect("solves");
        let direct = neutrality::solve(&r.material, 300.0, &r.doping, &r.options).expect("core");
        assert_eq!(o.equilibrium, direct);
        let options = PhysicsOptions::with_mobility(MobilityModel::Masetti);
        let mix = resistivity::resistivity_of_mix(&r.material, 300.0, &r.doping, &options);
        assert_eq!(o.transport, mix.map_err(|e| e.to_string()));
        let rho = o
            .transport
            .as_ref()
            .expect("mixed doping has a resistivity")
            .resistivity_ohm_cm;
        assert_eq!(o.sheet_ohm_sq, Ok(rho / 0.0525));
        let single = evaluate(&request(&[("P", 1e15)], 300.0)).expect("solves");
        let one = resistivity::resistivity_from_density(&r.material, "P", 1e15, 300.0, &options)
            .expect("core");
        let rho = single.transport.expect("rho").resistivity_ohm_cm;
        assert_eq!(rho, one.resistivity_ohm_cm);
        assert_eq!(single.sheet_ohm_sq, Ok(rho / 0.0525));
    }

    #[test]
    fn automatic_mobility_model_follows_the_majority_species() {
        // Ga majority (p-type): Masetti has no Ga set, so the first that applies is Arora.
        let o =
            evaluate(&request(&[("P", 1e15), ("B", 1e16), ("Ga", 2e16)], 300.0)).expect("solves");
        let t = o.transport.expect("transport");
        assert_eq!(
            (t.mobility_species.as_str(), t.mobility_model),
            ("Ga", MobilityModel::Arora)
        );
        // P majority: Masetti with its P set.
        let o = evaluate(&request(&[("P", 2e16), ("Ga", 1e16)], 300.0)).expect("solves");
        let t = o.transport.expect("transport");
        assert_eq!(
            (t.mobility_species.as_str(), t.mobility_model),
            ("P", MobilityModel::Masetti)
        );
        // Masetti named for a Ga-majority sample is refused with the core's message.
        let mut r = request(&[("Ga", 1e16)], 300.0);
        r.mobility_key = "masetti".into();
        assert!(evaluate(&r).expect("solves").transport.is_err());
    }

    #[test]
    fn model_keys_are_checked_against_the_material() {
        let m = si();
        assert_eq!(intrinsic_model("", &m), Ok(IntrinsicModel::DensityOfStates));
        assert_eq!(intrinsic_model("fit", &m), Ok(IntrinsicModel::DirectFit));
        assert!(intrinsic_model("x", &m).unwrap_err().contains("'x'"));
        assert_eq!(
            band_gap_narrowing(true, &m),
            Ok(Some(BgnModel::MaterialSet))
        );
        let gaas = materials::by_id("gaas").expect("gaas");
        if gaas.band_gap_narrowing.is_none() {
            assert!(band_gap_narrowing(true, &gaas).is_err());
        }
        assert_eq!(
            mobility_model("", &m, "B"),
            Ok(Some(MobilityModel::Masetti))
        );
        assert!(mobility_model("caughey-thomas", &m, "B").is_err());
    }

    #[test]
    fn rows_report_unknown_species_and_bad_densities() {
        let rows = read_rows(
            &si(),
            &[DopantRow::new("Xx", "1e15"), DopantRow::new("P", "-1")],
        );
        assert!(
            rows[0]
                .species
                .as_ref()
                .unwrap_err()
                .starts_with("species:")
        );
        assert!(
            rows[1]
                .density_cm3
                .as_ref()
                .unwrap_err()
                .starts_with("P density:")
        );
    }

    #[test]
    fn band_diagram_places_levels_to_scale() {
        let o = evaluate(&request(&[("P", 1e16), ("B", 1e15)], 300.0)).expect("solves");
        let spec = band_diagram(&o);
        let eg = o.equilibrium.band_gap_ev;
        let y_of = |name: &str| {
            spec.series
                .iter()
                .find(|s| s.name.starts_with(name))
                .expect(name)
                .points[0]
                .1
        };
        assert_eq!(y_of("Ec"), eg);
        assert_eq!(y_of("Ev"), 0.0);
        assert_eq!(y_of("EF"), o.equilibrium.fermi_minus_valence_ev);
        let [p, b] = [&o.equilibrium.species[0], &o.equilibrium.species[1]];
        assert_eq!(
            y_of("P level"),
            eg - p.level_from_band_edge_ev,
            "donor level below Ec"
        );
        assert_eq!(
            y_of("B level"),
            b.level_from_band_edge_ev,
            "acceptor level above Ev"
        );
        // The dilute levels are Sze's 45 meV; at these densities the level barely moves.
        assert!((p.level_from_band_edge_ev - 0.045).abs() < 2e-3);
    }
}
