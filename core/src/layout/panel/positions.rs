//! Positions and scale: where the sections stand along the panel, the horizontal scale of the
//! gaps between columns, and the page geometry ([`Sheet`]) every drawing step reads.

use super::{PanelOptions, HEAD_MM, KEY_ROW_MM, NOTE_LINE_MM, NOTE_PT, PAD_MM};
use crate::layout::column::{Tracks, SCALE_BAND_MM, TITLE_BAND_MM};
use crate::layout::legend::legend_height_mm;
use crate::layout::text::wrap;
use crate::model::{LatLon, Section};
use crate::REVIEW_CAUTION;
use serde::Serialize;

/// Mean radius of the Earth, metres: R1 = (2a + b)/3 of the GRS 80 ellipsoid (IUGG; Moritz 2000,
/// "Geodetic Reference System 1980", J. Geodesy 74, 128–133).
pub const EARTH_MEAN_RADIUS_M: f64 = 6_371_008.8;

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
/// use aggrade_core::layout::haversine_m;
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

/// The compact track layout of a panel column: the column's own tracks, narrowed so that four
/// columns fit across A3 landscape.
pub(super) fn panel_tracks() -> Tracks {
    use crate::layout::column::{GRAIN_CLASS_STEP_MM, GRAIN_MIN_WIDTH_MM};
    let lithology = GRAIN_MIN_WIDTH_MM + GRAIN_CLASS_STEP_MM * 11.0;
    Tracks::stacked([(11.0, 0.5), (lithology, 1.5), (11.0, 0.5), (8.0, 0.5), (5.0, 0.5)], None)
}

/// The horizontal layout: sections in panel order, the gaps between their columns and the scale
/// the gaps are drawn at.
pub(super) struct Horizontal {
    pub positions: Positions,
    /// Distance between neighbouring sections in panel order, m (never negative).
    pub deltas: Vec<f64>,
    /// Width of each gap on the page, mm.
    pub gaps: Vec<f64>,
    /// N of 1:N for the gaps; `None` for file order.
    pub denominator: Option<f64>,
    /// Gaps (index of the column left of the gap) widened to the minimum: not to scale.
    pub widened_gaps: Vec<usize>,
    /// Width of the columns with their strips, mm.
    pub slot_w: f64,
    /// Columns plus gaps, mm.
    pub panel_w: f64,
}

impl Horizontal {
    /// Space the columns: at the scale the options give, or the smallest round scale whose gaps
    /// fit the paper, or (tall single page) the largest round scale at which no gap needs
    /// widening. File order gets even gaps and no scale.
    pub fn plan(sections: &[Section], opts: &PanelOptions, slot_w: f64) -> Horizontal {
        let positions = panel_positions(sections);
        let (min_gap, margin) = (opts.min_gap(), opts.margin());
        let deltas: Vec<f64> = positions
            .order
            .windows(2)
            .map(|w| (positions.distance_m[w[1]] - positions.distance_m[w[0]]).max(0.0))
            .collect();
        let columns_w = sections.len() as f64 * slot_w;
        let gaps_for =
            |h: f64| -> Vec<f64> { deltas.iter().map(|d| (d * 1000.0 / h).max(min_gap)).collect() };
        let (denominator, gaps) = match positions.source {
            PositionSource::FileOrder => (None, vec![min_gap * 1.5; deltas.len()]),
            _ => {
                let h = match (opts.horizontal_scale_denominator, opts.layout.page_size_mm()) {
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
                        let smallest =
                            deltas.iter().copied().filter(|d| *d > 0.0).fold(f64::INFINITY, f64::min);
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
        let panel_w = columns_w + gaps.iter().sum::<f64>();
        Horizontal { positions, deltas, gaps, denominator, widened_gaps, slot_w, panel_w }
    }
}

/// How far the columns reach above and below the datum at the vertical scale, mm.
pub(super) fn vertical_reach_mm(sections: &[Section], datum_h: &[Option<f64>], v_scale: f64) -> (f64, f64) {
    let mm_per_m = 1000.0 / v_scale;
    let heights: Vec<(f64, f64)> =
        sections.iter().zip(datum_h).map(|(s, d)| (super::markers::top_m(s), d.unwrap_or(0.0))).collect();
    let above_mm = heights.iter().map(|(t, d)| (t - d) * mm_per_m).fold(0.0, f64::max);
    let below_mm = heights.iter().map(|(_, d)| d * mm_per_m).fold(0.0, f64::max);
    (above_mm, below_mm)
}

/// The page geometry, worked out once before anything is drawn: page size and the y of each
/// band, top to bottom (header, legend, key row, column heads, track titles, columns hung on the
/// datum, scale band, notes, footer caution), all in mm.
pub(super) struct Sheet {
    pub margin: f64,
    pub page_w: f64,
    pub page_h: f64,
    /// Page width inside the margins.
    pub usable_w: f64,
    pub header_h: f64,
    /// The footer caution, wrapped.
    pub caution_lines: Vec<String>,
    /// True when the page was made taller or wider than the chosen paper.
    pub enlarged: bool,
    pub y_legend: f64,
    pub y_key: f64,
    pub y_heads: f64,
    pub y_titles: f64,
    pub datum_y: f64,
    pub y_scale: f64,
    /// The compact tracks of every column.
    pub tracks: Tracks,
}

/// What the page must hold besides the fixed bands.
pub(super) struct Contents<'a> {
    /// Columns and gaps, mm.
    pub panel_w: f64,
    /// Reach of the columns above and below the datum, mm.
    pub above_mm: f64,
    pub below_mm: f64,
    pub legend_entries: usize,
    /// The notes known before drawing (the page-size note may add one more).
    pub notes: &'a [String],
}

impl Sheet {
    /// Size the page for `contents`: the chosen paper when the panel fits it, else a page
    /// lengthened (and widened when the columns need it) to keep the true scale.
    /// `header_mm` gives the header's height for a usable page width (mm).
    pub fn plan(
        opts: &PanelOptions,
        header_mm: &dyn Fn(f64) -> f64,
        contents: &Contents<'_>,
        tracks: Tracks,
    ) -> Sheet {
        let margin = opts.margin();
        let paper = opts.layout.page_size_mm();
        let (paper_w, paper_h) = paper.unwrap_or((210.0, 297.0));
        let page_w = paper_w.max(contents.panel_w + 2.0 * margin);
        let usable_w = page_w - 2.0 * margin;
        let legend_h = legend_height_mm(contents.legend_entries, usable_w);
        let caution_lines = wrap(REVIEW_CAUTION, usable_w - 28.0, NOTE_PT);
        let header_h = header_mm(usable_w);
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
        let need_h =
            fixed_h + notes_height_mm(contents.notes, usable_w) + contents.above_mm + contents.below_mm;
        let page_h = match paper {
            Some(_) if need_h <= paper_h => paper_h,
            // Room for the note that says the page was enlarged.
            Some(_) => {
                enlarged = true;
                need_h + 2.0 * NOTE_LINE_MM + 2.0
            }
            None => need_h,
        };
        let y_legend = margin + header_h;
        let y_key = y_legend + legend_h;
        let y_heads = y_key + KEY_ROW_MM;
        let y_titles = y_heads + HEAD_MM;
        let y_col_top = y_titles + TITLE_BAND_MM + PAD_MM;
        let datum_y = y_col_top + contents.above_mm;
        let y_col_bottom = datum_y + contents.below_mm;
        let y_scale = y_col_bottom + PAD_MM;
        Sheet {
            margin,
            page_w,
            page_h,
            usable_w,
            header_h,
            caution_lines,
            enlarged,
            y_legend,
            y_key,
            y_heads,
            y_titles,
            datum_y,
            y_scale,
            tracks,
        }
    }
}

/// Height the notes block takes at `usable_w` (mm): 0 without notes.
fn notes_height_mm(notes: &[String], usable_w: f64) -> f64 {
    let lines: usize = notes.iter().map(|n| wrap(n, usable_w, NOTE_PT).len()).sum();
    if lines == 0 {
        0.0
    } else {
        lines as f64 * NOTE_LINE_MM + 2.0
    }
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
