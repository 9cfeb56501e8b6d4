//! `AggradeApp`: the window. Panels draw from the document and queue actions; every edit is
//! applied here, in one place, where undo, dirty tracking and autosave hook in.

use super::actions::Actions;
use super::canvas::{self, Canvas};
use super::chooser::{Chooser, FileKind, PickFor};
use super::curve_dialog::{self, CurveDialog};
use super::document::{Document, Edit};
use super::engine::{self, LayoutOptions, RuleParams, Strip};
use super::export_dialog::ExportDialog;
use super::files::{self, DiskState, FileDialogs, SaveKind};
use super::import_dialog::{self, ImportDialog};
use super::inspector::Inspector;
use super::painter::ItemIndex;
use super::recovery::{self, Autosaver, FoundBackup};
use super::table::BedTable;
use super::trace::{self as trace_view, TraceView};
use super::views_common::Views;
use super::{demo, plots, review, theme};
use aggrade_core::model::{LengthUnit, Project, Section};
use aggrade_core::rules::Interpretation;
use egui::{Key, KeyboardShortcut, Modifiers};
use std::path::{Path, PathBuf};

/// How the window starts.
pub struct AppConfig {
    /// File to open (the demo section when `None`).
    pub file: Option<PathBuf>,
    /// Where the recovery file is kept.
    pub data_dir: PathBuf,
    /// File pickers (the system's, or scripted in tests).
    pub dialogs: Box<dyn FileDialogs>,
    /// Recently opened files (from the window's saved state).
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

/// The project file changed on disk since the window read or wrote it; saving waits for an answer.
#[derive(Debug, Clone, PartialEq)]
struct DiskPrompt {
    path: PathBuf,
    state: DiskState,
}

/// Something that discards unsaved work and therefore asks first.
#[derive(Debug, Clone, PartialEq)]
enum Pending {
    New,
    Open(PathBuf),
    Quit,
}

/// Menu commands and their shortcuts: one list drives both.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Command {
    New,
    Open,
    ImportCsv,
    Save,
    SaveAs,
    Export,
    Quit,
    Undo,
    Redo,
    ZoomIn,
    ZoomOut,
    PanelView,
    StatsView,
    BodiesView,
}

impl Command {
    /// The keyboard shortcut, if any.
    pub fn shortcut(self) -> Option<KeyboardShortcut> {
        let c = Modifiers::COMMAND;
        let cs = Modifiers::COMMAND | Modifiers::SHIFT;
        Some(match self {
            Command::New => KeyboardShortcut::new(c, Key::N),
            Command::Open => KeyboardShortcut::new(c, Key::O),
            Command::Save => KeyboardShortcut::new(c, Key::S),
            Command::SaveAs => KeyboardShortcut::new(cs, Key::S),
            Command::Export => KeyboardShortcut::new(c, Key::E),
            Command::Quit => KeyboardShortcut::new(c, Key::Q),
            Command::Redo => KeyboardShortcut::new(cs, Key::Z),
            Command::Undo => KeyboardShortcut::new(c, Key::Z),
            Command::PanelView => KeyboardShortcut::new(cs, Key::P),
            Command::StatsView => KeyboardShortcut::new(cs, Key::T),
            Command::BodiesView => KeyboardShortcut::new(cs, Key::B),
            Command::ImportCsv | Command::ZoomIn | Command::ZoomOut => return None,
        })
    }
    /// Shortcuts in the order they must be tested (Ctrl+Shift+Z before Ctrl+Z).
    const WITH_SHORTCUTS: [Command; 11] = [
        Command::PanelView,
        Command::StatsView,
        Command::BodiesView,
        Command::SaveAs,
        Command::Redo,
        Command::New,
        Command::Open,
        Command::Save,
        Command::Export,
        Command::Quit,
        Command::Undo,
    ];
}

/// Sections with at least this many beds have their rules and layout re-run on a worker thread
/// after an edit, so that the frame never waits for them (about 3 ms at 5,000 beds); the column
/// drawn meanwhile is the one from before the edit, for a frame or two. Shorter sections, whose
/// rules take well under a millisecond, are brought up to date within the frame.
pub const BACKGROUND_RULES_MIN_BEDS: usize = 2_000;

/// What an interpretation was computed from: document revision, section, rule parameters.
type RulesKey = (u64, usize, RuleParams);

/// Rules and layout running on a worker thread for one state of the document.
struct Refreshing {
    rules_key: RulesKey,
    result: std::sync::mpsc::Receiver<Cache>,
}

struct Cache {
    /// What the interpretation was computed from: document revision, section, rule parameters.
    rules_key: RulesKey,
    interp: Interpretation,
    /// What the strip was laid out from, besides the interpretation.
    layout_key: LayoutOptions,
    strip: Strip,
    /// The heights (m) the strip holds items for; `None` = the whole section.
    window_m: Option<(f64, f64)>,
    index: ItemIndex,
}

impl Cache {
    /// Lay out an interpretation of `section` for the heights `window_m` (all when `None`) and
    /// index the items for drawing.
    fn build(
        section: &Section,
        interp: Interpretation,
        rules_key: RulesKey,
        layout: &LayoutOptions,
        window_m: Option<(f64, f64)>,
    ) -> Cache {
        let strip = engine::column_strip_window(section, &interp, layout, window_m);
        let index = ItemIndex::build(&strip.items, strip.height_mm);
        Cache { rules_key, interp, layout_key: layout.clone(), strip, window_m, index }
    }

    /// Does the laid-out window hold every height in the canvas's view (strip y, mm)?
    fn covers(&self, view_y_mm: Option<(f64, f64)>) -> bool {
        match (self.window_m, view_y_mm) {
            (None, _) | (_, None) => true,
            (Some((lo, hi)), Some((y0, y1))) => {
                let h = &self.strip.heights;
                let (top, base) = (h.height_m(y0), h.height_m(y1));
                base >= lo - 1e-9 && top <= hi + 1e-9
            }
        }
    }

    /// Heights to lay out for a view: the view and one view's height above and below it, so
    /// scrolling rebuilds the layout only now and then; `None` when that is the whole section.
    fn window_for(&self, view_y_mm: Option<(f64, f64)>, total_m: f64) -> Option<(f64, f64)> {
        let (y0, y1) = view_y_mm?;
        let h = &self.strip.heights;
        let span_mm = (y1 - y0).max(1.0);
        let hi = h.height_m(y0 - span_mm);
        let lo = h.height_m(y1 + span_mm);
        (lo > 0.0 || hi < total_m).then_some((lo, hi))
    }
}

/// Drop a large value on a short-lived thread (or here, if no thread can be had).
pub(crate) fn drop_elsewhere<T: Send + 'static>(value: T) {
    let _ = std::thread::Builder::new().name("aggrade-drop".into()).spawn(move || drop(value));
}

/// The window's state.
pub struct AggradeApp {
    pub doc: Document,
    pub params: RuleParams,
    pub layout: LayoutOptions,
    pub tab: Tab,
    pub recent: Vec<PathBuf>,
    /// A message in a dialog.
    pub message: Option<Notice>,
    /// Last status line.
    pub status: String,
    /// The correlation panel, statistics and channel-body windows.
    pub views: Views,
    canvas: Canvas,
    table: BedTable,
    inspector: Inspector,
    export: Option<ExportDialog>,
    curve_dialog: Option<CurveDialog>,
    /// The trace window and what it was last checked against (project file, section, image).
    trace: Option<TraceView>,
    trace_checked: Option<(Option<PathBuf>, usize, Option<String>)>,
    import_dialog: Option<ImportDialog>,
    /// Aggrade's data folder (backups, the import mapping last used).
    data_dir: PathBuf,
    cache: Option<Cache>,
    /// The worker bringing `cache` up to date after an edit of a long section, if one runs.
    refreshing: Option<Refreshing>,
    /// Asked to draw again when a worker's result is ready.
    repaint: Option<egui::Context>,
    chooser: Chooser,
    autosaver: Autosaver,
    /// Backups of windows that did not close normally, offered back.
    found_backups: Vec<FoundBackup>,
    confirm: Option<Pending>,
    /// A save waits for the answer to "the file changed on disk".
    disk_prompt: Option<DiskPrompt>,
    /// What to do once the project is saved (a quit or open that asked "Save changes?").
    after_save: Option<Pending>,
    allow_close: bool,
    last_title: String,
    styled: bool,
}

impl AggradeApp {
    /// Build the window state: open the file (or the demo) and look for work left by a crash.
    pub fn new(config: AppConfig) -> Self {
        let mut message = None;
        let mut status = String::from("Ready");
        let mut recent = config.recent;
        let demo_doc = || {
            let mut doc = match demo::demo_file().map(|p| files::open(&p)) {
                Some(Ok((project, _))) => Document::new(project, None),
                _ => Document::new(demo::demo_project(), None),
            };
            doc.demo = true;
            doc
        };
        let file = config.file.as_deref().map(absolute);
        let doc = match &file {
            Some(path) => match files::open(path) {
                Ok((project, warnings)) => {
                    if !warnings.is_empty() {
                        message = Some(Notice::about_file("Opened with warnings", warnings.join("\n"), path));
                    }
                    status = format!("Opened {}", path.display());
                    files::push_recent(&mut recent, path);
                    let mut doc = Document::new(project, is_project_file(path).then(|| path.clone()));
                    doc.disk = files::DiskStamp::read(path).ok().flatten();
                    doc
                }
                Err(e) => {
                    message = Some(Notice::about_file("Could not open the file", e, path));
                    demo_doc()
                }
            },
            None => demo_doc(),
        };
        let found_backups = recovery::find_backups(&config.data_dir);
        let mut autosaver = Autosaver::new(&config.data_dir);
        autosaver.follow(&doc);
        let mut chooser = Chooser::new(config.dialogs);
        chooser.start_dir = doc.path.as_ref().and_then(|p| p.parent()).map(Path::to_path_buf);
        AggradeApp {
            doc,
            params: RuleParams::default(),
            layout: LayoutOptions::default(),
            tab: Tab::Review,
            recent,
            message,
            status,
            views: Views::default(),
            canvas: Canvas::default(),
            table: BedTable::default(),
            inspector: Inspector::default(),
            export: None,
            curve_dialog: None,
            trace: None,
            trace_checked: None,
            import_dialog: None,
            data_dir: config.data_dir.clone(),
            cache: None,
            refreshing: None,
            repaint: None,
            chooser,
            autosaver,
            found_backups,
            confirm: None,
            disk_prompt: None,
            after_save: None,
            allow_close: false,
            last_title: String::new(),
            styled: false,
        }
    }

    /// The current interpretation (computed on demand; waits for a worker if one is running).
    pub fn interpretation(&mut self) -> &Interpretation {
        self.settle();
        &self.cache.as_ref().expect("refreshed above").interp
    }

    /// True while the column drawn is from before the last edit (a worker is bringing it up
    /// to date).
    pub fn column_pending(&self) -> bool {
        self.refreshing.is_some()
    }

    /// The document revision the column on screen was computed from (`None` before the first
    /// frame); behind [`Document::revision`] while a worker runs.
    pub fn column_revision(&self) -> Option<u64> {
        self.cache.as_ref().map(|c| c.rules_key.0)
    }

    /// Is a recovery offer showing?
    pub fn recovery_pending(&self) -> bool {
        !self.found_backups.is_empty()
    }

    /// The backups offered back (one line each: the file, when, what it holds).
    pub fn offered_backups(&self) -> Vec<String> {
        self.found_backups.iter().map(FoundBackup::describe).collect()
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
        self.disk_prompt.is_some()
    }

    /// Screen position of the middle of a bed's top boundary in the last frame drawn.
    pub fn bed_top_on_screen(&self, bed: aggrade_core::model::BedId) -> Option<egui::Pos2> {
        let t = self.canvas.last_transform?;
        let i = self.doc.bed_index(bed)?;
        let b = self.cache.as_ref()?.strip.bed_boxes.iter().find(|b| b.bed_index == i)?;
        Some(t.pos(b.rect.x + b.rect.w / 2.0, b.rect.y))
    }

    /// Screen rectangle of a bed's box in the last frame drawn.
    pub fn bed_rect_on_screen(&self, bed: aggrade_core::model::BedId) -> Option<egui::Rect> {
        let t = self.canvas.last_transform?;
        let i = self.doc.bed_index(bed)?;
        let b = self.cache.as_ref()?.strip.bed_boxes.iter().find(|b| b.bed_index == i)?;
        Some(egui::Rect::from_min_max(
            t.pos(b.rect.x, b.rect.y),
            t.pos(b.rect.x + b.rect.w, b.rect.y + b.rect.h),
        ))
    }

    /// Screen x of the middle of a Wentworth class on the column's grain-size scale.
    pub fn class_x_on_screen(&self, class: aggrade_core::model::WentworthClass) -> Option<f32> {
        let t = self.canvas.last_transform?;
        Some(t.pos(self.cache.as_ref()?.strip.grain_scale.class_centre_x_mm(class), 0.0).x)
    }

    /// Screen points per metre of section in the canvas.
    pub fn points_per_m(&self) -> Option<f32> {
        let c = self.cache.as_ref()?;
        Some(self.canvas.zoom * c.strip.heights.mm_per_m() as f32)
    }

    /// Rows of the bed table shown in the last frame (0 = the top bed).
    pub fn table_rows_shown(&self) -> std::ops::Range<usize> {
        self.table.rows_shown()
    }

    /// Items drawn in the last frame, and items in the laid-out part of the column.
    pub fn drawn_items(&self) -> (usize, usize) {
        (self.canvas.last_drawn_items, self.cache.as_ref().map(|c| c.strip.items.len()).unwrap_or(0))
    }

    /// Bring a height into view in the canvas.
    pub fn scroll_canvas_to(&mut self, height_m: f64) {
        self.canvas.scroll_to_height(height_m);
    }

    /// This window's backup file.
    pub fn recovery_path(&self) -> PathBuf {
        self.autosaver.path()
    }

    /// Bring the interpretation and the laid-out column up to date: the rules re-run when the
    /// section or the parameters changed; the layout is rebuilt for the heights around the view
    /// (a long section is never laid out whole while editing or scrolling). After an edit of a
    /// long section the rules run on a worker and the column from before stays on screen until
    /// the worker is done ([`BACKGROUND_RULES_MIN_BEDS`]).
    fn refresh(&mut self) {
        self.collect_worker(false);
        let rules_key = (self.doc.revision, self.doc.selected_section, self.params.clone());
        let view = self.canvas.view_y_mm();
        let section = self.doc.section();
        let total_m = section.total_thickness_m();
        let (interp, window_m) = match self.cache.take() {
            Some(c) if c.rules_key == rules_key => {
                let w = c.window_for(view, total_m);
                // The first layout (before the view was known) is of the whole section: once
                // the view is known, a long section is laid out around it instead.
                let narrower = c.window_m.is_none() && w.is_some();
                if c.layout_key == self.layout && c.covers(view) && !narrower {
                    self.cache = Some(c);
                    return;
                }
                (c.interp, w)
            }
            Some(c) if section.beds.len() >= BACKGROUND_RULES_MIN_BEDS => {
                let w = c.window_for(view, total_m);
                self.cache = Some(c);
                self.start_worker(rules_key, w);
                return;
            }
            old => {
                let w = old.as_ref().and_then(|c| c.window_for(view, total_m));
                (engine::interpret(section, &self.params), w)
            }
        };
        self.cache = Some(Cache::build(section, interp, rules_key, &self.layout, window_m));
    }

    /// Start the rules and layout for the current state on a worker thread, unless one is
    /// running: one worker at a time, and the next starts when it reports, so the edits of a
    /// drag are brought up to date in as few runs as the machine allows.
    fn start_worker(&mut self, rules_key: RulesKey, window_m: Option<(f64, f64)>) {
        if self.refreshing.is_some() {
            return;
        }
        // The worker shares the document's project (an edit puts a new one in its place rather
        // than changing this one), so nothing is copied for it.
        let project = std::sync::Arc::clone(&self.doc.project);
        let selected = self.doc.selected_section.min(project.sections.len().saturating_sub(1));
        let (params, layout) = (self.params.clone(), self.layout.clone());
        let (tx, rx) = std::sync::mpsc::channel();
        let key = rules_key.clone();
        let repaint = self.repaint.clone();
        let spawned = std::thread::Builder::new().name("aggrade-rules".into()).spawn(move || {
            let Some(section) = project.sections.get(selected) else { return };
            let interp = engine::interpret(section, &params);
            // The window may have moved on to another document; then nobody listens.
            let _ = tx.send(Cache::build(section, interp, key, &layout, window_m));
            if let Some(ctx) = repaint {
                ctx.request_repaint();
            }
        });
        // No thread to be had (the system is out of them): bring it up to date in the frame.
        if spawned.is_err() {
            let section = self.doc.section();
            let interp = engine::interpret(section, &self.params);
            self.cache = Some(Cache::build(section, interp, rules_key, &self.layout, window_m));
            return;
        }
        self.refreshing = Some(Refreshing { rules_key, result: rx });
    }

    /// Take the worker's result when it is ready (or wait for it). It replaces the column on
    /// screen even when the document has moved on since, as it is newer than what is shown;
    /// [`AggradeApp::refresh`] then starts the next run.
    fn collect_worker(&mut self, wait: bool) {
        let Some(r) = &self.refreshing else { return };
        let got = if wait {
            r.result.recv().ok()
        } else {
            match r.result.try_recv() {
                Ok(c) => Some(c),
                Err(std::sync::mpsc::TryRecvError::Empty) => return,
                Err(std::sync::mpsc::TryRecvError::Disconnected) => None,
            }
        };
        debug_assert!(got.as_ref().is_none_or(|c| c.rules_key == r.rules_key));
        self.refreshing = None;
        if let Some(c) = got {
            // The column it replaces is dropped on another thread: freeing thousands of beds'
            // worth of items and evidence is work the frame need not wait for.
            let old = self.cache.replace(c);
            drop_elsewhere(old);
        }
    }

    /// Bring everything up to date now, waiting for a worker if one runs (for exports and
    /// scripted use, which must see the current state).
    fn settle(&mut self) {
        loop {
            self.refresh();
            if self.refreshing.is_none() {
                return;
            }
            self.collect_worker(true);
        }
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
        if let Some(sel) = actions.select {
            self.doc.selected_bed = sel;
        }
        if let Some(h) = actions.scroll_to_height_m {
            self.canvas.scroll_to_height(h);
        }
    }

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
            Command::Export => self.export = Some(ExportDialog::default()),
            Command::Quit => ctx.send_viewport_cmd(egui::ViewportCommand::Close),
            Command::Undo => {
                if !self.doc.undo() {
                    self.status = "Nothing to undo".into();
                }
            }
            Command::Redo => {
                if !self.doc.redo() {
                    self.status = "Nothing to redo".into();
                }
            }
            Command::ZoomIn => self.canvas.zoom *= 1.25,
            Command::ZoomOut => self.canvas.zoom /= 1.25,
            Command::PanelView => self.views.panel.open = !self.views.panel.open,
            Command::StatsView => self.views.stats.open = !self.views.stats.open,
            Command::BodiesView => self.views.bodies.open = !self.views.bodies.open,
        }
    }

    fn guard(&mut self, action: Pending, ctx: &egui::Context) {
        if self.doc.dirty || self.inspector.has_unstored_text() {
            self.confirm = Some(action);
        } else {
            self.proceed(action, ctx);
        }
    }

    fn proceed(&mut self, action: Pending, ctx: &egui::Context) {
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
    fn replace_document(&mut self, doc: Document) {
        self.doc = doc;
        if let Some(dir) = self.doc.path.as_ref().and_then(|p| p.parent()) {
            self.chooser.start_dir = Some(dir.to_path_buf());
        }
        self.cache = None;
        // A worker still running for the old document is forgotten; its result goes nowhere.
        self.refreshing = None;
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
                files::push_recent(&mut self.recent, path);
                self.status = format!("Opened {}", path.display());
                if self.autosaver.file_open_elsewhere {
                    self.status.push_str(" — it is open in another Aggrade window too; saving asks before overwriting its changes");
                }
                if !warnings.is_empty() {
                    self.message =
                        Some(Notice::about_file("Opened with warnings", warnings.join("\n"), path));
                }
            }
            Err(e) => self.message = Some(Notice::about_file("Could not open the file", e, path)),
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
            Err(e) => self.message = Some(Notice::about_file("Could not import the file", e, path)),
        }
    }

    /// Ask for a spreadsheet or text table and open the import window on it (File ▸ Import…).
    pub fn pick_import_table(&mut self) {
        if let Some(path) = self.chooser.pick(PickFor::ImportTable, FileKind::Table, "") {
            self.open_import_dialog(&path);
        }
    }

    fn open_import_dialog(&mut self, path: &Path) {
        match ImportDialog::open(path, Some(&self.data_dir)) {
            Ok(dlg) => self.import_dialog = Some(dlg),
            Err(e) => self.message = Some(Notice::about_file("Could not read the table", e, path)),
        }
    }

    /// Ask for a LAS file and open the attach window on it; a bad file gives the reader's message.
    pub fn pick_curve(&mut self) {
        if let Some(path) = self.chooser.pick(PickFor::AttachLas, FileKind::Las, "") {
            self.open_curve_dialog(&path);
        }
    }

    /// Ask for a sheet image and open the trace window on it (Section ▸ Trace from image…).
    pub fn pick_trace_image(&mut self) {
        if let Some(path) = self.chooser.pick(PickFor::TraceImage, FileKind::Image, "") {
            self.open_trace_image(&path);
        }
    }

    /// Put the image behind the selected section (keeping its calibration when it is the same
    /// image) and open the trace window; an unreadable image gives the reader's message.
    pub fn open_trace_image(&mut self, path: &Path) {
        match TraceView::open(path) {
            Ok(view) => {
                let stored = match &self.doc.path {
                    Some(project) => aggrade_core::trace::sheet::relative_image_path(project, path),
                    None => path.to_string_lossy().replace('\\', "/"),
                };
                let old = self.doc.section().trace.clone();
                let sheet = old
                    .clone()
                    .filter(|t| t.image == stored)
                    .unwrap_or_else(|| aggrade_core::trace::TraceSheet::new(stored.clone()));
                if old.as_ref() != Some(&sheet) {
                    self.apply(Edit::SetTrace { trace: Some(sheet) });
                }
                self.trace_checked = Some((self.doc.path.clone(), self.doc.selected_section, Some(stored)));
                self.trace = Some(view);
                self.status = format!("Tracing {}: set the height scale, then trace", path.display());
            }
            Err(e) => self.message = Some(Notice::about_file("Could not open the sheet image", e, path)),
        }
    }

    /// Bring the trace window back for a section saved with a sheet (after opening a project or
    /// choosing another section); a missing image is reported and the calibration kept.
    fn restore_trace(&mut self) {
        let stored = self.doc.section().trace.as_ref().map(|t| t.image.clone());
        let key = (self.doc.path.clone(), self.doc.selected_section, stored.clone());
        if self.trace_checked.as_ref() == Some(&key) {
            return;
        }
        self.trace_checked = Some(key);
        let Some(stored) = stored else {
            self.trace = None;
            return;
        };
        let path = aggrade_core::trace::sheet::resolve_image_path(self.doc.path.as_deref(), &stored);
        if self.trace.as_ref().is_some_and(|v| v.image_path == path) {
            return;
        }
        match TraceView::open(&path) {
            Ok(view) => self.trace = Some(view),
            Err(e) => {
                self.trace = None;
                self.status = format!("Sheet image not shown: {e}");
                self.message = Some(Notice::about_file("The traced sheet's image is not shown", e, &path));
            }
        }
    }

    fn open_curve_dialog(&mut self, path: &Path) {
        match CurveDialog::open(path) {
            Ok(dlg) => self.curve_dialog = Some(dlg),
            Err(e) => self.message = Some(Notice::about_file("Could not read the LAS file", e, path)),
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
                    self.disk_prompt = Some(DiskPrompt { path: p, state });
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
    fn save_to(&mut self, mut path: PathBuf) -> bool {
        if path.extension().is_none() {
            path.set_extension("aggrade");
        }
        match files::save(&path, &self.doc.project) {
            Ok(stamp) => {
                self.doc.mark_saved(path.clone());
                self.doc.disk = Some(stamp);
                self.autosaver.clear();
                self.autosaver.follow(&self.doc);
                self.chooser.start_dir = path.parent().map(Path::to_path_buf);
                files::push_recent(&mut self.recent, &path);
                self.status = format!("Saved {}", path.display());
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

    /// The window title: file name with a mark while there are unsaved changes.
    pub fn title(&self) -> String {
        format!("{}{} — Aggrade", if self.doc.dirty { "● " } else { "" }, self.doc.display_name())
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
        self.repaint.get_or_insert_with(|| ctx.clone());
        self.refresh();

        let mut actions = Actions::default();
        self.menu_bar(ui, &ctx, &mut actions);
        self.status_bar(ui);
        self.left_panel(ui, &mut actions);
        self.right_panel(ui, &mut actions);
        egui::CentralPanel::default().frame(egui::Frame::NONE).show(ui, |ui| {
            if let Some(c) = self.cache.as_mut() {
                self.canvas.ui(ui, &self.doc, &c.strip, &mut c.index, &mut actions);
                // Scrolled or zoomed past the laid-out heights: lay out around the new view next frame.
                if !c.covers(self.canvas.view_y_mm()) {
                    ui.ctx().request_repaint();
                }
            }
        });
        self.apply_actions(actions);
        self.views_ui(&ctx);
        self.dialogs_ui(&ctx);

        // Autosave unsaved changes into this window's own backup, with any typed values that did
        // not read; a failure is reported, never fatal.
        self.autosaver.follow(&self.doc);
        self.autosaver.set_unstored(self.inspector.unstored_texts(&self.doc));
        let now = ctx.input(|i| i.time);
        if let Err(e) = self.autosaver.tick(&self.doc, now) {
            self.status = format!("Autosave failed: {e}");
        }
        if self.doc.dirty {
            ctx.request_repaint_after(recovery::AUTOSAVE_INTERVAL);
        }

        // Closing with unsaved changes asks first.
        if ctx.input(|i| i.viewport().close_requested()) && !self.allow_close {
            if self.doc.dirty || self.inspector.has_unstored_text() {
                ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
                self.confirm = Some(Pending::Quit);
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
        if ctx.memory(|m| m.focused().is_none()) && self.confirm.is_none() && self.message.is_none() {
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
                let (id, mid) = (bed.id, self.doc.section().base_heights_m()[i] + bed.thickness_m / 2.0);
                self.doc.selected_bed = Some(id);
                self.canvas.scroll_to_height(mid);
            }
            if let (true, Some(id)) = (del, self.doc.selected_bed) {
                self.apply(Edit::DeleteBed { bed: id });
                self.status = "Bed deleted (Ctrl+Z brings it back)".into();
            }
        }
        for cmd in Command::WITH_SHORTCUTS {
            if let Some(sc) = cmd.shortcut() {
                if ctx.input_mut(|i| i.consume_shortcut(&sc)) {
                    self.run_command(ctx, cmd);
                }
            }
        }
    }

    fn menu_item(
        &mut self,
        ui: &mut egui::Ui,
        ctx: &egui::Context,
        label: &str,
        cmd: Command,
        enabled: bool,
        tip: &str,
    ) {
        let mut b = egui::Button::new(label);
        if let Some(sc) = cmd.shortcut() {
            b = b.shortcut_text(ctx.format_shortcut(&sc));
        } else if cmd == Command::ZoomIn {
            b = b.shortcut_text("+");
        } else if cmd == Command::ZoomOut {
            b = b.shortcut_text("−");
        }
        if ui.add_enabled(enabled, b).on_hover_text(tip).clicked() {
            self.run_command(ctx, cmd);
            ui.close();
        }
    }

    fn menu_bar(&mut self, ui: &mut egui::Ui, ctx: &egui::Context, actions: &mut Actions) {
        egui::Panel::top("menu").show(ui, |ui| {
            egui::MenuBar::new().ui(ui, |ui| {
                ui.menu_button("File", |ui| {
                    self.menu_item(ui, ctx, "New project", Command::New, true, "Start an empty project");
                    self.menu_item(ui, ctx, "Open…", Command::Open, true, "Open a project or bed-table CSV");
                    ui.menu_button("Open recent", |ui| {
                        if self.recent.is_empty() {
                            ui.label("No recent files");
                        }
                        for p in self.recent.clone() {
                            if ui
                                .button(p.display().to_string())
                                .on_hover_text("Open this file again")
                                .clicked()
                            {
                                self.guard(Pending::Open(p), ctx);
                                ui.close();
                            }
                        }
                    });
                    self.menu_item(
                        ui,
                        ctx,
                        "Import bed table (CSV)…",
                        Command::ImportCsv,
                        true,
                        "Add a CSV bed table as a new section",
                    );
                    if ui
                        .button("Import…")
                        .on_hover_text("Add a spreadsheet or text table (CSV, TSV, TXT, XLSX, ODS) as a new section, with a preview")
                        .clicked()
                    {
                        self.pick_import_table();
                        ui.close();
                    }
                    ui.separator();
                    self.menu_item(ui, ctx, "Save", Command::Save, true, "Save the project");
                    self.menu_item(
                        ui,
                        ctx,
                        "Save as…",
                        Command::SaveAs,
                        true,
                        "Save the project under a new name",
                    );
                    self.menu_item(
                        ui,
                        ctx,
                        "Export column…",
                        Command::Export,
                        true,
                        "Print the interpreted column at a true scale",
                    );
                    ui.separator();
                    self.menu_item(
                        ui,
                        ctx,
                        "Quit",
                        Command::Quit,
                        true,
                        "Close Aggrade (asks about unsaved work)",
                    );
                });
                ui.menu_button("Edit", |ui| {
                    let (u, r) = (self.doc.can_undo(), self.doc.can_redo());
                    self.menu_item(ui, ctx, "Undo", Command::Undo, u, "Take back the last change");
                    self.menu_item(ui, ctx, "Redo", Command::Redo, r, "Do the undone change again");
                    ui.separator();
                    ui.label(
                        egui::RichText::new("Selected bed (↑ ↓ to move, Del to delete)")
                            .small()
                            .color(theme::TEXT_DIM),
                    );
                    canvas::bed_menu(ui, &self.doc, self.doc.selected_bed, actions);
                });
                ui.menu_button("View", |ui| {
                    self.menu_item(
                        ui,
                        ctx,
                        "Zoom in",
                        Command::ZoomIn,
                        true,
                        "Enlarge the column (also Ctrl+wheel)",
                    );
                    self.menu_item(
                        ui,
                        ctx,
                        "Zoom out",
                        Command::ZoomOut,
                        true,
                        "Shrink the column (also Ctrl+wheel)",
                    );
                    ui.checkbox(&mut self.layout.show_rejected, "Show rejected boundaries")
                        .on_hover_text("Draw boundaries you rejected, greyed");
                    ui.separator();
                    self.menu_item(
                        ui,
                        ctx,
                        "Correlation panel",
                        Command::PanelView,
                        true,
                        "All sections side by side, hung on a datum, with tie lines",
                    );
                    self.menu_item(
                        ui,
                        ctx,
                        "Statistics",
                        Command::StatsView,
                        true,
                        "Paleocurrents, rose diagram and facies transitions",
                    );
                    self.menu_item(
                        ui,
                        ctx,
                        "Channel bodies",
                        Command::BodiesView,
                        true,
                        "Channel bodies of every section, thickness summary, CSV export",
                    );
                });
                ui.menu_button("Section", |ui| {
                    let names: Vec<String> =
                        self.doc.project.sections.iter().map(|s| s.name.clone()).collect();
                    for (i, n) in names.iter().enumerate() {
                        if ui
                            .radio(self.doc.selected_section == i, n)
                            .on_hover_text("Show this section")
                            .clicked()
                        {
                            self.doc.select_section(i);
                            ui.close();
                        }
                    }
                    ui.separator();
                    if ui
                        .button("Add empty section")
                        .on_hover_text("Start a new section in this project")
                        .clicked()
                    {
                        let mut k = self.doc.project.sections.len() + 1;
                        while self.doc.project.sections.iter().any(|s| s.name == format!("Section {k}")) {
                            k += 1;
                        }
                        self.apply(Edit::AddSection { section: Section::new(format!("Section {k}")) });
                        ui.close();
                    }
                    ui.separator();
                    if ui
                        .button("Trace from image…")
                        .on_hover_text("Put a photographed or scanned field sheet behind the section and trace it by clicking")
                        .clicked()
                    {
                        ui.close();
                        self.pick_trace_image();
                    }
                    if self.doc.section().trace.is_some()
                        && self.trace.is_none()
                        && ui
                            .button("Show the traced sheet")
                            .on_hover_text("Open the trace window again on this section's sheet")
                            .clicked()
                    {
                        // Checked again next frame: the window opens, or the missing image is reported.
                        self.trace_checked = None;
                        ui.close();
                    }
                    if ui
                        .button("Attach measured curve (LAS)…")
                        .on_hover_text("Read a curve such as gamma ray from a LAS 2.0 file and draw it beside the column")
                        .clicked()
                    {
                        ui.close();
                        self.pick_curve();
                    }
                    let attached: Vec<String> = self.doc.section().curves.iter().map(|c| c.mnemonic.clone()).collect();
                    for m in attached {
                        if ui
                            .button(format!("Remove curve {m}"))
                            .on_hover_text("Take this measured curve off the section (Ctrl+Z brings it back)")
                            .clicked()
                        {
                            self.apply(Edit::RemoveCurve { mnemonic: m });
                            ui.close();
                        }
                    }
                });
                ui.separator();
                ui.label(egui::RichText::new(&self.doc.section().name).strong());
                ui.label(
                    egui::RichText::new(format!("{} beds", self.doc.section().beds.len()))
                        .color(theme::TEXT_DIM),
                );
            });
        });
    }

    fn status_bar(&mut self, ui: &mut egui::Ui) {
        egui::Panel::bottom("status").show(ui, |ui| {
            // The caution first, from the right; the status takes the room left, cut short with
            // "…" (whole on hover) rather than written over the caution.
            ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
                ui.label(egui::RichText::new(aggrade_core::REVIEW_CAUTION).small().color(theme::WARN));
                ui.with_layout(egui::Layout::left_to_right(egui::Align::Center), |ui| {
                    ui.add(egui::Label::new(&self.status).truncate()).on_hover_text(&self.status);
                });
            });
        });
    }

    fn left_panel(&mut self, ui: &mut egui::Ui, actions: &mut Actions) {
        egui::Panel::left("beds").resizable(true).default_size(370.0).show(ui, |ui| {
            ui.add_space(4.0);
            self.table.ui(ui, &self.doc, actions);
        });
    }

    fn right_panel(&mut self, ui: &mut egui::Ui, actions: &mut Actions) {
        egui::Panel::right("side").resizable(true).default_size(360.0).show(ui, |ui| {
            ui.add_space(4.0);
            ui.horizontal(|ui| {
                for (t, name, tip) in [
                    (Tab::Inspector, "Bed", "Every field of the selected bed"),
                    (Tab::Review, "Review", "Candidate sequence boundaries and rule settings"),
                    (Tab::Plots, "Plots", "Proportion, grain size and body thickness plots"),
                    (Tab::Section, "Section", "Section details and units"),
                ] {
                    ui.selectable_value(&mut self.tab, t, name).on_hover_text(tip);
                }
            });
            ui.separator();
            let Some(cache) = self.cache.as_ref() else { return };
            match self.tab {
                Tab::Inspector => self.inspector.ui(ui, &self.doc, actions),
                Tab::Review => {
                    egui::CollapsingHeader::new("Rule parameters").show(ui, |ui| {
                        review::params_ui(ui, &mut self.params);
                    });
                    review::ui(ui, &self.doc, &cache.interp, actions);
                }
                Tab::Plots => plots::ui(ui, &self.doc, &cache.interp),
                Tab::Section => section_ui(ui, &self.doc, actions),
            }
        });
    }

    fn views_ui(&mut self, ctx: &egui::Context) {
        let now = std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map(|d| d.as_secs() as i64)
            .unwrap_or(0);
        let out = self.views.ui(ctx, &self.doc, &self.params, &mut self.chooser, now);
        if let Some(s) = out.status {
            self.status = s;
        }
        if let Some((title, text)) = out.error {
            self.message = Some(Notice::new(title, text));
        }
    }

    fn dialogs_ui(&mut self, ctx: &egui::Context) {
        self.recovery_ui(ctx);
        if let Some(action) = self.confirm.clone() {
            egui::Modal::new(egui::Id::unique("confirm")).show(ctx, |ui| {
                ui.heading("Save changes?");
                if self.doc.dirty {
                    ui.label(format!("{} has unsaved changes.", self.doc.display_name()));
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
                        self.confirm = None;
                        // Continues once the save is done; a failed or cancelled save stops it.
                        self.after_save = Some(action.clone());
                        if self.save(false) {
                            self.saved_then(ctx);
                        }
                    }
                    if ui.button("Don't save").on_hover_text("Continue and lose the changes").clicked() {
                        self.confirm = None;
                        self.autosaver.clear();
                        self.proceed(action.clone(), ctx);
                    }
                    if ui.button("Cancel").on_hover_text("Go back to the project").clicked() {
                        self.confirm = None;
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
        if let Some(dlg) = self.import_dialog.as_mut() {
            match dlg.ui(ctx) {
                import_dialog::Outcome::Open => {}
                import_dialog::Outcome::Closed => self.import_dialog = None,
                import_dialog::Outcome::Import { section, note } => {
                    self.import_dialog = None;
                    let mut section = *section;
                    while self.doc.project.sections.iter().any(|x| x.name == section.name) {
                        section.name.push_str(" (imported)");
                    }
                    self.status = format!(
                        "Imported {} ({} beds){}",
                        section.name,
                        section.beds.len(),
                        note.map(|n| format!("; {n}")).unwrap_or_default()
                    );
                    self.apply(Edit::AddSection { section });
                }
            }
        }
        self.restore_trace();
        if let Some(view) = self.trace.as_mut() {
            match view.ui(ctx, self.doc.section()) {
                trace_view::Outcome::Open => {}
                trace_view::Outcome::Closed => self.trace = None,
                trace_view::Outcome::Apply(edit, gesture) => {
                    if let Err(e) = self.doc.apply_in_gesture(*edit, gesture) {
                        view.note = format!("Not changed: {e}");
                    }
                }
            }
        }
        if let Some(dlg) = self.curve_dialog.as_mut() {
            match dlg.ui(ctx, self.doc.section()) {
                curve_dialog::Outcome::Open => {}
                curve_dialog::Outcome::Closed => self.curve_dialog = None,
                curve_dialog::Outcome::Attach(curve) => {
                    self.curve_dialog = None;
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
        if self.export.is_some() {
            // An export prints the current state: never a column from before an edit.
            self.settle();
        }
        if let (Some(dlg), Some(cache)) = (self.export.as_mut(), self.cache.as_ref()) {
            let section = self.doc.section();
            match dlg.ui(ctx, section, self.doc.revision, &cache.interp, &mut self.chooser) {
                super::export_dialog::Outcome::Open => {}
                super::export_dialog::Outcome::Closed => self.export = None,
                super::export_dialog::Outcome::Done(msg) => {
                    self.status = msg;
                    self.export = None;
                }
                super::export_dialog::Outcome::Failed(path, msg) => {
                    self.message = Some(Notice::about_file("Could not export", msg, &path));
                }
            }
        }
    }
}

impl AggradeApp {
    /// The offer of backups left by windows that did not close normally.
    fn recovery_ui(&mut self, ctx: &egui::Context) {
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
    fn disk_prompt_ui(&mut self, ctx: &egui::Context) {
        let Some(prompt) = self.disk_prompt.clone() else { return };
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
        self.disk_prompt = None;
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
    fn take_picks(&mut self, ctx: &egui::Context) {
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
        if self.after_save.is_some() && !self.chooser.in_window_open() && self.disk_prompt.is_none() {
            self.after_save = None;
        }
    }

    /// The project was saved: carry out what waited for it (a quit, a new project, an open).
    fn saved_then(&mut self, ctx: &egui::Context) {
        if let Some(action) = self.after_save.take() {
            self.proceed(action, ctx);
        }
    }
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

/// Show a folder in the system's file manager.
fn open_folder(folder: &Path) -> std::io::Result<()> {
    let program = if cfg!(target_os = "macos") {
        "open"
    } else if cfg!(target_os = "windows") {
        "explorer"
    } else {
        "xdg-open"
    };
    std::process::Command::new(program)
        .arg(folder)
        .stdin(std::process::Stdio::null())
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .map(|_| ())
}

fn section_ui(ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
    let s = doc.section();
    let (mut name, mut locality, mut logged_by, mut notes) =
        (s.name.clone(), s.locality.clone(), s.logged_by.clone(), s.notes.clone());
    let mut changed = false;
    egui::Grid::new("section_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
        ui.label("Name");
        let limit = aggrade_core::io::limits::MAX_STRING_CHARS;
        fn line(text: &mut String, limit: usize) -> egui::TextEdit<'_> {
            egui::TextEdit::singleline(text).char_limit(limit)
        }
        changed |= ui.add(line(&mut name, limit)).on_hover_text("The section's name").changed();
        ui.end_row();
        ui.label("Locality");
        changed |=
            ui.add(line(&mut locality, limit)).on_hover_text("Where the section was measured").changed();
        ui.end_row();
        ui.label("Logged by");
        changed |= ui.add(line(&mut logged_by, limit)).on_hover_text("Who measured it").changed();
        ui.end_row();
        ui.label("Units");
        ui.horizontal(|ui| {
            for u in LengthUnit::ALL {
                if ui
                    .selectable_label(s.display_unit == *u, u.name())
                    .on_hover_text("Show and type thicknesses in this unit")
                    .clicked()
                {
                    out.edit(Edit::SetDisplayUnit { unit: *u });
                }
            }
        });
        ui.end_row();
    });
    ui.label("Notes");
    changed |= ui
        .add(
            egui::TextEdit::multiline(&mut notes)
                .desired_width(f32::INFINITY)
                .char_limit(aggrade_core::io::limits::MAX_STRING_CHARS),
        )
        .on_hover_text("Notes on the section")
        .changed();
    if changed {
        let g = super::actions::gesture_key(("section", doc.selected_section));
        out.edit_in(Edit::SetSectionInfo { name, locality, logged_by, notes }, g);
    }
    ui.separator();
    ui.label(format!(
        "Total thickness {:.2} m · exposed {:.2} m · {} beds",
        s.total_thickness_m(),
        s.exposed_thickness_m(),
        s.beds.len()
    ));
}

/// Used by the canvas menu and exposed for tests.
pub use canvas::new_bed;

impl eframe::App for AggradeApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.ui_main(ui);
    }

    fn save(&mut self, storage: &mut dyn eframe::Storage) {
        if let Ok(json) = serde_json::to_string(&self.recent) {
            storage.set_string("aggrade.recent", json);
        }
    }
}
