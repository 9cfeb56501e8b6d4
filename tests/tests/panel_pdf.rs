//! The correlation panel checked in its PDF by independent readers (pypdf and pdfplumber from
//! PyPI): paper size, true vertical scale in every column, the datum at one height across the
//! columns, tie lines ending at the right heights (by surface name and by the geologist's
//! correlation label), and the caution in the footer.

use aggrade_core::export::{write_pdf, PdfInfo};
use aggrade_core::layout::{
    lithology_tint, panel_layout, Datum, LayoutOptions, Orientation, PanelLayout, PanelOptions, Paper,
    PrintMeta, Rgba, DATUM_BLUE, LINK_TEAL, TIE_VIOLET,
};
use aggrade_core::model::{
    Bed, BedId, GrainSize, Lithology, Project, ReviewDecision, ReviewState, Section, Surface, SurfaceKind,
    WentworthClass,
};
use aggrade_core::rules::{interpret, RuleParams};
use serde_json::Value;
use std::path::Path;
use std::process::Command;

/// 1 mm in PDF points: 72/25.4 (1 in = 25.4 mm exactly; 1 pt = 1/72 in).
const PT_PER_MM: f64 = 72.0 / 25.4;

fn probe(file: &Path) -> Value {
    let script = Path::new(env!("CARGO_MANIFEST_DIR")).join("data/panel/panel_probe.py");
    let out = Command::new("python3")
        .arg(&script)
        .arg(file)
        .output()
        .unwrap_or_else(|e| panic!("cannot run python3 (needed as the independent PDF reader): {e}"));
    assert!(out.status.success(), "{} failed: {}", script.display(), String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("probe prints JSON")
}

/// A section of mudstone with one conglomerate bed (a colour nothing else on the page uses in a
/// tall shape) whose base carries `base_name` and whose top carries `top_name`.
fn section(
    name: &str,
    below_m: f64,
    cgl_m: f64,
    above_m: f64,
    base_name: Option<&str>,
    top_name: Option<&str>,
    pos_m: f64,
) -> Section {
    let mut s = Section::new(name);
    let mud = Some(GrainSize::Class(WentworthClass::Silt));
    let surface = |n: Option<&str>| n.map(|n| Surface { name: n.to_string(), kind: SurfaceKind::Other });
    s.beds.push(Bed::new(BedId(1), below_m, Lithology::Mudstone, mud));
    let mut c =
        Bed::new(BedId(2), cgl_m, Lithology::Conglomerate, Some(GrainSize::Class(WentworthClass::Pebble)));
    c.base_surface = surface(base_name);
    s.beds.push(c);
    let mut top = Bed::new(BedId(3), above_m, Lithology::Mudstone, mud);
    top.base_surface = surface(top_name);
    s.beds.push(top);
    s.panel_position_m = Some(pos_m);
    s
}

fn project() -> Project {
    Project::new(vec![
        section("Ash Draw", 3.0, 2.0, 4.0, Some("SB-1"), Some("T-1"), 0.0),
        section("Birch Cut", 1.5, 3.0, 1.0, Some("SB-1"), Some("T-1"), 400.0),
        // No SB-1 here: hung on its base and flagged.
        section("Cinder Knoll", 5.0, 1.0, 2.0, None, None, 900.0),
    ])
}

fn layout_and_pdf(p: &Project, scale: f64) -> (PanelLayout, Value) {
    layout_and_pdf_on(p, scale, "SB-1")
}

fn layout_and_pdf_on(p: &Project, scale: f64, datum: &str) -> (PanelLayout, Value) {
    let interps: Vec<_> = p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect();
    let opts = PanelOptions {
        datum: Datum::parse(datum),
        layout: LayoutOptions {
            scale_denominator: scale,
            paper: Paper::A3,
            orientation: Orientation::Landscape,
            ..LayoutOptions::default()
        },
        ..PanelOptions::default()
    };
    let meta = PrintMeta { printed_on: "2026-12-01".into(), subtitle: String::new() };
    let layout = panel_layout(p, &interps, &opts, &meta).expect("panel lays out");
    let bytes = write_pdf(
        std::slice::from_ref(&layout.page),
        &PdfInfo { title: "panel".into(), author: String::new(), creation_date: 1_790_000_000 },
    );
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("panel.pdf");
    std::fs::write(&path, bytes).expect("write pdf");
    let v = probe(&path);
    (layout, v)
}

fn rgb(c: Rgba) -> [f64; 3] {
    [c.0, c.1, c.2].map(|v| (f64::from(v) / 255.0 * 10000.0).round() / 10000.0)
}

fn colour_is(v: &Value, c: [f64; 3]) -> bool {
    let got: Vec<f64> =
        v.as_array().map(|a| a.iter().filter_map(Value::as_f64).collect()).unwrap_or_default();
    got.len() == 3 && got.iter().zip(c).all(|(a, b)| (a - b).abs() < 0.003)
}

fn f(v: &Value, key: &str) -> f64 {
    v[key].as_f64().unwrap_or_else(|| panic!("{key} missing in {v}"))
}

/// Filled shapes of a colour taller than `min_pt`: (x0, top, bottom) in pt from the page top.
fn fills(page: &Value, colour: Rgba, min_pt: f64) -> Vec<(f64, f64, f64)> {
    let mut v = Vec::new();
    for kind in ["rects", "curves"] {
        for s in page[kind].as_array().expect("shapes") {
            if s["fill"].as_bool() == Some(true) && colour_is(&s["fill_colour"], rgb(colour)) {
                let (top, bottom) = (f(s, "top"), f(s, "bottom"));
                if bottom - top > min_pt {
                    v.push((f(s, "x0"), top, bottom));
                }
            }
        }
    }
    v.sort_by(|a, b| a.0.total_cmp(&b.0));
    v
}

/// Stroked paths of a colour, as their point lists (pt, y from the page top).
fn strokes(page: &Value, colour: Rgba) -> Vec<Vec<(f64, f64)>> {
    let mut v = Vec::new();
    for kind in ["lines", "curves", "rects"] {
        for s in page[kind].as_array().expect("shapes") {
            if s["stroke"].as_bool() == Some(true) && colour_is(&s["stroke_colour"], rgb(colour)) {
                let pts = s["pts"].as_array().expect("pts");
                v.push(pts.iter().map(|p| (p[0].as_f64().expect("x"), p[1].as_f64().expect("y"))).collect());
            }
        }
    }
    v
}

#[test]
fn a3_landscape_panel_at_true_vertical_scale() {
    let (layout, v) = layout_and_pdf(&project(), 100.0);
    // ISO 216: A3 is 297 × 420 mm = 841.890 × 1190.551 pt; landscape puts the long side across.
    let size = &v["pypdf"]["pages"][0];
    assert_eq!(v["pypdf"]["pages"].as_array().map(Vec::len), Some(1), "one page");
    assert!((size[0].as_f64().expect("w") - 1190.551).abs() < 0.01, "{size}");
    assert!((size[1].as_f64().expect("h") - 841.890).abs() < 0.01, "{size}");
    assert!(!layout.page_enlarged);

    let page = &v["pages"][0];
    // One conglomerate fill per column, taller than the legend swatch (3.8 mm ≈ 10.8 pt).
    let cgl = fills(page, lithology_tint(Lithology::Conglomerate), 15.0);
    assert_eq!(cgl.len(), 3, "{cgl:?}");
    // True scale: a bed of t m is t·1000/N mm tall at 1:N (common practice: the meaning
    // of a scale 1:N), ±0.1 mm. Columns left to right are Ash Draw (2 m), Birch Cut (3 m), Cinder Knoll (1 m).
    for ((_, top, bottom), t_m) in cgl.iter().zip([2.0, 3.0, 1.0]) {
        let mm = (bottom - top) / PT_PER_MM;
        assert!((mm - t_m * 1000.0 / 100.0).abs() <= 0.1, "{t_m} m bed drawn {mm:.3} mm tall");
    }
    // The datum (SB-1, the base of the conglomerate in Ash Draw and Birch Cut) sits at one y in
    // both columns and on the blue datum line.
    let (ya, yb) = (cgl[0].2, cgl[1].2);
    assert!((ya - yb).abs() < 0.05, "SB-1 at {ya} pt and {yb} pt");
    // Lines longer than 30 mm: the key's 9 mm swatch is left out.
    let datum_lines: Vec<_> = strokes(page, DATUM_BLUE)
        .into_iter()
        .filter(|l| {
            l.iter().map(|p| p.0).fold(f64::MIN, f64::max) - l.iter().map(|p| p.0).fold(f64::MAX, f64::min)
                > 30.0 * PT_PER_MM
        })
        .collect();
    assert!(!datum_lines.is_empty(), "a datum line is drawn");
    for line in &datum_lines {
        for (_, y) in line {
            assert!((y - ya).abs() < 0.05, "datum line at {y} pt, SB-1 at {ya} pt");
        }
    }
    // Cinder Knoll lacks SB-1: its base (mudstone below the conglomerate: 5 m = 50 mm) is on the
    // datum, and the page says it is not correlated.
    let base_c = cgl[2].2 + 5.0 * 10.0 * PT_PER_MM;
    assert!((base_c - ya).abs() < 0.1, "Cinder Knoll base at {base_c} pt, datum at {ya} pt");
    let chars = page["chars"].as_str().expect("chars");
    assert!(chars.contains("NO SB-1: hung on base"), "flag above the column");
    assert!(chars.contains("Cinder Knoll: has no SB-1"), "note on the page");
    assert!(chars.contains("vertical scale 1:100"));
    assert!(chars.contains("Interpretations are candidates for expert review"), "caution in the footer");

    // Tie line T-1 joins the top of the conglomerate in Ash Draw to that in Birch Cut; SB-1 joins
    // their bases (both drawn in the tie colour, dashed).
    let ties = strokes(page, TIE_VIOLET);
    let ends: Vec<((f64, f64), (f64, f64))> = ties
        .iter()
        .filter(|p| p.len() == 2)
        .map(|p| if p[0].0 <= p[1].0 { (p[0], p[1]) } else { (p[1], p[0]) })
        .collect();
    let (a_top, b_top) = (cgl[0].1, cgl[1].1);
    assert!(
        ends.iter().any(|(l, r)| (l.1 - a_top).abs() < 0.05
            && (r.1 - b_top).abs() < 0.05
            && l.0 > cgl[0].0
            && r.0 < cgl[1].0),
        "T-1 tie from {a_top} pt to {b_top} pt not found among {ends:?}"
    );
    assert!(ends.iter().any(|(l, r)| (l.1 - ya).abs() < 0.05 && (r.1 - yb).abs() < 0.05), "SB-1 tie");
    // No tie reaches Cinder Knoll (it has neither name).
    assert!(ends.iter().all(|(_, r)| r.0 < cgl[2].0), "{ends:?}");
    assert_eq!(layout.ties.len(), 2);
}

#[test]
fn vertical_scale_holds_at_other_scales() {
    // 1:50 and 1:200 (the page is lengthened at 1:50 when needed; the scale never changes).
    for scale in [50.0, 200.0] {
        let (layout, v) = layout_and_pdf(&project(), scale);
        let page = &v["pages"][0];
        let cgl = fills(
            page,
            lithology_tint(Lithology::Conglomerate),
            15.0_f64.min(1000.0 / scale * PT_PER_MM * 0.9),
        );
        assert_eq!(cgl.len(), 3, "1:{scale}: {cgl:?}");
        for ((_, top, bottom), t_m) in cgl.iter().zip([2.0, 3.0, 1.0]) {
            let mm = (bottom - top) / PT_PER_MM;
            assert!((mm - t_m * 1000.0 / scale).abs() <= 0.1, "1:{scale}: {t_m} m bed drawn {mm:.3} mm");
        }
        // The page is as the layout says (pypdf), in whole: mm × 72/25.4.
        let size = &v["pypdf"]["pages"][0];
        assert!((size[1].as_f64().expect("h") - layout.page.height_mm * PT_PER_MM).abs() < 0.01);
    }
}

/// Accept the boundary at the base of bed `id`, with a correlation label.
fn accept(s: &mut Section, id: u64, link: Option<&str>) {
    let mut d = ReviewDecision::new(BedId(id), ReviewState::Accepted, "");
    d.link = link.map(str::to_string);
    s.review.push(d);
}

#[test]
fn linked_boundaries_are_tied_at_their_heights_with_the_label_beside_the_tie() {
    // No surface names this time: the conglomerate bases are accepted boundaries that the
    // geologist labels SB-4 in Ash Draw (3 m) and Birch Cut (1.5 m). Ash Draw's conglomerate top
    // (5 m) is accepted too but not labelled; Birch Cut has no second boundary, so nothing pairs
    // it by order. Cinder Knoll (the right neighbour of Birch Cut) has no label: no tie.
    let mut p = Project::new(vec![
        section("Ash Draw", 3.0, 2.0, 4.0, None, None, 0.0),
        section("Birch Cut", 1.5, 3.0, 1.0, None, None, 400.0),
        section("Cinder Knoll", 5.0, 1.0, 2.0, None, None, 900.0),
    ]);
    accept(&mut p.sections[0], 2, Some("SB-4"));
    accept(&mut p.sections[0], 3, None);
    accept(&mut p.sections[1], 2, Some("SB-4"));
    let (layout, v) = layout_and_pdf_on(&p, 100.0, "base");
    let page = &v["pages"][0];
    let cgl = fills(page, lithology_tint(Lithology::Conglomerate), 15.0);
    assert_eq!(cgl.len(), 3, "{cgl:?}");
    // Hung on the base: the blue datum line across the panel is every column's base.
    let datum_y: Vec<f64> = strokes(page, DATUM_BLUE)
        .into_iter()
        .filter(|l| l.len() == 2 && (l[1].0 - l[0].0).abs() > 30.0 * PT_PER_MM)
        .map(|l| l[0].1)
        .collect();
    assert_eq!(datum_y.len(), 1, "{datum_y:?}");
    let base_y = datum_y[0];
    // The linked tie: a solid line in the link colour with two points, longer than the key's
    // 9 mm swatch.
    let links: Vec<((f64, f64), (f64, f64))> = strokes(page, LINK_TEAL)
        .into_iter()
        .filter(|l| l.len() == 2 && (l[1].0 - l[0].0).abs() > 10.0 * PT_PER_MM)
        .map(|l| if l[0].0 <= l[1].0 { (l[0], l[1]) } else { (l[1], l[0]) })
        .collect();
    assert_eq!(links.len(), 1, "one linked tie: {links:?}");
    let (l, r) = links[0];
    // True vertical scale, 1:100 (1 m = 10 mm; common practice), ±0.1 mm: the left end 3 m above
    // Ash Draw's base, the right end 1.5 m above Birch Cut's.
    let above_base_mm = |y: f64| (base_y - y) / PT_PER_MM;
    assert!((above_base_mm(l.1) - 30.0).abs() <= 0.1, "left end {:.3} mm above the base", above_base_mm(l.1));
    assert!(
        (above_base_mm(r.1) - 15.0).abs() <= 0.1,
        "right end {:.3} mm above the base",
        above_base_mm(r.1)
    );
    // And at the conglomerate bases as drawn in the two columns, from Ash Draw to Birch Cut.
    assert!((l.1 - cgl[0].2).abs() <= 0.1 * PT_PER_MM && (r.1 - cgl[1].2).abs() <= 0.1 * PT_PER_MM);
    assert!(l.0 > cgl[0].0 && r.0 < cgl[1].0 && r.0 > l.0, "between the first two columns: {l:?} {r:?}");
    // The label is written once, between the tie's ends and within 3 mm above its middle.
    let words = page["words"].as_array().expect("words");
    let labels: Vec<&Value> = words.iter().filter(|w| w["text"] == "SB-4").collect();
    assert_eq!(labels.len(), 1, "{labels:?}");
    let (x0, x1, bottom) = (f(labels[0], "x0"), f(labels[0], "x1"), f(labels[0], "bottom"));
    let mid_y = (l.1 + r.1) / 2.0;
    assert!(x0 > l.0 && x1 < r.0, "label at {x0}–{x1} pt, tie {}–{} pt", l.0, r.0);
    assert!(
        bottom <= mid_y + 0.5 && mid_y - bottom <= 3.0 * PT_PER_MM,
        "label bottom {bottom} pt, tie middle {mid_y} pt"
    );
    // The key explains the line; the layout agrees.
    let chars = page["chars"].as_str().expect("chars");
    assert!(chars.contains("tie line, accepted boundaries with one correlation label"), "key entry");
    assert_eq!(layout.ties.len(), 1, "{:?}", layout.ties);
    assert!(layout.ties[0].linked && layout.ties[0].name == "SB-4");
    // Nothing pairs Ash Draw's unlabelled boundary: the counts differ (1 and 0), so no note either.
    assert!(!layout.notes.iter().any(|n| n.contains("without surface names")), "{:?}", layout.notes);
}

#[test]
fn the_demo_at_1_500_keeps_its_header_on_the_page_and_its_roses_apart() {
    // The shipped demo project (four sections 1.15–1.45 km apart) at 1:500 on A3 landscape, as
    // `aggrade panel demo.aggrade --scale 500 --paper a3 --landscape` draws it.
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    let p = aggrade_core::io::load(&root.join("demo.aggrade")).expect("demo loads").project;
    let (layout, v) = layout_and_pdf_on(&p, 500.0, "base");
    let page = &v["pages"][0];
    let (w, h) = (f(page, "width"), f(page, "height"));
    // Every word lies on the page inside its margins (12 mm = 34.0 pt; 0.5 pt for rounding).
    let margin = LayoutOptions::default().margin_mm * PT_PER_MM;
    for word in page["words"].as_array().expect("words") {
        let (x0, x1) = (f(word, "x0"), f(word, "x1"));
        assert!(x0 >= margin - 0.5 && x1 <= w - margin + 0.5, "{word} runs past the margin of a {w} pt page");
        assert!(f(word, "top") >= 0.0 && f(word, "bottom") <= h);
    }
    // Every gap is widened to the minimum at this scale: the page says it is not to scale and
    // prints no horizontal scale beside it.
    assert_eq!(layout.horizontal.widened_gaps.len(), layout.columns.len() - 1);
    let text = v["pypdf"]["text"][0].as_str().expect("text");
    assert!(text.contains("NOT to scale"), "{text}");
    assert!(!text.contains("horizontal scale 1:"), "{text}");
    assert!(!text.contains("Gaps at 1:"));
    // The roses' reference circles (grey, 130/255) in one column never overlap: their centres
    // are at least a diameter apart.
    let grey = [130.0 / 255.0; 3].map(|v: f64| (v * 10000.0).round() / 10000.0);
    let mut circles: Vec<(f64, f64, f64)> = Vec::new();
    for s in page["curves"].as_array().expect("curves") {
        if s["stroke"].as_bool() == Some(true) && colour_is(&s["stroke_colour"], grey) {
            let (x0, x1, top, bottom) = (f(s, "x0"), f(s, "x1"), f(s, "top"), f(s, "bottom"));
            if (x1 - x0 - (bottom - top)).abs() < 0.5 {
                circles.push(((x0 + x1) / 2.0, (top + bottom) / 2.0, (x1 - x0) / 2.0));
            }
        }
    }
    assert!(circles.len() >= 8, "the demo's beds with four or more readings draw roses: {circles:?}");
    for (i, a) in circles.iter().enumerate() {
        for b in &circles[i + 1..] {
            let d = ((a.0 - b.0).powi(2) + (a.1 - b.1).powi(2)).sqrt();
            assert!(d >= a.2 + b.2 - 0.05, "roses at {a:?} and {b:?} overlap");
        }
    }
}
