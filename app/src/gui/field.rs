//! A text field that commits a whole value: parsed when the typing ends (Enter, Tab, a click
//! elsewhere), kept exactly as typed and framed in red while it does not parse, never stored
//! half-parsed.
//!
//! Typing "240 425" into a list of azimuths passes through "240 4", which parses; a field that
//! stored every keystroke's parse would keep that half value when the last keystroke made the text
//! invalid. Here nothing is stored until the geologist leaves the field, and then only a value that
//! parses as a whole; a text that does not stays in the field, marked, with a message naming the
//! field and what would be valid.

/// Colour of the frame and message of a field whose text does not parse.
pub const INVALID: egui::Color32 = egui::Color32::from_rgb(190, 30, 30);

/// The text of one field and what is known about it.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct FieldText {
    /// The text in the field, exactly as typed.
    pub text: String,
    /// The stored value's text the field was last filled from: a change made elsewhere (undo, a
    /// drag on the column) refills the field, a typed text that differs from it is uncommitted.
    loaded: String,
    /// Why the text does not parse (the field is framed in red and this is shown under it).
    pub problem: Option<String>,
    /// A value was read: show the stored value in its own form on the next frame, even when
    /// it is the value that was there (a list typed with other separators).
    refill: bool,
}

impl FieldText {
    /// A field showing a stored value.
    pub fn new(stored: &str) -> Self {
        FieldText { text: stored.to_string(), loaded: stored.to_string(), problem: None, refill: false }
    }

    /// A field holding a typed text that has not been stored (a draft kept for later).
    #[cfg(test)]
    pub fn typed(stored: &str, text: &str, problem: Option<String>) -> Self {
        FieldText { text: text.to_string(), loaded: stored.to_string(), problem, refill: false }
    }

    /// Follow the stored value while the field is neither being edited nor holding a text that
    /// does not parse (that text is the geologist's and is never replaced behind their back).
    pub fn sync(&mut self, stored: &str, editing: bool) {
        if !editing && self.problem.is_none() && (self.refill || self.loaded != stored) {
            self.text = stored.to_string();
            self.loaded = stored.to_string();
            self.refill = false;
        }
    }

    /// Whether the text differs from the stored value it was filled from (typed, not stored).
    pub fn is_uncommitted(&self) -> bool {
        self.text != self.loaded
    }

    /// The typing ended: parse the whole text. A text that parses returns its value (to be
    /// stored; the field refills from the stored value on a later frame); one that does not is
    /// kept as typed with its problem, and nothing is returned. An untouched text returns nothing.
    pub fn commit<T>(&mut self, parse: impl FnOnce(&str) -> Result<T, String>) -> Option<T> {
        if !self.is_uncommitted() {
            self.problem = None;
            return None;
        }
        match parse(&self.text) {
            Ok(v) => {
                self.problem = None;
                self.refill = true;
                Some(v)
            }
            Err(why) => {
                self.problem = Some(why);
                None
            }
        }
    }

    /// Put the stored value back (the typed text is dropped on purpose).
    pub fn revert(&mut self) {
        self.text = self.loaded.clone();
        self.problem = None;
    }
}

/// How a committed field looks.
#[derive(Debug, Clone, Copy)]
pub struct FieldLook<'a> {
    /// Grey text shown while the field is empty.
    pub hint: &'a str,
    /// Tooltip.
    pub tip: &'a str,
    pub width: f32,
    /// Most characters the field takes (the core's limit for the value it holds).
    pub char_limit: usize,
}

/// Frame a field's rectangle in red (a field whose text does not parse).
pub fn mark_invalid(ui: &egui::Ui, rect: egui::Rect) {
    ui.painter().rect_stroke(
        rect.expand(1.0),
        2.0,
        egui::Stroke::new(2.0, INVALID),
        egui::StrokeKind::Outside,
    );
}

/// The problem line under a field.
pub fn problem_label(ui: &mut egui::Ui, problem: &str) {
    // Wrapped within the room there is (at most 300 points), so a long message never widens the
    // side panel and pushes the column's tracks out of view.
    ui.scope(|ui| {
        ui.set_max_width(ui.available_width().clamp(120.0, 300.0));
        ui.add(egui::Label::new(egui::RichText::new(problem).color(INVALID).small()).wrap());
    });
}

/// Draw a single-line committed field: `state` follows `stored` unless it is being edited or
/// holds a text that does not parse; when the typing ends, `parse` reads the whole text and its
/// value is returned (the caller stores it). While the text does not parse the field is framed
/// in red and the problem is shown under it (`parse`'s message names the field and what is valid).
pub fn committed_field<T>(
    ui: &mut egui::Ui,
    id: egui::Id,
    state: &mut FieldText,
    stored: &str,
    look: FieldLook<'_>,
    parse: impl FnOnce(&str) -> Result<T, String>,
) -> (egui::Response, Option<T>) {
    let editing = ui.memory(|m| m.has_focus(id));
    state.sync(stored, editing);
    let r = ui
        .add(
            egui::TextEdit::singleline(&mut state.text)
                .id(id)
                .hint_text(look.hint)
                .desired_width(look.width)
                .char_limit(look.char_limit),
        )
        .on_hover_text(look.tip);
    let value = if r.lost_focus() { state.commit(parse) } else { None };
    if state.problem.is_some() {
        mark_invalid(ui, r.rect);
    }
    (r, value)
}

/// [`committed_field`] with its state kept in egui's memory under `id` (for fields drawn by free
/// functions, such as one per candidate boundary or per rule parameter).
pub fn committed_field_in_memory<T>(
    ui: &mut egui::Ui,
    id: egui::Id,
    stored: &str,
    look: FieldLook<'_>,
    parse: impl FnOnce(&str) -> Result<T, String>,
) -> (egui::Response, Option<T>, Option<String>) {
    let state_id = id.with("committed_field_state");
    let mut state = ui.data(|d| d.get_temp::<FieldText>(state_id)).unwrap_or_else(|| FieldText::new(stored));
    let (r, value) = committed_field(ui, id, &mut state, stored, look, parse);
    let problem = state.problem.clone();
    ui.data_mut(|d| d.insert_temp(state_id, state));
    (r, value, problem)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn azimuths(text: &str) -> Result<Vec<f64>, String> {
        text.split_whitespace()
            .map(|p| p.parse::<f64>().ok().filter(|a| (0.0..=360.0).contains(a)).ok_or(format!("{p:?}")))
            .collect()
    }

    #[test]
    fn nothing_is_stored_while_typing_and_an_invalid_text_is_kept_and_marked() {
        let mut f = FieldText::new("");
        // Typing "240 425": every keystroke changes the text, none stores anything.
        for end in 1..="240 425".len() {
            f.text = "240 425"[..end].to_string();
            f.sync("", true);
            assert_eq!(f.text, &"240 425"[..end], "the text is kept while editing");
        }
        assert_eq!(f.commit(azimuths), None, "425 is no azimuth: nothing to store");
        assert_eq!(f.text, "240 425");
        assert_eq!(f.problem.as_deref(), Some("\"425\""));
        // Not being edited, the invalid text still is not replaced by the stored value.
        f.sync("", false);
        assert_eq!(f.text, "240 425");
        assert!(f.is_uncommitted());
        // Fixed, it parses as a whole.
        f.text = "240 225".into();
        assert_eq!(f.commit(azimuths), Some(vec![240.0, 225.0]));
        assert_eq!(f.problem, None);
        // Stored and shown in its own form on a later frame.
        f.sync("240; 225", false);
        assert_eq!(f.text, "240; 225");
        assert!(!f.is_uncommitted());
        assert_eq!(f.commit(azimuths), None, "an untouched field stores nothing");
        // The same value typed another way: read, then shown in the stored form again.
        f.text = "240,225".into();
        assert_eq!(f.commit(|t| azimuths(&t.replace(',', " "))), Some(vec![240.0, 225.0]));
        f.sync("240; 225", false);
        assert_eq!(f.text, "240; 225");
    }

    #[test]
    fn a_change_made_elsewhere_refills_only_an_idle_valid_field() {
        let mut f = FieldText::new("1.5");
        f.sync("2", true);
        assert_eq!(f.text, "1.5", "not while it is being edited");
        f.sync("2", false);
        assert_eq!(f.text, "2");
        f.text = "x".into();
        assert_eq!(f.commit(|t| t.parse::<f64>().map_err(|e| e.to_string())), None);
        f.sync("3", false);
        assert_eq!(f.text, "x", "an invalid text is the geologist's until fixed or reverted");
        f.revert();
        assert_eq!((f.text.as_str(), f.problem.as_deref()), ("2", None));
        f.sync("3", false);
        assert_eq!(f.text, "3");
    }

    #[test]
    fn a_draft_is_uncommitted_and_keeps_its_problem() {
        let f = FieldText::typed("10", "1O", Some("not a number".into()));
        assert!(f.is_uncommitted());
        assert_eq!(f.problem.as_deref(), Some("not a number"));
    }
}
