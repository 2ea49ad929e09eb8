//! Demo: the greenhouse irrigation controller's coil drivers, computed with the library's
//! run-time API directly (the configuration step, `kickguard check examples/greenhouse.toml`,
//! does the same over every corner of the tolerances).
//!
//! Scenario (invented for the demo, see the README): four 24 V solenoid valves of 0.35 H and
//! 56 Ω at 20 °C switched low-side by 60 V MOSFETs with a switched freewheel (diode while
//! PWM-holding, 18 V zener + diode at the final turn-off); a 12 V pump contactor relay of 0.9 H
//! and 160 Ω at 20 °C with a plain freewheeling diode, which must release at 10 % of its
//! nominal voltage and takes 8 ms to release mechanically; a 12 V roof-vent latch solenoid of
//! 15 mH and 8 Ω at 20 °C on a high-side switch that clamps 45 V across itself. Enclosure
//! −10…55 °C, coils self-heat by up to 25 K. Generic silicon diodes; the zener values are
//! invented.
//!
//! Run: `cargo run --example greenhouse`.

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff, SwitchedFreewheel};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::input::resistor::{resistor_window, InjectionLimits, UpperLimits};
use kickguard::input::{Pin, SignalRange};
use kickguard::pwm::{hold_duty, Freewheel, HoldOperatingPoint};
use kickguard::timing::{release_current, release_time, to_ticks};
use kickguard::{Amps, Error, Henries, Hertz, Ohms, PerKelvin, Seconds, Temperature, Volts};

fn diode_drops(valve: &Coil, relay: &Coil) -> Result<(), Error> {
    let d = DiodeParams::SILICON;
    println!("== clamp diode forward drop at the coils' on-currents (generic silicon)");
    println!(
        "{:>8}  {:>12}  {:>12}  {:>14}",
        "T (°C)", "valve", "relay", "valve tempco"
    );
    for c in [-10.0f32, 10.0, 30.0, 55.0, 80.0] {
        let t = Temperature::from_celsius(c)?;
        let i_v = valve.steady_current(Volts::new(24.0)?, t)?;
        let i_r = relay.steady_current(Volts::new(12.0)?, t)?;
        println!(
            "{c:>8.0}  {:>9.1} mV  {:>9.1} mV  {:>9.2} mV/K",
            d.forward_drop(i_v, t)?.value() * 1e3,
            d.forward_drop(i_r, t)?.value() * 1e3,
            d.forward_tempco_v_per_k(i_v, t)? * 1e3
        );
    }
    let tj = d.junction_temperature(Amps::new(1e-3)?, Volts::new(0.575)?)?;
    println!(
        "thermometer: 575 mV at 1 mA through a spare clamp diode → junction at {:.1} °C",
        tj.celsius()
    );
    Ok(())
}

fn valve_options(valve: &Coil, z18: Breakdown) -> Result<(), Error> {
    let diode = Diode::Law(DiodeParams::SILICON);
    let avalanche = Breakdown::ideal(Volts::new(66.0)?)?; // a 60 V MOSFET avalanches above its rating
    let options: [(&str, Clamp); 4] = [
        ("diode", Clamp::FreewheelDiode(diode)),
        (
            "56 Ω + diode",
            Clamp::ResistorDiode {
                resistor: Ohms::new(56.0)?,
                diode,
            },
        ),
        (
            "18 V zener + diode",
            Clamp::ZenerDiode { zener: z18, diode },
        ),
        ("MOSFET avalanche", Clamp::Avalanche(avalanche)),
    ];
    let cold = Temperature::from_celsius(-10.0)?;
    let i_on = valve.steady_current(Volts::new(26.4)?, cold)?;
    // The valve releases below 10 % of 24 V across its resistance at 20 °C: 42.9 mA.
    let i_rel = release_current(valve, Volts::new(2.4)?)?;
    println!(
        "\n== valve switch-off, cold coil (−10 °C) at 26.4 V: I₀ = {:.3}, release at {:.3}",
        i_on, i_rel
    );
    println!(
        "{:<20} {:>10} {:>10} {:>10} {:>10} {:>10}",
        "clamp", "release", "to 1 mA", "V_switch", "E_clamp", "E_switch"
    );
    for (name, clamp) in &options {
        let off = SwitchOff::new(
            valve,
            clamp,
            Side::Low,
            &Operating::uniform(Volts::new(26.4)?, i_on, cold),
        )?;
        let p = off.profile(&[i_rel, Amps::new(1e-3)?])?;
        let e = p.decay.energy;
        println!(
            "{:<20} {:>7.2} ms {:>7.2} ms {:>8.1} V {:>7.1} mJ {:>7.1} mJ",
            name,
            p.times[0].value() * 1e3,
            p.times[1].value() * 1e3,
            p.peak_switch_voltage.value(),
            e.clamp_total.value() * 1e3,
            e.switch.value() * 1e3
        );
    }
    Ok(())
}

fn switched_freewheel(valve: &Coil, z18: Breakdown) -> Result<(), Error> {
    let hot = Temperature::from_celsius(80.0)?; // 55 °C enclosure + 25 K self-heating
    let diode = Diode::Law(DiodeParams::SILICON);
    let i_hold = Amps::new(0.15)?;
    let v = Volts::new(24.0)?;
    let sw = SwitchedFreewheel {
        diode,
        zener: z18,
        bypass: Ohms::new(0.5)?,
    };
    let with_zener = Freewheel::new(diode.forward_drop(i_hold, hot)?, z18.voltage(i_hold, hot)?)?;
    println!("\n== valve hold at 150 mA, 20 kHz, 24 V, hot coil: where the freewheel power goes");
    for (name, fw) in [
        ("zener + diode in every PWM cycle", with_zener),
        (
            "switched freewheel (zener bypassed)",
            sw.hold_freewheel(i_hold, hot)?,
        ),
    ] {
        let d = hold_duty(valve, v, hot, &fw, i_hold)?;
        let p = HoldOperatingPoint::new(valve, v, hot, &fw, Hertz::new(20e3)?, d)?;
        let pw = p.freewheel_power()?;
        println!(
            "{name:<38} duty {:.1} %, ripple {:.2} mA p-p, diode {:.0} mW, zener {:.0} mW",
            d.value() * 100.0,
            p.ripple()?.peak_to_peak.value() * 1e3,
            pw.diode.value() * 1e3,
            pw.zener.value() * 1e3
        );
    }
    println!(
        "the bypass keeps the zener cold while holding; it still clamps at the final turn-off"
    );
    Ok(())
}

fn relay_release(relay: &Coil, z18: Breakdown) -> Result<(), Error> {
    let hot = Temperature::from_celsius(80.0)?;
    let cold = Temperature::from_celsius(-10.0)?;
    let diode = Diode::Law(DiodeParams::SILICON);
    println!("\n== pump relay release (below 10 % of 12 V at 20 °C, 8 ms mechanical), cold coil at 13.2 V");
    let i_on = relay.steady_current(Volts::new(13.2)?, cold)?;
    let i_rel = release_current(relay, Volts::new(1.2)?)?;
    for (name, clamp) in [
        ("diode (as built)", Clamp::FreewheelDiode(diode)),
        (
            "diode + 18 V zener",
            Clamp::ZenerDiode { zener: z18, diode },
        ),
    ] {
        let op = Operating {
            supply: Volts::new(13.2)?,
            start_current: i_on,
            winding: cold,
            diodes: hot,
            breakdown: cold,
        };
        let off = SwitchOff::new(relay, &clamp, Side::Low, &op)?;
        let r = release_time(&off, i_rel, Seconds::new(8e-3)?)?;
        // Before re-energising: the contacts have opened and the current has decayed (below
        // 1 % of its on-value), whichever comes later.
        let decayed = off.time_to(Amps::new(0.01 * i_on.value())?)?;
        let tick = Hertz::new(10e3)?;
        let (open, low) = (to_ticks(r.total, tick)?, to_ticks(decayed, tick)?);
        println!(
            "{name:<20} electrical {:>6.2} ms + 8 ms = {:>6.2} ms: contacts open after {open} ticks of 10 kHz, current below 1 % after {low}; re-energise after {}",
            r.electrical.value() * 1e3,
            r.total.value() * 1e3,
            open.max(low)
        );
    }
    Ok(())
}

fn vent_latch() -> Result<(), Error> {
    let t20 = Temperature::from_celsius(20.0)?;
    let latch = Coil::copper(Henries::new(0.015)?, Ohms::new(8.0)?, t20)?;
    let clamp45 = Breakdown::ideal(Volts::new(45.0)?)?;
    let op = Operating::uniform(
        Volts::new(12.0)?,
        latch.steady_current(Volts::new(12.0)?, t20)?,
        t20,
    );
    let off = SwitchOff::new(&latch, &Clamp::Avalanche(clamp45), Side::High, &op)?;
    let d = off.decay_to_end()?;
    println!("\n== roof-vent latch, high-side switch clamping 45 V across itself, 12 V, 20 °C");
    println!(
        "output swings to {:.1} V; the current is gone in {:.3} ms; the switch absorbs {:.1} mJ",
        off.peak_output_voltage().value(),
        d.time.value() * 1e3,
        d.energy.switch.value() * 1e3
    );
    Ok(())
}

fn inputs() -> Result<(), Error> {
    println!(
        "\n== inputs into 3.3 V pins (hot MCU 85 °C, rail at its 3.0 V minimum; ±5 mA per pin)"
    );
    let mcu = Pin::new(
        Volts::new(3.0)?,
        Diode::Law(DiodeParams::SILICON),
        Temperature::from_celsius(85.0)?,
    )?;
    let per_pin = InjectionLimits {
        positive: Amps::new(5e-3)?,
        negative: Amps::new(5e-3)?,
    };
    let rain = SignalRange {
        steady_min: Volts::new(0.0)?,
        steady_max: Volts::new(24.0)?,
        transient_min: Volts::new(-2.0)?,
        transient_max: Volts::new(30.0)?,
        transient_width: Seconds::new(1e-3)?,
    };
    let upper = UpperLimits {
        leakage: Some((Amps::new(1e-6)?, Volts::new(0.05)?)),
        ..UpperLimits::default()
    };
    let w = resistor_window(&mcu, &rain, per_pin, &upper)?;
    println!(
        "rain sensor: series resistor window {:.0} … {:.0} Ω",
        w.min.value(),
        w.max.map_or(f32::INFINITY, |m| m.value())
    );
    let r = Ohms::new(22_000.0)?;
    println!(
        "with 22 kΩ: {:.2} mA into the rail at the 30 V transient",
        mcu.injection(Volts::new(30.0)?, r)?.value() * 1e3
    );
    Ok(())
}

fn main() -> Result<(), Error> {
    let t20 = Temperature::from_celsius(20.0)?;
    let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t20)?;
    let relay = Coil::copper(Henries::new(0.9)?, Ohms::new(160.0)?, t20)?;
    let z18 = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: Volts::new(18.0)?,
            izt: Amps::new(0.01)?,
            rz: Ohms::new(2.0)?,
        },
        PerKelvin::new(0.0008)?,
        Temperature::from_celsius(25.0)?,
    )?;
    println!("kickguard demo: greenhouse irrigation controller\n");
    diode_drops(&valve, &relay)?;
    valve_options(&valve, z18)?;
    switched_freewheel(&valve, z18)?;
    relay_release(&relay, z18)?;
    vent_latch()?;
    inputs()?;
    println!(
        "\nCaution: engineering estimates from simplified models. Verify on the real hardware;"
    );
    println!("local codes and licensed practice prevail.");
    Ok(())
}
