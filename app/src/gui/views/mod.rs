//! The comparison and statistics windows opened from the View menu (correlation panel,
//! statistics, channel bodies), with one interpretation of every section per document revision.

mod bodies;
mod common;
mod panel;
mod stats;

use super::chooser::Chooser;
use super::document::Document;
use super::engine::{interpret, RuleParams};
use aggrade_core::rules::Interpretation;
use bodies::BodiesView;
use common::{ViewCtx, ViewsOutcome};
use panel::PanelView;
use stats::StatsView;
use std::path::PathBuf;

#[cfg(feature = "test-hooks")]
pub use panel::{datum_choices, PANE_WIDTH as PANEL_PANE_WIDTH};

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

    /// Draw the open view windows. `params` are the project's rule parameters; `stability` the
    /// selected section's interpretation marked by a stability check of the document as it is.
    pub fn ui(
        &mut self,
        ctx: &egui::Context,
        doc: &Document,
        params: &RuleParams,
        stability: Option<&Interpretation>,
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
            stability,
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::demo::demo_project;
    use aggrade_core::model::Project;

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
}
