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
}

impl ColumnStrip {
    /// Items whose bounds overlap the y range [y0, y1] (mm), for drawing only what is visible.
    pub fn items_in_y(&self, y0_mm: f64, y1_mm: f64) -> impl Iterator<Item = &Item> {
        self.items.iter().filter(move |it| {
            let b = it.bounds();
            b.y <= y1_mm && b.y + b.h >= y0_mm
        })
    }

    /// The bed under a point (mm), if any.
    pub fn bed_at(&self, x_mm: f64, y_mm: f64) -> Option<usize> {
        self.bed_boxes
            .iter()
            .find(|b| {
                y_mm >= b.rect.y && y_mm <= b.rect.y + b.rect.h && x_mm >= b.rect.x && x_mm <= b.rect.x + b.rect.w
            })
            .map(|b| b.bed_index)
    }
}

/// Lay the whole column out as one strip at the options' scale.
pub fn column_strip(section: &Section, interp: &Interpretation, opts: &LayoutOptions) -> ColumnStrip {
    let ctx = ColumnCtx::new(section, interp, opts);
    let column_h = ctx.total_m * 1000.0 / opts.scale();
    let y_col_top = TITLE_BAND_MM + PAD_MM;
    let y_base = y_col_top + column_h;
    let heights = HeightTransform::new(y_base, 0.0, opts.scale());
    let mut items = Vec::new();
    let mut bed_boxes = Vec::new();
    ctx.draw_titles(0.0, 0.0, &mut items);
    ctx.draw_range(0.0, ctx.total_m, 0.0, &heights, &mut items, &mut bed_boxes);
    ctx.draw_scale(0.0, y_base + PAD_MM, &mut items);
    ColumnStrip {
        width_mm: ctx.tracks.width_mm,
        height_mm: y_base + PAD_MM + SCALE_BAND_MM,
        items,
        heights,
        bed_boxes,
        grain_scale: ctx.tracks.grain_scale(0.0),
    }
}
