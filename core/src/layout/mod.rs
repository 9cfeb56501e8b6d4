//! Column layout: turns a section and its interpretation into positioned items at a true scale.

pub mod clip;
pub mod font;
pub mod items;
pub mod options;
pub mod patterns;
pub mod style;
pub mod transform;

pub use items::*;
pub use options::{LayoutOptions, Orientation, Paper, PrintMeta};
pub use transform::{GrainScale, HeightTransform};
