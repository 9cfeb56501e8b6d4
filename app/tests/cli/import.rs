//! `aggrade import` and `aggrade curve --table` end to end on the built binary: a semicolon /
//! decimal-comma CSV and a generated .xlsx imported with the mapping printed, a saved mapping
//! used again, and bad input refused with file, line (or sheet and cell) and column while
//! nothing is written.

#[path = "../../../tests/tests/support/sheets.rs"]
mod sheets;

use super::harness::{run, text};
use sheets::V;
use std::path::{Path, PathBuf};

fn s(p: &Path) -> &str {
    p.to_str().expect("utf-8 path")
}

const EUROPEAN: &str = "\u{feff}Bed;Thickness (m);Rock type;Grain size;Notes\r\n\
1;1,20;sst;vc → m;Rinne\r\n\
2;0,45;mdst;si;\r\n\
3;2;cov;;\r\n";

fn write(dir: &Path, name: &str, bytes: &[u8]) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, bytes).expect("write input");
    p
}

#[test]
fn a_semicolon_decimal_comma_csv_is_imported_and_the_mapping_printed() {
    let dir = tempfile::tempdir().expect("temp dir");
    let input = write(dir.path(), "north wall.csv", EUROPEAN.as_bytes());
    let out = dir.path().join("north.aggrade");
    let map = dir.path().join("map.json");
    let o = run(&["import", s(&input), "--out", s(&out), "--save-mapping", s(&map)]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let stdout = text(&o.stdout);
    assert!(stdout.contains("UTF-8 with byte-order mark, delimiter ';', decimal comma"), "{stdout}");
    assert!(stdout.contains("\"Thickness (m)\" → thickness (in m)"), "{stdout}");
    assert!(stdout.contains("\"Rock type\" → lithology") && stdout.contains("not read: \"Bed\""), "{stdout}");
    assert!(stdout.contains("imported 3 beds (3.65 m) as section \"north wall\""), "{stdout}");
    let project = aggrade_core::io::load(&out).expect("written project opens").project;
    let beds = &project.sections[0].beds;
    assert_eq!(beds.len(), 3);
    assert_eq!((beds[0].thickness_m, beds[1].thickness_m), (1.2, 0.45));
    // Importing again adds a second section with its own name; the saved mapping is used.
    let o = run(&["import", s(&input), "--out", s(&out), "--mapping", s(&map), "--top-first"]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("rows reversed"), "{}", text(&o.stdout));
    let project = aggrade_core::io::load(&out).expect("opens").project;
    assert_eq!(project.sections.len(), 2);
    assert_eq!(project.sections[1].name, "north wall (imported)");
    assert_eq!(
        project.sections[1].beds[0].lithology,
        aggrade_core::model::Lithology::Covered,
        "top first: reversed"
    );
}

#[test]
fn a_generated_xlsx_is_imported_from_a_named_sheet() {
    let dir = tempfile::tempdir().expect("temp dir");
    let rows = vec![
        vec![V::S("From (m)"), V::S("To (m)"), V::S("Lithology"), V::S("Grain size")],
        vec![V::N(0.0), V::N(0.8), V::S("slst"), V::S("si")],
        vec![V::N(0.8), V::N(2.3), V::S("Sandstone"), V::S("ms")],
    ];
    let input = write(dir.path(), "log.xlsx", &sheets::xlsx("Logged 2026", &rows));
    let out = dir.path().join("log.aggrade");
    let o = run(&["import", s(&input), "--out", s(&out), "--sheet", "logged 2026", "--section", "Gully"]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    assert!(text(&o.stdout).contains("Excel workbook (.xlsx)"), "{}", text(&o.stdout));
    let project = aggrade_core::io::load(&out).expect("opens").project;
    assert_eq!(project.sections[0].name, "Gully");
    assert_eq!(project.sections[0].beds[1].thickness_m, 1.5);
}

#[test]
fn bad_input_names_the_place_and_writes_nothing() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("never.aggrade");
    let bad = write(dir.path(), "bad.csv", EUROPEAN.replace("0,45;mdst", "-0,45;mudd").as_bytes());
    let o = run(&["import", s(&bad), "--out", s(&out)]);
    assert!(!o.status.success());
    let err = text(&o.stderr);
    assert!(err.contains("bad.csv: 2 problems"), "{err}");
    assert!(err.contains("line 3: column \"Thickness (m)\": must be > 0"), "{err}");
    assert!(err.contains("line 3: column \"Rock type\": \"mudd\" is not a known lithology"), "{err}");
    assert!(!out.exists(), "nothing is written on failure");

    let unmapped = write(dir.path(), "de.csv", b"Dicke;Gestein\n1;sst\n");
    let o = run(&["import", s(&unmapped), "--out", s(&out)]);
    assert!(!o.status.success());
    let err = text(&o.stderr);
    assert!(
        err.contains("de.csv: 1 problem") && err.contains("Headers found: \"Dicke\", \"Gestein\""),
        "{err}"
    );
    assert!(!out.exists());

    let rows = vec![vec![V::S("Thickness"), V::S("Lithology")], vec![V::S("thick"), V::S("sst")]];
    let book = write(dir.path(), "b.xlsx", &sheets::xlsx("S1", &rows));
    let o = run(&["import", s(&book), "--out", s(&out)]);
    let err = text(&o.stderr);
    assert!(err.contains("sheet \"S1\", cell A2 (column \"Thickness\"): \"thick\" is not a number"), "{err}");
    assert!(!out.exists());

    let o = run(&["import", s(&bad), "--out", s(&dir.path().join("x.csv"))]);
    assert!(text(&o.stderr).contains("give --out NAME.aggrade"), "{}", text(&o.stderr));
}

#[test]
fn a_spectrometer_table_is_attached_as_a_curve() {
    let dir = tempfile::tempdir().expect("temp dir");
    let project = dir.path().join("kestrel.aggrade");
    std::fs::copy(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/data/analysis/kestrel_bluff.aggrade"),
        &project,
    )
    .expect("copy fixture");
    let table = write(
        dir.path(),
        "gs.txt",
        b"Height (m)\tK (%)\tU (ppm)\tTh (ppm)\n0.0\t1.2\t2.5\t9.8\n0.5\t1.4\tNaN\t10.1\n1.0\t1.1\t2.7\t11.0\n",
    );
    let o = run(&["curve", s(&project), "--table", s(&table), "--column", "K"]);
    let err = text(&o.stderr);
    assert!(o.status.success(), "{err}");
    assert!(err.contains("attached K (%)") && err.contains("3 samples (0 NULL)"), "{err}");
    let saved = aggrade_core::io::load(&project).expect("opens").project;
    let c = &saved.sections[0].curves[0];
    assert_eq!(c.samples, vec![(0.0, Some(1.2)), (0.5, Some(1.4)), (1.0, Some(1.1))]);
    assert_eq!(c.source_file, "gs.txt");
    let o = run(&[
        "curve",
        s(&project),
        "--table",
        s(&table),
        "--column",
        "U",
        "--depth-down",
        "--offset-m",
        "1",
    ]);
    assert!(o.status.success(), "{}", text(&o.stderr));
    let saved = aggrade_core::io::load(&project).expect("opens").project;
    let u = saved.sections[0].curves.iter().find(|c| c.mnemonic == "U").expect("U attached");
    assert_eq!(u.samples, vec![(0.0, Some(2.7)), (0.5, None), (1.0, Some(2.5))], "height = 1 − depth");
    let bad = write(dir.path(), "bad.txt", b"Height_m  K\n0  1.2\n0.5  lots\n");
    let o = run(&["curve", s(&project), "--table", s(&bad), "--column", "K"]);
    assert!(text(&o.stderr).contains("bad.txt, line 3: column \"K\""), "{}", text(&o.stderr));
}
