//! The four-corner homography checked against an independent computation: numpy's SVD solution
//! of the homogeneous DLT system (Hartley & Zisserman 2004, *Multiple View Geometry*, 2nd ed.,
//! Algorithm 4.1: the 8 × 9 matrix A, h the right singular vector of its smallest singular
//! value), where the Rust code solves the inhomogeneous 8 × 8 form with h33 = 1 by elimination.
//! Python with numpy is required (never skipped), as for the repository's other reference checks.

use aggrade_core::trace::{Homography, Pt};
use serde_json::Value;
use std::process::Command;

const NUMPY_DLT: &str = r#"
import json, sys
try:
    import numpy as np
except ImportError as e:
    sys.exit("numpy is not installed: " + str(e))
cases = json.loads(sys.argv[1])
out = []
for src, dst in cases:
    rows = []
    for (x, y), (u, v) in zip(src, dst):
        rows.append([-x, -y, -1, 0, 0, 0, u * x, u * y, u])
        rows.append([0, 0, 0, -x, -y, -1, v * x, v * y, v])
    _, _, vt = np.linalg.svd(np.array(rows, dtype=float))
    h = vt[-1].reshape(3, 3)
    out.append((h / h[2, 2]).tolist())
print(json.dumps(out))
"#;

fn numpy_homographies(cases: &[([Pt; 4], [Pt; 4])]) -> Vec<[[f64; 3]; 3]> {
    let json: Vec<_> = cases
        .iter()
        .map(|(s, d)| {
            let pts = |p: &[Pt; 4]| p.iter().map(|q| vec![q.x, q.y]).collect::<Vec<_>>();
            (pts(s), pts(d))
        })
        .collect();
    let out = Command::new("python3")
        .arg("-c")
        .arg(NUMPY_DLT)
        .arg(serde_json::to_string(&json).expect("json"))
        .output()
        .unwrap_or_else(|e| panic!("python3 is required for this reference check (pip install numpy): {e}"));
    assert!(
        out.status.success(),
        "the numpy reference check failed:\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: Value = serde_json::from_slice(&out.stdout).expect("numpy prints JSON");
    v.as_array()
        .expect("list")
        .iter()
        .map(|m| {
            let mut h = [[0.0; 3]; 3];
            for (i, row) in m.as_array().expect("rows").iter().enumerate() {
                for (j, x) in row.as_array().expect("row").iter().enumerate() {
                    h[i][j] = x.as_f64().expect("number");
                }
            }
            h
        })
        .collect()
}

#[test]
fn four_corner_homographies_agree_with_numpy_svd_dlt() {
    let unit = [Pt::new(0.0, 0.0), Pt::new(1.0, 0.0), Pt::new(1.0, 1.0), Pt::new(0.0, 1.0)];
    // Phone photos of a sheet (corner pixels lower left, lower right, upper right, upper left),
    // a scan turned a few degrees, and a strong perspective.
    let cases = [
        (
            [Pt::new(412.0, 2870.0), Pt::new(2390.0, 2950.0), Pt::new(2205.0, 310.0), Pt::new(560.0, 402.0)],
            unit,
        ),
        ([Pt::new(31.0, 3390.0), Pt::new(2482.0, 3301.0), Pt::new(2390.0, 12.0), Pt::new(0.0, 95.0)], unit),
        (
            [Pt::new(900.0, 3000.0), Pt::new(2100.0, 2990.0), Pt::new(1600.0, 800.0), Pt::new(1350.0, 805.0)],
            unit,
        ),
        (unit, [Pt::new(100.0, 950.0), Pt::new(900.0, 990.0), Pt::new(820.0, 80.0), Pt::new(160.0, 40.0)]),
    ];
    let reference = numpy_homographies(&cases);
    for ((src, dst), want) in cases.iter().zip(&reference) {
        let got = Homography::from_four(*src, *dst).expect("proper quadrilateral");
        // Same matrix (both scaled to h33 = 1), entry by entry relative to the matrix's size.
        let size = want.iter().flatten().fold(0.0_f64, |m, v| m.max(v.abs()));
        for (i, (got_row, want_row)) in got.h.iter().zip(want.iter()).enumerate() {
            for (j, (g, w)) in got_row.iter().zip(want_row.iter()).enumerate() {
                assert!((g - w).abs() <= 1e-8 * size, "h[{i}][{j}]: {g} vs numpy {w} ({src:?})");
            }
        }
        // And the same images of an interior point.
        let p = Pt::new(0.37 * src[1].x + 0.63 * src[3].x, 0.41 * src[0].y + 0.59 * src[2].y);
        let q = got.apply(p).expect("finite");
        let w = want[2][0] * p.x + want[2][1] * p.y + want[2][2];
        let u = (want[0][0] * p.x + want[0][1] * p.y + want[0][2]) / w;
        let v = (want[1][0] * p.x + want[1][1] * p.y + want[1][2]) / w;
        let scale = dst.iter().map(|d| d.x.abs().max(d.y.abs())).fold(1.0, f64::max);
        assert!((q.x - u).abs() < 1e-9 * scale && (q.y - v).abs() < 1e-9 * scale, "{q:?} vs ({u}, {v})");
    }
}
