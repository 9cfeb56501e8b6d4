//! The bed table: every field of a bed typed from the keyboard in one entry row, cell by cell in
//! the compact notation the bed-table CSV reads (`aggrade_core::model::shorthand`, one reader for
//! both), above the section's beds listed top first.
//!
//! Keys (`docs/notation.md` has them with every code):
//! - a digit typed while no field has the focus starts a new bed in the entry row;
//! - Tab and Shift+Tab move between the row's cells (an empty cell is skipped with one Tab);
//! - Enter adds the bed on top of the section, wherever the selection is; Ctrl+Enter inserts it
//!   above the selected bed instead (so does the row's "Insert above" button);
//! - F2, or a double click on a row, loads the selected bed into the entry row to edit it;
//!   Enter stores it, Esc (or Cancel) drops the edit and brings back the new bed's row.
//!
//! The cells and their reading are in `cells`, the keys (and why the row moves the focus itself)
//! in `keys`.

mod cells;
mod columns;
mod keys;
pub(super) mod split;

use cells::{describe, read_row, Cell, Texts};
use cells::{new_template, CELLS};
use columns::{Columns, Extra};
use keys::RowKey;

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::field::{mark_invalid, problem_label};
use super::theme;
use aggrade_core::io::limits::MAX_STRING_CHARS;
use aggrade_core::io::MAX_BED_THICKNESS_M;
use aggrade_core::model::shorthand as sh;
use aggrade_core::model::{BaseRank, Bed, BedId, GrainSize, LengthUnit, Lithology};

/// An existing bed loaded into the row (F2 or a double click): its section and id, the cells
/// as typed, and as loaded.
#[derive(Debug, Clone)]
struct Edited {
    section: usize,
    bed: BedId,
    texts: Texts,
    loaded: Texts,
}

/// The entry row and the table below it.
#[derive(Debug)]
pub struct BedTable {
    /// The new bed's cells (kept while a bed is being edited).
    new_row: Texts,
    /// The edited bed's cells, and the texts it was loaded with.
    edit: Option<Edited>,
    /// Problems of the row, by cell (framed in red) — found on Enter and on leaving a cell.
    problems: Vec<(Cell, String)>,
    /// Typing after a Tab or Enter in the same frame, for the cell that has the focus next.
    held: Vec<egui::Event>,
    /// The cell with the focus in the last frame.
    focused_last: Option<Cell>,
    /// A note about the row's last action (stored, refused, cancelled).
    note: Option<String>,
    /// The selection the table last showed: a selection made elsewhere (canvas, review list)
    /// scrolls the table to its row.
    last_selected: Option<BedId>,
    /// Rows shown in the last frame.
    visible_rows: std::ops::Range<usize>,
    /// The optional columns shown (their cells join the entry row).
    columns: Columns,
}

impl Default for BedTable {
    fn default() -> Self {
        BedTable {
            new_row: Default::default(),
            edit: None,
            problems: Vec::new(),
            held: Vec::new(),
            focused_last: None,
            note: None,
            last_selected: None,
            visible_rows: 0..0,
            columns: Columns::default(),
        }
    }
}

/// The least width of the table's six columns (number, top, thickness, lithology, grain, more),
/// points: optional columns beyond it make the table scroll sideways.
const TABLE_MIN_BASE_W: f32 = 330.0;

/// Scroll offset (points) that puts `row` a few rows below the top of the table, if it is not
/// among the rows shown; `None` when it is already in view.
pub fn follow_offset(row: usize, visible: &std::ops::Range<usize>, row_pitch: f32) -> Option<f32> {
    (!visible.contains(&row)).then(|| (row.saturating_sub(3) as f32 * row_pitch).max(0.0))
}

/// A length typed in the section's display unit (a trailing m, cm or ft overrides it), in metres; `None`
/// when the text is not a finite number.
pub fn parse_length(text: &str, unit: LengthUnit) -> Option<f64> {
    sh::length(text, unit).ok()
}

/// Parse a thickness typed in the section's display unit (a trailing m, cm or ft overrides it): greater
/// than 0 and at most the core's largest bed thickness.
pub fn parse_thickness(text: &str, unit: LengthUnit) -> Result<f64, String> {
    match sh::thickness_entry(text, unit) {
        Ok(t) if t.covered_top_m.is_none() && t.thickness_m <= MAX_BED_THICKNESS_M => Ok(t.thickness_m),
        Ok(t) if t.covered_top_m.is_some() => Err(format!(
            "{text:?}: a covered top is typed in the bed table's entry row, where it becomes a covered interval of its own"
        )),
        _ => Err(format!(
            "thickness {text:?} is not a number greater than 0 and at most {MAX_BED_THICKNESS_M} m (e.g. 1.25, 40cm, 3ft)"
        )),
    }
}

/// A number in the section's display unit, without trailing zeros.
pub fn show_length(m: f64, unit: LengthUnit) -> String {
    sh::length_code(m, unit)
}

impl BedTable {
    /// A table whose choice of optional columns is kept in Aggrade's data folder.
    pub fn with_settings_in(data_dir: &std::path::Path) -> Self {
        BedTable { columns: Columns::load(data_dir), ..Default::default() }
    }

    /// One line for each cell typed in the entry row and not yet stored (a new bed not yet
    /// added, or a loaded bed's changed cells), for the window's backup.
    pub fn unstored_lines(&self) -> Vec<String> {
        let mut out: Vec<String> = Cell::ALL
            .iter()
            .zip(&self.new_row)
            .filter(|(_, t)| !t.trim().is_empty())
            .map(|(c, t)| format!("New bed not yet added: {} {t:?}", c.label()))
            .collect();
        if let Some(e) = &self.edit {
            out.extend(
                Cell::ALL
                    .iter()
                    .zip(e.texts.iter().zip(&e.loaded))
                    .filter(|(_, (t, l))| t != l)
                    .map(|(c, (t, _))| format!("Bed {} not yet stored: {} {t:?}", e.bed.0, c.label())),
            );
        }
        out
    }

    /// Rows (0 = top of the section) the table showed in the last frame.
    pub fn rows_shown(&self) -> std::ops::Range<usize> {
        self.visible_rows.clone()
    }

    /// The texts of the row on show.
    fn texts(&mut self) -> &mut Texts {
        match &mut self.edit {
            Some(e) => &mut e.texts,
            None => &mut self.new_row,
        }
    }

    /// Draw the entry row and the table.
    pub fn ui(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let ctx = ui.ctx().clone();
        let unit = doc.section().display_unit;
        // An edited bed that is gone (deleted, undone, another section shown): the row becomes a
        // new bed's, with its text — nothing typed is lost.
        if let Some(Edited { section, bed, texts, .. }) = &self.edit {
            if *section != doc.selected_section || doc.bed_index(*bed).is_none() {
                if self.new_row.iter().all(|t| t.trim().is_empty()) {
                    self.new_row = texts.clone();
                    self.note = Some(
                        "The bed being edited is no longer in this section: its row is a new bed now".into(),
                    );
                    self.edit = None;
                } else {
                    self.note = Some(
                        "The bed being edited is no longer in this section: Enter adds the row as a new bed"
                            .into(),
                    );
                }
            }
        }
        self.keys_without_focus(&ctx, doc);
        let (key, typing_in) = self.route_keys(&ctx);

        let editing = match &self.edit {
            Some(Edited { section, bed, .. }) if *section == doc.selected_section => doc.bed_index(*bed),
            _ => None,
        };
        // Wrapped: the help never widens the panel.
        ui.horizontal_wrapped(|ui| {
            match editing {
                Some(i) => ui.strong(format!("Editing bed {}", i + 1)),
                None => ui.strong("New bed"),
            };
            // Above the entry row, so that the menu stays under the pointer while ticked columns
            // add cells to the row below it; a fixed id, so that the menu is not closed by them.
            ui.scope_builder(
                egui::UiBuilder::new().scope_id(egui::Id::unique("aggrade_table_columns")),
                |ui| self.columns_menu(ui),
            );
            let help = if editing.is_some() {
                "Tab across · Enter stores · Esc cancels"
            } else {
                "Tab across · Enter adds on top · Ctrl+Enter above the selection · F2 edits the selection"
            };
            ui.label(egui::RichText::new(help).small().color(theme::TEXT_DIM)).on_hover_text(
                "Every key and code of the row: docs/notation.md. Hover a cell for what it takes",
            );
        });
        let mut action = key;
        let texts_before = self.texts().clone();
        self.cells_ui(ui, unit);
        // A cell whose text changed is being fixed: its old problem goes.
        let now = self.texts().clone();
        self.problems.retain(|(c, _)| texts_before[*c as usize] == now[*c as usize]);
        ui.horizontal(|ui| {
            if editing.is_some() {
                if ui.button("Store").on_hover_text("Store the edited bed (Enter)").clicked() {
                    action = Some(RowKey::Commit { above_selection: false });
                }
                if ui.button("Cancel").on_hover_text("Drop the edit; the bed stays as it is (Esc)").clicked()
                {
                    action = Some(RowKey::Leave);
                }
            } else {
                if ui
                    .button("Add on top")
                    .on_hover_text("Add this bed on top of the section (Enter)")
                    .clicked()
                {
                    action = Some(RowKey::Commit { above_selection: false });
                }
                let above = doc.selected_bed.and_then(|id| doc.bed_index(id));
                let label = above
                    .map_or("Insert above selection".to_string(), |i| format!("Insert above bed {}", i + 1));
                if ui
                    .add_enabled(above.is_some(), egui::Button::new(label))
                    .on_hover_text("Insert this bed directly above the selected bed (Ctrl+Enter)")
                    .clicked()
                {
                    action = Some(RowKey::Commit { above_selection: true });
                }
            }
        });
        // The live reading of the row.
        let reading = self.read(doc);
        let preview = match &reading {
            Ok(beds) if !self.texts().iter().all(|t| t.trim().is_empty()) => {
                let mut s = format!("reads as: {}", describe(&beds[0], unit));
                if let Some(c) = beds.get(1) {
                    s.push_str(&format!(
                        "; then {} {} covered",
                        sh::length_code(c.thickness_m, unit),
                        unit.name()
                    ));
                }
                s
            }
            _ => String::new(),
        };
        if !preview.is_empty() {
            ui.add(egui::Label::new(egui::RichText::new(preview).small().color(theme::TEXT_DIM)).wrap());
        }
        match action {
            Some(RowKey::Step { forward }) => {
                let from = typing_in.or(self.focused_last).unwrap_or(Cell::Thickness);
                self.check_cell(doc, from);
                let columns = &self.columns;
                let next = from.step(forward, |c| columns.cell_shown(c));
                self.focus(&ctx, next);
            }
            Some(RowKey::Commit { above_selection }) => self.commit(&ctx, doc, out, above_selection),
            Some(RowKey::Leave) => {
                if self.edit.take().is_some() {
                    self.problems.clear();
                    self.note = Some("Edit cancelled: the bed is as it was".into());
                }
                ctx.memory_mut(|m| {
                    if let Some(id) = m.focused() {
                        m.surrender_focus(id);
                    }
                });
            }
            None => {}
        }
        if !self.held.is_empty() {
            ctx.request_repaint();
        }
        self.focused_last = self.focused_cell(&ctx);
        for (_, p) in &self.problems {
            problem_label(ui, p);
        }
        if let Some(n) = &self.note {
            ui.label(egui::RichText::new(n).small().color(theme::TEXT_DIM));
        }
        ui.separator();
        self.table(ui, doc, out);
    }

    /// The row's cells, on three lines, each with its name above it.
    fn cells_ui(&mut self, ui: &mut egui::Ui, unit: LengthUnit) {
        let problems: Vec<Cell> = self.problems.iter().map(|(c, _)| *c).collect();
        let w = ui.available_width();
        let gap = ui.spacing().item_spacing.x;
        // The optional columns' cells, on a line of their own while shown.
        let optional: Vec<Cell> =
            Cell::OPTIONAL.into_iter().filter(|c| self.columns.cell_shown(*c)).collect();
        let share = if optional.is_empty() { 0.0 } else { 1.0 / optional.len().max(3) as f32 };
        let extra_line: Vec<(Cell, f32)> = optional.iter().map(|c| (*c, share)).collect();
        let lines = Cell::LINES.into_iter().chain((!extra_line.is_empty()).then_some(extra_line.as_slice()));
        for line in lines {
            ui.horizontal(|ui| {
                let room = w - gap * (line.len() as f32 - 1.0);
                for (cell, share) in line {
                    ui.vertical(|ui| {
                        ui.set_width(room * share);
                        ui.label(egui::RichText::new(cell.label()).size(10.0).color(theme::TEXT_DIM));
                        let text = &mut self.texts()[*cell as usize];
                        let r = ui
                            .add(
                                egui::TextEdit::singleline(text)
                                    .id(cell.id())
                                    .char_limit(MAX_STRING_CHARS)
                                    .hint_text(cell.hint(unit))
                                    .desired_width(room * share),
                            )
                            .on_hover_ui(|ui| {
                                ui.label(cell.tip(unit));
                            });
                        if problems.contains(cell) {
                            mark_invalid(ui, r.rect);
                        }
                    });
                }
            });
        }
    }

    /// Check one cell on its own as it is left, so a typo is marked before Enter.
    fn check_cell(&mut self, doc: &Document, cell: Cell) {
        self.problems.retain(|(c, _)| *c != cell);
        let mut changed = [false; CELLS];
        changed[cell as usize] = true;
        let unit = doc.section().display_unit;
        let template = Bed::new(BedId(0), 1.0, Lithology::Coal, None);
        // Alone, a grain or lithology cell is judged without the other: only its own notation.
        if let Err(problems) = read_row(self.texts(), &template, &changed, unit, None) {
            let own = problems.into_iter().filter(|(c, _)| *c == cell);
            let own: Vec<(Cell, String)> = match cell {
                Cell::Lithology if self.texts()[cell as usize].trim().is_empty() => Vec::new(),
                _ => own.collect(),
            };
            self.problems.extend(own);
        }
    }

    /// The row read as it stands (for the live reading and for Enter).
    fn read(&mut self, doc: &Document) -> Result<Vec<Bed>, Vec<(Cell, String)>> {
        let s = doc.section();
        let unit = s.display_unit;
        match self.edit.clone() {
            Some(Edited { section, bed, texts, loaded }) if section == doc.selected_section => {
                match s.bed_index(bed) {
                    Some(i) => {
                        let changed: [bool; CELLS] = std::array::from_fn(|k| texts[k] != loaded[k]);
                        let below = i.checked_sub(1).map(|j| s.beds[j].paleosol);
                        read_row(&texts, &s.beds[i], &changed, unit, below).map(|mut beds| {
                            beds[0].id = bed;
                            beds
                        })
                    }
                    None => read_row(
                        &texts,
                        &new_template(),
                        &[true; CELLS],
                        unit,
                        s.beds.last().map(|b| b.paleosol),
                    ),
                }
            }
            _ => {
                let below = s.beds.last().map(|b| b.paleosol);
                read_row(&self.new_row, &new_template(), &[true; CELLS], unit, below)
            }
        }
    }

    /// Enter: add the row's bed on top (or above the selection), or store the edited bed.
    fn commit(&mut self, ctx: &egui::Context, doc: &Document, out: &mut Actions, above_selection: bool) {
        let s = doc.section();
        let editing = match &self.edit {
            Some(Edited { section, bed, texts, loaded }) if *section == doc.selected_section => {
                s.bed_index(*bed).map(|i| (i, texts == loaded))
            }
            _ => None,
        };
        if let Some((_, true)) = editing {
            // Nothing changed: the edit ends, the bed stays as it was.
            self.edit = None;
            self.note = None;
            self.focus(ctx, Cell::Thickness);
            return;
        }
        // Inserted above the selection: the soil below is the selected bed's.
        let selected = doc.selected_bed.and_then(|id| doc.bed_index(id));
        let beds = if let (None, true, Some(i)) = (editing, above_selection, selected) {
            read_row(self.texts(), &new_template(), &[true; CELLS], s.display_unit, Some(s.beds[i].paleosol))
        } else {
            self.read(doc)
        };
        let beds = match beds {
            Ok(b) => b,
            Err(problems) => {
                let first = problems[0].0;
                self.problems = problems;
                self.note = None;
                self.focus(ctx, first);
                return;
            }
        };
        // One undo step for the bed and its covered top.
        let gesture = gesture_key(("entry row", doc.revision, s.beds.len()));
        let n = beds.len();
        match editing {
            Some((i, _)) => {
                let mut beds = beds.into_iter();
                if let Some(bed) = beds.next() {
                    out.edit_in(Edit::ReplaceBed { bed }, gesture);
                }
                for bed in beds {
                    out.edit_in(Edit::InsertBed { index: i + 1, bed }, gesture);
                }
                self.note = Some(format!("Bed {} stored", i + 1));
                self.edit = None;
            }
            None => {
                let index = match (above_selection, selected) {
                    (true, Some(i)) => i + 1,
                    _ => s.beds.len(),
                };
                for (k, bed) in beds.into_iter().enumerate() {
                    out.edit_in(Edit::InsertBed { index: index + k, bed }, gesture);
                }
                self.note = Some(if index == s.beds.len() {
                    format!("Bed {} added on top", index + 1)
                } else {
                    format!("Bed inserted as bed {}; the beds above are renumbered", index + 1)
                });
                if let (true, Some(note)) = (n > 1, self.note.as_mut()) {
                    note.push_str(", with its covered top above");
                }
                // The edited bed's row (if one was left aside) stays; this row is now empty.
                if self.edit.is_some() {
                    self.edit = None;
                } else {
                    self.new_row = Default::default();
                }
            }
        }
        out.end_gesture = true;
        self.problems.clear();
        self.focus(ctx, Cell::Thickness);
    }

    /// The table of beds, top first; with optional columns that do not fit beside the six, it
    /// scrolls sideways (the entry row above stays in place).
    fn table(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions) {
        let extras_w: f32 = self.columns.shown().map(|e| e.width()).sum();
        let avail = ui.available_width();
        let width = avail.max(TABLE_MIN_BASE_W + extras_w);
        if width <= avail {
            self.table_body(ui, doc, out, width);
        } else {
            egui::ScrollArea::horizontal().id_salt("bed_table_sideways").auto_shrink([false, false]).show(
                ui,
                |ui| {
                    ui.set_width(width);
                    self.table_body(ui, doc, out, width);
                },
            );
        }
    }

    fn table_body(&mut self, ui: &mut egui::Ui, doc: &Document, out: &mut Actions, width: f32) {
        let s = doc.section();
        let unit = s.display_unit;
        let n = s.beds.len();
        let sums = doc.heights();
        let heights = &sums.base_m;
        let row_h = 22.0;
        let top_label = format!("top ({})", unit.name());
        let header = ["#", top_label.as_str(), "thick.", "lithology", "grain", "more"];
        let (hrect, _) = ui.allocate_exact_size(egui::vec2(width, 18.0), egui::Sense::hover());
        let font = egui::FontId::proportional(11.5);
        // The optional columns take their own widths on the right; the 6 columns share the rest.
        let extras: Vec<Extra> = self.columns.shown().collect();
        let extras_w: f32 = extras.iter().map(|e| e.width()).sum();
        let base_w = (width - extras_w).max(TABLE_MIN_BASE_W);
        let cols = column_edges(n, &show_length(sums.total_m, unit), base_w);
        let mut x0 = hrect.left() + base_w;
        for e in &extras {
            let clip = egui::Rect::from_x_y_ranges(x0..=(x0 + e.width() - 2.0), hrect.y_range());
            ui.painter().with_clip_rect(clip).text(
                egui::pos2(x0 + 3.0, hrect.center().y),
                egui::Align2::LEFT_CENTER,
                e.heading(),
                font.clone(),
                theme::TEXT_DIM,
            );
            x0 += e.width();
        }
        for (k, name) in header.iter().enumerate() {
            let numeric = (1..=2).contains(&k);
            let x = if numeric {
                hrect.left() + cols[k + 1] * base_w - 8.0
            } else {
                hrect.left() + cols[k] * base_w + 4.0
            };
            let align = if numeric { egui::Align2::RIGHT_CENTER } else { egui::Align2::LEFT_CENTER };
            let clip = egui::Rect::from_x_y_ranges(
                (hrect.left() + cols[k] * base_w)..=(hrect.left() + cols[k + 1] * base_w),
                hrect.y_range(),
            );
            ui.painter().with_clip_rect(clip).text(
                egui::pos2(x, hrect.center().y),
                align,
                *name,
                font.clone(),
                theme::TEXT_DIM,
            );
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
        let mut load = None;
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
                let (rect, r) = ui.allocate_exact_size(egui::vec2(width, row_h), egui::Sense::click());
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
                    more_codes(b, unit),
                ];
                for (k, text) in cells.into_iter().enumerate() {
                    let numeric = (1..=2).contains(&k);
                    let x = if numeric {
                        rect.left() + cols[k + 1] * base_w - 8.0
                    } else {
                        rect.left() + cols[k] * base_w + 4.0
                    };
                    let align = if numeric { egui::Align2::RIGHT_CENTER } else { egui::Align2::LEFT_CENTER };
                    let colour = if k == 0 || k == 5 { theme::TEXT_DIM } else { theme::TEXT };
                    let clip = egui::Rect::from_x_y_ranges(
                        (rect.left() + cols[k] * base_w)..=(rect.left() + cols[k + 1] * base_w - 2.0),
                        rect.y_range(),
                    );
                    p.with_clip_rect(clip).text(egui::pos2(x, rect.center().y), align, text, font.clone(), colour);
                }
                let mut x0 = rect.left() + base_w;
                for e in &extras {
                    let (text, suggested) = e.shown(b);
                    let clip = egui::Rect::from_x_y_ranges(x0..=(x0 + e.width() - 2.0), rect.y_range());
                    let colour = if suggested { theme::TEXT_DIM } else { theme::TEXT };
                    p.with_clip_rect(clip).text(
                        egui::pos2(x0 + 3.0, rect.center().y),
                        egui::Align2::LEFT_CENTER,
                        text,
                        font.clone(),
                        colour,
                    );
                    x0 += e.width();
                }
                // Written only while hovered: the table draws thousands of beds a frame apart.
                let r = r.on_hover_ui(|ui| {
                    let rank = b.base_rank.map(|r| format!("Base ranked {} by you. ", r.name())).unwrap_or_default();
                    ui.label(format!(
                        "{rank}{}. Click to select; double-click or F2 to edit in the row above; right-click for insert, split, merge, rank, delete",
                        describe(b, unit)
                    ));
                });
                // Named for screen readers (and the window's tests): "Bed 3: 1.9 m sandstone, …".
                r.widget_info(|| {
                    egui::WidgetInfo::labeled(egui::accesskit::Role::Row, true, format!("Bed {}: {}", i + 1, describe(b, unit)))
                });
                if r.clicked() || r.double_clicked() {
                    // Selected here: the row is in view already, so the table stays put.
                    self.last_selected = Some(b.id);
                    out.select = Some(Some(b.id));
                    out.scroll_to_height_m = Some(heights[i] + b.thickness_m / 2.0);
                }
                if r.double_clicked() {
                    load = Some(b.id);
                }
                let id = b.id;
                r.context_menu(|ui| super::canvas::bed_menu(ui, doc, Some(id), out));
            }
        });
        if let Some(id) = load {
            self.load(ui.ctx(), doc, id);
        }
    }
}

impl BedTable {
    /// The Columns menu: the optional columns to show (their cells join the entry row, where
    /// Tab reaches them after the notes).
    fn columns_menu(&mut self, ui: &mut egui::Ui) {
        let mut note = None;
        // Several columns may be ticked in turn: the menu stays open until a click beside it.
        let config = egui::containers::menu::MenuConfig::new()
            .close_behavior(egui::PopupCloseBehavior::CloseOnClickOutside);
        let (r, _) = egui::containers::menu::MenuButton::new("Columns…").config(config).ui(ui, |ui| {
            ui.label(
                egui::RichText::new("Optional columns: shown in the table and typed in the row")
                    .small()
                    .color(theme::TEXT_DIM),
            );
            for e in Extra::ALL {
                let mut on = self.columns.is_shown(e);
                if ui.checkbox(&mut on, e.menu_name()).changed() {
                    if let Err(why) = self.columns.set(e, on) {
                        note = Some(why);
                    }
                }
            }
        });
        r.on_hover_text("Show or hide the optional columns: facies, samples, photos, BI, Munsell, horizon");
        if note.is_some() {
            self.note = note;
        }
    }
}

/// The row's last column: paleosol, structures, a contact other than sharp, paleocurrents and
/// a named surface, in the notation.
fn more_codes(b: &Bed, unit: LengthUnit) -> String {
    let paleosol = sh::PaleosolEntry {
        development: b.paleosol,
        features: b.paleosol_features.clone(),
        carbonate_stage: b.carbonate_stage,
    };
    let mut parts = vec![sh::paleosol_code(&paleosol), sh::codes(&b.structures)];
    if b.base_contact != aggrade_core::model::Contact::Sharp || b.base_relief_m.is_some() {
        parts.push(sh::contact_code(b.base_contact, b.base_relief_m, unit));
    }
    if !b.paleocurrents.is_empty() {
        parts.push(format!("{}°", sh::paleocurrents_code(&b.paleocurrents)));
    }
    if let Some(s) = &b.base_surface {
        parts.push(s.name.clone());
    }
    parts.retain(|p| !p.is_empty());
    parts.join(" · ")
}

fn short(g: GrainSize) -> String {
    match g {
        GrainSize::Class(c) => c.short_label().to_string(),
        GrainSize::Phi(p) => format!("{p:.1}φ"),
    }
}

/// The left edges of the six columns as fractions of the row `base_w` points wide; numbers are
/// right-aligned to the next edge. The bed number and top columns widen to hold a long section's
/// numbers (bed 50000 S, a top of 79529.241) and the columns to their right shift over, the last
/// ("more") giving up its room first.
fn column_edges(beds: usize, longest_top: &str, base_w: f32) -> [f32; 7] {
    // Points a character of the table's 11.5-point figures takes, with a little room.
    const CHAR_W: f32 = 6.5;
    let base_w = base_w.max(1.0);
    let number_w = (beds.max(1).to_string().len() + 2) as f32 * CHAR_W + 4.0;
    let top_w = longest_top.chars().count() as f32 * CHAR_W + 16.0;
    let mut c = [0.0f32, 0.09, 0.24, 0.37, 0.62, 0.73, 1.0];
    c[1] = c[1].max(number_w / base_w);
    c[2] = c[2].max(c[1] + top_w / base_w);
    c[3] = c[3].max(c[2] + 0.13);
    c[4] = c[4].max(c[3] + 0.25);
    c[5] = c[5].max(c[4] + 0.11).min(0.95);
    c
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{
        Contact, PaleosolDevelopment, PaleosolFeature, Structure, WentworthClass as W,
    };

    #[test]
    fn the_number_and_top_columns_hold_a_long_sections_numbers() {
        assert_eq!(
            column_edges(12, "35.20", 350.0),
            [0.0, 0.09, 0.24, 0.37, 0.62, 0.73, 1.0],
            "short: as before"
        );
        let c = column_edges(50_000, "79529.241", 350.0);
        assert!(c[1] * 350.0 >= 7.0 * 6.5, "room for \"50000 S\": {c:?}");
        assert!((c[2] - c[1]) * 350.0 >= 9.0 * 6.5 + 8.0, "room for 79529.241 and the gap: {c:?}");
        assert!(c.windows(2).all(|w| w[0] < w[1]), "edges in order: {c:?}");
    }

    #[test]
    fn cells_typed_and_not_added_are_listed_for_the_backup() {
        let mut t = BedTable::default();
        assert!(t.unstored_lines().is_empty(), "an empty row keeps nothing");
        t.new_row[0] = "2.1".into();
        t.new_row[2] = "c-m".into();
        let lines = t.unstored_lines();
        assert_eq!(
            lines,
            vec![
                "New bed not yet added: thickness \"2.1\"".to_string(),
                "New bed not yet added: grain \"c-m\"".to_string()
            ]
        );
    }

    #[test]
    fn a_row_shows_the_rest_of_the_bed_in_the_notation() {
        let mut b = Bed::new(BedId(1), 0.4, Lithology::Conglomerate, Some(GrainSize::Class(W::Pebble)));
        assert_eq!(more_codes(&b, LengthUnit::Metre), "");
        b.structures = vec![Structure::BasalLag];
        b.base_contact = Contact::Erosional;
        b.base_relief_m = Some(1.2);
        b.paleocurrents =
            [210.0, 225.0].into_iter().map(aggrade_core::model::Paleocurrent::azimuth).collect();
        b.base_surface = Some(aggrade_core::model::Surface {
            name: "RG-E1".into(),
            kind: aggrade_core::model::SurfaceKind::Incision,
        });
        assert_eq!(more_codes(&b, LengthUnit::Metre), "bl · e1.2 · 210 225° · RG-E1");
        b.paleosol = PaleosolDevelopment::Weak;
        b.paleosol_features = vec![PaleosolFeature::RootTraces];
        assert!(more_codes(&b, LengthUnit::Metre).starts_with("w rt · bl"));
        assert_eq!(short(GrainSize::Class(W::Cobble)), "cbl");
    }

    #[test]
    fn table_follows_a_selection_only_when_its_row_is_out_of_view() {
        assert_eq!(follow_offset(12, &(10..30), 24.0), None);
        assert_eq!(follow_offset(100, &(10..30), 24.0), Some(97.0 * 24.0));
        assert_eq!(follow_offset(1, &(10..30), 24.0), Some(0.0));
    }

    #[test]
    fn thickness_units() {
        assert_eq!(parse_thickness("1.5", LengthUnit::Metre), Ok(1.5));
        assert_eq!(parse_thickness("40cm", LengthUnit::Metre), Ok(0.4));
        // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
        assert!((parse_thickness("10", LengthUnit::Foot).expect("ok") - 3.048).abs() < 1e-12);
        assert!(parse_thickness("-1", LengthUnit::Metre).is_err());
        assert!(parse_thickness("abc", LengthUnit::Metre).is_err());
        assert!(parse_thickness("4 c1", LengthUnit::Metre).is_err(), "a covered top is the entry row's");
        assert_eq!(show_length(0.3048, LengthUnit::Foot), "1");
    }
}
