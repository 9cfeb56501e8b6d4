//! What the interpretation rules produce: data with its evidence, never drawing or errors.
//!
//! Heights are metres above the section base. Field names ending in `_m` are serialised without
//! the suffix (`base`, `top`, `height`) to keep the `aggrade interpret --json` contract.

use super::evidence::{Evidence, RegimeWhy};
use crate::model::{BedId, GrainSize, ReviewState};
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
}

/// How the storeys of a channel body are stacked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum Stacking {
    /// Two or more storeys: amalgamated.
    #[serde(rename = "multi-story")]
    MultiStory,
    /// One storey encased in floodplain fines: isolated.
    #[serde(rename = "single-story")]
    SingleStory,
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
    pub stories: usize,
    pub stacking: Stacking,
    /// How many storey bases rest on channel sand rather than fines.
    pub amalgamated_bases: usize,
    pub grain_finest: Option<GrainSize>,
    pub grain_coarsest: Option<GrainSize>,
    pub profile: GrainProfile,
    pub style_hint: Option<StyleHint>,
    /// Indices into `Interpretation::storeys`.
    pub storey_indices: Vec<usize>,
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
    /// 0–1, from the weighted evidence.
    pub score: f64,
    pub evidence: Vec<Evidence>,
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
    /// Whole-section channel-body proportion; `None` when nothing is exposed.
    pub channel_proportion: Option<f64>,
    /// One element per bed, same order as the section's beds.
    pub elements: Vec<Element>,
    pub storeys: Vec<Storey>,
    pub channel_bodies: Vec<ChannelBody>,
    /// Proportion in each interval between accepted or candidate boundaries.
    pub interval_proportions: Vec<IntervalProportion>,
    pub proportion_curve: Vec<CurvePoint>,
    pub accommodation: Vec<RegimeInterval>,
    /// Sorted by score, highest first.
    pub sequence_boundary_candidates: Vec<BoundaryCandidate>,
    /// "Candidates for expert review" caution.
    pub caution: String,
}
