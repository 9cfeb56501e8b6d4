//! Fluvial style hints per channel body: braided-like (coarse, blocky, downstream accretion,
//! little mud) or meandering-like (fining-upward storeys, lateral accretion, thick overbank).

use super::bodies::{body_beds, profile};
use super::column::{is_sand_or_gravel, Column, TOL};
use super::evidence::Evidence;
use super::params::RuleParams;
use super::types::{ChannelBody, Element, FluvialStyle, GrainProfile, Storey, StyleHint};
use crate::model::{Section, Structure};

/// Evidence for each style in one body, as sentences.
fn evidence(
    section: &Section,
    column: &Column,
    elements: &[Element],
    storeys: &[Storey],
    bodies: &[ChannelBody],
    index: usize,
    params: &RuleParams,
) -> (Vec<Evidence>, Vec<Evidence>) {
    let body = &bodies[index];
    let (first, last) = body_beds(body, storeys);
    let beds = || section.beds.range(first..=last);
    let mut braided = Vec::new();
    let mut meandering = Vec::new();

    if let Some(c) = body.grain_coarsest.filter(|c| c.class() >= params.braided_min_coarsest) {
        braided.push(Evidence::CoarseGrained { coarsest: c.class() });
    }
    if body.profile == GrainProfile::Blocky {
        braided.push(Evidence::BlockyProfile);
    }
    if beds().any(|b| b.structures.contains(&Structure::DownstreamAccretion)) {
        braided.push(Evidence::DownstreamAccretion);
    }
    let mud_m: f64 = (first..=last)
        .filter(|&i| !is_sand_or_gravel(&section.beds[i]))
        .fold(0.0, |sum, i| sum + column.thickness_m(i));
    if body.thickness_m > 0.0 && mud_m < params.little_mud_max_fraction * body.thickness_m {
        braided.push(Evidence::LittleMud { mud_m });
    }

    let fining = body
        .storey_indices
        .iter()
        .filter(|&&k| {
            profile(section, storeys[k].first_bed, storeys[k].last_bed, params) == GrainProfile::FiningUpward
        })
        .count();
    if fining * 2 > body.storey_indices.len() {
        meandering.push(Evidence::FiningStoreys { fining, storeys: body.storey_indices.len() });
    }
    if beds().any(|b| b.structures.contains(&Structure::LateralAccretion)) {
        meandering.push(Evidence::LateralAccretion);
    }
    // Overbank deposits (fines, paleosols, splays) directly above the body, up to the next body
    // or the first covered or non-clastic bed.
    let next_base = bodies.get(index + 1).map_or(usize::MAX, |b| body_beds(b, storeys).0);
    let overbank_m: f64 = (last + 1..section.beds.len().min(next_base))
        .take_while(|&i| {
            matches!(elements[i], Element::OverbankFines | Element::Paleosol | Element::SplaySand)
        })
        .fold(0.0, |sum, i| sum + column.thickness_m(i));
    if body.thickness_m > 0.0 && overbank_m >= body.thickness_m - TOL {
        meandering.push(Evidence::ThickOverbank { overbank_m, body_m: body.thickness_m });
    }
    (braided, meandering)
}

/// Fill `style_hint` of every body: the style with at least the set number of evidence items and
/// more than the other; none when the evidence is thin or balanced.
pub fn add_style_hints(
    section: &Section,
    column: &Column,
    elements: &[Element],
    storeys: &[Storey],
    bodies: &mut [ChannelBody],
    params: &RuleParams,
) {
    let hints: Vec<Option<StyleHint>> = (0..bodies.len())
        .map(|k| {
            let (braided, meandering) = evidence(section, column, elements, storeys, bodies, k, params);
            let min = params.style_min_evidence.max(1);
            if braided.len() >= min && braided.len() > meandering.len() {
                Some(StyleHint { style: FluvialStyle::BraidedLike, evidence: braided })
            } else if meandering.len() >= min && meandering.len() > braided.len() {
                Some(StyleHint { style: FluvialStyle::MeanderingLike, evidence: meandering })
            } else {
                None
            }
        })
        .collect();
    for (body, hint) in bodies.iter_mut().zip(hints) {
        body.style_hint = hint;
    }
}

#[cfg(test)]
mod tests {
    use crate::model::{Bed, BedId, Contact, GrainSize, Lithology, Section, Structure, WentworthClass};
    use crate::rules::{interpret, FluvialStyle, RuleParams};

    fn sand(t: f64, base: WentworthClass, top: WentworthClass, structure: Option<Structure>) -> Bed {
        let mut b = Bed::new(BedId(0), t, Lithology::Sandstone, Some(GrainSize::Class(base)));
        b.grain_top = Some(GrainSize::Class(top));
        b.base_contact = Contact::Erosional;
        b.structures.extend(structure);
        b
    }

    fn run(beds: Vec<Bed>) -> Option<FluvialStyle> {
        let mut s = Section::new("t");
        let mud = Bed::new(BedId(0), 2.0, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)));
        for (i, mut b) in std::iter::once(mud).chain(beds).enumerate() {
            b.id = BedId(i as u64 + 1);
            s.beds.push(b);
        }
        interpret(&s, &RuleParams::default()).channel_bodies[0].style_hint.as_ref().map(|h| h.style)
    }

    #[test]
    fn coarse_blocky_downstream_accreting_body_is_braided_like() {
        use WentworthClass::{Granule, VeryCoarseSand};
        let b = run(vec![
            sand(2.0, Granule, VeryCoarseSand, Some(Structure::DownstreamAccretion)),
            sand(2.0, Granule, Granule, None),
        ]);
        assert_eq!(b, Some(FluvialStyle::BraidedLike));
    }

    #[test]
    fn fining_laterally_accreting_storey_under_thick_fines_is_meandering_like() {
        use WentworthClass::{FineSand, MediumSand, Silt};
        let mut beds = vec![sand(2.0, MediumSand, FineSand, Some(Structure::LateralAccretion))];
        beds.push(Bed::new(BedId(0), 5.0, Lithology::Mudstone, Some(GrainSize::Class(Silt))));
        assert_eq!(run(beds), Some(FluvialStyle::MeanderingLike));
    }

    #[test]
    fn thin_evidence_gives_no_hint() {
        // Medium sand, slightly fining (0.5 phi < 1 phi: blocky), no structures, nothing above:
        // blocky + little mud (2 braided items) against none → braided-like; raising the
        // minimum to 3 items leaves no hint.
        use WentworthClass::MediumSand;
        let beds = vec![sand(2.0, MediumSand, MediumSand, None)];
        assert_eq!(run(beds.clone()), Some(FluvialStyle::BraidedLike));
        let mut s = Section::new("t");
        for (i, mut b) in beds.into_iter().enumerate() {
            b.id = BedId(i as u64 + 1);
            s.beds.push(b);
        }
        let strict = RuleParams { style_min_evidence: 3, ..RuleParams::default() };
        assert_eq!(interpret(&s, &strict).channel_bodies[0].style_hint, None);
    }
}
