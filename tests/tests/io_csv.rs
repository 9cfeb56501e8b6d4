//! Bed-table CSV: the happy path, one test per kind of bad input (each asserting the line and
//! column named in the message), the writer's round trip, formula escaping, and Python's csv
//! module as an independent reader of what we write.

use aggrade_core::io::{self, read_bed_table, write_bed_table, Problem};
use aggrade_core::model::{
    Contact, GrainSize, LengthUnit, Lithology, PaleosolDevelopment, PaleosolFeature, Structure, SurfaceKind,
    WentworthClass,
};
use std::process::Command;

fn problems(text: &str) -> Vec<Problem> {
    read_bed_table(text, "t").expect_err("the table must be refused")
}

/// The single problem of a table, checked for line and column.
fn only_problem(text: &str, line: usize, column: &str) -> Problem {
    let ps = problems(text);
    assert_eq!(ps.len(), 1, "{ps:?}");
    assert_eq!(ps[0].line, Some(line), "{}", ps[0]);
    assert_eq!(ps[0].location, format!("column {column}"), "{}", ps[0]);
    let shown = ps[0].to_string();
    assert!(shown.contains(&format!("line {line}")) && shown.contains(column), "{shown}");
    ps[0].clone()
}

#[test]
fn happy_path_any_column_order_and_case() {
    let text = "\
Notes,Surface,Lithology,THICKNESS_M,grain base,grain_top,base_contact,base_relief_m,structures,paleosol,paleocurrents,colour
\"floodplain, rooted\",,Mudstone,2.5,silt,clay,,,root traces,weak,,red
lag at base,SB-1,sandstone,3.2,very_coarse_sand,0.3mm,Erosional,0.8,trough cross-bedding;mud clasts,,10;355.5;360,grey
,,covered,1.0,,,,,,,,
,P-9,Limestone,0.4,,,sharp,,,,,
";
    let read = read_bed_table(text, "Corrie Wash").expect("valid table");
    let s = &read.section;
    assert!(read.warnings.is_empty());
    assert_eq!(s.name, "Corrie Wash");
    assert_eq!(s.display_unit, LengthUnit::Metre);
    assert_eq!(s.beds.len(), 4);
    let ids: Vec<u64> = s.beds.iter().map(|b| b.id.0).collect();
    assert_eq!(ids, [1, 2, 3, 4]);
    assert_eq!(s.beds[0].notes, "floodplain, rooted");
    assert_eq!(s.beds[0].grain_top, Some(GrainSize::Class(WentworthClass::Clay)));
    let sand = &s.beds[1];
    assert_eq!(sand.lithology, Lithology::Sandstone);
    assert_eq!(sand.base_contact, Contact::Erosional);
    assert_eq!(sand.base_relief_m, Some(0.8));
    assert_eq!(sand.structures, [Structure::TroughCrossBedding, Structure::MudClasts]);
    assert_eq!(sand.azimuths().collect::<Vec<_>>(), [10.0, 355.5, 360.0]);
    // 0.3 mm → φ = −log2(0.3) = 1.7370 (Krumbein 1934).
    assert!(matches!(sand.grain_top, Some(GrainSize::Phi(p)) if (p - 1.7370).abs() < 5e-5));
    // Surface kind rule: erosional base → incision surface; a bed above a paleosol → paleosol top
    // (common practice).
    assert_eq!(sand.base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::Incision));
    assert!(s.beds[2].is_covered() && s.beds[2].grain_base.is_none());
    // Non-clastic rock: grain optional; bed below is covered (no paleosol) → other.
    assert_eq!(s.beds[3].base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::Other));
    assert!((s.total_thickness_m() - 7.1).abs() < 1e-12);
    assert!((s.exposed_thickness_m() - 6.1).abs() < 1e-12);
}

#[test]
fn surface_kind_from_paleosol_below_and_from_its_column() {
    let text = "thickness_m,lithology,grain,paleosol,surface,surface_kind\n\
                1,mudstone,clay,strong,,\n2,siltstone,silt,,P-1,\n1,sandstone,fine sand,,X,other\n";
    let s = read_bed_table(text, "t").expect("valid").section;
    assert_eq!(s.beds[1].base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::PaleosolTop));
    assert_eq!(s.beds[2].base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::Other));
}

#[test]
fn bad_thickness() {
    let p = only_problem(
        "thickness_m,lithology,grain\n1,sandstone,fine sand\n-1.5,mudstone,silt\n",
        3,
        "thickness_m",
    );
    assert!(p.message.contains("> 0") && p.message.contains("-1.5"), "{p}");
    let p = only_problem("thickness_cm,lithology,grain\nabc,mudstone,silt\n", 2, "thickness_cm");
    assert!(p.message.contains("\"abc\"") && p.message.contains("number"), "{p}");
    only_problem("thickness_m,lithology,grain\n0,mudstone,silt\n", 2, "thickness_m");
    only_problem("thickness_m,lithology,grain\nNaN,mudstone,silt\n", 2, "thickness_m");
    only_problem("thickness_m,lithology,grain\n1e999,mudstone,silt\n", 2, "thickness_m");
    // Larger than any bed (validation limit), reported against the row too.
    only_problem("thickness_m,lithology,grain\n5000,mudstone,silt\n", 2, "thickness_m");
}

#[test]
fn unknown_lithology() {
    let p = only_problem(
        "thickness_m,lithology,grain\n1,sandstone,fine sand\n1,sandstne,fine sand\n",
        3,
        "lithology",
    );
    assert!(p.message.contains("sandstne") && p.message.contains("claystone, mudstone"), "{p}");
}

#[test]
fn unknown_grain_size() {
    let p = only_problem(
        "thickness_m,lithology,grain_base,grain_top\n1,sandstone,gravelish,fine sand\n",
        2,
        "grain_base",
    );
    assert!(p.message.contains("gravelish") && p.message.contains("very fine sand"), "{p}");
    // A clastic bed needs a grain size; a covered one must have none.
    only_problem("thickness_m,lithology,grain\n1,mudstone,\n", 2, "grain");
    only_problem("thickness_m,lithology,grain\n1,covered,silt\n", 2, "grain");
}

#[test]
fn bad_azimuth() {
    let p = only_problem(
        "thickness_m,lithology,grain,paleocurrents\n1,sandstone,fine sand,10;400;20\n",
        2,
        "paleocurrents",
    );
    assert!(p.message.contains("400") && p.message.contains("0 to 360"), "{p}");
    only_problem("thickness_m,lithology,grain,paleocurrents\n1,sandstone,fine sand,NE\n", 2, "paleocurrents");
}

#[test]
fn missing_required_column() {
    let p = only_problem("thickness_m,grain\n1,fine sand\n", 1, "lithology");
    assert!(p.message.contains("required"), "{p}");
    let p = only_problem("lithology,grain\nsandstone,fine sand\n", 1, "thickness_m");
    assert!(p.message.contains("thickness_cm") && p.message.contains("thickness_ft"), "{p}");
}

#[test]
fn two_thickness_columns() {
    let p = only_problem(
        "thickness_m,lithology,thickness_ft,grain\n1,sandstone,3.3,fine sand\n",
        1,
        "thickness_m, thickness_ft",
    );
    assert!(p.message.contains("exactly one"), "{p}");
}

#[test]
fn other_vocabularies_name_what_is_valid() {
    let cases = [
        ("base_contact", "wavy", "erosional"),
        ("structures", "herringbone", "trough cross-bedding"),
        ("paleosol", "extreme", "very strong"),
        ("base_relief_m", "-0.2", "≥ 0"),
        ("carbonate_stage", "VII", "1–6"),
        ("surface_kind", "flooding", "incision surface"),
    ];
    for (column, value, valid) in cases {
        let extra = if column == "surface_kind" { ",surface" } else { "" };
        let extra_cell = if column == "surface_kind" { ",S" } else { "" };
        let text = format!(
            "thickness_m,lithology,grain,{column}{extra}\n1,sandstone,fine sand,{value}{extra_cell}\n"
        );
        let p = only_problem(&text, 2, column);
        assert!(p.message.contains(valid), "{column}: {p}");
    }
}

#[test]
fn every_bad_row_is_reported() {
    let text = "thickness_m,lithology,grain\n-1,sandstone,fine sand\n1,mudstone,silt\n2,basalt,\n1,sandstone,fine sand\nx,mudstone,silt\n";
    let lines: Vec<Option<usize>> = problems(text).iter().map(|p| p.line).collect();
    assert_eq!(lines, [Some(2), Some(4), Some(6)]);
}

#[test]
fn quoted_multiline_cells_keep_line_numbers_right() {
    // A quoted note spanning two lines: the next row starts on line 4 (RFC 4180 quoting).
    let text =
        "thickness_m,lithology,grain,notes\n1,sandstone,fine sand,\"first\nsecond\"\n-1,mudstone,silt,\n";
    let p = only_problem(text, 4, "thickness_m");
    assert!(p.message.contains("-1"));
}

#[test]
fn unknown_columns_are_warnings_not_dropped_silently() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("Sedge Creek.csv");
    std::fs::write(&path, "thickness_m,lithology,grain,Weather,\n1,sandstone,fine sand,hot,\n")
        .expect("write");
    let loaded = io::load(&path).expect("valid with warnings");
    assert_eq!(loaded.project.sections[0].name, "Sedge Creek", "the section takes the file stem");
    assert_eq!(loaded.warnings.len(), 2, "{:?}", loaded.warnings);
    let first = &loaded.warnings[0];
    assert!(
        first.path.ends_with("Sedge Creek.csv") && first.problem.to_string().contains("Weather"),
        "{first}"
    );
    assert_eq!(first.problem.line, Some(1), "{first}");
    assert!(first.to_string().contains("Sedge Creek.csv") && first.to_string().contains("line 1"), "{first}");
}

#[test]
fn load_names_the_file_in_errors() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("pell.csv");
    std::fs::write(&path, "thickness_ft,lithology,grain\n1,sandstone,fine sand\n2,sandstone,huge\n")
        .expect("write");
    let err = io::load(&path).expect_err("refused").to_string();
    assert!(err.contains("pell.csv") && err.contains("line 3") && err.contains("column grain"), "{err}");
    assert!(err.contains("\"huge\""), "the value is named: {err}");
}

#[test]
fn writer_round_trips_the_demo_sections() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    let loaded = io::load(&root.join("demo.aggrade")).expect("demo project loads");
    assert_eq!(loaded.project.sections.len(), 4);
    for section in &loaded.project.sections {
        let text = write_bed_table(section);
        let again = read_bed_table(&text, &section.name).expect("written table reads back").section;
        assert_eq!(again.beds.len(), section.beds.len());
        assert_eq!(again.display_unit, section.display_unit);
        for (a, b) in section.beds.iter().zip(&again.beds) {
            // Feet are written in feet and converted back: equal to rounding of the last bits.
            assert!((a.thickness_m - b.thickness_m).abs() <= 1e-12 * a.thickness_m, "{a:?} vs {b:?}");
            let mut b = b.clone();
            b.thickness_m = a.thickness_m;
            assert_eq!(a, &b);
        }
    }
}

#[test]
fn formula_cells_are_escaped_and_python_csv_reads_the_table() {
    // OWASP "CSV Injection": prefix cells starting with = + - @ tab CR with a quote mark.
    let text = "thickness_m,lithology,grain,notes,colour,surface,paleocurrents\n\
                1,sandstone,-1.5phi,=HYPERLINK(\"http://x\"),@red,+SB,10;20\n\
                2,mudstone,silt,\"a, b \"\"quoted\"\"\",grey,,\n";
    let section = read_bed_table(text, "t").expect("valid").section;
    assert_eq!(section.beds[0].notes, "=HYPERLINK(\"http://x\")");
    let written = write_bed_table(&section);
    // Independent oracle: Python's csv module (standard library) parses what we wrote.
    let code = "import csv,sys,json\nprint(json.dumps(list(csv.reader(sys.stdin))))";
    let mut child = Command::new("python3")
        .arg("-c")
        .arg(code)
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .spawn()
        .expect("python3 is needed for this reference check (csv module)");
    use std::io::Write;
    child.stdin.take().expect("stdin").write_all(written.as_bytes()).expect("write to python");
    let out = child.wait_with_output().expect("python runs");
    assert!(out.status.success(), "python csv failed");
    let rows: Vec<Vec<String>> = serde_json::from_slice(&out.stdout).expect("json from python");
    assert_eq!(rows.len(), 3);
    let col = |name: &str| rows[0].iter().position(|h| h == name).expect(name);
    assert_eq!(rows[1][col("notes")], "'=HYPERLINK(\"http://x\")");
    assert_eq!(rows[1][col("colour")], "'@red");
    assert_eq!(rows[1][col("surface")], "'+SB");
    assert_eq!(rows[1][col("grain_base")], "'-1.5phi");
    assert_eq!(rows[2][col("notes")], "a, b \"quoted\"");
    // Numbers are not text cells: no escaping.
    assert_eq!(rows[1][col("paleocurrents")], "10;20");
    assert_eq!(rows[1][col("thickness_m")], "1");
    // And it reads back to the same beds.
    let again = read_bed_table(&written, "t").expect("reads back").section;
    assert_eq!(again.beds, section.beds);
}

#[test]
fn a_field_log_typed_in_the_compact_notation_reads_as_the_full_names_say() {
    // An invented 13-bed log, base to top, typed with the codes of the compact notation; each
    // bed is checked against the same log written out in full words.
    let text = "thickness_m,lithology,grain,structures,base_contact,paleosol,paleocurrents,surface\n\
        2.4,mudstone,cl,rt,,m,,\n\
        0.6,siltstone,si,rcl,,,,\n\
        1.8,mudstone,cl,,,s cn,,\n\
        0.4,conglomerate,pb,bl,e1.2,,210 225,RG-E1\n\
        2.1,sandstone,c-m,tcb,,,\"200, 215, 230\",\n\
        1.9,sandstone,m-f,tcb,e,,,\n\
        1.5,sandstone,f,pcb,,,240,\n\
        3.2,mudstone,cl,rt,,w,,\n\
        0.5,sandstone,vf,rcl,s,,,\n\
        4.0,mudstone,cl,,,m,,\n\
        1.6,sandstone,m-f,la,e,,,\n\
        5.0,mudstone,cl,,,w,,\n\
        4.5,mudstone,si,,,,,\n";
    let section = read_bed_table(text, "t").expect("the notation reads").section;
    let beds = &section.beds;
    assert_eq!(beds.len(), 13);
    let class = |c| Some(GrainSize::Class(c));
    assert_eq!(beds[0].structures, vec![Structure::RootTraces]);
    assert_eq!(beds[0].paleosol, PaleosolDevelopment::Moderate);
    assert_eq!(beds[1].structures, vec![Structure::RippleCrossLamination]);
    assert_eq!(beds[2].paleosol, PaleosolDevelopment::Strong);
    assert_eq!(beds[2].paleosol_features, vec![PaleosolFeature::CarbonateNodules]);
    assert_eq!(beds[3].base_contact, Contact::Erosional);
    assert_eq!(beds[3].base_relief_m, Some(1.2));
    assert_eq!(beds[3].structures, vec![Structure::BasalLag]);
    assert_eq!(beds[3].azimuths().collect::<Vec<_>>(), vec![210.0, 225.0]);
    assert_eq!(beds[3].grain_base, class(WentworthClass::Pebble));
    assert_eq!(
        (beds[4].grain_base, beds[4].grain_top),
        (class(WentworthClass::CoarseSand), class(WentworthClass::MediumSand))
    );
    assert_eq!(beds[4].structures, vec![Structure::TroughCrossBedding]);
    assert_eq!(beds[4].azimuths().collect::<Vec<_>>(), vec![200.0, 215.0, 230.0]);
    assert_eq!(
        (beds[5].grain_base, beds[5].grain_top),
        (class(WentworthClass::MediumSand), class(WentworthClass::FineSand))
    );
    assert_eq!(beds[6].structures, vec![Structure::PlanarCrossBedding]);
    assert_eq!(beds[8].base_contact, Contact::Sharp);
    assert_eq!(beds[10].structures, vec![Structure::LateralAccretion]);
    assert_eq!(beds[11].paleosol, PaleosolDevelopment::Weak);
}

#[test]
fn a_code_that_fits_two_terms_is_refused_naming_both() {
    // `m` is the initial of both massive and mottling.
    let p = only_problem("thickness_m,lithology,grain,structures\n1,sandstone,f,m\n", 2, "structures");
    assert!(p.message.contains("massive") && p.message.contains("mottling"), "{p}");
}
