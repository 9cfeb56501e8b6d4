//! The inspector's groups below the bed's first fields: paleocurrent readings, facies, colour,
//! samples and photos, fossils and bioturbation, structures, paleosol, the surface at the base
//! and the notes.

use super::record::{self, BIOTURBATION_GRADES, BODY_FOSSILS, TRACE_FOSSILS};
use super::{combo, roman, Form, Row, Typed};
use crate::gui::document::Document;
use crate::gui::field::{problem_label, FieldLook, INVALID};
use crate::gui::theme;
use aggrade_core::io::limits::MAX_STRING_CHARS;
use aggrade_core::model::shorthand;
use aggrade_core::model::{
    Drainage, FaciesCode, Indicator, PaleosolDevelopment, PaleosolFeature, Photo, Sample, SampleKind,
    Structure, Surface, SurfaceKind,
};

/// Width of the inspector's usual field.
const FIELD_W: f32 = 170.0;

/// A small grey line of explanation, wrapped.
fn note(ui: &mut egui::Ui, text: impl Into<String>) {
    ui.add(egui::Label::new(egui::RichText::new(text.into()).small().color(theme::TEXT_DIM)).wrap());
}

impl Form<'_> {
    /// The paleocurrent readings as read from the shorthand, each with its indicator (which may
    /// be changed here) and dip.
    pub(super) fn readings(&mut self, ui: &mut egui::Ui) {
        if self.bed.paleocurrents.is_empty() {
            return;
        }
        egui::CollapsingHeader::new(format!("Paleocurrent readings ({})", self.bed.paleocurrents.len()))
            .id_salt("inspector_readings")
            .default_open(true)
            .show(ui, |ui| {
                egui::Grid::new("readings").num_columns(4).striped(true).spacing([10.0, 2.0]).show(ui, |ui| {
                    for h in ["azimuth", "indicator", "dip", ""] {
                        ui.label(egui::RichText::new(h).small().color(theme::TEXT_DIM));
                    }
                    ui.end_row();
                    for (k, p) in self.bed.paleocurrents.iter_mut().enumerate() {
                        ui.label(format!("{}°", shorthand::trim_number(p.azimuth_deg)));
                        egui::ComboBox::from_id_salt(("reading_indicator", k))
                            .selected_text(p.indicator.name())
                            .width(130.0)
                            .show_ui(ui, |ui| {
                                for i in Indicator::ALL {
                                    ui.selectable_value(&mut p.indicator, *i, i.name());
                                }
                            })
                            .response
                            .on_hover_text("What the reading was measured on");
                        ui.label(p.dip_deg.map(|d| format!("{}°", shorthand::trim_number(d))).unwrap_or("—".into()));
                        if p.indicator == Indicator::AccretionSurface {
                            ui.label(egui::RichText::new("not flow").small().color(theme::TEXT_DIM)).on_hover_text(
                                "An accretion-surface dip runs roughly across the flow: it is kept apart from \
                                 the flow indicators in the statistics (Miall 1974)",
                            );
                        } else {
                            ui.label("");
                        }
                        ui.end_row();
                    }
                });
                note(ui, "Type readings in the field above: 210t is a trough axis plunging 210°, 185p/22 a foreset dipping 22° to 185°.");
            });
    }

    /// The lithofacies code: the geologist's, or the suggested one marked as such with a button
    /// to confirm it.
    pub(super) fn facies(&mut self, ui: &mut egui::Ui) {
        egui::CollapsingHeader::new("Facies").default_open(true).show(ui, |ui| {
            let suggested = record::suggested_facies(&self.bed);
            ui.horizontal(|ui| {
                let lab = ui.label("Facies code").id;
                let shown = match (self.bed.facies, suggested) {
                    (Some(c), _) => c.code().to_string(),
                    (None, Some(s)) => format!("{s} (suggested)"),
                    (None, None) => "none".to_string(),
                };
                let mut pick = self.bed.facies;
                egui::ComboBox::from_id_salt("facies_code")
                    .selected_text(shown)
                    .width(120.0)
                    .height(420.0)
                    .show_ui(ui, |ui| {
                        ui.selectable_value(&mut pick, None, "none: use the suggestion");
                        for c in FaciesCode::ALL {
                            ui.selectable_value(&mut pick, Some(*c), format!("{:<4} {}", c.code(), c.meaning()));
                        }
                    })
                    .response
                    .labelled_by(lab)
                    .on_hover_text("Lithofacies code (Miall 1978, 1996). Left at none, the suggested code stands");
                self.bed.facies = pick;
            });
            match (self.bed.facies, suggested) {
                (Some(c), s) => {
                    note(ui, format!("{}: {}. Your code.", c.code(), c.meaning()));
                    // The same warning `aggrade check` gives: the code names another rock.
                    if let Some(why) = aggrade_core::rules::facies::code_against_rock(&self.bed) {
                        ui.add(egui::Label::new(egui::RichText::new(why).small().color(theme::WARN)).wrap());
                    }
                    if let Some(s) = s.filter(|s| *s != c) {
                        note(ui, format!("The rules would suggest {s} ({}).", s.meaning()));
                    }
                    if ui
                        .button("Clear (use suggestion)")
                        .on_hover_text("Take your code off; the suggested code stands, marked as suggested")
                        .clicked()
                    {
                        self.bed.facies = None;
                    }
                }
                (None, Some(s)) => {
                    note(
                        ui,
                        format!(
                            "Suggested {}: {}. Worked out from the lithology, grain size and structures: a candidate for your review.",
                            s.code(),
                            s.meaning()
                        ),
                    );
                    if ui.button("Confirm").on_hover_text(format!("Make {s} this bed's code")).clicked() {
                        self.bed.facies = Some(s);
                    }
                }
                (None, None) => note(ui, "No code is suggested for this bed; choose one above."),
            }
        });
    }

    /// The colour in words and as a Munsell notation.
    pub(super) fn colour(&mut self, ui: &mut egui::Ui) {
        let open = !self.bed.colour.is_empty() || self.bed.munsell.is_some();
        egui::CollapsingHeader::new("Colour").default_open(open).show(ui, |ui| {
            egui::Grid::new("colour_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
                let lab = ui.label("Colour in words").id;
                self.live_text(ui, lab, "colour", 0, |b| &mut b.colour, "e.g. pale red, greenish grey", "Colour as logged, in words");
                ui.end_row();
                let lab = ui.label(Typed::Munsell.label()).id;
                self.show(ui, lab, Typed::Munsell, FieldLook { hint: "e.g. 10YR 5/4", tip: "Munsell notation: hue value/chroma (10YR 5/4, 5R 4/6) or N 7/ for a neutral grey. Stored when you press Enter or leave the field; empty for none", width: FIELD_W, char_limit: 40 });
                ui.end_row();
                self.problem_row(ui, Typed::Munsell);
            });
        });
    }

    /// The samples taken and the photographs, as lists.
    pub(super) fn samples_and_photos(
        &mut self,
        ui: &mut egui::Ui,
        doc: &Document,
        photo_note: &mut Option<String>,
    ) {
        let open = !self.bed.samples.is_empty() || !self.bed.photos.is_empty();
        let unit = self.cx.unit;
        egui::CollapsingHeader::new("Samples & photos").default_open(open).show(ui, |ui| {
            ui.label(egui::RichText::new(format!("Samples ({})", self.bed.samples.len())).strong());
            let mut remove = None;
            if !self.bed.samples.is_empty() {
                egui::Grid::new("samples").num_columns(4).spacing([6.0, 4.0]).show(ui, |ui| {
                    // Headings at the columns' widths (a field takes no more room than its column).
                    let heading = |ui: &mut egui::Ui, h: &str, w: f32| {
                        ui.add_sized([w, 14.0], egui::Label::new(egui::RichText::new(h).small().color(theme::TEXT_DIM)));
                    };
                    heading(ui, "id", 76.0);
                    heading(ui, "kind", 110.0);
                    heading(ui, &format!("height in bed ({})", unit.name()), 56.0);
                    ui.label("");
                    ui.end_row();
                    for k in 0..self.bed.samples.len() {
                        let look = FieldLook {
                            hint: "id",
                            tip: "The label on the sample bag; stored when you press Enter or leave the field",
                            width: 76.0,
                            char_limit: MAX_STRING_CHARS,
                        };
                        let (r, read) = self.cx.show_row(ui, Row::SampleId, k, &mut self.fields, &mut self.bed, look);
                        r.accessible_name(format!("Sample {} id", k + 1));
                        self.committed |= read;
                        let kind = &mut self.bed.samples[k].kind;
                        egui::ComboBox::from_id_salt(("sample_kind", k, self.cx.key))
                            .selected_text(kind.map_or("—", SampleKind::name))
                            .width(110.0)
                            .show_ui(ui, |ui| {
                                ui.selectable_value(kind, None, "— (not said)");
                                for s in SampleKind::ALL {
                                    ui.selectable_value(kind, Some(*s), s.name());
                                }
                            })
                            .response
                            .on_hover_text("What the sample was taken for");
                        let look = FieldLook {
                            hint: unit.name(),
                            tip: "Height of the sample above the bed's base, in the display unit; empty if not noted. Stored when you press Enter or leave the field",
                            width: 56.0,
                            char_limit: 40,
                        };
                        let (r, read) =
                            self.cx.show_row(ui, Row::SampleHeight, k, &mut self.fields, &mut self.bed, look);
                        r.accessible_name(format!("Sample {} height in bed", k + 1));
                        self.committed |= read;
                        let words = record::sample_words(&self.bed.samples[k], unit);
                        if ui.small_button("✕").on_hover_text(format!("Remove sample {words}")).clicked() {
                            remove = Some(k);
                        }
                        ui.end_row();
                    }
                });
                for ((r, k), t) in &self.fields.rows {
                    if let (Some(p), true) = (&t.problem, *r != Row::PhotoReference && *k < self.bed.samples.len()) {
                        problem_label(ui, p);
                    }
                }
            }
            if let Some(k) = remove {
                self.bed.samples.remove(k);
                self.fields.entry_removed(&[Row::SampleId, Row::SampleHeight], k);
            }
            if ui
                .button("Add sample")
                .on_hover_text("Add a sample, numbered on from the section's highest sample id")
                .clicked()
            {
                // Numbered on from the section as it will be, this bed's list as edited.
                let mut section = doc.section().clone();
                if let Some(b) = section.beds.iter_mut().find(|b| b.id == self.bed.id) {
                    b.samples = self.bed.samples.clone();
                }
                let id = record::next_sample_id(&section);
                self.bed.samples.push(Sample::labelled(id));
            }

            ui.add_space(6.0);
            ui.label(egui::RichText::new(format!("Photos ({})", self.bed.photos.len())).strong());
            let mut remove = None;
            if !self.bed.photos.is_empty() {
                egui::Grid::new("photos").num_columns(4).spacing([6.0, 4.0]).show(ui, |ui| {
                    for (h, w) in [("reference", 80.0), ("image file", 110.0)] {
                        ui.add_sized([w, 14.0], egui::Label::new(egui::RichText::new(h).small().color(theme::TEXT_DIM)));
                    }
                    ui.label("");
                    ui.label("");
                    ui.end_row();
                    for k in 0..self.bed.photos.len() {
                        let look = FieldLook {
                            hint: "IMG_2041",
                            tip: "The camera's file name or number, or roll and frame; stored when you press Enter or leave the field",
                            width: 80.0,
                            char_limit: MAX_STRING_CHARS,
                        };
                        let (r, read) =
                            self.cx.show_row(ui, Row::PhotoReference, k, &mut self.fields, &mut self.bed, look);
                        r.accessible_name(format!("Photo {} reference", k + 1));
                        self.committed |= read;
                        let mut file = self.bed.photos[k].file.clone().unwrap_or_default();
                        let id = egui::Id::unique(("inspector_photo_file", k, self.cx.key));
                        let r = ui
                            .add_sized(
                                [110.0, 20.0],
                                egui::TextEdit::singleline(&mut file)
                                    .id(id)
                                    .hint_text("image file (optional)")
                                    .desired_width(110.0)
                                    .char_limit(MAX_STRING_CHARS),
                            )
                            .on_hover_text(
                                "An image file: a full path, or a path relative to the project file's folder",
                            );
                        let r = r.accessible_name(format!("Photo {} file", k + 1));
                        if r.changed() {
                            self.bed.photos[k].file = (!file.trim().is_empty()).then_some(file);
                            self.live = Some(("photo file", k));
                        }
                        let has_file =
                            self.bed.photos[k].file.as_deref().is_some_and(|f| !f.trim().is_empty());
                        if ui
                            .add_enabled(has_file, egui::Button::new("Open").small())
                            .on_hover_text("Open the image with the system's viewer")
                            .on_disabled_hover_text("No image file is given for this photo")
                            .clicked()
                        {
                            let path = record::photo_path(
                                self.bed.photos[k].file.as_deref().unwrap_or(""),
                                doc.path.as_deref(),
                            );
                            *photo_note = record::open_photo(&path).err();
                        }
                        if ui.small_button("✕").on_hover_text("Remove this photo from the bed").clicked() {
                            remove = Some(k);
                        }
                        ui.end_row();
                    }
                });
            }
            if let Some(k) = remove {
                self.bed.photos.remove(k);
                self.fields.entry_removed(&[Row::PhotoReference], k);
            }
            for ((r, k), t) in &self.fields.rows {
                if let (Some(p), true) = (&t.problem, *r == Row::PhotoReference && *k < self.bed.photos.len()) {
                    problem_label(ui, p);
                }
            }
            if let Some(n) = photo_note.as_deref() {
                ui.add(egui::Label::new(egui::RichText::new(n).small().color(INVALID)).wrap());
            }
            if ui
                .button("Add photo")
                .on_hover_text("Add a photograph of this bed, numbered on from the section's last photo")
                .clicked()
            {
                let mut section = doc.section().clone();
                if let Some(b) = section.beds.iter_mut().find(|b| b.id == self.bed.id) {
                    b.photos = self.bed.photos.clone();
                }
                let reference = record::next_photo_reference(&section);
                self.bed.photos.push(Photo { reference, file: None });
            }
        });
    }

    /// Fossils in words, trace and body fossils by name, and the bioturbation index.
    pub(super) fn fossils(&mut self, ui: &mut egui::Ui) {
        let b = &self.bed;
        let open = !b.fossils.is_empty()
            || !b.trace_fossils.is_empty()
            || !b.body_fossils.is_empty()
            || b.bioturbation_index.is_some();
        egui::CollapsingHeader::new("Fossils & bioturbation").default_open(open).show(ui, |ui| {
            egui::Grid::new("fossil_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
                let lab = ui.label("Bioturbation index").id;
                let mut bi = self.bed.bioturbation_index;
                let shown = bi.map_or("—".to_string(), |v| format!("BI {v}"));
                egui::ComboBox::from_id_salt("bioturbation_index")
                    .selected_text(shown)
                    .width(80.0)
                    .show_ui(ui, |ui| {
                        ui.selectable_value(&mut bi, None, "— (not graded)");
                        for (v, grade) in BIOTURBATION_GRADES.iter().enumerate() {
                            ui.selectable_value(&mut bi, Some(v as u8), format!("BI {v}"))
                                .on_hover_text(*grade);
                        }
                    })
                    .response
                    .labelled_by(lab)
                    .on_hover_text(
                        bi.and_then(|v| BIOTURBATION_GRADES.get(v as usize).copied())
                            .unwrap_or("Bioturbation index 0–6 (Taylor & Goldring 1993)"),
                    );
                self.bed.bioturbation_index = bi;
                ui.end_row();
                if let Some(g) = bi.and_then(|v| BIOTURBATION_GRADES.get(v as usize)) {
                    ui.label("");
                    note(ui, *g);
                    ui.end_row();
                }
                for (f, names, list) in [
                    (Typed::TraceFossil, TRACE_FOSSILS, "Trace fossils"),
                    (Typed::BodyFossil, BODY_FOSSILS, "Body fossils"),
                ] {
                    let list_label = ui.label(list).id;
                    ui.vertical(|ui| {
                        let mut remove = None;
                        let current = if f == Typed::TraceFossil {
                            &self.bed.trace_fossils
                        } else {
                            &self.bed.body_fossils
                        };
                        if !current.is_empty() {
                            ui.horizontal_wrapped(|ui| {
                                ui.set_max_width(FIELD_W + 40.0);
                                for (k, name) in current.iter().enumerate() {
                                    if ui
                                        .small_button(format!("{name} ✕"))
                                        .on_hover_text(format!("Take {name} off the list"))
                                        .clicked()
                                    {
                                        remove = Some(k);
                                    }
                                }
                            });
                        }
                        let mut add = None;
                        ui.horizontal(|ui| {
                            self.show(
                                ui,
                                list_label,
                                f,
                                FieldLook {
                                    hint: "add a name",
                                    tip: "A name to add to the list (any name; Enter adds it)",
                                    width: 130.0,
                                    char_limit: MAX_STRING_CHARS,
                                },
                            );
                            let list = if f == Typed::TraceFossil {
                                &self.bed.trace_fossils
                            } else {
                                &self.bed.body_fossils
                            };
                            ui.menu_button("▾", |ui| {
                                for n in
                                    names.iter().filter(|n| !list.iter().any(|x| x.eq_ignore_ascii_case(n)))
                                {
                                    if ui.button(*n).clicked() {
                                        add = Some(n.to_string());
                                        ui.close();
                                    }
                                }
                            })
                            .response
                            .on_hover_text(format!("Common {}", list_name(f)));
                        });
                        let target = if f == Typed::TraceFossil {
                            &mut self.bed.trace_fossils
                        } else {
                            &mut self.bed.body_fossils
                        };
                        if let Some(k) = remove {
                            target.remove(k);
                        }
                        if let Some(n) = add {
                            record::add_name(target, &n);
                        }
                    });
                    ui.end_row();
                    self.problem_row(ui, f);
                }
                let lab = ui.label("Fossils in words").id;
                self.live_text(
                    ui,
                    lab,
                    "fossils",
                    0,
                    |b| &mut b.fossils,
                    "anything else seen",
                    "Fossils in free words, beside the names above",
                );
                ui.end_row();
            });
        });
    }

    /// The structures seen. Root traces, slickensides, carbonate nodules and mottling are offered
    /// once, as paleosol features; a bed from an older file or table that holds one as a
    /// structure shows it here, ticked, with a button that moves it to the paleosol features.
    pub(super) fn structures(&mut self, ui: &mut egui::Ui) {
        let bed = &mut self.bed;
        egui::CollapsingHeader::new("Structures").default_open(true).show(ui, |ui| {
            ui.horizontal_wrapped(|ui| {
                for s in Structure::ALL {
                    let soil = shorthand::soil_feature(*s);
                    let mut on = bed.structures.contains(s);
                    if soil.is_some() && !on {
                        continue;
                    }
                    let (label, tip) = match soil {
                        Some(_) => (
                            format!("{} (soil feature)", s.name()),
                            format!("{} is a paleosol feature, recorded here as a structure (older files and tables). Untick to remove it", s.name()),
                        ),
                        None => (s.name().to_string(), format!("Seen in this bed: {} (code {})", s.name(), shorthand::short_code(*s))),
                    };
                    if ui.toggle_value(&mut on, label).on_hover_text(tip).changed() {
                        if on {
                            bed.structures.push(*s);
                            bed.structures.sort();
                        } else {
                            bed.structures.retain(|x| x != s);
                        }
                    }
                    if let Some(f) = soil {
                        if ui.small_button("→ paleosol").on_hover_text(format!("Record {} as a paleosol feature instead", s.name())).clicked() {
                            bed.structures.retain(|x| x != s);
                            if !bed.paleosol_features.contains(&f) {
                                bed.paleosol_features.push(f);
                                bed.paleosol_features.sort();
                            }
                        }
                    }
                }
            });
            note(ui, "Root traces, slickensides, carbonate nodules and mottling: under Paleosol");
        });
    }

    /// Paleosol development and features, carbonate stage, soil horizon and drainage.
    pub(super) fn paleosol(&mut self, ui: &mut egui::Ui) {
        let b = &self.bed;
        let open = b.paleosol != PaleosolDevelopment::None
            || !b.paleosol_features.is_empty()
            || b.carbonate_stage.is_some()
            || b.soil_horizon.is_some()
            || b.drainage.is_some();
        egui::CollapsingHeader::new("Paleosol").default_open(open).show(ui, |ui| {
            egui::Grid::new("paleosol_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
                let label = ui.label("Development").id;
                combo(ui, label, "paleosol", &mut self.bed.paleosol, PaleosolDevelopment::ALL, |p| p.name(), "Degree of paleosol development");
                ui.end_row();

                let lab = ui.label(Typed::SoilHorizon.label()).id;
                self.show(ui, lab, Typed::SoilHorizon, FieldLook { hint: "e.g. Bt, Bk2, Bss, 2Bg", tip: "Soil-horizon designation (Soil Survey Staff; Retallack 2001): master horizon O, A, E, B, C or R with lower-case suffixes, e.g. Bt, Bk2, Bss, 2Bg. Stored when you press Enter or leave the field; empty for none", width: FIELD_W, char_limit: 40 });
                ui.end_row();
                self.problem_row(ui, Typed::SoilHorizon);

                let label = ui.label("Drainage").id;
                let choices: Vec<Option<Drainage>> = std::iter::once(None).chain(Drainage::ALL.iter().copied().map(Some)).collect();
                combo(ui, label, "drainage", &mut self.bed.drainage, &choices, |d| d.map_or("— (not read)", Drainage::name), "Drainage of the soil as read from its colours and features (Soil Survey Manual classes)");
                ui.end_row();

                let lab = ui.label("Carbonate stage").id;
                ui.horizontal(|ui| {
                    let mut has = self.bed.carbonate_stage.is_some();
                    if ui.checkbox(&mut has, "").labelled_by(lab).on_hover_text("Carbonate morphological stage I–VI (Machette 1985)").changed() {
                        self.bed.carbonate_stage = has.then_some(1);
                    }
                    if let Some(s) = self.bed.carbonate_stage.as_mut() {
                        ui.add(egui::Slider::new(s, 1..=6).custom_formatter(|v, _| roman(v as u8).to_string()))
                            .labelled_by(lab)
                            .on_hover_text("Carbonate morphological stage, I to VI (Gile et al. 1966; Machette 1985)");
                    }
                });
                ui.end_row();
            });
            ui.label("Features");
            ui.horizontal_wrapped(|ui| {
                for f in PaleosolFeature::ALL {
                    let mut on = self.bed.paleosol_features.contains(f);
                    let tip = format!(
                        "{} seen in this bed: a mark of soil formation (code {} in the bed table's paleosol cell)",
                        f.name(),
                        shorthand::short_code(*f)
                    );
                    if ui.toggle_value(&mut on, f.name()).on_hover_text(tip).changed() {
                        if on {
                            self.bed.paleosol_features.push(*f);
                            self.bed.paleosol_features.sort();
                        } else {
                            self.bed.paleosol_features.retain(|x| x != f);
                        }
                    }
                }
            });
        });
    }

    /// A named surface at the bed's base.
    pub(super) fn surface(&mut self, ui: &mut egui::Ui) {
        egui::CollapsingHeader::new("Surface at base").default_open(self.bed.base_surface.is_some()).show(ui, |ui| {
            let mut has = self.bed.base_surface.is_some();
            if ui.checkbox(&mut has, "Named surface at this bed's base").on_hover_text("Mark and name the surface at the bed's base").changed() {
                self.bed.base_surface = has.then(|| Surface { name: "S-1".into(), kind: SurfaceKind::Other });
                self.fields.get(Typed::SurfaceName).revert();
            }
            if self.bed.base_surface.is_some() {
                ui.horizontal(|ui| {
                    let lab = ui.label("Name").id;
                    self.show(ui, lab, Typed::SurfaceName, FieldLook { hint: "e.g. SB-2", tip: "The surface's name, e.g. SB-2. Stored when you press Enter or leave the field", width: FIELD_W, char_limit: MAX_STRING_CHARS });
                });
                if let Some(p) = &self.fields.texts[Typed::SurfaceName as usize].problem {
                    problem_label(ui, p);
                }
            }
            if let Some(s) = self.bed.base_surface.as_mut() {
                ui.horizontal(|ui| {
                    let label = ui.label("Kind").id;
                    combo(ui, label, "surface_kind", &mut s.kind, SurfaceKind::ALL, |k| k.name(), "What kind of surface it is");
                });
            }
        });
    }

    /// Free notes on the bed.
    pub(super) fn notes(&mut self, ui: &mut egui::Ui) {
        ui.label("Notes");
        let id = egui::Id::unique(("inspector_notes", self.cx.key));
        if ui
            .add(
                egui::TextEdit::multiline(&mut self.bed.notes)
                    .id(id)
                    .desired_rows(3)
                    .desired_width(f32::INFINITY),
            )
            .on_hover_text(format!("Free notes on this bed (at most {MAX_STRING_CHARS} characters)"))
            .changed()
        {
            // egui's character limit holds for single-line fields only: stop the notes at
            // the project file's limit here (counted in characters, as the file checks).
            if let Some((cut, _)) = self.bed.notes.char_indices().nth(MAX_STRING_CHARS) {
                self.bed.notes.truncate(cut);
            }
            self.live = Some(("notes", 0));
        }
    }
}

fn list_name(f: Typed) -> &'static str {
    if f == Typed::TraceFossil {
        "trace fossils"
    } else {
        "body fossils"
    }
}
