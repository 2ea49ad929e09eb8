//! Property tests: hostile inputs never panic and never give NaN or ∞ inside `Ok`, results are
//! physically possible, errors name an input; physical invariants hold over random valid
//! circuits.
//!
//! Run length: `PROPTEST_CASES` (proptest's own variable; default 256 per property in CI). The
//! long run is `PROPTEST_CASES=1000000 cargo test --release --all-features --test properties`.
//!
//! Sources of the invariants, beside each: conservation of energy; the monotonicity of the RL
//! decay in its clamp voltage and of the diode law in temperature and voltage (Shockley equation
//! with the SPICE2 temperature law, Nagel 1975); the R → 0 and Vc → 0 limits of the RL decay
//! (Horowitz & Hill, The Art of Electronics, 3rd ed.).

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::{single_pulse_avalanche_energy, ConstantClamp};
use kickguard::clamp::sizing::ZenerSizing;
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{
    ActiveClamp, Clamp, Decay, Operating, Sample, Side, SwitchOff, SwitchedFreewheel,
};
use kickguard::coil::Coil;
use kickguard::diagnosis::classify::{Entry, MAX_WINDOWS};
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::{Condition, Verdict, Windows};
use kickguard::diode::{
    fit_three_points, fit_two_points, BandGap, Diode, DiodeParams, DropPoint, Ideality, Xti,
};
use kickguard::input::rail::{
    rail_off_check, rail_off_together, RailLoad, RailSource, UnpoweredRail,
};
use kickguard::input::resistor::{
    max_resistor, min_resistor, InjectionLimits, LogicHigh, UpperLimits,
};
use kickguard::input::{Pin, SignalRange};
use kickguard::pwm::{hold_duty, hysteretic, time_to_current, Freewheel, HoldOperatingPoint};
use kickguard::rating::{average_power, single_pulse, PulseRating, ThermalPath};
use kickguard::timing::to_ticks;
use kickguard::varistor::Varistor;
use kickguard::{
    Amps, Duty, Error, Farads, Henries, Hertz, Joules, Ohms, PerKelvin, Seconds, Temperature,
    Volts, Watts,
};
use proptest::prelude::*;

/// Hostile f32s: specials, subnormals, extremes, every bit pattern, and ordinary values.
fn hostile() -> impl Strategy<Value = f32> {
    prop_oneof![
        Just(f32::NAN),
        Just(f32::INFINITY),
        Just(f32::NEG_INFINITY),
        Just(0.0f32),
        Just(-0.0f32),
        Just(f32::MIN_POSITIVE),
        Just(1e-40f32),
        Just(f32::MAX),
        Just(-f32::MAX),
        Just(1e-30f32),
        Just(1e12f32),
        Just(-1e12f32),
        any::<f32>(),
        -1e3f32..1e3,
        1e-6f32..1e2,
    ]
}

/// Extreme but valid magnitudes (within the quantity bounds) of either sign.
fn extreme() -> impl Strategy<Value = f32> {
    prop_oneof![
        Just(1e12f32),
        Just(1e-30f32),
        Just(-1e12f32),
        Just(1.0f32),
        1e-30f32..1e12,
        -1e12f32..-1e-30,
    ]
}

/// An `Ok` value must be finite; an `Err` must name its input.
fn ok_finite(r: Result<f32, Error>) -> Result<(), TestCaseError> {
    match r {
        Ok(v) => prop_assert!(v.is_finite(), "non-finite Ok {v}"),
        Err(e) => prop_assert!(!e.input.is_empty()),
    }
    Ok(())
}

/// An `Ok` value must be finite and ≥ 0 (a dissipated energy, a power, a time).
fn ok_non_negative(r: Result<f32, Error>) -> Result<(), TestCaseError> {
    if let Ok(v) = r {
        prop_assert!(v.is_finite() && v >= 0.0, "impossible value {v}");
    }
    ok_finite(r)
}

fn t(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

/// Every figure of a decay is finite and physically possible.
fn check_decay(d: &Decay) -> Result<(), TestCaseError> {
    let e = d.energy;
    for x in [
        d.time.value(),
        d.charge.value(),
        e.released_by_coil.value(),
        e.coil_resistance.value(),
        e.resistor.value(),
        e.diodes.value(),
        e.zener.value(),
        e.varistor.value(),
        e.switch.value(),
        e.clamp_total.value(),
    ] {
        prop_assert!(
            x.is_finite() && x >= 0.0,
            "impossible decay figure {x} in {d:?}"
        );
    }
    prop_assert!(e.from_supply.value().is_finite());
    Ok(())
}

/// A clamp of each kind from hostile parts (`None` when the parts do not validate).
fn clamp_of(kind: usize, r: Ohms, z: Option<Breakdown>, x: f32) -> Option<Clamp> {
    let d = Diode::Law(DiodeParams::SILICON);
    let fixed = Diode::FixedDrop(Volts::new(x).ok()?);
    Some(match kind {
        0 => Clamp::FreewheelDiode(d),
        1 => Clamp::FreewheelDiode(fixed),
        2 => Clamp::ResistorDiode {
            resistor: r,
            diode: d,
        },
        3 => Clamp::ZenerDiode {
            zener: z?,
            diode: d,
        },
        4 => Clamp::TvsAcrossCoil(z?),
        5 => Clamp::Varistor(
            Varistor::new(
                Volts::new(x).ok()?,
                Amps::new(1e-3).ok()?,
                30.0,
                PerKelvin::ZERO,
                t(25.0),
            )
            .ok()?,
        ),
        6 => Clamp::AcrossSwitch(z?),
        7 => Clamp::Avalanche(z?),
        8 => Clamp::ActiveClamp(ActiveClamp {
            zener: z?,
            zener_current: Amps::new(x).ok()?,
            gate_threshold: Volts::new(x).ok()?,
            transconductance_a_per_v2: Some(x),
        }),
        9 => Clamp::SwitchedFreewheel(SwitchedFreewheel {
            diode: fixed,
            zener: z?,
            bypass: r,
        }),
        _ => Clamp::HBridgeFastDecay(d),
    })
}

proptest! {
    #[test]
    fn constructors_never_let_non_finite_through(x in hostile()) {
        ok_finite(Volts::new(x).map(|v| v.value()))?;
        ok_finite(Amps::new(x).map(|v| v.value()))?;
        ok_finite(Ohms::new(x).map(|v| v.value()))?;
        ok_finite(Henries::new(x).map(|v| v.value()))?;
        ok_finite(Farads::new(x).map(|v| v.value()))?;
        ok_finite(Seconds::new(x).map(|v| v.value()))?;
        ok_finite(Joules::new(x).map(|v| v.value()))?;
        ok_finite(Watts::new(x).map(|v| v.value()))?;
        ok_finite(Hertz::new(x).map(|v| v.value()))?;
        ok_finite(Duty::new(x).map(|v| v.value()))?;
        ok_finite(PerKelvin::new(x).map(|v| v.value()))?;
        ok_finite(Temperature::from_celsius(x).map(|v| v.kelvin()))?;
        ok_finite(Temperature::from_kelvin(x).map(|v| v.kelvin()))?;
        ok_finite(Ideality::new(x).map(|v| v.value()))?;
        ok_finite(BandGap::ev(x).map(|v| v.value_ev()))?;
        ok_finite(Xti::new(x).map(|v| v.value()))?;
        // Formatting any value is panic-free and non-empty.
        if let Ok(v) = Volts::new(x) {
            let (plain, fixed) = (format!("{}", v), format!("{:.3}", v));
            prop_assert!(!plain.is_empty() && !fixed.is_empty());
        }
    }

    #[test]
    fn tolerance_helpers_never_panic_or_give_nan(dv in hostile(), k in hostile(), th in hostile(), kind in 0usize..11) {
        // Diode spread, varistor tolerance and the comparator's crossing current, for any input.
        for d in [Diode::Law(DiodeParams::SILICON), Diode::FixedDrop(Volts::new(0.7).unwrap())] {
            if let Ok(v) = Volts::new(dv) {
                if let Ok(shifted) = d.shifted(v) {
                    ok_finite(shifted.forward_drop(Amps::new(0.1).unwrap(), t(25.0)).map(|x| x.value()))?;
                }
            }
        }
        let mov = Varistor::new(Volts::new(39.0).unwrap(), Amps::new(1e-3).unwrap(), 30.0, PerKelvin::ZERO, t(25.0)).unwrap();
        if let Ok(m) = mov.scaled(k) {
            ok_finite(m.voltage(Amps::new(0.1).unwrap(), t(25.0)).map(|x| x.value()))?;
        }
        let coil = Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap();
        let z = Breakdown::ideal(Volts::new(40.0).unwrap()).ok();
        if let (Some(c), Ok(v)) = (clamp_of(kind, Ohms::new(10.0).unwrap(), z, 1.0), Volts::new(th)) {
            if let Ok(off) = SwitchOff::new(&coil, &c, Side::Low, &Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(0.4).unwrap(), t(25.0))) {
                if let Ok(i) = off.current_at_switch_voltage(v) {
                    prop_assert!(i.value() >= 0.0 && i.value() < 0.4);
                }
            }
        }
    }

    #[test]
    fn chains_of_products_never_reach_infinity(r in extreme(), i in extreme(), s in extreme(), f in extreme()) {
        // Issue: a chain of three products of valid extremes gave +∞ J. Every product is checked.
        let (Ok(r), Ok(i)) = (Ohms::new(r.abs()), Amps::new(i)) else { return Ok(()); };
        let (Ok(s), Ok(f)) = (Seconds::new(s.abs()), Hertz::new(f.abs())) else { return Ok(()); };
        if let Ok(v) = r * i {
            prop_assert!(v.value().is_finite() && v.value().abs() <= 1e12);
            if let Ok(p) = v * i {
                prop_assert!(p.value().abs() <= 1e12);
                if let Ok(e) = p * s {
                    prop_assert!(e.value().abs() <= 1e12);
                    if let Ok(p2) = e * f {
                        prop_assert!(p2.value().abs() <= 1e12);
                    }
                    ok_finite((e + e).map(|x| x.value()))?;
                    ok_finite((e - e).map(|x| x.value()))?;
                }
            }
            ok_finite(v.over(r).map(|x| x.value()))?;
        }
        if let Ok(l) = Henries::new(s.value().max(1e-30)) {
            ok_finite(l.stored_energy(i).map(|x| x.value()))?;
            ok_finite(l.time_constant(r).map(|x| x.value()))?;
        }
        ok_finite(f.period().map(|x| x.value()))?;
    }

    #[test]
    fn diode_functions_never_panic_or_give_nan(
        is in hostile(), n in hostile(), rs in hostile(), eg in hostile(), xti in hostile(), tn in hostile(),
        i in hostile(), v in hostile(), r in hostile(), c in hostile(),
    ) {
        let built = (|| -> Result<DiodeParams, Error> {
            DiodeParams::new(Amps::new(is)?, Ideality::new(n)?, Ohms::new(rs)?, BandGap::ev(eg)?,
                             Xti::new(xti)?, Temperature::from_celsius(tn)?)
        })();
        let d = built.unwrap_or(DiodeParams::SILICON);
        if let (Ok(i), Ok(temp)) = (Amps::new(i), Temperature::from_celsius(c)) {
            ok_non_negative(d.forward_drop(i, temp).map(|x| x.value()))?;
            ok_non_negative(d.saturation_current(temp).map(|x| x.value()))?;
            ok_finite(d.forward_tempco_v_per_k(i, temp))?;
            if let Ok(v) = Volts::new(v) {
                ok_non_negative(d.reverse_leakage(v, temp).map(|x| x.value()))?;
                ok_finite(d.junction_temperature(i, v).map(|x| x.kelvin()))?;
                ok_finite(d.forward_current(v, temp).map(|x| x.value()))?;
                if let Ok(r) = Ohms::new(r) {
                    ok_finite(d.series_current(v, r, temp).map(|x| x.value()))?;
                    ok_finite(d.with_rs(r).map(|x| x.rs().value()))?;
                }
                let fixed = Diode::FixedDrop(v);
                ok_non_negative(fixed.forward_drop(i, temp).map(|x| x.value()))?;
            }
        }
    }

    #[test]
    fn fits_never_panic(
        a in hostile(), b in hostile(), c in hostile(), va in hostile(), vb in hostile(), vc in hostile(),
        eg in hostile(), tc in hostile(),
    ) {
        let pts = (DropPoint::new(a, va), DropPoint::new(b, vb), DropPoint::new(c, vc));
        let eg = BandGap::ev(eg).unwrap_or(BandGap::SILICON);
        if let (Ok(p1), Ok(p2), Ok(p3)) = pts {
            if let Ok(f) = fit_two_points([p1, p2], t(25.0), Ohms::new(0.0).unwrap(), eg, Xti::PN) {
                prop_assert!(f.n().value().is_finite() && f.is().value() > 0.0);
            }
            if let Ok(f) = fit_three_points([p1, p2, p3], t(25.0), eg, Xti::PN) {
                prop_assert!(f.rs().value().is_finite() && f.rs().value() >= 0.0);
            }
            if let Ok(f) = DiodeParams::SILICON.with_eg_from_point(p1, t(80.0)) {
                prop_assert!(f.eg().value_ev().is_finite());
            }
        }
        if let Ok(i) = Amps::new(a) {
            if let Ok(f) = DiodeParams::SILICON.with_eg_from_tempco(i, tc) {
                prop_assert!(f.eg().value_ev().is_finite());
            }
        }
    }

    #[test]
    fn clamp_engine_never_panics_or_gives_nan(
        l in hostile(), r in hostile(), vs in hostile(), i0 in hostile(), i1 in hostile(),
        vz in hostile(), kind in 0usize..11, c in hostile(), c2 in hostile(), dt in hostile(),
        x in hostile(), high in any::<bool>(),
    ) {
        let (Ok(l), Ok(r)) = (Henries::new(l), Ohms::new(r)) else { return Ok(()); };
        let Ok(coil) = Coil::copper(l, r, t(20.0)) else { return Ok(()); };
        let (Ok(vs), Ok(i0), Ok(i1)) = (Volts::new(vs), Amps::new(i0), Amps::new(i1)) else { return Ok(()); };
        let (Ok(temp), Ok(temp2)) = (Temperature::from_celsius(c), Temperature::from_celsius(c2)) else { return Ok(()); };
        let z = Volts::new(vz).ok().and_then(|v| Breakdown::ideal(v).ok());
        let Some(clamp) = clamp_of(kind, r, z, x) else { return Ok(()); };
        let side = if high { Side::High } else { Side::Low };
        let op = Operating { supply: vs, start_current: i0, winding: temp, diodes: temp2, breakdown: temp };
        if let Ok(off) = SwitchOff::new(&coil, &clamp, side, &op) {
            prop_assert!(off.peak_switch_voltage().value().is_finite());
            prop_assert!(off.peak_output_voltage().value().is_finite());
            prop_assert!(off.clamp_voltage_at_start().value().is_finite());
            ok_non_negative(off.time_to(i1).map(|x| x.value()))?;
            if let Ok(dec) = off.decay_to(i1) { check_decay(&dec)?; }
            if let Ok(dec) = off.decay_to_end() { check_decay(&dec)?; }
            if let Ok(p) = off.profile(&[i1, Amps::new(i1.value() * 0.5).unwrap_or(i1)]) {
                prop_assert!(p.times[0] <= p.times[1]);
                check_decay(&p.decay)?;
            }
            ok_non_negative(off.time_above(vs).map(|x| x.value()))?;
            ok_finite(off.switch_voltage_at(i1).map(|x| x.value()))?;
            let mut buf = [Sample::default(); 16];
            if let Ok(dt) = Seconds::new(dt) {
                if let Ok(n) = off.sample(dt, i1, &mut buf) {
                    prop_assert!(n <= 16);
                    for s in &buf[..n] {
                        prop_assert!(s.time.value().is_finite() && s.current.value().is_finite()
                            && s.current.value() >= 0.0 && s.switch_voltage.value().is_finite()
                            && s.output_voltage.value().is_finite());
                    }
                }
                // Sampling to 0 A is bounded work and stays finite.
                if let Ok(n) = off.sample(dt, Amps::new(0.0).unwrap(), &mut buf) {
                    prop_assert!(n <= 16);
                }
            }
        }
        if let Ok(cc) = ConstantClamp::new(l, r, vs, i0) {
            ok_non_negative(cc.time_to(i1).map(|x| x.value()))?;
            if let Ok(dd) = cc.decay_to(i1) {
                prop_assert!(dd.clamp_energy.value().is_finite() && dd.resistive_energy.value() >= 0.0);
            }
        }
        ok_non_negative(single_pulse_avalanche_energy(l, i0, vs, Volts::new(x).unwrap_or(vs)).map(|e| e.value()))?;
        if let Ok(cap) = Farads::new(dt) {
            let sn = RcSnubber { resistor: r, capacitor: cap };
            if let Ok(s) = SnubberSwitchOff::new(&coil, &sn, vs, i0, temp) {
                if let Ok(resp) = s.response() {
                    prop_assert!(resp.peak_switch_voltage.value().is_finite()
                        && resp.energy_in_resistor.value() >= 0.0 && resp.damping_ratio.is_finite());
                }
                ok_non_negative(s.settle_time(i1).map(|x| x.value()))?;
                let mut buf = [Sample::default(); 4];
                if let Ok(dts) = Seconds::new(x) {
                    if let Ok(n) = s.sample(dts, &mut buf) {
                        for smp in &buf[..n] {
                            prop_assert!(smp.current.value().is_finite() && smp.switch_voltage.value().is_finite());
                        }
                    }
                }
            }
        }
    }

    #[test]
    fn sizing_never_panics(a in hostile(), b in hostile(), c in hostile(), d in hostile()) {
        // Every field of the struct literal hostile in turn (the sizing validates what it takes).
        let coil = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(), t(20.0)).unwrap();
        let (Ok(rz), Ok(izt), Ok(vs), Ok(i0)) = (Ohms::new(a), Amps::new(b), Volts::new(c), Amps::new(d)) else { return Ok(()); };
        let s = ZenerSizing {
            coil, diode: Diode::Law(DiodeParams::SILICON), zener_rz: rz, zener_izt: izt, v_supply: vs,
            i_start: i0, t_coil: t(20.0), t_clamp: t(40.0), switch_rating: Volts::new(60.0).unwrap(),
            rating_fraction: Duty::new(0.9).unwrap(), release_current: Amps::new(0.05).unwrap(),
            max_release_time: Seconds::new(0.02).unwrap(),
        };
        if let Ok(w) = s.window() {
            prop_assert!(w.min.value().is_finite() && w.min <= w.max && w.min.value() > 0.0);
        }
    }

    #[test]
    fn timing_pwm_rating_input_never_panic(
        a in hostile(), b in hostile(), c in hostile(), d in hostile(), e in hostile(), top in any::<u32>(),
    ) {
        let coil = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(), t(20.0)).unwrap();
        if let (Ok(v), Ok(i)) = (Volts::new(a), Amps::new(b)) {
            ok_non_negative(time_to_current(&coil, v, t(25.0), i).map(|x| x.value()))?;
            // Issue: a struct-literal freewheel with a −1 V drop gave a duty and negative powers.
            let Ok(fw) = Freewheel::new(Volts::new(c).unwrap_or(v), Volts::new(e).unwrap_or(v)) else { return Ok(()); };
            prop_assert!(fw.diode_drop().value() > 0.0 && fw.zener().value() >= 0.0);
            ok_finite(hold_duty(&coil, v, t(25.0), &fw, i).map(|x| x.value()))?;
            if let (Ok(f), Ok(dd)) = (Hertz::new(c), Duty::new(d)) {
                if let Ok(p) = HoldOperatingPoint::new(&coil, v, t(25.0), &fw, f, dd) {
                    ok_non_negative(p.mean_current().map(|x| x.value()))?;
                    if let Ok(rp) = p.ripple() {
                        prop_assert!(rp.peak_to_peak.value() >= 0.0 && rp.i_min <= rp.i_max);
                    }
                    if let Ok(pw) = p.freewheel_power() {
                        prop_assert!(pw.diode.value() >= 0.0 && pw.zener.value() >= 0.0);
                    }
                    ok_finite(p.frequency_for_ripple(i).map(|x| x.value()))?;
                    let _ = p.compare_value(top);
                }
            }
            if let Ok(i2) = Amps::new(e) {
                if let Ok(h) = hysteretic(&coil, v, t(25.0), &fw, i, i2) {
                    prop_assert!(h.frequency.value() > 0.0 && h.duty.value() <= 1.0);
                }
            }
        }
        if let (Ok(s), Ok(f)) = (Seconds::new(a), Hertz::new(b)) {
            let _ = to_ticks(s, f);
        }
        if let (Ok(x), Ok(y)) = (Joules::new(a), Joules::new(b)) {
            if let Ok(rating) = PulseRating::new(y) {
                if let Ok(v) = single_pulse(x, rating) { prop_assert!(v.margin.is_finite()); }
            }
            if let Ok(f) = Hertz::new(c) { ok_finite(average_power(x, f).map(|p| p.value()))?; }
        }
        if let (Ok(ta), Ok(tj)) = (Temperature::from_celsius(c), Temperature::from_celsius(d)) {
            let path = ThermalPath { resistance_k_per_w: a, ambient: ta, junction_max: tj };
            ok_non_negative(path.max_power().map(|p| p.value()))?;
            if let Ok(w) = Watts::new(b) { if let Ok(ch) = path.check(w) { prop_assert!(ch.junction.kelvin().is_finite()); } }
            if let (Ok(en), Ok(s)) = (Joules::new(e), Seconds::new(b)) { ok_finite(path.max_repetition_rate(en, s).map(|f| f.value()))?; }
        }
    }

    #[test]
    fn input_protection_never_panics(
        a in hostile(), b in hostile(), c in hostile(), d in hostile(), e in hostile(), f in hostile(), fixed in any::<bool>(),
    ) {
        // Struct literals with hostile fields: every consumer validates them.
        let clamp = if fixed { Diode::FixedDrop(Volts::new(e).unwrap_or(Volts::new(0.3).unwrap())) } else { Diode::Law(DiodeParams::SILICON) };
        let (Ok(vdd), Ok(temp)) = (Volts::new(f), Temperature::from_celsius(e)) else { return Ok(()); };
        let pin = Pin { vdd, clamp, temperature: temp };
        if let (Ok(vsig), Ok(r)) = (Volts::new(a), Ohms::new(b)) {
            ok_finite(pin.injection(vsig, r).map(|x| x.value()))?;
            ok_finite(pin.pin_voltage(vsig, r).map(|x| x.value()))?;
            if let (Ok(load), Ok(allowed)) = (Ohms::new(c), Volts::new(d)) {
                if let Ok(off) = rail_off_check(&pin, vsig, r, &UnpoweredRail { load, allowed }) {
                    prop_assert!(off.rail_voltage.value() >= 0.0 && off.current.value() >= 0.0);
                }
                // Several lines together: finite, never below one of them alone (KCL: more
                // sources only add current into the same node).
                let src = [RailSource { v_signal: vsig, r_series: r, count: 3 }];
                if let (Ok(all), Ok(one)) = (
                    rail_off_together(&pin, &src, &UnpoweredRail { load, allowed }),
                    rail_off_check(&pin, vsig, r, &UnpoweredRail { load, allowed }),
                ) {
                    prop_assert!(all.rail_voltage.value().is_finite() && all.current.value().is_finite());
                    prop_assert!(all.rail_voltage.value() >= one.rail_voltage.value() * (1.0 - 1e-4) - 1e-6);
                }
            }
        }
        if let (Ok(lo), Ok(hi), Ok(tl), Ok(th)) = (Volts::new(a), Volts::new(b), Volts::new(c), Volts::new(d)) {
            let s = SignalRange { steady_min: lo, steady_max: hi, transient_min: tl, transient_max: th,
                                  transient_width: Seconds::new(1e-3).unwrap() };
            if let (Ok(x), Ok(y)) = (Amps::new(e), Amps::new(f)) {
                // Issue: an inverted range passed as 0 Ω. Now it must be refused or give R ≥ 0.
                let r = min_resistor(&pin, &s, InjectionLimits { positive: x, negative: y });
                if r.is_ok() { prop_assert!(s.validate().is_ok()); }
                ok_non_negative(r.map(|r| r.value()))?;
            }
        }
        if let (Ok(i), Ok(v1), Ok(v2)) = (Amps::new(a), Volts::new(b), Volts::new(c)) {
            let up = UpperLimits { logic_high: Some(LogicHigh { leakage: i, signal_high_min: v1, v_ih: v2 }),
                                   leakage: Some((i, v1)), ..UpperLimits::default() };
            if let Ok((Some(r), _)) = max_resistor(&up) { prop_assert!(r.value() > 0.0); }
            if let Ok(load) = RailLoad::new(i) { if let Ok(v) = load.check(i) { prop_assert!(v.margin.is_finite()); } }
        }
    }

    #[test]
    fn diagnosis_run_time_never_panics(rows in proptest::collection::vec((any::<u32>(), any::<u32>(), 0u32..8), 0..10), ticks in any::<u32>(), samples in proptest::collection::vec(hostile(), 0..20), h in hostile()) {
        // Issue: a window [u32::MAX, u32::MAX] subtracted with overflow. Extremes are now common.
        let table: Vec<[u32; 3]> = rows.iter().map(|&(a, b, c)| [a, b, c]).collect();
        let w = Windows::from_rows(&table);
        let _ = w.classify(ticks);
        let _ = w.classify(u32::MAX);
        let _ = w.entries().count();
        let edge = Windows::from_rows(&[[u32::MAX, u32::MAX, 1], [0, u32::MAX, 2], [ticks, ticks, 0]]);
        prop_assert_eq!(edge.classify(ticks), Verdict::Healthy);
        let amps: Vec<Amps> = samples.iter().filter_map(|&x| Amps::new(x).ok()).collect();
        if let Ok(h) = Seconds::new(h) {
            if let Ok(f) = fit_decay(&amps, h) {
                prop_assert!(f.tau.value().is_finite() && f.clamp_over_r.is_finite());
            }
        }
        let mut none: VerdictHistory<0> = VerdictHistory::new();
        none.push(Verdict::Healthy);
        prop_assert_eq!(none.latest(), None);
        let mut hist: VerdictHistory<3> = VerdictHistory::new();
        for (k, _) in rows.iter().enumerate() {
            hist.push(if k % 2 == 0 { Verdict::Healthy } else { Verdict::Unexplained });
        }
        prop_assert!(hist.consecutive(Verdict::Healthy) <= 3);
    }

    // ---------------- physical invariants ----------------

    #[test]
    fn energy_balance_closes(l in 1e-4f32..10.0, r in 0.1f32..2000.0, i0 in 1e-3f32..20.0, vz in 5.0f32..100.0, kind in 0usize..11, frac in 1e-4f32..0.5) {
        // Conservation of energy: ½L(I₀² − I₁²) + E_supply = Σ dissipated.
        let coil = Coil::fixed(Henries::new(l).unwrap(), Ohms::new(r).unwrap()).unwrap();
        let vs = 24.0f32;
        let z = Breakdown::ideal(Volts::new(vz + vs).unwrap()).unwrap();
        let Some(clamp) = clamp_of(kind, Ohms::new(r).unwrap(), Some(z), 0.8) else { return Ok(()); };
        let off = SwitchOff::new(&coil, &clamp, Side::Low, &Operating::uniform(Volts::new(vs).unwrap(), Amps::new(i0).unwrap(), t(25.0))).unwrap();
        let dec = off.decay_to(Amps::new(i0 * frac).unwrap()).unwrap();
        let e = dec.energy;
        let lhs = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
        let rhs: f64 = [e.coil_resistance, e.resistor, e.diodes, e.zener, e.varistor, e.switch].iter().map(|x| x.value() as f64).sum();
        prop_assert!(((lhs - rhs) / lhs).abs() < 1e-3, "{lhs} vs {rhs}");
    }

    #[test]
    fn higher_clamp_voltage_is_never_slower(l in 1e-3f32..5.0, r in 1.0f32..1000.0, i0 in 1e-2f32..5.0, v1 in 1.0f32..60.0, dv in 0.1f32..40.0) {
        // The RL decay into a higher clamp voltage is faster, and the clamp takes a larger share.
        let coil = Coil::fixed(Henries::new(l).unwrap(), Ohms::new(r).unwrap()).unwrap();
        let d = Diode::Law(DiodeParams::SILICON);
        let mk = |v: f32| Clamp::ZenerDiode { zener: Breakdown::ideal(Volts::new(v).unwrap()).unwrap(), diode: d };
        let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(i0).unwrap(), t(25.0));
        let a = SwitchOff::new(&coil, &mk(v1), Side::Low, &op).unwrap().decay_to_end().unwrap();
        let b = SwitchOff::new(&coil, &mk(v1 + dv), Side::Low, &op).unwrap().decay_to_end().unwrap();
        prop_assert!(b.time.value() <= a.time.value() * (1.0 + 1e-5));
        let share = |x: &Decay| x.energy.clamp_total.value() / x.energy.released_by_coil.value();
        prop_assert!(share(&b) >= share(&a) * (1.0 - 1e-4), "{} < {}", share(&b), share(&a));
    }

    #[test]
    fn spice_breakdown_tolerance_is_monotone(bv in 30.0f32..60.0, k in 0.85f32..1.15, nbv in 0.5f32..10.0, c in -40.0f32..125.0) {
        // A higher breakdown (tolerance, temperature) clamps harder: faster decay, higher peak
        // (monotone loop law, SPICE breakdown of Nagel 1975).
        let coil = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(), t(20.0)).unwrap();
        let b = Breakdown::new(BreakdownLaw::Spice { bv: Volts::new(bv).unwrap(), ibv: Amps::new(1e-3).unwrap(),
            nbv: Ideality::new(nbv).unwrap(), rs: Ohms::new(0.5).unwrap() }, PerKelvin::new(1e-3).unwrap(), t(25.0)).unwrap();
        let op = Operating::uniform(Volts::new(26.4).unwrap(), Amps::new(0.45).unwrap(), t(c));
        let lo = SwitchOff::new(&coil, &Clamp::AcrossSwitch(b), Side::Low, &op).unwrap();
        let hi = SwitchOff::new(&coil, &Clamp::AcrossSwitch(b.scaled(k.max(1.0)).unwrap()), Side::Low, &op).unwrap();
        prop_assert!(hi.peak_switch_voltage() >= lo.peak_switch_voltage());
        let end = Amps::new(0.0045).unwrap();
        prop_assert!(hi.time_to(end).unwrap().value() <= lo.time_to(end).unwrap().value() * (1.0 + 1e-5));
    }

    #[test]
    fn limits_of_the_constant_clamp(l in 1e-3f32..5.0, i0 in 1e-2f32..10.0, vc in 1.0f32..100.0) {
        // R → 0: time L·I₀/Vc; Vc → 0: τ·ln(I₀/I₁) (Horowitz & Hill).
        let i0a = Amps::new(i0).unwrap();
        let tiny_r = ConstantClamp::new(Henries::new(l).unwrap(), Ohms::new(1e-7).unwrap(), Volts::new(vc).unwrap(), i0a).unwrap();
        let t0 = tiny_r.time_to(Amps::new(0.0).unwrap()).unwrap().value();
        prop_assert!(((t0 - l * i0 / vc) / (l * i0 / vc)).abs() < 1e-4);
        let r = 10.0f32;
        let small_vc = ConstantClamp::new(Henries::new(l).unwrap(), Ohms::new(r).unwrap(), Volts::new(1e-6).unwrap(), i0a).unwrap();
        let t1 = small_vc.time_to(Amps::new(i0 / 10.0).unwrap()).unwrap().value();
        let want = l / r * 10f32.ln();
        prop_assert!(((t1 - want) / want).abs() < 1e-4, "{t1} vs {want}");
    }

    #[test]
    fn hotter_diode_never_drops_more(i in 1e-6f32..10.0, c in -55.0f32..170.0, dc in 0.5f32..5.0) {
        // Shockley + SPICE2 law: at fixed current the drop falls with temperature.
        for d in [DiodeParams::SILICON, DiodeParams::SCHOTTKY] {
            let a = d.forward_drop(Amps::new(i).unwrap(), t(c)).unwrap().value();
            let b = d.forward_drop(Amps::new(i).unwrap(), t(c + dc)).unwrap().value();
            prop_assert!(b <= a, "{d:?} I={i} {c}→{}: {a} → {b}", c + dc);
        }
    }

    #[test]
    fn injection_grows_with_signal(v in -50.0f32..100.0, dv in 0.01f32..10.0, r in 100.0f32..1e6, c in -40.0f32..125.0) {
        let pin = Pin::new(Volts::new(3.3).unwrap(), Diode::Law(DiodeParams::SILICON), t(c)).unwrap();
        let a = pin.injection(Volts::new(v).unwrap(), Ohms::new(r).unwrap()).unwrap().value();
        let b = pin.injection(Volts::new(v + dv).unwrap(), Ohms::new(r).unwrap()).unwrap().value();
        prop_assert!(b >= a);
    }

    #[test]
    fn healthy_measurement_never_called_a_fault(lo in 0u32..100_000, width in 0u32..100_000, faults in proptest::collection::vec((any::<u32>(), any::<u32>(), 1u32..6), 0..6), pick in 0.0f64..=1.0) {
        let mut e = [Entry::EMPTY; MAX_WINDOWS];
        e[0] = Entry { lo, hi: lo + width, condition: Condition::Healthy };
        let mut n = 1;
        for (a, b, code) in faults.into_iter().take(MAX_WINDOWS - 1) {
            e[n] = Entry { lo: a.min(b), hi: a.max(b), condition: Condition::from_code(code).unwrap() };
            n += 1;
        }
        let w = Windows::from_entries(e, n);
        let ticks = lo + (width as f64 * pick) as u32;
        prop_assert_eq!(w.classify(ticks), Verdict::Healthy);
    }
}

/// Breakdown laws with hostile parameters never panic either.
#[test]
fn breakdown_constructors_with_specials() {
    let specials = [f32::NAN, f32::INFINITY, -1.0, 0.0, 1e-40, 1e30, 18.0];
    for &a in &specials {
        for &b in &specials {
            let (Ok(v), Ok(i), Ok(r)) = (Volts::new(a), Amps::new(b), Ohms::new(b.abs())) else {
                continue;
            };
            let nbv = Ideality::new(b).unwrap_or(Ideality::new(1.0).unwrap());
            for law in [
                BreakdownLaw::Datasheet {
                    vz: v,
                    izt: i,
                    rz: r,
                },
                BreakdownLaw::Spice {
                    bv: v,
                    ibv: i,
                    nbv,
                    rs: r,
                },
                BreakdownLaw::FlooredAtBv {
                    bv: v,
                    ibv: i,
                    nbv,
                    rs: r,
                },
            ] {
                let tc = PerKelvin::new(a).unwrap_or(PerKelvin::ZERO);
                if let Ok(z) = Breakdown::new(law, tc, t(25.0)) {
                    if let Ok(x) = z.voltage(Amps::new(0.1).unwrap(), t(100.0)) {
                        assert!(x.value().is_finite());
                    }
                    if let Ok(s) = z.scaled(b) {
                        assert!(s.nominal_voltage().value().is_finite());
                    }
                }
            }
        }
    }
}
