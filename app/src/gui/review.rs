//! The review panel: candidate sequence boundaries ranked by score with their evidence, the
//! geologist's accept / reject / note, and the rule parameters that re-run the rules live.

use super::actions::{gesture_key, Actions};
use super::document::{Document, Edit};
use super::engine::RuleParams;
use super::table::show_length;
use super::theme;
use aggrade_core::model::{PaleosolDevelopment, Project, ReviewState};
use aggrade_core::rules::{CandidateKind, Interpretation};

/// How many candidates are listed at a time.
const REVIEW_PAGE: usize = 25;

fn kind_name(k: CandidateKind) -> &'static str {
    match k {
        CandidateKind::ChannelBodyBase => "channel-body base",
        CandidateKind::PaleosolTop => "paleosol top",
        CandidateKind::ChannelBaseOnPaleosol => "channel base on paleosol",
    }
}

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

/// Hint shown in the empty correlation-label field.
pub const LINK_HINT: &str = "correlation label, e.g. SB-2";

/// The correlation label of an accepted boundary: a text field (one undo step per typing run)
/// and a list of the labels already used in the project.
fn link_ui(
    ui: &mut egui::Ui,
    c: &aggrade_core::rules::BoundaryCandidate,
    current: &str,
    used: &[String],
    out: &mut Actions,
) {
    ui.horizontal(|ui| {
        let lab = ui.label("Link").id;
        let mut label = current.to_string();
        let r = ui
            .add(
                egui::TextEdit::singleline(&mut label)
                    .hint_text(LINK_HINT)
                    .desired_width(140.0)
                    // Longer labels are refused by the file checks: stop the typing rather than
                    // apply the keystrokes up to the limit and refuse the next.
                    .char_limit(aggrade_core::io::limits::MAX_LINK_LABEL_CHARS),
            )
            .labelled_by(lab)
            .on_hover_text(
                "Accepted boundaries with the same label in neighbouring sections are tied on the correlation panel",
            );
        if r.changed() {
            out.edit_in(Edit::SetLink { bed: c.bed_id, link: Some(label.clone()) }, gesture_key(("link", c.bed_id.0)));
        }
        if r.lost_focus() {
            // Spaces typed at either end go when the field is left, in the same undo step.
            if label.trim() != label {
                out.edit_in(
                    Edit::SetLink { bed: c.bed_id, link: Some(label.trim().to_string()) },
                    gesture_key(("link", c.bed_id.0)),
                );
            }
            out.end_gesture = true;
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
                ui.label(egui::RichText::new(kind_name(c.kind)).color(theme::TEXT_DIM));
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

/// Edit any parameter struct field by field through its serde form: numbers as drag values,
/// switches as check boxes. Returns true when something changed.
pub fn params_ui(ui: &mut egui::Ui, params: &mut RuleParams) -> bool {
    let Ok(serde_json::Value::Object(mut map)) = serde_json::to_value(&*params) else {
        ui.label("These parameters cannot be shown.");
        return false;
    };
    let mut changed = false;
    egui::Grid::new("rule_params").num_columns(2).spacing([10.0, 4.0]).show(ui, |ui| {
        for (name, value) in map.iter_mut() {
            let label = name.replace('_', " ");
            match value {
                serde_json::Value::Number(n) if n.is_u64() => {
                    let mut v = n.as_u64().unwrap_or(0);
                    ui.label(label);
                    let r = ui
                        .add(
                            egui::DragValue::new(&mut v)
                                .speed(0.1)
                                .range(0..=100)
                                .clamp_existing_to_range(false),
                        )
                        .on_hover_text(format!("Rule parameter `{name}`"));
                    if r.changed() {
                        *value = serde_json::Value::Number(v.into());
                        changed = true;
                    }
                    ui.end_row();
                }
                serde_json::Value::Number(n) => {
                    let mut v = n.as_f64().unwrap_or(0.0);
                    ui.label(label);
                    let r = ui
                        .add(
                            egui::DragValue::new(&mut v)
                                .speed(0.01)
                                .range(0.0..=f64::MAX)
                                .clamp_existing_to_range(false),
                        )
                        .on_hover_text(format!("Rule parameter `{name}`"));
                    if r.changed() {
                        if let Some(num) = serde_json::Number::from_f64(v) {
                            *value = serde_json::Value::Number(num);
                            changed = true;
                        }
                    }
                    ui.end_row();
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
