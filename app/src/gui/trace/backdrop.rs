//! The sheet image as shown: brightness and contrast applied to a display copy, the placement
//! (zoom, pan, rotation) that turns image pixels into screen points and back in the trace
//! window, and the mesh that lays the calibrated sheet behind the column canvas.

use aggrade_core::trace::image::SheetImage;
use aggrade_core::trace::{BackdropView, Pt, TraceSheet};
use egui::{Color32, Pos2, Rect, Vec2};

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

/// The calibrated sheet as the column canvas draws it behind the beds.
#[derive(Debug, Clone)]
pub struct CanvasBackdrop {
    pub sheet: aggrade_core::trace::TraceSheet,
    pub texture: egui::TextureId,
    pub image_size: [u32; 2],
    pub opacity: f32,
}

/// Where sheet readings land on the column canvas.
pub struct CanvasPlace<'a> {
    /// Screen y of a height (metres above the section base).
    pub y_of_height: &'a dyn Fn(f64) -> f32,
    /// Screen x of a grain-size position in Wentworth class ranks (clay 0; a class's centre at
    /// its rank), on the column's grain-size axis.
    pub x_of_rank: &'a dyn Fn(f64) -> f32,
    /// Screen x of the lithology column's left edge, and screen points per metre of height: with
    /// no grain-size scale the sheet keeps its proportions, its height-scale line on that edge.
    pub left_x: f32,
    pub points_per_m: f32,
}

/// Cells along each side of the mesh: enough for the straightening of a photo taken at an
/// angle to look smooth, few enough to draw every frame.
pub const MESH_CELLS: usize = 32;

/// The sheet behind the column: a textured mesh over the whole image whose vertices sit where the
/// calibration reads them (height up the column; grain size across it when that scale is
/// calibrated), so the page's pencil lines meet the beds traced from them. `None` until the
/// height scale is calibrated. Cells whose corners cannot be read (beyond a straightened sheet's
/// horizon) are left out.
pub fn behind_column(
    sheet: &TraceSheet,
    image_size: [u32; 2],
    texture: egui::TextureId,
    place: &CanvasPlace<'_>,
    opacity: f32,
) -> Option<egui::Mesh> {
    let scale = sheet.height_scale?;
    let (w, h) = (f64::from(image_size[0].max(1)), f64::from(image_size[1].max(1)));
    let px_len =
        ((scale.high_px.x - scale.low_px.x).powi(2) + (scale.high_px.y - scale.low_px.y).powi(2)).sqrt();
    if px_len <= 0.0 {
        return None;
    }
    let points_per_px = f64::from(place.points_per_m) * (scale.high_m - scale.low_m).abs() / px_len;
    let tint = Color32::from_white_alpha((opacity.clamp(0.0, 1.0) * 255.0) as u8);
    let n = MESH_CELLS;
    let mut mesh = egui::Mesh::with_texture(texture);
    let mut ok = Vec::with_capacity((n + 1) * (n + 1));
    for j in 0..=n {
        for i in 0..=n {
            let (u, v) = (i as f64 / n as f64, j as f64 / n as f64);
            let p = Pt::new(u * w, v * h);
            let y = sheet.height_at(p).ok().map(|m| (place.y_of_height)(m));
            let x = if sheet.grain_scale.is_some() {
                sheet.grain_rank_at(p).ok().map(|r| (place.x_of_rank)(r))
            } else {
                Some(place.left_x + ((p.x - scale.low_px.x) * points_per_px) as f32)
            };
            let pos = match (x, y) {
                (Some(x), Some(y)) if x.is_finite() && y.is_finite() => Some(Pos2::new(x, y)),
                _ => None,
            };
            ok.push(pos.is_some());
            mesh.vertices.push(egui::epaint::Vertex {
                pos: pos.unwrap_or(Pos2::ZERO),
                uv: egui::pos2(u as f32, v as f32),
                color: tint,
            });
        }
    }
    let at = |i: usize, j: usize| (j * (n + 1) + i) as u32;
    for j in 0..n {
        for i in 0..n {
            let corners = [at(i, j), at(i + 1, j), at(i + 1, j + 1), at(i, j + 1)];
            if corners.iter().all(|&k| ok[k as usize]) {
                mesh.add_triangle(corners[0], corners[1], corners[2]);
                mesh.add_triangle(corners[0], corners[2], corners[3]);
            }
        }
    }
    (!mesh.indices.is_empty()).then_some(mesh)
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::WentworthClass;
    use aggrade_core::trace::{GrainScale, HeightScale};

    #[test]
    fn the_sheet_behind_the_column_lines_up_with_its_calibration() {
        // A 1000 × 2000 px scan: 0 m at y = 1900 px, 10 m at y = 100 px (180 px per metre);
        // clay's column at x = 100 px, pebble's (rank 8) at x = 800 px (87.5 px per class). The
        // canvas: 20 points per metre with 0 m at y = 500; ranks at 30 points each from x = 50.
        let mut sheet = TraceSheet::new("scan.png");
        sheet.height_scale = Some(HeightScale {
            low_px: Pt::new(50.0, 1900.0),
            low_m: 0.0,
            high_px: Pt::new(50.0, 100.0),
            high_m: 10.0,
        });
        let y_of_height = |m: f64| (500.0 - 20.0 * m) as f32;
        let x_of_rank = |r: f64| (50.0 + 30.0 * r) as f32;
        let place = CanvasPlace {
            y_of_height: &y_of_height,
            x_of_rank: &x_of_rank,
            left_x: 40.0,
            points_per_m: 20.0,
        };
        let id = egui::TextureId::default();
        // Without a grain-size scale the sheet keeps its proportions: 20/180 points per pixel.
        let mesh = behind_column(&sheet, [1000, 2000], id, &place, 0.5).expect("a mesh");
        assert_eq!(mesh.vertices.len(), (MESH_CELLS + 1) * (MESH_CELLS + 1));
        assert_eq!(mesh.indices.len(), MESH_CELLS * MESH_CELLS * 6);
        let corner = |i: usize, j: usize| mesh.vertices[j * (MESH_CELLS + 1) + i].pos;
        // Top-left pixel (0, 0): height (1900 − 0)/180 = 10.556 m → y = 500 − 211.1 = 288.9;
        // x = 40 + (0 − 50)·20/180 = 34.44.
        let p = corner(0, 0);
        assert!((p.y - 288.89).abs() < 0.01 && (p.x - 34.444).abs() < 0.01, "{p:?}");
        // Bottom-right (1000, 2000): −0.556 m → y = 511.1; x = 40 + 950·20/180 = 145.56.
        let p = corner(MESH_CELLS, MESH_CELLS);
        assert!((p.y - 511.11).abs() < 0.01 && (p.x - 145.56).abs() < 0.01, "{p:?}");
        assert_eq!(mesh.vertices[0].color, Color32::from_white_alpha(127));

        // With the grain-size scale, across is read in class ranks: x = 0 px is 100/87.5 = 1.143
        // classes finer than clay's column → 50 − 30 × 1.143 = 15.71 points.
        sheet.grain_scale = Some(GrainScale {
            fine_px: Pt::new(100.0, 1000.0),
            fine: WentworthClass::Clay,
            coarse_px: Pt::new(800.0, 1000.0),
            coarse: WentworthClass::Pebble,
        });
        let mesh = behind_column(&sheet, [1000, 2000], id, &place, 1.0).expect("a mesh");
        let p = mesh.vertices[0].pos;
        assert!((p.x - 15.714).abs() < 0.01, "{p:?}");
        // Not calibrated: nothing to draw.
        assert!(behind_column(&TraceSheet::new("scan.png"), [1000, 2000], id, &place, 1.0).is_none());
    }

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
