//! The one demo: the project shipped as `sample_sections/demo.aggrade` (four invented sections in
//! the imaginary Tamsin Ridge badlands), built into the program so that a start with no file and
//! a start whose file could not be read show the same demo wherever Aggrade is installed.
//!
//! Behind the tests only: a generated section (the invented "Brackenford Draw"), and long
//! sections repeated from it, used as test data; the window never shows them.

use aggrade_core::model::Project;
#[cfg(any(test, feature = "test-hooks"))]
use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, Lithology, Paleocurrent, PaleosolDevelopment, PaleosolFeature, Section,
    Structure, Surface, SurfaceKind, WentworthClass,
};

/// The demo project's text: the same bytes as `sample_sections/demo.aggrade`.
const DEMO_TEXT: &str = include_str!("../../../sample_sections/demo.aggrade");

/// The name the demo goes by in the window and in messages.
pub const DEMO_NAME: &str = "the demo project (invented Tamsin Ridge sections)";

/// The demo project, read from the text built into the program with the project file's own
/// reader. An error (a build whose demo file does not read, which a test rules out) is the
/// reader's message.
pub fn demo() -> Result<Project, String> {
    aggrade_core::io::read_project_text(DEMO_TEXT).map(|r| r.project).map_err(|problems| {
        let lines: Vec<String> = problems.iter().map(ToString::to_string).collect();
        format!("the built-in demo project does not read: {}", lines.join("; "))
    })
}

#[cfg(any(test, feature = "test-hooks"))]
fn bed(t: f64, l: Lithology, base: WentworthClass, top: WentworthClass) -> Bed {
    let mut b = Bed::new(BedId(0), t, l, Some(GrainSize::Class(base)));
    b.grain_top = Some(GrainSize::Class(top));
    b
}

/// Test data: one invented section with a base-level cycle: a paleosol cut by amalgamated channels, then
/// isolated channels in floodplain fines, capped by a strong paleosol and a second incision.
#[cfg(any(test, feature = "test-hooks"))]
pub fn demo_section() -> Section {
    use Lithology::*;
    use WentworthClass::*;
    let mut s = Section::new("Brackenford Draw");
    s.locality = "Ulvane Flats (invented demo area)".into();
    s.logged_by = "Demo".into();
    s.date_logged = Some("2026-06-14".into());
    let mut beds = Vec::new();
    let fines = |t: f64, soil: PaleosolDevelopment| {
        let mut b = bed(t, Mudstone, Clay, Clay);
        b.paleosol = soil;
        if soil != PaleosolDevelopment::None {
            b.paleosol_features = vec![PaleosolFeature::RootTraces, PaleosolFeature::Mottling];
            b.colour = "pale red mottled".into();
        }
        if soil.is_strong() {
            b.paleosol_features.push(PaleosolFeature::CarbonateNodules);
            b.paleosol_features.push(PaleosolFeature::Slickensides);
            b.carbonate_stage = Some(3);
        }
        b
    };
    beds.push(fines(3.2, PaleosolDevelopment::Weak));
    beds.push(fines(2.1, PaleosolDevelopment::VeryStrong));
    // Amalgamated coarse channels over the incision.
    for (k, (t, lo, hi)) in
        [(2.4, Pebble, CoarseSand), (2.0, VeryCoarseSand, MediumSand), (1.8, CoarseSand, MediumSand)]
            .into_iter()
            .enumerate()
    {
        let mut b = bed(t, if k == 0 { Conglomerate } else { Sandstone }, lo, hi);
        b.base_contact = Contact::Erosional;
        b.base_relief_m = Some(if k == 0 { 1.4 } else { 0.4 });
        b.structures = vec![Structure::TroughCrossBedding, Structure::DownstreamAccretion];
        if k == 0 {
            b.structures.push(Structure::BasalLag);
            b.base_surface = Some(Surface { name: "SB-1".into(), kind: SurfaceKind::Incision });
        } else {
            b.structures.push(Structure::MudClasts);
        }
        b.paleocurrents = [212.0, 198.0, 225.0, 205.0].into_iter().map(Paleocurrent::azimuth).collect();
        beds.push(b);
        if k == 1 {
            beds.push(bed(0.2, Mudstone, Silt, Silt));
        }
    }
    beds.push(fines(4.5, PaleosolDevelopment::Weak));
    // A proximal crevasse splay: thick, but gradational-based, coarsening up and rippled.
    let mut splay = bed(1.5, Sandstone, VeryFineSand, FineSand);
    splay.base_contact = Contact::Gradational;
    splay.structures = vec![Structure::RippleCrossLamination, Structure::HorizontalLamination];
    splay.notes = "proximal splay: climbing ripples, coarsening up".into();
    beds.push(splay);
    beds.push(fines(3.8, PaleosolDevelopment::Moderate));
    // Isolated fining-upward channels in thick fines.
    for (k, (t, fines_t)) in [(3.6, 5.2), (2.8, 6.1)].into_iter().enumerate() {
        let mut b = bed(t, Sandstone, MediumSand, VeryFineSand);
        b.base_contact = Contact::Erosional;
        b.structures = vec![
            Structure::LateralAccretion,
            Structure::TroughCrossBedding,
            Structure::RippleCrossLamination,
        ];
        b.paleocurrents = [140.0, 155.0, 122.0].into_iter().map(Paleocurrent::azimuth).collect();
        if k == 1 {
            // A soil on the sandstone top: its upper 0.6 m rooted and mottled.
            b.thickness_m = t - 0.6;
            beds.push(b);
            let mut top = bed(0.6, Sandstone, VeryFineSand, VeryFineSand);
            top.paleosol = PaleosolDevelopment::Moderate;
            top.paleosol_features = vec![PaleosolFeature::RootTraces, PaleosolFeature::Rhizoliths];
            top.notes = "rooted sandstone top: paleosol on the channel sand".into();
            beds.push(top);
            beds.push(bed(0.9, Siltstone, Silt, Silt));
            beds.push(fines(fines_t, PaleosolDevelopment::Weak));
            continue;
        }
        beds.push(b);
        beds.push(bed(0.9, Siltstone, Silt, Silt));
        beds.push(fines(fines_t, PaleosolDevelopment::Weak));
    }
    beds.push(fines(2.4, PaleosolDevelopment::Strong));
    let mut b = bed(3.1, Conglomerate, Cobble, CoarseSand);
    b.base_contact = Contact::Erosional;
    b.base_relief_m = Some(2.2);
    b.base_surface = Some(Surface { name: "SB-2".into(), kind: SurfaceKind::Incision });
    b.structures = vec![Structure::Imbrication, Structure::BasalLag];
    beds.push(b);
    let mut b = bed(2.6, Sandstone, CoarseSand, MediumSand);
    b.base_contact = Contact::Erosional;
    b.structures = vec![Structure::TroughCrossBedding, Structure::DownstreamAccretion];
    beds.push(b);
    beds.push(bed(1.5, Covered, Clay, Clay));
    if let Some(last) = beds.last_mut() {
        last.grain_base = None;
        last.grain_top = None;
    }
    beds.push(fines(2.0, PaleosolDevelopment::None));
    for (i, b) in beds.iter_mut().enumerate() {
        b.id = BedId(i as u64 + 1);
    }
    s.beds = beds.into();
    s
}

/// Test data: [`demo_section`] as a project (not the demo the window shows: that is [`demo`]).
#[cfg(any(test, feature = "test-hooks"))]
pub fn demo_project() -> Project {
    Project::new(vec![demo_section()])
}

/// A long generated section (for the frame benchmark and scrolling tests): repeating cycles.
#[cfg(any(test, feature = "test-hooks"))]
pub fn long_section(n_beds: usize) -> Section {
    let base = demo_section();
    let mut s = Section::new("Generated long section");
    for i in 0..n_beds {
        let mut b = base.beds[i % base.beds.len()].clone();
        b.id = BedId(i as u64 + 1);
        b.base_surface = None;
        s.beds.push(b);
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_built_in_demo_is_the_shipped_file_and_reads_without_warnings() {
        let shipped =
            std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade");
        let loaded = aggrade_core::io::load(&shipped).expect("the shipped demo reads");
        assert!(loaded.warnings.is_empty(), "{:?}", loaded.warnings);
        assert_eq!(demo().expect("the built-in demo reads"), loaded.project);
        let names: Vec<&str> = loaded.project.sections.iter().map(|s| s.name.as_str()).collect();
        assert_eq!(names, ["Corrie Wash", "Halloway Bluff", "Sedge Creek", "Pell Butte"]);
    }
}
