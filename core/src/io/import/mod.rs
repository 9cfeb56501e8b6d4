//! Import: the forgiving door beside the bed-table CSV. Reads tables as geologists write them
//! (CSV/TSV/TXT in any common delimiter, decimal mark and encoding; `.xlsx` and `.ods`
//! workbooks: `text`, `sheet`), matches the headers to bed fields (`mapping`), reads notebook
//! abbreviations (`values`), and builds a section through the bed table's own reader, so every rule of that
//! format still holds. Every refused cell is named by file, line (or sheet and cell) and column;
//! nothing is guessed where a number could come out wrong.
//!
//! ```
//! use aggrade_core::io::import::{import_bytes, ImportOptions};
//! let text = "Thickness (m);Rock type;Grain size\n1,2;sst;fs\n0,5;mdst;si\n";
//! let got = import_bytes(text.as_bytes(), "log.csv", &ImportOptions::default()).unwrap();
//! assert_eq!(got.section.beds.len(), 2);
//! assert_eq!(got.section.beds[0].thickness_m, 1.2);
//! ```

mod build;
mod mapping;
mod sheet;
pub(crate) mod text;
pub(crate) mod values;

pub use build::{build_section, preview, read_cell, PreviewCell};
pub use mapping::{
    field_of_header, fit_saved, fold_header, guess_mapping, mapping_from_json, mapping_to_json,
    ColumnMapping, Field, MappedColumn,
};
pub use sheet::WorkbookKind;
pub use text::{Delimiter, TextEncoding, TextOptions, TextSniffed};
pub use values::{DecimalMark, GrainUnit};

use super::limits::MAX_FILE_BYTES;
use super::Problem;
use crate::model::Section;
use std::io::Read;
use std::path::Path;

/// One cell as read from a table.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell {
    Empty,
    Text(String),
    /// A number stored as a number (workbooks).
    Number(f64),
    /// A cell that cannot be a value (a spreadsheet error, a date), with the reason.
    Bad(String),
}

impl Cell {
    /// The cell as text (numbers in their shortest exact form).
    pub fn text(&self) -> String {
        match self {
            Cell::Empty => String::new(),
            Cell::Text(t) => t.trim().to_string(),
            Cell::Number(v) => format!("{v}"),
            Cell::Bad(_) => String::new(),
        }
    }
}

/// One non-empty row with its 1-based line in the file (or row number in the sheet).
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    pub line: usize,
    pub cells: Vec<Cell>,
}

/// A table as read, before any mapping.
#[derive(Debug, Clone, PartialEq)]
pub struct Table {
    /// The sheet's name for workbooks; `None` for text.
    pub sheet: Option<String>,
    pub rows: Vec<Row>,
}

impl Table {
    /// Where a cell is, for messages: a line and column for text, a sheet and cell for
    /// workbooks. `header` names the column.
    pub fn problem_at(&self, line: usize, col: usize, header: &str, message: impl Into<String>) -> Problem {
        match &self.sheet {
            Some(sheet) => Problem::new(
                format!(
                    "sheet {sheet:?}, cell {}{line} (column {header:?})",
                    sheet::column_letters(col as u32)
                ),
                message,
            ),
            None => Problem::new(format!("column {header:?}"), message).at_line(line),
        }
    }
}

/// How a file's text was read, or that it was a workbook.
#[derive(Debug, Clone, PartialEq)]
pub enum SourceFormat {
    Text(TextSniffed),
    Workbook(WorkbookKind),
}

impl SourceFormat {
    /// One line for the user.
    pub fn describe(&self) -> String {
        match self {
            SourceFormat::Text(s) => format!("text table: {}", s.describe()),
            SourceFormat::Workbook(WorkbookKind::Xlsx) => "Excel workbook (.xlsx)".into(),
            SourceFormat::Workbook(WorkbookKind::Ods) => "OpenDocument spreadsheet (.ods)".into(),
        }
    }

    /// The decimal mark for numbers written as text.
    pub fn decimal(&self) -> DecimalMark {
        match self {
            SourceFormat::Text(s) => s.decimal,
            // Workbooks store numbers as numbers; text cells that look like numbers follow the
            // point unless told otherwise.
            SourceFormat::Workbook(_) => DecimalMark::Point,
        }
    }
}

/// Everything the importer may be told.
#[derive(Debug, Clone, Default)]
pub struct ImportOptions {
    pub text: TextOptions,
    /// Sheet of a workbook (the first when `None`).
    pub sheet: Option<String>,
    /// The log is written from the top down.
    pub top_first: bool,
    /// A saved mapping to use instead of guessing from the headers.
    pub mapping: Option<ColumnMapping>,
    /// Name of the section (the file stem when `None`).
    pub section_name: Option<String>,
}

/// A table read from a file, with how it was read.
#[derive(Debug, Clone)]
pub struct Source {
    pub table: Table,
    pub format: SourceFormat,
}

/// A section imported, with the mapping used and anything worth a look.
#[derive(Debug, Clone)]
pub struct Imported {
    pub section: Section,
    pub mapping: ColumnMapping,
    pub format: SourceFormat,
    /// Index of the header row in the table's rows.
    pub header_row: usize,
    pub warnings: Vec<Problem>,
}

/// Why an import failed: every problem, each naming its place; nothing was written.
#[derive(Debug, Clone, thiserror::Error)]
#[error("{}", message(.file, .problems))]
pub struct ImportError {
    pub file: String,
    pub problems: Vec<Problem>,
}

fn message(file: &str, problems: &[Problem]) -> String {
    let n = problems.len();
    let shown = &problems[..n.min(super::MAX_PROBLEMS_LISTED)];
    let mut out =
        format!("{file}: {n} problem{}:\n{}", if n == 1 { "" } else { "s" }, super::problem::list(shown));
    if n > shown.len() {
        out.push_str(&format!("\n  … and {} more", n - shown.len()));
    }
    out
}

impl ImportError {
    fn one(file: &str, p: Problem) -> Self {
        ImportError { file: file.to_string(), problems: vec![p] }
    }
}

/// The workbook kind of a file name, by extension; `None` for text tables.
pub fn workbook_kind(name: &str) -> Option<WorkbookKind> {
    let ext = Path::new(name).extension()?.to_str()?.to_ascii_lowercase();
    match ext.as_str() {
        "xlsx" | "xlsm" => Some(WorkbookKind::Xlsx),
        "ods" => Some(WorkbookKind::Ods),
        _ => None,
    }
}

/// Read a file's bytes, refusing more than [`MAX_FILE_BYTES`] before reading.
pub fn read_limited(path: &Path) -> Result<Vec<u8>, ImportError> {
    let shown = path.display().to_string();
    let io = |e: std::io::Error| {
        ImportError::one(&shown, Problem::new("", format!("could not read the file: {e}")))
    };
    let file = std::fs::File::open(path).map_err(io)?;
    let size = file.metadata().map_err(io)?.len();
    let too_large = |size: u64| {
        ImportError::one(
            &shown,
            Problem::new("", format!("the file is {size} bytes; at most {MAX_FILE_BYTES} bytes are read")),
        )
    };
    if size > MAX_FILE_BYTES {
        return Err(too_large(size));
    }
    let mut bytes = Vec::with_capacity(size as usize);
    file.take(MAX_FILE_BYTES + 1).read_to_end(&mut bytes).map_err(io)?;
    if bytes.len() as u64 > MAX_FILE_BYTES {
        return Err(too_large(bytes.len() as u64));
    }
    Ok(bytes)
}

/// Read the table in a file's bytes; `name` (the path as shown) gives the kind by extension.
pub fn read_source(bytes: &[u8], name: &str, options: &ImportOptions) -> Result<Source, ImportError> {
    let ext = Path::new(name).extension().and_then(|e| e.to_str()).unwrap_or("").to_ascii_lowercase();
    if ext == "xls" {
        return Err(ImportError::one(
            name,
            Problem::new(
                "",
                "an old binary Excel (.xls) workbook is not read; save it as .xlsx, .ods or CSV",
            ),
        ));
    }
    match workbook_kind(name) {
        Some(kind) => {
            let table = sheet::read_workbook(bytes, kind, options.sheet.as_deref())
                .map_err(|e| ImportError::one(name, Problem::new("", e)))?;
            Ok(Source { table, format: SourceFormat::Workbook(kind) })
        }
        None => {
            let (table, sniffed) =
                text::read_text_table(bytes, &options.text).map_err(|p| ImportError::one(name, p))?;
            Ok(Source { table, format: SourceFormat::Text(sniffed) })
        }
    }
}

/// The header row (the first of the first ten rows that maps) and the mapping: the saved one
/// fitted to it, or one guessed from `HEADER_VARIANTS`. An impossible mapping is an
/// error listing the headers found.
pub fn find_mapping(table: &Table, options: &ImportOptions) -> Result<(usize, ColumnMapping), Problem> {
    let headers_of = |row: &Row| -> Vec<String> { row.cells.iter().map(Cell::text).collect() };
    let mut first_failure: Option<(usize, Vec<String>, Vec<String>)> = None;
    for (i, row) in table.rows.iter().enumerate().take(10) {
        let headers = headers_of(row);
        let attempt = match &options.mapping {
            Some(saved) => fit_saved(saved, &headers).map_err(|e| vec![e]).map(|mut m| {
                m.top_first |= options.top_first;
                m
            }),
            None => Ok(guess_mapping(&headers, options.top_first)),
        };
        let problems = match &attempt {
            Ok(m) => m.problems(),
            Err(e) => e.clone(),
        };
        match attempt {
            Ok(m) if problems.is_empty() => return Ok((i, m)),
            _ => {
                // The row most like a header (the most filled cells) is the one reported.
                let filled = headers.iter().filter(|h| !h.is_empty()).count();
                let best =
                    first_failure.as_ref().map_or(0, |(_, h, _): &(usize, Vec<String>, Vec<String>)| {
                        h.iter().filter(|h| !h.is_empty()).count()
                    });
                if first_failure.is_none() || filled > best {
                    first_failure = Some((row.line, headers, problems));
                }
            }
        }
    }
    let (line, headers, problems) =
        first_failure.unwrap_or((1, Vec::new(), vec!["the table is empty".into()]));
    let mut p = Problem::new(
        "header",
        format!(
            "cannot match the columns to bed fields: {}. Headers found: {}. Name the columns as in docs/import.md \
             (e.g. \"Thickness (m)\", \"Lithology\", \"Grain size\", or \"From\"/\"To\" heights) or give a saved \
             mapping with --mapping",
            problems.join("; "),
            mapping::quoted(&headers)
        ),
    );
    match &table.sheet {
        Some(sheet) => p.location = format!("sheet {sheet:?}, row {line}"),
        None => p = p.at_line(line),
    }
    Err(p)
}

/// Import a table from bytes: read, map, build. `name` is the file as shown in messages (its
/// extension chooses text or workbook, its stem names the section unless given).
pub fn import_bytes(bytes: &[u8], name: &str, options: &ImportOptions) -> Result<Imported, ImportError> {
    let source = read_source(bytes, name, options)?;
    import_source(&source, name, options)
}

/// Import from a table already read (the window reads once and previews).
pub fn import_source(source: &Source, name: &str, options: &ImportOptions) -> Result<Imported, ImportError> {
    let (header_row, mapping) =
        find_mapping(&source.table, options).map_err(|p| ImportError::one(name, p))?;
    let section_name = options.section_name.clone().unwrap_or_else(|| {
        Path::new(name).file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default()
    });
    let decimal = options.text.decimal.unwrap_or_else(|| source.format.decimal());
    let (section, warnings) = build_section(&source.table, header_row, &mapping, decimal, &section_name)
        .map_err(|problems| ImportError { file: name.to_string(), problems })?;
    Ok(Imported { section, mapping, format: source.format.clone(), header_row, warnings })
}

/// Import a file from disk.
pub fn import_file(path: &Path, options: &ImportOptions) -> Result<Imported, ImportError> {
    let bytes = read_limited(path)?;
    import_bytes(&bytes, &path.display().to_string(), options)
}
