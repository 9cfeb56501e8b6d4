//! Rule parameters kept in the project file: every command that runs the rules uses them,
//! `--params FILE` lays a one-run change over them, printouts say which rules produced them,
//! and `interpret` can list every candidate and measure how stable each pick is.

use super::harness::{aggrade, stderr, stdout};
use serde_json::Value;
use std::path::{Path, PathBuf};

/// The base-level cycle fixture (worked by hand in tests/tests/rules_handworked.rs) with the
/// given `rule_params`, written to a temporary project file.
fn cycle_with(dir: &Path, rule_params: Value) -> PathBuf {
    let text = std::fs::read_to_string(super::harness::fixture("rules").join("base_level_cycle.aggrade"))
        .expect("fixture");
    let mut v: Value = serde_json::from_str(&text).expect("fixture parses");
    v["rule_params"] = rule_params;
    let path = dir.join("cycle.aggrade");
    std::fs::write(&path, serde_json::to_string_pretty(&v).expect("json")).expect("write project");
    path
}

fn run_ok(args: &[&str]) -> String {
    let o = aggrade(args);
    assert!(o.status.success(), "aggrade {args:?} failed: {}", stderr(&o));
    stdout(&o)
}

/// Body rows of `aggrade bodies` (the CSV minus its header).
fn body_rows(project: &Path, extra: &[&str]) -> usize {
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("bodies.csv");
    let mut args = vec!["bodies", project.to_str().expect("utf-8"), "--csv", csv.to_str().expect("utf-8")];
    args.extend_from_slice(extra);
    run_ok(&args);
    let text = std::fs::read_to_string(&csv).expect("bodies csv");
    text.lines().filter(|l| !l.trim().is_empty() && !l.starts_with('#')).count() - 1
}

#[test]
fn saved_parameters_change_what_bodies_and_export_produce() {
    // The lower body (5–13 m) holds a 0.2 m mud drape between storeys. With the default 0.5 m
    // drape limit it is one body of three storeys (4 bodies in all); with a 0.1 m limit saved in
    // the project the drape ends the storey and splits the body (5 bodies). Common practice:
    // fines thicker than the drape limit are floodplain, not a drape inside a channel belt.
    let dir = tempfile::tempdir().expect("temp dir");
    let plain = cycle_with(dir.path(), serde_json::json!({}));
    assert_eq!(body_rows(&plain, &[]), 4);
    let tuned_dir = tempfile::tempdir().expect("temp dir");
    let tuned = cycle_with(tuned_dir.path(), serde_json::json!({"drape_limit_m": 0.1}));
    assert_eq!(body_rows(&tuned, &[]), 5, "the project's drape limit is used by `bodies`");

    // --params lays a one-run change over the project's own.
    let over = tuned_dir.path().join("over.json");
    std::fs::write(&over, r#"{"drape_limit_m": 0.5}"#).expect("params file");
    assert_eq!(body_rows(&tuned, &["--params", over.to_str().expect("utf-8")]), 4);

    // `export` draws with the project's rules and says so in the footer.
    let svg_of = |project: &Path| {
        let out = project.with_extension("svg");
        run_ok(&["export", project.to_str().expect("utf-8"), "--svg", out.to_str().expect("utf-8")]);
        std::fs::read_to_string(&out).expect("svg")
    };
    let (a, b) = (svg_of(&plain), svg_of(&tuned));
    assert!(a.contains("Interpreted with default rules."), "footer of the default run");
    assert!(b.contains("drape_limit_m = 0.1"), "the footer names the changed parameter");
    // Five bodies are bracketed instead of four: the drawings differ beyond the footer.
    assert_ne!(a.matches("<polyline").count(), b.matches("<polyline").count());

    // `interpret --json` echoes the full set used.
    let v: Value = serde_json::from_str(&run_ok(&["interpret", tuned.to_str().expect("utf-8"), "--json"]))
        .expect("json");
    assert_eq!(v["params"]["drape_limit_m"], 0.1);
    assert_eq!(v["params"]["window_m"], 10.0);
    assert_eq!(v["channel_bodies"].as_array().map(Vec::len), Some(5));
}

#[test]
fn faulty_saved_parameters_are_named_and_retired_names_warned() {
    let dir = tempfile::tempdir().expect("temp dir");
    let bad = cycle_with(dir.path(), serde_json::json!({"drape_limit_m": -1, "windw_m": 3}));
    let o = aggrade(&["check", bad.to_str().expect("utf-8")]);
    assert!(!o.status.success());
    let err = stderr(&o);
    assert!(err.contains("rule_params") && err.contains("windw_m: not a rule parameter"), "{err}");

    let dir = tempfile::tempdir().expect("temp dir");
    let old = cycle_with(dir.path(), serde_json::json!({"weight_grain_jump": 0.3}));
    let o = aggrade(&["interpret", old.to_str().expect("utf-8")]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert!(stderr(&o).contains("weight_grain_jump: no longer used by the rules; ignored"), "{}", stderr(&o));
}

#[test]
fn all_candidates_and_sensitivity_from_the_command_line() {
    let dir = tempfile::tempdir().expect("temp dir");
    let p = cycle_with(dir.path(), serde_json::json!({}));
    let p = p.to_str().expect("utf-8");
    let v: Value =
        serde_json::from_str(&run_ok(&["interpret", p, "--json", "--all-candidates"])).expect("json");
    let cands = v["sequence_boundary_candidates"].as_array().expect("candidates");
    assert_eq!(cands.len(), 5, "the weak soil top at 26.5 m is listed when asked for");
    assert!(cands.iter().any(|c| c["height"] == 26.5 && c["strength"] == "weak"));

    let v: Value = serde_json::from_str(&run_ok(&["interpret", p, "--json", "--sensitivity"])).expect("json");
    for c in v["sequence_boundary_candidates"].as_array().expect("candidates") {
        let s = c["stability"].as_f64().expect("stability on every candidate");
        assert!((0.0..=1.0).contains(&s), "{c}");
    }
    for b in v["channel_bodies"].as_array().expect("bodies") {
        let s = b["stability"].as_f64().expect("stability on every body");
        assert!((0.0..=1.0).contains(&s), "{b}");
    }
    let text = run_ok(&["interpret", p, "--sensitivity"]);
    assert!(text.contains("stable in ") && text.contains("Sensitivity: 46 runs"), "{text}");
}
