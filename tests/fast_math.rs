//! The micromath backend (`kickguard::fast`) against the libm reference functions and the same
//! outside test vectors.
#![cfg(feature = "micromath")]

use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::diode::DiodeParams;
use kickguard::{fast, Amps, Henries, Ohms, Reason, Temperature, Volts};

fn t(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

#[test]
fn fast_forward_drop_within_its_budget() {
    // Budget documented in `kickguard::fast`: 10 mV from the libm version (itself within 1 mV of
    // the f64 SPICE2 law, tests/diode_reference.rs).
    let mut worst = 0.0f32;
    for d in [DiodeParams::SILICON, DiodeParams::SCHOTTKY] {
        for c in (-40..=150).step_by(5) {
            for k in 0..=70 {
                let i = Amps::new(1e-6 * 10f32.powf(k as f32 / 10.0)).unwrap();
                let exact = d.forward_drop(i, t(c as f32)).unwrap().value();
                let quick = fast::forward_drop(&d, i, t(c as f32)).unwrap().value();
                worst = worst.max((exact - quick).abs());
            }
        }
    }
    assert!(worst < 1e-2, "worst {worst} V");
}

#[test]
fn fast_drop_meets_the_common_practice_vectors() {
    // Common practice: silicon about 0.6–0.7 V at a few mA; Schottky 0.2–0.45 V.
    let v = fast::forward_drop(&DiodeParams::SILICON, Amps::new(2e-3).unwrap(), t(25.0))
        .unwrap()
        .value();
    assert!((0.58..=0.72).contains(&v), "{v}");
    let v = fast::forward_drop(&DiodeParams::SCHOTTKY, Amps::new(5e-3).unwrap(), t(25.0))
        .unwrap()
        .value();
    assert!((0.2..=0.45).contains(&v), "{v}");
    let e =
        fast::forward_drop(&DiodeParams::SILICON, Amps::new(-1.0).unwrap(), t(25.0)).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("forward current", Reason::NotPositive)
    );
}

#[test]
fn fast_constant_clamp_time_within_its_budget() {
    // Budget: 0.2 % from the libm version (itself checked against Horowitz & Hill's closed form).
    for &(l, r, vc) in &[
        (0.35f32, 56.0f32, 42.0f32),
        (0.9, 160.0, 1.0),
        (1e-3, 0.1, 30.0),
    ] {
        for &(i0, i1) in &[(0.43f32, 0.0f32), (0.43, 0.043), (20.0, 1.0)] {
            let c = ConstantClamp::new(
                Henries::new(l).unwrap(),
                Ohms::new(r).unwrap(),
                Volts::new(vc).unwrap(),
                Amps::new(i0).unwrap(),
            )
            .unwrap();
            let i1 = Amps::new(i1).unwrap();
            let exact = c.time_to(i1).unwrap().value();
            let quick = fast::constant_clamp_time(&c, i1).unwrap().value();
            assert!(((exact - quick) / exact).abs() < 2e-3, "{exact} vs {quick}");
        }
    }
}
