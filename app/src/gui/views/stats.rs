//! Statistics view: paleocurrents per section, per interval and per bed with a rose diagram, and
//! the facies-transition analysis (observed, expected, difference, χ²) with a diagram of the
//! transitions that occur more often than chance.

use super::common::{caution, counted, fmt_p, text_table, ViewCtx};
use crate::cli::stats::{bounds_from_cuts, cuts_text, state_sequence, StateKind};
use crate::gui::plots::plot_unit;
use crate::gui::theme;
use aggrade_core::analysis::markov::{analyse_sequence, TransitionAnalysis, TransitionParams};
use aggrade_core::analysis::paleocurrents::{
    circular_summary, flow_readings, flow_readings_in_interval, grouped, per_bed, per_interval, rose_bins,
    CircularParams, CircularSummary, DataKind, PetalScale, RoseBin, RoseBins, RoseParams,
};
use aggrade_core::analysis::AnalysisError;
use aggrade_core::model::{LengthUnit, Project};
use aggrade_core::rules::Interpretation;
use egui::{Color32, Pos2, Rect, Shape, Stroke, Vec2};

/// Rose bin widths offered (each divides 360°).
pub const BIN_WIDTHS_DEG: [f64; 7] = [5.0, 10.0, 15.0, 20.0, 30.0, 45.0, 60.0];

/// What the rose diagram shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RoseOf {
    /// Every reading of the chosen section.
    Section,
    /// The readings of one interval between boundaries (index into the intervals).
    Interval(usize),
}

/// The choices of the statistics view.
#[derive(Debug, Clone, PartialEq)]
pub struct StatsChoices {
    /// Index of the section shown in detail.
    pub section: usize,
    pub kind: DataKind,
    pub bin_width_deg: f64,
    pub petal_scale: PetalScale,
    pub states: StateKind,
    pub rose_of: RoseOf,
}

impl Default for StatsChoices {
    fn default() -> Self {
        StatsChoices {
            section: 0,
            kind: DataKind::Directional,
            bin_width_deg: 30.0,
            petal_scale: PetalScale::Area,
            states: StateKind::Lithology,
            rose_of: RoseOf::Section,
        }
    }
}

/// One row of a paleocurrent table.
#[derive(Debug, Clone, PartialEq)]
pub struct SummaryRow {
    /// Section name, interval or bed.
    pub what: String,
    /// `Err` when there are too few readings (the reason).
    pub summary: Result<CircularSummary, NoSummary>,
}

/// Why the view has no figure to show for a row, the rose or the transitions.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum NoSummary {
    /// The statistics refused the readings (too few, or out of range).
    #[error(transparent)]
    Analysis(#[from] AnalysisError),
    /// An interval holds fewer than two readings.
    #[error("fewer than two readings")]
    FewerThanTwo,
    /// There is no section to compute from.
    #[error("the project holds no section")]
    NoSection,
}

/// Everything the view shows, computed once per document revision and choice.
#[derive(Debug, Clone, PartialEq)]
pub struct StatsResult {
    pub per_section: Vec<SummaryRow>,
    pub per_interval: Vec<SummaryRow>,
    pub per_bed: Vec<SummaryRow>,
    /// Flow readings per channel body of the rules (bodies of the chosen section).
    pub per_body: Vec<SummaryRow>,
    /// Whether the chosen section's readings were restored to horizontal, and with what; what
    /// was kept out of the flow statistics.
    pub tilt_note: String,
    /// Interval bounds of the chosen section (base, the boundaries cut at, top), m.
    pub interval_bounds_m: Vec<f64>,
    /// The unit the chosen section's heights are shown in (its display unit).
    pub unit: LengthUnit,
    /// True when the intervals are cut at accepted boundaries; false when at strong candidate
    /// boundaries, none being accepted yet (as the rules cut the regimes).
    pub cuts_are_accepted: bool,
    pub rose: Result<RoseBins, NoSummary>,
    /// Mean of the readings in the rose (for its arrow).
    pub rose_mean: Option<CircularSummary>,
    pub transitions: Result<TransitionAnalysis, NoSummary>,
}

/// Compute what the view shows for a project; `interps[i]` interprets `project.sections[i]` (the
/// intervals are cut where the rules cut them: accepted boundaries, else strong candidates).
pub fn compute(project: &Project, interps: &[Interpretation], c: &StatsChoices) -> StatsResult {
    let params = CircularParams { kind: c.kind, ..Default::default() };
    let per_section = project
        .sections
        .iter()
        .map(|s| SummaryRow {
            what: s.name.clone(),
            summary: circular_summary(&flow_readings(s, c.kind), &params).map_err(NoSummary::from),
        })
        .collect();
    let Some(section) = project.sections.get(c.section.min(project.sections.len().saturating_sub(1))) else {
        return StatsResult {
            per_section,
            per_interval: Vec::new(),
            per_bed: Vec::new(),
            per_body: Vec::new(),
            tilt_note: String::new(),
            interval_bounds_m: Vec::new(),
            unit: LengthUnit::Metre,
            cuts_are_accepted: false,
            rose: Err(NoSummary::NoSection),
            rose_mean: None,
            transitions: Err(NoSummary::NoSection),
        };
    };
    // The views get one interpretation per section; should one be missing, the section is
    // interpreted here with the project's rules, so the intervals are always the rules' own.
    let interp = match interps.get(c.section.min(project.sections.len().saturating_sub(1))) {
        Some(it) => std::borrow::Cow::Borrowed(it),
        None => std::borrow::Cow::Owned(aggrade_core::rules::interpret(
            section,
            &crate::gui::engine::project_rules(project).params,
        )),
    };
    let bounds = bounds_from_cuts(section.total_thickness_m(), &interp.cut_heights);
    let unit = plot_unit(section);
    let cuts_are_accepted = interp.cuts_are_accepted;
    let per_interval = match per_interval(section, &bounds, &params) {
        Ok(list) => list
            .into_iter()
            .map(|iv| SummaryRow {
                what: span_text(unit, iv.base_m, iv.top_m),
                summary: iv.summary.ok_or(NoSummary::FewerThanTwo),
            })
            .collect(),
        Err(e) => vec![SummaryRow { what: "every interval".into(), summary: Err(NoSummary::from(e)) }],
    };
    let per_bed = match per_bed(section, &params) {
        Ok(list) => list
            .into_iter()
            .map(|b| SummaryRow {
                what: format!("bed {} (base {})", b.bed_index + 1, unit.length(b.base_m)),
                summary: Ok(b.summary),
            })
            .collect(),
        Err(e) => vec![SummaryRow { what: "every bed".into(), summary: Err(NoSummary::from(e)) }],
    };
    let readings = match c.rose_of {
        RoseOf::Interval(k) if k + 1 < bounds.len() => {
            let top = if k + 2 == bounds.len() { bounds[k + 1] + 1e-9 } else { bounds[k + 1] };
            flow_readings_in_interval(section, bounds[k], top, c.kind)
        }
        _ => flow_readings(section, c.kind),
    };
    let rose = rose_bins(
        &readings,
        &RoseParams {
            bin_width_deg: c.bin_width_deg,
            scale: c.petal_scale,
            kind: c.kind,
            ..Default::default()
        },
    )
    .map_err(NoSummary::from);
    let rose_mean = circular_summary(&readings, &params).ok();
    let (per_body, tilt_note) = body_rows(section, &interp, &bounds, &params, unit);
    let transitions = analyse_sequence(&state_sequence(section, c.states), &TransitionParams::default())
        .map_err(NoSummary::from);
    StatsResult {
        per_section,
        per_interval,
        per_bed,
        per_body,
        tilt_note,
        interval_bounds_m: bounds,
        unit,
        cuts_are_accepted,
        rose,
        rose_mean,
        transitions,
    }
}

/// Flow statistics per channel body of the rules (one-way readings, or every flow reading as
/// axes when `params.kind` is axial) and a note on tilt correction and what was kept apart.
fn body_rows(
    section: &aggrade_core::model::Section,
    interp: &Interpretation,
    bounds: &[f64],
    params: &CircularParams,
    unit: LengthUnit,
) -> (Vec<SummaryRow>, String) {
    let g = match grouped(section, interp, bounds, params) {
        Ok(g) => g,
        Err(e) => return (Vec::new(), e.to_string()),
    };
    let rows = g
        .bodies
        .iter()
        .map(|b| {
            let readings = match params.kind {
                DataKind::Directional => b.group.flow_deg.clone(),
                DataKind::Axial => b.group.flow_deg.iter().chain(&b.group.axes_deg).copied().collect(),
            };
            SummaryRow {
                what: format!("body {} ({})", b.body + 1, span_text(unit, b.group.base_m, b.group.top_m)),
                summary: if readings.len() < 2 {
                    Err(NoSummary::FewerThanTwo)
                } else {
                    circular_summary(&readings, params).map_err(NoSummary::from)
                },
            }
        })
        .collect();
    let mut note = match g.restored_with {
        Some(b) => format!(
            "{}: readings restored to horizontal for bedding dipping {:.0}° toward {:03.0}° (rotation about \
             strike); imbrication turned downstream.",
            section.name, b.dip_deg, b.dip_direction_deg
        ),
        None => format!(
            "{}: readings as measured (no bedding attitude, so not restored to horizontal); imbrication turned \
             downstream.",
            section.name
        ),
    };
    let (axes, accretion) = (g.section.axes_deg.len(), g.section.accretion_deg.len());
    if accretion > 0 {
        note.push_str(&format!(
            " {} kept out of the flow statistics (Miall 1974).",
            counted(accretion, "accretion-surface dip", "accretion-surface dips")
        ));
    }
    if axes > 0 && params.kind == DataKind::Directional {
        note.push_str(&format!(
            " {} (parting lineation, groove casts) left out as directions; choose Axial to include them.",
            counted(axes, "two-way reading", "two-way readings")
        ));
    }
    (rows, note)
}

/// A stretch of section between two heights (m) in `unit`: "0.00–24.60 m", "0.00–80.71 ft".
pub fn span_text(unit: LengthUnit, base_m: f64, top_m: f64) -> String {
    format!("{:.2}\u{2013}{:.2} {}", unit.from_metres(base_m), unit.from_metres(top_m), unit.name())
}

/// The cells of a paleocurrent row: n, mean, R̄, circular s.d., Rayleigh z, p.
pub fn summary_cells(row: &SummaryRow) -> Vec<String> {
    match &row.summary {
        Ok(s) => vec![
            row.what.clone(),
            s.n.to_string(),
            s.mean_azimuth_deg.map(|m| format!("{m:.1}°")).unwrap_or_else(|| "none".into()),
            format!("{:.3}", s.mean_resultant_length),
            if s.circular_std_deg.is_finite() {
                format!("{:.1}°", s.circular_std_deg)
            } else {
                "∞".into()
            },
            format!("{:.3}", s.rayleigh_z),
            fmt_p(s.rayleigh_p),
        ],
        Err(e) => vec![row.what.clone(), e.to_string()],
    }
}

const SUMMARY_HEADER: [&str; 7] = ["", "n", "vector mean", "R̄", "circ. s.d.", "Rayleigh z", "p"];

/// Screen point at `radius` from `center` towards azimuth `azimuth_deg` (clockwise from north,
/// north up).
pub fn toward(center: Pos2, azimuth_deg: f64, radius: f32) -> Pos2 {
    let a = azimuth_deg.to_radians() as f32;
    Pos2::new(center.x + radius * a.sin(), center.y - radius * a.cos())
}

/// Petal length on screen: the bin's relative radius (∝ count, or ∝ √count for area) times the
/// longest petal's length.
pub fn petal_length(bin: &RoseBin, longest_pts: f32) -> f32 {
    bin.radius as f32 * longest_pts
}

/// Outline of one petal: the centre, then its arc (at most 5° per step).
pub fn petal_points(center: Pos2, bin: &RoseBin, longest_pts: f32) -> Vec<Pos2> {
    let r = petal_length(bin, longest_pts);
    let span = bin.to_deg - bin.from_deg;
    let steps = ((span / 5.0).ceil() as usize).max(1);
    let mut pts = Vec::with_capacity(steps + 2);
    pts.push(center);
    for k in 0..=steps {
        pts.push(toward(center, bin.from_deg + span * k as f64 / steps as f64, r));
    }
    pts
}

/// Draw a rose diagram in `rect`.
fn draw_rose(ui: &egui::Ui, rect: Rect, rose: &RoseBins, mean: Option<&CircularSummary>) {
    let p = ui.painter_at(rect);
    let center = rect.center();
    let longest = 0.40 * rect.width().min(rect.height());
    let ring = Stroke::new(1.0, theme::RULE_LINE);
    for f in [0.25f32, 0.5, 0.75, 1.0] {
        p.circle_stroke(center, longest * f, ring);
    }
    for (az, name) in [(0.0, "N"), (90.0, "E"), (180.0, "S"), (270.0, "W")] {
        p.line_segment([toward(center, az, longest), toward(center, az, longest * 1.04)], ring);
        p.text(
            toward(center, az, longest * 1.12),
            egui::Align2::CENTER_CENTER,
            name,
            egui::FontId::proportional(12.0),
            theme::TEXT_DIM,
        );
    }
    let fill = Color32::from_rgba_unmultiplied(22, 120, 128, 150);
    for bin in rose.bins.iter().filter(|b| b.count > 0) {
        let pts = petal_points(center, bin, longest);
        p.add(Shape::convex_polygon(pts, fill, Stroke::new(1.0, theme::ACCENT)));
    }
    if let Some(m) = mean.and_then(|m| m.mean_azimuth_deg.map(|a| (a, m))) {
        let (az, s) = m;
        let len = longest * s.mean_resultant_length as f32;
        let st = Stroke::new(2.0, theme::WARN);
        match s.kind {
            DataKind::Directional => p.arrow(center, toward(center, az, len) - center, st),
            DataKind::Axial => {
                p.line_segment([toward(center, az + 180.0, len), toward(center, az, len)], st);
            }
        }
    }
}

/// Where the state boxes of the transition diagram sit: evenly round a circle, the first at the
/// top, clockwise.
pub fn state_positions(n: usize, center: Pos2, radius: f32) -> Vec<Pos2> {
    (0..n).map(|k| toward(center, 360.0 * k as f64 / n.max(1) as f64, radius)).collect()
}

/// The point where the segment from the centre of `r` towards `to` leaves the rectangle.
pub fn exit_point(r: Rect, to: Pos2) -> Pos2 {
    let c = r.center();
    let d = to - c;
    if d.length() < 1e-6 {
        return c;
    }
    let hx = r.width() / 2.0;
    let hy = r.height() / 2.0;
    let tx = if d.x.abs() > 1e-6 { hx / d.x.abs() } else { f32::INFINITY };
    let ty = if d.y.abs() > 1e-6 { hy / d.y.abs() } else { f32::INFINITY };
    c + d * tx.min(ty)
}

/// Draw the boxes of the states and arrows for preferred transitions in `rect`.
fn draw_transitions(ui: &egui::Ui, rect: Rect, t: &TransitionAnalysis) {
    let p = ui.painter_at(rect);
    let font = egui::FontId::proportional(12.0);
    let radius = 0.36 * rect.width().min(rect.height());
    let centres = state_positions(t.states.len(), rect.center(), radius);
    let boxes: Vec<Rect> = t
        .states
        .iter()
        .zip(&centres)
        .map(|(s, c)| {
            let w = p.layout_no_wrap(s.clone(), font.clone(), theme::TEXT).size().x + 12.0;
            Rect::from_center_size(*c, Vec2::new(w, 22.0))
        })
        .collect();
    // Thin grey arrows: more often than expected at all; bold: the preferred transitions.
    let arrow = |a: usize, b: usize, st: Stroke| {
        let dir = (centres[b] - centres[a]).normalized();
        // Offset sideways so that A→B and B→A do not overlap.
        let side = Vec2::new(-dir.y, dir.x) * 4.0;
        let from = exit_point(boxes[a], centres[b]) + side;
        let to = exit_point(boxes[b], centres[a]) + side;
        p.arrow(from, to - from, st);
        (from, to, side)
    };
    let preferred =
        |a: usize, b: usize| t.preferred.iter().any(|pt| pt.from == t.states[a] && pt.to == t.states[b]);
    for (a, row) in t.difference.iter().enumerate() {
        for (b, d) in row.iter().enumerate() {
            if a != b && *d > 0.0 && !preferred(a, b) {
                arrow(a, b, Stroke::new(1.0, theme::RULE_LINE));
            }
        }
    }
    let st = Stroke::new(2.0, theme::ACCENT);
    for pt in &t.preferred {
        let (Some(a), Some(b)) =
            (t.states.iter().position(|s| *s == pt.from), t.states.iter().position(|s| *s == pt.to))
        else {
            continue;
        };
        let (from, to, side) = arrow(a, b, st);
        p.text(
            from + (to - from) * 0.5 + side * 2.5,
            egui::Align2::CENTER_CENTER,
            format!("{} vs {:.1}", pt.observed, pt.expected),
            egui::FontId::proportional(10.0),
            theme::TEXT_DIM,
        );
    }
    for (s, r) in t.states.iter().zip(&boxes) {
        p.rect_filled(*r, 3.0, theme::PANEL_BG);
        p.rect_stroke(*r, 3.0, Stroke::new(1.0, theme::TEXT_DIM), egui::StrokeKind::Inside);
        p.text(r.center(), egui::Align2::CENTER_CENTER, s, font.clone(), theme::TEXT);
    }
}

/// The statistics window.
#[derive(Default)]
pub struct StatsView {
    pub open: bool,
    pub choices: StatsChoices,
    cache: Option<((u64, StatsChoices), StatsResult)>,
    /// How many times the statistics were computed (stays put while nothing changes).
    pub computations: u64,
    /// The box under the interval table lists beds rather than channel bodies.
    pub beds_table: bool,
}

impl StatsView {
    /// The statistics shown (after a frame has been drawn).
    pub fn result(&self) -> Option<&StatsResult> {
        self.cache.as_ref().map(|c| &c.1)
    }

    fn refresh(&mut self, v: &ViewCtx) {
        if v.project.sections.is_empty() {
            self.choices.section = 0;
        } else {
            self.choices.section = self.choices.section.min(v.project.sections.len() - 1);
        }
        let key = (v.generation, self.choices.clone());
        if self.cache.as_ref().is_some_and(|c| c.0 == key) {
            return;
        }
        self.computations += 1;
        self.cache = Some((key, compute(v.project, v.interps, &self.choices)));
    }

    /// Draw the window.
    pub fn window(&mut self, ctx: &egui::Context, v: &ViewCtx) {
        self.refresh(v);
        let mut open = self.open;
        egui::Window::new("Statistics")
            .open(&mut open)
            .default_pos([160.0, 80.0])
            .default_size([980.0, 720.0])
            .resizable(true)
            .show(ctx, |ui| {
                egui::ScrollArea::vertical().id_salt("stats_scroll").show(ui, |ui| self.body(ui, v));
            });
        self.open = open;
    }

    fn body(&mut self, ui: &mut egui::Ui, v: &ViewCtx) {
        let c = &mut self.choices;
        ui.horizontal(|ui| {
            let lab = ui.label("Section").id;
            let name = v.project.sections.get(c.section).map(|s| s.name.clone()).unwrap_or_default();
            egui::ComboBox::from_id_salt("stats_section")
                .selected_text(name)
                .show_ui(ui, |ui| {
                    for (i, s) in v.project.sections.iter().enumerate() {
                        if ui.selectable_value(&mut c.section, i, &s.name).clicked() {
                            c.rose_of = RoseOf::Section;
                        }
                    }
                })
                .response
                .labelled_by(lab);
            ui.separator();
            ui.selectable_value(&mut c.kind, DataKind::Directional, "Directional")
                .on_hover_text("Readings are flow directions (0–360°)");
            ui.selectable_value(&mut c.kind, DataKind::Axial, "Axial")
                .on_hover_text("Readings are undirected axes: 10° and 190° mean the same");
        });
        let Some((_, r)) = self.cache.as_ref() else { return };
        ui.add_space(4.0);
        ui.heading("Paleocurrents");
        ui.label(
            egui::RichText::new(
                "Vector mean, mean resultant length R̄, circular s.d. √(−2 ln R̄) (Mardia & Jupp 2000); \
                 Rayleigh z = nR̄², p by Zar's (1999) approximation. Axial data: angles doubled, \
                 mean and s.d. halved.",
            )
            .small()
            .color(theme::TEXT_DIM),
        );
        ui.label(egui::RichText::new(&r.tilt_note).small());
        ui.label(egui::RichText::new("Per section").strong());
        let rows: Vec<Vec<String>> = r.per_section.iter().map(summary_cells).collect();
        text_table(ui, "stats_per_section", &SUMMARY_HEADER, &rows);
        ui.label(egui::RichText::new(format!("Per interval ({})", cuts_text(r.cuts_are_accepted))).strong());
        if r.interval_bounds_m.len() <= 2 {
            ui.label(if r.cuts_are_accepted {
                "The accepted boundaries lie at the section's base or top: the interval is the whole section."
            } else {
                "No accepted boundary and no strong candidate in this section: the interval is the whole section."
            });
        }
        let rows: Vec<Vec<String>> = r.per_interval.iter().map(summary_cells).collect();
        text_table(ui, "stats_per_interval", &SUMMARY_HEADER, &rows);
        let rows: Vec<Vec<String>> = r.per_bed.iter().map(summary_cells).collect();
        let body_rows: Vec<Vec<String>> = r.per_body.iter().map(summary_cells).collect();
        // Channel bodies and beds take turns in one scrolled box, so the rose below stays in view.
        ui.horizontal(|ui| {
            if !body_rows.is_empty() {
                ui.selectable_value(&mut self.beds_table, false, "Per channel body (bodies from the rules)");
            }
            ui.selectable_value(&mut self.beds_table, true, "Per bed (beds with two or more readings)");
        });
        let beds = self.beds_table || body_rows.is_empty();
        egui::ScrollArea::vertical().id_salt("stats_beds").max_height(180.0).show(ui, |ui| {
            if beds {
                text_table(ui, "stats_per_bed", &SUMMARY_HEADER, &rows);
            } else {
                text_table(ui, "stats_per_body", &SUMMARY_HEADER, &body_rows);
            }
        });

        ui.add_space(6.0);
        ui.label(egui::RichText::new("Rose diagram").strong());
        let c = &mut self.choices;
        ui.horizontal(|ui| {
            let lab = ui.label("Readings").id;
            let label = match c.rose_of {
                RoseOf::Section => "whole section".to_string(),
                RoseOf::Interval(k) => r
                    .interval_bounds_m
                    .get(k..k + 2)
                    .map(|w| span_text(r.unit, w[0], w[1]))
                    .unwrap_or_default(),
            };
            egui::ComboBox::from_id_salt("rose_of")
                .selected_text(label)
                .show_ui(ui, |ui| {
                    ui.selectable_value(&mut c.rose_of, RoseOf::Section, "whole section");
                    for (k, w) in r.interval_bounds_m.windows(2).enumerate() {
                        ui.selectable_value(
                            &mut c.rose_of,
                            RoseOf::Interval(k),
                            span_text(r.unit, w[0], w[1]),
                        );
                    }
                })
                .response
                .labelled_by(lab);
            let lab = ui.label("Bin width").id;
            egui::ComboBox::from_id_salt("rose_bin")
                .selected_text(format!("{}°", c.bin_width_deg))
                .show_ui(ui, |ui| {
                    for w in BIN_WIDTHS_DEG {
                        ui.selectable_value(&mut c.bin_width_deg, w, format!("{w}°"));
                    }
                })
                .response
                .labelled_by(lab);
            ui.selectable_value(&mut c.petal_scale, PetalScale::Area, "Petal area ∝ count")
                .on_hover_text("Petal length ∝ √count, so areas compare honestly");
            ui.selectable_value(&mut c.petal_scale, PetalScale::Count, "Petal length ∝ count")
                .on_hover_text("Petal length ∝ count (exaggerates the largest bins)");
        });
        match &r.rose {
            Ok(rose) => {
                let most = rose.bins.iter().map(|b| b.count).max().unwrap_or(0);
                ui.label(format!(
                    "n = {}, {} of {}°, longest petal {}{}",
                    rose.n,
                    counted(rose.bins.len(), "bin", "bins"),
                    rose.params.bin_width_deg,
                    counted(most, "reading", "readings"),
                    if rose.params.kind == DataKind::Axial {
                        " (axial: each reading drawn both ways)"
                    } else {
                        ""
                    }
                ));
                let (rect, _) = ui.allocate_exact_size(Vec2::new(320.0, 320.0), egui::Sense::hover());
                draw_rose(ui, rect, rose, r.rose_mean.as_ref());
            }
            Err(e) => {
                ui.colored_label(theme::WARN, format!("No rose: {e}"));
            }
        }

        ui.add_space(6.0);
        ui.heading("Facies transitions");
        let c = &mut self.choices;
        ui.horizontal(|ui| {
            ui.label("States");
            ui.selectable_value(&mut c.states, StateKind::Lithology, "Lithology")
                .on_hover_text("Each lithology is a state");
            ui.selectable_value(&mut c.states, StateKind::Family, "Lithology family")
                .on_hover_text("Fines, sand, gravel, non-clastic: helps short sections");
            ui.selectable_value(&mut c.states, StateKind::Facies, "Facies code").on_hover_text(
                "Lithofacies codes: the geologist's, else the suggested one (a candidate to review)",
            );
        });
        ui.label(
            egui::RichText::new(
                "Embedded Markov chain: repeats merged, covered intervals break the chain; expected \
                 counts under quasi-independence by iterative proportional fitting.",
            )
            .small()
            .color(theme::TEXT_DIM),
        );
        match &r.transitions {
            Ok(t) => transitions_ui(ui, t),
            Err(e) => {
                ui.colored_label(theme::WARN, format!("No transition analysis: {e}"));
            }
        }
        ui.add_space(6.0);
        caution(ui);
    }
}

fn matrix_rows<T>(t: &TransitionAnalysis, m: &[Vec<T>], cell: impl Fn(&T) -> String) -> Vec<Vec<String>> {
    t.states
        .iter()
        .zip(m)
        .map(|(s, row)| std::iter::once(s.clone()).chain(row.iter().map(&cell)).collect())
        .collect()
}

fn transitions_ui(ui: &mut egui::Ui, t: &TransitionAnalysis) {
    let mut header: Vec<&str> = vec!["from \\ to"];
    header.extend(t.states.iter().map(String::as_str));
    let tables = [
        ("Observed", "markov_observed", matrix_rows(t, &t.observed, |v| v.to_string())),
        ("Expected", "markov_expected", matrix_rows(t, &t.expected, |v| format!("{v:.2}"))),
        ("Observed − expected", "markov_difference", matrix_rows(t, &t.difference, |v| format!("{v:+.2}"))),
    ];
    // Side by side while three tables fit; one under another for the many states of facies codes.
    if t.states.len() <= 4 {
        ui.columns(3, |cols| {
            for (col, (title, id, rows)) in cols.iter_mut().zip(&tables) {
                col.label(egui::RichText::new(*title).strong());
                text_table(col, id, &header, rows);
            }
        });
    } else {
        for (title, id, rows) in &tables {
            ui.label(egui::RichText::new(*title).strong());
            text_table(ui, id, &header, rows);
        }
    }
    let p = t.p_value.map(fmt_p).unwrap_or_else(|| "n/a (fewer than 3 states)".into());
    ui.label(format!(
        "χ² = {:.2}, G² = {:.2}, dof = {}, p = {p} ({})",
        t.chi_square,
        t.g_square,
        t.dof,
        counted(t.transitions as usize, "transition", "transitions")
    ));
    if t.small_expected_cells * 5 > t.cells {
        ui.colored_label(
            theme::WARN,
            format!(
                "{} of {} expected counts are below 5: the χ² p-value is only a rough guide.",
                t.small_expected_cells, t.cells
            ),
        );
    }
    if t.preferred.is_empty() {
        ui.label("No transition occurs more often than chance.");
    } else {
        ui.label(egui::RichText::new("More often than chance (observed vs expected)").strong());
        let rows: Vec<Vec<String>> = t
            .preferred
            .iter()
            .map(|p| {
                vec![
                    format!("{} → {}", p.from, p.to),
                    p.observed.to_string(),
                    format!("{:.2}", p.expected),
                    format!("{:.2}", p.standardised_residual),
                ]
            })
            .collect();
        text_table(ui, "markov_preferred", &["transition", "observed", "expected", "residual"], &rows);
    }
    ui.label(
        egui::RichText::new(
            "Diagram: bold arrows, transitions more often than chance (observed vs expected); thin grey \
             arrows, observed above expected but not notably.",
        )
        .small()
        .color(theme::TEXT_DIM),
    );
    let (rect, _) =
        ui.allocate_exact_size(Vec2::new(ui.available_width().min(480.0), 280.0), egui::Sense::hover());
    draw_transitions(ui, rect, t);
}

#[cfg(test)]
mod tests {
    use super::*;

    fn bins(readings: &[f64], scale: PetalScale) -> RoseBins {
        rose_bins(readings, &RoseParams { bin_width_deg: 30.0, scale, ..Default::default() })
            .expect("valid readings")
    }

    #[test]
    fn petal_length_follows_count_or_its_square_root() {
        // Four readings in 0–30°, one in 90–120°.
        let readings = [5.0, 10.0, 15.0, 20.0, 100.0];
        let count = bins(&readings, PetalScale::Count);
        let area = bins(&readings, PetalScale::Area);
        let (long, short) = (petal_length(&count.bins[0], 100.0), petal_length(&count.bins[3], 100.0));
        assert_eq!((count.bins[0].count, count.bins[3].count), (4, 1));
        assert!((long - 100.0).abs() < 1e-4 && (short - 25.0).abs() < 1e-4, "∝ count: 4 : 1");
        let (long, short) = (petal_length(&area.bins[0], 100.0), petal_length(&area.bins[3], 100.0));
        assert!((long - 100.0).abs() < 1e-4 && (short - 50.0).abs() < 1e-4, "∝ √count: 2 : 1");
        // Petal area (a sector, ½ r² θ) is then proportional to count: 4 : 1.
        assert!(((long * long) / (short * short) - 4.0).abs() < 1e-3);
    }

    #[test]
    fn petals_point_the_right_way_north_up() {
        let c = Pos2::new(100.0, 100.0);
        let east = RoseBin { from_deg: 80.0, to_deg: 100.0, count: 1, radius: 1.0 };
        let pts = petal_points(c, &east, 50.0);
        assert_eq!(pts[0], c, "a petal starts at the centre");
        let tip = pts[pts.len() / 2 + 1];
        assert!(tip.x > 140.0 && (tip.y - 100.0).abs() < 10.0, "east is to the right: {tip:?}");
        for p in &pts[1..] {
            assert!(((*p - c).length() - 50.0).abs() < 1e-3, "arc points lie at the petal length");
        }
        let north = toward(c, 0.0, 10.0);
        assert!((north - Pos2::new(100.0, 90.0)).length() < 1e-4, "north is up on screen");
        let south_west = toward(c, 225.0, 10.0);
        assert!(south_west.x < 100.0 && south_west.y > 100.0);
    }

    #[test]
    fn arrows_leave_boxes_at_their_edges() {
        let a = Rect::from_center_size(Pos2::new(0.0, 0.0), Vec2::new(40.0, 20.0));
        let e = exit_point(a, Pos2::new(100.0, 0.0));
        assert_eq!(e, Pos2::new(20.0, 0.0), "straight right: the right edge");
        let e = exit_point(a, Pos2::new(0.0, -100.0));
        assert_eq!(e, Pos2::new(0.0, -10.0), "straight up: the top edge");
        let e = exit_point(a, Pos2::new(100.0, 100.0));
        assert!(
            (e.y - 10.0).abs() < 1e-4 && (e.x - 10.0).abs() < 1e-4,
            "diagonal leaves by the bottom: {e:?}"
        );
        let pos = state_positions(4, Pos2::new(0.0, 0.0), 10.0);
        assert!((pos[0] - Pos2::new(0.0, -10.0)).length() < 1e-4, "first state at the top");
        assert!((pos[1] - Pos2::new(10.0, 0.0)).length() < 1e-4, "then clockwise");
    }

    #[test]
    fn intervals_are_cut_where_the_rules_cut_them_and_say_at_what() {
        use aggrade_core::model::{ReviewDecision, ReviewState};
        use aggrade_core::rules::{interpret, RuleParams};
        let mut p = crate::gui::demo::demo_project();
        p.sections.truncate(1);
        p.sections[0].review.clear();
        let interps = |p: &Project| -> Vec<Interpretation> {
            p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect()
        };
        let open = interps(&p);
        assert!(!open[0].cuts_are_accepted);
        assert!(!open[0].cut_heights.is_empty(), "the demo has strong candidates");
        let r = compute(&p, &open, &StatsChoices::default());
        assert!(!r.cuts_are_accepted);
        assert_eq!(r.interval_bounds_m[1..r.interval_bounds_m.len() - 1], open[0].cut_heights[..]);
        assert_eq!(
            cuts_text(r.cuts_are_accepted),
            "between strong candidate sequence boundaries; none accepted yet"
        );
        // Accept one boundary: the intervals are cut there alone.
        let c = &open[0].sequence_boundary_candidates[0];
        p.sections[0].review.push(ReviewDecision::new(c.bed_id, ReviewState::Accepted, ""));
        let r = compute(&p, &interps(&p), &StatsChoices::default());
        assert!(r.cuts_are_accepted);
        assert_eq!(r.interval_bounds_m.len(), 3);
        assert!((r.interval_bounds_m[1] - c.height_m).abs() < 1e-9);
        assert_eq!(cuts_text(true), "between accepted sequence boundaries");
    }

    #[test]
    fn a_project_without_readings_says_so() {
        let p = Project::new(vec![aggrade_core::model::Section::new("Empty")]);
        let r = compute(&p, &[], &StatsChoices::default());
        assert!(r.per_section[0].summary.is_err());
        let rose = r.rose.expect("no readings is a valid, empty rose");
        assert_eq!(rose.n, 0);
        assert!(rose.bins.iter().all(|b| b.count == 0 && b.radius == 0.0));
        assert!(r.transitions.is_err(), "no beds, no transitions");
    }

    #[test]
    fn a_section_logged_in_feet_is_shown_in_feet() {
        use aggrade_core::model::{Bed, BedId, GrainSize, Lithology, Section, WentworthClass};
        use aggrade_core::rules::{interpret, RuleParams};
        let mut s = Section::new("Feet");
        s.display_unit = LengthUnit::Foot;
        let sand = Some(GrainSize::Class(WentworthClass::MediumSand));
        // 3.048 m = 10 ft of mudstone, then 1.524 m = 5 ft of sandstone with three readings.
        s.beds.push(Bed::new(BedId(1), 3.048, Lithology::Mudstone, None));
        let mut b = Bed::new(BedId(2), 1.524, Lithology::Sandstone, sand);
        b.paleocurrents =
            [10.0, 20.0, 30.0].into_iter().map(aggrade_core::model::Paleocurrent::azimuth).collect();
        s.beds.push(b);
        let p = Project::new(vec![s]);
        let interps: Vec<Interpretation> =
            p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect();
        let r = compute(&p, &interps, &StatsChoices::default());
        assert_eq!(r.unit, LengthUnit::Foot);
        assert_eq!(r.per_bed[0].what, "bed 2 (base 10.00 ft)");
        assert!(r.per_interval.iter().all(|row| row.what.ends_with(" ft")), "{:?}", r.per_interval);
        assert_eq!(span_text(LengthUnit::Foot, 0.0, 4.572), "0.00\u{2013}15.00 ft");
    }

    #[test]
    fn channel_bodies_get_rows_and_tilt_correction_is_said() {
        use aggrade_core::model::{
            Bed, BedId, BeddingAttitude, Contact, GrainSize, Indicator, Lithology, Paleocurrent, Section,
            WentworthClass,
        };
        use aggrade_core::rules::{interpret, RuleParams};
        let mut s = Section::new("Tilted");
        s.beds.push(Bed::new(BedId(1), 3.0, Lithology::Mudstone, None));
        let mut b =
            Bed::new(BedId(2), 4.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
        b.base_contact = Contact::Erosional;
        let r = |azimuth_deg, indicator, dip_deg| Paleocurrent { azimuth_deg, indicator, dip_deg };
        b.paleocurrents = vec![
            r(45.0, Indicator::TroughAxis, None),
            r(45.0, Indicator::TroughAxis, None),
            r(300.0, Indicator::AccretionSurface, Some(10.0)),
        ];
        s.beds.push(b);
        s.beds.push(Bed::new(BedId(3), 3.0, Lithology::Mudstone, None));
        let mut p = Project::new(vec![s]);
        let interps: Vec<Interpretation> =
            p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect();
        let res = compute(&p, &interps, &StatsChoices::default());
        assert_eq!(res.per_body.len(), 1);
        assert_eq!(res.per_body[0].what, "body 1 (3.00\u{2013}7.00 m)");
        let flow = res.per_body[0].summary.as_ref().expect("two trough axes");
        assert_eq!(flow.n, 2, "the accretion surface stays out");
        assert!((flow.mean_azimuth_deg.expect("mean") - 45.0).abs() < 1e-9);
        assert!(res.tilt_note.contains("not restored"), "{}", res.tilt_note);
        assert!(res.tilt_note.contains("1 accretion-surface dip kept out"), "{}", res.tilt_note);
        // Beds dipping 30° toward 090: trough axes trending 045 restore to 049.107 (rake
        // relation, see aggrade_core::analysis::attitude).
        p.sections[0].bedding = Some(BeddingAttitude { dip_deg: 30.0, dip_direction_deg: 90.0 });
        let res = compute(&p, &interps, &StatsChoices::default());
        let flow = res.per_body[0].summary.as_ref().expect("two trough axes");
        assert!((flow.mean_azimuth_deg.expect("mean") - 49.1066).abs() < 1e-3, "{flow:?}");
        assert!(
            res.tilt_note.contains("restored to horizontal for bedding dipping 30° toward 090°"),
            "{}",
            res.tilt_note
        );
    }
}
