//! The sheet image as shown: brightness and contrast applied to a display copy, and the placement
//! (zoom, pan, rotation) that turns image pixels into screen points and back.

use aggrade_core::trace::image::SheetImage;
use aggrade_core::trace::{BackdropView, Pt};
use egui::{Pos2, Rect, Vec2};

/// Longest side of the display copy, pixels (the calibration always uses the full image).
pub const DISPLAY_MAX_SIDE: u32 = 2048;

/// A display copy: every `step`-th pixel of the image, with brightness and contrast applied.
pub fn display_pixels(image: &SheetImage, view: &BackdropView) -> egui::ColorImage {
    let step = image.width.max(image.height).div_ceil(DISPLAY_MAX_SIDE).max(1);
    let (w, h) = (image.width.div_ceil(step), image.height.div_ceil(step));
    let adjust = |c: u8| {
        let v = (f32::from(c) / 255.0 - 0.5) * view.contrast + 0.5 + view.brightness;
        (v.clamp(0.0, 1.0) * 255.0).round() as u8
    };
    let mut pixels = Vec::with_capacity((w * h) as usize);
    for y in 0..h {
        for x in 0..w {
            let i = (((y * step) as usize) * image.width as usize + (x * step) as usize) * 4;
            let p = &image.rgba[i..i + 4];
            pixels.push(egui::Color32::from_rgb(adjust(p[0]), adjust(p[1]), adjust(p[2])));
        }
    }
    egui::ColorImage::new([w as usize, h as usize], pixels)
}

/// Where the image sits in the view: its centre at `center` on screen, `zoom` screen points per
/// image pixel, turned `rotation_deg` counter-clockwise about its centre.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placement {
    pub center: Pos2,
    pub zoom: f32,
    pub rotation_deg: f32,
    pub image_size: Vec2,
}

impl Placement {
    /// Fit the whole image into `area`.
    pub fn fit(area: Rect, image_size: Vec2, rotation_deg: f32, zoom_factor: f32, pan: Vec2) -> Self {
        let zoom = (area.width() / image_size.x).min(area.height() / image_size.y) * 0.95 * zoom_factor;
        Placement { center: area.center() + pan, zoom, rotation_deg, image_size }
    }

    fn turn(&self, v: Vec2, sign: f32) -> Vec2 {
        // Counter-clockwise on screen (y down) is a negative angle in screen coordinates.
        let a = -sign * self.rotation_deg.to_radians();
        Vec2::new(v.x * a.cos() - v.y * a.sin(), v.x * a.sin() + v.y * a.cos())
    }

    /// Screen point of an image pixel position.
    pub fn to_screen(self, p: Pt) -> Pos2 {
        let v = Vec2::new(p.x as f32, p.y as f32) - self.image_size / 2.0;
        self.center + self.turn(v * self.zoom, 1.0)
    }

    /// Image pixel position under a screen point.
    pub fn to_image(self, s: Pos2) -> Pt {
        let v = self.turn(s - self.center, -1.0) / self.zoom + self.image_size / 2.0;
        Pt::new(f64::from(v.x), f64::from(v.y))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn screen_and_image_positions_round_trip_under_rotation() {
        let area = Rect::from_min_size(Pos2::new(10.0, 20.0), Vec2::new(800.0, 600.0));
        let pl = Placement::fit(area, Vec2::new(1600.0, 1200.0), 7.0, 1.0, Vec2::new(5.0, -3.0));
        for p in [Pt::new(0.0, 0.0), Pt::new(1600.0, 1200.0), Pt::new(321.5, 987.25)] {
            let back = pl.to_image(pl.to_screen(p));
            assert!((back.x - p.x).abs() < 0.01 && (back.y - p.y).abs() < 0.01, "{p:?} -> {back:?}");
        }
        // The image centre is the placement's centre; a point right of it turns upward on screen
        // (counter-clockwise) when the rotation is positive.
        let c = pl.to_screen(Pt::new(800.0, 600.0));
        assert!((c - pl.center).length() < 1e-3);
        let right = pl.to_screen(Pt::new(1000.0, 600.0));
        assert!(right.y < c.y && right.x > c.x, "{right:?} vs {c:?}");
    }

    #[test]
    fn contrast_and_brightness_change_the_display_copy_only() {
        let image = SheetImage { width: 2, height: 1, rgba: vec![100, 100, 100, 255, 200, 200, 200, 255] };
        let plain = display_pixels(&image, &BackdropView::default());
        assert_eq!(plain.pixels[0].r(), 100);
        let strong =
            display_pixels(&image, &BackdropView { contrast: 2.0, brightness: 0.1, ..Default::default() });
        // (100/255 − 0.5)·2 + 0.5 + 0.1 = 0.384 → 98; (200/255 − 0.5)·2 + 0.6 = 1.669 → 255.
        assert_eq!(strong.pixels[0].r(), 98);
        assert_eq!(strong.pixels[1].r(), 255);
        assert_eq!(image.rgba[0], 100);
    }
}
