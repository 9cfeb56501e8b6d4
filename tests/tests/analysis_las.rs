//! LAS 2.0 reader checked against lasio (the PyPI LAS reader) on every fixture in
//! tests/data/las/, and its error messages on malformed files.

use crate::support::lasio_compare;

use aggrade_core::analysis::las::{parse_las, read_las, IndexDirection, IndexToSection, LasFile};
use proptest::prelude::*;
use std::path::PathBuf;
use std::process::Command;

fn fixture(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/las").join(name)
}

/// Run a Python snippet with the given arguments and parse its JSON output. Fails the test with
/// a clear message when python3 or a library is missing: the oracle is required, never skipped.
fn python_json(script: &str, args: &[&str]) -> serde_json::Value {
    let out = Command::new("python3").arg("-c").arg(script).args(args).output().unwrap_or_else(|e| {
        panic!("python3 is required for this reference check (pip install -r scripts/requirements-test.txt): {e}")
    });
    assert!(
        out.status.success(),
        "the Python reference check failed (is lasio installed? pip install lasio):\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap_or_else(|e| panic!("oracle output is not JSON ({e})"))
}

/// lasio's view of a file: index (converted to metres by the index unit), curve names, units and
/// values with NaN as null.
const LASIO_DUMP: &str = r#"
import json, math, sys
try:
    import lasio
except ImportError as e:
    sys.exit("lasio is not installed: " + str(e))
las = lasio.read(sys.argv[1])
unit = las.curves[0].unit.upper()
factor = {"M": 1.0, "FT": 0.3048, "F": 0.3048}[unit]
def clean(v):
    return None if math.isnan(v) else float(v)
print(json.dumps({
    "well": [[i.mnemonic, i.unit, str(i.value), i.descr] for i in las.well],
    "index_m": [float(v) * factor for v in las.index],
    "curves": [{"mnemonic": c.mnemonic, "unit": c.unit, "data": [clean(v) for v in c.data]}
               for c in las.curves[1:]],
}))
"#;

fn compare_with_lasio(name: &str) -> LasFile {
    let path = fixture(name);
    let ours = read_las(&path).unwrap_or_else(|e| panic!("{name}: {e}"));
    assert!(ours.warnings.is_empty(), "{name}: {:?}", ours.warnings);
    let path_text = path.to_string_lossy().to_string();
    let theirs = python_json(LASIO_DUMP, &[&path_text]);
    lasio_compare::compare(name, &ours, &theirs);
    ours
}

#[test]
fn unwrapped_metres_match_lasio() {
    let f = compare_with_lasio("kestrel_unwrapped_m.las");
    // The fixture has NULLs in GR at samples 4 and 5 and in K at sample 11.
    assert_eq!(f.values[0].iter().filter(|v| v.is_none()).count(), 2);
    assert_eq!(f.values[1].iter().filter(|v| v.is_none()).count(), 1);
    assert!(!f.wrapped);
    assert!(f.other.contains("hand-held spectrometer"));
}

#[test]
fn wrapped_metres_match_lasio() {
    let f = compare_with_lasio("harrow_wrapped_m.las");
    assert!(f.wrapped);
    assert_eq!(f.curve_items.len(), 5);
    assert_eq!(f.values[2][3], None, "TH NULL at 2.75 m");
}

#[test]
fn feet_are_converted_to_metres_like_lasio() {
    let f = compare_with_lasio("tern_feet.las");
    assert_eq!(f.index_unit, "FT");
    // 100 ft = 30.48 m exactly (1 ft = 0.3048 m, international yard and pound agreement, 1959).
    assert!((f.index_m[0] - 30.48).abs() < 1e-12);
}

#[test]
fn curves_are_placed_on_section_heights() {
    let f = read_las(&fixture("kestrel_unwrapped_m.las")).expect("valid fixture");
    // The log runs 0–10 m below the section top; a 10 m section has its base at depth 10 m.
    let curves = f.curves(&IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 10.0 });
    assert_eq!(curves[0].mnemonic, "GR");
    assert_eq!(curves[0].samples.first().map(|s| s.0), Some(10.0));
    assert_eq!(curves[0].samples.last().map(|s| s.0), Some(0.0));
    let up = f.curves(&IndexToSection { direction: IndexDirection::HeightAboveDatum, zero_m: 1.0 });
    assert_eq!(up[1].samples[0].0, -1.0);
}

fn error_of(name: &str) -> String {
    match read_las(&fixture(name)) {
        Ok(_) => panic!("{name} should be rejected"),
        Err(e) => e.to_string(),
    }
}

#[test]
fn malformed_files_get_line_numbers_and_expectations() {
    let e = error_of("bad_column_count.las");
    assert!(
        e.contains("bad_column_count.las, line 27: expected 3 values (one per ~C curve), found 2"),
        "{e}"
    );
    // lasio rejects the same file too (it cannot reshape the data into 3 columns).
    let lasio_rejects = Command::new("python3")
        .arg("-c")
        .arg("import sys, lasio\ntry:\n    lasio.read(sys.argv[1])\nexcept Exception:\n    sys.exit(3)\n")
        .arg(fixture("bad_column_count.las"))
        .status()
        .expect("python3 is required for this reference check");
    assert_eq!(lasio_rejects.code(), Some(3), "lasio accepted a file with a short data row");

    let e = error_of("bad_number.las");
    assert!(e.contains("line 29") && e.contains("\"3,000\" is not a number"), "{e}");
    let e = error_of("bad_unknown_wrap.las");
    assert!(e.contains("line 3") && e.contains("WRAP is \"SOMETIMES\"; expected YES or NO"), "{e}");
    let e = error_of("bad_missing_a.las");
    assert!(e.contains("no ~A (data) section"), "{e}");
    let e = error_of("bad_missing_v.las");
    assert!(e.contains("line 1") && e.contains("~V"), "{e}");
    let e = error_of("does_not_exist.las");
    assert!(e.contains("does_not_exist.las: cannot read"), "{e}");
}

/// Write a LAS 2.0 text from values (our own writer, for the round-trip property).
fn las_text(depths: &[f64], curves: &[Vec<Option<f64>>], wrap: bool) -> String {
    let mut t = String::from("~V\n VERS. 2.0 : version\n");
    t += if wrap { " WRAP. YES : wrapped\n" } else { " WRAP. NO : one line per step\n" };
    t += "~W\n NULL. -999.25 : null\n~C\n DEPT.M : depth\n";
    for k in 0..curves.len() {
        t += &format!(" C{k}.API : curve {k}\n");
    }
    t += "~A\n";
    for (i, d) in depths.iter().enumerate() {
        let vals: Vec<String> =
            curves.iter().map(|c| c[i].map_or("-999.25".to_string(), |v| format!("{v}"))).collect();
        if wrap {
            t += &format!("{d}\n");
            for chunk in vals.chunks(2) {
                t += &format!(" {}\n", chunk.join(" "));
            }
        } else {
            t += &format!("{d} {}\n", vals.join(" "));
        }
    }
    t
}

proptest! {
    /// Any text at all gives a value or an error, never a panic (common practice for readers).
    #[test]
    fn arbitrary_text_never_panics(text in "(~[VWCAPO]?[ -~]{0,30}\n){0,12}") {
        let _ = parse_las(&text, "fuzz.las");
    }

    /// Files we write with random values read back to the same values, wrapped or not.
    #[test]
    fn written_files_read_back(
        rows in prop::collection::vec(prop::collection::vec(prop::option::of(-1.0e4f64..1.0e4), 3), 1..20),
        wrap in any::<bool>(),
    ) {
        let depths: Vec<f64> = (0..rows.len()).map(|i| 10.0 + 0.25 * i as f64).collect();
        let curves: Vec<Vec<Option<f64>>> = (0..3).map(|k| rows.iter().map(|r| r[k]).collect()).collect();
        let f = parse_las(&las_text(&depths, &curves, wrap), "roundtrip.las").map_err(|e| TestCaseError::fail(e.to_string()))?;
        prop_assert_eq!(&f.index_m, &depths);
        prop_assert_eq!(&f.values, &curves);
    }
}
