//! Shared by the tests that build C programs against the static library.
#![allow(dead_code)]

use std::path::{Path, PathBuf};
use std::process::Command;

/// The static library cargo built for this test run: the newest `libkickguard_capi-*.a` beside
/// the test's own binary (target/<profile>/deps).
pub fn static_lib() -> PathBuf {
    let exe = std::env::current_exe().unwrap();
    let deps = exe.parent().unwrap();
    std::fs::read_dir(deps)
        .unwrap()
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| {
            let n = p.file_name().unwrap().to_string_lossy();
            n.starts_with("libkickguard_capi-") && n.ends_with(".a")
        })
        .max_by_key(|p| p.metadata().and_then(|m| m.modified()).unwrap())
        .expect("cargo builds the static library for the test run")
}

/// Compiles `source` with `cc` (C99, `-Wall -Wextra -pedantic -Werror`, AddressSanitizer and
/// UndefinedBehaviorSanitizer) against the static library, with `includes`, into an executable
/// named `name` beside the library; returns its path.
pub fn build_c(source: &Path, includes: &[&Path], name: &str) -> PathBuf {
    let lib = static_lib();
    let exe = lib.with_file_name(name);
    let mut cc = Command::new("cc");
    cc.args(["-std=c99", "-Wall", "-Wextra", "-pedantic", "-Werror", "-g"])
        .args(["-fsanitize=address,undefined", "-fno-sanitize-recover=all"]);
    for dir in includes {
        cc.arg("-I").arg(dir);
    }
    let out = cc
        .arg(source)
        .arg(&lib)
        // --gc-sections: only what the program reaches is linked (a build with kickguard's
        // `defmt` feature on leaves references to a logger the program does not have in
        // unused code).
        .args(["-Wl,--gc-sections", "-lpthread", "-ldl", "-lm", "-o"])
        .arg(&exe)
        .output()
        .expect("a C compiler (cc)");
    assert!(
        out.status.success(),
        "cc: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    exe
}
