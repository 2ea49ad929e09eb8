//! One unit's own decay, learned at whatever supply and temperature it happens to run at and
//! judged at every other: the learner for a coil whose conditions move (a valve that learns on
//! a cool morning and must not alarm every afternoon).
//!
//! # What is learned, and why it carries over
//!
//! While the clamp conducts, the loop law is L·di/dt = −g(i), with g the sum of the winding's
//! R·i and the clamp's voltage (less the supply where the clamp sits across the switch); g does
//! not contain L. Every decay time the firmware measures is therefore
//! t = L·∫ di / g(i) over the current span it times (a comparator's crossing current does not
//! depend on L either): **exactly proportional to L** for every clamp law. So a unit whose
//! inductance is s times the nominal reads s times what a nominal-L unit would read at the same
//! conditions, whatever they are, and s is what belongs to the unit. The clamp's part-to-part
//! breakdown tolerance belongs to the unit too, but moves the reading differently at different
//! conditions; it is kept as its own axis, split into [`SEGMENTS`] equal segments.
//!
//! # Configuration time ([`Design::unit_table`])
//!
//! The cells are those of [`compensate`] (bins of the measured supply and
//! on-current, widened by the readings' accuracy and resolution). For each cell and each
//! breakdown segment, the window a **nominal-L** healthy unit reads there is found over the
//! cell's supply, on-current and resistance, the clamp parts' temperatures and the segment's
//! two ends — 2⁹ corners, the same corner argument as the compensated windows (each axis
//! monotonic, the breakdown monotonic within a segment, so a unit anywhere in the segment reads
//! inside the window). The window gets the design's guard and is stored in sixteenths of a
//! tick, rounded outward.
//!
//! # Run time ([`UnitLearner`])
//!
//! A reading of T ticks with timing jitter J comes from a true time t·f in (T − E, T + E),
//! E = J + 1 (the timer's own quantisation adds one tick). If the unit sits in segment k, its
//! reading in cell c satisfies s·lo ≤ t·f ≤ s·hi, so s ∈ [(T − E)/hi, (T + E)/lo]. The learned
//! state is, per segment, the interval of s consistent with **every** reading so far
//! (set-membership estimation: intersect the intervals; a segment whose interval empties cannot
//! hold this unit). It starts at the design's inductance tolerance. All integer: s in ppm,
//! bounds rounded outward, products in u64.
//!
//! - Learning: each reading the design's compensated windows call healthy narrows the state;
//!   any other reading throws the learning away ([`UnitReading::Refused`]); readings no single
//!   healthy unit can give together (every segment emptied) are refused as
//!   [`UnitReading::NotOneUnit`] and learning restarts. After N healthy readings the state is
//!   learned and frozen.
//! - Monitoring: a reading the design calls a fault is [`UnitReading::Fault`]; a healthy reading
//!   consistent with the learned state in some segment is [`UnitReading::Healthy`]; otherwise
//!   [`UnitReading::Departure`] (healthy by the design, impossible for this unit).
//!
//! A healthy unit never departs: its true (s, segment) stays inside the learned state through
//! every reading, wherever in the design's range it learned and is read (up to the corner
//! argument and the guard). What the state lets through is the cell's width and one breakdown
//! segment: narrower bins give a tighter unit window. Shorted turns (L·(1 − f)²) move s itself
//! and depart once the fall exceeds that width; a coil too hot is the
//! [`ResistanceLimit`](super::compensate::ResistanceLimit)'s to catch, an open clamp the design
//! windows'.
//!
//! The learned state persists as [`STATE_BYTES`] bytes: a layout version, the table's
//! fingerprint (a state learned against another table is refused), the intervals and a 32-bit
//! FNV-1a checksum; restoring checks all of it.
//!
//! Work: the table, S·C cells × [`SEGMENTS`] × 2⁹ corners (each one switch-off set-up and at
//! most two decay integrations) on top of the compensated windows; a reading, S + C bin
//! comparisons, one [`Windows::classify`](super::Windows::classify) and 2·[`SEGMENTS`] u64
//! products and divisions.

use super::classify::Verdict;
use super::compensate::{self, CompensatedWindows, MeasuredAccuracy, Span};
use super::learn::{MAX_READINGS, MIN_READINGS};
use super::windows::{Design, Measurement, Timing};
use super::Condition;
use crate::error::{Error, Reason};
use crate::units::{Amps, Volts};

/// Segments of the clamp's breakdown tolerance the learner keeps apart.
pub const SEGMENTS: usize = 4;

/// Bytes of a persisted learned state ([`UnitLearner::state_bytes`]).
pub const STATE_BYTES: usize = 1 + 4 + 8 * SEGMENTS + 4;

/// Sixteenths of a tick per tick: the table's fixed-point scale.
pub const SUBTICKS: u64 = 16;

/// Layout version of the persisted state.
const VERSION: u8 = 1;

/// What a nominal-inductance healthy unit reads in one cell, per breakdown segment: within
/// `lo[k] … hi[k]` sixteenths of a tick (guard included, jitter not). A cell no healthy unit
/// can reach holds zeros (the design's windows never call a reading there healthy).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UnitCell {
    /// Lowest reading per segment, 1/16 tick.
    pub lo: [u32; SEGMENTS],
    /// Highest reading per segment, 1/16 tick.
    pub hi: [u32; SEGMENTS],
}

impl UnitCell {
    /// A cell with no healthy unit.
    pub const EMPTY: UnitCell = UnitCell {
        lo: [0; SEGMENTS],
        hi: [0; SEGMENTS],
    };
}

/// The run-time table of the unit learner: the design's compensated windows (for the verdict)
/// and, on the same cells, the nominal-L unit windows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UnitTable<const S: usize, const C: usize> {
    /// The design's windows per cell: the verdict on every reading.
    pub design: CompensatedWindows<S, C>,
    /// The nominal-L unit windows, `[supply bin][current bin]`, on the same edges.
    pub cells: [[UnitCell; C]; S],
    /// The inductance factor's range over the design's tolerance, ppm (rounded outward).
    pub scale_ppm: (u32, u32),
    /// E: half the width of what one reading leaves open, ticks (the jitter plus the timer's
    /// one tick of quantisation).
    pub reading_halfwidth_ticks: u32,
}

impl<const S: usize, const C: usize> UnitTable<S, C> {
    /// The unit cell of the measured supply (mV) and on-current (µA); None only with no bins.
    /// Work: S + C comparisons.
    pub fn cell(&self, supply_mv: u32, on_current_ua: u32) -> Option<&UnitCell> {
        let (s, c) = self.design.bins(supply_mv, on_current_ua);
        self.cells.get(s).and_then(|row| row.get(c))
    }

    /// A 32-bit fingerprint of the table (FNV-1a's step over its edges, its unit windows and its
    /// healthy windows), stored
    /// with a learned state so a state learned against another table is refused. Work: one pass
    /// over S·C·(2·[`SEGMENTS`] + the windows) words.
    pub fn fingerprint(&self) -> u32 {
        let mut f = Fnv::default();
        f.word(self.scale_ppm.0);
        f.word(self.scale_ppm.1);
        f.word(self.reading_halfwidth_ticks);
        for e in self.design.supply_edges_mv.iter() {
            f.word(*e);
        }
        for e in self.design.current_edges_ua.iter() {
            f.word(*e);
        }
        for (row, wrow) in self.cells.iter().zip(self.design.windows.iter()) {
            for (c, w) in row.iter().zip(wrow.iter()) {
                for x in c.lo.iter().chain(c.hi.iter()) {
                    f.word(*x);
                }
                let (lo, hi) = w.healthy().unwrap_or((u32::MAX, 0));
                f.word(lo);
                f.word(hi);
            }
        }
        f.value()
    }
}

/// FNV-1a's step (Fowler, Noll and Vo; offset basis 2166136261, prime 16777619, from memory)
/// over 32-bit words: h ← (h ⊕ w)·p mod 2³². Each step is a bijection of the running hash (p is
/// odd), so two word strings of the same length that differ in one word always hash apart.
struct Fnv(u32);

impl Default for Fnv {
    fn default() -> Self {
        Fnv(0x811C_9DC5)
    }
}

impl Fnv {
    fn word(&mut self, x: u32) {
        self.0 = (self.0 ^ x).wrapping_mul(0x0100_0193);
    }
    fn value(&self) -> u32 {
        self.0
    }
}

/// The learned state: per breakdown segment, the interval of the unit's inductance factor (ppm)
/// consistent with every reading so far. A segment with `lo > hi` cannot hold the unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UnitState {
    /// Lowest consistent factor per segment, ppm.
    pub lo_ppm: [u32; SEGMENTS],
    /// Highest consistent factor per segment, ppm.
    pub hi_ppm: [u32; SEGMENTS],
}

impl UnitState {
    /// Every segment over the design's inductance range: nothing learned yet.
    const fn open(scale_ppm: (u32, u32)) -> Self {
        UnitState {
            lo_ppm: [scale_ppm.0; SEGMENTS],
            hi_ppm: [scale_ppm.1; SEGMENTS],
        }
    }

    /// True when some segment can still hold the unit.
    pub fn alive(&self) -> bool {
        self.lo_ppm
            .iter()
            .zip(self.hi_ppm.iter())
            .any(|(l, h)| l <= h)
    }

    /// Narrows the state by a reading of `ticks` in `cell` (E = `e` ticks each side).
    /// Integer: s·hi ≥ (T − E)·16·10⁶ and s·lo ≤ (T + E)·16·10⁶, bounds rounded outward.
    fn narrow(&mut self, cell: &UnitCell, ticks: u32, e: u32) {
        let (below, above) = bounds(ticks, e);
        let windows = cell.lo.iter().zip(cell.hi.iter());
        for ((lo, hi), (w_lo, w_hi)) in self
            .lo_ppm
            .iter_mut()
            .zip(self.hi_ppm.iter_mut())
            .zip(windows)
        {
            let (w_lo, w_hi) = (u64::from(*w_lo), u64::from(*w_hi));
            // Lower bound s ≥ (T − E)/hi, rounded down; a window reading 0 at most admits
            // only readings within E of zero.
            let s_min = match below.checked_div(w_hi) {
                Some(q) => q,
                None if below == 0 => 0,
                None => u64::MAX,
            };
            // Upper bound s ≤ (T + E)/lo, rounded up; no bound from a window starting at 0.
            let s_max = match above.checked_div(w_lo) {
                Some(q) => q.saturating_add(u64::from(above % w_lo.max(1) != 0)),
                None => u64::MAX,
            };
            *lo = (*lo).max(u32::try_from(s_min).unwrap_or(u32::MAX));
            *hi = (*hi).min(u32::try_from(s_max).unwrap_or(u32::MAX));
        }
    }

    /// True when some live segment holds a factor s that reads `ticks` in `cell`: s_lo·lo ≤
    /// (T + E)·16·10⁶ and s_hi·hi ≥ (T − E)·16·10⁶. Products only (no division); never
    /// stricter than the truth, since the true s lies in [s_lo, s_hi] and reads
    /// s·lo ≤ t·f < T + E, s·hi ≥ t·f > T − E.
    fn admits(&self, cell: &UnitCell, ticks: u32, e: u32) -> bool {
        let (below, above) = bounds(ticks, e);
        let segs = self.lo_ppm.iter().zip(self.hi_ppm.iter());
        let windows = cell.lo.iter().zip(cell.hi.iter());
        segs.zip(windows).any(|((lo, hi), (w_lo, w_hi))| {
            lo <= hi
                && u64::from(*lo).saturating_mul(u64::from(*w_lo)) <= above
                && u64::from(*hi).saturating_mul(u64::from(*w_hi)) >= below
        })
    }
}

/// (T − E, T + E) in 16·10⁶ units: a u32 times 1.6·10⁷ stays below 2⁶⁴, so the saturation
/// never acts.
fn bounds(ticks: u32, e: u32) -> (u64, u64) {
    let k = SUBTICKS * 1_000_000;
    (
        u64::from(ticks.saturating_sub(e)).saturating_mul(k),
        u64::from(ticks.saturating_add(e)).saturating_mul(k),
    )
}

/// What one reading says to a [`UnitLearner`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum UnitReading {
    /// Healthy by the design; still learning (`seen` of the readings needed).
    Learning {
        /// Healthy readings taken so far.
        seen: u16,
    },
    /// Not healthy by the design's windows while learning: the learning restarts. The design's
    /// verdict is carried.
    Refused(Verdict),
    /// Each reading healthy by the design, but no single healthy unit gives them all (a unit
    /// changing while it learns): the learning restarts.
    NotOneUnit,
    /// This reading completed the learning.
    Learned,
    /// Consistent with this unit.
    Healthy,
    /// Healthy by the design, but no reading this unit can give at these conditions: an early
    /// warning (shorted turns beginning, a clamp drifting).
    Departure,
    /// Not healthy by the design's windows: the design's verdict.
    Fault(Verdict),
}

/// Learns one unit from its first `N` healthy readings, at whatever conditions they come, then
/// judges each later reading at its own measured supply and on-current.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UnitLearner<const N: usize> {
    state: UnitState,
    seen: u16,
    learned: bool,
    scale_ppm: (u32, u32),
    fingerprint: u32,
}

/// The words a persisted state holds after its version: the fingerprint, then the segments'
/// lower and upper bounds.
const WORDS: usize = 1 + 2 * SEGMENTS;

impl<const N: usize> UnitLearner<N> {
    /// A learner against `table`, nothing learned. Work: one pass of
    /// [`UnitTable::fingerprint`].
    ///
    /// # Errors
    /// `N` outside 5 … 256 → [`Reason::OutsideValidatedRange`] on `"readings"`; an inductance
    /// range that is empty → [`Reason::Inconsistent`] on `"unit table"`.
    pub fn new<const S: usize, const C: usize>(table: &UnitTable<S, C>) -> Result<Self, Error> {
        if !(MIN_READINGS..=MAX_READINGS).contains(&N) {
            return Err(Error::new("readings", Reason::OutsideValidatedRange));
        }
        if table.scale_ppm.0 > table.scale_ppm.1 || table.scale_ppm.1 == 0 {
            return Err(Error::new("unit table", Reason::Inconsistent));
        }
        Ok(UnitLearner {
            state: UnitState::open(table.scale_ppm),
            seen: 0,
            learned: false,
            scale_ppm: table.scale_ppm,
            fingerprint: table.fingerprint(),
        })
    }

    /// A learner that resumes monitoring from a persisted state, checked: its version, its
    /// checksum, the table's fingerprint, every live interval inside the design's inductance
    /// range, and at least one live segment. Work: as [`UnitLearner::new`], plus
    /// [`STATE_BYTES`] bytes.
    ///
    /// # Errors
    /// As [`UnitLearner::new`]; any check failing → [`Reason::Inconsistent`] on
    /// `"learned state"`.
    pub fn resume<const S: usize, const C: usize>(
        table: &UnitTable<S, C>,
        bytes: &[u8; STATE_BYTES],
    ) -> Result<Self, Error> {
        let mut l = Self::new(table)?;
        let bad = Error::new("learned state", Reason::Inconsistent);
        // Byte 0 the version, then WORDS words and the checksum, each u32 little-endian.
        let mut words = [0u32; WORDS + 1];
        let packed = bytes.get(1..).unwrap_or(&[]).chunks_exact(4);
        for (w, c) in words.iter_mut().zip(packed) {
            *w = c.try_into().map_or(0, u32::from_le_bytes);
        }
        let (body, sum) = words.split_at(WORDS);
        let ok = bytes.first() == Some(&VERSION)
            && sum.first() == Some(&checksum(body))
            && body.first() == Some(&l.fingerprint);
        if !ok {
            return Err(bad);
        }
        let bounds = body.get(1..).unwrap_or(&[]);
        let (lo_w, hi_w) = bounds.split_at(SEGMENTS.min(bounds.len()));
        let mut state = l.state;
        for ((lo, hi), (slo, shi)) in lo_w
            .iter()
            .zip(hi_w.iter())
            .zip(state.lo_ppm.iter_mut().zip(state.hi_ppm.iter_mut()))
        {
            if lo <= hi && (*lo < table.scale_ppm.0 || *hi > table.scale_ppm.1) {
                return Err(bad);
            }
            *slo = *lo;
            *shi = *hi;
        }
        if !state.alive() {
            return Err(bad);
        }
        l.state = state;
        l.learned = true;
        l.seen = N as u16;
        Ok(l)
    }

    /// The learned state as bytes to persist, once learned: a version byte, the table's
    /// fingerprint, the segments' lower then upper bounds (ppm), and a checksum of those words
    /// (FNV-1a's step over the words, with the version): each a u32, little-endian.
    pub fn state_bytes(&self) -> Option<[u8; STATE_BYTES]> {
        if !self.learned {
            return None;
        }
        let mut body = [0u32; WORDS];
        let bounds = self.state.lo_ppm.iter().chain(self.state.hi_ppm.iter());
        for (w, x) in body
            .iter_mut()
            .zip(core::iter::once(&self.fingerprint).chain(bounds))
        {
            *w = *x;
        }
        let mut out = [0u8; STATE_BYTES];
        let sum = checksum(&body);
        let bytes = body
            .iter()
            .chain(core::iter::once(&sum))
            .flat_map(|w| w.to_le_bytes());
        for (o, b) in out.iter_mut().zip(core::iter::once(VERSION).chain(bytes)) {
            *o = b;
        }
        Some(out)
    }

    /// The current state (the learned one once [`UnitLearner::learned`]).
    pub fn state(&self) -> UnitState {
        self.state
    }

    /// True once the learning is complete.
    pub fn learned(&self) -> bool {
        self.learned
    }

    /// Forgets what was learned (after a repair) and starts again.
    pub fn forget(&mut self) {
        self.state = UnitState::open(self.scale_ppm);
        self.seen = 0;
        self.learned = false;
    }

    /// Takes one reading: the supply (mV) and on-current (µA) the firmware measured before the
    /// switch-off, and the decay's ticks. `table` must be the one the learner was made with.
    /// Integer only; work: S + C comparisons, one [`Windows::classify`](super::Windows::classify),
    /// then while learning 2·[`SEGMENTS`] u64 divisions, once learned 2·[`SEGMENTS`] u64
    /// products.
    pub fn observe<const S: usize, const C: usize>(
        &mut self,
        table: &UnitTable<S, C>,
        supply_mv: u32,
        on_current_ua: u32,
        ticks: u32,
    ) -> UnitReading {
        let verdict = table.design.classify(supply_mv, on_current_ua, ticks);
        let cell = table.cell(supply_mv, on_current_ua);
        let (Verdict::Healthy, Some(cell)) = (verdict, cell) else {
            if self.learned {
                return UnitReading::Fault(verdict);
            }
            self.forget();
            return UnitReading::Refused(verdict);
        };
        let e = table.reading_halfwidth_ticks;
        if self.learned {
            return if self.state.admits(cell, ticks, e) {
                UnitReading::Healthy
            } else {
                UnitReading::Departure
            };
        }
        self.state.narrow(cell, ticks, e);
        if !self.state.alive() {
            self.forget();
            return UnitReading::NotOneUnit;
        }
        self.seen = self.seen.saturating_add(1);
        if usize::from(self.seen) < N {
            return UnitReading::Learning { seen: self.seen };
        }
        self.learned = true;
        UnitReading::Learned
    }
}

/// The persisted state's checksum: FNV-1a's step over the version and the words.
fn checksum(words: &[u32]) -> u32 {
    let mut f = Fnv::default();
    f.word(u32::from(VERSION));
    for w in words {
        f.word(*w);
    }
    f.value()
}

impl Design {
    /// The unit learner's table: the compensated windows on the given bins (see
    /// [`Design::compensated_tick_windows`]) and, per cell and breakdown segment, the window a
    /// nominal-inductance healthy unit reads (see the module docs).
    ///
    /// Work: that of [`Design::compensated_tick_windows`], plus S·C·[`SEGMENTS`]·2⁹ corners.
    ///
    /// A 24 V valve (350 mH ± 10 %, 56 Ω ± 20 %, a 0.8 V freewheeling diode) timed from 300 to
    /// 50 mA at 1 MHz learns at 21 V and is judged at 27 V:
    /// ```
    /// use kickguard::breakdown::Breakdown;
    /// use kickguard::clamp::{Clamp, Side};
    /// use kickguard::coil::Coil;
    /// use kickguard::diagnosis::compensate::MeasuredAccuracy;
    /// use kickguard::diagnosis::unit::{UnitLearner, UnitReading};
    /// use kickguard::diagnosis::{Design, Measurement, ShortedTurns, Timing};
    /// use kickguard::diode::Diode;
    /// use kickguard::{Amps, Duty, Henries, Hertz, Ohms, Temperature, Volts};
    /// # fn main() -> Result<(), kickguard::Error> {
    /// let t = |c| Temperature::from_celsius(c);
    /// let design = Design {
    ///     coil: Coil::fixed(Henries::new(0.35)?, Ohms::new(56.0)?)?,
    ///     inductance_tolerance: 0.1,
    ///     resistance_tolerance: 0.2,
    ///     v_supply_min: Volts::new(20.0)?,
    ///     v_supply_max: Volts::new(28.0)?,
    ///     t_winding_min: t(20.0)?,
    ///     t_winding_max: t(60.0)?,
    ///     t_winding_fault_max: t(100.0)?,
    ///     t_clamp_min: t(20.0)?,
    ///     t_clamp_max: t(60.0)?,
    ///     clamp: Clamp::FreewheelDiode(Diode::FixedDrop(Volts::new(0.8)?)),
    ///     clamp_tolerance: 0.0,
    ///     switch_avalanche: Breakdown::ideal(Volts::new(66.0)?)?,
    ///     avalanche_tolerance: 0.0,
    ///     shorted: ShortedTurns::Fraction(0.2),
    ///     side: Side::Low,
    /// };
    /// let m = Measurement::BetweenCurrents { upper: Amps::new(0.3)?, lower: Amps::new(0.05)? };
    /// let timing = Timing { tick: Hertz::new(1e6)?, guard: Duty::new(0.02)?, jitter_ticks: 2 };
    /// let acc = MeasuredAccuracy { supply: 0.01, current: 0.01, supply_step: 0.0, current_step: 0.0 };
    /// // Supply bins of 2 V, on-current bins of 40 mA (the last takes everything above).
    /// let supply = [22.0, 24.0, 26.0, 28.0].map(|v| Volts::new(v).unwrap());
    /// let current = [0.36, 0.40, 0.44, 0.48, 0.52, 0.56, 0.60].map(|a| Amps::new(a).unwrap());
    /// let table = design.unit_table(&m, &timing, &acc, supply, current)?;
    ///
    /// // This unit (L 5 % high, R 60 Ω) reads, by the constant-clamp decay
    /// // t = (L/R)·ln((0.3 + 0.8/R)/(0.05 + 0.8/R)):
    /// let ticks = |l: f64, r: f64| ((l / r) * ((0.3 + 0.8 / r) / (0.05 + 0.8 / r)).ln() * 1e6) as u32;
    /// let (l, r) = (0.35 * 1.05, 60.0);
    /// let mut unit: UnitLearner<8> = UnitLearner::new(&table)?;
    /// for _ in 0..8 {
    ///     unit.observe(&table, 21_000, 350_000, ticks(l, r)); // 21 V, 350 mA
    /// }
    /// assert!(unit.learned());
    /// // At 27 V (450 mA) the same unit is itself; shorted turns (L·0.64, R·0.8) are not.
    /// assert_eq!(unit.observe(&table, 27_000, 450_000, ticks(l, r)), UnitReading::Healthy);
    /// assert_ne!(unit.observe(&table, 27_000, 562_500, ticks(l * 0.64, r * 0.8)), UnitReading::Healthy);
    /// let stored = unit.state_bytes(); // persist these; UnitLearner::resume checks them
    /// # assert!(stored.is_some());
    /// # Ok(())
    /// # }
    /// ```
    ///
    /// # Errors
    /// As [`Design::compensated_tick_windows`]; a unit window beyond 2³² sixteenths of a tick
    /// → [`Reason::TooLarge`] on `"unit window"`.
    pub fn unit_table<const S: usize, const C: usize>(
        &self,
        m: &Measurement,
        timing: &Timing,
        acc: &MeasuredAccuracy,
        supply_edges: [Volts; S],
        current_edges: [Amps; C],
    ) -> Result<UnitTable<S, C>, Error> {
        let design = self.compensated_tick_windows(m, timing, acc, supply_edges, current_edges)?;
        let a = compensate::accuracy(acc)?;
        let sv = compensate::edges("supply edges", &supply_edges.map(|v| v.value()))?;
        let ci = compensate::edges("current edges", &current_edges.map(|a| a.value()))?;
        let ranges = self.ranges()?;
        let i_top = self.i_top(&a, &ranges);
        let lt = self.inductance_tolerance;
        let mut out = UnitTable {
            design,
            cells: [[UnitCell::EMPTY; C]; S],
            scale_ppm: (
                libm::floorf((1.0 - lt) * 1e6) as u32,
                libm::ceilf((1.0 + lt) * 1e6) as u32,
            ),
            reading_halfwidth_ticks: timing.jitter_ticks.saturating_add(1),
        };
        for (k, row) in (0..S).zip(out.cells.iter_mut()) {
            for (j, cell) in (0..C).zip(row.iter_mut()) {
                let (v, i) = self.cell_readings(&a, &sv, &ci, i_top, k, j);
                *cell = self.unit_cell(m, timing, ranges.healthy, v, i)?;
            }
        }
        Ok(out)
    }

    /// One cell's nominal-L unit windows: supply `v`, on-current `i`, healthy resistance range
    /// `healthy`.
    fn unit_cell(
        &self,
        m: &Measurement,
        timing: &Timing,
        healthy: (f32, f32),
        v: (f32, f32),
        i: (f32, f32),
    ) -> Result<UnitCell, Error> {
        let Some((i, r)) = compensate::cell_resistance(v, i, healthy) else {
            return Ok(UnitCell::EMPTY);
        };
        let mut out = UnitCell::EMPTY;
        let (ct, at) = (self.clamp_tolerance, self.avalanche_tolerance);
        let g = timing.guard.value();
        let f = timing.tick.value() as f64 * SUBTICKS as f64;
        for seg in 0..SEGMENTS {
            let part = |t: f32| {
                let step = 2.0 * t / SEGMENTS as f32;
                (
                    1.0 - t + step * seg as f32,
                    1.0 - t + step * (seg as f32 + 1.0),
                )
            };
            let span = Span {
                inductance: (1.0, 1.0),
                clamp: part(ct),
                avalanche: part(at),
            };
            let Some(w) = self.cell_window_over(Condition::Healthy, m, (v, i, r), &span)? else {
                continue;
            };
            let lo = libm::floor(w.min.value() as f64 * (1.0 - g as f64) * f);
            let hi = libm::ceil(w.max.value() as f64 * (1.0 + g as f64) * f);
            if !(hi < u32::MAX as f64) {
                return Err(Error::new("unit window", Reason::TooLarge));
            }
            if let (Some(l), Some(h)) = (out.lo.get_mut(seg), out.hi.get_mut(seg)) {
                *l = lo.max(0.0) as u32;
                *h = hi as u32;
            }
        }
        Ok(out)
    }
}
