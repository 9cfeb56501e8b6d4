//! Fuzz target: bytes as a plain curve table (a spectrometer's CSV/TXT export) → the curve-table
//! reader, then every curve placed on section heights. Never panics.
#![no_main]

use aggrade_core::analysis::curve_table::read_curve_table;
use aggrade_core::analysis::las::{IndexDirection, IndexToSection};
use aggrade_core::io::import::TextOptions;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(file) = read_curve_table(data, "fuzz.csv", &TextOptions::default(), None) else { return };
    let placement = IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 10.0 };
    for m in file.curve_mnemonics() {
        let _ = file.measured_curve(m, &placement, "fuzz.csv");
    }
});
