//! Drawing one height range of the interpreted column (a segment): height axis, lithology column,
//! structures, paleocurrents, paleosols, the interpretation tracks and measured-curve tracks,
//! plus the segment's track titles above and grain-size scale (and curve value axes) below. Used
//! by both the screen strip and the printed pages.
//!
//! [`ColumnCtx`] holds one section's heights and tracks; its drawing is split by part of the
//! segment: `tracks` (where each track sits), `beds` (outline, pattern, contact, symbols),
//! `interpretation` (storeys, bodies, proportion, regime, boundaries, surface names) and `frame`
//! (axis, titles, scale). Each draws one [`Part`] (heights, left edge, height transform) of the
//! column. `help` puts into words what a point of the column shows (hover help on screen).

mod beds;
mod frame;
mod header;
mod help;
mod interpretation;
mod record;
#[cfg(test)]
mod tests;
mod tracks;

pub use beds::{draw_contact, paleosol_bar_mm};
pub use header::{setting_lines, SETTING_LINE_MM, SETTING_PT};
pub use help::{column_help_at, column_tracks, Pointed, TrackKind};
pub use interpretation::{
    body_bracket, body_labels, boundary_style, candidate_name, review_words, stacking_code, stacking_words,
    storeys_words, surface_name, BracketEnd,
};
pub use record::{facies_colour, shown_facies, Glyph, ICHNO_MM_PER_GRADE, ICHNO_OLIVE, LABEL_PITCH_MM};
pub use tracks::{Track, Tracks, GRAIN_CLASS_STEP_MM, GRAIN_MIN_WIDTH_MM};

use crate::layout::curve_track::{self, CurvePlace, CurveTracks, ValueAxis, CURVE_COLOURS, MAX_CURVE_TRACKS};
use crate::layout::items::{Item, PtMm, RectMm, Rgba, Stroke};
use crate::layout::options::LayoutOptions;
use crate::layout::patterns::fill_bed;
use crate::layout::spans::InterpretationSpans;
use crate::layout::style::*;
use crate::layout::symbols::structure_symbol;
use crate::layout::text::{fit_size, text, text_up, width};
use crate::layout::transform::{GrainScale, HeightTransform};
use crate::model::{Bed, Contact, LengthUnit, PaleosolDevelopment, ReviewState, Section, WentworthClass};
use crate::rules::{BoundaryCandidate, Censor, ChannelBody, Interpretation, Regime, Stacking, Strength};
use serde::Serialize;

/// Phi at which beds with no grain size (non-clastic rocks logged without one, covered
/// intervals) are drawn: the fine/medium sand limit (φ 2), a fixed width of our own choosing that
/// keeps them clear of both the mud and the gravel end of the scale.
pub const NO_GRAIN_SIZE_PHI: f64 = 2.0;

/// Height of the track-title band above each segment, mm.
pub const TITLE_BAND_MM: f64 = 22.0;
/// Height of the grain-size scale band below each segment, mm.
pub const SCALE_BAND_MM: f64 = 13.0;

/// The screen rectangle of one bed (or of its part within a segment).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct BedBox {
    /// Index into `Section::beds`.
    pub bed_index: usize,
    pub rect: RectMm,
}

/// Everything needed to draw segments of one section.
pub struct ColumnCtx<'a> {
    pub section: &'a Section,
    pub interp: &'a Interpretation,
    pub opts: &'a LayoutOptions,
    pub tracks: Tracks,
    /// Base height of each bed, m.
    pub bases_m: Vec<f64>,
    /// Top height of each bed, m.
    pub tops_m: Vec<f64>,
    pub total_m: f64,
    /// Value axis of each attached curve over the section's height range (`None`: no values).
    pub curve_axes: Vec<Option<ValueAxis>>,
    /// Search indices, so a segment visits only the interpretation items near its heights.
    pub spans: InterpretationSpans,
    /// True for each bed that belongs to a paleosol profile (drawn as one mark per profile).
    pub in_profile: Vec<bool>,
}

/// Phi of a bed's right edge at its base and top.
fn bed_phis(bed: &Bed) -> (f64, f64) {
    if bed.is_covered() {
        return (NO_GRAIN_SIZE_PHI, NO_GRAIN_SIZE_PHI);
    }
    match (bed.grain_base, bed.grain_top) {
        (Some(b), Some(t)) => (b.phi(), t.phi()),
        (Some(g), None) | (None, Some(g)) => (g.phi(), g.phi()),
        (None, None) => (NO_GRAIN_SIZE_PHI, NO_GRAIN_SIZE_PHI),
    }
}

/// The part of a column being drawn: heights `lo`..`hi` (m) of a segment whose left edge is at
/// `x0` (mm), placed on the page by `t`.
#[derive(Clone, Copy)]
struct Part<'t> {
    lo: f64,
    hi: f64,
    x0: f64,
    t: &'t HeightTransform,
}

/// Base height of every bed (m), lowest first, each bed counted at its
/// [`Bed::usable_thickness_m`].
pub(crate) fn bed_bases_m(section: &Section) -> Vec<f64> {
    let mut h = 0.0;
    section
        .beds
        .iter()
        .map(|b| {
            let base = h;
            h += b.usable_thickness_m();
            base
        })
        .collect()
}

impl<'a> ColumnCtx<'a> {
    pub fn new(section: &'a Section, interp: &'a Interpretation, opts: &'a LayoutOptions) -> Self {
        let bases_m = bed_bases_m(section);
        let tops_m: Vec<f64> =
            section.beds.iter().zip(&bases_m).map(|(b, base)| base + b.usable_thickness_m()).collect();
        let h = tops_m.last().copied().unwrap_or(0.0);
        let curve_axes = section.curves.iter().map(|c| ValueAxis::for_curve(c, 0.0, h)).collect();
        let tracks =
            Tracks::for_section(section, opts).with_curves(section.curves.len().min(MAX_CURVE_TRACKS));
        let spans = InterpretationSpans::new(interp);
        let mut in_profile = vec![false; section.beds.len()];
        for p in &interp.paleosols {
            for slot in in_profile.iter_mut().take(p.last_bed + 1).skip(p.first_bed) {
                *slot = true;
            }
        }
        ColumnCtx {
            section,
            interp,
            opts,
            tracks,
            bases_m,
            tops_m,
            total_m: h,
            curve_axes,
            spans,
            in_profile,
        }
    }

    /// Drop curve tracks (the last ones first) until a segment is at most `max_width_mm` wide,
    /// then, if it is still wider, narrow the labelled record tracks (samples, photographs,
    /// fossils; to no less than [`tracks::MIN_LABEL_FACTOR`] of their width); returns how many
    /// curve tracks are left.
    pub fn fit_curves(&mut self, max_width_mm: f64) -> usize {
        while self.tracks.curves.count > 0 && self.tracks.width_mm > max_width_mm {
            self.tracks = self.tracks.with_curves(self.tracks.curves.count - 1);
        }
        let labels = self.tracks.label_tracks_mm();
        let excess = self.tracks.width_mm - max_width_mm;
        if excess > 0.0 && labels > 0.0 {
            let factor = (labels - excess) / labels;
            self.tracks = Tracks::with_record_sized(self.opts, self.tracks.record_shown(), factor);
        }
        self.tracks.curves.count
    }

    /// The attached curves that get a track, with their track (absolute x, width), value axis and
    /// colour, for a segment whose left edge is at `x0`.
    fn curve_tracks(&self, x0: f64) -> impl Iterator<Item = (usize, CurvePlace)> + '_ {
        self.section.curves.iter().enumerate().filter_map(move |(k, _)| {
            let (x, w) = self.tracks.curves.track(k)?;
            let place = CurvePlace {
                x_mm: x0 + x,
                w_mm: w,
                axis: self.curve_axes.get(k).copied().flatten(),
                colour: CURVE_COLOURS[k % CURVE_COLOURS.len()],
            };
            Some((k, place))
        })
    }

    fn top_m(&self, i: usize) -> f64 {
        self.tops_m[i]
    }

    /// Indices of beds overlapping [lo, hi] (by binary search on the sorted bases).
    fn beds_in(&self, lo: f64, hi: f64) -> std::ops::Range<usize> {
        let first = self.tops_m.partition_point(|&t| t < lo);
        let last = self.bases_m.partition_point(|&b| b < hi);
        first..last.max(first)
    }

    /// x of a bed's right edge at height h (linear in phi from base to top).
    fn right_x(&self, i: usize, h: f64, g: &GrainScale) -> f64 {
        let bed = &self.section.beds[i];
        let (pb, pt) = bed_phis(bed);
        let t = bed.usable_thickness_m();
        let f = if t > 0.0 { ((h - self.bases_m[i]) / t).clamp(0.0, 1.0) } else { 0.0 };
        g.x_mm(pb + (pt - pb) * f)
    }

    /// Draw the column between heights lo and hi (m) with its left edge at `x0` and the given
    /// height transform. Bed boxes are appended to `boxes`. Items come bed by bed, lowest first,
    /// then the interpretation tracks.
    pub fn draw_range(
        &self,
        lo: f64,
        hi: f64,
        x0: f64,
        t: &HeightTransform,
        out: &mut Vec<Item>,
        boxes: &mut Vec<BedBox>,
    ) {
        let part = Part { lo, hi, x0, t };
        let tr = &self.tracks;
        let g = tr.grain_scale(x0);
        let xl = g.left_mm;
        let y_lo = t.y_mm(lo);
        let y_hi = t.y_mm(hi);
        self.draw_axis(&part, out);
        for i in self.beds_in(lo, hi) {
            self.draw_bed(i, &part, &g, out, boxes);
        }
        self.draw_paleosol_profiles(&part, out);
        self.draw_paleocurrent_marks(&part, out);
        self.draw_record(&part, out);
        // Left edge of the column.
        out.push(Item::Polyline {
            points: vec![PtMm { x: xl, y: y_lo }, PtMm { x: xl, y: y_hi }],
            stroke: solid(LINE_MM, INK),
        });
        if self.opts.show_interpretation {
            self.draw_interpretation(&part, out);
        }
        self.draw_surface_names(&part, out);
        for (k, place) in self.curve_tracks(x0) {
            curve_track::draw_curve(&self.section.curves[k], &place, lo, hi, t, out);
        }
    }
}
