//! The C ABI on the core: links `c/selftest.c` (cross-compiled by build.rs with
//! arm-none-eabi-gcc, freestanding C99, `-Wall -Wextra -pedantic -Werror`) against the
//! `kickguard-capi` library, runs it under QEMU and compares each of its results with the host's
//! (computed by build.rs with the kickguard library). The panic handler (kickguard-capi's
//! `panic-proof`) calls a symbol that does not exist, so linking this binary is also the proof
//! that nothing the C program can reach panics. Build with the `c-abi` feature.
#![no_std]
#![no_main]

use cortex_m_rt::entry;
use cortex_m_semihosting::{debug, hprintln};
// Links the exported `kg_*` functions the C object calls.
use kickguard_capi as _;

include!(concat!(env!("OUT_DIR"), "/expected_c.rs"));

extern "C" {
    fn kg_c_selftest(out: *mut f32, max: i32) -> i32;
}

#[entry]
fn main() -> ! {
    let mut got = [0.0f32; 64];
    // SAFETY: the C function writes at most `max` floats into `out` (it checks `max` first and
    // writes fewer than 32); `got` holds 64 and outlives the call.
    let n = unsafe { kg_c_selftest(got.as_mut_ptr(), got.len() as i32) };
    let mut fails = 0u32;
    if n != EXPECTED_C.len() as i32 {
        hprintln!(
            "FAIL the C program wrote {} results, the host expects {}",
            n,
            EXPECTED_C.len()
        );
        fails += 1;
    }
    for (k, (g, (name, w))) in got.iter().zip(EXPECTED_C.iter()).enumerate() {
        // Both sides are IEEE-754 f32 through the same library code: equal to the last bit,
        // with 2 ulps of slack for instruction selection (as qemu_test).
        let ok = (g - w).abs() <= 2.4e-7 * w.abs();
        // Bit patterns, not decimals: core's float formatting has panic paths of its own.
        hprintln!(
            "{} c[{}] {}: target {:#010x} host {:#010x}",
            if ok { "PASS" } else { "FAIL" },
            k,
            name,
            g.to_bits(),
            w.to_bits()
        );
        if !ok {
            fails += 1;
        }
    }
    hprintln!("{} failure(s)", fails);
    debug::exit(if fails == 0 {
        debug::EXIT_SUCCESS
    } else {
        debug::EXIT_FAILURE
    });
    loop {}
}

// The panic handler is kickguard-capi's, with its `panic-proof` feature: it calls a symbol that
// does not exist, so this binary links only if no panic path is reachable.
