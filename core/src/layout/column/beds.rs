//! The beds of a segment: outline at their grain size, lithology pattern, basal contact,
//! structures, paleocurrents and paleosols.

use super::*;
use crate::layout::symbols::paleocurrent_mark;

impl ColumnCtx<'_> {
    pub(super) fn draw_bed(
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
                let w = width(label, size);
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
    pub(super) fn draw_paleosol_profiles(&self, part: &Part<'_>, out: &mut Vec<Item>) {
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
        // When they do not all fit, as many as leave room for "+k" inside the track (so the
        // count never runs into the paleocurrent track beside it).
        let more = |shown: usize| format!("+{}", n - shown);
        let shown = if n <= fit {
            n
        } else {
            (0..fit).rev().find(|&k| k as f64 * pitch + width(&more(k), SMALL_PT) <= tr.w_mm).unwrap_or(0)
        };
        for (k, s) in bed.structures.iter().take(shown).enumerate() {
            let c = PtMm { x: x0 + tr.x_mm + size / 2.0 + k as f64 * pitch, y: y_mid };
            structure_symbol(*s, c, size, out);
        }
        if shown < n {
            text(out, x0 + tr.x_mm + shown as f64 * pitch, y_mid + 0.8, &more(shown), SMALL_PT, INK);
        }
    }

    /// The paleocurrent marks of a part of the column, placed by [`place_marks`]: one per bed
    /// with readings where there is room, else one per group of neighbouring beds whose marks
    /// would overlap (their readings pooled, the count printed), never overlapping each other and
    /// never leaving the paleocurrent track (so never over the structure symbols beside it).
    pub(super) fn draw_paleocurrent_marks(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let mut wanted: Vec<(f64, Vec<f64>)> = Vec::new();
        for i in self.beds_in(lo, hi) {
            let bed = &self.section.beds[i];
            let (b, tp) = (self.bases_m[i].max(lo), self.top_m(i).min(hi));
            let readings: Vec<f64> =
                crate::analysis::paleocurrents::bed_flow_azimuths(bed, self.section.bedding.as_ref())
                    .into_iter()
                    .filter(|a| a.is_finite())
                    .collect();
            if tp <= b || readings.is_empty() {
                continue;
            }
            wanted.push(((t.y_mm(b) + t.y_mm(tp)) / 2.0, readings));
        }
        let tr = self.tracks.paleocurrents;
        let radius = mark_radius_mm(tr.w_mm);
        let x = x0 + tr.x_mm + tr.w_mm / 2.0;
        let ys: Vec<f64> = wanted.iter().map(|w| w.0).collect();
        for m in place_marks(&ys, mark_pitch_mm(radius)) {
            let readings: Vec<f64> =
                wanted[m.members.clone()].iter().flat_map(|w| w.1.iter().copied()).collect();
            paleocurrent_mark(PtMm { x, y: m.y_mm }, &readings, radius, out);
        }
    }
}

/// Half the side of the square a paleocurrent mark fills in a track `track_w_mm` wide, mm: the
/// track less 0.5 mm each side, at most 3.8 mm.
pub fn mark_radius_mm(track_w_mm: f64) -> f64 {
    (track_w_mm / 2.0 - 0.5).clamp(0.5, 3.8)
}

/// Least distance between the centres of two paleocurrent marks, mm: their side and a 0.4 mm gap.
pub fn mark_pitch_mm(radius_mm: f64) -> f64 {
    2.0 * radius_mm + 0.4
}

/// One paleocurrent mark: where it goes and which beds' readings it shows.
#[derive(Debug, Clone, PartialEq)]
pub struct PlacedMark {
    /// Centre of the mark on the page, mm (down).
    pub y_mm: f64,
    /// Indices into the wanted positions given to [`place_marks`] (consecutive).
    pub members: std::ops::Range<usize>,
}

/// Where the paleocurrent marks of a column go, given where each bed's mark is wanted (`wanted_y`,
/// mm down the page, in bed order from the base up, so y falls) and the pitch of the marks.
///
/// The rule, which keeps marks a readable size at every scale:
/// 1. Beds are taken from the base up. A group starts at the first bed not yet placed and takes
///    every following bed whose wanted centre lies less than one pitch above the group's first.
///    At large scales every bed is its own group; at small scales (1:500 and less) the beds of
///    each stretch one mark tall share one mark showing their readings pooled, with the count.
/// 2. A group's mark is wanted at the mean of its beds' centres, moved up just enough to clear the
///    mark below by a pitch.
/// 3. Should the top mark then stand above the highest bed's centre, it is put back there and the
///    marks below it moved down as needed to keep a pitch apart.
///
/// Marks are therefore never closer than a pitch (they never overlap), stay in order, and each
/// lies within one pitch of its own beds: group starts are at least a pitch apart, so the marks
/// always fit between the lowest and the highest wanted centre.
pub fn place_marks(wanted_y: &[f64], pitch: f64) -> Vec<PlacedMark> {
    let mut marks: Vec<PlacedMark> = Vec::new();
    let mut i = 0;
    while i < wanted_y.len() {
        let start = wanted_y[i];
        let mut j = i + 1;
        while j < wanted_y.len() && start - wanted_y[j] < pitch {
            j += 1;
        }
        let mean = wanted_y[i..j].iter().sum::<f64>() / (j - i) as f64;
        let y = match marks.last() {
            Some(below) => mean.min(below.y_mm - pitch),
            None => mean,
        };
        marks.push(PlacedMark { y_mm: y, members: i..j });
        i = j;
    }
    let top = wanted_y.iter().copied().fold(f64::INFINITY, f64::min);
    if let Some(last) = marks.last_mut() {
        last.y_mm = last.y_mm.max(top);
    }
    for k in (0..marks.len().saturating_sub(1)).rev() {
        marks[k].y_mm = marks[k].y_mm.max(marks[k + 1].y_mm + pitch);
    }
    marks
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::symbols::RAY_GREY;
    use crate::model::{BedId, Lithology, Structure};
    use crate::rules::{interpret, RuleParams};

    #[test]
    fn marks_with_room_sit_at_their_beds_and_crowded_ones_are_pooled_a_pitch_apart() {
        // Beds 20 mm apart on the page with an 8 mm pitch: every bed keeps its own mark, in place.
        let roomy = [200.0, 180.0, 160.0];
        let m = place_marks(&roomy, 8.0);
        assert_eq!(m.iter().map(|p| p.y_mm).collect::<Vec<_>>(), roomy);
        assert!(m.iter().enumerate().all(|(k, p)| p.members == (k..k + 1)));
        // Beds 1.5 mm apart (0.75 m at 1:500), 30 of them: pooled, never closer than a pitch, in
        // order, every bed in exactly one mark and each mark within a pitch of its beds.
        let crowded: Vec<f64> = (0..30).map(|k| 200.0 - 1.5 * k as f64).collect();
        let m = place_marks(&crowded, 8.0);
        assert!(m.len() < crowded.len() && m.len() >= 5, "{} marks", m.len());
        for w in m.windows(2) {
            assert!(w[0].y_mm - w[1].y_mm >= 8.0 - 1e-9, "{w:?}");
            assert_eq!(w[0].members.end, w[1].members.start);
        }
        assert_eq!((m[0].members.start, m[m.len() - 1].members.end), (0, 30));
        for p in &m {
            for &y in &crowded[p.members.clone()] {
                assert!((p.y_mm - y).abs() < 8.0, "{p:?} far from its bed at {y}");
            }
        }
        let (top, base) = (crowded[29], crowded[0]);
        assert!(m.iter().all(|p| p.y_mm >= top - 1e-9 && p.y_mm <= base + 1e-9), "inside the beds' span");
        assert!(place_marks(&[], 8.0).is_empty());
    }

    /// Bounding box (x0, x1) of an item, mm.
    fn x_extent(it: &Item) -> (f64, f64) {
        let xs: Vec<f64> = match it {
            Item::Polyline { points, .. } | Item::Polygon { points, .. } => {
                points.iter().map(|p| p.x).collect()
            }
            Item::Circle { center, radius_mm, .. } => vec![center.x - radius_mm, center.x + radius_mm],
            Item::Rect { rect, .. } => vec![rect.x, rect.x + rect.w],
            Item::Text { pos, text, size_pt, .. } => vec![pos.x, pos.x + width(text, *size_pt)],
        };
        (
            xs.iter().copied().fold(f64::INFINITY, f64::min),
            xs.iter().copied().fold(f64::NEG_INFINITY, f64::max),
        )
    }

    /// A section of 60 sandstone beds 0.4 m thick, each with three structures and the readings
    /// `readings(k)` of bed k, drawn at 1:500 (0.8 mm a bed).
    fn dense_at_500(readings: impl Fn(u64) -> Vec<f64>) -> (Vec<Item>, Tracks) {
        let mut s = Section::new("Dense");
        for k in 0..60 {
            let mut b = Bed::new(BedId(k + 1), 0.4, Lithology::Sandstone, None);
            b.structures = vec![Structure::TroughCrossBedding, Structure::MudClasts, Structure::BasalLag];
            b.paleocurrents = readings(k).into_iter().map(crate::model::Paleocurrent::azimuth).collect();
            s.beds.push(b);
        }
        let it = interpret(&s, &RuleParams::default());
        let opts = LayoutOptions { scale_denominator: 500.0, ..Default::default() };
        let ctx = ColumnCtx::new(&s, &it, &opts);
        let t = HeightTransform::new(300.0, 0.0, 500.0);
        let (mut out, mut boxes) = (Vec::new(), Vec::new());
        ctx.draw_range(0.0, ctx.total_m, 0.0, &t, &mut out, &mut boxes);
        (out, ctx.tracks)
    }

    #[test]
    fn roses_at_1_500_never_overlap_each_other_or_the_structure_symbols() {
        // Four readings a bed: a rose each, wanted every 0.8 mm.
        let (out, tr) = dense_at_500(|_| vec![200.0, 215.0, 230.0, 250.0]);
        let (pc, st) = (tr.paleocurrents, tr.structures);
        let radius = mark_radius_mm(pc.w_mm);
        let roses: Vec<PtMm> = out
            .iter()
            .filter_map(|it| match it {
                Item::Circle { center, fill: None, .. }
                    if center.x > pc.x_mm && center.x < pc.x_mm + pc.w_mm =>
                {
                    Some(*center)
                }
                _ => None,
            })
            .collect();
        assert!(roses.len() >= 3 && roses.len() < 60, "{} roses: pooled, but some", roses.len());
        for (i, a) in roses.iter().enumerate() {
            for b in &roses[i + 1..] {
                assert!((a.y - b.y).abs() >= 2.0 * radius, "roses at {a:?} and {b:?} overlap");
            }
        }
        // Every item right of the lithology track sits wholly in the structure track or wholly
        // in the paleocurrent track; the two tracks do not meet.
        assert!(st.x_mm + st.w_mm < pc.x_mm);
        let (mut in_st, mut in_pc) = (0, 0);
        for it in &out {
            let (x0, x1) = x_extent(it);
            if x0 >= st.x_mm - 1e-9 && x1 <= st.x_mm + st.w_mm + 1e-9 {
                in_st += 1;
            } else if x0 >= pc.x_mm - 1e-9 && x1 <= pc.x_mm + pc.w_mm + 1e-9 {
                in_pc += 1;
            } else {
                assert!(
                    x1 <= st.x_mm + 1e-9 || x0 >= pc.x_mm + pc.w_mm - 1e-9,
                    "an item straddles the structure and paleocurrent tracks: {it:?}"
                );
            }
        }
        assert!(in_st > 60 && in_pc > 0, "{in_st} structure items, {in_pc} paleocurrent items");
        // The pooled readings are counted: 60 beds × 4 readings over the marks.
        let total: usize = out
            .iter()
            .filter_map(|it| match it {
                Item::Text { text, pos, .. } if pos.x > pc.x_mm && pos.x < pc.x_mm + pc.w_mm => {
                    text.parse::<usize>().ok()
                }
                _ => None,
            })
            .sum();
        assert_eq!(total, 240);
    }

    #[test]
    fn fans_at_1_500_stand_apart() {
        // Three readings on beds 0, 30 and 59 (24 mm apart or more, well over a pitch): a fan
        // each, in place; one reading on each of beds 14 and 15 (0.8 mm apart, 11 mm and more
        // from the others): pooled into a fan of two. A fan's rays all start at its centre.
        let (out, tr) = dense_at_500(|k| match k {
            14 | 15 => vec![40.0 + k as f64],
            0 | 30 | 59 => vec![100.0, 130.0, 160.0],
            _ => vec![],
        });
        let pc = tr.paleocurrents;
        let mut centres: Vec<PtMm> = out
            .iter()
            .filter_map(|it| match it {
                Item::Polyline { points, stroke }
                    if stroke.color == RAY_GREY && points[0].x == pc.x_mm + pc.w_mm / 2.0 =>
                {
                    Some(points[0])
                }
                _ => None,
            })
            .collect();
        centres.dedup();
        assert_eq!(centres.len(), 4, "{centres:?}");
        // The lone fans stand at their beds' middles: 300 − 0.8 × (k + 0.5) mm.
        for k in [0.0, 30.0, 59.0] {
            let y = 300.0 - 0.8 * (k + 0.5);
            assert!(centres.iter().any(|c| (c.y - y).abs() < 1e-9), "bed {k}: {centres:?}");
        }
        let pitch = mark_pitch_mm(mark_radius_mm(pc.w_mm));
        for w in centres.windows(2) {
            assert!((w[0].y - w[1].y).abs() >= pitch - 1e-9, "{w:?}");
        }
    }
}
