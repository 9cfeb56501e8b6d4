//! `aggrade panel`: a project's sections side by side, hung on a datum, to PDF or SVG.

use aggrade_core::export::{write_pdf, write_svg, PdfInfo};
use aggrade_core::layout::{
    panel_layout, Datum, LayoutOptions, Orientation, PanelError, PanelOptions, Paper, PrintMeta,
};
use aggrade_core::rules::{interpret, Interpretation};
use anyhow::{anyhow, bail, Context};
use std::path::PathBuf;

/// Arguments of `aggrade panel`.
#[derive(Debug, clap::Args)]
pub struct PanelArgs {
    /// Project file (.aggrade) or bed-table CSV.
    pub file: PathBuf,
    /// What to hang the sections on: `base`, a surface name (e.g. SB-1), the correlation label of
    /// accepted boundaries (set with `aggrade link`), or an accepted boundary (its surface name,
    /// or `accepted:<section>@<height>` when unnamed). A name is looked up before a label.
    #[arg(long, value_name = "NAME", default_value = "base")]
    pub datum: String,
    /// Write the panel as PDF to this file.
    #[arg(long, value_name = "OUT.pdf", conflicts_with = "svg", required_unless_present = "svg")]
    pub pdf: Option<PathBuf>,
    /// Write the panel as SVG to this file.
    #[arg(long, value_name = "OUT.svg")]
    pub svg: Option<PathBuf>,
    /// Vertical scale denominator N of 1:N (100: 1 m of section is 10 mm on paper).
    #[arg(long, value_name = "N", default_value_t = 100.0, allow_negative_numbers = true)]
    pub scale: f64,
    /// Horizontal scale denominator of the gaps between columns (default: a round value that fits).
    #[arg(long = "hscale", value_name = "N", allow_negative_numbers = true)]
    pub hscale: Option<f64>,
    /// Paper: a4, a3, letter or tall (one page sized to the panel).
    #[arg(long, value_name = "PAPER", default_value = "a3")]
    pub paper: String,
    /// Landscape orientation.
    #[arg(long)]
    pub landscape: bool,
    /// Title printed at the top (default "Correlation panel").
    #[arg(long, value_name = "TEXT")]
    pub title: Option<String>,
    /// Date printed in the header, e.g. 2026-12-01 (none by default, for reproducible output).
    #[arg(long = "printed-on", value_name = "DATE")]
    pub printed_on: Option<String>,
    #[command(flatten)]
    pub rules: super::rules_args::RulesArgs,
}

/// PDF creation date: `SOURCE_DATE_EPOCH` when set (reproducible-builds convention), else a fixed
/// 1970-01-01 so that the same input always gives the same bytes.
fn creation_date() -> anyhow::Result<i64> {
    match std::env::var("SOURCE_DATE_EPOCH") {
        Ok(v) => v.trim().parse::<i64>().map_err(|_| {
            anyhow!("SOURCE_DATE_EPOCH is {v:?}; valid is a whole number of seconds since 1970-01-01 UTC")
        }),
        Err(_) => Ok(0),
    }
}

/// Run `aggrade panel`.
pub fn run(args: &PanelArgs) -> anyhow::Result<()> {
    if !(args.scale.is_finite() && args.scale > 0.0) {
        bail!("--scale {}: valid is a positive number N of the scale 1:N, e.g. 100", args.scale);
    }
    if let Some(h) = args.hscale.filter(|h| !(h.is_finite() && *h > 0.0)) {
        bail!("--hscale {h}: valid is a positive number N of the horizontal scale 1:N, e.g. 25000");
    }
    let paper = Paper::parse(&args.paper)
        .ok_or_else(|| anyhow!("--paper {:?}: valid are a4, a3, letter, tall", args.paper))?;
    let project = &super::load_input(&args.file)?;
    let params = args.rules.resolve(project, &args.file)?;
    let interps: Vec<Interpretation> = project.sections.iter().map(|s| interpret(s, &params)).collect();
    let opts = PanelOptions {
        datum: Datum::parse(&args.datum),
        layout: LayoutOptions {
            scale_denominator: args.scale,
            paper,
            orientation: if args.landscape { Orientation::Landscape } else { Orientation::Portrait },
            ..LayoutOptions::default()
        },
        horizontal_scale_denominator: args.hscale,
        title: args.title.clone().unwrap_or_default(),
        ..PanelOptions::default()
    };
    let meta = PrintMeta {
        printed_on: args.printed_on.clone().unwrap_or_default(),
        subtitle: args.file.file_name().map(|f| f.to_string_lossy().into_owned()).unwrap_or_default(),
    };
    let file = args.file.display();
    let layout = panel_layout(project, &interps, &opts, &meta).map_err(|e| match e {
        PanelError::UnknownDatum { .. } => anyhow!("{file}: --datum: {e}"),
        other => anyhow!("{file}: {other}"),
    })?;
    for note in &layout.notes {
        eprintln!("aggrade: note: {note}");
    }
    if let Some(out) = &args.pdf {
        let info = PdfInfo {
            title: if opts.title.is_empty() { "Correlation panel".into() } else { opts.title.clone() },
            author: String::new(),
            creation_date: creation_date()?,
        };
        let bytes = write_pdf(std::slice::from_ref(&layout.page), &info);
        std::fs::write(out, bytes).with_context(|| format!("{}: cannot write the PDF", out.display()))?;
        eprintln!("wrote {}", out.display());
    }
    if let Some(out) = &args.svg {
        std::fs::write(out, write_svg(&layout.page))
            .with_context(|| format!("{}: cannot write the SVG", out.display()))?;
        eprintln!("wrote {}", out.display());
    }
    Ok(())
}
