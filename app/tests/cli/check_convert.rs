//! End-to-end tests of `aggrade check` and `aggrade convert` on the built binary: every demo file,
//! bad input (exit code, stderr naming file, line, field and value; no panic or backtrace),
//! and conversions both ways.

use super::harness::text;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn aggrade(args: &[&std::ffi::OsStr]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .args(args)
        .env("RUST_BACKTRACE", "1")
        .output()
        .expect("the aggrade binary runs")
}

fn run(args: &[&str]) -> Output {
    let args: Vec<&std::ffi::OsStr> = args.iter().map(|a| std::ffi::OsStr::new(*a)).collect();
    aggrade(&args)
}

fn sample_files() -> Vec<PathBuf> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    let mut files: Vec<PathBuf> = std::fs::read_dir(&dir)
        .expect("sample_sections")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| matches!(p.extension().and_then(|e| e.to_str()), Some("csv" | "aggrade")))
        .collect();
    files.sort();
    files
}

/// No panic message or backtrace ever reaches the user.
fn assert_no_panic(out: &Output) {
    let err = text(&out.stderr);
    assert!(
        !err.contains("panicked") && !err.contains("stack backtrace") && !err.contains("RUST_BACKTRACE"),
        "{err}"
    );
}

#[test]
fn check_passes_every_sample_file_with_a_summary() {
    let files = sample_files();
    assert_eq!(files.len(), 5, "four CSV sections and the demo project: {files:?}");
    for file in files {
        let out = run(&["check", file.to_str().expect("utf-8 path")]);
        assert_no_panic(&out);
        assert!(out.status.success(), "{}: {}", file.display(), text(&out.stderr));
        let stdout = text(&out.stdout);
        assert!(
            stdout.contains("valid;") && stdout.contains(" m total") && stdout.contains(" m exposed"),
            "{stdout}"
        );
        assert!(text(&out.stderr).is_empty(), "no warnings on demo data: {}", text(&out.stderr));
    }
}

#[test]
fn check_summary_totals_match_the_demo_beds() {
    // Totals recomputed here from the CSV cells (thickness column summed; ft × 0.3048, 1959
    // international foot) must match the summary the command prints.
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    for (stem, factor) in
        [("corrie_wash", 1.0), ("halloway_bluff", 1.0), ("sedge_creek", 1.0), ("pell_butte", 0.3048)]
    {
        let path = dir.join(format!("{stem}.csv"));
        let csv = std::fs::read_to_string(&path).expect("read");
        let total: f64 = csv
            .lines()
            .skip(1)
            .map(|l| l.split(',').next().and_then(|c| c.parse::<f64>().ok()).expect("thickness cell"))
            .sum::<f64>()
            * factor;
        let beds = csv.lines().skip(1).count();
        let out = run(&["check", path.to_str().expect("path")]);
        let stdout = text(&out.stdout);
        assert!(
            stdout.contains(&format!("{beds} beds, {total:.2} m total")),
            "{stem}: expected {beds} beds, {total:.2} m in {stdout}"
        );
        assert!((20..=70).contains(&beds), "{stem}: {beds} beds");
    }
}

#[test]
fn check_reports_every_problem_on_stderr_and_fails() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("Bad Section.csv");
    std::fs::write(&path, "thickness_m,lithology,grain,paleocurrents\n1,sandstone,fine sand,10\n-2,mudstone,silt,\n1,sandstone,fine sand,400\n")
        .expect("write");
    let out = run(&["check", path.to_str().expect("path")]);
    assert_no_panic(&out);
    assert!(!out.status.success());
    assert!(text(&out.stdout).is_empty(), "nothing on stdout: {}", text(&out.stdout));
    let err = text(&out.stderr);
    for fragment in [
        "Bad Section.csv",
        "2 problems",
        "line 3: column thickness_m: must be > 0, got -2",
        "line 4: column paleocurrents",
        "400",
    ] {
        assert!(err.contains(fragment), "{fragment:?} missing from {err}");
    }
}

#[test]
fn check_on_every_hostile_file_fails_cleanly() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/data/bad");
    let mut n = 0;
    for entry in std::fs::read_dir(dir).expect("tests/data/bad") {
        let path = entry.expect("entry").path();
        let out = aggrade(&[std::ffi::OsStr::new("check"), path.as_os_str()]);
        assert_no_panic(&out);
        let name = path.file_name().and_then(|n| n.to_str()).expect("name");
        if name == "formula_cell.csv" {
            assert!(out.status.success(), "formula text is safe to load");
        } else {
            assert!(!out.status.success(), "{name} must fail");
            assert!(text(&out.stderr).contains(name), "{name}: {}", text(&out.stderr));
        }
        n += 1;
    }
    assert!(n >= 20, "{n} hostile files");
}

#[test]
fn check_warns_about_unknown_fields_in_beds_and_curves_alike() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("extra.aggrade");
    let project = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Kestrel Bluff",
      "beds": [
        {"id": 1, "thickness_m": 2.0, "lithology": "mudstone", "grain_base": "clay", "grain_top": "clay", "colr": "red"}
      ],
      "curves": [
        {"mnemonic": "GR", "offset_m": 0.0, "direction": "height_above_datum",
         "tool": "hand-held", "samples": [[0.0, 50.0]]}
      ]
    }
  ]
}
"#;
    std::fs::write(&path, project).expect("write");
    let out = run(&["check", path.to_str().expect("utf-8 path")]);
    assert!(out.status.success(), "warnings do not fail the check: {}", text(&out.stderr));
    let err = text(&out.stderr);
    let file = path.display().to_string();
    assert!(
        err.contains(&format!("warning: {file}: line 7: sections[0].beds[0].colr: unknown field, ignored")),
        "{err}"
    );
    assert!(
        err.contains(&format!(
            "warning: {file}: line 11: sections[0].curves[0].tool: unknown field, ignored"
        )),
        "{err}"
    );
}

#[test]
fn check_refuses_missing_files_and_unknown_types() {
    let out = run(&["check", "/nonexistent/Corrie.aggrade"]);
    assert_no_panic(&out);
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains("/nonexistent/Corrie.aggrade"));
    let out = run(&["check", "notes.txt"]);
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains(".aggrade") && text(&out.stderr).contains(".csv"));
}

#[test]
fn convert_round_trips_every_sample_file() {
    let dir = tempfile::tempdir().expect("temp dir");
    for file in sample_files() {
        let stem = file.file_stem().and_then(|s| s.to_str()).expect("stem").to_string();
        if file.extension().and_then(|e| e.to_str()) == Some("csv") {
            // CSV → project → CSV gives the same table back.
            let project = dir.path().join(format!("{stem}.aggrade"));
            let back = dir.path().join(format!("{stem}_back.csv"));
            let out = run(&["convert", file.to_str().expect("p"), project.to_str().expect("p")]);
            assert!(out.status.success(), "{}", text(&out.stderr));
            let out = run(&["check", project.to_str().expect("p")]);
            assert!(out.status.success(), "{}", text(&out.stderr));
            let out = run(&["convert", project.to_str().expect("p"), back.to_str().expect("p")]);
            assert!(out.status.success(), "{}", text(&out.stderr));
            let a = aggrade_core::io::load(&file).expect("original");
            let b = aggrade_core::io::load(&back).expect("converted back");
            let (sa, sb) = (&a.project.sections[0], &b.project.sections[0]);
            assert_eq!(sa.beds.len(), sb.beds.len());
            for (x, y) in sa.beds.iter().zip(&sb.beds) {
                assert!((x.thickness_m - y.thickness_m).abs() <= 1e-12 * x.thickness_m);
                let mut y = y.clone();
                y.thickness_m = x.thickness_m;
                assert_eq!(x, &y);
            }
        } else {
            // A multi-section project to CSV needs --section; without it the names are listed.
            let csv = dir.path().join("one.csv");
            let out = run(&["convert", file.to_str().expect("p"), csv.to_str().expect("p")]);
            assert_no_panic(&out);
            assert!(!out.status.success());
            let err = text(&out.stderr);
            assert!(
                err.contains("--section")
                    && err.contains("\"Corrie Wash\"")
                    && err.contains("\"Pell Butte\""),
                "{err}"
            );
            assert!(!csv.exists());
            let out = run(&[
                "convert",
                file.to_str().expect("p"),
                csv.to_str().expect("p"),
                "--section",
                "pell butte",
            ]);
            assert!(out.status.success(), "{}", text(&out.stderr));
            let table = std::fs::read_to_string(&csv).expect("csv");
            assert!(table.starts_with("thickness_ft,"), "Pell Butte is logged in feet: {table}");
            let out = run(&[
                "convert",
                file.to_str().expect("p"),
                csv.to_str().expect("p"),
                "--section",
                "Nowhere",
            ]);
            assert!(!out.status.success());
            assert!(text(&out.stderr).contains("no section named \"Nowhere\""));
            // Project → project (normalises, keeps everything).
            let copy = dir.path().join("copy.aggrade");
            let out = run(&["convert", file.to_str().expect("p"), copy.to_str().expect("p")]);
            assert!(out.status.success(), "{}", text(&out.stderr));
            assert_eq!(
                aggrade_core::io::load(&copy).expect("copy").project,
                aggrade_core::io::load(&file).expect("demo").project
            );
        }
    }
}

#[test]
fn convert_migrates_a_version_0_project() {
    let dir = tempfile::tempdir().expect("temp dir");
    let v0 = Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/data/io/v0_project.aggrade");
    let out_path = dir.path().join("v1.json");
    let out = aggrade(&[std::ffi::OsStr::new("convert"), v0.as_os_str(), out_path.as_os_str()]);
    assert!(out.status.success(), "{}", text(&out.stderr));
    assert!(text(&out.stderr).contains("version 0"), "the migration is reported: {}", text(&out.stderr));
    let json = std::fs::read_to_string(&out_path).expect("written");
    assert!(json.contains("\"format_version\": 2") && json.contains("\"thickness_m\": 3.048"), "{json}");
}

#[test]
fn convert_refuses_bad_input_without_writing() {
    let dir = tempfile::tempdir().expect("temp dir");
    let input = dir.path().join("in.csv");
    std::fs::write(&input, "thickness_m,lithology\n1,sandstone\n").expect("write");
    let output = dir.path().join("out.aggrade");
    let out = run(&["convert", input.to_str().expect("p"), output.to_str().expect("p")]);
    assert_no_panic(&out);
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains("line 2: column grain"), "{}", text(&out.stderr));
    assert!(!output.exists());
    let out = run(&["convert", input.to_str().expect("p"), input.to_str().expect("p")]);
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains("same file"));
}

#[test]
fn a_csv_with_6000_e_acute_in_a_note_converts_to_a_project_that_checks() {
    // 6,000 characters (12,000 bytes of UTF-8) is within the 10,000-character limit; the written
    // project was refused by `aggrade check` when its pre-scan counted bytes.
    let dir = tempfile::tempdir().expect("temp dir");
    let input = dir.path().join("notes.csv");
    let note = "é".repeat(6_000);
    std::fs::write(&input, format!("thickness_m,lithology,grain,notes\n1.5,mudstone,silt,{note}\n"))
        .expect("write");
    let project = dir.path().join("notes.aggrade");
    let out = run(&["convert", input.to_str().expect("p"), project.to_str().expect("p")]);
    assert!(out.status.success(), "{}", text(&out.stderr));
    let out = run(&["check", project.to_str().expect("p")]);
    assert_no_panic(&out);
    assert!(out.status.success(), "{}", text(&out.stderr));
    // And back to a bed table, which checks too and keeps the note.
    let back = dir.path().join("back.csv");
    let out = run(&["convert", project.to_str().expect("p"), back.to_str().expect("p")]);
    assert!(out.status.success(), "{}", text(&out.stderr));
    let out = run(&["check", back.to_str().expect("p")]);
    assert!(out.status.success(), "{}", text(&out.stderr));
    let loaded = aggrade_core::io::load(&back).expect("loads");
    assert_eq!(loaded.project.sections[0].beds[0].notes, note);
}

#[test]
fn check_warns_when_a_facies_code_names_another_rock() {
    // The first letter of a lithofacies code names its rock (Miall 1978, 1996): G gravel,
    // S sand, F fines, C coal. A gravel code on a mudstone and a coal code on a sandstone are
    // reported by line and field; the file still reads (the code is the geologist's call).
    let dir = tempfile::tempdir().expect("temp dir");
    let csv = dir.path().join("codes.csv");
    std::fs::write(&csv, "thickness_m,lithology,grain,facies\n1,mudstone,clay,Gcm\n2,sandstone,medium sand,C\n3,sandstone,medium sand,St\n")
        .expect("write");
    let out = aggrade(&[std::ffi::OsStr::new("check"), csv.as_os_str()]);
    assert!(out.status.success(), "{}", text(&out.stderr));
    let err = text(&out.stderr);
    assert!(err.contains("line 2") && err.contains("Gcm") && err.contains("mudstone"), "{err}");
    assert!(err.contains("line 3") && err.contains("C (coal"), "{err}");
    assert!(!err.contains("line 4"), "St on a sandstone fits: {err}");
}
