//! Invented demo data for previews, tests of drawing and benchmarks: a fluvial section at an
//! invented place with a hand-written interpretation. Not evidence of anything.

use crate::model::{
    Bed, BedId, Contact, GrainSize, LatLon, Lithology, PaleosolDevelopment, ReviewState, Section, Structure,
    WentworthClass as W,
};
use crate::rules::{
    BoundaryCandidate, CandidateKind, ChannelBody, CurvePoint, Element, GrainProfile, Interpretation,
    IntervalProportion, Regime, RegimeInterval, RuleParams, Stacking, Storey, Strength,
};
use crate::REVIEW_CAUTION;

fn bed(
    id: u64,
    t: f64,
    lith: Lithology,
    base: Option<W>,
    top: Option<W>,
    contact: Contact,
    structures: &[Structure],
) -> Bed {
    let mut b = Bed::new(BedId(id), t, lith, base.map(GrainSize::Class));
    b.grain_top = top.map(GrainSize::Class);
    b.base_contact = contact;
    b.structures = structures.to_vec();
    b
}

/// An invented 32 m section of stacked river channels and floodplain fines ("Tarn Gap Bluff").
pub fn sample_section() -> Section {
    use Contact::*;
    use Lithology::*;
    use Structure::*;
    let mut s = Section::new("Tarn Gap Bluff");
    s.locality = "Corrowin Creek, east bank (invented)".into();
    s.coordinates = Some(LatLon { lat_deg: -31.41527, lon_deg: 148.20311 });
    s.date_logged = Some("2026-07-14".into());
    s.logged_by = "R. Ashdown".into();
    let mut beds = vec![
        bed(1, 1.8, Mudstone, Some(W::Clay), Some(W::Clay), Sharp, &[RootTraces, Slickensides]),
        bed(2, 0.6, Siltstone, Some(W::Silt), Some(W::Silt), Gradational, &[HorizontalLamination]),
        bed(3, 2.2, Conglomerate, Some(W::Pebble), Some(W::Granule), Erosional, &[Imbrication, BasalLag]),
        bed(4, 2.6, Sandstone, Some(W::CoarseSand), Some(W::MediumSand), Sharp, &[TroughCrossBedding]),
        bed(
            5,
            1.9,
            Sandstone,
            Some(W::CoarseSand),
            Some(W::FineSand),
            Erosional,
            &[MudClasts, TroughCrossBedding],
        ),
        bed(6, 0.4, Mudstone, Some(W::Clay), Some(W::Clay), Sharp, &[]),
        bed(
            7,
            2.4,
            Sandstone,
            Some(W::MediumSand),
            Some(W::VeryFineSand),
            Erosional,
            &[LateralAccretion, RippleCrossLamination],
        ),
        bed(
            8,
            3.1,
            Mudstone,
            Some(W::Silt),
            Some(W::Clay),
            Gradational,
            &[RootTraces, CarbonateNodules, Mottling],
        ),
        bed(9, 0.5, Sandstone, Some(W::FineSand), Some(W::VeryFineSand), Sharp, &[RippleCrossLamination]),
        bed(10, 1.5, Claystone, Some(W::Clay), Some(W::Clay), Sharp, &[DesiccationCracks]),
        bed(11, 1.2, Covered, None, None, Sharp, &[]),
        bed(12, 0.3, Coal, None, None, Sharp, &[]),
        bed(13, 2.8, Shale, Some(W::Clay), Some(W::Silt), Sharp, &[Bioturbation]),
        bed(14, 0.4, Limestone, None, None, Sharp, &[]),
        bed(
            15,
            3.2,
            Sandstone,
            Some(W::VeryCoarseSand),
            Some(W::FineSand),
            Erosional,
            &[PlanarCrossBedding, SoftSedimentDeformation],
        ),
        bed(16, 1.6, Breccia, Some(W::Cobble), Some(W::Pebble), Erosional, &[Massive]),
        bed(17, 2.2, Mudstone, Some(W::Silt), Some(W::Clay), Sharp, &[RootTraces]),
        bed(18, 0.5, Dolostone, None, None, Sharp, &[]),
        bed(19, 0.9, Marl, Some(W::Clay), Some(W::Clay), Gradational, &[]),
        bed(20, 0.6, Tuff, Some(W::Silt), Some(W::Silt), Sharp, &[]),
        bed(21, 0.5, Evaporite, None, None, Sharp, &[]),
    ];
    beds[0].paleosol = PaleosolDevelopment::Moderate;
    beds[7].paleosol = PaleosolDevelopment::VeryStrong;
    beds[9].paleosol = PaleosolDevelopment::Weak;
    beds[16].paleosol = PaleosolDevelopment::Strong;
    let az = |v: &[f64]| v.iter().map(|a| crate::model::Paleocurrent::azimuth(*a)).collect::<Vec<_>>();
    beds[3].paleocurrents = az(&[192.0, 205.0, 214.0, 188.0, 230.0, 199.0]);
    beds[6].paleocurrents = az(&[150.0]);
    beds[14].paleocurrents = az(&[170.0, 240.0]);
    s.beds = beds.into();
    s
}

/// A hand-written interpretation of [`sample_section`] (what the rules might find there).
pub fn sample_interpretation(section: &Section) -> Interpretation {
    let bases = section.base_heights_m();
    let top = |i: usize| bases[i] + section.beds[i].thickness_m;
    let total = section.total_thickness_m();
    let storey = |a: usize, b: usize, amalg: bool| Storey {
        base_m: bases[a],
        top_m: top(b),
        first_bed: a,
        last_bed: b,
        amalgamated_base: amalg,
        capped_by_paleosol: false,
        body: 0,
    };
    let storeys = vec![storey(2, 3, false), storey(4, 4, true), storey(6, 6, false), storey(14, 15, false)];
    let body = |si: &[usize], stacking| {
        let (b, t) = (storeys[si[0]].base_m, storeys[si[si.len() - 1]].top_m);
        ChannelBody {
            base_m: b,
            top_m: t,
            thickness_m: t - b,
            stories: si.len(),
            stacking,
            censored: Vec::new(),
            amalgamated_bases: si.len() - 1,
            grain_finest: None,
            grain_coarsest: None,
            profile: GrainProfile::FiningUpward,
            style_hint: None,
            storey_indices: si.to_vec(),
            stability: None,
            flipped_by: None,
        }
    };
    let channel_bodies = vec![
        body(&[0, 1], Stacking::MultiStory),
        body(&[2], Stacking::SingleStory),
        body(&[3], Stacking::SingleStory),
    ];
    let elements = section
        .beds
        .iter()
        .map(|b| match b.lithology {
            Lithology::Covered => Element::Covered,
            Lithology::Sandstone | Lithology::Conglomerate | Lithology::Breccia => Element::ChannelDeposit,
            _ if b.paleosol != PaleosolDevelopment::None => Element::Paleosol,
            _ => Element::OverbankFines,
        })
        .collect();
    let exposed = section.exposed_thickness_m();
    let channel: f64 = channel_bodies.iter().map(|b| b.thickness_m).sum();
    // A smooth invented curve sampled every 0.5 m.
    let proportion_curve = (0..=(total / 0.5) as usize)
        .map(|k| {
            let h = k as f64 * 0.5;
            let p = if (bases[10]..top(10)).contains(&h) {
                None
            } else {
                Some((0.45 + 0.4 * (h / 5.0).sin() * (h / 13.0).cos()).clamp(0.0, 1.0))
            };
            CurvePoint { height_m: h, proportion: p }
        })
        .collect();
    let cand = |bed_index: usize, kind, strength, score, review| BoundaryCandidate {
        height_m: bases[bed_index],
        bed_index,
        bed_id: section.beds[bed_index].id,
        kind,
        strength,
        score,
        evidence: vec!["erosional relief beyond the storey below".into()],
        surface_name: None,
        label: None,
        stability: None,
        flipped_by: None,
        review,
        note: String::new(),
    };
    Interpretation {
        section: section.name.clone(),
        total_thickness_m: total,
        exposed_thickness_m: exposed,
        channel_proportion: Some(channel / exposed),
        channel_proportion_bounds: None,
        elements,
        storeys,
        channel_bodies,
        paleosols: Vec::new(),
        interval_proportions: vec![
            IntervalProportion { base_m: 0.0, top_m: bases[2], proportion: Some(0.0) },
            IntervalProportion { base_m: bases[2], top_m: bases[14], proportion: Some(0.55) },
            IntervalProportion { base_m: bases[14], top_m: total, proportion: Some(0.42) },
        ],
        proportion_curve,
        accommodation: vec![
            RegimeInterval {
                base_m: bases[2],
                top_m: top(5),
                regime: Regime::Low,
                why: "amalgamated storeys".into(),
            },
            RegimeInterval {
                base_m: top(5),
                top_m: bases[14],
                regime: Regime::High,
                why: "isolated storey in fines".into(),
            },
            RegimeInterval {
                base_m: bases[14],
                top_m: total,
                regime: Regime::Undetermined,
                why: "too little section".into(),
            },
        ],
        sequence_boundary_candidates: vec![
            cand(2, CandidateKind::ChannelBaseOnPaleosol, Strength::Strong, 0.55, ReviewState::Accepted),
            cand(14, CandidateKind::ChannelBodyBase, Strength::Moderate, 0.3, ReviewState::Candidate),
            cand(6, CandidateKind::ChannelBodyBase, Strength::Weak, 0.0, ReviewState::Rejected),
        ],
        unlisted_candidates: 0,
        cut_heights: vec![bases[2]],
        cuts_are_accepted: true,
        params: RuleParams::default(),
        caution: REVIEW_CAUTION.to_string(),
    }
}

/// A generated section of `n` beds cycling through channel sand and floodplain fines (for
/// benchmarks), ~0.36 m per bed on average, with its (trivial) interpretation.
pub fn generated_section(n: usize) -> (Section, Interpretation) {
    let base = sample_section();
    let mut s = Section::new(format!("Generated section, {n} beds"));
    s.beds = (0..n)
        .map(|i| {
            let mut b = base.beds[i % base.beds.len()].clone();
            b.id = BedId(i as u64 + 1);
            // Scale to ~0.36 m average (the demo beds average ~1.52 m).
            b.thickness_m = (b.thickness_m * 0.237).max(0.05);
            b
        })
        .collect();
    let total = s.total_thickness_m();
    let interp = Interpretation {
        section: s.name.clone(),
        total_thickness_m: total,
        exposed_thickness_m: s.exposed_thickness_m(),
        channel_proportion: None,
        channel_proportion_bounds: None,
        elements: vec![Element::Other; n],
        storeys: Vec::new(),
        channel_bodies: Vec::new(),
        paleosols: Vec::new(),
        interval_proportions: Vec::new(),
        proportion_curve: (0..=(total / 2.0) as usize)
            .map(|k| CurvePoint {
                height_m: k as f64 * 2.0,
                proportion: Some(0.5 + 0.3 * (k as f64 / 7.0).sin()),
            })
            .collect(),
        accommodation: Vec::new(),
        sequence_boundary_candidates: Vec::new(),
        unlisted_candidates: 0,
        cut_heights: Vec::new(),
        cuts_are_accepted: false,
        params: RuleParams::default(),
        caution: REVIEW_CAUTION.to_string(),
    };
    (s, interp)
}
