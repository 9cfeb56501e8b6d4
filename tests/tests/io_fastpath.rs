//! The project reader's fast paths against its checked path: a file read bed by bed straight
//! into the typed model (and a valid file read in one pass) gives exactly the project, the
//! problems and the warnings that the field-by-field reading of a whole JSON tree gives; and a
//! bad bed deep in a big file is still reported with its path and line.

use aggrade_core::io::internals::{
    beds_with_unknown_fields, check_json_syntax, check_limits_and_fields, known_fields, read_project,
    read_project_raw, FieldRead,
};
use aggrade_core::io::{project_to_json, read_project_text, Problem};
use aggrade_core::model::{
    BaseRank, Bed, BedId, Contact, GrainSize, LatLon, LengthUnit, Lithology, Paleocurrent,
    PaleosolDevelopment, PaleosolFeature, Project, ReviewDecision, ReviewState, Sample, Section, Structure,
    Surface, SurfaceKind, WentworthClass,
};
use proptest::prelude::*;
use serde_json::Value;
use std::path::Path;

type Read = (Option<Project>, Vec<Problem>, Vec<Problem>);

/// A reading as a tuple, to compare the paths in one assertion.
fn parts(read: FieldRead) -> Read {
    (read.project, read.problems, read.warnings)
}

/// The checked path: the whole text parsed into a tree, then read field by field.
fn tree_read(text: &str) -> Read {
    let root: Value = serde_json::from_str(text).expect("test text is JSON");
    parts(read_project(&root))
}

/// A read with its line numbers taken off (to compare with the tree path, which has none yet).
fn without_lines(mut read: Read) -> Read {
    for p in read.1.iter_mut().chain(read.2.iter_mut()) {
        p.line = None;
    }
    read
}

/// The raw path: beds deserialised one by one from the text; beds the limits scan found unknown
/// fields in are checked field by field.
fn raw_read(text: &str) -> Read {
    let unknown = check_limits_and_fields(text, &known_fields()).expect("test text is within the limits");
    assert!(check_json_syntax(text).is_ok());
    parts(read_project_raw(text, &beds_with_unknown_fields(&unknown)))
}

/// A small deterministic generator (64-bit linear congruential, Knuth's MMIX constants).
struct Lcg(u64);

impl Lcg {
    fn next(&mut self, n: u64) -> u64 {
        self.0 = self.0.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1_442_695_040_888_963_407);
        (self.0 >> 33) % n
    }
    fn pick<T: Copy>(&mut self, all: &[T]) -> T {
        all[self.next(all.len() as u64) as usize]
    }
    /// A float with many significant digits, so a reader that lost a digit would be caught.
    fn float(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * (self.next(1 << 30) as f64 / f64::from(1u32 << 30))
    }
}

/// A bed with every field of the file format set (where its lithology allows).
fn full_bed(rng: &mut Lcg, id: u64) -> Bed {
    let lithology = rng.pick(&Lithology::ALL);
    let mut b = Bed::new(BedId(id), rng.float(0.01, 30.0), lithology, None);
    if lithology != Lithology::Covered {
        b.grain_base = Some(GrainSize::Class(rng.pick(&WentworthClass::ALL)));
        b.grain_top = Some(GrainSize::Phi(rng.float(-12.0, 14.0)));
    }
    b.structures = vec![rng.pick(Structure::ALL), rng.pick(Structure::ALL)];
    b.base_contact = rng.pick(Contact::ALL);
    b.base_relief_m = Some(rng.float(0.0, 5.0));
    b.paleosol = rng.pick(PaleosolDevelopment::ALL);
    b.paleosol_features = vec![rng.pick(PaleosolFeature::ALL)];
    b.carbonate_stage = Some(1 + rng.next(6) as u8);
    b.base_surface = Some(Surface { name: format!("S-{id} \"α\"\\"), kind: rng.pick(SurfaceKind::ALL) });
    b.base_rank = Some(rng.pick(BaseRank::ALL));
    b.colour = "5YR 4/4 red-brown".into();
    b.paleocurrents = (0..rng.next(6)).map(|_| Paleocurrent::azimuth(rng.float(0.0, 360.0))).collect();
    b.fossils = "plant fragments; unio shells".into();
    b.samples = vec![Sample::labelled(format!("TR-{id}")), Sample::labelled("=formula-like text")];
    b.notes = format!("bed {id}: line one\nline two, tab\there, quote \" and unicode φ ≥ 2");
    b
}

/// A project of `sections` sections with `beds` beds each, every section and bed field used.
fn full_project(sections: usize, beds: usize, seed: u64) -> Project {
    let mut rng = Lcg(seed);
    let list = (0..sections)
        .map(|k| {
            let mut s = Section::new(format!("Invented section {k}"));
            s.locality = "Tamsin Ridge badlands (invented)".into();
            s.coordinates =
                Some(LatLon { lat_deg: rng.float(-90.0, 90.0), lon_deg: rng.float(-180.0, 180.0) });
            s.date_logged = Some("2026-07-14".into());
            s.logged_by = "A. Example".into();
            s.notes = "measured with a Jacob staff".into();
            s.display_unit = if k % 2 == 0 { LengthUnit::Metre } else { LengthUnit::Foot };
            s.beds = (0..beds).map(|i| full_bed(&mut rng, i as u64 + 1)).collect();
            s.review = [ReviewState::Accepted, ReviewState::Rejected, ReviewState::Candidate]
                .iter()
                .enumerate()
                .map(|(j, state)| ReviewDecision {
                    bed: BedId((j * beds / 3) as u64 + 1),
                    state: *state,
                    note: format!("decision {j}"),
                    link: (j % 2 == 0).then(|| format!("SB-{j}")),
                })
                .collect();
            s.panel_position_m = Some(rng.float(-1e4, 1e4));
            s
        })
        .collect();
    Project::new(list)
}

fn demo_path() -> std::path::PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade")
}

#[test]
fn the_demo_reads_the_same_by_every_path() {
    let text = std::fs::read_to_string(demo_path()).expect("demo file");
    let compact = serde_json::to_string(&serde_json::from_str::<Value>(&text).expect("json")).expect("json");
    for t in [text.as_str(), compact.as_str()] {
        let checked = tree_read(t);
        assert!(checked.1.is_empty(), "demo has problems: {:?}", checked.1);
        let project = checked.0.clone().expect("demo reads");
        assert_eq!(raw_read(t), checked, "bed-by-bed path differs from the tree path");
        assert_eq!(read_project_text(t).expect("demo reads").project, project, "one-pass path differs");
    }
}

#[test]
fn a_generated_file_with_every_field_reads_back_exactly() {
    let project = full_project(3, 4_000, 2026);
    let pretty = project_to_json(&project).expect("encode");
    let compact = serde_json::to_string(&project).expect("encode");
    for text in [&pretty, &compact] {
        let read = read_project_text(text).expect("valid");
        assert!(read.warnings.is_empty(), "{:?}", read.warnings);
        assert_eq!(read.project, project, "one-pass path");
        let (tree, tree_problems, tree_warnings) = tree_read(text);
        assert!(tree_problems.is_empty() && tree_warnings.is_empty());
        assert_eq!(tree.as_ref(), Some(&project), "tree path");
        assert_eq!(raw_read(text), (Some(project.clone()), vec![], vec![]), "bed-by-bed path");
    }
}

/// Ways of breaking one bed (or the file around it) in its text.
const BREAKS: &[(&str, &str)] = &[
    ("\"thickness_m\":", "\"thickness_m\": \"thick\", \"th\":"),
    ("\"lithology\":\"", "\"lithology\":\"x"),
    ("\"grain_base\":\"", "\"grain_base\":\"very "),
    ("\"structures\":[", "\"structures\":[\"wiggles\","),
    ("\"base_contact\":\"", "\"base_contact\":\"un"),
    ("\"paleosol\":\"", "\"paleosol\":\"very "),
    ("\"carbonate_stage\":", "\"carbonate_stage\": 300, \"cs\":"),
    ("\"colour\":", "\"colr\": \"red\", \"colour\":"),
    ("\"colour\":", "\"col\\u006Fur\": \"red\", \"colour\":"),
    ("\"id\":", "\"id\": 5, \"id\":"),
    ("\"id\":", "\"id\": -1, \"x\":"),
    ("\"paleocurrents_deg\":[", "\"paleocurrents_deg\":[\"north\","),
    ("\"samples\":[", "\"samples\":[7,"),
    ("\"base_surface\":{", "\"base_surface\":{\"extra\": 1,"),
    ("{\"id\":", "7, {\"id\":"),
    ("{\"id\":", "[], {\"id\":"),
    ("\"beds\":[", "\"beds\": 3, \"more\":["),
    ("\"name\":", "\"name\": 12, \"x\":"),
    ("\"review\":[", "\"review\":[{\"bed\": \"one\"},"),
    ("\"display_unit\":\"", "\"display_unit\":\"furlong"),
    ("\"format_version\":", "\"format_version\": \"one\", \"v\":"),
    ("\"sections\":[", "\"sections\":[5, "),
];

proptest! {
    #![proptest_config(ProptestConfig { cases: 200, .. ProptestConfig::default() })]

    /// Any combination of breaks at any beds: the bed-by-bed path reports exactly what the tree
    /// path reports (problems, warnings and their order), and reads the same project when valid.
    #[test]
    fn broken_beds_are_reported_the_same_by_both_paths(
        seed in 0u64..1_000,
        breaks in proptest::collection::vec((0..BREAKS.len(), 0usize..60), 0..4),
    ) {
        let project = full_project(2, 12, seed);
        let mut text = serde_json::to_string(&project).expect("encode");
        for (k, nth) in breaks {
            let (find, replace) = BREAKS[k];
            let hits: Vec<usize> = text.match_indices(find).map(|(i, _)| i).collect();
            if hits.is_empty() {
                continue;
            }
            let at = hits[nth % hits.len()];
            text.replace_range(at..at + find.len(), replace);
        }
        // The raw path also gives a bad bed's problems their lines (from the bed's slice); the
        // tree path leaves lines to the file reader. Everything else is the same.
        prop_assert_eq!(without_lines(raw_read(&text)), tree_read(&text), "{}", text);
    }
}

#[test]
fn syntax_errors_match_the_tree_parser_exactly() {
    let deep = format!("{}1{}", "[".repeat(200), "]".repeat(200));
    for text in [
        "",
        "{",
        "{\"a\": [1, 2,]}",
        "{\"a\": NaN}",
        "{\"a\": 1e400}",
        "{\"a\": -1e400}",
        "{\"a\": \"bad \\q escape\"}",
        "{\"a\": \"control \u{1} char\"}",
        "{\"a\" 1}",
        "{1: 2}",
        "{\"a\": 1} trailing",
        "{\"a\": \"\\ud800\"}",
        "{\"a\": tru}",
        "{\"format_version\": 1,\n \"sections\": [\n {\"name\": \"A\", \"beds\": [{\"id\": 01}]}]}",
        deep.as_str(),
    ] {
        let ours = check_json_syntax(text).err().map(|e| (e.to_string(), e.line(), e.column()));
        let tree = serde_json::from_str::<Value>(text).err().map(|e| (e.to_string(), e.line(), e.column()));
        assert!(tree.is_some(), "{text:?} should be refused");
        assert_eq!(ours, tree, "{text:?}");
    }
    assert!(check_json_syntax("{\"a\": [1, -0, 1e300, \"\\u00e9\", {}, null, true]}").is_ok());
}

/// Where `needle` starts in `text`, as a 1-based line number (counted here, independently of
/// the reader's scanner).
fn line_of(text: &str, needle: &str) -> usize {
    let at = text.find(needle).expect("needle in text");
    1 + text[..at].bytes().filter(|&b| b == b'\n').count()
}

#[test]
fn a_bad_bed_deep_in_a_big_file_is_named_with_its_path_and_line() {
    // 100,000 beds, the most a section may hold; pretty JSON puts each field on its own line.
    let mut section = Section::new("Invented long section");
    section.beds = (0..100_000u64)
        .map(|i| {
            let t = 0.5 + (i % 7) as f64 * 0.25;
            Bed::new(BedId(i + 1), t, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)))
        })
        .collect();
    section.beds[98_765].thickness_m = 7.654_321;
    section.beds[99_998].paleocurrents =
        vec![Paleocurrent::azimuth(12.5), Paleocurrent::azimuth(271.828_125)];
    let pretty = project_to_json(&Project::new(vec![section])).expect("encode");
    let text = pretty.replacen("7.654321", "\"7.654321 m\"", 1).replacen("271.828125", "\"NE\"", 1);
    assert_eq!(text.len(), pretty.len() + 4 - 6, "both breaks applied");
    let problems = read_project_text(&text).expect_err("two bad beds refused");
    let found: Vec<(Option<usize>, &str)> = problems.iter().map(|p| (p.line, p.location.as_str())).collect();
    assert_eq!(
        found,
        [
            (Some(line_of(&text, "\"7.654321 m\"")), "sections[0].beds[98765].thickness_m"),
            // The reading's own line: its object opens on the line above its azimuth.
            (Some(line_of(&text, "\"NE\"") - 1), "sections[0].beds[99998].paleocurrents[1]"),
        ]
    );
    // serde's wording for a wrong type, which the reader passes on with the value.
    assert!(
        problems[0].message.contains("invalid type: string \"7.654321 m\", expected f64"),
        "{}",
        problems[0]
    );
    assert!(problems[1].message.contains("invalid type: string \"NE\", expected f64"), "{}", problems[1]);
}

#[test]
fn unknown_fields_deep_in_a_big_file_are_warned_with_lines_by_every_path() {
    let project = full_project(1, 20_000, 11);
    let text = serde_json::to_string_pretty(&project).expect("encode");
    let marker = "\"id\": 17777,";
    let text = text.replacen(marker, "\"id\": 17777,\n          \"colr\": \"grey\",", 1);
    // Valid apart from the unknown field: the one-pass path reads it and warns with the line.
    let read = read_project_text(&text).expect("valid with a warning");
    assert_eq!(read.project, project);
    let warned: Vec<(Option<usize>, &str)> =
        read.warnings.iter().map(|w| (w.line, w.location.as_str())).collect();
    assert_eq!(warned, [(Some(line_of(&text, "\"colr\"")), "sections[0].beds[17776].colr")]);
    // The bed-by-bed path and the tree path agree on it too (with a bad bed elsewhere, which is
    // what sends a file down the bed-by-bed path).
    let broken = text.replacen("\"id\": 3,", "\"id\": \"three\",", 1);
    let raw = raw_read(&broken);
    // Lines of the bed-by-bed path come from each bed's slice of the file: the same lines the
    // whole-file reader reports.
    assert_eq!(raw.1[0].line, Some(line_of(&broken, "\"id\": \"three\"")));
    assert_eq!(raw.2[0].line, Some(line_of(&broken, "\"colr\"")));
    let raw = without_lines(raw);
    assert_eq!(raw, tree_read(&broken));
    assert_eq!(raw.2.len(), 1, "{:?}", raw.2);
    assert_eq!(raw.2[0].location, "sections[0].beds[17776].colr");
    assert_eq!(raw.1.len(), 1, "{:?}", raw.1);
    assert_eq!(raw.1[0].location, "sections[0].beds[2].id");
}
