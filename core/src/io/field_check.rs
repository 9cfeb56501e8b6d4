//! Checking the fields of a JSON object one by one, so that a message names the field at fault
//! (serde alone names none), and short descriptions of JSON values for those messages.

use serde::de::DeserializeOwned;
use serde_json::{Map, Value};

/// Checks one field's value, giving what was wrong with it.
pub(super) type FieldCheck = fn(&Value) -> Result<(), String>;

/// Whether a value deserialises as `T`; serde's message when it does not.
pub(super) fn check<T: DeserializeOwned>(v: &Value) -> Result<(), String> {
    T::deserialize(v).map(|_| ()).map_err(|e| e.to_string())
}

/// The first field of `obj` that is missing (when required) or does not read, in the order of
/// `fields` (name, required, check), as `name: what is wrong`.
pub(super) fn first_wrong_field(
    obj: &Map<String, Value>,
    fields: &[(&str, bool, FieldCheck)],
) -> Result<(), String> {
    for &(name, required, check) in fields {
        match obj.get(name) {
            None if required => return Err(format!("{name}: required field is missing")),
            None => {}
            Some(value) => check(value).map_err(|e| format!("{name}: {e}"))?,
        }
    }
    Ok(())
}

/// A short description of a JSON value's type for messages.
pub(super) fn describe(v: &Value) -> String {
    match v {
        Value::Null => "null".into(),
        Value::Bool(b) => format!("{b}"),
        Value::Number(n) => format!("the number {n}"),
        Value::String(s) => format!("the text {:?}", s.chars().take(60).collect::<String>()),
        Value::Array(_) => "a list".into(),
        Value::Object(_) => "an object".into(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn names_the_first_wrong_field_in_table_order() {
        let fields: [(&str, bool, FieldCheck); 3] =
            [("a", true, check::<u64>), ("b", false, check::<String>), ("c", true, check::<f64>)];
        let obj = |v: Value| v.as_object().expect("object").clone();
        assert_eq!(first_wrong_field(&obj(json!({"a": 1, "c": 2.5})), &fields), Ok(()));
        assert_eq!(
            first_wrong_field(&obj(json!({"a": 1})), &fields),
            Err("c: required field is missing".into())
        );
        let e = first_wrong_field(&obj(json!({"a": 1, "b": 3, "c": "x"})), &fields).expect_err("b is wrong");
        assert!(e.starts_with("b: invalid type: integer `3`, expected a string"), "{e}");
    }

    #[test]
    fn describes_values_briefly() {
        assert_eq!(describe(&json!(null)), "null");
        assert_eq!(describe(&json!(3)), "the number 3");
        assert_eq!(describe(&json!("é".repeat(70))), format!("the text {:?}", "é".repeat(60)));
        assert_eq!(describe(&json!([1])), "a list");
        assert_eq!(describe(&json!({})), "an object");
    }
}
