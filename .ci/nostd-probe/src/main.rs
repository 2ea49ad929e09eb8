//! no_std probe: builds only if nothing in the dependency graph links `std`.
#![no_std]
#![no_main]

#[cfg(feature = "leak-std")]
extern crate std;

use kickguard::clamp::{Clamp, Operating, Sample, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::{Amps, Error, Henries, Ohms, Seconds, Temperature, Volts};

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    loop {}
}

fn run() -> Result<f32, Error> {
    let t = Temperature::from_celsius(25.0)?;
    let drop = DiodeParams::SILICON.forward_drop(Amps::new(0.01)?, t)?;
    let coil = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t)?;
    let off = SwitchOff::new(
        &coil,
        &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        Side::Low,
        &Operating::uniform(Volts::new(24.0)?, Amps::new(0.4)?, t),
    )?;
    let mut buf = [Sample::default(); 8];
    let n = off.sample(Seconds::new(1e-3)?, Amps::new(1e-3)?, &mut buf)?;
    Ok(drop.value() + off.time_to(Amps::new(0.04)?)?.value() + n as f32)
}

/// Entry point symbol; never run, the probe is only type-checked and analysed.
#[no_mangle]
pub extern "C" fn probe_entry() -> f32 {
    run().unwrap_or(0.0)
}
