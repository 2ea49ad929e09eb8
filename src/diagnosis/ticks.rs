//! Configuration time: what the firmware can tell apart, judged where it lives — in timer
//! ticks, after the guard band, the tick rounding and the timing jitter ([`Timing`]): each
//! fault against the healthy window, and each fault against every other.

use super::classify::Candidates;
use super::windows::{Design, Measurement, Timing};
use super::Condition;
use crate::error::{Error, Reason};
use crate::slots::Slots;

/// A window in ticks, inclusive at both ends.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TickWindow {
    /// Lowest reading.
    pub lo: u32,
    /// Highest reading.
    pub hi: u32,
}

impl TickWindow {
    /// True when the two windows share a tick.
    pub const fn overlaps(&self, other: &TickWindow) -> bool {
        self.lo <= other.hi && other.lo <= self.hi
    }

    /// Ticks strictly between the two windows (≥ 1: a reading there belongs to neither), or the
    /// number of shared ticks as a negative number, or 0 when they touch.
    pub fn gap(&self, other: &TickWindow) -> i64 {
        let (a, b) = if self.lo <= other.lo {
            (self, other)
        } else {
            (other, self)
        };
        // u32 into i64: no overflow.
        b.lo as i64 - a.hi as i64 - 1
    }
}

/// One fault as the firmware sees it.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TickSeparation {
    /// The fault.
    pub condition: Condition,
    /// Its window in ticks.
    pub window: TickWindow,
    /// Ticks between it and the healthy window (see [`TickWindow::gap`]).
    pub gap_ticks: i64,
    /// True when no tick of it is healthy: the fault can be told from health.
    pub detectable: bool,
    /// The other faults whose windows share ticks with this one (a reading there is
    /// [`super::Verdict::Ambiguous`] between them).
    pub confused_with: Candidates,
}

/// The healthy window and every applicable fault, in ticks.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TickReport {
    /// The healthy window.
    pub healthy: TickWindow,
    /// The faults, in [`Condition::ALL`] order.
    pub faults: Slots<TickSeparation, 5>,
}

impl Design {
    /// What the firmware can tell apart with measurement `m` timed as `timing`: each fault
    /// against health, and against every other fault, in ticks.
    ///
    /// Work: six windows of [`Design::window`], then 25 comparisons.
    ///
    /// # Errors
    /// As [`Design::tick_windows`]; a clamp with no healthy window → [`Reason::Inconsistent`]
    /// on `"clamp"`.
    pub fn tick_separations(&self, m: &Measurement, timing: &Timing) -> Result<TickReport, Error> {
        let w = self.tick_windows(m, timing)?;
        let mut healthy = None;
        let mut faults: Slots<(Condition, TickWindow), 5> = Slots::new();
        for e in w.entries() {
            let t = TickWindow { lo: e.lo, hi: e.hi };
            if e.condition == Condition::Healthy {
                healthy = Some(t);
            } else {
                // At most five faults: cannot overflow.
                let _ = faults.push((e.condition, t));
            }
        }
        let healthy = healthy.ok_or(Error::new("clamp", Reason::Inconsistent))?;
        let mut out = Slots::new();
        for (c, t) in faults.iter() {
            let mut confused = Candidates::NONE;
            for (o, u) in faults.iter() {
                if o != c && t.overlaps(u) {
                    confused = confused.with(*o);
                }
            }
            // At most five faults: cannot overflow.
            let _ = out.push(TickSeparation {
                condition: *c,
                window: *t,
                gap_ticks: t.gap(&healthy),
                detectable: !t.overlaps(&healthy),
                confused_with: confused,
            });
        }
        Ok(TickReport {
            healthy,
            faults: out,
        })
    }
}
