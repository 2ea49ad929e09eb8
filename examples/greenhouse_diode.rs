//! Demo: the greenhouse irrigation controller's clamp diodes over the enclosure's temperature.
//!
//! Scenario (invented for the demo, see the README): four 24 V solenoid valves of 0.35 H and 56 Ω
//! at 20 °C, each with a diode plus 18 V zener clamp, and a 12 V pump contactor relay of 0.9 H and
//! 160 Ω with a plain freewheeling diode. The clamp diodes are the generic silicon preset. At
//! switch-off a clamp diode carries the coil's on-current, so its drop at that current, from the
//! coldest enclosure (−10 °C) to a hot junction (80 °C), is what the clamp voltage budget sees.
//!
//! Run: `cargo run --example greenhouse_diode`.

use kickguard::diode::DiodeParams;
use kickguard::{Amps, Error, Ohms, Temperature, Volts};

fn main() -> Result<(), Error> {
    let diode = DiodeParams::SILICON;
    // On-currents at 20 °C: V / R (Ohm's law).
    let valve_on = Volts::new(24.0)?.over(Ohms::new(56.0)?)?;
    let relay_on = Volts::new(12.0)?.over(Ohms::new(160.0)?)?;

    println!("kickguard demo: greenhouse controller, clamp diode forward drop");
    println!(
        "diode: generic silicon preset (IS {} N {} RS {})",
        diode.is(),
        diode.n(),
        diode.rs()
    );
    println!();
    println!(
        "drop at the on-current: valve {:.3} (24 V / 56 Ω), relay {:.3} (12 V / 160 Ω)",
        valve_on, relay_on
    );
    println!(
        "{:>8}  {:>14}  {:>14}  {:>16}",
        "T (°C)", "valve clamp", "relay diode", "valve tempco"
    );
    let mut c = -10.0f32;
    while c <= 80.0 {
        let t = Temperature::from_celsius(c)?;
        let v_valve = diode.forward_drop(valve_on, t)?;
        let v_relay = diode.forward_drop(relay_on, t)?;
        let tc = diode.forward_tempco_v_per_k(valve_on, t)?;
        println!(
            "{:>8.0}  {:>11.1} mV  {:>11.1} mV  {:>11.2} mV/K",
            c,
            v_valve.value() * 1e3,
            v_relay.value() * 1e3,
            tc * 1e3
        );
        c += 10.0;
    }

    // The diode as a thermometer: the firmware drives 1 mA through a spare clamp diode and
    // measures 0.575 V; what is the junction temperature?
    let sense = Amps::new(1e-3)?;
    let measured = Volts::new(0.575)?;
    let tj = diode.junction_temperature(sense, measured)?;
    println!();
    println!(
        "thermometer: {:.0} mV measured at {:.1} mA → junction at {:.1} °C",
        measured.value() * 1e3,
        sense.value() * 1e3,
        tj.celsius()
    );
    println!();
    println!("Caution: engineering estimates from simplified models. Verify on the real hardware;");
    println!("local codes and licensed practice prevail.");
    Ok(())
}
