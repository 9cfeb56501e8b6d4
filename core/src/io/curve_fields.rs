//! Field-by-field check of a measured curve in project JSON, so that a wrong field is named
//! (serde alone reports only "invalid type" for the curve as a whole).

use super::field_check::{check, describe, first_wrong_field, FieldCheck};
use crate::model::{IndexDirection, MeasuredCurve};
use serde::Deserialize;
use serde_json::Value;

/// The fields of a measured curve in project JSON (others are warned about and ignored).
pub(super) const CURVE_FIELDS: &[&str] =
    &["mnemonic", "unit", "description", "source_file", "offset_m", "direction", "samples"];

/// Check one item of a section's `curves` list; the error names the field (and sample) at fault.
pub(super) fn check_curve(v: &Value) -> Result<(), String> {
    if MeasuredCurve::deserialize(v).is_ok() {
        return Ok(());
    }
    let Some(obj) = v.as_object() else {
        return Err(format!("a measured curve must be an object {{ … }}, got {}", describe(v)));
    };
    let checks: [(&str, bool, FieldCheck); 6] = [
        ("mnemonic", true, check::<String>),
        ("unit", false, check::<String>),
        ("description", false, check::<String>),
        ("source_file", false, check::<String>),
        ("offset_m", true, check::<f64>),
        ("direction", true, check::<IndexDirection>),
    ];
    first_wrong_field(obj, &checks)?;
    match obj.get("samples") {
        None => return Err("samples: required field is missing".into()),
        Some(Value::Array(items)) => {
            for (i, item) in items.iter().enumerate() {
                if <(f64, Option<f64>)>::deserialize(item).is_err() {
                    return Err(format!(
                        "samples[{i}]: expected [height_m, value] with value a number or null, got {}",
                        match item {
                            Value::Array(a) => format!("a list of {} items", a.len()),
                            other => describe(other),
                        }
                    ));
                }
            }
        }
        Some(other) => return Err(format!("samples: must be a list [ … ], got {}", describe(other))),
    }
    // Every field is fine on its own; report serde's view of the whole.
    MeasuredCurve::deserialize(v).map(|_| ()).map_err(|e| e.to_string())
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn names_the_field_at_fault() {
        let good = json!({"mnemonic": "GR", "unit": "API", "offset_m": 10.0,
            "direction": "depth_below_datum", "samples": [[0.0, 60.0], [0.5, null]]});
        assert_eq!(check_curve(&good), Ok(()));
        let mut v = good.clone();
        v["offset_m"] = json!("ten");
        assert!(check_curve(&v).expect_err("bad").starts_with("offset_m: invalid type"));
        let mut v = good.clone();
        v["direction"] = json!("sideways");
        let e = check_curve(&v).expect_err("bad");
        assert!(e.starts_with("direction: unknown variant") && e.contains("height_above_datum"), "{e}");
        let mut v = good.clone();
        v["samples"] = json!([[0.0, 60.0], [0.5, "x"]]);
        assert_eq!(
            check_curve(&v),
            Err("samples[1]: expected [height_m, value] with value a number or null, got a list of 2 items"
                .into())
        );
        let mut v = good;
        v.as_object_mut().expect("object").remove("mnemonic");
        assert_eq!(check_curve(&v), Err("mnemonic: required field is missing".into()));
        assert!(check_curve(&json!(3)).expect_err("bad").contains("the number 3"));
    }
}
