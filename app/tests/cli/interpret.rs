//! End-to-end tests of `aggrade interpret`: the real binary on fixture files, its JSON contract,
//! the readable report, section choice and bad input.

use super::harness::{aggrade, stderr, stdout};
use serde_json::Value;
use std::path::{Path, PathBuf};

fn fixture(name: &str) -> PathBuf {
    super::harness::fixture("rules").join(name)
}

fn json_of(args: &[&str]) -> Value {
    let o = aggrade(args);
    assert!(o.status.success(), "aggrade {args:?} failed: {}", stderr(&o));
    serde_json::from_str(&stdout(&o)).expect("stdout is one JSON object")
}

fn num(v: &Value) -> f64 {
    v.as_f64().unwrap_or_else(|| panic!("expected a number, got {v}"))
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-9
}

#[test]
fn json_follows_the_contract_on_the_cycle_fixture() {
    // Expected values are worked by hand in tests/tests/rules_handworked.rs (same fixture).
    let path = fixture("base_level_cycle.aggrade");
    let v = json_of(&["interpret", path.to_str().expect("utf-8 path"), "--json"]);
    assert_eq!(v["section"], "Harrow Bluff");
    assert!(close(num(&v["total_thickness"]), 48.0) && close(num(&v["exposed_thickness"]), 48.0));
    // 8 + 1.5 + 1.5 + 6 = 17 m of channel deposits in 48 m.
    assert!(close(num(&v["channel_proportion"]), 17.0 / 48.0));

    let bodies = v["channel_bodies"].as_array().expect("channel_bodies array");
    let got: Vec<(f64, f64, u64, &str)> = bodies
        .iter()
        .map(|b| {
            (
                num(&b["base"]),
                num(&b["top"]),
                b["stories"].as_u64().unwrap_or(0),
                b["stacking"].as_str().unwrap_or(""),
            )
        })
        .collect();
    assert_eq!(
        got,
        vec![
            (5.0, 13.0, 3, "multi-storey"),
            (19.0, 20.5, 1, "single-storey"),
            (32.0, 33.5, 1, "single-storey"),
            (40.0, 46.0, 2, "multi-storey")
        ]
    );

    let cands = v["sequence_boundary_candidates"].as_array().expect("candidates array");
    assert_eq!(cands.len(), 4, "the weak soil top at 26.5 m is not listed");
    assert!(close(num(&cands[0]["height"]), 40.0) && close(num(&cands[0]["score"]), 0.8));
    assert!(close(num(&cands[1]["height"]), 5.0) && close(num(&cands[1]["score"]), 0.55));
    assert_eq!(cands[0]["kind"], "channel_base_on_paleosol");
    let strengths: Vec<&str> = cands.iter().map(|c| c["strength"].as_str().unwrap_or("")).collect();
    assert_eq!(strengths, ["strong", "strong", "weak", "weak"]);
    assert_eq!(v["unlisted_candidates"], 1);
    // The full parameter set used is echoed.
    assert_eq!(v["params"]["window_m"], 10.0);
    assert_eq!(
        v["params"].as_object().map(|o| o.len()),
        serde_json::to_value(aggrade_core::rules::RuleParams::default())
            .ok()
            .and_then(|d| d.as_object().map(|o| o.len()))
    );
    assert!(cands[0].get("stability").is_none(), "stability only with --sensitivity");

    let regimes: Vec<&str> = v["accommodation"]
        .as_array()
        .expect("accommodation")
        .iter()
        .map(|a| a["regime"].as_str().unwrap_or(""))
        .collect();
    assert_eq!(regimes, vec!["undetermined", "undetermined", "low"]);
    assert!(v["accommodation"][2]["why"].as_str().is_some_and(|w| w.contains("multi-storey")));

    // Curve every 0.5 m from 0 to 48 m: 97 points. At 10 m the 10 m window is 5–15 m:
    // channel 5–13 = 8 m → 0.8.
    let curve = v["proportion_curve"].as_array().expect("proportion_curve");
    assert_eq!(curve.len(), 97);
    assert!(close(num(&curve[20]["height"]), 10.0) && close(num(&curve[20]["proportion"]), 0.8));
    assert_eq!(v["caution"], aggrade_core::REVIEW_CAUTION);
}

#[test]
fn window_option_changes_the_curve() {
    // With a 20 m window the point at 10 m sees 0–20 m: channel 5–13 (8) + 19–20 (1) = 9 → 0.45.
    let path = fixture("base_level_cycle.aggrade");
    let v = json_of(&["interpret", path.to_str().expect("utf-8 path"), "--json", "--window-m", "20"]);
    let p = &v["proportion_curve"][20];
    assert!(close(num(&p["height"]), 10.0) && close(num(&p["proportion"]), 0.45), "{p}");
}

#[test]
fn readable_report_names_bodies_candidates_and_the_caution() {
    let path = fixture("base_level_cycle.aggrade");
    let o = aggrade(&["interpret", path.to_str().expect("utf-8 path")]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    for needle in [
        "Channel bodies (4)",
        "5.00–13.00 m (8.00 m): multi-storey, 3 storeys",
        "40.00–48.00 m: low",
        "1. 40.00 m, strong, channel-body base on a paleosol",
        "1 weak paleosol top with no other evidence not listed",
        "Interpreted with default rules.",
        "erodes directly into a paleosol of strong development",
        aggrade_core::REVIEW_CAUTION,
    ] {
        assert!(text.contains(needle), "report lacks {needle:?}:\n{text}");
    }
}

/// The cycle fixture's section plus a second one, written to a temporary project file.
fn two_section_project(dir: &Path) -> PathBuf {
    let text = std::fs::read_to_string(fixture("base_level_cycle.aggrade")).expect("fixture");
    let mut v: Value = serde_json::from_str(&text).expect("fixture parses");
    let mut second = v["sections"][0].clone();
    second["name"] = Value::from("Corran Gap");
    second["beds"] = Value::Array(second["beds"].as_array().expect("beds")[..3].to_vec());
    v["sections"].as_array_mut().expect("sections").push(second);
    let path = dir.join("two.aggrade");
    std::fs::write(&path, v.to_string()).expect("write temp project");
    path
}

#[test]
fn several_sections_need_a_section_name() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = two_section_project(dir.path());
    let p = path.to_str().expect("utf-8 path");

    let o = aggrade(&["interpret", p, "--json"]);
    assert!(!o.status.success());
    let err = stderr(&o);
    assert!(
        err.contains("--section") && err.contains("\"Harrow Bluff\"") && err.contains("\"Corran Gap\""),
        "{err}"
    );

    // Beds 0–3 mudstone, 3–5 strong paleosol, 5–7 conglomerate: one body of one storey. It
    // reaches the section top, so it is seen only in part: stacking undetermined, censored at
    // its top (it was called single-storey before censoring was read).
    let v = json_of(&["interpret", p, "--json", "--section", "corran gap"]);
    assert_eq!(v["section"], "Corran Gap");
    assert!(close(num(&v["total_thickness"]), 7.0));
    assert_eq!(v["channel_bodies"][0]["stacking"], "undetermined");
    assert_eq!(v["channel_bodies"][0]["censored"], serde_json::json!(["top"]));

    let o = aggrade(&["interpret", p, "--section", "Nowhere"]);
    assert!(!o.status.success());
    assert!(stderr(&o).contains("no section named \"Nowhere\""), "{}", stderr(&o));
}

#[test]
fn bad_input_fails_with_a_message_not_a_panic() {
    let dir = tempfile::tempdir().expect("temp dir");
    let missing = dir.path().join("missing.aggrade");
    let o = aggrade(&["interpret", missing.to_str().expect("utf-8 path")]);
    assert!(!o.status.success());
    assert!(stderr(&o).contains("missing.aggrade"), "{}", stderr(&o));

    let broken = dir.path().join("broken.aggrade");
    std::fs::write(&broken, "{\"format_version\": 1, \"sections\": [ {\"name\": 3} ]}").expect("write");
    let o = aggrade(&["interpret", broken.to_str().expect("utf-8 path")]);
    assert!(!o.status.success());
    let err = stderr(&o);
    assert!(err.contains("broken.aggrade") && !err.contains("panicked"), "{err}");

    let text = std::fs::read_to_string(fixture("base_level_cycle.aggrade")).expect("fixture");
    let zero = dir.path().join("zero.aggrade");
    std::fs::write(&zero, text.replacen("\"thickness_m\": 2.0", "\"thickness_m\": -2.0", 1)).expect("write");
    let o = aggrade(&["interpret", zero.to_str().expect("utf-8 path")]);
    assert!(!o.status.success());
    let err = stderr(&o);
    // The reader refuses the file before the rules see it, naming file, line, path and value.
    assert!(
        err.contains("zero.aggrade")
            && err.contains("sections[0].beds[1].thickness_m")
            && err.contains("got -2"),
        "{err}"
    );

    let path = fixture("base_level_cycle.aggrade");
    let o = aggrade(&["interpret", path.to_str().expect("utf-8 path"), "--window-m", "-2"]);
    assert!(!o.status.success());
    assert!(stderr(&o).contains("window_m: got -2"), "{}", stderr(&o));

    // A parameter file with `text`: the command must fail; its message is returned.
    let params = dir.path().join("params.json");
    let refused_with = |text: &str| {
        std::fs::write(&params, text).expect("write");
        let o = aggrade(&[
            "interpret",
            path.to_str().expect("utf-8 path"),
            "--params",
            params.to_str().expect("utf-8"),
        ]);
        assert!(!o.status.success(), "{text} was accepted");
        stderr(&o)
    };
    let err = refused_with("{\"drape_limit_m\": \"thin\"}");
    assert!(err.contains("params.json: drape_limit_m: got thin; invalid type"), "{err}");

    let err = refused_with("{\"drape_limt_m\": 0.3}");
    assert!(
        err.contains("drape_limt_m") && err.contains("drape_limit_m"),
        "unknown field named with the valid ones: {err}"
    );
}

#[test]
fn a_parameter_file_changes_the_rules() {
    // With a 0.1 m drape limit the 0.2 m drape at 11.0–11.2 m splits the lower body: 5–11 m
    // (2 storeys) and 11.2–13 m (1 storey).
    let dir = tempfile::tempdir().expect("temp dir");
    let params = dir.path().join("params.json");
    std::fs::write(&params, "{\"drape_limit_m\": 0.1}").expect("write");
    let path = fixture("base_level_cycle.aggrade");
    let v = json_of(&[
        "interpret",
        path.to_str().expect("utf-8 path"),
        "--json",
        "--params",
        params.to_str().expect("utf-8"),
    ]);
    let b = &v["channel_bodies"];
    assert!(close(num(&b[0]["top"]), 11.0) && close(num(&b[1]["base"]), 11.2), "{b}");
}

fn demo_file() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade")
}

#[test]
fn json_and_report_carry_censoring_profiles_bounds_and_storey_bodies() {
    // Pell Butte (invented demo, logged in feet): the body over SB-1 runs up to a covered
    // interval; the two upper channels rest on covered intervals (see sample_sections/README.md
    // and tests/tests/rules_demo_sections.rs for the reading).
    let demo = demo_file();
    let path = demo.to_str().expect("utf-8 path");
    let v = json_of(&["interpret", path, "--section", "Pell Butte", "--json"]);
    let bodies = v["channel_bodies"].as_array().expect("channel_bodies");
    let got: Vec<(&str, Value)> =
        bodies.iter().map(|b| (b["stacking"].as_str().unwrap_or(""), b["censored"].clone())).collect();
    assert_eq!(
        got,
        vec![
            ("multi-storey", serde_json::json!(["top"])),
            ("undetermined", serde_json::json!(["base"])),
            ("undetermined", serde_json::json!(["base"]))
        ]
    );
    // Every storey names its body; the first three belong to the first body.
    let storey_bodies: Vec<u64> =
        v["storeys"].as_array().expect("storeys").iter().map(|s| s["body"].as_u64().unwrap_or(99)).collect();
    assert_eq!(storey_bodies, vec![0, 0, 0, 1, 2]);
    let b = &v["channel_proportion_bounds"];
    let (lo, p, hi) =
        (num(&b["covered_as_fines"]), num(&v["channel_proportion"]), num(&b["covered_as_channel"]));
    assert!(lo < p && p < hi, "{lo} {p} {hi}");
    // Profiles, lowest first, with base, top, maturity and bed ids.
    let soils = v["paleosols"].as_array().expect("paleosols");
    assert!(soils.windows(2).all(|w| num(&w[0]["base"]) < num(&w[1]["base"])));
    // Strong by carbonate stage III (Machette 1985); its slickensides with nodules are named as a
    // seasonal-climate feature and no longer raise it a grade (docs/interpretation-rules.md).
    assert_eq!(soils[1]["maturity"], "strong");
    assert_eq!(soils[1]["beds"], serde_json::json!([3, 4]));

    let o = aggrade(&["interpret", path, "--section", "Pell Butte"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    for needle in [
        // Logged in feet: 8.6868 m is 28.50 ft (1 ft = 0.3048 m exactly, 1959 agreement).
        "(\u{2265} 28.50 ft): multi-storey, 3 storeys",
        "[top not seen: thickness a minimum]",
        "undetermined, 1 storey",
        "with covered as fines",
        "Paleosol profiles (7):",
        "strong maturity, 2 beds (logged strong, carbonate stage III)\n",
        "slickensides with carbonate nodules (vertic and calcic)",
    ] {
        assert!(text.contains(needle), "report lacks {needle:?}:\n{text}");
    }
    assert!(!text.contains("raised by slickensides"), "{text}");
}

#[test]
fn bodies_csv_names_censored_ends_and_the_summary_counts_undetermined_bodies() {
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("bodies.csv");
    let demo = demo_file();
    let o = aggrade(&[
        "bodies",
        demo.to_str().expect("utf-8 path"),
        "--section",
        "Pell Butte",
        "--csv",
        csv.to_str().expect("utf-8 path"),
        "--burial-depth",
        "1500",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&csv).expect("CSV written");
    let mut lines = text.lines();
    assert_eq!(
        lines.next(),
        Some(
            "section,base_m,top_m,thickness_m,storeys,stacking,grain_finest,grain_coarsest,censored,width_m,\
             beyond_outcrop,width_thickness,width_thickness_bound,geometry_class"
        )
    );
    let ends: Vec<&str> = lines.map(|l| l.split(',').nth(8).unwrap_or("")).collect();
    assert_eq!(ends, vec!["top", "base", "base"]);
    let out = stdout(&o);
    assert!(out.contains("stacking: 1 multi-storey, 0 single-storey, 2 undetermined"), "{out}");
    assert!(out.contains("3 bodies seen only in part"), "{out}");
    assert!(out.contains("counting covered intervals as fines"), "{out}");
    assert!(out.contains("covered intervals decompacted as shale"), "{out}");
}

/// Lengths written in metres in a report: a number followed by the unit symbol "m" standing alone
/// ("3.05 m", "10 m window"), not "m" starting a word.
fn metre_lengths(text: &str) -> Vec<String> {
    let words: Vec<&str> = text.split_whitespace().collect();
    words
        .windows(2)
        .filter(|w| {
            let unit = w[1].trim_end_matches([',', ')', ';', ':', '.']);
            unit == "m"
                && w[0].trim_start_matches(['(', '≥']).chars().last().is_some_and(|c| c.is_ascii_digit())
        })
        .map(|w| format!("{} {}", w[0], w[1]))
        .collect()
}

#[test]
fn a_section_logged_in_feet_reads_in_feet_and_a_metre_section_in_metres() {
    // Pell Butte (invented demo) is logged in feet: every height, thickness and length of the
    // report, evidence sentences and regime reasons included, is in feet; --json keeps metres.
    let demo = demo_file();
    let path = demo.to_str().expect("utf-8 path");
    let o = aggrade(&["interpret", path, "--section", "Pell Butte", "--all-candidates"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    assert_eq!(metre_lengths(&text), Vec::<String>::new(), "lengths in metres in a feet report:\n{text}");
    // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959): the default 10 m
    // window is 32.81 ft, the base of the lowest body 6.88848 m is 22.60 ft.
    for needle in [
        "(logged in ft: heights are ft above the section base; --json gives metres)",
        "1. 22.60–51.10 ft (\u{2265} 28.50 ft): multi-storey",
        "no channel body between 0.00 and 22.60 ft",
        "every 1.64 ft in a 32.81 ft window",
        "22.60 ft \"SB-1\", strong",
    ] {
        assert!(text.contains(needle), "report lacks {needle:?}:\n{text}");
    }
    let v = json_of(&["interpret", path, "--section", "Pell Butte", "--json"]);
    let base = num(&v["sequence_boundary_candidates"][0]["height"]);
    assert!((base - 22.6 * 0.3048).abs() < 1e-6, "JSON heights stay in metres: {base}");

    // A section logged in metres reads in metres, as before.
    let cycle = fixture("base_level_cycle.aggrade");
    let o = aggrade(&["interpret", cycle.to_str().expect("utf-8 path")]);
    let text = stdout(&o);
    assert!(!text.contains(" ft"), "{text}");
    assert!(!text.contains("logged in"), "{text}");
    assert!(metre_lengths(&text).contains(&"48.00 m,".to_string()), "the check above sees metres: {text}");
    for needle in [
        "Thickness 48.00 m, exposed 48.00 m, channel deposits 17.00 m",
        "every 0.5 m in a 10 m window",
        "1. 40.00 m, strong, channel-body base on a paleosol, unreviewed",
    ] {
        assert!(text.contains(needle), "report lacks {needle:?}:\n{text}");
    }
}

#[test]
fn the_review_state_reads_unreviewed_and_old_files_saying_candidate_still_open() {
    // The cycle fixture with decisions written in the old word ("candidate") and the new one.
    let dir = tempfile::tempdir().expect("temp dir");
    let text = std::fs::read_to_string(fixture("base_level_cycle.aggrade")).expect("fixture");
    let mut v: Value = serde_json::from_str(&text).expect("fixture parses");
    let bed_at_40 = v["sections"][0]["beds"]
        .as_array()
        .expect("beds")
        .iter()
        .scan(0.0, |h, b| {
            let base = *h;
            *h += num(&b["thickness_m"]);
            Some((base, b["id"].clone()))
        })
        .find(|(base, _)| close(*base, 40.0))
        .map(|(_, id)| id)
        .expect("a bed based at 40 m");
    v["sections"][0]["review"] =
        serde_json::json!([{"bed": bed_at_40, "state": "candidate", "note": "look again"}]);
    let old = dir.path().join("old.aggrade");
    std::fs::write(&old, v.to_string()).expect("write");
    let p = old.to_str().expect("utf-8 path");

    let o = aggrade(&["interpret", p]);
    assert!(o.status.success(), "an old file's \"candidate\" state is read: {}", stderr(&o));
    let report = stdout(&o);
    assert!(report.contains("1. 40.00 m, strong, channel-body base on a paleosol, unreviewed"), "{report}");
    assert!(report.contains("note: look again"), "{report}");
    for old_word in ["not yet reviewed", "still a candidate", "open"] {
        assert!(!report.contains(old_word), "{old_word:?} in:\n{report}");
    }
    let j = json_of(&["interpret", p, "--json"]);
    assert_eq!(j["sequence_boundary_candidates"][0]["review"], "unreviewed");
}
