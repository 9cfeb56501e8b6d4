//! The section's measuring setting in the real window (egui_kittest): the Section details
//! dialog's pop-up lists open above it every time and their choices are stored and undone; the
//! dialog stays above the comparison and statistics windows; the Section tab sums the setting up.

use super::harness::{app_with, harness_of};
use aggrade::gui::AggradeApp;
use aggrade_core::model::MeasuringMethod;
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;

fn open_dialog(h: &mut Harness<'static, AggradeApp>) {
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::D);
    h.run();
    h.run();
    assert!(h.state().section_details_open(), "Ctrl+Shift+D opens the dialog");
}

/// Click the widget labelled `label` with the pointer (pressed and released in one frame, as a
/// quick click arrives); the click lands on whatever is drawn on top there.
fn click(h: &mut Harness<'static, AggradeApp>, label: &str) {
    h.get_by_label(label).click();
    h.run();
    h.run();
}

/// Is `text` on screen (a label, or the value of a field or list)?
fn shown(h: &Harness<'static, AggradeApp>, text: &str) -> bool {
    h.query_all_by(|n| n.label().as_deref() == Some(text) || n.value().as_deref() == Some(text))
        .next()
        .is_some()
}

#[test]
fn the_measuring_method_list_opens_above_the_dialog_each_time_and_its_choice_is_stored_and_undone() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    let before = h.state().doc.section().clone();
    assert_eq!(before.method, Some(MeasuringMethod::JacobsStaff), "the demo's section");
    open_dialog(&mut h);
    // Shown with a capital, as the printed header writes it (the file keeps "jacob's staff").
    assert!(shown(&h, "Jacob's staff"), "the method is shown capitalised");
    assert!(!shown(&h, "jacob's staff"), "not in lower case");
    // A click in the dialog raises the dialog above a list shown before: the list opened again
    // by a quick click (which raises the dialog too) must still come up above it.
    for choice in ["Laser rangefinder", "Tape"] {
        click(&mut h, "Locality");
        click(&mut h, "Measuring method");
        assert!(h.query_by_label("Other").is_some(), "the list opens again");
        click(&mut h, choice);
        assert!(h.query_by_label("Other").is_none(), "{choice}: the choice closes the list");
        assert!(
            h.state().section_details_open(),
            "{choice}: the click went to the list, not beside the dialog"
        );
    }
    h.get_by_label("Apply").click();
    h.run();
    h.run();
    assert!(!h.state().section_details_open(), "Apply closes the dialog");
    assert_eq!(h.state().doc.section().method, Some(MeasuringMethod::Tape), "the choice is stored");
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(h.state().doc.section(), &before, "one undo takes it back");
}

#[test]
fn the_dialog_opened_over_the_statistics_window_is_on_top_and_takes_the_clicks() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::T);
    h.run();
    h.run();
    assert!(h.query_by_label("Statistics").is_some(), "the Statistics window is open");
    // A click in the Statistics window raises it, as a user's would.
    click(&mut h, "Axial");
    open_dialog(&mut h);
    let apply = h.get_by_label("Apply").rect().center();
    let on_top = h.ctx.layer_id_at(apply).expect("a layer under Apply");
    assert_eq!(on_top.order, egui::Order::Foreground, "the dialog is above every window: {on_top:?}");
    // Typed and applied with the pointer: the clicks reach the dialog, not the window behind.
    h.get_by_label("Locality").click();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.get_by(|n| n.is_focused()).type_text("north wall");
    h.run();
    click(&mut h, "Apply");
    assert!(!h.state().section_details_open(), "Apply closed the dialog");
    assert_eq!(h.state().doc.section().locality, "north wall");
}

#[test]
fn the_section_tab_sums_up_the_measuring_setting_and_follows_the_dialog() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.state_mut().tab = aggrade::gui::Tab::Section;
    h.run();
    h.run();
    let s = h.state().doc.section().clone();
    let b = s.bedding.expect("the demo's section has a bedding attitude");
    let top = s.fixes.iter().find(|f| f.role == aggrade_core::model::FixRole::Top).expect("a top fix");
    for line in [
        "Jacob's staff · ± 0.05 m".to_string(),
        // Right-hand rule: strike = dip direction − 90° (common practice in field work).
        format!("dip {}° towards {:03}°", b.dip_deg, b.dip_direction_deg),
        format!("strike/dip {:03}°/{}° (RHR)", b.dip_direction_deg - 90.0, b.dip_deg),
        format!("{} · top at {} m", s.fixes.len(), top.height_m),
    ] {
        assert!(shown_containing(&h, &line), "the Section tab lacks {line:?}");
    }
    // Changed in the dialog, the summary follows.
    open_dialog(&mut h);
    click(&mut h, "Measuring method");
    click(&mut h, "Tape");
    click(&mut h, "Apply");
    assert!(shown_containing(&h, "Tape · ± 0.05 m"), "the summary follows the stored method");
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
fn a_menu_left_open_behind_the_dialog_is_closed_and_never_drawn_over_it() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.get_by_label("File").click();
    h.run();
    assert!(h.query_by_label("Open recent").is_some(), "the File menu is open");
    open_dialog(&mut h);
    assert!(h.query_by_label("Open recent").is_none(), "the menu behind closed with the dialog's opening");
    // The dialog's own list still opens above it.
    click(&mut h, "Measuring method");
    let tape = h.get_by_label("Tape").rect().center();
    let layer = h.ctx.layer_id_at(tape).expect("a layer under the list");
    assert_eq!(layer.order, egui::Order::Foreground);
    click(&mut h, "Tape");
    click(&mut h, "Apply");
    assert_eq!(h.state().doc.section().method, Some(MeasuringMethod::Tape));
}
