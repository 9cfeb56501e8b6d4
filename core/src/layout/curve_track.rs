//! Measured-curve tracks beside the column: each attached curve (e.g. outcrop gamma ray) drawn
//! as a line against height at the column's true vertical scale, its value axis running from the
//! smallest value on the section (left edge) to the largest (right edge).

use super::items::{Item, PtMm, Rgba};
use super::style::{dashed, solid, GREY, HAIR_MM, INK, LIGHT_GREY, SMALL_PT, TEXT_PT, THIN_MM};
use super::text::{fit_size, text, width};
use super::transform::HeightTransform;
use crate::model::MeasuredCurve;
use serde::Serialize;

/// Width of one curve track, mm.
pub const CURVE_TRACK_MM: f64 = 20.0;
/// Space left of each curve track, mm.
pub const CURVE_GAP_MM: f64 = 2.5;
/// Most curve tracks drawn beside one column (the first ones attached); pages draw fewer when
/// the paper is too narrow and say so.
pub const MAX_CURVE_TRACKS: usize = 6;
/// Line width of a curve, mm.
pub const CURVE_LINE_MM: f64 = 0.3;

/// Our own line colours for curve tracks, in attachment order (repeating after six).
pub const CURVE_COLOURS: [Rgba; 6] = [
    Rgba(112, 36, 128, 255),
    Rgba(0, 112, 140, 255),
    Rgba(176, 86, 0, 255),
    Rgba(60, 110, 30, 255),
    Rgba(150, 30, 60, 255),
    Rgba(70, 70, 160, 255),
];

/// Where the curve tracks sit across a segment (mm from its left edge): `count` tracks of
/// [`CURVE_TRACK_MM`], each after a [`CURVE_GAP_MM`] gap, starting at `x_mm`.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct CurveTracks {
    pub x_mm: f64,
    pub count: usize,
}

impl CurveTracks {
    /// No curve tracks, starting at `x_mm` (the right edge of the other tracks).
    pub fn none(x_mm: f64) -> Self {
        CurveTracks { x_mm, count: 0 }
    }

    /// Left edge and width (mm, relative to the segment) of curve track `k`.
    pub fn track(&self, k: usize) -> Option<(f64, f64)> {
        (k < self.count).then_some((
            self.x_mm + CURVE_GAP_MM + k as f64 * (CURVE_TRACK_MM + CURVE_GAP_MM),
            CURVE_TRACK_MM,
        ))
    }

    /// Width (mm) the curve tracks add to a segment.
    pub fn width_mm(&self) -> f64 {
        self.count as f64 * (CURVE_TRACK_MM + CURVE_GAP_MM)
    }
}

/// Where and how one curve is drawn: its track's left edge and width on the page (mm), its value
/// axis (`None` when the curve has no finite value in the range drawn) and its ink.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvePlace {
    pub x_mm: f64,
    pub w_mm: f64,
    pub axis: Option<ValueAxis>,
    pub colour: Rgba,
}

/// The value axis of a curve track: `min` at the left edge, `max` at the right.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ValueAxis {
    pub min: f64,
    pub max: f64,
}

impl ValueAxis {
    /// The axis for a curve over the heights [lo_m, hi_m]: its smallest and largest value there.
    /// A curve with one value there gets ±1 % of it (±1 if it is 0) so the line sits mid-track.
    pub fn for_curve(curve: &MeasuredCurve, lo_m: f64, hi_m: f64) -> Option<Self> {
        let (min, max) = curve.value_range_in(lo_m, hi_m)?;
        if max > min {
            Some(ValueAxis { min, max })
        } else {
            let pad = if min == 0.0 { 1.0 } else { min.abs() * 0.01 };
            Some(ValueAxis { min: min - pad, max: max + pad })
        }
    }

    /// x (mm) of a value in a track whose left edge is `x_mm` and width `w_mm` (clamped to it).
    pub fn x_mm(&self, value: f64, x_mm: f64, w_mm: f64) -> f64 {
        let f = ((value - self.min) / (self.max - self.min)).clamp(0.0, 1.0);
        x_mm + f * w_mm
    }
}

/// A value as printed on a track's axis: at most four significant digits, no trailing zeros,
/// a true minus sign.
pub fn axis_label(v: f64) -> String {
    if v == 0.0 {
        return "0".into();
    }
    let digits = (3 - v.abs().log10().floor() as i32).clamp(0, 6) as usize;
    let mut s = format!("{v:.digits$}");
    if s.contains('.') {
        s = s.trim_end_matches('0').trim_end_matches('.').to_string();
    }
    s.replace('-', "\u{2212}")
}

/// Draw curve `curve` in the track at absolute `x_mm` (width `w_mm`) for heights [lo, hi]:
/// frame lines, a dashed mid line, and the curve as polylines broken at NULL samples and cut
/// (by linear interpolation) at lo and hi.
pub fn draw_curve(
    curve: &MeasuredCurve,
    place: &CurvePlace,
    lo: f64,
    hi: f64,
    t: &HeightTransform,
    out: &mut Vec<Item>,
) {
    let CurvePlace { x_mm, w_mm, axis, colour } = *place;
    let (y_lo, y_hi) = (t.y_mm(lo), t.y_mm(hi));
    for (x, stroke) in [
        (x_mm, solid(HAIR_MM, GREY)),
        (x_mm + w_mm / 2.0, dashed(HAIR_MM, LIGHT_GREY, &[1.0, 1.0])),
        (x_mm + w_mm, solid(HAIR_MM, GREY)),
    ] {
        out.push(Item::Polyline { points: vec![PtMm { x, y: y_lo }, PtMm { x, y: y_hi }], stroke });
    }
    let Some(axis) = axis else { return };
    let s = &curve.samples;
    // First sample at or above lo, then step back one for the interpolated start.
    let first = s.partition_point(|(h, _)| *h < lo);
    let start = first.saturating_sub(1);
    let mut run: Vec<PtMm> = Vec::new();
    let flush = |run: &mut Vec<PtMm>, out: &mut Vec<Item>| {
        if run.len() >= 2 {
            out.push(Item::Polyline { points: std::mem::take(run), stroke: solid(CURVE_LINE_MM, colour) });
        }
        run.clear();
    };
    let point = |h: f64, v: f64| PtMm { x: axis.x_mm(v, x_mm, w_mm), y: t.y_mm(h) };
    let mut prev: Option<(f64, f64)> = None;
    for &(h, v) in &s[start..] {
        let Some(v) = v.filter(|v| v.is_finite()).filter(|_| h.is_finite()) else {
            flush(&mut run, out);
            prev = None;
            continue;
        };
        if h < lo {
            prev = Some((h, v));
            continue;
        }
        if h > hi {
            if let Some((ph, pv)) = prev.filter(|(ph, _)| *ph <= hi && h > *ph) {
                // Cut at hi (prev is inside the range or below it).
                let f = (hi - ph) / (h - ph);
                if ph < lo {
                    let g = (lo - ph) / (h - ph);
                    run.push(point(lo, pv + (v - pv) * g));
                }
                run.push(point(hi, pv + (v - pv) * f));
            }
            break;
        }
        if run.is_empty() {
            if let Some((ph, pv)) = prev.filter(|(ph, _)| *ph < lo && h > lo) {
                let f = (lo - ph) / (h - ph);
                run.push(point(lo, pv + (v - pv) * f));
            }
        }
        run.push(point(h, v));
        prev = Some((h, v));
    }
    flush(&mut run, out);
}

/// Title of a curve track above the column: mnemonic and unit, and the description if it fits.
pub fn draw_curve_title(
    curve: &MeasuredCurve,
    colour: Rgba,
    x_mm: f64,
    w_mm: f64,
    y_bottom: f64,
    out: &mut Vec<Item>,
) {
    let mut lines: Vec<(String, f64, Rgba)> = Vec::new();
    if !curve.description.trim().is_empty() {
        let d = curve.description.trim().to_lowercase();
        if let Some(size) = fit_size(&d, w_mm, SMALL_PT - 0.5, 3.5) {
            lines.push((d, size, GREY));
        }
    }
    let title = curve.title();
    let size = fit_size(&title, w_mm, TEXT_PT, 3.5).unwrap_or(3.5);
    lines.push((title, size, colour));
    lines.push(("measured".into(), SMALL_PT - 0.5, GREY));
    // Bottom line first, upward.
    let mut y = y_bottom;
    for (label, size, c) in lines.iter().rev() {
        let w = width(label, *size);
        text(out, x_mm + ((w_mm - w) / 2.0).max(0.0), y, label, *size, *c);
        y -= size * 0.353 * 1.35;
    }
}

/// The value axis under a curve track, its top line at `y`: a line with end ticks, the minimum
/// under the left edge and the maximum under the right edge.
pub fn draw_value_axis(
    axis: Option<ValueAxis>,
    colour: Rgba,
    x_mm: f64,
    w_mm: f64,
    y: f64,
    out: &mut Vec<Item>,
) {
    out.push(Item::Polyline {
        points: vec![PtMm { x: x_mm, y: y + 1.0 }, PtMm { x: x_mm + w_mm, y: y + 1.0 }],
        stroke: solid(THIN_MM, INK),
    });
    for x in [x_mm, x_mm + w_mm] {
        out.push(Item::Polyline {
            points: vec![PtMm { x, y: y + 1.0 }, PtMm { x, y: y + 2.2 }],
            stroke: solid(THIN_MM, INK),
        });
    }
    let Some(axis) = axis else {
        text(out, x_mm, y + 4.6, "no values", SMALL_PT, GREY);
        return;
    };
    let (lo, hi) = (axis_label(axis.min), axis_label(axis.max));
    text(out, x_mm, y + 4.6, &lo, SMALL_PT, colour);
    let w = width(&hi, SMALL_PT);
    text(out, x_mm + w_mm - w, y + 7.0, &hi, SMALL_PT, colour);
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::IndexDirection;

    fn gr(samples: Vec<(f64, Option<f64>)>) -> MeasuredCurve {
        MeasuredCurve {
            mnemonic: "GR".into(),
            unit: "API".into(),
            description: "total gamma ray".into(),
            source_file: "gr.las".into(),
            offset_m: 0.0,
            direction: IndexDirection::HeightAboveDatum,
            samples,
        }
    }

    fn lines(items: &[Item], colour: Rgba) -> Vec<Vec<PtMm>> {
        items
            .iter()
            .filter_map(|i| match i {
                Item::Polyline { points, stroke } if stroke.color == colour => Some(points.clone()),
                _ => None,
            })
            .collect()
    }

    #[test]
    fn nulls_break_the_line_and_points_sit_at_their_heights() {
        let c =
            gr(vec![(0.0, Some(10.0)), (1.0, Some(30.0)), (2.0, None), (3.0, Some(20.0)), (4.0, Some(10.0))]);
        let axis = ValueAxis::for_curve(&c, 0.0, 4.0).expect("values");
        assert_eq!(axis, ValueAxis { min: 10.0, max: 30.0 });
        // 1:100: 10 mm per m, base at y = 100.
        let t = HeightTransform::new(100.0, 0.0, 100.0);
        let mut out = Vec::new();
        let ink = CURVE_COLOURS[0];
        let place = CurvePlace { x_mm: 50.0, w_mm: 20.0, axis: Some(axis), colour: ink };
        draw_curve(&c, &place, 0.0, 4.0, &t, &mut out);
        let l = lines(&out, ink);
        assert_eq!(l.len(), 2, "the NULL at 2 m splits the curve: {l:?}");
        assert_eq!(l[0], vec![PtMm { x: 50.0, y: 100.0 }, PtMm { x: 70.0, y: 90.0 }]);
        assert_eq!(l[1], vec![PtMm { x: 60.0, y: 70.0 }, PtMm { x: 50.0, y: 60.0 }]);
    }

    #[test]
    fn a_segment_draws_only_its_range_cut_at_the_ends() {
        let c = gr((0..=10).map(|i| (i as f64, Some(i as f64 * 10.0))).collect());
        let axis = ValueAxis::for_curve(&c, 0.0, 10.0).expect("values");
        let t = HeightTransform::new(200.0, 2.5, 100.0);
        let mut out = Vec::new();
        let ink = CURVE_COLOURS[1];
        let place = CurvePlace { x_mm: 0.0, w_mm: 100.0, axis: Some(axis), colour: ink };
        draw_curve(&c, &place, 2.5, 4.5, &t, &mut out);
        let l = lines(&out, ink);
        assert_eq!(l.len(), 1);
        let pts = &l[0];
        // Interpolated ends at 2.5 and 4.5 m (value 25 and 45 → x 25 and 45 on a 0–100 axis).
        assert_eq!(pts.len(), 4, "{pts:?}");
        assert!((pts[0].x - 25.0).abs() < 1e-9 && (pts[0].y - 200.0).abs() < 1e-9);
        assert!((pts[3].x - 45.0).abs() < 1e-9 && (pts[3].y - 180.0).abs() < 1e-9);
        // Two samples inside a range lying between them: one cut segment.
        let mut out = Vec::new();
        draw_curve(&c, &place, 3.2, 3.7, &t, &mut out);
        let l = lines(&out, ink);
        assert_eq!(l.len(), 1);
        assert!((l[0][0].x - 32.0).abs() < 1e-9 && (l[0][1].x - 37.0).abs() < 1e-9, "{l:?}");
    }

    #[test]
    fn flat_and_empty_curves() {
        let flat = gr(vec![(0.0, Some(5.0)), (1.0, Some(5.0))]);
        let a = ValueAxis::for_curve(&flat, 0.0, 1.0).expect("values");
        assert!((a.x_mm(5.0, 0.0, 20.0) - 10.0).abs() < 1e-9, "a flat curve sits mid-track");
        assert_eq!(ValueAxis::for_curve(&gr(vec![(0.0, None)]), 0.0, 1.0), None);
    }

    #[test]
    fn axis_labels_are_short() {
        assert_eq!(axis_label(25.0366), "25.04");
        assert_eq!(axis_label(91.8254), "91.83");
        assert_eq!(axis_label(0.4047), "0.4047");
        assert_eq!(axis_label(1234.6), "1235");
        assert_eq!(axis_label(-2.5), "\u{2212}2.5");
        assert_eq!(axis_label(0.0), "0");
        assert_eq!(axis_label(120.0), "120");
    }

    #[test]
    fn tracks_follow_each_other() {
        let t = CurveTracks { x_mm: 100.0, count: 2 };
        assert_eq!(t.track(0), Some((102.5, 20.0)));
        assert_eq!(t.track(1), Some((125.0, 20.0)));
        assert_eq!(t.track(2), None);
        assert_eq!(t.width_mm(), 45.0);
    }
}
