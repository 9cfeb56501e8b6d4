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
    assert!(text.contains("Paleocurrents: one reading only, too few for statistics"), "{text}");
    assert!(text.contains("Facies transitions: too few beds for a transition test\n"), "{text}");
}

#[test]
fn stats_says_plainly_when_there_is_too_little_to_test() {
    // Two beds, one transition between two states: the embedded-chain test has (m − 1)² − m = −1
    // degrees of freedom and needs three states at least (Powers & Easterling 1982, from
    // memory); no readings at all. Said in words, with no "dof = -1" and no expected-count
    // caution, and no error text.
    let dir = tempfile::tempdir().expect("temp dir");
    let two = dir.path().join("two.csv");
    std::fs::write(&two, "thickness_m,lithology,grain\n2,mudstone,clay\n1,sandstone,fine sand\n")
        .expect("write");
    let out = aggrade(&["stats", two.to_str().expect("utf-8")]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout).to_string();
    assert!(text.contains("  Paleocurrents: no paleocurrent readings\n"), "{text}");
    assert!(
        text.contains(
            "Facies transitions: too few beds for a transition test (1 transition between 2 states"
        ),
        "{text}"
    );
    for bad in ["dof = -1", "expected counts are below 5", "needs at least 2 values", "got 0"] {
        assert!(!text.contains(bad), "{bad:?} in {text}");
    }
    // Many beds but only two lithologies alternating: no test either, said so.
    let mut csv = String::from("thickness_m,lithology,grain\n");
    for _ in 0..5 {
        csv.push_str("2,mudstone,clay\n1,sandstone,fine sand\n");
    }
    let alt = dir.path().join("alternating.csv");
    std::fs::write(&alt, csv).expect("write");
    let text = String::from_utf8_lossy(&aggrade(&["stats", alt.to_str().expect("utf-8")]).stdout).to_string();
    assert!(
        text.contains("only 2 states alternate (mudstone, sandstone), so there is no transition test"),
        "{text}"
    );
    assert!(!text.contains("dof = -1"), "{text}");
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

/// A tilted section (bedding 30° toward 090) whose channel sandstone carries one reading of
/// each kind: two trough axes, a planar foreset, imbricated clasts, a parting lineation and an
/// accretion surface.
const TILTED: &str = r#"{
 "format_version": 2,
 "sections": [
  {
   "name": "Tilted",
   "bedding": { "dip_deg": 30.0, "dip_direction_deg": 90.0 },
   "beds": [
    { "id": 1, "thickness_m": 3.0, "lithology": "mudstone", "base_contact": "sharp",
      "grain_base": "clay", "grain_top": "clay" },
    { "id": 2, "thickness_m": 4.0, "lithology": "sandstone", "base_contact": "erosional",
      "grain_base": "medium sand", "grain_top": "medium sand",
      "paleocurrents": [
       { "azimuth_deg": 45.0, "indicator": "trough_axis" },
       { "azimuth_deg": 45.0, "indicator": "trough_axis" },
       { "azimuth_deg": 100.0, "indicator": "planar_foreset", "dip_deg": 25.0 },
       { "azimuth_deg": 30.0, "indicator": "imbrication", "dip_deg": 20.0 },
       { "azimuth_deg": 20.0, "indicator": "parting_lineation" },
       { "azimuth_deg": 300.0, "indicator": "accretion_surface", "dip_deg": 10.0 }
      ] },
    { "id": 3, "thickness_m": 3.0, "lithology": "mudstone", "base_contact": "sharp",
      "grain_base": "clay", "grain_top": "clay" }
   ]
  }
 ]
}"#;

/// Independent restoration in numpy: the rotation matrix maps the bedding's strike, dip line
/// and pole onto strike, horizontal and vertical (a change of basis, not the axis-angle form the
/// app uses); lines in bedding are bedding ∩ the vertical plane of their trend.
const TILT_ORACLE: &str = r#"
import json, sys
import numpy as np
sec = json.load(open(sys.argv[1]))["sections"][0]
dip, dd = sec["bedding"]["dip_deg"], sec["bedding"]["dip_direction_deg"]
def line(t, p):
    t, p = np.radians(t), np.radians(p)
    return np.array([np.sin(t)*np.cos(p), np.cos(t)*np.cos(p), -np.sin(p)])
def az(v): return float(np.degrees(np.arctan2(v[0], v[1])) % 360.0)
S, D = line(dd - 90, 0), line(dd, dip)
N = np.cross(D, S)
R = np.column_stack([S, line(dd, 0), [0, 0, 1]]) @ np.column_stack([S, D, N]).T
out = {"flow": [], "axes": [], "accretion": [], "accretion_dip": []}
for p in sec["beds"][1]["paleocurrents"]:
    kind, a = p["indicator"], p["azimuth_deg"]
    if "dip_deg" in p:
        pole = R @ line(a + 180, 90 - p["dip_deg"])
        if pole[2] < 0: pole = -pole
        restored = az(pole)
        rdip = float(np.degrees(np.arccos(pole[2])))
    else:
        t = np.radians(a); m = np.array([np.cos(t), -np.sin(t), 0.0])
        L = np.cross(N, m); L /= np.linalg.norm(L)
        if L[0]*np.sin(t) + L[1]*np.cos(t) < 0: L = -L
        restored = az(R @ L)
    if kind == "imbrication": out["flow"].append((restored + 180) % 360)
    elif kind == "parting_lineation": out["axes"].append(restored)
    elif kind == "accretion_surface":
        out["accretion"].append(restored); out["accretion_dip"].append(rdip)
    else: out["flow"].append(restored)
r = np.radians(out["flow"])
out["flow_mean"] = float(np.degrees(np.arctan2(np.sin(r).sum(), np.cos(r).sum())) % 360)
print(json.dumps(out))
"#;

#[test]
fn stats_restores_tilted_paleocurrents_and_keeps_accretion_apart() {
    let dir = tempfile::tempdir().expect("temp dir");
    let file = dir.path().join("tilted.aggrade");
    std::fs::write(&file, TILTED).expect("write");
    let path = file.to_str().expect("utf-8");
    let out =
        Command::new("python3").arg("-c").arg(TILT_ORACLE).arg(path).output().expect("python3 is required");
    assert!(out.status.success(), "numpy oracle failed: {}", String::from_utf8_lossy(&out.stderr));
    let o: serde_json::Value = serde_json::from_slice(&out.stdout).expect("oracle JSON");
    let v = stdout_json(&aggrade(&["stats", path, "--json"]));
    let g = &v["paleocurrent_groups"];
    assert_eq!(g["tilt_corrected"], true, "{g}");
    assert_eq!(g["bedding"]["dip"], 30.0);
    assert_eq!(g["bedding"]["dip_direction"], 90.0);
    let nums = |x: &serde_json::Value| -> Vec<f64> {
        x.as_array()
            .unwrap_or_else(|| panic!("array: {x}"))
            .iter()
            .map(|a| a.as_f64().expect("number"))
            .collect()
    };
    let close = |a: &[f64], b: &[f64]| {
        a.len() == b.len()
            && a.iter().zip(b).all(|(x, y)| {
                let d = (x - y).rem_euclid(360.0);
                d.min(360.0 - d) < 1e-7
            })
    };
    // One channel body: the sandstone (the rules read the erosional sandstone as a channel).
    let bodies = g["bodies"].as_array().expect("bodies");
    assert_eq!(bodies.len(), 1, "{g}");
    let body = &bodies[0];
    assert_eq!((body["first_bed_id"].as_u64(), body["last_bed_id"].as_u64()), (Some(2), Some(2)));
    assert!(close(&nums(&body["flow"]["azimuths"]), &nums(&o["flow"])), "{body} vs {o}");
    assert!(close(&nums(&body["axes"]["azimuths"]), &nums(&o["axes"])), "{body} vs {o}");
    assert!(
        close(&nums(&body["accretion_surfaces"]["dip_directions"]), &nums(&o["accretion"])),
        "{body} vs {o}"
    );
    let mean_dip = body["accretion_surfaces"]["mean_dip"].as_f64().expect("mean dip");
    assert!((mean_dip - nums(&o["accretion_dip"])[0]).abs() < 1e-7);
    // Trough axis trending 045 in beds dipping 30° toward 090: the rake relation
    // tan(rake) = tan(045 − strike)/cos 30° gives 049.107 (Ragan, rake and pitch).
    assert!((nums(&body["flow"]["azimuths"])[0] - 49.1066).abs() < 1e-3, "{body}");
    // The main summary pools the four one-way flow readings only: no lineation, no accretion.
    assert_eq!(v["paleocurrents"]["n"], 4, "{}", v["paleocurrents"]);
    let mean = v["paleocurrents"]["mean_azimuth"].as_f64().expect("mean");
    assert!(close(&[mean], &[o["flow_mean"].as_f64().expect("oracle mean")]), "{mean} vs {o}");
    assert_eq!(g["section"]["indicators"]["trough axis"], 2);
    assert_eq!(g["section"]["indicators"]["accretion surface"], 1);
    assert_eq!(g["section"]["flow"]["n"], 4);
    assert_eq!(g["section"]["axes"]["n"], 1);

    let out = aggrade(&["stats", path]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout).to_string();
    assert!(text.contains("restored to horizontal for bedding dipping 30° toward 090°"), "{text}");
    // The restoration is said right under the mean it concerns, before the transition tables.
    let lines: Vec<&str> = text.lines().collect();
    let rayleigh = lines.iter().position(|l| l.contains("Rayleigh z =")).expect("a Rayleigh line");
    assert!(lines[rayleigh + 1].contains("readings restored to horizontal"), "{text}");
    let markov = lines.iter().position(|l| l.contains("Facies transitions")).expect("a transitions line");
    assert!(rayleigh < markov, "{text}");
    assert!(text.contains("accretion surfaces n = 1 (kept apart from flow)"), "{text}");
    assert!(text.contains("2 trough axis, 1 planar foreset, 1 imbrication, 1 parting lineation"), "{text}");

    // Without bedding: said so, and the readings are taken as measured.
    let flat = dir.path().join("flat.aggrade");
    std::fs::write(
        &flat,
        TILTED.replace(r#""bedding": { "dip_deg": 30.0, "dip_direction_deg": 90.0 },"#, ""),
    )
    .expect("write");
    let v = stdout_json(&aggrade(&["stats", flat.to_str().expect("utf-8"), "--json"]));
    assert_eq!(v["paleocurrent_groups"]["tilt_corrected"], false);
    assert_eq!(v["paleocurrent_groups"]["bedding"], serde_json::Value::Null);
    let flow = nums(&v["paleocurrent_groups"]["section"]["flow"]["azimuths"]);
    assert_eq!(flow, vec![45.0, 45.0, 100.0, 210.0]); // imbrication 030 → flow 210
    let text =
        String::from_utf8_lossy(&aggrade(&["stats", flat.to_str().expect("utf-8")]).stdout).to_string();
    assert!(text.contains("no bedding attitude, so not restored to horizontal"), "{text}");
}

#[test]
fn stats_names_a_bad_bedding_attitude_or_dip() {
    let dir = tempfile::tempdir().expect("temp dir");
    let bad = dir.path().join("bad_bedding.aggrade");
    std::fs::write(&bad, TILTED.replace(r#""dip_deg": 30.0"#, r#""dip_deg": 130.0"#)).expect("write");
    let out = aggrade(&["stats", bad.to_str().expect("utf-8")]);
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("bad_bedding.aggrade") && err.contains("bedding") && err.contains("130"), "{err}");
    let bad = dir.path().join("bad_dip.aggrade");
    std::fs::write(&bad, TILTED.replace(r#""dip_deg": 25.0"#, r#""dip_deg": 125.0"#)).expect("write");
    let out = aggrade(&["stats", bad.to_str().expect("utf-8")]);
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("bad_dip.aggrade") && err.contains("paleocurrents") && err.contains("125"), "{err}");
}
