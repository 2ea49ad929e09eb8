//! Regression tests for the cases a hostile-input sweep found, one test per case, named after
//! it. `cargo test` builds these with overflow checks and debug assertions on, as the sweep did.
//! Check values: where a case had a wrong number, the right one comes from the textbook
//! constant-clamp solution i(t) = (I₀ + V_c/R)·e^(−t/τ) − V_c/R (any circuit-analysis text;
//! from memory) on a clamp whose loop is affine, so it is exact.

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::snubber::{RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{Clamp, Operating, Sample, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diagnosis::classify::Entry;
use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::windows::winding_temperature_from_current;
use kickguard::diagnosis::{Condition, Design, Measurement, ShortedTurns, Verdict, Windows};
use kickguard::diode::{BandGap, Diode, DiodeParams, Ideality, Xti};
use kickguard::input::resistor::{min_resistor, InjectionLimits};
use kickguard::input::{Pin, SignalRange};
use kickguard::pwm::Freewheel;
use kickguard::rating::ThermalPath;
use kickguard::{Amps, Farads, Henries, Ohms, PerKelvin, Seconds, Temperature, Volts};
use std::time::{Duration, Instant};

fn t(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

#[test]
fn case_1_window_entries_at_u32_max_do_not_overflow() {
    let e = Entry {
        lo: u32::MAX,
        hi: u32::MAX,
        condition: Condition::ClampOpen,
    };
    let w = Windows::from_entries(
        [
            e,
            Entry::EMPTY,
            Entry::EMPTY,
            Entry::EMPTY,
            Entry::EMPTY,
            Entry::EMPTY,
        ],
        1,
    );
    assert_eq!(w.classify(u32::MAX), Verdict::Fault(Condition::ClampOpen));
    assert_eq!(w.classify(0), Verdict::Unexplained);
    let w = Windows::from_rows(&[[u32::MAX, u32::MAX, 1]]);
    assert_eq!(w.classify(u32::MAX), Verdict::Fault(Condition::ClampOpen));
    assert_eq!(w.classify(u32::MAX - 1), Verdict::Unexplained);
}

#[test]
fn case_2_sampling_to_zero_amperes_is_right_and_prompt() {
    // A valve through a fixed-drop diode and a datasheet-line zener (18 V at 10 mA, 10 Ω): an
    // affine loop, V_c(i) = 18 − 0.1 + 0.8 + 10·i, so with R_t = 56 + 10 Ω the current is the
    // closed form with V_c = 18.7 V and τ = L/R_t.
    let coil = Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap();
    let z = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: Volts::new(18.0).unwrap(),
            izt: Amps::new(0.01).unwrap(),
            rz: Ohms::new(10.0).unwrap(),
        },
        PerKelvin::ZERO,
        t(25.0),
    )
    .unwrap();
    let clamp = Clamp::ZenerDiode {
        zener: z,
        diode: Diode::FixedDrop(Volts::new(0.8).unwrap()),
    };
    let i0 = 24.0 / 56.0;
    let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(i0).unwrap(), t(25.0));
    let off = SwitchOff::new(&coil, &clamp, Side::Low, &op).unwrap();
    let start = Instant::now();
    let mut buf = [Sample::default(); 64];
    let n = off
        .sample(
            Seconds::new(1e-3).unwrap(),
            Amps::new(0.0).unwrap(),
            &mut buf,
        )
        .unwrap();
    assert!(start.elapsed() < Duration::from_millis(100));
    let (rt, vc) = (66.0f64, 18.7f64);
    let tau = 0.35 / rt;
    for s in &buf[..n] {
        let tt = s.time.value() as f64;
        let want = ((i0 as f64 + vc / rt) * (-tt / tau).exp() - vc / rt).max(0.0);
        assert!(
            (s.current.value() as f64 - want).abs() < 2e-5,
            "{tt} s: {} vs {want}",
            s.current.value()
        );
    }
    // It reaches zero and stops there: the samples cover the whole decay.
    let t_zero = tau * (1.0 + i0 as f64 * rt / vc).ln();
    assert!(
        n as f64 * 1e-3 > t_zero && (n as f64 - 2.0) * 1e-3 < t_zero,
        "{n} samples, zero at {t_zero}"
    );
}

#[test]
fn case_2_avalanche_with_huge_values_samples_to_its_real_end() {
    let coil = Coil::fixed(Henries::new(1000.0).unwrap(), Ohms::new(0.01).unwrap()).unwrap();
    let av = Clamp::Avalanche(Breakdown::ideal(Volts::new(1000.0).unwrap()).unwrap());
    let op = Operating::uniform(
        Volts::new(900.0).unwrap(),
        Amps::new(10.0).unwrap(),
        t(25.0),
    );
    let off = SwitchOff::new(&coil, &av, Side::Low, &op).unwrap();
    let end = off.time_to(Amps::new(0.0).unwrap()).unwrap().value();
    let mut buf = [Sample::default(); 256];
    let dt = end / 100.0;
    let n = off
        .sample(Seconds::new(dt).unwrap(), Amps::new(0.0).unwrap(), &mut buf)
        .unwrap();
    // The last nonzero sample sits within one step of the decay's end.
    let last = buf[..n]
        .iter()
        .rposition(|s| s.current.value() > 0.0)
        .unwrap();
    let t_last = buf[last].time.value();
    assert!(
        (end - t_last) <= 1.01 * dt && t_last < end,
        "{t_last} vs {end}"
    );
}

#[test]
fn case_3_snubbers_that_cannot_be_represented_are_refused() {
    let cases = [(1e-30, 0.0, 1e12), (1e-30, 100.0, 1e12), (1e-6, 1e12, 1e12)];
    for (l, rs, c) in cases {
        let Ok(coil) = Coil::fixed(Henries::new(l).unwrap(), Ohms::new(1.0).unwrap()) else {
            continue;
        };
        let sn = RcSnubber {
            resistor: Ohms::new(rs).unwrap(),
            capacitor: Farads::new(c).unwrap(),
        };
        let r = SnubberSwitchOff::new(
            &coil,
            &sn,
            Volts::new(24.0).unwrap(),
            Amps::new(0.4).unwrap(),
            t(25.0),
        );
        match r {
            Err(e) => assert_eq!(e.input, "snubber"),
            Ok(s) => {
                // If it is accepted, every figure is finite, and a settle time it cannot
                // represent is a typed error, never 0 s.
                assert!(s
                    .current_at(Seconds::new(1e-3).unwrap())
                    .value()
                    .is_finite());
                assert!(s
                    .switch_voltage_at(Seconds::new(1e-3).unwrap())
                    .value()
                    .is_finite());
                match s.settle_time(Amps::new(1e-3).unwrap()) {
                    Ok(t) => assert!(t.value() > 0.0 && t.value().is_finite()),
                    Err(e) => assert_eq!(e.input, "settle time"),
                }
            }
        }
    }
}

#[test]
fn case_4_a_threshold_no_healthy_switch_off_reaches_gives_finite_gaps() {
    let coil = Coil::copper(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        t(20.0),
    )
    .unwrap();
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
        t_clamp_max: t(80.0),
        clamp: Clamp::FreewheelDiode(d),
        clamp_tolerance: 0.0,
        switch_avalanche: Breakdown::ideal(Volts::new(66.0).unwrap()).unwrap(),
        avalanche_tolerance: 0.0,
        shorted: ShortedTurns::Fraction(0.2),
        side: Side::Low,
    };
    let (_, seps) = design
        .separations(&Measurement::SwitchAbove {
            threshold: Volts::new(40.0).unwrap(),
        })
        .unwrap();
    assert!(seps.iter().count() > 0);
    for s in seps.iter() {
        assert!(s.relative_gap.is_finite() && s.gap.is_finite(), "{s:?}");
    }
}

#[test]
fn case_5_no_infinity_or_impossible_values_in_ok() {
    let path = ThermalPath {
        resistance_k_per_w: 1e-30,
        ambient: t(25.0),
        junction_max: t(150.0),
    };
    assert_eq!(path.max_power().unwrap_err().input, "thermal resistance");
    assert!(Freewheel::new(Volts::new(-1.0).unwrap(), Volts::new(0.0).unwrap()).is_err());
    let inverted = SignalRange {
        steady_min: Volts::new(24.0).unwrap(),
        steady_max: Volts::new(0.0).unwrap(),
        transient_min: Volts::new(0.0).unwrap(),
        transient_max: Volts::new(24.0).unwrap(),
        transient_width: Seconds::new(1e-3).unwrap(),
    };
    let pin = Pin::new(
        Volts::new(3.0).unwrap(),
        Diode::Law(DiodeParams::SILICON),
        t(85.0),
    )
    .unwrap();
    let lim = InjectionLimits {
        positive: Amps::new(5e-3).unwrap(),
        negative: Amps::new(5e-3).unwrap(),
    };
    assert_eq!(
        min_resistor(&pin, &inverted, lim).unwrap_err().input,
        "steady range"
    );
    // A product of two extreme valid quantities is a typed error, not +∞.
    let big = Amps::new(1e12).unwrap() * Ohms::new(1e12).unwrap();
    assert!(big.map(|v| v.value().is_finite()).unwrap_or(true));
}

#[test]
fn case_6_diode_parameters_outside_the_validated_box_are_refused() {
    let tnom = t(27.0);
    let (is, n, rs) = (
        Amps::new(1e-14).unwrap(),
        Ideality::new(1.0).unwrap(),
        Ohms::new(0.0).unwrap(),
    );
    assert_eq!(
        DiodeParams::new(
            Amps::new(1e-30).unwrap(),
            n,
            rs,
            BandGap::SILICON,
            Xti::PN,
            tnom
        )
        .unwrap_err()
        .input,
        "IS"
    );
    assert_eq!(
        DiodeParams::new(
            is,
            Ideality::new(0.3).unwrap(),
            rs,
            BandGap::SILICON,
            Xti::PN,
            tnom
        )
        .unwrap_err()
        .input,
        "N"
    );
    assert!(BandGap::ev(0.0).is_err() && BandGap::ev(5.0).is_err());
    assert!(Xti::new(-20.0).is_err());
    assert_eq!(
        DiodeParams::new(is, n, rs, BandGap::SILICON, Xti::PN, t(-100.0))
            .unwrap_err()
            .input,
        "TNOM"
    );
}

#[test]
fn case_8_errors_name_the_argument_that_is_wrong() {
    let e = Coil::copper(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        Temperature::from_kelvin(1.0).unwrap(),
    )
    .unwrap_err();
    assert_eq!(e.input, "reference temperature");
    let coil = Coil::copper(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        t(20.0),
    )
    .unwrap();
    let e =
        winding_temperature_from_current(&coil, Volts::new(-1.0).unwrap(), Amps::new(0.4).unwrap())
            .unwrap_err();
    assert_eq!(e.input, "supply voltage");
}

#[test]
fn case_9_quantities_format_without_core_float_formatting() {
    // The crate's own decimal writer (the path the link proof covers on the targets).
    let mut s = String::new();
    kickguard::units::decimal::write_fixed_point(&mut s, 12.345, 2).unwrap();
    // 12.345f32 is 12.3450002…, above the tie: it rounds up.
    assert_eq!(s, "12.35");
    assert_eq!(format!("{}", Volts::new(-3.5).unwrap()), "-3.5 V");
    assert_eq!(format!("{:.1}", Amps::new(0.26).unwrap()), "0.3 A");
    // An exact tie rounds to even, as core's own formatting does.
    assert_eq!(format!("{:.1}", Amps::new(0.25).unwrap()), "0.2 A");
}

#[test]
fn case_10_a_history_of_capacity_zero_stores_nothing() {
    let mut h: VerdictHistory<0> = VerdictHistory::new();
    h.push(Verdict::Healthy);
    assert_eq!(h.consecutive(Verdict::Healthy), 0);
    assert!(h.latest().is_none());
}

/// Released + supplied against dissipated, relative to the larger side.
fn imbalance(e: &kickguard::clamp::EnergySplit) -> f64 {
    let supplied = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
    let spent = e.coil_resistance.value() as f64
        + e.resistor.value() as f64
        + e.diodes.value() as f64
        + e.zener.value() as f64
        + e.varistor.value() as f64
        + e.switch.value() as f64;
    (supplied - spent).abs() / supplied.abs().max(spent.abs())
}

#[test]
fn case_11_the_energy_balance_holds_for_a_decay_of_one_ppm() {
    // The sweep's case: ½·L·(I₀² − I₁²) cancelled in f32 for a decay of 1 ppm of the current
    // (0.6 % on the diode law, 3 % with a fixed drop, 5.6 % on the H-bridge) where the docs
    // promise 0.01 %. Energy conservation (arithmetic): released + supplied = dissipated.
    let coil = Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap();
    let i0 = 24.0 / 56.0;
    let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(i0).unwrap(), t(25.0));
    let clamps = [
        Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        Clamp::FreewheelDiode(Diode::FixedDrop(Volts::new(0.8).unwrap())),
        Clamp::HBridgeFastDecay(Diode::Law(DiodeParams::SILICON)),
        Clamp::HBridgeFastDecay(Diode::FixedDrop(Volts::new(0.8).unwrap())),
    ];
    for clamp in clamps {
        let off = SwitchOff::new(&coil, &clamp, Side::Low, &op).unwrap();
        for frac in [1e-6f32, 1e-5, 1e-3, 0.5] {
            let i1 = Amps::new(i0 * (1.0 - frac)).unwrap();
            let d = off.decay_to(i1).unwrap();
            let bad = imbalance(&d.energy);
            assert!(
                bad < 1e-4,
                "{clamp:?} to (1 − {frac})·I₀: balance off by {bad}"
            );
        }
        // A profile over two adjacent currents (the second segment a few ulps long).
        let a = i0 * 0.5;
        let b = f32::from_bits(a.to_bits() - 3);
        let p = off
            .profile(&[Amps::new(a).unwrap(), Amps::new(b).unwrap()])
            .unwrap();
        let bad = imbalance(&p.decay.energy);
        assert!(bad < 1e-4, "{clamp:?} profile: balance off by {bad}");
    }
}

#[test]
fn case_12_sampling_a_spice_breakdown_to_zero_ends_at_the_supply() {
    // A TVS across the coil and across a high-side switch on SPICE's exact law: the last
    // sample at 0 A evaluated the law's logarithm at zero (−∞ in Ok). At zero current the coil
    // carries nothing and has no voltage (Faraday, v = L·di/dt with i held at zero): the switch
    // sees the supply, a low-side drain sits at it, a high-side output at 0 V.
    let coil = Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap();
    let tvs = Breakdown::new(
        BreakdownLaw::Spice {
            bv: Volts::new(36.0).unwrap(),
            ibv: Amps::new(1e-3).unwrap(),
            nbv: Ideality::new(1.0).unwrap(),
            rs: Ohms::new(0.5).unwrap(),
        },
        PerKelvin::ZERO,
        t(25.0),
    )
    .unwrap();
    let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(0.42).unwrap(), t(25.0));
    let mut to_zero = 0;
    for (clamp, side) in [
        (Clamp::TvsAcrossCoil(tvs), Side::Low),
        (Clamp::AcrossSwitch(tvs), Side::High),
        (Clamp::AcrossSwitch(tvs), Side::Low),
    ] {
        let off = SwitchOff::new(&coil, &clamp, side, &op).unwrap();
        let end = off.end_current().unwrap();
        let mut buf = [Sample::default(); 400];
        let n = off
            .sample(Seconds::new(2e-5).unwrap(), end, &mut buf)
            .unwrap();
        assert!(n > 2, "{clamp:?}");
        for s in &buf[..n] {
            assert!(
                s.switch_voltage.value().is_finite() && s.output_voltage.value().is_finite(),
                "{clamp:?} {side:?}: {s:?}"
            );
        }
        let last = buf[n - 1];
        if end.value() == 0.0 {
            to_zero += 1;
            assert_eq!(last.current.value(), 0.0);
            assert_eq!(last.switch_voltage.value(), 24.0, "{clamp:?} {side:?}");
            let out = if side == Side::High { 0.0 } else { 24.0 };
            assert_eq!(last.output_voltage.value(), out, "{clamp:?} {side:?}");
        }
    }
    assert_eq!(to_zero, 3, "every one of these decays reaches zero");
}

#[test]
fn case_13_results_the_quantities_cannot_hold_are_errors_naming_them() {
    use kickguard::clamp::closed_form::single_pulse_avalanche_energy;
    use kickguard::Reason;
    // Vt = k·T/q at 1e-30 K is 8.6e-35 V, below the quantities' 1e-30 (SI 2019 k and q).
    let e =
        kickguard::physics::thermal_voltage(Temperature::from_kelvin(1e-30).unwrap()).unwrap_err();
    assert_eq!((e.input, e.reason), ("thermal voltage", Reason::TooSmall));
    // ½·L·I² for 1 µH at 1e-20 A is 5e-47 J: an underflow, not 0 J.
    let e = Henries::new(1e-6)
        .unwrap()
        .stored_energy(Amps::new(1e-20).unwrap())
        .unwrap_err();
    assert_eq!((e.input, e.reason), ("stored energy", Reason::TooSmall));
    let zero = Henries::new(1e-6)
        .unwrap()
        .stored_energy(Amps::new(0.0).unwrap())
        .unwrap();
    assert_eq!(zero.value(), 0.0);
    // A product of two nonzero quantities that underflows: TooSmall.
    let e = (Ohms::new(1e-20).unwrap() * Amps::new(1e-20).unwrap()).unwrap_err();
    assert_eq!((e.input, e.reason), ("product", Reason::TooSmall));
    // The avalanche energy of 1e-30 A.
    let e = single_pulse_avalanche_energy(
        Henries::new(0.35).unwrap(),
        Amps::new(1e-30).unwrap(),
        Volts::new(66.0).unwrap(),
        Volts::new(24.0).unwrap(),
    )
    .unwrap_err();
    assert_eq!((e.input, e.reason), ("avalanche energy", Reason::TooSmall));
    // R·I₀ far beyond 1e12 V: the peak switch voltage is refused, not reported.
    let coil = Coil::fixed(Henries::new(1.0).unwrap(), Ohms::new(1e12).unwrap()).unwrap();
    let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(1e12).unwrap(), t(25.0));
    let rd = Clamp::ResistorDiode {
        resistor: Ohms::new(1e12).unwrap(),
        diode: Diode::FixedDrop(Volts::new(0.8).unwrap()),
    };
    let e = SwitchOff::new(&coil, &rd, Side::Low, &op).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("peak switch voltage", Reason::TooLarge)
    );
    let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(2.0).unwrap(), t(25.0));
    let rd = Clamp::ResistorDiode {
        resistor: Ohms::new(1e12).unwrap(),
        diode: Diode::FixedDrop(Volts::new(0.8).unwrap()),
    };
    let e = SwitchOff::new(&coil, &rd, Side::Low, &op).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("peak switch voltage", Reason::TooLarge)
    );
}

#[test]
fn case_14_magnitudes_below_the_bound_are_refused_everywhere() {
    use kickguard::{Duty, Reason};
    for d in [1e-40f32, 1e-31] {
        assert_eq!(Duty::new(d).unwrap_err().reason, Reason::TooSmall, "{d}");
    }
    assert_eq!(Duty::percent(1e-30).unwrap_err().reason, Reason::TooSmall);
    assert_eq!(PerKelvin::new(1e-38).unwrap_err().reason, Reason::TooSmall);
    assert_eq!(PerKelvin::new(-1e-38).unwrap_err().reason, Reason::TooSmall);
    assert!(Duty::new(0.0).is_ok() && PerKelvin::new(0.0).is_ok() && Duty::new(1e-30).is_ok());
}

#[test]
fn case_15_bin_edges_that_round_together_are_refused() {
    use kickguard::diagnosis::compensate::MeasuredAccuracy;
    use kickguard::diagnosis::windows::Timing;
    use kickguard::{Duty, Hertz, Reason};
    let design = fixed_drop_valve();
    let m = Measurement::SwitchAbove {
        threshold: Volts::new(30.0).unwrap(),
    };
    let timing = Timing {
        tick: Hertz::new(1e4).unwrap(),
        guard: Duty::new(0.02).unwrap(),
        jitter_ticks: 2,
    };
    let acc = MeasuredAccuracy {
        supply: 0.01,
        current: 0.01,
        supply_step: 0.0,
        current_step: 0.0,
    };
    // 24.0001 V and 24.0002 V both round to 24 000 mV: the second bin could never be chosen.
    let supply = [24.0001f32, 24.0002, 26.4].map(|v| Volts::new(v).unwrap());
    let current = [0.4f32, 0.6].map(|a| Amps::new(a).unwrap());
    let e = design
        .compensated_tick_windows(&m, &timing, &acc, supply, current)
        .unwrap_err();
    assert_eq!((e.input, e.reason), ("supply edges", Reason::NotIncreasing));
    // 0.4000001 A and 0.4000002 A: the same microampere.
    let supply = [24.0f32, 26.4].map(|v| Volts::new(v).unwrap());
    let current = [0.4000001f32, 0.4000003, 0.6].map(|a| Amps::new(a).unwrap());
    let e = design
        .compensated_tick_windows(&m, &timing, &acc, supply, current)
        .unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("current edges", Reason::NotIncreasing)
    );
}

#[test]
fn case_16_shorted_turn_factors_the_coil_model_cannot_hold_are_refused_by_name() {
    use kickguard::Reason;
    let mut design = fixed_drop_valve();
    design.shorted = ShortedTurns::Scales {
        inductance: 1e-40,
        resistance: 1e-40,
    };
    let m = Measurement::SwitchAbove {
        threshold: Volts::new(30.0).unwrap(),
    };
    let e = design.separations(&m).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("shorted turns", Reason::OutsideValidatedRange)
    );
    design.shorted = ShortedTurns::Fraction(0.999_99);
    let e = design.separations(&m).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("shorted turns", Reason::OutsideValidatedRange)
    );
    design.shorted = ShortedTurns::Scales {
        inductance: 1e-4,
        resistance: 0.5,
    };
    assert!(design.separations(&m).is_ok());
}

/// A 0.35 H, 56 Ω valve on 21.6 … 26.4 V with a fixed 0.8 V freewheel diode, for the diagnosis
/// cases (invented test input).
fn fixed_drop_valve() -> Design {
    Design {
        coil: Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap(),
        inductance_tolerance: 0.1,
        resistance_tolerance: 0.07,
        v_supply_min: Volts::new(21.6).unwrap(),
        v_supply_max: Volts::new(26.4).unwrap(),
        t_winding_min: t(-10.0),
        t_winding_max: t(80.0),
        t_winding_fault_max: t(130.0),
        t_clamp_min: t(-10.0),
        t_clamp_max: t(80.0),
        clamp: Clamp::FreewheelDiode(Diode::FixedDrop(Volts::new(0.8).unwrap())),
        clamp_tolerance: 0.0,
        switch_avalanche: Breakdown::ideal(Volts::new(66.0).unwrap()).unwrap(),
        avalanche_tolerance: 0.0,
        shorted: ShortedTurns::Fraction(0.2),
        side: Side::Low,
    }
}

#[test]
fn case_17_readings_at_their_accuracy_and_rounding_never_cross_the_resistance_limit() {
    use kickguard::diagnosis::compensate::MeasuredAccuracy;
    // The sweep's case: readings exactly ±1 % off and rounded to the nearest millivolt and
    // microampere crossed the limit by 5e-6 at some healthy corners. Every healthy corner here
    // (supply ends, winding −10 … 80 °C, R ± 7 %, copper 0.00393 /K: IEC 60028), read high in
    // V and low in I by exactly 1 % and rounded, stays within it (arithmetic on V = I·R).
    let mut d = fixed_drop_valve();
    d.coil = Coil::copper(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        t(20.0),
    )
    .unwrap();
    let acc = MeasuredAccuracy {
        supply: 0.01,
        current: 0.01,
        supply_step: 0.0,
        current_step: 0.0,
    };
    let lim = d.resistance_limit(&acc).unwrap();
    let mut corners = 0;
    for v in [21.6f64, 24.0, 26.4] {
        for k in 0..=18 {
            let tc = -10.0 + 5.0 * k as f64;
            for s in [0.93f64, 1.0, 1.07] {
                let r = 56.0 * s * (1.0 + 0.00393 * (tc - 20.0));
                let i = v / r;
                let v_mv = (v * 1.01 * 1e3).round() as u32;
                let i_ua = (i * 0.99 * 1e6).round() as u32;
                assert!(!lim.exceeded(v_mv, i_ua), "{v} V, {tc} °C, R×{s}");
                corners += 1;
            }
        }
    }
    assert_eq!(corners, 171);
    // A winding far hotter than any healthy one (R 10 % above the hottest, read exactly) is
    // over it.
    let r_hot = 56.0 * 1.07 * (1.0 + 0.00393 * 60.0) * 1.10;
    assert!(lim.exceeded(21_600, (21.6 / r_hot * 1e6) as u32));
}
