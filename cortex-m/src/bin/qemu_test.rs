//! On-target test: computes `cases.rs` on the emulated Cortex-M and compares each result with the
//! host's value (computed by build.rs). Prints through semihosting; QEMU exits 0 or 1.
#![no_std]
#![no_main]

use cortex_m_rt::entry;
use cortex_m_semihosting::{debug, hprintln};

#[allow(dead_code)]
mod cases {
    include!("../cases.rs");
}
include!(concat!(env!("OUT_DIR"), "/expected.rs"));

/// Tolerance: both sides are IEEE-754 f32 with the same libm code, so results should agree to
/// the last bit; allow 2 ulps of relative slack (2.4e-7) for any difference in instruction
/// selection (for example a fused multiply-add).
const REL_TOL: f32 = 2.4e-7;

#[entry]
fn main() -> ! {
    let mut fails = 0u32;
    for ((name, got), want) in cases::cases().iter().zip(EXPECTED.iter()) {
        let ok = match (got, want) {
            (Ok(g), Some(w)) => {
                let d = if g > w { g - w } else { w - g };
                let m = if *w < 0.0 { -w } else { *w };
                d <= REL_TOL * m
            }
            _ => false,
        };
        hprintln!(
            "{} {}: target {:?} host {:?}",
            if ok { "PASS" } else { "FAIL" },
            name,
            got.ok(),
            want
        );
        if !ok {
            fails += 1;
        }
    }
    #[cfg(feature = "force-fail")]
    {
        hprintln!("FAIL deliberately wrong check (negative control)");
        fails += 1;
    }
    hprintln!("{} failure(s)", fails);
    debug::exit(if fails == 0 {
        debug::EXIT_SUCCESS
    } else {
        debug::EXIT_FAILURE
    });
    loop {}
}

#[panic_handler]
fn panic(info: &core::panic::PanicInfo) -> ! {
    hprintln!("PANIC: {}", info);
    debug::exit(debug::EXIT_FAILURE);
    loop {}
}
