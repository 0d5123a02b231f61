//! Reading a record: JSON, the format, the version, the digest, then every member, each refusal
//! naming the member and what is allowed.

use serde_json::Value;

use super::digest::digest_of_members;
use super::{
    MEMBERS, RECORD_FORMAT, RECORD_VERSION, RECORD_VERSION_U64, RecordError, RecordedView,
    SignoffRecord,
};

/// Reads a record: JSON, the format, the version, the digest, then every member.
///
/// # Errors
/// Every [`RecordError`] but `Inputs`, `ResultDiffers` and `NotRecordable`, with a message
/// naming the member and what is allowed. Never panics, on any text of any size: the JSON
/// reader refuses nesting deeper than 128 levels.
pub fn read_record(text: &str) -> Result<SignoffRecord, RecordError> {
    if text.trim().is_empty() {
        return Err(RecordError::Empty);
    }
    let value: Value = serde_json::from_str(text).map_err(|e| match e.classify() {
        serde_json::error::Category::Eof => RecordError::Truncated { line: e.line() },
        _ => RecordError::NotJson {
            detail: e.to_string(),
        },
    })?;
    let Value::Object(mut members) = value else {
        return Err(RecordError::NotARecord {
            detail: format!("it is {}, not an object", json_kind(&value)),
        });
    };
    match members.get("format") {
        None => {
            return Err(RecordError::NotARecord {
                detail: "it has no \"format\" member".into(),
            });
        }
        Some(Value::String(f)) if f == RECORD_FORMAT => {}
        Some(Value::String(f)) => return Err(RecordError::UnknownFormat { found: f.clone() }),
        Some(other) => {
            return Err(RecordError::UnknownFormat {
                found: other.to_string(),
            });
        }
    }
    check_version(&members)?;
    let stored = match members.remove("digest") {
        None => {
            return Err(RecordError::MissingField {
                field: "digest".into(),
            });
        }
        Some(Value::String(d)) => d,
        Some(other) => {
            return Err(RecordError::BadField {
                field: "digest".into(),
                detail: format!(
                    "{} is not allowed; give the 64 hex digits of a SHA-256",
                    json_kind(&other)
                ),
            });
        }
    };
    let computed = digest_of_members(&members);
    if !stored.eq_ignore_ascii_case(&computed) {
        return Err(RecordError::Changed { stored, computed });
    }
    if let Some(extra) = members.keys().find(|k| !MEMBERS.contains(&k.as_str())) {
        return Err(RecordError::BadField {
            field: extra.clone(),
            detail: format!(
                "is not a member of a version {RECORD_VERSION} record; its members are {}",
                MEMBERS.join(", ")
            ),
        });
    }
    let mut take = |field: &str| {
        members
            .remove(field)
            .ok_or_else(|| RecordError::MissingField {
                field: field.into(),
            })
    };
    let record = SignoffRecord {
        format: RECORD_FORMAT.into(),
        format_version: RECORD_VERSION,
        app_version: decode("app_version", &[], take("app_version")?)?,
        build_commit: decode("build_commit", &[], take("build_commit")?)?,
        created_utc: decode("created_utc", &[], take("created_utc")?)?,
        view: decode("view", &[], take("view")?)?,
        inputs: decode("inputs", &["workbench", "lots"], take("inputs")?)?,
        results: decode(
            "results",
            &["sections", "models", "notes"],
            take("results")?,
        )?,
        digest: stored,
    };
    check_consistent(&record)?;
    Ok(record)
}

fn check_version(members: &serde_json::Map<String, Value>) -> Result<(), RecordError> {
    let app_version = members
        .get("app_version")
        .and_then(Value::as_str)
        .map(str::to_owned);
    match members.get("format_version") {
        None => Err(RecordError::MissingField {
            field: "format_version".into(),
        }),
        Some(Value::Number(n)) => match n.as_u64() {
            Some(v) if v == u64::from(RECORD_VERSION) => Ok(()),
            Some(v) if v > u64::from(RECORD_VERSION) => Err(RecordError::NewerVersion {
                found: v,
                app_version,
            }),
            // Version 1 was written by bandgauge 0.1 before the probe geometry and the Holm
            // adjustment (see DEVELOPERS.md, "Layout changes").
            Some(v @ 1..RECORD_VERSION_U64) => Err(RecordError::OlderVersion {
                found: v,
                app_version,
            }),
            _ => Err(RecordError::UnsupportedVersion {
                found: n.to_string(),
            }),
        },
        Some(other) => Err(RecordError::UnsupportedVersion {
            found: other.to_string(),
        }),
    }
}

/// One member, decoded; the serde complaint is kept, prefixed with the member's name. A
/// member missing right inside it (one of `direct`) is named by its path; one missing deeper
/// is named alone (serde does not say where).
fn decode<T: serde::de::DeserializeOwned>(
    field: &str,
    direct: &[&str],
    value: Value,
) -> Result<T, RecordError> {
    serde_json::from_value(value).map_err(|e| {
        let detail = e.to_string();
        match detail
            .strip_prefix("missing field `")
            .and_then(|rest| rest.split_once('`'))
        {
            Some((inner, _)) if direct.contains(&inner) => RecordError::MissingField {
                field: format!("{field}.{inner}"),
            },
            Some((inner, _)) => RecordError::BadField {
                field: field.into(),
                detail: format!(
                    "a member \"{inner}\" is missing inside it; every sign-off record has it"
                ),
            },
            None => RecordError::BadField {
                field: field.into(),
                detail: format!("{detail}; a version {RECORD_VERSION} record cannot have it"),
            },
        }
    })
}

fn check_consistent(record: &SignoffRecord) -> Result<(), RecordError> {
    if RecordedView::of(record.inputs.workbench.view) != record.view {
        return Err(RecordError::BadField {
            field: "inputs.workbench.view".into(),
            detail: format!(
                "{:?} does not match the record's view; a record of a {} has view {:?}",
                record.inputs.workbench.view,
                record.view.title().to_ascii_lowercase(),
                record.view.view()
            ),
        });
    }
    let lots = record.view == RecordedView::LotComparison;
    match (&record.inputs.lots, lots) {
        (None, true) => Err(RecordError::MissingField {
            field: "inputs.lots".into(),
        }),
        (Some(_), false) => Err(RecordError::BadField {
            field: "inputs.lots".into(),
            detail: "only a lot comparison carries lot files; give null".into(),
        }),
        _ => Ok(()),
    }
}

fn json_kind(value: &Value) -> &'static str {
    match value {
        Value::Null => "null",
        Value::Bool(_) => "true or false",
        Value::Number(_) => "a number",
        Value::String(_) => "text",
        Value::Array(_) => "a list",
        Value::Object(_) => "an object",
    }
}
