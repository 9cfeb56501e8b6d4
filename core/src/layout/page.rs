//! Printed pages: header, legend, column segments continued across (and side by side on) pages,
//! page numbers and the review caution in the footer.

use super::column::{BedBox, ColumnCtx, SCALE_BAND_MM, TITLE_BAND_MM};
use super::items::{Item, PtMm};
use super::legend::{draw_legend, legend_entries, legend_height_mm, LegendEntry};
use super::options::{LayoutOptions, PrintMeta};
use super::style::*;
use super::text::{fit_size, text, width, wrap};
use super::transform::HeightTransform;
use crate::model::{LengthUnit, Section};
use crate::rules::Interpretation;
use crate::REVIEW_CAUTION;
use serde::Serialize;

/// Height of the page header, mm.
const HEADER_MM: f64 = 17.0;
/// Space above a segment's title band for its height range, mm.
const SEGMENT_HEAD_MM: f64 = 5.0;
/// Padding between title band and column, and column and scale, mm.
const PAD_MM: f64 = 3.0;
/// Gap between side-by-side segments, mm.
const SEGMENT_GAP_MM: f64 = 4.0;
/// Text size of the footer caution, pt.
const FOOTER_PT: f64 = 6.0;
/// Shortest column worth putting on a page, mm.
const MIN_COLUMN_MM: f64 = 30.0;
/// A segment ends at a bed boundary if one lies in the top 15% of its height (common practice:
/// avoid cutting beds); otherwise the bed is cut and continues on the next segment.
const BREAK_SEARCH_FRACTION: f64 = 0.15;

/// One column segment on a page.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PageSegment {
    /// Height range shown, m above the section base.
    pub base_m: f64,
    pub top_m: f64,
    /// x (mm) of the segment's left edge on the page.
    pub x_mm: f64,
    /// Heights ↔ y on this page for this segment.
    pub heights: HeightTransform,
    /// Beds drawn in this segment (a bed cut at a segment boundary appears in both).
    pub bed_boxes: Vec<BedBox>,
}

/// A printed page.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Page {
    pub width_mm: f64,
    pub height_mm: f64,
    pub items: Vec<Item>,
    pub segments: Vec<PageSegment>,
}

/// The vertical budget of a page.
struct Frame {
    width: f64,
    height: f64,
    margin: f64,
    footer_h: f64,
}

impl Frame {
    /// Column height available below `y_top` (where the segment head starts).
    fn column_room(&self, y_top: f64) -> f64 {
        self.height
            - self.margin
            - self.footer_h
            - y_top
            - SEGMENT_HEAD_MM
            - TITLE_BAND_MM
            - 2.0 * PAD_MM
            - SCALE_BAND_MM
    }
}

/// The footer: the review caution and which rules produced the interpretation.
fn footer_lines(rules: &str, page_w: f64, margin: f64) -> Vec<String> {
    wrap(&format!("{REVIEW_CAUTION} Interpreted with {rules}."), page_w - 2.0 * margin - 28.0, FOOTER_PT)
}

/// Lay out printed pages of the interpreted column, all at once. [`page_stream`] gives the same
/// pages one at a time.
pub fn pages(
    section: &Section,
    interp: &Interpretation,
    opts: &LayoutOptions,
    meta: &PrintMeta,
) -> Vec<Page> {
    page_stream(section, interp, opts, meta).collect()
}

/// Where one printed page's column goes: planned before any page is drawn, so the page count
/// (for "page k of n") is known while pages are drawn one at a time.
#[derive(Debug, Clone)]
struct PagePlan {
    /// The first page carries the legend.
    legend: bool,
    /// y (mm) where the segment heads start.
    y_top: f64,
    /// Height ranges (m) of the segments, left to right.
    segments: Vec<(f64, f64)>,
}

/// Printed pages of the interpreted column, laid out one at a time as they are asked for (an
/// iterator), so a writer can put each page out before the next is drawn and memory does not
/// grow with the section. The pages are the same, item for item, as [`pages`] gives.
pub struct PageStream<'a> {
    ctx: ColumnCtx<'a>,
    opts: &'a LayoutOptions,
    meta: &'a PrintMeta,
    rules: String,
    entries: Vec<LegendEntry>,
    frame: Frame,
    header_h: f64,
    usable_w: f64,
    curves_note: Option<String>,
    plan: Vec<PagePlan>,
    next: usize,
}

/// Lay out the printed pages lazily: the page breaks are worked out first (cheap: heights only),
/// then each page is drawn when the iterator reaches it.
pub fn page_stream<'a>(
    section: &'a Section,
    interp: &'a Interpretation,
    opts: &'a LayoutOptions,
    meta: &'a PrintMeta,
) -> PageStream<'a> {
    let mut ctx = ColumnCtx::new(section, interp, opts);
    let rules = interp.params.summary();
    let entries = legend_entries(&ctx);
    let margin = if opts.margin_mm.is_finite() { opts.margin_mm.clamp(3.0, 40.0) } else { 12.0 };
    if let Some((w, _)) = opts.page_size_mm() {
        ctx.fit_curves(w - 2.0 * margin);
    }
    let curves_note = curves_note(ctx.tracks.curves.count, section.curves.len());
    let strip_w = ctx.tracks.width_mm;
    let header_h = HEADER_MM + if meta.subtitle.is_empty() { 0.0 } else { 3.0 };
    let mm_per_m = 1000.0 / opts.scale();
    let total_mm = ctx.total_m * mm_per_m;

    let (frame, tall) = match opts.page_size_mm() {
        Some((w, h)) => {
            let footer_h = footer_lines(&rules, w, margin).len() as f64 * 2.6 + 3.0;
            (Frame { width: w, height: h, margin, footer_h }, false)
        }
        None => {
            let w = (strip_w + 2.0 * margin).max(210.0);
            let footer_h = footer_lines(&rules, w, margin).len() as f64 * 2.6 + 3.0;
            let legend_h = legend_height_mm(entries.len(), w - 2.0 * margin);
            let h = margin
                + header_h
                + legend_h
                + 2.0
                + SEGMENT_HEAD_MM
                + TITLE_BAND_MM
                + 2.0 * PAD_MM
                + total_mm
                + SCALE_BAND_MM
                + footer_h
                + margin;
            (Frame { width: w, height: h, margin, footer_h }, true)
        }
    };
    let usable_w = frame.width - 2.0 * margin;
    let per_page = (((usable_w + SEGMENT_GAP_MM) / (strip_w + SEGMENT_GAP_MM)).floor() as usize).max(1);
    let legend_h = legend_height_mm(entries.len(), usable_w);

    let mut plan: Vec<PagePlan> = Vec::new();
    let mut cur = 0.0_f64;
    let mut first = true;
    let eps = 1e-9;
    loop {
        let mut y_top = margin + header_h;
        if first {
            y_top += legend_h + if legend_h > 0.0 { 2.0 } else { 0.0 };
        }
        let mut page = PagePlan { legend: first, y_top, segments: Vec::new() };
        let room_mm = if tall { total_mm } else { frame.column_room(y_top) };
        if room_mm < MIN_COLUMN_MM && !tall && first && ctx.total_m > 0.0 {
            // The legend leaves no room: the column starts on the next page.
            plan.push(page);
            first = false;
            continue;
        }
        // Never fewer than 5 mm per segment, so the loop always advances.
        let room_mm = room_mm.max(5.0);
        first = false;
        let cap_m = room_mm / mm_per_m;
        for k in 0..per_page {
            if k > 0 && cur >= ctx.total_m - eps {
                break;
            }
            let end = if tall || cur + cap_m >= ctx.total_m - eps {
                ctx.total_m
            } else {
                break_height(&ctx.tops_m, cur, cur + cap_m)
            };
            page.segments.push((cur, end));
            cur = end;
        }
        plan.push(page);
        if cur >= ctx.total_m - eps {
            break;
        }
    }
    PageStream { ctx, opts, meta, rules, entries, frame, header_h, usable_w, curves_note, plan, next: 0 }
}

impl PageStream<'_> {
    /// How many pages the column prints to (all of them, drawn or not yet).
    pub fn page_count(&self) -> usize {
        self.plan.len()
    }

    /// Draw page `index` (0-based) of the plan.
    fn draw_page(&self, index: usize) -> Page {
        let (ctx, opts, frame) = (&self.ctx, self.opts, &self.frame);
        let plan = &self.plan[index];
        let margin = frame.margin;
        let strip_w = ctx.tracks.width_mm;
        let mut page =
            Page { width_mm: frame.width, height_mm: frame.height, items: Vec::new(), segments: Vec::new() };
        draw_header(ctx.section, opts, self.meta, frame, self.header_h, &mut page.items);
        if plan.legend {
            draw_legend(&self.entries, margin, margin + self.header_h, self.usable_w, &mut page.items);
        }
        let y_top = plan.y_top;
        for (k, &(cur, end)) in plan.segments.iter().enumerate() {
            let x0 = margin + k as f64 * (strip_w + SEGMENT_GAP_MM);
            let y_titles = y_top + SEGMENT_HEAD_MM;
            let y_col_top = y_titles + TITLE_BAND_MM + PAD_MM;
            let y_base = y_col_top + (end - cur) * (1000.0 / opts.scale());
            let heights = HeightTransform::new(y_base, cur, opts.scale());
            let mut boxes = Vec::new();
            let unit = ctx.section.display_unit;
            let head = segment_head(cur, end, unit);
            text(&mut page.items, x0, y_top + 3.2, &head, TEXT_PT, INK);
            if let Some(note) = &self.curves_note {
                let x = x0 + width(&head, TEXT_PT) + 3.0;
                let size = fit_size(note, x0 + strip_w - x, SMALL_PT, 3.5).unwrap_or(3.5);
                text(&mut page.items, x, y_top + 3.2, note, size, GREY);
            }
            ctx.draw_titles(x0, y_titles, &mut page.items);
            ctx.draw_range(cur, end, x0, &heights, &mut page.items, &mut boxes);
            ctx.draw_scale(x0, y_base + PAD_MM, &mut page.items);
            page.segments.push(PageSegment { base_m: cur, top_m: end, x_mm: x0, heights, bed_boxes: boxes });
        }
        draw_footer(frame, &self.rules, index + 1, self.plan.len(), &mut page.items);
        page
    }
}

impl Iterator for PageStream<'_> {
    type Item = Page;

    fn next(&mut self) -> Option<Page> {
        if self.next >= self.plan.len() {
            return None;
        }
        let page = self.draw_page(self.next);
        self.next += 1;
        Some(page)
    }

    fn size_hint(&self) -> (usize, Option<usize>) {
        let left = self.plan.len() - self.next;
        (left, Some(left))
    }
}

impl ExactSizeIterator for PageStream<'_> {}

/// Where a segment starting at `from` and able to reach `limit` should end: the highest bed top
/// in the upper part of its range, or `limit` (cutting a bed) if there is none.
fn break_height(tops: &[f64], from: f64, limit: f64) -> f64 {
    let lowest = from + (limit - from) * (1.0 - BREAK_SEARCH_FRACTION);
    let k = tops.partition_point(|&t| t <= limit + 1e-9);
    match k.checked_sub(1).map(|j| tops[j]) {
        Some(t) if t >= lowest && t > from => t,
        _ => limit,
    }
}

/// A note for the segment heads when not every attached curve has a track.
fn curves_note(drawn: usize, attached: usize) -> Option<String> {
    (drawn < attached).then(|| {
        format!("{drawn} of {attached} measured curves drawn: the rest do not fit beside the column on this paper")
    })
}

/// "0.00–24.35 m" (or ft) for a segment's head.
fn segment_head(base_m: f64, top_m: f64, unit: LengthUnit) -> String {
    let (u, name) = match unit {
        LengthUnit::Foot => (LengthUnit::Foot, "ft"),
        _ => (LengthUnit::Metre, "m"),
    };
    format!("{:.2}\u{2013}{:.2} {name}", u.from_metres(base_m), u.from_metres(top_m))
}

fn fmt_coord(v: f64, pos: char, neg: char) -> String {
    format!("{:.5}\u{b0} {}", v.abs(), if v >= 0.0 { pos } else { neg })
}

fn draw_header(
    section: &Section,
    opts: &LayoutOptions,
    meta: &PrintMeta,
    f: &Frame,
    header_h: f64,
    out: &mut Vec<Item>,
) {
    let m = f.margin;
    let right = f.width - m;
    let scale = format!("scale {}", opts.scale_label());
    let scale_w = width(&scale, 10.0);
    text(out, right - scale_w, m + 5.0, &scale, 10.0, INK);
    let name = if section.name.trim().is_empty() { "(unnamed section)" } else { section.name.as_str() };
    let title_size = fit_size(name, right - m - scale_w - 6.0, 14.0, 7.0).unwrap_or(7.0);
    text(out, m, m + 5.5, name, title_size, INK);
    let mut facts: Vec<String> = Vec::new();
    if !section.locality.is_empty() {
        facts.push(section.locality.clone());
    }
    if let Some(c) = section.coordinates.filter(|c| c.lat_deg.is_finite() && c.lon_deg.is_finite()) {
        facts.push(format!("{}, {}", fmt_coord(c.lat_deg, 'N', 'S'), fmt_coord(c.lon_deg, 'E', 'W')));
    }
    if let Some(d) = section.date_logged.as_ref().filter(|d| !d.is_empty()) {
        facts.push(format!("logged {d}"));
    }
    if !section.logged_by.is_empty() {
        facts.push(format!("by {}", section.logged_by));
    }
    let line = facts.join("  \u{b7}  ");
    let unit = match section.display_unit {
        LengthUnit::Foot => "ft",
        _ => "m",
    };
    let right_line = if meta.printed_on.is_empty() {
        format!("heights in {unit} above section base")
    } else {
        format!("heights in {unit} above section base  \u{b7}  printed {}", meta.printed_on)
    };
    let rw = width(&right_line, SMALL_PT + 0.5);
    text(out, right - rw, m + 10.0, &right_line, SMALL_PT + 0.5, GREY);
    if let Some(size) = fit_size(&line, right - m - rw - 4.0, TEXT_PT + 0.5, 4.5) {
        text(out, m, m + 10.0, &line, size, INK);
    } else {
        text(out, m, m + 10.0, &line, 4.5, INK);
    }
    if !meta.subtitle.is_empty() {
        text(out, m, m + 13.0, &meta.subtitle, SMALL_PT, GREY);
    }
    let y = m + header_h - 3.0;
    out.push(Item::Polyline {
        points: vec![PtMm { x: m, y }, PtMm { x: right, y }],
        stroke: solid(THIN_MM, INK),
    });
}

fn draw_footer(f: &Frame, rules: &str, page: usize, n: usize, out: &mut Vec<Item>) {
    let m = f.margin;
    let lines = footer_lines(rules, f.width, m);
    let y0 = f.height - m - lines.len() as f64 * 2.6 + 1.6;
    out.push(Item::Polyline {
        points: vec![PtMm { x: m, y: y0 - 2.8 }, PtMm { x: f.width - m, y: y0 - 2.8 }],
        stroke: solid(HAIR_MM, GREY),
    });
    for (k, l) in lines.iter().enumerate() {
        text(out, m, y0 + k as f64 * 2.6, l, FOOTER_PT, INK);
    }
    let label = format!("page {page} of {n}");
    let w = width(&label, TEXT_PT);
    text(out, f.width - m - w, y0, &label, TEXT_PT, INK);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn breaks_prefer_bed_tops() {
        let tops = [1.0, 2.0, 9.0, 13.0, 20.0];
        // Room up to 10 m: bed top at 9 lies in the top 15% (8.5–10) → break there.
        assert_eq!(break_height(&tops, 0.0, 10.0), 9.0);
        // Room up to 8 m: no top in 6.8–8 → cut at 8.
        assert_eq!(break_height(&tops, 0.0, 8.0), 8.0);
        assert_eq!(break_height(&tops, 9.0, 13.0), 13.0);
    }
}

#[cfg(test)]
mod paging_tests {
    use super::*;
    use crate::layout::column::Tracks;
    use crate::layout::options::{Orientation, Paper};
    use crate::layout::sample::{generated_section, sample_interpretation, sample_section};

    fn check(section: &Section, pages: &[Page]) {
        let segs: Vec<&PageSegment> = pages.iter().flat_map(|p| p.segments.iter()).collect();
        assert!(!segs.is_empty());
        assert_eq!(segs[0].base_m, 0.0);
        for w in segs.windows(2) {
            assert_eq!(w[0].top_m, w[1].base_m, "segments join up");
        }
        assert!((segs[segs.len() - 1].top_m - section.total_thickness_m()).abs() < 1e-6);
        let bases = section.base_heights_m();
        let mut count = vec![0usize; section.beds.len()];
        for s in &segs {
            for b in &s.bed_boxes {
                count[b.bed_index] += 1;
            }
        }
        for (k, n) in count.iter().enumerate() {
            let top = bases[k] + section.beds[k].thickness_m;
            let cuts = segs.iter().filter(|s| s.top_m > bases[k] + 1e-9 && s.top_m < top - 1e-9).count();
            assert_eq!(*n, 1 + cuts, "bed {k} drawn {n} times with {cuts} cuts");
        }
        for p in pages {
            for s in &p.segments {
                // Every segment fits on its page.
                assert!(s.heights.y_mm(s.base_m) <= p.height_mm, "segment runs off the page");
                assert!(s.x_mm >= 0.0 && s.x_mm < p.width_mm);
            }
        }
    }

    #[test]
    fn page_breaking_never_drops_or_duplicates_a_bed() {
        let (long, li) = generated_section(700);
        let demo = sample_section();
        let di = sample_interpretation(&demo);
        let meta = PrintMeta { printed_on: "2026-12-01".into(), subtitle: "demo.aggrade".into() };
        for (s, i) in [(&long, &li), (&demo, &di)] {
            for paper in [Paper::A4, Paper::A3, Paper::Letter, Paper::TallSingle] {
                for orientation in [Orientation::Portrait, Orientation::Landscape] {
                    for scale in [10.0, 50.0, 100.0, 500.0] {
                        let opts = LayoutOptions {
                            paper,
                            orientation,
                            scale_denominator: scale,
                            ..Default::default()
                        };
                        let p = pages(s, i, &opts, &meta);
                        check(s, &p);
                        if paper == Paper::TallSingle {
                            assert_eq!(p.len(), 1);
                        }
                    }
                }
            }
        }
    }

    #[test]
    fn landscape_pages_put_segments_side_by_side() {
        let (s, i) = generated_section(300);
        // A4 landscape: 273 mm between margins holds two 134 mm segments; A3 landscape (396 mm) too.
        for (paper, n) in [(Paper::A4, 2), (Paper::A3, 2)] {
            let opts = LayoutOptions { paper, orientation: Orientation::Landscape, ..Default::default() };
            let p = pages(&s, &i, &opts, &PrintMeta::default());
            assert_eq!(p[1].segments.len(), n, "{paper:?} landscape");
            let last = &p[1].segments[n - 1];
            assert!(last.x_mm + Tracks::new(&opts).width_mm <= p[1].width_mm - opts.margin_mm + 1e-9);
        }
        let opts =
            LayoutOptions { paper: Paper::A3, orientation: Orientation::Landscape, ..Default::default() };
        let p = pages(&s, &i, &opts, &PrintMeta::default());
        for pg in &p {
            for w in pg.segments.windows(2) {
                assert!(w[1].x_mm > w[0].x_mm, "left to right, lowest first");
            }
        }
    }
}
