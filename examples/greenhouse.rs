//! Demo: the greenhouse irrigation controller's coil drivers and their suppression.
//!
//! Scenario (invented for the demo, see the README): four 24 V solenoid valves of 0.35 H and 56 Ω
//! at 20 °C switched low-side by 60 V MOSFETs, each with a diode plus 18 V zener clamp; a 12 V pump
//! contactor relay of 0.9 H and 160 Ω at 20 °C with a plain freewheeling diode, which must release
//! at 10 % of its nominal voltage and takes 8 ms to release mechanically. Enclosure −10…55 °C,
//! coils self-heat by up to 25 K. Generic silicon diodes; the zener and TVS values are invented.
//!
//! Run: `cargo run --example greenhouse`.

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::sizing::ZenerSizing;
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{Clamp, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diagnosis::{Design, Measurement};
use kickguard::diode::DiodeParams;
use kickguard::input::board::{Board, BoardInput};
use kickguard::input::rail::{rail_off_check, shared_clamp};
use kickguard::input::resistor::{resistor_window, InjectionLimits, UpperLimits};
use kickguard::input::{Pin, PinClamp, SignalRange};
use kickguard::pwm::{
    hold_current_drift, hold_duty, time_to_current, Freewheel, HoldOperatingPoint,
};
use kickguard::timing::{release_current, release_time, to_ticks};
use kickguard::{Amps, Error, Farads, Henries, Ohms, Seconds, Temperature, Volts};

fn main() -> Result<(), Error> {
    let diode = DiodeParams::SILICON;
    let t20 = Temperature::from_celsius(20.0)?;
    let cold = Temperature::from_celsius(-10.0)?;
    let hot = Temperature::from_celsius(80.0)?; // 55 °C enclosure + 25 K self-heating
    let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t20)?;
    let relay = Coil::copper(Henries::new(0.9)?, Ohms::new(160.0)?, t20)?;
    let v_valve = Volts::new(24.0)?;
    let v_relay = Volts::new(12.0)?;

    println!("kickguard demo: greenhouse irrigation controller");
    println!();
    println!("== clamp diode forward drop at the coils' on-currents (generic silicon)");
    println!(
        "{:>8}  {:>12}  {:>12}  {:>14}",
        "T (°C)", "valve", "relay", "valve tempco"
    );
    for c in [-10.0f32, 10.0, 30.0, 55.0, 80.0] {
        let t = Temperature::from_celsius(c)?;
        let i_v = valve.steady_current(v_valve, t)?;
        let i_r = relay.steady_current(v_relay, t)?;
        println!(
            "{:>8.0}  {:>9.1} mV  {:>9.1} mV  {:>9.2} mV/K",
            c,
            diode.forward_drop(i_v, t)?.value() * 1e3,
            diode.forward_drop(i_r, t)?.value() * 1e3,
            diode.forward_tempco_v_per_k(i_v, t)? * 1e3
        );
    }
    let tj = diode.junction_temperature(Amps::new(1e-3)?, Volts::new(0.575)?)?;
    println!(
        "thermometer: 575 mV at 1 mA through a spare clamp diode → junction at {:.1} °C",
        tj.celsius()
    );

    // Valve switch-off with each clamp option, cold and hot.
    let z18 = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: Volts::new(18.0)?,
            izt: Amps::new(0.01)?,
            rz: Ohms::new(10.0)?,
        },
        0.0008,
        Temperature::from_celsius(25.0)?,
    )?;
    let tvs40 = Breakdown::new(
        BreakdownLaw::Spice {
            bv: Volts::new(40.0)?,
            ibv: Amps::new(1e-3)?,
            nbv: 3.0,
            rs: Ohms::new(1.0)?,
        },
        0.001,
        Temperature::from_celsius(25.0)?,
    )?;
    let avalanche = Breakdown::ideal(Volts::new(66.0)?)?; // a 60 V MOSFET avalanches above its rating
    let options: [(&str, Clamp); 5] = [
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
        ("40 V TVS to ground", Clamp::SwitchZener(tvs40)),
        ("MOSFET avalanche", Clamp::Avalanche(avalanche)),
    ];
    for (label, t) in [("cold coil, −10 °C", cold), ("hot coil, 80 °C", hot)] {
        let i_on = valve.steady_current(v_valve, t)?;
        // Assumed release at 10 % of the on-current (the valve's must-release level).
        let i_rel = Amps::new(0.1 * i_on.value())?;
        println!();
        println!(
            "== valve switch-off, {label}: I₀ = {:.3}, release at {:.3}",
            i_on, i_rel
        );
        println!(
            "{:<20} {:>10} {:>10} {:>10} {:>10} {:>10}",
            "clamp", "release", "to 1 mA", "V_switch", "E_clamp", "E_switch"
        );
        for (name, clamp) in &options {
            let off = SwitchOff::new(&valve, clamp, v_valve, i_on, t, t)?;
            let to_release = off.time_to(i_rel)?;
            let d = off.decay_to(Amps::new(1e-3)?)?;
            let e = d.energy;
            let e_clamp = e.diodes.value() + e.zener.value() + e.resistor.value();
            println!(
                "{:<20} {:>7.2} ms {:>7.2} ms {:>8.1} V {:>7.1} mJ {:>7.1} mJ",
                name,
                to_release.value() * 1e3,
                d.time.value() * 1e3,
                off.peak_switch_voltage().value(),
                e_clamp * 1e3,
                e.switch.value() * 1e3
            );
        }
        let snub = SnubberSwitchOff::new(
            &valve,
            &RcSnubber {
                resistor: Ohms::new(56.0)?,
                capacitor: Farads::new(10e-6)?,
            },
            v_valve,
            i_on,
            t,
        )?;
        let r = snub.response()?;
        println!(
            "{:<20} {:>7.2} ms {:>7.2} ms {:>8.1} V {:>7.1} mJ {:>7.1} mJ   (ζ = {:.2}; times are envelope bounds)",
            "RC 56 Ω + 10 µF",
            snub.settle_time(i_rel)?.value() * 1e3,
            snub.settle_time(Amps::new(1e-3)?)?.value() * 1e3,
            r.peak_switch_voltage.value(),
            r.energy_in_resistor.value() * 1e3,
            0.0,
            r.damping_ratio,
        );
    }

    // Relay release time with the plain diode against a zener clamp, and the firmware's wait.
    println!();
    println!("== pump relay release (releases below 10 % of 12 V, 8 ms mechanical), hot coil");
    let i_on = relay.steady_current(v_relay, hot)?;
    let i_rel = release_current(&relay, Volts::new(1.2)?, hot)?;
    for (name, clamp) in [
        ("diode (as built)", Clamp::FreewheelDiode(diode)),
        (
            "diode + 18 V zener",
            Clamp::ZenerDiode { zener: z18, diode },
        ),
    ] {
        let off = SwitchOff::new(&relay, &clamp, v_relay, i_on, hot, hot)?;
        let r = release_time(&off, i_rel, Seconds::new(8e-3)?)?;
        println!(
            "{:<20} electrical {:>6.2} ms + 8 ms = {:>6.2} ms → wait {} ticks of 1 ms before re-energising",
            name,
            r.electrical.value() * 1e3,
            r.total.value() * 1e3,
            to_ticks(r.total, 1000.0)?
        );
    }

    // Valve peak-and-hold at 20 kHz: pull-in, then hold at 35 % of the cold on-current.
    println!();
    println!("== valve peak-and-hold, 20 kHz, 24 V");
    let pull_in = time_to_current(&valve, v_valve, Amps::new(0.3)?, hot)?;
    println!(
        "time to reach 0.3 A pull-in, hot coil: {:.2} ms",
        pull_in.value() * 1e3
    );
    let i_hold = Amps::new(0.15)?;
    for (name, zener_v) in [
        ("diode freewheel", 0.0f32),
        ("diode + 18 V zener (as built)", 18.0),
    ] {
        let fw = Freewheel {
            diode_drop: diode.forward_drop(i_hold, hot)?,
            zener: Volts::new(zener_v)?,
        };
        let d = hold_duty(&valve, v_valve, i_hold, hot, fw)?;
        let p = HoldOperatingPoint::new(&valve, v_valve, hot, fw, 20_000.0, d)?;
        let rp = p.ripple()?;
        let pw = p.freewheel_power()?;
        println!(
            "{:<30} duty {:.3} (compare {} of 1600), ripple {:.1} mA p-p, freewheel power: diode {:.0} mW, zener {:.0} mW",
            name,
            d,
            p.compare_value(1600)?,
            rp.peak_to_peak.value() * 1e3,
            pw.diode.value() * 1e3,
            pw.zener.value() * 1e3
        );
        if pw.zener.value() > 0.0 {
            println!("{:<30} note: the zener conducts every PWM cycle; it dissipates continuously while holding", "");
        }
    }
    let fw_cold = Freewheel {
        diode_drop: diode.forward_drop(i_hold, cold)?,
        zener: Volts::new(0.0)?,
    };
    let fw_hot = Freewheel {
        diode_drop: diode.forward_drop(i_hold, hot)?,
        zener: Volts::new(0.0)?,
    };
    let d_cold = hold_duty(&valve, v_valve, i_hold, cold, fw_cold)?;
    let (c_cold, c_hot) = hold_current_drift(&valve, v_valve, d_cold, fw_cold, fw_hot, cold, hot)?;
    println!(
        "duty set for 150 mA cold holds {:.0} mA at −10 °C and {:.0} mA at 80 °C (copper heating)",
        c_cold.value() * 1e3,
        c_hot.value() * 1e3
    );

    // Which zener voltages suit the valves: switch below 80 % of 60 V, release within 6 ms.
    let sizing = ZenerSizing {
        coil: valve,
        diode,
        zener_rz: Ohms::new(10.0)?,
        zener_izt: Amps::new(0.01)?,
        v_supply: Volts::new(26.4)?, // 24 V + 10 %
        i_start: valve.steady_current(Volts::new(26.4)?, cold)?,
        t_coil: cold,
        t_clamp: cold,
        switch_rating: Volts::new(60.0)?,
        rating_fraction: 0.8,
        release_current: Amps::new(0.05)?,
        max_release_time: Seconds::new(6e-3)?,
    };
    let w = sizing.window()?;
    println!();
    println!(
        "== valve zener window (switch ≤ 48 V at 26.4 V supply, cold coil, release to 50 mA within 6 ms): Vz {:.1} … {:.1}",
        w.min, w.max
    );
    // Inputs: the 24 V rain sensor and four drain-sense lines into 3.3 V pins.
    println!();
    println!("== inputs into 3.3 V pins (hot MCU 85 °C, rail at its 3.0 V minimum; ±5 mA per pin, ±20 mA total, rail load ≥ 8 mA)");
    let mcu = Pin::new(
        Volts::new(3.0)?,
        PinClamp::DiodeLaw(diode),
        Temperature::from_celsius(85.0)?,
    )?;
    let ma = |x: f32| Amps::new(x * 1e-3);
    let per_pin = InjectionLimits {
        positive: ma(5.0)?,
        negative: ma(5.0)?,
    };
    let rain = SignalRange::new(
        Volts::new(0.0)?,
        Volts::new(24.0)?,
        Volts::new(-2.0)?,
        Volts::new(30.0)?,
        Seconds::new(1e-3)?,
    )?;
    // Drain sense: safe even with the freewheeling diode failed open (the MOSFET avalanches at 66 V).
    let drain = SignalRange::drain_sense_open_diode(
        Volts::new(26.4)?,
        Volts::new(66.0)?,
        Seconds::new(3e-3)?,
    )?;
    let upper = UpperLimits {
        leakage: Some((Amps::new(1e-6)?, Volts::new(0.05)?)),
        ..UpperLimits::default()
    };
    for (name, sig) in [("rain sensor", rain), ("drain sense", drain)] {
        let w = resistor_window(&mcu, &sig, per_pin, &upper)?;
        println!(
            "{:<12} series resistor window {:.0} … {:.0} Ω (max set by {:?})",
            name,
            w.min,
            w.max.map(|m| m.value()).unwrap_or(f32::INFINITY),
            w.max_set_by
        );
    }
    let mut board: Board<5> = Board::new(
        mcu,
        InjectionLimits {
            positive: ma(20.0)?,
            negative: ma(20.0)?,
        },
        Some(ma(8.0)?),
    );
    let r_rain = Ohms::new(22_000.0)?;
    let r_drain = Ohms::new(47_000.0)?;
    let _ = board.add(BoardInput {
        name: "rain",
        signal: rain,
        resistor: r_rain,
        limits: per_pin,
    });
    for name in ["drain 1", "drain 2", "drain 3", "drain 4"] {
        let _ = board.add(BoardInput {
            name,
            signal: drain,
            resistor: r_drain,
            limits: per_pin,
        });
    }
    let report = board.check()?;
    for r in &report.inputs {
        println!(
            "{:<8} worst injection {:+.2} mA / {:+.2} mA (margin {:.0} %)",
            r.name,
            r.transient_positive.value() * 1e3,
            r.transient_negative.value() * 1e3,
            r.positive.margin.min(r.negative.margin) * 100.0
        );
    }
    println!(
        "board: total {:.2} mA into the rail at the worst transient; steady injection against the 8 mA minimum load: {}; verdict {}",
        report.total_positive.value() * 1e3,
        match report.rail_on { Some(v) if v.pass => "ok", Some(_) => "RAIL RISES", None => "not checked" },
        if report.pass { "PASS" } else { "FAIL" }
    );
    let off = rail_off_check(
        &mcu,
        Volts::new(24.0)?,
        r_rain,
        Ohms::new(1000.0)?,
        Volts::new(0.5)?,
    )?;
    println!(
        "rail off, rain sensor at 24 V: {:.2} V pushed onto the unpowered 3.3 V rail (allowed 0.5 V): {}",
        off.rail_voltage.value(),
        if off.verdict.pass { "ok" } else { "FLAG" }
    );
    let sh = shared_clamp(
        mcu.vdd,
        &diode,
        &DiodeParams::SCHOTTKY,
        mcu.temperature,
        Volts::new(66.0)?,
        r_drain,
    )?;
    println!(
        "with a Schottky to the rail on a drain line at 66 V: internal diode {:.3} mA, Schottky {:.3} mA",
        sh.internal.value() * 1e3,
        sh.external.value() * 1e3
    );

    // Diagnosis of a valve driver: comparator on the drain at 30 V (above the 26.4 V supply).
    println!();
    println!("== valve diagnosis: time the drain stays above a threshold after switch-off, 10 kHz ticks, 5 % guard");
    let design = Design {
        coil: valve,
        inductance_tolerance: 0.1,
        resistance_tolerance: 0.07,
        v_supply_min: Volts::new(21.6)?,
        v_supply_max: Volts::new(26.4)?,
        t_winding_min: cold,
        t_winding_max: hot,
        t_winding_fault_max: Temperature::from_celsius(130.0)?,
        t_clamp_min: cold,
        t_clamp_max: hot,
        clamp: Clamp::ZenerDiode { zener: z18, diode },
        switch_avalanche: avalanche,
        shorted_turns: 0.2,
    };
    // Two comparators on the drain divider: one at 30 V times the flyback, one at 55 V (above the
    // healthy clamp's 47 V peak) catches the avalanche of an open clamp.
    for threshold in [30.0f32, 55.0] {
        let m = Measurement::SwitchAbove {
            threshold: Volts::new(threshold)?,
        };
        let (healthy, seps) = design.separations(&m)?;
        println!("-- drain above {threshold} V");
        println!(
            "healthy            {:>6.2} … {:>6.2} ms",
            healthy.min.value() * 1e3,
            healthy.max.value() * 1e3
        );
        for s in &seps {
            println!(
                "{:<18} {:>6.2} … {:>6.2} ms   {}",
                format!("{:?}", s.condition),
                s.window.min.value() * 1e3,
                s.window.max.value() * 1e3,
                if s.detectable {
                    format!("detectable, gap {:.2} ms", s.gap * 1e3)
                } else {
                    format!(
                        "NOT detectable by this measurement (overlap {:.2} ms)",
                        (-s.gap).max(0.0) * 1e3
                    )
                }
            );
        }
        let w = design.tick_windows(&m, 10_000.0, 0.05)?;
        let table: Vec<String> = w
            .entries()
            .map(|e| format!("{:?} {}…{}", e.condition, e.lo, e.hi))
            .collect();
        println!("run-time windows (ticks): {}", table.join(", "));
    }
    let i_meas = Amps::new(0.36)?;
    let tw =
        kickguard::diagnosis::windows::winding_temperature_from_current(&valve, v_valve, i_meas)?;
    println!(
        "on-current 0.36 A at 24 V → winding at {:.0} °C (allowed up to 80 °C)",
        tw.celsius()
    );

    println!();
    println!("Caution: engineering estimates from simplified models. Verify on the real hardware;");
    println!("local codes and licensed practice prevail.");
    Ok(())
}
