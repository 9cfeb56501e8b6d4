//! Aggrade core: the section model, its files, the interpretation rules, the column layout and
//! the PDF/SVG writers. Nothing here depends on a GUI toolkit; the window and the command line
//! (the `aggrade` crate) are thin fronts over these stages.
//!
//! # The pipeline
//!
//! A measured section goes through four stages, each a module that takes the previous stage's
//! plain data and gives its own:
//!
//! 1. [`model`] — the data the geologist logs: a [`model::Project`] of [`model::Section`]s, each a
//!    list of [`model::Bed`]s (thickness, lithology, grain size, contacts, structures, paleosol
//!    features, named surfaces) plus review decisions and measured curves. Heights are never
//!    stored; they are summed from thicknesses.
//! 2. [`io`] and [`rules`], side by side on the model:
//!    - [`io`] reads and writes it: the versioned project file (JSON), the bed-table CSV, the
//!      forgiving import of spreadsheets and hand-made tables, validation and atomic saving. It
//!      takes bytes or paths and gives a project, or errors and warnings that name the file,
//!      line and field.
//!    - [`rules`] interprets it: [`rules::interpret`] takes one section and one
//!      [`rules::RuleParams`] and gives an [`rules::Interpretation`] (elements, storeys, channel
//!      bodies, paleosol profiles, candidate sequence boundaries, proportions, regimes), each
//!      result a candidate for expert review with its evidence.
//! 3. [`analysis`] and [`layout`], on a section and its interpretation:
//!    - [`analysis`] gives statistics beyond the rules (paleocurrents, facies transitions, body
//!      statistics, LAS curves, decompaction) as plain data.
//!    - [`layout`] places everything at a true scale: [`layout::pages`] gives printed
//!      [`layout::Page`]s, [`layout::column_strip`] one tall strip for the screen and
//!      [`layout::panel_layout`] a correlation panel of a whole project. Each is a list of
//!      positioned [`layout::Item`]s in millimetres, the one drawing model every output shares.
//! 4. [`export`] translates layout items, item by item and without layout decisions of its own,
//!    into PDF ([`export::write_pdf`]) and SVG ([`export::write_svg`]) bytes.
//!
//! Each stage imports only the stages above it (checked by the architecture test in the
//! workspace's `tests/` crate), every function of a stage is deterministic (the same input gives
//! the same bytes), and bad values in a section never panic a later stage: a thickness that
//! failed validation counts as zero ([`model::Bed::usable_thickness_m`]).
//!
//! ```
//! use aggrade_core::export::write_svg;
//! use aggrade_core::layout::{pages, LayoutOptions, PrintMeta};
//! use aggrade_core::model::{Bed, BedId, Contact, GrainSize, Lithology, Section, WentworthClass};
//! use aggrade_core::rules::{interpret, RuleParams};
//!
//! // model: an invented three-bed section.
//! let mut section = Section::new("Demo bluff");
//! let silt = Some(GrainSize::Class(WentworthClass::Silt));
//! let sand = Some(GrainSize::Class(WentworthClass::MediumSand));
//! section.beds.push(Bed::new(BedId(1), 4.0, Lithology::Mudstone, silt));
//! let mut channel = Bed::new(BedId(2), 2.0, Lithology::Sandstone, sand);
//! channel.base_contact = Contact::Erosional;
//! section.beds.push(channel);
//! section.beds.push(Bed::new(BedId(3), 4.0, Lithology::Mudstone, silt));
//!
//! // rules → layout → export.
//! let interpretation = interpret(&section, &RuleParams::default());
//! assert_eq!(interpretation.channel_bodies.len(), 1);
//! let printed = pages(&section, &interpretation, &LayoutOptions::default(), &PrintMeta::default());
//! let svg = write_svg(&printed[0]);
//! assert!(svg.starts_with("<?xml") && svg.contains("Demo bluff"));
//! ```

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
