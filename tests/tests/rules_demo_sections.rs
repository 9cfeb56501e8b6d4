//! The demo sections (invented data in `sample_sections/`) read as their README describes them:
//! a regression check of the interpretation rules on whole logs, not evidence of correctness.
//! The project file and the four bed-table CSVs hold the same beds and give the same reading.

use aggrade_core::io;
use aggrade_core::model::{PaleosolDevelopment, Section};
use aggrade_core::rules::{interpret, CandidateKind, Censor, Element, Interpretation, RuleParams, Stacking};
use std::path::PathBuf;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../sample_sections")
}

fn demo(name: &str) -> (Section, Interpretation) {
    let project = io::load(&root().join("demo.aggrade")).expect("demo project loads").project;
    let s = project.section(name).expect("demo section").clone();
    let r = interpret(&s, &RuleParams::default());
    (s, r)
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-6
}

fn stackings(r: &Interpretation) -> Vec<(usize, Stacking)> {
    r.channel_bodies.iter().map(|b| (b.stories, b.stacking)).collect()
}

#[test]
fn corrie_wash_isolated_channels_a_proximal_splay_and_a_soil_on_a_sandstone_top() {
    let (s, r) = demo("Corrie Wash");
    // Isolated single-storey bodies in floodplain mudstone; none seen only in part.
    assert!(r.channel_bodies.iter().all(|b| b.stacking == Stacking::SingleStory && b.censored.is_empty()));
    assert_eq!(r.channel_bodies.len(), 5, "{:?}", stackings(&r));
    // The 1.4 m gradational-based, coarsening-up, rippled sand (bed 8) is a proximal splay.
    assert!(s.beds[7].notes.contains("proximal crevasse splay"));
    assert_eq!(r.elements[7], Element::SplaySand);
    // The point-bar sand with a soil on its top and the small channel cut into it: two bodies
    // meeting at the soil top, the lower one capped by a profile formed in the sandstone.
    let top = r.channel_bodies.iter().position(|b| close(b.top_m, 39.03)).expect("body under the soil");
    assert!(close(r.channel_bodies[top + 1].base_m, 39.03));
    let soil = r.paleosols.iter().find(|p| close(p.top_m, 39.03)).expect("the soil on the sandstone");
    assert!(soil.on_sandstone && soil.maturity == PaleosolDevelopment::Moderate, "{soil:?}");
    let c = r.sequence_boundary_candidates.iter().find(|c| close(c.height_m, 39.03)).expect("candidate");
    assert_eq!(c.kind, CandidateKind::ChannelBaseOnPaleosol);
    // The strong interfluve paleosol under SB-2 is one profile of two beds (weak over strong).
    let interfluve = r.paleosols.iter().find(|p| p.maturity.is_strong()).expect("strong profile");
    assert_eq!(interfluve.beds.len(), 2);
}

#[test]
fn halloway_bluff_one_amalgamated_body_of_seven_storeys() {
    // Each basal lag floors the storey above it and the 0.6 m scour fill at the top of a bar is
    // no storey: seven storeys (the first rules counted ten), on SB-1 over a very strongly
    // developed paleosol logged as two horizons.
    let (s, r) = demo("Halloway Bluff");
    assert_eq!(stackings(&r), vec![(7, Stacking::MultiStory)]);
    let body = &r.channel_bodies[0];
    assert!(close(body.base_m, 5.0) && close(body.top_m, 27.0) && body.censored.is_empty(), "{body:?}");
    let scour = s.beds.iter().position(|b| b.notes.starts_with("scour fill")).expect("the scour bed");
    let h = s.base_heights_m()[scour];
    assert!(r.storeys.iter().all(|st| !close(st.base_m, h)), "no storey starts at the scour ({h} m)");
    assert_eq!(r.paleosols[0].beds.len(), 2);
    assert_eq!(r.paleosols[0].maturity, PaleosolDevelopment::VeryStrong);
    let first = &r.sequence_boundary_candidates[0];
    assert!(close(first.height_m, 5.0) && first.kind == CandidateKind::ChannelBaseOnPaleosol);
}

#[test]
fn sedge_creek_three_and_three_storeys_and_paleosols_as_profiles() {
    // The lower and upper amalgamated bodies have three storeys each (the first rules: four and
    // five); between them two isolated bodies. The top body reaches the section top: censored.
    let (_, r) = demo("Sedge Creek");
    assert_eq!(
        stackings(&r),
        vec![
            (3, Stacking::MultiStory),
            (1, Stacking::SingleStory),
            (1, Stacking::SingleStory),
            (3, Stacking::MultiStory)
        ]
    );
    assert_eq!(r.channel_bodies[3].censored, vec![Censor::Top]);
    assert!(r.channel_bodies[..3].iter().all(|b| b.censored.is_empty()));
    // Both capping paleosols are logged as two horizons: one profile each, one candidate each at
    // the profile top (3.70 and 41.45 m), none between the horizons.
    let two_bed: Vec<(f64, f64)> =
        r.paleosols.iter().filter(|p| p.beds.len() == 2).map(|p| (p.base_m, p.top_m)).collect();
    assert_eq!(two_bed.len(), 2, "{two_bed:?}");
    assert!(close(two_bed[0].1, 3.7) && close(two_bed[1].1, 41.45), "{two_bed:?}");
    let heights: Vec<f64> = r.sequence_boundary_candidates.iter().map(|c| c.height_m).collect();
    for (base, top) in &two_bed {
        assert!(!heights.iter().any(|h| *h > base + 1e-6 && *h < top - 1e-6), "{heights:?}");
    }
    for h in [3.7, 41.45] {
        assert_eq!(heights.iter().filter(|x| close(**x, h)).count(), 1, "{heights:?}");
    }
}

#[test]
fn pell_butte_bodies_cut_by_covered_intervals_are_censored() {
    // The amalgamated body over SB-1 runs up to a covered interval; the two upper channels rest
    // on covered intervals: every thickness is a minimum, and the single storeys seen are
    // undetermined. The proportion is of the exposed thickness, with bounds for the cover.
    let (_, r) = demo("Pell Butte");
    assert_eq!(
        stackings(&r),
        vec![(3, Stacking::MultiStory), (1, Stacking::Undetermined), (1, Stacking::Undetermined)]
    );
    let censored: Vec<Vec<Censor>> = r.channel_bodies.iter().map(|b| b.censored.clone()).collect();
    assert_eq!(censored, vec![vec![Censor::Top], vec![Censor::Base], vec![Censor::Base]]);
    let p = r.channel_proportion.expect("exposed");
    let b = r.channel_proportion_bounds.expect("bounds");
    let total = r.total_thickness_m;
    let channel = r.channel_thickness_m();
    assert!(close(p, channel / r.exposed_thickness_m));
    assert!(close(b.covered_as_fines, channel / total));
    assert!(close(b.covered_as_channel, (channel + total - r.exposed_thickness_m) / total));
    assert!(b.covered_as_fines < p && p < b.covered_as_channel);
}

#[test]
fn the_csv_files_and_the_project_file_read_the_same() {
    let project = io::load(&root().join("demo.aggrade")).expect("demo project loads").project;
    for (file, name) in [
        ("corrie_wash.csv", "Corrie Wash"),
        ("halloway_bluff.csv", "Halloway Bluff"),
        ("sedge_creek.csv", "Sedge Creek"),
        ("pell_butte.csv", "Pell Butte"),
    ] {
        let csv = io::load(&root().join(file)).expect("demo CSV loads").project.sections.remove(0);
        let s = project.section(name).expect("section");
        assert_eq!(csv.beds.len(), s.beds.len(), "{file}");
        let (a, b) = (interpret(&csv, &RuleParams::default()), interpret(s, &RuleParams::default()));
        let spans = |r: &Interpretation| -> Vec<(f64, f64, usize, Stacking)> {
            r.channel_bodies.iter().map(|b| (b.base_m, b.top_m, b.stories, b.stacking)).collect()
        };
        let (x, y) = (spans(&a), spans(&b));
        assert_eq!(x.len(), y.len(), "{file}");
        for (p, q) in x.iter().zip(&y) {
            assert!(close(p.0, q.0) && close(p.1, q.1) && p.2 == q.2 && p.3 == q.3, "{file}: {x:?} vs {y:?}");
        }
        assert_eq!(a.elements, b.elements, "{file}");
        assert_eq!(a.paleosols.len(), b.paleosols.len(), "{file}");
    }
}
