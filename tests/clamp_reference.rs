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
//! - SPICE's reverse breakdown I = IBV·exp((V − BV)/(NBV·Vt)) (Nagel 1975), written in f64 here.
//! - The empirical varistor law I = I₁·(V/V₁)^α (common practice) and, for R = 0, its decay time
//!   L·I₁^(1/α)·I₀^(1−1/α)/(V₁·(1 − 1/α)), integrated by hand from L·di/dt = −V₁·(i/I₁)^(1/α).
//! - The square-law MOSFET I_D = K·(V_GS − V_th)² (device-physics textbooks, e.g. Sedra & Smith,
//!   Microelectronic Circuits) for the active clamp, and for R = 0 its decay time
//!   2·L·K·[s₀ − c·ln(1 + s₀/c)], s₀ = √(I₀/K), c = V_Z + V_th − V_s, integrated by hand.

mod common;

use common::{v64, vt64};
use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::single_pulse_avalanche_energy;
use kickguard::clamp::path::END_FRACTION;
use kickguard::clamp::snubber::{Damping, RcSnubber, SnubberSwitchOff};
use kickguard::clamp::{ActiveClamp, Clamp, Operating, Sample, Side, SwitchOff, SwitchedFreewheel};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams, Ideality};
use kickguard::varistor::Varistor;
use kickguard::{Amps, Farads, Henries, Ohms, PerKelvin, Reason, Seconds, Temperature, Volts};
use ode_solvers::{Dopri5, SVector, System};

fn t25() -> Temperature {
    Temperature::from_celsius(25.0).unwrap()
}
fn coil(l: f32, r: f32) -> Coil {
    // No temperature coefficient: the coil's resistance is exactly `r` at every temperature.
    Coil::fixed(Henries::new(l).unwrap(), Ohms::new(r).unwrap()).unwrap()
}
fn law(d: DiodeParams) -> Diode {
    Diode::Law(d)
}
fn nbv(x: f32) -> Ideality {
    Ideality::new(x).unwrap()
}
/// A low-side switch-off with the winding and every part at 25 °C.
fn off_at(c: &Coil, clamp: &Clamp, vs: f32, i0: f32) -> SwitchOff {
    SwitchOff::new(
        c,
        clamp,
        Side::Low,
        &Operating::uniform(v(vs), a(i0), t25()),
    )
    .unwrap()
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
    let (si, sk) = (DiodeParams::SILICON, DiodeParams::SCHOTTKY);
    let z_spice = Breakdown::new(
        BreakdownLaw::Spice {
            bv: v(18.0),
            ibv: a(1e-3),
            nbv: nbv(2.0),
            rs: Ohms::new(2.0).unwrap(),
        },
        PerKelvin::ZERO,
        t25(),
    )
    .unwrap();
    let z_floor = Breakdown::new(
        BreakdownLaw::FlooredAtBv {
            bv: v(18.0),
            ibv: a(1e-3),
            nbv: nbv(2.0),
            rs: Ohms::new(2.0).unwrap(),
        },
        PerKelvin::ZERO,
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
                // SPICE's exact breakdown, V = BV + NBV·Vt·ln(I/IBV) + RS·I (Nagel 1975), and
                // the floored law BV + NBV·Vt·ln(1 + I/IBV) + RS·I.
                let z = |i: f64| 18.0 + 2.0 * vt64(TK) * (i / 1e-3).ln() + 2.0 * i;
                let zf = |i: f64| 18.0 + 2.0 * vt64(TK) * (i / 1e-3).ln_1p() + 2.0 * i;
                let zero = |_: f64| 0.0;
                let cases: Vec<Case> = vec![
                    (
                        "freewheel Si",
                        Clamp::FreewheelDiode(law(si)),
                        Box::new(move |i| r64 * i + d_si(i)),
                        &d_si,
                        &zero,
                        1.0,
                    ),
                    (
                        "freewheel Schottky",
                        Clamp::FreewheelDiode(law(sk)),
                        Box::new(move |i| r64 * i + d_sk(i)),
                        &d_sk,
                        &zero,
                        1.0,
                    ),
                    (
                        "R + D",
                        Clamp::ResistorDiode {
                            resistor: Ohms::new(r).unwrap(),
                            diode: law(si),
                        },
                        Box::new(move |i| 2.0 * r64 * i + d_si(i)),
                        &d_si,
                        &zero,
                        1.0,
                    ),
                    (
                        "Z + D (SPICE law)",
                        Clamp::ZenerDiode {
                            zener: z_spice,
                            diode: law(si),
                        },
                        Box::new(move |i| r64 * i + z(i) + d_si(i)),
                        &d_si,
                        &z,
                        1.0,
                    ),
                    (
                        "Z + D (floored law)",
                        Clamp::ZenerDiode {
                            zener: z_floor,
                            diode: law(si),
                        },
                        Box::new(move |i| r64 * i + zf(i) + d_si(i)),
                        &d_si,
                        &zf,
                        1.0,
                    ),
                    (
                        "TVS across the coil (SPICE law)",
                        Clamp::TvsAcrossCoil(z_spice),
                        Box::new(move |i| r64 * i + z(i)),
                        &zero,
                        &z,
                        0.0,
                    ),
                    (
                        "H-bridge",
                        Clamp::HBridgeFastDecay(law(si)),
                        Box::new(move |i| r64 * i + 2.0 * d_si(i) + VS as f64),
                        &d_si,
                        &zero,
                        2.0,
                    ),
                ];
                for (name, clamp, g, vd, vz, nd) in cases {
                    let off = off_at(&c, &clamp, VS, i0);
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
    // The issue asks for 0.05 %; the method gives far better. Guard the headroom too.
    assert!(worst < 2e-4, "worst relative error {worst:e}");
    println!("diode-law paths against Dormand–Prince: worst relative error {worst:e}");
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
        let off = off_at(
            &coil(l, r),
            &Clamp::Avalanche(Breakdown::ideal(v(vbr)).unwrap()),
            VS,
            i0,
        );
        let d = off.decay_to(a(0.0)).unwrap();
        assert_eq!(off.decay_to_end().unwrap(), d);
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
    let off = off_at(
        &coil(l as f32, 1e-6),
        &Clamp::Avalanche(Breakdown::ideal(v(vbr as f32)).unwrap()),
        VS,
        i0 as f32,
    );
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
    // The closed-form helper gives the same figure.
    let helper = single_pulse_avalanche_energy(
        Henries::new(l as f32).unwrap(),
        a(i0 as f32),
        v(vbr as f32),
        v(VS),
    )
    .unwrap();
    assert!(rel(helper.value(), e_as, 0.0) < 1e-6, "helper {helper}");
}

#[test]
fn small_clamp_voltage_gives_the_plain_exponential() {
    // Source: RL natural response i = I₀·e^(−t/τ) (Horowitz & Hill, AoE 3rd ed.), the Vc → 0 limit.
    let off = off_at(
        &coil(0.9, 160.0),
        &Clamp::AcrossSwitch(Breakdown::ideal(v(VS * (1.0 + 1e-6))).unwrap()),
        VS,
        0.075,
    );
    let t = off.time_to(a(0.0075)).unwrap().value() as f64;
    let want = 0.9 / 160.0 * 10f64.ln();
    assert!(rel(t as f32, want, 0.0) < 1e-4, "{t} vs {want}");
}

#[test]
fn energy_balance_closes_for_every_topology() {
    // Source: conservation of energy, ½·L·(I₀² − I₁²) + E_supply = Σ dissipated.
    let si = law(DiodeParams::SILICON);
    let z = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: v(18.0),
            izt: a(5e-3),
            rz: Ohms::new(15.0).unwrap(),
        },
        PerKelvin::new(9e-4).unwrap(),
        t25(),
    )
    .unwrap();
    let tvs = Breakdown::new(
        BreakdownLaw::Spice {
            bv: v(36.0),
            ibv: a(1e-3),
            nbv: nbv(3.0),
            rs: Ohms::new(0.5).unwrap(),
        },
        PerKelvin::new(1e-3).unwrap(),
        t25(),
    )
    .unwrap();
    let mov = Varistor::new(v(39.0), a(1e-3), 30.0, PerKelvin::ZERO, t25()).unwrap();
    let active = ActiveClamp {
        zener: Breakdown::ideal(v(40.0)).unwrap(),
        zener_current: a(1e-3),
        gate_threshold: v(3.0),
        transconductance_a_per_v2: Some(5.0),
    };
    let clamps = [
        Clamp::FreewheelDiode(si),
        Clamp::FreewheelDiode(Diode::FixedDrop(v(0.8))),
        Clamp::ResistorDiode {
            resistor: Ohms::new(100.0).unwrap(),
            diode: si,
        },
        Clamp::ZenerDiode {
            zener: z,
            diode: si,
        },
        Clamp::TvsAcrossCoil(tvs),
        Clamp::Varistor(mov),
        Clamp::AcrossSwitch(tvs),
        Clamp::Avalanche(Breakdown::ideal(v(65.0)).unwrap()),
        Clamp::ActiveClamp(active),
        Clamp::HBridgeFastDecay(si),
        Clamp::SwitchedFreewheel(SwitchedFreewheel {
            diode: si,
            zener: z,
            bypass: Ohms::new(0.5).unwrap(),
        }),
    ];
    for clamp in clamps {
        for &(l, r, i0) in &[
            (0.35f32, 56.0f32, 0.43f32),
            (1e-3, 0.5, 10.0),
            (5.0, 2000.0, 0.005),
        ] {
            let hot = Temperature::from_celsius(85.0).unwrap();
            let op = Operating {
                supply: v(VS),
                start_current: a(i0),
                winding: t25(),
                diodes: hot,
                breakdown: hot,
            };
            let off = SwitchOff::new(&coil(l, r), &clamp, Side::Low, &op).unwrap();
            let d = off.decay_to(a(i0 * 0.01)).unwrap();
            let e = d.energy;
            let lhs = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
            let parts = [e.resistor, e.diodes, e.zener, e.varistor];
            let rhs = [e.coil_resistance, e.switch]
                .iter()
                .chain(parts.iter())
                .map(|x| x.value() as f64)
                .sum::<f64>();
            let total: f64 = parts.iter().map(|x| x.value() as f64).sum();
            assert!(
                rel(e.clamp_total.value(), total, 1e-9) < 1e-6,
                "{clamp:?}: clamp total {} vs {total}",
                e.clamp_total
            );
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
    let si = law(DiodeParams::SILICON);
    let plain = off_at(&c, &Clamp::FreewheelDiode(si), 12.0, 0.075);
    let z = Breakdown::ideal(v(36.0)).unwrap();
    let zener = off_at(
        &c,
        &Clamp::ZenerDiode {
            zener: z,
            diode: si,
        },
        12.0,
        0.075,
    );
    let release = a(0.0075);
    let ratio = plain.time_to(release).unwrap().value() / zener.time_to(release).unwrap().value();
    assert!(ratio > 3.0, "plain/zener release time ratio {ratio}");
}

#[test]
fn sampled_decay_agrees_with_time_to() {
    // Consistency of the sampler with the quadrature (both from the model; the quadrature is
    // checked against the ODE solver above).
    let si = DiodeParams::SILICON;
    let off = off_at(&coil(0.35, 56.0), &Clamp::FreewheelDiode(law(si)), VS, 0.43);
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
    // Switch voltage: supply plus the diode's drop at that current; a low-side output is the
    // switch voltage itself.
    let vd = si.forward_drop(buf[3].current, t25()).unwrap().value();
    assert!((buf[3].switch_voltage.value() - (VS + vd)).abs() < 1e-4);
    assert_eq!(buf[3].output_voltage, buf[3].switch_voltage);
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
            .sample(Seconds::new(step as f32).unwrap(), &mut buf)
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
    let si = Clamp::FreewheelDiode(law(DiodeParams::SILICON));
    let op = |vs: f32, i0: f32| Operating::uniform(v(vs), a(i0), t25());
    let e = SwitchOff::new(&c, &si, Side::Low, &op(VS, 0.0)).unwrap_err();
    assert_eq!((e.input, e.reason), ("start current", Reason::NotPositive));
    let e = SwitchOff::new(&c, &si, Side::Low, &op(0.0, 0.4)).unwrap_err();
    assert_eq!((e.input, e.reason), ("supply voltage", Reason::NotPositive));
    // A clamp across the switch at or below the supply can never stop the current.
    let low = Clamp::AcrossSwitch(Breakdown::ideal(v(20.0)).unwrap());
    let e = SwitchOff::new(&c, &low, Side::Low, &op(VS, 0.4)).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("breakdown voltage", Reason::CannotClamp)
    );
    // The two temperatures are named fields: a clamp part outside its range names itself.
    let mut cold = op(VS, 0.4);
    cold.diodes = Temperature::from_celsius(-150.0).unwrap();
    let e = SwitchOff::new(&c, &si, Side::Low, &cold).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("diode temperature", Reason::OutsideValidatedRange)
    );
    let bad_drop = Clamp::FreewheelDiode(Diode::FixedDrop(v(-1.0)));
    let e = SwitchOff::new(&c, &bad_drop, Side::Low, &op(VS, 0.4)).unwrap_err();
    assert_eq!((e.input, e.reason), ("diode drop", Reason::NotPositive));
    let off = off_at(&c, &si, VS, 0.4);
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
    let e = off.profile(&[a(0.01), a(0.1)]).unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("profile currents", Reason::NotDecreasing)
    );
    let e = off.profile::<0>(&[]).unwrap_err();
    assert_eq!((e.input, e.reason), ("profile currents", Reason::TooFew));
    assert_eq!(Henries::new(0.0).unwrap_err().reason, Reason::NotPositive);
    assert_eq!(Ohms::new(-1.0).unwrap_err().reason, Reason::Negative);
    let e = Coil::fixed(Henries::new(1.0).unwrap(), Ohms::new(0.0).unwrap()).unwrap_err();
    assert_eq!(e.input, "coil resistance");
    let e = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: v(5.0),
            izt: a(0.1),
            rz: Ohms::new(60.0).unwrap(),
        },
        PerKelvin::ZERO,
        t25(),
    )
    .unwrap_err();
    assert_eq!((e.input, e.reason), ("rz", Reason::Inconsistent));
}

/// f64 root of an increasing function by bisection on [lo, hi] (a textbook method, written
/// here independently of the crate's Illinois solver).
fn bisect(f: impl Fn(f64) -> f64, mut lo: f64, mut hi: f64) -> f64 {
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if f(mid) > 0.0 {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    0.5 * (lo + hi)
}

#[test]
fn varistor_decay_matches_the_hand_integrated_power_law() {
    // Source: varistor law I = I₁·(V/V₁)^α (common practice). With R = 0,
    // L·di/dt = −V₁·(i/I₁)^(1/α) integrates by hand to t = L·I₁^β·I₀^(1−β)/(V₁·(1 − β)),
    // β = 1/α, and all of ½·L·I₀² goes into the varistor; with R > 0, the Dopri5 reference.
    for &alpha in &[5.0f32, 30.0, 80.0] {
        let mov = Varistor::new(v(39.0), a(1e-3), alpha, PerKelvin::ZERO, t25()).unwrap();
        let (l, i0) = (0.35f64, 0.43f64);
        let off = off_at(&coil(l as f32, 1e-9), &Clamp::Varistor(mov), VS, i0 as f32);
        assert!(off.reaches_zero(), "a varistor clamp reaches zero current");
        let d = off.decay_to_end().unwrap();
        let beta = 1.0 / alpha as f64;
        let want = l * 1e-3f64.powf(beta) * i0.powf(1.0 - beta) / (39.0 * (1.0 - beta));
        assert!(
            rel(d.time.value(), want, 0.0) < 2e-5,
            "α={alpha}: {} vs {want}",
            d.time
        );
        let e = d.energy.varistor.value();
        assert!(
            rel(e, 0.5 * l * i0 * i0, 0.0) < 1e-5,
            "α={alpha}: {e} vs {}",
            0.5 * l * i0 * i0
        );
        assert_eq!(d.energy.varistor, d.energy.clamp_total);
        // Switch voltage: supply plus the varistor's voltage at the start current.
        let vv = 39.0 * (i0 / 1e-3).powf(beta);
        assert!(rel(off.peak_switch_voltage().value(), VS as f64 + vv, 0.0) < 1e-5);
        // With a winding resistance: against the ODE.
        let r = 56.0;
        let off = off_at(
            &coil(l as f32, r as f32),
            &Clamp::Varistor(mov),
            VS,
            i0 as f32,
        );
        let g = move |i: f64| r * i + 39.0 * (i / 1e-3).powf(beta);
        let zero = |_: f64| 0.0;
        let i1 = 1e-4 * i0;
        let y = ode_decay(l, i0, i1, &g, &zero, &zero);
        let got = off.decay_to(a(i1 as f32)).unwrap();
        assert!(
            rel(got.time.value(), y[0], 0.0) < 1e-5,
            "α={alpha}: {} vs {}",
            got.time,
            y[0]
        );
        assert!(rel(got.charge.value(), y[1], 0.0) < 1e-5);
    }
}

#[test]
fn active_clamp_follows_the_uis_formula_and_the_square_law() {
    // Sources: the UIS energy ½·L·I²·V_cl/(V_cl − V_s) with V_cl = V_Z + V_th (power-MOSFET
    // practice, from memory) for a clamp without overdrive; with the square-law overdrive
    // √(i/K) (Sedra & Smith) and R = 0, t = 2·L·K·[s₀ − c·ln(1 + s₀/c)], integrated by hand.
    let (l, i0, vz, vth) = (0.015f64, 1.5f64, 40.0f32, 3.0f32);
    let zener = Breakdown::ideal(v(vz)).unwrap();
    let plain = ActiveClamp {
        zener,
        zener_current: a(1e-3),
        gate_threshold: v(vth),
        transconductance_a_per_v2: None,
    };
    let c = coil(l as f32, 1e-9);
    let off = off_at(&c, &Clamp::ActiveClamp(plain), 12.0, i0 as f32);
    let d = off.decay_to_end().unwrap();
    let vcl = (vz + vth) as f64;
    let e_uis = 0.5 * l * i0 * i0 * vcl / (vcl - 12.0);
    assert!(
        rel(d.energy.switch.value(), e_uis, 0.0) < 1e-4,
        "{} vs {e_uis}",
        d.energy.switch
    );
    assert_eq!(d.energy.clamp_total.value(), 0.0, "the switch takes it all");
    assert!(rel(off.peak_switch_voltage().value(), vcl, 0.0) < 1e-6);
    let k = 2.0f64;
    let sq = ActiveClamp {
        transconductance_a_per_v2: Some(k as f32),
        ..plain
    };
    let off = off_at(&c, &Clamp::ActiveClamp(sq), 12.0, i0 as f32);
    let d = off.decay_to_end().unwrap();
    let (s0, cc) = ((i0 / k).sqrt(), vcl - 12.0);
    let want = 2.0 * l * k * (s0 - cc * (1.0 + s0 / cc).ln());
    assert!(
        rel(d.time.value(), want, 0.0) < 1e-5,
        "{} vs {want}",
        d.time
    );
    // Peak: V_Z + V_th + √(I₀/K).
    assert!(rel(off.peak_switch_voltage().value(), vcl + s0, 0.0) < 1e-6);
    // A clamp voltage below the supply cannot switch the coil off.
    let weak = ActiveClamp {
        zener: Breakdown::ideal(v(6.0)).unwrap(),
        ..plain
    };
    let e = SwitchOff::new(
        &c,
        &Clamp::ActiveClamp(weak),
        Side::Low,
        &Operating::uniform(v(12.0), a(1.0), t25()),
    )
    .unwrap_err();
    assert_eq!(
        (e.input, e.reason),
        ("active clamp voltage", Reason::CannotClamp)
    );
}

#[test]
fn high_side_output_swings_below_ground() {
    // Sources: circuit analysis by hand. A high-side switch's output sits at V_s − V_switch
    // at switch-off: a freewheel diode to ground holds it at −V_D(I₀); an internal 45 V clamp
    // on a 12 V supply takes it to −33 V, and the switch absorbs the UIS energy
    // ½·L·I²·45/(45 − 12) (power-MOSFET practice, from memory) in the R → 0 limit.
    let si = DiodeParams::SILICON;
    let (l, i0) = (0.015f32, 1.5f32);
    let op = Operating::uniform(v(12.0), a(i0), t25());
    let c = coil(l, 8.0);
    let fw = SwitchOff::new(&c, &Clamp::FreewheelDiode(law(si)), Side::High, &op).unwrap();
    let vd = v64(&si, i0 as f64, TK);
    assert!(rel(fw.peak_output_voltage().value(), -vd, 0.0) < 1e-5);
    assert!(rel(fw.peak_switch_voltage().value(), 12.0 + vd, 0.0) < 1e-5);
    // The loop is the same on either side: the same decay.
    let low = SwitchOff::new(&c, &Clamp::FreewheelDiode(law(si)), Side::Low, &op).unwrap();
    assert_eq!(fw.time_to(a(0.01)).unwrap(), low.time_to(a(0.01)).unwrap());
    let clamp45 = Clamp::Avalanche(Breakdown::ideal(v(45.0)).unwrap());
    let hs = SwitchOff::new(&coil(l, 1e-9), &clamp45, Side::High, &op).unwrap();
    assert_eq!(hs.peak_output_voltage().value(), -33.0);
    assert_eq!(hs.peak_switch_voltage().value(), 45.0);
    let e = hs.decay_to_end().unwrap().energy.switch.value() as f64;
    let want = 0.5 * l as f64 * (i0 * i0) as f64 * 45.0 / 33.0;
    assert!(rel(e as f32, want, 0.0) < 1e-4, "{e} vs {want}");
    let mut buf = [Sample::default(); 8];
    let n = hs
        .sample(Seconds::new(1e-4).unwrap(), a(0.0), &mut buf)
        .unwrap();
    assert!(buf[..n].iter().all(|s| s.output_voltage.value() <= 0.0));
}

#[test]
fn switched_freewheel_is_zener_plus_diode_at_turn_off_and_a_diode_while_holding() {
    // Source: circuit analysis by hand: with the bypass open the path is zener + diode; with it
    // closed, the diode's drop plus R_on·I (the diode law of Nagel 1975, in f64).
    let si = DiodeParams::SILICON;
    let z = Breakdown::ideal(v(18.0)).unwrap();
    let sw = SwitchedFreewheel {
        diode: law(si),
        zener: z,
        bypass: Ohms::new(0.5).unwrap(),
    };
    let c = coil(0.35, 56.0);
    let a1 = off_at(&c, &Clamp::SwitchedFreewheel(sw), VS, 0.43);
    let a2 = off_at(&c, &sw.final_turn_off(), VS, 0.43);
    assert_eq!(a1.decay_to_end().unwrap(), a2.decay_to_end().unwrap());
    let fw = sw.hold_freewheel(a(0.15), t25()).unwrap();
    let want = v64(&si, 0.15, TK) + 0.5 * 0.15;
    assert!(rel(fw.diode_drop().value(), want, 0.0) < 1e-5);
    assert_eq!(fw.zener().value(), 0.0);
}

#[test]
fn fixed_drop_diode_is_the_textbook_constant_clamp() {
    // Source: RL decay into a constant clamp V_F (Horowitz & Hill, AoE 3rd ed.): time to zero
    // τ·ln(1 + I₀R/V_F); a fixed drop reaches zero, the full law only tends to it.
    let c = coil(0.9, 160.0);
    let fixed = off_at(
        &c,
        &Clamp::FreewheelDiode(Diode::FixedDrop(v(0.7))),
        12.0,
        0.075,
    );
    assert!(fixed.is_closed_form() && fixed.reaches_zero());
    let d = fixed.decay_to_end().unwrap();
    let want = 0.9 / 160.0 * (1.0f64 + 0.075 * 160.0 / 0.7).ln();
    assert!(rel(d.time.value(), want, 0.0) < 2e-5);
    assert!(rel(d.energy.diodes.value(), 0.7 * d.charge.value() as f64, 0.0) < 1e-5);
    let full = off_at(
        &c,
        &Clamp::FreewheelDiode(law(DiodeParams::SILICON)),
        12.0,
        0.075,
    );
    assert!(!full.reaches_zero());
    assert_eq!(
        full.end_current().unwrap().value(),
        0.075 * END_FRACTION,
        "a diode-law decay ends at the stated fraction of its start current"
    );
}

#[test]
fn one_pass_profile_equals_separate_integrations() {
    // Consistency of one pass with separate calls (each checked against the ODE above): the
    // same times and, to the last current, the same energies.
    let si = law(DiodeParams::SILICON);
    let z = Breakdown::new(
        BreakdownLaw::Spice {
            bv: v(18.0),
            ibv: a(1e-3),
            nbv: nbv(2.0),
            rs: Ohms::new(2.0).unwrap(),
        },
        PerKelvin::ZERO,
        t25(),
    )
    .unwrap();
    for clamp in [
        Clamp::FreewheelDiode(si),
        Clamp::ZenerDiode {
            zener: z,
            diode: si,
        },
        Clamp::Avalanche(Breakdown::ideal(v(66.0)).unwrap()),
    ] {
        let off = off_at(&coil(0.35, 56.0), &clamp, VS, 0.43);
        let cur = [a(0.215), a(0.043), a(0.0043)];
        let p = off.profile(&cur).unwrap();
        for (k, c) in cur.iter().enumerate() {
            let t = off.time_to(*c).unwrap().value();
            assert!(
                rel(p.times[k].value(), t as f64, 0.0) < 2e-6,
                "{clamp:?} {k}"
            );
        }
        let d = off.decay_to(cur[2]).unwrap();
        for (x, y) in [
            (p.decay.charge.value(), d.charge.value()),
            (p.decay.energy.diodes.value(), d.energy.diodes.value()),
            (p.decay.energy.zener.value(), d.energy.zener.value()),
            (p.decay.energy.switch.value(), d.energy.switch.value()),
        ] {
            assert!(rel(x, y as f64, 1e-12) < 2e-6, "{clamp:?}: {x} vs {y}");
        }
        assert_eq!(p.peak_switch_voltage, off.peak_switch_voltage());
    }
}

/// Decay integrals towards a steady current i_f, over s = ln(i − i_f), normalised to λ ∈ [0, 1]:
/// [t, ∫V_Z·i dt], each d/dλ = (s₀ − s₁)·L·(i − i_f)/g(i)·[1, V_Z·i]. Near i_f this variable
/// keeps the integrand smooth (g vanishes linearly there), where one uniform in current does not.
struct FloorOde<'a> {
    l: f64,
    f: f64,
    s0: f64,
    s1: f64,
    g: &'a dyn Fn(f64) -> f64,
    vz: &'a dyn Fn(f64) -> f64,
}

impl System<f64, SVector<f64, 2>> for FloorOde<'_> {
    fn system(&self, lam: f64, _y: &SVector<f64, 2>, dy: &mut SVector<f64, 2>) {
        let e = (self.s0 + lam * (self.s1 - self.s0)).exp();
        let i = self.f + e;
        let k = (self.s0 - self.s1) * self.l * e / (self.g)(i);
        dy[0] = k;
        dy[1] = k * (self.vz)(i) * i;
    }
}

fn floor_decay(
    l: f64,
    f: f64,
    i0: f64,
    i1: f64,
    g: &dyn Fn(f64) -> f64,
    vz: &dyn Fn(f64) -> f64,
) -> SVector<f64, 2> {
    let sys = FloorOde {
        l,
        f,
        s0: (i0 - f).ln(),
        s1: (i1 - f).ln(),
        g,
        vz,
    };
    let mut solver = Dopri5::new(sys, 0.0, 1.0, 1e-4, SVector::zeros(), 1e-11, 1e-30);
    solver.integrate().expect("reference ODE integration");
    *solver.y_out().last().unwrap()
}

#[test]
fn spice_clamp_near_the_supply_settles_at_its_steady_current() {
    // Source: SPICE's reverse breakdown I = IBV·exp((V − BV)/(NBV·Vt)) (Nagel 1975): across the
    // switch, the loop R·i + BV + NBV·Vt·ln(i/IBV) + RS·i − V_s = 0 has a root i_f > 0, found here
    // by f64 bisection; times to currents above it against the Dopri5 reference.
    let (bv, ibv, n, rs) = (24.2f32, 1e-3f32, 2.0f32, 0.5f32);
    let tvs = Breakdown::new(
        BreakdownLaw::Spice {
            bv: v(bv),
            ibv: a(ibv),
            nbv: nbv(n),
            rs: Ohms::new(rs).unwrap(),
        },
        PerKelvin::ZERO,
        t25(),
    )
    .unwrap();
    let (l, r, i0) = (0.35f64, 56.0f64, 0.43f64);
    let off = off_at(
        &coil(l as f32, r as f32),
        &Clamp::AcrossSwitch(tvs),
        VS,
        i0 as f32,
    );
    let a_z = n as f64 * vt64(TK);
    let g = move |i: f64| (r + rs as f64) * i + bv as f64 + a_z * (i / ibv as f64).ln() - VS as f64;
    let i_f = bisect(g, 1e-30, i0);
    assert!(i_f > 1e-6, "the reference root {i_f:e}");
    let got = off.steady_current().value() as f64;
    println!(
        "steady current {got:e} vs {i_f:e}: rel {:e}",
        rel(got as f32, i_f, 0.0)
    );
    assert!(
        rel(got as f32, i_f, 0.0) < 1e-4,
        "steady current {got:e} vs {i_f:e}"
    );
    assert!(!off.reaches_zero());
    assert_eq!(off.time_to(a(0.0)).unwrap_err().reason, Reason::Unreachable);
    assert_eq!(
        off.time_to(a((0.5 * i_f) as f32)).unwrap_err().reason,
        Reason::Unreachable
    );
    let vz = move |i: f64| bv as f64 + a_z * (i / ibv as f64).ln() + rs as f64 * i;
    for &i1 in &[0.1 * i0, 2.0 * i_f, 1.05 * i_f] {
        let y = floor_decay(l, i_f, i0, i1, &g, &vz);
        let d = off.decay_to(a(i1 as f32)).unwrap();
        assert!(
            rel(d.time.value(), y[0], 0.0) < 5e-5,
            "to {i1:e}: {} vs {}",
            d.time,
            y[0]
        );
        assert!(rel(d.energy.zener.value(), y[1], 0.0) < 5e-5);
    }
}
