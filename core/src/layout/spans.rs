//! Finding the interpretation items a height range can show without scanning them all, so a
//! printout costs the same per page however long the section is (drawing every page by scanning
//! every storey, body and curve point made long exports grow with the square of their length).
//!
//! Each index only narrows the items to visit; the drawing code still applies its own test to
//! each, in the original order, so the items drawn are exactly those a full scan draws.

use crate::rules::Interpretation;
use std::ops::Range;

/// Intervals (base, top) in list order, searchable when both bases and tops never decrease.
#[derive(Debug, Clone, Default)]
pub struct IntervalSpans {
    bases_m: Vec<f64>,
    tops_m: Vec<f64>,
    /// Bases and tops both non-decreasing (and no NaN), so a binary search is valid.
    sorted: bool,
}

/// True when the values never decrease (false for any NaN).
fn non_decreasing(values: &[f64]) -> bool {
    values.windows(2).all(|w| w[0] <= w[1]) && values.iter().all(|v| !v.is_nan())
}

impl IntervalSpans {
    /// An index of intervals given as (base, top) in list order.
    pub fn new(intervals: impl Iterator<Item = (f64, f64)>) -> Self {
        let (bases_m, tops_m): (Vec<f64>, Vec<f64>) = intervals.unzip();
        let sorted = non_decreasing(&bases_m) && non_decreasing(&tops_m);
        IntervalSpans { bases_m, tops_m, sorted }
    }

    /// Indices of the list that can overlap [lo, hi] (that is, `min(top, hi) > max(base, lo)`);
    /// every interval outside the range fails that test. The whole list when the intervals are
    /// not sorted.
    pub fn range(&self, lo: f64, hi: f64) -> Range<usize> {
        let n = self.bases_m.len();
        // NaN bounds compare as neither: take the whole list then too.
        if !self.sorted || lo.partial_cmp(&hi).is_none_or(|o| o == std::cmp::Ordering::Greater) {
            return 0..n;
        }
        // Before `first`: top ≤ lo, so min(top, hi) ≤ lo ≤ max(base, lo).
        let first = self.tops_m.partition_point(|&t| t <= lo);
        // From `last` on: base ≥ hi, so max(base, lo) ≥ hi ≥ min(top, hi).
        let last = self.bases_m.partition_point(|&b| b < hi);
        first..last.max(first)
    }
}

/// Search indices for the interpretation tracks of one column.
#[derive(Debug, Clone, Default)]
pub struct InterpretationSpans {
    pub storeys: IntervalSpans,
    pub channel_bodies: IntervalSpans,
    pub paleosols: IntervalSpans,
    pub interval_proportions: IntervalSpans,
    pub accommodation: IntervalSpans,
    /// Curve point heights, when they never decrease (`None` otherwise).
    curve_heights_m: Option<Vec<f64>>,
    /// Candidates with a finite height, as (height, index), sorted by height; candidates at one
    /// height keep their list order.
    candidates_by_height: Vec<(f64, usize)>,
}

impl InterpretationSpans {
    /// Build the indices for an interpretation.
    pub fn new(interp: &Interpretation) -> Self {
        let heights: Vec<f64> = interp.proportion_curve.iter().map(|p| p.height_m).collect();
        let mut candidates_by_height: Vec<(f64, usize)> = interp
            .sequence_boundary_candidates
            .iter()
            .enumerate()
            .filter(|(_, c)| c.height_m.is_finite())
            .map(|(k, c)| (c.height_m, k))
            .collect();
        // Stable: equal heights stay in list order.
        candidates_by_height.sort_by(|a, b| a.0.total_cmp(&b.0));
        InterpretationSpans {
            storeys: IntervalSpans::new(interp.storeys.iter().map(|s| (s.base_m, s.top_m))),
            channel_bodies: IntervalSpans::new(interp.channel_bodies.iter().map(|b| (b.base_m, b.top_m))),
            paleosols: IntervalSpans::new(interp.paleosols.iter().map(|p| (p.base_m, p.top_m))),
            interval_proportions: IntervalSpans::new(
                interp.interval_proportions.iter().map(|p| (p.base_m, p.top_m)),
            ),
            accommodation: IntervalSpans::new(interp.accommodation.iter().map(|r| (r.base_m, r.top_m))),
            curve_heights_m: non_decreasing(&heights).then_some(heights),
            candidates_by_height,
        }
    }

    /// The first curve point a walk up the curve for [lo, hi] needs to look at: every point
    /// before it lies below `lo` (so that walk skips it). 0 when the curve is not sorted.
    pub fn curve_start(&self, lo: f64, hi: f64) -> usize {
        match &self.curve_heights_m {
            Some(h) if lo <= hi => h.partition_point(|&x| x < lo),
            _ => 0,
        }
    }

    /// Indices of the candidates with lo ≤ height ≤ hi (finite heights only), ordered by height
    /// and, at one height, by list order: the same as filtering the list and sorting it stably.
    pub fn candidates_in(&self, lo: f64, hi: f64) -> impl Iterator<Item = usize> + '_ {
        let c = &self.candidates_by_height;
        let first = c.partition_point(|&(h, _)| h < lo);
        let last = c.partition_point(|&(h, _)| h <= hi).max(first);
        c[first..last].iter().map(|&(_, k)| k)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The overlap test the drawing code applies (`clip` in `column.rs`).
    fn overlaps(base: f64, top: f64, lo: f64, hi: f64) -> bool {
        top.min(hi) > base.max(lo)
    }

    #[test]
    fn interval_ranges_hold_every_overlapping_interval() {
        let list = [(0.0, 1.0), (1.0, 2.5), (2.5, 2.5), (2.5, 4.0), (4.0, 9.0), (9.0, 9.5)];
        let spans = IntervalSpans::new(list.iter().copied());
        for lo in [-1.0, 0.0, 0.5, 1.0, 2.5, 3.0, 4.0, 9.5, 20.0] {
            for hi in [-1.0, 0.0, 1.0, 2.5, 2.6, 4.0, 8.0, 9.5, 20.0] {
                let r = spans.range(lo, hi);
                for (k, (b, t)) in list.iter().enumerate() {
                    if overlaps(*b, *t, lo, hi) {
                        assert!(r.contains(&k), "[{lo}, {hi}] misses interval {k} in {r:?}");
                    }
                }
            }
        }
        // Narrow: a range in the middle visits only its neighbours.
        assert_eq!(spans.range(2.6, 3.0), 3..4);
    }

    #[test]
    fn unsorted_or_nan_intervals_are_scanned_whole() {
        let spans = IntervalSpans::new([(2.0, 3.0), (0.0, 1.0)].into_iter());
        assert_eq!(spans.range(0.0, 0.5), 0..2);
        let spans = IntervalSpans::new([(0.0, f64::NAN), (1.0, 2.0)].into_iter());
        assert_eq!(spans.range(1.5, 1.6), 0..2);
    }
}
