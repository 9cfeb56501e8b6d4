//! One page's items as a PDF content stream (ISO 32000-1 §8–9 operators), written straight to
//! bytes. The stream starts by setting the coordinate system to the layout's own (millimetres from
//! the top left, y down), so items are written in their own numbers; text anchoring is the only
//! other thing that happens here.
//!
//! Text is shown in the embedded font through the Identity-H encoding, each character as its glyph
//! index in DejaVu Sans (two bytes); the glyphs a page uses are reported so the document's font
//! can be subset to them once, at the end.

use crate::layout::{metrics, text_width_mm};
use crate::layout::{Anchor, Item, Page, PtMm, RectMm, Rgba, Stroke};
use std::collections::BTreeMap;

/// PostScript points per millimetre.
pub(super) const PT_PER_MM: f64 = 72.0 / 25.4;

/// Bezier handle length for a quarter circle (4/3·(√2 − 1)).
const KAPPA: f64 = 0.552_284_749_830_793_4;

/// Resource name of the embedded font on every page.
pub(super) const FONT_RESOURCE: &str = "F1";

/// Append a number with at most `decimals` decimals (trailing zeros dropped; `-0` is `0`; a
/// non-finite value, which the layout never gives, is written as `0` so the file stays valid).
#[inline]
pub(super) fn num(out: &mut Vec<u8>, v: f64, decimals: u32) {
    write_num(out, v, decimals, None);
}

/// [`num`], then `suffix`, built on the stack and appended in one copy (numbers are most of a
/// content stream). Inlined, so each call's `decimals` is a constant and its divisions are cheap.
#[inline(always)]
fn write_num(out: &mut Vec<u8>, v: f64, decimals: u32, suffix: Option<u8>) {
    let scale = 10_u64.pow(decimals);
    let scaled = v * scale as f64;
    let mut buf = [0u8; 32];
    let mut k = buf.len();
    if let Some(c) = suffix {
        k -= 1;
        buf[k] = c;
    }
    // Round half away from zero (a cast truncates toward zero); NaN fails the comparison.
    let a = if scaled.abs() < 9.0e18 { (scaled.abs() + 0.5) as u64 } else { 0 };
    let (mut int, mut frac) = (a / scale, a % scale);
    if frac != 0 {
        let mut digits = decimals;
        while frac % 10 == 0 {
            frac /= 10;
            digits -= 1;
        }
        for _ in 0..digits {
            k -= 1;
            buf[k] = b'0' + (frac % 10) as u8;
            frac /= 10;
        }
        k -= 1;
        buf[k] = b'.';
    }
    loop {
        k -= 1;
        buf[k] = b'0' + (int % 10) as u8;
        int /= 10;
        if int == 0 {
            break;
        }
    }
    if a != 0 && scaled < 0.0 {
        k -= 1;
        buf[k] = b'-';
    }
    out.extend_from_slice(&buf[k..]);
}

/// Append an unsigned integer in decimal.
pub(super) fn uint(out: &mut Vec<u8>, mut v: u64) {
    let mut buf = [0u8; 20];
    let mut k = buf.len();
    loop {
        k -= 1;
        buf[k] = b'0' + (v % 10) as u8;
        v /= 10;
        if v == 0 {
            break;
        }
    }
    out.extend_from_slice(&buf[k..]);
}

/// Coordinates and lengths, in mm: 0.01 mm (10 µm) is a quarter of a 600 dpi printer's dot.
fn coord(out: &mut Vec<u8>, v: f64) {
    write_num(out, v, 2, Some(b' '));
}

/// A paint is drawn unless it is fully transparent (partial alpha is printed opaque).
fn visible(c: &Rgba) -> bool {
    c.3 > 0
}

/// How a path is painted (nonzero winding rule).
#[derive(Clone, Copy)]
enum Paint {
    Fill,
    Stroke,
    FillStroke,
}

impl Paint {
    fn op(self) -> &'static [u8] {
        match self {
            Paint::Fill => b"f\n",
            Paint::Stroke => b"S\n",
            Paint::FillStroke => b"B\n",
        }
    }
}

/// The graphics state a piece of a page's content leaves set (colours, line width, dash).
#[derive(Debug, Clone, Default)]
pub(super) struct PenState {
    fill: Option<Rgba>,
    stroke_color: Option<Rgba>,
    width_mm: Option<f64>,
    dash: Option<Vec<f64>>,
}

/// Translates one page's items into content-stream bytes, tracking the graphics state so that
/// repeats of a colour, width or dash are not written again.
pub(super) struct ContentWriter<'g> {
    out: Vec<u8>,
    fill: Option<Rgba>,
    stroke_color: Option<Rgba>,
    width_mm: Option<f64>,
    dash: Option<Vec<f64>>,
    /// Glyphs shown, with the character each one stands for (the first seen).
    glyphs: &'g mut BTreeMap<u16, char>,
}

impl<'g> ContentWriter<'g> {
    /// A writer for `page`'s content that writes into `buf` (emptied first, so one buffer can
    /// serve page after page).
    pub(super) fn new(page: &Page, mut buf: Vec<u8>, glyphs: &'g mut BTreeMap<u16, char>) -> Self {
        buf.reserve(page.items.len() * 40 + 256);
        Self::start(page.height_mm, buf, glyphs)
    }

    /// The first piece of a page `height_mm` tall whose items come in pieces
    /// ([`ContentWriter::items`], then [`ContentWriter::pause`] and [`ContentWriter::resume`]).
    pub(super) fn start(height_mm: f64, mut buf: Vec<u8>, glyphs: &'g mut BTreeMap<u16, char>) -> Self {
        buf.clear();
        let mut w = Self::resume(PenState::default(), buf, glyphs);
        // The layout's coordinates: x right and y down from the top left corner, in mm
        // (ISO 32000-1 §8.3.4: the `cm` operator sets the current transformation matrix).
        num(&mut w.out, PT_PER_MM, 8);
        w.out.extend_from_slice(b" 0 0 ");
        num(&mut w.out, -PT_PER_MM, 8);
        w.out.extend_from_slice(b" 0 ");
        num(&mut w.out, height_mm * PT_PER_MM, 6);
        w.out.extend_from_slice(b" cm\n");
        w
    }

    /// Carry on a page's content, appending to `buf`, with the
    /// graphics state the earlier pieces left: a page's content streams are read as one
    /// (ISO 32000-1 §7.7.3.3, `Contents` as an array), so what is set stays set.
    pub(super) fn resume(state: PenState, buf: Vec<u8>, glyphs: &'g mut BTreeMap<u16, char>) -> Self {
        let PenState { fill, stroke_color, width_mm, dash } = state;
        ContentWriter { out: buf, fill, stroke_color, width_mm, dash, glyphs }
    }

    /// The content written so far and the graphics state it leaves.
    pub(super) fn pause(self) -> (Vec<u8>, PenState) {
        let ContentWriter { out, fill, stroke_color, width_mm, dash, .. } = self;
        (out, PenState { fill, stroke_color, width_mm, dash })
    }

    /// Translate the next items of the page.
    pub(super) fn items(&mut self, items: &[Item]) {
        for item in items {
            self.item(item);
        }
    }

    /// Bytes written so far.
    pub(super) fn len(&self) -> usize {
        self.out.len()
    }

    /// The content stream of a whole page.
    pub(super) fn page(mut self, page: &Page) -> Vec<u8> {
        for item in &page.items {
            self.item(item);
        }
        self.out
    }

    /// A point on the page, mm from the top left.
    fn point(&mut self, p: PtMm) {
        coord(&mut self.out, p.x);
        coord(&mut self.out, p.y);
    }

    fn rgb(&mut self, c: Rgba) {
        for v in [c.0, c.1, c.2] {
            // Four decimals: within 0.00005 of the 8-bit value.
            write_num(&mut self.out, f64::from(v) / 255.0, 4, Some(b' '));
        }
    }

    fn set_fill(&mut self, c: Rgba) {
        if self.fill != Some(c) {
            self.rgb(c);
            self.out.extend_from_slice(b"rg\n");
            self.fill = Some(c);
        }
    }

    fn set_stroke(&mut self, s: &Stroke) {
        if self.stroke_color != Some(s.color) {
            self.rgb(s.color);
            self.out.extend_from_slice(b"RG\n");
            self.stroke_color = Some(s.color);
        }
        if self.width_mm != Some(s.width_mm) {
            coord(&mut self.out, s.width_mm.max(0.0));
            self.out.extend_from_slice(b"w\n");
            self.width_mm = Some(s.width_mm);
        }
        if self.dash.as_ref() != Some(&s.dash_mm) {
            self.out.push(b'[');
            if s.dash_mm.iter().any(|d| *d > 0.0) {
                for d in &s.dash_mm {
                    coord(&mut self.out, d.max(0.0));
                }
            }
            self.out.extend_from_slice(b"] 0 d\n");
            self.dash = Some(s.dash_mm.clone());
        }
    }

    /// Set state for a fill/stroke pair; returns how to paint, or `None` if nothing shows.
    fn paint(&mut self, fill: &Option<Rgba>, stroke: &Option<Stroke>) -> Option<Paint> {
        let fill = fill.filter(visible);
        let stroke = stroke.as_ref().filter(|s| visible(&s.color) && s.width_mm > 0.0);
        if let Some(c) = fill {
            self.set_fill(c);
        }
        if let Some(s) = stroke {
            self.set_stroke(s);
        }
        match (fill.is_some(), stroke.is_some()) {
            (true, true) => Some(Paint::FillStroke),
            (true, false) => Some(Paint::Fill),
            (false, true) => Some(Paint::Stroke),
            (false, false) => None,
        }
    }

    /// A path through `points`: moveto, then lineto for the rest; closed if asked.
    fn path(&mut self, points: &[PtMm], close: bool) {
        for (k, p) in points.iter().enumerate() {
            self.point(*p);
            self.out.extend_from_slice(if k == 0 { b"m\n" } else { b"l\n" });
        }
        if close {
            self.out.extend_from_slice(b"h\n");
        }
    }

    fn item(&mut self, item: &Item) {
        match item {
            Item::Rect { rect, fill, stroke } => {
                let Some(mode) = self.paint(fill, stroke) else { return };
                let RectMm { x, y, w, h } = *rect;
                for v in [x, y, w, h] {
                    coord(&mut self.out, v);
                }
                self.out.extend_from_slice(b"re\n");
                self.out.extend_from_slice(mode.op());
            }
            Item::Polygon { points, fill, stroke } => {
                if points.len() < 2 {
                    return;
                }
                let Some(mode) = self.paint(fill, stroke) else { return };
                self.path(points, true);
                self.out.extend_from_slice(mode.op());
            }
            Item::Polyline { points, stroke } => {
                if points.len() < 2 || !visible(&stroke.color) || stroke.width_mm <= 0.0 {
                    return;
                }
                self.set_stroke(stroke);
                self.path(points, false);
                self.out.extend_from_slice(b"S\n");
            }
            Item::Circle { center, radius_mm, fill, stroke } => {
                let r = *radius_mm;
                if r.is_nan() || r <= 0.0 {
                    return;
                }
                let Some(mode) = self.paint(fill, stroke) else { return };
                let (cx, cy, k) = (center.x, center.y, r * KAPPA);
                let p = |x: f64, y: f64| PtMm { x: cx + x, y: cy + y };
                // Four cubic arcs, each: two handles and its end point.
                self.point(p(r, 0.0));
                self.out.extend_from_slice(b"m\n");
                let arcs = [
                    [p(r, k), p(k, r), p(0.0, r)],
                    [p(-k, r), p(-r, k), p(-r, 0.0)],
                    [p(-r, -k), p(-k, -r), p(0.0, -r)],
                    [p(k, -r), p(r, -k), p(r, 0.0)],
                ];
                for arc in arcs {
                    for q in arc {
                        self.point(q);
                    }
                    self.out.extend_from_slice(b"c\n");
                }
                self.out.extend_from_slice(b"h\n");
                self.out.extend_from_slice(mode.op());
            }
            Item::Text { pos, text, size_pt, color: c, anchor, rotation_deg } => {
                if text.is_empty() || !visible(c) || size_pt.is_nan() || *size_pt <= 0.0 {
                    return;
                }
                let w = text_width_mm(text, *size_pt);
                let shift = match anchor {
                    Anchor::Start => 0.0,
                    Anchor::Middle => -w / 2.0,
                    Anchor::End => -w,
                };
                // Quarter turns exactly (the column's titles stand at 90°).
                let r = *rotation_deg;
                let (cos, sin) = if r == 0.0 {
                    (1.0, 0.0)
                } else if r == 90.0 {
                    (0.0, 1.0)
                } else if r == -90.0 || r == 270.0 {
                    (0.0, -1.0)
                } else {
                    (r.to_radians().cos(), r.to_radians().sin())
                };
                // Anchor shift runs along the baseline, which points (cos, −sin) on a y-down page.
                let start = PtMm { x: pos.x + shift * cos, y: pos.y - shift * sin };
                self.set_fill(*c);
                self.out.extend_from_slice(b"BT\n/");
                self.out.extend_from_slice(FONT_RESOURCE.as_bytes());
                self.out.push(b' ');
                num(&mut self.out, *size_pt, 3);
                self.out.extend_from_slice(b" Tf\n");
                // Text space is in points with y up: undo the page's mm scale and y flip, then
                // turn by the rotation (counter-clockwise on the page).
                let k = 1.0 / PT_PER_MM;
                for v in [cos * k, -sin * k, -sin * k, -cos * k] {
                    write_num(&mut self.out, v, 6, Some(b' '));
                }
                self.point(start);
                self.out.extend_from_slice(b"Tm\n<");
                let m = metrics();
                for ch in text.chars() {
                    let g = m.glyph_id(ch);
                    self.glyphs.entry(g).or_insert(ch);
                    hex16(&mut self.out, g);
                }
                self.out.extend_from_slice(b"> Tj\nET\n");
            }
        }
    }
}

/// Append four upper-case hex digits.
pub(super) fn hex16(out: &mut Vec<u8>, v: u16) {
    const HEX: &[u8; 16] = b"0123456789ABCDEF";
    for shift in [12, 8, 4, 0] {
        out.push(HEX[usize::from((v >> shift) & 0xF)]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn n(v: f64, d: u32) -> String {
        let mut out = Vec::new();
        num(&mut out, v, d);
        String::from_utf8(out).expect("ascii")
    }

    #[test]
    fn numbers_are_short_and_exact_to_their_decimals() {
        assert_eq!(n(0.0, 3), "0");
        assert_eq!(n(-0.0001, 3), "0");
        assert_eq!(n(1.0, 3), "1");
        assert_eq!(n(595.2755905, 3), "595.276");
        assert_eq!(n(-12.5, 3), "-12.5");
        assert_eq!(n(0.05, 3), "0.05");
        assert_eq!(n(0.007, 3), "0.007");
        assert_eq!(n(1e6 + 0.25, 3), "1000000.25");
        assert_eq!(n(f64::NAN, 3), "0");
        assert_eq!(n(f64::INFINITY, 3), "0");
        assert_eq!(n(102.0 / 255.0, 4), "0.4");
        assert_eq!(n(1.0 / 3.0, 4), "0.3333");
        // Every value round-trips to within half a unit of its last decimal.
        for k in -2000..2000 {
            let v = f64::from(k) * 0.37719;
            let back: f64 = n(v, 3).parse().expect("parses");
            assert!((back - v).abs() <= 0.0005 + 1e-12, "{v} -> {back}");
        }
    }

    #[test]
    fn items_become_operators() {
        let page = Page {
            width_mm: 100.0,
            height_mm: 100.0,
            items: vec![
                Item::Rect {
                    rect: RectMm { x: 0.0, y: 0.0, w: 25.4, h: 25.4 },
                    fill: Some(Rgba(255, 0, 0, 255)),
                    stroke: None,
                },
                Item::Text {
                    pos: PtMm { x: 0.0, y: 100.0 },
                    text: "Aφ".into(),
                    size_pt: 10.0,
                    color: Rgba::BLACK,
                    anchor: Anchor::Start,
                    rotation_deg: 0.0,
                },
                // Invisible: nothing written.
                Item::Rect { rect: RectMm { x: 1.0, y: 1.0, w: 1.0, h: 1.0 }, fill: None, stroke: None },
            ],
            segments: Vec::new(),
        };
        let mut glyphs = BTreeMap::new();
        let bytes = ContentWriter::new(&page, Vec::new(), &mut glyphs).page(&page);
        let s = String::from_utf8(bytes).expect("ascii");
        // Millimetres from the top left: 1 mm = 72/25.4 pt, the page's top at 100 mm = 283.465 pt.
        assert!(s.starts_with("2.83464567 0 0 -2.83464567 0 283.464567 cm\n"), "{s}");
        assert!(s.contains("1 0 0 rg\n0 0 25.4 25.4 re\nf\n"), "{s}");
        let (a, phi) = (metrics().glyph_id('A'), metrics().glyph_id('φ'));
        assert!(a != 0 && phi != 0, "DejaVu Sans has both glyphs");
        let mut hex = Vec::new();
        hex16(&mut hex, a);
        hex16(&mut hex, phi);
        let shown = format!("<{}> Tj", String::from_utf8(hex).expect("ascii"));
        assert!(s.contains(&shown), "{s}");
        // Text upright at 10 pt: the page's scale and flip undone (25.4/72 = 0.352778).
        assert!(s.contains("0 0 0 rg\nBT\n/F1 10 Tf\n0.352778 0 0 -0.352778 0 100 Tm\n"), "{s}");
        assert_eq!(glyphs.get(&phi), Some(&'φ'));
        assert_eq!(s.matches(" re\n").count(), 1, "the invisible rectangle is skipped");
    }
}
