//! The compact notation for typing a whole bed on one line: a grain-size range such as `c-m`,
//! structures and paleosol features by short codes, a contact with its relief, paleocurrents as a
//! list. The bed table and bed-table CSV cells read the same notation, and each value is shown
//! back in it, so what is typed is what is seen. Full names always work too.
//!
//! | cell | notation | example |
//! | --- | --- | --- |
//! | grain | a class code or name, or base and top joined by `-` or `>` | `c-m` coarse fining to medium sand |
//! | structures | codes separated by spaces or commas | `tcb la` trough cross-bedding, lateral accretion |
//! | contact | `s`, `e`, `g`, then the erosional relief | `e1.2` erosional, 1.2 of relief |
//! | paleosol | development first, then features and a carbonate stage I–VI | `s cn rt III` |
//! | paleocurrents | azimuths in degrees, separated by spaces, commas or semicolons | `200 215 230` |
//!
//! A term's code is the initials of its words (`tcb` trough cross-bedding, `rt` root traces) or
//! any beginning of its name that fits no other term (`trough`, `mo` mottling). Where initials
//! fit two terms (`m`: massive or mottling) the message names both and asks for more letters.

use super::grain::{normalise_term, GrainSize, WentworthClass};
use super::vocab::{Contact, PaleosolDevelopment, PaleosolFeature, Structure};
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
terms!(Structure, PaleosolFeature, Contact, PaleosolDevelopment);

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
    let known =
        T::all().iter().map(|t| format!("{} ({})", t.term_name(), short_code(*t))).collect::<Vec<_>>();
    ShorthandError::Unknown { code: code.trim().to_string(), what, known: known.join(", ") }
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

/// Terms written back as codes separated by spaces.
pub fn codes<T: Term>(terms: &[T]) -> String {
    terms.iter().map(|t| short_code(*t)).collect::<Vec<_>>().join(" ")
}

/// Read a grain size: a class code (`m`, `vf`, `gr`), a class name, or a measured size (`0.35mm`).
pub fn grain_from_code(text: &str) -> Result<GrainSize, ShorthandError> {
    let t = text.trim();
    if let Some(c) = WentworthClass::ALL.iter().copied().find(|c| c.short_label().eq_ignore_ascii_case(t)) {
        return Ok(GrainSize::Class(c));
    }
    GrainSize::parse(t).map_err(ShorthandError::Number)
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

/// A contact and the erosional relief typed with it (in the unit the caller shows).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ContactEntry {
    pub contact: Contact,
    /// Relief as typed, in the caller's display unit; `None` when none was typed.
    pub relief: Option<f64>,
}

/// Read a contact with an optional relief: `e1.2`, `e 1.2`, `erosional 1.2`, `s`, `g`.
pub fn contact_entry(text: &str) -> Result<ContactEntry, ShorthandError> {
    let t = text.trim();
    let split = t.find(|c: char| c.is_ascii_digit() || c == '.').unwrap_or(t.len());
    let (word, number) = t.split_at(split);
    let contact = term_from_code::<Contact>(word, "contact")?;
    let number = number.trim().trim_end_matches('m').trim();
    let relief = if number.is_empty() {
        None
    } else {
        match number.parse::<f64>() {
            Ok(v) if v.is_finite() && v >= 0.0 => Some(v),
            _ => return Err(ShorthandError::Number(format!("relief {number:?} is not a number ≥ 0"))),
        }
    };
    if relief.is_some() && contact != Contact::Erosional {
        return Err(ShorthandError::Number(format!(
            "relief is measured on an erosional base; {} contacts have none",
            contact.name()
        )));
    }
    Ok(ContactEntry { contact, relief })
}

/// A contact and relief written back: `e1.2`, `s`.
pub fn contact_code(contact: Contact, relief: Option<f64>) -> String {
    match relief {
        Some(r) => format!("{}{}", short_code(contact), trim_number(r)),
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
/// codes and a carbonate stage as a roman numeral (`s cn rt III`). An empty cell is no paleosol.
pub fn paleosol_entry(text: &str) -> Result<PaleosolEntry, ShorthandError> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(PaleosolEntry {
            development: PaleosolDevelopment::None,
            features: Vec::new(),
            carbonate_stage: None,
        });
    }
    // "very strong" is two words: take it whole before splitting.
    let lower = t.to_lowercase();
    let (development, rest) = if let Some(rest) = lower.strip_prefix("very strong") {
        (PaleosolDevelopment::VeryStrong, rest.to_string())
    } else {
        let mut parts = items(&lower);
        let first = parts.next().unwrap_or_default();
        (
            term_from_code::<PaleosolDevelopment>(first, "paleosol development")?,
            parts.collect::<Vec<_>>().join(" "),
        )
    };
    let mut features = Vec::new();
    let mut carbonate_stage = None;
    let mut names = Vec::new();
    for item in items(&rest) {
        if let Some(i) = ROMAN.iter().position(|r| r.eq_ignore_ascii_case(item)) {
            carbonate_stage = Some(i as u8 + 1);
        } else {
            names.push(item);
        }
    }
    if !names.is_empty() {
        features = terms_from_codes::<PaleosolFeature>(&names.join(" "), "paleosol feature")?;
    }
    Ok(PaleosolEntry { development, features, carbonate_stage })
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

/// Read paleocurrent azimuths in degrees (0–360), separated by spaces, commas or semicolons.
pub fn paleocurrents(text: &str) -> Result<Vec<f64>, ShorthandError> {
    items(text)
        .map(|s| match s.trim_end_matches('°').parse::<f64>() {
            Ok(v) if v.is_finite() && (0.0..=360.0).contains(&v) => Ok(v),
            _ => Err(ShorthandError::Number(format!("{s:?} is not an azimuth from 0 to 360 degrees"))),
        })
        .collect()
}

/// Azimuths written back, separated by spaces.
pub fn paleocurrents_code(values: &[f64]) -> String {
    values.iter().map(|v| trim_number(*v)).collect::<Vec<_>>().join(" ")
}

/// A number without trailing zeros: `1.2`, `210`.
fn trim_number(v: f64) -> String {
    let s = format!("{v:.3}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
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
    fn grain_ranges_read_as_base_and_top() {
        let g = |c| Some(GrainSize::Class(c));
        assert_eq!(grain_range("c-m"), Ok((g(W::CoarseSand), g(W::MediumSand))));
        assert_eq!(grain_range("m"), Ok((g(W::MediumSand), g(W::MediumSand))));
        assert_eq!(grain_range("vf > f"), Ok((g(W::VeryFineSand), g(W::FineSand))));
        assert_eq!(grain_range("coarse sand to medium sand"), Ok((g(W::CoarseSand), g(W::MediumSand))));
        assert_eq!(grain_range(""), Ok((None, None)));
        assert!(grain_range("q-m").is_err());
        let (b, t) = grain_range("-1.5phi-1phi").expect("phi range");
        assert_eq!((b, t), (Some(GrainSize::Phi(-1.5)), Some(GrainSize::Phi(1.0))));
        assert_eq!(grain_range_code(g(W::CoarseSand), g(W::MediumSand)), "c-m");
    }

    #[test]
    fn contacts_carry_their_relief_and_only_erosional_ones_have_relief() {
        assert_eq!(
            contact_entry("e1.2"),
            Ok(ContactEntry { contact: Contact::Erosional, relief: Some(1.2) })
        );
        assert_eq!(
            contact_entry("erosional 1.2 m"),
            Ok(ContactEntry { contact: Contact::Erosional, relief: Some(1.2) })
        );
        assert_eq!(contact_entry("g"), Ok(ContactEntry { contact: Contact::Gradational, relief: None }));
        assert!(contact_entry("s0.5").is_err());
        assert_eq!(contact_code(Contact::Erosional, Some(1.2)), "e1.2");
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
    }

    #[test]
    fn paleocurrents_read_as_a_list_in_range() {
        assert_eq!(paleocurrents("200, 215;230"), Ok(vec![200.0, 215.0, 230.0]));
        assert!(paleocurrents("400").is_err());
        assert_eq!(paleocurrents_code(&[200.0, 212.5]), "200 212.5");
    }
}
