//! The inspector: every field of the selected bed, edited on a copy that is sent as one edit.

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::table::{grain_from_prefix, show_length};
use super::theme;
use aggrade_core::model::{
    BaseRank, Contact, Lithology, PaleosolDevelopment, PaleosolFeature, Structure, Surface, SurfaceKind,
};

/// Text buffers for fields typed as text (so half-typed values are not lost).
#[derive(Debug, Default)]
pub struct Inspector {
    for_bed: Option<(u64, u64)>,
    grain_base: String,
    grain_top: String,
    paleocurrents: String,
    samples: String,
    problem: Option<String>,
}

/// A labelled drop-down (the label is tied to it for screen readers and tests).
fn combo<T: Copy + PartialEq>(
    ui: &mut egui::Ui,
    label: egui::Id,
    id: &str,
    value: &mut T,
    all: &[T],
    name: impl Fn(T) -> &'static str,
    tip: &str,
) -> bool {
    let mut changed = false;
    egui::ComboBox::from_id_salt(id)
        .selected_text(name(*value))
        .width(170.0)
        .show_ui(ui, |ui| {
            for v in all {
                changed |= ui.selectable_value(value, *v, name(*v)).changed();
            }
        })
        .response
        .labelled_by(label)
        .on_hover_text(tip);
    changed
}

impl Inspector {
    /// Draw the inspector for the selected bed.
    pub fn ui(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let Some(orig) = doc.selected().cloned() else {
            ui.add_space(12.0);
            ui.label(
                egui::RichText::new("Select a bed in the column or the table to see its fields.")
                    .color(theme::TEXT_DIM),
            );
            return;
        };
        // Refill the text buffers when another bed is selected or the bed changed elsewhere.
        let key = (orig.id.0, doc.revision);
        if self.for_bed.map(|k| k.0) != Some(orig.id.0)
            || (self.for_bed != Some(key) && !ui.memory(|m| m.focused().is_some()))
        {
            self.grain_base = orig.grain_base.map(|g| g.to_string()).unwrap_or_default();
            self.grain_top = orig.grain_top.map(|g| g.to_string()).unwrap_or_default();
            self.paleocurrents =
                orig.paleocurrents_deg.iter().map(|a| format!("{a}")).collect::<Vec<_>>().join("; ");
            self.samples = orig.samples.join("; ");
            self.problem = None;
        }
        self.for_bed = Some(key);
        let unit = doc.section().display_unit;
        let index = doc.bed_index(orig.id).unwrap_or(0);
        let base_h = doc.section().base_heights_m().get(index).copied().unwrap_or(0.0);
        let mut bed = orig.clone();
        let mut text_field: Option<&'static str> = None;

        ui.horizontal(|ui| {
            ui.heading(format!("Bed {}", index + 1));
            ui.label(
                egui::RichText::new(format!(
                    "{} – {} {}",
                    show_length(base_h, unit),
                    show_length(base_h + orig.thickness_m, unit),
                    unit.name()
                ))
                .color(theme::TEXT_DIM),
            );
        });
        egui::ScrollArea::vertical().id_salt("inspector_scroll").show(ui, |ui| {
            egui::Grid::new("bed_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
                let lab = ui.label("Thickness").id;
                let mut t = unit.from_metres(bed.thickness_m);
                let r = ui
                    .add(egui::DragValue::new(&mut t).speed(0.01).range(0.001..=f64::MAX).clamp_existing_to_range(false).suffix(format!(" {}", unit.name())))
                    .labelled_by(lab)
                    .on_hover_text("Bed thickness; drag or click to type");
                if r.changed() {
                    bed.thickness_m = unit.to_metres(t);
                    text_field = Some("thickness");
                }
                ui.end_row();

                let label = ui.label("Lithology").id;
                combo(ui, label, "lith", &mut bed.lithology, &Lithology::ALL, |l| l.name(), "Rock type of the bed");
                ui.end_row();

                for (label, buf, is_top) in [("Grain at base", 0, false), ("Grain at top", 1, true)] {
                    ui.label(label);
                    let text = if buf == 0 { &mut self.grain_base } else { &mut self.grain_top };
                    let r = ui
                        .add(egui::TextEdit::singleline(text).desired_width(170.0).hint_text("e.g. m, fine sand, 0.3mm"))
                        .on_hover_text("Wentworth class (or first letters), or a measured size in mm or phi; empty for none");
                    if r.changed() {
                        let parsed = if text.trim().is_empty() { Some(None) } else { grain_from_prefix(text).map(Some) };
                        match parsed {
                            Some(g) => {
                                if is_top {
                                    bed.grain_top = g;
                                } else {
                                    bed.grain_base = g;
                                }
                                self.problem = None;
                                text_field = Some(if is_top { "grain_top" } else { "grain_base" });
                            }
                            None => self.problem = Some(format!("{text:?} is not a grain size")),
                        }
                    }
                    ui.end_row();
                }

                let label = ui.label("Basal contact").id;
                combo(ui, label, "contact", &mut bed.base_contact, Contact::ALL, |c| c.name(), "Nature of the bed's base");
                ui.end_row();

                let label = ui.label("Base rank").id;
                let ranks = [None, Some(BaseRank::StoreySurface), Some(BaseRank::BodyBase), Some(BaseRank::WithinStorey)];
                combo(ui, label, "base_rank", &mut bed.base_rank, &ranks, |r| r.map_or("rules decide", BaseRank::name), "Your rank for this base: a storey surface or a channel-body base starts a new storey (and body); within storey makes it a scour. Overrides the rules");
                ui.end_row();

                let lab = ui.label("Erosional relief").id;
                let mut has = bed.base_relief_m.is_some();
                ui.horizontal(|ui| {
                    if ui.checkbox(&mut has, "").labelled_by(lab).on_hover_text("Relief measured at the base").changed() {
                        bed.base_relief_m = has.then_some(0.1);
                    }
                    if let Some(r) = bed.base_relief_m.as_mut() {
                        let mut v = unit.from_metres(*r);
                        if ui.add(egui::DragValue::new(&mut v).speed(0.01).range(0.0..=f64::MAX).clamp_existing_to_range(false).suffix(format!(" {}", unit.name()))).labelled_by(lab).changed() {
                            *r = unit.to_metres(v);
                            text_field = Some("relief");
                        }
                    }
                });
                ui.end_row();

                let label = ui.label("Paleosol").id;
                combo(ui, label, "paleosol", &mut bed.paleosol, PaleosolDevelopment::ALL, |p| p.name(), "Degree of paleosol development");
                ui.end_row();

                let lab = ui.label("Carbonate stage").id;
                ui.horizontal(|ui| {
                    let mut has = bed.carbonate_stage.is_some();
                    if ui.checkbox(&mut has, "").labelled_by(lab).on_hover_text("Carbonate morphological stage I–VI").changed() {
                        bed.carbonate_stage = has.then_some(1);
                    }
                    if let Some(s) = bed.carbonate_stage.as_mut() {
                        ui.add(egui::Slider::new(s, 1..=6).custom_formatter(|v, _| roman(v as u8).to_string()))
                            .labelled_by(lab)
                            .on_hover_text("Carbonate morphological stage, I to VI");
                    }
                });
                ui.end_row();

                ui.label("Colour");
                if ui.add(egui::TextEdit::singleline(&mut bed.colour).desired_width(170.0)).on_hover_text("Colour as logged (e.g. 10YR 6/4, pale red)").changed() {
                    text_field = Some("colour");
                }
                ui.end_row();

                ui.label("Paleocurrents (°)");
                let r = ui
                    .add(egui::TextEdit::singleline(&mut self.paleocurrents).desired_width(170.0).hint_text("e.g. 120; 135; 140"))
                    .on_hover_text("Azimuths 0–360°, separated by ; or spaces");
                if r.changed() {
                    match parse_azimuths(&self.paleocurrents) {
                        Ok(v) => {
                            bed.paleocurrents_deg = v;
                            self.problem = None;
                            text_field = Some("paleocurrents");
                        }
                        Err(e) => self.problem = Some(e),
                    }
                }
                ui.end_row();

                ui.label("Fossils");
                if ui.add(egui::TextEdit::singleline(&mut bed.fossils).desired_width(170.0)).on_hover_text("Body and trace fossils").changed() {
                    text_field = Some("fossils");
                }
                ui.end_row();

                ui.label("Samples");
                if ui.add(egui::TextEdit::singleline(&mut self.samples).desired_width(170.0)).on_hover_text("Sample numbers, separated by ;").changed() {
                    bed.samples = self.samples.split(';').map(|s| s.trim().to_string()).filter(|s| !s.is_empty()).collect();
                    text_field = Some("samples");
                }
                ui.end_row();
            });

            if let Some(p) = &self.problem {
                ui.colored_label(theme::WARN, p);
            }

            ui.add_space(4.0);
            egui::CollapsingHeader::new("Structures").default_open(true).show(ui, |ui| {
                ui.horizontal_wrapped(|ui| {
                    for s in Structure::ALL {
                        let mut on = bed.structures.contains(s);
                        if ui.toggle_value(&mut on, s.name()).on_hover_text(format!("Seen in this bed: {}", s.name())).changed() {
                            if on {
                                bed.structures.push(*s);
                                bed.structures.sort();
                            } else {
                                bed.structures.retain(|x| x != s);
                            }
                        }
                    }
                });
            });
            egui::CollapsingHeader::new("Paleosol features").default_open(bed.paleosol != PaleosolDevelopment::None).show(ui, |ui| {
                ui.horizontal_wrapped(|ui| {
                    for f in PaleosolFeature::ALL {
                        let mut on = bed.paleosol_features.contains(f);
                        if ui.toggle_value(&mut on, f.name()).on_hover_text("Feature of a fossil soil").changed() {
                            if on {
                                bed.paleosol_features.push(*f);
                                bed.paleosol_features.sort();
                            } else {
                                bed.paleosol_features.retain(|x| x != f);
                            }
                        }
                    }
                });
            });
            egui::CollapsingHeader::new("Surface at base").default_open(bed.base_surface.is_some()).show(ui, |ui| {
                let mut has = bed.base_surface.is_some();
                if ui.checkbox(&mut has, "Named surface at this bed's base").on_hover_text("Mark and name the surface at the bed's base").changed() {
                    bed.base_surface = has.then(|| Surface { name: "S-1".into(), kind: SurfaceKind::Other });
                }
                if let Some(s) = bed.base_surface.as_mut() {
                    ui.horizontal(|ui| {
                        ui.label("Name");
                        if ui.text_edit_singleline(&mut s.name).on_hover_text("The surface's name, e.g. SB-2").changed() {
                            text_field = Some("surface_name");
                        }
                    });
                    ui.horizontal(|ui| {
                        let label = ui.label("Kind").id;
                        combo(ui, label, "surface_kind", &mut s.kind, SurfaceKind::ALL, |k| k.name(), "What kind of surface it is");
                    });
                }
            });
            ui.label("Notes");
            if ui
                .add(egui::TextEdit::multiline(&mut bed.notes).desired_rows(3).desired_width(f32::INFINITY))
                .on_hover_text("Free notes on this bed")
                .changed()
            {
                text_field = Some("notes");
            }
        });

        if bed != orig {
            let edit = if bed.thickness_m != orig.thickness_m && {
                let mut b2 = bed.clone();
                b2.thickness_m = orig.thickness_m;
                b2 == orig
            } {
                Edit::SetThickness { bed: bed.id, thickness_m: bed.thickness_m }
            } else {
                Edit::ReplaceBed { bed: bed.clone() }
            };
            match text_field {
                Some(field) => out.edit_in(edit, gesture_key(("inspector", bed.id.0, field))),
                None => out.edit(edit),
            }
        }
    }
}

fn roman(v: u8) -> &'static str {
    ["?", "I", "II", "III", "IV", "V", "VI"].get(v as usize).copied().unwrap_or("?")
}

/// Azimuths separated by `;`, `,` or spaces, each 0–360°.
pub fn parse_azimuths(text: &str) -> Result<Vec<f64>, String> {
    let mut v = Vec::new();
    for part in text.split([';', ',', ' ']).map(str::trim).filter(|p| !p.is_empty()) {
        match part.parse::<f64>() {
            Ok(a) if (0.0..=360.0).contains(&a) => v.push(a),
            _ => return Err(format!("paleocurrent {part:?} must be an azimuth from 0 to 360°")),
        }
    }
    Ok(v)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn azimuths_are_checked() {
        assert_eq!(parse_azimuths("120; 135,140 0 360"), Ok(vec![120.0, 135.0, 140.0, 0.0, 360.0]));
        assert!(parse_azimuths("400").is_err());
        assert!(parse_azimuths("north").is_err());
        assert_eq!(roman(4), "IV");
    }
}
