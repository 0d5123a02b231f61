//! The lot-file reader: every accepted file form, every kind of bad row with its line and
//! column, file-level refusals, chunked input, and counts that always add up.
//!
//! Check values are the numbers written into each small test file and read back (parser echoes,
//! invented data, no published source); conversions are compared with the empirical relation's
//! own functions in the core.

use bandgauge_core::empirical::EmpiricalRelation;
use bandgauge_core::lots::map::{Orientation, OrientationMark, WaferOutline};
use bandgauge_core::lots::{
    Column, LotBook, LotFileError, LotReader, MAX_LINE_BYTES, Measurement, ReadOptions, RowCounts,
    RowOutcome, RowRejection, read_str,
};
use bandgauge_core::probe::ProbeGeometry;

/// Unit conversions are powers of ten applied in f64: a few ulps.
const UNIT_RELATIVE: f64 = 1e-14;
/// The thin-sheet formula against the exact finite-thickness correction at t/s = 0.05: the
/// correction differs from 1 by far less than this.
const THIN_SHEET_RELATIVE: f64 = 1e-4;
/// The empirical relations' stated self-consistency (ASTM F723): 3 % for boron.
const BORON_RELATION_RELATIVE: f64 = 0.03;

/// A converted site with its text owned, for comparison after reading.
#[derive(Debug, Clone, PartialEq)]
struct Row {
    line: u64,
    lot: String,
    wafer: String,
    site: String,
    x_mm: Option<f64>,
    y_mm: Option<f64>,
    dopant: &'static str,
    relation: EmpiricalRelation,
    measurement: Measurement,
    resistivity_ohm_cm: f64,
    density_cm3: f64,
    uncertainty: Option<f64>,
    outline: WaferOutline,
}

#[derive(Debug)]
struct Outcome {
    result: Result<RowCounts, LotFileError>,
    rows: Vec<Row>,
    rejected: Vec<RowRejection>,
    notes: Vec<String>,
    book: LotBook,
}

fn read_chunked(bytes: &[u8], options: &ReadOptions, chunk: usize) -> Outcome {
    let mut book = LotBook::new();
    let mut reader = LotReader::new(options.clone());
    let mut rows = Vec::new();
    let mut rejected = Vec::new();
    let mut on_row = |outcome: RowOutcome<'_, '_>| match outcome {
        RowOutcome::Converted(site) => rows.push(Row {
            line: site.line,
            lot: site.lot.to_owned(),
            wafer: site.wafer.to_owned(),
            site: site.site.to_owned(),
            x_mm: site.x_mm,
            y_mm: site.y_mm,
            dopant: site.dopant,
            relation: site.relation,
            measurement: site.measurement,
            resistivity_ohm_cm: site.resistivity_ohm_cm,
            density_cm3: site.density_cm3,
            uncertainty: site.uncertainty,
            outline: site.outline,
        }),
        RowOutcome::Rejected(rejection) => rejected.push(rejection.clone()),
    };
    let mut result = Ok(RowCounts::default());
    for piece in bytes.chunks(chunk.max(1)) {
        if let Err(error) = reader.feed(piece, &mut book, &mut on_row) {
            result = Err(error);
            break;
        }
    }
    if result.is_ok() {
        result = reader.finish(&mut book, &mut on_row);
    }
    let notes = reader.notes().to_vec();
    Outcome {
        result,
        rows,
        rejected,
        notes,
        book,
    }
}

fn read_with(text: &str, options: &ReadOptions) -> Outcome {
    read_chunked(text.as_bytes(), options, usize::MAX)
}

fn read(text: &str) -> Outcome {
    read_with(text, &ReadOptions::default())
}

fn boron() -> ReadOptions {
    ReadOptions {
        default_dopant: Some("B".to_owned()),
    }
}

/// Checks that the counts add up and match what was handed on, and returns them.
fn counts(outcome: &Outcome) -> RowCounts {
    let counts = outcome.result.clone().expect("the file reads");
    assert_eq!(
        counts.read,
        counts.converted + counts.rejected,
        "{counts:?}"
    );
    assert_eq!(counts.converted as usize, outcome.rows.len());
    assert_eq!(counts.rejected as usize, outcome.rejected.len());
    assert_eq!(outcome.book.counts(), counts, "book and reader agree");
    counts
}

fn close(actual: f64, expected: f64, relative: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= relative * expected.abs(),
        "{what}: got {actual:e}, expected {expected:e}"
    );
}

/// The single rejection of `outcome`, checked for its line and column.
fn only_rejection(outcome: &Outcome, line: u64, column: Option<Column>) -> String {
    counts(outcome);
    assert_eq!(outcome.rejected.len(), 1, "{:?}", outcome.rejected);
    let rejection = &outcome.rejected[0];
    assert_eq!(rejection.line, line, "{rejection}");
    assert_eq!(rejection.column, column, "{rejection}");
    rejection.reason.clone()
}

#[test]
fn comma_file_with_every_position_column() {
    let text = "lot,wafer,site,x,y,dopant,resistivity\n\
                K7,01,1,0,0,B,10.0\n\
                K7,01,2,-45.5,30,b,10.2\n";
    let outcome = read(text);
    let c = counts(&outcome);
    assert_eq!((c.read, c.converted, c.rejected), (2, 2, 0));
    let row = &outcome.rows[1];
    assert_eq!(
        (
            row.line,
            row.lot.as_str(),
            row.wafer.as_str(),
            row.site.as_str()
        ),
        (3, "K7", "01", "2")
    );
    // Bare x and y are millimetres.
    assert_eq!((row.x_mm, row.y_mm), (Some(-45.5), Some(30.0)));
    assert_eq!((row.dopant, row.relation), ("B", EmpiricalRelation::Boron));
    assert_eq!(row.measurement, Measurement::Resistivity);
    assert_eq!(row.resistivity_ohm_cm, 10.2);
    assert_eq!(row.uncertainty, None);
}

#[test]
fn conversion_follows_the_published_table() {
    // Source: Hull (ed.), Properties of Crystalline Silicon, EMIS Datareviews 20 (1999),
    // resistivity table after ASTM F723: p-type 1e16 cm^-3 is 1.44 ohm cm, 1e15 is 13.3.
    let outcome = read("lot,wafer,dopant,resistivity\nA,1,B,1.44\nA,1,B,13.3\n");
    counts(&outcome);
    close(
        outcome.rows[0].density_cm3,
        1e16,
        BORON_RELATION_RELATIVE,
        "1.44 ohm cm",
    );
    close(
        outcome.rows[1].density_cm3,
        1e15,
        BORON_RELATION_RELATIVE,
        "13.3 ohm cm",
    );
}

#[test]
fn semicolon_file_with_decimal_commas() {
    let text = "lot;wafer;site;x [mm];y [mm];resistivity [ohm-cm];uncertainty [%]\n\
                A;1;1;-12,5;3,0;9,87;1,5\n";
    let outcome = read_with(text, &boron());
    counts(&outcome);
    let row = &outcome.rows[0];
    assert_eq!((row.x_mm, row.y_mm), (Some(-12.5), Some(3.0)));
    assert_eq!(row.resistivity_ohm_cm, 9.87);
    close(row.uncertainty.unwrap(), 0.015, 1e-15, "1,5 %");
}

#[test]
fn tab_file_with_decimal_commas_and_empty_cells() {
    let text = "lot\twafer\tsite\tresistivity\tsheet_resistance\tthickness [um]\n\
                A\t1\t1\t9,5\t\t\n\
                A\t1\t2\t\t190,0\t525\n";
    let outcome = read_with(text, &boron());
    let c = counts(&outcome);
    assert_eq!(c.converted, 2);
    assert_eq!(outcome.rows[0].resistivity_ohm_cm, 9.5);
    // Source: rho = R_s t (definition of sheet resistance): 190 ohm/sq x 525 um = 9.975 ohm cm.
    close(
        outcome.rows[1].resistivity_ohm_cm,
        9.975,
        UNIT_RELATIVE,
        "sheet x thickness",
    );
    assert_eq!(
        outcome.rows[1].measurement,
        Measurement::SheetResistance {
            sheet_resistance_ohm_sq: 190.0,
            thickness_cm: 0.0525
        }
    );
}

#[test]
fn van_der_pauw_columns_give_the_sheet_resistance() {
    let text = "# thickness: 2 um\nlot,wafer,site,R_A [kohm],r_b\n\
                A,1,1,0.5,500\n\
                A,1,2,1,500\n\
                A,1,3,,500\n";
    let outcome = read_with(text, &boron());
    let c = counts(&outcome);
    assert_eq!(c.converted, 2);
    assert_eq!(c.rejected, 1);
    // Source: van der Pauw, Philips Res. Rep. 13, 1 (1958): R_A = R_B = R gives
    // R_s = pi R / ln 2; 500 ohm -> 2266.18 ohm/sq, times 2 um = 0.453236 ohm cm.
    close(
        outcome.rows[0].resistivity_ohm_cm,
        std::f64::consts::PI * 500.0 / std::f64::consts::LN_2 * 2e-4,
        UNIT_RELATIVE,
        "symmetric structure",
    );
    // Source: mpmath 1.4.1 (core/tests/data/gen_vdp_reference.py): R_s/R_B at R_A/R_B = 2 is
    // 6.5285026052729938135; R_B = 500 ohm, t = 2 um.
    close(
        outcome.rows[1].resistivity_ohm_cm,
        6.528_502_605_272_994 * 500.0 * 2e-4,
        UNIT_RELATIVE,
        "ratio 2",
    );
    assert!(matches!(
        outcome.rows[1].measurement,
        Measurement::VanDerPauw { r_a_ohm, r_b_ohm, .. } if r_a_ohm == 1000.0 && r_b_ohm == 500.0
    ));
    let missing = &outcome.rejected[0];
    assert_eq!((missing.line, missing.column), (5, Some(Column::RA)));
    assert_eq!(
        missing.reason,
        "empty; a van der Pauw reading needs both r_a and r_b"
    );
}

#[test]
fn bom_crlf_and_a_last_line_without_break() {
    let text = "\u{feff}lot,wafer,resistivity\r\nA,1,10\r\nA,1,11";
    let outcome = read_with(text, &boron());
    assert_eq!(counts(&outcome).converted, 2);
    assert_eq!(
        outcome.rows[0].lot, "A",
        "the BOM is not part of the first column name"
    );
    assert_eq!(outcome.rows[1].resistivity_ohm_cm, 11.0);
    assert_eq!(outcome.rows[1].line, 3);
}

#[test]
fn quoted_fields() {
    let text = "\"lot\",\"wafer\",\"site\",\"resistivity [ohm-cm]\"\n\
                \"K7, split A\",\"W 01\",\"say \"\"centre\"\"\",\"10.5\"\n\
                K8 ,  \"2\"  , 3 , 9.5 \n";
    let outcome = read_with(text, &boron());
    counts(&outcome);
    assert_eq!(outcome.rows[0].lot, "K7, split A");
    assert_eq!(outcome.rows[0].wafer, "W 01");
    assert_eq!(outcome.rows[0].site, "say \"centre\"");
    assert_eq!(outcome.rows[0].resistivity_ohm_cm, 10.5);
    assert_eq!(
        (outcome.rows[1].lot.as_str(), outcome.rows[1].wafer.as_str()),
        ("K8", "2")
    );
}

#[test]
fn units_in_the_header_and_in_cells() {
    let text = "lot,wafer,resistivity [mohm-cm],thickness (mm),sheet_resistance [kohm/sq]\n\
                A,1,850,,\n\
                A,1,0.9 ohm-cm,,\n\
                A,2,,0.5,0.02\n";
    let outcome = read_with(text, &boron());
    counts(&outcome);
    close(
        outcome.rows[0].resistivity_ohm_cm,
        0.85,
        UNIT_RELATIVE,
        "850 mohm-cm",
    );
    // A unit written in the cell wins over the header's.
    close(
        outcome.rows[1].resistivity_ohm_cm,
        0.9,
        UNIT_RELATIVE,
        "0.9 ohm-cm",
    );
    // 0.02 kohm/sq = 20 ohm/sq times 0.5 mm = 0.05 cm: 1 ohm cm.
    close(
        outcome.rows[2].resistivity_ohm_cm,
        1.0,
        UNIT_RELATIVE,
        "kohm/sq x mm",
    );
}

#[test]
fn blank_lines_comments_and_empty_rows_are_not_rows() {
    let text = "\n# exported by the line-3 prober\n\nlot;wafer;resistivity\n\n;;\n  \nA;1;10\n# pause\n\r\nA;1;11\n\n";
    let outcome = read_with(text, &boron());
    let c = counts(&outcome);
    assert_eq!((c.read, c.converted), (2, 2));
    assert_eq!(outcome.rows[1].line, 11);
}

#[test]
fn outline_settings_reach_every_site_and_the_lot() {
    // Each written form and the outline it states (lengths: 1 in = 25.4 mm is not offered;
    // cm and um are, by the reader's unit table).
    let cases: [(&str, WaferOutline); 5] = [
        ("", WaferOutline::default()),
        (
            "# diameter: 150 mm\n# notch: 270\n",
            WaferOutline {
                diameter_mm: Some(150.0),
                orientation: Some(Orientation {
                    mark: OrientationMark::Notch,
                    angle_deg: 270.0,
                }),
            },
        ),
        (
            "# diameter = 20 cm\n# flat: 0\n",
            WaferOutline {
                diameter_mm: Some(200.0),
                orientation: Some(Orientation {
                    mark: OrientationMark::Flat,
                    angle_deg: 0.0,
                }),
            },
        ),
        (
            "# Diameter: 300\n",
            WaferOutline {
                diameter_mm: Some(300.0),
                orientation: None,
            },
        ),
        (
            "# FLAT: 89.5 deg\n",
            WaferOutline {
                diameter_mm: None,
                orientation: Some(Orientation {
                    mark: OrientationMark::Flat,
                    angle_deg: 89.5,
                }),
            },
        ),
    ];
    for (settings, expected) in cases {
        let text =
            format!("{settings}lot,wafer,x,y,dopant,resistivity\nA,1,0,0,B,10\nA,1,5,5,B,11\n");
        let outcome = read(&text);
        counts(&outcome);
        assert!(
            outcome.rows.iter().all(|r| r.outline == expected),
            "{settings:?}"
        );
        let report = outcome.book.report(None);
        assert_eq!(report.lots[0].outline, expected, "{settings:?}");
    }
    // 100000 um is 100 mm (unit conversion in f64).
    let outcome = read("# diameter: 100000 um\nlot,wafer,dopant,resistivity\nA,1,B,10\n");
    let d = outcome.rows[0].outline.diameter_mm.unwrap();
    close(d, 100.0, UNIT_RELATIVE, "diameter in um");
}

#[test]
fn settings_before_the_header_fill_every_row() {
    let text = "# lot: Q-118\n# dopant = P\n# thickness: 675 um\n# spacing: 1.0 mm\n# uncertainty: 2 %\n\
                wafer,site,volts,amps\n\
                3,1,0.0441,0.001\n";
    let outcome = read(text);
    counts(&outcome);
    let row = &outcome.rows[0];
    assert_eq!((row.lot.as_str(), row.dopant), ("Q-118", "P"));
    assert_eq!(row.uncertainty, Some(0.02));
    let Measurement::Probe {
        thickness_cm,
        spacing_cm,
        ..
    } = row.measurement
    else {
        panic!("a probe reading: {:?}", row.measurement);
    };
    assert_eq!((thickness_cm, spacing_cm), (Some(0.0675), 0.1));
    // A typo in a setting name is kept as a comment, with a note.
    let outcome = read_with("# dopnat: B\nlot,wafer,resistivity\nA,1,10\n", &boron());
    counts(&outcome);
    assert!(
        outcome.notes.iter().any(|n| n.contains("dopnat")),
        "{:?}",
        outcome.notes
    );
}

#[test]
fn four_point_probe_on_a_thin_layer_follows_the_thin_sheet_formula() {
    // t/s = 0.005 cm / 0.1 cm = 0.05: the finite-thickness factor is 1 to far below 1e-4.
    // Source: Smits, Bell Syst. Tech. J. 37, 711 (1958): R_s = (pi / ln 2) V / I for a thin
    // infinite sheet; rho = R_s t.
    let text =
        "lot,wafer,dopant,volts [mV],amps [mA],spacing [mm],thickness [um]\nA,1,P,4.4,1,1,50\n";
    let outcome = read(text);
    counts(&outcome);
    let expected = std::f64::consts::PI / std::f64::consts::LN_2 * 4.4e-3 / 1e-3 * 50e-4;
    close(
        outcome.rows[0].resistivity_ohm_cm,
        expected,
        THIN_SHEET_RELATIVE,
        "probe rho",
    );
    assert_eq!(outcome.rows[0].relation, EmpiricalRelation::Phosphorus);
    assert!(matches!(
        outcome.rows[0].measurement,
        Measurement::Probe {
            geometry: ProbeGeometry::ThinLayer,
            ..
        }
    ));
}

#[test]
fn four_point_probe_on_a_bulk_sample_needs_no_thickness() {
    // Source: Valdes, Proc. IRE 42, 420 (1954): rho = 2 pi s V/I on a semi-infinite body;
    // 2 pi x 0.1 cm x 15.9 mV / 1 mA = 9.990 ohm cm.
    let text =
        "# geometry: bulk\nlot,wafer,dopant,volts [mV],amps [mA],spacing [mm]\nA,1,P,15.9,1,1\n";
    let outcome = read(text);
    counts(&outcome);
    let expected = 2.0 * std::f64::consts::PI * 0.1 * 15.9;
    close(
        outcome.rows[0].resistivity_ohm_cm,
        expected,
        1e-14,
        "bulk rho",
    );
    assert_eq!(
        outcome.rows[0].measurement,
        Measurement::Probe {
            volts: 15.9e-3,
            amps: 1e-3,
            spacing_cm: 0.1,
            geometry: ProbeGeometry::Bulk,
            thickness_cm: None,
            sheet_resistance_ohm_sq: None,
        }
    );
    // A geometry column sets it per row; a thin-layer row without thickness is rejected by
    // name, and a geometry the reader does not know is refused with the allowed ones.
    let text = "lot,wafer,dopant,volts,amps,spacing,geometry\n\
                A,1,P,0.0159,0.001,1,bulk\n\
                A,2,P,0.0159,0.001,1,thin-layer\n\
                A,3,P,0.0159,0.001,1,slab\n";
    let outcome = read(text);
    let c = counts(&outcome);
    assert_eq!((c.converted, c.rejected), (1, 2));
    assert_eq!(outcome.rejected[0].column, Some(Column::Thickness));
    assert_eq!(outcome.rejected[1].column, Some(Column::Geometry));
    assert!(
        outcome.rejected[1].reason.contains("thin-layer")
            && outcome.rejected[1].reason.contains("bulk"),
        "{}",
        outcome.rejected[1].reason
    );
    // Without a thickness, a geometry column or a bulk setting the header is refused with the
    // three ways out.
    let mut book = LotBook::new();
    let error = read_str(
        "lot,wafer,dopant,volts,amps,spacing\nA,1,P,0.0159,0.001,1\n",
        &ReadOptions::default(),
        &mut book,
        &mut |_| {},
    )
    .unwrap_err();
    assert!(error.to_string().contains("# geometry: bulk"), "{error}");
}

#[test]
fn dopant_from_type_dopant_names_and_the_default() {
    let text = "lot,wafer,dopant,type,resistivity\n\
                A,1,,p,10\n\
                B,1,,N-type,10\n\
                C,1,arsenic,n,0.01\n\
                D,1,Sb,,0.02\n\
                E,1,,,10\n";
    let outcome = read_with(text, &boron());
    assert_eq!(counts(&outcome).converted, 5);
    let dopants: Vec<_> = outcome
        .rows
        .iter()
        .map(|r| (r.dopant, r.relation))
        .collect();
    use EmpiricalRelation::{Boron, Phosphorus};
    assert_eq!(
        dopants,
        [
            ("B", Boron),
            ("P", Phosphorus),
            ("As", Phosphorus),
            ("Sb", Phosphorus),
            ("B", Boron)
        ]
    );
    // Without a default the last row has no dopant at all.
    let outcome = read(text);
    let reason = only_rejection(&outcome, 6, Some(Column::Dopant));
    assert!(
        reason.contains("no type, file setting or default dopant"),
        "{reason}"
    );
}

#[test]
fn same_rows_whatever_the_chunk_size() {
    let text = "\u{feff}# lot: Z9\r\nwafer;site;résumé;resistivity [Ω·cm]\r\n1;1;é;9,9\r\n1;2;ü;10,1\r\n\r\n2;1;x;abc\r\n2;2;y;10,0";
    let whole = read_chunked(text.as_bytes(), &boron(), usize::MAX);
    let whole_counts = counts(&whole);
    assert_eq!((whole_counts.converted, whole_counts.rejected), (3, 1));
    for chunk in [1, 2, 3, 7, 16, 64] {
        let pieces = read_chunked(text.as_bytes(), &boron(), chunk);
        assert_eq!(counts(&pieces), whole_counts, "chunk {chunk}");
        assert_eq!(pieces.rows, whole.rows, "chunk {chunk}");
        assert_eq!(pieces.rejected, whole.rejected, "chunk {chunk}");
    }
}

/// One bad row after two good ones in a boron comma file: (row, expected line 4 column,
/// words the reason must contain).
#[test]
fn every_kind_of_bad_row_is_reported_with_line_and_column() {
    let header = "lot,wafer,site,x,y,dopant,type,resistivity,sheet_resistance,thickness [um],volts,amps,spacing [mm],uncertainty\n";
    let good = "A,1,1,0,0,B,,10,,,,,,\nA,1,2,5,5,B,,10.1,,,,,,\n";
    let cases: &[(&str, Option<Column>, &str)] = &[
        (
            "A,1,3,0,0,B,,ten,,,,,,",
            Some(Column::Resistivity),
            "not a number",
        ),
        (
            "A,1,3,0,0,B,,10 ohm,,,,,,",
            Some(Column::Resistivity),
            "not an accepted resistivity unit",
        ),
        (
            "A,1,3,0,0,B,,\"10,5\",,,,,,",
            Some(Column::Resistivity),
            "semicolons or tabs",
        ),
        (
            "A,1,3,0,0,B,,2e5,,,,,,",
            Some(Column::Resistivity),
            "outside the boron relation",
        ),
        (
            "A,1,3,0,0,B,,-4,,,,,,",
            Some(Column::Resistivity),
            "finite value > 0",
        ),
        (
            "A,1,3,0,0,B,,inf,,,,,,",
            Some(Column::Resistivity),
            "not a number",
        ),
        (
            "A,1,3,0,0,B,,1e999,,,,,,",
            Some(Column::Resistivity),
            "not a finite",
        ),
        (
            ",1,3,0,0,B,,10,,,,,,",
            Some(Column::Lot),
            "every row needs a lot",
        ),
        (
            "A,,3,0,0,B,,10,,,,,,",
            Some(Column::Wafer),
            "every row needs a wafer",
        ),
        ("A,1,3,0,0,B,,,,,,,,", None, "no measurement"),
        (
            "A,1,3,0,0,B,,10,50,525,,,,",
            None,
            "more than one measurement",
        ),
        (
            "A,1,3,0,0,B,,,50,,,,,",
            Some(Column::Thickness),
            "needs the thickness",
        ),
        (
            "A,1,3,0,0,B,,,0,525,,,,",
            Some(Column::SheetResistance),
            "finite value > 0",
        ),
        (
            "A,1,3,0,0,B,,,,525,0.01,,1,",
            Some(Column::Amps),
            "both volts and amps",
        ),
        (
            "A,1,3,0,0,B,,,,525,0.01,0.001,,",
            Some(Column::Spacing),
            "probe spacing",
        ),
        ("A,1,3,0,0,B,,,,525,0.01,-0.001,1,", None, "amps"),
        ("A,1,3,4,,B,,10,,,,,,", Some(Column::Y), "give both x and y"),
        (
            "A,1,3,4 in,5,B,,10,,,,,,",
            Some(Column::X),
            "not an accepted length unit",
        ),
        (
            "A,1,3,0,0,Ga,,10,,,,,,",
            Some(Column::Dopant),
            "no empirical silicon relation",
        ),
        (
            "A,1,3,0,0,B,n,10,,,,,,",
            Some(Column::Type),
            "contradicts dopant B",
        ),
        (
            "A,1,3,0,0,,q,10,,,,,,",
            Some(Column::Type),
            "not a conductivity type",
        ),
        (
            "A,1,3,0,0,P,,10,,,,,,",
            Some(Column::Dopant),
            "a lot holds one conductivity type",
        ),
        (
            "A,1,3,0,0,B,,10,,,,,,150",
            Some(Column::Uncertainty),
            "< 100",
        ),
        (
            "A,1,3,0,0,B,,10,,,,,,two",
            Some(Column::Uncertainty),
            "not a percentage",
        ),
        (
            "A,1,3,0,0,B,,10,,,,,,,surplus",
            None,
            "15 fields, but the header (line 1) has 14",
        ),
        ("A,1,\"3,0,0,B,,10,,,,,,", None, "not closed on this line"),
        (
            "A,1,\"3\"x,0,0,B,,10,,,,,,",
            None,
            "text after the closing quote",
        ),
    ];
    for (row, column, words) in cases {
        let text = format!("{header}{good}{row}\nA,1,4,0,0,B,,9.9,,,,,,\n");
        let outcome = read(&text);
        let reason = only_rejection(&outcome, 4, *column);
        assert!(
            reason.contains(words),
            "{row:?}: {reason:?} lacks {words:?}"
        );
        assert_eq!(
            outcome.rows.len(),
            3,
            "{row:?}: the rows around it still convert"
        );
    }
    // Decimal commas: several commas, or a comma and a point, in a semicolon file.
    for cell in ["1,234,5", "1.234,5"] {
        let outcome = read_with(&format!("lot;wafer;resistivity\nA;1;{cell}\n"), &boron());
        let reason = only_rejection(&outcome, 2, Some(Column::Resistivity));
        assert!(reason.contains("one decimal mark"), "{reason}");
    }
    // A row that is not UTF-8 is rejected; the next one still reads.
    let mut bytes = b"lot,wafer,resistivity\nA,1,1\xff0\nA,1,10\n".to_vec();
    bytes.extend_from_slice(b"A,2,11\n");
    let outcome = read_chunked(&bytes, &boron(), usize::MAX);
    let reason = only_rejection(&outcome, 2, None);
    assert!(reason.contains("not UTF-8"), "{reason}");
    assert_eq!(outcome.rows.len(), 2);
}

#[test]
fn counts_add_up_on_a_mixed_file() {
    let mut text = String::from("lot,wafer,resistivity\n");
    for i in 0..200 {
        let value = match i % 7 {
            0 => "x".to_owned(),
            3 => String::new(),
            _ => format!("{}", 5.0 + i as f64 * 0.01),
        };
        text.push_str(&format!("L{},{},{value}\n", i % 3, i % 5));
    }
    let outcome = read_with(&text, &boron());
    let c = counts(&outcome);
    // Rows with i % 7 == 0 (0, 7, ..., 196: 29 rows) and i % 7 == 3 (3, 10, ..., 199: 29)
    // are rejected.
    assert_eq!((c.read, c.converted, c.rejected), (200, 142, 58));
    assert_eq!(outcome.book.lot_count(), 3);
    assert_eq!(outcome.book.wafer_count(), 15);
}

#[test]
fn unknown_columns_are_ignored_with_a_note() {
    let outcome = read_with(
        "lot,operator,wafer,resistivity,tool\nA,kim,1,10,p3\n",
        &boron(),
    );
    assert_eq!(counts(&outcome).converted, 1);
    assert!(
        outcome.notes.iter().any(|n| n.contains("operator, tool")),
        "{:?}",
        outcome.notes
    );
}

fn file_error(text: &[u8], options: &ReadOptions) -> LotFileError {
    read_chunked(text, options, usize::MAX)
        .result
        .expect_err("the file is refused")
}

#[test]
fn unusable_files_are_refused_with_the_reason() {
    let b = boron();
    assert_eq!(file_error(b"", &b), LotFileError::NoHeader);
    assert_eq!(
        file_error(b"\n# only a comment\n\n", &b),
        LotFileError::NoHeader
    );
    assert!(matches!(
        file_error(b"A1,1,10.5\nA1,2,10.4\n", &b),
        LotFileError::NotAHeader { line: 1, .. }
    ));
    let header = |text: &str, options: &ReadOptions| match file_error(text.as_bytes(), options) {
        LotFileError::Header { line, message } => (line, message),
        other => panic!("{text:?}: {other:?}"),
    };
    let cases: &[(&str, &str)] = &[
        ("lot,wafer,resistivity,Lot\n", "lot appears twice"),
        (
            "lot,wafer,resistivity [ohm]\n",
            "not an accepted resistivity unit",
        ),
        ("lot [mm],wafer,resistivity\n", "takes no unit"),
        ("lot,wafer,resistivity,uncertainty [ppm]\n", "percentage"),
        ("wafer,resistivity\n", "no lot column"),
        ("lot,resistivity\n", "no wafer column"),
        ("lot,wafer,site\n", "no measurement column"),
        ("lot,wafer,sheet_resistance\n", "needs a thickness"),
        ("lot,wafer,volts,amps,thickness\n", "probe spacing"),
        (
            "lot,wafer,volts,thickness,spacing\n",
            "volts and amps come as a pair",
        ),
        ("lot,wafer,x,resistivity\n", "x and y come as a pair"),
    ];
    for (text, words) in cases {
        let (line, message) = header(text, &b);
        assert_eq!(line, 1);
        assert!(message.contains(words), "{text:?}: {message}");
    }
    let (_, message) = header("lot,wafer,resistivity\n", &ReadOptions::default());
    assert!(message.contains("no dopant"), "{message}");
    for (text, words) in [
        (
            "# resistivity: 10\nlot,wafer\n",
            "cannot be set for a whole file",
        ),
        (
            "# thickness: 3 in\nlot,wafer,sheet_resistance\n",
            "not an accepted length unit",
        ),
        (
            "# dopant: Ga\nlot,wafer,resistivity\n",
            "no empirical silicon relation",
        ),
        ("# lot:\nwafer,resistivity\n", "no value"),
    ] {
        match file_error(text.as_bytes(), &b) {
            LotFileError::Setting { line: 1, message } => {
                assert!(message.contains(words), "{text:?}: {message}")
            }
            other => panic!("{text:?}: {other:?}"),
        }
    }
    // UTF-16 (as some spreadsheet programs save "Unicode text") is not UTF-8.
    assert_eq!(
        file_error(b"\xff\xfel\x00o\x00t\x00\n", &b),
        LotFileError::NotText { line: 1 }
    );
    let long = vec![b'a'; MAX_LINE_BYTES + 10];
    assert!(matches!(
        read_chunked(&long, &b, 4096).result,
        Err(LotFileError::LineTooLong { line: 1 })
    ));
}

#[test]
fn several_files_share_one_book() {
    let mut book = LotBook::new();
    let b = boron();
    let first = read_str(
        "lot,wafer,resistivity\nA,1,10\nA,2,10.2\n",
        &b,
        &mut book,
        &mut |_| {},
    )
    .unwrap();
    let second = read_str(
        "wafer;lot;resistivity\n3;A;9,8\n1;B;11\nx;B;\n",
        &b,
        &mut book,
        &mut |_| {},
    )
    .unwrap();
    let mut total = first;
    total.add(second);
    assert_eq!(book.counts(), total);
    assert_eq!((total.read, total.converted, total.rejected), (5, 4, 1));
    let report = book.report(None);
    assert_eq!(report.lots[0].wafers, 3, "lot A spans both files");
    assert_eq!(report.lots[1].sites, 1);
}
