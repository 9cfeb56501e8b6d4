//! Builds a [`Project`] from JSON field by field, so that every wrong field is reported with its
//! path (serde alone stops at the first) and unknown fields become warnings. The JSON is either a
//! parsed tree or raw text whose beds are read one by one straight into the typed model (a tree
//! is built only for a bed or section that needs its fields named). Raw text is split into its
//! sections and beds by serde_json itself: each is a [`RawValue`], a checked slice of the file,
//! and a bad bed's problems take their lines from its slice: the slice's offset in the file gives
//! the bed's first line, a scan of the slice alone the line of the field within it.

use super::curve_fields::{check_curve, CURVE_FIELDS};
use super::field_check::{check, describe, first_wrong_field, FieldCheck};
use super::json_scan::KnownFields;
use super::problem::Problem;
use crate::model::{
    BaseRank, Bed, BeddingAttitude, BodyLateral, Contact, Drainage, FaciesCode, FixRole, GpsFix, GrainSize,
    Indicator, LatLon, LengthUnit, Lithology, MeasuringMethod, Munsell, Paleocurrent, PaleosolDevelopment,
    PaleosolFeature, Photo, Project, ReviewDecision, Sample, SampleKind, Section, SoilHorizon, Structure,
    Surface, Traverse,
};
use serde::de::{DeserializeOwned, MapAccess, SeqAccess, Visitor};
use serde::Deserialize;
use serde_json::value::RawValue;
use serde_json::{Map, Value};
use std::borrow::Cow;
use std::collections::{HashMap, HashSet};
use std::fmt;

/// How a field is checked before the whole object is deserialised.
#[derive(Clone, Copy)]
enum Kind {
    Required(FieldCheck),
    Optional(FieldCheck),
    /// An array whose items are each checked (and reported with their index).
    List(FieldCheck),
}

fn string_list(v: &Value) -> Result<(), String> {
    check::<String>(v)
}

/// One paleocurrent reading, naming the field at fault.
fn check_paleocurrent(v: &Value) -> Result<(), String> {
    let whole = check::<Paleocurrent>(v);
    let Some(obj) = v.as_object() else {
        return whole
            .map_err(|_| format!("a reading must be an object {{\"azimuth_deg\": …}}, got {}", describe(v)));
    };
    let fields: [(&str, bool, FieldCheck); 3] = [
        ("azimuth_deg", true, check::<f64>),
        ("indicator", false, check::<Indicator>),
        ("dip_deg", false, check::<Option<f64>>),
    ];
    first_wrong_field(obj, &fields)?;
    whole
}

/// One sample, naming the field at fault.
fn check_sample(v: &Value) -> Result<(), String> {
    let whole = check::<Sample>(v);
    let Some(obj) = v.as_object() else {
        return whole.map_err(|_| format!("a sample must be an object {{\"id\": …}}, got {}", describe(v)));
    };
    let fields: [(&str, bool, FieldCheck); 3] = [
        ("id", true, check::<String>),
        ("kind", false, check::<Option<SampleKind>>),
        ("height_in_bed_m", false, check::<Option<f64>>),
    ];
    first_wrong_field(obj, &fields)?;
    whole
}

/// One GPS fix, naming the field at fault.
fn check_fix(v: &Value) -> Result<(), String> {
    let whole = check::<GpsFix>(v);
    let Some(obj) = v.as_object() else { return whole };
    let fields: [(&str, bool, FieldCheck); 6] = [
        ("role", true, check::<FixRole>),
        ("height_m", true, check::<f64>),
        ("lat_deg", true, check::<f64>),
        ("lon_deg", true, check::<f64>),
        ("elevation_m", false, check::<Option<f64>>),
        ("note", false, check::<String>),
    ];
    first_wrong_field(obj, &fields)?;
    whole
}

/// One channel body's lateral data, naming the field at fault.
fn check_body_lateral(v: &Value) -> Result<(), String> {
    let whole = check::<BodyLateral>(v);
    let Some(obj) = v.as_object() else { return whole };
    let fields: [(&str, bool, FieldCheck); 4] = [
        ("base_bed", true, check::<u64>),
        ("width_m", false, check::<Option<f64>>),
        ("beyond_outcrop", false, check::<bool>),
        ("note", false, check::<String>),
    ];
    first_wrong_field(obj, &fields)?;
    whole
}

/// One review decision, naming the field at fault (serde alone names none).
fn check_review(v: &Value) -> Result<(), String> {
    let whole = check::<ReviewDecision>(v);
    let Some(obj) = v.as_object() else { return whole };
    let fields: [(&str, bool, FieldCheck); 4] = [
        ("bed", true, check::<u64>),
        ("state", true, check::<crate::model::ReviewState>),
        ("note", false, check::<String>),
        ("link", false, check::<Option<String>>),
    ];
    first_wrong_field(obj, &fields)?;
    whole
}

const PROJECT_FIELDS: &[(&str, Kind)] = &[
    ("format_version", Kind::Required(check::<u32>)),
    ("sections", Kind::List(|_| Ok(()))),
    ("rule_params", Kind::Optional(check::<serde_json::Map<String, Value>>)),
];

const SECTION_FIELDS: &[(&str, Kind)] = &[
    ("name", Kind::Required(check::<String>)),
    ("locality", Kind::Optional(check::<String>)),
    ("coordinates", Kind::Optional(check::<LatLon>)),
    ("date_logged", Kind::Optional(check::<Option<String>>)),
    ("logged_by", Kind::Optional(check::<String>)),
    ("notes", Kind::Optional(check::<String>)),
    ("method", Kind::Optional(check::<Option<MeasuringMethod>>)),
    ("thickness_uncertainty_m", Kind::Optional(check::<Option<f64>>)),
    ("bedding", Kind::Optional(check::<Option<BeddingAttitude>>)),
    ("traverse", Kind::Optional(check::<Option<Traverse>>)),
    ("fixes", Kind::List(check_fix)),
    ("body_lateral", Kind::List(check_body_lateral)),
    ("display_unit", Kind::Optional(check::<LengthUnit>)),
    ("beds", Kind::List(|_| Ok(()))),
    ("review", Kind::List(check_review)),
    ("panel_position_m", Kind::Optional(check::<Option<f64>>)),
    ("curves", Kind::List(check_curve)),
    ("trace", Kind::Optional(check::<Option<crate::trace::TraceSheet>>)),
];

const BED_FIELDS: &[(&str, Kind)] = &[
    ("id", Kind::Required(check::<u64>)),
    ("thickness_m", Kind::Required(check::<f64>)),
    ("lithology", Kind::Required(check::<Lithology>)),
    ("grain_base", Kind::Optional(check::<Option<GrainSize>>)),
    ("grain_top", Kind::Optional(check::<Option<GrainSize>>)),
    ("structures", Kind::List(check::<Structure>)),
    ("base_contact", Kind::Optional(check::<Contact>)),
    ("base_relief_m", Kind::Optional(check::<Option<f64>>)),
    ("paleosol", Kind::Optional(check::<PaleosolDevelopment>)),
    ("paleosol_features", Kind::List(check::<PaleosolFeature>)),
    ("carbonate_stage", Kind::Optional(check::<Option<u8>>)),
    ("base_surface", Kind::Optional(check::<Option<Surface>>)),
    ("base_rank", Kind::Optional(check::<Option<BaseRank>>)),
    ("colour", Kind::Optional(check::<String>)),
    ("munsell", Kind::Optional(check::<Option<Munsell>>)),
    ("paleocurrents", Kind::List(check_paleocurrent)),
    ("fossils", Kind::Optional(check::<String>)),
    ("trace_fossils", Kind::List(string_list)),
    ("body_fossils", Kind::List(string_list)),
    ("bioturbation_index", Kind::Optional(check::<Option<u8>>)),
    ("samples", Kind::List(check_sample)),
    ("photos", Kind::List(check::<Photo>)),
    ("facies", Kind::Optional(check::<Option<FaciesCode>>)),
    ("lag_composition", Kind::Optional(check::<String>)),
    ("soil_horizon", Kind::Optional(check::<Option<SoilHorizon>>)),
    ("drainage", Kind::Optional(check::<Option<Drainage>>)),
    ("slope_distance_m", Kind::Optional(check::<Option<f64>>)),
    ("notes", Kind::Optional(check::<String>)),
];

/// The field names of a table.
fn names(table: &[(&'static str, Kind)]) -> Vec<&'static str> {
    table.iter().map(|(n, _)| *n).collect()
}

/// Known field names of the project root, sections, beds and measured curves (for the scanner's
/// check).
pub fn known_fields() -> KnownFields {
    KnownFields {
        project: names(PROJECT_FIELDS),
        section: names(SECTION_FIELDS),
        bed: names(BED_FIELDS),
        curve: CURVE_FIELDS.to_vec(),
    }
}

/// Known fields as a sentence tail for warnings.
pub(super) fn known_list(role: &str) -> String {
    if role == "curve" {
        return CURVE_FIELDS.join(", ");
    }
    let table = match role {
        "bed" => BED_FIELDS,
        "section" => SECTION_FIELDS,
        _ => PROJECT_FIELDS,
    };
    names(table).join(", ")
}

/// Check an object's fields against a table, one by one, so that every bad field is named.
fn field_problems(obj: &Map<String, Value>, path: &str, table: &[(&str, Kind)], problems: &mut Vec<Problem>) {
    let at = |field: &str| if path.is_empty() { field.to_string() } else { format!("{path}.{field}") };
    for (name, kind) in table {
        let value = obj.get(*name);
        match (kind, value) {
            (Kind::Required(_), None) => problems.push(Problem::new(at(name), "required field is missing")),
            (Kind::Required(f) | Kind::Optional(f), Some(v)) => {
                if let Err(e) = f(v) {
                    problems.push(Problem::new(at(name), e));
                }
            }
            (Kind::List(f), Some(Value::Array(items))) => {
                for (i, item) in items.iter().enumerate() {
                    if let Err(e) = f(item) {
                        problems.push(Problem::new(format!("{}[{i}]", at(name)), e));
                    }
                }
            }
            (Kind::List(_), Some(other)) => problems
                .push(Problem::new(at(name), format!("must be a list [ … ], got {}", describe(other)))),
            (Kind::Optional(_) | Kind::List(_), None) => {}
        }
    }
}

/// Fields not in the table become warnings (they would be dropped on the next save).
fn unknown_fields(obj: &Map<String, Value>, path: &str, table: &[(&str, Kind)], warnings: &mut Vec<Problem>) {
    let known: Vec<&str> = table.iter().map(|(n, _)| *n).collect();
    unknown_field_names(obj, path, &known, warnings);
}

/// Fields not among `known` become warnings.
fn unknown_field_names(obj: &Map<String, Value>, path: &str, known: &[&str], warnings: &mut Vec<Problem>) {
    if obj.keys().all(|k| known.contains(&k.as_str())) {
        return;
    }
    let at = |field: &str| if path.is_empty() { field.to_string() } else { format!("{path}.{field}") };
    let mut unknown: Vec<&String> = obj.keys().filter(|k| !known.contains(&k.as_str())).collect();
    unknown.sort();
    for key in unknown {
        let valid = known.join(", ");
        warnings.push(Problem::new(at(key), format!("unknown field, ignored (known fields: {valid})")));
    }
}

/// Check an object's fields against a table; unknown fields become warnings.
fn check_fields(
    obj: &Map<String, Value>,
    path: &str,
    table: &[(&str, Kind)],
    problems: &mut Vec<Problem>,
    warnings: &mut Vec<Problem>,
) {
    field_problems(obj, path, table, problems);
    unknown_fields(obj, path, table, warnings);
}

/// Deserialise a value already checked field by field; a failure here is reported at `path`.
fn build<T: DeserializeOwned>(v: &Value, path: &str, problems: &mut Vec<Problem>) -> Option<T> {
    match T::deserialize(v) {
        Ok(t) => Some(t),
        Err(e) => {
            problems.push(Problem::new(path, e.to_string()));
            None
        }
    }
}

/// A JSON value either parsed into a tree or still raw text (parsed when a part is needed).
#[derive(Clone, Copy)]
enum Node<'a> {
    Tree(&'a Value),
    /// The text of one value (valid JSON).
    Raw(&'a str),
}

/// An object's fields as parsed values, except the list under one key, whose items stay nodes.
struct Split<'a> {
    /// Every field; the list itself is replaced by an empty list `[]` (a non-list is kept as it is).
    fields: Map<String, Value>,
    /// The items of the list, when the key holds a list.
    items: Option<Vec<Node<'a>>>,
}

/// Raw JSON text as a tree. The text was checked as JSON before, so this cannot fail.
fn raw_to_value(raw: &str) -> Value {
    serde_json::from_str(raw).unwrap_or(Value::Null)
}

/// The items of a raw array as slices of its text (serde_json's [`RawValue`]); `None` if the text
/// is not an array.
fn raw_items(raw: &str) -> Option<Vec<&str>> {
    let items: Vec<&RawValue> = serde_json::from_str(raw).ok()?;
    Some(items.into_iter().map(RawValue::get).collect())
}

/// An object's fields in file order, each value a slice of the text, repeated keys included.
struct RawObject<'a>(Vec<(String, &'a RawValue)>);

impl<'de> Deserialize<'de> for RawObject<'de> {
    fn deserialize<D: serde::Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        struct Fields;
        impl<'de> Visitor<'de> for Fields {
            type Value = RawObject<'de>;
            fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                f.write_str("a JSON object")
            }
            fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<RawObject<'de>, A::Error> {
                let mut fields = Vec::new();
                while let Some(entry) = map.next_entry::<String, &'de RawValue>()? {
                    fields.push(entry);
                }
                Ok(RawObject(fields))
            }
        }
        deserializer.deserialize_map(Fields)
    }
}

/// The fields of a raw object as a tree reads them: keys unescaped, the last of a repeated key
/// winning (in the place of the first, as the tree's map keeps it); `None` if the text is not an
/// object.
fn raw_fields(raw: &str) -> Option<Vec<(String, &str)>> {
    let RawObject(fields) = serde_json::from_str(raw).ok()?;
    let mut out: Vec<(String, &str)> = Vec::new();
    let mut seen: HashMap<String, usize> = HashMap::new();
    for (key, value) in fields {
        let value = value.get();
        match seen.get(&key) {
            Some(&k) => out[k].1 = value,
            None => {
                seen.insert(key.clone(), out.len());
                out.push((key, value));
            }
        }
    }
    Some(out)
}

impl<'a> Node<'a> {
    fn first_byte(self) -> Option<u8> {
        match self {
            Node::Tree(Value::Object(_)) => Some(b'{'),
            Node::Tree(Value::Array(_)) => Some(b'['),
            Node::Tree(_) => None,
            Node::Raw(r) => r.trim_start().bytes().next(),
        }
    }

    /// The value as a tree (a raw one is parsed).
    fn value(self) -> Cow<'a, Value> {
        match self {
            Node::Tree(v) => Cow::Borrowed(v),
            Node::Raw(r) => Cow::Owned(raw_to_value(r)),
        }
    }

    /// [`describe`] without parsing a raw list or object.
    fn describe(self) -> String {
        match self.first_byte() {
            Some(b'{') => "an object".into(),
            Some(b'[') => "a list".into(),
            _ => describe(&self.value()),
        }
    }

    /// The object's fields with the list under `list_key` split into item nodes; `None` if the
    /// value is not an object.
    fn split(self, list_key: &str) -> Option<Split<'a>> {
        match self {
            Node::Tree(v) => {
                let obj = v.as_object()?;
                let mut fields = Map::new();
                let mut items = None;
                for (k, v) in obj {
                    match v {
                        Value::Array(list) if k == list_key => {
                            items = Some(list.iter().map(Node::Tree).collect());
                            fields.insert(k.clone(), Value::Array(Vec::new()));
                        }
                        _ => {
                            fields.insert(k.clone(), v.clone());
                        }
                    }
                }
                Some(Split { fields, items })
            }
            Node::Raw(r) => {
                if self.first_byte() != Some(b'{') {
                    return None;
                }
                let mut fields = Map::new();
                let mut items = None;
                for (k, v) in raw_fields(r)? {
                    let list = if k == list_key { raw_items(v) } else { None };
                    match list {
                        Some(list) => {
                            items = Some(list.into_iter().map(Node::Raw).collect());
                            fields.insert(k, Value::Array(Vec::new()));
                        }
                        None => {
                            fields.insert(k, raw_to_value(v));
                        }
                    }
                }
                Some(Split { fields, items })
            }
        }
    }
}

/// True when raw JSON text holds an object.
pub fn is_object(raw: &str) -> bool {
    Node::Raw(raw).first_byte() == Some(b'{')
}

/// One field of a raw JSON object as a tree (the last one if the key repeats, as in a tree);
/// `None` when the value is not an object or has no such field.
pub fn root_field(raw: &str, key: &str) -> Option<Value> {
    let fields = raw_fields(raw)?;
    fields.into_iter().find(|(k, _)| k == key).map(|(_, v)| raw_to_value(v))
}

/// Which beds, by (section index, bed index), may hold fields the reader does not know. Raw beds
/// not in the set are deserialised straight into [`Bed`]; the others are checked field by field.
pub type BedsToCheck = HashSet<(usize, usize)>;

/// The beds named by unknown-field paths from the limits scan (`sections[2].beds[7].colr`).
pub fn beds_with_unknown_fields(unknown: &[(String, usize)]) -> BedsToCheck {
    /// A leading index and the text after it.
    fn index(s: &str) -> Option<(usize, &str)> {
        let end = s.find(|c: char| !c.is_ascii_digit())?;
        Some((s[..end].parse().ok()?, &s[end..]))
    }
    unknown
        .iter()
        .filter_map(|(path, _)| {
            let (i, rest) = index(path.strip_prefix("sections[")?)?;
            let (j, rest) = index(rest.strip_prefix("].beds[")?)?;
            rest.starts_with("].").then_some((i, j))
        })
        .collect()
}

/// What reading a project field by field found, located by JSON path.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldRead {
    /// The project, when there were no problems.
    pub project: Option<Project>,
    /// Every problem found, in reading order.
    pub problems: Vec<Problem>,
    /// Fields that are read past (unknown fields).
    pub warnings: Vec<Problem>,
}

/// Read a version-current project tree.
pub fn read_project(root: &Value) -> FieldRead {
    read_node(Node::Tree(root), &BedsToCheck::new())
}

/// Read a version-current project from JSON text that is known to be valid JSON (see
/// [`check_json_syntax`]). Gives exactly what [`read_project`] gives for the same text parsed
/// into a tree, without building the tree: each bed goes straight into a [`Bed`], and only a bed
/// that fails, or is listed in `check` (it may hold unknown fields), is parsed and checked
/// field by field.
pub fn read_project_raw(root: &str, check: &BedsToCheck) -> FieldRead {
    read_node(Node::Raw(root), check)
}

fn read_node(root: Node<'_>, check: &BedsToCheck) -> FieldRead {
    let mut problems = Vec::new();
    let mut warnings = Vec::new();
    // The file's text when read raw: a bed's slice lies inside it, and the slice's offset gives
    // the bed's line.
    let text = match root {
        Node::Raw(r) => Some(r),
        Node::Tree(_) => None,
    };
    let mut lines = LineCounter::default();
    let Some(Split { fields: obj, items: section_nodes }) = root.split("sections") else {
        problems.push(Problem::new(
            "",
            format!("a project file must hold a JSON object {{ … }}, got {}", root.describe()),
        ));
        return FieldRead { project: None, problems, warnings };
    };
    check_fields(&obj, "", PROJECT_FIELDS, &mut problems, &mut warnings);
    let format_version = obj.get("format_version").and_then(Value::as_u64).unwrap_or(0) as u32;
    let mut sections = Vec::new();
    if !obj.contains_key("sections") {
        problems.push(Problem::new("sections", "required field is missing (a list of sections)"));
    }
    for (i, sv) in section_nodes.unwrap_or_default().into_iter().enumerate() {
        let path = format!("sections[{i}]");
        let Some(Split { fields: sobj, items: bed_nodes }) = sv.split("beds") else {
            problems.push(Problem::new(
                &path,
                format!("a section must be an object {{ … }}, got {}", sv.describe()),
            ));
            continue;
        };
        let before = problems.len();
        check_fields(&sobj, &path, SECTION_FIELDS, &mut problems, &mut warnings);
        if let Some(Value::Array(curves)) = sobj.get("curves") {
            for (k, c) in curves.iter().enumerate() {
                if let Some(cobj) = c.as_object() {
                    let cpath = format!("{path}.curves[{k}]");
                    unknown_field_names(cobj, &cpath, CURVE_FIELDS, &mut warnings);
                }
            }
        }
        if !sobj.contains_key("beds") {
            problems.push(Problem::new(format!("{path}.beds"), "required field is missing (a list of beds)"));
        }
        let bed_nodes = bed_nodes.unwrap_or_default();
        let mut beds = Vec::with_capacity(bed_nodes.len());
        for (j, bv) in bed_nodes.into_iter().enumerate() {
            // The fast path: a raw bed with no unknown fields straight into the typed model.
            if let Node::Raw(raw) = bv {
                if bv.first_byte() == Some(b'{') && !check.contains(&(i, j)) {
                    if let Ok(bed) = serde_json::from_str::<Bed>(raw) {
                        beds.push(bed);
                        continue;
                    }
                }
            }
            let bpath = format!("{path}.beds[{j}]");
            let (p0, w0) = (problems.len(), warnings.len());
            read_bed(&bv.value(), &bpath, &mut beds, &mut problems, &mut warnings);
            if let (Some(text), Node::Raw(raw)) = (text, bv) {
                let first = lines.line_of(text, raw);
                locate_in_bed(raw, first, &bpath, &mut problems[p0..]);
                locate_in_bed(raw, first, &bpath, &mut warnings[w0..]);
            }
        }
        if problems.len() == before {
            // The section's own fields, with the beds already built.
            let mut shallow = sobj;
            shallow.insert("beds".into(), Value::Array(Vec::new()));
            if let Some(mut section) = build::<Section>(&Value::Object(shallow), &path, &mut problems) {
                section.beds = beds.into();
                sections.push(section);
            }
        }
    }
    let rule_params = match obj.get("rule_params") {
        Some(Value::Object(m)) => m.clone(),
        _ => serde_json::Map::new(),
    };
    let project = problems.is_empty().then_some(Project { format_version, sections, rule_params });
    FieldRead { project, problems, warnings }
}

/// Line numbers of slices of one text, counted forward from the last slice asked for (beds come
/// in file order, so a whole file's worth of bad beds costs one pass over it).
#[derive(Default)]
struct LineCounter {
    offset: usize,
    line: usize,
}

impl LineCounter {
    /// The 1-based line on which `slice`, a part of `text`, starts; `None` when it is not a part.
    fn line_of(&mut self, text: &str, slice: &str) -> Option<usize> {
        let offset = (slice.as_ptr() as usize).checked_sub(text.as_ptr() as usize)?;
        if offset > text.len() {
            return None;
        }
        if offset < self.offset || self.line == 0 {
            *self = LineCounter { offset: 0, line: 1 };
        }
        self.line += text.as_bytes()[self.offset..offset].iter().filter(|&&b| b == b'\n').count();
        self.offset = offset;
        Some(self.line)
    }
}

/// Lines for the problems of one bed read from its raw slice: the slice's first line in the file
/// plus the line of the field within the slice (found by scanning the slice alone).
fn locate_in_bed(raw: &str, first_line: Option<usize>, bpath: &str, found: &mut [Problem]) {
    let Some(first) = first_line else { return };
    let relative =
        |p: &Problem| p.location.strip_prefix(bpath).map(|r| r.trim_start_matches('.').to_string());
    let wanted: Vec<String> =
        found.iter().filter(|p| p.line.is_none()).filter_map(relative).filter(|r| !r.is_empty()).collect();
    let refs: Vec<&str> = wanted.iter().map(String::as_str).collect();
    let within = super::json_scan::lines_of(raw, &refs);
    for p in found.iter_mut().filter(|p| p.line.is_none()) {
        let line_in_bed = relative(p).and_then(|r| within.get(&r).copied()).unwrap_or(1);
        p.line = Some(first + line_in_bed - 1);
    }
}

/// Read one bed from a tree: every bad field named, unknown fields as warnings.
fn read_bed(
    bv: &Value,
    bpath: &str,
    beds: &mut Vec<Bed>,
    problems: &mut Vec<Problem>,
    warnings: &mut Vec<Problem>,
) {
    let Some(bobj) = bv.as_object() else {
        problems.push(Problem::new(bpath, format!("a bed must be an object {{ … }}, got {}", describe(bv))));
        return;
    };
    unknown_fields(bobj, bpath, BED_FIELDS, warnings);
    // The whole bed at once is the fast path; only a bed that fails is checked field by field,
    // to name every bad field.
    match Bed::deserialize(bv) {
        Ok(bed) => beds.push(bed),
        Err(e) => {
            let bed_before = problems.len();
            field_problems(bobj, bpath, BED_FIELDS, problems);
            if problems.len() == bed_before {
                problems.push(Problem::new(bpath, e.to_string()));
            }
        }
    }
}

/// Check that text is one JSON value, with the same error (message, line and column) that
/// parsing it into a [`Value`] tree would give, but without building the tree.
pub fn check_json_syntax(text: &str) -> Result<(), serde_json::Error> {
    serde_json::from_str::<AnyJson>(text).map(|_| ())
}

/// Any JSON value, visited the way [`Value`] visits it (every number parsed, every string
/// unescaped), and dropped.
struct AnyJson;

impl<'de> Deserialize<'de> for AnyJson {
    fn deserialize<D: serde::Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        deserializer.deserialize_any(AnyJsonVisitor)
    }
}

struct AnyJsonVisitor;

impl<'de> Visitor<'de> for AnyJsonVisitor {
    type Value = AnyJson;

    fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("any JSON value")
    }
    fn visit_bool<E>(self, _: bool) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_i64<E>(self, _: i64) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_u64<E>(self, _: u64) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_f64<E>(self, _: f64) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_str<E>(self, _: &str) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_unit<E>(self) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_none<E>(self) -> Result<AnyJson, E> {
        Ok(AnyJson)
    }
    fn visit_some<D: serde::Deserializer<'de>>(self, d: D) -> Result<AnyJson, D::Error> {
        AnyJson::deserialize(d)
    }
    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<AnyJson, A::Error> {
        while seq.next_element::<AnyJson>()?.is_some() {}
        Ok(AnyJson)
    }
    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<AnyJson, A::Error> {
        while map.next_key::<AnyJson>()?.is_some() {
            map.next_value::<AnyJson>()?;
        }
        Ok(AnyJson)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn reports_every_bad_field_and_warns_on_unknown_ones() {
        let v = json!({
            "format_version": 1,
            "sections": [{
                "name": "Sedge Creek",
                "beds": [
                    {"id": 1, "thickness_m": "thick", "lithology": "sandstne", "grain_base": "fine sand"},
                    {"id": 2, "thickness_m": 1.0, "lithology": "mudstone", "structures": ["massive", "wiggles"],
                     "colr": "red"}
                ]
            }]
        });
        let FieldRead { project, problems, warnings } = read_project(&v);
        assert!(project.is_none());
        let locs: Vec<&str> = problems.iter().map(|p| p.location.as_str()).collect();
        assert_eq!(
            locs,
            [
                "sections[0].beds[0].thickness_m",
                "sections[0].beds[0].lithology",
                "sections[0].beds[1].structures[1]"
            ]
        );
        assert!(problems[1].message.contains("sandstone"), "valid values listed: {}", problems[1]);
        assert_eq!(warnings.len(), 1);
        assert_eq!(warnings[0].location, "sections[0].beds[1].colr");
    }

    #[test]
    fn reads_a_valid_tree() {
        let v = json!({"format_version": 1, "sections": [{"name": "A", "beds": [
            {"id": 1, "thickness_m": 2.5, "lithology": "sandstone", "grain_base": "coarse sand", "grain_top": "0.2mm"}]}]});
        let FieldRead { project, problems, warnings } = read_project(&v);
        assert!(problems.is_empty() && warnings.is_empty(), "{problems:?} {warnings:?}");
        let project = project.expect("project");
        assert_eq!(project.sections[0].beds[0].thickness_m, 2.5);
    }

    #[test]
    fn a_bad_beds_line_comes_from_its_slice_offset() {
        // Line 1 `{`, line 2 version, line 3 sections, line 4 section name, line 5 `"beds": [`,
        // line 6 a good bed, line 7 the bad bed's `{`, line 8 its thickness (−2).
        let text = "{\n\"format_version\": 1,\n\"sections\": [{\n\"name\": \"A\",\n\"beds\": [\n\
                    {\"id\": 1, \"thickness_m\": 1.0, \"lithology\": \"mudstone\", \"grain_base\": \"silt\"},\n\
                    {\"id\": 2,\n \"thickness_m\": \"thick\", \"lithology\": \"mudstone\", \"grain_base\": \"silt\"}\n]}]}";
        let read = read_project_raw(text, &BedsToCheck::default());
        let p = read
            .problems
            .iter()
            .find(|p| p.location.ends_with("beds[1].thickness_m"))
            .expect("the bad field");
        assert_eq!(p.line, Some(8), "{:?}", read.problems);
        let mut lines = LineCounter::default();
        assert_eq!(lines.line_of(text, &text[text.find("\"beds\"").expect("beds")..]), Some(5));
        assert_eq!(lines.line_of(text, &text[..1]), Some(1), "counting again from the start");
        assert_eq!(lines.line_of(text, "elsewhere"), None);
    }

    #[test]
    fn splits_raw_arrays_and_objects_into_their_text() {
        let text = " [ {\"a\": [1, {\"b\": \"]}\\\"\"}]} , -1.5e3,\"x,\\\"y\" ,true,null,[],{} ] ";
        let items = raw_items(text).expect("an array");
        assert_eq!(
            items,
            ["{\"a\": [1, {\"b\": \"]}\\\"\"}]}", "-1.5e3", "\"x,\\\"y\"", "true", "null", "[]", "{}"]
        );
        let fields = raw_fields(items[0]).expect("an object");
        assert_eq!(fields, [("a".to_string(), "[1, {\"b\": \"]}\\\"\"}]")]);
        // Keys unescaped; a repeated key keeps the first place and the last value, as a tree does.
        let fields = raw_fields("{ \"k\\\"\" :1 ,\"k\":\"v\", \"k\\\"\": 2}").expect("an object");
        assert_eq!(fields, [("k\"".to_string(), "2"), ("k".to_string(), "\"v\"")]);
        // Each slice is the file's own text, so its offset in the file is known.
        let inner = items[1];
        assert_eq!(inner.as_ptr() as usize - text.as_ptr() as usize, text.find("-1.5e3").expect("in text"));
        assert_eq!(raw_items("[ ]"), Some(vec![]));
        assert_eq!(raw_fields("{}"), Some(vec![]));
        assert_eq!(raw_items("{}"), None);
        assert_eq!(raw_fields(" 5"), None);
    }
}
