//! The "Import table" window (File ▸ Import…): a spreadsheet or text table written by hand,
//! shown as it will be read — the first rows column by column under the field each column fills,
//! every cell that would be refused marked with the reason — with the mapping editable, and the
//! mapping saved for the next import of a table with the same headers.

use aggrade_core::io::import::{
    self, build_section, find_mapping, guess_mapping, mapping_from_json, mapping_to_json, preview,
    ColumnMapping, DecimalMark, Field, ImportOptions, Source, SourceFormat,
};
use aggrade_core::model::{LengthUnit, Section};
use std::path::{Path, PathBuf};

/// Rows shown in the preview.
pub const PREVIEW_ROWS: usize = 8;

/// File name of the saved mapping in the app's data folder.
pub const SAVED_MAPPING_FILE: &str = "import_mapping.json";

/// What happened in the window this frame.
pub enum Outcome {
    Open,
    Closed,
    /// Add this section (the window has closed); `note` says if the mapping could not be saved.
    Import {
        section: Box<Section>,
        note: Option<String>,
    },
}

/// Window state for one picked table.
#[derive(Debug)]
pub struct ImportDialog {
    path: PathBuf,
    source: Source,
    /// Index of the header row among the table's rows.
    header_row: usize,
    /// The mapping as edited.
    pub mapping: ColumnMapping,
    /// Decimal mark for numbers written as text.
    pub decimal: DecimalMark,
    /// Where the mapping is saved on import (`None`: not saved).
    saved_mapping: Option<PathBuf>,
    /// The importer's message after a refused import.
    pub error: Option<String>,
}

/// Why a table cannot be imported as it stands.
#[derive(Debug, thiserror::Error)]
pub enum TableError {
    /// The reader's own message (file, line or cell).
    #[error(transparent)]
    Read(#[from] import::ImportError),
    /// The file holds no rows.
    #[error("{0}: the table is empty")]
    Empty(String),
    /// The column mapping is not complete (one message per problem).
    #[error("{}", .0.join("; "))]
    Mapping(Vec<String>),
}

/// Why the mapping was not saved for the next import.
#[derive(Debug, thiserror::Error)]
pub enum MappingSaveError {
    /// The data folder could not be made.
    #[error("{}: {error}", dir.display())]
    Folder { dir: PathBuf, error: std::io::Error },
    /// The core's atomic writer failed (its message names the file).
    #[error(transparent)]
    Write(#[from] aggrade_core::io::SaveError),
}

impl ImportDialog {
    /// Read the table; use the mapping saved last time when it fits its headers, else match the
    /// headers. An unreadable file gives the reader's message (file and line).
    pub fn open(path: &Path, data_dir: Option<&Path>) -> Result<Self, TableError> {
        let shown = path.display().to_string();
        let bytes = import::read_limited(path)?;
        let source = import::read_source(&bytes, &shown, &ImportOptions::default())?;
        if source.table.rows.is_empty() {
            return Err(TableError::Empty(shown));
        }
        let saved_mapping = data_dir.map(|d| d.join(SAVED_MAPPING_FILE));
        let saved = saved_mapping
            .as_ref()
            .and_then(|p| std::fs::read_to_string(p).ok())
            .and_then(|t| mapping_from_json(&t).ok());
        let options = ImportOptions { mapping: saved, ..Default::default() };
        let (header_row, mapping) = match find_mapping(&source.table, &options) {
            Ok(found) => found,
            // The saved mapping does not fit: match the headers instead.
            Err(_) => match find_mapping(&source.table, &ImportOptions::default()) {
                Ok(found) => found,
                // Nothing maps: show the first row as headers, for the geologist to map.
                Err(_) => {
                    let headers: Vec<String> =
                        source.table.rows[0].cells.iter().map(import::Cell::text).collect();
                    (0, guess_mapping(&headers, false))
                }
            },
        };
        let decimal = source.format.decimal();
        Ok(ImportDialog {
            path: path.to_path_buf(),
            source,
            header_row,
            mapping,
            decimal,
            saved_mapping,
            error: None,
        })
    }

    /// The section as it would be imported, or every problem (file, line or cell, column).
    pub fn section(&self) -> Result<Section, TableError> {
        let problems = self.mapping.problems();
        if !problems.is_empty() {
            return Err(TableError::Mapping(problems));
        }
        let name = self.path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
        build_section(&self.source.table, self.header_row, &self.mapping, self.decimal, &name)
            .map(|(s, _)| s)
            .map_err(|problems| {
                TableError::Read(import::ImportError { file: self.path.display().to_string(), problems })
            })
    }

    /// Save the mapping for the next import (the error is for the status line).
    fn save_mapping(&self) -> Result<(), MappingSaveError> {
        let Some(path) = &self.saved_mapping else { return Ok(()) };
        if let Some(dir) = path.parent() {
            std::fs::create_dir_all(dir)
                .map_err(|error| MappingSaveError::Folder { dir: dir.to_path_buf(), error })?;
        }
        aggrade_core::io::write_bytes_atomic(path, mapping_to_json(&self.mapping).as_bytes())?;
        Ok(())
    }

    /// The headers of the current header row.
    fn headers(&self) -> Vec<String> {
        self.source
            .table
            .rows
            .get(self.header_row)
            .map(|r| r.cells.iter().map(import::Cell::text).collect())
            .unwrap_or_default()
    }

    /// Draw the window.
    pub fn ui(&mut self, ctx: &egui::Context) -> Outcome {
        let mut outcome = Outcome::Open;
        let mut open = true;
        egui::Window::new("Import table")
            .open(&mut open)
            .collapsible(false)
            .resizable(true)
            .default_width(760.0)
            .show(ctx, |ui| {
                let name =
                    self.path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
                ui.label(format!("{name}: {}", self.source.format.describe()));
                ui.horizontal(|ui| {
                    ui.checkbox(&mut self.mapping.top_first, "Written from the top down").on_hover_text(
                        "The first row is the top bed: rows are turned over; from/to are depths",
                    );
                    let unit_label = ui.label("Heights in");
                    egui::ComboBox::from_id_salt("import_unit")
                        .selected_text(self.mapping.length_unit.name())
                        .show_ui(ui, |ui| {
                            for u in [LengthUnit::Metre, LengthUnit::Centimetre, LengthUnit::Foot] {
                                ui.selectable_value(&mut self.mapping.length_unit, u, u.name());
                            }
                        })
                        .response
                        .labelled_by(unit_label.id);
                    if matches!(self.source.format, SourceFormat::Text(_)) {
                        let dec_label = ui.label("Decimal mark");
                        egui::ComboBox::from_id_salt("import_decimal")
                            .selected_text(self.decimal.describe())
                            .show_ui(ui, |ui| {
                                for d in [DecimalMark::Point, DecimalMark::Comma] {
                                    ui.selectable_value(&mut self.decimal, d, d.describe());
                                }
                            })
                            .response
                            .labelled_by(dec_label.id);
                    }
                    if self.header_row + 1 < self.source.table.rows.len().min(10)
                        && ui
                            .button("Headers one row down")
                            .on_hover_text("The headers are on the next row")
                            .clicked()
                    {
                        self.header_row += 1;
                        self.mapping = guess_mapping(&self.headers(), self.mapping.top_first);
                    }
                });
                let rows =
                    preview(&self.source.table, self.header_row, &self.mapping, self.decimal, PREVIEW_ROWS);
                egui::ScrollArea::both().max_height(320.0).show(ui, |ui| {
                    egui::Grid::new("import_preview").striped(true).spacing([12.0, 4.0]).show(ui, |ui| {
                        ui.label("");
                        for (i, column) in self.mapping.columns.iter_mut().enumerate() {
                            let header = column.header.clone();
                            ui.vertical(|ui| {
                                let label = ui.strong(if header.is_empty() {
                                    format!("column {}", i + 1)
                                } else {
                                    header.clone()
                                });
                                let current = column.field.map_or("not read", Field::name);
                                egui::ComboBox::from_id_salt(("import_field", i))
                                    .selected_text(current)
                                    .show_ui(ui, |ui| {
                                        ui.selectable_value(&mut column.field, None, "not read");
                                        for f in Field::ALL {
                                            ui.selectable_value(&mut column.field, Some(f), f.name());
                                        }
                                    })
                                    .response
                                    .labelled_by(label.id)
                                    .on_hover_text("The bed field this column fills");
                            });
                        }
                        ui.end_row();
                        for (line, cells) in &rows {
                            ui.label(egui::RichText::new(format!("{line}")).color(super::theme::TEXT_DIM))
                                .on_hover_text("Line (or row) in the file");
                            for c in cells {
                                match &c.refused {
                                    None => {
                                        ui.label(&c.shown);
                                    }
                                    Some(why) => {
                                        let shown = if c.shown.is_empty() {
                                            "(empty)".to_string()
                                        } else {
                                            c.shown.clone()
                                        };
                                        ui.label(
                                            egui::RichText::new(format!("✗ {shown}"))
                                                .color(super::theme::WARN),
                                        )
                                        .on_hover_text(format!("Refused: {why}"));
                                    }
                                }
                            }
                            ui.end_row();
                        }
                    });
                });
                let refused: usize =
                    rows.iter().map(|(_, c)| c.iter().filter(|c| c.refused.is_some()).count()).sum();
                if refused > 0 {
                    ui.label(
                        egui::RichText::new(format!(
                            "{refused} cell(s) shown would be refused (marked ✗; hover for the reason)"
                        ))
                        .color(super::theme::WARN),
                    );
                }
                for p in self.mapping.problems() {
                    ui.label(egui::RichText::new(format!("Mapping: {p}")).color(super::theme::WARN));
                }
                if let Some(e) = &self.error {
                    egui::ScrollArea::vertical().id_salt("import_error").max_height(120.0).show(ui, |ui| {
                        ui.label(egui::RichText::new(e).color(super::theme::WARN));
                    });
                }
                ui.horizontal(|ui| {
                    let ready = self.mapping.problems().is_empty();
                    if ui
                        .add_enabled(ready, egui::Button::new("Import"))
                        .on_hover_text("Add the table as a new section; the mapping is kept for next time")
                        .clicked()
                    {
                        // The mapping the geologist made is kept even when a row is refused (the
                        // file gets fixed and imported again); failing to save it does not stop the
                        // import, but the geologist is told.
                        let note =
                            self.save_mapping().err().map(|e| format!("the mapping was not saved: {e}"));
                        match self.section() {
                            Ok(section) => outcome = Outcome::Import { section: Box::new(section), note },
                            Err(e) => self.error = Some(note.map_or(e.to_string(), |n| format!("{e}\n{n}"))),
                        }
                    }
                    if ui.button("Cancel").on_hover_text("Close without importing").clicked() {
                        outcome = Outcome::Closed;
                    }
                });
            });
        if !open {
            return Outcome::Closed;
        }
        outcome
    }
}
