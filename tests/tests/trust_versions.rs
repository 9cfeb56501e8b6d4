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

/// The version 0 file (feet and centimetres, old field names), the version 1 file written from
/// it and the version 2 file written from that hold the same project, and the version 2 file
/// saves back byte for byte: migration keeps every value.
#[test]
fn version_0_and_1_migrate_to_the_same_project_as_their_version_2_save() {
    let v0 = open("v0_corrie_sedge.aggrade");
    let v1 = open("v1_corrie_sedge.aggrade");
    let v2 = open("v2_corrie_sedge.aggrade");
    assert_eq!(v0, v1);
    assert_eq!(v1, v2);
    let v2_text = std::fs::read_to_string(fixture("v2_corrie_sedge.aggrade")).expect("readable");
    assert_eq!(aggrade_core::io::project_to_json(&v2).expect("encodes"), v2_text);
}

/// A version 2 file with every field of the field record (facies, samples with kind and
/// height, photos, bioturbation, fossils by name, Munsell colour, lag, soil horizon, drainage,
/// slope distance, typed paleocurrent readings; method, uncertainty, bedding, traverse, GPS
/// fixes, channel-body widths) and non-English text reads and saves back byte for byte.
#[test]
fn a_version_2_field_record_saves_back_byte_identical() {
    let text = std::fs::read_to_string(fixture("v2_field_record.aggrade")).expect("readable");
    let p = open("v2_field_record.aggrade");
    assert_eq!(aggrade_core::io::project_to_json(&p).expect("encodes"), text);
    let s = &p.sections[0];
    assert_eq!(s.bedding.map(|b| (b.dip_deg, b.dip_direction_deg)), Some((12.0, 35.0)));
    assert_eq!(s.fixes.len(), 2);
    assert_eq!(s.body_lateral[0].width_m, Some(85.0));
    let soil = &s.beds[0];
    assert_eq!(soil.soil_horizon.as_ref().map(|h| h.master()), Some('B'));
    assert_eq!(soil.munsell.as_ref().map(|m| m.to_string()).as_deref(), Some("10R 6/2"));
    assert_eq!(soil.facies.map(|f| f.code()), Some("P"));
    let sand = &s.beds[1];
    assert_eq!(sand.flow_azimuths().collect::<Vec<_>>(), vec![205.0, 190.0], "accretion dip left out");
}

/// Version 1 beds held bare azimuths, sample ids as text and a Munsell notation as the colour:
/// they open as typed readings of unspecified indicator, samples with only an id, and the
/// notation as the Munsell colour (colour in words stays a colour).
#[test]
fn version_1_samples_colours_and_azimuths_open_unchanged_in_meaning() {
    use aggrade_core::model::Indicator;
    let raw: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(fixture("v1_samples_and_colours.aggrade")).expect("readable"),
    )
    .expect("JSON");
    let p = open("v1_samples_and_colours.aggrade");
    for (bed, raw_bed) in p.sections[0].beds.iter().zip(raw["sections"][0]["beds"].as_array().expect("beds"))
    {
        let want_az: Vec<f64> = raw_bed["paleocurrents_deg"]
            .as_array()
            .map(|a| a.iter().map(|v| v.as_f64().expect("number")).collect())
            .unwrap_or_default();
        assert_eq!(bed.azimuths().collect::<Vec<_>>(), want_az);
        assert!(bed
            .paleocurrents
            .iter()
            .all(|r| r.indicator == Indicator::Unspecified && r.dip_deg.is_none()));
        let want_ids: Vec<&str> =
            raw_bed["samples"].as_array().expect("samples").iter().map(|v| v.as_str().expect("id")).collect();
        assert_eq!(bed.samples.iter().map(|s| s.id.as_str()).collect::<Vec<_>>(), want_ids);
        assert!(bed.samples.iter().all(|s| s.kind.is_none() && s.height_in_bed_m.is_none()));
    }
    let beds = &p.sections[0].beds;
    assert_eq!(beds[0].munsell.as_ref().map(|m| m.to_string()).as_deref(), Some("10YR 5/4"));
    assert_eq!(beds[0].colour, "");
    assert_eq!(beds[1].munsell, None);
    assert_eq!(beds[1].colour, "greenish grey");
    assert_eq!(beds[0].fossils, "root casts");
    assert_eq!(beds[0].carbonate_stage, Some(2));
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

/// A version 1 file with every field the demo uses reads as the version 2 file written from it
/// (nothing dropped, nothing reordered), and that file saves back byte for byte.
#[test]
fn version_1_demo_excerpt_reads_as_its_version_2_save() {
    let v1 = open("v1_tamsin_demo_excerpt.aggrade");
    let v2 = open("v2_tamsin_demo_excerpt.aggrade");
    assert_eq!(v1, v2);
    let text = std::fs::read_to_string(fixture("v2_tamsin_demo_excerpt.aggrade")).expect("fixture readable");
    assert_eq!(aggrade_core::io::project_to_json(&v2).expect("encodes"), text);
    // The excerpt's raw azimuths are the readings' azimuths, bed by bed.
    let raw: serde_json::Value = serde_json::from_str(
        &std::fs::read_to_string(fixture("v1_tamsin_demo_excerpt.aggrade")).expect("readable"),
    )
    .expect("JSON");
    let mut compared = 0;
    for (s, raw_s) in v1.sections.iter().zip(raw["sections"].as_array().expect("sections")) {
        for (bed, raw_bed) in s.beds.iter().zip(raw_s["beds"].as_array().expect("beds")) {
            if let Some(a) = raw_bed["paleocurrents_deg"].as_array() {
                let want: Vec<f64> = a.iter().map(|v| v.as_f64().expect("number")).collect();
                assert_eq!(bed.azimuths().collect::<Vec<_>>(), want);
                compared += 1;
            }
        }
    }
    assert!(compared > 0, "the excerpt has paleocurrents to compare");
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
