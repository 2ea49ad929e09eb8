//! The C program `tests/c/smoke.c`, compiled with `cc` against the static library (C99,
//! `-Wall -Wextra -pedantic -Werror`, AddressSanitizer and UndefinedBehaviorSanitizer), calls
//! every exported function with good and hostile inputs (null pointers, zero and oversized
//! lengths, NaN, ±∞, unknown codes). Every good result must equal the Rust library's own, bit
//! for bit; every hostile one must be the expected status code naming the expected input.

mod common;
mod reference {
    include!("c/reference.rs");
}

use std::collections::HashMap;
use std::path::PathBuf;
use std::process::Command;

fn run_c() -> HashMap<String, (i32, f64, String)> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let exe = common::build_c(
        &dir.join("tests/c/smoke.c"),
        &[&dir.join("include")],
        "kickguard_c_smoke",
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
    let want = reference::c_reference();
    ok("preset", want.preset_is);
    ok("drop", want.drop);
    ok("thermometer", want.thermometer);
    ok("resistance", want.r85);
    ok("winding", want.winding);
    ok("current", want.current);
    ok("decay_time", want.decay_time);
    ok("decay_energy", want.decay_clamp_j);
    ok("classify_healthy", 0.0);
    ok("classify_open", 1.0);
    ok("classify_none", 3.0);
    ok("history", 16.0);
    ok("fit", want.fit_tau);
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
    // The armature detector by hand: peak 1000, valley 880 at sample 5 (the library's own
    // hand-made case in tests/armature_detect.rs), across two calls.
    ok("dip_pending", 0.0);
    ok("dip_moved", 120.0);
    ok("dip_at", 5.0);
    ok("dip_too_few", 4.0);
    refused("dip_bad_polarity", 102, "polarity");
    refused("dip_null_state", 100, "cfg or state");
    refused("dip_zero_len", 101, "n");
}
