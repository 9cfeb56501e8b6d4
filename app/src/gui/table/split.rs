//! Cutting a bed in two from its menu: "Split in two" halves it, "Split at…" cuts it at a height
//! above its base typed in the section's display unit, half the bed unless another height is typed.

use crate::gui::actions::Actions;
use crate::gui::document::{Document, Edit};
use crate::gui::field::problem_label;
use aggrade_core::model::shorthand as sh;
use aggrade_core::model::{BedId, LengthUnit};

/// The bed menu's splits: "Split in two" (halves at once) and "Split at…", which cuts the bed
/// at a height above its base typed in the section's display unit (half its thickness unless another is
/// typed).
pub fn split_menu(ui: &mut egui::Ui, doc: &Document, bed: BedId, out: &mut Actions) {
    let Some(i) = doc.bed_index(bed) else { return };
    let unit = doc.section().display_unit;
    let thickness = doc.section().beds[i].thickness_m;
    if ui.button("Split in two").on_hover_text("Cut this bed into two halves of equal thickness").clicked() {
        out.edit(Edit::SplitBed { bed });
        ui.close();
    }
    ui.menu_button("Split at…", |ui| {
        let key = egui::Id::unique(("aggrade_split_at", doc.selected_section, bed));
        let mut text: String =
            ui.data_mut(|d| d.get_temp(key)).unwrap_or_else(|| sh::length_code(thickness / 2.0, unit));
        ui.label(format!(
            "Height above the bed's base ({}), 0 – {}:",
            unit.name(),
            sh::length_code(thickness, unit)
        ));
        let r = ui.add(
            egui::TextEdit::singleline(&mut text)
                .id(key.with("field"))
                .desired_width(110.0)
                .hint_text(sh::length_code(thickness / 2.0, unit)),
        );
        let r = r.on_hover_text(
            "Where to cut, measured up from the bed's base; half the bed unless you type another height",
        );
        let cut = split_height(&text, thickness, unit);
        if let Err(why) = &cut {
            problem_label(ui, why);
        }
        let enter = r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
        let go = ui
            .add_enabled(cut.is_ok(), egui::Button::new("Split"))
            .on_hover_text("Cut the bed here (Enter)")
            .clicked();
        match (go || enter, cut) {
            (true, Ok(lower_m)) => {
                out.edit(Edit::SplitBedAt { bed, lower_m });
                ui.data_mut(|d| d.remove::<String>(key));
                ui.close();
            }
            _ => {
                ui.data_mut(|d| d.insert_temp(key, text));
            }
        }
    });
}

/// A split height typed in the section's display unit, checked to lie inside the bed; in metres.
pub fn split_height(text: &str, thickness_m: f64, unit: LengthUnit) -> Result<f64, String> {
    match sh::length(text, unit) {
        Ok(h) if h > 0.0 && h < thickness_m => Ok(h),
        _ => Err(format!(
            "split height {:?}: a height above 0 and below the bed's {} {} (e.g. {})",
            text.trim(),
            sh::length_code(thickness_m, unit),
            unit.name(),
            sh::length_code(thickness_m / 2.0, unit)
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_split_height_lies_inside_the_bed() {
        assert_eq!(split_height("0.8", 1.9, LengthUnit::Metre), Ok(0.8));
        assert_eq!(split_height("50cm", 1.9, LengthUnit::Metre), Ok(0.5));
        // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
        assert_eq!(split_height("1", 1.0, LengthUnit::Foot), Ok(0.3048));
        for bad in ["0", "1.9", "2", "-1", "x"] {
            let e = split_height(bad, 1.9, LengthUnit::Metre).expect_err(bad);
            assert!(e.contains("below the bed's 1.9 m") && e.contains("0.95"), "{e}");
        }
    }
}
