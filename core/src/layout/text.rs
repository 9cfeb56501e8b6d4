//! Placing text: every label is emitted left-anchored with its x computed from the embedded
//! font's advance widths, so screen, PDF and SVG agree without measuring text themselves.

use super::font::text_width_mm;
use super::items::{Anchor, Item, PtMm, Rgba};

/// Width of text in the embedded font, mm.
pub fn width(s: &str, size_pt: f64) -> f64 {
    text_width_mm(s, size_pt)
}

/// Horizontal text with its baseline starting at (x, y).
pub fn text(out: &mut Vec<Item>, x: f64, y: f64, s: &str, size_pt: f64, color: Rgba) {
    out.push(Item::Text {
        pos: PtMm { x, y },
        text: s.to_string(),
        size_pt,
        color,
        anchor: Anchor::Start,
        rotation_deg: 0.0,
    });
}

/// Text reading upward (rotated 90° counter-clockwise on the page), its baseline starting at
/// (x, y) and running toward smaller y.
pub fn text_up(out: &mut Vec<Item>, x: f64, y: f64, s: &str, size_pt: f64, color: Rgba) {
    out.push(Item::Text {
        pos: PtMm { x, y },
        text: s.to_string(),
        size_pt,
        color,
        anchor: Anchor::Start,
        rotation_deg: 90.0,
    });
}

/// The largest size ≤ `size_pt` (down to `min_pt`) at which text fits `max_w_mm`, if any.
pub fn fit_size(s: &str, max_w_mm: f64, size_pt: f64, min_pt: f64) -> Option<f64> {
    let w = width(s, size_pt);
    if w <= max_w_mm {
        return Some(size_pt);
    }
    let scaled = size_pt * max_w_mm / w;
    (scaled >= min_pt).then_some(scaled)
}

/// Break text into lines no wider than `max_w_mm` (at spaces; a word longer than a line stays whole).
pub fn wrap(s: &str, max_w_mm: f64, size_pt: f64) -> Vec<String> {
    wrap_words(s.split_whitespace(), max_w_mm, size_pt)
}

/// [`wrap`] breaking at ordinary spaces only, so that a scale grouped with thin or no-break
/// spaces ("1:25 000") is never split across lines.
pub fn wrap_at_spaces(s: &str, max_w_mm: f64, size_pt: f64) -> Vec<String> {
    wrap_words(s.split(' ').filter(|w| !w.is_empty()), max_w_mm, size_pt)
}

/// Join words into lines no wider than `max_w_mm`; a word longer than a line stays whole.
fn wrap_words<'a>(words: impl Iterator<Item = &'a str>, max_w_mm: f64, size_pt: f64) -> Vec<String> {
    let mut lines = Vec::new();
    let mut line = String::new();
    for word in words {
        let candidate = if line.is_empty() { word.to_string() } else { format!("{line} {word}") };
        if !line.is_empty() && width(&candidate, size_pt) > max_w_mm {
            lines.push(std::mem::take(&mut line));
            line = word.to_string();
        } else {
            line = candidate;
        }
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wraps_within_width() {
        let s = "Interpretations are candidates for expert review, not conclusions.";
        let lines = wrap(s, 30.0, 7.0);
        assert!(lines.len() > 1);
        assert_eq!(lines.join(" "), s, "no word lost or added");
        for l in &lines {
            assert!(width(l, 7.0) <= 30.0, "{l}");
        }
        assert_eq!(fit_size("abc", 100.0, 7.0, 4.0), Some(7.0));
        let w = width("a long label", 7.0);
        let s2 = fit_size("a long label", w / 2.0, 7.0, 3.0).expect("fits at half size");
        assert!((s2 - 3.5).abs() < 1e-9);
        assert_eq!(fit_size("a long label", w / 4.0, 7.0, 3.0), None);
    }
}
