//! The C program `tests/c/smoke.c`, compiled with `cc` against the static library (C99,
//! `-Wall -Wextra -pedantic -Werror`, AddressSanitizer and UndefinedBehaviorSanitizer), calls
//! every exported function with good and hostile inputs (null pointers, zero and oversized
//! lengths, NaN, ±∞, unknown codes). Every good result must equal the Rust library's own, bit
//! for bit; every hostile one must be the expected status code naming the expected input.

use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::coil::Coil;
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diode::DiodeParams;
use kickguard::{Amps, Henries, Ohms, PerKelvin, Seconds, Temperature, Volts};
use std::collections::HashMap;
use std::path::PathBuf;
use std::process::Command;

/// The static library cargo built for this test run: the newest `libkickguard_capi-*.a` beside
/// this test's own binary (target/<profile>/deps).
fn static_lib() -> PathBuf {
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

fn run_c() -> HashMap<String, (i32, f64, String)> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let lib = static_lib();
    let exe = lib.with_file_name("kickguard_c_smoke");
    let cc = Command::new("cc")
        .args(["-std=c99", "-Wall", "-Wextra", "-pedantic", "-Werror", "-g"])
        .args(["-fsanitize=address,undefined", "-fno-sanitize-recover=all"])
        .arg("-I")
        .arg(dir.join("include"))
        .arg(dir.join("tests/c/smoke.c"))
        .arg(&lib)
        // --gc-sections: only what the program reaches is linked (a build with kickguard's `defmt`
        // feature on leaves references to a logger the program does not have in unused code).
        .args(["-Wl,--gc-sections", "-lpthread", "-ldl", "-lm", "-o"])
        .arg(&exe)
        .output()
        .expect("a C compiler (cc)");
    assert!(
        cc.status.success(),
        "cc: {}",
        String::from_utf8_lossy(&cc.stderr)
    );
    let out = Command::new(&exe).output().unwrap();
    assert!(
        out.status.success(),
        "the C program failed: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout)
        .unwrap()
        .lines()
        .map(|l| {
            let mut it = l.splitn(4, ' ');
            let name = it.next().unwrap().to_string();
            let code = it.next().unwrap().parse().unwrap();
            let v = it.next().unwrap().parse().unwrap();
            (name, (code, v, it.next().unwrap().to_string()))
        })
        .collect()
}

#[test]
fn c_program_matches_the_library_and_refuses_hostile_input() {
    let r = run_c();
    let ok = |name: &str, want: f32| {
        let (code, v, _) = &r[name];
        assert_eq!(*code, 0, "{name}");
        // Printed with 9 significant digits: an f32 round-trips exactly.
        assert_eq!(*v as f32, want, "{name}");
    };
    let refused = |name: &str, code: i32, input: &str| {
        let (c, _, i) = &r[name];
        assert_eq!((*c, i.as_str()), (code, input), "{name}");
    };
    let t = |c: f32| Temperature::from_celsius(c).unwrap();
    let p = DiodeParams::SILICON;
    ok("preset", p.is().value());
    // The C side carries the parameters as plain data and rebuilds them (ln IS recomputed).
    let d = DiodeParams::new(p.is(), p.n(), p.rs(), p.eg(), p.xti(), p.tnom()).unwrap();
    ok(
        "drop",
        d.forward_drop(Amps::new(0.4).unwrap(), t(25.0))
            .unwrap()
            .value(),
    );
    ok(
        "thermometer",
        d.junction_temperature(Amps::new(1e-3).unwrap(), Volts::new(0.6).unwrap())
            .unwrap()
            .celsius(),
    );
    let coil = Coil::new(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        t(20.0),
        PerKelvin::new(0.00393).unwrap(),
    )
    .unwrap();
    ok("resistance", coil.resistance(t(85.0)).unwrap().value());
    ok(
        "winding",
        coil.winding_temperature(Ohms::new(64.8).unwrap())
            .unwrap()
            .celsius(),
    );
    ok(
        "current",
        coil.steady_current(Volts::new(24.0).unwrap(), t(25.0))
            .unwrap()
            .value(),
    );
    let cc = ConstantClamp::new(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        Volts::new(42.0).unwrap(),
        Amps::new(0.43).unwrap(),
    )
    .unwrap();
    let dec = cc.decay_to(Amps::new(0.0).unwrap()).unwrap();
    ok("decay_time", dec.time.value());
    ok("decay_energy", dec.clamp_energy.value());
    ok("classify_healthy", 0.0);
    ok("classify_open", 1.0);
    ok("classify_none", 3.0);
    ok("history", 16.0);
    let mut s = [Amps::new(0.0).unwrap(); 8];
    let mut x = 0.43f32;
    for a in s.iter_mut() {
        *a = Amps::new(x).unwrap();
        x *= 0.984127;
    }
    ok(
        "fit",
        fit_decay(&s, Seconds::new(1e-4).unwrap())
            .unwrap()
            .tau
            .value(),
    );
    // Reason codes (kickguard::Reason::code): 1 not finite, 2 not positive; this layer: 100 null
    // pointer, 101 bad length, 102 unknown code.
    refused("drop_nan", 1, "current (A)");
    refused("drop_null_diode", 100, "diode");
    refused("drop_null_out", 100, "out");
    refused("thermometer_inf", 1, "voltage (V)");
    refused("current_bad_l", 2, "inductance (H)");
    refused("decay_neg_inf", 1, "voltage (V)");
    refused("classify_null", 100, "rows");
    refused("classify_zero_len", 101, "n");
    refused("classify_long", 101, "n");
    refused("history_bad_code", 102, "verdict");
    refused("history_null", 100, "h or v");
    refused("fit_nan", 1, "current (A)");
    refused("fit_zero_len", 101, "n");
}
