//! Integrating the moving armature: pull-in with the coil driven, release through a clamp.
//!
//! State (λ, x, v) plus four running energies. Method: the Bogacki–Shampine 3(2) embedded
//! Runge–Kutta pair (Bogacki & Shampine 1989; coefficients from memory, checked against an
//! independent Dormand–Prince integration in `tests/armature_model.rs`) with a local error per
//! step held below `tolerance` relative to each component's size (plus the same fraction of a
//! reference scale: L_seat·I for the flux, the stroke for the gap, stroke/τ for the speed).
//! This is a **local** bound; the global error is checked, not proven: the tests compare event
//! times and turning currents with the reference at 1e-3.
//!
//! Events are located inside a step by the Illinois method on the step length (each trial one
//! Runge–Kutta step from the step's start; at most 40 trials, to 10⁻⁶ of the step): the
//! armature starting to move (the pull ½·i²·|dL/dx| reaching the opening force), reaching a
//! stop (the gap crossing 0 or s: inelastic, the kinetic energy is booked as impact loss), and
//! the current's turning points (di/dt = 0, from the state: di/dt = (dλ/dt − i·(dL/dx)·v)/L).
//! Steps are cut to land on every sample instant, so samples are values of the integration,
//! not interpolations.
//!
//! Work: at most [`MAX_STEPS`] steps (accepted or rejected), each four evaluations of the
//! right-hand side plus, for a step holding an event, at most 40 trial steps per event kind;
//! beyond it [`Reason::OutsideValidatedRange`] on `"integration steps"`.

use super::Armature;
use crate::clamp::SwitchOff;
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Ohms, Seconds, Volts};

/// Most steps one run may take.
pub const MAX_STEPS: u32 = 200_000;

/// How long to integrate, how often to sample, how tightly.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Run {
    /// How long after the start (switch-on or switch-off) to integrate.
    pub duration: Seconds,
    /// The sample period of the waveform written to the caller's buffer (the first sample at
    /// t = 0).
    pub sample_period: Seconds,
    /// Relative local error per step, 1e-7 … 1e-2.
    pub tolerance: f32,
}

/// A turning point of the current.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Turn {
    /// When.
    pub time: Seconds,
    /// The current there.
    pub current: Amps,
}

/// Where the energy went, J, from the start to the end of a run. Balances (each closing to the
/// integration's error): `source` = `field_end − field_start + magnetic_work` (the circuit's
/// side; `source` is ∫i·dλ, the energy the circuit puts into the coil) and `magnetic_work` =
/// `kinetic_end + spring + load + damping + impact` (the armature's side). Driven, the supply
/// delivers `source + loop_loss` (the copper's R·i²); switched off, the clamp loop takes
/// `loop_loss` = ∫g(i)·i = −`source`.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Energy {
    /// ∫ i·dλ: into the coil's field and the armature.
    pub source: f32,
    /// Driven: the copper loss ∫R·i². Switched off: the loop's loss ∫g(i)·i.
    pub loop_loss: f32,
    /// ½·L(x)·i² at the start.
    pub field_start: f32,
    /// ½·L(x)·i² at the end.
    pub field_end: f32,
    /// ∫ F_magnetic·(closing speed): what the field did on the armature.
    pub magnetic_work: f32,
    /// ½·m·v² at the end.
    pub kinetic_end: f32,
    /// The spring's energy gained (its potential at the end less at the start).
    pub spring: f32,
    /// Work done against the load: F_load·(x_start − x_end).
    pub load: f32,
    /// ∫ c·v².
    pub damping: f32,
    /// Kinetic energy lost at the end stops.
    pub impact: f32,
}

/// What a pull-in run shows.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PullIn {
    /// When the armature started to move (None: it never did within the run).
    pub motion_start: Option<Seconds>,
    /// When it reached the seat (None: not within the run).
    pub seated: Option<Seconds>,
    /// The current's first local maximum (the top before the dip), if any.
    pub peak: Option<Turn>,
    /// The local minimum after it (the bottom of the dip), if any.
    pub valley: Option<Turn>,
    /// The current at the end of the run.
    pub end_current: Amps,
    /// The gap at the end of the run, m.
    pub end_gap_m: f32,
    /// Samples written to the caller's buffer.
    pub samples: usize,
    /// Steps taken.
    pub steps: u32,
    /// Where the energy went.
    pub energy: Energy,
}

impl PullIn {
    /// The dip: peak less valley, A (0 without one).
    pub fn dip(&self) -> f32 {
        match (self.peak, self.valley) {
            (Some(p), Some(v)) => p.current.value() - v.current.value(),
            _ => 0.0,
        }
    }
}

/// What a release run shows.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Release {
    /// When the armature left the seat (None: it never did within the run).
    pub release_start: Option<Seconds>,
    /// When it reached the open stop (None: not within the run).
    pub opened: Option<Seconds>,
    /// The current's first local minimum after switch-off (the bottom before the bump), if any.
    pub valley: Option<Turn>,
    /// The local maximum after it (the top of the bump), if any.
    pub bump: Option<Turn>,
    /// The current at the end of the run (the run also ends where the current falls to
    /// 10⁻⁴ of its start).
    pub end_current: Amps,
    /// When the run ended.
    pub end_time: Seconds,
    /// The gap at the end, m.
    pub end_gap_m: f32,
    /// Samples written to the caller's buffer.
    pub samples: usize,
    /// Steps taken.
    pub steps: u32,
    /// Where the energy went.
    pub energy: Energy,
}

impl Release {
    /// The bump: its top less the valley before it, A (0 without one).
    pub fn bump_height(&self) -> f32 {
        match (self.valley, self.bump) {
            (Some(v), Some(b)) => b.current.value() - v.current.value(),
            _ => 0.0,
        }
    }
}

/// The armature's state of contact.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Contact {
    /// Resting on the open stop (x = s).
    Open,
    /// Resting on the seat (x = 0).
    Seat,
    /// Free between the stops.
    Free,
}

/// The electrical drive.
#[derive(Clone, Copy)]
enum Drive<'a> {
    /// The supply across the coil's resistance.
    On { v: f32, r: f32 },
    /// The clamp's loop law.
    Off(&'a SwitchOff),
}

/// State: flux, gap, speed (opening positive), then ∫i·dλ, loop loss, magnetic work, damping.
type State = [f32; 7];

struct System<'a> {
    arm: &'a Armature,
    drive: Drive<'a>,
}

impl System<'_> {
    fn current(&self, y: &State) -> f32 {
        y[0] / self.arm.inductance_at(y[1])
    }

    /// dλ/dt and the loop's loss rate at current i.
    fn electrical(&self, i: f32) -> (f32, f32) {
        match self.drive {
            Drive::On { v, r } => (v - r * i, r * i * i),
            Drive::Off(off) => {
                if i > 0.0 {
                    let g = off.loop_voltage_raw(i);
                    (-g, g * i)
                } else {
                    (0.0, 0.0)
                }
            }
        }
    }

    fn rhs(&self, y: &State, contact: Contact) -> State {
        let i = self.current(y);
        let (dl, loss) = self.electrical(i);
        let (dx, dv, f_mag) = match contact {
            Contact::Free => {
                let f_mag = self.arm.magnetic_force(i, y[1]);
                let f = self.arm.opening_force(y[1]) - f_mag - self.arm.damping_n_s_per_m * y[2];
                (y[2], f / self.arm.mass_kg, f_mag)
            }
            _ => (0.0, 0.0, 0.0),
        };
        [
            dl,
            dx,
            dv,
            i * dl,
            loss,
            // The pull is toward the seat (−x): its power is −F·v.
            -f_mag * y[2],
            self.arm.damping_n_s_per_m * y[2] * y[2],
        ]
    }

    /// di/dt from the state: (dλ/dt − i·(dL/dx)·v)/L, dL/dx = −|dL/dx|.
    fn di_dt(&self, y: &State, contact: Contact) -> f32 {
        let i = self.current(y);
        let (dl, _) = self.electrical(i);
        let v = if contact == Contact::Free { y[2] } else { 0.0 };
        (dl + i * self.arm.inductance_slope_at(y[1]) * v) / self.arm.inductance_at(y[1])
    }

    /// One Bogacki–Shampine step of size h: (the 3rd-order result, its error estimate).
    fn step(&self, y: &State, h: f32, c: Contact) -> (State, State) {
        let k1 = self.rhs(y, c);
        let k2 = self.rhs(&add(y, &[(h * 0.5, &k1)]), c);
        let k3 = self.rhs(&add(y, &[(h * 0.75, &k2)]), c);
        let y3 = add(
            y,
            &[(h * 2.0 / 9.0, &k1), (h / 3.0, &k2), (h * 4.0 / 9.0, &k3)],
        );
        let k4 = self.rhs(&y3, c);
        let y2 = add(
            y,
            &[
                (h * 7.0 / 24.0, &k1),
                (h * 0.25, &k2),
                (h / 3.0, &k3),
                (h * 0.125, &k4),
            ],
        );
        let mut err = [0.0f32; 7];
        for ((e, a), b) in err.iter_mut().zip(y3.iter()).zip(y2.iter()) {
            *e = a - b;
        }
        (y3, err)
    }
}

/// y + Σ aₖ·kₖ.
fn add(y: &State, terms: &[(f32, &State)]) -> State {
    let mut out = *y;
    for (a, k) in terms {
        for (o, d) in out.iter_mut().zip(k.iter()) {
            *o += a * d;
        }
    }
    out
}

/// What an event function watches.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Event {
    /// The armature at rest starts to move.
    Start,
    /// The free armature reaches the seat.
    Seat,
    /// The free armature reaches the open stop.
    Open,
    /// The current's slope changes sign.
    Turn,
}

/// The integrator's common loop: the contact state, the sampler, the records.
struct Integrator<'a, 's> {
    sys: System<'a>,
    run: Run,
    scale: [f32; 3],
    sink: &'s mut dyn Sink,
    steps: u32,
    impact: f32,
}

/// Where a run's current goes at chosen instants: each step lands on the sink's next instant.
pub trait Sink {
    /// The next instant (s from the run's start) the sink wants the current at; None when it
    /// wants no more.
    fn next_due(&self) -> Option<f32>;
    /// The current at that instant, A.
    fn put(&mut self, i: f32);
    /// Whether the run may end once the sink wants nothing more (`next_due` None): a sink that
    /// only probes a few instants ends it there (the steps up to then are those of the whole
    /// run; the run's result then describes only that far). Default: no.
    fn ends_run(&self) -> bool {
        false
    }
}

/// A buffer filled at k·Δt, k = 0, 1, … (as many as fit).
pub struct Samples<'b> {
    buf: &'b mut [f32],
    period: f32,
    written: usize,
}

impl<'b> Samples<'b> {
    /// Samples every `period` seconds into `buf`.
    pub fn new(buf: &'b mut [f32], period: Seconds) -> Self {
        Samples {
            buf,
            period: period.value(),
            written: 0,
        }
    }
    /// How many were written.
    pub fn written(&self) -> usize {
        self.written
    }
}

impl Sink for Samples<'_> {
    fn next_due(&self) -> Option<f32> {
        (self.written < self.buf.len()).then_some(self.written as f32 * self.period)
    }
    fn put(&mut self, i: f32) {
        if let Some(slot) = self.buf.get_mut(self.written) {
            *slot = i;
            self.written = self.written.saturating_add(1);
        }
    }
}

/// The events of a run, in the order seen.
#[derive(Default)]
struct Seen {
    start: Option<f32>,
    seat: Option<f32>,
    open: Option<f32>,
    turns: [TurnAt; 2],
    n_turns: usize,
}

impl Integrator<'_, '_> {
    fn event_value(&self, e: Event, y: &State, c: Contact) -> f32 {
        let a = self.sys.arm;
        match e {
            Event::Start => {
                let i = self.sys.current(y);
                let f = a.magnetic_force(i, y[1]) - a.opening_force(y[1]);
                if c == Contact::Open {
                    f
                } else {
                    -f
                }
            }
            Event::Seat => -y[1],
            Event::Open => y[1] - a.stroke_m,
            Event::Turn => self.sys.di_dt(y, c),
        }
    }

    /// The events that can happen from contact `c`.
    fn watched(&self, c: Contact) -> &'static [Event] {
        if !(self.sys.arm.stroke_m > 0.0) {
            return &[Event::Turn];
        }
        match c {
            Contact::Open | Contact::Seat => &[Event::Start, Event::Turn],
            Contact::Free => &[Event::Seat, Event::Open, Event::Turn],
        }
    }

    /// True when `e` fired between values a (start) and b (end of step).
    fn fired(e: Event, a: f32, b: f32) -> bool {
        match e {
            Event::Turn => (a > 0.0 && b <= 0.0) || (a < 0.0 && b >= 0.0),
            _ => a <= 0.0 && b > 0.0,
        }
    }

    /// The weighted error norm of a step (≤ 1 accepts).
    fn norm(&self, y: &State, y1: &State, err: &State) -> f32 {
        let tol = self.run.tolerance;
        let mut worst = 0.0f32;
        for (((a, b), e), sc) in y
            .iter()
            .zip(y1.iter())
            .zip(err.iter())
            .zip(self.scale.iter())
        {
            let w = tol * (a.abs().max(b.abs()) + sc);
            worst = worst.max(e.abs() / w);
        }
        if worst.is_finite() {
            worst
        } else {
            f32::INFINITY
        }
    }

    /// The first event in (0, h] from y, and the step length that lands just past it.
    fn locate(&self, y: &State, h: f32, c: Contact, y1: &State) -> Option<(Event, f32, State)> {
        let mut best: Option<(Event, f32, State)> = None;
        for &e in self.watched(c) {
            let (a, b) = (self.event_value(e, y, c), self.event_value(e, y1, c));
            if !Self::fired(e, a, b) {
                continue;
            }
            // Illinois on the step length: the bracket [lo, hi] with values (fa, fb).
            let (mut lo, mut hi, mut fa, mut fb) = (0.0f32, h, a, b);
            let mut side = 0i8;
            let mut at_hi = *y1;
            for _ in 0..40 {
                if hi - lo <= 1e-6 * h {
                    break;
                }
                let denom = fb - fa;
                let mut t = if denom != 0.0 {
                    hi - fb * (hi - lo) / denom
                } else {
                    0.5 * (lo + hi)
                };
                if !(t > lo && t < hi) {
                    t = 0.5 * (lo + hi);
                }
                let (yt, _) = self.sys.step(y, t, c);
                let ft = self.event_value(e, &yt, c);
                if Self::fired(e, a, ft) {
                    hi = t;
                    fb = ft;
                    at_hi = yt;
                    if side == 1 {
                        fa *= 0.5;
                    }
                    side = 1;
                } else {
                    lo = t;
                    fa = ft;
                    if side == -1 {
                        fb *= 0.5;
                    }
                    side = -1;
                }
            }
            if best.as_ref().is_none_or(|(_, t, _)| hi < *t) {
                best = Some((e, hi, at_hi));
            }
        }
        best
    }

    /// Hands the current to the sink if t is its next instant.
    fn sample(&mut self, t: f32, y: &State) {
        // Every instant due now (a sink may ask for the same instant twice), at most four per
        // landing (bounded even for a sink whose `put` does not advance it).
        for _ in 0..4 {
            match self.sink.next_due() {
                Some(due) if (t - due).abs() <= 1e-6 * self.run.duration.value().max(due) => {
                    self.sink.put(self.sys.current(y));
                }
                _ => break,
            }
        }
    }

    /// The next instant a step must land on: the sink's next instant, or the end.
    fn next_stop(&self, t: f32) -> f32 {
        let end = self.run.duration.value();
        match self.sink.next_due() {
            Some(due) if due > t => due.min(end),
            _ => end,
        }
    }

    /// Integrates from (y, c) at t = 0 until the end, or until `stop(y)`; returns the end state,
    /// time, contact and the events seen.
    fn integrate(
        &mut self,
        mut y: State,
        mut c: Contact,
        h0: f32,
        stop: impl Fn(&State, Contact) -> bool,
    ) -> Result<(State, f32, Contact, Seen), Error> {
        let end = self.run.duration.value();
        let mut seen = Seen::default();
        let mut t = 0.0f32;
        let mut h = h0;
        self.sample(t, &y);
        while t < end && !stop(&y, c) && !(self.sink.ends_run() && self.sink.next_due().is_none()) {
            if self.steps >= MAX_STEPS {
                return Err(Error::new(
                    "integration steps",
                    Reason::OutsideValidatedRange,
                ));
            }
            self.steps = self.steps.saturating_add(1);
            let target = self.next_stop(t);
            let mut hs = h.min(target - t);
            let landing = hs >= target - t;
            if landing {
                hs = target - t;
            }
            let (y1, err) = self.sys.step(&y, hs, c);
            let n = self.norm(&y, &y1, &err);
            if !(n <= 1.0) {
                // Rejected: shrink (factor 0.2 … 0.9).
                h = hs * (0.9 * libm::powf(n.max(1e-10), -1.0 / 3.0)).clamp(0.2, 0.9);
                if !(h > 1e-12 * end.max(1e-9)) {
                    return Err(Error::new(
                        "integration steps",
                        Reason::OutsideValidatedRange,
                    ));
                }
                continue;
            }
            let grow = if n > 0.0 {
                (0.9 * libm::powf(n, -1.0 / 3.0)).clamp(0.2, 5.0)
            } else {
                5.0
            };
            if let Some((e, te, ye)) = self.locate(&y, hs, c, &y1) {
                t += te;
                y = ye;
                c = self.apply(e, t, &mut y, c, &mut seen);
                h = hs.max(1e-9 * end);
            } else {
                t = if landing { target } else { t + hs };
                y = y1;
                h = if landing && hs < h { h } else { hs * grow };
            }
            // Switched off, the flux ends at zero: a clamp holds no reverse current.
            if matches!(self.sys.drive, Drive::Off(_)) && y[0] < 0.0 {
                y[0] = 0.0;
            }
            self.sample(t, &y);
        }
        Ok((y, t, c, seen))
    }

    /// Acts on an event at time t.
    fn apply(&mut self, e: Event, t: f32, y: &mut State, c: Contact, seen: &mut Seen) -> Contact {
        match e {
            Event::Start => {
                seen.start.get_or_insert(t);
                Contact::Free
            }
            Event::Seat | Event::Open => {
                let a = self.sys.arm;
                let before = self.sys.di_dt(y, Contact::Free);
                self.impact += 0.5 * a.mass_kg * y[2] * y[2];
                y[2] = 0.0;
                let next = if e == Event::Seat {
                    y[1] = 0.0;
                    seen.seat.get_or_insert(t);
                    Contact::Seat
                } else {
                    y[1] = a.stroke_m;
                    seen.open.get_or_insert(t);
                    Contact::Open
                };
                // The impact stops the motion's back-EMF at once: the current's slope can
                // change sign right here (the dip's bottom is usually the seating).
                let after = self.sys.di_dt(y, next);
                if (before < 0.0 && after > 0.0) || (before > 0.0 && after < 0.0) {
                    self.turn(t, y, seen);
                }
                next
            }
            Event::Turn => {
                self.turn(t, y, seen);
                c
            }
        }
    }

    /// Records a turning point of the current.
    fn turn(&self, t: f32, y: &State, seen: &mut Seen) {
        if let Some(slot) = seen.turns.get_mut(seen.n_turns) {
            *slot = Some((t, self.sys.current(y)));
            seen.n_turns = seen.n_turns.saturating_add(1);
        }
    }

    /// The energy record of a run from y0 to y.
    fn energy(&self, y0: &State, y: &State) -> Energy {
        let a = self.sys.arm;
        let field = |s: &State| 0.5 * s[0] * self.sys.current(s);
        let pe = |x: f32| {
            let d = a.stroke_m - x;
            a.preload_n * d + 0.5 * a.spring_n_per_m * d * d
        };
        Energy {
            source: y[3],
            loop_loss: y[4],
            field_start: field(y0),
            field_end: field(y),
            magnetic_work: y[5],
            kinetic_end: 0.5 * a.mass_kg * y[2] * y[2],
            spring: pe(y[1]) - pe(y0[1]),
            load: a.load_n * (y0[1] - y[1]),
            damping: y[6],
            impact: self.impact,
        }
    }
}

fn check_run(run: &Run) -> Result<(), Error> {
    error::positive("duration", run.duration.value())?;
    error::positive("sample period", run.sample_period.value())?;
    error::within("tolerance", run.tolerance, 1e-7, 1e-2)?;
    Ok(())
}

fn turn(x: TurnAt) -> Result<Option<Turn>, Error> {
    x.map(|(t, i)| {
        Ok(Turn {
            time: Seconds::new(t)?,
            current: Amps::new(i)?,
        })
    })
    .transpose()
}

fn time(x: Option<f32>) -> Result<Option<Seconds>, Error> {
    x.map(Seconds::new).transpose()
}

/// Pull-in: the coil of resistance `r` switched onto `supply` at t = 0 with no current, the
/// armature at rest on its open stop. The waveform i(k·Δt) goes to `samples` (as many as fit
/// and fall within the run).
///
/// # Errors
/// An invalid armature (see [`Armature::validate`]); `duration` or `sample period` ≤ 0 →
/// [`Reason::NotPositive`]; `tolerance` outside 1e-7 … 1e-2 →
/// [`Reason::OutsideValidatedRange`]; more than [`MAX_STEPS`] steps →
/// [`Reason::OutsideValidatedRange`] on `"integration steps"`; a result beyond the quantities'
/// range → the error names it.
pub fn pull_in(
    arm: &Armature,
    r: Ohms,
    supply: Volts,
    run: &Run,
    samples: &mut [f32],
) -> Result<PullIn, Error> {
    let mut sink = Samples::new(samples, run.sample_period);
    let mut p = pull_in_to(arm, r, supply, run, &mut sink)?;
    p.samples = sink.written();
    Ok(p)
}

/// [`pull_in`] with the current going to any [`Sink`] (its `samples` field is 0).
///
/// # Errors
/// As [`pull_in`].
pub fn pull_in_to(
    arm: &Armature,
    r: Ohms,
    supply: Volts,
    run: &Run,
    sink: &mut dyn Sink,
) -> Result<PullIn, Error> {
    arm.validate()?;
    check_run(run)?;
    let (v, rr) = (
        error::positive("supply voltage", supply.value())?,
        r.value(),
    );
    let i_ref = v / rr;
    let l0 = arm.inductance.seat.value();
    let tau = l0 / rr;
    let mut it = Integrator {
        sys: System {
            arm,
            drive: Drive::On { v, r: rr },
        },
        run: *run,
        scale: scales(arm, l0 * i_ref, tau),
        sink,
        steps: 0,
        impact: 0.0,
    };
    let y0: State = [0.0, arm.stroke_m, 0.0, 0.0, 0.0, 0.0, 0.0];
    let h0 = tau * 1e-3;
    let (y, _, _, seen) = it.integrate(y0, Contact::Open, h0, |_, _| false)?;
    let (peak, valley) = first_two(&seen);
    Ok(PullIn {
        motion_start: time(seen.start)?,
        seated: time(seen.seat)?,
        peak: turn(peak)?,
        valley: turn(valley)?,
        end_current: Amps::new(it.sys.current(&y))?,
        end_gap_m: y[1],
        samples: 0,
        steps: it.steps,
        energy: it.energy(&y0, &y),
    })
}

/// Release: the switch-off `off` (its start current, clamp, supply and temperatures; its
/// coil's inductance is not used — the armature's L(x) is) with the armature seated at t = 0.
/// The run ends at `duration`, or once the current has fallen to 10⁻⁴ of its start with the
/// armature at rest (the flight goes on after the current has died).
///
/// # Errors
/// As [`pull_in`].
pub fn release(
    arm: &Armature,
    off: &SwitchOff,
    run: &Run,
    samples: &mut [f32],
) -> Result<Release, Error> {
    let mut sink = Samples::new(samples, run.sample_period);
    let mut p = release_to(arm, off, run, &mut sink)?;
    p.samples = sink.written();
    Ok(p)
}

/// [`release`] with the current going to any [`Sink`] (its `samples` field is 0).
///
/// # Errors
/// As [`pull_in`].
pub fn release_to(
    arm: &Armature,
    off: &SwitchOff,
    run: &Run,
    sink: &mut dyn Sink,
) -> Result<Release, Error> {
    arm.validate()?;
    check_run(run)?;
    let i0 = off.start_current().value();
    let l0 = arm.inductance.seat.value();
    let g0 = off.loop_voltage_raw(i0);
    let tau = l0 * i0 / g0.max(1e-30);
    let mut it = Integrator {
        sys: System {
            arm,
            drive: Drive::Off(off),
        },
        run: *run,
        scale: scales(arm, l0 * i0, tau),
        sink,
        steps: 0,
        impact: 0.0,
    };
    let y0: State = [l0 * i0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0];
    let h0 = tau * 1e-3;
    let stop_at = 1e-4 * i0;
    let contact = if arm.stroke_m > 0.0 {
        Contact::Seat
    } else {
        Contact::Open
    };
    // i = λ/L(x) ≤ λ/L_open: a flux below stop·L_open is a current below stop. The run goes
    // on while the armature is still in flight.
    let lambda_stop = stop_at * arm.inductance.open.value();
    let (y, t_end, _, seen) = it.integrate(y0, contact, h0, |y, c| {
        y[0] <= lambda_stop && c != Contact::Free
    })?;
    let (valley, bump) = first_two(&seen);
    Ok(Release {
        release_start: time(seen.start)?,
        opened: time(seen.open)?,
        valley: turn(valley)?,
        bump: turn(bump)?,
        end_current: Amps::new(it.sys.current(&y).max(0.0))?,
        end_time: Seconds::new(t_end)?,
        end_gap_m: y[1],
        samples: 0,
        steps: it.steps,
        energy: it.energy(&y0, &y),
    })
}

/// The reference scales of (λ, x, v): the flux, the stroke (or g₀), stroke over τ.
fn scales(arm: &Armature, flux: f32, tau: f32) -> [f32; 3] {
    let x = arm.stroke_m.max(arm.inductance.g0_m);
    [flux.abs().max(1e-30), x, x / tau.max(1e-30)]
}

/// A turning point as (time, current).
type TurnAt = Option<(f32, f32)>;

/// The first two turning points: driven from zero the current rises first, so these are the
/// peak and the valley; switched off it falls first, so the valley and the bump.
fn first_two(seen: &Seen) -> (TurnAt, TurnAt) {
    (
        seen.turns.first().copied().flatten(),
        seen.turns.get(1).copied().flatten(),
    )
}
