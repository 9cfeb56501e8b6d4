//! Fuzz target: text → header folding and mapping (every line read as a header row, guessed and
//! fitted to a saved mapping), and the saved-mapping JSON reader: a mapping that reads must
//! write JSON that reads back to the same mapping. Never panics.
#![no_main]

use aggrade_core::io::import::{
    field_of_header, fit_saved, fold_header, guess_mapping, mapping_from_json, mapping_to_json,
};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let mut previous = None;
    for line in text.lines().take(32) {
        let headers: Vec<String> = line.split([',', ';', '\t']).map(str::to_string).collect();
        for h in &headers {
            let _ = fold_header(h);
            let _ = field_of_header(h);
        }
        let guessed = guess_mapping(&headers, false);
        let _ = guessed.problems();
        let _ = guessed.describe();
        if let Some(saved) = &previous {
            let _ = fit_saved(saved, &headers);
        }
        previous = Some(guessed);
    }
    if let Ok(m) = mapping_from_json(text) {
        let again = mapping_from_json(&mapping_to_json(&m)).expect("a saved mapping reads back");
        assert_eq!(again, m);
    }
});
