//! Configuration time: does the armature let go and reach its open stop at every corner after a
//! switch-off, when, how high is the bump its departure puts on the decaying current, and can a
//! given ADC see it — with the detector thresholds that see it (a welded or stuck-closed
//! armature gives a plain decay: no bump).
//!
//! # Method
//!
//! The corners are the nine mechanical axes of [`super::sizing`] (mass, stroke, preload, spring
//! rate, load, damping, L_seat, L_open, g₀; 2⁹ = 512) crossed with the switch-offs the caller
//! passes: the switch-off fixes the start current, the clamp's loop law, the supply and the
//! temperatures, all of which the caller's own corner engine already spans. The caller passes
//! the switch-offs that bound the decay (the host passes its slowest and its fastest vertex):
//! the time the current takes to fall to a seated armature's balance current
//! i_rel = √(2·F_open(0)/|dL/dx(0)|) grows with the start current and with a lower clamp
//! voltage, and the flight is slowed by what current is left. The tests compare the corner
//! extremes with random interior points.
//!
//! Each corner is integrated twice (as at pull-in): once for its events and turning points
//! (release start, open stop, the valley before the bump and the bump's top), once landing on
//! the four instants t_v ± Δt/2 and t_b ± Δt/2, which bound the bump as an ADC sampling every
//! Δt sees it at any phase: min(i(t_b ± Δt/2)) − max(i(t_v ± Δt/2)).
//!
//! The bump's top is confirmed by a fall of `confirm` below it. After the bump the armature is
//! on its open stop and the current decays monotonically under the clamp's loop law, so the
//! fall happens before the run's end whenever the top less `confirm` is above the current at
//! the end (10⁻⁴ of the start current, or the run's duration): the run's end bounds the
//! confirmation, conservatively (a later verdict, never a missed one).
//!
//! Work: at most 2 × 512 × [`MAX_SWITCH_OFFS`] integrations, each bounded as
//! [`super::motion`] states.

use super::detect::{DipConfig, Polarity};
use super::motion::{release_to, Run};
use super::sizing::{
    check_tolerances, corner, thresholds, Adc, NotDetectable, Probes, Span, Tolerances, Turns,
};
use super::Armature;
use crate::clamp::SwitchOff;
use crate::error::{self, Error, Reason};

/// The most switch-offs [`release_window`] takes.
pub const MAX_SWITCH_OFFS: usize = 8;

/// What the corners say of release.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ReleaseWindow {
    /// Corners evaluated (512 per switch-off).
    pub corners: u32,
    /// The first corner that did not reach the open stop within the run, if any: (mechanical
    /// corner bits as in [`super::sizing`], bits 0 … 8; index of the switch-off).
    pub not_opened: Option<(u32, usize)>,
    /// The armature leaving its seat, s after switch-off, over the corners that released.
    pub release_start: Span,
    /// The armature reaching its open stop, s, over the corners that opened.
    pub opened: Span,
    /// The bump (its top less the valley before it), A, over the corners that opened.
    pub bump: Span,
    /// The smallest bump as sampled at the run's sample period, A (0 where a corner shows no
    /// bump, or its valley and top are within one sample).
    pub sampled_bump_min: f32,
    /// The shortest time from the valley to the bump's top over the corners that show a bump,
    /// s (a necessary bound on the ADC's rate, as at pull-in). Infinite when none does.
    pub bump_duration_min: f32,
    /// The largest current, A: the largest start current.
    pub current_max: f32,
    /// When every corner's bump is confirmed, s (None: some corner's current never falls
    /// `confirm` below its top within the run).
    pub confirmed_by: Option<f32>,
}

/// Release over every corner: the nine mechanical axes at their ends × each of `offs`.
///
/// # Errors
/// A tolerance outside 0 … 0.5 → [`Reason::OutsideValidatedRange`] naming it; no switch-off,
/// or more than [`MAX_SWITCH_OFFS`] → [`Reason::OutsideValidatedRange`] on `"switch-offs"`; a
/// negative or non-finite `confirm`; a corner whose L_open exceeds its L_seat →
/// [`Reason::Inconsistent`] on `"open inductance"`; errors of [`super::motion::release`] at a
/// corner.
pub fn release_window(
    nominal: &Armature,
    tol: &Tolerances,
    offs: &[SwitchOff],
    run: &Run,
    confirm: f32,
) -> Result<ReleaseWindow, Error> {
    check_tolerances(tol)?;
    nominal.validate()?;
    error::non_negative("confirm", confirm)?;
    if offs.is_empty() || offs.len() > MAX_SWITCH_OFFS {
        return Err(Error::new("switch-offs", Reason::OutsideValidatedRange));
    }
    let mut w = ReleaseWindow {
        corners: 0,
        not_opened: None,
        release_start: Span::EMPTY,
        opened: Span::EMPTY,
        bump: Span::EMPTY,
        sampled_bump_min: f32::INFINITY,
        bump_duration_min: f32::INFINITY,
        current_max: 0.0,
        confirmed_by: Some(0.0),
    };
    for (j, off) in offs.iter().enumerate() {
        w.current_max = w.current_max.max(off.start_current().value());
        for k in 0u32..512 {
            let a = corner(nominal, tol, k)?;
            if !corner_release(&a, off, run, confirm, &mut w)? {
                w.not_opened.get_or_insert((k, j));
            }
            w.corners = w.corners.saturating_add(1);
        }
    }
    if w.sampled_bump_min == f32::INFINITY {
        w.sampled_bump_min = 0.0;
    }
    Ok(w)
}

/// One corner into `w`; whether it reached the open stop.
fn corner_release(
    a: &Armature,
    off: &SwitchOff,
    run: &Run,
    confirm: f32,
    w: &mut ReleaseWindow,
) -> Result<bool, Error> {
    let dt = run.sample_period.value();
    let r = release_to(a, off, run, &mut super::sizing::Nothing)?;
    if let Some(t) = r.release_start {
        w.release_start.add(t.value());
    }
    let Some(t_open) = r.opened else {
        w.confirmed_by = None;
        return Ok(false);
    };
    w.opened.add(t_open.value());
    let (Some(v), Some(b)) = (r.valley, r.bump) else {
        // Opened without a bump on the current (it had died before the flight): nothing a
        // sample can see.
        w.bump.add(0.0);
        w.sampled_bump_min = 0.0;
        w.confirmed_by = None;
        return Ok(true);
    };
    w.bump.add(r.bump_height());
    let (tv, tb, end) = (v.time.value(), b.time.value(), r.end_time.value());
    w.bump_duration_min = w.bump_duration_min.min(tb - tv);
    let sampled = if tb - tv >= dt && tv >= 0.5 * dt && tb + 0.5 * dt <= end {
        let mut probes = Probes {
            at: [tv - 0.5 * dt, tv + 0.5 * dt, tb - 0.5 * dt, tb + 0.5 * dt],
            got: [0.0; 4],
            n: 0,
        };
        // Ends at the last instant (Sink::ends_run; the steps up to it are the whole run's).
        release_to(a, off, run, &mut probes)?;
        if probes.n != 4 {
            return Err(Error::new("sample period", Reason::Unreachable));
        }
        let [v0, v1, b0, b1] = probes.got;
        b0.min(b1) - v0.max(v1)
    } else {
        0.0
    };
    w.sampled_bump_min = w.sampled_bump_min.min(sampled);
    let by = (b.current.value() - confirm > r.end_current.value()).then_some(end + dt);
    w.confirmed_by = match (w.confirmed_by, by) {
        (Some(x), Some(y)) => Some(x.max(y)),
        _ => None,
    };
    Ok(true)
}

/// The release detector's thresholds for `adc` from a window computed at its sample period
/// with `confirm` = [`super::sizing::confirm_amps`] of the same ADC ([`Polarity::Falling`]: a
/// stuck-closed armature's plain decay never turns), or why the release is not detectable.
///
/// # Errors
/// `counts per amp` ≤ 0 → [`Reason::NotPositive`]; a window beyond 2³² samples →
/// [`Reason::TooLarge`] on `"window"`.
pub fn release_detector_for(
    w: &ReleaseWindow,
    adc: &Adc,
) -> Result<Result<DipConfig, NotDetectable>, Error> {
    thresholds(
        Polarity::Falling,
        &Turns {
            all_moved: w.not_opened.is_none(),
            current_max: w.current_max,
            sampled_min: w.sampled_bump_min,
            confirmed_by: w.confirmed_by,
        },
        adc,
    )
}
