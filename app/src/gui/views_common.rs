//! What the comparison and statistics views share: the set of view windows opened from the View
//! menu, one interpretation of every section per document revision, and number formatting.

use super::chooser::Chooser;
use super::document::Document;
use super::engine::{interpret, RuleParams};
use super::views_bodies::BodiesView;
use super::views_panel::PanelView;
use super::views_stats::StatsView;
use aggrade_core::model::Project;
use aggrade_core::rules::Interpretation;
use std::path::PathBuf;

/// Enough of a document to tell when it changed: the revision counter, plus the file and the
/// sections' names and sizes (a newly opened document starts again at revision 0).
#[derive(Debug, Clone, PartialEq)]
pub struct DocStamp {
    revision: u64,
    path: Option<PathBuf>,
    sections: Vec<(String, usize, u64)>,
}

impl DocStamp {
    /// The stamp of a document now.
    pub fn of(doc: &Document) -> Self {
        DocStamp {
            revision: doc.revision,
            path: doc.path.clone(),
            sections: doc
                .project
                .sections
                .iter()
                .map(|s| (s.name.clone(), s.beds.len(), s.total_thickness_m().to_bits()))
                .collect(),
        }
    }
}

/// Every section interpreted once for a document revision and rule parameters.
struct ProjectInterps {
    stamp: DocStamp,
    params: RuleParams,
    interps: Vec<Interpretation>,
}

/// What the views need from the window this frame.
pub struct ViewCtx<'a> {
    pub project: &'a Project,
    /// `interps[i]` interprets `project.sections[i]`.
    pub interps: &'a [Interpretation],
    /// Grows whenever `interps` is recomputed: the views key their own caches on it.
    pub generation: u64,
    /// The document's file name, for suggested export names and printed subtitles.
    pub doc_name: String,
    /// Asks for files: the system dialog, or Aggrade's own chooser a frame or more later.
    pub dialogs: &'a mut Chooser,
    /// Seconds since 1970 (the PDF creation date).
    pub now_secs: i64,
}

/// What the views report back to the window.
#[derive(Debug, Default, Clone, PartialEq)]
pub struct ViewsOutcome {
    /// A line for the status bar.
    pub status: Option<String>,
    /// A message for a dialog (title, text).
    pub error: Option<(String, String)>,
}

/// The comparison and statistics windows.
#[derive(Default)]
pub struct Views {
    pub panel: PanelView,
    pub stats: StatsView,
    pub bodies: BodiesView,
    shared: Option<ProjectInterps>,
    generation: u64,
    /// How many times every section was interpreted for the views (tests check it stays put
    /// while nothing changes).
    pub recomputations: u64,
}

impl Views {
    /// Is any view window open?
    pub fn any_open(&self) -> bool {
        self.panel.open || self.stats.open || self.bodies.open
    }

    /// Interpret every section again only when the document or the rule parameters changed.
    fn refresh(&mut self, doc: &Document, params: &RuleParams) {
        let stamp = DocStamp::of(doc);
        if self.shared.as_ref().is_some_and(|s| s.stamp == stamp && s.params == *params) {
            return;
        }
        let interps = doc.project.sections.iter().map(|s| interpret(s, params)).collect();
        self.shared = Some(ProjectInterps { stamp, params: params.clone(), interps });
        self.generation += 1;
        self.recomputations += 1;
    }

    /// Draw the open view windows.
    pub fn ui(
        &mut self,
        ctx: &egui::Context,
        doc: &Document,
        params: &RuleParams,
        dialogs: &mut Chooser,
        now_secs: i64,
    ) -> ViewsOutcome {
        let mut out = ViewsOutcome::default();
        if !self.any_open() {
            return out;
        }
        self.refresh(doc, params);
        let Some(shared) = self.shared.as_ref() else { return out };
        let mut vctx = ViewCtx {
            project: &doc.project,
            interps: &shared.interps,
            generation: self.generation,
            doc_name: doc.display_name(),
            dialogs,
            now_secs,
        };
        if self.panel.open {
            self.panel.window(ctx, &mut vctx, &mut out);
        }
        if self.stats.open {
            self.stats.window(ctx, &vctx);
        }
        if self.bodies.open {
            self.bodies.window(ctx, &mut vctx, &mut out);
        }
        out
    }
}

/// A p-value as shown: "< 0.0001" when tiny, else four decimals.
pub fn fmt_p(p: f64) -> String {
    if p < 1e-4 {
        "< 0.0001".into()
    } else {
        format!("{p:.4}")
    }
}

/// An optional proportion with three decimals, or "n/a".
pub fn fmt_proportion(p: Option<f64>) -> String {
    p.map(|p| format!("{p:.3}")).unwrap_or_else(|| "n/a".into())
}

/// Draw a table of text cells with a bold header row, in a horizontal scroll area when wide.
pub fn text_table(ui: &mut egui::Ui, id: &str, header: &[&str], rows: &[Vec<String>]) {
    egui::ScrollArea::horizontal().id_salt(id).show(ui, |ui| {
        egui::Grid::new(id).striped(true).spacing([12.0, 3.0]).show(ui, |ui| {
            for h in header {
                ui.label(egui::RichText::new(*h).strong());
            }
            ui.end_row();
            for row in rows {
                for cell in row {
                    ui.label(cell);
                }
                ui.end_row();
            }
        });
    });
}

/// The review caution every view of interpreted numbers carries.
pub fn caution(ui: &mut egui::Ui) {
    ui.label(egui::RichText::new(aggrade_core::REVIEW_CAUTION).small().color(super::theme::WARN));
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::demo::demo_project;

    #[test]
    fn stamp_changes_with_revision_and_with_another_document() {
        let a = Document::new(demo_project(), None);
        let mut b = a.clone();
        assert_eq!(DocStamp::of(&a), DocStamp::of(&b));
        b.revision += 1;
        assert_ne!(DocStamp::of(&a), DocStamp::of(&b));
        // Another project opened fresh (revision 0 again) is still told apart.
        let c = Document::new(Project::new(vec![aggrade_core::model::Section::new("Other")]), None);
        assert_eq!(c.revision, a.revision);
        assert_ne!(DocStamp::of(&a), DocStamp::of(&c));
    }

    #[test]
    fn p_values_small_and_ordinary() {
        assert_eq!(fmt_p(0.00002), "< 0.0001");
        assert_eq!(fmt_p(0.01234), "0.0123");
        assert_eq!(fmt_proportion(None), "n/a");
        assert_eq!(fmt_proportion(Some(0.4567)), "0.457");
    }
}
