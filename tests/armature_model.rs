//! The moving-armature model against an independent f64 integration of the same equations.
//!
//! Sources:
//! - Reference integrator: `ode_solvers` (crates.io), Dormand–Prince 5(4), f64, dense output;
//!   the library uses its own Bogacki–Shampine 3(2) in f32.
//! - Equations (textbook electromechanics, Fitzgerald & Kingsley, *Electric Machinery*, ch. 3;
//!   from memory): V = R·i + dλ/dt, λ = L(x)·i, F = ½·i²·dL/dx, m·ẍ = ΣF.
//! - The RL rise i(t) = (V/R)·(1 − e^(−R·t/L)) (the textbook first-order solution) for the
//!   phases with the armature at rest, and for the limits.
//! - A magnetic circuit of two air gaps g in series with an ideal core: L = μ₀·N²·A/(2g), so
//!   F = μ₀·N²·A·i²/(4g²) (textbook; from memory), μ₀ = 4π·10⁻⁷ H/m (CODATA, to 10⁻⁹).
//! - The SPICE2 diode (tests/common) for the freewheeling diode at release.
//!
//! Designs: our own invented valves, relays and locks.

mod common;

use kickguard::armature::motion::{pull_in, release, PullIn, Release, Run};
use kickguard::armature::{Armature, GapInductance};
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::{Amps, Henries, Ohms, Seconds, Temperature, Volts};
use ode_solvers::{Dopri5, SVector, System};

/// One invented design: the armature and its drive.
#[derive(Clone, Copy, Debug)]
struct Spec {
    name: &'static str,
    m: f64,
    s: f64,
    f0: f64,
    k: f64,
    load: f64,
    c: f64,
    ls: f64,
    lo: f64,
    g0: f64,
    r: f64,
    v: f64,
}

fn specs() -> Vec<Spec> {
    vec![
        Spec {
            name: "24 V valve",
            m: 0.01,
            s: 1.5e-3,
            f0: 0.5,
            k: 500.0,
            load: 0.3,
            c: 2.0,
            ls: 0.35,
            lo: 0.2,
            g0: 0.5e-3,
            r: 56.0,
            v: 24.0,
        },
        Spec {
            name: "12 V relay",
            m: 0.002,
            s: 0.6e-3,
            f0: 0.15,
            k: 300.0,
            load: 0.0,
            c: 0.3,
            ls: 0.9,
            lo: 0.5,
            g0: 0.2e-3,
            r: 160.0,
            v: 12.0,
        },
        Spec {
            name: "12 V door lock",
            m: 0.03,
            s: 3e-3,
            f0: 0.3,
            k: 200.0,
            load: 0.5,
            c: 1.0,
            ls: 0.04,
            lo: 0.012,
            g0: 0.5e-3,
            r: 8.0,
            v: 12.0,
        },
        Spec {
            name: "24 V fast relay",
            m: 0.001,
            s: 0.4e-3,
            f0: 1.0,
            k: 3000.0,
            load: 0.0,
            c: 0.05,
            ls: 0.6,
            lo: 0.25,
            g0: 0.1e-3,
            r: 220.0,
            v: 24.0,
        },
        Spec {
            name: "48 V contactor",
            m: 0.05,
            s: 2e-3,
            f0: 0.5,
            k: 200.0,
            load: 0.0,
            c: 3.0,
            ls: 2.0,
            lo: 1.0,
            g0: 1e-3,
            r: 200.0,
            v: 48.0,
        },
        Spec {
            name: "5 V latch, undamped",
            m: 0.004,
            s: 2e-3,
            f0: 0.03,
            k: 20.0,
            load: 0.02,
            c: 0.0,
            ls: 0.05,
            lo: 0.03,
            g0: 0.6e-3,
            r: 20.0,
            v: 5.0,
        },
    ]
}

impl Spec {
    fn l_inf(&self) -> f64 {
        (self.lo * (self.g0 + self.s) - self.ls * self.g0) / self.s
    }
    fn l(&self, x: f64) -> f64 {
        let li = self.l_inf();
        li + (self.ls - li) * self.g0 / (self.g0 + x)
    }
    fn slope(&self, x: f64) -> f64 {
        (self.ls - self.l_inf()) * self.g0 / ((self.g0 + x) * (self.g0 + x))
    }
    fn f_open(&self, x: f64) -> f64 {
        self.f0 + self.k * (self.s - x) + self.load
    }
    fn armature(&self) -> Armature {
        Armature {
            mass_kg: self.m as f32,
            stroke_m: self.s as f32,
            preload_n: self.f0 as f32,
            spring_n_per_m: self.k as f32,
            load_n: self.load as f32,
            damping_n_s_per_m: self.c as f32,
            inductance: GapInductance {
                seat: Henries::new(self.ls as f32).unwrap(),
                open: Henries::new(self.lo as f32).unwrap(),
                g0_m: self.g0 as f32,
            },
        }
    }
    /// The armature free between the stops (the reference never touches a stop: each phase is
    /// cut at its event).
    fn free<'a>(&self, drive: &'a dyn Fn(f64) -> f64) -> Free<'a> {
        Free { s: *self, drive }
    }
}

/// The reference system: state (λ, x, v); `drive(i)` is dλ/dt.
struct Free<'a> {
    s: Spec,
    drive: &'a dyn Fn(f64) -> f64,
}

type V3 = SVector<f64, 3>;

impl System<f64, V3> for Free<'_> {
    fn system(&self, _t: f64, y: &V3, dy: &mut V3) {
        // Past a stop the reference keeps flying (its output there is discarded); the gap law
        // is held at half a fringing length beyond the seat so it stays finite.
        let x = y[1].max(-0.5 * self.s.g0);
        let i = y[0] / self.s.l(x);
        dy[0] = (self.drive)(i);
        dy[1] = y[2];
        let f_mag = 0.5 * i * i * self.s.slope(x);
        dy[2] = (self.s.f_open(y[1]) - f_mag - self.s.c * y[2]) / self.s.m;
    }
}

/// Dense reference output of a free phase: (t, i, x) every `dt` from `t0` for `span`.
fn dense(sys: Free<'_>, y0: V3, t0: f64, span: f64, n: usize) -> Vec<(f64, f64, f64)> {
    let s = sys.s;
    let mut solver = Dopri5::new(sys, t0, t0 + span, span / n as f64, y0, 1e-11, 1e-14);
    if let Err(e) = solver.integrate() {
        panic!("{}: reference integration: {e:?}", s.name);
    }
    solver
        .x_out()
        .iter()
        .zip(solver.y_out().iter())
        .map(|(t, y)| (*t, y[0] / s.l(y[1]), y[1]))
        .collect()
}

/// The first interior extreme of i (max if `max`), refined by the parabola through the three
/// points around it: (t, i).
fn extreme(d: &[(f64, f64, f64)], max: bool) -> Option<(f64, f64)> {
    let sg = if max { 1.0 } else { -1.0 };
    for w in d.windows(3) {
        let (a, b, c) = (sg * w[0].1, sg * w[1].1, sg * w[2].1);
        if b >= a && b > c {
            let dt = w[1].0 - w[0].0;
            let den = a - 2.0 * b + c;
            let t = w[1].0 + 0.5 * dt * (a - c) / den;
            let v = b - (a - c) * (a - c) / (8.0 * den);
            return Some((t, sg * v));
        }
    }
    None
}

/// Where x first crosses `level` (downward if `down`), by linear interpolation: (t, i there).
fn crossing(d: &[(f64, f64, f64)], level: f64, down: bool) -> Option<(f64, f64)> {
    for w in d.windows(2) {
        let (x0, x1) = (w[0].2 - level, w[1].2 - level);
        let hit = if down {
            x0 > 0.0 && x1 <= 0.0
        } else {
            x0 < 0.0 && x1 >= 0.0
        };
        if hit {
            let f = x0 / (x0 - x1);
            return Some((
                w[0].0 + f * (w[1].0 - w[0].0),
                w[0].1 + f * (w[1].1 - w[0].1),
            ));
        }
    }
    None
}

fn run(duration: f64, tol: f32) -> Run {
    Run {
        duration: Seconds::new(duration as f32).unwrap(),
        sample_period: Seconds::new((duration / 400.0) as f32).unwrap(),
        tolerance: tol,
    }
}

fn close(what: &str, name: &str, got: f64, want: f64, rel: f64) {
    assert!(
        (got - want).abs() <= rel * want.abs(),
        "{name}: {what} {got} vs reference {want} (rel {:.2e})",
        (got - want).abs() / want.abs()
    );
}

/// Pull-in by the reference: rest on the open stop (closed-form rise with L_open) until the
/// pull reaches the opening force; the free flight (Dormand–Prince) to the seat; the seated
/// rise (closed form with L_seat) to the end. (t_start, t_seat, peak, valley, i_end).
fn reference_pull_in(s: &Spec, t_end: f64) -> (f64, f64, (f64, f64), (f64, f64), f64) {
    let (r, v) = (s.r, s.v);
    let i_move = (2.0 * s.f_open(s.s) / s.slope(s.s)).sqrt();
    assert!(i_move < v / r, "{}: does not pull in", s.name);
    let t_start = -(s.lo / r) * (1.0 - i_move * r / v).ln();
    let drive = move |i: f64| v - r * i;
    let y0 = V3::new(s.lo * i_move, s.s, 0.0);
    let d = dense(s.free(&drive), y0, t_start, t_end - t_start, 200_000);
    let (t_seat, i_seat) = crossing(&d, 0.0, true).expect("reaches the seat");
    let flight: Vec<_> = d.iter().copied().filter(|p| p.0 <= t_seat).collect();
    let peak = extreme(&flight, true).expect("a peak in flight");
    let valley = extreme(&flight, false)
        .filter(|(_, i)| *i < i_seat)
        .unwrap_or((t_seat, i_seat));
    let i_end = v / r + (i_seat - v / r) * (-(t_end - t_seat) * r / s.ls).exp();
    (t_start, t_seat, peak, valley, i_end)
}

fn lib_pull_in(s: &Spec, t_end: f64, buf: &mut [f32]) -> PullIn {
    pull_in(
        &s.armature(),
        Ohms::new(s.r as f32).unwrap(),
        Volts::new(s.v as f32).unwrap(),
        &run(t_end, 1e-6),
        buf,
    )
    .unwrap()
}

/// A duration that holds the pull-in and the seated rise: 30 open-stop time constants.
fn pull_in_span(s: &Spec) -> f64 {
    30.0 * s.lo / s.r
}

#[test]
fn pull_in_matches_the_independent_integration() {
    for s in specs() {
        let t_end = pull_in_span(&s);
        let (t_start, t_seat, peak, valley, i_end) = reference_pull_in(&s, t_end);
        let mut buf = [0f32; 401];
        let p = lib_pull_in(&s, t_end, &mut buf);
        let n = s.name;
        close(
            "motion start",
            n,
            p.motion_start.unwrap().value() as f64,
            t_start,
            2e-4,
        );
        close("seated", n, p.seated.unwrap().value() as f64, t_seat, 1e-3);
        let (pk, vl) = (p.peak.unwrap(), p.valley.unwrap());
        close("peak time", n, pk.time.value() as f64, peak.0, 2e-3);
        close("peak current", n, pk.current.value() as f64, peak.1, 5e-4);
        close("valley time", n, vl.time.value() as f64, valley.0, 2e-3);
        close(
            "valley current",
            n,
            vl.current.value() as f64,
            valley.1,
            5e-4,
        );
        close("end current", n, p.end_current.value() as f64, i_end, 5e-4);
        println!(
            "{n:<22} start {:.4} ms, seated {:.4} ms, dip {:.1} mA ({:.1} % of the peak), {} steps",
            t_start * 1e3,
            t_seat * 1e3,
            (peak.1 - valley.1) * 1e3,
            100.0 * (peak.1 - valley.1) / peak.1,
            p.steps
        );
        // The samples are the integration's values at k·Δt: the first is zero, and one in
        // the flat seated end matches the closed form.
        assert_eq!(buf[0], 0.0);
        assert_eq!(p.samples, 401);
        close("last sample", n, buf[400] as f64, i_end, 5e-4);
    }
}

/// Energy balance (issue: electrical input = copper + mechanical work + damping + change in
/// field energy), closing to 10⁻⁴ of the input on every design.
#[test]
fn pull_in_energy_balances() {
    for s in specs() {
        let p = lib_pull_in(&s, pull_in_span(&s), &mut []);
        let e = p.energy;
        let supply = e.source + e.loop_loss;
        // The supply: copper + field + everything the field did on the armature.
        let electrical = e.loop_loss + (e.field_end - e.field_start) + e.magnetic_work;
        let mechanical = e.kinetic_end + e.spring + e.load + e.damping + e.impact;
        assert!(
            (supply - electrical).abs() <= 1e-4 * supply,
            "{}: {e:?}",
            s.name
        );
        assert!(
            (e.magnetic_work - mechanical).abs() <= 1e-4 * supply,
            "{}: {e:?}",
            s.name
        );
        // The supply's energy by the closed form it must also match: V·∫i dt is not tracked,
        // but R·∫i² is, and the copper loss alone exceeds the field's final energy here.
        assert!(
            e.magnetic_work > 0.0 && e.impact >= 0.0,
            "{}: {e:?}",
            s.name
        );
    }
}

/// Limits: no force (L_open = L_seat), no stroke, or a mass too heavy to move in the run give
/// the plain RL rise.
#[test]
fn limits_give_the_plain_rise() {
    let s = specs()[0];
    let t_end = pull_in_span(&s);
    let rise = |l: f64, t: f64| (s.v / s.r) * (1.0 - (-t * s.r / l).exp());
    let mut flat = s;
    flat.lo = flat.ls;
    let mut still = s;
    still.s = 0.0;
    for (what, spec, l) in [
        ("L_open = L_seat", flat, s.ls),
        ("zero stroke", still, s.lo),
    ] {
        let mut a = spec.armature();
        if spec.s == 0.0 {
            // With no stroke the gap never leaves its only position: L = L_open.
            a.inductance.seat = a.inductance.open;
        }
        let mut buf = [0f32; 401];
        let p = pull_in(
            &a,
            Ohms::new(s.r as f32).unwrap(),
            Volts::new(s.v as f32).unwrap(),
            &run(t_end, 1e-6),
            &mut buf,
        )
        .unwrap();
        assert!(
            p.motion_start.is_none() && p.peak.is_none(),
            "{what}: {p:?}"
        );
        for (k, x) in buf.iter().enumerate() {
            let t = k as f64 * t_end / 400.0;
            assert!(
                (*x as f64 - rise(l, t)).abs() <= 2e-4 * s.v / s.r,
                "{what}: sample {k}"
            );
        }
    }
    // A mass of 10⁶ kg starts to move but travels a negligible distance in the run: no dip,
    // the current is the rise with L_open (the motion's back-EMF is ~ 10⁻⁸ of the drive).
    let mut heavy = s;
    heavy.m = 1e6;
    let mut buf = [0f32; 401];
    let p = lib_pull_in(&heavy, t_end, &mut buf);
    assert!(
        p.motion_start.is_some() && p.seated.is_none() && p.peak.is_none(),
        "{p:?}"
    );
    close(
        "heavy end current",
        "heavy",
        p.end_current.value() as f64,
        rise(s.lo, t_end),
        1e-4,
    );
}

/// The force law against the two-gap magnetic circuit: N = 1000 turns, A = 1 cm², gaps
/// g = 0.4 … 2 mm, 0.5 A: L = μ₀·N²·A/(2g) is our law with L∞ = 0 and L_seat·g₀ = μ₀·N²·A/2
/// (g = g₀ + x, g₀ = 0.4 mm), and F = μ₀·N²·A·i²/(4g²).
#[test]
fn force_law_matches_the_two_gap_circuit() {
    let mu0 = 4.0e-7 * std::f64::consts::PI;
    let (n, area, g0, stroke, i) = (1000.0f64, 1e-4f64, 0.4e-3f64, 1.6e-3f64, 0.5f64);
    let l_of = |g: f64| mu0 * n * n * area / (2.0 * g);
    let a = Armature {
        mass_kg: 0.01,
        stroke_m: stroke as f32,
        preload_n: 0.0,
        spring_n_per_m: 0.0,
        load_n: 0.0,
        damping_n_s_per_m: 0.0,
        inductance: GapInductance {
            seat: Henries::new(l_of(g0) as f32).unwrap(),
            open: Henries::new(l_of(g0 + stroke) as f32).unwrap(),
            g0_m: g0 as f32,
        },
    };
    for x in [0.0, 0.4e-3, 0.8e-3, 1.6e-3] {
        let g = g0 + x;
        let want = mu0 * n * n * area * i * i / (4.0 * g * g);
        let got = a.magnetic_force(i as f32, x as f32) as f64;
        assert!(
            (got - want).abs() <= 1e-5 * want,
            "x = {x}: {got} vs {want}"
        );
        let l = a.inductance_at(x as f32) as f64;
        assert!((l - l_of(g)).abs() <= 1e-5 * l_of(g), "L at {x}: {l}");
    }
    // By hand at g = 0.4 mm: 4π·10⁻⁷·10⁶·10⁻⁴·0.25/(4·1.6·10⁻⁷) = 49.09 N.
    assert!((a.magnetic_force(0.5, 0.0) - 49.087).abs() < 0.01);
}

/// Release through a silicon freewheeling diode: the seated fall (Dormand–Prince on the fixed
/// L_seat) to the current that lets go, then the free flight.
#[test]
fn release_matches_the_independent_integration() {
    let p = DiodeParams::SILICON;
    let tk = 298.15;
    for s in specs() {
        let (i0, r) = (s.v / s.r, s.r);
        let t = Temperature::from_kelvin(tk as f32).unwrap();
        let coil = Coil::fixed(
            Henries::new(s.ls as f32).unwrap(),
            Ohms::new(r as f32).unwrap(),
        )
        .unwrap();
        let op = Operating::uniform(
            Volts::new(s.v as f32).unwrap(),
            Amps::new(i0 as f32).unwrap(),
            t,
        );
        let off =
            SwitchOff::new(&coil, &Clamp::FreewheelDiode(Diode::Law(p)), Side::Low, &op).unwrap();
        let g = move |i: f64| r * i + common::v64(&p, i, tk);
        let i_hold = (2.0 * s.f_open(0.0) / s.slope(0.0)).sqrt();
        let t_release = common::ode::fall_time(s.ls, i0, i_hold, &g, 1e-3, 1e-11, 1e-14);
        let span = 8.0 * s.ls / r;
        let drive = move |i: f64| if i > 0.0 { -g(i) } else { 0.0 };
        let d = dense(
            s.free(&drive),
            V3::new(s.ls * i_hold, 0.0, 0.0),
            t_release,
            span,
            200_000,
        );
        let opened = crossing(&d, s.s, false);
        let valley = extreme(&d, false);
        let lib: Release =
            release(&s.armature(), &off, &run(t_release + span, 1e-6), &mut []).unwrap();
        let n = s.name;
        assert!(lib.release_start.is_some(), "{n}: {lib:?}");
        close(
            "release start",
            n,
            lib.release_start.unwrap().value() as f64,
            t_release,
            5e-4,
        );
        match (opened, lib.opened) {
            (Some((t, _)), Some(x)) => close("opened", n, x.value() as f64, t, 2e-3),
            (None, None) => {}
            other => panic!("{n}: opened {other:?}"),
        }
        if let Some((tv, iv)) = valley.filter(|v| opened.is_none_or(|o| v.0 < o.0)) {
            let v = lib.valley.expect("valley");
            close("valley time", n, v.time.value() as f64, tv, 3e-3);
            close("valley current", n, v.current.value() as f64, iv, 1e-3);
            // The bump's top: the reference's next maximum (before the open stop), or the
            // current at the stop if it is still rising there.
            let after: Vec<_> = d.iter().copied().filter(|p| p.0 > tv).collect();
            let (tb, ib) = extreme(&after, true)
                .filter(|b| opened.is_none_or(|o| b.0 < o.0))
                .or(opened)
                .expect("a top after the valley");
            let b = lib.bump.expect("bump");
            close("bump time", n, b.time.value() as f64, tb, 3e-3);
            close("bump current", n, b.current.value() as f64, ib, 1e-3);
        } else {
            assert!(
                lib.valley.is_none(),
                "{n}: a valley the reference has not: {lib:?}"
            );
        }
        println!(
            "{n:<22} release starts {:.3} ms, open {:?} ms, bump {:.2} mA",
            t_release * 1e3,
            opened.map(|o| o.0 * 1e3),
            lib.bump_height() * 1e3
        );
    }
}
