//! The egui front end: the window, its panels, and a headless fallback when there is no display.

pub mod actions;
pub mod app;
pub mod canvas;
pub mod chooser;
pub mod curve_dialog;
pub mod demo;
pub mod document;
pub mod engine;
pub mod export_dialog;
pub mod field;
pub mod files;
pub mod import_dialog;
pub mod inspector;
pub mod painter;
pub mod plots;
pub mod recovery;
pub mod review;
pub mod table;
pub mod theme;
pub mod trace;
pub mod views_bodies;
pub mod views_common;
pub mod views_panel;
pub mod views_stats;

use anyhow::Context as _;
use std::path::{Path, PathBuf};

pub use app::{AggradeApp, AppConfig};

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
        Some(p) => files::open(p).map_err(|e| anyhow::anyhow!(e))?.0,
        None => match demo::demo_file().map(|p| files::open(&p)) {
            Some(Ok((p, _))) => p,
            _ => demo::demo_project(),
        },
    };
    let section = project.sections.first().context("the project holds no section")?;
    let interp = engine::interpret(section, &engine::RuleParams::default());
    let now = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    export_dialog::export_to(out, section, &interp, &engine::LayoutOptions::default(), now)
        .map_err(|e| anyhow::anyhow!(e))?;
    Ok(())
}
