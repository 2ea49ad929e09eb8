//! no_std probe: builds only if nothing in the dependency graph links `std`.
#![no_std]
#![no_main]

#[cfg(feature = "leak-std")]
extern crate std;

use kickguard::diode::DiodeParams;
use kickguard::{Amps, Temperature};

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    loop {}
}

/// Entry point symbol; never run, the probe is only type-checked and analysed.
#[no_mangle]
pub extern "C" fn probe_entry() -> f32 {
    let t = Temperature::from_celsius(25.0);
    let i = Amps::new(0.01);
    match (t, i) {
        (Ok(t), Ok(i)) => DiodeParams::SILICON.forward_drop(i, t).map(|v| v.value()).unwrap_or(0.0),
        _ => 0.0,
    }
}
