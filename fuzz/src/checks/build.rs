//! Structured inputs built from fuzz bytes with `arbitrary`: a workbench as the page could
//! hold it, and the lots view's inputs.
//!
//! Each text field is, three times in four, one of the values an engineer types (so that
//! calculations run to the end), else any text (so that every error path is reached).
//! Species are symbols from a material's list in the page: letters and digits only.

use arbitrary::{Result, Unstructured};
use bandgauge_app::record::{LotFile, LotInputs};
use bandgauge_app::state::{
    CarrierInputs, ConversionInputs, DopantRow, Given, HallInputs, SweepInputs, View, Workbench,
};

/// A typical value, or any text.
fn text(u: &mut Unstructured<'_>, typical: &[&str]) -> Result<String> {
    if !typical.is_empty() && u.ratio(3, 4)? {
        Ok((*u.choose(typical)?).to_owned())
    } else {
        u.arbitrary()
    }
}

const TEMPERATURES: &[&str] = &[
    "300 K", "300", "27 C", "77", "4.2 K", "1e-3", "1e4 K", "-5", "0",
];
const DENSITIES: &[&str] = &[
    "1e15 cm^-3",
    "1e15",
    "2.3x10^15",
    "1e19",
    "1e23",
    "0",
    "1e21 m^-3",
];
const LENGTHS: &[&str] = &["525 um", "0.0525", "1 mm", "150 mm", "0", "1e-9 cm"];

/// A workbench with any view.
pub fn workbench(u: &mut Unstructured<'_>) -> Result<Workbench> {
    let rows = u.int_in_range(0..=3)?;
    let mut dopants = Vec::with_capacity(rows);
    for _ in 0..rows {
        let species: String = text(u, &["P", "B", "As", "Sb", "Ga", "In", "Al", "N", "Si"])?
            .chars()
            .filter(char::is_ascii_alphanumeric)
            .collect();
        dopants.push(DopantRow {
            species,
            density: text(u, DENSITIES)?,
        });
    }
    Ok(Workbench {
        view: *u.choose(&View::ALL)?,
        carriers: CarrierInputs {
            material: text(u, &["si", "ge", "gaas", "gan"])?,
            temperature: text(u, TEMPERATURES)?,
            dopants,
            intrinsic_model: text(u, &["", "dos", "fit"])?,
            ionization_model: text(u, &["", "altermatt", "pearson-bardeen", "dilute"])?,
            band_gap_narrowing: u.arbitrary()?,
            mobility_model: text(u, &["", "masetti", "arora", "caughey-thomas", "lattice"])?,
            thickness: text(u, LENGTHS)?,
        },
        sweep: SweepInputs {
            from: text(u, TEMPERATURES)?,
            to: text(u, TEMPERATURES)?,
            points: text(u, &["2", "11", "131", "1000", "1", "0"])?,
        },
        conversion: ConversionInputs {
            given: *u.choose(&[Given::Resistivity, Given::Density])?,
            value: text(u, &["10 ohm-cm", "1e17", "0.001", "1e4", "1e15 cm^-3"])?,
            dopant: text(u, &["B", "P", "As", "Sb", "Ga"])?,
            probe_current: text(u, &["1 mA", "0.001", "1 uA", "0"])?,
            probe_voltage: text(u, &["4.5 mV", "0.01", "1 V"])?,
            probe_spacing: text(u, &["1 mm", "1.59 mm", "0.1"])?,
            probe_geometry: text(u, &["thin-layer", "bulk", "", "Thin Layer"])?,
            sample_thickness: text(u, LENGTHS)?,
            wafer_diameter: text(u, &["150 mm", "200 mm", "", "1 mm"])?,
            probe_temperature: text(u, &["23 C", "25 C", "", "300 K"])?,
        },
        hall: HallInputs {
            r_a: text(u, &["532 ohm", "1e300", "0", "10 kohm"])?,
            r_b: text(u, &["506 ohm", "1e-300", "10", "5 T"])?,
            thickness: text(u, LENGTHS)?,
            hall_voltage: text(u, &["-1.56 mV", "0", "2 uV", "1e308"])?,
            current: text(u, &["10 uA", "1 mA", "0"])?,
            field: text(u, &["5000 G", "0.5 T", "0", "5 kG"])?,
            scattering: text(u, &["unity", "acoustic-phonon", "1.18", "50", "x"])?,
            dopant: text(u, &["P", "B", "As", "Ga", "N"])?,
            temperature: text(u, TEMPERATURES)?,
        },
    })
}

/// The lots view's inputs: up to three files, typical or any text.
pub fn lot_inputs(u: &mut Unstructured<'_>) -> Result<LotInputs> {
    let count = u.int_in_range(0..=3)?;
    let mut files = Vec::with_capacity(count);
    for i in 0..count {
        files.push(LotFile {
            name: format!("lot-{i}.csv"),
            text: text(
                u,
                &[
                    "lot,wafer,site,resistivity [ohm-cm]\nA1,1,1,10.1\nA1,1,2,9.9\nA1,2,1,10\n",
                    "lot;wafer;type;resistivity\nB;1;n;5,1\nB;1;n;4,9\nB;2;n;5\n",
                    "# dopant: P\n# thickness: 675 um\n# spacing: 1 mm\nlot,wafer,volts [mV],amps [mA]\nC,1,28.7,1\nC,1,29.1,1\n",
                ],
            )?,
        });
    }
    Ok(LotInputs {
        default_dopant: text(u, &["", "B", "P"])?,
        spec_quantity: text(u, &["resistivity", "density"])?,
        spec_min: text(u, &["", "8", "1e14", "9.5"])?,
        spec_max: text(u, &["", "12", "1e15", "10.5"])?,
        files,
    })
}
