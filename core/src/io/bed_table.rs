//! The bed-table CSV: one row per bed, lowest bed first, a header row naming the columns in any
//! order. Read with every bad cell reported by line and column; written so that it reads back
//! to the same beds, with formula-looking text cells escaped.
//!
//! Columns (header names are case-insensitive; spaces and hyphens count as underscores). Each
//! cell is read by the compact notation's reader for it ([`crate::model::shorthand`]), the one
//! the bed table in the window uses, so a cell reads the same in both (`docs/notation.md`):
//! - exactly one of `thickness_m`, `thickness_cm`, `thickness_ft` (required, > 0, in the
//!   column's unit); `4.5 c2` is a 4.5 bed whose top 2 are covered, read as two beds (the
//!   exposed part, and a covered interval above it);
//! - `lithology`: a lithology name or its first letters (`sa`, `mu`); when empty, the grain
//!   size names it (sandstone for sand, conglomerate for gravel, mudstone for mud);
//! - `grain` or `grain_base` / `grain_top`: a Wentworth class name (`fine sand`, `fine_sand`), its
//!   code (`vf`, `m`, `gr`, `pbl`; the older `pb`, `cb`, `bd` too) or a number with `mm` or
//!   `phi`; `grain` may hold base and top in the compact notation (`c-m`: coarse fining to medium
//!   sand). Empty for covered intervals, optional for non-clastic rocks, required for clastic
//!   ones. When only one of base/top is filled the other takes its value;
//! - `base_contact` (sharp when empty, erosional, gradational, or `s`, `e`, `g`; `e1.2` also
//!   gives the relief, in the thickness column's unit, when `base_relief_m` is empty);
//!   `base_relief_m` (≥ 0, metres);
//! - `structures`, `paleosol_features`: full names separated by `;`, or codes separated by spaces
//!   or commas (`tcb la`); `samples`: a list separated by `;`;
//! - `paleosol` (none when empty, weak, moderate, strong, very strong, or `w`, `m`, `s`, `vs`,
//!   optionally followed by feature codes and a stage: `s cn rt III`); `carbonate_stage` (1–6 or
//!   I–VI);
//! - `paleocurrents`: readings separated by `;`, commas or spaces, each an azimuth in degrees
//!   (0–360) with an optional indicator code and dip (`210t 185p/22 40a/12`);
//! - `surface`: name of a surface at the bed's base, optionally with its kind in brackets
//!   (`T2 (pt)`); `surface_kind` (optional): its kind; else inferred by [`infer_surface_kind`];
//! - `colour` (or `color`), `fossils`, `notes`: free text;
//! - `base_rank` (optional): the geologist's rank for the bed's base — `storey surface`, `body
//!   base` or `within storey`, or `ss`, `bb`, `ws` — overriding the rules' reading; empty leaves
//!   it to the rules. Written only when some bed has one, so other tables are written as before.
//! - the field record ([`RECORD_COLUMNS`], read by [`record_cells`]), each optional and written
//!   only when some bed has a value for it: `facies`, `munsell`, `bioturbation_index`,
//!   `trace_fossils`, `body_fossils`, `lag_composition`, `soil_horizon`, `drainage`, `photos`,
//!   `slope_distance` (in the thickness column's unit; the thickness stays required, since a bed
//!   table holds no traverse or bedding to work it out from). The `samples` cell takes each
//!   sample's kind and height in brackets (`SC-1 (dz @0.4); SC-2`).
//!
//! There is no header block: the section takes its name from the caller (the file stem) and its
//! display unit from the thickness column (ft for `thickness_ft`, cm for `thickness_cm`).
//!
//! The codes are those of the compact notation the bed table in the window takes
//! ([`crate::model::shorthand`]).
//!
//! Cells are trimmed of surrounding spaces, and `;` separates list items, so a note with edge
//! spaces or a sample name containing `;` does not survive a CSV round trip (the project file
//! keeps both).
//!
//! Text cells starting with `=`, `+`, `-`, `@`, tab or carriage return are written with a leading
//! `'` so that spreadsheets do not run them as formulas (OWASP "CSV Injection" guidance); the
//! reader removes that `'` again. Text whose own `'`s come before such a character (`'=x`) gets
//! one more, so it reads back with them.
//!
//! Every text value is limited to [`MAX_STRING_CHARS`] characters (as it is kept: trimmed and
//! unescaped; each sample on its own), the same limit in the same unit as the project file.

pub use super::csv_rows::{escape_formula, unescape_formula};
use super::csv_rows::{Record, Records};
use super::limits::{MAX_BEDS_PER_SECTION, MAX_STRING_CHARS};
use super::migrate::infer_surface_kind;
use super::problem::Problem;
use super::record_cells;
use super::validate::validate_section;
use crate::model::grain::normalise_term;
use crate::model::shorthand::{self, Term};
use crate::model::{
    Bed, BedId, Contact, Drainage, FaciesCode, GrainSize, LengthUnit, Lithology, Munsell,
    PaleosolDevelopment, PaleosolFeature, Photo, Section, SoilHorizon, Structure, Surface, SurfaceKind,
};
use std::collections::HashMap;

/// Thickness columns and their units.
pub const THICKNESS_COLUMNS: [(&str, LengthUnit); 3] = [
    ("thickness_m", LengthUnit::Metre),
    ("thickness_cm", LengthUnit::Centimetre),
    ("thickness_ft", LengthUnit::Foot),
];

/// The bed table's first columns (the rock, its contacts, paleosol, paleocurrents, surface, words), read
/// as they always were (besides the alias `color` for `colour`); [`RECORD_COLUMNS`] lists the field record's.
pub const KNOWN_COLUMNS: [&str; 21] = [
    "thickness_m",
    "thickness_cm",
    "thickness_ft",
    "lithology",
    "grain",
    "grain_base",
    "grain_top",
    "base_contact",
    "base_relief_m",
    "structures",
    "paleosol",
    "paleosol_features",
    "carbonate_stage",
    "paleocurrents",
    "surface",
    "surface_kind",
    "colour",
    "fossils",
    "samples",
    "notes",
    "base_rank",
];

/// Optional columns of the field record, read by [`record_cells`] and written only when some bed
/// has a value for them (so that older tables are written as before), in this order after the
/// columns above.
pub const RECORD_COLUMNS: [&str; 10] = [
    "facies",
    "munsell",
    "bioturbation_index",
    "trace_fossils",
    "body_fossils",
    "lag_composition",
    "soil_horizon",
    "drainage",
    "photos",
    "slope_distance",
];

/// Columns whose cells are lists separated by `;`: the text limit applies to each item.
const LIST_COLUMNS: [&str; 4] = ["samples", "photos", "trace_fossils", "body_fossils"];

/// Every column name the reader knows, for messages.
fn all_columns() -> String {
    KNOWN_COLUMNS.iter().chain(RECORD_COLUMNS.iter()).copied().collect::<Vec<_>>().join(", ")
}

/// A bed table read successfully.
#[derive(Debug, Clone)]
pub struct BedTableRead {
    pub section: Section,
    /// Warnings (unknown columns), with line 1.
    pub warnings: Vec<Problem>,
    /// The line of the row each bed was read from (a covered top shares its row's line).
    pub lines: Vec<usize>,
}

/// Where each column sits in a row.
struct Columns {
    index: HashMap<&'static str, usize>,
    thickness: (&'static str, LengthUnit),
}

impl Columns {
    /// A cell's value: trimmed, and unescaped (see [`unescape_formula`]).
    fn cell<'r>(&self, record: &'r Record, name: &str) -> Option<&'r str> {
        self.raw_cell(record, name).map(unescape_formula)
    }

    /// A cell trimmed but not unescaped (a list cell whose items are unescaped one by one).
    fn raw_cell<'r>(&self, record: &'r Record, name: &str) -> Option<&'r str> {
        self.index.get(name).and_then(|&i| record.get(i)).map(str::trim)
    }
}

fn map_header(header: &Record) -> Result<(Columns, Vec<Problem>), Vec<Problem>> {
    let mut problems = Vec::new();
    let mut warnings = Vec::new();
    let mut index: HashMap<&'static str, usize> = HashMap::new();
    for (i, raw) in header.iter().enumerate() {
        let name = normalise_term(raw.trim_start_matches('\u{feff}'));
        let name = if name == "color" { "colour".to_string() } else { name };
        match KNOWN_COLUMNS.iter().chain(RECORD_COLUMNS.iter()).find(|k| **k == name) {
            Some(known) => {
                if index.insert(known, i).is_some() {
                    problems.push(
                        Problem::new(format!("column {known}"), "appears twice in the header; keep one")
                            .at_line(1),
                    );
                }
            }
            None if name.is_empty() => warnings.push(
                Problem::new(format!("column {}", i + 1), "has no name in the header; its cells are ignored")
                    .at_line(1),
            ),
            None => warnings.push(
                Problem::new(
                    format!("column {raw:?}"),
                    format!("unknown column, ignored (known columns: {})", all_columns()),
                )
                .at_line(1),
            ),
        }
    }
    let present: Vec<(&'static str, LengthUnit)> =
        THICKNESS_COLUMNS.iter().copied().filter(|(n, _)| index.contains_key(n)).collect();
    let thickness = match present.as_slice() {
        [one] => Some(*one),
        [] => {
            problems.push(
                Problem::new(
                    "column thickness_m",
                    "a thickness column is required: exactly one of thickness_m, thickness_cm, thickness_ft",
                )
                .at_line(1),
            );
            None
        }
        many => {
            let names: Vec<&str> = many.iter().map(|(n, _)| *n).collect();
            problems.push(
                Problem::new(
                    format!("column {}", names.join(", ")),
                    "more than one thickness column; keep exactly one of thickness_m, thickness_cm, thickness_ft",
                )
                .at_line(1),
            );
            None
        }
    };
    if !index.contains_key("lithology") {
        problems.push(
            Problem::new(
                "column lithology",
                format!(
                    "the lithology column is required (values: {})",
                    Lithology::ALL.map(|l| l.name()).join(", ")
                ),
            )
            .at_line(1),
        );
    }
    if index.contains_key("grain") && (index.contains_key("grain_base") || index.contains_key("grain_top")) {
        problems.push(
            Problem::new("column grain", "use either grain, or grain_base and grain_top, not both")
                .at_line(1),
        );
    }
    match thickness {
        Some(thickness) if problems.is_empty() => Ok((Columns { index, thickness }, warnings)),
        _ => Err(problems),
    }
}

/// Collects one row's problems.
struct Row<'a> {
    line: usize,
    problems: &'a mut Vec<Problem>,
}

impl Row<'_> {
    fn bad(&mut self, column: &str, message: String) {
        self.problems.push(Problem::new(format!("column {column}"), message).at_line(self.line));
    }

    /// A problem reported at an earlier place in the row's list (a cell read after another
    /// that it depends on, reported in the order of the columns).
    fn bad_at(&mut self, at: usize, column: &str, message: String) {
        let at = at.min(self.problems.len());
        self.problems.insert(at, Problem::new(format!("column {column}"), message).at_line(self.line));
    }

    fn number(&mut self, column: &str, cell: &str, what: &str) -> Option<f64> {
        match cell.parse::<f64>() {
            Ok(v) if v.is_finite() => Some(v),
            _ => {
                self.bad(column, format!("{cell:?} is not a number; expected {what}"));
                None
            }
        }
    }

    /// A single-value cell read by `read`; empty is `None`, a bad value is reported.
    fn cell_with<T>(
        &mut self,
        column: &str,
        cell: Option<&str>,
        read: impl Fn(&str) -> Result<T, String>,
    ) -> Option<T> {
        let cell = cell.filter(|c| !c.is_empty())?;
        read(cell).map_err(|e| self.bad(column, e)).ok()
    }

    fn grain(&mut self, column: &str, cell: Option<&str>) -> Option<GrainSize> {
        let cell = cell.filter(|c| !c.is_empty())?;
        match shorthand::grain_from_code(cell) {
            Ok(g) => Some(g),
            Err(e) => {
                self.bad(column, e.to_string());
                None
            }
        }
    }

    /// A list cell of vocabulary terms: full names separated by `;`, or codes of the compact
    /// notation ([`shorthand`]) separated by spaces or commas; each bad item is reported and
    /// the rest kept.
    fn terms<T: Term>(&mut self, column: &str, cell: Option<&str>, what: &'static str) -> Vec<T> {
        let mut out: Vec<T> = Vec::new();
        for piece in cell.unwrap_or("").split(';').map(str::trim).filter(|s| !s.is_empty()) {
            match shorthand::terms_from_codes::<T>(piece, what) {
                // Kept as written, repeats included, so a table reads back to the same beds.
                Ok(found) => out.extend(found),
                Err(_) => {
                    for code in piece.split(|c: char| c.is_whitespace() || c == ',').filter(|c| !c.is_empty())
                    {
                        match shorthand::term_from_code::<T>(code, what) {
                            Ok(t) => out.push(t),
                            Err(e) => self.bad(column, e.to_string()),
                        }
                    }
                }
            }
        }
        out
    }
}

fn parse_stage(text: &str) -> Option<u8> {
    let roman = ["I", "II", "III", "IV", "V", "VI"];
    if let Some(i) = roman.iter().position(|r| r.eq_ignore_ascii_case(text)) {
        return Some(i as u8 + 1);
    }
    text.parse::<u8>().ok().filter(|s| (1..=6).contains(s))
}

/// The field-record cells of one row, read.
struct RecordFields {
    facies: Option<FaciesCode>,
    munsell: Option<Munsell>,
    bioturbation_index: Option<u8>,
    trace_fossils: Vec<String>,
    body_fossils: Vec<String>,
    lag_composition: String,
    soil_horizon: Option<SoilHorizon>,
    drainage: Option<Drainage>,
    photos: Vec<Photo>,
    slope_distance_m: Option<f64>,
}

impl RecordFields {
    fn apply(self, bed: &mut Bed) {
        bed.facies = self.facies;
        bed.munsell = self.munsell;
        bed.bioturbation_index = self.bioturbation_index;
        bed.trace_fossils = self.trace_fossils;
        bed.body_fossils = self.body_fossils;
        bed.lag_composition = self.lag_composition;
        bed.soil_horizon = self.soil_horizon;
        bed.drainage = self.drainage;
        bed.photos = self.photos;
        bed.slope_distance_m = self.slope_distance_m;
    }
}

/// Read the optional field-record cells of a row ([`RECORD_COLUMNS`]); each bad cell reported.
fn read_record_cells(
    row: &mut Row<'_>,
    columns: &Columns,
    record: &Record,
    unit: LengthUnit,
) -> RecordFields {
    let raw = |name: &str| columns.raw_cell(record, name).unwrap_or("");
    RecordFields {
        facies: row.cell_with("facies", columns.cell(record, "facies"), record_cells::facies),
        munsell: row.cell_with("munsell", columns.cell(record, "munsell"), record_cells::munsell),
        bioturbation_index: row.cell_with(
            "bioturbation_index",
            columns.cell(record, "bioturbation_index"),
            record_cells::bioturbation_index,
        ),
        trace_fossils: record_cells::names(raw("trace_fossils")),
        body_fossils: record_cells::names(raw("body_fossils")),
        lag_composition: columns.cell(record, "lag_composition").unwrap_or("").to_string(),
        soil_horizon: row.cell_with(
            "soil_horizon",
            columns.cell(record, "soil_horizon"),
            record_cells::soil_horizon,
        ),
        drainage: row.cell_with("drainage", columns.cell(record, "drainage"), record_cells::drainage),
        photos: record_cells::photos(raw("photos")),
        slope_distance_m: row.cell_with("slope_distance", columns.cell(record, "slope_distance"), |c| {
            record_cells::slope_distance(c, unit)
        }),
    }
}

/// Read a bed-table CSV. `section_name` names the section (callers pass the file stem).
/// Every bad cell is reported with its line (header = line 1), column, value and what is valid.
pub fn read_bed_table(text: &str, section_name: &str) -> Result<BedTableRead, Vec<Problem>> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    // Rows may have any number of cells (checked against the header below).
    let mut records = Records::new(text);
    let header = match records.next() {
        Some(h) => h,
        None => {
            return Err(vec![Problem::new(
                "",
                "the file is empty; a bed table needs a header row (e.g. thickness_m,lithology,grain) and one row per bed",
            )
            .at_line(1)])
        }
    };
    if let Some(line) = unclosed_quote_line(text) {
        return Err(vec![Problem::new(
            "",
            "a quoted cell opened here is never closed, so the rest of the file would be read as one cell; \
             add the closing \" (write \"\" for a quote mark inside a quoted cell)",
        )
        .at_line(line)]);
    }
    let (columns, warnings) = map_header(&header)?;
    // Lines are counted here from the record's byte offset: the CSV parser's own line count
    // runs one short on files with Windows (CR LF) line breaks.
    let line_breaks: Vec<usize> = text.match_indices('\n').map(|(i, _)| i).collect();
    // Where a record's text starts: its offset can point at line breaks (blank lines, the LF of
    // a CR LF) the parser stepped over before it.
    let row_start = |record: &Record| {
        let mut at = record.start;
        while text.as_bytes().get(at).is_some_and(|b| *b == b'\n' || *b == b'\r') {
            at += 1;
        }
        at
    };
    let line_at = |record: &Record| line_breaks.partition_point(|&b| b < row_start(record)) + 1;
    let mut problems = Vec::new();
    let mut section = Section::new(section_name);
    section.display_unit = columns.thickness.1;
    let mut lines: Vec<usize> = Vec::new();
    let mut surface_kinds: Vec<Option<SurfaceKind>> = Vec::new();
    // Rows with problems count too: otherwise a file of bad rows collects problems without bound.
    let mut data_rows = 0usize;
    for record in records {
        let line = line_at(&record);
        if record.iter().all(|c| c.trim().is_empty()) {
            continue;
        }
        // A short last row in a file that stops without a line break was most likely cut off.
        let start = row_start(&record);
        let last_row = line_breaks.last().is_none_or(|&b| b < start);
        if last_row && record.len() < header.len() && !text.ends_with('\n') && !text.ends_with('\r') {
            problems.push(
                Problem::new(
                    "",
                    format!(
                        "the last row has {} cells but the header names {} columns, and the file ends in \
                         the middle of it: the file looks cut off (truncated?)",
                        record.len(),
                        header.len()
                    ),
                )
                .at_line(line),
            );
        }
        if data_rows >= MAX_BEDS_PER_SECTION {
            problems.push(
                Problem::new("", format!("more than {MAX_BEDS_PER_SECTION} bed rows; at most {MAX_BEDS_PER_SECTION} per section"))
                    .at_line(line),
            );
            break;
        }
        data_rows += 1;
        let before = problems.len();
        let mut row = Row { line, problems: &mut problems };
        if record.len() > header.len() && record.iter().skip(header.len()).any(|c| !c.trim().is_empty()) {
            row.bad(
                &format!("{}", header.len() + 1),
                format!("the row has {} cells but the header names {} columns", record.len(), header.len()),
            );
        }
        // The text limit applies to each value as it is kept (trimmed, unescaped; each item of a
        // list on its own), counted in characters as validation counts them.
        for (i, cell) in record.iter().enumerate() {
            let is_list = LIST_COLUMNS.iter().any(|c| columns.index.get(c) == Some(&i));
            let values: Vec<&str> = if is_list {
                cell.split(';').map(|s| unescape_formula(s.trim())).collect()
            } else {
                vec![unescape_formula(cell.trim())]
            };
            for value in values {
                let n = value.chars().count();
                if n > MAX_STRING_CHARS {
                    let name = header.get(i).unwrap_or("?").to_string();
                    row.bad(&name, format!("text of {n} characters; at most {MAX_STRING_CHARS} allowed"));
                }
            }
        }
        let (tcol, unit) = columns.thickness;
        let thickness = match columns.cell(&record, tcol).unwrap_or("") {
            "" if !columns.cell(&record, "slope_distance").unwrap_or("").is_empty() => {
                row.bad(
                    tcol,
                    format!(
                        "required: a thickness in {} > 0. The slope distance in this row cannot stand in for it: \
                         turning a distance along the ground into a thickness needs the traverse and the bedding \
                         attitude, which a bed table does not hold; work the thickness out, or enter the section \
                         in a project file, whose section details hold both",
                        unit.name()
                    ),
                );
                None
            }
            "" => {
                row.bad(tcol, format!("required: a thickness in {} > 0", unit.name()));
                None
            }
            cell => match shorthand::thickness_entry(cell, unit) {
                Ok(t) => Some(t),
                Err(e) => {
                    row.bad(tcol, e.to_string());
                    None
                }
            },
        };
        // The lithology is read after the grain size (an empty cell takes the grain's rock name)
        // but reported before it, in the order of the columns.
        let lithology_at = row.problems.len();
        let (mut grain_base, mut grain_top) = if columns.index.contains_key("grain") {
            // One grain size, or base and top in the compact notation (`c-m`).
            match shorthand::grain_range(columns.cell(&record, "grain").unwrap_or("")) {
                Ok(pair) => pair,
                Err(e) => {
                    row.bad("grain", e.to_string());
                    (None, None)
                }
            }
        } else {
            (
                row.grain("grain_base", columns.cell(&record, "grain_base")),
                row.grain("grain_top", columns.cell(&record, "grain_top")),
            )
        };
        if grain_base.is_none() {
            grain_base = grain_top;
        }
        if grain_top.is_none() {
            grain_top = grain_base;
        }
        // By name or first letters; an empty cell takes the lithology the grain size names.
        let lithology_cell = columns.cell(&record, "lithology").unwrap_or("");
        let lithology = match shorthand::lithology_entry(lithology_cell, grain_base) {
            Ok(l) => Some(l),
            Err(_) if lithology_cell.is_empty() => {
                row.bad_at(
                    lithology_at,
                    "lithology",
                    format!(
                        "required when there is no grain size; valid values are {}",
                        Lithology::ALL.map(|l| l.name()).join(", ")
                    ),
                );
                None
            }
            Err(e) => {
                row.bad_at(lithology_at, "lithology", e.to_string());
                None
            }
        };
        // A contact by name or code, with its relief in metres typed after it (`e1.2`) when the
        // relief column is empty.
        let (base_contact, relief_in_contact) =
            match shorthand::contact_entry(columns.cell(&record, "base_contact").unwrap_or(""), unit) {
                Ok(entry) => (entry.contact, entry.relief_m),
                Err(e) => {
                    row.bad("base_contact", e.to_string());
                    (Contact::Sharp, None)
                }
            };
        let base_relief_m = match columns.cell(&record, "base_relief_m").unwrap_or("") {
            "" => relief_in_contact,
            cell => row.number("base_relief_m", cell, "a relief in m ≥ 0").and_then(|v| {
                if v >= 0.0 {
                    Some(v)
                } else {
                    row.bad("base_relief_m", format!("must be ≥ 0, got {cell}"));
                    None
                }
            }),
        };
        let structures: Vec<Structure> =
            row.terms("structures", columns.cell(&record, "structures"), "structure");
        let base_rank = match shorthand::rank_entry(columns.cell(&record, "base_rank").unwrap_or("")) {
            Ok(rank) => rank,
            Err(e) => {
                row.bad("base_rank", e.to_string());
                None
            }
        };
        // Development by name or code; the compact notation may add features and a carbonate
        // stage in the same cell (`s cn rt III`).
        let (paleosol, features_in_paleosol, stage_in_paleosol) =
            match columns.cell(&record, "paleosol").unwrap_or("") {
                "" => (PaleosolDevelopment::None, Vec::new(), None),
                cell => match PaleosolDevelopment::parse(cell)
                    .map(|d| {
                        Ok(shorthand::PaleosolEntry {
                            development: d,
                            features: Vec::new(),
                            carbonate_stage: None,
                        })
                    })
                    .unwrap_or_else(|| shorthand::paleosol_entry(cell))
                {
                    Ok(entry) => (entry.development, entry.features, entry.carbonate_stage),
                    Err(e) => {
                        row.bad("paleosol", e.to_string());
                        (PaleosolDevelopment::None, Vec::new(), None)
                    }
                },
            };
        let mut paleosol_features: Vec<PaleosolFeature> =
            row.terms("paleosol_features", columns.cell(&record, "paleosol_features"), "paleosol feature");
        for f in features_in_paleosol {
            if !paleosol_features.contains(&f) {
                paleosol_features.push(f);
            }
        }
        let carbonate_stage = match columns.cell(&record, "carbonate_stage").unwrap_or("") {
            "" => stage_in_paleosol,
            cell => parse_stage(cell).or_else(|| {
                row.bad("carbonate_stage", format!("{cell:?} is not a carbonate stage; use 1–6 or I–VI"));
                None
            }),
        };
        let paleocurrents = shorthand::paleocurrents(columns.cell(&record, "paleocurrents").unwrap_or(""))
            .unwrap_or_else(|e| {
                row.bad("paleocurrents", e.to_string());
                Vec::new()
            });
        // A name, perhaps with its kind in brackets (`T2 (pt)`); the surface_kind column may
        // give the kind instead.
        let surface = shorthand::surface_entry(columns.cell(&record, "surface").unwrap_or(""))
            .unwrap_or_else(|e| {
                row.bad("surface", e.to_string());
                None
            });
        let kind_in_surface = surface.as_ref().and_then(|s| s.kind);
        let surface_name = surface.map(|s| s.name).unwrap_or_default();
        let surface_kind = match columns.cell(&record, "surface_kind").unwrap_or("") {
            "" => kind_in_surface,
            cell => match SurfaceKind::parse(cell) {
                Some(k) if kind_in_surface.is_some_and(|b| b != k) => {
                    row.bad(
                        "surface_kind",
                        format!("{k} differs from the kind given in the surface column; give it once"),
                    );
                    None
                }
                Some(k) if !surface_name.is_empty() => Some(k),
                Some(_) => {
                    row.bad("surface_kind", "given without a surface name in the surface column".to_string());
                    None
                }
                None => {
                    row.bad(
                        "surface_kind",
                        format!("{cell:?} is not known; valid values are {}", SurfaceKind::valid_list()),
                    );
                    None
                }
            },
        };
        let text = |name: &str| columns.cell(&record, name).unwrap_or("").to_string();
        let (samples, sample_errors) =
            record_cells::samples(columns.raw_cell(&record, "samples").unwrap_or(""), unit);
        for e in sample_errors {
            row.bad("samples", e);
        }
        let record_fields = read_record_cells(&mut row, &columns, &record, unit);
        let (Some(thickness), Some(lithology)) = (thickness, lithology) else { continue };
        if problems.len() > before {
            continue;
        }
        let id = BedId(section.beds.len() as u64 + 1);
        let mut bed = Bed::new(id, thickness.exposed_m(), lithology, None);
        bed.grain_base = grain_base;
        bed.grain_top = grain_top;
        bed.structures = structures;
        bed.base_contact = base_contact;
        bed.base_rank = base_rank;
        bed.base_relief_m = base_relief_m;
        bed.paleosol = paleosol;
        bed.paleosol_features = paleosol_features;
        bed.carbonate_stage = carbonate_stage;
        bed.paleocurrents = paleocurrents;
        if !surface_name.is_empty() {
            bed.base_surface = Some(Surface { name: surface_name, kind: SurfaceKind::Other });
        }
        bed.colour = text("colour");
        bed.fossils = text("fossils");
        bed.samples = samples;
        bed.notes = text("notes");
        record_fields.apply(&mut bed);
        section.beds.push(bed);
        lines.push(line);
        surface_kinds.push(surface_kind);
        // A covered top: a covered interval above the exposed part, from the same row.
        if let Some(covered) = thickness.covered_top_m {
            let id = BedId(section.beds.len() as u64 + 1);
            section.beds.push(Bed::new(id, covered, Lithology::Covered, None));
            lines.push(line);
            surface_kinds.push(None);
        }
    }
    if problems.is_empty() && section.beds.is_empty() {
        problems.push(
            Problem::new("", "no bed rows after the header; add one row per bed, lowest first").at_line(2),
        );
    }
    let mut below: Option<PaleosolDevelopment> = None;
    for (bed, kind) in section.beds.iter_mut().zip(&surface_kinds) {
        let contact = bed.base_contact;
        if let Some(surface) = bed.base_surface.as_mut() {
            surface.kind = kind.unwrap_or_else(|| infer_surface_kind(contact, below));
        }
        below = Some(bed.paleosol);
    }
    // Rules that need the whole bed (grain required for clastics, forbidden when covered …),
    // checked on the rows that parsed, so one pass reports every problem.
    problems.extend(
        validate_section(&section)
            .into_iter()
            .map(|p| csv_location(p, &lines, columns.thickness.0, columns.index.contains_key("grain"))),
    );
    problems.sort_by_key(|p| p.line);
    // A single `grain` column stands for base and top: one problem, not two.
    problems.dedup();
    if problems.is_empty() {
        Ok(BedTableRead { section, warnings, lines })
    } else {
        Err(problems)
    }
}

/// Turn a section-relative problem (`beds[3].grain_base`) into a CSV one (line, column).
fn csv_location(p: Problem, lines: &[usize], thickness_column: &str, single_grain: bool) -> Problem {
    let Some(rest) = p.location.strip_prefix("beds[") else { return p };
    let Some((index, field)) = rest.split_once("].") else { return p };
    let Ok(i) = index.parse::<usize>() else { return p };
    let field = field.split(['[', '.']).next().unwrap_or(field);
    let column = match field {
        "thickness_m" => thickness_column,
        "grain_base" | "grain_top" if single_grain => "grain",
        "paleocurrents_deg" => "paleocurrents",
        "base_surface" => "surface",
        "slope_distance_m" => "slope_distance",
        other => other,
    };
    let mut out = Problem::new(format!("column {column}"), p.message);
    out.line = lines.get(i).copied();
    out
}

/// The line of a quoted cell that is still open at the end of the text (RFC 4180 quoting: a
/// quote at the start of a cell opens it, `""` inside is a quote mark, `"` closes it). Quotes,
/// commas and line breaks are ASCII, so the text is walked byte by byte.
fn unclosed_quote_line(text: &str) -> Option<usize> {
    let mut line = 1;
    let mut opened_at = None;
    let mut at_cell_start = true;
    let mut bytes = text.bytes().peekable();
    while let Some(b) = bytes.next() {
        if b == b'\n' {
            line += 1;
        }
        match (opened_at, b) {
            (Some(_), b'"') if bytes.peek() == Some(&b'"') => {
                bytes.next();
            }
            (Some(_), b'"') => opened_at = None,
            (Some(_), _) => {}
            (None, b'"') if at_cell_start => opened_at = Some(line),
            (None, _) => {}
        }
        at_cell_start = opened_at.is_none() && (b == b',' || b == b'\n' || b == b'\r');
    }
    opened_at
}

/// Quote a CSV cell when needed (RFC 4180: comma, quote, line break; and edge spaces).
fn quote(cell: &str) -> String {
    if cell.contains([',', '"', '\n', '\r']) || cell.starts_with(' ') || cell.ends_with(' ') {
        format!("\"{}\"", cell.replace('"', "\"\""))
    } else {
        cell.to_string()
    }
}

/// A bed's cell in one of the [`RECORD_COLUMNS`], as the reader reads it back; empty when the
/// bed has no value there. Lengths in `unit`.
fn record_cell(bed: &Bed, column: &str, unit: LengthUnit) -> String {
    match column {
        "facies" => bed.facies.map(|f| f.code().to_string()).unwrap_or_default(),
        "munsell" => bed.munsell.as_ref().map(ToString::to_string).unwrap_or_default(),
        "bioturbation_index" => bed.bioturbation_index.map(|b| b.to_string()).unwrap_or_default(),
        "trace_fossils" => record_cells::names_code(&bed.trace_fossils),
        "body_fossils" => record_cells::names_code(&bed.body_fossils),
        "lag_composition" => escape_formula(&bed.lag_composition),
        "soil_horizon" => bed.soil_horizon.as_ref().map(ToString::to_string).unwrap_or_default(),
        "drainage" => bed.drainage.map(|d| d.name().to_string()).unwrap_or_default(),
        "photos" => record_cells::photos_code(&bed.photos),
        "slope_distance" => {
            bed.slope_distance_m.map(|d| format!("{}", unit.from_metres(d))).unwrap_or_default()
        }
        _ => String::new(),
    }
}

/// Write a section's beds as a bed-table CSV that [`read_bed_table`] reads back to the same
/// beds (ids are renumbered from 1). Thickness is written in the section's display unit.
pub fn write_bed_table(section: &Section) -> String {
    let (tcol, unit) = THICKNESS_COLUMNS
        .iter()
        .copied()
        .find(|(_, u)| *u == section.display_unit)
        .unwrap_or(THICKNESS_COLUMNS[0]);
    // The known columns in their order, with the one thickness column this section uses and the
    // base/top grain pair rather than the single `grain` shorthand.
    // `base_rank` only when some bed has one: tables without ranks are written as before.
    let ranks = section.beds.iter().any(|b| b.base_rank.is_some());
    // The field-record columns likewise, each only when some bed has a value for it.
    let record: Vec<&str> = RECORD_COLUMNS
        .iter()
        .copied()
        .filter(|c| section.beds.iter().any(|b| !record_cell(b, c, unit).is_empty()))
        .collect();
    let header: Vec<&str> = std::iter::once(tcol)
        .chain(
            KNOWN_COLUMNS
                .iter()
                .copied()
                .filter(|c| !c.starts_with("thickness_") && *c != "grain" && (ranks || *c != "base_rank")),
        )
        .chain(record.iter().copied())
        .collect();
    let mut out = header.join(",");
    out.push('\n');
    let join = |items: Vec<String>| items.join(";");
    for bed in &section.beds {
        let grain = |g: Option<GrainSize>| g.map(|g| escape_formula(&String::from(g))).unwrap_or_default();
        let cells: [String; 17] = [
            format!("{}", unit.from_metres(bed.thickness_m)),
            bed.lithology.name().to_string(),
            grain(bed.grain_base),
            grain(bed.grain_top),
            bed.base_contact.name().to_string(),
            bed.base_relief_m.map(|r| format!("{r}")).unwrap_or_default(),
            join(bed.structures.iter().map(|s| s.name().to_string()).collect()),
            bed.paleosol.name().to_string(),
            join(bed.paleosol_features.iter().map(|s| s.name().to_string()).collect()),
            bed.carbonate_stage.map(|s| s.to_string()).unwrap_or_default(),
            join(shorthand::paleocurrents_code(&bed.paleocurrents).split(' ').map(str::to_string).collect()),
            bed.base_surface.as_ref().map(|s| escape_formula(&s.name)).unwrap_or_default(),
            bed.base_surface.as_ref().map(|s| s.kind.name().to_string()).unwrap_or_default(),
            escape_formula(&bed.colour),
            escape_formula(&bed.fossils),
            record_cells::samples_code(&bed.samples, unit),
            escape_formula(&bed.notes),
        ];
        let rank = bed.base_rank.map(|r| r.name().to_string()).unwrap_or_default();
        let rank = ranks.then_some(rank);
        let record_cells: Vec<String> = record.iter().map(|c| record_cell(bed, c, unit)).collect();
        out.push_str(
            &cells
                .iter()
                .chain(rank.as_ref())
                .chain(&record_cells)
                .map(|c| quote(c))
                .collect::<Vec<_>>()
                .join(","),
        );
        out.push('\n');
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{BaseRank, WentworthClass};

    const TABLE: &str = "\
Thickness_ft,Lithology,grain_base,grain_top,base_contact,structures,paleosol,paleocurrents,surface,notes,weather
3,mudstone,silt,clay,,,moderate,,,,sunny
10,sandstone,coarse sand,fine_sand,erosional,trough cross-bedding; lateral accretion,,120;135,SB-1,\"fines up, 2 storeys\",
2,covered,,,,,,,,'=1+1,
";

    #[test]
    fn reads_a_table_in_feet_with_an_unknown_column() {
        let read = read_bed_table(TABLE, "Pell Butte").expect("valid table");
        let s = &read.section;
        assert_eq!(s.beds.len(), 3);
        assert_eq!(s.display_unit, LengthUnit::Foot);
        // 1 ft = 0.3048 m exactly (1959 international yard and pound agreement).
        assert_eq!(s.beds[1].thickness_m, 10.0 * 0.3048);
        assert_eq!(s.beds[1].grain_top, Some(GrainSize::Class(WentworthClass::FineSand)));
        assert_eq!(s.beds[1].azimuths().collect::<Vec<_>>(), vec![120.0, 135.0]);
        assert_eq!(s.beds[1].structures, vec![Structure::TroughCrossBedding, Structure::LateralAccretion]);
        assert_eq!(s.beds[1].base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::Incision));
        assert_eq!(s.beds[1].notes, "fines up, 2 storeys");
        assert_eq!(s.beds[2].notes, "=1+1");
        assert_eq!(read.warnings.len(), 1);
        assert!(read.warnings[0].to_string().contains("weather"), "{}", read.warnings[0]);
    }

    #[test]
    fn written_table_reads_back_and_escapes_formulas() {
        let read = read_bed_table(TABLE, "Pell Butte").expect("valid table");
        let text = write_bed_table(&read.section);
        assert!(text.contains(",'=1+1\n"), "{text}");
        let again = read_bed_table(&text, "Pell Butte").expect("reads back");
        assert_eq!(again.section.beds.len(), 3);
        for (a, b) in read.section.beds.iter().zip(&again.section.beds) {
            assert!((a.thickness_m - b.thickness_m).abs() < 1e-12);
            let mut b = b.clone();
            b.thickness_m = a.thickness_m;
            assert_eq!(a, &b);
        }
        assert!(again.warnings.is_empty());
    }

    #[test]
    fn formula_escape_reads_back_every_text_and_keeps_hand_written_apostrophes() {
        for text in ["=1+1", "'=1+1", "''-x", "'x", "''", "'", "@", "plain", "x=1", "'\t", "-"] {
            assert_eq!(unescape_formula(&escape_formula(text)), text, "{text:?}");
        }
        assert_eq!(escape_formula("'=1"), "''=1");
        // A spreadsheet's own apostrophes before ordinary text are not escapes.
        assert_eq!(unescape_formula("'tis"), "'tis");
        assert_eq!(unescape_formula("''quoted''"), "''quoted''");
    }

    #[test]
    fn reports_lines_and_columns() {
        let text = "thickness_m,lithology,grain\n1,sandstone,fine sand\n-1,sandstne,gravelish\n2,mudstone,\n";
        let problems = read_bed_table(text, "x").expect_err("refused");
        let got: Vec<(Option<usize>, &str)> =
            problems.iter().map(|p| (p.line, p.location.as_str())).collect();
        assert_eq!(
            got,
            [
                (Some(3), "column thickness_m"),
                (Some(3), "column lithology"),
                (Some(3), "column grain"),
                (Some(4), "column grain"),
            ]
        );
    }

    #[test]
    fn windows_line_breaks_give_the_same_lines() {
        // Spreadsheets on Windows write CR LF (RFC 4180 names CRLF as the line break).
        let lf = "thickness_m,lithology,grain\n1,sandstone,fine sand\n2,mudstone,silt\n-1,mudstone,silt\n\n3,sandstone,\n";
        let crlf = lf.replace('\n', "\r\n");
        let lines = |text: &str| -> Vec<(Option<usize>, String)> {
            let problems = read_bed_table(text, "x").expect_err("refused");
            problems.iter().map(|p| (p.line, p.location.clone())).collect()
        };
        let want = vec![(Some(4), "column thickness_m".to_string()), (Some(6), "column grain".to_string())];
        assert_eq!(lines(lf), want);
        assert_eq!(lines(&crlf), want);
    }

    #[test]
    fn a_short_last_row_without_a_line_break_is_called_truncated() {
        let cut = "thickness_m,lithology,grain,contact\n1,sandstone,fine sand,sharp\n1.2,sandstone";
        for text in [cut.to_string(), cut.replace('\n', "\r\n")] {
            let problems = read_bed_table(&text, "x").expect_err("refused");
            assert!(
                problems.iter().any(|p| p.line == Some(3) && p.message.contains("truncated")),
                "{text:?}: {problems:?}"
            );
        }
        // The same short row ending with a line break is a row with its last cells left empty.
        let read = read_bed_table(&format!("{cut},fine sand\n"), "x").expect("reads");
        assert_eq!(read.section.beds.len(), 2);
    }

    #[test]
    fn base_rank_is_read_written_only_when_used_and_bad_values_are_named() {
        let read = read_bed_table(TABLE, "Pell Butte").expect("valid table");
        assert!(!write_bed_table(&read.section).contains("base_rank"), "no ranks, no column");
        let text = "thickness_m,lithology,grain,base_contact,Base Rank\n\
                    1,sandstone,fine sand,erosional,storey surface\n\
                    1,sandstone,fine sand,erosional,within_storey\n2,mudstone,silt,,\n";
        let s = read_bed_table(text, "x").expect("valid").section;
        let ranks: Vec<Option<BaseRank>> = s.beds.iter().map(|b| b.base_rank).collect();
        assert_eq!(ranks, vec![Some(BaseRank::StoreySurface), Some(BaseRank::WithinStorey), None]);
        let written = write_bed_table(&s);
        assert!(written.lines().next().is_some_and(|h| h.ends_with(",notes,base_rank")), "{written}");
        assert_eq!(read_bed_table(&written, "x").expect("reads back").section.beds, s.beds);
        let bad = "thickness_m,lithology,grain,base_rank\n1,sandstone,fine sand,channel floor\n";
        let problems = read_bed_table(bad, "x").expect_err("refused");
        assert_eq!((problems[0].line, problems[0].location.as_str()), (Some(2), "column base_rank"));
        assert!(
            problems[0].message.contains("storey surface (ss), body base (bb), within storey (ws)"),
            "{}",
            problems[0].message
        );
    }

    #[test]
    fn the_notation_of_the_window_reads_in_every_cell() {
        // The cells the bed table in the window takes, in a table in feet: a covered top, a
        // lithology named by its grain size or by first letters, relief in the table's unit,
        // a surface with its kind, a rank by code.
        let text = "thickness_ft,lithology,grain,base_contact,surface,base_rank,paleocurrents\n\
                    4,mu,cl,,,,\n\
                    6 c2,,c-m,e1.5,RG-1 (pt),bb,200 215\n\
                    1,,pbl,,,,\n";
        let s = read_bed_table(text, "x").expect("reads").section;
        let ft = 0.3048; // m per international foot (1959 agreement)
        let got: Vec<(Lithology, f64)> = s.beds.iter().map(|b| (b.lithology, b.thickness_m / ft)).collect();
        assert_eq!(got.len(), 4, "the covered top is a bed of its own: {got:?}");
        assert_eq!(got[0].0, Lithology::Mudstone);
        assert_eq!(got[1].0, Lithology::Sandstone, "named from c-m");
        assert!((got[1].1 - 4.0).abs() < 1e-9 && (got[2].1 - 2.0).abs() < 1e-9, "{got:?}");
        assert_eq!(got[2].0, Lithology::Covered);
        assert_eq!(got[3].0, Lithology::Conglomerate, "named from pbl");
        let sand = &s.beds[1];
        assert!((sand.base_relief_m.unwrap_or(0.0) - 1.5 * ft).abs() < 1e-12, "relief in feet");
        assert_eq!(
            sand.base_surface.as_ref().map(|x| (x.name.as_str(), x.kind)),
            Some(("RG-1", SurfaceKind::PaleosolTop))
        );
        assert_eq!(sand.base_rank, Some(BaseRank::BodyBase));
        assert_eq!(sand.azimuths().collect::<Vec<_>>(), vec![200.0, 215.0]);
        // A problem in a row with a covered top names that row's line.
        let bad = "thickness_m,lithology,grain\n1,sa,f\n3 c1,sa,\n";
        let problems = read_bed_table(bad, "x").expect_err("sandstone without a grain size");
        assert_eq!(
            (problems[0].line, problems[0].location.as_str()),
            (Some(3), "column grain"),
            "{problems:?}"
        );
        // No lithology and no grain size: nothing names the rock.
        let p = read_bed_table("thickness_m,lithology,grain\n1,,\n", "x").expect_err("nothing names it");
        assert!(p[0].message.contains("required when there is no grain size"), "{}", p[0]);
        let p = read_bed_table("thickness_m,lithology,surface,surface_kind\n1,coal,T (pt),other\n", "x")
            .expect_err("two kinds");
        assert_eq!(p[0].location, "column surface_kind");
    }

    #[test]
    fn the_csv_in_the_notation_document_reads_as_its_log_says() {
        // docs/notation.md shows the 13-bed log as a CSV: it must read, to 13 beds and the
        // covered top of the last.
        let doc = include_str!("../../../docs/notation.md");
        let csv = doc
            .split("```csv\n")
            .nth(1)
            .and_then(|rest| rest.split("```").next())
            .expect("a csv block in docs/notation.md");
        let s = read_bed_table(csv, "notation").expect("the documented CSV reads").section;
        assert_eq!(s.beds.len(), 14);
        assert!((s.total_thickness_m() - 29.5).abs() < 1e-9);
        let lith: Vec<Lithology> = s.beds.iter().map(|b| b.lithology).collect();
        use Lithology::*;
        assert_eq!(
            lith,
            [
                Mudstone,
                Siltstone,
                Mudstone,
                Conglomerate,
                Sandstone,
                Sandstone,
                Sandstone,
                Mudstone,
                Sandstone,
                Mudstone,
                Sandstone,
                Mudstone,
                Mudstone,
                Covered
            ]
        );
        assert_eq!(s.beds[3].base_surface.as_ref().map(|x| x.kind), Some(SurfaceKind::Incision));
        assert_eq!(s.beds[0].paleosol_features, vec![PaleosolFeature::RootTraces]);
    }
}
