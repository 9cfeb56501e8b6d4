//! Migration of older project files to the current format.
//!
//! Version 0 (files with `"format_version": 0` or none at all) differs from version 1 thus:
//! - a section gives its thickness unit once, `"unit": "m" | "cm" | "ft"` (default m), and each
//!   bed has `"thickness"` in that unit; v1 stores `"thickness_m"` and keeps the unit as
//!   `"display_unit"`;
//! - beds have no `"id"`; v1 numbers them 1, 2, 3 … from the base;
//! - one `"grain"` per bed; v1 has `"grain_base"` and `"grain_top"` (both take the v0 value);
//! - `"contact"` became `"base_contact"`, `"paleocurrents"` became `"paleocurrents_deg"`;
//! - a surface was a bare name, `"surface": "SB-1"`; v1 stores `"base_surface": {name, kind}`,
//!   the kind inferred by [`infer_surface_kind`].

use super::field_check::describe;
use super::problem::Problem;
use crate::model::{Contact, LengthUnit, PaleosolDevelopment, SurfaceKind};
use serde_json::{Map, Value};

/// The kind of a surface named at a bed's base when the file does not say: an incision surface
/// if the bed's base is erosional, a paleosol top if the bed below carries a paleosol, otherwise
/// "other" (common practice: those are the two surfaces a geologist names in river deposits).
pub fn infer_surface_kind(base_contact: Contact, paleosol_below: Option<PaleosolDevelopment>) -> SurfaceKind {
    if base_contact == Contact::Erosional {
        SurfaceKind::Incision
    } else if paleosol_below.is_some_and(|p| p != PaleosolDevelopment::None) {
        SurfaceKind::PaleosolTop
    } else {
        SurfaceKind::Other
    }
}

/// Rename a key in place (a v1 key already present wins).
fn rename(obj: &mut Map<String, Value>, from: &str, to: &str) {
    if let Some(v) = obj.remove(from) {
        obj.entry(to.to_string()).or_insert(v);
    }
}

/// Rewrite a version-0 tree as version 1. Problems that only a v0 file can have (a bad unit, a
/// thickness that is not a number) are reported with their v0 paths.
pub fn v0_to_v1(root: &mut Value) -> Vec<Problem> {
    let mut problems = Vec::new();
    let Some(obj) = root.as_object_mut() else {
        return problems; // The reader reports a non-object root.
    };
    obj.insert("format_version".into(), Value::from(1u32));
    let Some(Value::Array(sections)) = obj.get_mut("sections") else {
        return problems;
    };
    for (i, section) in sections.iter_mut().enumerate() {
        let Some(sobj) = section.as_object_mut() else { continue };
        let unit = match sobj.remove("unit") {
            None => LengthUnit::Metre,
            Some(Value::String(s)) => match LengthUnit::parse(&s) {
                Some(u) => u,
                None => {
                    problems.push(Problem::new(
                        format!("sections[{i}].unit"),
                        format!("unknown unit {s:?}; valid units are {}", LengthUnit::valid_list()),
                    ));
                    LengthUnit::Metre
                }
            },
            Some(other) => {
                problems.push(Problem::new(
                    format!("sections[{i}].unit"),
                    format!("must be text (m, cm or ft), got {}", describe(&other)),
                ));
                LengthUnit::Metre
            }
        };
        sobj.entry("display_unit").or_insert(serde_json::to_value(unit).unwrap_or(Value::Null));
        let Some(Value::Array(beds)) = sobj.get_mut("beds") else { continue };
        let mut paleosol_below: Option<PaleosolDevelopment> = None;
        for (j, bed) in beds.iter_mut().enumerate() {
            let Some(bobj) = bed.as_object_mut() else { continue };
            bobj.entry("id").or_insert(Value::from(j as u64 + 1));
            match bobj.remove("thickness") {
                Some(Value::Number(n)) => {
                    let metres = n.as_f64().map(|t| unit.to_metres(t)).unwrap_or(f64::NAN);
                    match serde_json::Number::from_f64(metres) {
                        Some(m) => {
                            bobj.insert("thickness_m".into(), Value::Number(m));
                        }
                        None => problems.push(Problem::new(
                            format!("sections[{i}].beds[{j}].thickness"),
                            format!("must be a finite number of {}, got {n}", unit.name()),
                        )),
                    }
                }
                Some(other) => problems.push(Problem::new(
                    format!("sections[{i}].beds[{j}].thickness"),
                    format!("must be a number of {} > 0, got {}", unit.name(), describe(&other)),
                )),
                None => {}
            }
            if let Some(g) = bobj.remove("grain") {
                bobj.entry("grain_base").or_insert(g.clone());
                bobj.entry("grain_top").or_insert(g);
            }
            rename(bobj, "contact", "base_contact");
            rename(bobj, "paleocurrents", "paleocurrents_deg");
            if let Some(name) = bobj.remove("surface") {
                let contact = bobj
                    .get("base_contact")
                    .and_then(|c| serde_json::from_value::<Contact>(c.clone()).ok())
                    .unwrap_or_default();
                let kind = infer_surface_kind(contact, paleosol_below);
                let kind = serde_json::to_value(kind).unwrap_or(Value::Null);
                bobj.insert("base_surface".into(), serde_json::json!({ "name": name, "kind": kind }));
            }
            paleosol_below = bobj
                .get("paleosol")
                .and_then(|p| serde_json::from_value::<PaleosolDevelopment>(p.clone()).ok())
                .or(Some(PaleosolDevelopment::None));
        }
    }
    problems
}

/// The v0 name of a v1 field, for finding the line of a problem in a migrated file.
pub(crate) fn v0_field_name(v1_field: &str) -> Option<&'static str> {
    Some(match v1_field {
        "thickness_m" => "thickness",
        "grain_base" | "grain_top" => "grain",
        "base_contact" => "contact",
        "paleocurrents_deg" => "paleocurrents",
        "base_surface" => "surface",
        "display_unit" => "unit",
        _ => return None,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn migrates_a_v0_tree() {
        let mut v = json!({"sections": [{"name": "A", "unit": "ft", "beds": [
            {"thickness": 10, "lithology": "mudstone", "grain": "silt", "paleosol": "strong"},
            {"thickness": 5, "lithology": "sandstone", "grain": "medium sand", "contact": "sharp", "surface": "P-1",
             "paleocurrents": [10, 20]}
        ]}]});
        assert!(v0_to_v1(&mut v).is_empty());
        let beds = &v["sections"][0]["beds"];
        // 1 ft = 0.3048 m exactly (1959 international yard and pound agreement).
        assert_eq!(beds[0]["thickness_m"], json!(3.048));
        assert_eq!(beds[1]["id"], json!(2));
        assert_eq!(beds[1]["grain_top"], json!("medium sand"));
        assert_eq!(beds[1]["base_surface"]["kind"], json!("paleosol_top"));
        assert_eq!(beds[1]["paleocurrents_deg"], json!([10, 20]));
        assert_eq!(v["sections"][0]["display_unit"], json!("foot"));
    }

    #[test]
    fn reports_bad_units_and_thicknesses() {
        let mut v = json!({"sections": [{"name": "A", "unit": "furlong", "beds": [{"thickness": "two"}]}]});
        let locs: Vec<String> = v0_to_v1(&mut v).into_iter().map(|p| p.location).collect();
        assert_eq!(locs, ["sections[0].unit", "sections[0].beds[0].thickness"]);
    }

    #[test]
    fn surface_kind_rule() {
        use PaleosolDevelopment as P;
        assert_eq!(infer_surface_kind(Contact::Erosional, Some(P::Strong)), SurfaceKind::Incision);
        assert_eq!(infer_surface_kind(Contact::Sharp, Some(P::Weak)), SurfaceKind::PaleosolTop);
        assert_eq!(infer_surface_kind(Contact::Sharp, Some(P::None)), SurfaceKind::Other);
        assert_eq!(infer_surface_kind(Contact::Gradational, None), SurfaceKind::Other);
    }
}
