//! Drawing: the header with its distance bar, the key row, each column's head and interpretation
//! strip, the datum line and the tie lines, all placed by the [`Sheet`].

use super::markers::{find_marker, Marker};
use super::positions::{fmt_distance, PositionSource, Sheet};
use super::{
    Datum, HorizontalScale, PanelColumn, PanelOptions, TieLine, DATUM_BLUE, FLAG_ORANGE, LABEL_PITCH_MM,
    LINK_LINE_MM, LINK_TEAL, STRIP_MM, TIE_VIOLET,
};
use crate::layout::column::{
    body_bracket, body_labels, boundary_style, candidate_name, BracketEnd, ColumnCtx, TITLE_BAND_MM,
};
use crate::layout::items::{Item, PtMm, RectMm, Rgba, Stroke};
use crate::layout::legend::{legend_entries, LegendEntry};
use crate::layout::options::{LayoutOptions, PrintMeta};
use crate::layout::style::*;
use crate::layout::text::{fit_size, text, text_up, width, wrap_at_spaces};
use crate::model::{ReviewState, Section};
use crate::rules::{BoundaryCandidate, Censor, Interpretation};

/// Legend entries of the panel: rock entries of every column, then the panel's interpretation
/// marks; sorted, without repeats.
pub(super) fn legend(
    sections: &[Section],
    interps: &[Interpretation],
    opts: &PanelOptions,
    layout_opts: &LayoutOptions,
) -> Vec<LegendEntry> {
    let mut entries: Vec<LegendEntry> = Vec::new();
    for (s, it) in sections.iter().zip(interps) {
        let ctx = ColumnCtx::new(s, it, layout_opts);
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
    entries
}

/// One line of the page header: text, size (pt) and colour.
#[derive(Debug, Clone, PartialEq)]
pub(super) struct HeaderLine {
    pub text: String,
    pub size_pt: f64,
    pub colour: Rgba,
}

/// What the header says under the title, before wrapping: the datum, the horizontal scale in
/// words, where positions came from and which rules, and the document's name.
pub(super) struct HeaderText {
    title: String,
    vertical: String,
    statements: Vec<HeaderLine>,
    /// Whether a distance bar is drawn (some gap at the horizontal scale).
    pub bar: Option<f64>,
}

/// Width kept free at the right of the header for the vertical scale and the distance bar, mm.
const HEADER_RIGHT_MM: f64 = 46.0;
/// Baseline of the first line under the title, below the margin, mm.
const HEADER_FIRST_MM: f64 = 10.5;
/// Space from the last header line's baseline to the rule under the header, mm.
const HEADER_RULE_GAP_MM: f64 = 2.5;

impl HeaderText {
    pub fn new(
        scale: &HorizontalScale,
        gaps: usize,
        sections: &[Section],
        order: &[usize],
        opts: &PanelOptions,
        meta: &PrintMeta,
        rules: &str,
    ) -> Self {
        let title = if opts.title.trim().is_empty() { "Correlation panel" } else { opts.title.trim() };
        let datum = match &opts.datum {
            Datum::Base => "datum: section base (every column hung on its base)".to_string(),
            Datum::Named(n) => format!(
                "datum: {n} (columns hung on it; a column without it is hung on its base and flagged)"
            ),
        };
        let (h_line, not_to_scale) = scale.statement(gaps);
        let first = order.first().map(|&i| sections[i].name.as_str()).unwrap_or("");
        let source = match scale.source {
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
        facts.push(format!("candidates weaker than {} not drawn", opts.min_candidate_strength.name()));
        facts.push(format!("interpreted with {rules}"));
        if !meta.printed_on.is_empty() {
            facts.push(format!("printed {}", meta.printed_on));
        }
        let mut statements = vec![
            HeaderLine { text: datum, size_pt: TEXT_PT + 1.0, colour: DATUM_BLUE },
            HeaderLine {
                text: h_line,
                size_pt: TEXT_PT,
                colour: if not_to_scale { FLAG_ORANGE } else { INK },
            },
            HeaderLine { text: facts.join("  \u{b7}  "), size_pt: SMALL_PT + 0.5, colour: GREY },
        ];
        if !meta.subtitle.is_empty() {
            statements.push(HeaderLine { text: meta.subtitle.clone(), size_pt: SMALL_PT, colour: GREY });
        }
        let bar = scale.denominator.filter(|_| scale.widened_gaps.len() < gaps);
        HeaderText {
            title: title.to_string(),
            vertical: format!("vertical scale {}", opts.layout.scale_label()),
            statements,
            bar,
        }
    }

    /// Width the statements are wrapped to on a page `usable_w` wide (mm): clear of the vertical
    /// scale and distance bar on the right, and at most 55 % of the width, so that the lines stay
    /// on the page even where a screen draws small type larger than print (up to 1.7 times).
    pub fn wrap_width(usable_w: f64) -> f64 {
        (usable_w - HEADER_RIGHT_MM - 6.0).min(0.55 * usable_w).max(40.0)
    }

    /// The statements wrapped for a page `usable_w` wide, with the baseline of each line below
    /// the top margin (mm).
    pub fn lines(&self, usable_w: f64) -> Vec<(f64, HeaderLine)> {
        let w = Self::wrap_width(usable_w);
        let mut y = HEADER_FIRST_MM;
        let mut out = Vec::new();
        for st in &self.statements {
            for part in wrap_at_spaces(&st.text, w, st.size_pt) {
                out.push((y, HeaderLine { text: part, ..st.clone() }));
                y += st.size_pt * 0.3528 * 1.3;
            }
            y += 0.3;
        }
        out
    }

    /// Height of the header block on a page `usable_w` wide, down to just below its rule, mm.
    pub fn height_mm(&self, usable_w: f64) -> f64 {
        let last = self.lines(usable_w).last().map(|l| l.0).unwrap_or(HEADER_FIRST_MM);
        last + HEADER_RULE_GAP_MM + 2.0
    }
}

/// The page header: the title with the vertical scale on the right, then the datum, the
/// horizontal scale in words, where positions came from, which rules and the document's name,
/// each wrapped within the page; the distance bar under the vertical scale; and a rule.
pub(super) fn header(sheet: &Sheet, head: &HeaderText, out: &mut Vec<Item>) {
    let m = sheet.margin;
    let right = sheet.page_w - m;
    let vw = width(&head.vertical, 10.0);
    text(out, right - vw, m + 5.0, &head.vertical, 10.0, INK);
    let size = fit_size(&head.title, right - m - vw - 6.0, 14.0, 6.0).unwrap_or(6.0);
    text(out, m, m + 5.5, &head.title, size, INK);
    for (y, l) in head.lines(sheet.usable_w) {
        text(out, m, m + y, &l.text, l.size_pt, l.colour);
    }
    if let Some(h) = head.bar {
        distance_bar(h, right, m + 10.0, out);
    }
    let y = m + sheet.header_h - 2.0;
    out.push(Item::Polyline {
        points: vec![PtMm { x: m, y }, PtMm { x: right, y }],
        stroke: solid(THIN_MM, INK),
    });
}

/// A bar of a round ground distance at the horizontal scale, right-aligned at `right`.
fn distance_bar(denominator: f64, right: f64, y: f64, out: &mut Vec<Item>) {
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

/// How an interval's channel-body proportion is written in the strip and the key: "channel 45 %"
/// (a percentage named as such, never a bare "p", which reads as a p-value).
pub fn interval_proportion_label(p: f64) -> String {
    format!("channel {:.0} %", 100.0 * p)
}

/// A proportion (0–1) as a whole percentage: "21 %".
fn percent(p: f64) -> String {
    format!("{:.0} %", 100.0 * p)
}

/// The key row: the panel's own lines and labels.
/// The linked-tie entry is shown only when some section has a correlation label.
pub(super) fn key(x: f64, y: f64, any_link: bool, out: &mut Vec<Item>) {
    let row = y + 2.5;
    let mut cx = x;
    let mut entry =
        |stroke: Option<Stroke>, swatch_text: Option<(&str, Rgba)>, label: &str, out: &mut Vec<Item>| {
            if let Some(s) = stroke {
                out.push(Item::Polyline {
                    points: vec![PtMm { x: cx, y: row }, PtMm { x: cx + 9.0, y: row }],
                    stroke: s,
                });
            }
            // A sample of text takes as much room as it needs before its label.
            let mut swatch_w: f64 = 9.0;
            if let Some((t, c)) = swatch_text {
                text(out, cx, row + 0.9, t, SMALL_PT, c);
                swatch_w = swatch_w.max(width(t, SMALL_PT));
            }
            text(out, cx + swatch_w + 2.0, row + 0.9, label, SMALL_PT + 0.5, INK);
            cx += swatch_w + 2.0 + width(label, SMALL_PT + 0.5) + 6.0;
        };
    entry(Some(solid(0.35, DATUM_BLUE)), None, "datum", out);
    entry(Some(dashed(0.3, TIE_VIOLET, &[1.8, 1.0])), None, "tie line, same surface name", out);
    entry(Some(dashed(0.45, BOUNDARY_RED, &[2.4, 1.0])), None, "tie line, accepted boundaries", out);
    if any_link {
        entry(
            Some(solid(LINK_LINE_MM, LINK_TEAL)),
            None,
            "tie line, accepted boundaries with one correlation label (label on it)",
            out,
        );
    }
    entry(
        None,
        Some((&interval_proportion_label(0.45), CURVE_GREEN)),
        "channel-body proportion of the interval between accepted boundaries",
        out,
    );
    entry(None, Some(("n.t.s.", FLAG_ORANGE)), "gap not to horizontal scale", out);
}

/// Block above a column, from `y` down: name, position, datum status, channel-body proportion.
pub(super) fn head(
    ctx: &ColumnCtx<'_>,
    column: &PanelColumn,
    source: PositionSource,
    datum: &Datum,
    y: f64,
    out: &mut Vec<Item>,
) {
    let (s, it) = (ctx.section, ctx.interp);
    let (x, w) = (column.x_mm, column.width_mm);
    let datum_label = datum.label();
    let name = if s.name.trim().is_empty() { "(unnamed section)" } else { s.name.as_str() };
    let size = fit_size(name, w - 1.0, 9.0, 5.0).unwrap_or(5.0);
    text(out, x, y + 3.5, name, size, INK);
    let pos = match source {
        PositionSource::FileOrder => format!("column {} (no position)", column.distance_m.round() as i64 + 1),
        _ => format!("at {}", fmt_distance(column.distance_m)),
    };
    text(out, x, y + 6.8, &pos, SMALL_PT + 0.5, GREY);
    let unit = super::words::height_unit(s);
    let unit_name = unit.name();
    let (datum_line, colour) = match column.datum_height_m {
        Some(_) if datum_label == "section base" => {
            (format!("hung on base; {:.1} {unit_name} thick", unit.from_metres(total(it))), INK)
        }
        Some(h) => (format!("hung on {datum_label} at {:.2} {unit_name}", unit.from_metres(h)), DATUM_BLUE),
        None => (format!("NO {datum_label}: hung on base"), FLAG_ORANGE),
    };
    let size = fit_size(&datum_line, w - 1.0, SMALL_PT + 0.5, 4.0).unwrap_or(4.0);
    text(out, x, y + 9.8, &datum_line, size, colour);
    let p = match (it.channel_proportion, it.channel_proportion_bounds) {
        (Some(p), Some(b)) if it.has_cover() => format!(
            "channel bodies {} of exposed thickness ({}\u{2013}{} with cover)",
            percent(p),
            percent(b.covered_as_fines).trim_end_matches(" %"),
            percent(b.covered_as_channel)
        ),
        (Some(p), _) => format!("channel bodies {} of exposed thickness", percent(p)),
        (None, _) => "channel bodies: no exposure".to_string(),
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
pub(super) fn strip_titles(x: f64, y_top: f64, out: &mut Vec<Item>) {
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
pub(super) fn strip(
    ctx: &ColumnCtx<'_>,
    column: &PanelColumn,
    markers: &[Marker],
    opts: &PanelOptions,
    out: &mut Vec<Item>,
) {
    let (x0, t) = (column.x_mm, &column.heights);
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
        let [_, with_thickness, short] = body_labels(body, ctx.section.display_unit);
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
        let (stroke, label, colour) = boundary_style(c.review, c.strength, candidate_name(c));
        out.push(Item::Polyline { points: vec![PtMm { x: line_start, y }, PtMm { x: line_end, y }], stroke });
        labels.push((y, label, colour));
    }
    let has_datum = column.datum_height_m.is_some();
    for m in markers {
        let is_datum = has_datum
            && matches!(&opts.datum, Datum::Named(n) if find_marker(markers, n).is_some_and(|d| d.name == m.name));
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
                labels.push((y, interval_proportion_label(p), CURVE_GREEN));
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

/// "n.t.s." centred in a gap of `gap` mm starting at `x`, for a gap not to horizontal scale.
pub(super) fn not_to_scale(x: f64, gap: f64, y_titles: f64, out: &mut Vec<Item>) {
    let label = "n.t.s.";
    let size = fit_size(label, gap - 1.0, SMALL_PT, 3.5).unwrap_or(3.5);
    let w = width(label, size);
    text(out, x + (gap - w) / 2.0, y_titles + 3.0, label, size, FLAG_ORANGE);
}

/// The datum line: with a named datum, through the columns that have it and across the gaps
/// between two of them; on the section base, one line across the whole panel.
pub(super) fn datum_line(columns: &[PanelColumn], datum: &Datum, sheet: &Sheet, out: &mut Vec<Item>) {
    let lith_x = sheet.tracks.lithology.x_mm;
    let y = sheet.datum_y;
    if !matches!(datum, Datum::Base) {
        for (k, c) in columns.iter().enumerate() {
            if c.datum_height_m.is_none() {
                continue;
            }
            let x_end = match columns.get(k + 1) {
                Some(next) if next.datum_height_m.is_some() => next.x_mm + lith_x,
                _ => c.x_mm + c.width_mm,
            };
            out.push(Item::Polyline {
                points: vec![PtMm { x: c.x_mm + lith_x, y }, PtMm { x: x_end, y }],
                stroke: solid(0.35, DATUM_BLUE),
            });
        }
    } else if let Some(last) = columns.last() {
        out.push(Item::Polyline {
            points: vec![PtMm { x: sheet.margin + lith_x, y }, PtMm { x: last.x_mm + last.width_mm, y }],
            stroke: solid(0.35, DATUM_BLUE),
        });
    }
}

/// Tie lines: solid with their label for linked ties, dashed red between accepted boundaries,
/// dashed violet between named surfaces.
pub(super) fn ties(ties: &[TieLine], out: &mut Vec<Item>) {
    for tie in ties {
        let stroke = match (tie.linked, tie.accepted) {
            (true, _) => solid(LINK_LINE_MM, LINK_TEAL),
            (false, true) => dashed(0.45, BOUNDARY_RED, &[2.4, 1.0]),
            (false, false) => dashed(0.3, TIE_VIOLET, &[1.8, 1.0]),
        };
        out.push(Item::Polyline { points: vec![tie.from, tie.to], stroke });
        if tie.linked {
            tie_label(&tie.name, tie.from, tie.to, out);
        }
    }
}

/// A linked tie's label, once, at the middle of the tie and just above it, on the side the line
/// leaves free: right of the middle when the tie runs down to the right, left of it when it runs
/// up, centred when it is level.
fn tie_label(label: &str, from: PtMm, to: PtMm, out: &mut Vec<Item>) {
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

/// Whether a boundary candidate is drawn: accepted always; rejected only on request; others
/// when they score at least the panel's minimum.
fn shown(c: &BoundaryCandidate, opts: &PanelOptions) -> bool {
    match c.review {
        ReviewState::Accepted => true,
        ReviewState::Rejected => opts.layout.show_rejected,
        ReviewState::Candidate => c.strength >= opts.min_candidate_strength,
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
