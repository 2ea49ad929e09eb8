//! Input protection checked against sources outside the project.
//!
//! Sources named beside each check:
//! - The SPICE2 diode law (Nagel 1975), written in f64 in tests/common.
//! - The `roots` crate's Brent solver (crates.io, f64) for the diode-plus-resistor currents.
//! - Ohm's law worked examples.
//! - Facts of the trade, marked "common practice": a two-diode limiter holds about ±0.6–0.8 V;
//!   5 V through a silicon diode leaves about 4.3 V; pin injection limits of a few mA each and a
//!   larger total.
//! - First-order RC settling to half an LSB, t ≥ R·C·ln(2^(N+1)) (ADC application notes; from
//!   memory).

mod common;

use common::v64;
use kickguard::breakdown::Breakdown;
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::input::board::{Board, BoardInput};
use kickguard::input::rail::{
    neighbour_adc_error, rail_off_check, shared_clamp, RailLoad, UnpoweredRail,
};
use kickguard::input::resistor::{
    max_resistor, min_resistor, resistor_power, resistor_window, transient_energy, InjectionLimits,
    LogicHigh, UpperLimit, UpperLimits,
};
use kickguard::input::{Pin, SignalRange};
use kickguard::{Amps, Farads, Henries, Ohms, Reason, Seconds, Temperature, Volts};

fn tc(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}
fn v(x: f32) -> Volts {
    Volts::new(x).unwrap()
}
fn ohm(x: f32) -> Ohms {
    Ohms::new(x).unwrap()
}
fn ma(x: f32) -> Amps {
    Amps::new(x * 1e-3).unwrap()
}
fn si_pin(vdd: f32, c: f32) -> Pin {
    Pin::new(v(vdd), Diode::Law(DiodeParams::SILICON), tc(c)).unwrap()
}
/// A signal range from its four voltages (steady min/max, transient min/max) and a width.
fn range(smin: f32, smax: f32, tmin: f32, tmax: f32, width: f32) -> SignalRange {
    SignalRange {
        steady_min: v(smin),
        steady_max: v(smax),
        transient_min: v(tmin),
        transient_max: v(tmax),
        transient_width: Seconds::new(width).unwrap(),
    }
}

/// Brent (roots crate) solve of V = I·R + V_D(I) in f64 with the SPICE2 law (tests/common).
fn brent_current(d: &DiodeParams, volts: f64, r: f64, t_k: f64) -> f64 {
    let f = |i: f64| i * r + v64(d, i, t_k) - volts;
    let hi = volts / r;
    let mut conv = roots::SimpleConvergency {
        eps: hi * 1e-13,
        max_iter: 1000,
    };
    roots::find_root_brent(1e-30, hi, f, &mut conv).unwrap()
}

#[test]
fn two_diode_limiter_holds_about_six_to_eight_tenths_of_a_volt() {
    // Common practice: antiparallel silicon diodes to ground hold a line at about ±0.6–0.8 V.
    let limiter = Pin::limiter_to_ground(Diode::Law(DiodeParams::SILICON), tc(25.0)).unwrap();
    for &vs in &[5.0f32, 10.0, 24.0] {
        let up = limiter.pin_voltage(v(vs), ohm(10_000.0)).unwrap().value();
        let down = limiter.pin_voltage(v(-vs), ohm(10_000.0)).unwrap().value();
        assert!((0.55..=0.8).contains(&up), "+{vs} V → {up}");
        assert!((-0.8..=-0.55).contains(&down), "−{vs} V → {down}");
    }
    // Common practice: 5 V through a silicon diode into 1 kΩ leaves about 4.3 V on the resistor.
    let i = limiter.injection(v(5.0), ohm(1000.0)).unwrap().value();
    assert!((i * 1000.0 - 4.3).abs() < 0.1, "{i}");
}

#[test]
fn fixed_drop_clamp_is_ohms_law() {
    // Ohm's law: (24 V − 3.3 V − 0.3 V)/10 kΩ = 2.04 mA, and nothing below the rail.
    let pin = Pin::new(v(3.3), Diode::FixedDrop(v(0.3)), tc(25.0)).unwrap();
    let i = pin.injection(v(24.0), ohm(10_000.0)).unwrap().value();
    assert!((i - 2.04e-3).abs() < 1e-9, "{i}");
    assert_eq!(pin.injection(v(3.0), ohm(10_000.0)).unwrap().value(), 0.0);
    let i = pin.injection(v(-5.0), ohm(10_000.0)).unwrap().value();
    assert!((i + 4.7e-4).abs() < 1e-9, "{i}");
    // P = V²/R for the voltage across the resistor: (24 − 3.6)²/10 kΩ = 41.6 mW.
    let p = resistor_power(&pin, v(24.0), ohm(10_000.0))
        .unwrap()
        .value();
    assert!((p - 20.4f32 * 20.4 / 10_000.0).abs() < 1e-6, "{p}");
}

#[test]
fn injection_matches_an_independent_solver() {
    // Source: `roots` Brent (f64) on V_s − V_DD = I·R + V_D(I) with the SPICE2 law (Nagel 1975).
    for &c in &[-40.0f32, 25.0, 85.0, 125.0] {
        let pin = si_pin(3.3, c);
        for &vs in &[4.0f32, 5.0, 12.0, 24.0, 66.0] {
            for &r in &[1e3f32, 1e4, 1e5] {
                let got = pin.injection(v(vs), ohm(r)).unwrap().value() as f64;
                let want = brent_current(
                    &DiodeParams::SILICON,
                    (vs - 3.3) as f64,
                    r as f64 + 0.05,
                    c as f64 + 273.15,
                );
                assert!(
                    ((got - want) / want).abs() < 1e-4,
                    "T={c} V={vs} R={r}: {got:e} vs {want:e}"
                );
            }
        }
    }
}

#[test]
fn injection_grows_with_signal_and_with_temperature() {
    // Monotonicity of the model: more overvoltage, more current; hotter diode, lower drop, more
    // current through the same resistor.
    let (cold, hot) = (si_pin(3.3, -10.0), si_pin(3.3, 85.0));
    let mut last = -1.0;
    for k in 0..60 {
        let vs = -10.0 + k as f32;
        let i = cold.injection(v(vs), ohm(10_000.0)).unwrap().value();
        assert!(i >= last, "not monotone at {vs}");
        last = i;
    }
    let ic = cold.injection(v(24.0), ohm(10_000.0)).unwrap().value();
    let ih = hot.injection(v(24.0), ohm(10_000.0)).unwrap().value();
    assert!(ih > ic);
}

#[test]
fn minimum_resistor_puts_the_injection_exactly_at_the_limit() {
    // Common practice: injection limits of a few mA per pin. At R_min the worst transient injects
    // exactly the limit (by construction, checked with the independent injection solve).
    let pin = si_pin(3.0, 85.0);
    let s = range(0.0, 24.0, -12.0, 30.0, 1e-3);
    let lim = InjectionLimits {
        positive: ma(5.0),
        negative: ma(2.0),
    };
    let r = min_resistor(&pin, &s, lim).unwrap();
    let ip = pin.injection(s.transient_max, r).unwrap().value();
    let ineg = pin.injection(s.transient_min, r).unwrap().value();
    // The negative side is binding here: (12 − 0.7)/2 mA ≈ 5.6 kΩ > (30 − 3 − 0.7)/5 mA ≈ 5.3 kΩ.
    assert!((ineg + 2e-3).abs() < 2e-3 * 1e-4, "{ineg}");
    assert!(ip < 5e-3);
    // Energy in a rectangular pulse: P·t.
    let e = transient_energy(&pin, &s, r).unwrap().value();
    let p = resistor_power(&pin, v(30.0), r)
        .unwrap()
        .value()
        .max(resistor_power(&pin, v(-12.0), r).unwrap().value());
    assert!((e - p * 1e-3).abs() < 1e-9);
}

#[test]
fn maximum_resistor_from_each_limit() {
    // RC settling to half an LSB: R = t/(C·ln 2^(N+1)) − R_in (ADC application notes; from memory).
    let up = UpperLimits {
        sampling: Some((
            Farads::new(10e-12).unwrap(),
            Seconds::new(1e-6).unwrap(),
            12,
            ohm(1000.0),
        )),
        ..UpperLimits::default()
    };
    let (r, which) = max_resistor(&up).unwrap();
    let want = 1e-6 / (10e-12 * 13.0 * std::f64::consts::LN_2) - 1000.0;
    assert_eq!(which, UpperLimit::Sampling);
    assert!(((r.unwrap().value() as f64 - want) / want).abs() < 1e-5);
    // Ohm's law for the leakage error: 10 mV / 1 µA = 10 kΩ; the smallest limit wins.
    let up = UpperLimits {
        leakage: Some((Amps::new(1e-6).unwrap(), v(0.01))),
        adc_max_source: Some(ohm(50_000.0)),
        logic_high: Some(LogicHigh {
            leakage: Amps::new(1e-6).unwrap(),
            signal_high_min: v(10.0),
            v_ih: v(2.0),
        }),
        ..UpperLimits::default()
    };
    let (r, which) = max_resistor(&up).unwrap();
    assert_eq!((r.unwrap().value(), which), (10_000.0, UpperLimit::Leakage));
    assert_eq!(
        max_resistor(&UpperLimits::default()).unwrap(),
        (None, UpperLimit::None)
    );
    // A window that cannot close is an error naming the resistor.
    let pin = si_pin(3.0, 85.0);
    let s = range(0.0, 24.0, 0.0, 66.0, 1e-3);
    let lim = InjectionLimits {
        positive: ma(1.0),
        negative: ma(1.0),
    };
    let e = resistor_window(&pin, &s, lim, &up).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("series resistor", Reason::Inconsistent)
    );
}

#[test]
fn external_schottky_takes_most_of_the_current() {
    // Source: two SPICE2 diode laws in parallel (Nagel 1975); node equation solved here in f64
    // with nested `roots` Brent solves, independently of the crate.
    let t_k = 298.15;
    let (si, sk) = (DiodeParams::SILICON, DiodeParams::SCHOTTKY);
    let got = shared_clamp(&si_pin(3.3, 25.0), &sk, v(24.0), ohm(4700.0)).unwrap();
    let i_at = |d: &DiodeParams, vd: f64| {
        if vd <= 0.0 {
            return 0.0;
        }
        let f = |i: f64| v64(d, i, t_k) - vd;
        let mut conv = roots::SimpleConvergency {
            eps: 1e-16,
            max_iter: 1000,
        };
        roots::find_root_brent(1e-30, 100.0, f, &mut conv).unwrap()
    };
    let node = |vn: f64| (24.0 - vn) / 4700.0 - i_at(&si, vn - 3.3) - i_at(&sk, vn - 3.3);
    let mut conv = roots::SimpleConvergency {
        eps: 1e-12,
        max_iter: 1000,
    };
    let vn = roots::find_root_brent(3.3, 4.5, node, &mut conv).unwrap();
    assert!(
        (got.node.value() as f64 - vn).abs() < 2e-5,
        "{} vs {vn}",
        got.node
    );
    let ie = i_at(&sk, vn - 3.3);
    assert!(((got.external.value() as f64 - ie) / ie).abs() < 1e-3);
    assert!(
        got.external.value() > 10.0 * got.internal.value(),
        "{got:?}"
    );
    // Kirchhoff's current law at the node.
    let total = (24.0 - got.node.value()) / 4700.0;
    // Kirchhoff holds to the node tolerance: 1 µV across the Schottky is ~1.5e-7 A of 4.3 mA.
    assert!((got.internal.value() + got.external.value() - total).abs() < 1e-4 * total);
}

#[test]
fn rail_back_powering_on_and_off() {
    // Rail on: injected total against the minimum load (the regulator cannot sink).
    assert!(!RailLoad::new(ma(8.0)).unwrap().check(ma(9.0)).unwrap().pass);
    // Rail off: I = series current through R + R_load (Brent, f64), V_rail = I·R_load (Ohm's law).
    let pin = si_pin(3.3, 25.0);
    let rail = UnpoweredRail {
        load: ohm(1000.0),
        allowed: v(0.5),
    };
    let off = rail_off_check(&pin, v(24.0), ohm(10_000.0), &rail).unwrap();
    let i = brent_current(&DiodeParams::SILICON, 24.0, 11_000.05, 298.15);
    assert!(((off.current.value() as f64 - i) / i).abs() < 1e-4);
    assert!((off.rail_voltage.value() as f64 - i * 1000.0).abs() < 1e-4);
    assert!(!off.verdict.pass); // about 2 V on an unpowered 3.3 V rail
                                // Neighbour ADC error: 2 mA · 1e-4 · 10 kΩ = 2 mV.
    assert!(
        (neighbour_adc_error(ma(2.0), 1e-4, ohm(10_000.0))
            .unwrap()
            .value()
            - 2e-3)
            .abs()
            < 1e-9
    );
    assert_eq!(
        neighbour_adc_error(ma(2.0), -1.0, ohm(1.0))
            .unwrap_err()
            .input,
        "coupling ratio"
    );
}

#[test]
fn board_check_totals_and_capacity() {
    // Common practice: a few mA per pin, a larger total (here 5 mA and 20 mA).
    let pin = si_pin(3.0, 85.0);
    let mut board: Board<2> = Board::new(
        pin,
        InjectionLimits {
            positive: ma(20.0),
            negative: ma(20.0),
        },
        Some(RailLoad::new(ma(8.0)).unwrap()),
    );
    // The drain of a valve whose clamp opened: the switch avalanches at 66 V (hand check: the
    // range reaches 66 V, for the avalanche's τ·ln(1 + I₀R/(V_BR − V_s))).
    let valve = Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap();
    let open = SwitchOff::new(
        &valve,
        &Clamp::Avalanche(Breakdown::ideal(v(66.0)).unwrap()),
        Side::Low,
        &Operating::uniform(v(24.0), Amps::new(0.43).unwrap(), tc(25.0)),
    )
    .unwrap();
    let drain = SignalRange::output_sense(&open).unwrap();
    assert_eq!(drain.transient_max.value(), 66.0);
    let t_av = 0.35f64 / 56.0 * (1.0 + 0.43 * 56.0 / 42.0f64).ln();
    assert!((drain.transient_width.value() as f64 - t_av).abs() < 1e-6 * t_av);
    // On a high side, the same opening takes the output below ground: 24 − 66 = −42 V.
    let high = SwitchOff::new(
        &valve,
        &Clamp::Avalanche(Breakdown::ideal(v(66.0)).unwrap()),
        Side::High,
        &Operating::uniform(v(24.0), Amps::new(0.43).unwrap(), tc(25.0)),
    )
    .unwrap();
    assert_eq!(
        SignalRange::output_sense(&high)
            .unwrap()
            .transient_min
            .value(),
        -42.0
    );
    let lim = InjectionLimits {
        positive: ma(5.0),
        negative: ma(5.0),
    };
    let input = BoardInput {
        name: "drain 1",
        signal: drain,
        resistor: ohm(4700.0),
        limits: lim,
    };
    board.add(input).unwrap();
    board
        .add(BoardInput {
            name: "drain 2",
            ..input
        })
        .unwrap();
    // Full: the third is handed back, not dropped and not a panic.
    assert_eq!(
        board.add(BoardInput {
            name: "drain 3",
            ..input
        }),
        Err(BoardInput {
            name: "drain 3",
            ..input
        })
    );
    let r = board.check().unwrap();
    // 4.7 kΩ against 66 V: (66 − 3 − 0.7)/4.7 kΩ ≈ 13 mA per pin: fails the per-pin limit.
    assert!(!r.pass);
    assert!(!r.inputs.get(0).unwrap().positive.pass);
    let sum: f32 = r.inputs.iter().map(|x| x.transient_positive.value()).sum();
    assert!((r.total_positive.value() - sum).abs() < 1e-9);
    assert!(r.worst_margin < 0.0);
}

#[test]
fn bad_inputs_are_named() {
    let e = range(5.0, 0.0, 0.0, 5.0, 1e-3).validate().unwrap_err();
    assert_eq!((e.input, e.reason), ("steady range", Reason::NotIncreasing));
    let e = range(0.0, 5.0, 1.0, 5.0, 1e-3).validate().unwrap_err();
    assert_eq!(e.input, "transient range");
    // Issue: an inverted range (24…0 V) passed `min_resistor` as 0 Ω; every consumer checks it.
    let inverted = range(24.0, 0.0, 0.0, 24.0, 1e-3);
    let lim = InjectionLimits {
        positive: ma(5.0),
        negative: ma(5.0),
    };
    assert_eq!(
        min_resistor(&si_pin(3.3, 25.0), &inverted, lim)
            .unwrap_err()
            .input,
        "steady range"
    );
    assert_eq!(
        transient_energy(&si_pin(3.3, 25.0), &inverted, ohm(1e4))
            .unwrap_err()
            .input,
        "steady range"
    );
    let e = Pin::new(v(-3.3), Diode::FixedDrop(v(0.3)), tc(25.0)).unwrap_err();
    assert_eq!((e.input, e.reason), ("pin supply", Reason::NotPositive));
    let e = Pin::new(v(0.0), Diode::FixedDrop(v(0.3)), tc(25.0)).unwrap_err();
    assert_eq!((e.input, e.reason), ("pin supply", Reason::NotPositive));
    let e = Pin::new(v(3.3), Diode::FixedDrop(v(0.0)), tc(25.0)).unwrap_err();
    assert_eq!(e.input, "diode drop");
    let pin = si_pin(3.3, 25.0);
    let s = range(0.0, 24.0, 0.0, 24.0, 1e-3);
    let e = min_resistor(
        &pin,
        &s,
        InjectionLimits {
            positive: Amps::new(0.0).unwrap(),
            negative: ma(1.0),
        },
    )
    .unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("positive injection limit", Reason::NotPositive)
    );
}

#[test]
fn rail_off_by_every_input_at_once() {
    use kickguard::input::rail::{rail_off_together, RailSource};
    let rail = UnpoweredRail {
        load: ohm(220.0),
        allowed: v(0.5),
    };
    // Fixed 0.6 V clamp drops: Kirchhoff's current law at the rail node is linear (arithmetic),
    // V = R_L·Σ nₖ(Vₖ − V_f)/Rₖ / (1 + R_L·Σ nₖ/Rₖ).
    let pin = Pin::new(v(3.3), Diode::FixedDrop(v(0.6)), tc(85.0)).unwrap();
    let src = [
        RailSource {
            v_signal: v(26.4),
            r_series: ohm(15_000.0),
            count: 4,
        },
        RailSource {
            v_signal: v(24.0),
            r_series: ohm(22_000.0),
            count: 1,
        },
    ];
    let off = rail_off_together(&pin, &src, &rail).unwrap();
    let num = 220.0 * (4.0 * (26.4 - 0.6) / 15_000.0 + (24.0 - 0.6) / 22_000.0);
    let den = 1.0 + 220.0 * (4.0 / 15_000.0 + 1.0 / 22_000.0);
    let want: f64 = num / den;
    assert!(
        (off.rail_voltage.value() as f64 - want).abs() < 1e-5,
        "{} vs {want}",
        off.rail_voltage
    );
    assert!(!off.verdict.pass);
    // One line alone is the one-line law (rail_off_check).
    let one = rail_off_together(&si_pin(3.3, 25.0), &src[1..], &rail).unwrap();
    let alone = rail_off_check(&si_pin(3.3, 25.0), v(24.0), ohm(22_000.0), &rail).unwrap();
    assert!((one.rail_voltage.value() - alone.rail_voltage.value()).abs() < 2e-6);
    // The silicon law, two lines: an independent f64 solve (bisection on the rail voltage, each
    // line's current by the Brent solve of the diode law with its resistor).
    let pin = si_pin(3.3, 25.0);
    let off = rail_off_together(&pin, &src, &rail).unwrap();
    let fed = |vr: f64| {
        4.0 * brent_current(&DiodeParams::SILICON, 26.4 - vr, 15_000.0, 298.15)
            + brent_current(&DiodeParams::SILICON, 24.0 - vr, 22_000.0, 298.15)
            - vr / 220.0
    };
    let (mut lo, mut hi) = (0.0f64, 24.0f64);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if fed(mid) > 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    assert!(
        (off.rail_voltage.value() as f64 - lo).abs() < 1e-4,
        "{} vs {lo}",
        off.rail_voltage
    );
    // Bad input names itself.
    let bad = [RailSource {
        v_signal: v(5.0),
        r_series: ohm(0.0),
        count: 1,
    }];
    assert_eq!(
        rail_off_together(&pin, &bad, &rail).unwrap_err().input,
        "series resistor"
    );
    // No source: the rail stays at 0 V.
    assert_eq!(
        rail_off_together(&pin, &[], &rail)
            .unwrap()
            .rail_voltage
            .value(),
        0.0
    );
}
