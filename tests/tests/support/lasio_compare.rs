//! Every value Aggrade's LAS reader stores compared with lasio's view of the same file (as the
//! tests' Python dumps give it: ~W items, index in metres, curves with numbers, nulls, or text
//! lasio kept as text).

use aggrade_core::analysis::las::LasFile;

/// Text lasio keeps where Aggrade reads a missing value.
pub fn is_marker(text: &str) -> bool {
    let t = text.to_ascii_lowercase();
    let t = t.trim_start_matches(['-', '+']);
    ["nan", "null", "(null)", "#n/a", "n/a", "na", "inf", "infinity", "", "-", "--"].contains(&t)
        || ["1.#ind", "1.#inf", "1.#qnan", "1.#snan", "1.#io"].iter().any(|m| t.starts_with(m))
}

/// Every value Aggrade stores against lasio's.
pub fn compare(name: &str, ours: &LasFile, theirs: &serde_json::Value) {
    assert!(theirs.get("error").is_none(), "{name}: lasio refused a file Aggrade reads: {}", theirs["error"]);
    let index = theirs["index_m"].as_array().expect("index list");
    assert_eq!(ours.index_m.len(), index.len(), "{name}: sample count");
    for (a, b) in ours.index_m.iter().zip(index) {
        let b = b.as_f64().expect("number");
        assert!((a - b).abs() <= 1e-9 * b.abs().max(1.0), "{name}: index {a} vs lasio {b}");
    }
    let well = theirs["well"].as_array().expect("well list");
    assert_eq!(ours.well.len(), well.len(), "{name}: ~W item count");
    for (a, b) in ours.well.iter().zip(well) {
        let field = |k: usize| b[k].as_str().expect("text").to_string();
        assert_eq!(a.mnemonic, field(0), "{name}: ~W mnemonic");
        assert_eq!(a.unit, field(1), "{name}: unit of {}", a.mnemonic);
        match (a.value.parse::<f64>(), field(2).parse::<f64>()) {
            (Ok(x), Ok(y)) => assert!((x - y).abs() < 1e-12, "{name}: {} = {x} vs lasio {y}", a.mnemonic),
            _ => assert_eq!(a.value, field(2), "{name}: value of {}", a.mnemonic),
        }
        assert_eq!(a.description, field(3), "{name}: description of {}", a.mnemonic);
    }
    let curves = theirs["curves"].as_array().expect("curve list");
    assert_eq!(ours.values.len(), curves.len(), "{name}: curve count");
    for (k, c) in curves.iter().enumerate() {
        let item = &ours.curve_items[k + 1];
        assert_eq!(item.mnemonic, c["mnemonic"].as_str().expect("name"), "{name}: mnemonic");
        assert_eq!(item.unit, c["unit"].as_str().expect("unit"), "{name}: unit of {}", item.mnemonic);
        let data = c["data"].as_array().expect("data");
        assert_eq!(ours.values[k].len(), data.len(), "{name}: {} length", item.mnemonic);
        for (i, (a, b)) in ours.values[k].iter().zip(data).enumerate() {
            match (a, b) {
                (None, serde_json::Value::Null) => {}
                (None, serde_json::Value::Object(o)) => {
                    let text = o["text"].as_str().unwrap_or("");
                    assert!(
                        is_marker(text),
                        "{name} {} #{i}: Aggrade has NULL, lasio has text {text:?}",
                        item.mnemonic
                    );
                }
                (Some(x), b) => {
                    let y = b
                        .as_f64()
                        .unwrap_or_else(|| panic!("{name} {} #{i}: {x} vs lasio {b}", item.mnemonic));
                    assert!(
                        (x - y).abs() <= 1e-9 * y.abs().max(1.0),
                        "{name} {} #{i}: {x} vs {y}",
                        item.mnemonic
                    );
                }
                (None, b) => panic!("{name} {} #{i}: Aggrade has NULL, lasio {b}", item.mnemonic),
            }
        }
    }
}
