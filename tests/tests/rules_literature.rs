//! The rule defaults checked against the published values listed in the shared reference notes,
//! each check with its source beside it.

use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Section, Structure, WentworthClass,
};
use aggrade_core::rules::{interpret, interpret_with, CandidateKind, Element, Regime, RuleParams, Strength};

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
    // Shanley & McCabe 1994 (AAPG Bull. 78): low accommodation → amalgamated multi-storey bodies
    // with little floodplain; high accommodation → isolated single-storey bodies in thick fines.
    let channel = |t| bed(t, Lithology::Sandstone, WentworthClass::MediumSand, Contact::Erosional);
    // With no boundary the whole section is one stretch: one amalgamated body of three storeys
    // and 9/11 = 0.82 channel deposits are two signs of low accommodation.
    let low = section(vec![mud(1.0), channel(3.0), channel(3.0), channel(3.0), mud(1.0)]);
    let r = interpret(&low, &RuleParams::default());
    assert_eq!(r.accommodation.len(), 1);
    assert_eq!(r.accommodation[0].regime, Regime::Low, "{}", r.accommodation[0].why);

    // Two isolated single-storey bodies and 3/23 = 0.13 channel deposits: two signs of high.
    let high = section(vec![mud(4.0), channel(1.5), mud(8.0), channel(1.5), mud(8.0)]);
    let r = interpret(&high, &RuleParams::default());
    assert_eq!(r.accommodation[0].regime, Regime::High, "{}", r.accommodation[0].why);
}

#[test]
fn the_mud_to_sand_step_at_a_channel_base_is_not_evidence() {
    // Every channel base puts sand on mud (Wentworth 1922 classes: silt to medium sand is 3
    // steps, silt to pebble 7); a sequence boundary needs evidence beyond that step (Van Wagoner
    // et al. 1990: incision, a basinward facies shift, or an interfluve soil). However coarse
    // the fill, an isolated channel in mud is a weak candidate with no evidence items.
    assert_eq!(WentworthClass::Pebble.rank() - WentworthClass::Silt.rank(), 7);
    for grain in [WentworthClass::MediumSand, WentworthClass::CoarseSand, WentworthClass::Pebble] {
        let s = section(vec![mud(5.0), bed(2.0, Lithology::Sandstone, grain, Contact::Erosional), mud(5.0)]);
        let r = interpret(&s, &RuleParams::default());
        let c = &r.sequence_boundary_candidates[0];
        assert_eq!(c.strength, Strength::Weak, "{grain:?}: {c:?}");
        assert!(c.evidence.iter().all(|e| e.kind().is_none()), "{grain:?}: {:?}", c.evidence);
    }
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
    // McCarthy & Plint 1998 (Geology 26): a very strongly developed interfluve paleosol is the
    // interfluve expression of a sequence boundary on its own: strong. A strong one is one kind
    // of evidence (moderate); a weak one is none, and is not listed unless asked for.
    let strength = |dev, all| {
        let s = section(vec![mud(3.0), soil(dev), mud(3.0)]);
        let r = interpret_with(&s, &RuleParams::default(), all);
        let c = r.sequence_boundary_candidates.first()?;
        assert_eq!((c.kind, c.height_m), (CandidateKind::PaleosolTop, 5.0));
        Some(c.strength)
    };
    assert_eq!(strength(PaleosolDevelopment::VeryStrong, false), Some(Strength::Strong));
    assert_eq!(strength(PaleosolDevelopment::Strong, false), Some(Strength::Moderate));
    assert_eq!(strength(PaleosolDevelopment::Weak, false), None);
    assert_eq!(strength(PaleosolDevelopment::Weak, true), Some(Strength::Weak));
}
