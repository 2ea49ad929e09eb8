//! Timing: the release time against its requirement, the wait before re-energising or
//! reversing, and whether the coil still pulls in when hot at the lowest supply.
//!
//! Conventions (the magnetic circuit's, the same at every winding temperature): the release
//! current is the must-release voltage over the coil resistance at its reference temperature,
//! taken at the top of the resistance tolerance (its lowest value: the longest wait); the
//! operate current likewise at the bottom of the tolerance (its highest value).
//!
//! Worst corner: the time to a fixed current grows with L, with the on-current (higher supply,
//! lower R, colder winding) and with a lower clamp voltage (lower tolerance; for a diode a
//! hotter junction, for a positive-tempco zener a colder one); the on-current, for the pull-in
//! check, is lowest at the lowest supply, the highest R and the hottest winding. Each is
//! monotone in every axis; the vertex search finds the extremes whatever their directions.

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
    let d = &run.d;
    if let (Some(i_rel), Some(v_rel)) = (run.release_current, d.release) {
        let limit = d.max_release_time.map(|t| Limit {
            value: t.value(),
            bound: Bound::AtMost,
            source: "required release time".into(),
        });
        if let Some(c) = figure_check(
            run,
            Metric::Release,
            "release_time",
            "switch-off to contacts open",
            Unit::Second,
            limit,
        ) {
            let wait = ticks_up(board, c.value.unwrap_or(0.0))?;
            out.constants.push(Constant::new(
                &d.module,
                "RELEASE_WAIT_TICKS",
                wait,
                "wait from switch-off until the contacts are open, worst corner, rounded up",
            ));
            out.checks.push(c.noted(format!(
                "decay to the release current {:.2} mA ({} ÷ the coil's resistance at its reference temperature, tolerance high) + {:.1} ms mechanical",
                i_rel.value() * 1e3,
                v_rel,
                d.mechanical.value() * 1e3
            )));
        }
    }
    if let Some(c) = figure_check(
        run,
        Metric::OffTime,
        "off_time",
        "switch-off to current below 1 % of its on-value",
        Unit::Second,
        None,
    ) {
        let wait = ticks_up(board, c.value.unwrap_or(0.0))?;
        out.constants.push(Constant::new(&d.module, "OFF_TIME_TICKS", wait, "wait before re-energising or reversing: current below 1 % of its on-value, worst corner, rounded up"));
        out.checks
            .push(c.noted("the firmware's wait before re-energising or reversing"));
    }
    if let (Some(i_op), Some(v_op)) = (run.operate_current, d.operate) {
        let lim = Limit { value: i_op.value(), bound: Bound::AtLeast, source: format!("operate current: {v_op} ÷ the coil's resistance at its reference temperature, tolerance low") };
        if let Some(c) = figure_check(
            run,
            Metric::OnCurrent,
            "pull_in",
            "coil current available to operate",
            Unit::Ampere,
            Some(lim),
        ) {
            out.checks.push(c.noted("the steady on-current at the lowest supply and the hottest winding must reach the operate current"));
        }
    }
    Ok(())
}
