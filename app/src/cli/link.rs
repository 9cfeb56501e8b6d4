//! `aggrade link`: set the correlation label (e.g. SB-2) of an accepted boundary, so that the
//! correlation panel ties it to the accepted boundaries with the same correlation label in
//! neighbouring sections; or take the correlation label off.

use aggrade_core::io::check_link_label;
use aggrade_core::model::{BedId, Project, ReviewState};
use anyhow::{anyhow, bail};
use std::path::PathBuf;

/// Arguments of `aggrade link`.
#[derive(Debug, clap::Args)]
pub struct LinkArgs {
    /// Project file (.aggrade, .json) to change.
    pub file: PathBuf,
    /// Section holding the boundary (by name); needed when the file holds several.
    #[arg(long)]
    pub section: Option<String>,
    /// Id of the bed whose base is the accepted boundary.
    #[arg(long, value_name = "ID")]
    pub bed: u64,
    /// The correlation label, e.g. SB-2 (at most 40 characters).
    #[arg(long, value_name = "LABEL", required_unless_present = "remove", conflicts_with = "remove")]
    pub label: Option<String>,
    /// Take the boundary's correlation label off.
    #[arg(long)]
    pub remove: bool,
    /// Write the project here instead of over FILE (an existing file is kept as NAME.bak).
    #[arg(long, value_name = "OUT.aggrade")]
    pub out: Option<PathBuf>,
}

/// Other accepted boundaries carrying the correlation label `label`, as "Section bed N (h m)"
/// (in each section's display unit), for the report.
fn others_with(project: &Project, label: &str, except: (usize, BedId)) -> Vec<String> {
    let mut out = Vec::new();
    for (i, s) in project.sections.iter().enumerate() {
        let heights = s.base_heights_m();
        for d in &s.review {
            if (i, d.bed) == except || d.state != ReviewState::Accepted || d.link_label() != Some(label) {
                continue;
            }
            let h = s.bed_index(d.bed).map(|k| heights[k]).unwrap_or(f64::NAN);
            out.push(format!("{} bed {} ({})", s.name, d.bed.0, s.display_unit.length(h)));
        }
    }
    out
}

/// Run `aggrade link`.
pub fn run(args: &LinkArgs) -> anyhow::Result<()> {
    let out = super::project_output(args.out.as_deref(), &args.file, "correlation labels")?;
    let mut project = super::load_input(&args.file)?;
    let index = super::one_section_index(&project, &args.file, args.section.as_deref())?;
    let file = args.file.display();
    let bed = BedId(args.bed);
    let label = match &args.label {
        Some(l) if l.trim().is_empty() => {
            bail!(
                "--label {l:?}: must not be blank; to take a boundary's correlation label off, use --remove"
            )
        }
        Some(l) => {
            check_link_label(l).map_err(|why| anyhow!("--label {l:?}: {why}"))?;
            Some(l.trim().to_string())
        }
        None => None,
    };
    let section = &mut project.sections[index];
    let name = section.name.clone();
    let Some(k) = section.bed_index(bed) else {
        let ids: Vec<String> = section.beds.iter().map(|b| b.id.0.to_string()).collect();
        bail!(
            "{file}: section {name:?} has no bed with id {} (ids: {})",
            args.bed,
            if ids.is_empty() { "none".to_string() } else { ids.join(", ") }
        );
    };
    // The boundary's height, in the section's display unit.
    let height = section.display_unit.length(section.base_heights_m()[k]);
    let Some(decision) = section.review.iter_mut().find(|d| d.bed == bed) else {
        bail!(
            "{file}: the boundary at the base of bed {} ({height}) in {name:?} has no review decision; \
             only an accepted boundary can carry a correlation label (accept it first, e.g. in the app's review list)",
            args.bed
        );
    };
    match label {
        Some(label) => {
            if decision.state != ReviewState::Accepted {
                bail!(
                    "{file}: the boundary at the base of bed {} ({height}) in {name:?} is {}; \
                     only an accepted boundary can carry a correlation label (accept it first, e.g. in the app's review list)",
                    args.bed,
                    decision.state.name()
                );
            }
            let previous = decision.link.replace(label.clone());
            let others = others_with(&project, &label, (index, bed));
            match previous.as_deref().map(str::trim) {
                Some(p) if p == label => {
                    eprintln!("bed {} in {name:?} already carries the correlation label {label:?}", args.bed)
                }
                Some(p) => eprintln!(
                    "changed the correlation label of the boundary at the base of bed {} ({height}) in {name:?}: {p:?} → {label:?}",
                    args.bed
                ),
                None => eprintln!(
                    "set the correlation label of the boundary at the base of bed {} ({height}) in {name:?} to {label:?}",
                    args.bed
                ),
            }
            if others.is_empty() {
                eprintln!(
                    "no other accepted boundary carries the correlation label {label:?} yet: nothing is tied until one does"
                );
            } else {
                eprintln!("the correlation label {label:?} is also on: {}", others.join("; "));
            }
        }
        None => {
            let Some(previous) = decision.link.take() else {
                bail!(
                    "{file}: the boundary at the base of bed {} ({height}) in {name:?} has no correlation label to remove",
                    args.bed
                );
            };
            // A decision that only held the label goes with it.
            let section = &mut project.sections[index];
            section.review.retain(|d| {
                !(d.bed == bed && d.state == ReviewState::Candidate && d.note.is_empty() && d.link.is_none())
            });
            eprintln!(
                "removed the correlation label {previous:?} from the boundary at the base of bed {} ({height}) in {name:?}",
                args.bed
            );
        }
    }
    super::save_changed(&out, &project)
}
