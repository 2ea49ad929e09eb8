//! Configuration time: the window of measurements for the healthy circuit and for each fault,
//! their separability, and their conversion to timer ticks.
//!
//! Method: corner analysis. Every measurement here is monotonic in each toleranced quantity
//! (inductance, resistance, supply, winding and clamp temperature) over its range: the decay
//! time grows with L, with the on-current (lower R, higher supply) and with a lower clamp
//! voltage. So its extremes are at the 2⁵ = 32 corners, and the window is [min, max] over them.
//! (The tests check this against a dense interior grid.) The on-current is V/R(T); the switch's
//! own on-resistance is taken as part of the coil resistance tolerance.

use super::classify::{BandedWindows, Entry, Windows, MAX_WINDOWS};
use super::Condition;
use crate::breakdown::Breakdown;
use crate::clamp::{Clamp, Operating, Side, SwitchOff};
use crate::coil::Coil;
use crate::error::{self, Error, Reason};
use crate::timing::{to_ticks, to_ticks_floor};
use crate::units::{Amps, Duty, Hertz, Ohms, Seconds, Temperature, Volts};

/// What the firmware measures on each switch-off.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Measurement {
    /// How long the switch voltage stays above `threshold` (a comparator on a divider from the
    /// switch node). For a plain diode clamp put the threshold above the supply.
    SwitchAbove {
        /// Comparator threshold, referred to the switch node.
        threshold: Volts,
    },
    /// Time for the current to fall from `upper` to `lower` (a current-sense comparator with two
    /// thresholds). If the start current is below `upper`, timing starts at switch-off.
    BetweenCurrents {
        /// Upper threshold.
        upper: Amps,
        /// Lower threshold.
        lower: Amps,
    },
}

/// A coil driver and its tolerances, for diagnosis.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Design {
    /// Nominal coil.
    pub coil: Coil,
    /// Relative tolerance of L (0.1 = ±10 %).
    pub inductance_tolerance: f32,
    /// Relative tolerance of R at its reference temperature.
    pub resistance_tolerance: f32,
    /// Lowest supply.
    pub v_supply_min: Volts,
    /// Highest supply.
    pub v_supply_max: Volts,
    /// Coldest winding.
    pub t_winding_min: Temperature,
    /// Hottest allowed winding (above it: [`Condition::CoilTooHot`]).
    pub t_winding_max: Temperature,
    /// Hottest winding considered for the too-hot fault window.
    pub t_winding_fault_max: Temperature,
    /// Coldest clamp parts.
    pub t_clamp_min: Temperature,
    /// Hottest clamp parts.
    pub t_clamp_max: Temperature,
    /// The healthy clamp.
    pub clamp: Clamp,
    /// The switch's own avalanche, which takes over when the clamp path opens.
    pub switch_avalanche: Breakdown,
    /// Fraction of the turns shorted in the shorted-turns fault (for example 0.1).
    pub shorted_turns: f32,
}

/// A window of measured times.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TimeWindow {
    /// Shortest time over the corners.
    pub min: Seconds,
    /// Longest time over the corners.
    pub max: Seconds,
}

/// How well a fault's window stands apart from the healthy one.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Separation {
    /// The fault.
    pub condition: Condition,
    /// Its window.
    pub window: TimeWindow,
    /// Gap between this window and the healthy one, in seconds (negative: they overlap by that
    /// much, and the fault cannot be told from health by this measurement).
    pub gap: f32,
    /// Gap relative to the healthy window's width (how many healthy widths apart); a healthy
    /// window narrower than 1 ns counts as 1 ns wide, so the figure is always finite.
    pub relative_gap: f32,
    /// True when the gap is positive: the fault is detectable.
    pub detectable: bool,
}

/// Winding temperature from the measured on-current at a known supply, by the resistance method:
/// R = V/I, then [`Coil::winding_temperature`]. Catches a coil that is hotter than allowed without
/// waiting for a decay.
///
/// # Errors
/// `v_supply` ≤ 0 → [`Reason::NotPositive`] on `"supply voltage"`; `i_on` ≤ 0 →
/// [`Reason::NotPositive`] on `"on-current"` (an open coil); errors of
/// [`Coil::winding_temperature`].
pub fn winding_temperature_from_current(
    coil: &Coil,
    v_supply: Volts,
    i_on: Amps,
) -> Result<Temperature, Error> {
    error::positive("supply voltage", v_supply.value())?;
    let i = i_on.value();
    if !(i > 0.0) {
        return Err(Error::new("on-current", Reason::NotPositive));
    }
    coil.winding_temperature(Ohms::new(v_supply.value() / i)?)
}

impl Design {
    fn check(&self) -> Result<(), Error> {
        for (name, tol) in [
            ("inductance tolerance", self.inductance_tolerance),
            ("resistance tolerance", self.resistance_tolerance),
        ] {
            let t = error::non_negative(name, tol)?;
            if !(t < 0.5) {
                return Err(Error::new(name, Reason::OutsideValidatedRange));
            }
        }
        let f = error::non_negative("shorted turns", self.shorted_turns)?;
        if !(f > 0.0 && f < 1.0) {
            return Err(Error::new("shorted turns", Reason::OutsideValidatedRange));
        }
        if !(self.v_supply_max >= self.v_supply_min && self.v_supply_min.value() > 0.0) {
            return Err(Error::new("supply range", Reason::NotIncreasing));
        }
        if !(self.t_winding_max >= self.t_winding_min
            && self.t_winding_fault_max > self.t_winding_max)
        {
            return Err(Error::new(
                "winding temperature range",
                Reason::NotIncreasing,
            ));
        }
        if !(self.t_clamp_max >= self.t_clamp_min) {
            return Err(Error::new("clamp temperature range", Reason::NotIncreasing));
        }
        for (name, t) in [
            ("coldest winding", self.t_winding_min),
            ("fault winding temperature", self.t_winding_fault_max),
            ("coldest clamp", self.t_clamp_min),
            ("hottest clamp", self.t_clamp_max),
        ] {
            error::within(name, t.kelvin(), crate::coil::T_MIN_K, crate::coil::T_MAX_K)?;
        }
        Ok(())
    }

    /// The circuit of `cond`: (clamp, L scale, R scale, winding range), or None if the condition
    /// does not apply to this clamp (a zener fault without a zener) or has no decay (coil open).
    fn circuit(&self, cond: Condition) -> Option<(Clamp, f32, f32, Temperature, Temperature)> {
        let av = Clamp::Avalanche(self.switch_avalanche);
        let (tmin, tmax) = (self.t_winding_min, self.t_winding_max);
        let f = self.shorted_turns;
        match cond {
            Condition::Healthy => Some((self.clamp, 1.0, 1.0, tmin, tmax)),
            Condition::FreewheelOpen => match self.clamp {
                Clamp::Avalanche(_) => None,
                _ => Some((av, 1.0, 1.0, tmin, tmax)),
            },
            Condition::ZenerShorted => match self.clamp {
                Clamp::ZenerDiode { diode, .. } => {
                    Some((Clamp::FreewheelDiode(diode), 1.0, 1.0, tmin, tmax))
                }
                _ => None,
            },
            Condition::CoilOpen => None,
            Condition::ShortedTurns => {
                Some((self.clamp, (1.0 - f) * (1.0 - f), 1.0 - f, tmin, tmax))
            }
            Condition::CoilTooHot => Some((self.clamp, 1.0, 1.0, tmax, self.t_winding_fault_max)),
        }
    }

    fn measure(off: &SwitchOff, m: &Measurement) -> Result<f32, Error> {
        match *m {
            Measurement::SwitchAbove { threshold } => {
                // A switch voltage that never reaches the threshold reads zero.
                if !(threshold < off.peak_switch_voltage()) {
                    return Ok(0.0);
                }
                Ok(off.time_above(threshold)?.value())
            }
            Measurement::BetweenCurrents { upper, lower } => {
                if !(upper > lower) {
                    return Err(Error::new("upper current threshold", Reason::NotIncreasing));
                }
                let i0 = off.start_current();
                if !(lower < i0) {
                    return Ok(0.0);
                }
                let t_lo = off.time_to(lower)?.value();
                let t_up = if upper < i0 {
                    off.time_to(upper)?.value()
                } else {
                    0.0
                };
                Ok(t_lo - t_up)
            }
        }
    }

    /// The window of `m` under `cond`, over every corner of the tolerances; `None` when the
    /// condition does not apply to this clamp. A coil-open fault reads zero.
    ///
    /// # Errors
    /// Invalid tolerances or ranges → the error names them; errors of the clamp engine at a
    /// corner (for example a threshold the comparator never reaches there).
    pub fn window(&self, cond: Condition, m: &Measurement) -> Result<Option<TimeWindow>, Error> {
        self.check()?;
        if cond == Condition::CoilOpen {
            let z = Seconds::raw(0.0);
            return Ok(Some(TimeWindow { min: z, max: z }));
        }
        let Some((clamp, l_scale, r_scale, tw_min, tw_max)) = self.circuit(cond) else {
            return Ok(None);
        };
        let (lo, hi) = (f32::INFINITY, f32::NEG_INFINITY);
        let mut acc = (lo, hi);
        let base = self.coil.scaled(l_scale, r_scale)?;
        for corner in 0u32..32 {
            let pick = |bit: u32, a: f32, b: f32| if corner & (1 << bit) == 0 { a } else { b };
            let coil = base.scaled(
                pick(
                    0,
                    1.0 - self.inductance_tolerance,
                    1.0 + self.inductance_tolerance,
                ),
                pick(
                    1,
                    1.0 - self.resistance_tolerance,
                    1.0 + self.resistance_tolerance,
                ),
            )?;
            let vs = Volts::new(pick(
                2,
                self.v_supply_min.value(),
                self.v_supply_max.value(),
            ))?;
            let tw = Temperature::from_kelvin(pick(3, tw_min.kelvin(), tw_max.kelvin()))?;
            let tc = Temperature::from_kelvin(pick(
                4,
                self.t_clamp_min.kelvin(),
                self.t_clamp_max.kelvin(),
            ))?;
            let op = Operating {
                supply: vs,
                start_current: coil.steady_current(vs, tw)?,
                winding: tw,
                diodes: tc,
                breakdown: tc,
            };
            let off = SwitchOff::new(&coil, &clamp, Side::Low, &op)?;
            let t = Self::measure(&off, m)?;
            acc = (acc.0.min(t), acc.1.max(t));
        }
        Ok(Some(TimeWindow {
            min: Seconds::new(acc.0)?,
            max: Seconds::new(acc.1)?,
        }))
    }

    /// Every applicable fault's window beside the healthy one, with the gap between them.
    /// Returns the healthy window and up to five separations (in [`Condition::ALL`] order).
    ///
    /// # Errors
    /// As [`Design::window`].
    pub fn separations(
        &self,
        m: &Measurement,
    ) -> Result<(TimeWindow, crate::slots::Slots<Separation, 5>), Error> {
        let healthy = self
            .window(Condition::Healthy, m)?
            .ok_or(Error::new("clamp", Reason::Inconsistent))?;
        let (h_lo, h_hi) = (healthy.min.value(), healthy.max.value());
        // A healthy window that is a single instant (a comparator a healthy switch-off never
        // trips reads 0 at every corner) still has a finite relative gap: 1 ns floor.
        let width = (h_hi - h_lo).max(h_hi * 1e-6).max(1e-9);
        let mut out = crate::slots::Slots::new();
        for cond in Condition::ALL.iter().skip(1) {
            if let Some(w) = self.window(*cond, m)? {
                let gap = (w.min.value() - h_hi).max(h_lo - w.max.value());
                let sep = Separation {
                    condition: *cond,
                    window: w,
                    gap,
                    relative_gap: error::result("relative gap", gap / width)?,
                    detectable: gap > 0.0,
                };
                // Capacity 5 = the number of faults: cannot overflow.
                let _ = out.push(sep);
            }
        }
        Ok((healthy, out))
    }

    /// Windows per band of winding temperature, for [`BandedWindows`]: band k covers the
    /// windings from the previous edge (the first from `t_winding_min`) up to `upper_edges[k]`,
    /// each with its own, narrower, healthy window. The too-hot fault keeps its own range. A
    /// firmware that measures the winding (or board) temperature then classifies against the
    /// band that holds it.
    ///
    /// # Errors
    /// Edges not increasing, or outside the design's winding range → [`Reason::NotIncreasing`]
    /// / [`Reason::OutsideValidatedRange`] on `"band edges"`; errors of
    /// [`Design::tick_windows`].
    pub fn banded_tick_windows<const B: usize>(
        &self,
        m: &Measurement,
        tick: Hertz,
        guard: Duty,
        upper_edges: [Temperature; B],
    ) -> Result<BandedWindows<B>, Error> {
        let mut out = BandedWindows {
            upper_edges_deci_c: [0i16; B],
            windows: [Windows::from_entries([Entry::EMPTY; MAX_WINDOWS], 0); B],
        };
        let mut lo = self.t_winding_min;
        for (k, edge) in (0..B).zip(upper_edges.iter()) {
            if !(*edge > lo) {
                return Err(Error::new("band edges", Reason::NotIncreasing));
            }
            if !(*edge <= self.t_winding_max) {
                return Err(Error::new("band edges", Reason::OutsideValidatedRange));
            }
            let band = Design {
                t_winding_min: lo,
                t_winding_max: *edge,
                t_winding_fault_max: self.t_winding_fault_max,
                ..*self
            };
            let deci = libm::roundf(edge.celsius() * 10.0);
            if let (Some(e), Some(w)) = (out.upper_edges_deci_c.get_mut(k), out.windows.get_mut(k))
            {
                *e = deci as i16;
                *w = band.tick_windows(m, tick, guard)?;
            }
            lo = *edge;
        }
        Ok(out)
    }

    /// The run-time windows in timer ticks at `tick_hz`: each window widened outward to whole
    /// ticks (minimum rounded down, maximum rounded up) and by `guard` (a relative margin for
    /// what the model leaves out, for example 0.05).
    ///
    /// # Errors
    /// `guard` outside 0…1 → [`Reason::OutsideValidatedRange`] on `"guard"`; errors of
    /// [`Design::window`] and [`to_ticks`].
    pub fn tick_windows(
        &self,
        m: &Measurement,
        tick: Hertz,
        guard: Duty,
    ) -> Result<Windows, Error> {
        let g = guard.value();
        if !(g < 1.0) {
            return Err(Error::new("guard", Reason::OutsideValidatedRange));
        }
        let mut entries = [Entry::EMPTY; MAX_WINDOWS];
        let mut n = 0usize;
        for cond in Condition::ALL {
            if let Some(w) = self.window(cond, m)? {
                let lo_s = Seconds::new(w.min.value() * (1.0 - g))?;
                let hi_s = Seconds::new(w.max.value() * (1.0 + g))?;
                // Outward: the lower edge rounded down, the upper edge up.
                let lo = to_ticks_floor(lo_s, tick)?;
                let hi = to_ticks(hi_s, tick)?;
                if let Some(slot) = entries.get_mut(n) {
                    *slot = Entry {
                        lo,
                        hi,
                        condition: cond,
                    };
                    // n < MAX_WINDOWS here (the slot existed): cannot saturate.
                    n = n.saturating_add(1);
                }
            }
        }
        Ok(Windows::from_entries(entries, n))
    }
}
