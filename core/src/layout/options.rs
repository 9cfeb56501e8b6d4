//! What the user chooses for a printout or the screen column: scale, paper, orientation, options.

use serde::Serialize;

/// Paper sizes for printing.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum Paper {
    /// ISO 216 A4, 210 × 297 mm.
    A4,
    /// ISO 216 A3, 297 × 420 mm.
    A3,
    /// US Letter, 8.5 × 11 in (215.9 × 279.4 mm).
    Letter,
    /// One page as tall as the whole column needs (width as A4 or wider if the column needs it).
    TallSingle,
}

impl Paper {
    /// Portrait width and height in mm; `None` for [`Paper::TallSingle`], whose height follows
    /// the section. Sizes from ISO 216 (A series) and ANSI/ASME Y14.1 (Letter).
    pub fn portrait_mm(self) -> Option<(f64, f64)> {
        match self {
            Paper::A4 => Some((210.0, 297.0)),
            Paper::A3 => Some((297.0, 420.0)),
            Paper::Letter => Some((215.9, 279.4)),
            Paper::TallSingle => None,
        }
    }

    /// Parse `a4`, `a3`, `letter`, `tall` (case-insensitive).
    pub fn parse(text: &str) -> Option<Self> {
        match text.trim().to_ascii_lowercase().as_str() {
            "a4" => Some(Paper::A4),
            "a3" => Some(Paper::A3),
            "letter" | "us-letter" | "us_letter" => Some(Paper::Letter),
            "tall" | "tall-single" | "single" => Some(Paper::TallSingle),
            _ => None,
        }
    }

    /// Name as shown to the user.
    pub fn name(self) -> &'static str {
        match self {
            Paper::A4 => "A4",
            Paper::A3 => "A3",
            Paper::Letter => "US Letter",
            Paper::TallSingle => "tall single page",
        }
    }
}

/// Page orientation.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum Orientation {
    Portrait,
    Landscape,
}

/// Choices for laying out a column.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LayoutOptions {
    /// N of the vertical scale 1:N (100 means 1 m of section = 10 mm on paper). Must be > 0.
    pub scale_denominator: f64,
    pub paper: Paper,
    pub orientation: Orientation,
    /// Draw sequence-boundary candidates the geologist rejected (greyed); hidden by default.
    pub show_rejected: bool,
    /// Page margin on every side, mm.
    pub margin_mm: f64,
    /// Draw the interpretation tracks (storeys, bodies, proportion, regimes, boundaries).
    pub show_interpretation: bool,
    /// A track of each bed's lithofacies code: the geologist's, else the suggested one (grey,
    /// with "?"). On by default.
    pub show_facies: bool,
    /// Samples marked at their heights with their ids beside the column. On by default.
    pub show_sample_ids: bool,
    /// Photographs marked at their beds with their references. Off by default.
    pub show_photos: bool,
    /// A track of the bioturbation index (0–6, Taylor & Goldring 1993). Off by default.
    pub show_bioturbation: bool,
    /// Trace and body fossils marked at their beds with their names. Off by default.
    pub show_fossils: bool,
}

impl Default for LayoutOptions {
    fn default() -> Self {
        LayoutOptions {
            scale_denominator: 100.0,
            paper: Paper::A4,
            orientation: Orientation::Portrait,
            show_rejected: false,
            margin_mm: 12.0,
            show_interpretation: true,
            show_facies: true,
            show_sample_ids: true,
            show_photos: false,
            show_bioturbation: false,
            show_fossils: false,
        }
    }
}

impl LayoutOptions {
    /// The scale denominator, or 100 if the stored one is not a positive finite number (so that a
    /// bad value can never divide by zero; the CLI and GUI reject such values before this).
    pub fn scale(&self) -> f64 {
        if self.scale_denominator.is_finite() && self.scale_denominator > 0.0 {
            self.scale_denominator
        } else {
            100.0
        }
    }

    /// Page width and height in mm for the paper and orientation (`None` for a tall single page).
    pub fn page_size_mm(&self) -> Option<(f64, f64)> {
        let (w, h) = self.paper.portrait_mm()?;
        Some(match self.orientation {
            Orientation::Portrait => (w, h),
            Orientation::Landscape => (h, w),
        })
    }

    /// The same options with no field-record track (lithofacies, samples, photographs,
    /// bioturbation, fossils): for drawings that have no room for them, such as the
    /// correlation panel's narrow columns.
    pub fn without_record(&self) -> Self {
        LayoutOptions {
            show_facies: false,
            show_sample_ids: false,
            show_photos: false,
            show_bioturbation: false,
            show_fossils: false,
            ..self.clone()
        }
    }

    /// Scale as printed, "1:100".
    pub fn scale_label(&self) -> String {
        let s = self.scale();
        if (s - s.round()).abs() < 1e-9 {
            format!("1:{}", s.round() as i64)
        } else {
            format!("1:{s:.2}")
        }
    }
}

/// Facts about the printout that are not in the section (passed in, so output is reproducible).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct PrintMeta {
    /// Date printed on the page, e.g. "2026-12-01" (empty: not printed).
    pub printed_on: String,
    /// Free line under the header, e.g. the project file name (empty: none).
    pub subtitle: String,
}
