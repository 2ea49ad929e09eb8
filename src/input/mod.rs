//! Input protection: a microcontroller pin reading an outside signal through a series resistor,
//! with the pin's internal clamp diodes to its supply and to ground taking the excess current.
//!
//! Read in this order: [`Pin`] (the pin and its diodes, a [`Diode`]), [`SignalRange`] (what
//! the outside line can do, including the output-sense case of an open clamp),
//! [`Pin::injection`] (the current at an operating point), [`resistor`] (the smallest and
//! largest series resistor, and its power), [`rail`] (back-powering the supply rail, on and off),
//! and [`board`] (all the inputs of a board against the per-pin and total limits).
//!
//! Circuit: source V_s → R → pin node. Above V_DD the upper diode (pin → V_DD) conducts, below
//! 0 V the lower one (ground → pin). The injected current solves
//!
//! ```text
//! V_s − V_DD = I·R + V_D(I)      (positive injection, into the rail)
//! −V_s       = I·R + V_D(I)      (negative injection, out of ground), I reported negative
//! ```
//!
//! with V_D the diode law at the pin's temperature ([`crate::diode`]) or a stated fixed drop.
//! Between −V_D(0⁺) and V_DD nothing is injected (the pin's own leakage, nA, is ignored here
//! and treated separately in the resistor limits). Using the diode law instead of a fixed 0.6 V
//! matters: hot, the drop falls and more current flows through the same resistor.

pub mod board;
pub mod rail;
pub mod resistor;

use crate::clamp::SwitchOff;
use crate::diode::Diode;
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Ohms, Seconds, Temperature, Volts};

/// A microcontroller pin: its supply, its clamp diodes and its temperature. Fields are public
/// for readable literals; every function that takes a pin validates it ([`Pin::new`] does the
/// same check up front).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Pin {
    /// Supply voltage of the pin's I/O domain (the upper clamp's rail), 0 … 60 V; 0 V only for a
    /// limiter to ground or the unpowered-rail check.
    pub vdd: Volts,
    /// The clamp diodes: their law at the pin's temperature, or a stated drop.
    pub clamp: Diode,
    /// Junction temperature of the microcontroller.
    pub temperature: Temperature,
}

/// The range of an outside signal: what it does steadily, and what it can do briefly. Fields
/// are public for readable literals (four voltages are named, not positional); every function
/// that takes a range validates it ([`SignalRange::validate`]).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SignalRange {
    /// Lowest steady voltage.
    pub steady_min: Volts,
    /// Highest steady voltage (≥ `steady_min`).
    pub steady_max: Volts,
    /// Lowest transient voltage (≤ `steady_min`).
    pub transient_min: Volts,
    /// Highest transient voltage (≥ `steady_max`).
    pub transient_max: Volts,
    /// Longest duration of a transient, for the resistor's pulse energy.
    pub transient_width: Seconds,
}

impl SignalRange {
    /// Checks the range's order.
    ///
    /// # Errors
    /// `steady_max` < `steady_min` → [`Reason::NotIncreasing`] on `"steady range"`; a transient
    /// range that does not contain the steady one → [`Reason::Inconsistent`] on
    /// `"transient range"`.
    ///
    /// ```
    /// use kickguard::input::SignalRange;
    /// use kickguard::{Seconds, Volts};
    /// let inverted = SignalRange { steady_min: Volts::new(24.0)?, steady_max: Volts::new(0.0)?,
    ///     transient_min: Volts::new(0.0)?, transient_max: Volts::new(24.0)?,
    ///     transient_width: Seconds::new(1e-3)? };
    /// assert_eq!(inverted.validate().unwrap_err().input, "steady range");
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn validate(&self) -> Result<(), Error> {
        if !(self.steady_max >= self.steady_min) {
            return Err(Error::new("steady range", Reason::NotIncreasing));
        }
        if !(self.transient_min <= self.steady_min && self.transient_max >= self.steady_max) {
            return Err(Error::new("transient range", Reason::Inconsistent));
        }
        Ok(())
    }

    /// The sense line of a switch's output (a drain-sense or output-sense input), sized for
    /// the case it must survive: the clamp failed open, so the output swings as far as the
    /// switch's own avalanche (or internal clamp) takes it, for as long as that decay lasts.
    /// `open_clamp` is that switch-off (for example [`crate::clamp::Clamp::Avalanche`] at the
    /// switch's breakdown voltage, at the corner with the most current). Steadily the line is
    /// between 0 V and the supply; the transient reaches the open-clamp output's extreme: above
    /// the supply on a low-side switch, below ground on a high-side one.
    ///
    /// # Errors
    /// An open-clamp decay that never ends (a steady leak) → [`Reason::Unreachable`] on
    /// `"end current"`; a duration beyond the quantity bounds → the errors of [`Seconds::new`].
    pub fn output_sense(open_clamp: &SwitchOff) -> Result<Self, Error> {
        let zero = Volts::raw(0.0);
        let vs = open_clamp.supply();
        let peak = open_clamp.peak_output_voltage();
        let width = open_clamp.decay_to_end()?.time;
        let (t_min, t_max) = if peak < zero {
            (peak, vs)
        } else if peak > vs {
            (zero, peak)
        } else {
            (zero, vs)
        };
        let r = SignalRange {
            steady_min: zero,
            steady_max: vs,
            transient_min: t_min,
            transient_max: t_max,
            transient_width: width,
        };
        r.validate()?;
        Ok(r)
    }
}

impl Pin {
    /// A pin with supply `vdd`, clamp diodes `clamp`, at `t`.
    ///
    /// # Errors
    /// `vdd` ≤ 0 → [`Reason::NotPositive`] on `"pin supply"` (for the unpowered rail use
    /// [`rail::rail_off_check`]; for a pair of diodes to ground, [`Pin::limiter_to_ground`]);
    /// the rest as [`Pin::validate`].
    pub fn new(vdd: Volts, clamp: Diode, t: Temperature) -> Result<Self, Error> {
        if !(vdd.value() > 0.0) {
            return Err(Error::new("pin supply", Reason::NotPositive));
        }
        let pin = Pin {
            vdd,
            clamp,
            temperature: t,
        };
        pin.validate()?;
        Ok(pin)
    }

    /// A two-diode limiter: antiparallel clamp diodes from the node to ground (the "rail" is
    /// ground), which hold the node within a diode drop of 0 V either way.
    ///
    /// # Errors
    /// As [`Pin::validate`].
    pub fn limiter_to_ground(clamp: Diode, t: Temperature) -> Result<Self, Error> {
        let pin = Pin {
            vdd: Volts::raw(0.0),
            clamp,
            temperature: t,
        };
        pin.validate()?;
        Ok(pin)
    }

    /// Checks a pin's fields.
    ///
    /// # Errors
    /// `vdd` < 0 → [`Reason::Negative`], above 60 V → [`Reason::OutsideValidatedRange`], on
    /// `"pin supply"`; a fixed drop ≤ 0 or above 10 V → on `"diode drop"`; `temperature`
    /// outside the diode model's range → [`Reason::OutsideValidatedRange`] on `"temperature"`.
    pub fn validate(&self) -> Result<(), Error> {
        let v = self.vdd.value();
        if !(v >= 0.0) {
            return Err(Error::new("pin supply", Reason::Negative));
        }
        error::within("pin supply", v, 0.0, 60.0)?;
        self.clamp.checked_fixed_drop()?;
        crate::diode::params::checked_t("temperature", self.temperature)?;
        Ok(())
    }

    /// Current through one clamp diode driven by `excess` volts through `r` (excess ≤ 0 → 0).
    pub(crate) fn diode_current(&self, excess: f32, r: Ohms) -> Result<f32, Error> {
        if !(excess > 0.0) {
            return Ok(0.0);
        }
        match self.clamp {
            Diode::Law(d) => Ok(d
                .series_current(Volts::new(excess)?, r, self.temperature)?
                .value()),
            Diode::FixedDrop(vf) => {
                let over = excess - vf.value();
                if !(over > 0.0) {
                    Ok(0.0)
                } else if r.value() > 0.0 {
                    Ok(over / r.value())
                } else {
                    Err(Error::new("series resistor", Reason::NotPositive))
                }
            }
        }
    }

    /// The clamp's forward drop at current `i` (> 0).
    pub(crate) fn drop_at(&self, i: Amps) -> Result<f32, Error> {
        Ok(self.clamp.forward_drop(i, self.temperature)?.value())
    }

    /// Injected current when the outside line is at `v_signal` and the series resistor is `r`:
    /// positive into the pin's supply rail, negative out of ground, zero in between.
    ///
    /// Accuracy: that of [`crate::diode::DiodeParams::series_current`] (1e-5 relative), exact
    /// for a fixed drop. Work: at most two bounded Newton solves (≤ 64 steps each).
    ///
    /// # Errors
    /// As [`Pin::validate`]; a fixed-drop clamp with `r` = 0 while conducting →
    /// [`Reason::NotPositive`] on `"series resistor"`; errors of
    /// [`crate::diode::DiodeParams::series_current`].
    ///
    /// ```
    /// use kickguard::input::Pin;
    /// use kickguard::{diode::{Diode, DiodeParams}, Ohms, Temperature, Volts};
    /// let pin = Pin::new(Volts::new(3.3)?, Diode::Law(DiodeParams::SILICON),
    ///                    Temperature::from_celsius(25.0)?)?;
    /// let i = pin.injection(Volts::new(24.0)?, Ohms::new(10_000.0)?)?;
    /// assert!((i.value() - (24.0 - 3.3 - 0.6) / 10_000.0).abs() < 0.1e-3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn injection(&self, v_signal: Volts, r: Ohms) -> Result<Amps, Error> {
        self.validate()?;
        let v = v_signal.value();
        let up = self.diode_current(v - self.vdd.value(), r)?;
        let down = self.diode_current(-v, r)?;
        Amps::new(up - down)
    }

    /// The pin node's voltage at that operating point: V_s − I·R.
    ///
    /// # Errors
    /// As [`Pin::injection`].
    pub fn pin_voltage(&self, v_signal: Volts, r: Ohms) -> Result<Volts, Error> {
        let i = self.injection(v_signal, r)?;
        Volts::new(error::result(
            "pin voltage",
            v_signal.value() - i.value() * r.value(),
        )?)
    }
}
