//! The embedded font's PDF objects (ISO 32000-1 §9.7: a Type 0 font over a CIDFontType2 with
//! the Identity-H encoding), written once per document after the last page, subset to the glyphs
//! the whole document shows.
//!
//! Content streams show glyph indices of the full DejaVu Sans as CIDs; the subset renumbers its
//! glyphs, and the `CIDToGIDMap` stream maps each CID to its glyph in the subset. The widths (`W`)
//! are the font's own advances, the ones layout measures text with, and the `ToUnicode` map gives
//! each glyph its character back, so text is searchable and copies as itself.

use super::pdf_content::{hex16, num, uint};
use super::pdf_stream::{stream_into, Deflater};
use crate::layout::{metrics, DEJAVU_SANS};
use read_fonts::{FontRef, TableProvider};
use std::collections::BTreeMap;

/// PostScript name of the embedded font (its `name` table's).
const FONT_NAME: &str = "DejaVuSans";

/// A finished PDF object's body (what goes between `N 0 obj` and `endobj`).
pub(super) type ObjectBody = Vec<u8>;

/// The font program to embed and how CIDs reach its glyphs.
struct Program {
    bytes: Vec<u8>,
    /// New glyph index of each old one (`None`: the full font is embedded, glyphs unchanged).
    renumber: Option<BTreeMap<u16, u16>>,
}

/// The font subset to `glyphs` (glyph 0 always kept); the full font if subsetting fails, so the
/// PDF is still right, only larger.
fn program(glyphs: &BTreeMap<u16, char>) -> Program {
    let mut warnings = Vec::new();
    let wanted: BTreeMap<u16, String> = glyphs.iter().map(|(g, c)| (*g, c.to_string())).collect();
    let subset = printpdf::ParsedFont::from_bytes(DEJAVU_SANS, 0, &mut warnings)
        .and_then(|parsed| printpdf::subset_font(&parsed, &wanted).ok());
    match subset {
        Some(s) if !s.bytes.is_empty() => Program {
            bytes: s.bytes,
            renumber: Some(s.glyph_mapping.into_iter().map(|(old, (new, _))| (old, new)).collect()),
        },
        _ => Program { bytes: DEJAVU_SANS.to_vec(), renumber: None },
    }
}

/// A six-letter subset tag (ISO 32000-1 §9.6.4) that depends only on the glyphs, so the same
/// document gets the same tag (FNV-1a hash of the glyph indices, in letters A–Z).
fn subset_tag(glyphs: &BTreeMap<u16, char>) -> String {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for g in glyphs.keys() {
        for b in g.to_be_bytes() {
            h ^= u64::from(b);
            h = h.wrapping_mul(0x0100_0000_01b3);
        }
    }
    (0..6)
        .map(|_| {
            let c = char::from(b'A' + (h % 26) as u8);
            h /= 26;
            c
        })
        .collect()
}

/// Font-wide facts for the descriptor, in glyph space (1/1000 em).
struct Facts {
    bbox: [f64; 4],
    ascent: f64,
    descent: f64,
    cap_height: f64,
    italic_angle: f64,
    units_per_em: f64,
}

fn facts() -> Facts {
    let fallback = Facts {
        bbox: [-1021.0, -463.0, 1793.0, 1232.0],
        ascent: 928.0,
        descent: -236.0,
        cap_height: 729.0,
        italic_angle: 0.0,
        units_per_em: 2048.0,
    };
    let Ok(font) = FontRef::new(DEJAVU_SANS) else { return fallback };
    let (Ok(head), Ok(hhea)) = (font.head(), font.hhea()) else { return fallback };
    let upm = f64::from(head.units_per_em().max(1));
    let k = 1000.0 / upm;
    let ascent = f64::from(hhea.ascender().to_i16()) * k;
    Facts {
        bbox: [head.x_min(), head.y_min(), head.x_max(), head.y_max()].map(|v| f64::from(v) * k),
        ascent,
        descent: f64::from(hhea.descender().to_i16()) * k,
        cap_height: font.os2().ok().and_then(|t| t.s_cap_height()).map_or(ascent, |c| f64::from(c) * k),
        italic_angle: font.post().map_or(0.0, |p| p.italic_angle().to_f64()),
        units_per_em: upm,
    }
}

/// A stream object's body, compressed when that helps.
fn stream_object(dict_entries: &[u8], data: &[u8]) -> ObjectBody {
    let mut out = Vec::new();
    stream_into(&mut out, dict_entries, data, &mut Deflater::new());
    out
}

fn reference(out: &mut Vec<u8>, id: u32) {
    uint(out, u64::from(id));
    out.extend_from_slice(b" 0 R");
}

/// The ToUnicode CMap (Adobe Technical Note #5411 syntax): each shown glyph → its character.
fn to_unicode(glyphs: &BTreeMap<u16, char>) -> Vec<u8> {
    let mut s = Vec::new();
    s.extend_from_slice(
        b"/CIDInit /ProcSet findresource begin\n12 dict begin\nbegincmap\n\
          /CIDSystemInfo << /Registry (Adobe) /Ordering (UCS) /Supplement 0 >> def\n\
          /CMapName /Adobe-Identity-UCS def\n/CMapType 2 def\n\
          1 begincodespacerange\n<0000> <FFFF>\nendcodespacerange\n",
    );
    let entries: Vec<(&u16, &char)> = glyphs.iter().filter(|(g, _)| **g != 0).collect();
    // At most 100 entries per block.
    for block in entries.chunks(100) {
        uint(&mut s, block.len() as u64);
        s.extend_from_slice(b" beginbfchar\n");
        for (g, ch) in block {
            s.push(b'<');
            hex16(&mut s, **g);
            s.extend_from_slice(b"> <");
            let mut units = [0u16; 2];
            for u in ch.encode_utf16(&mut units) {
                hex16(&mut s, *u);
            }
            s.extend_from_slice(b">\n");
        }
        s.extend_from_slice(b"endbfchar\n");
    }
    s.extend_from_slice(b"endcmap\nCMapName currentdict /CMap defineresource pop\nend\nend\n");
    s
}

/// The `W` array: each shown glyph's advance (1/1000 em), runs of consecutive CIDs together.
fn widths(glyphs: &BTreeMap<u16, char>, units_per_em: f64) -> Vec<u8> {
    let m = metrics();
    let mut out = b"[".to_vec();
    let mut prev: Option<u16> = None;
    for (g, ch) in glyphs {
        let w =
            if *g == 0 { m.advance_units('\u{FFFF}') } else { m.advance_units(*ch) } * 1000.0 / units_per_em;
        if prev.is_some_and(|p| p.checked_add(1) == Some(*g)) {
            out.push(b' ');
        } else {
            if prev.is_some() {
                out.extend_from_slice(b"] ");
            }
            uint(&mut out, u64::from(*g));
            out.extend_from_slice(b" [");
        }
        num(&mut out, w, 3);
        prev = Some(*g);
    }
    if prev.is_some() {
        out.push(b']');
    }
    out.push(b']');
    out
}

/// The font's objects: the Type 0 font at `type0_id` and the objects it refers to, numbered from
/// `first_id` on. Returns the objects (id and body) and the next free id.
pub(super) fn font_objects(
    glyphs: &BTreeMap<u16, char>,
    type0_id: u32,
    first_id: u32,
) -> (Vec<(u32, ObjectBody)>, u32) {
    let mut glyphs = glyphs.clone();
    glyphs.entry(0).or_insert('\u{FFFD}');
    let f = facts();
    let prog = program(&glyphs);
    let base_font = match prog.renumber {
        Some(_) => format!("{}+{FONT_NAME}", subset_tag(&glyphs)),
        None => FONT_NAME.to_string(),
    };
    let [cid_font, descriptor, file, unicode] = [first_id, first_id + 1, first_id + 2, first_id + 3];
    let gid_map = prog.renumber.as_ref().map(|_| first_id + 4);
    let next = first_id + if gid_map.is_some() { 5 } else { 4 };
    let mut objects = Vec::new();

    let mut t0 = b"<< /Type /Font /Subtype /Type0 /BaseFont /".to_vec();
    t0.extend_from_slice(base_font.as_bytes());
    t0.extend_from_slice(b" /Encoding /Identity-H /DescendantFonts [");
    reference(&mut t0, cid_font);
    t0.extend_from_slice(b"] /ToUnicode ");
    reference(&mut t0, unicode);
    t0.extend_from_slice(b" >>");
    objects.push((type0_id, t0));

    let mut cf = b"<< /Type /Font /Subtype /CIDFontType2 /BaseFont /".to_vec();
    cf.extend_from_slice(base_font.as_bytes());
    cf.extend_from_slice(
        b" /CIDSystemInfo << /Registry (Adobe) /Ordering (Identity) /Supplement 0 >> /FontDescriptor ",
    );
    reference(&mut cf, descriptor);
    cf.extend_from_slice(b" /W ");
    cf.extend_from_slice(&widths(&glyphs, f.units_per_em));
    cf.extend_from_slice(b" /CIDToGIDMap ");
    match gid_map {
        Some(id) => reference(&mut cf, id),
        None => cf.extend_from_slice(b"/Identity"),
    }
    cf.extend_from_slice(b" >>");
    objects.push((cid_font, cf));

    let mut d = b"<< /Type /FontDescriptor /FontName /".to_vec();
    d.extend_from_slice(base_font.as_bytes());
    // Flags 32: nonsymbolic (Latin text). StemV is required but unused by viewers for an
    // embedded font; 80 is common practice for a regular weight.
    d.extend_from_slice(b" /Flags 32 /FontBBox [");
    for (k, v) in f.bbox.iter().enumerate() {
        if k > 0 {
            d.push(b' ');
        }
        num(&mut d, *v, 0);
    }
    d.extend_from_slice(b"] /ItalicAngle ");
    num(&mut d, f.italic_angle, 2);
    d.extend_from_slice(b" /Ascent ");
    num(&mut d, f.ascent, 0);
    d.extend_from_slice(b" /Descent ");
    num(&mut d, f.descent, 0);
    d.extend_from_slice(b" /CapHeight ");
    num(&mut d, f.cap_height, 0);
    d.extend_from_slice(b" /StemV 80 /FontFile2 ");
    reference(&mut d, file);
    d.extend_from_slice(b" >>");
    objects.push((descriptor, d));

    let mut length1 = b"/Length1 ".to_vec();
    uint(&mut length1, prog.bytes.len() as u64);
    length1.push(b' ');
    objects.push((file, stream_object(&length1, &prog.bytes)));
    objects.push((unicode, stream_object(b"", &to_unicode(&glyphs))));

    if let (Some(id), Some(renumber)) = (gid_map, &prog.renumber) {
        let max_cid = glyphs.keys().next_back().copied().unwrap_or(0);
        let mut map = vec![0u8; (usize::from(max_cid) + 1) * 2];
        for (old, new) in renumber {
            if let Some(slot) = map.get_mut(usize::from(*old) * 2..usize::from(*old) * 2 + 2) {
                slot.copy_from_slice(&new.to_be_bytes());
            }
        }
        objects.push((id, stream_object(b"", &map)));
    }
    (objects, next)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn widths_run_over_consecutive_glyphs() {
        // Hypothetical glyph numbers, DejaVu Sans advances: space 651, "!" 821 font units of
        // 2048 (the font's hmtx table).
        let glyphs: BTreeMap<u16, char> = [(3, ' '), (4, '!'), (10, ' ')].into_iter().collect();
        let w = String::from_utf8(widths(&glyphs, 2048.0)).expect("ascii");
        assert_eq!(w, "[3 [317.871 400.879] 10 [317.871]]");
    }

    #[test]
    fn tags_are_six_letters_and_follow_the_glyphs() {
        let a: BTreeMap<u16, char> = [(3, ' ')].into_iter().collect();
        let b: BTreeMap<u16, char> = [(4, '!')].into_iter().collect();
        assert_eq!(subset_tag(&a).len(), 6);
        assert!(subset_tag(&a).chars().all(|c| c.is_ascii_uppercase()));
        assert_eq!(subset_tag(&a), subset_tag(&a.clone()));
        assert_ne!(subset_tag(&a), subset_tag(&b));
    }

    #[test]
    fn to_unicode_maps_glyphs_back_to_characters() {
        let glyphs: BTreeMap<u16, char> = [(0, '\u{FFFD}'), (0x1A, 'φ'), (0x2B, '😀')].into_iter().collect();
        let s = String::from_utf8(to_unicode(&glyphs)).expect("ascii");
        assert!(s.contains("2 beginbfchar\n<001A> <03C6>\n<002B> <D83DDE00>\nendbfchar"), "{s}");
    }
}
