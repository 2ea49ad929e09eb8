//! All the inputs of a board at once: per-pin and total injection against the limits, and the
//! rail-on back-powering check, in fixed-capacity storage.
//!
//! Worst case, stated: every pin's injection is evaluated at its signal's transient extremes and
//! at the steady extremes; the totals add every pin at its extreme *at the same time* (the
//! conservative assumption when the lines share a cause, such as a surge on a common sensor
//! supply). The rail-on check uses the steady total (a transient is absorbed by the rail's
//! capacitance; its charge is not modelled here).

use super::rail::RailLoad;
use super::resistor::InjectionLimits;
use super::{Pin, SignalRange};
use crate::error::{Error, Reason};
use crate::rating::Verdict;
use crate::slots::Slots;
use crate::units::{Amps, Ohms};

/// One input of the board: a name for the report, its signal, its series resistor and the pin's
/// injection limits.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BoardInput {
    /// Name in the report.
    pub name: &'static str,
    /// The outside signal.
    pub signal: SignalRange,
    /// The series resistor.
    pub resistor: Ohms,
    /// The pin's per-pin injection limits.
    pub limits: InjectionLimits,
}

/// The result for one input.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct InputResult {
    /// Name of the input.
    pub name: &'static str,
    /// Injection at the transient maximum (into the rail, ≥ 0).
    pub transient_positive: Amps,
    /// Injection at the transient minimum (out of ground, ≤ 0).
    pub transient_negative: Amps,
    /// Injection at the steady maximum.
    pub steady_positive: Amps,
    /// Verdict of the positive injection against its limit.
    pub positive: Verdict,
    /// Verdict of the negative injection against its limit.
    pub negative: Verdict,
}

/// The board's result.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BoardReport<const N: usize> {
    /// Each input.
    pub inputs: Slots<InputResult, N>,
    /// Sum of the positive transient injections.
    pub total_positive: Amps,
    /// Sum of the negative transient injections (≤ 0).
    pub total_negative: Amps,
    /// Total positive against its limit.
    pub total_positive_verdict: Verdict,
    /// Total negative against its limit.
    pub total_negative_verdict: Verdict,
    /// Steady positive total against the rail's minimum load (None if not given).
    pub rail_on: Option<Verdict>,
    /// True when every verdict passes.
    pub pass: bool,
    /// Smallest margin of all the verdicts, the one that decides.
    pub worst_margin: f32,
}

/// A board: the pins' common supply, clamps and temperature, the total limits, and up to `N`
/// inputs.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Board<const N: usize> {
    pin: Pin,
    total: InjectionLimits,
    rail: Option<RailLoad>,
    inputs: Slots<BoardInput, N>,
}

impl<const N: usize> Board<N> {
    /// An empty board. `pin` gives the supply (use its lowest value), clamp diodes and hottest
    /// temperature; `total` the limits summed over all pins; `rail` the rail's minimum load, if
    /// the rail-on check should be made. Everything is validated by [`Board::check`].
    pub fn new(pin: Pin, total: InjectionLimits, rail: Option<RailLoad>) -> Self {
        Board {
            pin,
            total,
            rail,
            inputs: Slots::new(),
        }
    }

    /// Adds an input. When the board is full the input is handed back (no panic, no loss).
    ///
    /// # Errors
    /// The board already holds `N` inputs: `Err(input)`.
    pub fn add(&mut self, input: BoardInput) -> Result<(), BoardInput> {
        self.inputs.push(input)
    }

    /// Checks every input and the totals.
    ///
    /// Work: three injections per input (each at most two bounded Newton solves).
    ///
    /// # Errors
    /// A limit ≤ 0 → [`Reason::NotPositive`] naming it; errors of [`SignalRange::validate`] and
    /// [`Pin::injection`].
    ///
    /// ```
    /// use kickguard::input::board::{Board, BoardInput};
    /// use kickguard::input::{rail::RailLoad, resistor::InjectionLimits, Pin, SignalRange};
    /// use kickguard::{diode::{Diode, DiodeParams}, Amps, Ohms, Seconds, Temperature, Volts};
    /// let pin = Pin::new(Volts::new(3.0)?, Diode::Law(DiodeParams::SILICON),
    ///                    Temperature::from_celsius(85.0)?)?;
    /// let ma = |x: f32| Amps::new(x * 1e-3);
    /// let total = InjectionLimits { positive: ma(20.0)?, negative: ma(20.0)? };
    /// let mut board: Board<4> = Board::new(pin, total, Some(RailLoad::new(ma(8.0)?)?));
    /// let rain = SignalRange { steady_min: Volts::new(0.0)?, steady_max: Volts::new(24.0)?,
    ///     transient_min: Volts::new(-2.0)?, transient_max: Volts::new(30.0)?,
    ///     transient_width: Seconds::new(1e-3)? };
    /// let limits = InjectionLimits { positive: ma(5.0)?, negative: ma(5.0)? };
    /// board.add(BoardInput { name: "rain", signal: rain, resistor: Ohms::new(10_000.0)?, limits })
    ///     .map_err(|_| kickguard::Error::new("board", kickguard::Reason::TooLarge))?;
    /// let report = board.check()?;
    /// assert!(report.pass);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn check(&self) -> Result<BoardReport<N>, Error> {
        let mut inputs: Slots<InputResult, N> = Slots::new();
        let (mut tot_pos, mut tot_neg, mut steady_pos) = (0.0f32, 0.0f32, 0.0f32);
        let mut worst = f32::INFINITY;
        let mut pass = true;
        self.pin.validate()?;
        for inp in self.inputs.iter() {
            inp.signal.validate()?;
            inp.limits.validate()?;
            let pos = self
                .pin
                .injection(inp.signal.transient_max, inp.resistor)?
                .value()
                .max(0.0);
            let neg = self
                .pin
                .injection(inp.signal.transient_min, inp.resistor)?
                .value()
                .min(0.0);
            let st = self
                .pin
                .injection(inp.signal.steady_max, inp.resistor)?
                .value()
                .max(0.0);
            let vp = Verdict::of(pos, inp.limits.positive.value(), "positive injection limit")?;
            let vn = Verdict::of(
                -neg,
                inp.limits.negative.value(),
                "negative injection limit",
            )?;
            pass &= vp.pass && vn.pass;
            worst = worst.min(vp.margin).min(vn.margin);
            tot_pos += pos;
            tot_neg += neg;
            steady_pos += st;
            let result = InputResult {
                name: inp.name,
                transient_positive: Amps::new(pos)?,
                transient_negative: Amps::new(neg)?,
                steady_positive: Amps::new(st)?,
                positive: vp,
                negative: vn,
            };
            // Cannot overflow: `inputs` has the same capacity as `self.inputs`.
            if inputs.push(result).is_err() {
                return Err(Error::new("board inputs", Reason::TooLarge));
            }
        }
        let tpv = Verdict::of(
            tot_pos,
            self.total.positive.value(),
            "total positive injection limit",
        )?;
        let tnv = Verdict::of(
            -tot_neg,
            self.total.negative.value(),
            "total negative injection limit",
        )?;
        pass &= tpv.pass && tnv.pass;
        worst = worst.min(tpv.margin).min(tnv.margin);
        let rail_on = match self.rail {
            Some(load) => {
                let v = load.check(Amps::new(steady_pos)?)?;
                pass &= v.pass;
                worst = worst.min(v.margin);
                Some(v)
            }
            None => None,
        };
        Ok(BoardReport {
            inputs,
            total_positive: Amps::new(tot_pos)?,
            total_negative: Amps::new(tot_neg)?,
            total_positive_verdict: tpv,
            total_negative_verdict: tnv,
            rail_on,
            pass,
            worst_margin: worst,
        })
    }
}
