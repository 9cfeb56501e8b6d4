//! The evidence behind each call, kept as data (kinds and numbers) and put into words only when
//! it is shown or written: interpreting a long section no longer formats thousands of sentences
//! that nobody reads, and the words stay in one place.
//!
//! Each value displays as one sentence and serialises as that sentence, so the JSON output and
//! the screen read exactly as before.

use crate::model::{PaleosolDevelopment, WentworthClass};
use serde::{Serialize, Serializer};
use std::fmt;

/// Free text converts into the `Note` variant, and the value serialises as its sentence.
macro_rules! sentences {
    ($($t:ident),+) => {$(
        impl From<&str> for $t {
            fn from(text: &str) -> Self {
                $t::Note(text.to_string())
            }
        }

        impl Serialize for $t {
            fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                s.collect_str(self)
            }
        }
    )+};
}

/// One piece of evidence for a candidate sequence boundary or a style hint.
#[derive(Debug, Clone, PartialEq)]
pub enum Evidence {
    /// The boundary is the base of a multi-story body.
    MultiStoryBase { storeys: usize },
    /// The boundary is the erosional base of a single-story body.
    SingleStoryBase,
    /// The boundary is the erosional base of a body seen only in part (one storey seen).
    PartlySeenBodyBase,
    /// The bed below is a paleosol too weakly developed to count as strong.
    PaleosolTop { development: PaleosolDevelopment },
    /// Grain size jumps up across the boundary by `classes` Wentworth classes.
    GrainJump { classes: i64, from: WentworthClass, to: WentworthClass },
    /// Erosional relief beyond the set limit.
    ReliefOverLimit { relief_m: f64, limit_m: f64 },
    /// Erosional relief beyond the thickness of the storey below.
    ReliefOverStorey { relief_m: f64, storey_m: f64 },
    /// A channel base directly on a strongly developed paleosol.
    ErodesIntoPaleosol { development: PaleosolDevelopment },
    /// A channel base whose relief reaches down to a strongly developed paleosol.
    ReliefReachesPaleosol { relief_m: f64, development: PaleosolDevelopment, depth_m: f64 },
    /// A strong paleosol on floodplain fines, not cut by a channel here.
    InterfluvePaleosol { development: PaleosolDevelopment },
    /// A strong paleosol on a channel or splay sandstone top, not cut by a channel here.
    SandstoneTopPaleosol { development: PaleosolDevelopment },
    /// Channel-body proportion rises across the boundary.
    ProportionRise { below: f64, above: f64, window_m: f64 },
    /// Braided-like: coarse grain.
    CoarseGrained { coarsest: WentworthClass },
    /// Braided-like: blocky grain-size profile.
    BlockyProfile,
    /// Braided-like: downstream-accretion surfaces.
    DownstreamAccretion,
    /// Braided-like: little mud inside the body.
    LittleMud { mud_m: f64 },
    /// Meandering-like: most storeys fine upward.
    FiningStoreys { fining: usize, storeys: usize },
    /// Meandering-like: lateral-accretion surfaces.
    LateralAccretion,
    /// Meandering-like: thick overbank fines above the body.
    ThickOverbank { overbank_m: f64, body_m: f64 },
    /// Free text (examples and hand-made interpretations).
    Note(String),
}

impl fmt::Display for Evidence {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use Evidence::*;
        match self {
            MultiStoryBase { storeys } => {
                write!(f, "base of a multi-story (amalgamated) channel body of {storeys} storeys")
            }
            SingleStoryBase => f.write_str("erosional base of a single-story channel body"),
            PartlySeenBodyBase => f.write_str(
                "erosional base of a channel body seen only in part (stacking undetermined)",
            ),
            PaleosolTop { development } => write!(f, "top of a paleosol of {} development", development.name()),
            GrainJump { classes, from, to } => write!(
                f,
                "grain size jumps up {classes} Wentworth classes, from {} to {}",
                from.name(),
                to.name()
            ),
            ReliefOverLimit { relief_m, limit_m } => {
                write!(f, "erosional relief of {relief_m:.2} m exceeds the {limit_m:.2} m relief limit")
            }
            ReliefOverStorey { relief_m, storey_m } => {
                write!(f, "erosional relief of {relief_m:.2} m exceeds the {storey_m:.2} m storey below")
            }
            ErodesIntoPaleosol { development } => {
                write!(f, "erodes directly into a paleosol of {} development", development.name())
            }
            ReliefReachesPaleosol { relief_m, development, depth_m } => write!(
                f,
                "its {relief_m:.2} m relief reaches a paleosol of {} development {depth_m:.2} m below",
                development.name()
            ),
            InterfluvePaleosol { development } => write!(
                f,
                "paleosol of {} development caps floodplain fines (possible interfluve equivalent)",
                development.name()
            ),
            SandstoneTopPaleosol { development } => write!(
                f,
                "paleosol of {} development caps a sandstone (a long break in deposition above the channel)",
                development.name()
            ),
            ProportionRise { below, above, window_m } => write!(
                f,
                "channel-body proportion rises from {below:.2} in the {window_m} m below to {above:.2} in the {window_m} m above"
            ),
            CoarseGrained { coarsest } => write!(f, "coarse-grained: up to {}", coarsest.name()),
            BlockyProfile => f.write_str("blocky grain-size profile"),
            DownstreamAccretion => f.write_str("downstream-accretion surfaces recorded"),
            LittleMud { mud_m } => write!(f, "little mud inside the body ({mud_m:.2} m of drapes)"),
            FiningStoreys { fining, storeys } => write!(f, "{fining} of {storeys} storeys fine upward"),
            LateralAccretion => f.write_str("lateral-accretion surfaces recorded"),
            ThickOverbank { overbank_m, body_m } => {
                write!(f, "thick overbank fines above ({overbank_m:.2} m over a {body_m:.2} m body)")
            }
            Note(text) => f.write_str(text),
        }
    }
}

/// Why one stretch of section got no accommodation regime.
#[derive(Debug, Clone, PartialEq)]
pub enum Undetermined {
    /// The whole section is zero thickness.
    NoThickness,
    /// Too much of the stretch is covered.
    MostlyCovered { percent: f64, base_m: f64, top_m: f64 },
    /// No channel body in the stretch (or no exposure to measure a proportion on).
    NoChannelBody { base_m: f64, top_m: f64 },
    /// A multi-story body, but too little channel deposit around it for low accommodation.
    MultiStoryTooLittle { base_m: f64, proportion: f64, min: f64 },
    /// A single-story body, but too much channel deposit around it for high accommodation.
    SingleStoryTooMuch { base_m: f64, proportion: f64, max: f64 },
    /// Too few isolated bodies in a row for a high-accommodation call.
    TooFewIsolated { bodies: usize, needed: usize },
    /// The stretch's body is seen only in part, so its stacking is unknown.
    PartlySeenBody { base_m: f64 },
}

impl fmt::Display for Undetermined {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use Undetermined::*;
        match self {
            NoThickness => f.write_str("the section has no thickness"),
            MostlyCovered { percent, base_m, top_m } => {
                write!(f, "mostly covered ({percent}% of {base_m:.2}–{top_m:.2} m)")
            }
            NoChannelBody { base_m, top_m } => write!(f, "no channel body between {base_m:.2} and {top_m:.2} m"),
            MultiStoryTooLittle { base_m, proportion, min } => write!(
                f,
                "multi-story body at {base_m:.2} m but channel-body proportion only {proportion:.2} (low accommodation needs ≥ {min:.2})"
            ),
            SingleStoryTooMuch { base_m, proportion, max } => write!(
                f,
                "single-story body at {base_m:.2} m but channel-body proportion {proportion:.2} (high accommodation needs ≤ {max:.2})"
            ),
            PartlySeenBody { base_m } => write!(
                f,
                "channel body at {base_m:.2} m seen only in part (cut by the section's base or top or a covered interval): stacking undetermined"
            ),
            TooFewIsolated { bodies, needed } => write!(
                f,
                "only {bodies} isolated single-story bod{} (high accommodation needs {needed} in a row)",
                if *bodies == 1 { "y" } else { "ies" }
            ),
        }
    }
}

/// The reasoning behind one accommodation-regime interval.
#[derive(Debug, Clone, PartialEq)]
pub enum RegimeWhy {
    /// Amalgamated, sand-rich stacking.
    Low { bodies: usize, storeys: usize, amalgamated_bases: usize, proportion: Option<f64>, min: f64 },
    /// Single-story bodies isolated in fines.
    High { bodies: usize, proportion: Option<f64>, max: f64 },
    /// The reasons of every stretch in the interval, in order (repeats are written once).
    Undetermined { reasons: Vec<Undetermined> },
    /// Free text (examples and hand-made interpretations).
    Note(String),
}

/// "0.42", or "none (no exposure)".
struct ProportionText(Option<f64>);

impl fmt::Display for ProportionText {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.0 {
            Some(p) => write!(f, "{p:.2}"),
            None => f.write_str("none (no exposure)"),
        }
    }
}

impl fmt::Display for RegimeWhy {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RegimeWhy::Low { bodies, storeys, amalgamated_bases, proportion, min } => write!(
                f,
                "{bodies} multi-story channel bod{} ({storeys} storeys, {amalgamated_bases} storey base{} on channel sand) and a \
                 channel-body proportion of {} (≥ {min:.2}): amalgamated, sand-rich stacking suggests low accommodation",
                if *bodies == 1 { "y" } else { "ies" },
                if *amalgamated_bases == 1 { "" } else { "s" },
                ProportionText(*proportion),
            ),
            RegimeWhy::High { bodies, proportion, max } => write!(
                f,
                "{bodies} single-story channel bodies isolated in floodplain fines and a channel-body proportion of {} \
                 (≤ {max:.2}): suggests high accommodation",
                ProportionText(*proportion),
            ),
            RegimeWhy::Undetermined { reasons } => {
                f.write_str("evidence too thin or mixed to call a regime: ")?;
                // Each sentence once, in first-seen order; a set keeps long intervals linear.
                let mut seen = std::collections::HashSet::new();
                let mut first = true;
                for text in reasons.iter().map(ToString::to_string) {
                    if seen.contains(&text) {
                        continue;
                    }
                    if !first {
                        f.write_str("; ")?;
                    }
                    first = false;
                    f.write_str(&text)?;
                    seen.insert(text);
                }
                Ok(())
            }
            RegimeWhy::Note(text) => f.write_str(text),
        }
    }
}

sentences!(Evidence, RegimeWhy);

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sentences_read_as_written_out_by_hand() {
        let e =
            Evidence::GrainJump { classes: 3, from: WentworthClass::Silt, to: WentworthClass::MediumSand };
        assert_eq!(e.to_string(), "grain size jumps up 3 Wentworth classes, from silt to medium sand");
        let e = Evidence::ProportionRise { below: 0.2, above: 0.8, window_m: 10.0 };
        assert_eq!(
            e.to_string(),
            "channel-body proportion rises from 0.20 in the 10 m below to 0.80 in the 10 m above"
        );
        assert_eq!(
            serde_json::to_value(Evidence::BlockyProfile).ok(),
            Some("blocky grain-size profile".into())
        );
    }

    #[test]
    fn undetermined_reasons_are_written_once_each_in_order() {
        let why = RegimeWhy::Undetermined {
            reasons: vec![
                Undetermined::NoChannelBody { base_m: 0.0, top_m: 2.0 },
                Undetermined::TooFewIsolated { bodies: 1, needed: 2 },
                Undetermined::NoChannelBody { base_m: 0.0, top_m: 2.0 },
            ],
        };
        assert_eq!(
            why.to_string(),
            "evidence too thin or mixed to call a regime: no channel body between 0.00 and 2.00 m; \
             only 1 isolated single-story body (high accommodation needs 2 in a row)"
        );
        let high = RegimeWhy::High { bodies: 3, proportion: None, max: 0.3 };
        assert!(high.to_string().contains("proportion of none (no exposure) (≤ 0.30)"), "{high}");
    }
}
