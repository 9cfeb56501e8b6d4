//! Limits on what a file may ask for, so that hostile or broken files fail fast with bounded
//! memory instead of exhausting the machine.
//!
//! The figures are generous for real field data (the largest measured sections run to a few
//! thousand beds) and small enough that a file at every limit still loads in well under a second.

/// Largest file read, in bytes (32 MiB). A 10,000-bed project is about 3 MB.
pub const MAX_FILE_BYTES: u64 = 32 * 1024 * 1024;

/// Most sections in one project.
pub const MAX_SECTIONS: usize = 1_000;

/// Most beds in one section (and rows in one bed-table CSV).
pub const MAX_BEDS_PER_SECTION: usize = 100_000;

/// Most measured curves attached to one section.
pub const MAX_CURVES_PER_SECTION: usize = 32;

/// Most samples in one measured curve (a hand-held gamma-ray profile every 0.1 m over 1 km is
/// 10,000; a borehole log every 0.15 m over 3 km about 20,000).
pub const MAX_CURVE_SAMPLES: usize = 100_000;

/// Most items in any one JSON array (beds, paleocurrents, samples …); checked before parsing.
pub const MAX_ARRAY_ITEMS: usize = MAX_BEDS_PER_SECTION;

/// Longest text value (names, notes, colours …), in characters.
pub const MAX_STRING_CHARS: usize = 10_000;

/// Longest correlation label on an accepted boundary ("SB-2", "base of upper storey system"),
/// in characters: it is printed beside a tie line on the panel, so it must stay short.
pub const MAX_LINK_LABEL_CHARS: usize = 40;

/// Deepest nesting of JSON arrays and objects. A valid project nests 7 levels deep (a measured
/// curve's sample pair inside its curve inside a section).
pub const MAX_JSON_DEPTH: usize = 16;

/// Most problems listed in one error (the count of the rest is still given).
pub const MAX_PROBLEMS_LISTED: usize = 200;
