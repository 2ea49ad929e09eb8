//! The result of a run, as data: per driver its box, checks (with the Monte Carlo spread when
//! asked), constants, diagnosis tables and plot; the board's input checks; the cautions. The
//! outputs ([`super::output`]) only read it.

pub mod plot;

use super::board::Board;
use super::checks::{self, Check, Constant, Outcome, Status};
use super::engine::{self, DriverRun};
use super::montecarlo::{self, Request};
use super::HostError;
use crate::clamp::Side;
use std::string::String;
use std::vec::Vec;

/// The cautions every report and generated file carries.
pub const CAUTIONS: [&str; 3] = [
    "Results are engineering estimates from simplified models of the parts.",
    "Verify the design on the real hardware, over its real temperature range, with margin.",
    "Local codes and licensed practice prevail over anything computed here.",
];

/// What the checks do not cover, said in every report until the models cover it.
pub const SCOPE: [&str; 1] = [
    "A supply without a profile (supply.profile or [[supply.event]]) is checked over its steady minimum … maximum only.",
];

/// Version of the JSON report's layout (`schema/report.schema.json`).
pub const SCHEMA_VERSION: u32 = 2;

/// One driver's results.
#[derive(Debug, Clone)]
pub struct DriverReport {
    /// Name as written.
    pub name: String,
    /// Identifier of its constants.
    pub module: String,
    /// How many identical drivers.
    pub count: u32,
    /// Where the switch sits.
    pub side: Side,
    /// The clamp kind as the file spells it.
    pub kind: &'static str,
    /// Every axis that varies, with its range.
    pub axes: Vec<String>,
    /// Checks, constants and tables.
    pub outcome: Outcome,
    /// Every axis that varies as numbers: (machine name, lowest, highest, unit).
    pub ranges: Vec<(&'static str, f32, f32, &'static str)>,
    /// The decay of each clamp option at the worst switch-voltage corner, then at the worst
    /// release corner (with a must-release voltage).
    pub plots: Vec<plot::Plot>,
    /// Every clamp option's figures (the table beside the plots).
    pub options: Vec<plot::OptionRow>,
}

/// A whole run.
#[derive(Debug, Clone)]
pub struct Report {
    /// Title of the design.
    pub title: String,
    /// The design file.
    pub file: String,
    /// Timer tick rate of the generated constants, Hz.
    pub tick_hz: f32,
    /// The drivers.
    pub drivers: Vec<DriverReport>,
    /// The board's input checks and constants.
    pub board: Outcome,
    /// The Monte Carlo run, if one was asked for.
    pub monte_carlo: Option<Request>,
    /// Every driver's and input's (identifier, name as written).
    pub names: Vec<(String, String)>,
}

impl Report {
    /// Every check, drivers first.
    pub fn checks(&self) -> impl Iterator<Item = &Check> {
        self.drivers
            .iter()
            .flat_map(|d| d.outcome.checks.iter())
            .chain(self.board.checks.iter())
    }

    /// True when any check failed.
    pub fn failed(&self) -> bool {
        self.checks().any(|c| c.status == Status::Fail)
    }

    /// Every constant, the board's first.
    pub fn constants(&self) -> impl Iterator<Item = &Constant> {
        self.board
            .constants
            .iter()
            .chain(self.drivers.iter().flat_map(|d| d.outcome.constants.iter()))
    }
}

/// Attaches the Monte Carlo spread to every check tied to a figure.
fn attach_spreads(
    board: &Board,
    run: &DriverRun,
    k: usize,
    req: Request,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let metrics: Vec<_> = out.checks.iter().filter_map(|c| c.metric).collect();
    let spreads = montecarlo::spreads(board, run, k, req, &metrics)?;
    let mut it = spreads.into_iter();
    for c in out.checks.iter_mut().filter(|c| c.metric.is_some()) {
        c.spread = it.next().flatten();
    }
    Ok(())
}

/// One driver, analysed, checked and plotted.
fn driver(
    board: &Board,
    k: usize,
    run: &DriverRun,
    mc: Option<Request>,
) -> Result<DriverReport, HostError> {
    let mut outcome = checks::driver_checks(board, run)?;
    if let Some(req) = mc {
        attach_spreads(board, run, k, req, &mut outcome)?;
    }
    Ok(DriverReport {
        name: run.d.name.clone(),
        module: run.d.module.clone(),
        count: run.d.count,
        side: run.d.side,
        kind: run.d.clamp.kind(),
        axes: run.space.describe_ranges(),
        ranges: run.space.ranges(),
        outcome,
        plots: [plot::View::SwitchVoltage, plot::View::Release]
            .into_iter()
            .map(|v| plot::plot(board, run, v))
            .collect::<Result<Vec<_>, _>>()?
            .into_iter()
            .flatten()
            .collect(),
        options: plot::option_table(board, run)?,
    })
}

/// Every driver's and input's (identifier, name as written).
fn names(board: &Board) -> Vec<(String, String)> {
    let drivers = board
        .drivers
        .iter()
        .map(|d| (d.module.clone(), d.name.clone()));
    let inputs = board
        .inputs
        .iter()
        .flat_map(|p| p.inputs.iter().map(|i| (i.module.clone(), i.name.clone())));
    drivers.chain(inputs).collect()
}

impl Report {
    /// The name as written of the driver or input with identifier `module`.
    pub fn name_of<'a>(&'a self, module: &'a str) -> &'a str {
        self.names
            .iter()
            .find(|(m, _)| m == module)
            .map_or(module, |(_, n)| n.as_str())
    }
}

/// Analyses the board: every driver through the corner engine and its checks, then the
/// inputs, which read the drivers' results.
///
/// # Errors
/// A model refusal, located at the field it concerns.
pub fn build(board: &Board, mc: Option<Request>) -> Result<Report, HostError> {
    let runs = board
        .drivers
        .iter()
        .map(|d| engine::run_driver(board, d))
        .collect::<Result<Vec<_>, _>>()?;
    let drivers = runs
        .iter()
        .enumerate()
        .map(|(k, r)| driver(board, k, r, mc))
        .collect::<Result<Vec<_>, _>>()?;
    let mut inputs = checks::inputs::checks(board, &runs)?;
    inputs
        .checks
        .extend(checks::shared::checks(board, &runs)?.checks);
    inputs
        .constants
        .insert(0, checks::diagnosis::tick_constant(board));
    Ok(Report {
        title: board.title.clone(),
        file: board.file.clone(),
        tick_hz: board.tick.value(),
        drivers,
        board: inputs,
        monte_carlo: mc,
        names: names(board),
    })
}
