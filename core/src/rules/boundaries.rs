//! Candidate sequence boundaries: every erosional channel-body base, every paleosol profile's
//! top (once per profile) and every bed base the geologist tagged as an incision surface, with
//! the independent evidence found there and a strength class from it.
//!
//! Evidence comes in four independent kinds ([`EvidenceKind`]); items of one kind count once.
//! Being a channel base is not evidence, and neither is the mud-to-sand grain-size step that
//! every channel base has. The rule, its sources and the strength combination are written out in
//! `docs/interpretation-rules.md`.

use super::bodies::body_beds;
use super::column::{BedFacts, Column, TOL};
use super::evidence::{Evidence, EvidenceKind};
use super::params::RuleParams;
use super::types::{
    BoundaryCandidate, CandidateKind, Censor, ChannelBody, PaleosolProfile, Stacking, Storey, Strength,
};
use crate::model::{Contact, LithologyFamily, PaleosolDevelopment, Section, WentworthClass};
use std::collections::{BTreeMap, BTreeSet};

/// What the earlier rules found, for the candidates.
pub struct Found<'a> {
    pub storeys: &'a [Storey],
    pub bodies: &'a [ChannelBody],
    pub paleosols: &'a [PaleosolProfile],
    /// For each bed, the index of the paleosol profile it belongs to.
    pub profile_of: &'a [Option<usize>],
}

/// What sits at one bed boundary.
#[derive(Default)]
struct Site {
    /// Index of the channel body whose erosional base this is.
    body: Option<usize>,
    /// Index of the paleosol profile whose top this is.
    on_paleosol: Option<usize>,
    /// The geologist tagged this bed base as an incision surface.
    tagged: bool,
}

/// The candidates, strongest first (then by score, then by height), and how many weak paleosol
/// tops with no evidence were left out (none when `all` is set).
pub fn candidates(
    section: &Section,
    column: &Column,
    found: &Found,
    params: &RuleParams,
    all: bool,
) -> (Vec<BoundaryCandidate>, usize) {
    let Found { storeys, bodies, paleosols, profile_of } = *found;
    let beds = &section.beds;
    let facts = &column.facts;
    let n = beds.len();
    let mature_profile = |i: usize| profile_of[i].map(|k| &paleosols[k]).filter(|p| p.maturity.is_strong());

    // What sits at each bed boundary (indexed by the bed above it); most have nothing.
    let mut sites: Vec<Site> = Vec::new();
    sites.resize_with(n, Site::default);
    // A channel base is a site when erosional, or when it rests on a paleosol profile's top
    // (a channel on the soil, whatever its contact: then the soil is no interfluve).
    let mut body_starting_at: Vec<Option<usize>> = vec![None; n];
    for (k, body) in bodies.iter().enumerate() {
        let (first, _) = body_beds(body, storeys);
        // A body whose base is not seen (it lies on a covered interval) has no base to offer:
        // where the surface is, somewhere in the cover, is unknown.
        if body.censored.contains(&Censor::Base) {
            continue;
        }
        body_starting_at[first] = Some(k);
        if facts[first].contact == Contact::Erosional {
            sites[first].body = Some(k);
        }
    }
    for (k, p) in paleosols.iter().enumerate() {
        if p.last_bed + 1 < n {
            let j = p.last_bed + 1;
            sites[j].on_paleosol = Some(k);
            sites[j].body = sites[j].body.or(body_starting_at[j]);
        }
    }
    for (site, f) in sites.iter_mut().zip(facts) {
        site.tagged = f.incision_tagged;
    }

    // Index of the highest mature paleosol bed at or below each bed, for truncation checks in
    // constant time.
    let mut last_mature: Vec<Option<usize>> = Vec::with_capacity(n);
    for i in 0..n {
        let prev = if i > 0 { last_mature[i - 1] } else { None };
        last_mature.push(if mature_profile(i).is_some() { Some(i) } else { prev });
    }

    // For each channel site with erosional relief: the highest mature paleosol bed its relief
    // reaches down to, and how far below the base that bed's top lies. Read once, it gives the
    // channel its evidence and tells the soil's own top that it is no interfluve (a channel did
    // come down on it, whatever lies on it at the section).
    let reaches: Vec<Option<(usize, f64)>> = (0..n)
        .map(|j| {
            sites[j].body?;
            let r = facts[j].erosional_relief_m()?;
            let s = last_mature[j.checked_sub(1)?]?;
            let depth_m = column.bounds_m[j] - column.bounds_m[s + 1];
            (depth_m < r - TOL).then_some((s, depth_m))
        })
        .collect();
    let mut cut_by_channel: Vec<Option<f64>> = vec![None; paleosols.len()];
    for (j, &(s, _)) in reaches.iter().enumerate().filter_map(|(j, r)| r.as_ref().map(|r| (j, r))) {
        if let Some(k) = profile_of[s] {
            cut_by_channel[k].get_or_insert(column.bounds_m[j]);
        }
    }

    // The first decision recorded for a bed wins, as in `Section::decision_for`.
    let mut decisions = BTreeMap::new();
    for d in &section.review {
        decisions.entry(d.bed).or_insert(d);
    }

    // Each body's fill grain: the thickness-weighted median Wentworth class of its sand and
    // gravel beds, basal lags left out (a lag is the floor of a storey, not its fill: one
    // pebble lag must not make a medium-sand fill read as gravel).
    let fill_grain: Vec<Option<WentworthClass>> = bodies
        .iter()
        .map(|b| {
            let (first, last) = body_beds(b, storeys);
            fill_median(
                facts.get(first..=last.min(n.saturating_sub(1)).max(first)).unwrap_or_default(),
                params,
            )
        })
        .collect();

    let thickest_storey = |body: &ChannelBody| {
        body.storey_indices.iter().map(|&k| storeys[k].top_m - storeys[k].base_m).fold(0.0, f64::max)
    };

    let mut unlisted = 0;
    let mut found: Vec<BoundaryCandidate> = Vec::new();
    for (j, site) in sites.into_iter().enumerate() {
        if j == 0 || !(site.body.is_some() || site.on_paleosol.is_some() || site.tagged) {
            continue;
        }
        let height_m = column.bounds_m[j];
        let above = &facts[j];
        let below = &facts[j - 1];
        let mut evidence = Vec::new();
        let body = site.body.map(|k| &bodies[k]);

        // What the surface is (site descriptions; no weight).
        if let Some(b) = body {
            evidence.push(match b.stacking {
                Stacking::MultiStory => {
                    Evidence::MultiStoryBase { storeys: b.stories, amalgamated_bases: b.amalgamated_bases }
                }
                Stacking::SingleStory => Evidence::SingleStoryBase,
                Stacking::Undetermined => Evidence::PartlySeenBodyBase,
            });
        }
        let profile_below = site.on_paleosol.map(|k| &paleosols[k]);
        if let Some(p) = profile_below.filter(|p| !p.maturity.is_strong()) {
            evidence.push(Evidence::PaleosolTop { development: p.maturity });
        }
        // The table says whether there is a surface; its name is read from the bed.
        let surface_name = above
            .base_surface
            .then(|| beds[j].base_surface.as_ref())
            .flatten()
            .map(|s| s.name.trim().to_string())
            .filter(|s| !s.is_empty());
        if let Some(name) = surface_name.as_ref().filter(|_| !site.tagged) {
            evidence.push(Evidence::NamedSurface { name: name.clone() });
        }

        // Incision: the geologist's tag, or relief beyond one channel's depth.
        if site.tagged {
            evidence.push(Evidence::IncisionTagged { name: surface_name.clone().unwrap_or_default() });
        }
        let relief_m = above.erosional_relief_m();
        if let Some(r) = relief_m {
            // The body the surface cuts into: the highest one ending at or below it, when the
            // relief reaches down to its top; otherwise the channels of its own body.
            let ending_below = bodies.partition_point(|b| b.top_m <= height_m + TOL);
            let cut = ending_below
                .checked_sub(1)
                .map(|k| &bodies[k])
                .filter(|b| height_m - b.top_m < r - TOL)
                .map(|b| (thickest_storey(b), false))
                .or_else(|| body.map(|b| (thickest_storey(b), true)));
            let over_storey = cut.filter(|&(t, _)| t > 0.0 && r > params.incision_relief_ratio * t + TOL);
            if let Some((storey_m, cuts_into_own_body)) = over_storey {
                evidence.push(Evidence::ReliefOverStorey { relief_m: r, storey_m, cuts_into_own_body });
            } else if r > params.relief_limit_m + TOL {
                evidence.push(Evidence::ReliefOverLimit { relief_m: r, limit_m: params.relief_limit_m });
            }
        }

        // Basinward facies shift: the fill above against the channel fills of the stretch below
        // (whole bodies ending within the window; never the mud under this base).
        if let (Some(k), Some(b)) = (site.body, body) {
            let w = params.boundary_window_m;
            let available_m = w.min(height_m);
            // Bodies are in rising order and do not overlap, so their tops rise too: the bodies
            // ending in the window are found by two bisections, not a scan per base.
            let lo = bodies.partition_point(|o| o.top_m <= height_m - w + TOL);
            let hi = bodies.partition_point(|o| o.top_m <= height_m + TOL);
            let below_bodies: &[ChannelBody] = bodies.get(lo..hi).unwrap_or_default();
            let coarsest_below: Option<WentworthClass> =
                fill_grain.get(lo..hi).unwrap_or_default().iter().flatten().max().copied();
            if let (Some(up), Some(down)) = (fill_grain[k], coarsest_below) {
                let classes = up.rank().saturating_sub(down.rank());
                if classes >= params.facies_shift_min_classes.max(1) {
                    evidence.push(Evidence::CoarserFill {
                        above: up,
                        below: down,
                        classes,
                        bodies_below: below_bodies.len(),
                        available_m,
                        window_m: w,
                    });
                }
            }
            let isolated = below_bodies.iter().filter(|o| o.stacking == Stacking::SingleStory).count();
            if b.stacking == Stacking::MultiStory
                && b.amalgamated_bases > 0
                && isolated > 0
                && isolated == below_bodies.len()
            {
                evidence.push(Evidence::AmalgamatedOverIsolated {
                    storeys: b.stories,
                    isolated_below: isolated,
                    available_m,
                    window_m: w,
                });
            }
        }

        // A channel base on, or cutting into, a mature paleosol profile; or a mature profile
        // with no channel on it.
        if body.is_some() {
            if let Some(p) = mature_profile(j - 1) {
                evidence.push(if above.contact == Contact::Erosional {
                    Evidence::ErodesIntoPaleosol { development: p.maturity }
                } else {
                    Evidence::RestsOnPaleosol { development: p.maturity }
                });
            } else if let (Some(r), Some((s, depth_m))) = (relief_m, reaches[j]) {
                let development = mature_profile(s).map_or(facts[s].paleosol, |p| p.maturity);
                evidence.push(Evidence::ReliefReachesPaleosol { relief_m: r, development, depth_m });
            }
        } else if let Some((k, p)) =
            site.on_paleosol.map(|k| (k, &paleosols[k])).filter(|(_, p)| p.maturity.is_strong())
        {
            if above.family == LithologyFamily::Covered {
                // Whether a channel rests on it is not seen.
                evidence.push(Evidence::TopCovered { development: p.maturity });
            } else if let Some(at_m) = cut_by_channel[k] {
                evidence.push(Evidence::CutByChannelAbove { development: p.maturity, at_m });
            } else if below.sand_or_gravel() {
                evidence.push(Evidence::SandstoneTopPaleosol { development: p.maturity });
            } else {
                evidence.push(Evidence::InterfluvePaleosol {
                    development: p.maturity,
                    poorly_drained: p.poorly_drained,
                });
            }
        }

        let (strength, score) = strength_and_score(&evidence, params);
        let mature_here = profile_below.is_some_and(|p| p.maturity.is_strong());
        if !all && strength == Strength::Weak && body.is_none() && surface_name.is_none() && !mature_here {
            unlisted += 1;
            continue;
        }
        let kind = match (body.is_some(), site.on_paleosol.is_some()) {
            (true, true) => CandidateKind::ChannelBaseOnPaleosol,
            (true, false) => CandidateKind::ChannelBodyBase,
            (false, true) => CandidateKind::PaleosolTop,
            (false, false) => CandidateKind::TaggedSurface,
        };
        let decision = decisions.get(&above.id).copied();
        found.push(BoundaryCandidate {
            height_m,
            bed_index: j,
            bed_id: above.id,
            kind,
            strength,
            score,
            evidence,
            surface_name,
            label: decision.and_then(|d| d.link_label()).map(str::to_string),
            stability: None,
            flipped_by: None,
            review: decision.map(|d| d.state).unwrap_or_default(),
            note: decision.map(|d| d.note.clone()).unwrap_or_default(),
        });
    }
    // Sort small keys rather than the candidates themselves (each carries its evidence), then
    // move every candidate once into its place.
    let mut order: Vec<usize> = (0..found.len()).collect();
    order.sort_by(|&a, &b| {
        let (a, b) = (&found[a], &found[b]);
        b.strength
            .cmp(&a.strength)
            .then(b.score.total_cmp(&a.score))
            .then(a.height_m.total_cmp(&b.height_m))
            .then(a.bed_index.cmp(&b.bed_index))
    });
    let mut slots: Vec<Option<BoundaryCandidate>> = found.into_iter().map(Some).collect();
    (order.into_iter().filter_map(|k| slots[k].take()).collect(), unlisted)
}

/// The thickness-weighted median Wentworth class of the sand and gravel beds of a fill, basal
/// lags left out; a graded bed counts half at its base class and half at its top class. `None`
/// when no such bed has a grain size.
fn fill_median(beds: &[BedFacts], params: &RuleParams) -> Option<WentworthClass> {
    let mut parts: Vec<(WentworthClass, f64)> = Vec::new();
    for bed in beds.iter().filter(|b| b.sand_or_gravel() && !b.is_lag(params)) {
        let t = bed.thickness_m;
        let (base, top) = (bed.grain_base.or(bed.grain_top), bed.grain_top.or(bed.grain_base));
        if let (Some(b), Some(u)) = (base, top) {
            parts.push((b, t / 2.0));
            parts.push((u, t / 2.0));
        }
    }
    let total: f64 = parts.iter().map(|p| p.1).sum();
    if total.is_nan() || total <= 0.0 {
        return None;
    }
    parts.sort_by_key(|p| p.0);
    let mut run = 0.0;
    for (class, t) in parts {
        run += t;
        if run >= total / 2.0 - TOL {
            return Some(class);
        }
    }
    None
}

/// The strength class and ordering score of a candidate from its evidence items.
///
/// - `strong`: two or more independent kinds, or a very strongly developed interfluve paleosol
///   on its own (the interfluve expression of a sequence boundary: McCarthy & Plint 1998; Wright
///   & Marriott 1993). Drainage does not weaken it: interfluve profiles are often gleyed near
///   their top as the water table rose over them afterwards (McCarthy & Plint 1998; from
///   memory); drainage weighs in the regimes instead;
/// - `moderate`: one kind;
/// - `weak`: none (a channel base or paleosol top and nothing more).
///
/// The score sums the weight of each kind present, once; it orders candidates within a class.
pub fn strength_and_score(evidence: &[Evidence], params: &RuleParams) -> (Strength, f64) {
    let kinds: BTreeSet<EvidenceKind> = evidence.iter().filter_map(Evidence::kind).collect();
    let score: f64 = kinds
        .iter()
        .map(|k| match k {
            EvidenceKind::Incision => params.weight_incision,
            EvidenceKind::BasinwardFaciesShift => params.weight_facies_shift,
            EvidenceKind::OnMaturePaleosol => params.weight_on_mature_paleosol,
            EvidenceKind::InterfluvePaleosol => params.weight_interfluve_paleosol,
        })
        .sum();
    let mature_interfluve = evidence.iter().any(|e| {
        matches!(e, Evidence::InterfluvePaleosol { development: PaleosolDevelopment::VeryStrong, .. })
    });
    let strength = match kinds.len() {
        0 => Strength::Weak,
        1 if !mature_interfluve => Strength::Moderate,
        _ => Strength::Strong,
    };
    (strength, if score.is_nan() { 0.0 } else { score.clamp(0.0, 1.0) })
}

#[cfg(test)]
mod tests {
    use crate::model::{
        Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Section, WentworthClass,
    };
    use crate::rules::{interpret, interpret_with, CandidateKind, RuleParams, Strength};

    fn section(beds: Vec<Bed>) -> Section {
        let mut s = Section::new("t");
        for (i, mut b) in beds.into_iter().enumerate() {
            b.id = BedId(i as u64 + 1);
            s.beds.push(b);
        }
        s
    }

    fn mud(t: f64, dev: PaleosolDevelopment) -> Bed {
        let mut b = Bed::new(BedId(0), t, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)));
        b.paleosol = dev;
        b
    }

    #[test]
    fn relief_reaching_a_strong_paleosol_counts_as_truncating_it() {
        // mud 0–3 | strong paleosol 3–4 | mud 4–4.5 | channel 4.5–6.5 (erosional, 1 m relief).
        // The paleosol top lies 0.5 m below the channel base, within the 1 m relief: truncated.
        // Its own top (4 m) is then no interfluve — a channel came down on it — and is listed
        // (a mature soil) as weak, saying so; the evidence goes with the channel base.
        let mut channel =
            Bed::new(BedId(0), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
        channel.base_contact = Contact::Erosional;
        channel.base_relief_m = Some(1.0);
        let s = section(vec![
            mud(3.0, PaleosolDevelopment::None),
            mud(1.0, PaleosolDevelopment::Strong),
            mud(0.5, PaleosolDevelopment::None),
            channel,
            mud(3.0, PaleosolDevelopment::None),
        ]);
        let p = RuleParams::default();
        let r = interpret(&s, &p);
        let at = |h: f64| r.sequence_boundary_candidates.iter().find(|c| (c.height_m - h).abs() < 1e-9);
        let base = at(4.5).expect("channel-base candidate");
        assert_eq!(base.kind, CandidateKind::ChannelBodyBase);
        assert!(base
            .evidence
            .iter()
            .any(|e| e.to_string().contains("relief reaches a paleosol of strong development 0.50 m below")));
        assert_eq!(base.strength, Strength::Moderate, "one kind of evidence: {base:?}");
        let top = at(4.0).expect("paleosol-top candidate");
        assert_eq!(top.kind, CandidateKind::PaleosolTop);
        assert_eq!(top.strength, Strength::Weak, "{top:?}");
        assert!(top
            .evidence
            .iter()
            .any(|e| e.to_string().contains("the channel based at 4.50 m cuts down into")));

        // With 0.4 m of relief the channel does not reach the paleosol, whose top is then an
        // interfluve-type candidate of its own (one kind, moderate).
        let mut shallow = s.clone();
        shallow.beds[3].base_relief_m = Some(0.4);
        let r = interpret(&shallow, &p);
        let base = r.sequence_boundary_candidates.iter().find(|c| c.bed_index == 3).expect("candidate");
        assert!(base.evidence.iter().all(|e| !e.to_string().contains("relief reaches")), "{base:?}");
        assert_eq!(base.strength, Strength::Weak, "a channel base and nothing more: {base:?}");
        let top = r.sequence_boundary_candidates.iter().find(|c| c.bed_index == 2).expect("soil top");
        assert_eq!(top.strength, Strength::Moderate);
        assert!((top.score - p.weight_interfluve_paleosol).abs() < 1e-12, "{top:?}");
    }

    #[test]
    fn a_soil_under_a_cover_is_no_interfluve_and_a_base_on_a_cover_is_no_candidate() {
        // mud 0–3 | very strong paleosol 3–4 | covered 4–6 | channel 6–8 (erosional) | mud 8–10.
        // Whether anything rests on the soil is not seen: listed (a mature soil) but weak. The
        // channel's base lies somewhere in the cover: not offered as a candidate.
        let mut channel =
            Bed::new(BedId(0), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
        channel.base_contact = Contact::Erosional;
        let s = section(vec![
            mud(3.0, PaleosolDevelopment::None),
            mud(1.0, PaleosolDevelopment::VeryStrong),
            Bed::new(BedId(0), 2.0, Lithology::Covered, None),
            channel,
            mud(2.0, PaleosolDevelopment::None),
        ]);
        let r = interpret(&s, &RuleParams::default());
        let c = &r.sequence_boundary_candidates;
        assert_eq!(c.len(), 1, "{c:?}");
        assert_eq!((c[0].bed_index, c[0].strength), (2, Strength::Weak));
        assert!(c[0]
            .evidence
            .iter()
            .any(|e| e.to_string().contains("whether a channel rests on it is not seen")));
    }

    #[test]
    fn equal_scores_are_ordered_by_height() {
        // Two identical isolated channels in 20 m of mud each: no evidence at either base (being
        // a channel base is none), so both are weak with score 0; the lower comes first.
        let channel = || {
            let mut b = Bed::new(
                BedId(0),
                2.0,
                Lithology::Sandstone,
                Some(GrainSize::Class(WentworthClass::MediumSand)),
            );
            b.base_contact = Contact::Erosional;
            b
        };
        let none = PaleosolDevelopment::None;
        let s = section(vec![mud(20.0, none), channel(), mud(20.0, none), channel(), mud(20.0, none)]);
        let r = interpret(&s, &RuleParams::default());
        let heights: Vec<f64> = r.sequence_boundary_candidates.iter().map(|c| c.height_m).collect();
        assert_eq!(heights, vec![20.0, 42.0]);
    }

    #[test]
    fn a_weak_soil_top_is_unlisted_unless_all_are_asked_for() {
        let s = section(vec![
            mud(2.0, PaleosolDevelopment::None),
            mud(1.0, PaleosolDevelopment::Weak),
            mud(2.0, PaleosolDevelopment::None),
        ]);
        let r = interpret(&s, &RuleParams::default());
        assert!(r.sequence_boundary_candidates.is_empty(), "{:?}", r.sequence_boundary_candidates);
        assert_eq!(r.unlisted_candidates, 1);
        let all = interpret_with(&s, &RuleParams::default(), true);
        assert_eq!(all.sequence_boundary_candidates.len(), 1);
        assert_eq!(all.sequence_boundary_candidates[0].strength, Strength::Weak);
        assert_eq!(all.unlisted_candidates, 0);
    }

    #[test]
    fn a_channel_on_a_mature_soil_is_no_interfluve_whatever_its_contact() {
        // Mud 0–3 | very strong paleosol 3–4 | sharp-based channel sand 4–6 (thick, cross-bedded:
        // a channel storey by the decision table) | mud 6–9. The soil has a channel on it, so it
        // is evidence of a channel base on a mature profile (one kind, moderate), not an
        // interfluve paleosol (strong on its own).
        let mut channel =
            Bed::new(BedId(0), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
        channel.structures.push(crate::model::Structure::TroughCrossBedding);
        let s = section(vec![
            mud(3.0, PaleosolDevelopment::None),
            mud(1.0, PaleosolDevelopment::VeryStrong),
            channel,
            mud(3.0, PaleosolDevelopment::None),
        ]);
        let r = interpret(&s, &RuleParams::default());
        assert_eq!(r.channel_bodies.len(), 1, "{:?}", r.elements);
        let c = r.sequence_boundary_candidates.iter().find(|c| c.bed_index == 2).expect("candidate");
        assert_eq!(c.kind, CandidateKind::ChannelBaseOnPaleosol);
        assert_eq!(c.strength, Strength::Moderate, "{c:?}");
        let words: Vec<String> = c.evidence.iter().map(ToString::to_string).collect();
        assert!(words.iter().any(|w| w.contains("rests directly on a paleosol of very strong")), "{words:?}");
        assert!(words.iter().all(|w| !w.contains("interfluve")), "{words:?}");
    }

    #[test]
    fn a_thin_pebble_lag_does_not_make_a_fill_coarse() {
        // Two medium-sand channels in mud, 5 m apart; the upper one has a 0.2 m pebble lag at its
        // base (thinner than the 0.5 m lag limit: the storey's floor, not its fill). Fill
        // against fill, both are medium sand: no facies shift. Read by its coarsest grain, the
        // upper fill would be pebble, 4 classes coarser than the lower: a false shift.
        let sand = |t: f64, class: WentworthClass| {
            let mut b = Bed::new(BedId(0), t, Lithology::Sandstone, Some(GrainSize::Class(class)));
            b.base_contact = Contact::Erosional;
            b
        };
        let mut lag = sand(0.2, WentworthClass::Pebble);
        lag.lithology = Lithology::Conglomerate;
        let mut upper = sand(2.0, WentworthClass::MediumSand);
        upper.base_contact = Contact::Sharp;
        let none = PaleosolDevelopment::None;
        let s = section(vec![
            mud(3.0, none),
            sand(2.0, WentworthClass::MediumSand),
            mud(5.0, none),
            lag,
            upper,
            mud(3.0, none),
        ]);
        let r = interpret(&s, &RuleParams::default());
        let c = r.sequence_boundary_candidates.iter().find(|c| c.bed_index == 3).expect("the lagged base");
        assert!(c.evidence.iter().all(|e| e.kind().is_none()), "{:?}", c.evidence);
        assert_eq!(c.strength, Strength::Weak);
    }
}
