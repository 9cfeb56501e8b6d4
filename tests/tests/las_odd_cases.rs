//! LAS files as tools write them, one small file per odd case, written by the test and read by
//! Aggrade and by lasio (the PyPI LAS reader, default options) as the reference: every value
//! Aggrade stores must equal lasio's, each odd case read must carry a warning naming its line,
//! and each case Aggrade refuses must say why with the line. The refusals are the ones the
//! README lists; for each, the test also records whether lasio reads the file.
//! The LAS 1.2 and 2.0 specification examples (CWLS; reproduced from memory, shortened to three
//! depth steps) are compared the same way.

use crate::support::lasio_compare;

use aggrade_core::analysis::las::read_las;
use lasio_compare::compare;
use std::path::{Path, PathBuf};
use std::process::Command;

/// lasio's view of each file: ~W items, index in metres, curves with values (NaN → null; text
/// that lasio keeps as text → {"text": …}; infinities → {"text": "inf"}), or its error.
const LASIO_DUMP: &str = r#"
import json, math, sys
try:
    import lasio
except ImportError as e:
    sys.exit("lasio is not installed: " + str(e))
def clean(v):
    if isinstance(v, str):
        try:
            f = float(v)
        except ValueError:
            return {"text": v}
        v = f
    v = float(v)
    if math.isnan(v):
        return None
    if math.isinf(v):
        return {"text": "inf"}
    return v
out = {}
for path in sys.argv[1:]:
    try:
        las = lasio.read(path)
        unit = las.curves[0].unit.upper()
        factor = {"M": 1.0, "FT": 0.3048, "F": 0.3048, "CM": 0.01, ".1IN": 0.00254}.get(unit)
        out[path] = {
            "well": [[i.mnemonic, i.unit, str(i.value), i.descr] for i in las.well],
            "index_m": None if factor is None else [clean(float(v) * factor) for v in las.index],
            "curves": [{"mnemonic": c.mnemonic, "unit": c.unit, "data": [clean(v) for v in c.data]}
                       for c in las.curves[1:]],
        }
    except Exception as e:
        out[path] = {"error": type(e).__name__ + ": " + str(e)[:300]}
print(json.dumps(out))
"#;

fn lasio(paths: &[PathBuf]) -> serde_json::Value {
    let out = Command::new("python3")
        .arg("-c")
        .arg(LASIO_DUMP)
        .args(paths)
        .output()
        .unwrap_or_else(|e| panic!("python3 is required for this reference check: {e}"));
    assert!(
        out.status.success(),
        "the lasio reference check failed (pip install -r scripts/requirements-test.txt):\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap_or_else(|e| panic!("oracle output is not JSON ({e})"))
}

const BASE: &str = "~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   NO  : ONE LINE PER DEPTH STEP
~WELL INFORMATION
 STRT.M   0.0 : START DEPTH
 STOP.M   1.0 : STOP DEPTH
 STEP.M   0.5 : STEP
 NULL.    -999.25 : NULL VALUE
 WELL.    Harrier Creek outcrop : WELL
~CURVE INFORMATION
 DEPT.M        : DEPTH
 GR  .API      : GAMMA RAY
 K   .%        : POTASSIUM
~A
 0.0  45.5  1.20
 0.5  -999.25  1.35
 1.0  80.25  1.10
";

/// What Aggrade must do with a case.
enum Expect {
    /// Read, with a warning containing this text (or none when empty).
    Read(&'static str),
    /// Refused with a message containing this text; `lasio_reads` records lasio's own outcome.
    Refused { message: &'static str, lasio_reads: bool },
}

fn cases() -> Vec<(&'static str, Vec<u8>, Expect)> {
    let b = |s: String| s.into_bytes();
    let replace = |from: &str, to: &str| {
        assert!(BASE.contains(from), "{from:?} not in the base file");
        BASE.replace(from, to)
    };
    let wrapped_data = "~A\n 0.0\n 45.5  1.20\n 0.5\n -999.25\n 1.35\n 1.0\n 80.25 1.10\n";
    let utf16: Vec<u8> = BASE.encode_utf16().flat_map(|u| u.to_le_bytes()).collect();
    vec![
        ("plain", b(BASE.to_string()), Expect::Read("")),
        (
            "las12_value_after_colon",
            b(replace(
                " VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0",
                " VERS.   1.2 : CWLS LOG ASCII STANDARD - VERSION 1.2",
            )
            .replace(" WELL.    Harrier Creek outcrop : WELL", " WELL.    WELL : Harrier Creek outcrop")),
            Expect::Read(""),
        ),
        ("bom", b(format!("\u{feff}{BASE}")), Expect::Read("line 1: a UTF-8 byte-order mark")),
        ("cr_only", b(BASE.replace('\n', "\r")), Expect::Read("")),
        ("cr_lf", b(BASE.replace('\n', "\r\n")), Expect::Read("")),
        ("tabs", b(replace(" 0.5  -999.25  1.35", "0.5\t-999.25\t1.35")), Expect::Read("line 16: tabs")),
        (
            "no_vers",
            b(replace(" VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0\n", "")),
            Expect::Read("line 1: ~V has no VERS line"),
        ),
        (
            "no_wrap",
            b(replace(" WRAP.   NO  : ONE LINE PER DEPTH STEP\n", "")),
            Expect::Read("~V has no WRAP line; the data look unwrapped"),
        ),
        (
            "no_wrap_wrapped_data",
            b(replace(" WRAP.   NO  : ONE LINE PER DEPTH STEP\n", "")
                .split("~A")
                .next()
                .unwrap_or("")
                .to_string()
                + wrapped_data),
            Expect::Read("the data look wrapped"),
        ),
        (
            "wrapped",
            b(BASE.replace(" WRAP.   NO ", " WRAP.   YES").split("~A").next().unwrap_or("").to_string()
                + wrapped_data),
            Expect::Read(""),
        ),
        ("no_null", b(replace(" NULL.    -999.25 : NULL VALUE\n", "")), Expect::Read("no NULL value in ~W")),
        (
            "ind_markers",
            b(replace(" 0.5  -999.25  1.35", " 0.5  -1.#IND  1.35")
                .replace(" 1.0  80.25  1.10", " 1.0  80.25  1.#INF")),
            Expect::Read("line 16: \"-1.#IND\" read as a missing value (NULL); 1 more"),
        ),
        (
            "text_markers",
            b(replace(" 0.5  -999.25  1.35", " 0.5  NaN  (null)")
                .replace(" 1.0  80.25  1.10", " 1.0  -  1.10")),
            Expect::Read("line 16: \"NaN\" read as a missing value (NULL); 2 more"),
        ),
        (
            "comma_decimals",
            b(replace(" 0.5  -999.25  1.35", " 0.5  45,75  1,35")),
            Expect::Read("line 16: \"45,75\" read with a decimal comma; 1 more"),
        ),
        (
            "duplicate_mnemonics",
            b(replace(" K   .%        : POTASSIUM", " GR  .API      : GAMMA RAY 2")),
            Expect::Read("line 12: the mnemonic GR appears more than once"),
        ),
        (
            "fewer_data_columns",
            b(replace(
                " K   .%        : POTASSIUM\n",
                " K   .%        : POTASSIUM\n TH  .PPM      : THORIUM\n",
            )),
            Expect::Read("~C lists 4 curves but each data line holds 3 values"),
        ),
        (
            "curve_line_without_colon",
            b(replace(" K   .%        : POTASSIUM", " K   .%")),
            Expect::Read("line 13: no colon"),
        ),
        (
            "feet_index",
            b(BASE
                .replace("DEPT.M", "DEPT.FT")
                .replace("STRT.M", "STRT.FT")
                .replace("STOP.M", "STOP.FT")
                .replace("STEP.M", "STEP.FT")),
            Expect::Read(""),
        ),
        ("ctrl_z_at_end", b(format!("{BASE}\u{1a}")), Expect::Read("")),
        (
            "more_data_columns",
            b(replace(
                " 0.0  45.5  1.20\n 0.5  -999.25  1.35\n 1.0  80.25  1.10",
                " 0.0  45.5  1.20 7\n 0.5  -999.25  1.35 8\n 1.0  80.25  1.10 9",
            )),
            Expect::Refused {
                message: "line 15: the data lines hold 4 values but ~C lists 3 curves",
                lasio_reads: true,
            },
        ),
        (
            "ragged_rows",
            b(replace(" 0.5  -999.25  1.35", " 0.5  -999.25")),
            Expect::Refused {
                message: "line 16: expected 3 values (one per ~C curve), found 2",
                lasio_reads: false,
            },
        ),
        (
            "time_index",
            b(replace(" DEPT.M        : DEPTH", " TIME.S        : ELAPSED TIME")),
            Expect::Refused { message: "line 11: the index is TIME (S), a time", lasio_reads: true },
        ),
        (
            "run_on_numbers",
            b(replace(" 0.5  -999.25  1.35", " 0.5  45.5-999.25")),
            Expect::Refused {
                message: "line 16: data value: \"45.5-999.25\" is not a number (two numbers run together?",
                lasio_reads: true,
            },
        ),
        (
            "thousands_or_decimal_comma",
            b(replace(" 1.0  80.25  1.10", " 1.0  1,500  1.10")),
            Expect::Refused {
                message: "line 17: data value: \"1,500\" is not a number: a comma followed by three digits",
                lasio_reads: true,
            },
        ),
        (
            "unknown_text_value",
            b(replace(" 1.0  80.25  1.10", " 1.0  high  1.10")),
            Expect::Refused { message: "line 17: data value: \"high\" is not a number", lasio_reads: true },
        ),
        (
            "null_index",
            b(replace(" 0.5  -999.25  1.35", " -999.25  50.0  1.35")),
            Expect::Refused {
                message: "line 16: the index (depth) value is missing (NULL)",
                lasio_reads: true,
            },
        ),
        (
            "las30",
            b(replace(" VERS.   2.0 ", " VERS.   3.0 ")),
            Expect::Refused {
                message: "line 2: VERS is \"3.0\": LAS 3.0 files are not read",
                lasio_reads: true,
            },
        ),
        ("utf16", utf16, Expect::Refused { message: "a NUL byte", lasio_reads: false }),
    ]
}

fn write_all(dir: &Path) -> Vec<(String, PathBuf, Expect)> {
    cases()
        .into_iter()
        .map(|(name, bytes, expect)| {
            let path = dir.join(format!("{name}.las"));
            std::fs::write(&path, bytes).expect("write case");
            (name.to_string(), path, expect)
        })
        .collect()
}

#[test]
fn every_odd_case_is_read_like_lasio_or_refused_with_its_line() {
    let dir = tempfile::tempdir().expect("temp dir");
    let files = write_all(dir.path());
    let paths: Vec<PathBuf> = files.iter().map(|(_, p, _)| p.clone()).collect();
    let theirs = lasio(&paths);
    for (name, path, expect) in &files {
        let key = path.to_string_lossy().to_string();
        let lasio_view = &theirs[&key];
        match (read_las(path), expect) {
            (Ok(ours), Expect::Read(warning)) => {
                compare(name, &ours, lasio_view);
                if warning.is_empty() {
                    assert!(ours.warnings.is_empty(), "{name}: unexpected warnings {:?}", ours.warnings);
                } else {
                    assert!(
                        ours.warnings.iter().any(|w| w.contains(warning) && w.starts_with(&key)),
                        "{name}: no warning with {warning:?} naming the file: {:?}",
                        ours.warnings
                    );
                }
            }
            (Err(e), Expect::Refused { message, lasio_reads }) => {
                let e = e.to_string();
                assert!(e.starts_with(&key) && e.contains(message), "{name}: {e}");
                assert_eq!(
                    lasio_view.get("error").is_none(),
                    *lasio_reads,
                    "{name}: lasio's outcome differs from the README's account: {lasio_view}"
                );
            }
            (Ok(ours), Expect::Refused { message, .. }) => {
                panic!("{name}: read ({} samples) but should be refused with {message:?}", ours.index_m.len())
            }
            (Err(e), Expect::Read(_)) => panic!("{name}: refused: {e}"),
        }
    }
}

#[test]
fn specification_examples_match_lasio() {
    let fixtures = ["spec_las12_example.las", "spec_las20_example.las", "spec_las20_wrapped.las"];
    let paths: Vec<PathBuf> =
        fixtures.iter().map(|n| PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/las").join(n)).collect();
    let theirs = lasio(&paths);
    for (name, path) in fixtures.iter().zip(&paths) {
        let ours = read_las(path).unwrap_or_else(|e| panic!("{name}: {e}"));
        assert!(ours.warnings.is_empty(), "{name}: {:?}", ours.warnings);
        compare(name, &ours, &theirs[path.to_string_lossy().as_ref()]);
    }
    // LAS 1.2 writes most ~W items value last: `COMP. COMPANY: # ANY OIL COMPANY LTD.`.
    let las12 = read_las(&paths[0]).expect("reads");
    let comp = las12.well_item("COMP").expect("COMP");
    assert_eq!((comp.value.as_str(), comp.description.as_str()), ("# ANY OIL COMPANY LTD.", "COMPANY"));
    // The wrapped example holds 11 curves over three depths, the first a NULL.
    let wrapped = read_las(&paths[2]).expect("reads");
    assert_eq!((wrapped.values.len(), wrapped.index_m.len()), (10, 3));
    assert_eq!(wrapped.values[0][0], None);
}
