//! SVG writer: translates one layout page item by item into an SVG document in millimetres.
//!
//! No drawing decision lives here; text uses the same embedded font family name (DejaVu Sans)
//! and the same left-anchored positions as the PDF.

use crate::layout::{Anchor, Item, Page, PtMm, Rgba, Stroke};
use std::fmt::Write;

/// Round to 3 decimals (µm) and drop trailing zeros, so output is compact and stable.
fn n(v: f64) -> String {
    if !v.is_finite() {
        return "0".into();
    }
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".into()
    } else {
        s.to_string()
    }
}

fn rgb(c: Rgba) -> String {
    format!("#{:02x}{:02x}{:02x}", c.0, c.1, c.2)
}

fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for ch in s.chars() {
        match ch {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && c != '\t' && c != '\n' => {}
            c => out.push(c),
        }
    }
    out
}

fn paint(fill: &Option<Rgba>, stroke: &Option<Stroke>) -> String {
    let mut a = String::new();
    match fill {
        Some(c) if c.3 > 0 => {
            let _ = write!(a, " fill=\"{}\"", rgb(*c));
            if c.3 < 255 {
                let _ = write!(a, " fill-opacity=\"{}\"", n(f64::from(c.3) / 255.0));
            }
        }
        _ => a.push_str(" fill=\"none\""),
    }
    if let Some(s) = stroke.as_ref().filter(|s| s.color.3 > 0 && s.width_mm > 0.0) {
        a.push_str(&stroke_attrs(s));
    }
    a
}

fn stroke_attrs(s: &Stroke) -> String {
    let mut a = format!(" stroke=\"{}\" stroke-width=\"{}\"", rgb(s.color), n(s.width_mm));
    if s.color.3 < 255 {
        let _ = write!(a, " stroke-opacity=\"{}\"", n(f64::from(s.color.3) / 255.0));
    }
    if s.dash_mm.iter().any(|d| *d > 0.0) {
        let d: Vec<String> = s.dash_mm.iter().map(|d| n(d.max(0.0))).collect();
        let _ = write!(a, " stroke-dasharray=\"{}\"", d.join(" "));
    }
    a
}

fn points(pts: &[PtMm]) -> String {
    pts.iter().map(|p| format!("{},{}", n(p.x), n(p.y))).collect::<Vec<_>>().join(" ")
}

/// Write one page as an SVG document whose user unit is 1 mm.
pub fn write_svg(page: &Page) -> String {
    let mut out = Vec::with_capacity(page.items.len() * 80 + 512);
    // Writing to memory cannot fail.
    let _ = write_svg_to(&mut out, page);
    // Every piece written is a `str`.
    String::from_utf8(out).unwrap_or_default()
}

/// [`write_svg`] to any writer, in pieces of about 64 KB, so a long page (one tall column) never
/// has its whole document in memory beside its items.
pub fn write_svg_to<W: std::io::Write>(out: W, page: &Page) -> std::io::Result<()> {
    let mut svg = SvgWriter::begin(out, page.width_mm, page.height_mm)?;
    svg.items(&page.items)?;
    svg.finish().map(drop)
}

/// Size of the pieces an [`SvgWriter`] hands to its writer, bytes.
const PIECE: usize = 64 * 1024;

/// An SVG document written as its items come: the page's size first, then items in any number
/// of batches (as [`crate::layout::PageStream::next_in_pieces`] draws them), then the end. The
/// text goes out in pieces of about 64 KB, so neither the document nor all the page's items
/// need be in memory.
pub struct SvgWriter<W: std::io::Write> {
    out: W,
    buf: String,
}

impl<W: std::io::Write> SvgWriter<W> {
    /// Start a document for a page `width_mm` × `height_mm` (user unit 1 mm, white paper).
    pub fn begin(out: W, width_mm: f64, height_mm: f64) -> std::io::Result<Self> {
        let mut s = String::with_capacity(PIECE + 1024);
        let (w, h) = (n(width_mm), n(height_mm));
        let _ = writeln!(s, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>");
        let _ = writeln!(
            s,
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}mm\" height=\"{h}mm\" viewBox=\"0 0 {w} {h}\" \
             font-family=\"DejaVu Sans, sans-serif\" stroke-linecap=\"butt\" stroke-linejoin=\"miter\">"
        );
        let _ = writeln!(s, "<rect x=\"0\" y=\"0\" width=\"{w}\" height=\"{h}\" fill=\"#ffffff\"/>");
        Ok(SvgWriter { out, buf: s })
    }

    /// Write the next items, in drawing order.
    pub fn items(&mut self, items: &[Item]) -> std::io::Result<()> {
        for item in items {
            item_svg(&mut self.buf, item);
            if self.buf.len() >= PIECE {
                self.out.write_all(self.buf.as_bytes())?;
                self.buf.clear();
            }
        }
        Ok(())
    }

    /// Close the document and flush the writer; gives the writer back.
    pub fn finish(mut self) -> std::io::Result<W> {
        self.buf.push_str("</svg>\n");
        self.out.write_all(self.buf.as_bytes())?;
        self.out.flush()?;
        Ok(self.out)
    }
}

/// One item as an SVG element on its own line.
fn item_svg(s: &mut String, item: &Item) {
    match item {
        Item::Rect { rect, fill, stroke } => {
            let _ = writeln!(
                s,
                "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"{}/>",
                n(rect.x),
                n(rect.y),
                n(rect.w.max(0.0)),
                n(rect.h.max(0.0)),
                paint(fill, stroke)
            );
        }
        Item::Polygon { points: pts, fill, stroke } => {
            let _ = writeln!(s, "<polygon points=\"{}\"{}/>", points(pts), paint(fill, stroke));
        }
        Item::Polyline { points: pts, stroke } => {
            let _ =
                writeln!(s, "<polyline points=\"{}\" fill=\"none\"{}/>", points(pts), stroke_attrs(stroke));
        }
        Item::Circle { center, radius_mm, fill, stroke } => {
            let _ = writeln!(
                s,
                "<circle cx=\"{}\" cy=\"{}\" r=\"{}\"{}/>",
                n(center.x),
                n(center.y),
                n(radius_mm.max(0.0)),
                paint(fill, stroke)
            );
        }
        Item::Text { pos, text, size_pt, color, anchor, rotation_deg } => {
            let anchor = match anchor {
                Anchor::Start => "start",
                Anchor::Middle => "middle",
                Anchor::End => "end",
            };
            // Font size in user units (mm): 1 pt = 25.4/72 mm.
            let size_mm = size_pt * 25.4 / 72.0;
            let rot = if *rotation_deg != 0.0 {
                // SVG rotates clockwise on screen; ours is counter-clockwise on the page.
                format!(" transform=\"rotate({} {} {})\"", n(-rotation_deg), n(pos.x), n(pos.y))
            } else {
                String::new()
            };
            let _ = writeln!(
                    s,
                    "<text x=\"{}\" y=\"{}\" font-size=\"{}\" fill=\"{}\" text-anchor=\"{anchor}\"{rot}>{}</text>",
                    n(pos.x),
                    n(pos.y),
                    n(size_mm),
                    rgb(*color),
                    escape(text)
                );
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::RectMm;

    #[test]
    fn escapes_and_rounds() {
        assert_eq!(n(1.23456), "1.235");
        assert_eq!(n(2.0), "2");
        assert_eq!(n(-0.0001), "0");
        assert_eq!(escape("a<b & \"c\""), "a&lt;b &amp; &quot;c&quot;");
        let page = Page {
            width_mm: 210.0,
            height_mm: 297.0,
            items: vec![
                Item::Rect {
                    rect: RectMm { x: 1.0, y: 2.0, w: 3.0, h: 4.0 },
                    fill: Some(Rgba::BLACK),
                    stroke: None,
                },
                Item::Text {
                    pos: PtMm { x: 5.0, y: 6.0 },
                    text: "φ < 2".into(),
                    size_pt: 7.2,
                    color: Rgba::BLACK,
                    anchor: Anchor::Start,
                    rotation_deg: 90.0,
                },
            ],
            segments: Vec::new(),
        };
        let svg = write_svg(&page);
        assert!(svg.contains("<rect x=\"1\" y=\"2\" width=\"3\" height=\"4\" fill=\"#000000\"/>"), "{svg}");
        assert!(svg.contains(">φ &lt; 2</text>"));
        assert!(svg.contains("rotate(-90 5 6)"));
        // 7.2 pt = 2.54 mm.
        assert!(svg.contains("font-size=\"2.54\""));
    }
}
