//! Small vector symbols of our own design: sedimentary structures, paleocurrent arrows and roses.

use super::items::{Item, PtMm, Rgba};
use super::style::{solid, INK, THIN_MM};
use crate::model::Structure;

/// Maps unit coordinates (−0.5…0.5, y down) of a symbol box onto the page.
#[derive(Clone, Copy)]
struct Frame {
    centre: PtMm,
    size: f64,
}

impl Frame {
    fn p(self, x: f64, y: f64) -> PtMm {
        PtMm { x: self.centre.x + x * self.size, y: self.centre.y + y * self.size }
    }

    fn line(self, pts: &[(f64, f64)], out: &mut Vec<Item>) {
        out.push(Item::Polyline {
            points: pts.iter().map(|&(x, y)| self.p(x, y)).collect(),
            stroke: solid(THIN_MM, INK),
        });
    }

    /// An arc (as a polyline) of an ellipse centred at (cx, cy) with radii (rx, ry), angles in
    /// degrees measured counter-clockwise on the page from the +x axis.
    fn arc(self, c: (f64, f64), r: (f64, f64), from_deg: f64, to_deg: f64, out: &mut Vec<Item>) {
        let n = 10;
        let pts: Vec<(f64, f64)> = (0..=n)
            .map(|i| {
                let a = (from_deg + (to_deg - from_deg) * i as f64 / n as f64).to_radians();
                (c.0 + r.0 * a.cos(), c.1 - r.1 * a.sin())
            })
            .collect();
        self.line(&pts, out);
    }

    fn dot(self, x: f64, y: f64, r: f64, filled: bool, out: &mut Vec<Item>) {
        out.push(Item::Circle {
            center: self.p(x, y),
            radius_mm: r * self.size,
            fill: filled.then_some(INK),
            stroke: Some(solid(THIN_MM, INK)),
        });
    }

    fn shape(self, pts: &[(f64, f64)], fill: Option<Rgba>, out: &mut Vec<Item>) {
        out.push(Item::Polygon {
            points: pts.iter().map(|&(x, y)| self.p(x, y)).collect(),
            fill,
            stroke: Some(solid(THIN_MM, INK)),
        });
    }
}

/// Draw a structure symbol centred at `centre` in a square box `size_mm` wide.
pub fn structure_symbol(s: Structure, centre: PtMm, size_mm: f64, out: &mut Vec<Item>) {
    let f = Frame { centre, size: size_mm };
    match s {
        Structure::TroughCrossBedding => {
            // Nested scoops, open upward.
            f.arc((0.0, -0.25), (0.45, 0.5), 180.0, 360.0, out);
            f.arc((0.0, -0.25), (0.28, 0.32), 200.0, 340.0, out);
        }
        Structure::PlanarCrossBedding => {
            f.line(&[(-0.45, -0.35), (0.45, -0.35)], out);
            f.line(&[(-0.45, 0.35), (0.45, 0.35)], out);
            for x in [-0.35, -0.05, 0.25] {
                f.line(&[(x, -0.35), (x + 0.2, 0.35)], out);
            }
        }
        Structure::RippleCrossLamination => {
            let wave: Vec<(f64, f64)> = (0..=12)
                .map(|i| {
                    let x = -0.45 + 0.9 * i as f64 / 12.0;
                    (x, 0.1 - 0.15 * (x * std::f64::consts::TAU * 1.7).sin())
                })
                .collect();
            f.line(&wave, out);
            f.line(&[(-0.2, -0.05), (-0.05, 0.25)], out);
            f.line(&[(0.2, -0.05), (0.35, 0.25)], out);
        }
        Structure::HorizontalLamination => {
            for y in [-0.3, 0.0, 0.3] {
                f.line(&[(-0.45, y), (0.45, y)], out);
            }
        }
        Structure::Massive => {
            f.shape(&[(-0.35, -0.35), (0.35, -0.35), (0.35, 0.35), (-0.35, 0.35)], None, out);
        }
        Structure::LateralAccretion => {
            // Gently inclined sets stacked against a base.
            f.line(&[(-0.45, 0.4), (0.45, 0.4)], out);
            for x in [-0.45, -0.15, 0.15] {
                f.line(&[(x, -0.4), (x + 0.3, 0.4)], out);
            }
            f.arc((0.45, -0.4), (0.9, 0.8), 180.0, 240.0, out);
        }
        Structure::DownstreamAccretion => {
            f.line(&[(-0.45, 0.4), (0.45, 0.4)], out);
            for x in [-0.4, -0.1] {
                f.line(&[(x, -0.3), (x + 0.45, 0.4)], out);
            }
            // Arrow showing the accretion direction.
            f.line(&[(0.05, -0.35), (0.45, -0.35)], out);
            f.line(&[(0.32, -0.45), (0.45, -0.35), (0.32, -0.25)], out);
        }
        Structure::Imbrication => {
            for x in [-0.3, 0.0, 0.3] {
                f.shape(
                    &[(x - 0.18, 0.2), (x + 0.02, -0.25), (x + 0.16, -0.17), (x - 0.04, 0.28)],
                    None,
                    out,
                );
            }
        }
        Structure::MudClasts => {
            for (x, y) in [(-0.25, -0.15), (0.2, 0.0), (-0.1, 0.25)] {
                f.shape(
                    &[
                        (x - 0.18, y),
                        (x - 0.05, y - 0.08),
                        (x + 0.17, y - 0.05),
                        (x + 0.12, y + 0.07),
                        (x - 0.1, y + 0.08),
                    ],
                    Some(INK),
                    out,
                );
            }
        }
        Structure::BasalLag => {
            f.line(&[(-0.45, 0.4), (0.45, 0.4)], out);
            for x in [-0.3, 0.0, 0.3] {
                f.dot(x, 0.22, 0.14, false, out);
            }
            f.dot(-0.15, -0.02, 0.1, false, out);
            f.dot(0.15, -0.02, 0.1, false, out);
        }
        Structure::RootTraces => {
            f.line(&[(0.0, -0.45), (0.0, 0.1), (-0.25, 0.45)], out);
            f.line(&[(0.0, 0.1), (0.2, 0.45)], out);
            f.line(&[(0.0, -0.1), (0.22, 0.15)], out);
        }
        Structure::Slickensides => {
            f.arc((-0.55, 0.0), (0.6, 0.45), -60.0, 60.0, out);
            f.arc((0.55, 0.0), (0.6, 0.45), 120.0, 240.0, out);
        }
        Structure::CarbonateNodules => {
            for (x, y, r) in [(-0.22, -0.18, 0.13), (0.2, -0.05, 0.16), (-0.05, 0.25, 0.12)] {
                f.dot(x, y, r, true, out);
            }
        }
        Structure::Mottling => {
            f.shape(&[(-0.4, -0.1), (-0.2, -0.35), (0.05, -0.2), (0.0, 0.05), (-0.3, 0.1)], None, out);
            f.shape(&[(0.1, 0.15), (0.35, 0.05), (0.42, 0.3), (0.2, 0.4)], None, out);
        }
        Structure::DesiccationCracks => {
            f.line(&[(-0.45, -0.4), (0.45, -0.4)], out);
            f.line(&[(-0.3, -0.4), (-0.18, 0.4), (-0.06, -0.4)], out);
            f.line(&[(0.1, -0.4), (0.22, 0.3), (0.34, -0.4)], out);
        }
        Structure::Bioturbation => {
            let pts: Vec<(f64, f64)> = (0..=14)
                .map(|i| {
                    let t = i as f64 / 14.0;
                    (0.3 * (t * 9.0).sin(), -0.45 + 0.9 * t)
                })
                .collect();
            f.line(&pts, out);
        }
        Structure::SoftSedimentDeformation => {
            f.line(&[(-0.45, 0.35), (-0.2, 0.35)], out);
            f.arc((0.0, 0.1), (0.22, 0.25), 180.0, -90.0, out);
            f.line(&[(0.0, 0.35), (0.45, 0.35)], out);
            f.arc((0.0, -0.15), (0.3, 0.2), 200.0, -20.0, out);
        }
    }
}

/// An arrow pointing down-current: azimuth in degrees clockwise from north, north up the page.
pub fn paleocurrent_arrow(centre: PtMm, azimuth_deg: f64, length_mm: f64, color: Rgba, out: &mut Vec<Item>) {
    let a = azimuth_deg.to_radians();
    let d = PtMm { x: a.sin(), y: -a.cos() };
    let half = length_mm / 2.0;
    let tail = PtMm { x: centre.x - d.x * half, y: centre.y - d.y * half };
    let tip = PtMm { x: centre.x + d.x * half, y: centre.y + d.y * half };
    out.push(Item::Polyline { points: vec![tail, tip], stroke: solid(THIN_MM * 1.3, color) });
    let head = length_mm * 0.32;
    let n = PtMm { x: -d.y, y: d.x };
    let back = PtMm { x: tip.x - d.x * head, y: tip.y - d.y * head };
    out.push(Item::Polygon {
        points: vec![
            tip,
            PtMm { x: back.x + n.x * head * 0.45, y: back.y + n.y * head * 0.45 },
            PtMm { x: back.x - n.x * head * 0.45, y: back.y - n.y * head * 0.45 },
        ],
        fill: Some(color),
        stroke: None,
    });
}

/// Sector width of a paleocurrent rose, degrees.
pub const ROSE_SECTOR_DEG: f64 = 30.0;

/// A rose of readings: counts in 30° sectors (clockwise from north) as wedges whose length is
/// proportional to the count, inside a reference circle of `radius_mm`.
pub fn paleocurrent_rose(centre: PtMm, readings_deg: &[f64], radius_mm: f64, out: &mut Vec<Item>) {
    let sectors = (360.0 / ROSE_SECTOR_DEG).round() as usize;
    let mut counts = vec![0usize; sectors];
    for a in readings_deg.iter().filter(|a| a.is_finite()) {
        let k = ((a.rem_euclid(360.0)) / ROSE_SECTOR_DEG).floor() as usize;
        counts[k.min(sectors - 1)] += 1;
    }
    out.push(Item::Circle {
        center: centre,
        radius_mm,
        fill: None,
        stroke: Some(solid(THIN_MM * 0.7, Rgba(130, 130, 130, 255))),
    });
    let max = counts.iter().copied().max().unwrap_or(0).max(1) as f64;
    for (k, &n) in counts.iter().enumerate() {
        if n == 0 {
            continue;
        }
        let r = radius_mm * n as f64 / max;
        let mut pts = vec![centre];
        for step in 0..=4 {
            let az = (k as f64 * ROSE_SECTOR_DEG + ROSE_SECTOR_DEG * step as f64 / 4.0).to_radians();
            pts.push(PtMm { x: centre.x + r * az.sin(), y: centre.y - r * az.cos() });
        }
        out.push(Item::Polygon {
            points: pts,
            fill: Some(Rgba(90, 90, 90, 255)),
            stroke: Some(solid(THIN_MM * 0.7, INK)),
        });
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_structure_has_a_distinct_symbol_inside_its_box() {
        let c = PtMm { x: 50.0, y: 50.0 };
        let mut seen = Vec::new();
        for s in Structure::ALL {
            let mut out = Vec::new();
            structure_symbol(*s, c, 4.0, &mut out);
            assert!(!out.is_empty(), "{s} draws nothing");
            for item in &out {
                let pts = match item {
                    Item::Polyline { points, .. } | Item::Polygon { points, .. } => points.clone(),
                    Item::Circle { center, .. } => vec![*center],
                    _ => vec![],
                };
                for p in pts {
                    assert!(
                        (p.x - 50.0).abs() <= 2.0 + 1e-9 && (p.y - 50.0).abs() <= 2.0 + 1e-9,
                        "{s}: {p:?}"
                    );
                }
            }
            let sig = format!("{out:?}");
            assert!(!seen.contains(&sig), "{s} looks like another symbol");
            seen.push(sig);
        }
    }

    #[test]
    fn arrow_points_down_current() {
        // Azimuth 90° (east) with north up: the tip is to the right (common practice for maps).
        let mut out = Vec::new();
        paleocurrent_arrow(PtMm { x: 0.0, y: 0.0 }, 90.0, 4.0, INK, &mut out);
        let Item::Polyline { points, .. } = &out[0] else { panic!("shaft first") };
        assert!((points[1].x - 2.0).abs() < 1e-9 && points[1].y.abs() < 1e-9);
        // Azimuth 0 (north): tip up the page, i.e. smaller y.
        out.clear();
        paleocurrent_arrow(PtMm { x: 0.0, y: 0.0 }, 0.0, 4.0, INK, &mut out);
        let Item::Polyline { points, .. } = &out[0] else { panic!("shaft first") };
        assert!((points[1].y + 2.0).abs() < 1e-9);
    }

    #[test]
    fn rose_counts_sectors() {
        let mut out = Vec::new();
        // Three readings in 30–60°, one in 180–210°: two wedges, the first twice the second's length... 3×.
        paleocurrent_rose(PtMm { x: 0.0, y: 0.0 }, &[35.0, 40.0, 59.9, 181.0], 3.0, &mut out);
        let wedges: Vec<&Item> = out.iter().filter(|i| matches!(i, Item::Polygon { .. })).collect();
        assert_eq!(wedges.len(), 2);
        let reach = |it: &Item| match it {
            Item::Polygon { points, .. } => {
                points.iter().map(|p| (p.x * p.x + p.y * p.y).sqrt()).fold(0.0, f64::max)
            }
            _ => 0.0,
        };
        assert!((reach(wedges[0]) - 3.0).abs() < 1e-9);
        assert!((reach(wedges[1]) - 1.0).abs() < 1e-9);
    }
}
