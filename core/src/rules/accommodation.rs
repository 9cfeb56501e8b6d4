//! Accommodation regime intervals, one per stretch between boundaries (accepted ones, else
//! strong candidates), never across one. Each stretch collects signs of low and of high
//! accommodation and is called when one side has enough of them and more than the other:
//!
//! | low accommodation | high accommodation |
//! | --- | --- |
//! | most bodies multi-storey (amalgamated) | several single-storey bodies, most bodies isolated |
//! | channel-body proportion ≥ `low_min_proportion` + margin | proportion ≤ `high_max_proportion` − margin |
//!
//! (the proportion gives a sign only where the stretch holds a channel body)
//! | most paleosols mature and well drained | most paleosols immature or poorly drained |
//!
//! Stacking and proportion after Allen (1978), Bridge & Leeder (1979) and Shanley & McCabe
//! (1994); the soils after Wright & Marriott (1993) and Kraus (1999): slow aggradation leaves
//! time for mature, well-drained profiles, rapid aggradation leaves weakly developed, often
//! hydromorphic (gleyed) ones. "Poorly drained" here is a gleyed profile (poorly or very poorly
//! drained, or gleying, a `g` horizon or a low-chroma matrix where its maturity is). A mature
//! profile read as somewhat poorly (imperfectly) drained — mottles in an oxidised matrix, or the
//! class logged — counts on neither side: seasonal wetting of a red, mottled soil marks its
//! place on the floodplain and the climate more than the rate of aggradation (Kraus & Aslan
//! 1993), and it is not a well-drained soil either. An immature one counts as immature.
//!
//! A proportion within the margin of a threshold gives no sign. A call needs [`MIN_SIGNS`] signs and more than the other side has (our choice: one sign
//! alone, such as a single amalgamated body, is too little to call a regime on).

use super::column::{Column, TOL};
use super::evidence::{RegimeSign, RegimeWhy, Undetermined};
use super::params::RuleParams;
use super::types::{ChannelBody, DrainageReading, PaleosolProfile, Regime, RegimeInterval, Stacking};

/// Signs a call needs at the least (and more than the other side has).
pub const MIN_SIGNS: usize = 2;

/// The call for one stretch.
fn call(
    column: &Column,
    bodies: &[&ChannelBody],
    soils: &[&PaleosolProfile],
    (base_m, top_m): (f64, f64),
    params: &RuleParams,
) -> (Regime, RegimeWhy) {
    let len_m = top_m - base_m;
    if len_m <= 0.0 {
        return (
            Regime::Undetermined,
            RegimeWhy::Undetermined { signs: vec![], reasons: vec![Undetermined::NoThickness] },
        );
    }
    let (channel_m, exposed_m) = column.window_m(base_m, top_m);
    let covered = 1.0 - exposed_m / len_m;
    if covered > params.max_covered_fraction + TOL {
        let percent = (covered * 100.0).round();
        let why = Undetermined::MostlyCovered { percent, base_m, top_m };
        return (Regime::Undetermined, RegimeWhy::Undetermined { signs: vec![], reasons: vec![why] });
    }
    let mut low = Vec::new();
    let mut high = Vec::new();
    let mut reasons = Vec::new();

    // Stacking of the bodies seen whole enough to tell.
    let multi = bodies.iter().filter(|b| b.stacking == Stacking::MultiStory).count();
    let single = bodies.iter().filter(|b| b.stacking == Stacking::SingleStory).count();
    let told = multi + single;
    let partly_seen = bodies.len() - told;
    if told == 0 && !bodies.is_empty() {
        reasons.push(Undetermined::PartlySeenBodies { bodies: bodies.len() });
    } else if multi * 2 > told {
        low.push(RegimeSign::Amalgamated { multi, bodies: told, partly_seen });
    } else if single * 2 > told {
        if single >= params.high_min_isolated_bodies {
            high.push(RegimeSign::Isolated { single, bodies: told, partly_seen });
        } else {
            reasons.push(Undetermined::TooFewIsolated {
                bodies: single,
                needed: params.high_min_isolated_bodies,
            });
        }
    }

    // Channel-body proportion, with a margin around each threshold; a stretch of floodplain
    // alone says nothing about how channel bodies stack.
    if bodies.is_empty() {
        reasons.push(Undetermined::NoChannelBody { base_m, top_m });
    } else if exposed_m > 0.0 {
        let p = channel_m / exposed_m;
        let margin = params.regime_margin;
        let (lo, hi) = (params.low_min_proportion, params.high_max_proportion);
        if (p - lo).abs() < margin - TOL {
            reasons.push(Undetermined::NearThreshold { proportion: p, threshold: lo, margin });
        } else if (p - hi).abs() < margin - TOL {
            reasons.push(Undetermined::NearThreshold { proportion: p, threshold: hi, margin });
        } else if p >= lo - TOL {
            low.push(RegimeSign::SandRich { proportion: p, min: lo });
        } else if p <= hi + TOL {
            high.push(RegimeSign::MudRich { proportion: p, max: hi });
        }
    }

    // Paleosol maturity and drainage.
    if !soils.is_empty() {
        // A mature, somewhat poorly (imperfectly) drained profile counts on neither side: seasonal
        // wetting in an oxidised soil is not the gleyed, hydromorphic soil that rapid aggradation
        // leaves (Kraus 1999), nor a well-drained one (see the module notes).
        let mature = soils
            .iter()
            .filter(|p| p.maturity.is_strong() && p.drainage_reading == DrainageReading::NotPoorly)
            .count();
        let immature = soils.iter().filter(|p| !p.maturity.is_strong() || p.poorly_drained).count();
        if mature * 2 > soils.len() {
            low.push(RegimeSign::MatureSoils { mature, profiles: soils.len() });
        } else if immature * 2 > soils.len() {
            high.push(RegimeSign::ImmatureOrWetSoils { count: immature, profiles: soils.len() });
        }
    }

    let (nl, nh) = (low.len(), high.len());
    if nl >= MIN_SIGNS && nl > nh {
        (Regime::Low, RegimeWhy::Called { signs: low, against: high })
    } else if nh >= MIN_SIGNS && nh > nl {
        (Regime::High, RegimeWhy::Called { signs: high, against: low })
    } else {
        if nl == nh && nl > 0 {
            reasons.push(Undetermined::Mixed { low: nl, high: nh });
        } else {
            reasons.push(Undetermined::TooFewSigns { signs: nl.max(nh), needed: MIN_SIGNS });
        }
        low.extend(high);
        (Regime::Undetermined, RegimeWhy::Undetermined { signs: low, reasons })
    }
}

/// Regime intervals covering the whole section, base first: one per stretch between the cut
/// heights. A body belongs to the stretch its base lies in, a paleosol to the one its top lies in.
pub fn regimes(
    column: &Column,
    bodies: &[ChannelBody],
    paleosols: &[PaleosolProfile],
    cuts_m: &[f64],
    params: &RuleParams,
) -> Vec<RegimeInterval> {
    let total = column.total_m();
    let mut heights: Vec<f64> =
        cuts_m.iter().copied().filter(|h| h.is_finite() && *h > TOL && *h < total - TOL).collect();
    heights.sort_by(f64::total_cmp);
    heights.dedup_by(|a, b| (*a - *b).abs() <= TOL);
    let mut out = Vec::with_capacity(heights.len() + 1);
    let mut base = 0.0;
    // Bodies and soils are in rising order: two cursors keep the whole pass linear.
    let (mut kb, mut ks) = (0, 0);
    for top in heights.into_iter().chain(std::iter::once(total)) {
        let last = top >= total;
        let in_stretch = |h: f64| h < top - TOL || last;
        let from_b = kb;
        while kb < bodies.len() && in_stretch(bodies[kb].base_m) {
            kb += 1;
        }
        let from_s = ks;
        while ks < paleosols.len() && (paleosols[ks].top_m <= top + TOL || last) {
            ks += 1;
        }
        let b: Vec<&ChannelBody> = bodies[from_b..kb].iter().collect();
        let s: Vec<&PaleosolProfile> = paleosols[from_s..ks].iter().collect();
        let (regime, why) = call(column, &b, &s, (base, top), params);
        out.push(RegimeInterval { base_m: base, top_m: top, regime, why });
        base = top;
    }
    out
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
    fn mature_imperfectly_drained_soils_weigh_on_neither_side() {
        // Two isolated single-storey bodies, proportion 4/16 = 0.25: two signs of high. Two very
        // strong soils: unmarked they are mature and well drained (a sign of low, Kraus 1999);
        // gleyed they are poorly drained (a third sign of high, Wright & Marriott 1993); mottled
        // with no gleyed matrix they are somewhat poorly (imperfectly) drained and give no sign
        // either way (Kraus & Aslan 1993: seasonal wetting in an oxidised soil; our choice).
        use crate::model::{PaleosolDevelopment, PaleosolFeature};
        use Lithology::{Mudstone, Sandstone};
        let with = |feature: Option<PaleosolFeature>| {
            let mut s = section(&[
                (3.0, Mudstone, false),
                (2.0, Sandstone, true),
                (5.0, Mudstone, false),
                (2.0, Sandstone, true),
                (4.0, Mudstone, false),
            ]);
            for k in [0, 2] {
                s.beds[k].grain_base = Some(GrainSize::Class(WentworthClass::Silt));
                s.beds[k].paleosol = PaleosolDevelopment::VeryStrong;
                s.beds[k].paleosol_features.extend(feature);
            }
            let r = interpret(&s, &RuleParams::default());
            assert_eq!(r.accommodation.len(), 1);
            assert_eq!(r.accommodation[0].regime, Regime::High, "{}", r.accommodation[0].why);
            r.accommodation[0].why.to_string()
        };
        let dry = with(None);
        assert!(dry.contains("against: 2 of 2 paleosols mature and well drained"), "{dry}");
        let wet = with(Some(PaleosolFeature::Gleying));
        assert!(wet.contains("2 of 2 paleosols immature or poorly drained"), "{wet}");
        let mottled = with(Some(PaleosolFeature::Mottling));
        assert!(!mottled.contains("paleosols"), "{mottled}");
    }

    #[test]
    fn mostly_covered_stretch_is_undetermined_and_says_why() {
        // Mud 0–1 m, multi-storey body 1–5 m, then 10 m covered and 2 m mud: with no boundary the
        // stretch is the whole 17 m, 10/17 = 59 % covered (> 50 %), so no call despite the
        // amalgamated body.
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
            r.accommodation[0].why.to_string().contains("mostly covered (59% of 0.00–17.00 m)"),
            "{}",
            r.accommodation[0].why
        );
    }

    #[test]
    fn multi_storey_body_in_thick_fines_is_mixed_evidence() {
        // Two storeys 1–3 m in 11 m: amalgamated (a sign of low) but a proportion of
        // 2/11 = 0.18 ≤ 0.30 (a sign of high): one each, undetermined.
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
            r.accommodation[0].why.to_string().contains("mixed: 1 sign(s) of low and 1 of high"),
            "{}",
            r.accommodation[0].why
        );
    }
}
