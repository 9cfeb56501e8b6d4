//! The open document and the one place every edit is applied: undo/redo by snapshots, merged
//! gestures (a drag or a typed value is one undo step), dirty tracking and a revision counter
//! that caches and the autosave watch.

use aggrade_core::model::{
    Bed, BedId, GrainSize, LengthUnit, MeasuredCurve, Project, ReviewDecision, ReviewState, Section,
};
use std::path::{Path, PathBuf};
use std::sync::Arc;

/// How many undo steps are kept (older ones are dropped first).
pub const UNDO_LIMIT: usize = 200;

/// One change to the document. Every panel, menu and shortcut edits through these values only.
#[derive(Debug, Clone, PartialEq)]
pub enum Edit {
    /// Set a bed's thickness (metres); beds above move with it since heights are derived.
    SetThickness { bed: BedId, thickness_m: f64 },
    /// Set grain size at base and top.
    SetGrain { bed: BedId, base: Option<GrainSize>, top: Option<GrainSize> },
    /// Replace every field of a bed (the inspector and the table edit a copy, then send it).
    ReplaceBed { bed: Bed },
    /// Insert a bed at this index of the base-first bed list (its id is assigned here).
    InsertBed { index: usize, bed: Bed },
    /// Remove a bed.
    DeleteBed { bed: BedId },
    /// Cut a bed into two equal halves.
    SplitBed { bed: BedId },
    /// Cut a bed in two at `lower_m` metres above its base (0 < `lower_m` < its thickness): the
    /// lower part keeps the bed's id and base, the upper part is a new bed with a sharp base.
    SplitBedAt { bed: BedId, lower_m: f64 },
    /// Join a bed with the one above it (thicknesses add up; the lower bed's fields are kept).
    MergeWithAbove { bed: BedId },
    /// Record the geologist's decision on the candidate boundary at the base of `bed`.
    SetReview { bed: BedId, state: ReviewState, note: String },
    /// Give the accepted boundary at the base of `bed` a correlation label, or take it off
    /// (`None` or blank); the correlation panel ties boundaries with the same label.
    SetLink { bed: BedId, link: Option<String> },
    /// Change the unit thicknesses are shown and typed in.
    SetDisplayUnit { unit: LengthUnit },
    /// Change the section's descriptive fields.
    SetSectionInfo { name: String, locality: String, logged_by: String, notes: String },
    /// Set where and when the section was logged and its place on the correlation panel
    /// (metres along the line); refused with the field's message when out of range.
    SetSectionPlace {
        coordinates: Option<aggrade_core::model::LatLon>,
        date_logged: Option<String>,
        panel_position_m: Option<f64>,
    },
    /// Set how the section was measured and where: method, thickness uncertainty (± m), bedding
    /// attitude, traverse and GPS fixes; refused with the field's message when out of range (a
    /// fix's height must lie within the section).
    SetSectionSetting {
        method: Option<aggrade_core::model::MeasuringMethod>,
        thickness_uncertainty_m: Option<f64>,
        bedding: Option<aggrade_core::model::BeddingAttitude>,
        traverse: Option<aggrade_core::model::Traverse>,
        fixes: Vec<aggrade_core::model::GpsFix>,
    },
    /// Add a new empty section and select it.
    AddSection { section: Section },
    /// Replace the whole project (an import into the open document).
    ReplaceProject { project: Project },
    /// Attach a measured curve to the selected section (replacing one with the same mnemonic).
    AttachCurve { curve: MeasuredCurve },
    /// Remove the selected section's curve with this mnemonic.
    RemoveCurve { mnemonic: String },
    /// Put a traced sheet (image and calibration) behind the selected section, or take it off.
    SetTrace { trace: Option<aggrade_core::trace::TraceSheet> },
    /// A tracing click on a bed boundary: cut the bed at this height (metres), or add a bed on top.
    TraceBoundary { height_m: f64 },
    /// Set the project's rule parameters: the fields that differ from the defaults
    /// (`RuleParams::changed`), as the project file stores them; empty for the default rules.
    SetRuleParams { params: serde_json::Map<String, serde_json::Value> },
    /// Set what was seen of a channel body across the outcrop — its width (metres) and whether
    /// it runs beyond the outcrop — in section `section` (an index, as the body table lists every
    /// section), keyed by the body's lowest bed. The record's note is kept; a record left with no
    /// width, no "beyond" and no note is removed.
    SetBodyLateral { section: usize, base_bed: BedId, width_m: Option<f64>, beyond_outcrop: bool },
}

/// Why an edit was refused; shown to the user as is.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct EditError(pub String);

impl std::fmt::Display for EditError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

#[derive(Debug, Clone)]
struct Snapshot {
    /// Shared with the document until an edit replaces it: taking a snapshot copies nothing.
    project: Arc<Project>,
    selected_section: usize,
    selected_bed: Option<BedId>,
}

/// The project being edited, where it lives on disk, and what is selected.
#[derive(Debug, Clone)]
pub struct Document {
    /// Shared (not copied) with undo snapshots and with the worker that interprets it; an edit
    /// puts a new project in its place.
    pub project: Arc<Project>,
    /// Where the project was opened from or last saved to (`None` for a new document).
    pub path: Option<PathBuf>,
    /// Changed since the last save or open.
    pub dirty: bool,
    /// The demo project shown at a start with no file (named so in the title until saved).
    pub demo: bool,
    /// The file on disk as it was when last read or written here; saving compares it with the
    /// file as it is then, so that a change made meanwhile elsewhere is not overwritten unasked.
    pub disk: Option<super::files::DiskStamp>,
    pub selected_section: usize,
    pub selected_bed: Option<BedId>,
    /// Grows with every change to the project; caches and autosave compare it.
    pub revision: u64,
    undo: Vec<Snapshot>,
    redo: Vec<Snapshot>,
    /// The gesture the newest undo step belongs to, while it is still open.
    open_gesture: Option<u64>,
    /// Tells this document from any other opened in the window (revisions start again at 0).
    serial: u64,
    /// The selected section's heights, worked out once per revision (see [`Document::heights`]).
    heights: std::cell::RefCell<Option<(HeightsKey, Arc<SectionHeights>)>>,
}

/// What [`SectionHeights`] were worked out from: document serial, revision, section.
type HeightsKey = (u64, u64, usize);

/// The heights of the selected section's beds, worked out once for each state of the document
/// (each a pass over every bed, which the window would otherwise make every frame).
#[derive(Debug)]
pub struct SectionHeights {
    /// The height of each bed's base above the section's base (m), base first.
    pub base_m: Vec<f64>,
    /// The section's total thickness (m).
    pub total_m: f64,
    /// The thickness of its beds that are not covered (m).
    pub exposed_m: f64,
}

fn next_serial() -> u64 {
    static SERIAL: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(1);
    SERIAL.fetch_add(1, std::sync::atomic::Ordering::Relaxed)
}

impl Document {
    /// A document over a project, clean.
    pub fn new(project: Project, path: Option<PathBuf>) -> Self {
        let mut project = project;
        if project.sections.is_empty() {
            project.sections.push(Section::new("Section 1"));
        }
        Document {
            project: Arc::new(project),
            path,
            dirty: false,
            demo: false,
            disk: None,
            selected_section: 0,
            selected_bed: None,
            revision: 0,
            undo: Vec::new(),
            redo: Vec::new(),
            open_gesture: None,
            serial: next_serial(),
            heights: std::cell::RefCell::new(None),
        }
    }

    /// The selected section's bed base heights and total thickness, worked out once for each
    /// revision of the document.
    pub fn heights(&self) -> Arc<SectionHeights> {
        let key = (self.serial, self.revision, self.selected_section);
        let mut memo = self.heights.borrow_mut();
        if let Some((k, h)) = memo.as_ref() {
            if *k == key {
                return Arc::clone(h);
            }
        }
        // One pass over the beds (each a separate allocation: one pass, not three).
        let s = self.section();
        let mut base_m = Vec::with_capacity(s.beds.len());
        let (mut total_m, mut exposed_m) = (0.0, 0.0);
        for b in &s.beds {
            base_m.push(total_m);
            total_m += b.thickness_m;
            if !b.is_covered() {
                exposed_m += b.thickness_m;
            }
        }
        let h = Arc::new(SectionHeights { base_m, total_m, exposed_m });
        *memo = Some((key, Arc::clone(&h)));
        h
    }

    /// The selected section.
    pub fn section(&self) -> &Section {
        let i = self.selected_section.min(self.project.sections.len().saturating_sub(1));
        &self.project.sections[i]
    }

    fn section_mut(&mut self) -> &mut Section {
        let i = self.selected_section.min(self.project.sections.len().saturating_sub(1));
        &mut Arc::make_mut(&mut self.project).sections[i]
    }

    /// The selected bed, if it still exists.
    pub fn selected(&self) -> Option<&Bed> {
        let id = self.selected_bed?;
        self.section().beds.iter().find(|b| b.id == id)
    }

    /// File name for the title bar.
    pub fn display_name(&self) -> String {
        self.path
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_else(|| {
                if self.demo { "Demo project (not saved)" } else { "New project (not saved)" }.to_string()
            })
    }

    /// Apply an edit as its own undo step.
    pub fn apply(&mut self, edit: Edit) -> Result<(), EditError> {
        self.open_gesture = None;
        self.apply_in_gesture(edit, None)
    }

    /// Apply an edit; consecutive edits with the same `gesture` (a drag, typing into one field)
    /// share one undo step until [`Document::end_gesture`] or an edit of another gesture.
    pub fn apply_in_gesture(&mut self, edit: Edit, gesture: Option<u64>) -> Result<(), EditError> {
        // Steps of one gesture (a drag) merge into one undo step: only the first keeps a snapshot.
        let merge = gesture.is_some() && gesture == self.open_gesture && !self.undo.is_empty();
        // The edit runs on a copy, so a refused edit leaves everything as it was; the state it
        // replaces becomes the undo snapshot (one copy of the project per edit, not two).
        let mut work = self.clone_state();
        work.run(edit)?;
        work.check_saveable(&self.project)?;
        let before = Snapshot {
            project: std::mem::replace(&mut self.project, Arc::new(work.project)),
            selected_section: self.selected_section,
            selected_bed: self.selected_bed,
        };
        if !merge {
            self.undo.push(before);
            if self.undo.len() > UNDO_LIMIT {
                // The oldest snapshot (a whole project) is freed off the frame.
                drop_elsewhere(self.undo.remove(0));
            }
        }
        self.selected_section = work.selected_section;
        self.selected_bed = work.selected_bed;
        self.open_gesture = gesture;
        self.redo.clear();
        self.dirty = true;
        self.revision += 1;
        Ok(())
    }

    /// Close the open gesture so the next edit starts a new undo step.
    pub fn end_gesture(&mut self) {
        self.open_gesture = None;
    }

    /// Whether there is something to undo / redo.
    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }
    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }

    /// Step back one edit (or one gesture).
    pub fn undo(&mut self) -> bool {
        let Some(prev) = self.undo.pop() else { return false };
        let now = self.snapshot();
        self.redo.push(now);
        self.restore(prev);
        true
    }

    /// Redo the last undone step.
    pub fn redo(&mut self) -> bool {
        let Some(next) = self.redo.pop() else { return false };
        let now = self.snapshot();
        self.undo.push(now);
        self.restore(next);
        true
    }

    /// The project was written to `path`: clean from now on.
    /// Store every traced sheet's image path as read from `project_file` (relative to its
    /// folder), in the project and in the undo and redo steps: a sheet chosen before the first
    /// save (stored absolute) or a project saved elsewhere keeps naming the same image. Returns
    /// whether the project changed.
    pub fn rebase_trace_images(&mut self, project_file: &Path) -> bool {
        let old = self.path.clone();
        let rebase = |project: &mut Arc<Project>| {
            let moved = |image: &str| {
                let new = aggrade_core::trace::sheet::rebase_image_path(old.as_deref(), project_file, image);
                (new != image).then_some(new)
            };
            let changes: Vec<(usize, String)> = project
                .sections
                .iter()
                .enumerate()
                .filter_map(|(i, s)| moved(&s.trace.as_ref()?.image).map(|new| (i, new)))
                .collect();
            if changes.is_empty() {
                return false;
            }
            let project = Arc::make_mut(project);
            for (i, new) in changes {
                if let Some(t) = project.sections[i].trace.as_mut() {
                    t.image = new;
                }
            }
            true
        };
        let changed = rebase(&mut self.project);
        for step in self.undo.iter_mut().chain(self.redo.iter_mut()) {
            rebase(&mut step.project);
        }
        if changed {
            self.revision += 1;
        }
        changed
    }

    pub fn mark_saved(&mut self, path: PathBuf) {
        self.path = Some(path);
        self.dirty = false;
    }

    fn snapshot(&self) -> Snapshot {
        Snapshot {
            project: Arc::clone(&self.project),
            selected_section: self.selected_section,
            selected_bed: self.selected_bed,
        }
    }

    fn restore(&mut self, s: Snapshot) {
        self.project = s.project;
        self.selected_section = s.selected_section.min(self.project.sections.len().saturating_sub(1));
        self.selected_bed = s.selected_bed;
        self.open_gesture = None;
        self.dirty = true;
        self.revision += 1;
    }

    fn clone_state(&self) -> Work {
        Work {
            project: Project::clone(&self.project),
            selected_section: self.selected_section,
            selected_bed: self.selected_bed,
        }
    }

    /// Index (base-first) of a bed in the selected section.
    pub fn bed_index(&self, id: BedId) -> Option<usize> {
        self.section().bed_index(id)
    }

    /// Select a section by index.
    pub fn select_section(&mut self, index: usize) {
        if index < self.project.sections.len() {
            self.selected_section = index;
            self.selected_bed = None;
            self.revision += 1;
        }
    }

    #[doc(hidden)]
    pub fn section_mut_for_tests(&mut self) -> &mut Section {
        self.revision += 1;
        self.section_mut()
    }
}

/// A working copy an edit runs on; it replaces the document only when the edit succeeds.
struct Work {
    project: Project,
    selected_section: usize,
    selected_bed: Option<BedId>,
}

fn check_thickness(t: f64) -> Result<(), EditError> {
    if t.is_finite() && t > 0.0 {
        Ok(())
    } else {
        Err(EditError(format!("thickness must be a number greater than 0 m, got {t}")))
    }
}

impl Work {
    fn section(&mut self) -> &mut Section {
        let i = self.selected_section.min(self.project.sections.len().saturating_sub(1));
        &mut self.project.sections[i]
    }

    fn index_of(&mut self, id: BedId) -> Result<usize, EditError> {
        self.section().bed_index(id).ok_or_else(|| EditError(format!("bed {} no longer exists", id.0)))
    }

    /// Refuse an edit that leaves a project the project file's checks refuse (it would save but
    /// never open again); problems the project had before the edit do not block it.
    fn check_saveable(&self, before: &Project) -> Result<(), EditError> {
        // Only what the edit changed is read again (the beds it left are shared with `before`).
        match aggrade_core::io::new_problems(before, &self.project).into_iter().next() {
            Some(p) => Err(EditError(format!("the project would not open again: {p}"))),
            None => Ok(()),
        }
    }

    /// Cut the bed at index `i` at `lower_m` metres above its base.
    fn split(&mut self, i: usize, lower_m: f64) -> Result<(), EditError> {
        let s = self.section();
        let whole = s.beds[i].thickness_m;
        if !(lower_m.is_finite() && lower_m > 0.0 && lower_m < whole) {
            return Err(EditError(format!(
                "a bed of {whole} m is cut between its base and top (above 0 and below {whole} m), not at {lower_m} m"
            )));
        }
        let mut upper = s.beds[i].clone();
        upper.id = s.next_bed_id();
        // The new upper part has a conformable base and no named surface or rank of its own.
        upper.base_surface = None;
        upper.base_contact = aggrade_core::model::Contact::Sharp;
        upper.base_relief_m = None;
        upper.base_rank = None;
        s.beds[i].thickness_m = lower_m;
        upper.thickness_m = whole - lower_m;
        s.beds.insert(i + 1, upper);
        Ok(())
    }

    fn run(&mut self, edit: Edit) -> Result<(), EditError> {
        match edit {
            Edit::SetThickness { bed, thickness_m } => {
                check_thickness(thickness_m)?;
                let i = self.index_of(bed)?;
                self.section().beds[i].thickness_m = thickness_m;
            }
            Edit::SetGrain { bed, base, top } => {
                let i = self.index_of(bed)?;
                let b = &mut self.section().beds[i];
                b.grain_base = base;
                b.grain_top = top;
            }
            Edit::ReplaceBed { bed } => {
                check_thickness(bed.thickness_m)?;
                let i = self.index_of(bed.id)?;
                self.section().beds[i] = bed;
            }
            Edit::InsertBed { index, mut bed } => {
                check_thickness(bed.thickness_m)?;
                let s = self.section();
                bed.id = s.next_bed_id();
                let at = index.min(s.beds.len());
                let id = bed.id;
                s.beds.insert(at, bed);
                self.selected_bed = Some(id);
            }
            Edit::DeleteBed { bed } => {
                let i = self.index_of(bed)?;
                let s = self.section();
                s.beds.remove(i);
                s.review.retain(|d| d.bed != bed);
                // A channel body's width stays with the body: it moves to the bed now lowest.
                let heir = s.beds.get(i).map(|b| b.id);
                rekey_body_lateral(s, bed, heir);
                self.selected_bed = s.beds.get(i.min(s.beds.len().saturating_sub(1))).map(|b| b.id);
            }
            Edit::SplitBed { bed } => {
                let i = self.index_of(bed)?;
                let half = self.section().beds[i].thickness_m / 2.0;
                self.split(i, half)?;
            }
            Edit::SplitBedAt { bed, lower_m } => {
                let i = self.index_of(bed)?;
                self.split(i, lower_m)?;
            }
            Edit::MergeWithAbove { bed } => {
                let i = self.index_of(bed)?;
                let s = self.section();
                if i + 1 >= s.beds.len() {
                    return Err(EditError("the top bed has no bed above it to merge with".into()));
                }
                let above = s.beds.remove(i + 1);
                let b = &mut s.beds[i];
                b.thickness_m += above.thickness_m;
                b.grain_top = above.grain_top.or(b.grain_top);
                s.review.retain(|d| d.bed != above.id);
                // A body based on the bed merged away now starts with the merged bed.
                rekey_body_lateral(s, above.id, Some(bed));
                self.selected_bed = Some(bed);
            }
            Edit::SetReview { bed, state, note } => {
                self.index_of(bed)?;
                let s = self.section();
                // The correlation label stays with the boundary whatever is decided.
                let link = s.decision_for(bed).and_then(|d| d.link.clone());
                s.review.retain(|d| d.bed != bed);
                if state != ReviewState::Candidate || !note.is_empty() || link.is_some() {
                    s.review.push(ReviewDecision { bed, state, note, link });
                    s.review.sort_by_key(|d| d.bed);
                }
            }
            Edit::SetLink { bed, link } => {
                self.index_of(bed)?;
                // Kept as typed (a space may be followed by more while typing); compared trimmed.
                let link = link.filter(|l| !l.trim().is_empty());
                if let Some(l) = &link {
                    aggrade_core::io::check_link_label(l)
                        .map_err(|why| EditError(format!("correlation label {l:?}: {why}")))?;
                }
                let s = self.section();
                match (s.review.iter_mut().find(|d| d.bed == bed), link) {
                    (Some(d), None) => d.link = None,
                    (Some(d), Some(l)) if d.state == ReviewState::Accepted => d.link = Some(l),
                    (_, Some(_)) => {
                        return Err(EditError(
                            "only an accepted boundary can carry a correlation label; accept it first".into(),
                        ))
                    }
                    (None, None) => {}
                }
                // A decision left with nothing in it goes.
                s.review
                    .retain(|d| d.state != ReviewState::Candidate || !d.note.is_empty() || d.link.is_some());
            }
            Edit::SetDisplayUnit { unit } => self.section().display_unit = unit,
            Edit::SetSectionInfo { name, locality, logged_by, notes } => {
                if name.trim().is_empty() {
                    return Err(EditError("a section needs a name".into()));
                }
                let clash = self
                    .project
                    .sections
                    .iter()
                    .enumerate()
                    .any(|(i, s)| i != self.selected_section && s.name == name);
                if clash {
                    return Err(EditError(format!("another section is already named {name:?}")));
                }
                let s = self.section();
                s.name = name;
                s.locality = locality;
                s.logged_by = logged_by;
                s.notes = notes;
            }
            Edit::SetSectionPlace { coordinates, date_logged, panel_position_m } => {
                let s = self.section();
                s.coordinates = coordinates;
                s.date_logged = date_logged;
                s.panel_position_m = panel_position_m;
                let fields =
                    ["coordinates.lat_deg", "coordinates.lon_deg", "date_logged", "panel_position_m"];
                let problem = aggrade_core::io::validate_section(s)
                    .into_iter()
                    .find(|p| fields.contains(&p.location.as_str()));
                if let Some(p) = problem {
                    return Err(EditError(p.to_string()));
                }
            }
            Edit::SetSectionSetting { method, thickness_uncertainty_m, bedding, traverse, fixes } => {
                let s = self.section();
                if let Some(why) = setting_problem(s, thickness_uncertainty_m, bedding, traverse, &fixes) {
                    return Err(EditError(why));
                }
                s.method = method;
                s.thickness_uncertainty_m = thickness_uncertainty_m;
                s.bedding = bedding;
                s.traverse = traverse;
                s.fixes = fixes;
            }
            Edit::AddSection { section } => {
                if self.project.sections.iter().any(|s| s.name == section.name) {
                    return Err(EditError(format!("a section named {:?} exists already", section.name)));
                }
                self.project.sections.push(section);
                self.selected_section = self.project.sections.len() - 1;
                self.selected_bed = None;
            }
            Edit::ReplaceProject { project } => {
                if project.sections.is_empty() {
                    return Err(EditError("the imported project holds no section".into()));
                }
                self.project = project;
                self.selected_section = 0;
                self.selected_bed = None;
            }
            Edit::AttachCurve { curve } => {
                let s = self.section();
                s.attach_curve(curve);
                // A curve that would not save (and so not open again) is refused here.
                let problem = aggrade_core::io::validate_section(s)
                    .into_iter()
                    .find(|p| p.location.starts_with("curves"));
                if let Some(p) = problem {
                    return Err(EditError(format!("the curve cannot be attached: {p}")));
                }
            }
            Edit::RemoveCurve { mnemonic } => {
                if self.section().remove_curve(&mnemonic).is_none() {
                    return Err(EditError(format!("the section has no curve {mnemonic:?}")));
                }
            }
            Edit::SetTrace { trace } => {
                if let Some((field, why)) = trace.as_ref().and_then(|t| t.problems().into_iter().next()) {
                    return Err(EditError(format!("the sheet calibration is refused: trace.{field} {why}")));
                }
                self.section().trace = trace;
            }
            Edit::TraceBoundary { height_m } => {
                let cut = aggrade_core::trace::cut_at(self.section(), height_m)
                    .map_err(|e| EditError(e.to_string()))?;
                self.selected_bed = Some(match cut {
                    aggrade_core::trace::Cut::Split { upper, .. } => upper,
                    aggrade_core::trace::Cut::OnTop { bed } => bed,
                });
            }
            Edit::SetRuleParams { params } => {
                // Checked as the project file's reader checks them, so that the project opens again.
                aggrade_core::rules::RuleParams::from_fields(&params)
                    .map_err(|faults| EditError(format!("rule parameters refused: {}", faults.join("; "))))?;
                self.project.rule_params = params;
            }
            Edit::SetBodyLateral { section, base_bed, width_m, beyond_outcrop } => {
                if let Some(w) = width_m.filter(|w| !(w.is_finite() && *w > 0.0)) {
                    return Err(EditError(format!(
                        "width: a channel body's width is more than 0 m, got {w}"
                    )));
                }
                let s = self
                    .project
                    .sections
                    .get_mut(section)
                    .ok_or_else(|| EditError(format!("section {} no longer exists", section + 1)))?;
                if s.bed_index(base_bed).is_none() {
                    return Err(EditError(format!("bed {} no longer exists", base_bed.0)));
                }
                match s.body_lateral.iter().position(|l| l.base_bed == base_bed) {
                    Some(k) => {
                        let l = &mut s.body_lateral[k];
                        l.width_m = width_m;
                        l.beyond_outcrop = beyond_outcrop;
                        if l.width_m.is_none() && !l.beyond_outcrop && l.note.trim().is_empty() {
                            s.body_lateral.remove(k);
                        }
                    }
                    None if width_m.is_some() || beyond_outcrop => {
                        s.body_lateral.push(aggrade_core::model::BodyLateral {
                            base_bed,
                            width_m,
                            beyond_outcrop,
                            note: String::new(),
                        });
                    }
                    None => {}
                }
            }
        }
        Ok(())
    }
}

/// The first value of a section's setting out of range, in words naming the field.
fn setting_problem(
    s: &Section,
    uncertainty: Option<f64>,
    bedding: Option<aggrade_core::model::BeddingAttitude>,
    traverse: Option<aggrade_core::model::Traverse>,
    fixes: &[aggrade_core::model::GpsFix],
) -> Option<String> {
    let within = |v: f64, lo: f64, hi: f64| v.is_finite() && (lo..=hi).contains(&v);
    if let Some(u) = uncertainty.filter(|u| !within(*u, 0.0, aggrade_core::io::MAX_BED_THICKNESS_M)) {
        return Some(format!("thickness_uncertainty_m: a ± error is 0 m or more, got {u}"));
    }
    if let Some(b) = bedding {
        if !within(b.dip_deg, 0.0, 90.0) {
            return Some(format!("bedding.dip_deg: a dip lies between 0 and 90°, got {}", b.dip_deg));
        }
        if !within(b.dip_direction_deg, 0.0, 360.0) {
            return Some(format!(
                "bedding.dip_direction_deg: a direction lies between 0 and 360°, got {}",
                b.dip_direction_deg
            ));
        }
    }
    if let Some(t) = traverse {
        if !within(t.bearing_deg, 0.0, 360.0) {
            return Some(format!(
                "traverse.bearing_deg: a bearing lies between 0 and 360°, got {}",
                t.bearing_deg
            ));
        }
        if !within(t.slope_deg, -90.0, 90.0) {
            return Some(format!(
                "traverse.slope_deg: a slope lies between -90 and 90°, got {}",
                t.slope_deg
            ));
        }
    }
    let total = s.total_thickness_m();
    // A fix already stored passes as it is (the section may have been shortened since; `aggrade
    // check` warns of it), so that the other settings can still be changed.
    for (k, f) in fixes.iter().enumerate().filter(|(_, f)| !s.fixes.contains(f)) {
        if !within(f.lat_deg, -90.0, 90.0) {
            return Some(format!(
                "fixes[{k}].lat_deg: a latitude lies between -90 and 90°, got {}",
                f.lat_deg
            ));
        }
        if !within(f.lon_deg, -180.0, 180.0) {
            return Some(format!(
                "fixes[{k}].lon_deg: a longitude lies between -180 and 180°, got {}",
                f.lon_deg
            ));
        }
        if !within(f.height_m, 0.0, total + 1e-9) {
            return Some(format!(
                "fixes[{k}].height_m: a fix is taken within the section, 0 to {total} m above its base, got {}",
                f.height_m
            ));
        }
        if let Some(e) = f.elevation_m.filter(|e| !e.is_finite()) {
            return Some(format!("fixes[{k}].elevation_m: not a number ({e})"));
        }
    }
    None
}

/// Drop a large value on a short-lived thread (or here, if no thread can be had).
pub(crate) fn drop_elsewhere<T: Send + 'static>(value: T) {
    let _ = super::background::spawn("aggrade-drop", move || drop(value));
}

/// Move the lateral record of the channel body based on bed `from` to bed `to` (the geologist's
/// width is kept when its base bed goes). When `to` is absent or already has a record, the
/// record of `from` is dropped, since a record must name a bed that exists.
fn rekey_body_lateral(s: &mut Section, from: BedId, to: Option<BedId>) {
    let Some(k) = s.body_lateral.iter().position(|l| l.base_bed == from) else { return };
    match to.filter(|t| !s.body_lateral.iter().any(|l| l.base_bed == *t)) {
        Some(t) => s.body_lateral[k].base_bed = t,
        None => {
            s.body_lateral.remove(k);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{Lithology, WentworthClass};

    fn doc_with_beds(n: usize) -> Document {
        let mut s = Section::new("Test");
        for i in 0..n {
            let g = Some(GrainSize::Class(WentworthClass::FineSand));
            s.beds.push(Bed::new(BedId(i as u64 + 1), 1.0 + i as f64, Lithology::Sandstone, g));
        }
        Document::new(Project::new(vec![s]), None)
    }

    #[test]
    fn thickness_change_moves_beds_above_and_undoes() {
        let mut d = doc_with_beds(3);
        assert_eq!(d.section().base_heights_m(), vec![0.0, 1.0, 3.0]);
        d.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 0.5 }).expect("valid edit");
        assert_eq!(d.section().base_heights_m(), vec![0.0, 0.5, 2.5]);
        assert!(d.dirty);
        assert!(d.undo());
        assert_eq!(d.section().base_heights_m(), vec![0.0, 1.0, 3.0]);
        assert!(d.redo());
        assert_eq!(d.section().beds[0].thickness_m, 0.5);
    }

    /// The remembered heights follow every change: an edit, undo, redo and another section.
    #[test]
    fn the_remembered_heights_are_those_of_the_section_as_it_is() {
        let mut d = doc_with_beds(3);
        let mut other = Section::new("Other");
        other.beds.push(Bed::new(BedId(1), 0.25, Lithology::Covered, None));
        d.apply(Edit::AddSection { section: other }).expect("added");
        d.select_section(0);
        let same = |d: &Document| {
            let h = d.heights();
            let s = d.section();
            assert_eq!(h.base_m, s.base_heights_m());
            assert_eq!(h.total_m, s.total_thickness_m());
            assert_eq!(h.exposed_m, s.exposed_thickness_m());
            h.total_m
        };
        assert_eq!(same(&d), 6.0);
        d.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 0.5 }).expect("valid edit");
        assert_eq!(same(&d), 5.5);
        assert!(d.undo());
        assert_eq!(same(&d), 6.0);
        assert!(d.redo());
        assert_eq!(same(&d), 5.5);
        d.select_section(1);
        assert_eq!(same(&d), 0.25);
        assert_eq!(d.heights().exposed_m, 0.0, "a covered interval is not exposed");
        // Another document at the same revision is another document.
        let fresh = doc_with_beds(1);
        assert_eq!((fresh.revision, same(&fresh)), (0, 1.0));
    }

    /// An edit of one bed of a long section shares every other bed with the undo step it
    /// leaves (memory and time of an edit do not grow with the section).
    #[test]
    fn an_edit_shares_the_beds_it_did_not_change_with_its_undo_step() {
        let mut d = doc_with_beds(1_000);
        let before = Arc::clone(&d.project);
        d.apply(Edit::SetThickness { bed: BedId(500), thickness_m: 0.5 }).expect("valid edit");
        let (was, now) = (&before.sections[0].beds, &d.section().beds);
        assert_eq!(now.changed_since(was), 499..500);
        assert!((0..1_000).filter(|&i| i != 499).all(|i| now.shares(i, was, i)));
        assert_eq!(was[499].thickness_m, 500.0, "the undo step keeps the bed as it was");
    }

    #[test]
    fn a_drag_is_one_undo_step() {
        let mut d = doc_with_beds(2);
        for t in [1.1, 1.2, 1.3, 1.4] {
            d.apply_in_gesture(Edit::SetThickness { bed: BedId(2), thickness_m: t }, Some(7)).expect("valid");
        }
        d.end_gesture();
        d.apply_in_gesture(Edit::SetThickness { bed: BedId(2), thickness_m: 5.0 }, Some(7)).expect("valid");
        assert!(d.undo());
        assert_eq!(d.section().beds[1].thickness_m, 1.4);
        assert!(d.undo());
        assert_eq!(d.section().beds[1].thickness_m, 2.0);
        assert!(!d.can_undo());
    }

    #[test]
    fn bad_thickness_is_refused_and_changes_nothing() {
        let mut d = doc_with_beds(1);
        for bad in [0.0, -2.0, f64::NAN, f64::INFINITY] {
            let err = d.apply(Edit::SetThickness { bed: BedId(1), thickness_m: bad });
            assert!(err.is_err(), "{bad} accepted");
        }
        assert!(!d.dirty);
        assert!(!d.can_undo());
        assert_eq!(d.revision, 0);
    }

    #[test]
    fn split_and_merge_keep_total_thickness() {
        let mut d = doc_with_beds(3);
        let total = d.section().total_thickness_m();
        d.apply(Edit::SplitBed { bed: BedId(2) }).expect("split");
        assert_eq!(d.section().beds.len(), 4);
        assert_eq!(d.section().beds[1].thickness_m, 1.0);
        assert_eq!(d.section().beds[2].thickness_m, 1.0);
        assert!((d.section().total_thickness_m() - total).abs() < 1e-12);
        d.apply(Edit::MergeWithAbove { bed: BedId(2) }).expect("merge");
        assert_eq!(d.section().beds.len(), 3);
        assert!((d.section().total_thickness_m() - total).abs() < 1e-12);
        let top = d.section().beds[2].id;
        assert!(d.apply(Edit::MergeWithAbove { bed: top }).is_err());
    }

    #[test]
    fn a_split_at_a_height_keeps_the_base_below_and_refuses_a_cut_outside_the_bed() {
        let mut d = doc_with_beds(3);
        let total = d.section().total_thickness_m();
        let mut b = d.section().beds[2].clone();
        b.base_contact = aggrade_core::model::Contact::Erosional;
        b.base_relief_m = Some(0.5);
        d.apply(Edit::ReplaceBed { bed: b }).expect("erosional base");
        // Bed 3 is 3 m thick: cut 0.8 m above its base.
        d.apply(Edit::SplitBedAt { bed: BedId(3), lower_m: 0.8 }).expect("split");
        let s = d.section();
        assert_eq!(s.beds.len(), 4);
        assert_eq!((s.beds[2].id, s.beds[2].thickness_m), (BedId(3), 0.8));
        assert!((s.beds[3].thickness_m - 2.2).abs() < 1e-12);
        assert_eq!(s.beds[2].base_relief_m, Some(0.5), "the base stays with the lower part");
        assert_eq!(s.beds[3].base_contact, aggrade_core::model::Contact::Sharp);
        assert!((s.total_thickness_m() - total).abs() < 1e-12);
        for bad in [0.0, 0.8, 1.0, -1.0, f64::NAN] {
            assert!(d.apply(Edit::SplitBedAt { bed: BedId(3), lower_m: bad }).is_err(), "{bad}");
        }
        assert_eq!(d.section().beds.len(), 4, "a refused cut changes nothing");
        assert!(d.undo());
        assert_eq!(d.section().beds.len(), 3);
    }

    #[test]
    fn insert_assigns_fresh_id_and_selects() {
        let mut d = doc_with_beds(2);
        let bed = Bed::new(BedId(1), 0.3, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Clay)));
        d.apply(Edit::InsertBed { index: 2, bed }).expect("insert");
        assert_eq!(d.section().beds[2].id, BedId(3));
        assert_eq!(d.selected_bed, Some(BedId(3)));
    }

    #[test]
    fn review_decision_is_kept_by_bed_id_and_deleted_with_the_bed() {
        let mut d = doc_with_beds(3);
        d.apply(Edit::SetReview { bed: BedId(2), state: ReviewState::Accepted, note: "clear scour".into() })
            .expect("review");
        assert_eq!(d.section().decision_for(BedId(2)).map(|r| r.state), Some(ReviewState::Accepted));
        d.apply(Edit::SetReview { bed: BedId(2), state: ReviewState::Rejected, note: String::new() })
            .expect("review");
        assert_eq!(d.section().review.len(), 1);
        d.apply(Edit::DeleteBed { bed: BedId(2) }).expect("delete");
        assert!(d.section().review.is_empty());
    }

    #[test]
    fn a_body_width_moves_to_the_bed_now_lowest_when_its_base_bed_goes() {
        let mut d = doc_with_beds(4);
        let record = |base: u64| aggrade_core::model::BodyLateral {
            base_bed: BedId(base),
            width_m: Some(120.0),
            beyond_outcrop: false,
            note: String::new(),
        };
        d.apply(Edit::SetBodyLateral {
            section: 0,
            base_bed: BedId(2),
            width_m: Some(120.0),
            beyond_outcrop: false,
        })
        .expect("width");
        assert_eq!(d.section().body_lateral, vec![record(2)]);
        d.apply(Edit::DeleteBed { bed: BedId(2) }).expect("delete");
        assert_eq!(d.section().body_lateral, vec![record(3)], "kept, on the bed that took its place");
        d.apply(Edit::MergeWithAbove { bed: BedId(1) }).expect("merge 1 with 3");
        assert_eq!(d.section().body_lateral, vec![record(1)], "kept, on the merged bed");
        assert!(d.undo() && d.undo());
        assert_eq!(d.section().body_lateral, vec![record(2)], "undo puts it back");
        assert!(d.undo());
        assert!(d.section().body_lateral.is_empty());
    }

    #[test]
    fn a_link_needs_an_accepted_boundary_and_survives_review_changes() {
        let mut d = doc_with_beds(3);
        let set = |label: &str| Edit::SetLink { bed: BedId(2), link: Some(label.into()) };
        assert!(d.apply(set("SB-2")).is_err(), "no decision yet");
        d.apply(Edit::SetReview { bed: BedId(2), state: ReviewState::Accepted, note: String::new() })
            .expect("accept");
        d.apply(set("SB ")).expect("link");
        d.apply(set("SB 2 ")).expect("link");
        assert_eq!(d.section().decision_for(BedId(2)).and_then(|r| r.link_label()), Some("SB 2"));
        let e = d.apply(set(&"x".repeat(41))).expect_err("too long");
        assert!(e.0.contains("at most 40"), "{e}");
        // Reopening keeps the label (kept, not drawn); removing it then drops the empty decision.
        d.apply(Edit::SetReview { bed: BedId(2), state: ReviewState::Candidate, note: String::new() })
            .expect("reopen");
        assert_eq!(d.section().decision_for(BedId(2)).and_then(|r| r.link_label()), Some("SB 2"));
        assert!(d.apply(set("SB-3")).is_err(), "a candidate cannot be relabelled");
        d.apply(Edit::SetLink { bed: BedId(2), link: Some("  ".into()) }).expect("blank removes");
        assert!(d.section().review.is_empty());
        // Each change is one undo step.
        assert!(d.undo());
        assert_eq!(d.section().decision_for(BedId(2)).and_then(|r| r.link_label()), Some("SB 2"));
    }

    #[test]
    fn curves_attach_replace_remove_and_undo() {
        use aggrade_core::model::IndexDirection;
        let mut d = doc_with_beds(2);
        let gr = MeasuredCurve {
            mnemonic: "GR".into(),
            unit: "API".into(),
            description: String::new(),
            source_file: "gr.las".into(),
            offset_m: 0.0,
            direction: IndexDirection::HeightAboveDatum,
            samples: vec![(0.0, Some(50.0)), (1.0, Some(70.0))],
        };
        d.apply(Edit::AttachCurve { curve: gr.clone() }).expect("attach");
        let mut again = gr.clone();
        again.samples.push((2.0, None));
        d.apply(Edit::AttachCurve { curve: again }).expect("replace");
        assert_eq!(d.section().curves.len(), 1, "same mnemonic replaces");
        assert_eq!(d.section().curves[0].samples.len(), 3);
        let mut unsorted = gr.clone();
        unsorted.mnemonic = "K".into();
        unsorted.samples.reverse();
        let e = d.apply(Edit::AttachCurve { curve: unsorted }).expect_err("unsorted refused");
        assert!(e.0.contains("curves[1].samples[1]"), "{e}");
        d.apply(Edit::RemoveCurve { mnemonic: "gr".into() }).expect("remove");
        assert!(d.section().curves.is_empty());
        assert!(d.apply(Edit::RemoveCurve { mnemonic: "GR".into() }).is_err());
        assert!(d.undo());
        assert_eq!(d.section().curves.len(), 1);
        assert!(d.undo());
        assert!(d.undo());
        assert!(d.section().curves.is_empty());
    }

    #[test]
    fn rule_parameters_are_the_projects_undoable_and_checked() {
        use aggrade_core::rules::RuleParams;
        let mut d = doc_with_beds(2);
        let wider = RuleParams { window_m: 20.0, ..RuleParams::default() }.changed();
        d.apply(Edit::SetRuleParams { params: wider.clone() }).expect("valid parameters");
        assert_eq!(d.project.rule_params, wider);
        assert_eq!(RuleParams::of_project(&d.project).map(|p| p.window_m), Ok(20.0));
        let bad: serde_json::Map<String, serde_json::Value> =
            [("window_m".to_string(), serde_json::json!(0.0))].into_iter().collect();
        let e = d.apply(Edit::SetRuleParams { params: bad }).expect_err("a window of 0 m");
        assert!(e.0.contains("window_m: got 0"), "{e}");
        assert_eq!(d.project.rule_params, wider, "a refused edit changes nothing");
        assert!(d.undo());
        assert!(d.project.rule_params.is_empty(), "undo restores the default rules");
        assert!(d.redo());
        assert_eq!(d.project.rule_params, wider);
    }

    #[test]
    fn the_sections_setting_is_one_undoable_edit_and_refuses_fixes_outside_the_section() {
        use aggrade_core::model::{BeddingAttitude, FixRole, GpsFix, MeasuringMethod, Traverse};
        let mut d = doc_with_beds(2); // 1 m + 2 m
        let fix = |height_m: f64, lat_deg: f64| GpsFix {
            role: FixRole::Top,
            height_m,
            lat_deg,
            lon_deg: 133.7,
            elevation_m: None,
            note: String::new(),
        };
        let set = |fixes: Vec<GpsFix>| Edit::SetSectionSetting {
            method: Some(MeasuringMethod::Tape),
            thickness_uncertainty_m: Some(0.05),
            bedding: Some(BeddingAttitude { dip_deg: 12.0, dip_direction_deg: 75.0 }),
            traverse: Some(Traverse { bearing_deg: 255.0, slope_deg: 10.0 }),
            fixes,
        };
        d.apply(set(vec![fix(3.0, -24.6)])).expect("valid");
        assert_eq!(d.section().method, Some(MeasuringMethod::Tape));
        assert_eq!(d.section().fixes.len(), 1);
        // WGS84 latitude lies within ±90°; a fix lies within the section (0 to 3 m here).
        let e = d.apply(set(vec![fix(3.5, -24.6)])).expect_err("above the top");
        assert!(e.0.contains("fixes[0].height_m"), "{e}");
        let e = d.apply(set(vec![fix(1.0, -91.0)])).expect_err("off the globe");
        assert!(e.0.contains("fixes[0].lat_deg"), "{e}");
        assert_eq!(d.section().fixes[0].height_m, 3.0, "a refused edit changes nothing");
        // A stored fix the section has since grown shorter than does not block other changes.
        d.apply(Edit::SplitBedAt { bed: BedId(2), lower_m: 1.0 }).expect("split");
        d.apply(Edit::DeleteBed { bed: BedId(3) }).expect("shorter: 2 m now");
        let mut keep = set(vec![fix(3.0, -24.6)]);
        if let Edit::SetSectionSetting { method, .. } = &mut keep {
            *method = Some(MeasuringMethod::JacobsStaff);
        }
        d.apply(keep).expect("the stored fix passes as it is");
        assert_eq!(d.section().method, Some(MeasuringMethod::JacobsStaff));
        assert!(d.undo() && d.undo() && d.undo());
        assert!(d.undo());
        assert_eq!((d.section().method, d.section().fixes.len()), (None, 0));
    }

    #[test]
    fn new_edit_after_undo_clears_redo() {
        let mut d = doc_with_beds(1);
        d.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 2.0 }).expect("valid");
        d.undo();
        assert!(d.can_redo());
        d.apply(Edit::SetThickness { bed: BedId(1), thickness_m: 3.0 }).expect("valid");
        assert!(!d.can_redo());
    }
}
