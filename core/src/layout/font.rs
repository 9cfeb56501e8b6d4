//! The embedded text font (DejaVu Sans) and its advance widths, so layout can place text exactly.
//!
//! The same bytes are embedded in every PDF, so a width measured here is the width printed. Only
//! the tables needed for advance widths are read (`head`, `hhea`, `hmtx`, and the Unicode BMP
//! `cmap` subtable of format 4), through `read-fonts`; kerning is not applied by the writers
//! either, so none is applied here.

use read_fonts::tables::cmap::{CmapSubtable, PlatformId};
use read_fonts::{FontRef, TableProvider};
use std::sync::OnceLock;

/// DejaVu Sans (free licence, see `assets/fonts/DejaVu-LICENSE.txt`), used for all printed text.
pub const DEJAVU_SANS: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");

/// Millimetres per PostScript point (1 pt = 1/72 in, 1 in = 25.4 mm).
pub const MM_PER_PT: f64 = 25.4 / 72.0;

/// Number of code points in the Basic Multilingual Plane, the plane a format 4 `cmap` covers.
const BMP_LEN: usize = 0x1_0000;

/// Advance widths of a TrueType font, read from its `hmtx` and `cmap` tables.
#[derive(Debug, Clone)]
pub struct FontMetrics {
    units_per_em: f64,
    ascender: f64,
    descender: f64,
    /// Advance of each glyph with its own horizontal metric (later glyphs repeat the last one).
    advances: Vec<u16>,
    /// Glyph of every BMP code point (index = code point), 0 (the missing glyph) where the font
    /// has none.
    bmp_glyphs: Vec<u16>,
}

impl FontMetrics {
    /// Read the metrics of a TrueType font; `None` if a needed table is missing or malformed.
    pub fn parse(font: &[u8]) -> Option<Self> {
        let font = FontRef::new(font).ok()?;
        let units_per_em = f64::from(font.head().ok()?.units_per_em());
        let hhea = font.hhea().ok()?;
        let ascender = f64::from(hhea.ascender().to_i16());
        let descender = f64::from(hhea.descender().to_i16());
        let advances = font.hmtx().ok()?.h_metrics().iter().map(|m| m.advance()).collect();
        // Unicode BMP subtable: Windows (3,1) or Unicode (0,3), format 4.
        let cmap = font.cmap().ok()?;
        let bmp = cmap.encoding_records().iter().find_map(|rec| {
            let unicode_bmp = matches!(
                (rec.platform_id(), rec.encoding_id()),
                (PlatformId::Windows, 1) | (PlatformId::Unicode, 3)
            );
            match rec.subtable(cmap.offset_data()) {
                Ok(CmapSubtable::Format4(f4)) if unicode_bmp => Some(f4),
                _ => None,
            }
        })?;
        let bmp_glyphs =
            (0..BMP_LEN as u32).map(|c| bmp.map_codepoint(c).map_or(0, |g| g.to_u32() as u16)).collect();
        Some(FontMetrics { units_per_em, ascender, descender, advances, bmp_glyphs })
    }

    /// Glyph index of a character (0, the missing glyph, if the font lacks it).
    pub fn glyph_id(&self, ch: char) -> u16 {
        self.bmp_glyphs.get(ch as usize).copied().unwrap_or(0)
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
            bmp_glyphs: Vec::new(),
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
            assert_ne!(m.glyph_id(ch), 0, "{ch} missing");
        }
        assert_eq!(m.glyph_id('\u{E000}'), 0, "private-use area should be empty");
        // Beyond the BMP a format 4 map has nothing: the missing glyph's advance.
        assert_eq!(m.glyph_id('\u{1D400}'), 0);
        assert_eq!(m.advance_units('\u{1D400}'), m.advance_units('\u{E000}'));
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
