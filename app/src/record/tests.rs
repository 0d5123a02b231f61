//! Record unit tests: round trips per view, tampered and damaged files, versions, replay.

use serde_json::Value;
use sha2::{Digest, Sha256};

use super::digest::digest_of_value;
use super::error::short;
use super::*;
use crate::state::DopantRow;
use crate::{carriers, format, lots_view};

const CREATED: &str = "2025-03-14T09:26:53Z";

fn workbench(view: View) -> Workbench {
    let mut w = Workbench {
        view,
        ..Workbench::default()
    };
    w.carriers.dopants = vec![DopantRow::new("P", "1e16"), DopantRow::new("B", "2e15")];
    w.sweep.points = "21".into();
    w
}

fn demo_lots() -> LotInputs {
    LotInputs {
        default_dopant: String::new(),
        spec_quantity: "resistivity".into(),
        spec_min: lots_view::DEMO_SPEC.0.into(),
        spec_max: lots_view::DEMO_SPEC.1.into(),
        files: lots_view::DEMO_FILES
            .iter()
            .map(|(name, text)| LotFile {
                name: (*name).into(),
                text: (*text).into(),
            })
            .collect(),
    }
}

fn record(view: View) -> SignoffRecord {
    let lots = (view == View::Lots).then(demo_lots);
    capture(
        RecordInputs {
            workbench: workbench(view),
            lots,
        },
        CREATED,
    )
    .expect("valid inputs")
}

fn written(view: View) -> String {
    to_json(&record(view))
}

/// A record's text with one member replaced and the digest recomputed, as someone who
/// knows the format could do.
fn redigested(text: &str, change: impl FnOnce(&mut Value)) -> String {
    let mut value: Value = serde_json::from_str(text).expect("json");
    change(&mut value);
    let members = value.as_object_mut().expect("object");
    members.remove("digest");
    let digest = digest_of_value(&value);
    value["digest"] = Value::String(digest);
    value.to_string()
}

fn refused(text: &str) -> String {
    match read_record(text) {
        Ok(_) => panic!("read a bad record"),
        Err(e) => e.to_string(),
    }
}

#[test]
fn every_view_round_trips_to_identical_results() {
    for view in View::ALL {
        let original = record(view);
        let text = to_json(&original);
        let back = read_record(&text).unwrap_or_else(|e| panic!("{view:?}: {e}"));
        assert_eq!(back, original, "{view:?}");
        let replayed = replay(&back).unwrap_or_else(|e| panic!("{view:?}: {e}"));
        assert_eq!(replayed.results, original.results, "{view:?}");
        assert!(replayed.values > 5, "{view:?}: {}", replayed.values);
    }
}

#[test]
fn records_hold_what_each_view_shows() {
    let point = record(View::Carriers);
    let titles: Vec<&str> = point
        .results
        .sections
        .iter()
        .map(|s| s.title.as_str())
        .collect();
    assert_eq!(
        titles,
        ["Bands and carriers", "Transport", "Ionization by species"]
    );
    // The same outcome the carriers view shows, value for value.
    let request = carriers::request_from_inputs(&point.inputs.workbench.carriers).unwrap();
    let o = carriers::evaluate(&request).unwrap();
    let n = &point.results.sections[0].rows[4];
    assert_eq!(n.label, "Electrons n");
    assert_eq!(n.cells[0].exact, exact(o.equilibrium.electrons_cm3));
    assert_eq!(n.cells[0].shown, format::sci(o.equilibrium.electrons_cm3));
    assert_eq!(n.cells[0].unit, "cm⁻³");
    assert_eq!(
        exact(o.equilibrium.electrons_cm3).parse::<f64>(),
        Ok(o.equilibrium.electrons_cm3)
    );
    assert!(
        point
            .results
            .models
            .iter()
            .any(|m| m.quantity.contains("mobility"))
    );

    let sweep = record(View::Sweep);
    assert_eq!(sweep.results.sections[0].rows.len(), 21);

    let lots = record(View::Lots);
    let verdicts: Vec<(&str, &str)> = lots.results.sections[2]
        .rows
        .iter()
        .map(|r| (r.label.as_str(), r.cells[8].shown.as_str()))
        .collect();
    // Source: the demo scenario, demo-wafers/README.md (invented data).
    assert_eq!(
        verdicts,
        [
            ("C2-4417", "pass"),
            ("C2-4418", "pass"),
            ("C2-4421", "fail"),
            ("C2-4425", "marginal"),
            ("C2-4429", "pass"),
            ("C2-4432", "pass")
        ]
    );
    assert_eq!(
        lots.results.sections[1].rows[0].cells[0].shown,
        "resistivity 8 to 12 ohm-cm"
    );
}

#[test]
fn invalid_inputs_are_not_recorded() {
    let mut w = workbench(View::Carriers);
    w.carriers.temperature = "-5 K".into();
    let err = capture(
        RecordInputs {
            workbench: w,
            lots: None,
        },
        CREATED,
    )
    .unwrap_err();
    assert_eq!(
        err.to_string(),
        "inputs: temperature: -5 K is not allowed; give a temperature above 0 K (-273.15 C)"
    );
    let err = capture(
        RecordInputs {
            workbench: workbench(View::Lots),
            lots: None,
        },
        CREATED,
    )
    .unwrap_err();
    assert_eq!(
        err.to_string(),
        "no record written: no lot files are read; pick files or load the demo lots first"
    );
}

#[test]
fn tampered_input_is_refused_by_the_digest() {
    let text = written(View::Carriers).replace("\"1e16\"", "\"2e16\"");
    assert!(refused(&text).starts_with(
        "digest: the record was changed after it was written (its contents give digest "
    ));
    assert!(refused(&text).ends_with("; ask its author for the original file"));
}

#[test]
fn tampered_result_is_refused_by_the_digest() {
    let original = record(View::Carriers);
    let shown = &original.results.sections[0].rows[4].cells[0].exact;
    let text = to_json(&original).replacen(shown.as_str(), "1.5e16", 1);
    assert_ne!(text, to_json(&original));
    let message = refused(&text);
    assert!(
        message.starts_with("digest: the record was changed"),
        "{message}"
    );
    assert!(message.contains(&short(&original.digest)), "{message}");
}

#[test]
fn tampered_digest_is_refused() {
    let original = record(View::Resistivity);
    let text = to_json(&original).replace(&original.digest, &"0".repeat(64));
    let message = refused(&text);
    assert_eq!(
        message,
        format!(
            "digest: the record was changed after it was written (its contents give digest \
                 {}, the record says 000000000000…); ask its author for the original file",
            short(&original.digest)
        )
    );
}

#[test]
fn a_result_edited_with_a_new_digest_is_caught_by_the_replay() {
    let text = redigested(&written(View::Carriers), |v| {
        v["results"]["sections"][0]["rows"][4]["cells"][0]["shown"] =
            Value::String("9.999e15".into());
    });
    let record = read_record(&text).expect("a consistent record");
    let message = replay(&record).unwrap_err().to_string();
    assert!(
            message.starts_with(
                "result 'Bands and carriers' › 'Electrons n' › 'Value': the record says 9.999e15 cm⁻³ (exactly "
            ),
            "{message}"
        );
    assert!(
        message.ends_with(&format!(
            "; the record was written by bandgauge {APP_VERSION} (build {BUILD_COMMIT})"
        )),
        "{message}"
    );
}

#[test]
fn an_input_edited_with_a_new_digest_is_caught_by_the_replay() {
    let text = redigested(&written(View::Lots), |v| {
        v["inputs"]["lots"]["spec_max"] = Value::String("10".into());
    });
    let record = read_record(&text).expect("a consistent record");
    let message = replay(&record).unwrap_err().to_string();
    assert!(
            message.starts_with("result 'Spec window' › 'Spec window' › 'As read': the record says resistivity 8 to 12 ohm-cm, this bandgauge"),
            "{message}"
        );
    assert!(
        message.contains("computes resistivity 8 to 10 ohm-cm;"),
        "{message}"
    );
}

#[test]
fn newer_version_is_refused_naming_both_versions() {
    let text = redigested(&written(View::Carriers), |v| {
        v["format_version"] = Value::from(3);
        v["app_version"] = Value::String("9.1.0".into());
    });
    assert_eq!(
        refused(&text),
        format!(
            "format_version: the record was made by a newer bandgauge (record version 3); \
                 this bandgauge ({APP_VERSION}) reads record version 2 only; open it with \
                 bandgauge 9.1.0 or later"
        )
    );
    // A newer record is refused before its digest is looked at: its layout may differ.
    let text =
        written(View::Carriers).replacen("\"format_version\": 2", "\"format_version\": 7", 1);
    assert!(refused(&text).contains("(record version 7)"));
}

#[test]
fn unknown_and_older_versions_are_refused() {
    for (version, shown) in [("0", "0"), ("-1", "-1"), ("1.5", "1.5"), ("\"2\"", "\"2\"")] {
        let text = written(View::Carriers).replacen(
            "\"format_version\": 2",
            &format!("\"format_version\": {version}"),
            1,
        );
        assert_eq!(
            refused(&text),
            format!(
                "format_version: {shown} is not a record version bandgauge ever wrote; this \
                     bandgauge reads record version 2"
            )
        );
    }
    // Version 1 was written, before the probe geometry and the Holm adjustment: refused with a
    // message naming the bandgauge that wrote it, not silently upgraded.
    let text = redigested(&written(View::Resistivity), |v| {
        v["format_version"] = Value::from(1);
        v["app_version"] = Value::String("0.1.0".into());
    });
    assert_eq!(
        refused(&text),
        format!(
            "format_version: the record was made by an older bandgauge (record version 1); this \
             bandgauge ({APP_VERSION}) reads record version 2 only (since version 2 a probe \
             result states its sample geometry and a lot comparison its Holm-adjusted \
             p-values); open it with bandgauge 0.1.0"
        )
    );
}

#[test]
fn unknown_format_is_refused() {
    let text = written(View::Carriers).replacen(RECORD_FORMAT, "lab notebook page", 1);
    assert_eq!(
        refused(&text),
        "format: \"lab notebook page\" is not a format bandgauge reads; it reads \
             \"bandgauge sign-off record\""
    );
    assert_eq!(
        refused("{\"version\": 1}"),
        "the file is JSON but not a sign-off record: it has no \"format\" member; a record \
             is an object whose format is \"bandgauge sign-off record\""
    );
    assert_eq!(
        refused("[1, 2]"),
        "the file is JSON but not a sign-off record: it is a list, not an object; a record \
             is an object whose format is \"bandgauge sign-off record\""
    );
}

#[test]
fn truncated_empty_and_junk_files_are_refused() {
    let text = written(View::Carriers);
    let cut = &text[..text.len() / 2];
    let line = cut.lines().count();
    assert_eq!(
        refused(cut),
        format!(
            "the file is not a complete sign-off record: its text ends early, at line \
                 {line} (cut short while copying or saving?)"
        )
    );
    let empty = "the file is empty; a sign-off record is the JSON file bandgauge saves with \
                     'Save record'";
    assert_eq!(refused(""), empty);
    assert_eq!(refused(" \n\t"), empty);
    // Binary junk as a browser hands it over: invalid bytes become U+FFFD.
    let junk = String::from_utf8_lossy(&[0x89, b'P', b'N', b'G', 0x0d, 0x0a, 0x1a, 0, 0xff]);
    assert_eq!(
        refused(&junk),
        "the file is not a sign-off record: it is not JSON text (expected value at line 1 \
             column 1)"
    );
}

#[test]
fn missing_and_unknown_members_are_named() {
    let text = redigested(&written(View::Carriers), |v| {
        v.as_object_mut().unwrap().remove("created_utc");
    });
    assert_eq!(
        refused(&text),
        "created_utc: missing; every sign-off record has it"
    );
    let text = redigested(&written(View::Carriers), |v| {
        v["results"].as_object_mut().unwrap().remove("models");
    });
    assert_eq!(
        refused(&text),
        "results.models: missing; every sign-off record has it"
    );
    let text = redigested(&written(View::Carriers), |v| {
        v["inputs"]["workbench"]
            .as_object_mut()
            .unwrap()
            .remove("carriers");
    });
    assert_eq!(
        refused(&text),
        "inputs: a member \"carriers\" is missing inside it; every sign-off record has it"
    );
    let text = redigested(&written(View::Carriers), |v| {
        v["results"]["sections"][0]["rows"][0]["cells"][0]["exact"] = Value::from(1.1112);
    });
    assert_eq!(
        refused(&text),
        "results: invalid type: floating point `1.1112`, expected a string; a version 2 \
             record cannot have it"
    );
    let text = redigested(&written(View::Carriers), |v| {
        v["signed_by"] = Value::String("me".into());
    });
    assert!(refused(&text).starts_with("signed_by: is not a member of a version 2 record"));
    let text = written(View::Carriers);
    let no_digest = {
        let mut v: Value = serde_json::from_str(&text).unwrap();
        v.as_object_mut().unwrap().remove("digest");
        v.to_string()
    };
    assert_eq!(
        refused(&no_digest),
        "digest: missing; every sign-off record has it"
    );
    let text = redigested(&written(View::Carriers), |v| {
        v["view"] = Value::String("lot_comparison".into());
    });
    assert!(refused(&text).starts_with("inputs.workbench.view: Carriers does not match"));
}

#[test]
fn deep_nesting_and_large_junk_never_panic() {
    for depth in [127, 128, 129, 10_000, 1_000_000] {
        let text = format!("{}{}", "[".repeat(depth), "]".repeat(depth));
        assert!(read_record(&text).is_err());
        let text = format!("{}1{}", "{\"a\":".repeat(depth), "}".repeat(depth));
        assert!(read_record(&text).is_err());
    }
    let big = format!("{{\"format\":\"{}\"}}", "x".repeat(10_000_000));
    assert!(matches!(
        read_record(&big),
        Err(RecordError::UnknownFormat { .. })
    ));
}

#[test]
fn canonical_form_sorts_keys_and_escapes_like_json() {
    let v: Value = serde_json::from_str(
        "{\"b\":[1,{\"z\":null,\"a\":true}],\"a\":\"x\\n\\u0001é\",\"ä\":1,\"B\":2}",
    )
    .unwrap();
    let mut out = String::new();
    canonical_json(&v, &mut out);
    assert_eq!(
        out,
        "{\"B\":2,\"a\":\"x\\n\\u0001é\",\"b\":[1,{\"a\":true,\"z\":null}],\"ä\":1}"
    );
}

#[test]
fn digest_is_sha256_of_the_canonical_text() {
    // Source: FIPS 180-2, appendix B.1: SHA-256("abc").
    assert_eq!(
        Sha256::digest(b"abc")
            .iter()
            .map(|b| format!("{b:02x}"))
            .collect::<String>(),
        "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
    );
    let r = record(View::Carriers);
    let mut v = serde_json::to_value(&r).unwrap();
    v.as_object_mut().unwrap().remove("digest");
    let mut text = String::new();
    canonical_json(&v, &mut text);
    let hex: String = Sha256::digest(text.as_bytes())
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect();
    assert_eq!(r.digest, hex);
    assert_eq!(r.digest.len(), 64);
}

#[test]
fn file_names_carry_kind_and_time() {
    assert_eq!(
        file_name(&record(View::Lots)),
        "bandgauge-record-lots-20250314T092653Z.json"
    );
}

#[test]
fn input_lines_list_what_was_typed() {
    let lines = input_lines(&record(View::Carriers));
    assert!(lines.contains(&("Dopant 1".into(), "P 1e16".into())));
    assert!(lines.contains(&("Temperature".into(), "300 K".into())));
    let lines = input_lines(&record(View::Lots));
    assert_eq!(lines.iter().filter(|l| l.0 == "Lot file").count(), 6);
    assert!(lines.contains(&("Lower limit".into(), "8".into())));
}
