//! `aggrade bodies`: the channel-body table and proportion curve of a project as CSV, for
//! reservoir modellers, with a thickness summary (and decompacted proportions on request).

use super::long_lists;
use aggrade_core::analysis::bodies::{
    body_table_with_lateral, thickness_summary, unmatched_lateral, write_bodies_csv,
    write_interval_proportions_csv, write_proportion_curve_csv,
};
use aggrade_core::analysis::decompaction::{decompact_section, write_decompaction_csv, DecompactionParams};
use aggrade_core::rules::{interpret, Element, Interpretation};
use anyhow::Context;
use std::fmt::Write as _;
use std::path::{Path, PathBuf};

/// Arguments of `aggrade bodies`.
#[derive(Debug, clap::Args)]
pub struct BodiesArgs {
    /// Project file (.aggrade) or bed-table CSV.
    pub file: PathBuf,
    /// Write the body table here (section, base, top, thickness, storeys, stacking, grain range,
    /// censored ends, then width, beyond outcrop, width/thickness with its bound and geometry
    /// class where a width is recorded).
    #[arg(long)]
    pub csv: PathBuf,
    /// Also write the body table as JSON here (the same fields; heights in metres).
    #[arg(long)]
    pub json: Option<PathBuf>,
    /// Also write the moving-window channel-body proportion curve here.
    #[arg(long)]
    pub curve_csv: Option<PathBuf>,
    /// Also write the channel-body proportion of each interval here.
    #[arg(long)]
    pub interval_csv: Option<PathBuf>,
    /// Only this section.
    #[arg(long)]
    pub section: Option<String>,
    /// Depth of the section top below today's surface, metres: also report thicknesses and the
    /// channel-body proportion decompacted to the time the top was at the surface
    /// (Sclater & Christie 1980 porosity laws).
    #[arg(long, allow_negative_numbers = true)]
    pub burial_depth: Option<f64>,
    /// With --burial-depth: write each bed's present and decompacted thickness here.
    #[arg(long, requires = "burial_depth")]
    pub decompacted_csv: Option<PathBuf>,
    #[command(flatten)]
    pub rules: super::rules_args::RulesArgs,
}

fn create(path: &Path) -> anyhow::Result<std::io::BufWriter<std::fs::File>> {
    let f =
        std::fs::File::create(path).with_context(|| format!("{}: cannot create the file", path.display()))?;
    Ok(std::io::BufWriter::new(f))
}

/// Run `aggrade bodies`.
pub fn run(args: &BodiesArgs) -> anyhow::Result<()> {
    let project = super::load_input(&args.file)?;
    let sections = super::named_or_all(&project, &args.file, args.section.as_deref())?;
    if let Some(d) = args.burial_depth {
        if !(d.is_finite() && d >= 0.0) {
            anyhow::bail!("--burial-depth {d}: give the depth of the section top in metres, 0 or more");
        }
    }
    let params = args.rules.resolve(&project, &args.file)?;
    let mut out = String::new();
    let interpretations: Vec<Interpretation> = sections.iter().map(|s| interpret(s, &params)).collect();
    let rows = body_table_with_lateral(sections.iter().map(|s| &**s).zip(&interpretations));
    write_bodies_csv(&rows, create(&args.csv)?).with_context(|| args.csv.display().to_string())?;
    let unmatched: Vec<serde_json::Value> = sections
        .iter()
        .zip(&interpretations)
        .flat_map(|(s, i)| {
            unmatched_lateral(s, i).into_iter().map(|l| {
                let at = match s.beds.iter().position(|b| b.id == l.base_bed) {
                    Some(k) => format!("bed {}", k + 1),
                    None => "a bed no longer in the section".to_string(),
                };
                eprintln!(
                    "warning: section {:?}: the width recorded for the channel body based on {at} matches no body \
                     now (the rules start no body there); it is kept in the file but left out of the table",
                    s.name
                );
                serde_json::json!({"section": s.name, "base_bed": l.base_bed, "width": l.width_m,
                    "beyond_outcrop": l.beyond_outcrop, "note": l.note})
            })
        })
        .collect();
    if let Some(path) = &args.json {
        let doc = serde_json::json!({
            "caution": aggrade_core::REVIEW_CAUTION,
            "bodies": rows,
            "unmatched_lateral": unmatched,
        });
        let mut w = create(path)?;
        serde_json::to_writer_pretty(&mut w, &doc).with_context(|| path.display().to_string())?;
        std::io::Write::flush(&mut w).with_context(|| path.display().to_string())?;
    }
    if let Some(path) = &args.curve_csv {
        write_proportion_curve_csv(
            interpretations.iter().map(|i| (i.section.as_str(), i.proportion_curve.as_slice())),
            create(path)?,
        )
        .with_context(|| path.display().to_string())?;
    }
    if let Some(path) = &args.interval_csv {
        write_interval_proportions_csv(
            interpretations.iter().map(|i| (i.section.as_str(), i.interval_proportions.as_slice())),
            create(path)?,
        )
        .with_context(|| path.display().to_string())?;
    }

    writeln!(
        out,
        "{} channel bodies in {} section(s) written to {}",
        rows.len(),
        sections.len(),
        args.csv.display()
    )?;
    match thickness_summary(&rows) {
        Some(s) => {
            writeln!(
                out,
                "thickness (m): mean {:.3}, median {:.3}, P10 {:.3}, P50 {:.3}, P90 {:.3}, min {:.3}, max {:.3}",
                s.mean_m, s.median_m, s.p10_m, s.p50_m, s.p90_m, s.min_m, s.max_m
            )?;
            writeln!(
                out,
                "stacking: {} multi-storey, {} single-storey, {} undetermined",
                s.multi_story, s.single_story, s.undetermined
            )?;
            if s.censored > 0 {
                writeln!(
                    out,
                    "{} bod{} seen only in part (at the section base or top or a covered interval): their thickness is a minimum (marked in the censored column)",
                    s.censored,
                    if s.censored == 1 { "y" } else { "ies" }
                )?;
            }
            writeln!(
                out,
                "(percentiles by linear interpolation between order statistics, as numpy's default)"
            )?;
        }
        None => writeln!(out, "no channel bodies found")?,
    }
    let mut decompaction_rows = Vec::new();
    for (s, i) in sections.iter().zip(&interpretations) {
        let whole =
            i.channel_proportion.map(|p| format!("{p:.3}")).unwrap_or_else(|| "n/a (nothing exposed)".into());
        writeln!(out, "section {:?}: channel-body proportion {whole}", s.name)?;
        if let Some(b) = i.channel_proportion_bounds.filter(|_| i.has_cover()) {
            writeln!(
                out,
                "  of exposed thickness; {:.3} counting covered intervals as fines, {:.3} as channel deposits",
                b.covered_as_fines, b.covered_as_channel
            )?;
        }
        let n = i.interval_proportions.len();
        for (k, iv) in i.interval_proportions.iter().enumerate() {
            // A long section's intervals by their ends; every one goes to --interval-csv.
            if let Some(gap) = long_lists::gap_line(k, n, "intervals", "--interval-csv FILE") {
                writeln!(out, "{gap}")?;
            }
            if !long_lists::shown(k, n) {
                continue;
            }
            let p = iv.proportion.map(|p| format!("{p:.3}")).unwrap_or_else(|| "n/a".into());
            writeln!(out, "  {:.2}–{:.2} m: {p}", iv.base_m, iv.top_m)?;
        }
        if let Some(depth) = args.burial_depth {
            let flags: Vec<bool> = i.elements.iter().map(|e| *e == Element::ChannelDeposit).collect();
            let d = decompact_section(s, depth, Some(&flags), &DecompactionParams::default())
                .with_context(|| format!("{}: section {:?}", args.file.display(), s.name))?;
            let fmt = |p: Option<f64>| p.map(|p| format!("{p:.3}")).unwrap_or_else(|| "n/a".into());
            writeln!(
                out,
                "  decompacted from {depth} m burial: {:.2} m → {:.2} m; channel proportion {} → {}",
                d.present_thickness_m,
                d.decompacted_thickness_m,
                fmt(d.present_channel_proportion),
                fmt(d.decompacted_channel_proportion)
            )?;
            decompaction_rows.push((*s, d.clone()));
            if !d.not_decompacted.is_empty() {
                let names: Vec<&str> = d.not_decompacted.iter().map(|l| l.name()).collect();
                writeln!(out, "  kept at present thickness (no porosity law): {}", names.join(", "))?;
            }
            if let Some(a) = &d.covered_assumption {
                writeln!(out, "  {:.2} m covered: {a}", d.covered_m)?;
            }
        }
    }
    if let Some(path) = &args.decompacted_csv {
        // One file for all sections: each writer call adds its own header, so keep only the first.
        let mut bytes = Vec::new();
        for (k, (s, d)) in decompaction_rows.iter().enumerate() {
            let mut part = Vec::new();
            write_decompaction_csv(s, d, &mut part).with_context(|| path.display().to_string())?;
            let skip =
                if k == 0 { 0 } else { part.iter().position(|&c| c == b'\n').map_or(part.len(), |p| p + 1) };
            bytes.extend_from_slice(&part[skip..]);
        }
        std::fs::write(path, bytes).with_context(|| format!("{}: cannot write the file", path.display()))?;
    }
    writeln!(out, "{}", aggrade_core::REVIEW_CAUTION)?;
    super::stats::emit_stdout(&out)
}
