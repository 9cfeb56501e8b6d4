//! End-to-end tests of `aggrade stats` and `aggrade bodies` on the invented Marrow Basin
//! sections, with the numbers checked against scipy run on the same file.

use super::harness::aggrade;
use std::path::PathBuf;
use std::process::{Command, Output};

fn data(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../tests/data/analysis").join(name)
}

fn stdout_json(out: &Output) -> serde_json::Value {
    assert!(out.status.success(), "aggrade failed: {}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout)
        .unwrap_or_else(|e| panic!("not JSON ({e}): {}", String::from_utf8_lossy(&out.stdout)))
}

/// Independent reading of the fixture in Python: paleocurrent statistics with scipy, and the
/// lithology transitions counted by hand rules (repeats merged, covered intervals break the
/// chain). A missing python3 or scipy fails the test with a clear message.
const ORACLE: &str = r#"
import json, math, sys
try:
    import numpy as np
    from scipy.stats import circmean, circstd, chi2
except ImportError as e:
    sys.exit("scipy/numpy are required for this reference check: " + str(e))
sec = json.load(open(sys.argv[1]))["sections"][0]
az = [a for b in sec["beds"] for a in b.get("paleocurrents_deg", [])]
n = len(az); r = np.radians(az)
R = math.hypot(np.cos(r).sum(), np.sin(r).sum())
pairs = []; prev = None
for b in sec["beds"]:
    lith = b["lithology"]
    if lith == "covered":
        prev = None; continue
    if prev is not None and prev != lith:
        pairs.append((prev, lith))
    prev = lith
states = sorted({s for p in pairs for s in p})
obs = [[sum(1 for p in pairs if p == (a, b)) for b in states] for a in states]
# Broad families (common practice groupings): mud rocks and siltstone as fines, etc.
fam = {"claystone": "fines", "mudstone": "fines", "shale": "fines", "siltstone": "fines",
       "sandstone": "sand", "conglomerate": "gravel", "breccia": "gravel"}
fpairs = []; prev = None
for b in sec["beds"]:
    lith = b["lithology"]
    if lith == "covered":
        prev = None; continue
    f = fam.get(lith, "non-clastic")
    if prev is not None and prev != f:
        fpairs.append((prev, f))
    prev = f
fstates = sorted({s for p in fpairs for s in p})
fobs = [[sum(1 for p in fpairs if p == (a, b)) for b in fstates] for a in fstates]
print(json.dumps({
    "n": n,
    "mean": float(circmean(az, high=360, low=0)),
    "std": float(circstd(az, high=360, low=0)),
    "axial_mean": float(circmean(az, high=180, low=0)),
    "axial_std": float(circstd(az, high=180, low=0)),
    "rbar": R / n,
    # Zar (1999) approximation, written out here from its formula.
    "p_zar": math.exp(math.sqrt(1 + 4*n + 4*(n*n - R*R)) - (1 + 2*n)),
    "states": states,
    "observed": obs,
    "family_states": fstates,
    "family_observed": fobs,
}))
"#;

#[test]
fn stats_json_matches_scipy_on_the_same_file() {
    let file = data("kestrel_bluff.aggrade");
    let out = aggrade(&["stats", file.to_str().expect("utf-8 path"), "--json"]);
    let v = stdout_json(&out);
    let py = Command::new("python3")
        .arg("-c")
        .arg(ORACLE)
        .arg(&file)
        .output()
        .expect("python3 is required for this check");
    assert!(
        py.status.success(),
        "the Python reference check failed: {}",
        String::from_utf8_lossy(&py.stderr)
    );
    let o: serde_json::Value = serde_json::from_slice(&py.stdout).expect("oracle JSON");
    let pc = &v["paleocurrents"];
    let num = |x: &serde_json::Value| x.as_f64().unwrap_or_else(|| panic!("not a number: {x}"));
    assert_eq!(pc["n"], o["n"]);
    // scipy.stats.circmean / circstd (degrees, high=360).
    assert!((num(&pc["mean_azimuth"]) - num(&o["mean"])).abs() < 1e-8, "{pc} vs {o}");
    assert!((num(&pc["circular_std"]) - num(&o["std"])).abs() < 1e-8);
    assert!((num(&pc["mean_resultant_length"]) - num(&o["rbar"])).abs() < 1e-12);
    assert!((num(&pc["rayleigh_z"]) - num(&o["n"]) * num(&o["rbar"]).powi(2)).abs() < 1e-9);
    assert!((num(&pc["rayleigh_p"]) - num(&o["p_zar"])).abs() < 1e-12);
    let t = &v["transitions"];
    assert_eq!(t["states"], o["states"]);
    assert_eq!(t["observed"], o["observed"]);
    for key in ["expected", "chi_square", "dof", "p_value"] {
        assert!(!t[key].is_null(), "transitions.{key} missing: {t}");
    }
    // p-value against scipy.stats.chi2.sf on the reported statistic.
    let chk = Command::new("python3")
        .arg("-c")
        .arg("import sys\nfrom scipy.stats import chi2\nprint(repr(float(chi2.sf(float(sys.argv[1]), int(sys.argv[2])))))")
        .arg(t["chi_square"].to_string())
        .arg(t["dof"].to_string())
        .output()
        .expect("python3 is required for this check");
    assert!(chk.status.success(), "{}", String::from_utf8_lossy(&chk.stderr));
    let p: f64 = String::from_utf8_lossy(&chk.stdout).trim().parse().expect("a number from scipy");
    assert!((num(&t["p_value"]) - p).abs() < 1e-10, "{} vs scipy {p}", t["p_value"]);
    // One accepted boundary (bed 13, at 24.6 m) splits the section into two intervals.
    let iv = v["intervals"].as_array().expect("intervals");
    assert_eq!(iv.len(), 2);
    assert!((num(&iv[0]["top"]) - 24.6).abs() < 1e-9);
    assert_eq!(num(&iv[0]["paleocurrents"]["n"]) + num(&iv[1]["paleocurrents"]["n"]), num(&pc["n"]));
    assert_eq!(v["caution"], aggrade_core_caution());
    // Per-bed statistics: bed 2 holds four readings.
    assert_eq!(v["beds"][0]["bed_id"], 2);
    assert_eq!(v["beds"][0]["n"], 4);

    // Axial reading of the same azimuths: scipy with high=180 doubles the angles.
    let ax = stdout_json(&aggrade(&["stats", file.to_str().expect("utf-8 path"), "--json", "--axial"]));
    assert_eq!(ax["paleocurrents"]["kind"], "axial");
    assert!((num(&ax["paleocurrents"]["mean_azimuth"]) - num(&o["axial_mean"])).abs() < 1e-8);
    assert!((num(&ax["paleocurrents"]["circular_std"]) - num(&o["axial_std"])).abs() < 1e-8);

    // The same file with lithology families as states.
    let f =
        stdout_json(&aggrade(&["stats", file.to_str().expect("utf-8 path"), "--json", "--states", "family"]));
    assert_eq!(f["transitions"]["states"], o["family_states"]);
    assert_eq!(f["transitions"]["observed"], o["family_observed"]);
}

fn aggrade_core_caution() -> &'static str {
    aggrade_core::REVIEW_CAUTION
}

#[test]
fn stats_text_and_multi_section_json() {
    let file = data("marrow_basin.aggrade");
    let path = file.to_str().expect("utf-8 path");
    let out = aggrade(&["stats", path]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("Section \"Kestrel Bluff\"") && text.contains("Section \"Harrow Creek\""),
        "{text}"
    );
    assert!(text.contains("Rayleigh z") && text.contains("chi-square"), "{text}");
    assert!(text.contains("candidates for expert review"), "{text}");
    let v = stdout_json(&aggrade(&["stats", path, "--json"]));
    assert_eq!(v["sections"].as_array().map(Vec::len), Some(2));
    // Case-insensitive section choice gives the plain one-section object.
    let h = stdout_json(&aggrade(&["stats", path, "--json", "--section", "harrow creek"]));
    assert_eq!(h["section"], "Harrow Creek");
    assert_eq!(h["paleocurrents"]["n"], 5);
    assert_eq!(h["transitions"]["dof"], 1); // 3 states: (3 − 1)² − 3 = 1
}

#[test]
fn stats_reports_bad_input_clearly() {
    let path = data("marrow_basin.aggrade");
    let out = aggrade(&["stats", path.to_str().expect("utf-8"), "--section", "Nowhere"]);
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("no section named \"Nowhere\"") && err.contains("\"Kestrel Bluff\""), "{err}");

    let dir = tempfile::tempdir().expect("temp dir");
    let bad = dir.path().join("bad_azimuth.aggrade");
    let text = std::fs::read_to_string(data("kestrel_bluff.aggrade")).expect("fixture");
    std::fs::write(&bad, text.replacen("200,", "400,", 1)).expect("write");
    let out = aggrade(&["stats", bad.to_str().expect("utf-8")]);
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        // The reader names the file, line and field; it finds the bad value before stats does.
        err.contains("bad_azimuth.aggrade")
            && err.contains("line 24")
            && err.contains("beds[1].paleocurrents[0].azimuth_deg")
            && err.contains("between 0 and 360"),
        "{err}"
    );

    let out = aggrade(&["stats", "/nonexistent/section.aggrade"]);
    assert!(!out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("/nonexistent/section.aggrade"));
    let out = aggrade(&["stats", path.to_str().expect("utf-8"), "--bin-width", "7"]);
    assert!(!out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("must divide 360"));
}

#[test]
fn bodies_csv_and_summary_match_numpy() {
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("bodies.csv");
    let curve = dir.path().join("curve.csv");
    let file = data("marrow_basin.aggrade");
    let out = aggrade(&[
        "bodies",
        file.to_str().expect("utf-8"),
        "--csv",
        csv.to_str().expect("utf-8"),
        "--curve-csv",
        curve.to_str().expect("utf-8"),
        "--burial-depth",
        "1500",
    ]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout).to_string();
    // numpy.percentile (default linear method) on the thickness column read back with Python's
    // csv module must reproduce the printed P10/P50/P90 and mean.
    let script = r#"
import csv, json, sys
try:
    import numpy as np
except ImportError as e:
    sys.exit("numpy is required for this reference check: " + str(e))
rows = list(csv.DictReader(open(sys.argv[1], newline="")))
t = [float(r["thickness_m"]) for r in rows]
curve = list(csv.DictReader(open(sys.argv[2], newline="")))
print(json.dumps({"n": len(rows), "sections": sorted({r["section"] for r in rows}),
  "line": "mean %.3f, median %.3f, P10 %.3f, P50 %.3f, P90 %.3f, min %.3f, max %.3f" % (
      np.mean(t), np.median(t), np.percentile(t, 10), np.percentile(t, 50), np.percentile(t, 90), min(t), max(t)),
  "curve_points": len(curve)}))
"#;
    let py = Command::new("python3")
        .arg("-c")
        .arg(script)
        .arg(&csv)
        .arg(&curve)
        .output()
        .expect("python3 is required");
    assert!(
        py.status.success(),
        "the Python reference check failed: {}",
        String::from_utf8_lossy(&py.stderr)
    );
    let o: serde_json::Value = serde_json::from_slice(&py.stdout).expect("oracle JSON");
    let line = o["line"].as_str().expect("line");
    assert!(text.contains(line), "summary differs from numpy: expected {line:?} in\n{text}");
    assert!(text.contains(&format!("{} channel bodies", o["n"])), "{text}");
    assert_eq!(o["sections"], serde_json::json!(["Harrow Creek", "Kestrel Bluff"]));
    assert!(o["curve_points"].as_u64().expect("count") > 10);
    assert!(text.contains("decompacted from 1500 m burial"), "{text}");
    assert!(text.contains("candidates for expert review"), "{text}");
}

#[test]
fn bodies_reports_bad_input_clearly() {
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("bodies.csv");
    let file = data("kestrel_bluff.aggrade");
    let out = aggrade(&[
        "bodies",
        file.to_str().expect("utf-8"),
        "--csv",
        csv.to_str().expect("utf-8"),
        "--burial-depth",
        "-5",
    ]);
    assert!(!out.status.success());
    assert!(
        String::from_utf8_lossy(&out.stderr).contains("--burial-depth -5"),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = aggrade(&["bodies", file.to_str().expect("utf-8"), "--csv", "/nonexistent/dir/b.csv"]);
    assert!(!out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("/nonexistent/dir/b.csv: cannot create the file"));
}

#[test]
fn decompacted_beds_match_scipy_restacking() {
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("bodies.csv");
    let dc = dir.path().join("decompacted.csv");
    let file = data("marrow_basin.aggrade");
    let out = aggrade(&[
        "bodies",
        file.to_str().expect("utf-8"),
        "--csv",
        csv.to_str().expect("utf-8"),
        "--burial-depth",
        "1500",
        "--decompacted-csv",
        dc.to_str().expect("utf-8"),
    ]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    // Sclater & Christie (1980) laws (shale 0.63/0.51, sandstone 0.49/0.27, shaly sandstone
    // 0.56/0.39 per km; Sclater & Christie 1980, table 1 from memory), each bed's solid thickness conserved and the beds restacked
    // from the top down with the section top at the surface, solved with scipy.optimize.brentq.
    let script = r#"
import csv, json, math, sys
try:
    from scipy.optimize import brentq
except ImportError as e:
    sys.exit("scipy is required for this reference check: " + str(e))
laws = {"mudstone": (0.63, 0.51), "claystone": (0.63, 0.51), "shale": (0.63, 0.51), "covered": (0.63, 0.51),
        "siltstone": (0.56, 0.39), "marl": (0.56, 0.39),
        "sandstone": (0.49, 0.27), "conglomerate": (0.49, 0.27), "breccia": (0.49, 0.27),
        "limestone": (0.70, 0.71), "dolostone": (0.70, 0.71)}
def solid(phi0, c, a, b):
    return (b - a) - phi0 / c * (math.exp(-c * a) - math.exp(-c * b))
want = {}
for sec in json.load(open(sys.argv[1]))["sections"]:
    now, then = float(sys.argv[3]), 0.0
    for i in reversed(range(len(sec["beds"]))):
        b = sec["beds"][i]; t = b["thickness_m"]
        if b["lithology"] in laws:
            phi0, ck = laws[b["lithology"]]; c = ck / 1000.0
            s = solid(phi0, c, now, now + t)
            new = brentq(lambda x: solid(phi0, c, then, then + x) - s, s, 10 * t, xtol=1e-12)
        else:
            new = t
        want[(sec["name"], i + 1)] = new
        now += t; then += new
rows = list(csv.DictReader(open(sys.argv[2], newline="")))
worst = max(abs(float(r["decompacted_thickness_m"]) - want[(r["section"], int(r["bed"]))]) for r in rows)
print(json.dumps({"rows": len(rows), "beds": len(want), "worst": worst}))
"#;
    let py = Command::new("python3")
        .arg("-c")
        .arg(script)
        .arg(&file)
        .arg(&dc)
        .arg("1500")
        .output()
        .expect("python3 is required");
    assert!(
        py.status.success(),
        "the Python reference check failed: {}",
        String::from_utf8_lossy(&py.stderr)
    );
    let o: serde_json::Value = serde_json::from_slice(&py.stdout).expect("oracle JSON");
    assert_eq!(o["rows"], o["beds"], "one CSV row per bed");
    assert_eq!(o["rows"], 21);
    // The CSV rounds to 4 decimals (±0.00005).
    assert!(o["worst"].as_f64().expect("number") < 1e-4, "{o}");
}

#[test]
fn stats_text_is_in_the_display_unit_of_a_section_logged_in_feet() {
    let dir = tempfile::tempdir().expect("temp dir");
    // Logged in feet: 10 + 5 + 3.3 = 18.3 ft (5.578 m; 1 ft = 0.3048 m exactly, international
    // yard and pound agreement, 1959).
    let feet = dir.path().join("feet.csv");
    std::fs::write(
        &feet,
        "thickness_ft,lithology,grain,paleocurrents\n10,mudstone,clay,\n5,sandstone,medium sand,10;20;30\n3.3,mudstone,clay,\n",
    )
    .expect("write");
    let out = aggrade(&["stats", feet.to_str().expect("utf-8")]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout).to_string();
    assert!(text.contains("Section \"feet\": 18.30 ft, 3 beds, 3 paleocurrent readings"), "{text}");
    assert!(text.contains("bed 2 (id 2, base 10.00 ft): n = 3"), "{text}");
    // No height or thickness in metres anywhere in the text.
    for line in
        text.lines().filter(|l| l.starts_with("Section") || l.starts_with("Interval") || l.contains("base "))
    {
        assert!(!line.contains(" m,") && !line.contains(" m)") && !line.contains(" m "), "{line}");
    }
    // The JSON stays in metres (its fields are documented in metres): 18.3 ft = 5.57784 m.
    let v = stdout_json(&aggrade(&["stats", feet.to_str().expect("utf-8"), "--json"]));
    assert!((v["top"].as_f64().expect("top") - 18.3 * 0.3048).abs() < 1e-9, "{}", v["top"]);

    // One bed, one reading: counted in the singular.
    let one = dir.path().join("one.csv");
    std::fs::write(&one, "thickness_m,lithology,grain,paleocurrents\n2,sandstone,fine sand,45\n")
        .expect("write");
    let out = aggrade(&["stats", one.to_str().expect("utf-8")]);
    let text = String::from_utf8_lossy(&out.stdout).to_string();
    assert!(text.contains("Section \"one\": 2.00 m, 1 bed, 1 paleocurrent reading\n"), "{text}");
}

#[test]
fn the_feet_sample_section_reports_in_feet() {
    let pell = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/pell_butte.csv");
    let out = aggrade(&["stats", pell.to_str().expect("utf-8")]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout).to_string();
    // The sample's thickness_ft column sums to 141.2 ft.
    assert!(text.starts_with("Section \"pell_butte\": 141.20 ft, "), "{text}");
    assert!(
        text.lines().filter(|l| l.trim_start().starts_with("bed ")).all(|l| l.contains(" ft)")),
        "{text}"
    );
}
