//! `aggrade curve`: attach a measured curve from a LAS 1.2/2.0 file or a plain CSV/TXT table
//! (hand-held spectrometer exports) to a section (saved in the project and drawn as a track
//! beside the column), remove one, or list them.

use aggrade_core::analysis::curve_table::read_curve_table;
use aggrade_core::analysis::las::{read_las, IndexDirection, IndexToSection, LasFile};
use aggrade_core::io::import::TextOptions;
use aggrade_core::model::{MeasuredCurve, Section};
use anyhow::bail;
use std::path::{Path, PathBuf};

/// Arguments of `aggrade curve`.
#[derive(Debug, clap::Args)]
pub struct CurveArgs {
    /// Project file (.aggrade, .json) to change; a bed-table CSV needs --out NAME.aggrade.
    pub file: PathBuf,
    /// LAS 1.2 or 2.0 file to read the curve from.
    #[arg(long, value_name = "FILE.las", conflicts_with_all = ["remove", "table"])]
    pub las: Option<PathBuf>,
    /// Plain table (CSV or TXT, any delimiter and decimal mark) with a height or depth column and
    /// one column per curve, as hand-held spectrometers export.
    #[arg(long, value_name = "FILE.csv", conflicts_with = "remove")]
    pub table: Option<PathBuf>,
    /// Mnemonic of the curve in the LAS file, or header of the column in the table (GR, K …);
    /// may be left out when there is only one curve besides the index.
    #[arg(long, visible_alias = "column", value_name = "NAME")]
    pub curve: Option<String>,
    /// Header of the table's height or depth column (default: the first column named like
    /// Height, Depth, H, Z or MD, else the first column). Units from the header: m, cm or ft.
    #[arg(long, value_name = "NAME", requires = "table")]
    pub index_column: Option<String>,
    /// Section to attach to or remove from (by name); needed when the file holds several.
    #[arg(long)]
    pub section: Option<String>,
    /// The LAS index value, in metres, that lies at the section's base. Default: 0 (the index
    /// is height above the base); with --depth-down, the section's thickness (depth 0 is the
    /// section top).
    #[arg(long, value_name = "M", allow_hyphen_values = true)]
    pub offset_m: Option<String>,
    /// The LAS index is depth, increasing downward (height = offset − depth); without it the
    /// index is height, increasing upward (height = index − offset).
    #[arg(long)]
    pub depth_down: bool,
    /// Remove the curve with this mnemonic from the section.
    #[arg(long, value_name = "MNEMONIC")]
    pub remove: Option<String>,
    /// Write the project here instead of over FILE (an existing file is kept as NAME.bak).
    #[arg(long, value_name = "OUT.aggrade")]
    pub out: Option<PathBuf>,
}

/// Parse `--offset-m`: a finite number of metres.
fn parse_offset(text: &str) -> anyhow::Result<f64> {
    match text.trim().parse::<f64>() {
        Ok(v) if v.is_finite() && v.abs() <= 1.0e6 => Ok(v),
        _ => bail!("--offset-m {text:?} is not a number of metres: give e.g. 0, 12.5 or -3"),
    }
}

/// The curve to take from a LAS file: the one named, or the only one.
fn chosen_mnemonic(las: &LasFile, wanted: Option<&str>, path: &Path) -> anyhow::Result<String> {
    let names = las.curve_mnemonics();
    match (wanted, names.as_slice()) {
        (Some(w), _) => Ok(w.to_string()),
        (None, [only]) => Ok(only.to_string()),
        (None, []) => bail!("{}: the file has no curve besides its depth index", path.display()),
        (None, _) => bail!(
            "{}: the file has {} curves; choose one with --curve MNEMONIC (one of {})",
            path.display(),
            names.len(),
            names.join(", ")
        ),
    }
}

/// How many samples of a curve lie within the section's heights.
fn inside(curve: &MeasuredCurve, section: &Section) -> usize {
    let top = section.total_thickness_m();
    curve.samples.iter().filter(|(h, _)| *h >= 0.0 && *h <= top).count()
}

/// One line per attached curve.
fn listing(section: &Section) -> String {
    if section.curves.is_empty() {
        return format!("{}: no measured curves attached\n", section.name);
    }
    let mut out = format!("{}: {} measured curve(s)\n", section.name, section.curves.len());
    for c in &section.curves {
        let (lo, hi) = c.height_range_m().unwrap_or((0.0, 0.0));
        out.push_str(&format!(
            "  {}: {} samples at {lo:.2}–{hi:.2} m, {} inside the section; from {} (offset {} m, index is {})\n",
            c.title(),
            c.samples.len(),
            inside(c, section),
            if c.source_file.is_empty() { "an unnamed file" } else { &c.source_file },
            c.offset_m,
            c.direction.describe()
        ));
    }
    out
}

/// Run `aggrade curve`.
pub fn run(args: &CurveArgs) -> anyhow::Result<()> {
    let mut project = super::load_input(&args.file)?;
    let index = super::one_section_index(&project, &args.file, args.section.as_deref())?;
    let source = args.las.as_ref().or(args.table.as_ref());
    if source.is_none() && (args.curve.is_some() || args.offset_m.is_some() || args.depth_down) {
        bail!("--curve, --offset-m and --depth-down need a curve source: give --las FILE.las or --table FILE.csv");
    }
    if source.is_none() && args.remove.is_none() {
        print!("{}", listing(&project.sections[index]));
        return Ok(());
    }
    let out = super::project_output(args.out.as_deref(), &args.file, "measured curves")?;
    let section = &mut project.sections[index];
    if let Some(name) = &args.remove {
        let Some(removed) = section.remove_curve(name) else {
            let attached: Vec<&str> = section.curves.iter().map(|c| c.mnemonic.as_str()).collect();
            bail!(
                "{}: section {:?} has no curve {name:?}; attached: {}",
                args.file.display(),
                section.name,
                if attached.is_empty() { "none".to_string() } else { attached.join(", ") }
            );
        };
        eprintln!("removed {} from {:?}", removed.title(), section.name);
    } else if let Some(las_path) = source {
        let las = match &args.table {
            Some(table) => {
                let bytes = aggrade_core::io::import::read_limited(table)?;
                let shown = table.display().to_string();
                read_curve_table(&bytes, &shown, &TextOptions::default(), args.index_column.as_deref())?
            }
            None => read_las(las_path)?,
        };
        for w in &las.warnings {
            eprintln!("aggrade: warning: {w}");
        }
        let mnemonic = chosen_mnemonic(&las, args.curve.as_deref(), las_path)?;
        let direction =
            if args.depth_down { IndexDirection::DepthBelowDatum } else { IndexDirection::HeightAboveDatum };
        let zero_m = match &args.offset_m {
            Some(text) => parse_offset(text)?,
            None if args.depth_down => section.total_thickness_m(),
            None => 0.0,
        };
        let shown = las_path.display().to_string();
        let curve = las.measured_curve(&mnemonic, &IndexToSection { direction, zero_m }, &shown)?;
        let n = curve.samples.len();
        let nulls = curve.samples.iter().filter(|(_, v)| v.is_none()).count();
        let within = inside(&curve, section);
        let (lo, hi) = curve.height_range_m().unwrap_or((0.0, 0.0));
        let title = curve.title();
        let replaced = section.attach_curve(curve);
        eprintln!(
            "{} {title} from {shown} on {:?}: {n} samples ({nulls} NULL) at heights {lo:.2}–{hi:.2} m \
             (offset {zero_m} m, index is {}); {within} lie within the section's 0–{:.2} m",
            if replaced { "replaced" } else { "attached" },
            section.name,
            direction.describe(),
            section.total_thickness_m()
        );
        if within == 0 {
            eprintln!(
                "aggrade: warning: no sample lies within the section, so the track will be empty; \
                 check --offset-m and --depth-down"
            );
        }
    }
    super::save_changed(&out, &project)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn offsets_parse_or_explain() {
        assert_eq!(parse_offset("12.5").ok(), Some(12.5));
        assert_eq!(parse_offset("-3").ok(), Some(-3.0));
        for bad in ["NaN", "inf", "ten", "", "1e9"] {
            let e = parse_offset(bad).expect_err(bad).to_string();
            assert!(e.contains("--offset-m"), "{e}");
        }
    }
}
