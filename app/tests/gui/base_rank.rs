//! The geologist's rank of a bed base, set in the window (inspector and bed menu), reaches the
//! model, changes the storeys the rules find, and undoes.

use super::harness::{app_with, harness_of};
use aggrade::gui::AggradeApp;
use aggrade_core::model::{
    BaseRank, Bed, BedId, Contact, GrainSize, Lithology, Project, Section, WentworthClass,
};
use egui::Modifiers;
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;

fn harness(data: &std::path::Path, file: std::path::PathBuf) -> Harness<'static, AggradeApp> {
    harness_of(app_with(Some(file), data, Vec::new()))
}

/// Mud 3 m | sand 2 m (E) | sand 0.6 m (E, a scour by the rules) | mud 3 m.
fn section() -> Section {
    let mut s = Section::new("Rank test");
    let class = |c| Some(GrainSize::Class(c));
    for (i, (t, lith, g, c)) in [
        (3.0, Lithology::Mudstone, WentworthClass::Silt, Contact::Sharp),
        (2.0, Lithology::Sandstone, WentworthClass::MediumSand, Contact::Erosional),
        (0.6, Lithology::Sandstone, WentworthClass::MediumSand, Contact::Erosional),
        (3.0, Lithology::Mudstone, WentworthClass::Silt, Contact::Sharp),
    ]
    .into_iter()
    .enumerate()
    {
        let mut b = Bed::new(BedId(i as u64 + 1), t, lith, class(g));
        b.base_contact = c;
        s.beds.push(b);
    }
    s
}

#[test]
fn ranking_a_base_in_the_inspector_and_the_bed_menu_changes_the_storeys_and_undoes() {
    let data = tempfile::tempdir().expect("temp dir");
    let file = data.path().join("rank.aggrade");
    aggrade_core::io::save_project(&file, &Project::new(vec![section()])).expect("saved");
    let mut h = harness(data.path(), file);
    h.run();
    // The rules read the 0.6 m erosional sand as a scour inside one storey (Miall 1996).
    assert_eq!(h.state_mut().interpretation().storeys.len(), 1);

    // Inspector: rank the scour's base a storey surface.
    h.state_mut().doc.selected_bed = Some(BedId(3));
    h.run();
    h.get_by_label("Bed").click();
    h.run();
    h.get_by_label("Base rank").click();
    h.run();
    h.get_by_label("storey surface").click();
    h.run();
    assert_eq!(h.state().doc.section().beds[2].base_rank, Some(BaseRank::StoreySurface));
    assert_eq!(h.state_mut().interpretation().storeys.len(), 2, "the geologist's rank overrides the rules");

    // Bed menu on the column: rank the same base a body base: two bodies.
    let r = h.state().bed_rect_on_screen(BedId(3)).expect("drawn");
    let pos = r.center();
    h.hover_at(pos);
    h.run();
    for pressed in [true, false] {
        h.event(egui::Event::PointerButton {
            pos,
            button: egui::PointerButton::Secondary,
            pressed,
            modifiers: Modifiers::NONE,
        });
    }
    h.run();
    h.get_by_label("Rank of base").click();
    h.run();
    h.get_by_label("body base").click();
    h.run();
    assert_eq!(h.state().doc.section().beds[2].base_rank, Some(BaseRank::BodyBase));
    assert_eq!(h.state_mut().interpretation().channel_bodies.len(), 2);

    // Undo twice: back to the rules' own reading.
    for _ in 0..2 {
        h.key_press_modifiers(Modifiers::COMMAND, egui::Key::Z);
        h.run();
    }
    assert_eq!(h.state().doc.section().beds[2].base_rank, None);
    assert_eq!(h.state_mut().interpretation().storeys.len(), 1);
}
