//! Invariants of the sign-off record reader (`bandgauge_app::record`).
//!
//! The input is used three ways:
//! - as the text of a record file: `read_record` never panics; an error names what is wrong
//!   in one non-empty message; a record that reads writes back (`to_json`) to itself, and
//!   `replay` of it either reproduces every result or says which one differs;
//! - when it is JSON shaped like a record: its inputs, recorded afresh by this bandgauge
//!   (`capture`), must read back unchanged and replay exactly;
//! - as structured input (`super::build`): a workbench and lot inputs, recorded with
//!   `capture`, likewise;
//! - a fresh record's file edited at any one value (chosen by the input's length) no longer
//!   reads: the digest covers every member.

use super::build;
use bandgauge_app::record::{
    RecordError, RecordInputs, RecordedView, SignoffRecord, capture, read_record, replay, to_json,
};
use serde_json::Value;

/// A fixed creation time: the record's clock is not under test.
const CREATED_UTC: &str = "2026-05-20T12:00:00Z";

/// Checks one input; panics with a message naming the broken invariant.
pub fn check(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    match read_record(&text) {
        Ok(record) => {
            let again = read_record(&to_json(&record));
            assert_eq!(
                again.as_ref(),
                Ok(&record),
                "a record read does not write back"
            );
            match replay(&record) {
                Ok(replayed) => assert_eq!(
                    replayed.results, record.results,
                    "replay succeeded with other results"
                ),
                Err(error) => check_error(&error),
            }
        }
        Err(error) => check_error(&error),
    }
    if let Ok(shaped) = serde_json::from_str::<SignoffRecord>(&text) {
        record_afresh(shaped.inputs, data.len());
    }
    let mut source = arbitrary::Unstructured::new(data);
    if let Ok(workbench) = build::workbench(&mut source) {
        let lots = if workbench.view == bandgauge_app::state::View::Lots {
            build::lot_inputs(&mut source).ok()
        } else {
            None
        };
        record_afresh(RecordInputs { workbench, lots }, data.len());
    }
}

/// A record this bandgauge writes must read back unchanged, replay exactly, and refuse an
/// edit.
fn record_afresh(inputs: RecordInputs, choice: usize) {
    let record = match capture(inputs, CREATED_UTC) {
        Ok(record) => record,
        Err(error) => {
            check_error(&error);
            return;
        }
    };
    assert_eq!(record.view, RecordedView::of(record.inputs.workbench.view));
    let json = to_json(&record);
    assert_eq!(
        read_record(&json).as_ref(),
        Ok(&record),
        "a fresh record does not read back:\n{json}"
    );
    match replay(&record) {
        Ok(replayed) => assert_eq!(replayed.results, record.results, "replay changed results"),
        Err(error) => panic!("a fresh record does not replay: {error}\n{json}"),
    }
    check_edit_is_refused(&json, choice);
}

/// Any edit of a value in a record's file (the `choice`-th leaf) must make it unreadable:
/// the digest covers every member.
fn check_edit_is_refused(json: &str, choice: usize) {
    let mut value: Value = serde_json::from_str(json).expect("to_json writes JSON");
    let mut leaves = Vec::new();
    collect_leaves(&mut value, String::new(), &mut leaves);
    leaves.retain(|(path, _)| path != "/digest");
    let count = leaves.len();
    let Some((path, leaf)) = leaves.into_iter().nth(choice % count.max(1)) else {
        return;
    };
    *leaf = match leaf.take() {
        Value::String(mut s) => {
            s.push('x');
            Value::String(s)
        }
        // A number becomes text: n + 1 could round back to n.
        Value::Number(n) => Value::String(format!("{n}x")),
        Value::Bool(b) => Value::Bool(!b),
        _ => Value::from(0),
    };
    let edited = serde_json::to_string_pretty(&value).expect("a JSON value writes");
    assert!(
        read_record(&edited).is_err(),
        "a record edited at {path} still reads"
    );
}

fn collect_leaves<'v>(value: &'v mut Value, path: String, out: &mut Vec<(String, &'v mut Value)>) {
    match value {
        Value::Object(members) => {
            for (key, member) in members.iter_mut() {
                collect_leaves(member, format!("{path}/{key}"), out);
            }
        }
        Value::Array(items) => {
            for (index, item) in items.iter_mut().enumerate() {
                collect_leaves(item, format!("{path}/{index}"), out);
            }
        }
        _ => out.push((path, value)),
    }
}

fn check_error(error: &RecordError) {
    let message = error.to_string();
    assert!(!message.trim().is_empty(), "empty message for {error:?}");
}
