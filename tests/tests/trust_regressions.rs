//! Regression tests, each named after the problem it pins. Inputs that crashed or misbehaved
//! under fuzzing or hostile-input runs live in `tests/data/regressions/` (or are generated here
//! when they are large).

use aggrade_core::io::{read_bed_table, read_project_text, MAX_BEDS_PER_SECTION};
use std::path::PathBuf;

/// A bed table of rows that all have problems used to be read to the end: the row limit counted
/// only good rows, so 3,000,000 bad rows gave 6,000,000 problems (1.4 GB, 84 s in a debug build).
/// Bad rows now count toward the limit and the reader stops there.
#[test]
fn csv_rows_with_problems_count_toward_the_row_limit() {
    let rows = MAX_BEDS_PER_SECTION + 50_000;
    let mut text = String::from("thickness_m,lithology\n");
    text.push_str(&"x,y\n".repeat(rows));
    let problems = read_bed_table(&text, "bad rows").expect_err("every row is bad");
    // Two problems per bad row (thickness and lithology) up to the limit, plus the limit itself.
    assert_eq!(problems.len(), 2 * MAX_BEDS_PER_SECTION + 1);
    let last = problems.last().expect("a problem").to_string();
    // The first data row is line 2, so the row past the limit is line limit + 2.
    let want = format!("line {}: more than {MAX_BEDS_PER_SECTION} bed rows", MAX_BEDS_PER_SECTION + 2);
    assert!(last.starts_with(&want), "{last}");
}

/// A thickness of 1e300 m used to be shown as a 301-digit number in its message.
#[test]
fn huge_numbers_in_messages_use_exponent_form() {
    let text = r#"{"format_version": 1, "sections": [{"name": "Aster Gap", "beds": [
        {"id": 1, "thickness_m": 1e300, "lithology": "mudstone", "grain_base": "clay", "grain_top": "clay"}
    ]}]}"#;
    let problems = read_project_text(text).expect_err("too thick");
    let msg = problems[0].to_string();
    assert!(msg.ends_with("got 1e300"), "{msg}");
}

/// A section of 100,000 demo-like beds saved as pretty JSON is 52.6 MB, over the 32 MiB read
/// limit: it used to save and then refuse to open. Saving now falls back to compact JSON when the
/// pretty form is over the limit, so what is saved always opens.
#[test]
fn a_saved_project_over_the_read_limit_when_pretty_still_opens() {
    use aggrade_core::io::{load, save_project, MAX_FILE_BYTES};
    use aggrade_core::model::{BedId, Project};
    let demo = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade");
    let demo = load(&demo).expect("demo loads").project;
    let mut section = demo.sections[0].clone();
    let pattern = section.beds.clone();
    section.review.clear();
    // Three quarters of the most beds a section may have: with the demo beds' field record the
    // pretty form is well over the read limit and the compact form under it.
    section.beds = (0..MAX_BEDS_PER_SECTION * 3 / 4)
        .map(|i| {
            let mut bed = pattern[i % pattern.len()].clone();
            bed.id = BedId(i as u64 + 1);
            if let Some(s) = &mut bed.base_surface {
                s.name = format!("{}-{i}", s.name);
            }
            bed
        })
        .collect();
    let project = Project::new(vec![section]);
    let pretty = aggrade_core::io::project_to_json(&project).expect("encodes");
    assert!(pretty.len() as u64 > MAX_FILE_BYTES, "the case needs a pretty form over the limit");
    let dir = tempfile::tempdir().expect("temporary folder");
    let path = dir.path().join("big.aggrade");
    save_project(&path, &project).expect("saves");
    let size = std::fs::metadata(&path).expect("saved").len();
    assert!(size <= MAX_FILE_BYTES, "{size} bytes");
    let reopened = load(&path).unwrap_or_else(|e| panic!("saved file does not open: {e}")).project;
    assert_eq!(reopened, project);
}

/// Found by the `las` fuzz target: a header line that is a lone period before its colon
/// (` .            :  2  DEPTH`) sliced the line backwards and panicked. It is now refused as a
/// line with no mnemonic, naming the line.
#[test]
fn a_las_header_line_with_a_lone_period_is_refused_not_a_panic() {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/regressions/las_lone_period_header.las");
    let bytes = std::fs::read(&path).expect("regression input");
    let text = String::from_utf8_lossy(&bytes);
    let e = aggrade_core::analysis::las::parse_las(&text, "lone.las").expect_err("refused");
    assert!(e.to_string().contains("expected a mnemonic before the period"), "{e}");
    let e = aggrade_core::analysis::las::parse_las("~V\n VERS. 2.0 : v\n .   : 2 DEPTH\n", "x.las")
        .expect_err("refused");
    assert_eq!(e.to_string(), "x.las, line 3: expected a mnemonic before the period");
}
