//! Column layout: turns a section and its interpretation into positioned items at a true scale.
//!
//! [`column_strip`] gives the whole column as one tall strip (for the screen); [`pages`] gives
//! printed pages. Both draw through the same [`column::ColumnCtx`], so the screen and the
//! printout show the same items.

pub mod clip;
pub mod column;
pub mod curve_track;
pub mod font;
pub mod items;
pub mod legend;
pub mod options;
pub mod page;
pub mod panel;
pub mod patterns;
pub mod sample;
pub mod spans;
pub mod strip;
pub mod style;
pub mod symbols;
pub mod text;
pub mod transform;

pub use column::{BedBox, Tracks, NO_GRAIN_SIZE_PHI};
pub use items::*;
pub use legend::{legend_entries, LegendEntry};
pub use options::{LayoutOptions, Orientation, Paper, PrintMeta};
pub use page::{pages, Page, PageSegment};
pub use panel::{panel_layout, panel_pages, Datum, PanelError, PanelLayout, PanelOptions};
pub use strip::{column_strip, column_strip_window, ColumnStrip};
pub use transform::{GrainScale, HeightTransform};
