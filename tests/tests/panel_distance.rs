//! Horizontal distances of the correlation panel checked against an independent reference:
//! astropy's `angular_separation` (Vincenty's formula on the sphere, PyPI) times the same mean
//! Earth radius, run from python3; and the column order that follows from those distances.

use aggrade_core::layout::{haversine_m, panel_positions, PositionSource, EARTH_MEAN_RADIUS_M};
use aggrade_core::model::{LatLon, Section};
use std::process::Command;

/// Great-circle distances (m) from astropy for pairs (lat1, lon1, lat2, lon2) in degrees.
fn astropy_distances(pairs: &[[f64; 4]]) -> Vec<f64> {
    let script = format!(
        r#"
import json, math, sys
try:
    from astropy.coordinates import angular_separation
except ImportError as e:
    print(f"missing Python reference library: {{e}}; install with pip install astropy", file=sys.stderr)
    sys.exit(3)
pairs = json.loads(sys.argv[1])
R = {EARTH_MEAN_RADIUS_M}
out = []
for lat1, lon1, lat2, lon2 in pairs:
    # angular_separation(lon1, lat1, lon2, lat2) in radians (Vincenty formula)
    a = angular_separation(math.radians(lon1), math.radians(lat1), math.radians(lon2), math.radians(lat2))
    out.append(float(a) * R)
print(json.dumps(out))
"#
    );
    let arg = serde_json::to_string(pairs).expect("json");
    let out = Command::new("python3")
        .arg("-c")
        .arg(&script)
        .arg(arg)
        .output()
        .unwrap_or_else(|e| panic!("cannot run python3 (needed for the astropy reference): {e}"));
    assert!(out.status.success(), "astropy reference failed: {}", String::from_utf8_lossy(&out.stderr));
    serde_json::from_slice(&out.stdout).expect("python prints a JSON list")
}

#[test]
fn haversine_agrees_with_astropy() {
    let pairs = [
        // Invented demo sites a kilometre or so apart (the panel's usual case).
        [-24.6132, 133.7208, -24.6071, 133.7295],
        [-24.6132, 133.7208, -24.5912, 133.7534],
        // Long and awkward ones: across the antimeridian, across the equator, near a pole,
        // nearly antipodal.
        [10.0, 179.9, 10.0, -179.9],
        [-5.0, 20.0, 7.5, 21.0],
        [89.9, 0.0, 89.9, 180.0],
        [0.0, 0.0, 0.5, 179.7],
        [51.5, -0.12, 40.71, -74.0],
    ];
    let want = astropy_distances(&pairs);
    for (p, w) in pairs.iter().zip(&want) {
        let got =
            haversine_m(LatLon { lat_deg: p[0], lon_deg: p[1] }, LatLon { lat_deg: p[2], lon_deg: p[3] });
        // Same sphere, different formula: agreement to a millimetre over a kilometre, and to
        // 1e-9 relative at continental distances (rounding of haversine near antipodes aside).
        let tol = (w * 1e-9).max(1e-3).max(if *w > 1.9e7 { 1.0 } else { 0.0 });
        assert!((got - w).abs() <= tol, "{p:?}: ours {got} m, astropy {w} m");
    }
}

#[test]
fn columns_are_ordered_and_spaced_by_distance_from_the_first_section() {
    // Listed out of order along a north-east line; positions come from coordinates only.
    let coords = [(-24.6132, 133.7208), (-24.5912, 133.7534), (-24.6071, 133.7295), (-24.5987, 133.7401)];
    let sections: Vec<Section> = coords
        .iter()
        .enumerate()
        .map(|(k, (lat, lon))| {
            let mut s = Section::new(format!("S{k}"));
            s.coordinates = Some(LatLon { lat_deg: *lat, lon_deg: *lon });
            s
        })
        .collect();
    let pos = panel_positions(&sections);
    assert_eq!(pos.source, PositionSource::Coordinates);
    let pairs: Vec<[f64; 4]> = coords.iter().map(|c| [coords[0].0, coords[0].1, c.0, c.1]).collect();
    let want = astropy_distances(&pairs);
    for (got, w) in pos.distance_m.iter().zip(&want) {
        assert!((got - w).abs() < 1e-3, "{got} vs astropy {w}");
    }
    // Order by astropy's distances (computed independently above).
    let mut order: Vec<usize> = (0..want.len()).collect();
    order.sort_by(|a, b| want[*a].total_cmp(&want[*b]));
    assert_eq!(pos.order, order);
    assert_eq!(pos.order, vec![0, 2, 3, 1]);

    // Panel positions, when every section has one, win over coordinates.
    let mut given = sections.clone();
    for (s, p) in given.iter_mut().zip([3000.0, 0.0, 1000.0, 2000.0]) {
        s.panel_position_m = Some(p);
    }
    let pos = panel_positions(&given);
    assert_eq!(pos.source, PositionSource::PanelPosition);
    assert_eq!(pos.order, vec![1, 2, 3, 0]);

    // One section without coordinates or position: file order, flagged as not to scale.
    let mut partial = sections;
    partial[2].coordinates = None;
    let pos = panel_positions(&partial);
    assert_eq!(pos.source, PositionSource::FileOrder);
    assert_eq!(pos.order, vec![0, 1, 2, 3]);
}
