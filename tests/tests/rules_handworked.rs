//! Hand-worked interpretation cases: invented sections small enough to work on paper, with the
//! working written beside each check. Defaults are those of `RuleParams::default()` (drape limit
//! 0.5 m, splay limit 1.0 m, window 10 m every 0.5 m) unless a case says otherwise.

use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, LengthUnit, Lithology, PaleosolDevelopment, Project, ReviewDecision,
    ReviewState, Section, Structure,
};
use aggrade_core::rules::{
    interpret, CandidateKind, Element, FluvialStyle, Interpretation, Regime, RuleParams, Stacking,
};

/// A section from lines `THICKNESS LITHOLOGY GRAIN[>GRAIN_TOP] [CONTACT] [paleosol=DEV] [relief=R]
/// [STRUCTURE…]`, thicknesses (and relief) in `unit`, contacts sharp unless given.
fn section_in(unit: LengthUnit, name: &str, spec: &str) -> Section {
    let mut s = Section::new(name);
    s.display_unit = unit;
    for (i, line) in spec.lines().map(str::trim).filter(|l| !l.is_empty()).enumerate() {
        let mut words = line.split_whitespace();
        let t: f64 = words.next().and_then(|w| w.parse().ok()).expect("thickness");
        let lith = Lithology::parse(words.next().expect("lithology")).expect("known lithology");
        let mut bed = Bed::new(BedId(i as u64 + 1), unit.to_metres(t), lith, None);
        for w in words {
            if let Some(dev) = w.strip_prefix("paleosol=") {
                bed.paleosol = PaleosolDevelopment::parse(dev).expect("paleosol development");
            } else if let Some(r) = w.strip_prefix("relief=") {
                bed.base_relief_m = Some(unit.to_metres(r.parse().expect("relief")));
            } else if let Some(c) = Contact::parse(w) {
                bed.base_contact = c;
            } else if let Some(st) = Structure::parse(w) {
                bed.structures.push(st);
            } else {
                let (b, t) = w.split_once('>').unwrap_or((w, w));
                bed.grain_base = Some(GrainSize::parse(b).expect("grain size"));
                bed.grain_top = Some(GrainSize::parse(t).expect("grain size"));
            }
        }
        s.beds.push(bed);
    }
    s
}

fn section(name: &str, spec: &str) -> Section {
    section_in(LengthUnit::Metre, name, spec)
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-9
}

fn bodies(r: &Interpretation) -> Vec<(f64, f64, usize, Stacking)> {
    r.channel_bodies.iter().map(|b| (b.base_m, b.top_m, b.stories, b.stacking)).collect()
}

fn assert_bodies(r: &Interpretation, want: &[(f64, f64, usize, Stacking)]) {
    let got = bodies(r);
    assert_eq!(got.len(), want.len(), "bodies {got:?}, wanted {want:?}");
    for (g, w) in got.iter().zip(want) {
        assert!(
            close(g.0, w.0) && close(g.1, w.1) && g.2 == w.2 && g.3 == w.3,
            "bodies {got:?}, wanted {want:?}"
        );
    }
}

const ISOLATED: &str = "
    4.0 mudstone silt
    2.0 sandstone medium_sand>fine_sand erosional
    6.0 mudstone silt
    1.5 sandstone medium_sand erosional
    6.5 mudstone silt
";

#[test]
fn isolated_bodies_in_mudstone() {
    // Working: bodies 4–6 m and 12–13.5 m, one storey each, nothing but mudstone around them.
    // Channel 2 + 1.5 = 3.5 m of 20 m exposed → 0.175.
    // Regimes: 0–4 m no body → undetermined; 4–12 m proportion 2/8 = 0.25 ≤ 0.30 and 12–20 m
    // 1.5/8 = 0.1875 ≤ 0.30, both single-story: two isolated bodies in a row → high, 4–20 m.
    let r = interpret(&section("Isolated", ISOLATED), &RuleParams::default());
    assert_bodies(&r, &[(4.0, 6.0, 1, Stacking::SingleStory), (12.0, 13.5, 1, Stacking::SingleStory)]);
    assert!(r.channel_bodies.iter().all(|b| b.amalgamated_bases == 0));
    assert!(close(r.channel_proportion.expect("exposed"), 0.175));
    let regimes: Vec<(f64, f64, Regime)> =
        r.accommodation.iter().map(|a| (a.base_m, a.top_m, a.regime)).collect();
    assert_eq!(regimes, vec![(0.0, 4.0, Regime::Undetermined), (4.0, 20.0, Regime::High)]);
    assert!(r.accommodation[1].why.to_string().contains("2 single-story"), "{}", r.accommodation[1].why);
    assert_eq!(r.caution, aggrade_core::REVIEW_CAUTION);
}

#[test]
fn one_isolated_body_is_not_enough_for_a_high_call() {
    // Working: only the first body of the case above (section cut at 12 m): one isolated body
    // → undetermined, and the why says so.
    let spec = "4.0 mudstone silt\n2.0 sandstone medium_sand erosional\n6.0 mudstone silt";
    let r = interpret(&section("One", spec), &RuleParams::default());
    assert_eq!(r.accommodation.len(), 1);
    assert_eq!(r.accommodation[0].regime, Regime::Undetermined);
    assert!(r.accommodation[0].why.to_string().contains("only 1 isolated"), "{}", r.accommodation[0].why);
}

#[test]
fn amalgamated_storeys_with_thin_drapes() {
    // Beds (base–top m): mud 0–3 | cgl 3–5 E | drape 5–5.3 | ss 5.3–7.3 E | ss 7.3–9.3 E |
    // drape 9.3–9.7 | ss 9.7–11 sharp | mud 11–15.
    // Working: storey 1 = 3–5.3 (its drape runs up to the next erosional base), storey 2 =
    // 5.3–7.3 (base on the drape, not on sand), storey 3 = 7.3–11 (base on sand: amalgamated; the
    // 0.4 m drape < 0.5 m and the sharp sand above continue it). One body 3–11 m, 3 storeys,
    // 1 amalgamated base. Channel deposits 8 m of 15 m.
    let s = section(
        "Amalgamated",
        "3.0 mudstone silt
         2.0 conglomerate pebble>coarse_sand erosional
         0.3 mudstone silt
         2.0 sandstone coarse_sand>medium_sand erosional
         2.0 sandstone medium_sand erosional
         0.4 mudstone silt
         1.3 sandstone medium_sand sharp
         4.0 mudstone silt",
    );
    let r = interpret(&s, &RuleParams::default());
    let storeys: Vec<(f64, f64, bool)> =
        r.storeys.iter().map(|s| (s.base_m, s.top_m, s.amalgamated_base)).collect();
    assert_eq!(storeys.len(), 3, "{storeys:?}");
    assert!(close(storeys[0].1, 5.3) && close(storeys[1].1, 7.3) && close(storeys[2].1, 11.0), "{storeys:?}");
    assert_eq!(storeys.iter().map(|s| s.2).collect::<Vec<_>>(), vec![false, false, true]);
    assert_bodies(&r, &[(3.0, 11.0, 3, Stacking::MultiStory)]);
    assert_eq!(r.channel_bodies[0].amalgamated_bases, 1);
    assert_eq!(r.elements[2], Element::ChannelDeposit, "a drape inside the body is part of it");
    assert!(close(r.channel_thickness_m(), 8.0));
    assert!(close(r.channel_proportion.expect("exposed"), 8.0 / 15.0));
}

const DRAPES: &str = "
    2.0 mudstone silt
    2.0 sandstone medium_sand erosional
    0.6 mudstone silt
    2.0 sandstone medium_sand erosional
    0.2 mudstone silt
    0.3 siltstone silt
    2.0 sandstone medium_sand erosional
    2.9 mudstone silt
";

#[test]
fn drapes_thicker_than_the_limit_split_bodies() {
    // Working with the 0.5 m drape limit: 0.6 m of mud is not a drape; 0.2 + 0.3 = 0.5 m of fines
    // in a row is not thinner than 0.5 m either. Three single-story bodies: 2–4, 4.6–6.6,
    // 7.1–9.1 m; channel 6 m of 12 m = 0.5.
    let s = section("Drapes", DRAPES);
    let r = interpret(&s, &RuleParams::default());
    assert_bodies(
        &r,
        &[
            (2.0, 4.0, 1, Stacking::SingleStory),
            (4.6, 6.6, 1, Stacking::SingleStory),
            (7.1, 9.1, 1, Stacking::SingleStory),
        ],
    );
    assert!(close(r.channel_proportion.expect("exposed"), 0.5));

    // With a 0.7 m drape limit both partings are drapes: one body of 3 storeys, and the
    // drapes count as channel deposit: body 2–9.1 m, 7.1 m of 12 m.
    let wide = RuleParams { drape_limit_m: 0.7, ..RuleParams::default() };
    let r = interpret(&s, &wide);
    assert_bodies(&r, &[(2.0, 9.1, 3, Stacking::MultiStory)]);
    assert!(close(r.channel_proportion.expect("exposed"), 7.1 / 12.0));
}

const SPLAYS: &str = "
    3.0 mudstone silt
    0.4 sandstone very_fine_sand sharp ripple_cross-lamination
    2.6 mudstone silt
    0.8 sandstone fine_sand gradational
    2.2 mudstone silt
    2.0 sandstone medium_sand erosional trough_cross-bedding
    3.0 mudstone silt
";

#[test]
fn splay_sands_do_not_count_as_channel_deposits() {
    // Working: 0.4 m sharp and 0.8 m gradational sands in mudstone are thinner than the 1.0 m
    // splay limit: splays. The 2 m erosional sand at 9–11 m is the only channel: 2/14.
    let s = section("Splays", SPLAYS);
    let r = interpret(&s, &RuleParams::default());
    assert_eq!(r.elements[1], Element::SplaySand);
    assert_eq!(r.elements[3], Element::SplaySand);
    assert_bodies(&r, &[(9.0, 11.0, 1, Stacking::SingleStory)]);
    assert!(close(r.channel_proportion.expect("exposed"), 2.0 / 14.0));

    // With a 0.5 m splay limit the 0.8 m sand (6–6.8 m) becomes a channel storey: 2.8/14.
    let narrow = RuleParams { splay_limit_m: 0.5, ..RuleParams::default() };
    let r = interpret(&s, &narrow);
    assert_eq!(r.elements[1], Element::SplaySand);
    assert_bodies(&r, &[(6.0, 6.8, 1, Stacking::SingleStory), (9.0, 11.0, 1, Stacking::SingleStory)]);
    assert!(close(r.channel_proportion.expect("exposed"), 2.8 / 14.0));
}

const COVERED: &str = "
    4.0 mudstone silt
    2.0 sandstone medium_sand erosional
    4.0 covered
    2.0 mudstone silt
    2.0 sandstone medium_sand erosional
    2.0 mudstone silt
";

#[test]
fn covered_intervals_are_left_out_of_proportions() {
    // Working: total 16 m, covered 6–10 m, exposed 12 m, channel 4–6 and 12–14 m = 4 m → 1/3
    // (counting the cover as exposed would give 4/16 = 0.25).
    // Curve at 8 m, window 3–13 m: channel 4–6 (2) + 12–13 (1) = 3 m; exposed 3–6 (3) +
    // 10–13 (3) = 6 m → 0.5.
    let s = section("Covered", COVERED);
    let r = interpret(&s, &RuleParams::default());
    assert!(close(r.total_thickness_m, 16.0) && close(r.exposed_thickness_m, 12.0));
    assert!(close(r.channel_proportion.expect("exposed"), 1.0 / 3.0));
    assert_eq!(r.elements[2], Element::Covered);
    let at8 = r.proportion_curve.iter().find(|p| close(p.height_m, 8.0)).expect("a curve point at 8 m");
    assert!(close(at8.proportion.expect("exposed"), 0.5), "{at8:?}");
    assert_eq!(r.proportion_curve.len(), 33, "0, 0.5, … 16 m");

    // A 2 m window centred at 8 m (7–9 m) sees only cover: no proportion.
    let narrow = RuleParams { window_m: 2.0, ..RuleParams::default() };
    let r = interpret(&s, &narrow);
    let at8 = r.proportion_curve.iter().find(|p| close(p.height_m, 8.0)).expect("a curve point at 8 m");
    assert_eq!(at8.proportion, None);

    // Accepting the boundary at the base of bed 5 (12 m) splits the proportions there:
    // 0–12 m: channel 2 of exposed 6 + 2 = 8 → 0.25; 12–16 m: 2 of 4 → 0.5.
    let mut reviewed = s.clone();
    reviewed.review.push(ReviewDecision {
        bed: BedId(5),
        state: ReviewState::Accepted,
        note: String::new(),
        link: None,
    });
    let r = interpret(&reviewed, &RuleParams::default());
    let iv: Vec<(f64, f64, Option<f64>)> =
        r.interval_proportions.iter().map(|i| (i.base_m, i.top_m, i.proportion)).collect();
    assert_eq!(iv, vec![(0.0, 12.0, Some(0.25)), (12.0, 16.0, Some(0.5))]);
}

/// Compare two interpretations field by field, heights and proportions within 1e-9.
fn assert_same(a: &Interpretation, b: &Interpretation) {
    let near = |x: f64, y: f64| (x - y).abs() < 1e-9;
    let near_opt = |x: Option<f64>, y: Option<f64>| match (x, y) {
        (Some(x), Some(y)) => near(x, y),
        (None, None) => true,
        _ => false,
    };
    assert!(
        near(a.total_thickness_m, b.total_thickness_m) && near(a.exposed_thickness_m, b.exposed_thickness_m)
    );
    assert!(near_opt(a.channel_proportion, b.channel_proportion));
    assert_eq!(a.elements, b.elements);
    assert_eq!(a.storeys.len(), b.storeys.len());
    for (x, y) in a.storeys.iter().zip(&b.storeys) {
        assert!(near(x.base_m, y.base_m) && near(x.top_m, y.top_m));
        assert_eq!(
            (x.first_bed, x.last_bed, x.amalgamated_base),
            (y.first_bed, y.last_bed, y.amalgamated_base)
        );
    }
    assert_eq!(a.channel_bodies.len(), b.channel_bodies.len());
    for (x, y) in a.channel_bodies.iter().zip(&b.channel_bodies) {
        assert!(near(x.base_m, y.base_m) && near(x.top_m, y.top_m) && near(x.thickness_m, y.thickness_m));
        assert_eq!(
            (x.stories, x.stacking, x.amalgamated_bases, x.profile),
            (y.stories, y.stacking, y.amalgamated_bases, y.profile)
        );
        assert_eq!(x.style_hint.as_ref().map(|h| h.style), y.style_hint.as_ref().map(|h| h.style));
    }
    assert_eq!(a.proportion_curve.len(), b.proportion_curve.len());
    for (x, y) in a.proportion_curve.iter().zip(&b.proportion_curve) {
        assert!(near(x.height_m, y.height_m) && near_opt(x.proportion, y.proportion), "{x:?} {y:?}");
    }
    assert_eq!(a.interval_proportions.len(), b.interval_proportions.len());
    for (x, y) in a.interval_proportions.iter().zip(&b.interval_proportions) {
        assert!(near(x.base_m, y.base_m) && near(x.top_m, y.top_m) && near_opt(x.proportion, y.proportion));
    }
    let regimes = |r: &Interpretation| r.accommodation.iter().map(|a| a.regime).collect::<Vec<_>>();
    assert_eq!(regimes(a), regimes(b));
    assert_eq!(a.sequence_boundary_candidates.len(), b.sequence_boundary_candidates.len());
    for (x, y) in a.sequence_boundary_candidates.iter().zip(&b.sequence_boundary_candidates) {
        assert!(near(x.height_m, y.height_m) && near(x.score, y.score), "{x:?} {y:?}");
        assert_eq!((x.bed_index, x.kind, x.evidence.len()), (y.bed_index, y.kind, y.evidence.len()));
    }
}

#[test]
fn the_same_section_in_feet_and_metres_gives_the_same_answers() {
    // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959). The section is
    // entered once in feet (round numbers) and once in metres (the same lengths × 0.3048, typed
    // as decimals); drapes of 1 ft + 0.6 ft = 0.48768 m sit just under the 0.5 m limit and the
    // 3.28084 ft splay (≈ 1.0000 m) near the splay limit, so a unit slip would show.
    let feet = "
        10 mudstone silt
        8 conglomerate pebble>coarse_sand erosional relief=12
        1 mudstone silt
        0.6 siltstone silt
        7 sandstone coarse_sand>fine_sand erosional lateral_accretion
        20 mudstone silt paleosol=strong
        3 sandstone very_fine_sand sharp
        15 mudstone silt
        6 sandstone medium_sand erosional
        12 covered
        9 mudstone silt
    ";
    let metres = "
        3.048 mudstone silt
        2.4384 conglomerate pebble>coarse_sand erosional relief=3.6576
        0.3048 mudstone silt
        0.18288 siltstone silt
        2.1336 sandstone coarse_sand>fine_sand erosional lateral_accretion
        6.096 mudstone silt paleosol=strong
        0.9144 sandstone very_fine_sand sharp
        4.572 mudstone silt
        1.8288 sandstone medium_sand erosional
        3.6576 covered
        2.7432 mudstone silt
    ";
    let in_ft = section_in(LengthUnit::Foot, "Feet", feet);
    let in_m = section_in(LengthUnit::Metre, "Metres", metres);
    let p = RuleParams::default();
    let (a, b) = (interpret(&in_ft, &p), interpret(&in_m, &p));
    assert_same(&a, &b);
    // And the answers are the expected ones, in metres: one 2-storey body from 3.048 m
    // (10 ft) to 3.048 + 2.4384 + 0.48768 + 2.1336 = 8.10768 m; one storey from
    // 8.10768 + 6.096 + 0.9144 + 4.572 = 19.69008 m, 1.8288 m thick.
    assert_bodies(
        &a,
        &[(3.048, 8.10768, 2, Stacking::MultiStory), (19.69008, 21.51888, 1, Stacking::SingleStory)],
    );
    assert_eq!(a.elements[6], Element::SplaySand);
}

fn cycle() -> Section {
    let text =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/data/rules/base_level_cycle.aggrade"))
            .expect("fixture base_level_cycle.aggrade");
    let mut project: Project = serde_json::from_str(&text).expect("fixture parses");
    project.sections.remove(0)
}

#[test]
fn a_full_base_level_cycle_ranks_the_two_incisions_first() {
    // tests/data/rules/base_level_cycle.aggrade, beds (m): fines 0–3, strong paleosol 3–5;
    // multi-story body 5–13 (pebbly base, 4 m relief; 3 storeys, one 0.2 m drape); fines 13–19;
    // single-story 19–20.5; weak paleosol 20.5–26.5; 0.5 m splay; fines 27–32; single-story
    // 32–33.5; fines 33.5–38; very strong paleosol 38–40; multi-story 40–46 (5 m relief); fines 46–48.
    //
    // Working for 5 m: multi-story base 0.2 + jump silt→pebble 7 classes ≥ 4: 0.2 + relief 4 > 3 m:
    // 0.15 + on a strong paleosol: 0.25 + proportion 0.00 below (0–5) → 8/10 = 0.80 above: 0.2
    // = 1.00. For 40 m: the same items; proportion 1.5/10 = 0.15 below → 6/8 = 0.75 above (window
    // clipped at the top) = 1.00. Next best: 32 m, only the proportion jump (0 → 3.5/10 = 0.35):
    // 0.20. 19 m and the weak paleosol top at 26.5 m: 0.
    let s = cycle();
    let r = interpret(&s, &RuleParams::default());
    let c = &r.sequence_boundary_candidates;
    let ranked: Vec<(f64, f64, CandidateKind)> = c.iter().map(|c| (c.height_m, c.score, c.kind)).collect();
    assert_eq!(c.len(), 5, "{ranked:?}");
    assert!(close(c[0].height_m, 5.0) && close(c[1].height_m, 40.0), "{ranked:?}");
    for top in &c[..2] {
        assert!(close(top.score, 1.0), "{ranked:?}");
        assert_eq!(top.kind, CandidateKind::ChannelBaseOnPaleosol);
        assert_eq!(top.evidence.len(), 5, "{:?}", top.evidence);
    }
    assert!(c[2..].iter().all(|o| o.score < c[1].score), "{ranked:?}");
    assert!(close(c[2].height_m, 32.0) && close(c[2].score, 0.2), "{ranked:?}");

    // Regimes: below the first body undetermined; the amalgamated body (8 of 14 m = 0.57) low;
    // two isolated bodies in fines (3 of 21 m = 0.14) high; the top body (6 of 8 m) low.
    let regimes: Vec<(f64, f64, Regime)> =
        r.accommodation.iter().map(|a| (a.base_m, a.top_m, a.regime)).collect();
    assert_eq!(
        regimes,
        vec![
            (0.0, 5.0, Regime::Undetermined),
            (5.0, 19.0, Regime::Low),
            (19.0, 40.0, Regime::High),
            (40.0, 48.0, Regime::Low)
        ]
    );

    // No decisions yet: candidates above 0.5 (5 and 40 m) cut the proportions:
    // 0–5: 0; 5–40: (8 + 1.5 + 1.5)/35; 40–48: 6/8.
    let iv: Vec<(f64, f64, f64)> = r
        .interval_proportions
        .iter()
        .map(|i| (i.base_m, i.top_m, i.proportion.unwrap_or(f64::NAN)))
        .collect();
    assert_eq!(iv.len(), 3, "{iv:?}");
    assert!(close(iv[0].2, 0.0) && close(iv[1].2, 11.0 / 35.0) && close(iv[2].2, 0.75), "{iv:?}");

    // Style: the lower body is pebbly with 0.2 m of drapes in 8 m (braided-like); the isolated
    // fining-upward body at 19 m has 11.5 m of overbank above (meandering-like).
    assert_eq!(r.channel_bodies[0].style_hint.as_ref().map(|h| h.style), Some(FluvialStyle::BraidedLike));
    assert_eq!(r.channel_bodies[1].style_hint.as_ref().map(|h| h.style), Some(FluvialStyle::MeanderingLike));
}

#[test]
fn review_decisions_are_carried_and_accepted_ones_cut_the_intervals() {
    // Reject the 5 m candidate (base of bed 3), accept 32 m (bed 13) with a note: intervals are
    // cut at accepted boundaries only (32 m), and each candidate carries its decision.
    let mut s = cycle();
    s.review.push(ReviewDecision {
        bed: BedId(3),
        state: ReviewState::Rejected,
        note: "local scour".into(),
        link: None,
    });
    s.review.push(ReviewDecision {
        bed: BedId(13),
        state: ReviewState::Accepted,
        note: "traced 2 km".into(),
        link: None,
    });
    let r = interpret(&s, &RuleParams::default());
    let at =
        |h: f64| r.sequence_boundary_candidates.iter().find(|c| close(c.height_m, h)).expect("candidate");
    assert_eq!((at(5.0).review, at(5.0).note.as_str()), (ReviewState::Rejected, "local scour"));
    assert_eq!((at(32.0).review, at(32.0).note.as_str()), (ReviewState::Accepted, "traced 2 km"));
    assert_eq!(at(40.0).review, ReviewState::Candidate);
    let cuts: Vec<f64> = r.interval_proportions.iter().map(|i| i.top_m).collect();
    assert_eq!(cuts, vec![32.0, 48.0]);
    // 0–32 m: channel 8 + 1.5 = 9.5 of 32; 32–48: 1.5 + 6 = 7.5 of 16.
    assert!(close(r.interval_proportions[0].proportion.unwrap_or(f64::NAN), 9.5 / 32.0));
    assert!(close(r.interval_proportions[1].proportion.unwrap_or(f64::NAN), 7.5 / 16.0));
}

#[test]
fn an_empty_section_gives_an_empty_answer_not_a_panic() {
    let r = interpret(&Section::new("Empty"), &RuleParams::default());
    assert_eq!((r.total_thickness_m, r.channel_proportion), (0.0, None));
    assert!(r.channel_bodies.is_empty() && r.sequence_boundary_candidates.is_empty());
    assert_eq!(r.accommodation.len(), 1);
    assert_eq!(r.accommodation[0].regime, Regime::Undetermined);
}
