//! `aggrade export`.

use std::path::PathBuf;

/// Arguments of `aggrade export`.
#[derive(Debug, clap::Args)]
pub struct ExportArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade export`.
pub fn run(_args: &ExportArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade export` is not built yet")
}
