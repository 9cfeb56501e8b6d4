//! `aggrade link` end to end on the built binary: label accepted boundaries in two sections, see
//! the panel tie them and hang on the label, take a label off, and refuse boundaries that are
//! not accepted (with file, section, bed and height named) without touching the file.

use super::harness::text;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn run(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .args(args)
        .env("RUST_BACKTRACE", "1")
        .env_remove("SOURCE_DATE_EPOCH")
        .output()
        .expect("the aggrade binary runs")
}

/// Two invented sections, each with an accepted boundary at the base of bed 2 (3 m in Ash Draw,
/// 1.5 m in Birch Cut); bed 3 of Ash Draw is unreviewed (with a note; written in the old word
/// "candidate", which is still read), bed 1 has no decision.
const PROJECT: &str = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Ash Draw",
      "beds": [
        {"id": 1, "thickness_m": 3.0, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"},
        {"id": 2, "thickness_m": 2.0, "lithology": "sandstone", "grain_base": "medium sand", "grain_top": "fine sand"},
        {"id": 3, "thickness_m": 4.0, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"}
      ],
      "review": [
        {"bed": 2, "state": "accepted"},
        {"bed": 3, "state": "candidate", "note": "thin scour"}
      ],
      "panel_position_m": 0.0
    },
    {
      "name": "Birch Cut",
      "beds": [
        {"id": 1, "thickness_m": 1.5, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"},
        {"id": 2, "thickness_m": 3.0, "lithology": "sandstone", "grain_base": "coarse sand", "grain_top": "fine sand"},
        {"id": 3, "thickness_m": 1.0, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"}
      ],
      "review": [
        {"bed": 2, "state": "accepted"}
      ],
      "panel_position_m": 400.0
    }
  ]
}
"#;

fn project_in(dir: &Path) -> PathBuf {
    let path = dir.join("two.aggrade");
    std::fs::write(&path, PROJECT).expect("write");
    path
}

/// The `link` field of a section's decision on a bed, as stored in the file.
fn stored_link(path: &Path, section: usize, bed: u64) -> Option<String> {
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(path).expect("read")).expect("JSON");
    v["sections"][section]["review"]
        .as_array()
        .and_then(|r| r.iter().find(|d| d["bed"].as_u64() == Some(bed)))
        .and_then(|d| d["link"].as_str().map(str::to_string))
}

#[test]
fn link_two_sections_then_remove_one_label() {
    let dir = tempfile::tempdir().expect("temp dir");
    let src = project_in(dir.path());
    let out = dir.path().join("linked.aggrade");
    let (s, o) = (src.to_str().expect("utf-8"), out.to_str().expect("utf-8"));

    let r = run(&["link", s, "--section", "Ash Draw", "--bed", "2", "--label", "SB-2", "--out", o]);
    let err = text(&r.stderr);
    assert!(r.status.success(), "{err}");
    assert!(
        err.contains("set the correlation label of the boundary at the base of bed 2 (3.00 m) in \"Ash Draw\" to \"SB-2\""),
        "{err}"
    );
    assert!(err.contains("no other accepted boundary carries the correlation label \"SB-2\" yet"), "{err}");
    assert_eq!(std::fs::read_to_string(&src).expect("read"), PROJECT, "--out leaves the source alone");
    assert_eq!(stored_link(&out, 0, 2).as_deref(), Some("SB-2"));

    // Section names match ignoring case, as elsewhere; the label is trimmed.
    let r = run(&["link", o, "--section", "birch cut", "--bed", "2", "--label", " SB-2 "]);
    let err = text(&r.stderr);
    assert!(r.status.success(), "{err}");
    assert!(err.contains("the correlation label \"SB-2\" is also on: Ash Draw bed 2 (3.00 m)"), "{err}");
    assert_eq!(stored_link(&out, 1, 2).as_deref(), Some("SB-2"));
    assert!(dir.path().join("linked.aggrade.bak").exists(), "the previous file is kept as .bak");

    // The panel ties them and hangs on the label.
    let svg = dir.path().join("panel.svg");
    let r = run(&["panel", o, "--datum", "SB-2", "--svg", svg.to_str().expect("utf-8")]);
    let err = text(&r.stderr);
    assert!(r.status.success(), "{err}");
    assert!(!err.contains("has no SB-2"), "both sections have the datum: {err}");
    let drawn = std::fs::read_to_string(&svg).expect("svg");
    assert!(drawn.contains(">SB-2<"), "the label is written beside the tie");
    assert!(drawn.contains("datum: SB-2"), "hung on the label");

    // Remove one label: the decision stays (accepted), the label goes.
    let r = run(&["link", o, "--section", "Birch Cut", "--bed", "2", "--remove"]);
    let err = text(&r.stderr);
    assert!(r.status.success(), "{err}");
    assert!(err.contains("removed the correlation label \"SB-2\""), "{err}");
    assert_eq!(stored_link(&out, 1, 2), None);
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&out).expect("read")).expect("JSON");
    assert_eq!(v["sections"][1]["review"][0]["state"], "accepted");
    // Removing again is refused.
    let r = run(&["link", o, "--section", "Birch Cut", "--bed", "2", "--remove"]);
    assert!(!r.status.success());
    assert!(text(&r.stderr).contains("has no correlation label to remove"), "{}", text(&r.stderr));
}

#[test]
fn refuses_what_cannot_be_linked_and_leaves_the_file_alone() {
    let dir = tempfile::tempdir().expect("temp dir");
    let src = project_in(dir.path());
    let s = src.to_str().expect("utf-8");
    let refused = |args: &[&str], wanted: &[&str]| {
        let r = run(args);
        let err = text(&r.stderr);
        assert!(!r.status.success(), "{args:?} accepted: {err}");
        for w in wanted {
            assert!(err.contains(w), "{args:?}: {w:?} not in {err}");
        }
        assert!(!err.contains("panicked"), "{err}");
        assert_eq!(std::fs::read_to_string(&src).expect("read"), PROJECT, "{args:?} changed the file");
    };
    // An unreviewed boundary, and a boundary with no decision at all.
    refused(
        &["link", s, "--section", "Ash Draw", "--bed", "3", "--label", "SB-3"],
        &[
            "two.aggrade",
            "bed 3 (5.00 m) in \"Ash Draw\" is unreviewed",
            "only an accepted boundary can carry a correlation label",
        ],
    );
    refused(
        &["link", s, "--section", "Ash Draw", "--bed", "1", "--label", "SB-3"],
        &["bed 1 (0.00 m) in \"Ash Draw\" has no review decision"],
    );
    refused(
        &["link", s, "--section", "Ash Draw", "--bed", "99", "--label", "X"],
        &["no bed with id 99 (ids: 1, 2, 3)"],
    );
    // Two sections: which one must be said.
    refused(&["link", s, "--bed", "2", "--label", "X"], &["holds 2 sections", "--section"]);
    // Labels are short printable text.
    refused(&["link", s, "--section", "Ash Draw", "--bed", "2", "--label", "SB\t2"], &["--label", "U+0009"]);
    refused(
        &["link", s, "--section", "Ash Draw", "--bed", "2", "--label", " "],
        &["--label", "must not be blank", "use --remove"],
    );
    let long = "x".repeat(41);
    refused(
        &["link", s, "--section", "Ash Draw", "--bed", "2", "--label", &long],
        &["41 characters", "at most 40"],
    );
    // Neither --label nor --remove, or both.
    refused(&["link", s, "--section", "Ash Draw", "--bed", "2"], &["--label"]);
    refused(&["link", s, "--section", "Ash Draw", "--bed", "2", "--label", "X", "--remove"], &["--remove"]);
    // Labels live in a project file, not a bed table.
    let csv = dir.path().join("out.csv");
    refused(
        &[
            "link",
            s,
            "--section",
            "Ash Draw",
            "--bed",
            "2",
            "--label",
            "X",
            "--out",
            csv.to_str().expect("utf-8"),
        ],
        &["project file"],
    );
    assert!(!csv.exists());
}
