//! Hostile and broken input: every file in `tests/data/regressions/hostile/` (cases beyond the
//! reader's own corpus in `tests/data/bad/`, which `io_hostile.rs` pins file for file) and a few generated at test time
//! (deep nesting, ten million beds claimed, a 200 MB file, a device that never ends) gives a clear
//! error naming the file, line and field, or a safe result; never a panic, and never more memory
//! or time than the limits in `aggrade_core::io::limits` allow.

use aggrade_core::io::{self, load, read_bed_table, read_project_text, write_bed_table};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::Command;

fn bad(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/regressions/hostile").join(name)
}

/// Load a file that must be refused; return the message, after checking that it names the file.
fn refused(path: &Path) -> String {
    match load(path) {
        Ok(_) => panic!("{} was accepted", path.display()),
        Err(e) => {
            let msg = e.to_string();
            assert!(msg.contains(&path.display().to_string()), "message does not name the file:\n{msg}");
            msg
        }
    }
}

fn assert_has(msg: &str, parts: &[&str]) {
    for part in parts {
        assert!(msg.contains(part), "message lacks {part:?}:\n{msg}");
    }
}

/// The committed bad files, each with the line, field and guidance its message must carry.
#[test]
fn every_committed_bad_file_is_refused_with_line_field_and_what_is_valid() {
    let cases: &[(&str, &[&str])] = &[
        ("trust_truncated.aggrade", &["line 35", "ends too soon"]),
        (
            "trust_wrong_types.aggrade",
            &[
                "4 problems",
                "line 11: sections[0].beds[0].thickness_m: invalid type: string \"three\", expected f64",
                "line 26: sections[0].beds[1].lithology",
                "line 50: sections[0].beds[2].paleocurrents: must be a list",
                "line 66: sections[1].beds: must be a list",
            ],
        ),
        (
            "negative_zero_and_huge_thickness.aggrade",
            &[
                "line 11: sections[0].beds[0].thickness_m: must be > 0 and ≤ 1000 m, got -1.5",
                "line 25: sections[0].beds[1].thickness_m: must be > 0 and ≤ 1000 m, got 0",
                "line 46: sections[0].beds[2].thickness_m: must be > 0 and ≤ 1000 m, got 1e300",
            ],
        ),
        // JSON has no NaN or infinity (RFC 8259 section 6), and 1e400 is beyond f64 (IEEE 754).
        ("nan_literal.aggrade", &["line 11", "not valid JSON"]),
        ("number_out_of_range.aggrade", &["line 11", "number out of range"]),
        ("version_not_a_number.aggrade", &["line 2: format_version: must be a whole number 0–2"]),
        ("bed_id_out_of_range.aggrade", &["line 45: sections[0].beds[2].id", "`-3`, expected u64"]),
        // "Caf" then byte 0xE9: column 27 of line 2 (26 bytes precede it).
        ("bad_utf8.aggrade", &["line 2", "not UTF-8", "0xE9", "column 27", "save the file as UTF-8"]),
        ("bad_utf8.csv", &["line 3", "not UTF-8", "0xE9", "column 22"]),
        (
            "nan_inf_thickness.csv",
            &[
                "6 problems",
                "line 2: column thickness_m: \"NaN\" is not a number",
                "line 3: column thickness_m: \"inf\"",
                "line 4: column thickness_m: \"-inf\"",
                "line 5: column thickness_m: \"1e400\"",
                "line 6: column thickness_m: must be > 0, got -2",
                "line 7: column thickness_m: must be > 0, got 0",
            ],
        ),
    ];
    for (name, parts) in cases {
        let msg = refused(&bad(name));
        assert_has(&msg, parts);
        // No line of the message runs on without end (a huge number must not print in full).
        assert!(msg.lines().all(|l| l.chars().count() < 400), "{name}: an overlong message line:\n{msg}");
    }
}

/// The field record's hostile files: every value out of range, every unknown code, lists and
/// texts past their limits, each named by line and field (or column) with what is valid.
#[test]
fn field_record_files_name_every_bad_value_by_line_and_field() {
    let cases: &[(&str, &[&str])] = &[
        (
            "field_record_out_of_range.aggrade",
            &[
                "14 problems",
                "line 6: sections[0].thickness_uncertainty_m: must be ≥ 0",
                "line 8: sections[0].bedding.dip_deg: must lie between 0 and 90 degrees, got 95",
                "line 12: sections[0].traverse.bearing_deg: must lie between 0 and 360 degrees, got 400",
                "line 19: sections[0].fixes[0].lat_deg: must lie between -90 and 90, got 95",
                "line 24: sections[0].fixes[1].height_m: must be a height of 0 m or more above the section's base, got -5",
                "line 27: sections[0].fixes[1].elevation_m: must lie between -11000 and 9000 m above sea level, got 1000000",
                "line 32: sections[0].body_lateral[0].base_bed: refers to bed id 7, which is not in this section",
                "line 37: sections[0].body_lateral[1].width_m: must be > 0",
                // Bioturbation index scale 0–6 of Taylor & Goldring (1993).
                "line 47: sections[0].beds[0].bioturbation_index: must be a bioturbation index 0–6",
                "line 58: sections[0].beds[1].samples[0].height_in_bed_m: sample \"CW-1\": the height above the bed's base must be ≥ 0",
                "line 61: sections[0].beds[1].samples[1].id: \"CW-1\" is already the id of an earlier sample",
                "line 64: sections[0].beds[1].samples[2].id: must not be empty",
                "line 69: sections[0].beds[1].photos[0].reference: must not be empty",
                "line 72: sections[0].beds[1].slope_distance_m: must be > 0",
            ],
        ),
        (
            "field_record_bad_codes.aggrade",
            &[
                "6 problems",
                // Munsell value runs 0–10 (Munsell Soil Color Charts).
                "line 13: sections[0].beds[0].munsell: \"10YR 11/4\" is not a Munsell notation",
                "line 14: sections[0].beds[0].soil_horizon: \"bt\" is not a soil-horizon designation",
                "line 15: sections[0].beds[0].drainage",
                "well_drained",
                "line 23: sections[0].beds[1].facies: unknown lithofacies code \"Sx\"; valid codes are Gmm",
                "line 25: sections[0].beds[1].samples[0]: kind",
                "detrital_zircon",
                "line 31: sections[0].beds[1].paleocurrents[0]: indicator",
                "accretion_surface",
            ],
        ),
        (
            "field_record_bad_cells.csv",
            &[
                "8 problems",
                "line 2: column munsell: \"10YR 11/4\" is not a Munsell notation",
                "line 2: column bioturbation_index: \"7\" is not a bioturbation index",
                "line 3: column samples: sample SC-1: \"zircons\" is not a sample kind",
                "line 3: column facies: \"Sx\" is not a lithofacies code",
                "line 3: column drainage: \"soggy\" is not a drainage class",
                "line 4: column paleocurrents: \"210w\" is not a paleocurrent reading",
                "line 4: column soil_horizon: \"bt\"",
                "line 5: column thickness_m: required",
            ],
        ),
        (
            "field_record_long_lists.csv",
            &[
                "3 problems",
                "line 2: column photos: 1001 photos; at most 1000 per bed",
                "line 3: column body_fossils: a fossil name of 201 characters; at most 200 allowed",
                "line 4: column lag_composition: text of 10001 characters; at most 10000 allowed",
            ],
        ),
    ];
    for (name, parts) in cases {
        let msg = refused(&bad(name));
        assert_has(&msg, parts);
        assert!(msg.lines().all(|l| l.chars().count() < 400), "{name}: an overlong message line:\n{msg}");
    }
}

/// A hundred thousand samples on one bed pass the JSON pre-scan's list limit (100,000 items) and
/// stop at the field record's limit per bed; a note of a million characters stops at the text
/// limit. Each is named by line and field, in a project file and in a bed table.
#[test]
fn a_hundred_thousand_samples_and_a_megabyte_note_are_refused_by_line_and_field() {
    let samples = vec!["{\"id\": \"S\"}"; 100_000].join(",");
    let project = |bed_extra: &str| {
        format!(
            "{{\n\"format_version\": 2,\n\"sections\": [{{\n\"name\": \"x\",\n\"beds\": [\n\
             {{\"id\": 1, \"thickness_m\": 1.0, \"lithology\": \"mudstone\", \"grain_base\": \"clay\", \"grain_top\": \"clay\",\n{bed_extra}}}\n]}}]}}\n"
        )
    };
    let problems = read_project_text(&project(&format!("\"samples\": [{samples}]"))).expect_err("refused");
    assert_eq!(problems.len(), 1, "{problems:?}");
    assert_eq!(
        problems[0].to_string(),
        "line 7: sections[0].beds[0].samples: 100000 samples; at most 1000 per bed"
    );
    let note = "n".repeat(1_000_000);
    let problems = read_project_text(&project(&format!("\"notes\": \"{note}\""))).expect_err("refused");
    assert_eq!(problems.len(), 1, "{problems:?}");
    assert_has(
        &problems[0].to_string(),
        &["line 7", "sections[0].beds[0].notes", "text of 1000000 characters; at most 10000"],
    );
    // The same in a bed table.
    let ids: Vec<String> = (0..100_000).map(|i| format!("S{i}")).collect();
    let csv = format!("thickness_m,lithology,grain,samples,notes\n1,mudstone,cl,,\n1,mudstone,cl,{},\n2,mudstone,cl,,{note}\n", ids.join(";"));
    let problems = read_bed_table(&csv, "x").expect_err("refused");
    let shown: Vec<String> = problems.iter().map(ToString::to_string).collect();
    assert_eq!(
        shown,
        [
            "line 3: column samples: 100000 samples; at most 1000 per bed",
            "line 4: column notes: text of 1000000 characters; at most 10000 allowed"
        ]
    );
}

/// Every file in the folder is used by a test here, so a new bad file cannot be added and
/// silently left untested.
#[test]
fn no_bad_file_goes_untested() {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/regressions/hostile");
    let mut names: Vec<String> = std::fs::read_dir(&dir)
        .expect("tests/data/regressions/hostile exists")
        .filter_map(Result::ok)
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    let source = include_str!("trust_hostile.rs");
    for name in names {
        assert!(
            source.contains(&format!("\"{name}\"")),
            "tests/data/regressions/hostile/{name} is not used by any test"
        );
    }
}

/// Nesting far deeper than a project needs is refused by the pre-scan before the JSON parser
/// could recurse (serde_json's own guard is 128 levels; ours is 16).
#[test]
fn deeply_nested_json_is_refused_at_the_depth_limit() {
    let depth = 100_000;
    let text = format!("{{\"format_version\":1,\"sections\":{}{}}}", "[".repeat(depth), "]".repeat(depth));
    let problems = read_project_text(&text).expect_err("refused");
    assert_eq!(problems.len(), 1);
    let p = problems[0].to_string();
    assert_has(&p, &["line 1", "nested more than 16 levels"]);
}

/// A file claiming ten million beds (30 MB, under the size limit) stops at the array limit.
#[test]
fn ten_million_beds_claimed_stop_at_the_array_limit() {
    let mut text = String::with_capacity(31_000_000);
    text.push_str("{\"format_version\":1,\"sections\":[{\"name\":\"x\",\"beds\":[");
    for i in 0..10_000_000 {
        text.push_str(if i == 0 { "{}" } else { ",{}" });
    }
    text.push_str("]}]}");
    let problems = read_project_text(&text).expect_err("refused");
    assert_eq!(problems.len(), 1, "{problems:?}");
    let p = problems[0].to_string();
    assert_has(&p, &["sections[0].beds", "more than 100000 items"]);
}

/// A 200 MB file is refused from its size alone, before any of it is read.
#[test]
fn a_200_mb_file_is_refused_before_reading() {
    let dir = tempfile::tempdir().expect("temporary folder");
    for name in ["huge.aggrade", "huge.csv"] {
        let path = dir.path().join(name);
        let file = std::fs::File::create(&path).expect("create");
        // A sparse file: 200 MB long without writing 200 MB (the reader sees the full length).
        file.set_len(200 * 1024 * 1024).expect("set length");
        let msg = refused(&path);
        assert_has(&msg, &["209715200 bytes", "at most 33554432 bytes"]);
    }
}

/// A path whose size is unknown ahead of time (a device that never ends) is read only up to the
/// limit, then refused.
#[test]
fn an_endless_device_is_read_only_up_to_the_limit() {
    let dir = tempfile::tempdir().expect("temporary folder");
    let path = dir.path().join("endless.aggrade");
    std::os::unix::fs::symlink("/dev/zero", &path).expect("symlink");
    let msg = refused(&path);
    assert_has(&msg, &["at most 33554432 bytes"]);
}

/// A text cell that a spreadsheet would run (a DDE command, OWASP "CSV Injection") reads as
/// plain text and is written back with a leading `'`, also after a trip through a project file.
#[test]
fn formula_cells_are_exported_escaped_after_a_project_round_trip() {
    let loaded = load(&bad("formula_cells.csv")).expect("formula cells are text, not errors");
    let beds = &loaded.project.sections[0].beds;
    assert_eq!(beds[0].notes, "=cmd|' /C calc'!A0");
    // Through the project file and back, as `aggrade convert` does.
    let json = io::project_to_json(&loaded.project).expect("encodes");
    let again = read_project_text(&json).expect("reads again").project;
    let csv = write_bed_table(&again.sections[0]);
    // Reference: Python's csv module (standard library) reads the cells as a spreadsheet import
    // would see them; OWASP "CSV Injection" lists = + - @ tab CR as the dangerous first characters.
    let code = "import csv,sys,json\nprint(json.dumps(list(csv.reader(sys.stdin))))";
    let mut child = Command::new("python3")
        .arg("-c")
        .arg(code)
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .spawn()
        .expect("python3 is needed for this reference check (csv module)");
    child.stdin.take().expect("stdin").write_all(csv.as_bytes()).expect("write to python");
    let out = child.wait_with_output().expect("python runs");
    assert!(out.status.success(), "python csv failed");
    let rows: Vec<Vec<String>> = serde_json::from_slice(&out.stdout).expect("json from python");
    let header = &rows[0];
    let text_columns = ["notes", "colour", "surface", "fossils", "samples"];
    let mut escaped = 0;
    for row in &rows[1..] {
        for (name, cell) in header.iter().zip(row) {
            if text_columns.contains(&name.as_str()) && !cell.is_empty() {
                assert!(
                    !cell.starts_with(['=', '+', '-', '@', '\t', '\r']),
                    "{name} cell {cell:?} is not escaped"
                );
                if cell.starts_with('\'') {
                    escaped += 1;
                }
            }
        }
    }
    // =cmd…, @SUM…, +SB-9, -2+3, =HYPERLINK…
    assert_eq!(escaped, 5, "{rows:?}");
    let col = |name: &str| header.iter().position(|h| h == name).expect(name);
    assert_eq!(rows[1][col("notes")], "'=cmd|' /C calc'!A0");
    // And the reader removes the quote mark again: nothing is lost.
    let back = read_bed_table(&csv, "formula_cells").expect("reads back").section;
    assert_eq!(back.beds, again.sections[0].beds);
}
