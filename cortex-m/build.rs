//! Picks a memory.x for the QEMU board that matches the target, and computes the expected values
//! of `src/cases.rs` on the host (the same kickguard code, compiled for the build machine), so the
//! target's results are compared with the host's.
use std::{env, fmt::Write as _, fs, path::PathBuf};

#[allow(dead_code)]
mod c_reference {
    include!("../capi/tests/c/reference.rs");
}

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
    expected_c(&out);
    if env::var_os("CARGO_FEATURE_C_ABI").is_some() {
        compile_c(&target, &out);
    }
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rustc-link-arg-bins=-Tlink.x");
    println!("cargo:rerun-if-changed=build.rs");
    println!("cargo:rerun-if-changed=src/cases.rs");
    println!("cargo:rerun-if-changed=../capi/tests/c/reference.rs");
    println!("cargo:rerun-if-changed=../src");
}

/// The host's results for c/selftest.c, entry for entry (values of good calls, status codes of
/// hostile ones): the values from the kickguard library itself, through the reference the host
/// C test shares (capi/tests/c/reference.rs).
fn expected_c(out: &std::path::Path) {
    let r = c_reference::c_reference();
    // Status codes: 0 ok, kickguard::Reason::code (1 not finite), 100 null pointer, 101 bad length.
    let rows: [(&str, f32); 31] = [
        ("preset status", 0.0),
        ("preset IS", r.preset_is),
        ("drop status", 0.0),
        ("drop at 0.4 A, 25 °C", r.drop),
        ("drop of NaN: not finite", 1.0),
        ("drop with a null diode", 100.0),
        ("thermometer status", 0.0),
        ("thermometer 1 mA at 0.6 V", r.thermometer),
        ("thermometer at +inf V: not finite", 1.0),
        ("R(85 °C) status", 0.0),
        ("R(85 °C)", r.r85),
        ("winding T status", 0.0),
        ("winding T at 64.8 Ω", r.winding),
        ("steady current status", 0.0),
        ("steady current 24 V, 25 °C", r.current),
        ("decay status", 0.0),
        ("decay time to zero", r.decay_time),
        ("decay clamp energy", r.decay_clamp_j),
        ("decay at -inf V: not finite", 1.0),
        ("classify status", 0.0),
        ("classify 12 ticks: fault 1", 11.0),
        ("classify zero rows: bad length", 101.0),
        ("history status", 0.0),
        ("history consecutive", 16.0),
        ("fit status", 0.0),
        ("fit tau", r.fit_tau),
        ("fit of a null buffer", 100.0),
        ("armature dip status", 0.0),
        ("armature dip: moved", 1.0),
        ("armature dip depth, counts (1000 - 880 by hand)", 120.0),
        ("armature dip with a null state", 100.0),
    ];
    let mut src = format!("/// c/selftest.c's results as the host computes them.\npub const EXPECTED_C: [(&str, f32); {}] = [\n", rows.len());
    for (name, v) in rows {
        writeln!(
            src,
            "    ({name:?}, f32::from_bits({:#010x})),",
            v.to_bits()
        )
        .unwrap();
    }
    src.push_str("];\n");
    fs::write(out.join("expected_c.rs"), src).expect("write expected_c.rs");
}

/// Cross-compiles c/selftest.c for the target's core into a static library the bins link.
fn compile_c(target: &str, out: &std::path::Path) {
    use std::process::Command;
    let cpu: &[&str] = if target.starts_with("thumbv6m") {
        &["-mcpu=cortex-m0", "-mfloat-abi=soft"]
    } else {
        &["-mcpu=cortex-m4", "-mfloat-abi=hard", "-mfpu=fpv4-sp-d16"]
    };
    let obj = out.join("selftest.o");
    let st = Command::new("arm-none-eabi-gcc")
        .args([
            "-std=c99",
            "-Wall",
            "-Wextra",
            "-pedantic",
            "-Werror",
            "-O1",
            "-mthumb",
        ])
        .args([
            "-ffreestanding",
            "-fno-builtin",
            "-fno-tree-loop-distribute-patterns",
        ])
        .args(cpu)
        .args(["-I", "../capi/include", "-c", "c/selftest.c", "-o"])
        .arg(&obj)
        .status()
        .expect("arm-none-eabi-gcc (Debian package gcc-arm-none-eabi)");
    assert!(st.success(), "arm-none-eabi-gcc failed on c/selftest.c");
    let st = Command::new("arm-none-eabi-ar")
        .arg("rcs")
        .arg(out.join("libselftest.a"))
        .arg(&obj)
        .status()
        .expect("arm-none-eabi-ar");
    assert!(st.success());
    println!("cargo:rustc-link-lib=static=selftest");
    println!("cargo:rerun-if-changed=c/selftest.c");
    println!("cargo:rerun-if-changed=../capi/include/kickguard.h");
}
