//! A section of thousands of beds on the terminal: `aggrade interpret` and `aggrade bodies`
//! show long lists by their first and last entries and say where the full list goes.

use super::harness::{aggrade, stderr, stdout};

/// A bed table of the invented demo section Sedge Creek (34 beds: paleosols, incised channel
/// bodies, splays) logged `times` times over, one above the other: hundreds of channel bodies,
/// candidates and intervals between strong candidates.
fn long_table(dir: &std::path::Path, times: usize) -> std::path::PathBuf {
    let demo = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade");
    let one = dir.join("sedge.csv");
    let o = aggrade(&[
        "convert",
        demo.to_str().expect("path"),
        "--section",
        "Sedge Creek",
        one.to_str().expect("path"),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&one).expect("converted table");
    let mut lines = text.lines();
    let header = lines.next().expect("a header row");
    let beds: Vec<&str> = lines.collect();
    let mut rows = vec![header];
    for _ in 0..times {
        rows.extend(beds.iter().copied());
    }
    let csv = dir.join("long.csv");
    std::fs::write(&csv, rows.join("\n") + "\n").expect("write beds");
    csv
}

/// The count in a heading line such as "Channel bodies (750):".
fn heading_count(text: &str, heading: &str) -> usize {
    let line =
        text.lines().find(|l| l.starts_with(heading)).unwrap_or_else(|| panic!("no {heading:?} in {text}"));
    let inner = line.split('(').nth(1).and_then(|t| t.split(')').next()).expect("a count in brackets");
    inner.trim().parse().unwrap_or_else(|_| panic!("{line:?}"))
}

#[test]
fn interpret_shows_the_ends_of_long_lists_and_json_has_them_all() {
    let dir = tempfile::tempdir().expect("dir");
    let csv = long_table(dir.path(), 60);
    let path = csv.to_str().expect("path");
    let o = aggrade(&["interpret", path]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let bodies = heading_count(&text, "Channel bodies");
    assert!(bodies > 100, "{bodies} bodies: the table should make many");
    // The first five and the last five bodies, one line standing for the rest.
    assert!(
        text.contains("\n  1. ") && text.contains("\n  5. ") && !text.contains("\n  6. "),
        "{text:.2000}"
    );
    assert!(text.contains(&format!("\n  {bodies}. ")), "the last body is shown");
    let gap = format!("  … {} more channel bodies not shown", bodies - 10);
    assert!(text.contains(&gap), "{text:.3000}");
    assert!(text.contains("all of them: --json"));
    // However long the section, the report stays a page or two.
    let lines = text.lines().count();
    assert!(lines < 300, "{lines} lines");
    // The JSON keeps every body.
    let j = aggrade(&["interpret", "--json", path]);
    assert!(j.status.success(), "{}", stderr(&j));
    let v: serde_json::Value = serde_json::from_slice(&j.stdout).expect("JSON");
    let in_json = v["channel_bodies"].as_array().map(Vec::len);
    assert_eq!(in_json, Some(bodies));
}

#[test]
fn bodies_shows_the_ends_of_a_long_interval_list_and_the_csv_has_them_all() {
    let dir = tempfile::tempdir().expect("dir");
    let csv = long_table(dir.path(), 60);
    let (table, intervals) = (dir.path().join("bodies.csv"), dir.path().join("intervals.csv"));
    let o = aggrade(&[
        "bodies",
        csv.to_str().expect("path"),
        "--csv",
        table.to_str().expect("path"),
        "--interval-csv",
        intervals.to_str().expect("path"),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let rows = std::fs::read_to_string(&intervals).expect("interval CSV").lines().count() - 1;
    let shown = text.lines().filter(|l| l.starts_with("  ") && l.contains(" m: ")).count();
    assert!(rows > 100, "{rows} intervals in the CSV");
    assert_eq!(shown, 10, "{text}");
    let gap = format!("  … {} more intervals not shown", rows - 10);
    assert!(text.contains(&gap) && text.contains("--interval-csv FILE"), "{text}");
    let body_rows = std::fs::read_to_string(&table).expect("body CSV").lines().count() - 1;
    assert!(body_rows > 100, "{body_rows} bodies in the CSV");
    assert!(text.lines().count() < 60, "{text}");
}

#[test]
fn a_long_section_on_tall_paper_is_one_page_in_pdf_and_svg() {
    let dir = tempfile::tempdir().expect("dir");
    let csv = long_table(dir.path(), 60);
    let (pdf, svg) = (dir.path().join("tall.pdf"), dir.path().join("tall.svg"));
    let o = aggrade(&[
        "export",
        csv.to_str().expect("path"),
        "--pdf",
        pdf.to_str().expect("path"),
        "--svg",
        svg.to_str().expect("path"),
        "--paper",
        "tall",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert!(stderr(&o).contains("(1 page, scale 1:100)"), "{}", stderr(&o));
    // pypdf (PyPI, an independent reader): one page, as tall as the column, whose content comes
    // in several streams (written as the column was drawn), with the section's last bed top on
    // it and the review caution at its foot.
    let script = "import sys, json, pypdf\n\
        r = pypdf.PdfReader(sys.argv[1]); p = r.pages[0]; c = p.get_object()['/Contents']\n\
        streams = len(c) if isinstance(c, list) else 1\n\
        data = b''.join(s.get_object().get_data() for s in (c if isinstance(c, list) else [c]))\n\
        print(json.dumps([len(r.pages), float(p.mediabox.height), streams, len(data)]))";
    let out = std::process::Command::new("python3")
        .args(["-c", script])
        .arg(&pdf)
        .output()
        .expect("python3 runs (needed as the independent PDF reader)");
    assert!(out.status.success(), "pypdf could not read the PDF: {}", stderr(&out));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("JSON");
    assert_eq!(v[0], 1, "{v}");
    // At least as tall as the column: at 1:100, 10 mm a metre, 72/25.4 points a millimetre.
    let table = std::fs::read_to_string(&csv).expect("table");
    let total_m: f64 = table.lines().skip(1).filter_map(|l| l.split(',').next()?.parse::<f64>().ok()).sum();
    let column_pt = total_m * 10.0 * 72.0 / 25.4;
    let height_pt = v[1].as_f64().unwrap_or(0.0);
    assert!(
        column_pt > 50_000.0 && height_pt > column_pt && height_pt < column_pt + 1_000.0,
        "{v} {column_pt}"
    );
    assert!(v[2].as_u64().unwrap_or(0) >= 2, "content in several streams: {v}");
    // The SVG: one file, one page of the same height.
    let text = std::fs::read_to_string(&svg).expect("one SVG file");
    assert!(text.starts_with("<?xml") && text.trim_end().ends_with("</svg>"));
    assert!(!dir.path().join("tall-1.svg").exists());
}
