//! The projective transform (homography) of a plane from four point pairs, used to straighten a
//! field sheet photographed at an angle.
//!
//! A homography maps image pixels `(x, y)` to sheet coordinates `(u, v)`:
//!
//! ```text
//!     u = (h11·x + h12·y + h13) / (h31·x + h32·y + h33)
//!     v = (h21·x + h22·y + h23) / (h31·x + h32·y + h33)
//! ```
//!
//! It has eight degrees of freedom (the nine entries up to scale), so four correspondences, no
//! three of them collinear, fix it. Fixing `h33 = 1` and multiplying out the denominators gives two
//! linear equations per pair,
//!
//! ```text
//!     h11·x + h12·y + h13 − h31·x·u − h32·y·u = u
//!     h21·x + h22·y + h23 − h31·x·v − h32·y·v = v
//! ```
//!
//! an 8 × 8 system solved here by Gaussian elimination with partial pivoting: the direct linear
//! transformation (DLT) of Hartley & Zisserman (2004), *Multiple View Geometry in Computer
//! Vision*, 2nd ed., §4.1, in its inhomogeneous form (their eq. 4.3 with `h33 = 1`). The points are
//! first normalised (centroid to the origin, mean distance √2: Hartley & Zisserman §4.4.4) so that
//! pixel coordinates in the thousands do not spoil the conditioning, and the result is
//! denormalised. `h33 = 1` excludes only maps sending the origin of the normalised image to
//! infinity, which a photographed sheet (the origin is the centroid of its own corners) never is.

use thiserror::Error;

/// A point in a plane (image pixels, or sheet units).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct Pt {
    pub x: f64,
    pub y: f64,
}

impl Pt {
    pub const fn new(x: f64, y: f64) -> Self {
        Pt { x, y }
    }
}

/// Why four point pairs give no transform.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ProjectiveError {
    /// A coordinate is NaN or infinite.
    #[error("a corner position is not a finite number")]
    NotFinite,
    /// Three of the points lie on one line (or two coincide), so the four do not fix a plane.
    #[error("three of the four corners lie on one line (or two are the same point); click the sheet's four corners")]
    Degenerate,
}

/// A plane projective transform as a 3 × 3 matrix acting on homogeneous points `(x, y, 1)`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Homography {
    /// Row-major matrix `h[row][column]`.
    pub h: [[f64; 3]; 3],
}

/// Similarity (translation + uniform scale) that moves the points' centroid to the origin and
/// their mean distance from it to √2 (Hartley & Zisserman 2004, §4.4.4).
fn normaliser(pts: &[Pt; 4]) -> Result<[[f64; 3]; 3], ProjectiveError> {
    let cx = pts.iter().map(|p| p.x).sum::<f64>() / 4.0;
    let cy = pts.iter().map(|p| p.y).sum::<f64>() / 4.0;
    let mean = pts.iter().map(|p| (p.x - cx).hypot(p.y - cy)).sum::<f64>() / 4.0;
    if !(mean.is_finite() && mean > 0.0) {
        return Err(ProjectiveError::Degenerate);
    }
    let s = std::f64::consts::SQRT_2 / mean;
    Ok([[s, 0.0, -s * cx], [0.0, s, -s * cy], [0.0, 0.0, 1.0]])
}

fn mul(a: &[[f64; 3]; 3], b: &[[f64; 3]; 3]) -> [[f64; 3]; 3] {
    let mut m = [[0.0; 3]; 3];
    for (i, row) in m.iter_mut().enumerate() {
        for (j, v) in row.iter_mut().enumerate() {
            *v = (0..3).map(|k| a[i][k] * b[k][j]).sum();
        }
    }
    m
}

fn apply_matrix(m: &[[f64; 3]; 3], p: Pt) -> Pt {
    Pt::new(m[0][0] * p.x + m[0][1] * p.y + m[0][2], m[1][0] * p.x + m[1][1] * p.y + m[1][2])
}

/// Solve `a · x = b` (n × n) by Gaussian elimination with partial pivoting; `None` when the
/// matrix is singular (a pivot below `1e-12` of the largest entry).
fn solve<const N: usize>(mut a: [[f64; N]; N], mut b: [f64; N]) -> Option<[f64; N]> {
    let scale = a.iter().flatten().fold(0.0_f64, |m, v| m.max(v.abs()));
    if !(scale.is_finite() && scale > 0.0) {
        return None;
    }
    for col in 0..N {
        let pivot = (col..N).max_by(|&i, &j| a[i][col].abs().total_cmp(&a[j][col].abs()))?;
        if a[pivot][col].abs() <= 1e-12 * scale {
            return None;
        }
        a.swap(col, pivot);
        b.swap(col, pivot);
        for row in col + 1..N {
            let f = a[row][col] / a[col][col];
            let pivot_row = a[col];
            for (v, p) in a[row].iter_mut().zip(pivot_row.iter()).skip(col) {
                *v -= f * p;
            }
            b[row] -= f * b[col];
        }
    }
    let mut x = [0.0; N];
    for row in (0..N).rev() {
        let rest: f64 = (row + 1..N).map(|k| a[row][k] * x[k]).sum();
        x[row] = (b[row] - rest) / a[row][row];
    }
    x.iter().all(|v| v.is_finite()).then_some(x)
}

/// True when three of the four points are (nearly) on one line, measured by the triangle area
/// against the square of the points' spread.
fn three_collinear(p: &[Pt; 4]) -> bool {
    let spread =
        p.iter().flat_map(|a| p.iter().map(move |b| (a.x - b.x).hypot(a.y - b.y))).fold(0.0_f64, f64::max);
    let tiny = 1e-9 * spread * spread;
    let area = |a: Pt, b: Pt, c: Pt| ((b.x - a.x) * (c.y - a.y) - (b.y - a.y) * (c.x - a.x)).abs();
    spread == 0.0
        || [(0, 1, 2), (0, 1, 3), (0, 2, 3), (1, 2, 3)]
            .iter()
            .any(|&(i, j, k)| area(p[i], p[j], p[k]) <= tiny)
}

impl Homography {
    /// The identity transform.
    pub const IDENTITY: Homography = Homography { h: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]] };

    /// The homography taking each `from[i]` to `to[i]` (normalised DLT, see the module notes).
    pub fn from_four(from: [Pt; 4], to: [Pt; 4]) -> Result<Homography, ProjectiveError> {
        if from.iter().chain(to.iter()).any(|p| !(p.x.is_finite() && p.y.is_finite())) {
            return Err(ProjectiveError::NotFinite);
        }
        if three_collinear(&from) || three_collinear(&to) {
            return Err(ProjectiveError::Degenerate);
        }
        let (tf, tt) = (normaliser(&from)?, normaliser(&to)?);
        let mut a = [[0.0; 8]; 8];
        let mut b = [0.0; 8];
        for i in 0..4 {
            let p = apply_matrix(&tf, from[i]);
            let q = apply_matrix(&tt, to[i]);
            a[2 * i] = [p.x, p.y, 1.0, 0.0, 0.0, 0.0, -p.x * q.x, -p.y * q.x];
            b[2 * i] = q.x;
            a[2 * i + 1] = [0.0, 0.0, 0.0, p.x, p.y, 1.0, -p.x * q.y, -p.y * q.y];
            b[2 * i + 1] = q.y;
        }
        let x = solve(a, b).ok_or(ProjectiveError::Degenerate)?;
        let hn = [[x[0], x[1], x[2]], [x[3], x[4], x[5]], [x[6], x[7], 1.0]];
        // H = Tto⁻¹ · Hn · Tfrom.
        let s = tt[0][0];
        let tt_inv = [[1.0 / s, 0.0, -tt[0][2] / s], [0.0, 1.0 / s, -tt[1][2] / s], [0.0, 0.0, 1.0]];
        let mut h = mul(&tt_inv, &mul(&hn, &tf));
        let norm = h[2][2];
        if norm.abs() > 1e-300 {
            for v in h.iter_mut().flatten() {
                *v /= norm;
            }
        }
        Ok(Homography { h })
    }

    /// The image of a point; `None` for a point the transform sends to infinity (on the
    /// horizon line of the photographed plane) or when a result is not finite.
    pub fn apply(&self, p: Pt) -> Option<Pt> {
        let h = &self.h;
        let w = h[2][0] * p.x + h[2][1] * p.y + h[2][2];
        if w.abs() < 1e-12 {
            return None;
        }
        let u = (h[0][0] * p.x + h[0][1] * p.y + h[0][2]) / w;
        let v = (h[1][0] * p.x + h[1][1] * p.y + h[1][2]) / w;
        (u.is_finite() && v.is_finite()).then_some(Pt::new(u, v))
    }

    /// The inverse transform (adjugate over determinant); `None` when singular.
    pub fn inverse(&self) -> Option<Homography> {
        let m = &self.h;
        let c = |r0: usize, r1: usize, c0: usize, c1: usize| m[r0][c0] * m[r1][c1] - m[r0][c1] * m[r1][c0];
        let adj = [
            [c(1, 2, 1, 2), -c(0, 2, 1, 2), c(0, 1, 1, 2)],
            [-c(1, 2, 0, 2), c(0, 2, 0, 2), -c(0, 1, 0, 2)],
            [c(1, 2, 0, 1), -c(0, 2, 0, 1), c(0, 1, 0, 1)],
        ];
        let det = m[0][0] * adj[0][0] + m[0][1] * adj[1][0] + m[0][2] * adj[2][0];
        let scale = m.iter().flatten().fold(0.0_f64, |a, v| a.max(v.abs()));
        if !det.is_finite() || det.abs() <= 1e-15 * scale.powi(3) {
            return None;
        }
        let mut h = adj;
        for v in h.iter_mut().flatten() {
            *v /= det;
        }
        Some(Homography { h })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn close(a: Pt, b: Pt, tol: f64) -> bool {
        (a.x - b.x).abs() <= tol && (a.y - b.y).abs() <= tol
    }

    const SQUARE: [Pt; 4] = [Pt::new(0.0, 0.0), Pt::new(1.0, 0.0), Pt::new(1.0, 1.0), Pt::new(0.0, 1.0)];

    #[test]
    fn maps_the_four_corners_exactly() {
        let photo =
            [Pt::new(412.0, 2870.0), Pt::new(2390.0, 2950.0), Pt::new(2205.0, 310.0), Pt::new(560.0, 402.0)];
        let h = Homography::from_four(photo, SQUARE).expect("a proper quadrilateral");
        for (p, q) in photo.iter().zip(SQUARE.iter()) {
            let got = h.apply(*p).expect("finite");
            assert!(close(got, *q, 1e-9), "{p:?} -> {got:?}, expected {q:?}");
        }
    }

    #[test]
    fn an_affine_map_is_recovered_with_a_zero_bottom_row() {
        // u = 2x + 0.5y + 3, v = -x + 4y - 1: a homography whose last row is (0, 0, 1).
        let f = |p: Pt| Pt::new(2.0 * p.x + 0.5 * p.y + 3.0, -p.x + 4.0 * p.y - 1.0);
        let from = [Pt::new(0.0, 0.0), Pt::new(10.0, 0.0), Pt::new(10.0, 7.0), Pt::new(0.0, 7.0)];
        let h = Homography::from_four(from, from.map(f)).expect("affine");
        assert!(h.h[2][0].abs() < 1e-12 && h.h[2][1].abs() < 1e-12, "{:?}", h.h);
        assert!((h.h[0][0] - 2.0).abs() < 1e-9 && (h.h[1][1] - 4.0).abs() < 1e-9, "{:?}", h.h);
        // An interior point follows the same map.
        let p = Pt::new(3.3, 5.1);
        assert!(close(h.apply(p).expect("finite"), f(p), 1e-9));
    }

    #[test]
    fn straight_lines_stay_straight_and_inverse_undoes() {
        let photo = [Pt::new(40.0, 900.0), Pt::new(700.0, 980.0), Pt::new(640.0, 60.0), Pt::new(90.0, 120.0)];
        let h = Homography::from_four(SQUARE, photo).expect("proper");
        // Three points on the sheet line v = 0.3 map to three collinear image points.
        let a = h.apply(Pt::new(0.1, 0.3)).expect("finite");
        let b = h.apply(Pt::new(0.5, 0.3)).expect("finite");
        let c = h.apply(Pt::new(0.9, 0.3)).expect("finite");
        let cross = (b.x - a.x) * (c.y - a.y) - (b.y - a.y) * (c.x - a.x);
        assert!(cross.abs() < 1e-6, "cross product {cross}");
        let inv = h.inverse().expect("invertible");
        for p in [Pt::new(0.25, 0.75), Pt::new(0.9, 0.05)] {
            let back = inv.apply(h.apply(p).expect("finite")).expect("finite");
            assert!(close(back, p, 1e-9), "{p:?} -> {back:?}");
        }
        // Midpoints are not preserved under perspective (the reason an affine fit is not enough).
        let mid = h.apply(Pt::new(0.5, 0.5)).expect("finite");
        let naive = Pt::new(
            photo.iter().map(|p| p.x).sum::<f64>() / 4.0,
            photo.iter().map(|p| p.y).sum::<f64>() / 4.0,
        );
        assert!(!close(mid, naive, 1.0), "perspective moved the centre: {mid:?} vs {naive:?}");
    }

    #[test]
    fn collinear_or_repeated_corners_are_refused() {
        let line = [Pt::new(0.0, 0.0), Pt::new(1.0, 1.0), Pt::new(2.0, 2.0), Pt::new(0.0, 5.0)];
        assert_eq!(Homography::from_four(line, SQUARE), Err(ProjectiveError::Degenerate));
        let twice = [Pt::new(0.0, 0.0), Pt::new(0.0, 0.0), Pt::new(2.0, 2.0), Pt::new(0.0, 5.0)];
        assert_eq!(Homography::from_four(twice, SQUARE), Err(ProjectiveError::Degenerate));
        let nan = [Pt::new(f64::NAN, 0.0), Pt::new(1.0, 0.0), Pt::new(1.0, 1.0), Pt::new(0.0, 1.0)];
        assert_eq!(Homography::from_four(nan, SQUARE), Err(ProjectiveError::NotFinite));
    }
}
