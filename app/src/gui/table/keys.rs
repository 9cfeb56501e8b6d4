//! The entry row's keys. Keys typed faster than the window draws: egui's text field reads every
//! key of a frame before a Tab moves the focus on, so letters typed right after a Tab in the
//! same frame landed in the cell being left ("mu", Tab, "cl" became "mucl"). The row moves the
//! focus itself instead: the keys after the first Tab, Enter or Esc of a frame are held back and
//! given to the cell that has the focus on the next frame. A digit typed while no field has the
//! focus starts a new bed; F2 loads the selected bed into the row.

use super::cells::{bed_cells, Cell};
use super::{BedTable, Edited};
use crate::gui::document::Document;
use aggrade_core::model::BedId;

/// A key that ends the typing in a cell.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RowKey {
    /// Tab, Shift+Tab: to the next or previous cell.
    Step { forward: bool },
    /// Enter (add on top, or store the edited bed); Ctrl+Enter: insert above the selection.
    Commit { above_selection: bool },
    /// Esc: leave the row (and drop an edit).
    Leave,
}

/// The key an event is, if it ends the typing in a cell.
fn row_key(e: &egui::Event) -> Option<RowKey> {
    match e {
        egui::Event::Key { key, pressed: true, modifiers, .. } => match key {
            egui::Key::Tab if modifiers.is_none() => Some(RowKey::Step { forward: true }),
            egui::Key::Tab if modifiers.shift_only() => Some(RowKey::Step { forward: false }),
            egui::Key::Enter => Some(RowKey::Commit { above_selection: modifiers.command }),
            egui::Key::Escape => Some(RowKey::Leave),
            _ => None,
        },
        _ => None,
    }
}

/// Keys and text: what a text field reads (held back after a Tab with the rest of the typing).
fn is_typing(e: &egui::Event) -> bool {
    matches!(
        e,
        egui::Event::Text(_)
            | egui::Event::Key { .. }
            | egui::Event::Paste(_)
            | egui::Event::Copy
            | egui::Event::Cut
            | egui::Event::Ime(_)
    )
}

/// Split a frame's events at the first key that ends the typing in a cell: the events the cell
/// reads this frame, that key, and the typing after it (for the next frame). Events that are not
/// typing (the pointer's) stay in this frame wherever they are.
pub fn split_at_row_key(events: Vec<egui::Event>) -> (Vec<egui::Event>, Option<RowKey>, Vec<egui::Event>) {
    let mut now = Vec::new();
    let mut later = Vec::new();
    let mut key = None;
    for e in events {
        if key.is_some() && is_typing(&e) {
            later.push(e);
        } else if key.is_none() && row_key(&e).is_some() {
            key = row_key(&e);
        } else {
            now.push(e);
        }
    }
    (now, key, later)
}

impl BedTable {
    /// The cell that has the keyboard focus, if one of the row's does.
    pub(super) fn focused_cell(&self, ctx: &egui::Context) -> Option<Cell> {
        let focused = ctx.memory(|m| m.focused())?;
        Cell::ALL.into_iter().find(|c| c.id() == focused)
    }

    /// Give a cell the focus with its text selected (typing replaces it, as in a spreadsheet).
    pub(super) fn focus(&mut self, ctx: &egui::Context, cell: Cell) {
        ctx.memory_mut(|m| m.request_focus(cell.id()));
        let text = self.texts()[cell as usize].clone();
        let mut state = egui::text_edit::TextEditState::load(ctx, cell.id()).unwrap_or_default();
        state.cursor.set_char_range(Some(egui::text::CCursorRange::select_all_str(&text)));
        state.store(ctx, cell.id());
    }

    /// Keys that act while no field has the focus: F2 edits the selected bed; a digit starts a
    /// new bed in the entry row.
    pub(super) fn keys_without_focus(&mut self, ctx: &egui::Context, doc: &Document) {
        let free = ctx.memory(|m| m.focused().is_none() && m.top_modal_layer().is_none())
            && self.focused_last.is_none()
            && !ctx.any_popup_open();
        if !free {
            return;
        }
        if ctx.input_mut(|i| i.consume_key(egui::Modifiers::NONE, egui::Key::F2)) {
            if let Some(id) = doc.selected_bed {
                self.load(ctx, doc, id);
            }
            return;
        }
        // The first text typed (a window system sends the key's press before its text).
        let starts_bed = ctx.input(|i| {
            i.events
                .iter()
                .find_map(|e| if let egui::Event::Text(t) = e { Some(t) } else { None })
                .is_some_and(|t| t.starts_with(|c: char| c.is_ascii_digit() || c == '.'))
        });
        if starts_bed && self.edit.is_none() && self.new_row[Cell::Thickness as usize].is_empty() {
            self.focus(ctx, Cell::Thickness);
        }
    }

    /// Load a bed into the row to edit it (the new bed's text is kept aside).
    pub(super) fn load(&mut self, ctx: &egui::Context, doc: &Document, id: BedId) {
        let Some(bed) = doc.section().beds.iter().find(|b| b.id == id) else { return };
        if let Some(Edited { bed: other, texts, loaded, .. }) = &self.edit {
            if texts != loaded && *other != id {
                self.note = Some(
                    "The row holds changes to another bed: store them (Enter) or cancel (Esc) first".into(),
                );
                return;
            }
        }
        let texts = bed_cells(bed, doc.section().display_unit);
        self.edit =
            Some(Edited { section: doc.selected_section, bed: id, texts: texts.clone(), loaded: texts });
        self.problems.clear();
        self.note = None;
        self.focus(ctx, Cell::Thickness);
    }

    /// While a cell has the focus, take the frame's first Tab, Enter or Esc for the row and hold
    /// the typing after it for the next frame, when the focus is where that key sends it.
    /// Returns that key and the cell it was typed in.
    pub(super) fn route_keys(&mut self, ctx: &egui::Context) -> (Option<RowKey>, Option<Cell>) {
        // Esc in the raw input has already taken the focus away: give it back for this frame, so
        // that what was typed before the Esc reaches the cell.
        let esc = ctx.input(|i| i.raw.events.iter().any(|e| row_key(e) == Some(RowKey::Leave)));
        if let (None, Some(last), true) = (self.focused_cell(ctx), self.focused_last, esc) {
            ctx.memory_mut(|m| m.request_focus(last.id()));
        }
        let Some(cell) = self.focused_cell(ctx) else {
            // The focus went elsewhere (a click): held typing goes where the focus is.
            if !self.held.is_empty() {
                let mut held = std::mem::take(&mut self.held);
                ctx.input_mut(|i| {
                    held.append(&mut i.events);
                    i.events = held;
                });
            }
            return (None, None);
        };
        let held = std::mem::take(&mut self.held);
        let (key, later) = ctx.input_mut(|i| {
            let mut events = held;
            events.append(&mut i.events);
            let (now, key, later) = split_at_row_key(events);
            i.events = now;
            (key, later)
        });
        self.held = later;
        // The row moves the focus itself: egui's own Tab move (read from the raw input) is off.
        ctx.memory_mut(|m| m.move_focus(egui::FocusDirection::None));
        (key, Some(cell))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keys_after_a_tab_in_one_frame_are_held_for_the_next_cell() {
        let key = |k, modifiers| egui::Event::Key {
            key: k,
            physical_key: None,
            pressed: true,
            repeat: false,
            modifiers,
        };
        let text = |t: &str| egui::Event::Text(t.into());
        let pointer = egui::Event::PointerGone;
        let events = vec![
            text("mu"),
            key(egui::Key::Tab, egui::Modifiers::NONE),
            pointer.clone(),
            text("cl"),
            key(egui::Key::Enter, egui::Modifiers::NONE),
        ];
        let (now, k, later) = split_at_row_key(events);
        assert_eq!(now, vec![text("mu"), pointer]);
        assert_eq!(k, Some(RowKey::Step { forward: true }));
        assert_eq!(later, vec![text("cl"), key(egui::Key::Enter, egui::Modifiers::NONE)]);
        let (now, k, later) = split_at_row_key(later);
        assert_eq!(
            (now, k, later),
            (vec![text("cl")], Some(RowKey::Commit { above_selection: false }), vec![])
        );
        let (_, k, _) = split_at_row_key(vec![key(egui::Key::Tab, egui::Modifiers::SHIFT)]);
        assert_eq!(k, Some(RowKey::Step { forward: false }));
        let (_, k, _) = split_at_row_key(vec![key(egui::Key::Enter, egui::Modifiers::COMMAND)]);
        assert_eq!(k, Some(RowKey::Commit { above_selection: true }));
    }
}
