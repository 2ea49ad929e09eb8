//! Timing and PWM hold checked against sources outside the project.
//!
//! Sources named beside each check:
//! - RL step and decay solutions i(t) = I∞ + (I₀ − I∞)·e^(−t/τ) (standard electronics texts, e.g.
//!   Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 1).
//! - Inductor volt-second balance and the small-ripple approximation
//!   ΔI ≈ (V + V_f)·D·(1 − D)·T/L (R. W. Erickson & D. Maksimović, Fundamentals of Power
//!   Electronics, 2nd ed., ch. 2; from memory).
//! - Relay timing definitions of the IEC 61810 series (release time: de-energise to contacts
//!   open; from memory).
//! - A brute-force f64 simulation of the PWM waveform built from those step/decay solutions,
//!   cycle after cycle until it settles, written here independently of the crate's closed forms.

use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::pwm::{
    compare_value, hold_duty, hysteretic, mean_hold_current, time_to_current, Freewheel,
    HoldOperatingPoint,
};
use kickguard::timing::{
    max_repetition_rate, release_current, release_time, reversal_wait, to_ticks, to_ticks_floor,
};
use kickguard::{
    Amps, Duty, Henries, Hertz, Joules, Ohms, Reason, Seconds, Temperature, Volts, Watts,
};

fn tc(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}
fn coil(l: f32, r: f32) -> Coil {
    Coil::fixed(Henries::new(l).unwrap(), Ohms::new(r).unwrap()).unwrap()
}
fn fw(vd: f32, vz: f32) -> Freewheel {
    Freewheel::new(Volts::new(vd).unwrap(), Volts::new(vz).unwrap()).unwrap()
}
fn hz(f: f32) -> Hertz {
    Hertz::new(f).unwrap()
}
fn duty(d: f32) -> Duty {
    Duty::new(d).unwrap()
}

#[test]
fn pull_in_time_is_the_rl_step_response() {
    // Source: RL step response, t = τ·ln(I∞/(I∞ − I)) (Horowitz & Hill, AoE 3rd ed.).
    for &(l, r, v, i) in &[
        (0.35f32, 56.0f32, 24.0f32, 0.3f32),
        (1e-3, 2.0, 12.0, 0.1),
        (5.0, 1000.0, 24.0, 0.0239),
    ] {
        let got = time_to_current(
            &coil(l, r),
            Volts::new(v).unwrap(),
            tc(25.0),
            Amps::new(i).unwrap(),
        )
        .unwrap()
        .value() as f64;
        let (tau, inf) = (l as f64 / r as f64, v as f64 / r as f64);
        let want = tau * (inf / (inf - i as f64)).ln();
        assert!(((got - want) / want).abs() < 1e-5, "{got} vs {want}");
    }
    let e = time_to_current(
        &coil(0.35, 56.0),
        Volts::new(24.0).unwrap(),
        tc(25.0),
        Amps::new(0.5).unwrap(),
    )
    .unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("pull-in current", Reason::Unreachable)
    );
}

/// f64 brute force: apply on/off segments (RL step/decay solutions) until periodic; returns
/// (i_max, i_min, mean, Q_off) of the last period. Mean and Q_off by Simpson over each segment.
fn simulate(l: f64, r: f64, v: f64, vf: f64, f: f64, d: f64) -> (f64, f64, f64, f64) {
    let tau = l / r;
    let (t_on, t_off) = (d / f, (1.0 - d) / f);
    let seg = |i0: f64, inf: f64, t: f64| inf + (i0 - inf) * (-t / tau).exp();
    let simpson = |i0: f64, inf: f64, t: f64| {
        let n = 200;
        let h = t / n as f64;
        (0..=n)
            .map(|k| {
                let w = if k == 0 || k == n {
                    1.0
                } else if k % 2 == 1 {
                    4.0
                } else {
                    2.0
                };
                w * seg(i0, inf, k as f64 * h)
            })
            .sum::<f64>()
            * h
            / 3.0
    };
    let mut i = 0.0;
    let cycles = (20.0 * tau * f).ceil() as usize + 10;
    let mut out = (0.0, 0.0, 0.0, 0.0);
    for _ in 0..cycles {
        let start = i;
        let top = seg(start, v / r, t_on);
        let q_on = simpson(start, v / r, t_on);
        let bottom = seg(top, -vf / r, t_off);
        let q_off = simpson(top, -vf / r, t_off);
        out = (top, bottom, (q_on + q_off) * f, q_off);
        i = bottom;
    }
    out
}

#[test]
fn pwm_hold_matches_brute_force_and_textbook_limits() {
    for &(l, r, v, vf, vz, f, d) in &[
        (
            0.35f32,
            56.0f32,
            24.0f32,
            0.8f32,
            0.0f32,
            20_000.0f32,
            0.38f32,
        ),
        (0.35, 56.0, 24.0, 0.8, 18.0, 20_000.0, 0.6),
        (0.01, 10.0, 12.0, 0.4, 0.0, 2_000.0, 0.5),
        (0.9, 160.0, 12.0, 0.7, 0.0, 500.0, 0.3),
    ] {
        let p = HoldOperatingPoint::new(
            &coil(l, r),
            Volts::new(v).unwrap(),
            tc(25.0),
            &fw(vf, vz),
            hz(f),
            duty(d),
        )
        .unwrap();
        let rp = p.ripple().unwrap();
        let mean = p.mean_current().unwrap().value() as f64;
        let power = p.freewheel_power().unwrap();
        let vft = (vf + vz) as f64;
        let (imax, imin, smean, q_off) =
            simulate(l as f64, r as f64, v as f64, vft, f as f64, d as f64);
        // Brute-force f64 simulation from the RL step/decay solutions.
        let rel = |a: f32, b: f64| ((a as f64 - b) / b).abs();
        assert!(
            rel(rp.i_max.value(), imax) < 1e-4,
            "i_max {} vs {imax}",
            rp.i_max
        );
        assert!(
            rel(rp.i_min.value(), imin) < 1e-4,
            "i_min {} vs {imin}",
            rp.i_min
        );
        assert!(
            rel(rp.peak_to_peak.value(), imax - imin) < 2e-3,
            "Δi {} vs {}",
            rp.peak_to_peak,
            imax - imin
        );
        // Volt-second balance: mean = (D·V − (1 − D)·V_f)/R (Erickson & Maksimović, ch. 2).
        let vsb = (d as f64 * v as f64 - (1.0 - d as f64) * vft) / r as f64;
        assert!(
            ((mean - vsb) / vsb).abs() < 1e-6 && ((smean - vsb) / vsb).abs() < 1e-4,
            "mean {mean} {smean} {vsb}"
        );
        // Freewheel power V·Q_off/T.
        assert!(
            rel(power.diode.value(), vf as f64 * q_off * f as f64) < 1e-3,
            "P_D {}",
            power.diode
        );
        if vz > 0.0 {
            assert!(
                rel(power.zener.value(), vz as f64 * q_off * f as f64) < 1e-3,
                "P_Z {}",
                power.zener
            );
        } else {
            assert_eq!(power.zener.value(), 0.0);
        }
        // Small-ripple limit (T ≪ τ): exact ripple approaches (V + V_f)·D·(1 − D)·T/L from below.
        let small = rp.small_ripple_estimate.value();
        assert!(rp.peak_to_peak.value() <= small * 1.000_01);
        let t_over_tau = (r / l / f) as f64;
        if t_over_tau < 0.02 {
            assert!(
                rel(rp.peak_to_peak.value(), small as f64) < t_over_tau,
                "{} vs {small}",
                rp.peak_to_peak
            );
        }
    }
}

#[test]
fn duty_and_frequency_inverses() {
    let c = coil(0.35, 56.0);
    let v = Volts::new(24.0).unwrap();
    let f = fw(0.8, 0.0);
    // Volt-second balance solved for D (Erickson & Maksimović, ch. 2).
    let d = hold_duty(&c, v, tc(25.0), &f, Amps::new(0.15).unwrap()).unwrap();
    let p = HoldOperatingPoint::new(&c, v, tc(25.0), &f, hz(20_000.0), d).unwrap();
    assert!((p.mean_current().unwrap().value() - 0.15).abs() < 1e-6);
    assert_eq!(
        mean_hold_current(&c, v, tc(25.0), &f, d).unwrap(),
        p.mean_current().unwrap()
    );
    // The frequency for a ripple target gives that ripple.
    let target = Amps::new(0.005).unwrap();
    let fr = p.frequency_for_ripple(target).unwrap();
    let q = HoldOperatingPoint::new(&c, v, tc(25.0), &f, fr, d).unwrap();
    let pp = q.ripple().unwrap().peak_to_peak.value();
    assert!((pp - 0.005).abs() < 1e-5 * 0.005 + 1e-8, "{pp} at {fr}");
    let e = hold_duty(&c, v, tc(25.0), &f, Amps::new(1.0).unwrap()).unwrap_err();
    assert_eq!((e.input, e.reason), ("hold current", Reason::Unreachable));
    let e = HoldOperatingPoint::new(&c, v, tc(25.0), &f, hz(20_000.0), duty(1.0)).unwrap_err();
    assert_eq!((e.input, e.reason), ("duty", Reason::OutsideValidatedRange));
    assert_eq!(
        Duty::new(1.2).unwrap_err().reason,
        Reason::OutsideValidatedRange
    );
    assert_eq!(Duty::new(f32::NAN).unwrap_err().reason, Reason::NotFinite);
    // Issue: a negative diode drop used to give a hold duty, a negative power and ripple.
    let e = Freewheel::diode(Volts::new(-1.0).unwrap()).unwrap_err();
    assert_eq!((e.input, e.reason), ("diode drop", Reason::NotPositive));
}

#[test]
fn hysteretic_hold_matches_segment_solutions() {
    // Source: RL step/decay solutions (Horowitz & Hill): each phase is one exponential segment.
    let c = coil(0.35, 56.0);
    let h = hysteretic(
        &c,
        Volts::new(24.0).unwrap(),
        tc(25.0),
        &fw(0.8, 0.0),
        Amps::new(0.14).unwrap(),
        Amps::new(0.16).unwrap(),
    )
    .unwrap();
    let (tau, inf, vfr) = (0.35f64 / 56.0, 24.0f64 / 56.0, 0.8f64 / 56.0);
    let t_on = tau * ((inf - 0.14) / (inf - 0.16)).ln();
    let t_off = tau * ((0.16 + vfr) / (0.14 + vfr)).ln();
    assert!(((h.on_time.value() as f64 - t_on) / t_on).abs() < 1e-4);
    assert!(((h.off_time.value() as f64 - t_off) / t_off).abs() < 1e-4);
    assert!(((h.frequency.value() as f64 - 1.0 / (t_on + t_off)) * (t_on + t_off)).abs() < 1e-4);
    // The mean of a slowly rippling current sits midway between the thresholds.
    assert!(
        (h.mean_current.value() - 0.15).abs() < 2e-4,
        "{}",
        h.mean_current
    );
    let e = hysteretic(
        &c,
        Volts::new(24.0).unwrap(),
        tc(25.0),
        &fw(0.8, 0.0),
        Amps::new(0.2).unwrap(),
        Amps::new(0.1).unwrap(),
    )
    .unwrap_err();
    assert_eq!(e.reason, Reason::NotIncreasing);
}

#[test]
fn release_time_adds_the_mechanical_part() {
    // Source: release time = de-energise to contacts open (IEC 61810 series; from memory);
    // modelled as electrical decay to the release current plus the mechanical time. The release
    // current is the must-release voltage over R at the datasheet's reference temperature,
    // the same at every winding temperature (fixed ampere-turns; common practice).
    let t = tc(25.0);
    let relay = Coil::copper(
        Henries::new(0.9).unwrap(),
        Ohms::new(160.0).unwrap(),
        tc(20.0),
    )
    .unwrap();
    let v = Volts::new(12.0).unwrap();
    let i_on = relay.steady_current(v, t).unwrap();
    let off = SwitchOff::new(
        &relay,
        &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
        Side::Low,
        &Operating::uniform(v, i_on, t),
    )
    .unwrap();
    let i_rel = release_current(&relay, Volts::new(1.2).unwrap()).unwrap();
    assert!((i_rel.value() - 1.2 / 160.0).abs() < 1e-8);
    let r = release_time(&off, i_rel, Seconds::new(8e-3).unwrap()).unwrap();
    assert_eq!(r.electrical, off.time_to(i_rel).unwrap());
    assert!((r.total.value() - r.electrical.value() - 8e-3).abs() < 1e-7);
    // A plain diode: slower than τ·ln 10 would be without the diode's drop? No: the drop helps,
    // so the electrical part is below τ·ln(10) (RL decay, Horowitz & Hill).
    let tau_ln10 = relay.inductance().value() / relay.resistance(t).unwrap().value() * 10f32.ln();
    assert!(r.electrical.value() < tau_ln10 && r.electrical.value() > 0.5 * tau_ln10);
    assert_eq!(reversal_wait(&off, i_rel).unwrap(), r.electrical);
    // A release current above the on-current is an error.
    let e = release_time(&off, Amps::new(1.0).unwrap(), Seconds::new(8e-3).unwrap()).unwrap_err();
    assert_eq!((e.input, e.reason), ("end current", Reason::Unreachable));
}

#[test]
fn ticks_and_compare_values_round_up() {
    // Rounding up is the safe direction for a wait and for a hold duty (common practice).
    let khz = hz(1000.0);
    assert_eq!(to_ticks(Seconds::new(0.0167).unwrap(), khz).unwrap(), 17);
    assert_eq!(
        to_ticks_floor(Seconds::new(0.0167).unwrap(), khz).unwrap(),
        16
    );
    assert_eq!(to_ticks(Seconds::new(0.002).unwrap(), khz).unwrap(), 2);
    assert_eq!(
        to_ticks_floor(Seconds::new(0.002).unwrap(), khz).unwrap(),
        2
    );
    assert_eq!(to_ticks(Seconds::new(0.0).unwrap(), khz).unwrap(), 0);
    assert_eq!(
        to_ticks(Seconds::new(3600.0).unwrap(), hz(1e6)).unwrap(),
        3_600_000_000
    );
    assert_eq!(
        to_ticks(Seconds::new(1e4).unwrap(), hz(1e6))
            .unwrap_err()
            .reason,
        Reason::TooLarge
    );
    assert_eq!(Hertz::new(0.0).unwrap_err().reason, Reason::NotPositive);
    assert_eq!(compare_value(duty(0.5), 1000).unwrap(), 500);
    assert_eq!(compare_value(duty(0.5001), 1000).unwrap(), 501);
    assert_eq!(compare_value(duty(1.0), 1000).unwrap(), 1000);
    assert_eq!(
        compare_value(duty(0.5), 0).unwrap_err().input,
        "timer period"
    );
    // Repetition: the slower of the cycle and the thermal limit.
    let f = max_repetition_rate(
        Seconds::new(0.1167).unwrap(),
        Joules::new(0.02).unwrap(),
        Watts::new(0.5).unwrap(),
    )
    .unwrap()
    .value();
    assert!((f - (1.0f32 / 0.1167).min(25.0)).abs() < 1e-3, "{f}");
}
