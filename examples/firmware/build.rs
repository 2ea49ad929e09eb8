//! Runs the kickguard configuration step on the design file; stops the build if it is unsafe.
use std::path::PathBuf;

fn main() {
    let design = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../greenhouse.toml");
    println!("cargo:rerun-if-changed={}", design.display());
    let out = std::env::var("OUT_DIR").expect("cargo sets OUT_DIR");
    if let Err(reason) = kickguard::host::configure(&design, &out) {
        eprintln!("{reason}");
        std::process::exit(1);
    }
}
