//! The interpretation and column layout the window draws from: the core's rules and layout,
//! named in one place so the panels do not each reach into the core.

pub use aggrade_core::layout::{column_strip_window, ColumnStrip as Strip, LayoutOptions};
pub use aggrade_core::rules::{interpret, RuleParams};
