//! The moving-window channel-body proportion checked against an independent computation with
//! numpy (PyPI): the section is sampled every centimetre and each window summed with
//! `numpy.cumsum`, so the prefix sums and the interpolation inside beds are checked from outside.
//! Fails (does not skip) when python3 or numpy is missing.

use aggrade_core::model::{Bed, BedId, Contact, GrainSize, Lithology, Section, WentworthClass};
use aggrade_core::rules::{interpret, Element, RuleParams};
use std::process::Command;

/// numpy side: per-centimetre channel and exposure flags, window sums by cumulative sums.
const ORACLE: &str = r#"
import json, sys
try:
    import numpy as np
except ImportError:
    sys.exit("numpy is not installed: pip install numpy (see scripts/requirements-test.txt)")
d = json.load(sys.stdin)
cm = np.array(d["thickness_cm"], dtype=np.int64)
chan = np.repeat(np.array(d["channel"], dtype=np.float64), cm)
expo = np.repeat(np.array(d["exposed"], dtype=np.float64), cm)
C = np.concatenate([[0.0], np.cumsum(chan)])
E = np.concatenate([[0.0], np.cumsum(expo)])
total = int(cm.sum())
half = d["half_window_cm"]
out = []
for h in range(0, total + 1, d["step_cm"]):
    a, b = max(h - half, 0), min(h + half, total)
    e = E[b] - E[a]
    out.append(None if e == 0 else float((C[b] - C[a]) / e))
whole = None if E[-1] == 0 else float(C[-1] / E[-1])
print(json.dumps({"curve": out, "whole": whole}))
"#;

/// A deterministic pseudo-random section with beds in whole centimetres (a linear congruential
/// generator, so the test needs no extra crate and always builds the same section).
fn generated(n: usize) -> (Section, Vec<u64>) {
    let mut state: u64 = 0x2545_f491_4f6c_dd1d;
    let mut next = move |m: u64| {
        state = state.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1_442_695_040_888_963_407);
        (state >> 33) % m
    };
    let mut s = Section::new("Oracle");
    let mut cms = Vec::new();
    for i in 0..n {
        let cm = 10 + next(400);
        let lith = [Lithology::Mudstone, Lithology::Sandstone, Lithology::Sandstone, Lithology::Covered]
            [next(4) as usize];
        let grain = (lith != Lithology::Covered).then_some(GrainSize::Class(WentworthClass::MediumSand));
        let mut b = Bed::new(BedId(i as u64 + 1), cm as f64 / 100.0, lith, grain);
        b.base_contact = [Contact::Sharp, Contact::Erosional][next(2) as usize];
        s.beds.push(b);
        cms.push(cm);
    }
    (s, cms)
}

#[test]
fn proportion_curve_matches_numpy_window_sums() {
    let (s, cms) = generated(300);
    let p = RuleParams { window_m: 10.0, curve_step_m: 0.5, ..RuleParams::default() };
    let r = interpret(&s, &p);
    let flags = |f: &dyn Fn(Element) -> bool| r.elements.iter().map(|&e| u8::from(f(e))).collect::<Vec<_>>();
    let input = serde_json::json!({
        "thickness_cm": cms,
        "channel": flags(&|e| e == Element::ChannelDeposit),
        "exposed": flags(&|e| e != Element::Covered),
        "half_window_cm": 500,
        "step_cm": 50,
    });
    let mut child = Command::new("python3")
        .args(["-c", ORACLE])
        .stdin(std::process::Stdio::piped())
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .expect("python3 must be installed to run the numpy reference check");
    {
        use std::io::Write;
        let mut stdin = child.stdin.take().expect("stdin");
        stdin.write_all(input.to_string().as_bytes()).expect("write to python3");
    }
    let out = child.wait_with_output().expect("python3 runs");
    assert!(out.status.success(), "numpy oracle failed: {}", String::from_utf8_lossy(&out.stderr));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("oracle prints JSON");
    let oracle = v["curve"].as_array().expect("curve");

    assert!(r.channel_bodies.len() > 10, "the generated section should hold many bodies");
    assert_eq!(r.proportion_curve.len(), oracle.len(), "number of curve points");
    let mut some = 0;
    for (k, (ours, theirs)) in r.proportion_curve.iter().zip(oracle).enumerate() {
        assert!((ours.height_m - k as f64 * 0.5).abs() < 1e-9);
        match (ours.proportion, theirs.as_f64()) {
            (Some(a), Some(b)) => {
                some += 1;
                assert!((a - b).abs() < 1e-9, "at {} m: ours {a}, numpy {b}", ours.height_m)
            }
            (None, None) => {}
            (a, _) => panic!("at {} m: ours {a:?}, numpy {theirs}", ours.height_m),
        }
    }
    assert!(some > oracle.len() / 2, "most points should have exposure");
    let whole = v["whole"].as_f64().expect("whole-section proportion");
    assert!((r.channel_proportion.expect("exposed") - whole).abs() < 1e-12);
}
