//! `aggrade interpret`.

use std::path::PathBuf;

/// Arguments of `aggrade interpret`.
#[derive(Debug, clap::Args)]
pub struct InterpretArgs {
    /// Input file.
    pub file: PathBuf,
}

/// Run `aggrade interpret`.
pub fn run(_args: &InterpretArgs) -> anyhow::Result<()> {
    anyhow::bail!("`aggrade interpret` is not built yet")
}
