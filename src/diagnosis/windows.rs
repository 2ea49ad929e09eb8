//! Configuration time: the window of measurements for the healthy circuit and for each fault,
//! their separability, and their conversion to timer ticks.
//!
//! Method: corner analysis with every independent quantity its own axis: L and R over their
//! tolerances, the supply, the winding's temperature, the clamp diodes' temperature, the
//! breakdown part's temperature, the switch's temperature (for its avalanche), the clamp's
//! breakdown tolerance and the switch avalanche's tolerance — nine axes, 2⁹ = 512 corners per
//! window. Every measurement here is monotonic in each of them over its range (the decay time
//! grows with L, with the on-current and with a lower clamp voltage; a comparator's time above
//! a threshold moves the same way), so its extremes are at the corners and the window is
//! [min, max] over them; the tests check this against dense interior sampling. The on-current
//! is V/R(T); the switch's own on-resistance is taken as part of the coil resistance tolerance.
//!
//! Work: every window evaluates 512 corners, each one switch-off set-up and at most two decay
//! integrations (bounded as [`SwitchOff::time_to`] states).

use super::classify::{BandedWindows, Entry, Windows, MAX_WINDOWS};
use super::Condition;
use crate::breakdown::Breakdown;
use crate::clamp::{ActiveClamp, Clamp, Operating, Side, SwitchOff, SwitchedFreewheel};
use crate::coil::Coil;
use crate::error::{self, Error, Reason};
use crate::timing::{to_ticks, to_ticks_floor};
use crate::units::{Amps, Duty, Hertz, Ohms, Seconds, Temperature, Volts};

/// What the firmware measures on each switch-off.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Measurement {
    /// How long the voltage across the switch stays above `threshold` (a comparator on a
    /// divider across the switch). Put the threshold above the highest supply: across the
    /// switch the voltage rests at the supply once the coil is off.
    SwitchAbove {
        /// Comparator threshold, referred to the voltage across the switch.
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

/// How the shorted-turns fault changes the coil.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ShortedTurns {
    /// A share f of the turns shorted, with the usual scaling: L·(1 − f)² (inductance goes
    /// with the square of the turns) and R·(1 − f) (resistance with the wire length);
    /// 0 < f ≤ 0.99.
    Fraction(f32),
    /// Stated changes: L and R multiplied by these (each [`MIN_SHORTED_FACTOR`] ≤ k ≤ 1), for
    /// a winding whose shorted-turns behaviour is known from measurement.
    Scales {
        /// Inductance factor.
        inductance: f32,
        /// Resistance factor.
        resistance: f32,
    },
}

/// The smallest L or R factor a shorted-turns fault may leave (1e-4: 99 % of the turns
/// shorted), so the faulted coil stays inside the coil model's range and a refusal names the
/// shorted-turns fault, not a quantity the caller never wrote.
pub const MIN_SHORTED_FACTOR: f32 = 1e-4;

impl ShortedTurns {
    /// The (L, R) factors, validated: each within [`MIN_SHORTED_FACTOR`] … 1.
    fn factors(self) -> Result<(f32, f32), Error> {
        match self {
            ShortedTurns::Fraction(f) => {
                if !(f > 0.0 && f <= 0.99) {
                    return Err(Error::new("shorted turns", Reason::OutsideValidatedRange));
                }
                Ok(((1.0 - f) * (1.0 - f), 1.0 - f))
            }
            ShortedTurns::Scales {
                inductance,
                resistance,
            } => {
                for k in [inductance, resistance] {
                    if !(MIN_SHORTED_FACTOR..=1.0).contains(&k) {
                        return Err(Error::new("shorted turns", Reason::OutsideValidatedRange));
                    }
                }
                Ok((inductance, resistance))
            }
        }
    }
}

/// A coil driver and its tolerances, for diagnosis. Fields are public for readable literals;
/// every function that takes a design validates it.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Design {
    /// Nominal coil.
    pub coil: Coil,
    /// Relative tolerance of L (0.1 = ±10 %), 0 … 0.5.
    pub inductance_tolerance: f32,
    /// Relative tolerance of R at its reference temperature, 0 … 0.5.
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
    /// Coldest clamp parts (diodes, breakdown part, switch).
    pub t_clamp_min: Temperature,
    /// Hottest clamp parts (each part is its own axis over this range).
    pub t_clamp_max: Temperature,
    /// The healthy clamp.
    pub clamp: Clamp,
    /// Relative part-to-part tolerance of the clamp's breakdown voltage (zener, TVS, varistor,
    /// active clamp), 0 … 0.3; ignored for a clamp without one.
    pub clamp_tolerance: f32,
    /// The switch's own avalanche, which takes over when the clamp path opens.
    pub switch_avalanche: Breakdown,
    /// Relative tolerance of the avalanche voltage, 0 … 0.3.
    pub avalanche_tolerance: f32,
    /// The shorted-turns fault.
    pub shorted: ShortedTurns,
    /// Where the switch sits.
    pub side: Side,
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
    /// True when the gap is positive in seconds (before ticks, guard and jitter: see
    /// [`Design::tick_separations`] for what the firmware can really see).
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

/// The clamp with its breakdown voltage scaled by a tolerance factor `k`.
pub(crate) fn clamp_scaled(clamp: &Clamp, k: f32) -> Result<Clamp, Error> {
    if k == 1.0 {
        return Ok(*clamp);
    }
    Ok(match *clamp {
        Clamp::ZenerDiode { zener, diode } => Clamp::ZenerDiode {
            zener: zener.scaled(k)?,
            diode,
        },
        Clamp::TvsAcrossCoil(b) => Clamp::TvsAcrossCoil(b.scaled(k)?),
        Clamp::AcrossSwitch(b) => Clamp::AcrossSwitch(b.scaled(k)?),
        Clamp::Avalanche(b) => Clamp::Avalanche(b.scaled(k)?),
        Clamp::Varistor(v) => Clamp::Varistor(v.scaled(k)?),
        Clamp::ActiveClamp(a) => Clamp::ActiveClamp(ActiveClamp {
            zener: a.zener.scaled(k)?,
            ..a
        }),
        Clamp::SwitchedFreewheel(s) => Clamp::SwitchedFreewheel(SwitchedFreewheel {
            zener: s.zener.scaled(k)?,
            ..s
        }),
        other => other,
    })
}

/// One corner of the nine axes, each at its low (false) or high (true) end.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Corner(pub u32);

impl Corner {
    /// The number of corners.
    pub(crate) const COUNT: u32 = 512;

    fn pick(self, bit: u32, lo: f32, hi: f32) -> f32 {
        if self.0 & (1 << bit) == 0 {
            lo
        } else {
            hi
        }
    }
}

impl Design {
    pub(crate) fn check(&self) -> Result<(), Error> {
        for (name, tol, max) in [
            ("inductance tolerance", self.inductance_tolerance, 0.5),
            ("resistance tolerance", self.resistance_tolerance, 0.5),
            ("clamp tolerance", self.clamp_tolerance, 0.3),
            ("avalanche tolerance", self.avalanche_tolerance, 0.3),
        ] {
            let t = error::non_negative(name, tol)?;
            if !(t < max) {
                return Err(Error::new(name, Reason::OutsideValidatedRange));
            }
        }
        self.shorted.factors()?;
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

    /// The shorted-turns fault's (L, R) factors, validated.
    pub(crate) fn shorted_factors(&self) -> Result<(f32, f32), Error> {
        self.shorted.factors()
    }

    /// The circuit of `cond`: (clamp before tolerance, L scale, R scale, winding range, whether
    /// the clamp is the switch's avalanche), or None if the condition does not apply to this
    /// clamp (a zener fault without a zener) or has no decay (coil open).
    #[allow(clippy::type_complexity)]
    pub(crate) fn circuit(
        &self,
        cond: Condition,
    ) -> Result<Option<(Clamp, f32, f32, Temperature, Temperature, bool)>, Error> {
        let av = Clamp::Avalanche(self.switch_avalanche);
        let (tmin, tmax) = (self.t_winding_min, self.t_winding_max);
        let (fl, fr) = self.shorted.factors()?;
        let own_avalanche = matches!(self.clamp, Clamp::Avalanche(_));
        Ok(match cond {
            Condition::Healthy => Some((self.clamp, 1.0, 1.0, tmin, tmax, own_avalanche)),
            // An active clamp's drain–gate zener open leaves the switch to avalanche too.
            Condition::ClampOpen => match self.clamp {
                Clamp::Avalanche(_) => None,
                _ => Some((av, 1.0, 1.0, tmin, tmax, true)),
            },
            Condition::ZenerShorted => match self.clamp {
                Clamp::ZenerDiode { diode, .. } => {
                    Some((Clamp::FreewheelDiode(diode), 1.0, 1.0, tmin, tmax, false))
                }
                Clamp::SwitchedFreewheel(s) => {
                    Some((Clamp::FreewheelDiode(s.diode), 1.0, 1.0, tmin, tmax, false))
                }
                _ => None,
            },
            // No decay (coil open); the armature's conditions belong to the armature's
            // detectors, not to the flyback windows.
            Condition::CoilOpen | Condition::ArmatureStuckOpen | Condition::ArmatureStuckClosed => {
                None
            }
            Condition::ShortedTurns => Some((self.clamp, fl, fr, tmin, tmax, own_avalanche)),
            Condition::CoilTooHot => Some((
                self.clamp,
                1.0,
                1.0,
                tmax,
                self.t_winding_fault_max,
                own_avalanche,
            )),
        })
    }

    /// The switch-off at one corner of one condition's circuit.
    #[allow(clippy::type_complexity)]
    pub(crate) fn corner_off(
        &self,
        c: (Clamp, f32, f32, Temperature, Temperature, bool),
        k: Corner,
    ) -> Result<SwitchOff, Error> {
        let (clamp, l_scale, r_scale, tw_min, tw_max, avalanche) = c;
        let (lt, rt) = (self.inductance_tolerance, self.resistance_tolerance);
        let coil = self.coil.scaled(
            l_scale * k.pick(0, 1.0 - lt, 1.0 + lt),
            r_scale * k.pick(1, 1.0 - rt, 1.0 + rt),
        )?;
        let vs = Volts::new(k.pick(2, self.v_supply_min.value(), self.v_supply_max.value()))?;
        let tw = Temperature::from_kelvin(k.pick(3, tw_min.kelvin(), tw_max.kelvin()))?;
        let (c_lo, c_hi) = (self.t_clamp_min.kelvin(), self.t_clamp_max.kelvin());
        let t_diode = Temperature::from_kelvin(k.pick(4, c_lo, c_hi))?;
        let t_part = Temperature::from_kelvin(k.pick(5, c_lo, c_hi))?;
        let t_switch = Temperature::from_kelvin(k.pick(6, c_lo, c_hi))?;
        let (ct, at) = (self.clamp_tolerance, self.avalanche_tolerance);
        let (tol, t_bd) = if avalanche {
            (k.pick(8, 1.0 - at, 1.0 + at), t_switch)
        } else {
            (k.pick(7, 1.0 - ct, 1.0 + ct), t_part)
        };
        let op = Operating {
            supply: vs,
            start_current: coil.steady_current(vs, tw)?,
            winding: tw,
            diodes: t_diode,
            breakdown: t_bd,
        };
        SwitchOff::new(&coil, &clamp_scaled(&clamp, tol)?, self.side, &op)
    }

    /// What `m` reads on the switch-off `off`.
    pub(crate) fn measure(off: &SwitchOff, m: &Measurement) -> Result<f32, Error> {
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

    /// The window of `m` under `cond`, over every corner of the nine axes; `None` when the
    /// condition does not apply to this clamp. A coil-open fault reads zero.
    ///
    /// Work: 512 corners, each one switch-off set-up and at most two decay integrations.
    ///
    /// # Errors
    /// Invalid tolerances or ranges → the error names them; errors of the clamp engine at a
    /// corner.
    pub fn window(&self, cond: Condition, m: &Measurement) -> Result<Option<TimeWindow>, Error> {
        self.check()?;
        if cond == Condition::CoilOpen {
            let z = Seconds::raw(0.0);
            return Ok(Some(TimeWindow { min: z, max: z }));
        }
        let Some(circuit) = self.circuit(cond)? else {
            return Ok(None);
        };
        let mut acc = (f32::INFINITY, f32::NEG_INFINITY);
        for k in 0..Corner::COUNT {
            let off = self.corner_off(circuit, Corner(k))?;
            let t = Self::measure(&off, m)?;
            acc = (acc.0.min(t), acc.1.max(t));
        }
        Ok(Some(TimeWindow {
            min: Seconds::new(acc.0)?,
            max: Seconds::new(acc.1)?,
        }))
    }

    /// Every applicable fault's window beside the healthy one, with the gap between them in
    /// seconds. Returns the healthy window and up to five separations (in [`Condition::ALL`]
    /// order).
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
        timing: &Timing,
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
                *w = band.tick_windows(m, timing)?;
            }
            lo = *edge;
        }
        Ok(out)
    }

    /// The run-time windows in timer ticks: every condition's window widened by the relative
    /// guard band, rounded outward to whole ticks (a time t reads ⌊t·f⌋ or ⌈t·f⌉ depending on
    /// the timer's phase) and widened by the stated jitter on each side.
    ///
    /// Work: six windows of [`Design::window`].
    ///
    /// # Errors
    /// `timing` invalid → see [`Timing::validate`]; errors of [`Design::window`] and
    /// [`to_ticks`].
    pub fn tick_windows(&self, m: &Measurement, timing: &Timing) -> Result<Windows, Error> {
        tick_table(timing, |cond| self.window(cond, m))
    }
}

/// The run-time windows of the conditions `window_of` gives a window for (in
/// [`Condition::ALL`] order), each converted to ticks by `timing`. Work: six calls of
/// `window_of` and six conversions.
pub(crate) fn tick_table(
    timing: &Timing,
    mut window_of: impl FnMut(Condition) -> Result<Option<TimeWindow>, Error>,
) -> Result<Windows, Error> {
    let mut entries = [Entry::EMPTY; MAX_WINDOWS];
    let mut n = 0usize;
    for cond in Condition::ALL {
        if let (Some(w), Some(slot)) = (window_of(cond)?, entries.get_mut(n)) {
            let (lo, hi) = timing.ticks(w)?;
            *slot = Entry {
                lo,
                hi,
                condition: cond,
            };
            // n < MAX_WINDOWS here (the slot existed): cannot saturate.
            n = n.saturating_add(1);
        }
    }
    Ok(Windows::from_entries(entries, n))
}

/// How the firmware times a measurement: its tick rate, the relative guard band added to every
/// window (for what the model leaves out), and its timing jitter in ticks (interrupt latency,
/// a polled comparator, the timer's synchronisation).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Timing {
    /// Timer tick rate.
    pub tick: Hertz,
    /// Relative guard band, 0 ≤ g < 1.
    pub guard: Duty,
    /// Timing jitter, ticks, on each side (≤ 1 000 000).
    pub jitter_ticks: u32,
}

impl Timing {
    /// Checks the fields.
    ///
    /// # Errors
    /// `guard` of 1 → [`Reason::OutsideValidatedRange`] on `"guard"`; jitter above 10⁶ ticks →
    /// [`Reason::OutsideValidatedRange`] on `"jitter"`.
    pub fn validate(&self) -> Result<(), Error> {
        if !(self.guard.value() < 1.0) {
            return Err(Error::new("guard", Reason::OutsideValidatedRange));
        }
        if self.jitter_ticks > 1_000_000 {
            return Err(Error::new("jitter", Reason::OutsideValidatedRange));
        }
        Ok(())
    }

    /// A window of times as ticks: guard, outward rounding, jitter.
    ///
    /// # Errors
    /// As [`Timing::validate`]; errors of [`to_ticks`].
    pub fn ticks(&self, w: TimeWindow) -> Result<(u32, u32), Error> {
        self.validate()?;
        let g = self.guard.value();
        let lo_s = Seconds::new(w.min.value() * (1.0 - g))?;
        let hi_s = Seconds::new(w.max.value() * (1.0 + g))?;
        // Outward: the lower edge rounded down, the upper edge up; then the jitter.
        let lo = to_ticks_floor(lo_s, self.tick)?.saturating_sub(self.jitter_ticks);
        let hi = to_ticks(hi_s, self.tick)?.saturating_add(self.jitter_ticks);
        Ok((lo, hi))
    }
}
