//! The section change one tracing click makes: a boundary at a height, cutting the bed there or
//! adding a bed on top of the section.

use crate::model::{Bed, BedId, Contact, Section};
use thiserror::Error;

/// Clicks closer than this to an existing boundary (metres) are taken to be on it: 1 mm, far
/// below what a pencil line on a sheet can show.
pub const SAME_BOUNDARY_M: f64 = 0.001;

/// What a boundary click did.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Cut {
    /// Cut the bed `lower` at the height; `upper` is the new bed above the cut.
    Split { lower: BedId, upper: BedId },
    /// Added a new bed from the old top of the section up to the height.
    OnTop { bed: BedId },
}

/// Why a boundary click changes nothing.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum CutError {
    #[error("the click reads {height_m:.3} m, at or below the section base (0 m); click above it")]
    BelowBase { height_m: f64 },
    #[error("there is already a boundary at {height_m:.3} m")]
    AlreadyABoundary { height_m: f64 },
    #[error("the click's height is not a number")]
    NotFinite,
}

/// The bed whose interval holds `height_m` (base inclusive), if any.
pub fn bed_at(section: &Section, height_m: f64) -> Option<BedId> {
    let mut base = 0.0;
    for bed in &section.beds {
        let top = base + bed.thickness_m;
        if height_m >= base && height_m < top {
            return Some(bed.id);
        }
        base = top;
    }
    None
}

/// Put a bed boundary at `height_m` (metres above the section base). Inside a bed, the bed is cut
/// in two: the lower part keeps the bed's id, base and everything else; the upper part is a copy
/// with a sharp base and no surface of its own. Above the top, a new bed fills the gap as a
/// covered interval (not yet described) until the geologist types its lithology.
pub fn cut_at(section: &mut Section, height_m: f64) -> Result<Cut, CutError> {
    if !height_m.is_finite() {
        return Err(CutError::NotFinite);
    }
    if height_m <= SAME_BOUNDARY_M {
        return Err(CutError::BelowBase { height_m });
    }
    let mut base = 0.0;
    for i in 0..section.beds.len() {
        let top = base + section.beds[i].thickness_m;
        if (height_m - top).abs() < SAME_BOUNDARY_M || (height_m - base).abs() < SAME_BOUNDARY_M {
            return Err(CutError::AlreadyABoundary { height_m });
        }
        if height_m > base && height_m < top {
            let id = section.next_bed_id();
            let mut upper = section.beds[i].clone();
            upper.id = id;
            upper.base_contact = Contact::Sharp;
            upper.base_surface = None;
            upper.base_relief_m = None;
            upper.base_rank = None;
            upper.thickness_m = top - height_m;
            section.beds[i].thickness_m = height_m - base;
            let lower = section.beds[i].id;
            section.beds.insert(i + 1, upper);
            return Ok(Cut::Split { lower, upper: id });
        }
        base = top;
    }
    let id = section.next_bed_id();
    let bed = Bed::new(id, height_m - base, crate::model::Lithology::Covered, None);
    section.beds.push(bed);
    Ok(Cut::OnTop { bed: id })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clicks_from_the_base_up_build_the_beds() {
        let mut s = Section::new("traced");
        assert!(matches!(cut_at(&mut s, 1.2), Ok(Cut::OnTop { .. })));
        assert!(matches!(cut_at(&mut s, 2.0), Ok(Cut::OnTop { .. })));
        let t: Vec<f64> = s.beds.iter().map(|b| b.thickness_m).collect();
        assert!((t[0] - 1.2).abs() < 1e-12 && (t[1] - 0.8).abs() < 1e-12, "{t:?}");
        // A click inside the lower bed cuts it; the thicknesses still add up to the top.
        let Ok(Cut::Split { lower, upper }) = cut_at(&mut s, 0.5) else { panic!("a cut") };
        assert_eq!(lower, s.beds[0].id);
        assert_eq!(upper, s.beds[1].id);
        let t: Vec<f64> = s.beds.iter().map(|b| b.thickness_m).collect();
        assert!(
            (t[0] - 0.5).abs() < 1e-12 && (t[1] - 0.7).abs() < 1e-12 && (t[2] - 0.8).abs() < 1e-12,
            "{t:?}"
        );
        assert_eq!(bed_at(&s, 0.6), Some(upper));
        assert_eq!(bed_at(&s, 2.5), None);
    }

    #[test]
    fn clicks_on_a_boundary_or_below_the_base_are_refused() {
        let mut s = Section::new("traced");
        assert_eq!(cut_at(&mut s, -0.3), Err(CutError::BelowBase { height_m: -0.3 }));
        cut_at(&mut s, 1.0).expect("first bed");
        assert_eq!(cut_at(&mut s, 1.0004), Err(CutError::AlreadyABoundary { height_m: 1.0004 }));
        assert_eq!(cut_at(&mut s, f64::NAN), Err(CutError::NotFinite));
        assert_eq!(s.beds.len(), 1);
    }
}
