//! Channel-body statistics across a project: the body table, thickness summary, proportions by
//! interval and CSV writers for modellers.
//!
//! Percentiles follow numpy's default (`method="linear"`, Hyndman & Fan 1996 type 7): for n
//! sorted values and fraction q, position h = (n − 1)·q, value x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]).

use crate::model::{GrainSize, Section};
use crate::rules::{Censor, ChannelBody, CurvePoint, IntervalProportion, Stacking};
use serde::Serialize;
use std::io::Write;

/// One row of the project-wide body table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BodyRow {
    pub section: String,
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    #[serde(rename = "thickness")]
    pub thickness_m: f64,
    pub storeys: usize,
    pub stacking: Stacking,
    pub grain_finest: Option<GrainSize>,
    pub grain_coarsest: Option<GrainSize>,
    /// Ends of the body not seen; when not empty the thickness is a minimum.
    pub censored: Vec<Censor>,
}

impl BodyRow {
    /// The thickness as shown: "≥ 4.20" for a censored body (a minimum), "4.20" otherwise.
    pub fn thickness_text(&self) -> String {
        let at_least = if self.censored.is_empty() { "" } else { "\u{2265} " };
        format!("{at_least}{:.2}", self.thickness_m)
    }

    /// The censored ends as written in tables: "base", "top", "base; top" or "".
    pub fn censored_text(&self) -> String {
        self.censored.iter().map(|c| censor_name(*c)).collect::<Vec<_>>().join("; ")
    }
}

/// "base" or "top".
pub fn censor_name(c: Censor) -> &'static str {
    match c {
        Censor::Base => "base",
        Censor::Top => "top",
    }
}

/// The body table of a project: every body of every section, sections in the order given,
/// bodies by base height within a section.
pub fn body_table<'a>(sections: impl IntoIterator<Item = (&'a str, &'a [ChannelBody])>) -> Vec<BodyRow> {
    let mut rows = Vec::new();
    for (name, bodies) in sections {
        let mut mine: Vec<BodyRow> = bodies
            .iter()
            .map(|b| BodyRow {
                section: name.to_string(),
                base_m: b.base_m,
                top_m: b.top_m,
                thickness_m: b.thickness_m,
                storeys: b.stories,
                stacking: b.stacking,
                grain_finest: b.grain_finest,
                grain_coarsest: b.grain_coarsest,
                censored: b.censored.clone(),
            })
            .collect();
        mine.sort_by(|a, b| a.base_m.total_cmp(&b.base_m));
        rows.extend(mine);
    }
    rows
}

/// Percentile by linear interpolation between order statistics (numpy's default). `q` in 0–1.
/// `None` for an empty slice or q outside 0–1. NaN values are ignored.
///
/// ```
/// use aggrade_core::analysis::bodies::percentile_linear;
/// assert_eq!(percentile_linear(&[1.0, 2.0, 3.0, 4.0], 0.5), Some(2.5));
/// ```
pub fn percentile_linear(values: &[f64], q: f64) -> Option<f64> {
    if !(0.0..=1.0).contains(&q) {
        return None;
    }
    let mut v: Vec<f64> = values.iter().copied().filter(|x| !x.is_nan()).collect();
    if v.is_empty() {
        return None;
    }
    v.sort_by(f64::total_cmp);
    let h = (v.len() - 1) as f64 * q;
    let lo = h.floor() as usize;
    let hi = (lo + 1).min(v.len() - 1);
    Some(v[lo] + (h - lo as f64) * (v[hi] - v[lo]))
}

/// Thickness statistics of a set of bodies.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ThicknessSummary {
    pub count: usize,
    pub multi_story: usize,
    pub single_story: usize,
    /// Bodies seen only in part with one storey: stacking undetermined.
    pub undetermined: usize,
    /// Bodies with an end not seen (their thickness is a minimum, so the statistics are too).
    pub censored: usize,
    pub mean_m: f64,
    pub median_m: f64,
    pub p10_m: f64,
    pub p50_m: f64,
    pub p90_m: f64,
    pub min_m: f64,
    pub max_m: f64,
}

/// Summary of body thicknesses; `None` when there are no bodies.
pub fn thickness_summary(rows: &[BodyRow]) -> Option<ThicknessSummary> {
    let t: Vec<f64> = rows.iter().map(|r| r.thickness_m).collect();
    let count = t.len();
    let p = |q| percentile_linear(&t, q);
    Some(ThicknessSummary {
        count,
        multi_story: rows.iter().filter(|r| r.stacking == Stacking::MultiStory).count(),
        single_story: rows.iter().filter(|r| r.stacking == Stacking::SingleStory).count(),
        undetermined: rows.iter().filter(|r| r.stacking == Stacking::Undetermined).count(),
        censored: rows.iter().filter(|r| !r.censored.is_empty()).count(),
        mean_m: t.iter().sum::<f64>() / count as f64,
        median_m: p(0.5)?,
        p10_m: p(0.1)?,
        p50_m: p(0.5)?,
        p90_m: p(0.9)?,
        min_m: p(0.0)?,
        max_m: p(1.0)?,
    })
}

/// Channel-body proportion in `base_m`–`top_m`: thickness of body intervals over exposed
/// thickness (covered intervals left out of both), `None` where nothing is exposed.
pub fn proportion_in_interval(
    section: &Section,
    bodies: &[ChannelBody],
    base_m: f64,
    top_m: f64,
) -> Option<f64> {
    let overlap = |a0: f64, a1: f64| (a1.min(top_m) - a0.max(base_m)).max(0.0);
    let mut exposed = 0.0;
    let mut channel = 0.0;
    let mut h = 0.0;
    for bed in &section.beds {
        let (b0, b1) = (h, h + bed.thickness_m);
        h = b1;
        if bed.is_covered() {
            continue;
        }
        exposed += overlap(b0, b1);
        channel += bodies
            .iter()
            .map(|body| (b1.min(body.top_m).min(top_m) - b0.max(body.base_m).max(base_m)).max(0.0))
            .sum::<f64>();
    }
    (exposed > 0.0).then(|| channel / exposed)
}

/// Proportion in each interval between consecutive heights (`bounds_m` sorted ascending,
/// starting at the section base and ending at its top).
pub fn proportions_by_interval(
    section: &Section,
    bodies: &[ChannelBody],
    bounds_m: &[f64],
) -> Vec<IntervalProportion> {
    bounds_m
        .windows(2)
        .map(|w| IntervalProportion {
            base_m: w[0],
            top_m: w[1],
            proportion: proportion_in_interval(section, bodies, w[0], w[1]),
        })
        .collect()
}

/// Why a CSV could not be written.
#[derive(Debug, thiserror::Error)]
pub enum CsvWriteError {
    #[error("writing CSV: {0}")]
    Csv(#[from] csv::Error),
    #[error("writing CSV: {0}")]
    Io(#[from] std::io::Error),
}

/// A text cell made safe for spreadsheets: text starting with `=`, `+`, `-`, `@`, a tab or a
/// carriage return would be read as a formula, so it gets a leading `'` (OWASP "CSV injection"
/// advice; common practice).
pub fn escape_text_cell(text: &str) -> String {
    match text.chars().next() {
        Some('=' | '+' | '-' | '@' | '\t' | '\r') => format!("'{text}"),
        _ => text.to_string(),
    }
}

fn fmt_m(v: f64) -> String {
    format!("{v:.3}")
}

fn fmt_opt(v: Option<f64>) -> String {
    v.map(|p| format!("{p:.4}")).unwrap_or_default()
}

/// Write the body table as CSV (heights and thicknesses in metres, 3 decimals). `censored` names
/// the ends not seen (`base`, `top`, `base;top`); where it is not empty the thickness is a
/// minimum.
pub fn write_bodies_csv<W: Write>(rows: &[BodyRow], out: W) -> Result<(), CsvWriteError> {
    let mut w = csv::Writer::from_writer(out);
    w.write_record([
        "section",
        "base_m",
        "top_m",
        "thickness_m",
        "storeys",
        "stacking",
        "grain_finest",
        "grain_coarsest",
        "censored",
    ])?;
    for r in rows {
        let stacking = r.stacking.name();
        let grain = |g: Option<GrainSize>| g.map(|g| escape_text_cell(&g.to_string())).unwrap_or_default();
        w.write_record([
            escape_text_cell(&r.section),
            fmt_m(r.base_m),
            fmt_m(r.top_m),
            fmt_m(r.thickness_m),
            r.storeys.to_string(),
            stacking.to_string(),
            grain(r.grain_finest),
            grain(r.grain_coarsest),
            r.censored.iter().map(|c| censor_name(*c)).collect::<Vec<_>>().join(";"),
        ])?;
    }
    w.flush()?;
    Ok(())
}

/// Write the moving-window proportion curve of one or more sections as CSV
/// (`section,height_m,proportion`; an empty proportion where the window has no exposure).
pub fn write_proportion_curve_csv<'a, W: Write>(
    curves: impl IntoIterator<Item = (&'a str, &'a [CurvePoint])>,
    out: W,
) -> Result<(), CsvWriteError> {
    let mut w = csv::Writer::from_writer(out);
    w.write_record(["section", "height_m", "proportion"])?;
    for (name, points) in curves {
        for p in points {
            w.write_record([escape_text_cell(name), fmt_m(p.height_m), fmt_opt(p.proportion)])?;
        }
    }
    w.flush()?;
    Ok(())
}

/// Write proportions by interval as CSV (`section,base_m,top_m,proportion`).
pub fn write_interval_proportions_csv<'a, W: Write>(
    intervals: impl IntoIterator<Item = (&'a str, &'a [IntervalProportion])>,
    out: W,
) -> Result<(), CsvWriteError> {
    let mut w = csv::Writer::from_writer(out);
    w.write_record(["section", "base_m", "top_m", "proportion"])?;
    for (name, list) in intervals {
        for p in list {
            w.write_record([escape_text_cell(name), fmt_m(p.base_m), fmt_m(p.top_m), fmt_opt(p.proportion)])?;
        }
    }
    w.flush()?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Bed, Lithology};
    use crate::rules::GrainProfile;

    fn body(base: f64, top: f64, stories: usize) -> ChannelBody {
        ChannelBody {
            base_m: base,
            top_m: top,
            thickness_m: top - base,
            stories,
            stacking: if stories > 1 { Stacking::MultiStory } else { Stacking::SingleStory },
            censored: Vec::new(),
            amalgamated_bases: stories.saturating_sub(1),
            grain_finest: None,
            grain_coarsest: None,
            profile: GrainProfile::Unknown,
            style_hint: None,
            storey_indices: Vec::new(),
            stability: None,
            flipped_by: None,
        }
    }

    #[test]
    fn percentiles_match_numpy_definition() {
        // numpy.percentile([1, 2, 3, 4], [10, 50, 90]) = 1.3, 2.5, 3.7 (linear interpolation;
        // worked by hand from h = (n − 1)q).
        let v = [4.0, 1.0, 3.0, 2.0];
        assert!((percentile_linear(&v, 0.1).expect("n>0") - 1.3).abs() < 1e-12);
        assert!((percentile_linear(&v, 0.5).expect("n>0") - 2.5).abs() < 1e-12);
        assert!((percentile_linear(&v, 0.9).expect("n>0") - 3.7).abs() < 1e-12);
        assert_eq!(percentile_linear(&[], 0.5), None);
        assert_eq!(percentile_linear(&v, 1.5), None);
    }

    #[test]
    fn table_summary_and_proportions() {
        let mut s = Section::new("Kestrel Bluff");
        for (t, l) in [
            (2.0, Lithology::Mudstone),
            (3.0, Lithology::Sandstone),
            (1.0, Lithology::Covered),
            (4.0, Lithology::Mudstone),
        ] {
            let id = s.next_bed_id();
            s.beds.push(Bed::new(id, t, l, None));
        }
        let bodies = vec![body(2.0, 5.0, 2)];
        let rows = body_table([("Kestrel Bluff", bodies.as_slice())]);
        assert_eq!(rows.len(), 1);
        let sum = thickness_summary(&rows).expect("one body");
        assert_eq!((sum.count, sum.multi_story, sum.single_story), (1, 1, 0));
        assert_eq!(sum.p90_m, 3.0);
        // 3 m of channel over 9 m exposed (the 1 m cover is left out).
        assert!((proportion_in_interval(&s, &bodies, 0.0, 10.0).expect("exposed") - 3.0 / 9.0).abs() < 1e-12);
        let by = proportions_by_interval(&s, &bodies, &[0.0, 5.0, 6.0, 10.0]);
        assert!((by[0].proportion.expect("exposed") - 0.6).abs() < 1e-12);
        assert_eq!(by[1].proportion, None);
        assert_eq!(by[2].proportion, Some(0.0));
        assert_eq!(thickness_summary(&[]), None);
    }

    #[test]
    fn csv_escapes_formula_looking_text() {
        let bodies = vec![body(0.0, 1.5, 1)];
        let rows = body_table([("=HYPERLINK(\"x\")", bodies.as_slice())]);
        let mut buf = Vec::new();
        write_bodies_csv(&rows, &mut buf).expect("in memory");
        let text = String::from_utf8(buf).expect("utf8");
        assert!(text.contains("\"'=HYPERLINK(\"\"x\"\")\""), "{text}");
        assert!(text.contains(",0.000,1.500,1.500,1,single-storey,,,"), "{text}");
        // A censored body: its ends are named and its thickness shown as a minimum.
        let mut cut = body(0.0, 1.5, 1);
        cut.stacking = Stacking::Undetermined;
        cut.censored = vec![Censor::Base, Censor::Top];
        let rows = body_table([("K", std::slice::from_ref(&cut))]);
        let mut buf = Vec::new();
        write_bodies_csv(&rows, &mut buf).expect("in memory");
        let text = String::from_utf8(buf).expect("utf8");
        assert!(text.contains("K,0.000,1.500,1.500,1,undetermined,,,base;top"), "{text}");
        assert_eq!(rows[0].thickness_text(), "\u{2265} 1.50");
        assert_eq!(escape_text_cell("-1"), "'-1");
        assert_eq!(escape_text_cell("Kestrel"), "Kestrel");
    }
}
