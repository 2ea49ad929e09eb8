//! The diagnosis measurements at one point, under each condition the firmware tells apart:
//! healthy, clamp path open, zener shorted, coil open, shorted turns, coil too hot.
//!
//! The circuits (each at the point's own axis values):
//! - clamp path open: the switch's own avalanche at its tolerance and temperature axes;
//! - zener shorted (zener + diode, switched freewheel): the diode alone;
//! - coil open: no current, every measurement reads zero;
//! - shorted turns, a share f of the turns: R·(1 − f) (with the wire's length) and L anywhere
//!   from L·(1 − f)² (with the square of the turns) to L·(1 − f) (the two common models;
//!   the reading is monotone in the L factor, so both ends bound it), or the L and R factors
//!   the file gives;
//! - coil too hot: the winding axis mapped onto the 50 K above the hottest allowed winding.

use super::profile::{self, MAX_CURRENTS};
use super::Context;
use crate::clamp::{Clamp, SwitchOff};
use crate::diagnosis::Condition;
use crate::error::Error;
use crate::host::board::{ClampBoard, MeasureBoard};
use crate::host::corners::{Axis, Point};
use crate::host::parts::{self, Circuit, Off, Path};

/// Most measurements a driver's diagnosis takes.
pub const MAX_MEASUREMENTS: usize = 4;

/// How far above the hottest allowed winding the too-hot fault window reaches, K.
pub const TOO_HOT_SPAN_K: f32 = 50.0;

/// What each measurement reads on one switch-off, and the times to `extra` currents, from one
/// integration (on to the decay's end if `to_end`, for its energies). A comparator whose threshold is at or above the peak never trips and reads
/// zero; a current window whose lower threshold is at or above the start current reads zero.
///
/// # Errors
/// The library's refusals (see `profile::run`).
pub fn measure(
    off: &SwitchOff,
    to_end: bool,
    extra: &[f32],
    measurements: &[MeasureBoard],
    extra_times: &mut [f32],
    values: &mut [Option<f32>],
) -> Result<crate::clamp::Decay, Error> {
    let mut wanted = [0.0f32; MAX_CURRENTS];
    let mut n = 0usize;
    let mut put = |x: f32, n: &mut usize| {
        if let Some(s) = wanted.get_mut(*n) {
            *s = x;
            *n += 1;
        }
    };
    for &x in extra {
        put(x, &mut n);
    }
    let i0 = off.start_current().value();
    for m in measurements {
        match *m {
            MeasureBoard::Comparator(th) => match off.current_at_switch_voltage(th) {
                Ok(i) => put(i.value(), &mut n),
                // Never trips: a current at the start reads zero time.
                Err(_) => put(i0, &mut n),
            },
            MeasureBoard::Current { upper, lower } => {
                put(upper.value(), &mut n);
                put(lower.value(), &mut n);
            }
        }
    }
    let mut times = [0.0f32; MAX_CURRENTS];
    let w = wanted.get(..n).unwrap_or(&[]);
    let decay = profile::run(off, w, to_end, &mut times)?;
    for (slot, t) in extra_times.iter_mut().zip(times.iter()) {
        *slot = *t;
    }
    let mut k = extra.len();
    for (m, v) in measurements.iter().zip(values.iter_mut()) {
        let at = |j: usize| times.get(j).copied().unwrap_or(0.0);
        *v = Some(match m {
            MeasureBoard::Comparator(_) => {
                k += 1;
                at(k - 1)
            }
            MeasureBoard::Current { .. } => {
                k += 2;
                (at(k - 1) - at(k - 2)).max(0.0)
            }
        });
    }
    Ok(decay)
}

/// The circuit of a fault condition at `p`, or None where it does not apply (or has no decay);
/// `upper` picks the upper end of a condition's model range (the shorted turns' L factor).
fn fault_circuit(
    cx: &Context<'_>,
    cond: Condition,
    p: &Point,
    upper: bool,
) -> Result<Option<Circuit>, Error> {
    let d = cx.d;
    Ok(match cond {
        Condition::Healthy => Some(parts::circuit_at(d, p)?),
        Condition::ClampOpen => parts::open_clamp_at(d, p)?,
        Condition::ZenerShorted => match &d.clamp {
            ClampBoard::ZenerDiode { diode, .. } | ClampBoard::SwitchedFreewheel { diode, .. } => {
                let mut c = parts::circuit_at(d, p)?;
                c.path = Path::Clamp(Clamp::FreewheelDiode(parts::diode_at(diode, p)?));
                Some(c)
            }
            _ => None,
        },
        // No decay; the armature's conditions are not flyback windows' business.
        Condition::CoilOpen | Condition::ArmatureStuckOpen | Condition::ArmatureStuckClosed => None,
        Condition::ShortedTurns => {
            let ((l_lo, l_hi), fr) =
                cx.d.diagnosis
                    .as_ref()
                    .map_or(((1.0, 1.0), 1.0), |g| g.shorted);
            let fl = if upper { l_hi } else { l_lo };
            let mut c = parts::circuit_at(d, p)?;
            c.coil = c.coil.scaled(fl, fr)?;
            c.op.start_current = c.coil.steady_current(c.op.supply, c.op.winding)?;
            Some(c)
        }
        Condition::CoilTooHot => {
            let (lo, hi) = cx.winding;
            let share = if hi > lo {
                (p.at(Axis::Winding) - lo) / (hi - lo)
            } else {
                0.0
            };
            let hot = p.with(Axis::Winding, hi + share * TOO_HOT_SPAN_K);
            Some(parts::circuit_at(d, &hot)?)
        }
    })
}

/// Every measurement under every fault condition at `p` (the healthy row is filled by the
/// caller from the healthy switch-off's own integration).
///
/// # Errors
/// The library's refusals at this point.
pub fn faults(
    cx: &Context<'_>,
    p: &Point,
    out: &mut [[Option<(f32, f32)>; 6]; MAX_MEASUREMENTS],
) -> Result<(), Error> {
    let Some(g) = cx.d.diagnosis.as_ref() else {
        return Ok(());
    };
    let ((l_lo, l_hi), _) = g.shorted;
    for (ci, cond) in Condition::ALL.iter().enumerate().skip(1) {
        // The shorted turns take both ends of their model range (when it is one).
        let ends: &[bool] = if *cond == Condition::ShortedTurns && l_hi > l_lo {
            &[false, true]
        } else {
            &[false]
        };
        let mut pairs: [Option<(f32, f32)>; MAX_MEASUREMENTS] = [None; MAX_MEASUREMENTS];
        for &upper in ends {
            let mut values = [None; MAX_MEASUREMENTS];
            if *cond == Condition::CoilOpen {
                values
                    .iter_mut()
                    .take(g.measurements.len())
                    .for_each(|v| *v = Some(0.0));
            } else if let Some(c) = fault_circuit(cx, *cond, p, upper)? {
                if let Off::Engine(off) = c.switch_off()? {
                    measure(&off, false, &[], &g.measurements, &mut [], &mut values)?;
                }
            }
            for (pair, v) in pairs.iter_mut().zip(values) {
                *pair = match (*pair, v) {
                    (None, Some(x)) => Some((x, x)),
                    (Some((a, b)), Some(x)) => Some((a.min(x), b.max(x))),
                    (keep, None) => keep,
                };
            }
        }
        for (row, v) in out.iter_mut().zip(pairs) {
            if let Some(slot) = row.get_mut(ci) {
                *slot = v;
            }
        }
    }
    Ok(())
}
