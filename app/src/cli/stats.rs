//! `aggrade stats`: paleocurrent statistics and facies-transition analysis per section, and per
//! interval between sequence boundaries: accepted ones, or where none is accepted yet, the strong
//! candidates of the rules run with the project's parameters (`--params` overrides).

use aggrade_core::analysis::attitude::{check_bedding, check_reading};
use aggrade_core::analysis::markov::{
    analyse_sequence, facies_sequence, facies_state_set, lithology_sequence, TransitionAnalysis,
    TransitionParams,
};
use aggrade_core::analysis::paleocurrents::{
    beds_in_interval, circular_summary, flow_readings_of_beds, grouped, per_bed, rose_bins, CircularParams,
    CircularSummary, DataKind, GroupedPaleocurrents, ReadingGroup, RoseParams,
};
use aggrade_core::model::{LengthUnit, LithologyFamily, Section};
use serde_json::{json, Value};
use std::fmt::Write as _;
use std::path::PathBuf;

/// Arguments of `aggrade stats`.
#[derive(Debug, clap::Args)]
pub struct StatsArgs {
    /// Project file (.aggrade) or bed-table CSV.
    pub file: PathBuf,
    /// Only this section (by name; case-insensitive match is tried second).
    #[arg(long)]
    pub section: Option<String>,
    /// Print JSON instead of text. One section gives one object with "paleocurrents" and
    /// "transitions"; several give {"sections": [...]}. Azimuths and circular_std in degrees.
    #[arg(long)]
    pub json: bool,
    /// Treat paleocurrent readings as axes (0–180°) rather than flow directions.
    #[arg(long)]
    pub axial: bool,
    /// What the transition analysis counts: each lithology, broad lithology families (fines,
    /// sand, gravel, non-clastic), which helps short sections with many lithologies, or
    /// lithofacies codes (the geologist's, else the suggested one; see docs/facies.md).
    #[arg(long, value_enum, default_value_t = StateKind::Lithology)]
    pub states: StateKind,
    /// Rose-diagram bin width in degrees (must divide 360).
    #[arg(long, default_value_t = 30.0)]
    pub bin_width: f64,
    #[command(flatten)]
    pub rules: super::rules_args::RulesArgs,
}

/// The states of the facies-transition analysis.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum StateKind {
    Lithology,
    Family,
    /// Lithofacies codes (Miall 1978, 1996): the geologist's code, else the suggested one, else
    /// the bed's lithology name.
    Facies,
}

impl StateKind {
    /// What the states are, in words ("states_from" in the JSON).
    pub fn describe(self) -> &'static str {
        match self {
            StateKind::Lithology => "lithology",
            StateKind::Family => "lithology family",
            StateKind::Facies => "lithofacies code",
        }
    }
}

/// The state of each bed, `None` for covered intervals (they break the chain).
pub fn state_sequence(section: &Section, kind: StateKind) -> Vec<Option<&'static str>> {
    if kind == StateKind::Facies {
        return facies_sequence(section);
    }
    lithology_sequence(section)
        .into_iter()
        .map(|l| {
            l.map(|l| match kind {
                StateKind::Lithology | StateKind::Facies => l.name(),
                StateKind::Family => match l.family() {
                    LithologyFamily::Fines => "fines",
                    LithologyFamily::Sand => "sand",
                    LithologyFamily::Gravel => "gravel",
                    LithologyFamily::NonClastic => "non-clastic",
                    LithologyFamily::Covered => "covered",
                },
            })
        })
        .collect()
}

/// Statistics of one stretch of section (whole section or an interval).
struct Stretch {
    base_m: f64,
    top_m: f64,
    paleocurrents: Result<CircularSummary, String>,
    readings: Vec<f64>,
    transitions: Result<TransitionAnalysis, String>,
}

/// `bases` are the section's bed bases and `states` its state sequence, worked out once for all
/// the stretches of a section (each stretch takes its beds by bisection, so many intervals on a
/// long section stay linear).
fn stretch(
    section: &Section,
    bases: &[f64],
    states: &[Option<&'static str>],
    base_m: f64,
    top_m: f64,
    params: &CircularParams,
) -> Stretch {
    let beds = beds_in_interval(bases, base_m, top_m);
    let readings = flow_readings_of_beds(section, beds.clone(), params.kind);
    let seq: Vec<Option<&'static str>> = states[beds].to_vec();
    Stretch {
        base_m,
        top_m,
        paleocurrents: circular_summary(&readings, params).map_err(|e| e.to_string()),
        readings,
        transitions: analyse_sequence(&seq, &TransitionParams::default()).map_err(|e| e.to_string()),
    }
}

/// Cut heights inside the section, with its base and top, ascending and each once.
pub fn bounds_from_cuts(total_m: f64, cuts_m: &[f64]) -> Vec<f64> {
    let mut cuts: Vec<f64> = cuts_m.iter().copied().filter(|h| *h > 0.0 && *h < total_m).collect();
    cuts.sort_by(f64::total_cmp);
    cuts.dedup();
    let mut bounds = vec![0.0];
    bounds.extend(cuts);
    bounds.push(total_m);
    bounds
}

/// The unit a section's heights are written in: feet for a section logged in feet, else metres
/// (centimetres read poorly for heights of tens of metres). JSON stays in metres.
pub fn height_unit(section: &Section) -> LengthUnit {
    match section.display_unit {
        LengthUnit::Foot => LengthUnit::Foot,
        _ => LengthUnit::Metre,
    }
}

/// A count with its noun in the right number: "1 section", "0 sections", "3 readings".
pub fn counted(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

/// What the intervals are between, in words.
pub fn cuts_text(cuts_are_accepted: bool) -> &'static str {
    if cuts_are_accepted {
        "between accepted sequence boundaries"
    } else {
        "between strong candidate sequence boundaries; none accepted yet"
    }
}

fn paleocurrents_json(s: &Stretch, args: &StatsArgs, kind: DataKind) -> Value {
    match &s.paleocurrents {
        Ok(p) => {
            let rose = rose_bins(
                &s.readings,
                &RoseParams { bin_width_deg: args.bin_width, kind, ..Default::default() },
            )
            .ok()
            .map(|r| serde_json::to_value(r).unwrap_or(Value::Null));
            json!({
                "kind": p.kind,
                "n": p.n,
                "mean_azimuth": p.mean_azimuth_deg,
                "mean_resultant_length": p.mean_resultant_length,
                "circular_std": finite_or_null(p.circular_std_deg),
                "rayleigh_z": p.rayleigh_z,
                "rayleigh_p": p.rayleigh_p,
                "rayleigh_p_method": "Zar 1999",
                "rose": rose,
            })
        }
        Err(_) => Value::Null,
    }
}

/// A circular summary as JSON with the keys of "paleocurrents" (degrees), `null` when there is
/// none (fewer than two readings).
fn summary_json(s: &Option<CircularSummary>) -> Value {
    match s {
        Some(p) => json!({
            "kind": p.kind,
            "n": p.n,
            "mean_azimuth": p.mean_azimuth_deg,
            "mean_resultant_length": p.mean_resultant_length,
            "circular_std": finite_or_null(p.circular_std_deg),
            "rayleigh_z": p.rayleigh_z,
            "rayleigh_p": p.rayleigh_p,
        }),
        None => Value::Null,
    }
}

/// One group of paleocurrent readings: counts per indicator, one-way flow, two-way axes and
/// accretion surfaces, each summarised on its own.
fn group_json(g: &ReadingGroup) -> Value {
    let indicators: serde_json::Map<String, Value> =
        g.indicators.iter().map(|c| (c.indicator.to_string(), json!(c.n))).collect();
    json!({
        "base": g.base_m,
        "top": g.top_m,
        "indicators": indicators,
        "flow": { "n": g.flow_deg.len(), "azimuths": g.flow_deg, "summary": summary_json(&g.flow) },
        "axes": { "n": g.axes_deg.len(), "azimuths": g.axes_deg, "summary": summary_json(&g.axes) },
        "accretion_surfaces": {
            "n": g.accretion_deg.len(),
            "dip_directions": g.accretion_deg,
            "summary": summary_json(&g.accretion),
            "mean_dip": g.accretion_mean_dip_deg,
        },
    })
}

/// The paleocurrent groups of a section: whether and how the readings were restored to
/// horizontal, the whole section, each channel body of the rules and each interval.
fn groups_json(section: &Section, g: &Result<GroupedPaleocurrents, String>) -> Value {
    let g = match g {
        Ok(g) => g,
        Err(e) => return json!({ "error": e }),
    };
    let bed_id = |i: usize| section.beds.get(i).map(|b| b.id.0);
    json!({
        "tilt_corrected": g.restored_with.is_some(),
        "bedding": g.restored_with.map(|b| json!({ "dip": b.dip_deg, "dip_direction": b.dip_direction_deg })),
        "restoration": g.restored_with.map(|_| "rotation about the strike of bedding by its dip (docs/paleocurrents.md)"),
        "pooling": "one-way flow readings, two-way axes (parting lineation, groove casts) and accretion-surface dips are summarised apart; imbrication is turned downstream (azimuth + 180)",
        "section": group_json(&g.section),
        "bodies": g.bodies.iter().map(|b| {
            let mut v = group_json(&b.group);
            v["body_index"] = json!(b.body);
            v["first_bed_id"] = json!(bed_id(b.first_bed));
            v["last_bed_id"] = json!(bed_id(b.last_bed));
            v
        }).collect::<Vec<_>>(),
        "intervals": g.intervals.iter().map(group_json).collect::<Vec<_>>(),
    })
}

/// A group in one line: flow, axes and accretion surfaces with the readings per indicator.
fn group_brief(g: &ReadingGroup) -> String {
    let mut parts = Vec::new();
    parts.push(match &g.flow {
        Some(f) => format!(
            "flow n = {}, mean {}, R̄ {:.3}, Rayleigh p {}",
            f.n,
            f.mean_azimuth_deg.map(|m| format!("{m:.1}°")).unwrap_or_else(|| "none".into()),
            f.mean_resultant_length,
            fmt_p(f.rayleigh_p)
        ),
        None => match g.flow_deg[..] {
            [a] => format!("flow n = 1 ({a:.1}°)"),
            _ => format!("flow n = {}", g.flow_deg.len()),
        },
    });
    if !g.axes_deg.is_empty() {
        let mean = g.axes.as_ref().and_then(|a| a.mean_azimuth_deg);
        parts.push(match mean {
            Some(m) => format!("two-way axes n = {}, mean axis {m:.1}°–{:.1}°", g.axes_deg.len(), m + 180.0),
            None => match g.axes_deg[..] {
                [a] => format!("two-way axes n = 1 ({:.1}°–{:.1}°)", a % 180.0, a % 180.0 + 180.0),
                _ => format!("two-way axes n = {}", g.axes_deg.len()),
            },
        });
    }
    if !g.accretion_deg.is_empty() {
        let mut a = format!("accretion surfaces n = {} (kept apart from flow)", g.accretion_deg.len());
        if let Some(m) = g.accretion.as_ref().and_then(|s| s.mean_azimuth_deg) {
            a.push_str(&format!(", mean dip direction {m:.1}°"));
        } else if let [one] = g.accretion_deg[..] {
            a.push_str(&format!(", dip direction {one:.1}°"));
        }
        if let Some(d) = g.accretion_mean_dip_deg {
            a.push_str(&format!(", mean dip {d:.1}°"));
        }
        parts.push(a);
    }
    let counts: Vec<String> = g
        .indicators
        .iter()
        .map(|c| match c.indicator {
            "unspecified" => format!("{} with no indicator recorded", c.n),
            name => format!("{} {name}", c.n),
        })
        .collect();
    if !counts.is_empty() {
        parts.push(format!("readings: {}", counts.join(", ")));
    }
    parts.join("; ")
}

/// Whether the readings were restored to horizontal, as a line printed under the paleocurrent
/// mean it concerns.
fn restoration_line(g: &GroupedPaleocurrents) -> String {
    match g.restored_with {
        Some(b) => format!(
            "    readings restored to horizontal for bedding dipping {:.0}° toward {:03.0}° (rotation about strike)",
            b.dip_deg, b.dip_direction_deg
        ),
        None => "    readings as measured: no bedding attitude, so not restored to horizontal".to_string(),
    }
}

/// The paleocurrent groups of a section as text.
fn print_groups(out: &mut String, g: &GroupedPaleocurrents, unit: LengthUnit) -> std::fmt::Result {
    writeln!(out, "  Paleocurrent groups: whole section: {}", group_brief(&g.section))?;
    if !g.bodies.is_empty() {
        writeln!(out, "  Paleocurrents per channel body (bodies from the rules)")?;
    }
    for b in &g.bodies {
        writeln!(
            out,
            "    body {} ({:.2}–{:.2} {}): {}",
            b.body + 1,
            unit.from_metres(b.group.base_m),
            unit.from_metres(b.group.top_m),
            unit.name(),
            group_brief(&b.group)
        )?;
    }
    Ok(())
}

/// A p-value as "= 0.0123" or "< 0.0001".
fn fmt_p(p: f64) -> String {
    if p < 1e-4 {
        "< 0.0001".into()
    } else {
        format!("= {p:.4}")
    }
}

fn finite_or_null(v: f64) -> Value {
    if v.is_finite() {
        json!(v)
    } else {
        Value::Null
    }
}

fn transitions_json(s: &Stretch) -> Value {
    match &s.transitions {
        Ok(t) => json!({
            "states": t.states,
            "observed": t.observed,
            "expected": t.expected,
            "difference": t.difference,
            "transitions": t.transitions,
            "chi_square": t.chi_square,
            "g_square": t.g_square,
            "dof": t.dof,
            "p_value": t.p_value,
            "small_expected_cells": t.small_expected_cells,
            "preferred": t.preferred,
        }),
        Err(_) => Value::Null,
    }
}

fn notes(s: &Stretch) -> Vec<String> {
    let mut n = Vec::new();
    if let Err(e) = &s.paleocurrents {
        n.push(format!("paleocurrents: {e}"));
    }
    if let Err(e) = &s.transitions {
        n.push(format!("transitions: {e}"));
    }
    n
}

fn section_json(
    section: &Section,
    whole: &Stretch,
    intervals: &[Stretch],
    args: &StatsArgs,
    kind: DataKind,
) -> Value {
    json!({
        "section": section.name,
        "base": whole.base_m,
        "top": whole.top_m,
        "paleocurrents": paleocurrents_json(whole, args, kind),
        "transitions": transitions_json(whole),
        "notes": notes(whole),
        "states_from": args.states.describe(),
        // Where each bed's lithofacies code comes from, with the count of codes only suggested.
        "facies": serde_json::to_value(facies_state_set(section)).unwrap_or(Value::Null),
        "beds": per_bed(section, &CircularParams { kind, ..Default::default() })
            .unwrap_or_default()
            .iter()
            .map(|b| json!({
                "bed_index": b.bed_index,
                "bed_id": section.beds[b.bed_index].id.0,
                "base": b.base_m,
                "n": b.summary.n,
                "mean_azimuth": b.summary.mean_azimuth_deg,
                "mean_resultant_length": b.summary.mean_resultant_length,
                "circular_std": finite_or_null(b.summary.circular_std_deg),
                "rayleigh_z": b.summary.rayleigh_z,
                "rayleigh_p": b.summary.rayleigh_p,
            }))
            .collect::<Vec<_>>(),
        "intervals": intervals.iter().map(|s| json!({
            "base": s.base_m,
            "top": s.top_m,
            "paleocurrents": paleocurrents_json(s, args, kind),
            "transitions": transitions_json(s),
            "notes": notes(s),
        })).collect::<Vec<_>>(),
    })
}

/// One stretch as text: its paleocurrent summary (with `restored`, the line saying whether the
/// readings were restored to horizontal, right under the mean) and its facies transitions.
fn print_stretch(out: &mut String, s: &Stretch, restored: Option<&str>) -> std::fmt::Result {
    match &s.paleocurrents {
        Ok(p) => {
            let what = match p.kind {
                DataKind::Directional => "flow azimuths",
                DataKind::Axial => "axes",
            };
            let mean = p
                .mean_azimuth_deg
                .map(|m| format!("{m:.1}°"))
                .unwrap_or_else(|| "none (readings cancel)".into());
            writeln!(out, "  Paleocurrents ({what}, n = {})", p.n)?;
            writeln!(
                out,
                "    vector mean {mean}, mean resultant length {:.3}, circular s.d. {:.1}°",
                p.mean_resultant_length, p.circular_std_deg
            )?;
            writeln!(
                out,
                "    Rayleigh z = {:.3}, p {} (Zar 1999 approximation)",
                p.rayleigh_z,
                fmt_p(p.rayleigh_p)
            )?;
            if let Some(line) = restored {
                writeln!(out, "{line}")?;
            }
        }
        Err(_) if s.readings.is_empty() => writeln!(out, "  Paleocurrents: no paleocurrent readings")?,
        Err(_) if s.readings.len() == 1 => {
            writeln!(
                out,
                "  Paleocurrents: one reading only, too few for statistics (they need at least two)"
            )?;
            if let Some(line) = restored {
                writeln!(out, "{line}")?;
            }
        }
        Err(e) => writeln!(out, "  Paleocurrents: {e}")?,
    }
    match &s.transitions {
        // (m − 1)² − m < 1: two states (or fewer), no test to run; the counts are still shown.
        Ok(t) if t.dof < 1 => {
            let few_beds = t.transitions < 4;
            if few_beds {
                writeln!(
                    out,
                    "  Facies transitions: too few beds for a transition test ({} between {} states; a test needs at least three states)",
                    counted(t.transitions as usize, "transition", "transitions"),
                    t.states.len()
                )?;
            } else {
                writeln!(
                    out,
                    "  Facies transitions: only {} states alternate ({}), so there is no transition test (it needs at least three states)",
                    t.states.len(),
                    t.states.join(", ")
                )?;
            }
        }
        Ok(t) => {
            writeln!(out, "  Facies transitions (embedded Markov chain; repeats merged, covered intervals break the chain)")?;
            let w = t.states.iter().map(|s| s.len()).max().unwrap_or(4).max(8);
            let header: String = t.states.iter().map(|s| format!(" {s:>w$}")).collect();
            writeln!(out, "    observed (rows from, columns to)")?;
            writeln!(out, "    {:w$}{header}", "")?;
            for (name, row) in t.states.iter().zip(&t.observed) {
                let cells: String = row.iter().map(|v| format!(" {v:>w$}")).collect();
                writeln!(out, "    {name:>w$}{cells}")?;
            }
            writeln!(out, "    expected under quasi-independence (iterative proportional fitting)")?;
            writeln!(out, "    {:w$}{header}", "")?;
            for (name, row) in t.states.iter().zip(&t.expected) {
                let cells: String = row.iter().map(|v| format!(" {v:>w$.2}")).collect();
                writeln!(out, "    {name:>w$}{cells}")?;
            }
            let p = t.p_value.map(fmt_p).unwrap_or_else(|| "n/a (fewer than 3 states)".into());
            writeln!(
                out,
                "    chi-square = {:.2}, G² = {:.2}, dof = {}, p {p}",
                t.chi_square, t.g_square, t.dof
            )?;
            if t.small_expected_cells * 5 > t.cells {
                writeln!(
                out,
                    "    caution: {} of {} expected counts are below 5, so the chi-square p-value is only a rough guide",
                    t.small_expected_cells, t.cells
                )?;
            }
            if t.preferred.is_empty() {
                writeln!(out, "    no transition stands out from chance")?;
            }
            for pt in &t.preferred {
                writeln!(
                    out,
                    "    more often than chance: {} → {} (observed {}, expected {:.2}, residual {:.2})",
                    pt.from, pt.to, pt.observed, pt.expected, pt.standardised_residual
                )?;
            }
        }
        // Fewer than two states take part in a transition: a bed or two, or one lithology.
        Err(e) if e.starts_with("facies transition analysis (states)") => {
            writeln!(out, "  Facies transitions: too few beds for a transition test")?
        }
        Err(e) => writeln!(out, "  Facies transitions: {e}")?,
    }
    Ok(())
}

/// Write a command's output to stdout in one go. A reader that closes the pipe early
/// (`aggrade stats FILE | head`) is not an error worth a message, and never a panic.
pub(crate) fn emit_stdout(text: &str) -> anyhow::Result<()> {
    use std::io::Write;
    let mut stdout = std::io::stdout().lock();
    match stdout.write_all(text.as_bytes()).and_then(|()| stdout.flush()) {
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => Ok(()),
        other => Ok(other?),
    }
}

/// Run `aggrade stats`.
pub fn run(args: &StatsArgs) -> anyhow::Result<()> {
    let project = super::load_input(&args.file)?;
    let sections = super::named_or_all(&project, &args.file, args.section.as_deref())?;
    let kind = if args.axial { DataKind::Axial } else { DataKind::Directional };
    let params = CircularParams { kind, ..Default::default() };
    // Fail early, naming the bed, on readings outside 0–360°.
    for s in &sections {
        for (i, b) in s.beds.iter().enumerate() {
            if let Some(a) = b.azimuths().find(|a| !(0.0..=360.0).contains(a)) {
                anyhow::bail!(
                    "{}: section {:?}, bed {} (id {}), field paleocurrents: {a} is not an azimuth; valid values lie between 0 and 360 degrees",
                    args.file.display(),
                    s.name,
                    i + 1,
                    b.id.0
                );
            }
        }
    }
    // Dips and the bedding attitude too: the readings are restored to horizontal with them.
    for s in &sections {
        if let Some(b) = &s.bedding {
            if let Err(e) = check_bedding(b) {
                anyhow::bail!("{}: section {:?}, field bedding: {e}", args.file.display(), s.name);
            }
        }
        for (i, b) in s.beds.iter().enumerate() {
            if let Some(e) = b.paleocurrents.iter().find_map(|p| check_reading(p).err()) {
                anyhow::bail!(
                    "{}: section {:?}, bed {} (id {}), field paleocurrents: {e}",
                    args.file.display(),
                    s.name,
                    i + 1,
                    b.id.0
                );
            }
        }
    }
    if !(args.bin_width > 0.0 && (360.0 / args.bin_width - (360.0 / args.bin_width).round()).abs() < 1e-9) {
        anyhow::bail!(
            "--bin-width {}: the bin width must divide 360 degrees into whole bins (e.g. 10, 15, 30, 45)",
            args.bin_width
        );
    }
    let rules = args.rules.resolve(&project, &args.file)?;
    let mut values = Vec::new();
    let mut out = String::new();
    for s in &sections {
        let bases = s.base_heights_m();
        let states = state_sequence(s, args.states);
        let whole = stretch(s, &bases, &states, 0.0, s.total_thickness_m() + 1e-9, &params);
        let interp = aggrade_core::rules::interpret(s, &rules);
        let unit = height_unit(s);
        let bounds = bounds_from_cuts(s.total_thickness_m(), &interp.cut_heights);
        let groups = grouped(s, &interp, &bounds, &params).map_err(|e| e.to_string());
        let intervals: Vec<Stretch> = if bounds.len() > 2 {
            bounds
                .windows(2)
                .enumerate()
                .map(|(k, w)| {
                    // The top interval includes the section top.
                    let top = if k + 2 == bounds.len() { w[1] + 1e-9 } else { w[1] };
                    let mut st = stretch(s, &bases, &states, w[0], top, &params);
                    st.top_m = w[1];
                    st
                })
                .collect()
        } else {
            Vec::new()
        };
        if args.json {
            let mut v = section_json(s, &whole, &intervals, args, kind);
            v["top"] = json!(s.total_thickness_m());
            v["paleocurrent_groups"] = groups_json(s, &groups);
            v["intervals_between"] =
                json!(if interp.cuts_are_accepted { "accepted boundaries" } else { "strong candidates" });
            values.push(v);
        } else {
            writeln!(
                out,
                "Section {:?}: {}, {}, {}",
                s.name,
                unit.length(s.total_thickness_m()),
                counted(s.beds.len(), "bed", "beds"),
                counted(
                    s.beds.iter().map(|b| b.paleocurrents.len()).sum(),
                    "paleocurrent reading",
                    "paleocurrent readings"
                )
            )?;
            if args.states == StateKind::Facies {
                let f = facies_state_set(s);
                writeln!(
                    out,
                    "  Lithofacies codes: {} suggested (candidates not yet confirmed), {} given by the geologist, {} without a code (counted by lithology)",
                    f.suggested,
                    f.confirmed,
                    counted(f.uncoded, "bed", "beds")
                )?;
            }
            let restored = groups.as_ref().ok().map(restoration_line);
            print_stretch(&mut out, &whole, restored.as_deref())?;
            match &groups {
                Ok(g) => print_groups(&mut out, g, unit)?,
                Err(e) => writeln!(out, "  Paleocurrent groups: {e}")?,
            }
            let beds = per_bed(s, &params).unwrap_or_default();
            if !beds.is_empty() {
                writeln!(out, "  Paleocurrents per bed (beds with two or more readings)")?;
            }
            for b in beds {
                writeln!(
                    out,
                    "    bed {} (id {}, base {}): n = {}, mean {}, R̄ {:.3}, Rayleigh p {}",
                    b.bed_index + 1,
                    s.beds[b.bed_index].id.0,
                    unit.length(b.base_m),
                    b.summary.n,
                    b.summary.mean_azimuth_deg.map(|m| format!("{m:.1}°")).unwrap_or_else(|| "none".into()),
                    b.summary.mean_resultant_length,
                    fmt_p(b.summary.rayleigh_p)
                )?;
            }
            for (k, st) in intervals.iter().enumerate() {
                writeln!(
                    out,
                    "Interval {:.2}–{:.2} {} ({})",
                    unit.from_metres(st.base_m),
                    unit.from_metres(st.top_m),
                    unit.name(),
                    cuts_text(interp.cuts_are_accepted)
                )?;
                // The interval readings are restored as the section's are (said once, above).
                print_stretch(&mut out, st, None)?;
                if let Some(g) = groups.as_ref().ok().and_then(|g| g.intervals.get(k)) {
                    writeln!(out, "  Paleocurrent groups: {}", group_brief(g))?;
                }
            }
            writeln!(out)?;
        }
    }
    if args.json {
        let mut v = if values.len() == 1 { values.remove(0) } else { json!({ "sections": values }) };
        v["rules"] = json!(rules.summary());
        v["caution"] = json!(aggrade_core::REVIEW_CAUTION);
        writeln!(out, "{}", serde_json::to_string_pretty(&v)?)?;
    } else {
        writeln!(out, "Interpreted with {}.", rules.summary())?;
        writeln!(out, "{}", aggrade_core::REVIEW_CAUTION)?;
    }
    emit_stdout(&out)
}
