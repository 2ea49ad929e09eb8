//! Measurement sizing: the drain comparator that separates an open clamp best, checked over
//! every corner like the file's own measurements, and what stays invisible with the
//! measurements the file gives and which measurement would show it.
//!
//! The comparator (common practice for switch-side fault detection): a threshold above every
//! voltage a healthy switch-off puts across the switch and below every voltage the switch
//! avalanches at with the clamp open. A healthy switch-off never trips it (reads 0 ticks at
//! every corner), the open clamp trips it for as long as it avalanches. Sizing:
//! - highest healthy voltage: [`Metric::PeakSwitch`] at its worst vertex (the peak is monotone
//!   in each axis, see [`crate::host::checks::switch`]);
//! - lowest avalanche voltage: the open-clamp peak, its lowest vertex;
//! - threshold: the midpoint, to 0.1 V, kept only if the divider's and comparator's accuracy
//!   ([`COMPARATOR_TOLERANCE`]) leaves it strictly between them both ways;
//! - then the driver's figures are evaluated again at every vertex with that comparator as its
//!   only measurement and its windows judged in ticks exactly as the file's (guard, rounding,
//!   jitter): the proposal is reported detectable only if that judgement says so;
//! - slowest timer: healthy reads [0, j] ticks, the open clamp from ⌊t_min·(1 − g)·f⌋ − j; no
//!   shared tick once f ≥ (2j + 1)/(t_min·(1 − g)).
//!
//! Work: one more sweep of the driver's vertices.

use super::diagnosis::{condition_words, windows};
use super::{Check, Constant, Corner, Metric, Outcome, Status, WindowTable};
use crate::diagnosis::Condition;
use crate::host::board::{Board, MeasureBoard};
use crate::host::engine::DriverRun;
use crate::host::HostError;
use crate::units::Volts;
use std::format;
use std::string::String;
use std::vec::Vec;

/// The relative accuracy assumed of a comparator threshold on a drain divider, both ways: 1 %
/// resistors and a ±1 % reference (common practice).
pub const COMPARATOR_TOLERANCE: f32 = 0.02;

/// The proposed comparator, as judged over every corner.
#[derive(Debug, Clone, PartialEq)]
pub struct Proposal {
    /// Highest healthy switch voltage, V.
    pub healthy_max: f32,
    /// Lowest open-clamp avalanche voltage, V.
    pub open_min: f32,
    /// The threshold, V.
    pub threshold: f32,
    /// The open clamp's readings, s.
    pub open_seconds: (f32, f32),
    /// The open clamp's tick window, and whether it shares no tick with the healthy one.
    pub open_ticks: (u32, u32),
    /// True when the tick windows separate the open clamp from health.
    pub detectable: bool,
    /// Slowest timer that separates them, Hz.
    pub slowest_tick: f32,
    /// Its window table: rows of [lowest tick, highest tick, condition code].
    pub rows: Vec<[u32; 3]>,
}

/// The lowest and highest switch voltages that bound a threshold: (healthy max, open min).
fn bounds(run: &DriverRun) -> Option<(f32, f32)> {
    let healthy = Metric::PeakSwitch
        .worst(&run.d, &run.points, &run.figures)?
        .value;
    let open = run
        .figures
        .iter()
        .filter_map(|f| f.open.map(|o| o.peak_switch))
        .fold(f32::INFINITY, f32::min);
    open.is_finite().then_some((healthy, open))
}

/// The threshold between `h` and `a`, to 0.1 V, if the tolerance leaves room.
fn threshold(h: f32, a: f32) -> Option<f32> {
    let th = libm::roundf(5.0 * (h + a)) / 10.0;
    let tol = COMPARATOR_TOLERANCE;
    (h < th * (1.0 - tol) && th * (1.0 + tol) < a).then_some(th)
}

/// The driver's run again with `th` as its only measurement, judged over the proposal's own
/// ±[`COMPARATOR_TOLERANCE`] (the windows cover every threshold the divider and the comparator
/// can give).
fn with_comparator(board: &Board, run: &DriverRun, th: f32) -> Result<DriverRun, HostError> {
    let th = Volts::new(th)
        .map_err(|e| board.fault(&format!("{}.diagnosis", run.d.field), format!("{e}")))?;
    let mut again =
        super::diagnosis::with_measurements(board, run, Vec::from([MeasureBoard::Comparator(th)]))?;
    if let Some(g) = again.d.diagnosis.as_mut() {
        g.comparator_tolerance = COMPARATOR_TOLERANCE;
    }
    Ok(again)
}

/// Sizes and judges the proposed comparator; None when no threshold fits.
///
/// # Errors
/// A model refusal at a vertex; a reading beyond the timer's range.
pub fn propose(board: &Board, run: &DriverRun) -> Result<Option<Proposal>, HostError> {
    let Some(g) = run.d.diagnosis.as_ref() else {
        return Ok(None);
    };
    let Some((h, a)) = bounds(run) else {
        return Ok(None);
    };
    let Some(th) = threshold(h, a) else {
        return Ok(None);
    };
    let again = with_comparator(board, run, th)?;
    let ws = windows(board, &again, 0)?;
    let find = |c| ws.iter().find(|w| w.condition == c).copied();
    let (Some(healthy), Some(open)) = (find(Condition::Healthy), find(Condition::ClampOpen)) else {
        return Ok(None);
    };
    let usable = open.seconds.0 * (1.0 - g.guard.value());
    let slowest = if usable > 0.0 {
        libm::ceilf((2.0 * g.jitter_ticks as f32 + 1.0) / usable * (1.0 + 1e-6))
    } else {
        f32::INFINITY
    };
    Ok(Some(Proposal {
        healthy_max: h,
        open_min: a,
        threshold: th,
        open_seconds: open.seconds,
        open_ticks: open.ticks,
        detectable: open.ticks.0 > healthy.ticks.1 || open.ticks.1 < healthy.ticks.0,
        slowest_tick: slowest,
        rows: ws
            .iter()
            .map(|w| [w.ticks.0, w.ticks.1, w.condition.code()])
            .collect(),
    }))
}

/// The proposal in words.
fn proposal_words(p: &Proposal, tick_hz: f32) -> String {
    let seen = if p.detectable {
        format!("detectable at this timer ({tick_hz:.0} Hz)")
    } else {
        format!("NOT detectable at this timer ({tick_hz:.0} Hz)")
    };
    format!(
        "a comparator at {:.1} V across the switch: no healthy switch-off reaches it (at most {:.2} V), every open-clamp switch-off does (the switch avalanches from {:.2} V), with ±{:.0} % for the divider and comparator; the open clamp reads {} … {} ticks ({:.3} … {:.3} ms) against healthy 0: {seen}; the slowest timer that separates them with this guard and jitter is {:.0} Hz",
        p.threshold,
        p.healthy_max,
        p.open_min,
        COMPARATOR_TOLERANCE * 100.0,
        p.open_ticks.0,
        p.open_ticks.1,
        p.open_seconds.0 * 1e3,
        p.open_seconds.1 * 1e3,
        p.slowest_tick
    )
}

/// The proposal as constants: the threshold in millivolts, the divider ratio for the stated
/// comparator reference (parts per million: the drain voltage × ratio = the reference at the
/// threshold), and its window table, so a firmware can adopt it without copying numbers by
/// hand (the windows hold only once the comparator is built at this threshold).
fn emit(d: &crate::host::board::DriverBoard, p: &Proposal, out: &mut Outcome) {
    out.constants.push(Constant::new(
        &d.module,
        "PROPOSED_COMPARATOR_MV",
        libm::roundf(p.threshold * 1e3) as u32,
        "proposed drain comparator threshold across the switch, mV (judged with ±2 % for the divider and comparator)",
    ));
    if let Some(vref) = d.diagnosis.as_ref().and_then(|g| g.reference) {
        out.constants.push(Constant::new(
            &d.module,
            "PROPOSED_DIVIDER_PPM",
            libm::roundf(vref.value() / p.threshold * 1e6) as u32,
            &format!("divider ratio for the proposed comparator with a {vref} reference, parts per million (drain voltage × ratio = reference at the threshold)"),
        ));
    }
    out.windows.push(WindowTable {
        scope: d.module.clone(),
        name: "PROPOSED_WINDOWS".into(),
        measurement: format!(
            "proposed comparator at {:.1} V across the switch",
            p.threshold
        ),
        rows: p.rows.clone(),
    });
}

/// The proposal as a check (and its constants), or why none fits.
fn proposal_check(board: &Board, run: &DriverRun, proposal: Option<&Proposal>, out: &mut Outcome) {
    let d = &run.d;
    let corner = || Corner::Stated("every corner".into());
    let title = "diagnosis: proposed drain comparator";
    match (proposal, bounds(run)) {
        (Some(p), _) => {
            let status = if p.detectable {
                Status::Info
            } else {
                Status::Warn
            };
            let shown = format!("{:.1} V", p.threshold);
            emit(d, p, out);
            out.checks.push(
                Check::worded(
                    &d.name,
                    "diagnosis_proposal",
                    title,
                    status,
                    &shown,
                    corner(),
                )
                .noted(proposal_words(p, board.tick.value())),
            );
        }
        (None, Some((h, a))) => {
            let why = format!("no threshold fits: healthy switch-offs reach {h:.2} V and the switch avalanches from {a:.2} V with the clamp open, closer than ±{:.0} % allows; the open clamp must be told by its decay time", COMPARATOR_TOLERANCE * 100.0);
            out.checks.push(
                Check::worded(
                    &d.name,
                    "diagnosis_proposal",
                    title,
                    Status::Info,
                    "none fits",
                    corner(),
                )
                .noted(why),
            );
        }
        (None, None) => {}
    }
}

/// Which measurement would show a fault the file's measurements cannot.
fn remedy(c: Condition) -> &'static str {
    match c {
        Condition::ClampOpen => "the proposed comparator, a faster timer, the compensated windows (kickguard::diagnosis::compensate) or the unit's learned window (kickguard::diagnosis::learn)",
        Condition::ZenerShorted => "a comparator between the diode-only switch voltage and the lowest healthy one: a healthy switch-off trips it, a shorted zener never does",
        Condition::CoilOpen => "no on-current: read the coil current before switching off",
        Condition::ShortedTurns => "a decay too fast for the resistance the measured supply and on-current show: the compensated windows (kickguard::diagnosis::compensate)",
        Condition::CoilTooHot => "the on-current with the supply measured: V/I above the hottest healthy winding (kickguard::diagnosis::compensate::ResistanceLimit)",
        Condition::ArmatureStuckOpen => "the armature's dip detector on the coil current at switch-on ([driver.armature], kickguard::armature::detect)",
        Condition::ArmatureStuckClosed => "the armature's release detector on the coil current at switch-off ([driver.armature], kickguard::armature::detect with Polarity::Falling), where the clamp leaves a bump",
        Condition::Healthy => "",
    }
}

/// The proposal check, and the faults that stay invisible with a remedy each; returns the
/// proposal, if one fits.
///
/// # Errors
/// As [`propose`].
pub fn checks(
    board: &Board,
    run: &DriverRun,
    out: &mut Outcome,
) -> Result<Option<Proposal>, HostError> {
    let d = &run.d;
    if d.diagnosis.is_none() {
        return Ok(None);
    }
    let proposal = if run.figures.iter().any(|f| f.open.is_some()) {
        propose(board, run)?
    } else {
        None
    };
    proposal_check(board, run, proposal.as_ref(), out);
    Ok(proposal)
}

/// "What the measurements cannot see": the faults the flyback windows leave invisible (their
/// checks warn), less the open clamp where the proposal sees it, and the armature's two where
/// no armature detector is emitted (no `[driver.armature]`, or its check not passed) — each
/// with what would show it. Run after every other check of the driver.
pub fn invisible(run: &DriverRun, proposal: Option<&Proposal>, out: &mut Outcome) {
    let d = &run.d;
    if d.diagnosis.is_none() {
        return;
    }
    let of = |id: &str| {
        out.checks
            .iter()
            .find(|c| c.subject == d.name && c.id == id)
            .map(|c| c.status)
    };
    let windows = Condition::ALL.iter().filter(|k| {
        let id = format!("diagnosis_{}", condition_words(**k).replace(' ', "_"));
        of(&id) == Some(Status::Warn)
            && !(**k == Condition::ClampOpen && proposal.is_some_and(|p| p.detectable))
    });
    let armature = [
        (Condition::ArmatureStuckOpen, "armature_detectable"),
        (
            Condition::ArmatureStuckClosed,
            "armature_release_detectable",
        ),
    ]
    .into_iter()
    .filter(|(_, id)| of(id) != Some(Status::Pass))
    .map(|(k, _)| k);
    let list: Vec<String> = windows
        .copied()
        .chain(armature)
        .map(|k| format!("{}: {}", condition_words(k), remedy(k)))
        .collect();
    if list.is_empty() {
        return;
    }
    out.checks.push(
        Check::worded(
            &d.name,
            "diagnosis_invisible",
            "diagnosis: what the measurements cannot see",
            Status::Info,
            &format!("{} fault(s)", list.len()),
            Corner::Stated("every corner".into()),
        )
        .noted(format!("and what would show it — {}", list.join("; "))),
    );
}
