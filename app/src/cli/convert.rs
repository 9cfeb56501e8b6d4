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
    // The errors' own text already names the cause; anyhow's chain would repeat it.
    let loaded = io::load(&args.file).map_err(|e| anyhow::anyhow!("{e}"))?;
    for warning in &loaded.warnings {
        eprintln!("warning: {warning}");
    }
    let project = loaded.project;
    match out_kind {
        FileKind::Project => {
            let project = match &args.section {
                Some(name) => Project::new(vec![pick_section(&project, Some(name), &args.file)?.clone()]),
                None => project,
            };
            io::save_project(&args.output, &project).map_err(|e| anyhow::anyhow!("{e}"))?;
        }
        FileKind::BedTable => {
            let section = pick_section(&project, args.section.as_deref(), &args.file)?;
            io::write_bytes_atomic(&args.output, io::write_bed_table(section).as_bytes())
                .map_err(|e| anyhow::anyhow!("{e}"))?;
            if !section.locality.is_empty() || section.coordinates.is_some() || !section.review.is_empty() {
                eprintln!(
                    "note: a bed table holds beds only; section metadata and review decisions of {:?} are not in {}",
                    section.name,
                    args.output.display()
                );
            }
        }
    }
    eprintln!("wrote {}", args.output.display());
    Ok(())
}

/// The section to convert: the named one, or the only one; else an error listing the names.
fn pick_section<'p>(
    project: &'p Project,
    name: Option<&str>,
    path: &std::path::Path,
) -> anyhow::Result<&'p aggrade_core::model::Section> {
    let names = || project.sections.iter().map(|s| format!("{:?}", s.name)).collect::<Vec<_>>().join(", ");
    match name {
        Some(name) => project.section(name).with_context(|| {
            format!("{}: no section named {name:?}; sections are {}", path.display(), names())
        }),
        None => match project.sections.as_slice() {
            [one] => Ok(one),
            [] => bail!("{}: the project has no sections", path.display()),
            _ => bail!(
                "{}: the project has {} sections; choose one with --section NAME ({})",
                path.display(),
                project.sections.len(),
                names()
            ),
        },
    }
}

fn same_file(a: &std::path::Path, b: &std::path::Path) -> bool {
    match (a.canonicalize(), b.canonicalize()) {
        (Ok(x), Ok(y)) => x == y,
        _ => false,
    }
}
