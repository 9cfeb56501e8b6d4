//! Cell values as people write them: numbers with a decimal comma, lithology and grain-size
//! abbreviations from field notebooks, and the short forms Aggrade itself prints. Every value is
//! turned into the bed table's own spelling, or refused with the reason.
//!
//! The tables here are documented for users in `docs/import.md`; keep the two in step.

use crate::model::{Contact, GrainSize, Lithology, PaleosolDevelopment, WentworthClass};

/// How decimals are written in a text table.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum DecimalMark {
    /// `1.5` (and a comma is refused inside a number, since `1,500` could be either).
    Point,
    /// `1,5` (a point is read as a decimal point too, unless it looks like a thousands group such
    /// as `1.500`, which is refused as ambiguous).
    Comma,
}

impl DecimalMark {
    /// The mark as shown to the user.
    pub fn describe(self) -> &'static str {
        match self {
            DecimalMark::Point => "decimal point",
            DecimalMark::Comma => "decimal comma",
        }
    }
}

/// Lithology abbreviations and synonyms (lower case, after folding spaces, hyphens and
/// underscores to `_`), beside the vocabulary names themselves. Common practice in field
/// notebooks and logging sheets; no single published list.
pub const LITHOLOGY_SYNONYMS: [(&str, Lithology); 49] = [
    ("clst", Lithology::Claystone),
    ("clyst", Lithology::Claystone),
    ("claystone", Lithology::Claystone),
    ("clay", Lithology::Claystone),
    ("mdst", Lithology::Mudstone),
    ("mudst", Lithology::Mudstone),
    ("mud", Lithology::Mudstone),
    ("mudrock", Lithology::Mudstone),
    ("sh", Lithology::Shale),
    ("shl", Lithology::Shale),
    ("slst", Lithology::Siltstone),
    ("siltst", Lithology::Siltstone),
    ("sltst", Lithology::Siltstone),
    ("silt", Lithology::Siltstone),
    ("sst", Lithology::Sandstone),
    ("ss", Lithology::Sandstone),
    ("sdst", Lithology::Sandstone),
    ("sandst", Lithology::Sandstone),
    ("sand", Lithology::Sandstone),
    ("cgl", Lithology::Conglomerate),
    ("congl", Lithology::Conglomerate),
    ("cong", Lithology::Conglomerate),
    ("conglom", Lithology::Conglomerate),
    ("gravel", Lithology::Conglomerate),
    ("bx", Lithology::Breccia),
    ("brec", Lithology::Breccia),
    ("brecc", Lithology::Breccia),
    ("lst", Lithology::Limestone),
    ("ls", Lithology::Limestone),
    ("lmst", Lithology::Limestone),
    ("limest", Lithology::Limestone),
    ("dol", Lithology::Dolostone),
    ("dolo", Lithology::Dolostone),
    ("dolst", Lithology::Dolostone),
    ("dolomite", Lithology::Dolostone),
    ("mrl", Lithology::Marl),
    ("marlstone", Lithology::Marl),
    ("lignite", Lithology::Coal),
    ("evap", Lithology::Evaporite),
    ("gyp", Lithology::Evaporite),
    ("gypsum", Lithology::Evaporite),
    ("anhydrite", Lithology::Evaporite),
    ("tf", Lithology::Tuff),
    ("ash", Lithology::Tuff),
    ("cov", Lithology::Covered),
    ("cvd", Lithology::Covered),
    ("no_exposure", Lithology::Covered),
    ("not_exposed", Lithology::Covered),
    ("gap", Lithology::Covered),
];

/// Grain-size abbreviations (lower case, dots and spaces removed). Includes the short labels
/// Aggrade prints on its grain-size scale and in its bed table (`cl`, `si`, `vf`, `f`, `m`, `c`,
/// `vc`, `gr`, `pb`, `cb`, `bd`), the sand classes with an `s` (`vfs` … `vcs`), the upper/lower
/// halves of a sand class (`fu`, `fl` …, read as the class), and common short forms of the gravel
/// classes. Common practice; no single published list.
pub const GRAIN_SYNONYMS: [(&str, WentworthClass); 44] = [
    ("cl", WentworthClass::Clay),
    ("cly", WentworthClass::Clay),
    ("si", WentworthClass::Silt),
    ("slt", WentworthClass::Silt),
    ("vf", WentworthClass::VeryFineSand),
    ("vfs", WentworthClass::VeryFineSand),
    ("vfu", WentworthClass::VeryFineSand),
    ("vfl", WentworthClass::VeryFineSand),
    ("veryfine", WentworthClass::VeryFineSand),
    ("f", WentworthClass::FineSand),
    ("fs", WentworthClass::FineSand),
    ("fu", WentworthClass::FineSand),
    ("fl", WentworthClass::FineSand),
    ("fine", WentworthClass::FineSand),
    ("m", WentworthClass::MediumSand),
    ("ms", WentworthClass::MediumSand),
    ("mu", WentworthClass::MediumSand),
    ("ml", WentworthClass::MediumSand),
    ("med", WentworthClass::MediumSand),
    ("medium", WentworthClass::MediumSand),
    ("c", WentworthClass::CoarseSand),
    ("cs", WentworthClass::CoarseSand),
    ("cu", WentworthClass::CoarseSand),
    ("crs", WentworthClass::CoarseSand),
    ("coarse", WentworthClass::CoarseSand),
    ("vc", WentworthClass::VeryCoarseSand),
    ("vcs", WentworthClass::VeryCoarseSand),
    ("vcu", WentworthClass::VeryCoarseSand),
    ("vcl", WentworthClass::VeryCoarseSand),
    ("verycoarse", WentworthClass::VeryCoarseSand),
    ("gr", WentworthClass::Granule),
    ("gran", WentworthClass::Granule),
    ("grn", WentworthClass::Granule),
    ("granules", WentworthClass::Granule),
    ("pb", WentworthClass::Pebble),
    ("pbl", WentworthClass::Pebble),
    ("peb", WentworthClass::Pebble),
    ("pebbles", WentworthClass::Pebble),
    ("cb", WentworthClass::Cobble),
    ("cob", WentworthClass::Cobble),
    ("cbl", WentworthClass::Cobble),
    ("cobbles", WentworthClass::Cobble),
    ("bd", WentworthClass::Boulder),
    ("bld", WentworthClass::Boulder),
];

/// Basal-contact synonyms (common practice), beside the vocabulary names.
pub const CONTACT_SYNONYMS: [(&str, Contact); 9] = [
    ("sh", Contact::Sharp),
    ("flat", Contact::Sharp),
    ("er", Contact::Erosional),
    ("eros", Contact::Erosional),
    ("erosive", Contact::Erosional),
    ("scoured", Contact::Erosional),
    ("grad", Contact::Gradational),
    ("gradual", Contact::Gradational),
    ("transitional", Contact::Gradational),
];

/// Fold a value for table look-up: lower case, words joined by `_`.
fn fold(text: &str) -> String {
    crate::model::grain::normalise_term(text)
}

/// A lithology from its name or a synonym in [`LITHOLOGY_SYNONYMS`] (also with a trailing `.`
/// or plural `s`).
pub fn lithology(text: &str) -> Option<Lithology> {
    let t = fold(text.trim().trim_end_matches('.'));
    let find = |t: &str| {
        Lithology::parse(t).or_else(|| LITHOLOGY_SYNONYMS.iter().find(|(k, _)| *k == t).map(|(_, l)| *l))
    };
    find(&t).or_else(|| t.strip_suffix('s').and_then(find))
}

/// A Wentworth class from a name ("fine sand", "fine-grained sand", "sand, fine") or an
/// abbreviation in [`GRAIN_SYNONYMS`].
pub fn grain_class(text: &str) -> Option<WentworthClass> {
    let t = text.trim().to_lowercase();
    if let Some(c) = WentworthClass::parse(&t) {
        return Some(c);
    }
    // "f.", "v.f.", "vf sand", "fine-grained sand", "sand, fine", "sand (fine)" …
    let squeezed: String = t
        .replace("grained", "")
        .replace("sandstone", "")
        .replace("sand", "")
        .chars()
        .filter(|c| c.is_alphanumeric())
        .collect();
    if squeezed.is_empty() {
        return None;
    }
    let sand_word = t.contains("sand");
    match GRAIN_SYNONYMS.iter().find(|(k, _)| *k == squeezed) {
        // "vf sand" is very fine sand; "clay sand" is not a class.
        Some((_, c)) if !sand_word || (c.is_sand_or_coarser() && *c <= WentworthClass::VeryCoarseSand) => {
            Some(*c)
        }
        _ => None,
    }
}

/// The unit of a bare number in a grain-size column, from its header (`Grain size (mm)`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum GrainUnit {
    Mm,
    Phi,
}

/// A grain size: a class or abbreviation, a number with `mm` or `phi`/`φ` (the decimal mark as
/// the table's), or a bare number when the header gave its unit.
pub fn grain(text: &str, decimal: DecimalMark, unit: Option<GrainUnit>) -> Result<GrainSize, String> {
    let t = text.trim();
    if let Some(c) = grain_class(t) {
        return Ok(GrainSize::Class(c));
    }
    let lower = t.to_lowercase();
    let (num, suffix) = if let Some(n) = lower.strip_suffix("mm") {
        (n, Some(GrainUnit::Mm))
    } else if let Some(n) = lower.strip_suffix("phi").or_else(|| lower.strip_suffix('φ')) {
        (n, Some(GrainUnit::Phi))
    } else {
        (lower.as_str(), None)
    };
    if let Ok(v) = number(num, decimal) {
        let text = match suffix.or(unit) {
            Some(GrainUnit::Mm) => format!("{v}mm"),
            Some(GrainUnit::Phi) => format!("{v}phi"),
            None => {
                return Err(format!(
                    "{t:?} is a number without a unit: write {t}mm or {t}phi, or name the unit in the header \
                     (e.g. \"Grain size (mm)\")"
                ))
            }
        };
        return GrainSize::parse(&text);
    }
    Err(format!(
        "{t:?} is not a grain size: use a Wentworth class or its abbreviation (cl, si, vf, f, m, c, vc, gr, pb, cb, bd; \
         also vfs, fs, ms, cs, vcs, pbl …) or a number with mm or phi"
    ))
}

/// A grain-size cell that may hold base and top (`vc → m`, `vc->m`, `c to f`), as Aggrade's bed
/// table shows them.
pub fn grain_pair(
    text: &str,
    decimal: DecimalMark,
    unit: Option<GrainUnit>,
) -> Result<(GrainSize, GrainSize), String> {
    for sep in ["→", "->", " to "] {
        if let Some((a, b)) = text.split_once(sep) {
            return Ok((grain(a, decimal, unit)?, grain(b, decimal, unit)?));
        }
    }
    let g = grain(text, decimal, unit)?;
    Ok((g, g))
}

/// A basal contact from its name or a synonym in [`CONTACT_SYNONYMS`].
pub fn contact(text: &str) -> Option<Contact> {
    let t = fold(text.trim_end_matches('.'));
    Contact::parse(&t).or_else(|| CONTACT_SYNONYMS.iter().find(|(k, _)| *k == t).map(|(_, c)| *c))
}

/// Paleosol development, also with the British spelling of the field and `v. strong`.
pub fn paleosol(text: &str) -> Option<PaleosolDevelopment> {
    let t = fold(&text.replace('.', " "));
    let t = t.replace("v_strong", "very_strong").replace("vstrong", "very_strong");
    PaleosolDevelopment::parse(&t)
}

/// Is this text a thousands-grouped number such as `1.500` or `12.000.000`?
fn thousands_grouped(text: &str, sep: char) -> bool {
    let mut parts = text.trim_start_matches(['-', '+']).split(sep);
    let first_ok =
        parts.next().is_some_and(|p| (1..=3).contains(&p.len()) && p.bytes().all(|b| b.is_ascii_digit()));
    let mut rest = parts.peekable();
    first_ok && rest.peek().is_some() && rest.all(|p| p.len() == 3 && p.bytes().all(|b| b.is_ascii_digit()))
}

/// A finite number written with the table's decimal mark. Spaces around it are allowed; other
/// separators inside it are refused rather than guessed.
pub fn number(text: &str, decimal: DecimalMark) -> Result<f64, String> {
    let t = text.trim();
    let plain = |s: &str| -> Result<f64, String> {
        // Only digits, one mark, a sign and an exponent: `inf`, `NaN` and `0x10` are refused.
        let ok = !s.is_empty() && s.bytes().all(|b| b.is_ascii_digit() || b"+-.eE".contains(&b));
        match s.parse::<f64>() {
            Ok(v) if ok && v.is_finite() => Ok(v),
            _ => Err(format!("{t:?} is not a number")),
        }
    };
    match decimal {
        DecimalMark::Point => {
            if t.contains(',') {
                return Err(format!(
                    "{t:?} has a comma in a table read with a decimal point: a comma could be a decimal mark \
                     or a thousands separator; write {} (or import with the decimal comma)",
                    t.replace(',', ".")
                ));
            }
            plain(t)
        }
        DecimalMark::Comma => {
            if t.contains(',') && t.contains('.') || thousands_grouped(t, '.') {
                return Err(format!(
                    "{t:?} mixes or groups decimal marks in a table read with a decimal comma; write it without \
                     thousands separators (e.g. 1500 or 1,5)"
                ));
            }
            plain(&t.replace(',', "."))
        }
    }
}

/// The number of decimals written in a number's text (for rounding differences of heights).
pub fn decimals(text: &str) -> usize {
    let t = text.trim();
    let mantissa = t.split(['e', 'E']).next().unwrap_or(t);
    mantissa.rsplit_once(['.', ',']).map_or(0, |(_, frac)| frac.len())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_short_label_aggrade_prints_reads_back() {
        for c in WentworthClass::ALL {
            assert_eq!(grain_class(c.short_label()), Some(c), "{}", c.short_label());
            assert_eq!(grain_class(c.name()), Some(c));
        }
        // The bed table shows base → top as "vc → m", and measured sizes as "1.5φ".
        let pair = grain_pair("vc → m", DecimalMark::Point, None).expect("reads");
        assert_eq!(
            pair,
            (GrainSize::Class(WentworthClass::VeryCoarseSand), GrainSize::Class(WentworthClass::MediumSand))
        );
        assert_eq!(grain("1.5φ", DecimalMark::Point, None), Ok(GrainSize::Phi(1.5)));
    }

    #[test]
    fn notebook_abbreviations() {
        let l = |t| lithology(t);
        assert_eq!(l("sst"), Some(Lithology::Sandstone));
        assert_eq!(l("Mdst."), Some(Lithology::Mudstone));
        assert_eq!(l("slst"), Some(Lithology::Siltstone));
        assert_eq!(l("CGL"), Some(Lithology::Conglomerate));
        assert_eq!(l("Sandstones"), Some(Lithology::Sandstone));
        assert_eq!(l("granite"), None);
        let g = |t| grain_class(t);
        assert_eq!(g("fs"), Some(WentworthClass::FineSand));
        assert_eq!(g("ms"), Some(WentworthClass::MediumSand));
        assert_eq!(g("vf"), Some(WentworthClass::VeryFineSand));
        assert_eq!(g("pbl"), Some(WentworthClass::Pebble));
        assert_eq!(g("v.f."), Some(WentworthClass::VeryFineSand));
        assert_eq!(g("fine-grained sand"), Some(WentworthClass::FineSand));
        assert_eq!(g("Sand, medium"), Some(WentworthClass::MediumSand));
        assert_eq!(g("fU"), Some(WentworthClass::FineSand));
        assert_eq!(g("pebble sand"), None);
        assert_eq!(g("gravelish"), None);
    }

    #[test]
    fn numbers_with_either_mark() {
        assert_eq!(number("1,25", DecimalMark::Comma), Ok(1.25));
        assert_eq!(number(" 2 ", DecimalMark::Comma), Ok(2.0));
        assert_eq!(number("0.5", DecimalMark::Comma), Ok(0.5));
        assert!(number("1.500", DecimalMark::Comma).is_err(), "thousands group is ambiguous");
        assert!(number("1.234,5", DecimalMark::Comma).is_err());
        assert_eq!(number("1.5", DecimalMark::Point), Ok(1.5));
        assert!(number("1,5", DecimalMark::Point).is_err());
        for bad in ["inf", "NaN", "1e999", "", "0x10", "1 m"] {
            assert!(number(bad, DecimalMark::Point).is_err(), "{bad}");
        }
        assert_eq!(decimals("1,25"), 2);
        assert_eq!(decimals("3"), 0);
    }

    #[test]
    fn bare_grain_numbers_need_a_unit() {
        assert!(grain("0,25", DecimalMark::Comma, None).expect_err("no unit").contains("0,25mm"));
        assert_eq!(grain("0,25", DecimalMark::Comma, Some(GrainUnit::Mm)), Ok(GrainSize::Phi(2.0)));
        assert_eq!(grain("2 phi", DecimalMark::Point, None), Ok(GrainSize::Phi(2.0)));
    }
}
