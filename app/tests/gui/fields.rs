//! Committed fields in the real window (egui_kittest, driven by label and keyboard): a typo in a
//! list field is kept as typed and marked, nothing half-read is stored, leaving the bed keeps the
//! text with a warning, and the fixed text is stored whole on Enter.

use super::harness::{app_with, harness_of};
use aggrade::gui::AggradeApp;
use aggrade::gui::Tab;
use aggrade_core::model::BedId;
use egui::accesskit::Role;
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::Path;

fn harness(data_dir: &Path) -> Harness<'static, AggradeApp> {
    harness_of(app_with(None, data_dir, Vec::new()))
}

/// The window on the demo project with the bed inspector showing.
fn inspector(data_dir: &Path) -> Harness<'static, AggradeApp> {
    let mut h = harness(data_dir);
    h.run();
    h.state_mut().tab = Tab::Inspector;
    h
}

/// The inspector's text field labelled `label`, if shown.
fn field_value(h: &Harness<'static, AggradeApp>, label: &str) -> Option<String> {
    h.query_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some(label)).and_then(|n| n.value())
}

fn shown_containing(h: &Harness<'static, AggradeApp>, part: &str) -> bool {
    h.query_all_by(|n| {
        n.label().is_some_and(|l| l.contains(part)) || n.value().is_some_and(|v| v.contains(part))
    })
    .next()
    .is_some()
}

/// Whether a field is framed in the colour of a text that does not read.
fn framed_invalid(h: &Harness<'static, AggradeApp>) -> bool {
    h.output().shapes.iter().any(|c| {
        matches!(&c.shape, egui::Shape::Rect(r) if r.stroke.color == aggrade::gui::test_hooks::INVALID && r.stroke.width > 0.0)
    })
}

fn paleocurrents(h: &Harness<'static, AggradeApp>, id: BedId) -> Vec<f64> {
    h.state().doc.section().beds.iter().find(|b| b.id == id).expect("bed still there").azimuths().collect()
}

fn select(h: &mut Harness<'static, AggradeApp>, id: BedId) {
    h.state_mut().doc.selected_bed = Some(id);
    h.run();
}

/// Type into the focused field, then press a key (Enter, Tab) and let the window settle.
fn type_then(h: &mut Harness<'static, AggradeApp>, text: &str, key: Key) {
    h.get_by(|n| n.is_focused()).type_text(text);
    h.run();
    h.key_press(key);
    h.run();
    h.run();
}

const FIELD: &str = "Paleocurrents (°)";

#[test]
fn a_paleocurrent_typo_is_kept_and_marked_never_stored_and_the_fixed_value_is_stored_whole() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let beds = h.state().doc.section().beds.clone();
    let bed = beds.iter().find(|b| b.paleocurrents.is_empty()).expect("a bed without paleocurrents").id;
    let other = beds.iter().find(|b| b.id != bed).expect("another bed").id;
    select(&mut h, bed);
    let revision = h.state().doc.revision;

    h.get_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some(FIELD)).focus();
    h.run();
    // Typed a key at a time: "240 4" on the way parses, and must not be stored.
    for c in "240 425".chars() {
        h.get_by(|n| n.is_focused()).type_text(&c.to_string());
        h.run();
        assert_eq!(paleocurrents(&h, bed), Vec::<f64>::new(), "stored while typing (after {c:?})");
    }
    h.key_press(Key::Enter);
    h.run();
    h.run();
    assert_eq!(paleocurrents(&h, bed), Vec::<f64>::new(), "an invalid list was stored");
    assert_eq!(h.state().doc.revision, revision, "nothing was applied");
    assert_eq!(field_value(&h, FIELD).as_deref(), Some("240 425"), "the typed text stays");
    assert!(shown_containing(&h, "\"425\" is not a paleocurrent reading"), "the field's problem is shown");
    assert!(framed_invalid(&h), "the field is framed in red");

    // Another bed selected: the typed text is kept for its bed with a warning, not dropped.
    select(&mut h, other);
    h.run();
    assert_eq!(paleocurrents(&h, bed), Vec::<f64>::new());
    assert!(shown_containing(&h, "\"240 425\" was not stored"), "leaving the bed warns");
    // Back on the bed: the text and its mark are there again.
    select(&mut h, bed);
    h.run();
    assert_eq!(field_value(&h, FIELD).as_deref(), Some("240 425"), "the typed text survived reselecting");
    assert!(shown_containing(&h, "\"425\" is not a paleocurrent reading"), "still marked");
    assert!(!shown_containing(&h, "was not stored"), "the draft is back in its field");

    // Fixed to "240 225" and Enter: stored whole, as one undo step.
    h.get_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some(FIELD)).focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.run();
    type_then(&mut h, "240 225", Key::Enter);
    assert_eq!(paleocurrents(&h, bed), vec![240.0, 225.0]);
    assert!(!shown_containing(&h, "is not a paleocurrent reading"), "the mark went with the fix");
    assert!(!framed_invalid(&h), "no field is framed in red any more");
    assert_eq!(field_value(&h, FIELD).as_deref(), Some("240 225"), "shown in its stored form");
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(paleocurrents(&h, bed), Vec::<f64>::new(), "one undo takes the whole list back");
}

#[test]
fn a_thickness_typed_in_the_inspector_is_stored_on_enter_and_a_bad_one_is_refused_with_its_field_named() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let bed = h.state().doc.section().beds[0].id;
    select(&mut h, bed);
    let t0 = h.state().doc.section().beds[0].thickness_m;
    let field = |h: &mut Harness<'static, AggradeApp>| {
        h.get_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some("Thickness")).focus();
        h.run();
        h.key_press_modifiers(Modifiers::COMMAND, Key::A);
        h.run();
    };
    field(&mut h);
    // 1,200 m is more than one bed can be (the project file refuses it): kept, marked, not stored.
    type_then(&mut h, "1200", Key::Tab);
    assert_eq!(h.state().doc.section().beds[0].thickness_m, t0);
    assert!(shown_containing(&h, "Thickness: thickness \"1200\" is not a number greater than 0"));
    field(&mut h);
    type_then(&mut h, "40cm", Key::Enter);
    assert_eq!(h.state().doc.section().beds[0].thickness_m, 0.4);
    assert!(!shown_containing(&h, "is not a number greater than 0"));
}
