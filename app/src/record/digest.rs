//! The record's digest: SHA-256 over the canonical JSON (compact, keys sorted by their bytes)
//! of everything but the `digest` member.

use bandgauge_core::order;
use serde_json::Value;
use sha2::{Digest, Sha256};

use super::SignoffRecord;

/// The digest a record should carry: SHA-256, in lower-case hex, of [`canonical_json`] of the
/// record without its `digest` member.
pub fn digest_of(record: &SignoffRecord) -> String {
    let mut value = serde_json::to_value(record).unwrap_or(Value::Null);
    if let Value::Object(members) = &mut value {
        members.remove("digest");
    }
    digest_of_value(&value)
}

pub(super) fn digest_of_value(value: &Value) -> String {
    let mut text = String::new();
    canonical_json(value, &mut text);
    sha256_hex(&text)
}

pub(super) fn digest_of_members(members: &serde_json::Map<String, Value>) -> String {
    let mut text = String::new();
    canonical_object(members, &mut text);
    sha256_hex(&text)
}

fn sha256_hex(text: &str) -> String {
    Sha256::digest(text.as_bytes())
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect()
}

/// Compact JSON with every object's keys sorted by their UTF-8 bytes and strings escaped as
/// `serde_json` escapes them; the same text as Python's
/// `json.dumps(v, sort_keys=True, separators=(",", ":"), ensure_ascii=False)` gives for a record,
/// so a reviewer can check a digest without bandgauge.
pub fn canonical_json(value: &Value, out: &mut String) {
    match value {
        Value::Array(items) => {
            out.push('[');
            for (i, item) in items.iter().enumerate() {
                if i > 0 {
                    out.push(',');
                }
                canonical_json(item, out);
            }
            out.push(']');
        }
        Value::Object(members) => canonical_object(members, out),
        scalar => out.push_str(&scalar.to_string()),
    }
}

fn canonical_object(members: &serde_json::Map<String, Value>, out: &mut String) {
    let mut sorted: Vec<(&String, &Value)> = members.iter().collect();
    order::sort_by(&mut sorted, &|a, b| a.0.cmp(b.0));
    out.push('{');
    for (i, (key, value)) in sorted.into_iter().enumerate() {
        if i > 0 {
            out.push(',');
        }
        out.push_str(&Value::String(key.clone()).to_string());
        out.push(':');
        canonical_json(value, out);
    }
    out.push('}');
}
