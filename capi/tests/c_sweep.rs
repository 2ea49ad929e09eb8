//! The C ABI's own hostile sweep: `tests/c/sweep.c`, compiled with `cc` against the static
//! library under AddressSanitizer and UndefinedBehaviorSanitizer, calls every exported function
//! with generated hostile inputs (the classes of the library's property tests: NaN, ±∞,
//! subnormals, zero, negative, huge and tiny values, raw bit patterns; and this layer's own:
//! null pointers, zero and oversized lengths, unknown codes). No crash, no sanitizer report, no
//! unknown status, no non-finite result in a success, every failure naming its input.
//!
//! CI runs 2000 rounds (every function once a round); `KICKGUARD_CAPI_SWEEP=N` sets the rounds.

mod common;

use std::path::PathBuf;
use std::process::Command;

#[test]
fn every_function_survives_hostile_input() {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let exe = common::build_c(
        &dir.join("tests/c/sweep.c"),
        &[&dir.join("include")],
        "kickguard_c_sweep",
    );
    let rounds = std::env::var("KICKGUARD_CAPI_SWEEP").unwrap_or_else(|_| "2000".into());
    let out = Command::new(&exe).arg(&rounds).output().unwrap();
    let stdout = String::from_utf8_lossy(&out.stdout);
    let stderr = String::from_utf8_lossy(&out.stderr);
    println!("{stdout}");
    assert!(out.status.success(), "{stdout}\n{stderr}");
    assert!(stdout.contains(" 0 problems"), "{stdout}");
    // The sweep did call and refuse (a sweep that refuses nothing tests nothing).
    let calls: u64 = stdout.split(' ').nth(1).unwrap().parse().unwrap();
    let refused: u64 = stdout.split(' ').nth(3).unwrap().parse().unwrap();
    let rounds: u64 = rounds.parse().unwrap();
    assert!(
        calls >= 11 * rounds && refused > calls / 10 && refused < calls,
        "{stdout}"
    );
}
