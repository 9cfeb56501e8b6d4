//! Body widths typed in the channel-body table: stored in the section's lateral data as one
//! undoable edit each, with the width/thickness ratio and class shown beside them (Gibling 2006
//! classes: ribbon w/t < 15, narrow sheet 15–100, broad sheet > 100; after Friend et al. 1979).

use super::harness::{app_with, demo_file, harness_of};
use aggrade::gui::{AggradeApp, Document};
use aggrade_core::rules::{interpret, RuleParams};
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;

/// How many widgets are labelled exactly `text`.
fn count(h: &Harness<'static, AggradeApp>, text: &str) -> usize {
    h.query_all_by_label(text).count()
}

/// The width cell of the table's first row.
fn first_width_cell<'h>(h: &'h Harness<'static, AggradeApp>) -> egui_kittest::Node<'h> {
    h.query_all_by(|n| n.placeholder() == Some("width (m)")).next().expect("a width cell")
}

#[test]
fn a_width_typed_in_the_body_table_is_stored_classed_and_undone() {
    let data = tempfile::tempdir().expect("temp dir");
    // The demo with the first section's widths taken off, so the first row starts empty.
    let mut a = app_with(Some(demo_file()), data.path(), vec![]);
    let mut project = a.doc.project.as_ref().clone();
    project.sections[0].body_lateral.clear();
    a.doc = Document::new(project, None);
    let mut h = harness_of(a);
    h.run();
    h.state_mut().views.bodies.open = true;
    h.run();
    h.run();

    // The table's first row: the lowest body of the first section.
    let section = h.state().doc.project.sections[0].clone();
    let it = interpret(&section, &RuleParams::default());
    let lowest = it.channel_bodies.iter().min_by(|a, b| a.base_m.total_cmp(&b.base_m)).expect("a body");
    let thickness = lowest.thickness_m;
    let base_bed = section.beds[it.storeys[lowest.storey_indices[0]].first_bed].id;
    assert!(!lowest.is_censored(), "its thickness is whole");

    // A width 12 times the thickness: w/t 12 < 15, a ribbon (Friend et al. 1979; Gibling 2006).
    let width = (12.0 * thickness * 100.0).round() / 100.0;
    let ratio = width / thickness;
    assert!(ratio < 15.0 && ratio > 11.0);
    let ribbons = count(&h, "ribbon");
    first_width_cell(&h).focus();
    h.run();
    h.get_by(|n| n.is_focused()).type_text(&width.to_string());
    h.run();
    h.key_press(Key::Enter);
    h.run();
    h.run();
    let stored = &h.state().doc.project.sections[0].body_lateral;
    assert_eq!(stored.len(), 1, "{stored:?}");
    assert_eq!(
        (stored[0].base_bed, stored[0].width_m, stored[0].beyond_outcrop),
        (base_bed, Some(width), false)
    );
    assert_eq!(count(&h, "ribbon"), ribbons + 1, "the class is shown");
    assert_eq!(count(&h, &format!("{ratio:.1}")), 1, "the ratio is shown");

    // Beyond the outcrop: the width is a minimum, w/t ≥ 12 allows every class.
    let undetermined = count(&h, "undetermined");
    h.query_all_by(|n| n.label().as_deref() == Some("beyond outcrop")).next().expect("a box").click();
    h.run();
    h.run();
    assert!(h.state().doc.project.sections[0].body_lateral[0].beyond_outcrop);
    assert_eq!(count(&h, &format!("\u{2265} {ratio:.1}")), 1, "the ratio is shown as a minimum");
    assert_eq!(count(&h, "ribbon"), ribbons, "never a ribbon from a minimum");
    assert!(count(&h, "undetermined") > undetermined);

    // Undo twice: the box, then the width; the record goes and the class with it.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert!(!h.state().doc.project.sections[0].body_lateral[0].beyond_outcrop);
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    h.run();
    assert!(h.state().doc.project.sections[0].body_lateral.is_empty());
    assert_eq!(count(&h, "ribbon"), ribbons);

    // A width that does not read is refused, kept in its cell, and nothing is stored.
    first_width_cell(&h).focus();
    h.run();
    h.get_by(|n| n.is_focused()).type_text("wide");
    h.run();
    h.key_press(Key::Enter);
    h.run();
    assert!(h.state().doc.project.sections[0].body_lateral.is_empty());
    assert!(
        h.query_all_by(|n| n.value().as_deref() == Some("wide")).next().is_some(),
        "the typed text stays"
    );
}
