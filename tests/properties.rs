//! Property tests: hostile inputs never panic and never give NaN or ∞ inside `Ok`; physical
//! invariants hold over random valid circuits.
//!
//! Run length: `PROPTEST_CASES` (proptest's own variable; default 256 per property in CI). The
//! long run is `PROPTEST_CASES=100000 cargo test --release --all-features --test properties`.
//!
//! Sources of the invariants, beside each: conservation of energy; the monotonicity of the RL
//! decay in its clamp voltage and of the diode law in temperature and voltage (Shockley equation
//! with the SPICE2 temperature law, Nagel 1975); the R → 0 and Vc → 0 limits of the RL decay
//! (Horowitz & Hill, The Art of Electronics, 3rd ed.).

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{Clamp, Sample, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diagnosis::classify::{Entry, MAX_WINDOWS};
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::{Condition, Verdict, Windows};
use kickguard::diode::{fit_three_points, fit_two_points, DiodeParams, DropPoint};
use kickguard::input::resistor::{min_resistor, InjectionLimits};
use kickguard::input::{Pin, PinClamp, SignalRange};
use kickguard::pwm::{hold_duty, hysteretic, time_to_current, Freewheel, HoldOperatingPoint};
use kickguard::rating::{average_power, single_pulse, ThermalPath};
use kickguard::timing::to_ticks;
use kickguard::{Amps, Error, Farads, Henries, Joules, Ohms, Seconds, Temperature, Volts, Watts};
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
        any::<f32>(),
        -1e3f32..1e3,
        1e-6f32..1e2,
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

fn t(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
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
        ok_finite(Temperature::from_celsius(x).map(|v| v.kelvin()))?;
        ok_finite(Temperature::from_kelvin(x).map(|v| v.kelvin()))?;
    }

    #[test]
    fn diode_functions_never_panic_or_give_nan(
        is in hostile(), n in hostile(), rs in hostile(), eg in hostile(), xti in hostile(),
        i in hostile(), v in hostile(), r in hostile(), c in hostile(),
    ) {
        let tn = t(27.0);
        let d = match (Amps::new(is), Ohms::new(rs)) {
            (Ok(is), Ok(rs)) => DiodeParams::new(is, n, rs, eg, xti, tn).unwrap_or(DiodeParams::SILICON),
            _ => DiodeParams::SILICON,
        };
        if let (Ok(i), Ok(temp)) = (Amps::new(i), Temperature::from_celsius(c)) {
            ok_finite(d.forward_drop(i, temp).map(|x| x.value()))?;
            ok_finite(d.saturation_current(temp).map(|x| x.value()))?;
            ok_finite(d.forward_tempco_v_per_k(i, temp))?;
            if let Ok(v) = Volts::new(v) {
                ok_finite(d.reverse_leakage(v, temp).map(|x| x.value()))?;
                ok_finite(d.junction_temperature(i, v).map(|x| x.kelvin()))?;
                ok_finite(d.forward_current(v, temp).map(|x| x.value()))?;
                if let Ok(r) = Ohms::new(r) {
                    ok_finite(d.series_current(v, r, temp).map(|x| x.value()))?;
                }
            }
        }
    }

    #[test]
    fn fits_never_panic(
        a in hostile(), b in hostile(), c in hostile(), va in hostile(), vb in hostile(), vc in hostile(),
        eg in hostile(), tc in hostile(),
    ) {
        let pts = (DropPoint::new(a, va), DropPoint::new(b, vb), DropPoint::new(c, vc));
        if let (Ok(p1), Ok(p2), Ok(p3)) = pts {
            if let Ok(f) = fit_two_points([p1, p2], t(25.0), Ohms::new(0.0).unwrap(), eg, 3.0) {
                prop_assert!(f.n().is_finite() && f.is().value() > 0.0);
            }
            if let Ok(f) = fit_three_points([p1, p2, p3], t(25.0), eg, 3.0) {
                prop_assert!(f.rs().value().is_finite() && f.rs().value() >= 0.0);
            }
            if let Ok(f) = DiodeParams::SILICON.with_eg_from_point(p1, t(80.0)) {
                prop_assert!(f.eg_ev().is_finite());
            }
        }
        if let Ok(i) = Amps::new(a) {
            if let Ok(f) = DiodeParams::SILICON.with_eg_from_tempco(i, tc) {
                prop_assert!(f.eg_ev().is_finite());
            }
        }
    }

    #[test]
    fn clamp_engine_never_panics_or_gives_nan(
        l in hostile(), r in hostile(), vs in hostile(), i0 in hostile(), i1 in hostile(),
        vz in hostile(), kind in 0usize..6, c in hostile(), dt in hostile(),
    ) {
        let (Ok(l), Ok(r)) = (Henries::new(l), Ohms::new(r)) else { return Ok(()); };
        let Ok(coil) = Coil::new(l, r, t(20.0), 0.00393) else { return Ok(()); };
        let (Ok(vs), Ok(i0), Ok(i1)) = (Volts::new(vs), Amps::new(i0), Amps::new(i1)) else { return Ok(()); };
        let Ok(temp) = Temperature::from_celsius(c) else { return Ok(()); };
        let z = Volts::new(vz).ok().and_then(|v| Breakdown::ideal(v).ok());
        let d = DiodeParams::SILICON;
        let clamp = match (kind, z) {
            (0, _) => Clamp::FreewheelDiode(d),
            (1, _) => Clamp::ResistorDiode { resistor: r, diode: d },
            (2, Some(z)) => Clamp::ZenerDiode { zener: z, diode: d },
            (3, Some(z)) => Clamp::SwitchZener(z),
            (4, Some(z)) => Clamp::Avalanche(z),
            _ => Clamp::HBridgeFastDecay(d),
        };
        if let Ok(off) = SwitchOff::new(&coil, &clamp, vs, i0, temp, temp) {
            prop_assert!(off.peak_switch_voltage().value().is_finite());
            ok_finite(off.time_to(i1).map(|x| x.value()))?;
            if let Ok(dec) = off.decay_to(i1) {
                let e = dec.energy;
                for x in [dec.time.value(), dec.charge.value(), e.released_by_coil.value(), e.from_supply.value(),
                          e.coil_resistance.value(), e.resistor.value(), e.diodes.value(), e.zener.value(), e.switch.value()] {
                    prop_assert!(x.is_finite());
                }
            }
            ok_finite(off.time_above(vs).map(|x| x.value()))?;
            let mut buf = [Sample::default(); 16];
            if let (Ok(dt), Ok(n)) = (Seconds::new(dt), Seconds::new(dt).and_then(|dt| off.sample(dt, i1, &mut buf))) {
                let _ = dt;
                prop_assert!(n <= 16);
                for s in &buf[..n] {
                    prop_assert!(s.time.value().is_finite() && s.current.value().is_finite() && s.switch_voltage.value().is_finite());
                }
            }
        }
        if let Ok(cc) = ConstantClamp::new(l, r, vs) {
            ok_finite(cc.time_to(i0, i1).map(|x| x.value()))?;
            if let Ok(dd) = cc.decay(i0, i1) {
                prop_assert!(dd.clamp_energy.value().is_finite() && dd.resistive_energy.value().is_finite());
            }
        }
        if let Ok(cap) = Farads::new(dt) {
            let sn = RcSnubber { resistor: r, capacitor: cap };
            if let Ok(s) = SnubberSwitchOff::new(&coil, &sn, vs, i0, temp) {
                if let Ok(resp) = s.response() {
                    prop_assert!(resp.peak_switch_voltage.value().is_finite() && resp.energy_in_resistor.value().is_finite());
                }
                ok_finite(s.settle_time(i1).map(|x| x.value()))?;
            }
        }
    }

    #[test]
    fn timing_pwm_rating_input_never_panic(
        a in hostile(), b in hostile(), c in hostile(), d in hostile(), e in hostile(), top in any::<u32>(),
    ) {
        let coil = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(), t(20.0)).unwrap();
        if let (Ok(v), Ok(i)) = (Volts::new(a), Amps::new(b)) {
            ok_finite(time_to_current(&coil, v, i, t(25.0)).map(|x| x.value()))?;
            let fw = Freewheel { diode_drop: Volts::new(0.8).unwrap(), zener: Volts::new(0.0).unwrap() };
            ok_finite(hold_duty(&coil, v, i, t(25.0), fw))?;
            if let Ok(p) = HoldOperatingPoint::new(&coil, v, t(25.0), fw, c, d) {
                ok_finite(p.mean_current().map(|x| x.value()))?;
                if let Ok(rp) = p.ripple() {
                    prop_assert!(rp.peak_to_peak.value().is_finite());
                }
                ok_finite(p.frequency_for_ripple(i))?;
                let _ = p.compare_value(top);
            }
            if let Ok(i2) = Amps::new(e) {
                if let Ok(h) = hysteretic(&coil, v, t(25.0), fw, i, i2) {
                    prop_assert!(h.frequency_hz.is_finite() && h.duty.is_finite());
                }
            }
        }
        if let Ok(s) = Seconds::new(a) {
            let _ = to_ticks(s, b);
        }
        if let (Ok(x), Ok(y)) = (Joules::new(a), Joules::new(b)) {
            if let Ok(v) = single_pulse(x, y) { prop_assert!(v.margin.is_finite()); }
            ok_finite(average_power(x, c).map(|p| p.value()))?;
        }
        if let Ok(path) = ThermalPath::new(a, t(25.0), t(150.0)) {
            if let Ok(w) = Watts::new(b) { if let Ok(ch) = path.check(w) { prop_assert!(ch.junction.kelvin().is_finite()); } }
            if let (Ok(e), Ok(s)) = (Joules::new(c), Seconds::new(d)) { ok_finite(path.max_repetition_rate_hz(e, s))?; }
        }
        let pin = Pin::new(Volts::new(3.3).unwrap(), PinClamp::DiodeLaw(DiodeParams::SILICON), t(85.0)).unwrap();
        if let (Ok(vsig), Ok(r)) = (Volts::new(a), Ohms::new(b)) {
            ok_finite(pin.injection(vsig, r).map(|x| x.value()))?;
            ok_finite(pin.pin_voltage(vsig, r).map(|x| x.value()))?;
        }
        if let (Ok(lo), Ok(hi)) = (Volts::new(a), Volts::new(b)) {
            if let Ok(s) = SignalRange::new(lo, hi, lo, hi, Seconds::new(1e-3).unwrap()) {
                if let (Ok(x), Ok(y)) = (Amps::new(c), Amps::new(d)) {
                    ok_finite(min_resistor(&pin, &s, InjectionLimits { positive: x, negative: y }).map(|r| r.value()))?;
                }
            }
        }
    }

    #[test]
    fn diagnosis_run_time_never_panics(rows in proptest::collection::vec((any::<u32>(), any::<u32>(), 0u32..8), 0..10), ticks in any::<u32>(), samples in proptest::collection::vec(hostile(), 0..20), h in hostile()) {
        let table: Vec<[u32; 3]> = rows.iter().map(|&(a, b, c)| [a, b, c]).collect();
        let w = Windows::from_rows(&table);
        let _ = w.classify(ticks);
        let amps: Vec<Amps> = samples.iter().filter_map(|&x| Amps::new(x).ok()).collect();
        if let Ok(h) = Seconds::new(h) {
            if let Ok(f) = fit_decay(&amps, h) {
                prop_assert!(f.tau.value().is_finite() && f.clamp_over_r.is_finite());
            }
        }
    }

    // ---------------- physical invariants ----------------

    #[test]
    fn energy_balance_closes(l in 1e-4f32..10.0, r in 0.1f32..2000.0, i0 in 1e-3f32..20.0, vz in 5.0f32..100.0, kind in 0usize..6, frac in 1e-4f32..0.5) {
        // Conservation of energy: ½L(I₀² − I₁²) + E_supply = Σ dissipated.
        let coil = Coil::new(Henries::new(l).unwrap(), Ohms::new(r).unwrap(), t(25.0), 0.0).unwrap();
        let d = DiodeParams::SILICON;
        let vs = 24.0f32;
        let z = Breakdown::ideal(Volts::new(vz + vs).unwrap()).unwrap();
        let clamp = match kind {
            0 => Clamp::FreewheelDiode(d),
            1 => Clamp::ResistorDiode { resistor: Ohms::new(r).unwrap(), diode: d },
            2 => Clamp::ZenerDiode { zener: z, diode: d },
            3 => Clamp::SwitchZener(z),
            4 => Clamp::Avalanche(z),
            _ => Clamp::HBridgeFastDecay(d),
        };
        let off = SwitchOff::new(&coil, &clamp, Volts::new(vs).unwrap(), Amps::new(i0).unwrap(), t(25.0), t(25.0)).unwrap();
        let dec = off.decay_to(Amps::new(i0 * frac).unwrap()).unwrap();
        let e = dec.energy;
        let lhs = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
        let rhs: f64 = [e.coil_resistance, e.resistor, e.diodes, e.zener, e.switch].iter().map(|x| x.value() as f64).sum();
        prop_assert!(((lhs - rhs) / lhs).abs() < 1e-3, "{lhs} vs {rhs}");
    }

    #[test]
    fn higher_clamp_voltage_is_never_slower(l in 1e-3f32..5.0, r in 1.0f32..1000.0, i0 in 1e-2f32..5.0, v1 in 1.0f32..60.0, dv in 0.1f32..40.0) {
        // The RL decay into a higher clamp voltage is faster, and the clamp takes a larger share.
        let coil = Coil::new(Henries::new(l).unwrap(), Ohms::new(r).unwrap(), t(25.0), 0.0).unwrap();
        let d = DiodeParams::SILICON;
        let mk = |v: f32| Clamp::ZenerDiode { zener: Breakdown::ideal(Volts::new(v).unwrap()).unwrap(), diode: d };
        let vs = Volts::new(24.0).unwrap();
        let a = SwitchOff::new(&coil, &mk(v1), vs, Amps::new(i0).unwrap(), t(25.0), t(25.0)).unwrap().decay_to(Amps::new(0.0).unwrap()).unwrap();
        let b = SwitchOff::new(&coil, &mk(v1 + dv), vs, Amps::new(i0).unwrap(), t(25.0), t(25.0)).unwrap().decay_to(Amps::new(0.0).unwrap()).unwrap();
        prop_assert!(b.time.value() <= a.time.value() * (1.0 + 1e-5));
        let share = |x: &kickguard::clamp::Decay| (x.energy.zener.value() + x.energy.diodes.value()) / x.energy.released_by_coil.value();
        prop_assert!(share(&b) >= share(&a) * (1.0 - 1e-4), "{} < {}", share(&b), share(&a));
    }

    #[test]
    fn limits_of_the_constant_clamp(l in 1e-3f32..5.0, i0 in 1e-2f32..10.0, vc in 1.0f32..100.0) {
        // R → 0: time L·I₀/Vc; Vc → 0: τ·ln(I₀/I₁) (Horowitz & Hill).
        let tiny_r = ConstantClamp::new(Henries::new(l).unwrap(), Ohms::new(1e-7).unwrap(), Volts::new(vc).unwrap()).unwrap();
        let t0 = tiny_r.time_to(Amps::new(i0).unwrap(), Amps::new(0.0).unwrap()).unwrap().value();
        prop_assert!(((t0 - l * i0 / vc) / (l * i0 / vc)).abs() < 1e-4);
        let r = 10.0f32;
        let small_vc = ConstantClamp::new(Henries::new(l).unwrap(), Ohms::new(r).unwrap(), Volts::new(1e-6).unwrap()).unwrap();
        let t1 = small_vc.time_to(Amps::new(i0).unwrap(), Amps::new(i0 / 10.0).unwrap()).unwrap().value();
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
        let pin = Pin::new(Volts::new(3.3).unwrap(), PinClamp::DiodeLaw(DiodeParams::SILICON), t(c)).unwrap();
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
            if let (Ok(v), Ok(i), Ok(r)) = (Volts::new(a), Amps::new(b), Ohms::new(b.abs())) {
                for law in [
                    BreakdownLaw::Datasheet {
                        vz: v,
                        izt: i,
                        rz: r,
                    },
                    BreakdownLaw::Spice {
                        bv: v,
                        ibv: i,
                        nbv: b,
                        rs: r,
                    },
                ] {
                    if let Ok(z) = Breakdown::new(law, a, t(25.0)) {
                        if let Ok(x) = z.voltage(Amps::new(0.1).unwrap(), t(100.0)) {
                            assert!(x.value().is_finite());
                        }
                    }
                }
            }
        }
    }
}
