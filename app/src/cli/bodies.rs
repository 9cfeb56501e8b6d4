//! `aggrade bodies`.

use std::path::PathBuf;

/// Arguments of `aggrade bodies`.
#[derive(Debug, clap::Args)]
pub struct BodiesArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade bodies`.
pub fn run(_args: &BodiesArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade bodies` is not built yet")
}
