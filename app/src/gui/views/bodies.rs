//! Channel-body statistics view: every body of every section with its width (typed here, an
//! undoable edit), width/thickness and geometry class, the thickness summary with P10/P50/P90,
//! proportions, decompacted thicknesses for a burial depth, and CSV export.

use super::common::{caution, fmt_proportion, text_table, ViewCtx, ViewsOutcome};
use crate::gui::chooser::{PickFor, SaveKind};
use crate::gui::document::Edit;
use crate::gui::error::{WriteError, Written};
use crate::gui::field::{mark_invalid, INVALID};
use crate::gui::theme;
use aggrade_core::analysis::bodies::{
    body_table_with_lateral, thickness_summary, unmatched_lateral, write_bodies_csv,
    write_interval_proportions_csv, write_proportion_curve_csv, BodyRow, ThicknessSummary,
};
use aggrade_core::analysis::decompaction::{decompact_section, DecompactionParams, SectionDecompaction};
use aggrade_core::analysis::AnalysisError;
use aggrade_core::model::{BedId, GrainSize, Project};
use aggrade_core::rules::sensitivity::stability_text;
use aggrade_core::rules::{ChannelBody, Element, Interpretation, ProportionBounds};

/// Default burial depth offered, m (a round figure to start from; the user types the real one).
pub const DEFAULT_BURIAL_DEPTH_M: f64 = 1000.0;

/// Decompacted thickness (m) of a body: the restored thicknesses of the beds of its storeys.
pub fn body_decompacted_thickness_m(
    interp: &Interpretation,
    body: &ChannelBody,
    d: &SectionDecompaction,
) -> f64 {
    let mut beds: Vec<usize> = body
        .storey_indices
        .iter()
        .filter_map(|&k| interp.storeys.get(k))
        .flat_map(|s| s.first_bed..=s.last_bed)
        .collect();
    beds.sort_unstable();
    beds.dedup();
    beds.iter().filter_map(|&i| d.beds.get(i)).map(|b| b.decompacted_thickness_m).sum()
}

/// Decompaction of one section, for the view.
#[derive(Debug, Clone, PartialEq)]
pub struct SectionLine {
    pub name: String,
    pub channel_proportion: Option<f64>,
    /// The proportion with covered intervals counted as fines and as channel, when some of the
    /// section is covered.
    pub bounds: Option<ProportionBounds>,
    /// (base m, top m, proportion) of each interval.
    pub intervals: Vec<(f64, f64, Option<f64>)>,
    /// `None` when decompaction is off; `Err` with the reason when it failed.
    pub decompaction: Option<Result<SectionDecompaction, AnalysisError>>,
}

/// Everything the view shows.
#[derive(Debug, Clone, PartialEq)]
pub struct BodiesResult {
    pub rows: Vec<BodyRow>,
    /// Index in the project of each row's section (same order as `rows`).
    pub row_section: Vec<usize>,
    /// Widths recorded for a bed at which no body starts now, as sentences (kept in the file).
    pub unmatched: Vec<String>,
    pub summary: Option<ThicknessSummary>,
    /// Decompacted thickness of each row (same order), when decompaction is on and worked.
    pub decompacted_m: Vec<Option<f64>>,
    pub decompacted_summary: Option<ThicknessSummary>,
    pub sections: Vec<SectionLine>,
}

/// Compute the table, the summaries and (with a burial depth) the decompacted thicknesses.
pub fn compute(project: &Project, interps: &[Interpretation], burial_depth_m: Option<f64>) -> BodiesResult {
    let rows = body_table_with_lateral(project.sections.iter().zip(interps));
    let mut decompacted_m = Vec::with_capacity(rows.len());
    let mut sections = Vec::new();
    let mut row_section = Vec::with_capacity(rows.len());
    let mut unmatched = Vec::new();
    for (k, (s, it)) in project.sections.iter().zip(interps).enumerate() {
        row_section.extend(std::iter::repeat_n(k, it.channel_bodies.len()));
        for l in unmatched_lateral(s, it) {
            let at = match s.bed_index(l.base_bed) {
                Some(i) => format!("bed {}", i + 1),
                None => "a deleted bed".to_string(),
            };
            let width = l.width_m.map_or_else(|| "no width".to_string(), |w| format!("{w} m wide"));
            unmatched.push(format!(
                "{}: a body recorded at {at} ({width}) — no body starts there now; the record stays in the file",
                s.name
            ));
        }
        let decompaction = burial_depth_m.map(|depth| {
            let flags: Vec<bool> = it.elements.iter().map(|e| *e == Element::ChannelDeposit).collect();
            decompact_section(s, depth, Some(&flags), &DecompactionParams::default())
        });
        // The body table lists a section's bodies by base height (a stable sort): follow it.
        let mut bodies: Vec<&ChannelBody> = it.channel_bodies.iter().collect();
        bodies.sort_by(|a, b| a.base_m.total_cmp(&b.base_m));
        for b in bodies {
            decompacted_m.push(match &decompaction {
                Some(Ok(d)) => Some(body_decompacted_thickness_m(it, b, d)),
                _ => None,
            });
        }
        sections.push(SectionLine {
            name: s.name.clone(),
            channel_proportion: it.channel_proportion,
            bounds: it.channel_proportion_bounds.filter(|_| it.has_cover()),
            intervals: it.interval_proportions.iter().map(|p| (p.base_m, p.top_m, p.proportion)).collect(),
            decompaction,
        });
    }
    let decompacted_summary = if decompacted_m.iter().all(Option::is_some) && !rows.is_empty() {
        let restored: Vec<BodyRow> = rows
            .iter()
            .zip(&decompacted_m)
            .map(|(r, d)| BodyRow { thickness_m: d.unwrap_or(r.thickness_m), ..r.clone() })
            .collect();
        thickness_summary(&restored)
    } else {
        None
    };
    let summary = thickness_summary(&rows);
    BodiesResult { rows, row_section, unmatched, summary, decompacted_m, decompacted_summary, sections }
}

/// The width as typed back into its cell: "120", "85.5", empty when none.
pub fn width_text(w: Option<f64>) -> String {
    w.map(|w| format!("{w}")).unwrap_or_default()
}

/// Read a typed width (metres): empty for none, else a number above 0 ("120", "120 m", "85,5").
pub fn parse_width(text: &str) -> Result<Option<f64>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    let number = t.strip_suffix('m').map_or(t, str::trim_end).replace(',', ".");
    match number.parse::<f64>() {
        Ok(w) if w.is_finite() && w > 0.0 => Ok(Some(w)),
        _ => {
            Err(format!("{t:?} is not a width: type the body's width in metres, e.g. 120, or leave it empty"))
        }
    }
}

/// The width/thickness and class cells of a row: "≥ 40.0" and "at least narrow sheet", or "–"
/// where no width is recorded.
pub fn geometry_cells(r: &BodyRow) -> [String; 2] {
    match r.geometry {
        Some(g) => [g.ratio_text(), g.class.name().to_string()],
        None => ["–".to_string(), "–".to_string()],
    }
}

fn grain(g: Option<GrainSize>) -> String {
    g.map(|g| g.to_string()).unwrap_or_else(|| "–".into())
}

/// The cells of one table row as shown.
pub fn row_cells(r: &BodyRow, decompacted_m: Option<f64>) -> Vec<String> {
    let mut cells = vec![
        r.section.clone(),
        format!("{:.2}", r.base_m),
        format!("{:.2}", r.top_m),
        r.thickness_text(),
        r.storeys.to_string(),
        r.stacking.name().to_string(),
        format!("{} – {}", grain(r.grain_finest), grain(r.grain_coarsest)),
        if r.censored.is_empty() { "–".to_string() } else { r.censored_text() },
    ];
    if let Some(d) = decompacted_m {
        cells.push(format!("{d:.2}"));
    }
    cells
}

/// The stability of each table row's body, in the rows' order, from a stability check of one
/// section: its words for that section's bodies ("stable in 96 % of runs"), "not checked" for
/// the other sections' (a body is matched by section, base and top, as the table lists it).
pub fn stability_cells(rows: &[BodyRow], checked: &Interpretation) -> Vec<String> {
    let of_body: std::collections::HashMap<(u64, u64), &ChannelBody> =
        checked.channel_bodies.iter().map(|b| ((b.base_m.to_bits(), b.top_m.to_bits()), b)).collect();
    rows.iter()
        .map(|r| {
            let body = (r.section == checked.section)
                .then(|| of_body.get(&(r.base_m.to_bits(), r.top_m.to_bits())))
                .flatten();
            body.and_then(|b| stability_text(b.stability, b.flipped_by.as_ref()))
                .unwrap_or_else(|| "not checked".to_string())
        })
        .collect()
}

/// Which CSV to write.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BodiesCsv {
    Bodies,
    ProportionCurve,
    IntervalProportions,
}

/// Write one of the view's CSV files to `path`.
pub fn export_csv(
    path: &std::path::Path,
    which: BodiesCsv,
    rows: &[BodyRow],
    interps: &[Interpretation],
) -> Result<Written, WriteError> {
    let mut bytes = Vec::new();
    let what = match which {
        BodiesCsv::Bodies => {
            write_bodies_csv(rows, &mut bytes)?;
            format!("{} channel bodies", rows.len())
        }
        BodiesCsv::ProportionCurve => {
            write_proportion_curve_csv(
                interps.iter().map(|i| (i.section.as_str(), i.proportion_curve.as_slice())),
                &mut bytes,
            )?;
            "the proportion curve".to_string()
        }
        BodiesCsv::IntervalProportions => {
            write_interval_proportions_csv(
                interps.iter().map(|i| (i.section.as_str(), i.interval_proportions.as_slice())),
                &mut bytes,
            )?;
            "proportions by interval".to_string()
        }
    };
    aggrade_core::io::write_bytes_atomic(path, &bytes)
        .map_err(|error| WriteError::At { path: path.to_path_buf(), error })?;
    Ok(Written::Table { what, path: path.to_path_buf() })
}

/// The channel-body window.
pub struct BodiesView {
    pub open: bool,
    /// Decompact to the time the top of each section was at the surface.
    pub decompact: bool,
    /// Present depth of each section's top, m.
    pub burial_depth_m: f64,
    cache: Option<((u64, Option<u64>), BodiesResult)>,
    /// How many times the table was computed (stays put while nothing changes).
    pub computations: u64,
    /// The width cells being typed in or holding a text that did not read, by (section index,
    /// base bed): what was typed is kept there until it reads or is cleared.
    typed: std::collections::BTreeMap<(usize, BedId), String>,
}

impl Default for BodiesView {
    fn default() -> Self {
        BodiesView {
            open: false,
            decompact: false,
            burial_depth_m: DEFAULT_BURIAL_DEPTH_M,
            cache: None,
            computations: 0,
            typed: Default::default(),
        }
    }
}

impl BodiesView {
    /// The numbers shown (after a frame has been drawn).
    pub fn result(&self) -> Option<&BodiesResult> {
        self.cache.as_ref().map(|c| &c.1)
    }

    fn depth(&self) -> Option<f64> {
        self.decompact.then_some(self.burial_depth_m)
    }

    fn refresh(&mut self, v: &ViewCtx) {
        let key = (v.generation, self.depth().map(f64::to_bits));
        if self.cache.as_ref().is_some_and(|c| c.0 == key) {
            return;
        }
        self.computations += 1;
        self.cache = Some((key, compute(v.project, v.interps, self.depth())));
    }

    /// Draw the window.
    pub fn window(&mut self, ctx: &egui::Context, v: &mut ViewCtx, out: &mut ViewsOutcome) {
        self.refresh(v);
        let mut open = self.open;
        egui::Window::new("Channel bodies")
            .open(&mut open)
            .default_pos([200.0, 100.0])
            .default_size([900.0, 680.0])
            .resizable(true)
            .show(ctx, |ui| {
                egui::ScrollArea::vertical().id_salt("bodies_scroll").show(ui, |ui| self.body(ui, v, out));
            });
        self.open = open;
    }

    fn body(&mut self, ui: &mut egui::Ui, v: &mut ViewCtx, out: &mut ViewsOutcome) {
        ui.horizontal(|ui| {
            ui.checkbox(&mut self.decompact, "Decompact")
                .on_hover_text("Restore thicknesses to when each section's top was at the surface");
            let lab = ui.label("burial depth of the section top").id;
            ui.add_enabled(
                self.decompact,
                egui::DragValue::new(&mut self.burial_depth_m).range(0.0..=50_000.0).speed(10.0).suffix(" m"),
            )
            .labelled_by(lab)
            .on_hover_text("Present depth of the section top, m (Sclater & Christie 1980 porosity laws)");
        });
        let Some((_, r)) = self.cache.as_ref() else { return };
        ui.horizontal(|ui| {
            for (label, which, tip) in [
                ("Export bodies CSV…", BodiesCsv::Bodies, "Every body of every section, one row each"),
                (
                    "Export proportion curve CSV…",
                    BodiesCsv::ProportionCurve,
                    "The moving-window channel-body proportion of every section",
                ),
                (
                    "Export interval proportions CSV…",
                    BodiesCsv::IntervalProportions,
                    "Channel-body proportion of each interval of every section",
                ),
            ] {
                let clicked = ui.button(label).on_hover_text(tip).clicked();
                let name = match which {
                    BodiesCsv::Bodies => "channel-bodies",
                    BodiesCsv::ProportionCurve => "proportion-curve",
                    BodiesCsv::IntervalProportions => "interval-proportions",
                };
                {
                    if let Some(path) = v.dialogs.save_path(clicked, PickFor::View(name), SaveKind::Csv, name)
                    {
                        match export_csv(&path, which, &r.rows, v.interps) {
                            Ok(written) => out.status = Some(written.to_string()),
                            Err(e) => out.error = Some(("Could not write the CSV".into(), e.to_string())),
                        }
                    }
                }
            }
        });
        ui.add_space(4.0);
        ui.heading("Summary");
        let summary_rows: Vec<Vec<String>> =
            [("present", &r.summary), ("decompacted", &r.decompacted_summary)]
                .into_iter()
                .filter_map(|(what, s)| s.as_ref().map(|s| (what, s)))
                .map(|(what, s)| {
                    vec![
                        what.to_string(),
                        s.count.to_string(),
                        format!("{} / {} / {}", s.multi_story, s.single_story, s.undetermined),
                        format!("{:.2}", s.mean_m),
                        format!("{:.2}", s.median_m),
                        format!("{:.2}", s.p10_m),
                        format!("{:.2}", s.p50_m),
                        format!("{:.2}", s.p90_m),
                        format!("{:.2}–{:.2}", s.min_m, s.max_m),
                    ]
                })
                .collect();
        if summary_rows.is_empty() {
            ui.label("No channel bodies found.");
        } else {
            text_table(
                ui,
                "bodies_summary",
                &[
                    "thickness (m)",
                    "count",
                    "multi-storey / single-storey / undetermined",
                    "mean",
                    "median",
                    "P10",
                    "P50",
                    "P90",
                    "range",
                ],
                &summary_rows,
            );
            ui.label(
                egui::RichText::new(
                    "Percentiles by linear interpolation between order statistics (numpy's default).",
                )
                .small()
                .color(theme::TEXT_DIM),
            );
        }
        ui.add_space(4.0);
        ui.heading("Proportions");
        let mut rows = Vec::new();
        for s in &r.sections {
            let whole = match s.bounds {
                Some(b) => format!(
                    "{} ({:.2} covered as fines, {:.2} as channel)",
                    fmt_proportion(s.channel_proportion),
                    b.covered_as_fines,
                    b.covered_as_channel
                ),
                None => fmt_proportion(s.channel_proportion),
            };
            let mut row = vec![s.name.clone(), "whole section (exposed)".into(), whole];
            match &s.decompaction {
                Some(Ok(d)) => row.push(format!(
                    "{} ({:.2} → {:.2} m)",
                    fmt_proportion(d.decompacted_channel_proportion),
                    d.present_thickness_m,
                    d.decompacted_thickness_m
                )),
                Some(Err(e)) => row.push(e.to_string()),
                None => {}
            }
            rows.push(row);
            for (base, top, p) in &s.intervals {
                rows.push(vec![String::new(), format!("{base:.2}–{top:.2} m"), fmt_proportion(*p)]);
            }
        }
        let mut header = vec!["section", "interval", "channel proportion"];
        if self.decompact {
            header.push("decompacted");
        }
        text_table(ui, "bodies_proportions", &header, &rows);
        for s in &r.sections {
            if let Some(Ok(d)) = &s.decompaction {
                if let Some(a) = &d.covered_assumption {
                    ui.label(
                        egui::RichText::new(format!("{}: {:.2} m covered: {a}", s.name, d.covered_m))
                            .small()
                            .color(theme::TEXT_DIM),
                    );
                }
                if !d.not_decompacted.is_empty() {
                    let names: Vec<&str> = d.not_decompacted.iter().map(|l| l.name()).collect();
                    ui.label(
                        egui::RichText::new(format!(
                            "{}: kept at present thickness (no porosity law): {}",
                            s.name,
                            names.join(", ")
                        ))
                        .small()
                        .color(theme::WARN),
                    );
                }
            }
        }
        ui.add_space(4.0);
        ui.heading(format!("Channel bodies ({})", r.rows.len()));
        let mut header = vec![
            "section",
            "base (m)",
            "top (m)",
            "thickness (m)",
            "width (m)",
            "beyond outcrop",
            "w/t",
            "class",
            "storeys",
            "stacking",
            "grain (finest – coarsest)",
            "end not seen",
        ];
        if r.decompacted_m.iter().any(Option::is_some) {
            header.push("decompacted (m)");
        }
        let mut rows: Vec<Vec<String>> =
            r.rows.iter().zip(&r.decompacted_m).map(|(b, d)| row_cells(b, *d)).collect();
        if let Some(checked) = v.stability {
            header.push("stability");
            for (row, cell) in rows.iter_mut().zip(stability_cells(&r.rows, checked)) {
                row.push(cell);
            }
        }
        // The table's cells edit through `self`: hold the computed table aside while drawing it.
        let cache = self.cache.take();
        if let Some((_, r)) = &cache {
            self.body_table(ui, &header, r, &rows, out);
            for line in &r.unmatched {
                ui.label(egui::RichText::new(line).small().color(theme::WARN));
            }
        }
        self.cache = cache;
        ui.label(
            egui::RichText::new(
                "Width: across the outcrop, m; tick \"beyond outcrop\" when the body runs on, so the width is a \
                 minimum. Class by w/t (Gibling 2006, after Friend et al. 1979): ribbon < 15, narrow sheet 15–100, \
                 broad sheet > 100; ≥ / ≤ mark a ratio that is only a bound (a width or thickness that is a minimum).",
            )
            .small()
            .color(theme::TEXT_DIM),
        );
        if let Some(checked) = v.stability {
            ui.label(
                egui::RichText::new(format!(
                    "Stability: share of the runs of the rules, each with one threshold moved, in which the \
                     body came out the same (same beds, same stacking); {} only, from \"Check stability\" in \
                     the review list.",
                    checked.section
                ))
                .small()
                .color(theme::TEXT_DIM),
            );
        }
        let Some((_, r)) = self.cache.as_ref() else { return };
        if r.summary.as_ref().is_some_and(|s| s.censored > 0) {
            ui.label(
                egui::RichText::new(
                    "≥: the body is cut by the section's base or top or by a covered interval; its thickness is a minimum.",
                )
                .small()
                .color(theme::TEXT_DIM),
            );
        }
        ui.add_space(6.0);
        caution(ui);
    }
}

impl BodiesView {
    /// The body table: text cells, with each body's width and "beyond outcrop" editable (each
    /// change one undoable edit of the document) and its w/t and class shown.
    fn body_table(
        &mut self,
        ui: &mut egui::Ui,
        header: &[&str],
        r: &BodiesResult,
        rows: &[Vec<String>],
        out: &mut ViewsOutcome,
    ) {
        egui::ScrollArea::horizontal().id_salt("bodies_table").show(ui, |ui| {
            egui::Grid::new("bodies_table").striped(true).spacing([12.0, 3.0]).show(ui, |ui| {
                for h in header {
                    ui.label(egui::RichText::new(*h).strong());
                }
                ui.end_row();
                for ((row, cells), &sec) in r.rows.iter().zip(rows).zip(&r.row_section) {
                    for cell in &cells[..4] {
                        ui.label(cell);
                    }
                    match row.base_bed {
                        Some(bed) => self.lateral_cells(ui, sec, bed, row, out),
                        None => {
                            ui.label("–");
                            ui.label("–");
                        }
                    }
                    for cell in geometry_cells(row) {
                        ui.label(cell);
                    }
                    for cell in &cells[4..] {
                        ui.label(cell);
                    }
                    ui.end_row();
                }
            });
        });
    }

    /// The width cell and the "beyond outcrop" box of one body.
    fn lateral_cells(
        &mut self,
        ui: &mut egui::Ui,
        sec: usize,
        bed: BedId,
        row: &BodyRow,
        out: &mut ViewsOutcome,
    ) {
        let key = (sec, bed);
        let mut text = self.typed.get(&key).cloned().unwrap_or_else(|| width_text(row.width_m));
        ui.horizontal(|ui| {
            let bad = parse_width(&text).is_err();
            let mut edit = egui::TextEdit::singleline(&mut text)
                .id_salt(("body_width", sec, bed.0))
                .desired_width(64.0)
                .hint_text("width (m)");
            if bad {
                edit = edit.text_color(INVALID);
            }
            let resp = ui.add(edit).on_hover_text(
                "Width of the body across the outcrop, metres (Enter or leaving the cell stores it; empty for none)",
            );
            let read = parse_width(&text);
            if resp.lost_focus() {
                if let Ok(w) = read {
                    self.typed.remove(&key);
                    if w != row.width_m {
                        out.edit = Some(Edit::SetBodyLateral {
                            section: sec,
                            base_bed: bed,
                            width_m: w,
                            beyond_outcrop: row.beyond_outcrop,
                        });
                    }
                }
            }
            // Typed text stays in its cell while it is being typed or does not read: nothing
            // typed is lost, and nothing that does not read is stored.
            if resp.has_focus() || read.is_err() {
                self.typed.insert(key, text.clone());
            } else if !resp.lost_focus() {
                self.typed.remove(&key);
            }
            if let (Err(why), false) = (&read, resp.has_focus()) {
                mark_invalid(ui, resp.rect);
                ui.scope(|ui| {
                    ui.set_max_width(260.0);
                    ui.add(egui::Label::new(egui::RichText::new(format!("not stored: {why}")).small().color(INVALID)).wrap());
                });
            }
        });
        let mut beyond = row.beyond_outcrop;
        let resp = ui.checkbox(&mut beyond, "");
        // The box shows no text of its own (the column header says it): name it for screen readers.
        resp.widget_info(|| egui::WidgetInfo::selected(egui::Role::CheckBox, true, beyond, "beyond outcrop"));
        if resp.on_hover_text("The body runs on beyond the outcrop: its width is a minimum").changed() {
            out.edit = Some(Edit::SetBodyLateral {
                section: sec,
                base_bed: bed,
                width_m: row.width_m,
                beyond_outcrop: beyond,
            });
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::demo::demo_project;
    use aggrade_core::rules::{interpret, RuleParams};

    fn demo() -> (Project, Vec<Interpretation>) {
        let p = demo_project();
        let i = p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect();
        (p, i)
    }

    #[test]
    fn at_no_burial_decompacted_bodies_keep_their_thickness() {
        // Decompacting from 0 m to 0 m changes nothing (identity of the method), so each body's
        // restored thickness is the sum of its beds: its own thickness.
        let (p, i) = demo();
        let r = compute(&p, &i, Some(0.0));
        assert!(!r.rows.is_empty(), "the demo holds channel bodies");
        for (row, d) in r.rows.iter().zip(&r.decompacted_m) {
            let d = d.expect("decompacted");
            assert!(
                (d - row.thickness_m).abs() < 1e-9,
                "{} at {}: {d} vs {}",
                row.section,
                row.base_m,
                row.thickness_m
            );
        }
        assert_eq!(r.decompacted_summary.as_ref().map(|s| s.count), r.summary.as_ref().map(|s| s.count));
    }

    #[test]
    fn buried_bodies_were_thicker_when_deposited() {
        let (p, i) = demo();
        let r = compute(&p, &i, Some(2000.0));
        for (row, d) in r.rows.iter().zip(&r.decompacted_m) {
            assert!(d.expect("decompacted") > row.thickness_m, "porosity lost with burial is given back");
        }
        let off = compute(&p, &i, None);
        assert!(off.decompacted_m.iter().all(Option::is_none) && off.decompacted_summary.is_none());
        assert_eq!(off.rows, r.rows, "the table itself does not depend on decompaction");
    }

    #[test]
    fn stability_is_shown_for_the_checked_sections_bodies_only() {
        let (p, mut i) = demo();
        let runs =
            aggrade_core::rules::sensitivity::annotate(&p.sections[0], &RuleParams::default(), &mut i[0]);
        assert!(runs > 0);
        let r = compute(&p, &i, None);
        let cells = stability_cells(&r.rows, &i[0]);
        assert_eq!(cells.len(), r.rows.len());
        for (row, cell) in r.rows.iter().zip(&cells) {
            if row.section == i[0].section {
                assert!(cell.starts_with("stable in "), "{cell}");
            } else {
                assert_eq!(cell, "not checked");
            }
        }
        assert!(cells.iter().any(|c| c.starts_with("stable in ")), "the checked section has bodies");
    }

    #[test]
    fn row_cells_show_stacking_and_grain_range() {
        let (p, i) = demo();
        let r = compute(&p, &i, None);
        let cells = row_cells(&r.rows[0], None);
        assert_eq!(cells.len(), 8);
        assert_eq!(cells[0], r.rows[0].section);
        assert!(["multi-storey", "single-storey", "undetermined"].contains(&cells[5].as_str()));
        assert_eq!(row_cells(&r.rows[0], Some(1.234))[8], "1.23");
    }
}
