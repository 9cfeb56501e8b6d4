//! Interpretation rules: pure functions of a section plus one documented parameter struct.
//!
//! [`interpret`] runs the rule families in order, one file each: paleosol profiles
//! (`paleosols`), elements and storeys (`elements`), channel bodies (`bodies`), fluvial style (`style`), channel-body proportion
//! (`proportion`), candidate sequence boundaries (`boundaries`) and accommodation regimes
//! (`accommodation`). Every threshold is a field of [`RuleParams`]. The work is linear in the
//! number of beds, plus a binary search per curve point and per candidate.

mod accommodation;
mod bodies;
mod boundaries;
mod column;
mod elements;
pub mod evidence;
pub mod facies;
mod paleosols;
pub mod params;
mod proportion;
pub mod sensitivity;
mod style;
pub mod types;

pub use evidence::{Evidence, EvidenceKind, RegimeSign, RegimeWhy, Undetermined};
pub use params::RuleParams;
pub use types::*;

use crate::model::{ReviewState, Section};
use column::Column;

/// Interpret one section. Deterministic, never panics, and every height is in metres above the
/// section base whatever unit the thicknesses were entered in.
///
/// ```
/// use aggrade_core::model::{Bed, BedId, Contact, GrainSize, Lithology, Section, WentworthClass};
/// use aggrade_core::rules::{interpret, RuleParams, Stacking};
///
/// let mut s = Section::new("Demo");
/// let silt = Some(GrainSize::Class(WentworthClass::Silt));
/// let sand = Some(GrainSize::Class(WentworthClass::MediumSand));
/// s.beds.push(Bed::new(BedId(1), 4.0, Lithology::Mudstone, silt));
/// let mut channel = Bed::new(BedId(2), 2.0, Lithology::Sandstone, sand);
/// channel.base_contact = Contact::Erosional;
/// s.beds.push(channel);
/// s.beds.push(Bed::new(BedId(3), 4.0, Lithology::Mudstone, silt));
///
/// let result = interpret(&s, &RuleParams::default());
/// assert_eq!(result.channel_bodies.len(), 1);
/// assert_eq!(result.channel_bodies[0].stacking, Stacking::SingleStory);
/// assert!(result.channel_bodies[0].censored.is_empty());
/// assert_eq!(result.channel_proportion, Some(0.2)); // 2 m of channel sand in 10 m
/// ```
pub fn interpret(section: &Section, params: &RuleParams) -> Interpretation {
    interpret_with(section, params, false)
}

/// [`interpret`], listing every candidate when `all_candidates` is set: weak paleosol tops with
/// no evidence too (`aggrade interpret --all-candidates`, the review list's toggle).
pub fn interpret_with(section: &Section, params: &RuleParams, all_candidates: bool) -> Interpretation {
    let column = Column::new(section);
    let paleosols = paleosols::profiles(section, &column, params);
    let profile_of = paleosols::profile_of_bed(section.beds.len(), &paleosols);
    let (elements, mut storeys) = elements::elements_and_storeys(section, &column, &profile_of, params);
    let column = column.with_elements(&elements);
    let mut channel_bodies = bodies::channel_bodies(section, &elements, &mut storeys, params);
    style::add_style_hints(section, &column, &elements, &storeys, &mut channel_bodies, params);
    let found = boundaries::Found {
        storeys: &storeys,
        bodies: &channel_bodies,
        paleosols: &paleosols,
        profile_of: &profile_of,
    };
    let (candidates, unlisted_candidates) =
        boundaries::candidates(section, &column, &found, params, all_candidates);

    // Cuts for regimes and proportions: accepted boundaries; failing those, strong candidates not
    // rejected (unlisted candidates are weak, so never cut). The first decision recorded for a
    // bed counts, as in `Section::decision_for`.
    let mut first_decision = std::collections::BTreeMap::new();
    for d in &section.review {
        first_decision.entry(d.bed).or_insert(d.state);
    }
    let accepted: Vec<f64> = (0..section.beds.len())
        .filter(|&i| first_decision.get(&section.beds[i].id) == Some(&ReviewState::Accepted))
        .map(|i| column.bounds_m[i])
        .collect();
    let cuts_are_accepted = !accepted.is_empty();
    let cut_heights: Vec<f64> = if cuts_are_accepted {
        accepted
    } else {
        let mut strong: Vec<f64> = candidates
            .iter()
            .filter(|c| c.review != ReviewState::Rejected && c.strength == Strength::Strong)
            .map(|c| c.height_m)
            .collect();
        strong.sort_by(f64::total_cmp);
        strong
    };

    Interpretation {
        section: section.name.clone(),
        total_thickness_m: column.total_m(),
        exposed_thickness_m: column.exposed_total_m(),
        channel_proportion: column::proportion_of(column.channel_total_m(), column.exposed_total_m()),
        channel_proportion_bounds: proportion::bounds(&column),
        interval_proportions: proportion::interval_proportions(&column, &cut_heights),
        proportion_curve: proportion::proportion_curve(&column, params),
        accommodation: accommodation::regimes(&column, &channel_bodies, &paleosols, &cut_heights, params),
        sequence_boundary_candidates: candidates,
        unlisted_candidates,
        cut_heights,
        cuts_are_accepted,
        params: params.clone(),
        elements,
        storeys,
        channel_bodies,
        paleosols,
        caution: crate::REVIEW_CAUTION.to_string(),
    }
}

impl Interpretation {
    /// True when the proportion's bounds differ from it (some of the section is covered).
    pub fn has_cover(&self) -> bool {
        self.total_thickness_m - self.exposed_thickness_m > 1e-9
    }

    /// The whole-section proportion in words, with its bounds when part of the section is
    /// covered: "0.42 of exposed (0.38 with covered as fines, 0.50 as channel)".
    pub fn proportion_text(&self) -> String {
        match (self.channel_proportion, self.channel_proportion_bounds) {
            (None, _) => "n/a (no exposure)".to_string(),
            (Some(p), Some(b)) if self.has_cover() => format!(
                "{p:.2} of exposed ({:.2} with covered as fines, {:.2} as channel)",
                b.covered_as_fines, b.covered_as_channel
            ),
            (Some(p), _) => format!("{p:.2}"),
        }
    }

    /// Total thickness of channel deposits (storeys, drapes inside them included), metres.
    pub fn channel_thickness_m(&self) -> f64 {
        // A fold from +0.0: an empty float sum would give −0.0.
        self.storeys.iter().fold(0.0, |sum, s| sum + (s.top_m - s.base_m))
    }
}
