//! `aggrade check`: validate a project file or bed-table CSV and print a short summary.

use aggrade_core::io;
use std::path::PathBuf;

/// Arguments of `aggrade check`.
#[derive(Debug, clap::Args)]
pub struct CheckArgs {
    /// Project file (.aggrade, .json) or bed-table CSV (.csv) to validate.
    pub file: PathBuf,
}

/// Run `aggrade check`: a summary on stdout and exit 0 when the file is valid; every problem (file,
/// line, field, value, what is valid) on stderr and a non-zero exit when it is not.
pub fn run(args: &CheckArgs) -> anyhow::Result<()> {
    let loaded = io::load(&args.file)?;
    for warning in loaded.warnings.iter().chain(&io::field_record_warnings(&args.file, &loaded.project)) {
        eprintln!("warning: {warning}");
    }
    print!("{}", summary(&args.file, &loaded.project));
    Ok(())
}

/// The summary printed for a valid file: totals, then one line per section.
pub fn summary(path: &std::path::Path, project: &aggrade_core::model::Project) -> String {
    let beds: usize = project.sections.iter().map(|s| s.beds.len()).sum();
    let total_m: f64 = project.sections.iter().map(|s| s.total_thickness_m()).sum();
    let exposed_m: f64 = project.sections.iter().map(|s| s.exposed_thickness_m()).sum();
    let n = project.sections.len();
    let mut out = format!(
        "{}: valid; {n} section{}, {beds} beds, {total_m:.2} m total, {exposed_m:.2} m exposed\n",
        path.display(),
        if n == 1 { "" } else { "s" }
    );
    for s in &project.sections {
        out.push_str(&format!(
            "  {}: {} bed{}, {:.2} m total, {:.2} m exposed\n",
            s.name,
            s.beds.len(),
            if s.beds.len() == 1 { "" } else { "s" },
            s.total_thickness_m(),
            s.exposed_thickness_m()
        ));
    }
    out
}
