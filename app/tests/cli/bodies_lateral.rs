//! `aggrade bodies` with channel-body widths: the CSV and JSON gain width, beyond-outcrop,
//! width/thickness with its bound and the geometry class (Friend et al. 1979 ribbons w/t < 15;
//! Gibling 2006 narrow sheets 15–100, broad sheets > 100), and a width whose body is gone is
//! named on standard error.
//!
//! Fixture `tests/data/analysis/tern_reach_widths.aggrade` (invented): four channel sandstones
//! in mudstone, 4.0, 2.0, 2.5 and 3.0 m thick (the last at the section top, so censored), with
//! widths 48 m, 160 m (runs beyond the outcrop), 300 m and 30 m, and one width recorded on a
//! mudstone bed where no body starts.

use super::harness::{aggrade, fixture, stderr};

#[test]
fn bodies_csv_and_json_carry_width_ratio_and_class() {
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("bodies.csv");
    let json = dir.path().join("bodies.json");
    let file = fixture("analysis/tern_reach_widths.aggrade");
    let o = aggrade(&[
        "bodies",
        file.to_str().expect("utf-8 path"),
        "--csv",
        csv.to_str().expect("utf-8 path"),
        "--json",
        json.to_str().expect("utf-8 path"),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));

    let text = std::fs::read_to_string(&csv).expect("CSV written");
    let mut lines = text.lines();
    let header: Vec<&str> = lines.next().expect("header").split(',').collect();
    assert_eq!(
        &header[9..],
        ["width_m", "beyond_outcrop", "width_thickness", "width_thickness_bound", "geometry_class"]
    );
    let rows: Vec<Vec<&str>> = lines.map(|l| l.split(',').collect()).collect();
    let lateral: Vec<&[&str]> = rows.iter().map(|r| &r[9..]).collect();
    assert_eq!(
        lateral,
        [
            // 48 / 4.0 = 12 < 15: a ribbon (Friend et al. 1979; Gibling 2006).
            &["48.000", "false", "12.00", "exact", "ribbon"][..],
            // 160 / 2.0 = 80, but the width is a minimum: narrow or broad sheet, never a ribbon.
            &["160.000", "true", "80.00", "minimum", "at least narrow sheet"][..],
            // 300 / 2.5 = 120 > 100: a broad sheet (Gibling 2006).
            &["300.000", "false", "120.00", "exact", "broad sheet"][..],
            // 30 / 3.0 = 10 with the thickness a minimum (top not seen): at most 10, a ribbon.
            &["30.000", "false", "10.00", "maximum", "ribbon"][..],
        ]
    );
    assert_eq!(rows[3][8], "top");

    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&json).expect("JSON written")).expect("JSON parses");
    assert!(v["caution"].as_str().is_some_and(|c| c.contains("candidates for expert review")), "{v}");
    let bodies = v["bodies"].as_array().expect("bodies");
    assert_eq!(bodies.len(), 4);
    assert_eq!(bodies[1]["width"], 160.0);
    assert_eq!(bodies[1]["beyond_outcrop"], true);
    assert_eq!(bodies[1]["width_thickness"], 80.0);
    assert_eq!(bodies[1]["width_thickness_bound"], "minimum");
    assert_eq!(bodies[1]["geometry_class"], "at least narrow sheet");
    assert_eq!(bodies[2]["geometry_class"], "broad sheet");
    assert_eq!(bodies[0]["base_bed"], 2);

    // The width recorded on bed 3 (a mudstone) matches no body: named, kept out of the table.
    let unmatched = v["unmatched_lateral"].as_array().expect("unmatched list");
    assert_eq!(unmatched.len(), 1);
    assert_eq!(unmatched[0]["base_bed"], 3);
    let err = stderr(&o);
    assert!(err.contains("based on bed 3 matches no body now"), "{err}");
}
