//! With no display the `aggrade` binary still does the main job: it writes the interpreted
//! column of the file (or the demo) to a PDF and says where. The PDF is checked with an
//! independent reader (pypdf from PyPI).

use std::process::Command;

/// Page count, first page size in points, and whether the text holds `needle`, read by pypdf.
fn pypdf_facts(pdf: &std::path::Path, needle: &str) -> (usize, f64, f64, bool) {
    let script = r#"
import sys
try:
    from pypdf import PdfReader
except ImportError:
    print("MISSING pypdf"); sys.exit(3)
r = PdfReader(sys.argv[1])
p = r.pages[0]
text = "".join(pg.extract_text() or "" for pg in r.pages)
print(len(r.pages), float(p.mediabox.width), float(p.mediabox.height), sys.argv[2] in text)
"#;
    let out =
        Command::new("python3").args(["-c", script]).arg(pdf).arg(needle).output().expect("python3 runs");
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        !stdout.contains("MISSING"),
        "pypdf is not installed: pip install pypdf (the reference reader this test needs)"
    );
    assert!(out.status.success(), "pypdf failed: {}", String::from_utf8_lossy(&out.stderr));
    let f: Vec<&str> = stdout.split_whitespace().collect();
    assert_eq!(f.len(), 4, "unexpected pypdf output {stdout:?}");
    (f[0].parse().expect("count"), f[1].parse().expect("w"), f[2].parse().expect("h"), f[3] == "True")
}

#[test]
fn without_a_display_the_binary_writes_the_column_as_pdf() {
    let tmp = tempfile::tempdir().expect("temp dir");
    let demo = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade");
    let out = Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .arg(&demo)
        .env_remove("DISPLAY")
        .env_remove("WAYLAND_DISPLAY")
        .env("TMPDIR", tmp.path())
        .env("AGGRADE_DATA_DIR", tmp.path())
        .output()
        .expect("binary runs");
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(out.status.success(), "exit {:?}: {}", out.status, String::from_utf8_lossy(&out.stderr));
    let pdf = tmp.path().join("aggrade-column.pdf");
    assert!(stdout.contains(&pdf.display().to_string()), "says where: {stdout}");
    let project = aggrade_core::io::load(&demo).expect("demo readable").project;
    let name = project.sections[0].name.clone();
    let (pages, w_pt, h_pt, has_name) = pypdf_facts(&pdf, &name);
    assert!(pages >= 1);
    // ISO 216 A4 is 210 × 297 mm = 595.276 × 841.890 pt (1 pt = 1/72 in).
    assert!((w_pt - 595.276).abs() < 0.01 && (h_pt - 841.890).abs() < 0.01, "{w_pt} × {h_pt}");
    assert!(has_name, "section name {name:?} not found in the PDF text");
}

#[test]
fn without_a_display_a_bad_file_fails_with_its_name_and_no_panic() {
    let tmp = tempfile::tempdir().expect("temp dir");
    let bad = tmp.path().join("torn.aggrade");
    std::fs::write(&bad, "{\"format_version\": 1, \"sections\": [").expect("write");
    let out = Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .arg(&bad)
        .env_remove("DISPLAY")
        .env_remove("WAYLAND_DISPLAY")
        .env("TMPDIR", tmp.path())
        .output()
        .expect("binary runs");
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(!out.status.success());
    assert!(stderr.contains("torn.aggrade"), "{stderr}");
    assert!(!stderr.contains("panicked"), "{stderr}");
}
