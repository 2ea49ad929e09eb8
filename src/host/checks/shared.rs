//! Clamps shared by several channels: drivers whose `clamp.shared` names one group share one
//! breakdown part (a common zener or TVS across every channel's coil, as driver arrays return
//! their freewheel current through one common pin), every channel of every such driver
//! included (a driver's `count`).
//!
//! Checked for every channel switching off at once, the worst case: staggered switch-offs put
//! the same energy per event into the part with a lower peak current.
//! - **current**: the sum of the channels' largest on-currents, Σ nₖ·I₀ₖ;
//! - **peak across each switch**: its supply, the shared part at the summed current (its
//!   voltage at Σ I, temperature and tolerance at that driver's worst switch-voltage corner)
//!   and its own diode at its own current, against the switch's derated rating;
//! - **energy per event**: Σ nₖ·Eₖ, each channel's energy into the part computed with the part's
//!   voltage raised by its dynamic resistance × (Σ I − I₀ₖ) (the others' current through it),
//!   an upper bound: a higher clamp voltage only shortens the decay and takes a larger share of
//!   the stored energy; against the smallest energy rating any member states;
//! - **power**: that energy at the highest switching rate of the group, against the smallest
//!   power rating (not judged without a rate).
//!
//! Work: one more sweep of each member driver's vertices.

use super::{corner_for, Bound, Check, Corner, Limit, Metric, Outcome, Status, Unit};
use crate::host::board::{Board, BreakdownPart, ClampBoard};
use crate::host::corners::Axis;
use crate::host::engine::{refused, sweep, DriverRun};
use crate::host::parts;
use crate::host::HostError;
use crate::units::{Amps, Volts};
use std::collections::BTreeMap;
use std::format;
use std::vec::Vec;

/// The largest on-current of a driver over its box, A.
fn i_max(run: &DriverRun) -> f32 {
    run.figures.iter().map(|f| f.on_current).fold(0.0, f32::max)
}

/// Every group's checks.
///
/// # Errors
/// A model refusal at a member's vertex, located at that driver.
pub fn checks(board: &Board, runs: &[DriverRun]) -> Result<Outcome, HostError> {
    let mut groups: BTreeMap<&str, Vec<&DriverRun>> = BTreeMap::new();
    for r in runs {
        if let (Some(g), Some(_)) = (r.d.shared.as_deref(), r.d.clamp.breakdown()) {
            groups.entry(g).or_default().push(r);
        }
    }
    let mut out = Outcome::default();
    for (name, members) in groups {
        group(board, name, &members, &mut out)?;
    }
    Ok(out)
}

fn group(
    board: &Board,
    name: &str,
    members: &[&DriverRun],
    out: &mut Outcome,
) -> Result<(), HostError> {
    let subject = format!("shared clamp \"{name}\"");
    let channels: u32 = members.iter().map(|r| r.d.count).sum();
    let i_sum: f32 = members.iter().map(|r| r.d.count as f32 * i_max(r)).sum();
    out.checks.push(
        Check::valued(
            &subject,
            "shared_current",
            "current in the shared part, every channel switching off at once",
            i_sum,
            Unit::Ampere,
            None,
            Corner::Stated(format!(
                "{channels} channel(s) at their largest on-currents"
            )),
        )
        .noted("staggered switch-offs give a lower peak current and the same energy per event"),
    );
    let mut energy = 0.0f32;
    for r in members {
        peak(board, &subject, r, i_sum, out)?;
        energy += r.d.count as f32 * raised_energy(board, r, i_sum)?;
    }
    energy_and_power(&subject, members, energy, out);
    Ok(())
}

/// The event's energy against the smallest energy rating, and its power at the group's
/// highest rate against the smallest power rating.
fn energy_and_power(subject: &str, members: &[&DriverRun], energy: f32, out: &mut Outcome) {
    let parts: Vec<&BreakdownPart> = members
        .iter()
        .filter_map(|r| r.d.clamp.breakdown())
        .collect();
    let e_rating = parts
        .iter()
        .filter_map(|p| p.energy_rating)
        .map(|e| e.value())
        .reduce(f32::min);
    let p_rating = parts
        .iter()
        .filter_map(|p| p.power_rating)
        .map(|w| w.value())
        .reduce(f32::min);
    let lim = e_rating.map(|v| Limit {
        value: v,
        bound: Bound::AtMost,
        source: "its pulse energy rating (the smallest stated)".into(),
    });
    out.checks.push(
        Check::valued(subject, "shared_energy", "energy into the shared part per event", energy, Unit::Joule, lim, Corner::Stated("every channel at its worst corner, the part's voltage raised by the others' current".into()))
            .noted("Σ channels × each one's energy with the shared part at the summed current: an upper bound"),
    );
    let rate = members
        .iter()
        .filter_map(|r| r.d.switching_rate)
        .map(|f| f.value())
        .reduce(f32::max);
    let title = "average power in the shared part";
    match rate {
        Some(f) => {
            let lim = p_rating.map(|v| Limit {
                value: v,
                bound: Bound::AtMost,
                source: "its continuous power rating (the smallest stated)".into(),
            });
            out.checks.push(
                Check::valued(
                    subject,
                    "shared_power",
                    title,
                    energy * f,
                    Unit::Watt,
                    lim,
                    Corner::Stated(format!("every channel switching off together at {f} Hz")),
                )
                .noted("the event's energy at the group's highest switching rate"),
            );
        }
        None => out.checks.push(
            Check::worded(
                subject,
                "shared_power",
                title,
                Status::Warn,
                "not judged",
                Corner::Ties,
            )
            .noted("not judged: give the members' switching_rate"),
        ),
    }
}

/// A member's peak switch voltage with the shared part at the summed current.
fn peak(
    board: &Board,
    subject: &str,
    r: &DriverRun,
    i_sum: f32,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let d = &r.d;
    let Some(e) = Metric::PeakSwitch.worst(d, &r.points, &r.figures) else {
        return Ok(());
    };
    let p = e.at;
    let fail = |x: crate::Error| refused(board, d, &r.space, &p, x);
    let i0 = r
        .points
        .iter()
        .position(|q| *q == p)
        .and_then(|k| r.figures.get(k))
        .map_or(0.0, |f| f.on_current);
    let Some(part) = d.clamp.breakdown() else {
        return Ok(());
    };
    let bd = parts::breakdown_at(part, &p).map_err(fail)?;
    let v_bd = bd
        .voltage(
            Amps::new(i_sum).map_err(fail)?,
            p.temperature(Axis::BreakdownTemp).map_err(fail)?,
        )
        .map_err(fail)?
        .value();
    let v_d = match d.clamp.diode() {
        Some(dp) => parts::diode_at(dp, &p)
            .and_then(|x| x.forward_drop(Amps::new(i0)?, p.temperature(Axis::DiodeTemp)?))
            .map_err(fail)?
            .value(),
        None => 0.0,
    };
    let v = p.at(Axis::Supply) + v_bd + v_d;
    let limit = d.switch.rating.value() * d.switch.derating.value();
    let c = Check::valued(
        subject,
        "shared_switch_voltage",
        &format!("peak across {}'s switch with the shared part at the summed current", d.name),
        v,
        Unit::Volt,
        Some(Limit { value: limit, bound: Bound::AtMost, source: format!("{:.0} % of the {} rating", d.switch.derating.value() * 100.0, d.switch.rating) }),
        corner_for(r, Metric::PeakSwitch, &e),
    )
    .noted(format!("supply + the shared part at {i_sum:.3} A ({v_bd:.2} V) + the channel's own diode at {i0:.3} A ({v_d:.2} V)"));
    out.checks.push(c);
    Ok(())
}

/// A member's worst energy into the part with its voltage raised by r_z·(Σ I − I₀).
fn raised_energy(board: &Board, r: &DriverRun, i_sum: f32) -> Result<f32, HostError> {
    let d = &r.d;
    let mut d2 = d.clone();
    let dv = |b: &BreakdownPart| b.dynamic_resistance.value() * (i_sum - i_max(r)).max(0.0);
    let raise = |b: &mut BreakdownPart| {
        let add = dv(b);
        b.voltage = b.voltage.map(|v| Volts::raw(v.value() + add));
    };
    match &mut d2.clamp {
        ClampBoard::ZenerDiode { zener, .. } | ClampBoard::SwitchedFreewheel { zener, .. } => {
            raise(zener)
        }
        ClampBoard::TvsAcrossCoil(b) => raise(b),
        _ => {}
    }
    let mut cx = r.context(board);
    cx.d = &d2;
    let figures = sweep(&cx, &r.space, &r.points)?;
    Ok(figures
        .iter()
        .map(|f| f.energy.breakdown)
        .fold(0.0, f32::max))
}
