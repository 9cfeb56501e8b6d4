//! The command line: headless subcommands for scripting, the window when none is given.

pub mod bodies;
pub mod check;
pub mod convert;
pub mod curve;
pub mod export;
pub mod import;
pub mod interpret;
pub mod link;
pub mod long_lists;
pub mod panel;
pub mod rules_args;
pub mod stats;

use aggrade_core::model::{Project, Section};
use anyhow::bail;
use clap::{Parser, Subcommand};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

/// Aggrade: log, interpret and print measured sections in river deposits.
#[derive(Debug, Parser)]
#[command(name = "aggrade", version, about, long_about = None)]
pub struct Cli {
    /// A project file (.aggrade) or bed-table CSV to open in the window (the demo section when absent).
    pub file: Option<PathBuf>,
    #[command(subcommand)]
    pub command: Option<Command>,
}

/// Headless subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Validate a project file or bed-table CSV and print a summary.
    Check(check::CheckArgs),
    /// Convert between a bed-table CSV and a project file (by extension).
    Convert(convert::ConvertArgs),
    /// Interpret a section: channel bodies, stacking, proportions, regimes, candidate boundaries.
    Interpret(interpret::InterpretArgs),
    /// Import a spreadsheet or text table written by hand (.csv, .tsv, .txt, .xlsx, .ods) into a
    /// project file, matching its headers and abbreviations; prints the mapping used.
    Import(import::ImportArgs),
    /// Export the interpreted column to PDF or SVG at a true scale.
    Export(export::ExportArgs),
    /// Paleocurrent statistics and facies-transition analysis.
    Stats(stats::StatsArgs),
    /// Channel-body table and proportion curve for modellers, as CSV.
    Bodies(bodies::BodiesArgs),
    /// Correlation panel of a project's sections hung on a datum, to PDF or SVG.
    Panel(panel::PanelArgs),
    /// Attach a measured curve (e.g. gamma ray) from a LAS 1.2/2.0 file or a plain CSV/TXT table
    /// to a section, remove one, or list them.
    Curve(curve::CurveArgs),
    /// Set or remove the correlation label (e.g. SB-2) of an accepted boundary.
    ///
    /// The correlation panel ties accepted boundaries with the same correlation label in
    /// neighbouring sections; `--remove` takes the correlation label off.
    Link(link::LinkArgs),
}

/// Run the parsed command line; errors are reported once, here, in plain words: the error and
/// the chain of its causes, joined by `: `. The core's errors are whole messages that chain no
/// cause of their own; the commands add a cause only where their words add to it (anyhow
/// context).
pub fn main(cli: Cli) -> ExitCode {
    let result = match cli.command {
        Some(Command::Check(a)) => check::run(&a),
        Some(Command::Convert(a)) => convert::run(&a),
        Some(Command::Interpret(a)) => interpret::run(&a),
        Some(Command::Import(a)) => import::run(&a),
        Some(Command::Export(a)) => export::run(&a),
        Some(Command::Stats(a)) => stats::run(&a),
        Some(Command::Bodies(a)) => bodies::run(&a),
        Some(Command::Panel(a)) => panel::run(&a),
        Some(Command::Curve(a)) => curve::run(&a),
        Some(Command::Link(a)) => link::run(&a),
        None => crate::gui::run(cli.file),
    };
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(err) => {
            eprintln!("aggrade: {err:#}");
            ExitCode::FAILURE
        }
    }
}

/// Read a project file or bed-table CSV for a command, reporting the reader's warnings on stderr.
pub fn load_input(file: &Path) -> anyhow::Result<Project> {
    let loaded = aggrade_core::io::load(file)?;
    for w in &loaded.warnings {
        eprintln!("aggrade: warning: {w}");
    }
    Ok(loaded.project)
}

/// Index of the section a command that changes a project works on (see [`one_section`]).
pub fn one_section_index(project: &Project, file: &Path, wanted: Option<&str>) -> anyhow::Result<usize> {
    let chosen = one_section(project, file, wanted)?;
    Ok(project.sections.iter().position(|s| std::ptr::eq(s, chosen)).unwrap_or(0))
}

/// Where a command that changes a project writes it (`--out`, or over the input), refused when
/// that is not a project file: `what` says what would be lost in a bed table.
pub fn project_output(out: Option<&Path>, file: &Path, what: &str) -> anyhow::Result<std::path::PathBuf> {
    let out = out.unwrap_or(file).to_path_buf();
    if aggrade_core::io::FileKind::of(&out) != Some(aggrade_core::io::FileKind::Project) {
        bail!("{}: {what} are kept in a project file; give --out NAME.aggrade", out.display());
    }
    Ok(out)
}

/// Save a changed project (atomically, the old file kept as NAME.bak) and say where.
pub fn save_changed(out: &Path, project: &Project) -> anyhow::Result<()> {
    aggrade_core::io::save_project(out, project)?;
    eprintln!("wrote {}", out.display());
    Ok(())
}

/// Section names, quoted and joined, for error messages.
fn section_names(project: &Project) -> String {
    project.sections.iter().map(|s| format!("{:?}", s.name)).collect::<Vec<_>>().join(", ")
}

/// The section a single-section command works on: the named one, or the only one; otherwise an
/// error listing the names.
pub fn one_section<'a>(
    project: &'a Project,
    file: &Path,
    wanted: Option<&str>,
) -> anyhow::Result<&'a Section> {
    match (wanted, project.sections.as_slice()) {
        (_, []) => bail!("{}: the file holds no sections", file.display()),
        (Some(name), _) => named(project, file, name),
        (None, [only]) => Ok(only),
        (None, _) => bail!(
            "{}: the file holds {} sections; choose one with --section NAME (one of {})",
            file.display(),
            project.sections.len(),
            section_names(project)
        ),
    }
}

/// The sections a command works on: the named one, or all of them.
pub fn named_or_all<'a>(
    project: &'a Project,
    file: &Path,
    wanted: Option<&str>,
) -> anyhow::Result<Vec<&'a Section>> {
    if project.sections.is_empty() {
        bail!("{}: the file holds no sections", file.display());
    }
    match wanted {
        Some(name) => Ok(vec![named(project, file, name)?]),
        None => Ok(project.sections.iter().collect()),
    }
}

fn named<'a>(project: &'a Project, file: &Path, name: &str) -> anyhow::Result<&'a Section> {
    project.section(name).ok_or_else(|| {
        anyhow::anyhow!(
            "{}: no section named {name:?}; the file holds {}",
            file.display(),
            section_names(project)
        )
    })
}
