//! The menu bar, status bar and side panels of the window.

use super::{AggradeApp, Command, Notice, Pending, Tab};
use crate::gui::actions::Actions;
use crate::gui::canvas;
use crate::gui::document::{Document, Edit};
use crate::gui::{plots, review, theme};
use aggrade_core::model::{FixRole, LengthUnit, Section};

impl AggradeApp {
    /// One menu entry for a command: its label, shortcut and tooltip come from the command.
    pub(super) fn menu_item(&mut self, ui: &mut egui::Ui, ctx: &egui::Context, cmd: Command) {
        let mut b = egui::Button::new(cmd.label());
        if let Some(text) = cmd.shortcut_text(ctx) {
            b = b.shortcut_text(text);
        }
        let enabled = match cmd {
            Command::Undo => self.doc.can_undo(),
            Command::Redo => self.doc.can_redo(),
            _ => true,
        };
        if ui.add_enabled(enabled, b).on_hover_text(cmd.tooltip()).clicked() {
            self.run_command(ctx, cmd);
            ui.close();
        }
    }

    /// Menu entries for several commands, in order.
    pub(super) fn menu_items(&mut self, ui: &mut egui::Ui, ctx: &egui::Context, cmds: &[Command]) {
        for cmd in cmds {
            self.menu_item(ui, ctx, *cmd);
        }
    }

    pub(super) fn menu_bar(&mut self, ui: &mut egui::Ui, ctx: &egui::Context, actions: &mut Actions) {
        let recent_was_open = std::mem::take(&mut self.recent_menu_open);
        egui::Panel::top("menu").show(ui, |ui| {
            egui::MenuBar::new().ui(ui, |ui| {
                ui.menu_button("File", |ui| {
                    self.menu_items(ui, ctx, &[Command::New, Command::Open]);
                    ui.menu_button("Open recent", |ui| {
                        // Read again as the submenu opens: another window may have opened files.
                        if !recent_was_open {
                            self.recent.refresh();
                        }
                        self.recent_menu_open = true;
                        if self.recent.list().is_empty() {
                            ui.label("No recent files");
                        }
                        for p in self.recent.list().to_vec() {
                            if ui
                                .button(p.display().to_string())
                                .on_hover_text("Open this file again")
                                .clicked()
                            {
                                self.guard(Pending::Open(p), ctx);
                                ui.close();
                            }
                        }
                    });
                    self.menu_items(ui, ctx, &[Command::ImportCsv, Command::ImportTable]);
                    ui.separator();
                    self.menu_items(ui, ctx, &[Command::Save, Command::SaveAs, Command::Export]);
                    ui.separator();
                    self.menu_item(ui, ctx, Command::Quit);
                });
                ui.menu_button("Edit", |ui| {
                    self.menu_items(ui, ctx, &[Command::Undo, Command::Redo]);
                    ui.separator();
                    ui.label(
                        egui::RichText::new("Selected bed (↑ ↓ to move, Del to delete)")
                            .small()
                            .color(theme::TEXT_DIM),
                    );
                    canvas::bed_menu(ui, &self.doc, self.doc.selected_bed, actions);
                });
                ui.menu_button("View", |ui| {
                    self.menu_items(ui, ctx, &[Command::ZoomIn, Command::ZoomOut]);
                    ui.checkbox(&mut self.layout.show_rejected, "Show rejected boundaries")
                        .on_hover_text("Draw boundaries you rejected, greyed");
                    ui.separator();
                    self.menu_items(ui, ctx, &[Command::PanelView, Command::StatsView, Command::BodiesView]);
                });
                ui.menu_button("Section", |ui| {
                    let names: Vec<String> =
                        self.doc.project.sections.iter().map(|s| s.name.clone()).collect();
                    for (i, n) in names.iter().enumerate() {
                        if ui
                            .radio(self.doc.selected_section == i, n)
                            .on_hover_text("Show this section")
                            .clicked()
                        {
                            self.doc.select_section(i);
                            ui.close();
                        }
                    }
                    ui.separator();
                    self.menu_items(ui, ctx, &[Command::SectionDetails, Command::AddSection]);
                    ui.separator();
                    self.menu_item(ui, ctx, Command::TraceImage);
                    if self.doc.section().trace.is_some() && !self.trace_window_open() {
                        self.menu_item(ui, ctx, Command::ShowTrace);
                    }
                    self.menu_item(ui, ctx, Command::AttachCurve);
                    let attached: Vec<String> =
                        self.doc.section().curves.iter().map(|c| c.mnemonic.clone()).collect();
                    for m in attached {
                        if ui
                            .button(format!("Remove curve {m}"))
                            .on_hover_text("Take this measured curve off the section (Ctrl+Z brings it back)")
                            .clicked()
                        {
                            self.apply(Edit::RemoveCurve { mnemonic: m });
                            ui.close();
                        }
                    }
                });
                ui.separator();
                ui.label(egui::RichText::new(&self.doc.section().name).strong());
                ui.label(
                    egui::RichText::new(super::plural(self.doc.section().beds.len(), "bed", "beds"))
                        .color(theme::TEXT_DIM),
                );
            });
        });
    }

    pub(super) fn status_bar(&mut self, ui: &mut egui::Ui) {
        // A new message stands from the document revision it was first shown at.
        if self.status_shown.as_ref().is_none_or(|(text, _)| *text != self.status) {
            self.status_shown = Some((self.status.clone(), self.doc.revision));
        }
        egui::Panel::bottom("status").show(ui, |ui| {
            // The caution first, from the right; the status takes the room left, cut short with
            // "…" (whole on hover) rather than written over the caution.
            let problem = self.rules().problem;
            ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
                ui.label(egui::RichText::new(aggrade_core::REVIEW_CAUTION).small().color(theme::WARN));
                if let Some(p) = &problem {
                    ui.label(egui::RichText::new("Default rules used").small().strong().color(theme::WARN))
                        .on_hover_text(p);
                }
                ui.with_layout(egui::Layout::left_to_right(egui::Align::Center), |ui| {
                    let line = self.status_line();
                    ui.add(egui::Label::new(&line).truncate()).on_hover_text(&line);
                });
            });
        });
    }

    pub(super) fn left_panel(&mut self, ui: &mut egui::Ui, actions: &mut Actions) {
        egui::Panel::left("beds").resizable(true).default_size(370.0).show(ui, |ui| {
            ui.add_space(4.0);
            self.table.ui(ui, &self.doc, actions);
        });
    }

    pub(super) fn right_panel(&mut self, ui: &mut egui::Ui, actions: &mut Actions) {
        egui::Panel::right("side").resizable(true).default_size(360.0).show(ui, |ui| {
            ui.add_space(4.0);
            ui.horizontal(|ui| {
                for (t, name, tip) in [
                    (Tab::Inspector, "Bed", "Every field of the selected bed"),
                    (Tab::Review, "Review", "Candidate sequence boundaries and rule settings"),
                    (Tab::Plots, "Plots", "Proportion, grain size and body thickness plots"),
                    (Tab::Section, "Section", "Section details and display unit"),
                ] {
                    ui.selectable_value(&mut self.tab, t, name).on_hover_text(tip);
                }
            });
            ui.separator();
            let Some(cache) = self.column.current() else { return };
            match self.tab {
                Tab::Inspector => self.inspector.ui(ui, &self.doc, actions),
                Tab::Review => {
                    let rules = self.rules();
                    egui::CollapsingHeader::new("Rule parameters").show(ui, |ui| {
                        review::params_ui(ui, &rules, &self.doc.project.rule_params, actions);
                    });
                    // The checked interpretation is the one on screen, marked with stabilities.
                    let checked =
                        self.stability.as_ref().filter(|s| s.is_for(&self.doc, self.all_candidates));
                    let list = review::List {
                        interp: checked.map_or(&cache.interp, |s| &s.interp),
                        all_candidates: &mut self.all_candidates,
                        stability_runs: checked.map(|s| s.runs),
                    };
                    review::ui(ui, &self.doc, list, actions);
                }
                Tab::Plots => plots::ui(ui, &self.doc, &cache.interp),
                Tab::Section => {
                    if section_ui(ui, &self.doc, actions) {
                        self.open_section_details();
                    }
                }
            }
        });
    }

    pub(super) fn views_ui(&mut self, ctx: &egui::Context) {
        let now = std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map(|d| d.as_secs() as i64)
            .unwrap_or(0);
        let params = self.rules().params;
        let checked = self.stability.as_ref().filter(|s| s.is_for(&self.doc, self.all_candidates));
        let out = self.views.ui(ctx, &self.doc, &params, checked.map(|s| &s.interp), &mut self.chooser, now);
        if let Some(s) = out.status {
            self.status = s;
        }
        if let Some((title, text)) = out.error {
            self.message = Some(Notice::new(title, text));
        }
        if let Some(edit) = out.edit {
            self.apply(edit);
        }
    }
}

/// The Section tab: every detail of the section shown, the unit switch, and the button that
/// opens the Section details dialog where they are edited.
fn section_ui(ui: &mut egui::Ui, doc: &Document, out: &mut Actions) -> bool {
    let s = doc.section();
    let unit = s.display_unit;
    let none = || egui::RichText::new("—").color(theme::TEXT_DIM);
    let text_or_none = |t: &str| if t.trim().is_empty() { none() } else { egui::RichText::new(t) };
    egui::Grid::new("section_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
        ui.label("Name");
        ui.label(egui::RichText::new(&s.name).strong());
        ui.end_row();
        ui.label("Locality");
        ui.add(egui::Label::new(text_or_none(&s.locality)).wrap());
        ui.end_row();
        ui.label("Logged by");
        ui.label(text_or_none(&s.logged_by));
        ui.end_row();
        ui.label("Date logged");
        ui.label(text_or_none(s.date_logged.as_deref().unwrap_or("")));
        ui.end_row();
        ui.label("Coordinates");
        match s.coordinates {
            Some(c) => ui
                .label(format!("{}°, {}°", trimmed(c.lat_deg, 6), trimmed(c.lon_deg, 6)))
                .on_hover_text("WGS84 latitude and longitude of the section base, decimal degrees"),
            None => ui.label(none()),
        };
        ui.end_row();
        ui.label("Panel position");
        match s.panel_position_m {
            Some(m) => ui.label(format!("{:.2} {} along the line", unit.from_metres(m), unit.name())),
            None => ui.label(egui::RichText::new("— (placed by its order)").color(theme::TEXT_DIM)),
        };
        ui.end_row();
        for (name, line, tip) in setting_lines(s) {
            ui.label(name);
            let shown =
                if line.is_empty() { ui.label(none()) } else { ui.add(egui::Label::new(line).wrap()) };
            shown.on_hover_text(tip);
            ui.end_row();
        }
        ui.label("Display unit");
        ui.horizontal(|ui| {
            for u in LengthUnit::ALL {
                if ui
                    .selectable_label(unit == *u, u.name())
                    .on_hover_text("Show and type thicknesses in this unit")
                    .clicked()
                {
                    out.edit(Edit::SetDisplayUnit { unit: *u });
                }
            }
        });
        ui.end_row();
    });
    ui.label("Notes");
    ui.add(egui::Label::new(text_or_none(&s.notes)).wrap());
    ui.add_space(4.0);
    let open = ui
        .button(Command::SectionDetails.label())
        .on_hover_text(format!(
            "{} ({})",
            Command::SectionDetails.tooltip(),
            Command::SectionDetails.shortcut_text(ui.ctx()).unwrap_or_default()
        ))
        .clicked();
    ui.separator();
    let length = |m: f64| format!("{:.2} {}", unit.from_metres(m), unit.name());
    ui.label(format!(
        "Total thickness {} · exposed {} · {}",
        length(doc.heights().total_m),
        length(doc.heights().exposed_m),
        super::plural(s.beds.len(), "bed", "beds")
    ));
    open
}

/// The section's measuring setting as the Section tab sums it up, one (name, line, hover text)
/// each: method and uncertainty, bedding attitude (both ways it is written), traverse, and the
/// GPS fixes (how many, and the top one). An empty line is shown as "—".
fn setting_lines(s: &Section) -> [(&'static str, String, &'static str); 4] {
    let unit = s.display_unit;
    let method = s.method.map(crate::gui::section_details::method_label);
    let uncertainty =
        s.thickness_uncertainty_m.map(|m| format!("± {} {}", trimmed(unit.from_metres(m), 4), unit.name()));
    let measured = [method, uncertainty].into_iter().flatten().collect::<Vec<_>>().join(" · ");
    let bedding = s.bedding.map_or_else(String::new, |b| {
        format!(
            "dip {}° towards {:03}° · strike/dip {:03}°/{}° (RHR)",
            trimmed(b.dip_deg, 1),
            b.dip_direction_deg.round() as i64 % 360,
            b.strike_rhr_deg().round() as i64 % 360,
            trimmed(b.dip_deg, 1)
        )
    });
    let traverse = s.traverse.map_or_else(String::new, |t| {
        format!(
            "bearing {:03}° · ground slope {}°",
            t.bearing_deg.round() as i64 % 360,
            trimmed(t.slope_deg, 1)
        )
    });
    // The top fix, else the highest.
    let top = s.fixes.iter().max_by(|a, b| {
        (a.role == FixRole::Top, a.height_m)
            .partial_cmp(&(b.role == FixRole::Top, b.height_m))
            .unwrap_or(std::cmp::Ordering::Equal)
    });
    let fixes = match top {
        None => String::new(),
        Some(f) => format!(
            "{} · {} at {} {}: {}°, {}°{}",
            s.fixes.len(),
            f.role.name(),
            trimmed(unit.from_metres(f.height_m), 2),
            unit.name(),
            trimmed(f.lat_deg, 6),
            trimmed(f.lon_deg, 6),
            f.elevation_m.map_or_else(String::new, |e| format!(", {} m elevation", trimmed(e, 1)))
        ),
    };
    [
        ("Measured with", measured, "Measuring method and the ± error of one thickness reading"),
        (
            "Bedding",
            bedding,
            "Bedding attitude at the section: dip and dip direction, and the same as a right-hand-rule strike and dip",
        ),
        ("Traverse", traverse, "Direction walked up-section and the slope of the ground along it"),
        ("GPS fixes", fixes, "How many GPS fixes, and the top one (or the highest)"),
    ]
}

/// A number with at most `decimals` decimals and no trailing zeros.
fn trimmed(v: f64, decimals: usize) -> String {
    let s = format!("{v:.decimals$}");
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{BeddingAttitude, GpsFix, MeasuringMethod, Traverse};

    #[test]
    fn the_section_tab_sums_up_how_the_section_was_measured() {
        let mut s = Section::new("Corrie Wash");
        assert!(setting_lines(&s).iter().all(|(_, line, _)| line.is_empty()), "nothing said: all dashes");
        s.method = Some(MeasuringMethod::JacobsStaff);
        s.thickness_uncertainty_m = Some(0.05);
        // Right-hand rule: strike = dip direction − 90° (common practice in field work).
        s.bedding = Some(BeddingAttitude { dip_deg: 3.0, dip_direction_deg: 95.0 });
        s.traverse = Some(Traverse { bearing_deg: 210.0, slope_deg: -8.0 });
        let fix = |role, height_m, elevation_m| GpsFix {
            role,
            height_m,
            lat_deg: -24.6118,
            lon_deg: 133.7214,
            elevation_m,
            note: String::new(),
        };
        s.fixes = vec![
            fix(FixRole::Offset, 40.0, None),
            fix(FixRole::Top, 30.0, Some(471.0)),
            fix(FixRole::Base, 0.0, None),
        ];
        let lines: Vec<String> = setting_lines(&s).into_iter().map(|(_, l, _)| l).collect();
        assert_eq!(lines[0], "Jacob's staff · ± 0.05 m");
        assert_eq!(lines[1], "dip 3° towards 095° · strike/dip 005°/3° (RHR)");
        assert_eq!(lines[2], "bearing 210° · ground slope -8°");
        assert_eq!(
            lines[3], "3 · top at 30 m: -24.6118°, 133.7214°, 471 m elevation",
            "the top fix, not the highest"
        );
        // In feet (1 ft = 0.3048 m exactly, 1959 agreement).
        s.display_unit = LengthUnit::Foot;
        s.fixes.retain(|f| f.role != FixRole::Top);
        let lines: Vec<String> = setting_lines(&s).into_iter().map(|(_, l, _)| l).collect();
        assert!(lines[0].ends_with("± 0.164 ft"), "{}", lines[0]);
        assert!(lines[3].starts_with("2 · offset at 131.23 ft"), "no top fix: the highest: {}", lines[3]);
    }
}
