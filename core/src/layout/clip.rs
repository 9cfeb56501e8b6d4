//! Clipping pattern marks to a convex bed outline, so writers never need a clip path.

use super::items::PtMm;

/// A convex polygon (any winding), used to clip pattern marks.
#[derive(Debug, Clone)]
pub struct ConvexClip {
    points: Vec<PtMm>,
    /// +1 for counter-clockwise in (x, y) coordinates, −1 for clockwise.
    sign: f64,
    pub min: PtMm,
    pub max: PtMm,
}

fn cross(o: PtMm, a: PtMm, b: PtMm) -> f64 {
    (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x)
}

impl ConvexClip {
    /// A clip region from a convex outline; `None` if it has no area.
    pub fn new(points: &[PtMm]) -> Option<Self> {
        let mut pts: Vec<PtMm> = Vec::with_capacity(points.len());
        for p in points {
            if pts.last().is_none_or(|q: &PtMm| (q.x - p.x).abs() > 1e-9 || (q.y - p.y).abs() > 1e-9) {
                pts.push(*p);
            }
        }
        while pts.len() > 1 {
            let (a, b) = (pts[0], pts[pts.len() - 1]);
            if (a.x - b.x).abs() > 1e-9 || (a.y - b.y).abs() > 1e-9 {
                break;
            }
            pts.pop();
        }
        if pts.len() < 3 {
            return None;
        }
        let area2: f64 =
            (0..pts.len()).map(|i| cross(PtMm { x: 0.0, y: 0.0 }, pts[i], pts[(i + 1) % pts.len()])).sum();
        if area2.abs() < 1e-9 {
            return None;
        }
        let min = PtMm {
            x: pts.iter().map(|p| p.x).fold(f64::INFINITY, f64::min),
            y: pts.iter().map(|p| p.y).fold(f64::INFINITY, f64::min),
        };
        let max = PtMm {
            x: pts.iter().map(|p| p.x).fold(f64::NEG_INFINITY, f64::max),
            y: pts.iter().map(|p| p.y).fold(f64::NEG_INFINITY, f64::max),
        };
        Some(ConvexClip { points: pts, sign: area2.signum(), min, max })
    }

    /// Signed distance-like value of a point against each edge: ≥ 0 on the inside of every edge.
    fn edges(&self) -> impl Iterator<Item = (PtMm, PtMm)> + '_ {
        let n = self.points.len();
        (0..n).map(move |i| (self.points[i], self.points[(i + 1) % n]))
    }

    /// True when the point is inside (or on) the outline.
    pub fn contains(&self, p: PtMm) -> bool {
        self.edges().all(|(a, b)| cross(a, b, p) * self.sign >= -1e-9)
    }

    /// True when a disc lies wholly inside the outline.
    pub fn contains_disc(&self, c: PtMm, r: f64) -> bool {
        self.edges().all(|(a, b)| {
            let len = ((b.x - a.x).powi(2) + (b.y - a.y).powi(2)).sqrt();
            len > 0.0 && cross(a, b, c) * self.sign / len >= r
        })
    }

    /// True when every point lies inside the outline (so a convex shape of them does too).
    pub fn contains_all(&self, pts: &[PtMm]) -> bool {
        pts.iter().all(|p| self.contains(*p))
    }

    /// The part of segment p→q inside the outline, as parameters (t0, t1) with 0 ≤ t0 < t1 ≤ 1
    /// (Cyrus–Beck clipping against a convex polygon).
    pub fn clip_params(&self, p: PtMm, q: PtMm) -> Option<(f64, f64)> {
        let d = PtMm { x: q.x - p.x, y: q.y - p.y };
        let (mut t0, mut t1) = (0.0_f64, 1.0_f64);
        for (a, b) in self.edges() {
            // Inside when sign·cross(a, b, x) ≥ 0; cross is linear in x along the segment.
            let f0 = cross(a, b, p) * self.sign;
            let fd = ((b.x - a.x) * d.y - (b.y - a.y) * d.x) * self.sign;
            if fd.abs() < 1e-15 {
                if f0 < 0.0 {
                    return None;
                }
                continue;
            }
            let t = -f0 / fd;
            if fd > 0.0 {
                t0 = t0.max(t);
            } else {
                t1 = t1.min(t);
            }
            if t0 >= t1 {
                return None;
            }
        }
        (t1 - t0 > 1e-12).then_some((t0, t1))
    }

    /// The part of segment p→q inside the outline.
    pub fn clip_segment(&self, p: PtMm, q: PtMm) -> Option<(PtMm, PtMm)> {
        let (t0, t1) = self.clip_params(p, q)?;
        let at = |t: f64| PtMm { x: p.x + (q.x - p.x) * t, y: p.y + (q.y - p.y) * t };
        Some((at(t0), at(t1)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pt(x: f64, y: f64) -> PtMm {
        PtMm { x, y }
    }

    #[test]
    fn clips_against_trapezoid_any_winding() {
        // A bed outline whose right edge slopes: base at y = 10 is 10 wide, top at y = 0 is 20 wide.
        let cw = [pt(0.0, 10.0), pt(10.0, 10.0), pt(20.0, 0.0), pt(0.0, 0.0)];
        let mut ccw = cw;
        ccw.reverse();
        for outline in [cw, ccw] {
            let c = ConvexClip::new(&outline).expect("has area");
            // Horizontal line at y = 5 crosses from x = 0 to the sloping edge at x = 15.
            let (a, b) = c.clip_segment(pt(-5.0, 5.0), pt(30.0, 5.0)).expect("crosses");
            assert!((a.x - 0.0).abs() < 1e-9 && (b.x - 15.0).abs() < 1e-9, "{a:?} {b:?}");
            assert!(c.clip_segment(pt(-5.0, 12.0), pt(30.0, 12.0)).is_none(), "below the base");
            assert!(c.contains(pt(5.0, 5.0)) && !c.contains(pt(18.0, 8.0)));
            assert!(c.contains_disc(pt(5.0, 5.0), 2.0) && !c.contains_disc(pt(5.0, 5.0), 6.0));
            // A segment wholly inside is kept whole.
            assert_eq!(c.clip_params(pt(1.0, 1.0), pt(2.0, 2.0)), Some((0.0, 1.0)));
        }
        assert!(ConvexClip::new(&[pt(0.0, 0.0), pt(1.0, 0.0), pt(2.0, 0.0)]).is_none(), "no area");
    }
}
