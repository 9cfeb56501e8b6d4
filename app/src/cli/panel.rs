//! `aggrade panel`.

use std::path::PathBuf;

/// Arguments of `aggrade panel`.
#[derive(Debug, clap::Args)]
pub struct PanelArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade panel`.
pub fn run(_args: &PanelArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade panel` is not built yet")
}
