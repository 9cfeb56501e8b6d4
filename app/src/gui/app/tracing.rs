//! The trace window beside the column: opening a sheet image on the selected section (Section ▸
//! Trace from image…), bringing it back for a section saved with a sheet, and applying its edits.

use super::{AggradeApp, Notice};
use crate::gui::chooser::{FileKind, PickFor};
use crate::gui::document::Edit;
use crate::gui::trace::{self as trace_view, TraceView};
use aggrade_core::trace::sheet::{relative_image_path, resolve_image_path};
use aggrade_core::trace::TraceSheet;
use std::path::{Path, PathBuf};

/// The trace window and what it was last checked against.
#[derive(Default)]
pub(super) struct Tracing {
    /// The open trace window, if any.
    pub(super) view: Option<TraceView>,
    /// The project file, section and stored image the window was last matched with; checked
    /// again whenever one of them changes.
    pub(super) checked: Option<(Option<PathBuf>, usize, Option<String>)>,
}

impl AggradeApp {
    /// Ask for a sheet image and open the trace window on it (Section ▸ Trace from image…).
    pub fn pick_trace_image(&mut self) {
        if let Some(path) = self.chooser.pick(PickFor::TraceImage, FileKind::Image, "") {
            self.open_trace_image(&path);
        }
    }

    /// Is the trace window open?
    pub fn trace_window_open(&self) -> bool {
        self.tracing.view.is_some()
    }

    /// Put the image behind the selected section (keeping its calibration when it is the same
    /// image) and open the trace window; an unreadable image gives the reader's message.
    pub fn open_trace_image(&mut self, path: &Path) {
        match TraceView::open(path) {
            Ok(view) => {
                let stored = match &self.doc.path {
                    Some(project) => relative_image_path(project, path),
                    None => path.to_string_lossy().replace('\\', "/"),
                };
                let old = self.doc.section().trace.clone();
                let sheet = old
                    .clone()
                    .filter(|t| t.image == stored)
                    .unwrap_or_else(|| TraceSheet::new(stored.clone()));
                if old.as_ref() != Some(&sheet) {
                    self.apply(Edit::SetTrace { trace: Some(sheet) });
                }
                self.tracing.checked = Some((self.doc.path.clone(), self.doc.selected_section, Some(stored)));
                self.tracing.view = Some(view);
                self.status = format!("Tracing {}: set the height scale, then trace", path.display());
            }
            Err(e) => {
                self.message = Some(Notice::about_file("Could not open the sheet image", e.to_string(), path))
            }
        }
    }

    /// Open the trace window again on the section's sheet (checked next frame: the window
    /// opens, or the missing image is reported).
    pub(super) fn show_traced_sheet(&mut self) {
        self.tracing.checked = None;
    }

    /// Bring the trace window back for a section saved with a sheet (after opening a project or
    /// choosing another section); a missing image is reported and the calibration kept.
    fn restore_trace(&mut self) {
        let stored = self.doc.section().trace.as_ref().map(|t| t.image.clone());
        let key = (self.doc.path.clone(), self.doc.selected_section, stored.clone());
        if self.tracing.checked.as_ref() == Some(&key) {
            return;
        }
        self.tracing.checked = Some(key);
        let Some(stored) = stored else {
            self.tracing.view = None;
            return;
        };
        let path = resolve_image_path(self.doc.path.as_deref(), &stored);
        if self.tracing.view.as_ref().is_some_and(|v| v.image_path == path) {
            return;
        }
        match TraceView::open(&path) {
            Ok(view) => self.tracing.view = Some(view),
            Err(e) => {
                self.tracing.view = None;
                self.status = format!("Sheet image not shown: {e}");
                self.message =
                    Some(Notice::about_file("The traced sheet's image is not shown", e.to_string(), &path));
            }
        }
    }

    /// Draw the trace window (when open) and apply what it asks.
    pub(super) fn trace_ui(&mut self, ctx: &egui::Context) {
        self.restore_trace();
        if let Some(view) = self.tracing.view.as_mut() {
            match view.ui(ctx, self.doc.section()) {
                trace_view::Outcome::Open => {}
                trace_view::Outcome::Closed => self.tracing.view = None,
                trace_view::Outcome::Apply(edit, gesture) => {
                    if let Err(e) = self.doc.apply_in_gesture(*edit, gesture) {
                        view.note = format!("Not changed: {e}");
                    }
                }
            }
        }
    }
}
