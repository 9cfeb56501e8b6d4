//! Column layout: turns a section and its interpretation into positioned items at a true scale.
//!
//! Takes a [`Section`](crate::model::Section), its
//! [`Interpretation`](crate::rules::Interpretation) and [`LayoutOptions`] (scale, paper,
//! orientation, what to show); gives [`Item`]s in millimetres (rectangles, polygons, lines,
//! circles, text), which the screen and the writers in [`crate::export`] only translate.
//!
//! - [`column_strip`] gives the whole column as one tall strip (for the screen); [`pages`] gives
//!   printed pages. Both draw through the same column drawing (`column.rs`: axis, beds with
//!   their lithology patterns and grain-size profile, structures, paleocurrents, paleosols, the
//!   interpretation tracks and measured curves), so the screen and the printout show the same
//!   items.
//! - [`panel_layout`] sets a project's sections side by side as a correlation panel, spaced by
//!   distance and hung on a datum, with tie lines (`panel/`: positions and scale, markers and
//!   ties, notes, drawing).
//! - Text is measured with the embedded font's own advance widths (`font.rs`), the font every
//!   PDF embeds, so a width measured here is the width printed.
//!
//! The modules are private; what other stages use is re-exported here.

mod clip;
mod column;
mod curve_track;
mod font;
mod items;
mod legend;
mod options;
mod page;
mod panel;
mod patterns;
#[cfg(any(test, feature = "sample-data"))]
pub mod sample;
mod spans;
mod strip;
mod style;
mod symbols;
mod text;
mod transform;

pub use column::{
    column_help_at, column_tracks, BedBox, Pointed, Track, TrackKind, Tracks, NO_GRAIN_SIZE_PHI,
};
pub use curve_track::CURVE_COLOURS;
pub(crate) use font::{metrics, text_width_mm, DEJAVU_SANS, MM_PER_PT};
pub use items::*;
pub use legend::{column_legend, draw_swatch, legend_entries, LegendEntry};
pub use options::{LayoutOptions, Orientation, Paper, PrintMeta};
pub use page::{page_stream, pages, Page, PageSegment, PageStream};
pub use panel::{
    haversine_m, panel_layout, panel_layout_in_pieces, panel_pages, panel_positions, section_markers, Datum,
    HorizontalScale, Marker, PanelColumn, PanelError, PanelLayout, PanelOptions, PanelSink, PositionSource,
    Positions, SectionMarkers, TieLine, DATUM_BLUE, EARTH_MEAN_RADIUS_M, FLAG_ORANGE, LINK_TEAL, TIE_VIOLET,
};
pub use strip::{column_strip, column_strip_window, ColumnStrip};
pub use style::lithology_tint;
pub use transform::{GrainScale, HeightTransform};
