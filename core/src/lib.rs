//! Aggrade core: the section model, file formats, interpretation rules, column layout and the
//! PDF/SVG writers. Nothing here depends on a GUI toolkit.

pub mod analysis;
pub mod export;
pub mod io;
pub mod layout;
pub mod model;
pub mod rules;
pub mod trace;

/// Shown on every interpretation, report and printout.
pub const REVIEW_CAUTION: &str = "Interpretations are candidates for expert review, not conclusions: \
a qualified geologist must check them before use.";
