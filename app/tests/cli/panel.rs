//! `aggrade panel` end to end on the demo project: a one-page A3 landscape PDF read back by
//! pypdf/pdfplumber (PyPI), reproducible bytes, SVG output, and clear errors.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn demo() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade")
}

fn aggrade(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .args(args)
        .env_remove("SOURCE_DATE_EPOCH")
        .output()
        .expect("run aggrade")
}

/// Page size (pt) and text of a PDF by pypdf and pdfplumber.
fn read_pdf(path: &Path) -> (f64, f64, usize, String) {
    let script = r#"
import json, sys
try:
    import pypdf, pdfplumber
except ImportError as e:
    print(f"missing Python reference library: {e}; install with pip install pypdf pdfplumber", file=sys.stderr)
    sys.exit(3)
r = pypdf.PdfReader(sys.argv[1])
box = r.pages[0].mediabox
with pdfplumber.open(sys.argv[1]) as pdf:
    chars = "".join(c["text"] for c in pdf.pages[0].chars)
print(json.dumps([float(box.width), float(box.height), len(r.pages), chars]))
"#;
    let out = Command::new("python3").arg("-c").arg(script).arg(path).output().expect("run python3");
    assert!(out.status.success(), "PDF reader failed: {}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    (
        v[0].as_f64().expect("w"),
        v[1].as_f64().expect("h"),
        v[2].as_u64().expect("n") as usize,
        v[3].as_str().expect("chars").to_string(),
    )
}

#[test]
fn demo_panel_on_a3_landscape() {
    let dir = tempfile::tempdir().expect("tmp");
    let pdf = dir.path().join("panel.pdf");
    let pdf_s = pdf.to_str().expect("utf-8 path");
    let demo = demo();
    let demo_s = demo.to_str().expect("utf-8 path");
    let args = [
        "panel",
        demo_s,
        "--datum",
        "SB-1",
        "--pdf",
        pdf_s,
        "--scale",
        "500",
        "--paper",
        "a3",
        "--landscape",
    ];
    let out = aggrade(&args);
    assert!(out.status.success(), "stderr: {}", String::from_utf8_lossy(&out.stderr));
    let said = String::from_utf8_lossy(&out.stderr);
    assert!(said.contains(&format!("wrote {pdf_s}")), "says where the panel went: {said}");
    // ISO 216 A3 landscape: 420 × 297 mm = 1190.551 × 841.890 pt.
    let (w, h, n, chars) = read_pdf(&pdf);
    assert_eq!(n, 1);
    assert!((w - 1190.551).abs() < 0.01 && (h - 841.890).abs() < 0.01, "{w} × {h} pt");
    for name in ["Corrie Wash", "Halloway Bluff", "Sedge Creek", "Pell Butte"] {
        assert!(chars.contains(name), "{name} on the page");
    }
    // The demo places Corrie Wash, which has SB-2 but no SB-1, first: it is flagged.
    assert!(chars.contains("NO SB-1: hung on base"));
    assert!(chars.contains("datum: SB-1"));
    assert!(chars.contains("vertical scale 1:500"));
    assert!(chars.contains("Interpretations are candidates for expert review"));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("Corrie Wash: has no SB-1"), "note on stderr: {stderr}");

    // Same input, same bytes (fixed creation date).
    let again = dir.path().join("again.pdf");
    let mut args2 = args;
    args2[5] = again.to_str().expect("utf-8 path");
    assert!(aggrade(&args2).status.success());
    assert_eq!(std::fs::read(&pdf).expect("pdf"), std::fs::read(&again).expect("pdf"), "reproducible bytes");
}

#[test]
fn svg_output_and_base_datum() {
    let dir = tempfile::tempdir().expect("tmp");
    let svg = dir.path().join("panel.svg");
    let demo = demo();
    let out = aggrade(&[
        "panel",
        demo.to_str().expect("path"),
        "--svg",
        svg.to_str().expect("path"),
        "--scale",
        "1000",
    ]);
    assert!(out.status.success(), "stderr: {}", String::from_utf8_lossy(&out.stderr));
    let text = std::fs::read_to_string(&svg).expect("svg");
    assert!(text.contains("<svg") && text.contains("Sedge Creek"));
}

#[test]
fn unknown_datum_lists_the_surfaces() {
    let dir = tempfile::tempdir().expect("tmp");
    let pdf = dir.path().join("x.pdf");
    let demo = demo();
    let out = aggrade(&[
        "panel",
        demo.to_str().expect("path"),
        "--datum",
        "SB-7",
        "--pdf",
        pdf.to_str().expect("path"),
    ]);
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("demo.aggrade") && err.contains("\"SB-7\""), "{err}");
    assert!(err.contains("\"SB-1\"") && err.contains("\"SB-2\"") && err.contains("\"base\""), "{err}");
    assert!(!pdf.exists(), "nothing written on error");
}

#[test]
fn bad_arguments_are_refused_clearly() {
    let demo = demo();
    let d = demo.to_str().expect("path");
    let out = aggrade(&["panel", d, "--pdf", "/nonexistent-dir/x.pdf", "--scale", "0"]);
    assert!(!out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("--scale 0"));
    let out = aggrade(&["panel", d, "--pdf", "x.pdf", "--paper", "b5"]);
    assert!(String::from_utf8_lossy(&out.stderr).contains("valid are a4, a3, letter, tall"));
    // Neither --pdf nor --svg: clap says one is required.
    let out = aggrade(&["panel", d]);
    assert!(!out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("--pdf"));
}
