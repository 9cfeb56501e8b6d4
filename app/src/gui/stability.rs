//! The review list's stability check: the rules re-run with one key threshold moved at a time
//! (`aggrade_core::rules::sensitivity`), the result kept for one state of the document only.

use super::document::Document;
use super::engine::{interpret_with, RuleParams};
use aggrade_core::model::Project;
use aggrade_core::rules::{sensitivity, Interpretation};
use std::sync::Arc;

/// Sections with more beds than this get a word that the check may take a few seconds (it runs
/// the rules some forty times on the window's thread: 4 ms for 500 beds in the release benchmark).
pub const SLOW_CHECK_MIN_BEDS: usize = 5_000;

/// The selected section's interpretation marked with the stability of each candidate boundary
/// and channel body, for the document state it was computed from.
pub struct Stability {
    /// The project checked (shared, not copied): any edit, undo or another file puts another
    /// project in the document's place.
    project: Arc<Project>,
    revision: u64,
    all_candidates: bool,
    /// How many runs with moved parameters there were.
    pub runs: usize,
    pub interp: Interpretation,
}

impl Stability {
    /// Check the selected section of `doc` with `params` (the project's), listing every candidate
    /// when `all_candidates` is set, as the review list does.
    pub fn check(doc: &Document, params: &RuleParams, all_candidates: bool) -> Stability {
        let section = doc.section();
        let mut interp = interpret_with(section, params, all_candidates);
        let runs = sensitivity::annotate(section, params, &mut interp);
        Stability { project: Arc::clone(&doc.project), revision: doc.revision, all_candidates, runs, interp }
    }

    /// Is this the check of the document as it is now (same project, revision and list)?
    pub fn is_for(&self, doc: &Document, all_candidates: bool) -> bool {
        Arc::ptr_eq(&self.project, &doc.project)
            && self.revision == doc.revision
            && self.all_candidates == all_candidates
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::demo::demo_project;
    use crate::gui::document::Edit;

    #[test]
    fn a_check_marks_every_candidate_and_lapses_when_the_document_changes() {
        let mut doc = Document::new(demo_project(), None);
        let params = RuleParams::default();
        let s = Stability::check(&doc, &params, false);
        assert!(s.runs > 0);
        assert!(!s.interp.sequence_boundary_candidates.is_empty(), "the demo has candidates");
        assert!(s.interp.sequence_boundary_candidates.iter().all(|c| c.stability.is_some()));
        assert!(s.interp.channel_bodies.iter().all(|b| b.stability.is_some()));
        assert!(s.is_for(&doc, false));
        assert!(!s.is_for(&doc, true), "another list is another check");
        let bed = doc.section().beds[0].id;
        let thickness_m = doc.section().beds[0].thickness_m + 1.0;
        doc.apply(Edit::SetThickness { bed, thickness_m }).expect("edit");
        assert!(!s.is_for(&doc, false), "an edit");
        doc.undo();
        assert!(!s.is_for(&doc, false), "undo is a change too");
        // Another document at the same revision number is another document.
        let other = Document::new(demo_project(), None);
        assert!(!Stability::check(&other, &params, false).is_for(&Document::new(demo_project(), None), false));
    }
}
