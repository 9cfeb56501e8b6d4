//! Fuzz target: raw bytes in a file on disk → `io::load` (size limit, UTF-8 check with its
//! line/column message, then the project reader). Never panics.
#![no_main]

use libfuzzer_sys::fuzz_target;
use std::io::Write;

fuzz_target!(|data: &[u8]| {
    let Ok(mut file) = tempfile::Builder::new().suffix(".aggrade").tempfile() else { return };
    if file.write_all(data).is_err() {
        return;
    }
    if let Err(err) = aggrade_core::io::load(file.path()) {
        // The message must name the file (formatting it must not panic either).
        let msg = err.to_string();
        assert!(msg.contains(&*file.path().display().to_string()), "message lacks the path: {msg}");
    }
});
