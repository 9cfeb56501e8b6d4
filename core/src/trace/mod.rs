//! Tracing a photographed or scanned field sheet: calibration of the page, the projective
//! straightening of a photo taken at an angle, and the section edits a click makes.

pub mod cut;
pub mod image;
pub mod projective;
pub mod sheet;
pub mod snap;

pub use cut::{bed_at, cut_at, Cut, CutError};
pub use projective::{Homography, ProjectiveError, Pt};
pub use sheet::{BackdropView, GrainScale, HeightScale, SheetError, TraceSheet};
