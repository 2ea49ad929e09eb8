//! The C example `examples/c/valve_diagnosis.c`, end to end: the configuration step writes the
//! demo's constants header, the example compiles against it and the C ABI header (C99,
//! `-Wall -Wextra -pedantic -Werror`, with the sanitizers), links the static library, and
//! confirms the stubbed open clamp after exactly FAULT_CONFIRMATIONS readings.

use std::path::PathBuf;
use std::process::Command;

#[test]
fn valve_diagnosis_example_confirms_the_open_clamp() {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let exe = std::env::current_exe().unwrap();
    let deps = exe.parent().unwrap();
    let out = deps.join("c_example_config");
    kickguard::host::configure(root.join("examples/greenhouse.toml"), &out).unwrap();
    let lib = std::fs::read_dir(deps)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| {
            let n = p.file_name().unwrap().to_string_lossy();
            n.starts_with("libkickguard_capi-") && n.ends_with(".a")
        })
        .max_by_key(|p| p.metadata().and_then(|m| m.modified()).unwrap())
        .expect("cargo builds the static library for the test run");
    let bin = deps.join("valve_diagnosis");
    let cc = Command::new("cc")
        .args(["-std=c99", "-Wall", "-Wextra", "-pedantic", "-Werror"])
        .args(["-fsanitize=address,undefined", "-fno-sanitize-recover=all"])
        .arg("-I")
        .arg(root.join("capi/include"))
        .arg("-I")
        .arg(&out)
        .arg(root.join("examples/c/valve_diagnosis.c"))
        .arg(&lib)
        // --gc-sections: only what the program reaches is linked (a build with kickguard's `defmt`
        // feature on leaves references to a logger the program does not have in unused code).
        .args(["-Wl,--gc-sections", "-lpthread", "-ldl", "-lm", "-o"])
        .arg(&bin)
        .output()
        .expect("a C compiler (cc)");
    assert!(
        cc.status.success(),
        "cc: {}",
        String::from_utf8_lossy(&cc.stderr)
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
