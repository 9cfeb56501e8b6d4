//! The inspector: every field of the selected bed, edited on a copy that is sent as one edit.
//!
//! Number and list fields (thickness, grain sizes, relief, paleocurrents, samples, the surface
//! name) are committed fields ([`super::field`]): read as a whole when the typing ends, kept as
//! typed and marked while they do not parse, never stored half-read. Free text (colour, fossils,
//! notes) is stored as typed, each keystroke being a whole value.
//!
//! Leaving a bed while one of its fields holds a text that does not parse: the selection may
//! change from many places (the column, the table, the review list, the keyboard, undo), and a
//! desktop tool that refused to let go of a bed until a typo is fixed would trap the geologist in
//! the middle of a log. Instead the typed text is kept for that bed as a draft, listed with a
//! warning at the top of the inspector whatever is selected ("not stored"), shown again in its
//! field, still marked, when the bed is selected again, and only dropped by an explicit Discard.
//! Nothing typed is lost, nothing half-read is stored. Valid uncommitted text is stored when the
//! bed is left, as on any other focus loss.

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::field::{committed_field, problem_label, FieldLook, FieldText};
use super::table::{parse_length, parse_thickness, show_length};
use super::theme;
use aggrade_core::io::limits::MAX_STRING_CHARS;
use aggrade_core::io::MAX_BED_THICKNESS_M;
use aggrade_core::model::shorthand;
use aggrade_core::model::{
    BaseRank, Bed, BedId, Contact, GrainSize, GrainSizeRule, LengthUnit, Lithology, PaleosolDevelopment,
    PaleosolFeature, Section, Structure, Surface, SurfaceKind,
};
use std::collections::BTreeMap;

/// The bed fields typed as text and committed as whole values.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Typed {
    Thickness,
    GrainBase,
    GrainTop,
    Relief,
    Paleocurrents,
    Samples,
    SurfaceName,
}

impl Typed {
    const ALL: [Typed; 7] = [
        Typed::Thickness,
        Typed::GrainBase,
        Typed::GrainTop,
        Typed::Relief,
        Typed::Paleocurrents,
        Typed::Samples,
        Typed::SurfaceName,
    ];

    /// The field's label in the inspector (and in its messages).
    fn label(self) -> &'static str {
        match self {
            Typed::Thickness => "Thickness",
            Typed::GrainBase => "Grain at base",
            Typed::GrainTop => "Grain at top",
            Typed::Relief => "Erosional relief",
            Typed::Paleocurrents => "Paleocurrents (°)",
            Typed::Samples => "Samples",
            Typed::SurfaceName => "Surface name",
        }
    }

    /// The field of the project file it fills (to tell its validation problems from others').
    fn file_field(self) -> &'static str {
        match self {
            Typed::Thickness => "thickness_m",
            Typed::GrainBase => "grain_base",
            Typed::GrainTop => "grain_top",
            Typed::Relief => "base_relief_m",
            Typed::Paleocurrents => "paleocurrents",
            Typed::Samples => "samples",
            Typed::SurfaceName => "base_surface.name",
        }
    }

    /// The stored value as the field shows it.
    fn stored(self, bed: &Bed, unit: LengthUnit) -> String {
        match self {
            Typed::Thickness => show_length(bed.thickness_m, unit),
            Typed::GrainBase => bed.grain_base.map(|g| g.to_string()).unwrap_or_default(),
            Typed::GrainTop => bed.grain_top.map(|g| g.to_string()).unwrap_or_default(),
            Typed::Relief => bed.base_relief_m.map(|r| show_length(r, unit)).unwrap_or_default(),
            Typed::Paleocurrents => shorthand::paleocurrents_code(&bed.paleocurrents),
            Typed::Samples => shorthand::samples_code(&bed.samples),
            Typed::SurfaceName => bed.base_surface.as_ref().map(|s| s.name.clone()).unwrap_or_default(),
        }
    }

    /// Read the whole text into `bed`, or say (naming the field) why it cannot be read and what
    /// would be valid. The bed is then checked by the same validation a saved file passes, so
    /// nothing is stored that would not open again.
    fn read(self, text: &str, bed: &mut Bed, unit: LengthUnit) -> Result<(), String> {
        let label = self.label();
        match self {
            Typed::Thickness => {
                bed.thickness_m = parse_thickness(text, unit).map_err(|e| format!("{label}: {e}"))?;
            }
            Typed::GrainBase | Typed::GrainTop => {
                let g = read_grain(text, bed.lithology).map_err(|e| format!("{label}: {e}"))?;
                let (this, other) = if self == Typed::GrainBase {
                    (&mut bed.grain_base, &mut bed.grain_top)
                } else {
                    (&mut bed.grain_top, &mut bed.grain_base)
                };
                *this = g;
                // A bed that needs a grain size and had none gets one size base to top.
                if other.is_none() && bed.lithology.grain_size_rule() == GrainSizeRule::Required {
                    *other = g;
                }
            }
            Typed::Relief => {
                bed.base_relief_m = if text.trim().is_empty() {
                    None
                } else {
                    match parse_length(text, unit) {
                        Some(r) if (0.0..=MAX_BED_THICKNESS_M).contains(&r) => Some(r),
                        _ => {
                            return Err(format!(
                                "{label}: {text:?} is not a height from 0 to {MAX_BED_THICKNESS_M} m (e.g. 0.4, 40cm); empty for none"
                            ))
                        }
                    }
                };
            }
            Typed::Paleocurrents => {
                bed.paleocurrents = shorthand::paleocurrents(text).map_err(|e| format!("{label}: {e}"))?
            }
            Typed::Samples => {
                bed.samples = shorthand::samples(text, &bed.samples);
            }
            Typed::SurfaceName => {
                if text.trim().is_empty() {
                    return Err(format!(
                        "{label}: a named surface needs a name (e.g. SB-2); untick the box for none"
                    ));
                }
                if let Some(s) = bed.base_surface.as_mut() {
                    s.name = text.trim().to_string();
                }
            }
        }
        check_bed(bed, Some(self))
    }
}

/// A grain size typed in a field: empty for none, else a class (or its first letters) or a
/// measured size; checked against what the lithology allows.
fn read_grain(text: &str, lithology: Lithology) -> Result<Option<GrainSize>, String> {
    let g = if text.trim().is_empty() {
        None
    } else {
        // The bed table's and the CSV's reader: a code, a name or a measured size.
        Some(shorthand::grain_from_code(text).map_err(|e| e.to_string())?)
    };
    match (lithology.grain_size_rule(), g) {
        (GrainSizeRule::Required, None) => {
            Err(format!("a {lithology} bed needs a grain size (e.g. fine sand, m, 0.3mm)"))
        }
        (GrainSizeRule::Forbidden, Some(_)) => Err(format!(
            "a {lithology} interval takes no grain size; choose the bed's lithology first (the size typed here is used then)"
        )),
        _ => Ok(g),
    }
}

/// The bed checked alone by the project file's validation: the first problem, in words naming
/// the inspector field (`field`'s own problems first).
fn check_bed(bed: &Bed, field: Option<Typed>) -> Result<(), String> {
    let mut s = Section::new("inspector check");
    s.beds.push(bed.clone());
    let problems = aggrade_core::io::validate_section(&s);
    let own = |p: &&aggrade_core::io::Problem| {
        field.is_some_and(|f| {
            p.location.strip_prefix("beds[0].").is_some_and(|l| l.starts_with(f.file_field()))
        })
    };
    let Some(p) = problems.iter().find(own).or(problems.first()) else { return Ok(()) };
    let location = p.location.strip_prefix("beds[0].").unwrap_or(&p.location);
    let label = Typed::ALL.iter().find(|f| location.starts_with(f.file_field())).map(|f| f.label());
    Err(format!("{}: {}", label.unwrap_or(location), p.message))
}

/// The typed fields of one bed.
#[derive(Debug, Clone)]
struct BedFields {
    /// Section index and bed id (bed ids are unique within a section only).
    key: (usize, BedId),
    texts: [FieldText; 7],
}

impl BedFields {
    fn new(key: (usize, BedId), bed: &Bed, unit: LengthUnit) -> Self {
        BedFields { key, texts: Typed::ALL.map(|f| FieldText::new(&f.stored(bed, unit))) }
    }

    fn get(&mut self, f: Typed) -> &mut FieldText {
        &mut self.texts[f as usize]
    }

    fn has_problem(&self) -> bool {
        self.texts.iter().any(|t| t.problem.is_some())
    }
}

/// Text buffers for fields typed as text (so half-typed values are neither lost nor stored).
#[derive(Debug, Default)]
pub struct Inspector {
    /// The fields of the bed on show.
    fields: Option<BedFields>,
    /// Beds left while a field held a text that does not parse: the text kept, not stored.
    drafts: BTreeMap<(usize, BedId), BedFields>,
    /// A problem that is not one field's (a lithology that needs a grain size first).
    problem: Option<String>,
}

impl Inspector {
    /// The typed texts that do not parse (kept, not stored), one line each naming the section,
    /// the bed and the field: autosaved with the work so that a crash loses no word of them.
    pub fn unstored_texts(&self, doc: &Document) -> Vec<String> {
        let mut out = Vec::new();
        for fields in self.drafts.values().chain(self.fields.iter()) {
            let (section, bed) = fields.key;
            let section_name = doc.project.sections.get(section).map(|s| s.name.as_str()).unwrap_or("?");
            let place = match doc.project.sections.get(section).and_then(|s| s.bed_index(bed)) {
                Some(i) => format!("{section_name}, bed {}", i + 1),
                None => format!("{section_name}, a deleted bed"),
            };
            for (f, t) in Typed::ALL.iter().zip(&fields.texts) {
                if t.problem.is_some() {
                    out.push(format!("{place}: {} {:?}", f.label(), t.text));
                }
            }
        }
        out
    }

    /// Whether any bed's field holds a typed text that does not parse (kept, not stored).
    pub fn has_unstored_text(&self) -> bool {
        !self.drafts.is_empty() || self.fields.as_ref().is_some_and(BedFields::has_problem)
    }

    /// The bed on show changed (or the selection went): store what was typed and reads as a
    /// whole, keep what does not as a draft of that bed.
    fn leave(&mut self, doc: &Document, out: &mut Actions) {
        let Some(mut fields) = self.fields.take() else { return };
        let unit = doc.section().display_unit;
        let here = fields.key.0 == doc.selected_section;
        let stored = here.then(|| doc.section().beds.iter().find(|b| b.id == fields.key.1)).flatten();
        if let Some(orig) = stored {
            let mut bed = orig.clone();
            let mut read = Vec::new();
            for f in Typed::ALL {
                let t = fields.get(f);
                if t.is_uncommitted() && t.problem.is_none() {
                    let text = t.text.clone();
                    match f.read(&text, &mut bed, unit) {
                        Ok(()) => read.push(f),
                        Err(e) => fields.get(f).problem = Some(e),
                    }
                }
            }
            if bed != *orig && check_bed(&bed, None).is_ok() {
                out.edit(Edit::ReplaceBed { bed });
                // Stored: the field follows the stored value again when the bed is shown.
                for f in read {
                    fields.get(f).revert();
                }
            }
        }
        if fields.has_problem() || (stored.is_none() && fields.texts.iter().any(FieldText::is_uncommitted)) {
            self.drafts.insert(fields.key, fields);
        }
    }

    /// The warning listing beds left with text that was not stored.
    fn drafts_ui(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let mut discard = None;
        for (key, fields) in &self.drafts {
            let (section, bed) = *key;
            let place = if section == doc.selected_section {
                match doc.bed_index(bed) {
                    Some(i) => format!("Bed {}", i + 1),
                    None => "A deleted bed".to_string(),
                }
            } else {
                let name = doc.project.sections.get(section).map(|s| s.name.as_str()).unwrap_or("?");
                format!("A bed of section {name:?}")
            };
            for (f, t) in Typed::ALL.iter().zip(&fields.texts) {
                if !t.is_uncommitted() {
                    continue;
                }
                egui::Frame::group(ui.style()).stroke(egui::Stroke::new(1.0, super::field::INVALID)).show(
                    ui,
                    |ui| {
                        ui.label(
                            egui::RichText::new(format!(
                                "{place}: {} {:?} was not stored",
                                f.label(),
                                t.text
                            ))
                            .color(super::field::INVALID),
                        );
                        if let Some(p) = &t.problem {
                            problem_label(ui, p);
                        }
                        ui.horizontal(|ui| {
                            let can_show = section == doc.selected_section && doc.bed_index(bed).is_some();
                            if ui
                                .add_enabled(can_show, egui::Button::new("Show"))
                                .on_hover_text("Select that bed to fix the text")
                                .clicked()
                            {
                                out.select = Some(Some(bed));
                            }
                            if ui
                                .button("Discard")
                                .on_hover_text("Drop the typed text; the bed keeps its stored value")
                                .clicked()
                            {
                                discard = Some(*key);
                            }
                        });
                    },
                );
            }
        }
        if let Some(k) = discard {
            self.drafts.remove(&k);
        }
    }

    /// Draw the inspector for the selected bed.
    pub fn ui(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let selected = doc.selected().cloned();
        let key = selected.as_ref().map(|b| (doc.selected_section, b.id));
        if self.fields.as_ref().map(|f| f.key) != key {
            self.leave(doc, out);
            self.problem = None;
        }
        let unit = doc.section().display_unit;
        if let (None, Some(orig), Some(key)) = (&self.fields, &selected, key) {
            // A bed left with text that was not stored gets it back in its fields.
            self.fields = Some(self.drafts.remove(&key).unwrap_or_else(|| BedFields::new(key, orig, unit)));
        }
        self.drafts_ui(ui, doc, out);
        let Some(orig) = selected else {
            ui.add_space(12.0);
            ui.label(
                egui::RichText::new("Select a bed in the column or the table to see its fields.")
                    .color(theme::TEXT_DIM),
            );
            return;
        };
        let key = (doc.selected_section, orig.id);
        let Some(mut fields) = self.fields.take() else { return };
        let index = doc.bed_index(orig.id).unwrap_or(0);
        let base_h = doc.section().base_heights_m().get(index).copied().unwrap_or(0.0);
        let mut bed = orig.clone();
        // A live text field changed (one undo step per typing run) or a committed field was read.
        let mut text_field: Option<&'static str> = None;
        let mut committed = false;
        let cx = FieldCtx { key, unit, orig: &orig };
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
                let lab = ui.label(Typed::Thickness.label()).id;
                committed |= cx.show(ui, lab, Typed::Thickness, &mut fields, &mut bed, FieldLook { hint: &format!("e.g. 1.25 ({})", unit.name()), tip: "Bed thickness in the section's display unit; add cm, m or ft to type another unit. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
                ui.end_row();
                problem_row(ui, &fields, Typed::Thickness);

                let label = ui.label("Lithology").id;
                let mut lith = bed.lithology;
                if combo(ui, label, "lith", &mut lith, &Lithology::ALL, |l| l.name(), "Rock type of the bed") {
                    match with_lithology(&bed, lith, &fields, unit) {
                        Ok(b) => {
                            bed = b;
                            self.problem = None;
                            for f in [Typed::GrainBase, Typed::GrainTop] {
                                fields.get(f).problem = None;
                                fields.get(f).revert();
                            }
                        }
                        Err(e) => self.problem = Some(e),
                    }
                }
                ui.end_row();
                if let Some(p) = &self.problem {
                    ui.label("");
                    problem_label(ui, p);
                    ui.end_row();
                }

                for f in [Typed::GrainBase, Typed::GrainTop] {
                    let lab = ui.label(f.label()).id;
                    committed |= cx.show(ui, lab, f, &mut fields, &mut bed, FieldLook { hint: "e.g. m, fine sand, 0.3mm", tip: "Wentworth class (or first letters), or a measured size in mm or phi; empty for none. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
                    ui.end_row();
                    problem_row(ui, &fields, f);
                }

                let label = ui.label("Basal contact").id;
                combo(ui, label, "contact", &mut bed.base_contact, Contact::ALL, |c| c.name(), "Nature of the bed's base");
                ui.end_row();

                let label = ui.label("Base rank").id;
                let ranks = [None, Some(BaseRank::StoreySurface), Some(BaseRank::BodyBase), Some(BaseRank::WithinStorey)];
                combo(ui, label, "base_rank", &mut bed.base_rank, &ranks, |r| r.map_or("rules decide", BaseRank::name), "Your rank for this base: a storey surface or a channel-body base starts a new storey (and body); within storey makes it a scour. Overrides the rules");
                ui.end_row();

                let lab = ui.label(Typed::Relief.label()).id;
                let mut has = bed.base_relief_m.is_some();
                ui.horizontal(|ui| {
                    if ui.checkbox(&mut has, "").labelled_by(lab).on_hover_text("Relief measured at the base").changed() {
                        bed.base_relief_m = has.then_some(0.1);
                        fields.get(Typed::Relief).revert();
                    }
                    if bed.base_relief_m.is_some() {
                        committed |= cx.show(ui, lab, Typed::Relief, &mut fields, &mut bed, FieldLook { hint: "e.g. 0.4", tip: "Erosional relief at the bed's base in the section's display unit (0 or more)", width: 110.0, char_limit: MAX_STRING_CHARS });
                    }
                });
                ui.end_row();
                problem_row(ui, &fields, Typed::Relief);

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
                if ui.add(egui::TextEdit::singleline(&mut bed.colour).desired_width(170.0).char_limit(MAX_STRING_CHARS)).on_hover_text("Colour as logged (e.g. 10YR 6/4, pale red)").changed() {
                    text_field = Some("colour");
                }
                ui.end_row();

                let lab = ui.label(Typed::Paleocurrents.label()).id;
                committed |= cx.show(ui, lab, Typed::Paleocurrents, &mut fields, &mut bed, FieldLook { hint: "e.g. 120; 135; 140", tip: "Azimuths 0–360°, separated by ; or spaces. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
                ui.end_row();
                problem_row(ui, &fields, Typed::Paleocurrents);

                ui.label("Fossils");
                if ui.add(egui::TextEdit::singleline(&mut bed.fossils).desired_width(170.0).char_limit(MAX_STRING_CHARS)).on_hover_text("Body and trace fossils").changed() {
                    text_field = Some("fossils");
                }
                ui.end_row();

                let lab = ui.label(Typed::Samples.label()).id;
                committed |= cx.show(ui, lab, Typed::Samples, &mut fields, &mut bed, FieldLook { hint: "e.g. CW-12; CW-13", tip: "Sample numbers, separated by ;. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
                ui.end_row();
                problem_row(ui, &fields, Typed::Samples);
            });


            ui.add_space(4.0);
            // Root traces, slickensides, carbonate nodules and mottling are offered once, as
            // paleosol features; a bed from an older file or table that holds one as a structure
            // shows it here, ticked, with a button that moves it to the paleosol features.
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
                ui.label(
                    egui::RichText::new("Root traces, slickensides, carbonate nodules and mottling: under Paleosol features")
                        .small()
                        .color(theme::TEXT_DIM),
                );
            });
            let soil_open = bed.paleosol != PaleosolDevelopment::None || !bed.paleosol_features.is_empty();
            egui::CollapsingHeader::new("Paleosol features").default_open(soil_open).show(ui, |ui| {
                ui.horizontal_wrapped(|ui| {
                    for f in PaleosolFeature::ALL {
                        let mut on = bed.paleosol_features.contains(f);
                        let tip = format!(
                            "{} seen in this bed: a mark of soil formation (code {} in the bed table's paleosol cell)",
                            f.name(),
                            shorthand::short_code(*f)
                        );
                        if ui.toggle_value(&mut on, f.name()).on_hover_text(tip).changed() {
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
                    fields.get(Typed::SurfaceName).revert();
                }
                if bed.base_surface.is_some() {
                    ui.horizontal(|ui| {
                        let lab = ui.label("Name").id;
                        committed |= cx.show(ui, lab, Typed::SurfaceName, &mut fields, &mut bed, FieldLook { hint: "e.g. SB-2", tip: "The surface's name, e.g. SB-2. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
                    });
                    if let Some(p) = &fields.texts[Typed::SurfaceName as usize].problem {
                        problem_label(ui, p);
                    }
                }
                if let Some(s) = bed.base_surface.as_mut() {
                    ui.horizontal(|ui| {
                        let label = ui.label("Kind").id;
                        combo(ui, label, "surface_kind", &mut s.kind, SurfaceKind::ALL, |k| k.name(), "What kind of surface it is");
                    });
                }
            });
            ui.label("Notes");
            if ui
                .add(egui::TextEdit::multiline(&mut bed.notes).desired_rows(3).desired_width(f32::INFINITY))
                .on_hover_text(format!("Free notes on this bed (at most {MAX_STRING_CHARS} characters)"))
                .changed()
            {
                // egui's character limit holds for single-line fields only: stop the notes at
                // the project file's limit here (counted in characters, as the file checks).
                if let Some((cut, _)) = bed.notes.char_indices().nth(MAX_STRING_CHARS) {
                    bed.notes.truncate(cut);
                }
                text_field = Some("notes");
            }
        });
        self.fields = Some(fields);

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
            match (text_field, committed) {
                (Some(field), false) => out.edit_in(edit, gesture_key(("inspector", bed.id.0, field))),
                _ => out.edit(edit),
            }
        }
    }
}

/// What a committed field of the inspector needs to know about the bed on show.
struct FieldCtx<'a> {
    key: (usize, BedId),
    unit: LengthUnit,
    /// The bed as stored.
    orig: &'a Bed,
}

impl FieldCtx<'_> {
    /// One committed field; its widget id is the bed's, so focus never carries a text over to
    /// another bed. Returns true when a whole value was read into `bed`.
    fn show(
        &self,
        ui: &mut egui::Ui,
        label: egui::Id,
        f: Typed,
        fields: &mut BedFields,
        bed: &mut Bed,
        look: FieldLook<'_>,
    ) -> bool {
        let id = egui::Id::unique(("inspector_field", f as u8, self.key));
        let stored = f.stored(self.orig, self.unit);
        let mut candidate = bed.clone();
        let unit = self.unit;
        let (r, value) = committed_field(ui, id, fields.get(f), &stored, look, |text| {
            f.read(text, &mut candidate, unit).map(|_| candidate)
        });
        r.labelled_by(label);
        match value {
            Some(b) => {
                *bed = b;
                true
            }
            None => false,
        }
    }
}

/// The problem of a committed field, on a grid row of its own right under the field.
fn problem_row(ui: &mut egui::Ui, fields: &BedFields, f: Typed) {
    if let Some(p) = &fields.texts[f as usize].problem {
        ui.label("");
        problem_label(ui, p);
        ui.end_row();
    }
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

/// The bed with another lithology: a covered interval drops its grain sizes (undo brings them
/// back); a lithology that needs a grain size takes the one typed in the grain fields, or is
/// refused until one is typed.
fn with_lithology(bed: &Bed, lith: Lithology, fields: &BedFields, unit: LengthUnit) -> Result<Bed, String> {
    let mut b = bed.clone();
    b.lithology = lith;
    match lith.grain_size_rule() {
        GrainSizeRule::Forbidden => {
            b.grain_base = None;
            b.grain_top = None;
        }
        GrainSizeRule::Required if b.grain_base.is_none() || b.grain_top.is_none() => {
            for f in [Typed::GrainBase, Typed::GrainTop] {
                let text = &fields.texts[f as usize].text;
                if !text.trim().is_empty() {
                    f.read(text, &mut b, unit)?;
                }
            }
            if b.grain_base.is_none() || b.grain_top.is_none() {
                return Err(format!(
                    "A {lith} bed needs a grain size: type it in {:?} first, then choose {lith} again.",
                    Typed::GrainBase.label()
                ));
            }
        }
        _ => {}
    }
    check_bed(&b, None)?;
    Ok(b)
}

fn roman(v: u8) -> &'static str {
    ["?", "I", "II", "III", "IV", "V", "VI"].get(v as usize).copied().unwrap_or("?")
}

#[cfg(test)]
mod tests {
    use super::*;

    use aggrade_core::model::WentworthClass;

    #[test]
    fn typed_fields_read_whole_values_and_name_the_field_when_they_cannot() {
        let unit = LengthUnit::Metre;
        let sand =
            Bed::new(BedId(1), 1.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)));
        let mut b = sand.clone();
        Typed::Paleocurrents.read("240 225", &mut b, unit).expect("two azimuths");
        assert_eq!(b.azimuths().collect::<Vec<_>>(), vec![240.0, 225.0]);
        let mut b = sand.clone();
        let e = Typed::Paleocurrents.read("240 425", &mut b, unit).expect_err("425 is no azimuth");
        assert!(e.starts_with("Paleocurrents (°): \"425\""), "{e}");
        // Core validation: at most 1,000 m for one bed, counted after unit conversion (3,300 ft).
        let e = Typed::Thickness.read("3300ft", &mut sand.clone(), unit).expect_err("too thick");
        assert!(e.starts_with("Thickness:"), "{e}");
        // A sandstone needs a grain size; a covered interval takes none.
        let e = Typed::GrainBase.read("", &mut sand.clone(), unit).expect_err("required");
        assert!(e.contains("needs a grain size"), "{e}");
        let mut covered = Bed::new(BedId(2), 1.0, Lithology::Covered, None);
        assert!(Typed::GrainTop.read("m", &mut covered, unit).is_err());
        // Phi outside the core's range (-12 to 14) is refused by the same check the file passes.
        let e = Typed::GrainBase.read("20phi", &mut sand.clone(), unit).expect_err("phi range");
        assert!(e.starts_with("Grain at base:") && e.contains("between -12 and 14"), "{e}");
        // A grain size given to a bed needing one with none at the other end fills both.
        let mut bare = sand.clone();
        (bare.grain_base, bare.grain_top) = (None, None);
        Typed::GrainTop.read("vf", &mut bare, unit).expect("a class");
        assert_eq!(bare.grain_base, Some(GrainSize::Class(WentworthClass::VeryFineSand)));
        let mut b = sand.clone();
        Typed::Samples.read(" CW-1; ;CW-2 ", &mut b, unit).expect("samples");
        assert_eq!(aggrade_core::model::shorthand::samples_code(&b.samples), "CW-1; CW-2");
        let mut b = sand.clone();
        Typed::Relief.read("40cm", &mut b, unit).expect("relief");
        assert_eq!(b.base_relief_m, Some(0.4));
        assert!(Typed::Relief.read("-1", &mut b, unit).is_err());
        // The stored form reads back to the same value.
        let mut b = sand.clone();
        b.paleocurrents = [12.5, 300.0].into_iter().map(aggrade_core::model::Paleocurrent::azimuth).collect();
        let shown = Typed::Paleocurrents.stored(&b, unit);
        let mut again = sand.clone();
        Typed::Paleocurrents.read(&shown, &mut again, unit).expect("reads back");
        assert_eq!(again.paleocurrents, b.paleocurrents);
    }

    #[test]
    fn choosing_a_lithology_that_needs_a_grain_size_uses_the_typed_one_or_waits_for_it() {
        let unit = LengthUnit::Metre;
        let covered = Bed::new(BedId(2), 1.0, Lithology::Covered, None);
        let mut fields = BedFields::new((0, covered.id), &covered, unit);
        let e = with_lithology(&covered, Lithology::Sandstone, &fields, unit).expect_err("no grain yet");
        assert!(e.contains("needs a grain size"), "{e}");
        fields.get(Typed::GrainBase).text = "m".into();
        let b = with_lithology(&covered, Lithology::Sandstone, &fields, unit).expect("grain typed first");
        assert_eq!(
            (b.grain_base, b.grain_top),
            (Some(GrainSize::Class(WentworthClass::MediumSand)), b.grain_base)
        );
        // Back to covered: the grain sizes go (undo brings them back).
        let c = with_lithology(&b, Lithology::Covered, &fields, unit).expect("covered");
        assert_eq!((c.grain_base, c.grain_top), (None, None));
    }

    #[test]
    fn azimuths_are_checked_by_the_notations_reader() {
        let unit = LengthUnit::Metre;
        let mut b =
            Bed::new(BedId(1), 1.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)));
        Typed::Paleocurrents.read("120; 135,140 0 360", &mut b, unit).expect("five azimuths");
        assert_eq!(b.azimuths().collect::<Vec<_>>(), vec![120.0, 135.0, 140.0, 0.0, 360.0]);
        for bad in ["400", "north"] {
            let e = Typed::Paleocurrents.read(bad, &mut b, unit).expect_err(bad);
            assert!(e.starts_with("Paleocurrents (°):") && e.contains("0–360"), "{e}");
        }
        assert_eq!(roman(4), "IV");
    }
}
