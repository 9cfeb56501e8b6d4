//! How stable each pick is: the rules re-run with one key threshold moved at a time over a
//! documented range, and each candidate boundary and channel body marked with the share of runs
//! in which it comes out the same, and the parameter change nearest the values used that flips
//! it (a one-at-a-time sensitivity analysis; Saltelli et al. 2008, ch. 1).
//!
//! "The same" is, for a candidate, being listed with at least `moderate` strength (or not, as in
//! the run with the values used); for a body, the same lowest and highest bed and the same
//! stacking.

use super::bodies::body_beds;
use super::params::RuleParams;
use super::types::{Flip, Interpretation, Stacking, Strength};
use crate::model::{BedId, Section};
use std::collections::{BTreeMap, BTreeSet};

/// How one parameter is moved: multiplied by each factor (lengths), or shifted by each step
/// (fractions, clamped to 0–1; class counts, at least 1).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Moves {
    Factors(&'static [f64]),
    Steps(&'static [f64]),
}

/// Factors for lengths: half, three quarters, five quarters and one and a half times the value.
const LENGTH_FACTORS: &[f64] = &[0.5, 0.75, 1.25, 1.5];
/// Steps for proportion thresholds.
const FRACTION_STEPS: &[f64] = &[-0.1, -0.05, 0.05, 0.1];
/// Steps for a count of Wentworth classes.
const CLASS_STEPS: &[f64] = &[-1.0, 1.0];

/// The ranges: the thresholds the picks hinge on (storey, splay, drape and lag limits, the
/// relief limit, the window heights and the regime thresholds).
pub const RANGES: &[(&str, Moves)] = &[
    ("splay_limit_m", Moves::Factors(LENGTH_FACTORS)),
    ("drape_limit_m", Moves::Factors(LENGTH_FACTORS)),
    ("lag_limit_m", Moves::Factors(LENGTH_FACTORS)),
    ("min_storey_m", Moves::Factors(LENGTH_FACTORS)),
    ("relief_limit_m", Moves::Factors(LENGTH_FACTORS)),
    ("incision_relief_ratio", Moves::Factors(LENGTH_FACTORS)),
    ("boundary_window_m", Moves::Factors(LENGTH_FACTORS)),
    ("thick_b_horizon_m", Moves::Factors(LENGTH_FACTORS)),
    ("very_thick_b_horizon_m", Moves::Factors(LENGTH_FACTORS)),
    ("facies_shift_min_classes", Moves::Steps(CLASS_STEPS)),
    ("low_min_proportion", Moves::Steps(FRACTION_STEPS)),
    ("high_max_proportion", Moves::Steps(FRACTION_STEPS)),
];

/// One run's parameters: which parameter moved, to what, and the full set.
#[derive(Debug, Clone)]
pub struct Variant {
    pub parameter: &'static str,
    pub value: f64,
    /// How far from the value used, relative (0.25 for ×1.25 or ×0.75, the step for fractions).
    pub distance: f64,
    pub params: RuleParams,
}

/// Every variant of the parameters used, in the order of [`RANGES`]; variants the parameter
/// checks refuse, or equal to the values used, are left out.
pub fn variants(params: &RuleParams) -> Vec<Variant> {
    let Ok(serde_json::Value::Object(base)) = serde_json::to_value(params) else {
        return Vec::new();
    };
    let mut out = Vec::new();
    for &(name, moves) in RANGES {
        let Some(current) = base.get(name).and_then(serde_json::Value::as_f64) else {
            continue;
        };
        let candidates: Vec<(f64, f64)> = match moves {
            Moves::Factors(fs) => fs.iter().map(|f| (current * f, (f - 1.0).abs())).collect(),
            Moves::Steps(steps) => steps.iter().map(|d| (current + d, d.abs())).collect(),
        };
        for (value, distance) in candidates {
            let mut map = base.clone();
            let v = if name.ends_with("_classes") {
                if value < 1.0 {
                    continue;
                }
                serde_json::json!(value.round() as u64)
            } else {
                serde_json::json!(value)
            };
            if (value - current).abs() < 1e-12 {
                continue;
            }
            map.insert(name.to_string(), v);
            let Ok(p) = serde_json::from_value::<RuleParams>(serde_json::Value::Object(map)) else {
                continue;
            };
            if p.problems().is_empty() {
                out.push(Variant { parameter: name, value, distance, params: p });
            }
        }
    }
    out
}

/// A candidate's outcome in one run: listed with at least moderate strength.
fn listed_firmly(r: &Interpretation) -> BTreeSet<BedId> {
    r.sequence_boundary_candidates
        .iter()
        .filter(|c| c.strength >= Strength::Moderate)
        .map(|c| c.bed_id)
        .collect()
}

/// Each body's identity in one run: lowest and highest bed and stacking.
fn body_keys(r: &Interpretation) -> BTreeSet<(usize, usize, Stacking)> {
    r.channel_bodies
        .iter()
        .map(|b| {
            let (first, last) = body_beds(b, &r.storeys);
            (first, last, b.stacking)
        })
        .collect()
}

/// Tally of one pick over the runs.
#[derive(Default)]
struct Tally {
    same: usize,
    /// The nearest flipping variant: (distance, parameter, value).
    nearest_flip: Option<(f64, &'static str, f64)>,
}

impl Tally {
    fn record(&mut self, same: bool, v: &Variant) {
        if same {
            self.same += 1;
        } else if self.nearest_flip.is_none_or(|(d, _, _)| v.distance < d - 1e-12) {
            self.nearest_flip = Some((v.distance, v.parameter, v.value));
        }
    }

    fn result(&self, runs: usize) -> (f64, Option<Flip>) {
        let stability = if runs == 0 { 1.0 } else { self.same as f64 / runs as f64 };
        let flip =
            self.nearest_flip.map(|(_, parameter, value)| Flip { parameter: parameter.to_string(), value });
        (stability, flip)
    }
}

/// Re-run the rules over [`variants`] of `params` and mark every candidate and body of `result`
/// (the run with `params` itself) with its stability and nearest flip. Returns the number of
/// runs. Linear in beds times runs (41 runs with the default ranges).
pub fn annotate(section: &Section, params: &RuleParams, result: &mut Interpretation) -> usize {
    let variants = variants(params);
    let firm = listed_firmly(result);
    let bodies: Vec<(usize, usize, Stacking)> = result
        .channel_bodies
        .iter()
        .map(|b| {
            let (first, last) = body_beds(b, &result.storeys);
            (first, last, b.stacking)
        })
        .collect();
    let mut candidate_tally: BTreeMap<BedId, Tally> = BTreeMap::new();
    let mut body_tally: Vec<Tally> = bodies.iter().map(|_| Tally::default()).collect();
    for v in &variants {
        let run = super::interpret(section, &v.params);
        let run_firm = listed_firmly(&run);
        let run_bodies = body_keys(&run);
        for c in &result.sequence_boundary_candidates {
            let same = firm.contains(&c.bed_id) == run_firm.contains(&c.bed_id);
            candidate_tally.entry(c.bed_id).or_default().record(same, v);
        }
        for (k, key) in bodies.iter().enumerate() {
            body_tally[k].record(run_bodies.contains(key), v);
        }
    }
    let runs = variants.len();
    for c in &mut result.sequence_boundary_candidates {
        let (stability, flip) = candidate_tally.get(&c.bed_id).map_or((1.0, None), |t| t.result(runs));
        c.stability = Some(stability);
        c.flipped_by = flip;
    }
    for (b, t) in result.channel_bodies.iter_mut().zip(&body_tally) {
        let (stability, flip) = t.result(runs);
        b.stability = Some(stability);
        b.flipped_by = flip;
    }
    runs
}

/// "stable in 96 % of runs", or "stable in 60 % of runs; flips at splay_limit_m = 1.25".
pub fn stability_text(stability: Option<f64>, flip: Option<&Flip>) -> Option<String> {
    let s = stability?;
    let pct = (s * 100.0).round();
    Some(match flip {
        Some(f) if s < 1.0 => {
            format!("stable in {pct} % of runs; flips at {} = {}", f.parameter, trim(f.value))
        }
        _ => format!("stable in {pct} % of runs"),
    })
}

/// A number with at most three decimals and no trailing zeros.
fn trim(v: f64) -> String {
    let t = format!("{v:.3}");
    let t = t.trim_end_matches('0').trim_end_matches('.');
    t.to_string()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_range_names_a_numeric_parameter_and_moves_it() {
        let p = RuleParams::default();
        let vs = variants(&p);
        for (name, _) in RANGES {
            assert!(vs.iter().any(|v| v.parameter == *name), "{name} produced no variant");
        }
        // 9 lengths × 4 + 1 count × 2 + 2 fractions × 4.
        assert_eq!(vs.len(), 9 * 4 + 2 + 2 * 4);
        let splay: Vec<f64> = vs.iter().filter(|v| v.parameter == "splay_limit_m").map(|v| v.value).collect();
        assert_eq!(splay, [0.5, 0.75, 1.25, 1.5]);
        assert!(vs.iter().all(|v| v.params != p));
    }

    #[test]
    fn the_text_names_the_flip_only_when_unstable() {
        let flip = Flip { parameter: "splay_limit_m".into(), value: 1.25 };
        assert_eq!(
            stability_text(Some(0.6), Some(&flip)).as_deref(),
            Some("stable in 60 % of runs; flips at splay_limit_m = 1.25")
        );
        assert_eq!(stability_text(Some(1.0), None).as_deref(), Some("stable in 100 % of runs"));
        assert_eq!(stability_text(None, None), None);
    }
}
