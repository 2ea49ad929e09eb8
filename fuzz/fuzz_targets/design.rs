//! Fuzz target: any bytes as a design file. The configuration step must never panic or hang; a
//! bad file is a located error. Seeded with the shipped demo design.
#![no_main]

use kickguard::host::{analyse_text, HostError, Options};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    match analyse_text(&text, "fuzz.toml", &Options::default()) {
        Ok(report) => {
            let _ = kickguard::host::render_outputs(&report);
        }
        Err(HostError::Input { line, column, .. }) => assert!(line >= 1 && column >= 1),
        Err(_) => {}
    }
});
