//! Choosing files: the system's dialogs behind a trait (tests script them), and Aggrade's own
//! chooser inside the window when the system's cannot be shown, so that Save, Open and Export
//! always work and never fail without a word.

use std::collections::VecDeque;
use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

/// What a save dialog is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum SaveKind {
    Project,
    Pdf,
    Svg,
    /// A table of numbers (CSV).
    Csv,
    /// A raster image of the column (PNG).
    Png,
}

impl SaveKind {
    /// The file type's name and extension.
    pub fn name_and_extension(self) -> (&'static str, &'static str) {
        match self {
            SaveKind::Project => ("Aggrade project", "aggrade"),
            SaveKind::Pdf => ("PDF", "pdf"),
            SaveKind::Svg => ("SVG", "svg"),
            SaveKind::Png => ("PNG image", "png"),
            SaveKind::Csv => ("CSV table", "csv"),
        }
    }
}

/// The kind of file asked for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum FileKind {
    /// A project or bed-table CSV to open.
    Open,
    /// A bed-table CSV to import.
    Csv,
    /// A LAS log (a measured curve).
    Las,
    /// A spreadsheet or text table to import (CSV, TSV, TXT, XLSX, ODS).
    Table,
    /// A photographed or scanned field sheet to trace (PNG, JPEG).
    Image,
    /// Where to write.
    Save(SaveKind),
}

impl FileKind {
    fn extensions(self) -> &'static [&'static str] {
        match self {
            FileKind::Open => &["aggrade", "json", "csv"],
            FileKind::Csv => &["csv"],
            FileKind::Las => &["las"],
            FileKind::Table => &["csv", "tsv", "txt", "xlsx", "xlsm", "ods"],
            FileKind::Image => &["png", "jpg", "jpeg"],
            FileKind::Save(k) => match k {
                SaveKind::Project => &["aggrade"],
                SaveKind::Pdf => &["pdf"],
                SaveKind::Svg => &["svg"],
                SaveKind::Png => &["png"],
                SaveKind::Csv => &["csv"],
            },
        }
    }

    fn title(self) -> &'static str {
        match self {
            FileKind::Open => "Open a project or bed table",
            FileKind::Csv => "Import a bed table (CSV)",
            FileKind::Las => "Attach a measured curve (LAS)",
            FileKind::Table => "Import a table (CSV, TSV, TXT, XLSX, ODS)",
            FileKind::Image => "Trace a field sheet (PNG, JPEG)",
            FileKind::Save(SaveKind::Project) => "Save the project",
            FileKind::Save(SaveKind::Pdf) => "Export as PDF",
            FileKind::Save(SaveKind::Svg) => "Export as SVG",
            FileKind::Save(SaveKind::Png) => "Export as PNG",
            FileKind::Save(SaveKind::Csv) => "Write a CSV table",
        }
    }
}

/// What a file dialog answered.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Pick {
    Chosen(PathBuf),
    /// The person closed the dialog without choosing.
    Cancelled,
    /// No dialog could be shown; says why.
    Unavailable(String),
}

/// The file pickers the window uses.
pub trait FileDialogs {
    /// Ask for a file of `kind`; `suggested_name` (no extension) is offered when saving.
    fn pick(&mut self, kind: FileKind, suggested_name: &str) -> Pick;
}

/// The system's file dialogs (rfd: the desktop portal, else zenity).
#[derive(Debug, Default)]
pub struct SystemDialogs;

/// A dialog that answered "nothing chosen" faster than this was never shown: nobody closes a
/// file dialog within a fifth of a second.
const FASTEST_HUMAN_ANSWER: Duration = Duration::from_millis(200);

impl FileDialogs for SystemDialogs {
    fn pick(&mut self, kind: FileKind, suggested_name: &str) -> Pick {
        if let Err(why) = system_dialog_available() {
            return Pick::Unavailable(why);
        }
        let started = Instant::now();
        let answer = match kind {
            FileKind::Open => rfd::FileDialog::new()
                .add_filter("Aggrade project or bed table", FileKind::Open.extensions())
                .add_filter("All files", &["*"])
                .pick_file(),
            FileKind::Csv => rfd::FileDialog::new().add_filter("Bed table (CSV)", &["csv"]).pick_file(),
            FileKind::Table => rfd::FileDialog::new()
                .add_filter("Table (CSV, TSV, TXT, XLSX, ODS)", FileKind::Table.extensions())
                .add_filter("All files", &["*"])
                .pick_file(),
            FileKind::Image => rfd::FileDialog::new()
                .add_filter("Sheet image (PNG, JPEG)", &["png", "PNG", "jpg", "JPG", "jpeg", "JPEG"])
                .add_filter("All files", &["*"])
                .pick_file(),
            FileKind::Las => rfd::FileDialog::new()
                .add_filter("LAS log", &["las", "LAS"])
                .add_filter("All files", &["*"])
                .pick_file(),
            FileKind::Save(k) => {
                let (name, ext) = k.name_and_extension();
                rfd::FileDialog::new()
                    .add_filter(name, &[ext])
                    .set_file_name(format!("{suggested_name}.{ext}"))
                    .save_file()
            }
        };
        match answer {
            Some(p) => Pick::Chosen(p),
            None if started.elapsed() < FASTEST_HUMAN_ANSWER => Pick::Unavailable(
                "the system file dialog closed at once without showing (no desktop portal or zenity \
                 answered)"
                    .into(),
            ),
            None => Pick::Cancelled,
        }
    }
}

/// Can the system show a file dialog? rfd asks the desktop portal over the D-Bus session bus
/// and falls back to the `zenity` program; when neither can answer it returns "nothing chosen",
/// which cannot be told from a cancel. `AGGRADE_FILE_CHOOSER=builtin` always uses Aggrade's own.
pub fn system_dialog_available() -> Result<(), String> {
    if std::env::var("AGGRADE_FILE_CHOOSER").is_ok_and(|v| v.eq_ignore_ascii_case("builtin")) {
        return Err("AGGRADE_FILE_CHOOSER=builtin is set".into());
    }
    let on_path = |prog: &str| {
        std::env::var_os("PATH")
            .is_some_and(|paths| std::env::split_paths(&paths).any(|d| d.join(prog).is_file()))
    };
    if on_path("zenity") {
        return Ok(());
    }
    let bus = std::env::var_os("DBUS_SESSION_BUS_ADDRESS").is_some_and(|v| !v.is_empty())
        || std::env::var_os("XDG_RUNTIME_DIR").is_some_and(|d| Path::new(&d).join("bus").exists());
    if !bus {
        return Err("there is no D-Bus session for the desktop portal, and zenity is not installed".into());
    }
    let portal_dirs =
        ["/usr/share/xdg-desktop-portal/portals", "/usr/local/share/xdg-desktop-portal/portals"];
    let has_chooser = portal_dirs.iter().any(|d| {
        std::fs::read_dir(d).into_iter().flatten().flatten().any(|e| {
            std::fs::read_to_string(e.path())
                .is_ok_and(|t| t.contains("org.freedesktop.impl.portal.FileChooser"))
        })
    });
    if has_chooser {
        Ok(())
    } else {
        Err("no desktop portal offers a file chooser, and zenity is not installed".into())
    }
}

/// Paths handed out in order (for tests and scripted runs); `None` answers as a cancel.
#[derive(Debug, Default)]
pub struct ScriptedDialogs {
    pub answers: VecDeque<Option<PathBuf>>,
}

impl FileDialogs for ScriptedDialogs {
    fn pick(&mut self, _kind: FileKind, _suggested: &str) -> Pick {
        match self.answers.pop_front().flatten() {
            Some(p) => Pick::Chosen(p),
            None => Pick::Cancelled,
        }
    }
}

/// Dialogs that can never be shown (a desktop with no portal and no zenity); for tests.
#[derive(Debug, Default)]
pub struct NoSystemDialogs;

impl FileDialogs for NoSystemDialogs {
    fn pick(&mut self, _kind: FileKind, _suggested: &str) -> Pick {
        Pick::Unavailable("no desktop portal and no zenity (simulated)".into())
    }
}

/// What a chosen file will be used for: the window, or the view that asked, takes the path
/// when the in-window chooser delivers it a frame or more after the request.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum PickFor {
    Open,
    ImportCsv,
    ImportTable,
    AttachLas,
    TraceImage,
    SaveProject,
    ExportColumn(SaveKind),
    /// A view's own export, named by the view ("panel-pdf", "bodies-csv" …).
    View(&'static str),
}

/// Aggrade's own file chooser, shown inside the window.
struct InWindow {
    dialog: egui_file::FileDialog,
    purpose: PickFor,
    kind: FileKind,
    why: String,
    /// A save target that exists and waits for "Replace".
    confirm_replace: Option<PathBuf>,
}

/// The one way the window asks for files: the system's dialog first, Aggrade's own chooser when
/// that cannot be shown.
pub struct Chooser {
    system: Box<dyn FileDialogs>,
    in_window: Option<InWindow>,
    ready: Option<(PickFor, PathBuf)>,
    /// Where Aggrade's own chooser starts (the open document's folder, else the home folder).
    pub start_dir: Option<PathBuf>,
    /// Why the last system dialog could not be shown (for the status line).
    pub last_unavailable: Option<String>,
}

impl Chooser {
    /// A chooser over these system dialogs.
    pub fn new(system: Box<dyn FileDialogs>) -> Self {
        Chooser { system, in_window: None, ready: None, start_dir: None, last_unavailable: None }
    }

    /// Ask for a file. Returns the path at once when the system's dialog answers; `None` when
    /// the person cancelled, or when Aggrade's own chooser was opened instead, which delivers
    /// the path later through [`Chooser::take`] for the same `purpose`.
    pub fn pick(&mut self, purpose: PickFor, kind: FileKind, suggested_name: &str) -> Option<PathBuf> {
        if self.in_window.is_some() {
            return None;
        }
        match self.system.pick(kind, suggested_name) {
            Pick::Chosen(p) => Some(p),
            Pick::Cancelled => None,
            Pick::Unavailable(why) => {
                self.open_in_window(purpose, kind, suggested_name, why);
                None
            }
        }
    }

    /// A path for a save button: at once from the system dialog when `clicked`, or in a later
    /// frame from Aggrade's own chooser.
    pub fn save_path(
        &mut self,
        clicked: bool,
        purpose: PickFor,
        kind: SaveKind,
        suggested_name: &str,
    ) -> Option<PathBuf> {
        if clicked {
            if let Some(p) = self.pick(purpose, FileKind::Save(kind), suggested_name) {
                return Some(p);
            }
        }
        self.take(purpose)
    }

    /// The path Aggrade's own chooser delivered for `purpose`, once.
    pub fn take(&mut self, purpose: PickFor) -> Option<PathBuf> {
        match &self.ready {
            Some((p, _)) if *p == purpose => self.ready.take().map(|(_, path)| path),
            _ => None,
        }
    }

    /// Is Aggrade's own chooser showing?
    pub fn in_window_open(&self) -> bool {
        self.in_window.is_some()
    }

    /// Why the in-window chooser was opened (shown in it), if it is open.
    pub fn in_window_reason(&self) -> Option<&str> {
        self.in_window.as_ref().map(|w| w.why.as_str())
    }

    fn open_in_window(&mut self, purpose: PickFor, kind: FileKind, suggested_name: &str, why: String) {
        let start = self
            .start_dir
            .clone()
            .filter(|d| d.is_dir())
            .or_else(|| std::env::var_os("HOME").map(PathBuf::from).filter(|d| d.is_dir()))
            .or_else(|| std::env::current_dir().ok())
            .unwrap_or_else(|| PathBuf::from("."));
        let exts = kind.extensions();
        let filter = move |p: &Path| {
            p.is_dir()
                || p.extension()
                    .and_then(|e| e.to_str())
                    .is_some_and(|e| exts.iter().any(|x| x.eq_ignore_ascii_case(e)))
        };
        let mut dialog = match kind {
            FileKind::Save(k) => {
                let (_, ext) = k.name_and_extension();
                egui_file::FileDialog::save_file()
                    .default_filename(format!("{}.{ext}", safe_file_name(suggested_name)))
                    .save_button_text("Save here".into())
            }
            _ => egui_file::FileDialog::open_file().open_button_text("Open this file".into()),
        }
        .initial_path(start)
        .title(kind.title())
        .show_files_filter(Box::new(filter))
        .id(egui::Id::unique("aggrade_in_window_chooser"))
        .default_size([620.0, 460.0])
        // Centred, just below the line that says why it shows.
        .anchor(egui::Align2::CENTER_CENTER, [0.0, 20.0])
        .keep_on_top(true);
        dialog.open();
        self.last_unavailable = Some(why.clone());
        self.in_window = Some(InWindow { dialog, purpose, kind, why, confirm_replace: None });
    }

    /// Draw Aggrade's own chooser if it is open. Returns a line for the status bar when it
    /// delivered or was cancelled.
    pub fn ui(&mut self, ctx: &egui::Context) -> Option<String> {
        let w = self.in_window.as_mut()?;
        if let Some(target) = w.confirm_replace.clone() {
            let mut answer = None;
            egui::Modal::new(egui::Id::unique("aggrade_replace_confirm")).show(ctx, |ui| {
                ui.heading("Replace the file?");
                ui.label(format!("{} exists already. Replace it?", target.display()));
                ui.label(
                    egui::RichText::new("The file it replaces is kept beside it as a .bak copy.").small(),
                );
                ui.horizontal(|ui| {
                    if ui.button("Replace").on_hover_text("Write over the existing file").clicked() {
                        answer = Some(true);
                    }
                    if ui.button("Choose another name").on_hover_text("Back to the chooser").clicked() {
                        answer = Some(false);
                    }
                });
            });
            match answer {
                Some(true) => {
                    let purpose = w.purpose;
                    self.in_window = None;
                    self.ready = Some((purpose, target.clone()));
                    return Some(format!("Chosen {}", target.display()));
                }
                Some(false) => {
                    w.confirm_replace = None;
                    w.dialog.open();
                }
                None => {}
            }
            return None;
        }
        // Why Aggrade's own chooser shows, above it.
        egui::Area::new(egui::Id::unique("aggrade_chooser_why"))
            .anchor(egui::Align2::CENTER_CENTER, [0.0, -262.0])
            .order(egui::Order::Foreground)
            .show(ctx, |ui| {
                egui::Frame::popup(ui.style()).show(ui, |ui| {
                    ui.label(format!(
                        "Aggrade's own file chooser: the system's could not be shown ({}).",
                        w.why
                    ));
                });
            });
        w.dialog.show(ctx);
        match w.dialog.state() {
            egui_file::State::Open => None,
            egui_file::State::Selected => {
                let mut path = w.dialog.path().map(Path::to_path_buf)?;
                if let FileKind::Save(k) = w.kind {
                    let (_, ext) = k.name_and_extension();
                    if path.extension().is_none() {
                        path.set_extension(ext);
                    }
                    if path.exists() {
                        w.confirm_replace = Some(path);
                        return None;
                    }
                }
                let purpose = w.purpose;
                self.in_window = None;
                let line = format!("Chosen {}", path.display());
                self.ready = Some((purpose, path));
                Some(line)
            }
            egui_file::State::Cancelled | egui_file::State::Closed => {
                self.in_window = None;
                Some("Nothing chosen".into())
            }
        }
    }
}

/// A suggested file name without characters that file systems refuse.
fn safe_file_name(name: &str) -> String {
    let cleaned: String = name
        .chars()
        .map(|c| {
            if matches!(c, '/' | '\\' | ':' | '*' | '?' | '"' | '<' | '>' | '|') || c.is_control() {
                '_'
            } else {
                c
            }
        })
        .collect();
    let trimmed = cleaned.trim().trim_matches('.');
    if trimmed.is_empty() {
        "untitled".into()
    } else {
        trimmed.to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scripted_answers_come_back_at_once() {
        let mut c = Chooser::new(Box::new(ScriptedDialogs {
            answers: vec![Some(PathBuf::from("a.pdf")), None].into(),
        }));
        assert_eq!(c.pick(PickFor::Open, FileKind::Open, "x"), Some(PathBuf::from("a.pdf")));
        assert_eq!(c.pick(PickFor::Open, FileKind::Open, "x"), None);
        assert!(!c.in_window_open(), "a cancel opens nothing else");
    }

    #[test]
    fn an_unavailable_system_dialog_opens_the_in_window_chooser_and_says_why() {
        let mut c = Chooser::new(Box::new(NoSystemDialogs));
        assert_eq!(c.pick(PickFor::SaveProject, FileKind::Save(SaveKind::Project), "Field day"), None);
        assert!(c.in_window_open());
        assert!(c.in_window_reason().is_some_and(|w| w.contains("no desktop portal")));
        // A second request while it shows does not replace the first.
        assert_eq!(c.pick(PickFor::Open, FileKind::Open, ""), None);
        assert!(c.take(PickFor::SaveProject).is_none(), "nothing delivered yet");
    }

    #[test]
    fn delivered_paths_go_only_to_their_purpose() {
        let mut c = Chooser::new(Box::new(NoSystemDialogs));
        c.ready = Some((PickFor::View("panel-pdf"), PathBuf::from("p.pdf")));
        assert_eq!(c.take(PickFor::View("bodies-csv")), None);
        assert_eq!(
            c.save_path(false, PickFor::View("panel-pdf"), SaveKind::Pdf, "x"),
            Some(PathBuf::from("p.pdf"))
        );
        assert_eq!(c.take(PickFor::View("panel-pdf")), None, "delivered once");
    }

    #[test]
    fn suggested_names_lose_characters_file_systems_refuse() {
        assert_eq!(safe_file_name("Sedge Creek: 2/3"), "Sedge Creek_ 2_3");
        assert_eq!(safe_file_name("  ..  "), "untitled");
        assert_eq!(safe_file_name("Río Tinto — Ñ"), "Río Tinto — Ñ");
    }
}
