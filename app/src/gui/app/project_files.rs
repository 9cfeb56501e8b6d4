//! What the File menu and its shortcuts do: new, open, import, save (asking before anything that
//! would lose unsaved work), and the commands of the menus.

use super::modal::{DiskPrompt, Modal, Pending};
use super::{absolute, is_project_file, AggradeApp, Command, Notice};
use crate::gui::canvas::Canvas;
use crate::gui::chooser::{FileKind, PickFor};
use crate::gui::curve_dialog::CurveDialog;
use crate::gui::document::{Document, Edit};
use crate::gui::export_dialog::ExportDialog;
use crate::gui::files::{self, DiskState, SaveKind};
use crate::gui::import_dialog::ImportDialog;
use aggrade_core::model::{Project, Section};
use std::path::{Path, PathBuf};

impl AggradeApp {
    /// Run a menu command or shortcut.
    pub fn run_command(&mut self, ctx: &egui::Context, cmd: Command) {
        match cmd {
            Command::New => self.guard(Pending::New, ctx),
            Command::Open => {
                if let Some(p) = self.chooser.pick(PickFor::Open, FileKind::Open, "") {
                    self.guard(Pending::Open(p), ctx);
                }
            }
            Command::ImportCsv => {
                if let Some(p) = self.chooser.pick(PickFor::ImportCsv, FileKind::Csv, "") {
                    self.import(&p);
                }
            }
            Command::Save => {
                self.save(false);
            }
            Command::SaveAs => {
                self.save(true);
            }
            Command::Export => self.modal = Some(Modal::Export(ExportDialog::default())),
            Command::Quit => ctx.send_viewport_cmd(egui::ViewportCommand::Close),
            Command::Undo => {
                self.status = if self.doc.undo() {
                    "Undid the last change (Ctrl+Shift+Z does it again)".into()
                } else {
                    "Nothing to undo".into()
                };
            }
            Command::Redo => {
                self.status = if self.doc.redo() {
                    "Did the undone change again".into()
                } else {
                    "Nothing to redo".into()
                };
            }
            Command::ZoomIn => self.canvas.zoom *= 1.25,
            Command::ZoomOut => self.canvas.zoom /= 1.25,
            Command::PanelView => self.views.panel.open = !self.views.panel.open,
            Command::StatsView => self.views.stats.open = !self.views.stats.open,
            Command::BodiesView => self.views.bodies.open = !self.views.bodies.open,
            Command::ImportTable => self.pick_import_table(),
            Command::AddSection => {
                let mut k = self.doc.project.sections.len() + 1;
                while self.doc.project.sections.iter().any(|s| s.name == format!("Section {k}")) {
                    k += 1;
                }
                self.apply(Edit::AddSection { section: Section::new(format!("Section {k}")) });
            }
            Command::SectionDetails => self.open_section_details(),
            Command::AttachCurve => self.pick_curve(),
            Command::TraceImage => self.pick_trace_image(),
            Command::ShowTrace => self.show_traced_sheet(),
        }
    }

    pub(super) fn guard(&mut self, action: Pending, ctx: &egui::Context) {
        if self.doc.dirty || self.has_unstored_text() {
            self.modal = Some(Modal::Confirm(action));
        } else {
            self.proceed(action, ctx);
        }
    }

    pub(super) fn proceed(&mut self, action: Pending, ctx: &egui::Context) {
        match action {
            Pending::New => {
                self.replace_document(Document::new(Project::new(vec![Section::new("New section")]), None));
                self.autosaver.clear();
                self.status = "New project".into();
            }
            Pending::Open(p) => self.open_path(&p),
            Pending::Quit => {
                // Saved, or thrown away on purpose: no backup is written again on the way out.
                self.autosaver.discard_and_stop();
                self.allow_close = true;
                ctx.send_viewport_cmd(egui::ViewportCommand::Close);
            }
        }
    }

    /// Put another document in the window. A new document starts its revisions again, so what
    /// was computed and laid out for the old one is dropped here, and the column is fitted anew.
    pub(super) fn replace_document(&mut self, doc: Document) {
        self.doc = doc;
        if let Some(dir) = self.doc.path.as_ref().and_then(|p| p.parent()) {
            self.chooser.start_dir = Some(dir.to_path_buf());
        }
        self.column.clear();
        self.stability = None;
        self.canvas = Canvas::default();
    }

    /// Open a project or bed table, replacing the document; bad files give a dialog.
    pub fn open_path(&mut self, path: &Path) {
        let path = &absolute(path);
        match files::open(path) {
            Ok((project, warnings)) => {
                let mut doc = Document::new(project, is_project_file(path).then(|| path.to_path_buf()));
                doc.disk = files::DiskStamp::read(path).ok().flatten();
                self.autosaver.clear();
                self.replace_document(doc);
                self.autosaver.follow(&self.doc);
                self.status = format!("Opened {}", path.display());
                if let Err(e) = self.recent.add(path) {
                    self.status = format!("{}; {e}", self.status);
                }
                if self.autosaver.file_open_elsewhere {
                    self.status.push_str(" — it is open in another Aggrade window too; saving asks before overwriting its changes");
                }
                if !warnings.is_empty() {
                    self.message =
                        Some(Notice::about_file("Opened with warnings", warnings.join("\n"), path));
                }
            }
            Err(e) => self.message = Some(Notice::about_file("Could not open the file", e.to_string(), path)),
        }
    }

    /// Import a bed table as a new section of the open project.
    pub fn import(&mut self, path: &Path) {
        match files::open(path) {
            Ok((project, warnings)) => {
                for mut s in project.sections {
                    while self.doc.project.sections.iter().any(|x| x.name == s.name) {
                        s.name.push_str(" (imported)");
                    }
                    self.apply(Edit::AddSection { section: s });
                }
                self.status = format!("Imported {}", path.display());
                if !warnings.is_empty() {
                    self.message =
                        Some(Notice::about_file("Imported with warnings", warnings.join("\n"), path));
                }
            }
            Err(e) => {
                self.message = Some(Notice::about_file("Could not import the file", e.to_string(), path))
            }
        }
    }

    /// Ask for a spreadsheet or text table and open the import window on it (File ▸ Import…).
    pub fn pick_import_table(&mut self) {
        if let Some(path) = self.chooser.pick(PickFor::ImportTable, FileKind::Table, "") {
            self.open_import_dialog(&path);
        }
    }

    pub(super) fn open_import_dialog(&mut self, path: &Path) {
        match ImportDialog::open(path, Some(&self.data_dir)) {
            Ok(dlg) => self.modal = Some(Modal::Import(dlg)),
            Err(e) => {
                self.message = Some(Notice::about_file("Could not read the table", e.to_string(), path))
            }
        }
    }

    /// Ask for a LAS file and open the attach window on it; a bad file gives the reader's message.
    pub fn pick_curve(&mut self) {
        if let Some(path) = self.chooser.pick(PickFor::AttachLas, FileKind::Las, "") {
            self.open_curve_dialog(&path);
        }
    }

    pub(super) fn open_curve_dialog(&mut self, path: &Path) {
        match CurveDialog::open(path) {
            Ok(dlg) => self.modal = Some(Modal::Curve(dlg)),
            Err(e) => {
                self.message = Some(Notice::about_file("Could not read the LAS file", e.to_string(), path))
            }
        }
    }

    /// Save (asking where when new or `as_new`). Returns true when written now; false when
    /// nothing was written (cancelled, failed with a message, or waiting for an answer: the
    /// in-window chooser or the question about a file changed on disk finish it later).
    pub fn save(&mut self, as_new: bool) -> bool {
        if let (Some(p), false) = (self.doc.path.clone(), as_new) {
            match files::disk_state(&p, self.doc.disk.as_ref()) {
                DiskState::Unchanged => return self.save_to(p),
                state => {
                    self.modal = Some(Modal::DiskPrompt(DiskPrompt { path: p, state }));
                    return false;
                }
            }
        }
        let name = self.doc.section().name.clone();
        match self.chooser.pick(PickFor::SaveProject, FileKind::Save(SaveKind::Project), &name) {
            Some(p) => self.save_to(p),
            None => {
                if !self.chooser.in_window_open() {
                    // Cancelled: whatever waited for the save waits no more.
                    self.after_save = None;
                }
                false
            }
        }
    }

    /// Write the project to `path` (an extension is added when missing). Returns true when
    /// written; a failure is a message, and the work stays open and unsaved.
    pub(super) fn save_to(&mut self, mut path: PathBuf) -> bool {
        if path.extension().is_none() {
            path.set_extension("aggrade");
        }
        // Sheet images are stored relative to the file written (one chosen before the first
        // save is absolute until then); the document takes the new paths only once written.
        let mut doc = self.doc.clone();
        doc.rebase_trace_images(&absolute(&path));
        match files::save(&path, &doc.project) {
            Ok(stamp) => {
                self.doc = doc;
                self.doc.mark_saved(path.clone());
                self.doc.disk = Some(stamp);
                self.autosaver.clear();
                self.autosaver.follow(&self.doc);
                self.chooser.start_dir = path.parent().map(Path::to_path_buf);
                self.status = format!("Saved {}", path.display());
                if let Err(e) = self.recent.add(&absolute(&path)) {
                    self.status = format!("{}; {e}", self.status);
                }
                if self.inspector.has_unstored_text() {
                    self.status.push_str(
                        "; values typed in the Bed tab that do not read were not stored and are not in the file",
                    );
                }
                true
            }
            Err(e) => {
                self.after_save = None;
                self.status = format!("Not saved: {}", path.display());
                self.message = Some(Notice::about_file(
                    "Could not save",
                    format!("{e}\nYour work is still open and unsaved, and kept in the window's backup."),
                    &path,
                ));
                false
            }
        }
    }
}
