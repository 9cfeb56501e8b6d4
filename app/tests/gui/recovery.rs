//! Never lose a word: kill the app mid-session (one window or two) and check the next start
//! recovers every edit; save, save as, export and quit with no system file dialog; a file changed
//! or removed on disk; broken files reach a person with the command line's own message.
//!
//! The parent test starts this same test binary again in "child" mode: the child drives the real
//! window (egui_kittest, the same `AggradeApp`) through keyboard edits and a review decision,
//! then keeps running frames like an idle window. The parent waits until the child's recovery
//! file holds the last edit, kills the child with SIGKILL (no chance to clean up), then starts
//! a fresh app on the same data folder, accepts the restore offer and checks every edit.

use super::harness::{harness_of, push_close_request};
use aggrade::gui::test_hooks::recovery;
use aggrade::gui::test_hooks::recovery::{read_all_backups, DATA_DIR_ENV};
use aggrade::gui::Document;
use aggrade::gui::ScriptedDialogs;
use aggrade::gui::{AggradeApp, AppConfig};
use aggrade_core::model::{Contact, GrainSize, Lithology, Project, ReviewState, Section, WentworthClass};
use egui::Key;
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

const CHILD_ENV: &str = "AGGRADE_TEST_CHILD_SESSION";

/// The window on the demo, with scripted dialogs that answer "cancel".
fn harness(data_dir: &Path) -> Harness<'static, AggradeApp> {
    harness_of(app_with(None, data_dir, Box::new(ScriptedDialogs::default())))
}

/// The child session: edits, then idles until killed. Runs only when started by the parent.
#[test]
fn child_session() {
    let Some(dir) = std::env::var_os(CHILD_ENV) else { return };
    let data = Path::new(&dir);
    assert_eq!(recovery::data_dir(), data, "the child must use the folder the parent gave it");
    let mut h = harness(data);
    h.run();
    h.state_mut().doc = Document::new(Project::new(vec![Section::new("Field day")]), None);
    h.run();
    h.get_by(|n| n.placeholder() == Some("thickness (m)")).focus();
    h.run();
    for (t, l, g) in [("2.5", "mu", "si"), ("1.2", "sa", "c"), ("80cm", "mu", "cl"), ("3", "sa", "vc")] {
        for (text, key) in [(t, Key::Tab), (l, Key::Tab), (g, Key::Enter)] {
            h.get_by(|n| n.is_focused()).type_text(text);
            h.run();
            h.key_press(key);
            h.run();
        }
    }
    // Make the base of the top sandstone erosional in the inspector: a channel base to review.
    h.get_by_label("Bed").click();
    h.run();
    h.get_by_label("Basal contact").click();
    h.run();
    h.get_by_label("erosional").click();
    h.run();
    let top = h.state().doc.section().beds[3].clone();
    assert_eq!(top.base_contact, Contact::Erosional, "inspector edit not applied: {top:?}");
    h.get_by_label("Review").click();
    h.run();
    // Accept the strongest candidate through the review panel.
    h.get_all_by_label("Accept").next().expect("an Accept button").click();
    h.run();
    edits_done_then_idle(&mut h, &data.join("edits-done"));
}

/// The child's last step: tell the parent which revision holds every edit (written to `marker`), then
/// idle like an open window — frames keep coming, time passes, autosave does its work. The
/// parent kills it; the time limit only stops an orphan.
fn edits_done_then_idle(h: &mut Harness<'static, AggradeApp>, marker: &Path) {
    std::fs::write(marker, h.state().doc.revision.to_string()).expect("marker written");
    let start = Instant::now();
    while start.elapsed() < Duration::from_secs(120) {
        h.step();
        std::thread::sleep(Duration::from_millis(20));
    }
}

#[test]
fn killed_session_is_recovered_with_every_edit() {
    if std::env::var_os(CHILD_ENV).is_some() {
        return;
    }
    let data = tempfile::tempdir().expect("temp dir");
    kill_child_after_backup("recovery::child_session", CHILD_ENV, data.path(), 90);

    // Next start: the offer appears; restoring brings every edit back.
    let mut h = harness(data.path());
    h.run();
    assert!(h.state().recovery_pending(), "no restore offer after the crash");
    h.get_by_label("Restore").click();
    h.run();
    let s = h.state().doc.section().clone();
    assert_eq!(s.name, "Field day");
    let got: Vec<(f64, Lithology, Option<GrainSize>)> =
        s.beds.iter().map(|b| (b.thickness_m, b.lithology, b.grain_base)).collect();
    use WentworthClass::*;
    assert_eq!(
        got,
        vec![
            (2.5, Lithology::Mudstone, Some(GrainSize::Class(Silt))),
            (1.2, Lithology::Sandstone, Some(GrainSize::Class(CoarseSand))),
            (0.8, Lithology::Mudstone, Some(GrainSize::Class(Clay))),
            (3.0, Lithology::Sandstone, Some(GrainSize::Class(VeryCoarseSand))),
        ]
    );
    assert_eq!(s.beds[3].base_contact, Contact::Erosional, "the inspector edit was recovered");
    assert_eq!(s.review.len(), 1, "the review decision was recovered");
    assert_eq!(s.review[0].state, ReviewState::Accepted);
    assert!(h.state().doc.dirty);
}

/// Start the child test `child_test` (it finds its data folder in the variable `env`), wait
/// up to `edit_secs` for it to finish its edits (it writes the revision to `edits-done`), then
/// until its backup holds that revision, and kill it without warning.
fn kill_child_after_backup(child_test: &str, env: &str, data: &Path, edit_secs: u64) {
    let exe = std::env::current_exe().expect("test binary");
    let mut child = Command::new(exe)
        .args(["--exact", child_test, "--nocapture", "--test-threads", "1"])
        .env(env, data)
        .env(DATA_DIR_ENV, data)
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .expect("child started");
    // Wait for the child to finish its edits.
    let start = Instant::now();
    let marker = data.join("edits-done");
    let revision = loop {
        if let Some(r) = std::fs::read_to_string(&marker).ok().and_then(|t| t.trim().parse::<u64>().ok()) {
            break r;
        }
        if let Ok(Some(status)) = child.try_wait() {
            panic!("the child ended before finishing its edits: {status:?}");
        }
        if start.elapsed() > Duration::from_secs(edit_secs) {
            let _ = child.kill();
            panic!("the child did not finish its edits within {edit_secs} s");
        }
        std::thread::sleep(Duration::from_millis(50));
    };
    // Wait until the autosave holds the last edit, then kill without warning.
    let start = Instant::now();
    loop {
        // The child is alive and holds its backup's lock: read the files directly.
        if read_all_backups(data).iter().any(|(_, r)| r.as_ref().is_ok_and(|r| r.revision == revision)) {
            break;
        }
        if start.elapsed() > Duration::from_secs(60) {
            let _ = child.kill();
            panic!("no autosave of revision {revision} within 60 s");
        }
        std::thread::sleep(Duration::from_millis(50));
    }
    child.kill().expect("killed");
    let status = child.wait().expect("reaped");
    assert!(!status.success(), "the child must have died, not finished: {status:?}");
}

const LONG_CHILD_ENV: &str = "AGGRADE_TEST_CHILD_LONG";

/// Beds of the long section the long child edits (its backup is written off the window's thread).
const LONG_BEDS: usize = 5_000;

/// The child for a long section: thickness edits of a 5,000-bed section, whose backups are
/// encoded and written on a thread of their own, then idle until killed.
#[test]
fn child_long_session() {
    let Some(dir) = std::env::var_os(LONG_CHILD_ENV) else { return };
    let data = Path::new(&dir);
    let mut h = harness(data);
    h.run();
    let long = aggrade::gui::test_hooks::demo::long_section(LONG_BEDS);
    h.state_mut().doc = Document::new(Project::new(vec![long]), None);
    h.run();
    for (k, t) in [(10usize, 2.75), (2_500, 0.35), (LONG_BEDS - 1, 4.5)] {
        let bed = h.state().doc.section().beds[k].id;
        h.state_mut().apply(aggrade::gui::Edit::SetThickness { bed, thickness_m: t });
        // Frames keep coming between edits, as they do while someone types.
        for _ in 0..5 {
            h.step();
            std::thread::sleep(Duration::from_millis(20));
        }
    }
    edits_done_then_idle(&mut h, &data.join("edits-done"));
}

/// A long section's backup is written on a thread of its own; a kill after it landed loses
/// nothing, and the next start offers it back with every edit.
#[test]
fn killed_long_session_is_recovered_with_every_edit() {
    if std::env::var_os(CHILD_ENV).is_some() || std::env::var_os(LONG_CHILD_ENV).is_some() {
        return;
    }
    let data = tempfile::tempdir().expect("temp dir");
    kill_child_after_backup("recovery::child_long_session", LONG_CHILD_ENV, data.path(), 120);

    let mut h = harness(data.path());
    h.run();
    assert!(h.state().recovery_pending(), "no restore offer after the crash");
    h.get_by_label("Restore").click();
    h.run();
    let s = h.state().doc.section();
    assert_eq!(s.beds.len(), LONG_BEDS);
    let got: Vec<f64> = [10usize, 2_500, LONG_BEDS - 1].iter().map(|&k| s.beds[k].thickness_m).collect();
    assert_eq!(got, vec![2.75, 0.35, 4.5], "every edit of the long section was recovered");
    assert!(h.state().doc.dirty);
}

const WINDOW_ENV: &str = "AGGRADE_TEST_CHILD_WINDOW";

/// A second kind of child: one window with a section of the given name and a few edits through
/// the same `Edit` path the panels use, then idle until killed. Runs only when started so.
#[test]
fn child_window() {
    let Some(name) = std::env::var_os(WINDOW_ENV) else { return };
    let name = name.to_string_lossy().into_owned();
    let data = recovery::data_dir();
    let mut h = harness(&data);
    h.run();
    assert!(!h.state().recovery_pending(), "{name}: offered another living window's backup");
    h.state_mut().doc = Document::new(Project::new(vec![Section::new(name.as_str())]), None);
    for (i, t) in [1.5, 0.75, 2.25].into_iter().enumerate() {
        let mut bed = aggrade::gui::test_hooks::new_bed();
        bed.thickness_m = t;
        bed.lithology = Lithology::Sandstone;
        bed.notes = format!("{name} — bed {i}, ñandú 河床 🪨");
        h.state_mut().apply(aggrade::gui::Edit::InsertBed { index: i, bed });
        h.run();
    }
    edits_done_then_idle(&mut h, &data.join(format!("{name}.done")));
}

fn start_window(data: &Path, name: &str) -> std::process::Child {
    Command::new(std::env::current_exe().expect("test binary"))
        .args(["--exact", "recovery::child_window", "--nocapture", "--test-threads", "1"])
        .env(WINDOW_ENV, name)
        .env(DATA_DIR_ENV, data)
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .expect("child started")
}

/// Wait until the window named `name` has autosaved its last edit.
fn wait_for_backup(data: &Path, name: &str, child: &mut std::process::Child) {
    let start = Instant::now();
    loop {
        let revision = std::fs::read_to_string(data.join(format!("{name}.done")))
            .ok()
            .and_then(|t| t.trim().parse::<u64>().ok());
        if let Some(rev) = revision {
            let saved = read_all_backups(data)
                .into_iter()
                .any(|(_, r)| r.is_ok_and(|r| r.revision == rev && r.project.sections[0].name == name));
            if saved {
                return;
            }
        }
        if let Ok(Some(status)) = child.try_wait() {
            panic!("window {name} ended early: {status:?}");
        }
        if start.elapsed() > Duration::from_secs(90) {
            let _ = child.kill();
            panic!("window {name} did not autosave within 90 s");
        }
        std::thread::sleep(Duration::from_millis(50));
    }
}

/// Two windows with unsaved work, each with a backup of its own: a window started meanwhile
/// offers neither (both are alive), and after both are killed with SIGKILL the next start
/// offers both; discarding one leaves the other whole.
#[test]
fn two_windows_killed_keep_two_backups_and_discarding_one_spares_the_other() {
    if std::env::var_os(CHILD_ENV).is_some() || std::env::var_os(WINDOW_ENV).is_some() {
        return;
    }
    let data = tempfile::tempdir().expect("temp dir");
    let mut a = start_window(data.path(), "Window A");
    wait_for_backup(data.path(), "Window A", &mut a);
    let mut b = start_window(data.path(), "Window B");
    wait_for_backup(data.path(), "Window B", &mut b);
    assert_eq!(read_all_backups(data.path()).len(), 2, "the two windows share a backup");

    // A third window while both live: no offer, and nothing of theirs is touched.
    {
        let mut h = harness(data.path());
        h.run();
        assert!(!h.state().recovery_pending(), "offered the work of windows still open");
    }
    assert_eq!(read_all_backups(data.path()).len(), 2, "a third window removed a living window's backup");

    for c in [&mut a, &mut b] {
        c.kill().expect("SIGKILL");
        let status = c.wait().expect("reaped");
        assert!(!status.success(), "the window must have died: {status:?}");
    }

    let mut h = harness(data.path());
    h.run();
    let offered = h.state().offered_backups();
    assert_eq!(offered.len(), 2, "{offered:?}");
    assert!(offered.iter().all(|l| l.contains("never saved") && l.contains("UTC")), "{offered:?}");
    // Discard the first listed; the other stays on disk, whole.
    h.get_all_by_label("Discard").next().expect("a Discard button").click();
    h.run();
    let left = read_all_backups(data.path());
    assert_eq!(left.len(), 1, "discarding one touched the other");
    let kept = left[0].1.as_ref().expect("readable").project.sections[0].name.clone();
    h.get_by_label("Restore").click();
    h.run();
    assert!(!h.state().recovery_pending());
    let s = h.state().doc.section().clone();
    assert_eq!(s.name, kept);
    assert_eq!(s.beds.len(), 3);
    assert!(s.beds[2].notes.ends_with("ñandú 河床 🪨"), "{:?}", s.beds[2].notes);
    assert!(h.state().doc.dirty, "restored work is unsaved until saved");
}

fn app_with(file: Option<PathBuf>, data: &Path, dialogs: Box<dyn aggrade::gui::FileDialogs>) -> AggradeApp {
    AggradeApp::new(AppConfig { file, data_dir: data.to_path_buf(), dialogs, recent: Vec::new() })
}

/// A harness for tests that open Aggrade's own file chooser: its folder and file-name fields
/// (drawn by the `egui_file` crate) carry no accessible name, which kittest's accessibility
/// check would otherwise refuse.
fn harness_with_chooser(app: AggradeApp) -> Harness<'static, AggradeApp> {
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .with_accessibility_check(false)
        .build_ui_state(|ui, app: &mut AggradeApp| app.ui_main(ui), app)
}

/// A dirty document holding one section of this name (non-English, to try file names too).
fn fresh_work(h: &mut Harness<'static, AggradeApp>, name: &str) {
    h.state_mut().doc = Document::new(Project::new(vec![Section::new(name)]), None);
    let mut bed = aggrade::gui::test_hooks::new_bed();
    bed.notes = "trozos de madera carbonizada; 炭化木片".into();
    h.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed });
    h.run();
}

fn request_close(h: &mut Harness<'static, AggradeApp>) {
    push_close_request(h);
    h.run();
}

#[test]
fn save_save_as_export_and_quit_save_work_with_no_system_file_dialog() {
    use egui::Modifiers;
    let dir = tempfile::tempdir().expect("temp dir");
    let data = dir.path().join("data");
    let work = dir.path().join("work");
    std::fs::create_dir_all(&work).expect("dir");
    let mut h = harness_with_chooser(app_with(None, &data, Box::new(aggrade::gui::NoSystemDialogs)));
    h.run();
    h.state_mut().chooser_mut().start_dir = Some(work.clone());
    fresh_work(&mut h, "Río Ñuble");

    // Save: Aggrade's own chooser opens and says why.
    h.key_press_modifiers(Modifiers::COMMAND, Key::S);
    h.run();
    assert!(
        h.query_by_label_contains("Aggrade's own file chooser").is_some(),
        "the chooser does not say why"
    );
    h.get_by_label("Save here").click();
    h.run();
    let saved = work.join("Río Ñuble.aggrade");
    assert!(saved.is_file(), "not saved: {}", h.state().status);
    assert!(!h.state().doc.dirty);
    let back = aggrade_core::io::load(&saved).expect("reads back").project;
    assert_eq!(back, *h.state().doc.project);

    // Save as onto the same name: asks before replacing, then writes.
    h.state_mut().apply(aggrade::gui::Edit::SetDisplayUnit { unit: aggrade_core::model::LengthUnit::Foot });
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::S);
    h.run();
    h.get_by_label("Save here").click();
    h.run();
    assert!(h.query_by_label("Replace the file?").is_some(), "no question before replacing");
    h.get_by_label("Replace").click();
    h.run();
    assert!(!h.state().doc.dirty, "{}", h.state().status);
    let back = aggrade_core::io::load(&saved).expect("reads back").project;
    assert_eq!(back.sections[0].display_unit, aggrade_core::model::LengthUnit::Foot);

    // Export: the column's PDF through the same chooser.
    h.key_press_modifiers(Modifiers::COMMAND, Key::E);
    h.run();
    h.get_by_label("Export PDF…").click();
    h.run();
    h.get_by_label("Save here").click();
    h.run();
    let pdf = work.join("Río Ñuble.pdf");
    let bytes = std::fs::read(&pdf).expect("PDF written");
    assert!(bytes.starts_with(b"%PDF"), "not a PDF");
    assert!(h.state().status.contains("Exported"), "{}", h.state().status);

    // A view's export too: the channel-body table's CSV.
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::B);
    h.run();
    h.get_by_label("Export bodies CSV…").click();
    h.run();
    h.get_by_label("Save here").click();
    h.run();
    let csv = std::fs::read_to_string(work.join("channel-bodies.csv")).expect("CSV written");
    assert!(csv.lines().count() >= 1, "empty CSV");
    assert!(h.state().status.contains("channel-bodies.csv"), "{}", h.state().status);
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::B);
    h.run();

    // Quit ▸ Save on a new project: saved through the chooser, then the window closes.
    fresh_work(&mut h, "Quit test");
    request_close(&mut h);
    assert!(h.query_by_label("Save changes?").is_some());
    h.get_by_label("Save").click();
    h.run();
    assert!(!h.state().close_allowed(), "closed before the file was chosen");
    h.get_by_label("Save here").click();
    h.run();
    assert!(work.join("Quit test.aggrade").is_file(), "{}", h.state().status);
    assert!(h.state().close_allowed(), "the window did not close after saving");
}

#[test]
fn a_failed_save_in_the_quit_prompt_keeps_the_window_and_the_work() {
    let dir = tempfile::tempdir().expect("temp dir");
    let data = dir.path().join("data");
    let folder = dir.path().join("usb-stick");
    std::fs::create_dir_all(&folder).expect("dir");
    let file = folder.join("log.aggrade");
    aggrade_core::io::save_project(&file, &Project::new(vec![Section::new("Stick")])).expect("saved");
    let mut h = harness_of(app_with(Some(file.clone()), &data, Box::new(ScriptedDialogs::default())));
    h.run();
    let id = aggrade::gui::test_hooks::new_bed();
    h.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed: id });
    h.run();
    // The stick is pulled out: the folder is gone.
    std::fs::remove_dir_all(&folder).expect("removed");
    request_close(&mut h);
    h.get_by_label("Save").click();
    h.run();
    assert!(h.query_by_label("The file is gone").is_some(), "a removed file is not noticed");
    h.get_by_label("Save it there again").click();
    h.run();
    let notice = h.state().message.clone().expect("a message");
    assert_eq!(notice.title, "Could not save");
    assert!(notice.text.contains("log.aggrade"), "{}", notice.text);
    assert!(!h.state().close_allowed(), "the window closed with unsaved work after a failed save");
    assert!(h.state().doc.dirty);
    // The work is in this window's backup meanwhile.
    let backups = read_all_backups(&data);
    assert!(backups.iter().any(|(_, r)| r.as_ref().is_ok_and(|r| r.project.sections[0].beds.len() == 1)));
}

#[test]
fn dont_save_on_quit_leaves_no_backup_to_offer_next_time() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Box::new(ScriptedDialogs::default())));
    h.run();
    fresh_work(&mut h, "Thrown away");
    h.run();
    assert!(!read_all_backups(data.path()).is_empty(), "the autosave did not run");
    request_close(&mut h);
    h.get_by_label("Don't save").click();
    h.run();
    h.run();
    assert!(h.state().close_allowed());
    assert!(read_all_backups(data.path()).is_empty(), "the discarded work was written again");
    drop(h);
    let next = app_with(None, data.path(), Box::new(ScriptedDialogs::default()));
    assert!(!next.recovery_pending(), "the next start offers work the geologist threw away");
}

#[test]
fn saving_over_a_file_changed_elsewhere_asks_and_keep_both_keeps_both() {
    use egui::Modifiers;
    let dir = tempfile::tempdir().expect("temp dir");
    let data = dir.path().join("data");
    let file = dir.path().join("shared log.aggrade");
    aggrade_core::io::save_project(&file, &Project::new(vec![Section::new("Shared")])).expect("saved");
    // Two windows on the same file.
    let mut w1 = harness_of(app_with(Some(file.clone()), &data, Box::new(ScriptedDialogs::default())));
    let mut w2 = harness_of(app_with(Some(file.clone()), &data, Box::new(ScriptedDialogs::default())));
    w1.run();
    w2.run();
    for (h, t) in [(&mut w1, 1.0), (&mut w2, 2.0)] {
        let mut bed = aggrade::gui::test_hooks::new_bed();
        bed.thickness_m = t;
        h.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed });
        h.run();
    }
    assert_ne!(w1.state().recovery_path(), w2.state().recovery_path(), "two windows share one backup");
    // Window 1 saves; window 2's save must not overwrite it unasked.
    w1.key_press_modifiers(Modifiers::COMMAND, Key::S);
    w1.run();
    assert!(!w1.state().doc.dirty, "{}", w1.state().status);
    w2.key_press_modifiers(Modifiers::COMMAND, Key::S);
    w2.run();
    assert!(w2.state().disk_prompt_pending(), "window 2 overwrote window 1's save without asking");
    assert!(w2.query_by_label("The file changed on disk").is_some());
    w2.get_by_label("Keep both").click();
    w2.run();
    let theirs = aggrade_core::io::load(&file).expect("reads").project;
    assert_eq!(theirs.sections[0].beds[0].thickness_m, 1.0, "window 1's save was overwritten");
    let mine_path = dir.path().join("shared log (2).aggrade");
    let mine = aggrade_core::io::load(&mine_path).expect("kept beside it").project;
    assert_eq!(mine.sections[0].beds[0].thickness_m, 2.0);
    assert_eq!(w2.state().doc.path.as_deref(), Some(mine_path.as_path()), "window 2 now edits its own copy");

    // Changed again by another program: Overwrite replaces it after asking.
    let mut other = theirs.clone();
    other.sections[0].notes = "edited by a sync tool".into();
    aggrade_core::io::save_project(&file, &other).expect("saved");
    let mut bed = aggrade::gui::test_hooks::new_bed();
    bed.thickness_m = 3.0;
    w1.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed });
    w1.run();
    w1.key_press_modifiers(Modifiers::COMMAND, Key::S);
    w1.run();
    assert!(w1.state().disk_prompt_pending());
    w1.get_by_label("Overwrite").click();
    w1.run();
    assert!(!w1.state().doc.dirty);
    assert_eq!(aggrade_core::io::load(&file).expect("reads").project.sections[0].beds[0].thickness_m, 3.0);

    // Deleted meanwhile: saved again on request.
    std::fs::remove_file(&file).expect("removed");
    let bed = aggrade::gui::test_hooks::new_bed();
    w1.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed });
    w1.run();
    w1.key_press_modifiers(Modifiers::COMMAND, Key::S);
    w1.run();
    assert!(w1.query_by_label("The file is gone").is_some());
    w1.get_by_label("Save it there again").click();
    w1.run();
    assert!(file.is_file(), "the removed file was not written again");
    assert!(!w1.state().doc.dirty);
}

#[test]
fn a_broken_file_shows_in_the_window_what_the_command_line_says() {
    use egui::Modifiers;
    let dir = tempfile::tempdir().expect("temp dir");
    let data = dir.path().join("data");
    let bad = Path::new(env!("CARGO_MANIFEST_DIR")).join("../tests/data/bad");
    let written = [
        ("negative.csv", "thickness_m,lithology,grain\n1.0,sandstone,fine sand\n-2,mudstone,clay\n"),
        ("granite.csv", "thickness_m,lithology,grain\n1.0,granite,fine sand\n"),
        (
            "cut.aggrade",
            "{ \"format_version\": 1, \"sections\": [ { \"name\": \"Cut\", \"beds\": [ {\"id\": 1,",
        ),
    ];
    let mut files: Vec<PathBuf> = written
        .iter()
        .map(|(name, text)| {
            let p = dir.path().join(name);
            std::fs::write(&p, text).expect("write");
            p
        })
        .collect();
    files.extend(
        ["negative_thickness.aggrade", "invalid_utf8.csv", "wrong_types.aggrade"].map(|f| bad.join(f)),
    );
    for file in files {
        let dialogs = ScriptedDialogs { answers: vec![Some(file.clone())].into() };
        let mut h = harness_of(app_with(None, &data, Box::new(dialogs)));
        h.run();
        h.key_press_modifiers(Modifiers::COMMAND, Key::O);
        h.run();
        let notice = h.state().message.clone().unwrap_or_else(|| panic!("{}: no message", file.display()));
        let cli = Command::new(env!("CARGO_BIN_EXE_aggrade")).arg("check").arg(&file).output().expect("runs");
        assert!(!cli.status.success(), "{} passed the check", file.display());
        let said = String::from_utf8_lossy(&cli.stderr);
        let said = said.trim_end().strip_prefix("aggrade: ").unwrap_or(&said).to_string();
        assert_eq!(notice.text, said, "{}: the window and the command line differ", file.display());
        assert!(notice.text.contains("line "), "{}: no line number: {}", file.display(), notice.text);
        assert_eq!(notice.folder.as_deref(), file.parent(), "the folder offered is the file's");
        assert!(h.query_by_label("Open folder").is_some());
    }
}

/// Found by a newcomer's trial: a window restored after a crash saved over a file changed
/// meanwhile without asking (the restored document forgot what the file looked like).
#[test]
fn a_restored_window_still_asks_before_saving_over_a_file_changed_since() {
    use egui::Modifiers;
    let dir = tempfile::tempdir().expect("temp dir");
    let data = dir.path().join("data");
    let file = dir.path().join("camp log.aggrade");
    aggrade_core::io::save_project(&file, &Project::new(vec![Section::new("Camp")])).expect("saved");
    {
        let mut h = harness_of(app_with(Some(file.clone()), &data, Box::new(ScriptedDialogs::default())));
        h.run();
        let bed = aggrade::gui::test_hooks::new_bed();
        h.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed });
        h.run();
        h.run();
        // The window dies here: its backup stays, its lock goes with it.
    }
    let mut other = Project::new(vec![Section::new("Camp")]);
    other.sections[0].notes = "changed by a colleague".into();
    aggrade_core::io::save_project(&file, &other).expect("saved");

    let mut h = harness_of(app_with(None, &data, Box::new(ScriptedDialogs::default())));
    h.run();
    h.get_by_label("Restore").click();
    h.run();
    assert_eq!(h.state().doc.path.as_deref(), Some(file.as_path()));
    h.key_press_modifiers(Modifiers::COMMAND, Key::S);
    h.run();
    assert!(h.state().disk_prompt_pending(), "saved over the colleague's change without asking");
    let on_disk = aggrade_core::io::load(&file).expect("reads").project;
    assert_eq!(on_disk.sections[0].notes, "changed by a colleague");
}

/// Found by a newcomer's trial: a file opened by a relative path was kept so in the backup,
/// and a restore started from another folder saved to the wrong place.
#[test]
fn files_are_kept_by_their_absolute_path() {
    let data = tempfile::tempdir().expect("temp dir");
    let relative = PathBuf::from("../sample_sections/demo.aggrade");
    assert!(relative.is_relative() && relative.exists(), "tests run in the app folder");
    let app = app_with(Some(relative), data.path(), Box::new(ScriptedDialogs::default()));
    let path = app.doc.path.clone().expect("a project file");
    assert!(path.is_absolute(), "{}", path.display());
    assert!(path.ends_with("sample_sections/demo.aggrade"));
}

/// Found by a newcomer's trial: a value typed in the Bed tab that did not read was lost in a
/// crash. It now rides in the backup and is listed after the restore.
#[test]
fn a_typed_value_that_did_not_read_survives_a_crash_and_is_listed_after_restore() {
    use egui::accesskit::Role;
    let data = tempfile::tempdir().expect("temp dir");
    {
        let mut h = harness(data.path());
        h.run();
        h.state_mut().tab = aggrade::gui::Tab::Inspector;
        let bed = h.state().doc.section().beds[1].id;
        h.state_mut().doc.selected_bed = Some(bed);
        h.run();
        h.get_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some("Paleocurrents (°)"))
            .focus();
        h.run();
        h.get_by(|n| n.is_focused()).type_text("240 425");
        h.run();
        h.key_press(Key::Enter);
        h.run();
        h.run();
        let kept = read_all_backups(data.path());
        assert!(
            kept.iter()
                .any(|(_, r)| r.as_ref().is_ok_and(|r| r.unstored.iter().any(|l| l.contains("240 425")))),
            "the typed text is not in the backup"
        );
    }
    let mut h = harness(data.path());
    h.run();
    h.get_by_label("Restore").click();
    h.run();
    let notice = h.state().message.clone().expect("the values are listed");
    assert_eq!(notice.title, "Values that were not stored");
    assert!(
        notice.text.contains("Paleocurrents (°) \"") && notice.text.contains("240 425\""),
        "{}",
        notice.text
    );
}

/// Every way a file is opened puts it in File ▸ Open recent: Aggrade's own chooser (shown when
/// the system's cannot be) and a restore of unsaved work that belongs to a file.
#[test]
fn files_opened_in_aggrades_own_chooser_or_restored_enter_open_recent() {
    use egui::Modifiers;
    let dir = tempfile::tempdir().expect("temp dir");
    let data = dir.path().join("data");
    let work = dir.path().join("work");
    std::fs::create_dir_all(&work).expect("dir");
    let file = work.join("camp log.aggrade");
    aggrade_core::io::save_project(&file, &Project::new(vec![Section::new("Camp")])).expect("saved");
    {
        let mut h = harness_with_chooser(app_with(None, &data, Box::new(aggrade::gui::NoSystemDialogs)));
        h.run();
        h.state_mut().chooser_mut().start_dir = Some(work.clone());
        h.key_press_modifiers(Modifiers::COMMAND, Key::O);
        h.run();
        h.get_by_label_contains("camp log.aggrade").click();
        h.run();
        h.get_by_label("Open this file").click();
        h.run();
        h.run();
        assert_eq!(h.state().doc.path.as_deref(), Some(file.as_path()), "{}", h.state().status);
        assert_eq!(h.state().recent_files(), std::slice::from_ref(&file));
        // Unsaved work on it, then the window dies: its backup stays.
        let bed = aggrade::gui::test_hooks::new_bed();
        h.state_mut().apply(aggrade::gui::Edit::InsertBed { index: 0, bed });
        h.run();
        h.run();
    }
    // The list is gone (a new data folder for the list only would do the same): the restore
    // puts the file back in it.
    std::fs::remove_file(data.join("recent.json")).expect("the list was kept in the data folder");
    let mut h = harness_of(app_with(None, &data, Box::new(ScriptedDialogs::default())));
    h.run();
    assert!(h.state().recent_files().is_empty());
    h.get_by_label("Restore").click();
    h.run();
    assert_eq!(h.state().doc.path.as_deref(), Some(file.as_path()));
    assert_eq!(h.state().recent_files(), [file]);
}
