//! Snapping a boundary click to the dark pencil line nearest to it: the intensity profile of the
//! image along the sheet's height axis, averaged over a short band across it.

use super::image::SheetImage;
use super::projective::Pt;
use super::sheet::TraceSheet;

/// How far a click may move and how wide the band across the height axis is.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SnapParams {
    /// Largest move along the height axis, image pixels.
    pub reach_px: f64,
    /// Half the band's width across the height axis, image pixels.
    pub half_band_px: f64,
    /// A line must be at least this much darker than the profile's median (grey levels, 0–255).
    pub min_contrast: f64,
}

impl Default for SnapParams {
    fn default() -> Self {
        SnapParams { reach_px: 8.0, half_band_px: 6.0, min_contrast: 40.0 }
    }
}

/// The click moved onto the darkest line within reach (the darkness-weighted centre of the
/// darkest rows of the profile), or the click itself when no line stands out.
pub fn snap_to_line(image: &SheetImage, sheet: &TraceSheet, click: Pt, params: SnapParams) -> Pt {
    let Ok(h0) = sheet.height_at(click) else { return click };
    // The local "up" direction in image pixels, from a small step in height.
    let step = sheet.height_scale.map(|s| (s.high_m - s.low_m).abs() * 1e-3).unwrap_or(0.0);
    let Ok(above) = sheet.pixel_at_height(h0 + step, click) else { return click };
    let (dx, dy) = (above.x - click.x, above.y - click.y);
    let len = dx.hypot(dy);
    if !(len.is_finite() && len > 0.0) {
        return click;
    }
    let (ux, uy) = (dx / len, dy / len);
    let (wx, wy) = (-uy, ux);
    let reach = params.reach_px.round() as i64;
    let band = params.half_band_px.round() as i64;
    let profile: Vec<f64> = (-reach..=reach)
        .map(|k| {
            let sum: f64 = (-band..=band)
                .map(|j| {
                    let x = click.x + k as f64 * ux + j as f64 * wx;
                    let y = click.y + k as f64 * uy + j as f64 * wy;
                    image.grey_at(Pt::new(x, y))
                })
                .sum();
            sum / (2 * band + 1) as f64
        })
        .collect();
    let mut sorted = profile.clone();
    sorted.sort_by(f64::total_cmp);
    let median = sorted[sorted.len() / 2];
    // The darkest line, nearer lines preferred: darkness counts half at the edge of reach, so a
    // line under the click wins over a slightly darker one a bed away.
    let score = |i: usize, v: f64| {
        (median - v) * (1.0 - 0.5 * (i as f64 - reach as f64).abs() / (reach as f64).max(1.0))
    };
    let Some((imin, vmin)) = profile
        .iter()
        .enumerate()
        .map(|(i, v)| (i, *v))
        .max_by(|a, b| score(a.0, a.1).total_cmp(&score(b.0, b.1)))
    else {
        return click;
    };
    if median - vmin < params.min_contrast {
        return click;
    }
    // Centre of darkness over the samples around the darkest one that are darker than the
    // median by a twentieth of the line's depth: with bilinear samples this centre is the line's
    // centre to a small fraction of a pixel.
    let half = median - 0.05 * (median - vmin);
    let (mut lo, mut hi) = (imin, imin);
    while lo > 0 && profile[lo - 1] < half {
        lo -= 1;
    }
    while hi + 1 < profile.len() && profile[hi + 1] < half {
        hi += 1;
    }
    let (mut wsum, mut ksum) = (0.0, 0.0);
    for (i, v) in profile.iter().enumerate().take(hi + 1).skip(lo) {
        let w = median - v;
        wsum += w;
        ksum += w * (i as f64 - reach as f64);
    }
    let k = ksum / wsum;
    Pt::new(click.x + k * ux, click.y + k * uy)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::trace::sheet::HeightScale;

    #[test]
    fn a_click_near_a_dark_line_lands_on_it() {
        // White 100 x 100 image with a 2-pixel black line on rows 40 and 41.
        let (w, h) = (100u32, 100u32);
        let mut rgba = vec![255u8; (w * h * 4) as usize];
        for y in 40..42 {
            for x in 0..w {
                let i = ((y * w + x) * 4) as usize;
                rgba[i..i + 3].copy_from_slice(&[0, 0, 0]);
            }
        }
        let image = SheetImage { width: w, height: h, rgba };
        let mut sheet = TraceSheet::new("a.png");
        sheet.height_scale = Some(HeightScale {
            low_px: Pt::new(5.0, 100.0),
            low_m: 0.0,
            high_px: Pt::new(5.0, 0.0),
            high_m: 10.0,
        });
        let got = snap_to_line(&image, &sheet, Pt::new(50.0, 45.3), SnapParams::default());
        // The line's centre is y = 41.0 (rows 40 and 41 cover 40.0–42.0).
        assert!((got.y - 41.0).abs() < 0.01 && (got.x - 50.0).abs() < 1e-9, "{got:?}");
        // Far from any line, the click stays where it was.
        let stay = snap_to_line(&image, &sheet, Pt::new(50.0, 80.0), SnapParams::default());
        assert_eq!(stay, Pt::new(50.0, 80.0));
    }
}
