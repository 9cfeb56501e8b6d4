//! Typing in the window's tables (egui_kittest): a body width that does not read stays in its
//! cell, marked with its message beside it, and is never stored; the bed table's Columns… menu
//! stays put under the pointer while columns are ticked.

use super::harness::{app_with, demo_file, harness_of};
use aggrade::gui::{AggradeApp, Document};
use egui::Key;
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;

/// The window on the demo with the channel-body window open and the first section's widths off.
fn bodies_window(data: &std::path::Path) -> Harness<'static, AggradeApp> {
    let mut a = app_with(Some(demo_file()), data, vec![]);
    let mut project = a.doc.project.as_ref().clone();
    project.sections[0].body_lateral.clear();
    a.doc = Document::new(project, None);
    let mut h = harness_of(a);
    h.run();
    h.state_mut().views.bodies.open = true;
    h.run();
    h.run();
    h
}

/// The empty width cells (those showing the hint), top row first.
fn width_cell<'h>(h: &'h Harness<'static, AggradeApp>, k: usize) -> egui_kittest::Node<'h> {
    h.query_all_by(|n| n.placeholder() == Some("width (m)")).nth(k).expect("a width cell")
}

/// Does a field hold `text`?
fn holds(h: &Harness<'static, AggradeApp>, text: &str) -> bool {
    h.query_all_by(|n| n.value().as_deref() == Some(text)).next().is_some()
}

/// Is a text containing `part` on screen (a label's words, or a field's text)?
fn shown_containing(h: &Harness<'static, AggradeApp>, part: &str) -> bool {
    h.query_all_by(|n| {
        n.label().is_some_and(|l| l.contains(part)) || n.value().is_some_and(|v| v.contains(part))
    })
    .next()
    .is_some()
}

#[test]
fn a_width_that_does_not_read_stays_in_its_cell_with_its_message_and_is_not_stored() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = bodies_window(data.path());
    let before = h.state().doc.project.clone();
    // Typed and entered in one frame (a paste and Enter, or a fast typist).
    width_cell(&h, 0).focus();
    h.run();
    h.get_by(|n| n.is_focused()).type_text("abc");
    h.key_press(Key::Enter);
    h.run();
    h.run();
    assert!(holds(&h, "abc"), "the typed text stays in its cell");
    h.query_all_by(|n| n.value().as_deref() == Some("abc")).next().expect("the cell").scroll_to_me();
    h.run();
    assert!(h.state().message.is_none(), "no pop-up message to dismiss");
    assert!(shown_containing(&h, "not stored: \"abc\" is not a width"), "the message is beside the cell");
    assert_eq!(h.state().doc.project, before, "nothing stored");
    // Another body's cell typed meanwhile: the first keeps its text.
    width_cell(&h, 1).focus();
    h.run();
    h.get_by(|n| n.is_focused()).type_text("-3");
    h.key_press(Key::Tab);
    h.run();
    h.run();
    assert!(holds(&h, "abc") && holds(&h, "-3"), "both typed texts stay");
    assert_eq!(h.state().doc.project, before, "still nothing stored");
    // Corrected, it is stored and the message goes.
    h.query_all_by(|n| n.value().as_deref() == Some("abc")).next().expect("the cell").focus();
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, Key::A);
    h.run();
    h.get_by(|n| n.is_focused()).type_text("120");
    h.key_press(Key::Enter);
    h.run();
    h.run();
    let stored = &h.state().doc.project.sections[0].body_lateral;
    assert_eq!(stored.iter().filter_map(|l| l.width_m).collect::<Vec<_>>(), vec![120.0]);
    assert!(!shown_containing(&h, "not stored: \"abc\""), "the message goes");
    assert!(holds(&h, "120") && !holds(&h, "abc"));
}

/// Click at `pos` with the pointer, pressed and released in one frame.
fn click_at(h: &mut Harness<'static, AggradeApp>, pos: egui::Pos2) {
    h.input_mut().events.push(egui::Event::PointerMoved(pos));
    for pressed in [true, false] {
        h.input_mut().events.push(egui::Event::PointerButton {
            pos,
            button: egui::PointerButton::Primary,
            pressed,
            modifiers: egui::Modifiers::NONE,
        });
    }
    h.run();
}

#[test]
fn the_columns_menu_stays_under_the_pointer_while_columns_are_ticked_in_quick_succession() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.get_by_label("Columns…").click();
    h.run();
    let names = ["Samples", "Photos", "Munsell colour", "Soil horizon"];
    // Where each item is when the menu opens: a user aims there, click after click.
    let at: Vec<egui::Pos2> = names.iter().map(|n| h.get_by_label(n).rect().center()).collect();
    for (name, pos) in names.iter().zip(&at) {
        click_at(&mut h, *pos);
        assert_eq!(h.get_by_label(name).rect().center(), *pos, "{name}: the menu did not move");
    }
    h.key_press(Key::Escape);
    h.run();
    let kept = std::fs::read_to_string(data.path().join("table_columns.json")).expect("the choice is kept");
    for key in ["samples", "photos", "munsell", "soil_horizon"] {
        assert!(kept.contains(key), "{key} was ticked: {kept}");
    }
    assert!(!kept.contains("facies"), "nothing else was ticked: {kept}");
}
