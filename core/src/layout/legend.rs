//! The legend: only the patterns, lines and symbols a printout actually uses.

use super::column::{
    boundary_style, draw_contact, facies_colour, paleosol_bar_mm, shown_facies, stacking_code,
    stacking_words, surface_name, ColumnCtx, Glyph, ICHNO_MM_PER_GRADE, ICHNO_OLIVE,
};
use super::items::{Item, PtMm, RectMm};
use super::options::LayoutOptions;
use super::patterns::fill_bed;
use super::style::*;
use super::symbols::{paleocurrent_arrow, paleocurrent_rose, structure_symbol};
use super::text::{fit_size, text};
use crate::model::{Contact, Lithology, PaleosolDevelopment, ReviewState, Section, Structure};
use crate::rules::{Interpretation, Regime, Stacking, Strength};
use serde::Serialize;

/// One line of the legend.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum LegendEntry {
    Lithology(Lithology),
    Contact(Contact),
    Structure(Structure),
    PaleocurrentArrow,
    PaleocurrentRose,
    Paleosol(PaleosolDevelopment),
    /// The bioturbation-index bar.
    Bioturbation,
    /// A lithofacies code the geologist gave.
    FaciesGiven,
    /// A suggested lithofacies code (grey, "?"): a candidate for the geologist's review.
    FaciesSuggested,
    Sample,
    Photo,
    TraceFossil,
    BodyFossil,
    Storey,
    Body(Stacking),
    /// A channel body with an end not seen (open bracket end, "≥" thickness).
    CensoredBody,
    ProportionCurve,
    IntervalProportion,
    Regime(Regime),
    Boundary(ReviewState),
    /// An unreviewed candidate boundary of a strength class (its line is thicker the stronger).
    BoundaryStrength(Strength),
    /// A surface the geologist named at a bed base, printed by its name.
    NamedSurface,
}

/// Width of one legend column, mm.
pub const LEGEND_COLUMN_MM: f64 = 46.0;
/// Height of one legend row, mm.
pub const LEGEND_ROW_MM: f64 = 4.4;

impl LegendEntry {
    /// Order in the legend: rock first, then lines and symbols, then interpretation.
    pub fn sort_key(self) -> (u8, usize) {
        match self {
            LegendEntry::Lithology(l) => (0, l as usize),
            LegendEntry::Contact(c) => (1, c as usize),
            LegendEntry::Structure(s) => (2, s as usize),
            LegendEntry::PaleocurrentArrow => (3, 0),
            LegendEntry::PaleocurrentRose => (3, 1),
            LegendEntry::Paleosol(d) => (4, d as usize),
            LegendEntry::Bioturbation => (4, 10),
            LegendEntry::FaciesGiven => (4, 11),
            LegendEntry::FaciesSuggested => (4, 12),
            LegendEntry::Sample => (4, 13),
            LegendEntry::Photo => (4, 14),
            LegendEntry::TraceFossil => (4, 15),
            LegendEntry::BodyFossil => (4, 16),
            LegendEntry::Storey => (5, 0),
            LegendEntry::Body(b) => (6, b as usize),
            LegendEntry::CensoredBody => (6, 9),
            LegendEntry::ProportionCurve => (7, 0),
            LegendEntry::IntervalProportion => (7, 1),
            LegendEntry::Regime(r) => (8, r as usize),
            LegendEntry::Boundary(b) => (9, b as usize * 10),
            LegendEntry::BoundaryStrength(s) => (9, 1 + s as usize),
            LegendEntry::NamedSurface => (10, 0),
        }
    }

    /// The words printed beside the swatch.
    pub fn label(self) -> String {
        match self {
            LegendEntry::Lithology(Lithology::Covered) => "covered (no exposure)".into(),
            LegendEntry::Lithology(l) => l.name().into(),
            LegendEntry::Contact(c) => format!("{} contact", c.name()),
            LegendEntry::Structure(s) => s.name().into(),
            LegendEntry::PaleocurrentArrow => "paleocurrent (north up)".into(),
            LegendEntry::PaleocurrentRose => "paleocurrent rose, 30\u{b0} sectors".into(),
            LegendEntry::Paleosol(d) => format!("paleosol, {}", d.name()),
            LegendEntry::Bioturbation => "bioturbation index 0\u{2013}6 (bar)".into(),
            LegendEntry::FaciesGiven => "lithofacies code you gave".into(),
            LegendEntry::FaciesSuggested => "suggested code: for your review".into(),
            LegendEntry::Sample => "sample, with its id".into(),
            LegendEntry::Photo => "photograph, with its reference".into(),
            LegendEntry::TraceFossil => "trace fossils, named".into(),
            LegendEntry::BodyFossil => "body fossils, named".into(),
            LegendEntry::Storey => "storey (one channel fill)".into(),
            LegendEntry::Body(st @ Stacking::MultiStory) => {
                format!("{} channel body: {} \u{b7} n storeys", stacking_words(st), stacking_code(st))
            }
            LegendEntry::Body(st @ Stacking::SingleStory) => {
                format!("{} channel body ({})", stacking_words(st), stacking_code(st))
            }
            LegendEntry::Body(st @ Stacking::Undetermined) => {
                format!("channel body, 1 storey seen ({})", stacking_code(st))
            }
            LegendEntry::CensoredBody => "body end not seen: thickness \u{2265}".into(),
            LegendEntry::ProportionCurve => "channel-body proportion (window)".into(),
            LegendEntry::IntervalProportion => "proportion per interval".into(),
            LegendEntry::Regime(Regime::Low) => "low accommodation".into(),
            LegendEntry::Regime(Regime::High) => "high accommodation".into(),
            LegendEntry::Regime(Regime::Undetermined) => "accommodation undetermined".into(),
            LegendEntry::Boundary(ReviewState::Candidate) => "SB? candidate boundary, unreviewed".into(),
            LegendEntry::Boundary(ReviewState::Accepted) => "SB boundary accepted".into(),
            LegendEntry::Boundary(ReviewState::Rejected) => "rej. boundary rejected".into(),
            LegendEntry::BoundaryStrength(s) => format!("SB? with {} evidence", s.name()),
            LegendEntry::NamedSurface => "named surface at a bed base".into(),
        }
    }
}

/// The entries a column uses, sorted and without repeats.
pub fn legend_entries(ctx: &ColumnCtx<'_>) -> Vec<LegendEntry> {
    let mut v = Vec::new();
    for (i, bed) in ctx.section.beds.iter().enumerate() {
        if !bed.has_usable_thickness() {
            continue;
        }
        v.push(LegendEntry::Lithology(bed.lithology));
        if i > 0 {
            v.push(LegendEntry::Contact(bed.base_contact));
        }
        v.extend(bed.structures.iter().map(|s| LegendEntry::Structure(*s)));
        let n = bed.flow_azimuths().filter(|a| a.is_finite()).count();
        if n >= 4 {
            v.push(LegendEntry::PaleocurrentRose);
        } else if n > 0 {
            v.push(LegendEntry::PaleocurrentArrow);
        }
        if bed.paleosol != PaleosolDevelopment::None && !ctx.in_profile.get(i).copied().unwrap_or(false) {
            v.push(LegendEntry::Paleosol(bed.paleosol));
        }
    }
    let tr = ctx.tracks;
    let beds = || ctx.section.beds.iter().filter(|b| b.has_usable_thickness());
    if tr.bioturbation.is_some() {
        v.push(LegendEntry::Bioturbation);
    }
    if tr.facies.is_some() {
        // Both kinds are usually met within a few beds: stop looking once both are.
        let (mut given, mut suggested) = (false, false);
        for f in beds().filter_map(shown_facies) {
            given |= !f.suggested;
            suggested |= f.suggested;
            if given && suggested {
                break;
            }
        }
        v.extend(given.then_some(LegendEntry::FaciesGiven));
        v.extend(suggested.then_some(LegendEntry::FaciesSuggested));
    }
    if tr.samples.is_some() {
        v.push(LegendEntry::Sample);
    }
    if tr.photos.is_some() {
        v.push(LegendEntry::Photo);
    }
    if tr.fossils.is_some() {
        if beds().any(|b| b.trace_fossils.iter().any(|n| !n.trim().is_empty())) {
            v.push(LegendEntry::TraceFossil);
        }
        if beds().any(|b| b.body_fossils.iter().any(|n| !n.trim().is_empty())) {
            v.push(LegendEntry::BodyFossil);
        }
    }
    // Profiles are drawn at their maturity.
    v.extend(ctx.interp.paleosols.iter().map(|p| LegendEntry::Paleosol(p.maturity)));
    if ctx.opts.show_interpretation {
        let it = ctx.interp;
        if !it.storeys.is_empty() {
            v.push(LegendEntry::Storey);
        }
        v.extend(it.channel_bodies.iter().map(|b| LegendEntry::Body(b.stacking)));
        if it.channel_bodies.iter().any(|b| b.is_censored()) {
            v.push(LegendEntry::CensoredBody);
        }
        if it.proportion_curve.iter().any(|p| p.proportion.is_some()) {
            v.push(LegendEntry::ProportionCurve);
        }
        if it.interval_proportions.iter().any(|p| p.proportion.is_some()) {
            v.push(LegendEntry::IntervalProportion);
        }
        v.extend(it.accommodation.iter().map(|r| LegendEntry::Regime(r.regime)));
        let shown: Vec<_> = it
            .sequence_boundary_candidates
            .iter()
            .filter(|c| ctx.opts.show_rejected || c.review != ReviewState::Rejected)
            .collect();
        v.extend(shown.iter().map(|c| LegendEntry::Boundary(c.review)));
        v.extend(
            shown
                .iter()
                .filter(|c| c.review == ReviewState::Candidate)
                .map(|c| LegendEntry::BoundaryStrength(c.strength)),
        );
        let labelled = |i: usize| shown.iter().any(|c| c.bed_index == i);
        if ctx.section.beds.iter().enumerate().any(|(i, b)| surface_name(b).is_some() && !labelled(i)) {
            v.push(LegendEntry::NamedSurface);
        }
    } else if ctx.section.beds.iter().any(|b| surface_name(b).is_some()) {
        v.push(LegendEntry::NamedSurface);
    }
    v.sort_by_key(|e| e.sort_key());
    v.dedup();
    v
}

/// The entries the column of `section` uses, laid out with `opts` (the screen legend lists
/// exactly what the printed one would).
pub fn column_legend(section: &Section, interp: &Interpretation, opts: &LayoutOptions) -> Vec<LegendEntry> {
    legend_entries(&ColumnCtx::new(section, interp, opts))
}

/// Height (mm) the legend takes in a given width.
pub fn legend_height_mm(n_entries: usize, width_mm: f64) -> f64 {
    if n_entries == 0 {
        return 0.0;
    }
    let cols = ((width_mm / LEGEND_COLUMN_MM).floor() as usize).max(1);
    let rows = n_entries.div_ceil(cols);
    6.0 + rows as f64 * LEGEND_ROW_MM
}

/// Draw the legend with its top-left at (x, y), flowing down columns; returns its height.
pub fn draw_legend(entries: &[LegendEntry], x: f64, y: f64, width_mm: f64, out: &mut Vec<Item>) -> f64 {
    if entries.is_empty() {
        return 0.0;
    }
    text(out, x, y + 3.0, "Legend", TEXT_PT + 0.5, INK);
    let cols = ((width_mm / LEGEND_COLUMN_MM).floor() as usize).max(1);
    let rows = entries.len().div_ceil(cols);
    for (k, e) in entries.iter().enumerate() {
        let (col, row) = (k / rows, k % rows);
        let sx = x + col as f64 * LEGEND_COLUMN_MM;
        let sy = y + 6.0 + row as f64 * LEGEND_ROW_MM;
        draw_swatch(*e, RectMm { x: sx, y: sy, w: 8.0, h: 3.4 }, out);
        let label = e.label();
        let size = fit_size(&label, LEGEND_COLUMN_MM - 11.0, SMALL_PT + 0.5, 4.0).unwrap_or(4.0);
        text(out, sx + 10.0, sy + 2.7, &label, size, INK);
    }
    legend_height_mm(entries.len(), width_mm)
}

/// The sample drawn beside an entry's words, in the rectangle `r` (8 × 3.4 mm on paper).
pub fn draw_swatch(e: LegendEntry, r: RectMm, out: &mut Vec<Item>) {
    let mid = PtMm { x: r.x + r.w / 2.0, y: r.y + r.h / 2.0 };
    match e {
        LegendEntry::Lithology(l) => {
            let outline = [
                PtMm { x: r.x, y: r.y + r.h },
                PtMm { x: r.x + r.w, y: r.y + r.h },
                PtMm { x: r.x + r.w, y: r.y },
                PtMm { x: r.x, y: r.y },
            ];
            fill_bed(l, &outline, PtMm { x: r.x, y: r.y }, out);
            out.push(Item::Rect { rect: r, fill: None, stroke: Some(solid(THIN_MM, INK)) });
        }
        LegendEntry::Contact(c) => draw_contact(c, r.x, r.x + r.w, mid.y, out),
        LegendEntry::Structure(s) => structure_symbol(s, mid, 3.6, out),
        LegendEntry::PaleocurrentArrow => paleocurrent_arrow(mid, 45.0, 3.6, INK, out),
        LegendEntry::PaleocurrentRose => {
            paleocurrent_rose(mid, &[20.0, 35.0, 50.0, 55.0, 80.0, 110.0], 1.9, out)
        }
        LegendEntry::Paleosol(d) => out.push(Item::Rect {
            rect: RectMm { x: r.x + 0.5, y: r.y, w: paleosol_bar_mm(d), h: r.h },
            fill: Some(PALEOSOL_BROWN),
            stroke: None,
        }),
        LegendEntry::Bioturbation => out.push(Item::Rect {
            rect: RectMm { x: r.x + 0.5, y: r.y, w: 3.0 * ICHNO_MM_PER_GRADE, h: r.h },
            fill: Some(ICHNO_OLIVE),
            stroke: None,
        }),
        LegendEntry::FaciesGiven | LegendEntry::FaciesSuggested => {
            let suggested = e == LegendEntry::FaciesSuggested;
            let code = if suggested { "St?" } else { "St" };
            text(out, r.x + 0.5, mid.y + 0.9, code, SMALL_PT + 0.5, facies_colour(suggested));
        }
        LegendEntry::Sample | LegendEntry::Photo | LegendEntry::TraceFossil | LegendEntry::BodyFossil => {
            let g = match e {
                LegendEntry::Sample => Glyph::Sample,
                LegendEntry::Photo => Glyph::Photo,
                LegendEntry::TraceFossil => Glyph::Trace,
                _ => Glyph::Body,
            };
            g.draw(r.x + 0.5, mid.y, out);
        }
        LegendEntry::Storey | LegendEntry::Body(_) => {
            let (w, label) = match e {
                LegendEntry::Body(st) => (LINE_MM * 1.4, Some(stacking_code(st))),
                _ => (THIN_MM, None),
            };
            let x = r.x + 2.5;
            out.push(Item::Polyline {
                points: vec![
                    PtMm { x: x - 1.2, y: r.y },
                    PtMm { x, y: r.y },
                    PtMm { x, y: r.y + r.h },
                    PtMm { x: x - 1.2, y: r.y + r.h },
                ],
                stroke: solid(w, BODY_BLUE),
            });
            if let Some(l) = label {
                text(out, x + 1.2, r.y + 2.9, l, SMALL_PT, BODY_BLUE);
            }
        }
        LegendEntry::CensoredBody => {
            let x = r.x + 2.5;
            super::column::body_bracket(
                x,
                r.y + r.h,
                r.y + 1.2,
                (super::column::BracketEnd::Tick, super::column::BracketEnd::Open),
                1.2,
                LINE_MM * 1.4,
                out,
            );
        }
        LegendEntry::ProportionCurve => out.push(Item::Polyline {
            points: vec![
                PtMm { x: r.x + 2.0, y: r.y + r.h },
                PtMm { x: r.x + 6.0, y: r.y + r.h * 0.5 },
                PtMm { x: r.x + 4.0, y: r.y },
            ],
            stroke: solid(THIN_MM * 2.0, CURVE_GREEN),
        }),
        LegendEntry::IntervalProportion => out.push(Item::Polyline {
            points: vec![PtMm { x: mid.x, y: r.y }, PtMm { x: mid.x, y: r.y + r.h }],
            stroke: dashed(THIN_MM * 1.5, super::items::Rgba(120, 170, 140, 255), &[1.2, 0.6]),
        }),
        LegendEntry::Regime(g) => out.push(Item::Rect {
            rect: r,
            fill: Some(match g {
                Regime::Low => REGIME_LOW,
                Regime::High => REGIME_HIGH,
                Regime::Undetermined => REGIME_UNDETERMINED,
            }),
            stroke: Some(solid(HAIR_MM, GREY)),
        }),
        LegendEntry::Boundary(state) => {
            let (stroke, _, _) = boundary_style(state, Strength::Moderate, None);
            out.push(Item::Polyline {
                points: vec![PtMm { x: r.x, y: mid.y }, PtMm { x: r.x + r.w, y: mid.y }],
                stroke,
            });
        }
        LegendEntry::BoundaryStrength(s) => {
            let (stroke, _, _) = boundary_style(ReviewState::Candidate, s, None);
            out.push(Item::Polyline {
                points: vec![PtMm { x: r.x, y: mid.y }, PtMm { x: r.x + r.w, y: mid.y }],
                stroke,
            });
        }
        LegendEntry::NamedSurface => {
            out.push(Item::Polyline {
                points: vec![PtMm { x: r.x, y: mid.y }, PtMm { x: r.x + 1.2, y: mid.y }],
                stroke: solid(THIN_MM * 2.0, INK),
            });
            text(out, r.x + 1.6, mid.y + 0.9, "name", SMALL_PT, INK);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::sample::{sample_interpretation, sample_section};
    use crate::layout::LayoutOptions;
    use crate::model::{Bed, BedId, Contact, GrainSize, Section, WentworthClass};

    #[test]
    fn legend_lists_exactly_the_used_lithologies() {
        let mut s = Section::new("Two rocks");
        let mut b2 =
            Bed::new(BedId(2), 1.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)));
        b2.base_contact = Contact::Erosional;
        b2.structures = vec![Structure::TroughCrossBedding];
        s.beds = vec![
            Bed::new(BedId(1), 2.0, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Clay))),
            b2,
        ]
        .into();
        let interp = sample_interpretation(&sample_section());
        let opts = LayoutOptions { show_interpretation: false, ..Default::default() };
        let ctx = ColumnCtx::new(&s, &interp, &opts);
        assert_eq!(
            legend_entries(&ctx),
            vec![
                LegendEntry::Lithology(Lithology::Mudstone),
                LegendEntry::Lithology(Lithology::Sandstone),
                LegendEntry::Contact(Contact::Erosional),
                LegendEntry::Structure(Structure::TroughCrossBedding),
                // Neither bed's code was given: both show a suggested one (Fsm, St).
                LegendEntry::FaciesSuggested,
            ]
        );
        // The demo section: every lithology it uses, and no other.
        let demo = sample_section();
        let interp = sample_interpretation(&demo);
        let opts = LayoutOptions::default();
        let ctx = ColumnCtx::new(&demo, &interp, &opts);
        let entries = legend_entries(&ctx);
        let mut used: Vec<Lithology> = demo.beds.iter().map(|b| b.lithology).collect();
        used.sort();
        used.dedup();
        let listed: Vec<Lithology> = entries
            .iter()
            .filter_map(|e| if let LegendEntry::Lithology(l) = e { Some(*l) } else { None })
            .collect();
        assert_eq!(listed, used);
        // Rejected candidates are hidden by default, so not in the legend.
        assert!(entries.contains(&LegendEntry::Boundary(ReviewState::Accepted)));
        assert!(!entries.contains(&LegendEntry::Boundary(ReviewState::Rejected)));
        let shown = LayoutOptions { show_rejected: true, ..Default::default() };
        let ctx = ColumnCtx::new(&demo, &interp, &shown);
        assert!(legend_entries(&ctx).contains(&LegendEntry::Boundary(ReviewState::Rejected)));
    }

    #[test]
    fn the_legend_uses_the_columns_words_and_shows_strengths_and_named_surfaces() {
        use crate::model::{Surface, SurfaceKind};
        let mut s = sample_section();
        s.beds[9].base_surface = Some(Surface { name: "Ash-3".into(), kind: SurfaceKind::Other });
        let interp = sample_interpretation(&s);
        let entries = column_legend(&s, &interp, &LayoutOptions::default());
        assert!(entries.contains(&LegendEntry::Body(Stacking::MultiStory)));
        // The sample's one open candidate has moderate evidence.
        assert!(entries.contains(&LegendEntry::BoundaryStrength(Strength::Moderate)));
        assert!(!entries.contains(&LegendEntry::BoundaryStrength(Strength::Strong)));
        assert!(entries.contains(&LegendEntry::NamedSurface));
        let labels: Vec<String> = entries.iter().map(|e| e.label()).collect();
        assert!(labels.contains(&"multi-storey channel body: MS \u{b7} n storeys".to_string()), "{labels:?}");
        assert!(labels.contains(&"single-storey channel body (SS)".to_string()));
        assert!(labels.iter().all(|l| !l.contains("story")), "one spelling: storey");
        // The code beside the legend's bracket is the one beside the column's.
        let mut items = Vec::new();
        draw_swatch(
            LegendEntry::Body(Stacking::MultiStory),
            RectMm { x: 0.0, y: 0.0, w: 8.0, h: 3.4 },
            &mut items,
        );
        let codes: Vec<&str> = items
            .iter()
            .filter_map(|i| if let Item::Text { text, .. } = i { Some(text.as_str()) } else { None })
            .collect();
        let [_, _, short] =
            crate::layout::column::body_labels(&interp.channel_bodies[0], crate::model::LengthUnit::Metre);
        assert_eq!(codes, vec!["MS"]);
        assert!(short.starts_with("MS"));
        // Sorted and without repeats, whatever order the column met them in.
        let mut sorted = entries.clone();
        sorted.sort_by_key(|e| e.sort_key());
        sorted.dedup();
        assert_eq!(sorted, entries);
    }
}
