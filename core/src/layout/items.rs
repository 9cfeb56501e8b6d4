//! Positioned drawing items: the one model the screen, the PDF and the SVG all draw from.
//!
//! Coordinates are millimetres on the page (or column strip), origin top-left, y down. Pattern
//! fills are already clipped to their bed by the layout, so writers only translate items.

use serde::Serialize;

/// A point in millimetres, y down.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct PtMm {
    pub x: f64,
    pub y: f64,
}

/// An axis-aligned rectangle in millimetres (top-left corner plus size).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RectMm {
    pub x: f64,
    pub y: f64,
    pub w: f64,
    pub h: f64,
}

/// sRGB colour with alpha.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub struct Rgba(pub u8, pub u8, pub u8, pub u8);

impl Rgba {
    pub const BLACK: Rgba = Rgba(0, 0, 0, 255);
    pub const WHITE: Rgba = Rgba(255, 255, 255, 255);
}

/// Line style.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Stroke {
    pub width_mm: f64,
    pub color: Rgba,
    /// Dash pattern (on, off, …) in mm; empty for a solid line.
    pub dash_mm: Vec<f64>,
}

/// Horizontal anchoring of text at its position (the position is on the text's baseline).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Anchor {
    Start,
    Middle,
    End,
}

/// One drawing primitive.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum Item {
    Rect {
        rect: RectMm,
        fill: Option<Rgba>,
        stroke: Option<Stroke>,
    },
    Polygon {
        points: Vec<PtMm>,
        fill: Option<Rgba>,
        stroke: Option<Stroke>,
    },
    Polyline {
        points: Vec<PtMm>,
        stroke: Stroke,
    },
    Circle {
        center: PtMm,
        radius_mm: f64,
        fill: Option<Rgba>,
        stroke: Option<Stroke>,
    },
    /// Text in the embedded font (DejaVu Sans). `pos` is on the baseline; `rotation_deg` turns
    /// the text counter-clockwise as seen on the page (90 reads bottom to top) about `pos`.
    Text {
        pos: PtMm,
        text: String,
        size_pt: f64,
        color: Rgba,
        anchor: Anchor,
        rotation_deg: f64,
    },
}

impl Stroke {
    /// A solid line.
    pub fn solid(width_mm: f64, color: Rgba) -> Self {
        Stroke { width_mm, color, dash_mm: Vec::new() }
    }
}

impl RectMm {
    /// True when the point lies inside or on the rectangle.
    pub fn contains(&self, p: PtMm) -> bool {
        p.x >= self.x && p.x <= self.x + self.w && p.y >= self.y && p.y <= self.y + self.h
    }
}

impl Item {
    /// Bounding box (mm) of the item, including half its stroke width; for text, the box of its
    /// glyphs in the embedded font (rotation taken into account). Used to draw only what is visible.
    pub fn bounds(&self) -> RectMm {
        fn of(points: impl Iterator<Item = PtMm>, pad: f64) -> RectMm {
            let (mut x0, mut y0, mut x1, mut y1) =
                (f64::INFINITY, f64::INFINITY, f64::NEG_INFINITY, f64::NEG_INFINITY);
            for p in points {
                x0 = x0.min(p.x);
                y0 = y0.min(p.y);
                x1 = x1.max(p.x);
                y1 = y1.max(p.y);
            }
            if x0 > x1 {
                return RectMm { x: 0.0, y: 0.0, w: 0.0, h: 0.0 };
            }
            RectMm { x: x0 - pad, y: y0 - pad, w: x1 - x0 + 2.0 * pad, h: y1 - y0 + 2.0 * pad }
        }
        let half = |s: &Option<Stroke>| s.as_ref().map(|s| s.width_mm / 2.0).unwrap_or(0.0);
        match self {
            Item::Rect { rect, stroke, .. } => {
                let p = half(stroke);
                RectMm { x: rect.x - p, y: rect.y - p, w: rect.w + 2.0 * p, h: rect.h + 2.0 * p }
            }
            Item::Polygon { points, stroke, .. } => of(points.iter().copied(), half(stroke)),
            Item::Polyline { points, stroke } => of(points.iter().copied(), stroke.width_mm / 2.0),
            Item::Circle { center, radius_mm, stroke, .. } => {
                let r = radius_mm + half(stroke);
                RectMm { x: center.x - r, y: center.y - r, w: 2.0 * r, h: 2.0 * r }
            }
            Item::Text { pos, text, size_pt, anchor, rotation_deg, .. } => {
                let m = super::font::metrics();
                let w = m.text_width_mm(text, *size_pt);
                let (asc, desc) = (m.ascent_mm(*size_pt), m.descent_mm(*size_pt));
                let start = match anchor {
                    Anchor::Start => 0.0,
                    Anchor::Middle => -w / 2.0,
                    Anchor::End => -w,
                };
                // Corners in text space (x along the baseline, y up), rotated counter-clockwise
                // on the page, then flipped to y down.
                let a = rotation_deg.to_radians();
                let (c, s) = (a.cos(), a.sin());
                let corners = [(start, -desc), (start + w, -desc), (start + w, asc), (start, asc)];
                of(
                    corners
                        .iter()
                        .map(|&(u, v)| PtMm { x: pos.x + u * c - v * s, y: pos.y - (u * s + v * c) }),
                    0.0,
                )
            }
        }
    }
}
