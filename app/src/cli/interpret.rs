//! `aggrade interpret`: run the interpretation rules on one section and print a readable report
//! or one JSON object.

use super::long_lists;
use aggrade_core::analysis::bodies::censor_name;
use aggrade_core::model::{LengthUnit, Project, Section};
use aggrade_core::rules::facies::facies_of;
use aggrade_core::rules::{interpret_with, sensitivity, GrainProfile, Interpretation, Regime, RuleParams};
use anyhow::{bail, Context};
use serde::Serialize;
use std::fmt::Write as _;
use std::io::Write as _;
use std::path::{Path, PathBuf};

/// Arguments of `aggrade interpret`.
#[derive(Debug, clap::Args)]
pub struct InterpretArgs {
    /// Project file (.aggrade) or bed-table CSV.
    pub file: PathBuf,
    /// Name of the section to interpret (needed when the project holds several).
    #[arg(long, value_name = "NAME")]
    pub section: Option<String>,
    /// Print one JSON object (heights in metres) instead of the readable report.
    #[arg(long)]
    pub json: bool,
    /// Height of the moving window of the channel-body proportion curve, metres (default 10).
    #[arg(long = "window-m", value_name = "METRES", allow_negative_numbers = true)]
    pub window_m: Option<f64>,
    #[command(flatten)]
    pub rules: super::rules_args::RulesArgs,
    /// List every candidate boundary, also weak paleosol tops with no evidence beyond the soil.
    #[arg(long)]
    pub all_candidates: bool,
    /// Re-run the rules over the documented ranges of the key thresholds and report how often
    /// each candidate and each channel body comes out the same ("stability" in the JSON).
    #[arg(long)]
    pub sensitivity: bool,
}

/// Run `aggrade interpret`.
pub fn run(args: &InterpretArgs) -> anyhow::Result<()> {
    let project = super::load_input(&args.file)?;
    let section = super::one_section(&project, &args.file, args.section.as_deref())?;
    check_lengths(section, &args.file)?;
    let params = rule_params(args, &project)?;
    let mut result = interpret_with(section, &params, args.all_candidates);
    let runs =
        if args.sensitivity { Some(sensitivity::annotate(section, &params, &mut result)) } else { None };
    let mut out = std::io::BufWriter::new(std::io::stdout().lock());
    if args.json {
        // Streamed: the JSON of a long section runs to tens of megabytes, never held in memory.
        let json = InterpretJson { interpretation: &result, beds: BedsJson(section) };
        serde_json::to_writer_pretty(&mut out, &json).context("writing the interpretation as JSON")?;
        out.write_all(b"\n").context("writing to standard output")?;
    } else {
        out.write_all(report(section, &result, &params, runs).as_bytes())
            .context("writing to standard output")?;
    }
    out.flush().context("writing to standard output")?;
    Ok(())
}

/// What `aggrade interpret --json` prints: the interpretation's fields, then `beds`.
#[derive(Serialize)]
struct InterpretJson<'a> {
    #[serde(flatten)]
    interpretation: &'a Interpretation,
    beds: BedsJson<'a>,
}

/// The beds of the section, base first, written one by one as the JSON streams.
struct BedsJson<'a>(&'a Section);

/// One bed in the JSON: its id, base and top in metres above the section base, and the
/// lithofacies code in force. `facies` is null for a covered interval or a bed no row of the
/// suggestion table fits; `facies_suggested` is true when the code is only suggested (a
/// candidate for review, see docs/facies.md), false when the geologist gave it or there is none.
#[derive(Serialize)]
struct BedJson {
    id: u64,
    base: f64,
    top: f64,
    facies: Option<&'static str>,
    facies_suggested: bool,
}

impl Serialize for BedsJson<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        let mut height = 0.0;
        serializer.collect_seq(self.0.beds.iter().map(|b| {
            let base = height;
            height += b.thickness_m;
            let f = facies_of(b);
            // Heights are sums of thicknesses: rounded to the micrometre, so 3.65 is not written
            // 3.6500000000000004 (no log is measured that finely).
            let micrometre = |m: f64| (m * 1e6).round() / 1e6;
            BedJson {
                id: b.id.0,
                base: micrometre(base),
                top: micrometre(height),
                facies: f.map(|(code, _)| code.code()),
                facies_suggested: f.is_some_and(|(_, suggested)| suggested),
            }
        }))
    }
}

/// Refuse lengths the rules cannot use. The readers validate files fully; this guards the rules
/// against any reader that lets such a value through.
fn check_lengths(section: &Section, file: &Path) -> anyhow::Result<()> {
    for (i, bed) in section.beds.iter().enumerate() {
        let at =
            || format!("{}: section {:?}, bed {} (id {})", file.display(), section.name, i + 1, bed.id.0);
        if !bed.has_usable_thickness() {
            bail!("{}: thickness_m is {}; valid is a number of metres > 0", at(), bed.thickness_m);
        }
        if let Some(r) = bed.base_relief_m.filter(|r| !(r.is_finite() && *r >= 0.0)) {
            bail!("{}: base_relief_m is {r}; valid is a number of metres ≥ 0, or no value", at());
        }
    }
    Ok(())
}

/// The project's parameters, then the parameter file, then `--window-m`; every invalid value is
/// reported.
fn rule_params(args: &InterpretArgs, project: &Project) -> anyhow::Result<RuleParams> {
    let mut params = args.rules.resolve(project, &args.file)?;
    if let Some(w) = args.window_m {
        params.window_m = w;
        let problems = params.problems();
        if !problems.is_empty() {
            bail!("invalid rule parameters (--window-m sets window_m): {}", problems.join("; "));
        }
    }
    Ok(params)
}

fn regime_name(r: Regime) -> &'static str {
    match r {
        Regime::Low => "low",
        Regime::High => "high",
        Regime::Undetermined => "undetermined",
    }
}

fn profile_name(p: GrainProfile) -> &'static str {
    match p {
        GrainProfile::FiningUpward => "fining-upward",
        GrainProfile::CoarseningUpward => "coarsening-upward",
        GrainProfile::Blocky => "blocky",
        GrainProfile::Unknown => "unknown (no grain sizes)",
    }
}

/// A carbonate stage 1–6 as I–VI.
fn roman(stage: u8) -> &'static str {
    ["?", "I", "II", "III", "IV", "V", "VI"].get(stage as usize).copied().unwrap_or("?")
}

fn fmt_proportion(p: Option<f64>) -> String {
    p.map_or("n/a (no exposure)".to_string(), |p| format!("{p:.2}"))
}

/// "5.00–13.00 ft": a stretch of section in the display unit.
fn span(base_m: f64, top_m: f64, unit: LengthUnit) -> String {
    format!("{:.2}–{:.2} {unit}", unit.from_metres(base_m), unit.from_metres(top_m))
}

/// The readable report: bodies, stacking, proportions, regimes, ranked candidates, the caution.
/// Every height, thickness and length in it, evidence included, is in the section's display unit
/// (the JSON keeps metres).
pub fn report(section: &Section, r: &Interpretation, params: &RuleParams, runs: Option<usize>) -> String {
    let mut s = String::new();
    let u = section.display_unit;
    // Writing to a String cannot fail; the results are ignored for that reason.
    let _ = writeln!(s, "Section {:?}: interpretation", r.section);
    if u != LengthUnit::Metre {
        let _ = writeln!(s, "(logged in {u}: heights are {u} above the section base; --json gives metres)");
    }
    let _ = writeln!(
        s,
        "Thickness {}, exposed {}, channel deposits {}; channel-body proportion {}",
        u.length(r.total_thickness_m),
        u.length(r.exposed_thickness_m),
        u.length(r.channel_thickness_m()),
        r.proportion_text()
    );

    let _ = writeln!(s, "\nChannel bodies ({}):", r.channel_bodies.len());
    if r.channel_bodies.is_empty() {
        let _ = writeln!(s, "  none");
    }
    for (k, b) in r.channel_bodies.iter().enumerate() {
        if let Some(gap) = long_lists::gap_line(k, r.channel_bodies.len(), "channel bodies", "--json") {
            let _ = writeln!(s, "{gap}");
        }
        if !long_lists::shown(k, r.channel_bodies.len()) {
            continue;
        }
        let grain = match (b.grain_finest, b.grain_coarsest) {
            (Some(f), Some(c)) if f == c => format!(", {}", c.class().name()),
            (Some(f), Some(c)) => format!(", {} to {}", f.class().name(), c.class().name()),
            _ => String::new(),
        };
        let censored = if b.is_censored() {
            let ends: Vec<&str> = b.censored.iter().map(|c| censor_name(*c)).collect();
            format!(" [{} not seen: thickness a minimum]", ends.join(" and "))
        } else {
            String::new()
        };
        let stable = sensitivity::stability_text(b.stability, b.flipped_by.as_ref())
            .map(|t| format!("; {t}"))
            .unwrap_or_default();
        let _ = writeln!(
            s,
            "  {}. {} ({}): {}, {} storey{}, {} amalgamated base{}{grain}, profile {}{censored}{stable}",
            k + 1,
            span(b.base_m, b.top_m, u),
            b.thickness_text_in(u),
            b.stacking.name(),
            b.stories,
            if b.stories == 1 { "" } else { "s" },
            b.amalgamated_bases,
            if b.amalgamated_bases == 1 { "" } else { "s" },
            profile_name(b.profile)
        );
        if let Some(h) = &b.style_hint {
            let style = match h.style {
                aggrade_core::rules::FluvialStyle::BraidedLike => "braided-like",
                aggrade_core::rules::FluvialStyle::MeanderingLike => "meandering-like",
            };
            let _ = writeln!(
                s,
                "     style hint: {style} ({})",
                h.evidence.iter().map(|e| e.worded(u).to_string()).collect::<Vec<_>>().join("; ")
            );
        }
    }

    let _ = writeln!(s, "\nPaleosol profiles ({}):", r.paleosols.len());
    if r.paleosols.is_empty() {
        let _ = writeln!(s, "  none");
    }
    for (k, p) in r.paleosols.iter().enumerate() {
        if let Some(gap) = long_lists::gap_line(k, r.paleosols.len(), "paleosol profiles", "--json") {
            let _ = writeln!(s, "{gap}");
        }
        if !long_lists::shown(k, r.paleosols.len()) {
            continue;
        }
        let mut why = vec![format!("logged {}", p.logged_development.name())];
        if let Some(st) = p.carbonate_stage {
            why.push(format!("carbonate stage {}", roman(st)));
        }
        for sign in &p.raised_by {
            why.push(sign.words().to_string());
        }
        if p.on_sandstone {
            why.push("on a sandstone top".to_string());
        }
        let _ = writeln!(
            s,
            "  {}. {}: {} maturity, {} bed{} ({})",
            k + 1,
            span(p.base_m, p.top_m, u),
            p.maturity.name(),
            p.beds.len(),
            if p.beds.len() == 1 { "" } else { "s" },
            why.join(", ")
        );
        let read: Vec<String> = p.evidence.iter().map(|e| e.worded(u)).collect();
        let _ = writeln!(s, "     read from: {}", read.join("; "));
    }

    let _ = writeln!(
        s,
        "\nChannel-body proportion by interval ({}):",
        if r.cuts_are_accepted {
            "between accepted boundaries"
        } else if r.cut_heights.is_empty() {
            "no accepted boundary and no strong candidate: the whole section"
        } else {
            "between strong candidates; none accepted yet"
        }
    );
    for (k, iv) in r.interval_proportions.iter().enumerate() {
        if let Some(gap) = long_lists::gap_line(k, r.interval_proportions.len(), "intervals", "--json") {
            let _ = writeln!(s, "{gap}");
        }
        if !long_lists::shown(k, r.interval_proportions.len()) {
            continue;
        }
        let _ = writeln!(s, "  {}: {}", span(iv.base_m, iv.top_m, u), fmt_proportion(iv.proportion));
    }

    let _ = writeln!(s, "\nAccommodation regime (one call per interval above):");
    for (k, a) in r.accommodation.iter().enumerate() {
        if let Some(gap) = long_lists::gap_line(k, r.accommodation.len(), "intervals", "--json") {
            let _ = writeln!(s, "{gap}");
        }
        if !long_lists::shown(k, r.accommodation.len()) {
            continue;
        }
        let _ =
            writeln!(s, "  {}: {} — {}", span(a.base_m, a.top_m, u), regime_name(a.regime), a.why.worded(u));
    }

    let _ = writeln!(
        s,
        "\nCandidate sequence boundaries, strongest first ({}):",
        r.sequence_boundary_candidates.len()
    );
    if r.sequence_boundary_candidates.is_empty() {
        let _ = writeln!(s, "  none");
    }
    if r.unlisted_candidates > 0 {
        let _ = writeln!(
            s,
            "  ({} weak paleosol top{} with no other evidence not listed; --all-candidates lists them)",
            r.unlisted_candidates,
            if r.unlisted_candidates == 1 { "" } else { "s" }
        );
    }
    for (k, c) in r.sequence_boundary_candidates.iter().enumerate() {
        if let Some(gap) =
            long_lists::gap_line(k, r.sequence_boundary_candidates.len(), "candidates", "--json")
        {
            let _ = writeln!(s, "{gap}");
        }
        if !long_lists::shown(k, r.sequence_boundary_candidates.len()) {
            continue;
        }
        let review = c.review.name();
        let named = match (&c.label, &c.surface_name) {
            (Some(l), _) => format!(" \"{l}\""),
            (None, Some(n)) => format!(" \"{n}\""),
            _ => String::new(),
        };
        let _ = writeln!(
            s,
            "  {}. {}{named}, {}, {}, {review}",
            k + 1,
            u.length(c.height_m),
            c.strength.name(),
            c.kind.name()
        );
        if let Some(t) = sensitivity::stability_text(c.stability, c.flipped_by.as_ref()) {
            let _ = writeln!(s, "     {t}");
        }
        for e in &c.evidence {
            let _ = writeln!(s, "     - {}", e.worded(u));
        }
        if !c.note.is_empty() {
            let _ = writeln!(s, "     note: {}", c.note);
        }
    }
    let _ = writeln!(
        s,
        "\nProportion curve: {} points, every {} {u} in a {} {u} window (use --json for the values)",
        r.proportion_curve.len(),
        u.length(params.curve_step_m).number_trimmed(),
        u.length(params.window_m).number_trimmed()
    );
    if let Some(n) = runs {
        let _ = writeln!(
            s,
            "Sensitivity: {n} runs, one key threshold moved at a time (lengths and the relief ratio \
             ×0.5, ×0.75, ×1.25, ×1.5; the regime proportion thresholds ±0.05, ±0.1; the facies-shift \
             class count ±1); \"stable\" counts the runs with the same outcome."
        );
    }
    let _ = writeln!(s, "Interpreted with {}.", params.summary());
    let _ = writeln!(s, "\n{}", r.caution);
    s
}
