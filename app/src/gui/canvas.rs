//! The column canvas: draws the laid-out strip with zoom, pan and a height ruler; click selects a
//! bed, dragging a bed's top changes its thickness, dragging its right edge sets its grain size,
//! and a right-click menu inserts, splits, merges and deletes beds.

use super::actions::{gesture_key, Actions};
use super::column::Cache;
use super::column_help::{self, HEADER_H};
use super::document::{Document, Edit};
use super::engine::Strip;
use super::painter::{self, MmToScreen};
use super::theme;
use super::trace::backdrop::{behind_column, CanvasBackdrop, CanvasPlace};
use aggrade_core::layout::Item;
use aggrade_core::model::{BaseRank, Bed, BedId, GrainSize, LengthUnit, Lithology, WentworthClass};
use egui::{Color32, CursorIcon, Pos2, Rect, Sense, Shape, Vec2};

/// Width of the height ruler on the left, points.
const RULER_W: f32 = 58.0;
/// How close (points) the pointer must be to a bed's right edge to grab it.
const GRAB_PT: f32 = 5.0;
/// Height (points) of the band, centred on a bed's top, that grabs the top to drag it.
pub const GRAB_TOP_PT: f32 = 10.0;
/// Width of the outline round the selected bed, points.
const SELECT_OUTLINE_PT: f32 = 2.5;

#[derive(Debug, Clone, Copy, PartialEq)]
enum DragKind {
    Top { bed: BedId, t0_m: f64, start_y: f32, gesture: u64 },
    Grain { bed: BedId, end: GrainEnd, start: WentworthClass, gesture: u64 },
    Pan,
}

/// Which grain size a drag on a bed's right edge changes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum GrainEnd {
    /// The grain size at the base (the lower third of a sloping edge was grabbed).
    Base,
    /// The grain size at the top (the upper third of a sloping edge was grabbed).
    Top,
    /// Both: a uniform bed is set to the class under the pointer; a graded bed is shifted by the
    /// classes moved, so its fining or coarsening upward is kept.
    Both,
}

/// Which end a grab at `frac_from_base` (0 = base, 1 = top) of a bed's edge takes.
pub fn grain_end_at(bed: &Bed, frac_from_base: f64) -> GrainEnd {
    let graded = bed.grain_base.map(|g| g.class()) != bed.grain_top.map(|g| g.class());
    match frac_from_base {
        f if graded && f < 1.0 / 3.0 => GrainEnd::Base,
        f if graded && f > 2.0 / 3.0 => GrainEnd::Top,
        _ => GrainEnd::Both,
    }
}

/// Grain sizes (base, top) after dragging the edge from class `start` to class `now`.
pub fn dragged_grain(
    base: Option<GrainSize>,
    top: Option<GrainSize>,
    end: GrainEnd,
    start: WentworthClass,
    now: WentworthClass,
) -> (Option<GrainSize>, Option<GrainSize>) {
    let set = Some(GrainSize::Class(now));
    let shift = |g: Option<GrainSize>| {
        let rank =
            g.map(|g| g.class()).unwrap_or(start).rank() as i64 + now.rank() as i64 - start.rank() as i64;
        Some(GrainSize::Class(WentworthClass::from_rank(rank.max(0) as usize)))
    };
    let uniform = base.map(|g| g.class()) == top.map(|g| g.class());
    match end {
        GrainEnd::Base => (set, top),
        GrainEnd::Top => (base, set),
        GrainEnd::Both if uniform => (set, set),
        GrainEnd::Both if now == start => (base, top),
        GrainEnd::Both => (shift(base), shift(top)),
    }
}

/// The highest height (metres) the sheet's image reaches: its upper corners read on the height
/// scale; `None` when not calibrated.
fn sheet_top_height_m(sheet: &aggrade_core::trace::TraceSheet, size: [u32; 2]) -> Option<f64> {
    use aggrade_core::trace::Pt;
    let (w, h) = (f64::from(size[0]), f64::from(size[1]));
    [Pt::new(0.0, 0.0), Pt::new(w, 0.0), Pt::new(0.0, h), Pt::new(w, h)]
        .into_iter()
        .filter_map(|p| sheet.height_at(p).ok())
        .filter(|m| m.is_finite())
        .reduce(f64::max)
}

/// View state of the canvas (kept between frames).
#[derive(Debug)]
pub struct Canvas {
    /// Screen points per strip millimetre.
    pub zoom: f32,
    /// Strip y (mm) shown at the top of the view.
    pub top_mm: f64,
    /// Strip x (mm) at the left of the view, right of the ruler (the strip pans sideways when
    /// wider than the view).
    pub left_mm: f64,
    drag: Option<DragKind>,
    context_bed: Option<BedId>,
    last_total_m: Option<f64>,
    pending_scroll_m: Option<f64>,
    /// Grain sizes (base, top) of the bed being grain-dragged, as they were when grabbed.
    grain_from: Option<(Option<GrainSize>, Option<GrainSize>)>,
    /// Shapes reused between frames (avoids reallocating).
    shapes: Vec<Shape>,
    /// How many layout items the last frame drew (culling keeps this to the visible range).
    pub last_drawn_items: usize,
    /// The strip → screen transform of the last frame (for hit tests from outside).
    pub last_transform: Option<MmToScreen>,
    /// Height of the last frame's view, strip mm.
    last_view_h_mm: Option<f64>,
    fitted: bool,
}

impl Default for Canvas {
    fn default() -> Self {
        Canvas {
            zoom: 2.5,
            top_mm: 0.0,
            left_mm: 0.0,
            drag: None,
            context_bed: None,
            last_total_m: None,
            pending_scroll_m: None,
            grain_from: None,
            shapes: Vec::new(),
            last_drawn_items: 0,
            last_transform: None,
            last_view_h_mm: None,
            fitted: false,
        }
    }
}

/// Snap step for dragged thicknesses: 1, 5 or 10 cm depending on how many points a metre spans.
pub fn snap_step_m(points_per_m: f32) -> f64 {
    if points_per_m >= 300.0 {
        0.01
    } else if points_per_m >= 60.0 {
        0.05
    } else {
        0.10
    }
}

/// A "nice" ruler step (in display units) so labels are at least `min_pt` apart.
pub fn ruler_step(points_per_unit: f32, min_pt: f32) -> f64 {
    for s in [0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0] {
        if s as f32 * points_per_unit >= min_pt {
            return s;
        }
    }
    2000.0
}

impl Canvas {
    /// Ask to bring a height into view on the next frame.
    pub fn scroll_to_height(&mut self, height_m: f64) {
        self.pending_scroll_m = Some(height_m);
    }

    /// The strip y range (mm, top first) the last frame showed; `None` before the first frame.
    pub fn view_y_mm(&self) -> Option<(f64, f64)> {
        self.last_view_h_mm.map(|h| (self.top_mm, self.top_mm + h))
    }

    /// Draw the canvas (header, ruler, column, the legend beside it when shown) and collect what
    /// the user did.
    pub fn ui(
        &mut self,
        ui: &mut egui::Ui,
        doc: &Document,
        column: &mut Cache,
        backdrop: Option<&CanvasBackdrop>,
        out: &mut Actions,
    ) {
        startup_log(ui.ctx());
        let area = ui.available_rect_before_wrap();
        ui.advance_cursor_after_rect(area);
        let (area, legend_rect) = column_help::split_for_legend(ui.ctx(), area);
        let header = Rect::from_min_size(area.min, Vec2::new(area.width(), HEADER_H));
        let rect = Rect::from_min_max(Pos2::new(area.left(), header.bottom()), area.max);
        let response = ui.interact(rect, ui.scope_id().with("column-canvas"), Sense::click_and_drag());
        let strip = &column.strip;
        let painter = ui.painter_at(rect);
        let mm_per_m = strip.heights.mm_per_m();
        let total = doc.heights().total_m;
        // The column's top line, strip y (mm): the titles above it are drawn in the header.
        let column_top_mm = strip.heights.y_mm(total);
        if !self.fitted && strip.width_mm > 0.0 {
            // First frame: fit the strip's width into the view, and show the top of the section.
            let avail = rect.width() - RULER_W - 40.0;
            self.zoom = (avail / strip.width_mm as f32).clamp(1.5, 6.0);
            self.top_mm = column_top_mm - 4.0;
            self.fitted = true;
        }
        let view_h_mm = (rect.height() / self.zoom) as f64;

        // Keep the part below a dragged bed still while the section grows or shrinks above it.
        if let (Some(last), Some(DragKind::Top { .. })) = (self.last_total_m, self.drag) {
            self.top_mm += (total - last) * mm_per_m;
        }
        self.last_total_m = Some(total);
        if let Some(h) = self.pending_scroll_m.take() {
            self.top_mm = strip.heights.y_mm(h) - view_h_mm / 2.0;
        }

        // Zoom (ctrl+wheel, pinch, +/- keys) about the pointer; the wheel pans (sideways too).
        let hovered = response.hovered() || response.contains_pointer();
        let typing = ui.memory(|m| m.focused().is_some());
        let (mut zoom_f, scroll) = ui.input(|i| (i.zoom_delta(), i.smooth_scroll_delta()));
        if !typing {
            ui.input(|i| {
                if i.key_pressed(egui::Key::Plus) || i.key_pressed(egui::Key::Equals) {
                    zoom_f *= 1.25;
                }
                if i.key_pressed(egui::Key::Minus) {
                    zoom_f /= 1.25;
                }
            });
            // The legend's key, unless the pointer is over a window of its own (the trace window
            // takes letters).
            let over_window = ui.input(|i| i.pointer.hover_pos()).and_then(|p| ui.ctx().layer_id_at(p));
            let free = over_window.is_none_or(|l| l.order == egui::Order::Background);
            if free && ui.input(|i| i.key_pressed(column_help::LEGEND_KEY) && i.modifiers.is_none()) {
                let shown = column_help::legend_shown(ui.ctx());
                column_help::set_legend_shown(ui.ctx(), !shown);
            }
        }
        if zoom_f != 1.0 {
            let anchor_y = response.hover_pos().map(|p| p.y).unwrap_or(rect.center().y);
            let anchor_mm = self.top_mm + ((anchor_y - rect.top()) / self.zoom) as f64;
            self.zoom = (self.zoom * zoom_f).clamp(0.02, 60.0);
            self.top_mm = anchor_mm - ((anchor_y - rect.top()) / self.zoom) as f64;
        } else if hovered && scroll != Vec2::ZERO {
            self.top_mm -= (scroll.y / self.zoom) as f64;
            self.left_mm -= (scroll.x / self.zoom) as f64;
        }
        let view_h_mm = (rect.height() / self.zoom) as f64;
        // A sheet behind the column may reach above the beds traced so far: let the view follow.
        let sheet_top_mm = backdrop
            .and_then(|b| sheet_top_height_m(&b.sheet, b.image_size))
            .map_or(0.0, |h| strip.heights.y_mm(h).min(0.0));
        let lowest_top = -view_h_mm * 0.5 + sheet_top_mm;
        self.top_mm = self.top_mm.clamp(lowest_top, (strip.height_mm - view_h_mm * 0.5).max(lowest_top));
        self.last_view_h_mm = Some(view_h_mm);
        // Sideways only as far as the strip reaches past the view.
        let view_w_mm = ((rect.width() - RULER_W - 14.0) / self.zoom) as f64;
        self.left_mm = self.left_mm.clamp(0.0, (strip.width_mm + 6.0 - view_w_mm).max(0.0));

        let t = MmToScreen {
            origin: Pos2::new(
                rect.left() + RULER_W + 14.0 - self.left_mm as f32 * self.zoom,
                rect.top() - self.top_mm as f32 * self.zoom,
            ),
            zoom: self.zoom,
        };
        self.last_transform = Some(t);
        let points_per_m = self.zoom * mm_per_m as f32;

        // Background: paper for the strip.
        painter.rect_filled(rect, 0.0, theme::CANVAS_BG);
        let paper = Rect::from_min_max(t.pos(-4.0, -2.0), t.pos(strip.width_mm + 4.0, strip.height_mm));
        painter.rect_filled(paper.intersect(rect), 0.0, Color32::WHITE);
        // The traced sheet behind the beds, at its calibrated heights and grain sizes.
        if let Some(b) = backdrop {
            let gs = strip.grain_scale;
            let y_of_height = |m: f64| t.pos(0.0, strip.heights.y_mm(m)).y;
            let x_of_rank =
                |r: f64| t.pos(gs.left_mm + gs.min_width_mm + gs.class_step_mm * (r + 0.5), 0.0).x;
            let place = CanvasPlace {
                y_of_height: &y_of_height,
                x_of_rank: &x_of_rank,
                left_x: t.pos(gs.left_mm, 0.0).x,
                points_per_m,
            };
            if let Some(mesh) = behind_column(&b.sheet, b.image_size, b.texture, &place, b.opacity) {
                painter.add(Shape::mesh(mesh));
            }
        }

        // Items in the visible range, with a margin so lines crossing the edge are not cut short;
        // the track titles above the column are left to the header, which stays in view.
        let lo = self.top_mm - 5.0;
        let hi = self.top_mm + view_h_mm + 5.0;
        let mut which = column.index.visible(lo, hi);
        which.retain(|&i| strip.items.get(i as usize).is_some_and(|it| below_titles(it, column_top_mm)));
        self.last_drawn_items = which.len();
        self.shapes.clear();
        painter::shapes(&strip.items, &which, &t, &mut self.shapes);
        painter.extend(self.shapes.drain(..));
        painter::texts(&strip.items, &which, &t, &painter);

        // Selection: an outline round the bed and a bar beside the ruler; the bed's own colours
        // stay as they are, so a selected sandstone still looks like sandstone.
        let sel_index = doc.selected_bed.and_then(|id| doc.bed_index(id));
        let selected = sel_index.and_then(|i| strip.bed_boxes.iter().find(|b| b.bed_index == i)).map(|b| {
            Rect::from_min_max(t.pos(b.rect.x, b.rect.y), t.pos(b.rect.x + b.rect.w, b.rect.y + b.rect.h))
        });
        if let Some(r) = selected {
            painter.rect_stroke(
                r.expand(1.5),
                1.0,
                egui::Stroke::new(SELECT_OUTLINE_PT, theme::ACCENT),
                egui::StrokeKind::Outside,
            );
        }

        self.draw_ruler(&painter, rect, doc.section().display_unit, total, strip, &t);
        if let Some(r) = selected {
            let bar = Rect::from_min_max(
                Pos2::new(rect.left() + RULER_W - 6.0, r.top()),
                Pos2::new(rect.left() + RULER_W - 1.0, r.bottom().max(r.top() + 3.0)),
            );
            painter.rect_filled(bar, 1.0, theme::ACCENT);
        }
        let corner = Rect::from_min_size(header.min, Vec2::new(RULER_W, HEADER_H));
        // The tracks the strip on screen was laid out with (a pass over every bed to find again).
        column_help::draw_header(ui, header, corner, &strip.tracks, doc.section(), strip, &t);
        if let Some(r) = legend_rect {
            column_help::legend_panel(ui, r, doc.section(), &column.interp, column.layout());
        }

        // Interaction.
        let pointer = response.hover_pos().or(response.interact_pointer_pos());
        let beds = &doc.section().beds;
        // A drag grabs what was under the pointer where the button went down.
        let origin = if response.drag_started() { ui.input(|i| i.pointer.press_origin()) } else { None };
        let grab = origin.or(pointer).and_then(|p| self.grab_target(p, strip, beds, &t));
        if self.drag.is_none() {
            match grab {
                Some(DragKind::Top { .. }) => ui.ctx().set_cursor_icon(CursorIcon::ResizeVertical),
                Some(DragKind::Grain { .. }) => ui.ctx().set_cursor_icon(CursorIcon::ResizeHorizontal),
                _ => {}
            }
        }
        if response.drag_started() {
            self.drag = Some(grab.unwrap_or(DragKind::Pan));
            // A grain drag works from the grain sizes the bed had when it was grabbed.
            self.grain_from = match self.drag {
                Some(DragKind::Grain { bed, .. }) => {
                    doc.section().bed_index(bed).map(|i| (beds[i].grain_base, beds[i].grain_top))
                }
                _ => None,
            };
            if let Some(DragKind::Top { bed, .. } | DragKind::Grain { bed, .. }) = self.drag {
                out.select = Some(Some(bed));
            }
        }
        if response.dragged() {
            match self.drag {
                Some(DragKind::Pan) => {
                    let d = response.drag_delta();
                    self.top_mm -= (d.y / self.zoom) as f64;
                    self.left_mm -= (d.x / self.zoom) as f64;
                }
                Some(DragKind::Top { bed, t0_m, start_y, gesture }) => {
                    ui.ctx().set_cursor_icon(CursorIcon::ResizeVertical);
                    if let Some(p) = pointer {
                        let step = snap_step_m(points_per_m);
                        let raw = t0_m - ((p.y - start_y) / points_per_m) as f64;
                        let snapped = ((raw / step).round() * step).max(step);
                        let current = doc.section().bed_index(bed).map(|i| beds[i].thickness_m);
                        if current.is_some_and(|c| (c - snapped).abs() > 1e-9) {
                            out.edit_in(Edit::SetThickness { bed, thickness_m: snapped }, gesture);
                        }
                    }
                }
                Some(DragKind::Grain { bed, end, start, gesture }) => {
                    ui.ctx().set_cursor_icon(CursorIcon::ResizeHorizontal);
                    if let (Some(p), Some(i)) = (pointer, doc.section().bed_index(bed)) {
                        let class = strip.grain_scale.class_at(t.x_mm(p.x));
                        let b = &beds[i];
                        let (base, top) = match self.grain_from {
                            Some((from_base, from_top)) => {
                                dragged_grain(from_base, from_top, end, start, class)
                            }
                            None => (b.grain_base, b.grain_top),
                        };
                        if b.grain_base != base || b.grain_top != top {
                            out.edit_in(Edit::SetGrain { bed, base, top }, gesture);
                        }
                    }
                }
                None => {}
            }
        }
        if response.drag_stopped() {
            self.drag = None;
            out.end_gesture = true;
        }
        if response.clicked() {
            let hit =
                pointer.and_then(|p| strip.bed_at_y(t.y_mm(p.y))).and_then(|i| beds.get(i)).map(|b| b.id);
            out.select = Some(hit);
        }
        if response.secondary_clicked() {
            self.context_bed =
                pointer.and_then(|p| strip.bed_at_y(t.y_mm(p.y))).and_then(|i| beds.get(i)).map(|b| b.id);
            if self.context_bed.is_some() {
                out.select = Some(self.context_bed);
            }
        }
        let context_bed = self.context_bed;
        // Hover help for what the pointer rests on: not while dragging (the drag has the
        // pointer), nor after the wheel scrolled the column under a pointer that has not moved
        // since (the help would change under it frame after frame; it comes back with the
        // pointer's next move).
        let still = self.drag.is_none()
            && !ui.input(|i| {
                i.pointer.any_down()
                    || i.is_scrolling()
                    || i.time_since_last_scroll() <= i.pointer.time_since_last_movement()
            });
        let help = response.hover_pos().filter(|p| still && p.x > rect.left() + RULER_W).and_then(|p| {
            column_help::help_at_pointer(doc.section(), &column.interp, column.layout(), strip, &t, p)
        });
        let response = match help {
            Some(text) => response.on_hover_text_at_pointer(text),
            None => response,
        };
        response.context_menu(|ui| bed_menu(ui, doc, context_bed, out));
    }

    /// What a drag starting at `p` would move: a bed's top within half of [`GRAB_TOP_PT`] of
    /// its line, across the whole width of the beds on either side of it; else a bed's right
    /// edge within [`GRAB_PT`].
    fn grab_target(
        &self,
        p: Pos2,
        strip: &Strip,
        beds: &aggrade_core::model::Beds,
        t: &MmToScreen,
    ) -> Option<DragKind> {
        let y = t.y_mm(p.y);
        let x = t.x_mm(p.x);
        let half = GRAB_TOP_PT / 2.0;
        let gesture = |i: usize| gesture_key(("canvas", i, p.x.to_bits(), p.y.to_bits()));
        let screen_rect = |k: usize| {
            strip.bed_boxes.get(k).map(|b| {
                Rect::from_min_max(t.pos(b.rect.x, b.rect.y), t.pos(b.rect.x + b.rect.w, b.rect.y + b.rect.h))
            })
        };
        // The line nearest the pointer, seen from the box under it or (above the column's top)
        // the box just below it.
        let k = strip.box_at_y(y).or_else(|| strip.box_at_y(y + (half / t.zoom) as f64))?;
        let r = screen_rect(k)?;
        // Box k's top is bed k's top; its base is the top of the box below (k - 1).
        let line = if (p.y - r.top()).abs() <= half {
            Some(k)
        } else if (p.y - r.bottom()).abs() <= half && k > 0 {
            Some(k - 1)
        } else {
            None
        };
        if let Some(lower) = line {
            // Across the bed whose top it is and the one resting on it, whichever is wider.
            let right = [screen_rect(lower), screen_rect(lower + 1)]
                .into_iter()
                .flatten()
                .map(|r| r.right())
                .fold(f32::NEG_INFINITY, f32::max);
            let left = screen_rect(lower).map_or(r.left(), |r| r.left());
            if p.x >= left - GRAB_PT && p.x <= right + GRAB_PT {
                let i = strip.bed_boxes[lower].bed_index;
                let bed = beds.get(i)?;
                return Some(DragKind::Top {
                    bed: bed.id,
                    t0_m: bed.thickness_m,
                    start_y: p.y,
                    gesture: gesture(i),
                });
            }
        }
        let i = strip.bed_boxes.get(k)?.bed_index;
        let bed = beds.get(i)?;
        let (top_screen, base_screen, right) = (r.top(), r.bottom(), r.right());
        // The right edge at the pointer's height (a graded bed's edge slopes from base to top).
        let frac_from_base =
            (((base_screen - p.y) / (base_screen - top_screen).max(1.0)) as f64).clamp(0.0, 1.0);
        let edge = match (bed.grain_base, bed.grain_top) {
            (Some(gb), Some(gt)) => {
                let (xb, xt) = (strip.grain_scale.x_mm(gb.phi()), strip.grain_scale.x_mm(gt.phi()));
                t.pos(xb + (xt - xb) * frac_from_base, 0.0).x
            }
            _ => right,
        };
        if (p.x - edge).abs() <= GRAB_PT && !bed.is_covered() && p.y >= top_screen && p.y <= base_screen {
            let end = grain_end_at(bed, frac_from_base);
            let start = strip.grain_scale.class_at(x);
            return Some(DragKind::Grain { bed: bed.id, end, start, gesture: gesture(i) });
        }
        None
    }

    fn draw_ruler(
        &self,
        painter: &egui::Painter,
        rect: Rect,
        unit: LengthUnit,
        total_m: f64,
        strip: &Strip,
        t: &MmToScreen,
    ) {
        let bar = Rect::from_min_max(rect.min, Pos2::new(rect.left() + RULER_W, rect.bottom()));
        painter.rect_filled(bar, 0.0, theme::PANEL_BG);
        painter.line_segment([bar.right_top(), bar.right_bottom()], egui::Stroke::new(1.0, theme::RULE_LINE));
        let unit_m = unit.metres();
        let points_per_unit = (strip.heights.mm_per_m() * unit_m) as f32 * t.zoom;
        let step = ruler_step(points_per_unit, 36.0);
        let h_top = strip.heights.height_m(t.y_mm(bar.top())) / unit_m;
        let h_bot = strip.heights.height_m(t.y_mm(bar.bottom())) / unit_m;
        let total_u = total_m / unit_m;
        let first = (h_bot.max(0.0) / step).floor() as i64;
        let last = (h_top.min(total_u) / step).ceil() as i64;
        let font = egui::FontId::monospace(10.5);
        let decimals = if step < 0.1 {
            2
        } else if step < 1.0 {
            1
        } else {
            0
        };
        for k in first..=last.min(first + 400) {
            let h_u = k as f64 * step;
            if h_u < -1e-9 || h_u > total_u + 1e-9 {
                continue;
            }
            let y = t.pos(0.0, strip.heights.y_mm(h_u * unit_m)).y;
            if y < bar.top() || y > bar.bottom() {
                continue;
            }
            painter.line_segment(
                [Pos2::new(bar.right() - 7.0, y), Pos2::new(bar.right(), y)],
                egui::Stroke::new(1.0, theme::TEXT_DIM),
            );
            let label = format!("{h_u:.decimals$}");
            painter.text(
                Pos2::new(bar.right() - 10.0, y),
                egui::Align2::RIGHT_CENTER,
                label,
                font.clone(),
                theme::TEXT,
            );
        }
        let minor = step / 5.0;
        let first_minor = (h_bot.max(0.0) / minor).floor() as i64;
        let last_minor = (h_top.min(total_u) / minor).ceil() as i64;
        if last_minor - first_minor < 2000 {
            for k in first_minor..=last_minor {
                let y = t.pos(0.0, strip.heights.y_mm(k as f64 * minor * unit_m)).y;
                if y >= bar.top() && y <= bar.bottom() && k as f64 * minor <= total_u + 1e-9 {
                    painter.line_segment(
                        [Pos2::new(bar.right() - 3.5, y), Pos2::new(bar.right(), y)],
                        egui::Stroke::new(1.0, theme::RULE_LINE),
                    );
                }
            }
        }
        painter.text(
            Pos2::new(bar.left() + 5.0, bar.top() + 4.0),
            egui::Align2::LEFT_TOP,
            unit.name(),
            egui::FontId::proportional(10.0),
            theme::TEXT_DIM,
        );
    }
}

/// Is an item of the strip drawn below the track titles (so on the canvas, not in its header)?
fn below_titles(item: &Item, column_top_mm: f64) -> bool {
    let b = item.bounds();
    b.y + b.h >= column_top_mm - 1.0
}

/// Start-up timing for scripts (`scripts/bench-startup.sh`): with `AGGRADE_FRAME_LOG=FILE` set,
/// the wall clock (nanoseconds since 1970) when the first frame with the column is built and when
/// the frame after it starts (so the first one has been painted and shown) is appended to FILE;
/// with `AGGRADE_EXIT_AFTER_FIRST_FRAME=1` as well, the window then closes. Nothing happens
/// without the variable.
fn startup_log(ctx: &egui::Context) {
    use std::sync::atomic::{AtomicU8, Ordering};
    static FRAMES: AtomicU8 = AtomicU8::new(0);
    let Some(path) = std::env::var_os("AGGRADE_FRAME_LOG") else { return };
    let frame = FRAMES.load(Ordering::Relaxed);
    if frame >= 2 {
        return;
    }
    FRAMES.store(frame + 1, Ordering::Relaxed);
    let now =
        std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_nanos()).unwrap_or(0);
    let what = if frame == 0 { "first_column_frame_built" } else { "second_frame_started" };
    let line = format!("{what} {now}\n");
    // A timing aid only: a log that cannot be written is skipped.
    let _ = std::fs::OpenOptions::new()
        .create(true)
        .append(true)
        .open(path)
        .and_then(|mut f| std::io::Write::write_all(&mut f, line.as_bytes()));
    if frame == 0 {
        ctx.request_repaint();
    } else if std::env::var_os("AGGRADE_EXIT_AFTER_FIRST_FRAME").is_some() {
        ctx.send_viewport_cmd(egui::ViewportCommand::Close);
    }
}

/// A plain new bed for the insert commands.
pub fn new_bed() -> Bed {
    Bed::new(BedId(0), 0.5, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)))
}

/// The right-click menu of a bed (also used by the table).
pub fn bed_menu(ui: &mut egui::Ui, doc: &Document, bed: Option<BedId>, out: &mut Actions) {
    let Some(bed) = bed else {
        ui.label("No bed selected");
        return;
    };
    let Some(i) = doc.bed_index(bed) else { return };
    let n = doc.section().beds.len();
    if ui.button("Insert bed above").on_hover_text("Add a 0.5 m bed directly above this one").clicked() {
        out.edit(Edit::InsertBed { index: i + 1, bed: new_bed() });
        ui.close();
    }
    if ui.button("Insert bed below").on_hover_text("Add a 0.5 m bed directly below this one").clicked() {
        out.edit(Edit::InsertBed { index: i, bed: new_bed() });
        ui.close();
    }
    super::table::split::split_menu(ui, doc, bed, out);
    let can_merge = i + 1 < n;
    if ui
        .add_enabled(can_merge, egui::Button::new("Merge with bed above"))
        .on_hover_text("Join this bed and the one above into one bed")
        .clicked()
    {
        out.edit(Edit::MergeWithAbove { bed });
        ui.close();
    }
    ui.menu_button("Rank of base", |ui| {
        let current = doc.section().beds[i].base_rank;
        let ranks =
            [None, Some(BaseRank::StoreySurface), Some(BaseRank::BodyBase), Some(BaseRank::WithinStorey)];
        for rank in ranks {
            let label = rank.map_or("rules decide", BaseRank::name);
            if ui
                .radio(current == rank, label)
                .on_hover_text("Your rank overrides the storey and body rules")
                .clicked()
            {
                let mut b = doc.section().beds[i].clone();
                b.base_rank = rank;
                out.edit(Edit::ReplaceBed { bed: b });
                ui.close();
            }
        }
    });
    ui.separator();
    if ui.button("Delete bed").on_hover_text("Remove this bed (Ctrl+Z brings it back)").clicked() {
        out.edit(Edit::DeleteBed { bed });
        ui.close();
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn class(c: WentworthClass) -> Option<GrainSize> {
        Some(GrainSize::Class(c))
    }

    #[test]
    fn grain_drag_keeps_a_fining_upward_profile() {
        use WentworthClass::*;
        let mut bed = Bed::new(BedId(1), 2.0, Lithology::Sandstone, class(CoarseSand));
        bed.grain_top = class(FineSand);
        // A graded bed: the thirds of its edge pick the end; the middle moves both.
        assert_eq!(grain_end_at(&bed, 0.1), GrainEnd::Base);
        assert_eq!(grain_end_at(&bed, 0.5), GrainEnd::Both);
        assert_eq!(grain_end_at(&bed, 0.9), GrainEnd::Top);
        let (b, t) = (bed.grain_base, bed.grain_top);
        // Middle grab moved one class coarser: both ends shift, still fining upward.
        assert_eq!(
            dragged_grain(b, t, GrainEnd::Both, MediumSand, CoarseSand),
            (class(VeryCoarseSand), class(MediumSand))
        );
        // No class moved: nothing changes (no flattening on a click-drag in place).
        assert_eq!(dragged_grain(b, t, GrainEnd::Both, MediumSand, MediumSand), (b, t));
        // The top third sets only the top, the base third only the base.
        assert_eq!(dragged_grain(b, t, GrainEnd::Top, FineSand, VeryFineSand), (b, class(VeryFineSand)));
        assert_eq!(dragged_grain(b, t, GrainEnd::Base, CoarseSand, Granule), (class(Granule), t));
        // Shifting past the end of the scale clamps instead of wrapping.
        assert_eq!(dragged_grain(b, t, GrainEnd::Both, MediumSand, Clay).0, class(Silt));
        assert_eq!(dragged_grain(b, t, GrainEnd::Both, MediumSand, Clay).1, class(Clay));
    }

    #[test]
    fn grain_drag_on_a_uniform_bed_sets_both_ends() {
        use WentworthClass::*;
        let bed = Bed::new(BedId(1), 2.0, Lithology::Sandstone, class(MediumSand));
        for f in [0.05, 0.5, 0.95] {
            assert_eq!(grain_end_at(&bed, f), GrainEnd::Both);
        }
        let (b, t) = (bed.grain_base, bed.grain_top);
        assert_eq!(dragged_grain(b, t, GrainEnd::Both, MediumSand, Pebble), (class(Pebble), class(Pebble)));
    }

    #[test]
    fn snap_steps_follow_zoom() {
        assert_eq!(snap_step_m(1000.0), 0.01);
        assert_eq!(snap_step_m(100.0), 0.05);
        assert_eq!(snap_step_m(10.0), 0.10);
    }

    #[test]
    fn ruler_steps_keep_labels_apart() {
        for ppu in [0.5f32, 3.0, 20.0, 150.0, 2000.0] {
            let s = ruler_step(ppu, 36.0);
            assert!(s as f32 * ppu >= 36.0, "{ppu}: {s}");
        }
        assert_eq!(ruler_step(20.0, 36.0), 2.0);
    }
}
