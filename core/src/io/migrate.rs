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
//!
//! Version 1 differs from version 2 thus (version 2 adds the whole field record: facies codes,
//! photos, bioturbation, fossils by name, Munsell colour, lag composition, soil horizons and
//! drainage on beds; measuring method, uncertainty, bedding, traverse, GPS fixes and channel-body
//! widths on sections — all optional, so only these change):
//! - `"paleocurrents_deg": [210, 225]` became `"paleocurrents": [{"azimuth_deg": 210}, …]`, each
//!   reading able to carry its indicator and dip;
//! - `"samples": ["SC-1"]` became `"samples": [{"id": "SC-1"}]`, each able to carry its kind and
//!   height in the bed;
//! - a `"colour"` that is a Munsell notation (`"10YR 5/4"`) moves to `"munsell"`; colour in
//!   words stays;
//! - review states written `"candidate"` are read as `"unreviewed"` (the word since version 2).

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

/// Rewrite a version-1 tree as version 2 (see the module note). Nothing changes in meaning: a
/// value of the wrong type is carried over as it is, for the reader to report.
pub fn v1_to_v2(root: &mut Value) {
    let Some(obj) = root.as_object_mut() else { return };
    obj.insert("format_version".into(), Value::from(2u32));
    let Some(Value::Array(sections)) = obj.get_mut("sections") else { return };
    for section in sections.iter_mut() {
        let Some(Value::Array(beds)) = section.get_mut("beds") else { continue };
        for bed in beds.iter_mut() {
            let Some(bobj) = bed.as_object_mut() else { continue };
            if let Some(readings) = bobj.remove("paleocurrents_deg") {
                let readings = match readings {
                    Value::Array(items) => Value::Array(
                        items.into_iter().map(|a| serde_json::json!({ "azimuth_deg": a })).collect(),
                    ),
                    other => other,
                };
                bobj.entry("paleocurrents").or_insert(readings);
            }
            if let Some(Value::Array(samples)) = bobj.get_mut("samples") {
                for s in samples.iter_mut() {
                    if s.is_string() {
                        *s = serde_json::json!({ "id": s.take() });
                    }
                }
            }
            let munsell = match bobj.get("colour") {
                Some(Value::String(c)) if !bobj.contains_key("munsell") => {
                    crate::model::Munsell::parse(c).ok().map(|m| m.to_string())
                }
                _ => None,
            };
            if let Some(m) = munsell {
                bobj.remove("colour");
                bobj.insert("munsell".into(), Value::String(m));
            }
        }
    }
}

/// The version-1 spelling of a current path whose field was reshaped, for finding the line of a
/// problem in a migrated file (`…paleocurrents[2].azimuth_deg` → `…paleocurrents_deg[2]`).
pub(crate) fn v1_path(path: &str) -> Option<String> {
    if let Some(head) = path.strip_suffix(".paleocurrents") {
        return Some(format!("{head}.paleocurrents_deg"));
    }
    if let Some(at) = path.find(".paleocurrents[") {
        let rest = &path[at + ".paleocurrents".len()..];
        let index_end = rest.find(']').map_or(rest.len(), |i| i + 1);
        return Some(format!("{}.paleocurrents_deg{}", &path[..at], &rest[..index_end]));
    }
    if let Some(stripped) = path.strip_suffix(".id").filter(|p| p.contains(".samples[")) {
        return Some(stripped.to_string());
    }
    path.strip_suffix(".munsell").map(|head| format!("{head}.colour"))
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
    fn migrates_a_v1_tree_without_changing_its_meaning() {
        let mut v = json!({"format_version": 1, "sections": [{"name": "A", "beds": [
            {"id": 1, "thickness_m": 2.0, "lithology": "sandstone", "paleocurrents_deg": [210, 225.5],
             "samples": ["SC-1", "SC-2"], "colour": "10yr 5/4"},
            {"id": 2, "thickness_m": 1.0, "lithology": "mudstone", "colour": "greenish grey",
             "paleocurrents_deg": "north"}
        ]}]});
        v1_to_v2(&mut v);
        assert_eq!(v["format_version"], 2);
        let bed = &v["sections"][0]["beds"][0];
        assert_eq!(bed["paleocurrents"], json!([{"azimuth_deg": 210}, {"azimuth_deg": 225.5}]));
        assert!(bed.get("paleocurrents_deg").is_none());
        assert_eq!(bed["samples"], json!([{"id": "SC-1"}, {"id": "SC-2"}]));
        assert_eq!(bed["munsell"], "10YR 5/4");
        assert!(bed.get("colour").is_none());
        let words = &v["sections"][0]["beds"][1];
        assert_eq!(words["colour"], "greenish grey");
        assert!(words.get("munsell").is_none());
        // A wrong value is carried over for the reader to report, not dropped.
        assert_eq!(words["paleocurrents"], "north");
        assert_eq!(
            v1_path("sections[0].beds[3].paleocurrents[2].azimuth_deg").as_deref(),
            Some("sections[0].beds[3].paleocurrents_deg[2]")
        );
        assert_eq!(
            v1_path("sections[0].beds[1].samples[0].id").as_deref(),
            Some("sections[0].beds[1].samples[0]")
        );
        assert_eq!(v1_path("sections[0].beds[1].notes"), None);
    }

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
