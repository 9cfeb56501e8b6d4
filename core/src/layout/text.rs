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

/// Set short facts one after another on lines no wider than `max_w_mm`, `sep` between two on a
/// line; a fact never breaks across lines unless it is wider than a line by itself (then it is
/// wrapped at its spaces).
pub fn wrap_facts(facts: &[String], sep: &str, max_w_mm: f64, size_pt: f64) -> Vec<String> {
    let mut lines: Vec<String> = Vec::new();
    let mut line = String::new();
    for fact in facts.iter().map(|f| f.trim()).filter(|f| !f.is_empty()) {
        let candidate = if line.is_empty() { fact.to_string() } else { format!("{line}{sep}{fact}") };
        if width(&candidate, size_pt) <= max_w_mm {
            line = candidate;
            continue;
        }
        if !line.is_empty() {
            lines.push(std::mem::take(&mut line));
        }
        if width(fact, size_pt) <= max_w_mm {
            line = fact.to_string();
        } else {
            let mut parts = wrap_at_spaces(fact, max_w_mm, size_pt);
            line = parts.pop().unwrap_or_default();
            lines.extend(parts);
        }
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
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

    #[test]
    fn facts_stay_whole_on_their_lines() {
        let facts: Vec<String> =
            ["measured with a tape", "thickness \u{b1}0.05 m", "bedding dips 12\u{b0} toward 045\u{b0}"]
                .map(String::from)
                .to_vec();
        let sep = "  \u{b7}  ";
        // Room for everything: one line.
        assert_eq!(wrap_facts(&facts, sep, 500.0, 6.0), vec![facts.join(sep)]);
        // Room for about one fact a line: each fact whole on a line, none begins with the separator.
        let w = facts.iter().map(|f| width(f, 6.0)).fold(0.0, f64::max) + 1.0;
        assert_eq!(wrap_facts(&facts, sep, w, 6.0), facts);
        // A fact wider than a line is wrapped at its spaces, every word kept.
        let lines = wrap_facts(&facts, sep, 15.0, 6.0);
        assert!(lines.len() > 3);
        let words =
            |t: &str| t.split_whitespace().filter(|w| *w != "\u{b7}").map(str::to_string).collect::<Vec<_>>();
        assert_eq!(words(&lines.join(" ")), words(&facts.join(" ")));
        assert!(wrap_facts(&[String::new(), " ".into()], sep, 50.0, 6.0).is_empty());
    }
}
