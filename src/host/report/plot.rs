//! Plot data: the decay of each clamp option for one driver, at the corner where the designed
//! clamp's switch voltage is worst (the report names it), sampled by the library's bounded
//! sampler, with the switch's rating and its derated limit.
//!
//! The options are fixed, each with its own colour in every plot: the clamp as designed; a
//! plain freewheeling diode; a resistor equal to the coil's resistance plus the diode; no
//! clamp at all (the switch's own avalanche). Each trace ends where its current has fallen to
//! 0.1 % of the start, then holds zero current and the supply across the switch to the plot's
//! end: the voltage returns to the supply once the coil is off.

use crate::clamp::{Clamp, Sample, SwitchOff};
use crate::diode::{Diode, DiodeParams};
use crate::host::board::Board;
use crate::host::checks::Metric;
use crate::host::engine::{refused, DriverRun};
use crate::host::parts::{self, Off, Path};
use crate::host::HostError;
use crate::units::{Amps, Ohms, Seconds};
use std::string::String;
use std::vec::Vec;

/// Samples per trace at most.
pub const SAMPLES: usize = 400;

/// A clamp option of the plots.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Choice {
    /// The clamp as designed.
    Designed,
    /// A plain freewheeling diode.
    Diode,
    /// A resistor equal to the coil resistance, plus the diode.
    ResistorDiode,
    /// No clamp: the switch avalanches.
    Avalanche,
}

impl Choice {
    /// Its label.
    pub fn label(self, kind: &str) -> String {
        match self {
            Choice::Designed => std::format!("as designed ({kind})"),
            Choice::Diode => "plain diode".into(),
            Choice::ResistorDiode => "resistor (= coil R) + diode".into(),
            Choice::Avalanche => "no clamp: switch avalanche".into(),
        }
    }
}

/// One trace.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// The option.
    pub choice: Choice,
    /// Its label.
    pub label: String,
    /// Times, s.
    pub t: Vec<f32>,
    /// Coil current, A.
    pub i: Vec<f32>,
    /// Voltage across the switch, V.
    pub v: Vec<f32>,
}

/// One driver's plot.
#[derive(Debug, Clone, PartialEq)]
pub struct Plot {
    /// The driver's name as written.
    pub name: String,
    /// Its identifier (for the file name).
    pub module: String,
    /// The corner, in words.
    pub corner: String,
    /// The supply at that corner, V.
    pub supply: f32,
    /// The switch's rating, V.
    pub rating: f32,
    /// The derated limit, V.
    pub limit: f32,
    /// The traces.
    pub series: Vec<Series>,
}

/// The diode the alternative options use: the design's own, or a silicon rectifier.
fn option_diode(run: &DriverRun, p: &crate::host::corners::Point) -> Result<Diode, crate::Error> {
    match run.d.clamp.diode() {
        Some(dp) => parts::diode_at(dp, p),
        None => Ok(Diode::Law(DiodeParams::SILICON)),
    }
}

/// Samples one switch-off, then holds zero current and the supply to `t_end`.
#[allow(clippy::type_complexity)]
fn trace(
    off: &Off,
    dt: Seconds,
    supply: f32,
    t_end: f32,
) -> Result<(Vec<f32>, Vec<f32>, Vec<f32>), crate::Error> {
    let mut buf = std::vec![Sample::default(); SAMPLES];
    let n = match off {
        Off::Engine(o) => o.sample(dt, Amps::new(o.start_current().value() * 1e-3)?, &mut buf)?,
        Off::Snubber(s) => s.sample(dt, &mut buf)?,
    };
    buf.truncate(n);
    let mut t: Vec<f32> = buf.iter().map(|s| s.time.value()).collect();
    let mut i: Vec<f32> = buf.iter().map(|s| s.current.value()).collect();
    let mut v: Vec<f32> = buf.iter().map(|s| s.switch_voltage.value()).collect();
    let last = t.last().copied().unwrap_or(0.0);
    for tt in [last + dt.value(), t_end.max(last + dt.value())] {
        t.push(tt);
        i.push(0.0);
        v.push(supply);
    }
    Ok((t, i, v))
}

/// The switch-offs of every option at `p`.
fn options(
    run: &DriverRun,
    p: &crate::host::corners::Point,
) -> Result<Vec<(Choice, Off)>, crate::Error> {
    let designed = parts::circuit_at(&run.d, p)?;
    let diode = option_diode(run, p)?;
    let mut out = std::vec![(Choice::Designed, designed.switch_off()?)];
    let is = |c: &dyn Fn(&Clamp) -> bool| matches!(&designed.path, Path::Clamp(x) if c(x));
    let mut add = |choice: Choice, clamp: Clamp| -> Result<(), crate::Error> {
        let off = SwitchOff::new(&designed.coil, &clamp, designed.side, &designed.op)?;
        out.push((choice, Off::Engine(off)));
        Ok(())
    };
    if !is(&|c| matches!(c, Clamp::FreewheelDiode(_))) {
        add(Choice::Diode, Clamp::FreewheelDiode(diode))?;
    }
    if !is(&|c| matches!(c, Clamp::ResistorDiode { .. })) {
        add(
            Choice::ResistorDiode,
            Clamp::ResistorDiode {
                resistor: Ohms::new(run.d.coil.resistance_ref().value())?,
                diode,
            },
        )?;
    }
    if !is(&|c| matches!(c, Clamp::Avalanche(_))) {
        // The switch's avalanche at the switch's own temperature.
        let mut op = designed.op;
        op.breakdown = p.temperature(crate::host::corners::Axis::AvalancheTemp)?;
        let off = SwitchOff::new(
            &designed.coil,
            &Clamp::Avalanche(parts::avalanche_at(&run.d, p)?),
            designed.side,
            &op,
        )?;
        out.push((Choice::Avalanche, Off::Engine(off)));
    }
    Ok(out)
}

/// The time by which an option's current is below 0.1 % of its start.
fn settled(off: &Off) -> Result<f32, crate::Error> {
    Ok(match off {
        Off::Engine(o) => o
            .time_to(Amps::new(o.start_current().value() * 1e-3)?)?
            .value(),
        Off::Snubber(s) => s.settle_time(Amps::new(1e-6)?)?.value(),
    })
}

/// The plot of one driver at its worst switch-voltage corner; None when that figure has no
/// worst (it always has one for a driver with vertices).
///
/// # Errors
/// A model refusal at the corner, located at the driver.
pub fn plot(board: &Board, run: &DriverRun) -> Result<Option<Plot>, HostError> {
    let Some(e) = Metric::PeakSwitch.worst(&run.d, &run.points, &run.figures) else {
        return Ok(None);
    };
    let p = e.at;
    let fail = |err: crate::Error| refused(board, &run.d, &run.space, &p, err);
    let opts = options(run, &p).map_err(fail)?;
    let mut ends = Vec::new();
    for (_, off) in &opts {
        ends.push(settled(off).map_err(fail)? * 1.1);
    }
    let t_end = ends.iter().fold(0.0f32, |a, b| a.max(*b));
    let supply = p.at(crate::host::corners::Axis::Supply);
    let mut series = Vec::new();
    for ((choice, off), end) in opts.iter().zip(ends) {
        // Each trace at its own step, so a fast decay is drawn as finely as a slow one.
        let dt = Seconds::new(end / (SAMPLES as f32 - 10.0)).map_err(fail)?;
        let (t, i, v) = trace(off, dt, supply, t_end).map_err(fail)?;
        series.push(Series {
            choice: *choice,
            label: choice.label(run.d.clamp.kind()),
            t,
            i,
            v,
        });
    }
    Ok(Some(Plot {
        name: run.d.name.clone(),
        module: run.d.module.clone(),
        corner: if e.ties {
            "every corner alike".into()
        } else {
            run.space.describe(&p)
        },
        supply,
        rating: run.d.switch.rating.value(),
        limit: run.d.switch.rating.value() * run.d.switch.derating.value(),
        series,
    }))
}
