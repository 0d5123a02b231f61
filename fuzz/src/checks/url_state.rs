//! Invariants of the workbench's URL and saved-state decoders (`bandgauge_app::state`).
//!
//! The input is used twice. As raw text it is a URL query, a saved-state JSON and both at
//! once (`initial`):
//! - nothing panics; notices are non-empty;
//! - a decoded state, written as a query and read again, is a fixed point: the second
//!   pass gives the same state and query, with no notice;
//! - a saved state that reads writes back to itself; an unreadable one gives a notice
//!   that says the defaults are shown.
//!
//! As structured input it builds a workbench as the page could hold it (`super::build`):
//! its query and its saved JSON must both bring back exactly that workbench.

use bandgauge_app::state::{
    Workbench, from_query, from_saved_json, initial, is_workbench_query, to_query, to_saved_json,
};

/// Checks one input; panics with a message naming the broken invariant.
pub fn check(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    let (from_link, notices) = from_query(&text);
    check_notices(&text, &notices);
    check_query_fixed_point(&from_link, &text);

    match from_saved_json(&text) {
        Ok(saved) => {
            if !is_workbench_query(&text) {
                assert_eq!(
                    initial(&text, Some(&text)),
                    (saved.clone(), vec![]),
                    "{text:?}: initial() does not restore the saved state"
                );
            }
            assert_eq!(
                from_saved_json(&to_saved_json(&saved)).as_ref(),
                Ok(&saved),
                "{text:?}: a saved state does not write back to itself"
            );
            check_query_fixed_point(&saved, &text);
        }
        Err(notice) => {
            check_notices(&text, std::slice::from_ref(&notice));
            assert!(
                notice.contains("defaults"),
                "{text:?}: the saved-state notice does not say what is shown: {notice:?}"
            );
        }
    }

    let (start, notices) = initial(&text, Some(&text));
    check_notices(&text, &notices);
    if is_workbench_query(&text) {
        assert_eq!(
            start, from_link,
            "{text:?}: initial() does not follow the link"
        );
    }
    assert_eq!(
        initial(&text, None).0,
        if is_workbench_query(&text) {
            from_link
        } else {
            Workbench::default()
        }
    );

    let mut source = arbitrary::Unstructured::new(data);
    if let Ok(built) = super::build::workbench(&mut source) {
        let query = to_query(&built);
        let (back, notices) = from_query(&query);
        assert_eq!(
            back, built,
            "the link {query:?} does not bring back its workbench"
        );
        assert!(notices.is_empty(), "{query:?}: notices {notices:?}");
        assert!(
            is_workbench_query(&query),
            "{query:?} is not seen as a link"
        );
        assert_eq!(
            from_saved_json(&to_saved_json(&built)).as_ref(),
            Ok(&built),
            "the saved JSON does not bring back its workbench"
        );
    }
}

/// Notices quote the value given as it was (the page shows them as text), so only their
/// presence is checked.
fn check_notices(text: &str, notices: &[String]) {
    for notice in notices {
        assert!(!notice.trim().is_empty(), "{text:?}: empty notice");
    }
}

/// to_query(from_query(x)) is stable from the second pass on, and raises no notice.
fn check_query_fixed_point(first: &Workbench, text: &str) {
    let query = to_query(first);
    let (second, notices) = from_query(&query);
    assert!(
        notices.is_empty(),
        "{text:?}: re-reading {query:?} gives {notices:?}"
    );
    let again = to_query(&second);
    assert_eq!(query, again, "{text:?}: the query changes on a second pass");
    assert_eq!(
        from_query(&again).0,
        second,
        "{text:?}: the state changes on a third pass"
    );
}
