//! Invented armature designs and the independent reference for them: the same equations in
//! f64, integrated by `ode_solvers` (Dormand–Prince 5(4)) with dense output. See
//! tests/armature_model.rs for the sources.

use kickguard::armature::{Armature, GapInductance};
use kickguard::Henries;
use ode_solvers::{Dopri5, SVector, System};

/// One invented design: the armature and its drive.
#[derive(Clone, Copy, Debug)]
pub struct Spec {
    pub name: &'static str,
    pub m: f64,
    pub s: f64,
    pub f0: f64,
    pub k: f64,
    pub load: f64,
    pub c: f64,
    pub ls: f64,
    pub lo: f64,
    pub g0: f64,
    pub r: f64,
    pub v: f64,
}

pub fn specs() -> Vec<Spec> {
    vec![
        Spec {
            name: "24 V valve",
            m: 0.01,
            s: 1.5e-3,
            f0: 0.275,
            k: 500.0,
            load: 0.165,
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
            f0: 0.0825,
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
            f0: 0.165,
            k: 200.0,
            load: 0.275,
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
            f0: 0.55,
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
            f0: 0.275,
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
            f0: 0.0165,
            k: 20.0,
            load: 0.011,
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
    pub fn l_inf(&self) -> f64 {
        (self.lo * (self.g0 + self.s) - self.ls * self.g0) / self.s
    }
    pub fn l(&self, x: f64) -> f64 {
        let li = self.l_inf();
        li + (self.ls - li) * self.g0 / (self.g0 + x)
    }
    pub fn slope(&self, x: f64) -> f64 {
        (self.ls - self.l_inf()) * self.g0 / ((self.g0 + x) * (self.g0 + x))
    }
    pub fn f_open(&self, x: f64) -> f64 {
        self.f0 + self.k * (self.s - x) + self.load
    }
    pub fn armature(&self) -> Armature {
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
                shape: None,
            },
        }
    }
    /// The armature free between the stops (the reference never touches a stop: each phase is
    /// cut at its event).
    pub fn free<'a>(&self, drive: &'a dyn Fn(f64) -> f64) -> Free<'a> {
        Free { s: *self, drive }
    }
}

/// The reference system: state (λ, x, v); `drive(i)` is dλ/dt.
pub struct Free<'a> {
    s: Spec,
    drive: &'a dyn Fn(f64) -> f64,
}

pub type V3 = SVector<f64, 3>;

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
pub fn dense(sys: Free<'_>, y0: V3, t0: f64, span: f64, n: usize) -> Vec<(f64, f64, f64)> {
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
pub fn extreme(d: &[(f64, f64, f64)], max: bool) -> Option<(f64, f64)> {
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
pub fn crossing(d: &[(f64, f64, f64)], level: f64, down: bool) -> Option<(f64, f64)> {
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

/// The pull-in current of `s` at the instants phase·Δt + k·Δt (k = 0, 1, …, up to `t_end`),
/// by the reference: rest on the open stop (closed-form rise with L_open), the free flight
/// (Dormand–Prince) to the seat, the seated rise (closed form with L_seat). With `stuck` the
/// armature never leaves the open stop: the plain rise with L_open throughout.
pub fn pull_in_waveform(s: &Spec, t_end: f64, dt: f64, phase: f64, stuck: bool) -> Vec<f64> {
    let (r, v) = (s.r, s.v);
    let rise = |t: f64| (v / r) * (1.0 - (-t * r / s.lo).exp());
    let times: Vec<f64> = (0..)
        .map(|k| (phase + k as f64) * dt)
        .take_while(|t| *t <= t_end)
        .collect();
    let i_move = (2.0 * s.f_open(s.s) / s.slope(s.s)).sqrt();
    if stuck || i_move >= v / r {
        return times.iter().map(|t| rise(*t)).collect();
    }
    let t_start = -(s.lo / r) * (1.0 - i_move * r / v).ln();
    let drive = move |i: f64| v - r * i;
    let d = dense(
        s.free(&drive),
        V3::new(s.lo * i_move, s.s, 0.0),
        t_start,
        t_end - t_start,
        100_000,
    );
    let (t_seat, i_seat) = crossing(&d, 0.0, true).unwrap_or((f64::INFINITY, 0.0));
    let h = (t_end - t_start) / 100_000.0;
    times
        .iter()
        .map(|&t| {
            if t < t_start {
                rise(t)
            } else if t < t_seat {
                let x = (t - t_start) / h;
                let k = (x.floor() as usize).min(d.len() - 2);
                let f = x - k as f64;
                d[k].1 + f * (d[k + 1].1 - d[k].1)
            } else {
                v / r + (i_seat - v / r) * (-(t - t_seat) * r / s.ls).exp()
            }
        })
        .collect()
}

/// `s` with every parameter moved by its share of the tolerances: `u` holds eleven numbers in
/// 0 … 1 (mass, stroke, preload, spring, load, damping, L_seat, L_open, g₀, supply, R) placed
/// in [1 − t, 1 + t] (the supply and R in their ranges).
pub fn perturbed(
    s: &Spec,
    mech: f64,
    induct: f64,
    supply: (f64, f64),
    res: (f64, f64),
    u: &[f64; 11],
) -> Spec {
    let f = |x: f64, t: f64| 1.0 - t + 2.0 * t * x;
    Spec {
        m: s.m * f(u[0], mech),
        s: s.s * f(u[1], mech),
        f0: s.f0 * f(u[2], mech),
        k: s.k * f(u[3], mech),
        load: s.load * f(u[4], mech),
        c: s.c * f(u[5], mech),
        ls: s.ls * f(u[6], induct),
        lo: s.lo * f(u[7], induct),
        g0: s.g0 * f(u[8], mech),
        v: supply.0 + (supply.1 - supply.0) * u[9],
        r: res.0 + (res.1 - res.0) * u[10],
        ..*s
    }
}
