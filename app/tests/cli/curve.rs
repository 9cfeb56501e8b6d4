//! `aggrade curve` end to end on the built binary: attach a gamma-ray curve from a LAS file, list
//! it, remove it, and refuse a malformed LAS file with the reader's file-and-line message.

use super::harness::{run, text};
use std::path::{Path, PathBuf};

fn fixture(rel: &str) -> String {
    super::harness::fixture(rel).display().to_string()
}

fn copy_of_kestrel(dir: &Path) -> PathBuf {
    let path = dir.join("kestrel.aggrade");
    std::fs::copy(fixture("analysis/kestrel_bluff.aggrade"), &path).expect("copy fixture");
    path
}

#[test]
fn attach_list_and_remove_a_curve() {
    let dir = tempfile::tempdir().expect("temp dir");
    let project = copy_of_kestrel(dir.path());
    let p = project.to_str().expect("utf-8");
    let las = fixture("las/kestrel_unwrapped_m.las");
    let out = run(&["curve", p, "--las", &las, "--curve", "gr", "--depth-down", "--offset-m", "10"]);
    let err = text(&out.stderr);
    assert!(out.status.success(), "{err}");
    // 21 readings at depths 0–10 m with two NULLs (the fixture's ~A block); offset 10 m downward
    // puts them at heights 0–10 m, all inside the 35.1 m section.
    assert!(err.contains("attached GR (API)") && err.contains("21 samples (2 NULL)"), "{err}");
    assert!(err.contains("heights 0.00–10.00 m") && err.contains("21 lie within"), "{err}");
    assert!(Path::new(&format!("{p}.bak")).exists(), "the previous file is kept as .bak");
    let saved = aggrade_core::io::load(&project).expect("saved project opens").project;
    assert_eq!(saved.sections[0].curves.len(), 1);
    assert_eq!(saved.sections[0].curves[0].samples[0], (0.0, Some(73.0953)), "depth 10 m is the base");

    let list = run(&["curve", p]);
    assert!(list.status.success());
    let listed = text(&list.stdout);
    assert!(listed.contains("GR (API): 21 samples at 0.00–10.00 m, 21 inside the section"), "{listed}");

    // Without --curve a file with two curves asks which one.
    let out = run(&["curve", p, "--las", &las]);
    assert!(!out.status.success());
    assert!(
        text(&out.stderr).contains("choose one with --curve MNEMONIC (one of GR, K)"),
        "{}",
        text(&out.stderr)
    );

    let out = run(&["curve", p, "--remove", "GR"]);
    assert!(out.status.success(), "{}", text(&out.stderr));
    let saved = aggrade_core::io::load(&project).expect("opens").project;
    assert!(saved.sections[0].curves.is_empty());
    let out = run(&["curve", p, "--remove", "GR"]);
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains("has no curve \"GR\"; attached: none"), "{}", text(&out.stderr));
}

#[test]
fn malformed_las_names_file_and_line_and_changes_nothing() {
    let dir = tempfile::tempdir().expect("temp dir");
    let project = copy_of_kestrel(dir.path());
    let before = std::fs::read(&project).expect("read");
    let p = project.to_str().expect("utf-8");
    let bad = fixture("las/bad_number.las");
    let out = run(&["curve", p, "--las", &bad, "--curve", "GR"]);
    assert!(!out.status.success());
    let err = text(&out.stderr);
    // Line 29 holds "3,000" (a comma where the decimal point belongs).
    assert!(err.contains("bad_number.las, line 29") && err.contains("\"3,000\" is not a number"), "{err}");
    assert!(!err.contains("panicked"), "{err}");
    assert_eq!(std::fs::read(&project).expect("read"), before, "the project is untouched");
    // A bed-table CSV cannot hold curves: --out must name a project file.
    let csv = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/corrie_wash.csv");
    let las = fixture("las/kestrel_unwrapped_m.las");
    let out = run(&["curve", csv.to_str().expect("path"), "--las", &las, "--curve", "GR"]);
    assert!(!out.status.success());
    assert!(text(&out.stderr).contains("give --out NAME.aggrade"), "{}", text(&out.stderr));
}
