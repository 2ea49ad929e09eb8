//! One driver through the whole analysis: its corner box, the values it sizes, its figures at
//! every vertex, and the self-heating iteration that ties them together (see
//! [`super::heating`]). Everything here reads the typed board; the checks then read the run.

use super::board::{Board, DriverBoard};
use super::corners::{Axis, Point, Rises, Space};
use super::figures::{self, Context, Figures};
use super::heating;
use super::sizing::{self, HoldChoice, ZenerChoice};
use super::HostError;
use std::format;
use std::string::{String, ToString};
use std::vec::Vec;

/// The hottest any part may be taken by self-heating, °C: the library's models stop at 250 °C.
pub const HOTTEST_PART_C: f32 = 240.0;

/// One driver, analysed.
#[derive(Debug, Clone)]
pub struct DriverRun {
    /// The driver with its sized values filled in.
    pub d: DriverBoard,
    /// Its corner box (with the final self-heating).
    pub space: Space,
    /// The self-heating used for the box.
    pub rises: Rises,
    /// Whether the self-heating settled within [`heating::MAX_PASSES`] and stayed inside
    /// [`HOTTEST_PART_C`].
    pub settled: bool,
    /// The zener sizing, if the file asked for it.
    pub zener: Option<ZenerChoice>,
    /// The hold sizing, if the driver holds.
    pub hold: Option<HoldChoice>,
    /// The vertices of the box.
    pub points: Vec<Point>,
    /// The figures at each vertex.
    pub figures: Vec<Figures>,
}

impl DriverRun {
    /// The context to evaluate more points of this driver (Monte Carlo, plots).
    pub fn context<'a>(&'a self, board: &'a Board) -> Context<'a> {
        Context {
            board,
            d: &self.d,
            release_voltage: self.d.release,
            hold: self.hold.and_then(|h| h.plan),
            winding: self.space.range(Axis::Winding),
        }
    }
}

/// The design field a model refusal points at, from the library's name for the input it
/// refused, with what the user can do: the field whose value took the model there, not the
/// clamp by default. A board-level field is returned with a leading `^`.
fn cause(e: &crate::Error) -> (&'static str, &'static str) {
    match e.input {
        "duty" => ("hold.frequency", "the coil current falls to zero in every PWM period (the period is long against the coil's L/R) or cannot be held, so continuous conduction, the hold model's assumption, fails: raise hold.frequency or check coil.inductance"),
        "hold current" => ("hold.hold_current", "the hold current cannot be reached at this corner"),
        "pull-in current" => ("hold.pull_in_current", "the pull-in current cannot be reached at this corner"),
        "period" | "timer period" => ("hold.frequency", "the PWM period is beyond the quantities' range"),
        "winding temperature" | "coil resistance" => ("^environment.coil_self_heating", "the winding (or the coil-too-hot fault above it) leaves the coil model's −100 … 250 °C"),
        "inductance" | "time constant" => ("coil.inductance", "the coil's values take the model out of its range"),
        "start current" | "current" | "R" => ("coil.resistance", "the on-current takes the model out of its range"),
        "diode temperature" | "diode drop" | "IS" | "forward current" | "drop shift" => ("clamp.diode", "the clamp diode leaves its model's range (its own heating included)"),
        "breakdown temperature" | "breakdown voltage" | "breakdown current" | "active clamp voltage" | "rz" => ("clamp.voltage", "the clamp's breakdown part leaves its model's range (its own heating included)"),
        "avalanche energy" => ("switch.avalanche_energy", "the avalanche energy leaves the quantities' range"),
        "shorted turns" => ("diagnosis.shorted_turns", "the shorted-turns fault leaves the model's range"),
        "threshold" | "upper threshold" | "upper current threshold" => ("diagnosis", "a measurement's threshold is out of the model's reach"),
        _ => ("clamp", ""),
    }
}

/// A model refusal at a corner, located at the design field that caused it (mapped from the
/// library's name for the refused input).
pub fn refused(
    board: &Board,
    d: &DriverBoard,
    space: &Space,
    p: &Point,
    e: crate::Error,
) -> HostError {
    let (field, hint) = cause(&e);
    let located = match field.strip_prefix('^') {
        Some(board_field) => board_field.to_string(),
        None => format!("{}.{field}", d.field),
    };
    let hint = if hint.is_empty() {
        String::new()
    } else {
        format!(" ({hint})")
    };
    board.fault(
        &located,
        format!(
            "at the corner {} the model refuses it: {e}{hint}",
            space.describe(p)
        ),
    )
}

/// The figures at every point.
///
/// # Errors
/// A model refusal at a point, located at the driver.
pub fn sweep(cx: &Context<'_>, space: &Space, points: &[Point]) -> Result<Vec<Figures>, HostError> {
    points
        .iter()
        .map(|p| figures::figures_at(cx, p).map_err(|e| refused(cx.board, cx.d, space, p, e)))
        .collect()
}

/// The rises limited so no part leaves the models' range (and whether any had to be).
fn capped(board: &Board, r: Rises) -> (Rises, bool) {
    let room = HOTTEST_PART_C - board.ambient.1.celsius();
    let c = Rises {
        diode: r.diode.min(room),
        breakdown: r.breakdown.min(room),
        switch: r.switch.min(room),
    };
    (c, c != r)
}

/// The zener choice for `d` over `points` (None when the file gives its voltage).
fn zener_for(
    board: &Board,
    d: &DriverBoard,
    space: &Space,
    points: &[Point],
) -> Result<Option<ZenerChoice>, HostError> {
    if !sizing::zener_is_auto(d) {
        return Ok(None);
    }
    let limit = d.max_release_time.map(|t| t.value());
    let release_ok = |cand: &DriverBoard| -> Result<bool, crate::Error> {
        let (Some(limit), Some(_)) = (limit, d.release) else {
            return Ok(true);
        };
        let cx = Context {
            board,
            d: cand,
            release_voltage: d.release,
            hold: None,
            winding: space.range(Axis::Winding),
        };
        for p in points {
            if figures::release_at(&cx, p)?.is_some_and(|t| t > limit) {
                return Ok(false);
            }
        }
        Ok(true)
    };
    sizing::size_zener(d, points, &release_ok)
        .map(Some)
        .map_err(|e| {
            board.fault(
                &format!("{}.clamp.voltage", d.field),
                format!("sizing the zener, the model refuses a candidate: {e}"),
            )
        })
}

/// Analyses driver `d`.
///
/// # Errors
/// A model refusal at a corner, located at the driver.
pub fn run_driver(board: &Board, d: &DriverBoard) -> Result<DriverRun, HostError> {
    let mut rises = Rises::default();
    let mut pass = 0usize;
    loop {
        pass += 1;
        let (used, was_capped) = capped(board, rises);
        let space = Space::for_driver(board, d, used);
        let points = space.vertices();
        let zener = zener_for(board, d, &space, &points)?;
        let sized = match zener {
            Some(z) => sizing::with_zener(d, z.chosen),
            None => d.clone(),
        };
        let hold = sizing::size_hold(&sized, &points, board.pwm_clock).map_err(|e| {
            board.fault(
                &format!("{}.hold", d.field),
                format!("sizing the hold, the model refuses it: {e}"),
            )
        })?;
        let cx = Context {
            board,
            d: &sized,
            release_voltage: sized.release,
            hold: hold.and_then(|h| h.plan),
            winding: space.range(Axis::Winding),
        };
        let figures = sweep(&cx, &space, &points)?;
        let next = heating::rises(&sized, &figures);
        let done = heating::settled(&next, &rises);
        if done || pass >= heating::MAX_PASSES {
            return Ok(DriverRun {
                d: sized,
                space,
                rises: used,
                settled: done && !was_capped,
                zener,
                hold,
                points,
                figures,
            });
        }
        rises = next;
    }
}
