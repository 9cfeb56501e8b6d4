//! PDF and SVG writers that translate layout pages item by item.

pub mod pdf;
pub mod svg;

pub use pdf::{write_pdf, PdfInfo};
pub use svg::write_svg;
