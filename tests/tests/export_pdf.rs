//! Printed columns checked by independent PDF readers (pypdf and pdfplumber from PyPI): paper
//! sizes, true vertical scale, searchable text, reproducible bytes.

use aggrade_core::export::{write_pdf, write_pdf_in_groups, write_pdf_to, PdfInfo, PAGES_PER_GROUP};
use aggrade_core::layout::sample::{sample_interpretation, sample_section};
use aggrade_core::layout::{page_stream, pages, LayoutOptions, Orientation, Paper, PrintMeta};
use aggrade_core::model::{Bed, BedId, GrainSize, Lithology, Section, WentworthClass};
use aggrade_core::rules::Interpretation;
use serde_json::Value;
use std::path::Path;
use std::process::Command;

/// Run a probe script from tests/data/export on a file; fails clearly if Python or a library is missing.
fn probe(script: &str, file: &Path) -> Value {
    let script = Path::new(env!("CARGO_MANIFEST_DIR")).join("data/export").join(script);
    let out = Command::new("python3")
        .arg(&script)
        .arg(file)
        .output()
        .unwrap_or_else(|e| panic!("cannot run python3 (needed as the independent PDF reader): {e}"));
    assert!(out.status.success(), "{} failed: {}", script.display(), String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("probe prints JSON")
}

fn pdf_of(section: &Section, interp: &Interpretation, opts: &LayoutOptions) -> (Vec<u8>, tempfile::TempDir) {
    let meta = PrintMeta { printed_on: "2026-12-01".into(), subtitle: String::new() };
    let p = pages(section, interp, opts, &meta);
    let info = PdfInfo { title: section.name.clone(), author: String::new(), creation_date: 1_790_000_000 };
    (write_pdf(&p, &info), tempfile::tempdir().expect("temp dir"))
}

fn probe_pdf(bytes: &[u8], dir: &tempfile::TempDir) -> Value {
    let path = dir.path().join("out.pdf");
    std::fs::write(&path, bytes).expect("write pdf");
    probe("pdf_probe.py", &path)
}

/// An empty interpretation for sections where only the drawing matters.
fn no_interp(section: &Section) -> Interpretation {
    Interpretation {
        section: section.name.clone(),
        total_thickness_m: section.total_thickness_m(),
        exposed_thickness_m: section.exposed_thickness_m(),
        channel_proportion: None,
        channel_proportion_bounds: None,
        elements: Vec::new(),
        storeys: Vec::new(),
        channel_bodies: Vec::new(),
        paleosols: Vec::new(),
        interval_proportions: Vec::new(),
        proportion_curve: Vec::new(),
        accommodation: Vec::new(),
        sequence_boundary_candidates: Vec::new(),
        unlisted_candidates: 0,
        cut_heights: Vec::new(),
        cuts_are_accepted: false,
        params: aggrade_core::rules::RuleParams::default(),
        caution: aggrade_core::REVIEW_CAUTION.into(),
    }
}

#[test]
fn paper_sizes_follow_iso_216_and_ansi() {
    let s = sample_section();
    let i = sample_interpretation(&s);
    // ISO 216: A4 210 × 297 mm, A3 297 × 420 mm; ANSI Letter 8.5 × 11 in. In PDF points
    // (1/72 in): A4 595.276 × 841.890, A3 841.890 × 1190.551, Letter 612 × 792 (1 in = 25.4 mm exactly; ISO 32000-1 §8.3.2.3 default user unit 1/72 in).
    let cases = [
        (Paper::A4, Orientation::Portrait, 595.276, 841.890),
        (Paper::A4, Orientation::Landscape, 841.890, 595.276),
        (Paper::A3, Orientation::Portrait, 841.890, 1190.551),
        (Paper::Letter, Orientation::Portrait, 612.0, 792.0),
        (Paper::Letter, Orientation::Landscape, 792.0, 612.0),
    ];
    for (paper, orientation, w_pt, h_pt) in cases {
        let opts = LayoutOptions { paper, orientation, ..Default::default() };
        let (pdf, dir) = pdf_of(&s, &i, &opts);
        let v = probe_pdf(&pdf, &dir);
        let sizes = v["pypdf"]["pages"].as_array().expect("pages");
        assert!(!sizes.is_empty());
        for size in sizes {
            let (w, h) = (size[0].as_f64().expect("w"), size[1].as_f64().expect("h"));
            assert!(
                (w - w_pt).abs() < 0.01 && (h - h_pt).abs() < 0.01,
                "{paper:?} {orientation:?}: {w} × {h} pt"
            );
        }
    }
}

/// Fill colour of a bed in the PDF, as pdfplumber reports it (0–1 floats).
fn tint(lith: Lithology) -> Vec<f64> {
    let c = aggrade_core::layout::lithology_tint(lith);
    [c.0, c.1, c.2].iter().map(|v| (f64::from(*v) / 255.0 * 10000.0).round() / 10000.0).collect()
}

/// The drawn height (pt) of every filled shape in a colour, as pdfplumber measures it.
fn filled_heights(page: &Value, colour: &[f64]) -> Vec<f64> {
    let mut v = Vec::new();
    for kind in ["rects", "curves"] {
        for s in page[kind].as_array().expect("shapes") {
            let c: Vec<f64> = s["fill_colour"]
                .as_array()
                .map(|a| a.iter().filter_map(Value::as_f64).collect())
                .unwrap_or_default();
            if s["fill"].as_bool() == Some(true)
                && c.len() == 3
                && c.iter().zip(colour).all(|(a, b)| (a - b).abs() < 0.003)
            {
                v.push(s["bottom"].as_f64().expect("bottom") - s["top"].as_f64().expect("top"));
            }
        }
    }
    v
}

#[test]
fn beds_are_drawn_at_true_scale() {
    // A 2 m sandstone between mudstones; at 1:S it must be 2000/S mm tall (±0.1 mm).
    // 1 mm = 72/25.4 pt (1 in = 25.4 mm exactly; 1 pt = 1/72 in): 2 m at 1:50 is 113.386 pt.
    let mut s = Section::new("Scale check");
    let mud = Some(GrainSize::Class(WentworthClass::Clay));
    s.beds = vec![
        Bed::new(BedId(1), 1.0, Lithology::Mudstone, mud),
        Bed::new(BedId(2), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand))),
        Bed::new(BedId(3), 0.7, Lithology::Mudstone, mud),
    ]
    .into();
    let i = no_interp(&s);
    for scale in [20.0, 50.0, 100.0, 200.0, 500.0, 137.0] {
        let opts = LayoutOptions { scale_denominator: scale, ..Default::default() };
        let (pdf, dir) = pdf_of(&s, &i, &opts);
        let v = probe_pdf(&pdf, &dir);
        let page = &v["pages"][0];
        let heights = filled_heights(page, &tint(Lithology::Sandstone));
        // The legend swatch is also sandstone-coloured (3.8 mm tall); the bed is the tallest.
        let bed_pt = heights.iter().copied().fold(0.0, f64::max);
        let expected_pt = 2.0 * 1000.0 / scale * 72.0 / 25.4;
        if scale == 50.0 {
            assert!(
                (expected_pt - 113.386).abs() < 0.001,
                "2 m at 1:50 = 40 mm = 113.386 pt (40 / 25.4 × 72)"
            );
        }
        assert!(
            (bed_pt - expected_pt).abs() <= 0.1 * 72.0 / 25.4,
            "1:{scale}: sandstone drawn {bed_pt:.3} pt tall, expected {expected_pt:.3} pt ({heights:?})"
        );
        // The thicker-than-legend mudstone bed below: 1 m.
        let mud_pt = filled_heights(page, &tint(Lithology::Mudstone));
        let one_m = 1000.0 / scale * 72.0 / 25.4;
        if one_m > 12.0 {
            assert!(
                mud_pt.iter().any(|h| (h - one_m).abs() <= 0.2835),
                "1:{scale}: no 1 m mudstone in {mud_pt:?}"
            );
        }
    }
}

#[test]
fn text_is_embedded_and_searchable() {
    let s = sample_section();
    let i = sample_interpretation(&s);
    let (pdf, dir) = pdf_of(&s, &i, &LayoutOptions::default());
    let v = probe_pdf(&pdf, &dir);
    let all: String =
        v["pages"].as_array().expect("pages").iter().map(|p| p["chars"].as_str().unwrap_or("")).collect();
    let first = v["pages"][0]["text"].as_str().expect("text");
    for needle in ["Tarn Gap Bluff", "scale 1:100", "Legend", "sandstone", "page 1 of"] {
        assert!(first.contains(needle), "{needle:?} not found by pdfplumber in page 1 text:\n{first}");
    }
    // Axis labels at 1 m steps (1:100 → 10 mm per m) are findable.
    for label in ["10", "20", "30"] {
        assert!(all.contains(label), "axis label {label}");
    }
    // φ and the minus sign come out as themselves, not "?" (font embedded with a Unicode map).
    assert!(all.contains('φ'), "φ missing from extracted text");
    assert!(all.contains('−'), "U+2212 minus missing from extracted text");
    assert!(!all.contains('?') || s.name.contains('?') || all.contains("SB?"), "no replacement marks");
    // The caution is on every page (pypdf's own text extraction, a second reader).
    let caution_start = "Interpretations are candidates for expert review";
    for (k, t) in v["pypdf"]["text"].as_array().expect("pypdf text").iter().enumerate() {
        let t = t.as_str().unwrap_or("").replace('\n', " ");
        assert!(t.contains(caution_start), "page {} lacks the caution: {t}", k + 1);
    }
}

#[test]
fn same_input_same_bytes() {
    let s = sample_section();
    let i = sample_interpretation(&s);
    let (a, _d1) = pdf_of(&s, &i, &LayoutOptions::default());
    let (b, _d2) = pdf_of(&s, &i, &LayoutOptions::default());
    assert!(a.len() > 1000);
    assert!(a == b, "two exports of the same section differ");
    assert!(a.starts_with(b"%PDF-"));
    // For looking at the output by eye: AGGRADE_PREVIEW_DIR=/some/dir keeps a copy.
    if let Some(dir) = std::env::var_os("AGGRADE_PREVIEW_DIR") {
        std::fs::write(Path::new(&dir).join("sample-a4.pdf"), &a).expect("write preview");
        let opts = LayoutOptions { paper: Paper::TallSingle, scale_denominator: 50.0, ..Default::default() };
        let (t, _d) = pdf_of(&s, &i, &opts);
        std::fs::write(Path::new(&dir).join("sample-tall-50.pdf"), &t).expect("write preview");
    }
}

#[test]
fn long_section_continues_over_pages_with_every_bed() {
    let (s, i) = aggrade_core::layout::sample::generated_section(400);
    let opts = LayoutOptions { scale_denominator: 100.0, ..Default::default() };
    let meta = PrintMeta::default();
    let p = pages(&s, &i, &opts, &meta);
    assert!(p.len() > 3, "{} pages", p.len());
    // Heights covered by the segments join up from 0 to the top without gaps or overlaps.
    let segs: Vec<_> = p.iter().flat_map(|pg| pg.segments.iter()).collect();
    assert_eq!(segs[0].base_m, 0.0);
    for w in segs.windows(2) {
        assert_eq!(w[0].top_m, w[1].base_m);
    }
    assert!((segs[segs.len() - 1].top_m - s.total_thickness_m()).abs() < 1e-9);
    // Every bed is drawn; a bed drawn twice must straddle a segment boundary.
    let mut seen = vec![0usize; s.beds.len()];
    for seg in &segs {
        for b in &seg.bed_boxes {
            seen[b.bed_index] += 1;
        }
    }
    let bases = s.base_heights_m();
    for (k, n) in seen.iter().enumerate() {
        assert!(*n >= 1, "bed {k} dropped");
        if *n > 1 {
            let top = bases[k] + s.beds[k].thickness_m;
            assert!(segs.iter().any(|g| g.top_m > bases[k] && g.top_m < top), "bed {k} duplicated");
        }
    }
    let (pdf, dir) = {
        let info = PdfInfo { title: s.name.clone(), author: String::new(), creation_date: 0 };
        (write_pdf(&p, &info), tempfile::tempdir().expect("dir"))
    };
    let v = probe_pdf(&pdf, &dir);
    assert_eq!(v["pages"].as_array().expect("pages").len(), p.len());
    let last = v["pages"][p.len() - 1]["text"].as_str().expect("text");
    assert!(last.contains(&format!("page {} of {}", p.len(), p.len())), "{last}");
}

#[test]
fn a_long_export_is_written_in_groups_of_pages_that_read_as_one_document() {
    // The writer translates a group of pages at a time and writes each group before the next;
    // groups of 4 make this section's pages many groups, the last one short. The font is
    // written once, after the last page, subset to what every page shows, so the group size
    // changes nothing in the file.
    let (s, i) = aggrade_core::layout::sample::generated_section(2_000);
    let p = pages(&s, &i, &LayoutOptions::default(), &PrintMeta::default());
    assert!(p.len() > 30 && !p.len().is_multiple_of(4), "{} pages", p.len());
    assert!(p.len() > PAGES_PER_GROUP, "more than one group at the default size");
    let info = PdfInfo { title: "Long export".into(), author: "A. Logger".into(), creation_date: 0 };
    let pdf = write_pdf_in_groups(&p, &info, 4);
    assert!(pdf == write_pdf_in_groups(&p, &info, 4), "two exports of the same pages differ");
    assert!(pdf == write_pdf(&p, &info), "the group size changes the bytes");
    assert!(pdf == write_pdf_in_groups(&p, &info, 1), "one page per group changes the bytes");
    // Pages laid out and written one at a time (a layout iterator into a file) give the same
    // bytes as all pages laid out first.
    let dir = tempfile::tempdir().expect("dir");
    let streamed_path = dir.path().join("streamed.pdf");
    let file = std::io::BufWriter::new(std::fs::File::create(&streamed_path).expect("create"));
    let opts = LayoutOptions::default();
    let meta = PrintMeta::default();
    let stream = page_stream(&s, &i, &opts, &meta);
    assert_eq!(stream.page_count(), p.len(), "the page count is known before any page is drawn");
    let n = write_pdf_to(file, stream, &info).expect("write");
    assert_eq!(n, p.len());
    assert!(std::fs::read(&streamed_path).expect("read") == pdf, "streamed and collected pages differ");
    let v = probe_pdf(&pdf, &dir);
    // pypdf and pdfplumber both see every page, in order, at the layout's paper size, with its
    // text readable through the one embedded font.
    let plumber = v["pages"].as_array().expect("pages");
    let pypdf_text = v["pypdf"]["text"].as_array().expect("pypdf text");
    let pypdf_sizes = v["pypdf"]["pages"].as_array().expect("pypdf sizes");
    assert_eq!((plumber.len(), pypdf_text.len(), pypdf_sizes.len()), (n, n, n));
    for (k, page) in plumber.iter().enumerate() {
        let footer = format!("page {} of {n}", k + 1);
        let text = page["text"].as_str().expect("text");
        assert!(text.contains(&footer), "page {}: {text:.200}", k + 1);
        assert!(pypdf_text[k].as_str().is_some_and(|t| t.contains(&footer)), "pypdf, page {}", k + 1);
        // The segment heads: the height range each page shows, as the layout placed it.
        for seg in &p[k].segments {
            let head = format!("{:.2}\u{2013}{:.2} m", seg.base_m, seg.top_m);
            assert!(text.contains(&head), "page {}: {head} not in {text:.300}", k + 1);
        }
        let (w_pt, h_pt) = (p[k].width_mm * 72.0 / 25.4, p[k].height_mm * 72.0 / 25.4);
        for (w, h) in [
            (page["width"].as_f64().expect("w"), page["height"].as_f64().expect("h")),
            (pypdf_sizes[k][0].as_f64().expect("w"), pypdf_sizes[k][1].as_f64().expect("h")),
        ] {
            // ISO 216 A4: 210 × 297 mm = 595.276 × 841.890 pt.
            assert!((w - w_pt).abs() < 0.01 && (h - h_pt).abs() < 0.01, "page {}: {w} × {h} pt", k + 1);
            assert!((w - 595.276).abs() < 0.01 && (h - 841.890).abs() < 0.01);
        }
    }
}

#[test]
fn sample_fixture_is_the_demo_section() {
    // tests/data/export/tarn_gap.aggrade is the invented demo section as a project file, used by
    // the command-line tests; regenerate with UPDATE_FIXTURES=1 when the demo changes.
    let project = aggrade_core::model::Project::new(vec![sample_section()]);
    let json = serde_json::to_string_pretty(&project).expect("serialises");
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("data/export/tarn_gap.aggrade");
    if std::env::var_os("UPDATE_FIXTURES").is_some() {
        std::fs::write(&path, &json).expect("write fixture");
    }
    let on_disk = std::fs::read_to_string(&path).expect("fixture present (UPDATE_FIXTURES=1 writes it)");
    let back: aggrade_core::model::Project = serde_json::from_str(&on_disk).expect("fixture parses");
    assert_eq!(back, project, "fixture differs from the demo section");
}
