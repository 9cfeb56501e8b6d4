//! Project file: round trip (property test), migration from the kept version 0 fixture, every
//! problem reported with path and line, atomic save with a backup, and deterministic output.

use aggrade_core::io::{self, backup_path, read_project_text, save_project, write_atomic};
use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, LatLon, LengthUnit, Lithology, Paleocurrent, PaleosolDevelopment,
    PaleosolFeature, Project, ReviewDecision, ReviewState, Sample, Section, Structure, Surface, SurfaceKind,
    WentworthClass,
};
use proptest::prelude::*;
use std::path::Path;

fn data(path: &str) -> std::path::PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("data").join(path)
}

// ---------- property test: any valid project saved and loaded is equal ----------

fn grain() -> impl Strategy<Value = GrainSize> {
    prop_oneof![
        (0..WentworthClass::ALL.len()).prop_map(|i| GrainSize::Class(WentworthClass::ALL[i])),
        // Measured sizes are kept to 4 decimals of phi (the text form's precision).
        (-120_000i32..=140_000).prop_map(|k| GrainSize::Phi(f64::from(k) / 10_000.0)),
    ]
}

fn text() -> impl Strategy<Value = String> {
    // Any characters, including quotes, backslashes, line breaks and non-Latin letters.
    "\\PC{0,12}"
}

fn bed(id: u64) -> impl Strategy<Value = Bed> {
    (
        (0..Lithology::ALL.len()),
        1e-3..500.0f64,
        grain(),
        grain(),
        proptest::collection::vec(0..Structure::ALL.len(), 0..3),
        (0..Contact::ALL.len(), proptest::option::of(0.0..50.0f64)),
        (0..PaleosolDevelopment::ALL.len(), proptest::collection::vec(0..PaleosolFeature::ALL.len(), 0..3)),
        proptest::option::of(1u8..=6),
        proptest::option::of(("[A-Za-z0-9][A-Za-z0-9 -]{0,7}", 0..SurfaceKind::ALL.len())),
        proptest::collection::vec(0.0..=360.0f64, 0..4),
        (text(), text(), proptest::collection::vec(text(), 0..2), text()),
    )
        .prop_map(
            move |(
                l,
                t,
                gb,
                gt,
                st,
                (c, relief),
                (p, pf),
                stage,
                surface,
                pc,
                (colour, fossils, samples, notes),
            )| {
                let lithology = Lithology::ALL[l];
                let mut b = Bed::new(BedId(id), t, lithology, None);
                match lithology.grain_size_rule() {
                    aggrade_core::model::GrainSizeRule::Forbidden => {}
                    _ => {
                        b.grain_base = Some(gb);
                        b.grain_top = Some(gt);
                    }
                }
                b.structures = st.into_iter().map(|i| Structure::ALL[i]).collect();
                b.base_contact = Contact::ALL[c];
                b.base_relief_m = relief;
                b.paleosol = PaleosolDevelopment::ALL[p];
                b.paleosol_features = pf.into_iter().map(|i| PaleosolFeature::ALL[i]).collect();
                b.carbonate_stage = stage;
                b.base_surface = surface.map(|(name, k)| Surface { name, kind: SurfaceKind::ALL[k] });
                b.paleocurrents = pc.into_iter().map(Paleocurrent::azimuth).collect();
                b.colour = colour;
                b.fossils = fossils;
                // A sample needs a label (a blank id is refused by validation).
                b.samples =
                    samples.into_iter().filter(|s| !s.trim().is_empty()).map(Sample::labelled).collect();
                b.notes = notes;
                b
            },
        )
}

fn section(index: usize) -> impl Strategy<Value = Section> {
    (1usize..12).prop_flat_map(move |n| {
        (
            (0..n).map(|i| bed(i as u64 * 3 + 1)).collect::<Vec<_>>(),
            text(),
            proptest::option::of((-90.0..=90.0f64, -180.0..=180.0f64)),
            proptest::option::of((1900u32..2100, 1u32..13, 1u32..29)),
            (0..LengthUnit::ALL.len()),
            proptest::option::of(-1e6..1e6f64),
            proptest::option::of((0..n, 0usize..3, text())),
        )
            .prop_map(move |(beds, locality, coords, date, unit, panel, review)| {
                let mut s = Section::new(format!("Section {index}"));
                s.locality = locality;
                s.coordinates = coords.map(|(lat_deg, lon_deg)| LatLon { lat_deg, lon_deg });
                s.date_logged = date.map(|(y, m, d)| format!("{y:04}-{m:02}-{d:02}"));
                s.display_unit = LengthUnit::ALL[unit];
                s.panel_position_m = panel;
                if let Some((i, state, note)) = review {
                    let state = [ReviewState::Candidate, ReviewState::Accepted, ReviewState::Rejected][state];
                    s.review = vec![ReviewDecision { bed: beds[i].id, state, note, link: None }];
                }
                s.beds = beds.into();
                s
            })
    })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, ..ProptestConfig::default() })]

    #[test]
    fn any_valid_project_saved_and_loaded_is_equal(a in section(0), b in section(1)) {
        let project = Project::new(vec![a, b]);
        prop_assert_eq!(io::validate_project(&project), vec![], "the generator makes valid projects");
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("p.aggrade");
        save_project(&path, &project).expect("saves");
        let loaded = io::load(&path).expect("loads");
        prop_assert!(loaded.warnings.is_empty(), "{:?}", loaded.warnings);
        prop_assert_eq!(&loaded.project, &project);
        // Deterministic: saving the loaded project gives the same bytes.
        let first = std::fs::read(&path).expect("read");
        save_project(&path, &loaded.project).expect("saves again");
        prop_assert_eq!(first, std::fs::read(&path).expect("read"));
    }
}

// ---------- migration ----------

#[test]
fn migrates_the_version_0_fixture() {
    let loaded = io::load(&data("io/v0_project.aggrade")).expect("v0 fixture loads");
    assert!(loaded.warnings.iter().any(|w| w.to_string().contains("version 0")), "{:?}", loaded.warnings);
    let p = &loaded.project;
    assert_eq!(p.format_version, Project::CURRENT_VERSION);
    assert_eq!(p.sections.len(), 2);
    let s = &p.sections[0];
    assert_eq!(s.display_unit, LengthUnit::Foot);
    let ids: Vec<u64> = s.beds.iter().map(|b| b.id.0).collect();
    assert_eq!(ids, [1, 2, 3, 4], "ids assigned from the base");
    // 10 ft and 6.5 ft at 0.3048 m/ft (1959 international yard and pound agreement).
    assert!((s.beds[0].thickness_m - 3.048).abs() < 1e-12);
    assert!((s.beds[1].thickness_m - 1.9812).abs() < 1e-12);
    let sand = &s.beds[1];
    assert_eq!(sand.grain_base, Some(GrainSize::Class(WentworthClass::CoarseSand)));
    assert_eq!(sand.grain_top, sand.grain_base);
    assert_eq!(sand.base_contact, Contact::Erosional);
    assert_eq!(sand.azimuths().collect::<Vec<_>>(), [20.0, 35.0, 10.0]);
    assert_eq!(sand.base_surface, Some(Surface { name: "SB-1".into(), kind: SurfaceKind::Incision }));
    assert!(s.beds[2].is_covered());
    let cm = &p.sections[1];
    assert_eq!(cm.display_unit, LengthUnit::Centimetre);
    assert!((cm.beds[0].thickness_m - 0.45).abs() < 1e-12);
    // Sharp base over a weak paleosol: paleosol top (surface kind rule, common practice).
    assert_eq!(cm.beds[1].base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::PaleosolTop));
    // 0.2 mm is φ 2.3219 (Krumbein 1934: −log2 0.2).
    assert!(matches!(cm.beds[1].grain_base, Some(GrainSize::Phi(x)) if (x - 2.3219).abs() < 5e-5));

    // Saved again it is version 1 and loads without the migration warning.
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("migrated.aggrade");
    save_project(&out, p).expect("saves");
    let again = io::load(&out).expect("loads");
    assert!(again.warnings.is_empty(), "{:?}", again.warnings);
    assert_eq!(&again.project, p);
    assert!(std::fs::read_to_string(&out).expect("read").contains("\"format_version\": 2"));
}

// ---------- every problem, with path and line ----------

#[test]
fn reports_every_problem_with_path_value_and_line() {
    let text = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Halloway Bluff",
      "coordinates": {"lat_deg": 95.0, "lon_deg": 10.0},
      "date_logged": "2026-02-30",
      "beds": [
        {"id": 1, "thickness_m": 1.0, "lithology": "sandstone", "grain_base": "fine sand", "grain_top": "fine sand"},
        {"id": 1, "thickness_m": -1.2, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"},
        {"id": 3, "thickness_m": 1.0, "lithology": "sandstone",
         "paleocurrents_deg": [10, 400], "carbonate_stage": 9, "base_relief_m": -2},
        {"id": 4, "thickness_m": 1.0, "lithology": "covered", "grain_base": "silt"}
      ],
      "review": [{"bed": 77, "state": "accepted"}]
    },
    {"name": "halloway bluff", "beds": []}
  ]
}"#;
    let problems = read_project_text(text).expect_err("refused");
    let found: Vec<(Option<usize>, &str)> = problems.iter().map(|p| (p.line, p.location.as_str())).collect();
    let expected = [
        (Some(6), "sections[0].coordinates.lat_deg"),
        (Some(7), "sections[0].date_logged"),
        (Some(10), "sections[0].beds[1].id"),
        (Some(10), "sections[0].beds[1].thickness_m"),
        (Some(11), "sections[0].beds[2].grain_base"),
        (Some(11), "sections[0].beds[2].grain_top"),
        (Some(12), "sections[0].beds[2].base_relief_m"),
        (Some(12), "sections[0].beds[2].paleocurrents[1].azimuth_deg"),
        (Some(12), "sections[0].beds[2].carbonate_stage"),
        (Some(13), "sections[0].beds[3].grain_base"),
        (Some(15), "sections[0].review[0].bed"),
        (Some(17), "sections[1].name"),
    ];
    for e in expected {
        assert!(found.contains(&e), "{e:?} not in {found:?}");
    }
    assert_eq!(found.len(), expected.len(), "{found:?}");
    let thickness = problems.iter().find(|p| p.location.ends_with("beds[1].thickness_m")).expect("thickness");
    assert_eq!(
        thickness.to_string(),
        "line 10: sections[0].beds[1].thickness_m: must be > 0 and ≤ 1000 m, got -1.2"
    );
}

#[test]
fn type_errors_name_the_field_and_the_valid_values() {
    let text = r#"{"format_version": 1, "sections": [{"name": "A", "beds": [
  {"id": 1, "thickness_m": "1.5", "lithology": "granite", "grain_base": "huge", "base_contact": "wavy",
   "structures": ["massive", 3], "colr": "red"}]}]}"#;
    let problems = read_project_text(text).expect_err("refused");
    let get = |field: &str| {
        problems
            .iter()
            .find(|p| p.location.ends_with(field))
            .unwrap_or_else(|| panic!("{field} missing from {problems:?}"))
    };
    assert!(get("thickness_m").message.contains("expected f64"), "{}", get("thickness_m"));
    assert!(get("lithology").message.contains("sandstone"), "{}", get("lithology"));
    assert!(get("grain_base").message.contains("huge"), "{}", get("grain_base"));
    assert!(get("base_contact").message.contains("erosional"), "{}", get("base_contact"));
    assert!(get("structures[1]").message.contains("invalid type"), "{}", get("structures[1]"));
    // Sorted by line; each on the line its value starts.
    let lines: Vec<Option<usize>> = problems.iter().map(|p| p.line).collect();
    assert_eq!(lines, [Some(2), Some(2), Some(2), Some(2), Some(3)], "{problems:?}");
    assert_eq!(problems.len(), 5, "{problems:?}");
}

// ---------- atomic save ----------

#[test]
fn save_keeps_the_previous_file_as_a_backup() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("demo.aggrade");
    let demo = io::load(&data("../../sample_sections/demo.aggrade")).expect("demo loads").project;
    let mut one = demo.clone();
    one.sections.truncate(1);
    save_project(&path, &one).expect("first save");
    save_project(&path, &demo).expect("second save");
    assert_eq!(io::load(&path).expect("loads").project, demo);
    assert_eq!(backup_path(&path), dir.path().join("demo.aggrade.bak"));
    assert_eq!(
        io::load(&backup_path(&path)).map(|l| l.project).ok(),
        None,
        ".bak is not a project extension"
    );
    let backup: Project =
        serde_json::from_slice(&std::fs::read(backup_path(&path)).expect("backup")).expect("json");
    assert_eq!(backup, one);
}

#[test]
fn a_failing_write_leaves_the_old_file_intact() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("p.aggrade");
    let demo = io::load(&data("../../sample_sections/demo.aggrade")).expect("demo loads").project;
    save_project(&path, &demo).expect("save");
    let before = std::fs::read(&path).expect("read");
    // The write fails half way (as on a full disk).
    let err = write_atomic(&path, |f| {
        use std::io::Write;
        f.write_all(b"{\"format_version\": 1, \"sec")?;
        Err(std::io::Error::other("no space left on device (simulated)"))
    })
    .expect_err("the write fails");
    assert!(err.to_string().contains("no space left"), "{err}");
    assert_eq!(std::fs::read(&path).expect("read"), before, "old file untouched");
    assert_eq!(io::load(&path).expect("still loads").project, demo);
    // The temporary file cannot even be created (its name is taken by a folder).
    std::fs::create_dir(dir.path().join(".p.aggrade.tmp")).expect("mkdir");
    let err = save_project(&path, &Project::new(vec![])).expect_err("save fails");
    assert!(err.to_string().contains("temporary file"), "{err}");
    assert_eq!(std::fs::read(&path).expect("read"), before, "old file untouched");
    let mut leftovers: Vec<String> = std::fs::read_dir(dir.path())
        .expect("ls")
        .filter_map(|e| e.ok())
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    leftovers.sort();
    assert_eq!(leftovers, [".p.aggrade.tmp", "p.aggrade"], "the old file and the blocking folder only");
}

#[test]
fn an_invalid_project_is_not_saved() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("p.aggrade");
    let mut s = Section::new("Corrie Wash");
    s.beds =
        vec![Bed::new(BedId(1), f64::NAN, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)))]
            .into();
    let err = save_project(&path, &Project::new(vec![s])).expect_err("refused");
    assert!(err.to_string().contains("beds[0].thickness_m"), "{err}");
    assert!(!path.exists());
}

#[test]
fn unknown_fields_in_a_valid_file_are_warnings_with_lines() {
    let text = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Pell Butte",
      "weather": "hot",
      "beds": [
        {"id": 1, "thickness_m": 1.0, "lithology": "coal",
         "colr": "black"}
      ]
    }
  ]
}"#;
    let read = read_project_text(text).expect("valid with warnings");
    let shown: Vec<String> = read.warnings.iter().map(|w| w.to_string()).collect();
    assert_eq!(shown.len(), 2, "{shown:?}");
    assert!(shown[0].starts_with("line 6: sections[0].weather: unknown field"), "{shown:?}");
    assert!(shown[1].starts_with("line 9: sections[0].beds[0].colr: unknown field"), "{shown:?}");
    assert!(shown[1].contains("colour"), "known fields listed: {shown:?}");
}

#[test]
fn correlation_labels_round_trip_and_bad_ones_are_named_with_their_line() {
    let text = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Sedge Creek",
      "beds": [
        {"id": 1, "thickness_m": 1.0, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"},
        {"id": 2, "thickness_m": 2.0, "lithology": "sandstone", "grain_base": "fine sand", "grain_top": "fine sand"}
      ],
      "review": [
        {"bed": 2, "state": "accepted", "link": "SB-2"}
      ]
    }
  ]
}"#;
    let read = read_project_text(text).expect("a label reads");
    assert!(read.warnings.is_empty(), "{:?}", read.warnings);
    let d = &read.project.sections[0].review[0];
    assert_eq!(d.link.as_deref(), Some("SB-2"));
    let json = aggrade_core::io::project_to_json(&read.project).expect("encode");
    assert!(json.contains("\"link\": \"SB-2\""), "{json}");
    assert_eq!(read_project_text(&json).expect("reads again").project, read.project);
    // Without a label nothing is written (files without labels stay as they were).
    let mut plain = read.project.clone();
    plain.sections[0].review[0].link = None;
    assert!(!aggrade_core::io::project_to_json(&plain).expect("encode").contains("\"link\""));
    // A label with a control character, a blank one and one of the wrong type: named with the
    // line, JSON path and field.
    let problems = read_project_text(&text.replace("\"SB-2\"", "\"SB\\u00072\"")).expect_err("refused");
    assert_eq!(problems.len(), 1, "{problems:?}");
    assert_eq!(problems[0].location, "sections[0].review[0].link");
    assert_eq!(problems[0].line, Some(11));
    assert!(problems[0].message.contains("U+0007"), "{}", problems[0]);
    let problems = read_project_text(&text.replace("\"SB-2\"", "\"  \"")).expect_err("refused");
    assert!(
        problems[0].to_string().starts_with("line 11: sections[0].review[0].link: must not be blank"),
        "{problems:?}"
    );
    let problems = read_project_text(&text.replace("\"SB-2\"", "2")).expect_err("refused");
    assert!(
        problems[0].to_string().contains("sections[0].review[0]: link: invalid type: integer `2`"),
        "{problems:?}"
    );
}

#[test]
fn review_states_read_old_and_new_words_and_refuse_others_naming_the_valid_ones() {
    let text = |state: &str| {
        format!(
            r#"{{
  "format_version": 1,
  "sections": [
    {{
      "name": "Sedge Creek",
      "beds": [
        {{"id": 1, "thickness_m": 1.0, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"}},
        {{"id": 2, "thickness_m": 2.0, "lithology": "sandstone", "grain_base": "fine sand", "grain_top": "fine sand"}}
      ],
      "review": [
        {{"bed": 2, "state": "{state}", "note": "scour?"}}
      ]
    }}
  ]
}}"#
        )
    };
    let state_of = |s: &str| read_project_text(&text(s)).map(|r| r.project.sections[0].review[0].state);
    assert_eq!(state_of("unreviewed").ok(), Some(ReviewState::Candidate));
    assert_eq!(state_of("candidate").ok(), Some(ReviewState::Candidate), "the old word is still read");
    assert_eq!(state_of("accepted").ok(), Some(ReviewState::Accepted));
    let written =
        aggrade_core::io::project_to_json(&read_project_text(&text("candidate")).expect("reads").project)
            .expect("encode");
    assert!(written.contains("\"state\": \"unreviewed\""), "written with the new word: {written}");
    let problems = state_of("open").expect_err("not a review state");
    let message = problems[0].to_string();
    assert!(
        message.contains("sections[0].review[0]")
            && message.contains("open")
            && message.contains("unreviewed"),
        "{message}"
    );
}
