//! Hostile and broken files: each gives a clear error (file, line, what is wrong) or a safe result,
//! never a panic; the very large cases are generated at run time and refused by the documented
//! limits before they are parsed.

use aggrade_core::io::{self, LoadError, MAX_ARRAY_ITEMS, MAX_BEDS_PER_SECTION, MAX_FILE_BYTES};
use std::path::{Path, PathBuf};
use std::time::Instant;

fn bad(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data/bad").join(name)
}

/// The error text for a file that must be refused, checked to name the file.
fn refused(path: &Path) -> String {
    let err = match io::load(path) {
        Ok(_) => panic!("{} must be refused", path.display()),
        Err(e) => e.to_string(),
    };
    let name = path.file_name().and_then(|n| n.to_str()).expect("file name");
    assert!(err.contains(name), "the message names the file: {err}");
    err
}

#[test]
fn every_committed_bad_file_is_refused_with_a_clear_message() {
    // (file, fragments the message must contain: the line and what is wrong)
    let cases: &[(&str, &[&str])] = &[
        ("truncated.aggrade", &["line 13", "ends too soon"]),
        (
            "wrong_types.aggrade",
            &[
                "line 5: sections[0].name",
                "line 9: sections[0].beds[0].thickness_m",
                "line 15: sections[0].beds[1].id",
                "3 problems",
            ],
        ),
        ("huge_number.aggrade", &["line 9", "number out of range"]),
        ("huge_thickness.aggrade", &["line 9", "thickness_m", "got 1e300"]),
        ("huge_id.aggrade", &["line 8", "beds[0].id", "expected u64"]),
        ("nan.aggrade", &["line 9", "no NaN or Infinity"]),
        ("infinity.aggrade", &["line 9", "no NaN or Infinity"]),
        ("negative_thickness.aggrade", &["line 9", "beds[0].thickness_m: must be > 0", "got -1.2"]),
        ("zero_thickness.aggrade", &["line 16", "beds[1].thickness_m", "got 0"]),
        ("deep_nesting.aggrade", &["line 1", "nested more than 16 levels"]),
        ("wrong_root.aggrade", &["line 1", "must hold a JSON object", "got a list"]),
        ("empty.aggrade", &["line 1", "ends too soon"]),
        ("future_version.aggrade", &["line 2", "format_version", "newer"]),
        ("invalid_utf8.aggrade", &["line 5", "not UTF-8", "0xC3"]),
        ("invalid_utf8.csv", &["line 3", "not UTF-8", "0xFF"]),
        ("ragged_rows.csv", &["line 2", "5 cells", "3 columns"]),
        ("header_only.csv", &["no bed rows"]),
        ("empty.csv", &["line 1", "empty"]),
        ("unterminated_quote.csv", &["line 2", "never closed"]),
    ];
    for (name, fragments) in cases {
        let err = refused(&bad(name));
        for f in *fragments {
            assert!(err.contains(f), "{name}: {f:?} missing from:\n{err}");
        }
    }
    // Every committed file is covered by a case above (or the formula test below).
    let mut listed: Vec<String> = cases.iter().map(|(n, _)| n.to_string()).collect();
    listed.push("formula_cell.csv".into());
    listed.sort();
    let mut on_disk: Vec<String> = std::fs::read_dir(bad(""))
        .expect("tests/data/bad")
        .filter_map(|e| e.ok())
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    on_disk.sort();
    assert_eq!(listed, on_disk);
}

#[test]
fn a_formula_cell_loads_as_plain_text_and_is_escaped_on_write() {
    // OWASP "CSV Injection": the text is kept, never evaluated, and written back with a leading '.
    let loaded = io::load(&bad("formula_cell.csv")).expect("a formula-looking note is just text");
    let beds = &loaded.project.sections[0].beds;
    assert_eq!(beds[0].notes, "=cmd|' /C calc'!A0");
    assert_eq!(beds[1].notes, "@SUM(1+1)");
    let written = io::write_bed_table(&loaded.project.sections[0]);
    assert!(written.contains(",'=cmd|' /C calc'!A0\n"), "{written}");
    assert!(written.contains(",'@SUM(1+1)\n"), "{written}");
}

#[test]
fn a_200_mb_file_is_refused_by_the_size_limit_before_reading() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("huge.aggrade");
    // A sparse 200 MB file: as large as a real one to the reader, instant to make.
    let file = std::fs::File::create(&path).expect("create");
    file.set_len(200 * 1024 * 1024).expect("set_len");
    drop(file);
    let start = Instant::now();
    let result = io::load(&path);
    let elapsed = start.elapsed();
    match result {
        Err(LoadError::TooLarge { size_bytes, limit_bytes, .. }) => {
            assert_eq!(size_bytes, 200 * 1024 * 1024);
            assert_eq!(limit_bytes, MAX_FILE_BYTES);
        }
        other => panic!("expected the size limit, got {other:?}"),
    }
    eprintln!("200 MB file refused in {elapsed:?}");
    let err = refused(&path);
    assert!(err.contains("209715200 bytes") && err.contains(&MAX_FILE_BYTES.to_string()), "{err}");
}

#[test]
fn a_claim_of_ten_million_beds_is_refused_at_the_array_limit() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("many.aggrade");
    let mut text = String::from("{\"format_version\": 1, \"sections\": [{\"name\": \"x\", \"beds\": [");
    text.push_str(&"{},".repeat(10_000_000 - 1));
    text.push_str("{}]}]}");
    assert!((text.len() as u64) < MAX_FILE_BYTES, "under the size limit, so the item limit must act");
    std::fs::write(&path, &text).expect("write");
    let err = refused(&path);
    assert!(
        err.contains("sections[0].beds") && err.contains(&format!("more than {MAX_ARRAY_ITEMS} items")),
        "{err}"
    );
}

#[test]
fn a_csv_with_too_many_rows_is_refused() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("rows.csv");
    let mut text = String::from("thickness_m,lithology,grain\n");
    text.push_str(&"1,mudstone,silt\n".repeat(MAX_BEDS_PER_SECTION + 10));
    std::fs::write(&path, &text).expect("write");
    let err = refused(&path);
    assert!(err.contains(&format!("line {}", MAX_BEDS_PER_SECTION + 2)), "{err}");
    assert!(err.contains(&format!("more than {MAX_BEDS_PER_SECTION} bed rows")), "{err}");
}

#[test]
fn an_overlong_text_is_refused() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("long.aggrade");
    let text = format!(
        "{{\"format_version\": 1,\n\"sections\": [{{\"name\": \"x\",\n\"notes\": \"{}\", \"beds\": []}}]}}",
        "a".repeat(io::MAX_STRING_CHARS + 1)
    );
    std::fs::write(&path, text).expect("write");
    let err = refused(&path);
    assert!(err.contains("line 3: sections[0].notes") && err.contains("at most"), "{err}");
}

#[test]
fn arbitrary_bytes_never_panic() {
    // A fixed-seed sweep of mutations of a valid project: each must load or be refused, never panic.
    let good = std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join("data/io/v0_project.aggrade"))
        .expect("fixture");
    let mut state: u64 = 0x2545_F491_4F6C_DD1D;
    let mut next = || {
        // xorshift64 (Marsaglia 2003): deterministic pseudo-random numbers for the sweep.
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        state
    };
    let (mut ok, mut refused_count) = (0, 0);
    for _ in 0..2_000 {
        let mut bytes = good.clone();
        for _ in 0..(next() % 4 + 1) {
            let i = (next() as usize) % bytes.len();
            match next() % 3 {
                0 => bytes[i] = (next() % 256) as u8,
                1 => bytes.truncate(i.max(1)),
                _ => bytes.insert(i, b"{}[]\",:-e9\\"[(next() % 11) as usize]),
            }
        }
        let text = String::from_utf8_lossy(&bytes);
        match io::read_project_text(&text) {
            Ok(_) => ok += 1,
            Err(problems) => {
                assert!(!problems.is_empty());
                refused_count += 1;
            }
        }
        let _ = io::read_bed_table(&text, "x");
    }
    assert!(refused_count > 0 && ok + refused_count == 2_000, "ok {ok}, refused {refused_count}");
}
