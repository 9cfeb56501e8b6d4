//! The field record in files: the bed table's optional columns (facies, Munsell colour,
//! bioturbation index, fossils, lag composition, soil horizon, drainage, photos, slope distance,
//! samples with kind and height, typed paleocurrent readings) read, refused with line and column,
//! written only when used and read back; Python's csv module as an independent reader of what is
//! written; and the project file's validation of the same fields, with line and field.

use aggrade_core::io::{
    read_bed_table, read_project_text, write_bed_table, Problem, MAX_RECORD_ITEMS_PER_BED, MAX_STRING_CHARS,
};
use aggrade_core::model::{Drainage, FaciesCode, Indicator, LengthUnit, SampleKind};
use std::io::Write;
use std::process::Command;

/// A table with every optional column of the field record, in metres.
const FULL: &str = "\
thickness_m,lithology,grain,paleocurrents,samples,facies,munsell,bioturbation_index,trace_fossils,body_fossils,lag_composition,soil_horizon,drainage,photos,slope_distance
2.4,sandstone,m-f,210t 185p/22 40a/12,SC-1 (dz @0.4); SC-2 (ts); SC-3,St,10YR 6/3,BI 2,Skolithos,unionid bivalves; plant fragments,\"quartzite pebbles, mud clasts\",,,IMG_2041; IMG_2042 (photos/IMG_2042.jpg),3.1
1.8,mudstone,cl,,SC-4 (pal @1.2),Fr,5R 4/6,4,Planolites; Taenidium,,,Bk2,well drained,IMG_2050,
0.9,mudstone,si,,,,N 6/,0,,,,Bg,pd,,
";

fn problems(text: &str) -> Vec<Problem> {
    read_bed_table(text, "t").expect_err("the table must be refused")
}

/// A table with one data row under `header`, refused: its problems.
fn row_problems(header: &str, row: &str) -> Vec<Problem> {
    problems(&format!("{header}\n{row}\n"))
}

/// The one problem of a refused table, checked for its line and column.
fn only_problem(text: &str, line: usize, column: &str) -> Problem {
    let ps = problems(text);
    assert_eq!(ps.len(), 1, "{ps:?}");
    assert_eq!(
        (ps[0].line, ps[0].location.as_str()),
        (Some(line), format!("column {column}").as_str()),
        "{}",
        ps[0]
    );
    ps[0].clone()
}

#[test]
fn every_field_record_column_reads() {
    let s = read_bed_table(FULL, "Corrie Wash").expect("valid table").section;
    assert_eq!(s.beds.len(), 3);
    let sand = &s.beds[0];
    assert_eq!(sand.facies, Some(FaciesCode::St));
    assert_eq!(sand.munsell.as_ref().map(ToString::to_string).as_deref(), Some("10YR 6/3"));
    assert_eq!(sand.bioturbation_index, Some(2));
    assert_eq!(sand.trace_fossils, ["Skolithos"]);
    assert_eq!(sand.body_fossils, ["unionid bivalves", "plant fragments"]);
    assert_eq!(sand.lag_composition, "quartzite pebbles, mud clasts");
    assert_eq!(sand.slope_distance_m, Some(3.1));
    let samples: Vec<(&str, Option<SampleKind>, Option<f64>)> =
        sand.samples.iter().map(|x| (x.id.as_str(), x.kind, x.height_in_bed_m)).collect();
    assert_eq!(
        samples,
        [
            ("SC-1", Some(SampleKind::DetritalZircon), Some(0.4)),
            ("SC-2", Some(SampleKind::ThinSection), None),
            ("SC-3", None, None)
        ]
    );
    let photos: Vec<(&str, Option<&str>)> =
        sand.photos.iter().map(|p| (p.reference.as_str(), p.file.as_deref())).collect();
    assert_eq!(photos, [("IMG_2041", None), ("IMG_2042", Some("photos/IMG_2042.jpg"))]);
    let readings: Vec<(f64, Indicator, Option<f64>)> =
        sand.paleocurrents.iter().map(|p| (p.azimuth_deg, p.indicator, p.dip_deg)).collect();
    assert_eq!(
        readings,
        [
            (210.0, Indicator::TroughAxis, None),
            (185.0, Indicator::PlanarForeset, Some(22.0)),
            (40.0, Indicator::AccretionSurface, Some(12.0))
        ]
    );
    // The accretion-surface dip is not a flow direction (Miall 1974).
    assert_eq!(sand.flow_azimuths().collect::<Vec<_>>(), [210.0, 185.0]);
    let soil = &s.beds[1];
    assert_eq!(soil.soil_horizon.as_ref().map(|h| h.as_str()), Some("Bk2"));
    assert_eq!(soil.drainage, Some(Drainage::WellDrained));
    assert_eq!(soil.bioturbation_index, Some(4));
    assert_eq!(soil.samples[0].height_in_bed_m, Some(1.2));
    assert_eq!(soil.facies, Some(FaciesCode::Fr));
    let gley = &s.beds[2];
    assert_eq!(gley.facies, None, "an empty facies cell leaves the suggested code in force");
    assert_eq!(gley.drainage, Some(Drainage::PoorlyDrained), "by code");
    assert_eq!(gley.munsell.as_ref().map(ToString::to_string).as_deref(), Some("N 6/"));
    assert_eq!(gley.bioturbation_index, Some(0));
}

#[test]
fn heights_and_slope_distances_are_in_the_tables_unit() {
    // 1 ft = 0.3048 m exactly (1959 international yard and pound agreement).
    let text = "thickness_ft,lithology,grain,samples,slope_distance\n10,sandstone,m,PB-1 (hs @2.5),12\n";
    let bed = &read_bed_table(text, "Pell Butte").expect("valid").section.beds[0];
    assert!((bed.samples[0].height_in_bed_m.unwrap_or(0.0) - 2.5 * 0.3048).abs() < 1e-12);
    assert!((bed.slope_distance_m.unwrap_or(0.0) - 12.0 * 0.3048).abs() < 1e-12);
    // A unit after the number says another (as in every length cell).
    let text = "thickness_m,lithology,grain,samples\n2,sandstone,m,X-1 (@40cm)\n";
    let bed = &read_bed_table(text, "t").expect("valid").section.beds[0];
    assert!((bed.samples[0].height_in_bed_m.unwrap_or(0.0) - 0.4).abs() < 1e-12);
}

#[test]
fn each_bad_cell_is_named_by_line_and_column_with_what_is_valid() {
    let h = "thickness_m,lithology,grain,munsell,bioturbation_index,facies,drainage,soil_horizon,samples,slope_distance";
    let cases: &[(&str, &str, &[&str])] = &[
        (
            "1,sandstone,m,10YR 11/4,,,,,,",
            "munsell",
            &["\"10YR 11/4\" is not a Munsell notation", "10YR 5/4"],
        ),
        ("1,sandstone,m,reddish,,,,,,", "munsell", &["\"reddish\""]),
        (
            "1,sandstone,m,,7,,,,,",
            "bioturbation_index",
            &["\"7\"", "0 (no bioturbation) to 6", "Taylor & Goldring"],
        ),
        ("1,sandstone,m,,,Sx,,,,", "facies", &["\"Sx\" is not a lithofacies code", "St, Sp", "Miall"]),
        (
            "1,sandstone,m,,,,soggy,,,",
            "drainage",
            &["\"soggy\" is not a drainage class", "wd (well drained)"],
        ),
        ("1,mudstone,cl,,,,,bt,,", "soil_horizon", &["\"bt\" is not a soil-horizon designation", "Bk2"]),
        (
            "1,sandstone,m,,,,,,SC-1 (zircons),",
            "samples",
            &["\"zircons\" is not a sample kind", "dz (detrital zircon)"],
        ),
        (
            "1,sandstone,m,,,,,,SC-1 (@-0.5),",
            "samples",
            &["sample SC-1: the height above the bed's base must be ≥ 0, got -0.5"],
        ),
        (
            "1,sandstone,m,,,,,,SC-1;SC-1,",
            "samples",
            &["\"SC-1\" is already the id of an earlier sample of this bed"],
        ),
        ("1,sandstone,m,,,,,,,-3", "slope_distance", &["must be > 0, got -3"]),
    ];
    for (row, column, parts) in cases {
        let ps = row_problems(h, row);
        assert_eq!(ps.len(), 1, "{row}: {ps:?}");
        assert_eq!(
            (ps[0].line, ps[0].location.as_str()),
            (Some(2), format!("column {column}").as_str()),
            "{row}"
        );
        let shown = ps[0].to_string();
        for part in *parts {
            assert!(shown.contains(part), "{row}: {shown:?} lacks {part:?}");
        }
        assert!(shown.starts_with("line 2: column "), "{shown}");
    }
}

#[test]
fn every_bad_row_of_a_table_is_reported_in_file_order() {
    let text = "thickness_m,lithology,grain,facies,munsell\n1,sandstone,m,St,10YR 5/4\n1,sandstone,m,Qq,\n\
                1,sandstone,m,,5Q 4/4\n";
    let ps = problems(text);
    let got: Vec<(Option<usize>, &str)> = ps.iter().map(|p| (p.line, p.location.as_str())).collect();
    assert_eq!(got, [(Some(3), "column facies"), (Some(4), "column munsell")]);
}

#[test]
fn huge_lists_and_very_long_texts_are_refused_naming_the_cell() {
    // A thousand samples on one bed is the most (aggrade_core::io::limits).
    let many: Vec<String> = (0..=MAX_RECORD_ITEMS_PER_BED).map(|i| format!("S-{i}")).collect();
    let text = format!("thickness_m,lithology,grain,samples\n1,sandstone,m,{}\n", many.join(";"));
    let p = only_problem(&text, 2, "samples");
    assert!(p.message.contains("1001 samples; at most 1000 per bed"), "{p}");
    let text = format!("thickness_m,lithology,grain,trace_fossils\n1,sandstone,m,{}\n", many.join(";"));
    let p = only_problem(&text, 2, "trace_fossils");
    assert!(p.message.contains("1001 trace-fossil names"), "{p}");
    // A lag description past the text limit, on the second data row.
    let long = "q".repeat(MAX_STRING_CHARS + 1);
    let text = format!("thickness_m,lithology,grain,lag_composition\n1,sandstone,m,\n1,sandstone,m,{long}\n");
    let p = only_problem(&text, 3, "lag_composition");
    assert!(p.message.contains("text of 10001 characters; at most 10000 allowed"), "{p}");
    // A fossil name is printed beside the column: 200 characters at most.
    let text = format!("thickness_m,lithology,grain,body_fossils\n1,sandstone,m,{}\n", "n".repeat(201));
    let p = only_problem(&text, 2, "body_fossils");
    assert!(p.message.contains("201 characters; at most 200"), "{p}");
    // A photo cell of many long references: each reference is checked on its own.
    let refs = vec!["r".repeat(150); 80].join(";");
    let text = format!("thickness_m,lithology,grain,photos\n1,sandstone,m,{refs}\n");
    let bed =
        &read_bed_table(&text, "t").expect("12,000 characters, each reference within its limit").section.beds
            [0];
    assert_eq!(bed.photos.len(), 80);
}

#[test]
fn a_sample_above_its_beds_top_reads_and_is_a_warning() {
    // Not an error: shortening a bed in the window must not be refused for it.
    let text = "thickness_m,lithology,grain,samples\n1,sandstone,m,SC-1 (@1.5)\n";
    let s = read_bed_table(text, "t").expect("reads").section;
    let w = aggrade_core::io::record_warnings(&s);
    assert_eq!(w.len(), 1, "{w:?}");
    assert!(w[0].message.contains("above its top (the bed is 1 m thick)"), "{}", w[0]);
}

#[test]
fn a_slope_distance_does_not_stand_in_for_a_missing_thickness() {
    let text = "thickness_m,lithology,grain,slope_distance\n,sandstone,m,4.2\n";
    let p = only_problem(text, 2, "thickness_m");
    for part in ["required", "traverse", "bedding attitude", "project file"] {
        assert!(p.message.contains(part), "{p}");
    }
}

#[test]
fn written_tables_read_back_and_carry_the_new_columns_only_when_used() {
    let s = read_bed_table(FULL, "Corrie Wash").expect("valid").section;
    let written = write_bed_table(&s);
    let header = written.lines().next().unwrap_or("");
    assert!(
        header.ends_with(
            ",notes,facies,munsell,bioturbation_index,trace_fossils,body_fossils,lag_composition,soil_horizon,\
             drainage,photos,slope_distance"
        ),
        "{header}"
    );
    let again = read_bed_table(&written, "Corrie Wash").expect("reads back").section;
    assert_eq!(again.beds, s.beds);
    // A table without field-record values is written as before: none of the new columns, and
    // written again unchanged.
    let old = "thickness_m,lithology,grain,samples,paleocurrents\n1,sandstone,m,CW-1;CW-2,120 135\n2,mudstone,cl,,\n";
    let s = read_bed_table(old, "t").expect("valid").section;
    let written = write_bed_table(&s);
    assert_eq!(
        written.lines().next(),
        Some(
            "thickness_m,lithology,grain_base,grain_top,base_contact,base_relief_m,structures,paleosol,\
             paleosol_features,carbonate_stage,paleocurrents,surface,surface_kind,colour,fossils,samples,notes"
        )
    );
    assert!(written.contains(",CW-1;CW-2,"), "{written}");
    let again = read_bed_table(&written, "t").expect("reads back").section;
    assert_eq!(write_bed_table(&again), written);
    // Only the columns some bed uses: one soil horizon gives one more column.
    let mut one = again.clone();
    one.beds[1].soil_horizon = aggrade_core::model::SoilHorizon::parse("Bt").ok();
    let header = write_bed_table(&one).lines().next().unwrap_or("").to_string();
    assert!(header.ends_with(",notes,soil_horizon"), "{header}");
}

#[test]
fn a_table_in_feet_round_trips_its_heights() {
    let text = "thickness_ft,lithology,grain,samples,slope_distance\n10,sandstone,m,PB-1 (hs @2.5); PB-2 (@7.25),12.5\n";
    let s = read_bed_table(text, "Pell Butte").expect("valid").section;
    assert_eq!(s.display_unit, LengthUnit::Foot);
    let again = read_bed_table(&write_bed_table(&s), "Pell Butte").expect("reads back").section;
    let (a, b) = (&s.beds[0], &again.beds[0]);
    for (x, y) in a.samples.iter().zip(&b.samples) {
        let (hx, hy) = (x.height_in_bed_m.unwrap_or(0.0), y.height_in_bed_m.unwrap_or(0.0));
        // Feet are written in feet and converted back: equal to rounding of the last bits.
        assert!((hx - hy).abs() <= 1e-12, "{hx} vs {hy}");
    }
    assert!((a.slope_distance_m.unwrap_or(0.0) - b.slope_distance_m.unwrap_or(0.0)).abs() <= 1e-12);
}

/// Python's csv module (standard library) parses text as a spreadsheet import would.
fn python_rows(csv: &str) -> Vec<Vec<String>> {
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
    serde_json::from_slice(&out.stdout).expect("json from python")
}

#[test]
fn python_csv_reads_the_written_field_record() {
    let text = "thickness_m,lithology,grain,samples,photos,lag_composition,trace_fossils\n\
                2,sandstone,m,\"SC-1 (dz @0.4); =SC-2\",\"IMG_1 (photos/a, b.jpg); +IMG_2\",\"quartzite, chert\",-Skolithos\n";
    let s = read_bed_table(text, "t").expect("valid").section;
    assert_eq!(s.beds[0].samples[1].id, "=SC-2");
    assert_eq!(s.beds[0].trace_fossils, ["-Skolithos"]);
    let written = write_bed_table(&s);
    let rows = python_rows(&written);
    assert_eq!(rows.len(), 2, "{rows:?}");
    let col = |name: &str| rows[0].iter().position(|h| h == name).expect(name);
    // Each item of a list cell that a spreadsheet would run is escaped (OWASP "CSV Injection").
    assert_eq!(rows[1][col("samples")], "SC-1 (dz @0.4);'=SC-2");
    assert_eq!(rows[1][col("photos")], "IMG_1 (photos/a, b.jpg);'+IMG_2");
    assert_eq!(rows[1][col("lag_composition")], "quartzite, chert");
    assert_eq!(rows[1][col("trace_fossils")], "'-Skolithos");
    assert_eq!(rows[0].len(), rows[1].len());
    assert_eq!(read_bed_table(&written, "t").expect("reads back").section.beds, s.beds);
}

/// A project file of one section, pretty-printed so that each field has its own line.
fn project_text(section_extra: &str, bed_extra: &str) -> String {
    format!(
        "{{\n  \"format_version\": 2,\n  \"sections\": [\n    {{\n      \"name\": \"Corrie Wash\",\n{section_extra}      \"beds\": [\n        {{\n          \"id\": 1,\n          \"thickness_m\": 2.0,\n          \"lithology\": \"sandstone\",\n          \"grain_base\": \"fine sand\",\n{bed_extra}          \"grain_top\": \"fine sand\"\n        }}\n      ]\n    }}\n  ]\n}}\n"
    )
}

#[test]
fn project_file_problems_name_line_and_field() {
    let good = project_text("", "");
    read_project_text(&good).expect("the plain project reads");
    // Bed fields: line 12 is the first of bed_extra.
    let bed_extra = "          \"bioturbation_index\": 7,\n          \"samples\": [{\"id\": \"CW-1\", \"height_in_bed_m\": -0.5}],\n          \"photos\": [{\"reference\": \" \"}],\n          \"slope_distance_m\": -1,\n";
    let ps = read_project_text(&project_text("", bed_extra)).expect_err("refused");
    let got: Vec<String> = ps.iter().map(ToString::to_string).collect();
    let want = [
        "line 12: sections[0].beds[0].bioturbation_index: must be a bioturbation index 0–6",
        "line 13: sections[0].beds[0].samples[0].height_in_bed_m: sample \"CW-1\": the height above the bed's base must be ≥ 0",
        "line 14: sections[0].beds[0].photos[0].reference: must not be empty",
        "line 15: sections[0].beds[0].slope_distance_m: must be > 0",
    ];
    assert_eq!(got.len(), want.len(), "{got:?}");
    for (g, w) in got.iter().zip(want) {
        assert!(g.starts_with(w), "{g:?} does not start with {w:?}");
    }
    // A bad Munsell string and an unknown facies code are refused by the reader, by field.
    let bed_extra = "          \"munsell\": \"10YR 5\",\n          \"facies\": \"Sx\",\n";
    let ps = read_project_text(&project_text("", bed_extra)).expect_err("refused");
    let got: Vec<String> = ps.iter().map(ToString::to_string).collect();
    assert!(
        got.iter().any(|g| g.starts_with("line 12: sections[0].beds[0].munsell") && g.contains("Munsell")),
        "{got:?}"
    );
    assert!(
        got.iter().any(|g| g.starts_with("line 13: sections[0].beds[0].facies") && g.contains("Sx")),
        "{got:?}"
    );
    // Section fields: line 6 is the first of section_extra.
    let section_extra = "      \"bedding\": {\"dip_deg\": 95, \"dip_direction_deg\": 30},\n      \"traverse\": {\"bearing_deg\": 400, \"slope_deg\": 10},\n      \"fixes\": [\n        {\"role\": \"top\", \"height_m\": -9, \"lat_deg\": 95, \"lon_deg\": 10}\n      ],\n      \"thickness_uncertainty_m\": -0.05,\n      \"body_lateral\": [{\"base_bed\": 4, \"width_m\": 0}],\n";
    let ps = read_project_text(&project_text(section_extra, "")).expect_err("refused");
    let got: Vec<String> = ps.iter().map(ToString::to_string).collect();
    let want = [
        "line 6: sections[0].bedding.dip_deg: must lie between 0 and 90 degrees, got 95",
        "line 7: sections[0].traverse.bearing_deg: must lie between 0 and 360 degrees, got 400",
        "line 9: sections[0].fixes[0].lat_deg: must lie between -90 and 90, got 95",
        "line 9: sections[0].fixes[0].height_m: must be a height of 0 m or more above the section's base, got -9",
        "line 11: sections[0].thickness_uncertainty_m: must be ≥ 0",
        "line 12: sections[0].body_lateral[0].base_bed: refers to bed id 4",
        "line 12: sections[0].body_lateral[0].width_m: must be > 0",
    ];
    for w in want {
        assert!(got.iter().any(|g| g.starts_with(w)), "{w:?} missing from {got:?}");
    }
    assert_eq!(got.len(), want.len(), "{got:?}");
}

#[test]
fn the_field_record_example_in_the_notation_document_reads() {
    // docs/notation.md shows the field-record columns in a second CSV block: it must read, with
    // each documented value where the document says.
    let doc = include_str!("../../docs/notation.md");
    let csv = doc
        .split("```csv\n")
        .nth(2)
        .and_then(|rest| rest.split("```").next())
        .expect("a second csv block in docs/notation.md");
    let s = read_bed_table(csv, "example").expect("the documented CSV reads").section;
    assert_eq!(s.beds.len(), 4);
    assert_eq!(s.beds[0].drainage, Some(Drainage::WellDrained));
    assert_eq!(s.beds[1].facies, Some(FaciesCode::Gh));
    assert_eq!(s.beds[1].paleocurrents[0].indicator, Indicator::Imbrication);
    assert_eq!(s.beds[1].photos[0].file.as_deref(), Some("photos/IMG_2051.jpg"));
    assert_eq!(s.beds[2].samples.len(), 2);
    assert_eq!(s.beds[2].slope_distance_m, Some(3.1));
    assert_eq!(s.beds[3].soil_horizon.as_ref().map(|h| h.as_str()), Some("Bg"));
    // Written again, it reads back to the same beds.
    assert_eq!(read_bed_table(&write_bed_table(&s), "example").expect("reads back").section.beds, s.beds);
}

/// The invented demo: the bed tables in `sample_sections/` hold the same beds and field record as
/// the project file, the demo carries some of every field of the record, and each thickness
/// worked out from a slope distance is the app's own true thickness of it.
#[test]
fn the_demo_carries_the_field_record_and_its_tables_agree_with_the_project() {
    use aggrade_core::analysis::attitude::true_thickness_m;
    use aggrade_core::io::load;
    use aggrade_core::model::FixRole;
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    let project = load(&root.join("demo.aggrade")).expect("the demo loads").project;
    for (file, name) in [
        ("corrie_wash.csv", "Corrie Wash"),
        ("halloway_bluff.csv", "Halloway Bluff"),
        ("sedge_creek.csv", "Sedge Creek"),
        ("pell_butte.csv", "Pell Butte"),
    ] {
        let csv = load(&root.join(file)).expect("the demo table loads").project.sections.remove(0);
        let s = project.section(name).expect("the section");
        assert_eq!(csv.beds.len(), s.beds.len(), "{file}");
        for (a, b) in s.beds.iter().zip(&csv.beds) {
            // Feet are written in feet and converted back: equal to rounding of the last bits.
            assert!((a.thickness_m - b.thickness_m).abs() <= 1e-12 * a.thickness_m, "{file}: {a:?} vs {b:?}");
            let mut b = b.clone();
            b.thickness_m = a.thickness_m;
            assert_eq!(a, &b, "{file}");
        }
    }
    let beds = || project.sections.iter().flat_map(|s| &s.beds);
    assert!(beds().any(|b| b.facies.is_some()), "some confirmed facies codes");
    let confirmed = beds().filter(|b| b.facies.is_some()).count();
    assert!(confirmed * 5 < beds().count(), "most beds are left to the suggestion");
    assert!(beds().flat_map(|b| &b.samples).any(|x| x.kind.is_some() && x.height_in_bed_m.is_some()));
    assert!(beds().any(|b| !b.photos.is_empty()));
    assert!(beds().any(|b| b.bioturbation_index.is_some() && !b.trace_fossils.is_empty()));
    assert!(beds().any(|b| !b.body_fossils.is_empty()));
    assert!(beds().any(|b| b.munsell.is_some()));
    assert!(beds().any(|b| !b.lag_composition.is_empty()));
    assert!(beds().any(|b| b.soil_horizon.is_some() && b.carbonate_stage.is_some() && b.drainage.is_some()));
    assert!(beds().flat_map(|b| &b.paleocurrents).any(|p| p.indicator == Indicator::AccretionSurface));
    assert!(beds().flat_map(|b| &b.paleocurrents).any(|p| p.indicator == Indicator::Imbrication));
    let sections = &project.sections;
    assert!(sections.iter().all(|s| s.method.is_some() && s.thickness_uncertainty_m.is_some()));
    let roles: Vec<FixRole> = sections.iter().flat_map(|s| &s.fixes).map(|f| f.role).collect();
    for role in [FixRole::Base, FixRole::Top, FixRole::Offset] {
        assert!(roles.contains(&role), "{role:?}");
    }
    let lateral: Vec<_> = sections.iter().flat_map(|s| &s.body_lateral).collect();
    assert!(lateral.iter().any(|l| l.beyond_outcrop) && lateral.iter().any(|l| !l.beyond_outcrop));
    let mut by_slope = 0;
    for s in sections {
        for b in &s.beds {
            let Some(d) = b.slope_distance_m else { continue };
            let (t, a) = (s.traverse.expect("a traverse"), s.bedding.expect("a bedding attitude"));
            let want = true_thickness_m(d, &t, &a).expect("a thickness");
            assert!(
                (b.thickness_m - want).abs() <= 1e-12,
                "{}: bed {}: {} vs {want}",
                s.name,
                b.id.0,
                b.thickness_m
            );
            by_slope += 1;
        }
    }
    assert!(by_slope >= 3, "a few beds given by slope distance");
}
