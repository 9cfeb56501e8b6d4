//! Hand-worked interpretation cases: invented sections small enough to work on paper, with the
//! working written beside each check. Defaults are those of `RuleParams::default()` (drape limit
//! 0.5 m, splay limit 1.0 m, window 10 m every 0.5 m) unless a case says otherwise.

use aggrade_core::model::{
    BaseRank, Bed, BedId, Contact, GrainSize, LengthUnit, Lithology, PaleosolDevelopment, PaleosolFeature,
    Project, ReviewDecision, ReviewState, Section, Structure, Surface, SurfaceKind,
};
use aggrade_core::rules::{
    interpret, CandidateKind, Element, EvidenceKind, FluvialStyle, Interpretation, Regime, RuleParams,
    Stacking, Strength,
};

/// A section from lines `THICKNESS LITHOLOGY GRAIN[>GRAIN_TOP] [CONTACT] [paleosol=DEV] [relief=R]
/// [stage=N] [rank=RANK] [incision=NAME] [soil:FEATURE…] [STRUCTURE…]`, thicknesses (and relief) in `unit`,
/// contacts sharp unless given.
pub(crate) fn section_in(unit: LengthUnit, name: &str, spec: &str) -> Section {
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
            } else if let Some(st) = w.strip_prefix("stage=") {
                bed.carbonate_stage = Some(st.parse().expect("carbonate stage"));
            } else if let Some(r) = w.strip_prefix("rank=") {
                bed.base_rank = Some(BaseRank::parse(r).expect("base rank"));
            } else if let Some(f) = w.strip_prefix("soil:") {
                bed.paleosol_features.push(PaleosolFeature::parse(f).expect("paleosol feature"));
            } else if let Some(n) = w.strip_prefix("incision=") {
                bed.base_surface = Some(Surface { name: n.to_string(), kind: SurfaceKind::Incision });
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

pub(crate) fn section(name: &str, spec: &str) -> Section {
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
    // Regimes: no boundary is strong enough to cut, so one stretch 0–20 m: two single-storey
    // bodies (a sign of high, Shanley & McCabe 1994) and a proportion of 0.175 ≤ 0.30 (a second
    // sign; Larue & Hovadik 2006) → high.
    let r = interpret(&section("Isolated", ISOLATED), &RuleParams::default());
    assert_bodies(&r, &[(4.0, 6.0, 1, Stacking::SingleStory), (12.0, 13.5, 1, Stacking::SingleStory)]);
    assert!(r.channel_bodies.iter().all(|b| b.amalgamated_bases == 0));
    assert!(close(r.channel_proportion.expect("exposed"), 0.175));
    let regimes: Vec<(f64, f64, Regime)> =
        r.accommodation.iter().map(|a| (a.base_m, a.top_m, a.regime)).collect();
    assert_eq!(regimes, vec![(0.0, 20.0, Regime::High)]);
    let why = r.accommodation[0].why.to_string();
    assert!(why.contains("2 of 2 channel bodies single-storey") && why.contains("0.17 (≤ 0.30)"), "{why}");
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
    // in a row is not thinner than 0.5 m either. Three single-storey bodies: 2–4, 4.6–6.6,
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

    // With a 0.5 m splay limit the 0.8 m sand (6–6.8 m) is thick enough for one channel sign,
    // but its gradational base and fine grain are two splay signs (decision table after Miall
    // 1996, Bridge 2003, Burns et al. 2017): still a splay. (The first rules, which went by
    // thickness alone, made it a channel storey; that is the misreading the table corrects.)
    let narrow = RuleParams { splay_limit_m: 0.5, ..RuleParams::default() };
    let r = interpret(&s, &narrow);
    assert_eq!((r.elements[1], r.elements[3]), (Element::SplaySand, Element::SplaySand));
    assert_bodies(&r, &[(9.0, 11.0, 1, Stacking::SingleStory)]);
    // Logged as medium sand with an erosional base it has two channel signs (erosional base,
    // thickness) to none: a channel.
    let mut scoured = s.clone();
    scoured.beds[3].base_contact = Contact::Erosional;
    scoured.beds[3].grain_base = Some(GrainSize::parse("medium sand").expect("class"));
    scoured.beds[3].grain_top = scoured.beds[3].grain_base;
    let r = interpret(&scoured, &narrow);
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
    // 8.10768 + 6.096 + 0.9144 + 4.572 = 19.69008 m, 1.8288 m thick. Its top lies against the
    // 12 ft covered interval, so only part of it is seen: stacking undetermined (it was called
    // single-storey before censoring was read; one storey seen does not make a body single-storey).
    assert_bodies(
        &a,
        &[(3.048, 8.10768, 2, Stacking::MultiStory), (19.69008, 21.51888, 1, Stacking::Undetermined)],
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
    // multi-storey body 5–13 (pebbly base, 4 m relief; 3 storeys, one 0.2 m drape); fines 13–19;
    // single-storey 19–20.5; weak paleosol 20.5–26.5; 0.5 m splay; fines 27–32; single-storey
    // 32–33.5; fines 33.5–38; very strong paleosol 38–40; multi-storey 40–46 (5 m relief); fines 46–48.
    //
    // Working, with the evidence kinds of Van Wagoner et al. 1990 and Posamentier & Allen 1999
    // (each kind once; being a channel base is none):
    // 40 m: incision (5 m relief > the 4 m thickest storey of its own body; Gibling 2006),
    //   basinward facies shift (a fill mostly of coarse sand — the thickness-weighted median of
    //   2 m pebble and 4 m coarse sand — over the 32 m body's medium-to-fine fill, median fine
    //   sand: 2 Wentworth classes ≥ 2; and amalgamated over isolated in the 10 m below), on a mature
    //   paleosol (very strong, 38–40 m) → 3 kinds, strong, score 0.30 + 0.25 + 0.25 = 0.80.
    // 5 m: incision (4 m relief > the 3 m relief limit; its thickest storey is 4.2 m), on a
    //   mature paleosol (strong, 3–5 m); no channel fill below to compare → 2 kinds, strong, 0.55.
    // 19 m and 32 m: channel bases and nothing more → weak, 0. The weak paleosol top at 26.5 m
    //   is not listed.
    let s = cycle();
    let r = interpret(&s, &RuleParams::default());
    let c = &r.sequence_boundary_candidates;
    let ranked: Vec<(f64, Strength, f64)> = c.iter().map(|c| (c.height_m, c.strength, c.score)).collect();
    assert_eq!(c.len(), 4, "{ranked:?}");
    assert_eq!(r.unlisted_candidates, 1);
    assert!(close(c[0].height_m, 40.0) && close(c[0].score, 0.8), "{ranked:?}");
    assert!(close(c[1].height_m, 5.0) && close(c[1].score, 0.55), "{ranked:?}");
    for top in &c[..2] {
        assert_eq!(top.strength, Strength::Strong, "{ranked:?}");
        assert_eq!(top.kind, CandidateKind::ChannelBaseOnPaleosol);
    }
    let kinds = |c: &aggrade_core::rules::BoundaryCandidate| {
        let mut k: Vec<EvidenceKind> = c.evidence.iter().filter_map(|e| e.kind()).collect();
        k.dedup();
        k
    };
    assert_eq!(
        kinds(&c[0]),
        [EvidenceKind::Incision, EvidenceKind::BasinwardFaciesShift, EvidenceKind::OnMaturePaleosol]
    );
    assert_eq!(kinds(&c[1]), [EvidenceKind::Incision, EvidenceKind::OnMaturePaleosol]);
    for weak in &c[2..] {
        assert_eq!((weak.strength, weak.score), (Strength::Weak, 0.0), "{ranked:?}");
    }

    // Regimes, one per stretch between the strong candidates (5 and 40 m):
    // 0–5 m: no body; one mature, well-drained soil: 1 sign → undetermined.
    // 5–40 m: 2 of 3 bodies single-storey (a sign of high); proportion (8 + 1.5 + 1.5)/35 = 0.314,
    //   within 0.05 of the 0.30 threshold → no sign; soils: one weak, one very strong → no
    //   majority. 1 sign → undetermined (the first rules called this stretch low, then high).
    // 40–48 m: amalgamated, 6/8 = 0.75 ≥ 0.50: 2 signs → low.
    let regimes: Vec<(f64, f64, Regime)> =
        r.accommodation.iter().map(|a| (a.base_m, a.top_m, a.regime)).collect();
    assert_eq!(
        regimes,
        vec![(0.0, 5.0, Regime::Undetermined), (5.0, 40.0, Regime::Undetermined), (40.0, 48.0, Regime::Low)]
    );
    assert!(
        r.accommodation[1].why.to_string().contains("0.31 is within 0.05 of the 0.30 threshold"),
        "{}",
        r.accommodation[1].why
    );

    // No decisions yet: the strong candidates (5 and 40 m) cut the proportions:
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

// ---------- Second-generation rules: storeys, channel or splay, paleosol profiles, censoring ----------

fn storeys(r: &Interpretation) -> Vec<(f64, f64)> {
    r.storeys.iter().map(|s| (s.base_m, s.top_m)).collect()
}

fn assert_storeys(r: &Interpretation, want: &[(f64, f64)]) {
    let got = storeys(r);
    assert!(
        got.len() == want.len() && got.iter().zip(want).all(|(g, w)| close(g.0, w.0) && close(g.1, w.1)),
        "storeys {got:?}, wanted {want:?}"
    );
}

const LAG_AND_SCOUR: &str = "
    3.0 mudstone silt
    0.3 conglomerate pebble erosional basal_lag
    2.2 sandstone coarse_sand>medium_sand erosional trough_cross-bedding
    0.6 sandstone medium_sand erosional trough_cross-bedding
    0.3 conglomerate pebble erosional basal_lag
    1.6 sandstone coarse_sand>fine_sand erosional trough_cross-bedding
    4.0 mudstone silt
";

#[test]
fn a_basal_lag_floors_the_storey_above_and_a_thin_scour_is_no_storey() {
    // Miall 1985, 1996 (bounding-surface hierarchy): a basal lag is the floor of the storey above
    // it; scours and set boundaries inside a storey rank below storey surfaces.
    // Beds (m): mud 0–3 | lag 3–3.3 | sand 3.3–5.5 (E, on the lag) | sand 5.5–6.1 (E) | lag 6.1–6.4 |
    // sand 6.4–8.0 (E, on the lag) | mud 8–12.
    // Working: the sand on each lag continues the lag's storey. The 0.6 m sand at 5.5 m reaches
    // only 6.1 m before the next storey surface (the lag at 6.1 m, whose storey reaches 8.0 m:
    // 1.9 m ≥ 1.0 m), so it is a scour (0.6 < 1.0 m). Storeys 3.0–6.1 and 6.1–8.0 m in one body
    // of two storeys, one amalgamated base. The first rules counted five storeys here.
    let s = section("Lag and scour", LAG_AND_SCOUR);
    let r = interpret(&s, &RuleParams::default());
    assert_storeys(&r, &[(3.0, 6.1), (6.1, 8.0)]);
    assert_bodies(&r, &[(3.0, 8.0, 2, Stacking::MultiStory)]);
    assert_eq!(r.channel_bodies[0].amalgamated_bases, 1);
    assert!(r.channel_bodies[0].censored.is_empty());

    // A minimum storey thickness of 0.5 m makes the 0.6 m scour fill a storey of its own.
    let loose = RuleParams { min_storey_m: 0.5, ..RuleParams::default() };
    assert_storeys(&interpret(&s, &loose), &[(3.0, 5.5), (5.5, 6.1), (6.1, 8.0)]);
}

#[test]
fn the_geologists_rank_of_a_base_overrides_the_rules() {
    // Storey surfaces are often tagged in the field (Miall 1996): the tag beats any rule.
    // Same beds as above. Ranking the 0.6 m scour (bed 4) a storey surface gives three storeys;
    // ranking the upper lag (bed 5) a body base splits the body there (two single-storey bodies).
    // Ranking the upper lag within the storey lets the sand from 5.5 m reach 8.0 m (2.5 m ≥
    // 1.0 m), so the rules then put the storey surface at 5.5 m; ranking both bases within the
    // storey leaves one storey.
    let mut s = section("Ranked", LAG_AND_SCOUR);
    s.beds[3].base_rank = Some(BaseRank::StoreySurface);
    assert_storeys(&interpret(&s, &RuleParams::default()), &[(3.0, 5.5), (5.5, 6.1), (6.1, 8.0)]);

    let mut s = section("Ranked", LAG_AND_SCOUR);
    s.beds[4].base_rank = Some(BaseRank::BodyBase);
    let r = interpret(&s, &RuleParams::default());
    assert_bodies(&r, &[(3.0, 6.1, 1, Stacking::SingleStory), (6.1, 8.0, 1, Stacking::SingleStory)]);
    assert_eq!(r.storeys.iter().map(|s| s.body).collect::<Vec<_>>(), vec![0, 1]);

    let mut s = section("Ranked", LAG_AND_SCOUR);
    s.beds[4].base_rank = Some(BaseRank::WithinStorey);
    assert_storeys(&interpret(&s, &RuleParams::default()), &[(3.0, 5.5), (5.5, 8.0)]);
    s.beds[3].base_rank = Some(BaseRank::WithinStorey);
    assert_storeys(&interpret(&s, &RuleParams::default()), &[(3.0, 8.0)]);
}

const CHANNEL_OR_SPLAY: &str = "
    3.0 mudstone silt
    1.5 sandstone very_fine_sand>fine_sand gradational ripple_cross-lamination
    3.0 mudstone silt
    0.2 sandstone very_fine_sand erosional ripple_cross-lamination
    3.0 mudstone silt
    1.2 sandstone medium_sand>fine_sand sharp trough_cross-bedding
    3.0 mudstone silt
";

#[test]
fn channel_or_splay_is_read_from_all_the_signs_not_thickness_alone() {
    // Decision table after Miall 1985, 1996 (elements CH against CS/LS) and Bridge 2003; splay
    // grain size after Burns et al. 2017 (coarsest lower fine sand).
    // 3–4.5 m: 1.5 m, gradational base, coarsening up (φ 3.5 → 2.5), ripples only, fine sand at
    //   most: splay signs 4 (base, profile, ripples, grain) against 1 (thickness) → proximal splay.
    // 7.5–7.7 m: 0.2 m very fine sand, scoured base, ripples only: channel 1 (erosional base)
    //   against splay 3 (ripples, thin, grain) → splay, no channel body and no style hint.
    // 10.7–11.9 m: 1.2 m, sharp base, trough cross-bedding, fining up (φ 1.5 → 2.5): channel 3
    //   against splay 1 (base) → a single-storey channel body.
    // The first rules made bodies of the first two (by thickness and by the scoured base).
    let r = interpret(&section("Channel or splay", CHANNEL_OR_SPLAY), &RuleParams::default());
    assert_eq!(
        (r.elements[1], r.elements[3], r.elements[5]),
        (Element::SplaySand, Element::SplaySand, Element::ChannelDeposit)
    );
    assert_bodies(&r, &[(10.7, 11.9, 1, Stacking::SingleStory)]);
    assert!(close(r.channel_proportion.expect("exposed"), 1.2 / 14.9));
}

const HORIZONS: &str = "
    2.0 mudstone silt
    1.0 mudstone silt paleosol=weak stage=3 soil:carbonate_nodules
    0.8 mudstone clay paleosol=moderate soil:slickensides soil:root_traces
    3.0 mudstone silt
";

#[test]
fn horizons_logged_as_beds_make_one_profile_with_one_candidate() {
    // Retallack 2001 and Kraus 1999: a paleosol is a profile of horizons. Carbonate stage III
    // (Machette 1985, after Gile et al. 1966) makes a profile at least strongly developed;
    // slickensides with carbonate nodules (vertic and calcic features) record shrink–swell under
    // a seasonal climate (Kraus 1999), not more time, and add no grade.
    // Working: beds 2–3 (2.0–3.8 m) are one profile, logged at most moderate → strong by stage III.
    // One candidate at its top (3.8 m): a strongly developed interfluve paleosol, score 0.30, one
    // kind of evidence and so moderate (only a very strongly developed interfluve soil is strong
    // on its own, McCarthy & Plint 1998); the first rules gave one candidate per bed (3.0 and
    // 3.8 m).
    let s = section("Horizons", HORIZONS);
    let r = interpret(&s, &RuleParams::default());
    assert_eq!(r.paleosols.len(), 1);
    let p = &r.paleosols[0];
    assert!(close(p.base_m, 2.0) && close(p.top_m, 3.8), "{p:?}");
    assert_eq!(p.beds, vec![BedId(2), BedId(3)]);
    assert_eq!(
        (p.logged_development, p.maturity),
        (PaleosolDevelopment::Moderate, PaleosolDevelopment::Strong)
    );
    assert!(p.evidence.iter().any(|e| e.to_string().starts_with("slickensides with carbonate nodules")));
    let c = &r.sequence_boundary_candidates;
    assert_eq!(c.len(), 1, "{c:?}");
    assert!(close(c[0].height_m, 3.8) && close(c[0].score, 0.3), "{c:?}");
    assert_eq!(c[0].strength, Strength::Moderate);
    assert_eq!((r.elements[1], r.elements[2]), (Element::Paleosol, Element::Paleosol));

    // With stage III no longer enough for strong: moderate as logged, the pair adding nothing.
    let p = RuleParams { strong_carbonate_stage: 4, very_strong_carbonate_stage: 5, ..RuleParams::default() };
    assert_eq!(interpret(&s, &p).paleosols[0].maturity, PaleosolDevelopment::Moderate);
}

const SOIL_ON_SAND: &str = "
    3.0 mudstone silt
    2.0 sandstone medium_sand>fine_sand erosional trough_cross-bedding
    0.4 sandstone fine_sand paleosol=strong soil:root_traces soil:rhizoliths
    2.0 sandstone coarse_sand>medium_sand erosional trough_cross-bedding
    3.0 mudstone silt
";

#[test]
fn a_soil_on_a_sandstone_top_ends_the_channel_body_below_it() {
    // Retallack 2001; Kraus 1999: a paleosol records a break in deposition long enough for a
    // soil to form, on sand as on mud, so it separates what lies below from what lies above.
    // Working: bodies 3–5.4 m (sand with its rooted top) and 5.4–7.4 m, each one storey; the
    // first rules merged them into one two-storey "amalgamated" body. The upper body's base sits
    // on the strong soil: a candidate at 5.4 m of kind channel base on paleosol.
    let r = interpret(&section("Soil on sand", SOIL_ON_SAND), &RuleParams::default());
    assert_bodies(&r, &[(3.0, 5.4, 1, Stacking::SingleStory), (5.4, 7.4, 1, Stacking::SingleStory)]);
    assert!(r.storeys[0].capped_by_paleosol);
    assert_eq!(r.paleosols.len(), 1);
    assert!(r.paleosols[0].on_sandstone);
    let at = r.sequence_boundary_candidates.iter().find(|c| close(c.height_m, 5.4)).expect("candidate");
    assert_eq!(at.kind, CandidateKind::ChannelBaseOnPaleosol);
    assert!(
        at.evidence.iter().any(|e| e.to_string().contains("erodes directly into a paleosol of strong")),
        "{at:?}"
    );
    assert!(close(r.channel_thickness_m(), 4.4));
}

const CENSORED: &str = "
    2.5 sandstone medium_sand>fine_sand trough_cross-bedding
    3.0 mudstone silt
    2.0 sandstone medium_sand erosional trough_cross-bedding
    1.5 covered
    2.0 mudstone silt
    1.2 sandstone coarse_sand erosional trough_cross-bedding
    1.5 sandstone coarse_sand erosional trough_cross-bedding
    0.2 mudstone silt
";

#[test]
fn bodies_cut_by_the_section_or_a_cover_are_censored() {
    // Common practice: a body seen only in part gives a minimum thickness, and one storey seen
    // does not make it single-storey (a truncated measurement is a lower bound).
    // Beds (m): sand 0–2.5 (section base) | mud 2.5–5.5 | sand 5.5–7.5 | covered 7.5–9 |
    // mud 9–11 | sand 11–12.2 (E) | sand 12.2–13.7 (E, 1.5 ≥ 1 m: a storey) | drape 13.7–13.9 (top).
    // Working: body 1 censored at its base, body 2 at its top (the cover), both one storey →
    // undetermined; body 3 two storeys → multi-storey, censored at its top (only a 0.2 m drape,
    // thinner than the 0.5 m drape limit, lies between it and the section top).
    let r = interpret(&section("Censored", CENSORED), &RuleParams::default());
    assert_bodies(
        &r,
        &[
            (0.0, 2.5, 1, Stacking::Undetermined),
            (5.5, 7.5, 1, Stacking::Undetermined),
            (11.0, 13.7, 2, Stacking::MultiStory),
        ],
    );
    use aggrade_core::rules::Censor;
    let censored: Vec<Vec<Censor>> = r.channel_bodies.iter().map(|b| b.censored.clone()).collect();
    assert_eq!(censored, vec![vec![Censor::Base], vec![Censor::Top], vec![Censor::Top]]);
    assert_eq!(r.channel_bodies[0].thickness_text(), "\u{2265} 2.50 m");
    // One stretch (no strong candidate): the one body seen whole is amalgamated and channel
    // deposits are 7.2/12.4 = 0.58 of the exposure → low; the sentence counts the two bodies
    // seen only in part, which give no stacking sign.
    assert_eq!(r.accommodation[0].regime, Regime::Low);
    assert!(
        r.accommodation[0]
            .why
            .to_string()
            .contains("1 of 1 channel bodies multi-storey (amalgamated) (2 more seen only in part)"),
        "{}",
        r.accommodation[0].why
    );
    let base = r.sequence_boundary_candidates.iter().find(|c| close(c.height_m, 5.5)).expect("candidate");
    assert!(base.evidence.iter().any(|e| e.to_string().contains("seen only in part")), "{base:?}");

    // Covered intervals: proportion of the exposed 12.4 m, with bounds over all 13.9 m.
    // Channel 2.5 + 2.0 + 2.7 = 7.2 m: exposed-only 7.2/12.4; cover as fines 7.2/13.9; cover
    // as channel (7.2 + 1.5)/13.9.
    assert!(close(r.channel_proportion.expect("exposed"), 7.2 / 12.4));
    let b = r.channel_proportion_bounds.expect("bounds");
    assert!(close(b.covered_as_fines, 7.2 / 13.9) && close(b.covered_as_channel, 8.7 / 13.9), "{b:?}");
}

#[test]
fn decompaction_reads_covered_intervals_as_the_lower_bound_does() {
    // Sclater & Christie 1980 laws; covered slopes are usually mudrock (common practice), so the
    // cover is decompacted as shale — the covered-as-fines reading — while the proportion stays
    // of the exposed thickness, as the rules' own.
    use aggrade_core::analysis::decompaction::{decompact_section, DecompactionParams};
    let s = section("Censored", CENSORED);
    let r = interpret(&s, &RuleParams::default());
    let flags: Vec<bool> = r.elements.iter().map(|e| *e == Element::ChannelDeposit).collect();
    let d = decompact_section(&s, 0.0, Some(&flags), &DecompactionParams::default()).expect("valid");
    assert!(close(d.present_channel_proportion.expect("exposed"), r.channel_proportion.expect("exposed")));
    assert!(close(d.covered_m, 1.5));
    let a = d.covered_assumption.expect("the section has cover");
    assert!(
        a.contains("as shale") && a.contains("covered-as-fines") && a.contains("exposed thickness only"),
        "{a}"
    );
}

#[test]
fn the_json_carries_the_new_results_under_their_contract_names() {
    // `aggrade interpret --json` contract: channel_bodies[].stacking and .censored; paleosols
    // [{base, top, maturity, beds}]; channel_proportion_bounds {covered_as_fines,
    // covered_as_channel}; storeys [{base, top, body}].
    let r = interpret(&section("Censored", CENSORED), &RuleParams::default());
    let v = serde_json::to_value(&r).expect("serialises");
    assert_eq!(v["channel_bodies"][0]["stacking"], "undetermined");
    assert_eq!(v["channel_bodies"][0]["censored"], serde_json::json!(["base"]));
    assert_eq!(v["channel_bodies"][2]["stacking"], "multi-storey");
    assert_eq!(v["storeys"][3]["body"], 2);
    assert!(v["storeys"][0]["base"].is_number() && v["storeys"][0]["top"].is_number());
    assert!(v["channel_proportion_bounds"]["covered_as_fines"].is_number());
    assert!(v["channel_proportion_bounds"]["covered_as_channel"].is_number());
    let r = interpret(&section("Horizons", HORIZONS), &RuleParams::default());
    let v = serde_json::to_value(&r).expect("serialises");
    assert_eq!(v["paleosols"][0]["maturity"], "strong");
    assert_eq!(v["paleosols"][0]["drainage_reading"], "not_poorly");
    assert_eq!(v["paleosols"][0]["drainage_from"], "no_sign");
    assert_eq!(v["paleosols"][0]["beds"], serde_json::json!([2, 3]));
    assert_eq!(
        (v["paleosols"][0]["base"].as_f64(), v["paleosols"][0]["top"].as_f64()),
        (Some(2.0), Some(3.8))
    );
}
