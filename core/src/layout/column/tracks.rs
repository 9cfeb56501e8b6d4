//! Where each track sits across a segment, and the grain-size scale of the lithology track.

use super::*;

/// Horizontal extent of one track, relative to the segment's left edge, mm.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Track {
    pub x_mm: f64,
    pub w_mm: f64,
}

/// Where each track sits across a segment (mm from the segment's left edge).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Tracks {
    pub axis: Track,
    pub lithology: Track,
    pub structures: Track,
    pub paleocurrents: Track,
    pub paleosols: Track,
    /// Interpretation tracks; `None` when interpretation is hidden.
    pub storeys: Option<Track>,
    pub bodies: Option<Track>,
    pub proportion: Option<Track>,
    pub regime: Option<Track>,
    pub boundary_labels: Option<Track>,
    /// Measured-curve tracks, right of all the others (none unless curves are attached).
    pub curves: CurveTracks,
    /// Total width of a segment, mm.
    pub width_mm: f64,
}

/// Grain scale geometry relative to the lithology track's left edge.
pub const GRAIN_MIN_WIDTH_MM: f64 = 4.0;
pub const GRAIN_CLASS_STEP_MM: f64 = 3.0;

impl Tracks {
    /// The track layout for the options (interpretation tracks only when shown).
    pub fn new(opts: &LayoutOptions) -> Self {
        let rock = [
            (12.0, 1.0),
            (GRAIN_MIN_WIDTH_MM + GRAIN_CLASS_STEP_MM * 11.0, 2.0),
            (14.0, 0.5),
            (9.0, 0.5),
            (6.0, 1.5),
        ];
        let interpretation = [(3.5, 0.0), (9.0, 1.5), (16.0, 1.5), (6.5, 0.5), (12.0, 0.0)];
        Tracks::stacked(rock, opts.show_interpretation.then_some(interpretation))
    }

    /// Tracks laid left to right from (width, gap after it) in mm: the rock tracks (axis,
    /// lithology, structures, paleocurrents, paleosols), then the interpretation tracks (storeys,
    /// bodies, proportion, regime, boundary labels) when given; no curve tracks yet.
    pub fn stacked(rock: [(f64, f64); 5], interpretation: Option<[(f64, f64); 5]>) -> Self {
        let mut x = 0.0;
        let mut take = |(w, gap): (f64, f64)| {
            let t = Track { x_mm: x, w_mm: w };
            x += w + gap;
            t
        };
        let [axis, lithology, structures, paleocurrents, paleosols] = rock.map(&mut take);
        let [storeys, bodies, proportion, regime, boundary_labels] = match interpretation {
            Some(widths) => widths.map(|w| Some(take(w))),
            None => [None; 5],
        };
        Tracks {
            axis,
            lithology,
            structures,
            paleocurrents,
            paleosols,
            storeys,
            bodies,
            proportion,
            regime,
            boundary_labels,
            curves: CurveTracks::none(x),
            width_mm: x,
        }
    }

    /// The same tracks with `count` measured-curve tracks added on the right.
    pub fn with_curves(mut self, count: usize) -> Self {
        self.width_mm -= self.curves.width_mm();
        self.curves = CurveTracks { x_mm: self.curves.x_mm, count };
        self.width_mm += self.curves.width_mm();
        self
    }

    /// The grain scale of a segment whose left edge is at `x0_mm`.
    pub fn grain_scale(&self, x0_mm: f64) -> GrainScale {
        GrainScale {
            left_mm: x0_mm + self.lithology.x_mm,
            min_width_mm: GRAIN_MIN_WIDTH_MM,
            class_step_mm: GRAIN_CLASS_STEP_MM,
        }
    }

    /// Right edge (relative) of the last track a boundary line crosses.
    pub(super) fn boundary_line_end(&self) -> f64 {
        self.regime.map(|t| t.x_mm + t.w_mm).unwrap_or(self.paleosols.x_mm + self.paleosols.w_mm)
    }
}
