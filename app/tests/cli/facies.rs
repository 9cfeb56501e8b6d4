//! Lithofacies codes on the command line: `aggrade interpret --json` lists each bed with its
//! heights and code, telling the geologist's codes from suggested ones, and `aggrade stats
//! --states facies` counts codes as states and says how many are only suggested.

use super::harness::{aggrade, stderr, stdout};
use serde_json::Value;

fn fixture() -> String {
    super::harness::fixture("facies/codes.aggrade").to_str().expect("utf-8 path").to_string()
}

fn json_of(args: &[&str]) -> Value {
    let o = aggrade(args);
    assert!(o.status.success(), "aggrade {args:?} failed: {}", stderr(&o));
    serde_json::from_str(&stdout(&o)).expect("stdout is one JSON object")
}

#[test]
fn interpret_json_lists_beds_with_heights_and_codes() {
    let file = fixture();
    let v = json_of(&["interpret", &file, "--json"]);
    // The interpretation's own fields are still there, beside the new array.
    assert_eq!(v["section"], "Linnet Cut (invented)");
    assert!(v["caution"].as_str().is_some_and(|c| c.contains("candidates")));
    let beds = v["beds"].as_array().expect("beds array");
    let got: Vec<(u64, f64, f64, Option<&str>, bool)> = beds
        .iter()
        .map(|b| {
            (
                b["id"].as_u64().expect("id"),
                b["base"].as_f64().expect("base"),
                b["top"].as_f64().expect("top"),
                b["facies"].as_str(),
                b["facies_suggested"].as_bool().expect("facies_suggested is a bool"),
            )
        })
        .collect();
    // Heights: the fixture's thicknesses summed from the base (binary fractions, exact).
    // Codes: docs/facies.md's table for the beds with no typed code; the file's own codes else.
    assert_eq!(
        got,
        vec![
            (1, 0.0, 1.5, Some("Gh"), true),    // imbricated gravel, suggested
            (2, 1.5, 3.5, Some("St"), false),   // suggestion confirmed by typing it
            (3, 3.5, 4.75, Some("Sl"), false),  // planar cross-beds, the geologist wrote Sl
            (4, 4.75, 5.5, Some("Sr"), true),   // ripples, suggested
            (5, 5.5, 6.0, None, false),         // covered: no code
            (6, 6.0, 8.5, Some("Fl"), true),    // laminated mud, suggested
            (7, 8.5, 8.75, None, false),        // tuff: outside the scheme
            (8, 8.75, 11.75, Some("P"), false), // typed, the same as the suggestion
            (9, 11.75, 12.25, Some("C"), true), // coal, suggested
            (10, 12.25, 13.25, None, false),    // sandstone with no structure logged
        ]
    );
    // Every bed is listed, base first, each top the next base.
    assert!(beds.windows(2).all(|w| w[0]["top"] == w[1]["base"]));
    assert_eq!(beds.last().and_then(|b| b["top"].as_f64()), v["total_thickness"].as_f64());
}

#[test]
fn stats_facies_states_count_suggested_and_confirmed_codes() {
    let file = fixture();
    let v = json_of(&["stats", &file, "--json", "--states", "facies"]);
    assert_eq!(v["states_from"], "lithofacies code");
    let f = &v["facies"];
    assert_eq!(f["suggested"], 4, "{f}");
    assert_eq!(f["confirmed"], 3, "{f}");
    assert_eq!(f["uncoded"], 2, "the tuff and the sandstone with no structure");
    assert_eq!(f["states"], serde_json::json!(["C", "Fl", "Gh", "P", "Sl", "Sr", "St", "sandstone", "tuff"]));
    let per_bed: Vec<(u64, Option<&str>, bool)> = f["beds"]
        .as_array()
        .expect("beds")
        .iter()
        .map(|b| {
            (b["bed_id"].as_u64().expect("id"), b["state"].as_str(), b["suggested"].as_bool().expect("bool"))
        })
        .collect();
    assert_eq!(per_bed[1], (2, Some("St"), false));
    assert_eq!(per_bed[4], (5, None, false), "a covered interval breaks the chain");
    assert_eq!(per_bed[6], (7, Some("tuff"), false), "an uncoded bed counts by its lithology");
    // The transitions use the codes: Gh → St → Sl → Sr, (cover), Fl → tuff → P → C → sandstone.
    let t = &v["transitions"];
    assert_eq!(t["states"], f["states"]);
    assert_eq!(t["transitions"], 7);
    // Lithology on the same file gives fewer states and degrees of freedom.
    let l = json_of(&["stats", &file, "--json"]);
    assert_eq!(l["states_from"], "lithology");
    let lith_states = l["transitions"]["states"].as_array().expect("states").len();
    assert!(lith_states < 9, "{lith_states} lithology states");
    assert_eq!(t["dof"], 55, "(m − 1)² − m with m = 9 (Powers & Easterling 1982)");
    assert!(l["transitions"]["dof"].as_i64().expect("dof") < 55);

    // The readable report says how many codes are only suggested.
    let o = aggrade(&["stats", &file, "--states", "facies"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    assert!(
        text.contains("Lithofacies codes: 4 suggested (candidates not yet confirmed), 3 given by the geologist, 2 beds without a code"),
        "{text}"
    );
}
