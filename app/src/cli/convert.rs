//! `aggrade convert`.

use std::path::PathBuf;

/// Arguments of `aggrade convert`.
#[derive(Debug, clap::Args)]
pub struct ConvertArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade convert`.
pub fn run(_args: &ConvertArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade convert` is not built yet")
}
