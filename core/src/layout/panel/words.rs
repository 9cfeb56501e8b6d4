//! Small wording pieces the panel's notes, markers and drawing share: counts with their noun and
//! heights in a section's display unit.

use crate::model::{LengthUnit, Section};

/// The unit a section's heights are written in on the panel: feet for a section logged in feet,
/// else metres (a centimetre section's heights read best in metres).
pub(super) fn height_unit(section: &Section) -> LengthUnit {
    match section.display_unit {
        LengthUnit::Foot => LengthUnit::Foot,
        _ => LengthUnit::Metre,
    }
}

/// A count with its noun in the right number: "1 section", "0 sections".
pub(super) fn counted(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

/// A height (m) of `section` as written on the panel: "24.60 m", "80.71 ft".
pub(super) fn height_text(section: &Section, height_m: f64) -> String {
    height_unit(section).length(height_m).to_string()
}
