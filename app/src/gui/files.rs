//! File dialogs behind a trait (tests inject paths), reading and saving projects, recent files.

use aggrade_core::model::Project;
use std::path::{Path, PathBuf};

/// What a save dialog is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SaveKind {
    Project,
    Pdf,
    Svg,
    /// A table of numbers (CSV).
    Csv,
}

/// The file pickers the window uses.
pub trait FileDialogs {
    /// Pick a project or CSV to open.
    fn pick_open(&mut self) -> Option<PathBuf>;
    /// Pick a bed-table CSV to import.
    fn pick_csv(&mut self) -> Option<PathBuf>;
    /// Pick where to save.
    fn pick_save(&mut self, kind: SaveKind, suggested_name: &str) -> Option<PathBuf>;
    /// Pick a LAS 2.0 log file (a measured curve to attach); scripted dialogs answer as for open.
    fn pick_las(&mut self) -> Option<PathBuf> {
        self.pick_open()
    }
    /// Pick a spreadsheet or text table to import; scripted dialogs answer as for open.
    fn pick_table(&mut self) -> Option<PathBuf> {
        self.pick_open()
    }
}

/// The system's file dialogs (rfd).
#[derive(Debug, Default)]
pub struct SystemDialogs;

impl FileDialogs for SystemDialogs {
    fn pick_open(&mut self) -> Option<PathBuf> {
        rfd::FileDialog::new()
            .add_filter("Aggrade project or bed table", &["aggrade", "json", "csv"])
            .add_filter("All files", &["*"])
            .pick_file()
    }
    fn pick_csv(&mut self) -> Option<PathBuf> {
        rfd::FileDialog::new().add_filter("Bed table (CSV)", &["csv"]).pick_file()
    }
    fn pick_table(&mut self) -> Option<PathBuf> {
        rfd::FileDialog::new()
            .add_filter("Table (CSV, TSV, TXT, XLSX, ODS)", &["csv", "tsv", "txt", "xlsx", "xlsm", "ods"])
            .add_filter("All files", &["*"])
            .pick_file()
    }
    fn pick_las(&mut self) -> Option<PathBuf> {
        rfd::FileDialog::new()
            .add_filter("LAS 2.0 log", &["las", "LAS"])
            .add_filter("All files", &["*"])
            .pick_file()
    }
    fn pick_save(&mut self, kind: SaveKind, suggested_name: &str) -> Option<PathBuf> {
        let (name, ext) = match kind {
            SaveKind::Project => ("Aggrade project", "aggrade"),
            SaveKind::Pdf => ("PDF", "pdf"),
            SaveKind::Svg => ("SVG", "svg"),
            SaveKind::Csv => ("CSV table", "csv"),
        };
        rfd::FileDialog::new()
            .add_filter(name, &[ext])
            .set_file_name(format!("{suggested_name}.{ext}"))
            .save_file()
    }
}

/// Paths handed out in order (for tests and scripted runs).
#[derive(Debug, Default)]
pub struct ScriptedDialogs {
    pub answers: std::collections::VecDeque<Option<PathBuf>>,
}

impl FileDialogs for ScriptedDialogs {
    fn pick_open(&mut self) -> Option<PathBuf> {
        self.answers.pop_front().flatten()
    }
    fn pick_csv(&mut self) -> Option<PathBuf> {
        self.answers.pop_front().flatten()
    }
    fn pick_save(&mut self, _kind: SaveKind, _suggested: &str) -> Option<PathBuf> {
        self.answers.pop_front().flatten()
    }
}

/// Read a project or bed table; the error is the reader's own message, ready for a dialog.
pub fn open(path: &Path) -> Result<(Project, Vec<String>), String> {
    aggrade_core::io::load(path).map(|l| (l.project, l.warnings)).map_err(|e| e.to_string())
}

/// Write a project: a temp file in the same folder, then renamed over the old one, so a failed
/// write never leaves half a file. STAND-IN until the core's `io::save_project` lands.
pub fn save(path: &Path, project: &Project) -> Result<(), String> {
    let json =
        serde_json::to_string_pretty(project).map_err(|e| format!("cannot encode the project: {e}"))?;
    let tmp = path.with_extension("aggrade-tmp");
    std::fs::write(&tmp, json).map_err(|e| format!("{}: cannot write: {e}", tmp.display()))?;
    std::fs::rename(&tmp, path).map_err(|e| format!("{}: cannot write: {e}", path.display()))
}

/// Most recent first, no duplicates, at most 8.
pub fn push_recent(recent: &mut Vec<PathBuf>, path: &Path) {
    recent.retain(|p| p != path);
    recent.insert(0, path.to_path_buf());
    recent.truncate(8);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn recent_list_moves_reopened_files_to_front() {
        let mut r = Vec::new();
        for p in ["a", "b", "c", "a"] {
            push_recent(&mut r, Path::new(p));
        }
        assert_eq!(r, vec![PathBuf::from("a"), PathBuf::from("c"), PathBuf::from("b")]);
        for i in 0..20 {
            push_recent(&mut r, Path::new(&format!("f{i}")));
        }
        assert_eq!(r.len(), 8);
    }

    #[test]
    fn save_then_open_round_trips() {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("x.aggrade");
        let p = crate::gui::demo::demo_project();
        save(&path, &p).expect("saved");
        let (back, warnings) = open(&path).expect("read back");
        assert_eq!(back, p);
        assert!(warnings.is_empty());
    }
}
