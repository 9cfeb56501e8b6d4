//! What the interpretation rules produce: data with its evidence, never drawing or errors.
//!
//! Heights are metres above the section base. Field names ending in `_m` are serialised without
//! the suffix (`base`, `top`, `height`) to keep the `aggrade interpret --json` contract.

use super::evidence::{Evidence, RegimeWhy};
use crate::model::{BedId, Drainage, GrainSize, LengthUnit, PaleosolDevelopment, ReviewState};
use serde::Serialize;

/// The depositional element a bed is read as.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Element {
    ChannelDeposit,
    OverbankFines,
    SplaySand,
    Paleosol,
    Covered,
    Other,
}

/// One channel-filling episode: from an erosional base up to the next erosional base or the
/// overbank fines that cap it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Storey {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    /// Index of the lowest and highest bed in the storey (inclusive).
    pub first_bed: usize,
    pub last_bed: usize,
    /// True when the storey's base rests on channel sand of the storey below (not on fines).
    pub amalgamated_base: bool,
    /// True when a paleosol profile caps the storey's own sand (a soil on a sandstone top): the
    /// channel body ends there.
    pub capped_by_paleosol: bool,
    /// Index into `Interpretation::channel_bodies` of the body the storey belongs to.
    pub body: usize,
}

/// How the storeys of a channel body are stacked. Written `multi-storey`, `single-storey` (the
/// spelling of "storey" used everywhere); output written before that choice said `multi-story`,
/// `single-story`, which [`Stacking::parse`] still reads.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
pub enum Stacking {
    /// Two or more storeys: amalgamated.
    #[serde(rename = "multi-storey")]
    MultiStory,
    /// One storey encased in floodplain fines: isolated.
    #[serde(rename = "single-storey")]
    SingleStory,
    /// One storey seen, but the body is cut by the section's base or top or by a covered
    /// interval: more storeys may lie in the part not seen.
    #[serde(rename = "undetermined")]
    Undetermined,
}

impl Stacking {
    /// The term as shown and written (`multi-storey`, `single-storey`, `undetermined`).
    pub fn name(self) -> &'static str {
        match self {
            Stacking::MultiStory => "multi-storey",
            Stacking::SingleStory => "single-storey",
            Stacking::Undetermined => "undetermined",
        }
    }

    /// The term as written now or before (`multi-story`, `single-story`), in any case, with
    /// spaces, hyphens or underscores.
    pub fn parse(text: &str) -> Option<Stacking> {
        let norm: String = text
            .trim()
            .chars()
            .map(|c| if c == ' ' || c == '_' { '-' } else { c.to_ascii_lowercase() })
            .collect();
        match norm.as_str() {
            "multi-storey" | "multi-story" => Some(Stacking::MultiStory),
            "single-storey" | "single-story" => Some(Stacking::SingleStory),
            "undetermined" => Some(Stacking::Undetermined),
            _ => None,
        }
    }
}

/// Which end of a channel body is not seen: it lies at the section's base or top, or against a
/// covered interval.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Censor {
    Base,
    Top,
}

/// Vertical grain-size profile of a body.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum GrainProfile {
    FiningUpward,
    CoarseningUpward,
    Blocky,
    Unknown,
}

/// A fluvial style a body resembles.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum FluvialStyle {
    BraidedLike,
    MeanderingLike,
}

/// A style hint with the evidence behind it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StyleHint {
    pub style: FluvialStyle,
    pub evidence: Vec<Evidence>,
}

/// Storeys stacked with nothing but thin drapes between them.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ChannelBody {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    #[serde(rename = "thickness")]
    pub thickness_m: f64,
    /// How many storeys the body has (the JSON key keeps its first spelling, `stories`).
    pub stories: usize,
    pub stacking: Stacking,
    /// Ends not seen (`base`, `top`); when not empty the thickness is a minimum.
    pub censored: Vec<Censor>,
    /// How many storey bases rest on channel sand rather than fines.
    pub amalgamated_bases: usize,
    pub grain_finest: Option<GrainSize>,
    pub grain_coarsest: Option<GrainSize>,
    pub profile: GrainProfile,
    pub style_hint: Option<StyleHint>,
    /// Indices into `Interpretation::storeys`.
    pub storey_indices: Vec<usize>,
    /// Share of the sensitivity runs (0–1) in which the body came out the same (same base, top
    /// and stacking); only after a sensitivity run.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stability: Option<f64>,
    /// The parameter change nearest the values used that makes the body come out differently.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub flipped_by: Option<Flip>,
}

impl ChannelBody {
    /// True when an end of the body is not seen, so that its thickness is a minimum.
    pub fn is_censored(&self) -> bool {
        !self.censored.is_empty()
    }

    /// Thickness as written for people: "≥ 4.20 m" when censored, "4.20 m" otherwise.
    pub fn thickness_text(&self) -> String {
        self.thickness_text_in(LengthUnit::Metre)
    }

    /// [`ChannelBody::thickness_text`] in a section's display unit ("≥ 13.78 ft").
    pub fn thickness_text_in(&self, unit: LengthUnit) -> String {
        let at_least = if self.is_censored() { "\u{2265} " } else { "" };
        format!("{at_least}{}", unit.length(self.thickness_m))
    }
}

/// What raised a paleosol profile's maturity above the development logged for its beds.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum MaturitySign {
    /// A carbonate horizon of a high morphological stage.
    CarbonateStage,
    /// Designated soil horizons (A, E, B, O) where no development was logged: a soil was seen.
    DesignatedHorizon,
    /// A Bt horizon with clay coatings: an argillic horizon.
    ArgillicHorizon,
    /// A Bk horizon with a carbonate stage of at least II: a calcic horizon.
    CalcicHorizon,
    /// A Bss horizon: a vertic (slickensided, shrink–swell) subsurface horizon.
    VerticHorizon,
    /// Especially or unusually thick B horizons.
    ThickBHorizon,
}

impl MaturitySign {
    /// The sign in words, as the readable report lists it ("raised by its carbonate stage").
    pub fn words(self) -> &'static str {
        match self {
            MaturitySign::CarbonateStage => "raised by its carbonate stage",
            MaturitySign::DesignatedHorizon => "raised by its designated soil horizons",
            MaturitySign::ArgillicHorizon => "raised by a Bt horizon with clay coatings",
            MaturitySign::CalcicHorizon => "raised by a Bk horizon of carbonate stage II or more",
            MaturitySign::VerticHorizon => "raised by a Bss horizon",
            MaturitySign::ThickBHorizon => "raised by the thickness of its B horizons",
        }
    }
}

/// Where a profile's drainage reading comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum DrainageBasis {
    /// The geologist's drainage class on the horizons that carry the maturity (or, where none
    /// of those has one, on another horizon of the profile).
    Logged,
    /// Gleying logged, a `g` horizon suffix or a low-chroma (gleyed) matrix on the horizons that
    /// carry the maturity: poorly drained.
    Gleyed,
    /// Mottles in a high-chroma or red matrix, or mottles with no matrix colour logged, on the
    /// horizons that carry the maturity: somewhat poorly (imperfectly) drained.
    Mottled,
    /// Neither: read as not poorly drained.
    NoSign,
}

/// How wet a profile is read to have been, graded as the Soil Survey Manual's drainage classes
/// group: gleyed soils (poorly and very poorly drained) apart from mottled but oxidised ones
/// (somewhat poorly, "imperfectly", drained) apart from the rest.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum DrainageReading {
    /// Well or moderately well drained, or no wet sign where the maturity is.
    NotPoorly,
    /// Somewhat poorly (imperfectly) drained: wet for part of the year, the matrix still
    /// oxidised (Kraus & Aslan 1993).
    Imperfectly,
    /// Poorly or very poorly drained: waterlogged long enough to gley the matrix.
    Poorly,
}

impl DrainageReading {
    /// The reading for a logged Soil Survey Manual class.
    pub fn of_class(d: Drainage) -> DrainageReading {
        match d {
            Drainage::WellDrained | Drainage::ModeratelyWellDrained => DrainageReading::NotPoorly,
            Drainage::SomewhatPoorlyDrained => DrainageReading::Imperfectly,
            Drainage::PoorlyDrained | Drainage::VeryPoorlyDrained => DrainageReading::Poorly,
        }
    }

    /// The reading in words.
    pub fn words(self) -> &'static str {
        match self {
            DrainageReading::NotPoorly => "not poorly drained",
            DrainageReading::Imperfectly => "imperfectly (somewhat poorly) drained",
            DrainageReading::Poorly => "poorly drained",
        }
    }
}

/// The wet sign a drainage reading was taken from, on one horizon.
#[derive(Debug, Clone, PartialEq)]
pub enum WetSign {
    /// Gleying logged as a paleosol feature.
    Gleying,
    /// A `g` suffix on the designation (`Bg`, `Cg`).
    GleyedHorizon,
    /// A matrix of low chroma (gleyed colours), mottled or not; the Munsell notation as logged.
    LowChromaMatrix { munsell: String, mottled: bool },
    /// Mottles in a matrix of high chroma or red hue; the Munsell notation as logged.
    MottlesInOxidisedMatrix { munsell: String },
    /// Mottles with no Munsell colour of the matrix logged.
    MottlesNoColour,
}

impl WetSign {
    /// The reading the sign gives.
    pub fn reading(&self) -> DrainageReading {
        match self {
            WetSign::Gleying | WetSign::GleyedHorizon | WetSign::LowChromaMatrix { .. } => {
                DrainageReading::Poorly
            }
            WetSign::MottlesInOxidisedMatrix { .. } | WetSign::MottlesNoColour => {
                DrainageReading::Imperfectly
            }
        }
    }

    /// The sign in a few words, for hover help ("mottles in a 5YR 4/4 matrix").
    pub fn short(&self) -> String {
        match self {
            WetSign::Gleying => "gleying logged".to_string(),
            WetSign::GleyedHorizon => "a gleyed (g) horizon".to_string(),
            WetSign::LowChromaMatrix { munsell, mottled: true } => {
                format!("mottles in a low-chroma {munsell} matrix")
            }
            WetSign::LowChromaMatrix { munsell, mottled: false } => format!("a low-chroma {munsell} matrix"),
            WetSign::MottlesInOxidisedMatrix { munsell } => format!("mottles in a {munsell} matrix"),
            WetSign::MottlesNoColour => "mottles, matrix colour not logged".to_string(),
        }
    }
}

/// One sentence of a profile's evidence: what its maturity and drainage were read from, horizon
/// data included. Kept as data, worded in a display unit where shown, serialised as the
/// sentence in metres.
#[derive(Debug, Clone, PartialEq)]
pub enum ProfileEvidence {
    /// The horizons designated on its beds, top down ("A / Bt / Bk2 / C").
    Horizons { top_down: Vec<String> },
    /// No bed of the profile carries a horizon designation.
    NoHorizons,
    /// The strongest development logged on its beds.
    Logged { development: PaleosolDevelopment },
    /// Designated A, E, B or O horizons with no development logged: at least weak.
    Designated { floor: PaleosolDevelopment },
    /// A Bt horizon logged with clay coatings.
    Argillic { horizon: String, floor: PaleosolDevelopment },
    /// A Bt horizon without clay coatings logged: not counted as argillic.
    BtWithoutCoatings { horizon: String },
    /// A Bk horizon of carbonate stage II or more.
    Calcic { horizon: String, stage: u8, floor: PaleosolDevelopment },
    /// A Bss horizon.
    Vertic { horizon: String, floor: PaleosolDevelopment },
    /// The highest carbonate stage (1–6), with the horizon it was logged on, if designated.
    CarbonateStage { stage: u8, horizon: Option<String>, floor: PaleosolDevelopment },
    /// Slickensides and carbonate nodules (features or `ss`/`k` suffixes) together: named as a
    /// seasonal-climate feature of the profile; they do not raise its maturity.
    VerticCalcic,
    /// Total thickness of the B horizons (master B alone), the beds counted ("Bt1 (bed 5)"), the
    /// transitional ones left out, and the limit it reached (if any).
    BThickness {
        thickness_m: f64,
        counted: Vec<String>,
        transitional: Vec<String>,
        limit_m: Option<f64>,
        floor: Option<PaleosolDevelopment>,
    },
    /// The geologist's drainage class, on the named horizon (or an undesignated bed).
    DrainageLogged { drainage: Drainage, horizon: Option<String> },
    /// Gleying, a `g` suffix, a low-chroma matrix or mottling on a horizon carrying the maturity.
    WetSign { sign: WetSign, horizon: Option<String> },
    /// No drainage class logged and no wet sign on the horizons carrying the maturity.
    NoWetSign,
    /// The profile was cut off from the one below where the horizon sequence starts again.
    StartsNewSequence { why: ProfileBreak },
}

/// Why a run of horizon beds was split into two profiles at a bed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ProfileBreak {
    /// The bed's master horizon lies lower in a profile than the designated bed below it (a C or
    /// B over an A: the soil below is buried and a new one starts).
    HorizonSequence,
    /// The bed has an erosional base: the soil below was truncated.
    Truncation,
}

/// A horizon's name for a sentence: "Bt" or "an undesignated bed".
fn on_horizon(horizon: &Option<String>) -> String {
    horizon.as_ref().map_or_else(|| "an undesignated bed".to_string(), |h| h.clone())
}

impl ProfileEvidence {
    /// The sentence with its lengths in `unit` (a section's display unit).
    pub fn worded(&self, unit: LengthUnit) -> String {
        use ProfileEvidence::*;
        match self {
            Horizons { top_down } => format!("horizons logged, top down: {}", top_down.join(" / ")),
            NoHorizons => "no soil horizons designated: read from development, features and carbonate stage only"
                .to_string(),
            Logged { development } => format!("strongest development logged: {}", development.name()),
            Designated { floor } => {
                format!("designated soil horizons with no development logged: at least {}", floor.name())
            }
            Argillic { horizon, floor } => format!(
                "{horizon} with clay coatings, an argillic horizon (Retallack 2001): at least {}",
                floor.name()
            ),
            BtWithoutCoatings { horizon } => {
                format!("{horizon} logged without clay coatings: not counted as an argillic horizon")
            }
            Calcic { horizon, stage, floor } => format!(
                "{horizon} of carbonate stage {} (Machette 1985), a calcic horizon: at least {}",
                roman(*stage),
                floor.name()
            ),
            Vertic { horizon, floor } => {
                format!("{horizon}, a slickensided (vertic) horizon (Retallack 2001): at least {}", floor.name())
            }
            CarbonateStage { stage, horizon, floor } => format!(
                "carbonate stage {} (Machette 1985: {}) in {}: at least {}",
                roman(*stage),
                carbonate_stage_morphology(*stage).unwrap_or("stage out of range"),
                on_horizon(horizon),
                floor.name()
            ),
            VerticCalcic => "slickensides with carbonate nodules (vertic and calcic): shrink–swell and carbonate \
                             accumulation under a seasonally dry climate (Kraus 1999), not counted as extra maturity"
                .to_string(),
            BThickness { thickness_m, counted, transitional, limit_m, floor } => {
                let left_out = if transitional.is_empty() {
                    String::new()
                } else {
                    format!("; transitional {} not counted", transitional.join(", "))
                };
                let counted = if counted.is_empty() { "none".to_string() } else { counted.join(", ") };
                match (limit_m, floor) {
                    (Some(limit), Some(floor)) => format!(
                        "B horizons {} thick in all ({counted}{left_out}; at least {}): at least {}",
                        unit.length(*thickness_m),
                        unit.length(*limit),
                        floor.name()
                    ),
                    _ => format!("B horizons {} thick in all ({counted}{left_out})", unit.length(*thickness_m)),
                }
            }
            DrainageLogged { drainage, horizon } => {
                let reading = DrainageReading::of_class(*drainage);
                let note = match reading {
                    DrainageReading::Imperfectly => ": imperfectly drained, not counted as poorly drained",
                    _ => "",
                };
                format!("drainage logged as {} on {}{note}", drainage.name(), on_horizon(horizon))
            }
            WetSign { sign, horizon } => {
                let on = on_horizon(horizon);
                match sign {
                    self::WetSign::Gleying => format!("gleying in {on}: poorly drained (waterlogged, reduced)"),
                    self::WetSign::GleyedHorizon => format!("a gleyed (g) horizon in {on}: poorly drained"),
                    self::WetSign::LowChromaMatrix { munsell, mottled } => format!(
                        "{} {munsell} matrix (chroma 2 or less, hue not red: gleyed) in {on}: poorly drained",
                        if *mottled { "mottles in a low-chroma" } else { "a low-chroma" }
                    ),
                    self::WetSign::MottlesInOxidisedMatrix { munsell } => format!(
                        "mottles in a {munsell} matrix (high chroma or red hue: oxidised, not gleyed) in {on}: \
                         imperfectly (somewhat poorly) drained (seasonal wetting)"
                    ),
                    self::WetSign::MottlesNoColour => format!(
                        "mottles in {on}, no Munsell colour of the matrix logged: read as imperfectly (somewhat \
                         poorly) drained (seasonal wetting); a gleyed, low-chroma matrix would make it poorly drained"
                    ),
                }
            }
            NoWetSign => "no drainage logged and no gleying, low-chroma matrix, mottling or g horizon where the \
                          maturity is: not poorly drained"
                .to_string(),
            StartsNewSequence { why: ProfileBreak::HorizonSequence } => {
                "starts where the horizon sequence starts again (a lower horizon over an upper one): a new profile"
                    .to_string()
            }
            StartsNewSequence { why: ProfileBreak::Truncation } => {
                "starts at an erosional base inside a run of horizons (the soil below truncated): a new profile"
                    .to_string()
            }
        }
    }
}

/// The morphology of a carbonate stage (1–6 for I–VI) in the fine-grained (non-gravelly) form
/// fluvial paleosols mostly show, worded after Machette (1985, his table of morphogenetic
/// stages, after Gile et al. 1966). `None` outside 1–6.
pub fn carbonate_stage_morphology(stage: u8) -> Option<&'static str> {
    Some(match stage {
        1 => "thin, discontinuous carbonate filaments or coatings",
        2 => "few to common carbonate nodules",
        3 => "many nodules coalescing, with carbonate filling between them: the horizon plugged",
        4 => "a thin laminar layer on top of a plugged horizon",
        5 => "a thick laminar layer (1 cm or more) with pisoliths and incipient brecciation",
        6 => "several generations of laminae, brecciation and pisoliths, recemented",
        _ => return None,
    })
}

/// A carbonate stage (1–6) as the Roman numeral of Machette (1985).
pub fn roman(stage: u8) -> &'static str {
    ["I", "II", "III", "IV", "V", "VI"].get(usize::from(stage).wrapping_sub(1)).copied().unwrap_or("?")
}

impl std::fmt::Display for ProfileEvidence {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.worded(LengthUnit::Metre))
    }
}

impl Serialize for ProfileEvidence {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

/// Consecutive beds with soil development (a profile of horizons), read as one paleosol.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PaleosolProfile {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    /// Maturity of the whole profile on the development scale.
    pub maturity: PaleosolDevelopment,
    /// Ids of the beds of the profile, lowest first.
    pub beds: Vec<BedId>,
    /// Index of the lowest and highest bed (inclusive).
    pub first_bed: usize,
    pub last_bed: usize,
    /// The strongest development logged on any of its beds.
    pub logged_development: PaleosolDevelopment,
    /// Highest carbonate stage logged in the profile (1–6).
    pub carbonate_stage: Option<u8>,
    /// What raised the maturity above the logged development.
    pub raised_by: Vec<MaturitySign>,
    /// True when the soil formed in sandstone or conglomerate (a profile including such a bed: a
    /// soil on a sandstone top).
    pub on_sandstone: bool,
    /// True when the profile is poorly drained (gleyed): the geologist's drainage class (poorly
    /// or very poorly drained) where logged, else gleying, a `g` horizon or a low-chroma matrix
    /// on the horizons that carry its maturity: a high water table (Kraus 1999; Wright &
    /// Marriott 1993). A somewhat poorly (imperfectly) drained profile is not: see `drainage_reading`.
    pub poorly_drained: bool,
    /// The graded drainage reading: poorly, imperfectly (somewhat poorly) or not poorly drained.
    pub drainage_reading: DrainageReading,
    /// The geologist's drainage class the reading used, where one was logged.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub drainage: Option<Drainage>,
    /// Where the drainage reading comes from.
    pub drainage_from: DrainageBasis,
    /// Total thickness of the beds designated as B horizons with master B alone (Bt, Bk, Bss,
    /// Bw, Bg…; transitional BC, AB… not counted), metres (0 when none).
    #[serde(rename = "b_horizon_thickness")]
    pub b_horizon_thickness_m: f64,
    /// What the maturity and drainage were read from, horizon data included, as sentences.
    pub evidence: Vec<ProfileEvidence>,
}

/// The whole-section channel-body proportion with covered intervals counted one way or the other.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ProportionBounds {
    /// Covered intervals counted as floodplain fines (the low bound).
    pub covered_as_fines: f64,
    /// Covered intervals counted as channel deposits (the high bound).
    pub covered_as_channel: f64,
}

/// Channel-body proportion over an interval.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IntervalProportion {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    /// `None` where the interval has no exposure.
    pub proportion: Option<f64>,
}

/// One point of the moving-window proportion curve.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CurvePoint {
    #[serde(rename = "height")]
    pub height_m: f64,
    /// `None` where the window has no exposure.
    pub proportion: Option<f64>,
}

/// Accommodation regime called for an interval.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Regime {
    Low,
    High,
    Undetermined,
}

/// An interval with its regime and the reasoning in words.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RegimeInterval {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    pub regime: Regime,
    pub why: RegimeWhy,
}

/// What kind of surface a candidate sequence boundary sits on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum CandidateKind {
    /// Erosional base of a channel body.
    ChannelBodyBase,
    /// Top of a paleosol capping floodplain fines (interfluve equivalent).
    PaleosolTop,
    /// Both at one boundary.
    ChannelBaseOnPaleosol,
    /// A bed base the geologist tagged as an incision surface, neither of the above.
    TaggedSurface,
}

/// How much independent evidence a candidate sequence boundary has (see
/// `docs/interpretation-rules.md` for the combination).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Strength {
    /// A channel base or paleosol top with no evidence beyond being one.
    Weak,
    /// One independent kind of evidence.
    Moderate,
    /// Two or more independent kinds, or a very strongly developed interfluve paleosol.
    Strong,
}

impl Strength {
    /// The word as printed (`strong`, `moderate`, `weak`).
    pub fn name(self) -> &'static str {
        match self {
            Strength::Strong => "strong",
            Strength::Moderate => "moderate",
            Strength::Weak => "weak",
        }
    }
}

/// One parameter value, among the sensitivity runs, that changes a result.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Flip {
    /// The parameter's name as in the parameter file (`splay_limit_m`).
    pub parameter: String,
    /// The value that changes the result.
    pub value: f64,
}

impl CandidateKind {
    /// The kind in words ("channel-body base").
    pub fn name(self) -> &'static str {
        match self {
            CandidateKind::ChannelBodyBase => "channel-body base",
            CandidateKind::PaleosolTop => "paleosol top",
            CandidateKind::ChannelBaseOnPaleosol => "channel-body base on a paleosol",
            CandidateKind::TaggedSurface => "tagged incision surface",
        }
    }
}

/// A candidate sequence boundary at one bed boundary, with everything found there.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BoundaryCandidate {
    #[serde(rename = "height")]
    pub height_m: f64,
    /// Index of the bed whose base the boundary is.
    pub bed_index: usize,
    /// Id of that bed (the key for review decisions).
    pub bed_id: BedId,
    pub kind: CandidateKind,
    /// From the independent evidence items found (see [`Strength`]).
    pub strength: Strength,
    /// 0–1, the weights of the independent evidence found; orders candidates within a strength
    /// class and is not a probability.
    pub score: f64,
    pub evidence: Vec<Evidence>,
    /// The geologist's name for the surface at this bed base, if any.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub surface_name: Option<String>,
    /// The geologist's correlation label on the decision, if any.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub label: Option<String>,
    /// Share of the sensitivity runs (0–1) in which the candidate came out the same (listed with
    /// at least moderate strength, or not); only after a sensitivity run.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub stability: Option<f64>,
    /// The parameter change nearest the values used that changes it.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub flipped_by: Option<Flip>,
    /// The geologist's decision, carried over from the section's review list.
    pub review: ReviewState,
    /// The geologist's note on it, if any.
    pub note: String,
}

/// Everything the rules found in one section.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Interpretation {
    pub section: String,
    #[serde(rename = "total_thickness")]
    pub total_thickness_m: f64,
    #[serde(rename = "exposed_thickness")]
    pub exposed_thickness_m: f64,
    /// Whole-section channel-body proportion of the exposed thickness; `None` when nothing is
    /// exposed.
    pub channel_proportion: Option<f64>,
    /// The same with covered intervals counted as fines and as channel deposits; `None` for a
    /// section of no thickness.
    pub channel_proportion_bounds: Option<ProportionBounds>,
    /// One element per bed, same order as the section's beds.
    pub elements: Vec<Element>,
    pub storeys: Vec<Storey>,
    pub channel_bodies: Vec<ChannelBody>,
    /// Paleosol profiles, lowest first.
    pub paleosols: Vec<PaleosolProfile>,
    /// Proportion in each interval between accepted or candidate boundaries.
    pub interval_proportions: Vec<IntervalProportion>,
    pub proportion_curve: Vec<CurvePoint>,
    pub accommodation: Vec<RegimeInterval>,
    /// Strongest first, then by score, then by height. Weak paleosol tops with no evidence are
    /// left out unless all candidates were asked for.
    pub sequence_boundary_candidates: Vec<BoundaryCandidate>,
    /// How many weak paleosol tops with no evidence were left out of the list.
    pub unlisted_candidates: usize,
    /// The heights the regimes and interval proportions were cut at: accepted boundaries, else
    /// strong candidates not rejected.
    pub cut_heights: Vec<f64>,
    /// True when `cut_heights` are accepted boundaries (false: strong candidates).
    pub cuts_are_accepted: bool,
    /// The full parameter set the rules ran with.
    pub params: super::params::RuleParams,
    /// "Candidates for expert review" caution.
    pub caution: String,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stacking_is_written_storey_and_read_in_either_spelling() {
        assert_eq!(serde_json::to_value(Stacking::MultiStory).ok(), Some("multi-storey".into()));
        assert_eq!(serde_json::to_value(Stacking::SingleStory).ok(), Some("single-storey".into()));
        for s in [Stacking::MultiStory, Stacking::SingleStory, Stacking::Undetermined] {
            assert_eq!(Stacking::parse(s.name()), Some(s));
        }
        assert_eq!(Stacking::parse("multi-story"), Some(Stacking::MultiStory));
        assert_eq!(Stacking::parse(" Single_Story "), Some(Stacking::SingleStory));
        assert_eq!(Stacking::parse("storeyed"), None);
    }

    #[test]
    fn a_censored_thickness_is_a_minimum_in_the_display_unit() {
        let body = ChannelBody {
            base_m: 0.0,
            top_m: 4.2672,
            thickness_m: 4.2672,
            stories: 2,
            stacking: Stacking::MultiStory,
            censored: vec![Censor::Top],
            amalgamated_bases: 1,
            grain_finest: None,
            grain_coarsest: None,
            profile: GrainProfile::Unknown,
            style_hint: None,
            storey_indices: vec![0, 1],
            stability: None,
            flipped_by: None,
        };
        // 4.2672 m = 14 ft exactly (1 ft = 0.3048 m, international yard and pound agreement 1959).
        assert_eq!(body.thickness_text(), "\u{2265} 4.27 m");
        assert_eq!(body.thickness_text_in(LengthUnit::Foot), "\u{2265} 14.00 ft");
    }
}
