//! The supply side of each driver: its supply's transient events, reversed polarity, and the
//! energy a fast decay returns to the supply (the profiles are in
//! [`crate::host::board::profile`]; the rail's rise in [`crate::supply`]).
//!
//! For an event with a positive voltage V_ev (a load dump, a jump start, an overvoltage):
//! - **the switch when off** holds V_ev (through the coil on a low side, directly on a high
//!   side): beyond its derated rating it is overstressed, and at or above its avalanche onset
//!   it avalanches from the supply itself for the whole event, with energy only the supply's
//!   source impedance limits: a failure either way;
//! - **a switch-off during the event**: the coil's current taken at V_ev (it settles within a
//!   few L/R; for an event shorter than that this overstates it) and every other axis of the
//!   driver's box as usual; the peak across the switch against its derated rating, the clamp
//!   below the switch's avalanche onset, the clamp part's energy against its rating; a clamp
//!   across the switch at or below V_ev conducts from the supply and fails;
//! - **the coil energised through a long event** (10 s or more): the winding's rise above the
//!   hottest ambient scales with its power, V², so it reaches the design's self-heating ×
//!   (V_ev/V_max)² (steady state, which overstates a shorter event), against
//!   `coil.max_temperature` when given; and, below the steady range, the operate check at the
//!   event's voltage.
//!
//! For an event with a negative voltage (reversed polarity), with nothing in the supply to stop
//! it: a clamp with a diode across the coil and nothing in series (a plain diode, an H-bridge,
//! a switched freewheel whose bypass conducts) puts that diode in series with the switch's body
//! diode straight across the reversed supply, a short only the wiring limits (a failure); a
//! resistor in series limits it to (V − 2·V_F)/R; otherwise the body diode energises the coil
//! in reverse at (V − V_F)/R_coil (a relay operates, a valve opens: said as a warning). A series
//! diode or a reverse-polarity MOSFET in the supply blocks all of it. V_F = 0.7 V per silicon
//! junction (common practice; a lower drop gives more current).
//!
//! Work: one sweep of the driver's vertices (no diagnosis, hold or open-clamp figures) per
//! positive event.

use super::{figure_check, Bound, Check, Corner, Limit, Outcome, Status, Unit};
use crate::host::board::profile::{Event, Protection, SupplyProfile};
use crate::host::board::{Board, ClampBoard, DriverBoard, SupplyRange};
use crate::host::corners::{Axis, Space};
use crate::host::engine::DriverRun;
use crate::host::figures::{figures_with, Context, Needs};
use crate::host::HostError;
use crate::Reason;
use std::format;
use std::string::String;

/// A silicon junction's forward drop in the reverse-polarity paths, V (common practice).
pub const JUNCTION_V: f32 = 0.7;

/// Events of 10 s or more heat the winding to its steady state.
pub const LONG_EVENT_S: f32 = 10.0;

/// The supply checks of one driver.
///
/// # Errors
/// A model refusal at a vertex during an event, located at the supply's profile.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<(), HostError> {
    returned(board, run, out)?;
    let Some(p) = run.d.profile.as_ref() else {
        return Ok(());
    };
    for e in &p.events {
        if e.voltage > 0.0 {
            off_state(run, e, out);
            switch_off_during(board, run, p, e, out)?;
            heating(board, run, e, out);
            operate_during(run, e, out);
        } else if e.voltage < 0.0 {
            reversed(board, run, p, e, out);
        }
    }
    Ok(())
}

/// The energy a fast decay returns to the supply, and the rail's rise from it (model in
/// [`crate::supply`]): per switch-off of one channel and of every channel of the driver at
/// once. Only a decay that drives the coil's current back into the supply returns energy (an
/// H-bridge's fast decay); a freewheel across the coil keeps it local and a clamp across the
/// switch draws from the supply instead. Worst corner: the most energy returned, the highest
/// supply, the shortest decay (least drawn by the loads meanwhile).
fn returned(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<(), HostError> {
    let d = &run.d;
    if !run.figures.iter().any(|f| f.energy.returned > 0.0) {
        return Ok(());
    }
    let fault = |x: crate::Error| board.fault(&format!("{}.supply", d.field), format!("{x}"));
    let Some(c) = figure_check(
        run,
        super::Metric::EnergyReturned,
        "returned_energy",
        "energy returned to the supply per switch-off",
        Unit::Joule,
        None,
    ) else {
        return Ok(());
    };
    let e = c.value.unwrap_or(0.0);
    out.checks.push(
        c.noted("the fast decay drives the coil's current back into the supply's positive node"),
    );
    let title = "supply rail after every channel switches off at once";
    let p = d.profile.as_ref();
    // A series diode in the supply blocks the returned current whatever the supply could sink.
    if p.is_some_and(|p| p.sinks && p.protection != Protection::SeriesDiode) {
        out.checks.push(
            Check::worded(
                &d.name,
                "rail_rise",
                title,
                Status::Pass,
                "taken by the supply",
                Corner::Ties,
            )
            .noted("the supply sinks current (supply.sinks_current)"),
        );
        return Ok(());
    }
    let Some(bulk) = p.and_then(|p| p.bulk) else {
        out.checks.push(
            Check::worded(&d.name, "rail_rise", title, Status::Warn, "not judged", Corner::Ties)
                .noted("not judged: give supply.bulk_capacitance (and rail_load, rail_limit), or supply.sinks_current = true for a supply that takes it back"),
        );
        return Ok(());
    };
    let t_min = run
        .figures
        .iter()
        .map(|f| f.off_time)
        .fold(f32::INFINITY, f32::min);
    let load = p.map_or(0.0, |p| p.load);
    let v1 = d.supply.max;
    let rise = |n: f32| -> Result<f32, crate::Error> {
        Ok(crate::supply::rail_rise(
            bulk,
            v1,
            crate::units::Joules::new(e * n)?,
            crate::units::Amps::new(load)?,
            crate::units::Seconds::new(t_min)?,
        )?
        .value())
    };
    let one = rise(1.0).map_err(fault)?;
    let all = rise(d.count as f32).map_err(fault)?;
    let limit = p.and_then(|p| p.limit).map(|l| Limit {
        value: l,
        bound: Bound::AtMost,
        source: "what the parts on the rail tolerate (supply.rail_limit)".into(),
    });
    let c = Check::valued(&d.name, "rail_rise", title, all, Unit::Volt, limit, Corner::Stated(format!("highest supply {v1}, the most energy returned, the shortest decay")))
        .noted(format!(
            "½·C·(V₂² − V₁²) = E − V₁·I_load·t with C = {bulk}, {} channel(s) returning {:.3} mJ each, loads ≥ {load:.3} A for {:.3} ms; one channel alone: {one:.2} V{}",
            d.count,
            e * 1e3,
            t_min * 1e3,
            if p.and_then(|p| p.limit).is_none() { "; give supply.rail_limit to judge it" } else { "" }
        ));
    out.checks.push(c);
    Ok(())
}

/// The words of an event.
fn words(e: &Event) -> String {
    let d = if e.duration >= 1.0 {
        format!("{:.0} s", e.duration)
    } else {
        format!("{:.0} ms", e.duration * 1e3)
    };
    format!("{} ({:.1} V for {d}; {})", e.name, e.voltage, e.source)
}

/// The lowest avalanche onset over the box (None where the switch is itself the clamp).
fn onset_min(run: &DriverRun) -> Option<f32> {
    run.figures
        .iter()
        .filter_map(|f| f.avalanche_onset)
        .reduce(f32::min)
}

/// The switch while off, holding the event's voltage.
fn off_state(run: &DriverRun, e: &Event, out: &mut Outcome) {
    let d = &run.d;
    let limit = d.switch.rating.value() * d.switch.derating.value();
    let title = format!("switch off during {}", e.name);
    let lim = Limit {
        value: limit,
        bound: Bound::AtMost,
        source: format!(
            "{:.0} % of the {} rating",
            d.switch.derating.value() * 100.0,
            d.switch.rating
        ),
    };
    let mut c = Check::valued(
        &d.name,
        "event_off_state",
        &title,
        e.voltage,
        Unit::Volt,
        Some(lim),
        Corner::Stated(words(e)),
    );
    let onset = onset_min(run);
    c = match onset {
        Some(v) if e.voltage >= v => c.with_status(Status::Fail).noted(format!("the supply alone reaches the switch's avalanche onset ({v:.2} V): it avalanches for the whole event with energy only the source impedance limits; a central clamp on the supply, or a switch rated above it")),
        _ if c.status == Status::Fail => c.noted("the switch holds the supply while it is off: beyond its derated rating for the whole event"),
        _ => c.noted("the switch holds the supply while it is off"),
    };
    out.checks.push(c);
}

/// The driver with its supply held at `v`.
fn at_supply(d: &DriverBoard, v: f32) -> Result<DriverBoard, crate::Error> {
    let mut d = d.clone();
    let volts = crate::units::Volts::new(v)?;
    d.supply = SupplyRange {
        nominal: volts,
        min: volts,
        max: volts,
    };
    Ok(d)
}

/// The driver's vertices with its supply held at the event's voltage, or None when a clamp
/// across the switch conducts from the supply there (reported as a failing check).
fn event_run(
    board: &Board,
    run: &DriverRun,
    p: &SupplyProfile,
    e: &Event,
    out: &mut Outcome,
) -> Result<Option<DriverRun>, HostError> {
    let fault = |x: crate::Error| {
        board.fault(
            &format!("{}.profile", p.field),
            format!("during {}: the model refuses it: {x}", e.name),
        )
    };
    let d_ev = at_supply(&run.d, e.voltage).map_err(fault)?;
    let space = Space::for_driver(board, &d_ev, run.rises);
    let cx = Context {
        board,
        d: &d_ev,
        release_voltage: None,
        hold: None,
        winding: space.range(Axis::Winding),
    };
    let none = Needs {
        diag: false,
        open: false,
        hold: false,
    };
    let points = space.vertices();
    let mut figures = std::vec::Vec::with_capacity(points.len());
    for pt in &points {
        match figures_with(&cx, pt, none) {
            Ok(f) => figures.push(f),
            Err(x) if x.reason == Reason::CannotClamp => {
                out.checks.push(
                    Check::worded(&run.d.name, "event_clamp_conducts", &format!("clamp during {}", e.name), Status::Fail, "conducts from the supply", Corner::Stated(words(e)))
                        .noted("the clamp across the switch is at or below the event's supply voltage: it conducts from the supply for the whole event (and the coil never switches off); choose a clamp above the event's voltage"),
                );
                return Ok(None);
            }
            Err(x) => return Err(fault(x)),
        }
    }
    Ok(Some(DriverRun {
        d: d_ev.clone(),
        space,
        points,
        figures,
        ..run.clone()
    }))
}

/// A switch-off during the event: peak, clamp below the avalanche, the switch's survival where
/// it clamps itself, the clamp part's energy.
fn switch_off_during(
    board: &Board,
    run: &DriverRun,
    p: &SupplyProfile,
    e: &Event,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let Some(ev) = event_run(board, run, p, e, out)? else {
        return Ok(());
    };
    event_peaks(&ev, e, out);
    event_energies(&ev, e, out);
    Ok(())
}

/// The peak across the switch during the event, and against its avalanche onset.
fn event_peaks(ev: &DriverRun, e: &Event, out: &mut Outcome) {
    let d = &ev.d;
    let lim = Limit {
        value: d.switch.rating.value() * d.switch.derating.value(),
        bound: Bound::AtMost,
        source: format!(
            "{:.0} % of the {} rating",
            d.switch.derating.value() * 100.0,
            d.switch.rating
        ),
    };
    // With the switch's own avalanche as the clamp the peak is the avalanche by design: a
    // figure, judged by the energy checks like the steady case.
    let by_design = matches!(d.clamp, ClampBoard::Avalanche);
    if let Some(c) = figure_check(
        ev,
        super::Metric::PeakSwitch,
        "event_switch_voltage",
        &format!("peak across the switch at a switch-off during {}", e.name),
        Unit::Volt,
        (!by_design).then_some(lim),
    ) {
        out.checks.push(c.noted(format!("{}; the coil's current taken at the event's voltage (it settles within a few L/R; a shorter event gives less)", words(e))));
    }
    if let Some(c) = figure_check(
        ev,
        super::Metric::AvalancheShare,
        "event_clamp_below_avalanche",
        &format!(
            "peak at a switch-off during {} as a share of the switch's avalanche onset",
            e.name
        ),
        Unit::Fraction,
        Some(Limit {
            value: 1.0,
            bound: Bound::AtMost,
            source: "the switch's avalanche onset at the same corner".into(),
        }),
    ) {
        out.checks.push(c.noted(words(e)));
    }
}

/// The switch's survival where it clamps itself, and the clamp part's energy, during the event.
fn event_energies(ev: &DriverRun, e: &Event, out: &mut Outcome) {
    let d = &ev.d;
    // A switch that clamps every switch-off itself (its avalanche or its own clamp): it must
    // survive one switch-off during the event, with the supply adding V_ev·Q.
    if let Some(e_s) = super::Metric::SwitchSurvivable.worst(&ev.d, &ev.points, &ev.figures) {
        let ok = e_s.value >= 1.0;
        out.checks.push(
            Check::worded(&d.name, "event_switch_survival", &format!("switch survives a switch-off during {}", e.name), if ok { Status::Pass } else { Status::Fail }, &super::open_clamp::count_words(e_s.value), super::corner_for(ev, super::Metric::SwitchSurvivable, &e_s))
                .of(super::Metric::SwitchSurvivable)
                .counted(e_s.value)
                .noted(format!("{}; its avalanche energy rating derated to its start temperature, the supply adding V·Q during the decay", words(e))),
        );
    }
    let rating = d.clamp.breakdown().and_then(|b| b.energy_rating);
    if let (Some(r), true) = (rating, ev.figures.iter().any(|f| f.energy.breakdown > 0.0)) {
        if let Some(c) = figure_check(
            ev,
            super::Metric::EnergyBreakdown,
            "event_breakdown_energy",
            &format!(
                "energy into the clamp part at a switch-off during {}",
                e.name
            ),
            Unit::Joule,
            Some(Limit {
                value: r.value(),
                bound: Bound::AtMost,
                source: "its pulse energy rating".into(),
            }),
        ) {
            out.checks.push(c.noted(words(e)));
        }
    }
}

/// The winding through a long event.
fn heating(board: &Board, run: &DriverRun, e: &Event, out: &mut Outcome) {
    let d = &run.d;
    if e.duration < LONG_EVENT_S {
        return;
    }
    let v_max = d.supply.max.value();
    let rise = board.coil_heating.kelvin() * (e.voltage / v_max) * (e.voltage / v_max);
    let t = board.ambient.1.celsius() + rise;
    let limit = d.winding_limit.map(|w| Limit {
        value: w.celsius(),
        bound: Bound::AtMost,
        source: "the winding's highest allowed temperature (coil.max_temperature)".into(),
    });
    let c = Check::valued(
        &d.name,
        "event_winding",
        &format!("winding energised through {}", e.name),
        t,
        Unit::Celsius,
        limit,
        Corner::Stated(words(e)),
    )
    .noted(format!(
        "hottest ambient {} + the self-heating {} × ({:.1} V / {:.1} V)² (copper loss scales with V²; steady state){}",
        board.ambient.1,
        board.coil_heating,
        e.voltage,
        v_max,
        if d.winding_limit.is_none() { "; give coil.max_temperature to judge it" } else { "" }
    ));
    out.checks.push(c);
}

/// A breakdown part's lowest voltage over its tolerance (its temperature coefficient aside), V.
fn lowest(b: &crate::host::board::BreakdownPart) -> Option<f32> {
    b.voltage.map(|v| v.value() * (1.0 - b.tol))
}

/// A long event below the steady range: does the coil still operate? The operate drive
/// (on-current × the unit's R at its reference temperature, [`crate::host::checks::timing`])
/// scales with the supply, so at the event it is the steady figure × V_ev/V at its worst
/// vertex, against the must-operate voltage.
fn operate_during(run: &DriverRun, e: &Event, out: &mut Outcome) {
    let d = &run.d;
    let Some(v_op) = d.operate else { return };
    if e.duration < LONG_EVENT_S || !(e.voltage < d.supply.min.value()) {
        return;
    }
    let drive = run
        .points
        .iter()
        .zip(&run.figures)
        .filter_map(|(p, f)| f.operate_drive.map(|x| x / p.at(Axis::Supply)))
        .fold(f32::INFINITY, f32::min)
        * e.voltage;
    if !drive.is_finite() {
        return;
    }
    let lim = Limit {
        value: v_op.value(),
        bound: Bound::AtLeast,
        source: format!("must-operate voltage {v_op}, per unit at the reference temperature"),
    };
    out.checks.push(
        Check::valued(
            &d.name,
            "event_operate",
            &format!("coil drive to operate during {}", e.name),
            drive,
            Unit::Volt,
            Some(lim),
            Corner::Stated(words(e)),
        )
        .noted("the operate check at the event's voltage: the hottest winding, the unit's own resistance tied on both sides"),
    );
}

/// The lowest coil resistance (coldest ambient, bottom of the tolerance), Ω.
fn coil_r_min(board: &Board, d: &DriverBoard) -> f32 {
    let cold = board.ambient.0;
    let r = d
        .coil
        .resistance(cold)
        .map_or(d.coil.resistance_ref().value(), |r| r.value());
    r * (1.0 - d.r_tol)
}

/// Reversed polarity.
fn reversed(board: &Board, run: &DriverRun, p: &SupplyProfile, e: &Event, out: &mut Outcome) {
    let d = &run.d;
    let v = -e.voltage;
    let title = format!("{}: current with the supply reversed", e.name);
    let id = "reverse_polarity";
    let at = Corner::Stated(words(e));
    if p.protection != Protection::None {
        let by = if p.protection == Protection::SeriesDiode {
            "a series diode"
        } else {
            "a reverse-polarity MOSFET"
        };
        out.checks.push(
            Check::worded(&d.name, id, &title, Status::Pass, "blocked", at)
                .noted(format!("{by} in the supply blocks the reversed voltage")),
        );
        return;
    }
    let r_coil = coil_r_min(board, d);
    let through_coil = (v - JUNCTION_V).max(0.0) / r_coil;
    // A breakdown part across the coil conducts once the reversed supply exceeds its lowest
    // voltage plus the junctions in its path (the body diode, and a zener + diode's diode).
    let breaks_down = match d.clamp {
        ClampBoard::ZenerDiode { zener: b, .. } => {
            lowest(&b).is_some_and(|vb| v > vb + 2.0 * JUNCTION_V)
        }
        ClampBoard::TvsAcrossCoil(b) | ClampBoard::Varistor { part: b, .. } => {
            lowest(&b).is_some_and(|vb| v > vb + JUNCTION_V)
        }
        _ => false,
    };
    let diode_across = breaks_down
        || matches!(
            d.clamp,
            ClampBoard::Diode(_) | ClampBoard::HBridge(_) | ClampBoard::SwitchedFreewheel { .. }
        );
    let c = if diode_across {
        let shown = match p.wiring {
            Some(w) => format!("{:.1} A", (v - 2.0 * JUNCTION_V).max(0.0) / w.value()),
            None => String::from("limited only by the wiring"),
        };
        let mut c = Check::worded(&d.name, id, &title, Status::Fail, &shown, at).noted("the switch's body diode and the clamp across the coil (its diode, or its breakdown part once the reversed supply exceeds it) form a short across the reversed supply: add a series diode or a reverse-polarity MOSFET to the supply (supply.reverse_protection)");
        if let Some(w) = p.wiring {
            c.value = Some((v - 2.0 * JUNCTION_V).max(0.0) / w.value());
            c.unit = Unit::Ampere;
            c.note = format!("{} (two 0.7 V junctions and the wiring's {w})", c.note);
        }
        c
    } else if let ClampBoard::ResistorDiode { resistor, .. } = d.clamp {
        let i = (v - 2.0 * JUNCTION_V).max(0.0) / resistor.value().max(1e-3);
        Check::valued(&d.name, id, &title, i + through_coil, Unit::Ampere, None, at)
            .with_status(Status::Warn)
            .noted(format!("the body diode and the clamp's diode put its {resistor} resistor across the reversed supply ({:.2} W in it for the event) and energise the coil in reverse: add a series diode or a reverse-polarity MOSFET (supply.reverse_protection)", i * i * resistor.value()))
    } else {
        Check::valued(&d.name, id, &title, through_coil, Unit::Ampere, None, at)
            .with_status(Status::Warn)
            .noted("the switch's body diode energises the coil in reverse ((V − 0.7 V)/R at the coldest, lowest-resistance winding): a relay operates, a valve opens; add a series diode or a reverse-polarity MOSFET if that is unsafe (supply.reverse_protection)")
    };
    out.checks.push(c);
}
