//! Regression tests, each named after the problem it pins. Inputs that crashed or misbehaved
//! under fuzzing or hostile-input runs live in `tests/data/regressions/` (or are generated here
//! when they are large).

use aggrade_core::io::{read_bed_table, read_project_text, MAX_BEDS_PER_SECTION};

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
