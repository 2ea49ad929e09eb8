//! Numerical edge cases: τ from 1 µs to 10 s, currents from 1 µA to 100 A, temperatures from −55
//! to 175 °C, clamp voltages barely above the supply. Every result is within its documented
//! accuracy or an error that says the input is outside the validated range.
//!
//! References, beside each check: the constant-clamp RL decay in closed form (Horowitz & Hill,
//! The Art of Electronics, 3rd ed.) evaluated in f64; the SPICE2 diode law (Nagel 1975) in f64
//! (tests/common); a composite Simpson integration in f64 of the diode-law decay.

mod common;

use common::v64;
use kickguard::breakdown::Breakdown;
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::{Amps, Henries, Ohms, Reason, Temperature, Volts};

fn tc(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

fn coil(l: f32, r: f32) -> Coil {
    Coil::fixed(Henries::new(l).unwrap(), Ohms::new(r).unwrap()).unwrap()
}

/// f64 Simpson in u = ln i of L·i/g(i) from i1 to i0 (tests/common), 40 000 intervals.
fn simpson_time(l: f64, i0: f64, i1: f64, g: &dyn Fn(f64) -> f64) -> f64 {
    common::simpson_decay(l, i0, i1, 40_000, g)[0]
}

#[test]
fn decay_over_the_tau_and_current_extremes() {
    // τ = L/R from 1 µs to 10 s; I₀ from 1 µA to 100 A; a plain silicon diode at −55, 25, 175 °C.
    let si = DiodeParams::SILICON;
    let mut worst = 0.0f64;
    for &(l, r) in &[
        (1e-6f32, 1.0f32),
        (1e-4, 100.0),
        (1.0, 1.0),
        (10.0, 1.0),
        (100.0, 10.0),
    ] {
        for &i0 in &[1e-6f32, 1e-3, 1.0, 100.0] {
            for &c in &[-55.0f32, 25.0, 175.0] {
                let off = SwitchOff::new(
                    &coil(l, r),
                    &Clamp::FreewheelDiode(Diode::Law(si)),
                    Side::Low,
                    &Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(i0).unwrap(), tc(c)),
                )
                .unwrap();
                let i1 = i0 * 1e-2;
                let got = off.time_to(Amps::new(i1).unwrap()).unwrap().value() as f64;
                let tk = c as f64 + 273.15;
                let want = simpson_time(l as f64, i0 as f64, i1 as f64, &|i| {
                    r as f64 * i + v64(&si, i, tk)
                });
                let rel = ((got - want) / want).abs();
                worst = worst.max(rel);
                assert!(rel < 5e-3, "L={l} R={r} I0={i0} T={c}: {got} vs {want}");
            }
        }
    }
    assert!(worst < 1e-4, "worst {worst:e}");
}

#[test]
fn clamp_barely_above_the_supply() {
    // Horowitz & Hill closed form with Vc = V_BR − V_s down to 1e-4 of the supply.
    for &ratio in &[1e-4f32, 1e-3, 1e-2] {
        let vs = 24.0f32;
        let vbr = vs * (1.0 + ratio);
        let (l, r, i0) = (0.35f32, 56.0f32, 0.43f32);
        let off = SwitchOff::new(
            &coil(l, r),
            &Clamp::Avalanche(Breakdown::ideal(Volts::new(vbr).unwrap()).unwrap()),
            Side::Low,
            &Operating::uniform(Volts::new(vs).unwrap(), Amps::new(i0).unwrap(), tc(25.0)),
        )
        .unwrap();
        let d = off.decay_to(Amps::new(0.0).unwrap()).unwrap();
        // Vc is the difference of two f32 numbers: its own rounding is ≈ 1e-7·V_s, so the
        // relative error of Vc, and of the result where Vc matters, grows as 1e-7/ratio.
        let vc = vbr as f64 - vs as f64;
        let tau = l as f64 / r as f64;
        let want = tau * (1.0 + i0 as f64 * r as f64 / vc).ln();
        let rel = ((d.time.value() as f64 - want) / want).abs();
        assert!(rel < 5e-3, "ratio {ratio}: {} vs {want}", d.time.value());
        // At or below the supply it is an error, not a silently clamped result.
        let e = SwitchOff::new(
            &coil(l, r),
            &Clamp::Avalanche(Breakdown::ideal(Volts::new(vs).unwrap()).unwrap()),
            Side::Low,
            &Operating::uniform(Volts::new(vs).unwrap(), Amps::new(i0).unwrap(), tc(25.0)),
        )
        .unwrap_err();
        assert_eq!(
            (e.input, e.reason),
            ("breakdown voltage", Reason::CannotClamp)
        );
    }
}

#[test]
fn temperatures_at_and_beyond_the_validated_range() {
    // Inside −55…175 °C the diode law holds to 1 mV of its f64 form (Nagel 1975); beyond the
    // validated range (−100…250 °C) the answer is an error naming the temperature.
    let si = DiodeParams::SILICON;
    for &c in &[-55.0f32, 0.0, 175.0] {
        for &i in &[1e-6f32, 1e-3, 1.0, 100.0] {
            let got = si
                .forward_drop(Amps::new(i).unwrap(), tc(c))
                .unwrap()
                .value() as f64;
            let want = v64(&si, (i as f64 as f32) as f64, c as f64 + 273.15);
            assert!((got - want).abs() < 1e-3, "T={c} I={i}: {got} vs {want}");
        }
    }
    for c in [-120.0f32, 260.0] {
        let e = si
            .forward_drop(Amps::new(1e-3).unwrap(), tc(c))
            .unwrap_err();
        assert_eq!(
            (e.input, e.reason),
            ("temperature", Reason::OutsideValidatedRange)
        );
    }
    let e = SwitchOff::new(
        &coil(1.0, 10.0),
        &Clamp::FreewheelDiode(Diode::Law(si)),
        Side::Low,
        &Operating {
            supply: Volts::new(24.0).unwrap(),
            start_current: Amps::new(1.0).unwrap(),
            winding: tc(25.0),
            diodes: tc(300.0),
            breakdown: tc(300.0),
        },
    )
    .unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("diode temperature", Reason::OutsideValidatedRange)
    );
}

#[test]
fn end_currents_far_below_the_start() {
    // A diode-law decay is integrated down to any current within e⁴⁸ of the start, and refuses
    // beyond (the work is bounded).
    let off = SwitchOff::new(
        &coil(0.35, 56.0),
        &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        Side::Low,
        &Operating::uniform(
            Volts::new(24.0).unwrap(),
            Amps::new(100.0).unwrap(),
            tc(25.0),
        ),
    )
    .unwrap();
    assert!(off
        .time_to(Amps::new(1e-6).unwrap())
        .unwrap()
        .value()
        .is_finite());
    let e = off.time_to(Amps::new(1e-20).unwrap()).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("end current", Reason::OutsideValidatedRange)
    );
}
