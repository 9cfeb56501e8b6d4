//! Property tests of the interpretation rules on generated sections: proportions stay in 0–1,
//! bodies never overlap and lie inside the section, covered intervals between bodies change no
//! channel-deposit thickness, and the unit thicknesses were entered in does not matter; storeys,
//! bodies, censoring and stacking agree with each other and the proportion lies between its bounds;
//! candidates are sorted by strength and their strength follows their evidence kinds; regimes
//! never straddle a cut (accepted boundaries, else strong candidates); listing every candidate
//! adds only weak soil tops and changes nothing else.

use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, LengthUnit, Lithology, PaleosolDevelopment, Section, WentworthClass,
};
use aggrade_core::rules::{interpret, Censor, Interpretation, RuleParams, Stacking};
use proptest::prelude::*;

/// One generated bed: thickness in centimetres (so the same section can be written exactly in
/// other units), lithology, contact, paleosol development, grain class.
fn bed_strategy() -> impl Strategy<Value = (u32, Lithology, Contact, PaleosolDevelopment, WentworthClass)> {
    let lith = prop::sample::select(vec![
        Lithology::Mudstone,
        Lithology::Siltstone,
        Lithology::Sandstone,
        Lithology::Sandstone,
        Lithology::Conglomerate,
        Lithology::Covered,
        Lithology::Coal,
    ]);
    let contact = prop::sample::select(vec![Contact::Sharp, Contact::Erosional, Contact::Gradational]);
    let soil = prop::sample::select(PaleosolDevelopment::ALL.to_vec());
    let grain = prop::sample::select(WentworthClass::ALL.to_vec());
    (5u32..600, lith, contact, soil, grain)
}

fn build(
    beds: &[(u32, Lithology, Contact, PaleosolDevelopment, WentworthClass)],
    unit: LengthUnit,
) -> Section {
    let mut s = Section::new("generated");
    s.display_unit = unit;
    for (i, &(cm, lith, contact, soil, grain)) in beds.iter().enumerate() {
        // The thickness as a geologist would type it in this unit, then stored in metres.
        let typed = LengthUnit::Centimetre.to_metres(cm as f64) / unit.metres();
        let g = (lith != Lithology::Covered).then_some(GrainSize::Class(grain));
        let mut b = Bed::new(BedId(i as u64 + 1), unit.to_metres(typed), lith, g);
        b.base_contact = contact;
        b.paleosol = soil;
        s.beds.push(b);
    }
    s
}

fn in_unit_interval(p: Option<f64>) -> bool {
    p.is_none_or(|p| (0.0..=1.0).contains(&p))
}

fn check_invariants(s: &Section, r: &Interpretation) -> Result<(), TestCaseError> {
    let total = s.total_thickness_m();
    prop_assert!(in_unit_interval(r.channel_proportion));
    prop_assert!(r.proportion_curve.iter().all(|p| in_unit_interval(p.proportion)));
    prop_assert!(r.interval_proportions.iter().all(|p| in_unit_interval(p.proportion)));
    prop_assert_eq!(r.elements.len(), s.beds.len());
    let mut previous_top = f64::NEG_INFINITY;
    for b in &r.channel_bodies {
        prop_assert!(
            b.base_m >= -1e-9 && b.top_m <= total + 1e-9,
            "body {:?} outside 0–{}",
            (b.base_m, b.top_m),
            total
        );
        prop_assert!(b.base_m < b.top_m, "empty body {:?}", (b.base_m, b.top_m));
        prop_assert!(b.base_m >= previous_top - 1e-9, "bodies overlap at {}", b.base_m);
        prop_assert_eq!(b.stories, b.storey_indices.len());
        prop_assert!(b.amalgamated_bases < b.stories);
        previous_top = b.top_m;
    }
    // Each storey names the body that lists it; stacking follows storeys and censoring; a body
    // at the section base or top is censored there.
    for (k, b) in r.channel_bodies.iter().enumerate() {
        for &i in &b.storey_indices {
            prop_assert_eq!(r.storeys[i].body, k);
        }
        let want = match (b.stories, b.censored.is_empty()) {
            (n, _) if n >= 2 => Stacking::MultiStory,
            (_, true) => Stacking::SingleStory,
            (_, false) => Stacking::Undetermined,
        };
        prop_assert_eq!(b.stacking, want);
        if b.base_m.abs() < 1e-12 {
            prop_assert!(b.censored.contains(&Censor::Base), "body at the section base not censored");
        }
        // (A soil formed in the body's own top sand shows where that body ends: seen.)
        let capped = b.storey_indices.last().is_some_and(|&i| r.storeys[i].capped_by_paleosol);
        if (b.top_m - total).abs() < 1e-9 && !capped {
            prop_assert!(b.censored.contains(&Censor::Top), "body at the section top not censored");
        }
    }
    // Paleosol profiles are disjoint, lowest first, inside the section.
    for w in r.paleosols.windows(2) {
        prop_assert!(w[0].top_m <= w[1].base_m + 1e-9);
    }
    if let Some(b) = r.channel_proportion_bounds {
        prop_assert!(b.covered_as_fines <= b.covered_as_channel + 1e-12);
        if let Some(p) = r.channel_proportion {
            prop_assert!(b.covered_as_fines <= p + 1e-9 && p <= b.covered_as_channel + 1e-9);
        }
    }
    for c in &r.sequence_boundary_candidates {
        prop_assert!((0.0..=1.0).contains(&c.score));
    }
    for w in r.sequence_boundary_candidates.windows(2) {
        prop_assert!(
            w[0].strength > w[1].strength || (w[0].strength == w[1].strength && w[0].score >= w[1].score),
            "not sorted by strength, then score"
        );
    }
    // The strength follows the count of independent evidence kinds (a very strong interfluve
    // soil alone is strong).
    for c in &r.sequence_boundary_candidates {
        let kinds: std::collections::BTreeSet<_> = c.evidence.iter().filter_map(|e| e.kind()).collect();
        let expected = match kinds.len() {
            0 => aggrade_core::rules::Strength::Weak,
            1 if c.evidence.iter().any(|e| {
                matches!(
                    e,
                    aggrade_core::rules::Evidence::InterfluvePaleosol {
                        development: aggrade_core::model::PaleosolDevelopment::VeryStrong,
                        ..
                    }
                )
            }) =>
            {
                aggrade_core::rules::Strength::Strong
            }
            1 => aggrade_core::rules::Strength::Moderate,
            _ => aggrade_core::rules::Strength::Strong,
        };
        prop_assert_eq!(c.strength, expected);
    }
    // Regime intervals tile the section.
    prop_assert!(r.accommodation.first().is_some_and(|a| a.base_m == 0.0));
    prop_assert!((r.accommodation.last().map_or(f64::NAN, |a| a.top_m) - total).abs() < 1e-9);
    for w in r.accommodation.windows(2) {
        prop_assert!((w[0].top_m - w[1].base_m).abs() < 1e-12);
    }
    Ok(())
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]

    #[test]
    fn proportions_in_unit_interval_and_bodies_disjoint_inside_the_section(
        beds in prop::collection::vec(bed_strategy(), 0..60)
    ) {
        let s = build(&beds, LengthUnit::Metre);
        let r = interpret(&s, &RuleParams::default());
        check_invariants(&s, &r)?;
    }

    #[test]
    fn regimes_never_straddle_a_cut_and_accepted_boundaries_are_the_cuts(
        beds in prop::collection::vec(bed_strategy(), 1..60),
        accept in prop::collection::vec(any::<prop::sample::Index>(), 0..3),
    ) {
        // The rule (Shanley & McCabe 1994 read stacking within sequences): one regime per
        // stretch between accepted boundaries, else strong candidates; never across one.
        use aggrade_core::model::{ReviewDecision, ReviewState};
        use aggrade_core::rules::Strength;
        let mut s = build(&beds, LengthUnit::Metre);
        for k in &accept {
            let i = k.index(s.beds.len());
            s.review.push(ReviewDecision::new(s.beds[i].id, ReviewState::Accepted, ""));
        }
        let r = interpret(&s, &RuleParams::default());
        let bases = s.base_heights_m();
        let total = s.total_thickness_m();
        if accept.is_empty() {
            let mut strong: Vec<f64> = r.sequence_boundary_candidates.iter()
                .filter(|c| c.strength == Strength::Strong).map(|c| c.height_m).collect();
            strong.sort_by(f64::total_cmp);
            prop_assert_eq!(&r.cut_heights, &strong);
            prop_assert!(!r.cuts_are_accepted || r.cut_heights.is_empty());
        } else {
            prop_assert!(r.cuts_are_accepted);
            for k in &accept {
                let h = bases[k.index(s.beds.len())];
                prop_assert!(r.cut_heights.iter().any(|c| (c - h).abs() < 1e-9), "accepted {} not a cut", h);
            }
        }
        for a in &r.accommodation {
            for &c in r.cut_heights.iter().filter(|c| **c > 1e-9 && **c < total - 1e-9) {
                prop_assert!(!(a.base_m < c - 1e-9 && a.top_m > c + 1e-9),
                    "regime {}–{} straddles the cut at {}", a.base_m, a.top_m, c);
            }
        }
    }

    #[test]
    fn listing_every_candidate_adds_only_the_unlisted_weak_soil_tops(
        beds in prop::collection::vec(bed_strategy(), 0..60)
    ) {
        use aggrade_core::rules::{interpret_with, CandidateKind, Strength};
        let s = build(&beds, LengthUnit::Metre);
        let p = RuleParams::default();
        let some = interpret(&s, &p);
        let all = interpret_with(&s, &p, true);
        prop_assert_eq!(all.unlisted_candidates, 0);
        prop_assert_eq!(all.sequence_boundary_candidates.len(),
            some.sequence_boundary_candidates.len() + some.unlisted_candidates);
        let listed: std::collections::BTreeSet<usize> =
            some.sequence_boundary_candidates.iter().map(|c| c.bed_index).collect();
        for c in all.sequence_boundary_candidates.iter().filter(|c| !listed.contains(&c.bed_index)) {
            prop_assert_eq!((c.strength, c.kind), (Strength::Weak, CandidateKind::PaleosolTop));
        }
        // The rest of the interpretation does not depend on the listing.
        prop_assert_eq!(&some.accommodation, &all.accommodation);
        prop_assert_eq!(&some.cut_heights, &all.cut_heights);
    }

    #[test]
    fn a_covered_interval_between_two_bodies_changes_no_channel_thickness(
        beds in prop::collection::vec(bed_strategy(), 2..60),
        covered_cm in 1u32..2000,
        pick in any::<prop::sample::Index>(),
    ) {
        let s = build(&beds, LengthUnit::Metre);
        let p = RuleParams::default();
        let before = interpret(&s, &p);
        prop_assume!(before.channel_bodies.len() >= 2);
        // Insert right above a body that has another body above it.
        let k = pick.index(before.channel_bodies.len() - 1);
        let last_storey = *before.channel_bodies[k].storey_indices.last().expect("a body has storeys");
        let at = before.storeys[last_storey].last_bed + 1;
        let mut t = s.clone();
        t.beds.insert(at, Bed::new(BedId(10_000), covered_cm as f64 / 100.0, Lithology::Covered, None));
        let after = interpret(&t, &p);
        prop_assert!((before.channel_thickness_m() - after.channel_thickness_m()).abs() < 1e-9,
            "channel thickness {} became {}", before.channel_thickness_m(), after.channel_thickness_m());
        prop_assert_eq!(before.channel_bodies.len(), after.channel_bodies.len());
        check_invariants(&t, &after)?;
    }

    #[test]
    fn results_do_not_depend_on_the_unit_thicknesses_were_entered_in(
        beds in prop::collection::vec(bed_strategy(), 0..40)
    ) {
        // Same lengths typed in m, cm and ft (1 ft = 0.3048 m exactly, 1959 agreement).
        let p = RuleParams::default();
        let m = interpret(&build(&beds, LengthUnit::Metre), &p);
        for unit in [LengthUnit::Centimetre, LengthUnit::Foot] {
            let other = interpret(&build(&beds, unit), &p);
            prop_assert_eq!(&m.elements, &other.elements);
            prop_assert_eq!(m.channel_bodies.len(), other.channel_bodies.len());
            for (a, b) in m.channel_bodies.iter().zip(&other.channel_bodies) {
                prop_assert!((a.base_m - b.base_m).abs() < 1e-9 && (a.top_m - b.top_m).abs() < 1e-9);
                prop_assert_eq!((a.stories, a.stacking, a.profile), (b.stories, b.stacking, b.profile));
            }
            prop_assert_eq!(m.sequence_boundary_candidates.len(), other.sequence_boundary_candidates.len());
            for (a, b) in m.sequence_boundary_candidates.iter().zip(&other.sequence_boundary_candidates) {
                prop_assert_eq!(a.bed_index, b.bed_index);
                prop_assert!((a.score - b.score).abs() < 1e-9);
            }
            let regimes = |r: &Interpretation| r.accommodation.iter().map(|a| a.regime).collect::<Vec<_>>();
            prop_assert_eq!(regimes(&m), regimes(&other));
            prop_assert_eq!(m.proportion_curve.len(), other.proportion_curve.len());
            for (a, b) in m.proportion_curve.iter().zip(&other.proportion_curve) {
                let same = match (a.proportion, b.proportion) {
                    (Some(x), Some(y)) => (x - y).abs() < 1e-9,
                    (None, None) => true,
                    _ => false,
                };
                prop_assert!(same, "curve at {} m: {:?} vs {:?}", a.height_m, a.proportion, b.proportion);
            }
        }
    }

    #[test]
    fn interpretation_is_deterministic(beds in prop::collection::vec(bed_strategy(), 0..40)) {
        let s = build(&beds, LengthUnit::Metre);
        let p = RuleParams::default();
        prop_assert_eq!(interpret(&s, &p), interpret(&s, &p));
    }
}
