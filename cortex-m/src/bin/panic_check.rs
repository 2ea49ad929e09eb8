//! Link-time proof that no public kickguard function can panic.
//!
//! Every public function is called with inputs hidden from the optimiser (`black_box`), so every
//! branch stays live. The panic handler calls a symbol that does not exist: if any panic path is
//! reachable, the release (LTO) link fails with "undefined symbol:
//! __PANIC_PATH_IS_REACHABLE__see_linker_error". Keep the call list complete as the API grows.
#![no_std]
#![no_main]

use core::hint::black_box as bb;
use cortex_m_rt::entry;
use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::clamp::sizing::ZenerSizing;
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{Clamp, Sample, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{fit_three_points, fit_two_points, DiodeParams, DropPoint};
use kickguard::rating::{average_power, single_pulse, ThermalPath, Verdict};
use kickguard::{
    Amps, Coulombs, Error, Farads, Henries, Joules, Ohms, Seconds, TempDelta, Temperature, Volts,
    Watts,
};

fn units() -> Result<(), Error> {
    let v = Volts::new(bb(1.0))?;
    let i = Amps::new(bb(2.0))?;
    let r = Ohms::new(bb(3.0))?;
    let l = Henries::new(bb(4.0))?;
    let c = Farads::new(bb(5e-6))?;
    let s = Seconds::new(bb(6.0))?;
    let e = Joules::new(bb(7.0))?;
    let p = Watts::new(bb(8.0))?;
    let q = Coulombs::new(bb(9.0))?;
    let t = Temperature::from_kelvin(bb(300.0))?;
    let t2 = Temperature::from_celsius(bb(30.0))?;
    let d = TempDelta::from_kelvin(bb(5.0))?;
    bb((
        r * i,
        v * i,
        p * s,
        i * s,
        q * v,
        r * c,
        v + v,
        i - i,
        e + e,
        p - p,
        q + q,
    ));
    bb((
        l.time_constant(r)?,
        l.stored_energy(i),
        v.over(r)?,
        t.offset(d)?,
        t2 - t,
        t.kelvin(),
        t2.celsius(),
    ));
    bb(kickguard::physics::thermal_voltage(t));
    Ok(())
}

fn diode() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    let d = DiodeParams::new(
        Amps::new(bb(1e-14))?,
        bb(1.0),
        Ohms::new(bb(0.1))?,
        bb(1.11),
        bb(3.0),
        t,
    )?;
    let d = bb(d.with_rs(Ohms::new(bb(0.2))?));
    let i = Amps::new(bb(0.01))?;
    bb(d.forward_drop(i, t)?);
    bb(d.saturation_current(t)?);
    bb(d.forward_tempco_v_per_k(i, t)?);
    bb(d.reverse_leakage(Volts::new(bb(10.0))?, t)?);
    bb(d.series_current(Volts::new(bb(5.0))?, Ohms::new(bb(1e3))?, t)?);
    bb(d.forward_current(Volts::new(bb(0.6))?, t)?);
    bb(d.junction_temperature(i, Volts::new(bb(0.6))?)?);
    bb((d.is(), d.n(), d.rs(), d.eg_ev(), d.xti(), d.tnom()));
    let p = |a: f32, v: f32| DropPoint::new(bb(a), bb(v));
    bb(fit_two_points(
        [p(1e-3, 0.6)?, p(0.1, 0.8)?],
        t,
        Ohms::new(bb(0.0))?,
        bb(1.11),
        bb(3.0),
    )?);
    bb(fit_three_points(
        [p(1e-3, 0.6)?, p(0.1, 0.8)?, p(1.0, 1.0)?],
        t,
        bb(1.11),
        bb(3.0),
    )?);
    bb(d.with_eg_from_point(p(1e-3, 0.55)?, Temperature::from_celsius(bb(60.0))?)?);
    bb(d.with_eg_from_tempco(i, bb(-2e-3))?);
    Ok(())
}

fn coil_and_clamps() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    let coil = Coil::copper(Henries::new(bb(0.35))?, Ohms::new(bb(56.0))?, t)?;
    let coil2 = Coil::new(Henries::new(bb(0.9))?, Ohms::new(bb(160.0))?, t, bb(0.0))?;
    bb((
        coil.inductance(),
        coil.resistance_ref(),
        coil.reference_temperature(),
        coil.alpha_per_k(),
    ));
    bb(coil.resistance(t)?);
    bb(coil.winding_temperature(Ohms::new(bb(60.0))?)?);
    bb(coil.steady_current(Volts::new(bb(24.0))?, t)?);
    bb(coil.stored_energy(Amps::new(bb(0.4))?));
    bb(coil2.pull_in_margin(Volts::new(bb(9.0))?, Volts::new(bb(11.0))?, t)?);
    let law = if bb(true) {
        BreakdownLaw::Spice {
            bv: Volts::new(bb(40.0))?,
            ibv: Amps::new(bb(1e-3))?,
            nbv: bb(2.0),
            rs: Ohms::new(bb(1.0))?,
        }
    } else {
        BreakdownLaw::Datasheet {
            vz: Volts::new(bb(18.0))?,
            izt: Amps::new(bb(0.01))?,
            rz: Ohms::new(bb(10.0))?,
        }
    };
    let z = Breakdown::new(law, bb(1e-3), t)?;
    bb((z.law(), z.tc_per_k(), z.voltage(Amps::new(bb(0.1))?, t)?));
    let ideal = Breakdown::ideal(Volts::new(bb(60.0))?)?;
    let d = DiodeParams::SCHOTTKY;
    let clamps = [
        Clamp::FreewheelDiode(d),
        Clamp::ResistorDiode {
            resistor: Ohms::new(bb(56.0))?,
            diode: d,
        },
        Clamp::ZenerDiode { zener: z, diode: d },
        Clamp::SwitchZener(z),
        Clamp::Avalanche(ideal),
        Clamp::HBridgeFastDecay(d),
    ];
    let mut buf = [Sample::default(); 4];
    for c in bb(clamps).iter() {
        let off = SwitchOff::new(&coil, c, Volts::new(bb(24.0))?, Amps::new(bb(0.4))?, t, t)?;
        bb((
            off.start_current(),
            off.is_closed_form(),
            off.peak_switch_voltage(),
            off.clamp_voltage_at_start(),
        ));
        bb(off.time_to(Amps::new(bb(0.01))?)?);
        bb(off.decay_to(Amps::new(bb(0.01))?)?);
        bb(off.sample(Seconds::new(bb(1e-3))?, Amps::new(bb(0.01))?, &mut buf)?);
    }
    let cc = ConstantClamp::new(
        Henries::new(bb(0.35))?,
        Ohms::new(bb(56.0))?,
        Volts::new(bb(36.0))?,
    )?;
    bb(cc.time_to(Amps::new(bb(0.4))?, Amps::new(bb(0.0))?)?);
    bb(cc.decay(Amps::new(bb(0.4))?, Amps::new(bb(0.0))?)?);
    let s = SnubberSwitchOff::new(
        &coil,
        &RcSnubber {
            resistor: Ohms::new(bb(100.0))?,
            capacitor: Farads::new(bb(1e-6))?,
        },
        Volts::new(bb(24.0))?,
        Amps::new(bb(0.4))?,
        t,
    )?;
    bb(s.response()?);
    bb(s.settle_time(Amps::new(bb(1e-3))?)?);
    bb(s.current_at(Seconds::new(bb(1e-3))?));
    bb(s.switch_voltage_at(Seconds::new(bb(1e-3))?));
    bb(s.sample(Seconds::new(bb(1e-3))?, Seconds::new(bb(1e-2))?, &mut buf)?);
    let sizing = ZenerSizing {
        coil,
        diode: d,
        zener_rz: Ohms::new(bb(10.0))?,
        zener_izt: Amps::new(bb(0.01))?,
        v_supply: Volts::new(bb(26.4))?,
        i_start: Amps::new(bb(0.47))?,
        t_coil: t,
        t_clamp: t,
        switch_rating: Volts::new(bb(60.0))?,
        rating_fraction: bb(0.8),
        release_current: Amps::new(bb(0.05))?,
        max_release_time: Seconds::new(bb(5e-3))?,
    };
    bb(sizing.window()?);
    Ok(())
}

fn ratings() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(55.0))?;
    let e = Joules::new(bb(0.02))?;
    bb(single_pulse(e, Joules::new(bb(0.1))?)?);
    bb(average_power(e, bb(5.0))?);
    bb(Verdict::of(bb(1.0), bb(2.0), "x")?);
    let path = ThermalPath::new(bb(200.0), t, Temperature::from_celsius(bb(150.0))?)?;
    bb(path.max_power());
    bb(path.check(Watts::new(bb(0.1))?)?);
    bb(path.max_repetition_rate_hz(e, Seconds::new(bb(0.01))?)?);
    Ok(())
}

#[cfg(feature = "micromath")]
fn fast() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    bb(kickguard::fast::forward_drop(
        &DiodeParams::SILICON,
        Amps::new(bb(0.4))?,
        t,
    )?);
    let cc = ConstantClamp::new(
        Henries::new(bb(0.35))?,
        Ohms::new(bb(56.0))?,
        Volts::new(bb(36.0))?,
    )?;
    bb(kickguard::fast::constant_clamp_time(
        &cc,
        Amps::new(bb(0.4))?,
        Amps::new(bb(0.0))?,
    )?);
    Ok(())
}

fn timing_and_pwm() -> Result<(), Error> {
    use kickguard::pwm::{
        compare_value, hold_current_drift, hold_duty, hysteretic, time_to_current, Freewheel,
        HoldOperatingPoint,
    };
    use kickguard::timing::{
        max_repetition_rate_hz, release_current, release_time, reversal_wait, to_ticks,
    };
    let t = Temperature::from_celsius(bb(25.0))?;
    let coil = Coil::copper(Henries::new(bb(0.9))?, Ohms::new(bb(160.0))?, t)?;
    let v = Volts::new(bb(12.0))?;
    let off = SwitchOff::new(
        &coil,
        &Clamp::FreewheelDiode(DiodeParams::SILICON),
        v,
        Amps::new(bb(0.075))?,
        t,
        t,
    )?;
    let i_rel = release_current(&coil, Volts::new(bb(1.2))?, t)?;
    let r = release_time(&off, i_rel, Seconds::new(bb(8e-3))?)?;
    bb(reversal_wait(&off, i_rel)?);
    bb(max_repetition_rate_hz(
        r.total,
        Seconds::new(bb(0.1))?,
        bb(0.01),
        bb(0.5),
    )?);
    bb(to_ticks(r.total, bb(1000.0))?);
    bb(time_to_current(&coil, v, Amps::new(bb(0.05))?, t)?);
    let fw = Freewheel {
        diode_drop: Volts::new(bb(0.8))?,
        zener: Volts::new(bb(0.0))?,
    };
    let d = hold_duty(&coil, v, Amps::new(bb(0.03))?, t, fw)?;
    let p = HoldOperatingPoint::new(&coil, v, t, fw, bb(20_000.0), d)?;
    bb((
        p.mean_current()?,
        p.ripple()?,
        p.freewheel_power()?,
        p.frequency_for_ripple(Amps::new(bb(1e-3))?)?,
        p.compare_value(bb(1600))?,
    ));
    bb(compare_value(d, bb(1600))?);
    bb(hold_current_drift(
        &coil,
        v,
        d,
        fw,
        fw,
        t,
        Temperature::from_celsius(bb(80.0))?,
    )?);
    bb(hysteretic(
        &coil,
        v,
        t,
        fw,
        Amps::new(bb(0.02))?,
        Amps::new(bb(0.03))?,
    )?);
    Ok(())
}

fn input_protection() -> Result<(), Error> {
    use kickguard::input::board::{Board, BoardInput};
    use kickguard::input::rail::{
        neighbour_adc_error, rail_off_check, rail_on_check, shared_clamp,
    };
    use kickguard::input::resistor::{
        max_resistor, min_resistor, resistor_power, resistor_window, transient_energy,
        InjectionLimits, UpperLimits,
    };
    use kickguard::input::{Pin, PinClamp, SignalRange};
    let t = Temperature::from_celsius(bb(85.0))?;
    let clamp = if bb(true) {
        PinClamp::DiodeLaw(DiodeParams::SILICON)
    } else {
        PinClamp::FixedDrop(Volts::new(bb(0.3))?)
    };
    let pin = Pin::new(Volts::new(bb(3.0))?, clamp, t)?;
    bb(Pin::limiter_to_ground(clamp, t)?.injection(Volts::new(bb(5.0))?, Ohms::new(bb(1e3))?)?);
    let r = Ohms::new(bb(10_000.0))?;
    let s = SignalRange::new(
        Volts::new(bb(0.0))?,
        Volts::new(bb(24.0))?,
        Volts::new(bb(-2.0))?,
        Volts::new(bb(30.0))?,
        Seconds::new(bb(1e-3))?,
    )?;
    let d = SignalRange::drain_sense_open_diode(
        Volts::new(bb(24.0))?,
        Volts::new(bb(66.0))?,
        Seconds::new(bb(3e-3))?,
    )?;
    bb((
        pin.injection(s.transient_max, r)?,
        pin.pin_voltage(s.transient_min, r)?,
    ));
    let lim = InjectionLimits {
        positive: Amps::new(bb(5e-3))?,
        negative: Amps::new(bb(5e-3))?,
    };
    let up = UpperLimits {
        adc_max_source: Some(Ohms::new(bb(50_000.0))?),
        leakage: Some((Amps::new(bb(1e-6))?, Volts::new(bb(0.01))?)),
        logic_high: Some((
            Amps::new(bb(1e-6))?,
            Volts::new(bb(10.0))?,
            Volts::new(bb(2.0))?,
        )),
        sampling: Some((
            Farads::new(bb(1e-11))?,
            Seconds::new(bb(1e-6))?,
            bb(12),
            Ohms::new(bb(1000.0))?,
        )),
    };
    bb((
        min_resistor(&pin, &s, lim)?,
        max_resistor(&up)?,
        resistor_window(&pin, &s, lim, &up)?,
    ));
    bb((
        resistor_power(&pin, s.transient_max, r)?,
        transient_energy(&pin, &d, r)?,
    ));
    bb(rail_on_check(Amps::new(bb(6e-3))?, Amps::new(bb(8e-3))?)?);
    bb(rail_off_check(
        &pin,
        s.steady_max,
        r,
        Ohms::new(bb(1000.0))?,
        Volts::new(bb(0.5))?,
    )?);
    bb(shared_clamp(
        pin.vdd,
        &DiodeParams::SILICON,
        &DiodeParams::SCHOTTKY,
        t,
        s.transient_max,
        r,
    )?);
    bb(neighbour_adc_error(Amps::new(bb(2e-3))?, bb(1e-4), r)?);
    let mut board: Board<2> = Board::new(pin, lim, Some(Amps::new(bb(8e-3))?));
    let _ = bb(board.add(BoardInput {
        name: "a",
        signal: s,
        resistor: r,
        limits: lim,
    }));
    bb(board.check()?);
    Ok(())
}

fn diagnosis() -> Result<(), Error> {
    use kickguard::diagnosis::classify::{BandedWindows, Entry, Windows, MAX_WINDOWS};
    use kickguard::diagnosis::fit::{fit_decay, SampleBuffer};
    use kickguard::diagnosis::history::VerdictHistory;
    use kickguard::diagnosis::windows::winding_temperature_from_current;
    use kickguard::diagnosis::{Condition, Design, Measurement};
    let t = Temperature::from_celsius(bb(25.0))?;
    let coil = Coil::copper(Henries::new(bb(0.5))?, Ohms::new(bb(100.0))?, t)?;
    let design = Design {
        coil,
        inductance_tolerance: bb(0.1),
        resistance_tolerance: bb(0.07),
        v_supply_min: Volts::new(bb(10.8))?,
        v_supply_max: Volts::new(bb(13.2))?,
        t_winding_min: Temperature::from_celsius(bb(-10.0))?,
        t_winding_max: Temperature::from_celsius(bb(70.0))?,
        t_winding_fault_max: Temperature::from_celsius(bb(130.0))?,
        t_clamp_min: Temperature::from_celsius(bb(-10.0))?,
        t_clamp_max: Temperature::from_celsius(bb(70.0))?,
        clamp: Clamp::FreewheelDiode(DiodeParams::SILICON),
        switch_avalanche: Breakdown::ideal(Volts::new(bb(60.0))?)?,
        shorted_turns: bb(0.2),
    };
    let m = if bb(true) {
        Measurement::BetweenCurrents {
            upper: Amps::new(bb(0.08))?,
            lower: Amps::new(bb(0.01))?,
        }
    } else {
        Measurement::SwitchAbove {
            threshold: Volts::new(bb(14.0))?,
        }
    };
    bb(design.window(Condition::Healthy, &m)?);
    bb(design.separations(&m)?);
    let w = design.tick_windows(&m, bb(100_000.0), bb(0.02))?;
    bb(design.banded_tick_windows(
        &m,
        bb(100_000.0),
        bb(0.02),
        [Temperature::from_celsius(bb(30.0))?],
    )?);
    let v = w.classify(bb(1234));
    bb(w.entries().count());
    let mut e = [Entry::EMPTY; MAX_WINDOWS];
    e[0] = Entry {
        lo: bb(10),
        hi: bb(20),
        condition: Condition::Healthy,
    };
    let w2 = Windows::from_entries(e, bb(1));
    let banded = BandedWindows {
        upper_edges_deci_c: [bb(250), bb(600)],
        windows: [w, w2],
    };
    bb(banded.classify(bb(300), bb(15)));
    let mut h: VerdictHistory<8> = VerdictHistory::new();
    h.push(v);
    bb((h.consecutive(v), h.confirmed(v, bb(3)), h.latest()));
    h.clear();
    let mut buf: SampleBuffer<8> = SampleBuffer::new();
    for k in 0..8 {
        let _ = buf.push(Amps::new(bb(0.4 - 0.04 * k as f32))?);
    }
    let f = fit_decay(&buf, Seconds::new(bb(1e-3))?)?;
    bb((
        f.inductance(Ohms::new(bb(100.0))?)?,
        f.clamp_voltage(Ohms::new(bb(100.0))?)?,
    ));
    bb(winding_temperature_from_current(
        &coil,
        Volts::new(bb(12.0))?,
        Amps::new(bb(0.1))?,
    )?);
    Ok(())
}

#[entry]
fn main() -> ! {
    let _ = bb(diagnosis());
    let _ = bb(input_protection());
    let _ = bb(timing_and_pwm());
    #[cfg(feature = "micromath")]
    let _ = bb(fast());
    let _ = bb(units());
    let _ = bb(diode());
    let _ = bb(coil_and_clamps());
    let _ = bb(ratings());
    #[cfg(feature = "force-panic")]
    {
        let arr = bb([1u32, 2, 3]);
        bb(arr[bb(7usize)]); // reachable bounds-check panic: the link must fail
    }
    cortex_m_semihosting::debug::exit(cortex_m_semihosting::debug::EXIT_SUCCESS);
    loop {}
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    extern "Rust" {
        #[link_name = "__PANIC_PATH_IS_REACHABLE__see_linker_error"]
        fn panic_is_reachable() -> !;
    }
    // SAFETY: the symbol does not exist; this call exists only to make the link fail.
    unsafe { panic_is_reachable() }
}
