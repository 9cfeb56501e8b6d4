//! The egui front end.

use std::path::PathBuf;

/// Open the main window on a file (or the demo section).
pub fn run(_file: Option<PathBuf>) -> anyhow::Result<()> {
    anyhow::bail!("the window is not built yet")
}
