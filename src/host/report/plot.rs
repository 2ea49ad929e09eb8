//! Plot data and the option table: the decay of each clamp option for one driver, at the corner
//! where the designed clamp's switch voltage is worst and at the corner where its release is
//! slowest (the report names both), sampled by the library's bounded sampler, with the switch's
//! rating, its derated limit and its avalanche onset, and at the release corner the release
//! current and the designed clamp's release time.
//!
//! The options are fixed: the clamp as designed; a plain freewheeling diode; a resistor equal
//! to the coil's resistance plus the diode; no clamp at all (the switch's own avalanche). Each
//! topology keeps one colour in every plot (the output picks it from the topology, so a plain
//! diode is the same colour whether it is the design or an option). Each trace ends where its
//! current has fallen to 0.1 % of the start, then holds zero current and the supply across the
//! switch to the plot's end: the voltage returns to the supply once the coil is off.
//!
//! The option table gives every option's figures from the same circuits: peak switch voltage,
//! energies and average power at the worst switch-voltage corner; release time and the time to
//! 1 % of the on-current at the worst release corner (at the switch-voltage corner when the
//! coil has no must-release voltage).

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
    /// The topology it draws, as the design file names kinds (its colour in every plot).
    pub fn topology(self, designed: &str) -> String {
        match self {
            Choice::Designed => designed.into(),
            Choice::Diode => "diode".into(),
            Choice::ResistorDiode => "resistor+diode".into(),
            Choice::Avalanche => "avalanche".into(),
        }
    }

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
    /// Its topology, as the design file names kinds (sets its colour).
    pub topology: String,
    /// Its label.
    pub label: String,
    /// Times, s.
    pub t: Vec<f32>,
    /// Coil current, A.
    pub i: Vec<f32>,
    /// Voltage across the switch, V.
    pub v: Vec<f32>,
}

/// Which corner a plot shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum View {
    /// The worst switch-voltage corner.
    SwitchVoltage,
    /// The worst release corner.
    Release,
}

/// One driver's plot at one corner.
#[derive(Debug, Clone, PartialEq)]
pub struct Plot {
    /// The driver's name as written.
    pub name: String,
    /// Its identifier (for the file name).
    pub module: String,
    /// The corner it shows.
    pub view: View,
    /// The corner, in words.
    pub corner: String,
    /// The switch's avalanche onset at that corner, V (where the switch is not itself the
    /// clamp).
    pub avalanche: Option<f32>,
    /// This unit's release current at that corner, A (release view, with a must-release
    /// voltage).
    pub release_current: Option<f32>,
    /// The designed clamp's electrical decay to the release current at that corner, s
    /// (release view).
    pub release_decay: Option<f32>,
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

/// The worst vertex of `view`'s figure, and whether every vertex gave the same.
fn corner_of(run: &DriverRun, view: View) -> Option<(crate::host::corners::Point, bool)> {
    let m = match view {
        View::SwitchVoltage => Metric::PeakSwitch,
        View::Release => Metric::Release,
    };
    m.worst(&run.d, &run.points, &run.figures)
        .map(|e| (e.at, e.ties))
}

/// The plot of one driver at the worst corner of `view`; None when the figure applies at no
/// vertex (no release view without a must-release voltage).
///
/// # Errors
/// A model refusal at the corner, located at the driver.
pub fn plot(board: &Board, run: &DriverRun, view: View) -> Result<Option<Plot>, HostError> {
    let Some((p, ties)) = corner_of(run, view) else {
        return Ok(None);
    };
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
            topology: choice.topology(run.d.clamp.kind()),
            label: choice.label(run.d.clamp.kind()),
            t,
            i,
            v,
        });
    }
    let (release_current, release_decay) = match (view, run.d.release) {
        (View::Release, Some(v)) => {
            let i = crate::host::figures::magnetic_current(&run.d, v, &p).map_err(fail)?;
            let decay = opts
                .first()
                .map(|(_, off)| time_to(off, i))
                .transpose()
                .map_err(fail)?;
            (Some(i.value()), decay)
        }
        _ => (None, None),
    };
    let figures = crate::host::figures::figures_at(&run.context(board), &p).map_err(fail)?;
    Ok(Some(Plot {
        name: run.d.name.clone(),
        module: run.d.module.clone(),
        view,
        corner: if ties {
            "every corner alike".into()
        } else {
            run.space.describe(&p)
        },
        avalanche: figures.avalanche_onset,
        release_current,
        release_decay,
        supply,
        rating: run.d.switch.rating.value(),
        limit: run.d.switch.rating.value() * run.d.switch.derating.value(),
        series,
    }))
}

/// An option's decay time to `i` (zero when it starts at or below it).
fn time_to(off: &Off, i: Amps) -> Result<f32, crate::Error> {
    let i0 = match off {
        Off::Engine(o) => o.start_current(),
        Off::Snubber(_) => return Ok(0.0),
    };
    if !(i < i0) {
        return Ok(0.0);
    }
    Ok(match off {
        Off::Engine(o) => o.time_to(i)?.value(),
        Off::Snubber(s) => s.settle_time(i)?.value(),
    })
}

/// One row of the option table.
#[derive(Debug, Clone, PartialEq)]
pub struct OptionRow {
    /// The option.
    pub choice: Choice,
    /// Its topology (as the design file names kinds).
    pub topology: String,
    /// Its label.
    pub label: String,
    /// Switch-off to open contacts at the worst release corner (decay to this unit's release
    /// current plus the mechanical time), s; None without a must-release voltage.
    pub release: Option<f32>,
    /// Switch-off to 1 % of the on-current, s.
    pub off_time: f32,
    /// Peak voltage across the switch, V.
    pub peak_switch: f32,
    /// Energy into the suppression parts (diodes, zener, TVS, varistor, resistor) per
    /// switch-off, J.
    pub clamp_energy: f32,
    /// Energy into the switch per switch-off, J.
    pub switch_energy: f32,
    /// Average power of the suppression parts and the switch together at the switching rate,
    /// W; None without a rate.
    pub power: Option<f32>,
}

/// The energies of an option's whole decay: (suppression parts, switch), J.
fn energies(off: &Off) -> Result<(f32, f32), crate::Error> {
    Ok(match off {
        Off::Engine(o) => {
            let e = o.decay_to_end()?.energy;
            (e.clamp_total.value(), e.switch.value())
        }
        Off::Snubber(s) => (s.response()?.energy_in_resistor.value(), 0.0),
    })
}

/// Every option's figures: peak and energies at the worst switch-voltage corner, release and
/// the time to 1 % at the worst release corner (or the switch-voltage corner without one).
///
/// # Errors
/// A model refusal at either corner, located at the driver.
pub fn option_table(board: &Board, run: &DriverRun) -> Result<Vec<OptionRow>, HostError> {
    let Some((pv, _)) = corner_of(run, View::SwitchVoltage) else {
        return Ok(Vec::new());
    };
    let pr = corner_of(run, View::Release).map_or(pv, |(p, _)| p);
    let fail = |p| move |err: crate::Error| refused(board, &run.d, &run.space, &p, err);
    let at_v = options(run, &pv).map_err(fail(pv))?;
    let at_r = options(run, &pr).map_err(fail(pr))?;
    let i_rel = run
        .d
        .release
        .map(|v| crate::host::figures::magnetic_current(&run.d, v, &pr))
        .transpose()
        .map_err(fail(pr))?;
    let rate = run.d.switching_rate.map(|f| f.value());
    let mut rows = Vec::new();
    for ((choice, off_v), (_, off_r)) in at_v.iter().zip(&at_r) {
        let (clamp_energy, switch_energy) = energies(off_v).map_err(fail(pv))?;
        let i0 = match off_r {
            Off::Engine(o) => o.start_current().value(),
            Off::Snubber(_) => 0.0,
        };
        let off_time = match off_r {
            Off::Engine(_) => time_to(off_r, Amps::new(i0 * 0.01).map_err(fail(pr))?),
            Off::Snubber(s) => s
                .settle_time(Amps::new(1e-6).map_err(fail(pr))?)
                .map(|t| t.value()),
        }
        .map_err(fail(pr))?;
        let release = i_rel
            .map(|i| time_to(off_r, i).map(|t| t + run.d.mechanical.value()))
            .transpose()
            .map_err(fail(pr))?;
        let peak_switch = match off_v {
            Off::Engine(o) => o.peak_switch_voltage().value(),
            Off::Snubber(s) => s.response().map_err(fail(pv))?.peak_switch_voltage.value(),
        };
        rows.push(OptionRow {
            choice: *choice,
            topology: choice.topology(run.d.clamp.kind()),
            label: choice.label(run.d.clamp.kind()),
            release,
            off_time,
            peak_switch,
            clamp_energy,
            switch_energy,
            power: rate.map(|f| (clamp_energy + switch_energy) * f),
        });
    }
    Ok(rows)
}
