//! The window's own look: a calm light palette with one teal accent.

use egui::Color32;

pub const ACCENT: Color32 = Color32::from_rgb(22, 120, 128);
/// The accent at about 16 % opacity (premultiplied).
pub const SELECT_FILL: Color32 = Color32::from_rgba_premultiplied(3, 19, 20, 40);
pub const CANVAS_BG: Color32 = Color32::from_rgb(226, 229, 231);
pub const PANEL_BG: Color32 = Color32::from_rgb(246, 246, 244);
pub const RULE_LINE: Color32 = Color32::from_rgb(200, 203, 206);
pub const TEXT: Color32 = Color32::from_rgb(40, 44, 48);
pub const TEXT_DIM: Color32 = Color32::from_rgb(110, 116, 122);
pub const WARN: Color32 = Color32::from_rgb(160, 82, 20);
pub const ACCEPTED: Color32 = Color32::from_rgb(40, 130, 70);
pub const REJECTED: Color32 = Color32::from_rgb(150, 150, 150);
/// Badges of the strength classes of candidate boundaries: one hue, darker for stronger.
pub const STRONG: Color32 = Color32::from_rgb(28, 66, 130);
pub const MODERATE: Color32 = Color32::from_rgb(84, 116, 176);
pub const WEAK: Color32 = Color32::from_rgb(122, 132, 152);

/// DejaVu Sans (free licence, shipped in `assets/fonts`): covers φ, →, −, ° and the like, and
/// matches the printed column's lettering.
static DEJAVU: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");

/// Apply fonts, palette and spacing to a context (fonts take effect from the next pass).
pub fn apply(ctx: &egui::Context) {
    let mut fonts = egui::FontDefinitions::default();
    fonts.font_data.insert("dejavu".into(), std::sync::Arc::new(egui::FontData::from_static(DEJAVU)));
    if let Some(f) = fonts.families.get_mut(&egui::FontFamily::Proportional) {
        f.insert(0, "dejavu".into());
    }
    if let Some(f) = fonts.families.get_mut(&egui::FontFamily::Monospace) {
        f.push("dejavu".into());
    }
    ctx.set_fonts(fonts);
    ctx.set_theme(egui::Theme::Light);
    ctx.all_styles_mut(|s| {
        s.spacing.item_spacing = egui::vec2(7.0, 5.0);
        s.spacing.button_padding = egui::vec2(7.0, 3.0);
        s.visuals.selection.bg_fill = ACCENT;
        s.visuals.selection.stroke = egui::Stroke::new(1.0, Color32::WHITE);
        s.visuals.hyperlink_color = ACCENT;
        s.visuals.panel_fill = PANEL_BG;
        s.visuals.window_corner_radius = egui::CornerRadius::same(6);
    });
}
