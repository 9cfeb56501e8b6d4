//! Channel bodies: storeys stacked with nothing but drapes between them, with their stacking,
//! amalgamation, grain-size range, vertical profile and the ends not seen.
//!
//! A body ends where overbank fines or a paleosol separate storeys, at a paleosol on a storey's
//! own sandstone top, and at a base the geologist ranked a body base. A body whose base lies at
//! the section base or on a covered interval, or whose top (above any thin drapes) lies at the
//! section top or under a covered interval, is censored: its thickness is a minimum, and with one
//! storey seen its stacking is undetermined (more storeys may lie in the part not seen).

use super::column::{is_sand_or_gravel, TOL};
use super::params::RuleParams;
use super::types::{Censor, ChannelBody, Element, GrainProfile, Stacking, Storey};
use crate::model::{BaseRank, Bed, GrainSize, Section};

/// Grain size at the base of a bed (the top value when only that was logged).
pub(crate) fn grain_at_base(bed: &Bed) -> Option<GrainSize> {
    bed.grain_base.or(bed.grain_top)
}

/// Grain size at the top of a bed (the base value when only that was logged).
pub(crate) fn grain_at_top(bed: &Bed) -> Option<GrainSize> {
    bed.grain_top.or(bed.grain_base)
}

/// Profile from the grain size at the base of the lowest and the top of the highest sand or
/// gravel bed in `first..=last`: a rise in phi (finer) of at least the set change is fining-upward.
pub(crate) fn profile(section: &Section, first: usize, last: usize, params: &RuleParams) -> GrainProfile {
    let sands = || (first..=last).filter(|&i| is_sand_or_gravel(&section.beds[i]));
    let base = sands().find_map(|i| grain_at_base(&section.beds[i]));
    let top = sands().rev().find_map(|i| grain_at_top(&section.beds[i]));
    match (base, top) {
        (Some(b), Some(t)) => {
            let finer_by_phi = t.phi() - b.phi();
            if !finer_by_phi.is_finite() {
                GrainProfile::Unknown
            } else if finer_by_phi >= params.profile_min_phi_change {
                GrainProfile::FiningUpward
            } else if -finer_by_phi >= params.profile_min_phi_change {
                GrainProfile::CoarseningUpward
            } else {
                GrainProfile::Blocky
            }
        }
        _ => GrainProfile::Unknown,
    }
}

/// Group storeys (base first) into channel bodies (base first), and note each storey's body.
/// Style hints are filled later.
pub fn channel_bodies(
    section: &Section,
    elements: &[Element],
    storeys: &mut [Storey],
    params: &RuleParams,
) -> Vec<ChannelBody> {
    let mut bodies = Vec::new();
    let mut start = 0;
    for k in 0..storeys.len() {
        let ends_body = k + 1 == storeys.len()
            || storeys[k + 1].first_bed != storeys[k].last_bed + 1
            || storeys[k].capped_by_paleosol
            || section.beds[storeys[k + 1].first_bed].base_rank == Some(BaseRank::BodyBase);
        if ends_body {
            let mut body = make_body(section, storeys, start, k, params);
            body.censored = censored(section, elements, &storeys[start..=k], params);
            if body.stories < 2 && body.is_censored() {
                body.stacking = Stacking::Undetermined;
            }
            for s in &mut storeys[start..=k] {
                s.body = bodies.len();
            }
            bodies.push(body);
            start = k + 1;
        }
    }
    bodies
}

/// The ends of a body (its storeys) that are not seen.
fn censored(section: &Section, elements: &[Element], group: &[Storey], params: &RuleParams) -> Vec<Censor> {
    let n = section.beds.len();
    let (first, last) = (group[0].first_bed, group[group.len() - 1].last_bed);
    let mut out = Vec::new();
    if first == 0 || elements[first - 1] == Element::Covered {
        out.push(Censor::Base);
    }
    // Above the top: thin overbank fines (a drape) may lie between the sand and a cover.
    let mut k = last + 1;
    let mut drape_m = 0.0;
    while k < n
        && elements[k] == Element::OverbankFines
        && drape_m + section.beds[k].usable_thickness_m() < params.drape_limit_m - TOL
    {
        drape_m += section.beds[k].usable_thickness_m();
        k += 1;
    }
    let capped = group[group.len() - 1].capped_by_paleosol;
    if !capped && (k >= n || elements[k] == Element::Covered) {
        out.push(Censor::Top);
    }
    out
}

fn make_body(
    section: &Section,
    storeys: &[Storey],
    first: usize,
    last: usize,
    params: &RuleParams,
) -> ChannelBody {
    let group = &storeys[first..=last];
    let first_bed = group[0].first_bed;
    let last_bed = group[group.len() - 1].last_bed;
    let mut finest: Option<GrainSize> = None;
    let mut coarsest: Option<GrainSize> = None;
    for bed in section.beds.range(first_bed..=last_bed).filter(|b| is_sand_or_gravel(b)) {
        for g in [bed.grain_base, bed.grain_top].into_iter().flatten() {
            if finest.is_none_or(|f| g.phi() > f.phi()) {
                finest = Some(g);
            }
            if coarsest.is_none_or(|c| g.phi() < c.phi()) {
                coarsest = Some(g);
            }
        }
    }
    let base_m = group[0].base_m;
    let top_m = group[group.len() - 1].top_m;
    ChannelBody {
        base_m,
        top_m,
        thickness_m: top_m - base_m,
        stories: group.len(),
        stacking: if group.len() >= 2 { Stacking::MultiStory } else { Stacking::SingleStory },
        censored: Vec::new(),
        amalgamated_bases: group.iter().filter(|s| s.amalgamated_base).count(),
        grain_finest: finest,
        grain_coarsest: coarsest,
        profile: profile(section, first_bed, last_bed, params),
        style_hint: None,
        storey_indices: (first..=last).collect(),
        stability: None,
        flipped_by: None,
    }
}

/// Index of the lowest and highest bed of a body.
pub(crate) fn body_beds(body: &ChannelBody, storeys: &[Storey]) -> (usize, usize) {
    let first = body.storey_indices.first().map_or(0, |&k| storeys[k].first_bed);
    let last = body.storey_indices.last().map_or(0, |&k| storeys[k].last_bed);
    (first, last)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{BedId, Lithology, WentworthClass};

    fn storey(first: usize, last: usize, base: f64, top: f64, amalgamated: bool) -> Storey {
        Storey {
            base_m: base,
            top_m: top,
            first_bed: first,
            last_bed: last,
            amalgamated_base: amalgamated,
            capped_by_paleosol: false,
            body: 0,
        }
    }

    #[test]
    fn contiguous_storeys_form_one_body() {
        let mut s = Section::new("t");
        for (i, (lith, base, top)) in [
            (Lithology::Conglomerate, WentworthClass::Pebble, WentworthClass::CoarseSand),
            (Lithology::Sandstone, WentworthClass::MediumSand, WentworthClass::FineSand),
            (Lithology::Mudstone, WentworthClass::Silt, WentworthClass::Silt),
            (Lithology::Sandstone, WentworthClass::FineSand, WentworthClass::FineSand),
        ]
        .into_iter()
        .enumerate()
        {
            let mut b = Bed::new(BedId(i as u64), 1.0, lith, Some(GrainSize::Class(base)));
            b.grain_top = Some(GrainSize::Class(top));
            s.beds.push(b);
        }
        let mut st =
            vec![storey(0, 0, 0.0, 1.0, false), storey(1, 1, 1.0, 2.0, true), storey(3, 3, 3.0, 4.0, false)];
        let els = [
            Element::ChannelDeposit,
            Element::ChannelDeposit,
            Element::OverbankFines,
            Element::ChannelDeposit,
        ];
        let bodies = channel_bodies(&s, &els, &mut st, &RuleParams::default());
        assert_eq!(st.iter().map(|s| s.body).collect::<Vec<_>>(), vec![0, 0, 1]);
        assert_eq!(bodies.len(), 2);
        assert_eq!(
            (bodies[0].stories, bodies[0].stacking, bodies[0].amalgamated_bases),
            (2, Stacking::MultiStory, 1)
        );
        assert_eq!(bodies[0].grain_coarsest, Some(GrainSize::Class(WentworthClass::Pebble)));
        assert_eq!(bodies[0].grain_finest, Some(GrainSize::Class(WentworthClass::FineSand)));
        // Pebble midpoint φ −4 to fine sand φ 2.5: fining upward.
        assert_eq!(bodies[0].profile, GrainProfile::FiningUpward);
        // The second body reaches the section top: one storey seen, stacking undetermined.
        assert_eq!(bodies[1].censored, vec![Censor::Top]);
        assert_eq!((bodies[1].stacking, bodies[1].profile), (Stacking::Undetermined, GrainProfile::Blocky));
        // The first starts at the section base: censored there, but two storeys are seen.
        assert_eq!(
            (bodies[0].censored.as_slice(), bodies[0].stacking),
            (&[Censor::Base][..], Stacking::MultiStory)
        );
    }
}
