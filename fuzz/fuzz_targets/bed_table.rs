//! Fuzz target: bed-table CSV text → reader. Never panics; a table that reads must write back
//! to CSV that reads again to the same beds.
#![no_main]

use aggrade_core::io::{read_bed_table, write_bed_table};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let Ok(read) = read_bed_table(text, "fuzz") else { return };
    let csv = write_bed_table(&read.section);
    let again = match read_bed_table(&csv, "fuzz") {
        Ok(again) => again,
        Err(problems) => panic!("written table does not read again: {problems:?}\n{csv}"),
    };
    assert_eq!(csv, write_bed_table(&again.section), "beds changed on a write/read round trip");
});
