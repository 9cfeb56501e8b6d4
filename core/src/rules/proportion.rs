//! Channel-body proportion: the moving-window curve and the proportion of each interval between
//! boundaries. Covered intervals are left out of both channel and exposed thickness (common
//! practice); the whole-section figure comes with bounds that count them as fines (covered
//! slopes are usually recessive mudrock) and as channel deposits.

use super::column::Column;
use super::params::{RuleParams, MAX_CURVE_POINTS};
use super::types::{CurvePoint, IntervalProportion, ProportionBounds};

/// The whole-section proportion with covered intervals counted as fines and as channel deposits;
/// `None` for a section of no thickness.
pub fn bounds(column: &Column) -> Option<ProportionBounds> {
    let total = column.total_m();
    if total <= 1e-9 {
        return None;
    }
    let channel = column.channel_total_m();
    let covered = (total - column.exposed_total_m()).max(0.0);
    Some(ProportionBounds {
        covered_as_fines: (channel / total).clamp(0.0, 1.0),
        covered_as_channel: ((channel + covered) / total).clamp(0.0, 1.0),
    })
}

/// The proportion in a window of `window_m` centred on heights 0, step, 2·step … up to the
/// section top; the window is clipped to the section. Empty when the step or window is not a
/// positive number. One upward pass of rising windows: linear in beds plus points.
pub fn proportion_curve(column: &Column, params: &RuleParams) -> Vec<CurvePoint> {
    let step = params.curve_step_m;
    let half = params.window_m / 2.0;
    if !(step.is_finite() && step > 0.0 && half.is_finite() && half > 0.0) {
        return Vec::new();
    }
    let total = column.total_m();
    // The small allowance keeps a top that is a whole number of steps (up to rounding) on the grid.
    let steps = ((total / step) + 1e-9).floor();
    let count = if steps.is_finite() && steps >= 0.0 { (steps as usize).saturating_add(1) } else { 1 };
    let count = count.min(MAX_CURVE_POINTS);
    let mut windows = column.rising_windows();
    (0..count)
        .map(|k| {
            let height_m = k as f64 * step;
            CurvePoint { height_m, proportion: windows.proportion(height_m - half, height_m + half) }
        })
        .collect()
}

/// Proportions of the intervals that the cut heights split the section into (cuts outside the
/// section or repeated are ignored; the result always covers the whole section).
pub fn interval_proportions(column: &Column, cuts_m: &[f64]) -> Vec<IntervalProportion> {
    let total = column.total_m();
    let mut heights: Vec<f64> =
        cuts_m.iter().copied().filter(|h| h.is_finite() && *h > 0.0 && *h < total).collect();
    heights.sort_by(f64::total_cmp);
    heights.dedup();
    let mut out = Vec::with_capacity(heights.len() + 1);
    let mut base = 0.0;
    for top in heights.into_iter().chain(std::iter::once(total)) {
        out.push(IntervalProportion { base_m: base, top_m: top, proportion: column.proportion(base, top) });
        base = top;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Bed, BedId, Lithology, Section};
    use crate::rules::types::Element;

    fn column(beds: &[(f64, Element)]) -> Column {
        let mut s = Section::new("t");
        for (i, (t, _)) in beds.iter().enumerate() {
            s.beds.push(Bed::new(BedId(i as u64), *t, Lithology::Mudstone, None));
        }
        let els: Vec<Element> = beds.iter().map(|b| b.1).collect();
        Column::new(&s).with_elements(&els)
    }

    #[test]
    fn curve_on_hand_worked_column() {
        // 0–4 channel, 4–8 fines, 8–10 covered. Window 4 m, step 2 m: points 0, 2, …, 10.
        // h=0: [0,2] 2/2 = 1; h=2: [0,4] 1; h=4: [2,6] 2/4; h=6: [4,8] 0; h=8: [6,10] 0/2 = 0;
        // h=10: [8,10] all covered → None.
        let col =
            column(&[(4.0, Element::ChannelDeposit), (4.0, Element::OverbankFines), (2.0, Element::Covered)]);
        let p = RuleParams { window_m: 4.0, curve_step_m: 2.0, ..RuleParams::default() };
        let got: Vec<(f64, Option<f64>)> =
            proportion_curve(&col, &p).iter().map(|c| (c.height_m, c.proportion)).collect();
        assert_eq!(
            got,
            vec![
                (0.0, Some(1.0)),
                (2.0, Some(1.0)),
                (4.0, Some(0.5)),
                (6.0, Some(0.0)),
                (8.0, Some(0.0)),
                (10.0, None)
            ]
        );
    }

    #[test]
    fn bounds_count_the_cover_both_ways() {
        // 4 m channel, 4 m fines, 2 m covered: exposed-only 4/8 = 0.5; covered as fines 4/10 =
        // 0.4; covered as channel 6/10 = 0.6.
        let col =
            column(&[(4.0, Element::ChannelDeposit), (4.0, Element::OverbankFines), (2.0, Element::Covered)]);
        let b = bounds(&col).expect("thickness");
        assert!((b.covered_as_fines - 0.4).abs() < 1e-12 && (b.covered_as_channel - 0.6).abs() < 1e-12);
        assert_eq!(bounds(&column(&[])), None);
    }

    #[test]
    fn intervals_cover_the_section() {
        let col = column(&[(4.0, Element::ChannelDeposit), (4.0, Element::OverbankFines)]);
        let iv = interval_proportions(&col, &[6.0, 0.0, 6.0, 99.0, f64::NAN]);
        let got: Vec<(f64, f64, Option<f64>)> =
            iv.iter().map(|i| (i.base_m, i.top_m, i.proportion)).collect();
        assert_eq!(got, vec![(0.0, 6.0, Some(4.0 / 6.0)), (6.0, 8.0, Some(0.0))]);
    }
}
