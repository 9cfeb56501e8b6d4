//! Builds a [`Project`] from a parsed JSON tree field by field, so that every wrong field is
//! reported with its path (serde alone stops at the first) and unknown fields become warnings.

use super::problem::Problem;
use crate::model::{
    Contact, GrainSize, LatLon, LengthUnit, Lithology, PaleosolDevelopment, PaleosolFeature, Project,
    ReviewDecision, Section, Structure, Surface,
};
use serde::de::DeserializeOwned;
use serde::Deserialize;
use serde_json::{Map, Value};

/// How a field is checked before the whole object is deserialised.
#[derive(Clone, Copy)]
enum Kind {
    Required(fn(&Value) -> Result<(), String>),
    Optional(fn(&Value) -> Result<(), String>),
    /// An array whose items are each checked (and reported with their index).
    List(fn(&Value) -> Result<(), String>),
}

fn check<T: DeserializeOwned>(v: &Value) -> Result<(), String> {
    T::deserialize(v).map(|_| ()).map_err(|e| e.to_string())
}

fn string_list(v: &Value) -> Result<(), String> {
    check::<String>(v)
}

const PROJECT_FIELDS: &[(&str, Kind)] =
    &[("format_version", Kind::Required(check::<u32>)), ("sections", Kind::List(|_| Ok(())))];

const SECTION_FIELDS: &[(&str, Kind)] = &[
    ("name", Kind::Required(check::<String>)),
    ("locality", Kind::Optional(check::<String>)),
    ("coordinates", Kind::Optional(check::<LatLon>)),
    ("date_logged", Kind::Optional(check::<Option<String>>)),
    ("logged_by", Kind::Optional(check::<String>)),
    ("notes", Kind::Optional(check::<String>)),
    ("display_unit", Kind::Optional(check::<LengthUnit>)),
    ("beds", Kind::List(|_| Ok(()))),
    ("review", Kind::List(check::<ReviewDecision>)),
    ("panel_position_m", Kind::Optional(check::<Option<f64>>)),
    ("curves", Kind::List(super::curve_fields::check_curve)),
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
    ("colour", Kind::Optional(check::<String>)),
    ("paleocurrents_deg", Kind::List(check::<f64>)),
    ("fossils", Kind::Optional(check::<String>)),
    ("samples", Kind::List(string_list)),
    ("notes", Kind::Optional(check::<String>)),
];

/// The field names of a table.
fn names(table: &[(&'static str, Kind)]) -> Vec<&'static str> {
    table.iter().map(|(n, _)| *n).collect()
}

/// Known field names of the project root, sections and beds (for the scanner's check).
pub fn known_field_names() -> (Vec<&'static str>, Vec<&'static str>, Vec<&'static str>) {
    (names(PROJECT_FIELDS), names(SECTION_FIELDS), names(BED_FIELDS))
}

/// Known fields as a sentence tail for warnings.
pub fn known_list(role: &str) -> String {
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
    if obj.keys().all(|k| table.iter().any(|(n, _)| n == k)) {
        return;
    }
    let at = |field: &str| if path.is_empty() { field.to_string() } else { format!("{path}.{field}") };
    let mut unknown: Vec<&String> = obj.keys().filter(|k| !table.iter().any(|(n, _)| n == k)).collect();
    unknown.sort();
    for key in unknown {
        let valid = table.iter().map(|(n, _)| *n).collect::<Vec<_>>().join(", ");
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

/// A short description of a JSON value's type for messages.
pub(crate) fn describe(v: &Value) -> String {
    match v {
        Value::Null => "null".into(),
        Value::Bool(b) => format!("{b}"),
        Value::Number(n) => format!("the number {n}"),
        Value::String(s) => format!("the text {:?}", s.chars().take(60).collect::<String>()),
        Value::Array(_) => "a list".into(),
        Value::Object(_) => "an object".into(),
    }
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

/// Read a version-current project tree. Returns the project when there were no problems, plus
/// the problems and the warnings (both located by JSON path).
pub fn read_project(root: &Value) -> (Option<Project>, Vec<Problem>, Vec<Problem>) {
    let mut problems = Vec::new();
    let mut warnings = Vec::new();
    let Some(obj) = root.as_object() else {
        problems.push(Problem::new(
            "",
            format!("a project file must hold a JSON object {{ … }}, got {}", describe(root)),
        ));
        return (None, problems, warnings);
    };
    check_fields(obj, "", PROJECT_FIELDS, &mut problems, &mut warnings);
    let format_version = obj.get("format_version").and_then(Value::as_u64).unwrap_or(0) as u32;
    let mut sections = Vec::new();
    let section_values = obj.get("sections").and_then(Value::as_array).map(Vec::as_slice).unwrap_or(&[]);
    if !obj.contains_key("sections") {
        problems.push(Problem::new("sections", "required field is missing (a list of sections)"));
    }
    for (i, sv) in section_values.iter().enumerate() {
        let path = format!("sections[{i}]");
        let Some(sobj) = sv.as_object() else {
            problems.push(Problem::new(
                &path,
                format!("a section must be an object {{ … }}, got {}", describe(sv)),
            ));
            continue;
        };
        let before = problems.len();
        check_fields(sobj, &path, SECTION_FIELDS, &mut problems, &mut warnings);
        if !sobj.contains_key("beds") {
            problems.push(Problem::new(format!("{path}.beds"), "required field is missing (a list of beds)"));
        }
        let bed_values = sobj.get("beds").and_then(Value::as_array).map(Vec::as_slice).unwrap_or(&[]);
        let mut beds = Vec::with_capacity(bed_values.len());
        for (j, bv) in bed_values.iter().enumerate() {
            let bpath = format!("{path}.beds[{j}]");
            let Some(bobj) = bv.as_object() else {
                problems.push(Problem::new(
                    &bpath,
                    format!("a bed must be an object {{ … }}, got {}", describe(bv)),
                ));
                continue;
            };
            unknown_fields(bobj, &bpath, BED_FIELDS, &mut warnings);
            // The whole bed at once is the fast path; only a bed that fails is checked field by
            // field, to name every bad field.
            match crate::model::Bed::deserialize(bv) {
                Ok(bed) => beds.push(bed),
                Err(e) => {
                    let bed_before = problems.len();
                    field_problems(bobj, &bpath, BED_FIELDS, &mut problems);
                    if problems.len() == bed_before {
                        problems.push(Problem::new(&bpath, e.to_string()));
                    }
                }
            }
        }
        if problems.len() == before {
            // Deserialise the section without its beds (already built) to keep one copy.
            let mut shallow: Map<String, Value> = sobj
                .iter()
                .filter(|(k, _)| k.as_str() != "beds")
                .map(|(k, v)| (k.clone(), v.clone()))
                .collect();
            shallow.insert("beds".into(), Value::Array(Vec::new()));
            if let Some(mut section) = build::<Section>(&Value::Object(shallow), &path, &mut problems) {
                section.beds = beds;
                sections.push(section);
            }
        }
    }
    if problems.is_empty() {
        (Some(Project { format_version, sections }), problems, warnings)
    } else {
        (None, problems, warnings)
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
        let (project, problems, warnings) = read_project(&v);
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
        let (project, problems, warnings) = read_project(&v);
        assert!(problems.is_empty() && warnings.is_empty(), "{problems:?} {warnings:?}");
        let project = project.expect("project");
        assert_eq!(project.sections[0].beds[0].thickness_m, 2.5);
    }
}
