//! What the view windows share: the frame's context handed to them, what they report back, and
//! number and table formatting.

use crate::gui::chooser::Chooser;
use aggrade_core::model::Project;
use aggrade_core::rules::Interpretation;

/// What the views need from the window this frame.
pub struct ViewCtx<'a> {
    pub project: &'a Project,
    /// `interps[i]` interprets `project.sections[i]`.
    pub interps: &'a [Interpretation],
    /// The selected section's interpretation marked by a stability check, while the document is
    /// as it was checked.
    pub stability: Option<&'a Interpretation>,
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
    /// An edit of the document (a body's width typed in the body table).
    pub edit: Option<crate::gui::document::Edit>,
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

/// An optional proportion (0–1) as a whole percentage ("21 %"), or "n/a".
pub fn fmt_percent(p: Option<f64>) -> String {
    p.map(|p| format!("{:.0} %", 100.0 * p)).unwrap_or_else(|| "n/a".into())
}

pub use crate::cli::stats::counted;

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
    ui.label(egui::RichText::new(aggrade_core::REVIEW_CAUTION).small().color(crate::gui::theme::WARN));
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn p_values_small_and_ordinary() {
        assert_eq!(fmt_p(0.00002), "< 0.0001");
        assert_eq!(fmt_p(0.01234), "0.0123");
        assert_eq!(fmt_proportion(None), "n/a");
        assert_eq!(fmt_proportion(Some(0.4567)), "0.457");
        assert_eq!(fmt_percent(Some(0.4567)), "46 %");
        assert_eq!(fmt_percent(None), "n/a");
        assert_eq!(counted(1, "section", "sections"), "1 section");
        assert_eq!(counted(0, "section", "sections"), "0 sections");
        assert_eq!(counted(2, "reading", "readings"), "2 readings");
    }
}
