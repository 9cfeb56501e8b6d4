//! The inspector: every field of the selected bed, edited on a copy that is sent as one edit.
//!
//! Number and list fields (thickness, slope distance, grain sizes, relief, paleocurrents, sample
//! heights, Munsell colour, soil horizon, the surface name, a fossil name being added) are
//! committed fields ([`super::field`]): read as a whole when the typing ends, kept as
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

mod groups;
mod record;

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::field::{committed_field, problem_label, FieldLook, FieldText};
use super::table::{parse_length, parse_thickness, show_length};
use super::theme;
use aggrade_core::io::limits::MAX_STRING_CHARS;
use aggrade_core::io::MAX_BED_THICKNESS_M;
use aggrade_core::model::shorthand;
use aggrade_core::model::{
    BaseRank, Bed, BedId, Contact, GrainSize, GrainSizeRule, LengthUnit, Lithology, Munsell, Section,
    SoilHorizon,
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
    SurfaceName,
    Munsell,
    SoilHorizon,
    SlopeDistance,
    /// A trace fossil's name being added to the list.
    TraceFossil,
    /// A body fossil's name being added to the list.
    BodyFossil,
}

/// How many typed fields a bed has.
const TYPED: usize = 11;

/// What reading a typed field needs besides its text: the section's display unit and, for the
/// slope distance, the section's traverse and bedding.
#[derive(Debug, Clone, Copy)]
struct At<'a> {
    unit: LengthUnit,
    section: Option<&'a Section>,
}

impl From<LengthUnit> for At<'_> {
    fn from(unit: LengthUnit) -> Self {
        At { unit, section: None }
    }
}

impl Typed {
    const ALL: [Typed; TYPED] = [
        Typed::Thickness,
        Typed::GrainBase,
        Typed::GrainTop,
        Typed::Relief,
        Typed::Paleocurrents,
        Typed::SurfaceName,
        Typed::Munsell,
        Typed::SoilHorizon,
        Typed::SlopeDistance,
        Typed::TraceFossil,
        Typed::BodyFossil,
    ];

    /// The field's label in the inspector (and in its messages).
    fn label(self) -> &'static str {
        match self {
            Typed::Thickness => "Thickness",
            Typed::GrainBase => "Grain at base",
            Typed::GrainTop => "Grain at top",
            Typed::Relief => "Erosional relief",
            Typed::Paleocurrents => "Paleocurrents (°)",
            Typed::SurfaceName => "Surface name",
            Typed::Munsell => "Munsell colour",
            Typed::SoilHorizon => "Soil horizon",
            Typed::SlopeDistance => "Slope distance",
            Typed::TraceFossil => "Add a trace fossil",
            Typed::BodyFossil => "Add a body fossil",
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
            Typed::SurfaceName => "base_surface.name",
            Typed::Munsell => "munsell",
            Typed::SoilHorizon => "soil_horizon",
            Typed::SlopeDistance => "slope_distance_m",
            Typed::TraceFossil => "trace_fossils",
            Typed::BodyFossil => "body_fossils",
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
            Typed::SurfaceName => bed.base_surface.as_ref().map(|s| s.name.clone()).unwrap_or_default(),
            Typed::Munsell => bed.munsell.as_ref().map(|m| m.to_string()).unwrap_or_default(),
            Typed::SoilHorizon => bed.soil_horizon.as_ref().map(|h| h.to_string()).unwrap_or_default(),
            Typed::SlopeDistance => bed.slope_distance_m.map(|d| show_length(d, unit)).unwrap_or_default(),
            // A name is added, then the field is empty for the next one.
            Typed::TraceFossil | Typed::BodyFossil => String::new(),
        }
    }

    /// Read the whole text into `bed`, or say (naming the field) why it cannot be read and what
    /// would be valid. The bed is then checked by the same validation a saved file passes, so
    /// nothing is stored that would not open again.
    fn read<'a>(self, text: &str, bed: &mut Bed, at: impl Into<At<'a>>) -> Result<(), String> {
        let at = at.into();
        let unit = at.unit;
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
            Typed::Munsell => {
                bed.munsell = if text.trim().is_empty() {
                    None
                } else {
                    Some(Munsell::parse(text).map_err(|e| format!("{label}: {e}"))?)
                };
            }
            Typed::SoilHorizon => {
                bed.soil_horizon = if text.trim().is_empty() {
                    None
                } else {
                    Some(SoilHorizon::parse(text).map_err(|e| format!("{label}: {e}"))?)
                };
            }
            Typed::SlopeDistance => {
                if text.trim().is_empty() {
                    bed.slope_distance_m = None;
                } else {
                    let d = parse_length(text, unit).filter(|d| *d > 0.0 && *d <= MAX_BED_THICKNESS_M).ok_or_else(
                        || {
                            format!(
                                "{label}: {text:?} is not a distance greater than 0 and at most {MAX_BED_THICKNESS_M} m (e.g. 2.4, 240cm); empty for none"
                            )
                        },
                    )?;
                    bed.slope_distance_m = Some(d);
                    // The thickness follows when the section's traverse and bedding give it;
                    // otherwise the inspector says what is missing and the thickness stays.
                    if let Some(Ok(t)) = at.section.map(|s| record::true_thickness(d, s)) {
                        if t.is_finite() && t > 0.0 {
                            bed.thickness_m = t;
                        }
                    }
                }
            }
            Typed::TraceFossil => {
                record::add_name(&mut bed.trace_fossils, text);
            }
            Typed::BodyFossil => {
                record::add_name(&mut bed.body_fossils, text);
            }
        }
        check_bed(bed, Some(self))
    }
}

/// A field of one sample or photo of a bed's lists, committed as a whole value like the typed
/// fields (an id may not be empty or repeat another's; a height lies within the bed).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
enum Row {
    SampleId,
    SampleHeight,
    PhotoReference,
}

impl Row {
    /// The field's name in messages, for the list entry `k`.
    fn label(self, k: usize) -> String {
        match self {
            Row::SampleId => format!("Sample {} id", k + 1),
            Row::SampleHeight => sample_height_label(k),
            Row::PhotoReference => format!("Photo {} reference", k + 1),
        }
    }

    /// The stored value of entry `k` as the field shows it.
    fn stored(self, bed: &Bed, k: usize, unit: LengthUnit) -> String {
        match self {
            Row::SampleId => bed.samples.get(k).map(|s| s.id.clone()),
            Row::SampleHeight => {
                bed.samples.get(k).and_then(|s| s.height_in_bed_m).map(|h| show_length(h, unit))
            }
            Row::PhotoReference => bed.photos.get(k).map(|p| p.reference.clone()),
        }
        .unwrap_or_default()
    }

    /// Read the whole text into entry `k` of `bed`, checked as a saved file is.
    fn read(self, text: &str, bed: &mut Bed, k: usize, unit: LengthUnit) -> Result<(), String> {
        let label = self.label(k);
        let gone = || format!("{label}: the entry is no longer listed on this bed");
        match self {
            Row::SampleHeight => return read_sample_height(text, bed, k, unit),
            Row::SampleId => {
                let t = text.trim();
                if t.is_empty() {
                    return Err(format!("{label}: write the label on the bag (e.g. SC-14)"));
                }
                if bed.samples.iter().enumerate().any(|(i, s)| i != k && s.id.trim() == t) {
                    return Err(format!("{label}: {t:?} is already the id of another sample of this bed"));
                }
                bed.samples.get_mut(k).ok_or_else(gone)?.id = t.to_string();
            }
            Row::PhotoReference => {
                let t = text.trim();
                if t.is_empty() {
                    return Err(format!("{label}: give the camera's file name or number (e.g. IMG_2041)"));
                }
                bed.photos.get_mut(k).ok_or_else(gone)?.reference = t.to_string();
            }
        }
        check_bed(bed, None).map_err(|e| format!("{label}: {e}"))
    }
}

/// Read the height of sample `k` above the bed's base, typed in the display unit; empty for none.
fn read_sample_height(text: &str, bed: &mut Bed, k: usize, unit: LengthUnit) -> Result<(), String> {
    let label = sample_height_label(k);
    let thickness = bed.thickness_m;
    let Some(sample) = bed.samples.get_mut(k) else {
        return Err(format!("{label}: the sample is no longer listed on this bed"));
    };
    sample.height_in_bed_m = if text.trim().is_empty() {
        None
    } else {
        match parse_length(text, unit) {
            Some(h) if (0.0..=thickness + 1e-9).contains(&h) => Some(h.min(thickness)),
            _ => {
                return Err(format!(
                    "{label}: {text:?} is not a height from 0 to {} above the bed's base (e.g. 0.4, 40cm); empty for none",
                    unit.length(thickness)
                ))
            }
        }
    };
    check_bed(bed, None)
}

fn sample_height_label(k: usize) -> String {
    format!("Height in bed of sample {}", k + 1)
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
    texts: [FieldText; TYPED],
    /// The fields of the samples and photos, by field and place in the bed's list.
    rows: BTreeMap<(Row, usize), FieldText>,
}

impl BedFields {
    fn new(key: (usize, BedId), bed: &Bed, unit: LengthUnit) -> Self {
        BedFields {
            key,
            texts: Typed::ALL.map(|f| FieldText::new(&f.stored(bed, unit))),
            rows: BTreeMap::new(),
        }
    }

    fn get(&mut self, f: Typed) -> &mut FieldText {
        &mut self.texts[f as usize]
    }

    fn has_problem(&self) -> bool {
        self.texts.iter().chain(self.rows.values()).any(|t| t.problem.is_some())
    }

    fn has_uncommitted(&self) -> bool {
        self.texts.iter().chain(self.rows.values()).any(FieldText::is_uncommitted)
    }

    /// Every field with its label (the typed fields, then the samples' and photos').
    fn entries(&self) -> Vec<(String, &FieldText)> {
        let typed = Typed::ALL.iter().zip(&self.texts).map(|(f, t)| (f.label().to_string(), t));
        typed.chain(self.rows.iter().map(|((r, k), t)| (r.label(*k), t))).collect()
    }

    /// Entry `k` of a list was taken off: the fields of the entries after it move up.
    fn entry_removed(&mut self, of: &[Row], k: usize) {
        let old = std::mem::take(&mut self.rows);
        self.rows = old
            .into_iter()
            .filter(|((r, i), _)| !(of.contains(r) && *i == k))
            .map(|((r, i), t)| if of.contains(&r) && i > k { ((r, i - 1), t) } else { ((r, i), t) })
            .collect();
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
    /// What happened when a photo was asked to open (a file that is not there).
    photo_note: Option<String>,
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
            for (label, t) in fields.entries() {
                if t.problem.is_some() {
                    out.push(format!("{place}: {label} {:?}", t.text));
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
            let at = At { unit, section: Some(doc.section()) };
            for f in Typed::ALL {
                let t = fields.get(f);
                if t.is_uncommitted() && t.problem.is_none() {
                    let text = t.text.clone();
                    match f.read(&text, &mut bed, at) {
                        Ok(()) => read.push(f),
                        Err(e) => fields.get(f).problem = Some(e),
                    }
                }
            }
            let mut rows_read = Vec::new();
            for ((r, k), t) in fields.rows.iter_mut() {
                if t.is_uncommitted() && t.problem.is_none() {
                    match r.read(&t.text.clone(), &mut bed, *k, unit) {
                        Ok(()) => rows_read.push((*r, *k)),
                        Err(e) => t.problem = Some(e),
                    }
                }
            }
            if bed != *orig && check_bed(&bed, None).is_ok() {
                out.edit(Edit::ReplaceBed { bed });
                // Stored: the field follows the stored value again when the bed is shown.
                for f in read {
                    fields.get(f).revert();
                }
                for key in rows_read {
                    fields.rows.remove(&key);
                }
            }
        }
        if fields.has_problem() || (stored.is_none() && fields.has_uncommitted()) {
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
            for (label, t) in fields.entries() {
                if !t.is_uncommitted() {
                    continue;
                }
                egui::Frame::group(ui.style()).stroke(egui::Stroke::new(1.0, super::field::INVALID)).show(
                    ui,
                    |ui| {
                        ui.label(
                            egui::RichText::new(format!("{place}: {label} {:?} was not stored", t.text))
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
        let Some(fields) = self.fields.take() else { return };
        let index = doc.bed_index(orig.id).unwrap_or(0);
        let base_h = doc.heights().base_m.get(index).copied().unwrap_or(0.0);
        let mut form = Form {
            cx: FieldCtx { key, unit, orig: &orig, section: doc.section() },
            fields,
            bed: orig.clone(),
            live: None,
            committed: false,
        };
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
            self.main_grid(ui, &mut form);
            form.readings(ui);
            form.facies(ui);
            form.colour(ui);
            form.samples_and_photos(ui, doc, &mut self.photo_note);
            form.fossils(ui);
            form.structures(ui);
            form.paleosol(ui);
            form.surface(ui);
            form.notes(ui);
        });
        let Form { fields, bed, live, committed, .. } = form;
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
            match (live, committed) {
                (Some(field), false) => out.edit_in(edit, gesture_key(("inspector", bed.id.0, field))),
                _ => out.edit(edit),
            }
        }
    }

    /// The bed's first fields: its thickness and rock, its base and its paleocurrents.
    fn main_grid(&mut self, ui: &mut egui::Ui, form: &mut Form<'_>) {
        let unit = form.cx.unit;
        egui::Grid::new("bed_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
            let lab = ui.label(Typed::Thickness.label()).id;
            form.show(ui, lab, Typed::Thickness, FieldLook { hint: &format!("e.g. 1.25 ({})", unit.name()), tip: "Bed thickness in the section's display unit; add cm, m or ft to type another unit. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
            ui.end_row();
            form.problem_row(ui, Typed::Thickness);

            let lab = ui.label(Typed::SlopeDistance.label()).id;
            form.show(ui, lab, Typed::SlopeDistance, FieldLook { hint: "taped along the ground", tip: "The distance measured along the ground across this bed, in the display unit. With the section's traverse and bedding attitude (Section details) it gives the bed's true thickness. Stored when you press Enter or leave the field; empty for none", width: 170.0, char_limit: MAX_STRING_CHARS });
            ui.end_row();
            form.problem_row(ui, Typed::SlopeDistance);
            if let Some(d) = form.bed.slope_distance_m {
                let note = match record::true_thickness(d, form.cx.section) {
                    Ok(t) => format!("True thickness from it: {}", unit.length(t)),
                    Err(why) => format!("Thickness not worked out: {why}"),
                };
                ui.label("");
                ui.add(egui::Label::new(egui::RichText::new(note).small().color(theme::TEXT_DIM)).wrap());
                ui.end_row();
            }

            let label = ui.label("Lithology").id;
            let mut lith = form.bed.lithology;
            if combo(ui, label, "lith", &mut lith, &Lithology::ALL, |l| l.name(), "Rock type of the bed") {
                match with_lithology(&form.bed, lith, &form.fields, unit) {
                    Ok(b) => {
                        form.bed = b;
                        self.problem = None;
                        for f in [Typed::GrainBase, Typed::GrainTop] {
                            form.fields.get(f).problem = None;
                            form.fields.get(f).revert();
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
                form.show(ui, lab, f, FieldLook { hint: "e.g. m, fine sand, 0.3mm", tip: "Wentworth class (or first letters), or a measured size in mm or phi; empty for none. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
                ui.end_row();
                form.problem_row(ui, f);
            }

            let label = ui.label("Basal contact").id;
            combo(ui, label, "contact", &mut form.bed.base_contact, Contact::ALL, |c| c.name(), "Nature of the bed's base");
            ui.end_row();

            let label = ui.label("Base rank").id;
            let ranks = [None, Some(BaseRank::StoreySurface), Some(BaseRank::BodyBase), Some(BaseRank::WithinStorey)];
            combo(ui, label, "base_rank", &mut form.bed.base_rank, &ranks, |r| r.map_or("rules decide", BaseRank::name), "Your rank for this base: a storey surface or a channel-body base starts a new storey (and body); within storey makes it a scour. Overrides the rules");
            ui.end_row();

            let lab = ui.label(Typed::Relief.label()).id;
            let mut has = form.bed.base_relief_m.is_some();
            ui.horizontal(|ui| {
                if ui.checkbox(&mut has, "").labelled_by(lab).on_hover_text("Relief measured at the base").changed() {
                    form.bed.base_relief_m = has.then_some(0.1);
                    form.fields.get(Typed::Relief).revert();
                }
                if form.bed.base_relief_m.is_some() {
                    form.show(ui, lab, Typed::Relief, FieldLook { hint: "e.g. 0.4", tip: "Erosional relief at the bed's base in the section's display unit (0 or more)", width: 110.0, char_limit: MAX_STRING_CHARS });
                }
            });
            ui.end_row();
            form.problem_row(ui, Typed::Relief);

            let lab = ui.label("Lag composition").id;
            form.live_text(ui, lab, "lag", 0, |b| &mut b.lag_composition, "e.g. quartzite pebbles, mud clasts", "What the clasts of a basal lag are made of");
            ui.end_row();

            let lab = ui.label(Typed::Paleocurrents.label()).id;
            form.show(ui, lab, Typed::Paleocurrents, FieldLook { hint: "e.g. 210t 185p/22 40a/12", tip: "Azimuths 0–360° as measured, separated by spaces or ;, each with an optional indicator code (t trough axis, p planar foreset, r ripple, i imbrication, pl parting lineation, f flute cast, g groove cast, a accretion surface) and /dip. Stored when you press Enter or leave the field", width: 170.0, char_limit: MAX_STRING_CHARS });
            ui.end_row();
            form.problem_row(ui, Typed::Paleocurrents);
        });
    }
}

/// The bed being edited in one frame: its typed fields, the copy that becomes the edit, and
/// how it changed.
struct Form<'a> {
    cx: FieldCtx<'a>,
    fields: BedFields,
    /// The bed as edited this frame (compared with the stored bed at the end).
    bed: Bed,
    /// A live text field changed (one undo step per typing run): its name and place in a list.
    live: Option<(&'static str, usize)>,
    /// A committed field was read.
    committed: bool,
}

impl Form<'_> {
    /// A committed field (see [`FieldCtx::show`]).
    fn show(&mut self, ui: &mut egui::Ui, label: egui::Id, f: Typed, look: FieldLook<'_>) {
        self.committed |= self.cx.show(ui, label, f, &mut self.fields, &mut self.bed, look);
    }

    /// The problem of a committed field, on a grid row of its own right under the field.
    fn problem_row(&self, ui: &mut egui::Ui, f: Typed) {
        problem_row(ui, &self.fields, f);
    }

    /// A free text stored as typed (each keystroke a whole value, one undo step per typing run).
    #[allow(clippy::too_many_arguments)]
    fn live_text(
        &mut self,
        ui: &mut egui::Ui,
        label: egui::Id,
        name: &'static str,
        place: usize,
        text: impl FnOnce(&mut Bed) -> &mut String,
        hint: &str,
        tip: &str,
    ) {
        let id = egui::Id::unique(("inspector_live", name, place, self.cx.key));
        let t = text(&mut self.bed);
        if ui
            .add(
                egui::TextEdit::singleline(t)
                    .id(id)
                    .hint_text(hint)
                    .desired_width(170.0)
                    .char_limit(MAX_STRING_CHARS),
            )
            .labelled_by(label)
            .on_hover_text(tip)
            .changed()
        {
            self.live = Some((name, place));
        }
    }
}

/// What a committed field of the inspector needs to know about the bed on show.
struct FieldCtx<'a> {
    key: (usize, BedId),
    unit: LengthUnit,
    /// The bed as stored.
    orig: &'a Bed,
    /// Its section (the traverse and bedding a slope distance is read with).
    section: &'a Section,
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
        let at = At { unit: self.unit, section: Some(self.section) };
        let (r, value) = committed_field(ui, id, fields.get(f), &stored, look, |text| {
            f.read(text, &mut candidate, at).map(|_| candidate)
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

    /// A field of entry `k` of the bed's samples or photos.
    fn show_row(
        &self,
        ui: &mut egui::Ui,
        row: Row,
        k: usize,
        fields: &mut BedFields,
        bed: &mut Bed,
        look: FieldLook<'_>,
    ) -> (egui::Response, bool) {
        let id = egui::Id::unique(("inspector_row", row, k, self.key));
        let stored = row.stored(self.orig, k, self.unit);
        let state = fields.rows.entry((row, k)).or_insert_with(|| FieldText::new(&stored));
        let mut candidate = bed.clone();
        let unit = self.unit;
        let (r, value) = committed_field(ui, id, state, &stored, look, |text| {
            row.read(text, &mut candidate, k, unit).map(|_| candidate)
        });
        match value {
            Some(b) => {
                *bed = b;
                (r, true)
            }
            None => (r, false),
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
            assert!(e.starts_with("Paleocurrents (°):") && e.contains("0 to 360°"), "{e}");
        }
        assert_eq!(roman(4), "IV");
    }

    #[test]
    fn the_field_records_values_read_whole_or_are_refused_naming_the_field() {
        use aggrade_core::model::{BeddingAttitude, Traverse};
        let unit = LengthUnit::Metre;
        let sand =
            Bed::new(BedId(1), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)));
        // Munsell notation as on the Munsell Soil Color Charts: hue value/chroma.
        let mut b = sand.clone();
        Typed::Munsell.read("10yr 5/4", &mut b, unit).expect("a notation");
        assert_eq!(Typed::Munsell.stored(&b, unit), "10YR 5/4");
        let e = Typed::Munsell.read("brownish", &mut b, unit).expect_err("words");
        assert!(e.starts_with("Munsell colour:") && e.contains("10YR 5/4"), "{e}");
        Typed::Munsell.read(" ", &mut b, unit).expect("empty for none");
        assert_eq!(b.munsell, None);
        // Horizon designations after the Soil Survey Staff (Keys to Soil Taxonomy).
        Typed::SoilHorizon.read("Bk2", &mut b, unit).expect("a horizon");
        assert_eq!(b.soil_horizon.as_ref().map(|h| h.as_str()), Some("Bk2"));
        assert!(Typed::SoilHorizon.read("bt", &mut b, unit).expect_err("case").starts_with("Soil horizon:"));
        // Fossil names are added once, and the field is empty again for the next.
        Typed::TraceFossil.read(" Skolithos ", &mut b, unit).expect("a name");
        Typed::TraceFossil.read("skolithos", &mut b, unit).expect("again");
        assert_eq!(b.trace_fossils, ["Skolithos"]);
        assert_eq!(Typed::TraceFossil.stored(&b, unit), "");
        // A slope distance with no traverse or bedding is kept; the thickness stays.
        let mut s = Section::new("t");
        let mut b = sand.clone();
        Typed::SlopeDistance.read("4", &mut b, At { unit, section: Some(&s) }).expect("a distance");
        assert_eq!((b.slope_distance_m, b.thickness_m), (Some(4.0), 2.0));
        assert!(Typed::SlopeDistance.read("-1", &mut b, unit).is_err());
        // With both, the true thickness follows. Flat ground, walking down the dip direction of
        // beds dipping 30°: t = s·sin 30° (Compton 1985).
        s.traverse = Some(Traverse { bearing_deg: 90.0, slope_deg: 0.0 });
        s.bedding = Some(BeddingAttitude { dip_deg: 30.0, dip_direction_deg: 90.0 });
        Typed::SlopeDistance.read("4", &mut b, At { unit, section: Some(&s) }).expect("a distance");
        assert!((b.thickness_m - 2.0).abs() < 1e-9 && b.slope_distance_m == Some(4.0), "{}", b.thickness_m);
        Typed::SlopeDistance.read("3", &mut b, At { unit, section: Some(&s) }).expect("a distance");
        assert!((b.thickness_m - 1.5).abs() < 1e-9, "{}", b.thickness_m);
        // A sample's height lies within its bed.
        let mut b = sand.clone();
        b.samples.push(aggrade_core::model::Sample::labelled("CW-1"));
        read_sample_height("40cm", &mut b, 0, unit).expect("inside");
        assert_eq!(b.samples[0].height_in_bed_m, Some(0.4));
        let e = read_sample_height("2.5", &mut b, 0, unit).expect_err("above the top");
        assert!(e.starts_with("Height in bed of sample 1:") && e.contains("2.00 m"), "{e}");
    }
}
