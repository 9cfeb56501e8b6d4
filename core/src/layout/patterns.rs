//! Lithology fill patterns of our own drawing, following the kinds of mark in FGDC-STD-013-2006
//! section 37: stipple for sandstone, staggered short dashes for clay rocks, dashes and dots for
//! siltstone, circles for conglomerate, angular fragments for breccia, brick for limestone,
//! rhomb-jointed brick for dolostone, solid black for coal.
//!
//! Marks are generated already clipped to the (convex) bed outline. Rows of marks are single
//! dashed lines whose dash phase is anchored to a fixed grid, so a pattern is continuous across
//! beds and cheap to draw (one item per row instead of one per mark).

use super::clip::ConvexClip;
use super::items::{Item, PtMm, Rgba};
use super::style::{dashed, lithology_tint, solid, HAIR_MM};
use crate::model::Lithology;

/// Pattern ink: dark grey so marks read as texture, not outlines.
const MARK: Rgba = Rgba(60, 60, 60, 255);

/// A pattern's marks inside one bed outline.
pub struct PatternCtx<'a> {
    pub clip: &'a ConvexClip,
    /// Grid origin (mm) the pattern is anchored to, so neighbouring beds line up.
    pub origin: PtMm,
    /// Items are appended here.
    pub out: &'a mut Vec<Item>,
}

impl PatternCtx<'_> {
    /// A line through `anchor` with unit direction `dir`, dashed (`on`, `off`) with a dash starting
    /// at `anchor` (and every `on + off` along the line), clipped to the outline. `off == 0` draws
    /// a solid line.
    fn dashed_line(&mut self, anchor: PtMm, dir: PtMm, on: f64, off: f64, width_mm: f64, color: Rgba) {
        // Long enough to cross the outline from wherever the anchor lies.
        let reach = (self.clip.max.x - self.clip.min.x)
            + (self.clip.max.y - self.clip.min.y)
            + (anchor.x - self.clip.min.x).abs()
            + (anchor.y - self.clip.min.y).abs()
            + 10.0;
        let p = PtMm { x: anchor.x - dir.x * reach, y: anchor.y - dir.y * reach };
        let q = PtMm { x: anchor.x + dir.x * reach, y: anchor.y + dir.y * reach };
        let Some((t0, t1)) = self.clip.clip_params(p, q) else { return };
        // Parameters measured from the anchor, in mm along the line.
        let (a, b) = (t0 * 2.0 * reach - reach, t1 * 2.0 * reach - reach);
        let at = |t: f64| PtMm { x: anchor.x + dir.x * t, y: anchor.y + dir.y * t };
        if off <= 0.0 {
            self.out.push(Item::Polyline { points: vec![at(a), at(b)], stroke: solid(width_mm, color) });
            return;
        }
        let period = on + off;
        let first = (a / period).ceil() * period;
        // A dash cut by the outline at the start: draw its visible part.
        let prev = first - period;
        if prev + on > a {
            let end = (prev + on).min(b);
            if end - a > 0.02 {
                self.out
                    .push(Item::Polyline { points: vec![at(a), at(end)], stroke: solid(width_mm, color) });
            }
        }
        if b - first > 0.02 {
            self.out.push(Item::Polyline {
                points: vec![at(first), at(b)],
                stroke: dashed(width_mm, color, &[on, off]),
            });
        }
    }

    /// Horizontal rows `row_mm` apart, dashed, every other row shifted by `stagger_mm`.
    fn rows(&mut self, row_mm: f64, y_offset: f64, on: f64, off: f64, stagger_mm: f64, width_mm: f64) {
        let first = ((self.clip.min.y - self.origin.y - y_offset) / row_mm).ceil() as i64;
        let last = ((self.clip.max.y - self.origin.y - y_offset) / row_mm).floor() as i64;
        for k in first..=last {
            let y = self.origin.y + y_offset + k as f64 * row_mm;
            let x = self.origin.x + if k.rem_euclid(2) == 1 { stagger_mm } else { 0.0 };
            self.dashed_line(PtMm { x, y }, PtMm { x: 1.0, y: 0.0 }, on, off, width_mm, MARK);
        }
    }

    /// Brick joints between rows `row_mm` apart: one short stroke every `brick_mm` in each course,
    /// offset by half a brick on alternate courses; `lean_mm` leans them (rhomb joints).
    fn joints(&mut self, row_mm: f64, brick_mm: f64, lean_mm: f64) {
        let k0 = ((self.clip.min.y - self.origin.y) / row_mm).floor() as i64;
        let k1 = ((self.clip.max.y - self.origin.y) / row_mm).ceil() as i64;
        for k in k0..k1 {
            let y_top = self.origin.y + k as f64 * row_mm;
            let y_bot = y_top + row_mm;
            let offset = if k.rem_euclid(2) == 1 { brick_mm / 2.0 } else { 0.0 };
            let m0 = ((self.clip.min.x - self.origin.x - offset - lean_mm.abs()) / brick_mm).floor() as i64;
            let m1 = ((self.clip.max.x - self.origin.x - offset + lean_mm.abs()) / brick_mm).ceil() as i64;
            for m in m0..=m1 {
                let x = self.origin.x + offset + m as f64 * brick_mm;
                let p = PtMm { x, y: y_bot };
                let q = PtMm { x: x + lean_mm, y: y_top };
                if let Some((a, b)) = self.clip.clip_segment(p, q) {
                    self.out.push(Item::Polyline { points: vec![a, b], stroke: solid(HAIR_MM * 1.3, MARK) });
                }
            }
        }
    }

    /// Deterministic pseudo-random number in [0, 1) for a grid cell (so fills never change between
    /// runs or between screen and print).
    fn jitter(i: i64, j: i64, salt: u64) -> f64 {
        let mut h = (i as u64).wrapping_mul(0x9E37_79B9_7F4A_7C15)
            ^ (j as u64).wrapping_mul(0xC2B2_AE3D_27D4_EB4F)
            ^ salt.wrapping_mul(0x1656_67B1_9E37_79F9);
        h ^= h >> 31;
        h = h.wrapping_mul(0xBF58_476D_1CE4_E5B9);
        h ^= h >> 29;
        (h >> 11) as f64 / (1u64 << 53) as f64
    }

    /// Cells of a grid `dx` × `dy` mm that touch the outline's bounding box.
    fn cells(&self, dx: f64, dy: f64) -> Vec<(i64, i64, PtMm)> {
        let i0 = ((self.clip.min.x - self.origin.x) / dx).floor() as i64;
        let i1 = ((self.clip.max.x - self.origin.x) / dx).ceil() as i64;
        let j0 = ((self.clip.min.y - self.origin.y) / dy).floor() as i64;
        let j1 = ((self.clip.max.y - self.origin.y) / dy).ceil() as i64;
        let mut v = Vec::new();
        for j in j0..=j1 {
            for i in i0..=i1 {
                let shift = if j.rem_euclid(2) == 1 { dx / 2.0 } else { 0.0 };
                v.push((
                    i,
                    j,
                    PtMm { x: self.origin.x + i as f64 * dx + shift, y: self.origin.y + j as f64 * dy },
                ));
            }
        }
        v
    }

    fn circles(&mut self, dx: f64, dy: f64, r_min: f64, r_max: f64) {
        for (i, j, c) in self.cells(dx, dy) {
            let r = r_min + (r_max - r_min) * Self::jitter(i, j, 1);
            let c = PtMm {
                x: c.x + (Self::jitter(i, j, 2) - 0.5) * dx * 0.3,
                y: c.y + (Self::jitter(i, j, 3) - 0.5) * dy * 0.3,
            };
            if self.clip.contains_disc(c, r + 0.05) {
                self.out.push(Item::Circle {
                    center: c,
                    radius_mm: r,
                    fill: None,
                    stroke: Some(solid(HAIR_MM * 1.5, MARK)),
                });
            }
        }
    }

    fn fragments(&mut self, dx: f64, dy: f64, size: f64) {
        for (i, j, c) in self.cells(dx, dy) {
            let n = 3 + (Self::jitter(i, j, 4) * 2.0) as usize;
            let turn = Self::jitter(i, j, 5) * std::f64::consts::TAU;
            let pts: Vec<PtMm> = (0..n)
                .map(|k| {
                    let a = turn + k as f64 * std::f64::consts::TAU / n as f64;
                    let r = size * (0.6 + 0.5 * Self::jitter(i, j, 10 + k as u64));
                    PtMm { x: c.x + r * a.cos(), y: c.y + r * a.sin() * 0.8 }
                })
                .collect();
            if self.clip.contains_all(&pts) {
                self.out.push(Item::Polygon {
                    points: pts,
                    fill: None,
                    stroke: Some(solid(HAIR_MM * 1.5, MARK)),
                });
            }
        }
    }

    fn vees(&mut self, dx: f64, dy: f64, size: f64) {
        for (_, _, c) in self.cells(dx, dy) {
            let pts = vec![
                PtMm { x: c.x - size / 2.0, y: c.y - size / 2.0 },
                PtMm { x: c.x, y: c.y + size / 2.0 },
                PtMm { x: c.x + size / 2.0, y: c.y - size / 2.0 },
            ];
            if self.clip.contains_all(&pts) {
                self.out.push(Item::Polyline { points: pts, stroke: solid(HAIR_MM * 1.5, MARK) });
            }
        }
    }

    /// Parallel lines in direction `dir` (not horizontal), `spacing` apart along x, on a grid
    /// anchored at the pattern origin.
    fn hatch(&mut self, spacing: f64, dir: PtMm, color: Rgba, width_mm: f64) {
        // x where line k crosses height y: origin.x + k·spacing + (y − origin.y)·dir.x/dir.y.
        let run = dir.x / dir.y;
        let ymid = (self.clip.min.y + self.clip.max.y) / 2.0;
        let shift = (ymid - self.origin.y) * run;
        let half_h = (self.clip.max.y - self.clip.min.y) / 2.0 * run.abs();
        let k0 = ((self.clip.min.x - half_h - self.origin.x - shift) / spacing).floor() as i64;
        let k1 = ((self.clip.max.x + half_h - self.origin.x - shift) / spacing).ceil() as i64;
        for k in k0..=k1 {
            let anchor = PtMm { x: self.origin.x + k as f64 * spacing + shift, y: ymid };
            self.dashed_line(anchor, dir, 1.0, 0.0, width_mm, color);
        }
    }
}

/// Draw the fill of one bed (tint plus pattern marks) clipped to its convex outline.
///
/// The outline polygon itself is emitted first, filled with the lithology's tint.
pub fn fill_bed(lith: Lithology, outline: &[PtMm], origin: PtMm, out: &mut Vec<Item>) {
    out.push(Item::Polygon { points: outline.to_vec(), fill: Some(lithology_tint(lith)), stroke: None });
    let Some(clip) = ConvexClip::new(outline) else { return };
    let mut ctx = PatternCtx { clip: &clip, origin, out };
    draw_marks(lith, &mut ctx);
}

/// The marks of a lithology's pattern (no tint).
fn draw_marks(lith: Lithology, ctx: &mut PatternCtx<'_>) {
    let w = HAIR_MM * 1.5;
    let diag = {
        let s = std::f64::consts::FRAC_1_SQRT_2;
        PtMm { x: s, y: -s }
    };
    match lith {
        // 620 clay or clay shale: short dashes in staggered rows.
        Lithology::Claystone | Lithology::Mudstone | Lithology::Shale => {
            ctx.rows(1.1, 0.55, 1.2, 1.0, 1.1, w);
        }
        // 616 siltstone: dashes and dots along rows, staggered.
        Lithology::Siltstone => {
            ctx.rows(1.2, 0.6, 1.0, 0.55, 0.8, w);
            // The dot between dashes: a second row family of short marks offset half a period.
            ctx.rows(1.2, 0.6, 0.2, 1.35, 1.975, w * 1.4);
        }
        // 607 massive sandstone: dot stipple (square dots from a dashed row).
        Lithology::Sandstone => {
            ctx.rows(0.9, 0.45, 0.22, 0.93, 0.575, 0.22);
        }
        // 601 conglomerate: open circles of varied size over a light stipple.
        Lithology::Conglomerate => {
            ctx.circles(2.4, 1.9, 0.45, 0.8);
            ctx.rows(1.9, 0.0, 0.2, 1.0, 0.6, 0.2);
        }
        // 605 breccia: open angular fragments over a light stipple.
        Lithology::Breccia => {
            ctx.fragments(2.6, 2.0, 0.75);
            ctx.rows(2.0, 0.95, 0.2, 1.1, 0.65, 0.2);
        }
        // 627 limestone: brick (courses with joints offset by half a brick).
        Lithology::Limestone => {
            ctx.rows(1.6, 0.0, 1.0, 0.0, 0.0, HAIR_MM * 1.3);
            ctx.joints(1.6, 3.2, 0.0);
        }
        // 642 dolostone: brick with leaning (rhomb) joints.
        Lithology::Dolostone => {
            ctx.rows(1.6, 0.0, 1.0, 0.0, 0.0, HAIR_MM * 1.3);
            ctx.joints(1.6, 3.2, 0.8);
        }
        // 623 calcareous shale or marl: clay dashes with limestone-like joints between them.
        Lithology::Marl => {
            ctx.rows(1.6, 0.0, 1.2, 0.5, 0.85, w);
            ctx.joints(1.6, 3.4, 0.0);
        }
        // 658 coal: solid black (the tint); nothing more.
        Lithology::Coal => {}
        // 667 gypsum (evaporite): our own lattice of crossing diagonals.
        Lithology::Evaporite => {
            ctx.hatch(1.8, diag, MARK, HAIR_MM);
            ctx.hatch(1.8, PtMm { x: -diag.x, y: diag.y }, MARK, HAIR_MM);
        }
        // Tuff: small v marks in staggered rows.
        Lithology::Tuff => ctx.vees(2.0, 1.6, 0.9),
        // Covered: wide diagonal hatch, no rock pattern.
        Lithology::Covered => ctx.hatch(2.2, diag, Rgba(140, 140, 140, 255), HAIR_MM * 1.5),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn outline() -> Vec<PtMm> {
        vec![
            PtMm { x: 10.0, y: 30.0 },
            PtMm { x: 30.0, y: 30.0 },
            PtMm { x: 36.0, y: 10.0 },
            PtMm { x: 10.0, y: 10.0 },
        ]
    }

    fn inside(c: &ConvexClip, p: PtMm) -> bool {
        // Allow for a stroke's rounding at the outline.
        c.contains(p)
            || [(-0.01, 0.0), (0.01, 0.0), (0.0, -0.01), (0.0, 0.01)]
                .iter()
                .any(|(dx, dy)| c.contains(PtMm { x: p.x + dx, y: p.y + dy }))
    }

    #[test]
    fn every_mark_stays_inside_the_bed() {
        let o = outline();
        let clip = ConvexClip::new(&o).expect("area");
        // Patterns are anchored to the section base, which may lie far below the bed.
        for (lith, origin) in Lithology::ALL
            .iter()
            .flat_map(|l| [(*l, PtMm { x: 3.3, y: 1.7 }), (*l, PtMm { x: 10.0, y: 950.0 })])
        {
            let mut out = Vec::new();
            fill_bed(lith, &o, origin, &mut out);
            assert!(matches!(out[0], Item::Polygon { fill: Some(_), .. }), "{lith}: tint first");
            if lith != Lithology::Coal {
                assert!(
                    out.len() > 5,
                    "{lith}: a 20 × 20 mm bed must show its pattern ({} items)",
                    out.len()
                );
            }
            for item in &out[1..] {
                let pts: Vec<PtMm> = match item {
                    Item::Polyline { points, .. } | Item::Polygon { points, .. } => points.clone(),
                    Item::Circle { center, radius_mm, .. } => {
                        assert!(
                            clip.contains_disc(*center, *radius_mm),
                            "{lith}: circle crosses the outline"
                        );
                        vec![*center]
                    }
                    other => panic!("{lith}: unexpected mark {other:?}"),
                };
                for p in pts {
                    assert!(inside(&clip, p), "{lith}: mark point {p:?} outside the bed");
                }
            }
        }
    }

    #[test]
    fn patterns_differ_between_families() {
        let o = outline();
        let sig = |lith| {
            let mut out = Vec::new();
            fill_bed(lith, &o, PtMm { x: 0.0, y: 0.0 }, &mut out);
            format!("{:?}", &out[1..])
        };
        let kinds = [
            Lithology::Mudstone,
            Lithology::Siltstone,
            Lithology::Sandstone,
            Lithology::Conglomerate,
            Lithology::Breccia,
            Lithology::Limestone,
            Lithology::Dolostone,
            Lithology::Marl,
            Lithology::Evaporite,
            Lithology::Tuff,
            Lithology::Covered,
        ];
        for (i, a) in kinds.iter().enumerate() {
            for b in &kinds[i + 1..] {
                assert_ne!(sig(*a), sig(*b), "{a} and {b} draw the same marks");
            }
        }
        // Claystone, mudstone and shale share FGDC pattern 620, so the same marks.
        assert_eq!(sig(Lithology::Claystone), sig(Lithology::Shale));
    }
}
