//! SVG writer: translates one layout page item by item into an SVG document in millimetres.
//!
//! No drawing decision lives here; text uses the same embedded font family name (DejaVu Sans)
//! and the same left-anchored positions as the PDF.

use crate::layout::{Anchor, Item, Page, PtMm, Rgba, Stroke};
use std::fmt::Write;

/// Round to 3 decimals (µm) and drop trailing zeros, so output is compact and stable.
#[cfg(test)]
fn n(v: f64) -> String {
    let mut s = String::new();
    num(&mut s, v);
    s
}

/// Append `v` rounded to 3 decimals (µm), trailing zeros dropped, `-0` written `0`; a value that
/// is not finite is written `0`. Written straight into the document: no string per number.
fn num(s: &mut String, v: f64) {
    if !v.is_finite() {
        s.push('0');
        return;
    }
    let start = s.len();
    let _ = write!(s, "{v:.3}");
    while s.ends_with('0') {
        s.pop();
    }
    if s.ends_with('.') {
        s.pop();
    }
    if &s[start..] == "-0" {
        s.truncate(start);
        s.push('0');
    }
}

/// Append an attribute ` name="value"` with a number value.
fn num_attr(s: &mut String, name: &str, v: f64) {
    s.push(' ');
    s.push_str(name);
    s.push_str("=\"");
    num(s, v);
    s.push('"');
}

fn rgb(s: &mut String, c: Rgba) {
    let _ = write!(s, "#{:02x}{:02x}{:02x}", c.0, c.1, c.2);
}

/// Append `text` with the XML special characters escaped and control characters (other than
/// tab and newline) left out.
fn escape_into(out: &mut String, text: &str) {
    for ch in text.chars() {
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
}

#[cfg(test)]
fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    escape_into(&mut out, text);
    out
}

fn paint(s: &mut String, fill: &Option<Rgba>, stroke: &Option<Stroke>) {
    match fill {
        Some(c) if c.3 > 0 => {
            s.push_str(" fill=\"");
            rgb(s, *c);
            s.push('"');
            if c.3 < 255 {
                num_attr(s, "fill-opacity", f64::from(c.3) / 255.0);
            }
        }
        _ => s.push_str(" fill=\"none\""),
    }
    if let Some(st) = stroke.as_ref().filter(|st| st.color.3 > 0 && st.width_mm > 0.0) {
        stroke_attrs(s, st);
    }
}

fn stroke_attrs(s: &mut String, st: &Stroke) {
    s.push_str(" stroke=\"");
    rgb(s, st.color);
    s.push('"');
    num_attr(s, "stroke-width", st.width_mm);
    if st.color.3 < 255 {
        num_attr(s, "stroke-opacity", f64::from(st.color.3) / 255.0);
    }
    if st.dash_mm.iter().any(|d| *d > 0.0) {
        s.push_str(" stroke-dasharray=\"");
        for (k, d) in st.dash_mm.iter().enumerate() {
            if k > 0 {
                s.push(' ');
            }
            num(s, d.max(0.0));
        }
        s.push('"');
    }
}

fn points(s: &mut String, pts: &[PtMm]) {
    s.push_str(" points=\"");
    for (k, p) in pts.iter().enumerate() {
        if k > 0 {
            s.push(' ');
        }
        num(s, p.x);
        s.push(',');
        num(s, p.y);
    }
    s.push('"');
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
        let (mut w, mut h) = (String::new(), String::new());
        num(&mut w, width_mm);
        num(&mut h, height_mm);
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
            s.push_str("<rect");
            num_attr(s, "x", rect.x);
            num_attr(s, "y", rect.y);
            num_attr(s, "width", rect.w.max(0.0));
            num_attr(s, "height", rect.h.max(0.0));
            paint(s, fill, stroke);
            s.push_str("/>\n");
        }
        Item::Polygon { points: pts, fill, stroke } => {
            s.push_str("<polygon");
            points(s, pts);
            paint(s, fill, stroke);
            s.push_str("/>\n");
        }
        Item::Polyline { points: pts, stroke } => {
            s.push_str("<polyline");
            points(s, pts);
            s.push_str(" fill=\"none\"");
            stroke_attrs(s, stroke);
            s.push_str("/>\n");
        }
        Item::Circle { center, radius_mm, fill, stroke } => {
            s.push_str("<circle");
            num_attr(s, "cx", center.x);
            num_attr(s, "cy", center.y);
            num_attr(s, "r", radius_mm.max(0.0));
            paint(s, fill, stroke);
            s.push_str("/>\n");
        }
        Item::Text { pos, text, size_pt, color, anchor, rotation_deg } => {
            let anchor = match anchor {
                Anchor::Start => "start",
                Anchor::Middle => "middle",
                Anchor::End => "end",
            };
            s.push_str("<text");
            num_attr(s, "x", pos.x);
            num_attr(s, "y", pos.y);
            // Font size in user units (mm): 1 pt = 25.4/72 mm.
            num_attr(s, "font-size", size_pt * 25.4 / 72.0);
            s.push_str(" fill=\"");
            rgb(s, *color);
            s.push_str("\" text-anchor=\"");
            s.push_str(anchor);
            s.push('"');
            if *rotation_deg != 0.0 {
                // SVG rotates clockwise on screen; ours is counter-clockwise on the page.
                s.push_str(" transform=\"rotate(");
                num(s, -rotation_deg);
                s.push(' ');
                num(s, pos.x);
                s.push(' ');
                num(s, pos.y);
                s.push_str(")\"");
            }
            s.push('>');
            escape_into(s, text);
            s.push_str("</text>\n");
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
