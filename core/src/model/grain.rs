//! Grain size: Udden–Wentworth classes and Krumbein phi, with conversions between mm, phi and class.

use serde::{Deserialize, Serialize};
use std::fmt;

/// The Udden–Wentworth size classes (Wentworth 1922), finest first so that `Ord` runs fine → coarse.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum WentworthClass {
    Clay,
    Silt,
    VeryFineSand,
    FineSand,
    MediumSand,
    CoarseSand,
    VeryCoarseSand,
    Granule,
    Pebble,
    Cobble,
    Boulder,
}

impl WentworthClass {
    /// Every class, finest first.
    pub const ALL: [WentworthClass; 11] = [
        Self::Clay,
        Self::Silt,
        Self::VeryFineSand,
        Self::FineSand,
        Self::MediumSand,
        Self::CoarseSand,
        Self::VeryCoarseSand,
        Self::Granule,
        Self::Pebble,
        Self::Cobble,
        Self::Boulder,
    ];

    /// Position on the scale, 0 = clay … 10 = boulder (used to count class jumps and set widths).
    pub fn rank(self) -> usize {
        self as usize
    }

    /// The class at a rank (clamped to the scale).
    pub fn from_rank(rank: usize) -> Self {
        Self::ALL[rank.min(Self::ALL.len() - 1)]
    }

    /// Lower (fine) and upper (coarse) class limits in mm; open-ended classes give 0 or infinity.
    pub fn limits_mm(self) -> (f64, f64) {
        match self {
            Self::Clay => (0.0, 1.0 / 256.0),
            Self::Silt => (1.0 / 256.0, 1.0 / 16.0),
            Self::VeryFineSand => (1.0 / 16.0, 0.125),
            Self::FineSand => (0.125, 0.25),
            Self::MediumSand => (0.25, 0.5),
            Self::CoarseSand => (0.5, 1.0),
            Self::VeryCoarseSand => (1.0, 2.0),
            Self::Granule => (2.0, 4.0),
            Self::Pebble => (4.0, 64.0),
            Self::Cobble => (64.0, 256.0),
            Self::Boulder => (256.0, f64::INFINITY),
        }
    }

    /// Class midpoint in phi: the mean of the two phi limits. The open-ended classes (clay, boulder)
    /// have no published midpoint; we take one phi unit beyond their limit (φ 9 and φ −9), our own choice.
    pub fn midpoint_phi(self) -> f64 {
        match self {
            Self::Clay => 9.0,
            Self::Boulder => -9.0,
            other => {
                let (lo, hi) = other.limits_mm();
                (mm_to_phi(lo) + mm_to_phi(hi)) / 2.0
            }
        }
    }

    /// Class midpoint in mm (the geometric mean of the limits, i.e. 2^−midpoint φ).
    pub fn midpoint_mm(self) -> f64 {
        phi_to_mm(self.midpoint_phi())
    }

    /// The class a diameter belongs to. A value on a limit belongs to the coarser class
    /// (e.g. 2 mm is granule, 1/16 mm is very fine sand): "silt < 1/16 mm ≤ sand".
    pub fn from_mm(d_mm: f64) -> Option<Self> {
        if !(d_mm.is_finite() && d_mm > 0.0) {
            return None;
        }
        Self::ALL.iter().rev().copied().find(|c| d_mm >= c.limits_mm().0)
    }

    /// The class of a phi value (same limit convention as [`WentworthClass::from_mm`]).
    pub fn from_phi(phi: f64) -> Option<Self> {
        if !phi.is_finite() {
            return None;
        }
        // Compare in phi to avoid rounding at the limits: d ≥ limit ⇔ φ ≤ φ(limit).
        Self::ALL.iter().rev().copied().find(|c| {
            let lo = c.limits_mm().0;
            lo == 0.0 || phi <= mm_to_phi(lo)
        })
    }

    /// Name as a geologist writes it ("very fine sand").
    pub fn name(self) -> &'static str {
        match self {
            Self::Clay => "clay",
            Self::Silt => "silt",
            Self::VeryFineSand => "very fine sand",
            Self::FineSand => "fine sand",
            Self::MediumSand => "medium sand",
            Self::CoarseSand => "coarse sand",
            Self::VeryCoarseSand => "very coarse sand",
            Self::Granule => "granule",
            Self::Pebble => "pebble",
            Self::Cobble => "cobble",
            Self::Boulder => "boulder",
        }
    }

    /// The class's code, shown on the grain-size scale under a column, in the bed table and in
    /// the compact notation: the abbreviations geologists write on logs (common practice):
    /// cl, si, vf, f, m, c, vc, gr, pbl, cbl, bld.
    pub fn short_label(self) -> &'static str {
        match self {
            Self::Clay => "cl",
            Self::Silt => "si",
            Self::VeryFineSand => "vf",
            Self::FineSand => "f",
            Self::MediumSand => "m",
            Self::CoarseSand => "c",
            Self::VeryCoarseSand => "vc",
            Self::Granule => "gr",
            Self::Pebble => "pbl",
            Self::Cobble => "cbl",
            Self::Boulder => "bld",
        }
    }

    /// Other codes read as a class: the codes Aggrade showed before (`pb`, `cb`, `bd`), so that
    /// older tables still read, and `gran` for granule (common practice).
    pub const CODE_ALIASES: [(&'static str, WentworthClass); 4] =
        [("pb", Self::Pebble), ("cb", Self::Cobble), ("bd", Self::Boulder), ("gran", Self::Granule)];

    /// The class a code names ([`WentworthClass::short_label`] or one of
    /// [`WentworthClass::CODE_ALIASES`]), case-insensitive and trimmed.
    pub fn from_code(code: &str) -> Option<Self> {
        let t = code.trim();
        Self::ALL
            .iter()
            .copied()
            .find(|c| c.short_label().eq_ignore_ascii_case(t))
            .or_else(|| Self::CODE_ALIASES.iter().find(|(a, _)| a.eq_ignore_ascii_case(t)).map(|(_, c)| *c))
    }

    /// Parse a class name: case-insensitive, spaces, underscores or hyphens between words.
    pub fn parse(text: &str) -> Option<Self> {
        let norm = normalise_term(text);
        // Names are lower-case words joined by single spaces: compare without allocating.
        Self::ALL
            .iter()
            .copied()
            .find(|c| c.name().bytes().map(|b| if b == b' ' { b'_' } else { b }).eq(norm.bytes()))
    }

    /// True for sand and coarser (very fine sand … boulder).
    pub fn is_sand_or_coarser(self) -> bool {
        self >= Self::VeryFineSand
    }
}

impl fmt::Display for WentworthClass {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// Krumbein (1934) phi: φ = −log2(d / 1 mm).
pub fn mm_to_phi(d_mm: f64) -> f64 {
    -(d_mm.log2())
}

/// Inverse of [`mm_to_phi`]: d = 2^−φ mm.
pub fn phi_to_mm(phi: f64) -> f64 {
    (-phi).exp2()
}

/// Lower-case a vocabulary term and fold spaces, hyphens and underscores to single underscores.
pub fn normalise_term(text: &str) -> String {
    text.trim()
        .to_lowercase()
        .split(|c: char| c.is_whitespace() || c == '_' || c == '-')
        .filter(|w| !w.is_empty())
        .collect::<Vec<_>>()
        .join("_")
}

/// A grain size as the geologist recorded it: a Wentworth class, or a measured value kept in phi.
///
/// Serialised as text: a class name (`"fine sand"`) or a phi value (`"1.5phi"`). Entering mm
/// (`"0.35mm"`) converts to phi on input.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(try_from = "String", into = "String")]
pub enum GrainSize {
    /// A class read by eye with a grain-size card.
    Class(WentworthClass),
    /// A measured size in Krumbein phi.
    Phi(f64),
}

impl GrainSize {
    /// Phi used for drawing and arithmetic: the class midpoint or the measured value.
    pub fn phi(self) -> f64 {
        match self {
            Self::Class(c) => c.midpoint_phi(),
            Self::Phi(p) => p,
        }
    }

    /// The Wentworth class this size falls in.
    pub fn class(self) -> WentworthClass {
        match self {
            Self::Class(c) => c,
            Self::Phi(p) => WentworthClass::from_phi(p).unwrap_or(WentworthClass::Clay),
        }
    }

    /// Parse `fine sand`, `fine_sand`, `0.35mm`, `0.35 mm`, `1.5phi`, `-2 φ`.
    pub fn parse(text: &str) -> Result<Self, String> {
        let t = text.trim();
        if let Some(c) = WentworthClass::parse(t) {
            return Ok(Self::Class(c));
        }
        let lower = t.to_lowercase();
        let number = |s: &str| -> Option<f64> { s.trim().parse::<f64>().ok().filter(|v| v.is_finite()) };
        if let Some(num) = lower.strip_suffix("mm").and_then(number) {
            if num > 0.0 {
                return Ok(Self::Phi(mm_to_phi(num)));
            }
            return Err(format!("a diameter must be > 0 mm, got {t:?}"));
        }
        if let Some(num) = lower.strip_suffix("phi").or_else(|| lower.strip_suffix('φ')).and_then(number) {
            if (-12.0..=14.0).contains(&num) {
                return Ok(Self::Phi(num));
            }
            return Err(format!("phi must lie between -12 and 14, got {t:?}"));
        }
        Err(format!(
            "{t:?} is not a grain size: use a Wentworth class ({}) or a number with mm or phi (0.35mm, 1.5phi)",
            WentworthClass::ALL.map(|c| c.name()).join(", ")
        ))
    }
}

impl fmt::Display for GrainSize {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Self::Class(c) => f.write_str(c.name()),
            Self::Phi(p) => write!(f, "{}phi", fmt_trim(*p)),
        }
    }
}

/// Format a number with up to 4 decimals and no trailing zeros.
pub(crate) fn fmt_trim(v: f64) -> String {
    let s = format!("{v:.4}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".to_string()
    } else {
        s.to_string()
    }
}

/// The stored text form: a class name, or phi with every digit needed to read back the same
/// number (display uses 4 decimals; storing those would change a value on every save).
impl From<GrainSize> for String {
    fn from(g: GrainSize) -> String {
        match g {
            GrainSize::Class(c) => c.name().to_string(),
            GrainSize::Phi(p) => format!("{p}phi"),
        }
    }
}

impl TryFrom<String> for GrainSize {
    type Error = String;
    fn try_from(s: String) -> Result<Self, String> {
        GrainSize::parse(&s)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parse_forms() {
        assert_eq!(GrainSize::parse("Fine_Sand"), Ok(GrainSize::Class(WentworthClass::FineSand)));
        assert_eq!(GrainSize::parse("very-fine sand"), Ok(GrainSize::Class(WentworthClass::VeryFineSand)));
        assert_eq!(GrainSize::parse("0.25mm"), Ok(GrainSize::Phi(2.0)));
        assert_eq!(GrainSize::parse("1.5 phi"), Ok(GrainSize::Phi(1.5)));
        assert!(GrainSize::parse("gravelish").is_err());
        assert!(GrainSize::parse("0mm").is_err());
        assert!(GrainSize::parse("NaNphi").is_err());
    }

    #[test]
    fn stored_text_keeps_every_digit() {
        let g = GrainSize::parse("0.2mm").expect("valid");
        assert_eq!(GrainSize::parse(&String::from(g)), Ok(g));
        assert_eq!(String::from(GrainSize::Phi(-1.0)), "-1phi");
    }

    #[test]
    fn text_round_trip() {
        for g in [GrainSize::Class(WentworthClass::Pebble), GrainSize::Phi(-1.25), GrainSize::Phi(2.4739)] {
            assert_eq!(GrainSize::parse(&g.to_string()), Ok(g));
        }
    }

    #[test]
    fn codes_are_the_usual_abbreviations_and_the_old_ones_still_read() {
        use WentworthClass as W;
        // The abbreviations geologists write on logs (common practice).
        let shown: Vec<&str> = W::ALL.iter().map(|c| c.short_label()).collect();
        assert_eq!(shown, ["cl", "si", "vf", "f", "m", "c", "vc", "gr", "pbl", "cbl", "bld"]);
        for c in W::ALL {
            assert_eq!(W::from_code(c.short_label()), Some(c));
            assert_eq!(W::from_code(&c.short_label().to_uppercase()), Some(c));
        }
        // Codes shown by earlier versions, still in older tables.
        assert_eq!(W::from_code("pb"), Some(W::Pebble));
        assert_eq!(W::from_code(" cb "), Some(W::Cobble));
        assert_eq!(W::from_code("bd"), Some(W::Boulder));
        assert_eq!(W::from_code("gran"), Some(W::Granule));
        assert_eq!(W::from_code("pebble"), None, "names are read by parse, not as codes");
        // No alias shadows another class's code.
        for (a, _) in W::CODE_ALIASES {
            assert!(W::ALL.iter().all(|c| c.short_label() != a), "{a}");
        }
    }

    #[test]
    fn classes_ordered_and_ranked() {
        for (i, c) in WentworthClass::ALL.iter().enumerate() {
            assert_eq!(c.rank(), i);
            assert_eq!(WentworthClass::from_rank(i), *c);
        }
        assert!(WentworthClass::Granule > WentworthClass::VeryCoarseSand);
    }
}
