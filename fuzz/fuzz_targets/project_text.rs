//! Fuzz target: project JSON text → reader. Never panics; a project that reads must write back
//! to JSON that reads again to the same project (a saved file always opens).
#![no_main]

use aggrade_core::io::{project_to_json, read_project_text};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let Ok(read) = read_project_text(text) else { return };
    let json = project_to_json(&read.project).expect("a read project encodes to JSON");
    let again = match read_project_text(&json) {
        Ok(again) => again,
        Err(problems) => panic!("saved project does not read again: {problems:?}\n{json}"),
    };
    let json_again = project_to_json(&again.project).expect("encodes");
    assert_eq!(json, json_again, "project changed on a save/read round trip");
});
