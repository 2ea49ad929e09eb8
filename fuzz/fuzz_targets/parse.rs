//! Fuzz target: the design file's parsing alone (TOML, schema, unknown fields, spans to line and
//! column), fast enough for tens of millions of runs. Never panics; errors are located.
#![no_main]

use kickguard::host::file::{parse_file, Reader};
use kickguard::host::HostError;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    let reader = Reader::new(&text, "fuzz.toml");
    match parse_file(&reader) {
        Ok(_) => {}
        Err(HostError::Input { line, column, .. }) => assert!(line >= 1 && column >= 1),
        Err(_) => {}
    }
});
