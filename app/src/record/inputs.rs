//! A record's inputs outside the workbench: the lot files taken from the lots view, and every
//! input listed as the report prints it.

use sha2::{Digest, Sha256};

use super::{LotFile, LotInputs, RecordError, RecordedView, SignoffRecord};
use crate::lots_view;
use crate::state::Given;

/// The lot inputs of a record from what the lots view holds, or why there can be none.
pub fn lot_inputs(snapshot: &lots_view::LotsSnapshot) -> Result<LotInputs, RecordError> {
    let refuse = |reason: String| Err(RecordError::NotRecordable { reason });
    if snapshot.busy {
        return refuse("lot files are being read; wait until reading ends".into());
    }
    let Some(files) = &snapshot.files else {
        return refuse(format!(
            "the lot files are larger than a record carries ({} MiB in all at most)",
            lots_view::MAX_RECORDED_BYTES / (1024 * 1024)
        ));
    };
    let mut out = Vec::with_capacity(files.len());
    for (name, bytes) in files {
        match String::from_utf8(bytes.clone()) {
            Ok(text) => out.push(LotFile {
                name: name.clone(),
                text,
            }),
            Err(_) => {
                return refuse(format!(
                    "{name} is not UTF-8 text; a record carries text files only"
                ));
            }
        }
    }
    Ok(LotInputs {
        default_dopant: snapshot.read_dopant.clone(),
        spec_quantity: snapshot.inputs.quantity.clone(),
        spec_min: snapshot.inputs.spec_min.clone(),
        spec_max: snapshot.inputs.spec_max.clone(),
        files: out,
    })
}

/// The inputs of a record as the report lists them: `(label, as typed)`.
pub fn input_lines(record: &SignoffRecord) -> Vec<(String, String)> {
    let w = &record.inputs.workbench;
    let c = &w.carriers;
    let mut lines: Vec<(String, String)> = Vec::new();
    let mut push = |label: &str, value: &str| lines.push((label.to_owned(), value.to_owned()));
    let carriers_lines = |push: &mut dyn FnMut(&str, &str)| {
        push("Material", &c.material);
        push("Temperature", &c.temperature);
        if c.dopants.is_empty() {
            push("Dopants", "none (intrinsic)");
        }
        for (i, d) in c.dopants.iter().enumerate() {
            push(
                &format!("Dopant {}", i + 1),
                &format!("{} {}", d.species, d.density),
            );
        }
        push("Layer thickness", &c.thickness);
        push("Intrinsic density model", &c.intrinsic_model);
        push("Dopant-level model", &c.ionization_model);
        push(
            "Band-gap narrowing",
            if c.band_gap_narrowing { "on" } else { "off" },
        );
        let mobility = if c.mobility_model.is_empty() {
            "first that applies"
        } else {
            &c.mobility_model
        };
        push("Mobility model", mobility);
    };
    match record.view {
        RecordedView::PointCalculation => carriers_lines(&mut push),
        RecordedView::TemperatureSweep => {
            carriers_lines(&mut push);
            push("Sweep from", &w.sweep.from);
            push("Sweep to", &w.sweep.to);
            push("Temperatures", &w.sweep.points);
        }
        RecordedView::Conversion => {
            let v = &w.conversion;
            let given = match v.given {
                Given::Resistivity => "Resistivity given",
                Given::Density => "Dopant density given",
            };
            push(given, &v.value);
            push("Dopant", &v.dopant);
            push("Probe current", &v.probe_current);
            push("Probe voltage", &v.probe_voltage);
            push("Probe spacing", &v.probe_spacing);
            push("Sample thickness", &v.sample_thickness);
            push("Wafer diameter", &v.wafer_diameter);
            push("Temperature of the reading", &v.probe_temperature);
        }
        RecordedView::HallAnalysis => {
            let h = &w.hall;
            push("R_A", &h.r_a);
            push("R_B", &h.r_b);
            push("Layer thickness", &h.thickness);
            push("Hall voltage V2 - V4", &h.hall_voltage);
            push("Current", &h.current);
            push("Magnetic field", &h.field);
            push("Hall scattering factor", &h.scattering);
            push("Dopant (cross-check)", &h.dopant);
            push("Temperature of the measurement", &h.temperature);
        }
        RecordedView::LotComparison => {
            if let Some(l) = &record.inputs.lots {
                push("Spec limits on", &l.spec_quantity);
                push("Lower limit", &l.spec_min);
                push("Upper limit", &l.spec_max);
                let dopant = if l.default_dopant.is_empty() {
                    "none (files must say)"
                } else {
                    &l.default_dopant
                };
                push("Dopant for rows without one", dopant);
                for f in &l.files {
                    let sha: String = Sha256::digest(f.text.as_bytes())
                        .iter()
                        .take(8)
                        .map(|b| format!("{b:02x}"))
                        .collect();
                    push(
                        "Lot file",
                        &format!(
                            "{} ({} bytes, {} lines, SHA-256 {sha}…)",
                            f.name,
                            f.text.len(),
                            f.text.lines().count()
                        ),
                    );
                }
            }
        }
    }
    lines
}
