//! `aggrade export`: the interpreted column to PDF or SVG at a true scale.

use aggrade_core::export::{write_pdf, write_svg, PdfInfo};
use aggrade_core::layout::{pages, LayoutOptions, Orientation, Paper, PrintMeta};
use aggrade_core::model::Section;
use aggrade_core::rules::{interpret, RuleParams};
use anyhow::{bail, Context};
use std::path::{Path, PathBuf};

/// Arguments of `aggrade export`.
#[derive(Debug, clap::Args)]
pub struct ExportArgs {
    /// Input file (project file or bed-table CSV).
    pub file: PathBuf,
    /// Section to print (by name); needed when the file holds more than one.
    #[arg(long)]
    pub section: Option<String>,
    /// Write a PDF here.
    #[arg(long, value_name = "OUT.pdf", required_unless_present = "svg")]
    pub pdf: Option<PathBuf>,
    /// Write SVG here (one file per page: OUT.svg, or OUT-1.svg, OUT-2.svg … for several pages).
    #[arg(long, value_name = "OUT.svg")]
    pub svg: Option<PathBuf>,
    /// Vertical scale 1:N, e.g. 10, 20, 50, 100, 200, 500 or any N > 0.
    #[arg(long, default_value = "100", value_name = "N")]
    pub scale: String,
    /// Paper: a4, a3, letter or tall (one page as tall as the column). Default: a4 for PDF,
    /// tall for SVG.
    #[arg(long)]
    pub paper: Option<String>,
    /// Landscape instead of portrait.
    #[arg(long)]
    pub landscape: bool,
    /// Also draw sequence-boundary candidates the geologist rejected.
    #[arg(long)]
    pub show_rejected: bool,
}

/// Parse a scale "100" or "1:100" into N.
fn parse_scale(text: &str) -> anyhow::Result<f64> {
    let t = text.trim();
    let n = t.strip_prefix("1:").unwrap_or(t);
    match n.trim().parse::<f64>() {
        Ok(v) if v.is_finite() && v > 0.0 && v <= 1.0e6 => Ok(v),
        _ => bail!(
            "--scale {text:?} is not a scale: give N of 1:N as a number > 0, e.g. 10, 20, 50, 100, 200, 500"
        ),
    }
}

/// Choose the section to print.
fn pick_section<'a>(file: &Path, sections: &'a [Section], name: Option<&str>) -> anyhow::Result<&'a Section> {
    let names = || sections.iter().map(|s| format!("{:?}", s.name)).collect::<Vec<_>>().join(", ");
    match name {
        Some(n) => sections
            .iter()
            .find(|s| s.name == n)
            .or_else(|| sections.iter().find(|s| s.name.eq_ignore_ascii_case(n)))
            .with_context(|| {
                format!("{}: no section named {n:?}; the file holds {}", file.display(), names())
            }),
        None => match sections {
            [] => bail!("{}: the file holds no sections", file.display()),
            [only] => Ok(only),
            _ => bail!(
                "{}: the file holds {} sections ({}); choose one with --section NAME",
                file.display(),
                sections.len(),
                names()
            ),
        },
    }
}

/// Seconds since 1970 for the PDF date: `SOURCE_DATE_EPOCH` when set (reproducible builds
/// convention), otherwise the clock.
fn creation_time() -> anyhow::Result<i64> {
    if let Ok(v) = std::env::var("SOURCE_DATE_EPOCH") {
        return v
            .trim()
            .parse::<i64>()
            .ok()
            .filter(|s| *s >= 0)
            .with_context(|| format!("SOURCE_DATE_EPOCH={v:?} is not a number of seconds since 1970"));
    }
    let now =
        std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_secs()).unwrap_or(0);
    Ok(i64::try_from(now).unwrap_or(0))
}

/// YYYY-MM-DD of a Unix time (proleptic Gregorian calendar, UTC; days-from-civil inverse).
fn iso_date(unix_s: i64) -> String {
    let z = unix_s.div_euclid(86_400) + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

/// Run `aggrade export`.
pub fn run(args: &ExportArgs) -> anyhow::Result<()> {
    if args.pdf.is_none() && args.svg.is_none() {
        bail!("nothing to write: give --pdf OUT.pdf and/or --svg OUT.svg");
    }
    let scale = parse_scale(&args.scale)?;
    let loaded = aggrade_core::io::load(&args.file)?;
    for w in &loaded.warnings {
        eprintln!("aggrade: warning: {w}");
    }
    let section = pick_section(&args.file, &loaded.project.sections, args.section.as_deref())?;
    // Default rule parameters, as `aggrade interpret` uses without --params.
    let interp = interpret(section, &RuleParams::default());
    let when = creation_time()?;
    let meta = PrintMeta {
        printed_on: iso_date(when),
        subtitle: args.file.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default(),
    };
    let orientation = if args.landscape { Orientation::Landscape } else { Orientation::Portrait };
    let paper_for = |default: Paper| -> anyhow::Result<Paper> {
        match &args.paper {
            None => Ok(default),
            Some(p) => Paper::parse(p)
                .with_context(|| format!("--paper {p:?} is not a paper size: use a4, a3, letter or tall")),
        }
    };
    if let Some(out) = &args.pdf {
        let opts = LayoutOptions {
            scale_denominator: scale,
            paper: paper_for(Paper::A4)?,
            orientation,
            show_rejected: args.show_rejected,
            ..Default::default()
        };
        let p = pages(section, &interp, &opts, &meta);
        let info =
            PdfInfo { title: section.name.clone(), author: section.logged_by.clone(), creation_date: when };
        let bytes = write_pdf(&p, &info);
        std::fs::write(out, bytes).with_context(|| format!("cannot write {}", out.display()))?;
        eprintln!(
            "wrote {} ({} page{}, scale {})",
            out.display(),
            p.len(),
            if p.len() == 1 { "" } else { "s" },
            opts.scale_label()
        );
    }
    if let Some(out) = &args.svg {
        let opts = LayoutOptions {
            scale_denominator: scale,
            paper: paper_for(Paper::TallSingle)?,
            orientation,
            show_rejected: args.show_rejected,
            ..Default::default()
        };
        let p = pages(section, &interp, &opts, &meta);
        let paths: Vec<PathBuf> = if p.len() == 1 {
            vec![out.clone()]
        } else {
            let stem =
                out.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_else(|| "page".into());
            (1..=p.len()).map(|k| out.with_file_name(format!("{stem}-{k}.svg"))).collect()
        };
        for (page, path) in p.iter().zip(&paths) {
            std::fs::write(path, write_svg(page))
                .with_context(|| format!("cannot write {}", path.display()))?;
            eprintln!("wrote {}", path.display());
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scales_parse_or_explain() {
        assert_eq!(parse_scale("100").ok(), Some(100.0));
        assert_eq!(parse_scale("1:50").ok(), Some(50.0));
        assert_eq!(parse_scale(" 137.5 ").ok(), Some(137.5));
        for bad in ["0", "-5", "abc", "NaN", "inf", ""] {
            let e = parse_scale(bad).expect_err(bad).to_string();
            assert!(e.contains("--scale") && e.contains("> 0"), "{e}");
        }
    }

    #[test]
    fn dates_from_unix_time() {
        // 1970-01-01 is day 0; 2000-03-01 is 951868800 s (leap-year handling); 2026-12-01 is
        // 1796083200 s (computed with Python's datetime, an independent implementation).
        assert_eq!(iso_date(0), "1970-01-01");
        assert_eq!(iso_date(951_868_800), "2000-03-01");
        assert_eq!(iso_date(1_796_083_200), "2026-12-01");
        assert_eq!(iso_date(1_796_083_200 - 1), "2026-11-30");
    }
}
