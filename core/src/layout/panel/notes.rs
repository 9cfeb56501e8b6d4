//! Notes: what the panel says in words about its own choices (sections without the datum,
//! repeated or unmatched labels, gaps not to scale, an enlarged page), and the notes block and
//! footer caution at the bottom of the page.

use super::markers::SectionMarkers;
use super::positions::{fmt_distance, Horizontal, Sheet};
pub(super) use super::words::{counted, height_text};
use super::{Datum, FLAG_ORANGE, NOTE_LINE_MM, NOTE_PT};
use crate::layout::column::SCALE_BAND_MM;
use crate::layout::items::{Item, PtMm};
use crate::layout::options::LayoutOptions;
use crate::layout::style::{solid, GREY, HAIR_MM, INK, TEXT_PT};
use crate::layout::text::{text, width, wrap};
use crate::model::Section;

/// Notes about each section's datum and markers, in panel order.
pub(super) fn section_notes(
    sections: &[Section],
    order: &[usize],
    markers: &[SectionMarkers],
    datum_h: &[Option<f64>],
    datum: &Datum,
) -> Vec<String> {
    let datum_label = datum.label();
    let mut notes = Vec::new();
    for &i in order {
        if datum_h[i].is_none() {
            notes.push(format!(
                "{}: has no {datum_label}; drawn hung on its base, which is NOT correlated with the datum.",
                sections[i].name
            ));
        }
        for r in &markers[i].repeated_names {
            notes.push(format!(
                "{}: surface {r:?} occurs more than once; the lowest is used.",
                sections[i].name
            ));
        }
        for (l, h) in &markers[i].repeated_links {
            notes.push(format!(
                "{}: correlation label {l:?} is on more than one accepted boundary; the lowest is tied, not the one at {}.",
                sections[i].name,
                height_text(&sections[i], *h)
            ));
        }
        for (l, h) in &markers[i].unaccepted_links {
            notes.push(format!(
                "{}: correlation label {l:?} at {} is on a boundary that is not accepted: kept, not drawn.",
                sections[i].name,
                height_text(&sections[i], *h)
            ));
        }
    }
    notes
}

/// Notes about the horizontal layout: columns not spaced by distance, gaps widened to the
/// minimum `min_gap` (mm).
pub(super) fn horizontal_notes(sections: &[Section], h: &Horizontal, min_gap: f64) -> Vec<String> {
    let mut notes = Vec::new();
    if h.positions.source == super::PositionSource::FileOrder {
        notes.push(
            "Columns stand in file order, NOT spaced by distance: not every section has a panel position or coordinates."
                .to_string(),
        );
    }
    if !h.widened_gaps.is_empty() {
        let list: Vec<String> = h
            .widened_gaps
            .iter()
            .map(|&k| {
                let (a, b) = (h.positions.order[k], h.positions.order[k + 1]);
                format!("{} \u{2013} {} ({})", sections[a].name, sections[b].name, fmt_distance(h.deltas[k]))
            })
            .collect();
        notes.push(format!(
            "Gaps widened to the {min_gap:.0} mm minimum, NOT to horizontal scale (n.t.s.): {}.",
            list.join("; ")
        ));
    }
    notes
}

/// The note that says the page was enlarged beyond the chosen paper.
pub(super) fn enlarged_note(layout: &LayoutOptions, sheet: &Sheet) -> String {
    format!(
        "The panel does not fit {} at vertical {}: the page is enlarged to {:.0} \u{d7} {:.0} mm to keep the true scale.",
        layout.paper.name(),
        layout.scale_label(),
        sheet.page_w,
        sheet.page_h
    )
}

/// The notes under the scale band (warnings in the flag colour), then the footer: a rule, the
/// caution and the page number.
pub(super) fn draw_notes_and_footer(notes: &[String], sheet: &Sheet, out: &mut Vec<Item>) {
    let margin = sheet.margin;
    let mut ny = sheet.y_scale + SCALE_BAND_MM + 2.0;
    if !notes.is_empty() {
        text(out, margin, ny + 1.0, "Notes", TEXT_PT, INK);
        ny += NOTE_LINE_MM + 0.5;
        for n in notes {
            for line in wrap(n, sheet.usable_w, NOTE_PT) {
                let colour = if n.contains("NOT") || n.contains("n.t.s.") { FLAG_ORANGE } else { INK };
                text(out, margin, ny + 1.0, &line, NOTE_PT, colour);
                ny += NOTE_LINE_MM;
            }
        }
    }
    let caution_lines = &sheet.caution_lines;
    let fy = sheet.page_h - margin - caution_lines.len() as f64 * NOTE_LINE_MM + 1.6;
    out.push(Item::Polyline {
        points: vec![PtMm { x: margin, y: fy - 2.8 }, PtMm { x: sheet.page_w - margin, y: fy - 2.8 }],
        stroke: solid(HAIR_MM, GREY),
    });
    for (k, l) in caution_lines.iter().enumerate() {
        text(out, margin, fy + k as f64 * NOTE_LINE_MM, l, NOTE_PT, INK);
    }
    let label = "page 1 of 1";
    text(out, sheet.page_w - margin - width(label, TEXT_PT), fy, label, TEXT_PT, INK);
}
