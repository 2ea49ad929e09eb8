//! Diagnosis, judged where the firmware lives: in timer ticks. For each measurement and each
//! condition (healthy, clamp path open, zener shorted, coil open, shorted turns, coil too
//! hot) the window of readings over every vertex, widened by the guard band, rounded outward
//! to whole ticks (the reading of a time t is ⌊t·f⌋ or ⌈t·f⌉ depending on the timer's
//! phase) and by the stated timing jitter on each side. A fault is detectable by a
//! measurement when its tick window and the healthy one share no tick; two faults whose
//! windows share ticks cannot be told apart there.
//!
//! Worst corner: each reading is a decay time, monotone in each axis (see
//! [`crate::host::checks::timing`]); its window is [min, max] over the vertices.

use super::{Check, Constant, Corner, Metric, Outcome, Status, WindowTable};
use crate::diagnosis::Condition;
use crate::host::board::{Board, MeasureBoard};
use crate::host::engine::DriverRun;
use crate::host::HostError;
use crate::units::Seconds;
use std::format;
use std::string::String;
use std::vec::Vec;

/// A condition's readings of one measurement: seconds and ticks.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Window {
    /// The condition.
    pub condition: Condition,
    /// Shortest and longest reading over the vertices, s.
    pub seconds: (f32, f32),
    /// The tick window after guard, rounding and jitter.
    pub ticks: (u32, u32),
}

/// The condition's words in the report.
pub fn condition_words(c: Condition) -> &'static str {
    match c {
        Condition::Healthy => "healthy",
        Condition::ClampOpen => "clamp path open",
        Condition::ZenerShorted => "zener shorted",
        Condition::CoilOpen => "coil open",
        Condition::ShortedTurns => "shorted turns",
        Condition::CoilTooHot => "coil too hot",
        Condition::ArmatureStuckOpen => "armature stuck open",
        Condition::ArmatureStuckClosed => "armature stuck closed",
    }
}

/// The measurement's words in the report.
pub fn measurement_words(m: &MeasureBoard) -> String {
    match m {
        MeasureBoard::Comparator(v) => format!("comparator at {v} across the switch"),
        MeasureBoard::Current { upper, lower } => format!(
            "current falling from {:.0} mA to {:.0} mA",
            upper.value() * 1e3,
            lower.value() * 1e3
        ),
    }
}

/// The tick windows of measurement `k` under every condition that applies, over the
/// comparator threshold's tolerance (`diagnosis.comparator_tolerance`) as one more axis: the
/// reading of a comparator is monotone in its threshold, so the windows at its two ends and
/// the nominal, united per condition, hold every threshold in between.
///
/// # Errors
/// A reading beyond the timer's range; a model refusal at a shifted threshold.
pub fn windows(board: &Board, run: &DriverRun, k: usize) -> Result<Vec<Window>, HostError> {
    let mut ws = windows_at(board, run, k)?;
    let Some(g) = run.d.diagnosis.as_ref() else {
        return Ok(ws);
    };
    let (tol, Some(MeasureBoard::Comparator(th))) =
        (g.comparator_tolerance, g.measurements.get(k).copied())
    else {
        return Ok(ws);
    };
    if !(tol > 0.0) {
        return Ok(ws);
    }
    for scale in [1.0 - tol, 1.0 + tol] {
        let shifted = crate::units::Volts::new(th.value() * scale).map_err(|e| {
            board.fault(
                &format!("{}.diagnosis.comparator", run.d.field),
                format!("{e}"),
            )
        })?;
        let mut ms = g.measurements.clone();
        if let Some(m) = ms.get_mut(k) {
            *m = MeasureBoard::Comparator(shifted);
        }
        let again = with_measurements(board, run, ms)?;
        for w in windows_at(board, &again, k)? {
            match ws.iter_mut().find(|x| x.condition == w.condition) {
                Some(x) => {
                    x.seconds = (x.seconds.0.min(w.seconds.0), x.seconds.1.max(w.seconds.1));
                    x.ticks = (x.ticks.0.min(w.ticks.0), x.ticks.1.max(w.ticks.1));
                }
                None => ws.push(w),
            }
        }
    }
    Ok(ws)
}

/// The driver's run again with `measurements` as its diagnosis measurements (the same vertices
/// and self-heating).
///
/// # Errors
/// A model refusal at a vertex.
pub fn with_measurements(
    board: &Board,
    run: &DriverRun,
    measurements: Vec<MeasureBoard>,
) -> Result<DriverRun, HostError> {
    let mut d = run.d.clone();
    if let Some(g) = d.diagnosis.as_mut() {
        g.measurements = measurements;
    }
    let mut cx = run.context(board);
    cx.d = &d;
    let figures = crate::host::engine::sweep(&cx, &run.space, &run.points)?;
    Ok(DriverRun {
        d,
        figures,
        ..run.clone()
    })
}

/// The tick windows of measurement `k` at its nominal threshold.
///
/// # Errors
/// A reading beyond the timer's range.
fn windows_at(board: &Board, run: &DriverRun, k: usize) -> Result<Vec<Window>, HostError> {
    let Some(g) = run.d.diagnosis.as_ref() else {
        return Ok(Vec::new());
    };
    let fault =
        |e: crate::Error| board.fault(&format!("{}.diagnosis", run.d.field), format!("{e}"));
    let (guard, jitter) = (g.guard.value(), g.jitter_ticks);
    let mut out = Vec::new();
    for (c, cond) in Condition::ALL.iter().enumerate() {
        let m = |high| Metric::Diag {
            m: k as u8,
            c: c as u8,
            high,
        };
        let (Some(lo), Some(hi)) = (
            m(false).worst(&run.d, &run.points, &run.figures),
            m(true).worst(&run.d, &run.points, &run.figures),
        ) else {
            continue;
        };
        let t_lo = crate::timing::to_ticks_floor(
            Seconds::new(lo.value * (1.0 - guard)).map_err(fault)?,
            board.tick,
        )
        .map_err(fault)?;
        let t_hi = crate::timing::to_ticks(
            Seconds::new(hi.value * (1.0 + guard)).map_err(fault)?,
            board.tick,
        )
        .map_err(fault)?;
        out.push(Window {
            condition: *cond,
            seconds: (lo.value, hi.value),
            ticks: (t_lo.saturating_sub(jitter), t_hi.saturating_add(jitter)),
        });
    }
    Ok(out)
}

/// True when two tick windows share a tick.
fn overlap(a: (u32, u32), b: (u32, u32)) -> bool {
    a.0 <= b.1 && b.0 <= a.1
}

/// A window in words: ticks and milliseconds, or "never trips".
fn window_words(m: &MeasureBoard, w: &Window) -> String {
    if w.seconds.1 <= 0.0 {
        return match m {
            MeasureBoard::Comparator(_) => "comparator never trips (reads 0)".into(),
            MeasureBoard::Current { .. } => "reads 0".into(),
        };
    }
    format!(
        "{} … {} ticks ({:.3} … {:.3} ms)",
        w.ticks.0,
        w.ticks.1,
        w.seconds.0 * 1e3,
        w.seconds.1 * 1e3
    )
}

/// The diagnosis checks and tables.
///
/// # Errors
/// A reading beyond the timer's range.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<(), HostError> {
    let d = &run.d;
    let Some(g) = d.diagnosis.as_ref() else {
        return Ok(());
    };
    let mut per: Vec<(Condition, Vec<String>, Vec<String>)> = Vec::new();
    for (k, m) in g.measurements.iter().enumerate() {
        let ws = windows(board, run, k)?;
        let Some(h) = ws
            .iter()
            .find(|w| w.condition == Condition::Healthy)
            .copied()
        else {
            continue;
        };
        out.windows.push(WindowTable {
            scope: d.module.clone(),
            name: format!("DIAG_{k}_WINDOWS"),
            measurement: measurement_words(m),
            rows: ws
                .iter()
                .map(|w| [w.ticks.0, w.ticks.1, w.condition.code()])
                .collect(),
        });
        sort_readings(m, &ws, &h, &mut per);
    }
    learner_constants(run, out);
    let (model, tol) = assumptions(g);
    for (cond, yes, no) in per {
        let title = format!("diagnosis: {}", condition_words(cond));
        let id = format!("diagnosis_{}", condition_words(cond).replace(' ', "_"));
        let c = if yes.is_empty() {
            Check::worded(&d.name, &id, &title, Status::Warn, "not detectable", Corner::Stated("every corner".into()))
                .noted(format!("its windows share ticks with the healthy one (guard, rounding and ±{} ticks of jitter included): {}", g.jitter_ticks, no.join("; ")))
        } else {
            Check::worded(
                &d.name,
                &id,
                &title,
                Status::Pass,
                "detectable",
                Corner::Stated("every corner".into()),
            )
            .noted(yes.join("; "))
        };
        let extra = if cond == Condition::ShortedTurns {
            format!("{model}{tol}")
        } else {
            tol.clone()
        };
        let note = format!("{}{extra}", c.note);
        out.checks.push(c.noted(note));
    }
    Ok(())
}

/// Each fault's windows of measurement `m` in words, sorted into those that separate from the
/// healthy one (`.1`) and those that share ticks with it (`.2`).
#[allow(clippy::type_complexity)]
fn sort_readings(
    m: &MeasureBoard,
    ws: &[Window],
    h: &Window,
    per: &mut Vec<(Condition, Vec<String>, Vec<String>)>,
) {
    for w in ws.iter().filter(|w| w.condition != Condition::Healthy) {
        let entry = match per.iter().position(|x| x.0 == w.condition) {
            Some(i) => i,
            None => {
                per.push((w.condition, Vec::new(), Vec::new()));
                per.len() - 1
            }
        };
        let text = format!(
            "{}: {} against healthy {}",
            measurement_words(m),
            window_words(m, w),
            window_words(m, h)
        );
        let others: Vec<&str> = ws
            .iter()
            .filter(|o| {
                o.condition != Condition::Healthy
                    && o.condition != w.condition
                    && overlap(o.ticks, w.ticks)
            })
            .map(|o| condition_words(o.condition))
            .collect();
        if let Some(slot) = per.get_mut(entry) {
            if overlap(w.ticks, h.ticks) {
                slot.2.push(text);
            } else if others.is_empty() {
                slot.1.push(text);
            } else {
                slot.1
                    .push(format!("{text}; shares ticks with {}", others.join(", ")));
            }
        }
    }
}

/// What the windows assume, for the notes: the shorted-turn model and the comparator
/// tolerance.
fn assumptions(g: &crate::host::board::DiagnosisBoard) -> (String, String) {
    let ((l_lo, l_hi), fr) = g.shorted;
    let model = if l_hi > l_lo {
        format!(
            "; shorted turns modelled as L × {l_lo:.3} … {l_hi:.3} (from L·(1 − f)² to L·(1 − f), the two common models) and R × {fr:.3}"
        )
    } else {
        format!("; shorted turns modelled as L × {l_lo:.3} and R × {fr:.3} (as given)")
    };
    let tol = if g.comparator_tolerance > 0.0 {
        format!(
            "; comparator thresholds ±{:.1} %",
            g.comparator_tolerance * 100.0
        )
    } else {
        String::new()
    };
    (model, tol)
}

/// How many healthy readings the firmware's learner collects before it has learned a unit's
/// own window (`Learner::<LEARN_READINGS>`; between the library's 5 and 256).
pub const LEARN_READINGS: u32 = 16;

/// The learner's constants of a driver with a diagnosis: its size, its margin (the timing
/// jitter) and the length of the persisted window.
pub fn learner_constants(run: &DriverRun, out: &mut Outcome) {
    let Some(g) = run.d.diagnosis.as_ref() else {
        return;
    };
    let m = &run.d.module;
    out.constants.push(Constant::new(m, "LEARN_READINGS", LEARN_READINGS, "healthy readings the learner collects before it has learned this unit's window (Learner::<LEARN_READINGS>)"));
    out.constants.push(Constant::new(
        m,
        "LEARN_MARGIN_TICKS",
        g.jitter_ticks,
        "ticks added to each side of a learned window (the timing jitter)",
    ));
    out.constants.push(Constant::new(
        m,
        "LEARNED_WINDOW_BYTES",
        9,
        "bytes of a persisted learned window (LearnedWindow::to_bytes)",
    ));
}

/// The constant the firmware's tables need beside them.
pub fn tick_constant(board: &Board) -> Constant {
    Constant::new(
        "",
        "TICK_HZ",
        libm::roundf(board.tick.value()) as u32,
        "timer tick rate of every *_TICKS constant and diagnosis window, Hz",
    )
}
