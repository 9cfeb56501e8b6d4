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
//!   than continued, so that tie lines are never cut; the notes say so. [`crate::layout::Paper::TallSingle`]
//!   sizes the page to the panel, spacing the columns to scale where it can.
//! - **Tie lines** join neighbouring columns only. Accepted boundaries carrying the same
//!   correlation label (`ReviewDecision::link`) are tied first, with a solid line and the label
//!   written once at the middle of the tie; a label used twice in one section ties its lowest
//!   boundary (the others are noted), and a label on a boundary that is not accepted is kept in
//!   the file but not drawn (noted). Surfaces of the same name are then tied with a dashed line,
//!   unless the same two levels are already linked. Accepted boundaries with neither a surface
//!   name nor a label are paired in stratigraphic order when both sections have the same number
//!   of them; otherwise a note says they are not tied.
//!
//! The work goes in stages, one file each: [`positions`] (where the sections stand, the
//! horizontal scale, the page geometry), [`markers`] (named levels, the datum, tie pairing),
//! [`notes`] (what the page says about its choices) and [`draw`] (the items).

mod draw;
mod markers;
mod notes;
mod positions;
#[cfg(test)]
mod tests;
mod words;

pub use markers::{section_markers, Datum, Marker, SectionMarkers};
pub use positions::{haversine_m, panel_positions, PositionSource, Positions, EARTH_MEAN_RADIUS_M};

use super::column::ColumnCtx;
use super::items::{Item, PtMm, Rgba};
use super::legend::draw_legend;
use super::options::{LayoutOptions, PrintMeta};
use super::page::{piece_top, Page, PageSegment, PieceCuts, PIECE_BEDS};
use super::transform::HeightTransform;
use crate::model::{Project, Section};
use crate::rules::Interpretation;
use positions::{Contents, Horizontal, Sheet};
use serde::Serialize;

/// Width of the panel's own interpretation strip right of each column (channel bodies, surface
/// and boundary labels, interval proportions), mm.
pub const STRIP_MM: f64 = 15.0;
/// Height of the block above each column with its name, position, datum and proportion, mm.
const HEAD_MM: f64 = 15.0;
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
    /// Candidate sequence boundaries weaker than this are left off the panel (accepted ones are
    /// always drawn); by default `strong`, the class at which the rules cut intervals.
    pub min_candidate_strength: crate::rules::Strength,
}

impl Default for PanelOptions {
    fn default() -> Self {
        PanelOptions {
            datum: Datum::Base,
            layout: LayoutOptions { scale_denominator: 500.0, ..LayoutOptions::default() },
            horizontal_scale_denominator: None,
            min_gap_mm: 10.0,
            title: String::new(),
            min_candidate_strength: crate::rules::Strength::Strong,
        }
    }
}

impl PanelOptions {
    /// The narrowest gap as used: 10 mm when the option is not a positive number.
    fn min_gap(&self) -> f64 {
        if self.min_gap_mm.is_finite() && self.min_gap_mm > 0.0 {
            self.min_gap_mm
        } else {
            10.0
        }
    }

    /// The page margin as used: clamped to 3–40 mm, 12 mm when not a number.
    fn margin(&self) -> f64 {
        if self.layout.margin_mm.is_finite() {
            self.layout.margin_mm.clamp(3.0, 40.0)
        } else {
            12.0
        }
    }
}

/// Why a panel could not be laid out.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PanelError {
    #[error("the project holds no section to put on a panel")]
    NoSections,
    #[error(
        "{} but {} given; give one interpretation per section, in the same order",
        notes::counted(*sections, "section", "sections"),
        notes::counted(*interpretations, "interpretation was", "interpretations were")
    )]
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

impl HorizontalScale {
    /// The horizontal scale in words, said once and the same on the page and on screen, for a
    /// panel with `gaps` gaps between its columns; and whether some gap is not to scale (the
    /// statement is then flagged). A scale is printed only when some gap is drawn at it: when
    /// every gap had to be widened to the minimum the panel says only that it is not to scale.
    pub fn statement(&self, gaps: usize) -> (String, bool) {
        let widened = self.widened_gaps.len();
        match self.denominator {
            None => ("horizontal: columns in file order, NOT to scale".to_string(), true),
            Some(_) if gaps == 0 => ("horizontal: one column, no gaps to scale".to_string(), false),
            Some(h) if widened == 0 => (
                format!(
                    "horizontal scale {} (gaps between columns; column widths show grain size)",
                    positions::fmt_scale(h)
                ),
                false,
            ),
            Some(_) if widened >= gaps => (
                "horizontal: NOT to scale (every gap widened to the minimum; distances above the columns)"
                    .to_string(),
                true,
            ),
            Some(h) => (
                format!(
                    "horizontal scale {} (gaps between columns), except the gaps marked n.t.s., widened to the minimum",
                    positions::fmt_scale(h)
                ),
                true,
            ),
        }
    }
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
    project: &Project,
    interps: &[Interpretation],
    opts: &PanelOptions,
    meta: &PrintMeta,
) -> Result<Vec<Page>, PanelError> {
    Ok(vec![panel_layout(project, interps, opts, meta)?.page])
}

/// Refuse what cannot be laid out: no sections, interpretations not one per section, scales that
/// are not positive numbers.
fn check_input(
    sections: &[Section],
    interps: &[Interpretation],
    opts: &PanelOptions,
) -> Result<(), PanelError> {
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
    Ok(())
}

/// Lay out the correlation panel. `interps[i]` is the interpretation of `project.sections[i]`.
pub fn panel_layout(
    project: &Project,
    interps: &[Interpretation],
    opts: &PanelOptions,
    meta: &PrintMeta,
) -> Result<PanelLayout, PanelError> {
    lay_out(project, interps, opts, meta, None)
}

/// Where [`panel_layout_in_pieces`] hands the items: called with the page's size (width,
/// height; mm, the same every time) and the next items in drawing order; returns false to stop
/// drawing (the writer failed).
pub type PanelSink<'s> = &'s mut dyn FnMut((f64, f64), &[Item]) -> bool;

/// The same panel, drawn into `sink` a piece at a time (header, legend and key; each column a
/// few hundred beds at a time; its strip, scale and head; the lines across and the notes) instead
/// of into one page, so a panel of many long sections never holds all its items: written one
/// after another, the pieces are the page [`panel_layout`] gives (cut between beds, outside
/// storeys, channel bodies and paleosol profiles where one is near). The layout returned has
/// everything but the page's items and the bed boxes. Drawing stops early when `sink` returns
/// false.
pub fn panel_layout_in_pieces(
    project: &Project,
    interps: &[Interpretation],
    opts: &PanelOptions,
    meta: &PrintMeta,
    sink: PanelSink<'_>,
) -> Result<PanelLayout, PanelError> {
    lay_out(project, interps, opts, meta, Some(sink))
}

/// [`panel_layout`] (no sink: every item kept on the page) or [`panel_layout_in_pieces`].
fn lay_out(
    project: &Project,
    interps: &[Interpretation],
    opts: &PanelOptions,
    meta: &PrintMeta,
    mut sink: Option<PanelSink<'_>>,
) -> Result<PanelLayout, PanelError> {
    let sections = &project.sections;
    check_input(sections, interps, opts)?;

    // Markers and the datum in each section.
    let markers: Vec<SectionMarkers> = sections.iter().map(section_markers).collect();
    let datum_h = markers::datum_heights(&markers, &opts.datum);
    if let Datum::Named(name) = &opts.datum {
        if datum_h.iter().all(Option::is_none) {
            let available = markers::all_marker_names(project);
            return Err(PanelError::UnknownDatum { datum: name.clone(), available });
        }
    }

    // Positions, scales and the page.
    let tracks = positions::panel_tracks();
    let horizontal = Horizontal::plan(sections, opts, tracks.width_mm + STRIP_MM);
    let order = &horizontal.positions.order;
    let mut notes = notes::section_notes(sections, order, &markers, &datum_h, &opts.datum);
    notes.extend(notes::horizontal_notes(sections, &horizontal, opts.min_gap()));
    let layout_opts = LayoutOptions { show_interpretation: false, ..opts.layout.without_record() };
    let entries = draw::legend(sections, interps, opts, &layout_opts);
    let (above_mm, below_mm) =
        positions::vertical_reach_mm(sections, &datum_h, opts.layout.scale_denominator);
    let contents = Contents {
        panel_w: horizontal.panel_w,
        above_mm,
        below_mm,
        legend_entries: entries.len(),
        notes: &notes,
    };
    // Which rules: those of the first interpretation, or a warning when they differ.
    let rules = match interps.first() {
        Some(first) if interps.iter().all(|i| i.params == first.params) => first.params.summary(),
        Some(_) => "DIFFERENT rules per column (see each column's printout)".to_string(),
        None => "default rules".to_string(),
    };
    let scale = HorizontalScale {
        source: horizontal.positions.source,
        denominator: horizontal.denominator,
        widened_gaps: horizontal.widened_gaps.clone(),
    };
    let head = draw::HeaderText::new(&scale, horizontal.deltas.len(), sections, order, opts, meta, &rules);
    let sheet = Sheet::plan(opts, &|w| head.height_mm(w), &contents, tracks);
    if sheet.enlarged {
        notes.push(notes::enlarged_note(&opts.layout, &sheet));
    }

    // Hands the items drawn so far to the sink and empties them; keeps them when there is none.
    // False once the sink has refused, and from then on nothing more is drawn.
    let size = (sheet.page_w, sheet.page_h);
    let in_pieces = sink.is_some();
    let mut going = true;
    let mut flush = |items: &mut Vec<Item>| -> bool {
        if let Some(sink) = sink.as_mut() {
            going = going && sink(size, items);
            items.clear();
        }
        going
    };
    // After a refusal, the columns are left undrawn.
    let mut refused;

    // Header, legend and key.
    let mut items: Vec<Item> = Vec::new();
    draw::header(&sheet, &head, &mut items);
    draw_legend(&entries, sheet.margin, sheet.y_legend, sheet.usable_w, &mut items);
    let any_link = markers.iter().any(|m| m.markers.iter().any(|m| m.link.is_some()));
    draw::key(sheet.margin, sheet.y_key, any_link, &mut items);
    refused = !flush(&mut items);

    // Columns, left to right.
    let positions = &horizontal.positions;
    let slot_w = horizontal.slot_w;
    let mut columns: Vec<PanelColumn> = Vec::new();
    let mut segments: Vec<PageSegment> = Vec::new();
    let mut x = sheet.margin;
    let d0 = positions.order.first().map(|&i| positions.distance_m[i]).unwrap_or(0.0);
    for (k, &i) in positions.order.iter().enumerate() {
        let (s, it) = (&sections[i], &interps[i]);
        let mut ctx = ColumnCtx::new(s, it, &layout_opts);
        ctx.tracks = tracks;
        let heights =
            HeightTransform::new(sheet.datum_y, datum_h[i].unwrap_or(0.0), opts.layout.scale_denominator);
        let column = PanelColumn {
            section_index: i,
            name: s.name.clone(),
            distance_m: positions.distance_m[i] - d0,
            x_mm: x,
            width_mm: slot_w,
            heights,
            datum_height_m: datum_h[i],
            channel_proportion: it.channel_proportion,
        };
        let mut boxes = Vec::new();
        ctx.draw_titles(x, sheet.y_titles, &mut items);
        draw::strip_titles(x + tracks.width_mm, sheet.y_titles, &mut items);
        if refused {
            // The sink refused: nothing more is drawn.
            items.clear();
        } else if in_pieces {
            // A piece at a time, the bed boxes dropped with each.
            let cuts = PieceCuts::new(it);
            let mut lo = 0.0;
            loop {
                let hi = piece_top(&ctx, &cuts, lo, ctx.total_m, PIECE_BEDS);
                ctx.draw_range(lo, hi, x, &heights, &mut items, &mut boxes);
                boxes.clear();
                refused = !flush(&mut items);
                if refused || hi >= ctx.total_m {
                    break;
                }
                lo = hi;
            }
        } else {
            ctx.draw_range(0.0, ctx.total_m, x, &heights, &mut items, &mut boxes);
        }
        draw::strip(&ctx, &column, &markers[i].markers, opts, &mut items);
        ctx.draw_scale(x, sheet.y_scale, &mut items);
        draw::head(&ctx, &column, positions.source, &opts.datum, sheet.y_heads, &mut items);
        segments.push(PageSegment { base_m: 0.0, top_m: ctx.total_m, x_mm: x, heights, bed_boxes: boxes });
        columns.push(column);
        refused = !flush(&mut items);
        if let Some(&gap) = horizontal.gaps.get(k) {
            if horizontal.widened_gaps.contains(&k) {
                draw::not_to_scale(x + slot_w, gap, sheet.y_titles, &mut items);
            }
            x += slot_w + gap;
        }
    }

    // Datum line, tie lines, then the notes and the footer.
    draw::datum_line(&columns, &opts.datum, &sheet, &mut items);
    let (ties, tie_notes) = markers::tie_lines(sections, &columns, &markers, tracks.lithology.x_mm);
    draw::ties(&ties, &mut items);
    notes.extend(tie_notes);
    notes::draw_notes_and_footer(&notes, &sheet, &mut items);
    flush(&mut items);

    Ok(PanelLayout {
        page: Page { width_mm: sheet.page_w, height_mm: sheet.page_h, items, segments },
        columns,
        ties,
        horizontal: scale,
        datum_y_mm: sheet.datum_y,
        notes,
        page_enlarged: sheet.enlarged,
    })
}
