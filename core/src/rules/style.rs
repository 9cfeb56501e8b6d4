//! Fluvial style hints per channel body: braided-like (coarse, blocky, downstream accretion,
//! little mud) or meandering-like (fining-upward storeys, lateral accretion, thick overbank).

use super::bodies::{body_beds, profile};
use super::column::{is_sand_or_gravel, Column, TOL};
use super::params::RuleParams;
use super::types::{ChannelBody, Element, FluvialStyle, GrainProfile, Storey, StyleHint};
use crate::model::{Section, Structure, WentworthClass};

/// Coarsest grain at or above which a body counts as coarse for the braided-like reading
/// (common practice: gravelly or very coarse sandy channel fills).
const COARSE_FROM: WentworthClass = WentworthClass::VeryCoarseSand;

/// Drapes making up less than this share of a body count as "little mud" (common practice).
const LITTLE_MUD_FRACTION: f64 = 0.05;

/// Evidence for each style in one body, as sentences.
fn evidence(
    section: &Section,
    column: &Column,
    elements: &[Element],
    storeys: &[Storey],
    bodies: &[ChannelBody],
    index: usize,
    params: &RuleParams,
) -> (Vec<String>, Vec<String>) {
    let body = &bodies[index];
    let (first, last) = body_beds(body, storeys);
    let beds = &section.beds[first..=last];
    let mut braided = Vec::new();
    let mut meandering = Vec::new();

    if let Some(c) = body.grain_coarsest.filter(|c| c.class() >= COARSE_FROM) {
        braided.push(format!("coarse-grained: up to {}", c.class().name()));
    }
    if body.profile == GrainProfile::Blocky {
        braided.push("blocky grain-size profile".to_string());
    }
    if beds.iter().any(|b| b.structures.contains(&Structure::DownstreamAccretion)) {
        braided.push("downstream-accretion surfaces recorded".to_string());
    }
    let mud_m: f64 = (first..=last)
        .filter(|&i| !is_sand_or_gravel(&section.beds[i]))
        .fold(0.0, |sum, i| sum + column.thickness_m(i));
    if body.thickness_m > 0.0 && mud_m < LITTLE_MUD_FRACTION * body.thickness_m {
        braided.push(format!("little mud inside the body ({mud_m:.2} m of drapes)"));
    }

    let fining = body
        .storey_indices
        .iter()
        .filter(|&&k| {
            profile(section, storeys[k].first_bed, storeys[k].last_bed, params) == GrainProfile::FiningUpward
        })
        .count();
    if fining * 2 > body.storey_indices.len() {
        meandering.push(format!("{fining} of {} storeys fine upward", body.storey_indices.len()));
    }
    if beds.iter().any(|b| b.structures.contains(&Structure::LateralAccretion)) {
        meandering.push("lateral-accretion surfaces recorded".to_string());
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
        meandering.push(format!(
            "thick overbank fines above ({overbank_m:.2} m over a {:.2} m body)",
            body.thickness_m
        ));
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
