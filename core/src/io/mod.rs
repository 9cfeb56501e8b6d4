//! Reading and writing files: the versioned project JSON (`.aggrade`), the bed-table CSV,
//! validation shared with the app, atomic saving, and the forgiving import of spreadsheets and
//! text tables written by hand (`import`).
//!
//! A project file is read in stages, each reporting every problem it finds as a [`Problem`]
//! (line, JSON path, what would be valid): a pre-scan of the text enforces the [`limits`] and
//! lists unknown fields (`json_scan`); a valid current file then deserialises in one pass;
//! anything else is checked as JSON, migrated from older versions (`migrate`) and read section
//! by section and bed by bed (`project_reader`, with serde_json's `RawValue` slices of the text),
//! naming every wrong field; last comes validation (`validate`). [`load`] chooses the reader by
//! extension and names the file in every error and warning; [`save_project`] validates and
//! writes atomically (`atomic`).

mod atomic;
mod bed_table;
mod csv_rows;
mod curve_fields;
mod field_check;
pub mod import;
mod json_scan;
pub mod limits;
mod migrate;
mod problem;
mod project_file;
mod project_reader;
mod record_cells;
mod validate;

pub use atomic::{backup_path, write_atomic, write_bytes_atomic, SaveError};
pub use bed_table::{read_bed_table, write_bed_table, BedTableRead};
pub use limits::*;
pub use migrate::infer_surface_kind;
pub use problem::Problem;
pub use project_file::{project_to_json, read_project_text, ProjectRead};
pub use validate::{
    check_iso_date, check_link_label, field_record_warnings, new_problems, record_warnings, validate_project,
    validate_section,
};

/// The reader's stages on their own, for the cross-crate tests and benchmarks that compare the
/// fast paths with the checked path (cargo feature `internals`); not part of the API.
#[cfg(feature = "internals")]
#[doc(hidden)]
pub mod internals {
    pub use super::json_scan::{check_limits, check_limits_and_fields, KnownFields};
    pub use super::project_reader::{
        beds_with_unknown_fields, check_json_syntax, known_fields, read_project, read_project_raw, FieldRead,
    };
}

use crate::model::Project;
use std::io::Read;
use std::path::{Path, PathBuf};

/// A file read successfully, with any warnings (e.g. unknown CSV columns).
#[derive(Debug, Clone)]
pub struct Loaded {
    pub project: Project,
    pub warnings: Vec<Warning>,
}

/// Something read past in a file that was read: shown as a full sentence naming the file (and
/// the line, field or column, where known).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Warning {
    pub path: PathBuf,
    pub problem: Problem,
}

impl std::fmt::Display for Warning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: {}", self.path.display(), self.problem)
    }
}

/// Why a file could not be read. Each message is whole: it names the file and the underlying
/// error, which is kept as data (`error`) but not chained as a `source()`, so that a report
/// walking the chain does not print it twice.
#[derive(Debug, thiserror::Error)]
pub enum LoadError {
    /// The file could not be opened or read.
    #[error("{path}: could not read the file: {error}", path = .path.display())]
    Io { path: PathBuf, error: std::io::Error },
    /// Larger than [`MAX_FILE_BYTES`]; refused before reading.
    #[error("{path}: the file is {size_bytes} bytes; at most {limit_bytes} bytes are read", path = .path.display())]
    TooLarge { path: PathBuf, size_bytes: u64, limit_bytes: u64 },
    /// The extension names no format this build reads.
    #[error("{path}: unknown file type; use .aggrade or .json (project) or .csv (bed table)", path = .path.display())]
    UnknownKind { path: PathBuf },
    /// The content breaks the format; every problem found, in file order.
    #[error("{}", invalid_message(.path, .problems))]
    Invalid { path: PathBuf, problems: Vec<Problem> },
}

impl LoadError {
    /// The problems found in the content (empty for I/O and size errors).
    pub fn problems(&self) -> &[Problem] {
        match self {
            LoadError::Invalid { problems, .. } => problems,
            _ => &[],
        }
    }
}

fn invalid_message(path: &Path, problems: &[Problem]) -> String {
    let n = problems.len();
    let shown = &problems[..n.min(MAX_PROBLEMS_LISTED)];
    let mut msg = format!(
        "{}: {n} problem{}:\n{}",
        path.display(),
        if n == 1 { "" } else { "s" },
        problem::list(shown)
    );
    if n > shown.len() {
        msg.push_str(&format!("\n  … and {} more", n - shown.len()));
    }
    msg
}

/// The kinds of file [`load`] reads, by extension.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FileKind {
    /// `.aggrade` or `.json`.
    Project,
    /// `.csv`.
    BedTable,
}

impl FileKind {
    /// The kind of a path by its extension (case-insensitive).
    pub fn of(path: &Path) -> Option<FileKind> {
        let ext = path.extension()?.to_str()?.to_ascii_lowercase();
        match ext.as_str() {
            "aggrade" | "json" => Some(FileKind::Project),
            "csv" => Some(FileKind::BedTable),
            _ => None,
        }
    }
}

/// Read at most [`MAX_FILE_BYTES`] of a file as UTF-8 text; refuses larger files before reading.
fn read_text(path: &Path) -> Result<String, LoadError> {
    let io_err = |error| LoadError::Io { path: path.to_path_buf(), error };
    let file = std::fs::File::open(path).map_err(io_err)?;
    let size = file.metadata().map_err(io_err)?.len();
    if size > MAX_FILE_BYTES {
        return Err(LoadError::TooLarge {
            path: path.to_path_buf(),
            size_bytes: size,
            limit_bytes: MAX_FILE_BYTES,
        });
    }
    let mut bytes = Vec::with_capacity(size as usize);
    // The size may change under us (or be unknown for special files): never read past the limit.
    file.take(MAX_FILE_BYTES + 1).read_to_end(&mut bytes).map_err(io_err)?;
    if bytes.len() as u64 > MAX_FILE_BYTES {
        return Err(LoadError::TooLarge {
            path: path.to_path_buf(),
            size_bytes: bytes.len() as u64,
            limit_bytes: MAX_FILE_BYTES,
        });
    }
    String::from_utf8(bytes).map_err(|e| {
        let valid = e.utf8_error().valid_up_to();
        let bytes = e.as_bytes();
        let line = 1 + bytes[..valid].iter().filter(|&&b| b == b'\n').count();
        // Column in characters, as an editor shows it (the line up to the bad byte is UTF-8).
        let line_start = bytes[..valid].iter().rposition(|&b| b == b'\n').map_or(0, |i| i + 1);
        let column = 1 + String::from_utf8_lossy(&bytes[line_start..valid]).chars().count();
        LoadError::Invalid {
            path: path.to_path_buf(),
            problems: vec![Problem::new(
                "",
                format!(
                    "not UTF-8 text: invalid byte 0x{:02X} at column {column}; save the file as UTF-8",
                    bytes.get(valid).copied().unwrap_or(0)
                ),
            )
            .at_line(line)],
        }
    })
}

/// Read a project file (`.aggrade`, `.json`) or a bed-table CSV (`.csv`, one section named after
/// the file stem), chosen by extension. Everything is validated; every problem is reported.
pub fn load(path: &Path) -> Result<Loaded, LoadError> {
    let kind = FileKind::of(path).ok_or_else(|| LoadError::UnknownKind { path: path.to_path_buf() })?;
    let text = read_text(path)?;
    let invalid = |problems| LoadError::Invalid { path: path.to_path_buf(), problems };
    let in_file = |problems: Vec<Problem>| {
        problems.into_iter().map(|problem| Warning { path: path.to_path_buf(), problem }).collect()
    };
    match kind {
        FileKind::Project => {
            let read = read_project_text(&text).map_err(invalid)?;
            Ok(Loaded { project: read.project, warnings: in_file(read.warnings) })
        }
        FileKind::BedTable => {
            let stem = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
            let read = read_bed_table(&text, &stem).map_err(invalid)?;
            Ok(Loaded { project: Project::new(vec![read.section]), warnings: in_file(read.warnings) })
        }
    }
}

/// Save a project atomically as pretty JSON (see [`write_atomic`]); the previous file is kept as
/// `NAME.bak`. A project that breaks a validation rule is not written (it would not load again).
pub fn save_project(path: &Path, project: &Project) -> Result<(), SaveError> {
    let problems = validate_project(project);
    if !problems.is_empty() {
        return Err(SaveError::Invalid { path: path.to_path_buf(), problems });
    }
    let encode_err = |error| SaveError::Encode { path: path.to_path_buf(), error };
    let mut text = project_to_json(project).map_err(encode_err)?;
    // A file over the read limit would save but never open again: write compact JSON instead
    // (about 0.55 of the pretty size for bed lists), and refuse when even that is too large.
    if text.len() as u64 > MAX_FILE_BYTES {
        text = serde_json::to_string(project).map_err(encode_err)?;
        text.push('\n');
        if text.len() as u64 > MAX_FILE_BYTES {
            return Err(SaveError::Invalid {
                path: path.to_path_buf(),
                problems: vec![Problem::new(
                    "",
                    format!(
                        "the file would be {} bytes, more than the {MAX_FILE_BYTES} bytes a project file may \
                         have, so it could not be opened again; move some sections to another project",
                        text.len()
                    ),
                )],
            });
        }
    }
    write_bytes_atomic(path, text.as_bytes())
}
