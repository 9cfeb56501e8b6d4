//! `AggradeApp`: the window. Panels draw from the document and queue actions; every edit is
//! applied here, in one place, where undo, dirty tracking and autosave hook in. The menu bar
//! and side panels are in `panels`, the commands they run in `commands` and `project_files`,
//! the pop-up dialogs in `modal`, the trace window in `tracing`; the column on screen is kept
//! up to date by `gui::column`.

mod commands;
mod modal;
mod panels;
mod project_files;
mod tracing;

pub use commands::Command;
use modal::{Modal, Pending};
use tracing::Tracing;

use super::actions::Actions;
use super::canvas::Canvas;
use super::chooser::Chooser;
use super::column::{self, Column};
use super::document::{Document, Edit};
use super::engine::{project_rules, LayoutOptions, ProjectRules, RuleParams};
use super::files::{self, FileDialogs};
use super::inspector::Inspector;
use super::recovery::{self, Autosaver, FoundBackup};
use super::section_details::SectionDetails;
use super::stability::Stability;
use super::table::BedTable;
use super::views::Views;
use super::{demo, theme};
use aggrade_core::rules::Interpretation;
use egui::{Key, Modifiers};
use std::path::{Path, PathBuf};

/// How the window starts.
pub struct AppConfig {
    /// File to open (the demo section when `None`).
    pub file: Option<PathBuf>,
    /// Where the recovery file is kept.
    pub data_dir: PathBuf,
    /// File pickers (the system's, or scripted in tests).
    pub dialogs: Box<dyn FileDialogs>,
    /// Recently opened files kept by an older version in the window's saved state: taken into
    /// the Open recent list only while `data_dir` holds none (see `files::RecentFiles`).
    pub recent: Vec<PathBuf>,
}

/// Right-hand panel tabs.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Tab {
    Inspector,
    Review,
    Plots,
    Section,
}

/// A message in a dialog: what happened, and the folder of the file it is about (the dialog
/// offers to open it).
#[derive(Debug, Clone, PartialEq)]
pub struct Notice {
    pub title: String,
    pub text: String,
    pub folder: Option<PathBuf>,
}

impl Notice {
    /// A message about nothing on disk.
    pub fn new(title: impl Into<String>, text: impl Into<String>) -> Self {
        Notice { title: title.into(), text: text.into(), folder: None }
    }

    /// A message about a file: the dialog offers to open its folder.
    pub fn about_file(title: impl Into<String>, text: impl Into<String>, file: &Path) -> Self {
        let folder = file.parent().map(|p| if p.as_os_str().is_empty() { Path::new(".") } else { p });
        Notice { title: title.into(), text: text.into(), folder: folder.map(Path::to_path_buf) }
    }
}

/// The window's state.
pub struct AggradeApp {
    pub doc: Document,
    pub layout: LayoutOptions,
    /// The review list shows every candidate boundary, weak paleosol tops with no evidence too.
    pub all_candidates: bool,
    pub tab: Tab,
    /// File ▸ Open recent (shared with the other windows through the data folder).
    recent: files::RecentFiles,
    /// File ▸ Open recent was shown in the last frame (the list is read again as it opens).
    recent_menu_open: bool,
    /// A message in a dialog.
    pub message: Option<Notice>,
    /// Last status line.
    pub status: String,
    /// The correlation panel, statistics and channel-body windows.
    pub views: Views,
    canvas: Canvas,
    table: BedTable,
    inspector: Inspector,
    /// The pop-up dialog or question showing, if any.
    modal: Option<Modal>,
    /// The Section details dialog, when open (kept apart from `modal`: a question asked over it,
    /// such as "Save changes?", must not close it and lose what was typed).
    details: Option<SectionDetails>,
    /// The trace window (beside the column, not a pop-up).
    tracing: Tracing,
    /// The last stability check, while the document is as it was checked.
    stability: Option<Stability>,
    /// Aggrade's data folder (backups, the import mapping last used).
    data_dir: PathBuf,
    /// The interpretation and laid-out column on screen.
    column: Column,
    chooser: Chooser,
    autosaver: Autosaver,
    /// Backups of windows that did not close normally, offered back.
    found_backups: Vec<FoundBackup>,
    /// What to do once the project is saved (a quit or open that asked "Save changes?").
    after_save: Option<Pending>,
    allow_close: bool,
    last_title: String,
    /// The status message as the status bar last saw it, and the document revision then: the
    /// message stands until the document changes.
    status_shown: Option<(String, u64)>,
    styled: bool,
}

impl AggradeApp {
    /// Build the window state: open the file (or the demo) and look for work left by a crash.
    /// A file that cannot be read leaves its error in a dialog (it names the file, the line and
    /// the field) and the status bar, and the window shows the same demo as a start with no file.
    pub fn new(config: AppConfig) -> Self {
        let mut message = None;
        let mut status = String::from("Ready");
        let mut recent = files::RecentFiles::load(&config.data_dir, config.recent);
        let file = config.file.as_deref().map(absolute);
        let mut start_dir = None;
        let doc = match &file {
            Some(path) => match files::open(path) {
                Ok((project, warnings)) => {
                    if !warnings.is_empty() {
                        message = Some(Notice::about_file("Opened with warnings", warnings.join("\n"), path));
                    }
                    status = format!("Opened {}", path.display());
                    if let Err(e) = recent.add(path) {
                        status = format!("{status}; {e}");
                    }
                    let mut doc = Document::new(project, is_project_file(path).then(|| path.clone()));
                    doc.disk = files::DiskStamp::read(path).ok().flatten();
                    doc
                }
                Err(e) => {
                    message = Some(Notice::about_file(
                        "Could not open the file",
                        format!(
                            "{e}\n\nThe file is left as it is. The window shows {} instead; \
                             correct the file and open it again with File ▸ Open.",
                            demo::DEMO_NAME
                        ),
                        path,
                    ));
                    status = format!("Could not open {}; showing {}", path.display(), demo::DEMO_NAME);
                    start_dir = path.parent().map(Path::to_path_buf);
                    demo_document(&mut message)
                }
            },
            None => demo_document(&mut message),
        };
        let found_backups = recovery::find_backups(&config.data_dir);
        let mut autosaver = Autosaver::new(&config.data_dir);
        autosaver.follow(&doc);
        let mut chooser = Chooser::new(config.dialogs);
        chooser.start_dir = doc.path.as_ref().and_then(|p| p.parent()).map(Path::to_path_buf).or(start_dir);
        AggradeApp {
            doc,
            layout: LayoutOptions::default(),
            all_candidates: false,
            tab: Tab::Review,
            recent,
            recent_menu_open: false,
            message,
            status,
            views: Views::default(),
            canvas: Canvas::default(),
            table: BedTable::with_settings_in(&config.data_dir),
            inspector: Inspector::default(),
            modal: None,
            details: None,
            tracing: Tracing::default(),
            stability: None,
            data_dir: config.data_dir.clone(),
            column: Column::default(),
            chooser,
            autosaver,
            found_backups,
            after_save: None,
            allow_close: false,
            last_title: String::new(),
            status_shown: None,
            styled: false,
        }
    }

    /// The current interpretation (computed on demand; waits for a worker if one is running).
    pub fn interpretation(&mut self) -> &Interpretation {
        let params = self.rules().params;
        let inputs = column_inputs(&self.doc, &params, self.all_candidates, &self.layout, &self.canvas);
        &self.column.settled(&inputs).interp
    }

    /// The rule parameters the window runs with: the project's (see [`ProjectRules`]).
    pub fn rules(&self) -> ProjectRules {
        project_rules(&self.doc.project)
    }

    /// The stability check of the document as it is now, if one was run.
    pub fn stability(&self) -> Option<&Stability> {
        self.stability.as_ref().filter(|s| s.is_for(&self.doc, self.all_candidates))
    }

    /// Run the stability check on the selected section with the project's parameters (on this
    /// thread: some forty runs of the rules).
    pub fn check_stability(&mut self) {
        let params = self.rules().params;
        let s = Stability::check(&self.doc, &params, self.all_candidates);
        self.status = format!(
            "Stability checked: {} of the rules, each with one threshold moved",
            plural(s.runs, "run", "runs")
        );
        self.stability = Some(s);
    }

    /// True while the column drawn is from before the last edit (a worker is bringing it up
    /// to date).
    pub fn column_pending(&self) -> bool {
        self.column.pending()
    }

    /// The document revision the column on screen was computed from (`None` before the first
    /// frame); behind [`Document::revision`] while a worker runs.
    pub fn column_revision(&self) -> Option<u64> {
        self.column.current().map(column::Cache::revision)
    }

    /// Is a recovery offer showing?
    pub fn recovery_pending(&self) -> bool {
        !self.found_backups.is_empty()
    }

    /// The backups offered back (one line each: the file, when, what it holds).
    pub fn offered_backups(&self) -> Vec<String> {
        self.found_backups.iter().map(FoundBackup::describe).collect()
    }

    /// The files under File ▸ Open recent, most recent first.
    pub fn recent_files(&self) -> &[PathBuf] {
        self.recent.list()
    }

    /// The file chooser (tests point Aggrade's own chooser at a folder).
    pub fn chooser_mut(&mut self) -> &mut Chooser {
        &mut self.chooser
    }

    /// Has the window been allowed to close (the work saved or deliberately discarded)?
    pub fn close_allowed(&self) -> bool {
        self.allow_close
    }

    /// Is a question about the file changed on disk showing?
    pub fn disk_prompt_pending(&self) -> bool {
        matches!(self.modal, Some(Modal::DiskPrompt(_)))
    }

    /// Screen position of the middle of a bed's top boundary in the last frame drawn.
    pub fn bed_top_on_screen(&self, bed: aggrade_core::model::BedId) -> Option<egui::Pos2> {
        let t = self.canvas.last_transform?;
        let i = self.doc.bed_index(bed)?;
        let b = self.column.current()?.strip.bed_boxes.iter().find(|b| b.bed_index == i)?;
        Some(t.pos(b.rect.x + b.rect.w / 2.0, b.rect.y))
    }

    /// Screen rectangle of a bed's box in the last frame drawn.
    pub fn bed_rect_on_screen(&self, bed: aggrade_core::model::BedId) -> Option<egui::Rect> {
        let t = self.canvas.last_transform?;
        let i = self.doc.bed_index(bed)?;
        let b = self.column.current()?.strip.bed_boxes.iter().find(|b| b.bed_index == i)?;
        Some(egui::Rect::from_min_max(
            t.pos(b.rect.x, b.rect.y),
            t.pos(b.rect.x + b.rect.w, b.rect.y + b.rect.h),
        ))
    }

    /// Screen x of the middle of a Wentworth class on the column's grain-size scale.
    pub fn class_x_on_screen(&self, class: aggrade_core::model::WentworthClass) -> Option<f32> {
        let t = self.canvas.last_transform?;
        Some(t.pos(self.column.current()?.strip.grain_scale.class_centre_x_mm(class), 0.0).x)
    }

    /// Screen points per metre of section in the canvas.
    pub fn points_per_m(&self) -> Option<f32> {
        let c = self.column.current()?;
        Some(self.canvas.zoom * c.strip.heights.mm_per_m() as f32)
    }

    /// Rows of the bed table shown in the last frame (0 = the top bed).
    pub fn table_rows_shown(&self) -> std::ops::Range<usize> {
        self.table.rows_shown()
    }

    /// Items drawn in the last frame, and items in the laid-out part of the column.
    pub fn drawn_items(&self) -> (usize, usize) {
        (self.canvas.last_drawn_items, self.column.current().map(|c| c.strip.items.len()).unwrap_or(0))
    }

    /// Bring a height into view in the canvas.
    pub fn scroll_canvas_to(&mut self, height_m: f64) {
        self.canvas.scroll_to_height(height_m);
    }

    /// Is the Section details dialog open?
    pub fn section_details_open(&self) -> bool {
        self.details.is_some()
    }

    /// Open the Section details dialog on the section shown (Section ▸ Section details…).
    pub fn open_section_details(&mut self) {
        if self.details.is_none() {
            self.details = Some(SectionDetails::open(self.doc.section(), self.doc.selected_section));
        }
    }

    /// Values typed that were not stored: in the Bed tab (they do not read) or in the Section
    /// details dialog (not applied yet).
    pub fn has_unstored_text(&self) -> bool {
        self.inspector.has_unstored_text() || self.details.as_ref().is_some_and(SectionDetails::is_changed)
    }

    /// One line for each value typed and not stored (kept in the window's backup).
    fn unstored_texts(&self) -> Vec<String> {
        let mut lines = self.table.unstored_lines();
        lines.extend(self.inspector.unstored_texts(&self.doc));
        lines.extend(self.details.iter().flat_map(SectionDetails::unstored_lines));
        lines
    }

    /// This window's backup file.
    pub fn recovery_path(&self) -> PathBuf {
        self.autosaver.path()
    }

    /// Bring the column up to date for this frame (see [`Column::refresh`]).
    fn refresh(&mut self) {
        self.with_column_inputs(Column::refresh);
    }

    /// Bring the column up to date now, waiting for a worker if one runs.
    fn settle(&mut self) {
        self.with_column_inputs(Column::settle);
    }

    /// Hand the column this frame's inputs (the document, the project's rules, the listing
    /// choice, the layout and the view).
    fn with_column_inputs(&mut self, step: impl FnOnce(&mut Column, &column::Inputs<'_>)) {
        let params = self.rules().params;
        let inputs = column_inputs(&self.doc, &params, self.all_candidates, &self.layout, &self.canvas);
        step(&mut self.column, &inputs);
    }

    /// Apply one edit now (used by scripted runs and tests as well as the panels).
    pub fn apply(&mut self, edit: Edit) {
        if let Err(e) = self.doc.apply(edit) {
            self.status = format!("Not changed: {e}");
        }
    }

    fn apply_actions(&mut self, actions: Actions) {
        for (edit, gesture) in actions.edits {
            if let Err(e) = self.doc.apply_in_gesture(edit, gesture) {
                self.status = format!("Not changed: {e}");
            }
        }
        if actions.end_gesture {
            self.doc.end_gesture();
        }
        if actions.check_stability {
            self.check_stability();
        }
        if let Some(sel) = actions.select {
            self.doc.selected_bed = sel;
        }
        if let Some(h) = actions.scroll_to_height_m {
            self.canvas.scroll_to_height(h);
        }
    }

    /// The window title: the file's name (or, before the first save, the sections'), with a
    /// mark while there are unsaved changes.
    pub fn title(&self) -> String {
        let name = match self.file_name() {
            Some(file) => file,
            None if self.doc.demo => {
                format!("Demo project: {} (not saved to a file)", sections_phrase(&self.doc))
            }
            None => format!("{} (not saved to a file)", capitalised(&sections_phrase(&self.doc))),
        };
        format!("{}{name} — Aggrade", if self.doc.dirty { "● " } else { "" })
    }

    /// The sentence of the "Save changes?" question naming what has unsaved changes.
    pub fn unsaved_changes_sentence(&self) -> String {
        let sections = sections_phrase(&self.doc);
        match self.file_name() {
            Some(file) => format!("{file} ({sections}) has unsaved changes."),
            None if self.doc.demo => {
                format!(
                    "The demo project ({sections}) has unsaved changes and has never been saved to a file."
                )
            }
            None => {
                format!("The project with {sections} has unsaved changes and has never been saved to a file.")
            }
        }
    }

    /// What the status bar says: the last message while nothing was changed since it was given;
    /// after an edit, what is true of the document now (its file, and whether it has unsaved
    /// changes).
    pub fn status_line(&self) -> String {
        let fresh = self
            .status_shown
            .as_ref()
            .is_none_or(|(text, rev)| *text != self.status || *rev == self.doc.revision);
        if fresh {
            return self.status.clone();
        }
        let name = self.file_name().unwrap_or_else(|| {
            if self.doc.demo {
                "Demo project".into()
            } else {
                "Not saved to a file yet".into()
            }
        });
        let beds = self.doc.section().beds.len();
        let place = format!("{} ({})", self.doc.section().name, plural(beds, "bed", "beds"));
        if self.doc.dirty {
            format!("{name}: unsaved changes · {place} · Ctrl+S saves")
        } else {
            format!("{name}: no unsaved changes · {place}")
        }
    }

    /// The name of the document's file, if it has one.
    fn file_name(&self) -> Option<String> {
        let path = self.doc.path.as_ref()?;
        Some(
            path.file_name().map_or_else(|| path.display().to_string(), |n| n.to_string_lossy().into_owned()),
        )
    }

    /// Is a dialog open in front of the window (Section details, a question, a notice, an export,
    /// import or curve dialog, the offer of backups)?
    pub fn dialog_open(&self) -> bool {
        self.details.is_some()
            || self.modal.is_some()
            || self.message.is_some()
            || !self.found_backups.is_empty()
    }

    /// Draw the whole window (eframe calls this; tests call it through a harness).
    pub fn ui_main(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        if !self.styled {
            // The first pass only installs fonts and style; drawing starts with the next one.
            theme::apply(&ctx);
            self.styled = true;
            ctx.request_repaint();
            return;
        }
        self.handle_input(&ctx);
        if !self.column.has_waker() {
            let repaint = ctx.clone();
            self.column.set_waker(std::sync::Arc::new(move || repaint.request_repaint()));
        }
        self.refresh();

        let mut actions = Actions::default();
        self.menu_bar(ui, &ctx, &mut actions);
        self.status_bar(ui);
        self.left_panel(ui, &mut actions);
        self.right_panel(ui, &mut actions);
        egui::CentralPanel::default().frame(egui::Frame::NONE).show(ui, |ui| {
            let backdrop =
                self.tracing.view.as_mut().and_then(|v| v.canvas_backdrop(ui.ctx(), self.doc.section()));
            if let Some(c) = self.column.current_mut() {
                self.canvas.ui(ui, &self.doc, c, backdrop.as_ref(), &mut actions);
                // Scrolled or zoomed past the laid-out heights: lay out around the new view next frame.
                if !c.covers(self.canvas.view_y_mm()) {
                    ui.ctx().request_repaint();
                }
            }
        });
        self.apply_actions(actions);
        // A stability check holds for the document as it was checked only.
        if self.stability.is_some() && self.stability().is_none() {
            self.stability = None;
        }
        self.views_ui(&ctx);
        self.trace_ui(&ctx);
        self.dialogs_ui(&ctx);

        // Autosave unsaved changes into this window's own backup, with any typed values that did
        // not read; a failure is reported, never fatal.
        self.autosaver.follow(&self.doc);
        self.autosaver.set_unstored(self.unstored_texts());
        let now = ctx.input(|i| i.time);
        if let Err(e) = self.autosaver.tick(&self.doc, now) {
            self.status = format!("Autosave failed: {e}");
        }
        if self.doc.dirty {
            ctx.request_repaint_after(recovery::AUTOSAVE_INTERVAL);
        }

        // Closing with unsaved changes asks first.
        if ctx.input(|i| i.viewport().close_requested()) && !self.allow_close {
            if self.doc.dirty || self.has_unstored_text() {
                ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
                self.modal = Some(Modal::Confirm(Pending::Quit));
            } else {
                self.autosaver.clear();
            }
        }
        let title = self.title();
        if title != self.last_title {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.last_title = title;
        }
    }

    fn handle_input(&mut self, ctx: &egui::Context) {
        let dropped: Vec<PathBuf> = ctx.input(|i| {
            i.raw
                .dropped_files
                .iter()
                .map(|f| f.path().to_path_buf())
                .filter(|p| !p.as_os_str().is_empty())
                .collect()
        });
        for p in dropped {
            if p.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv")) {
                self.import(&p);
            } else {
                self.guard(Pending::Open(p), ctx);
            }
        }
        // Bed navigation and deletion from the keyboard when no text field has the focus.
        if ctx.memory(|m| m.focused().is_none()) && !self.dialog_open() {
            let (up, down, del) = ctx.input_mut(|i| {
                (
                    i.consume_key(Modifiers::NONE, Key::ArrowUp),
                    i.consume_key(Modifiers::NONE, Key::ArrowDown),
                    i.consume_key(Modifiers::NONE, Key::Delete),
                )
            });
            let n = self.doc.section().beds.len();
            let current = self.doc.selected_bed.and_then(|id| self.doc.bed_index(id));
            let target = match (up, down, current) {
                (true, _, Some(i)) => Some((i + 1).min(n.saturating_sub(1))),
                (_, true, Some(i)) => Some(i.saturating_sub(1)),
                (true, _, None) | (_, true, None) if n > 0 => Some(n - 1),
                _ => None,
            };
            if let Some(i) = target {
                let bed = &self.doc.section().beds[i];
                let (id, mid) = (bed.id, self.doc.heights().base_m[i] + bed.thickness_m / 2.0);
                self.doc.selected_bed = Some(id);
                self.canvas.scroll_to_height(mid);
            }
            if let (true, Some(id)) = (del, self.doc.selected_bed) {
                self.apply(Edit::DeleteBed { bed: id });
                self.status = "Bed deleted (Ctrl+Z brings it back)".into();
            }
        }
        // A dialog in front of the window takes the keyboard: the window's shortcuts wait until
        // it is closed. Otherwise Ctrl+N or Ctrl+O would replace the document under a dialog
        // still holding what was typed for the old one, and Ctrl+Z in one of its fields would
        // undo an edit behind it instead of the typing.
        if self.dialog_open() {
            return;
        }
        for cmd in Command::WITH_SHORTCUTS {
            if let Some(sc) = cmd.shortcut() {
                if ctx.input_mut(|i| i.consume_shortcut(&sc)) {
                    self.run_command(ctx, cmd);
                }
            }
        }
    }
}

/// "3 beds", "1 bed": a count with its noun.
pub(crate) fn plural(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

/// The document's sections named: "section “A”", "sections “A” and “B”", "sections “A”, “B”
/// and 2 more".
fn sections_phrase(doc: &Document) -> String {
    let names: Vec<String> = doc.project.sections.iter().map(|s| format!("“{}”", s.name)).collect();
    match names.as_slice() {
        [] => "no section".into(),
        [one] => format!("section {one}"),
        [a, b] => format!("sections {a} and {b}"),
        [a, b, rest @ ..] => format!("sections {a}, {b} and {} more", rest.len()),
    }
}

/// The text with its first letter in capitals.
fn capitalised(text: &str) -> String {
    let mut c = text.chars();
    c.next().map(|f| f.to_uppercase().chain(c).collect()).unwrap_or_default()
}

/// The demo document (the same at every start that shows it); a demo that does not read (a
/// broken build) gives an empty section and a message saying so.
fn demo_document(message: &mut Option<Notice>) -> Document {
    match demo::demo() {
        Ok(project) => {
            let mut doc = Document::new(project, None);
            doc.demo = true;
            doc
        }
        Err(e) => {
            message.get_or_insert_with(|| Notice::new("The demo could not be shown", e));
            Document::new(aggrade_core::model::Project::new(Vec::new()), None)
        }
    }
}

/// What the column is computed from: the document, the project's rule parameters, the
/// candidate list and layout settings, the view.
fn column_inputs<'a>(
    doc: &'a Document,
    params: &'a RuleParams,
    all_candidates: bool,
    layout: &'a LayoutOptions,
    canvas: &Canvas,
) -> column::Inputs<'a> {
    column::Inputs { doc, params, all_candidates, layout, view_y_mm: canvas.view_y_mm() }
}

/// A path made absolute against the working folder (kept as given if that cannot be had), so
/// that backups and messages name the file wherever Aggrade is started next.
fn absolute(path: &Path) -> PathBuf {
    std::path::absolute(path).unwrap_or_else(|_| path.to_path_buf())
}

/// Is this a project file (as opposed to a bed table read into a new project)?
fn is_project_file(path: &Path) -> bool {
    matches!(aggrade_core::io::FileKind::of(path), Some(aggrade_core::io::FileKind::Project))
}

// The Open recent list is kept in the data folder (see `files::RecentFiles`), not in eframe's
// window state: one window's state would overwrite another's list when both close.
impl eframe::App for AggradeApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.ui_main(ui);
    }
}
