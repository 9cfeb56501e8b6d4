//! A traced sheet's calibration as saved in the project: the image (relative path), the optional
//! four frame corners, the two clicked points of the height scale and of the grain-size scale.
//!
//! Positions are image pixels (x right, y down, of the image as stored, before any display
//! rotation). With frame corners the sheet is first straightened by the homography that takes
//! the corners to a rectangle (`projective`); heights are then read along the straightened
//! sheet's vertical and grain sizes along its horizontal. Without corners, heights are read by
//! projecting the click on the line through the two height-scale points (so a rotated scan reads
//! correctly), and grain sizes likewise on the grain-size scale's line.

use super::projective::{Homography, ProjectiveError, Pt};
use crate::model::WentworthClass;
use serde::{Deserialize, Serialize};
use std::path::{Component, Path, PathBuf};
use thiserror::Error;

/// Display settings of the backdrop (they change nothing in the calibration).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct BackdropView {
    /// 0 (invisible) to 1 (opaque).
    pub opacity: f32,
    /// Added to each channel, −1 to 1.
    pub brightness: f32,
    /// Multiplies each channel's distance from mid-grey, 0.2 to 3.
    pub contrast: f32,
    /// Turns the image about its centre, degrees counter-clockwise, −15 to 15.
    pub rotation_deg: f32,
}

impl Default for BackdropView {
    fn default() -> Self {
        BackdropView { opacity: 0.6, brightness: 0.0, contrast: 1.0, rotation_deg: 0.0 }
    }
}

/// Two points of the sheet's height scale and the heights written there (metres).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct HeightScale {
    pub low_px: Pt,
    pub low_m: f64,
    pub high_px: Pt,
    pub high_m: f64,
}

/// Two points of the sheet's grain-size scale and the classes written there. Log sheets give each
/// Wentworth class a column of the same width (common practice), so classes are read linearly
/// in class rank between the two points.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct GrainScale {
    pub fine_px: Pt,
    pub fine: WentworthClass,
    pub coarse_px: Pt,
    pub coarse: WentworthClass,
}

/// A sheet traced behind a section, saved with the section (absent in older files).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct TraceSheet {
    /// The image, relative to the project file's folder, with `/` between folders.
    pub image: String,
    #[serde(default)]
    pub view: BackdropView,
    /// The sheet frame's corners: lower left, lower right, upper right, upper left.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub frame_px: Option<[Pt; 4]>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub height_scale: Option<HeightScale>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub grain_scale: Option<GrainScale>,
}

/// Why a click cannot be read or a calibration is refused.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum SheetError {
    #[error("the height scale is not calibrated yet: click two points of the sheet's height scale and type their heights")]
    NoHeightScale,
    #[error("the grain-size scale is not calibrated yet: click two points of the sheet's grain-size scale and name their classes")]
    NoGrainScale,
    #[error(
        "the two {0} points are the same point on the straightened sheet; click two points further apart"
    )]
    ScaleTooShort(&'static str),
    #[error("the two heights of the scale are equal ({0} m); type two different heights")]
    EqualHeights(f64),
    #[error("the two grain-size classes are the same ({0}); name two different classes")]
    EqualClasses(WentworthClass),
    #[error("{0}")]
    Frame(#[from] ProjectiveError),
    #[error("the click is outside the straightened sheet (beyond its horizon)")]
    OffSheet,
}

/// Size of the rectangle the frame corners are taken to (arbitrary units; square so that the
/// straightened sheet keeps no preferred direction).
const FRAME_SIDE: f64 = 1000.0;

impl TraceSheet {
    /// A fresh sheet for an image at `image` (relative path), nothing calibrated.
    pub fn new(image: impl Into<String>) -> Self {
        TraceSheet {
            image: image.into(),
            view: BackdropView::default(),
            frame_px: None,
            height_scale: None,
            grain_scale: None,
        }
    }

    /// The straightening transform from image pixels to sheet units, if frame corners are set.
    pub fn straightening(&self) -> Result<Option<Homography>, SheetError> {
        let Some(frame) = self.frame_px else { return Ok(None) };
        // Lower left, lower right, upper right, upper left → a square with y up.
        let to = [
            Pt::new(0.0, 0.0),
            Pt::new(FRAME_SIDE, 0.0),
            Pt::new(FRAME_SIDE, FRAME_SIDE),
            Pt::new(0.0, FRAME_SIDE),
        ];
        Ok(Some(Homography::from_four(frame, to)?))
    }

    fn straight(&self, p: Pt) -> Result<Pt, SheetError> {
        match self.straightening()? {
            Some(h) => h.apply(p).ok_or(SheetError::OffSheet),
            None => Ok(p),
        }
    }

    /// Position of `p` along the scale from `a` (0) to `b` (1): on the straightened sheet's
    /// vertical or horizontal axis when the frame is set, else projected on the line `a`–`b`.
    fn along(&self, p: Pt, a: Pt, b: Pt, vertical: bool, what: &'static str) -> Result<f64, SheetError> {
        let (p, a, b) = (self.straight(p)?, self.straight(a)?, self.straight(b)?);
        let t = if self.frame_px.is_some() {
            let (pa, pb, pp) = if vertical { (a.y, b.y, p.y) } else { (a.x, b.x, p.x) };
            if (pb - pa).abs() < 1e-9 {
                return Err(SheetError::ScaleTooShort(what));
            }
            (pp - pa) / (pb - pa)
        } else {
            let (dx, dy) = (b.x - a.x, b.y - a.y);
            let len2 = dx * dx + dy * dy;
            if len2 < 1e-12 {
                return Err(SheetError::ScaleTooShort(what));
            }
            ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2
        };
        if t.is_finite() {
            Ok(t)
        } else {
            Err(SheetError::OffSheet)
        }
    }

    /// Check the calibration reads at all (distinct points and values, a proper frame).
    pub fn check(&self) -> Result<(), SheetError> {
        self.straightening()?;
        if let Some(s) = self.height_scale {
            if s.low_m == s.high_m {
                return Err(SheetError::EqualHeights(s.low_m));
            }
            self.along(s.low_px, s.low_px, s.high_px, true, "height-scale")?;
        }
        if let Some(g) = self.grain_scale {
            if g.fine == g.coarse {
                return Err(SheetError::EqualClasses(g.fine));
            }
            self.along(g.fine_px, g.fine_px, g.coarse_px, false, "grain-size-scale")?;
        }
        Ok(())
    }

    /// What the project file checks refuse, as (field under `trace`, what is wrong): the fields
    /// must be finite and in range and the calibration must read (see `check`).
    pub fn problems(&self) -> Vec<(String, String)> {
        let mut out = Vec::new();
        if self.image.trim().is_empty() || self.image.chars().any(char::is_control) {
            out.push(("image".to_string(), "must name the sheet image file".to_string()));
        }
        let v = self.view;
        for (field, value, lo, hi) in [
            ("view.opacity", v.opacity, 0.0, 1.0),
            ("view.brightness", v.brightness, -1.0, 1.0),
            ("view.contrast", v.contrast, 0.2, 3.0),
            ("view.rotation_deg", v.rotation_deg, -15.0, 15.0),
        ] {
            if !(value.is_finite() && (lo..=hi).contains(&value)) {
                out.push((field.to_string(), format!("must lie between {lo} and {hi}, got {value}")));
            }
        }
        let mut points: Vec<(&str, Pt)> = Vec::new();
        if let Some(f) = &self.frame_px {
            points.extend(f.iter().map(|p| ("frame_px", *p)));
        }
        if let Some(h) = &self.height_scale {
            points.extend([("height_scale.low_px", h.low_px), ("height_scale.high_px", h.high_px)]);
            for (field, m) in [("height_scale.low_m", h.low_m), ("height_scale.high_m", h.high_m)] {
                if !m.is_finite() {
                    out.push((field.to_string(), "must be a finite height in metres".to_string()));
                }
            }
        }
        if let Some(g) = &self.grain_scale {
            points.extend([("grain_scale.fine_px", g.fine_px), ("grain_scale.coarse_px", g.coarse_px)]);
        }
        for (field, p) in points {
            if !(p.x.is_finite() && p.y.is_finite() && p.x.abs() <= 1e6 && p.y.abs() <= 1e6) {
                out.push((
                    field.to_string(),
                    "must be a pixel position (finite, within a million pixels)".to_string(),
                ));
            }
        }
        if out.is_empty() {
            if let Err(e) = self.check() {
                out.push(("calibration".to_string(), e.to_string()));
            }
        }
        out
    }

    /// The height (metres above the section base) at an image pixel.
    pub fn height_at(&self, p: Pt) -> Result<f64, SheetError> {
        let s = self.height_scale.ok_or(SheetError::NoHeightScale)?;
        let t = self.along(p, s.low_px, s.high_px, true, "height-scale")?;
        Ok(s.low_m + t * (s.high_m - s.low_m))
    }

    /// The Wentworth class at an image pixel: the nearest class on the calibrated scale, held to
    /// the classes that exist.
    pub fn grain_at(&self, p: Pt) -> Result<WentworthClass, SheetError> {
        let rank = self.grain_rank_at(p)?.round();
        let last = (WentworthClass::ALL.len() - 1) as f64;
        Ok(WentworthClass::from_rank(rank.clamp(0.0, last) as usize))
    }

    /// The position across the grain-size scale at an image pixel, in Wentworth class ranks
    /// (clay 0, silt 1 …), not rounded and not held to the scale: used to lay the sheet behind
    /// the column's grain-size axis.
    pub fn grain_rank_at(&self, p: Pt) -> Result<f64, SheetError> {
        let g = self.grain_scale.ok_or(SheetError::NoGrainScale)?;
        let t = self.along(p, g.fine_px, g.coarse_px, false, "grain-size-scale")?;
        let (r0, r1) = (g.fine.rank() as f64, g.coarse.rank() as f64);
        Ok(r0 + t * (r1 - r0))
    }

    /// The image pixel at a height, on the vertical through `near` (the inverse of `height_at`,
    /// used to draw traced boundaries over the sheet and by the snapping).
    pub fn pixel_at_height(&self, height_m: f64, near: Pt) -> Result<Pt, SheetError> {
        let s = self.height_scale.ok_or(SheetError::NoHeightScale)?;
        let t = (height_m - s.low_m) / (s.high_m - s.low_m);
        let (a, b, q) = (self.straight(s.low_px)?, self.straight(s.high_px)?, self.straight(near)?);
        let target = if self.frame_px.is_some() {
            Pt::new(q.x, a.y + t * (b.y - a.y))
        } else {
            // Move `near` along the scale's direction until its projection reads `t`.
            let (dx, dy) = (b.x - a.x, b.y - a.y);
            let now = self.along(near, s.low_px, s.high_px, true, "height-scale")?;
            Pt::new(q.x + (t - now) * dx, q.y + (t - now) * dy)
        };
        match self.straightening()? {
            Some(h) => h.inverse().and_then(|inv| inv.apply(target)).ok_or(SheetError::OffSheet),
            None => Ok(target),
        }
    }
}

/// The image path to store: relative to the project file's folder when the image lies under it
/// or beside it (with `..` steps otherwise on the same drive), with `/` separators.
pub fn relative_image_path(project_file: &Path, image: &Path) -> String {
    let base = project_file.parent().unwrap_or(Path::new(""));
    let (b, i): (Vec<Component>, Vec<Component>) =
        (base.components().collect(), image.components().collect());
    let common = b.iter().zip(i.iter()).take_while(|(x, y)| x == y).count();
    if common == 0 && image.is_absolute() {
        return image.to_string_lossy().replace('\\', "/");
    }
    let mut parts: Vec<String> = vec!["..".to_string(); b.len() - common];
    parts.extend(i[common..].iter().map(|c| c.as_os_str().to_string_lossy().into_owned()));
    parts.join("/")
}

/// The image file a stored path names, resolved against the project file's folder.
pub fn resolve_image_path(project_file: Option<&Path>, stored: &str) -> PathBuf {
    let p = PathBuf::from(stored);
    if p.is_absolute() {
        return p;
    }
    match project_file.and_then(Path::parent) {
        Some(dir) => dir.join(p),
        None => p,
    }
}

/// The stored image path for a project written to `new_project_file`: the image `stored` names
/// (absolute, as chosen before a first save, or relative to `old_project_file`'s folder) told
/// again relative to the new file's folder. A relative path with no project file to read it
/// from is kept as it is.
pub fn rebase_image_path(old_project_file: Option<&Path>, new_project_file: &Path, stored: &str) -> String {
    let image = resolve_image_path(old_project_file, stored);
    if !image.is_absolute() {
        return stored.to_string();
    }
    relative_image_path(new_project_file, &image)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_stored_path_is_told_again_from_where_the_project_is_written() {
        // Chosen before the first save: absolute, made relative to the new file's folder.
        let new = Path::new("/field/2026/log.aggrade");
        assert_eq!(rebase_image_path(None, new, "/field/2026/scans/s.png"), "scans/s.png");
        // Saved elsewhere: relative to the old folder, then to the new one.
        let old = Path::new("/field/2026/log.aggrade");
        let moved = Path::new("/field/copies/log.aggrade");
        assert_eq!(rebase_image_path(Some(old), moved, "scans/s.png"), "../2026/scans/s.png");
        // Saved in the same place: unchanged.
        assert_eq!(rebase_image_path(Some(old), old, "scans/s.png"), "scans/s.png");
        // Relative with nothing to read it from: kept.
        assert_eq!(rebase_image_path(None, new, "s.png"), "s.png");
    }

    fn scan() -> TraceSheet {
        let mut s = TraceSheet::new("sheet.png");
        // Height scale up the left side: 0 m at y = 900 px, 10 m at y = 100 px.
        s.height_scale = Some(HeightScale {
            low_px: Pt::new(50.0, 900.0),
            low_m: 0.0,
            high_px: Pt::new(50.0, 100.0),
            high_m: 10.0,
        });
        s.grain_scale = Some(GrainScale {
            fine_px: Pt::new(200.0, 950.0),
            fine: WentworthClass::Clay,
            coarse_px: Pt::new(600.0, 950.0),
            coarse: WentworthClass::Granule,
        });
        s
    }

    #[test]
    fn heights_and_classes_read_linearly() {
        let s = scan();
        assert!((s.height_at(Pt::new(300.0, 500.0)).expect("calibrated") - 5.0).abs() < 1e-12);
        assert!((s.height_at(Pt::new(80.0, 820.0)).expect("calibrated") - 1.0).abs() < 1e-12);
        // Clay (rank 0) at 200 px, granule (rank 7) at 600 px: one class every 400/7 px.
        assert_eq!(s.grain_at(Pt::new(200.0, 0.0)), Ok(WentworthClass::Clay));
        assert_eq!(s.grain_at(Pt::new(200.0 + 3.0 * 400.0 / 7.0, 0.0)), Ok(WentworthClass::FineSand));
        assert_eq!(s.grain_at(Pt::new(2000.0, 0.0)), Ok(WentworthClass::Boulder));
        let back = s.pixel_at_height(2.5, Pt::new(300.0, 10.0)).expect("calibrated");
        assert!((back.y - 700.0).abs() < 1e-9 && (back.x - 300.0).abs() < 1e-9, "{back:?}");
    }

    #[test]
    fn a_rotated_scan_reads_along_its_own_scale() {
        // The same scale turned by 30 degrees about (50, 900).
        let (c, sn) = (30f64.to_radians().cos(), 30f64.to_radians().sin());
        let rot = |p: Pt| {
            let (dx, dy) = (p.x - 50.0, p.y - 900.0);
            Pt::new(50.0 + dx * c - dy * sn, 900.0 + dx * sn + dy * c)
        };
        let mut s = scan();
        let h = s.height_scale.as_mut().expect("set");
        h.high_px = rot(h.high_px);
        let p = rot(Pt::new(300.0, 500.0));
        assert!((s.height_at(p).expect("calibrated") - 5.0).abs() < 1e-9);
    }

    #[test]
    fn a_frame_straightens_before_reading() {
        // A 1000 x 1000 sheet photographed so its frame is the quadrilateral below; points on
        // the straightened sheet at 25 % and 75 % of the height read 2.5 m and 7.5 m.
        let frame =
            [Pt::new(100.0, 950.0), Pt::new(900.0, 990.0), Pt::new(820.0, 80.0), Pt::new(160.0, 40.0)];
        let to_photo = Homography::from_four(
            [Pt::new(0.0, 0.0), Pt::new(1.0, 0.0), Pt::new(1.0, 1.0), Pt::new(0.0, 1.0)],
            frame,
        )
        .expect("proper");
        let on = |u: f64, v: f64| to_photo.apply(Pt::new(u, v)).expect("finite");
        let mut s = TraceSheet::new("photo.jpg");
        s.frame_px = Some(frame);
        s.height_scale =
            Some(HeightScale { low_px: on(0.05, 0.0), low_m: 0.0, high_px: on(0.05, 1.0), high_m: 10.0 });
        for (v, want) in [(0.25, 2.5), (0.75, 7.5)] {
            let got = s.height_at(on(0.6, v)).expect("calibrated");
            assert!((got - want).abs() < 1e-9, "{v}: {got}");
            let px = s.pixel_at_height(want, on(0.6, 0.5)).expect("calibrated");
            let target = on(0.6, v);
            assert!((px.x - target.x).abs() < 1e-6 && (px.y - target.y).abs() < 1e-6, "{px:?} vs {target:?}");
        }
    }

    #[test]
    fn refusals_name_what_to_do() {
        let mut s = TraceSheet::new("a.png");
        assert_eq!(s.height_at(Pt::new(1.0, 1.0)), Err(SheetError::NoHeightScale));
        s.height_scale = Some(HeightScale {
            low_px: Pt::new(5.0, 5.0),
            low_m: 0.0,
            high_px: Pt::new(5.0, 5.0),
            high_m: 2.0,
        });
        assert_eq!(s.check(), Err(SheetError::ScaleTooShort("height-scale")));
        s.height_scale = Some(HeightScale {
            low_px: Pt::new(5.0, 5.0),
            low_m: 2.0,
            high_px: Pt::new(5.0, 50.0),
            high_m: 2.0,
        });
        assert_eq!(s.check(), Err(SheetError::EqualHeights(2.0)));
    }

    #[test]
    fn image_paths_are_kept_relative_to_the_project() {
        let proj = Path::new("/data/field/2026/log.aggrade");
        assert_eq!(relative_image_path(proj, Path::new("/data/field/2026/scans/p1.jpg")), "scans/p1.jpg");
        assert_eq!(relative_image_path(proj, Path::new("/data/field/photos/p1.jpg")), "../photos/p1.jpg");
        assert_eq!(
            resolve_image_path(Some(proj), "scans/p1.jpg"),
            PathBuf::from("/data/field/2026/scans/p1.jpg")
        );
        assert_eq!(resolve_image_path(None, "scans/p1.jpg"), PathBuf::from("scans/p1.jpg"));
    }
}
