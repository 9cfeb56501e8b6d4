//! End-to-end checks of `aggrade export`: files written, read back by pypdf, reproducible with
//! SOURCE_DATE_EPOCH, and clear messages for bad input.

use super::harness::stderr;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn fixture() -> PathBuf {
    super::harness::fixture("export/tarn_gap.aggrade")
}

fn aggrade(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .args(args)
        .env("SOURCE_DATE_EPOCH", "1796083200")
        .output()
        .expect("run aggrade")
}

/// Page sizes (pt) of a PDF as pypdf (from PyPI, an independent reader) reports them.
fn pypdf_pages(pdf: &Path) -> Vec<(f64, f64)> {
    let out = Command::new("python3")
        .args([
            "-c",
            "import sys, pypdf\nfor p in pypdf.PdfReader(sys.argv[1]).pages: print(float(p.mediabox.width), float(p.mediabox.height))",
        ])
        .arg(pdf)
        .output()
        .expect("python3 runs (needed as the independent PDF reader)");
    assert!(out.status.success(), "pypdf could not read {}: {}", pdf.display(), stderr(&out));
    String::from_utf8_lossy(&out.stdout)
        .lines()
        .map(|l| {
            let mut it = l.split_whitespace().map(|v| v.parse::<f64>().expect("number"));
            (it.next().expect("w"), it.next().expect("h"))
        })
        .collect()
}

#[test]
fn exports_pdf_at_the_chosen_paper_and_is_reproducible() {
    let dir = tempfile::tempdir().expect("dir");
    let a = dir.path().join("a.pdf");
    let b = dir.path().join("b.pdf");
    let file = fixture();
    let file = file.to_str().expect("utf-8 path");
    for out in [&a, &b] {
        let o = aggrade(&[
            "export",
            file,
            "--pdf",
            out.to_str().expect("path"),
            "--scale",
            "50",
            "--paper",
            "a3",
            "--landscape",
        ]);
        assert!(o.status.success(), "{}", stderr(&o));
    }
    let bytes = std::fs::read(&a).expect("pdf written");
    assert_eq!(bytes, std::fs::read(&b).expect("second pdf"), "same input, same bytes");
    // ISO 216 A3 landscape: 1190.551 × 841.890 pt.
    let pages = pypdf_pages(&a);
    assert!(!pages.is_empty());
    for (w, h) in pages {
        assert!((w - 1190.551).abs() < 0.01 && (h - 841.890).abs() < 0.01, "{w} × {h}");
    }
}

#[test]
fn exports_svg_and_letter() {
    let dir = tempfile::tempdir().expect("dir");
    let file = fixture();
    let file = file.to_str().expect("path");
    // SVG defaults to one tall page.
    let svg = dir.path().join("col.svg");
    let o = aggrade(&["export", file, "--svg", svg.to_str().expect("path"), "--scale", "1:200"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&svg).expect("one svg written");
    assert!(
        text.starts_with("<?xml") && text.contains("Tarn Gap Bluff") && text.trim_end().ends_with("</svg>")
    );
    // Letter pages, PDF and SVG side by side: the SVG pages are numbered when there are several.
    let pdf = dir.path().join("col.pdf");
    let svg2 = dir.path().join("paged.svg");
    let o = aggrade(&[
        "export",
        file,
        "--pdf",
        pdf.to_str().expect("path"),
        "--svg",
        svg2.to_str().expect("path"),
        "--paper",
        "letter",
        "--scale",
        "100",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    // Letter (ANSI): 612 × 792 pt.
    let pages = pypdf_pages(&pdf);
    assert!(pages.len() >= 2, "32 m at 1:100 needs more than one Letter page");
    for (w, h) in &pages {
        assert!((w - 612.0).abs() < 0.01 && (h - 792.0).abs() < 0.01, "{w} × {h}");
    }
    for k in 1..=pages.len() {
        assert!(dir.path().join(format!("paged-{k}.svg")).exists(), "SVG page {k} missing");
    }
}

#[test]
fn bad_input_gets_a_clear_message() {
    let dir = tempfile::tempdir().expect("dir");
    let out = dir.path().join("x.pdf");
    let out = out.to_str().expect("path");
    let file = fixture();
    let file = file.to_str().expect("path");
    let cases: [(&[&str], &str); 5] = [
        (&["export", file, "--pdf", out, "--scale", "0"], "--scale"),
        (&["export", file, "--pdf", out, "--paper", "b5"], "a4, a3, letter or tall"),
        (&["export", file, "--pdf", out, "--section", "Nowhere"], "Tarn Gap Bluff"),
        (&["export", "/nonexistent/dir/file.aggrade", "--pdf", out], "/nonexistent/dir/file.aggrade"),
        (&["export", file, "--pdf", "/nonexistent/dir/out.pdf"], "/nonexistent/dir/out.pdf"),
    ];
    for (args, expect) in cases {
        let o = aggrade(args);
        assert!(!o.status.success(), "{args:?} should fail");
        let e = stderr(&o);
        assert!(e.contains(expect), "{args:?}: message {e:?} lacks {expect:?}");
        assert!(!e.contains("panicked"), "{e}");
    }
}

#[test]
fn png_is_written_at_the_asked_dpi_and_a_bad_dpi_is_refused() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("column.png");
    let fixture = fixture();
    let export_png = |dpi: &str| {
        aggrade(&[
            "export",
            fixture.to_str().expect("utf-8"),
            "--png",
            out.to_str().expect("utf-8"),
            "--dpi",
            dpi,
        ])
    };
    let o = export_png("150");
    assert!(o.status.success(), "{}", stderr(&o));
    let bytes = std::fs::read(&out).expect("written");
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n", "a PNG signature");
    // pHYs: 150 dpi = 5905.5 px/m, stored rounded to 5906, unit metre (PNG specification §11.3.5.3).
    let at = bytes.windows(4).position(|w| w == b"pHYs").expect("a pHYs chunk");
    let ppm = u32::from_be_bytes([bytes[at + 4], bytes[at + 5], bytes[at + 6], bytes[at + 7]]);
    assert_eq!((ppm, bytes[at + 12]), (5906, 1));
    let o = export_png("5");
    assert!(!o.status.success());
    assert!(stderr(&o).contains("--dpi 5 is outside 10 … 1200"), "{}", stderr(&o));
}

/// Text of every page of a PDF as pypdf (from PyPI, an independent reader) extracts it.
fn pypdf_texts(pdf: &Path) -> Vec<String> {
    let out = Command::new("python3")
        .args([
            "-c",
            "import sys, json, pypdf\nprint(json.dumps([p.extract_text() for p in pypdf.PdfReader(sys.argv[1]).pages]))",
        ])
        .arg(pdf)
        .output()
        .expect("python3 runs (needed as the independent PDF reader)");
    assert!(out.status.success(), "pypdf could not read {}: {}", pdf.display(), stderr(&out));
    serde_json::from_slice(&out.stdout).expect("a JSON list of page texts")
}

#[test]
fn a_long_section_is_written_page_by_page_into_one_pdf_and_numbered_svgs() {
    // 4,000 beds of 0.3 to 0.6 m (1,800 m): at 1:100 on A4 more than twice as many pages as the
    // writer translates at once, so the file is written in several groups.
    let dir = tempfile::tempdir().expect("dir");
    let csv = dir.path().join("long.csv");
    let mut rows = String::from("thickness_m,lithology,grain_base,grain_top,base_contact\n");
    let kinds = [("mudstone", "clay"), ("sandstone", "medium sand"), ("siltstone", "silt")];
    for k in 0..4000 {
        let (lith, grain) = kinds[k % 3];
        rows.push_str(&format!("{},{lith},{grain},{grain},sharp\n", 0.3 + 0.1 * (k % 4) as f64));
    }
    std::fs::write(&csv, rows).expect("write beds");
    let pdf = dir.path().join("long.pdf");
    let svg = dir.path().join("long.svg");
    let o = aggrade(&[
        "export",
        csv.to_str().expect("path"),
        "--pdf",
        pdf.to_str().expect("path"),
        "--svg",
        svg.to_str().expect("path"),
        "--paper",
        "a4",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let said = stderr(&o);
    let texts = pypdf_texts(&pdf);
    let n = texts.len();
    assert!(n > 2 * aggrade_core::export::PAGES_PER_GROUP, "{n} pages");
    assert!(said.contains(&format!("({n} pages, scale 1:100)")), "{said}");
    // Every page in order, with its own number and the total, and the review caution.
    for (k, t) in texts.iter().enumerate() {
        assert!(t.contains(&format!("page {} of {n}", k + 1)), "page {}: {t:.300}", k + 1);
        assert!(t.replace('\n', " ").contains("Interpretations are candidates for expert review"));
    }
    // ISO 216 A4: 595.276 × 841.890 pt, every page.
    let sizes = pypdf_pages(&pdf);
    assert_eq!(sizes.len(), n);
    assert!(sizes.iter().all(|(w, h)| (w - 595.276).abs() < 0.01 && (h - 841.890).abs() < 0.01));
    // The SVG pages: one file per PDF page, each a whole document with its own page number.
    for k in 1..=n {
        let page = std::fs::read_to_string(dir.path().join(format!("long-{k}.svg"))).expect("SVG page");
        assert!(page.starts_with("<?xml") && page.trim_end().ends_with("</svg>"), "SVG page {k}");
        assert!(page.contains(&format!(">page {k} of {n}</text>")), "SVG page {k} lacks its number");
    }
    assert!(!dir.path().join(format!("long-{}.svg", n + 1)).exists());
}
