//! The interpretation tracks of a segment: storeys, channel bodies with their brackets,
//! channel-body proportion, accommodation regime and candidate sequence boundaries.

use super::*;

impl ColumnCtx<'_> {
    pub(super) fn draw_interpretation(&self, part: &Part<'_>, out: &mut Vec<Item>) {
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
                            let w = width(&candidate, size);
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
                        let w = width(label, size);
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
            let (stroke, label, color) = boundary_style(c.review, c.strength, candidate_name(c));
            out.push(Item::Polyline { points: vec![PtMm { x: x_start, y }, PtMm { x: x_end, y }], stroke });
            if let Some(lt) = tr.boundary_labels {
                text(out, x0 + lt.x_mm + 0.8, y + 0.9, &label, SMALL_PT, color);
            }
        }
    }
}

/// The name a boundary is printed with: the geologist's correlation label, else the surface's
/// name.
pub fn candidate_name(c: &BoundaryCandidate) -> Option<&str> {
    c.label.as_deref().or(c.surface_name.as_deref())
}

/// A label and stroke for a boundary in a review state: "SB? strong", "SB moderate · Red Cap",
/// "rej. weak". The strength class, never a bare number that reads like a probability.
pub fn boundary_style(review: ReviewState, strength: Strength, name: Option<&str>) -> (Stroke, String, Rgba) {
    let named = |head: &str| match name.map(str::trim).filter(|n| !n.is_empty()) {
        Some(n) => format!("{head} {} \u{b7} {n}", strength.name()),
        None => format!("{head} {}", strength.name()),
    };
    match review {
        ReviewState::Candidate => (dashed(0.35, BOUNDARY_RED, &[2.0, 1.0]), named("SB?"), BOUNDARY_RED),
        ReviewState::Accepted => (solid(0.55, BOUNDARY_RED), named("SB"), BOUNDARY_RED),
        ReviewState::Rejected => (dashed(0.25, REJECTED_GREY, &[0.5, 0.8]), named("rej."), REJECTED_GREY),
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
