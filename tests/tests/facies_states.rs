//! Lithofacies codes as the states of the transition analysis: on a section where the codes
//! split each lithology, the analysis has more states and more degrees of freedom than on
//! lithology alone, and its counts, expected counts, χ², G², degrees of freedom and p-value agree
//! with an independent computation in Python (numpy iterative proportional fitting with the
//! diagonal as structural zeros, scipy.stats.power_divergence and chi2.sf).

use aggrade_core::analysis::markov::{
    analyse_section, analyse_section_facies, facies_sequence, facies_state_set, TransitionAnalysis,
    TransitionParams,
};
use aggrade_core::model::{
    Bed, Contact, FaciesCode, GrainSize, Lithology, Section, Structure, WentworthClass,
};
use std::process::Command;

/// One kind of bed of the invented section: lithology, grain, structure, and the code the
/// geologist typed (None: the suggestion is in force).
#[derive(Clone, Copy)]
struct Kind(Lithology, WentworthClass, Structure, Option<FaciesCode>);

const GT: Kind = Kind(Lithology::Conglomerate, WentworthClass::Pebble, Structure::TroughCrossBedding, None);
const ST: Kind = Kind(Lithology::Sandstone, WentworthClass::CoarseSand, Structure::TroughCrossBedding, None);
/// Planar cross-beds, the code confirmed by the geologist.
const SP: Kind = Kind(
    Lithology::Sandstone,
    WentworthClass::MediumSand,
    Structure::PlanarCrossBedding,
    Some(FaciesCode::Sp),
);
const SR: Kind = Kind(Lithology::Sandstone, WentworthClass::FineSand, Structure::RippleCrossLamination, None);
const SH: Kind = Kind(Lithology::Sandstone, WentworthClass::FineSand, Structure::HorizontalLamination, None);
const FL: Kind = Kind(Lithology::Mudstone, WentworthClass::Silt, Structure::HorizontalLamination, None);
const FR: Kind = Kind(Lithology::Mudstone, WentworthClass::Clay, Structure::RootTraces, None);
/// Massive mud the geologist coded Fm themselves.
const FM: Kind = Kind(Lithology::Claystone, WentworthClass::Clay, Structure::Massive, Some(FaciesCode::Fm));

/// An invented fining-upward succession of 40 cycles (no real place): each cycle picks its
/// beds from a small pseudo-random generator, so the facies vary from cycle to cycle while the
/// lithologies keep repeating conglomerate/sandstone/mudstone.
fn invented_section() -> Section {
    let mut s = Section::new("Tollen Gill (invented)");
    let mut state: u64 = 0x2545_f491_4f6c_dd1d;
    let mut pick = |n: u64| {
        // Knuth's MMIX linear congruential generator, high bits.
        state = state.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1_442_695_040_888_963_407);
        (state >> 33) % n
    };
    let push = |s: &mut Section, k: Kind, erosional: bool| {
        let id = s.next_bed_id();
        let mut b = Bed::new(id, 0.5 + (id.0 % 5) as f64 * 0.3, k.0, Some(GrainSize::Class(k.1)));
        b.structures = vec![k.2];
        b.facies = k.3;
        if erosional {
            b.base_contact = Contact::Erosional;
        }
        s.beds.push(b);
    };
    for cycle in 0..40 {
        // Channel base: gravel or straight onto sand.
        match pick(3) {
            0 => push(&mut s, GT, true),
            _ => push(&mut s, if pick(2) == 0 { ST } else { SP }, true),
        }
        // Channel fill: one to three sand beds.
        for _ in 0..=pick(3) {
            push(&mut s, [ST, SP, SR, SH][pick(4) as usize], false);
        }
        // Floodplain: laminated, rooted or massive fines, sometimes a crevasse sand.
        for _ in 0..=pick(2) {
            push(&mut s, [FL, FR, FM, SR][pick(4) as usize], false);
        }
        if cycle % 9 == 8 {
            let id = s.next_bed_id();
            s.beds.push(Bed::new(id, 2.0, Lithology::Covered, None));
        }
    }
    s
}

/// Independent computation of the transition analysis from a state sequence.
const ORACLE: &str = r#"
import json, sys
try:
    import numpy as np
    from scipy.stats import power_divergence, chi2
except ImportError as e:
    sys.exit("numpy and scipy are required for this reference check: " + str(e))
seq = json.loads(sys.argv[1])
# Transitions: repeats merged, a null (covered interval) breaks the chain.
pairs = []; prev = None
for s in seq:
    if s is None:
        prev = None; continue
    if prev is not None and prev != s:
        pairs.append((prev, s))
    prev = s
states = sorted({x for p in pairs for x in p})
m = len(states); ix = {s: i for i, s in enumerate(states)}
O = np.zeros((m, m))
for a, b in pairs:
    O[ix[a], ix[b]] += 1
# Quasi-independence with the diagonal as structural zeros: iterative proportional fitting of
# the row and column totals, started from ones off the diagonal (Goodman 1968; Bishop, Fienberg
# & Holland 1975, ch. 5).
E = 1.0 - np.eye(m)
for _ in range(200000):
    E *= (O.sum(axis=1) / E.sum(axis=1))[:, None]
    E *= (O.sum(axis=0) / E.sum(axis=0))[None, :]
    if np.abs(E.sum(axis=1) - O.sum(axis=1)).max() < 1e-12:
        break
off = ~np.eye(m, dtype=bool)
o, e = O[off], E[off]
x2 = float(power_divergence(o, e, lambda_="pearson").statistic)
g2 = float(power_divergence(o, e, lambda_="log-likelihood").statistic)
dof = (m - 1) ** 2 - m
print(json.dumps({"states": states, "observed": O.astype(int).tolist(), "expected": E.tolist(),
                  "chi2": x2, "g2": g2, "dof": dof, "p": float(chi2.sf(x2, dof))}))
"#;

fn oracle(seq: &[Option<&str>]) -> serde_json::Value {
    let arg = serde_json::to_string(seq).expect("json");
    let out = Command::new("python3")
        .arg("-c")
        .arg(ORACLE)
        .arg(arg)
        .output()
        .unwrap_or_else(|e| panic!("python3 is required for this reference check: {e}"));
    assert!(
        out.status.success(),
        "the Python reference check failed:\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("the oracle prints JSON")
}

fn agrees(r: &TransitionAnalysis, seq: &[Option<&str>]) {
    let o = oracle(seq);
    let num = |k: &str| o[k].as_f64().unwrap_or_else(|| panic!("oracle field {k}"));
    let states: Vec<String> = o["states"]
        .as_array()
        .expect("states")
        .iter()
        .map(|v| v.as_str().expect("str").to_string())
        .collect();
    assert_eq!(r.states, states);
    let observed: Vec<Vec<u32>> = serde_json::from_value(o["observed"].clone()).expect("matrix");
    assert_eq!(r.observed, observed);
    let expected: Vec<Vec<f64>> = serde_json::from_value(o["expected"].clone()).expect("matrix");
    for (i, row) in expected.iter().enumerate() {
        for (j, e) in row.iter().enumerate() {
            assert!((r.expected[i][j] - e).abs() < 1e-7, "e[{i}][{j}]: ours {} numpy {e}", r.expected[i][j]);
        }
    }
    assert!(
        (r.chi_square - num("chi2")).abs() < 1e-6 * num("chi2"),
        "χ² {} vs scipy {}",
        r.chi_square,
        num("chi2")
    );
    assert!((r.g_square - num("g2")).abs() < 1e-6 * num("g2"), "G² {} vs scipy {}", r.g_square, num("g2"));
    assert_eq!(r.dof, o["dof"].as_i64().expect("dof"));
    let p = r.p_value.expect("dof ≥ 1");
    assert!((p - num("p")).abs() <= 1e-6 * num("p").max(1e-300), "p {p} vs scipy {}", num("p"));
}

#[test]
fn facies_states_give_more_degrees_of_freedom_and_agree_with_scipy() {
    let s = invented_section();
    let params = TransitionParams::default();

    // Lithology alone: conglomerate, sandstone, mudstone and claystone … at most a handful of
    // states; the issue's typical case is 3 states and 1 degree of freedom.
    let lith = analyse_section(&s, &params).expect("lithology analysis");
    let facies = analyse_section_facies(&s, &params).expect("facies analysis");
    assert_eq!(facies.states, vec!["Fl", "Fm", "Fr", "Gt", "Sh", "Sp", "Sr", "St"]);
    assert!(facies.states.len() > lith.states.len(), "{:?} vs {:?}", facies.states, lith.states);
    // (m − 1)² − m for embedded chains (Powers & Easterling 1982): 8 states give 41.
    assert_eq!(facies.dof, 41);
    assert!(facies.dof > lith.dof, "dof {} (facies) vs {} (lithology)", facies.dof, lith.dof);

    // Both analyses against the independent computation.
    let facies_seq = facies_sequence(&s);
    agrees(&facies, &facies_seq);
    let lith_seq: Vec<Option<&str>> =
        s.beds.iter().map(|b| (!b.is_covered()).then_some(b.lithology.name())).collect();
    agrees(&lith, &lith_seq);

    // Where the codes came from: Sp and Fm beds were typed by the geologist, the rest suggested.
    let set = facies_state_set(&s);
    let typed = s.beds.iter().filter(|b| b.facies.is_some()).count();
    let exposed = s.beds.iter().filter(|b| !b.is_covered()).count();
    assert!(typed > 0 && typed < exposed);
    assert_eq!(set.confirmed, typed);
    assert_eq!(set.suggested, exposed - typed);
    assert_eq!(set.uncoded, 0);
}

#[test]
fn a_typical_three_lithology_section_gains_states_from_its_codes() {
    // The issue's case: sandstone, mudstone, coal repeated, 3 states and 1 degree of freedom on
    // lithology; the structures logged split sandstone into St/Sr and mudstone into Fl/Fr.
    let mut s = Section::new("Three lithologies (invented)");
    let beds: [(Lithology, Structure); 12] = [
        (Lithology::Sandstone, Structure::TroughCrossBedding),
        (Lithology::Mudstone, Structure::HorizontalLamination),
        (Lithology::Coal, Structure::Massive),
        (Lithology::Sandstone, Structure::RippleCrossLamination),
        (Lithology::Mudstone, Structure::RootTraces),
        (Lithology::Coal, Structure::Massive),
        (Lithology::Sandstone, Structure::TroughCrossBedding),
        (Lithology::Mudstone, Structure::RootTraces),
        (Lithology::Sandstone, Structure::RippleCrossLamination),
        (Lithology::Coal, Structure::Massive),
        (Lithology::Mudstone, Structure::HorizontalLamination),
        (Lithology::Sandstone, Structure::TroughCrossBedding),
    ];
    for (lith, st) in beds {
        let id = s.next_bed_id();
        let grain = match lith {
            Lithology::Sandstone => Some(GrainSize::Class(WentworthClass::MediumSand)),
            Lithology::Mudstone => Some(GrainSize::Class(WentworthClass::Clay)),
            _ => None,
        };
        let mut b = Bed::new(id, 1.0, lith, grain);
        b.structures = vec![st];
        s.beds.push(b);
    }
    let params = TransitionParams::default();
    let lith = analyse_section(&s, &params).expect("lithology analysis");
    assert_eq!((lith.states.len(), lith.dof), (3, 1));
    let facies = analyse_section_facies(&s, &params).expect("facies analysis");
    assert_eq!(facies.states, vec!["C", "Fl", "Fr", "Sr", "St"]);
    assert_eq!(facies.dof, 11, "(5 − 1)² − 5");
    agrees(&facies, &facies_sequence(&s));
}
