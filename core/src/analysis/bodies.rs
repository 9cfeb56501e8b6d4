//! Channel-body statistics across a project: the body table (with each body's lateral data and
//! width/thickness class), thickness summary, proportions by interval and CSV writers for
//! modellers.
//!
//! Width/thickness classes: Friend, Slater & Williams (1979) call bodies with w/t < 15 ribbons
//! and wider ones sheets; Gibling (2006) splits the sheets into narrow (w/t 15–100) and broad
//! (w/t > 100). Aggrade uses Gibling's three classes. A width seen to run beyond the outcrop is a
//! minimum, and so is the thickness of a censored body; the ratio is then a bound and the class
//! says only what the bound allows (see [`Geometry`] and `docs/interpretation-rules.md`).
//!
//! Percentiles follow numpy's default (`method="linear"`, Hyndman & Fan 1996 type 7): for n
//! sorted values and fraction q, position h = (n − 1)·q, value x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]).

use crate::model::{BedId, BodyLateral, GrainSize, Section};
use crate::rules::{Censor, ChannelBody, CurvePoint, Interpretation, IntervalProportion, Stacking};
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
    /// Id of the body's lowest bed, the key of its lateral data (`None` when the table was built
    /// without the sections' beds).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub base_bed: Option<BedId>,
    /// Observed width across the outcrop, metres, from the section's lateral data.
    #[serde(rename = "width")]
    pub width_m: Option<f64>,
    /// True when the body runs on beyond the outcrop: the width is a minimum.
    pub beyond_outcrop: bool,
    /// Width/thickness ratio, its bound and class, where a width is recorded (written as the
    /// row's own `width_thickness`, `width_thickness_bound` and `geometry_class` keys).
    #[serde(flatten)]
    pub geometry: Option<Geometry>,
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

/// Ratio below which a body is a ribbon: w/t < 15 (Friend et al. 1979; Gibling 2006).
pub const RIBBON_MAX_RATIO: f64 = 15.0;
/// Ratio above which a sheet is broad: w/t > 100; from 15 to 100 it is narrow (Gibling 2006).
pub const NARROW_SHEET_MAX_RATIO: f64 = 100.0;

/// Channel-body geometry class by width/thickness ratio (Gibling 2006, refining the ribbons and
/// sheets of Friend et al. 1979).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum GeometryClass {
    /// w/t < 15.
    Ribbon,
    /// 15 ≤ w/t ≤ 100.
    NarrowSheet,
    /// w/t > 100.
    BroadSheet,
}

impl GeometryClass {
    /// The class of an exact ratio.
    pub fn of_ratio(ratio: f64) -> GeometryClass {
        if ratio < RIBBON_MAX_RATIO {
            GeometryClass::Ribbon
        } else if ratio <= NARROW_SHEET_MAX_RATIO {
            GeometryClass::NarrowSheet
        } else {
            GeometryClass::BroadSheet
        }
    }

    /// "ribbon", "narrow sheet", "broad sheet".
    pub fn name(self) -> &'static str {
        match self {
            GeometryClass::Ribbon => "ribbon",
            GeometryClass::NarrowSheet => "narrow sheet",
            GeometryClass::BroadSheet => "broad sheet",
        }
    }
}

/// What the ratio is: exact, or a bound because the width or the thickness is a minimum.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RatioBound {
    /// Width and thickness both seen whole.
    Exact,
    /// The width runs beyond the outcrop (a minimum) and the thickness is whole: the true ratio is
    /// at least this.
    Minimum,
    /// The width is whole and the body is censored (its thickness a minimum): the true ratio is at
    /// most this.
    Maximum,
    /// Both are minimums: the ratio bounds nothing.
    Unbounded,
}

impl RatioBound {
    /// "exact", "minimum", "maximum", "unbounded".
    pub fn name(self) -> &'static str {
        match self {
            RatioBound::Exact => "exact",
            RatioBound::Minimum => "minimum",
            RatioBound::Maximum => "maximum",
            RatioBound::Unbounded => "unbounded",
        }
    }
}

/// The class a ratio allows: one class, a class or wider, a class or narrower, or none.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ClassReading {
    Is(GeometryClass),
    /// This class or a wider one (only `NarrowSheet`: narrow or broad sheet).
    AtLeast(GeometryClass),
    /// This class or a narrower one (only `NarrowSheet`: ribbon or narrow sheet).
    AtMost(GeometryClass),
    /// Any class.
    Undetermined,
}

impl ClassReading {
    /// What a ratio of the given bound allows.
    pub fn of(ratio: f64, bound: RatioBound) -> ClassReading {
        use GeometryClass::*;
        let c = GeometryClass::of_ratio(ratio);
        match (bound, c) {
            (RatioBound::Exact, c) => ClassReading::Is(c),
            // At least the ratio: nothing is wider than a broad sheet, and a minimum under 15
            // allows every class.
            (RatioBound::Minimum, BroadSheet) => ClassReading::Is(BroadSheet),
            (RatioBound::Minimum, NarrowSheet) => ClassReading::AtLeast(NarrowSheet),
            (RatioBound::Minimum, Ribbon) => ClassReading::Undetermined,
            // At most the ratio: nothing is narrower than a ribbon, and a maximum over 100 allows
            // every class.
            (RatioBound::Maximum, Ribbon) => ClassReading::Is(Ribbon),
            (RatioBound::Maximum, NarrowSheet) => ClassReading::AtMost(NarrowSheet),
            (RatioBound::Maximum, BroadSheet) => ClassReading::Undetermined,
            (RatioBound::Unbounded, _) => ClassReading::Undetermined,
        }
    }

    /// The class as written in tables: "ribbon", "narrow sheet", "broad sheet", "at least narrow
    /// sheet" (narrow or broad), "at most narrow sheet" (ribbon or narrow), "undetermined".
    pub fn name(self) -> &'static str {
        match self {
            ClassReading::Is(c) => c.name(),
            ClassReading::AtLeast(GeometryClass::NarrowSheet) => "at least narrow sheet",
            ClassReading::AtMost(GeometryClass::NarrowSheet) => "at most narrow sheet",
            ClassReading::AtLeast(c) | ClassReading::AtMost(c) => c.name(),
            ClassReading::Undetermined => "undetermined",
        }
    }
}

impl Serialize for ClassReading {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}

/// Width/thickness of a body and the class it allows.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Geometry {
    /// Width over thickness as recorded (a bound unless `bound` is exact).
    pub width_thickness: f64,
    #[serde(rename = "width_thickness_bound")]
    pub bound: RatioBound,
    #[serde(rename = "geometry_class")]
    pub class: ClassReading,
}

impl Geometry {
    /// The geometry of a body `thickness_m` thick (a minimum when `thickness_is_minimum`) and
    /// `width_m` wide (a minimum when `beyond_outcrop`). `None` unless both are positive numbers.
    pub fn of(
        width_m: f64,
        beyond_outcrop: bool,
        thickness_m: f64,
        thickness_is_minimum: bool,
    ) -> Option<Geometry> {
        if !(width_m.is_finite() && width_m > 0.0 && thickness_m.is_finite() && thickness_m > 0.0) {
            return None;
        }
        let ratio = width_m / thickness_m;
        let bound = match (beyond_outcrop, thickness_is_minimum) {
            (false, false) => RatioBound::Exact,
            (true, false) => RatioBound::Minimum,
            (false, true) => RatioBound::Maximum,
            (true, true) => RatioBound::Unbounded,
        };
        Some(Geometry { width_thickness: ratio, bound, class: ClassReading::of(ratio, bound) })
    }

    /// The ratio as shown: "≥ 23.4" for a minimum, "≤ 23.4" for a maximum, "23.4" when exact,
    /// "23.4 (bounds nothing)" when both width and thickness are minimums.
    pub fn ratio_text(&self) -> String {
        let r = self.width_thickness;
        match self.bound {
            RatioBound::Exact => format!("{r:.1}"),
            RatioBound::Minimum => format!("\u{2265} {r:.1}"),
            RatioBound::Maximum => format!("\u{2264} {r:.1}"),
            RatioBound::Unbounded => format!("{r:.1} (bounds nothing)"),
        }
    }
}

/// Id of the lowest bed of a body (the base bed of its lowest storey).
pub fn body_base_bed(section: &Section, interp: &Interpretation, body: &ChannelBody) -> Option<BedId> {
    let storey = interp.storeys.get(*body.storey_indices.first()?)?;
    section.beds.get(storey.first_bed).map(|b| b.id)
}

/// The body table of a project with each body's lateral data: a body is matched to the
/// section's `body_lateral` record of its lowest bed. A record whose bed is no longer the base of
/// a body (the rules now start the body elsewhere, or the bed was deleted) matches nothing; see
/// [`unmatched_lateral`].
pub fn body_table_with_lateral<'a>(
    sections: impl IntoIterator<Item = (&'a Section, &'a Interpretation)>,
) -> Vec<BodyRow> {
    let mut rows = Vec::new();
    for (section, interp) in sections {
        let mut mine: Vec<BodyRow> = interp
            .channel_bodies
            .iter()
            .map(|b| {
                let base_bed = body_base_bed(section, interp, b);
                let lateral = base_bed.and_then(|id| section.body_lateral.iter().find(|l| l.base_bed == id));
                let mut row = row_of(&interp.section, b);
                row.base_bed = base_bed;
                if let Some(l) = lateral {
                    row.width_m = l.width_m;
                    row.beyond_outcrop = l.beyond_outcrop;
                    row.geometry = l
                        .width_m
                        .and_then(|w| Geometry::of(w, l.beyond_outcrop, b.thickness_m, b.is_censored()));
                }
                row
            })
            .collect();
        mine.sort_by(|a, b| a.base_m.total_cmp(&b.base_m));
        rows.extend(mine);
    }
    rows
}

/// The section's lateral records that match no body of the interpretation: kept in the file,
/// shown nowhere in the body table until a body starts at their bed again.
pub fn unmatched_lateral<'a>(section: &'a Section, interp: &Interpretation) -> Vec<&'a BodyLateral> {
    let bases: Vec<BedId> =
        interp.channel_bodies.iter().filter_map(|b| body_base_bed(section, interp, b)).collect();
    section.body_lateral.iter().filter(|l| !bases.contains(&l.base_bed)).collect()
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
        let mut mine: Vec<BodyRow> = bodies.iter().map(|b| row_of(name, b)).collect();
        mine.sort_by(|a, b| a.base_m.total_cmp(&b.base_m));
        rows.extend(mine);
    }
    rows
}

/// A body's row with no lateral data.
fn row_of(section: &str, b: &ChannelBody) -> BodyRow {
    BodyRow {
        section: section.to_string(),
        base_m: b.base_m,
        top_m: b.top_m,
        thickness_m: b.thickness_m,
        storeys: b.stories,
        stacking: b.stacking,
        grain_finest: b.grain_finest,
        grain_coarsest: b.grain_coarsest,
        censored: b.censored.clone(),
        base_bed: None,
        width_m: None,
        beyond_outcrop: false,
        geometry: None,
    }
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
/// minimum. The lateral columns are empty where no width is recorded: `width_m`,
/// `beyond_outcrop` (`true`: the width is a minimum), `width_thickness` (2 decimals),
/// `width_thickness_bound` (`exact`, `minimum`, `maximum`, `unbounded`) and `geometry_class`
/// ([`ClassReading::name`]).
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
        "width_m",
        "beyond_outcrop",
        "width_thickness",
        "width_thickness_bound",
        "geometry_class",
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
            r.width_m.map(fmt_m).unwrap_or_default(),
            if r.width_m.is_some() { r.beyond_outcrop.to_string() } else { String::new() },
            r.geometry.map(|g| format!("{:.2}", g.width_thickness)).unwrap_or_default(),
            r.geometry.map(|g| g.bound.name().to_string()).unwrap_or_default(),
            r.geometry.map(|g| g.class.name().to_string()).unwrap_or_default(),
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

    #[test]
    fn width_thickness_classes_follow_the_published_thresholds() {
        // Friend et al. 1979: ribbons w/t < 15, sheets above. Gibling 2006: narrow sheets
        // w/t 15–100, broad sheets > 100.
        use GeometryClass::*;
        for (ratio, class) in [
            (1.0, Ribbon),
            (14.99, Ribbon),
            (15.0, NarrowSheet),
            (60.0, NarrowSheet),
            (100.0, NarrowSheet),
            (100.01, BroadSheet),
            (900.0, BroadSheet),
        ] {
            assert_eq!(GeometryClass::of_ratio(ratio), class, "w/t {ratio}");
        }
        assert_eq!((RIBBON_MAX_RATIO, NARROW_SHEET_MAX_RATIO), (15.0, 100.0));
        // 120 m wide, 4 m thick, both seen whole: w/t 30, a narrow sheet.
        let g = Geometry::of(120.0, false, 4.0, false).expect("positive");
        assert_eq!(
            (g.width_thickness, g.bound, g.class),
            (30.0, RatioBound::Exact, ClassReading::Is(NarrowSheet))
        );
        assert_eq!((g.class.name(), g.ratio_text()), ("narrow sheet", "30.0".to_string()));
        assert_eq!(Geometry::of(0.0, false, 4.0, false), None);
        assert_eq!(Geometry::of(10.0, false, 0.0, false), None);
    }

    #[test]
    fn a_width_beyond_the_outcrop_gives_a_minimum_ratio_and_never_a_ribbon() {
        let class = |w: f64, beyond: bool, t: f64, censored: bool| {
            Geometry::of(w, beyond, t, censored).map(|g| g.class.name()).expect("positive")
        };
        // Width a minimum: w/t ≥ 40 is a narrow or a broad sheet; ≥ 8 says nothing (a ribbon
        // 8 wide could be a sheet 200 wide); ≥ 150 can only be a broad sheet.
        assert_eq!(class(160.0, true, 4.0, false), "at least narrow sheet");
        assert_eq!(class(32.0, true, 4.0, false), "undetermined");
        assert_eq!(class(600.0, true, 4.0, false), "broad sheet");
        assert_eq!(class(400.0, true, 4.0, false), "at least narrow sheet"); // ≥ 100: narrow (=100) or broad
                                                                             // Thickness a minimum (a censored body): the ratio is a maximum.
        assert_eq!(class(40.0, false, 4.0, true), "ribbon");
        assert_eq!(class(160.0, false, 4.0, true), "at most narrow sheet");
        assert_eq!(class(60.0, false, 4.0, true), "at most narrow sheet"); // ≤ 15: ribbon or narrow (=15)
        assert_eq!(class(600.0, false, 4.0, true), "undetermined");
        // Both minimums: no bound at all.
        assert_eq!(class(600.0, true, 4.0, true), "undetermined");
        assert_eq!(Geometry::of(160.0, true, 4.0, false).expect("positive").ratio_text(), "\u{2265} 40.0");
        assert_eq!(Geometry::of(160.0, false, 4.0, true).expect("positive").ratio_text(), "\u{2264} 40.0");
    }

    #[test]
    fn lateral_data_join_by_the_base_bed_and_a_moved_base_keeps_nothing() {
        use crate::model::{BodyLateral, Contact, GrainSize, WentworthClass};
        use crate::rules::{interpret, RuleParams};
        let mut s = Section::new("Tarn Gill");
        let sand = |t: f64| {
            let mut b = Bed::new(
                BedId(0),
                t,
                Lithology::Sandstone,
                Some(GrainSize::Class(WentworthClass::MediumSand)),
            );
            b.base_contact = Contact::Erosional;
            b.structures.push(crate::model::Structure::TroughCrossBedding);
            b
        };
        for b in [
            Bed::new(BedId(0), 3.0, Lithology::Mudstone, None),
            sand(4.0),
            Bed::new(BedId(0), 3.0, Lithology::Mudstone, None),
        ] {
            let id = s.next_bed_id();
            s.beds.push(Bed { id, ..b });
        }
        let base = s.beds[1].id;
        s.body_lateral.push(BodyLateral {
            base_bed: base,
            width_m: Some(120.0),
            beyond_outcrop: false,
            note: String::new(),
        });
        let r = interpret(&s, &RuleParams::default());
        assert_eq!(r.channel_bodies.len(), 1, "{:?}", r.channel_bodies);
        let rows = body_table_with_lateral([(&s, &r)]);
        assert_eq!((rows[0].base_bed, rows[0].width_m), (Some(base), Some(120.0)));
        let g = rows[0].geometry.expect("a width");
        assert_eq!((g.width_thickness, g.class.name()), (30.0, "narrow sheet"));
        assert!(unmatched_lateral(&s, &r).is_empty());
        let mut buf = Vec::new();
        write_bodies_csv(&rows, &mut buf).expect("in memory");
        let text = String::from_utf8(buf).expect("utf8");
        assert!(
            text.lines().next().expect("header").ends_with(
                ",censored,width_m,beyond_outcrop,width_thickness,width_thickness_bound,geometry_class"
            ),
            "{text}"
        );
        assert!(text.contains(",120.000,false,30.00,exact,narrow sheet"), "{text}");
        // A new sand bed under the old base: the body now starts there, the record matches nothing.
        let id = s.next_bed_id();
        s.beds.insert(1, Bed { id, ..sand(1.5) });
        s.beds[2].base_contact = Contact::Sharp;
        let r = interpret(&s, &RuleParams::default());
        let rows = body_table_with_lateral([(&s, &r)]);
        assert_eq!(
            (rows.len(), rows[0].base_bed, rows[0].width_m, rows[0].geometry),
            (1, Some(id), None, None)
        );
        assert_eq!(unmatched_lateral(&s, &r).len(), 1);
    }
}
