//! Our own drawing style: colours, line widths and text sizes shared by the column and legend.

use super::items::{Rgba, Stroke};
use crate::model::Lithology;

/// Outline of beds and the column.
pub const LINE_MM: f64 = 0.25;
/// Thin lines: ticks, pattern marks, brackets.
pub const THIN_MM: f64 = 0.15;
/// Hair lines: grid and pattern marks.
pub const HAIR_MM: f64 = 0.1;

pub const INK: Rgba = Rgba(25, 25, 25, 255);
pub const GREY: Rgba = Rgba(120, 120, 120, 255);
pub const LIGHT_GREY: Rgba = Rgba(200, 200, 200, 255);
/// Candidate and accepted sequence boundaries.
pub const BOUNDARY_RED: Rgba = Rgba(196, 32, 40, 255);
/// Rejected candidates (only drawn on request).
pub const REJECTED_GREY: Rgba = Rgba(150, 150, 150, 255);
/// Paleosol development bars.
pub const PALEOSOL_BROWN: Rgba = Rgba(150, 92, 52, 255);
/// Storey and channel-body brackets.
pub const BODY_BLUE: Rgba = Rgba(30, 70, 140, 255);
/// Proportion curve.
pub const CURVE_GREEN: Rgba = Rgba(20, 110, 70, 255);
/// Accommodation regime bands.
pub const REGIME_LOW: Rgba = Rgba(244, 205, 150, 255);
pub const REGIME_HIGH: Rgba = Rgba(170, 208, 228, 255);
pub const REGIME_UNDETERMINED: Rgba = Rgba(226, 226, 226, 255);

/// Body text size (pt).
pub const TEXT_PT: f64 = 6.5;
/// Small labels (pt).
pub const SMALL_PT: f64 = 5.5;

/// A solid stroke.
pub fn solid(width_mm: f64, color: Rgba) -> Stroke {
    Stroke { width_mm, color, dash_mm: Vec::new() }
}

/// A dashed stroke (on, off, … in mm).
pub fn dashed(width_mm: f64, color: Rgba, dash_mm: &[f64]) -> Stroke {
    Stroke { width_mm, color, dash_mm: dash_mm.to_vec() }
}

/// Background tint of a lithology fill (our own palette; coal is solid black as is usual).
pub fn lithology_tint(lith: Lithology) -> Rgba {
    match lith {
        Lithology::Claystone => Rgba(188, 192, 176, 255),
        Lithology::Mudstone => Rgba(198, 202, 184, 255),
        Lithology::Shale => Rgba(184, 190, 190, 255),
        Lithology::Siltstone => Rgba(224, 222, 186, 255),
        Lithology::Sandstone => Rgba(252, 238, 168, 255),
        Lithology::Conglomerate => Rgba(246, 206, 140, 255),
        Lithology::Breccia => Rgba(236, 190, 150, 255),
        Lithology::Limestone => Rgba(196, 224, 238, 255),
        Lithology::Dolostone => Rgba(206, 210, 238, 255),
        Lithology::Marl => Rgba(212, 228, 204, 255),
        Lithology::Coal => Rgba(22, 22, 22, 255),
        Lithology::Evaporite => Rgba(242, 214, 228, 255),
        Lithology::Tuff => Rgba(232, 212, 222, 255),
        Lithology::Covered => Rgba(255, 255, 255, 255),
    }
}
