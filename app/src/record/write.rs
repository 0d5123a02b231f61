//! Writing a record: [`capture`] computes the results from the inputs with the views' own
//! functions and seals them with the digest; [`to_json`] and [`file_name`] give the file.

use super::{
    APP_VERSION, BUILD_COMMIT, RECORD_FORMAT, RECORD_VERSION, RecordError, RecordInputs,
    RecordedView, SignoffRecord, compute, digest_of,
};

/// A record of `inputs` (the view is `inputs.workbench.view`), written at `created_utc`: the
/// results are computed here from the inputs, with the views' own functions.
///
/// # Errors
/// [`RecordError::Inputs`] when an input is not valid (the page then shows the last valid
/// result, which these inputs would not reproduce); [`RecordError::NotRecordable`] when a lot
/// comparison has no files.
pub fn capture(inputs: RecordInputs, created_utc: &str) -> Result<SignoffRecord, RecordError> {
    let view = RecordedView::of(inputs.workbench.view);
    if view == RecordedView::LotComparison
        && inputs.lots.as_ref().is_none_or(|l| l.files.is_empty())
    {
        return Err(RecordError::NotRecordable {
            reason: "no lot files are read; pick files or load the demo lots first".into(),
        });
    }
    let results = compute(view, &inputs).map_err(|reason| RecordError::Inputs { reason })?;
    let mut record = SignoffRecord {
        format: RECORD_FORMAT.into(),
        format_version: RECORD_VERSION,
        app_version: APP_VERSION.into(),
        build_commit: BUILD_COMMIT.into(),
        created_utc: created_utc.into(),
        view,
        inputs,
        results,
        digest: String::new(),
    };
    record.digest = digest_of(&record);
    Ok(record)
}

/// The record as the JSON text of its file (indented, members in a fixed order).
pub fn to_json(record: &SignoffRecord) -> String {
    // Serialising plain strings, numbers and vectors cannot fail.
    serde_json::to_string_pretty(record).unwrap_or_default()
}

/// A file name for the record: kind and time, no characters a file system refuses.
pub fn file_name(record: &SignoffRecord) -> String {
    let kind = match record.view {
        RecordedView::PointCalculation => "point",
        RecordedView::TemperatureSweep => "sweep",
        RecordedView::Conversion => "conversion",
        RecordedView::LotComparison => "lots",
        RecordedView::HallAnalysis => "hall",
    };
    let time: String = record
        .created_utc
        .chars()
        .filter(char::is_ascii_alphanumeric)
        .collect();
    format!("bandgauge-record-{kind}-{time}.json")
}
