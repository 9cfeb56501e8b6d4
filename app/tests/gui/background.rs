//! After an edit of a long section the rules and layout run on a worker thread while the window
//! keeps drawing the column from before; these tests pin that the column catches up, that the
//! stale column is safe to draw while beds are deleted under it, that short sections stay
//! up to date within the frame, and that whatever must see the current state waits for it.

use super::harness::harness_of;
use aggrade::gui::test_hooks::demo;
use aggrade::gui::Edit;
use aggrade::gui::ScriptedDialogs;
use aggrade::gui::BACKGROUND_RULES_MIN_BEDS;
use aggrade::gui::{AggradeApp, AppConfig};
use aggrade_core::model::Project;
use egui_kittest::Harness;
use std::path::Path;

fn harness_on(project: Project, dir: &Path) -> Harness<'static, AggradeApp> {
    let path = dir.join("section.aggrade");
    aggrade::gui::test_hooks::files::save(&path, &project).expect("written");
    let app = AggradeApp::new(AppConfig {
        file: Some(path),
        data_dir: dir.to_path_buf(),
        dialogs: Box::new(ScriptedDialogs::default()),
        recent: Vec::new(),
    });
    harness_of(app)
}

/// Step frames until the worker has reported. The bound only keeps a broken worker from hanging
/// the suite (it is not a timing requirement: the worker usually reports within a few frames).
fn until_current(h: &mut Harness<'static, AggradeApp>) -> usize {
    for frames in 1..=6_000 {
        h.step();
        if !h.state().column_pending() {
            return frames;
        }
        std::thread::sleep(std::time::Duration::from_millis(5));
    }
    panic!("the column never caught up with the edit");
}

#[test]
fn a_long_sections_column_catches_up_with_an_edit_made_while_it_was_drawn() {
    let dir = tempfile::tempdir().expect("temp dir");
    let mut h = harness_on(Project::new(vec![demo::long_section(3_000)]), dir.path());
    h.run();
    assert!(h.state().doc.section().beds.len() >= BACKGROUND_RULES_MIN_BEDS);
    let before = h.state().doc.revision;
    assert_eq!(h.state().column_revision(), Some(before));
    let old_total = h.state().doc.section().total_thickness_m();

    let bed = h.state().doc.section().beds[5].id;
    let t0 = h.state().doc.section().beds[5].thickness_m;
    h.state_mut().apply(Edit::SetThickness { bed, thickness_m: t0 + 7.0 });
    h.step();
    // The frame after the edit drew the column from before and left the rules to the worker.
    assert!(h.state().column_pending(), "the rules ran in the frame");
    assert_eq!(h.state().column_revision(), Some(before));

    until_current(&mut h);
    let now = h.state().doc.revision;
    assert_eq!(h.state().column_revision(), Some(now));
    let total = h.state_mut().interpretation().total_thickness_m;
    assert!((total - (old_total + 7.0)).abs() < 1e-6, "{total} vs {old_total} + 7");
}

#[test]
fn deleting_beds_under_a_stale_column_is_safe_and_undo_catches_up_too() {
    let dir = tempfile::tempdir().expect("temp dir");
    let mut h = harness_on(Project::new(vec![demo::long_section(2_500)]), dir.path());
    h.run();
    // Delete the top hundred beds one frame each: every frame draws a column that still holds
    // beds the section no longer has.
    for _ in 0..100 {
        let top = h.state().doc.section().beds.last().expect("beds left").id;
        h.state_mut().apply(Edit::DeleteBed { bed: top });
        h.step();
    }
    until_current(&mut h);
    assert_eq!(h.state().doc.section().beds.len(), 2_400);
    let n = h.state_mut().interpretation().elements.len();
    assert_eq!(n, 2_400);
    h.state_mut().doc.undo();
    h.step();
    until_current(&mut h);
    assert_eq!(h.state_mut().interpretation().elements.len(), 2_401);
}

#[test]
fn a_short_section_is_up_to_date_in_the_frame_of_the_edit() {
    let dir = tempfile::tempdir().expect("temp dir");
    let mut h = harness_on(Project::new(vec![demo::long_section(300)]), dir.path());
    h.run();
    let bed = h.state().doc.section().beds[3].id;
    h.state_mut().apply(Edit::SetThickness { bed, thickness_m: 2.5 });
    h.step();
    assert!(!h.state().column_pending());
    assert_eq!(h.state().column_revision(), Some(h.state().doc.revision));
}

#[test]
fn asking_for_the_interpretation_waits_for_the_worker() {
    let dir = tempfile::tempdir().expect("temp dir");
    let mut h = harness_on(Project::new(vec![demo::long_section(3_000)]), dir.path());
    h.run();
    let bed = h.state().doc.section().beds[0].id;
    h.state_mut().apply(Edit::SetThickness { bed, thickness_m: 40.0 });
    h.step();
    assert!(h.state().column_pending());
    // No frames in between: the interpretation returned is of the edited section.
    let expected = h.state().doc.section().total_thickness_m();
    let total = h.state_mut().interpretation().total_thickness_m;
    assert!((total - expected).abs() < 1e-6, "{total} vs {expected}");
    assert!(!h.state().column_pending());
    assert_eq!(h.state().column_revision(), Some(h.state().doc.revision));
}
