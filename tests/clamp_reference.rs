//! Clamp engine checked against sources outside the project.
//!
//! Sources named beside each check:
//! - The RL decay with a constant clamp voltage, i(t) = (I₀ + Vc/R)·e^(−t/τ) − Vc/R, its time to
//!   zero τ·ln(1 + I₀R/Vc) and its R → 0 linear ramp L·I₀/Vc (standard electronics texts, e.g.
//!   Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 1 on RL circuits and inductive kick).
//! - The single-pulse avalanche energy ½·L·I²·V_BR/(V_BR − V_DD) of an unclamped inductive switch
//!   (the standard power-MOSFET UIS formula of the manufacturers' application notes; from memory).
//! - An independent numerical integration of the same circuit by a general-purpose ODE solver
//!   from crates.io (`ode_solvers`, Dormand–Prince 5(4), f64).
//! - The series RLC natural response (any circuits textbook): ωd = √(1/LC − (R/2L)²).

mod common;

use common::{v64, vt64};
use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::snubber::{Damping, RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{Clamp, Sample, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::DiodeParams;
use kickguard::{Amps, Farads, Henries, Ohms, Reason, Seconds, Temperature, Volts};
use ode_solvers::{Dopri5, SVector, System};

fn t25() -> Temperature {
    Temperature::from_celsius(25.0).unwrap()
}
fn coil(l: f32, r: f32) -> Coil {
    // α = 0: the coil's resistance is exactly `r` at every temperature.
    Coil::new(Henries::new(l).unwrap(), Ohms::new(r).unwrap(), t25(), 0.0).unwrap()
}
fn a(x: f32) -> Amps {
    Amps::new(x).unwrap()
}
fn v(x: f32) -> Volts {
    Volts::new(x).unwrap()
}

const TK: f64 = 298.15;
const VS: f32 = 24.0;

/// State along the decay, integrated over the normalised fall σ = (I₀ − i)/(I₀ − I₁) from 0 to 1
/// (normalised because the solver's end-point test is absolute):
/// [t, Q, ∫i²dt, ∫V_D·i dt (one diode), ∫V_Z·i dt], each d/dσ = (I₀ − I₁)·L/g(i)·[1, i, i², V_D·i, V_Z·i].
type State = SVector<f64, 5>;

struct DecayOde<'a> {
    l: f64,
    i0: f64,
    span: f64,
    g: &'a dyn Fn(f64) -> f64,
    vd: &'a dyn Fn(f64) -> f64,
    vz: &'a dyn Fn(f64) -> f64,
}

impl System<f64, State> for DecayOde<'_> {
    fn system(&self, sigma: f64, _y: &State, dy: &mut State) {
        let i = self.i0 - sigma * self.span;
        let k = self.span * self.l / (self.g)(i);
        dy[0] = k;
        dy[1] = k * i;
        dy[2] = k * i * i;
        dy[3] = k * (self.vd)(i) * i;
        dy[4] = k * (self.vz)(i) * i;
    }
}

fn ode_decay(
    l: f64,
    i0: f64,
    i1: f64,
    g: &dyn Fn(f64) -> f64,
    vd: &dyn Fn(f64) -> f64,
    vz: &dyn Fn(f64) -> f64,
) -> State {
    let sys = DecayOde {
        l,
        i0,
        span: i0 - i1,
        g,
        vd,
        vz,
    };
    // Fine dense output: the library adds its end point by interpolation, which is only exact
    // when an output point falls in the last step.
    let mut solver = Dopri5::new(sys, 0.0, 1.0, 1e-4, State::zeros(), 1e-11, 1e-30);
    solver.integrate().expect("reference ODE integration");
    *solver.y_out().last().unwrap()
}

/// (name, clamp, g(i), one diode's V_D(i), zener V_Z(i), number of diodes) for the ODE comparison.
type Case<'a> = (
    &'static str,
    Clamp,
    Box<dyn Fn(f64) -> f64 + 'a>,
    &'a dyn Fn(f64) -> f64,
    &'a dyn Fn(f64) -> f64,
    f64,
);

fn rel(got: f32, want: f64, scale: f64) -> f64 {
    (got as f64 - want).abs() / want.abs().max(scale)
}

/// The worst relative error over a grid of τ (10 µs … 1 s) and start currents (1 mA … 20 A),
/// for each diode-law topology, against the Dormand–Prince reference.
#[test]
fn diode_law_paths_match_an_independent_ode_solution() {
    // Source: `ode_solvers` Dopri5 (crates.io), f64, on L·di/dt = −g(i) with the SPICE2 diode
    // law (Nagel 1975) written independently in tests/common.
    let si = DiodeParams::SILICON;
    let sk = DiodeParams::SCHOTTKY;
    let z_spice = Breakdown::new(
        BreakdownLaw::Spice {
            bv: v(18.0),
            ibv: a(1e-3),
            nbv: 2.0,
            rs: Ohms::new(2.0).unwrap(),
        },
        0.0,
        t25(),
    )
    .unwrap();
    let mut worst: f64 = 0.0;
    for &(l, r) in &[
        (1e-5f32, 1.0f32),
        (0.35, 56.0),
        (1.0, 1.0),
        (0.9, 160.0),
        (10.0, 1000.0),
    ] {
        for &i0 in &[1e-3f32, 0.43, 20.0] {
            for &frac in &[0.1f32, 1e-3] {
                let i1 = i0 * frac;
                let c = coil(l, r);
                let (l64, r64, i064, i164) = (l as f64, r as f64, i0 as f64, i1 as f64);
                let d_si = |i: f64| v64(&si, i, TK);
                let d_sk = |i: f64| v64(&sk, i, TK);
                // Breakdown as documented: BV + NBV·Vt·ln(1 + I/IBV) + RS·I.
                let z = |i: f64| 18.0 + 2.0 * vt64(TK) * (i / 1e-3).ln_1p() + 2.0 * i;
                let zero = |_: f64| 0.0;
                let cases: Vec<Case> = vec![
                    (
                        "freewheel Si",
                        Clamp::FreewheelDiode(si),
                        Box::new(move |i| r64 * i + d_si(i)),
                        &d_si,
                        &zero,
                        1.0,
                    ),
                    (
                        "freewheel Schottky",
                        Clamp::FreewheelDiode(sk),
                        Box::new(move |i| r64 * i + d_sk(i)),
                        &d_sk,
                        &zero,
                        1.0,
                    ),
                    (
                        "R + D",
                        Clamp::ResistorDiode {
                            resistor: Ohms::new(r).unwrap(),
                            diode: si,
                        },
                        Box::new(move |i| 2.0 * r64 * i + d_si(i)),
                        &d_si,
                        &zero,
                        1.0,
                    ),
                    (
                        "Z + D",
                        Clamp::ZenerDiode {
                            zener: z_spice,
                            diode: si,
                        },
                        Box::new(move |i| r64 * i + z(i) + d_si(i)),
                        &d_si,
                        &z,
                        1.0,
                    ),
                    (
                        "H-bridge",
                        Clamp::HBridgeFastDecay(si),
                        Box::new(move |i| r64 * i + 2.0 * d_si(i) + VS as f64),
                        &d_si,
                        &zero,
                        2.0,
                    ),
                ];
                for (name, clamp, g, vd, vz, nd) in cases {
                    let off = SwitchOff::new(&c, &clamp, v(VS), a(i0), t25(), t25()).unwrap();
                    let got = off.decay_to(a(i1)).unwrap();
                    let y = ode_decay(l64, i064, i164, &*g, vd, vz);
                    let released = 0.5 * l64 * (i064 * i064 - i164 * i164);
                    let scale = 1e-3 * released;
                    let errs = [
                        ("time", rel(got.time.value(), y[0], 0.0)),
                        ("charge", rel(got.charge.value(), y[1], 0.0)),
                        (
                            "coil R energy",
                            rel(got.energy.coil_resistance.value(), r64 * y[2], scale),
                        ),
                        (
                            "diode energy",
                            rel(got.energy.diodes.value(), nd * y[3], scale),
                        ),
                        ("zener energy", rel(got.energy.zener.value(), y[4], scale)),
                    ];
                    for (what, e) in errs {
                        worst = worst.max(e);
                        assert!(
                            e < 5e-3,
                            "{name} L={l} R={r} I0={i0} I1={i1}: {what} off by {e:e}"
                        );
                    }
                }
            }
        }
    }
    // The issue asks for 0.5 %; the method gives far better. Guard the headroom too.
    assert!(worst < 2e-4, "worst relative error {worst:e}");
}

#[test]
fn constant_clamp_matches_the_textbook_rl_decay() {
    // Source: RL decay with constant clamp voltage (Horowitz & Hill, AoE 3rd ed.): time to zero
    // τ·ln(1 + I₀R/Vc), charge τ·[I₀ − (Vc/R)·ln(1 + I₀R/Vc)], clamp energy V_BR·Q, supply V_s·Q.
    for &(l, r, i0, vbr) in &[
        (0.35f32, 56.0f32, 0.43f32, 40.0f32),
        (1e-4, 0.1, 20.0, 60.0),
        (2.0, 1000.0, 0.01, 25.0),
    ] {
        let off = SwitchOff::new(
            &coil(l, r),
            &Clamp::Avalanche(Breakdown::ideal(v(vbr)).unwrap()),
            v(VS),
            a(i0),
            t25(),
            t25(),
        )
        .unwrap();
        let d = off.decay_to(a(0.0)).unwrap();
        let (l, r, i0, vbr, vs) = (l as f64, r as f64, i0 as f64, vbr as f64, VS as f64);
        let tau = l / r;
        let vc = vbr - vs;
        let t0 = tau * (1.0 + i0 * r / vc).ln();
        let q = tau * (i0 - (vc / r) * (1.0 + i0 * r / vc).ln());
        assert!(
            rel(d.time.value(), t0, 0.0) < 2e-5,
            "t {} vs {t0}",
            d.time.value()
        );
        assert!(
            rel(d.charge.value(), q, 0.0) < 1e-4,
            "Q {} vs {q}",
            d.charge.value()
        );
        assert!(rel(d.energy.switch.value(), vbr * q, 0.0) < 1e-4);
        assert!(rel(d.energy.from_supply.value(), vs * q, 0.0) < 1e-4);
        assert_eq!(off.peak_switch_voltage().value() as f64, vbr);
        // i(t) at t = τ/2 from the textbook expression.
        let mut buf = [Sample::default(); 4];
        off.sample(Seconds::new((tau / 2.0) as f32).unwrap(), a(0.0), &mut buf)
            .unwrap();
        let want = (i0 + vc / r) * (-0.5f64).exp() - vc / r;
        if want > 0.0 {
            assert!(
                rel(buf[1].current.value(), want, 0.0) < 1e-4,
                "i(τ/2) {} vs {want}",
                buf[1].current.value()
            );
        }
    }
}

#[test]
fn r_to_zero_gives_the_linear_ramp_and_the_avalanche_energy_formula() {
    // Source: R → 0 limit, time L·I₀/Vc (Horowitz & Hill, AoE 3rd ed.), and the UIS single-pulse
    // avalanche energy ½·L·I²·V_BR/(V_BR − V_DD) (power-MOSFET application notes; from memory).
    let (l, i0, vbr) = (0.35f64, 2.0f64, 60.0f64);
    let off = SwitchOff::new(
        &coil(l as f32, 1e-6),
        &Clamp::Avalanche(Breakdown::ideal(v(vbr as f32)).unwrap()),
        v(VS),
        a(i0 as f32),
        t25(),
        t25(),
    )
    .unwrap();
    let d = off.decay_to(a(0.0)).unwrap();
    let vc = vbr - VS as f64;
    assert!(
        rel(d.time.value(), l * i0 / vc, 0.0) < 1e-4,
        "ramp time {}",
        d.time.value()
    );
    let e_as = 0.5 * l * i0 * i0 * vbr / (vbr - VS as f64);
    assert!(
        rel(d.energy.switch.value(), e_as, 0.0) < 1e-4,
        "E_AS {} vs {e_as}",
        d.energy.switch.value()
    );
}

#[test]
fn small_clamp_voltage_gives_the_plain_exponential() {
    // Source: RL natural response i = I₀·e^(−t/τ) (Horowitz & Hill, AoE 3rd ed.), the Vc → 0 limit.
    let off = SwitchOff::new(
        &coil(0.9, 160.0),
        &Clamp::SwitchZener(Breakdown::ideal(v(VS * (1.0 + 1e-6))).unwrap()),
        v(VS),
        a(0.075),
        t25(),
        t25(),
    )
    .unwrap();
    let t = off.time_to(a(0.0075)).unwrap().value() as f64;
    let want = 0.9 / 160.0 * 10f64.ln();
    assert!(rel(t as f32, want, 0.0) < 1e-4, "{t} vs {want}");
}

#[test]
fn energy_balance_closes_for_every_topology() {
    // Source: conservation of energy, ½·L·(I₀² − I₁²) + E_supply = Σ dissipated.
    let si = DiodeParams::SILICON;
    let z = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: v(18.0),
            izt: a(5e-3),
            rz: Ohms::new(15.0).unwrap(),
        },
        9e-4,
        t25(),
    )
    .unwrap();
    let tvs = Breakdown::new(
        BreakdownLaw::Spice {
            bv: v(36.0),
            ibv: a(1e-3),
            nbv: 3.0,
            rs: Ohms::new(0.5).unwrap(),
        },
        1e-3,
        t25(),
    )
    .unwrap();
    let clamps = [
        Clamp::FreewheelDiode(si),
        Clamp::ResistorDiode {
            resistor: Ohms::new(100.0).unwrap(),
            diode: si,
        },
        Clamp::ZenerDiode {
            zener: z,
            diode: si,
        },
        Clamp::SwitchZener(tvs),
        Clamp::Avalanche(Breakdown::ideal(v(65.0)).unwrap()),
        Clamp::HBridgeFastDecay(si),
    ];
    for clamp in clamps {
        for &(l, r, i0) in &[
            (0.35f32, 56.0f32, 0.43f32),
            (1e-3, 0.5, 10.0),
            (5.0, 2000.0, 0.005),
        ] {
            let off = SwitchOff::new(
                &coil(l, r),
                &clamp,
                v(VS),
                a(i0),
                t25(),
                Temperature::from_celsius(85.0).unwrap(),
            )
            .unwrap();
            let d = off.decay_to(a(i0 * 0.01)).unwrap();
            let e = d.energy;
            let lhs = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
            let rhs = [e.coil_resistance, e.resistor, e.diodes, e.zener, e.switch]
                .iter()
                .map(|x| x.value() as f64)
                .sum::<f64>();
            let err = (lhs - rhs).abs() / lhs.abs();
            assert!(err < 1e-3, "{clamp:?} L={l}: {lhs} vs {rhs} ({err:e})");
            assert!(
                err < 1e-4,
                "{clamp:?} L={l}: balance {err:e} (tighter than the 0.1 % asked)"
            );
        }
    }
}

#[test]
fn plain_diode_is_several_times_slower_than_a_zener_clamp() {
    // Common practice: a plain freewheeling diode makes a relay release several times slower
    // than a diode + zener clamp of a few times the supply voltage.
    let c = coil(0.9, 160.0);
    let si = DiodeParams::SILICON;
    let plain = SwitchOff::new(
        &c,
        &Clamp::FreewheelDiode(si),
        v(12.0),
        a(0.075),
        t25(),
        t25(),
    )
    .unwrap();
    let z = Breakdown::ideal(v(36.0)).unwrap();
    let zener = SwitchOff::new(
        &c,
        &Clamp::ZenerDiode {
            zener: z,
            diode: si,
        },
        v(12.0),
        a(0.075),
        t25(),
        t25(),
    )
    .unwrap();
    let release = a(0.0075);
    let ratio = plain.time_to(release).unwrap().value() / zener.time_to(release).unwrap().value();
    assert!(ratio > 3.0, "plain/zener release time ratio {ratio}");
}

#[test]
fn sampled_decay_agrees_with_time_to() {
    // Consistency of the sampler with the quadrature (both from the model; the quadrature is
    // checked against the ODE solver above).
    let si = DiodeParams::SILICON;
    let off = SwitchOff::new(
        &coil(0.35, 56.0),
        &Clamp::FreewheelDiode(si),
        v(VS),
        a(0.43),
        t25(),
        t25(),
    )
    .unwrap();
    let mut buf = [Sample::default(); 256];
    let dt = 1e-4f32;
    let n = off
        .sample(Seconds::new(dt).unwrap(), a(1e-3), &mut buf)
        .unwrap();
    assert!(n > 10);
    for w in buf[..n].windows(2) {
        assert!(
            w[1].time > w[0].time && w[1].current < w[0].current,
            "{w:?}"
        );
    }
    for s in &buf[1..n - 1] {
        let t = off.time_to(s.current).unwrap().value();
        assert!(
            (t - s.time.value()).abs() < 1e-3 * s.time.value() + 1e-7,
            "sample {s:?} vs time_to {t}"
        );
    }
    // Switch voltage: supply plus the diode's drop at that current.
    let vd = si.forward_drop(buf[3].current, t25()).unwrap().value();
    assert!((buf[3].switch_voltage.value() - (VS + vd)).abs() < 1e-4);
    // A small buffer is filled and no more.
    let mut small = [Sample::default(); 3];
    assert_eq!(
        off.sample(Seconds::new(dt).unwrap(), a(1e-3), &mut small)
            .unwrap(),
        3
    );
}

/// RLC reference state over normalised time θ = t/T (the solver's end-point test is absolute):
/// [i, v_C, ∫R_s·i² dt].
type RlcState = SVector<f64, 3>;
struct Rlc {
    l: f64,
    rc: f64,
    rs: f64,
    c: f64,
    t_scale: f64,
}
impl System<f64, RlcState> for Rlc {
    fn system(&self, _theta: f64, y: &RlcState, dy: &mut RlcState) {
        dy[0] = -self.t_scale * ((self.rc + self.rs) * y[0] + y[1]) / self.l;
        dy[1] = self.t_scale * y[0] / self.c;
        dy[2] = self.t_scale * self.rs * y[0] * y[0];
    }
}

#[test]
fn rc_snubber_matches_ode_and_textbook_rlc() {
    // Sources: series RLC natural response (circuits textbooks) for the ring frequency, and
    // `ode_solvers` Dopri5 (crates.io, f64) for the peak switch voltage and resistor energy.
    for &(l, rc, rs, cap, i0) in &[
        (0.35f32, 56.0f32, 100.0f32, 100e-9f32, 0.43f32), // underdamped
        (0.35, 56.0, 2000.0, 1e-6, 0.43),                 // close to critical/over
        (0.9, 160.0, 10_000.0, 1e-6, 0.075),              // overdamped
        (1e-3, 1.0, 4.0, 1e-6, 5.0),                      // underdamped, fast
    ] {
        let s = SnubberSwitchOff::new(
            &coil(l, rc),
            &RcSnubber {
                resistor: Ohms::new(rs).unwrap(),
                capacitor: Farads::new(cap).unwrap(),
            },
            v(VS),
            a(i0),
            t25(),
        )
        .unwrap();
        let resp = s.response().unwrap();
        let (l, rc, rs, c, i0) = (l as f64, rc as f64, rs as f64, cap as f64, i0 as f64);
        let r = rc + rs;
        let alpha = r / (2.0 * l);
        let w0sq = 1.0 / (l * c);
        if let Damping::Under { ring_hz } = resp.damping {
            let want = (w0sq - alpha * alpha).sqrt() / (2.0 * std::f64::consts::PI);
            assert!(rel(ring_hz, want, 0.0) < 1e-4, "ring {ring_hz} vs {want}");
        }
        // ODE reference over 30 slowest time constants, dense output for the peak.
        let slow = if alpha * alpha > w0sq {
            -(-alpha + (alpha * alpha - w0sq).sqrt())
        } else {
            alpha
        };
        let t_end = 30.0 / slow;
        let sys = Rlc {
            l,
            rc,
            rs,
            c,
            t_scale: t_end,
        };
        let mut solver = Dopri5::new(
            sys,
            0.0,
            1.0,
            1.0 / 200_000.0,
            RlcState::new(i0, -(VS as f64), 0.0),
            1e-11,
            1e-14,
        );
        solver.integrate().unwrap();
        let mut peak = f64::MIN;
        for y in solver.y_out() {
            peak = peak.max(VS as f64 + rs * y[0] + y[1]);
        }
        let e_rs = solver.y_out().last().unwrap()[2];
        // Sampled i(t) and switch voltage agree with the ODE at a few instants.
        let mut buf = [Sample::default(); 5];
        let step = t_end / 40.0;
        let n = s
            .sample(
                Seconds::new(step as f32).unwrap(),
                Seconds::new(t_end as f32).unwrap(),
                &mut buf,
            )
            .unwrap();
        assert_eq!(n, 5);
        for smp in &buf[..n] {
            let k = ((smp.time.value() as f64 / t_end) * 200_000.0).round() as usize;
            let y = solver.y_out()[k];
            assert!(
                (smp.current.value() as f64 - y[0]).abs() < 1e-4 * i0,
                "i at {:?}: {} vs {}",
                smp.time,
                smp.current,
                y[0]
            );
            let vsw = VS as f64 + rs * y[0] + y[1];
            assert!(
                (smp.switch_voltage.value() as f64 - vsw).abs() < 1e-4 * peak.abs(),
                "v_sw {} vs {vsw}",
                smp.switch_voltage
            );
        }
        assert!(
            rel(resp.peak_switch_voltage.value(), peak, 0.0) < 1e-3,
            "peak {} vs {peak}",
            resp.peak_switch_voltage.value()
        );
        assert!(
            rel(resp.energy_in_resistor.value(), e_rs, 0.0) < 1e-4,
            "E_Rs {} vs {e_rs}",
            resp.energy_in_resistor.value()
        );
        // The envelope-based settle time is conservative: at that time the ODE's |i| is below it.
        let i_end = 1e-3 * i0;
        let ts = s.settle_time(a(i_end as f32)).unwrap().value() as f64;
        let idx = solver
            .x_out()
            .iter()
            .position(|&theta| theta * t_end >= ts)
            .unwrap();
        for y in &solver.y_out()[idx..] {
            assert!(
                y[0].abs() <= i_end * 1.001,
                "current {} after settle time {ts}",
                y[0]
            );
        }
    }
}

#[test]
fn bad_inputs_are_named() {
    let c = coil(0.35, 56.0);
    let si = Clamp::FreewheelDiode(DiodeParams::SILICON);
    let e = SwitchOff::new(&c, &si, v(VS), a(0.0), t25(), t25()).unwrap_err();
    assert_eq!((e.input, e.reason), ("start current", Reason::NotPositive));
    let e = SwitchOff::new(&c, &si, v(0.0), a(0.4), t25(), t25()).unwrap_err();
    assert_eq!((e.input, e.reason), ("supply voltage", Reason::NotPositive));
    // A switch-side clamp at or below the supply can never stop the current.
    let low = Clamp::SwitchZener(Breakdown::ideal(v(20.0)).unwrap());
    let e = SwitchOff::new(&c, &low, v(VS), a(0.4), t25(), t25()).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("breakdown voltage", Reason::CannotClamp)
    );
    let off = SwitchOff::new(&c, &si, v(VS), a(0.4), t25(), t25()).unwrap();
    assert_eq!(off.time_to(a(0.4)).unwrap_err().reason, Reason::Unreachable);
    assert_eq!(off.time_to(a(0.0)).unwrap_err().reason, Reason::Unreachable);
    assert_eq!(off.time_to(a(-0.1)).unwrap_err().reason, Reason::Negative);
    assert_eq!(
        off.time_to(a(1e-25)).unwrap_err().reason,
        Reason::OutsideValidatedRange
    );
    let mut buf = [Sample::default(); 2];
    assert_eq!(
        off.sample(Seconds::new(0.0).unwrap(), a(0.01), &mut buf)
            .unwrap_err()
            .input,
        "sample interval"
    );
    assert_eq!(Henries::new(0.0).unwrap_err().reason, Reason::NotPositive);
    assert_eq!(Ohms::new(-1.0).unwrap_err().reason, Reason::Negative);
    let e = Coil::new(
        Henries::new(1.0).unwrap(),
        Ohms::new(0.0).unwrap(),
        t25(),
        0.0,
    )
    .unwrap_err();
    assert_eq!(e.input, "coil resistance");
    let e = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: v(5.0),
            izt: a(0.1),
            rz: Ohms::new(60.0).unwrap(),
        },
        0.0,
        t25(),
    )
    .unwrap_err();
    assert_eq!((e.input, e.reason), ("rz", Reason::Inconsistent));
}
