//! `aggrade check`.

use std::path::PathBuf;

/// Arguments of `aggrade check`.
#[derive(Debug, clap::Args)]
pub struct CheckArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade check`.
pub fn run(_args: &CheckArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade check` is not built yet")
}
