//! Never lose a word: projects with any valid Unicode in every text field (characters outside
//! the Basic Multilingual Plane, combining marks, right-to-left text, control characters,
//! strings right at each limit) save with the real save path and reopen equal; bed tables with
//! whatever a CSV cell can hold write and read back equal. Every limit is counted in characters
//! (`str::chars`), the unit validation uses, so what passes validation always reopens.
//!
//! Cases: 64 in the normal suite; a long run sets `PROPTEST_CASES` (e.g. `PROPTEST_CASES=20000
//! cargo test --workspace --test io_unicode_roundtrip`).

use aggrade_core::io::{
    self, project_to_json, read_bed_table, read_project_text, save_project, write_bed_table,
    MAX_LINK_LABEL_CHARS, MAX_STRING_CHARS,
};
use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, IndexDirection, LatLon, LengthUnit, Lithology, MeasuredCurve,
    Paleocurrent, PaleosolDevelopment, PaleosolFeature, Project, ReviewDecision, ReviewState, Sample,
    Section, Structure, Surface, SurfaceKind, WentworthClass,
};
use proptest::collection::vec;
use proptest::prelude::*;

// ---------- text generators ----------

/// Characters that break byte counting, escaping or trimming: 2-, 3- and 4-byte UTF-8 (Latin,
/// Cyrillic, CJK, Hangul, emoji, musical and hieroglyph signs outside the Basic Multilingual
/// Plane), combining marks, Hebrew and Arabic letters with direction marks and overrides, a zero
/// width joiner, the byte-order mark, control characters JSON must escape, line and paragraph
/// separators, quotes, backslashes, CSV separators and the characters spreadsheets run as formulas.
const AWKWARD: &[char] = &[
    'é',
    'ß',
    'ж',
    'Ω',
    '漢',
    '字',
    '한',
    '€',
    '😀',
    '🪨',
    '𝄞',
    '𓀀',
    '\u{10FFFF}',
    '\u{FFFD}',
    '\u{301}',
    '\u{308}',
    '\u{20DD}',
    '\u{1AB0}',
    'א',
    'ש',
    'ע',
    'ب',
    'ح',
    '\u{200F}',
    '\u{200E}',
    '\u{202E}',
    '\u{2067}',
    '\u{200D}',
    '\u{FEFF}',
    '\u{0}',
    '\u{1}',
    '\u{1F}',
    '\u{7F}',
    '\u{85}',
    '\n',
    '\r',
    '\t',
    '"',
    '\\',
    '\'',
    '/',
    '=',
    '+',
    '-',
    '@',
    ';',
    ',',
    ' ',
    '\u{A0}',
    '\u{2028}',
    '\u{2029}',
    '\u{3000}',
    'a',
    'Z',
    '0',
];

fn any_char() -> impl Strategy<Value = char> {
    prop_oneof![3 => proptest::sample::select(AWKWARD), 2 => any::<char>()]
}

fn short_text() -> impl Strategy<Value = String> {
    vec(any_char(), 0..16).prop_map(|v| v.into_iter().collect())
}

/// Exactly `n` characters: a short pattern drawn from `chars` repeated.
fn text_of(n: usize, chars: BoxedStrategy<char>) -> impl Strategy<Value = String> {
    vec(chars, 1..6).prop_map(move |pattern| pattern.iter().cycle().take(n).collect())
}

/// A text field: mostly short, sometimes exactly at `limit` characters, sometimes anywhere up to it.
fn field_text(limit: usize) -> BoxedStrategy<String> {
    prop_oneof![
        8 => short_text(),
        1 => text_of(limit, any_char().boxed()),
        1 => (1..=limit).prop_flat_map(|n| text_of(n, any_char().boxed())),
    ]
    .boxed()
}

/// A text that is not blank (names), at most `limit` characters.
fn name_text(prefix: String, limit: usize) -> impl Strategy<Value = String> {
    field_text(limit).prop_map(move |t| format!("{prefix}{t}").chars().take(limit).collect())
}

/// A correlation label: 1–40 characters, no control characters, not blank.
fn link_label() -> impl Strategy<Value = String> {
    let printable = any_char().prop_filter("no control characters", |c| !c.is_control()).boxed();
    prop_oneof![
        (1..=MAX_LINK_LABEL_CHARS).prop_flat_map(move |n| text_of(n, printable.clone().boxed())),
        text_of(MAX_LINK_LABEL_CHARS, any_char().prop_filter("printable", |c| !c.is_control()).boxed()),
    ]
    .prop_map(|label| {
        if label.trim().is_empty() {
            std::iter::once('L').chain(label.chars().skip(1)).collect()
        } else {
            label
        }
    })
}

// ---------- model generators ----------

fn grain() -> impl Strategy<Value = GrainSize> {
    prop_oneof![
        (0..WentworthClass::ALL.len()).prop_map(|i| GrainSize::Class(WentworthClass::ALL[i])),
        (-120_000i32..=140_000).prop_map(|k| GrainSize::Phi(f64::from(k) / 10_000.0)),
    ]
}

/// The free text of a bed: colour, fossils, samples, notes and the name of a surface at its base.
#[derive(Debug, Clone)]
struct BedText {
    colour: String,
    fossils: String,
    samples: Vec<String>,
    notes: String,
    surface: Option<String>,
}

fn bed(id: u64, text: impl Strategy<Value = BedText>) -> impl Strategy<Value = Bed> {
    (
        (0..Lithology::ALL.len(), 1u32..100_000, grain(), grain()),
        (vec(0..Structure::ALL.len(), 0..3), 0..Contact::ALL.len(), proptest::option::of(0u32..50_000)),
        (
            0..PaleosolDevelopment::ALL.len(),
            vec(0..PaleosolFeature::ALL.len(), 0..3),
            proptest::option::of(1u8..=6),
        ),
        (0..SurfaceKind::ALL.len(), vec(0u32..=360_000, 0..3)),
        text,
    )
        .prop_map(move |((l, t, gb, gt), (st, c, relief), (p, pf, stage), (kind, pc), text)| {
            let lithology = Lithology::ALL[l];
            let mut b = Bed::new(BedId(id), f64::from(t) / 1000.0, lithology, None);
            if lithology.grain_size_rule() != aggrade_core::model::GrainSizeRule::Forbidden {
                b.grain_base = Some(gb);
                b.grain_top = Some(gt);
            }
            b.structures = st.into_iter().map(|i| Structure::ALL[i]).collect();
            b.base_contact = Contact::ALL[c];
            b.base_relief_m = relief.map(|r| f64::from(r) / 1000.0);
            b.paleosol = PaleosolDevelopment::ALL[p];
            b.paleosol_features = pf.into_iter().map(|i| PaleosolFeature::ALL[i]).collect();
            b.carbonate_stage = stage;
            b.paleocurrents = pc.into_iter().map(|a| Paleocurrent::azimuth(f64::from(a) / 1000.0)).collect();
            b.base_surface = text.surface.map(|name| Surface { name, kind: SurfaceKind::ALL[kind] });
            b.colour = text.colour;
            b.fossils = text.fossils;
            // A sample needs a label, once per bed (validation refuses blank and repeated ids).
            let mut ids: Vec<String> = Vec::new();
            for s in text.samples.into_iter().filter(|s| !s.trim().is_empty()) {
                if !ids.contains(&s) {
                    ids.push(s);
                }
            }
            b.samples = ids.into_iter().map(Sample::labelled).collect();
            b.notes = text.notes;
            b
        })
}

/// Bed text for a project file: anything, up to the limit.
fn project_bed_text() -> impl Strategy<Value = BedText> {
    (
        field_text(MAX_STRING_CHARS),
        field_text(MAX_STRING_CHARS),
        vec(field_text(MAX_STRING_CHARS), 0..3),
        field_text(MAX_STRING_CHARS),
        proptest::option::of(name_text("S".into(), MAX_STRING_CHARS)),
    )
        .prop_map(|(colour, fossils, samples, notes, surface)| BedText {
            colour,
            fossils,
            samples,
            notes,
            surface,
        })
}

fn curve(k: usize) -> impl Strategy<Value = MeasuredCurve> {
    (
        name_text(format!("{k}:"), MAX_STRING_CHARS),
        (field_text(MAX_STRING_CHARS), field_text(MAX_STRING_CHARS), field_text(MAX_STRING_CHARS)),
        (-10_000i32..10_000, any::<bool>()),
        vec((0u32..10_000, proptest::option::of(-1_000i32..1_000)), 0..5),
    )
        .prop_map(|(mnemonic, (unit, description, source_file), (offset, depth), samples)| {
            let mut samples: Vec<(f64, Option<f64>)> = samples
                .into_iter()
                .map(|(h, v)| (f64::from(h) / 100.0, v.map(|v| f64::from(v) / 10.0)))
                .collect();
            samples.sort_by(|a, b| a.0.total_cmp(&b.0));
            MeasuredCurve {
                mnemonic,
                unit,
                description,
                source_file,
                offset_m: f64::from(offset) / 100.0,
                direction: if depth {
                    IndexDirection::DepthBelowDatum
                } else {
                    IndexDirection::HeightAboveDatum
                },
                samples,
            }
        })
}

fn review(beds: usize) -> impl Strategy<Value = Vec<(usize, usize, String, Option<String>)>> {
    vec((0..beds, 0usize..3, field_text(MAX_STRING_CHARS), proptest::option::of(link_label())), 0..=beds)
}

fn section(index: usize) -> impl Strategy<Value = Section> {
    (1usize..4).prop_flat_map(move |n| {
        (
            (1..=n).map(|i| bed(i as u64 * 2, project_bed_text())).collect::<Vec<_>>(),
            name_text(format!("{index}:"), MAX_STRING_CHARS),
            (field_text(MAX_STRING_CHARS), field_text(MAX_STRING_CHARS), field_text(MAX_STRING_CHARS)),
            (proptest::option::of((-90_000i32..=90_000, -180_000i32..=180_000)), 0..LengthUnit::ALL.len()),
            review(n),
            (0usize..3).prop_flat_map(|c| (0..c).map(curve).collect::<Vec<_>>()),
        )
            .prop_map(
                move |(beds, name, (locality, logged_by, notes), (coords, unit), review, curves)| {
                    let mut s = Section::new(name);
                    s.locality = locality;
                    s.logged_by = logged_by;
                    s.notes = notes;
                    s.coordinates = coords.map(|(a, b)| LatLon {
                        lat_deg: f64::from(a) / 1000.0,
                        lon_deg: f64::from(b) / 1000.0,
                    });
                    s.date_logged = Some(format!("2026-0{}-1{}", 1 + index % 9, index % 10));
                    s.display_unit = LengthUnit::ALL[unit];
                    let states = [ReviewState::Candidate, ReviewState::Accepted, ReviewState::Rejected];
                    for (i, state, note, link) in review {
                        let bed = beds[i].id;
                        if s.review.iter().all(|d| d.bed != bed) {
                            s.review.push(ReviewDecision { bed, state: states[state], note, link });
                        }
                    }
                    s.beds = beds.into();
                    s.curves = curves;
                    s
                },
            )
    })
}

fn project() -> impl Strategy<Value = Project> {
    (1usize..3).prop_flat_map(|n| (0..n).map(section).collect::<Vec<_>>()).prop_map(Project::new)
}

/// Bed text a bed-table cell can hold: cells are trimmed and `;` separates samples, so texts have
/// no white space at their ends, and samples no `;` and are not empty.
fn csv_text() -> BoxedStrategy<String> {
    let solid = || any_char().prop_filter("not white space", |c| !c.is_whitespace()).boxed();
    prop_oneof![
        8 => short_text().prop_map(|t| t.trim().to_string()),
        1 => text_of(MAX_STRING_CHARS, solid()),
        1 => (1..=MAX_STRING_CHARS).prop_flat_map(move |n| text_of(n, solid())),
    ]
    .boxed()
}

fn csv_bed_text() -> impl Strategy<Value = BedText> {
    let sample = csv_text().prop_map(|s| s.replace(';', ":")).prop_filter("not empty", |s| !s.is_empty());
    (csv_text(), csv_text(), vec(sample, 0..3), csv_text(), proptest::option::of(csv_text())).prop_map(
        |(colour, fossils, samples, notes, surface)| BedText {
            colour,
            fossils,
            samples,
            notes,
            surface: surface.map(|s| if s.is_empty() { "S".to_string() } else { s }),
        },
    )
}

fn csv_section() -> impl Strategy<Value = Section> {
    (1usize..5, 0..LengthUnit::ALL.len()).prop_flat_map(|(n, unit)| {
        (1..=n).map(|i| bed(i as u64, csv_bed_text())).collect::<Vec<_>>().prop_map(move |beds| {
            let mut s = Section::new("table");
            s.display_unit = LengthUnit::ALL[unit];
            s.beds = beds.into();
            s
        })
    })
}

/// Beds equal field by field; thickness to 1e-12 relative (a table in feet or centimetres keeps
/// the thickness in that unit, and converting back may move the last digit).
fn assert_beds_equal(want: &Section, got: &Section) -> Result<(), TestCaseError> {
    prop_assert_eq!(want.beds.len(), got.beds.len());
    for (a, b) in want.beds.iter().zip(&got.beds) {
        prop_assert!(
            (a.thickness_m - b.thickness_m).abs() <= 1e-12 * a.thickness_m,
            "{} vs {}",
            a.thickness_m,
            b.thickness_m
        );
        let mut b = b.clone();
        b.thickness_m = a.thickness_m;
        prop_assert_eq!(a, &b);
    }
    Ok(())
}

/// 64 cases, or `PROPTEST_CASES` for a long run (an explicit `cases` in the config would
/// otherwise override the variable).
fn cases() -> u32 {
    std::env::var("PROPTEST_CASES").ok().and_then(|v| v.parse().ok()).unwrap_or(64)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: cases(), ..ProptestConfig::default() })]

    #[test]
    fn any_unicode_in_every_text_field_saves_and_reopens_equal(project in project()) {
        prop_assert_eq!(io::validate_project(&project), vec![], "the generator makes valid projects");
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("unicode.aggrade");
        save_project(&path, &project).expect("a valid project saves");
        let loaded = io::load(&path).unwrap_or_else(|e| panic!("a saved project reopens: {e}"));
        prop_assert!(loaded.warnings.is_empty(), "{:?}", loaded.warnings);
        prop_assert_eq!(&loaded.project, &project);
        // The same through the text, without the file.
        let json = project_to_json(&project).expect("encodes");
        let read = read_project_text(&json).unwrap_or_else(|p| panic!("{p:?}"));
        prop_assert_eq!(&read.project, &project);
    }

    #[test]
    fn any_unicode_a_bed_table_holds_writes_and_reads_back_equal(section in csv_section()) {
        prop_assert_eq!(io::validate_section(&section), vec![], "the generator makes valid sections");
        let csv = write_bed_table(&section);
        let read = read_bed_table(&csv, "table").unwrap_or_else(|p| panic!("the written table reads: {p:?}"));
        prop_assert!(read.warnings.is_empty(), "{:?}", read.warnings);
        prop_assert_eq!(read.section.display_unit, section.display_unit);
        assert_beds_equal(&section, &read.section)?;
        // Through a file saved with the real atomic write and opened with the real loader.
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("table.csv");
        io::write_bytes_atomic(&path, csv.as_bytes()).expect("writes");
        let loaded = io::load(&path).unwrap_or_else(|e| panic!("{e}"));
        assert_beds_equal(&section, &loaded.project.sections[0])?;
    }
}

// ---------- named regressions: limits counted in characters, not bytes ----------

/// A one-bed project whose bed note is `note`.
fn project_with_note(note: String) -> Project {
    let mut s = Section::new("Corrie Wash");
    let mut bed = Bed::new(BedId(1), 1.5, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)));
    bed.notes = note;
    s.beds = vec![bed].into();
    Project::new(vec![s])
}

/// Save and reopen with the real paths; the reopened project must equal the saved one.
fn saves_and_reopens(project: &Project) {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("notes.aggrade");
    save_project(&path, project).expect("a valid project saves");
    let loaded = io::load(&path).unwrap_or_else(|e| panic!("the saved file must reopen: {e}"));
    assert_eq!(&loaded.project, project);
}

#[test]
fn a_bed_note_of_6000_e_acute_saves_and_reopens() {
    // 6,000 characters, 12,000 bytes: was refused on reopening as "text of 12000 characters".
    let note = "é".repeat(6_000);
    assert_eq!(note.len(), 12_000);
    saves_and_reopens(&project_with_note(note));
}

#[test]
fn cjk_and_emoji_notes_at_the_limit_save_and_reopen() {
    // 3 bytes a character (CJK) and 4 (emoji outside the Basic Multilingual Plane, which JSON
    // writers that escape non-ASCII write as a surrogate pair of two \u escapes).
    for c in ['漢', '😀', '𓀀'] {
        saves_and_reopens(&project_with_note(c.to_string().repeat(MAX_STRING_CHARS)));
    }
}

#[test]
fn escaped_characters_count_once_toward_the_limit() {
    // A file written by another tool may escape every non-ASCII character; each escape is one
    // character of the note (RFC 8259 §7), a surrogate pair too.
    for escape in ["\\u00e9", "\\uD83D\\uDE00", "\\n", "\\u0001"] {
        let text = |n: usize| {
            format!(
                r#"{{"format_version": 1, "sections": [{{"name": "A", "beds": [{{"id": 1, "thickness_m": 1.0,
                "lithology": "coal", "notes": "{}"}}]}}]}}"#,
                escape.repeat(n)
            )
        };
        let read = read_project_text(&text(MAX_STRING_CHARS)).unwrap_or_else(|p| panic!("{escape}: {p:?}"));
        assert_eq!(read.project.sections[0].beds[0].notes.chars().count(), MAX_STRING_CHARS);
        let problems = read_project_text(&text(MAX_STRING_CHARS + 1)).expect_err("one over is refused");
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert_eq!(
            problems[0].to_string(),
            format!(
                "line 2: sections[0].beds[0].notes: text of {} characters; at most {MAX_STRING_CHARS} allowed",
                MAX_STRING_CHARS + 1
            )
        );
    }
}

#[test]
fn a_note_one_character_over_the_limit_is_refused_at_save_with_its_count() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("over.aggrade");
    let err = save_project(&path, &project_with_note("é".repeat(MAX_STRING_CHARS + 1))).expect_err("refused");
    let msg = err.to_string();
    assert!(
        msg.contains("sections[0].beds[0].notes")
            && msg.contains("text of 10001 characters; at most 10000 allowed"),
        "{msg}"
    );
    assert!(!path.exists(), "nothing written");
}

#[test]
fn a_bed_table_note_at_the_limit_in_any_script_reads_back() {
    for c in ["é", "漢", "😀", "e\u{301}"] {
        let note: String = c.chars().cycle().take(MAX_STRING_CHARS).collect();
        let mut project = project_with_note(note.clone());
        let section = &mut project.sections[0];
        let read = read_bed_table(&write_bed_table(section), "t").unwrap_or_else(|p| panic!("{c}: {p:?}"));
        assert_eq!(read.section.beds[0].notes, note);
        // One over is refused, with the count in characters.
        section.beds[0].notes.push('x');
        let problems = read_bed_table(&write_bed_table(section), "t").expect_err("one over is refused");
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert_eq!(
            problems[0].to_string(),
            "line 2: column notes: text of 10001 characters; at most 10000 allowed"
        );
    }
}

#[test]
fn a_bed_table_note_at_the_limit_that_starts_like_a_formula_reads_back() {
    // The written cell carries a leading ' (formula escape) and so is one character longer than
    // the note; the limit applies to the note, not the cell.
    let note: String = "=é".chars().cycle().take(MAX_STRING_CHARS).collect();
    let project = project_with_note(note.clone());
    let csv = write_bed_table(&project.sections[0]);
    let read = read_bed_table(&csv, "t").unwrap_or_else(|p| panic!("{p:?}"));
    assert_eq!(read.section.beds[0].notes, note);
}

#[test]
fn bed_table_samples_are_limited_one_by_one_not_as_a_joined_cell() {
    // Three samples of 6,000 characters each are valid; their cell (18,002 characters) is not a
    // text value of its own.
    let mut project = project_with_note(String::new());
    project.sections[0].beds[0].samples =
        ["α".repeat(6_000), "β".repeat(6_000), "γ".repeat(6_000)].into_iter().map(Sample::labelled).collect();
    assert_eq!(io::validate_project(&project), vec![]);
    let read =
        read_bed_table(&write_bed_table(&project.sections[0]), "t").unwrap_or_else(|p| panic!("{p:?}"));
    assert_eq!(read.section.beds[0].samples, project.sections[0].beds[0].samples);
}

#[test]
fn text_starting_with_an_apostrophe_before_a_formula_character_keeps_it_in_a_bed_table() {
    let mut project = project_with_note("'=not a formula".to_string());
    project.sections[0].beds[0].samples =
        ["'-7", "''@x", "'plain"].into_iter().map(Sample::labelled).collect();
    project.sections[0].beds[0].colour = "'".into();
    let read =
        read_bed_table(&write_bed_table(&project.sections[0]), "t").unwrap_or_else(|p| panic!("{p:?}"));
    assert_eq!(read.section.beds[0], project.sections[0].beds[0]);
}

#[test]
fn a_las_curve_description_of_6000_e_acute_attaches_saves_and_reopens() {
    use aggrade_core::analysis::las::{parse_las, IndexToSection};
    // LAS 2.0 header line: MNEM.UNIT VALUE : DESCRIPTION (CWLS LAS 2.0 specification).
    let description = "é".repeat(6_000);
    let text = format!(
        "~V\n VERS. 2.0 : v\n WRAP. NO : w\n~W\n NULL. -999.25 : n\n~C\n DEPT.M : depth\n GR.API : {description}\n~A\n 1.0 55.5\n 2.0 60.0\n"
    );
    let las = parse_las(&text, "édition.las").unwrap_or_else(|e| panic!("{e}"));
    let placement = IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 3.0 };
    let curve = las.measured_curve("GR", &placement, "édition.las").unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(curve.description, description);
    let mut project = project_with_note(String::new());
    project.sections[0].attach_curve(curve);
    saves_and_reopens(&project);
}

// ---------- columns in messages are counted in characters too ----------

#[test]
fn a_json_syntax_error_after_non_ascii_text_names_the_column_an_editor_shows() {
    // The same line with "e" and with "漢字 é" (7 bytes, 4 characters) before the error: the
    // column moves by the 3 extra characters, not by the 5 extra bytes.
    let column = |note: &str| {
        let text = format!("{{\"format_version\": 1,\n\"sections\": [{{\"name\": \"{note}\", x}}]}}");
        let problems = read_project_text(&text).expect_err("not JSON");
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert_eq!(problems[0].line, Some(2));
        let msg = &problems[0].message;
        let at = msg.find("(column ").unwrap_or_else(|| panic!("{msg}")) + "(column ".len();
        msg[at..].split(')').next().and_then(|n| n.parse::<usize>().ok()).unwrap_or_else(|| panic!("{msg}"))
    };
    assert_eq!(column("漢字 é"), column("e") + 3);
    // Line 2 is `"sections": [{"name": "e", x}]}`: x is its 28th character.
    assert_eq!(column("e"), 28);
}

#[test]
fn a_bad_utf8_byte_after_non_ascii_text_names_the_column_in_characters() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("bad.aggrade");
    // Line 2: `"notes": "ñandú ` then the invalid byte 0xFF: 16 characters (18 bytes) before it.
    let mut bytes = "{\n\"notes\": \"ñandú ".as_bytes().to_vec();
    bytes.push(0xFF);
    bytes.extend_from_slice(b"\"}\n");
    std::fs::write(&path, &bytes).expect("write");
    let msg = io::load(&path).expect_err("not UTF-8").to_string();
    assert!(msg.contains("line 2") && msg.contains("0xFF at column 17"), "{msg}");
}
