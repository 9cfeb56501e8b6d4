//! Kill the app mid-session and check the next start recovers every edit.
//!
//! The parent test starts this same test binary again in "child" mode: the child drives the real
//! window (egui_kittest, the same `AggradeApp`) through keyboard edits and a review decision,
//! then keeps running frames like an idle window. The parent waits until the child's recovery
//! file holds the last edit, kills the child with SIGKILL (no chance to clean up), then starts
//! a fresh app on the same data folder, accepts the restore offer and checks every edit.

use aggrade::gui::document::Document;
use aggrade::gui::files::ScriptedDialogs;
use aggrade::gui::recovery::{find_recovery, DATA_DIR_ENV};
use aggrade::gui::{recovery, AggradeApp, AppConfig};
use aggrade_core::model::{Contact, GrainSize, Lithology, Project, ReviewState, Section, WentworthClass};
use egui::Key;
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::Path;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

const CHILD_ENV: &str = "AGGRADE_TEST_CHILD_SESSION";

fn harness(data_dir: &Path) -> Harness<'static, AggradeApp> {
    let app = AggradeApp::new(AppConfig {
        file: None,
        data_dir: data_dir.to_path_buf(),
        dialogs: Box::new(ScriptedDialogs::default()),
        recent: Vec::new(),
    });
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut AggradeApp| app.ui_main(ui), app)
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
    std::fs::write(data.join("edits-done"), h.state().doc.revision.to_string()).expect("marker written");
    // Idle like an open window: frames keep coming, time passes, autosave does its work. The
    // parent kills us; the time limit only stops an orphan.
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
    let exe = std::env::current_exe().expect("test binary");
    let mut child = Command::new(exe)
        .args(["--exact", "child_session", "--nocapture", "--test-threads", "1"])
        .env(CHILD_ENV, data.path())
        .env(DATA_DIR_ENV, data.path())
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .expect("child started");
    // Wait for the child to finish its edits.
    let start = Instant::now();
    let marker = data.path().join("edits-done");
    let revision = loop {
        if let Some(r) = std::fs::read_to_string(&marker).ok().and_then(|t| t.trim().parse::<u64>().ok()) {
            break r;
        }
        if let Ok(Some(status)) = child.try_wait() {
            panic!("the child ended before finishing its edits: {status:?}");
        }
        if start.elapsed() > Duration::from_secs(90) {
            let _ = child.kill();
            panic!("the child did not finish its edits within 90 s");
        }
        std::thread::sleep(Duration::from_millis(50));
    };
    // Wait until the autosave holds the last edit, then kill without warning.
    let start = Instant::now();
    loop {
        if let Some(Ok(r)) = find_recovery(data.path()) {
            if r.revision == revision {
                break;
            }
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
