//! SVG output parsed by an independent XML parser (Python's xml.etree) and compared with the
//! PDF of the same layout as read by pdfplumber: the same shapes and the same text.

use aggrade_core::export::{write_pdf, write_svg, PdfInfo};
use aggrade_core::layout::sample::{sample_interpretation, sample_section};
use aggrade_core::layout::{pages, Item, LayoutOptions, Paper, PrintMeta};
use serde_json::Value;
use std::path::Path;
use std::process::Command;

fn probe(script: &str, file: &Path) -> Value {
    let script = Path::new(env!("CARGO_MANIFEST_DIR")).join("data/export").join(script);
    let out = Command::new("python3")
        .arg(&script)
        .arg(file)
        .output()
        .unwrap_or_else(|e| panic!("cannot run python3 (needed as the independent reader): {e}"));
    assert!(out.status.success(), "{} failed: {}", script.display(), String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("probe prints JSON")
}

fn sorted_chars(s: &str) -> Vec<char> {
    let mut v: Vec<char> = s.chars().filter(|c| !c.is_whitespace()).collect();
    v.sort();
    v
}

#[test]
fn svg_parses_and_matches_the_pdf() {
    let s = sample_section();
    let i = sample_interpretation(&s);
    let opts = LayoutOptions { paper: Paper::TallSingle, show_rejected: true, ..Default::default() };
    let p = pages(&s, &i, &opts, &PrintMeta { printed_on: "2026-12-01".into(), subtitle: String::new() });
    assert_eq!(p.len(), 1);
    let page = &p[0];
    let dir = tempfile::tempdir().expect("dir");
    let svg_path = dir.path().join("page.svg");
    std::fs::write(&svg_path, write_svg(page)).expect("write svg");
    let svg = probe("svg_probe.py", &svg_path);
    assert_eq!(svg["root"], "svg");
    // The SVG is sized in millimetres like the page (user unit 1 mm).
    assert_eq!(svg["width"].as_str(), Some(format!("{}mm", page.width_mm).as_str()));

    let count = |f: fn(&Item) -> bool| page.items.iter().filter(|it| f(it)).count() as u64;
    let rects = count(|it| matches!(it, Item::Rect { .. }));
    let polygons = count(|it| matches!(it, Item::Polygon { .. }));
    let polylines = count(|it| matches!(it, Item::Polyline { .. }));
    let circles = count(|it| matches!(it, Item::Circle { .. }));
    let texts = count(|it| matches!(it, Item::Text { .. }));
    let c = &svg["counts"];
    // One extra rect: the white page background.
    assert_eq!(c["rect"].as_u64(), Some(rects + 1));
    assert_eq!(c["polygon"].as_u64().unwrap_or(0), polygons);
    assert_eq!(c["polyline"].as_u64().unwrap_or(0), polylines);
    assert_eq!(c["circle"].as_u64().unwrap_or(0), circles);
    assert_eq!(c["text"].as_u64(), Some(texts));
    assert!(polygons > 20 && polylines > 100 && circles > 10 && texts > 50, "{c}");

    // The PDF of the same page, read by pdfplumber: one drawn path per shape item, same glyphs.
    let pdf_path = dir.path().join("page.pdf");
    let info = PdfInfo { title: s.name.clone(), author: String::new(), creation_date: 0 };
    std::fs::write(&pdf_path, write_pdf(&p, &info)).expect("write pdf");
    let pdf = probe("pdf_probe.py", &pdf_path);
    let pg = &pdf["pages"][0];
    let shapes = pg["rects"].as_array().map_or(0, Vec::len) as u64
        + pg["curves"].as_array().map_or(0, Vec::len) as u64
        + pg["lines"].as_u64().unwrap_or(0);
    assert_eq!(shapes, rects + polygons + polylines + circles, "PDF paths vs SVG shapes");
    let svg_text: String = svg["texts"].as_array().expect("texts").iter().filter_map(Value::as_str).collect();
    let pdf_text = pg["chars"].as_str().expect("chars");
    assert_eq!(sorted_chars(pdf_text), sorted_chars(&svg_text), "same characters in PDF and SVG");
    assert!(svg_text.contains("Tarn Gap Bluff") && svg_text.contains("rej. weak"));
}
