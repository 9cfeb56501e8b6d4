//! PNG writer: rasterises one layout page item by item with tiny-skia at a chosen resolution.
//!
//! Like the PDF and SVG writers it makes no drawing decision: millimetres on the page become
//! pixels at `dpi / 25.4` pixels per millimetre, so a length on the page is the same length on
//! paper when the image is printed at its dpi (written into the file's `pHYs` chunk). Text is
//! drawn from the embedded DejaVu Sans outlines (through skrifa) with the layout's own advance
//! widths, so labels sit where the PDF puts them.

use crate::layout::{metrics, DEJAVU_SANS, MM_PER_PT};
use crate::layout::{Anchor, Item, Page, PtMm, Rgba, Stroke};
use skrifa::instance::{LocationRef, Size};
use skrifa::outline::{DrawSettings, OutlinePen};
use skrifa::{FontRef, GlyphId, MetadataProvider};
use thiserror::Error;
use tiny_skia::{FillRule, LineCap, LineJoin, Paint, PathBuilder, Pixmap, Transform};

/// The resolutions the writer accepts (dots per inch).
pub const DPI_RANGE: std::ops::RangeInclusive<f64> = 10.0..=1200.0;

/// Largest raster the writer makes (pixels), so a tall column at a high dpi cannot exhaust memory.
pub const MAX_PNG_PIXELS: u64 = 400_000_000;

/// Why a page cannot be rasterised.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum PngError {
    #[error("--dpi {0} is outside 10 … 1200")]
    Dpi(f64),
    #[error("the page would be {width} × {height} pixels at {dpi} dpi, more than {MAX_PNG_PIXELS}: lower the dpi or print a smaller scale")]
    TooLarge { width: u64, height: u64, dpi: f64 },
    #[error("cannot encode the PNG: {0}")]
    Encode(String),
}

/// Pixels per millimetre at a resolution.
pub fn px_per_mm(dpi: f64) -> f64 {
    dpi / 25.4
}

fn paint(c: Rgba) -> Paint<'static> {
    let mut p = Paint::default();
    p.set_color_rgba8(c.0, c.1, c.2, c.3);
    p.anti_alias = true;
    p
}

fn stroke_of(s: &Stroke, k: f64) -> Option<tiny_skia::Stroke> {
    if s.color.3 == 0 || s.width_mm <= 0.0 {
        return None;
    }
    let mut st = tiny_skia::Stroke {
        width: (s.width_mm * k) as f32,
        line_cap: LineCap::Butt,
        line_join: LineJoin::Miter,
        ..Default::default()
    };
    if s.dash_mm.iter().any(|d| *d > 0.0) {
        let mut d: Vec<f32> = s.dash_mm.iter().map(|d| (d.max(0.0) * k) as f32).collect();
        if d.len() % 2 == 1 {
            d.extend_from_within(..);
        }
        st.dash = tiny_skia::StrokeDash::new(d, 0.0);
    }
    Some(st)
}

fn poly(points: &[PtMm], k: f64, close: bool) -> Option<tiny_skia::Path> {
    let mut pb = PathBuilder::new();
    let mut it = points.iter();
    let first = it.next()?;
    pb.move_to((first.x * k) as f32, (first.y * k) as f32);
    for p in it {
        pb.line_to((p.x * k) as f32, (p.y * k) as f32);
    }
    if close {
        pb.close();
    }
    pb.finish()
}

/// Collects a glyph outline into a tiny-skia path.
struct Pen(PathBuilder);

impl OutlinePen for Pen {
    fn move_to(&mut self, x: f32, y: f32) {
        self.0.move_to(x, y);
    }
    fn line_to(&mut self, x: f32, y: f32) {
        self.0.line_to(x, y);
    }
    fn quad_to(&mut self, cx0: f32, cy0: f32, x: f32, y: f32) {
        self.0.quad_to(cx0, cy0, x, y);
    }
    fn curve_to(&mut self, cx0: f32, cy0: f32, cx1: f32, cy1: f32, x: f32, y: f32) {
        self.0.cubic_to(cx0, cy0, cx1, cy1, x, y);
    }
    fn close(&mut self) {
        self.0.close();
    }
}

struct Text<'a> {
    pos: PtMm,
    text: &'a str,
    size_pt: f64,
    color: Rgba,
    anchor: Anchor,
    rotation_deg: f64,
}

fn draw_text(pixmap: &mut Pixmap, font: &FontRef, t: &Text, k: f64) {
    let m = metrics();
    let size_mm = t.size_pt * MM_PER_PT;
    let width = m.text_width_mm(t.text, t.size_pt);
    let mut x = match t.anchor {
        Anchor::Start => 0.0,
        Anchor::Middle => -width / 2.0,
        Anchor::End => -width,
    };
    // Text space: x along the baseline, y up, in mm; turned counter-clockwise on the page.
    let (c, s) = (t.rotation_deg.to_radians().cos(), t.rotation_deg.to_radians().sin());
    let outlines = font.outline_glyphs();
    let paint = paint(t.color);
    let mut buf = [0u8; 4];
    for ch in t.text.chars() {
        let advance = m.text_width_mm(ch.encode_utf8(&mut buf), t.size_pt);
        if let Some(glyph) = outlines.get(GlyphId::new(u32::from(m.glyph_id(ch)))) {
            let mut pen = Pen(PathBuilder::new());
            let settings = DrawSettings::unhinted(Size::new(size_mm as f32), LocationRef::default());
            if glyph.draw(settings, &mut pen).is_ok() {
                if let Some(path) = pen.0.finish() {
                    let (ox, oy) = (t.pos.x + x * c, t.pos.y - x * s);
                    let tr = Transform::from_row(
                        (k * c) as f32,
                        (-k * s) as f32,
                        (-k * s) as f32,
                        (-k * c) as f32,
                        (ox * k) as f32,
                        (oy * k) as f32,
                    );
                    pixmap.fill_path(&path, &paint, FillRule::Winding, tr, None);
                }
            }
        }
        x += advance;
    }
}

/// Rasterise one page at `dpi` into a pixmap (white background).
pub fn rasterise(page: &Page, dpi: f64) -> Result<Pixmap, PngError> {
    if !(dpi.is_finite() && DPI_RANGE.contains(&dpi)) {
        return Err(PngError::Dpi(dpi));
    }
    let k = px_per_mm(dpi);
    let (w, h) = ((page.width_mm * k).ceil().max(1.0) as u64, (page.height_mm * k).ceil().max(1.0) as u64);
    if w * h > MAX_PNG_PIXELS {
        return Err(PngError::TooLarge { width: w, height: h, dpi });
    }
    let mut pixmap =
        Pixmap::new(w as u32, h as u32).ok_or(PngError::TooLarge { width: w, height: h, dpi })?;
    pixmap.fill(tiny_skia::Color::WHITE);
    let font = FontRef::new(DEJAVU_SANS).map_err(|e| PngError::Encode(e.to_string()))?;
    let id = Transform::identity();
    for item in &page.items {
        let (path, fill, stroke) = match item {
            Item::Rect { rect, fill, stroke } => {
                let r = tiny_skia::Rect::from_xywh(
                    (rect.x * k) as f32,
                    (rect.y * k) as f32,
                    (rect.w.max(0.0) * k) as f32,
                    (rect.h.max(0.0) * k) as f32,
                );
                (r.map(PathBuilder::from_rect), *fill, stroke.as_ref())
            }
            Item::Polygon { points, fill, stroke } => (poly(points, k, true), *fill, stroke.as_ref()),
            Item::Polyline { points, stroke } => (poly(points, k, false), None, Some(stroke)),
            Item::Circle { center, radius_mm, fill, stroke } => (
                PathBuilder::from_circle(
                    (center.x * k) as f32,
                    (center.y * k) as f32,
                    (radius_mm.max(0.0) * k) as f32,
                ),
                *fill,
                stroke.as_ref(),
            ),
            Item::Text { pos, text, size_pt, color, anchor, rotation_deg } => {
                let t = Text {
                    pos: *pos,
                    text,
                    size_pt: *size_pt,
                    color: *color,
                    anchor: *anchor,
                    rotation_deg: *rotation_deg,
                };
                draw_text(&mut pixmap, &font, &t, k);
                continue;
            }
        };
        let Some(path) = path else { continue };
        if let Some(c) = fill.filter(|c| c.3 > 0) {
            pixmap.fill_path(&path, &paint(c), FillRule::Winding, id, None);
        }
        if let Some((s, st)) = stroke.and_then(|s| stroke_of(s, k).map(|st| (s, st))) {
            pixmap.stroke_path(&path, &paint(s.color), &st, id, None);
        }
    }
    Ok(pixmap)
}

/// Rasterise one page at `dpi` and encode it as a PNG (8-bit RGB) whose `pHYs` chunk records the
/// resolution, so image programs print it at true scale.
pub fn write_png(page: &Page, dpi: f64) -> Result<Vec<u8>, PngError> {
    let pixmap = rasterise(page, dpi)?;
    // The background is opaque white, so premultiplied and straight colour are the same.
    let rgb: Vec<u8> = pixmap.data().chunks_exact(4).flat_map(|p| [p[0], p[1], p[2]]).collect();
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, pixmap.width(), pixmap.height());
        enc.set_color(png::ColorType::Rgb);
        enc.set_depth(png::BitDepth::Eight);
        // Pixels per metre, rounded (the chunk holds whole numbers).
        let ppm = (dpi / 0.0254).round() as u32;
        enc.set_pixel_dims(Some(png::PixelDimensions { xppu: ppm, yppu: ppm, unit: png::Unit::Meter }));
        let mut w = enc.write_header().map_err(|e| PngError::Encode(e.to_string()))?;
        w.write_image_data(&rgb).map_err(|e| PngError::Encode(e.to_string()))?;
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::RectMm;

    #[test]
    fn a_rectangle_lands_on_the_pixels_its_millimetres_give() {
        // A black 10 mm × 20 mm box at (5 mm, 5 mm) on a 30 × 40 mm page at 254 dpi (10 px/mm).
        let page = Page {
            width_mm: 30.0,
            height_mm: 40.0,
            items: vec![Item::Rect {
                rect: RectMm { x: 5.0, y: 5.0, w: 10.0, h: 20.0 },
                fill: Some(Rgba::BLACK),
                stroke: None,
            }],
            segments: Vec::new(),
        };
        let pm = rasterise(&page, 254.0).expect("rasterises");
        assert_eq!((pm.width(), pm.height()), (300, 400));
        let dark = |x: u32, y: u32| pm.pixel(x, y).map(|p| p.red() < 128).unwrap_or(false);
        assert!(dark(50, 50) && dark(149, 249) && !dark(49, 50) && !dark(150, 50) && !dark(50, 250));
        assert_eq!(rasterise(&page, 5.0).err(), Some(PngError::Dpi(5.0)));
    }

    #[test]
    fn text_puts_ink_where_the_layout_measures_it() {
        let label = Item::Text {
            pos: PtMm { x: 5.0, y: 12.0 },
            text: "Sandstone".into(),
            size_pt: 12.0,
            color: Rgba::BLACK,
            anchor: Anchor::Start,
            rotation_deg: 0.0,
        };
        let width_px = label.bounds().w * 10.0;
        let page = Page { width_mm: 60.0, height_mm: 20.0, items: vec![label], segments: Vec::new() };
        let pm = rasterise(&page, 254.0).expect("rasterises");
        let (mut x0, mut x1, mut y0, mut y1) = (u32::MAX, 0, u32::MAX, 0);
        for y in 0..pm.height() {
            for x in 0..pm.width() {
                if pm.pixel(x, y).map(|p| p.red() < 128).unwrap_or(false) {
                    (x0, x1, y0, y1) = (x0.min(x), x1.max(x), y0.min(y), y1.max(y));
                }
            }
        }
        // Ink starts near the pen position (a glyph's left side bearing is a fraction of a mm),
        // spans about the measured advance width, and sits on the baseline (12 mm = 120 px).
        assert!((50..=60).contains(&x0), "x0 {x0}");
        assert!((f64::from(x1 - x0) - width_px).abs() < 15.0, "ink {} px vs {width_px} px", x1 - x0);
        assert!((118..=122).contains(&y1) && y0 < 90, "y {y0}..{y1}");
    }
}
