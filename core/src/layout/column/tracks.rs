//! Where each track sits across a segment, and the grain-size scale of the lithology track.

use super::*;

/// Horizontal extent of one track, relative to the segment's left edge, mm.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Track {
    pub x_mm: f64,
    pub w_mm: f64,
}

/// Where each track sits across a segment (mm from the segment's left edge).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Tracks {
    pub axis: Track,
    pub lithology: Track,
    pub structures: Track,
    pub paleocurrents: Track,
    pub paleosols: Track,
    /// Field-record tracks, each only when the options ask for it and the section has something
    /// to show in it: bioturbation index, lithofacies code, samples, photographs, fossils.
    pub bioturbation: Option<Track>,
    pub facies: Option<Track>,
    pub samples: Option<Track>,
    pub photos: Option<Track>,
    pub fossils: Option<Track>,
    /// Interpretation tracks; `None` when interpretation is hidden.
    pub storeys: Option<Track>,
    pub bodies: Option<Track>,
    pub proportion: Option<Track>,
    pub regime: Option<Track>,
    pub boundary_labels: Option<Track>,
    /// Measured-curve tracks, right of all the others (none unless curves are attached).
    pub curves: CurveTracks,
    /// Total width of a segment, mm.
    pub width_mm: f64,
}

/// Grain scale geometry relative to the lithology track's left edge.
pub const GRAIN_MIN_WIDTH_MM: f64 = 4.0;
pub const GRAIN_CLASS_STEP_MM: f64 = 3.0;

/// Width and gap after each field-record track (bioturbation index, lithofacies, samples,
/// photographs, fossils), mm.
pub const RECORD_TRACKS_MM: [(f64, f64); 5] = [(5.5, 0.5), (6.0, 0.5), (16.0, 1.0), (16.0, 1.0), (18.0, 1.0)];

/// The least share of their width the labelled record tracks are narrowed to on paper.
pub const MIN_LABEL_FACTOR: f64 = 0.6;

/// Which field-record tracks a column has (bioturbation index, lithofacies, samples,
/// photographs, fossils).
pub type RecordShown = [bool; 5];

impl Tracks {
    /// The track layout for the options (interpretation tracks only when shown), without the
    /// field-record tracks (see [`Tracks::for_section`]).
    pub fn new(opts: &LayoutOptions) -> Self {
        Tracks::with_record(opts, [false; 5])
    }

    /// The track layout for a section: [`Tracks::new`] with each field-record track the options
    /// ask for and the section has something to show in (no empty tracks on the page).
    pub fn for_section(section: &Section, opts: &LayoutOptions) -> Self {
        Tracks::with_record(opts, super::record::record_shown(section, opts))
    }

    /// The track layout with the field-record tracks `record` says.
    pub fn with_record(opts: &LayoutOptions, record: RecordShown) -> Self {
        Tracks::with_record_sized(opts, record, 1.0)
    }

    /// [`Tracks::with_record`] with the labelled tracks (samples, photographs, fossils) at
    /// `label_factor` (at most 1) of their width, so that a column fits a page.
    pub fn with_record_sized(opts: &LayoutOptions, record: RecordShown, label_factor: f64) -> Self {
        // With the lithofacies track the default column is 134 mm wide, so A4 landscape (273 mm
        // between 12 mm margins) holds two segments side by side with the 4 mm gap.
        let rock = [
            (12.0, 1.0),
            (GRAIN_MIN_WIDTH_MM + GRAIN_CLASS_STEP_MM * 11.0, 2.0),
            (13.0, 0.5),
            (9.0, 0.5),
            (6.0, 1.0),
        ];
        let interpretation = [(3.5, 0.0), (9.0, 1.5), (11.0, 1.5), (6.5, 0.5), (12.0, 0.0)];
        let mut extra = [None; 5];
        let factor = label_factor.clamp(MIN_LABEL_FACTOR, 1.0);
        for (k, shown) in record.iter().enumerate() {
            let (w, gap) = RECORD_TRACKS_MM[k];
            extra[k] = shown.then_some((if k >= 2 { w * factor } else { w }, gap));
        }
        Tracks::stacked_with(rock, extra, opts.show_interpretation.then_some(interpretation))
    }

    /// Tracks laid left to right from (width, gap after it) in mm: the rock tracks (axis,
    /// lithology, structures, paleocurrents, paleosols), then the interpretation tracks (storeys,
    /// bodies, proportion, regime, boundary labels) when given; no curve tracks yet.
    pub fn stacked(rock: [(f64, f64); 5], interpretation: Option<[(f64, f64); 5]>) -> Self {
        Tracks::stacked_with(rock, [None; 5], interpretation)
    }

    /// [`Tracks::stacked`] with the field-record tracks given (bioturbation index, lithofacies,
    /// samples, photographs, fossils) between the rock and the interpretation tracks.
    pub fn stacked_with(
        rock: [(f64, f64); 5],
        record: [Option<(f64, f64)>; 5],
        interpretation: Option<[(f64, f64); 5]>,
    ) -> Self {
        let mut x = 0.0;
        let mut take = |(w, gap): (f64, f64)| {
            let t = Track { x_mm: x, w_mm: w };
            x += w + gap;
            t
        };
        let [axis, lithology, structures, paleocurrents, paleosols] = rock.map(&mut take);
        let [bioturbation, facies, samples, photos, fossils] = record.map(|r| r.map(&mut take));
        let [storeys, bodies, proportion, regime, boundary_labels] = match interpretation {
            Some(widths) => widths.map(|w| Some(take(w))),
            None => [None; 5],
        };
        Tracks {
            axis,
            lithology,
            structures,
            paleocurrents,
            paleosols,
            bioturbation,
            facies,
            samples,
            photos,
            fossils,
            storeys,
            bodies,
            proportion,
            regime,
            boundary_labels,
            curves: CurveTracks::none(x),
            width_mm: x,
        }
    }

    /// The same tracks with `count` measured-curve tracks added on the right.
    pub fn with_curves(mut self, count: usize) -> Self {
        self.width_mm -= self.curves.width_mm();
        self.curves = CurveTracks { x_mm: self.curves.x_mm, count };
        self.width_mm += self.curves.width_mm();
        self
    }

    /// The grain scale of a segment whose left edge is at `x0_mm`.
    pub fn grain_scale(&self, x0_mm: f64) -> GrainScale {
        GrainScale {
            left_mm: x0_mm + self.lithology.x_mm,
            min_width_mm: GRAIN_MIN_WIDTH_MM,
            class_step_mm: GRAIN_CLASS_STEP_MM,
        }
    }

    /// Total width of the labelled record tracks (samples, photographs, fossils), mm.
    pub fn label_tracks_mm(&self) -> f64 {
        [self.samples, self.photos, self.fossils].iter().flatten().map(|t| t.w_mm).sum()
    }

    /// From the left edge of the first record track of words (lithofacies codes, samples,
    /// photographs, fossils) to the right edge of the last, mm from the segment's left edge;
    /// `None` without them.
    pub fn words_tracks_span(&self) -> Option<(f64, f64)> {
        let shown: Vec<Track> =
            [self.facies, self.samples, self.photos, self.fossils].into_iter().flatten().collect();
        Some((shown.first()?.x_mm, shown.last().map(|t| t.x_mm + t.w_mm)?))
    }

    /// The field-record tracks a column has, in [`RecordShown`] order.
    pub fn record_shown(&self) -> RecordShown {
        [self.bioturbation, self.facies, self.samples, self.photos, self.fossils].map(|t| t.is_some())
    }

    /// Right edge (relative) of the last track a boundary line crosses.
    pub(super) fn boundary_line_end(&self) -> f64 {
        self.regime.map(|t| t.x_mm + t.w_mm).unwrap_or(self.paleosols.x_mm + self.paleosols.w_mm)
    }
}
