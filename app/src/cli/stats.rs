//! `aggrade stats`.

use std::path::PathBuf;

/// Arguments of `aggrade stats`.
#[derive(Debug, clap::Args)]
pub struct StatsArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade stats`.
pub fn run(_args: &StatsArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade stats` is not built yet")
}
