//! Sections, beds, named surfaces and review decisions: the record a geologist logs.

use super::beds::SharedList;
use super::curve::MeasuredCurve;
use super::facies::FaciesCode;
use super::grain::GrainSize;
use super::lithology::Lithology;
use super::record::{Munsell, Paleocurrent, Photo, Sample, SoilHorizon};
use super::setting::{BeddingAttitude, GpsFix, Traverse};
use super::vocab::{
    BaseRank, Contact, Drainage, LengthUnit, MeasuringMethod, PaleosolDevelopment, PaleosolFeature,
    Structure, SurfaceKind,
};
use serde::{Deserialize, Serialize};

/// A stable identifier of a bed within its section; survives edits that move or renumber beds.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
pub struct BedId(pub u64);

/// A named surface on a bed boundary (stored on the bed whose base it is).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Surface {
    /// The geologist's name for it ("SB-2", "Red paleosol top").
    pub name: String,
    pub kind: SurfaceKind,
}

/// One bed (or covered interval) of a measured section.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Bed {
    pub id: BedId,
    /// Thickness in metres (> 0). Heights are derived from thicknesses, never stored.
    pub thickness_m: f64,
    pub lithology: Lithology,
    /// Grain size at the base of the bed; `None` for covered intervals and some non-clastic beds.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub grain_base: Option<GrainSize>,
    /// Grain size at the top of the bed (a different value from the base gives a fining or
    /// coarsening trend).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub grain_top: Option<GrainSize>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub structures: Vec<Structure>,
    #[serde(default)]
    pub base_contact: Contact,
    /// Erosional relief measured at the bed's base, metres.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub base_relief_m: Option<f64>,
    #[serde(default)]
    pub paleosol: PaleosolDevelopment,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub paleosol_features: Vec<PaleosolFeature>,
    /// Carbonate morphological stage I–VI (Gile et al. 1966; Machette 1985) as 1–6.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub carbonate_stage: Option<u8>,
    /// A named surface at the base of this bed.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub base_surface: Option<Surface>,
    /// The geologist's rank for this bed's base (storey surface, body base, within storey),
    /// overriding the rules. Absent in older files.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub base_rank: Option<BaseRank>,
    /// Colour in words ("greenish grey").
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub colour: String,
    /// Colour as a Munsell notation ("10YR 5/4"). Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub munsell: Option<Munsell>,
    /// Paleocurrent readings as measured (version 1 held bare azimuths, `paleocurrents_deg`).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub paleocurrents: Vec<Paleocurrent>,
    /// Fossils in free words (version 1's only fossil field).
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub fossils: String,
    /// Trace fossils by name ("Skolithos", "Planolites"). Version 2.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub trace_fossils: Vec<String>,
    /// Body fossils by name ("unionid bivalves", "plant fragments"). Version 2.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub body_fossils: Vec<String>,
    /// Bioturbation index 0–6 (Taylor & Goldring 1993). Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bioturbation_index: Option<u8>,
    /// Samples taken (version 1 held bare ids).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub samples: Vec<Sample>,
    /// Photographs of the bed. Version 2.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub photos: Vec<Photo>,
    /// The geologist's lithofacies code. `None` leaves the suggested code in force (see
    /// `facies::suggest`). Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub facies: Option<FaciesCode>,
    /// What the clasts of a basal lag are ("quartzite pebbles, mud clasts"). Version 2.
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub lag_composition: String,
    /// Soil-horizon designation of this bed within a paleosol profile ("Bt", "Bk2"). Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub soil_horizon: Option<SoilHorizon>,
    /// Drainage of the paleosol, as the geologist read it. Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub drainage: Option<Drainage>,
    /// The distance measured along the ground across this bed, metres, when the thickness was
    /// worked out from it (see `analysis::attitude::true_thickness_m`). Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub slope_distance_m: Option<f64>,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub notes: String,
}

impl Bed {
    /// True when the thickness is a finite number of metres above zero, as validation requires.
    pub fn has_usable_thickness(&self) -> bool {
        self.thickness_m.is_finite() && self.thickness_m > 0.0
    }

    /// The thickness layout draws and the rules count, m: a thickness that failed validation
    /// (not finite, zero or negative) counts as 0, so bad data never breaks a drawing or a rule;
    /// validation reports it to the user.
    pub fn usable_thickness_m(&self) -> f64 {
        if self.has_usable_thickness() {
            self.thickness_m
        } else {
            0.0
        }
    }

    /// A plain bed with defaults for everything but thickness, lithology and grain size.
    pub fn new(id: BedId, thickness_m: f64, lithology: Lithology, grain: Option<GrainSize>) -> Self {
        Bed {
            id,
            thickness_m,
            lithology,
            grain_base: grain,
            grain_top: grain,
            structures: Vec::new(),
            base_contact: Contact::Sharp,
            base_relief_m: None,
            paleosol: PaleosolDevelopment::None,
            paleosol_features: Vec::new(),
            carbonate_stage: None,
            base_surface: None,
            base_rank: None,
            colour: String::new(),
            munsell: None,
            paleocurrents: Vec::new(),
            fossils: String::new(),
            trace_fossils: Vec::new(),
            body_fossils: Vec::new(),
            bioturbation_index: None,
            samples: Vec::new(),
            photos: Vec::new(),
            facies: None,
            lag_composition: String::new(),
            soil_horizon: None,
            drainage: None,
            slope_distance_m: None,
            notes: String::new(),
        }
    }

    /// The paleocurrent azimuths as measured, degrees, whatever their indicator.
    pub fn azimuths(&self) -> impl Iterator<Item = f64> + '_ {
        self.paleocurrents.iter().map(|p| p.azimuth_deg)
    }

    /// The azimuths of flow indicators (every reading but accretion-surface dips), degrees, as
    /// measured.
    pub fn flow_azimuths(&self) -> impl Iterator<Item = f64> + '_ {
        self.paleocurrents.iter().filter(|p| p.indicator.is_flow()).map(|p| p.azimuth_deg)
    }

    /// True for a covered (unexposed) interval.
    pub fn is_covered(&self) -> bool {
        self.lithology == Lithology::Covered
    }

    /// The coarser of base and top grain size, if any.
    pub fn coarsest_grain(&self) -> Option<GrainSize> {
        match (self.grain_base, self.grain_top) {
            (Some(a), Some(b)) => Some(if a.phi() <= b.phi() { a } else { b }),
            (a, b) => a.or(b),
        }
    }
}

/// What the geologist saw of a channel body across the outcrop. The body is named by the bed at
/// its base, which survives re-running the rules and editing other beds.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BodyLateral {
    /// The lowest bed of the body.
    pub base_bed: BedId,
    /// Observed width across the outcrop, metres.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub width_m: Option<f64>,
    /// True when the body runs on beyond the outcrop, so the width is a minimum.
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub beyond_outcrop: bool,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub note: String,
}

/// WGS84 coordinates of the section base.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct LatLon {
    pub lat_deg: f64,
    pub lon_deg: f64,
}

/// Review state of a candidate sequence boundary: unreviewed, accepted or rejected.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ReviewState {
    /// Not yet reviewed: written `"unreviewed"`; files written before that word was chosen say
    /// `"candidate"`, which is still read.
    #[default]
    #[serde(rename = "unreviewed", alias = "candidate")]
    Candidate,
    Accepted,
    Rejected,
}

impl ReviewState {
    /// The word shown, printed and written (`unreviewed`, `accepted`, `rejected`).
    pub fn name(self) -> &'static str {
        match self {
            ReviewState::Candidate => "unreviewed",
            ReviewState::Accepted => "accepted",
            ReviewState::Rejected => "rejected",
        }
    }
}

/// The geologist's decision on the candidate at one bed boundary (the base of `bed`). Kept in
/// the project so that it survives re-running the rules.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReviewDecision {
    /// The bed whose base the boundary is.
    pub bed: BedId,
    pub state: ReviewState,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub note: String,
    /// The geologist's correlation label ("SB-2"): accepted boundaries carrying the same label
    /// in neighbouring sections are tied on the correlation panel. Kept, but not drawn, while the
    /// boundary is not accepted. Absent in older files.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub link: Option<String>,
}

impl ReviewDecision {
    /// A decision without a correlation label.
    pub fn new(bed: BedId, state: ReviewState, note: impl Into<String>) -> Self {
        ReviewDecision { bed, state, note: note.into(), link: None }
    }

    /// The correlation label, trimmed; `None` when absent or blank.
    pub fn link_label(&self) -> Option<&str> {
        self.link.as_deref().map(str::trim).filter(|l| !l.is_empty())
    }
}

/// The beds of a section, base first, each shared between copies of the section until written
/// ([`SharedList`]).
pub type Beds = SharedList<Bed>;

/// A measured section: metadata and beds listed base first.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Section {
    pub name: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub locality: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub coordinates: Option<LatLon>,
    /// Date logged, ISO 8601 (YYYY-MM-DD).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub date_logged: Option<String>,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub logged_by: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub notes: String,
    /// How thicknesses were measured. Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub method: Option<MeasuringMethod>,
    /// The geologist's estimate of the ± error of one thickness reading, metres. Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thickness_uncertainty_m: Option<f64>,
    /// Bedding attitude at the section. Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bedding: Option<BeddingAttitude>,
    /// The traverse along which slope distances were taped. Version 2.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub traverse: Option<Traverse>,
    /// GPS fixes at the top and at each offset of a composite traverse (the base is
    /// `coordinates`; a base fix may be repeated here with its elevation). Version 2.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub fixes: Vec<GpsFix>,
    /// Lateral data on channel bodies (width across the outcrop). Version 2.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub body_lateral: Vec<BodyLateral>,
    /// Unit heights and thicknesses are shown in (m or ft); storage is always metres.
    #[serde(default = "default_display_unit")]
    pub display_unit: LengthUnit,
    /// Beds, lowest first.
    pub beds: Beds,
    /// Decisions on candidate sequence boundaries.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub review: Vec<ReviewDecision>,
    /// Horizontal position along a correlation panel, metres (when no coordinates are given).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub panel_position_m: Option<f64>,
    /// Measured curves (e.g. outcrop gamma ray) on this section's heights, drawn as tracks
    /// beside the column. Absent in older files.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub curves: Vec<MeasuredCurve>,
    /// A photographed or scanned field sheet traced behind the column, with its calibration.
    /// Absent in older files.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub trace: Option<crate::trace::TraceSheet>,
}

fn default_display_unit() -> LengthUnit {
    LengthUnit::Metre
}

impl Section {
    /// An empty section.
    pub fn new(name: impl Into<String>) -> Self {
        Section {
            name: name.into(),
            locality: String::new(),
            coordinates: None,
            date_logged: None,
            logged_by: String::new(),
            notes: String::new(),
            method: None,
            thickness_uncertainty_m: None,
            bedding: None,
            traverse: None,
            fixes: Vec::new(),
            body_lateral: Vec::new(),
            display_unit: LengthUnit::Metre,
            beds: Beds::new(),
            review: Vec::new(),
            panel_position_m: None,
            curves: Vec::new(),
            trace: None,
        }
    }

    /// Height of each bed's base above the section base, metres (same order as `beds`).
    pub fn base_heights_m(&self) -> Vec<f64> {
        let mut h = 0.0;
        self.beds
            .iter()
            .map(|b| {
                let base = h;
                h += b.thickness_m;
                base
            })
            .collect()
    }

    /// Total thickness, metres.
    pub fn total_thickness_m(&self) -> f64 {
        self.beds.iter().map(|b| b.thickness_m).sum()
    }

    /// Thickness of exposed (not covered) beds, metres.
    pub fn exposed_thickness_m(&self) -> f64 {
        self.beds.iter().filter(|b| !b.is_covered()).map(|b| b.thickness_m).sum()
    }

    /// An id not yet used by any bed of this section.
    pub fn next_bed_id(&self) -> BedId {
        BedId(self.beds.iter().map(|b| b.id.0 + 1).max().unwrap_or(1))
    }

    /// Index of the bed with this id.
    pub fn bed_index(&self, id: BedId) -> Option<usize> {
        self.beds.iter().position(|b| b.id == id)
    }

    /// The attached curve with this mnemonic (case-insensitive).
    pub fn curve(&self, mnemonic: &str) -> Option<&MeasuredCurve> {
        self.curves.iter().find(|c| c.mnemonic.eq_ignore_ascii_case(mnemonic))
    }

    /// Attach a curve, replacing one with the same mnemonic (case-insensitive) in its place.
    /// Returns true when one was replaced.
    pub fn attach_curve(&mut self, curve: MeasuredCurve) -> bool {
        match self.curves.iter().position(|c| c.mnemonic.eq_ignore_ascii_case(&curve.mnemonic)) {
            Some(i) => {
                self.curves[i] = curve;
                true
            }
            None => {
                self.curves.push(curve);
                false
            }
        }
    }

    /// Remove the curve with this mnemonic (case-insensitive); returns it if there was one.
    pub fn remove_curve(&mut self, mnemonic: &str) -> Option<MeasuredCurve> {
        let i = self.curves.iter().position(|c| c.mnemonic.eq_ignore_ascii_case(mnemonic))?;
        Some(self.curves.remove(i))
    }

    /// The review decision for the boundary at the base of this bed.
    pub fn decision_for(&self, bed: BedId) -> Option<&ReviewDecision> {
        self.review.iter().find(|d| d.bed == bed)
    }
}

/// A project file's content: one or more sections.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Project {
    /// File format version; readers migrate older versions forward.
    pub format_version: u32,
    pub sections: Vec<Section>,
    /// The interpretation rules' parameters that differ from the defaults, as a partial object
    /// (the rules read it; the rest comes from the defaults). Empty: the default rules.
    #[serde(default, skip_serializing_if = "serde_json::Map::is_empty")]
    pub rule_params: serde_json::Map<String, serde_json::Value>,
}

impl Project {
    /// The format version this build writes.
    pub const CURRENT_VERSION: u32 = 2;

    /// A project holding the given sections.
    pub fn new(sections: Vec<Section>) -> Self {
        Project { format_version: Self::CURRENT_VERSION, sections, rule_params: serde_json::Map::new() }
    }

    /// Find a section by name (exact, then case-insensitive).
    pub fn section(&self, name: &str) -> Option<&Section> {
        self.sections
            .iter()
            .find(|s| s.name == name)
            .or_else(|| self.sections.iter().find(|s| s.name.eq_ignore_ascii_case(name)))
    }
}
