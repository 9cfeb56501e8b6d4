//! The embedded text font (DejaVu Sans) and its advance widths, so layout can place text exactly.
//!
//! The same bytes are embedded in every PDF, so a width measured here is the width printed. Only
//! the tables needed for advance widths are read (`head`, `hhea`, `hmtx`, `cmap` format 4); kerning
//! is not applied by the writers either, so none is applied here.

use std::sync::OnceLock;

/// DejaVu Sans (free licence, see `assets/fonts/DejaVu-LICENSE.txt`), used for all printed text.
pub const DEJAVU_SANS: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");

/// Millimetres per PostScript point (1 pt = 1/72 in, 1 in = 25.4 mm).
pub const MM_PER_PT: f64 = 25.4 / 72.0;

/// Advance widths of a TrueType font, read from its `hmtx` and `cmap` tables.
#[derive(Debug, Clone)]
pub struct FontMetrics {
    units_per_em: f64,
    ascender: f64,
    descender: f64,
    advances: Vec<u16>,
    segments: Vec<CmapSegment>,
    glyph_ids: Vec<u16>,
    /// Byte index into `glyph_ids` terms where the idRangeOffset array starts (format 4 quirk).
    range_offset_base: usize,
}

#[derive(Debug, Clone, Copy)]
struct CmapSegment {
    start: u16,
    end: u16,
    delta: i16,
    range_offset: u16,
    index: usize,
}

fn u16_at(b: &[u8], at: usize) -> Option<u16> {
    Some(u16::from_be_bytes([*b.get(at)?, *b.get(at + 1)?]))
}

fn i16_at(b: &[u8], at: usize) -> Option<i16> {
    u16_at(b, at).map(|v| v as i16)
}

fn u32_at(b: &[u8], at: usize) -> Option<u32> {
    Some(u32::from_be_bytes([*b.get(at)?, *b.get(at + 1)?, *b.get(at + 2)?, *b.get(at + 3)?]))
}

fn table<'a>(font: &'a [u8], tag: &[u8; 4]) -> Option<&'a [u8]> {
    let count = u16_at(font, 4)? as usize;
    (0..count).find_map(|i| {
        let rec = 12 + 16 * i;
        if font.get(rec..rec + 4)? != tag {
            return None;
        }
        let offset = u32_at(font, rec + 8)? as usize;
        let length = u32_at(font, rec + 12)? as usize;
        font.get(offset..offset.checked_add(length)?)
    })
}

impl FontMetrics {
    /// Read the metrics of a TrueType font; `None` if a needed table is missing or malformed.
    pub fn parse(font: &[u8]) -> Option<Self> {
        let head = table(font, b"head")?;
        let hhea = table(font, b"hhea")?;
        let hmtx = table(font, b"hmtx")?;
        let cmap = table(font, b"cmap")?;
        let units_per_em = f64::from(u16_at(head, 18)?);
        let ascender = f64::from(i16_at(hhea, 4)?);
        let descender = f64::from(i16_at(hhea, 6)?);
        let n_metrics = u16_at(hhea, 34)? as usize;
        let advances = (0..n_metrics).map(|i| u16_at(hmtx, 4 * i)).collect::<Option<Vec<_>>>()?;
        // Unicode BMP subtable: Windows (3,1) or Unicode (0,3), format 4.
        let n_sub = u16_at(cmap, 2)? as usize;
        let sub = (0..n_sub).find_map(|i| {
            let rec = 4 + 8 * i;
            let platform = u16_at(cmap, rec)?;
            let encoding = u16_at(cmap, rec + 2)?;
            let offset = u32_at(cmap, rec + 4)? as usize;
            let st = cmap.get(offset..)?;
            ((platform, encoding) == (3, 1) || (platform, encoding) == (0, 3))
                .then_some(st)
                .filter(|st| u16_at(st, 0) == Some(4))
        })?;
        let seg_count = u16_at(sub, 6)? as usize / 2;
        let ends = 14;
        let starts = ends + 2 * seg_count + 2;
        let deltas = starts + 2 * seg_count;
        let ranges = deltas + 2 * seg_count;
        let glyphs = ranges + 2 * seg_count;
        let segments = (0..seg_count)
            .map(|i| {
                Some(CmapSegment {
                    end: u16_at(sub, ends + 2 * i)?,
                    start: u16_at(sub, starts + 2 * i)?,
                    delta: i16_at(sub, deltas + 2 * i)?,
                    range_offset: u16_at(sub, ranges + 2 * i)?,
                    index: i,
                })
            })
            .collect::<Option<Vec<_>>>()?;
        let sub_len = (u16_at(sub, 2)? as usize).min(sub.len());
        let glyph_ids = (glyphs..sub_len.max(glyphs)).step_by(2).filter_map(|at| u16_at(sub, at)).collect();
        Some(FontMetrics {
            units_per_em,
            ascender,
            descender,
            advances,
            segments,
            glyph_ids,
            range_offset_base: seg_count,
        })
    }

    /// Glyph index of a character (0, the missing glyph, if the font lacks it).
    pub fn glyph_id(&self, ch: char) -> u16 {
        let c = ch as u32;
        if c > 0xFFFF {
            return 0;
        }
        let c = c as u16;
        let pos = self.segments.partition_point(|s| s.end < c);
        let Some(seg) = self.segments.get(pos) else { return 0 };
        if seg.start > c {
            return 0;
        }
        if seg.range_offset == 0 {
            return (c as i32 + seg.delta as i32).rem_euclid(65536) as u16;
        }
        // idRangeOffset is a byte offset from its own slot; turn it into an index into glyphIdArray.
        let slot = seg.range_offset as usize / 2 + (c - seg.start) as usize;
        let Some(index) = (slot + seg.index).checked_sub(self.range_offset_base) else { return 0 };
        match self.glyph_ids.get(index) {
            Some(0) | None => 0,
            Some(&g) => (g as i32 + seg.delta as i32).rem_euclid(65536) as u16,
        }
    }

    /// True when the font has a glyph for the character.
    pub fn has_glyph(&self, ch: char) -> bool {
        self.glyph_id(ch) != 0
    }

    /// Advance width of a character in font units.
    pub fn advance_units(&self, ch: char) -> f64 {
        let g = self.glyph_id(ch) as usize;
        let adv = self.advances.get(g).or(self.advances.last()).copied().unwrap_or(0);
        f64::from(adv)
    }

    /// Width of a line of text in millimetres at a size in points.
    pub fn text_width_mm(&self, text: &str, size_pt: f64) -> f64 {
        let units: f64 = text.chars().map(|c| self.advance_units(c)).sum();
        units / self.units_per_em * size_pt * MM_PER_PT
    }

    /// Height above the baseline of the font's ascender, mm.
    pub fn ascent_mm(&self, size_pt: f64) -> f64 {
        self.ascender / self.units_per_em * size_pt * MM_PER_PT
    }

    /// Depth below the baseline of the font's descender (positive), mm.
    pub fn descent_mm(&self, size_pt: f64) -> f64 {
        -self.descender / self.units_per_em * size_pt * MM_PER_PT
    }
}

/// Metrics of the embedded DejaVu Sans, parsed once.
pub fn metrics() -> &'static FontMetrics {
    static METRICS: OnceLock<FontMetrics> = OnceLock::new();
    METRICS.get_or_init(|| {
        // The font is compiled in, so failing to parse it is a build defect, not user input;
        // fall back to a fixed 0.6 em advance so layout still works.
        FontMetrics::parse(DEJAVU_SANS).unwrap_or(FontMetrics {
            units_per_em: 1000.0,
            ascender: 760.0,
            descender: -240.0,
            advances: vec![600],
            segments: Vec::new(),
            glyph_ids: Vec::new(),
            range_offset_base: 0,
        })
    })
}

/// Width of text in the embedded font, mm.
pub fn text_width_mm(text: &str, size_pt: f64) -> f64 {
    metrics().text_width_mm(text, size_pt)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_embedded_font() {
        let m = FontMetrics::parse(DEJAVU_SANS).expect("DejaVu Sans parses");
        // DejaVu Sans has 2048 units per em (from memory; a TrueType font's usual grid).
        assert_eq!(m.units_per_em, 2048.0);
        // The characters printed on logs must exist: phi, minus, ≥, digits, letters.
        for ch in ['φ', '−', '≥', '0', 'A', 'z', '°', '–'] {
            assert!(m.has_glyph(ch), "{ch} missing");
        }
        assert!(!m.has_glyph('\u{E000}'), "private-use area should be empty");
    }

    #[test]
    fn widths_behave() {
        let m = metrics();
        // Digits are tabular in DejaVu Sans (common practice for text fonts): all the same advance.
        let w0 = m.advance_units('0');
        for d in "123456789".chars() {
            assert_eq!(m.advance_units(d), w0);
        }
        // Width scales with size and adds up over characters.
        let a = m.text_width_mm("Mud", 10.0);
        assert!((m.text_width_mm("Mud", 20.0) - 2.0 * a).abs() < 1e-9);
        assert!((m.text_width_mm("MudMud", 10.0) - 2.0 * a).abs() < 1e-9);
        assert!(m.text_width_mm("W", 10.0) > m.text_width_mm("i", 10.0));
        // A space in DejaVu Sans is 651 units (from memory) → 651/2048 em.
        assert!((m.text_width_mm(" ", 72.0) - 651.0 / 2048.0 * 25.4).abs() < 1e-9);
    }
}
