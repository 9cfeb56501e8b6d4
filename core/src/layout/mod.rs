//! Column layout: turns a section and its interpretation into positioned items at a true scale.

pub mod items;

pub use items::*;
