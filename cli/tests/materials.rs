//! `bandgauge materials`: the listing against bandgauge-core and published parameters.

mod support;

use bandgauge_core::materials::{self, Material};
use serde_json::Value;
use support::{json, number, relative_difference, success};

/// The Varshni parameters are stored as published; JSON round trips f64 exactly.
const EXACT: f64 = 0.0;
/// Eg(300 K) shown with four significant digits in the table.
const TABLE_DIGITS_EV: f64 = 5e-4;

/// Same constants in a differently optimised build (the binary versus this test):
/// products like 10.4 meV x 1e-3 may round to a neighbouring f64.
const SAME_CODE_OTHER_BUILD: f64 = 1e-15;

/// `actual` equals `expected` in every text and within `SAME_CODE_OTHER_BUILD` in every number.
fn assert_close(actual: &Value, expected: &Value, path: &str) {
    match (actual, expected) {
        (Value::Number(a), Value::Number(e)) => {
            let (a, e) = (a.as_f64().unwrap(), e.as_f64().unwrap());
            assert!(
                a == e || relative_difference(a, e) < SAME_CODE_OTHER_BUILD,
                "{path}: {a} vs {e}"
            );
        }
        (Value::Array(a), Value::Array(e)) => {
            assert_eq!(a.len(), e.len(), "{path}");
            for (index, (a, e)) in a.iter().zip(e).enumerate() {
                assert_close(a, e, &format!("{path}[{index}]"));
            }
        }
        (Value::Object(a), Value::Object(e)) => {
            assert_eq!(
                a.keys().collect::<Vec<_>>(),
                e.keys().collect::<Vec<_>>(),
                "{path}"
            );
            for (key, a) in a {
                assert_close(a, &e[key], &format!("{path}.{key}"));
            }
        }
        _ => assert_eq!(actual, expected, "{path}"),
    }
}

#[test]
fn json_lists_exactly_the_core_materials() {
    let output = json("materials --json");
    let listed: Vec<Material> =
        serde_json::from_value(output.clone()).expect("each entry is a whole material");
    assert_eq!(listed.len(), materials::builtin().len());
    assert_close(
        &output,
        &serde_json::to_value(materials::builtin()).unwrap(),
        "materials",
    );
    let ids: Vec<&str> = output
        .as_array()
        .unwrap()
        .iter()
        .map(|m| m["id"].as_str().unwrap())
        .collect();
    assert_eq!(ids, ["si", "ge", "gaas", "gan"]);
}

#[test]
fn published_silicon_parameters_with_their_sources() {
    let output = json("materials --json");
    let si = &output[0];
    // Source: Thurmond, J. Electrochem. Soc. 122, 1133 (1975): Eg0 = 1.17 eV,
    // alpha = 4.73e-4 eV/K, beta = 636 K.
    assert!((number(&si["varshni"], "eg0_ev") - 1.17).abs() <= EXACT);
    assert!((number(&si["varshni"], "alpha_ev_per_k") - 4.73e-4).abs() <= EXACT);
    assert!((number(&si["varshni"], "beta_k") - 636.0).abs() <= EXACT);
    assert!(
        si["sources"]["band_gap"]
            .as_str()
            .unwrap()
            .contains("Thurmond")
    );
    // Source: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), ch. 1: P 45 meV, B 45 meV,
    // In 160 meV in silicon.
    let dopants = si["dopants"].as_array().unwrap();
    let energy = |symbol: &str| {
        let d = dopants.iter().find(|d| d["symbol"] == symbol).unwrap();
        assert!(d["source"].as_str().unwrap().contains("Sze"));
        number(d, "ionization_energy_ev")
    };
    assert!((energy("P") - 0.045).abs() < 1e-12);
    assert!((energy("B") - 0.045).abs() < 1e-12);
    assert!((energy("In") - 0.160).abs() < 1e-12);
    // Every dopant carries a source.
    for m in output.as_array().unwrap() {
        for d in m["dopants"].as_array().unwrap() {
            assert!(
                !d["source"].as_str().unwrap().is_empty(),
                "{} {}",
                m["id"],
                d["symbol"]
            );
        }
    }
}

#[test]
fn table_names_each_material_parameter_and_source() {
    let text = success("materials");
    for material in materials::builtin() {
        assert!(
            text.contains(&format!("{} ({})\n", material.name, material.id)),
            "{}",
            material.id
        );
        for dopant in &material.dopants {
            assert!(
                text.lines().any(
                    |l| l.trim_start().starts_with(&format!("{} ", dopant.symbol))
                        && l.contains(&*dopant.source)
                ),
                "{} {}",
                material.id,
                dopant.symbol
            );
        }
    }
    // Source: Vurgaftman, Meyer, Ram-Mohan, J. Appl. Phys. 89, 5815 (2001), Table III:
    // GaAs Eg(300 K) = 1.422 eV from their Varshni set.
    let gaas_start = text
        .find("Gallium arsenide (gaas)")
        .or_else(|| text.find("(gaas)"))
        .unwrap();
    let gaas_gap = text[gaas_start..]
        .lines()
        .find(|l| l.trim_start().starts_with("Eg(300 K)"))
        .unwrap();
    let shown: f64 = gaas_gap.split_whitespace().nth(2).unwrap().parse().unwrap();
    assert!((shown - 1.422).abs() < TABLE_DIGITS_EV, "{gaas_gap}");
    assert!(
        text.trim_end().ends_with(
            "the fab's own specifications and the governing standards decide acceptance."
        )
    );
}
