//! The rules in the real window (egui_kittest, driven by label and keyboard): the parameters are
//! the project's (typed in the panel, undone, saved and opened again), the review list shows
//! strength classes and lists weak paleosol tops on request, and "Check stability" marks each
//! candidate with its stability; a feet section's review card words its lengths in feet.

use super::harness::{app_with, harness_of};
use aggrade::gui::{AggradeApp, Document, Tab};
use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Project, Section, WentworthClass,
};
use aggrade_core::rules::{RuleParams, Strength};
use egui::accesskit::Role;
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;

/// Is some widget whose text (a button's label or a plain label's value) holds `part` on screen?
fn shown_containing(h: &Harness<'static, AggradeApp>, part: &str) -> bool {
    h.query_all_by(|n| n.label().or_else(|| n.value()).is_some_and(|l| l.contains(part))).next().is_some()
}

/// The review tab of the window on `doc` (the demo when `None`).
fn review(
    doc: Option<Document>,
    data_dir: &std::path::Path,
    answers: Vec<Option<std::path::PathBuf>>,
) -> Harness<'static, AggradeApp> {
    let mut a = app_with(None, data_dir, answers);
    if let Some(d) = doc {
        a.doc = d;
    }
    a.tab = Tab::Review;
    let mut h = harness_of(a);
    h.run();
    h.run();
    h
}

#[test]
fn a_parameter_typed_in_the_panel_is_the_projects_is_undone_and_is_saved() {
    let data = tempfile::tempdir().expect("temp dir");
    let file = data.path().join("params.aggrade");
    let mut h = review(None, data.path(), vec![Some(file.clone())]);
    assert!(h.state().doc.project.rule_params.is_empty(), "the demo runs the default rules");
    h.get_by_label("Rule parameters").click();
    h.run();
    h.run();
    let field = |h: &Harness<'static, AggradeApp>| {
        h.query_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some("window m"))
            .and_then(|n| n.value())
    };
    assert_eq!(field(&h).as_deref(), Some("10.0"));
    h.get_by(|n| n.role() == Role::TextInput && n.label().as_deref() == Some("window m")).focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.run();
    h.get_by(|n| n.is_focused()).type_text("20");
    h.run();
    h.key_press(Key::Enter);
    h.run();
    h.run();

    // Stored in the project as the one field that differs from the defaults.
    let stored = h.state().doc.project.rule_params.clone();
    assert_eq!(stored, RuleParams { window_m: 20.0, ..RuleParams::default() }.changed());
    assert_eq!(h.state_mut().interpretation().params.window_m, 20.0, "the rules ran with it");
    assert!(h.state().doc.dirty);

    // Undo takes it out of the project, and the rules run with the default again; redo puts it back.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    h.run();
    assert!(h.state().doc.project.rule_params.is_empty(), "{:?}", h.state().doc.project.rule_params);
    assert_eq!(h.state_mut().interpretation().params.window_m, 10.0);
    assert_eq!(field(&h).as_deref(), Some("10.0"), "the panel shows the project's value");
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
    h.run();
    assert_eq!(h.state().doc.project.rule_params, stored);

    // Saved and opened again: the same parameters.
    h.key_press_modifiers(Modifiers::COMMAND, Key::S);
    h.run();
    assert!(file.exists(), "saved");
    let mut reopened = app_with(Some(file.clone()), data.path(), vec![]);
    assert!(reopened.message.is_none(), "{:?}", reopened.message);
    assert_eq!(reopened.doc.project.rule_params, stored);
    assert_eq!(reopened.interpretation().params.window_m, 20.0);

    // "Restore defaults" is one more undoable edit.
    h.get_by_label("Restore defaults").click();
    h.run();
    assert!(h.state().doc.project.rule_params.is_empty());
    assert!(h.state().doc.dirty);
}

/// Mudstone with a weakly developed paleosol at its top (3 m), mudstone, a strongly developed
/// paleosol cut by an erosional channel sandstone at 5 m, mudstone.
fn weak_soil_section() -> Document {
    let mut s = Section::new("Soils");
    let silt = Some(GrainSize::Class(WentworthClass::Silt));
    let mut weak = Bed::new(BedId(1), 3.0, Lithology::Mudstone, silt);
    weak.paleosol = PaleosolDevelopment::Weak;
    let plain = Bed::new(BedId(2), 1.0, Lithology::Mudstone, silt);
    let mut strong = Bed::new(BedId(3), 1.0, Lithology::Mudstone, silt);
    strong.paleosol = PaleosolDevelopment::Strong;
    let mut sand =
        Bed::new(BedId(4), 2.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
    sand.base_contact = Contact::Erosional;
    let cap = Bed::new(BedId(5), 2.0, Lithology::Mudstone, silt);
    s.beds = vec![weak, plain, strong, sand, cap].into();
    Document::new(Project::new(vec![s]), None)
}

#[test]
fn the_review_list_shows_strength_classes_and_lists_hidden_weak_soil_tops_on_request() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = review(Some(weak_soil_section()), data.path(), vec![]);
    let listed = h.state_mut().interpretation().clone();
    assert_eq!(listed.unlisted_candidates, 1, "the weak soil top at 3 m is left out");
    assert_eq!(listed.sequence_boundary_candidates.len(), 1);
    let channel = &listed.sequence_boundary_candidates[0];
    assert_eq!(channel.height_m, 5.0);
    assert_eq!(channel.strength, Strength::Moderate, "{:?}", channel.evidence);

    // The class as a badge; the score is not written out.
    assert!(h.query_by_label("#1 at 5 m").is_some());
    assert!(h.query_by_label("moderate").is_some(), "the strength badge");
    assert!(!shown_containing(&h, "score"), "the score only on hover");
    assert!(!shown_containing(&h, " at 3 m"), "the weak soil top is not listed");

    h.get_by_label("Show weak paleosol tops (1 not listed)").click();
    h.run();
    h.run();
    assert!(h.state().all_candidates);
    assert!(h.query_by_label("#2 at 3 m").is_some(), "the weak soil top is listed, after the moderate one");
    assert!(h.query_by_label("weak").is_some(), "with its badge");
    assert!(h.query_by_label("Show weak paleosol tops (listed)").is_some());
    let all = h.state_mut().interpretation().clone();
    assert_eq!(all.sequence_boundary_candidates.len(), 2);
    assert_eq!(all.unlisted_candidates, 0);
}

#[test]
fn check_stability_marks_each_candidate_and_lapses_with_an_edit() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = review(None, data.path(), vec![]);
    assert!(!shown_containing(&h, "stable in "), "nothing before a check");
    h.get_by_label("Check stability").click();
    h.run();
    h.run();
    let runs = h.state().stability().map(|s| s.runs).expect("a check of the document as it is");
    assert!(runs > 0);
    // A plain label's text runs repeat its text: count the labels.
    let marked = h
        .query_all_by(|n| n.role() == Role::Label && n.value().is_some_and(|l| l.starts_with("stable in ")))
        .count();
    let listed = h.state_mut().interpretation().sequence_boundary_candidates.len().min(25);
    assert_eq!(marked, listed, "every listed candidate shows its stability");
    assert!(shown_containing(&h, &format!("Stability from {runs} runs")));

    // An edit changes the document: the check no longer holds and is dropped.
    let bed = h.state().doc.section().beds[0].clone();
    h.state_mut().apply(aggrade::gui::Edit::SetThickness { bed: bed.id, thickness_m: bed.thickness_m + 1.0 });
    h.run();
    assert!(h.state().stability().is_none());
    assert!(!shown_containing(&h, "stable in "));
}

/// The review card of a section logged in feet: the evidence's lengths in feet, the review state
/// named "unreviewed" until decided, and the accepted boundary's "Correlation label" field.
#[test]
fn the_review_card_words_lengths_in_feet_and_names_the_review_state_unreviewed() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut project = (*weak_soil_section().project).clone();
    let s = &mut project.sections[0];
    s.display_unit = aggrade_core::model::LengthUnit::Foot;
    // 3.048 m = 10 ft of erosional relief (1 ft = 0.3048 m exactly, international yard and pound
    // agreement 1959): beyond the 2 m storey.
    s.beds[3].base_relief_m = Some(3.048);
    let mut h = review(Some(Document::new(project, None)), data.path(), vec![]);
    let listed = h.state_mut().interpretation().clone();
    let channel = &listed.sequence_boundary_candidates[0];
    assert!(
        channel.evidence.iter().any(|e| matches!(e, aggrade_core::rules::Evidence::ReliefOverStorey { .. })),
        "{:?}",
        channel.evidence
    );
    // The 2 m storey is 6.56 ft.
    assert!(shown_containing(&h, "erosional relief of 10.00 ft exceeds the thickest storey (6.56 ft)"));
    let evidence_lines: Vec<String> = h
        .query_all_by(|n| n.value().is_some_and(|l| l.starts_with("• ")))
        .filter_map(|n| n.value())
        .collect();
    assert!(!evidence_lines.is_empty());
    for line in &evidence_lines {
        assert!(
            !line.contains(" m ") && !line.ends_with(" m"),
            "a length in metres on a feet section: {line}"
        );
    }
    assert!(h.query_by_label("unreviewed").is_some(), "the review state's badge");
    assert!(h.query_by_label("open").is_none(), "the old word for the state is gone");

    h.get_by_label("Accept").click();
    h.run();
    h.run();
    assert!(h.query_by_label("accepted").is_some());
    assert!(h.query_by_label("Correlation label").is_some(), "the accepted boundary's label field");
    h.get_by_label("Mark unreviewed").click();
    h.run();
    h.run();
    assert!(h.query_by_label("unreviewed").is_some());
}
