//! `aggrade panel`: a project's sections side by side, hung on a datum, to PDF or SVG.

use aggrade_core::export::{PdfInfo, PdfWriter, SvgWriter};
use aggrade_core::layout::{
    panel_layout_in_pieces, Datum, Item, LayoutOptions, Orientation, PanelError, PanelOptions, Paper,
    PrintMeta,
};
use aggrade_core::rules::{interpret, Interpretation};
use anyhow::{anyhow, bail, Context};
use std::fs::File;
use std::io::BufWriter;
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

/// The files a panel is written to as it is drawn, and the first error writing them.
struct PanelFiles {
    pdf: Option<PdfWriter<BufWriter<File>>>,
    svg: Option<SvgWriter<BufWriter<File>>>,
    failed: Option<anyhow::Error>,
}

impl PanelFiles {
    /// Write the next items of a page `size` (mm) to every file asked for, making the files with
    /// the first items; false (and the error kept) when a file cannot be written.
    fn put(&mut self, args: &PanelArgs, info: &PdfInfo, size: (f64, f64), items: &[Item]) -> bool {
        let written = self.try_put(args, info, size, items);
        if let Err(e) = written {
            self.failed.get_or_insert(e);
            return false;
        }
        true
    }

    fn try_put(
        &mut self,
        args: &PanelArgs,
        info: &PdfInfo,
        size: (f64, f64),
        items: &[Item],
    ) -> anyhow::Result<()> {
        if let Some(path) = &args.pdf {
            let cannot = || format!("{}: cannot write the PDF", path.display());
            if self.pdf.is_none() {
                let file = File::create(path).with_context(cannot)?;
                let mut pdf = PdfWriter::new(BufWriter::new(file), info).with_context(cannot)?;
                pdf.begin_page(size.0, size.1).with_context(cannot)?;
                self.pdf = Some(pdf);
            }
            if let Some(pdf) = self.pdf.as_mut() {
                pdf.page_items(items).with_context(cannot)?;
            }
        }
        if let Some(path) = &args.svg {
            let cannot = || format!("{}: cannot write the SVG", path.display());
            if self.svg.is_none() {
                let file = File::create(path).with_context(cannot)?;
                self.svg = Some(SvgWriter::begin(BufWriter::new(file), size.0, size.1).with_context(cannot)?);
            }
            if let Some(svg) = self.svg.as_mut() {
                svg.items(items).with_context(cannot)?;
            }
        }
        Ok(())
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
    let title = if opts.title.is_empty() { "Correlation panel".to_string() } else { opts.title.clone() };
    let info = PdfInfo { title, author: String::new(), creation_date: creation_date()? };
    // The panel is written as it is drawn, a piece at a time (a column's beds a few hundred at a
    // time), so a panel of many long sections never holds all its items or all its PDF content.
    // The files are made with the first piece, after the datum and the input were found good.
    let mut out = PanelFiles { pdf: None, svg: None, failed: None };
    let drawn = panel_layout_in_pieces(project, &interps, &opts, &meta, &mut |size, items| {
        out.put(args, &info, size, items)
    });
    let layout = drawn.map_err(|e| match e {
        PanelError::UnknownDatum { .. } => anyhow!("{file}: --datum: {e}"),
        other => anyhow!("{file}: {other}"),
    })?;
    if let Some(e) = out.failed.take() {
        return Err(e);
    }
    for note in &layout.notes {
        eprintln!("aggrade: note: {note}");
    }
    if let (Some(pdf), Some(path)) = (out.pdf.take(), &args.pdf) {
        pdf.finish().with_context(|| format!("{}: cannot write the PDF", path.display()))?;
        eprintln!("wrote {}", path.display());
    }
    if let (Some(svg), Some(path)) = (out.svg.take(), &args.svg) {
        svg.finish().with_context(|| format!("{}: cannot write the SVG", path.display()))?;
        eprintln!("wrote {}", path.display());
    }
    Ok(())
}
