//! Fuzz target: bytes as an .xlsx and as an .ods workbook → the archive bounds, the .ods repeat
//! count, calamine and the importer. Never panics.
#![no_main]

use aggrade_core::io::import::{import_bytes, ImportOptions};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    for name in ["fuzz.xlsx", "fuzz.ods"] {
        let _ = import_bytes(data, name, &ImportOptions::default());
    }
});
