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
