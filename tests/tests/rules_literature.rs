//! The rule defaults checked against the published values listed in the shared reference notes,
//! each check with its source beside it.

use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Section, Structure, WentworthClass,
};
use aggrade_core::rules::{interpret, CandidateKind, Element, Regime, RuleParams};

fn bed(t_m: f64, lith: Lithology, grain: WentworthClass, contact: Contact) -> Bed {
    let mut b = Bed::new(BedId(0), t_m, lith, Some(GrainSize::Class(grain)));
    b.base_contact = contact;
    b
}

fn section(beds: Vec<Bed>) -> Section {
    let mut s = Section::new("Reference");
    for (i, mut b) in beds.into_iter().enumerate() {
        b.id = BedId(i as u64 + 1);
        s.beds.push(b);
    }
    s
}

fn mud(t_m: f64) -> Bed {
    bed(t_m, Lithology::Mudstone, WentworthClass::Silt, Contact::Sharp)
}

#[test]
fn splay_limit_against_burns_et_al_2017() {
    // Burns et al. 2017 (J. Sed. Research): crevasse-splay sands average ~2.1 m near the channel,
    // thinning to ~0.8 m distally; coarsest grain lower-fine sand. The default limit must sit
    // between the two so that a typical distal splay is not counted as a channel.
    let p = RuleParams::default();
    assert!(p.splay_limit_m > 0.8 && p.splay_limit_m < 2.1, "splay limit {} m", p.splay_limit_m);

    // A distal splay as described there: 0.8 m, sharp-based, fine sand, ripple-laminated
    // (ripple lamination in a thin sheet sand: common practice), inside mudstone.
    let mut splay = bed(0.8, Lithology::Sandstone, WentworthClass::FineSand, Contact::Sharp);
    splay.structures.push(Structure::RippleCrossLamination);
    let r = interpret(&section(vec![mud(3.0), splay, mud(3.0)]), &p);
    assert_eq!(r.elements[1], Element::SplaySand);
    assert_eq!(r.channel_proportion, Some(0.0));
    assert!(r.channel_bodies.is_empty());
}

#[test]
fn drape_limit_is_thinner_than_a_splay() {
    // Common practice: mud drapes inside a channel belt are centimetres to decimetres thick,
    // thinner than the thinnest splay sheets worth logging (Burns et al. 2017: ~0.8 m distal).
    let p = RuleParams::default();
    assert!(p.drape_limit_m < p.splay_limit_m && p.drape_limit_m < 0.8);
}

#[test]
fn regime_thresholds_against_connectivity_studies() {
    // Larue & Hovadik 2006 (Petroleum Geoscience 12): connectivity is usually > 90 % above ~30 %
    // net-to-gross and falls steeply below, so bodies in a stretch under 0.3 are mostly isolated.
    let p = RuleParams::default();
    assert!(p.high_max_proportion <= 0.3, "high-accommodation ceiling {}", p.high_max_proportion);
    // Allen 1978 (Sed. Geol. 21; from memory): connectedness rises sharply above ~50 % channel
    // deposits: the floor for calling amalgamated, sand-rich stacking.
    assert!((p.low_min_proportion - 0.5).abs() < 1e-12);
    assert!(p.high_max_proportion < p.low_min_proportion);
}

#[test]
fn stacking_reads_as_in_shanley_and_mccabe_1994() {
    // Shanley & McCabe 1994 (AAPG Bull. 78): low accommodation → amalgamated multi-story bodies
    // with little floodplain; high accommodation → isolated single-story bodies in thick fines.
    let channel = |t| bed(t, Lithology::Sandstone, WentworthClass::MediumSand, Contact::Erosional);
    let low = section(vec![mud(1.0), channel(3.0), channel(3.0), channel(3.0), mud(1.0)]);
    let r = interpret(&low, &RuleParams::default());
    assert_eq!(r.accommodation.iter().find(|a| a.base_m == 1.0).map(|a| a.regime), Some(Regime::Low));

    let high = section(vec![mud(4.0), channel(1.5), mud(8.0), channel(1.5), mud(8.0)]);
    let r = interpret(&high, &RuleParams::default());
    assert_eq!(r.accommodation.iter().find(|a| a.base_m == 4.0).map(|a| a.regime), Some(Regime::High));
}

#[test]
fn grain_jump_counted_on_the_wentworth_scale() {
    // Wentworth 1922 classes between silt and pebble: silt, very fine, fine, medium, coarse,
    // very coarse sand, granule, pebble → 7 steps; silt to medium sand is 3 steps, the ordinary
    // floodplain-to-channel change, which the default (4 classes) must not count as a jump.
    assert_eq!(WentworthClass::Pebble.rank() - WentworthClass::Silt.rank(), 7);
    assert_eq!(WentworthClass::MediumSand.rank() - WentworthClass::Silt.rank(), 3);
    let jumps = |grain| {
        let s = section(vec![mud(5.0), bed(2.0, Lithology::Sandstone, grain, Contact::Erosional), mud(5.0)]);
        let r = interpret(&s, &RuleParams::default());
        r.sequence_boundary_candidates
            .iter()
            .any(|c| c.evidence.iter().any(|e| e.to_string().starts_with("grain size jumps up")))
    };
    assert!(!jumps(WentworthClass::MediumSand));
    assert!(jumps(WentworthClass::CoarseSand));
    assert!(jumps(WentworthClass::Pebble));
}

#[test]
fn mature_paleosol_tops_score_as_interfluve_equivalents() {
    // Kraus 1999 (Earth-Sci. Rev. 47): thick, very well developed paleosols form during stability
    // at unconformities; a weakly developed one does not mark one on its own.
    let soil = |dev| {
        let mut b = mud(2.0);
        b.paleosol = dev;
        b
    };
    let score = |dev| {
        let s = section(vec![mud(3.0), soil(dev), mud(3.0)]);
        let r = interpret(&s, &RuleParams::default());
        let c = r.sequence_boundary_candidates.first().expect("a paleosol-top candidate");
        assert_eq!((c.kind, c.height_m), (CandidateKind::PaleosolTop, 5.0));
        c.score
    };
    assert!(score(PaleosolDevelopment::Strong) > 0.0);
    assert_eq!(score(PaleosolDevelopment::VeryStrong), score(PaleosolDevelopment::Strong));
    assert_eq!(score(PaleosolDevelopment::Weak), 0.0);
}
