//! The section model: projects, sections, beds, grain size, lithology, measured curves and the
//! log's vocabularies.

pub mod beds;
pub mod curve;
pub mod facies;
pub mod grain;
pub mod lithology;
pub mod record;
pub mod section;
pub mod setting;
pub mod shorthand;
pub mod vocab;

pub use curve::{IndexDirection, MeasuredCurve};
pub use facies::FaciesCode;
pub use grain::{mm_to_phi, phi_to_mm, GrainSize, WentworthClass};
pub use lithology::{GrainSizeRule, Lithology, LithologyFamily};
pub use record::{HorizonError, Munsell, MunsellError, Paleocurrent, Photo, Sample, SoilHorizon};
pub use section::{
    Bed, BedId, Beds, BodyLateral, LatLon, Project, ReviewDecision, ReviewState, Section, Surface,
};
pub use setting::{BeddingAttitude, GpsFix, Traverse};
pub use vocab::{
    BaseRank, Contact, Drainage, FixRole, Indicator, LengthUnit, MeasuringMethod, PaleosolDevelopment,
    PaleosolFeature, SampleKind, Structure, SurfaceKind, METRES_PER_FOOT,
};
