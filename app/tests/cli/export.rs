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
