//! Lithology vocabulary, its broad families for the rules, and the FGDC-STD-013-2006 pattern numbers.

use super::grain::normalise_term;
use serde::{Deserialize, Serialize};
use std::fmt;

/// Rock types a bed can be logged as.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Lithology {
    Claystone,
    Mudstone,
    Shale,
    Siltstone,
    Sandstone,
    Conglomerate,
    Breccia,
    Limestone,
    Dolostone,
    Marl,
    Coal,
    Evaporite,
    Tuff,
    /// No exposure: counts in height, left out of every proportion.
    Covered,
}

/// Broad families the rules reason with.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LithologyFamily {
    /// Claystone, mudstone, shale, siltstone.
    Fines,
    /// Sandstone.
    Sand,
    /// Conglomerate, breccia.
    Gravel,
    /// Limestone, dolostone, marl, coal, evaporite, tuff.
    NonClastic,
    /// Covered interval.
    Covered,
}

impl Lithology {
    /// Every lithology in the vocabulary.
    pub const ALL: [Lithology; 14] = [
        Self::Claystone,
        Self::Mudstone,
        Self::Shale,
        Self::Siltstone,
        Self::Sandstone,
        Self::Conglomerate,
        Self::Breccia,
        Self::Limestone,
        Self::Dolostone,
        Self::Marl,
        Self::Coal,
        Self::Evaporite,
        Self::Tuff,
        Self::Covered,
    ];

    /// Lower-case name as written in files and shown to the user.
    pub fn name(self) -> &'static str {
        match self {
            Self::Claystone => "claystone",
            Self::Mudstone => "mudstone",
            Self::Shale => "shale",
            Self::Siltstone => "siltstone",
            Self::Sandstone => "sandstone",
            Self::Conglomerate => "conglomerate",
            Self::Breccia => "breccia",
            Self::Limestone => "limestone",
            Self::Dolostone => "dolostone",
            Self::Marl => "marl",
            Self::Coal => "coal",
            Self::Evaporite => "evaporite",
            Self::Tuff => "tuff",
            Self::Covered => "covered",
        }
    }

    /// Case-insensitive parse of a vocabulary name.
    pub fn parse(text: &str) -> Option<Self> {
        let norm = normalise_term(text);
        Self::ALL.iter().copied().find(|l| l.name() == norm)
    }

    /// The family the rules use.
    pub fn family(self) -> LithologyFamily {
        match self {
            Self::Claystone | Self::Mudstone | Self::Shale | Self::Siltstone => LithologyFamily::Fines,
            Self::Sandstone => LithologyFamily::Sand,
            Self::Conglomerate | Self::Breccia => LithologyFamily::Gravel,
            Self::Limestone | Self::Dolostone | Self::Marl | Self::Coal | Self::Evaporite | Self::Tuff => {
                LithologyFamily::NonClastic
            }
            Self::Covered => LithologyFamily::Covered,
        }
    }

    /// Clastic rocks need a grain size; covered intervals must not have one; the rest may.
    pub fn grain_size_rule(self) -> GrainSizeRule {
        match self.family() {
            LithologyFamily::Fines | LithologyFamily::Sand | LithologyFamily::Gravel => {
                GrainSizeRule::Required
            }
            LithologyFamily::NonClastic => GrainSizeRule::Optional,
            LithologyFamily::Covered => GrainSizeRule::Forbidden,
        }
    }

    /// Pattern number in FGDC-STD-013-2006 section 37 ("Lithologic patterns") that the drawing
    /// follows; `None` for covered intervals, which have no rock to show.
    ///
    /// Claystone, mudstone and shale share 620 (clay or clay shale); sandstone uses 607 (massive
    /// sand or sandstone), evaporite 667 (gypsum), tuff 711 (tuffaceous rock; the standard's tuff
    /// patterns are 711–713, while 717 is basaltic flows). Every number is checked against the
    /// standard's names in `tests/tests/reference_fgdc_patterns.rs`.
    pub fn fgdc_pattern(self) -> Option<u16> {
        Some(match self {
            Self::Claystone | Self::Mudstone | Self::Shale => 620,
            Self::Siltstone => 616,
            Self::Sandstone => 607,
            Self::Conglomerate => 601,
            Self::Breccia => 605,
            Self::Limestone => 627,
            Self::Dolostone => 642,
            Self::Marl => 623,
            Self::Coal => 658,
            Self::Evaporite => 667,
            Self::Tuff => 711,
            Self::Covered => return None,
        })
    }
}

/// Whether a lithology takes a grain size.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum GrainSizeRule {
    Required,
    Optional,
    Forbidden,
}

impl fmt::Display for Lithology {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}
