//! The single fault the firmware is there to detect: the clamp path open. Until the firmware
//! acts, every switch-off is then the switch's own avalanche; this check says how many such
//! switch-offs the switch survives (none, one, a number, or repetitively within its thermal
//! limits; model and reason in [`crate::host::figures`]'s survival module) and judges the
//! firmware's reaction against it:
//! - the firmware waits for `diagnosis.confirmations` fault readings in a row: the switch must
//!   survive that many (the check's limit);
//! - a confirmation needs a measurement that sees the fault: when the switch survives only a
//!   finite number and no configured measurement detects the open clamp (or the driver has no
//!   diagnosis), the firmware never acts and the switch avalanches until it fails, so the
//!   design fails, and the note names the measurement that would make it detectable (the
//!   proposed drain comparator, [`super::propose`]).
//!
//! Worst corner: the avalanche energy ½·L·I₀²·V_BR/(V_BR − V_s) (R → 0) grows with L and I₀
//! (high supply, low R, cold winding) and falls as V_BR rises above V_s; the allowance falls
//! as the switch's start temperature rises. The survivable count is monotone in each, and the
//! vertex search takes the smallest.

use super::propose::Proposal;
use super::{corner_for, figure_check, Bound, Check, Constant, Corner, Limit};
use super::{Metric, Outcome, Status};
use crate::host::engine::DriverRun;
use crate::host::figures::{avalanche_allowance, survival_reason, REPETITIVE};
use std::format;
use std::string::String;

/// The survival check's id.
pub const SURVIVAL_ID: &str = "open_clamp_survival";

/// How a count of switch-offs reads.
pub fn count_words(n: f32) -> String {
    if n >= REPETITIVE {
        "repetitively, within its thermal limits".into()
    } else if n < 1.0 {
        "none: a single avalanche pulse exceeds the switch's derated rating".into()
    } else if n < 2.0 {
        "one".into()
    } else {
        format!("{n:.0} in a row")
    }
}

/// The open-clamp checks and the constants the firmware needs for them. The survival check's
/// verdict is provisional until [`require_detection`] has seen the diagnosis.
pub fn checks(run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    if !run.figures.iter().any(|f| f.open.is_some()) {
        return;
    }
    if let Some(c) = figure_check(
        run,
        Metric::OpenEnergy,
        "open_clamp_energy",
        "switch avalanche energy with the clamp open",
        super::Unit::Joule,
        None,
    ) {
        out.checks.push(c.noted(format!("until the firmware acts, every switch-off avalanches the switch at {} (tolerance and temperature included)", d.switch.avalanche.nominal_voltage())));
    }
    let confirmations = d.diagnosis.as_ref().map(|g| g.confirmations);
    let title = "open-clamp switch-offs the switch survives";
    let Some(e) = Metric::OpenSurvivable.worst(d, &run.points, &run.figures) else {
        let c = Check::worded(&d.name, SURVIVAL_ID, title, Status::Warn, "not judged", Corner::Ties)
            .noted("not judged: give switch.avalanche_energy and junction_max (and avalanche_energy_repetitive) to judge the open-clamp fault");
        out.checks.push(c);
        return;
    };
    let survivable = e.value;
    let counted = if survivable >= REPETITIVE {
        u32::MAX
    } else {
        survivable as u32
    };
    out.constants.push(Constant::new(&d.module, "OPEN_CLAMP_SURVIVABLE", counted, "open-clamp switch-offs the switch survives in a row at the worst corner (0xFFFFFFFF: repetitively)"));
    // The reason at the tightest corner: the largest pulse against the rating derated to its
    // start (where the count ties over the box, the first vertex would say less).
    let why = run
        .figures
        .iter()
        .filter_map(|f| f.open)
        .max_by(|a, b| {
            let load = |o: &crate::host::figures::OpenFigures| {
                o.energy
                    / avalanche_allowance(&d.switch, o.start_c)
                        .unwrap_or(1.0)
                        .max(1e-30)
            };
            load(a).total_cmp(&load(b))
        })
        .map(|o| survival_reason(&d.switch, d.switching_rate, o.energy, o.start_c))
        .unwrap_or_default();
    let (status, judged) = match confirmations {
        _ if survivable >= REPETITIVE => (Status::Pass, String::from("the switch survives the fault repetitively")),
        Some(n) if (n as f32) <= survivable => (Status::Pass, format!("the firmware confirms the fault after {n} switch-off(s) and stops switching: within what the switch survives")),
        Some(n) => (Status::Fail, format!("the firmware waits for {n} confirmation(s) but the switch survives fewer: lower diagnosis.confirmations, or choose a switch with a higher avalanche rating")),
        None => (Status::Fail, String::from("nothing detects the fault: the switch avalanches on every switch-off until it fails; add a diagnosis (see the proposed drain comparator) or choose a switch rated for repetitive avalanche")),
    };
    let mut c = Check::worded(
        &d.name,
        SURVIVAL_ID,
        title,
        status,
        &count_words(survivable),
        corner_for(run, Metric::OpenSurvivable, &e),
    )
    .of(Metric::OpenSurvivable)
    .counted(survivable)
    .noted(format!("{judged}. Why: {why}"));
    c.limit = confirmations.map(|n| Limit {
        value: n as f32,
        bound: Bound::AtLeast,
        source: "the firmware's confirmations before it acts (diagnosis.confirmations)".into(),
    });
    out.checks.push(c);
    if let Some(n) = confirmations {
        out.constants.push(Constant::new(
            &d.module,
            "FAULT_CONFIRMATIONS",
            n,
            "fault readings in a row before the firmware acts (within OPEN_CLAMP_SURVIVABLE)",
        ));
    }
}

/// Fails a passing survival check that rests on a confirmation no configured measurement can
/// give: the switch survives only a finite number of open-clamp switch-offs and the open
/// clamp is not detectable. Run after the diagnosis checks; `proposal` is the comparator
/// [`super::propose`] sized, if one fits.
pub fn require_detection(run: &DriverRun, proposal: Option<&Proposal>, out: &mut Outcome) {
    let d = &run.d;
    let detected = out.checks.iter().any(|c| {
        c.subject == d.name && c.id == "diagnosis_clamp_path_open" && c.status == Status::Pass
    });
    let Some(c) = out
        .checks
        .iter_mut()
        .find(|c| c.subject == d.name && c.id == SURVIVAL_ID)
    else {
        return;
    };
    let finite = c.value.is_some();
    if detected || !finite || d.diagnosis.is_none() || c.status != Status::Pass {
        return;
    }
    let fix = match proposal {
        Some(p) if p.detectable => format!(
            "add the proposed drain comparator at {:.1} V (diagnosis.comparator), which detects it at every corner",
            p.threshold
        ),
        Some(p) => format!(
            "the proposed drain comparator at {:.1} V needs a timer of at least {:.0} Hz (tick_rate) to detect it",
            p.threshold, p.slowest_tick
        ),
        None => String::from(
            "no drain comparator fits between the healthy and the avalanche voltage: measure the decay some other way, or choose a switch rated for repetitive avalanche",
        ),
    };
    c.status = Status::Fail;
    c.note = format!(
        "no configured measurement detects the open clamp, so the firmware never confirms it and the switch avalanches until it fails: {fix}. {}",
        c.note
    );
}
