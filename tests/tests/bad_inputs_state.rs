//! Bad-input catalogue, page state: every kind of bad link (URL query) and bad saved state
//! (the JSON the page keeps in the browser's storage), one test per case, each with the exact
//! notice the page shows and what it falls back to. Nothing typed is lost: a value the page
//! cannot use is kept as text in its field, where the field's own message explains it.

use bandgauge_app::entry;
use bandgauge_app::state::{
    self, CarrierInputs, DopantRow, Given, SAVED_STATE_VERSION, View, Workbench,
};

/// The page's start from `query` and `saved`: the state and the notices shown.
fn start(query: &str, saved: Option<&str>) -> (Workbench, Vec<String>) {
    state::initial(query, saved)
}

/// One `#[test]` per link with a value the page cannot use: the notice, and a check of the
/// state the page opens with instead.
macro_rules! links {
    ($($name:ident: $query:expr => [$($notice:expr),*], |$w:ident| $check:expr;)+) => {
        $(
            #[test]
            fn $name() {
                let ($w, notices) = start($query, None);
                let expected: Vec<String> = vec![$($notice.to_string()),*];
                assert_eq!(notices, expected, "link {:?}", $query);
                assert!($check, "link {:?} opened {:?}", $query, $w);
            }
        )+
    };
}

links! {
    unknown_view: "view=plots" =>
        ["link: view 'plots' is unknown; showing the carriers view"],
        |w| w.view == View::Carriers;
    view_without_a_value: "view" =>
        ["link: view '' is unknown; showing the carriers view"],
        |w| w.view == View::Carriers;
    view_in_capitals: "view=SWEEP" =>
        ["link: view 'SWEEP' is unknown; showing the carriers view"],
        |w| w.view == View::Carriers;
    gap_narrowing_not_a_switch: "bgn=maybe&t=350" =>
        ["link: bgn 'maybe' is not 0 or 1; band-gap narrowing is off"],
        |w| !w.carriers.band_gap_narrowing && w.carriers.temperature == "350";
    given_neither_rho_nor_n: "view=resistivity&given=sheet" =>
        ["link: given 'sheet' is not rho or n; resistivity is given"],
        |w| w.conversion.given == Given::Resistivity && w.view == View::Resistivity;
    three_bad_values_give_three_notices: "view=x&bgn=2&given=y" =>
        [
            "link: view 'x' is unknown; showing the carriers view",
            "link: bgn '2' is not 0 or 1; band-gap narrowing is off",
            "link: given 'y' is not rho or n; resistivity is given"
        ],
        |w| w == Workbench::default();
    control_characters_in_a_value_are_shown_escaped: "view=a%0Ab%07" =>
        ["link: view 'a\\nb\\u{7}' is unknown; showing the carriers view"],
        |w| w.view == View::Carriers;
    a_long_value_is_cut_in_the_notice: "bgn=yes-please-turn-band-gap-narrowing-on-for-this-one" =>
        ["link: bgn 'yes-please-turn-band-gap-narrowing-on-fo…' is not 0 or 1; band-gap \
          narrowing is off"],
        |w| !w.carriers.band_gap_narrowing;
    foreign_keys_are_ignored: "t=77&utm_source=mail&fbclid=abc" =>
        [],
        |w| w.carriers.temperature == "77";
    missing_keys_take_defaults: "t=77" =>
        [],
        |w| w.carriers.dopants == CarrierInputs::default().dopants && w.view == View::Carriers;
    malformed_percent_escapes_stay_as_typed: "t=300%zz&val=100%" =>
        [],
        |w| w.carriers.temperature == "300%zz" && w.conversion.value == "100%";
    invalid_utf8_escapes_become_replacement_characters: "t=%FF300" =>
        [],
        |w| w.carriers.temperature == "\u{FFFD}300";
    dopant_row_without_a_density: "dop=B" =>
        [],
        |w| w.carriers.dopants == vec![DopantRow::new("B", "")];
    dopant_row_with_an_unknown_species_is_kept: "dop=Zz,1e15" =>
        [],
        |w| w.carriers.dopants == vec![DopantRow::new("Zz", "1e15")];
    leading_question_mark_and_empty_pairs: "?&&t=300&&" =>
        [],
        |w| w.carriers.temperature == "300";
}

#[test]
fn link_value_the_field_cannot_read_is_kept_and_explained_by_the_field() {
    let (w, notices) = start("t=warm&thick=-1%20mm", None);
    assert!(notices.is_empty(), "{notices:?}");
    assert_eq!(w.carriers.temperature, "warm");
    assert_eq!(
        entry::temperature_k("temperature", &w.carriers.temperature),
        Err(
            "temperature: \"warm\" is not a number; give a temperature such as 300, 300K or 27C; \
             units: K (default), C, °C"
                .to_owned()
        )
    );
    assert_eq!(w.carriers.thickness, "-1 mm");
}

#[test]
fn a_query_of_foreign_keys_only_is_not_a_link() {
    let saved = state::to_saved_json(&Workbench {
        view: View::Sweep,
        ..Workbench::default()
    });
    let (w, notices) = start("?utm_source=mail", Some(&saved));
    assert!(notices.is_empty());
    assert_eq!(w.view, View::Sweep, "the saved inputs are used");
}

#[test]
fn a_link_wins_over_unreadable_saved_inputs_without_a_notice() {
    let (w, notices) = start("t=4.2", Some("{broken"));
    assert!(notices.is_empty(), "{notices:?}");
    assert_eq!(w.carriers.temperature, "4.2");
}

// ---------------------------------------------------------------------------------------------
// Saved state (JSON in the browser's storage)
// ---------------------------------------------------------------------------------------------

/// One `#[test]` per saved state the page cannot read: the exact notice; the page then shows
/// the defaults. A fault in the saved text itself names its line and column; a fault inside
/// the inputs names what was found and what is allowed (they are read from a parsed JSON value,
/// which keeps no positions: one deserializer per input type keeps the page smaller).
macro_rules! saved {
    ($($name:ident: $text:expr => $notice:expr;)+) => {
        $(
            #[test]
            fn $name() {
                let text: String = $text.into();
                let (w, notices) = start("", Some(&text));
                assert_eq!(notices, vec![$notice.to_string()], "saved {text:?}");
                assert_eq!(w, Workbench::default(), "defaults are shown");
            }
        )+
    };
}

/// The inputs of a saved workbench, each view's as `{}` (its fields take their defaults).
const WORKBENCH: &str = "{\"view\":\"Carriers\",\"carriers\":{},\"sweep\":{},\"conversion\":{}}";

/// A saved state of format version 1 with `view` and the carriers inputs as given.
fn saved_workbench(view: &str, carriers: &str) -> String {
    format!(
        "{{\"version\":1,\"workbench\":{{\"view\":\"{view}\",\"carriers\":{carriers},\
         \"sweep\":{{}},\"conversion\":{{}}}}}}"
    )
}

/// The current saved form of the default workbench with `from` replaced by `to`.
fn edited(from: &str, to: &str) -> String {
    let text = state::to_saved_json(&Workbench::default());
    assert!(text.contains(from), "{from:?} not in {text}");
    text.replacen(from, to, 1)
}

saved! {
    saved_empty: "" =>
        "the saved inputs could not be read (EOF while parsing a value at line 1 column 0); the \
         defaults are shown";
    saved_cut_short: "{\"version\":1,\"workbench\":{\"view\":\"Sweep\"" =>
        "the saved inputs could not be read (EOF while parsing an object at line 1 column 40); \
         the defaults are shown";
    saved_null: "null" =>
        "the saved inputs could not be read (invalid type: null, expected struct Saved at line 1 \
         column 4); the defaults are shown";
    saved_not_an_object: "\"inputs\"" =>
        "the saved inputs could not be read (invalid type: string \"inputs\", expected struct \
         Saved at line 1 column 8); the defaults are shown";
    saved_as_a_list: "[1,2]" =>
        "the saved inputs could not be read (invalid type: integer `2`, expected struct \
         Workbench); the defaults are shown";
    saved_not_json: "view=sweep&t=300" =>
        "the saved inputs could not be read (expected value at line 1 column 1); the defaults \
         are shown";
    saved_without_a_version: format!("{{\"workbench\":{WORKBENCH}}}") =>
        "the saved inputs could not be read (missing field `version` at line 1 column 74); the \
         defaults are shown";
    saved_without_inputs: "{\"version\":1}" =>
        "the saved inputs could not be read (missing field `workbench` at line 1 column 13); the \
         defaults are shown";
    saved_version_as_text: "{\"version\":\"1\",\"workbench\":{}}" =>
        "the saved inputs could not be read (invalid type: string \"1\", expected u32 at line 1 \
         column 14); the defaults are shown";
    saved_by_a_newer_page: edited("\"version\":1", "\"version\":2") =>
        "the saved inputs are from format version 2 (this page reads 1); the defaults are shown";
    saved_by_an_older_format: edited("\"version\":1", "\"version\":0") =>
        "the saved inputs are from format version 0 (this page reads 1); the defaults are shown";
    saved_with_an_unknown_view: saved_workbench("Plots", "{}") =>
        "the saved inputs could not be read (unknown variant `Plots`, expected one of \
         `Carriers`, `Sweep`, `Resistivity`, `Lots`, `Hall`); the defaults are shown";
    saved_with_a_number_where_text_is_kept: saved_workbench("Carriers", "{\"temperature\":300}") =>
        "the saved inputs could not be read (invalid type: integer `300`, expected a string); \
         the defaults are shown";
    saved_with_dopants_not_a_list: saved_workbench("Carriers", "{\"dopants\":{\"P\":\"1e15\"}}") =>
        "the saved inputs could not be read (invalid type: map, expected a sequence); \
         the defaults are shown";
    saved_with_a_dopant_row_missing_its_density: saved_workbench("Carriers", "{\"dopants\":[{\"species\":\"P\"}]}") =>
        "the saved inputs could not be read (missing field `density`); the defaults are \
         shown";
    saved_with_a_switch_as_text: saved_workbench("Carriers", "{\"band_gap_narrowing\":\"on\"}") =>
        "the saved inputs could not be read (invalid type: string \"on\", expected a boolean); \
         the defaults are shown";
}

#[test]
fn saved_state_written_as_the_catalogue_writes_it_is_read() {
    // The hand-written states above differ from a readable one only in the case's fault.
    let (w, notices) = start(
        "",
        Some(&saved_workbench("Sweep", "{\"temperature\":\"77 K\"}")),
    );
    assert!(notices.is_empty(), "{notices:?}");
    assert_eq!(
        (w.view, w.carriers.temperature.as_str()),
        (View::Sweep, "77 K")
    );
}

#[test]
fn saved_state_version_is_the_one_this_page_writes() {
    // The catalogue's version cases above are written against this version.
    assert_eq!(SAVED_STATE_VERSION, 1);
}

#[test]
fn saved_state_missing_newer_fields_takes_their_defaults_silently() {
    // An older page did not write the ionization model; the defaults fill it in.
    let text = edited("\"ionization_model\":\"altermatt\",", "");
    assert!(!text.contains("ionization_model"));
    let (w, notices) = start("", Some(&text));
    assert!(notices.is_empty(), "{notices:?}");
    assert_eq!(w, Workbench::default());
}

#[test]
fn saved_state_with_fields_this_page_does_not_know_is_read() {
    // A newer page of the same format version may add fields; they are ignored.
    let text = edited(
        "\"view\":\"Carriers\"",
        "\"view\":\"Sweep\",\"theme\":\"dark\"",
    );
    let (w, notices) = start("", Some(&text));
    assert!(notices.is_empty(), "{notices:?}");
    assert_eq!(w.view, View::Sweep);
}
