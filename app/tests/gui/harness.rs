//! What the window tests share: the window built as the binary builds it, with scripted file
//! pickers, in a headless egui_kittest harness of the real window size.

use aggrade::gui::{AggradeApp, AppConfig, ScriptedDialogs};
use egui_kittest::Harness;
use std::path::{Path, PathBuf};

/// A file under the shared test data (`tests/data/`).
pub fn fixture(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/data").join(rel)
}

/// The demo project shipped in `sample_sections/`.
pub fn demo_file() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade")
}

/// The window on `file` (the demo when `None`), its data folder `data_dir`, answering file
/// pickers with `answers` in turn.
pub fn app_with(file: Option<PathBuf>, data_dir: &Path, answers: Vec<Option<PathBuf>>) -> AggradeApp {
    AggradeApp::new(AppConfig {
        file,
        data_dir: data_dir.to_path_buf(),
        dialogs: Box::new(ScriptedDialogs { answers: answers.into() }),
        recent: Vec::new(),
    })
}

/// A headless harness drawing the whole window at 1400 × 900 points.
pub fn harness_of(app: AggradeApp) -> Harness<'static, AggradeApp> {
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut AggradeApp| app.ui_main(ui), app)
}

/// Ask the window to close, as the window manager's close button does (drawn at the next frame).
pub fn push_close_request(h: &mut Harness<'static, AggradeApp>) {
    h.input_mut()
        .viewports
        .entry(egui::ViewportId::ROOT)
        .or_default()
        .events
        .push(egui::ViewportEvent::Close);
}
