//! The compact notation for typing a whole bed, cell by cell: a thickness with its covered
//! top, a lithology by its first letters, a grain-size range such as `c-m`, structures and
//! paleosol features by short codes, a contact with its relief, paleocurrents as a list, a
//! named surface with its kind. The bed table in the window and the bed-table CSV read every
//! cell with the functions here (one reader for both), and each value is shown back in the
//! notation, so what is typed is what is seen. Full names always work too. `docs/notation.md`
//! has the same table with more examples.
//!
//! | cell | notation | example |
//! | --- | --- | --- |
//! | thickness | a number in the section's display unit (`m`, `cm` or `ft` after it says another), then optionally `c` and the covered top | `4.5 c2`: 4.5, its top 2 covered |
//! | lithology | a name or its first letters (the first lithology in the list that starts so); empty: named from the grain size | `mu` mudstone, `sa` sandstone |
//! | grain | a class code or name, a measured size, or base and top joined by `-` or `>` | `c-m` coarse fining to medium sand |
//! | paleosol | development first, then features and a carbonate stage I–VI | `s cn rt III` |
//! | structures | codes separated by spaces or commas | `tcb la` trough cross-bedding, lateral accretion |
//! | contact | `s`, `e`, `g`, then the erosional relief (section's unit) | `e1.2` erosional, 1.2 of relief |
//! | paleocurrents | azimuths in degrees, separated by spaces, commas or semicolons | `200 215 230` |
//! | surface | the name of a surface at the bed's base, its kind in brackets when not inferred | `RG-E1`, `T2 (pt)` |
//! | rank | the geologist's rank of the base | `ss` storey surface, `bb` body base, `ws` within storey |
//! | samples | sample names separated by `;` | `CW-12; CW-13` |
//!
//! Grain-size codes are the usual abbreviations: cl, si, vf, f, m, c, vc, gr, pbl, cbl, bld
//! ([`WentworthClass::short_label`]; the older `pb`, `cb`, `bd` still read). A term's code is
//! the initials of its words (`tcb` trough cross-bedding, `rt` root traces) or any beginning of
//! its name that fits no other term (`trough`, `mo` mottling). Where initials fit two terms
//! (`m`: massive or mottling) the message names both and asks for more letters.

use super::grain::{normalise_term, GrainSize, WentworthClass};
use super::lithology::Lithology;
use super::record::{Paleocurrent, Sample};
use super::vocab::{
    BaseRank, Contact, Indicator, LengthUnit, PaleosolDevelopment, PaleosolFeature, Structure, SurfaceKind,
};
use std::fmt;

/// A term of a closed vocabulary that can be typed by code.
pub trait Term: Copy + PartialEq + 'static {
    /// Every term.
    fn all() -> &'static [Self];
    /// The term's full name.
    fn term_name(self) -> &'static str;
}

macro_rules! terms {
    ($($t:ty),+) => {$(
        impl Term for $t {
            fn all() -> &'static [Self] {
                <$t>::ALL
            }
            fn term_name(self) -> &'static str {
                self.name()
            }
        }
    )+};
}
terms!(Structure, PaleosolFeature, Contact, PaleosolDevelopment, BaseRank, SurfaceKind);

impl Term for WentworthClass {
    fn all() -> &'static [Self] {
        &WentworthClass::ALL
    }
    fn term_name(self) -> &'static str {
        self.name()
    }
}

/// Why a cell in the compact notation does not read; the message says what would.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ShorthandError {
    /// No term has this code.
    #[error("{code:?} is not a known {what} (known: {known})")]
    Unknown { code: String, what: &'static str, known: String },
    /// The code fits more than one term.
    #[error("{code:?} could be {}: type more letters", candidates.join(" or "))]
    Ambiguous { code: String, candidates: Vec<&'static str> },
    /// A number in the cell does not read or is out of range.
    #[error("{0}")]
    Number(String),
}

/// The words of a name: spaces and hyphens separate them ("cross-bedding" is two words).
fn words(name: &str) -> impl Iterator<Item = &str> {
    name.split([' ', '-']).filter(|w| !w.is_empty())
}

/// The initials of a term's words: `tcb` for trough cross-bedding.
fn initials(name: &str) -> String {
    words(name).filter_map(|w| w.chars().next()).collect()
}

/// A name with its separators dropped, for prefix matching: `troughcrossbedding`.
fn squashed(name: &str) -> String {
    words(name).collect()
}

/// Read one code: the full name, the initials of exactly one term, or a beginning of exactly
/// one term's name.
pub fn term_from_code<T: Term>(code: &str, what: &'static str) -> Result<T, ShorthandError> {
    let norm = normalise_term(code);
    let typed = norm.replace('_', "");
    let all = T::all();
    if let Some(t) = all.iter().copied().find(|t| normalise_term(t.term_name()) == norm) {
        return Ok(t);
    }
    let pick = |matches: Vec<T>| -> Option<Result<T, ShorthandError>> {
        match matches.as_slice() {
            [] => None,
            [one] => Some(Ok(*one)),
            many => Some(Err(ShorthandError::Ambiguous {
                code: code.trim().to_string(),
                candidates: many.iter().map(|t| t.term_name()).collect(),
            })),
        }
    };
    if typed.is_empty() {
        return Err(unknown::<T>(code, what));
    }
    let by_initials: Vec<T> = all.iter().copied().filter(|t| initials(t.term_name()) == typed).collect();
    let by_prefix: Vec<T> =
        all.iter().copied().filter(|t| squashed(t.term_name()).starts_with(&typed)).collect();
    // Initials that fit exactly one term win; ambiguous initials may still be settled by a
    // prefix that fits one term only (`mo` is mottling although no term has those initials).
    match pick(by_initials) {
        Some(Ok(t)) => Ok(t),
        Some(Err(e)) => match pick(by_prefix) {
            Some(Ok(t)) => Ok(t),
            _ => Err(e),
        },
        None => pick(by_prefix).unwrap_or_else(|| Err(unknown::<T>(code, what))),
    }
}

fn unknown<T: Term>(code: &str, what: &'static str) -> ShorthandError {
    let known = known_codes::<T>(T::all().iter().copied());
    ShorthandError::Unknown { code: code.trim().to_string(), what, known }
}

/// Terms listed for a message: `trough cross-bedding (tcb), planar cross-bedding (pcb), …`.
pub fn known_codes<T: Term>(terms: impl Iterator<Item = T>) -> String {
    terms.map(|t| format!("{} ({})", t.term_name(), short_code(t))).collect::<Vec<_>>().join(", ")
}

/// The shortest code that reads back as this term: its initials when they fit it alone, else
/// the shortest beginning of its name that does.
pub fn short_code<T: Term>(term: T) -> String {
    let name = term.term_name();
    let own = initials(name);
    if T::all().iter().filter(|t| initials(t.term_name()) == own).count() == 1 {
        return own;
    }
    let full = squashed(name);
    (1..=full.len())
        .filter(|n| full.is_char_boundary(*n))
        .map(|n| &full[..n])
        .find(|p| {
            T::all().iter().filter(|t| squashed(t.term_name()).starts_with(p)).count() == 1
                && T::all().iter().all(|t| *t == term || initials(t.term_name()) != *p)
        })
        .unwrap_or(&full)
        .to_string()
}

/// Split a list cell on spaces, commas and semicolons.
fn items(text: &str) -> impl Iterator<Item = &str> {
    text.split(|c: char| c.is_whitespace() || c == ',' || c == ';').filter(|s| !s.is_empty())
}

/// Read a list of terms by code, in order, without repeats.
pub fn terms_from_codes<T: Term>(text: &str, what: &'static str) -> Result<Vec<T>, ShorthandError> {
    // Full names with spaces ("trough cross-bedding") are one term: try the whole cell, and each
    // `;`- or `,`-separated piece, as a name before splitting on spaces.
    let mut out: Vec<T> = Vec::new();
    for piece in text.split([',', ';']).map(str::trim).filter(|p| !p.is_empty()) {
        let as_name =
            T::all().iter().copied().find(|t| normalise_term(t.term_name()) == normalise_term(piece));
        let found: Vec<T> = match as_name {
            Some(t) => vec![t],
            None => items(piece).map(|code| term_from_code::<T>(code, what)).collect::<Result<_, _>>()?,
        };
        for t in found {
            if !out.contains(&t) {
                out.push(t);
            }
        }
    }
    Ok(out)
}

/// The paleosol feature a structure names, for the terms both vocabularies hold (root traces,
/// slickensides, carbonate nodules, mottling): soil features, logged as paleosol features;
/// older files and tables may hold them as structures, which still read.
pub fn soil_feature(structure: Structure) -> Option<PaleosolFeature> {
    PaleosolFeature::parse(structure.name())
}

/// Terms written back as codes separated by spaces.
pub fn codes<T: Term>(terms: &[T]) -> String {
    terms.iter().map(|t| short_code(*t)).collect::<Vec<_>>().join(" ")
}

/// A number without trailing zeros: `1.2`, `210` (three decimals at most).
pub fn trim_number(v: f64) -> String {
    let s = format!("{v:.3}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".to_string()
    } else {
        s.to_string()
    }
}

/// A length typed in `unit` (a trailing `m`, `cm` or `ft` says another unit; a decimal comma
/// reads as a point), in metres. Any finite number; the caller checks the range.
pub fn length(text: &str, unit: LengthUnit) -> Result<f64, ShorthandError> {
    let t = text.trim().replace(',', ".");
    let lower = t.to_lowercase();
    let (num, unit) = if let Some(n) = lower.strip_suffix("cm") {
        (n, LengthUnit::Centimetre)
    } else if let Some(n) = lower.strip_suffix("ft") {
        (n, LengthUnit::Foot)
    } else if let Some(n) = lower.strip_suffix('m') {
        (n, LengthUnit::Metre)
    } else {
        (lower.as_str(), unit)
    };
    match num.trim().parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(unit.to_metres(v)),
        _ => Err(ShorthandError::Number(format!(
            "{:?} is not a length (a number in {}, or with m, cm or ft after it)",
            text.trim(),
            unit.name()
        ))),
    }
}

/// A length in metres written back in `unit`, without the unit and trailing zeros.
pub fn length_code(metres: f64, unit: LengthUnit) -> String {
    trim_number(unit.from_metres(metres))
}

/// A thickness as typed: the bed's, and the part of it at the top that is covered (logged as a
/// covered interval above the exposed part).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ThicknessEntry {
    /// The whole thickness, metres (> 0).
    pub thickness_m: f64,
    /// The covered top, metres (> 0 and less than the whole); `None` when none was typed.
    pub covered_top_m: Option<f64>,
}

impl ThicknessEntry {
    /// The exposed part, metres: the thickness less its covered top.
    pub fn exposed_m(&self) -> f64 {
        self.thickness_m - self.covered_top_m.unwrap_or(0.0)
    }
}

/// Where a covered top starts in a thickness cell: a `c` (or `cov`, `covered`) followed by a
/// number, not the `c` of `cm`. Returns the thickness text and the covered text.
fn split_covered(text: &str) -> (&str, Option<&str>) {
    for (i, _) in text.match_indices(['c', 'C']) {
        let after = &text[i + 1..];
        let lower = after.to_lowercase();
        let skip = ["overed", "ov"].iter().find(|w| lower.starts_with(*w)).map_or(0, |w| w.len());
        let rest = after[skip..].trim_start();
        if rest.starts_with(|c: char| c.is_ascii_digit() || c == '.' || c == ',') {
            return (&text[..i], Some(rest));
        }
    }
    (text, None)
}

/// Read a thickness cell: a length in `unit` greater than 0, optionally followed by `c` and the
/// covered top (`4.5 c2`: a 4.5 bed whose top 2 are covered; `4.5 cov 2` and `4.5c2` read too).
pub fn thickness_entry(text: &str, unit: LengthUnit) -> Result<ThicknessEntry, ShorthandError> {
    let (whole, covered) = split_covered(text.trim());
    let thickness_m = length(whole, unit).map_err(|_| {
        ShorthandError::Number(format!(
            "{:?} is not a number; expected a thickness in {} > 0 (e.g. 1.25, 40cm, 3ft; 4.5 c2 for 4.5 with its top 2 covered)",
            text.trim(),
            unit.name()
        ))
    })?;
    if thickness_m <= 0.0 {
        return Err(ShorthandError::Number(format!("must be > 0, got {}", whole.trim())));
    }
    let covered_top_m = match covered {
        None => None,
        Some(c) => match length(c, unit) {
            Ok(v) if v > 0.0 && v < thickness_m => Some(v),
            _ => {
                return Err(ShorthandError::Number(format!(
                    "covered top {:?} is not a length above 0 and below the thickness {} (a covered interval on its own is lithology cov)",
                    c.trim(),
                    whole.trim()
                )))
            }
        },
    };
    Ok(ThicknessEntry { thickness_m, covered_top_m })
}

/// Read a lithology: its name, or the first letters of one (the first lithology in the
/// vocabulary's order whose name starts so: `mu` mudstone, `sa` sandstone, `co` conglomerate).
pub fn lithology_from_code(text: &str) -> Result<Lithology, ShorthandError> {
    let t = normalise_term(text);
    if let Some(l) = Lithology::parse(&t) {
        return Ok(l);
    }
    Lithology::ALL.iter().copied().find(|l| !t.is_empty() && l.name().starts_with(&t)).ok_or_else(|| {
        ShorthandError::Unknown {
            code: text.trim().to_string(),
            what: "lithology",
            known: format!(
                "{}; or the first letters of one: sa sandstone, mu mudstone, co conglomerate",
                Lithology::ALL.map(|l| l.name()).join(", ")
            ),
        }
    })
}

/// The shortest first letters that read back as this lithology (`m` mudstone, `sa` sandstone).
pub fn lithology_code(lithology: Lithology) -> String {
    let name = lithology.name();
    (1..=name.len())
        .map(|n| &name[..n])
        .find(|p| lithology_from_code(p) == Ok(lithology))
        .unwrap_or(name)
        .to_string()
}

/// The lithology a grain size names when none is typed: the rock name of its grade — sandstone
/// for sand, conglomerate for gravel, mudstone for silt and clay (mudstone as the general name of
/// mud rocks: Blatt, Middleton & Murray 1980, Origin of Sedimentary Rocks, ch. 11).
pub fn lithology_of_grain(grain: GrainSize) -> Lithology {
    let c = grain.class();
    if c >= WentworthClass::Granule {
        Lithology::Conglomerate
    } else if c.is_sand_or_coarser() {
        Lithology::Sandstone
    } else {
        Lithology::Mudstone
    }
}

/// Read a lithology cell: empty takes the lithology the grain size names
/// ([`lithology_of_grain`]); a cell with neither is refused.
pub fn lithology_entry(text: &str, grain: Option<GrainSize>) -> Result<Lithology, ShorthandError> {
    match (text.trim().is_empty(), grain) {
        (true, Some(g)) => Ok(lithology_of_grain(g)),
        (true, None) => Err(ShorthandError::Unknown {
            code: String::new(),
            what: "lithology",
            known: format!(
                "{}; or leave it empty and give a grain size, which names it",
                Lithology::ALL.map(|l| l.name()).join(", ")
            ),
        }),
        (false, _) => lithology_from_code(text),
    }
}

/// Read a grain size: a class code (`m`, `vf`, `pbl`, or the older `pb`), a class name or a
/// beginning of one that fits one class only (`peb`), or a measured size (`0.35mm`, `1.5phi`).
pub fn grain_from_code(text: &str) -> Result<GrainSize, ShorthandError> {
    let t = text.trim();
    if let Some(c) = WentworthClass::from_code(t) {
        return Ok(GrainSize::Class(c));
    }
    match GrainSize::parse(t) {
        Ok(g) => Ok(g),
        // A measured size that does not read: the core's own reason (phi out of range …).
        Err(why) if t.chars().any(|c| c.is_ascii_digit()) => Err(ShorthandError::Number(why)),
        Err(_) => {
            term_from_code::<WentworthClass>(t, "grain size").map(GrainSize::Class).map_err(|e| match e {
                ShorthandError::Unknown { code, what, .. } => ShorthandError::Unknown {
                    code,
                    what,
                    known: format!(
                        "{}; or a measured size such as 0.3mm or 2phi",
                        WentworthClass::ALL
                            .iter()
                            .map(|c| format!("{} ({})", c.name(), c.short_label()))
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                },
                other => other,
            })
        }
    }
}

/// A grain size written back as its class code or measured value.
pub fn grain_code(grain: GrainSize) -> String {
    match grain {
        GrainSize::Class(c) => c.short_label().to_string(),
        other => other.to_string(),
    }
}

/// Read a grain-size range: one size for both base and top, or base and top joined by `-`, `>`
/// or `to` (`c-m` coarse fining to medium sand). An empty cell is no grain size.
pub fn grain_range(text: &str) -> Result<(Option<GrainSize>, Option<GrainSize>), ShorthandError> {
    let t = text.trim();
    if t.is_empty() {
        return Ok((None, None));
    }
    if let Ok(one) = grain_from_code(t) {
        return Ok((Some(one), Some(one)));
    }
    // A measured phi may itself carry a minus sign (`-1.5phi`): split on a separator that has
    // text on both sides, trying `>` and " to " first.
    let split = t
        .split_once('>')
        .or_else(|| t.split_once(" to "))
        .or_else(|| t.char_indices().skip(1).find(|(_, c)| *c == '-').map(|(i, _)| (&t[..i], &t[i + 1..])));
    match split {
        Some((base, top)) => Ok((Some(grain_from_code(base)?), Some(grain_from_code(top)?))),
        None => Err(grain_from_code(t).err().unwrap_or_else(|| ShorthandError::Number(t.to_string()))),
    }
}

/// A base-and-top pair written back: one code when they agree, else `base-top`.
pub fn grain_range_code(base: Option<GrainSize>, top: Option<GrainSize>) -> String {
    match (base, top) {
        (None, None) => String::new(),
        (Some(b), Some(t)) if b == t => grain_code(b),
        (Some(b), None) | (None, Some(b)) => grain_code(b),
        (Some(b), Some(t)) => format!("{}-{}", grain_code(b), grain_code(t)),
    }
}

/// A contact and the erosional relief typed with it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ContactEntry {
    pub contact: Contact,
    /// Relief in metres (typed in the section's display unit); `None` when none was typed.
    pub relief_m: Option<f64>,
}

/// Read a contact with an optional relief in `unit`: `e1.2`, `e 1.2`, `erosional 1.2`,
/// `e40cm`, `s`, `g`. An empty cell is a sharp contact.
pub fn contact_entry(text: &str, unit: LengthUnit) -> Result<ContactEntry, ShorthandError> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(ContactEntry { contact: Contact::Sharp, relief_m: None });
    }
    let split = t.find(|c: char| c.is_ascii_digit() || c == '.').unwrap_or(t.len());
    let (word, number) = t.split_at(split);
    let contact = term_from_code::<Contact>(word, "contact")?;
    let number = number.trim();
    let relief_m = if number.is_empty() {
        None
    } else {
        match length(number, unit) {
            Ok(v) if v >= 0.0 => Some(v),
            _ => {
                return Err(ShorthandError::Number(format!(
                    "relief {number:?} is not a length ≥ 0 (in {}, or with m, cm or ft after it)",
                    unit.name()
                )))
            }
        }
    };
    if relief_m.is_some() && contact != Contact::Erosional {
        return Err(ShorthandError::Number(format!(
            "relief is measured on an erosional base; {} contacts have none",
            contact.name()
        )));
    }
    Ok(ContactEntry { contact, relief_m })
}

/// A contact and relief written back in `unit`: `e1.2`, `s`.
pub fn contact_code(contact: Contact, relief_m: Option<f64>, unit: LengthUnit) -> String {
    match relief_m {
        Some(r) => format!("{}{}", short_code(contact), length_code(r, unit)),
        None => short_code(contact),
    }
}

/// A paleosol as typed: development, features and carbonate stage.
#[derive(Debug, Clone, PartialEq)]
pub struct PaleosolEntry {
    pub development: PaleosolDevelopment,
    pub features: Vec<PaleosolFeature>,
    /// Carbonate stage 1–6 (written I–VI).
    pub carbonate_stage: Option<u8>,
}

const ROMAN: [&str; 6] = ["I", "II", "III", "IV", "V", "VI"];

/// Read a paleosol cell: development first (`w`, `m`, `s`, `vs` or the names), then feature
/// codes and a carbonate stage as a roman numeral (`s cn rt III`). Features alone (`rt`) are a
/// soil of no stated development. An empty cell is no paleosol.
pub fn paleosol_entry(text: &str) -> Result<PaleosolEntry, ShorthandError> {
    let t = text.trim();
    let none =
        PaleosolEntry { development: PaleosolDevelopment::None, features: Vec::new(), carbonate_stage: None };
    if t.is_empty() {
        return Ok(none);
    }
    // "very strong" is two words: take it whole before splitting.
    let lower = t.to_lowercase();
    let (development, rest) = if let Some(rest) = lower.strip_prefix("very strong") {
        (PaleosolDevelopment::VeryStrong, rest.to_string())
    } else {
        let mut parts = items(&lower);
        let first = parts.next().unwrap_or_default();
        match term_from_code::<PaleosolDevelopment>(first, "paleosol development") {
            Ok(d) => (d, parts.collect::<Vec<_>>().join(" ")),
            // Not a development: features (and a stage) alone, or a word that is neither.
            Err(dev_error) => match paleosol_features(&lower) {
                Ok((features, carbonate_stage)) => {
                    return Ok(PaleosolEntry {
                        development: PaleosolDevelopment::None,
                        features,
                        carbonate_stage,
                    })
                }
                Err(_) if matches!(dev_error, ShorthandError::Ambiguous { .. }) => return Err(dev_error),
                Err(_) => {
                    return Err(ShorthandError::Unknown {
                        code: first.to_string(),
                        what: "paleosol development or feature",
                        known: format!(
                            "development first: {}; then features: {}; and a carbonate stage I–VI",
                            known_codes(PaleosolDevelopment::ALL.iter().copied()),
                            known_codes(PaleosolFeature::ALL.iter().copied())
                        ),
                    })
                }
            },
        }
    };
    let (features, carbonate_stage) = paleosol_features(&rest)?;
    Ok(PaleosolEntry { development, features, carbonate_stage })
}

/// Feature codes and a carbonate stage (a roman numeral), in any order.
fn paleosol_features(text: &str) -> Result<(Vec<PaleosolFeature>, Option<u8>), ShorthandError> {
    let mut carbonate_stage = None;
    let mut names = Vec::new();
    for item in items(text) {
        if let Some(i) = ROMAN.iter().position(|r| r.eq_ignore_ascii_case(item)) {
            carbonate_stage = Some(i as u8 + 1);
        } else {
            names.push(item);
        }
    }
    let features = if names.is_empty() {
        Vec::new()
    } else {
        terms_from_codes::<PaleosolFeature>(&names.join(" "), "paleosol feature")?
    };
    Ok((features, carbonate_stage))
}

/// A paleosol written back in the notation; empty for no paleosol.
pub fn paleosol_code(entry: &PaleosolEntry) -> String {
    if entry.development == PaleosolDevelopment::None
        && entry.features.is_empty()
        && entry.carbonate_stage.is_none()
    {
        return String::new();
    }
    let mut parts = vec![short_code(entry.development)];
    parts.extend(entry.features.iter().map(|f| short_code(*f)));
    if let Some(s) = entry.carbonate_stage.filter(|s| (1..=6).contains(s)) {
        parts.push(ROMAN[s as usize - 1].to_string());
    }
    parts.join(" ")
}

/// Indicator codes of the paleocurrent cell, written after the azimuth (`210t`, `185p/22`).
pub const INDICATOR_CODES: &[(&str, Indicator)] = &[
    ("t", Indicator::TroughAxis),
    ("p", Indicator::PlanarForeset),
    ("r", Indicator::Ripple),
    ("i", Indicator::Imbrication),
    ("pl", Indicator::PartingLineation),
    ("f", Indicator::FluteCast),
    ("g", Indicator::GrooveCast),
    ("a", Indicator::AccretionSurface),
];

/// Read a paleocurrent cell: readings separated by spaces, commas or `;`. A reading is an
/// azimuth 0–360, optionally followed by an indicator code (t trough axis, p planar foreset,
/// r ripple, i imbrication, pl parting lineation, f flute cast, g groove cast, a accretion
/// surface) and `/dip` in degrees: `210`, `210t`, `185p/22`, `40a/12`.
pub fn paleocurrents(text: &str) -> Result<Vec<Paleocurrent>, ShorthandError> {
    items(text).map(paleocurrent).collect()
}

fn paleocurrent(item: &str) -> Result<Paleocurrent, ShorthandError> {
    let bad = || {
        ShorthandError::Number(format!(
            "{item:?} is not a paleocurrent reading: write an azimuth from 0 to 360°, optionally an indicator \
             code ({}) and /dip, e.g. 210, 210t, 185p/22",
            INDICATOR_CODES.iter().map(|(c, _)| *c).collect::<Vec<_>>().join(" ")
        ))
    };
    let (main, dip) = match item.split_once('/') {
        Some((m, d)) => (m, Some(d)),
        None => (item, None),
    };
    let main = main.trim().trim_end_matches('°');
    let split = main.find(|c: char| c.is_ascii_alphabetic()).unwrap_or(main.len());
    let (number, code) = main.split_at(split);
    let azimuth_deg = match number.trim().trim_end_matches('°').parse::<f64>() {
        Ok(v) if v.is_finite() && (0.0..=360.0).contains(&v) => v,
        _ => return Err(bad()),
    };
    let indicator = if code.is_empty() {
        Indicator::Unspecified
    } else {
        let code = code.to_ascii_lowercase();
        INDICATOR_CODES.iter().find(|(c, _)| *c == code).map(|(_, i)| *i).ok_or_else(bad)?
    };
    let dip_deg = match dip {
        None => None,
        Some(d) => match d.trim().trim_end_matches('°').parse::<f64>() {
            Ok(v) if v.is_finite() && (0.0..=90.0).contains(&v) => Some(v),
            _ => return Err(bad()),
        },
    };
    Ok(Paleocurrent { azimuth_deg, indicator, dip_deg })
}

/// Readings written back in the cell's form, separated by spaces.
pub fn paleocurrents_code(values: &[Paleocurrent]) -> String {
    values
        .iter()
        .map(|p| {
            let code = INDICATOR_CODES.iter().find(|(_, i)| *i == p.indicator).map_or("", |(c, _)| *c);
            let dip = p.dip_deg.map(|d| format!("/{}", trim_number(d))).unwrap_or_default();
            format!("{}{code}{dip}", trim_number(p.azimuth_deg))
        })
        .collect::<Vec<_>>()
        .join(" ")
}

/// A named surface at a bed's base as typed: its name, and its kind when given.
#[derive(Debug, Clone, PartialEq)]
pub struct SurfaceEntry {
    pub name: String,
    /// `None`: inferred from the contact and the paleosol below
    /// ([`crate::io::infer_surface_kind`]).
    pub kind: Option<SurfaceKind>,
}

/// Read a surface cell: a name, optionally followed by its kind in brackets (`RG-E1`,
/// `T2 (pt)`, `T2 (paleosol top)`). An empty cell is no surface.
pub fn surface_entry(text: &str) -> Result<Option<SurfaceEntry>, ShorthandError> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    let (name, kind) = match t.strip_suffix(')').and_then(|r| r.rsplit_once('(')) {
        Some((name, kind)) => (name.trim(), Some(term_from_code::<SurfaceKind>(kind, "surface kind")?)),
        None => (t, None),
    };
    if name.is_empty() {
        return Err(ShorthandError::Number(format!(
            "{t:?} gives a surface kind but no name; write the name first (e.g. SB-2 (is))"
        )));
    }
    Ok(Some(SurfaceEntry { name: name.to_string(), kind }))
}

/// A surface written back: `RG-E1 (is)`.
pub fn surface_code(name: &str, kind: SurfaceKind) -> String {
    format!("{name} ({})", short_code(kind))
}

/// Read a rank cell: empty leaves the base to the rules, else a rank by code or name.
pub fn rank_entry(text: &str) -> Result<Option<BaseRank>, ShorthandError> {
    if text.trim().is_empty() {
        return Ok(None);
    }
    term_from_code::<BaseRank>(text, "base rank").map(Some)
}

/// Read a samples cell: ids separated by `;`, each trimmed, empty ones left out. A sample
/// already on the bed under the same id keeps its kind and height.
pub fn samples(text: &str, existing: &[Sample]) -> Vec<Sample> {
    text.split(';')
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .map(|id| existing.iter().find(|s| s.id == id).cloned().unwrap_or_else(|| Sample::labelled(id)))
        .collect()
}

/// Sample ids written back in the cell's form.
pub fn samples_code(samples: &[Sample]) -> String {
    samples.iter().map(|s| s.id.as_str()).collect::<Vec<_>>().join("; ")
}

impl fmt::Display for PaleosolEntry {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&paleosol_code(self))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::WentworthClass as W;

    #[test]
    fn every_term_reads_back_from_its_own_code_and_from_its_name() {
        fn check<T: Term + fmt::Debug>() {
            for t in T::all() {
                let code = short_code(*t);
                assert_eq!(term_from_code::<T>(&code, "term"), Ok(*t), "code {code:?}");
                assert_eq!(term_from_code::<T>(t.term_name(), "term"), Ok(*t));
            }
        }
        check::<Structure>();
        check::<PaleosolFeature>();
        check::<Contact>();
        check::<PaleosolDevelopment>();
        check::<BaseRank>();
        check::<SurfaceKind>();
        for l in Lithology::ALL {
            assert_eq!(lithology_from_code(&lithology_code(l)), Ok(l), "{l}");
            assert_eq!(lithology_from_code(l.name()), Ok(l));
        }
        for c in W::ALL {
            assert_eq!(grain_from_code(&grain_code(GrainSize::Class(c))), Ok(GrainSize::Class(c)));
            assert_eq!(grain_from_code(c.name()), Ok(GrainSize::Class(c)));
        }
    }

    #[test]
    fn the_codes_shown_are_these() {
        // The codes the window shows and docs/notation.md lists: a change here is a change of
        // the notation, to be made in the documentation too.
        let shown = |list: String| list;
        assert_eq!(shown(codes(Structure::ALL)), "tcb pcb rcl hl ma la da i mc bl rt s cn mo dc b ssd");
        assert_eq!(shown(codes(PaleosolFeature::ALL)), "rt s cn m cc r g");
        assert_eq!(shown(codes(PaleosolDevelopment::ALL)), "n w m s vs");
        assert_eq!(shown(codes(Contact::ALL)), "s e g");
        assert_eq!(shown(codes(BaseRank::ALL)), "ss bb ws");
        assert_eq!(shown(codes(SurfaceKind::ALL)), "is pt o");
        let lith: Vec<String> = Lithology::ALL.iter().map(|l| lithology_code(*l)).collect();
        assert_eq!(lith.join(" "), "c m s si sa co b l d ma coa e t cov");
    }

    #[test]
    fn the_soil_features_among_the_structures_are_these_four() {
        let soil: Vec<Structure> =
            Structure::ALL.iter().copied().filter(|s| soil_feature(*s).is_some()).collect();
        assert_eq!(
            soil,
            [
                Structure::RootTraces,
                Structure::Slickensides,
                Structure::CarbonateNodules,
                Structure::Mottling
            ]
        );
        assert_eq!(soil_feature(Structure::RootTraces), Some(PaleosolFeature::RootTraces));
    }

    #[test]
    fn initials_and_beginnings_read_and_ambiguous_initials_say_so() {
        assert_eq!(term_from_code::<Structure>("tcb", "s"), Ok(Structure::TroughCrossBedding));
        assert_eq!(term_from_code::<Structure>("trough", "s"), Ok(Structure::TroughCrossBedding));
        assert_eq!(term_from_code::<Structure>("la", "s"), Ok(Structure::LateralAccretion));
        assert_eq!(term_from_code::<Structure>("mo", "s"), Ok(Structure::Mottling));
        let e = term_from_code::<Structure>("m", "structure").expect_err("m fits two structures");
        assert!(e.to_string().contains("massive") && e.to_string().contains("mottling"), "{e}");
        let e = term_from_code::<Structure>("zz", "structure").expect_err("zz fits none");
        assert!(e.to_string().contains("not a known structure") && e.to_string().contains("tcb"), "{e}");
    }

    #[test]
    fn grain_codes_names_old_codes_and_measured_sizes_read() {
        let g = |c| Ok(GrainSize::Class(c));
        assert_eq!(grain_from_code("pbl"), g(W::Pebble));
        assert_eq!(grain_from_code("pb"), g(W::Pebble), "the code shown before still reads");
        assert_eq!(grain_from_code("BD"), g(W::Boulder));
        assert_eq!(grain_from_code("peb"), g(W::Pebble));
        assert_eq!(grain_from_code("fine sand"), g(W::FineSand));
        // 0.25 mm is φ 2 by Krumbein (1934): φ = −log2(d / 1 mm).
        assert_eq!(grain_from_code("0.25mm"), Ok(GrainSize::Phi(2.0)));
        let e = grain_from_code("very").expect_err("two classes start so");
        assert!(
            e.to_string().contains("very fine sand") && e.to_string().contains("very coarse sand"),
            "{e}"
        );
        let e = grain_from_code("gravelish").expect_err("no class");
        assert!(e.to_string().contains("pebble (pbl)") && e.to_string().contains("0.3mm"), "{e}");
        let e = grain_from_code("20phi").expect_err("out of the core's range");
        assert!(e.to_string().contains("between -12 and 14"), "{e}");
    }

    #[test]
    fn grain_ranges_read_as_base_and_top() {
        let g = |c| Some(GrainSize::Class(c));
        assert_eq!(grain_range("c-m"), Ok((g(W::CoarseSand), g(W::MediumSand))));
        assert_eq!(grain_range("m"), Ok((g(W::MediumSand), g(W::MediumSand))));
        assert_eq!(grain_range("vf > f"), Ok((g(W::VeryFineSand), g(W::FineSand))));
        assert_eq!(grain_range("coarse sand to medium sand"), Ok((g(W::CoarseSand), g(W::MediumSand))));
        assert_eq!(grain_range("pbl-gr"), Ok((g(W::Pebble), g(W::Granule))));
        assert_eq!(grain_range(""), Ok((None, None)));
        assert!(grain_range("q-m").is_err());
        let (b, t) = grain_range("-1.5phi-1phi").expect("phi range");
        assert_eq!((b, t), (Some(GrainSize::Phi(-1.5)), Some(GrainSize::Phi(1.0))));
        assert_eq!(grain_range_code(g(W::CoarseSand), g(W::MediumSand)), "c-m");
        assert_eq!(grain_range_code(g(W::Cobble), g(W::Cobble)), "cbl");
    }

    #[test]
    fn thicknesses_read_in_the_sections_unit_with_a_covered_top() {
        let m = LengthUnit::Metre;
        let t = |text: &str| thickness_entry(text, m);
        assert_eq!(t("2.4"), Ok(ThicknessEntry { thickness_m: 2.4, covered_top_m: None }));
        assert_eq!(t(".6").map(|e| e.thickness_m), Ok(0.6));
        assert_eq!(t("40cm").map(|e| e.thickness_m), Ok(0.4));
        assert_eq!(t("1,5").map(|e| e.thickness_m), Ok(1.5), "a decimal comma");
        let cov = ThicknessEntry { thickness_m: 4.5, covered_top_m: Some(2.0) };
        for text in ["4.5 c2", "4.5c2", "4.5 cov 2", "4.5 covered 2", "4.5 C2"] {
            assert_eq!(t(text), Ok(cov), "{text}");
        }
        assert_eq!(cov.exposed_m(), 2.5);
        // The c of cm is a unit, not a covered top.
        assert_eq!(t("450cm c200cm"), Ok(ThicknessEntry { thickness_m: 4.5, covered_top_m: Some(2.0) }));
        // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
        let ft = thickness_entry("10 c2", LengthUnit::Foot).expect("feet");
        assert!(
            (ft.thickness_m - 3.048).abs() < 1e-12
                && (ft.covered_top_m.unwrap_or(0.0) - 0.6096).abs() < 1e-12
        );
        for bad in ["", "0", "-1", "abc", "NaN", "inf", "1e999"] {
            let e = t(bad).expect_err(bad);
            assert!(e.to_string().contains("> 0"), "{bad}: {e}");
        }
        for bad in ["4.5 c4.5", "4.5 c0", "4.5 c6"] {
            let e = t(bad).expect_err(bad);
            assert!(e.to_string().contains("covered top"), "{bad}: {e}");
        }
    }

    #[test]
    fn lithologies_read_by_first_letters_or_from_the_grain_size() {
        assert_eq!(lithology_from_code("sa"), Ok(Lithology::Sandstone));
        assert_eq!(lithology_from_code("Mud"), Ok(Lithology::Mudstone));
        assert_eq!(lithology_from_code("co"), Ok(Lithology::Conglomerate));
        assert_eq!(lithology_from_code("cov"), Ok(Lithology::Covered));
        let e = lithology_from_code("sandstne").expect_err("a typo is no beginning of a name");
        assert!(e.to_string().contains("claystone, mudstone"), "{e}");
        // Named from the grade of the grain size when the cell is empty (Blatt, Middleton &
        // Murray 1980: sandstone, conglomerate, and mudstone for mud rocks in general).
        let g = |c| Some(GrainSize::Class(c));
        assert_eq!(lithology_entry("", g(W::Clay)), Ok(Lithology::Mudstone));
        assert_eq!(lithology_entry("", g(W::Silt)), Ok(Lithology::Mudstone));
        assert_eq!(lithology_entry("", g(W::VeryFineSand)), Ok(Lithology::Sandstone));
        assert_eq!(lithology_entry("", g(W::VeryCoarseSand)), Ok(Lithology::Sandstone));
        assert_eq!(lithology_entry("", g(W::Granule)), Ok(Lithology::Conglomerate));
        assert_eq!(lithology_entry("", Some(GrainSize::Phi(2.0))), Ok(Lithology::Sandstone));
        assert_eq!(lithology_entry("si", g(W::Silt)), Ok(Lithology::Siltstone), "typed wins");
        assert!(lithology_entry(" ", None).is_err());
    }

    #[test]
    fn contacts_carry_their_relief_and_only_erosional_ones_have_relief() {
        let m = LengthUnit::Metre;
        let e = |r| Ok(ContactEntry { contact: Contact::Erosional, relief_m: r });
        assert_eq!(contact_entry("e1.2", m), e(Some(1.2)));
        assert_eq!(contact_entry("erosional 1.2 m", m), e(Some(1.2)));
        assert_eq!(contact_entry("e40cm", m), e(Some(0.4)));
        assert_eq!(contact_entry("e", m), e(None));
        assert_eq!(contact_entry("", m), Ok(ContactEntry { contact: Contact::Sharp, relief_m: None }));
        assert_eq!(contact_entry("g", m), Ok(ContactEntry { contact: Contact::Gradational, relief_m: None }));
        assert!(contact_entry("s0.5", m).is_err());
        assert_eq!(contact_code(Contact::Erosional, Some(1.2), m), "e1.2");
        // In a section shown in feet the relief is typed and shown in feet.
        let ft = contact_entry("e4", LengthUnit::Foot).expect("feet");
        assert!((ft.relief_m.unwrap_or(0.0) - 4.0 * 0.3048).abs() < 1e-12);
        assert_eq!(contact_code(Contact::Erosional, ft.relief_m, LengthUnit::Foot), "e4");
    }

    #[test]
    fn paleosols_read_development_features_and_stage() {
        let p = paleosol_entry("s cn rt III").expect("reads");
        assert_eq!(p.development, PaleosolDevelopment::Strong);
        assert_eq!(p.features, vec![PaleosolFeature::CarbonateNodules, PaleosolFeature::RootTraces]);
        assert_eq!(p.carbonate_stage, Some(3));
        assert_eq!(paleosol_entry(&paleosol_code(&p)), Ok(p));
        assert_eq!(paleosol_entry("very strong").map(|p| p.development), Ok(PaleosolDevelopment::VeryStrong));
        assert_eq!(paleosol_entry("").map(|p| p.development), Ok(PaleosolDevelopment::None));
        // Development first: `m` is moderate there, mottling after it.
        let p = paleosol_entry("m m").expect("reads");
        assert_eq!(
            (p.development, p.features),
            (PaleosolDevelopment::Moderate, vec![PaleosolFeature::Mottling])
        );
        // Features alone are a soil of no stated development.
        let p = paleosol_entry("rt sl").expect("features alone");
        assert_eq!(p.development, PaleosolDevelopment::None);
        assert_eq!(p.features, vec![PaleosolFeature::RootTraces, PaleosolFeature::Slickensides]);
        assert_eq!(paleosol_entry(&paleosol_code(&p)), Ok(p));
        let e = paleosol_entry("xx").expect_err("neither");
        assert!(e.to_string().contains("weak (w)") && e.to_string().contains("root traces (rt)"), "{e}");
        let e = paleosol_entry("w zz").expect_err("no such feature");
        assert!(e.to_string().contains("paleosol feature"), "{e}");
    }

    #[test]
    fn paleocurrents_read_as_a_list_in_range() {
        let az = |v: &[f64]| v.iter().map(|a| Paleocurrent::azimuth(*a)).collect::<Vec<_>>();
        assert_eq!(paleocurrents("200, 215;230"), Ok(az(&[200.0, 215.0, 230.0])));
        assert_eq!(paleocurrents("0 360 12.5°"), Ok(az(&[0.0, 360.0, 12.5])));
        let e = paleocurrents("400").expect_err("out of range");
        assert!(e.to_string().contains("\"400\"") && e.to_string().contains("0 to 360"), "{e}");
        assert!(paleocurrents("NE").is_err());
        assert!(paleocurrents("210x").is_err());
        assert!(paleocurrents("210p/95").is_err());
        assert_eq!(paleocurrents_code(&az(&[200.0, 212.5])), "200 212.5");
        let typed = paleocurrents("210t 185P/22 40a/12.5").expect("reads");
        assert_eq!(
            typed[0],
            Paleocurrent { azimuth_deg: 210.0, indicator: Indicator::TroughAxis, dip_deg: None }
        );
        assert_eq!(
            typed[1],
            Paleocurrent { azimuth_deg: 185.0, indicator: Indicator::PlanarForeset, dip_deg: Some(22.0) }
        );
        assert_eq!(typed[2].indicator, Indicator::AccretionSurface);
        assert_eq!(paleocurrents_code(&typed), "210t 185p/22 40a/12.5");
        assert_eq!(paleocurrents(&paleocurrents_code(&typed)), Ok(typed));
    }

    #[test]
    fn surfaces_ranks_and_samples_read() {
        assert_eq!(surface_entry("RG-E1"), Ok(Some(SurfaceEntry { name: "RG-E1".into(), kind: None })));
        assert_eq!(
            surface_entry(" T2 (pt) "),
            Ok(Some(SurfaceEntry { name: "T2".into(), kind: Some(SurfaceKind::PaleosolTop) }))
        );
        assert_eq!(
            surface_entry("SB (incision surface)").map(|s| s.and_then(|s| s.kind)),
            Ok(Some(SurfaceKind::Incision))
        );
        assert_eq!(surface_entry(""), Ok(None));
        assert!(surface_entry("(pt)").is_err());
        assert!(surface_entry("T2 (zz)")
            .expect_err("no such kind")
            .to_string()
            .contains("paleosol top (pt)"));
        assert_eq!(
            surface_entry(&surface_code("RG-E1", SurfaceKind::Incision)).map(|s| s.and_then(|s| s.kind)),
            Ok(Some(SurfaceKind::Incision))
        );
        assert_eq!(rank_entry("bb"), Ok(Some(BaseRank::BodyBase)));
        assert_eq!(rank_entry("within storey"), Ok(Some(BaseRank::WithinStorey)));
        assert_eq!(rank_entry(" "), Ok(None));
        assert!(rank_entry("x").is_err());
        assert_eq!(samples(" CW-1; ;CW-2 ", &[]), vec![Sample::labelled("CW-1"), Sample::labelled("CW-2")]);
        let kept = Sample {
            id: "CW-2".into(),
            kind: Some(crate::model::SampleKind::DetritalZircon),
            height_in_bed_m: Some(0.4),
        };
        assert_eq!(
            samples("CW-2; CW-3", std::slice::from_ref(&kept)),
            vec![kept.clone(), Sample::labelled("CW-3")]
        );
        assert_eq!(samples_code(&[kept, Sample::labelled("CW-3")]), "CW-2; CW-3");
    }
}
