//! The reference checks and end-to-end tests of the core library, gathered into one test
//! binary: on a 2-core machine linking dominates the suite, so each former test file is a
//! module here. Every `.rs` file in this folder must be listed below (`architecture.rs`
//! checks it, so a new file cannot silently go unrun).

mod support;

mod analysis_attitude;
mod analysis_bodies_decompaction;
mod analysis_las;
mod analysis_markov;
mod analysis_paleocurrents;
mod architecture;
mod curves_pdf;
mod curves_project;
mod export_pdf;
mod export_png;
mod export_svg;
mod facies_states;
mod import_hostile;
mod io_csv;
mod io_fastpath;
mod io_field_record;
mod io_hostile;
mod io_import;
mod io_project;
mod io_unicode_roundtrip;
mod las_odd_cases;
mod panel_distance;
mod panel_pdf;
mod record_pdf;
mod reference_carbonate_stages;
mod reference_fgdc_patterns;
mod reference_grain_units;
mod rules_demo_sections;
mod rules_evidence;
mod rules_handworked;
mod rules_literature;
mod rules_properties;
mod rules_reference;
mod trace_projective;
mod trace_sheet;
mod trust_hostile;
mod trust_regressions;
mod trust_versions;
