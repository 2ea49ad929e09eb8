// Representative computations run both on the host (by build.rs, to produce the expected values)
// and on the target (by the qemu_test binary). Included with `include!`, so it must stay free of
// items that clash with either file. Inputs pass through `black_box` so the target really
// computes them at run time.

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams, Ideality};
use kickguard::rating::ThermalPath;
use kickguard::{Amps, Error, Henries, Ohms, PerKelvin, Temperature, Volts, Watts};

fn bb(x: f32) -> f32 {
    core::hint::black_box(x)
}

fn case_drop() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(85.0))?;
    Ok(DiodeParams::SILICON.forward_drop(Amps::new(bb(0.43))?, t)?.value())
}

fn case_thermometer() -> Result<f32, Error> {
    let t = DiodeParams::SILICON.junction_temperature(Amps::new(bb(1e-3))?, Volts::new(bb(0.575))?)?;
    Ok(t.celsius())
}

fn case_series() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    Ok(DiodeParams::SCHOTTKY.series_current(Volts::new(bb(24.0))?, Ohms::new(bb(4700.0))?, t)?.value())
}

fn valve(t: Temperature) -> Result<Coil, Error> {
    let _ = t;
    Coil::copper(Henries::new(bb(0.35))?, Ohms::new(bb(56.0))?, Temperature::from_celsius(bb(20.0))?)
}

fn case_diode_decay_time() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(55.0))?;
    let op = Operating::uniform(Volts::new(bb(24.0))?, Amps::new(bb(0.4))?, t);
    let off = SwitchOff::new(&valve(t)?, &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)), Side::Low, &op)?;
    Ok(off.time_to(Amps::new(bb(0.004))?)?.value())
}

fn case_zener_energy() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(55.0))?;
    let z = Breakdown::new(
        BreakdownLaw::Spice { bv: Volts::new(bb(18.0))?, ibv: Amps::new(bb(1e-3))?, nbv: Ideality::new(bb(2.0))?, rs: Ohms::new(bb(2.0))? },
        PerKelvin::new(bb(8e-4))?,
        Temperature::from_celsius(bb(25.0))?,
    )?;
    let clamp = Clamp::ZenerDiode { zener: z, diode: Diode::Law(DiodeParams::SILICON) };
    let op = Operating::uniform(Volts::new(bb(24.0))?, Amps::new(bb(0.4))?, t);
    let off = SwitchOff::new(&valve(t)?, &clamp, Side::Low, &op)?;
    Ok(off.decay_to(Amps::new(bb(0.004))?)?.energy.zener.value())
}

fn case_profile_time() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(55.0))?;
    let op = Operating::uniform(Volts::new(bb(24.0))?, Amps::new(bb(0.4))?, t);
    let off = SwitchOff::new(&valve(t)?, &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)), Side::Low, &op)?;
    let p = off.profile(&[Amps::new(bb(0.2))?, Amps::new(bb(0.04))?, Amps::new(bb(0.004))?])?;
    Ok(p.times[1].value())
}

fn case_avalanche_closed_form() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    let clamp = Clamp::Avalanche(Breakdown::ideal(Volts::new(bb(66.0))?)?);
    let op = Operating::uniform(Volts::new(bb(24.0))?, Amps::new(bb(0.43))?, t);
    let off = SwitchOff::new(&valve(t)?, &clamp, Side::Low, &op)?;
    Ok(off.decay_to(Amps::new(bb(0.0))?)?.energy.switch.value())
}

fn case_winding_temperature() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(20.0))?;
    Ok(valve(t)?.winding_temperature(Ohms::new(bb(64.8))?)?.celsius())
}

fn case_junction() -> Result<f32, Error> {
    let path = ThermalPath { resistance_k_per_w: bb(250.0), ambient: Temperature::from_celsius(bb(55.0))?, junction_max: Temperature::from_celsius(bb(150.0))? };
    Ok(path.check(Watts::new(bb(0.2))?)?.junction.celsius())
}

fn case_verdict() -> Result<f32, Error> {
    use kickguard::diagnosis::classify::{Entry, Windows, MAX_WINDOWS};
    use kickguard::diagnosis::{Condition, Verdict};
    let mut e = [Entry::EMPTY; MAX_WINDOWS];
    e[0] = Entry { lo: 400, hi: 600, condition: Condition::Healthy };
    e[1] = Entry { lo: 100, hi: 300, condition: Condition::ClampOpen };
    e[2] = Entry { lo: 250, hi: 350, condition: Condition::ShortedTurns };
    let w = Windows::from_entries(e, 3);
    let code = |v: Verdict| match v {
        Verdict::Healthy => 1.0,
        Verdict::Fault(Condition::ClampOpen) => 2.0,
        Verdict::Fault(_) => 3.0,
        Verdict::Ambiguous(_) => 4.0,
        Verdict::Unexplained => 5.0,
    };
    let t = |x: u32| core::hint::black_box(x);
    Ok(code(w.classify(t(500))) + 10.0 * code(w.classify(t(150))) + 100.0 * code(w.classify(t(275))) + 1000.0 * code(w.classify(t(20))))
}

fn case_bad_input_is_an_error() -> Result<f32, Error> {
    // Must be an error on the target too: NaN current.
    match Amps::new(bb(f32::NAN)) {
        Err(e) if e.input == "current (A)" => Ok(1.0),
        _ => Ok(0.0),
    }
}

/// Number of cases.
pub const CASES: usize = 11;

/// (name, result) of every case.
pub fn cases() -> [(&'static str, Result<f32, Error>); CASES] {
    [
        ("diode drop 0.43 A 85 C", case_drop()),
        ("thermometer 575 mV 1 mA", case_thermometer()),
        ("schottky series current 24 V 4k7", case_series()),
        ("diode decay time 0.4 A to 4 mA", case_diode_decay_time()),
        ("zener (SPICE law) clamp energy", case_zener_energy()),
        ("one-pass profile, time to 10 %", case_profile_time()),
        ("avalanche energy closed form", case_avalanche_closed_form()),
        ("winding temperature 64.8 ohm", case_winding_temperature()),
        ("junction temperature 0.2 W", case_junction()),
        ("NaN input rejected", case_bad_input_is_an_error()),
        ("diagnosis verdicts", case_verdict()),
    ]
}
