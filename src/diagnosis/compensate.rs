//! Compensation: windows as a function of what the firmware measures before it switches off —
//! the supply voltage and the coil's on-current — so the healthy window spans only what those
//! readings leave open.
//!
//! Why it narrows: across all units and temperatures a healthy decay time moves with L, R, the
//! on-current and the clamp; the on-current I = V/R and the supply V tell the firmware R (to its
//! measurement accuracy) and I₀ before the decay starts, leaving L's tolerance and the clamp's.
//! A shorted-turns fault then shows as a decay too fast for the measured R, and a winding too
//! hot as an R no healthy winding has ([`ResistanceLimit`]).
//!
//! Configuration time ([`Design::compensated_tick_windows`]): the supply and the on-current are
//! split into bins (upper edges, increasing; the last bin also takes everything above). In each
//! cell the true values lie within the bin widened by the firmware's measurement accuracy
//! ([`MeasuredAccuracy`]); the coil resistance then lies within [V_lo/I_hi, V_hi/I_lo]
//! intersected with what each condition allows (healthy: R over temperature and tolerance;
//! shorted turns: that times its factor; too hot: beyond the hottest allowed winding). Every
//! condition's window in the cell is found over the corners of the supply, the start current and
//! the resistance (taken as three independent axes: a superset of the physical cell, so the
//! window can only be wider than the truth, never narrower), L, the diode, breakdown-part and
//! switch temperatures, and the two breakdown tolerances: 2⁹ corners a condition. A condition
//! whose resistance range misses the cell has no window there.
//!
//! Run time ([`CompensatedWindows::classify`]): two bin searches over the edges and the verdict
//! of the cell's [`Windows`], integer comparisons only.

use super::classify::{Entry, Verdict, Windows, MAX_WINDOWS};
use super::windows::{clamp_scaled, tick_table, Design, Measurement, TimeWindow, Timing};
use super::Condition;
use crate::clamp::{Clamp, Operating, SwitchOff};
use crate::coil::Coil;
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Henries, Ohms, Seconds, Temperature, Volts};

/// The accuracy of the firmware's own readings of the supply and the on-current: a relative
/// error (0.02 = ±2 %, each 0 … 0.2) and a resolution, the step of the reading as the firmware
/// feeds it (an ADC's LSB over its range; never finer than the 1 mV and 1 µA of the integer
/// inputs, which are taken when the step is smaller): a reading rounded to the nearest step is
/// within half a step of its value, on top of the relative error.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MeasuredAccuracy {
    /// Supply reading, relative.
    pub supply: f32,
    /// On-current reading, relative.
    pub current: f32,
    /// Step of the supply reading, V (0 … 1 V).
    pub supply_step: f32,
    /// Step of the on-current reading, A (0 … 1 A).
    pub current_step: f32,
}

/// The readings' errors: relative (supply, current) and half a step each (V, A).
#[derive(Debug, Clone, Copy)]
pub(super) struct Acc {
    ev: f32,
    ei: f32,
    hv: f32,
    hi: f32,
}

/// Windows per cell of (measured supply, measured on-current).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CompensatedWindows<const S: usize, const C: usize> {
    /// Upper edge of each supply bin, mV, increasing; the last bin takes everything above.
    pub supply_edges_mv: [u32; S],
    /// Upper edge of each on-current bin, µA, increasing; the last bin takes everything above.
    pub current_edges_ua: [u32; C],
    /// The windows of each cell, `[supply bin][current bin]`.
    pub windows: [[Windows; C]; S],
}

/// The bin of `x` among increasing upper `edges` (the last takes everything above). Work: at
/// most N comparisons.
fn bin<const N: usize>(edges: &[u32; N], x: u32) -> usize {
    let mut k = 0usize;
    // zip with a bounded range, not enumerate: Range's step cannot overflow-panic.
    for (i, e) in (0..N).zip(edges.iter()) {
        k = i;
        if x <= *e {
            break;
        }
    }
    k
}

impl<const S: usize, const C: usize> CompensatedWindows<S, C> {
    /// The verdict on `ticks` with the windows of the cell holding the measured supply (mV) and
    /// on-current (µA). Integer only; work: S + C comparisons and one [`Windows::classify`].
    /// With no bins nothing is known: [`Verdict::Unexplained`].
    pub fn classify(&self, supply_mv: u32, on_current_ua: u32, ticks: u32) -> Verdict {
        self.cell(supply_mv, on_current_ua)
            .map_or(Verdict::Unexplained, |w| w.classify(ticks))
    }

    /// The windows of the cell holding the measured supply (mV) and on-current (µA): for a
    /// report of what each cell can tell apart. None only with no bins. Work: S + C
    /// comparisons.
    pub fn cell(&self, supply_mv: u32, on_current_ua: u32) -> Option<&Windows> {
        let (s, c) = self.bins(supply_mv, on_current_ua);
        self.windows.get(s).and_then(|row| row.get(c))
    }

    /// The (supply bin, current bin) of the measured supply (mV) and on-current (µA). Work:
    /// S + C comparisons.
    pub fn bins(&self, supply_mv: u32, on_current_ua: u32) -> (usize, usize) {
        (
            bin(&self.supply_edges_mv, supply_mv),
            bin(&self.current_edges_ua, on_current_ua),
        )
    }
}

/// The resistance above which no healthy winding can be: the firmware's integer check for a
/// coil too hot (or shorted to a higher resistance), from its supply and on-current readings.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ResistanceLimit {
    /// The limit, mΩ, already lowered by the readings' accuracy.
    pub max_healthy_mohm: u32,
}

impl ResistanceLimit {
    /// True when the measured V/I is above every healthy winding's resistance. Integer only:
    /// V/I in Ω is 1000·V_mV/I_µA, so the test is 10⁶·V_mV > R_mΩ·I_µA (u64, no overflow).
    pub fn exceeded(&self, supply_mv: u32, on_current_ua: u32) -> bool {
        (supply_mv as u64) * 1_000_000 > (self.max_healthy_mohm as u64) * (on_current_ua as u64)
    }
}

/// The factor ranges a cell window spans: the inductance, the clamp's breakdown and the
/// switch avalanche's breakdown (each a (low, high) factor on its nominal).
#[derive(Debug, Clone, Copy)]
pub(crate) struct Span {
    pub(crate) inductance: (f32, f32),
    pub(crate) clamp: (f32, f32),
    pub(crate) avalanche: (f32, f32),
}

/// The resistance range each condition allows, Ω (before the cell's own limits).
pub(super) struct Ranges {
    pub(super) healthy: (f32, f32),
    shorted: (f32, f32),
    hot: (f32, f32),
}

impl Design {
    /// R of the winding at `t` over its tolerance.
    fn r_range(&self, t_lo: Temperature, t_hi: Temperature) -> Result<(f32, f32), Error> {
        let tol = self.resistance_tolerance;
        Ok((
            self.coil.resistance(t_lo)?.value() * (1.0 - tol),
            self.coil.resistance(t_hi)?.value() * (1.0 + tol),
        ))
    }

    pub(super) fn ranges(&self) -> Result<Ranges, Error> {
        let healthy = self.r_range(self.t_winding_min, self.t_winding_max)?;
        let (_, fr) = self.shorted_factors()?;
        Ok(Ranges {
            healthy,
            shorted: (healthy.0 * fr, healthy.1 * fr),
            hot: (
                self.coil.resistance(self.t_winding_max)?.value()
                    * (1.0 - self.resistance_tolerance),
                self.r_range(self.t_winding_max, self.t_winding_fault_max)?
                    .1,
            ),
        })
    }

    /// The resistance limit above which no healthy winding is, raised by what the on-current and
    /// supply readings can add: a true healthy R can read up to
    /// (1 + ε_V + h_V/V)/(1 − ε_I − h_I/I) high, h half a step of each reading, at the lowest
    /// supply and the smallest healthy on-current (where the steps weigh most).
    ///
    /// # Errors
    /// As [`Design::window`]; accuracy outside 0 … 0.2, a step outside 0 … 1 V / 1 A, or a
    /// current step as large as the smallest on-current → [`Reason::OutsideValidatedRange`] on
    /// `"measurement accuracy"`.
    pub fn resistance_limit(&self, acc: &MeasuredAccuracy) -> Result<ResistanceLimit, Error> {
        self.check()?;
        let a = accuracy(acc)?;
        // R_read = V_read/I_read ≤ (V·(1 + ε_V) + h_V)/(I·(1 − ε_I) − h_I)
        //        = R·(1 + ε_V + h_V/V)/(1 − ε_I − h_I/I), largest at the smallest V and I.
        let r_max = self.ranges()?.healthy.1;
        let v_min = self.v_supply_min.value();
        let i_min = v_min / r_max;
        let den = 1.0 - a.ei - a.hi / i_min;
        if !(den > 0.0) {
            return Err(Error::new(
                "measurement accuracy",
                Reason::OutsideValidatedRange,
            ));
        }
        let r = r_max * (1.0 + a.ev + a.hv / v_min) / den;
        let mohm = libm::ceilf(r * 1000.0);
        if !(mohm < u32::MAX as f32) {
            return Err(Error::new("coil resistance", Reason::TooLarge));
        }
        Ok(ResistanceLimit {
            max_healthy_mohm: mohm as u32,
        })
    }

    /// The compensated run-time windows: one set of [`Windows`] per cell of measured supply
    /// (upper edges `supply_edges`) and on-current (upper edges `current_edges`), each found
    /// over what the readings leave open (see the module docs).
    ///
    /// Work: S·C cells × six conditions × 512 corners, each one switch-off set-up and at most
    /// two decay integrations.
    ///
    /// # Errors
    /// Edges not increasing, or not increasing once rounded to millivolts / microamperes (or
    /// rounding to zero) → [`Reason::NotIncreasing`] on `"supply edges"` / `"current
    /// edges"`; the last supply edge below the highest supply → [`Reason::Inconsistent`] on
    /// `"supply edges"`; as [`Design::resistance_limit`] and [`Design::tick_windows`].
    pub fn compensated_tick_windows<const S: usize, const C: usize>(
        &self,
        m: &Measurement,
        timing: &Timing,
        acc: &MeasuredAccuracy,
        supply_edges: [Volts; S],
        current_edges: [Amps; C],
    ) -> Result<CompensatedWindows<S, C>, Error> {
        self.check()?;
        timing.validate()?;
        let a = accuracy(acc)?;
        let sv = edges("supply edges", &supply_edges.map(|v| v.value()))?;
        let ci = edges("current edges", &current_edges.map(|a| a.value()))?;
        if S > 0 && !(supply_edges.last().is_some_and(|e| *e >= self.v_supply_max)) {
            return Err(Error::new("supply edges", Reason::Inconsistent));
        }
        let ranges = self.ranges()?;
        let i_top = self.i_top(&a, &ranges);
        let mut out = CompensatedWindows {
            supply_edges_mv: scaled_edges("supply edges", &sv, 1e3)?,
            current_edges_ua: scaled_edges("current edges", &ci, 1e6)?,
            windows: [[Windows::from_entries([Entry::EMPTY; MAX_WINDOWS], 0); C]; S],
        };
        for (k, row) in (0..S).zip(out.windows.iter_mut()) {
            for (j, cell) in (0..C).zip(row.iter_mut()) {
                let (v, i) = self.cell_readings(&a, &sv, &ci, i_top, k, j);
                *cell = self.cell_windows(m, timing, &ranges, v, i)?;
            }
        }
        Ok(out)
    }

    /// The highest on-current any condition's cell can hold: the highest supply over the
    /// lowest shorted-turns resistance, read high.
    pub(super) fn i_top(&self, a: &Acc, ranges: &Ranges) -> f32 {
        self.v_supply_max.value() * (1.0 + a.ev) / ranges.shorted.0.max(1e-30)
    }

    /// The true supply and on-current a cell can hold: cell (k, j) of the bins `sv`, `ci`
    /// (upper edges, V and A), widened by the readings' accuracy and limited to the design's
    /// supply range; the last current bin reaches `i_top`.
    pub(super) fn cell_readings<const S: usize, const C: usize>(
        &self,
        a: &Acc,
        sv: &[f32; S],
        ci: &[f32; C],
        i_top: f32,
        k: usize,
        j: usize,
    ) -> ((f32, f32), (f32, f32)) {
        let v_lo = if k == 0 {
            self.v_supply_min.value()
        } else {
            sv.get(k - 1).copied().unwrap_or(0.0)
        };
        let v_hi = sv
            .get(k)
            .copied()
            .unwrap_or(v_lo)
            .min(self.v_supply_max.value());
        let v = (
            ((v_lo - a.hv) * (1.0 - a.ev)).max(self.v_supply_min.value()),
            ((v_hi + a.hv) * (1.0 + a.ev)).min(self.v_supply_max.value()),
        );
        let i_lo = if j == 0 {
            0.0
        } else {
            ci.get(j - 1).copied().unwrap_or(0.0)
        };
        let i_hi = if C.checked_sub(1) == Some(j) {
            i_top.max(i_lo)
        } else {
            ci.get(j).copied().unwrap_or(i_lo)
        };
        let i = (
            ((i_lo - a.hi) * (1.0 - a.ei)).max(0.0),
            (i_hi + a.hi) * (1.0 + a.ei),
        );
        (v, i)
    }

    /// The windows of one cell: supply range `v`, on-current range `i`.
    fn cell_windows(
        &self,
        m: &Measurement,
        timing: &Timing,
        ranges: &Ranges,
        v: (f32, f32),
        i: (f32, f32),
    ) -> Result<Windows, Error> {
        tick_table(timing, |cond| {
            Ok(match cond {
                Condition::CoilOpen if i.0 <= 0.0 => Some(TimeWindow {
                    min: Seconds::raw(0.0),
                    max: Seconds::raw(0.0),
                }),
                Condition::CoilOpen => None,
                _ => {
                    let allowed = match cond {
                        Condition::ShortedTurns => ranges.shorted,
                        Condition::CoilTooHot => ranges.hot,
                        _ => ranges.healthy,
                    };
                    match cell_resistance(v, i, allowed) {
                        None => None,
                        Some((i, r)) => self.cell_window(cond, m, v, i, r)?,
                    }
                }
            })
        })
    }

    /// One condition's window over a cell: supply `v`, start current `i`, resistance `r`, over
    /// the design's inductance and breakdown tolerances.
    fn cell_window(
        &self,
        cond: Condition,
        m: &Measurement,
        v: (f32, f32),
        i: (f32, f32),
        r: (f32, f32),
    ) -> Result<Option<TimeWindow>, Error> {
        let (lt, ct, at) = (
            self.inductance_tolerance,
            self.clamp_tolerance,
            self.avalanche_tolerance,
        );
        let span = Span {
            inductance: (1.0 - lt, 1.0 + lt),
            clamp: (1.0 - ct, 1.0 + ct),
            avalanche: (1.0 - at, 1.0 + at),
        };
        self.cell_window_over(cond, m, (v, i, r), &span)
    }

    /// One condition's window over a cell (supply, start current, resistance ranges) and the
    /// factor ranges of `span`: 2⁹ corners.
    pub(crate) fn cell_window_over(
        &self,
        cond: Condition,
        m: &Measurement,
        cell: ((f32, f32), (f32, f32), (f32, f32)),
        span: &Span,
    ) -> Result<Option<TimeWindow>, Error> {
        let (v, i, r) = cell;
        let (fl, _) = self.shorted_factors()?;
        let (clamp, l_scale, avalanche) = match cond {
            Condition::Healthy | Condition::CoilTooHot => {
                (self.clamp, 1.0, matches!(self.clamp, Clamp::Avalanche(_)))
            }
            Condition::ShortedTurns => (self.clamp, fl, matches!(self.clamp, Clamp::Avalanche(_))),
            Condition::ClampOpen => match self.clamp {
                Clamp::Avalanche(_) => return Ok(None),
                _ => (Clamp::Avalanche(self.switch_avalanche), 1.0, true),
            },
            Condition::ZenerShorted => match self.clamp {
                Clamp::ZenerDiode { diode, .. } => (Clamp::FreewheelDiode(diode), 1.0, false),
                Clamp::SwitchedFreewheel(s) => (Clamp::FreewheelDiode(s.diode), 1.0, false),
                _ => return Ok(None),
            },
            // No decay (coil open); the armature's conditions are judged from the coil current
            // by the armature's detectors, not by flyback windows.
            Condition::CoilOpen | Condition::ArmatureStuckOpen | Condition::ArmatureStuckClosed => {
                return Ok(None)
            }
        };
        if !(i.1 > 0.0 && i.0 <= i.1) {
            return Ok(None);
        }
        let i = (i.0.max(i.1 * 1e-6), i.1);
        let mut acc = (f32::INFINITY, f32::NEG_INFINITY);
        for k in 0u32..512 {
            let pick = |bit: u32, lo: f32, hi: f32| if k & (1 << bit) == 0 { lo } else { hi };
            let l = self.coil.inductance().value()
                * l_scale
                * pick(0, span.inductance.0, span.inductance.1);
            let coil = Coil::fixed(Henries::new(l)?, Ohms::new(pick(1, r.0, r.1))?)?;
            let (c_lo, c_hi) = (self.t_clamp_min.kelvin(), self.t_clamp_max.kelvin());
            let t_switch = Temperature::from_kelvin(pick(6, c_lo, c_hi))?;
            let (tol, t_bd) = if avalanche {
                (pick(8, span.avalanche.0, span.avalanche.1), t_switch)
            } else {
                (
                    pick(7, span.clamp.0, span.clamp.1),
                    Temperature::from_kelvin(pick(5, c_lo, c_hi))?,
                )
            };
            let op = Operating {
                supply: Volts::new(pick(2, v.0, v.1))?,
                start_current: Amps::new(pick(3, i.0, i.1))?,
                winding: self.t_winding_min,
                diodes: Temperature::from_kelvin(pick(4, c_lo, c_hi))?,
                breakdown: t_bd,
            };
            let off = SwitchOff::new(&coil, &clamp_scaled(&clamp, tol)?, self.side, &op)?;
            let t = Self::measure(&off, m)?;
            acc = (acc.0.min(t), acc.1.max(t));
        }
        Ok(Some(TimeWindow {
            min: Seconds::new(acc.0)?,
            max: Seconds::new(acc.1)?,
        }))
    }
}

/// The resistance a cell of supply `v` and on-current `i` holds within `allowed` (the
/// condition's range), with the on-current narrowed to it: R in [V_lo/I_hi, V_hi/I_lo] ∩
/// allowed; None when they do not meet.
pub(super) fn cell_resistance(
    v: (f32, f32),
    i: (f32, f32),
    allowed: (f32, f32),
) -> Option<((f32, f32), (f32, f32))> {
    let r_cell = (
        v.0 / i.1.max(1e-30),
        if i.0 > 0.0 { v.1 / i.0 } else { f32::INFINITY },
    );
    let r = (r_cell.0.max(allowed.0), r_cell.1.min(allowed.1));
    if r.0 > r.1 {
        return None;
    }
    Some(((i.0.max(v.0 / r.1), i.1.min(v.1 / r.0)), r))
}

/// The two accuracies, checked.
pub(super) fn accuracy(acc: &MeasuredAccuracy) -> Result<Acc, Error> {
    let m = "measurement accuracy";
    Ok(Acc {
        ev: error::within(m, acc.supply, 0.0, 0.2)?,
        ei: error::within(m, acc.current, 0.0, 0.2)?,
        // Half a step, never finer than the integer inputs' 1 mV and 1 µA.
        hv: 0.5 * error::within(m, acc.supply_step, 0.0, 1.0)?.max(1e-3),
        hi: 0.5 * error::within(m, acc.current_step, 0.0, 1.0)?.max(1e-6),
    })
}

/// Edges checked positive and strictly increasing.
pub(super) fn edges<const N: usize>(name: &'static str, e: &[f32; N]) -> Result<[f32; N], Error> {
    let mut prev = 0.0f32;
    for x in e {
        if !(*x > prev) {
            return Err(Error::new(name, Reason::NotIncreasing));
        }
        prev = *x;
    }
    Ok(*e)
}

/// Edges in milli- or micro-units, rounded to the nearest; an edge beyond u32 is refused, and
/// so are edges that round to the same (or a lower) integer than the one before, which would
/// leave a bin no reading can select.
pub(super) fn scaled_edges<const N: usize>(
    name: &'static str,
    e: &[f32; N],
    scale: f32,
) -> Result<[u32; N], Error> {
    let mut out = [0u32; N];
    let mut prev: Option<u32> = None;
    for (o, x) in out.iter_mut().zip(e) {
        let y = libm::roundf(x * scale);
        if !(y >= 0.0 && y < u32::MAX as f32) {
            return Err(Error::new(name, Reason::TooLarge));
        }
        let v = y as u32;
        if prev.is_some_and(|p| v <= p) || v == 0 {
            return Err(Error::new(name, Reason::NotIncreasing));
        }
        (*o, prev) = (v, Some(v));
    }
    Ok(out)
}
