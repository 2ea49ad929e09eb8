//! Timing: the release time against its requirement, the waits the firmware needs after a
//! switch-off, and whether the coil still operates when hot at the lowest supply.
//!
//! Conventions (per-unit guarantee, [`crate::host::figures::magnetic_current`]): a datasheet's
//! must-operate and must-release voltages hold for every unit at the coil's reference
//! temperature, so each unit's release and operate currents are those voltages over the same
//! unit's own resistance at the reference temperature, the resistance that also sets its
//! on-current. The resistance tolerance moves both sides together: the operate check
//! V_min·R_u(T_ref)/R_u(T_hot) ≥ V_op does not depend on it, and the release time is the decay
//! of one unit to its own release current.
//!
//! The three waits after a switch-off (each the worst corner, rounded up to whole ticks):
//! - `RELEASE_WAIT_TICKS`: until the contacts are open (the decay to the release current plus
//!   the mechanical release time): the load is disconnected;
//! - `DECAY_WAIT_TICKS`: until the coil current is below 1 % of its on-value: the clamp has
//!   done its work and the coil holds almost no energy;
//! - `REENERGISE_WAIT_TICKS`: the longer of the two, the wait before re-energising or
//!   reversing: the armature has released and the current has decayed, so the next pull-in
//!   starts from rest and a reversal does not fight a residual current.
//!
//! Worst corner: the time to the unit's release current grows with L, with the ratio of the
//! on-current to the release current (higher supply, colder winding) and with a lower clamp
//! voltage (lower tolerance; for a diode a hotter junction, for a positive-tempco zener a
//! colder one); the operate drive is lowest at the lowest supply and the hottest winding. Each
//! is monotone in every axis; the vertex search finds the extremes whatever their directions.

use super::{figure_check, ticks_up, Bound, Constant, Limit, Metric, Outcome, Unit};
use crate::host::board::Board;
use crate::host::engine::DriverRun;
use crate::host::HostError;
use std::format;

/// The timing checks and their constants.
///
/// # Errors
/// A wait beyond the timer's range.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<(), HostError> {
    let release = release(board, run, out)?;
    let decay = decay(board, run, out)?;
    if let Some(wait) = release.max(decay) {
        out.constants.push(Constant::new(
            &run.d.module,
            "REENERGISE_WAIT_TICKS",
            wait,
            "wait from switch-off before re-energising or reversing: the longer of RELEASE_WAIT_TICKS and DECAY_WAIT_TICKS",
        ));
    }
    operate(run, out);
    Ok(())
}

/// The release time and `RELEASE_WAIT_TICKS`; the wait, if the coil has a must-release voltage.
fn release(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<Option<u32>, HostError> {
    let d = &run.d;
    let Some(v_rel) = d.release else {
        return Ok(None);
    };
    let limit = d.max_release_time.map(|t| Limit {
        value: t.value(),
        bound: Bound::AtMost,
        source: "required release time".into(),
    });
    let Some(c) = figure_check(
        run,
        Metric::Release,
        "release_time",
        "switch-off to contacts open",
        Unit::Second,
        limit,
    ) else {
        return Ok(None);
    };
    let wait = ticks_up(board, c.value.unwrap_or(0.0))?;
    out.constants.push(Constant::new(
        &d.module,
        "RELEASE_WAIT_TICKS",
        wait,
        "wait from switch-off until the contacts are open, worst corner, rounded up",
    ));
    out.checks.push(c.noted(format!(
        "decay to this unit's release current ({v_rel} ÷ its own resistance at the reference temperature: the resistance tolerance moves the on-current and the release current together) + {:.1} ms mechanical",
        d.mechanical.value() * 1e3
    )));
    Ok(Some(wait))
}

/// The decay to 1 % of the on-current and `DECAY_WAIT_TICKS`.
fn decay(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<Option<u32>, HostError> {
    let Some(c) = figure_check(
        run,
        Metric::OffTime,
        "off_time",
        "switch-off to current below 1 % of its on-value",
        Unit::Second,
        None,
    ) else {
        return Ok(None);
    };
    let wait = ticks_up(board, c.value.unwrap_or(0.0))?;
    out.constants.push(Constant::new(
        &run.d.module,
        "DECAY_WAIT_TICKS",
        wait,
        "wait from switch-off until the coil current is below 1 % of its on-value, worst corner, rounded up",
    ));
    out.checks.push(c.noted(
        "the coil current has decayed; before re-energising or reversing the firmware waits REENERGISE_WAIT_TICKS, the longer of this and the release time",
    ));
    Ok(Some(wait))
}

/// The operate check: the on-current referred to the reference temperature against the
/// must-operate voltage.
fn operate(run: &DriverRun, out: &mut Outcome) {
    let Some(v_op) = run.d.operate else { return };
    let lim = Limit {
        value: v_op.value(),
        bound: Bound::AtLeast,
        source: format!("must-operate voltage {v_op}, per unit at the reference temperature"),
    };
    if let Some(c) = figure_check(
        run,
        Metric::OperateDrive,
        "operate",
        "coil drive to operate, referred to the reference temperature",
        Unit::Volt,
        Some(lim),
    ) {
        out.checks.push(c.noted(
            "the steady on-current at the lowest supply and the hottest winding × the same unit's resistance at the reference temperature (V_min·R(T_ref)/R(T_hot)): the resistance tolerance cancels",
        ));
    }
}
