//! What can go wrong when the window writes a file, kept typed until a dialog or the status
//! bar puts it into words; and what a successful write reports.
//!
//! Each message prints its cause rather than chaining it, so it is shown once.

use aggrade_core::analysis::bodies::CsvWriteError;
use aggrade_core::io::SaveError;
use std::fmt;
use std::path::PathBuf;

/// A file the window writes (a column or panel export, a CSV table) was not written.
#[derive(Debug, thiserror::Error)]
pub enum WriteError {
    /// An SVG or PNG of page 1 was asked for, and there is no page.
    #[error("nothing to export: the section has no beds")]
    NothingToExport,
    /// The PNG could not be drawn or encoded (resolution, size or encoder).
    #[error(transparent)]
    Png(#[from] aggrade_core::export::PngError),
    /// The table could not be put into CSV.
    #[error(transparent)]
    Csv(#[from] CsvWriteError),
    /// The core's atomic writer refused or failed (its message names the file).
    #[error(transparent)]
    Save(#[from] SaveError),
    /// The core's atomic writer failed; the message names the file first.
    #[error("{}: {error}", path.display())]
    At { path: PathBuf, error: SaveError },
}

/// What an export wrote, for the status line.
#[derive(Debug, Clone, PartialEq)]
pub enum Written {
    /// The interpreted column: pages at a scale.
    Column { pages: usize, scale: String, path: PathBuf },
    /// The correlation panel: its columns and page size.
    Panel { columns: usize, width_mm: f64, height_mm: f64, path: PathBuf },
    /// A CSV table of the channel-body view (`what` says which).
    Table { what: String, path: PathBuf },
}

impl fmt::Display for Written {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Written::Column { pages, scale, path } => {
                write!(f, "Exported {pages} page(s) at {scale} to {}", path.display())
            }
            Written::Panel { columns, width_mm, height_mm, path } => write!(
                f,
                "Exported the correlation panel ({columns} columns, {width_mm:.0} × {height_mm:.0} mm) to {}",
                path.display()
            ),
            Written::Table { what, path } => write!(f, "Wrote {what} to {}", path.display()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn status_lines_read_as_before() {
        let path = PathBuf::from("/tmp/out.pdf");
        let column = Written::Column { pages: 3, scale: "1:100".into(), path: path.clone() };
        assert_eq!(column.to_string(), "Exported 3 page(s) at 1:100 to /tmp/out.pdf");
        let panel = Written::Panel { columns: 2, width_mm: 420.4, height_mm: 296.6, path: path.clone() };
        assert_eq!(
            panel.to_string(),
            "Exported the correlation panel (2 columns, 420 × 297 mm) to /tmp/out.pdf"
        );
        let table = Written::Table { what: "the proportion curve".into(), path };
        assert_eq!(table.to_string(), "Wrote the proportion curve to /tmp/out.pdf");
        assert_eq!(WriteError::NothingToExport.to_string(), "nothing to export: the section has no beds");
    }
}
