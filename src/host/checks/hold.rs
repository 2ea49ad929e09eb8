//! The PWM peak-and-hold, judged with what the firmware will really run: the emitted counts.
//!
//! - the duty each vertex needs (it must stay below 100 %), and the one emitted: the largest
//!   needed, rounded up to whole counts (see [`crate::host::sizing`]);
//! - the current actually held at every vertex with the emitted duty, its lowest against the
//!   target (it cannot fall below: the emitted duty is the worst vertex's, rounded up), its
//!   highest (the winding's heating);
//! - the ripple against its target, the time to the pull-in current, and the power the
//!   freewheel parts burn while holding (a zener in the freewheel path burns it in every
//!   cycle; a switched freewheel bypasses it, and the saving is shown).
//!
//! Worst corner: the duty needed and the held current are monotone in the supply, R, the
//! winding temperature and the freewheel drop (D = (I·R + V_f)/(V + V_f)); the ripple peaks
//! near D = ½ but, with the duty fixed, is monotone in V, L and R at each corner; the vertex
//! search takes each extreme.

use super::{
    figure_check, ticks_up, Bound, Check, Constant, Corner, Limit, Metric, Outcome, Status, Unit,
};
use crate::host::board::{Board, ClampBoard};
use crate::host::engine::DriverRun;
use crate::host::HostError;
use std::format;

/// The hold cannot work: some corner needs more than 100 %.
fn infeasible(run: &DriverRun, i_hold: f32, out: &mut Outcome) {
    let d = &run.d;
    let at = Metric::HoldDuty
        .first_missing(d, &run.points, &run.figures)
        .map_or(Corner::Ties, |p| {
            Corner::At(run.space.describe(&p), run.space.values(&p))
        });
    let c = Check::worded(
        &d.name,
        "hold_duty",
        "PWM duty needed to hold",
        Status::Fail,
        "more than 100 %",
        at,
    )
    .noted(format!(
        "the supply cannot hold {:.0} mA at this corner",
        i_hold * 1e3
    ));
    out.checks.push(c);
}

/// The duty, the current held with it and the ripple.
fn duty_and_current(
    run: &DriverRun,
    h: &crate::host::board::HoldBoard,
    plan: &crate::host::figures::HoldPlan,
    out: &mut Outcome,
) {
    let lim = Limit {
        value: 1.0,
        bound: Bound::AtMost,
        source: "100 %".into(),
    };
    if let Some(c) = figure_check(
        run,
        Metric::HoldDuty,
        "hold_duty",
        "PWM duty needed to hold",
        Unit::Fraction,
        Some(lim),
    ) {
        out.checks.push(c.noted(format!(
            "emitted: {:.2} % (the worst corner's need, rounded up to whole counts)",
            plan.duty.value() * 100.0
        )));
    }
    let target = Limit {
        value: h.hold.value(),
        bound: Bound::AtLeast,
        source: "hold current".into(),
    };
    if let Some(c) = figure_check(
        run,
        Metric::HoldHeldMin,
        "hold_current",
        "current held with the emitted duty, lowest",
        Unit::Ampere,
        Some(target),
    ) {
        out.checks.push(c);
    }
    if let Some(c) = figure_check(
        run,
        Metric::HoldHeldMax,
        "hold_current_high",
        "current held with the emitted duty, highest",
        Unit::Ampere,
        None,
    ) {
        out.checks
            .push(c.noted("a fixed duty holds more at a high supply and a cold winding"));
    }
    let ripple = h.max_ripple.map(|r| Limit {
        value: r.value(),
        bound: Bound::AtMost,
        source: "ripple target".into(),
    });
    if let Some(c) = figure_check(
        run,
        Metric::HoldRipple,
        "hold_ripple",
        "hold current ripple, peak to peak",
        Unit::Ampere,
        ripple,
    ) {
        out.checks
            .push(c.noted(format!("at {:.0} Hz", plan.frequency.value())));
    }
}

/// The hold checks and their constants.
///
/// # Errors
/// A pull-in time beyond the timer's range.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<(), HostError> {
    let d = &run.d;
    let (Some(h), Some(choice)) = (d.hold.as_ref(), run.hold) else {
        return Ok(());
    };
    let Some(plan) = choice.plan else {
        infeasible(run, h.hold.value(), out);
        return Ok(());
    };
    emitted(d, &choice, &plan, out);
    duty_and_current(run, h, &plan, out);
    pull_in(board, run, h.pull_in.value(), out)?;
    power(run, out);
    Ok(())
}

/// The emitted counts.
fn emitted(
    d: &crate::host::board::DriverBoard,
    choice: &crate::host::sizing::HoldChoice,
    plan: &crate::host::figures::HoldPlan,
    out: &mut Outcome,
) {
    match choice.period_counts {
        Some(top) => {
            out.constants.push(Constant::new(
                &d.module,
                "PWM_PERIOD_COUNTS",
                top,
                "PWM period in PWM-timer clock counts",
            ));
            out.constants.push(Constant::new(&d.module, "HOLD_ON_COUNTS", choice.on, "on-time per PWM period while holding, in PWM-timer clock counts (worst corner, rounded up)"));
        }
        None => out.constants.push(Constant::new(
            &d.module,
            "HOLD_DUTY_PPM",
            choice.on,
            "hold duty in parts per million (worst corner, rounded up)",
        )),
    }
    if let Some(f) = choice.frequency_needed {
        let c = Check::valued(&d.name, "hold_frequency", "PWM frequency (sized)", plan.frequency.value(), Unit::Hertz, None, Corner::Stated("the corner with the most ripple".into()))
            .noted(format!("lowest frequency meeting the ripple target at every corner: {f:.0} Hz, period rounded down to whole counts"));
        out.checks.push(c);
    }
}

/// Time to the pull-in current.
fn pull_in(
    board: &Board,
    run: &DriverRun,
    target: f32,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let d = &run.d;
    if let Some(p) = Metric::PullIn.first_missing(d, &run.points, &run.figures) {
        out.checks.push(
            Check::worded(
                &d.name,
                "pull_in_time",
                "time to the pull-in current",
                Status::Fail,
                "never reached",
                Corner::At(run.space.describe(&p), run.space.values(&p)),
            )
            .noted(format!(
                "the supply cannot drive {:.0} mA through the coil at this corner",
                target * 1e3
            )),
        );
        return Ok(());
    }
    if let Some(c) = figure_check(
        run,
        Metric::PullIn,
        "pull_in_time",
        "time to the pull-in current at full drive",
        Unit::Second,
        None,
    ) {
        let ticks = ticks_up(board, c.value.unwrap_or(0.0))?;
        out.constants.push(Constant::new(
            &d.module,
            "PULL_IN_TICKS",
            ticks,
            "full drive before switching to hold, worst corner, rounded up",
        ));
        out.checks.push(c);
    }
    Ok(())
}

/// Power in the freewheel parts while holding.
fn power(run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    if let Some(c) = figure_check(
        run,
        Metric::HoldDiode,
        "hold_diode_power",
        "freewheel diode power while holding",
        Unit::Watt,
        None,
    ) {
        out.checks.push(c);
    }
    match &d.clamp {
        ClampBoard::ZenerDiode { .. } => {
            if let Some(c) = figure_check(
                run,
                Metric::HoldZener,
                "hold_zener_power",
                "zener power while holding",
                Unit::Watt,
                None,
            ) {
                out.checks.push(c.noted("the zener is in the freewheel path: it conducts in every PWM cycle (a switched freewheel would bypass it)"));
            }
        }
        ClampBoard::SwitchedFreewheel { .. } => {
            if let Some(c) = figure_check(
                run,
                Metric::HoldUnbypassed,
                "hold_zener_saved",
                "zener power the bypass saves while holding",
                Unit::Watt,
                None,
            ) {
                out.checks.push(c.noted(format!("per driver ({} drivers): what the zener would burn in every PWM cycle without its bypass; it clamps only at the final turn-off", d.count)));
            }
        }
        _ => {}
    }
    if let Some(c) = figure_check(
        run,
        Metric::HoldCoil,
        "hold_coil_power",
        "winding power while holding",
        Unit::Watt,
        None,
    ) {
        out.checks.push(c);
    }
}
