//! The column explains itself: track headers that stay at the top of the canvas (each saying
//! what its track shows when pointed at), the legend beside the column (the printed legend's
//! entries and samples), and hover help for whatever mark the pointer rests on.

use super::engine::Strip;
use super::painter::{self, MmToScreen};
use super::theme;
use aggrade_core::layout::{
    column_help_at, column_legend, draw_swatch, Item, LayoutOptions, LegendEntry, Pointed, RectMm, Track,
    TrackKind, Tracks,
};
use aggrade_core::model::{LengthUnit, Section, WentworthClass};
use aggrade_core::rules::Interpretation;
use egui::{Align2, FontId, Pos2, Rect, Sense, Stroke, Vec2};

/// Height of the header band above the column (track titles and the grain-size classes), points.
pub const HEADER_H: f32 = 92.0;
/// Height of the grain-size row at the foot of the header, points.
const GRAIN_ROW_H: f32 = 18.0;
/// Width of the legend beside the column, points (less in a narrow window).
const LEGEND_W: f32 = 300.0;
/// Size of a legend sample, points (the printed one is 8 × 3.4 mm).
const SWATCH: Vec2 = Vec2::new(36.0, 15.3);
/// Where the window remembers, for the session, whether the legend is shown.
const LEGEND_SHOWN: &str = "aggrade-column-legend-shown";
/// The key that shows or hides the legend when no text field has the focus.
pub const LEGEND_KEY: egui::Key = egui::Key::L;

/// Is the legend shown (the choice is kept for the session, across files)?
pub fn legend_shown(ctx: &egui::Context) -> bool {
    ctx.data(|d| d.get_temp::<bool>(egui::Id::unique(LEGEND_SHOWN))).unwrap_or(false)
}

/// Show or hide the legend.
pub fn set_legend_shown(ctx: &egui::Context, shown: bool) {
    ctx.data_mut(|d| d.insert_temp(egui::Id::unique(LEGEND_SHOWN), shown));
}

/// The canvas's area split into the column's part and the legend's (when shown).
pub fn split_for_legend(ctx: &egui::Context, area: Rect) -> (Rect, Option<Rect>) {
    if !legend_shown(ctx) {
        return (area, None);
    }
    let w = LEGEND_W.min(area.width() * 0.45);
    let legend = Rect::from_min_max(Pos2::new(area.right() - w, area.top()), area.max);
    (Rect::from_min_max(area.min, Pos2::new(legend.left(), area.bottom())), Some(legend))
}

/// The words of a track's header: the height axis names its unit, a curve its mnemonic.
fn header_lines(kind: TrackKind, section: &Section) -> Vec<String> {
    match kind {
        TrackKind::Axis => {
            let unit = if section.display_unit == LengthUnit::Foot { "ft" } else { "m" };
            vec![format!("height ({unit})")]
        }
        TrackKind::Curve(k) => match section.curves.get(k) {
            Some(c) if c.unit.is_empty() => vec![c.mnemonic.clone()],
            Some(c) => vec![format!("{} ({})", c.mnemonic, c.unit)],
            None => vec!["curve".into()],
        },
        _ => kind.title_lines().iter().map(|s| s.to_string()).collect(),
    }
}

/// What the header of a track says when pointed at.
fn header_help(kind: TrackKind, section: &Section) -> String {
    match kind {
        TrackKind::Curve(k) => match section.curves.get(k) {
            Some(c) if !c.description.is_empty() => format!("{} {}", c.description, kind.help()),
            _ => kind.help().to_string(),
        },
        _ => kind.help().to_string(),
    }
}

/// The header band at the top of the canvas: it stays put when the column scrolls up or down,
/// and its cells follow the tracks left and right (a label keeps to the part of its cell in
/// view). `corner` is the part above the height ruler; `t` places the strip on screen.
pub fn draw_header(
    ui: &mut egui::Ui,
    header: Rect,
    corner: Rect,
    tracks: &Tracks,
    section: &Section,
    strip: &Strip,
    t: &MmToScreen,
) {
    let painter = ui.painter_at(header);
    painter.rect_filled(header, 0.0, theme::PANEL_BG);
    painter.line_segment([header.left_bottom(), header.right_bottom()], Stroke::new(1.0, theme::RULE_LINE));
    let cells_area = Rect::from_min_max(Pos2::new(corner.right(), header.top()), header.max);
    let cells = ui.painter_at(cells_area);
    let title_bottom = header.bottom() - GRAIN_ROW_H;
    for (k, (kind, track)) in tracks.in_order().into_iter().enumerate() {
        let cell = cell_rect(track, header, t);
        let visible = cell.intersect(cells_area);
        if visible.width() < 1.0 {
            continue;
        }
        cells.line_segment(
            [Pos2::new(cell.right(), header.top() + 4.0), Pos2::new(cell.right(), header.bottom() - 2.0)],
            Stroke::new(1.0, theme::RULE_LINE),
        );
        let lines = header_lines(kind, section);
        let band = Rect::from_min_max(
            Pos2::new(visible.left(), header.top()),
            Pos2::new(visible.right(), title_bottom),
        );
        draw_cell_title(&ui.painter_at(visible), band, &lines);
        let title = lines.join(" ");
        let response = ui.interact(visible, ui.scope_id().with(("column-track-header", k)), Sense::hover());
        response.widget_info(|| egui::WidgetInfo::labeled(egui::Role::Label, true, &title));
        response.on_hover_text(header_help(kind, section));
    }
    // The grain-size classes under the lithology track.
    let font = FontId::proportional(10.0);
    let mut last_x = f32::NEG_INFINITY;
    for c in WentworthClass::ALL {
        let x = t.pos(strip.grain_scale.class_centre_x_mm(c), 0.0).x;
        if x < cells_area.left() || x > cells_area.right() {
            continue;
        }
        cells.line_segment(
            [Pos2::new(x, header.bottom() - 4.0), Pos2::new(x, header.bottom())],
            Stroke::new(1.0, theme::TEXT_DIM),
        );
        if x - last_x > 16.0 && x < header.right() - 6.0 {
            cells.text(
                Pos2::new(x, header.bottom() - 4.0),
                Align2::CENTER_BOTTOM,
                c.short_label(),
                font.clone(),
                theme::TEXT_DIM,
            );
            last_x = x;
        }
    }
    // The corner above the ruler: the legend's toggle, and what the class letters are.
    let corner_painter = ui.painter_at(corner);
    corner_painter.rect_filled(corner, 0.0, theme::PANEL_BG);
    corner_painter.text(
        Pos2::new(corner.right() - 4.0, header.bottom() - 4.0),
        Align2::RIGHT_BOTTOM,
        "grain",
        FontId::proportional(10.0),
        theme::TEXT_DIM,
    );
    let shown = legend_shown(ui.ctx());
    let button = Rect::from_min_size(corner.min + Vec2::new(2.0, 6.0), Vec2::new(corner.width() - 4.0, 22.0));
    let response = ui
        .scope(|ui| {
            ui.spacing_mut().button_padding = Vec2::new(3.0, 2.0);
            let label = egui::RichText::new("Legend").size(11.0);
            ui.put(button, egui::Button::new(label).selected(shown))
        })
        .inner
        .on_hover_text(format!(
            "{} the legend beside the column: every pattern, symbol and line it draws (key: {})",
            if shown { "Hide" } else { "Show" },
            LEGEND_KEY.name()
        ));
    if response.clicked() {
        set_legend_shown(ui.ctx(), !shown);
    }
}

/// A track's cell in the header (its x range on screen, the header's height).
fn cell_rect(track: Track, header: Rect, t: &MmToScreen) -> Rect {
    let (a, b) = (t.pos(track.x_mm, 0.0).x, t.pos(track.x_mm + track.w_mm, 0.0).x);
    Rect::from_min_max(Pos2::new(a, header.top()), Pos2::new(b, header.bottom()))
}

/// A cell's title: on lines across the part in view when they fit, else turned to read upward.
fn draw_cell_title(painter: &egui::Painter, band: Rect, lines: &[String]) {
    let font = FontId::proportional(10.5);
    let colour = theme::TEXT;
    let widths: Vec<f32> =
        lines.iter().map(|l| painter.layout_no_wrap(l.clone(), font.clone(), colour).size().x).collect();
    let line_h = 12.5;
    if widths.iter().all(|w| *w <= band.width() - 4.0) {
        let n = lines.len() as f32;
        for (k, (l, w)) in lines.iter().zip(&widths).enumerate() {
            let y = band.bottom() - 4.0 - (n - 1.0 - k as f32) * line_h;
            let x = band.center().x.clamp(band.left() + w / 2.0 + 2.0, band.right() - w / 2.0 - 2.0);
            painter.text(Pos2::new(x, y), Align2::CENTER_BOTTOM, l, font.clone(), colour);
        }
        return;
    }
    // Turned to read upward, one line beside the other, as large as the cell allows.
    let room = band.height() - 8.0;
    let n = lines.len() as f32;
    let longest = widths.iter().copied().fold(1.0_f32, f32::max);
    let mut size = 10.5_f32.min(10.5 * room / longest).min(band.width() / (n * 1.2));
    let mut lines = lines.to_vec();
    if size < 7.0 && lines.len() > 1 {
        // Too narrow for lines side by side: one line, turned.
        let joined = lines.join(" ");
        let w = painter.layout_no_wrap(joined.clone(), font.clone(), colour).size().x;
        size = 10.5_f32.min(10.5 * room / w).min(band.width() - 1.0);
        lines = vec![joined];
    }
    if size < 6.0 {
        return;
    }
    let galleys: Vec<_> =
        lines.into_iter().map(|l| painter.layout_no_wrap(l, FontId::proportional(size), colour)).collect();
    let total_h: f32 = galleys.iter().map(|g| g.size().y).sum();
    // Turned a quarter counter-clockwise, a galley's top-left corner goes to its lower left.
    let mut x = band.center().x - total_h / 2.0;
    for g in galleys {
        let h = g.size().y;
        let shape = egui::epaint::TextShape::new(Pos2::new(x, band.bottom() - 4.0), g, colour)
            .with_angle(-std::f32::consts::FRAC_PI_2);
        painter.add(shape);
        x += h;
    }
}

/// Hover help for the point `p` of the canvas, if something is there to explain.
pub fn help_at_pointer(
    section: &Section,
    interp: &Interpretation,
    layout: &LayoutOptions,
    strip: &Strip,
    t: &MmToScreen,
    p: Pos2,
) -> Option<String> {
    let points_per_m = t.zoom as f64 * strip.heights.mm_per_m();
    if points_per_m <= 0.0 {
        return None;
    }
    let pointed = Pointed {
        x_mm: t.x_mm(p.x),
        height_m: strip.heights.height_m(t.y_mm(p.y)),
        // About four points either side of a line.
        tolerance_m: 4.0 / points_per_m,
    };
    column_help_at(section, interp, layout, pointed)
}

/// The legend beside the column, in `rect`: the entries the printed legend would list for this
/// column, each with the printed sample and words.
pub fn legend_panel(
    ui: &mut egui::Ui,
    rect: Rect,
    section: &Section,
    interp: &Interpretation,
    layout: &LayoutOptions,
) {
    let entries = column_legend(section, interp, layout);
    ui.painter().rect_filled(rect, 0.0, theme::PANEL_BG);
    ui.painter().line_segment([rect.left_top(), rect.left_bottom()], Stroke::new(1.0, theme::RULE_LINE));
    let inner = rect.shrink2(Vec2::new(10.0, 8.0));
    let mut child = ui
        .new_child(egui::UiBuilder::new().max_rect(inner).layout(egui::Layout::top_down(egui::Align::LEFT)));
    let ui = &mut child;
    ui.horizontal(|ui| {
        ui.strong("Legend");
        ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
            if ui
                .small_button("Hide")
                .on_hover_text(format!("Hide the legend (key: {})", LEGEND_KEY.name()))
                .clicked()
            {
                set_legend_shown(ui.ctx(), false);
            }
        });
    });
    ui.label(
        egui::RichText::new("What this column draws. Interpretations are candidates for your review.")
            .small()
            .color(theme::TEXT_DIM),
    );
    ui.add_space(4.0);
    egui::ScrollArea::vertical().id_salt("column-legend").auto_shrink([false, false]).show(ui, |ui| {
        if entries.is_empty() {
            ui.label("Nothing drawn yet.");
        }
        for e in &entries {
            ui.horizontal_top(|ui| {
                let (r, _) = ui.allocate_exact_size(SWATCH, Sense::hover());
                paint_swatch(ui.painter(), *e, r);
                // Long words wrap within the legend rather than run out of it.
                ui.add(egui::Label::new(e.label()).wrap());
            });
        }
    });
}

/// The printed sample of a legend entry, drawn in `r` on screen.
pub fn paint_swatch(painter: &egui::Painter, e: LegendEntry, r: Rect) {
    let mut items: Vec<Item> = Vec::new();
    draw_swatch(e, RectMm { x: 0.0, y: 0.0, w: 8.0, h: 3.4 }, &mut items);
    let t = MmToScreen { origin: r.min, zoom: r.width() / 8.0 };
    let which: Vec<u32> = (0..items.len() as u32).collect();
    let mut shapes = Vec::new();
    painter::shapes(&items, &which, &t, &mut shapes);
    painter.with_clip_rect(r.expand(2.0)).extend(shapes);
    painter::texts(&items, &which, &t, painter);
}
