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
    Rect { rect: RectMm, fill: Option<Rgba>, stroke: Option<Stroke> },
    Polygon { points: Vec<PtMm>, fill: Option<Rgba>, stroke: Option<Stroke> },
    Polyline { points: Vec<PtMm>, stroke: Stroke },
    Circle { center: PtMm, radius_mm: f64, fill: Option<Rgba>, stroke: Option<Stroke> },
    Text { pos: PtMm, text: String, size_pt: f64, color: Rgba, anchor: Anchor, rotation_deg: f64 },
}
