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
                    for candidate in body_labels(body, self.section.display_unit) {
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
            // The line leaves a gap over the record tracks of words so that it never strikes
            // through a facies code, a sample id, a photograph's reference or a fossil's name.
            match tr.words_tracks_span() {
                Some((a, b)) => {
                    out.push(Item::Polyline {
                        points: vec![PtMm { x: x_start, y }, PtMm { x: x0 + a - 0.5, y }],
                        stroke: stroke.clone(),
                    });
                    out.push(Item::Polyline {
                        points: vec![PtMm { x: x0 + b + 0.5, y }, PtMm { x: x_end, y }],
                        stroke,
                    });
                }
                None => out.push(Item::Polyline {
                    points: vec![PtMm { x: x_start, y }, PtMm { x: x_end, y }],
                    stroke,
                }),
            }
            if let Some(lt) = tr.boundary_labels {
                let size = fit_size(&label, lt.w_mm - 0.8, SMALL_PT, 4.0).unwrap_or(4.0);
                text(out, x0 + lt.x_mm + 0.8, y + 0.9, &label, size, color);
            }
        }
    }
}

impl ColumnCtx<'_> {
    /// Names of the surfaces logged at bed bases in the segment, where no boundary line shown
    /// already carries a label: in the boundary-label track when the interpretation is shown (a
    /// short tick and the name), else at the right of the lithology track. Drawn on screen and
    /// on paper alike.
    pub(super) fn draw_surface_names(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let labelled: Vec<usize> = if self.opts.show_interpretation {
            let all = &self.interp.sequence_boundary_candidates;
            self.spans
                .candidates_in(lo, hi)
                .map(|k| &all[k])
                .filter(|c| self.opts.show_rejected || c.review != ReviewState::Rejected)
                .map(|c| c.bed_index)
                .collect()
        } else {
            Vec::new()
        };
        for i in self.beds_in(lo, hi) {
            let Some(name) = surface_name(&self.section.beds[i]) else { continue };
            let base = self.bases_m[i];
            if base < lo - 1e-9 || base > hi + 1e-9 || labelled.contains(&i) {
                continue;
            }
            let y = t.y_mm(base);
            match self.tracks.boundary_labels {
                Some(lt) => {
                    let x = x0 + lt.x_mm;
                    out.push(Item::Polyline {
                        points: vec![PtMm { x, y }, PtMm { x: x + 1.2, y }],
                        stroke: solid(THIN_MM * 2.0, INK),
                    });
                    let size = fit_size(name, lt.w_mm - 2.0, SMALL_PT, 4.0).unwrap_or(4.0);
                    text(out, x + 1.6, y + 0.9, name, size, INK);
                }
                None => {
                    let lt = self.tracks.lithology;
                    let size = fit_size(name, lt.w_mm / 2.0, SMALL_PT, 4.0).unwrap_or(4.0);
                    let w = width(name, size);
                    text(out, x0 + lt.x_mm + lt.w_mm - 0.5 - w, y - 0.5, name, size, INK);
                }
            }
        }
    }
}

/// The geologist's name for the surface at a bed's base, trimmed; `None` when there is none.
pub fn surface_name(bed: &Bed) -> Option<&str> {
    bed.base_surface.as_ref().map(|s| s.name.trim()).filter(|n| !n.is_empty())
}

/// The name a boundary is printed with: the geologist's correlation label, else the surface's
/// name.
pub fn candidate_name(c: &BoundaryCandidate) -> Option<&str> {
    c.label.as_deref().or(c.surface_name.as_deref())
}

/// A label and stroke for a boundary in a review state: its name when it has one ("SB? RG-E1"
/// unreviewed, "SB RG-E1" accepted, "rej. RG-E1" rejected), else its strength class ("SB?
/// strong") — never a bare number that reads like a probability. The line of an unreviewed
/// candidate is thicker the stronger its evidence, so a named one still shows its strength.
pub fn boundary_style(review: ReviewState, strength: Strength, name: Option<&str>) -> (Stroke, String, Rgba) {
    let label = |head: &str| match name.map(str::trim).filter(|n| !n.is_empty()) {
        Some(n) => format!("{head} {n}"),
        None => format!("{head} {}", strength.name()),
    };
    match review {
        ReviewState::Candidate => {
            (dashed(candidate_line_mm(strength), BOUNDARY_RED, &[2.0, 1.0]), label("SB?"), BOUNDARY_RED)
        }
        ReviewState::Accepted => (solid(0.55, BOUNDARY_RED), label("SB"), BOUNDARY_RED),
        ReviewState::Rejected => (dashed(0.25, REJECTED_GREY, &[0.5, 0.8]), label("rej."), REJECTED_GREY),
    }
}

/// Line width (mm) of an unreviewed candidate boundary of a strength class: thicker for stronger.
pub fn candidate_line_mm(strength: Strength) -> f64 {
    match strength {
        Strength::Weak => 0.25,
        Strength::Moderate => 0.38,
        Strength::Strong => 0.5,
    }
}

/// The review state in words, as the hover help and the legend say it.
pub fn review_words(review: ReviewState) -> &'static str {
    match review {
        ReviewState::Candidate => "unreviewed: for you to judge",
        ReviewState::Accepted => "accepted by you",
        ReviewState::Rejected => "rejected by you",
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

/// The stacking of a body as the column and its legend write it.
pub fn stacking_words(stacking: Stacking) -> &'static str {
    match stacking {
        Stacking::MultiStory => "multi-storey",
        Stacking::SingleStory => "single-storey",
        Stacking::Undetermined => "stacking undetermined",
    }
}

/// The short code of a stacking, as beside a narrow bracket and in the legend ("MS", "SS",
/// "≥1" for a body of which one storey is seen).
pub fn stacking_code(stacking: Stacking) -> &'static str {
    match stacking {
        Stacking::MultiStory => "MS",
        Stacking::SingleStory => "SS",
        Stacking::Undetermined => "\u{2265}1",
    }
}

/// "2 storeys", "1 storey".
pub fn storeys_words(n: usize) -> String {
    if n == 1 {
        "1 storey".to_string()
    } else {
        format!("{n} storeys")
    }
}

/// Labels for a body, longest first, every one saying what its number counts: the stacking with
/// its storeys and thickness ("multi-storey · 2 storeys · 5.40 m", "≥" before a censored one),
/// the code with them ("MS · 2 storeys · 5.4 m"), the code with the storeys ("MS · 2 storeys").
pub fn body_labels(body: &ChannelBody, unit: LengthUnit) -> [String; 3] {
    let code = stacking_code(body.stacking);
    let at_least = if body.is_censored() { "\u{2265}" } else { "" };
    let thick = format!("{at_least}{:.1}", unit.length(body.thickness_m));
    match body.stacking {
        Stacking::MultiStory => {
            let storeys = storeys_words(body.stories);
            [
                format!("multi-storey \u{b7} {storeys} \u{b7} {}", body.thickness_text_in(unit)),
                format!("{code} \u{b7} {storeys} \u{b7} {thick}"),
                format!("{code} \u{b7} {storeys}"),
            ]
        }
        Stacking::SingleStory => [
            format!("single-storey \u{b7} {}", body.thickness_text_in(unit)),
            format!("{code} \u{b7} {thick}"),
            code.to_string(),
        ],
        Stacking::Undetermined => [
            format!("1 storey seen \u{b7} {}", body.thickness_text_in(unit)),
            format!("{code} storey \u{b7} {thick}"),
            code.to_string(),
        ],
    }
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::sample::{sample_interpretation, sample_section};
    use crate::layout::{column_strip, pages, PrintMeta};
    use crate::model::{Surface, SurfaceKind};

    fn texts(items: &[Item]) -> Vec<&str> {
        items
            .iter()
            .filter_map(|it| match it {
                Item::Text { text, .. } => Some(text.as_str()),
                _ => None,
            })
            .collect()
    }

    #[test]
    fn a_boundary_is_labelled_by_its_name_else_its_strength_class() {
        let label = |r, s, n| boundary_style(r, s, n).1;
        assert_eq!(label(ReviewState::Candidate, Strength::Strong, Some("RG-E1")), "SB? RG-E1");
        assert_eq!(label(ReviewState::Accepted, Strength::Strong, Some(" RG-E1 ")), "SB RG-E1");
        assert_eq!(label(ReviewState::Rejected, Strength::Weak, Some("RG-E1")), "rej. RG-E1");
        assert_eq!(label(ReviewState::Candidate, Strength::Strong, None), "SB? strong");
        assert_eq!(label(ReviewState::Candidate, Strength::Moderate, Some("  ")), "SB? moderate");
        // The strength still shows on a named candidate: its line is thicker the stronger.
        let w = |s| boundary_style(ReviewState::Candidate, s, Some("RG-E1")).0.width_mm;
        assert!(w(Strength::Weak) < w(Strength::Moderate) && w(Strength::Moderate) < w(Strength::Strong));
    }

    #[test]
    fn body_labels_say_what_their_number_counts() {
        let i = sample_interpretation(&sample_section());
        let [long, mid, short] = body_labels(&i.channel_bodies[0], LengthUnit::Metre);
        assert_eq!(long, "multi-storey \u{b7} 2 storeys \u{b7} 6.70 m");
        assert_eq!(mid, "MS \u{b7} 2 storeys \u{b7} 6.7 m");
        assert_eq!(short, "MS \u{b7} 2 storeys");
        let [long, _, short] = body_labels(&i.channel_bodies[1], LengthUnit::Metre);
        assert!(long.starts_with("single-storey \u{b7} "), "{long}");
        assert_eq!(short, "SS");
        for b in &i.channel_bodies {
            assert!(
                body_labels(b, LengthUnit::Metre).iter().all(|l| !l.contains("story")),
                "one spelling: storey"
            );
        }
    }

    #[test]
    fn surface_names_are_drawn_on_screen_and_paper_with_or_without_the_interpretation() {
        let mut s = sample_section();
        // A named surface that the rules list (the candidate at bed 15's base) and one they do
        // not (bed 10's base).
        s.beds[14].base_surface = Some(Surface { name: "RG-E1".into(), kind: SurfaceKind::Incision });
        s.beds[9].base_surface = Some(Surface { name: "Ash-3".into(), kind: SurfaceKind::Other });
        let mut i = sample_interpretation(&s);
        i.sequence_boundary_candidates[1].surface_name = Some("RG-E1".into());
        let opts = LayoutOptions::default();
        let strip = column_strip(&s, &i, &opts);
        let on_screen = texts(&strip.items);
        assert!(on_screen.contains(&"SB? RG-E1"), "{on_screen:?}");
        assert!(on_screen.contains(&"Ash-3"));
        assert!(!on_screen.iter().any(|t| t.contains("strong \u{b7}") || *t == "RG-E1"), "named once");
        assert!(on_screen.contains(&"SB strong"), "an unnamed boundary shows its strength class");
        let meta = PrintMeta::default();
        let paper: Vec<String> = pages(&s, &i, &opts, &meta)
            .iter()
            .flat_map(|p| texts(&p.items).into_iter().map(str::to_string).collect::<Vec<_>>())
            .collect();
        assert!(paper.iter().any(|t| t == "SB? RG-E1") && paper.iter().any(|t| t == "Ash-3"));
        // Without the interpretation both names are still on the column.
        let bare = LayoutOptions { show_interpretation: false, ..Default::default() };
        let strip = column_strip(&s, &i, &bare);
        let on_screen = texts(&strip.items);
        assert!(on_screen.contains(&"RG-E1") && on_screen.contains(&"Ash-3"), "{on_screen:?}");
        assert!(!on_screen.iter().any(|t| t.starts_with("SB")));
    }
}
