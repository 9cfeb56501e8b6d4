//! The export dialog: scale, paper and orientation, a preview of page 1, and writing PDF or SVG
//! through the core's page layout and writers (the same items the screen draws).

use super::chooser::{Chooser, PickFor, SaveKind};
use super::error::{WriteError, Written};
use super::painter::{self, ItemIndex, MmToScreen};
use aggrade_core::export::{write_pdf, write_svg, PdfInfo};
use aggrade_core::layout::{pages, LayoutOptions, Orientation, Page, Paper, PrintMeta};
use aggrade_core::model::Section;
use aggrade_core::rules::Interpretation;
use std::path::Path;

/// What happened in the dialog this frame.
pub enum Outcome {
    Open,
    Closed,
    Done(Written),
    /// Writing to this path failed, for this reason.
    Failed(std::path::PathBuf, WriteError),
}

/// Dialog state.
#[derive(Debug, Default)]
pub struct ExportDialog {
    pub options: LayoutOptions,
    preview: Option<Preview>,
}

/// Resolution of File ▸ Export PNG (the command line takes any with `--dpi`).
pub const PNG_DPI: f64 = 200.0;

/// The pages laid out for the preview, with what they were laid out from and page 1's item
/// index (built once per layout, not per frame).
#[derive(Debug)]
struct Preview {
    options: LayoutOptions,
    revision: u64,
    pages: Vec<Page>,
    first_page_index: ItemIndex,
}

/// Write the section's pages to `path` as PDF (all pages), SVG or PNG (page 1), by extension;
/// says what was written.
pub fn export_to(
    path: &Path,
    section: &Section,
    interp: &Interpretation,
    opts: &LayoutOptions,
    now_secs: i64,
) -> Result<Written, WriteError> {
    let meta = PrintMeta { printed_on: aggrade_core::export::civil_date(now_secs), subtitle: String::new() };
    let pages = pages(section, interp, opts, &meta);
    let is_svg = path.extension().is_some_and(|e| e.eq_ignore_ascii_case("svg"));
    let is_png = path.extension().is_some_and(|e| e.eq_ignore_ascii_case("png"));
    let bytes = if is_svg {
        pages.first().map(write_svg).ok_or(WriteError::NothingToExport)?.into_bytes()
    } else if is_png {
        let page = pages.first().ok_or(WriteError::NothingToExport)?;
        aggrade_core::export::write_png(page, PNG_DPI)?
    } else {
        let info = PdfInfo {
            title: section.name.clone(),
            author: section.logged_by.clone(),
            creation_date: now_secs,
        };
        write_pdf(&pages, &info)
    };
    aggrade_core::io::write_bytes_atomic(path, &bytes)?;
    Ok(Written::Column {
        pages: if is_svg || is_png { 1 } else { pages.len() },
        scale: opts.scale_label(),
        path: path.to_path_buf(),
    })
}

/// Scales offered in the scale row's menu (common practice for measured sections).
pub const COMMON_SCALES: [f64; 6] = [10.0, 20.0, 50.0, 100.0, 200.0, 500.0];

/// The scale, shown once: "Scale 1:" with the denominator to type or drag, and a menu of common
/// scales that sets it.
pub fn scale_row(ui: &mut egui::Ui, o: &mut LayoutOptions) {
    ui.horizontal(|ui| {
        let lab = ui.label("Scale").id;
        ui.add(egui::DragValue::new(&mut o.scale_denominator).range(1.0..=100_000.0).speed(1.0).prefix("1:"))
            .labelled_by(lab)
            .on_hover_text("Any scale 1:N: type or drag N");
        ui.menu_button("Common scales", |ui| {
            for s in COMMON_SCALES {
                if ui.button(format!("1:{s}")).clicked() {
                    o.scale_denominator = s;
                    ui.close();
                }
            }
        });
    });
}

/// Which marks of the field record print: each as a checkbox saying what it adds.
pub fn record_row(ui: &mut egui::Ui, o: &mut LayoutOptions) {
    ui.horizontal_wrapped(|ui| {
        ui.label("Print");
        ui.checkbox(&mut o.show_facies, "Lithofacies").on_hover_text(
            "A track of each bed's lithofacies code: yours in black, a suggested one grey with \"?\" \
             (a candidate for your review)",
        );
        ui.checkbox(&mut o.show_sample_ids, "Sample ids")
            .on_hover_text("Samples marked at the height they were taken, with their ids beside the column");
        ui.checkbox(&mut o.show_photos, "Photos")
            .on_hover_text("Photographs marked at their beds, with their references");
        ui.checkbox(&mut o.show_bioturbation, "Bioturbation index")
            .on_hover_text("A narrow track of the bioturbation index, 0-6 (Taylor & Goldring 1993)");
        ui.checkbox(&mut o.show_fossils, "Fossils")
            .on_hover_text("Trace and body fossils marked at their beds, with their names");
    });
}

/// The line above the preview (the scale is in the row above, not repeated here).
pub fn pages_line(pages: usize) -> String {
    format!("{pages} page{} · preview of page 1", if pages == 1 { "" } else { "s" })
}

impl ExportDialog {
    /// Draw the dialog.
    pub fn ui(
        &mut self,
        ctx: &egui::Context,
        section: &Section,
        revision: u64,
        interp: &Interpretation,
        dialogs: &mut Chooser,
    ) -> Outcome {
        let mut outcome = Outcome::Open;
        let mut open = true;
        egui::Window::new("Export column").open(&mut open).collapsible(false).resizable(false).show(
            ctx,
            |ui| {
                let o = &mut self.options;
                scale_row(ui, o);
                ui.horizontal(|ui| {
                    ui.label("Paper");
                    egui::ComboBox::from_id_salt("paper").selected_text(o.paper.name()).show_ui(ui, |ui| {
                        for p in [Paper::A4, Paper::A3, Paper::Letter, Paper::TallSingle] {
                            ui.selectable_value(&mut o.paper, p, p.name());
                        }
                    });
                    let mut landscape = o.orientation == Orientation::Landscape;
                    if ui
                        .checkbox(&mut landscape, "Landscape")
                        .on_hover_text("Turn the page sideways")
                        .changed()
                    {
                        o.orientation =
                            if landscape { Orientation::Landscape } else { Orientation::Portrait };
                    }
                });
                ui.checkbox(&mut o.show_rejected, "Show rejected boundaries")
                    .on_hover_text("Print the boundaries you rejected, greyed");
                record_row(ui, o);
                let stale =
                    self.preview.as_ref().is_none_or(|p| p.options != self.options || p.revision != revision);
                if stale {
                    let meta = PrintMeta::default();
                    let pages = pages(section, interp, &self.options, &meta);
                    let first_page_index =
                        pages.first().map(|p| ItemIndex::build(&p.items, p.height_mm)).unwrap_or_default();
                    self.preview =
                        Some(Preview { options: self.options.clone(), revision, pages, first_page_index });
                }
                let Some(Preview { pages, first_page_index, .. }) = self.preview.as_mut() else { return };
                ui.label(pages_line(pages.len()));
                if let Some(page) = pages.first() {
                    let zoom = (340.0 / page.height_mm as f32).min(260.0 / page.width_mm as f32);
                    let (rect, _) = ui.allocate_exact_size(
                        egui::vec2(page.width_mm as f32 * zoom, page.height_mm as f32 * zoom),
                        egui::Sense::hover(),
                    );
                    let p = ui.painter_at(rect);
                    p.rect_filled(rect, 0.0, egui::Color32::WHITE);
                    p.rect_stroke(
                        rect,
                        0.0,
                        egui::Stroke::new(1.0, egui::Color32::GRAY),
                        egui::StrokeKind::Outside,
                    );
                    let t = MmToScreen { origin: rect.min, zoom };
                    let which = first_page_index.visible(0.0, page.height_mm);
                    let mut shapes = Vec::new();
                    painter::shapes(&page.items, &which, &t, &mut shapes);
                    p.extend(shapes);
                    painter::texts(&page.items, &which, &t, &p);
                }
                ui.horizontal(|ui| {
                    let now = std::time::SystemTime::now()
                        .duration_since(std::time::UNIX_EPOCH)
                        .map(|d| d.as_secs() as i64)
                        .unwrap_or(0);
                    for (label, kind, tip) in [
                        ("Export PDF…", SaveKind::Pdf, "Write every page as a PDF at the chosen scale"),
                        ("Export SVG…", SaveKind::Svg, "Write page 1 as an SVG drawing"),
                        (
                            "Export PNG…",
                            SaveKind::Png,
                            "Write page 1 as a PNG image at 200 dpi, true scale when printed at 200 dpi",
                        ),
                    ] {
                        let clicked = ui.button(label).on_hover_text(tip).clicked();
                        let purpose = PickFor::ExportColumn(kind);
                        if let Some(path) = dialogs.save_path(clicked, purpose, kind, &section.name) {
                            outcome = match export_to(&path, section, interp, &self.options, now) {
                                Ok(msg) => Outcome::Done(msg),
                                Err(e) => Outcome::Failed(path, e),
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

#[cfg(test)]
mod tests {
    use super::*;
    use egui_kittest::kittest::Queryable;

    /// Widgets whose shown text holds the scale's denominator.
    fn showing(h: &egui_kittest::Harness<'_, LayoutOptions>, text: &str) -> usize {
        h.query_all_by(|n| n.value().or_else(|| n.label()).is_some_and(|l| l.contains(text))).count()
    }

    #[test]
    fn the_scale_is_shown_once_and_a_common_scale_sets_it() {
        let mut options = LayoutOptions { scale_denominator: 250.0, ..LayoutOptions::default() };
        let mut h = egui_kittest::Harness::new_ui_state(
            |ui, o: &mut LayoutOptions| scale_row(ui, o),
            options.clone(),
        );
        h.run();
        assert_eq!(showing(&h, "250"), 1, "the denominator appears in one widget only");
        h.get_by_label("Common scales").click();
        h.run();
        h.get_by_label("1:200").click();
        h.run();
        options.scale_denominator = 200.0;
        assert_eq!(h.state().scale_denominator, options.scale_denominator);
        assert_eq!(showing(&h, "250"), 0);
        assert_eq!(pages_line(1), "1 page · preview of page 1");
        assert_eq!(pages_line(3), "3 pages · preview of page 1");
    }

    #[test]
    fn the_record_marks_to_print_are_chosen_by_checkbox() {
        let mut h = egui_kittest::Harness::new_ui_state(
            |ui, o: &mut LayoutOptions| record_row(ui, o),
            LayoutOptions::default(),
        );
        h.run();
        // Facies and sample ids print unless turned off; photos, bioturbation, fossils on request.
        assert!(h.state().show_facies && h.state().show_sample_ids);
        h.get_by_label("Sample ids").click();
        h.get_by_label("Photos").click();
        h.get_by_label("Bioturbation index").click();
        h.run();
        let o = h.state();
        assert!(
            !o.show_sample_ids && o.show_photos && o.show_bioturbation && o.show_facies && !o.show_fossils
        );
    }
}
