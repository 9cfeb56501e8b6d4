//! The interpretation and column layout the window draws from. STAND-IN: a small private
//! version used until the core's rules and layout modules land; the window only talks to the
//! four items below (`RuleParams`, `interpret`, `Strip`, `column_strip`), so switching to the
//! core's engine touches this file only.

use aggrade_core::layout::{Anchor, Item, PtMm, RectMm, Rgba, Stroke};
use aggrade_core::model::{
    mm_to_phi, Contact, LithologyFamily, PaleosolDevelopment, Section, WentworthClass,
};
use aggrade_core::rules::{
    BoundaryCandidate, CandidateKind, ChannelBody, CurvePoint, Element, GrainProfile, Interpretation,
    Stacking, Storey,
};
use serde::{Deserialize, Serialize};

/// Rule parameters (stand-in for the core's; edited generically through serde by the panel).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RuleParams {
    /// Fines thinner than this inside a channel belt do not split a body (m; common practice).
    pub drape_limit_m: f64,
    /// A non-erosional sand thinner than this inside fines is a splay (m; common practice).
    pub splay_limit_m: f64,
    /// Moving window of the proportion curve (m).
    pub window_m: f64,
    /// Spacing of the curve's points (m).
    pub curve_step_m: f64,
}

impl Default for RuleParams {
    fn default() -> Self {
        RuleParams { drape_limit_m: 0.5, splay_limit_m: 1.0, window_m: 10.0, curve_step_m: 0.5 }
    }
}

/// Interpret a section (stand-in rules).
pub fn interpret(section: &Section, p: &RuleParams) -> Interpretation {
    let beds = &section.beds;
    let base = section.base_heights_m();
    let n = beds.len();
    let coarse =
        |i: usize| matches!(beds[i].lithology.family(), LithologyFamily::Sand | LithologyFamily::Gravel);
    let mut elements = vec![Element::Other; n];
    let mut storeys: Vec<Storey> = Vec::new();
    let mut i = 0;
    while i < n {
        let b = &beds[i];
        elements[i] = match b.lithology.family() {
            LithologyFamily::Covered => Element::Covered,
            LithologyFamily::Fines if b.paleosol != PaleosolDevelopment::None => Element::Paleosol,
            LithologyFamily::Fines => Element::OverbankFines,
            LithologyFamily::NonClastic => Element::Other,
            _ if b.base_contact != Contact::Erosional && b.thickness_m < p.splay_limit_m => {
                Element::SplaySand
            }
            _ => Element::ChannelDeposit,
        };
        if elements[i] == Element::ChannelDeposit {
            let first = i;
            let mut last = i;
            let mut j = i + 1;
            while j < n && coarse(j) && beds[j].base_contact != Contact::Erosional {
                elements[j] = Element::ChannelDeposit;
                last = j;
                j += 1;
            }
            let amalgamated_base = first > 0 && elements[first - 1] == Element::ChannelDeposit;
            storeys.push(Storey {
                base_m: base[first],
                top_m: base[last] + beds[last].thickness_m,
                first_bed: first,
                last_bed: last,
                amalgamated_base,
            });
            i = j;
        } else {
            i += 1;
        }
    }
    // Storeys separated only by thin drapes form one body.
    let mut groups: Vec<Vec<usize>> = Vec::new();
    for (k, s) in storeys.iter().enumerate() {
        let joined = groups.last().is_some_and(|g| {
            let prev = &storeys[g[g.len() - 1]];
            let gap: f64 = (prev.last_bed + 1..s.first_bed).map(|b| beds[b].thickness_m).sum();
            gap < p.drape_limit_m
        });
        match groups.last_mut() {
            Some(g) if joined => g.push(k),
            _ => groups.push(vec![k]),
        }
    }
    let channel_bodies: Vec<ChannelBody> = groups
        .iter()
        .map(|g| {
            let (s0, s1) = (&storeys[g[0]], &storeys[g[g.len() - 1]]);
            let grains: Vec<_> =
                (s0.first_bed..=s1.last_bed).filter_map(|b| beds[b].coarsest_grain()).collect();
            let finest = grains.iter().copied().max_by(|a, b| a.phi().total_cmp(&b.phi()));
            let coarsest = grains.iter().copied().min_by(|a, b| a.phi().total_cmp(&b.phi()));
            ChannelBody {
                base_m: s0.base_m,
                top_m: s1.top_m,
                thickness_m: s1.top_m - s0.base_m,
                stories: g.len(),
                stacking: if g.len() > 1 { Stacking::MultiStory } else { Stacking::SingleStory },
                amalgamated_bases: g.iter().filter(|&&k| storeys[k].amalgamated_base).count(),
                grain_finest: finest,
                grain_coarsest: coarsest,
                profile: GrainProfile::Unknown,
                style_hint: None,
                storey_indices: g.clone(),
            }
        })
        .collect();
    let exposed = section.exposed_thickness_m();
    let channel_m: f64 = beds
        .iter()
        .zip(&elements)
        .filter(|(_, e)| **e == Element::ChannelDeposit)
        .map(|(b, _)| b.thickness_m)
        .sum();
    let total = section.total_thickness_m();
    let mut curve = Vec::new();
    let step = p.curve_step_m.max(0.05);
    let mut h = 0.0;
    while h <= total + 1e-9 && curve.len() < 200_000 {
        let (lo, hi) = (h - p.window_m / 2.0, h + p.window_m / 2.0);
        let (mut ch, mut ex) = (0.0, 0.0);
        let start = base.partition_point(|&b| b < lo).saturating_sub(1);
        for k in start..n {
            if base[k] > hi {
                break;
            }
            let ov = (base[k] + beds[k].thickness_m).min(hi) - base[k].max(lo);
            if ov > 0.0 && !beds[k].is_covered() {
                ex += ov;
                if elements[k] == Element::ChannelDeposit {
                    ch += ov;
                }
            }
        }
        curve.push(CurvePoint { height_m: h, proportion: (ex > 0.0).then(|| ch / ex) });
        h += step;
    }
    let mut cands: Vec<BoundaryCandidate> = Vec::new();
    for body in &channel_bodies {
        let bi = storeys[body.storey_indices[0]].first_bed;
        let mut score: f64 = 0.3;
        let mut evidence = vec!["erosional base of a channel body".to_string()];
        if body.stacking == Stacking::MultiStory {
            score += 0.25;
            evidence.push(format!("base of a multi-story body ({} storeys)", body.stories));
        }
        let mut kind = CandidateKind::ChannelBodyBase;
        if bi > 0 {
            let below = &beds[bi - 1];
            if below.paleosol.is_strong() {
                score += 0.25;
                kind = CandidateKind::ChannelBaseOnPaleosol;
                evidence.push(format!("rests on a paleosol of {} development", below.paleosol));
            }
            if let (Some(a), Some(b)) = (below.grain_top, beds[bi].grain_base) {
                let jump = b.class().rank() as i64 - a.class().rank() as i64;
                if jump >= 2 {
                    score += 0.2;
                    evidence.push(format!("grain size jumps {jump} Wentworth classes upward"));
                }
            }
        }
        cands.push(candidate(section, bi, base[bi], kind, score, evidence));
    }
    for k in 0..n.saturating_sub(1) {
        if beds[k].paleosol.is_strong() && elements[k + 1] != Element::ChannelDeposit {
            let ev = vec![format!("paleosol of {} development capping floodplain fines", beds[k].paleosol)];
            cands.push(candidate(section, k + 1, base[k + 1], CandidateKind::PaleosolTop, 0.4, ev));
        }
    }
    cands.sort_by(|a, b| b.score.total_cmp(&a.score).then(a.height_m.total_cmp(&b.height_m)));
    Interpretation {
        section: section.name.clone(),
        total_thickness_m: total,
        exposed_thickness_m: exposed,
        channel_proportion: (exposed > 0.0).then(|| channel_m / exposed),
        elements,
        storeys,
        channel_bodies,
        interval_proportions: Vec::new(),
        proportion_curve: curve,
        accommodation: Vec::new(),
        sequence_boundary_candidates: cands,
        caution: aggrade_core::REVIEW_CAUTION.to_string(),
    }
}

fn candidate(
    s: &Section,
    bed_index: usize,
    height_m: f64,
    kind: CandidateKind,
    score: f64,
    evidence: Vec<String>,
) -> BoundaryCandidate {
    let bed_id = s.beds[bed_index].id;
    let d = s.decision_for(bed_id);
    BoundaryCandidate {
        height_m,
        bed_index,
        bed_id,
        kind,
        score: score.min(1.0),
        evidence,
        review: d.map(|d| d.state).unwrap_or_default(),
        note: d.map(|d| d.note.clone()).unwrap_or_default(),
    }
}

/// Heights (m, up) ↔ strip y (mm, down).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HeightTransform {
    pub top_y_mm: f64,
    pub top_height_m: f64,
    pub mm_per_m: f64,
}

impl HeightTransform {
    /// y on the strip of a height above the section base.
    pub fn y_mm(&self, height_m: f64) -> f64 {
        self.top_y_mm + (self.top_height_m - height_m) * self.mm_per_m
    }
    /// Height above the section base at a strip y.
    pub fn height_m(&self, y_mm: f64) -> f64 {
        self.top_height_m - (y_mm - self.top_y_mm) / self.mm_per_m
    }
}

/// Grain size (phi) ↔ column width (mm).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GrainScale {
    pub x0_mm: f64,
    pub clay_width_mm: f64,
    pub mm_per_phi: f64,
}

impl GrainScale {
    /// Right edge of the column for a phi value.
    pub fn x_mm(&self, phi: f64) -> f64 {
        self.x0_mm + self.clay_width_mm + (9.0 - phi.clamp(-9.0, 9.0)) * self.mm_per_phi
    }
    /// The Wentworth class whose width is nearest to a right-edge x.
    pub fn class_at(&self, x_mm: f64) -> WentworthClass {
        let mut best = WentworthClass::Clay;
        for c in WentworthClass::ALL {
            if (self.x_mm(c.midpoint_phi()) - x_mm).abs() < (self.x_mm(best.midpoint_phi()) - x_mm).abs() {
                best = c;
            }
        }
        best
    }
}

/// Where a bed is drawn.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BedBox {
    pub bed_index: usize,
    pub rect: RectMm,
}

/// The whole column as one tall strip of items.
#[derive(Debug, Clone)]
pub struct Strip {
    pub width_mm: f64,
    pub height_mm: f64,
    pub items: Vec<Item>,
    pub heights: HeightTransform,
    pub bed_boxes: Vec<BedBox>,
    pub grain_scale: GrainScale,
}

/// Layout options the window sets.
#[derive(Debug, Clone, PartialEq)]
pub struct LayoutOptions {
    pub scale_denominator: f64,
    pub show_rejected: bool,
}

impl Default for LayoutOptions {
    fn default() -> Self {
        LayoutOptions { scale_denominator: 100.0, show_rejected: false }
    }
}

fn fill_for(section: &Section, i: usize) -> Rgba {
    use aggrade_core::model::Lithology::*;
    match section.beds[i].lithology {
        Sandstone => Rgba(236, 214, 140, 255),
        Conglomerate | Breccia => Rgba(214, 170, 110, 255),
        Siltstone => Rgba(190, 196, 160, 255),
        Claystone | Mudstone | Shale => Rgba(160, 170, 150, 255),
        Limestone | Dolostone | Marl => Rgba(170, 200, 215, 255),
        Coal => Rgba(40, 40, 40, 255),
        Evaporite => Rgba(230, 200, 230, 255),
        Tuff => Rgba(220, 180, 190, 255),
        Covered => Rgba(245, 245, 245, 255),
    }
}

/// Lay the column out as one strip (stand-in layout).
pub fn column_strip(section: &Section, interp: &Interpretation, opts: &LayoutOptions) -> Strip {
    let mm_per_m = 1000.0 / opts.scale_denominator.max(1.0);
    let total = section.total_thickness_m();
    let heights = HeightTransform { top_y_mm: 6.0, top_height_m: total, mm_per_m };
    let gs = GrainScale { x0_mm: 0.0, clay_width_mm: 8.0, mm_per_phi: 2.2 };
    let ink = |w: f64| Stroke { width_mm: w, color: Rgba(40, 40, 40, 255), dash_mm: Vec::new() };
    let mut items = Vec::with_capacity(section.beds.len() * 3);
    let mut boxes = Vec::with_capacity(section.beds.len());
    let base = section.base_heights_m();
    for (i, b) in section.beds.iter().enumerate() {
        let (y0, y1) = (heights.y_mm(base[i]), heights.y_mm(base[i] + b.thickness_m));
        let fixed = if b.is_covered() { 12.0 } else { 20.0 };
        let xb = b.grain_base.map(|g| gs.x_mm(g.phi())).unwrap_or(fixed);
        let xt = b.grain_top.or(b.grain_base).map(|g| gs.x_mm(g.phi())).unwrap_or(fixed);
        let pts = vec![
            PtMm { x: 0.0, y: y0 },
            PtMm { x: xb, y: y0 },
            PtMm { x: xt, y: y1 },
            PtMm { x: 0.0, y: y1 },
        ];
        items.push(Item::Polygon { points: pts, fill: Some(fill_for(section, i)), stroke: Some(ink(0.15)) });
        let mut base_line = ink(if b.base_contact == Contact::Erosional { 0.5 } else { 0.2 });
        if b.base_contact == Contact::Gradational {
            base_line.dash_mm = vec![1.0, 0.8];
        }
        items.push(Item::Polyline {
            points: vec![PtMm { x: 0.0, y: y0 }, PtMm { x: xb, y: y0 }],
            stroke: base_line,
        });
        let el = interp.elements.get(i).copied().unwrap_or(Element::Other);
        let tag = match el {
            Element::ChannelDeposit => Rgba(214, 140, 60, 255),
            Element::SplaySand => Rgba(230, 200, 120, 255),
            Element::Paleosol => Rgba(150, 90, 70, 255),
            Element::OverbankFines => Rgba(140, 160, 130, 255),
            Element::Covered => Rgba(225, 225, 225, 255),
            Element::Other => Rgba(150, 170, 190, 255),
        };
        items.push(Item::Rect {
            rect: RectMm { x: 56.0, y: y1, w: 4.0, h: y0 - y1 },
            fill: Some(tag),
            stroke: None,
        });
        boxes.push(BedBox { bed_index: i, rect: RectMm { x: 0.0, y: y1, w: xb.max(xt), h: y0 - y1 } });
    }
    for body in &interp.channel_bodies {
        let (y0, y1) = (heights.y_mm(body.base_m), heights.y_mm(body.top_m));
        let pts = vec![
            PtMm { x: 62.0, y: y1 },
            PtMm { x: 64.0, y: y1 },
            PtMm { x: 64.0, y: y0 },
            PtMm { x: 62.0, y: y0 },
        ];
        items.push(Item::Polyline { points: pts, stroke: ink(0.3) });
        let label = match body.stacking {
            Stacking::MultiStory => format!("multi-story ({})", body.stories),
            Stacking::SingleStory => "single-story".to_string(),
        };
        let pos = PtMm { x: 66.0, y: (y0 + y1) / 2.0 + 1.0 };
        items.push(Item::Text {
            pos,
            text: label,
            size_pt: 7.0,
            color: Rgba::BLACK,
            anchor: Anchor::Start,
            rotation_deg: 0.0,
        });
    }
    let curve: Vec<PtMm> = interp
        .proportion_curve
        .iter()
        .filter_map(|c| c.proportion.map(|p| PtMm { x: 96.0 + p * 20.0, y: heights.y_mm(c.height_m) }))
        .collect();
    if curve.len() > 1 {
        let stroke = Stroke { width_mm: 0.35, color: Rgba(30, 90, 160, 255), dash_mm: Vec::new() };
        items.push(Item::Polyline { points: curve, stroke });
    }
    for c in &interp.sequence_boundary_candidates {
        use aggrade_core::model::ReviewState::*;
        if c.review == Rejected && !opts.show_rejected {
            continue;
        }
        let y = heights.y_mm(c.height_m);
        let (color, dash) = match c.review {
            Accepted => (Rgba(180, 30, 40, 255), vec![]),
            Candidate => (Rgba(200, 80, 40, 255), vec![2.0, 1.2]),
            Rejected => (Rgba(150, 150, 150, 255), vec![0.6, 0.8]),
        };
        let stroke = Stroke { width_mm: 0.4, color, dash_mm: dash };
        items.push(Item::Polyline { points: vec![PtMm { x: -2.0, y }, PtMm { x: 120.0, y }], stroke });
        let text = format!("SB? {:.2}", c.score);
        items.push(Item::Text {
            pos: PtMm { x: 120.0, y: y - 0.8 },
            text,
            size_pt: 7.0,
            color,
            anchor: Anchor::End,
            rotation_deg: 0.0,
        });
    }
    let height_mm = heights.y_mm(0.0) + 12.0;
    let _ = mm_to_phi;
    Strip { width_mm: 122.0, height_mm, items, heights, bed_boxes: boxes, grain_scale: gs }
}

/// Write strip items as an SVG document (stand-in for the core's SVG writer).
pub fn strip_svg(strip: &Strip) -> String {
    let col = |c: Rgba| format!("rgb({},{},{})", c.0, c.1, c.2);
    let stroke = |s: &Option<Stroke>| match s {
        Some(s) => format!(" stroke=\"{}\" stroke-width=\"{}\"", col(s.color), s.width_mm),
        None => String::new(),
    };
    let fill = |f: &Option<Rgba>| f.map(col).unwrap_or_else(|| "none".into());
    let pts =
        |p: &[PtMm]| p.iter().map(|p| format!("{:.3},{:.3}", p.x + 4.0, p.y)).collect::<Vec<_>>().join(" ");
    let mut out = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}mm\" height=\"{h}mm\" viewBox=\"0 0 {w} {h}\">\n",
        w = strip.width_mm + 8.0,
        h = strip.height_mm
    );
    for it in &strip.items {
        match it {
            Item::Rect { rect, fill: f, stroke: s } => {
                out += &format!(
                    "<rect x=\"{:.3}\" y=\"{:.3}\" width=\"{:.3}\" height=\"{:.3}\" fill=\"{}\"{}/>\n",
                    rect.x + 4.0,
                    rect.y,
                    rect.w,
                    rect.h,
                    fill(f),
                    stroke(s)
                )
            }
            Item::Polygon { points, fill: f, stroke: s } => {
                out += &format!("<polygon points=\"{}\" fill=\"{}\"{}/>\n", pts(points), fill(f), stroke(s))
            }
            Item::Polyline { points, stroke: s } => {
                out += &format!(
                    "<polyline points=\"{}\" fill=\"none\"{}/>\n",
                    pts(points),
                    stroke(&Some(s.clone()))
                )
            }
            Item::Circle { center, radius_mm, fill: f, stroke: s } => {
                out += &format!(
                    "<circle cx=\"{:.3}\" cy=\"{:.3}\" r=\"{:.3}\" fill=\"{}\"{}/>\n",
                    center.x + 4.0,
                    center.y,
                    radius_mm,
                    fill(f),
                    stroke(s)
                )
            }
            Item::Text { pos, text, size_pt, color, .. } => {
                let esc = text.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;");
                out += &format!(
                    "<text x=\"{:.3}\" y=\"{:.3}\" font-size=\"{:.3}\" fill=\"{}\">{esc}</text>\n",
                    pos.x + 4.0,
                    pos.y,
                    size_pt * 25.4 / 72.0,
                    col(*color)
                )
            }
        }
    }
    out += "</svg>\n";
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn height_transform_round_trips_and_points_up() {
        let t = HeightTransform { top_y_mm: 6.0, top_height_m: 20.0, mm_per_m: 10.0 };
        assert_eq!(t.y_mm(20.0), 6.0);
        assert_eq!(t.y_mm(0.0), 206.0);
        assert!(t.y_mm(5.0) > t.y_mm(6.0), "higher beds must be drawn higher (smaller y)");
        assert!((t.height_m(t.y_mm(7.3)) - 7.3).abs() < 1e-12);
    }

    #[test]
    fn grain_scale_is_monotonic_and_snaps_to_classes() {
        let g = GrainScale { x0_mm: 0.0, clay_width_mm: 8.0, mm_per_phi: 2.2 };
        for w in WentworthClass::ALL.windows(2) {
            assert!(g.x_mm(w[1].midpoint_phi()) > g.x_mm(w[0].midpoint_phi()));
        }
        for c in WentworthClass::ALL {
            assert_eq!(g.class_at(g.x_mm(c.midpoint_phi()) + 0.3), c);
        }
    }
}
