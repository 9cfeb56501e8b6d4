//! `aggrade export`: the interpreted column to PDF, SVG or PNG at a true scale.

use aggrade_core::export::{write_pdf_to, write_png, PdfInfo, PdfWriter, SvgWriter};
use aggrade_core::layout::{page_stream, LayoutOptions, Orientation, Paper, PrintMeta};
use aggrade_core::rules::interpret;
use anyhow::{bail, Context};
use std::path::PathBuf;

/// Arguments of `aggrade export`.
#[derive(Debug, clap::Args)]
pub struct ExportArgs {
    /// Input file (project file or bed-table CSV).
    pub file: PathBuf,
    /// Section to print (by name); needed when the file holds more than one.
    #[arg(long)]
    pub section: Option<String>,
    /// Write a PDF here.
    #[arg(long, value_name = "OUT.pdf", required_unless_present_any = ["svg", "png"])]
    pub pdf: Option<PathBuf>,
    /// Write SVG here (one file per page: OUT.svg, or OUT-1.svg, OUT-2.svg … for several pages).
    #[arg(long, value_name = "OUT.svg")]
    pub svg: Option<PathBuf>,
    /// Write PNG here, true scale at --dpi (one file per page like --svg).
    #[arg(long, value_name = "OUT.png")]
    pub png: Option<PathBuf>,
    /// Resolution of the PNG, dots per inch (10 … 1200).
    #[arg(long, default_value = "200", value_name = "DPI")]
    pub dpi: f64,
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
    /// Also draw candidate boundaries the geologist rejected.
    #[arg(long)]
    pub show_rejected: bool,
    /// Leave out the lithofacies track (each bed's code; a suggested one grey with "?").
    #[arg(long)]
    pub no_facies: bool,
    /// Leave out the sample marks and their ids.
    #[arg(long)]
    pub no_sample_ids: bool,
    /// Mark photographs with their references.
    #[arg(long)]
    pub photos: bool,
    /// Add the bioturbation-index track (0-6, Taylor & Goldring 1993).
    #[arg(long)]
    pub bioturbation: bool,
    /// Mark trace and body fossils with their names.
    #[arg(long)]
    pub fossils: bool,
    #[command(flatten)]
    pub rules: super::rules_args::RulesArgs,
}

impl ExportArgs {
    /// Layout options with the field-record marks the flags ask for, the rest at their defaults.
    fn record_options(&self) -> LayoutOptions {
        LayoutOptions {
            show_facies: !self.no_facies,
            show_sample_ids: !self.no_sample_ids,
            show_photos: self.photos,
            show_bioturbation: self.bioturbation,
            show_fossils: self.fossils,
            ..Default::default()
        }
    }
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

/// Run `aggrade export`.
pub fn run(args: &ExportArgs) -> anyhow::Result<()> {
    if args.pdf.is_none() && args.svg.is_none() && args.png.is_none() {
        bail!("nothing to write: give --pdf OUT.pdf, --svg OUT.svg and/or --png OUT.png");
    }
    let scale = parse_scale(&args.scale)?;
    let project = super::load_input(&args.file)?;
    let section = super::one_section(&project, &args.file, args.section.as_deref())?;
    // The project's rule parameters (with --params laid over them), as `aggrade interpret` uses.
    let params = args.rules.resolve(&project, &args.file)?;
    let interp = interpret(section, &params);
    let when = creation_time()?;
    let meta = PrintMeta {
        printed_on: aggrade_core::export::civil_date(when),
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
            ..args.record_options()
        };
        // Pages are laid out and written a group at a time: memory stays the same for a
        // section of any length.
        let mut p = page_stream(section, &interp, &opts, &meta);
        let info =
            PdfInfo { title: section.name.clone(), author: section.logged_by.clone(), creation_date: when };
        let file = std::fs::File::create(out).with_context(|| format!("cannot write {}", out.display()))?;
        let out_file = std::io::BufWriter::new(file);
        let written = if opts.paper == Paper::TallSingle {
            // One page as tall as the column: written as it is drawn, a few hundred beds at a
            // time, like the tall SVG.
            let (w_mm, h_mm) = p.page_size_mm();
            PdfWriter::new(out_file, &info).and_then(|mut pdf| {
                pdf.begin_page(w_mm, h_mm)?;
                p.next_in_pieces(|items| pdf.page_items(items)).unwrap_or(Ok(()))?;
                pdf.end_page()?;
                pdf.finish().map(|_| 1)
            })
        } else {
            write_pdf_to(out_file, p, &info)
        };
        let n = written.with_context(|| format!("cannot write {}", out.display()))?;
        eprintln!(
            "wrote {} ({} page{}, scale {})",
            out.display(),
            n,
            if n == 1 { "" } else { "s" },
            opts.scale_label()
        );
    }
    for (out, ext) in [(&args.svg, "svg"), (&args.png, "png")] {
        let Some(out) = out else { continue };
        let opts = LayoutOptions {
            scale_denominator: scale,
            paper: paper_for(Paper::TallSingle)?,
            orientation,
            show_rejected: args.show_rejected,
            ..args.record_options()
        };
        // One page laid out, written and dropped at a time; an SVG page is written as its
        // column is drawn, a few hundred beds at a time, so even one tall page stays small.
        let mut p = page_stream(section, &interp, &opts, &meta);
        let n = p.page_count();
        let (w_mm, h_mm) = p.page_size_mm();
        let stem = out.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_else(|| "page".into());
        for k in 0..n {
            let path =
                if n == 1 { out.clone() } else { out.with_file_name(format!("{stem}-{}.{ext}", k + 1)) };
            if ext == "png" {
                let Some(page) = p.next() else { break };
                let bytes = write_png(&page, args.dpi)?;
                std::fs::write(&path, bytes).with_context(|| format!("cannot write {}", path.display()))?;
            } else {
                let written = std::fs::File::create(&path).and_then(|f| {
                    let mut svg = SvgWriter::begin(std::io::BufWriter::new(f), w_mm, h_mm)?;
                    p.next_in_pieces(|items| svg.items(items)).unwrap_or(Ok(()))?;
                    svg.finish().map(drop)
                });
                written.with_context(|| format!("cannot write {}", path.display()))?;
            }
            eprintln!("wrote {}", path.display());
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn record_flags_choose_the_marks_printed() {
        #[derive(clap::Parser)]
        struct Cli {
            #[command(flatten)]
            args: ExportArgs,
        }
        let parse = |extra: &[&str]| {
            let mut argv = vec!["aggrade-export", "log.csv", "--pdf", "log.pdf"];
            argv.extend_from_slice(extra);
            <Cli as clap::Parser>::try_parse_from(argv).expect("flags parse").args.record_options()
        };
        let o = parse(&[]);
        assert!(o.show_facies && o.show_sample_ids, "facies and sample ids print by default");
        assert!(!o.show_photos && !o.show_bioturbation && !o.show_fossils, "the rest on request");
        let o = parse(&["--no-facies", "--no-sample-ids", "--photos", "--bioturbation", "--fossils"]);
        assert!(
            !o.show_facies && !o.show_sample_ids && o.show_photos && o.show_bioturbation && o.show_fossils
        );
    }

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
}
