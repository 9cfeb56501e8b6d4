//! The section's details in the real window (egui_kittest, driven by keyboard and label): each
//! detail edited through the Section details dialog reaches the document and one undo takes it
//! back; bad input is marked and kept; files opened from the command line enter Open recent; a
//! broken file on the command line shows its error over the same demo as a start with no file;
//! the question before closing names the section; the status bar says what is true after edits;
//! the window's shortcuts wait while the dialog is open.

use super::harness::{app_with, harness_of, push_close_request};
use aggrade::gui::test_hooks::demo;
use aggrade::gui::{AggradeApp, Document, Edit};
use aggrade_core::model::{LatLon, LengthUnit, Project, Section};
use egui::accesskit::Role;
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::Path;

/// The window on a project of two sections ("Corrie Wash" shown, "Pell Butte"), not saved to a
/// file.
fn two_sections(data: &Path) -> Harness<'static, AggradeApp> {
    let mut a = app_with(None, data, Vec::new());
    let mut shown = Section::new("Corrie Wash");
    shown.locality = "Tamsin Ridge".into();
    a.doc = Document::new(Project::new(vec![shown, Section::new("Pell Butte")]), None);
    let mut h = harness_of(a);
    h.run();
    h
}

fn open_dialog(h: &mut Harness<'static, AggradeApp>) {
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::D);
    h.run();
    h.run();
    assert!(h.state().section_details_open(), "Ctrl+Shift+D opens the dialog");
}

/// Replace the text of the dialog's field labelled `label` by typing.
fn type_into(h: &mut Harness<'static, AggradeApp>, label: &str, text: &str) {
    h.query_by(|n| {
        matches!(n.role(), Role::TextInput | Role::MultilineTextInput) && n.label().as_deref() == Some(label)
    })
    .unwrap_or_else(|| panic!("no field {label:?}"))
    .focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.run();
    if !text.is_empty() {
        h.get_by(|n| n.is_focused()).type_text(text);
    } else {
        h.key_press(Key::Backspace);
    }
    h.run();
}

fn apply(h: &mut Harness<'static, AggradeApp>) {
    h.get_by_label("Apply").click();
    h.run();
    h.run();
}

fn shown_containing(h: &Harness<'static, AggradeApp>, part: &str) -> bool {
    h.query_all_by(|n| {
        n.label().is_some_and(|l| l.contains(part)) || n.value().is_some_and(|v| v.contains(part))
    })
    .next()
    .is_some()
}

fn section(h: &Harness<'static, AggradeApp>) -> Section {
    h.state().doc.section().clone()
}

#[test]
fn each_section_detail_is_edited_through_the_dialog_and_one_undo_takes_it_back() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = two_sections(data.path());
    let original = section(&h);
    // (field label, text typed, what the section holds after Apply)
    type Check = fn(&Section) -> bool;
    let cases: [(&str, &str, Check); 8] = [
        ("Section name", "Corrie Wash West", |s| s.name == "Corrie Wash West"),
        ("Locality", "west wall of the wash", |s| s.locality == "west wall of the wash"),
        ("Logged by", "M. Okonkwo", |s| s.logged_by == "M. Okonkwo"),
        ("Date logged", "2026-06-18", |s| s.date_logged.as_deref() == Some("2026-06-18")),
        ("Section notes", "base at the dry wash floor", |s| s.notes == "base at the dry wash floor"),
        ("Panel position (m)", "1250", |s| s.panel_position_m == Some(1250.0)),
        // The latitude alone is refused (see below); here both, one after the other, in one Apply.
        ("Latitude (°)", "24.6132 S", |s| s.coordinates.is_none()),
        ("Longitude (°)", "133.7208", |s| {
            s.coordinates == Some(LatLon { lat_deg: -24.6132, lon_deg: 133.7208 })
        }),
    ];
    for (label, text, check) in cases {
        open_dialog(&mut h);
        if label == "Longitude (°)" {
            type_into(&mut h, "Latitude (°)", "24.6132 S");
        }
        type_into(&mut h, label, text);
        apply(&mut h);
        if label == "Latitude (°)" {
            // One coordinate without the other does not read: marked, kept, nothing stored.
            assert!(h.state().section_details_open(), "the dialog stays open");
            assert!(shown_containing(&h, "give the longitude too"), "the longitude is asked for");
            assert_eq!(section(&h), original, "nothing stored");
            h.get_by_label("Cancel").click();
            h.run();
            assert!(!h.state().section_details_open());
            continue;
        }
        assert!(!h.state().section_details_open(), "{label}: Apply closes the dialog");
        let after = section(&h);
        assert!(check(&after), "{label}: not stored: {after:?}");
        assert!(h.state().doc.dirty);
        assert!(h.state().status.starts_with("Section details of"), "{}", h.state().status);
        h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
        h.run();
        assert_eq!(section(&h), original, "{label}: one undo takes the change back");
    }
    // The display unit: chosen in the dialog, the panel position is typed in it (one foot is
    // 0.3048 m exactly, by the 1959 international agreement).
    open_dialog(&mut h);
    h.get_by_label("ft").click();
    h.run();
    type_into(&mut h, "Panel position (ft)", "1000");
    apply(&mut h);
    let s = section(&h);
    assert_eq!(s.display_unit, LengthUnit::Foot);
    assert_eq!(s.panel_position_m, Some(304.8));
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(section(&h), original, "unit and position are one undo step");
}

#[test]
fn bad_details_are_marked_with_their_message_kept_as_typed_and_never_stored() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = two_sections(data.path());
    let before = h.state().doc.project.clone();
    let revision = h.state().doc.revision;
    open_dialog(&mut h);
    type_into(&mut h, "Section name", "Pell Butte");
    type_into(&mut h, "Date logged", "18/06/2026");
    type_into(&mut h, "Latitude (°)", "95");
    type_into(&mut h, "Longitude (°)", "10");
    type_into(&mut h, "Panel position (m)", "far");
    apply(&mut h);
    assert!(h.state().section_details_open(), "the dialog stays open");
    for message in [
        "already named \"Pell Butte\"",
        "not a date in the form YYYY-MM-DD, got \"18/06/2026\"",
        "between -90 and 90 degrees, got 95",
        "\"far\" is not a distance",
    ] {
        assert!(shown_containing(&h, message), "no message {message:?}");
    }
    assert_eq!(h.state().doc.project, before, "nothing stored");
    assert_eq!(h.state().doc.revision, revision);
    let typed = |h: &Harness<'static, AggradeApp>, label: &str| {
        h.get_by(|n| {
            matches!(n.role(), Role::TextInput | Role::MultilineTextInput)
                && n.label().as_deref() == Some(label)
        })
        .value()
    };
    assert_eq!(typed(&h, "Date logged").as_deref(), Some("18/06/2026"), "kept as typed");
    // Escape does not drop what was typed; the dialog says how to leave.
    h.key_press(Key::Escape);
    h.run();
    h.run();
    assert!(h.state().section_details_open(), "Escape dropped typed text");
    // Closing the window asks, and says the typed details are not applied.
    push_close_request(&mut h);
    h.run();
    h.run();
    assert!(shown_containing(&h, "typed in the Section details dialog"), "the question warns");
    // The question's Cancel (drawn over the dialog, so after it).
    h.get_all_by_label("Cancel").last().expect("the question's Cancel").click();
    h.run();
    assert!(!shown_containing(&h, "typed in the Section details dialog"), "the question is answered");
    assert!(h.state().section_details_open(), "the dialog and its text outlived the question");
    // Fixed, they are stored.
    type_into(&mut h, "Section name", "Corrie Wash");
    type_into(&mut h, "Date logged", "2026-06-18");
    type_into(&mut h, "Latitude (°)", "-45");
    type_into(&mut h, "Panel position (m)", "-12,5");
    // Ctrl+Enter applies from the keyboard, with the focus in a field.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Enter);
    h.run();
    h.run();
    assert!(!h.state().section_details_open());
    let s = section(&h);
    assert_eq!(s.date_logged.as_deref(), Some("2026-06-18"));
    assert_eq!(s.coordinates, Some(LatLon { lat_deg: -45.0, lon_deg: 10.0 }));
    assert_eq!(s.panel_position_m, Some(-12.5));
}

#[test]
fn the_section_menu_and_the_section_tab_open_the_dialog() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = two_sections(data.path());
    // The menu bar's "Section" (the first of the two: the tab has the same word).
    h.get_all_by_label("Section").next().expect("the Section menu").click();
    h.run();
    // The item carries its shortcut beside the words.
    h.get_by_label_contains("Section details…").click();
    h.run();
    assert!(h.state().section_details_open(), "the menu item opens it");
    h.get_by_label("Cancel").click();
    h.run();
    assert!(!h.state().section_details_open());
    h.state_mut().tab = aggrade::gui::Tab::Section;
    h.run();
    h.get_by_label("Section details…").click();
    h.run();
    assert!(h.state().section_details_open(), "the tab's button opens it");
}

#[test]
fn a_file_opened_from_the_command_line_enters_open_recent_for_every_window() {
    let data = tempfile::tempdir().expect("temp dir");
    let work = tempfile::tempdir().expect("temp dir");
    let first = work.path().join("corrie.aggrade");
    let second = work.path().join("pell.aggrade");
    for (p, name) in [(&first, "Corrie Wash"), (&second, "Pell Butte")] {
        aggrade_core::io::save_project(p, &Project::new(vec![Section::new(name)])).expect("saved");
    }
    // `aggrade corrie.aggrade`: the window's config carries the file as main.rs passes it.
    let a = app_with(Some(first.clone()), data.path(), Vec::new());
    assert_eq!(a.recent_files(), std::slice::from_ref(&first));
    // A second window, started meanwhile, opens another file through File ▸ Open.
    let mut other = harness_of(app_with(None, data.path(), vec![Some(second.clone())]));
    other.run();
    other.key_press_modifiers(Modifiers::COMMAND, Key::O);
    other.run();
    assert_eq!(other.state().doc.path.as_deref(), Some(second.as_path()));
    assert_eq!(other.state().recent_files(), [second.clone(), first.clone()], "read, merged, written");
    // The first window's menu lists both (it reads the shared list again when shown).
    let mut h = harness_of(a);
    h.run();
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("Open recent").hover();
    h.run();
    h.run();
    assert!(h.query_by_label(&first.display().to_string()).is_some(), "the command line's file is listed");
    assert!(h.query_by_label(&second.display().to_string()).is_some(), "the other window's file is listed");
    // A later start sees the list.
    let later = app_with(None, data.path(), Vec::new());
    assert_eq!(later.recent_files(), [second, first]);
}

#[test]
fn a_broken_file_on_the_command_line_shows_its_error_over_the_same_demo_as_a_plain_start() {
    let data = tempfile::tempdir().expect("temp dir");
    let bad = data.path().join("field day.aggrade");
    let text = std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade"),
    )
    .expect("demo readable");
    std::fs::write(&bad, text.replacen("\"lat_deg\": -24.6132", "\"lat_deg\": \"south\"", 1)).expect("write");

    let plain = app_with(None, data.path(), Vec::new());
    let mut h = harness_of(app_with(Some(bad.clone()), data.path(), Vec::new()));
    h.run();
    assert_eq!(h.state().doc.project, plain.doc.project, "the same demo as a start with no file");
    assert_eq!(*plain.doc.project, demo::demo().expect("the demo reads"));
    assert!(h.state().doc.demo && h.state().doc.path.is_none(), "the demo is not the broken file");
    assert!(h.state().recent_files().is_empty(), "a file that did not open is not a recent file");
    let notice = h.state().message.clone().expect("the error is shown");
    assert_eq!(notice.title, "Could not open the file");
    for part in ["field day.aggrade", "line 7", "sections[0].coordinates", "the demo project"] {
        assert!(notice.text.contains(part), "the message lacks {part:?}: {}", notice.text);
    }
    // It stays until dismissed, and the status bar still names the file afterwards.
    for _ in 0..5 {
        h.run();
    }
    assert!(h.query_by_label_contains("line 7: sections[0].coordinates").is_some(), "the error is on screen");
    h.get_by_label("OK").click();
    h.run();
    assert!(h.state().message.is_none());
    let line = h.state().status_line();
    assert!(line.contains("Could not open") && line.contains("field day.aggrade"), "{line}");
    assert!(h.state().title().starts_with("Demo project"), "{}", h.state().title());
}

#[test]
fn the_unsaved_changes_question_names_the_section_or_the_file() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = two_sections(data.path());
    h.state_mut().apply(Edit::SetDisplayUnit { unit: LengthUnit::Foot });
    h.run();
    assert_eq!(
        h.state().title(),
        "● Sections “Corrie Wash” and “Pell Butte” (not saved to a file) — Aggrade",
        "the title names the sections"
    );
    push_close_request(&mut h);
    h.run();
    h.run();
    assert!(
        h.query_by_label(
            "The project with sections “Corrie Wash” and “Pell Butte” has unsaved changes and has never been saved to a file."
        )
        .is_some(),
        "the question names the sections"
    );
    assert!(!shown_containing(&h, "New project") && !shown_containing(&h, "Untitled"));
    h.get_by_label("Cancel").click();
    h.run();

    // With a file: the file and its section.
    let file = data.path().join("camp.aggrade");
    aggrade_core::io::save_project(&file, &Project::new(vec![Section::new("Camp")])).expect("saved");
    let mut h = harness_of(app_with(Some(file.clone()), data.path(), Vec::new()));
    h.run();
    h.state_mut().apply(Edit::SetDisplayUnit { unit: LengthUnit::Foot });
    h.run();
    push_close_request(&mut h);
    h.run();
    h.run();
    assert!(h.query_by_label("camp.aggrade (section “Camp”) has unsaved changes.").is_some());
}

#[test]
fn the_status_bar_says_what_is_true_after_edits() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::N);
    h.run();
    assert_eq!(h.state().status_line(), "New project");
    for i in 0..5 {
        let mut bed = aggrade::gui::test_hooks::new_bed();
        bed.thickness_m = 1.0 + f64::from(i);
        h.state_mut().apply(Edit::InsertBed { index: 0, bed });
        h.run();
    }
    let line = h.state().status_line();
    assert_eq!(line, "Not saved to a file yet: unsaved changes · New section (5 beds) · Ctrl+S saves");
    assert!(h.query_by_label(&line).is_some(), "the bar shows it");
    // One bed: no "1 beds".
    let saved = data.path().join("one.aggrade");
    let mut one = Section::new("Solo");
    one.beds.push(aggrade::gui::test_hooks::new_bed());
    aggrade_core::io::save_project(&saved, &Project::new(vec![one])).expect("saved");
    let mut h = harness_of(app_with(Some(saved.clone()), data.path(), Vec::new()));
    h.run();
    assert_eq!(h.state().status_line(), format!("Opened {}", saved.display()));
    assert!(h.query_by_label("1 bed").is_some(), "the menu bar says 1 bed");
    h.state_mut().apply(Edit::SetDisplayUnit { unit: LengthUnit::Foot });
    h.run();
    assert_eq!(h.state().status_line(), "one.aggrade: unsaved changes · Solo (1 bed) · Ctrl+S saves");
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert!(h.state().status_line().starts_with("Undid the last change"), "{}", h.state().status_line());
}

/// With the dialog open, the window's shortcuts wait: Ctrl+N does not put a new project under
/// the typed details, Delete deletes no bed, Ctrl+Z undoes the typing in the field (as a text
/// field does) and not an edit behind the dialog; the shortcuts work again once it is closed.
#[test]
fn the_windows_shortcuts_wait_while_the_dialog_is_open() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = two_sections(data.path());
    h.state_mut().apply(Edit::InsertBed { index: 0, bed: aggrade::gui::test_hooks::new_bed() });
    h.run();
    let bed = h.state().doc.section().beds[0].id;
    h.state_mut().doc.selected_bed = Some(bed);
    let revision = h.state().doc.revision;
    open_dialog(&mut h);
    type_into(&mut h, "Locality", "west wall, Río Ñandú, côté ouest");
    for (mods, key) in [
        (Modifiers::COMMAND, Key::N),
        (Modifiers::COMMAND, Key::O),
        (Modifiers::COMMAND | Modifiers::SHIFT, Key::D),
        (Modifiers::NONE, Key::Delete),
        (Modifiers::COMMAND, Key::Z),
    ] {
        h.key_press_modifiers(mods, key);
        h.run();
        assert!(h.state().section_details_open(), "{mods:?}+{key:?} closed the dialog");
        assert_eq!(
            h.state().doc.revision,
            revision,
            "{mods:?}+{key:?} changed the document behind the dialog"
        );
        assert_eq!(section(&h).name, "Corrie Wash", "{mods:?}+{key:?} replaced the project");
        assert!(!h.state().dialog_open() || h.state().message.is_none(), "{mods:?}+{key:?} put up a notice");
    }
    type_into(&mut h, "Locality", "west wall, Río Ñandú, côté ouest");
    apply(&mut h);
    assert_eq!(section(&h).locality, "west wall, Río Ñandú, côté ouest");
    assert_eq!(section(&h).beds.len(), 1, "no bed deleted");
    // Closed: Ctrl+Z works again and takes the details back.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(section(&h).locality, "Tamsin Ridge");
}
