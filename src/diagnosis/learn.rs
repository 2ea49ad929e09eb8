//! Learning one unit's own healthy decay, far narrower than the window across every unit of a
//! design, and flagging departures from it — a failing diode, shorting turns, a drifting clamp
//! — before they become a hard fault.
//!
//! The firmware feeds every reading (ticks) to a [`Learner`]. While learning, a reading the
//! design's windows call healthy is kept; any other reading throws the partial learning away
//! and is reported ([`Reading::Refused`]): learning never starts from, or runs through, a
//! faulty reading. After `N` healthy readings the learned window is the median ± 6 median
//! absolute deviations (6·MAD ≈ 4 σ for a normal spread: 1.4826·MAD estimates σ, a common
//! robust-statistics rule; from memory), widened by a margin in ticks (the jitter) and clipped
//! to the design's healthy window, so it can never admit a reading the design calls a fault.
//! From then on a healthy reading outside the learned window is a [`Reading::Departure`].
//!
//! The learned window persists as 9 bytes ([`LearnedWindow::to_bytes`]); restoring it
//! checks it against the design's healthy window again.
//!
//! Integer only; work: constant per reading while monitoring, and one sort of `N` readings
//! (insertion sort, N ≤ 256: at most 32 640 comparisons) when learning completes.

use super::classify::{Verdict, Windows};
use crate::error::{Error, Reason};

/// Largest number of readings a [`Learner`] collects.
pub const MAX_READINGS: usize = 256;

/// Smallest number of readings a [`Learner`] collects.
pub const MIN_READINGS: usize = 5;

/// A learned healthy window, in ticks, inclusive.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LearnedWindow {
    /// Lowest healthy reading of this unit.
    pub lo: u32,
    /// Highest healthy reading of this unit.
    pub hi: u32,
}

/// Layout version of [`LearnedWindow::to_bytes`].
const VERSION: u8 = 1;

impl LearnedWindow {
    /// The window as bytes for the firmware to store: a version byte, then `lo` and `hi`
    /// little-endian.
    pub fn to_bytes(&self) -> [u8; 9] {
        let (l, h) = (self.lo.to_le_bytes(), self.hi.to_le_bytes());
        [VERSION, l[0], l[1], l[2], l[3], h[0], h[1], h[2], h[3]]
    }

    /// A stored window, checked again: the version, lo ≤ hi, and inside the design's healthy
    /// window (a stored window that admits a fault reading is refused).
    ///
    /// # Errors
    /// An unknown version, lo > hi, or a window not inside `design`'s healthy one (or a design
    /// without one) → [`Reason::Inconsistent`] on `"learned window"`.
    pub fn from_bytes(b: &[u8; 9], design: &Windows) -> Result<Self, Error> {
        let bad = Error::new("learned window", Reason::Inconsistent);
        if b[0] != VERSION {
            return Err(bad);
        }
        let w = LearnedWindow {
            lo: u32::from_le_bytes([b[1], b[2], b[3], b[4]]),
            hi: u32::from_le_bytes([b[5], b[6], b[7], b[8]]),
        };
        match design.healthy() {
            Some((lo, hi)) if w.lo <= w.hi && w.lo >= lo && w.hi <= hi => Ok(w),
            _ => Err(bad),
        }
    }

    /// True when `ticks` is inside.
    pub const fn contains(&self, ticks: u32) -> bool {
        self.lo <= ticks && ticks <= self.hi
    }
}

/// What one reading says.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Reading {
    /// Healthy by the design's windows; still learning (`seen` of the readings needed).
    Learning {
        /// Healthy readings kept so far.
        seen: u16,
    },
    /// Not healthy by the design's windows: the partial learning is thrown away. The design's
    /// verdict is carried.
    Refused(Verdict),
    /// This reading completed the learning.
    Learned(LearnedWindow),
    /// Inside the learned window.
    Healthy,
    /// Healthy by the design but outside this unit's learned window: an early warning.
    Departure,
    /// Not healthy by the design's windows: the design's verdict.
    Fault(Verdict),
}

/// Learns a unit's healthy window from its first `N` healthy readings, then monitors.
#[derive(Debug, Clone, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Learner<const N: usize> {
    design: Windows,
    margin_ticks: u32,
    buf: [u32; N],
    n: usize,
    learned: Option<LearnedWindow>,
}

impl<const N: usize> Learner<N> {
    /// A learner against the design's `windows`, with `margin_ticks` added to each side of the
    /// learned window (use the timing jitter).
    ///
    /// # Errors
    /// `N` outside 5 … 256 → [`Reason::OutsideValidatedRange`] on `"readings"`; a design
    /// without a healthy window → [`Reason::Inconsistent`] on `"design windows"`.
    pub fn new(windows: Windows, margin_ticks: u32) -> Result<Self, Error> {
        if !(MIN_READINGS..=MAX_READINGS).contains(&N) {
            return Err(Error::new("readings", Reason::OutsideValidatedRange));
        }
        if windows.healthy().is_none() {
            return Err(Error::new("design windows", Reason::Inconsistent));
        }
        Ok(Learner {
            design: windows,
            margin_ticks,
            buf: [0; N],
            n: 0,
            learned: None,
        })
    }

    /// A learner that resumes monitoring with a window learned before (see
    /// [`LearnedWindow::from_bytes`], which checks it against the design).
    ///
    /// # Errors
    /// As [`Learner::new`].
    pub fn resume(
        windows: Windows,
        margin_ticks: u32,
        learned: LearnedWindow,
    ) -> Result<Self, Error> {
        let mut l = Self::new(windows, margin_ticks)?;
        LearnedWindow::from_bytes(&learned.to_bytes(), &l.design)?;
        l.learned = Some(learned);
        Ok(l)
    }

    /// The learned window, once learned.
    pub fn learned(&self) -> Option<LearnedWindow> {
        self.learned
    }

    /// Forgets what was learned (after a repair) and starts again.
    pub fn forget(&mut self) {
        self.n = 0;
        self.learned = None;
    }

    /// Takes one reading. Work: constant, plus one sort of N when learning completes.
    pub fn observe(&mut self, ticks: u32) -> Reading {
        let v = self.design.classify(ticks);
        if let Some(w) = self.learned {
            return match v {
                Verdict::Healthy if w.contains(ticks) => Reading::Healthy,
                Verdict::Healthy => Reading::Departure,
                other => Reading::Fault(other),
            };
        }
        if v != Verdict::Healthy {
            self.n = 0;
            return Reading::Refused(v);
        }
        if let Some(slot) = self.buf.get_mut(self.n) {
            *slot = ticks;
            // n < N ≤ 256 here: cannot saturate.
            self.n = self.n.saturating_add(1);
        }
        if self.n < N {
            return Reading::Learning {
                seen: self.n as u16,
            };
        }
        let w = self.window();
        self.learned = Some(w);
        Reading::Learned(w)
    }

    /// Median ± 6·MAD + margin, clipped to the design's healthy window. Works in the
    /// learner's own buffer (the readings are not needed once learned: `forget` starts over),
    /// so its stack does not grow with N.
    fn window(&mut self) -> LearnedWindow {
        let s = &mut self.buf;
        sort(s);
        let m = median(s);
        for x in s.iter_mut() {
            *x = x.abs_diff(m);
        }
        sort(s);
        // A MAD of zero (identical readings) still leaves one tick.
        let spread = median(s)
            .max(1)
            .saturating_mul(6)
            .saturating_add(self.margin_ticks);
        let (h_lo, h_hi) = self.design.healthy().unwrap_or((0, u32::MAX));
        LearnedWindow {
            lo: m.saturating_sub(spread).max(h_lo),
            hi: m.saturating_add(spread).min(h_hi),
        }
    }
}

/// Insertion sort, ascending (N ≤ 256: bounded).
fn sort<const N: usize>(a: &mut [u32; N]) {
    for k in 1..N {
        let mut j = k;
        while j > 0 && a.get(j - 1) > a.get(j) {
            a.swap(j - 1, j);
            j -= 1;
        }
    }
}

/// The median of sorted values (the lower middle for an even count).
fn median<const N: usize>(a: &[u32; N]) -> u32 {
    a.get(N.saturating_sub(1) / 2).copied().unwrap_or(0)
}
