//! The command-line tests, in one binary: the built `aggrade` binary run on fixture and demo
//! files, its output read back (often by reference libraries from PyPI), and killed mid-save.

mod harness;

mod bodies_lateral;
mod check_convert;
mod curve;
mod export;
mod facies;
mod headless;
mod import;
mod interpret;
mod kill_during_save;
mod link;
mod long_output;
mod panel;
mod rules_params;
mod stats;
