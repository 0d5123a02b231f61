//! Bad-input catalogue, lot files: every way `bandgauge_core::lots` refuses a whole file or
//! rejects a row, one test per case, each with the exact message the CLI and the page show.
//!
//! A refused file is a [`LotFileError`] (its `Display` is the message, the CLI prefixes the file
//! name); a rejected row is a [`RowRejection`] whose `Display` is `line N: column: reason`. The
//! accepted oddities (byte-order mark, CRLF line ends, quoted fields, decimal commas in a
//! semicolon file) are listed too, since an engineer's file must not be refused for them.

use bandgauge_core::lots::{LotBook, LotFileError, LotReader, ReadOptions, RowCounts, RowOutcome};

/// What reading `text` gave: the file error, or the counts, the rejections as displayed, and
/// the notes.
struct Read {
    result: Result<RowCounts, LotFileError>,
    rejected: Vec<String>,
    notes: Vec<String>,
}

fn read_with(text: &[u8], default_dopant: Option<&str>) -> Read {
    let options = ReadOptions {
        default_dopant: default_dopant.map(str::to_owned),
    };
    let mut reader = LotReader::new(options);
    let mut book = LotBook::new();
    let mut rejected = Vec::new();
    let mut on_row = |outcome: RowOutcome<'_, '_>| {
        if let RowOutcome::Rejected(r) = outcome {
            rejected.push(r.to_string());
        }
    };
    // Fed in pieces of 7 bytes, so that every case also crosses chunk boundaries mid-line.
    let mut result = Ok(());
    for chunk in text.chunks(7) {
        result = reader.feed(chunk, &mut book, &mut on_row);
        if result.is_err() {
            break;
        }
    }
    let result = result.and_then(|()| reader.finish(&mut book, &mut on_row));
    Read {
        result,
        rejected,
        notes: reader.notes().to_vec(),
    }
}

fn read(text: &[u8]) -> Read {
    read_with(text, None)
}

/// The message of a file that cannot be read at all.
fn refusal(text: &[u8]) -> String {
    match read(text).result {
        Err(error) => error.to_string(),
        Ok(counts) => panic!("the file was read ({counts:?}); expected a refusal"),
    }
}

/// The one rejected row of a file whose other rows convert.
fn only_rejection(text: &[u8], default_dopant: Option<&str>) -> String {
    let read = read_with(text, default_dopant);
    let counts = read.result.expect("the file as a whole is readable");
    assert_eq!(counts.rejected, 1, "rejected: {:?}", read.rejected);
    assert_eq!(counts.read, counts.converted + counts.rejected);
    assert_eq!(read.rejected.len(), 1);
    read.rejected[0].clone()
}

/// Every column name, as the header messages list them.
const COLUMNS: &str = "lot, wafer, site, x, y, dopant, type, resistivity, sheet_resistance, \
                       thickness, volts, amps, spacing, r_a, r_b, uncertainty, geometry";

/// One `#[test]` per file the reader refuses as a whole, with the exact message.
macro_rules! refused_files {
    ($($name:ident: $text:expr => $message:expr;)+) => {
        $(
            #[test]
            fn $name() {
                let owned = $text;
                let text: &[u8] = owned.as_ref();
                assert_eq!(refusal(text), $message);
            }
        )+
    };
}

refused_files! {
    empty_file: "" =>
        "no header line: the file is empty or holds only blank and comment lines; the first \
         other line must name the columns, e.g. lot,wafer,site,resistivity [ohm-cm]";
    only_blank_and_comment_lines: "\n   \n# exported 2024-05-01\n\r\n" =>
        "no header line: the file is empty or holds only blank and comment lines; the first \
         other line must name the columns, e.g. lot,wafer,site,resistivity [ohm-cm]";
    only_a_byte_order_mark: b"\xEF\xBB\xBF" =>
        "no header line: the file is empty or holds only blank and comment lines; the first \
         other line must name the columns, e.g. lot,wafer,site,resistivity [ohm-cm]";
    header_names_none_of_the_columns: "Operator,Tool,Reading\nAK,P2,10.1\n" =>
        format!("line 1: \"Operator,Tool,Reading\" is not a header: it names none of the columns {COLUMNS}");
    data_before_any_header: "# dopant: B\n10.1,9.9,10.3\nlot,wafer,resistivity\n" =>
        format!("line 2: \"10.1,9.9,10.3\" is not a header: it names none of the columns {COLUMNS}");
    long_non_header_is_shortened: format!("{}\n", "q".repeat(200)) =>
        format!("line 1: \"{}...\" is not a header: it names none of the columns {COLUMNS}", "q".repeat(80));
    column_given_twice: "lot,wafer,resistivity,Resistivity [ohm-cm]\n" =>
        "line 1: header: column resistivity appears twice; keep one";
    unit_on_a_text_column: "lot [mm],wafer,resistivity\n" =>
        "line 1: header: column lot: unit [mm] is not allowed; lot is text and takes no unit";
    unit_unknown_for_the_column: "lot,wafer,sheet_resistance,thickness [mil]\n" =>
        "line 1: header: column thickness: unit [mil] is not an accepted length unit; allowed: \
         cm (default), mm, um, µm, nm, m";
    unit_of_another_quantity: "lot,wafer,resistivity [ohm/sq]\n" =>
        "line 1: header: column resistivity: unit [ohm/sq] is not an accepted resistivity unit; \
         allowed: ohm-cm (default), mohm-cm, kohm-cm, ohm-m";
    uncertainty_unit_not_percent: "lot,wafer,resistivity,uncertainty [ppm]\n" =>
        "line 1: header: column uncertainty: unit [ppm] is not allowed; uncertainty is a \
         percentage: write [%] or no unit";
    no_lot_column: "wafer,resistivity,dopant\n" =>
        "line 1: header: no lot column; add one, or give the lot for the whole file with a line \
         '# lot: NAME' before the header";
    no_wafer_column: "lot,resistivity,dopant\n" =>
        "line 1: header: no wafer column; add one, or give '# wafer: NAME' before the header";
    x_without_y: "lot,wafer,x,resistivity,dopant\n" =>
        "line 1: header: x and y come as a pair; give both columns or neither";
    volts_without_amps: "lot,wafer,volts,thickness,spacing,dopant\n" =>
        "line 1: header: volts and amps come as a pair; give both columns or neither";
    no_measurement_column: "lot,wafer,site,dopant\n" =>
        "line 1: header: no measurement column; give resistivity, sheet_resistance (with \
         thickness), volts and amps (with spacing and thickness) or r_a and r_b (with thickness)";
    van_der_pauw_without_thickness: "lot,wafer,r_a,r_b,dopant\n" =>
        "line 1: header: r_a and r_b need a thickness: add a thickness column or a line \
         '# thickness: 2 um' before the header";
    van_der_pauw_half_a_pair: "lot,wafer,r_a,thickness,dopant\n" =>
        "line 1: header: r_a and r_b come as a pair; give both columns or neither";
    sheet_resistance_without_thickness: "lot,wafer,sheet_resistance,dopant\n" =>
        "line 1: header: sheet_resistance needs a thickness: add a thickness column or a line \
         '# thickness: 525 um' before the header";
    probe_without_thickness: "lot,wafer,volts,amps,spacing,dopant\n" =>
        "line 1: header: volts and amps on a thin layer need a thickness: add a thickness column \
         or a line '# thickness: 525 um' before the header, or '# geometry: bulk' for a bulk \
         sample";
    probe_geometry_unknown: "# geometry: slab\nlot,wafer,volts,amps,spacing,dopant\n" =>
        "line 1: setting: \"slab\" is not a probe geometry; give thin-layer (sheet resistance of \
         a layer or wafer; resistivity with its thickness) or bulk (semi-infinite sample)";
    probe_without_spacing: "lot,wafer,volts,amps,thickness,dopant\n" =>
        "line 1: header: volts and amps need the probe spacing: add a spacing column or a line \
         '# spacing: 1 mm' before the header";
    no_dopant_anywhere: "lot,wafer,resistivity\nA1,1,10\n" =>
        "line 1: header: no dopant: add a dopant or type column, a line '# dopant: B' before the \
         header, or name the dopant for all files (--dopant)";
    header_quote_not_closed: "lot,\"wafer,resistivity\n" =>
        "line 1: header: field 2: the quote opened here is not closed on this line (a field may \
         not span lines)";
    setting_for_a_column_that_cannot_be_set: "# resistivity: 10\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: resistivity cannot be set for a whole file; it belongs in a column \
         (settings: lot, wafer, dopant, type, thickness, spacing, uncertainty, geometry, \
         diameter, notch, flat)";
    diameter_in_inches: "# diameter: 6 in\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: diameter: \"6 in\": not a length unit bandgauge reads; allowed: \
         mm (for a bare number), cm, um, nm, m";
    diameter_not_a_length: "# diameter: large\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: diameter: \"large\" is not a length; give the wafer diameter, \
         e.g. 150 mm";
    diameter_negative: "# diameter: -150 mm\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: diameter: \"-150 mm\" is -150 mm; a wafer diameter is more than 0 \
         and at most 1000 mm (standard: 100, 150, 200, 300 mm)";
    diameter_too_large: "# diameter: 2 m\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: diameter: \"2 m\" is 2000 mm; a wafer diameter is more than 0 and \
         at most 1000 mm (standard: 100, 150, 200, 300 mm)";
    diameter_without_a_value: "# diameter:\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: diameter: no value after the name; give the wafer diameter, e.g. \
         150 mm";
    notch_angle_of_360: "# notch: 360\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: notch: \"360\" is outside 0 to 360; give the direction from the \
         wafer centre in degrees anticlockwise from +x, 0 <= angle < 360 (270 = at the \
         bottom)";
    notch_angle_negative: "# notch: -90\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: notch: \"-90\" is outside 0 to 360; give the direction from the \
         wafer centre in degrees anticlockwise from +x, 0 <= angle < 360 (270 = at the \
         bottom)";
    flat_angle_not_a_number: "# flat: bottom\nlot,wafer,dopant,resistivity\n" =>
        "line 1: setting: flat: \"bottom\" is not a number; give the direction from the \
         wafer centre in degrees anticlockwise from +x, 0 <= angle < 360 (270 = at the \
         bottom)";
    notch_and_flat_both_given: "# notch: 270\n# diameter: 200 mm\n# flat: 270\nlot,wafer,dopant,resistivity\n" =>
        "line 3: setting: flat: the notch is already given on line 1; a wafer has a notch \
         or a flat, give only one";
    setting_without_a_value: "# lot:\nwafer,dopant,resistivity\n" =>
        "line 1: setting: lot: no value after the name";
    setting_with_an_unknown_dopant: "# dopant: Ga\nlot,wafer,resistivity\n" =>
        "line 1: setting: dopant 'Ga' has no empirical silicon relation; give B, P, As or Sb \
         (or boron, phosphorus, arsenic, antimony)";
    setting_with_a_bad_type: "# type: intrinsic\nlot,wafer,resistivity\n" =>
        "line 1: setting: type 'intrinsic' is not a conductivity type; give n or p (n-type, p-type)";
    setting_with_a_bad_number: "# thickness: thick\nlot,wafer,sheet_resistance,dopant\n" =>
        "line 1: setting: thickness: \"thick\" is not a number; give a length such as 0.0525 or \
         525 um; units: cm (default), mm, um, µm, nm, m";
    setting_with_a_bad_unit: "# spacing: 40 mil\nlot,wafer,volts,amps,thickness,dopant\n" =>
        "line 1: setting: spacing: \"40 mil\": \"mil\" is not an accepted length unit; allowed: \
         cm (default), mm, um, µm, nm, m";
    setting_with_an_uncertainty_of_100_percent: "# uncertainty: 100\nlot,wafer,resistivity,dopant\n" =>
        "line 1: setting: uncertainty: \"100\" is not allowed; give a percentage >= 0 and < 100";
    latin1_text_before_the_header: b"# Messung bei 23 \xB0C\nlot,wafer,resistivity\n" =>
        "line 1: not UTF-8 text; save the file as UTF-8 (or plain ASCII) CSV";
    utf16_file: b"\xFF\xFEl\0o\0t\0,\0w\0a\0f\0e\0r\0\n\0" =>
        "line 1: not UTF-8 text; save the file as UTF-8 (or plain ASCII) CSV";
    binary_file_with_no_line_breaks: vec![b'z'; (1 << 20) + 1] =>
        "line 1: longer than 1048576 bytes; this does not look like a lot file";
}

/// A file with a header and the given data rows (dopant B, resistivity in ohm cm).
fn with_header(header: &str, rows: &str) -> Vec<u8> {
    format!("{header}\n{rows}").into_bytes()
}

/// One `#[test]` per kind of rejected row: the file's one bad row, with the exact message.
/// `good` is a row that converts, put before the bad one so that the line number is 3.
macro_rules! rejected_rows {
    ($($name:ident: ($header:expr, $good:expr, $bad:expr $(, dopant $default:expr)?) => $message:expr;)+) => {
        $(
            #[test]
            fn $name() {
                #[allow(unused_mut, unused_assignments)]
                let mut default: Option<&str> = None;
                $(default = Some($default);)?
                let text = with_header($header, &format!("{}\n{}\n", $good, $bad));
                assert_eq!(only_rejection(&text, default), $message);
            }
        )+
    };
}

const RHO: &str = "lot,wafer,site,dopant,resistivity";
const SHEET: &str = "lot,wafer,site,dopant,sheet_resistance,thickness";
const PROBE: &str = "lot,wafer,site,dopant,volts,amps,spacing,thickness";

rejected_rows! {
    resistivity_not_a_number: (RHO, "A1,1,1,B,10", "A1,1,2,B,ten") =>
        "line 3: resistivity: \"ten\" is not a number; give a resistivity such as 10 or 850 \
         mohm-cm; units: ohm-cm (default), mohm-cm, kohm-cm, ohm-m";
    resistivity_in_an_unknown_unit: (RHO, "A1,1,1,B,10", "A1,1,2,B,10 ohm-in") =>
        "line 3: resistivity: \"10 ohm-in\": \"ohm-in\" is not an accepted resistivity unit; \
         allowed: ohm-cm (default), mohm-cm, kohm-cm, ohm-m";
    resistivity_negative: (RHO, "A1,1,1,B,10", "A1,1,2,B,-10") =>
        "line 3: resistivity: resistivity_ohm_cm: -1e1 is not allowed; give a finite value > 0 ohm cm";
    resistivity_zero: (RHO, "A1,1,1,B,10", "A1,1,2,B,0") =>
        "line 3: resistivity: resistivity_ohm_cm: 0e0 is not allowed; give a finite value > 0 ohm cm";
    resistivity_not_finite: (RHO, "A1,1,1,B,10", "A1,1,2,B,inf") =>
        "line 3: resistivity: \"inf\" is not a number; give a resistivity such as 10 or 850 \
         mohm-cm; units: ohm-cm (default), mohm-cm, kohm-cm, ohm-m";
    resistivity_overflows: (RHO, "A1,1,1,B,10", "A1,1,2,B,1e999") =>
        "line 3: resistivity: \"1e999\" is not a finite resistivity; give a finite number (about \
         1e308 at most)";
    resistivity_outside_the_relation: (RHO, "A1,1,1,B,10", "A1,1,2,B,5e4") =>
        "line 3: resistivity: resistivity_ohm_cm: 5e4 ohm cm is outside the boron relation (ASTM \
         F723, 23 C); give 1e-4 to 1e4 ohm cm";
    decimal_comma_in_a_comma_file: (RHO, "A1,1,1,B,10", "A1,1,2,B,\"10,5\"") =>
        "line 3: resistivity: \"10,5\" contains a comma; write decimals with a point (2.5, not \
         2,5) and no thousands separators (decimal commas are read only in files delimited by \
         semicolons or tabs)";
    thousands_separator_in_a_semicolon_file: ("lot;wafer;site;dopant;resistivity", "A1;1;1;B;10,5", "A1;1;2;B;1.000,5") =>
        "line 3: resistivity: \"1.000,5\" mixes commas and points or has several commas; write \
         one decimal mark and no thousands separators";
    unquoted_delimiter_in_a_value: (RHO, "A1,1,1,B,10", "A1,1,2,B,10,5") =>
        "line 3: 6 fields, but the header (line 1) has 5; check for an unquoted delimiter in a value";
    empty_lot: (RHO, "A1,1,1,B,10", ",1,2,B,10") =>
        "line 3: lot: empty; every row needs a lot";
    empty_wafer: (RHO, "A1,1,1,B,10", "A1, ,2,B,10") =>
        "line 3: wafer: empty; every row needs a wafer";
    y_missing_beside_x: ("lot,wafer,x,y,dopant,resistivity", "A1,1,0,0,B,10", "A1,1,5,,B,10") =>
        "line 3: y: empty while the other coordinate is given; give both x and y or neither";
    position_not_a_number: ("lot,wafer,x,y,dopant,resistivity", "A1,1,0,0,B,10", "A1,1,5 mm,north,B,10") =>
        "line 3: y: \"north\" is not a number; give a length such as 0.0525 or 525 um; units: cm \
         (default), mm, um, µm, nm, m";
    dopant_without_a_relation: (RHO, "A1,1,1,B,10", "A1,1,2,Ga,10") =>
        "line 3: dopant: dopant 'Ga' has no empirical silicon relation; give B, P, As or Sb (or \
         boron, phosphorus, arsenic, antimony)";
    type_not_n_or_p: ("lot,wafer,site,type,resistivity", "A1,1,1,p,10", "A1,1,2,i,10") =>
        "line 3: type: type 'i' is not a conductivity type; give n or p (n-type, p-type)";
    type_contradicts_dopant: ("lot,wafer,site,dopant,type,resistivity", "A1,1,1,B,p,10", "A1,1,2,B,n,10") =>
        "line 3: type: type n contradicts dopant B, which makes silicon p-type";
    lot_mixes_conductivity_types: (RHO, "A1,1,1,B,10", "A1,1,2,P,10") =>
        "line 3: dopant: lot A1 is p-type (B) from its first row; this row is n-type (P); a lot \
         holds one conductivity type";
    dopant_empty_without_a_default: (RHO, "A1,1,1,B,10", "A1,1,2,,10") =>
        "line 3: dopant: empty, and no type, file setting or default dopant is given";
    default_dopant_without_a_relation: (RHO, "A1,1,1,B,10", "A1,1,2,,10", dopant "Ga") =>
        "line 3: dopant 'Ga' has no empirical silicon relation; give B, P, As or Sb (or boron, \
         phosphorus, arsenic, antimony)";
    no_measurement_filled: (RHO, "A1,1,1,B,10", "A1,1,2,B,") =>
        "line 3: no measurement; fill resistivity, sheet_resistance, volts and amps, or r_a and r_b";
    two_measurements_filled: ("lot,wafer,dopant,resistivity,sheet_resistance,thickness", "A1,1,B,10,,", "A1,1,B,10,190,525") =>
        "line 3: more than one measurement filled (resistivity, sheet_resistance, volts/amps, \
         r_a/r_b); give one per row";
    van_der_pauw_without_r_b: ("lot,wafer,dopant,r_a,r_b,thickness [um]", "A1,1,B,500,500,2", "A1,1,B,500,,2") =>
        "line 3: r_b: empty; a van der Pauw reading needs both r_a and r_b";
    van_der_pauw_zero: ("lot,wafer,dopant,r_a,r_b,thickness [um]", "A1,1,B,500,500,2", "A1,1,B,500,0,2") =>
        "line 3: r_b: r_b_ohm: 0e0 is not allowed; give a finite resistance V/I > 0 (for a \
         reversed-polarity reading divide the reversed voltage by the reversed current)";
    sheet_resistance_without_its_thickness: (SHEET, "A1,1,1,B,190,525", "A1,1,2,B,190,") =>
        "line 3: thickness: empty; this measurement needs the thickness";
    sheet_resistance_zero: (SHEET, "A1,1,1,B,190,525", "A1,1,2,B,0,525") =>
        "line 3: sheet_resistance: sheet_resistance_ohm_sq: 0e0 is not allowed; give a finite \
         value > 0";
    thickness_negative: (SHEET, "A1,1,1,B,190,525", "A1,1,2,B,190,-525") =>
        "line 3: sheet_resistance: thickness_cm: -5.25e-2 is not allowed; give a finite value > 0";
    probe_volts_without_amps: (PROBE, "A1,1,1,B,12.5 mV,1 mA,1,525", "A1,1,2,B,12.5 mV,,1,525") =>
        "line 3: amps: empty; a probe reading needs both volts and amps";
    probe_row_without_spacing: (PROBE, "A1,1,1,B,12.5 mV,1 mA,1,525", "A1,1,2,B,12.5 mV,1 mA,,525") =>
        "line 3: spacing: empty; a probe reading needs the probe spacing";
    probe_current_zero: (PROBE, "A1,1,1,B,12.5 mV,1 mA,1,525", "A1,1,2,B,12.5 mV,0,1,525") =>
        "line 3: amps: 0e0 is not allowed; give a finite value > 0";
    probe_voltage_in_ohms: (PROBE, "A1,1,1,B,12.5 mV,1 mA,1,525", "A1,1,2,B,12.5 ohm,1 mA,1,525") =>
        "line 3: volts: \"12.5 ohm\": \"ohm\" is not an accepted voltage unit; allowed: V \
         (default), mV, uV, µV";
    uncertainty_not_a_percentage: ("lot,wafer,dopant,resistivity,uncertainty", "A1,1,B,10,2", "A1,1,B,10,two") =>
        "line 3: uncertainty: \"two\" is not a percentage; give a number such as 2 or 2 % (a \
         half-width)";
    uncertainty_of_100_percent_or_more: ("lot,wafer,dopant,resistivity,uncertainty", "A1,1,B,10,2", "A1,1,B,10,150 %") =>
        "line 3: uncertainty: \"150 %\" is not allowed; give a percentage >= 0 and < 100";
    uncertainty_negative: ("lot,wafer,dopant,resistivity,uncertainty", "A1,1,B,10,2", "A1,1,B,10,-1") =>
        "line 3: uncertainty: \"-1\" is not allowed; give a percentage >= 0 and < 100";
    quote_not_closed: (RHO, "A1,1,1,B,10", "A1,1,\"2,B,10") =>
        "line 3: field 3: the quote opened here is not closed on this line (a field may not span \
         lines)";
    text_after_a_closing_quote: (RHO, "A1,1,1,B,10", "A1,1,\"2\"b,B,10") =>
        "line 3: field 3: text after the closing quote; quote the whole field";
}

#[test]
fn invalid_utf8_in_a_data_row_rejects_that_row_only() {
    let mut text = b"lot,wafer,site,dopant,resistivity\nA1,1,1,B,10\nA1,1,".to_vec();
    text.extend_from_slice(b"\xE9,B,10\nA1,1,3,B,11\n");
    let read = read(&text);
    let counts = read.result.expect("readable");
    assert_eq!((counts.read, counts.converted, counts.rejected), (3, 2, 1));
    assert_eq!(
        read.rejected,
        ["line 3: not UTF-8 text (bad byte at position 6); save the file as UTF-8"]
    );
}

// ---------------------------------------------------------------------------------------------
// Notes: the file is read, and the page and the CLI say what was set aside.
// ---------------------------------------------------------------------------------------------

#[test]
fn unknown_setting_is_read_as_a_comment_with_a_note() {
    let read = read(b"# operator: AK\n# dopant: B\nlot,wafer,resistivity\nA1,1,10\n");
    assert_eq!(read.result.expect("readable").converted, 1);
    assert_eq!(
        read.notes,
        [
            "line 1: 'operator' is not a setting bandgauge knows; the line is read as a comment \
          (settings: lot, wafer, dopant, type, thickness, spacing, uncertainty, geometry, \
          diameter, notch, flat)"
        ]
    );
}

#[test]
fn columns_that_are_not_ours_are_ignored_with_a_note() {
    let read = read(b"lot,wafer,operator,dopant,resistivity,Temp [C]\nA1,1,AK,B,10,23\n");
    assert_eq!(read.result.expect("readable").converted, 1);
    assert_eq!(
        read.notes,
        ["line 1: column(s) operator, Temp [C] are not ours and are ignored"]
    );
}

// ---------------------------------------------------------------------------------------------
// Accepted: oddities of real exports that must not be refused.
// ---------------------------------------------------------------------------------------------

/// Reads `text` and gives (read, converted, rejected).
fn counts_of(text: &[u8]) -> (u64, u64, u64) {
    let read = read(text);
    assert!(read.rejected.is_empty(), "{:?}", read.rejected);
    let c = read.result.expect("readable");
    (c.read, c.converted, c.rejected)
}

#[test]
fn byte_order_mark_and_crlf_line_ends_are_read() {
    let text = b"\xEF\xBB\xBFlot,wafer,dopant,resistivity\r\nA1,1,B,10\r\nA1,1,B,11\r\n";
    assert_eq!(counts_of(text), (2, 2, 0));
}

#[test]
fn crlf_line_ends_keep_line_numbers() {
    let text = b"lot,wafer,dopant,resistivity\r\nA1,1,B,10\r\n\r\nA1,1,B,x\r\n";
    let read = read(text);
    assert_eq!(read.rejected.len(), 1);
    assert!(
        read.rejected[0].starts_with("line 4: resistivity: \"x\""),
        "{:?}",
        read.rejected
    );
}

#[test]
fn quoted_fields_may_hold_the_delimiter_and_doubled_quotes() {
    let text = b"lot,wafer,site,dopant,resistivity\n\"A1, north\",1,\"say \"\"hi\"\"\",B,10\n";
    assert_eq!(counts_of(text), (1, 1, 0));
}

#[test]
fn decimal_commas_are_read_in_semicolon_and_tab_files() {
    assert_eq!(
        counts_of(b"lot;wafer;dopant;resistivity\nA1;1;B;10,5\n"),
        (1, 1, 0)
    );
    assert_eq!(
        counts_of(b"lot\twafer\tdopant\tresistivity\nA1\t1\tB\t10,5\n"),
        (1, 1, 0)
    );
}

#[test]
fn a_last_line_without_a_line_break_is_read() {
    assert_eq!(
        counts_of(b"lot,wafer,dopant,resistivity\nA1,1,B,10"),
        (1, 1, 0)
    );
}

#[test]
fn a_file_with_a_header_and_no_rows_is_read_as_empty() {
    assert_eq!(counts_of(b"lot,wafer,dopant,resistivity\n"), (0, 0, 0));
}
