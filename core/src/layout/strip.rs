//! The whole column as one continuous tall strip, for the screen.

use super::column::{BedBox, ColumnCtx, SCALE_BAND_MM, TITLE_BAND_MM};
use super::items::Item;
use super::options::LayoutOptions;
use super::transform::{GrainScale, HeightTransform};
use crate::model::Section;
use crate::rules::Interpretation;
use serde::Serialize;

/// Gap between the title band and the column top, and the column base and the scale, mm.
const PAD_MM: f64 = 3.0;

/// The interpreted column as one strip: titles on top, grain-size scale at the foot.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ColumnStrip {
    pub width_mm: f64,
    pub height_mm: f64,
    /// Titles first, then the height axis, then beds lowest first (each bed's fill, edges,
    /// contact, structures, paleocurrents, paleosol), then interpretation tracks, then the scale.
    pub items: Vec<Item>,
    /// Heights (m) ↔ y (mm) in this strip.
    pub heights: HeightTransform,
    /// One box per drawn bed, lowest first, for picking and editing.
    pub bed_boxes: Vec<BedBox>,
    /// Grain size ↔ x (mm) across the lithology column.
    pub grain_scale: GrainScale,
    /// Where each track sits across the strip (mm from its left edge), as laid out.
    pub tracks: crate::layout::column::Tracks,
}

impl ColumnStrip {
    /// Index into `bed_boxes` of the box spanning strip y (mm), if any. Boxes run lowest bed
    /// first, so their y falls: a binary search finds the box, however long the section.
    pub fn box_at_y(&self, y_mm: f64) -> Option<usize> {
        let k = self.bed_boxes.partition_point(|b| b.rect.y > y_mm);
        let b = self.bed_boxes.get(k)?;
        (y_mm <= b.rect.y + b.rect.h).then_some(k)
    }

    /// Index in the section of the bed drawn at strip y (mm), if any.
    pub fn bed_at_y(&self, y_mm: f64) -> Option<usize> {
        self.box_at_y(y_mm).map(|k| self.bed_boxes[k].bed_index)
    }
}

/// Lay the whole column out as one strip at the options' scale.
pub fn column_strip(section: &Section, interp: &Interpretation, opts: &LayoutOptions) -> ColumnStrip {
    column_strip_window(section, interp, opts, None)
}

/// The same strip, with only the heights in `window_m` (lo, hi; metres) drawn: coordinates,
/// size, titles and scale are those of the whole strip, so a window's items are exactly the
/// whole strip's items for those heights. The screen lays out a few views' worth around what it
/// shows, so a long section costs no more per edit than a short one.
pub fn column_strip_window(
    section: &Section,
    interp: &Interpretation,
    opts: &LayoutOptions,
    window_m: Option<(f64, f64)>,
) -> ColumnStrip {
    let ctx = ColumnCtx::new(section, interp, opts);
    let column_h = ctx.total_m * 1000.0 / opts.scale();
    let y_col_top = TITLE_BAND_MM + PAD_MM;
    let y_base = y_col_top + column_h;
    let heights = HeightTransform::new(y_base, 0.0, opts.scale());
    let (lo, hi) = match window_m {
        Some((lo, hi)) => (lo.max(0.0), hi.min(ctx.total_m)),
        None => (0.0, ctx.total_m),
    };
    let mut items = Vec::new();
    let mut bed_boxes = Vec::new();
    ctx.draw_titles(0.0, 0.0, &mut items);
    if lo < hi || ctx.total_m == 0.0 {
        ctx.draw_range(lo, hi, 0.0, &heights, &mut items, &mut bed_boxes);
    }
    ctx.draw_scale(0.0, y_base + PAD_MM, &mut items);
    ColumnStrip {
        width_mm: ctx.tracks.width_mm,
        height_mm: y_base + PAD_MM + SCALE_BAND_MM,
        items,
        heights,
        bed_boxes,
        grain_scale: ctx.tracks.grain_scale(0.0),
        tracks: ctx.tracks,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::items::Item;
    use crate::layout::sample::{sample_interpretation, sample_section};
    use crate::model::{Bed, BedId, GrainSize, Lithology, WentworthClass};

    #[test]
    fn strip_places_every_bed_at_its_height() {
        let s = sample_section();
        let i = sample_interpretation(&s);
        for scale in [20.0, 100.0, 500.0] {
            let opts = LayoutOptions { scale_denominator: scale, ..Default::default() };
            let strip = column_strip(&s, &i, &opts);
            assert_eq!(strip.bed_boxes.len(), s.beds.len());
            let bases = s.base_heights_m();
            for (k, b) in strip.bed_boxes.iter().enumerate() {
                assert_eq!(b.bed_index, k, "boxes in bed order");
                let top = bases[k] + s.beds[k].thickness_m;
                // The box spans the bed's base to top: y is down, heights are up.
                assert!((b.rect.y - strip.heights.y_mm(top)).abs() < 1e-9);
                assert!((b.rect.h - s.beds[k].thickness_m * 1000.0 / scale).abs() < 1e-9);
                assert!((strip.heights.height_m(b.rect.y + b.rect.h) - bases[k]).abs() < 1e-9);
            }
            let total_mm = s.total_thickness_m() * 1000.0 / scale;
            assert!(strip.height_mm > total_mm && strip.height_mm < total_mm + 60.0);
            assert!(strip.items.len() > s.beds.len() * 3);
            // Picking: the middle of each bed's box finds that bed; above the top, none.
            for (k, b) in strip.bed_boxes.iter().enumerate() {
                assert_eq!(strip.bed_at_y(b.rect.y + b.rect.h / 2.0), Some(k));
            }
            assert_eq!(strip.bed_at_y(strip.bed_boxes[s.beds.len() - 1].rect.y - 1.0), None);
        }
    }

    #[test]
    fn a_window_holds_the_whole_strips_beds_for_its_heights() {
        let s = sample_section();
        let i = sample_interpretation(&s);
        let opts = LayoutOptions::default();
        let whole = column_strip(&s, &i, &opts);
        let bases = s.base_heights_m();
        let (lo, hi) = (bases[3] + 0.01, bases[6] + 0.01);
        let part = column_strip_window(&s, &i, &opts, Some((lo, hi)));
        assert_eq!(
            (part.width_mm, part.height_mm, &part.heights),
            (whole.width_mm, whole.height_mm, &whole.heights)
        );
        // Beds 3..=6 overlap the window; those wholly inside have the whole strip's boxes (the
        // two at the edges are clipped to the window, as on a page).
        let idx: Vec<usize> = part.bed_boxes.iter().map(|b| b.bed_index).collect();
        assert_eq!(idx, vec![3, 4, 5, 6]);
        for b in &part.bed_boxes[1..3] {
            let w = whole.bed_boxes.iter().find(|x| x.bed_index == b.bed_index).expect("in whole strip");
            assert!((b.rect.y - w.rect.y).abs() < 1e-9 && (b.rect.h - w.rect.h).abs() < 1e-9);
        }
        assert!(part.items.len() < whole.items.len());
        // A window past the top draws no beds but keeps titles and scale.
        let past = column_strip_window(&s, &i, &opts, Some((1e6, 2e6)));
        assert!(past.bed_boxes.is_empty() && !past.items.is_empty());
    }

    #[test]
    fn box_width_grows_with_grain_class() {
        let mut s = Section::new("Coarsening");
        s.beds = WentworthClass::ALL
            .iter()
            .enumerate()
            .map(|(k, c)| {
                Bed::new(BedId(k as u64 + 1), 1.0, Lithology::Sandstone, Some(GrainSize::Class(*c)))
            })
            .collect();
        let i = sample_interpretation(&sample_section());
        let strip = column_strip(&s, &i, &LayoutOptions::default());
        for w in strip.bed_boxes.windows(2) {
            assert!(w[1].rect.w > w[0].rect.w, "{:?} then {:?}", w[0], w[1]);
        }
        // Each box's right edge is where the grain scale puts that class's midpoint.
        for (b, c) in strip.bed_boxes.iter().zip(WentworthClass::ALL) {
            assert!((b.rect.x + b.rect.w - strip.grain_scale.class_centre_x_mm(c)).abs() < 1e-9);
            assert_eq!(strip.grain_scale.class_at(b.rect.x + b.rect.w), c);
        }
    }

    #[test]
    fn empty_and_odd_sections_do_not_panic() {
        let i = sample_interpretation(&sample_section());
        let empty = Section::new("");
        let strip = column_strip(&empty, &i, &LayoutOptions::default());
        assert!(strip.bed_boxes.is_empty());
        let mut odd = Section::new("odd");
        let mut b = Bed::new(BedId(1), f64::NAN, Lithology::Sandstone, None);
        b.paleocurrents = [f64::NAN, 400.0, -20.0, 10.0, 11.0]
            .into_iter()
            .map(crate::model::Paleocurrent::azimuth)
            .collect();
        odd.beds = vec![
            b,
            Bed::new(BedId(2), -1.0, Lithology::Coal, None),
            Bed::new(BedId(3), 1.0, Lithology::Tuff, None),
        ]
        .into();
        let opts = LayoutOptions { scale_denominator: 0.0, ..Default::default() };
        let strip = column_strip(&odd, &i, &opts);
        assert!(strip.items.iter().all(|it| {
            let b = it.bounds();
            b.x.is_finite() && b.y.is_finite() && b.w.is_finite() && b.h.is_finite()
        }));
        assert!(matches!(strip.items.first(), Some(Item::Text { .. })));
    }
}
