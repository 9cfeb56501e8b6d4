//! Small vector symbols of our own design: sedimentary structures, paleocurrent arrows, fans and
//! roses.

use super::items::{Item, PtMm, Rgba};
use super::style::{solid, INK, SMALL_PT, THIN_MM};
use super::text::{text, width};
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

/// Colour of the rays of a fan: dark enough to read at small sizes, apart from the ink of the
/// mean arrow.
pub const RAY_GREY: Rgba = Rgba(70, 70, 70, 255);

/// Readings up to this many are drawn as a fan of rays; more as a rose.
pub const FAN_MAX_READINGS: usize = 3;

/// Vector mean of azimuths (degrees clockwise from north) and the mean resultant length R̄
/// (0–1): the direction of the sum of unit vectors and its length over n (Mardia & Jupp 2000,
/// "Directional Statistics", §2.2). `None` when there are no readings or they cancel (R̄ ≈ 0).
pub fn vector_mean(readings_deg: &[f64]) -> Option<(f64, f64)> {
    let (mut s, mut c, mut n) = (0.0, 0.0, 0usize);
    for a in readings_deg.iter().filter(|a| a.is_finite()) {
        let r = a.to_radians();
        s += r.sin();
        c += r.cos();
        n += 1;
    }
    if n == 0 {
        return None;
    }
    let rbar = (s * s + c * c).sqrt() / n as f64;
    (rbar > 1e-9).then(|| (s.atan2(c).to_degrees().rem_euclid(360.0), rbar))
}

/// The point `length_mm` from `centre` towards `azimuth_deg` (north up the page).
fn toward(centre: PtMm, azimuth_deg: f64, length_mm: f64) -> PtMm {
    let a = azimuth_deg.to_radians();
    PtMm { x: centre.x + length_mm * a.sin(), y: centre.y - length_mm * a.cos() }
}

/// A fan of a few readings from one centre: a thin dark grey ray per reading out to `radius_mm`, each
/// ending in a short tick, and the vector mean as a bold arrow from the centre, R̄ × radius long
/// (left out when the readings cancel). Rays that start at a common centre stay apart at their
/// tips however close the readings are to each other in space, unlike arrows drawn through the
/// centre, which pile into one cluster.
pub fn paleocurrent_fan(centre: PtMm, readings_deg: &[f64], radius_mm: f64, out: &mut Vec<Item>) {
    let readings: Vec<f64> = readings_deg.iter().copied().filter(|a| a.is_finite()).collect();
    for &a in &readings {
        let tip = toward(centre, a, radius_mm);
        out.push(Item::Polyline { points: vec![centre, tip], stroke: solid(THIN_MM * 1.2, RAY_GREY) });
        // A tick across the tip, so each ray ends visibly.
        let t = radius_mm * 0.12;
        out.push(Item::Polyline {
            points: vec![toward(tip, a + 90.0, t), toward(tip, a - 90.0, t)],
            stroke: solid(THIN_MM * 1.2, RAY_GREY),
        });
    }
    if let Some((mean, rbar)) = vector_mean(&readings) {
        let len = (radius_mm * rbar).max(radius_mm * 0.4);
        let mid = toward(centre, mean, len / 2.0);
        paleocurrent_arrow(mid, mean, len, INK, out);
    }
}

/// Text size of the reading count beside a fan or rose, pt.
pub const COUNT_PT: f64 = SMALL_PT - 1.0;

/// The mark for the readings of one bed (or of neighbouring beds pooled; see the column's
/// paleocurrent track), inside a square `2 × radius_mm` wide about `centre`:
/// - one reading: an arrow through the centre, down-current;
/// - two or three ([`FAN_MAX_READINGS`]): a fan of rays with the vector-mean arrow;
/// - more: a rose of 30° sectors.
///
/// Fans and roses carry the count of readings at the lower right corner of the square.
pub fn paleocurrent_mark(centre: PtMm, readings_deg: &[f64], radius_mm: f64, out: &mut Vec<Item>) {
    let readings: Vec<f64> = readings_deg.iter().copied().filter(|a| a.is_finite()).collect();
    match readings.len() {
        0 => {}
        1 => paleocurrent_arrow(centre, readings[0], (2.0 * radius_mm * 0.9).min(5.0), INK, out),
        n => {
            // The figure keeps clear of the count in the corner.
            let r = radius_mm * 0.85;
            if n <= FAN_MAX_READINGS {
                paleocurrent_fan(centre, &readings, r, out);
            } else {
                paleocurrent_rose(centre, &readings, r, out);
            }
            let label = n.to_string();
            let w = width(&label, COUNT_PT);
            text(out, centre.x + radius_mm - w, centre.y + radius_mm, &label, COUNT_PT, INK);
        }
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

    /// Ends of the rays of a fan (the dark grey two-point lines from the centre).
    fn ray_tips(out: &[Item], centre: PtMm) -> Vec<PtMm> {
        out.iter()
            .filter_map(|i| match i {
                Item::Polyline { points, stroke } if stroke.color == RAY_GREY && points[0] == centre => {
                    Some(points[1])
                }
                _ => None,
            })
            .collect()
    }

    #[test]
    fn three_readings_in_one_bed_give_three_distinct_rays_a_mean_arrow_and_the_count() {
        let c = PtMm { x: 10.0, y: 10.0 };
        let readings = [100.0, 130.0, 160.0];
        let mut out = Vec::new();
        paleocurrent_mark(c, &readings, 3.5, &mut out);
        let tips = ray_tips(&out, c);
        assert_eq!(tips.len(), 3, "one ray per reading");
        // Each ray ends 0.85 × 3.5 mm from the centre towards its reading (north up, clockwise).
        for (tip, a) in tips.iter().zip(readings) {
            let want = toward(c, a, 3.5 * 0.85);
            assert!((tip.x - want.x).abs() < 1e-9 && (tip.y - want.y).abs() < 1e-9, "{a}: {tip:?}");
        }
        // Distinguishable: tips 30° apart at 2.975 mm are 2·r·sin 15° = 1.54 mm apart (computed),
        // ten line widths.
        for i in 0..3 {
            for j in i + 1..3 {
                let d = ((tips[i].x - tips[j].x).powi(2) + (tips[i].y - tips[j].y).powi(2)).sqrt();
                assert!(d > 10.0 * THIN_MM, "rays {i} and {j} only {d:.2} mm apart");
            }
        }
        // The vector mean of 100°, 130°, 160° is 130° (symmetric readings); R̄ = (1 + 2 cos 30°)/3
        // = 0.911 (computed), so the mean arrow is 0.911 × 2.975 mm long, from the centre.
        let (mean, rbar) = vector_mean(&readings).expect("a mean");
        assert!(
            (mean - 130.0).abs() < 1e-9
                && (rbar - (1.0 + 2.0 * 30f64.to_radians().cos()) / 3.0).abs() < 1e-12
        );
        let shaft = out
            .iter()
            .find_map(|i| match i {
                Item::Polyline { points, stroke } if stroke.color == INK => Some(points.clone()),
                _ => None,
            })
            .expect("a mean arrow");
        let len = ((shaft[1].x - shaft[0].x).powi(2) + (shaft[1].y - shaft[0].y).powi(2)).sqrt();
        assert!((len - rbar * 3.5 * 0.85).abs() < 1e-9 && (shaft[0].x - c.x).abs() < 1e-9, "{shaft:?}");
        assert!(shaft[1].x > c.x && shaft[1].y > c.y, "130° points right and down the page");
        // The count, inside the mark's square.
        let count = out.iter().find_map(|i| match i {
            Item::Text { text, pos, .. } => Some((text.clone(), *pos)),
            _ => None,
        });
        let (label, pos) = count.expect("the count is printed");
        assert_eq!(label, "3");
        assert!(
            pos.x >= c.x && pos.x + width("3", COUNT_PT) <= c.x + 3.5 + 1e-9 && pos.y <= c.y + 3.5 + 1e-9
        );
    }

    #[test]
    fn marks_keep_inside_their_square_and_switch_from_arrow_to_fan_to_rose() {
        let c = PtMm { x: 0.0, y: 0.0 };
        for n in 1..=8 {
            let readings: Vec<f64> = (0..n).map(|k| 20.0 + 37.0 * k as f64).collect();
            let mut out = Vec::new();
            paleocurrent_mark(c, &readings, 3.0, &mut out);
            let mut pts = Vec::new();
            for it in &out {
                match it {
                    Item::Polyline { points, .. } | Item::Polygon { points, .. } => {
                        pts.extend(points.iter().copied())
                    }
                    Item::Circle { center, radius_mm, .. } => {
                        pts.push(PtMm { x: center.x + radius_mm, y: center.y + radius_mm });
                        pts.push(PtMm { x: center.x - radius_mm, y: center.y - radius_mm });
                    }
                    Item::Text { pos, .. } => pts.push(*pos),
                    _ => {}
                }
            }
            assert!(pts.iter().all(|p| p.x.abs() <= 3.0 + 1e-9 && p.y.abs() <= 3.0 + 1e-9), "{n}: {pts:?}");
            let rays = ray_tips(&out, c).len();
            let wedges =
                out.iter().filter(|i| matches!(i, Item::Polygon { fill: Some(f), .. } if *f != INK)).count();
            match n {
                1 => assert_eq!((rays, wedges), (0, 0), "one reading: one arrow"),
                2 | 3 => assert_eq!((rays, wedges), (n, 0), "a fan"),
                _ => assert!(rays == 0 && wedges > 0, "a rose"),
            }
        }
        // Readings that cancel have no mean arrow: 90° and 270°.
        assert_eq!(vector_mean(&[90.0, 270.0]), None);
    }
}
