//! Bad-input catalogue, imported sign-off records: every kind of file the page's "open record"
//! can be given that is not a record this bandgauge can check and reproduce, one test per case,
//! each with the exact message (`RecordError`'s text) the page shows.
//!
//! A damaged file is written out as text; a record edited on purpose is "re-sealed" with the
//! digest its edited contents give (SHA-256 of the canonical JSON, as app/src/record/mod.rs
//! documents), so that the check after the digest is the one that refuses it.

use bandgauge_app::record::{
    self, RECORD_FORMAT, RECORD_VERSION, RecordInputs, SignoffRecord, read_record, replay,
};
use bandgauge_app::state::Workbench;
use serde_json::{Value, json};
use sha2::{Digest, Sha256};

/// A valid record of the default carriers inputs.
fn original() -> SignoffRecord {
    record::capture(
        RecordInputs {
            workbench: Workbench::default(),
            lots: None,
        },
        "2025-03-04T05:06:07Z",
    )
    .expect("the default inputs make a record")
}

/// The record's file as JSON, to be edited.
fn original_json() -> Value {
    serde_json::from_str(&record::to_json(&original())).expect("a record is JSON")
}

/// The digest that `members` (without `digest`) give.
fn digest(members: &Value) -> String {
    let mut text = String::new();
    record::canonical_json(members, &mut text);
    Sha256::digest(text.as_bytes())
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect()
}

/// `value` after `edit`, with the digest of its edited contents, as file text.
fn resealed(edit: impl FnOnce(&mut serde_json::Map<String, Value>)) -> String {
    let mut value = original_json();
    let members = value.as_object_mut().expect("an object");
    members.remove("digest");
    edit(members);
    let d = digest(&value);
    value
        .as_object_mut()
        .expect("an object")
        .insert("digest".into(), json!(d));
    value.to_string()
}

/// `value` after `edit`, the digest left as it was.
fn edited(edit: impl FnOnce(&mut serde_json::Map<String, Value>)) -> String {
    let mut value = original_json();
    edit(value.as_object_mut().expect("an object"));
    value.to_string()
}

/// The message of a file `read_record` refuses.
fn refusal(text: &str) -> String {
    match read_record(text) {
        Err(error) => error.to_string(),
        Ok(_) => panic!("the record was read; expected a refusal"),
    }
}

/// One `#[test]` per file the page refuses to open as a record.
macro_rules! refused_records {
    ($($name:ident: $text:expr => $message:expr;)+) => {
        $(
            #[test]
            fn $name() {
                let text: String = $text.into();
                assert_eq!(refusal(&text), $message);
            }
        )+
    };
}

const SAVE_HINT: &str = "a record is an object whose format is \"bandgauge sign-off record\"";

refused_records! {
    empty_file: "" =>
        "the file is empty; a sign-off record is the JSON file bandgauge saves with 'Save record'";
    only_white_space: " \n\t\r\n" =>
        "the file is empty; a sign-off record is the JSON file bandgauge saves with 'Save record'";
    not_json: "lot,wafer,resistivity\nA1,1,10\n" =>
        "the file is not a sign-off record: it is not JSON text (expected value at line 1 column 1)";
    cut_short: {
        let text = record::to_json(&original());
        let lines: Vec<&str> = text.lines().take(5).collect();
        lines.join("\n")
    } =>
        "the file is not a complete sign-off record: its text ends early, at line 5 (cut short \
         while copying or saving?)";
    json_list: "[1, 2, 3]" =>
        format!("the file is JSON but not a sign-off record: it is a list, not an object; {SAVE_HINT}");
    json_text: "\"bandgauge sign-off record\"" =>
        format!("the file is JSON but not a sign-off record: it is text, not an object; {SAVE_HINT}");
    object_without_a_format: "{\"view\": \"point_calculation\"}" =>
        format!("the file is JSON but not a sign-off record: it has no \"format\" member; {SAVE_HINT}");
    another_format: edited(|m| { m.insert("format".into(), json!("bandgauge saved state")); }) =>
        "format: \"bandgauge saved state\" is not a format bandgauge reads; it reads \"bandgauge \
         sign-off record\"";
    format_not_text: edited(|m| { m.insert("format".into(), json!(1)); }) =>
        "format: \"1\" is not a format bandgauge reads; it reads \"bandgauge sign-off record\"";
    version_missing: edited(|m| { m.remove("format_version"); }) =>
        "format_version: missing; every sign-off record has it";
    version_from_a_newer_bandgauge: edited(|m| {
        m.insert("format_version".into(), json!(RECORD_VERSION + 1));
        m.insert("app_version".into(), json!("9.4.0"));
    }) =>
        format!(
            "format_version: the record was made by a newer bandgauge (record version {}); this \
             bandgauge ({}) reads record version {RECORD_VERSION} only; open it with bandgauge \
             9.4.0 or later",
            RECORD_VERSION + 1,
            record::APP_VERSION
        );
    version_from_a_newer_bandgauge_without_its_name: edited(|m| {
        m.insert("format_version".into(), json!(7));
        m.remove("app_version");
    }) =>
        format!(
            "format_version: the record was made by a newer bandgauge (record version 7); this \
             bandgauge ({}) reads record version {RECORD_VERSION} only; open it with a newer \
             bandgauge",
            record::APP_VERSION
        );
    version_zero: edited(|m| { m.insert("format_version".into(), json!(0)); }) =>
        "format_version: 0 is not a record version bandgauge ever wrote; this bandgauge reads \
         record version 2";
    version_not_whole: edited(|m| { m.insert("format_version".into(), json!(1.5)); }) =>
        "format_version: 1.5 is not a record version bandgauge ever wrote; this bandgauge reads \
         record version 2";
    version_negative: edited(|m| { m.insert("format_version".into(), json!(-1)); }) =>
        "format_version: -1 is not a record version bandgauge ever wrote; this bandgauge reads \
         record version 2";
    version_as_text: edited(|m| { m.insert("format_version".into(), json!("1")); }) =>
        "format_version: \"1\" is not a record version bandgauge ever wrote; this bandgauge reads \
         record version 2";
    digest_missing: edited(|m| { m.remove("digest"); }) =>
        "digest: missing; every sign-off record has it";
    digest_not_text: edited(|m| { m.insert("digest".into(), json!(12345)); }) =>
        "digest: a number is not allowed; give the 64 hex digits of a SHA-256";
    extra_member: resealed(|m| { m.insert("signed_by".into(), json!("QA")); }) =>
        "signed_by: is not a member of a version 2 record; its members are format, \
         format_version, app_version, build_commit, created_utc, view, inputs, results, digest";
    member_missing: resealed(|m| { m.remove("created_utc"); }) =>
        "created_utc: missing; every sign-off record has it";
    view_unknown: resealed(|m| { m.insert("view".into(), json!("wafer_map")); }) =>
        "view: unknown variant `wafer_map`, expected one of `point_calculation`, \
         `temperature_sweep`, `conversion`, `lot_comparison`, `hall_analysis`; a version 2 record \
         cannot have it";
    inputs_without_the_workbench: resealed(|m| {
        m.insert("inputs".into(), json!({ "lots": null }));
    }) =>
        "inputs.workbench: missing; every sign-off record has it";
    inputs_of_another_view: resealed(|m| {
        m["inputs"]["workbench"]["view"] = json!("Sweep");
    }) =>
        "inputs.workbench.view: Sweep does not match the record's view; a record of a point \
         calculation has view Carriers";
    lot_files_in_a_point_calculation: resealed(|m| {
        m["inputs"]["lots"] = json!({
            "default_dopant": "B", "spec_quantity": "resistivity", "spec_min": "8",
            "spec_max": "12", "files": []
        });
    }) =>
        "inputs.lots: only a lot comparison carries lot files; give null";
    app_version_not_text: resealed(|m| { m.insert("app_version".into(), json!(0.1)); }) =>
        "app_version: invalid type: floating point `0.1`, expected a string; a version 2 record \
         cannot have it";
}

/// The first 12 hex digits and an ellipsis, as the message shows a digest.
fn short(digest: &str) -> String {
    format!("{}…", &digest[..12])
}

#[test]
fn result_edited_after_saving() {
    let mut value = original_json();
    let stored = value["digest"].as_str().expect("digest").to_owned();
    value["created_utc"] = json!("2025-03-04T05:06:08Z");
    let members = {
        let mut v = value.clone();
        v.as_object_mut().expect("object").remove("digest");
        v
    };
    assert_eq!(
        refusal(&value.to_string()),
        format!(
            "digest: the record was changed after it was written (its contents give digest {}, \
             the record says {}); ask its author for the original file",
            short(&digest(&members)),
            short(&stored)
        )
    );
}

#[test]
fn record_of_uncomputable_inputs() {
    let text = resealed(|m| {
        m["inputs"]["workbench"]["carriers"]["temperature"] = json!("warm");
    });
    let record = read_record(&text).expect("a well-formed record");
    assert_eq!(
        replay(&record).expect_err("not computable").to_string(),
        "inputs: this bandgauge cannot compute the recorded inputs: temperature: \"warm\" is not \
         a number; give a temperature such as 300, 300K or 27C; units: K (default), C, °C"
    );
}

#[test]
fn record_whose_result_this_bandgauge_does_not_reproduce() {
    // A record re-sealed after its first shown value was changed: the digest holds, the
    // recomputation does not.
    let mut recorded = String::new();
    let text = resealed(|m| {
        let cell = &mut m["results"]["sections"][0]["rows"][0]["cells"][0];
        recorded = cell["shown"].as_str().expect("shown text").to_owned();
        cell["shown"] = json!("9.999");
        cell["exact"] = json!("9.999e0");
    });
    let record = read_record(&text).expect("a well-formed record");
    let section = &record.results.sections[0];
    let row = &section.rows[0];
    let unit = &row.cells[0].unit;
    let unit = if unit.is_empty() {
        String::new()
    } else {
        format!(" {unit}")
    };
    let now = &original().results.sections[0].rows[0].cells[0];
    let recomputed = if now.shown == now.exact {
        format!("{}{unit}", now.shown)
    } else {
        format!("{}{unit} (exactly {})", now.shown, now.exact)
    };
    assert_ne!(recorded, "9.999");
    assert_eq!(
        replay(&record).expect_err("differs").to_string(),
        format!(
            "result '{}' › '{}' › '{}': the record says 9.999{unit} (exactly 9.999e0), this \
             bandgauge ({}, build {}) computes {recomputed}; the record was written by bandgauge \
             {} (build {})",
            section.title,
            row.label,
            section.columns.get(1).map_or("value", String::as_str),
            record::APP_VERSION,
            record::BUILD_COMMIT,
            record.app_version,
            record.build_commit
        )
    );
}

#[test]
fn the_original_record_reads_and_replays() {
    // Every case above is this record with one fault: without it, the record is accepted.
    let text = record::to_json(&original());
    let record = read_record(&text).expect("reads");
    assert_eq!(record.format, RECORD_FORMAT);
    replay(&record).expect("replays");
    // Re-sealing without an edit gives the same digest (the helper computes it as the app does).
    assert_eq!(
        read_record(&resealed(|_| {})).expect("reads").digest,
        record.digest
    );
}

#[test]
fn very_deep_nesting_is_refused_without_a_crash() {
    let text = format!("{}{}", "[".repeat(100_000), "]".repeat(100_000));
    assert_eq!(
        refusal(&text),
        "the file is not a sign-off record: it is not JSON text (recursion limit exceeded at line \
         1 column 128)"
    );
}
