//! The frame of a segment: the height axis, the track titles above and the grain-size scale
//! (with curve value axes) below.

use super::help::TrackKind;
use super::*;

impl ColumnCtx<'_> {
    pub(super) fn draw_axis(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let unit = match self.section.display_unit {
            LengthUnit::Foot => LengthUnit::Foot,
            _ => LengthUnit::Metre,
        };
        let per_unit_mm = t.length_mm(unit.metres());
        let step = axis_step(per_unit_mm);
        let minor = if step * per_unit_mm / 5.0 >= 1.4 { step / 5.0 } else { step / 2.0 };
        let x_axis = x0 + self.tracks.lithology.x_mm;
        let (lo_u, hi_u) = (unit.from_metres(lo), unit.from_metres(hi));
        let decimals = if step < 1.0 - 1e-9 { 1 } else { 0 };
        let k0 = (lo_u / minor - 1e-6).ceil() as i64;
        let k1 = (hi_u / minor + 1e-6).floor() as i64;
        let per_major = (step / minor).round() as i64;
        for k in k0..=k1 {
            let v = k as f64 * minor;
            let y = t.y_mm(unit.to_metres(v));
            let major = per_major > 0 && k % per_major == 0;
            let len = if major { 2.0 } else { 1.0 };
            out.push(Item::Polyline {
                points: vec![PtMm { x: x_axis - len, y }, PtMm { x: x_axis, y }],
                stroke: solid(THIN_MM, INK),
            });
            if major {
                let label = format!("{v:.decimals$}");
                let label = label.replace('-', "\u{2212}");
                let w = width(&label, TEXT_PT);
                text(out, x_axis - 2.6 - w, y + 0.8, &label, TEXT_PT, INK);
            }
        }
    }

    /// Track titles above a segment whose band starts at `y_top` and ends at `y_top + TITLE_BAND_MM`.
    pub fn draw_titles(&self, x0: f64, y_top: f64, out: &mut Vec<Item>) {
        let tr = self.tracks;
        let y_bottom = y_top + TITLE_BAND_MM - 1.0;
        let unit = match self.section.display_unit {
            LengthUnit::Foot => "ft",
            _ => "m",
        };
        let axis_label = format!("height ({unit})");
        let mut rotated: Vec<(Track, String)> = vec![(tr.axis, axis_label)];
        let title = |k: TrackKind| k.title_lines().join(" ");
        rotated.push((tr.structures, title(TrackKind::Structures)));
        rotated.push((tr.paleocurrents, title(TrackKind::Paleocurrents)));
        rotated.push((tr.paleosols, title(TrackKind::Paleosols)));
        for (track, kind) in [(tr.bioturbation, TrackKind::Bioturbation), (tr.facies, TrackKind::Facies)] {
            if let Some(track) = track {
                rotated.push((track, title(kind)));
            }
        }
        if let (Some(s), Some(b), Some(r)) = (tr.storeys, tr.bodies, tr.regime) {
            rotated.push((s, title(TrackKind::Storeys)));
            rotated.push((b, title(TrackKind::Bodies)));
            rotated.push((r, title(TrackKind::Regime)));
        }
        for (track, label) in rotated {
            let Some(size) = fit_size(&label, TITLE_BAND_MM - 2.0, SMALL_PT, 4.0) else { continue };
            let asc = size * 0.353 * 0.76;
            let cx = x0 + track.x_mm + track.w_mm / 2.0;
            text_up(out, cx + asc / 2.0, y_bottom, &label, size, INK);
        }
        let lithology_lines = TrackKind::Lithology.title_lines();
        centred_lines(x0, tr.lithology, (y_bottom - 3.5, 3.0), lithology_lines, TEXT_PT, out);
        for (track, kind) in [
            (tr.samples, TrackKind::Samples),
            (tr.photos, TrackKind::Photos),
            (tr.fossils, TrackKind::Fossils),
        ] {
            if let Some(track) = track {
                centred_lines(x0, track, (y_bottom - 0.8, 2.6), kind.title_lines(), TEXT_PT, out);
            }
        }
        if let Some(p) = tr.proportion {
            centred_lines(x0, p, (y_bottom - 3.2, 2.6), TrackKind::Proportion.title_lines(), SMALL_PT, out);
        }
        if let Some(l) = tr.boundary_labels {
            for (line, label) in TrackKind::BoundaryLabels.title_lines().iter().enumerate() {
                let size = fit_size(label, l.w_mm, SMALL_PT, 4.0).unwrap_or(4.0);
                text(out, x0 + l.x_mm + 0.8, y_bottom - 5.8 + line as f64 * 2.6, label, size, INK);
            }
        }
        for (k, p) in self.curve_tracks(x0) {
            curve_track::draw_curve_title(&self.section.curves[k], p.colour, p.x_mm, p.w_mm, y_bottom, out);
        }
        out.push(Item::Polyline {
            points: vec![
                PtMm { x: x0, y: y_top + TITLE_BAND_MM },
                PtMm { x: x0 + tr.width_mm, y: y_top + TITLE_BAND_MM },
            ],
            stroke: solid(HAIR_MM, GREY),
        });
    }

    /// Grain-size scale (and proportion axis) under a segment, its top line at `y`.
    pub fn draw_scale(&self, x0: f64, y: f64, out: &mut Vec<Item>) {
        let g = self.tracks.grain_scale(x0);
        let x_end = g.left_mm + g.full_width_mm();
        out.push(Item::Polyline {
            points: vec![PtMm { x: x0, y }, PtMm { x: x0 + self.tracks.width_mm, y }],
            stroke: solid(HAIR_MM, GREY),
        });
        out.push(Item::Polyline {
            points: vec![PtMm { x: g.left_mm, y: y + 1.0 }, PtMm { x: x_end, y: y + 1.0 }],
            stroke: solid(THIN_MM, INK),
        });
        for k in 0..=WentworthClass::ALL.len() {
            let x = g.left_mm + g.min_width_mm + g.class_step_mm * k as f64;
            let len = if k == 2 || k == 7 { 2.2 } else { 1.0 };
            out.push(Item::Polyline {
                points: vec![PtMm { x, y: y + 1.0 }, PtMm { x, y: y + 1.0 + len }],
                stroke: solid(THIN_MM, INK),
            });
        }
        for c in WentworthClass::ALL {
            let label = c.short_label();
            let size = fit_size(label, g.class_step_mm - 0.2, SMALL_PT, 3.5).unwrap_or(3.5);
            let w = width(label, size);
            text(out, g.class_centre_x_mm(c) - w / 2.0, y + 4.6, label, size, INK);
        }
        // Groups: mud (clay, silt), sand (very fine … very coarse), gravel (granule … boulder).
        for (from, to, label) in [(0usize, 2usize, "mud"), (2, 7, "sand"), (7, 11, "gravel")] {
            let xa = g.left_mm + g.min_width_mm + g.class_step_mm * from as f64;
            let xb = g.left_mm + g.min_width_mm + g.class_step_mm * to as f64;
            let w = width(label, SMALL_PT);
            text(out, (xa + xb - w) / 2.0, y + 7.8, label, SMALL_PT, GREY);
        }
        let phi_note = "Wentworth classes; \u{3c6} = \u{2212}log\u{2082}(d/mm)";
        if let Some(size) = fit_size(phi_note, g.full_width_mm() + 4.0, 4.5, 3.5) {
            text(out, g.left_mm, y + 10.8, phi_note, size, GREY);
        }
        if let Some(p) = self.tracks.proportion {
            for (f, label) in [(0.0, "0"), (0.5, "0.5"), (1.0, "1")] {
                let w = width(label, SMALL_PT);
                text(out, x0 + p.x_mm + f * p.w_mm - w / 2.0, y + 3.6, label, SMALL_PT, INK);
            }
        }
        for (_, p) in self.curve_tracks(x0) {
            curve_track::draw_value_axis(p.axis, p.colour, p.x_mm, p.w_mm, y, out);
        }
    }
}

/// Lines of a title centred in `track` of the segment at `x0`, the first baseline at `y0` and
/// the next ones `pitch` mm lower (`(y0, pitch)`).
fn centred_lines(
    x0: f64,
    track: Track,
    (y0, pitch): (f64, f64),
    lines: &[&str],
    size_pt: f64,
    out: &mut Vec<Item>,
) {
    for (k, label) in lines.iter().enumerate() {
        let size = fit_size(label, track.w_mm, size_pt, 3.5).unwrap_or(3.5);
        let w = width(label, size);
        text(out, x0 + track.x_mm + (track.w_mm - w) / 2.0, y0 + k as f64 * pitch, label, size, INK);
    }
}

/// A tick step (in display units) giving major ticks at least ~8 mm apart.
pub fn axis_step(mm_per_unit: f64) -> f64 {
    const STEPS: [f64; 16] = [
        0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0, 2000.0, 5000.0, 10000.0,
    ];
    STEPS.iter().copied().find(|s| s * mm_per_unit >= 8.0).unwrap_or(10000.0)
}
