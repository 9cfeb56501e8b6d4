//! Draws layout items (millimetres, y down) as egui shapes, only those in the visible range.

use aggrade_core::layout::{Anchor, Item, PtMm, Rgba, Stroke};
use egui::epaint::{Mesh, Vertex, WHITE_UV};
use egui::{Color32, Pos2, Shape};

/// Millimetres on the strip → screen points.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MmToScreen {
    /// Screen position of strip point (0, 0).
    pub origin: Pos2,
    /// Screen points per millimetre.
    pub zoom: f32,
}

impl MmToScreen {
    /// Screen position of a strip point.
    pub fn pos(&self, x_mm: f64, y_mm: f64) -> Pos2 {
        Pos2::new(self.origin.x + x_mm as f32 * self.zoom, self.origin.y + y_mm as f32 * self.zoom)
    }
    fn pt(&self, p: PtMm) -> Pos2 {
        self.pos(p.x, p.y)
    }
    /// Strip y (mm) at a screen y.
    pub fn y_mm(&self, y: f32) -> f64 {
        ((y - self.origin.y) / self.zoom) as f64
    }
    /// Strip x (mm) at a screen x.
    pub fn x_mm(&self, x: f32) -> f64 {
        ((x - self.origin.x) / self.zoom) as f64
    }
}

/// Items binned by their vertical extent so a frame touches only what it shows.
#[derive(Debug, Default)]
pub struct ItemIndex {
    bin_mm: f64,
    bins: Vec<Vec<u32>>,
    /// Per item, the last frame it was drawn in (avoids drawing an item twice from two bins).
    stamp: Vec<u64>,
    frame: u64,
}

/// The vertical extent of an item in mm.
fn y_range(item: &Item) -> (f64, f64) {
    let b = item.bounds();
    (b.y, b.y + b.h)
}

impl ItemIndex {
    /// Index items of a strip `height_mm` tall.
    pub fn build(items: &[Item], height_mm: f64) -> Self {
        let bin_mm = 20.0;
        let nbins = ((height_mm / bin_mm).ceil() as usize).clamp(1, 1_000_000);
        let mut bins = vec![Vec::new(); nbins];
        for (i, it) in items.iter().enumerate() {
            let (lo, hi) = y_range(it);
            if !(lo.is_finite() && hi.is_finite()) {
                continue;
            }
            let a = ((lo / bin_mm).floor().max(0.0) as usize).min(nbins - 1);
            let b = ((hi / bin_mm).floor().max(0.0) as usize).min(nbins - 1);
            for bin in &mut bins[a..=b] {
                bin.push(i as u32);
            }
        }
        ItemIndex { bin_mm, bins, stamp: vec![0; items.len()], frame: 0 }
    }

    /// Indices of items that may overlap y in [lo, hi] mm, each once, in drawing order.
    pub fn visible(&mut self, lo_mm: f64, hi_mm: f64) -> Vec<u32> {
        self.frame += 1;
        let mut out = Vec::new();
        if self.bins.is_empty() {
            return out;
        }
        let n = self.bins.len();
        let a = ((lo_mm / self.bin_mm).floor().max(0.0) as usize).min(n - 1);
        let b = ((hi_mm / self.bin_mm).floor().max(0.0) as usize).min(n - 1);
        for bin in &self.bins[a..=b] {
            for &i in bin {
                if self.stamp[i as usize] != self.frame {
                    self.stamp[i as usize] = self.frame;
                    out.push(i);
                }
            }
        }
        out.sort_unstable();
        out
    }
}

fn color(c: Rgba) -> Color32 {
    Color32::from_rgba_unmultiplied(c.0, c.1, c.2, c.3)
}

fn stroke(s: &Stroke, zoom: f32) -> egui::Stroke {
    egui::Stroke::new((s.width_mm as f32 * zoom).max(0.6), color(s.color))
}

fn line(points: Vec<Pos2>, s: &Stroke, zoom: f32, out: &mut Vec<Shape>) {
    let st = stroke(s, zoom);
    if s.dash_mm.len() >= 2 {
        let dash = (s.dash_mm[0] as f32 * zoom).max(1.0);
        let gap = (s.dash_mm[1] as f32 * zoom).max(1.0);
        out.extend(Shape::dashed_line(&points, st, dash, gap));
    } else {
        out.push(Shape::line(points, st));
    }
}

/// Twice the signed area of a polygon (positive when counter-clockwise in y-down screen space).
fn signed_area2(p: &[Pos2]) -> f32 {
    let mut a = 0.0;
    for i in 0..p.len() {
        let (u, v) = (p[i], p[(i + 1) % p.len()]);
        a += u.x * v.y - v.x * u.y;
    }
    a
}

/// Triangles of a simple polygon by ear clipping (bed outlines with scalloped bases are concave).
pub fn triangulate(points: &[Pos2]) -> Vec<[usize; 3]> {
    let n = points.len();
    if n < 3 {
        return Vec::new();
    }
    let orient = signed_area2(points).signum();
    let cross = |a: Pos2, b: Pos2, c: Pos2| (b.x - a.x) * (c.y - a.y) - (b.y - a.y) * (c.x - a.x);
    let mut idx: Vec<usize> = (0..n).collect();
    let mut tris = Vec::with_capacity(n - 2);
    let mut guard = 0;
    while idx.len() > 3 && guard < n * n {
        guard += 1;
        let m = idx.len();
        let mut clipped = false;
        for k in 0..m {
            let (ia, ib, ic) = (idx[(k + m - 1) % m], idx[k], idx[(k + 1) % m]);
            let (a, b, c) = (points[ia], points[ib], points[ic]);
            let turn = cross(a, b, c) * orient;
            if turn <= 0.0 {
                continue;
            }
            let inside = idx.iter().any(|&j| {
                if j == ia || j == ib || j == ic {
                    return false;
                }
                let p = points[j];
                cross(a, b, p) * orient >= 0.0
                    && cross(b, c, p) * orient >= 0.0
                    && cross(c, a, p) * orient >= 0.0
            });
            if !inside {
                tris.push([ia, ib, ic]);
                idx.remove(k);
                clipped = true;
                break;
            }
        }
        if !clipped {
            break;
        }
    }
    if idx.len() == 3 {
        tris.push([idx[0], idx[1], idx[2]]);
    } else if idx.len() > 3 {
        // Degenerate (self-touching) remainder: fan it rather than drop it.
        for k in 1..idx.len() - 1 {
            tris.push([idx[0], idx[k], idx[k + 1]]);
        }
    }
    tris
}

fn fill_polygon(pts: &[Pos2], c: Color32, out: &mut Vec<Shape>) {
    if pts.len() <= 4 {
        out.push(Shape::convex_polygon(pts.to_vec(), c, egui::Stroke::NONE));
        return;
    }
    let mut mesh = Mesh::default();
    for p in pts {
        mesh.vertices.push(Vertex { pos: *p, uv: WHITE_UV, color: c });
    }
    for t in triangulate(pts) {
        mesh.add_triangle(t[0] as u32, t[1] as u32, t[2] as u32);
    }
    out.push(Shape::mesh(mesh));
}

/// Shapes for the given items.
pub fn shapes(items: &[Item], which: &[u32], t: &MmToScreen, out: &mut Vec<Shape>) {
    for &i in which {
        let Some(item) = items.get(i as usize) else { continue };
        match item {
            Item::Rect { rect, fill, stroke: s } => {
                let r =
                    egui::Rect::from_min_max(t.pos(rect.x, rect.y), t.pos(rect.x + rect.w, rect.y + rect.h));
                if let Some(f) = fill {
                    out.push(Shape::rect_filled(r, 0.0, color(*f)));
                }
                if let Some(s) = s {
                    out.push(Shape::rect_stroke(r, 0.0, stroke(s, t.zoom), egui::StrokeKind::Middle));
                }
            }
            Item::Polygon { points, fill, stroke: s } => {
                let pts: Vec<Pos2> = points.iter().map(|p| t.pt(*p)).collect();
                if let Some(f) = fill {
                    fill_polygon(&pts, color(*f), out);
                }
                if let Some(s) = s {
                    let mut closed = pts;
                    if let Some(first) = closed.first().copied() {
                        closed.push(first);
                    }
                    line(closed, s, t.zoom, out);
                }
            }
            Item::Polyline { points, stroke: s } => {
                line(points.iter().map(|p| t.pt(*p)).collect(), s, t.zoom, out);
            }
            Item::Circle { center, radius_mm, fill, stroke: s } => {
                let c = t.pt(*center);
                let r = *radius_mm as f32 * t.zoom;
                let st = s.as_ref().map(|s| stroke(s, t.zoom)).unwrap_or(egui::Stroke::NONE);
                out.push(Shape::circle_filled(c, r, fill.map(color).unwrap_or(Color32::TRANSPARENT)));
                if st.width > 0.0 {
                    out.push(Shape::circle_stroke(c, r, st));
                }
            }
            Item::Text { .. } => {}
        }
    }
}

/// Text items are drawn through the painter (they need the font system).
pub fn texts(items: &[Item], which: &[u32], t: &MmToScreen, painter: &egui::Painter) {
    for &i in which {
        if let Some(Item::Text { pos, text, size_pt, color: c, anchor, .. }) = items.get(i as usize) {
            // Text height in points at this zoom (1 pt of type = 0.3528 mm); too small to read is
            // left out rather than drawn as a smudge.
            let raw = *size_pt as f32 * 0.3528 * t.zoom;
            if raw < 3.5 {
                continue;
            }
            let size = raw.clamp(6.0, 28.0);
            let align = match anchor {
                Anchor::Start => egui::Align2::LEFT_BOTTOM,
                Anchor::Middle => egui::Align2::CENTER_BOTTOM,
                Anchor::End => egui::Align2::RIGHT_BOTTOM,
            };
            painter.text(t.pt(*pos), align, text, egui::FontId::proportional(size), color(*c));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::layout::RectMm;

    fn rect(y: f64, h: f64) -> Item {
        Item::Rect { rect: RectMm { x: 0.0, y, w: 5.0, h }, fill: None, stroke: None }
    }

    #[test]
    fn index_returns_exactly_the_overlapping_items_once() {
        let items = vec![rect(0.0, 10.0), rect(50.0, 10.0), rect(0.0, 500.0), rect(300.0, 5.0)];
        let mut idx = ItemIndex::build(&items, 600.0);
        assert_eq!(idx.visible(45.0, 70.0), vec![1, 2]);
        assert_eq!(idx.visible(0.0, 5.0), vec![0, 2]);
        assert_eq!(idx.visible(290.0, 310.0), vec![2, 3]);
        assert_eq!(idx.visible(550.0, 590.0), Vec::<u32>::new());
    }

    #[test]
    fn ear_clipping_covers_a_concave_outline_exactly() {
        // An L shape of area 3 (three unit squares); triangles must add up to it.
        let l = [(0.0, 0.0), (2.0, 0.0), (2.0, 1.0), (1.0, 1.0), (1.0, 2.0), (0.0, 2.0)]
            .map(|(x, y)| Pos2::new(x, y));
        let tris = triangulate(&l);
        assert_eq!(tris.len(), 4);
        let area: f32 = tris.iter().map(|t| signed_area2(&[l[t[0]], l[t[1]], l[t[2]]]).abs() / 2.0).sum();
        assert!((area - 3.0).abs() < 1e-5, "{area}");
    }

    #[test]
    fn mm_to_screen_inverts() {
        let t = MmToScreen { origin: Pos2::new(10.0, -200.0), zoom: 3.0 };
        let p = t.pos(4.0, 100.0);
        assert_eq!(p, Pos2::new(22.0, 100.0));
        assert!((t.y_mm(p.y) - 100.0).abs() < 1e-4);
        assert!((t.x_mm(p.x) - 4.0).abs() < 1e-4);
    }
}
