//! Picks a memory.x for the QEMU board that matches the target, and computes the expected values
//! of `src/cases.rs` on the host (the same kickguard code, compiled for the build machine), so the
//! target's results are compared with the host's.
use std::{env, fmt::Write as _, fs, path::PathBuf};

#[allow(dead_code)]
mod cases {
    include!("src/cases.rs");
}

fn main() {
    let target = env::var("TARGET").unwrap_or_default();
    let out = PathBuf::from(env::var("OUT_DIR").expect("OUT_DIR"));
    let memx = if target.starts_with("thumbv6m") {
        // qemu -M microbit (nRF51, Cortex-M0): 256K flash, 16K RAM
        "MEMORY { FLASH : ORIGIN = 0x00000000, LENGTH = 256K\n RAM : ORIGIN = 0x20000000, LENGTH = 16K }\n"
    } else {
        // qemu -M mps2-an386 (Cortex-M4F): SSRAM1 at 0x0, SSRAM2/3 at 0x20000000
        "MEMORY { FLASH : ORIGIN = 0x00000000, LENGTH = 512K\n RAM : ORIGIN = 0x20000000, LENGTH = 128K }\n"
    };
    fs::write(out.join("memory.x"), memx).expect("write memory.x");
    let mut src = String::from(
        "/// Expected values computed on the host by build.rs (None: the host got an error).\n",
    );
    writeln!(
        src,
        "pub const EXPECTED: [Option<f32>; {}] = [",
        cases::CASES
    )
    .unwrap();
    for (name, r) in cases::cases() {
        match r {
            Ok(v) => writeln!(
                src,
                "    Some(f32::from_bits({:#010x})), // {name} = {v}",
                v.to_bits()
            )
            .unwrap(),
            Err(e) => writeln!(src, "    None, // {name}: {e:?}").unwrap(),
        }
    }
    src.push_str("];\n");
    fs::write(out.join("expected.rs"), src).expect("write expected.rs");
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rustc-link-arg-bins=-Tlink.x");
    println!("cargo:rerun-if-changed=build.rs");
    println!("cargo:rerun-if-changed=src/cases.rs");
    println!("cargo:rerun-if-changed=../src");
}
