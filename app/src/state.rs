//! The workbench inputs as typed (plain text, no parsed numbers), with their URL-query
//! and saved-state encodings. Everything here is plain Rust, tested without a browser.
//!
//! Inputs are kept exactly as the engineer typed them, so a link or a reload brings
//! back the same text, including a field that is still invalid.

use serde::de::Unexpected;
use serde::{Deserialize, Serialize};
use serde_json::{Map, Value};

/// The three views of the workbench.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum View {
    /// Carriers, Fermi level and resistivity at one temperature.
    #[default]
    Carriers,
    /// The same doping over a temperature range.
    Sweep,
    /// Resistivity and density conversion, and the four-point probe.
    Resistivity,
    /// Wafer-lot files summarised and judged against a spec window.
    Lots,
    /// Van der Pauw sheet resistance and Hall analysis, cross-checked against the conversion.
    Hall,
}

impl View {
    /// Every view, in tab order.
    pub const ALL: [View; 5] = [
        View::Carriers,
        View::Sweep,
        View::Resistivity,
        View::Hall,
        View::Lots,
    ];

    /// The key used in the URL (`view=`).
    pub fn key(self) -> &'static str {
        match self {
            View::Carriers => "carriers",
            View::Sweep => "sweep",
            View::Resistivity => "resistivity",
            View::Lots => "lots",
            View::Hall => "hall",
        }
    }

    /// The tab title.
    pub fn title(self) -> &'static str {
        match self {
            View::Carriers => "Carriers at one temperature",
            View::Sweep => "Temperature sweep",
            View::Resistivity => "Resistivity & probe",
            View::Lots => "Wafer lots",
            View::Hall => "Van der Pauw & Hall",
        }
    }

    /// The view for a URL key.
    pub fn from_key(key: &str) -> Option<View> {
        View::ALL.into_iter().find(|v| v.key() == key)
    }
}

/// One dopant row: a species symbol and its density as typed.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct DopantRow {
    /// Species symbol as the material lists it (`P`, `B`, ...).
    pub species: String,
    /// Density as typed (`1e15`, `2.3x10^15 cm^-3`).
    pub density: String,
}

impl DopantRow {
    /// A row for `species` at `density` (both as text).
    pub fn new(species: &str, density: &str) -> DopantRow {
        DopantRow {
            species: species.into(),
            density: density.into(),
        }
    }
}

/// Inputs of the carriers view (and the doping the sweep view reuses).
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct CarrierInputs {
    /// Material id (`si`, `ge`, ...).
    pub material: String,
    /// Temperature as typed (`300`, `300 K`, `27 C`).
    pub temperature: String,
    /// Donor and acceptor rows.
    pub dopants: Vec<DopantRow>,
    /// Intrinsic-density model key.
    pub intrinsic_model: String,
    /// Dopant-level (ionization) model key.
    pub ionization_model: String,
    /// Band-gap narrowing on or off.
    pub band_gap_narrowing: bool,
    /// Mobility model key.
    pub mobility_model: String,
    /// Layer or wafer thickness as typed, for the sheet resistance.
    pub thickness: String,
}

impl Default for CarrierInputs {
    fn default() -> Self {
        CarrierInputs {
            material: "si".into(),
            temperature: "300 K".into(),
            dopants: vec![DopantRow::new("P", "1e15 cm^-3")],
            intrinsic_model: "dos".into(),
            ionization_model: "altermatt".into(),
            band_gap_narrowing: false,
            mobility_model: String::new(),
            thickness: "525 um".into(),
        }
    }
}

/// Inputs of the temperature-sweep view.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct SweepInputs {
    /// Lowest temperature as typed.
    pub from: String,
    /// Highest temperature as typed.
    pub to: String,
    /// Number of temperatures as typed.
    pub points: String,
}

impl Default for SweepInputs {
    fn default() -> Self {
        SweepInputs {
            from: "50 K".into(),
            to: "700 K".into(),
            points: "131".into(),
        }
    }
}

/// Which quantity the engineer gives in the conversion panel.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize, Default)]
pub enum Given {
    /// Resistivity given, density wanted.
    #[default]
    Resistivity,
    /// Density given, resistivity wanted.
    Density,
}

impl Given {
    /// The key used in the URL.
    pub fn key(self) -> &'static str {
        match self {
            Given::Resistivity => "rho",
            Given::Density => "n",
        }
    }

    /// The value for a URL key.
    pub fn from_key(key: &str) -> Option<Given> {
        match key {
            "rho" => Some(Given::Resistivity),
            "n" => Some(Given::Density),
            _ => None,
        }
    }
}

/// Inputs of the resistivity and probe view.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct ConversionInputs {
    /// Which quantity is given.
    pub given: Given,
    /// The given resistivity or density as typed.
    pub value: String,
    /// Dopant species of the silicon sample (`B`, `P`, `As`, ...).
    pub dopant: String,
    /// Probe current as typed (A by default, `mA`, `uA`).
    pub probe_current: String,
    /// Probe voltage as typed (V by default, `mV`, `uV`).
    pub probe_voltage: String,
    /// Probe pin spacing as typed.
    pub probe_spacing: String,
    /// Sample geometry of the probe reading: a `ProbeGeometry` id (`thin-layer`, `bulk`).
    pub probe_geometry: String,
    /// Sample thickness as typed.
    pub sample_thickness: String,
    /// Wafer diameter as typed.
    pub wafer_diameter: String,
    /// Sample temperature during the probe measurement, as typed.
    pub probe_temperature: String,
}

impl Default for ConversionInputs {
    fn default() -> Self {
        ConversionInputs {
            given: Given::Resistivity,
            value: "10 ohm-cm".into(),
            dopant: "B".into(),
            probe_current: "1 mA".into(),
            probe_voltage: "4.5 mV".into(),
            probe_spacing: "1 mm".into(),
            probe_geometry: "thin-layer".into(),
            sample_thickness: "525 um".into(),
            wafer_diameter: "150 mm".into(),
            probe_temperature: "23 C".into(),
        }
    }
}

/// Inputs of the van der Pauw and Hall view, as typed.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct HallInputs {
    /// R_A (V/I), ohm by default.
    pub r_a: String,
    /// R_B (V/I), ohm by default.
    pub r_b: String,
    /// Layer thickness.
    pub thickness: String,
    /// Net Hall voltage V2 - V4 (signed).
    pub hall_voltage: String,
    /// Current of the Hall measurement.
    pub current: String,
    /// Magnetic field (T, mT, G).
    pub field: String,
    /// Hall scattering factor: an id of `ScatteringFactor` or a number.
    pub scattering: String,
    /// Dopant of the layer, for the cross-check (silicon).
    pub dopant: String,
    /// Temperature of the measurement.
    pub temperature: String,
}

impl HallInputs {
    /// Whether every field is at its default.
    pub fn is_default(&self) -> bool {
        *self == HallInputs::default()
    }
}

impl Default for HallInputs {
    fn default() -> Self {
        HallInputs {
            r_a: "532 ohm".into(),
            r_b: "506 ohm".into(),
            thickness: "2 um".into(),
            hall_voltage: "-1.56 mV".into(),
            current: "10 uA".into(),
            field: "5000 G".into(),
            scattering: "unity".into(),
            dopant: "P".into(),
            temperature: "23 C".into(),
        }
    }
}

/// `Deserialize` for a struct of inputs, read from a JSON object: a member missing takes the
/// struct's default, unknown members are ignored (as serde's derive with `#[serde(default)]`
/// does), the `text` members must be strings and the `typed` ones are read by their own types;
/// `required` members are read by their own types and refused when missing.
/// Every such struct shares [`object_members`] and [`take_text`] instead of a derived visitor
/// each (about 28 KB of wasm for the four); serde's messages are kept word for word.
macro_rules! inputs_from_object {
    ($name:ident, text: [$($text:ident),*], typed: [$($typed:ident),*]) => {
        inputs_from_object!($name, text: [$($text),*], typed: [$($typed),*], required: []);
    };
    (
        $name:ident,
        text: [$($text:ident),*],
        typed: [$($typed:ident),*],
        required: [$($required:ident),*]
    ) => {
        impl<'de> Deserialize<'de> for $name {
            fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                $name::from_object(Value::deserialize(d)?).map_err(serde::de::Error::custom)
            }
        }

        impl $name {
            fn from_object(value: Value) -> Result<Self, serde_json::Error> {
                let mut members = object_members(value, concat!("struct ", stringify!($name)))?;
                let mut out = $name::default();
                $(take_text(&mut members, stringify!($text), &mut out.$text)?;)*
                $(if let Some(v) = members.remove(stringify!($typed)) {
                    out.$typed = serde_json::from_value(v)?;
                })*
                // As serde's derive: faults in the members given first, then the first
                // required member missing.
                #[allow(unused_mut, reason = "structs without required members")]
                let mut missing: Option<&'static str> = None;
                $(match members.remove(stringify!($required)) {
                    Some(v) => out.$required = serde_json::from_value(v)?,
                    None => {
                        missing.get_or_insert(stringify!($required));
                    }
                })*
                match missing {
                    Some(field) => Err(serde::de::Error::missing_field(field)),
                    None => Ok(out),
                }
            }
        }
    };
}

/// The members of a JSON object; anything else is refused as serde refuses it for `expected`.
fn object_members(value: Value, expected: &str) -> Result<Map<String, Value>, serde_json::Error> {
    let found = match value {
        Value::Object(members) => return Ok(members),
        Value::Null => Unexpected::Unit,
        Value::Bool(b) => Unexpected::Bool(b),
        Value::Number(n) => match (n.as_u64(), n.as_i64()) {
            (Some(u), _) => Unexpected::Unsigned(u),
            (None, Some(i)) => Unexpected::Signed(i),
            _ => Unexpected::Float(n.as_f64().unwrap_or(f64::NAN)),
        },
        Value::String(ref text) => Unexpected::Str(text),
        Value::Array(_) => Unexpected::Seq,
    };
    Err(serde::de::Error::invalid_type(found, &expected))
}

/// Moves the text member `key`, when present, into `into`.
fn take_text(
    members: &mut Map<String, Value>,
    key: &str,
    into: &mut String,
) -> Result<(), serde_json::Error> {
    if let Some(value) = members.remove(key) {
        *into = String::deserialize(value)?;
    }
    Ok(())
}

inputs_from_object!(
    CarrierInputs,
    text: [material, temperature, intrinsic_model, ionization_model, mobility_model, thickness],
    typed: [dopants, band_gap_narrowing]
);
inputs_from_object!(SweepInputs, text: [from, to, points], typed: []);
inputs_from_object!(
    ConversionInputs,
    text: [
        value,
        dopant,
        probe_current,
        probe_voltage,
        probe_spacing,
        probe_geometry,
        sample_thickness,
        wafer_diameter,
        probe_temperature
    ],
    typed: [given]
);
inputs_from_object!(
    HallInputs,
    text: [r_a, r_b, thickness, hall_voltage, current, field, scattering, dopant, temperature],
    typed: []
);

/// Everything the workbench needs to reproduce a calculation.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Default)]
pub struct Workbench {
    /// The view on screen.
    pub view: View,
    /// Carriers view inputs.
    pub carriers: CarrierInputs,
    /// Sweep view inputs.
    pub sweep: SweepInputs,
    /// Resistivity view inputs.
    pub conversion: ConversionInputs,
    /// Van der Pauw and Hall view inputs. Left out of the JSON while at their defaults, so
    /// that records and saved inputs written before this view existed read back to the same
    /// text (and a record's digest still matches it).
    #[serde(default, skip_serializing_if = "HallInputs::is_default")]
    pub hall: HallInputs,
}

inputs_from_object!(
    Workbench,
    text: [],
    typed: [hall],
    required: [view, carriers, sweep, conversion]
);

/// The version written into saved states; a saved state of another version is not read.
pub const SAVED_STATE_VERSION: u32 = 1;

#[derive(Serialize, Deserialize)]
struct Saved<W> {
    version: u32,
    workbench: W,
}

/// The state as the JSON text kept in the browser's storage.
pub fn to_saved_json(workbench: &Workbench) -> String {
    let saved = Saved {
        version: SAVED_STATE_VERSION,
        workbench: workbench.clone(),
    };
    serde_json::to_string(&saved).unwrap_or_default()
}

/// Reads a saved state; Err with a sentence for the notice when it is unreadable.
///
/// The typed reading goes through a `serde_json::Value`, as the sign-off record's does: one
/// deserializer per input type in the page instead of two (a text one and a value one) saves
/// about 25 KB of wasm; serde's complaint is kept, without the line and column.
pub fn from_saved_json(text: &str) -> Result<Workbench, String> {
    let unreadable = |e: serde_json::Error| {
        format!("the saved inputs could not be read ({e}); the defaults are shown")
    };
    let saved: Saved<serde_json::Value> = serde_json::from_str(text).map_err(unreadable)?;
    if saved.version != SAVED_STATE_VERSION {
        return Err(format!(
            "the saved inputs are from format version {} (this page reads {}); the defaults are shown",
            saved.version, SAVED_STATE_VERSION
        ));
    }
    let strict_error = match serde_json::from_value::<Workbench>(saved.workbench.clone()) {
        Ok(workbench) => return Ok(workbench),
        Err(e) => e,
    };
    // A view's inputs missing as a whole (saved before that view existed) take their
    // defaults, like a field missing inside a view; the other views keep what was saved.
    // Any other fault is reported with the strict reading's complaint.
    let mut workbench = saved.workbench;
    if let (Some(members), Ok(serde_json::Value::Object(defaults))) = (
        workbench.as_object_mut(),
        serde_json::to_value(Workbench::default()),
    ) {
        for (key, value) in defaults {
            members.entry(key).or_insert(value);
        }
    }
    serde_json::from_value(workbench).map_err(|_| unreadable(strict_error))
}

// URL query keys. Short, lower case, stable: links in e-mails and lab notes depend on them.
const K_VIEW: &str = "view";
const K_MATERIAL: &str = "mat";
const K_TEMPERATURE: &str = "t";
const K_DOPANT: &str = "dop";
const K_INTRINSIC: &str = "ni";
const K_IONIZATION: &str = "ion";
const K_BGN: &str = "bgn";
const K_MOBILITY: &str = "mob";
const K_THICKNESS: &str = "thick";
const K_SWEEP_FROM: &str = "from";
const K_SWEEP_TO: &str = "to";
const K_SWEEP_POINTS: &str = "pts";
const K_GIVEN: &str = "given";
const K_VALUE: &str = "val";
const K_CONV_DOPANT: &str = "species";
const K_PROBE_I: &str = "i";
const K_PROBE_V: &str = "v";
const K_PROBE_S: &str = "s";
const K_PROBE_T: &str = "w";
const K_PROBE_D: &str = "dia";
const K_PROBE_TEMP: &str = "tp";
const K_PROBE_GEOMETRY: &str = "geom";
const K_HALL_RA: &str = "ra";
const K_HALL_RB: &str = "rb";
const K_HALL_THICKNESS: &str = "ht";
const K_HALL_VOLTAGE: &str = "vh";
const K_HALL_CURRENT: &str = "ih";
const K_HALL_FIELD: &str = "b";
const K_HALL_FACTOR: &str = "rh";
const K_HALL_DOPANT: &str = "hdop";
const K_HALL_TEMPERATURE: &str = "htemp";

/// Every key this page writes; a query with none of them is not a workbench link.
const ALL_KEYS: [&str; 31] = [
    K_VIEW,
    K_MATERIAL,
    K_TEMPERATURE,
    K_DOPANT,
    K_INTRINSIC,
    K_IONIZATION,
    K_BGN,
    K_MOBILITY,
    K_THICKNESS,
    K_SWEEP_FROM,
    K_SWEEP_TO,
    K_SWEEP_POINTS,
    K_GIVEN,
    K_VALUE,
    K_CONV_DOPANT,
    K_PROBE_I,
    K_PROBE_V,
    K_PROBE_S,
    K_PROBE_T,
    K_PROBE_D,
    K_PROBE_TEMP,
    K_PROBE_GEOMETRY,
    K_HALL_RA,
    K_HALL_RB,
    K_HALL_THICKNESS,
    K_HALL_VOLTAGE,
    K_HALL_CURRENT,
    K_HALL_FIELD,
    K_HALL_FACTOR,
    K_HALL_DOPANT,
    K_HALL_TEMPERATURE,
];

/// The state as a URL query string (without the leading `?`). Every field is written,
/// so a link carries the whole calculation.
pub fn to_query(w: &Workbench) -> String {
    let c = &w.carriers;
    let s = &w.sweep;
    let v = &w.conversion;
    let mut pairs: Vec<(&str, String)> = vec![
        (K_VIEW, w.view.key().into()),
        (K_MATERIAL, c.material.clone()),
        (K_TEMPERATURE, c.temperature.clone()),
    ];
    // One `dop` pair per row: `species,density`. Species symbols hold no comma, so
    // the first comma splits the pair even if the density text has one. No rows (intrinsic
    // material) is one empty `dop=`: without it the link would open with the default row.
    pairs.extend(
        c.dopants
            .iter()
            .map(|d| (K_DOPANT, format!("{},{}", d.species, d.density))),
    );
    if c.dopants.is_empty() {
        pairs.push((K_DOPANT, String::new()));
    }
    pairs.extend([
        (K_INTRINSIC, c.intrinsic_model.clone()),
        (K_IONIZATION, c.ionization_model.clone()),
        (K_BGN, if c.band_gap_narrowing { "1" } else { "0" }.into()),
        (K_MOBILITY, c.mobility_model.clone()),
        (K_THICKNESS, c.thickness.clone()),
        (K_SWEEP_FROM, s.from.clone()),
        (K_SWEEP_TO, s.to.clone()),
        (K_SWEEP_POINTS, s.points.clone()),
        (K_GIVEN, v.given.key().into()),
        (K_VALUE, v.value.clone()),
        (K_CONV_DOPANT, v.dopant.clone()),
        (K_PROBE_I, v.probe_current.clone()),
        (K_PROBE_V, v.probe_voltage.clone()),
        (K_PROBE_S, v.probe_spacing.clone()),
        (K_PROBE_T, v.sample_thickness.clone()),
        (K_PROBE_D, v.wafer_diameter.clone()),
        (K_PROBE_TEMP, v.probe_temperature.clone()),
        (K_PROBE_GEOMETRY, v.probe_geometry.clone()),
        (K_HALL_RA, w.hall.r_a.clone()),
        (K_HALL_RB, w.hall.r_b.clone()),
        (K_HALL_THICKNESS, w.hall.thickness.clone()),
        (K_HALL_VOLTAGE, w.hall.hall_voltage.clone()),
        (K_HALL_CURRENT, w.hall.current.clone()),
        (K_HALL_FIELD, w.hall.field.clone()),
        (K_HALL_FACTOR, w.hall.scattering.clone()),
        (K_HALL_DOPANT, w.hall.dopant.clone()),
        (K_HALL_TEMPERATURE, w.hall.temperature.clone()),
    ]);
    pairs
        .iter()
        .map(|(k, v)| format!("{k}={}", percent_encode(v)))
        .collect::<Vec<_>>()
        .join("&")
}

/// Whether a query string carries workbench inputs at all.
pub fn is_workbench_query(query: &str) -> bool {
    parse_pairs(query)
        .iter()
        .any(|(k, _)| ALL_KEYS.contains(&k.as_str()))
}

/// Reads a URL query. Fields missing from it take their defaults; values that cannot be
/// understood are replaced by defaults and reported in the returned notices.
pub fn from_query(query: &str) -> (Workbench, Vec<String>) {
    let mut w = Workbench::default();
    let mut notices = Vec::new();
    let mut dopants: Option<Vec<DopantRow>> = None;
    for (key, value) in parse_pairs(query) {
        let c = &mut w.carriers;
        let s = &mut w.sweep;
        let v = &mut w.conversion;
        match key.as_str() {
            K_VIEW => match View::from_key(&value) {
                Some(view) => w.view = view,
                None => notices.push(format!(
                    "link: view {} is unknown; showing the carriers view",
                    quoted(&value)
                )),
            },
            K_MATERIAL => c.material = value,
            K_TEMPERATURE => c.temperature = value,
            K_DOPANT => {
                let rows = dopants.get_or_insert_with(Vec::new);
                // An empty value is the intrinsic material's "no rows" (see `to_query`).
                if !value.is_empty() {
                    rows.push(match value.split_once(',') {
                        Some((species, density)) => DopantRow::new(species.trim(), density),
                        None => DopantRow::new(value.trim(), ""),
                    });
                }
            }
            K_INTRINSIC => c.intrinsic_model = value,
            K_IONIZATION => c.ionization_model = value,
            K_BGN => match value.as_str() {
                "1" | "on" | "true" => c.band_gap_narrowing = true,
                "0" | "off" | "false" => c.band_gap_narrowing = false,
                _ => notices.push(format!(
                    "link: bgn {} is not 0 or 1; band-gap narrowing is off",
                    quoted(&value)
                )),
            },
            K_MOBILITY => c.mobility_model = value,
            K_THICKNESS => c.thickness = value,
            K_SWEEP_FROM => s.from = value,
            K_SWEEP_TO => s.to = value,
            K_SWEEP_POINTS => s.points = value,
            K_GIVEN => match Given::from_key(&value) {
                Some(g) => v.given = g,
                None => notices.push(format!(
                    "link: given {} is not rho or n; resistivity is given",
                    quoted(&value)
                )),
            },
            K_VALUE => v.value = value,
            K_CONV_DOPANT => v.dopant = value,
            K_PROBE_I => v.probe_current = value,
            K_HALL_RA => w.hall.r_a = value,
            K_HALL_RB => w.hall.r_b = value,
            K_HALL_THICKNESS => w.hall.thickness = value,
            K_HALL_VOLTAGE => w.hall.hall_voltage = value,
            K_HALL_CURRENT => w.hall.current = value,
            K_HALL_FIELD => w.hall.field = value,
            K_HALL_FACTOR => w.hall.scattering = value,
            K_HALL_DOPANT => w.hall.dopant = value,
            K_HALL_TEMPERATURE => w.hall.temperature = value,
            K_PROBE_V => v.probe_voltage = value,
            K_PROBE_S => v.probe_spacing = value,
            K_PROBE_T => v.sample_thickness = value,
            K_PROBE_D => v.wafer_diameter = value,
            K_PROBE_TEMP => v.probe_temperature = value,
            K_PROBE_GEOMETRY => v.probe_geometry = value,
            _ => {} // Keys of other tools sharing the URL are none of our business.
        }
    }
    if let Some(rows) = dopants {
        w.carriers.dopants = rows;
    }
    (w, notices)
}

/// The state a page load starts from: a workbench link wins (it is what was shared),
/// then the saved inputs, then the defaults. The notices say what was set aside and why.
pub fn initial(query: &str, saved: Option<&str>) -> (Workbench, Vec<String>) {
    if is_workbench_query(query) {
        return from_query(query);
    }
    match saved.map(from_saved_json) {
        None => (Workbench::default(), Vec::new()),
        Some(Ok(w)) => (w, Vec::new()),
        Some(Err(notice)) => (Workbench::default(), vec![notice]),
    }
}

/// Longest part of a link value a notice quotes, in characters.
const QUOTED_MAX_CHARS: usize = 40;

/// A link value as a notice quotes it: in single quotes, control characters, quotes and
/// backslashes escaped (`\n`, `\u{7}`, `\'`) so that the notice shows exactly what arrived
/// and nothing can break its line, and cut after [`QUOTED_MAX_CHARS`] characters with "…".
fn quoted(value: &str) -> String {
    let mut shown: String = value
        .chars()
        .take(QUOTED_MAX_CHARS)
        .flat_map(char::escape_debug)
        .collect();
    if value.chars().nth(QUOTED_MAX_CHARS).is_some() {
        shown.push('…');
    }
    format!("'{shown}'")
}

/// Splits `a=1&b=2` into decoded pairs, in order.
fn parse_pairs(query: &str) -> Vec<(String, String)> {
    query
        .trim_start_matches('?')
        .split('&')
        .filter(|p| !p.is_empty())
        .map(|p| match p.split_once('=') {
            Some((k, v)) => (percent_decode(k), percent_decode(v)),
            None => (percent_decode(p), String::new()),
        })
        .collect()
}

/// Percent-encodes everything except RFC 3986 unreserved characters.
pub fn percent_encode(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for b in text.bytes() {
        if b.is_ascii_alphanumeric() || matches!(b, b'-' | b'.' | b'_' | b'~') {
            out.push(b as char);
        } else {
            out.push_str(&format!("%{b:02X}"));
        }
    }
    out
}

/// Decodes `%XX` escapes and `+` (space, as forms write it); malformed escapes stay as typed.
pub fn percent_decode(text: &str) -> String {
    let bytes = text.as_bytes();
    let mut out = Vec::with_capacity(bytes.len());
    let mut i = 0;
    while i < bytes.len() {
        match bytes[i] {
            b'+' => {
                out.push(b' ');
                i += 1;
            }
            b'%' if i + 2 < bytes.len() => {
                let hex = std::str::from_utf8(&bytes[i + 1..i + 3]).ok();
                match hex.and_then(|h| u8::from_str_radix(h, 16).ok()) {
                    Some(b) => {
                        out.push(b);
                        i += 3;
                    }
                    None => {
                        out.push(b'%');
                        i += 1;
                    }
                }
            }
            b => {
                out.push(b);
                i += 1;
            }
        }
    }
    String::from_utf8_lossy(&out).into_owned()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every member of every view's inputs is read back: each text member is given a value of
    /// its own, each switch is flipped, and the workbench must survive the round trip.
    #[test]
    fn every_input_member_is_read_back() {
        let mut value = serde_json::to_value(Workbench {
            hall: HallInputs {
                r_a: "1 ohm".into(),
                ..HallInputs::default()
            },
            ..Workbench::default()
        })
        .expect("to JSON");
        let mut changed = 0;
        for view in ["carriers", "sweep", "conversion", "hall"] {
            let members = value[view].as_object_mut().expect("an object");
            for (key, member) in members.iter_mut() {
                match member {
                    Value::String(text) => *text = format!("{view}-{key}"),
                    Value::Bool(on) => *on = !*on,
                    _ => continue,
                }
                changed += 1;
            }
        }
        value["conversion"]["given"] = Value::String("Density".into());
        // carriers: 6 texts and a switch; sweep: 3; conversion: 9 texts and `given`; hall: 9.
        assert_eq!(changed, 7 + 3 + 10 + 9);
        let read: Workbench = serde_json::from_value(value.clone()).expect("read back");
        assert_eq!(serde_json::to_value(&read).expect("to JSON"), value);
        assert_eq!(read.conversion.given, Given::Density);
        assert!(read.carriers.band_gap_narrowing);
        assert_eq!(read.hall.scattering, "hall-scattering");
    }

    /// The complaint on reading `text` (JSON) as a `T` through a `serde_json::Value`.
    fn complaint<T: serde::de::DeserializeOwned + std::fmt::Debug>(text: &str) -> String {
        serde_json::from_str::<Value>(text)
            .and_then(serde_json::from_value::<T>)
            .expect_err("refused")
            .to_string()
    }

    #[test]
    fn inputs_that_are_not_an_object_are_refused_as_serde_refuses_them() {
        let refused = complaint::<SweepInputs>;
        assert_eq!(
            refused("null"),
            "invalid type: null, expected struct SweepInputs"
        );
        assert_eq!(
            refused("[1]"),
            "invalid type: sequence, expected struct SweepInputs"
        );
        assert_eq!(
            refused("-2"),
            "invalid type: integer `-2`, expected struct SweepInputs"
        );
        assert_eq!(
            refused("1.5"),
            "invalid type: floating point `1.5`, expected struct SweepInputs"
        );
        assert_eq!(
            refused("\"x\""),
            "invalid type: string \"x\", expected struct SweepInputs"
        );
        assert_eq!(
            refused("{\"to\":true}"),
            "invalid type: boolean `true`, expected a string"
        );
        let workbench = complaint::<Workbench>;
        assert_eq!(
            workbench("{\"view\":\"Sweep\"}"),
            "missing field `carriers`"
        );
        assert_eq!(
            workbench("{\"sweep\":{\"to\":1}}"),
            "invalid type: integer `1`, expected a string",
            "a fault in a member given comes before a member missing"
        );
    }

    fn sample() -> Workbench {
        Workbench {
            view: View::Sweep,
            carriers: CarrierInputs {
                material: "ge".into(),
                temperature: "27 C".into(),
                dopants: vec![
                    DopantRow::new("As", "2.3x10^15 cm^-3"),
                    DopantRow::new("B", "1,5e14"),
                    DopantRow::new("Ga", ""),
                ],
                intrinsic_model: "model a".into(),
                ionization_model: "pearson-bardeen".into(),
                band_gap_narrowing: true,
                mobility_model: "m&b=c".into(),
                thickness: "0.5 mm".into(),
            },
            sweep: SweepInputs {
                from: "77".into(),
                to: "500 K".into(),
                points: "x".into(),
            },
            conversion: ConversionInputs {
                given: Given::Density,
                value: "1E16 m^-3 #?%".into(),
                dopant: "P".into(),
                probe_current: "0.1".into(),
                probe_voltage: "μV 3".into(),
                probe_spacing: "1.59 mm".into(),
                probe_geometry: "bulk".into(),
                sample_thickness: "380 um".into(),
                wafer_diameter: "200 mm".into(),
                probe_temperature: "25 C".into(),
            },
            hall: HallInputs {
                r_a: "1.2 kohm".into(),
                r_b: "Ω 9&9".into(),
                thickness: "350 nm".into(),
                hall_voltage: "-12 uV".into(),
                current: "1 uA".into(),
                field: "0.3 T".into(),
                scattering: "1.18".into(),
                dopant: "B".into(),
                temperature: "77 K".into(),
            },
        }
    }

    #[test]
    fn query_round_trips_every_field() {
        let w = sample();
        let (back, notices) = from_query(&to_query(&w));
        assert_eq!(back, w);
        assert!(notices.is_empty(), "{notices:?}");
    }

    #[test]
    fn default_state_round_trips_through_query_and_saved_json() {
        let w = Workbench::default();
        assert_eq!(from_query(&to_query(&w)).0, w);
        assert_eq!(from_saved_json(&to_saved_json(&w)), Ok(w));
    }

    #[test]
    fn saved_json_round_trips() {
        let w = sample();
        assert_eq!(from_saved_json(&to_saved_json(&w)), Ok(w));
    }

    #[test]
    fn corrupt_saved_state_is_reported() {
        for bad in [
            "",
            "{",
            "null",
            "{\"version\":1}",
            "[1,2]",
            "{\"version\":1,\"workbench\":{\"view\":\"Nope\"}}",
        ] {
            let err = from_saved_json(bad).expect_err(bad);
            assert!(err.contains("defaults"), "{err}");
        }
    }

    #[test]
    fn saved_state_missing_a_newer_field_takes_its_default() {
        let text =
            to_saved_json(&sample()).replace("\"ionization_model\":\"pearson-bardeen\",", "");
        assert!(!text.contains("ionization_model"));
        let w = from_saved_json(&text).expect("older saved state");
        assert_eq!(
            w.carriers.ionization_model,
            CarrierInputs::default().ionization_model
        );
        assert_eq!(w.carriers.material, "ge");
    }

    #[test]
    fn saved_state_missing_a_whole_view_keeps_the_other_views() {
        let mut w = Workbench::default();
        w.carriers.temperature = "77 K".into();
        let text = to_saved_json(&w);
        let mut value: serde_json::Value = serde_json::from_str(&text).expect("json");
        value["workbench"]
            .as_object_mut()
            .expect("object")
            .remove("sweep");
        let back = from_saved_json(&value.to_string()).expect("readable");
        assert_eq!(back.carriers.temperature, "77 K");
        assert_eq!(back.sweep, SweepInputs::default());
    }

    #[test]
    fn saved_state_of_another_version_is_refused() {
        let text = to_saved_json(&sample()).replacen("\"version\":1", "\"version\":99", 1);
        let err = from_saved_json(&text).expect_err("version 99");
        assert!(err.contains("99"), "{err}");
    }

    #[test]
    fn missing_keys_take_defaults_and_bad_keys_are_noticed() {
        let (w, notices) = from_query("view=nowhere&t=350&bgn=maybe&given=x&utm_source=mail");
        assert_eq!(w.view, View::Carriers);
        assert_eq!(w.carriers.temperature, "350");
        assert_eq!(w.carriers.dopants, CarrierInputs::default().dopants);
        assert!(!w.carriers.band_gap_narrowing);
        assert_eq!(notices.len(), 3, "{notices:?}");
        assert!(notices[0].contains("nowhere"));
    }

    #[test]
    fn a_link_wins_over_saved_inputs_which_win_over_defaults() {
        let saved = to_saved_json(&sample());
        let (w, notices) = initial("t=77", Some(&saved));
        assert_eq!(w.carriers.temperature, "77");
        assert_eq!(
            w.carriers.material, "si",
            "fields missing from a link take defaults"
        );
        assert!(notices.is_empty());
        assert_eq!(initial("", Some(&saved)), (sample(), vec![]));
        assert_eq!(initial("", None), (Workbench::default(), vec![]));
        let (w, notices) = initial("?utm=1", Some("{not json"));
        assert_eq!(w, Workbench::default());
        assert_eq!(notices.len(), 1);
        assert!(notices[0].contains("could not be read"), "{notices:?}");
    }

    #[test]
    fn recognises_workbench_links() {
        assert!(is_workbench_query("?view=sweep"));
        assert!(is_workbench_query("a=1&t=300"));
        assert!(!is_workbench_query(""));
        assert!(!is_workbench_query("?utm_source=x"));
    }

    #[test]
    fn percent_coding_round_trips_and_tolerates_junk() {
        for text in [
            "",
            "a b",
            "1e15 cm^-3",
            "%",
            "%4",
            "%zz",
            "ohm·cm",
            "a+b",
            "&=?#",
        ] {
            assert_eq!(percent_decode(&percent_encode(text)), text);
        }
        assert_eq!(percent_decode("a+b%20c"), "a b c");
        assert_eq!(percent_decode("100%"), "100%");
        assert_eq!(percent_decode("%4"), "%4");
        assert_eq!(percent_decode("%zz"), "%zz");
    }

    #[test]
    fn intrinsic_material_link_keeps_no_dopant_rows() {
        // Fuzz finding (url_state): a workbench with every dopant row removed was written
        // without any `dop` pair, and the link opened with the default 1e15 P row.
        let mut w = Workbench::default();
        w.carriers.dopants.clear();
        let query = to_query(&w);
        assert!(query.contains("&dop=&"), "{query}");
        assert_eq!(from_query(&query), (w, vec![]));
        // An empty `dop` among rows adds no row.
        let (w, _) = from_query("dop=&dop=B,1e16");
        assert_eq!(w.carriers.dopants, vec![DopantRow::new("B", "1e16")]);
    }

    #[test]
    fn dopant_rows_keep_their_order_and_text() {
        let (w, _) = from_query("dop=B,1e16&dop=P,2%2C0e15&dop=Sb");
        assert_eq!(
            w.carriers.dopants,
            vec![
                DopantRow::new("B", "1e16"),
                DopantRow::new("P", "2,0e15"),
                DopantRow::new("Sb", "")
            ]
        );
    }
}
