//! Drawing one height range of the interpreted column (a segment): height axis, lithology column,
//! structures, paleocurrents, paleosols, the interpretation tracks and measured-curve tracks,
//! plus the segment's track titles above and grain-size scale (and curve value axes) below. Used by both the screen strip and the printed pages.

use super::curve_track::{self, CurvePlace, CurveTracks, ValueAxis, CURVE_COLOURS, MAX_CURVE_TRACKS};
use super::items::{Item, PtMm, RectMm, Rgba, Stroke};
use super::options::LayoutOptions;
use super::patterns::fill_bed;
use super::spans::InterpretationSpans;
use super::style::*;
use super::symbols::{paleocurrent_arrow, paleocurrent_rose, structure_symbol};
use super::text::{fit_size, text, text_up};
use super::transform::{GrainScale, HeightTransform};
use crate::model::{Bed, Contact, LengthUnit, PaleosolDevelopment, ReviewState, Section, WentworthClass};
use crate::rules::{Censor, ChannelBody, Interpretation, Regime, Stacking};
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
        let mut x = 0.0;
        let mut take = |w: f64, gap: f64| {
            let t = Track { x_mm: x, w_mm: w };
            x += w + gap;
            t
        };
        let axis = take(12.0, 1.0);
        let lithology = take(GRAIN_MIN_WIDTH_MM + GRAIN_CLASS_STEP_MM * 11.0, 2.0);
        let structures = take(14.0, 0.5);
        let paleocurrents = take(9.0, 0.5);
        let paleosols = take(6.0, 1.5);
        let (storeys, bodies, proportion, regime, boundary_labels) = if opts.show_interpretation {
            (
                Some(take(3.5, 0.0)),
                Some(take(9.0, 1.5)),
                Some(take(16.0, 1.5)),
                Some(take(6.5, 0.5)),
                Some(take(12.0, 0.0)),
            )
        } else {
            (None, None, None, None, None)
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
    fn boundary_line_end(&self) -> f64 {
        self.regime.map(|t| t.x_mm + t.w_mm).unwrap_or(self.paleosols.x_mm + self.paleosols.w_mm)
    }
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

impl<'a> ColumnCtx<'a> {
    pub fn new(section: &'a Section, interp: &'a Interpretation, opts: &'a LayoutOptions) -> Self {
        let mut h = 0.0;
        let bases_m = section
            .beds
            .iter()
            .map(|b| {
                let base = h;
                h += b.usable_thickness_m();
                base
            })
            .collect::<Vec<f64>>();
        let tops_m =
            section.beds.iter().zip(&bases_m).map(|(b, base)| base + b.usable_thickness_m()).collect();
        let curve_axes = section.curves.iter().map(|c| ValueAxis::for_curve(c, 0.0, h)).collect();
        let tracks = Tracks::new(opts).with_curves(section.curves.len().min(MAX_CURVE_TRACKS));
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

    /// Drop curve tracks (the last ones first) until a segment is at most `max_width_mm` wide;
    /// returns how many curve tracks are left.
    pub fn fit_curves(&mut self, max_width_mm: f64) -> usize {
        while self.tracks.curves.count > 0 && self.tracks.width_mm > max_width_mm {
            self.tracks = self.tracks.with_curves(self.tracks.curves.count - 1);
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
        // Left edge of the column.
        out.push(Item::Polyline {
            points: vec![PtMm { x: xl, y: y_lo }, PtMm { x: xl, y: y_hi }],
            stroke: solid(LINE_MM, INK),
        });
        if self.opts.show_interpretation {
            self.draw_interpretation(&part, out);
        }
        for (k, place) in self.curve_tracks(x0) {
            curve_track::draw_curve(&self.section.curves[k], &place, lo, hi, t, out);
        }
    }

    fn draw_axis(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let unit = match self.section.display_unit {
            LengthUnit::Foot => LengthUnit::Foot,
            _ => LengthUnit::Metre,
        };
        let per_unit_mm = t.length_mm(unit.metres());
        let step = axis_step(per_unit_mm);
        let minor = if step * per_unit_mm / 5.0 >= 1.4 { step / 5.0 } else { step / 2.0 };
        let x_axis = x0 + self.tracks.lithology.x_mm;
        let (lo_u, hi_u) = (unit.from_metres(lo), unit.from_metres(hi));
        let decimals = if step < 1.0 - 1e-9 { 1 } else { 0 };
        let k0 = (lo_u / minor - 1e-6).ceil() as i64;
        let k1 = (hi_u / minor + 1e-6).floor() as i64;
        let per_major = (step / minor).round() as i64;
        for k in k0..=k1 {
            let v = k as f64 * minor;
            let y = t.y_mm(unit.to_metres(v));
            let major = per_major > 0 && k % per_major == 0;
            let len = if major { 2.0 } else { 1.0 };
            out.push(Item::Polyline {
                points: vec![PtMm { x: x_axis - len, y }, PtMm { x: x_axis, y }],
                stroke: solid(THIN_MM, INK),
            });
            if major {
                let label = format!("{v:.decimals$}");
                let label = label.replace('-', "\u{2212}");
                let w = super::text::width(&label, TEXT_PT);
                text(out, x_axis - 2.6 - w, y + 0.8, &label, TEXT_PT, INK);
            }
        }
    }

    fn draw_bed(
        &self,
        i: usize,
        part: &Part<'_>,
        g: &GrainScale,
        out: &mut Vec<Item>,
        boxes: &mut Vec<BedBox>,
    ) {
        let Part { lo, hi, x0, t } = *part;
        let bed = &self.section.beds[i];
        let (base, top) = (self.bases_m[i], self.top_m(i));
        let (b, tp) = (base.max(lo), top.min(hi));
        let xl = g.left_mm;
        if tp <= b {
            // Zero-thickness or out of range: nothing to draw, but keep its place for picking.
            if top >= lo && base <= hi && bed.usable_thickness_m() == 0.0 {
                boxes.push(BedBox { bed_index: i, rect: RectMm { x: xl, y: t.y_mm(base), w: 0.0, h: 0.0 } });
            }
            return;
        }
        let (yb, yt) = (t.y_mm(b), t.y_mm(tp));
        let (xb, xt) = (self.right_x(i, b, g), self.right_x(i, tp, g));
        let outline =
            [PtMm { x: xl, y: yb }, PtMm { x: xb, y: yb }, PtMm { x: xt, y: yt }, PtMm { x: xl, y: yt }];
        // Anchor patterns to the section base so they run on across beds and segments.
        fill_bed(bed.lithology, &outline, PtMm { x: xl, y: t.y_mm(0.0) }, out);
        out.push(Item::Polyline {
            points: vec![PtMm { x: xb, y: yb }, PtMm { x: xt, y: yt }],
            stroke: solid(LINE_MM, INK),
        });
        // Basal contact, drawn across the wider of this bed and the one below.
        if base >= lo - 1e-9 {
            let below = if i > 0 { self.right_x(i - 1, base, g) } else { xb };
            let xr = xb.max(below);
            let contact = if i == 0 { Contact::Sharp } else { bed.base_contact };
            draw_contact(contact, xl, xr, yb, out);
        } else {
            // The bed continues from the previous segment.
            out.push(Item::Polyline {
                points: vec![PtMm { x: xl, y: yb }, PtMm { x: xb, y: yb }],
                stroke: dashed(HAIR_MM, GREY, &[0.6, 0.6]),
            });
        }
        if top <= hi + 1e-9 {
            if i + 1 == self.section.beds.len() {
                out.push(Item::Polyline {
                    points: vec![PtMm { x: xl, y: yt }, PtMm { x: xt, y: yt }],
                    stroke: solid(LINE_MM, INK),
                });
            }
        } else {
            out.push(Item::Polyline {
                points: vec![PtMm { x: xl, y: yt }, PtMm { x: xt, y: yt }],
                stroke: dashed(HAIR_MM, GREY, &[0.6, 0.6]),
            });
        }
        let h_mm = yb - yt;
        if bed.is_covered() && h_mm >= 2.2 {
            let label = "no exposure";
            let size = fit_size(label, xb.min(xt) - xl - 1.0, SMALL_PT, 3.5);
            if let Some(size) = size {
                let w = super::text::width(label, size);
                let x = xl + ((xb.min(xt) - xl) - w) / 2.0;
                let y = (yb + yt) / 2.0 + size * 0.35 * 0.353;
                out.push(Item::Rect {
                    rect: RectMm {
                        x: x - 0.4,
                        y: y - size * 0.353 * 0.85,
                        w: w + 0.8,
                        h: size * 0.353 * 1.2,
                    },
                    fill: Some(Rgba::WHITE),
                    stroke: None,
                });
                text(out, x, y, label, size, GREY);
            }
        }
        boxes.push(BedBox { bed_index: i, rect: RectMm { x: xl, y: yt, w: xb.max(xt) - xl, h: h_mm } });
        let y_mid = (yb + yt) / 2.0;
        self.draw_structures(bed, x0, y_mid, h_mm, out);
        self.draw_paleocurrents(bed, x0, y_mid, h_mm, out);
        // Beds of a profile are drawn as one mark by `draw_paleosol_profiles`.
        if bed.paleosol != PaleosolDevelopment::None && !self.in_profile.get(i).copied().unwrap_or(false) {
            let tr = self.tracks.paleosols;
            let w = paleosol_bar_mm(bed.paleosol);
            out.push(Item::Rect {
                rect: RectMm { x: x0 + tr.x_mm + 0.5, y: yt, w, h: h_mm },
                fill: Some(PALEOSOL_BROWN),
                stroke: None,
            });
        }
    }

    /// One mark per paleosol profile in the paleosol track: a bar as wide as the profile's
    /// maturity over its whole height (however many beds its horizons were logged as), outlined,
    /// with a tick at the profile's top.
    fn draw_paleosol_profiles(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let tr = self.tracks.paleosols;
        for p in &self.interp.paleosols[self.spans.paleosols.range(lo, hi)] {
            let (b, tp) = (p.base_m.max(lo), p.top_m.min(hi));
            if tp.is_nan() || b.is_nan() || tp <= b {
                continue;
            }
            let (yb, yt) = (t.y_mm(b), t.y_mm(tp));
            let w = paleosol_bar_mm(p.maturity).max(0.6);
            let x = x0 + tr.x_mm + 0.5;
            out.push(Item::Rect {
                rect: RectMm { x, y: yt, w, h: yb - yt },
                fill: Some(PALEOSOL_BROWN),
                stroke: Some(solid(HAIR_MM, INK)),
            });
            if p.top_m <= hi + 1e-9 {
                out.push(Item::Polyline {
                    points: vec![PtMm { x: x - 0.4, y: yt }, PtMm { x: x + tr.w_mm - 0.6, y: yt }],
                    stroke: solid(THIN_MM, INK),
                });
            }
        }
    }

    fn draw_structures(&self, bed: &Bed, x0: f64, y_mid: f64, h_mm: f64, out: &mut Vec<Item>) {
        if bed.structures.is_empty() {
            return;
        }
        let tr = self.tracks.structures;
        let size = (h_mm * 0.9).clamp(2.0, 3.6);
        let pitch = size + 1.0;
        let fit = ((tr.w_mm + 1.0) / pitch).floor().max(1.0) as usize;
        let n = bed.structures.len();
        let shown = if n > fit { fit - 1 } else { n };
        for (k, s) in bed.structures.iter().take(shown).enumerate() {
            let c = PtMm { x: x0 + tr.x_mm + size / 2.0 + k as f64 * pitch, y: y_mid };
            structure_symbol(*s, c, size, out);
        }
        if shown < n {
            let label = format!("+{}", n - shown);
            text(out, x0 + tr.x_mm + shown as f64 * pitch, y_mid + 0.8, &label, SMALL_PT, INK);
        }
    }

    fn draw_paleocurrents(&self, bed: &Bed, x0: f64, y_mid: f64, h_mm: f64, out: &mut Vec<Item>) {
        let readings: Vec<f64> = bed.paleocurrents_deg.iter().copied().filter(|a| a.is_finite()).collect();
        if readings.is_empty() {
            return;
        }
        let tr = self.tracks.paleocurrents;
        let c = PtMm { x: x0 + tr.x_mm + tr.w_mm / 2.0, y: y_mid };
        if readings.len() >= 4 {
            paleocurrent_rose(c, &readings, (tr.w_mm / 2.0 - 0.5).min(3.8), out);
        } else {
            let len = (h_mm.max(3.0)).min(tr.w_mm - 1.5).min(5.0);
            for a in readings {
                paleocurrent_arrow(c, a, len, INK, out);
            }
        }
    }

    fn draw_interpretation(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let tr = self.tracks;
        let clip = |b: f64, tp: f64| -> Option<(f64, f64)> {
            let (b2, t2) = (b.max(lo), tp.min(hi));
            (t2 > b2).then_some((b2, t2))
        };
        if let Some(st) = tr.storeys {
            let x = x0 + st.x_mm + st.w_mm - 1.0;
            for s in &self.interp.storeys[self.spans.storeys.range(lo, hi)] {
                if let Some((b, tp)) = clip(s.base_m, s.top_m) {
                    bracket(x, t.y_mm(b), t.y_mm(tp), (s.base_m >= lo, s.top_m <= hi), 1.2, THIN_MM, out);
                }
            }
        }
        if let Some(bt) = tr.bodies {
            let x = x0 + bt.x_mm + 1.6;
            for body in &self.interp.channel_bodies[self.spans.channel_bodies.range(lo, hi)] {
                if let Some((b, tp)) = clip(body.base_m, body.top_m) {
                    let (yb, yt) = (t.y_mm(b), t.y_mm(tp));
                    let end = |inside: bool, censored: bool| match (inside, censored) {
                        (false, _) => BracketEnd::Cut,
                        (true, true) => BracketEnd::Open,
                        (true, false) => BracketEnd::Tick,
                    };
                    let ends = (
                        end(body.base_m >= lo, body.censored.contains(&Censor::Base)),
                        end(body.top_m <= hi, body.censored.contains(&Censor::Top)),
                    );
                    body_bracket(x, yb, yt, ends, 1.5, LINE_MM * 1.4, out);
                    for candidate in body_labels(body) {
                        if let Some(size) = fit_size(&candidate, yb - yt - 1.0, SMALL_PT, 4.0) {
                            let w = super::text::width(&candidate, size);
                            let asc = size * 0.353 * 0.76;
                            text_up(
                                out,
                                x + 1.2 + asc,
                                (yb + yt) / 2.0 + w / 2.0,
                                &candidate,
                                size,
                                BODY_BLUE,
                            );
                            break;
                        }
                    }
                }
            }
        }
        if let Some(pt) = tr.proportion {
            self.draw_proportion(pt, part, out);
        }
        if let Some(rt) = tr.regime {
            for r in &self.interp.accommodation[self.spans.accommodation.range(lo, hi)] {
                if let Some((b, tp)) = clip(r.base_m, r.top_m) {
                    let (yb, yt) = (t.y_mm(b), t.y_mm(tp));
                    let (fill, label) = match r.regime {
                        Regime::Low => (REGIME_LOW, "low"),
                        Regime::High => (REGIME_HIGH, "high"),
                        Regime::Undetermined => (REGIME_UNDETERMINED, "undetermined"),
                    };
                    out.push(Item::Rect {
                        rect: RectMm { x: x0 + rt.x_mm, y: yt, w: rt.w_mm, h: yb - yt },
                        fill: Some(fill),
                        stroke: Some(solid(HAIR_MM, GREY)),
                    });
                    if let Some(size) = fit_size(label, yb - yt - 1.0, SMALL_PT, 4.0) {
                        let w = super::text::width(label, size);
                        let asc = size * 0.353 * 0.76;
                        text_up(
                            out,
                            x0 + rt.x_mm + rt.w_mm / 2.0 + asc / 2.0,
                            (yb + yt) / 2.0 + w / 2.0,
                            label,
                            size,
                            INK,
                        );
                    }
                }
            }
        }
        self.draw_boundaries(part, out);
    }

    fn draw_proportion(&self, pt: Track, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let (x_a, x_b) = (x0 + pt.x_mm, x0 + pt.x_mm + pt.w_mm);
        let (y_lo, y_hi) = (t.y_mm(lo), t.y_mm(hi));
        for (x, stroke) in [
            (x_a, solid(HAIR_MM, GREY)),
            ((x_a + x_b) / 2.0, dashed(HAIR_MM, LIGHT_GREY, &[1.0, 1.0])),
            (x_b, solid(HAIR_MM, GREY)),
        ] {
            out.push(Item::Polyline { points: vec![PtMm { x, y: y_lo }, PtMm { x, y: y_hi }], stroke });
        }
        // Interval proportions as a stepped line behind the moving-window curve.
        for ip in &self.interp.interval_proportions[self.spans.interval_proportions.range(lo, hi)] {
            let (Some(p), b, tp) = (ip.proportion, ip.base_m.max(lo), ip.top_m.min(hi)) else { continue };
            if tp > b {
                let x = x_a + p.clamp(0.0, 1.0) * pt.w_mm;
                out.push(Item::Polyline {
                    points: vec![PtMm { x, y: t.y_mm(b) }, PtMm { x, y: t.y_mm(tp) }],
                    stroke: dashed(THIN_MM * 1.5, Rgba(120, 170, 140, 255), &[1.2, 0.6]),
                });
            }
        }
        // Moving-window curve, split where a window has no exposure, cut to [lo, hi].
        let mut run: Vec<PtMm> = Vec::new();
        let flush = |run: &mut Vec<PtMm>, out: &mut Vec<Item>| {
            if run.len() >= 2 {
                out.push(Item::Polyline {
                    points: std::mem::take(run),
                    stroke: solid(THIN_MM * 2.0, CURVE_GREEN),
                });
            }
            run.clear();
        };
        let pts = &self.interp.proportion_curve;
        for k in self.spans.curve_start(lo, hi)..pts.len() {
            let (h, p) = (pts[k].height_m, pts[k].proportion);
            let Some(p) = p.filter(|p| p.is_finite()) else {
                flush(&mut run, out);
                continue;
            };
            let x = x_a + p.clamp(0.0, 1.0) * pt.w_mm;
            if h >= lo && h <= hi {
                if run.is_empty() && k > 0 {
                    if let Some(q) = pts[k - 1].proportion.filter(|_| pts[k - 1].height_m < lo) {
                        let f = (lo - pts[k - 1].height_m) / (h - pts[k - 1].height_m);
                        let xq = x_a + (q + (p - q) * f).clamp(0.0, 1.0) * pt.w_mm;
                        run.push(PtMm { x: xq, y: t.y_mm(lo) });
                    }
                }
                run.push(PtMm { x, y: t.y_mm(h) });
            } else if h > hi {
                if let Some(last) = k.checked_sub(1).map(|j| &pts[j]) {
                    if let (Some(q), true) = (last.proportion, last.height_m <= hi && last.height_m >= lo) {
                        let f = (hi - last.height_m) / (h - last.height_m);
                        let xq = x_a + (q + (p - q) * f).clamp(0.0, 1.0) * pt.w_mm;
                        run.push(PtMm { x: xq, y: t.y_mm(hi) });
                    }
                }
                break;
            }
        }
        flush(&mut run, out);
    }

    fn draw_boundaries(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let tr = self.tracks;
        let x_start = x0 + tr.lithology.x_mm - 1.5;
        let x_end = x0 + tr.boundary_line_end();
        // Candidates in [lo, hi], lowest first (at one height in list order).
        let all = &self.interp.sequence_boundary_candidates;
        let cands = self
            .spans
            .candidates_in(lo, hi)
            .map(|k| &all[k])
            .filter(|c| self.opts.show_rejected || c.review != ReviewState::Rejected);
        for c in cands {
            let y = t.y_mm(c.height_m);
            let (stroke, label, color) = boundary_style(c.review, c.score);
            out.push(Item::Polyline { points: vec![PtMm { x: x_start, y }, PtMm { x: x_end, y }], stroke });
            if let Some(lt) = tr.boundary_labels {
                text(out, x0 + lt.x_mm + 0.8, y + 0.9, &label, SMALL_PT, color);
            }
        }
    }

    /// Track titles above a segment whose band starts at `y_top` and ends at `y_top + TITLE_BAND_MM`.
    pub fn draw_titles(&self, x0: f64, y_top: f64, out: &mut Vec<Item>) {
        let tr = self.tracks;
        let y_bottom = y_top + TITLE_BAND_MM - 1.0;
        let unit = match self.section.display_unit {
            LengthUnit::Foot => "ft",
            _ => "m",
        };
        let axis_label = format!("height ({unit})");
        let mut rotated: Vec<(Track, String)> = vec![(tr.axis, axis_label)];
        rotated.push((tr.structures, "structures".into()));
        rotated.push((tr.paleocurrents, "paleocurrent".into()));
        rotated.push((tr.paleosols, "paleosol".into()));
        if let (Some(s), Some(b), Some(r)) = (tr.storeys, tr.bodies, tr.regime) {
            rotated.push((s, "storeys".into()));
            rotated.push((b, "channel bodies".into()));
            rotated.push((r, "accommodation".into()));
        }
        for (track, label) in rotated {
            let Some(size) = fit_size(&label, TITLE_BAND_MM - 2.0, SMALL_PT, 4.0) else { continue };
            let asc = size * 0.353 * 0.76;
            let cx = x0 + track.x_mm + track.w_mm / 2.0;
            text_up(out, cx + asc / 2.0, y_bottom, &label, size, INK);
        }
        let lith = tr.lithology;
        for (line, label) in [(0.0, "lithology"), (1.0, "grain size \u{2192}")] {
            let w = super::text::width(label, TEXT_PT);
            text(
                out,
                x0 + lith.x_mm + (lith.w_mm - w) / 2.0,
                y_bottom - 3.5 + line * 3.0,
                label,
                TEXT_PT,
                INK,
            );
        }
        if let Some(p) = tr.proportion {
            for (line, label) in [(0.0, "channel-body"), (1.0, "proportion")] {
                let w = super::text::width(label, SMALL_PT);
                text(
                    out,
                    x0 + p.x_mm + (p.w_mm - w) / 2.0,
                    y_bottom - 3.2 + line * 2.6,
                    label,
                    SMALL_PT,
                    INK,
                );
            }
        }
        if let Some(l) = tr.boundary_labels {
            for (line, label) in [(0.0, "sequence"), (1.0, "boundary"), (2.0, "candidates")] {
                let size = fit_size(label, l.w_mm, SMALL_PT, 4.0).unwrap_or(4.0);
                text(out, x0 + l.x_mm + 0.8, y_bottom - 5.8 + line * 2.6, label, size, INK);
            }
        }
        for (k, p) in self.curve_tracks(x0) {
            curve_track::draw_curve_title(&self.section.curves[k], p.colour, p.x_mm, p.w_mm, y_bottom, out);
        }
        out.push(Item::Polyline {
            points: vec![
                PtMm { x: x0, y: y_top + TITLE_BAND_MM },
                PtMm { x: x0 + tr.width_mm, y: y_top + TITLE_BAND_MM },
            ],
            stroke: solid(HAIR_MM, GREY),
        });
    }

    /// Grain-size scale (and proportion axis) under a segment, its top line at `y`.
    pub fn draw_scale(&self, x0: f64, y: f64, out: &mut Vec<Item>) {
        let g = self.tracks.grain_scale(x0);
        let x_end = g.left_mm + g.full_width_mm();
        out.push(Item::Polyline {
            points: vec![PtMm { x: x0, y }, PtMm { x: x0 + self.tracks.width_mm, y }],
            stroke: solid(HAIR_MM, GREY),
        });
        out.push(Item::Polyline {
            points: vec![PtMm { x: g.left_mm, y: y + 1.0 }, PtMm { x: x_end, y: y + 1.0 }],
            stroke: solid(THIN_MM, INK),
        });
        for k in 0..=WentworthClass::ALL.len() {
            let x = g.left_mm + g.min_width_mm + g.class_step_mm * k as f64;
            let len = if k == 2 || k == 7 { 2.2 } else { 1.0 };
            out.push(Item::Polyline {
                points: vec![PtMm { x, y: y + 1.0 }, PtMm { x, y: y + 1.0 + len }],
                stroke: solid(THIN_MM, INK),
            });
        }
        for c in WentworthClass::ALL {
            let label = c.short_label();
            let size = fit_size(label, g.class_step_mm - 0.2, SMALL_PT, 3.5).unwrap_or(3.5);
            let w = super::text::width(label, size);
            text(out, g.class_centre_x_mm(c) - w / 2.0, y + 4.6, label, size, INK);
        }
        // Groups: mud (clay, silt), sand (very fine … very coarse), gravel (granule … boulder).
        for (from, to, label) in [(0usize, 2usize, "mud"), (2, 7, "sand"), (7, 11, "gravel")] {
            let xa = g.left_mm + g.min_width_mm + g.class_step_mm * from as f64;
            let xb = g.left_mm + g.min_width_mm + g.class_step_mm * to as f64;
            let w = super::text::width(label, SMALL_PT);
            text(out, (xa + xb - w) / 2.0, y + 7.8, label, SMALL_PT, GREY);
        }
        let phi_note = "Wentworth classes; \u{3c6} = \u{2212}log\u{2082}(d/mm)";
        if let Some(size) = fit_size(phi_note, g.full_width_mm() + 4.0, 4.5, 3.5) {
            text(out, g.left_mm, y + 10.8, phi_note, size, GREY);
        }
        if let Some(p) = self.tracks.proportion {
            for (f, label) in [(0.0, "0"), (0.5, "0.5"), (1.0, "1")] {
                let w = super::text::width(label, SMALL_PT);
                text(out, x0 + p.x_mm + f * p.w_mm - w / 2.0, y + 3.6, label, SMALL_PT, INK);
            }
        }
        for (_, p) in self.curve_tracks(x0) {
            curve_track::draw_value_axis(p.axis, p.colour, p.x_mm, p.w_mm, y, out);
        }
    }
}

/// A label and stroke for a boundary in a review state.
pub fn boundary_style(review: ReviewState, score: f64) -> (Stroke, String, Rgba) {
    let score = if score.is_finite() { score } else { 0.0 };
    match review {
        ReviewState::Candidate => {
            (dashed(0.35, BOUNDARY_RED, &[2.0, 1.0]), format!("SB? {score:.2}"), BOUNDARY_RED)
        }
        ReviewState::Accepted => (solid(0.55, BOUNDARY_RED), format!("SB {score:.2}"), BOUNDARY_RED),
        ReviewState::Rejected => {
            (dashed(0.25, REJECTED_GREY, &[0.5, 0.8]), format!("rej. {score:.2}"), REJECTED_GREY)
        }
    }
}

/// Width of the paleosol bar for a development grade, mm.
pub fn paleosol_bar_mm(dev: PaleosolDevelopment) -> f64 {
    match dev {
        PaleosolDevelopment::None => 0.0,
        PaleosolDevelopment::Weak => 1.2,
        PaleosolDevelopment::Moderate => 2.4,
        PaleosolDevelopment::Strong => 3.6,
        PaleosolDevelopment::VeryStrong => 4.8,
    }
}

/// How one end of a body bracket is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BracketEnd {
    /// The body ends here: a tick pointing left.
    Tick,
    /// The body runs on beyond the segment: no tick.
    Cut,
    /// The body's end is not seen (section base or top, covered interval): no tick, and the line
    /// runs on beyond the end as a dotted stub.
    Open,
}

/// Labels for a body, longest first: the stacking with its thickness ("≥" before a censored
/// one), the stacking alone, a short code.
pub fn body_labels(body: &ChannelBody) -> [String; 3] {
    let (long, short) = match body.stacking {
        Stacking::MultiStory => (format!("multi-story ({})", body.stories), format!("MS{}", body.stories)),
        Stacking::SingleStory => ("single-story".to_string(), "SS".to_string()),
        Stacking::Undetermined => ("1 storey seen".to_string(), "\u{2265}1".to_string()),
    };
    let thick = if body.is_censored() {
        format!("\u{2265}{:.1}", body.thickness_m)
    } else {
        format!("{:.1}", body.thickness_m)
    };
    [format!("{long}, {}", body.thickness_text()), format!("{short} {thick} m"), short]
}

/// A body bracket at x from yb (base) to yt (top) with the given ends (base, top).
pub fn body_bracket(
    x: f64,
    yb: f64,
    yt: f64,
    (base, top): (BracketEnd, BracketEnd),
    tick: f64,
    width: f64,
    out: &mut Vec<Item>,
) {
    bracket(x, yb, yt, (base == BracketEnd::Tick, top == BracketEnd::Tick), tick, width, out);
    let stub = 2.2_f64.min((yb - yt).abs() / 2.0 + 1.0);
    for (end, y, dir) in [(base, yb, 1.0), (top, yt, -1.0)] {
        if end == BracketEnd::Open {
            out.push(Item::Polyline {
                points: vec![PtMm { x, y }, PtMm { x, y: y + dir * stub }],
                stroke: dashed(width, BODY_BLUE, &[0.45, 0.45]),
            });
        }
    }
}

/// A vertical bracket at x from yb (base) to yt (top), with end ticks pointing left where the
/// interval ends inside the segment.
fn bracket(
    x: f64,
    yb: f64,
    yt: f64,
    (tick_base, tick_top): (bool, bool),
    tick: f64,
    width: f64,
    out: &mut Vec<Item>,
) {
    // Closed ends stop short of the boundary so that stacked intervals read as separate brackets.
    let inset = width / 2.0 + 0.35;
    let y_top = if tick_top { yt + inset } else { yt };
    let y_base = if tick_base { yb - inset } else { yb };
    if y_base <= y_top {
        return;
    }
    let mut pts = Vec::new();
    if tick_top {
        pts.push(PtMm { x: x - tick, y: y_top });
    }
    pts.push(PtMm { x, y: y_top });
    pts.push(PtMm { x, y: y_base });
    if tick_base {
        pts.push(PtMm { x: x - tick, y: y_base });
    }
    out.push(Item::Polyline { points: pts, stroke: solid(width, BODY_BLUE) });
}

/// Draw a basal contact from xl to xr at y: straight (sharp), scalloped (erosional) or broken
/// (gradational).
pub fn draw_contact(contact: Contact, xl: f64, xr: f64, y: f64, out: &mut Vec<Item>) {
    match contact {
        Contact::Sharp => out.push(Item::Polyline {
            points: vec![PtMm { x: xl, y }, PtMm { x: xr, y }],
            stroke: solid(LINE_MM, INK),
        }),
        Contact::Gradational => out.push(Item::Polyline {
            points: vec![PtMm { x: xl, y }, PtMm { x: xr, y }],
            stroke: dashed(LINE_MM, INK, &[1.2, 0.8]),
        }),
        Contact::Erosional => {
            // Scallops cut down into the bed below: arcs of ~2.4 mm span, 0.7 mm deep.
            let span = xr - xl;
            let n = (span / 2.4).round().max(1.0) as usize;
            let w = span / n as f64;
            let mut pts = Vec::with_capacity(n * 8 + 1);
            for k in 0..n {
                for s in 0..8 {
                    let f = s as f64 / 8.0;
                    pts.push(PtMm {
                        x: xl + (k as f64 + f) * w,
                        y: y + 0.7 * (f * std::f64::consts::PI).sin(),
                    });
                }
            }
            pts.push(PtMm { x: xr, y });
            out.push(Item::Polyline { points: pts, stroke: solid(LINE_MM * 1.2, INK) });
        }
    }
}

/// A tick step (in display units) giving major ticks at least ~8 mm apart.
pub fn axis_step(mm_per_unit: f64) -> f64 {
    const STEPS: [f64; 16] = [
        0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0, 2000.0, 5000.0, 10000.0,
    ];
    STEPS.iter().copied().find(|s| s * mm_per_unit >= 8.0).unwrap_or(10000.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn axis_steps_suit_the_scale() {
        // 1:100 → 10 mm per m → 1 m steps; 1:500 → 2 mm per m → 5 m; 1:10 → 0.1 m (common practice).
        assert_eq!(axis_step(10.0), 1.0);
        assert_eq!(axis_step(2.0), 5.0);
        assert_eq!(axis_step(100.0), 0.1);
        assert_eq!(axis_step(20.0), 0.5);
    }

    #[test]
    fn tracks_do_not_overlap() {
        for show in [true, false] {
            let opts = LayoutOptions { show_interpretation: show, ..Default::default() };
            let t = Tracks::new(&opts);
            let mut list = vec![t.axis, t.lithology, t.structures, t.paleocurrents, t.paleosols];
            list.extend(
                [t.storeys, t.bodies, t.proportion, t.regime, t.boundary_labels].into_iter().flatten(),
            );
            assert_eq!(list.len(), if show { 10 } else { 5 });
            for w in list.windows(2) {
                assert!(w[0].x_mm + w[0].w_mm <= w[1].x_mm + 1e-9, "{w:?}");
            }
            let last = list[list.len() - 1];
            assert!(last.x_mm + last.w_mm <= t.width_mm + 1e-9);
        }
    }

    #[test]
    fn feet_sections_get_a_feet_axis() {
        use crate::layout::sample::{sample_interpretation, sample_section};
        let mut s = sample_section();
        s.display_unit = LengthUnit::Foot;
        let i = sample_interpretation(&s);
        let opts = LayoutOptions::default();
        let strip = crate::layout::column_strip(&s, &i, &opts);
        let texts: Vec<(&str, f64)> = strip
            .items
            .iter()
            .filter_map(|it| match it {
                Item::Text { text, pos, .. } => Some((text.as_str(), pos.y)),
                _ => None,
            })
            .collect();
        assert!(texts.iter().any(|(t, _)| *t == "height (ft)"));
        // At 1:100 a foot is 3.048 mm (1 ft = 0.3048 m exactly), so labels every 5 ft (15.24 mm).
        // The "100" label sits at 100 ft = 30.48 m above the base.
        let (_, y) = texts.iter().find(|(t, _)| *t == "100").expect("100 ft label");
        let baseline_offset = 0.8;
        assert!((strip.heights.height_m(y - baseline_offset) - 30.48).abs() < 1e-9);
        assert!(!texts.iter().any(|(t, _)| *t == "102"), "no label off the 5 ft grid");
    }

    #[test]
    fn contacts_differ() {
        let mut s = Vec::new();
        draw_contact(Contact::Sharp, 0.0, 10.0, 5.0, &mut s);
        let mut e = Vec::new();
        draw_contact(Contact::Erosional, 0.0, 10.0, 5.0, &mut e);
        let mut g = Vec::new();
        draw_contact(Contact::Gradational, 0.0, 10.0, 5.0, &mut g);
        let Item::Polyline { points, stroke } = &s[0] else { panic!() };
        assert_eq!(points.len(), 2);
        assert!(stroke.dash_mm.is_empty());
        let Item::Polyline { points, .. } = &e[0] else { panic!() };
        assert!(points.len() > 8 && points.iter().any(|p| p.y > 5.5), "scallops dip below the line");
        assert!((points[points.len() - 1].x - 10.0).abs() < 1e-9);
        let Item::Polyline { stroke, .. } = &g[0] else { panic!() };
        assert!(!stroke.dash_mm.is_empty(), "gradational is broken");
    }
}
