//! Input protection: a microcontroller pin reading an outside signal through a series resistor,
//! with the pin's internal clamp diodes to its supply and to ground taking the excess current.
//!
//! Read in this order: [`PinClamp`] and [`Pin`] (the pin and its diodes), [`SignalRange`] (what
//! the outside line can do, including the drain-sense case of an open freewheeling diode),
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

use crate::diode::DiodeParams;
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Ohms, Seconds, Temperature, Volts};

/// How the pin's clamp diodes are described.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum PinClamp {
    /// Both clamp diodes follow this diode law (at the pin's temperature).
    DiodeLaw(DiodeParams),
    /// A stated forward drop, the same at any current (the datasheet's "V_DD + 0.3 V" style).
    FixedDrop(Volts),
}

/// A microcontroller pin: its supply, its clamp diodes and its temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Pin {
    /// Supply voltage of the pin's I/O domain (the upper clamp's rail); 0 V only for a limiter to
    /// ground or the unpowered-rail check.
    pub vdd: Volts,
    /// The clamp diodes.
    pub clamp: PinClamp,
    /// Junction temperature of the microcontroller.
    pub temperature: Temperature,
}

/// The range of an outside signal: what it does steadily, and what it can do briefly.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SignalRange {
    /// Lowest steady voltage.
    pub steady_min: Volts,
    /// Highest steady voltage.
    pub steady_max: Volts,
    /// Lowest transient voltage (≤ `steady_min`).
    pub transient_min: Volts,
    /// Highest transient voltage (≥ `steady_max`).
    pub transient_max: Volts,
    /// Longest duration of a transient, for the resistor's pulse energy.
    pub transient_width: Seconds,
}

impl SignalRange {
    /// A validated range.
    ///
    /// # Errors
    /// `steady_max` < `steady_min` → [`Reason::NotIncreasing`] on `"steady range"`; a transient
    /// range that does not contain the steady one → [`Reason::Inconsistent`] on
    /// `"transient range"`.
    pub fn new(
        steady_min: Volts,
        steady_max: Volts,
        transient_min: Volts,
        transient_max: Volts,
        transient_width: Seconds,
    ) -> Result<Self, Error> {
        if !(steady_max >= steady_min) {
            return Err(Error::new("steady range", Reason::NotIncreasing));
        }
        if !(transient_min <= steady_min && transient_max >= steady_max) {
            return Err(Error::new("transient range", Reason::Inconsistent));
        }
        Ok(SignalRange {
            steady_min,
            steady_max,
            transient_min,
            transient_max,
            transient_width,
        })
    }

    /// A drain-sense line on a low-side switch: steadily between 0 V and the coil supply, and in
    /// a transient up to the highest voltage the drain can reach *with the freewheeling diode
    /// failed open*, which is the switch's avalanche (breakdown) voltage, for as long as the
    /// avalanche lasts. Sizing the input for this case keeps it safe after that fault.
    ///
    /// # Errors
    /// `v_breakdown` ≤ `v_supply` → [`Reason::CannotClamp`] on `"breakdown voltage"`.
    ///
    /// ```
    /// use kickguard::input::SignalRange;
    /// use kickguard::{Seconds, Volts};
    /// let s = SignalRange::drain_sense_open_diode(Volts::new(24.0).unwrap(), Volts::new(66.0).unwrap(),
    ///                                             Seconds::new(3e-3).unwrap()).unwrap();
    /// assert_eq!(s.transient_max.value(), 66.0);
    /// ```
    pub fn drain_sense_open_diode(
        v_supply: Volts,
        v_breakdown: Volts,
        avalanche_time: Seconds,
    ) -> Result<Self, Error> {
        if !(v_breakdown > v_supply) {
            return Err(Error::new("breakdown voltage", Reason::CannotClamp));
        }
        let zero = Volts::raw(0.0);
        SignalRange::new(zero, v_supply, zero, v_breakdown, avalanche_time)
    }
}

impl Pin {
    /// A pin with supply `vdd`, clamp diodes `clamp`, at `t`.
    ///
    /// # Errors
    /// `vdd` ≤ 0 → [`Reason::NotPositive`] on `"pin supply"` (for the unpowered rail use
    /// [`rail::rail_off_check`]; for a pair of diodes to ground, [`Pin::limiter_to_ground`]); a
    /// fixed drop ≤ 0 → [`Reason::NotPositive`] on `"clamp drop"`; `t` outside the diode model's
    /// range → [`Reason::OutsideValidatedRange`] on `"temperature"`.
    pub fn new(vdd: Volts, clamp: PinClamp, t: Temperature) -> Result<Self, Error> {
        if !(vdd.value() > 0.0) {
            return Err(Error::new("pin supply", Reason::NotPositive));
        }
        Pin::checked(vdd, clamp, t)
    }

    /// A two-diode limiter: antiparallel clamp diodes from the node to ground (the "rail" is
    /// ground), which hold the node within a diode drop of 0 V either way.
    ///
    /// # Errors
    /// As [`Pin::new`], without the supply check.
    pub fn limiter_to_ground(clamp: PinClamp, t: Temperature) -> Result<Self, Error> {
        Pin::checked(Volts::raw(0.0), clamp, t)
    }

    fn checked(vdd: Volts, clamp: PinClamp, t: Temperature) -> Result<Self, Error> {
        if let PinClamp::FixedDrop(v) = clamp {
            if !(v.value() > 0.0) {
                return Err(Error::new("clamp drop", Reason::NotPositive));
            }
        }
        crate::diode::params::checked_t("temperature", t)?;
        Ok(Pin {
            vdd,
            clamp,
            temperature: t,
        })
    }

    /// Current through one clamp diode driven by `excess` volts through `r` (excess ≤ 0 → 0).
    pub(crate) fn diode_current(&self, excess: f32, r: Ohms) -> Result<f32, Error> {
        if !(excess > 0.0) {
            return Ok(0.0);
        }
        match self.clamp {
            PinClamp::DiodeLaw(d) => Ok(d
                .series_current(Volts::new(excess)?, r, self.temperature)?
                .value()),
            PinClamp::FixedDrop(vf) => {
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
        match self.clamp {
            PinClamp::DiodeLaw(d) => Ok(d.forward_drop(i, self.temperature)?.value()),
            PinClamp::FixedDrop(vf) => Ok(vf.value()),
        }
    }

    /// Injected current when the outside line is at `v_signal` and the series resistor is `r`:
    /// positive into the pin's supply rail, negative out of ground, zero in between.
    ///
    /// Accuracy: that of [`DiodeParams::series_current`] (1e-5 relative), exact for a fixed drop.
    ///
    /// # Errors
    /// A fixed-drop clamp with `r` = 0 while conducting → [`Reason::NotPositive`] on
    /// `"series resistor"`; errors of [`DiodeParams::series_current`].
    ///
    /// ```
    /// use kickguard::input::{Pin, PinClamp};
    /// use kickguard::{diode::DiodeParams, Ohms, Temperature, Volts};
    /// let pin = Pin::new(Volts::new(3.3).unwrap(), PinClamp::DiodeLaw(DiodeParams::SILICON),
    ///                    Temperature::from_celsius(25.0).unwrap()).unwrap();
    /// let i = pin.injection(Volts::new(24.0).unwrap(), Ohms::new(10_000.0).unwrap()).unwrap();
    /// assert!((i.value() - (24.0 - 3.3 - 0.6) / 10_000.0).abs() < 0.1e-3);
    /// ```
    pub fn injection(&self, v_signal: Volts, r: Ohms) -> Result<Amps, Error> {
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
