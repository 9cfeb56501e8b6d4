//! The review panel: candidate sequence boundaries ranked by score with their evidence, the
//! geologist's accept / reject / note, and the rule parameters that re-run the rules live.

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::engine::RuleParams;
use super::field::{committed_field_in_memory, problem_label, FieldLook};
use super::table::show_length;
use super::theme;
use aggrade_core::model::{PaleosolDevelopment, Project, ReviewState};
use aggrade_core::rules::Interpretation;

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
    aggrade_core::io::check_link_label(label).map_err(|why| format!("Link: {why}"))?;
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
        let lab = ui.label("Link").id;
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

/// Draw the candidate list.
pub fn ui(ui: &mut egui::Ui, doc: &Document, interp: &Interpretation, out: &mut Actions) {
    let unit = doc.section().display_unit;
    ui.label(
        egui::RichText::new(
            "Candidate sequence boundaries, best supported first. Each is a suggestion for you to judge.",
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
    ui.separator();
    if interp.sequence_boundary_candidates.is_empty() {
        ui.label("No candidates: no erosional channel-body base or strongly developed paleosol was found.");
    }
    // Long sections can have hundreds of candidates: list the best ones, more on request.
    let shown_id = egui::Id::unique("review_shown");
    let shown = ui.data(|d| d.get_temp::<usize>(shown_id)).unwrap_or(REVIEW_PAGE);
    let total = interp.sequence_boundary_candidates.len();
    let used = link_labels(&doc.project);
    egui::ScrollArea::vertical().id_salt("review_list").show(ui, |ui| {
        for (rank, c) in interp.sequence_boundary_candidates.iter().enumerate().take(shown) {
            let (badge, colour) = match c.review {
                ReviewState::Candidate => ("open", theme::WARN),
                ReviewState::Accepted => ("accepted", theme::ACCEPTED),
                ReviewState::Rejected => ("rejected", theme::REJECTED),
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
                    ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
                        ui.label(egui::RichText::new(badge).color(colour).strong());
                    });
                });
                ui.label(egui::RichText::new(c.kind.name()).color(theme::TEXT_DIM));
                score_bar(ui, c.score);
                for e in &c.evidence {
                    ui.label(format!("• {e}"));
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
                        .add_enabled(c.review != ReviewState::Candidate, egui::Button::new("Reopen"))
                        .on_hover_text("Take back your decision");
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
                .on_hover_text("List further, lower-scoring candidates");
            if more.clicked() {
                ui.data_mut(|d| d.insert_temp(shown_id, shown + REVIEW_PAGE));
            }
        }
    });
}

/// The score as a number and a thin bar.
fn score_bar(ui: &mut egui::Ui, score: f64) {
    ui.horizontal(|ui| {
        ui.label(egui::RichText::new(format!("score {score:.2}")).small().strong());
        let (rect, r) =
            ui.allocate_exact_size(egui::vec2(ui.available_width().min(200.0), 6.0), egui::Sense::hover());
        let p = ui.painter();
        p.rect_filled(rect, 3.0, egui::Color32::from_gray(225));
        let mut fill = rect;
        fill.set_width(rect.width() * score.clamp(0.0, 1.0) as f32);
        p.rect_filled(fill, 3.0, theme::ACCENT);
        r.on_hover_text("Weighted evidence, 0–1");
    });
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

/// Edit any parameter struct field by field through its serde form: numbers as committed fields,
/// switches as check boxes. Returns true when something changed.
pub fn params_ui(ui: &mut egui::Ui, params: &mut RuleParams) -> bool {
    let Ok(serde_json::Value::Object(mut map)) = serde_json::to_value(&*params) else {
        ui.label("These parameters cannot be shown.");
        return false;
    };
    let mut changed = false;
    let before = params.clone();
    egui::Grid::new("rule_params").num_columns(2).spacing([10.0, 4.0]).show(ui, |ui| {
        for (name, value) in map.iter_mut() {
            let label = name.replace('_', " ");
            match value {
                serde_json::Value::Number(n) => {
                    let lab = ui.label(label).id;
                    let stored = n.to_string();
                    let tip = format!(
                        "Rule parameter `{name}`; the rules run again when you press Enter or leave the field"
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
                        .on_hover_text(format!("Rule parameter `{name}`"));
                    ui.end_row();
                }
                serde_json::Value::Bool(b) => {
                    ui.label(label);
                    changed |= ui.checkbox(b, "").on_hover_text(format!("Rule parameter `{name}`")).changed();
                    ui.end_row();
                }
                _ => {}
            }
        }
    });
    if changed {
        match serde_json::from_value::<RuleParams>(serde_json::Value::Object(map)) {
            Ok(p) => *params = p,
            Err(_) => return false,
        }
    }
    if ui
        .button("Restore defaults")
        .on_hover_text("Put every rule parameter back to its documented default")
        .clicked()
    {
        *params = RuleParams::default();
        changed = true;
    }
    changed
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_link_is_read_whole_trimmed_and_checked_as_the_file_checks_it() {
        assert_eq!(read_link("  SB-2 "), Ok(Some("SB-2".to_string())));
        assert_eq!(read_link("   "), Ok(None), "blank takes the label off");
        let e = read_link("SB\u{7}").expect_err("control character");
        assert!(e.starts_with("Link: must not hold control characters"), "{e}");
        let long = "é".repeat(aggrade_core::io::limits::MAX_LINK_LABEL_CHARS + 1);
        assert!(read_link(&long).is_err(), "41 characters (82 bytes)");
        let at_limit = "é".repeat(aggrade_core::io::limits::MAX_LINK_LABEL_CHARS);
        assert_eq!(read_link(&at_limit), Ok(Some(at_limit.clone())), "the limit counts characters");
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
