//! Configuration time: does the armature pull in at every corner of its tolerances, when, how
//! deep is its dip, and can a given ADC see it — and the detector thresholds that see it.
//!
//! # Method
//!
//! Corner search over eleven axes, each at its two ends: the moving mass, the stroke, the
//! spring's preload and rate, the load, the damping, L_seat, L_open, g₀ (each a relative
//! tolerance on its nominal), the supply (its range) and the coil's resistance (its range over
//! tolerance and temperature: the hot coil at the top) — 2¹¹ = 2048 pull-ins. The dip is not
//! proven monotonic in every axis; the tests check the vertex extremes against random interior
//! points (Monte Carlo) on every design.
//!
//! # What the samples see
//!
//! An ADC sampling every Δt at an unknown phase has a sample within Δt/2 of the peak and of the
//! valley. Near each the current is unimodal, so the largest sample near the peak is at least
//! min(i(t_p − Δt/2), i(t_p + Δt/2)) and the smallest near the valley at most
//! max(i(t_v − Δt/2), i(t_v + Δt/2)): their difference bounds the dip **as sampled**, whatever
//! the phase. Each corner is integrated twice: once for its turning points, once landing on
//! those four instants.
//!
//! # The detector's thresholds ([`detector_for`])
//!
//! With n the stated noise per sample in counts (peak, each side) and one count of rounding,
//! n_e = n + 1: `hysteresis` = 2·n_e + 1 (no monotonic signal can confirm a peak, see
//! [`super::detect`]); `min_dip` = `hysteresis`; detectable when the smallest sampled dip in
//! counts, less 2·n_e, still reaches `hysteresis`, the largest current stays below full scale,
//! and every corner's current climbs `hysteresis` + 2·n_e counts above its valley within the
//! window. The window ends after the latest such climb (closed form on the seated rise:
//! t_seat + τ_seat·ln((V/R − i_seat)/(V/R − i_v − Δ)), Δ the climb in amperes) plus one sample.
//!
//! Work: 2 × 2048 integrations (each bounded as [`super::motion`] states; the second of each
//! corner ends just after its valley).

use super::detect::{DipConfig, Polarity};
use super::motion::{pull_in_to, PullIn, Run, Sink};
use super::Armature;
use crate::error::{self, Error, Reason};
use crate::units::{Henries, Hertz, Ohms, Seconds, Volts};

/// Relative tolerances (0 … 0.5 each) of an armature's parameters.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Tolerances {
    /// Moving mass.
    pub mass: f32,
    /// Stroke.
    pub stroke: f32,
    /// Spring preload.
    pub preload: f32,
    /// Spring rate.
    pub spring: f32,
    /// Load force.
    pub load: f32,
    /// Damping.
    pub damping: f32,
    /// L_seat.
    pub l_seat: f32,
    /// L_open.
    pub l_open: f32,
    /// g₀.
    pub g0: f32,
}

/// The driven coil's ranges.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DriveRange {
    /// Lowest supply across the coil.
    pub supply_min: Volts,
    /// Highest supply.
    pub supply_max: Volts,
    /// Lowest coil resistance (cold, low tolerance).
    pub resistance_min: Ohms,
    /// Highest coil resistance (hot, high tolerance).
    pub resistance_max: Ohms,
}

/// The ADC that samples the coil current.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Adc {
    /// Sample rate.
    pub rate: Hertz,
    /// Counts per ampere of coil current (shunt × gain × counts per volt).
    pub counts_per_amp: f32,
    /// The first saturated count (4096 for a 12-bit converter).
    pub full_scale: u16,
    /// Noise per sample, counts, peak, each side (the firmware's stated bound).
    pub noise_counts: u16,
}

/// A window [lowest, highest] over the corners.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Span {
    /// Lowest.
    pub lo: f32,
    /// Highest.
    pub hi: f32,
}

impl Span {
    pub(super) const EMPTY: Span = Span {
        lo: f32::INFINITY,
        hi: f32::NEG_INFINITY,
    };
    pub(super) fn add(&mut self, x: f32) {
        self.lo = self.lo.min(x);
        self.hi = self.hi.max(x);
    }
}

/// What the corners say of pull-in.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PullInWindow {
    /// Corners evaluated.
    pub corners: u32,
    /// The first corner (bit k set: axis k at its high end, in the order of the module docs)
    /// that did not reach the seat within the run, if any.
    pub not_seated: Option<u32>,
    /// Motion start, s, over the corners that moved.
    pub motion_start: Span,
    /// Seating, s, over the corners that seated.
    pub seated: Span,
    /// The dip, A, over the corners that seated.
    pub dip: Span,
    /// The smallest dip as sampled at the run's sample period, A (see the module docs).
    pub sampled_dip_min: f32,
    /// The shortest time from the peak to the valley over the corners that seated, s (an ADC
    /// slower than its inverse cannot be sure to sample near both: a necessary bound on the
    /// rate; the rate's sufficiency is `sampled_dip_min` at that rate). Infinite when no
    /// corner seated.
    pub dip_duration_min: f32,
    /// The highest current any corner reaches within the run, A (V_max/R_min bounds it).
    pub current_max: f32,
    /// The latest instant every corner's current has climbed `confirm` above its valley, s
    /// (None: some corner never climbs that far).
    pub confirmed_by: Option<f32>,
}

/// The four instants around the turning points a corner's second run lands on.
pub(super) struct Probes {
    pub(super) at: [f32; 4],
    pub(super) got: [f32; 4],
    pub(super) n: usize,
}

impl Sink for Probes {
    fn next_due(&self) -> Option<f32> {
        self.at.get(self.n).copied()
    }
    fn ends_run(&self) -> bool {
        true
    }
    fn put(&mut self, i: f32) {
        if let Some(g) = self.got.get_mut(self.n) {
            *g = i;
        }
        self.n = self.n.saturating_add(1);
    }
}

/// No samples.
pub(super) struct Nothing;

impl Sink for Nothing {
    fn next_due(&self) -> Option<f32> {
        None
    }
    fn put(&mut self, _: f32) {}
}

/// The armature of corner `k` (bits 0 … 8: the mechanical axes in the module docs' order).
pub(super) fn corner(nominal: &Armature, tol: &Tolerances, k: u32) -> Result<Armature, Error> {
    let f = |bit: u32, t: f32| {
        if k & (1 << bit) == 0 {
            1.0 - t
        } else {
            1.0 + t
        }
    };
    let mut a = *nominal;
    a.mass_kg *= f(0, tol.mass);
    a.stroke_m *= f(1, tol.stroke);
    a.preload_n *= f(2, tol.preload);
    a.spring_n_per_m *= f(3, tol.spring);
    a.load_n *= f(4, tol.load);
    a.damping_n_s_per_m *= f(5, tol.damping);
    a.inductance.seat = Henries::new(a.inductance.seat.value() * f(6, tol.l_seat))?;
    a.inductance.open = Henries::new(a.inductance.open.value() * f(7, tol.l_open))?;
    a.inductance.g0_m *= f(8, tol.g0);
    Ok(a)
}

pub(super) fn check_tolerances(tol: &Tolerances) -> Result<(), Error> {
    for (name, t) in [
        ("mass tolerance", tol.mass),
        ("stroke tolerance", tol.stroke),
        ("preload tolerance", tol.preload),
        ("spring tolerance", tol.spring),
        ("load tolerance", tol.load),
        ("damping tolerance", tol.damping),
        ("seat inductance tolerance", tol.l_seat),
        ("open inductance tolerance", tol.l_open),
        ("g0 tolerance", tol.g0),
    ] {
        error::within(name, t, 0.0, 0.5)?;
    }
    Ok(())
}

fn check(tol: &Tolerances, drive: &DriveRange) -> Result<(), Error> {
    check_tolerances(tol)?;
    if !(drive.supply_min <= drive.supply_max) {
        return Err(Error::new("supply range", Reason::NotIncreasing));
    }
    if !(drive.resistance_min <= drive.resistance_max) {
        return Err(Error::new("resistance range", Reason::NotIncreasing));
    }
    Ok(())
}

/// Pull-in over every corner: whether each seats within `run`, the windows of motion start,
/// seating and dip, the smallest dip as sampled every `run.sample_period`, and the latest
/// instant each corner's current has climbed `confirm` amperes above its valley.
///
/// # Errors
/// A tolerance outside 0 … 0.5 → [`Reason::OutsideValidatedRange`] naming it; a range upside
/// down → [`Reason::NotIncreasing`] on `"supply range"` / `"resistance range"`; a corner whose
/// L_open exceeds its L_seat (overlapping inductance tolerances) → [`Reason::Inconsistent`] on
/// `"open inductance"`; errors of [`super::motion::pull_in`] at a corner.
pub fn pull_in_window(
    nominal: &Armature,
    tol: &Tolerances,
    drive: &DriveRange,
    run: &Run,
    confirm: f32,
) -> Result<PullInWindow, Error> {
    pull_in_window_keeping(nominal, tol, drive, run, confirm, &mut []).map(|(w, _)| w)
}

/// A seated corner's turning points, kept by [`pull_in_window_keeping`] for
/// [`sampled_dip_min_at`].
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CornerTurns {
    /// The corner's index (bits as in the module docs).
    pub corner: u32,
    /// The peak's time, s.
    pub peak_s: f32,
    /// The valley's time, s.
    pub valley_s: f32,
}

/// [`pull_in_window`], keeping each seated corner's turning points in `keep` (as many as fit;
/// 2048 hold every corner): returns the window and how many were kept.
///
/// # Errors
/// As [`pull_in_window`].
pub fn pull_in_window_keeping(
    nominal: &Armature,
    tol: &Tolerances,
    drive: &DriveRange,
    run: &Run,
    confirm: f32,
    keep: &mut [CornerTurns],
) -> Result<(PullInWindow, usize), Error> {
    check(tol, drive)?;
    nominal.validate()?;
    error::non_negative("confirm", confirm)?;
    let dt = run.sample_period.value();
    let mut w = PullInWindow {
        corners: 0,
        not_seated: None,
        motion_start: Span::EMPTY,
        seated: Span::EMPTY,
        dip: Span::EMPTY,
        sampled_dip_min: f32::INFINITY,
        dip_duration_min: f32::INFINITY,
        current_max: 0.0,
        confirmed_by: Some(0.0),
    };
    let mut kept = 0usize;
    for k in 0u32..2048 {
        let a = corner(nominal, tol, k)?;
        let (v, r) = drive_of(drive, k);
        let p = pull_in_to(&a, r, v, run, &mut Nothing)?;
        w.corners = w.corners.saturating_add(1);
        let i_final = v.value() / r.value();
        w.current_max = w.current_max.max(i_final).max(peak_of(&p));
        if let Some(t) = p.motion_start {
            w.motion_start.add(t.value());
        }
        let (Some(ts), Some(pk), Some(vl)) = (p.seated, p.peak, p.valley) else {
            w.not_seated.get_or_insert(k);
            w.confirmed_by = None;
            continue;
        };
        w.seated.add(ts.value());
        w.dip.add(p.dip());
        let (tp, tv) = (pk.time.value(), vl.time.value());
        w.dip_duration_min = w.dip_duration_min.min(tv - tp);
        if let Some(slot) = keep.get_mut(kept) {
            *slot = CornerTurns {
                corner: k,
                peak_s: tp,
                valley_s: tv,
            };
            kept += 1;
        }
        let sampled = sampled_dip(&a, r, v, run, tp, tv)?;
        w.sampled_dip_min = w.sampled_dip_min.min(sampled);
        // The climb: from the seat the current rises as V/R + (i_seat − V/R)·e^(−t/τ_seat).
        // The valley's current stands in for i_seat: equal when the valley is the seating,
        // below it when the valley came in flight — a later, so safe, confirmation.
        let i_v = vl.current.value();
        let i_seat = i_v;
        let target = i_v + confirm;
        let by = if target <= i_seat {
            Some(ts.value())
        } else if target < i_final {
            let tau = a.inductance.seat.value() / r.value();
            Some(ts.value() + tau * libm::logf((i_final - i_seat) / (i_final - target)))
        } else {
            None
        };
        w.confirmed_by = match (w.confirmed_by, by) {
            (Some(x), Some(y)) => Some(x.max(y + dt)),
            _ => None,
        };
    }
    Ok((w, kept))
}

/// The supply and resistance of corner `k` (bits 9 and 10).
fn drive_of(drive: &DriveRange, k: u32) -> (Volts, Ohms) {
    let v = if k & (1 << 9) == 0 {
        drive.supply_min
    } else {
        drive.supply_max
    };
    let r = if k & (1 << 10) == 0 {
        drive.resistance_min
    } else {
        drive.resistance_max
    };
    (v, r)
}

/// The dip of one corner as an ADC sampling every `run.sample_period` sees it at any phase
/// (module docs), from its peak and valley times: a second run landing on t_p ± Δt/2 and
/// t_v ± Δt/2, ended at the last ([`Sink::ends_run`]: the steps up to there are those of the
/// whole run). 0 where the turns are within one sample of each other or of the run's ends.
fn sampled_dip(a: &Armature, r: Ohms, v: Volts, run: &Run, tp: f32, tv: f32) -> Result<f32, Error> {
    let dt = run.sample_period.value();
    if !(tv - tp >= dt && tp >= 0.5 * dt && tv + 0.5 * dt <= run.duration.value()) {
        return Ok(0.0);
    }
    let mut probes = Probes {
        at: [tp - 0.5 * dt, tp + 0.5 * dt, tv - 0.5 * dt, tv + 0.5 * dt],
        got: [0.0; 4],
        n: 0,
    };
    pull_in_to(a, r, v, run, &mut probes)?;
    if probes.n != 4 {
        return Err(Error::new("sample period", Reason::Unreachable));
    }
    let [a0, a1, b0, b1] = probes.got;
    Ok(a0.min(a1) - b0.max(b1))
}

/// The smallest dip as sampled every `run.sample_period` at any phase over the corners `turns`
/// lists (from [`pull_in_window_keeping`] with the same armature, tolerances and drive: its
/// turning points do not depend on the sample period), with no first pass: one short run per
/// corner. Infinite with no corner.
///
/// # Errors
/// More than 2048 turns → [`Reason::TooLarge`] on `"turns"`; a corner index beyond 2047 →
/// [`Reason::OutsideValidatedRange`] on `"turns"`; as [`pull_in_window`] otherwise.
pub fn sampled_dip_min_at(
    nominal: &Armature,
    tol: &Tolerances,
    drive: &DriveRange,
    run: &Run,
    turns: &[CornerTurns],
) -> Result<f32, Error> {
    check(tol, drive)?;
    nominal.validate()?;
    if turns.len() > 2048 {
        return Err(Error::new("turns", Reason::TooLarge));
    }
    let mut least = f32::INFINITY;
    for t in turns {
        if t.corner >= 2048 {
            return Err(Error::new("turns", Reason::OutsideValidatedRange));
        }
        let a = corner(nominal, tol, t.corner)?;
        let (v, r) = drive_of(drive, t.corner);
        least = least.min(sampled_dip(&a, r, v, run, t.peak_s, t.valley_s)?);
    }
    Ok(least)
}

fn peak_of(p: &PullIn) -> f32 {
    p.peak
        .map_or(p.end_current.value(), |t| t.current.value())
        .max(p.end_current.value())
}

/// Why a pull-in is not detectable with an ADC.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum NotDetectable {
    /// Some corner does not pull in (or, for a release, does not open) within the run:
    /// nothing to detect there.
    DoesNotPullIn,
    /// The largest current reaches full scale.
    Saturates,
    /// The smallest sampled dip, less twice the noise, is below the hysteresis.
    DipTooSmall,
    /// Some corner's current never climbs far enough above its valley to confirm it (for a
    /// release: never falls far enough below the bump's top).
    NoClimb,
}

/// The detector thresholds for `adc` from a window computed at its sample period with
/// `confirm` = [`confirm_amps`] of the same ADC, or why the pull-in is not detectable with it.
///
/// # Errors
/// `counts per amp` ≤ 0 → [`Reason::NotPositive`]; a window beyond 2³² samples →
/// [`Reason::TooLarge`] on `"window"`.
pub fn detector_for(
    w: &PullInWindow,
    adc: &Adc,
) -> Result<Result<DipConfig, NotDetectable>, Error> {
    thresholds(
        Polarity::Rising,
        &Turns {
            all_moved: w.not_seated.is_none(),
            current_max: w.current_max,
            sampled_min: w.sampled_dip_min,
            confirmed_by: w.confirmed_by,
        },
        adc,
    )
}

/// What the thresholds need of a window, pull-in or release.
pub(super) struct Turns {
    /// Every corner moved (seated, or opened).
    pub(super) all_moved: bool,
    /// The largest current, A.
    pub(super) current_max: f32,
    /// The smallest dip (or bump) as sampled, A.
    pub(super) sampled_min: f32,
    /// When every corner's turn is confirmed, s (None: some never is).
    pub(super) confirmed_by: Option<f32>,
}

/// The detector's thresholds for `adc` (module docs), or why the motion is not detectable.
pub(super) fn thresholds(
    polarity: Polarity,
    t: &Turns,
    adc: &Adc,
) -> Result<Result<DipConfig, NotDetectable>, Error> {
    let cpa = error::positive("counts per amp", adc.counts_per_amp)?;
    let n_e = u32::from(adc.noise_counts) + 1;
    let hyst = n_e.saturating_mul(2).saturating_add(1);
    if !t.all_moved {
        return Ok(Err(NotDetectable::DoesNotPullIn));
    }
    if !(t.current_max * cpa < f32::from(adc.full_scale)) {
        return Ok(Err(NotDetectable::Saturates));
    }
    let dip_counts = libm::floorf(t.sampled_min * cpa);
    if !(dip_counts - 2.0 * n_e as f32 >= hyst as f32) {
        return Ok(Err(NotDetectable::DipTooSmall));
    }
    let Some(by) = t.confirmed_by else {
        return Ok(Err(NotDetectable::NoClimb));
    };
    let window = libm::ceilf(by * adc.rate.value()) + 1.0;
    if !(window < u32::MAX as f32) {
        return Err(Error::new("window", Reason::TooLarge));
    }
    let hyst16 = u16::try_from(hyst).map_err(|_| Error::new("noise", Reason::TooLarge))?;
    Ok(Ok(DipConfig {
        polarity,
        rise: hyst16,
        hysteresis: hyst16,
        min_dip: hyst16,
        window: window as u32,
        full_scale: adc.full_scale,
    }))
}

/// The climb above the valley, A, that confirms it with `adc`: the hysteresis plus twice the
/// noise, in amperes.
///
/// # Errors
/// `counts per amp` ≤ 0 → [`Reason::NotPositive`].
pub fn confirm_amps(adc: &Adc) -> Result<f32, Error> {
    let cpa = error::positive("counts per amp", adc.counts_per_amp)?;
    let n_e = f32::from(adc.noise_counts) + 1.0;
    Ok((4.0 * n_e + 1.0) / cpa)
}

/// The run for sizing at `adc`: `duration`, its sample period, a local tolerance of 10⁻⁵ (the
/// event times then agree with the reference to about 10⁻⁴; the claims keep whole counts of
/// margin).
///
/// # Errors
/// As [`Seconds::new`] for the period.
pub fn run_for(adc: &Adc, duration: Seconds) -> Result<Run, Error> {
    Ok(Run {
        duration,
        sample_period: Seconds::new(1.0 / adc.rate.value())?,
        tolerance: 1e-5,
    })
}
