//! The field record on the printed column, read back from the PDF by an independent reader
//! (pdfplumber from PyPI, through `data/export/pdf_probe.py`): sample ids beside the column,
//! the lithofacies codes (the geologist's, and suggested ones marked "?"), and the header's
//! bedding attitude, method, uncertainty and GPS fixes with their datum.

use aggrade_core::export::{write_pdf_to, PdfInfo};
use aggrade_core::layout::sample::{sample_interpretation, sample_section};
use aggrade_core::layout::{page_stream, LayoutOptions, PrintMeta};
use aggrade_core::model::{BeddingAttitude, FaciesCode, FixRole, GpsFix, MeasuringMethod, Sample, Section};
use serde_json::Value;
use std::path::Path;
use std::process::Command;

fn probe(file: &Path) -> Value {
    let script = Path::new(env!("CARGO_MANIFEST_DIR")).join("data/export/pdf_probe.py");
    let out = Command::new("python3")
        .arg(&script)
        .arg(file)
        .output()
        .unwrap_or_else(|e| panic!("cannot run python3 (needed as the independent PDF reader): {e}"));
    assert!(out.status.success(), "{} failed: {}", script.display(), String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("probe prints JSON")
}

/// The demo section with a field record: a Jacob's staff, ±0.05 m, bedding given as strike 305°
/// dip 12° (right-hand rule), a top fix, samples "TG-Q1" … "TG-Q9" on beds 3–5 and the
/// geologist's own code on bed 4.
fn recorded() -> Section {
    let mut s = sample_section();
    s.method = Some(MeasuringMethod::JacobsStaff);
    s.thickness_uncertainty_m = Some(0.05);
    s.bedding = Some(BeddingAttitude::from_strike_rhr(305.0, 12.0));
    s.fixes = vec![GpsFix {
        role: FixRole::Top,
        height_m: 32.0,
        lat_deg: -31.41402,
        lon_deg: 148.20577,
        elevation_m: Some(344.0),
        note: String::new(),
    }];
    let mut n = 0;
    for bed in s.beds.iter_mut().skip(2).take(3) {
        for k in 0..3 {
            n += 1;
            bed.samples.push(Sample {
                id: format!("TG-Q{n}"),
                kind: None,
                height_in_bed_m: Some(0.3 + 0.6 * k as f64),
            });
        }
    }
    s.beds[3].facies = Some(FaciesCode::Gt);
    s
}

/// The text pdfplumber finds on every page of the column printed with `opts`.
fn printed_text(s: &Section, opts: &LayoutOptions) -> String {
    let interp = sample_interpretation(s);
    let meta = PrintMeta { printed_on: "2026-12-03".into(), subtitle: String::new() };
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("record.pdf");
    let file = std::fs::File::create(&path).expect("create pdf");
    let info = PdfInfo { title: s.name.clone(), author: String::new(), creation_date: 1_790_000_000 };
    write_pdf_to(std::io::BufWriter::new(file), page_stream(s, &interp, opts, &meta), &info)
        .expect("write pdf");
    let v = probe(&path);
    v["pages"]
        .as_array()
        .expect("pages")
        .iter()
        .map(|p| p["text"].as_str().unwrap_or("").to_string())
        .collect::<Vec<_>>()
        .join("\n")
}

#[test]
fn sample_ids_facies_codes_and_the_bedding_attitude_are_printed() {
    let s = recorded();
    for scale in [100.0, 500.0] {
        let opts = LayoutOptions { scale_denominator: scale, ..Default::default() };
        let text = printed_text(&s, &opts);
        // Header: method, uncertainty, attitude (dip direction = strike + 90° by the right-hand
        // rule; common practice), GPS with its datum.
        for needle in [
            "measured with a Jacob's staff",
            "each thickness \u{b1}0.05 m",
            "bedding dip 12\u{b0} toward 035\u{b0}",
            "strike/dip 305/12",
            "GPS (WGS84): base 31.41527\u{b0} S, 148.20311\u{b0} E",
            "top 31.41402\u{b0} S, 148.20577\u{b0} E, elev. 344 m",
        ] {
            assert!(text.contains(needle), "1:{scale}: {needle:?} not found by pdfplumber:\n{text}");
        }
        // The geologist's own code on bed 4 (Gt, whatever the rules would say), and the rules'
        // suggestion for the trough cross-bedded sandstone of bed 5 (St, Miall 1996) with "?".
        assert!(text.contains("Gt"), "1:{scale}: the given code");
        // (Once in the legend's sample, the rest on the column.)
        assert!(text.matches("St?").count() >= 2, "1:{scale}: a suggested code with its '?'");
        assert!(
            text.contains("suggested code: for your review"),
            "1:{scale}: the legend says what '?' means"
        );
        // Sample ids: at 1:100 every id in full; at 1:500 (beds 2–3 mm apart) the ids are pooled
        // but every label's first id is there.
        if scale == 100.0 {
            for k in 1..=9 {
                assert!(text.contains(&format!("TG-Q{k}")), "TG-Q{k} missing at 1:100:\n{text}");
            }
        } else {
            assert!(text.contains("TG-Q1"), "the first sample at 1:500");
        }
    }
    // Turned off, neither the codes' track nor the ids print.
    let off = LayoutOptions { show_facies: false, show_sample_ids: false, ..Default::default() };
    let text = printed_text(&s, &off);
    assert!(!text.contains("TG-Q") && !text.contains("St?") && !text.contains("lithofacies"), "{text}");
    assert!(text.contains("bedding dip 12\u{b0}"), "the header does not depend on the marks");
}
