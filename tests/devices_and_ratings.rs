//! Coil, breakdown devices, ratings and zener sizing checked against outside sources.
//!
//! Sources named beside each check:
//! - IEC 60028 (international standard of resistance for copper): annealed copper's resistance
//!   temperature coefficient 0.00393 /K at 20 °C; the referred coefficient at T is
//!   1/(1/α₂₀ + T − 20 K), 0.00385 /K at 25 °C (from memory).
//! - SPICE reverse-breakdown branch I = IBV·exp((V − BV)/(NBV·Vt)) (SPICE2, Nagel 1975).
//! - Steady-state thermal resistance, T_j = T_a + P·R_th, and P = E·f (any power-electronics text).

mod common;

use common::{v64, vt64};
use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::sizing::ZenerSizing;
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams, Ideality};
use kickguard::rating::{average_power, single_pulse, PulseRating, ThermalPath};
use kickguard::timing::max_repetition_rate;
use kickguard::{
    Amps, Duty, Henries, Hertz, Joules, Ohms, PerKelvin, Reason, Seconds, Temperature, Volts, Watts,
};

fn tc(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

#[test]
fn copper_coefficient_follows_iec_60028() {
    // Source: IEC 60028, α₂₀ = 0.00393 /K for annealed copper.
    let c = Coil::copper(
        Henries::new(1.0).unwrap(),
        Ohms::new(100.0).unwrap(),
        tc(20.0),
    )
    .unwrap();
    assert!((c.alpha().value() - 0.00393).abs() < 1e-7);
    let r = c.resistance(tc(70.0)).unwrap().value();
    assert!((r - 100.0 * (1.0 + 0.00393 * 50.0)).abs() < 1e-3, "{r}");
    // Referred to 25 °C: 1/(1/0.00393 + 5) = 0.003855 /K (IEC 60028 relation; from memory).
    let c25 = Coil::copper(
        Henries::new(1.0).unwrap(),
        Ohms::new(100.0).unwrap(),
        tc(25.0),
    )
    .unwrap();
    assert!(
        (c25.alpha().value() - 0.003855).abs() < 2e-6,
        "{:?}",
        c25.alpha()
    );
    // Both descriptions of the same winding agree at any temperature (the linear law is exact
    // under re-referencing).
    let r20 = c.resistance(tc(25.0)).unwrap().value();
    let same = Coil::copper(
        Henries::new(1.0).unwrap(),
        Ohms::new(r20).unwrap(),
        tc(25.0),
    )
    .unwrap();
    for t in [-10.0f32, 55.0, 105.0] {
        let (a, b) = (
            c.resistance(tc(t)).unwrap().value(),
            same.resistance(tc(t)).unwrap().value(),
        );
        assert!((a - b).abs() < 1e-3 * a, "{t}: {a} vs {b}");
    }
    // The resistance method inverts R(T).
    let t = c.winding_temperature(Ohms::new(r).unwrap()).unwrap();
    assert!((t.celsius() - 70.0).abs() < 0.01);
    // α = 0 is allowed, and so is no coefficient at all; then the winding temperature cannot be
    // inferred.
    let flat = Coil::new(
        Henries::new(1.0).unwrap(),
        Ohms::new(100.0).unwrap(),
        tc(60.0),
        PerKelvin::ZERO,
    )
    .unwrap();
    let none = Coil::fixed(Henries::new(1.0).unwrap(), Ohms::new(100.0).unwrap()).unwrap();
    for coil in [flat, none] {
        assert_eq!(coil.resistance(tc(-40.0)).unwrap().value(), 100.0);
        assert_eq!(
            coil.winding_temperature(Ohms::new(110.0).unwrap())
                .unwrap_err()
                .input,
            "coil temperature coefficient"
        );
    }
}

#[test]
fn stored_energy_and_hot_pull_in() {
    // ½·L·I² (definition of magnetic energy in an inductor).
    let c = Coil::copper(
        Henries::new(0.9).unwrap(),
        Ohms::new(160.0).unwrap(),
        tc(20.0),
    )
    .unwrap();
    let i = c
        .steady_current(Volts::new(12.0).unwrap(), tc(20.0))
        .unwrap();
    assert!((i.value() - 0.075).abs() < 1e-6);
    assert!((c.stored_energy(i).unwrap().value() - 0.5 * 0.9 * 0.075 * 0.075).abs() < 1e-8);
    // Common practice: a relay operates at fixed ampere-turns, so its must-operate voltage rises
    // with winding resistance; at 75 % of nominal when cold (at the datasheet's 20 °C), a copper
    // coil at +60 K needs 0.75·(1 + 0.00393·60) = 0.927 of nominal.
    let i_op = c.magnetic_current(Volts::new(9.0).unwrap()).unwrap();
    assert!((i_op.value() - 9.0 / 160.0).abs() < 1e-7);
    let p = c
        .pull_in_margin(i_op, Volts::new(12.0).unwrap(), tc(80.0))
        .unwrap();
    assert!((p.must_operate_hot.value() - 9.0 * (1.0 + 0.00393 * 60.0)).abs() < 1e-3);
    assert!((p.margin - (12.0 / p.must_operate_hot.value() - 1.0)).abs() < 1e-6 && p.margin > 0.0);
    let e = c
        .pull_in_margin(Amps::new(0.0).unwrap(), Volts::new(12.0).unwrap(), tc(80.0))
        .unwrap_err();
    assert_eq!(e.input, "operate current");
}

#[test]
fn spice_breakdown_law_and_tempco() {
    // Source: SPICE reverse breakdown I = IBV·exp((V − BV)/(NBV·Vt)) with RS (Nagel 1975):
    // V = BV + NBV·Vt·ln(I/IBV) + RS·I at every current, above and below IBV.
    let b = Breakdown::new(
        BreakdownLaw::Spice {
            bv: Volts::new(18.0).unwrap(),
            ibv: Amps::new(1e-3).unwrap(),
            nbv: Ideality::new(2.0).unwrap(),
            rs: Ohms::new(1.5).unwrap(),
        },
        PerKelvin::new(8e-4).unwrap(),
        tc(25.0),
    )
    .unwrap();
    let t = tc(25.0);
    for i in [1e-6f32, 1.4e-4, 1e-3, 0.05, 0.5, 2.0] {
        let got = b.voltage(Amps::new(i).unwrap(), t).unwrap().value() as f64;
        let want = 18.0 + 2.0 * vt64(298.15) * (i as f64 / 1e-3).ln() + 1.5 * i as f64;
        assert!((got - want).abs() < 2e-5, "I={i}: {got} vs {want}");
    }
    // Tempco: +0.08 %/K over 50 K moves BV by 4 % (at the knee current).
    let hot = b
        .voltage(Amps::new(1e-3).unwrap(), tc(75.0))
        .unwrap()
        .value();
    assert!((hot - (18.0 * 1.04 + 1.5e-3)).abs() < 1e-4, "{hot}");
    // A part-to-part tolerance scales BV and keeps the slope.
    let plus5 = b.scaled(1.05).unwrap();
    let d = plus5.voltage(Amps::new(0.1).unwrap(), t).unwrap().value()
        - b.voltage(Amps::new(0.1).unwrap(), t).unwrap().value();
    assert!((d - 0.9).abs() < 1e-4, "{d}");
    assert_eq!(
        b.voltage(Amps::new(-1.0).unwrap(), t).unwrap_err().reason,
        Reason::Negative
    );
}

#[test]
fn ratings_and_thermal_arithmetic() {
    // P = E·f; T_j = T_a + P·R_th (steady-state thermal resistance, any power-electronics text).
    let p = average_power(Joules::new(0.02).unwrap(), Hertz::new(5.0).unwrap()).unwrap();
    assert!((p.value() - 0.1).abs() < 1e-7);
    let path = ThermalPath {
        resistance_k_per_w: 200.0,
        ambient: tc(55.0),
        junction_max: tc(150.0),
    };
    let c = path.check(p).unwrap();
    assert!((c.junction.celsius() - 75.0).abs() < 1e-3);
    assert!((c.headroom.kelvin() - 75.0).abs() < 1e-3);
    assert!(c.verdict.pass && (c.verdict.margin - (95.0 / 20.0 - 1.0)).abs() < 1e-4);
    assert!((path.max_power().unwrap().value() - 95.0 / 200.0).abs() < 1e-6);
    // Fastest rate: thermal limit 0.475 W / 0.02 J = 23.75 Hz, unless the decay is slower.
    let f = path
        .max_repetition_rate(Joules::new(0.02).unwrap(), Seconds::new(0.01).unwrap())
        .unwrap()
        .value();
    assert!((f - 23.75).abs() < 1e-3, "{f}");
    let f = path
        .max_repetition_rate(Joules::new(0.02).unwrap(), Seconds::new(0.1).unwrap())
        .unwrap()
        .value();
    assert!((f - 10.0).abs() < 1e-4, "{f}");
    let f = max_repetition_rate(
        Seconds::new(0.01).unwrap(),
        Joules::new(0.02).unwrap(),
        path.max_power().unwrap(),
    )
    .unwrap()
    .value();
    assert!((f - 23.75).abs() < 1e-3, "{f}");
    let rating = PulseRating::new(Joules::new(0.1).unwrap()).unwrap();
    let v = single_pulse(Joules::new(0.2).unwrap(), rating).unwrap();
    assert!(!v.pass && (v.margin + 0.5).abs() < 1e-6);
    assert!(!path.check(Watts::new(1.0).unwrap()).unwrap().verdict.pass);
    let bad = ThermalPath {
        resistance_k_per_w: 0.0,
        ..path
    };
    assert_eq!(bad.max_power().unwrap_err().input, "thermal resistance");
    // Issue: a 1e-30 K/W path gave +∞ W; it is outside the accepted range now.
    let tiny = ThermalPath {
        resistance_k_per_w: 1e-30,
        ..path
    };
    assert_eq!(
        tiny.max_power().unwrap_err().reason,
        Reason::OutsideValidatedRange
    );
    let inverted = ThermalPath {
        resistance_k_per_w: 10.0,
        ambient: tc(160.0),
        junction_max: tc(150.0),
    };
    assert_eq!(
        inverted.max_power().unwrap_err().reason,
        Reason::Inconsistent
    );
}

#[test]
fn zener_window_edges_meet_their_requirements() {
    // Sources: the window's upper edge is the closed form V_s + Vz + rz·(I₀ − Izt) + V_D(I₀) =
    // k·V_rating, with V_D from the f64 diode law (Nagel 1975); the lower edge meets the release
    // time, checked by the clamp engine (itself checked against an ODE solver in
    // tests/clamp_reference.rs).
    let t = tc(40.0);
    let s = ZenerSizing {
        coil: Coil::copper(
            Henries::new(0.35).unwrap(),
            Ohms::new(56.0).unwrap(),
            tc(20.0),
        )
        .unwrap(),
        diode: Diode::Law(DiodeParams::SILICON),
        zener_rz: Ohms::new(10.0).unwrap(),
        zener_izt: Amps::new(0.01).unwrap(),
        v_supply: Volts::new(26.4).unwrap(),
        i_start: Amps::new(0.47).unwrap(),
        t_coil: t,
        t_clamp: t,
        switch_rating: Volts::new(60.0).unwrap(),
        rating_fraction: Duty::new(0.8).unwrap(),
        release_current: Amps::new(0.05).unwrap(),
        max_release_time: Seconds::new(5e-3).unwrap(),
    };
    let w = s.window().unwrap();
    let vd = v64(&DiodeParams::SILICON, 0.47, 313.15);
    let vz_max = 0.8 * 60.0 - 26.4 - vd - 10.0 * (0.47 - 0.01);
    assert!(
        (w.max.value() as f64 - vz_max).abs() < 1e-3,
        "{} vs {vz_max}",
        w.max
    );
    let time_at = |vz: f32| {
        let z = Breakdown::new(
            BreakdownLaw::Datasheet {
                vz: Volts::new(vz).unwrap(),
                izt: s.zener_izt,
                rz: s.zener_rz,
            },
            PerKelvin::ZERO,
            t,
        )
        .unwrap();
        SwitchOff::new(
            &s.coil,
            &Clamp::ZenerDiode {
                zener: z,
                diode: s.diode,
            },
            Side::Low,
            &Operating::uniform(s.v_supply, s.i_start, t),
        )
        .unwrap()
        .time_to(s.release_current)
        .unwrap()
        .value()
    };
    assert!(
        (time_at(w.min.value()) - 5e-3).abs() < 1e-6,
        "time at min {}",
        time_at(w.min.value())
    );
    assert!(time_at(w.max.value()) < 5e-3);
    // Conflicting requirements are reported, not papered over.
    let strict = ZenerSizing {
        max_release_time: Seconds::new(1e-3).unwrap(),
        ..s
    };
    assert_eq!(strict.window().unwrap_err().input, "max release time");
    let tiny = ZenerSizing {
        switch_rating: Volts::new(30.0).unwrap(),
        ..s
    };
    assert_eq!(tiny.window().unwrap_err().input, "switch rating");
    let bad = ZenerSizing {
        rating_fraction: Duty::new(0.0).unwrap(),
        ..s
    };
    assert_eq!(
        bad.window().unwrap_err().reason,
        Reason::OutsideValidatedRange
    );
}

#[test]
fn a_returned_energy_charges_the_bulk_capacitor() {
    use kickguard::supply::rail_rise;
    use kickguard::{Farads, Joules, Reason};
    // Energy of a capacitor, ½·C·V² (any circuit text): 100 mJ into 1000 µF at 24 V with no
    // load gives √(576 + 2·0.1/1e-3) = √776 = 27.857 V.
    let c = Farads::new(1e-3).unwrap();
    let v = rail_rise(
        c,
        Volts::new(24.0).unwrap(),
        Joules::new(0.1).unwrap(),
        Amps::new(0.0).unwrap(),
        Seconds::new(0.0).unwrap(),
    )
    .unwrap();
    assert!((v.value() as f64 - 776f64.sqrt()).abs() < 1e-4);
    // Loads drawing 0.5 A for 5 ms take 24·0.5·0.005 = 60 mJ of it: √(576 + 2·0.04/1e-3).
    let v = rail_rise(
        c,
        Volts::new(24.0).unwrap(),
        Joules::new(0.1).unwrap(),
        Amps::new(0.5).unwrap(),
        Seconds::new(5e-3).unwrap(),
    )
    .unwrap();
    assert!((v.value() as f64 - 656f64.sqrt()).abs() < 1e-4);
    // Loads that draw more than is returned leave the rail where the supply holds it.
    let v = rail_rise(
        c,
        Volts::new(24.0).unwrap(),
        Joules::new(0.01).unwrap(),
        Amps::new(1.0).unwrap(),
        Seconds::new(1.0).unwrap(),
    )
    .unwrap();
    assert_eq!(v.value(), 24.0);
    let e = rail_rise(
        c,
        Volts::new(24.0).unwrap(),
        Joules::new(-0.1).unwrap(),
        Amps::new(0.0).unwrap(),
        Seconds::new(0.0).unwrap(),
    )
    .unwrap_err();
    assert_eq!((e.input, e.reason), ("returned energy", Reason::Negative));
    let e = rail_rise(
        c,
        Volts::new(0.0).unwrap(),
        Joules::new(0.1).unwrap(),
        Amps::new(0.0).unwrap(),
        Seconds::new(0.0).unwrap(),
    )
    .unwrap_err();
    assert_eq!((e.input, e.reason), ("rail voltage", Reason::NotPositive));
}
