//! The evidence behind each call, kept as data (kinds and numbers) and put into words only when
//! it is shown or written: interpreting a long section no longer formats thousands of sentences
//! that nobody reads, and the words stay in one place.
//!
//! Lengths are held in metres. Each value displays as one sentence with its lengths in metres,
//! and serialises as that sentence (the JSON output, whose heights are metres); `worded(unit)`
//! writes the same sentence with its lengths in a section's display unit, for the window and the
//! readable report.

use crate::model::{LengthUnit, PaleosolDevelopment, WentworthClass};
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

/// Which independent kind of evidence for a sequence boundary an item is. Items of one kind say
/// the same thing twice (a tagged incision with a large relief): a kind counts once.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum EvidenceKind {
    /// Erosional relief beyond one channel's depth, or the geologist's incision tag (Van Wagoner
    /// et al. 1990; Posamentier & Allen 1999; Holbrook 2001; Gibling 2006).
    Incision,
    /// Markedly coarser channel fills, or amalgamated over isolated stacking (Van Wagoner et al.
    /// 1990; Shanley & McCabe 1994; Posamentier & Allen 1999).
    BasinwardFaciesShift,
    /// A channel base on, or cutting into, a mature paleosol profile (Wright & Marriott 1993;
    /// McCarthy & Plint 1998).
    OnMaturePaleosol,
    /// A mature profile with no channel on it (Kraus 1999; McCarthy & Plint 1998).
    InterfluvePaleosol,
}

/// One piece of evidence for a candidate sequence boundary or a style hint. Variants marked
/// "site" describe what the surface is and count for nothing; the others each belong to one
/// [`EvidenceKind`] (see [`Evidence::kind`]).
#[derive(Debug, Clone, PartialEq)]
pub enum Evidence {
    /// Site: the base of a multi-storey body.
    MultiStoryBase { storeys: usize, amalgamated_bases: usize },
    /// Site: the base of a single-storey body.
    SingleStoryBase,
    /// Site: the base of a body seen only in part (one storey seen).
    PartlySeenBodyBase,
    /// Site: the top of a paleosol profile short of mature.
    PaleosolTop { development: PaleosolDevelopment },
    /// Site: a mature profile's top under a covered interval: whether a channel rests on it is not
    /// seen, so it is no interfluve evidence.
    TopCovered { development: PaleosolDevelopment },
    /// Site: a mature profile's top that a channel's relief cuts down into further up (at
    /// `at_m`): no interfluve; the evidence goes with that channel's base.
    CutByChannelAbove { development: PaleosolDevelopment, at_m: f64 },
    /// Site: a bed base the geologist named, of a kind other than an incision surface.
    NamedSurface { name: String },
    /// Incision: the geologist tagged the bed base as an incision surface.
    IncisionTagged { name: String },
    /// Incision: erosional relief beyond the set limit.
    ReliefOverLimit { relief_m: f64, limit_m: f64 },
    /// Incision: erosional relief beyond the thickest storey of the body it cuts into.
    ReliefOverStorey { relief_m: f64, storey_m: f64, cuts_into_own_body: bool },
    /// Facies shift: the channel fill above (its thickness-weighted median class, lags left out)
    /// is coarser than every fill in the stretch below.
    CoarserFill {
        above: WentworthClass,
        below: WentworthClass,
        classes: usize,
        bodies_below: usize,
        available_m: f64,
        window_m: f64,
    },
    /// Facies shift: an amalgamated body above only isolated ones in the stretch below.
    AmalgamatedOverIsolated { storeys: usize, isolated_below: usize, available_m: f64, window_m: f64 },
    /// On a mature paleosol: an erosional channel base directly on a mature profile.
    ErodesIntoPaleosol { development: PaleosolDevelopment },
    /// On a mature paleosol: a channel base of another contact directly on a mature profile.
    RestsOnPaleosol { development: PaleosolDevelopment },
    /// On a mature paleosol: a channel base whose relief reaches down to a mature profile.
    ReliefReachesPaleosol { relief_m: f64, development: PaleosolDevelopment, depth_m: f64 },
    /// Interfluve paleosol: a mature profile on floodplain fines, with no channel on it.
    InterfluvePaleosol { development: PaleosolDevelopment, poorly_drained: bool },
    /// Interfluve paleosol: a mature profile on a channel or splay sandstone top, with no channel
    /// on it (a long break in deposition after the channel was abandoned).
    SandstoneTopPaleosol { development: PaleosolDevelopment },
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

impl Evidence {
    /// The independent kind of boundary evidence this item is, or `None` for a site description,
    /// a style hint or a note.
    pub fn kind(&self) -> Option<EvidenceKind> {
        use Evidence::*;
        match self {
            IncisionTagged { .. } | ReliefOverLimit { .. } | ReliefOverStorey { .. } => {
                Some(EvidenceKind::Incision)
            }
            CoarserFill { .. } | AmalgamatedOverIsolated { .. } => Some(EvidenceKind::BasinwardFaciesShift),
            ErodesIntoPaleosol { .. } | RestsOnPaleosol { .. } | ReliefReachesPaleosol { .. } => {
                Some(EvidenceKind::OnMaturePaleosol)
            }
            InterfluvePaleosol { .. } | SandstoneTopPaleosol { .. } => Some(EvidenceKind::InterfluvePaleosol),
            _ => None,
        }
    }
}

/// An item of evidence or a regime's reasoning worded with its lengths in a display unit (see
/// [`Evidence::worded`], [`RegimeWhy::worded`]).
#[derive(Debug, Clone, Copy)]
pub struct Worded<'a, T> {
    item: &'a T,
    unit: LengthUnit,
}

/// "10 m", or "6.50 m (all the section has of the 10 m window)" when the section ends sooner;
/// in the display unit.
struct WindowText(f64, f64, LengthUnit);

impl fmt::Display for WindowText {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let (available, window, u) = (self.0, self.1, self.2);
        let window_text = format!("{} {u}", u.length(window).number_trimmed());
        if available + 1e-9 < window {
            write!(f, "{} (all the section has of the {window_text} window)", u.length(available))
        } else {
            f.write_str(&window_text)
        }
    }
}

impl Evidence {
    /// The sentence with its lengths in `unit` (a section's display unit).
    pub fn worded(&self, unit: LengthUnit) -> Worded<'_, Evidence> {
        Worded { item: self, unit }
    }
}

impl fmt::Display for Evidence {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        self.worded(LengthUnit::Metre).fmt(f)
    }
}

impl fmt::Display for Worded<'_, Evidence> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use Evidence::*;
        let u = self.unit;
        let len = |m: f64| u.length(m);
        match self.item {
            MultiStoryBase { storeys, amalgamated_bases } => write!(
                f,
                "base of a multi-storey channel body of {storeys} storeys ({amalgamated_bases} resting on channel sand)"
            ),
            SingleStoryBase => f.write_str("base of a single-storey channel body"),
            PartlySeenBodyBase => f.write_str(
                "base of a channel body seen only in part (stacking undetermined)",
            ),
            PaleosolTop { development } => write!(f, "top of a paleosol of {} development", development.name()),
            NamedSurface { name } => write!(f, "the geologist's surface \"{name}\""),
            TopCovered { development } => write!(
                f,
                "top of a paleosol of {} development under a covered interval: whether a channel rests on it is not seen",
                development.name()
            ),
            CutByChannelAbove { development, at_m } => write!(
                f,
                "top of a paleosol of {} development that the channel based at {} cuts down into (no interfluve)",
                development.name(),
                len(*at_m)
            ),
            IncisionTagged { name } if name.trim().is_empty() => {
                f.write_str("tagged by the geologist as an incision surface")
            }
            IncisionTagged { name } => write!(f, "tagged by the geologist as an incision surface (\"{name}\")"),
            ReliefOverLimit { relief_m, limit_m } => {
                write!(f, "erosional relief of {} exceeds the {} relief limit", len(*relief_m), len(*limit_m))
            }
            ReliefOverStorey { relief_m, storey_m, cuts_into_own_body } => write!(
                f,
                "erosional relief of {} exceeds the thickest storey ({}) of {}",
                len(*relief_m),
                len(*storey_m),
                if *cuts_into_own_body { "its own channel body" } else { "the channel body it cuts into" }
            ),
            CoarserFill { above, below, classes, bodies_below, available_m, window_m } => write!(
                f,
                "channel fill above is mostly {}, {classes} Wentworth classes coarser than the coarsest of the {bodies_below} \
                 channel fill{} in the {} below ({}; thickness-weighted median grain, lags left out)",
                above.name(),
                if *bodies_below == 1 { "" } else { "s" },
                WindowText(*available_m, *window_m, u),
                below.name()
            ),
            AmalgamatedOverIsolated { storeys, isolated_below, available_m, window_m } => write!(
                f,
                "a multi-storey body of {storeys} storeys above only single-storey bodies ({isolated_below}) in the {} below",
                WindowText(*available_m, *window_m, u)
            ),
            ErodesIntoPaleosol { development } => {
                write!(f, "erodes directly into a paleosol of {} development", development.name())
            }
            RestsOnPaleosol { development } => {
                write!(f, "channel base rests directly on a paleosol of {} development", development.name())
            }
            ReliefReachesPaleosol { relief_m, development, depth_m } => write!(
                f,
                "its {} relief reaches a paleosol of {} development {} below",
                len(*relief_m),
                development.name(),
                len(*depth_m)
            ),
            InterfluvePaleosol { development, poorly_drained } => write!(
                f,
                "paleosol of {} development{} caps floodplain fines with no channel on it (possible interfluve equivalent)",
                development.name(),
                if *poorly_drained { ", poorly drained," } else { "" }
            ),
            SandstoneTopPaleosol { development } => write!(
                f,
                "paleosol of {} development caps a sandstone with no channel on it (a long break in deposition)",
                development.name()
            ),
            CoarseGrained { coarsest } => write!(f, "coarse-grained: up to {}", coarsest.name()),
            BlockyProfile => f.write_str("blocky grain-size profile"),
            DownstreamAccretion => f.write_str("downstream-accretion surfaces recorded"),
            LittleMud { mud_m } => write!(f, "little mud inside the body ({} of drapes)", len(*mud_m)),
            FiningStoreys { fining, storeys } => write!(f, "{fining} of {storeys} storeys fine upward"),
            LateralAccretion => f.write_str("lateral-accretion surfaces recorded"),
            ThickOverbank { overbank_m, body_m } => {
                write!(f, "thick overbank fines above ({} over a {} body)", len(*overbank_m), len(*body_m))
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
    /// No channel body in the stretch: its proportion gives no sign.
    NoChannelBody { base_m: f64, top_m: f64 },
    /// Fewer signs than a call needs.
    TooFewSigns { signs: usize, needed: usize },
    /// Signs point both ways in equal number.
    Mixed { low: usize, high: usize },
    /// The proportion lies within the margin of a threshold, so it gives no sign.
    NearThreshold { proportion: f64, threshold: f64, margin: f64 },
    /// Isolated bodies, but too few for a sign of high accommodation.
    TooFewIsolated { bodies: usize, needed: usize },
    /// Every body in the stretch is seen only in part, so stacking gives no sign.
    PartlySeenBodies { bodies: usize },
}

impl Undetermined {
    /// The reason with its lengths in `unit` (a section's display unit).
    pub fn worded(&self, unit: LengthUnit) -> Worded<'_, Undetermined> {
        Worded { item: self, unit }
    }
}

impl fmt::Display for Undetermined {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        self.worded(LengthUnit::Metre).fmt(f)
    }
}

impl fmt::Display for Worded<'_, Undetermined> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use Undetermined::*;
        let u = self.unit;
        let number = |m: f64| u.from_metres(m);
        match self.item {
            NoThickness => f.write_str("the section has no thickness"),
            MostlyCovered { percent, base_m, top_m } => {
                write!(f, "mostly covered ({percent}% of {:.2}–{:.2} {u})", number(*base_m), number(*top_m))
            }
            NoChannelBody { base_m, top_m } => write!(
                f,
                "no channel body between {:.2} and {:.2} {u} (its channel-body proportion gives no sign)",
                number(*base_m),
                number(*top_m)
            ),
            TooFewSigns { signs, needed } => {
                write!(f, "{signs} sign{} found, a call needs {needed}", if *signs == 1 { "" } else { "s" })
            }
            Mixed { low, high } => write!(f, "mixed: {low} sign(s) of low and {high} of high accommodation"),
            NearThreshold { proportion, threshold, margin } => write!(
                f,
                "channel-body proportion {proportion:.2} is within {margin:.2} of the {threshold:.2} threshold (no sign either way)"
            ),
            TooFewIsolated { bodies, needed } => write!(
                f,
                "only {bodies} isolated single-storey bod{} (a sign of high accommodation needs {needed})",
                if *bodies == 1 { "y" } else { "ies" }
            ),
            PartlySeenBodies { bodies } => write!(
                f,
                "{bodies} channel bod{} seen only in part (cut by the section's base or top or a covered interval): stacking unknown",
                if *bodies == 1 { "y" } else { "ies" }
            ),
        }
    }
}

/// One sign for a regime in a stretch.
#[derive(Debug, Clone, PartialEq)]
pub enum RegimeSign {
    /// Low: most bodies multi-storey (amalgamated).
    Amalgamated { multi: usize, bodies: usize, partly_seen: usize },
    /// High: single-storey bodies isolated in fines, several of them.
    Isolated { single: usize, bodies: usize, partly_seen: usize },
    /// Low: a high channel-body proportion.
    SandRich { proportion: f64, min: f64 },
    /// High: a low channel-body proportion.
    MudRich { proportion: f64, max: f64 },
    /// Low: mature, well-drained paleosols are the majority (Wright & Marriott 1993).
    MatureSoils { mature: usize, profiles: usize },
    /// High: immature or poorly drained paleosols are the majority (Kraus 1999).
    ImmatureOrWetSoils { count: usize, profiles: usize },
}

impl fmt::Display for RegimeSign {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        use RegimeSign::*;
        match self {
            Amalgamated { multi, bodies, partly_seen } => {
                write!(
                    f,
                    "{multi} of {bodies} channel bodies multi-storey (amalgamated){}",
                    PartlySeen(*partly_seen)
                )
            }
            Isolated { single, bodies, partly_seen } => write!(
                f,
                "{single} of {bodies} channel bodies single-storey, isolated in floodplain fines{}",
                PartlySeen(*partly_seen)
            ),
            SandRich { proportion, min } => write!(f, "channel-body proportion {proportion:.2} (≥ {min:.2})"),
            MudRich { proportion, max } => write!(f, "channel-body proportion {proportion:.2} (≤ {max:.2})"),
            MatureSoils { mature, profiles } => {
                write!(f, "{mature} of {profiles} paleosols mature and well drained")
            }
            ImmatureOrWetSoils { count, profiles } => {
                write!(f, "{count} of {profiles} paleosols immature or poorly drained")
            }
        }
    }
}

/// " (2 more seen only in part)", or nothing.
struct PartlySeen(usize);

impl fmt::Display for PartlySeen {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self.0 {
            0 => Ok(()),
            n => write!(f, " ({n} more seen only in part)"),
        }
    }
}

/// The reasoning behind one accommodation-regime interval.
#[derive(Debug, Clone, PartialEq)]
pub enum RegimeWhy {
    /// Called low or high: the signs for the call and any against it.
    Called { signs: Vec<RegimeSign>, against: Vec<RegimeSign> },
    /// No call: the signs found each way and why they do not make one.
    Undetermined { signs: Vec<RegimeSign>, reasons: Vec<Undetermined> },
    /// Free text (examples and hand-made interpretations).
    Note(String),
}

/// Sentences joined with "; ".
fn join(f: &mut fmt::Formatter<'_>, items: impl Iterator<Item = String>) -> fmt::Result {
    for (k, text) in items.enumerate() {
        if k > 0 {
            f.write_str("; ")?;
        }
        f.write_str(&text)?;
    }
    Ok(())
}

impl RegimeWhy {
    /// The reasoning with its lengths in `unit` (a section's display unit).
    pub fn worded(&self, unit: LengthUnit) -> Worded<'_, RegimeWhy> {
        Worded { item: self, unit }
    }
}

impl fmt::Display for RegimeWhy {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        self.worded(LengthUnit::Metre).fmt(f)
    }
}

impl fmt::Display for Worded<'_, RegimeWhy> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let u = self.unit;
        match self.item {
            RegimeWhy::Called { signs, against } => {
                join(f, signs.iter().map(ToString::to_string))?;
                if !against.is_empty() {
                    f.write_str("; against: ")?;
                    join(f, against.iter().map(ToString::to_string))?;
                }
                Ok(())
            }
            RegimeWhy::Undetermined { signs, reasons } => {
                f.write_str("evidence too thin or mixed to call a regime: ")?;
                join(f, reasons.iter().map(|r| r.worded(u).to_string()))?;
                if !signs.is_empty() {
                    f.write_str("; signs found: ")?;
                    join(f, signs.iter().map(ToString::to_string))?;
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
        let e = Evidence::CoarserFill {
            above: WentworthClass::VeryCoarseSand,
            below: WentworthClass::MediumSand,
            classes: 2,
            bodies_below: 1,
            available_m: 6.5,
            window_m: 10.0,
        };
        assert_eq!(
            e.to_string(),
            "channel fill above is mostly very coarse sand, 2 Wentworth classes coarser than the coarsest of the 1 \
             channel fill in the 6.50 m (all the section has of the 10 m window) below (medium sand; \
             thickness-weighted median grain, lags left out)"
        );
        assert_eq!(e.kind(), Some(EvidenceKind::BasinwardFaciesShift));
        assert_eq!(Evidence::SingleStoryBase.kind(), None);
        assert_eq!(
            serde_json::to_value(Evidence::BlockyProfile).ok(),
            Some("blocky grain-size profile".into())
        );
    }

    #[test]
    fn lengths_are_worded_in_the_display_unit_and_metres_stay_as_they_were() {
        // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959): 3.048 m relief
        // is 10 ft, a 1.524 m limit 5 ft, a 10 m window 32.81 ft.
        let relief = Evidence::ReliefOverLimit { relief_m: 3.048, limit_m: 1.524 };
        assert_eq!(relief.to_string(), "erosional relief of 3.05 m exceeds the 1.52 m relief limit");
        assert_eq!(
            relief.worded(LengthUnit::Foot).to_string(),
            "erosional relief of 10.00 ft exceeds the 5.00 ft relief limit"
        );
        let reach = Evidence::ReliefReachesPaleosol {
            relief_m: 3.048,
            development: PaleosolDevelopment::Strong,
            depth_m: 0.6096,
        };
        assert_eq!(
            reach.worded(LengthUnit::Foot).to_string(),
            "its 10.00 ft relief reaches a paleosol of strong development 2.00 ft below"
        );
        let shift = Evidence::AmalgamatedOverIsolated {
            storeys: 2,
            isolated_below: 1,
            available_m: 10.0,
            window_m: 10.0,
        };
        assert!(shift.to_string().ends_with("in the 10 m below"), "{shift}");
        assert!(shift.worded(LengthUnit::Foot).to_string().ends_with("in the 32.81 ft below"));
        let why = RegimeWhy::Undetermined {
            signs: vec![],
            reasons: vec![Undetermined::NoChannelBody { base_m: 0.0, top_m: 3.048 }],
        };
        assert_eq!(
            why.worded(LengthUnit::Foot).to_string(),
            "evidence too thin or mixed to call a regime: no channel body between 0.00 and 10.00 ft (its \
             channel-body proportion gives no sign)"
        );
        assert!(why.to_string().contains("between 0.00 and 3.05 m"), "{why}");
        // A sentence with no length reads the same in any unit.
        assert_eq!(
            Evidence::SingleStoryBase.worded(LengthUnit::Foot).to_string(),
            Evidence::SingleStoryBase.to_string()
        );
    }

    #[test]
    fn regime_reasons_read_in_order() {
        let why = RegimeWhy::Undetermined {
            signs: vec![RegimeSign::Amalgamated { multi: 2, bodies: 2, partly_seen: 0 }],
            reasons: vec![
                Undetermined::NearThreshold { proportion: 0.52, threshold: 0.5, margin: 0.05 },
                Undetermined::TooFewSigns { signs: 1, needed: 2 },
            ],
        };
        assert_eq!(
            why.to_string(),
            "evidence too thin or mixed to call a regime: channel-body proportion 0.52 is within 0.05 of the 0.50 \
             threshold (no sign either way); 1 sign found, a call needs 2; signs found: 2 of 2 channel bodies \
             multi-storey (amalgamated)"
        );
    }
}
