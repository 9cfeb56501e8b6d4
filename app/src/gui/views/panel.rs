//! Correlation panel view: the project's sections side by side from the core's panel layout,
//! drawn by the same painter as the column (so screen and print agree), with zoom and pan, a
//! datum picker, tie lines, proportions and export to PDF or SVG.

use super::common::{caution, counted, fmt_percent, text_table, ViewCtx, ViewsOutcome};
use crate::gui::chooser::{PickFor, SaveKind};
use crate::gui::error::{WriteError, Written};
use crate::gui::painter::{self, ItemIndex, MmToScreen};
use crate::gui::plots::plot_unit;
use crate::gui::theme;
use aggrade_core::export::{write_pdf, write_svg, PdfInfo};
use aggrade_core::layout::{
    panel_layout, section_markers, Datum, LayoutOptions, Orientation, PanelError, PanelLayout, PanelOptions,
    Paper, PrintMeta,
};
use aggrade_core::model::{LengthUnit, Project, Section};
use std::path::Path;

/// Default width of the controls on the left of the panel window, points: wide enough for the
/// section table (name, position, datum height, channel bodies) without clipping.
pub const PANE_WIDTH: f32 = 440.0;

/// A height (m) of `section` in its display unit: "24.60 m", "80.71 ft".
fn height_text(section: &Section, h: f64) -> String {
    plot_unit(section).length(h).to_string()
}

/// The first letter in capitals.
fn capitalised(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().chain(c).collect(),
        None => String::new(),
    }
}

/// A level the panel can hang on, as offered in the datum picker.
#[derive(Debug, Clone, PartialEq)]
pub struct DatumChoice {
    pub datum: Datum,
    /// As shown in the picker.
    pub label: String,
}

/// The datums a project offers: the section base, then every named surface, correlation label
/// and accepted boundary (by name, each once, sorted), saying how many sections have it.
pub fn datum_choices(project: &Project) -> Vec<DatumChoice> {
    let mut named: std::collections::BTreeMap<String, (usize, bool, Option<String>)> = Default::default();
    let mut links: std::collections::BTreeMap<String, usize> = Default::default();
    for s in &project.sections {
        for m in section_markers(s).markers {
            if let Some(l) = &m.link {
                *links.entry(l.clone()).or_insert(0) += 1;
                if !m.surface {
                    // Offered by its label.
                    continue;
                }
            }
            let e = named.entry(m.name.clone()).or_insert((0, false, None));
            e.0 += 1;
            e.1 |= m.accepted;
            if m.unnamed {
                e.2 = Some(format!("accepted boundary, {} at {:.2} m", s.name, m.height_m));
            }
        }
    }
    let secs = |count: usize| counted(count, "section", "sections");
    let mut out = vec![DatumChoice { datum: Datum::Base, label: "Section base".into() }];
    for (name, (count, accepted, unnamed)) in named {
        let label = match unnamed {
            Some(text) => text,
            None => {
                let acc = if accepted { ", accepted boundary" } else { "" };
                format!("{name} ({}{acc})", secs(count))
            }
        };
        out.push(DatumChoice { datum: Datum::Named(name), label });
    }
    for (label, count) in links {
        if out.iter().any(|d| d.datum == Datum::Named(label.clone())) {
            continue;
        }
        out.push(DatumChoice {
            label: format!("{label} (correlation label, {})", secs(count)),
            datum: Datum::Named(label),
        });
    }
    out
}

/// The panel's choices, the same as `aggrade panel` takes.
#[derive(Debug, Clone, PartialEq)]
pub struct PanelChoices {
    pub datum: Datum,
    /// Vertical scale denominator N of 1:N.
    pub scale_denominator: f64,
    /// Horizontal scale denominator of the gaps; `None` picks a round value that fits.
    pub horizontal_scale_denominator: Option<f64>,
    pub paper: Paper,
    pub landscape: bool,
    /// Empty gives "Correlation panel".
    pub title: String,
    /// Date printed in the header (empty: none).
    pub printed_on: String,
}

impl Default for PanelChoices {
    /// Hung on the base, 1:500 on A3 landscape (four or five columns of a few tens of metres fit
    /// on one sheet), horizontal scale chosen to fit.
    fn default() -> Self {
        PanelChoices {
            datum: Datum::Base,
            scale_denominator: 500.0,
            horizontal_scale_denominator: None,
            paper: Paper::A3,
            landscape: true,
            title: String::new(),
            printed_on: String::new(),
        }
    }
}

impl PanelChoices {
    /// The core's panel options for these choices (as `aggrade panel` builds them).
    pub fn options(&self) -> PanelOptions {
        PanelOptions {
            datum: self.datum.clone(),
            layout: LayoutOptions {
                scale_denominator: self.scale_denominator,
                paper: self.paper,
                orientation: if self.landscape { Orientation::Landscape } else { Orientation::Portrait },
                ..LayoutOptions::default()
            },
            horizontal_scale_denominator: self.horizontal_scale_denominator,
            title: self.title.clone(),
            ..PanelOptions::default()
        }
    }

    /// Header lines under the title: the document's name and the date, if any.
    pub fn meta(&self, doc_name: &str) -> PrintMeta {
        PrintMeta { printed_on: self.printed_on.trim().to_string(), subtitle: doc_name.to_string() }
    }
}

struct PanelCache {
    key: (u64, PanelChoices, String),
    layout: Result<PanelLayout, PanelError>,
    index: ItemIndex,
    choices: Vec<DatumChoice>,
}

/// The correlation panel window.
pub struct PanelView {
    pub open: bool,
    pub choices: PanelChoices,
    /// Screen points per millimetre of page.
    pub zoom: f32,
    /// Offset of the page's top-left corner from the view's top-left corner, points.
    pub pan: egui::Vec2,
    fit_pending: bool,
    cache: Option<PanelCache>,
    /// Items drawn in the last frame.
    pub last_drawn_items: usize,
    /// How many times the panel was laid out (stays put while nothing changes).
    pub layouts_made: u64,
}

impl Default for PanelView {
    fn default() -> Self {
        PanelView {
            open: false,
            choices: PanelChoices::default(),
            zoom: 1.0,
            pan: egui::Vec2::ZERO,
            fit_pending: true,
            cache: None,
            last_drawn_items: 0,
            layouts_made: 0,
        }
    }
}

/// Write a laid-out panel to `path`: SVG when the name ends in .svg, else PDF.
pub fn export_panel(
    path: &Path,
    layout: &PanelLayout,
    title: &str,
    now_secs: i64,
) -> Result<Written, WriteError> {
    let is_svg = path.extension().is_some_and(|e| e.eq_ignore_ascii_case("svg"));
    let bytes = if is_svg {
        write_svg(&layout.page).into_bytes()
    } else {
        let info = PdfInfo {
            title: if title.is_empty() { "Correlation panel".into() } else { title.to_string() },
            author: String::new(),
            creation_date: now_secs,
        };
        write_pdf(std::slice::from_ref(&layout.page), &info)
    };
    aggrade_core::io::write_bytes_atomic(path, &bytes)
        .map_err(|error| WriteError::At { path: path.to_path_buf(), error })?;
    Ok(Written::Panel {
        columns: layout.columns.len(),
        width_mm: layout.page.width_mm,
        height_mm: layout.page.height_mm,
        path: path.to_path_buf(),
    })
}

impl PanelView {
    /// The current layout (after a frame has been drawn).
    pub fn layout(&self) -> Option<&Result<PanelLayout, PanelError>> {
        self.cache.as_ref().map(|c| &c.layout)
    }

    fn refresh(&mut self, v: &ViewCtx) {
        let key = (v.generation, self.choices.clone(), v.doc_name.clone());
        if self.cache.as_ref().is_some_and(|c| c.key == key) {
            return;
        }
        let choices = datum_choices(v.project);
        let layout =
            panel_layout(v.project, v.interps, &self.choices.options(), &self.choices.meta(&v.doc_name));
        let index = match &layout {
            Ok(l) => ItemIndex::build(&l.page.items, l.page.height_mm),
            Err(_) => ItemIndex::default(),
        };
        let page_changed = match (self.cache.as_ref().map(|c| &c.layout), &layout) {
            (Some(Ok(a)), Ok(b)) => {
                (a.page.width_mm, a.page.height_mm) != (b.page.width_mm, b.page.height_mm)
            }
            _ => true,
        };
        self.fit_pending |= page_changed;
        self.layouts_made += 1;
        self.cache = Some(PanelCache { key, layout, index, choices });
    }

    /// Draw the window.
    pub fn window(&mut self, ctx: &egui::Context, v: &mut ViewCtx, out: &mut ViewsOutcome) {
        self.refresh(v);
        let mut open = self.open;
        egui::Window::new("Correlation panel")
            .open(&mut open)
            .default_pos([120.0, 60.0])
            .default_size([1100.0, 760.0])
            .resizable(true)
            .vscroll(false)
            .show(ctx, |ui| {
                egui::Panel::left("panel_view_controls")
                    .resizable(true)
                    .default_size(PANE_WIDTH)
                    .min_size(300.0)
                    .show(ui, |ui| {
                        egui::ScrollArea::vertical().id_salt("panel_view_side").show(ui, |ui| {
                            self.controls(ui, v, out);
                        });
                    });
                egui::CentralPanel::default().show(ui, |ui| self.canvas(ui));
            });
        self.open = open;
    }

    fn controls(&mut self, ui: &mut egui::Ui, v: &mut ViewCtx, out: &mut ViewsOutcome) {
        let Some(cache) = self.cache.as_ref() else { return };
        let c = &mut self.choices;
        let hang = ui
            .heading("Datum")
            .on_hover_text(
                "Sections are hung from this surface: each column is moved up or down so that this                  level lines up across the panel",
            )
            .id;
        let current = cache
            .choices
            .iter()
            .find(|d| d.datum == c.datum)
            .map(|d| d.label.clone())
            .unwrap_or_else(|| c.datum.label());
        egui::ComboBox::from_id_salt("panel_datum")
            .selected_text(current)
            .width(260.0)
            .show_ui(ui, |ui| {
                for d in &cache.choices {
                    ui.selectable_value(&mut c.datum, d.datum.clone(), &d.label)
                        .on_hover_text("Hang the sections from this level");
                }
            })
            .response
            .labelled_by(hang)
            .on_hover_text(
                "The level the sections are hung from: the section base, a named surface or an                  accepted boundary",
            );
        ui.add_space(4.0);
        egui::Grid::new("panel_options").num_columns(2).spacing([8.0, 4.0]).show(ui, |ui| {
            let lab = ui.label("Vertical scale 1 :").id;
            ui.add(egui::DragValue::new(&mut c.scale_denominator).range(1.0..=100_000.0).speed(5.0))
                .labelled_by(lab)
                .on_hover_text("The true vertical scale of every column, 1:N");
            ui.end_row();
            ui.label("Horizontal scale");
            ui.horizontal(|ui| {
                let mut auto = c.horizontal_scale_denominator.is_none();
                if ui
                    .checkbox(&mut auto, "fit")
                    .on_hover_text("Pick a round scale that fits the paper")
                    .changed()
                {
                    c.horizontal_scale_denominator = if auto { None } else { Some(25_000.0) };
                }
                if let Some(h) = c.horizontal_scale_denominator.as_mut() {
                    let lab = ui.label("1 :").id;
                    ui.add(egui::DragValue::new(h).range(10.0..=1e8).speed(100.0))
                        .labelled_by(lab)
                        .on_hover_text("Scale of the gaps between columns, 1:N of the distance");
                }
            });
            ui.end_row();
            let lab = ui.label("Paper").id;
            ui.horizontal(|ui| {
                egui::ComboBox::from_id_salt("panel_paper")
                    .selected_text(c.paper.name())
                    .show_ui(ui, |ui| {
                        for p in [Paper::A4, Paper::A3, Paper::Letter, Paper::TallSingle] {
                            ui.selectable_value(&mut c.paper, p, p.name());
                        }
                    })
                    .response
                    .labelled_by(lab);
                ui.checkbox(&mut c.landscape, "Landscape").on_hover_text("Turn the page sideways");
            });
            ui.end_row();
            let lab = ui.label("Title").id;
            ui.text_edit_singleline(&mut c.title)
                .labelled_by(lab)
                .on_hover_text("Printed at the top (empty: Correlation panel)");
            ui.end_row();
            let lab = ui.label("Date printed").id;
            ui.add(egui::TextEdit::singleline(&mut c.printed_on).hint_text("e.g. 2026-12-01"))
                .labelled_by(lab)
                .on_hover_text("Printed in the header; empty prints none");
            ui.end_row();
        });
        ui.horizontal(|ui| {
            let layout = cache.layout.as_ref().ok();
            for (label, kind, tip) in [
                ("Export panel PDF…", SaveKind::Pdf, "Write the panel as a one-page PDF, as drawn here"),
                ("Export panel SVG…", SaveKind::Svg, "Write the panel as an SVG drawing, as drawn here"),
            ] {
                let clicked =
                    ui.add_enabled(layout.is_some(), egui::Button::new(label)).on_hover_text(tip).clicked();
                let purpose = PickFor::View(if kind == SaveKind::Pdf { "panel-pdf" } else { "panel-svg" });
                if let Some(path) = v.dialogs.save_path(clicked, purpose, kind, "correlation-panel") {
                    match layout {
                        Some(l) => match export_panel(&path, l, &c.title, v.now_secs) {
                            Ok(written) => out.status = Some(written.to_string()),
                            Err(e) => out.error = Some(("Could not export the panel".into(), e.to_string())),
                        },
                        None => {
                            out.error = Some((
                                "Could not export the panel".into(),
                                "the panel has nothing to draw yet".into(),
                            ))
                        }
                    }
                }
            }
        });
        ui.horizontal(|ui| {
            if ui.button("Fit").on_hover_text("Show the whole page").clicked() {
                self.fit_pending = true;
            }
            if ui.button("+").on_hover_text("Zoom in (also Ctrl+wheel)").clicked() {
                self.zoom *= 1.25;
            }
            if ui.button("−").on_hover_text("Zoom out (also Ctrl+wheel)").clicked() {
                self.zoom /= 1.25;
            }
        });
        ui.separator();
        let layout = match &cache.layout {
            Ok(l) => l,
            Err(e) => {
                ui.colored_label(theme::WARN, e.to_string());
                return;
            }
        };
        for n in &layout.notes {
            ui.label(egui::RichText::new(n).small().color(theme::WARN));
        }
        // The page's own words for the horizontal scale, so the two never disagree.
        let (said, flagged) = layout.horizontal.statement(layout.columns.len().saturating_sub(1));
        let said = capitalised(&said);
        if flagged {
            ui.colored_label(theme::WARN, said);
        } else {
            ui.label(said);
        }
        ui.add_space(4.0);
        ui.label(egui::RichText::new("Sections (left to right)").strong());
        let section_of = |k: usize| v.project.sections.get(k);
        let height = |k: usize, h: f64| match section_of(k) {
            Some(s) => height_text(s, h),
            None => format!("{h:.2} m"),
        };
        let rows: Vec<Vec<String>> = layout
            .columns
            .iter()
            .map(|col| {
                vec![
                    col.name.clone(),
                    format!("{:.0} m", col.distance_m),
                    col.datum_height_m
                        .map(|h| height(col.section_index, h))
                        .unwrap_or_else(|| "none (base)".into()),
                    fmt_percent(col.channel_proportion),
                ]
            })
            .collect();
        text_table(ui, "panel_sections", &["section", "along panel", "datum at", "channel bodies"], &rows);
        ui.add_space(4.0);
        ui.label(egui::RichText::new("Channel bodies per interval").strong());
        let rows: Vec<Vec<String>> = layout
            .columns
            .iter()
            .flat_map(|col| {
                let unit = section_of(col.section_index).map(plot_unit).unwrap_or(LengthUnit::Metre);
                v.interps.get(col.section_index).into_iter().flat_map(move |it| {
                    it.interval_proportions.iter().map(move |iv| {
                        vec![
                            col.name.clone(),
                            format!(
                                "{:.2}\u{2013}{:.2} {}",
                                unit.from_metres(iv.base_m),
                                unit.from_metres(iv.top_m),
                                unit.name()
                            ),
                            fmt_percent(iv.proportion),
                        ]
                    })
                })
            })
            .collect();
        text_table(ui, "panel_intervals", &["section", "interval", "channel bodies"], &rows);
        ui.add_space(4.0);
        ui.label(
            egui::RichText::new(capitalised(&counted(layout.ties.len(), "tie line", "tie lines"))).strong(),
        );
        for t in &layout.ties {
            let end = |k: usize, h: f64| match layout.columns.get(k) {
                Some(c) => format!("{} at {}", c.name, height(c.section_index, h)),
                None => String::new(),
            };
            let kind = if t.linked {
                "correlation label"
            } else if t.accepted {
                "accepted boundaries"
            } else {
                "same surface name"
            };
            ui.label(format!(
                "{} ({kind}): {} \u{2013} {}",
                t.name,
                end(t.left, t.left_height_m),
                end(t.right, t.right_height_m)
            ));
        }
        ui.add_space(6.0);
        caution(ui);
    }

    fn canvas(&mut self, ui: &mut egui::Ui) {
        let size = ui.available_size().max(egui::vec2(200.0, 200.0));
        let (rect, resp) = ui.allocate_exact_size(size, egui::Sense::click_and_drag());
        let p = ui.painter_at(rect);
        p.rect_filled(rect, 0.0, theme::CANVAS_BG);
        let Some(cache) = self.cache.as_mut() else { return };
        let Ok(layout) = &cache.layout else { return };
        let page = &layout.page;
        if self.fit_pending && page.width_mm > 0.0 && page.height_mm > 0.0 {
            self.zoom = fit_zoom(rect.size(), page.width_mm, page.height_mm);
            self.pan =
                (rect.size() - egui::vec2(page.width_mm as f32, page.height_mm as f32) * self.zoom) / 2.0;
            self.fit_pending = false;
        }
        if resp.dragged() {
            self.pan += resp.drag_delta();
        }
        if resp.hovered() {
            let (scroll, zoom_delta, pointer) =
                ui.input(|i| (i.smooth_scroll_delta, i.zoom_delta(), i.pointer.hover_pos()));
            if zoom_delta != 1.0 {
                // Zoom about the pointer: the page point under it stays put.
                let at = pointer.unwrap_or(rect.center()) - rect.min;
                let new_zoom = (self.zoom * zoom_delta).clamp(0.05, 40.0);
                self.pan = at - (at - self.pan) * (new_zoom / self.zoom);
                self.zoom = new_zoom;
            } else {
                self.pan += scroll;
            }
        }
        let t = MmToScreen { origin: rect.min + self.pan, zoom: self.zoom };
        let page_rect = egui::Rect::from_min_max(t.pos(0.0, 0.0), t.pos(page.width_mm, page.height_mm));
        p.rect_filled(page_rect, 0.0, egui::Color32::WHITE);
        p.rect_stroke(page_rect, 0.0, egui::Stroke::new(1.0, theme::RULE_LINE), egui::StrokeKind::Outside);
        let which = cache.index.visible(t.y_mm(rect.top()), t.y_mm(rect.bottom()));
        let mut shapes = Vec::with_capacity(which.len());
        painter::shapes(&page.items, &which, &t, &mut shapes);
        p.extend(shapes);
        painter::texts(&page.items, &which, &t, &p);
        self.last_drawn_items = which.len();
    }
}

/// Screen points per mm that show a whole page in a view, with a small border.
pub fn fit_zoom(view: egui::Vec2, page_w_mm: f64, page_h_mm: f64) -> f32 {
    0.96 * (view.x / page_w_mm as f32).min(view.y / page_h_mm as f32)
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{
        Bed, BedId, Lithology, ReviewDecision, ReviewState, Section, Surface, SurfaceKind,
    };

    fn section(name: &str, surfaces: &[Option<&str>]) -> Section {
        let mut s = Section::new(name);
        for (k, n) in surfaces.iter().enumerate() {
            let mut b = Bed::new(BedId(k as u64 + 1), 1.0, Lithology::Mudstone, None);
            b.base_surface = n.map(|n| Surface { name: n.into(), kind: SurfaceKind::Incision });
            s.beds.push(b);
        }
        s
    }

    #[test]
    fn datum_choices_list_base_then_each_name_once() {
        let a = section("A", &[None, Some("SB-1"), Some("T")]);
        let mut b = section("B", &[None, Some("SB-1")]);
        b.review.push(ReviewDecision {
            bed: BedId(1),
            state: ReviewState::Accepted,
            note: String::new(),
            link: None,
        });
        b.review.push(ReviewDecision {
            bed: BedId(2),
            state: ReviewState::Accepted,
            note: String::new(),
            link: None,
        });
        let c = datum_choices(&Project::new(vec![a, b]));
        let labels: Vec<&str> = c.iter().map(|d| d.label.as_str()).collect();
        assert_eq!(
            labels,
            [
                "Section base",
                "SB-1 (2 sections, accepted boundary)",
                "T (1 section)",
                "accepted boundary, B at 0.00 m",
            ]
        );
        assert_eq!(c[0].datum, Datum::Base);
        assert_eq!(c[3].datum, Datum::Named("accepted:B@0.00".into()));
    }

    #[test]
    fn datum_choices_offer_correlation_labels_once() {
        let mut a = section("A", &[None, None, Some("SB-1")]);
        let mut b = section("B", &[None, None]);
        for s in [&mut a, &mut b] {
            let mut d = ReviewDecision::new(BedId(2), ReviewState::Accepted, "");
            d.link = Some("K-1".into());
            s.review.push(d);
        }
        // A label that is also a surface name is offered once, by the name.
        let mut d = ReviewDecision::new(BedId(3), ReviewState::Accepted, "");
        d.link = Some("SB-1".into());
        a.review.push(d);
        let project = Project::new(vec![a, b]);
        let labels: Vec<String> = datum_choices(&project).into_iter().map(|d| d.label).collect();
        assert_eq!(
            labels,
            ["Section base", "SB-1 (1 section, accepted boundary)", "K-1 (correlation label, 2 sections)"]
        );
        assert_eq!(crate::gui::review::link_labels(&project), ["K-1", "SB-1"]);
    }

    #[test]
    fn choices_map_onto_the_panel_options_as_the_command_line_does() {
        let c = PanelChoices {
            datum: Datum::Named("SB-1".into()),
            scale_denominator: 200.0,
            horizontal_scale_denominator: Some(25_000.0),
            paper: Paper::A4,
            landscape: false,
            title: "T".into(),
            printed_on: " 2026-12-01 ".into(),
        };
        let o = c.options();
        // As `aggrade panel --datum SB-1 --scale 200 --hscale 25000 --paper a4 --title T` builds them.
        assert_eq!(o.datum, Datum::Named("SB-1".into()));
        assert_eq!(o.layout.scale_denominator, 200.0);
        assert_eq!(o.layout.paper, Paper::A4);
        assert_eq!(o.layout.orientation, Orientation::Portrait);
        assert_eq!(o.horizontal_scale_denominator, Some(25_000.0));
        assert_eq!(o.title, "T");
        assert_eq!(o.min_gap_mm, PanelOptions::default().min_gap_mm);
        assert_eq!(o.layout.margin_mm, LayoutOptions::default().margin_mm);
        assert_eq!(c.meta("x.aggrade").printed_on, "2026-12-01");
        assert_eq!(PanelChoices::default().options().layout.orientation, Orientation::Landscape);
    }

    #[test]
    fn fit_shows_the_whole_page() {
        // A 297 × 420 mm page in an 800 × 600 view: height limits, 600/420 × 0.96 (computed).
        let z = fit_zoom(egui::vec2(800.0, 600.0), 297.0, 420.0);
        assert!((z - 0.96 * 600.0 / 420.0).abs() < 1e-5);
        assert!(297.0 * z <= 800.0 && 420.0 * z <= 600.0);
    }
}
