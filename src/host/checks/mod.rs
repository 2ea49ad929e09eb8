//! The checks: small separate units, each a function from the analysed driver (or the board's
//! inputs) to verdicts with value, limit, margin and the corner that set them, and the
//! constants the firmware compiles in.
//!
//! How each finds its worst case is stated with it: every figure is taken at its worst over
//! all vertices of the corner box ([`crate::host::corners`]), which is exact for a figure
//! monotone in each axis (the directions are argued in [`crate::host::figures`] and in each
//! check's docs) and is verified by the Monte Carlo comparison of the report.

pub mod armature;
pub mod armature_release;
pub mod diagnosis;
pub mod energy;
pub mod hold;
pub mod inputs;
pub mod metric;
pub mod open_clamp;
pub mod propose;
pub mod shared;
pub mod sized;
pub mod supply;
pub mod switch;
pub mod timing;
pub mod verdict;

pub use metric::Metric;
pub use verdict::{AxisValue, Bound, Check, Corner, Limit, Spread, Status, Unit, MC_TOLERANCE};

use super::corners::{Extreme, Space};
use super::engine::DriverRun;
use std::string::{String, ToString};
use std::vec::Vec;

/// The corner of an extreme in words.
pub fn corner_of(space: &Space, e: &Extreme) -> Corner {
    if e.ties {
        Corner::Ties
    } else {
        Corner::At(space.describe(&e.at), space.values(&e.at))
    }
}

/// A constant the firmware compiles in.
#[derive(Debug, Clone, PartialEq)]
pub struct Constant {
    /// The module it belongs to (the driver's or input's identifier, or "" for the board).
    pub scope: String,
    /// Its name (upper case).
    pub name: String,
    /// Its value.
    pub value: u32,
    /// What it is, for the generated comment.
    pub doc: String,
}

impl Constant {
    /// A constant.
    pub fn new(scope: &str, name: &str, value: u32, doc: &str) -> Constant {
        Constant {
            scope: scope.to_string(),
            name: name.to_string(),
            value,
            doc: doc.to_string(),
        }
    }
}

/// A table of diagnosis windows the firmware classifies against.
#[derive(Debug, Clone, PartialEq)]
pub struct WindowTable {
    /// The driver's identifier.
    pub scope: String,
    /// Its name ("DIAG_0_WINDOWS").
    pub name: String,
    /// The measurement, in words.
    pub measurement: String,
    /// Rows of [lowest tick, highest tick, condition code].
    pub rows: Vec<[u32; 3]>,
}

/// Everything one driver's checks produce.
#[derive(Debug, Clone, Default)]
pub struct Outcome {
    /// The verdicts.
    pub checks: Vec<Check>,
    /// The constants.
    pub constants: Vec<Constant>,
    /// The diagnosis tables.
    pub windows: Vec<WindowTable>,
}

impl Outcome {
    /// The value of constant `name` of `scope`, if emitted.
    pub fn constant(&self, scope: &str, name: &str) -> Option<u32> {
        self.constants
            .iter()
            .find(|c| c.scope == scope && c.name == name)
            .map(|c| c.value)
    }

    /// Sets constant `name` of `scope` to `value`, adding it with `doc` if not yet emitted
    /// (an existing one keeps its doc).
    pub fn set_constant(&mut self, scope: &str, name: &str, value: u32, doc: &str) {
        match self
            .constants
            .iter_mut()
            .find(|c| c.scope == scope && c.name == name)
        {
            Some(c) => c.value = value,
            None => self.constants.push(Constant::new(scope, name, value, doc)),
        }
    }
}

/// Runs every check of one analysed driver.
///
/// # Errors
/// A model refusal while converting a figure (a time beyond the timer's range), located at
/// the driver.
pub fn driver_checks(
    board: &super::board::Board,
    run: &DriverRun,
) -> Result<Outcome, super::HostError> {
    let mut out = Outcome::default();
    sized::checks(run, &mut out);
    switch::checks(board, run, &mut out);
    timing::checks(board, run, &mut out)?;
    energy::checks(board, run, &mut out);
    open_clamp::checks(run, &mut out);
    hold::checks(board, run, &mut out)?;
    diagnosis::checks(board, run, &mut out)?;
    let proposal = propose::checks(board, run, &mut out)?;
    open_clamp::require_detection(run, proposal.as_ref(), &mut out);
    supply::checks(board, run, &mut out)?;
    armature::checks(board, run, &mut out)?;
    propose::invisible(run, proposal.as_ref(), &mut out);
    Ok(out)
}

/// The corner of figure `m`'s extreme `e`, naming only the axes that move the figure there:
/// an axis whose opposite vertex gives the same value (to 1e-6 relative) does not set it.
pub fn corner_for(run: &DriverRun, m: Metric, e: &Extreme) -> Corner {
    if e.ties {
        return Corner::Ties;
    }
    let mut named = Vec::new();
    let mut values = Vec::new();
    let mut quiet = 0usize;
    for a in run.space.varying() {
        let (lo, hi) = run.space.range(a);
        let here = e.at.at(a);
        let other = e.at.with(a, if here == lo { hi } else { lo });
        let v = run
            .points
            .iter()
            .position(|p| *p == other)
            .and_then(|k| run.figures.get(k))
            .and_then(|f| m.read(&run.d, f));
        let same = v.is_some_and(|v| (v - e.value).abs() <= 1e-6 * e.value.abs().max(1e-30));
        if same {
            quiet += 1;
        } else {
            named.push(super::corners::describe_axis(a, here));
            values.push(super::corners::axis_value_of(a, here));
        }
    }
    let mut text = named.join(", ");
    if quiet > 0 {
        text.push_str(if named.is_empty() {
            "any"
        } else {
            " (the other axes do not move it)"
        });
    }
    Corner::At(text, values)
}

/// The check of figure `m` at its worst over the driver's vertices, against `limit`; None
/// where the figure applies at no vertex.
pub fn figure_check(
    run: &DriverRun,
    m: Metric,
    id: &str,
    title: &str,
    unit: Unit,
    limit: Option<Limit>,
) -> Option<Check> {
    let e = m.worst(&run.d, &run.points, &run.figures)?;
    Some(
        Check::valued(
            &run.d.name,
            id,
            title,
            e.value,
            unit,
            limit,
            corner_for(run, m, &e),
        )
        .of(m),
    )
}

/// The figures at the vertex where `m` is worst.
pub fn figures_where(run: &DriverRun, m: Metric) -> Option<&super::figures::Figures> {
    let e = m.worst(&run.d, &run.points, &run.figures)?;
    run.points
        .iter()
        .position(|p| *p == e.at)
        .and_then(|k| run.figures.get(k))
}

/// A time as timer ticks, rounded up (a wait that is never too short).
///
/// # Errors
/// A time beyond the timer's range, located at the tick rate.
pub fn ticks_up(board: &super::board::Board, t: f32) -> Result<u32, super::HostError> {
    let s =
        crate::units::Seconds::new(t).map_err(|e| board.fault("tick_rate", std::format!("{e}")))?;
    crate::timing::to_ticks(s, board.tick)
        .map_err(|e| board.fault("tick_rate", std::format!("{e}")))
}
