//! The window's pop-up dialogs and questions, one at a time: the export, import and curve
//! windows, "Save changes?" and "the file changed on disk"; also the offer of backups and
//! the message dialog, which can show over any of them.

use super::{absolute, AggradeApp, Notice};
use crate::gui::actions::gesture_key;
use crate::gui::chooser::PickFor;
use crate::gui::curve_dialog::{self, CurveDialog};
use crate::gui::document::{Document, Edit};
use crate::gui::export_dialog::{self, ExportDialog};
use crate::gui::files::{self, DiskState};
use crate::gui::import_dialog::{self, ImportDialog};
use crate::gui::section_details;
use crate::gui::theme;
use std::path::{Path, PathBuf};

/// The pop-up dialog or question showing.
pub(super) enum Modal {
    /// "Save changes?" before something that discards unsaved work.
    Confirm(Pending),
    /// A save waits for the answer to "the file changed on disk".
    DiskPrompt(DiskPrompt),
    Export(ExportDialog),
    Curve(CurveDialog),
    Import(ImportDialog),
}

/// The project file changed on disk since the window read or wrote it; saving waits for an answer.
#[derive(Debug, Clone, PartialEq)]
pub(super) struct DiskPrompt {
    pub(super) path: PathBuf,
    pub(super) state: DiskState,
}

/// Something that discards unsaved work and therefore asks first.
#[derive(Debug, Clone, PartialEq)]
pub(super) enum Pending {
    New,
    Open(PathBuf),
    Quit,
}

impl AggradeApp {
    pub(super) fn dialogs_ui(&mut self, ctx: &egui::Context) {
        // First, so that a question asked over it ("Save changes?") shows on top.
        self.section_details_ui(ctx);
        self.recovery_ui(ctx);
        if let Some(Modal::Confirm(action)) = &self.modal {
            let action = action.clone();
            egui::Modal::new(egui::Id::unique("confirm")).show(ctx, |ui| {
                ui.heading("Save changes?");
                if self.doc.dirty {
                    ui.label(self.unsaved_changes_sentence());
                }
                if self.details.as_ref().is_some_and(|d| d.is_changed()) {
                    ui.label(
                        egui::RichText::new(
                            "What was typed in the Section details dialog is not applied yet and is not \
                             saved; Cancel and apply it there to keep it.",
                        )
                        .color(theme::WARN),
                    );
                }
                if self.inspector.has_unstored_text() {
                    ui.label(
                        egui::RichText::new(
                            "Some values typed in the Bed tab do not read and were not stored; \
                             Cancel and fix them there to keep them.",
                        )
                        .color(theme::WARN),
                    );
                }
                ui.horizontal(|ui| {
                    if ui.button("Save").on_hover_text("Save, then continue").clicked() {
                        self.modal = None;
                        // Continues once the save is done; a failed or cancelled save stops it.
                        self.after_save = Some(action.clone());
                        if self.save(false) {
                            self.saved_then(ctx);
                        }
                    }
                    if ui.button("Don't save").on_hover_text("Continue and lose the changes").clicked() {
                        self.modal = None;
                        self.autosaver.clear();
                        self.proceed(action.clone(), ctx);
                    }
                    if ui.button("Cancel").on_hover_text("Go back to the project").clicked() {
                        self.modal = None;
                    }
                });
            });
        }
        self.disk_prompt_ui(ctx);
        if let Some(line) = self.chooser.ui(ctx) {
            self.status = line;
        }
        self.take_picks(ctx);
        if let Some(n) = self.message.clone() {
            egui::Modal::new(egui::Id::unique("message")).show(ctx, |ui| {
                ui.set_max_width(560.0);
                ui.heading(&n.title);
                egui::ScrollArea::vertical().max_height(300.0).show(ui, |ui| {
                    ui.label(&n.text);
                });
                ui.horizontal(|ui| {
                    if ui.button("OK").on_hover_text("Close this message").clicked() {
                        self.message = None;
                    }
                    if let Some(folder) = &n.folder {
                        if ui
                            .button("Open folder")
                            .on_hover_text(format!("Show {} in the file manager", folder.display()))
                            .clicked()
                        {
                            if let Err(e) = open_folder(folder) {
                                self.status = format!(
                                    "No file manager could be started ({e}); the folder is {}",
                                    absolute(folder).display()
                                );
                            }
                        }
                        if ui.button("Copy message").on_hover_text("Copy the whole message").clicked() {
                            ui.ctx().copy_text(n.text.clone());
                        }
                    }
                });
            });
        }
        if let Some(Modal::Import(dlg)) = self.modal.as_mut() {
            match dlg.ui(ctx) {
                import_dialog::Outcome::Open => {}
                import_dialog::Outcome::Closed => self.modal = None,
                import_dialog::Outcome::Import { section, note } => {
                    self.modal = None;
                    let mut section = *section;
                    while self.doc.project.sections.iter().any(|x| x.name == section.name) {
                        section.name.push_str(" (imported)");
                    }
                    self.status = format!(
                        "Imported {} ({}){}",
                        section.name,
                        super::plural(section.beds.len(), "bed", "beds"),
                        note.map(|n| format!("; {n}")).unwrap_or_default()
                    );
                    self.apply(Edit::AddSection { section });
                }
            }
        }
        if let Some(Modal::Curve(dlg)) = self.modal.as_mut() {
            match dlg.ui(ctx, self.doc.section()) {
                curve_dialog::Outcome::Open => {}
                curve_dialog::Outcome::Closed => self.modal = None,
                curve_dialog::Outcome::Attach(curve) => {
                    self.modal = None;
                    let title = curve.title();
                    match self.doc.apply(Edit::AttachCurve { curve }) {
                        Ok(()) => self.status = format!("Attached {title} (Ctrl+Z takes it off)"),
                        Err(e) => {
                            self.message = Some(Notice::new("Could not attach the curve", e.to_string()))
                        }
                    }
                }
            }
        }
        if matches!(self.modal, Some(Modal::Export(_))) {
            // An export prints the current state: never a column from before an edit.
            self.settle();
        }
        if let (Some(Modal::Export(dlg)), Some(cache)) = (self.modal.as_mut(), self.column.current()) {
            let section = self.doc.section();
            match dlg.ui(ctx, section, self.doc.revision, &cache.interp, &mut self.chooser) {
                export_dialog::Outcome::Open => {}
                export_dialog::Outcome::Closed => self.modal = None,
                export_dialog::Outcome::Done(written) => {
                    self.status = written.to_string();
                    self.modal = None;
                }
                export_dialog::Outcome::Failed(path, e) => {
                    self.message = Some(Notice::about_file("Could not export", e.to_string(), &path));
                }
            }
        }
    }

    /// The Section details dialog: applied as one undo step on the section it was opened on;
    /// refused edits leave it open with the reason and the typed texts.
    fn section_details_ui(&mut self, ctx: &egui::Context) {
        let Some(mut dlg) = self.details.take() else { return };
        let others: Vec<&str> = self
            .doc
            .project
            .sections
            .iter()
            .enumerate()
            .filter(|(i, _)| *i != dlg.section)
            .map(|(_, s)| s.name.as_str())
            .collect();
        match dlg.ui(ctx, &others) {
            section_details::Outcome::Open => self.details = Some(dlg),
            section_details::Outcome::Closed => {}
            section_details::Outcome::Apply { section, edits } => match self.apply_together(section, edits) {
                Ok(()) => {
                    self.status = format!(
                        "Section details of {} changed (Ctrl+Z takes the change back)",
                        self.doc.section().name
                    );
                }
                Err(why) => {
                    dlg.refused(why);
                    self.details = Some(dlg);
                }
            },
        }
    }

    /// Apply edits to section `section` as one undo step: all of them, or (one refused) none.
    fn apply_together(&mut self, section: usize, edits: Vec<Edit>) -> Result<(), String> {
        if section >= self.doc.project.sections.len() {
            return Err("the section is no longer in the project (an undo took it away)".into());
        }
        let mut trial = self.doc.clone();
        if trial.selected_section != section {
            trial.select_section(section);
        }
        let gesture = gesture_key(("section details", trial.revision));
        for e in edits {
            trial.apply_in_gesture(e, Some(gesture)).map_err(|e| e.to_string())?;
        }
        trial.end_gesture();
        self.doc = trial;
        Ok(())
    }

    /// The offer of backups left by windows that did not close normally.
    pub(super) fn recovery_ui(&mut self, ctx: &egui::Context) {
        if self.found_backups.is_empty() {
            return;
        }
        let mut restore = None;
        let mut discard = None;
        let mut later = false;
        let restored_one = self.doc.dirty;
        egui::Modal::new(egui::Id::unique("recovery")).show(ctx, |ui| {
            ui.set_max_width(640.0);
            ui.heading("Restore unsaved work?");
            ui.label(
                "Aggrade did not close normally last time, and kept the unsaved work of each window. \
                 Nothing is lost until you discard it here.",
            );
            ui.add_space(6.0);
            for (i, f) in self.found_backups.iter().enumerate() {
                ui.horizontal(|ui| {
                    let readable = f.content.is_ok();
                    if ui
                        .add_enabled(readable && !restored_one, egui::Button::new("Restore"))
                        .on_hover_text("Open this work in this window; save it to keep it")
                        .on_disabled_hover_text(if readable {
                            "This window holds unsaved work already; this backup is kept and offered at the next start"
                        } else {
                            "The backup cannot be read"
                        })
                        .clicked()
                    {
                        restore = Some(i);
                    }
                    if ui.button("Discard").on_hover_text("Delete this backup (no other)").clicked() {
                        discard = Some(i);
                    }
                    ui.label(f.describe());
                });
            }
            ui.add_space(6.0);
            if ui
                .button("Decide later")
                .on_hover_text("Keep every backup listed here; they are offered again at the next start")
                .clicked()
            {
                later = true;
            }
        });
        if let Some(i) = discard {
            let f = self.found_backups.remove(i);
            self.status = format!("Discarded the backup {}", f.describe());
            f.discard();
        }
        if let Some(i) = restore {
            let f = self.found_backups.remove(i);
            if let Ok(rec) = &f.content {
                let path = rec.original_path.as_deref().map(absolute);
                let mut doc = Document::new(rec.project.clone(), path.clone());
                doc.dirty = true;
                doc.revision = rec.revision + 1;
                // Saving compares with the file as the window last knew it. A backup of an older
                // version knows nothing of it: then any file there counts as changed, and saving
                // asks first.
                doc.disk = match (rec.disk, &path) {
                    (Some((len, hash)), _) => Some(files::DiskStamp { len, hash }),
                    (None, Some(_)) => Some(files::DiskStamp { len: u64::MAX, hash: 0 }),
                    (None, None) => None,
                };
                let unstored = rec.unstored.clone();
                self.replace_document(doc);
                self.autosaver.adopt(f, &self.doc);
                self.status = "Restored unsaved work; save to keep it".into();
                // The file the work belongs to is one opened again.
                if let Some(p) = path.as_deref().filter(|p| p.is_file()) {
                    if let Err(e) = self.recent.add(p) {
                        self.status = format!("{}; {e}", self.status);
                    }
                }
                if !unstored.is_empty() {
                    self.message = Some(Notice::new(
                        "Values that were not stored",
                        format!(
                            "These values were typed before the window closed but did not read, so they \
                             were not stored; type them again as they should be:\n{}",
                            unstored.join("\n")
                        ),
                    ));
                }
            }
        }
        if later {
            // Their locks are released: the backups stay and are offered at the next start.
            self.found_backups.clear();
        }
    }

    /// The question asked before saving over a file that changed on disk, or that is gone.
    pub(super) fn disk_prompt_ui(&mut self, ctx: &egui::Context) {
        let Some(Modal::DiskPrompt(prompt)) = &self.modal else { return };
        let prompt = prompt.clone();
        let name = prompt.path.display().to_string();
        let mut choice = None;
        egui::Modal::new(egui::Id::unique("disk_prompt")).show(ctx, |ui| {
            ui.set_max_width(560.0);
            match prompt.state {
                DiskState::Missing => {
                    ui.heading("The file is gone");
                    ui.label(format!(
                        "{name} is no longer there: it was deleted, moved or renamed since you opened or saved it. \
                         Your work is still here."
                    ));
                    ui.horizontal(|ui| {
                        if ui.button("Save it there again").on_hover_text("Write your work at the same place").clicked() {
                            choice = Some("overwrite");
                        }
                        if ui.button("Save as…").on_hover_text("Choose another place").clicked() {
                            choice = Some("save_as");
                        }
                        if ui.button("Cancel").on_hover_text("Do not save now").clicked() {
                            choice = Some("cancel");
                        }
                    });
                }
                _ => {
                    ui.heading("The file changed on disk");
                    let beside = files::sibling_free_path(&prompt.path);
                    ui.label(format!(
                        "{name} was changed since you opened or saved it: by another program, another \
                         Aggrade window or a sync tool. Saving now would replace those changes with yours."
                    ));
                    ui.label(format!(
                        "Keep both leaves it as it is and saves yours beside it as {}.",
                        beside.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default()
                    ));
                    ui.horizontal(|ui| {
                        if ui
                            .button("Keep both")
                            .on_hover_text(format!(
                                "Leave the changed file as it is and save yours beside it as {}",
                                beside.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default()
                            ))
                            .clicked()
                        {
                            choice = Some("keep_both");
                        }
                        if ui.button("Overwrite").on_hover_text("Replace the file on disk with your version").clicked() {
                            choice = Some("overwrite");
                        }
                        if ui.button("Cancel").on_hover_text("Do not save now").clicked() {
                            choice = Some("cancel");
                        }
                    });
                }
            }
        });
        let Some(choice) = choice else { return };
        self.modal = None;
        let saved = match choice {
            "overwrite" => self.save_to(prompt.path),
            "keep_both" => self.save_to(files::sibling_free_path(&prompt.path)),
            "save_as" => self.save(true),
            _ => {
                self.after_save = None;
                self.status = "Not saved".into();
                false
            }
        };
        if saved {
            self.saved_then(ctx);
        }
    }

    /// Deliver what Aggrade's own file chooser picked to what asked for it.
    pub(super) fn take_picks(&mut self, ctx: &egui::Context) {
        if let Some(p) = self.chooser.take(PickFor::Open) {
            self.guard(Pending::Open(p), ctx);
        }
        if let Some(p) = self.chooser.take(PickFor::ImportCsv) {
            self.import(&p);
        }
        if let Some(p) = self.chooser.take(PickFor::ImportTable) {
            self.open_import_dialog(&p);
        }
        if let Some(p) = self.chooser.take(PickFor::AttachLas) {
            self.open_curve_dialog(&p);
        }
        if let Some(p) = self.chooser.take(PickFor::TraceImage) {
            self.open_trace_image(&p);
        }
        if let Some(p) = self.chooser.take(PickFor::SaveProject) {
            if self.save_to(p) {
                self.saved_then(ctx);
            }
        }
        // A save that was waited for and then cancelled in the chooser: nothing follows it.
        if self.after_save.is_some()
            && !self.chooser.in_window_open()
            && !matches!(self.modal, Some(Modal::DiskPrompt(_)))
        {
            self.after_save = None;
        }
    }

    /// The project was saved: carry out what waited for it (a quit, a new project, an open).
    pub(super) fn saved_then(&mut self, ctx: &egui::Context) {
        if let Some(action) = self.after_save.take() {
            self.proceed(action, ctx);
        }
    }
}

/// Show a folder in the system's file manager.
fn open_folder(folder: &Path) -> std::io::Result<()> {
    crate::gui::files::open_with_system(folder)
}
