//! The egui front end: the window, its panels, and a headless fallback when there is no display.
//!
//! The modules are private; what the binary and the tests use is re-exported here:
//! [`AggradeApp`] (the window, built from an [`AppConfig`]), the [`Document`] it edits through
//! [`Edit`] values, the file pickers ([`FileDialogs`]), [`run`] and [`headless_fallback`].
//! Layout of the modules: `app/` (the window: menus, commands, pop-up dialogs), `column` (the
//! interpretation and laid-out column, brought up to date on a worker for long sections),
//! `document` (the project, its edits and undo), `views/` (correlation panel, statistics,
//! channel bodies), one file per panel or dialog besides.

mod actions;
mod app;
mod background;
mod canvas;
mod chooser;
mod column;
mod column_help;
mod curve_dialog;
mod demo;
mod document;
mod engine;
mod error;
mod export_dialog;
mod field;
mod files;
mod import_dialog;
mod inspector;
mod painter;
mod plots;
mod recovery;
mod review;
mod section_details;
mod stability;
mod table;
mod theme;
mod trace;
mod views;

use anyhow::Context as _;
use std::path::{Path, PathBuf};

pub use app::{AggradeApp, AppConfig, Command, Notice, Tab};
pub use chooser::Chooser;
pub use column::BACKGROUND_RULES_MIN_BEDS;
pub use document::{Document, Edit};
pub use files::{FileDialogs, NoSystemDialogs, ScriptedDialogs, SystemDialogs};
pub use views::Views;

/// What only the app's own tests and benchmarks reach: demo data, file and backup helpers,
/// and a few constants the tests compare with. Behind the `test-hooks` feature.
#[cfg(feature = "test-hooks")]
pub mod test_hooks {
    /// The demo the window shows, and generated test sections (a short one and long ones).
    pub mod demo {
        pub use crate::gui::demo::{demo, demo_project, long_section, DEMO_NAME};
    }
    /// Opening and saving project files as the window does.
    pub mod files {
        pub use crate::gui::files::{open, save};
    }
    /// The window's backups.
    pub mod recovery {
        pub use crate::gui::recovery::{data_dir, find_recovery, read_all_backups, Autosaver, DATA_DIR_ENV};
    }
    /// What a tracing click or letter turns into, checked without a window.
    pub mod trace {
        pub use crate::gui::trace::{grain_click, with_lithology};
    }
    pub use crate::gui::canvas::new_bed;
    pub use crate::gui::field::INVALID;
    pub use crate::gui::import_dialog::SAVED_MAPPING_FILE;
    pub use crate::gui::plots::{histogram, histogram_bars, PROPORTION_PLOT, THICKNESS_PLOT};
    pub use crate::gui::review::LINK_HINT;
    pub use crate::gui::views::{datum_choices, PANEL_PANE_WIDTH};
}

/// Open the main window on a file (or the demo section). With no display, do the main job
/// headless instead (see [`headless_fallback`]).
pub fn run(file: Option<PathBuf>) -> anyhow::Result<()> {
    let has_display =
        ["DISPLAY", "WAYLAND_DISPLAY"].iter().any(|v| std::env::var_os(v).is_some_and(|x| !x.is_empty()));
    if !has_display {
        let out = std::env::temp_dir().join("aggrade-column.pdf");
        headless_fallback(file.as_deref(), &out)?;
        println!("No display found: wrote the interpreted column to {}", out.display());
        return Ok(());
    }
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_inner_size([1400.0, 900.0])
            .with_min_inner_size([900.0, 560.0])
            .with_app_id("aggrade"),
        ..Default::default()
    };
    let data_dir = recovery::data_dir();
    eframe::run_native(
        "Aggrade",
        options,
        Box::new(move |cc| {
            let recent = cc
                .storage
                .and_then(|s| s.get_string("aggrade.recent"))
                .and_then(|j| serde_json::from_str::<Vec<PathBuf>>(&j).ok())
                .unwrap_or_default();
            let config = AppConfig { file, data_dir, dialogs: Box::new(files::SystemDialogs), recent };
            Ok(Box::new(AggradeApp::new(config)))
        }),
    )
    .map_err(|e| anyhow::anyhow!("cannot open the window: {e}"))
}

/// Without a display: interpret the file (or the demo) and write its interpreted column as a
/// PDF to `out` at 1:100 on A4.
pub fn headless_fallback(file: Option<&Path>, out: &Path) -> anyhow::Result<()> {
    let project = match file {
        Some(p) => files::open(p).map_err(|e| anyhow::anyhow!("{e}"))?.0,
        None => demo::demo().map_err(|e| anyhow::anyhow!("{e}"))?,
    };
    let section = project.sections.first().context("the project holds no section")?;
    // The project's own rule parameters; faulty ones are named, and the defaults used.
    let rules = engine::project_rules(&project);
    if let Some(problem) = &rules.problem {
        eprintln!("{problem}");
    }
    let interp = engine::interpret(section, &rules.params);
    let now = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    export_dialog::export_to(out, section, &interp, &engine::LayoutOptions::default(), now)
        .map_err(|e| anyhow::anyhow!("{e}"))?;
    Ok(())
}
