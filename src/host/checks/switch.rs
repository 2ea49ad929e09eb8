//! The switch: its peak voltage against its derated rating, the output's swing below ground
//! on a high side, and, where every switch-off is the switch's own avalanche (no clamp, or a
//! clamp inside the switch), its energy and temperature.
//!
//! Worst corner: the peak switch voltage is V_s + V_clamp(I₀) across the coil (or the clamp
//! voltage across the switch): it rises with the supply (directly and through I₀ = V_s/R),
//! falls with R and with the winding temperature (through I₀), rises with a clamp's tolerance
//! and, for a positive tempco, its temperature; a diode's share falls as it heats. Monotone in
//! each axis, so the vertex search is exact.
//!
//! A clamp must clamp below the switch's own avalanche: where the healthy peak across the
//! switch can reach the switch's avalanche onset (its stated voltage at the bottom of its
//! tolerance and at its temperature), the lower of the two clamps clamps and the switch
//! avalanches on every healthy switch-off. The check takes the peak over the onset at the same
//! vertex: the peak depends only on the supply, coil and clamp axes and the onset only on the
//! switch's avalanche axes, so the ratio is monotone in each axis.
//!
//! With the switch's own avalanche as the clamp (kind "avalanche") the peak is the avalanche
//! voltage, above the derated rating by design: that kind is judged by its avalanche energy,
//! its survival on every switch-off and its junction temperature instead.

use super::{figure_check, figures_where, Bound, Check, Limit, Metric, Outcome, Status, Unit};
use crate::clamp::Side;
use crate::host::board::{Board, ClampBoard};
use crate::host::engine::DriverRun;
use crate::host::figures::{survivable, REPETITIVE};
use std::format;
use std::string::String;

/// The switch's checks.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    let limit = d.switch.rating.value() * d.switch.derating.value();
    let src = format!(
        "{:.0} % of the {} rating",
        d.switch.derating.value() * 100.0,
        d.switch.rating
    );
    let lim = Limit {
        value: limit,
        bound: Bound::AtMost,
        source: src,
    };
    if let Some(c) = figure_check(
        run,
        Metric::PeakSwitch,
        "switch_voltage",
        "peak voltage across the switch",
        Unit::Volt,
        Some(lim),
    ) {
        let c = if matches!(d.clamp, ClampBoard::Avalanche) {
            let mut c = c;
            c.limit = None;
            c.with_status(Status::Info).noted("the switch's own avalanche sets the peak, above the derated rating by design: judged instead by its avalanche energy, its survival on every switch-off and its junction temperature below")
        } else {
            c.noted("at switch-off, with the whole on-current in the clamp")
        };
        out.checks.push(c);
    }
    below_avalanche(run, out);
    if d.side == Side::High {
        if let Some(c) = figure_check(
            run,
            Metric::PeakOutputLow,
            "output_swing",
            "output swing below ground",
            Unit::Volt,
            None,
        ) {
            out.checks.push(c.noted("the high-side output swings to the supply minus the switch voltage: anything on that node sees it"));
        }
    }
    if run.figures.iter().any(|f| f.energy.switch > 0.0) {
        self_avalanche(board, run, out);
    }
}

/// The healthy peak against the switch's avalanche onset; where it reaches it, what happens.
fn below_avalanche(run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    let lim = Limit {
        value: 1.0,
        bound: Bound::AtMost,
        source:
            "the switch's avalanche onset at the same corner (tolerance and temperature included)"
                .into(),
    };
    let Some(c) = figure_check(
        run,
        Metric::AvalancheShare,
        "clamp_below_avalanche",
        "healthy peak across the switch as a share of its avalanche onset",
        Unit::Fraction,
        Some(lim),
    ) else {
        return;
    };
    let note = match (c.status, figures_where(run, Metric::AvalancheShare)) {
        (Status::Fail, Some(f)) => {
            let onset = f.avalanche_onset.unwrap_or(0.0);
            let (energy, count) = f.open.map_or((None, None), |o| {
                (
                    Some(o.energy),
                    survivable(&d.switch, d.switching_rate, o.energy, o.start_c),
                )
            });
            let count = count.map_or(
                String::from("not judged without an avalanche energy rating"),
                super::open_clamp::count_words,
            );
            format!(
                "the clamp would hold {:.2} V across the switch, but the switch avalanches from {onset:.2} V there: the lower of the two clamps clamps, so the switch avalanches on every healthy switch-off and takes up to {} per switch-off (the open-clamp figure, an upper bound: the clamp shares the current), surviving {count}. The peak-voltage and clamp-energy figures of this driver assume the clamp alone and do not hold: lower the clamp voltage or choose a switch with a higher avalanche voltage",
                f.peak_switch,
                energy.map_or(String::from("its avalanche energy"), |e| format!("{:.3} mJ", e * 1e3)),
            )
        }
        _ => String::from("the clamp holds the switch below its own avalanche at every corner"),
    };
    out.checks.push(c.noted(note));
}

/// Every switch-off is an avalanche (or the switch's own clamp): energy, survival, heat.
fn self_avalanche(board: &Board, run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    if let Some(c) = figure_check(
        run,
        Metric::EnergySwitch,
        "switch_energy",
        "energy into the switch per switch-off",
        Unit::Joule,
        None,
    ) {
        out.checks
            .push(c.noted("the switch absorbs the decay: it clamps on every switch-off"));
    }
    match Metric::SwitchSurvivable.worst(d, &run.points, &run.figures) {
        None => out.checks.push(
            Check::worded(&d.name, "switch_repetitive", "switch survives an avalanche on every switch-off", Status::Warn, "not judged", super::Corner::Ties)
                .noted("give switch.avalanche_energy, avalanche_energy_repetitive and junction_max to judge it"),
        ),
        Some(e) => {
            let ok = e.value >= REPETITIVE;
            let shown = super::open_clamp::count_words(e.value);
            let c = Check::worded(&d.name, "switch_repetitive", "switch survives an avalanche on every switch-off", if ok { Status::Pass } else { Status::Fail }, &shown, super::corner_for(run, Metric::SwitchSurvivable, &e))
                .of(Metric::SwitchSurvivable)
                .counted(e.value)
                .noted("against the single-pulse rating derated linearly to the maximum junction temperature, the repetitive rating and the junction's heating");
            out.checks.push(c);
        }
    }
    temperature(board, run, out);
}

/// The switch's junction temperature from its average power.
fn temperature(board: &Board, run: &DriverRun, out: &mut Outcome) {
    let d = &run.d;
    let (Some(rth), Some(tj)) = (d.switch.thermal_resistance, d.switch.junction_max) else {
        return;
    };
    let Some(e) = Metric::PowerSwitch.worst(d, &run.points, &run.figures) else {
        return;
    };
    let t = board.ambient.1.celsius() + e.value * rth;
    let lim = Limit {
        value: tj.celsius(),
        bound: Bound::AtMost,
        source: "maximum junction temperature".into(),
    };
    let c = Check::valued(&d.name, "switch_temperature", "switch junction temperature", t, Unit::Celsius, Some(lim), super::corner_for(run, Metric::PowerSwitch, &e))
        .noted(format!("hottest ambient {} + {:.3} W × {rth} K/W (switch-offs at the stated rate, conduction as if always on)", board.ambient.1, e.value));
    out.checks.push(c);
}
