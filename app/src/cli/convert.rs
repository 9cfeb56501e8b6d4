//! `aggrade convert`: bed-table CSV ↔ project file, chosen by the files' extensions.

use aggrade_core::io::{self, FileKind};
use aggrade_core::model::Project;
use anyhow::{bail, Context};
use std::path::PathBuf;

/// Arguments of `aggrade convert`.
#[derive(Debug, clap::Args)]
pub struct ConvertArgs {
    /// Input: project file (.aggrade, .json) or bed-table CSV (.csv).
    pub file: PathBuf,
    /// Output: project file (.aggrade, .json) or bed-table CSV (.csv). An existing project file
    /// is kept as NAME.bak.
    pub output: PathBuf,
    /// Section to write when a project with several sections is converted to CSV.
    #[arg(long)]
    pub section: Option<String>,
}

/// Run `aggrade convert`.
pub fn run(args: &ConvertArgs) -> anyhow::Result<()> {
    let out_kind = FileKind::of(&args.output).with_context(|| {
        format!(
            "{}: unknown output type; use .aggrade or .json (project) or .csv (bed table)",
            args.output.display()
        )
    })?;
    if same_file(&args.file, &args.output) {
        bail!("{}: input and output are the same file; give a different output", args.output.display());
    }
    let loaded = io::load(&args.file)?;
    for warning in &loaded.warnings {
        eprintln!("warning: {warning}");
    }
    let project = loaded.project;
    match out_kind {
        FileKind::Project => {
            let project = match &args.section {
                Some(name) => {
                    Project::new(vec![super::one_section(&project, &args.file, Some(name))?.clone()])
                }
                None => project,
            };
            io::save_project(&args.output, &project)?;
        }
        FileKind::BedTable => {
            let section = super::one_section(&project, &args.file, args.section.as_deref())?;
            io::write_bytes_atomic(&args.output, io::write_bed_table(section).as_bytes())?;
            if !section.locality.is_empty()
                || section.coordinates.is_some()
                || !section.review.is_empty()
                || !section.curves.is_empty()
                || section.method.is_some()
                || section.thickness_uncertainty_m.is_some()
                || section.bedding.is_some()
                || section.traverse.is_some()
                || !section.fixes.is_empty()
                || !section.body_lateral.is_empty()
            {
                eprintln!(
                    "note: a bed table holds beds only; section metadata (place, method, bedding, traverse, GPS fixes), channel-body widths, review decisions and measured curves of {:?} are not in {}",
                    section.name,
                    args.output.display()
                );
            }
        }
    }
    eprintln!("wrote {}", args.output.display());
    Ok(())
}

fn same_file(a: &std::path::Path, b: &std::path::Path) -> bool {
    match (a.canonicalize(), b.canonicalize()) {
        (Ok(x), Ok(y)) => x == y,
        _ => false,
    }
}
