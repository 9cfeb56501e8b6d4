//! Candidate sequence boundaries: every erosional channel-body base and every paleosol
//! profile's top (once per profile, whatever number of beds its horizons were logged as), scored
//! from weighted evidence, one candidate per bed boundary.

use super::bodies::{body_beds, grain_at_base, grain_at_top};
use super::column::{is_sand_or_gravel, Column, TOL};
use super::evidence::Evidence;
use super::params::RuleParams;
use super::types::{BoundaryCandidate, CandidateKind, ChannelBody, PaleosolProfile, Stacking, Storey};
use crate::model::{Contact, Section};
use std::collections::BTreeMap;

/// What the earlier rules found, for the candidates.
pub struct Found<'a> {
    pub storeys: &'a [Storey],
    pub bodies: &'a [ChannelBody],
    pub paleosols: &'a [PaleosolProfile],
}

/// What sits at one bed boundary.
#[derive(Default)]
struct Site {
    /// Index of the channel body whose erosional base this is.
    body: Option<usize>,
    /// Index of the paleosol profile whose top this is.
    on_paleosol: Option<usize>,
}

/// Score and explain every candidate; sorted by score (highest first), ties by height.
pub fn candidates(
    section: &Section,
    column: &Column,
    found: &Found,
    params: &RuleParams,
) -> Vec<BoundaryCandidate> {
    let Found { storeys, bodies, paleosols } = *found;
    let beds = &section.beds;
    let n = beds.len();
    let profile_of = super::paleosols::profile_of_bed(n, paleosols);
    let strong_profile = |i: usize| profile_of[i].map(|k| &paleosols[k]).filter(|p| p.maturity.is_strong());
    let is_strong_soil = |i: usize| strong_profile(i).is_some();

    // What sits at each bed boundary (indexed by the bed above it); most have nothing.
    let mut sites: Vec<Site> = Vec::new();
    sites.resize_with(n, Site::default);
    for (k, body) in bodies.iter().enumerate() {
        let (first, _) = body_beds(body, storeys);
        if beds[first].base_contact == Contact::Erosional {
            sites[first].body = Some(k);
        }
    }
    for (k, p) in paleosols.iter().enumerate() {
        if p.last_bed + 1 < n {
            sites[p.last_bed + 1].on_paleosol = Some(k);
        }
    }

    // Index of the highest strongly developed paleosol at or below each bed, for truncation checks
    // in constant time.
    let mut last_strong: Vec<Option<usize>> = Vec::with_capacity(n);
    for i in 0..n {
        let prev = if i > 0 { last_strong[i - 1] } else { None };
        last_strong.push(if is_strong_soil(i) { Some(i) } else { prev });
    }

    // The first decision recorded for a bed wins, as in `Section::decision_for`; one map instead
    // of a search per candidate.
    let mut decisions = BTreeMap::new();
    for d in &section.review {
        decisions.entry(d.bed).or_insert(d);
    }

    // Sites come in rising order, so the windows below and above each one rise too.
    let (mut windows_below, mut windows_above) = (column.rising_windows(), column.rising_windows());
    let found: Vec<BoundaryCandidate> = sites
        .into_iter()
        .enumerate()
        .filter(|(j, site)| *j > 0 && (site.body.is_some() || site.on_paleosol.is_some()))
        .map(|(j, site)| {
            let height_m = column.bounds_m[j];
            let above = &beds[j];
            let below = &beds[j - 1];
            let mut evidence = Vec::new();
            let mut score = 0.0;

            if let Some(k) = site.body {
                let body = &bodies[k];
                match body.stacking {
                    Stacking::MultiStory => {
                        score += params.weight_multistory_base;
                        evidence.push(Evidence::MultiStoryBase { storeys: body.stories });
                    }
                    Stacking::SingleStory => evidence.push(Evidence::SingleStoryBase),
                    Stacking::Undetermined => evidence.push(Evidence::PartlySeenBodyBase),
                }
            }
            let profile_below = site.on_paleosol.map(|k| &paleosols[k]);
            if let Some(p) = profile_below.filter(|p| !p.maturity.is_strong()) {
                evidence.push(Evidence::PaleosolTop { development: p.maturity });
            }

            // Abrupt upward jump in grain size, counted in Wentworth classes.
            if let (Some(up), Some(down)) = (grain_at_base(above), grain_at_top(below)) {
                let jump = up.class().rank() as i64 - down.class().rank() as i64;
                if jump >= params.grain_jump_min_classes as i64 && jump > 0 {
                    score += params.weight_grain_jump;
                    evidence.push(Evidence::GrainJump { classes: jump, from: down.class(), to: up.class() });
                }
            }

            // Erosional relief beyond one channel's scour.
            let relief_m = above.base_relief_m.filter(|r| r.is_finite() && *r > 0.0);
            if let Some(r) = relief_m.filter(|_| above.base_contact == Contact::Erosional) {
                // Storeys are in order, so the last one ending below this bed is found by bisection.
                let below_count = storeys.partition_point(|s| s.last_bed < j);
                let storey_below = below_count.checked_sub(1).map(|k| storeys[k].top_m - storeys[k].base_m);
                if r > params.relief_limit_m + TOL {
                    score += params.weight_relief;
                    evidence.push(Evidence::ReliefOverLimit { relief_m: r, limit_m: params.relief_limit_m });
                } else if let Some(t) = storey_below.filter(|t| r > *t + TOL) {
                    score += params.weight_relief;
                    evidence.push(Evidence::ReliefOverStorey { relief_m: r, storey_m: t });
                }
            }

            // A channel base on, or cutting into, a strongly developed paleosol.
            if site.body.is_some() {
                if let Some(p) = strong_profile(j - 1) {
                    score += params.weight_on_strong_paleosol;
                    evidence.push(Evidence::ErodesIntoPaleosol { development: p.maturity });
                } else if let (Some(r), Some(s)) = (relief_m, last_strong[j - 1]) {
                    let depth_m = height_m - column.bounds_m[s + 1];
                    if depth_m < r - TOL {
                        score += params.weight_on_strong_paleosol;
                        let development = strong_profile(s).map_or(beds[s].paleosol, |p| p.maturity);
                        evidence.push(Evidence::ReliefReachesPaleosol { relief_m: r, development, depth_m });
                    }
                }
            } else if let Some(p) = profile_below.filter(|p| p.maturity.is_strong()) {
                // A mature soil not cut by a channel here: on floodplain fines an interfluve
                // equivalent; on a sandstone top a long break in deposition after the channel.
                score += params.weight_interfluve_paleosol;
                if is_sand_or_gravel(below) {
                    evidence.push(Evidence::SandstoneTopPaleosol { development: p.maturity });
                } else {
                    evidence.push(Evidence::InterfluvePaleosol { development: p.maturity });
                }
            }

            // Basinward shift in stacking: more channel deposits above than below.
            let w = params.boundary_window_m;
            if w.is_finite() && w > 0.0 && height_m > 0.0 {
                let lower = windows_below.proportion(height_m - w, height_m);
                let upper = windows_above.proportion(height_m, height_m + w);
                if let (Some(lo), Some(up)) = (lower, upper) {
                    if up - lo >= params.proportion_jump_min - TOL {
                        score += params.weight_proportion_jump;
                        evidence.push(Evidence::ProportionRise { below: lo, above: up, window_m: w });
                    }
                }
            }

            let kind = match (site.body.is_some(), site.on_paleosol.is_some()) {
                (true, true) => CandidateKind::ChannelBaseOnPaleosol,
                (true, false) => CandidateKind::ChannelBodyBase,
                _ => CandidateKind::PaleosolTop,
            };
            let decision = decisions.get(&above.id).copied();
            BoundaryCandidate {
                height_m,
                bed_index: j,
                bed_id: above.id,
                kind,
                score: if score.is_nan() { 0.0 } else { score.clamp(0.0, 1.0) },
                evidence,
                review: decision.map(|d| d.state).unwrap_or_default(),
                note: decision.map(|d| d.note.clone()).unwrap_or_default(),
            }
        })
        .collect();
    // Sort small keys rather than the candidates themselves (each carries its evidence), then
    // move every candidate once into its place.
    let mut order: Vec<usize> = (0..found.len()).collect();
    order.sort_by(|&a, &b| {
        let (a, b) = (&found[a], &found[b]);
        b.score
            .total_cmp(&a.score)
            .then(a.height_m.total_cmp(&b.height_m))
            .then(a.bed_index.cmp(&b.bed_index))
    });
    let mut slots: Vec<Option<BoundaryCandidate>> = found.into_iter().map(Some).collect();
    order.into_iter().filter_map(|k| slots[k].take()).collect()
}

#[cfg(test)]
mod tests {
    use crate::model::{
        Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Section, WentworthClass,
    };
    use crate::rules::{interpret, CandidateKind, RuleParams};

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
        // Its own top (4 m) is overlain by mud: an interfluve-type candidate of its own.
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
        // The proportion jump (0 below, 2/5.5 above) is weighed elsewhere; leave it out here.
        let p = RuleParams { weight_proportion_jump: 0.0, ..RuleParams::default() };
        let r = interpret(&s, &p);
        let at = |h: f64| r.sequence_boundary_candidates.iter().find(|c| (c.height_m - h).abs() < 1e-9);
        let base = at(4.5).expect("channel-base candidate");
        assert_eq!(base.kind, CandidateKind::ChannelBodyBase);
        assert!(base
            .evidence
            .iter()
            .any(|e| e.to_string().contains("relief reaches a paleosol of strong development 0.50 m below")));
        let top = at(4.0).expect("paleosol-top candidate");
        assert_eq!(top.kind, CandidateKind::PaleosolTop);
        assert!((top.score - p.weight_interfluve_paleosol).abs() < 1e-12, "{top:?}");

        // With 0.4 m of relief the channel does not reach the paleosol.
        let mut shallow = s.clone();
        shallow.beds[3].base_relief_m = Some(0.4);
        let r = interpret(&shallow, &p);
        let base = r.sequence_boundary_candidates.iter().find(|c| c.bed_index == 3).expect("candidate");
        assert!(base.evidence.iter().all(|e| !e.to_string().contains("relief reaches")), "{base:?}");
    }

    #[test]
    fn equal_scores_are_ordered_by_height() {
        // Two identical isolated channels in 20 m of mud each: the 10 m windows see 0 below and
        // 2/10 = 0.2 above both bases (< 0.3, no jump), so both score 0; the lower comes first.
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
}
