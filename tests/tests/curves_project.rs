//! Measured curves in the project file: what is stored matches lasio's reading of the source LAS,
//! a project with curves saves and reopens unchanged, files without curves are untouched, and a
//! bad curve block is refused with its file, line and JSON path.

use aggrade_core::analysis::las::{read_las, IndexDirection, IndexToSection};
use aggrade_core::io;
use aggrade_core::model::Project;
use std::path::{Path, PathBuf};
use std::process::Command;

fn data(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data").join(rel)
}

/// lasio's (PyPI) reading of every curve: mnemonic → [(depth m, value or None)].
fn lasio_curves(path: &Path) -> serde_json::Value {
    let code = r#"
import json, math, sys
try:
    import lasio
except ImportError as e:
    sys.exit("lasio is not installed: " + str(e))
las = lasio.read(sys.argv[1])
factor = {"M": 1.0, "FT": 0.3048, "F": 0.3048}[las.curves[0].unit.upper()]
print(json.dumps({c.mnemonic: [[float(d) * factor, None if math.isnan(v) else float(v)]
                               for d, v in zip(las.index, c.data)] for c in las.curves[1:]}))
"#;
    let out =
        Command::new("python3").arg("-c").arg(code).arg(path).output().unwrap_or_else(|e| {
            panic!("python3 is required for this reference check (pip install lasio): {e}")
        });
    assert!(out.status.success(), "lasio check failed:\n{}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("JSON")
}

fn kestrel_with(curves: &[(&str, &str, IndexToSection)]) -> Project {
    let mut project = io::load(&data("analysis/kestrel_bluff.aggrade")).expect("fixture").project;
    for (file, mnemonic, placement) in curves {
        let path = data(&format!("las/{file}"));
        let las = read_las(&path).expect("fixture reads");
        let c = las.measured_curve(mnemonic, placement, &path.display().to_string()).expect("curve");
        project.sections[0].attach_curve(c);
    }
    project
}

#[test]
fn stored_samples_match_lasio_and_survive_save_and_reopen() {
    let down10 = IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 10.0 };
    let up = IndexToSection { direction: IndexDirection::HeightAboveDatum, zero_m: -5.0 };
    let project = kestrel_with(&[
        ("kestrel_unwrapped_m.las", "GR", down10),
        ("kestrel_unwrapped_m.las", "K", down10),
        ("tern_feet.las", "GR", up),
    ]);
    // Same mnemonic from another file replaces the first GR (mnemonics are unique per section).
    let section = &project.sections[0];
    assert_eq!(section.curves.iter().map(|c| c.mnemonic.as_str()).collect::<Vec<_>>(), ["GR", "K"]);

    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("kestrel.aggrade");
    io::save_project(&path, &project).expect("saves");
    let first = std::fs::read(&path).expect("read");
    let back = io::load(&path).expect("reopens");
    assert!(back.warnings.is_empty(), "{:?}", back.warnings);
    assert_eq!(back.project, project, "reopens unchanged");
    io::save_project(&path, &back.project).expect("saves again");
    assert_eq!(std::fs::read(&path).expect("read"), first, "saving again writes the same bytes");

    // The stored GR came from tern_feet.las (feet, converted with 1 ft = 0.3048 m exactly) placed
    // upward with offset −5 m: height = depth − (−5). K came from the Kestrel file, downward.
    let tern = lasio_curves(&data("las/tern_feet.las"));
    let kestrel = lasio_curves(&data("las/kestrel_unwrapped_m.las"));
    for (curve, theirs, height_of) in [
        (&back.project.sections[0].curves[0], &tern["GR"], (|d: f64| d + 5.0) as fn(f64) -> f64),
        (&back.project.sections[0].curves[1], &kestrel["K"], |d: f64| 10.0 - d),
    ] {
        let mut expected: Vec<(f64, Option<f64>)> = theirs
            .as_array()
            .expect("samples")
            .iter()
            .map(|s| (height_of(s[0].as_f64().expect("depth")), s[1].as_f64()))
            .collect();
        expected.sort_by(|a, b| a.0.total_cmp(&b.0));
        assert_eq!(curve.samples.len(), expected.len(), "{}", curve.mnemonic);
        for ((h, v), (eh, ev)) in curve.samples.iter().zip(&expected) {
            assert!((h - eh).abs() < 1e-9, "{}: height {h} vs {eh}", curve.mnemonic);
            match (v, ev) {
                (None, None) => {}
                (Some(a), Some(b)) => assert!((a - b).abs() < 1e-9, "{}: {a} vs lasio {b}", curve.mnemonic),
                _ => panic!("{}: NULL at {h} m differs from lasio ({v:?} vs {ev:?})", curve.mnemonic),
            }
        }
    }
    assert_eq!(back.project.sections[0].curves[0].source_file, "tern_feet.las");
}

#[test]
fn files_without_curves_do_not_gain_a_curves_field() {
    let project = io::load(&data("analysis/kestrel_bluff.aggrade")).expect("fixture").project;
    let text = io::project_to_json(&project).expect("encode");
    assert!(!text.contains("\"curves\""), "absent curves are not written");
    // A version 0 file (before curves existed) still opens.
    let v0 = io::load(&data("io/v0_project.aggrade")).expect("v0 opens").project;
    assert!(v0.sections.iter().all(|s| s.curves.is_empty()));
}

fn problems_of(text: &str) -> String {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("bad_curve.aggrade");
    std::fs::write(&path, text).expect("write");
    io::load(&path).expect_err("refused").to_string()
}

const PROJECT: &str = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Kestrel Bluff",
      "beds": [
        {"id": 1, "thickness_m": 10.0, "lithology": "mudstone", "grain_base": "clay", "grain_top": "clay"}
      ],
      "curves": [
        {
          "mnemonic": "GR",
          "unit": "API",
          "offset_m": 10.0,
          "direction": "depth_below_datum",
          "samples": [
            [0.0, 60.0],
            [0.5, null],
            [1.0, 71.5]
          ]
        }
      ]
    }
  ]
}
"#;

#[test]
fn bad_curve_blocks_name_file_line_and_json_path() {
    let dir = tempfile::tempdir().expect("temp dir");
    let good = dir.path().join("good.aggrade");
    std::fs::write(&good, PROJECT).expect("write");
    let loaded = io::load(&good).expect("the well-formed block reads");
    assert_eq!(loaded.project.sections[0].curves[0].samples[1], (0.5, None));

    // Heights out of order (line 18 holds the offending sample).
    let e = problems_of(&PROJECT.replace("[1.0, 71.5]", "[0.25, 71.5]"));
    assert!(e.contains("bad_curve.aggrade"), "{e}");
    assert!(e.contains("line 18: sections[0].curves[0].samples[2]: height 0.25 m is below"), "{e}");
    // A field of the wrong type is named inside the curve.
    let e = problems_of(&PROJECT.replace("\"offset_m\": 10.0", "\"offset_m\": \"ten\""));
    assert!(e.contains("sections[0].curves[0]: offset_m: invalid type"), "{e}");
    assert!(e.contains("line 10:"), "the curve's first line: {e}");
    // A sample that is not a [height, value] pair.
    let e = problems_of(&PROJECT.replace("[0.5, null]", "[0.5, \"high\"]"));
    assert!(e.contains("sections[0].curves[0]: samples[1]: expected [height_m, value]"), "{e}");
    // An unknown direction lists the valid ones.
    let e = problems_of(&PROJECT.replace("depth_below_datum", "downward"));
    assert!(e.contains("direction: unknown variant `downward`") && e.contains("depth_below_datum"), "{e}");
    // Two curves with one mnemonic.
    let twice = PROJECT.replace(
        "      ]\n    }\n  ]\n}",
        "      ,{\"mnemonic\": \"gr\", \"offset_m\": 0, \"direction\": \"height_above_datum\", \"samples\": []}]\n    }\n  ]\n}",
    );
    let e = problems_of(&twice);
    assert!(e.contains("sections[0].curves[1].mnemonic"), "{e}");
}

#[test]
fn unknown_fields_in_a_curve_are_warnings_naming_file_line_and_path() {
    let text = PROJECT.replace("\"unit\": \"API\",", "\"unit\": \"API\",\n          \"colour\": \"green\",");
    assert_eq!(text.lines().nth(12).map(str::trim), Some("\"colour\": \"green\","), "line 13");
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("curve_extra.aggrade");
    std::fs::write(&path, &text).expect("write");
    let loaded = io::load(&path).expect("an unknown field is a warning, not an error");
    assert_eq!(loaded.project.sections[0].curves[0].samples.len(), 3, "the curve is still read");
    assert_eq!(loaded.warnings.len(), 1, "{:?}", loaded.warnings);
    let w = &loaded.warnings[0].to_string();
    assert!(
        w.starts_with(&format!(
            "{}: line 13: sections[0].curves[0].colour: unknown field, ignored",
            path.display()
        )),
        "{w}"
    );
    assert!(
        w.contains("known fields: mnemonic, unit, description, source_file, offset_m, direction, samples"),
        "{w}"
    );
    // The field-by-field reading of a JSON tree (the path older files take) warns the same way.
    let root: serde_json::Value = serde_json::from_str(&text).expect("JSON");
    let io::internals::FieldRead { project, problems, warnings } = io::internals::read_project(&root);
    assert!(problems.is_empty() && project.is_some(), "{problems:?}");
    let at: Vec<&str> = warnings.iter().map(|w| w.location.as_str()).collect();
    assert_eq!(at, ["sections[0].curves[0].colour"]);
    // Known fields alone give no warning.
    let loaded = io::load(&{
        let p = dir.path().join("plain.aggrade");
        std::fs::write(&p, PROJECT).expect("write");
        p
    })
    .expect("reads");
    assert!(loaded.warnings.is_empty(), "{:?}", loaded.warnings);
}

#[test]
fn the_demo_curve_is_its_las_file_placed_from_the_section_top() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    let demo = io::load(&root.join("demo.aggrade")).expect("demo loads").project;
    let corrie = demo.section("Corrie Wash").expect("Corrie Wash");
    let las_path = root.join("corrie_wash_gr.las");
    let las = read_las(&las_path).expect("demo LAS reads");
    assert!(las.warnings.is_empty(), "{:?}", las.warnings);
    // Depth 0 at the section top: offset = the section's thickness, index running down.
    let placement =
        IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: corrie.total_thickness_m() };
    let expected = las.measured_curve("GR", &placement, "corrie_wash_gr.las").expect("GR");
    assert_eq!(corrie.curves, vec![expected]);
    // The demo file is exactly what Aggrade writes for it.
    let text = std::fs::read_to_string(root.join("demo.aggrade")).expect("read");
    assert_eq!(io::project_to_json(&demo).expect("encode"), text);
}
