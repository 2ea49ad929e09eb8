// Shared by the HAL examples' build scripts (`include!`d): runs the kickguard configuration step
// on the demo design (the build stops with the reason if the design is unsafe), and writes the
// board's memory map for cortex-m-rt's link.x.
use std::path::PathBuf;

/// Configures the demo valves into OUT_DIR and writes `memory_x` there as `memory.x`.
fn configure_and_link(memory_x: &str) {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let design = dir.join("../greenhouse.toml");
    println!("cargo:rerun-if-changed={}", design.display());
    println!("cargo:rerun-if-changed=build.rs");
    println!("cargo:rerun-if-changed=../hal-common");
    let out = PathBuf::from(std::env::var("OUT_DIR").expect("cargo sets OUT_DIR"));
    if let Err(reason) = kickguard::host::configure(&design, &out) {
        eprintln!("{reason}");
        std::process::exit(1);
    }
    std::fs::write(out.join("memory.x"), memory_x).expect("write memory.x");
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rustc-link-arg=-Tlink.x");
}
