//! Files written by every format version open in this build: one frozen fixture per version in
//! `tests/data/versions/`, loaded through the same path the app and the command line use.

use aggrade_core::io::load;
use aggrade_core::model::Project;
use std::path::PathBuf;

fn fixture(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/versions").join(name)
}

fn open(name: &str) -> Project {
    match load(&fixture(name)) {
        Ok(loaded) => loaded.project,
        Err(e) => panic!("{name} no longer opens:\n{e}"),
    }
}

/// Every fixture in the folder opens (a new version's fixture is picked up without editing this
/// test), and each version from 0 to the current one has at least one fixture.
#[test]
fn every_version_fixture_opens() {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("data/versions");
    let mut versions_seen = Vec::new();
    let mut entries: Vec<_> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "aggrade"))
        .collect();
    entries.sort();
    for path in &entries {
        let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        let raw: serde_json::Value =
            serde_json::from_str(&text).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        // A file without the field is version 0 (the first files had none).
        let version = raw.get("format_version").and_then(|v| v.as_u64()).unwrap_or(0);
        versions_seen.push(version);
        let loaded = load(path).unwrap_or_else(|e| panic!("version {version} file no longer opens:\n{e}"));
        assert!(!loaded.project.sections.is_empty(), "{}: no sections read", path.display());
        assert_eq!(loaded.project.format_version, Project::CURRENT_VERSION, "{}", path.display());
    }
    for v in 0..=u64::from(Project::CURRENT_VERSION) {
        assert!(versions_seen.contains(&v), "no fixture for format version {v} in {}", dir.display());
    }
}

/// The version 0 file (feet and centimetres, old field names) and the version 1 file written
/// from it hold the same project, and the version 1 file saves back byte for byte: migration
/// keeps every value.
#[test]
fn version_0_migrates_to_the_same_project_as_its_version_1_save() {
    let v0 = open("v0_corrie_sedge.aggrade");
    let v1 = open("v1_corrie_sedge.aggrade");
    assert_eq!(v0, v1);
    let v1_text = std::fs::read_to_string(fixture("v1_corrie_sedge.aggrade")).expect("readable");
    assert_eq!(aggrade_core::io::project_to_json(&v1).expect("encodes"), v1_text);
}

/// Early version 1 files stored a grain size given in mm as phi to 4 decimals (2.3219 for
/// 0.2 mm); they still open, and differ from the exact value only in that rounding.
#[test]
fn early_version_1_files_with_rounded_phi_still_open() {
    let exact = open("v1_corrie_sedge.aggrade");
    let rounded = open("v1_corrie_sedge_phi4.aggrade");
    let g = |p: &aggrade_core::model::Project| p.sections[1].beds[1].grain_base.expect("grain").phi();
    // -log2(0.2) = 2.321928… (Krumbein 1934); the early file holds it to 4 decimals.
    assert!((g(&exact) - 2.321_928_094_887_362).abs() < 1e-15);
    assert!((g(&rounded) - 2.3219).abs() < 1e-12);
    let mut rounded = rounded;
    for bed in &mut rounded.sections[1].beds {
        bed.grain_base = bed.grain_base.map(|_| exact.sections[1].beds[1].grain_base.expect("grain"));
        bed.grain_top = bed.grain_top.map(|_| exact.sections[1].beds[1].grain_top.expect("grain"));
    }
    // Sedge Creek bed 1 is silt (a class, not phi): put its class back after the overwrite.
    rounded.sections[1].beds[0] = exact.sections[1].beds[0].clone();
    assert_eq!(rounded, exact);
}

/// Unit conversion of the version 0 thicknesses, checked against the definitions.
#[test]
fn version_0_thicknesses_convert_exactly() {
    let p = open("v0_corrie_sedge.aggrade");
    let corrie = &p.sections[0].beds;
    // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959): 10 ft, 6.5 ft,
    // 2.5 ft, 4 ft as written in the version 0 file.
    let expected_m = [3.048, 1.9812, 0.762, 1.2192];
    assert_eq!(corrie.len(), expected_m.len());
    for (bed, want) in corrie.iter().zip(expected_m) {
        assert!(
            (bed.thickness_m - want).abs() < 1e-12,
            "bed {:?}: {} m, want {want} m",
            bed.id,
            bed.thickness_m
        );
    }
    // 1 cm = 0.01 m (SI): 45 cm and 80 cm.
    let sedge = &p.sections[1].beds;
    assert!((sedge[0].thickness_m - 0.45).abs() < 1e-12);
    assert!((sedge[1].thickness_m - 0.80).abs() < 1e-12);
    // A grain size given as 0.2 mm is kept as phi = -log2(0.2) = 2.3219 (Krumbein 1934), which is
    // fine sand (1/8-1/4 mm, Wentworth 1922).
    let grain = sedge[1].grain_base.expect("grain size read");
    assert!((grain.phi() - 2.321_928).abs() < 1e-3, "phi {}", grain.phi());
    assert_eq!(grain.class().name(), "fine sand");
}

/// A version 1 file with every field the demo uses reads back to identical JSON when saved
/// again (nothing dropped, nothing reordered).
#[test]
fn version_1_demo_excerpt_saves_back_byte_identical() {
    let path = fixture("v1_tamsin_demo_excerpt.aggrade");
    let text = std::fs::read_to_string(&path).expect("fixture readable");
    let project = open("v1_tamsin_demo_excerpt.aggrade");
    let written = aggrade_core::io::project_to_json(&project).expect("encodes");
    let reparsed: serde_json::Value = serde_json::from_str(&written).expect("valid JSON");
    let original: serde_json::Value = serde_json::from_str(&text).expect("valid JSON");
    assert_eq!(reparsed, original);
}

/// Version 1 files written before the review state was named "unreviewed" say "candidate": they
/// open with the state unreviewed (note and correlation label kept) and are saved with the new
/// word.
#[test]
fn a_review_state_written_as_candidate_opens_as_unreviewed_and_saves_as_unreviewed() {
    use aggrade_core::model::ReviewState;
    let p = open("v1_review_candidate.aggrade");
    let d = &p.sections[0].review[0];
    assert_eq!(d.state, ReviewState::Candidate);
    assert_eq!(d.state.name(), "unreviewed");
    assert_eq!(d.note, "check the scour at the east end");
    assert_eq!(d.link_label(), Some("SB-1"));
    let saved = aggrade_core::io::project_to_json(&p).expect("encodes");
    assert!(saved.contains("\"state\": \"unreviewed\""), "{saved}");
    assert!(!saved.contains("\"candidate\""), "{saved}");
    let again = aggrade_core::io::read_project_text(&saved).expect("reads again").project;
    assert_eq!(again, p);
}
