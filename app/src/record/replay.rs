//! Replaying a record: recompute every result from the recorded inputs and name the first one
//! that differs.

use super::{ModelLine, RecordError, RecordResults, ResultCell, SignoffRecord, compute};

/// A record recomputed: every result identical.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Replayed {
    /// How many values were compared (all identical).
    pub values: usize,
    /// The recomputed results (identical to the record's).
    pub results: RecordResults,
}

/// Recomputes every result of `record` from its inputs and compares it with the recorded one:
/// the exact value, the text shown and the unit, then the models and the notes.
///
/// # Errors
/// [`RecordError::Inputs`] when the inputs cannot be computed; [`RecordError::ResultDiffers`]
/// naming the first result that differs, from what to what.
pub fn replay(record: &SignoffRecord) -> Result<Replayed, RecordError> {
    let results = compute(record.view, &record.inputs).map_err(|reason| RecordError::Inputs {
        reason: format!("this bandgauge cannot compute the recorded inputs: {reason}"),
    })?;
    compare(&record.results, &results, record)?;
    Ok(Replayed {
        values: results.value_count(),
        results,
    })
}

fn compare(
    recorded: &RecordResults,
    now: &RecordResults,
    record: &SignoffRecord,
) -> Result<(), RecordError> {
    let differs = |place: String, recorded: String, recomputed: String| {
        Err(RecordError::ResultDiffers {
            place,
            recorded,
            recomputed,
            written_by: format!("{} (build {})", record.app_version, record.build_commit),
        })
    };
    let none = || "nothing".to_string();
    let longest = recorded.sections.len().max(now.sections.len());
    for i in 0..longest {
        let (a, b) = (recorded.sections.get(i), now.sections.get(i));
        let (Some(a), Some(b)) = (a, b) else {
            return differs(
                format!("table {}", i + 1),
                a.map_or_else(none, |s| format!("table '{}'", s.title)),
                b.map_or_else(none, |s| format!("table '{}'", s.title)),
            );
        };
        if a.title != b.title || a.columns != b.columns {
            return differs(
                format!("table {}", i + 1),
                format!("'{}' ({})", a.title, a.columns.join(", ")),
                format!("'{}' ({})", b.title, b.columns.join(", ")),
            );
        }
        for j in 0..a.rows.len().max(b.rows.len()) {
            let (ra, rb) = (a.rows.get(j), b.rows.get(j));
            let (Some(ra), Some(rb)) = (ra, rb) else {
                return differs(
                    format!("'{}', row {}", a.title, j + 1),
                    ra.map_or_else(none, |r| format!("row '{}'", r.label)),
                    rb.map_or_else(none, |r| format!("row '{}'", r.label)),
                );
            };
            if ra.label != rb.label || ra.cells.len() != rb.cells.len() {
                return differs(
                    format!("'{}', row {}", a.title, j + 1),
                    format!("row '{}' of {} values", ra.label, ra.cells.len()),
                    format!("row '{}' of {} values", rb.label, rb.cells.len()),
                );
            }
            for (k, (ca, cb)) in ra.cells.iter().zip(&rb.cells).enumerate() {
                if ca != cb {
                    let column = a.columns.get(k + 1).map_or("value", String::as_str);
                    return differs(
                        format!("'{}' › '{}' › '{}'", a.title, ra.label, column),
                        cell_text(ca),
                        cell_text(cb),
                    );
                }
            }
        }
    }
    if recorded.models != now.models {
        let line = |m: Option<&ModelLine>| {
            m.map_or_else(none, |m| {
                format!("{}: {} ({})", m.quantity, m.model, m.source)
            })
        };
        let at = (0..)
            .find(|&i| recorded.models.get(i) != now.models.get(i))
            .unwrap_or(0);
        return differs(
            format!("models used, line {}", at + 1),
            line(recorded.models.get(at)),
            line(now.models.get(at)),
        );
    }
    if recorded.notes != now.notes {
        let at = (0..)
            .find(|&i| recorded.notes.get(i) != now.notes.get(i))
            .unwrap_or(0);
        return differs(
            format!("notes, line {}", at + 1),
            recorded.notes.get(at).cloned().unwrap_or_else(none),
            now.notes.get(at).cloned().unwrap_or_else(none),
        );
    }
    Ok(())
}

fn cell_text(c: &ResultCell) -> String {
    let unit = if c.unit.is_empty() {
        String::new()
    } else {
        format!(" {}", c.unit)
    };
    if c.shown == c.exact {
        format!("{}{unit}", c.shown)
    } else {
        format!("{}{unit} (exactly {})", c.shown, c.exact)
    }
}
