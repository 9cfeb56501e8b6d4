//! A measured gamma-ray curve attached from a LAS fixture and printed at 1:100, checked with
//! independent readers: lasio (PyPI) reads the LAS file, pdfplumber (PyPI) reads the PDF. The
//! curve's points must sit at the heights of the LAS depths at true scale, and its value axis must
//! put the smallest value on the track's left edge and the largest on its right edge.

use aggrade_core::analysis::las::{read_las, IndexDirection, IndexToSection};
use aggrade_core::export::{write_pdf, PdfInfo};
use aggrade_core::io;
use aggrade_core::layout::{
    lithology_tint, pages, LayoutOptions, Orientation, Paper, PrintMeta, CURVE_COLOURS,
};
use aggrade_core::model::{Lithology, Project};
use aggrade_core::rules::{interpret, RuleParams};
use serde_json::Value;
use std::path::{Path, PathBuf};
use std::process::Command;

/// 1 mm in PDF points: 1 in = 25.4 mm exactly and 1 pt = 1/72 in (PDF 32000-1 §8.3.2.3).
const PT_PER_MM: f64 = 72.0 / 25.4;
/// The tolerance asked of the drawing: 0.1 mm on paper.
const TOL_PT: f64 = 0.1 * PT_PER_MM;

fn data(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data").join(rel)
}

/// Run a Python script on a file and parse its JSON; the oracle is required, never skipped.
fn python_json(script: &Path, code: Option<&str>, arg: &Path) -> Value {
    let mut cmd = Command::new("python3");
    match code {
        Some(c) => cmd.arg("-c").arg(c),
        None => cmd.arg(script),
    };
    let out = cmd.arg(arg).output().unwrap_or_else(|e| {
        panic!("python3 is required for this reference check (pip install lasio pdfplumber): {e}")
    });
    assert!(
        out.status.success(),
        "the Python reference check failed:\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("oracle prints JSON")
}

/// lasio's reading of the GR curve: (depth in m, value or None for NULL).
fn lasio_gr(path: &Path) -> Vec<(f64, Option<f64>)> {
    let code = r#"
import json, math, sys
try:
    import lasio
except ImportError as e:
    sys.exit("lasio is not installed: " + str(e))
las = lasio.read(sys.argv[1])
assert las.curves[0].unit.upper() == "M"
gr = las["GR"]
print(json.dumps([[float(d), None if math.isnan(v) else float(v)] for d, v in zip(las.index, gr)]))
"#;
    let v = python_json(Path::new(""), Some(code), path);
    v.as_array().expect("list").iter().map(|p| (p[0].as_f64().expect("depth"), p[1].as_f64())).collect()
}

fn rgb01(c: aggrade_core::layout::Rgba) -> [f64; 3] {
    [c.0, c.1, c.2].map(|v| (f64::from(v) / 255.0 * 10000.0).round() / 10000.0)
}

fn colour_is(v: &Value, want: [f64; 3]) -> bool {
    let c: Vec<f64> = v.as_array().map(|a| a.iter().filter_map(Value::as_f64).collect()).unwrap_or_default();
    c.len() == 3 && c.iter().zip(want).all(|(a, b)| (a - b).abs() < 0.003)
}

/// y (pt) of the highest drawn curve point: the track titles sit above it.
fn top_of_column(points: &[(f64, f64)]) -> f64 {
    points.iter().map(|p| p.1).fold(f64::INFINITY, f64::min)
}

#[test]
fn gamma_ray_track_sits_at_true_scale_and_spans_its_value_axis() {
    let las_path = data("las/kestrel_unwrapped_m.las");
    let mut project: Project =
        io::load(&data("analysis/kestrel_bluff.aggrade")).expect("fixture loads").project;
    // The log runs 0–10 m below a datum 10 m above the Kestrel Bluff base: height = 10 − depth.
    let las = read_las(&las_path).expect("fixture reads");
    let placement = IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 10.0 };
    let curve = las.measured_curve("GR", &placement, &las_path.display().to_string()).expect("GR");
    project.sections[0].attach_curve(curve);

    // Save, reopen, print the reopened project: what is drawn is what was stored.
    let dir = tempfile::tempdir().expect("temp dir");
    let saved = dir.path().join("kestrel.aggrade");
    io::save_project(&saved, &project).expect("saves");
    let project = io::load(&saved).expect("reopens").project;
    let section = &project.sections[0];
    let interp = interpret(section, &RuleParams::default());
    let opts = LayoutOptions {
        scale_denominator: 100.0,
        paper: Paper::A4,
        orientation: Orientation::Portrait,
        ..Default::default()
    };
    let p = pages(
        section,
        &interp,
        &opts,
        &PrintMeta { printed_on: "2026-12-01".into(), subtitle: String::new() },
    );
    let info = PdfInfo { title: section.name.clone(), author: String::new(), creation_date: 1_796_083_200 };
    let pdf_path = dir.path().join("kestrel.pdf");
    std::fs::write(&pdf_path, write_pdf(&p, &info)).expect("write pdf");
    let probe = python_json(&data("curves/curve_probe.py"), None, &pdf_path);
    let page = &probe["pages"][0];

    // Section base on the page: the bottom of the lowest mudstone fill (bed 1 is a 2 m mudstone;
    // the legend swatch of the same colour sits higher up the page).
    let mud = rgb01(lithology_tint(Lithology::Mudstone));
    let base_pt = page["fills"]
        .as_array()
        .expect("fills")
        .iter()
        .filter(|f| colour_is(&f["fill"], mud))
        .map(|f| f["bottom"].as_f64().expect("bottom"))
        .fold(f64::NEG_INFINITY, f64::max);
    assert!(base_pt.is_finite(), "no mudstone fill found");
    // At 1:100, 1 m of section is 10 mm on paper.
    let pt_per_m = 1000.0 / 100.0 * PT_PER_MM;

    // The curve: stroked paths in the first curve colour. NULLs at depths 2.0 and 2.5 m split it.
    let ink = rgb01(CURVE_COLOURS[0]);
    let runs: Vec<Vec<(f64, f64)>> = page["paths"]
        .as_array()
        .expect("paths")
        .iter()
        .filter(|p| colour_is(&p["stroke"], ink))
        .map(|p| {
            p["pts"]
                .as_array()
                .expect("pts")
                .iter()
                .map(|q| (q[0].as_f64().expect("x"), q[1].as_f64().expect("y")))
                .collect()
        })
        .collect();
    assert_eq!(runs.len(), 2, "the curve breaks at the NULL readings: {runs:?}");

    // The track's frame: the two grey vertical lines that bracket the curve's x range.
    let xs: Vec<f64> = runs.iter().flatten().map(|p| p.0).collect();
    let (cx0, cx1) = (
        xs.iter().copied().fold(f64::INFINITY, f64::min),
        xs.iter().copied().fold(f64::NEG_INFINITY, f64::max),
    );
    let verticals: Vec<f64> = page["lines"]
        .as_array()
        .expect("lines")
        .iter()
        .filter(|l| (l["x0"].as_f64().expect("x0") - l["x1"].as_f64().expect("x1")).abs() < 1e-6)
        .filter(|l| l["bottom"].as_f64().expect("bottom") >= base_pt - TOL_PT)
        .map(|l| l["x0"].as_f64().expect("x0"))
        .collect();
    let left = verticals.iter().copied().filter(|x| *x <= cx0 + TOL_PT).fold(f64::NEG_INFINITY, f64::max);
    let right = verticals.iter().copied().filter(|x| *x >= cx1 - TOL_PT).fold(f64::INFINITY, f64::min);
    assert!(left.is_finite() && right.is_finite(), "track frame lines not found around {cx0}–{cx1}");
    // Track width 20 mm (our layout's choice, curve_track::CURVE_TRACK_MM).
    assert!((right - left - 20.0 * PT_PER_MM).abs() < TOL_PT, "track is {} pt wide", right - left);

    // lasio's values: min and max over the non-NULL samples.
    let theirs = lasio_gr(&las_path);
    let values: Vec<f64> = theirs.iter().filter_map(|s| s.1).collect();
    let (vmin, vmax) = (
        values.iter().copied().fold(f64::INFINITY, f64::min),
        values.iter().copied().fold(f64::NEG_INFINITY, f64::max),
    );
    // Value axis: min on the left edge, max on the right edge (±0.1 mm).
    assert!((cx0 - left).abs() < TOL_PT, "minimum drawn at {cx0}, track's left edge at {left}");
    assert!((cx1 - right).abs() < TOL_PT, "maximum drawn at {cx1}, track's right edge at {right}");
    // And the axis labels print those values (rounded to 4 significant digits).
    let drawn: Vec<(f64, f64)> = runs.iter().flatten().copied().collect();
    let words: Vec<&str> =
        page["words"].as_array().expect("words").iter().filter_map(|w| w["text"].as_str()).collect();
    for (v, label) in [(vmin, "25.04"), (vmax, "91.83")] {
        assert_eq!(format!("{v:.2}"), label, "lasio's extreme value");
        assert!(words.contains(&label), "axis label {label} missing from {words:?}");
    }
    // The track title above the column, read from the upright characters over the track.
    let mut title: Vec<(i64, f64, String)> = page["chars"]
        .as_array()
        .expect("chars")
        .iter()
        .filter(|c| c["upright"].as_bool() == Some(true))
        .filter(|c| {
            c["x0"].as_f64().expect("x0") >= left - TOL_PT && c["x1"].as_f64().expect("x1") <= right + TOL_PT
        })
        .filter(|c| c["top"].as_f64().expect("top") < top_of_column(&drawn))
        .map(|c| {
            let top = c["top"].as_f64().expect("top");
            (
                (top * 2.0).round() as i64,
                c["x0"].as_f64().expect("x0"),
                c["text"].as_str().expect("text").to_string(),
            )
        })
        .collect();
    title.sort_by(|a, b| a.0.cmp(&b.0).then(a.1.total_cmp(&b.1)));
    let mut lines: Vec<String> = Vec::new();
    let mut last = None;
    for (row, _, t) in &title {
        if last != Some(*row) {
            lines.push(String::new());
            last = Some(*row);
        }
        if let Some(l) = lines.last_mut() {
            l.push_str(t.trim());
        }
    }
    assert!(lines.iter().any(|l| l == "GR(API)"), "track title names curve and unit: {lines:?}");

    // Every non-NULL lasio sample has a drawn point at its height and value (±0.1 mm).
    assert_eq!(drawn.len(), values.len(), "one point per non-NULL sample");
    for (depth, v) in theirs.iter().filter_map(|(d, v)| v.map(|v| (*d, v))) {
        let height_m = 10.0 - depth;
        let y = base_pt - height_m * pt_per_m;
        let x = left + (v - vmin) / (vmax - vmin) * (right - left);
        let hit = drawn.iter().any(|(px, py)| (px - x).abs() <= TOL_PT && (py - y).abs() <= TOL_PT);
        assert!(hit, "no point for depth {depth} m (height {height_m} m, GR {v}) near ({x:.2}, {y:.2}) pt");
    }
    // The highest sample (depth 0, height 10 m) is 100 mm above the base at 1:100.
    let top_y = drawn.iter().map(|p| p.1).fold(f64::INFINITY, f64::min);
    assert!(
        (base_pt - top_y - 100.0 * PT_PER_MM).abs() <= TOL_PT,
        "top sample {} pt above base",
        base_pt - top_y
    );
}

#[test]
fn a_narrow_page_drops_curve_tracks_and_says_so() {
    let las_path = data("las/harrow_wrapped_m.las");
    let mut project = io::load(&data("analysis/kestrel_bluff.aggrade")).expect("fixture loads").project;
    let las = read_las(&las_path).expect("fixture reads");
    let placement = IndexToSection { direction: IndexDirection::HeightAboveDatum, zero_m: 0.0 };
    for m in las.curve_mnemonics() {
        let c = las.measured_curve(m, &placement, "harrow.las").expect("curve");
        project.sections[0].attach_curve(c);
    }
    let n = project.sections[0].curves.len();
    assert_eq!(n, 4, "the wrapped fixture has four curves besides its index");
    let section = &project.sections[0];
    let interp = interpret(section, &RuleParams::default());
    for (orientation, drawn) in [(Orientation::Portrait, 2usize), (Orientation::Landscape, 4)] {
        let opts = LayoutOptions { orientation, ..Default::default() };
        let p = pages(section, &interp, &opts, &PrintMeta::default());
        // A4 portrait leaves 186 mm between 12 mm margins: the 134 mm column plus two 22.5 mm
        // curve tracks (179 mm) fit, a third does not; landscape (273 mm) takes all four.
        let titles = p[0]
            .items
            .iter()
            .filter(|i| matches!(i, aggrade_core::layout::Item::Text { text, .. } if text.ends_with(')') && las.curve_mnemonics().iter().any(|m| text.starts_with(&format!("{m} ("))) ))
            .count();
        assert_eq!(titles, drawn, "{orientation:?}");
        let note = p[0].items.iter().any(|i| matches!(i, aggrade_core::layout::Item::Text { text, .. } if text.starts_with(&format!("{drawn} of {n} measured curves drawn"))));
        assert_eq!(note, drawn < n, "{orientation:?}: the page says when curves are left out");
        for page in &p {
            for it in &page.items {
                let b = it.bounds();
                assert!(b.x + b.w <= page.width_mm + 1e-6, "{orientation:?}: item runs off the page: {it:?}");
            }
        }
    }
}
