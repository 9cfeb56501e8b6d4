//! Correlation panel: a project's sections side by side, spaced by horizontal distance and hung
//! on a datum, with dashed tie lines between surfaces of the same name in neighbouring sections
//! and solid ones between accepted boundaries the geologist links with a correlation label.
//!
//! Choices, stated once here and printed on the page:
//! - **Horizontal positions** come from every section's `panel_position_m` when all sections have
//!   one; otherwise from coordinates when all sections have them, as the great-circle (haversine)
//!   distance from the first section listed in the file (so that section should sit at one end of
//!   the line); otherwise the columns stand in file order and the panel says it is not spaced by
//!   distance. Columns are ordered by position.
//! - **Horizontal scale**: the *gaps* between columns are drawn at 1:H of the distance between
//!   sections (column widths show grain size, not distance). H is chosen as the smallest round
//!   value that fits the paper unless the user gives one. A gap narrower than the minimum gap is
//!   widened to it and marked "n.t.s." (not to scale), so columns never overlap.
//! - **Vertical scale** is the true 1:N of the column, the same for every column. A section that
//!   lacks the datum is hung on its base and flagged in red above its column and in the notes.
//! - **Paper**: everything goes on one page. When the panel does not fit the chosen paper at the
//!   true vertical scale the page is lengthened (and widened when the columns need it) rather
//!   than continued, so that tie lines are never cut; the notes say so. [`super::Paper::TallSingle`]
//!   sizes the page to the panel, spacing the columns to scale where it can.
//! - **Tie lines** join neighbouring columns only. Accepted boundaries carrying the same
//!   correlation label (`ReviewDecision::link`) are tied first, with a solid line and the label
//!   written once at the middle of the tie; a label used twice in one section ties its lowest
//!   boundary (the others are noted), and a label on a boundary that is not accepted is kept in
//!   the file but not drawn (noted). Surfaces of the same name are then tied with a dashed line,
//!   unless the same two levels are already linked. Accepted boundaries with neither a surface
//!   name nor a label are paired in stratigraphic order when both sections have the same number
//!   of them; otherwise a note says they are not tied.

use super::column::{
    body_bracket, body_labels, boundary_style, BracketEnd, ColumnCtx, Track, Tracks, SCALE_BAND_MM,
    TITLE_BAND_MM,
};
use super::items::{Item, PtMm, RectMm, Rgba};
use super::legend::{draw_legend, legend_entries, legend_height_mm, LegendEntry};
use super::options::{LayoutOptions, PrintMeta};
use super::page::{Page, PageSegment};
use super::style::*;
use super::text::{fit_size, text, text_up, width, wrap};
use super::transform::HeightTransform;
use crate::model::{LatLon, ReviewState, Section};
use crate::rules::{Censor, Interpretation};
use crate::REVIEW_CAUTION;
use serde::Serialize;

/// Mean radius of the Earth, metres: R1 = (2a + b)/3 of the GRS 80 ellipsoid (IUGG; Moritz 2000,
/// "Geodetic Reference System 1980", J. Geodesy 74, 128–133).
pub const EARTH_MEAN_RADIUS_M: f64 = 6_371_008.8;

/// Width of the panel's own interpretation strip right of each column (channel bodies, surface
/// and boundary labels, interval proportions), mm.
pub const STRIP_MM: f64 = 15.0;
/// Height of the block above each column with its name, position, datum and proportion, mm.
const HEAD_MM: f64 = 15.0;
/// Height of the page header, mm.
const HEADER_MM: f64 = 21.0;
/// Padding between blocks, mm.
const PAD_MM: f64 = 3.0;
/// Height of the key row for the panel's own lines, mm.
const KEY_ROW_MM: f64 = 6.0;
/// Text size of notes and the footer caution, pt.
const NOTE_PT: f64 = 6.0;
/// Line pitch of notes and caution, mm.
const NOTE_LINE_MM: f64 = 2.7;
/// Least vertical distance between two labels in the strip, mm.
const LABEL_PITCH_MM: f64 = 2.3;

/// Datum line across the columns that have the datum.
pub const DATUM_BLUE: Rgba = Rgba(0, 104, 180, 255);
/// Tie lines between named surfaces.
pub const TIE_VIOLET: Rgba = Rgba(96, 64, 150, 255);
/// Tie lines between accepted boundaries the geologist linked with a correlation label.
pub const LINK_TEAL: Rgba = Rgba(0, 131, 143, 255);
/// Width of a linked tie line, mm.
const LINK_LINE_MM: f64 = 0.5;
/// Flags on sections drawn without the datum, and gaps not to scale.
pub const FLAG_ORANGE: Rgba = Rgba(205, 85, 0, 255);

/// Round scale denominators the horizontal scale is chosen from (1-2-2.5-5 series).
const ROUND_DENOMINATORS: [f64; 22] = [
    100.0, 200.0, 250.0, 500.0, 1e3, 2e3, 2.5e3, 5e3, 1e4, 2e4, 2.5e4, 5e4, 1e5, 2e5, 2.5e5, 5e5, 1e6, 2e6,
    2.5e6, 5e6, 1e7, 2e7,
];

/// Great-circle distance (m) between two points on a sphere of the Earth's mean radius, by the
/// haversine formula: d = 2R·asin(√(sin²(Δφ/2) + cos φ1 cos φ2 sin²(Δλ/2))). The sphere differs
/// from the ellipsoid by up to about 0.5 %, ample for spacing columns.
///
/// ```
/// use aggrade_core::layout::panel::haversine_m;
/// use aggrade_core::model::LatLon;
/// // A quarter of a meridian: π/2 · R (computed).
/// let d = haversine_m(LatLon { lat_deg: 0.0, lon_deg: 10.0 }, LatLon { lat_deg: 90.0, lon_deg: 10.0 });
/// assert!((d - std::f64::consts::FRAC_PI_2 * 6_371_008.8).abs() < 1e-6);
/// ```
pub fn haversine_m(a: LatLon, b: LatLon) -> f64 {
    let (p1, p2) = (a.lat_deg.to_radians(), b.lat_deg.to_radians());
    let dp = p2 - p1;
    let dl = (b.lon_deg - a.lon_deg).to_radians();
    let h = (dp / 2.0).sin().powi(2) + p1.cos() * p2.cos() * (dl / 2.0).sin().powi(2);
    // Rounding can push h a hair past 1 for antipodal points.
    2.0 * EARTH_MEAN_RADIUS_M * h.clamp(0.0, 1.0).sqrt().asin()
}

/// Where the horizontal positions of the columns came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum PositionSource {
    /// Every section's `panel_position_m`.
    PanelPosition,
    /// Haversine distance from the first section listed, from every section's coordinates.
    Coordinates,
    /// Neither is given for every section: file order, not spaced by distance.
    FileOrder,
}

/// Horizontal positions of a project's sections.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Positions {
    pub source: PositionSource,
    /// Position of each section along the panel, metres, in file order (0 for the first section
    /// with coordinates; the section's index for file order).
    pub distance_m: Vec<f64>,
    /// Section indices in panel order (by position; ties keep file order).
    pub order: Vec<usize>,
}

fn valid_coordinates(c: &LatLon) -> bool {
    c.lat_deg.is_finite() && c.lon_deg.is_finite() && c.lat_deg.abs() <= 90.0 && c.lon_deg.abs() <= 360.0
}

/// Positions of the sections along the panel (see the module documentation for the rules).
pub fn panel_positions(sections: &[Section]) -> Positions {
    let given: Option<Vec<f64>> =
        sections.iter().map(|s| s.panel_position_m.filter(|p| p.is_finite())).collect();
    let coords: Option<Vec<LatLon>> =
        sections.iter().map(|s| s.coordinates.filter(valid_coordinates)).collect();
    let (source, distance_m) = match (given, coords) {
        (Some(d), _) if !sections.is_empty() => (PositionSource::PanelPosition, d),
        (_, Some(c)) if !c.is_empty() => {
            (PositionSource::Coordinates, c.iter().map(|p| haversine_m(c[0], *p)).collect())
        }
        _ => (PositionSource::FileOrder, (0..sections.len()).map(|i| i as f64).collect()),
    };
    let mut order: Vec<usize> = (0..sections.len()).collect();
    order.sort_by(|&a, &b| distance_m[a].total_cmp(&distance_m[b]).then(a.cmp(&b)));
    Positions { source, distance_m, order }
}

/// What the panel is hung on.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub enum Datum {
    /// Each section's base (0 m).
    Base,
    /// A named surface (`Bed::base_surface`), an accepted boundary's correlation label, or an
    /// accepted sequence boundary by its marker name (see [`section_markers`] and [`find_marker`]).
    Named(String),
}

impl Datum {
    /// `base` (any case) for the section base, anything else for a marker name.
    pub fn parse(text: &str) -> Datum {
        let t = text.trim();
        if t.eq_ignore_ascii_case("base") {
            Datum::Base
        } else {
            Datum::Named(t.to_string())
        }
    }

    /// As printed in the header.
    pub fn label(&self) -> String {
        match self {
            Datum::Base => "section base".to_string(),
            Datum::Named(n) => n.clone(),
        }
    }
}

/// A named level in a section that the panel can hang on or tie between.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Marker {
    /// The surface's name; for an accepted boundary on an unnamed bed boundary,
    /// `accepted:<section>@<height, m, 2 decimals>`.
    pub name: String,
    /// Height above the section base, m.
    pub height_m: f64,
    /// True when the geologist accepted a sequence boundary here.
    pub accepted: bool,
    /// True for an accepted boundary with neither a surface name nor a correlation label (tied by
    /// order, not by name).
    pub unnamed: bool,
    /// True when `name` is a surface name (`Bed::base_surface`).
    pub surface: bool,
    /// The correlation label of an accepted boundary (trimmed); `None` when it has none, or when
    /// a lower accepted boundary of the section already carries it.
    pub link: Option<String>,
}

/// The markers of one section and what the panel notes about them.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct SectionMarkers {
    /// Named surfaces and accepted boundaries, lowest first.
    pub markers: Vec<Marker>,
    /// Surface names that occur more than once (the lowest is used), in order met.
    pub repeated_names: Vec<String>,
    /// Correlation labels on more than one accepted boundary: (label, height of an unused one, m).
    pub repeated_links: Vec<(String, f64)>,
    /// Correlation labels on boundaries that are not accepted: (label, height, m); kept, not drawn.
    pub unaccepted_links: Vec<(String, f64)>,
}

/// Name given to an accepted boundary at an unnamed bed boundary.
pub fn accepted_marker_name(section: &str, height_m: f64) -> String {
    format!("accepted:{section}@{height_m:.2}")
}

/// Named surfaces and accepted boundaries of a section, lowest first. A surface name that occurs
/// twice keeps its lowest occurrence, and so does a correlation label; the others are listed for
/// a note, as are labels on boundaries that are not accepted.
pub fn section_markers(section: &Section) -> SectionMarkers {
    let ctx_bases = bases_m(section);
    let mut out = SectionMarkers::default();
    for (i, bed) in section.beds.iter().enumerate() {
        let decision = section.decision_for(bed.id);
        let accepted = decision.is_some_and(|d| d.state == ReviewState::Accepted);
        let label = decision.and_then(|d| d.link_label());
        let surface = bed.base_surface.as_ref().map(|s| s.name.trim()).filter(|n| !n.is_empty());
        let h = ctx_bases[i];
        if let (Some(l), false) = (label, accepted) {
            out.unaccepted_links.push((l.to_string(), h));
        }
        let mut link = label.filter(|_| accepted).map(str::to_string);
        if let Some(l) = &link {
            if out.markers.iter().any(|m| m.link.as_deref() == Some(l.as_str())) {
                out.repeated_links.push((l.clone(), h));
                link = None;
            }
        }
        let labelled = accepted && label.is_some();
        let (name, unnamed) = match (surface, accepted) {
            (Some(n), _) => (n.to_string(), false),
            (None, true) => (accepted_marker_name(&section.name, h), !labelled),
            (None, false) => continue,
        };
        if out.markers.iter().any(|m| m.name == name) {
            out.repeated_names.push(name);
            continue;
        }
        out.markers.push(Marker { name, height_m: h, accepted, unnamed, surface: surface.is_some(), link });
    }
    out
}

/// Base height of every bed (m), counting bad thicknesses as zero as the column drawing does.
fn bases_m(section: &Section) -> Vec<f64> {
    let mut h = 0.0;
    section
        .beds
        .iter()
        .map(|b| {
            let base = h;
            if b.thickness_m.is_finite() && b.thickness_m > 0.0 {
                h += b.thickness_m;
            }
            base
        })
        .collect()
}

/// The marker a datum names in a section: a surface or marker name first, then a correlation
/// label, each exact first and then ignoring ASCII case.
pub fn find_marker<'m>(markers: &'m [Marker], name: &str) -> Option<&'m Marker> {
    let link_is = |m: &Marker, exact: bool| {
        m.link.as_deref().is_some_and(|l| if exact { l == name } else { l.eq_ignore_ascii_case(name) })
    };
    markers
        .iter()
        .find(|m| m.name == name)
        .or_else(|| markers.iter().find(|m| m.name.eq_ignore_ascii_case(name)))
        .or_else(|| markers.iter().find(|m| link_is(m, true)))
        .or_else(|| markers.iter().find(|m| link_is(m, false)))
}

/// Choices for a correlation panel.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PanelOptions {
    pub datum: Datum,
    /// Vertical scale, paper, orientation, margin, whether rejected candidates are drawn.
    /// `show_interpretation` is ignored: the panel draws its own narrow interpretation strip.
    pub layout: LayoutOptions,
    /// N of the horizontal scale 1:N of the gaps between columns; `None` picks a round value
    /// that fits the paper.
    pub horizontal_scale_denominator: Option<f64>,
    /// Narrowest gap between two columns, mm.
    pub min_gap_mm: f64,
    /// Printed at the top; empty gives "Correlation panel".
    pub title: String,
    /// Candidate sequence boundaries scoring below this are left off the panel (accepted ones
    /// are always drawn); by default the score above which the rules cut proportion intervals.
    pub min_candidate_score: f64,
}

impl Default for PanelOptions {
    fn default() -> Self {
        PanelOptions {
            datum: Datum::Base,
            layout: LayoutOptions { scale_denominator: 500.0, ..LayoutOptions::default() },
            horizontal_scale_denominator: None,
            min_gap_mm: 10.0,
            title: String::new(),
            min_candidate_score: crate::rules::RuleParams::default().boundary_interval_min_score,
        }
    }
}

/// Why a panel could not be laid out.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PanelError {
    #[error("the project holds no section to put on a panel")]
    NoSections,
    #[error("{sections} sections but {interpretations} interpretations were given; give one per section, in the same order")]
    InterpretationCount { sections: usize, interpretations: usize },
    #[error("no section has a surface, correlation label or accepted boundary named {datum:?}; valid datums are \"base\"{}", list_names(.available))]
    UnknownDatum { datum: String, available: Vec<String> },
    #[error("{what} must be a positive number, not {value}")]
    BadNumber { what: &'static str, value: f64 },
}

fn list_names(names: &[String]) -> String {
    names.iter().map(|n| format!(", {n:?}")).collect()
}

/// One column of the panel.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PanelColumn {
    /// Index into `Project::sections`.
    pub section_index: usize,
    pub name: String,
    /// Position along the panel, m (see [`Positions`]).
    pub distance_m: f64,
    /// Left edge of the column (its height axis), mm.
    pub x_mm: f64,
    /// Width of column plus strip, mm.
    pub width_mm: f64,
    /// Heights of this section ↔ y on the page.
    pub heights: HeightTransform,
    /// Height of the datum in this section, m; `None` when the section lacks it and is hung on
    /// its base (flagged).
    pub datum_height_m: Option<f64>,
    pub channel_proportion: Option<f64>,
}

/// A tie line between the same marker in two neighbouring columns.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TieLine {
    /// The correlation label for a linked tie; else the marker name (for unnamed accepted
    /// boundaries, the left one's name).
    pub name: String,
    /// True between accepted sequence boundaries.
    pub accepted: bool,
    /// True when the geologist linked the two boundaries with a correlation label (drawn solid,
    /// labelled); false for a tie by surface name or by order.
    pub linked: bool,
    /// Indices into [`PanelLayout::columns`].
    pub left: usize,
    pub right: usize,
    pub left_height_m: f64,
    pub right_height_m: f64,
    pub from: PtMm,
    pub to: PtMm,
}

/// The horizontal scale as drawn.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HorizontalScale {
    pub source: PositionSource,
    /// N of 1:N for the gaps; `None` for file order.
    pub denominator: Option<f64>,
    /// Gaps (index of the column left of the gap) widened to the minimum: not to scale.
    pub widened_gaps: Vec<usize>,
}

/// A laid-out panel: the page plus its geometry (for tests and the screen).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PanelLayout {
    pub page: Page,
    /// In panel order, left to right.
    pub columns: Vec<PanelColumn>,
    pub ties: Vec<TieLine>,
    pub horizontal: HorizontalScale,
    /// y (mm) of the datum on the page.
    pub datum_y_mm: f64,
    /// Notes printed on the page (sections without the datum, gaps not to scale, …).
    pub notes: Vec<String>,
    /// True when the page was made taller or wider than the chosen paper.
    pub page_enlarged: bool,
}

/// The panel as printed pages (always one page; see the module documentation).
pub fn panel_pages(
    project: &crate::model::Project,
    interps: &[Interpretation],
    opts: &PanelOptions,
    meta: &PrintMeta,
) -> Result<Vec<Page>, PanelError> {
    Ok(vec![panel_layout(project, interps, opts, meta)?.page])
}

/// The compact track layout of a panel column: the column's own tracks, narrowed so that four
/// columns fit across A3 landscape.
fn panel_tracks() -> Tracks {
    let mut x = 0.0;
    let mut take = |w: f64, gap: f64| {
        let t = Track { x_mm: x, w_mm: w };
        x += w + gap;
        t
    };
    let axis = take(11.0, 0.5);
    let lithology = take(super::column::GRAIN_MIN_WIDTH_MM + super::column::GRAIN_CLASS_STEP_MM * 11.0, 1.5);
    let structures = take(11.0, 0.5);
    let paleocurrents = take(8.0, 0.5);
    let paleosols = take(5.0, 0.5);
    Tracks {
        axis,
        lithology,
        structures,
        paleocurrents,
        paleosols,
        storeys: None,
        bodies: None,
        proportion: None,
        regime: None,
        boundary_labels: None,
        curves: super::curve_track::CurveTracks::none(x),
        width_mm: x,
    }
}

/// All marker names and correlation labels of a project, sorted, for the unknown-datum message.
fn all_marker_names(project: &crate::model::Project) -> Vec<String> {
    let mut v: Vec<String> = project
        .sections
        .iter()
        .flat_map(|s| {
            section_markers(s).markers.into_iter().flat_map(|m| std::iter::once(m.name).chain(m.link))
        })
        .collect();
    v.sort();
    v.dedup();
    v
}

/// Lay out the correlation panel. `interps[i]` is the interpretation of `project.sections[i]`.
pub fn panel_layout(
    project: &crate::model::Project,
    interps: &[Interpretation],
    opts: &PanelOptions,
    meta: &PrintMeta,
) -> Result<PanelLayout, PanelError> {
    let sections = &project.sections;
    if sections.is_empty() {
        return Err(PanelError::NoSections);
    }
    if interps.len() != sections.len() {
        return Err(PanelError::InterpretationCount {
            sections: sections.len(),
            interpretations: interps.len(),
        });
    }
    let v_scale = opts.layout.scale_denominator;
    if !(v_scale.is_finite() && v_scale > 0.0) {
        return Err(PanelError::BadNumber { what: "the vertical scale denominator", value: v_scale });
    }
    if let Some(h) = opts.horizontal_scale_denominator {
        if !(h.is_finite() && h > 0.0) {
            return Err(PanelError::BadNumber { what: "the horizontal scale denominator", value: h });
        }
    }
    let min_gap = if opts.min_gap_mm.is_finite() && opts.min_gap_mm > 0.0 { opts.min_gap_mm } else { 10.0 };
    let margin =
        if opts.layout.margin_mm.is_finite() { opts.layout.margin_mm.clamp(3.0, 40.0) } else { 12.0 };

    // Markers and the datum in each section.
    let markers: Vec<SectionMarkers> = sections.iter().map(section_markers).collect();
    let datum_h: Vec<Option<f64>> = match &opts.datum {
        Datum::Base => vec![Some(0.0); sections.len()],
        Datum::Named(name) => {
            markers.iter().map(|m| find_marker(&m.markers, name).map(|m| m.height_m)).collect()
        }
    };
    if let Datum::Named(name) = &opts.datum {
        if datum_h.iter().all(Option::is_none) {
            return Err(PanelError::UnknownDatum {
                datum: name.clone(),
                available: all_marker_names(project),
            });
        }
    }

    let positions = panel_positions(sections);
    let tracks = panel_tracks();
    let slot_w = tracks.width_mm + STRIP_MM;
    let n = sections.len();
    let mut notes: Vec<String> = Vec::new();
    let datum_label = opts.datum.label();
    for &i in &positions.order {
        if datum_h[i].is_none() {
            notes.push(format!(
                "{}: has no {datum_label}; drawn hung on its base, which is NOT correlated with the datum.",
                sections[i].name
            ));
        }
        for r in &markers[i].repeated_names {
            notes.push(format!(
                "{}: surface {r:?} occurs more than once; the lowest is used.",
                sections[i].name
            ));
        }
        for (l, h) in &markers[i].repeated_links {
            notes.push(format!(
                "{}: correlation label {l:?} is on more than one accepted boundary; the lowest is tied, not the one at {h:.2} m.",
                sections[i].name
            ));
        }
        for (l, h) in &markers[i].unaccepted_links {
            notes.push(format!(
                "{}: correlation label {l:?} at {h:.2} m is on a boundary that is not accepted: kept, not drawn.",
                sections[i].name
            ));
        }
    }

    // Horizontal layout.
    let deltas: Vec<f64> = positions
        .order
        .windows(2)
        .map(|w| (positions.distance_m[w[1]] - positions.distance_m[w[0]]).max(0.0))
        .collect();
    let columns_w = n as f64 * slot_w;
    let gaps_for = |h: f64| -> Vec<f64> { deltas.iter().map(|d| (d * 1000.0 / h).max(min_gap)).collect() };
    let paper = opts.layout.page_size_mm();
    let (denominator, gaps) = match positions.source {
        PositionSource::FileOrder => (None, vec![min_gap * 1.5; deltas.len()]),
        _ => {
            let h = match (opts.horizontal_scale_denominator, paper) {
                (Some(h), _) => h,
                (None, Some((w, _))) => {
                    let room = w - 2.0 * margin - columns_w;
                    ROUND_DENOMINATORS
                        .iter()
                        .copied()
                        .find(|&h| gaps_for(h).iter().sum::<f64>() <= room + 1e-9)
                        .unwrap_or(ROUND_DENOMINATORS[ROUND_DENOMINATORS.len() - 1])
                }
                (None, None) => {
                    // Tall single page: the largest scale at which no gap needs widening.
                    let smallest = deltas.iter().copied().filter(|d| *d > 0.0).fold(f64::INFINITY, f64::min);
                    let want = if smallest.is_finite() { smallest * 1000.0 / min_gap } else { 1e4 };
                    ROUND_DENOMINATORS
                        .iter()
                        .rev()
                        .copied()
                        .find(|&h| h <= want)
                        .unwrap_or(ROUND_DENOMINATORS[0])
                }
            };
            (Some(h), gaps_for(h))
        }
    };
    let widened_gaps: Vec<usize> = match denominator {
        Some(h) => (0..deltas.len()).filter(|&k| deltas[k] * 1000.0 / h < min_gap - 1e-9).collect(),
        None => Vec::new(),
    };
    if positions.source == PositionSource::FileOrder {
        notes.push(
            "Columns stand in file order, NOT spaced by distance: not every section has a panel position or coordinates."
                .to_string(),
        );
    }
    if !widened_gaps.is_empty() {
        let list: Vec<String> = widened_gaps
            .iter()
            .map(|&k| {
                let (a, b) = (positions.order[k], positions.order[k + 1]);
                format!("{} \u{2013} {} ({})", sections[a].name, sections[b].name, fmt_distance(deltas[k]))
            })
            .collect();
        notes.push(format!(
            "Gaps widened to the {min_gap:.0} mm minimum, NOT to horizontal scale (n.t.s.): {}.",
            list.join("; ")
        ));
    }
    let panel_w = columns_w + gaps.iter().sum::<f64>();

    // Legend: rock entries of every column, then the panel's interpretation marks.
    let layout_opts = LayoutOptions { show_interpretation: false, ..opts.layout.clone() };
    let mut entries: Vec<LegendEntry> = Vec::new();
    for (s, it) in sections.iter().zip(interps) {
        let ctx = ColumnCtx::new(s, it, &layout_opts);
        entries.extend(legend_entries(&ctx));
        entries.extend(it.channel_bodies.iter().map(|b| LegendEntry::Body(b.stacking)));
        if it.channel_bodies.iter().any(|b| b.is_censored()) {
            entries.push(LegendEntry::CensoredBody);
        }
        entries.extend(
            it.sequence_boundary_candidates
                .iter()
                .filter(|c| shown(c, opts))
                .map(|c| LegendEntry::Boundary(c.review)),
        );
    }
    entries.sort_by_key(|e| e.sort_key());
    entries.dedup();

    // Vertical budget.
    let mm_per_m = 1000.0 / v_scale;
    let heights: Vec<(f64, f64)> = sections
        .iter()
        .zip(&datum_h)
        .map(|(s, d)| {
            let total: f64 =
                bases_m(s).last().copied().unwrap_or(0.0)
                    + s.beds
                        .last()
                        .map(|b| {
                            if b.thickness_m.is_finite() && b.thickness_m > 0.0 {
                                b.thickness_m
                            } else {
                                0.0
                            }
                        })
                        .unwrap_or(0.0);
            (total, d.unwrap_or(0.0))
        })
        .collect();
    let above_mm = heights.iter().map(|(t, d)| (t - d) * mm_per_m).fold(0.0, f64::max);
    let below_mm = heights.iter().map(|(_, d)| d * mm_per_m).fold(0.0, f64::max);

    let (paper_w, paper_h) = paper.unwrap_or((210.0, 297.0));
    let page_w = paper_w.max(panel_w + 2.0 * margin);
    let usable_w = page_w - 2.0 * margin;
    let legend_h = legend_height_mm(entries.len(), usable_w);
    let caution_lines = wrap(REVIEW_CAUTION, usable_w - 28.0, NOTE_PT);
    let header_h = HEADER_MM + if meta.subtitle.is_empty() { 0.0 } else { 3.0 };
    // Notes get their final wording below; the page-size note may add one line.
    let notes_budget = |notes: &[String]| -> f64 {
        let lines: usize = notes.iter().map(|n| wrap(n, usable_w, NOTE_PT).len()).sum();
        if lines == 0 {
            0.0
        } else {
            lines as f64 * NOTE_LINE_MM + 2.0
        }
    };
    let fixed_h = margin
        + header_h
        + legend_h
        + KEY_ROW_MM
        + HEAD_MM
        + TITLE_BAND_MM
        + PAD_MM
        + PAD_MM
        + SCALE_BAND_MM
        + caution_lines.len() as f64 * NOTE_LINE_MM
        + 4.0
        + margin;
    let mut enlarged = page_w > paper_w + 1e-9 && paper.is_some();
    let need_h = fixed_h + notes_budget(&notes) + above_mm + below_mm;
    let page_h = match paper {
        Some(_) if need_h <= paper_h => paper_h,
        // Room for the note that says the page was enlarged.
        Some(_) => {
            enlarged = true;
            need_h + 2.0 * NOTE_LINE_MM + 2.0
        }
        None => need_h,
    };
    if enlarged {
        notes.push(format!(
            "The panel does not fit {} at vertical {}: the page is enlarged to {:.0} \u{d7} {:.0} mm to keep the true scale.",
            opts.layout.paper.name(),
            opts.layout.scale_label(),
            page_w,
            page_h
        ));
    }

    let mut items: Vec<Item> = Vec::new();
    // Header.
    let y_header = margin;
    let hz = (denominator, widened_gaps.len(), deltas.len());
    draw_header(opts, meta, &positions, sections, hz, margin, page_w, header_h, &mut items);
    let mut y = y_header + header_h;
    draw_legend(&entries, margin, y, usable_w, &mut items);
    y += legend_h;
    let any_link = markers.iter().any(|m| m.markers.iter().any(|m| m.link.is_some()));
    draw_key(margin, y, any_link, &mut items);
    y += KEY_ROW_MM;
    let y_heads = y;
    let y_titles = y_heads + HEAD_MM;
    let y_col_top = y_titles + TITLE_BAND_MM + PAD_MM;
    let datum_y = y_col_top + above_mm;
    let y_col_bottom = datum_y + below_mm;
    let y_scale = y_col_bottom + PAD_MM;

    // Columns.
    let mut columns: Vec<PanelColumn> = Vec::new();
    let mut segments: Vec<PageSegment> = Vec::new();
    let mut x = margin;
    let d0 = positions.order.first().map(|&i| positions.distance_m[i]).unwrap_or(0.0);
    for (k, &i) in positions.order.iter().enumerate() {
        let s = &sections[i];
        let it = &interps[i];
        let mut ctx = ColumnCtx::new(s, it, &layout_opts);
        ctx.tracks = tracks;
        let hang = datum_h[i].unwrap_or(0.0);
        let heights_t = HeightTransform::new(datum_y, hang, v_scale);
        let mut boxes = Vec::new();
        ctx.draw_titles(x, y_titles, &mut items);
        draw_strip_titles(x + tracks.width_mm, y_titles, &mut items);
        ctx.draw_range(0.0, ctx.total_m, x, &heights_t, &mut items, &mut boxes);
        draw_strip(
            &ctx,
            &markers[i].markers,
            &opts.datum,
            datum_h[i].is_some(),
            opts,
            x,
            &heights_t,
            &mut items,
        );
        ctx.draw_scale(x, y_scale, &mut items);
        let distance = positions.distance_m[i] - d0;
        draw_head(
            s,
            it,
            positions.source,
            distance,
            &datum_label,
            datum_h[i],
            x,
            y_heads,
            slot_w,
            &mut items,
        );
        segments.push(PageSegment {
            base_m: 0.0,
            top_m: ctx.total_m,
            x_mm: x,
            heights: heights_t,
            bed_boxes: boxes,
        });
        columns.push(PanelColumn {
            section_index: i,
            name: s.name.clone(),
            distance_m: distance,
            x_mm: x,
            width_mm: slot_w,
            heights: heights_t,
            datum_height_m: datum_h[i],
            channel_proportion: it.channel_proportion,
        });
        if k + 1 < n {
            let gap = gaps[k];
            if widened_gaps.contains(&k) {
                let label = "n.t.s.";
                let size = fit_size(label, gap - 1.0, SMALL_PT, 3.5).unwrap_or(3.5);
                let w = width(label, size);
                text(&mut items, x + slot_w + (gap - w) / 2.0, y_titles + 3.0, label, size, FLAG_ORANGE);
            }
            x += slot_w + gap;
        }
    }

    // Datum line through the columns that have the datum and the gaps between two of them.
    if !matches!(opts.datum, Datum::Base) {
        for (k, c) in columns.iter().enumerate() {
            if c.datum_height_m.is_none() {
                continue;
            }
            let x_end = match columns.get(k + 1) {
                Some(next) if next.datum_height_m.is_some() => next.x_mm + tracks.lithology.x_mm,
                _ => c.x_mm + c.width_mm,
            };
            items.push(Item::Polyline {
                points: vec![
                    PtMm { x: c.x_mm + tracks.lithology.x_mm, y: datum_y },
                    PtMm { x: x_end, y: datum_y },
                ],
                stroke: solid(0.35, DATUM_BLUE),
            });
        }
    } else {
        items.push(Item::Polyline {
            points: vec![
                PtMm { x: margin + tracks.lithology.x_mm, y: datum_y },
                PtMm { x: x + slot_w, y: datum_y },
            ],
            stroke: solid(0.35, DATUM_BLUE),
        });
    }

    // Tie lines between neighbours.
    let mut ties: Vec<TieLine> = Vec::new();
    // Linked markers that found their label in a neighbour: (column, marker index).
    let mut linked_ends: Vec<(usize, usize)> = Vec::new();
    for k in 0..columns.len().saturating_sub(1) {
        let (a, b) = (&columns[k], &columns[k + 1]);
        let (ma, mb) = (&markers[a.section_index].markers, &markers[b.section_index].markers);
        let (pairs, unpaired) = tie_pairs(ma, mb);
        if let Some((na, nb)) = unpaired {
            notes.push(format!(
                "{} and {} have {na} and {nb} accepted boundaries without surface names or correlation labels: not tied (name the surfaces or give them labels to tie them).",
                a.name, b.name
            ));
        }
        for (i, j, kind) in pairs {
            let (m, o) = (&ma[i], &mb[j]);
            let from = PtMm { x: a.x_mm + a.width_mm, y: a.heights.y_mm(m.height_m) };
            let to = PtMm { x: b.x_mm + tracks.lithology.x_mm - 1.0, y: b.heights.y_mm(o.height_m) };
            let accepted = m.accepted && o.accepted;
            let stroke = match kind {
                TieKind::Link => solid(LINK_LINE_MM, LINK_TEAL),
                _ if accepted => dashed(0.45, BOUNDARY_RED, &[2.4, 1.0]),
                _ => dashed(0.3, TIE_VIOLET, &[1.8, 1.0]),
            };
            items.push(Item::Polyline { points: vec![from, to], stroke });
            let name = match (kind, &m.link) {
                (TieKind::Link, Some(l)) => {
                    linked_ends.extend([(k, i), (k + 1, j)]);
                    draw_tie_label(l, from, to, &mut items);
                    l.clone()
                }
                _ => m.name.clone(),
            };
            ties.push(TieLine {
                name,
                accepted,
                linked: kind == TieKind::Link,
                left: k,
                right: k + 1,
                left_height_m: m.height_m,
                right_height_m: o.height_m,
                from,
                to,
            });
        }
    }
    for (k, c) in columns.iter().enumerate() {
        for (i, m) in markers[c.section_index].markers.iter().enumerate() {
            if let Some(l) = m.link.as_ref().filter(|_| !linked_ends.contains(&(k, i))) {
                notes.push(format!(
                    "{}: correlation label {l:?} at {:.2} m has no match in a neighbouring column: not tied.",
                    c.name, m.height_m
                ));
            }
        }
    }

    // Notes, then the footer caution.
    let mut ny = y_scale + SCALE_BAND_MM + 2.0;
    if !notes.is_empty() {
        text(&mut items, margin, ny + 1.0, "Notes", TEXT_PT, INK);
        ny += NOTE_LINE_MM + 0.5;
        for n in &notes {
            for line in wrap(n, usable_w, NOTE_PT) {
                let colour = if n.contains("NOT") || n.contains("n.t.s.") { FLAG_ORANGE } else { INK };
                text(&mut items, margin, ny + 1.0, &line, NOTE_PT, colour);
                ny += NOTE_LINE_MM;
            }
        }
    }
    let fy = page_h - margin - caution_lines.len() as f64 * NOTE_LINE_MM + 1.6;
    items.push(Item::Polyline {
        points: vec![PtMm { x: margin, y: fy - 2.8 }, PtMm { x: page_w - margin, y: fy - 2.8 }],
        stroke: solid(HAIR_MM, GREY),
    });
    for (k, l) in caution_lines.iter().enumerate() {
        text(&mut items, margin, fy + k as f64 * NOTE_LINE_MM, l, NOTE_PT, INK);
    }
    let label = "page 1 of 1";
    text(&mut items, page_w - margin - width(label, TEXT_PT), fy, label, TEXT_PT, INK);

    Ok(PanelLayout {
        page: Page { width_mm: page_w, height_mm: page_h, items, segments },
        columns,
        ties,
        horizontal: HorizontalScale { source: positions.source, denominator, widened_gaps },
        datum_y_mm: datum_y,
        notes,
        page_enlarged: enlarged,
    })
}

/// How two markers in neighbouring columns came to be tied.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum TieKind {
    /// Accepted boundaries carrying the same correlation label.
    Link,
    /// Surfaces of the same name.
    Name,
    /// Unnamed, unlabelled accepted boundaries paired in stratigraphic order.
    Order,
}

/// Two tied markers: (index in the left column's markers, index in the right's, how).
pub type TiePair = (usize, usize, TieKind);

/// Which markers of two neighbouring columns are tied: (index in `left`, index in `right`, how),
/// links first, then names (unless the same two levels are already linked), then order. The
/// second value gives the counts of unnamed accepted boundaries when both columns have some but
/// not the same number, so that nothing says which goes with which.
pub fn tie_pairs(left: &[Marker], right: &[Marker]) -> (Vec<TiePair>, Option<(usize, usize)>) {
    let mut pairs: Vec<TiePair> = Vec::new();
    for (i, m) in left.iter().enumerate() {
        let Some(l) = &m.link else { continue };
        if let Some(j) = right.iter().position(|o| o.link.as_ref() == Some(l)) {
            pairs.push((i, j, TieKind::Link));
        }
    }
    for (i, m) in left.iter().enumerate().filter(|(_, m)| m.surface) {
        if let Some(j) = right.iter().position(|o| o.surface && o.name == m.name) {
            if !pairs.iter().any(|&(a, b, _)| (a, b) == (i, j)) {
                pairs.push((i, j, TieKind::Name));
            }
        }
    }
    let ua: Vec<usize> = (0..left.len()).filter(|&i| left[i].unnamed).collect();
    let ub: Vec<usize> = (0..right.len()).filter(|&j| right[j].unnamed).collect();
    let mut unpaired = None;
    if ua.len() == ub.len() {
        pairs.extend(ua.into_iter().zip(ub).map(|(i, j)| (i, j, TieKind::Order)));
    } else if !ua.is_empty() && !ub.is_empty() {
        unpaired = Some((ua.len(), ub.len()));
    }
    (pairs, unpaired)
}

/// A linked tie's label, once, at the middle of the tie and just above it, on the side the line
/// leaves free: right of the middle when the tie runs down to the right, left of it when it runs
/// up, centred when it is level.
fn draw_tie_label(label: &str, from: PtMm, to: PtMm, out: &mut Vec<Item>) {
    let half_gap = ((to.x - from.x) / 2.0 - 0.8).max(1.0);
    let size = fit_size(label, half_gap, SMALL_PT, 3.2).unwrap_or(3.2);
    let w = width(label, size);
    let mid = PtMm { x: (from.x + to.x) / 2.0, y: (from.y + to.y) / 2.0 };
    let x = match to.y - from.y {
        d if d > 0.5 => mid.x + 0.6,
        d if d < -0.5 => mid.x - 0.6 - w,
        _ => mid.x - w / 2.0,
    };
    text(out, x, mid.y - 0.7, label, size, LINK_TEAL);
}

/// "850 m" or "1.15 km".
pub fn fmt_distance(d_m: f64) -> String {
    if d_m.abs() < 1000.0 {
        format!("{d_m:.0} m")
    } else {
        format!("{:.2} km", d_m / 1000.0)
    }
}

/// "1:25 000" with a thin space grouping thousands.
pub fn fmt_scale(denominator: f64) -> String {
    let n = denominator.round() as i64;
    let digits = n.to_string();
    let mut out = String::new();
    for (k, ch) in digits.chars().enumerate() {
        if k > 0 && (digits.len() - k).is_multiple_of(3) {
            out.push('\u{2009}');
        }
        out.push(ch);
    }
    format!("1:{out}")
}

#[allow(clippy::too_many_arguments)]
fn draw_header(
    opts: &PanelOptions,
    meta: &PrintMeta,
    positions: &Positions,
    sections: &[Section],
    (denominator, widened, n_gaps): (Option<f64>, usize, usize),
    m: f64,
    page_w: f64,
    header_h: f64,
    out: &mut Vec<Item>,
) {
    let right = page_w - m;
    let title = if opts.title.trim().is_empty() { "Correlation panel" } else { opts.title.trim() };
    let v = format!("vertical scale {}", opts.layout.scale_label());
    let vw = width(&v, 10.0);
    text(out, right - vw, m + 5.0, &v, 10.0, INK);
    let size = fit_size(title, right - m - vw - 6.0, 14.0, 6.0).unwrap_or(6.0);
    text(out, m, m + 5.5, title, size, INK);
    let datum = match &opts.datum {
        Datum::Base => "datum: section base (every column hung on its base)".to_string(),
        Datum::Named(n) => {
            format!("datum: {n} (columns hung on it; a column without it is hung on its base and flagged)")
        }
    };
    text(out, m, m + 10.5, &datum, TEXT_PT + 1.0, DATUM_BLUE);
    let (h_line, h_colour) = match denominator {
        Some(h) if widened == 0 || n_gaps == 0 => (
            format!(
                "horizontal scale {} (gaps between columns; column widths show grain size)",
                fmt_scale(h)
            ),
            INK,
        ),
        Some(_) if widened == n_gaps => (
            "horizontal: NOT to scale (every gap widened to the minimum; distances above the columns)"
                .to_string(),
            FLAG_ORANGE,
        ),
        Some(h) => (
            format!("horizontal scale {} (gaps between columns) except gaps marked n.t.s.", fmt_scale(h)),
            FLAG_ORANGE,
        ),
        None => ("horizontal: columns in file order, NOT to scale".to_string(), FLAG_ORANGE),
    };
    let hw = width(&h_line, TEXT_PT);
    text(out, right - hw, m + 10.5, &h_line, TEXT_PT, h_colour);
    let first = positions.order.first().map(|&i| sections[i].name.as_str()).unwrap_or("");
    let source = match positions.source {
        PositionSource::PanelPosition => {
            "positions: panel positions given in the project (m along the panel)".to_string()
        }
        PositionSource::Coordinates => format!(
            "positions: great-circle (haversine) distance from {:?}, Earth mean radius 6371.0 km",
            sections.first().map(|s| s.name.as_str()).unwrap_or(first)
        ),
        PositionSource::FileOrder => "positions: none given, file order".to_string(),
    };
    let mut facts = vec![source];
    facts.push(format!("boundary candidates scoring below {:.2} not drawn", opts.min_candidate_score));
    if !meta.printed_on.is_empty() {
        facts.push(format!("printed {}", meta.printed_on));
    }
    text(out, m, m + 14.5, &facts.join("  \u{b7}  "), SMALL_PT + 0.5, GREY);
    if let (Some(h), true) = (denominator, widened < n_gaps) {
        draw_distance_bar(h, right, m + 15.5, out);
    }
    if !meta.subtitle.is_empty() {
        text(out, m, m + 17.5, &meta.subtitle, SMALL_PT, GREY);
    }
    let y = m + header_h - 2.0;
    out.push(Item::Polyline {
        points: vec![PtMm { x: m, y }, PtMm { x: right, y }],
        stroke: solid(THIN_MM, INK),
    });
}

/// A bar of a round ground distance at the horizontal scale, right-aligned at `right`.
fn draw_distance_bar(denominator: f64, right: f64, y: f64, out: &mut Vec<Item>) {
    // The round distance whose bar is 15–40 mm long.
    let mm_per_m = 1000.0 / denominator;
    let steps = [1.0, 2.0, 5.0];
    let mut length_m = 1.0;
    'outer: for e in 0..9 {
        for s in steps {
            let d = s * 10f64.powi(e);
            if d * mm_per_m >= 15.0 {
                length_m = d;
                break 'outer;
            }
        }
    }
    let w = length_m * mm_per_m;
    let x0 = right - w - 1.0;
    out.push(Item::Rect {
        rect: RectMm { x: x0, y, w: w / 2.0, h: 1.0 },
        fill: Some(INK),
        stroke: Some(solid(HAIR_MM, INK)),
    });
    out.push(Item::Rect {
        rect: RectMm { x: x0 + w / 2.0, y, w: w / 2.0, h: 1.0 },
        fill: Some(Rgba::WHITE),
        stroke: Some(solid(HAIR_MM, INK)),
    });
    for (f, label) in [(0.0, "0".to_string()), (1.0, fmt_distance(length_m))] {
        let lw = width(&label, SMALL_PT);
        let lx = (x0 + f * w - lw / 2.0).min(right - lw);
        text(out, lx, y - 0.6, &label, SMALL_PT, INK);
    }
}

/// The key row: the panel's own lines and labels.
/// The linked-tie entry is shown only when some section has a correlation label.
fn draw_key(x: f64, y: f64, any_link: bool, out: &mut Vec<Item>) {
    let row = y + 2.5;
    let mut cx = x;
    let mut entry = |stroke: Option<super::items::Stroke>,
                     swatch_text: Option<(&str, Rgba)>,
                     label: &str,
                     out: &mut Vec<Item>| {
        if let Some(s) = stroke {
            out.push(Item::Polyline {
                points: vec![PtMm { x: cx, y: row }, PtMm { x: cx + 9.0, y: row }],
                stroke: s,
            });
        }
        if let Some((t, c)) = swatch_text {
            text(out, cx, row + 0.9, t, SMALL_PT, c);
        }
        text(out, cx + 11.0, row + 0.9, label, SMALL_PT + 0.5, INK);
        cx += 11.0 + width(label, SMALL_PT + 0.5) + 6.0;
    };
    entry(Some(solid(0.35, DATUM_BLUE)), None, "datum", out);
    entry(Some(dashed(0.3, TIE_VIOLET, &[1.8, 1.0])), None, "tie line, same surface name", out);
    entry(Some(dashed(0.45, BOUNDARY_RED, &[2.4, 1.0])), None, "tie line, accepted boundaries", out);
    if any_link {
        entry(
            Some(solid(LINK_LINE_MM, LINK_TEAL)),
            None,
            "tie line, linked accepted boundaries (label on it)",
            out,
        );
    }
    entry(None, Some(("p 0.45", CURVE_GREEN)), "channel-body proportion between accepted boundaries", out);
    entry(None, Some(("n.t.s.", FLAG_ORANGE)), "gap not to horizontal scale", out);
}

/// Block above a column: name, position, datum status, channel-body proportion.
#[allow(clippy::too_many_arguments)]
fn draw_head(
    s: &Section,
    it: &Interpretation,
    source: PositionSource,
    distance_m: f64,
    datum_label: &str,
    datum_h: Option<f64>,
    x: f64,
    y: f64,
    w: f64,
    out: &mut Vec<Item>,
) {
    let name = if s.name.trim().is_empty() { "(unnamed section)" } else { s.name.as_str() };
    let size = fit_size(name, w - 1.0, 9.0, 5.0).unwrap_or(5.0);
    text(out, x, y + 3.5, name, size, INK);
    let pos = match source {
        PositionSource::FileOrder => format!("column {} (no position)", distance_m.round() as i64 + 1),
        _ => format!("at {}", fmt_distance(distance_m)),
    };
    text(out, x, y + 6.8, &pos, SMALL_PT + 0.5, GREY);
    let (unit, unit_name) = match s.display_unit {
        crate::model::LengthUnit::Foot => (crate::model::LengthUnit::Foot, "ft"),
        _ => (crate::model::LengthUnit::Metre, "m"),
    };
    let (datum_line, colour) = match datum_h {
        Some(_) if datum_label == "section base" => {
            (format!("hung on base; {:.1} {unit_name} thick", unit.from_metres(total(it))), INK)
        }
        Some(h) => (format!("hung on {datum_label} at {:.2} {unit_name}", unit.from_metres(h)), DATUM_BLUE),
        None => (format!("NO {datum_label}: hung on base"), FLAG_ORANGE),
    };
    let size = fit_size(&datum_line, w - 1.0, SMALL_PT + 0.5, 4.0).unwrap_or(4.0);
    text(out, x, y + 9.8, &datum_line, size, colour);
    let p = match (it.channel_proportion, it.channel_proportion_bounds) {
        (Some(p), Some(b)) if it.has_cover() => {
            format!(
                "channel-body proportion {p:.2} ({:.2}\u{2013}{:.2} with cover)",
                b.covered_as_fines, b.covered_as_channel
            )
        }
        (Some(p), _) => format!("channel-body proportion {p:.2}"),
        (None, _) => "channel-body proportion: no exposure".to_string(),
    };
    let size = fit_size(&p, w - 1.0, SMALL_PT + 0.5, 3.5).unwrap_or(3.5);
    text(out, x, y + 12.8, &p, size, CURVE_GREEN);
}

fn total(it: &Interpretation) -> f64 {
    if it.total_thickness_m.is_finite() {
        it.total_thickness_m
    } else {
        0.0
    }
}

/// Titles of the strip in the track-title band.
fn draw_strip_titles(x: f64, y_top: f64, out: &mut Vec<Item>) {
    let y_bottom = y_top + TITLE_BAND_MM - 1.0;
    for (dx, label) in
        [(2.0, "channel bodies"), (6.5, "surfaces,"), (9.5, "boundaries,"), (12.5, "proportion")]
    {
        if let Some(size) = fit_size(label, TITLE_BAND_MM - 2.0, SMALL_PT, 4.0) {
            text_up(out, x + dx, y_bottom, label, size, INK);
        }
    }
    out.push(Item::Polyline {
        points: vec![
            PtMm { x, y: y_top + TITLE_BAND_MM },
            PtMm { x: x + STRIP_MM, y: y_top + TITLE_BAND_MM },
        ],
        stroke: solid(HAIR_MM, GREY),
    });
}

/// The strip right of a column: channel-body brackets, boundary lines, and labels for surfaces,
/// boundaries and interval proportions (spread so they do not overlap).
#[allow(clippy::too_many_arguments)]
fn draw_strip(
    ctx: &ColumnCtx<'_>,
    markers: &[Marker],
    datum: &Datum,
    has_datum: bool,
    opts: &PanelOptions,
    x0: f64,
    t: &HeightTransform,
    out: &mut Vec<Item>,
) {
    let xs = x0 + ctx.tracks.width_mm;
    let it = ctx.interp;
    // Channel bodies.
    let xb = xs + 1.5;
    for body in &it.channel_bodies {
        if !(body.base_m.is_finite() && body.top_m.is_finite()) || body.top_m <= body.base_m {
            continue;
        }
        let (yb, yt) = (t.y_mm(body.base_m), t.y_mm(body.top_m));
        let end = |c: Censor| if body.censored.contains(&c) { BracketEnd::Open } else { BracketEnd::Tick };
        body_bracket(xb, yb, yt, (end(Censor::Base), end(Censor::Top)), 1.2, LINE_MM * 1.4, out);
        let [_, with_thickness, short] = body_labels(body);
        for label in [with_thickness, short] {
            if let Some(size) = fit_size(&label, yb - yt - 0.4, SMALL_PT - 0.5, 3.0) {
                let w = width(&label, size);
                let asc = size * 0.353 * 0.76;
                text_up(out, xb + 0.6 + asc, (yb + yt) / 2.0 + w / 2.0, &label, size, BODY_BLUE);
                break;
            }
        }
    }
    // Labels wanted at heights: (y, text, colour).
    let mut labels: Vec<(f64, String, Rgba)> = Vec::new();
    let line_start = x0 + ctx.tracks.lithology.x_mm - 1.5;
    let line_end = xs + 4.0;
    let mut cands: Vec<_> = it
        .sequence_boundary_candidates
        .iter()
        .filter(|c| c.height_m.is_finite())
        .filter(|c| shown(c, opts))
        .collect();
    cands.sort_by(|a, b| a.height_m.total_cmp(&b.height_m));
    for c in cands {
        let y = t.y_mm(c.height_m);
        let (stroke, label, colour) = boundary_style(c.review, c.score);
        out.push(Item::Polyline { points: vec![PtMm { x: line_start, y }, PtMm { x: line_end, y }], stroke });
        labels.push((y, label, colour));
    }
    for m in markers {
        let is_datum = has_datum
            && matches!(datum, Datum::Named(n) if find_marker(markers, n).is_some_and(|d| d.name == m.name));
        let colour = if is_datum { DATUM_BLUE } else { TIE_VIOLET };
        let name = if m.surface { m.name.clone() } else { "accepted".to_string() };
        labels.push((t.y_mm(m.height_m), name, colour));
    }
    // Interval proportions, only between accepted boundaries (the rules cut at candidates
    // otherwise, which the panel does not present as intervals).
    let any_accepted = ctx.section.review.iter().any(|d| d.state == ReviewState::Accepted);
    if any_accepted {
        for ip in &it.interval_proportions {
            if let Some(p) = ip.proportion.filter(|p| p.is_finite()) {
                let y = t.y_mm((ip.base_m + ip.top_m) / 2.0);
                labels.push((y, format!("p {p:.2}"), CURVE_GREEN));
            }
        }
    }
    let y_top = t.y_mm(ctx.total_m);
    let y_base = t.y_mm(0.0);
    let placed = spread_labels(labels.iter().map(|l| l.0).collect(), y_top + 0.5, y_base + 3.0);
    let lx = xs + 4.6;
    for ((_, s, colour), y) in labels.iter().zip(placed) {
        let size = fit_size(s, STRIP_MM - 4.8, SMALL_PT - 0.5, 3.2).unwrap_or(3.2);
        // Baseline below the level, so the text hangs under the line it names rather than on it.
        text(out, lx, y + 1.8, s, size, *colour);
    }
}

/// Whether a boundary candidate is drawn: accepted always; rejected only on request; others
/// when they score at least the panel's minimum.
fn shown(c: &crate::rules::BoundaryCandidate, opts: &PanelOptions) -> bool {
    match c.review {
        ReviewState::Accepted => true,
        ReviewState::Rejected => opts.layout.show_rejected,
        ReviewState::Candidate => {
            c.score >= opts.min_candidate_score || !opts.min_candidate_score.is_finite()
        }
    }
}

/// Move label y positions (mm, down) apart by at least [`LABEL_PITCH_MM`], keeping their order
/// and staying near where they were wanted; returns the new y of each input label.
pub fn spread_labels(wanted: Vec<f64>, y_min: f64, y_max: f64) -> Vec<f64> {
    let mut idx: Vec<usize> = (0..wanted.len()).collect();
    idx.sort_by(|&a, &b| wanted[a].total_cmp(&wanted[b]).then(a.cmp(&b)));
    let mut ys: Vec<f64> = idx.iter().map(|&i| wanted[i]).collect();
    // Down pass, then an up pass from the bottom limit if the stack overran it.
    for k in 1..ys.len() {
        if ys[k] < ys[k - 1] + LABEL_PITCH_MM {
            ys[k] = ys[k - 1] + LABEL_PITCH_MM;
        }
    }
    if let Some(last) = ys.last_mut() {
        if *last > y_max {
            *last = y_max.max(y_min);
        }
    }
    for k in (0..ys.len().saturating_sub(1)).rev() {
        if ys[k] > ys[k + 1] - LABEL_PITCH_MM {
            ys[k] = ys[k + 1] - LABEL_PITCH_MM;
        }
    }
    let mut out = vec![0.0; wanted.len()];
    for (k, &i) in idx.iter().enumerate() {
        out[i] = ys[k];
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::{Orientation, Paper};
    use crate::model::{
        Bed, BedId, GrainSize, Lithology, Project, ReviewDecision, Surface, SurfaceKind, WentworthClass,
    };
    use crate::rules::{interpret, RuleParams};

    fn section(name: &str, beds: &[(f64, Lithology, Option<&str>)]) -> Section {
        let mut s = Section::new(name);
        for (k, (t, l, surf)) in beds.iter().enumerate() {
            let g = match l {
                Lithology::Sandstone => WentworthClass::MediumSand,
                _ => WentworthClass::Silt,
            };
            let mut b = Bed::new(BedId(k as u64 + 1), *t, *l, Some(GrainSize::Class(g)));
            b.base_surface = surf.map(|n| Surface { name: n.to_string(), kind: SurfaceKind::Incision });
            s.beds.push(b);
        }
        s
    }

    fn three() -> Project {
        use Lithology::*;
        let mut a = section(
            "A",
            &[(3.0, Mudstone, None), (2.0, Sandstone, Some("SB-1")), (4.0, Mudstone, Some("T"))],
        );
        let mut b = section(
            "B",
            &[(1.5, Mudstone, None), (2.0, Sandstone, Some("SB-1")), (1.0, Mudstone, Some("T"))],
        );
        let mut c = section("C", &[(5.0, Mudstone, None), (1.0, Sandstone, None)]);
        a.panel_position_m = Some(0.0);
        b.panel_position_m = Some(800.0);
        c.panel_position_m = Some(300.0);
        c.review.push(ReviewDecision::new(BedId(2), ReviewState::Accepted, ""));
        Project::new(vec![a, b, c])
    }

    fn interps(p: &Project) -> Vec<Interpretation> {
        p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect()
    }

    fn opts(datum: &str) -> PanelOptions {
        PanelOptions {
            datum: Datum::parse(datum),
            layout: LayoutOptions {
                scale_denominator: 100.0,
                paper: Paper::A3,
                orientation: Orientation::Landscape,
                ..Default::default()
            },
            ..Default::default()
        }
    }

    #[test]
    fn ordered_by_position_and_hung_on_the_datum() {
        let p = three();
        let l = panel_layout(&p, &interps(&p), &opts("SB-1"), &PrintMeta::default()).expect("panel");
        let names: Vec<&str> = l.columns.iter().map(|c| c.name.as_str()).collect();
        assert_eq!(names, ["A", "C", "B"], "ordered by panel position 0, 300, 800 m");
        // SB-1 at 3 m in A and 1.5 m in B sits at the datum y in both (construction, exact).
        assert!((l.columns[0].heights.y_mm(3.0) - l.datum_y_mm).abs() < 1e-9);
        assert!((l.columns[2].heights.y_mm(1.5) - l.datum_y_mm).abs() < 1e-9);
        // C lacks SB-1: hung on its base, and flagged.
        assert_eq!(l.columns[1].datum_height_m, None);
        assert!((l.columns[1].heights.y_mm(0.0) - l.datum_y_mm).abs() < 1e-9);
        assert!(l.notes.iter().any(|n| n.starts_with("C: has no SB-1")), "{:?}", l.notes);
        // Columns never overlap, and gaps keep at least the minimum.
        for w in l.columns.windows(2) {
            assert!(w[1].x_mm >= w[0].x_mm + w[0].width_mm + 10.0 - 1e-9);
        }
    }

    #[test]
    fn gaps_follow_the_horizontal_scale() {
        let p = three();
        let o = PanelOptions { horizontal_scale_denominator: Some(10_000.0), ..opts("base") };
        let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
        // 300 m at 1:10 000 is 30 mm; 500 m is 50 mm (computed).
        let gap = |k: usize| l.columns[k + 1].x_mm - (l.columns[k].x_mm + l.columns[k].width_mm);
        assert!((gap(0) - 30.0).abs() < 1e-9, "{}", gap(0));
        assert!((gap(1) - 50.0).abs() < 1e-9, "{}", gap(1));
        assert!(l.horizontal.widened_gaps.is_empty());
        // At 1:100 000, 3 mm and 5 mm gaps are widened to the 10 mm minimum and flagged.
        let o = PanelOptions { horizontal_scale_denominator: Some(100_000.0), ..opts("base") };
        let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
        assert_eq!(l.horizontal.widened_gaps, vec![0, 1]);
        assert!(l.notes.iter().any(|n| n.contains("NOT to horizontal scale")));
    }

    #[test]
    fn ties_join_same_names_and_accepted_boundaries() {
        let mut p = three();
        // Put C far away so A and B are neighbours; accept SB-1 in both A and B.
        p.sections[2].panel_position_m = Some(5000.0);
        for s in &mut p.sections[..2] {
            s.review.push(ReviewDecision::new(BedId(2), ReviewState::Accepted, ""));
        }
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        let sb1 = l.ties.iter().find(|t| t.name == "SB-1").expect("SB-1 tie");
        assert!(sb1.accepted);
        assert_eq!((sb1.left_height_m, sb1.right_height_m), (3.0, 1.5));
        assert!((sb1.from.y - l.columns[0].heights.y_mm(3.0)).abs() < 1e-9);
        assert!((sb1.to.y - l.columns[1].heights.y_mm(1.5)).abs() < 1e-9);
        let top = l.ties.iter().find(|t| t.name == "T").expect("T tie");
        assert!(!top.accepted);
        assert_eq!((top.left_height_m, top.right_height_m), (5.0, 3.5));
        // B and C (neighbours): B has no unnamed accepted boundary, C has one: no tie, no note.
        assert!(l.ties.iter().all(|t| t.right != 2 || t.name != "accepted:C@5.00"));
        assert_eq!(l.ties.len(), 2);
    }

    /// Accept the boundary at the base of bed `id` with an optional correlation label.
    fn accept(s: &mut Section, id: u64, link: Option<&str>) {
        let mut d = ReviewDecision::new(BedId(id), ReviewState::Accepted, "");
        d.link = link.map(str::to_string);
        s.review.retain(|r| r.bed != BedId(id));
        s.review.push(d);
    }

    /// Unnamed boundaries: A has two accepted, B one; without labels the counts differ, so
    /// order pairing gives nothing (A–B are neighbours: C is moved far away).
    fn unnamed_pair() -> Project {
        use Lithology::*;
        let mut a = section("A", &[(2.0, Mudstone, None), (1.0, Sandstone, None), (3.0, Sandstone, None)]);
        let mut b = section("B", &[(1.0, Mudstone, None), (4.0, Sandstone, None), (2.0, Sandstone, None)]);
        a.panel_position_m = Some(0.0);
        b.panel_position_m = Some(500.0);
        accept(&mut a, 2, None);
        accept(&mut a, 3, None);
        accept(&mut b, 3, None);
        Project::new(vec![a, b])
    }

    #[test]
    fn a_link_ties_boundaries_that_order_pairing_could_not() {
        let mut p = unnamed_pair();
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        assert!(l.ties.is_empty(), "{:?}", l.ties);
        assert!(l.notes.iter().any(|n| n.contains("have 2 and 1 accepted boundaries")), "{:?}", l.notes);
        // Label A's upper boundary (base of bed 3 at 3 m) and B's (base of bed 3 at 5 m) SB-2.
        accept(&mut p.sections[0], 3, Some("SB-2"));
        accept(&mut p.sections[1], 3, Some(" SB-2 "));
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        assert_eq!(l.ties.len(), 1, "{:?}", l.ties);
        let t = &l.ties[0];
        assert!(t.linked && t.accepted);
        assert_eq!(t.name, "SB-2");
        assert_eq!((t.left_height_m, t.right_height_m), (3.0, 5.0));
        assert!((t.from.y - l.columns[0].heights.y_mm(3.0)).abs() < 1e-9);
        assert!((t.to.y - l.columns[1].heights.y_mm(5.0)).abs() < 1e-9);
        // A linked boundary is no longer unnamed: A has one unnamed left, B none; no note.
        assert!(!l.notes.iter().any(|n| n.contains("accepted boundaries without")), "{:?}", l.notes);
        // Drawn solid in the link colour, and the label written once, in the link colour.
        let solid_link = l.page.items.iter().filter(|it| {
            matches!(it, Item::Polyline { points, stroke } if stroke.color == LINK_TEAL
                && stroke.dash_mm.is_empty() && points.len() == 2 && points[0] == t.from)
        });
        assert_eq!(solid_link.count(), 1);
        let labels = l.page.items.iter().filter(
            |it| matches!(it, Item::Text { text, color, .. } if text == "SB-2" && *color == LINK_TEAL),
        );
        assert_eq!(labels.count(), 1);
    }

    #[test]
    fn link_and_name_on_the_same_levels_give_one_tie() {
        let mut p = three();
        p.sections[2].panel_position_m = Some(5000.0);
        for s in &mut p.sections[..2] {
            accept(s, 2, Some("K-1"));
        }
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        // SB-1 (bed 2 base) in A and B is both named and linked: one linked tie; T still by name.
        let names: Vec<(&str, bool)> = l.ties.iter().map(|t| (t.name.as_str(), t.linked)).collect();
        assert_eq!(names, [("K-1", true), ("T", false)]);
        // The datum may be the label: A hangs at 3 m, B at 1.5 m.
        let l = panel_layout(&p, &interps(&p), &opts("k-1"), &PrintMeta::default()).expect("panel");
        assert_eq!(l.columns[0].datum_height_m, Some(3.0));
        assert_eq!(l.columns[1].datum_height_m, Some(1.5));
        assert_eq!(l.columns[2].datum_height_m, None);
    }

    #[test]
    fn repeated_and_unaccepted_labels_are_noted() {
        let mut p = unnamed_pair();
        // A: SB-2 on both accepted boundaries (the lowest, at 2 m, is tied); B: SB-2 accepted at
        // 5 m, and SB-3 on a boundary that is only a candidate.
        accept(&mut p.sections[0], 2, Some("SB-2"));
        accept(&mut p.sections[0], 3, Some("SB-2"));
        accept(&mut p.sections[1], 3, Some("SB-2"));
        let mut d = ReviewDecision::new(BedId(2), ReviewState::Candidate, "");
        d.link = Some("SB-3".into());
        p.sections[1].review.push(d);
        let m = section_markers(&p.sections[0]);
        assert_eq!(m.repeated_links, vec![("SB-2".to_string(), 3.0)]);
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        let linked: Vec<(f64, f64)> =
            l.ties.iter().filter(|t| t.linked).map(|t| (t.left_height_m, t.right_height_m)).collect();
        assert_eq!(linked, [(2.0, 5.0)]);
        assert!(l.notes.iter().any(|n| n.starts_with("A: correlation label \"SB-2\" is on more than one")));
        assert!(l.notes.iter().any(|n| n
            .starts_with("B: correlation label \"SB-3\" at 1.00 m is on a boundary that is not accepted")));
        // The repeat is neither tied by label nor paired by order (it carries a label).
        assert_eq!(l.ties.len(), 1, "{:?}", l.ties);
    }

    #[test]
    fn a_label_without_a_neighbour_is_noted() {
        let mut p = three();
        // C (at 300 m, between A and B) has the label; neither neighbour does.
        accept(&mut p.sections[2], 2, Some("SB-9"));
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        assert!(l.ties.iter().all(|t| !t.linked));
        assert!(
            l.notes.iter().any(|n| n == "C: correlation label \"SB-9\" at 5.00 m has no match in a neighbouring column: not tied."),
            "{:?}",
            l.notes
        );
    }

    #[test]
    fn pairing_rules() {
        let m = |name: &str, h: f64, surface: bool, unnamed: bool, link: Option<&str>| Marker {
            name: name.into(),
            height_m: h,
            accepted: unnamed || link.is_some(),
            unnamed,
            surface,
            link: link.map(str::to_string),
        };
        let left = [
            m("SB-1", 1.0, true, false, None),
            m("accepted:L@2.00", 2.0, false, true, None),
            m("accepted:L@3.00", 3.0, false, false, Some("X")),
            m("T", 4.0, true, false, Some("Y")),
        ];
        let right = [
            m("accepted:R@0.50", 0.5, false, false, Some("Y")),
            m("SB-1", 1.5, true, false, None),
            m("accepted:R@2.50", 2.5, false, true, None),
            m("T", 6.0, true, false, None),
            m("accepted:R@7.00", 7.0, false, false, Some("X")),
        ];
        let (pairs, unpaired) = tie_pairs(&left, &right);
        // Links first (X: 2→4, Y: 3→0), then names (SB-1; T 3→3 is a different level from the
        // link Y 3→0, so both are drawn), then order (one unnamed each side).
        assert_eq!(
            pairs,
            vec![
                (2, 4, TieKind::Link),
                (3, 0, TieKind::Link),
                (0, 1, TieKind::Name),
                (3, 3, TieKind::Name),
                (1, 2, TieKind::Order)
            ]
        );
        assert_eq!(unpaired, None);
        // Two unnamed against one: no order pairs, and the counts are returned for the note.
        let (pairs, unpaired) =
            tie_pairs(&left[..2], &[right[2].clone(), m("accepted:R@9.00", 9.0, false, true, None)]);
        assert_eq!(pairs, vec![]);
        assert_eq!(unpaired, Some((1, 2)));
    }

    #[test]
    fn unknown_datum_lists_the_names() {
        let p = three();
        let err = panel_layout(&p, &interps(&p), &opts("SB-9"), &PrintMeta::default()).expect_err("unknown");
        let msg = err.to_string();
        assert!(
            msg.contains("\"SB-9\"")
                && msg.contains("\"SB-1\"")
                && msg.contains("\"T\"")
                && msg.contains("\"accepted:C@5.00\""),
            "{msg}"
        );
        // The accepted boundary's own name works as a datum.
        let l =
            panel_layout(&p, &interps(&p), &opts("accepted:C@5.00"), &PrintMeta::default()).expect("panel");
        let c = l.columns.iter().find(|c| c.name == "C").expect("C");
        assert_eq!(c.datum_height_m, Some(5.0));
    }

    #[test]
    fn bad_input_gets_errors_not_panics() {
        let p = three();
        assert_eq!(
            panel_layout(&Project::new(vec![]), &[], &opts("base"), &PrintMeta::default()),
            Err(PanelError::NoSections)
        );
        assert!(matches!(
            panel_layout(&p, &[], &opts("base"), &PrintMeta::default()),
            Err(PanelError::InterpretationCount { sections: 3, interpretations: 0 })
        ));
        let mut o = opts("base");
        o.layout.scale_denominator = 0.0;
        assert!(panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).is_err());
        // NaN thickness and missing positions still give a page.
        let mut q = three();
        q.sections[0].beds[0].thickness_m = f64::NAN;
        q.sections[1].panel_position_m = None;
        let l = panel_layout(&q, &interps(&q), &opts("SB-1"), &PrintMeta::default()).expect("panel");
        assert_eq!(l.horizontal.source, PositionSource::FileOrder);
        assert!(l.page.height_mm > 0.0);
    }

    #[test]
    fn tall_page_when_the_panel_does_not_fit() {
        let p = three();
        let mut o = opts("base");
        o.layout.scale_denominator = 10.0; // 9 m at 1:10 = 900 mm: taller than A3.
        let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
        assert!(l.page_enlarged && l.page.height_mm > 900.0);
        assert!((l.page.width_mm - 420.0).abs() < 1e-9);
        // Tall single page: the round horizontal scale at which the closest pair (300 m) gets
        // at least the 10 mm minimum: 1:25 000 (300 m → 12 mm, 500 m → 20 mm; computed).
        o.layout.paper = Paper::TallSingle;
        let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
        assert_eq!(l.horizontal.denominator, Some(25_000.0));
        assert!(l.horizontal.widened_gaps.is_empty());
        let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
        assert!(!l.page_enlarged);
        assert_eq!((l.page.width_mm, l.page.height_mm), (420.0, 297.0));
    }

    #[test]
    fn labels_spread_apart_in_order() {
        let ys = spread_labels(vec![10.0, 10.5, 30.0, 10.2], 0.0, 100.0);
        let mut sorted = ys.clone();
        sorted.sort_by(f64::total_cmp);
        for w in sorted.windows(2) {
            assert!(w[1] - w[0] >= LABEL_PITCH_MM - 1e-9);
        }
        assert_eq!(ys[2], 30.0, "a label with room stays put");
        assert!(ys[0] < ys[3] && ys[3] < ys[1], "order kept");
        // Near the bottom limit the stack is pushed up.
        let ys = spread_labels(vec![99.0, 99.0], 0.0, 100.0);
        assert!(ys.iter().all(|y| *y <= 100.0));
    }
}
