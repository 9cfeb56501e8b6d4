//! Tracing in the window's document: every trace action is an `Edit` — undone and redone one at
//! a time, written by the autosave and read back by the recovery offer, saved and reopened with
//! the sheet's calibration and its image path relative to the project file.

use super::harness::app_with;
use aggrade::gui::test_hooks::trace::{grain_click, with_lithology};
use aggrade::gui::test_hooks::{files, recovery};
use aggrade::gui::{Document, Edit};
use aggrade_core::model::{GrainSize, Lithology, Project, Section, WentworthClass};
use aggrade_core::trace::sheet::{relative_image_path, resolve_image_path};
use aggrade_core::trace::{GrainScale, HeightScale, Pt, TraceSheet};
use std::path::Path;

fn calibrated(image: &str) -> TraceSheet {
    let mut sheet = TraceSheet::new(image);
    // 0 m at y = 1000 px, 10 m at y = 0 px; clay at x = 100 px, pebble at x = 800 px.
    sheet.height_scale = Some(HeightScale {
        low_px: Pt::new(50.0, 1000.0),
        low_m: 0.0,
        high_px: Pt::new(50.0, 0.0),
        high_m: 10.0,
    });
    sheet.grain_scale = Some(GrainScale {
        fine_px: Pt::new(100.0, 1010.0),
        fine: WentworthClass::Clay,
        coarse_px: Pt::new(800.0, 1010.0),
        coarse: WentworthClass::Pebble,
    });
    sheet
}

fn thicknesses(doc: &Document) -> Vec<f64> {
    doc.section().beds.iter().map(|b| (b.thickness_m * 1e9).round() / 1e9).collect()
}

#[test]
fn trace_actions_undo_autosave_and_reopen() {
    let dir = tempfile::tempdir().expect("temp dir");
    let project_file = dir.path().join("field").join("log.aggrade");
    let image = dir.path().join("field").join("scans").join("sheet.jpg");
    let stored = relative_image_path(&project_file, &image);
    assert_eq!(stored, "scans/sheet.jpg");

    let mut doc = Document::new(Project::new(vec![Section::new("Traced")]), None);
    doc.apply(Edit::SetTrace { trace: Some(calibrated(&stored)) }).expect("calibration accepted");
    let sheet = doc.section().trace.clone().expect("set");
    // Three boundary clicks from the base up (heights read from the sheet), then one inside the
    // lowest bed.
    for y in [880.0, 700.0, 450.0, 950.0] {
        let h = sheet.height_at(Pt::new(300.0, y)).expect("calibrated");
        doc.apply(Edit::TraceBoundary { height_m: h }).expect("boundary");
    }
    assert_eq!(thicknesses(&doc), vec![0.5, 0.7, 1.8, 2.5]);
    // Letters over the second bed make it sandstone; a Shift+click at 3 classes from clay sets
    // its grain size (fine sand: clay 0, silt 1, very fine 2, fine 3 at 100 px a class).
    let second = doc.section().beds[1].clone();
    doc.apply(Edit::ReplaceBed { bed: with_lithology(&second, Lithology::Sandstone) }).expect("lithology");
    let class = sheet.grain_at(Pt::new(400.0, 0.0)).expect("calibrated");
    assert_eq!(class, WentworthClass::FineSand);
    let second = doc.section().beds[1].clone();
    doc.apply(grain_click(&second, 0.5, class)).expect("grain size");
    assert_eq!(doc.section().beds[1].grain_base, Some(GrainSize::Class(WentworthClass::FineSand)));
    // A click on an existing boundary is refused and changes nothing.
    let h = sheet.height_at(Pt::new(300.0, 880.0)).expect("calibrated");
    assert!(doc.apply(Edit::TraceBoundary { height_m: h }).is_err());
    let traced = doc.project.clone();

    // Autosave → recovery gives the same project, the sheet included.
    let rec_dir = dir.path().join("data");
    std::fs::create_dir_all(&rec_dir).expect("dir");
    let mut saver = recovery::Autosaver::new(&rec_dir);
    saver.write_now(&doc).expect("the autosave writes");
    drop(saver);
    let rec = recovery::find_recovery(&rec_dir).expect("found").expect("reads");
    assert_eq!(rec.project, *traced, "recovered as traced");

    // Save → reopen keeps the calibration and the relative image path.
    std::fs::create_dir_all(project_file.parent().expect("folder")).expect("dir");
    files::save(&project_file, &traced).expect("saves");
    let (back, warnings) = files::open(&project_file).expect("reopens");
    assert!(warnings.is_empty(), "{warnings:?}");
    assert_eq!(back, *traced);
    let back_sheet = back.sections[0].trace.as_ref().expect("sheet kept");
    assert_eq!(resolve_image_path(Some(&project_file), &back_sheet.image), image);

    // Undo walks back one action at a time: grain, lithology, four boundaries, the calibration.
    for expect_beds in [4, 4, 3, 2, 1, 0] {
        assert!(doc.undo());
        assert_eq!(doc.section().beds.len(), expect_beds);
    }
    assert!(doc.section().trace.is_some());
    assert!(doc.undo());
    assert!(doc.section().trace.is_none());
    while doc.redo() {}
    assert_eq!(doc.project, traced);
}

#[test]
fn a_calibration_that_does_not_read_is_refused_with_its_field() {
    let mut doc = Document::new(Project::new(vec![Section::new("Traced")]), None);
    let mut bad = calibrated("sheet.png");
    bad.height_scale.as_mut().expect("set").high_m = 0.0;
    let e = doc.apply(Edit::SetTrace { trace: Some(bad) }).expect_err("refused");
    assert!(e.to_string().contains("trace.calibration") && e.to_string().contains("equal"), "{e}");
    let mut bad = calibrated("sheet.png");
    bad.view.opacity = 7.0;
    let e = doc.apply(Edit::SetTrace { trace: Some(bad) }).expect_err("refused");
    assert!(e.to_string().contains("trace.view.opacity"), "{e}");
    assert!(doc.section().trace.is_none());
}

#[test]
fn a_sheet_chosen_before_the_first_save_is_stored_relative_once_saved() {
    let dir = tempfile::tempdir().expect("temp dir");
    let field = dir.path().join("field");
    let image = field.join("scans").join("sheet.png");
    std::fs::create_dir_all(image.parent().expect("folder")).expect("dir");
    // Any PNG serves as the sheet: the screenshot in the docs folder.
    let png = Path::new(env!("CARGO_MANIFEST_DIR")).join("../docs/trace-window.png");
    std::fs::copy(&png, &image).expect("sheet image copied");
    let first = field.join("log.aggrade");
    let copies = dir.path().join("copies").join("log.aggrade");
    std::fs::create_dir_all(copies.parent().expect("folder")).expect("dir");
    let data = dir.path().join("data");
    let mut app = app_with(None, &data, vec![Some(first.clone()), Some(copies.clone())]);
    assert!(app.doc.path.is_none());

    app.open_trace_image(&image);
    assert!(app.trace_window_open(), "{:?}", app.message);
    let stored =
        |app: &aggrade::gui::AggradeApp| app.doc.section().trace.as_ref().expect("sheet").image.clone();
    assert_eq!(stored(&app), image.to_string_lossy().replace('\\', "/"), "absolute before a save");

    // The first save writes the path relative to the project file, and the window keeps it so.
    assert!(app.save(false), "{:?}", app.message);
    assert_eq!(stored(&app), "scans/sheet.png");
    let (back, _) = files::open(&first).expect("reopens");
    let sheet = back.sections[0].trace.as_ref().expect("sheet saved");
    assert_eq!(sheet.image, "scans/sheet.png");
    assert_eq!(resolve_image_path(Some(&first), &sheet.image), image);

    // Saved as elsewhere: told again from the new folder, still the same image.
    assert!(app.save(true), "{:?}", app.message);
    let (back, _) = files::open(&copies).expect("reopens");
    let sheet = back.sections[0].trace.as_ref().expect("sheet saved");
    assert_eq!(sheet.image, "../field/scans/sheet.png");
    assert_eq!(
        std::fs::read(resolve_image_path(Some(&copies), &sheet.image)).ok(),
        std::fs::read(&image).ok()
    );

    // Undo and redo bring back the sheet with the path of the file now open, not the first one.
    assert!(app.doc.undo());
    assert!(app.doc.section().trace.is_none());
    assert!(app.doc.redo());
    assert_eq!(stored(&app), "../field/scans/sheet.png");
}
