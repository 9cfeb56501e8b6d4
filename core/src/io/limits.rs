//! Limits on what a file may ask for, so that hostile or broken files fail fast with bounded
//! memory instead of exhausting the machine.
//!
//! The figures are generous for real field data (the largest measured sections run to a few
//! thousand beds) and small enough that a file at every limit still loads in well under a second.
//!
//! Every limit on text is counted in one unit, characters as `str::chars` counts them (Unicode
//! scalar values), wherever it is applied: validation, the JSON pre-scan (an escape such as
//! `\u00e9`, or a surrogate pair such as `\uD83D\uDE00`, is one character; the bytes of a
//! multi-byte UTF-8 character are one), each bed-table cell as it is kept, and the window's text
//! fields. A combining mark is a character of its own (`e` + U+0301 is two).

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

/// Longest text value (names, notes, colours, samples, surface names, review notes, curve
/// mnemonics, units, descriptions and source files), in characters (see above), not bytes: 10,000
/// "é" are 20,000 bytes of UTF-8 and within the limit.
pub const MAX_STRING_CHARS: usize = 10_000;

/// Longest correlation label on an accepted boundary ("SB-2", "base of upper storey system"),
/// in characters: it is printed beside a tie line on the panel, so it must stay short.
pub const MAX_LINK_LABEL_CHARS: usize = 40;

/// Deepest nesting of JSON arrays and objects. A valid project nests 7 levels deep (a measured
/// curve's sample pair inside its curve inside a section).
pub const MAX_JSON_DEPTH: usize = 16;

/// Most problems listed in one error (the count of the rest is still given).
pub const MAX_PROBLEMS_LISTED: usize = 200;

/// Largest thickness (or erosional relief) accepted for one bed, metres. No single bed of a
/// measured section approaches a kilometre; larger values are typing or unit mistakes.
pub const MAX_BED_THICKNESS_M: f64 = 1_000.0;

/// Largest panel position accepted, metres (|x| ≤ 10,000 km).
pub const MAX_PANEL_POSITION_M: f64 = 1.0e7;

/// Most items in each list of one bed's field record: samples, photographs, paleocurrent
/// readings, trace-fossil and body-fossil names. A bed logged in great detail carries a few
/// dozen; a thousand is far beyond any notebook and keeps a hostile file's lists bounded per bed
/// (the JSON pre-scan alone would allow [`MAX_ARRAY_ITEMS`] on every bed).
pub const MAX_RECORD_ITEMS_PER_BED: usize = 1_000;

/// Most GPS fixes on one section (base, top and one at the foot of each offset of a composite
/// traverse: a handful in practice).
pub const MAX_FIXES_PER_SECTION: usize = 1_000;

/// Longest name in a list of the field record (a photo reference, a trace- or body-fossil name),
/// in characters: such names are printed beside the column, so they must stay short. Sample ids
/// keep the general [`MAX_STRING_CHARS`], as in version-1 files.
pub const MAX_RECORD_NAME_CHARS: usize = 200;

/// Widest channel body accepted, metres. Channel belts of the largest rivers reach tens of
/// kilometres (Gibling 2006, J. Sed. Research 76, 731–770); 100 km seen across one outcrop is a
/// typing or unit mistake.
pub const MAX_BODY_WIDTH_M: f64 = 100_000.0;

/// Range of GPS elevations accepted, metres above sea level: below the deepest ocean trench
/// (about −10,900 m) or above the highest summit (8,849 m) is a typing or unit mistake.
pub const ELEVATION_RANGE_M: (f64, f64) = (-11_000.0, 9_000.0);
