//! Menu commands: each carries its label, tooltip and keyboard shortcut, so menus and shortcuts
//! are driven by one list and a test can list them.

use egui::{Key, KeyboardShortcut, Modifiers};

/// A command of the menu bar (and its shortcut, where it has one).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Command {
    New,
    Open,
    ImportCsv,
    ImportTable,
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
    AddSection,
    SectionDetails,
    AttachCurve,
    TraceImage,
    ShowTrace,
}

impl Command {
    /// Every command, in menu order.
    pub const ALL: [Command; 20] = [
        Command::New,
        Command::Open,
        Command::ImportCsv,
        Command::ImportTable,
        Command::Save,
        Command::SaveAs,
        Command::Export,
        Command::Quit,
        Command::Undo,
        Command::Redo,
        Command::ZoomIn,
        Command::ZoomOut,
        Command::PanelView,
        Command::StatsView,
        Command::BodiesView,
        Command::SectionDetails,
        Command::AddSection,
        Command::TraceImage,
        Command::ShowTrace,
        Command::AttachCurve,
    ];

    /// Shortcuts in the order they must be tested (Ctrl+Shift+Z before Ctrl+Z).
    pub const WITH_SHORTCUTS: [Command; 12] = [
        Command::SectionDetails,
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

    /// The words in the menu.
    pub fn label(self) -> &'static str {
        match self {
            Command::New => "New project",
            Command::Open => "Open…",
            Command::ImportCsv => "Import bed table (CSV)…",
            Command::ImportTable => "Import…",
            Command::Save => "Save",
            Command::SaveAs => "Save as…",
            Command::Export => "Export column…",
            Command::Quit => "Quit",
            Command::Undo => "Undo",
            Command::Redo => "Redo",
            Command::ZoomIn => "Zoom in",
            Command::ZoomOut => "Zoom out",
            Command::PanelView => "Correlation panel",
            Command::StatsView => "Statistics",
            Command::BodiesView => "Channel bodies",
            Command::AddSection => "Add empty section",
            Command::SectionDetails => "Section details…",
            Command::AttachCurve => "Attach measured curve (LAS)…",
            Command::TraceImage => "Trace from image…",
            Command::ShowTrace => "Show the traced sheet",
        }
    }

    /// What the command does, shown on hover.
    pub fn tooltip(self) -> &'static str {
        match self {
            Command::New => "Start an empty project",
            Command::Open => "Open a project or bed-table CSV",
            Command::ImportCsv => "Add a CSV bed table as a new section",
            Command::ImportTable => {
                "Add a spreadsheet or text table (CSV, TSV, TXT, XLSX, ODS) as a new section, with a preview"
            }
            Command::Save => "Save the project",
            Command::SaveAs => "Save the project under a new name",
            Command::Export => "Print the interpreted column at a true scale",
            Command::Quit => "Close Aggrade (asks about unsaved work)",
            Command::Undo => "Take back the last change",
            Command::Redo => "Do the undone change again",
            Command::ZoomIn => "Enlarge the column (also Ctrl+wheel)",
            Command::ZoomOut => "Shrink the column (also Ctrl+wheel)",
            Command::PanelView => "All sections side by side, hung on a datum, with tie lines",
            Command::StatsView => "Paleocurrents, rose diagram and facies transitions",
            Command::BodiesView => "Channel bodies of every section, thickness summary, CSV export",
            Command::AddSection => "Start a new section in this project",
            Command::SectionDetails => {
                "Name, locality, who logged it and when, coordinates, display unit, panel position and notes of the section shown"
            }
            Command::AttachCurve => {
                "Read a curve such as gamma ray from a LAS 2.0 file and draw it beside the column"
            }
            Command::TraceImage => {
                "Put a photographed or scanned field sheet behind the section and trace it by clicking"
            }
            Command::ShowTrace => "Open the trace window again on this section's sheet",
        }
    }

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
            Command::SectionDetails => KeyboardShortcut::new(cs, Key::D),
            Command::ImportCsv
            | Command::ImportTable
            | Command::ZoomIn
            | Command::ZoomOut
            | Command::AddSection
            | Command::AttachCurve
            | Command::TraceImage
            | Command::ShowTrace => return None,
        })
    }

    /// The key written beside the label: the shortcut as the platform writes it, or the key
    /// the canvas answers to (zoom).
    pub fn shortcut_text(self, ctx: &egui::Context) -> Option<String> {
        match (self.shortcut(), self) {
            (Some(sc), _) => Some(ctx.format_shortcut(&sc)),
            (None, Command::ZoomIn) => Some("+".into()),
            (None, Command::ZoomOut) => Some("−".into()),
            (None, _) => None,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_command_is_listed_once_with_words() {
        for (i, c) in Command::ALL.iter().enumerate() {
            assert!(!Command::ALL[..i].contains(c), "{c:?} listed twice");
            assert!(!c.label().is_empty() && !c.tooltip().is_empty(), "{c:?}");
        }
        let labels: Vec<&str> = Command::ALL.iter().map(|c| c.label()).collect();
        let mut unique = labels.clone();
        unique.sort_unstable();
        unique.dedup();
        assert_eq!(unique.len(), labels.len(), "two commands share a label: {labels:?}");
    }

    #[test]
    fn every_shortcut_is_tested_and_none_is_shared() {
        let with: Vec<Command> = Command::ALL.into_iter().filter(|c| c.shortcut().is_some()).collect();
        assert_eq!(with.len(), Command::WITH_SHORTCUTS.len());
        for c in &with {
            assert!(Command::WITH_SHORTCUTS.contains(c), "{c:?} has a shortcut that is never tested");
        }
        for (i, a) in with.iter().enumerate() {
            for b in &with[i + 1..] {
                assert_ne!(a.shortcut(), b.shortcut(), "{a:?} and {b:?}");
            }
        }
        // Ctrl+Shift+Z must be tested before Ctrl+Z (which also matches it).
        let at = |c| Command::WITH_SHORTCUTS.iter().position(|x| *x == c);
        assert!(at(Command::Redo) < at(Command::Undo));
        assert!(at(Command::SaveAs) < at(Command::Save));
    }
}
