//! Why a record could not be written, read or reproduced: [`RecordError`] and its messages,
//! each naming the member and what is allowed.

use std::fmt;

use super::{APP_VERSION, BUILD_COMMIT, RECORD_FORMAT, RECORD_VERSION};

/// Why a record could not be written, read or reproduced.
#[non_exhaustive]
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum RecordError {
    /// The file holds nothing (or only white space).
    Empty,
    /// The text is not JSON.
    NotJson {
        /// The JSON reader's complaint.
        detail: String,
    },
    /// The text ends inside the JSON (a file cut short).
    Truncated {
        /// Line where the text ends.
        line: usize,
    },
    /// JSON, but not a sign-off record.
    NotARecord {
        /// What is missing or wrong.
        detail: String,
    },
    /// `format` names another format.
    UnknownFormat {
        /// The format given.
        found: String,
    },
    /// Written by a newer bandgauge, in a layout this one does not know.
    NewerVersion {
        /// The record's version.
        found: u64,
        /// The app version the record names, if any.
        app_version: Option<String>,
    },
    /// Written by an older bandgauge, in a layout whose meaning has changed since.
    OlderVersion {
        /// The record's version.
        found: u64,
        /// The app version the record names, if any.
        app_version: Option<String>,
    },
    /// A version number this bandgauge never wrote (0, negative, not a whole number).
    UnsupportedVersion {
        /// The version given, as written.
        found: String,
    },
    /// A member every record has is missing.
    MissingField {
        /// The member.
        field: String,
    },
    /// A member has a value a record cannot have.
    BadField {
        /// The member.
        field: String,
        /// What is wrong and what is allowed.
        detail: String,
    },
    /// The digest does not match the contents.
    Changed {
        /// The digest the record carries.
        stored: String,
        /// The digest of its contents.
        computed: String,
    },
    /// The recorded inputs cannot be computed (on reading) or the shown inputs are not valid
    /// (on writing).
    Inputs {
        /// The field's message.
        reason: String,
    },
    /// A recomputed result differs from the recorded one.
    ResultDiffers {
        /// Section, row and column of the first difference.
        place: String,
        /// The recorded value, as shown, with its unit.
        recorded: String,
        /// The recomputed value.
        recomputed: String,
        /// Version and build commit of the bandgauge that wrote the record.
        written_by: String,
    },
    /// A record cannot be written of what the page holds.
    NotRecordable {
        /// Why.
        reason: String,
    },
}

impl fmt::Display for RecordError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RecordError::Empty => write!(
                f,
                "the file is empty; a sign-off record is the JSON file bandgauge saves with \
                 'Save record'"
            ),
            RecordError::NotJson { detail } => write!(
                f,
                "the file is not a sign-off record: it is not JSON text ({detail})"
            ),
            RecordError::Truncated { line } => write!(
                f,
                "the file is not a complete sign-off record: its text ends early, at line {line} \
                 (cut short while copying or saving?)"
            ),
            RecordError::NotARecord { detail } => write!(
                f,
                "the file is JSON but not a sign-off record: {detail}; a record is an object \
                 whose format is \"{RECORD_FORMAT}\""
            ),
            RecordError::UnknownFormat { found } => write!(
                f,
                "format: \"{found}\" is not a format bandgauge reads; it reads \"{RECORD_FORMAT}\""
            ),
            RecordError::NewerVersion { found, app_version } => {
                write!(
                    f,
                    "format_version: the record was made by a newer bandgauge (record version \
                     {found}); this bandgauge ({APP_VERSION}) reads record version \
                     {RECORD_VERSION} only; open it with "
                )?;
                match app_version {
                    Some(v) => write!(f, "bandgauge {v} or later"),
                    None => write!(f, "a newer bandgauge"),
                }
            }
            RecordError::OlderVersion { found, app_version } => {
                write!(
                    f,
                    "format_version: the record was made by an older bandgauge (record version \
                     {found}); this bandgauge ({APP_VERSION}) reads record version \
                     {RECORD_VERSION} only (since version 2 a probe result states its sample \
                     geometry and a lot comparison its Holm-adjusted p-values); open it with "
                )?;
                match app_version {
                    Some(v) => write!(f, "bandgauge {v}"),
                    None => write!(f, "the bandgauge that wrote it"),
                }
            }
            RecordError::UnsupportedVersion { found } => write!(
                f,
                "format_version: {found} is not a record version bandgauge ever wrote; this \
                 bandgauge reads record version {RECORD_VERSION}"
            ),
            RecordError::MissingField { field } => {
                write!(f, "{field}: missing; every sign-off record has it")
            }
            RecordError::BadField { field, detail } => write!(f, "{field}: {detail}"),
            RecordError::Changed { stored, computed } => write!(
                f,
                "digest: the record was changed after it was written (its contents give digest \
                 {}, the record says {}); ask its author for the original file",
                short(computed),
                short(stored)
            ),
            RecordError::Inputs { reason } => write!(f, "inputs: {reason}"),
            RecordError::ResultDiffers {
                place,
                recorded,
                recomputed,
                written_by,
            } => write!(
                f,
                "result {place}: the record says {recorded}, this bandgauge ({APP_VERSION}, \
                 build {BUILD_COMMIT}) computes {recomputed}; the record was written by \
                 bandgauge {written_by}"
            ),
            RecordError::NotRecordable { reason } => write!(f, "no record written: {reason}"),
        }
    }
}

impl std::error::Error for RecordError {}

/// The first 12 hex digits of a digest, enough to tell two apart in a message.
pub(super) fn short(digest: &str) -> String {
    let head: String = digest.chars().take(12).collect();
    if digest.chars().count() > 12 {
        format!("{head}…")
    } else {
        head
    }
}
