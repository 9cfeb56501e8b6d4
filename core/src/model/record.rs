//! What a geologist records at a bed beyond its rock: samples, photographs, paleocurrent
//! readings with their indicator, Munsell colour and soil-horizon designations.

use super::vocab::{Indicator, SampleKind};
use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::fmt;

/// A sample taken from a bed.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Sample {
    /// The label on the bag ("SC-14").
    pub id: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub kind: Option<SampleKind>,
    /// Height above the bed's base, metres (0 ≤ h ≤ thickness).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub height_in_bed_m: Option<f64>,
}

impl Sample {
    /// A sample with an id only.
    pub fn labelled(id: impl Into<String>) -> Self {
        Sample { id: id.into(), kind: None, height_in_bed_m: None }
    }
}

/// A photograph of a bed: the camera's file name or number, and optionally a path to the image.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Photo {
    /// "IMG_2041", "roll 3 #12".
    pub reference: String,
    /// An image file, absolute or relative to the project file.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub file: Option<String>,
}

/// One paleocurrent reading: the azimuth as measured, what it was measured on and, for a plane
/// (a foreset, an accretion surface, imbricated clasts), its dip.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Paleocurrent {
    /// Degrees clockwise from north, 0 ≤ a ≤ 360.
    pub azimuth_deg: f64,
    #[serde(default, skip_serializing_if = "is_unspecified")]
    pub indicator: Indicator,
    /// Dip of the measured plane, degrees (0–90); for a line, its plunge.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub dip_deg: Option<f64>,
}

fn is_unspecified(i: &Indicator) -> bool {
    *i == Indicator::Unspecified
}

impl Paleocurrent {
    /// A reading of unspecified indicator (what version-1 files and the bed table's plain
    /// numbers hold).
    pub fn azimuth(azimuth_deg: f64) -> Self {
        Paleocurrent { azimuth_deg, indicator: Indicator::Unspecified, dip_deg: None }
    }
}

/// Why a Munsell notation did not read.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{0:?} is not a Munsell notation: write hue value/chroma, e.g. \"10YR 5/4\", \"5R 4/6\" or \"N 7/\"")]
pub struct MunsellError(pub String);

/// The ten principal and intermediate Munsell hues.
const HUE_LETTERS: &[&str] = &["R", "YR", "Y", "GY", "G", "BG", "B", "PB", "P", "RP"];

/// A Munsell colour notation such as `10YR 5/4` (hue, value/chroma) or `N 7/` (neutral), as in
/// the Munsell Soil Color Charts and the GSA Rock-Color Chart.
#[derive(Debug, Clone, PartialEq)]
pub struct Munsell {
    /// Hue step, 0 < step ≤ 10 (2.5, 5, 7.5, 10 on the charts); 0 for neutral.
    pub hue_step: f64,
    /// "YR", "R" … or "N" for neutral.
    pub hue: String,
    /// Value (lightness), 0–10.
    pub value: f64,
    /// Chroma (saturation), 0–30; 0 for neutral.
    pub chroma: f64,
}

impl Munsell {
    /// Read a notation: `10YR 5/4`, `2.5Y 6/2`, `N 7/` or `N 7/0`; spaces optional, letters in any
    /// case.
    pub fn parse(text: &str) -> Result<Munsell, MunsellError> {
        let bad = || MunsellError(text.to_string());
        let t: String = text.split_whitespace().collect::<Vec<_>>().join("");
        if t.len() > 16 {
            return Err(bad());
        }
        let upper = t.to_uppercase();
        // Split "10YR5/4" into "10", "YR", "5/4".
        let digits_end = upper.find(|c: char| !(c.is_ascii_digit() || c == '.')).ok_or_else(bad)?;
        let letters_end = upper[digits_end..]
            .find(|c: char| !c.is_ascii_alphabetic())
            .map(|i| i + digits_end)
            .ok_or_else(bad)?;
        let step_text = &upper[..digits_end];
        let hue = &upper[digits_end..letters_end];
        let (value_text, chroma_text) = upper[letters_end..].split_once('/').ok_or_else(bad)?;
        let value: f64 = value_text.parse().map_err(|_| bad())?;
        if !(0.0..=10.0).contains(&value) {
            return Err(bad());
        }
        if hue == "N" {
            if !step_text.is_empty() {
                return Err(bad());
            }
            let chroma: f64 =
                if chroma_text.is_empty() { 0.0 } else { chroma_text.parse().map_err(|_| bad())? };
            if chroma != 0.0 {
                return Err(bad());
            }
            return Ok(Munsell { hue_step: 0.0, hue: "N".into(), value, chroma: 0.0 });
        }
        let hue = HUE_LETTERS.iter().find(|h| **h == hue).ok_or_else(bad)?;
        let hue_step: f64 = step_text.parse().map_err(|_| bad())?;
        let chroma: f64 = chroma_text.parse().map_err(|_| bad())?;
        if !(hue_step > 0.0 && hue_step <= 10.0 && (0.0..=30.0).contains(&chroma)) {
            return Err(bad());
        }
        Ok(Munsell { hue_step, hue: hue.to_string(), value, chroma })
    }
}

impl fmt::Display for Munsell {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.hue == "N" {
            write!(f, "N {}/", self.value)
        } else {
            write!(f, "{}{} {}/{}", self.hue_step, self.hue, self.value, self.chroma)
        }
    }
}

impl Serialize for Munsell {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

impl<'de> Deserialize<'de> for Munsell {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let text = String::deserialize(d)?;
        Munsell::parse(&text).map_err(serde::de::Error::custom)
    }
}

/// Why a soil-horizon designation did not read.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{0:?} is not a soil-horizon designation: write a master horizon (O, A, E, B, C, R) with optional suffixes, e.g. \"A\", \"Bt\", \"Bk2\", \"Bss\", \"Bg\", \"2C\"")]
pub struct HorizonError(pub String);

/// Lower-case suffixes of horizon designations (Soil Survey Staff, Keys to Soil Taxonomy; the
/// paleosol usage of Retallack 2001). `ss` (slickensides) and `kk` are doubled letters.
const HORIZON_SUFFIXES: &str = "abcdefghijkmnopqrstvwxyz";

/// A soil-horizon designation such as `Bt`, `Bk2`, `Bss`, `2Bg` or the transitional `BC`.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SoilHorizon(String);

impl SoilHorizon {
    /// Read a designation: an optional discontinuity number, one or two master letters
    /// (O A E B C R; two for a transitional horizon), lower-case suffixes, an optional
    /// subdivision number. Case matters as it does in the designations.
    pub fn parse(text: &str) -> Result<SoilHorizon, HorizonError> {
        let t = text.trim();
        let bad = || HorizonError(t.to_string());
        if t.is_empty() || t.len() > 12 {
            return Err(bad());
        }
        let rest = t.trim_start_matches(|c: char| c.is_ascii_digit());
        let masters = rest.chars().take_while(|c| "OAEBCR".contains(*c)).count();
        if masters == 0 || masters > 2 {
            return Err(bad());
        }
        let rest = &rest[masters..];
        let rest =
            rest.strip_prefix('/').map_or(rest, |r| r.trim_start_matches(|c: char| "OAEBCR".contains(c)));
        let suffix_end = rest.find(|c: char| !HORIZON_SUFFIXES.contains(c)).unwrap_or(rest.len());
        let tail = &rest[suffix_end..];
        if !tail.chars().all(|c| c.is_ascii_digit()) {
            return Err(bad());
        }
        Ok(SoilHorizon(t.to_string()))
    }

    /// The designation as written.
    pub fn as_str(&self) -> &str {
        &self.0
    }

    /// The master horizon letter ('A', 'B' …), the first after any discontinuity number.
    pub fn master(&self) -> char {
        self.0.chars().find(|c| c.is_ascii_uppercase()).unwrap_or('?')
    }

    /// The lower-case suffix letters of the designation ("t", "k", "ss", "g").
    pub fn suffixes(&self) -> &str {
        let start = self.0.find(|c: char| c.is_ascii_lowercase()).unwrap_or(self.0.len());
        let end = self.0[start..].find(|c: char| !c.is_ascii_lowercase()).map_or(self.0.len(), |i| start + i);
        &self.0[start..end]
    }

    /// True when the designation carries this suffix (`has("k")` for Bk, `has("ss")` for Bss).
    pub fn has(&self, suffix: &str) -> bool {
        let s = self.suffixes();
        if suffix == "s" {
            return s.contains('s') && !s.contains("ss");
        }
        s.contains(suffix)
    }
}

impl fmt::Display for SoilHorizon {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

impl Serialize for SoilHorizon {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.0)
    }
}

impl<'de> Deserialize<'de> for SoilHorizon {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let text = String::deserialize(d)?;
        SoilHorizon::parse(&text).map_err(serde::de::Error::custom)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn munsell_notations_of_the_soil_charts_read_and_write_back() {
        // Notation as printed on the Munsell Soil Color Charts (hue value/chroma; N for neutral).
        for (text, written) in [
            ("10YR 5/4", "10YR 5/4"),
            ("2.5y 6/2", "2.5Y 6/2"),
            ("5R4/6", "5R 4/6"),
            ("N 7/", "N 7/"),
            ("N 7/0", "N 7/"),
        ] {
            let m = Munsell::parse(text).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_eq!(m.to_string(), written);
        }
        let m = Munsell::parse("7.5YR 4/6").expect("reads");
        assert_eq!((m.hue_step, m.hue.as_str(), m.value, m.chroma), (7.5, "YR", 4.0, 6.0));
        for bad in [
            "",
            "red",
            "10XX 5/4",
            "10YR 5",
            "10YR 11/4",
            "0YR 5/4",
            "12YR 5/4",
            "N 5/3",
            "5 5/4",
            "10YR 5/x",
        ] {
            assert!(Munsell::parse(bad).is_err(), "{bad:?} must not read");
        }
    }

    #[test]
    fn horizon_designations_follow_the_soil_survey_form() {
        // Designations after the Soil Survey Staff (Keys to Soil Taxonomy) as used for paleosols
        // by Retallack (2001).
        for good in ["A", "E", "Bt", "Bk2", "Bss", "Bg", "C", "2Bt", "BC", "Btk", "R", "Bkm", "E/B"] {
            assert!(SoilHorizon::parse(good).is_ok(), "{good} must read");
        }
        for bad in ["", "bt", "X", "Bt-", "BCAD", "Bt2x!", "t"] {
            assert!(SoilHorizon::parse(bad).is_err(), "{bad:?} must not read");
        }
        let h = SoilHorizon::parse("2Btk1").expect("reads");
        assert_eq!(h.master(), 'B');
        assert_eq!(h.suffixes(), "tk");
        assert!(h.has("k") && h.has("t") && !h.has("g"));
        assert!(SoilHorizon::parse("Bss").expect("reads").has("ss"));
        assert!(!SoilHorizon::parse("Bss").expect("reads").has("s"));
    }
}
