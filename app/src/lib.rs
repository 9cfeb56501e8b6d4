//! The Aggrade desktop application and command line, on top of `aggrade-core`.

pub mod cli;
pub mod gui;
