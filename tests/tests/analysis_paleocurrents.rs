//! Paleocurrent statistics checked against published worked values, Davis (2002) critical R̄
//! values, and scipy / astropy run on the same numbers.

use crate::support::oracle::{python_json, SplitMix};
use aggrade_core::analysis::paleocurrents::{
    circular_summary, rayleigh_p, CircularParams, DataKind, RayleighApproximation,
};
use proptest::prelude::*;

/// Seeded datasets: n readings spread ±spread° around a mean (wrapped to 0–360).
fn datasets() -> Vec<Vec<f64>> {
    let mut rng = SplitMix(20_261_201);
    [
        (5, 40.0, 60.0),
        (8, 350.0, 30.0),
        (12, 200.0, 170.0),
        (25, 90.0, 90.0),
        (60, 10.0, 120.0),
        (150, 300.0, 180.0),
    ]
    .iter()
    .map(|&(n, mean, spread)| {
        (0..n).map(|_| (mean + (rng.next_f64() * 2.0 - 1.0) * spread).rem_euclid(360.0)).collect()
    })
    .collect()
}

const SCIPY_ASTROPY: &str = r#"
import json, sys
try:
    import numpy as np
    from scipy.stats import circmean, circstd
    from astropy.stats import rayleightest
except ImportError as e:
    sys.exit("a reference library is missing: " + str(e))
out = []
for d in json.loads(sys.argv[1]):
    a = np.array(d)
    out.append({
        "mean": float(circmean(a, high=360.0, low=0.0)),
        "std": float(circstd(a, high=360.0, low=0.0)),
        "axial_mean": float(circmean(a, high=180.0, low=0.0)),
        "axial_std": float(circstd(a, high=180.0, low=0.0)),
        "rayleigh_p": float(rayleightest(np.radians(a))),
    })
print(json.dumps(out))
"#;

fn angle_diff(a: f64, b: f64, period: f64) -> f64 {
    let d = (a - b).rem_euclid(period);
    d.min(period - d)
}

#[test]
fn worked_example_from_references() {
    // The data of the worked example in astropy's `astropy.stats.circstats` documentation; z, p,
    // R̄ and mean computed from them (Rayleigh test after Mardia & Jupp 2000, §6.3.1 from memory): angles 0.785, 1.570, 3.141,
    // 0.839, 5.934 rad → z = 1.236, p = 0.3048, R̄ = 0.4972, mean 58.04°.
    #[allow(clippy::approx_constant)] // 3.141 is a data value of the example, not π.
    let rad = [0.785, 1.570, 3.141, 0.839, 5.934];
    let deg: Vec<f64> = rad.iter().map(|r: &f64| r.to_degrees()).collect();
    let s = circular_summary(&deg, &CircularParams::default()).expect("valid");
    assert!((s.rayleigh_z - 1.236).abs() < 5e-4, "z {}", s.rayleigh_z);
    assert!((s.rayleigh_p - 0.3048).abs() < 5e-5, "p {}", s.rayleigh_p);
    assert!((s.mean_resultant_length - 0.4972).abs() < 5e-5, "R̄ {}", s.mean_resultant_length);
    assert!((s.mean_azimuth_deg.expect("mean") - 58.04).abs() < 5e-3);
}

#[test]
fn davis_critical_values_give_p_near_five_percent() {
    // Davis (2002), Table A.10 (after Mardia 1972): critical R̄ at α = 0.05 for n = 5, 10, 20.
    // Tolerance 0.001: the table rounds R̄ to 3 decimals, and ±0.0005 in R̄ moves Zar's p by at
    // most 0.0004 at these n; the rest is left for the approximation itself (Zar 1999 gives it
    // as good to about three decimals — from memory).
    for (n, rbar) in [(5usize, 0.754), (10, 0.540), (20, 0.385)] {
        let p = rayleigh_p(n, rbar, RayleighApproximation::Zar1999);
        assert!((p - 0.05).abs() < 0.001, "n = {n}, R̄ = {rbar}: p = {p}");
        let p_series = rayleigh_p(n, rbar, RayleighApproximation::SeriesExpansion);
        assert!((p_series - 0.05).abs() < 0.001, "series, n = {n}: p = {p_series}");
    }
}

#[test]
fn seeded_datasets_match_scipy_and_astropy() {
    let sets = datasets();
    let json = serde_json::to_string(&sets).expect("numbers");
    let oracle = python_json(SCIPY_ASTROPY, &[&json], "scipy and astropy");
    let oracle = oracle.as_array().expect("list");
    assert_eq!(oracle.len(), sets.len());
    let mut worst_zar_vs_astropy: f64 = 0.0;
    for (d, o) in sets.iter().zip(oracle) {
        let num = |k: &str| o[k].as_f64().unwrap_or_else(|| panic!("oracle field {k}"));
        let dir = circular_summary(d, &CircularParams::default()).expect("valid");
        // scipy.stats.circmean / circstd with high=360 (degrees).
        assert!(angle_diff(dir.mean_azimuth_deg.expect("mean"), num("mean"), 360.0) < 1e-8, "{dir:?} vs {o}");
        assert!((dir.circular_std_deg - num("std")).abs() < 1e-8, "{dir:?} vs {o}");
        // scipy with high=180 treats the data as axial (angles doubled onto the full circle).
        let axial = CircularParams { kind: DataKind::Axial, ..Default::default() };
        let ax = circular_summary(d, &axial).expect("valid");
        assert!(
            angle_diff(ax.mean_azimuth_deg.expect("mean"), num("axial_mean"), 180.0) < 1e-8,
            "{ax:?} vs {o}"
        );
        assert!((ax.circular_std_deg - num("axial_std")).abs() < 1e-8, "{ax:?} vs {o}");
        // astropy.stats.rayleightest uses the series expansion: same formula, same numbers.
        let series =
            CircularParams { rayleigh: RayleighApproximation::SeriesExpansion, ..Default::default() };
        let s = circular_summary(d, &series).expect("valid");
        assert!((s.rayleigh_p - num("rayleigh_p").clamp(0.0, 1.0)).abs() < 1e-10, "{s:?} vs {o}");
        // Zar's approximation and the series are different approximations of one tail
        // probability; they agree closely but not exactly.
        worst_zar_vs_astropy =
            worst_zar_vs_astropy.max((dir.rayleigh_p - num("rayleigh_p").clamp(0.0, 1.0)).abs());
    }
    assert!(worst_zar_vs_astropy < 0.01, "Zar vs astropy differ by {worst_zar_vs_astropy}");
    eprintln!("largest |p(Zar) − p(astropy)| over the seeded datasets: {worst_zar_vs_astropy:.5}");
}

proptest! {
    /// Rotating every reading by the same angle rotates the mean by that angle and leaves R̄,
    /// the circular spread and the Rayleigh test unchanged (rotation equivariance of the vector
    /// mean; Mardia & Jupp 2000, ch. 2).
    #[test]
    fn statistics_follow_a_rotation(
        readings in prop::collection::vec(0.0f64..360.0, 2..40),
        shift in 0.0f64..360.0,
    ) {
        let p = CircularParams::default();
        let a = circular_summary(&readings, &p).expect("valid");
        let rotated: Vec<f64> = readings.iter().map(|r| (r + shift).rem_euclid(360.0)).collect();
        let b = circular_summary(&rotated, &p).expect("valid");
        prop_assert!((a.mean_resultant_length - b.mean_resultant_length).abs() < 1e-9);
        prop_assert!((a.rayleigh_p - b.rayleigh_p).abs() < 1e-9);
        prop_assert!((0.0..=1.0).contains(&a.rayleigh_p));
        // The mean is only defined well away from a balanced sample.
        if a.mean_resultant_length > 1e-6 {
            let ma = a.mean_azimuth_deg.expect("mean");
            let mb = b.mean_azimuth_deg.expect("mean");
            prop_assert!(angle_diff(ma + shift, mb, 360.0) < 1e-6, "{ma} + {shift} vs {mb}");
        }
    }
}
