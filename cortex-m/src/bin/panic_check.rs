//! Link-time proof that no public kickguard function can panic.
//!
//! Every public function is called with inputs hidden from the optimiser (`black_box`), so every
//! branch stays live. The panic handler calls a symbol that does not exist: if any panic path is
//! reachable, the release (LTO) link fails with "undefined symbol:
//! __PANIC_PATH_IS_REACHABLE__see_linker_error". `.ci/cross` links it twice: with the release
//! profile, and with overflow checks and debug assertions on (the `checked` profile), so integer
//! overflow is proved impossible too. Quantities and errors are also written with `{}` into a
//! fixed buffer: the formatting path is covered. Keep the call list complete as the API grows.
#![no_std]
#![no_main]

use core::fmt::Write as _;
use core::hint::black_box as bb;
use cortex_m_rt::entry;
use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::{single_pulse_avalanche_energy, ConstantClamp};
use kickguard::clamp::sizing::ZenerSizing;
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{ActiveClamp, Clamp, Operating, Sample, Side, SwitchOff, SwitchedFreewheel};
use kickguard::coil::Coil;
use kickguard::diode::{
    fit_three_points, fit_two_points, BandGap, Diode, DiodeParams, DropPoint, Ideality, Xti,
};
use kickguard::rating::{average_power, single_pulse, PulseRating, ThermalPath};
use kickguard::varistor::Varistor;
use kickguard::{
    Amps, Coulombs, Duty, Error, Farads, Henries, Hertz, Joules, Ohms, PerKelvin, Seconds,
    TempDelta, Temperature, Volts, Watts,
};

/// A `fmt::Write` that counts bytes and discards them.
struct Sink(u32);

impl core::fmt::Write for Sink {
    fn write_str(&mut self, s: &str) -> core::fmt::Result {
        self.0 = self.0.saturating_add(s.len() as u32);
        Ok(())
    }
}

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
    let f = Hertz::new(bb(50.0))?;
    let t = Temperature::from_kelvin(bb(300.0))?;
    let t2 = Temperature::from_celsius(bb(30.0))?;
    let d = TempDelta::from_kelvin(bb(5.0))?;
    let duty = Duty::new(bb(0.5))?;
    let pk = PerKelvin::percent_per_kelvin(bb(0.08))?;
    bb((
        (r * i)?,
        (v * i)?,
        (p * s)?,
        (i * s)?,
        (q * v)?,
        (r * c)?,
        (e * f)?,
        (v + v)?,
        (i - i)?,
        (e + e)?,
        (p - p)?,
        (q + q)?,
    ));
    bb((
        l.time_constant(r)?,
        l.stored_energy(i)?,
        v.over(r)?,
        f.period()?,
        t.offset(d)?,
        t2 - t,
        t.kelvin(),
        t2.celsius(),
        Duty::percent(bb(40.0))?,
    ));
    let _ = bb(kickguard::physics::thermal_voltage(t));
    // Formatting: the crate's own printer, into a sink that only counts (the proof is about
    // kickguard's formatting path, not about any particular buffer type).
    let mut out = Sink(0);
    let _ = write!(out, "{} {:.3} {:>9.2} {}", v, i, r, t);
    let _ = write!(out, "{} {} {} {}", duty, d, l, f);
    let _ = write!(out, "{}", Error::new("x", kickguard::Reason::TooLarge));
    let _ = kickguard::units::decimal::write_fixed_point(&mut out, bb(pk.value()), bb(3));
    bb(out.0);
    bb(kickguard::Reason::Overflow.code());
    Ok(())
}

fn diode() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    let d = DiodeParams::new(
        Amps::new(bb(1e-14))?,
        Ideality::new(bb(1.0))?,
        Ohms::new(bb(0.1))?,
        BandGap::ev(bb(1.11))?,
        Xti::new(bb(3.0))?,
        t,
    )?;
    let d = bb(d.with_rs(Ohms::new(bb(0.2))?)?);
    let i = Amps::new(bb(0.01))?;
    bb(d.forward_drop(i, t)?);
    bb(d.saturation_current(t)?);
    bb(d.forward_tempco_v_per_k(i, t)?);
    bb(d.reverse_leakage(Volts::new(bb(10.0))?, t)?);
    bb(d.series_current(Volts::new(bb(5.0))?, Ohms::new(bb(1e3))?, t)?);
    bb(d.forward_current(Volts::new(bb(0.6))?, t)?);
    bb(d.junction_temperature(i, Volts::new(bb(0.6))?)?);
    bb((d.is(), d.n(), d.rs(), d.eg(), d.xti(), d.tnom()));
    let fixed = Diode::FixedDrop(Volts::new(bb(0.7))?);
    bb(fixed.forward_drop(i, t)?);
    bb(fixed.shifted(Volts::new(bb(0.03))?)?);
    bb(Diode::Law(d).shifted(Volts::new(bb(-0.03))?)?);
    let p = |a: f32, v: f32| DropPoint::new(bb(a), bb(v));
    bb(fit_two_points(
        [p(1e-3, 0.6)?, p(0.1, 0.8)?],
        t,
        Ohms::new(bb(0.0))?,
        BandGap::SILICON,
        Xti::PN,
    )?);
    bb(fit_three_points(
        [p(1e-3, 0.6)?, p(0.1, 0.8)?, p(1.0, 1.0)?],
        t,
        BandGap::SCHOTTKY,
        Xti::SCHOTTKY,
    )?);
    bb(d.with_eg_from_point(p(1e-3, 0.55)?, Temperature::from_celsius(bb(60.0))?)?);
    bb(d.with_eg_from_tempco(i, bb(-2e-3))?);
    Ok(())
}

fn breakdown_law() -> Result<BreakdownLaw, Error> {
    Ok(match bb(2u8) {
        0 => BreakdownLaw::Spice {
            bv: Volts::new(bb(40.0))?,
            ibv: Amps::new(bb(1e-3))?,
            nbv: Ideality::new(bb(2.0))?,
            rs: Ohms::new(bb(1.0))?,
        },
        1 => BreakdownLaw::FlooredAtBv {
            bv: Volts::new(bb(40.0))?,
            ibv: Amps::new(bb(1e-3))?,
            nbv: Ideality::new(bb(2.0))?,
            rs: Ohms::new(bb(1.0))?,
        },
        _ => BreakdownLaw::Datasheet {
            vz: Volts::new(bb(18.0))?,
            izt: Amps::new(bb(0.01))?,
            rz: Ohms::new(bb(10.0))?,
        },
    })
}

fn coil_and_clamps() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    let coil = Coil::copper(Henries::new(bb(0.35))?, Ohms::new(bb(56.0))?, t)?;
    let coil2 = Coil::new(
        Henries::new(bb(0.9))?,
        Ohms::new(bb(160.0))?,
        t,
        PerKelvin::ZERO,
    )?;
    let coil3 =
        Coil::fixed(Henries::new(bb(0.1))?, Ohms::new(bb(20.0))?)?.scaled(bb(1.1), bb(0.9))?;
    bb((
        coil.inductance(),
        coil.resistance_ref(),
        coil.reference_temperature(),
        coil.alpha(),
        coil3.resistance(t)?,
    ));
    bb(coil.resistance(t)?);
    bb(coil.winding_temperature(Ohms::new(bb(60.0))?)?);
    bb(coil.steady_current(Volts::new(bb(24.0))?, t)?);
    bb(coil.stored_energy(Amps::new(bb(0.4))?)?);
    let i_op = coil2.magnetic_current(Volts::new(bb(9.0))?)?;
    bb(coil2.pull_in_margin(i_op, Volts::new(bb(11.0))?, t)?);
    let z = Breakdown::new(breakdown_law()?, PerKelvin::new(bb(1e-3))?, t)?;
    let z = bb(z.scaled(bb(1.05))?);
    bb((
        z.law(),
        z.tc(),
        z.nominal_voltage(),
        z.voltage(Amps::new(bb(0.1))?, t)?,
    ));
    let ideal = Breakdown::ideal(Volts::new(bb(60.0))?)?;
    let mov = Varistor::new(
        Volts::new(bb(39.0))?,
        Amps::new(bb(1e-3))?,
        bb(30.0),
        PerKelvin::ZERO,
        t,
    )?;
    bb((mov.alpha(), mov.voltage(Amps::new(bb(0.1))?, t)?));
    let mov = bb(mov.scaled(bb(1.1))?);
    bb(mov.reference_voltage());
    let d = if bb(true) {
        Diode::Law(DiodeParams::SCHOTTKY)
    } else {
        Diode::FixedDrop(Volts::new(bb(0.4))?)
    };
    let sw = SwitchedFreewheel {
        diode: d,
        zener: z,
        bypass: Ohms::new(bb(0.5))?,
    };
    bb(sw.hold_freewheel(Amps::new(bb(0.15))?, t)?);
    bb(sw.final_turn_off());
    let clamps = [
        Clamp::FreewheelDiode(d),
        Clamp::ResistorDiode {
            resistor: Ohms::new(bb(56.0))?,
            diode: d,
        },
        Clamp::ZenerDiode { zener: z, diode: d },
        Clamp::TvsAcrossCoil(z),
        Clamp::Varistor(mov),
        Clamp::AcrossSwitch(z),
        Clamp::Avalanche(ideal),
        Clamp::ActiveClamp(ActiveClamp {
            zener: z,
            zener_current: Amps::new(bb(1e-3))?,
            gate_threshold: Volts::new(bb(3.0))?,
            transconductance_a_per_v2: bb(Some(5.0)),
        }),
        Clamp::HBridgeFastDecay(d),
        Clamp::SwitchedFreewheel(sw),
    ];
    let mut buf = [Sample::default(); 4];
    let op = Operating {
        supply: Volts::new(bb(24.0))?,
        start_current: Amps::new(bb(0.4))?,
        winding: t,
        diodes: t,
        breakdown: Temperature::from_celsius(bb(60.0))?,
    };
    let side = if bb(true) { Side::Low } else { Side::High };
    for c in bb(clamps).iter() {
        let off = SwitchOff::new(&coil, c, side, &op)?;
        bb((
            off.start_current(),
            off.supply(),
            off.side(),
            off.is_closed_form(),
            off.reaches_zero(),
            off.steady_current(),
            off.end_current(),
            off.peak_switch_voltage(),
            off.peak_output_voltage(),
            off.clamp_voltage_at_start(),
        ));
        let i1 = Amps::new(bb(0.01))?;
        bb(off.switch_voltage_at(i1)?);
        bb(off.output_voltage_at(i1)?);
        bb(off.time_above(Volts::new(bb(30.0))?)?);
        bb(off.current_at_switch_voltage(Volts::new(bb(30.0))?)?);
        bb(off.time_to(i1)?);
        bb(off.decay_to(i1)?);
        bb(off.decay_to_end()?);
        bb(off.profile(&[Amps::new(bb(0.2))?, i1])?);
        bb(off.sample(Seconds::new(bb(1e-3))?, i1, &mut buf)?);
        bb(off.sample(Seconds::new(bb(1e-3))?, Amps::new(bb(0.0))?, &mut buf)?);
    }
    let cc = ConstantClamp::new(
        Henries::new(bb(0.35))?,
        Ohms::new(bb(56.0))?,
        Volts::new(bb(36.0))?,
        Amps::new(bb(0.4))?,
    )?;
    bb(cc.time_to(Amps::new(bb(0.0))?)?);
    bb(cc.decay_to(Amps::new(bb(0.0))?)?);
    bb(single_pulse_avalanche_energy(
        Henries::new(bb(0.35))?,
        Amps::new(bb(0.4))?,
        Volts::new(bb(66.0))?,
        Volts::new(bb(24.0))?,
    )?);
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
    bb(s.sample(Seconds::new(bb(1e-3))?, &mut buf)?);
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
        rating_fraction: Duty::new(bb(0.8))?,
        release_current: Amps::new(bb(0.05))?,
        max_release_time: Seconds::new(bb(5e-3))?,
    };
    bb(sizing.window()?);
    Ok(())
}

fn ratings() -> Result<(), Error> {
    let t = Temperature::from_celsius(bb(55.0))?;
    let e = Joules::new(bb(0.02))?;
    bb(single_pulse(e, PulseRating::new(Joules::new(bb(0.1))?)?)?);
    bb(PulseRating::new(e)?.energy());
    bb(average_power(e, Hertz::new(bb(5.0))?)?);
    let path = ThermalPath {
        resistance_k_per_w: bb(200.0),
        ambient: t,
        junction_max: Temperature::from_celsius(bb(150.0))?,
    };
    bb(path.max_power()?);
    bb(path.check(Watts::new(bb(0.1))?)?);
    bb(path.max_repetition_rate(e, Seconds::new(bb(0.01))?)?);
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
        Amps::new(bb(0.4))?,
    )?;
    bb(kickguard::fast::constant_clamp_time(
        &cc,
        Amps::new(bb(0.0))?,
    )?);
    Ok(())
}

fn timing_and_pwm() -> Result<(), Error> {
    use kickguard::pwm::{
        compare_value, hold_current_drift, hold_duty, hysteretic, mean_hold_current,
        time_to_current, Freewheel, HoldOperatingPoint,
    };
    use kickguard::timing::{
        max_repetition_rate, release_current, release_time, reversal_wait, to_ticks, to_ticks_floor,
    };
    let t = Temperature::from_celsius(bb(25.0))?;
    let coil = Coil::copper(Henries::new(bb(0.9))?, Ohms::new(bb(160.0))?, t)?;
    let v = Volts::new(bb(12.0))?;
    let off = SwitchOff::new(
        &coil,
        &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        Side::Low,
        &Operating::uniform(v, Amps::new(bb(0.075))?, t),
    )?;
    let i_rel = release_current(&coil, Volts::new(bb(1.2))?)?;
    let r = release_time(&off, i_rel, Seconds::new(bb(8e-3))?)?;
    bb(reversal_wait(&off, i_rel)?);
    bb(max_repetition_rate(
        r.total,
        Joules::new(bb(0.01))?,
        Watts::new(bb(0.5))?,
    )?);
    let tick = Hertz::new(bb(1000.0))?;
    bb((to_ticks(r.total, tick)?, to_ticks_floor(r.total, tick)?));
    bb(time_to_current(&coil, v, t, Amps::new(bb(0.05))?)?);
    let fw = Freewheel::new(Volts::new(bb(0.8))?, Volts::new(bb(0.0))?)?;
    let fw2 = Freewheel::diode(Volts::new(bb(0.7))?)?;
    bb((fw.diode_drop(), fw.zener()));
    let d = hold_duty(&coil, v, t, &fw, Amps::new(bb(0.03))?)?;
    let p = HoldOperatingPoint::new(&coil, v, t, &fw, Hertz::new(bb(20_000.0))?, d)?;
    bb((
        p.mean_current()?,
        p.ripple()?,
        p.freewheel_power()?,
        p.frequency_for_ripple(Amps::new(bb(1e-3))?)?,
        p.compare_value(bb(1600))?,
    ));
    bb(compare_value(d, bb(1600))?);
    bb(mean_hold_current(&coil, v, t, &fw, d)?);
    bb(hold_current_drift(
        &coil,
        v,
        (t, fw),
        (Temperature::from_celsius(bb(80.0))?, fw2),
        d,
    )?);
    bb(hysteretic(
        &coil,
        v,
        t,
        &fw,
        Amps::new(bb(0.02))?,
        Amps::new(bb(0.03))?,
    )?);
    Ok(())
}

fn input_protection() -> Result<(), Error> {
    use kickguard::input::board::{Board, BoardInput};
    use kickguard::input::rail::{
        neighbour_adc_error, rail_off_check, rail_off_together, shared_clamp, RailLoad, RailSource,
        UnpoweredRail,
    };
    use kickguard::input::resistor::{
        max_resistor, min_resistor, resistor_power, resistor_window, transient_energy,
        InjectionLimits, LogicHigh, UpperLimits,
    };
    use kickguard::input::{Pin, SignalRange};
    let t = Temperature::from_celsius(bb(85.0))?;
    let clamp = if bb(true) {
        Diode::Law(DiodeParams::SILICON)
    } else {
        Diode::FixedDrop(Volts::new(bb(0.3))?)
    };
    let pin = Pin::new(Volts::new(bb(3.0))?, clamp, t)?;
    bb(Pin::limiter_to_ground(clamp, t)?.injection(Volts::new(bb(5.0))?, Ohms::new(bb(1e3))?)?);
    let r = Ohms::new(bb(10_000.0))?;
    let s = SignalRange {
        steady_min: Volts::new(bb(0.0))?,
        steady_max: Volts::new(bb(24.0))?,
        transient_min: Volts::new(bb(-2.0))?,
        transient_max: Volts::new(bb(30.0))?,
        transient_width: Seconds::new(bb(1e-3))?,
    };
    s.validate()?;
    let valve = Coil::copper(Henries::new(bb(0.35))?, Ohms::new(bb(56.0))?, t)?;
    let open = SwitchOff::new(
        &valve,
        &Clamp::Avalanche(Breakdown::ideal(Volts::new(bb(66.0))?)?),
        Side::Low,
        &Operating::uniform(Volts::new(bb(24.0))?, Amps::new(bb(0.4))?, t),
    )?;
    let d = SignalRange::output_sense(&open)?;
    bb((
        pin.injection(s.transient_max, r)?,
        pin.pin_voltage(s.transient_min, r)?,
    ));
    let lim = InjectionLimits {
        positive: Amps::new(bb(5e-3))?,
        negative: Amps::new(bb(5e-3))?,
    };
    bb(lim.validate()?);
    let up = UpperLimits {
        adc_max_source: Some(Ohms::new(bb(50_000.0))?),
        leakage: Some((Amps::new(bb(1e-6))?, Volts::new(bb(0.01))?)),
        logic_high: Some(LogicHigh {
            leakage: Amps::new(bb(1e-6))?,
            signal_high_min: Volts::new(bb(10.0))?,
            v_ih: Volts::new(bb(2.0))?,
        }),
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
    let rail = RailLoad::new(Amps::new(bb(8e-3))?)?;
    bb((rail.min_load(), rail.check(Amps::new(bb(6e-3))?)?));
    bb(rail_off_check(
        &pin,
        s.steady_max,
        r,
        &UnpoweredRail {
            load: Ohms::new(bb(1000.0))?,
            allowed: Volts::new(bb(0.5))?,
        },
    )?);
    let sources = [RailSource {
        v_signal: s.steady_max,
        r_series: r,
        count: bb(4),
    }; 2];
    bb(kickguard::supply::rail_rise(
        kickguard::Farads::new(bb(470e-6))?,
        Volts::new(bb(24.0))?,
        kickguard::Joules::new(bb(0.05))?,
        Amps::new(bb(0.1))?,
        kickguard::Seconds::new(bb(1e-3))?,
    )?);
    bb(rail_off_together(
        &pin,
        bb(&sources[..]),
        &UnpoweredRail {
            load: Ohms::new(bb(220.0))?,
            allowed: Volts::new(bb(0.5))?,
        },
    )?);
    bb(shared_clamp(
        &pin,
        &DiodeParams::SCHOTTKY,
        s.transient_max,
        r,
    )?);
    bb(neighbour_adc_error(Amps::new(bb(2e-3))?, bb(1e-4), r)?);
    let mut board: Board<2> = Board::new(pin, lim, Some(rail));
    let _ = bb(board.add(BoardInput {
        name: "a",
        signal: s,
        resistor: r,
        limits: lim,
    }));
    bb(board.check()?);
    Ok(())
}

/// The unit learner: its table at configuration time, then learning, persisting, restoring,
/// judging, every reading kind.
fn unit_learner(
    design: &kickguard::diagnosis::Design,
    m: &kickguard::diagnosis::Measurement,
    timing: &kickguard::diagnosis::Timing,
    acc: &kickguard::diagnosis::compensate::MeasuredAccuracy,
) -> Result<(), Error> {
    use kickguard::diagnosis::unit::{UnitLearner, STATE_BYTES};
    let table = design.unit_table(
        m,
        timing,
        acc,
        [Volts::new(bb(13.2))?],
        [Amps::new(bb(0.1))?, Amps::new(bb(0.14))?],
    )?;
    bb(table.cell(bb(12_000), bb(110_000)).is_some());
    bb(table.fingerprint());
    let mut u: UnitLearner<8> = UnitLearner::new(&table)?;
    for k in 0..12u32 {
        bb(u.observe(&table, bb(12_000), bb(110_000 + k), bb(500 + k)));
    }
    bb((u.state(), u.learned(), u.state().alive()));
    let bytes = u.state_bytes().unwrap_or([0u8; STATE_BYTES]);
    if let Ok(mut back) = UnitLearner::<8>::resume(&table, bb(&bytes)) {
        bb(back.observe(&table, bb(u32::MAX), bb(0), bb(u32::MAX)));
    }
    u.forget();
    Ok(())
}

/// The armature: the model's pull-in and release, the sizing's helpers, the detector.
fn armature() -> Result<(), Error> {
    use kickguard::armature::detect::{DipConfig, DipDetector, Polarity};
    use kickguard::armature::motion::{pull_in, release, Run};
    use kickguard::armature::release_sizing::{release_detector_for, release_window};
    use kickguard::armature::sizing::{
        confirm_amps, detector_for, pull_in_window, run_for, Adc, DriveRange, Tolerances,
    };
    use kickguard::armature::{Armature, GapInductance};
    let arm = Armature {
        mass_kg: bb(0.01),
        stroke_m: bb(1.5e-3),
        preload_n: bb(0.3),
        spring_n_per_m: bb(500.0),
        load_n: bb(0.2),
        damping_n_s_per_m: bb(2.0),
        inductance: GapInductance {
            seat: Henries::new(bb(0.35))?,
            open: Henries::new(bb(0.2))?,
            g0_m: bb(0.5e-3),
            shape: None,
        },
    };
    bb((
        arm.magnetic_force(bb(0.3), bb(1e-3)),
        arm.balance_current(bb(0.0)),
    ));
    let (shape, ends) = kickguard::armature::shape::GapShape::from_table(bb(&[
        (0.0, 0.35),
        (0.4e-3, 0.26),
        (0.8e-3, 0.23),
        (1.5e-3, 0.2),
    ]))?;
    let mut tabled = arm;
    tabled.inductance.shape = Some(shape);
    bb((
        ends,
        tabled.inductance_at(bb(0.7e-3)),
        tabled.magnetic_force(bb(0.3), bb(1e-3)),
    ));
    let run = Run {
        duration: Seconds::new(bb(0.05))?,
        sample_period: Seconds::new(bb(1e-4))?,
        tolerance: bb(1e-5),
    };
    let mut buf = [0f32; 16];
    let p = pull_in(
        &arm,
        Ohms::new(bb(56.0))?,
        Volts::new(bb(24.0))?,
        &run,
        &mut buf,
    )?;
    bb((p.dip(), p.seated, p.energy));
    let t = Temperature::from_celsius(bb(25.0))?;
    let coil = Coil::fixed(Henries::new(bb(0.35))?, Ohms::new(bb(56.0))?)?;
    let op = Operating::uniform(Volts::new(bb(24.0))?, Amps::new(bb(0.43))?, t);
    let off = SwitchOff::new(
        &coil,
        &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        Side::Low,
        &op,
    )?;
    let r = release(&arm, &off, &run, &mut buf)?;
    bb((r.bump_height(), r.opened));
    let adc = Adc {
        rate: Hertz::new(bb(10_000.0))?,
        counts_per_amp: bb(4000.0),
        full_scale: bb(4096),
        noise_counts: bb(4),
    };
    let tol = Tolerances {
        mass: bb(0.1),
        ..Tolerances::default()
    };
    let drive = DriveRange {
        supply_min: Volts::new(bb(21.6))?,
        supply_max: Volts::new(bb(26.4))?,
        resistance_min: Ohms::new(bb(52.0))?,
        resistance_max: Ohms::new(bb(70.0))?,
    };
    if bb(false) {
        // Configuration time (2 × 2048 integrations): linked, not run on the target.
        let w = pull_in_window(
            &arm,
            &tol,
            &drive,
            &run_for(&adc, Seconds::new(bb(0.2))?)?,
            confirm_amps(&adc)?,
        )?;
        bb(detector_for(&w, &adc)?.is_ok());
        let mut turns = [kickguard::armature::sizing::CornerTurns::default(); 4];
        let run_k = run_for(&adc, Seconds::new(bb(0.2))?)?;
        let (_, kept) = kickguard::armature::sizing::pull_in_window_keeping(
            &arm,
            &tol,
            &drive,
            &run_k,
            confirm_amps(&adc)?,
            &mut turns,
        )?;
        bb(kickguard::armature::sizing::sampled_dip_min_at(
            &arm,
            &tol,
            &drive,
            &run_k,
            turns.get(..kept).unwrap_or(&[]),
        )?);
        let rw = release_window(
            &arm,
            &tol,
            &[off],
            &run_for(&adc, Seconds::new(bb(0.2))?)?,
            confirm_amps(&adc)?,
        )?;
        bb(release_detector_for(&rw, &adc)?.is_ok());
    }
    let mut d = DipDetector::new(DipConfig {
        polarity: if bb(true) {
            Polarity::Rising
        } else {
            Polarity::Falling
        },
        rise: bb(11),
        hysteresis: bb(11),
        min_dip: bb(11),
        window: bb(100),
        full_scale: bb(4096),
    });
    bb(d.push_slice(bb(&[0u16, 500, 1000, 900, 800, 1200, u16::MAX])));
    bb((d.finish(), d.verdict()));
    d.reset();
    Ok(())
}

fn diagnosis() -> Result<(), Error> {
    use kickguard::diagnosis::classify::{BandedWindows, Entry, Windows, MAX_WINDOWS};
    use kickguard::diagnosis::compensate::MeasuredAccuracy;
    use kickguard::diagnosis::fit::{fit_decay, SampleBuffer};
    use kickguard::diagnosis::history::VerdictHistory;
    use kickguard::diagnosis::learn::{LearnedWindow, Learner};
    use kickguard::diagnosis::windows::winding_temperature_from_current;
    use kickguard::diagnosis::{Candidates, Condition, Design, Measurement, ShortedTurns, Timing};
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
        clamp: Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        clamp_tolerance: bb(0.05),
        switch_avalanche: Breakdown::ideal(Volts::new(bb(60.0))?)?,
        avalanche_tolerance: bb(0.05),
        shorted: if bb(true) {
            ShortedTurns::Fraction(bb(0.2))
        } else {
            ShortedTurns::Scales {
                inductance: bb(0.6),
                resistance: bb(0.8),
            }
        },
        side: if bb(true) { Side::Low } else { Side::High },
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
    let timing = Timing {
        tick: Hertz::new(bb(100_000.0))?,
        guard: Duty::new(bb(0.02))?,
        jitter_ticks: bb(2),
    };
    timing.validate()?;
    bb(design.window(Condition::Healthy, &m)?);
    bb(design.separations(&m)?);
    let w = design.tick_windows(&m, &timing)?;
    bb(design.banded_tick_windows(&m, &timing, [Temperature::from_celsius(bb(30.0))?])?);
    let rep = design.tick_separations(&m, &timing)?;
    for s in rep.faults.iter() {
        bb((
            s.window.gap(&rep.healthy),
            s.window.overlaps(&rep.healthy),
            s.confused_with.count(),
        ));
        // Counted with a saturating fold: core's `count` adds with an overflow check.
        bb(s.confused_with
            .iter()
            .fold(0u32, |n, _| n.saturating_add(1)));
    }
    let acc = MeasuredAccuracy {
        supply: bb(0.01),
        current: bb(0.01),
        supply_step: 0.0,
        current_step: 0.0,
    };
    let comp = design.compensated_tick_windows(
        &m,
        &timing,
        &acc,
        [Volts::new(bb(13.2))?],
        [Amps::new(bb(0.1))?, Amps::new(bb(0.14))?],
    )?;
    bb(comp.classify(bb(12_000), bb(110_000), bb(500)));
    bb(comp.cell(bb(12_000), bb(110_000)).is_some());
    if let Some(p) = design.propose_comparator(&timing, bb(0.02))? {
        bb((p.measurement(), p.slowest_tick));
    }
    let lim = design.resistance_limit(&acc)?;
    bb(lim.exceeded(bb(12_000), bb(90_000)));
    let v = w.classify(bb(1234));
    bb(Candidates::NONE
        .with(Condition::CoilOpen)
        .contains(Condition::Healthy));
    let mut learner: Learner<8> = Learner::new(w, bb(2))?;
    for k in 0..12u32 {
        bb(learner.observe(bb(1000 + k)));
    }
    if let Some(lw) = learner.learned() {
        let _ = bb(LearnedWindow::from_bytes(&lw.to_bytes(), &w).map(|x| x.contains(bb(1003))));
        bb(Learner::<8>::resume(w, bb(2), lw).is_ok());
    }
    learner.forget();
    unit_learner(&design, &m, &timing, &acc)?;
    hal_routines();
    bb(w.entries()
        .fold(0u32, |n, e| n.saturating_add(e.hi.saturating_sub(e.lo))));
    let mut e = [Entry::EMPTY; MAX_WINDOWS];
    e[0] = Entry {
        lo: bb(10),
        hi: bb(20),
        condition: Condition::Healthy,
    };
    let w2 = Windows::from_entries(e, bb(1));
    let rows = bb([[u32::MAX, u32::MAX, 1], [0, u32::MAX, 2]]);
    bb(Windows::from_rows(&rows).classify(bb(u32::MAX)));
    let banded = BandedWindows {
        upper_edges_deci_c: [bb(250), bb(600)],
        windows: [w, w2],
    };
    bb(banded.classify(bb(300), bb(15)));
    let mut h: VerdictHistory<8> = VerdictHistory::new();
    h.push(v);
    bb((h.consecutive(v), h.confirmed(v, bb(3)), h.latest()));
    h.clear();
    let mut none: VerdictHistory<0> = VerdictHistory::new();
    none.push(v);
    bb(none.latest());
    let mut buf = [Amps::new(0.0)?; 8];
    let mut x = 0.4f32;
    for slot in buf.iter_mut() {
        *slot = Amps::new(bb(x))?;
        x -= 0.04;
    }
    let _: Option<SampleBuffer<8>> = None;
    let f = fit_decay(&buf, Seconds::new(bb(1e-3))?)?;
    bb((
        f.inductance(Ohms::new(bb(100.0))?)?,
        f.clamp_voltage(Ohms::new(bb(100.0))?)?,
        f.closest_clamp(Ohms::new(bb(100.0))?, &[Volts::new(bb(0.8))?])?,
        f.recover(Ohms::new(bb(100.0))?, Ohms::new(bb(15.0))?)?,
    ));
    bb(winding_temperature_from_current(
        &coil,
        Volts::new(bb(12.0))?,
        Amps::new(bb(0.1))?,
    )?);
    Ok(())
}

/// Pins and a counter that only exist to call the `embedded-hal` routines.
struct Pin(bool);
impl embedded_hal::digital::ErrorType for Pin {
    type Error = core::convert::Infallible;
}
impl embedded_hal::digital::OutputPin for Pin {
    fn set_low(&mut self) -> Result<(), Self::Error> {
        self.0 = false;
        Ok(())
    }
    fn set_high(&mut self) -> Result<(), Self::Error> {
        self.0 = true;
        Ok(())
    }
}
impl embedded_hal::digital::InputPin for Pin {
    fn is_high(&mut self) -> Result<bool, Self::Error> {
        Ok(bb(self.0))
    }
    fn is_low(&mut self) -> Result<bool, Self::Error> {
        Ok(!bb(self.0))
    }
}
struct Counter(u32);
impl kickguard::diagnosis::hal::TickCounter for Counter {
    fn ticks(&mut self) -> u32 {
        self.0 = self.0.wrapping_add(bb(3));
        self.0
    }
}
struct Delay;
impl embedded_hal::delay::DelayNs for Delay {
    fn delay_ns(&mut self, ns: u32) {
        bb(ns);
    }
}

fn hal_routines() {
    use kickguard::diagnosis::hal::{measure_flyback, time_current_window, time_flyback};
    let (mut drive, mut a, mut b) = (Pin(true), Pin(bb(true)), Pin(bb(false)));
    let mut c = Counter(bb(0));
    let _ = bb(time_flyback(&mut drive, &mut a, &mut c, bb(100)));
    let _ = bb(time_current_window(
        &mut drive,
        &mut a,
        &mut b,
        &mut c,
        bb(100),
    ));
    let _ = bb(measure_flyback(
        &mut drive,
        &mut b,
        &mut Delay,
        bb(1000),
        bb(1),
        bb(100),
    ));
}

#[entry]
fn main() -> ! {
    let _ = bb(diagnosis());
    let _ = bb(armature());
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
    #[cfg(feature = "force-overflow")]
    {
        bb(bb(u32::MAX) + bb(1u32)); // reachable only with overflow checks: the checked link must fail
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
