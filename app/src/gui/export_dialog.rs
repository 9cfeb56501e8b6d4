//! The export dialog: scale and paper, a preview of page 1, and writing the file.

use super::engine::{self, LayoutOptions};
use super::files::{FileDialogs, SaveKind};
use super::painter::{self, ItemIndex, MmToScreen};
use aggrade_core::model::Section;
use aggrade_core::rules::Interpretation;

/// Paper sizes offered (ISO 216 A4 and A3; US Letter 8.5 × 11 in; one tall page).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PaperChoice {
    A4,
    A3,
    Letter,
    Tall,
}

impl PaperChoice {
    fn name(self) -> &'static str {
        match self {
            PaperChoice::A4 => "A4",
            PaperChoice::A3 => "A3",
            PaperChoice::Letter => "US Letter",
            PaperChoice::Tall => "One tall page",
        }
    }
    /// Portrait size in mm (ISO 216: A4 210 × 297, A3 297 × 420; Letter 215.9 × 279.4).
    fn size_mm(self, column_h_mm: f64) -> (f64, f64) {
        match self {
            PaperChoice::A4 => (210.0, 297.0),
            PaperChoice::A3 => (297.0, 420.0),
            PaperChoice::Letter => (215.9, 279.4),
            PaperChoice::Tall => (210.0, column_h_mm + 40.0),
        }
    }
}

/// What happened in the dialog this frame.
pub enum Outcome {
    Open,
    Closed,
    Done(String),
    Failed(String),
}

/// Dialog state.
#[derive(Debug)]
pub struct ExportDialog {
    pub scale: f64,
    pub paper: PaperChoice,
    pub landscape: bool,
}

impl Default for ExportDialog {
    fn default() -> Self {
        ExportDialog { scale: 100.0, paper: PaperChoice::A4, landscape: false }
    }
}

impl ExportDialog {
    /// Draw the dialog.
    pub fn ui(
        &mut self,
        ctx: &egui::Context,
        section: &Section,
        interp: &Interpretation,
        dialogs: &mut dyn FileDialogs,
    ) -> Outcome {
        let mut outcome = Outcome::Open;
        let mut open = true;
        egui::Window::new("Export column").open(&mut open).collapsible(false).resizable(false).show(
            ctx,
            |ui| {
                ui.horizontal(|ui| {
                    ui.label("Scale 1 :");
                    egui::ComboBox::from_id_salt("scale").selected_text(format!("{}", self.scale)).show_ui(
                        ui,
                        |ui| {
                            for s in [10.0, 20.0, 50.0, 100.0, 200.0, 500.0] {
                                ui.selectable_value(&mut self.scale, s, format!("{s}"));
                            }
                        },
                    );
                    ui.add(egui::DragValue::new(&mut self.scale).range(1.0..=100_000.0).speed(1.0))
                        .on_hover_text("Any scale 1:N");
                });
                ui.horizontal(|ui| {
                    ui.label("Paper");
                    egui::ComboBox::from_id_salt("paper").selected_text(self.paper.name()).show_ui(
                        ui,
                        |ui| {
                            for p in
                                [PaperChoice::A4, PaperChoice::A3, PaperChoice::Letter, PaperChoice::Tall]
                            {
                                ui.selectable_value(&mut self.paper, p, p.name());
                            }
                        },
                    );
                    ui.checkbox(&mut self.landscape, "Landscape").on_hover_text("Turn the page sideways");
                });
                let opts = LayoutOptions { scale_denominator: self.scale, ..LayoutOptions::default() };
                let strip = engine::column_strip(section, interp, &opts);
                let (mut w, mut h) = self.paper.size_mm(strip.height_mm);
                if self.landscape && self.paper != PaperChoice::Tall {
                    std::mem::swap(&mut w, &mut h);
                }
                ui.label(format!(
                    "Column {:.0} mm tall at 1:{} · page 1 preview",
                    strip.height_mm, self.scale
                ));
                let box_h = 300.0f32;
                let zoom = (box_h / h as f32).min(240.0 / w as f32);
                let (rect, _) = ui
                    .allocate_exact_size(egui::vec2(w as f32 * zoom, h as f32 * zoom), egui::Sense::hover());
                let p = ui.painter_at(rect);
                p.rect_filled(rect, 0.0, egui::Color32::WHITE);
                p.rect_stroke(
                    rect,
                    0.0,
                    egui::Stroke::new(1.0, egui::Color32::GRAY),
                    egui::StrokeKind::Outside,
                );
                let t = MmToScreen { origin: rect.min + egui::vec2(15.0 * zoom, 15.0 * zoom), zoom };
                let mut idx = ItemIndex::build(&strip.items, strip.height_mm);
                let which = idx.visible(0.0, h - 30.0);
                let mut shapes = Vec::new();
                painter::shapes(&strip.items, &which, &t, &mut shapes);
                p.extend(shapes);
                ui.horizontal(|ui| {
                    if ui.button("Export SVG…").on_hover_text("Write the column as an SVG drawing").clicked()
                    {
                        if let Some(path) = dialogs.pick_save(SaveKind::Svg, &section.name) {
                            outcome = match std::fs::write(&path, engine::strip_svg(&strip)) {
                                Ok(()) => Outcome::Done(format!("Exported {}", path.display())),
                                Err(e) => Outcome::Failed(format!("{}: {e}", path.display())),
                            };
                        }
                    }
                });
            },
        );
        if !open {
            return Outcome::Closed;
        }
        outcome
    }
}
