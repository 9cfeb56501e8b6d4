//! The review list: candidate sequence boundaries, strongest first, with their evidence and
//! stability, the geologist's accept / reject / note / correlation label, and the project's rule
//! parameters.

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::engine::{ProjectRules, RuleParams};
use super::field::{committed_field_in_memory, problem_label, FieldLook};
use super::stability::SLOW_CHECK_MIN_BEDS;
use super::table::show_length;
use super::theme;
use aggrade_core::model::{PaleosolDevelopment, Project, ReviewState};
use aggrade_core::rules::sensitivity::stability_text;
use aggrade_core::rules::{BoundaryCandidate, Interpretation, Strength};

/// How many candidates are listed at a time.
const REVIEW_PAGE: usize = 25;

/// The correlation labels already used in a project, sorted, each once (offered when labelling
/// another boundary, so that the same label is written the same way).
pub fn link_labels(project: &Project) -> Vec<String> {
    let mut v: Vec<String> = project
        .sections
        .iter()
        .flat_map(|s| s.review.iter().filter_map(|d| d.link_label().map(str::to_string)))
        .collect();
    v.sort();
    v.dedup();
    v
}

/// A correlation label as typed: trimmed; blank for none; else checked as the project file checks it.
pub fn read_link(text: &str) -> Result<Option<String>, String> {
    let label = text.trim();
    if label.is_empty() {
        return Ok(None);
    }
    aggrade_core::io::check_link_label(label).map_err(|why| format!("correlation label: {why}"))?;
    Ok(Some(label.to_string()))
}

/// Hint shown in the empty correlation-label field.
pub const LINK_HINT: &str = "correlation label, e.g. SB-2";

/// The correlation label of an accepted boundary: a committed field (stored as one undo step
/// when the typing ends, trimmed; blank takes the label off) and a list of the labels already
/// used in the project.
fn link_ui(
    ui: &mut egui::Ui,
    c: &aggrade_core::rules::BoundaryCandidate,
    current: &str,
    used: &[String],
    out: &mut Actions,
) {
    ui.horizontal(|ui| {
        let lab = ui.label("Correlation label").id;
        let look = FieldLook {
            hint: LINK_HINT,
            tip: "Accepted boundaries with the same label in neighbouring sections are tied on the correlation panel. Stored when you press Enter or leave the field",
            width: 140.0,
            // Longer labels are refused by the file checks: the field stops the typing there.
            char_limit: aggrade_core::io::limits::MAX_LINK_LABEL_CHARS,
        };
        let (r, value, problem) =
            committed_field_in_memory(ui, egui::Id::unique(("link", c.bed_id.0)), current, look, read_link);
        r.labelled_by(lab);
        if let Some(link) = value {
            out.edit(Edit::SetLink { bed: c.bed_id, link });
        }
        if let Some(p) = problem {
            problem_label(ui, &p);
        }
        let others: Vec<&String> = used.iter().filter(|l| l.as_str() != current.trim()).collect();
        if !others.is_empty() {
            egui::ComboBox::from_id_salt(("link_used", c.bed_id.0))
                .selected_text("used labels")
                .width(90.0)
                .show_ui(ui, |ui| {
                    for l in others {
                        if ui.selectable_label(false, l.as_str()).clicked() {
                            out.edit(Edit::SetLink { bed: c.bed_id, link: Some(l.clone()) });
                        }
                    }
                })
                .response
                .on_hover_text("A label already used in this project");
        }
    });
}

/// What the candidate list is drawn from.
pub struct List<'a> {
    /// The selected section's interpretation (marked with stabilities after a check).
    pub interp: &'a Interpretation,
    /// The toggle listing weak paleosol tops with no evidence too.
    pub all_candidates: &'a mut bool,
    /// Runs of the stability check the interpretation is marked from, if one was run.
    pub stability_runs: Option<usize>,
}

/// Hover text of a candidate's score.
pub const SCORE_TIP: &str = "orders candidates within a class; not a probability";

/// The colour of a strength class's badge.
fn strength_colour(s: Strength) -> egui::Color32 {
    match s {
        Strength::Strong => theme::STRONG,
        Strength::Moderate => theme::MODERATE,
        Strength::Weak => theme::WEAK,
    }
}

/// What the list says when it holds no candidate: what the rules look for, and the weak
/// paleosol tops left out, if any.
pub fn no_candidates_text(unlisted: usize) -> String {
    let mut t = String::from(
        "No candidates: the rules found no erosional channel-body base, no paleosol top with beds above it and no \
         base tagged as an incision surface.",
    );
    if unlisted > 0 {
        t = format!(
            "No listed candidates: {unlisted} weak paleosol top{} with no further evidence {} not listed.",
            if unlisted == 1 { "" } else { "s" },
            if unlisted == 1 { "is" } else { "are" }
        );
    }
    t
}

/// The toggle's label: how many weak paleosol tops are left out of the list.
pub fn toggle_text(all_candidates: bool, unlisted: usize) -> String {
    if all_candidates {
        "Show weak paleosol tops (listed)".to_string()
    } else {
        format!("Show weak paleosol tops ({unlisted} not listed)")
    }
}

/// One line of a candidate's evidence, its lengths in the section's display unit.
pub fn evidence_line(e: &aggrade_core::rules::Evidence, unit: aggrade_core::model::LengthUnit) -> String {
    format!("• {}", e.worded(unit))
}

/// Draw the candidate list.
pub fn ui(ui: &mut egui::Ui, doc: &Document, list: List<'_>, out: &mut Actions) {
    let interp = list.interp;
    let unit = doc.section().display_unit;
    ui.label(
        egui::RichText::new(
            "Candidate sequence boundaries, strongest first (by the independent evidence found). Each \
             is a suggestion for you to judge.",
        )
        .small()
        .color(theme::TEXT_DIM),
    );
    if let Some(p) = interp.channel_proportion {
        let bounds = match interp.channel_proportion_bounds {
            Some(b) if interp.has_cover() => format!(
                " ({:.0}–{:.0} % counting covered intervals as fines or as channel)",
                b.covered_as_fines * 100.0,
                b.covered_as_channel * 100.0
            ),
            _ => String::new(),
        };
        ui.label(format!(
            "Channel-body proportion: {:.0} % of exposed thickness{bounds} · {} channel bodies, {} paleosol profiles",
            p * 100.0,
            interp.channel_bodies.len(),
            interp.paleosols.len()
        ));
    }
    ui.horizontal(|ui| {
        ui.checkbox(list.all_candidates, toggle_text(*list.all_candidates, interp.unlisted_candidates))
            .on_hover_text("Also list paleosol tops that are weak (no evidence beyond being a paleosol top)");
    });
    ui.horizontal(|ui| {
        let beds = doc.section().beds.len();
        let mut tip = String::from(
            "Run the rules again with each key threshold moved in turn over a documented range, and show \
             how often each candidate and channel body comes out the same",
        );
        if beds > SLOW_CHECK_MIN_BEDS {
            tip.push_str(&format!("; with {beds} beds this may take a few seconds"));
        }
        if ui.button("Check stability").on_hover_text(tip).clicked() {
            out.check_stability = true;
        }
        if beds > SLOW_CHECK_MIN_BEDS {
            ui.label(egui::RichText::new("may take a few seconds").small().color(theme::TEXT_DIM));
        }
    });
    if let Some(runs) = list.stability_runs {
        ui.label(
            egui::RichText::new(format!(
                "Stability from {runs} runs, each with one threshold moved: the share in which a candidate \
                 is listed at least moderate (or not) as here."
            ))
            .small()
            .color(theme::TEXT_DIM),
        );
    }
    ui.separator();
    if interp.sequence_boundary_candidates.is_empty() {
        ui.label(no_candidates_text(interp.unlisted_candidates));
    }
    // Long sections can have hundreds of candidates: list the best ones, more on request.
    let shown_id = egui::Id::unique("review_shown");
    let shown = ui.data(|d| d.get_temp::<usize>(shown_id)).unwrap_or(REVIEW_PAGE);
    let total = interp.sequence_boundary_candidates.len();
    let used = link_labels(&doc.project);
    egui::ScrollArea::vertical().id_salt("review_list").show(ui, |ui| {
        for (rank, c) in interp.sequence_boundary_candidates.iter().enumerate().take(shown) {
            let (badge, colour) = match c.review {
                ReviewState::Candidate => (c.review.name(), theme::WARN),
                ReviewState::Accepted => (c.review.name(), theme::ACCEPTED),
                ReviewState::Rejected => (c.review.name(), theme::REJECTED),
            };
            egui::Frame::group(ui.style()).inner_margin(8.0).show(ui, |ui| {
                ui.set_width(ui.available_width());
                ui.horizontal(|ui| {
                    let title = format!("#{} at {} {}", rank + 1, show_length(c.height_m, unit), unit.name());
                    if ui
                        .link(egui::RichText::new(title).strong())
                        .on_hover_text("Show this boundary in the column")
                        .clicked()
                    {
                        out.scroll_to_height_m = Some(c.height_m);
                        out.select = Some(Some(c.bed_id));
                    }
                    strength_badge(ui, c);
                    ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
                        ui.label(egui::RichText::new(badge).color(colour).strong());
                    });
                });
                ui.horizontal_wrapped(|ui| {
                    ui.label(egui::RichText::new(c.kind.name()).color(theme::TEXT_DIM));
                    if let Some(name) = &c.surface_name {
                        ui.label(egui::RichText::new(format!("surface {name}")).strong())
                            .on_hover_text("The name you gave the surface at this bed base");
                    }
                    if let Some(label) = &c.label {
                        ui.label(egui::RichText::new(format!("correlation label {label}")).strong())
                            .on_hover_text("The correlation label on your decision");
                    }
                });
                if let Some(text) = stability_text(c.stability, c.flipped_by.as_ref()) {
                    ui.label(egui::RichText::new(text).small()).on_hover_text(
                        "Share of the stability runs in which this candidate is listed at least moderate (or \
                         not) as here, and the nearest threshold change that alters that",
                    );
                }
                for e in &c.evidence {
                    ui.label(evidence_line(e, unit));
                }
                if let Some(p) = interp.paleosols.iter().find(|p| p.last_bed + 1 == c.bed_index) {
                    let read: Vec<String> = p.evidence.iter().map(|e| e.worded(unit)).collect();
                    ui.label(
                        egui::RichText::new(format!("Paleosol below read from: {}", read.join("; "))).small(),
                    )
                    .on_hover_text(
                        "What the profile's maturity and drainage were read from, horizons included",
                    );
                }
                ui.horizontal(|ui| {
                    let accept = ui
                        .add_enabled(c.review != ReviewState::Accepted, egui::Button::new("Accept"))
                        .on_hover_text("Record that you accept this boundary (kept when the rules re-run)");
                    if accept.clicked() {
                        out.edit(Edit::SetReview {
                            bed: c.bed_id,
                            state: ReviewState::Accepted,
                            note: c.note.clone(),
                        });
                    }
                    let reject = ui
                        .add_enabled(c.review != ReviewState::Rejected, egui::Button::new("Reject"))
                        .on_hover_text("Record that you reject this boundary (hidden in the column)");
                    if reject.clicked() {
                        out.edit(Edit::SetReview {
                            bed: c.bed_id,
                            state: ReviewState::Rejected,
                            note: c.note.clone(),
                        });
                    }
                    let reset = ui
                        .add_enabled(c.review != ReviewState::Candidate, egui::Button::new("Mark unreviewed"))
                        .on_hover_text("Take back your decision: the boundary is unreviewed again");
                    if reset.clicked() {
                        out.edit(Edit::SetReview {
                            bed: c.bed_id,
                            state: ReviewState::Candidate,
                            note: c.note.clone(),
                        });
                    }
                });
                let decision = doc.section().decision_for(c.bed_id);
                match (c.review, decision.and_then(|d| d.link_label())) {
                    (ReviewState::Accepted, _) => {
                        let typed = decision.and_then(|d| d.link.as_deref()).unwrap_or("");
                        link_ui(ui, c, typed, &used, out);
                    }
                    (_, Some(l)) => {
                        ui.label(
                            egui::RichText::new(format!(
                                "correlation label {l} kept; tied only once accepted"
                            ))
                            .small()
                            .color(theme::TEXT_DIM),
                        );
                    }
                    (_, None) => {}
                }
                let mut note = c.note.clone();
                let r = ui
                    .add(
                        egui::TextEdit::singleline(&mut note)
                            .hint_text("note on this boundary")
                            .char_limit(aggrade_core::io::limits::MAX_STRING_CHARS)
                            .desired_width(f32::INFINITY),
                    )
                    .on_hover_text("Your reasoning; saved with the project");
                if r.changed() {
                    out.edit_in(
                        Edit::SetReview { bed: c.bed_id, state: c.review, note },
                        gesture_key(("note", c.bed_id.0)),
                    );
                }
            });
            ui.add_space(4.0);
        }
        if total > shown {
            let more = ui
                .button(format!(
                    "Show {} more of {} candidates",
                    REVIEW_PAGE.min(total - shown),
                    total - shown
                ))
                .on_hover_text("List further, weaker candidates");
            if more.clicked() {
                ui.data_mut(|d| d.insert_temp(shown_id, shown + REVIEW_PAGE));
            }
        }
    });
}

/// The strength class as a coloured badge; the score only on hover.
fn strength_badge(ui: &mut egui::Ui, c: &BoundaryCandidate) {
    let colour = strength_colour(c.strength);
    let text = egui::RichText::new(c.strength.name()).small().strong().color(egui::Color32::WHITE);
    ui.add(egui::Button::new(text).fill(colour).stroke(egui::Stroke::NONE).sense(egui::Sense::hover()))
        .on_hover_text(format!("score {:.2}: {SCORE_TIP}", c.score));
}

/// A paleosol development term in its serialised form.
fn paleosol_term(text: &str) -> Option<PaleosolDevelopment> {
    serde_json::from_value(serde_json::Value::String(text.to_string())).ok()
}

/// A rule parameter typed as text: a whole number from 0 to 100 for counts, else a number; the
/// parameters with it must pass [`RuleParams::problems`] for that field.
pub fn read_param(
    params: &RuleParams,
    name: &str,
    text: &str,
    count: bool,
) -> Result<serde_json::Value, String> {
    let t = text.trim();
    let v = if count {
        match t.parse::<u64>() {
            Ok(v) if v <= 100 => serde_json::Value::Number(v.into()),
            _ => return Err(format!("{name}: {t:?} is not a whole number from 0 to 100")),
        }
    } else {
        match t.replace(',', ".").parse::<f64>().ok().and_then(serde_json::Number::from_f64) {
            Some(n) => serde_json::Value::Number(n),
            None => return Err(format!("{name}: {t:?} is not a number")),
        }
    };
    let mut map = serde_json::to_value(params).map_err(|e| format!("{name}: {e}"))?;
    map[name] = v.clone();
    let candidate: RuleParams = serde_json::from_value(map).map_err(|e| format!("{name}: {e}"))?;
    match candidate.problems().into_iter().find(|p| p.starts_with(&format!("{name}:"))) {
        Some(p) => Err(p),
        None => Ok(v),
    }
}

/// The project's rule parameters, field by field through their serde form: numbers as committed
/// fields, switches as check boxes, each change one undoable edit of the project
/// ([`Edit::SetRuleParams`], storing the fields that differ from the defaults). `stored` is what
/// the project holds.
pub fn params_ui(
    ui: &mut egui::Ui,
    rules: &ProjectRules,
    stored: &serde_json::Map<String, serde_json::Value>,
    out: &mut Actions,
) {
    if let Some(problem) = &rules.problem {
        ui.colored_label(theme::WARN, problem);
    }
    ui.label(
        egui::RichText::new(format!("Saved with the project; {}.", rules.params.summary()))
            .small()
            .color(theme::TEXT_DIM),
    );
    let before = rules.params.clone();
    let Ok(serde_json::Value::Object(mut map)) = serde_json::to_value(&before) else {
        ui.label("These parameters cannot be shown.");
        return;
    };
    let mut changed = false;
    egui::Grid::new("rule_params").num_columns(2).spacing([10.0, 4.0]).show(ui, |ui| {
        for (name, value) in map.iter_mut() {
            let label = name.replace('_', " ");
            match value {
                serde_json::Value::Number(n) => {
                    let lab = ui.label(label).id;
                    let stored = n.to_string();
                    let tip = format!(
                        "Rule parameter `{name}`, saved with the project; the rules run again when you press Enter or leave the field"
                    );
                    let look = FieldLook { hint: "", tip: &tip, width: 90.0, char_limit: 40 };
                    let count = n.is_u64();
                    let id = egui::Id::unique(("rule_param", name.as_str()));
                    let (r, v, problem) = committed_field_in_memory(ui, id, &stored, look, |text| {
                        read_param(&before, name, text, count)
                    });
                    r.labelled_by(lab);
                    if let Some(v) = v {
                        *value = v;
                        changed = true;
                    }
                    ui.end_row();
                    if let Some(p) = problem {
                        ui.label("");
                        problem_label(ui, &p);
                        ui.end_row();
                    }
                }
                serde_json::Value::String(text) if paleosol_term(text).is_some() => {
                    ui.label(label);
                    let current = paleosol_term(text).map(|p| p.name()).unwrap_or("?");
                    egui::ComboBox::from_id_salt(name.as_str())
                        .selected_text(current)
                        .show_ui(ui, |ui| {
                            for p in PaleosolDevelopment::ALL {
                                if let Ok(serde_json::Value::String(v)) = serde_json::to_value(p) {
                                    if ui.selectable_label(*text == v, p.name()).clicked() {
                                        *text = v;
                                        changed = true;
                                    }
                                }
                            }
                        })
                        .response
                        .on_hover_text(format!("Rule parameter `{name}`, saved with the project"));
                    ui.end_row();
                }
                serde_json::Value::Bool(b) => {
                    ui.label(label);
                    changed |= ui
                        .checkbox(b, "")
                        .on_hover_text(format!("Rule parameter `{name}`, saved with the project"))
                        .changed();
                    ui.end_row();
                }
                _ => {}
            }
        }
    });
    if changed {
        if let Ok(edited) = serde_json::from_value::<RuleParams>(serde_json::Value::Object(map)) {
            if edited != before {
                out.edit(Edit::SetRuleParams { params: edited.changed() });
            }
        }
    }
    if ui
        .add_enabled(!stored.is_empty(), egui::Button::new("Restore defaults"))
        .on_hover_text("Put every rule parameter back to its documented default (Ctrl+Z takes it back)")
        .clicked()
    {
        out.edit(Edit::SetRuleParams { params: serde_json::Map::new() });
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_correlation_label_is_read_whole_trimmed_and_checked_as_the_file_checks_it() {
        assert_eq!(read_link("  SB-2 "), Ok(Some("SB-2".to_string())));
        assert_eq!(read_link("   "), Ok(None), "blank takes the label off");
        let e = read_link("SB\u{7}").expect_err("control character");
        assert!(e.starts_with("correlation label: must not hold control characters"), "{e}");
        let long = "é".repeat(aggrade_core::io::limits::MAX_LINK_LABEL_CHARS + 1);
        assert!(read_link(&long).is_err(), "41 characters (82 bytes)");
        let at_limit = "é".repeat(aggrade_core::io::limits::MAX_LINK_LABEL_CHARS);
        assert_eq!(read_link(&at_limit), Ok(Some(at_limit.clone())), "the limit counts characters");
    }

    #[test]
    fn the_list_tells_what_it_leaves_out() {
        assert_eq!(toggle_text(false, 3), "Show weak paleosol tops (3 not listed)");
        assert_eq!(toggle_text(true, 0), "Show weak paleosol tops (listed)");
        assert!(no_candidates_text(0).contains("no erosional channel-body base, no paleosol top"));
        assert_eq!(
            no_candidates_text(2),
            "No listed candidates: 2 weak paleosol tops with no further evidence are not listed."
        );
    }

    #[test]
    fn a_rule_parameter_is_read_whole_and_checked_by_the_rules_own_checks() {
        let p = RuleParams::default();
        assert_eq!(read_param(&p, "window_m", " 12,5 ", false), Ok(serde_json::json!(12.5)));
        let e = read_param(&p, "window_m", "0", false).expect_err("a window of 0 m");
        assert!(e.starts_with("window_m: got 0"), "{e}");
        assert!(read_param(&p, "window_m", "1 2", false).is_err(), "half a number is not read");
        assert!(read_param(&p, "low_min_proportion", "1.5", false).is_err(), "a fraction above 1");
        assert_eq!(read_param(&p, "facies_shift_min_classes", "3", true), Ok(serde_json::json!(3)));
        assert!(read_param(&p, "facies_shift_min_classes", "3.5", true).is_err());
        assert!(read_param(&p, "facies_shift_min_classes", "101", true).is_err());
    }
}
