//! The column the window draws: the interpretation of the selected section and its laid-out
//! strip, kept up to date after edits, on a worker thread for long sections. Knows nothing of
//! egui: the window hands it a waker to call when a worker's result is ready.

use super::document::{drop_elsewhere, Document};
use super::engine::{self, LayoutOptions, RuleParams, Strip};
use super::painter::ItemIndex;
use aggrade_core::model::Section;
use aggrade_core::rules::Interpretation;
use std::sync::Arc;

/// Sections with at least this many beds have their rules and layout re-run on a worker thread
/// after an edit, so that the frame never waits for them (about 3 ms at 5,000 beds); the column
/// drawn meanwhile is the one from before the edit, for a frame or two. Shorter sections, whose
/// rules take well under a millisecond, are brought up to date within the frame.
pub const BACKGROUND_RULES_MIN_BEDS: usize = 2_000;

/// What an interpretation was computed from: document revision, section, rule parameters, and
/// whether every candidate boundary was listed.
type RulesKey = (u64, usize, RuleParams, bool);

/// Rules and layout running on a worker thread for one state of the document.
struct Refreshing {
    rules_key: RulesKey,
    result: std::sync::mpsc::Receiver<Cache>,
}

/// The interpretation of the selected section and its laid-out column, with what they were
/// computed from.
pub struct Cache {
    /// What the interpretation was computed from (see [`RulesKey`]).
    rules_key: RulesKey,
    pub interp: Interpretation,
    /// What the strip was laid out from, besides the interpretation.
    layout_key: LayoutOptions,
    pub strip: Strip,
    /// The heights (m) the strip holds items for; `None` = the whole section.
    window_m: Option<(f64, f64)>,
    pub index: ItemIndex,
}

impl Cache {
    /// The document revision this was computed from.
    pub fn revision(&self) -> u64 {
        self.rules_key.0
    }

    /// The layout options the strip was laid out with.
    pub fn layout(&self) -> &LayoutOptions {
        &self.layout_key
    }

    /// Lay out an interpretation of `section` for the heights `window_m` (all when `None`) and
    /// index the items for drawing.
    fn build(
        section: &Section,
        interp: Interpretation,
        rules_key: RulesKey,
        layout: &LayoutOptions,
        window_m: Option<(f64, f64)>,
    ) -> Cache {
        let strip = engine::column_strip_window(section, &interp, layout, window_m);
        let index = ItemIndex::build(&strip.items, strip.height_mm);
        Cache { rules_key, interp, layout_key: layout.clone(), strip, window_m, index }
    }

    /// Does the laid-out window hold every height in the canvas's view (strip y, mm)?
    pub fn covers(&self, view_y_mm: Option<(f64, f64)>) -> bool {
        match (self.window_m, view_y_mm) {
            (None, _) | (_, None) => true,
            (Some((lo, hi)), Some((y0, y1))) => {
                let h = &self.strip.heights;
                let (top, base) = (h.height_m(y0), h.height_m(y1));
                base >= lo - 1e-9 && top <= hi + 1e-9
            }
        }
    }

    /// Heights to lay out for a view: the view and one view's height above and below it, so
    /// scrolling rebuilds the layout only now and then; `None` when that is the whole section.
    fn window_for(&self, view_y_mm: Option<(f64, f64)>, total_m: f64) -> Option<(f64, f64)> {
        let Some((y0, y1)) = view_y_mm else {
            return top_window(total_m, self.strip.heights.mm_per_m());
        };
        let h = &self.strip.heights;
        let span_mm = (y1 - y0).max(1.0);
        let hi = h.height_m(y0 - span_mm);
        let lo = h.height_m(y1 + span_mm);
        (lo > 0.0 || hi < total_m).then_some((lo, hi))
    }
}

/// Strip length (mm) laid out at the top of a section before the canvas has shown a view: the
/// canvas opens on the section's top, and at its smallest opening zoom (1.5 points a millimetre)
/// a view of the 880-point-high window is under 600 mm of strip, so this holds it three times
/// over. Laying out a 50,000-bed section whole before the first frame cost seconds and hundreds of
/// megabytes; the view, once known, gets its own window (see [`Cache::window_for`]).
pub const FIRST_WINDOW_MM: f64 = 1_800.0;

/// The heights (m) of the top [`FIRST_WINDOW_MM`] of a section `total_m` high drawn at
/// `mm_per_m`, and as much again above its top (the titles, which a view of the top shows too);
/// `None` when that is the whole section.
fn top_window(total_m: f64, mm_per_m: f64) -> Option<(f64, f64)> {
    let span_m = FIRST_WINDOW_MM / mm_per_m.max(1e-9);
    (total_m > span_m).then_some((total_m - span_m, total_m + span_m))
}

/// Called from a worker thread when its result is ready (the window asks for a repaint).
pub type Waker = Arc<dyn Fn() + Send + Sync>;

/// The column on screen and the worker bringing it up to date, if one runs.
#[derive(Default)]
pub struct Column {
    cache: Option<Cache>,
    /// The worker bringing `cache` up to date after an edit of a long section, if one runs.
    refreshing: Option<Refreshing>,
    /// Called when a worker's result is ready.
    waker: Option<Waker>,
}

/// What the column is computed from this frame.
pub struct Inputs<'a> {
    pub doc: &'a Document,
    /// The project's rule parameters (the defaults when they are faulty).
    pub params: &'a RuleParams,
    /// List every candidate boundary, weak paleosol tops with no evidence too.
    pub all_candidates: bool,
    pub layout: &'a LayoutOptions,
    /// The heights in the canvas's view (strip y, mm), once known.
    pub view_y_mm: Option<(f64, f64)>,
}

impl Column {
    /// The column computed last, if any (the one from before an edit while a worker runs).
    pub fn current(&self) -> Option<&Cache> {
        self.cache.as_ref()
    }

    /// The column computed last, to draw (drawing keeps its item index up to date).
    pub fn current_mut(&mut self) -> Option<&mut Cache> {
        self.cache.as_mut()
    }

    /// True while a worker is bringing the column up to date.
    pub fn pending(&self) -> bool {
        self.refreshing.is_some()
    }

    /// Has a waker been handed over?
    pub fn has_waker(&self) -> bool {
        self.waker.is_some()
    }

    /// What to call when a worker's result is ready.
    pub fn set_waker(&mut self, waker: Waker) {
        self.waker = Some(waker);
    }

    /// Forget everything computed (another document is in the window). A worker still running
    /// for the old document is forgotten; its result goes nowhere.
    pub fn clear(&mut self) {
        self.cache = None;
        self.refreshing = None;
    }

    /// Bring the interpretation and the laid-out column up to date: the rules re-run when the
    /// section or the parameters changed; the layout is rebuilt for the heights around the view
    /// (a long section is never laid out whole while editing or scrolling). After an edit of a
    /// long section the rules run on a worker and the column from before stays on screen until
    /// the worker is done ([`BACKGROUND_RULES_MIN_BEDS`]).
    pub fn refresh(&mut self, inputs: &Inputs<'_>) {
        self.collect_worker(false);
        let doc = inputs.doc;
        let rules_key = (doc.revision, doc.selected_section, inputs.params.clone(), inputs.all_candidates);
        let view = inputs.view_y_mm;
        let section = doc.section();
        let total_m = doc.heights().total_m;
        let (interp, window_m) = match self.cache.take() {
            Some(c) if c.rules_key == rules_key => {
                let w = c.window_for(view, total_m);
                // The first layout (before the view was known) is of the whole section: once
                // the view is known, a long section is laid out around it instead.
                let narrower = c.window_m.is_none() && w.is_some();
                if c.layout_key == *inputs.layout && c.covers(view) && !narrower {
                    self.cache = Some(c);
                    return;
                }
                (c.interp, w)
            }
            Some(c) if section.beds.len() >= BACKGROUND_RULES_MIN_BEDS => {
                let w = c.window_for(view, total_m);
                self.cache = Some(c);
                self.start_worker(inputs, rules_key, w);
                return;
            }
            old => {
                let w = match (&old, view) {
                    (Some(c), _) => c.window_for(view, total_m),
                    // Nothing shown yet: the top of the section, where the canvas opens.
                    (None, None) => top_window(total_m, 1000.0 / inputs.layout.scale()),
                    (None, Some(_)) => None,
                };
                (engine::interpret_with(section, inputs.params, inputs.all_candidates), w)
            }
        };
        self.cache = Some(Cache::build(section, interp, rules_key, inputs.layout, window_m));
    }

    /// Start the rules and layout for the current state on a worker thread, unless one is
    /// running: one worker at a time, and the next starts when it reports, so the edits of a
    /// drag are brought up to date in as few runs as the machine allows.
    fn start_worker(&mut self, inputs: &Inputs<'_>, rules_key: RulesKey, window_m: Option<(f64, f64)>) {
        if self.refreshing.is_some() {
            return;
        }
        // The worker shares the document's project (an edit puts a new one in its place rather
        // than changing this one), so nothing is copied for it.
        let project = Arc::clone(&inputs.doc.project);
        let selected = inputs.doc.selected_section.min(project.sections.len().saturating_sub(1));
        let (params, layout, all) = (inputs.params.clone(), inputs.layout.clone(), inputs.all_candidates);
        let (tx, rx) = std::sync::mpsc::channel();
        let key = rules_key.clone();
        let waker = self.waker.clone();
        let spawned = std::thread::Builder::new().name("aggrade-rules".into()).spawn(move || {
            let Some(section) = project.sections.get(selected) else { return };
            let interp = engine::interpret_with(section, &params, all);
            // The window may have moved on to another document; then nobody listens.
            let _ = tx.send(Cache::build(section, interp, key, &layout, window_m));
            if let Some(wake) = waker {
                wake();
            }
        });
        // No thread to be had (the system is out of them): bring it up to date in the frame.
        if spawned.is_err() {
            let section = inputs.doc.section();
            let interp = engine::interpret_with(section, inputs.params, inputs.all_candidates);
            self.cache = Some(Cache::build(section, interp, rules_key, inputs.layout, window_m));
            return;
        }
        self.refreshing = Some(Refreshing { rules_key, result: rx });
    }

    /// Take the worker's result when it is ready (or wait for it). It replaces the column on
    /// screen even when the document has moved on since, as it is newer than what is shown;
    /// [`Column::refresh`] then starts the next run.
    fn collect_worker(&mut self, wait: bool) {
        let Some(r) = &self.refreshing else { return };
        let got = if wait {
            r.result.recv().ok()
        } else {
            match r.result.try_recv() {
                Ok(c) => Some(c),
                Err(std::sync::mpsc::TryRecvError::Empty) => return,
                Err(std::sync::mpsc::TryRecvError::Disconnected) => None,
            }
        };
        debug_assert!(got.as_ref().is_none_or(|c| c.rules_key == r.rules_key));
        self.refreshing = None;
        if let Some(c) = got {
            // The column it replaces is dropped on another thread: freeing thousands of beds'
            // worth of items and evidence is work the frame need not wait for.
            let old = self.cache.replace(c);
            drop_elsewhere(old);
        }
    }

    /// Bring everything up to date now, waiting for a worker if one runs (for exports and
    /// scripted use, which must see the current state).
    pub fn settle(&mut self, inputs: &Inputs<'_>) {
        loop {
            self.refresh(inputs);
            if self.refreshing.is_none() {
                return;
            }
            self.collect_worker(true);
        }
    }

    /// The interpretation of the current state (waits for a worker if one runs).
    pub fn settled(&mut self, inputs: &Inputs<'_>) -> &Cache {
        self.settle(inputs);
        self.cache.as_ref().expect("settle leaves a column")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gui::demo::{demo_project, long_section};
    use crate::gui::document::Edit;
    use aggrade_core::model::Project;

    fn inputs<'a>(doc: &'a Document, params: &'a RuleParams, layout: &'a LayoutOptions) -> Inputs<'a> {
        Inputs { doc, params, all_candidates: false, layout, view_y_mm: None }
    }

    fn thicken_first_bed(doc: &mut Document) {
        let bed = doc.section().beds[0].id;
        let thickness_m = doc.section().beds[0].thickness_m + 0.5;
        doc.apply(Edit::SetThickness { bed, thickness_m }).expect("edit applies");
    }

    #[test]
    fn a_short_section_is_brought_up_to_date_within_the_call() {
        let mut doc = Document::new(demo_project(), None);
        let (params, layout) = (RuleParams::default(), LayoutOptions::default());
        let mut column = Column::default();
        assert!(column.current().is_none());
        column.refresh(&inputs(&doc, &params, &layout));
        assert_eq!(column.current().map(Cache::revision), Some(doc.revision));
        assert!(!column.pending());
        thicken_first_bed(&mut doc);
        column.refresh(&inputs(&doc, &params, &layout));
        assert!(!column.pending(), "a short section needs no worker");
        let c = column.current().expect("computed");
        assert_eq!(c.revision(), doc.revision);
        assert_eq!(c.interp, engine::interpret(doc.section(), &params));
    }

    #[test]
    fn a_long_section_keeps_the_old_column_until_the_worker_reports() {
        let mut doc = Document::new(Project::new(vec![long_section(BACKGROUND_RULES_MIN_BEDS)]), None);
        let (params, layout) = (RuleParams::default(), LayoutOptions::default());
        let mut column = Column::default();
        let (tx, rx) = std::sync::mpsc::channel();
        let tx = std::sync::Mutex::new(tx);
        column.set_waker(Arc::new(move || {
            let _ = tx.lock().map(|t| t.send(()));
        }));
        // The first column is computed in the call: there is nothing older to show.
        column.refresh(&inputs(&doc, &params, &layout));
        let first = doc.revision;
        assert_eq!(column.current().map(Cache::revision), Some(first));
        thicken_first_bed(&mut doc);
        column.refresh(&inputs(&doc, &params, &layout));
        assert!(column.pending(), "an edit of a long section goes to a worker");
        assert_eq!(column.current().map(Cache::revision), Some(first), "the old column stays meanwhile");
        rx.recv_timeout(std::time::Duration::from_secs(120)).expect("the worker calls the waker");
        let settled = column.settled(&inputs(&doc, &params, &layout));
        assert_eq!(settled.revision(), doc.revision);
        assert_eq!(settled.interp, engine::interpret(doc.section(), &params));
        assert!(!column.pending());
    }

    #[test]
    fn clearing_forgets_the_column_and_the_worker() {
        let mut doc = Document::new(Project::new(vec![long_section(BACKGROUND_RULES_MIN_BEDS)]), None);
        let (params, layout) = (RuleParams::default(), LayoutOptions::default());
        let mut column = Column::default();
        column.refresh(&inputs(&doc, &params, &layout));
        thicken_first_bed(&mut doc);
        column.refresh(&inputs(&doc, &params, &layout));
        assert!(column.pending());
        column.clear();
        assert!(!column.pending());
        assert!(column.current().is_none());
    }

    #[test]
    fn a_long_section_opens_with_its_top_laid_out_and_then_the_view() {
        let doc = Document::new(Project::new(vec![long_section(20_000)]), None);
        let (params, layout) = (RuleParams::default(), LayoutOptions::default());
        let mut column = Column::default();
        column.refresh(&inputs(&doc, &params, &layout));
        let total_m = doc.heights().total_m;
        let c = column.current().expect("computed");
        let (lo, hi) = c.window_m.expect("a window, not the whole section");
        // 1:100 (10 mm a metre): the top 180 m, and the titles above.
        assert!((total_m - lo - FIRST_WINDOW_MM / 10.0).abs() < 1e-6, "{lo}–{hi} of {total_m} m");
        assert!(hi > total_m);
        let whole = engine::column_strip_window(doc.section(), &c.interp, &layout, None);
        assert!(
            c.strip.items.len() * 20 < whole.items.len(),
            "{} of {} items",
            c.strip.items.len(),
            whole.items.len()
        );
        // The canvas's first view (the top, at its smallest opening zoom) lies inside it.
        let top_mm = c.strip.heights.y_mm(total_m) - 4.0;
        assert!(c.covers(Some((top_mm, top_mm + 880.0 / 1.5))));
        // A view far down is not covered, and gets a window of its own around it.
        let mid_mm = c.strip.heights.y_mm(total_m / 2.0);
        let view = Some((mid_mm, mid_mm + 300.0));
        assert!(!c.covers(view));
        let (lo2, hi2) = c.window_for(view, total_m).expect("a window around the view");
        assert!(lo2 < total_m / 2.0 && hi2 > total_m / 2.0 && hi2 < total_m);
    }

    #[test]
    fn a_whole_section_layout_covers_every_view() {
        let doc = Document::new(demo_project(), None);
        let (params, layout) = (RuleParams::default(), LayoutOptions::default());
        let mut column = Column::default();
        column.refresh(&inputs(&doc, &params, &layout));
        let c = column.current().expect("computed");
        assert!(c.covers(None));
        assert!(c.covers(Some((0.0, 10.0))));
        // A view of the whole strip needs no narrower window.
        let total_m = doc.heights().total_m;
        assert_eq!(c.window_for(Some((0.0, c.strip.height_mm)), total_m), None);
        assert_eq!(c.window_for(None, total_m), None);
    }
}
