//! The bed table with a keyboard entry row: type a thickness, the first letters of a lithology
//! and of a grain size, Tab across, Enter adds the bed above the selected one (or on top).

use super::actions::Actions;
use super::document::{Document, Edit};
use super::field::{mark_invalid, problem_label};
use super::theme;
use aggrade_core::io::limits::MAX_STRING_CHARS;
use aggrade_core::io::MAX_BED_THICKNESS_M;
use aggrade_core::model::{BaseRank, Bed, BedId, GrainSize, LengthUnit, Lithology, WentworthClass};

/// The fields of the entry row.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum EntryField {
    Thickness,
    Lithology,
    Grain,
}

/// Text typed into the entry row.
#[derive(Debug, Default)]
pub struct BedTable {
    pub thickness: String,
    pub lithology: String,
    pub grain: String,
    focus_thickness: bool,
    /// Last problem with the entry row, shown under it.
    pub problem: Option<String>,
    /// The entry field the problem is in (framed in red until the row is added).
    problem_field: Option<EntryField>,
    /// The selection the table last showed: a selection made elsewhere (canvas, review list)
    /// scrolls the table to its row.
    last_selected: Option<BedId>,
    /// Rows shown in the last frame.
    visible_rows: std::ops::Range<usize>,
}

impl BedTable {
    /// Rows (0 = top of the section) the table showed in the last frame.
    pub fn rows_shown(&self) -> std::ops::Range<usize> {
        self.visible_rows.clone()
    }
}

/// Scroll offset (points) that puts `row` a few rows below the top of the table, if it is not
/// among the rows shown; `None` when it is already in view.
pub fn follow_offset(row: usize, visible: &std::ops::Range<usize>, row_pitch: f32) -> Option<f32> {
    (!visible.contains(&row)).then(|| (row.saturating_sub(3) as f32 * row_pitch).max(0.0))
}

/// The lithology whose name starts with the typed letters (first in vocabulary order).
pub fn lithology_from_prefix(text: &str) -> Option<Lithology> {
    let t = text.trim().to_lowercase();
    if t.is_empty() {
        return None;
    }
    Lithology::parse(&t).or_else(|| Lithology::ALL.iter().copied().find(|l| l.name().starts_with(&t)))
}

/// A grain size from a short label (`vf`, `m`), a class-name prefix, or a value with mm / phi.
pub fn grain_from_prefix(text: &str) -> Option<GrainSize> {
    let t = text.trim().to_lowercase();
    if t.is_empty() {
        return None;
    }
    if let Some(c) = WentworthClass::ALL.iter().copied().find(|c| c.short_label() == t) {
        return Some(GrainSize::Class(c));
    }
    if let Ok(g) = GrainSize::parse(&t) {
        return Some(g);
    }
    WentworthClass::ALL.iter().copied().find(|c| c.name().starts_with(&t)).map(GrainSize::Class)
}

/// A length typed in the section's unit (a trailing m, cm or ft overrides it), in metres; `None`
/// when the text is not a finite number.
pub fn parse_length(text: &str, unit: LengthUnit) -> Option<f64> {
    let t = text.trim().replace(',', ".");
    let (num, unit) = if let Some(n) = t.strip_suffix("cm") {
        (n, LengthUnit::Centimetre)
    } else if let Some(n) = t.strip_suffix("ft") {
        (n, LengthUnit::Foot)
    } else if let Some(n) = t.strip_suffix('m') {
        (n, LengthUnit::Metre)
    } else {
        (t.as_str(), unit)
    };
    num.trim().parse::<f64>().ok().filter(|v| v.is_finite()).map(|v| unit.to_metres(v))
}

/// Parse a thickness typed in the section's unit (a trailing m, cm or ft overrides it): greater
/// than 0 and at most the core's largest bed thickness.
pub fn parse_thickness(text: &str, unit: LengthUnit) -> Result<f64, String> {
    match parse_length(text, unit) {
        Some(v) if v > 0.0 && v <= MAX_BED_THICKNESS_M => Ok(v),
        _ => Err(format!(
            "thickness {text:?} is not a number greater than 0 and at most {MAX_BED_THICKNESS_M} m (e.g. 1.25, 40cm, 3ft)"
        )),
    }
}

/// A number in the section's display unit, without trailing zeros.
pub fn show_length(m: f64, unit: LengthUnit) -> String {
    let v = unit.from_metres(m);
    let s = format!("{v:.3}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

impl BedTable {
    /// Draw the entry row and the table.
    pub fn ui(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let unit = doc.section().display_unit;
        ui.horizontal(|ui| {
            ui.strong("New bed");
            ui.label(
                egui::RichText::new("Tab across · Enter adds above the selection")
                    .small()
                    .color(theme::TEXT_DIM),
            );
        });
        let mut enter = false;
        ui.horizontal(|ui| {
            let w = ui.available_width();
            let r = ui.add(
                egui::TextEdit::singleline(&mut self.thickness)
                    .id_salt("entry_thickness")
                    .char_limit(MAX_STRING_CHARS)
                    .hint_text(format!("thickness ({})", unit.name()))
                    .desired_width(w * 0.31),
            );
            let r = r.on_hover_text("Thickness in the section's unit; add cm, m or ft to type another unit");
            if self.focus_thickness {
                r.request_focus();
                self.focus_thickness = false;
            }
            self.mark(ui, &r, EntryField::Thickness);
            enter |= r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            let r = ui
                .add(
                    egui::TextEdit::singleline(&mut self.lithology)
                        .id_salt("entry_lithology")
                        .char_limit(MAX_STRING_CHARS)
                        .hint_text("lithology")
                        .desired_width(w * 0.27),
                )
                .on_hover_text(
                    "First letters of a lithology: sa = sandstone, mu = mudstone, co = conglomerate…",
                );
            self.mark(ui, &r, EntryField::Lithology);
            enter |= r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            let r = ui
                .add(
                    egui::TextEdit::singleline(&mut self.grain)
                        .id_salt("entry_grain")
                        .char_limit(MAX_STRING_CHARS)
                        .hint_text("grain")
                        .desired_width(w * 0.18),
                )
                .on_hover_text("Grain size: vf, f, m, c, vc, si, cl, gr, pb…, a class name, or 0.3mm / 2phi");
            self.mark(ui, &r, EntryField::Grain);
            enter |= r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            if ui.button("Add").on_hover_text("Add this bed above the selected bed (Enter)").clicked() {
                enter = true;
            }
        });
        // Live reading of what was typed.
        let lith = lithology_from_prefix(&self.lithology);
        let grain = grain_from_prefix(&self.grain);
        let preview = format!(
            "reads as: {} · {}",
            lith.map(|l| l.name()).unwrap_or("?"),
            grain.map(|g| g.to_string()).unwrap_or_else(|| "no grain size".into())
        );
        ui.label(egui::RichText::new(preview).small().color(theme::TEXT_DIM));
        if enter {
            self.commit(doc, out);
        }
        if let Some(p) = &self.problem {
            problem_label(ui, p);
        }
        ui.separator();
        self.table(ui, doc, out);
    }

    /// Frame an entry field in red while the row's problem is in it.
    fn mark(&self, ui: &egui::Ui, r: &egui::Response, field: EntryField) {
        if self.problem.is_some() && self.problem_field == Some(field) {
            mark_invalid(ui, r.rect);
        }
    }

    /// Read the whole row: the new bed, or the field at fault and why (naming it and what is
    /// valid). The typed text stays in the row until a bed is added.
    fn read_row(&self, unit: LengthUnit) -> Result<Bed, (EntryField, String)> {
        let thickness = parse_thickness(&self.thickness, unit).map_err(|e| (EntryField::Thickness, e))?;
        let Some(lith) = lithology_from_prefix(&self.lithology) else {
            return Err((
                EntryField::Lithology,
                format!(
                    "lithology {:?} is not known; valid: {}",
                    self.lithology,
                    Lithology::ALL.map(|l| l.name()).join(", ")
                ),
            ));
        };
        let grain = if lith == Lithology::Covered { None } else { grain_from_prefix(&self.grain) };
        if grain.is_none() && !self.grain.trim().is_empty() && lith != Lithology::Covered {
            return Err((
                EntryField::Grain,
                format!("grain size {:?} is not known (try vf, f, m, c, 0.3mm, 2phi)", self.grain),
            ));
        }
        let bed = Bed::new(BedId(0), thickness, lith, grain);
        // The checks a saved file passes (a sandstone needs a grain size, phi within range…).
        let mut s = aggrade_core::model::Section::new("entry row");
        s.beds.push(bed.clone());
        if let Some(p) = aggrade_core::io::validate_section(&s).first() {
            let field = if p.location.contains("grain") { EntryField::Grain } else { EntryField::Thickness };
            let what = p.location.strip_prefix("beds[0].").unwrap_or(&p.location).replace('_', " ");
            return Err((field, format!("{what}: {}", p.message)));
        }
        Ok(bed)
    }

    fn commit(&mut self, doc: &Document, out: &mut Actions) {
        let unit = doc.section().display_unit;
        let bed = match self.read_row(unit) {
            Ok(b) => b,
            Err((field, why)) => {
                self.problem = Some(why);
                self.problem_field = Some(field);
                return;
            }
        };
        let index = doc
            .selected_bed
            .and_then(|id| doc.bed_index(id))
            .map(|i| i + 1)
            .unwrap_or(doc.section().beds.len());
        out.edit(Edit::InsertBed { index, bed });
        self.thickness.clear();
        self.lithology.clear();
        self.grain.clear();
        self.problem = None;
        self.problem_field = None;
        self.focus_thickness = true;
    }

    fn table(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let s = doc.section();
        let unit = s.display_unit;
        let n = s.beds.len();
        let heights = s.base_heights_m();
        let row_h = 22.0;
        // Column left edges as fractions of the row; numbers are right-aligned to the next edge.
        let cols = [0.0f32, 0.11, 0.30, 0.48, 0.80, 1.0];
        let top_label = format!("top ({})", unit.name());
        let header = ["#", top_label.as_str(), "thick.", "lithology", "grain"];
        let (hrect, _) = ui.allocate_exact_size(egui::vec2(ui.available_width(), 18.0), egui::Sense::hover());
        let font = egui::FontId::proportional(11.5);
        for (k, name) in header.iter().enumerate() {
            let numeric = (1..=2).contains(&k);
            let x = if numeric {
                hrect.left() + cols[k + 1] * hrect.width() - 8.0
            } else {
                hrect.left() + cols[k] * hrect.width() + 4.0
            };
            let align = if numeric { egui::Align2::RIGHT_CENTER } else { egui::Align2::LEFT_CENTER };
            ui.painter().text(egui::pos2(x, hrect.center().y), align, *name, font.clone(), theme::TEXT_DIM);
        }
        let mut area =
            egui::ScrollArea::vertical().id_salt("bed_table").auto_shrink([false, false]).animated(false);
        if doc.selected_bed != self.last_selected {
            self.last_selected = doc.selected_bed;
            let row = doc.selected_bed.and_then(|id| doc.bed_index(id)).map(|i| n - 1 - i);
            let pitch = row_h + ui.spacing().item_spacing.y;
            if let Some(offset) = row.and_then(|r| follow_offset(r, &self.visible_rows, pitch)) {
                // Never past the end (the area would spring back over several frames).
                let max = (n as f32 * pitch - ui.available_height()).max(0.0);
                area = area.vertical_scroll_offset(offset.min(max));
            }
        }
        area.show_rows(ui, row_h, n, |ui, range| {
            self.visible_rows = range.clone();
            for row in range {
                // Top of the section first.
                let i = n - 1 - row;
                let b = &s.beds[i];
                let selected = doc.selected_bed == Some(b.id);
                let top = heights[i] + b.thickness_m;
                let grain = match (b.grain_base, b.grain_top) {
                    (Some(a), Some(t)) if a != t => format!("{} → {}", short(a), short(t)),
                    (Some(a), _) => short(a),
                    (None, _) => "—".into(),
                };
                let (rect, r) =
                    ui.allocate_exact_size(egui::vec2(ui.available_width(), row_h), egui::Sense::click());
                let bg = if selected {
                    theme::SELECT_FILL
                } else if r.hovered() {
                    egui::Color32::from_gray(234)
                } else if row % 2 == 1 {
                    egui::Color32::from_gray(241)
                } else {
                    egui::Color32::TRANSPARENT
                };
                let p = ui.painter();
                p.rect_filled(rect, 2.0, bg);
                if selected {
                    p.rect_filled(
                        egui::Rect::from_min_size(rect.min, egui::vec2(3.0, rect.height())),
                        0.0,
                        theme::ACCENT,
                    );
                }
                // The geologist's rank of the base, when given: S storey surface, B body base,
                // w within storey.
                let rank = match b.base_rank {
                    Some(BaseRank::StoreySurface) => " S",
                    Some(BaseRank::BodyBase) => " B",
                    Some(BaseRank::WithinStorey) => " w",
                    None => "",
                };
                let cells = [
                    format!("{}{rank}", i + 1),
                    show_length(top, unit),
                    show_length(b.thickness_m, unit),
                    b.lithology.name().to_string(),
                    grain,
                ];
                for (k, text) in cells.into_iter().enumerate() {
                    let numeric = (1..=2).contains(&k);
                    let x = if numeric {
                        rect.left() + cols[k + 1] * rect.width() - 8.0
                    } else {
                        rect.left() + cols[k] * rect.width() + 4.0
                    };
                    let align = if numeric { egui::Align2::RIGHT_CENTER } else { egui::Align2::LEFT_CENTER };
                    let colour = if k == 0 { theme::TEXT_DIM } else { theme::TEXT };
                    p.text(egui::pos2(x, rect.center().y), align, text, font.clone(), colour);
                }
                let r = match b.base_rank {
                    Some(rank) => r.on_hover_text(format!(
                        "Base ranked {} by you. Click to select; right-click for insert, split, merge, rank, delete",
                        rank.name()
                    )),
                    None => r.on_hover_text("Click to select; right-click for insert, split, merge, rank, delete"),
                };
                if r.clicked() {
                    // Selected here: the row is in view already, so the table stays put.
                    self.last_selected = Some(b.id);
                    out.select = Some(Some(b.id));
                    out.scroll_to_height_m = Some(heights[i] + b.thickness_m / 2.0);
                }
                let id = b.id;
                r.context_menu(|ui| super::canvas::bed_menu(ui, doc, Some(id), out));
            }
        });
    }
}

fn short(g: GrainSize) -> String {
    match g {
        GrainSize::Class(c) => c.short_label().to_string(),
        GrainSize::Phi(p) => format!("{p:.1}φ"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn first_letters_pick_vocabulary_terms() {
        assert_eq!(lithology_from_prefix("sa"), Some(Lithology::Sandstone));
        assert_eq!(lithology_from_prefix("Mud"), Some(Lithology::Mudstone));
        assert_eq!(lithology_from_prefix("co"), Some(Lithology::Conglomerate));
        assert_eq!(lithology_from_prefix("xyz"), None);
        assert_eq!(grain_from_prefix("vf"), Some(GrainSize::Class(WentworthClass::VeryFineSand)));
        assert_eq!(grain_from_prefix("m"), Some(GrainSize::Class(WentworthClass::MediumSand)));
        assert_eq!(grain_from_prefix("peb"), Some(GrainSize::Class(WentworthClass::Pebble)));
        // 0.25 mm is φ 2 by Krumbein (1934): φ = −log2(d / 1 mm).
        assert_eq!(grain_from_prefix("0.25mm"), Some(GrainSize::Phi(2.0)));
    }

    #[test]
    fn table_follows_a_selection_only_when_its_row_is_out_of_view() {
        assert_eq!(follow_offset(12, &(10..30), 24.0), None);
        assert_eq!(follow_offset(100, &(10..30), 24.0), Some(97.0 * 24.0));
        assert_eq!(follow_offset(1, &(10..30), 24.0), Some(0.0));
    }

    #[test]
    fn the_entry_row_names_the_field_at_fault() {
        let row = |t: &str, l: &str, g: &str| BedTable {
            thickness: t.into(),
            lithology: l.into(),
            grain: g.into(),
            ..BedTable::default()
        };
        let unit = LengthUnit::Metre;
        assert_eq!(row("1.5", "sa", "m").read_row(unit).map(|b| b.thickness_m), Ok(1.5));
        assert_eq!(row("x", "sa", "m").read_row(unit).map_err(|e| e.0), Err(EntryField::Thickness));
        assert_eq!(row("1", "zz", "m").read_row(unit).map_err(|e| e.0), Err(EntryField::Lithology));
        assert_eq!(row("1", "sa", "zz").read_row(unit).map_err(|e| e.0), Err(EntryField::Grain));
        // The file's checks: a sandstone needs a grain size; no bed is over 1,000 m.
        let (field, why) = row("1", "sa", "").read_row(unit).expect_err("grain required");
        assert_eq!(field, EntryField::Grain, "{why}");
        assert!(why.starts_with("grain base: required for sandstone"), "{why}");
        assert_eq!(row("1001", "mu", "cl").read_row(unit).map_err(|e| e.0), Err(EntryField::Thickness));
        assert!(row("2", "cov", "").read_row(unit).is_ok(), "a covered interval takes no grain size");
    }

    #[test]
    fn thickness_units() {
        assert_eq!(parse_thickness("1.5", LengthUnit::Metre), Ok(1.5));
        assert_eq!(parse_thickness("40cm", LengthUnit::Metre), Ok(0.4));
        // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
        assert!((parse_thickness("10", LengthUnit::Foot).expect("ok") - 3.048).abs() < 1e-12);
        assert!(parse_thickness("-1", LengthUnit::Metre).is_err());
        assert!(parse_thickness("abc", LengthUnit::Metre).is_err());
        assert_eq!(show_length(0.3048, LengthUnit::Foot), "1");
    }
}
