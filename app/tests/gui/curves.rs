//! Attaching a measured curve in the window (egui_kittest, headless): Section menu → scripted LAS
//! pick → the attach window → the document holds the curve, the column gains its track, and undo
//! takes it off again. A malformed LAS file gives the reader's message naming file and line.

use super::harness::{app_with, fixture, harness_of};
use aggrade::gui::AggradeApp;
use aggrade_core::model::IndexDirection;
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::{Path, PathBuf};

fn harness(data_dir: &Path, answers: Vec<Option<PathBuf>>) -> Harness<'static, AggradeApp> {
    harness_of(app_with(Some(fixture("analysis/kestrel_bluff.aggrade")), data_dir, answers))
}

/// Open the Section menu in the menu bar and click an item in it.
fn section_menu(h: &mut Harness<'static, AggradeApp>, item: &str) {
    // The menu bar is drawn before the side panel's "Section" tab, so it comes first.
    h.get_all_by_label("Section").next().expect("Section menu").click();
    h.run();
    h.get_by_label(item).click();
    h.run();
}

#[test]
fn attach_a_gamma_ray_curve_from_the_section_menu_and_undo_it() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(data.path(), vec![Some(fixture("las/kestrel_unwrapped_m.las"))]);
    h.run();
    assert!(h.state().doc.section().curves.is_empty());
    let (_, items_before) = h.state().drawn_items();

    section_menu(&mut h, "Attach measured curve (LAS)…");
    // Depth increasing downward; the offset then defaults to the section's thickness (35.1 m),
    // so depth 0 is the section top.
    h.get_by_label("down (depth)").click();
    h.run();
    h.get_by_label("Attach").click();
    h.run();

    let section = h.state().doc.section().clone();
    assert_eq!(section.curves.len(), 1);
    let c = &section.curves[0];
    assert_eq!((c.mnemonic.as_str(), c.unit.as_str()), ("GR", "API"));
    assert_eq!(c.direction, IndexDirection::DepthBelowDatum);
    assert!((c.offset_m - section.total_thickness_m()).abs() < 1e-9);
    assert_eq!(c.source_file, "kestrel_unwrapped_m.las");
    // 21 readings at depths 0–10 m (the fixture's ~A block): heights 25.1–35.1 m, lowest first.
    assert_eq!(c.samples.len(), 21);
    assert!((c.samples[0].0 - (section.total_thickness_m() - 10.0)).abs() < 1e-9);
    assert!((c.samples[20].0 - section.total_thickness_m()).abs() < 1e-9);
    assert!(h.state().doc.dirty);
    let (_, items_after) = h.state().drawn_items();
    assert!(
        items_after > items_before,
        "the column gains the curve track ({items_before} → {items_after} items)"
    );

    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert!(h.state().doc.section().curves.is_empty(), "undo takes the curve off");
    let (_, items_undone) = h.state().drawn_items();
    assert_eq!(items_undone, items_before);
}

#[test]
fn a_malformed_las_file_gives_the_readers_message() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(data.path(), vec![Some(fixture("las/bad_number.las"))]);
    h.run();
    section_menu(&mut h, "Attach measured curve (LAS)…");
    let notice = h.state().message.clone().expect("a message dialog");
    let (title, text) = (notice.title, notice.text);
    assert_eq!(title, "Could not read the LAS file");
    assert!(text.contains("bad_number.las") && text.contains("line "), "names file and line: {text}");
    assert!(h.state().doc.section().curves.is_empty());
    assert!(!h.state().doc.dirty, "nothing changed");
}
