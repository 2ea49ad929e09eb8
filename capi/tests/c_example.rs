//! The C example `examples/c/valve_diagnosis.c`, end to end: the configuration step writes the
//! demo's constants header, the example compiles against it and the C ABI header (C99,
//! `-Wall -Wextra -pedantic -Werror`, with the sanitizers), links the static library, and
//! confirms the stubbed open clamp after exactly FAULT_CONFIRMATIONS readings.

mod common;

use std::path::PathBuf;
use std::process::Command;

#[test]
fn valve_diagnosis_example_confirms_the_open_clamp() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let exe = std::env::current_exe().unwrap();
    let deps = exe.parent().unwrap();
    let out = deps.join("c_example_config");
    kickguard::host::configure(root.join("examples/greenhouse.toml"), &out).unwrap();
    let bin = common::build_c(
        &root.join("examples/c/valve_diagnosis.c"),
        &[&root.join("capi/include"), &out],
        "valve_diagnosis",
    );
    let run = Command::new(&bin).output().unwrap();
    let text = String::from_utf8_lossy(&run.stdout);
    assert!(run.status.success(), "{text}");
    // Healthy for switch-offs 0…4, open from 5: confirmed at the third open reading (the demo's
    // FAULT_CONFIRMATIONS is 3).
    assert!(
        text.contains("clamp path open confirmed at switch-off 7"),
        "{text}"
    );
    assert!(
        text.contains("switch-off 4: 0 ticks, verdict kind 0"),
        "{text}"
    );
}
