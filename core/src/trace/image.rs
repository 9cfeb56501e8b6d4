//! Reading a sheet image (PNG or JPEG) into grey levels for snapping and RGBA for display.

use std::path::{Path, PathBuf};
use thiserror::Error;

/// Images larger than this many pixels are refused (a 12-megapixel phone photo is far below).
pub const MAX_SHEET_PIXELS: u64 = 80_000_000;

/// A decoded sheet image.
#[derive(Debug, Clone, PartialEq)]
pub struct SheetImage {
    pub width: u32,
    pub height: u32,
    /// RGBA, 8 bits a channel, row by row from the top.
    pub rgba: Vec<u8>,
}

/// Why a sheet image cannot be shown.
#[derive(Debug, Error)]
pub enum SheetImageError {
    #[error("{path}: the sheet image is missing (moved or renamed?); the calibration is kept — open the image again from Section ▸ Trace from image…")]
    Missing { path: PathBuf },
    #[error("{path}: cannot read the sheet image: {why}")]
    Unreadable { path: PathBuf, why: String },
    #[error("{path}: not a PNG or JPEG image this version reads: {why}")]
    Undecodable { path: PathBuf, why: String },
    #[error("{path}: the image is {width} × {height} pixels, more than the {MAX_SHEET_PIXELS} this version opens; scale it down first")]
    TooLarge { path: PathBuf, width: u32, height: u32 },
}

impl SheetImage {
    /// Decode PNG or JPEG bytes (the format is read from the bytes, not the name).
    pub fn decode(bytes: &[u8], path: &Path) -> Result<SheetImage, SheetImageError> {
        let undecodable = |e: ::image::ImageError| SheetImageError::Undecodable {
            path: path.to_path_buf(),
            why: e.to_string(),
        };
        let reader = ::image::ImageReader::new(std::io::Cursor::new(bytes))
            .with_guessed_format()
            .map_err(|e| SheetImageError::Unreadable { path: path.to_path_buf(), why: e.to_string() })?;
        let (width, height) = reader.into_dimensions().map_err(undecodable)?;
        if u64::from(width) * u64::from(height) > MAX_SHEET_PIXELS {
            return Err(SheetImageError::TooLarge { path: path.to_path_buf(), width, height });
        }
        let reader = ::image::ImageReader::new(std::io::Cursor::new(bytes))
            .with_guessed_format()
            .map_err(|e| SheetImageError::Unreadable { path: path.to_path_buf(), why: e.to_string() })?;
        let img = reader.decode().map_err(undecodable)?.to_rgba8();
        Ok(SheetImage { width: img.width(), height: img.height(), rgba: img.into_raw() })
    }

    /// Read and decode a file; a missing file is its own error so the window can say so calmly.
    pub fn open(path: &Path) -> Result<SheetImage, SheetImageError> {
        let bytes = std::fs::read(path).map_err(|e| {
            if e.kind() == std::io::ErrorKind::NotFound {
                SheetImageError::Missing { path: path.to_path_buf() }
            } else {
                SheetImageError::Unreadable { path: path.to_path_buf(), why: e.to_string() }
            }
        })?;
        SheetImage::decode(&bytes, path)
    }

    /// Grey level (0 black … 255 white, Rec. 601 luma weights) at a pixel; white outside.
    pub fn grey(&self, x: i64, y: i64) -> f64 {
        if x < 0 || y < 0 || x >= i64::from(self.width) || y >= i64::from(self.height) {
            return 255.0;
        }
        let i = (y as usize * self.width as usize + x as usize) * 4;
        let (r, g, b) = (f64::from(self.rgba[i]), f64::from(self.rgba[i + 1]), f64::from(self.rgba[i + 2]));
        0.299 * r + 0.587 * g + 0.114 * b
    }

    /// Grey level at a point in continuous pixel coordinates (pixel `i` covers `i … i + 1`, its
    /// centre at `i + 0.5`), interpolated bilinearly between the four nearest pixel centres.
    pub fn grey_at(&self, p: super::projective::Pt) -> f64 {
        let (x, y) = (p.x - 0.5, p.y - 0.5);
        let (x0, y0) = (x.floor(), y.floor());
        let (fx, fy) = (x - x0, y - y0);
        let (x0, y0) = (x0 as i64, y0 as i64);
        let top = self.grey(x0, y0) * (1.0 - fx) + self.grey(x0 + 1, y0) * fx;
        let bottom = self.grey(x0, y0 + 1) * (1.0 - fx) + self.grey(x0 + 1, y0 + 1) * fx;
        top * (1.0 - fy) + bottom * fy
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn png_bytes_decode_and_garbage_is_named() {
        let mut png = Vec::new();
        let img = ::image::RgbaImage::from_fn(3, 2, |x, _| ::image::Rgba([x as u8 * 100, 0, 0, 255]));
        img.write_to(&mut std::io::Cursor::new(&mut png), ::image::ImageFormat::Png).expect("encode");
        let got = SheetImage::decode(&png, Path::new("p.png")).expect("decodes");
        assert_eq!((got.width, got.height), (3, 2));
        assert!((got.grey(2, 0) - 0.299 * 200.0).abs() < 1e-9);
        assert_eq!(got.grey(-1, 0), 255.0);
        let err = SheetImage::decode(b"not an image", Path::new("notes.txt")).expect_err("refused");
        assert!(err.to_string().starts_with("notes.txt: "), "{err}");
        let err = SheetImage::open(Path::new("/nonexistent/sheet.jpg")).expect_err("missing");
        assert!(matches!(err, SheetImageError::Missing { .. }), "{err}");
    }
}
