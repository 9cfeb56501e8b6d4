//! Fuzz target: bytes as a text table → the importer's sniffing (encoding, delimiter, decimal
//! mark), header mapping and value tables, the preview, and the section build. A table that
//! imports must write to a bed table that reads back to the same number of beds. Never panics.
#![no_main]

use aggrade_core::io::import::{find_mapping, import_bytes, preview, read_source, ImportOptions};
use aggrade_core::io::{read_bed_table, write_bed_table};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let options = ImportOptions::default();
    if let Ok(source) = read_source(data, "fuzz.csv", &options) {
        if let Ok((header, mapping)) = find_mapping(&source.table, &options) {
            let _ = preview(&source.table, header, &mapping, source.format.decimal(), 8);
        }
    }
    for top_first in [false, true] {
        let options = ImportOptions { top_first, ..Default::default() };
        if let Ok(imported) = import_bytes(data, "fuzz.csv", &options) {
            let text = write_bed_table(&imported.section);
            let again = read_bed_table(&text, "fuzz").expect("an imported section writes a bed table that reads");
            assert_eq!(again.section.beds.len(), imported.section.beds.len());
        }
    }
});
