//! Interpretation rules: pure functions of a section plus one documented parameter struct.

pub mod types;

pub use types::*;
