//! The two conversions every view of the column shares: section height ↔ y on paper, and grain
//! size ↔ x across the lithology column.

use crate::model::{mm_to_phi, WentworthClass};
use serde::Serialize;

/// Converts heights above the section base (metres, up) to y on the page or strip (mm, down).
///
/// `y_mm(h) = y_at_ref_mm − (h − ref_height_m) · 1000 / scale_denominator`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct HeightTransform {
    /// y (mm) at which `ref_height_m` is drawn.
    pub y_at_ref_mm: f64,
    /// The height (m) drawn at `y_at_ref_mm`.
    pub ref_height_m: f64,
    /// N of the scale 1:N.
    pub scale_denominator: f64,
}

impl HeightTransform {
    /// A transform drawing `ref_height_m` at `y_at_ref_mm` at 1:`scale_denominator`.
    pub fn new(y_at_ref_mm: f64, ref_height_m: f64, scale_denominator: f64) -> Self {
        HeightTransform { y_at_ref_mm, ref_height_m, scale_denominator }
    }

    /// Millimetres on paper per metre of section.
    pub fn mm_per_m(&self) -> f64 {
        1000.0 / self.scale_denominator
    }

    /// y (mm, down) of a height (m, up).
    pub fn y_mm(&self, height_m: f64) -> f64 {
        self.y_at_ref_mm - (height_m - self.ref_height_m) * self.mm_per_m()
    }

    /// Height (m, up) at a y (mm, down); the inverse of [`HeightTransform::y_mm`].
    pub fn height_m(&self, y_mm: f64) -> f64 {
        self.ref_height_m + (self.y_at_ref_mm - y_mm) / self.mm_per_m()
    }

    /// Length on paper (mm) of a thickness (m).
    pub fn length_mm(&self, thickness_m: f64) -> f64 {
        thickness_m * self.mm_per_m()
    }
}

/// Converts grain size to the x of a bed's right edge in the lithology column, and back.
///
/// Each Wentworth class gets the same width step, clay narrowest; within a class x is linear in
/// phi between the class limits, so a class midpoint sits in the middle of its step. The
/// open-ended classes span one phi unit beyond their limit (clay φ 8–10, boulder φ −8 to −10),
/// matching the midpoints in [`WentworthClass::midpoint_phi`].
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct GrainScale {
    /// x (mm) of the column's left edge.
    pub left_mm: f64,
    /// Width (mm) drawn for the finest grain size (the fine end of clay).
    pub min_width_mm: f64,
    /// Width step (mm) per Wentworth class.
    pub class_step_mm: f64,
}

/// Phi limits (fine, coarse) of a class as used by the grain scale.
fn phi_span(class: WentworthClass) -> (f64, f64) {
    match class {
        WentworthClass::Clay => (10.0, 8.0),
        WentworthClass::Boulder => (-8.0, -10.0),
        c => {
            let (lo, hi) = c.limits_mm();
            (mm_to_phi(lo), mm_to_phi(hi))
        }
    }
}

impl GrainScale {
    /// Total width of the scale (mm): from the left edge to the coarse end of boulder.
    pub fn full_width_mm(&self) -> f64 {
        self.min_width_mm + self.class_step_mm * WentworthClass::ALL.len() as f64
    }

    /// Position on the scale in class steps: 0 at the fine end of clay, 11 at the coarse end of
    /// boulder; clamped to that range.
    pub fn class_position(phi: f64) -> f64 {
        if phi.is_nan() {
            return 0.0;
        }
        for (k, c) in WentworthClass::ALL.iter().enumerate() {
            let (fine, coarse) = phi_span(*c);
            if phi >= coarse {
                let frac = ((fine - phi) / (fine - coarse)).clamp(0.0, 1.0);
                return k as f64 + frac;
            }
        }
        WentworthClass::ALL.len() as f64
    }

    /// Phi at a position in class steps (inverse of [`GrainScale::class_position`]).
    pub fn phi_at_position(position: f64) -> f64 {
        let n = WentworthClass::ALL.len();
        let p = if position.is_nan() { 0.0 } else { position.clamp(0.0, n as f64) };
        let k = (p.floor() as usize).min(n - 1);
        let (fine, coarse) = phi_span(WentworthClass::ALL[k]);
        fine - (p - k as f64) * (fine - coarse)
    }

    /// x (mm) of a bed's right edge for a grain size in phi.
    pub fn x_mm(&self, phi: f64) -> f64 {
        self.left_mm + self.min_width_mm + self.class_step_mm * Self::class_position(phi)
    }

    /// Phi at an x (mm), e.g. where the user drags a bed's edge; clamped to the scale.
    pub fn phi_at(&self, x_mm: f64) -> f64 {
        Self::phi_at_position((x_mm - self.left_mm - self.min_width_mm) / self.class_step_mm)
    }

    /// The Wentworth class at an x (mm).
    pub fn class_at(&self, x_mm: f64) -> WentworthClass {
        let pos = (x_mm - self.left_mm - self.min_width_mm) / self.class_step_mm;
        let k = if pos.is_nan() { 0.0 } else { pos.floor().clamp(0.0, 10.0) };
        WentworthClass::from_rank(k as usize)
    }

    /// x (mm) of the middle of a class's step (where its label sits on the scale).
    pub fn class_centre_x_mm(&self, class: WentworthClass) -> f64 {
        self.left_mm + self.min_width_mm + self.class_step_mm * (class.rank() as f64 + 0.5)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn heights_up_y_down() {
        // At 1:50, 2 m of section is 40 mm on paper (true scale: 2000 mm / 50; common practice).
        let t = HeightTransform::new(250.0, 10.0, 50.0);
        assert_eq!(t.y_mm(10.0), 250.0);
        assert!((t.y_mm(12.0) - 210.0).abs() < 1e-9, "higher is further up the page");
        assert!((t.y_mm(8.0) - 290.0).abs() < 1e-9);
        for h in [-3.0, 0.0, 1.234, 10.0, 77.7] {
            assert!((t.height_m(t.y_mm(h)) - h).abs() < 1e-9);
        }
        // At 1:100, 1 m is 10 mm (1000 mm / 100; computed).
        assert!((HeightTransform::new(0.0, 0.0, 100.0).length_mm(1.0) - 10.0).abs() < 1e-12);
    }

    #[test]
    fn grain_width_grows_with_class() {
        let g = GrainScale { left_mm: 20.0, min_width_mm: 4.0, class_step_mm: 3.0 };
        let mut last = f64::NEG_INFINITY;
        for c in WentworthClass::ALL {
            let x = g.x_mm(c.midpoint_phi());
            assert!(x > last, "{c} not wider than the finer class");
            // A class midpoint sits in the middle of its step.
            assert!((x - g.class_centre_x_mm(c)).abs() < 1e-9, "{c}");
            assert_eq!(g.class_at(x), c);
            last = x;
        }
        // Class limits in phi (Wentworth 1922 / Krumbein 1934): 4 φ is the silt/very fine sand limit.
        assert!((g.x_mm(4.0) - (20.0 + 4.0 + 2.0 * 3.0)).abs() < 1e-9);
        // Pebble spans φ −2 to −6: φ −4 is half-way through its step.
        assert!((g.x_mm(-4.0) - (20.0 + 4.0 + 8.5 * 3.0)).abs() < 1e-9);
        // Round trip x → phi → x inside the scale.
        for phi in [9.5, 7.0, 3.3, 0.2, -1.5, -5.0, -9.0] {
            assert!((g.phi_at(g.x_mm(phi)) - phi).abs() < 1e-9, "{phi}");
        }
        // Clamped outside the scale.
        assert_eq!(g.x_mm(14.0), g.x_mm(10.0));
        assert_eq!(g.x_mm(-20.0), 20.0 + g.full_width_mm());
        assert_eq!(g.phi_at(-100.0), 10.0);
    }
}
