//! The section model: projects, sections, beds, grain size, lithology, measured curves and the
//! log's vocabularies.

pub mod curve;
pub mod grain;
pub mod lithology;
pub mod section;
pub mod shorthand;
pub mod vocab;

pub use curve::{IndexDirection, MeasuredCurve};
pub use grain::{mm_to_phi, phi_to_mm, GrainSize, WentworthClass};
pub use lithology::{GrainSizeRule, Lithology, LithologyFamily};
pub use section::{Bed, BedId, LatLon, Project, ReviewDecision, ReviewState, Section, Surface};
pub use vocab::{
    BaseRank, Contact, LengthUnit, PaleosolDevelopment, PaleosolFeature, Structure, SurfaceKind,
    METRES_PER_FOOT,
};
