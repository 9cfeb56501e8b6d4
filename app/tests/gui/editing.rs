//! Drives the real window headlessly (egui_kittest) by role and label, and checks the model:
//! keyboard entry, dragging a thickness, undo, accepting a candidate, save and reopen, a bad
//! file, restoring after a crash and closing with unsaved changes.

use super::harness::{app_with as app, harness_of as harness, push_close_request};
use aggrade::gui::test_hooks::demo;
use aggrade::gui::test_hooks::recovery::Autosaver;
use aggrade::gui::AggradeApp;
use aggrade::gui::{Document, Edit};
use aggrade_core::model::{GrainSize, Lithology, Project, ReviewState, Section, WentworthClass};
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::{Path, PathBuf};

/// Type into the field that has focus, then press a key.
fn type_then(h: &mut Harness<'static, AggradeApp>, text: &str, key: Key) {
    h.get_by(|n| n.is_focused()).type_text(text);
    h.run();
    h.key_press(key);
    h.run();
}

#[test]
fn three_beds_from_the_keyboard() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut a = app(None, data.path(), vec![]);
    a.doc = Document::new(Project::new(vec![Section::new("Keyboard test")]), None);
    let mut h = harness(a);
    h.run();
    h.get_by(|n| n.placeholder() == Some("thickness (m)")).focus();
    h.run();
    for (t, l, g) in [("1.5", "sa", "m"), ("40cm", "mu", "cl"), ("2", "co", "pb")] {
        type_then(&mut h, t, Key::Tab);
        type_then(&mut h, l, Key::Tab);
        type_then(&mut h, g, Key::Enter);
    }
    let beds = &h.state().doc.section().beds;
    let got: Vec<(f64, Lithology, Option<GrainSize>)> =
        beds.iter().map(|b| (b.thickness_m, b.lithology, b.grain_base)).collect();
    assert_eq!(
        got,
        vec![
            (1.5, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand))),
            (0.4, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Clay))),
            (2.0, Lithology::Conglomerate, Some(GrainSize::Class(WentworthClass::Pebble))),
        ],
        "beds are listed base first; each new bed goes above the last"
    );
    assert!(h.state().doc.dirty);
}

#[test]
fn drag_changes_thickness_and_undo_restores_it() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    // The third bed from the base; bring it into view.
    let bed = h.state().doc.section().beds[2].clone();
    let base = h.state().doc.section().base_heights_m()[2];
    h.state_mut().scroll_canvas_to(base + bed.thickness_m);
    h.run();
    let top = h.state().bed_top_on_screen(bed.id).expect("bed drawn");
    let ppm = h.state().points_per_m().expect("laid out");
    // Snap is 10 cm below 60 points per metre, 5 cm up to 300: a whole metre is on the grid.
    let up = egui::vec2(0.0, -ppm);
    h.hover_at(top);
    h.run();
    h.drag_at(top);
    h.run();
    for k in 1..=4 {
        h.hover_at(top + up * (k as f32 / 4.0));
        // The bed table scrolls to follow the bed being resized, which takes a few frames.
        h.run_steps(8);
    }
    h.drop_at(top + up);
    h.run();
    let after = h.state().doc.section().beds[2].thickness_m;
    assert!((after - (bed.thickness_m + 1.0)).abs() < 1e-9, "dragged 1 m up: {} -> {after}", bed.thickness_m);
    // Beds above moved up by the same metre.
    let base_above = h.state().doc.section().base_heights_m()[3];
    assert!((base_above - (base + bed.thickness_m + 1.0)).abs() < 1e-9);
    // One undo step takes back the whole drag.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(h.state().doc.section().beds[2].thickness_m, bed.thickness_m);
    assert!(!h.state().doc.can_undo(), "the drag was more than one undo step");
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
    h.run();
    assert!((h.state().doc.section().beds[2].thickness_m - (bed.thickness_m + 1.0)).abs() < 1e-9, "redo");
}

#[test]
fn accepting_a_candidate_is_kept_when_rules_rerun() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    let top = h.state_mut().interpretation().sequence_boundary_candidates[0].clone();
    h.get_all_by_label("Accept").next().expect("an Accept button").click();
    h.run();
    let d = h.state().doc.section().decision_for(top.bed_id).cloned().expect("decision stored");
    assert_eq!(d.state, ReviewState::Accepted);
    // Re-running the rules with other parameters keeps the decision on that bed's boundary.
    let narrower = aggrade_core::rules::RuleParams { window_m: 4.0, ..Default::default() }.changed();
    h.state_mut().apply(Edit::SetRuleParams { params: narrower });
    h.run();
    assert_eq!(h.state_mut().interpretation().params.window_m, 4.0, "the rules ran again");
    let again = h
        .state_mut()
        .interpretation()
        .sequence_boundary_candidates
        .iter()
        .find(|c| c.bed_id == top.bed_id)
        .cloned();
    assert_eq!(again.map(|c| c.review), Some(ReviewState::Accepted));
    assert!(h.query_by_label("accepted").is_some(), "the list shows the decision");
}

#[test]
fn save_and_reopen_gives_the_same_project() {
    let data = tempfile::tempdir().expect("temp dir");
    let out = data.path().join("saved.aggrade");
    let mut h = harness(app(None, data.path(), vec![Some(out.clone())]));
    h.run();
    let id = h.state().doc.section().beds[0].id;
    h.state_mut().apply(Edit::SetThickness { bed: id, thickness_m: 7.25 });
    h.run();
    assert!(h.state().doc.dirty);
    assert!(h.state().title().starts_with("● "), "unsaved mark: {}", h.state().title());
    h.key_press_modifiers(Modifiers::COMMAND, Key::S);
    h.run();
    assert!(out.exists(), "file written");
    assert!(!h.state().doc.dirty, "clean after saving");
    assert_eq!(h.state().title(), "saved.aggrade — Aggrade");
    let saved = h.state().doc.project.clone();
    let reopened = app(Some(out.clone()), data.path(), vec![]);
    assert!(reopened.message.is_none(), "{:?}", reopened.message);
    assert_eq!(reopened.doc.project, saved);
    assert_eq!(reopened.doc.section().beds[0].thickness_m, 7.25);
    assert_eq!(reopened.doc.path.as_deref(), Some(out.as_path()));
}

#[test]
fn a_bad_file_gives_a_dialog_and_the_work_stays() {
    let data = tempfile::tempdir().expect("temp dir");
    let bad = data.path().join("broken.aggrade");
    std::fs::write(&bad, "{ \"format_version\": 1, \"sections\": [ { \"name\": 3").expect("write");
    let mut h = harness(app(None, data.path(), vec![Some(bad.clone())]));
    h.run();
    let before = h.state().doc.project.clone();
    h.key_press_modifiers(Modifiers::COMMAND, Key::O);
    h.run();
    let notice = h.state().message.clone().expect("a message dialog");
    assert_eq!(notice.title, "Could not open the file");
    assert!(notice.text.contains("broken.aggrade"), "message names the file: {}", notice.text);
    assert_eq!(notice.folder.as_deref(), Some(data.path()), "the dialog offers the file's folder");
    assert!(h.query_by_label("Open folder").is_some(), "an Open folder button");
    assert_eq!(h.state().doc.project, before, "the open work is untouched");
    h.get_by_label("OK").click();
    h.run();
    assert!(h.state().message.is_none());
}

#[test]
fn restore_offer_after_a_crash_brings_the_work_back() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut doc = Document::new(demo::demo_project(), None);
    let id = doc.section().beds[1].id;
    doc.apply(Edit::SetThickness { bed: id, thickness_m: 9.5 }).expect("valid");
    Autosaver::new(data.path()).write_now(&doc).expect("written");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    assert!(h.state().recovery_pending());
    h.get_by_label("Restore").click();
    h.run();
    assert!(!h.state().recovery_pending());
    assert_eq!(h.state().doc.project, doc.project);
    assert!(h.state().doc.dirty, "restored work is unsaved until saved");
}

#[test]
fn closing_with_unsaved_changes_asks_first() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    let id = h.state().doc.section().beds[0].id;
    h.state_mut().apply(Edit::SetThickness { bed: id, thickness_m: 3.0 });
    h.run();
    push_close_request(&mut h);
    h.step();
    let commands = h
        .output()
        .viewport_output
        .get(&egui::ViewportId::ROOT)
        .map(|v| v.commands.clone())
        .unwrap_or_default();
    assert!(
        commands.contains(&egui::ViewportCommand::CancelClose),
        "the close was not held back: {commands:?}"
    );
    h.run();
    assert!(h.query_by_label("Save changes?").is_some(), "a question is shown");
    h.get_by_label("Cancel").click();
    h.run();
    assert!(h.query_by_label("Save changes?").is_none());
    assert!(h.state().doc.dirty, "nothing was lost or saved");
}

#[test]
fn clicking_the_column_selects_the_bed_at_that_height() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    let beds = h.state().doc.section().beds.clone();
    let n = beds.len();
    let target = beds[n - 2].clone();
    let top = h.state().bed_top_on_screen(target.id).expect("bed drawn");
    let ppm = h.state().points_per_m().expect("laid out");
    // Inside the bed, clear of its grab zones; once on the column, once out on the tracks.
    let inside = top + egui::vec2(-2.0, (target.thickness_m as f32 * ppm / 2.0).max(6.0));
    for pos in [inside, inside + egui::vec2(180.0, 0.0)] {
        h.state_mut().doc.selected_bed = None;
        h.hover_at(pos);
        h.run();
        h.event(egui::Event::PointerButton {
            pos,
            button: egui::PointerButton::Primary,
            pressed: true,
            modifiers: Modifiers::NONE,
        });
        h.run();
        h.event(egui::Event::PointerButton {
            pos,
            button: egui::PointerButton::Primary,
            pressed: false,
            modifiers: Modifiers::NONE,
        });
        h.run();
        assert_eq!(h.state().doc.selected_bed, Some(target.id), "click at {pos:?}");
    }
}

#[test]
fn a_5000_bed_section_draws_only_what_is_visible_while_scrolling_and_zooming() {
    let data = tempfile::tempdir().expect("temp dir");
    let path = data.path().join("long.aggrade");
    aggrade::gui::test_hooks::files::save(&path, &Project::new(vec![demo::long_section(5_000)]))
        .expect("written");
    let mut h = harness(app(Some(path), data.path(), vec![]));
    h.run();
    assert_eq!(h.state().doc.section().beds.len(), 5_000);
    // Items in a layout of the whole section, to compare what the window lays out and draws.
    let section = h.state().doc.section().clone();
    let interp = aggrade_core::rules::interpret(&section, &aggrade_core::rules::RuleParams::default());
    let whole = aggrade_core::layout::column_strip(
        &section,
        &interp,
        &aggrade_core::layout::LayoutOptions::default(),
    )
    .items
    .len();
    let centre = egui::pos2(700.0, 450.0);
    h.hover_at(centre);
    h.run();
    for k in 0..20 {
        h.event(egui::Event::MouseWheel {
            unit: egui::MouseWheelUnit::Point,
            delta: egui::vec2(0.0, -400.0),
            modifiers: Modifiers::NONE,
            phase: egui::TouchPhase::Move,
            source: egui::MouseWheelSource::Wheel,
        });
        if k % 5 == 0 {
            h.key_press(Key::Minus);
        }
        h.run();
        let (drawn, laid_out) = h.state().drawn_items();
        assert!(drawn > 0, "nothing drawn at step {k}");
        assert!(drawn * 20 < whole, "step {k}: drew {drawn} of {whole} items");
        assert!(laid_out * 5 < whole, "step {k}: laid out {laid_out} of {whole} items");
    }
    // Zoomed far out the whole column fits; culling still holds items to the view.
    for _ in 0..6 {
        h.key_press(Key::Plus);
        h.run();
    }
    let (drawn, laid_out) = h.state().drawn_items();
    assert!(
        drawn > 0 && drawn <= laid_out && drawn < whole,
        "{drawn} of {laid_out} laid out, {whole} in all"
    );
}

#[test]
fn dragging_a_beds_right_edge_snaps_its_grain_size_to_a_wentworth_class() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    // The topmost bed with one grain size base to top.
    let beds = h.state().doc.section().beds.clone();
    let bed = beds
        .iter()
        .rev()
        .find(|b| {
            !b.is_covered() && b.thickness_m > 0.3 && b.grain_base.is_some() && b.grain_base == b.grain_top
        })
        .expect("a bed of one grain size")
        .clone();
    let base = h.state().doc.section().base_heights_m()[h.state().doc.bed_index(bed.id).expect("index")];
    h.state_mut().scroll_canvas_to(base + bed.thickness_m / 2.0);
    h.run();
    let r = h.state().bed_rect_on_screen(bed.id).expect("drawn");
    // Grab the right edge of the bed's box half-way up (the box spans the wider of base and top).
    let start = egui::pos2(r.right(), r.center().y);
    for (class, expect) in
        [(WentworthClass::Pebble, WentworthClass::Pebble), (WentworthClass::Silt, WentworthClass::Silt)]
    {
        let r = h.state().bed_rect_on_screen(bed.id).expect("drawn");
        let start = egui::pos2(r.right(), start.y);
        let x = h.state().class_x_on_screen(class).expect("scale");
        h.hover_at(start);
        h.run();
        h.drag_at(start);
        h.run();
        for k in 1..=4 {
            h.hover_at(egui::pos2(start.x + (x - start.x) * k as f32 / 4.0, start.y));
            h.run();
        }
        h.drop_at(egui::pos2(x, start.y));
        h.run();
        let now = h.state().doc.section().beds.iter().find(|b| b.id == bed.id).expect("still there").clone();
        assert_eq!(now.grain_base, Some(GrainSize::Class(expect)), "drag to {class:?}");
        assert_eq!(now.grain_top, Some(GrainSize::Class(expect)));
    }
}

#[test]
fn dragging_a_graded_beds_edge_keeps_it_fining_upward() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    // The topmost fining-upward sandstone (coarser at its base than at its top; sand classes are
    // one phi wide, so its edge runs between the two classes' marks on the scale).
    let sand = WentworthClass::VeryFineSand..=WentworthClass::VeryCoarseSand;
    let beds = h.state().doc.section().beds.clone();
    let bed = beds
        .iter()
        .rev()
        .find(|b| {
            b.thickness_m > 0.5
                && matches!((b.grain_base, b.grain_top), (Some(x), Some(y))
                    if x.class() > y.class() && sand.contains(&x.class()) && sand.contains(&y.class()))
        })
        .expect("a fining-upward bed in the demo")
        .clone();
    let (base0, top0) = (bed.grain_base.expect("base").class(), bed.grain_top.expect("top").class());
    let base = h.state().doc.section().base_heights_m()[h.state().doc.bed_index(bed.id).expect("index")];
    h.state_mut().scroll_canvas_to(base + bed.thickness_m / 2.0);
    h.run();
    let r = h.state().bed_rect_on_screen(bed.id).expect("drawn");
    // The right edge half-way up lies between the base and top classes; grab it there and drag
    // two class steps coarser.
    let (xb, xt) = (
        h.state().class_x_on_screen(base0).expect("scale"),
        h.state().class_x_on_screen(top0).expect("scale"),
    );
    let step = (h.state().class_x_on_screen(WentworthClass::Pebble).expect("scale")
        - h.state().class_x_on_screen(WentworthClass::Granule).expect("scale"))
    .abs();
    let start = egui::pos2((xb + xt) / 2.0, r.center().y);
    h.hover_at(start);
    h.run();
    h.drag_at(start);
    h.run();
    for k in 1..=4 {
        h.hover_at(egui::pos2(start.x + 2.0 * step * k as f32 / 4.0, start.y));
        h.run();
    }
    h.drop_at(egui::pos2(start.x + 2.0 * step, start.y));
    h.run();
    let now = h.state().doc.section().beds.iter().find(|b| b.id == bed.id).expect("still there").clone();
    let (b1, t1) = (now.grain_base.expect("base").class(), now.grain_top.expect("top").class());
    assert!(b1 > base0 && t1 > top0, "both ends coarser: {base0:?}/{top0:?} -> {b1:?}/{t1:?}");
    assert_eq!(b1.rank() - t1.rank(), base0.rank() - top0.rank(), "the fining-upward step is kept");
    // One drag is one undo step.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert!(!h.state().doc.can_undo(), "the drag was more than one undo step");
    let back = h.state().doc.section().beds.iter().find(|b| b.id == bed.id).expect("still there").clone();
    assert_eq!((back.grain_base, back.grain_top), (bed.grain_base, bed.grain_top));
}

#[test]
fn a_long_section_scrolls_to_a_picked_boundary_in_column_and_table() {
    let data = tempfile::tempdir().expect("temp dir");
    let file = data.path().join("long.aggrade");
    aggrade::gui::test_hooks::files::save(&file, &Project::new(vec![demo::long_section(800)]))
        .expect("saved");
    let mut h = harness(app(Some(file), data.path(), vec![]));
    h.run();
    let (drawn, laid_out) = h.state().drawn_items();
    assert!(drawn > 0 && drawn < laid_out, "only the visible part is drawn: {drawn} of {laid_out}");
    // Pick a bed near the base, far below the view, as the review list does.
    let n = h.state().doc.section().beds.len();
    let bed = h.state().doc.section().beds[5].clone();
    let mid = h.state().doc.section().base_heights_m()[5] + bed.thickness_m / 2.0;
    h.state_mut().doc.selected_bed = Some(bed.id);
    h.state_mut().scroll_canvas_to(mid);
    h.run();
    // The column shows it (laid out around the new view) and the table shows its row.
    let r = h.state().bed_rect_on_screen(bed.id).expect("the bed is laid out and drawn");
    assert!(r.top() > 0.0 && r.bottom() < 900.0, "in the window: {r:?}");
    let row = n - 1 - 5;
    assert!(h.state().table_rows_shown().contains(&row), "row {row} in {:?}", h.state().table_rows_shown());
}

#[test]
fn opening_another_file_shows_its_own_column_and_interpretation() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    assert!(!h.state_mut().interpretation().channel_bodies.is_empty(), "the demo has channel bodies");
    // Another unedited file: its revision counter starts where the demo's did.
    let mut mud = Section::new("Mud only");
    mud.beds = vec![aggrade_core::model::Bed::new(
        aggrade_core::model::BedId(1),
        4.0,
        Lithology::Mudstone,
        Some(GrainSize::Class(WentworthClass::Clay)),
    )]
    .into();
    let other = data.path().join("mud.aggrade");
    aggrade::gui::test_hooks::files::save(&other, &Project::new(vec![mud.clone()])).expect("saved");
    h.state_mut().open_path(&other);
    h.run();
    let expected = aggrade_core::rules::interpret(&mud, &aggrade_core::rules::RuleParams::default());
    assert_eq!(h.state_mut().interpretation(), &expected, "the new file's interpretation, not the old one's");
    let id = h.state().doc.section().beds[0].id;
    let r = h.state().bed_rect_on_screen(id).expect("the new bed is drawn");
    assert!(r.height() > 1.0);
    assert!(h.state().drawn_items().1 < 200, "the demo column is gone");
}

#[test]
fn right_click_menu_splits_and_deletes_beds() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    let n = h.state().doc.section().beds.len();
    let bed = h.state().doc.section().beds[n - 1].clone();
    let r = h.state().bed_rect_on_screen(bed.id).expect("drawn");
    let pos = egui::pos2(r.center().x, r.center().y);
    let total = h.state().doc.section().total_thickness_m();
    h.hover_at(pos);
    h.run();
    h.event(egui::Event::PointerButton {
        pos,
        button: egui::PointerButton::Secondary,
        pressed: true,
        modifiers: Modifiers::NONE,
    });
    h.event(egui::Event::PointerButton {
        pos,
        button: egui::PointerButton::Secondary,
        pressed: false,
        modifiers: Modifiers::NONE,
    });
    h.run();
    h.get_by_label("Split in two").click();
    h.run();
    let s = h.state().doc.section();
    assert_eq!(s.beds.len(), n + 1);
    assert!((s.beds[n - 1].thickness_m - bed.thickness_m / 2.0).abs() < 1e-12);
    assert!((s.total_thickness_m() - total).abs() < 1e-9, "splitting keeps the section's thickness");
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(h.state().doc.section().beds.len(), n, "undo joins the halves again");
}

#[derive(Debug)]
struct Dropped(PathBuf);

impl egui::DroppedFile for Dropped {
    fn path(&self) -> &Path {
        &self.0
    }
    fn bytes(&self) -> Result<Vec<u8>, String> {
        std::fs::read(&self.0).map_err(|e| e.to_string())
    }
}

#[test]
fn dropping_a_csv_imports_it_and_dropping_a_project_opens_it() {
    let data = tempfile::tempdir().expect("temp dir");
    let samples = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections");
    let mut a = app(None, data.path(), vec![]);
    a.doc = Document::new(Project::new(vec![Section::new("Scratch")]), None);
    let mut h = harness(a);
    h.run();
    let csv = samples.join("sedge_creek.csv");
    let expected = aggrade_core::io::load(&csv).expect("sample readable").project.sections[0].clone();
    h.input_mut().dropped_files.push(std::sync::Arc::new(Dropped(csv)));
    h.run();
    assert_eq!(h.state().doc.project.sections.len(), 2, "the CSV became a second section");
    assert_eq!(h.state().doc.section().beds, expected.beds);
    // Dropping a project onto unsaved work asks first; "Don't save" opens it.
    let project = samples.join("demo.aggrade");
    h.input_mut().dropped_files.push(std::sync::Arc::new(Dropped(project.clone())));
    h.run();
    h.get_by_label("Don't save").click();
    h.run();
    let expected = aggrade_core::io::load(&project).expect("demo readable").project;
    assert_eq!(*h.state().doc.project, expected);
    assert_eq!(h.state().doc.path.as_deref(), Some(project.as_path()));
}

#[test]
fn arrow_keys_move_the_selection_and_delete_removes_the_bed() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    let beds = h.state().doc.section().beds.clone();
    let n = beds.len();
    h.key_press(Key::ArrowUp);
    h.run();
    assert_eq!(h.state().doc.selected_bed, Some(beds[n - 1].id), "first press selects the top bed");
    h.key_press(Key::ArrowDown);
    h.key_press(Key::ArrowDown);
    h.run();
    assert_eq!(h.state().doc.selected_bed, Some(beds[n - 3].id));
    h.key_press(Key::Delete);
    h.run();
    let ids: Vec<_> = h.state().doc.section().beds.iter().map(|b| b.id).collect();
    assert_eq!(ids.len(), n - 1);
    assert!(!ids.contains(&beds[n - 3].id));
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    assert_eq!(h.state().doc.section().beds, beds, "undo restores the deleted bed in place");
}

#[test]
fn looking_at_every_bed_in_the_inspector_changes_nothing() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    h.get_by_label("Bed").click();
    h.run();
    let before = h.state().doc.project.clone();
    let ids: Vec<_> = before.sections[0].beds.iter().map(|b| b.id).collect();
    for id in ids {
        h.state_mut().doc.selected_bed = Some(id);
        h.run();
    }
    assert!(!h.state().doc.dirty, "showing a bed must not edit it");
    assert!(!h.state().doc.can_undo());
    assert_eq!(h.state().doc.project, before);
}
