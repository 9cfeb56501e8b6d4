//! `aggrade bodies`: the channel-body table and proportion curve of a project as CSV, for
//! reservoir modellers.

use std::path::PathBuf;

/// Arguments of `aggrade bodies`.
#[derive(Debug, clap::Args)]
pub struct BodiesArgs {
    /// Project file (.aggrade) or bed-table CSV.
    pub file: PathBuf,
    /// Write the body table here (section, base, top, thickness, storeys, stacking, grain range).
    #[arg(long)]
    pub csv: PathBuf,
    /// Also write the moving-window channel-body proportion curve here.
    #[arg(long)]
    pub curve_csv: Option<PathBuf>,
    /// Only this section.
    #[arg(long)]
    pub section: Option<String>,
}

/// Run `aggrade bodies`.
pub fn run(args: &BodiesArgs) -> anyhow::Result<()> {
    // Read first so that a bad file is reported as such.
    let _loaded = aggrade_core::io::load(&args.file)?;
    anyhow::bail!(
        "{}: the rules engine is not available in this build, so channel bodies cannot be found yet; \
         `aggrade stats` works without it",
        args.file.display()
    )
}
