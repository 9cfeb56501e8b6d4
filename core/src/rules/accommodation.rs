//! Accommodation regime intervals: low where bodies are amalgamated and the channel-body
//! proportion is high, high where single-story bodies sit isolated in thick fines, undetermined
//! where the evidence is thin or mixed. Each call explains itself in words.
//!
//! The section is cut at channel-body bases: each stretch runs from one body's base to the next
//! body's base (the stretch below the first body has no body). Neighbouring stretches with the
//! same call are merged.

use super::column::{proportion_of, Column, RisingWindows, TOL};
use super::evidence::{RegimeWhy, Undetermined};
use super::params::RuleParams;
use super::types::{ChannelBody, Regime, RegimeInterval, Stacking};

/// One stretch with its first call and, when undetermined, why.
struct Stretch {
    base_m: f64,
    top_m: f64,
    body: Option<usize>,
    regime: Regime,
    reasons: Vec<Undetermined>,
}

/// The first call for one stretch, before neighbours are merged.
fn call(windows: &mut RisingWindows, bodies: &[ChannelBody], s: &mut Stretch, params: &RuleParams) {
    let len_m = s.top_m - s.base_m;
    let (channel_m, exposed_m) = windows.window_m(s.base_m, s.top_m);
    let covered = if len_m > 0.0 { 1.0 - exposed_m / len_m } else { 1.0 };
    let proportion = proportion_of(channel_m, exposed_m);
    let undetermined = |s: &mut Stretch, why: Undetermined| {
        s.regime = Regime::Undetermined;
        s.reasons.push(why);
    };
    if len_m <= 0.0 {
        return undetermined(s, Undetermined::NoThickness);
    }
    if covered > params.max_covered_fraction + TOL {
        let pct = (covered * 100.0).round();
        let (base_m, top_m) = (s.base_m, s.top_m);
        return undetermined(s, Undetermined::MostlyCovered { percent: pct, base_m, top_m });
    }
    let (Some(k), Some(p)) = (s.body, proportion) else {
        let (base_m, top_m) = (s.base_m, s.top_m);
        return undetermined(s, Undetermined::NoChannelBody { base_m, top_m });
    };
    match bodies[k].stacking {
        Stacking::MultiStory if p >= params.low_min_proportion - TOL => s.regime = Regime::Low,
        Stacking::SingleStory if p <= params.high_max_proportion + TOL => s.regime = Regime::High,
        Stacking::MultiStory => {
            let why = Undetermined::MultiStoryTooLittle {
                base_m: s.base_m,
                proportion: p,
                min: params.low_min_proportion,
            };
            undetermined(s, why)
        }
        Stacking::Undetermined => {
            let why = Undetermined::PartlySeenBody { base_m: s.base_m };
            undetermined(s, why)
        }
        Stacking::SingleStory => {
            let why = Undetermined::SingleStoryTooMuch {
                base_m: s.base_m,
                proportion: p,
                max: params.high_max_proportion,
            };
            undetermined(s, why)
        }
    }
}

/// Merge neighbours with the same regime.
fn merge(stretches: Vec<Vec<Stretch>>) -> Vec<Vec<Stretch>> {
    let mut out: Vec<Vec<Stretch>> = Vec::new();
    for group in stretches {
        match out.last_mut() {
            Some(last) if last[0].regime == group[0].regime => last.extend(group),
            _ => out.push(group),
        }
    }
    out
}

/// The reasoning for a merged group (put into words only when shown).
fn why(
    windows: &mut RisingWindows,
    bodies: &[ChannelBody],
    group: &[Stretch],
    params: &RuleParams,
) -> RegimeWhy {
    let base = group[0].base_m;
    let top = group[group.len() - 1].top_m;
    let proportion = windows.proportion(base, top);
    let in_group = || group.iter().filter_map(|s| s.body.map(|k| &bodies[k]));
    match group[0].regime {
        Regime::Low => RegimeWhy::Low {
            bodies: in_group().count(),
            storeys: in_group().map(|b| b.stories).sum(),
            amalgamated_bases: in_group().map(|b| b.amalgamated_bases).sum(),
            proportion,
            min: params.low_min_proportion,
        },
        Regime::High => {
            RegimeWhy::High { bodies: in_group().count(), proportion, max: params.high_max_proportion }
        }
        Regime::Undetermined => RegimeWhy::Undetermined {
            reasons: group.iter().flat_map(|s| s.reasons.iter().cloned()).collect(),
        },
    }
}

/// Regime intervals covering the whole section, base first.
pub fn regimes(column: &Column, bodies: &[ChannelBody], params: &RuleParams) -> Vec<RegimeInterval> {
    let total = column.total_m();
    let mut cuts: Vec<(f64, Option<usize>)> = Vec::with_capacity(bodies.len() + 1);
    if bodies.first().is_none_or(|b| b.base_m > 0.0) {
        cuts.push((0.0, None));
    }
    cuts.extend(bodies.iter().enumerate().map(|(k, b)| (b.base_m, Some(k))));
    // Stretches and groups both rise up the section: one cursor each keeps the windows linear.
    let mut windows = column.rising_windows();
    let mut stretches: Vec<Vec<Stretch>> = Vec::with_capacity(cuts.len());
    for (i, &(base_m, body)) in cuts.iter().enumerate() {
        let top_m = cuts.get(i + 1).map_or(total, |c| c.0);
        let mut s = Stretch { base_m, top_m, body, regime: Regime::Undetermined, reasons: Vec::new() };
        call(&mut windows, bodies, &mut s, params);
        stretches.push(vec![s]);
    }
    let mut groups = merge(stretches);
    // One isolated body may be a local avulsion: a high call needs several in a row.
    for g in &mut groups {
        if g[0].regime == Regime::High && g.len() < params.high_min_isolated_bodies {
            let n = g.len();
            for s in g.iter_mut() {
                s.regime = Regime::Undetermined;
            }
            g[0].reasons
                .push(Undetermined::TooFewIsolated { bodies: n, needed: params.high_min_isolated_bodies });
        }
    }
    let mut windows = column.rising_windows();
    merge(groups)
        .iter()
        .map(|g| RegimeInterval {
            base_m: g[0].base_m,
            top_m: g[g.len() - 1].top_m,
            regime: g[0].regime,
            why: why(&mut windows, bodies, g, params),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use crate::model::{Bed, BedId, Contact, GrainSize, Lithology, Section, WentworthClass};
    use crate::rules::{interpret, Regime, RuleParams};

    fn section(spec: &[(f64, Lithology, bool)]) -> Section {
        let mut s = Section::new("t");
        for (i, &(t, lith, erosional)) in spec.iter().enumerate() {
            let grain = (lith != Lithology::Covered).then_some(GrainSize::Class(WentworthClass::MediumSand));
            let mut b = Bed::new(BedId(i as u64 + 1), t, lith, grain);
            if erosional {
                b.base_contact = Contact::Erosional;
            }
            s.beds.push(b);
        }
        s
    }

    #[test]
    fn mostly_covered_stretch_is_undetermined_and_says_why() {
        // Multi-story body 1–5 m, then 10 m covered and 1 m mud: stretch 1–17 m is 10/16 = 63 %
        // covered (> 50 %), so no low call despite the amalgamated body.
        use Lithology::{Covered, Mudstone, Sandstone};
        let s = section(&[
            (1.0, Mudstone, false),
            (2.0, Sandstone, true),
            (2.0, Sandstone, true),
            (10.0, Covered, false),
            (2.0, Mudstone, false),
        ]);
        let r = interpret(&s, &RuleParams::default());
        assert_eq!(r.accommodation.len(), 1, "{:?}", r.accommodation);
        assert_eq!(r.accommodation[0].regime, Regime::Undetermined);
        assert!(
            r.accommodation[0].why.to_string().contains("mostly covered (63% of 1.00–17.00 m)"),
            "{}",
            r.accommodation[0].why
        );
    }

    #[test]
    fn multi_story_body_in_thick_fines_is_mixed_evidence() {
        // Two storeys 1–3 m then 8 m of mud: proportion 2/10 = 0.2 < 0.5 → undetermined.
        use Lithology::{Mudstone, Sandstone};
        let s = section(&[
            (1.0, Mudstone, false),
            (1.0, Sandstone, true),
            (1.0, Sandstone, true),
            (8.0, Mudstone, false),
        ]);
        let r = interpret(&s, &RuleParams::default());
        assert!(r.accommodation.iter().all(|a| a.regime == Regime::Undetermined));
        assert!(
            r.accommodation[0].why.to_string().contains("proportion only 0.20"),
            "{}",
            r.accommodation[0].why
        );
    }
}
