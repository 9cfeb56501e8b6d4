//! What panels ask for during a frame; the app applies it in one place after drawing.

use super::document::Edit;
use aggrade_core::model::BedId;

/// Requests collected from the panels in one frame.
#[derive(Debug, Default)]
pub struct Actions {
    /// Edits, each with the gesture it belongs to (same gesture = one undo step).
    pub edits: Vec<(Edit, Option<u64>)>,
    /// Change the selected bed.
    pub select: Option<Option<BedId>>,
    /// A drag or typing run ended.
    pub end_gesture: bool,
    /// Scroll the canvas so this height (m) is in view.
    pub scroll_to_height_m: Option<f64>,
    /// Run the stability check on the selected section.
    pub check_stability: bool,
}

impl Actions {
    /// Queue an edit that is its own undo step.
    pub fn edit(&mut self, e: Edit) {
        self.edits.push((e, None));
    }
    /// Queue an edit belonging to a gesture.
    pub fn edit_in(&mut self, e: Edit, gesture: u64) {
        self.edits.push((e, Some(gesture)));
    }
}

/// A stable gesture key from a few parts.
pub fn gesture_key(parts: impl std::hash::Hash) -> u64 {
    use std::hash::{BuildHasher, BuildHasherDefault, DefaultHasher};
    BuildHasherDefault::<DefaultHasher>::default().hash_one(parts)
}
