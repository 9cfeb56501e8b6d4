//! The trace window (Section ▸ Trace from image…): the sheet image with its display sliders, the
//! calibration clicks (frame corners, height scale, grain-size scale) and tracing by clicks and
//! keys. Every change it makes is an `Edit` the window applies like any other.

pub mod backdrop;

use super::document::Edit;
use super::table::parse_length;
use aggrade_core::model::{Bed, GrainSize, Lithology, Section, WentworthClass};
use aggrade_core::trace::image::{SheetImage, SheetImageError};
use aggrade_core::trace::snap::{snap_to_line, SnapParams};
use aggrade_core::trace::{bed_at, GrainScale, HeightScale, Pt, TraceSheet};
use backdrop::{display_pixels, CanvasBackdrop, Placement};
use egui::{Color32, Sense, Stroke, Vec2};
use std::path::{Path, PathBuf};

/// What the next click on the image does.
#[derive(Debug, Clone, PartialEq)]
pub enum Mode {
    /// Clicks do nothing; drag to pan.
    Look,
    /// Collecting the frame corners: lower left, lower right, upper right, upper left.
    Frame(Vec<Pt>),
    /// Collecting the two height-scale points (lower first).
    HeightScale(Vec<Pt>),
    /// Collecting the two grain-size-scale points (finer first).
    GrainScale(Vec<Pt>),
    /// A click adds a boundary; Shift+click sets the grain size; letters set the lithology.
    Trace,
}

/// What the window asks of the application this frame.
#[derive(Debug, Clone, PartialEq)]
pub enum Outcome {
    Open,
    Closed,
    /// Apply this edit (with a gesture key for slider drags, so a drag is one undo step).
    Apply(Box<Edit>, Option<u64>),
}

/// The trace window's state for one image.
pub struct TraceView {
    /// The image file as found on disk (the project stores it relative to itself).
    pub image_path: PathBuf,
    image: SheetImage,
    texture: Option<(egui::TextureHandle, [u32; 2])>,
    pub mode: Mode,
    zoom: f32,
    pan: Vec2,
    /// Snap boundary clicks to the darkest pencil line near them.
    pub snap: bool,
    /// Lay the calibrated sheet behind the column canvas too.
    pub behind_column: bool,
    low_text: String,
    high_text: String,
    fine: WentworthClass,
    coarse: WentworthClass,
    /// Letters typed toward a lithology name.
    typed: String,
    /// The last thing the window did or refused, shown under the image.
    pub note: String,
}

/// Classes of the typed letters: the lithologies whose names start with them.
pub fn lithologies_starting(typed: &str) -> Vec<Lithology> {
    let t = typed.to_lowercase();
    Lithology::ALL.iter().copied().filter(|l| !t.is_empty() && l.name().starts_with(&t)).collect()
}

/// A grain size that goes with a lithology when the bed has none and the lithology needs one
/// (sandstone → medium sand …), so a key press never leaves a bed the file checks refuse; the
/// geologist then sets the true size with Shift+click.
pub fn starting_grain(lithology: Lithology) -> Option<GrainSize> {
    use aggrade_core::model::{GrainSizeRule, LithologyFamily};
    if lithology.grain_size_rule() != GrainSizeRule::Required {
        return None;
    }
    Some(GrainSize::Class(match lithology.family() {
        LithologyFamily::Fines if lithology == Lithology::Siltstone => WentworthClass::Silt,
        LithologyFamily::Fines => WentworthClass::Clay,
        LithologyFamily::Gravel => WentworthClass::Pebble,
        _ => WentworthClass::MediumSand,
    }))
}

/// The bed with a new lithology, grain sizes kept when allowed, given a start when required,
/// taken off when forbidden.
pub fn with_lithology(bed: &Bed, lithology: Lithology) -> Bed {
    use aggrade_core::model::GrainSizeRule;
    let mut b = bed.clone();
    b.lithology = lithology;
    match lithology.grain_size_rule() {
        GrainSizeRule::Forbidden => (b.grain_base, b.grain_top) = (None, None),
        GrainSizeRule::Required if b.grain_base.is_none() => {
            b.grain_base = starting_grain(lithology);
            b.grain_top = b.grain_base;
        }
        _ => {}
    }
    b
}

/// The grain-size edit a Shift+click makes: a click in the lower third of a graded bed sets its
/// base, in the upper third its top, elsewhere (or on an ungraded bed) both.
pub fn grain_click(bed: &Bed, frac_from_base: f64, class: WentworthClass) -> Edit {
    let g = Some(GrainSize::Class(class));
    let (base, top) = match super::canvas::grain_end_at(bed, frac_from_base) {
        super::canvas::GrainEnd::Base => (g, bed.grain_top),
        super::canvas::GrainEnd::Top => (bed.grain_base, g),
        super::canvas::GrainEnd::Both => (g, g),
    };
    Edit::SetGrain { bed: bed.id, base, top }
}

impl TraceView {
    /// Read the image; a missing or unreadable image gives the reader's message.
    pub fn open(path: &Path) -> Result<TraceView, SheetImageError> {
        let image = SheetImage::open(path)?;
        Ok(TraceView {
            image_path: path.to_path_buf(),
            image,
            texture: None,
            mode: Mode::Look,
            zoom: 1.0,
            pan: Vec2::ZERO,
            snap: true,
            behind_column: true,
            low_text: "0".into(),
            high_text: "1".into(),
            fine: WentworthClass::Clay,
            coarse: WentworthClass::Pebble,
            typed: String::new(),
            note: String::new(),
        })
    }

    /// The display copy as a texture, made again when brightness or contrast change.
    fn ensure_texture(&mut self, ctx: &egui::Context, view: &aggrade_core::trace::BackdropView) {
        let key = [((view.brightness * 1000.0) as i32) as u32, ((view.contrast * 1000.0) as i32) as u32];
        if self.texture.as_ref().is_none_or(|(_, k)| *k != key) {
            let pixels = display_pixels(&self.image, view);
            let tex = ctx.load_texture("trace-sheet", pixels, egui::TextureOptions::LINEAR);
            self.texture = Some((tex, key));
        }
    }

    /// What the column canvas needs to lay the sheet behind it: the texture, the full image size
    /// in pixels (the calibration's units) and the opacity; `None` when switched off or when the
    /// height scale is not calibrated yet.
    pub fn canvas_backdrop(&mut self, ctx: &egui::Context, section: &Section) -> Option<CanvasBackdrop> {
        let sheet = section.trace.as_ref()?;
        if !self.behind_column || sheet.height_scale.is_none() {
            return None;
        }
        self.ensure_texture(ctx, &sheet.view);
        let (tex, _) = self.texture.as_ref()?;
        Some(CanvasBackdrop {
            sheet: sheet.clone(),
            texture: tex.id(),
            image_size: [self.image.width, self.image.height],
            opacity: sheet.view.opacity,
        })
    }

    /// A click at image position `p` in the current mode: the edit it makes, if any.
    pub fn click(&mut self, section: &Section, p: Pt, shift: bool) -> Option<Edit> {
        let sheet = section.trace.clone()?;
        let unit = section.display_unit;
        match &mut self.mode {
            Mode::Look => None,
            Mode::Frame(pts) => {
                pts.push(p);
                if pts.len() < 4 {
                    self.note = format!("Corner {} of 4 taken", pts.len());
                    return None;
                }
                let frame = [pts[0], pts[1], pts[2], pts[3]];
                self.mode = Mode::Look;
                self.note = "Frame set: the sheet is straightened".into();
                Some(Edit::SetTrace { trace: Some(TraceSheet { frame_px: Some(frame), ..sheet }) })
            }
            Mode::HeightScale(pts) => {
                pts.push(p);
                if pts.len() < 2 {
                    self.note = "Lower height-scale point taken; now click the upper one".into();
                    return None;
                }
                let (low, high) = (pts[0], pts[1]);
                self.mode = Mode::Look;
                let (Some(low_m), Some(high_m)) =
                    (parse_length(&self.low_text, unit), parse_length(&self.high_text, unit))
                else {
                    self.note = "Type the two heights of the scale as numbers".into();
                    return None;
                };
                self.note = "Height scale set".into();
                let scale = HeightScale { low_px: low, low_m, high_px: high, high_m };
                Some(Edit::SetTrace { trace: Some(TraceSheet { height_scale: Some(scale), ..sheet }) })
            }
            Mode::GrainScale(pts) => {
                pts.push(p);
                if pts.len() < 2 {
                    self.note = "Finer grain-size point taken; now click the coarser one".into();
                    return None;
                }
                let (fine_px, coarse_px) = (pts[0], pts[1]);
                self.mode = Mode::Look;
                self.note = "Grain-size scale set".into();
                let scale = GrainScale { fine_px, fine: self.fine, coarse_px, coarse: self.coarse };
                Some(Edit::SetTrace { trace: Some(TraceSheet { grain_scale: Some(scale), ..sheet }) })
            }
            Mode::Trace => {
                let p = if self.snap && !shift {
                    snap_to_line(&self.image, &sheet, p, SnapParams::default())
                } else {
                    p
                };
                let height_m = match sheet.height_at(p) {
                    Ok(h) => h,
                    Err(e) => {
                        self.note = e.to_string();
                        return None;
                    }
                };
                if !shift {
                    return Some(Edit::TraceBoundary { height_m });
                }
                let class = match sheet.grain_at(p) {
                    Ok(c) => c,
                    Err(e) => {
                        self.note = e.to_string();
                        return None;
                    }
                };
                let Some(id) = bed_at(section, height_m) else {
                    self.note = "No bed there yet: click its top boundary first".into();
                    return None;
                };
                let i = section.bed_index(id)?;
                let base = section.base_heights_m()[i];
                let bed = &section.beds[i];
                Some(grain_click(bed, (height_m - base) / bed.thickness_m, class))
            }
        }
    }

    /// A letter typed in trace mode over image position `p`: the lithology edit once the letters
    /// name one lithology.
    pub fn letter(&mut self, section: &Section, p: Pt, ch: char) -> Option<Edit> {
        self.typed.push(ch);
        let found = lithologies_starting(&self.typed);
        match found.as_slice() {
            [] => {
                self.note = format!("No lithology starts with {:?}", self.typed);
                self.typed.clear();
                None
            }
            [one] => {
                self.typed.clear();
                let sheet = section.trace.as_ref()?;
                let h = sheet.height_at(p).ok()?;
                let Some(id) = bed_at(section, h) else {
                    self.note = "No bed under the cursor".into();
                    return None;
                };
                let bed = &section.beds[section.bed_index(id)?];
                self.note = format!("{one}");
                Some(Edit::ReplaceBed { bed: with_lithology(bed, *one) })
            }
            many => {
                self.note = format!(
                    "{:?}: {} — type more letters",
                    self.typed,
                    many.iter().map(|l| l.name()).collect::<Vec<_>>().join(", ")
                );
                None
            }
        }
    }

    /// Draw the window.
    pub fn ui(&mut self, ctx: &egui::Context, section: &Section) -> Outcome {
        let Some(sheet) = section.trace.clone() else { return Outcome::Closed };
        let mut outcome = Outcome::Open;
        let mut open = true;
        let name = self.image_path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
        egui::Window::new("Trace from image").open(&mut open).default_size([720.0, 820.0]).show(ctx, |ui| {
            ui.label(format!("{name} behind section {:?}", section.name));
            let mut view = sheet.view;
            let mut changed = false;
            ui.horizontal(|ui| {
                changed |= ui.add(egui::Slider::new(&mut view.opacity, 0.0..=1.0).text("opacity")).changed();
                changed |= ui.add(egui::Slider::new(&mut view.rotation_deg, -15.0..=15.0).text("rotation °")).changed();
            });
            ui.horizontal(|ui| {
                changed |= ui.add(egui::Slider::new(&mut view.brightness, -1.0..=1.0).text("brightness")).changed();
                changed |= ui.add(egui::Slider::new(&mut view.contrast, 0.2..=3.0).text("contrast")).changed();
            });
            if changed {
                let edit = Edit::SetTrace { trace: Some(TraceSheet { view, ..sheet.clone() }) };
                outcome = Outcome::Apply(Box::new(edit), Some(super::actions::gesture_key(("trace-view", &self.image_path))));
            }
            let unit = section.display_unit;
            ui.horizontal(|ui| {
                if ui.selectable_label(matches!(self.mode, Mode::Frame(_)), "Frame corners").on_hover_text(
                    "Click the sheet's frame corners: lower left, lower right, upper right, upper left (straightens a photo taken at an angle)",
                ).clicked() {
                    self.mode = Mode::Frame(Vec::new());
                }
                if ui.selectable_label(matches!(self.mode, Mode::HeightScale(_)), "Height scale").on_hover_text(
                    "Click two points of the sheet's height scale, lower first; their heights are typed beside",
                ).clicked() {
                    self.mode = Mode::HeightScale(Vec::new());
                }
                ui.add(egui::TextEdit::singleline(&mut self.low_text).desired_width(48.0).char_limit(24));
                ui.label("to");
                ui.add(egui::TextEdit::singleline(&mut self.high_text).desired_width(48.0).char_limit(24));
                ui.label(unit.name());
            });
            ui.horizontal(|ui| {
                if ui.selectable_label(matches!(self.mode, Mode::GrainScale(_)), "Grain-size scale").on_hover_text(
                    "Click two points of the sheet's grain-size scale, finer first; name their classes beside",
                ).clicked() {
                    self.mode = Mode::GrainScale(Vec::new());
                }
                for (salt, class) in [("trace_fine", &mut self.fine), ("trace_coarse", &mut self.coarse)] {
                    egui::ComboBox::from_id_salt(salt).selected_text(class.name()).show_ui(ui, |ui| {
                        for c in WentworthClass::ALL {
                            ui.selectable_value(class, c, c.name());
                        }
                    });
                }
            });
            ui.horizontal(|ui| {
                let ready = sheet.height_scale.is_some();
                if ui.add_enabled(ready, egui::Button::selectable(self.mode == Mode::Trace, "Trace")).on_hover_text(
                    "Click a bed boundary to put it in; Shift+click at a bed's grain-size edge sets its grain size; type a lithology's first letters over a bed",
                ).on_disabled_hover_text("Set the height scale first").clicked() {
                    self.mode = Mode::Trace;
                }
                if ui.selectable_label(self.mode == Mode::Look, "Look").clicked() {
                    self.mode = Mode::Look;
                }
                ui.checkbox(&mut self.snap, "Snap to pencil lines");
                ui.checkbox(&mut self.behind_column, "Show behind the column").on_hover_text(
                    "Lay the sheet behind the column at its calibrated heights (and grain sizes), at the opacity set above",
                );
                if ui.button("Take the sheet off").on_hover_text("Remove the image and its calibration from the section (Ctrl+Z brings it back)").clicked() {
                    outcome = Outcome::Apply(Box::new(Edit::SetTrace { trace: None }), None);
                }
            });
            self.ensure_texture(ctx, &view);
            let (rect, response) = ui.allocate_exact_size(ui.available_size().max(Vec2::splat(100.0)) - Vec2::new(0.0, 22.0), Sense::click_and_drag());
            let size = Vec2::new(self.image.width as f32, self.image.height as f32);
            let place = Placement::fit(rect, size, view.rotation_deg, self.zoom, self.pan);
            let painter = ui.painter_at(rect);
            painter.rect_filled(rect, 0.0, Color32::from_gray(60));
            if let Some((tex, _)) = &self.texture {
                let corners = [Pt::new(0.0, 0.0), Pt::new(size.x as f64, 0.0), Pt::new(size.x as f64, size.y as f64), Pt::new(0.0, size.y as f64)];
                let uv = [egui::pos2(0.0, 0.0), egui::pos2(1.0, 0.0), egui::pos2(1.0, 1.0), egui::pos2(0.0, 1.0)];
                let tint = Color32::from_white_alpha((view.opacity.clamp(0.0, 1.0) * 255.0) as u8);
                let mut mesh = egui::Mesh::with_texture(tex.id());
                for (c, t) in corners.iter().zip(uv) {
                    mesh.vertices.push(egui::epaint::Vertex { pos: place.to_screen(*c), uv: t, color: tint });
                }
                mesh.add_triangle(0, 1, 2);
                mesh.add_triangle(0, 2, 3);
                painter.add(egui::Shape::mesh(mesh));
            }
            self.draw_overlay(&painter, &place, section, &sheet);
            if response.dragged() && self.mode == Mode::Look {
                self.pan += response.drag_delta();
            }
            if response.hovered() {
                let scroll = ui.input(|i| i.smooth_scroll_delta.y);
                if scroll != 0.0 {
                    self.zoom = (self.zoom * (1.0 + scroll / 400.0)).clamp(0.2, 20.0);
                }
            }
            if let (true, Some(pos)) = (response.clicked(), response.interact_pointer_pos()) {
                let shift = ui.input(|i| i.modifiers.shift);
                if let Some(edit) = self.click(section, place.to_image(pos), shift) {
                    outcome = Outcome::Apply(Box::new(edit), None);
                }
            }
            let mut hover = String::new();
            if self.mode == Mode::Trace && response.hovered() {
                if let Some(pos) = response.hover_pos() {
                    let letters: Vec<char> = ui.input(|i| {
                        i.events.iter().filter_map(|e| match e {
                            egui::Event::Text(t) => Some(t.chars().filter(|c| c.is_alphabetic()).collect::<Vec<_>>()),
                            _ => None,
                        }).flatten().collect()
                    });
                    for ch in letters {
                        if let Some(edit) = self.letter(section, place.to_image(pos), ch) {
                            outcome = Outcome::Apply(Box::new(edit), None);
                        }
                    }
                    if let Ok(h) = sheet.height_at(place.to_image(pos)) {
                        hover = format!("{:.3} {} · ", unit.from_metres(h), unit.name());
                    }
                }
            }
            ui.label(egui::RichText::new(format!("{hover}{}", self.note)).small());
        });
        if !open {
            return Outcome::Closed;
        }
        outcome
    }

    /// Calibration points and the traced boundaries drawn over the image.
    fn draw_overlay(
        &self,
        painter: &egui::Painter,
        place: &Placement,
        section: &Section,
        sheet: &TraceSheet,
    ) {
        let dot = |p: Pt, c: Color32| painter.circle_stroke(place.to_screen(p), 5.0, Stroke::new(2.0, c));
        let blue = Color32::from_rgb(30, 110, 230);
        let orange = Color32::from_rgb(230, 120, 20);
        if let Some(f) = sheet.frame_px {
            let pts: Vec<_> = f.iter().chain(f.first()).map(|p| place.to_screen(*p)).collect();
            painter.add(egui::Shape::line(pts, Stroke::new(1.5, blue)));
        }
        if let Some(h) = sheet.height_scale {
            dot(h.low_px, orange);
            dot(h.high_px, orange);
        }
        if let Some(g) = sheet.grain_scale {
            dot(g.fine_px, blue);
            dot(g.coarse_px, blue);
        }
        if let Mode::Frame(p) | Mode::HeightScale(p) | Mode::GrainScale(p) = &self.mode {
            for q in p {
                dot(*q, Color32::RED);
            }
        }
        // Each traced boundary as a short red line at its height, across the grain-size scale
        // (or the middle of the image when that is not set).
        let (left, right) = match sheet.grain_scale {
            Some(g) => (g.fine_px, g.coarse_px),
            None => {
                (Pt::new(self.image.width as f64 * 0.3, 0.0), Pt::new(self.image.width as f64 * 0.7, 0.0))
            }
        };
        let mut h = 0.0;
        for bed in &section.beds {
            h += bed.thickness_m;
            if let (Ok(a), Ok(b)) = (sheet.pixel_at_height(h, left), sheet.pixel_at_height(h, right)) {
                painter.line_segment(
                    [place.to_screen(a), place.to_screen(b)],
                    Stroke::new(2.0, Color32::from_rgb(220, 30, 30)),
                );
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::BedId;

    #[test]
    fn letters_pick_a_lithology_once_they_name_one() {
        assert_eq!(lithologies_starting("sa"), vec![Lithology::Sandstone]);
        assert_eq!(lithologies_starting("s").len(), 3, "sandstone, shale, siltstone");
        assert!(lithologies_starting("x").is_empty());
        assert!(lithologies_starting("").is_empty());
    }

    #[test]
    fn a_new_lithology_brings_a_grain_size_the_checks_accept() {
        let covered = Bed::new(BedId(1), 1.0, Lithology::Covered, None);
        let sand = with_lithology(&covered, Lithology::Sandstone);
        assert_eq!(sand.grain_base, Some(GrainSize::Class(WentworthClass::MediumSand)));
        let silt = with_lithology(&covered, Lithology::Siltstone);
        assert_eq!(silt.grain_top, Some(GrainSize::Class(WentworthClass::Silt)));
        assert_eq!(with_lithology(&sand, Lithology::Covered).grain_base, None);
        assert_eq!(with_lithology(&covered, Lithology::Coal).grain_base, None);
    }

    #[test]
    fn shift_clicks_set_base_or_top_of_a_graded_bed() {
        let mut bed =
            Bed::new(BedId(4), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::CoarseSand)));
        bed.grain_top = Some(GrainSize::Class(WentworthClass::FineSand));
        let fine = Some(GrainSize::Class(WentworthClass::VeryFineSand));
        assert_eq!(
            grain_click(&bed, 0.1, WentworthClass::VeryFineSand),
            Edit::SetGrain { bed: BedId(4), base: fine, top: bed.grain_top }
        );
        assert_eq!(
            grain_click(&bed, 0.9, WentworthClass::VeryFineSand),
            Edit::SetGrain { bed: BedId(4), base: bed.grain_base, top: fine }
        );
        assert_eq!(
            grain_click(&bed, 0.5, WentworthClass::VeryFineSand),
            Edit::SetGrain { bed: BedId(4), base: fine, top: fine }
        );
    }
}
