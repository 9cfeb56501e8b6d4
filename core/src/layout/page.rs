//! Printed pages: header, legend, column segments continued across (and side by side on) pages,
//! page numbers and the review caution in the footer.

use super::column::{
    setting_lines, BedBox, ColumnCtx, SCALE_BAND_MM, SETTING_LINE_MM, SETTING_PT, TITLE_BAND_MM,
};
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
    /// Heights the column may be cut at between pieces without cutting an interpretation interval.
    cuts: PieceCuts,
    /// The header's measurement lines, the same on every page.
    setting: Vec<String>,
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
    let page_w = opts.page_size_mm().map(|(w, _)| w).unwrap_or((strip_w + 2.0 * margin).max(210.0));
    // Worked out once: the slope note counts beds, so per page it grew with pages × beds.
    let setting = setting_lines(section, page_w - 2.0 * margin);
    let setting_h = setting.len() as f64 * SETTING_LINE_MM;
    let header_h = HEADER_MM + if meta.subtitle.is_empty() { 0.0 } else { 3.0 } + setting_h;
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
    let cuts = PieceCuts::new(interp);
    PageStream {
        ctx,
        opts,
        meta,
        rules,
        entries,
        frame,
        header_h,
        usable_w,
        curves_note,
        plan,
        next: 0,
        cuts,
        setting,
    }
}

impl PageStream<'_> {
    /// How many pages the column prints to (all of them, drawn or not yet).
    pub fn page_count(&self) -> usize {
        self.plan.len()
    }

    /// Width and height of the paper, mm (every page of one stream has the same).
    pub fn page_size_mm(&self) -> (f64, f64) {
        (self.frame.width, self.frame.height)
    }

    /// The next page, drawn and handed to `piece` a part at a time instead of as one [`Page`]:
    /// header, legend and track titles first, then the column a few hundred beds at a time
    /// (cut at bed tops outside every storey, channel body, paleosol profile, regime and
    /// proportion interval where one is near), then the scale and footer. Written one after
    /// another, the pieces draw the same page as [`Iterator::next`] gives; a page as tall as the
    /// whole column (the `tall` paper) so never has all its items in memory at once. `None`
    /// after the last page; otherwise the first error `piece` returned, if any.
    pub fn next_in_pieces<E>(
        &mut self,
        mut piece: impl FnMut(&[Item]) -> Result<(), E>,
    ) -> Option<Result<(), E>> {
        if self.next >= self.plan.len() {
            return None;
        }
        let index = self.next;
        self.next += 1;
        let mut items = Vec::new();
        let result = self.draw_into(index, PIECE_BEDS, &mut items, &mut |items, _segment| {
            piece(items)?;
            items.clear();
            Ok(())
        });
        Some(result.and_then(|()| piece(&items)))
    }

    /// Draw page `index` (0-based) of the plan.
    fn draw_page(&self, index: usize) -> Page {
        let frame = &self.frame;
        let mut items = Vec::new();
        let mut segments = Vec::new();
        let drawn = self.draw_into(index, usize::MAX, &mut items, &mut |_items, segment| {
            segments.extend(segment);
            Ok::<(), std::convert::Infallible>(())
        });
        match drawn {
            Ok(()) => Page { width_mm: frame.width, height_mm: frame.height, items, segments },
            Err(never) => match never {},
        }
    }

    /// Draw page `index` into `items`, calling `flush` after each piece of a segment's column
    /// (with `None`) and after each segment (with the segment). A segment's column is drawn
    /// `piece_beds` beds at a time at most (`usize::MAX`: whole, and bed boxes kept; otherwise
    /// the boxes are dropped after each piece).
    fn draw_into<E>(
        &self,
        index: usize,
        piece_beds: usize,
        items: &mut Vec<Item>,
        flush: &mut Flush<'_, E>,
    ) -> Result<(), E> {
        let (ctx, opts, frame) = (&self.ctx, self.opts, &self.frame);
        let plan = &self.plan[index];
        let margin = frame.margin;
        let strip_w = ctx.tracks.width_mm;
        let whole = piece_beds == usize::MAX;
        draw_header(ctx.section, opts, self.meta, frame, self.header_h, &self.setting, items);
        if plan.legend {
            draw_legend(&self.entries, margin, margin + self.header_h, self.usable_w, items);
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
            text(items, x0, y_top + 3.2, &head, TEXT_PT, INK);
            if let Some(note) = &self.curves_note {
                let x = x0 + width(&head, TEXT_PT) + 3.0;
                let size = fit_size(note, x0 + strip_w - x, SMALL_PT, 3.5).unwrap_or(3.5);
                text(items, x, y_top + 3.2, note, size, GREY);
            }
            ctx.draw_titles(x0, y_titles, items);
            let mut lo = cur;
            loop {
                let hi = if whole { end } else { self.piece_top(lo, end, piece_beds) };
                ctx.draw_range(lo, hi, x0, &heights, items, &mut boxes);
                if hi >= end {
                    break;
                }
                flush(items, None)?;
                boxes.clear();
                lo = hi;
            }
            ctx.draw_scale(x0, y_base + PAD_MM, items);
            flush(items, Some(PageSegment { base_m: cur, top_m: end, x_mm: x0, heights, bed_boxes: boxes }))?;
        }
        draw_footer(frame, &self.rules, index + 1, self.plan.len(), items);
        Ok(())
    }

    fn piece_top(&self, lo: f64, end: f64, piece_beds: usize) -> f64 {
        piece_top(&self.ctx, &self.cuts, lo, end, piece_beds)
    }
}

/// Where a piece of a column starting at `lo` ends: at the top of the bed `piece_beds` beds
/// up, or of a later bed within [`PIECE_SEARCH_BEDS`] whose top cuts no interpretation interval
/// (then none but regimes and proportion intervals); `end` when it is nearer.
pub(super) fn piece_top(ctx: &ColumnCtx<'_>, cuts: &PieceCuts, lo: f64, end: f64, piece_beds: usize) -> f64 {
    let tops = &ctx.tops_m;
    let eps = 1e-9;
    let want = tops.partition_point(|&t| t <= lo + eps).saturating_add(piece_beds);
    if want >= tops.len() || tops[want] >= end - eps {
        return end;
    }
    let last = want.saturating_add(PIECE_SEARCH_BEDS).min(tops.len());
    for strict in [true, false] {
        for &h in &tops[want..last] {
            if h >= end - eps {
                break;
            }
            if cuts.clear_at(h, strict) {
                return h;
            }
        }
    }
    tops[want]
}

/// What [`PageStream::draw_into`] calls after each piece of a segment's column (`None`) and after
/// each segment (with it): hands the items on, or keeps them.
type Flush<'f, E> = dyn FnMut(&mut Vec<Item>, Option<PageSegment>) -> Result<(), E> + 'f;

/// Beds in one piece of [`PageStream::next_in_pieces`]: a piece's items take a few hundred
/// kilobytes whatever the length of the page.
pub(super) const PIECE_BEDS: usize = 200;
/// How many beds past [`PIECE_BEDS`] a piece may run to end where it cuts no interval.
const PIECE_SEARCH_BEDS: usize = 1_000;

/// Heights where the interpretation tracks have an interval running across (open intervals,
/// merged and sorted), so pieces of a column can be cut where nothing is drawn across the cut.
#[derive(Debug, Default)]
pub(super) struct PieceCuts {
    /// Storeys, channel bodies and paleosol profiles.
    bodies: Vec<(f64, f64)>,
    /// The same with the accommodation regimes and interval proportions.
    all: Vec<(f64, f64)>,
}

impl PieceCuts {
    pub(super) fn new(interp: &Interpretation) -> Self {
        let bodies: Vec<(f64, f64)> = interp
            .storeys
            .iter()
            .map(|s| (s.base_m, s.top_m))
            .chain(interp.channel_bodies.iter().map(|b| (b.base_m, b.top_m)))
            .chain(interp.paleosols.iter().map(|p| (p.base_m, p.top_m)))
            .collect();
        let mut all = bodies.clone();
        all.extend(interp.accommodation.iter().map(|r| (r.base_m, r.top_m)));
        all.extend(interp.interval_proportions.iter().map(|p| (p.base_m, p.top_m)));
        PieceCuts { bodies: merged(bodies), all: merged(all) }
    }

    /// True when no interval runs across height `h` (only storeys, bodies and paleosols when
    /// not `strict`).
    fn clear_at(&self, h: f64, strict: bool) -> bool {
        let spans = if strict { &self.all } else { &self.bodies };
        let k = spans.partition_point(|&(_, top)| top <= h);
        spans.get(k).is_none_or(|&(base, _)| base >= h)
    }
}

/// Open intervals sorted by base and merged where they overlap (intervals that only touch stay
/// apart: their shared end is clear); intervals with a non-finite end are left out.
fn merged(mut spans: Vec<(f64, f64)>) -> Vec<(f64, f64)> {
    spans.retain(|(b, t)| b.is_finite() && t.is_finite() && t > b);
    spans.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut out: Vec<(f64, f64)> = Vec::with_capacity(spans.len());
    for (b, t) in spans {
        match out.last_mut() {
            Some(last) if b < last.1 => last.1 = last.1.max(t),
            _ => out.push((b, t)),
        }
    }
    out
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

fn draw_header(
    section: &Section,
    opts: &LayoutOptions,
    meta: &PrintMeta,
    f: &Frame,
    header_h: f64,
    setting: &[String],
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
    let mut y_line = m + 13.0;
    if !meta.subtitle.is_empty() {
        text(out, m, y_line, &meta.subtitle, SMALL_PT, GREY);
        y_line += 3.0;
    }
    // How and where the section was measured (the base coordinates among the GPS fixes).
    for line in setting {
        text(out, m, y_line + 0.3, line, SETTING_PT, INK);
        y_line += SETTING_LINE_MM;
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

    /// The pieces of one page, drawn by `next_in_pieces`.
    fn pieces_of(stream: &mut PageStream<'_>) -> Vec<Vec<Item>> {
        let mut pieces = Vec::new();
        let drawn = stream.next_in_pieces(|items| {
            pieces.push(items.to_vec());
            Ok::<(), ()>(())
        });
        assert_eq!(drawn, Some(Ok(())));
        pieces
    }

    #[test]
    fn a_tall_page_drawn_in_pieces_prints_as_the_whole_page() {
        let (s, i) = generated_section(1_500);
        let meta = PrintMeta { printed_on: "2026-12-03".into(), subtitle: "generated".into() };
        let opts = LayoutOptions { paper: Paper::TallSingle, ..Default::default() };
        let whole = pages(&s, &i, &opts, &meta).remove(0);
        let mut stream = page_stream(&s, &i, &opts, &meta);
        assert_eq!(stream.page_size_mm(), (whole.width_mm, whole.height_mm));
        let pieces = pieces_of(&mut stream);
        assert_eq!(stream.next_in_pieces(|_| Ok::<(), ()>(())), None, "one tall page only");
        // Held a piece at a time: none holds more than a fraction of the page's items.
        let largest = pieces.iter().map(Vec::len).max().unwrap_or(0);
        assert!(pieces.len() >= 6, "{} pieces", pieces.len());
        assert!(largest * 4 < whole.items.len(), "largest piece {largest} of {} items", whole.items.len());
        // Written one after another they print the same page: rasterised at 40 dpi, at most one
        // pixel in a thousand differs visibly (where a tick or label at a cut is drawn twice,
        // or a dashed line restarts its pattern).
        let joined = Page {
            width_mm: whole.width_mm,
            height_mm: whole.height_mm,
            items: pieces.concat(),
            segments: Vec::new(),
        };
        let a = crate::export::rasterise(&whole, 40.0).expect("whole page rasterises");
        let b = crate::export::rasterise(&joined, 40.0).expect("joined pieces rasterise");
        assert_eq!((a.width(), a.height()), (b.width(), b.height()));
        let differ = a
            .data()
            .chunks_exact(4)
            .zip(b.data().chunks_exact(4))
            .filter(|(p, q)| p.iter().zip(q.iter()).any(|(x, y)| x.abs_diff(*y) > 48))
            .count();
        let total = (a.width() * a.height()) as usize;
        assert!(differ * 1000 <= total, "{differ} of {total} pixels differ");
        // Every bed's name of a surface and every text of the whole page is there.
        let texts = |items: &[Item]| {
            let mut t: Vec<String> = items
                .iter()
                .filter_map(|it| match it {
                    Item::Text { text, .. } => Some(text.clone()),
                    _ => None,
                })
                .collect();
            t.sort();
            t.dedup();
            t
        };
        assert_eq!(texts(&joined.items), texts(&whole.items));
    }

    #[test]
    fn short_pages_come_in_pieces_that_are_the_page_item_for_item() {
        let (s, i) = generated_section(400);
        let meta = PrintMeta::default();
        let opts = LayoutOptions::default();
        let whole = pages(&s, &i, &opts, &meta);
        let mut stream = page_stream(&s, &i, &opts, &meta);
        for page in &whole {
            assert_eq!(pieces_of(&mut stream).concat(), page.items);
        }
        assert_eq!(stream.next_in_pieces(|_| Ok::<(), ()>(())), None);
    }

    #[test]
    fn pieces_are_cut_outside_interpretation_intervals() {
        // Storeys 1–3 and 2–5 overlap into 1–5; a regime 0–8 covers all but its ends.
        let spans = merged(vec![(2.0, 5.0), (1.0, 3.0), (6.0, 7.0), (7.0, 7.5), (f64::NAN, 9.0)]);
        assert_eq!(spans, vec![(1.0, 5.0), (6.0, 7.0), (7.0, 7.5)]);
        let cuts = PieceCuts { bodies: spans, all: merged(vec![(1.0, 5.0), (6.0, 7.5), (0.0, 8.0)]) };
        for (h, clear) in [
            (0.5, true),
            (1.0, true),
            (3.0, false),
            (5.0, true),
            (5.5, true),
            (7.0, true),
            (7.2, false),
            (9.0, true),
        ] {
            assert_eq!(cuts.clear_at(h, false), clear, "height {h}");
        }
        assert!(!cuts.clear_at(5.5, true) && cuts.clear_at(8.0, true) && cuts.clear_at(0.0, true));
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
