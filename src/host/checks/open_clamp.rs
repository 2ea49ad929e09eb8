//! The single fault the firmware is there to detect: the clamp path open. Until the firmware
//! acts, every switch-off is then the switch's own avalanche; this check says how many such
//! switch-offs the switch survives (none, one, a number, or repetitively within its thermal
//! limits; model in [`crate::host::figures`]'s survival module) and fails when the firmware
//! waits for more confirmations than that.
//!
//! Worst corner: the avalanche energy ½·L·I₀²·V_BR/(V_BR − V_s) (R → 0) grows with L and I₀
//! (high supply, low R, cold winding) and falls as V_BR rises above V_s; the allowance falls
//! as the switch's start temperature rises. The survivable count is monotone in each, and the
//! vertex search takes the smallest.

use super::{corner_for, figure_check, Check, Constant, Corner, Metric, Outcome, Status};
use crate::host::engine::DriverRun;
use crate::host::figures::REPETITIVE;
use std::format;
use std::string::String;

/// How a count of switch-offs reads.
pub fn count_words(n: f32) -> String {
    if n >= REPETITIVE {
        "repetitively, within its thermal limits".into()
    } else if n < 1.0 {
        "none: one open-clamp switch-off exceeds its avalanche rating".into()
    } else if n < 2.0 {
        "one".into()
    } else {
        format!("{n:.0} in a row")
    }
}

/// The open-clamp checks and the constants the firmware needs for them.
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
        let c = Check::worded(&d.name, "open_clamp_survival", title, Status::Warn, "not judged", Corner::Ties)
            .noted("give switch.avalanche_energy and junction_max (and avalanche_energy_repetitive) to judge the open-clamp fault");
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
    let (status, note) = match confirmations {
        Some(n) if (n as f32) <= survivable => (Status::Pass, format!("the firmware confirms the fault after {n} switch-off(s) and stops switching: within what the switch survives")),
        Some(n) => (Status::Fail, format!("the firmware waits for {n} confirmations but the switch survives fewer: lower diagnosis.confirmations, or choose a switch with a higher avalanche rating")),
        None if survivable >= REPETITIVE => (Status::Pass, String::from("no diagnosis, but the switch survives the fault repetitively")),
        None => (Status::Warn, String::from("nothing detects the fault: the switch keeps avalanching until it fails; add a diagnosis or a switch rated for repetitive avalanche")),
    };
    let c = Check::worded(
        &d.name,
        "open_clamp_survival",
        title,
        status,
        &count_words(survivable),
        corner_for(run, Metric::OpenSurvivable, &e),
    )
    .of(Metric::OpenSurvivable)
    .counted(survivable)
    .noted(note);
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
