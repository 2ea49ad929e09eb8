//! The microcontroller's inputs: series resistor window (sized when "auto"), injection per
//! pin and in total against the limits, back-powering of the rail when it is on (against its
//! minimum load) and when it is off.
//!
//! Axes: the pin supply (nominal and lowest) and the microcontroller's temperature (coldest
//! ambient to its hottest). Worst corner: the injected current (V_sig − V_dd − V_D(I, T))/R
//! rises as V_dd falls and as the clamp diode heats (its drop falls): monotone in both, so
//! the four vertices hold every extreme. A sense line of a driver's output takes its range from
//! that driver's analysis: steadily 0 … the highest supply, transiently the output's extreme
//! with the clamp open (the switch's avalanche), over all of that driver's vertices.

use super::{Bound, Check, Constant, Corner, Limit, Outcome, Status, Unit};
use crate::clamp::Side;
use crate::host::board::{Board, InputBoard, InputsBoard, SignalSource};
use crate::host::engine::DriverRun;
use crate::host::sizing::e24_at_least;
use crate::host::HostError;
use crate::input::rail::{rail_off_check, rail_off_together, RailSource, UnpoweredRail};
use crate::input::resistor::{max_resistor, min_resistor, InjectionLimits, UpperLimits};
use crate::input::{Pin, SignalRange};
use crate::units::{Ohms, Seconds, Temperature, Volts};
use std::format;

/// The four pin corners: (pin supply, temperature).
pub fn pin_corners(board: &Board, p: &InputsBoard) -> [(Volts, Temperature); 4] {
    let (t_lo, t_hi) = (board.ambient.0, p.max_temperature);
    [
        (p.supply.1, t_hi),
        (p.supply.1, t_lo),
        (p.supply.0, t_hi),
        (p.supply.0, t_lo),
    ]
}

/// Words for a pin corner.
fn corner_words(c: &(Volts, Temperature)) -> Corner {
    Corner::At(
        format!("pin supply {}, microcontroller {}", c.0, c.1),
        std::vec![
            super::AxisValue {
                name: "pin_supply",
                value: c.0.value(),
                unit: "V",
            },
            super::AxisValue {
                name: "microcontroller_temperature",
                value: c.1.celsius(),
                unit: "°C",
            },
        ],
    )
}

/// The signal range of an input.
///
/// # Errors
/// A driver's open-clamp range the library refuses.
pub fn signal(
    board: &Board,
    runs: &[DriverRun],
    inp: &InputBoard,
) -> Result<SignalRange, HostError> {
    let fault = |e: crate::Error| board.fault(&format!("{}.sense_of", inp.field), format!("{e}"));
    match inp.source {
        SignalSource::Stated {
            steady,
            transient,
            width,
        } => Ok(SignalRange {
            steady_min: steady.0,
            steady_max: steady.1,
            transient_min: transient.0,
            transient_max: transient.1,
            transient_width: width,
        }),
        SignalSource::SenseOf(k) => {
            let run = runs
                .get(k)
                .ok_or_else(|| board.fault(&format!("{}.sense_of", inp.field), "no such driver"))?;
            let vs = run.d.supply.max.value();
            let (mut lo, mut hi, mut width) = (0.0f32, vs, 0.0f32);
            for f in &run.figures {
                let (out, w) = f
                    .open
                    .map_or((f.peak_output, f.off_time), |o| (o.peak_output, o.width));
                match run.d.side {
                    Side::Low => hi = hi.max(out),
                    Side::High => lo = lo.min(out),
                }
                width = width.max(w);
            }
            let v = |x: f32| Volts::new(x).map_err(fault);
            Ok(SignalRange {
                steady_min: v(0.0)?,
                steady_max: v(vs)?,
                transient_min: v(lo)?,
                transient_max: v(hi)?,
                transient_width: Seconds::new(width).map_err(fault)?,
            })
        }
    }
}

/// The pin at a corner.
fn pin(p: &InputsBoard, c: &(Volts, Temperature)) -> Result<Pin, crate::Error> {
    Pin::new(c.0, p.clamp, c.1)
}

/// The resistor window: the smallest resistor over the pin corners (and where), and the
/// largest the leakage allows.
#[allow(clippy::type_complexity)]
fn window(
    board: &Board,
    p: &InputsBoard,
    sig: &SignalRange,
) -> Result<(f32, (Volts, Temperature), Option<f32>), crate::Error> {
    let limits = InjectionLimits {
        positive: p.limit,
        negative: p.limit,
    };
    let corners = pin_corners(board, p);
    let (mut r_min, mut at) = (0.0f32, corners[0]);
    for c in corners {
        let r = min_resistor(&pin(p, &c)?, sig, limits)?.value();
        if r > r_min {
            (r_min, at) = (r, c);
        }
    }
    let (r_max, _) = max_resistor(&UpperLimits {
        leakage: p.leakage,
        ..UpperLimits::default()
    })?;
    Ok((r_min, at, r_max.map(|r| r.value())))
}

/// The sized resistor: the smallest E24 value 5 % above the minimum, and its check.
fn sized(
    inp: &InputBoard,
    r_min: f32,
    at: &(Volts, Temperature),
    r_max: Option<f32>,
    out: &mut Outcome,
) -> f32 {
    let pick = e24_at_least((r_min * 1.05).max(1.0)).unwrap_or(r_min);
    let fits = r_max.is_none_or(|m| pick <= m);
    let window = format!(
        "window {:.0} Ω … {}",
        r_min,
        r_max.map_or("no upper limit".into(), |m| format!("{m:.0} Ω"))
    );
    let note = if fits {
        format!("smallest E24 value 5 % above the minimum; {window}")
    } else {
        format!("no E24 value fits the {window}: add an external clamp or relax a limit")
    };
    let c = Check::valued(
        &inp.name,
        "series_resistor_sized",
        "series resistor (sized)",
        pick,
        Unit::Ohm,
        None,
        corner_words(at),
    )
    .with_status(if fits { Status::Info } else { Status::Fail })
    .noted(note);
    out.checks.push(c);
    pick
}

/// The resistor: as given, or sized; with its checks against the window.
fn resistor(
    board: &Board,
    p: &InputsBoard,
    inp: &InputBoard,
    sig: &SignalRange,
    out: &mut Outcome,
) -> Result<Ohms, HostError> {
    let fault = |e: crate::Error| board.fault(&inp.field, format!("{e}"));
    let (r_min, at, r_max) = window(board, p, sig).map_err(fault)?;
    let chosen = match inp.resistor {
        Some(r) => r.value(),
        None => sized(inp, r_min, &at, r_max, out),
    };
    let lim = Limit {
        value: chosen,
        bound: Bound::AtMost,
        source: "the resistor used".into(),
    };
    let title = "smallest resistor that keeps the injection within the per-pin limit";
    out.checks.push(Check::valued(
        &inp.name,
        "series_resistor_min",
        title,
        r_min,
        Unit::Ohm,
        Some(lim),
        corner_words(&at),
    ));
    if let Some(m) = r_max {
        let lim = Limit {
            value: m,
            bound: Bound::AtMost,
            source: "the pin leakage's allowed error".into(),
        };
        let c = Check::valued(
            &inp.name,
            "series_resistor_max",
            "series resistor against the leakage error",
            chosen,
            Unit::Ohm,
            Some(lim),
            Corner::Stated("largest leakage".into()),
        );
        out.checks.push(c);
    }
    Ohms::new(chosen).map_err(fault)
}

/// Injection of one input at its worst pin corner: (into the rail, out of ground, steady into
/// the rail) and the corner of the first.
fn injection(
    board: &Board,
    p: &InputsBoard,
    sig: &SignalRange,
    r: Ohms,
) -> Result<([f32; 3], (Volts, Temperature)), crate::Error> {
    let mut worst = [0.0f32; 3];
    let mut at = pin_corners(board, p)[0];
    for c in pin_corners(board, p) {
        let pn = pin(p, &c)?;
        let up = pn.injection(sig.transient_max, r)?.value().max(0.0);
        let down = (-pn.injection(sig.transient_min, r)?.value()).max(0.0);
        let steady = pn.injection(sig.steady_max, r)?.value().max(0.0);
        if up > worst[0] {
            at = c;
        }
        worst = [worst[0].max(up), worst[1].max(down), worst[2].max(steady)];
    }
    Ok((worst, at))
}

/// One input's checks; returns its (worst transient, steady) injection into the rail, for
/// the board's totals.
fn one_input(
    board: &Board,
    runs: &[DriverRun],
    p: &InputsBoard,
    inp: &InputBoard,
    out: &mut Outcome,
) -> Result<(f32, f32, RailSource), HostError> {
    let fault = |e: crate::Error| board.fault(&inp.field, format!("{e}"));
    let sig = signal(board, runs, inp)?;
    let r = resistor(board, p, inp, &sig, out)?;
    out.constants.push(Constant::new(
        &inp.module,
        "SERIES_RESISTOR_OHM",
        libm::roundf(r.value()) as u32,
        "series resistor the analysis used",
    ));
    let ([up, down, steady], at) = injection(board, p, &sig, r).map_err(fault)?;
    let lim = |what: &str| Limit {
        value: p.limit.value(),
        bound: Bound::AtMost,
        source: format!("per-pin injection limit ({what})"),
    };
    out.checks.push(Check::valued(
        &inp.name,
        "injection_in",
        "injection into the rail, worst transient",
        up,
        Unit::Ampere,
        Some(lim("into the rail")),
        corner_words(&at),
    ));
    if down > 0.0 {
        let c = Check::valued(
            &inp.name,
            "injection_out",
            "injection out of ground, worst transient",
            down,
            Unit::Ampere,
            Some(lim("out of ground")),
            Corner::Stated("hottest microcontroller".into()),
        );
        out.checks.push(c);
    }
    let source = RailSource {
        v_signal: sig.steady_max,
        r_series: r,
        count: if inp.present_unpowered { inp.count } else { 0 },
    };
    if inp.present_unpowered {
        rail_off(board, p, inp, &sig, r, out)?;
    }
    Ok((up * inp.count as f32, steady * inp.count as f32, source))
}

/// Every input check of the board.
///
/// # Errors
/// A model refusal, located at the input.
pub fn checks(board: &Board, runs: &[DriverRun]) -> Result<Outcome, HostError> {
    let mut out = Outcome::default();
    let Some(p) = board.inputs.as_ref() else {
        return Ok(out);
    };
    let (mut total, mut steady) = (0.0f32, 0.0f32);
    let mut sources = std::vec::Vec::new();
    for inp in &p.inputs {
        let (t, s, src) = one_input(board, runs, p, inp, &mut out)?;
        total += t;
        steady += s;
        sources.push(src);
    }
    rail_off_board(board, p, &sources, &mut out)?;
    let lim = Limit {
        value: p.total_limit.value(),
        bound: Bound::AtMost,
        source: "total injection limit".into(),
    };
    out.checks.push(Check::valued(
        "board",
        "injection_total",
        "total injection into the rail",
        total,
        Unit::Ampere,
        Some(lim),
        Corner::Stated("every input at its worst transient at once".into()),
    ));
    if let Some(load) = p.rail_min_load {
        let lim = Limit {
            value: load.value(),
            bound: Bound::AtMost,
            source: "the rail's minimum load".into(),
        };
        let c = Check::valued(
            "board",
            "rail_on",
            "steady injection against the rail's minimum load",
            steady,
            Unit::Ampere,
            Some(lim),
            Corner::Stated("every input at its steady maximum".into()),
        )
        .noted("a regulator cannot sink current: above its minimum load the rail rises");
        out.checks.push(c);
    }
    Ok(out)
}

/// The unpowered rail pushed up by every input at its steady maximum at once (a board whose
/// signals stay up while its own supply is off: the drain-sense lines of valves on a live
/// 24 V supply, a sensor powered from elsewhere).
fn rail_off_board(
    board: &Board,
    p: &InputsBoard,
    sources: &[RailSource],
    out: &mut Outcome,
) -> Result<(), HostError> {
    let Some((load, allowed)) = p.rail_off else {
        return Ok(());
    };
    if sources.iter().map(|s| s.count).sum::<u32>() < 2 {
        return Ok(());
    }
    let fault = |e: crate::Error| board.fault("pins.rail_off_load", format!("{e}"));
    let pn = Pin::new(p.supply.0, p.clamp, p.max_temperature).map_err(fault)?;
    let off = rail_off_together(&pn, sources, &UnpoweredRail { load, allowed }).map_err(fault)?;
    let lim = Limit {
        value: allowed.value(),
        bound: Bound::AtMost,
        source: "allowed voltage on the unpowered rail".into(),
    };
    let absent: std::vec::Vec<&str> = p
        .inputs
        .iter()
        .filter(|i| !i.present_unpowered)
        .map(|i| i.name.as_str())
        .collect();
    let c = Check::valued(
        "board",
        "rail_off_total",
        "voltage every input together pushes onto the unpowered rail",
        off.rail_voltage.value(),
        Unit::Volt,
        Some(lim),
        Corner::Stated("every input at its steady maximum at once, hottest microcontroller".into()),
    );
    let mut note = format!(
        "{:.3} mA into the rail's {load} load from all lines together",
        off.current.value() * 1e3
    );
    if !absent.is_empty() {
        note.push_str(&format!(
            " (left out, declared absent while the pins' supply is off: {})",
            absent.join(", ")
        ));
    }
    out.checks.push(if off.verdict.pass {
        c.noted(note)
    } else {
        c.with_status(Status::Fail).noted(format!("{note}: parts on the rail may half-power while it is off: larger series resistors, a lower pins.rail_off_load (a bleeder) or a clamp to a powered rail"))
    });
    Ok(())
}

/// The unpowered rail pushed up by one input's steady signal.
fn rail_off(
    board: &Board,
    p: &InputsBoard,
    inp: &InputBoard,
    sig: &SignalRange,
    r: Ohms,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let Some((load, allowed)) = p.rail_off else {
        return Ok(());
    };
    let fault = |e: crate::Error| board.fault(&inp.field, format!("{e}"));
    let pn = Pin::new(p.supply.0, p.clamp, p.max_temperature).map_err(fault)?;
    let off =
        rail_off_check(&pn, sig.steady_max, r, &UnpoweredRail { load, allowed }).map_err(fault)?;
    let lim = Limit {
        value: allowed.value(),
        bound: Bound::AtMost,
        source: "allowed voltage on the unpowered rail".into(),
    };
    let c = Check::valued(
        &inp.name,
        "rail_off",
        "voltage the signal pushes onto the unpowered rail",
        off.rail_voltage.value(),
        Unit::Volt,
        Some(lim),
        Corner::Stated("steady maximum signal, hottest microcontroller".into()),
    );
    // The allowed voltage is the design's own requirement (pins.rail_off_allowed): beyond it
    // the check fails, like every other limit.
    out.checks.push(if off.verdict.pass {
        c
    } else {
        c.with_status(Status::Fail)
            .noted("parts on the rail may half-power while it is off: a larger series resistor, a lower pins.rail_off_load (a bleeder) or a clamp to a powered rail")
    });
    Ok(())
}
