//! Bounded work on hostile inputs: every public function returns within a generous bound for
//! every combination of hostile values, so a hang (a loop whose count depends on a bad number,
//! like the sampler that once spun for minutes on a 0 A end current) cannot come back silently.
//!
//! The bound is generous (50 ms a call in a release build, 500 ms in a debug one: the slowest
//! calls take well under 1 ms in release); a call over it is repeated twice and fails only if it
//! is slow every time, so a busy machine cannot fail the test but a real hang always does. The
//! slowest call seen is printed.

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::clamp::sizing::ZenerSizing;
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{ActiveClamp, Clamp, Operating, Sample, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diagnosis::compensate::MeasuredAccuracy;
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::unit::UnitLearner;
use kickguard::diagnosis::{Condition, Design, Measurement, ShortedTurns, Timing, Windows};
use kickguard::diode::{
    fit_three_points, fit_two_points, BandGap, Diode, DiodeParams, DropPoint, Ideality, Xti,
};
use kickguard::input::rail::{rail_off_together, shared_clamp, RailSource, UnpoweredRail};
use kickguard::input::resistor::{resistor_window, InjectionLimits, UpperLimits};
use kickguard::input::{Pin, SignalRange};
use kickguard::pwm::{hold_duty, hysteretic, Freewheel, HoldOperatingPoint};
use kickguard::timing::to_ticks;
use kickguard::varistor::Varistor;
use kickguard::{Amps, Duty, Farads, Henries, Hertz, Ohms, PerKelvin, Seconds, Temperature, Volts};
use std::time::{Duration, Instant};

/// Hostile values: specials, subnormals, extremes of the quantity bounds, ordinary values.
const HOSTILE: [f32; 17] = [
    f32::NAN,
    f32::INFINITY,
    f32::NEG_INFINITY,
    0.0,
    -0.0,
    f32::MIN_POSITIVE,
    1e-40,
    1e-30,
    1e-12,
    1e-6,
    0.01,
    1.0,
    24.0,
    1e6,
    1e12,
    -1.0,
    f32::MAX,
];

fn bound() -> Duration {
    if cfg!(debug_assertions) {
        Duration::from_millis(500)
    } else {
        Duration::from_millis(50)
    }
}

/// Runs `f` on every pair of hostile values (and each value with the others nominal), timing
/// each call; returns the slowest.
fn sweep(name: &str, nominal: [f32; 4], f: &dyn Fn([f32; 4])) -> Duration {
    let mut worst = Duration::ZERO;
    let mut inputs = Vec::new();
    for (k, _) in nominal.iter().enumerate() {
        for &h in &HOSTILE {
            let mut x = nominal;
            x[k] = h;
            inputs.push(x);
        }
    }
    for &a in &HOSTILE {
        for &b in &HOSTILE {
            inputs.push([a, b, nominal[2], nominal[3]]);
            inputs.push([nominal[0], nominal[1], a, b]);
        }
    }
    for x in inputs {
        let timed = || {
            let start = Instant::now();
            f(x);
            start.elapsed()
        };
        let mut took = timed();
        for _ in 0..2 {
            if took <= bound() {
                break;
            }
            took = took.min(timed());
        }
        assert!(took <= bound(), "{name}{x:?} took {took:?}");
        worst = worst.max(took);
    }
    worst
}

fn t(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

fn coil_of(l: f32, r: f32) -> Option<Coil> {
    Coil::copper(Henries::new(l).ok()?, Ohms::new(r).ok()?, t(20.0)).ok()
}

#[test]
fn every_public_function_returns_promptly_on_hostile_input() {
    let mut report: Vec<(&str, Duration)> = Vec::new();
    let mut run = |name: &'static str, nominal: [f32; 4], f: &dyn Fn([f32; 4])| {
        report.push((name, sweep(name, nominal, f)));
    };
    run("diode", [0.4, 25.0, 5.0, 1e3], &|[i, c, v, r]| {
        let d = DiodeParams::SILICON;
        if let (Ok(i), Ok(t)) = (Amps::new(i), Temperature::from_celsius(c)) {
            let _ = d.forward_drop(i, t);
            let _ = d.forward_tempco_v_per_k(i, t);
            if let (Ok(v), Ok(r)) = (Volts::new(v), Ohms::new(r)) {
                let _ = d.series_current(v, r, t);
                let _ = d.junction_temperature(i, v);
                let _ = d.reverse_leakage(v, t);
            }
        }
    });
    run("diode fits", [1e-3, 0.6, 0.1, 0.8], &|[i1, v1, i2, v2]| {
        if let (Ok(p1), Ok(p2)) = (DropPoint::new(i1, v1), DropPoint::new(i2, v2)) {
            let _ = fit_two_points(
                [p1, p2],
                t(25.0),
                Ohms::new(0.0).unwrap(),
                BandGap::SILICON,
                Xti::PN,
            );
            if let Ok(p3) = DropPoint::new(i2 * 10.0, v2 + 0.1) {
                let _ = fit_three_points([p1, p2, p3], t(25.0), BandGap::SILICON, Xti::PN);
            }
            let _ = DiodeParams::SILICON.with_eg_from_point(p1, t(80.0));
        }
    });
    for kind in 0..7usize {
        run(
            "switch-off",
            [0.35, 56.0, 24.0, 0.43],
            &move |[l, r, vs, i0]| {
                let Some(coil) = coil_of(l, r) else { return };
                let (Ok(vs), Ok(i0)) = (Volts::new(vs), Amps::new(i0)) else {
                    return;
                };
                let d = Diode::Law(DiodeParams::SILICON);
                let z = Breakdown::new(
                    BreakdownLaw::Spice {
                        bv: Volts::new(30.0).unwrap(),
                        ibv: Amps::new(1e-3).unwrap(),
                        nbv: Ideality::new(2.0).unwrap(),
                        rs: Ohms::new(1.0).unwrap(),
                    },
                    PerKelvin::ZERO,
                    t(25.0),
                )
                .unwrap();
                let clamp = match kind {
                    0 => Clamp::FreewheelDiode(d),
                    1 => Clamp::ZenerDiode { zener: z, diode: d },
                    2 => Clamp::AcrossSwitch(z),
                    3 => Clamp::Avalanche(Breakdown::ideal(Volts::new(66.0).unwrap()).unwrap()),
                    4 => Clamp::Varistor(
                        Varistor::new(
                            Volts::new(39.0).unwrap(),
                            Amps::new(1e-3).unwrap(),
                            30.0,
                            PerKelvin::ZERO,
                            t(25.0),
                        )
                        .unwrap(),
                    ),
                    5 => Clamp::ActiveClamp(ActiveClamp {
                        zener: z,
                        zener_current: Amps::new(1e-3).unwrap(),
                        gate_threshold: Volts::new(3.0).unwrap(),
                        transconductance_a_per_v2: Some(5.0),
                    }),
                    _ => Clamp::HBridgeFastDecay(d),
                };
                let Ok(off) = SwitchOff::new(
                    &coil,
                    &clamp,
                    Side::Low,
                    &Operating::uniform(vs, i0, t(25.0)),
                ) else {
                    return;
                };
                let _ = off.decay_to_end();
                let _ = off.time_above(vs);
                let i1 = Amps::new(i0.value() * 1e-3).unwrap_or(i0);
                let _ = off.profile(&[i1]);
                let mut buf = [Sample::default(); 64];
                for dt in [1e-30f32, 1e-6, 1.0, 1e12] {
                    let _ =
                        off.sample(Seconds::new(dt).unwrap(), Amps::new(0.0).unwrap(), &mut buf);
                    let _ = off.sample(Seconds::new(dt).unwrap(), i1, &mut buf);
                }
            },
        );
    }
    run(
        "constant clamp",
        [0.35, 56.0, 42.0, 0.43],
        &|[l, r, vc, i0]| {
            if let (Ok(l), Ok(r), Ok(vc), Ok(i0)) =
                (Henries::new(l), Ohms::new(r), Volts::new(vc), Amps::new(i0))
            {
                if let Ok(c) = ConstantClamp::new(l, r, vc, i0) {
                    let _ = c.decay_to(Amps::new(0.0).unwrap());
                }
            }
        },
    );
    run("snubber", [0.35, 100.0, 1e-7, 0.43], &|[l, rs, cap, i0]| {
        let Some(coil) = coil_of(l, 56.0) else { return };
        let (Ok(rs), Ok(cap), Ok(i0)) = (Ohms::new(rs), Farads::new(cap), Amps::new(i0)) else {
            return;
        };
        let sn = RcSnubber {
            resistor: rs,
            capacitor: cap,
        };
        if let Ok(s) = SnubberSwitchOff::new(&coil, &sn, Volts::new(24.0).unwrap(), i0, t(25.0)) {
            let _ = s.response();
            let _ = s.settle_time(Amps::new(1e-6).unwrap());
            let mut buf = [Sample::default(); 64];
            let _ = s.sample(Seconds::new(1e-6).unwrap(), &mut buf);
        }
    });
    run("sizing", [10.0, 0.01, 26.4, 0.47], &|[rz, izt, vs, i0]| {
        let coil = coil_of(0.35, 56.0).unwrap();
        let (Ok(rz), Ok(izt), Ok(vs), Ok(i0)) =
            (Ohms::new(rz), Amps::new(izt), Volts::new(vs), Amps::new(i0))
        else {
            return;
        };
        let _ = ZenerSizing {
            coil,
            diode: Diode::Law(DiodeParams::SILICON),
            zener_rz: rz,
            zener_izt: izt,
            v_supply: vs,
            i_start: i0,
            t_coil: t(20.0),
            t_clamp: t(20.0),
            switch_rating: Volts::new(60.0).unwrap(),
            rating_fraction: Duty::new(0.8).unwrap(),
            release_current: Amps::new(0.05).unwrap(),
            max_release_time: Seconds::new(5e-3).unwrap(),
        }
        .window();
    });
    run("pwm", [24.0, 0.15, 20e3, 0.5], &|[v, i, f, d]| {
        let coil = coil_of(0.35, 56.0).unwrap();
        let fw = Freewheel::diode(Volts::new(0.8).unwrap()).unwrap();
        let (Ok(v), Ok(i)) = (Volts::new(v), Amps::new(i)) else {
            return;
        };
        let _ = hold_duty(&coil, v, t(25.0), &fw, i);
        if let (Ok(f), Ok(d)) = (Hertz::new(f), Duty::new(d)) {
            if let Ok(p) = HoldOperatingPoint::new(&coil, v, t(25.0), &fw, f, d) {
                let _ = p.ripple();
                let _ = p.freewheel_power();
                let _ = p.frequency_for_ripple(i);
            }
        }
        if let Ok(i2) = Amps::new(i.value() * 1.1) {
            let _ = hysteretic(&coil, v, t(25.0), &fw, i, i2);
        }
    });
    run("input", [24.0, 4700.0, 3.3, 85.0], &|[vs, r, vdd, c]| {
        let (Ok(vs), Ok(r), Ok(vdd), Ok(tc)) = (
            Volts::new(vs),
            Ohms::new(r),
            Volts::new(vdd),
            Temperature::from_celsius(c),
        ) else {
            return;
        };
        let pin = Pin {
            vdd,
            clamp: Diode::Law(DiodeParams::SILICON),
            temperature: tc,
        };
        let _ = pin.injection(vs, r);
        let _ = shared_clamp(&pin, &DiodeParams::SCHOTTKY, vs, r);
        // Every input of a board at once: 64 sources, the most a design file allows.
        let sources = [RailSource {
            v_signal: vs,
            r_series: r,
            count: 1,
        }; 64];
        if let (Ok(load), Ok(allowed)) = (Ohms::new(220.0), Volts::new(0.5)) {
            let _ = rail_off_together(&pin, &sources, &UnpoweredRail { load, allowed });
        }
        let s = SignalRange {
            steady_min: Volts::new(0.0).unwrap(),
            steady_max: vs,
            transient_min: Volts::new(-2.0).unwrap(),
            transient_max: vs,
            transient_width: Seconds::new(1e-3).unwrap(),
        };
        let lim = InjectionLimits {
            positive: Amps::new(5e-3).unwrap(),
            negative: Amps::new(5e-3).unwrap(),
        };
        let _ = resistor_window(&pin, &s, lim, &UpperLimits::default());
    });
    run("diagnosis", [0.35, 56.0, 30.0, 1e4], &|[l, r, th, tick]| {
        let Some(coil) = coil_of(l, r) else { return };
        let d = Diode::Law(DiodeParams::SILICON);
        let design = Design {
            coil,
            inductance_tolerance: 0.1,
            resistance_tolerance: 0.07,
            v_supply_min: Volts::new(21.6).unwrap(),
            v_supply_max: Volts::new(26.4).unwrap(),
            t_winding_min: t(-10.0),
            t_winding_max: t(80.0),
            t_winding_fault_max: t(130.0),
            t_clamp_min: t(-10.0),
            t_clamp_max: t(55.0),
            clamp: Clamp::ZenerDiode {
                zener: Breakdown::ideal(Volts::new(18.0).unwrap()).unwrap(),
                diode: d,
            },
            clamp_tolerance: 0.05,
            switch_avalanche: Breakdown::ideal(Volts::new(66.0).unwrap()).unwrap(),
            avalanche_tolerance: 0.05,
            shorted: ShortedTurns::Fraction(0.2),
            side: Side::Low,
        };
        let Ok(th) = Volts::new(th) else { return };
        let m = Measurement::SwitchAbove { threshold: th };
        let _ = design.separations(&m);
        if let Ok(tick) = Hertz::new(tick) {
            let timing = Timing {
                tick,
                guard: Duty::new(0.05).unwrap(),
                jitter_ticks: 2,
            };
            if let Ok(w) = design.tick_windows(&m, &timing) {
                let _ = w.classify(to_ticks(Seconds::new(3e-3).unwrap(), tick).unwrap_or(0));
            }
            let _ = design.tick_separations(&m, &timing);
            let acc = MeasuredAccuracy {
                supply: 0.02,
                current: 0.02,
                supply_step: 0.0,
                current_step: 0.0,
            };
            let _ = design.compensated_tick_windows(
                &m,
                &timing,
                &acc,
                [Volts::new(26.4).unwrap()],
                [Amps::new(0.45).unwrap(), Amps::new(0.6).unwrap()],
            );
            if let Ok(table) = design.unit_table(
                &m,
                &timing,
                &acc,
                [Volts::new(26.4).unwrap()],
                [Amps::new(0.45).unwrap(), Amps::new(0.6).unwrap()],
            ) {
                if let Ok(mut u) = UnitLearner::<5>::new(&table) {
                    for k in 0..8u32 {
                        let _ = u.observe(&table, 24_000, 420_000, k.wrapping_mul(0x9E37_79B9));
                    }
                }
            }
        }
        let _ = Windows::from_rows(&[[u32::MAX, u32::MAX, Condition::ClampOpen.code()]])
            .classify(u32::MAX);
        let samples: Vec<Amps> = (0..64)
            .filter_map(|k| Amps::new(0.4 * (-(k as f32) * 0.05).exp()).ok())
            .collect();
        let _ = fit_decay(&samples, Seconds::new(1e-4).unwrap());
    });
    let (name, slowest) = report.iter().max_by_key(|(_, d)| *d).copied().unwrap();
    println!("slowest call: {name}, {slowest:?} (bound {:?})", bound());
}
