//! Run time: the verdict on a measured tick count, by integer comparisons only.
//!
//! The windows come from [`super::windows::Design::tick_windows`] at configuration time (or as
//! generated constants). The rules, in order:
//! 1. inside the healthy window → [`Verdict::Healthy`], whatever else overlaps there (a healthy
//!    measurement is never called a fault inside its own window);
//! 2. inside exactly one fault window → [`Verdict::Fault`] with that condition;
//! 3. inside several → [`Verdict::Ambiguous`] with the set of candidates;
//! 4. inside none → [`Verdict::Unexplained`] (outside everything the model predicts: suspect the
//!    measurement or a fault not modelled).
//!
//! No floating point, no division, a fixed loop over at most [`MAX_WINDOWS`] entries: it runs in
//! an interrupt on a core without an FPU (measured: see `cargo bench --bench instructions`).

use super::Condition;

/// Largest number of windows a [`Windows`] holds (one per [`Condition`]).
pub const MAX_WINDOWS: usize = 6;

/// One window in ticks, inclusive at both ends.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Entry {
    /// Lowest tick count of the window.
    pub lo: u32,
    /// Highest tick count of the window.
    pub hi: u32,
    /// The condition it belongs to.
    pub condition: Condition,
}

impl Entry {
    /// An unused slot (never matches: lo > hi).
    pub const EMPTY: Entry = Entry {
        lo: 1,
        hi: 0,
        condition: Condition::Healthy,
    };
}

/// A set of conditions, one bit per [`Condition::code`] (bit 0 healthy … bit 5 coil too hot):
/// the candidates of an ambiguous verdict.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Candidates(pub u8);

impl Candidates {
    /// The empty set.
    pub const NONE: Candidates = Candidates(0);

    /// The set with `c` added.
    #[inline]
    pub const fn with(self, c: Condition) -> Candidates {
        // code() ≤ 5: the shift stays inside the byte.
        Candidates(self.0 | (1u8 << (c.code() & 7)))
    }

    /// True when `c` is in the set.
    #[inline]
    pub const fn contains(self, c: Condition) -> bool {
        self.0 & (1u8 << (c.code() & 7)) != 0
    }

    /// How many conditions are in the set.
    pub const fn count(self) -> u32 {
        self.0.count_ones()
    }

    /// The conditions in the set, in [`Condition::ALL`] order.
    pub fn iter(self) -> impl Iterator<Item = Condition> {
        Condition::ALL
            .into_iter()
            .filter(move |c| self.contains(*c))
    }
}

/// The verdict on one measurement.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Verdict {
    /// Inside the healthy window.
    Healthy,
    /// Inside exactly one fault's window.
    Fault(Condition),
    /// Inside several fault windows and not the healthy one: the candidates.
    Ambiguous(Candidates),
    /// Inside no window at all.
    Unexplained,
}

/// The windows a firmware classifies against, in ticks.
///
/// Stored for the run-time check: the healthy window apart, the fault windows each as (lowest
/// tick, span = hi − lo + 1), so that "inside" is one wrapping subtraction and one comparison,
/// `ticks − lo < span` (wrapping makes a tick count below `lo` a huge number), and an unused
/// slot (span 0) never matches: the loop runs over every slot without a length test. The span
/// saturates at `u32::MAX`: a window from 0 to `u32::MAX` covers every count but `u32::MAX`
/// itself, the only case where a window is one tick narrower than asked.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Windows {
    healthy: Option<(u32, u32)>,
    fault_lo: [u32; MAX_WINDOWS],
    fault_span: [u32; MAX_WINDOWS],
    /// Each fault window's condition as its candidate bit, 1 << code (0 in an unused slot).
    fault_bit: [u8; MAX_WINDOWS],
    n_faults: usize,
}

impl Windows {
    /// Windows from a table (for generated constants): the first `len` entries count (at most
    /// [`MAX_WINDOWS`]); entries with `lo > hi` never match; if several healthy entries are given,
    /// the last one counts.
    ///
    /// Work: one pass over at most [`MAX_WINDOWS`] entries; no arithmetic that can overflow
    /// (the spans saturate).
    #[allow(clippy::indexing_slicing)] // const fn: `get` is unavailable; indices guarded below
    pub const fn from_entries(entries: [Entry; MAX_WINDOWS], len: usize) -> Self {
        let len = if len > MAX_WINDOWS { MAX_WINDOWS } else { len };
        let mut healthy = None;
        let mut fault_lo = [0u32; MAX_WINDOWS];
        let mut fault_span = [0u32; MAX_WINDOWS];
        let mut fault_bit = [0u8; MAX_WINDOWS];
        let mut n_faults = 0usize;
        let mut k = 0usize;
        // Indices are checked against MAX_WINDOWS in the loop condition and before each store,
        // so no bounds check can fail (const fn cannot use `get`).
        while k < len && k < MAX_WINDOWS {
            let e = entries[k];
            if e.lo <= e.hi && n_faults < MAX_WINDOWS {
                // lo ≤ hi: the difference cannot wrap.
                let width = e.hi - e.lo;
                if matches!(e.condition, Condition::Healthy) {
                    healthy = Some((e.lo, width));
                } else {
                    fault_lo[n_faults] = e.lo;
                    fault_span[n_faults] = width.saturating_add(1);
                    // code() ≤ 5: the shift stays inside the byte.
                    fault_bit[n_faults] = 1u8 << (e.condition.code() & 7);
                    // n_faults < MAX_WINDOWS here: cannot saturate.
                    n_faults = n_faults.saturating_add(1);
                }
            }
            k = k.saturating_add(1);
        }
        Windows {
            healthy,
            fault_lo,
            fault_span,
            fault_bit,
            n_faults,
        }
    }

    /// Windows from the rows of a generated table, `[lowest tick, highest tick, condition code]`
    /// (as written by the configuration step). Rows with an unknown code or beyond
    /// [`MAX_WINDOWS`] are ignored.
    ///
    /// ```
    /// use kickguard::diagnosis::{Condition, Verdict, Windows};
    /// const ROWS: [[u32; 3]; 2] = [[29, 74, 0], [16, 45, 1]];
    /// let w = Windows::from_rows(&ROWS);
    /// assert_eq!(w.classify(20), Verdict::Fault(Condition::ClampOpen));
    /// ```
    pub fn from_rows(rows: &[[u32; 3]]) -> Self {
        let mut entries = [Entry::EMPTY; MAX_WINDOWS];
        let mut n = 0usize;
        for [lo, hi, code] in rows.iter().copied() {
            if let (Some(condition), Some(slot)) = (Condition::from_code(code), entries.get_mut(n))
            {
                *slot = Entry { lo, hi, condition };
                // n < MAX_WINDOWS here (the slot existed): cannot saturate.
                n = n.saturating_add(1);
            }
        }
        Windows::from_entries(entries, n)
    }

    /// The healthy window (lowest, highest tick), if there is one.
    pub const fn healthy(&self) -> Option<(u32, u32)> {
        match self.healthy {
            // lo + width ≤ u32::MAX: width was hi − lo.
            Some((lo, w)) => Some((lo, lo.saturating_add(w))),
            None => None,
        }
    }

    /// The windows in use, healthy first, as entries (for reports and generated code).
    pub fn entries(&self) -> impl Iterator<Item = Entry> + '_ {
        let healthy = self.healthy.map(|(lo, w)| Entry {
            lo,
            hi: lo.saturating_add(w),
            condition: Condition::Healthy,
        });
        let faults = self
            .fault_lo
            .iter()
            .zip(self.fault_span.iter())
            .zip(self.fault_bit.iter())
            .take(self.n_faults)
            .map(|((&lo, &span), &bit)| Entry {
                lo,
                hi: lo.saturating_add(span.saturating_sub(1)),
                // A slot in use holds one bit of a known code.
                condition: Condition::from_code(bit.trailing_zeros()).unwrap_or(Condition::Healthy),
            });
        healthy.into_iter().chain(faults)
    }

    /// The verdict on a measured tick count (integer comparisons only).
    ///
    /// ```
    /// use kickguard::diagnosis::classify::{Entry, Windows, MAX_WINDOWS};
    /// use kickguard::diagnosis::{Condition, Verdict};
    /// let mut e = [Entry::EMPTY; MAX_WINDOWS];
    /// e[0] = Entry { lo: 40, hi: 60, condition: Condition::Healthy };
    /// e[1] = Entry { lo: 10, hi: 25, condition: Condition::ClampOpen };
    /// let w = Windows::from_entries(e, 2);
    /// assert_eq!(w.classify(50), Verdict::Healthy);
    /// assert_eq!(w.classify(12), Verdict::Fault(Condition::ClampOpen));
    /// assert_eq!(w.classify(30), Verdict::Unexplained);
    /// ```
    #[inline]
    pub fn classify(&self, ticks: u32) -> Verdict {
        if let Some((lo, width)) = self.healthy {
            if ticks.wrapping_sub(lo) <= width {
                return Verdict::Healthy;
            }
        }
        // Written out for the six slots (the pattern fails to compile if MAX_WINDOWS changes):
        // straight-line code, no loop counter, the same on a core that does not unroll.
        let [l0, l1, l2, l3, l4, l5] = self.fault_lo;
        let [s0, s1, s2, s3, s4, s5] = self.fault_span;
        let [b0, b1, b2, b3, b4, b5] = self.fault_bit;
        let set = hit(ticks, l0, s0, b0)
            | hit(ticks, l1, s1, b1)
            | hit(ticks, l2, s2, b2)
            | hit(ticks, l3, s3, b3)
            | hit(ticks, l4, s4, b4)
            | hit(ticks, l5, s5, b5);
        // One bit set: x & (x − 1) clears the lowest bit (no population count, which a core
        // without one would run in software). set ≥ 1 there, so the subtraction cannot wrap.
        if set == 0 {
            Verdict::Unexplained
        } else if set & set.wrapping_sub(1) == 0 {
            match Condition::from_code(set.trailing_zeros()) {
                Some(c) => Verdict::Fault(c),
                None => Verdict::Unexplained,
            }
        } else {
            Verdict::Ambiguous(Candidates(set))
        }
    }
}

/// A slot's candidate bit where `ticks` is inside it (`ticks − lo < span`, wrapping), else 0.
/// Branch-free.
#[inline(always)]
const fn hit(ticks: u32, lo: u32, span: u32, bit: u8) -> u8 {
    bit & ((ticks.wrapping_sub(lo) < span) as u8).wrapping_neg()
}

/// Windows per temperature band: the measured winding (or board) temperature selects a narrower
/// set of windows. Bands are given by their upper edge in tenths of a degree Celsius, in
/// increasing order; the last band also takes everything above its edge.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BandedWindows<const B: usize> {
    /// Upper edge of each band, in 0.1 °C.
    pub upper_edges_deci_c: [i16; B],
    /// The windows of each band.
    pub windows: [Windows; B],
}

impl<const B: usize> BandedWindows<B> {
    /// The verdict on `ticks` with the windows of the band holding `temp_deci_c` (integer only).
    /// With no bands (`B` = 0) nothing is known: [`Verdict::Unexplained`].
    pub fn classify(&self, temp_deci_c: i16, ticks: u32) -> Verdict {
        let mut chosen = None;
        for (edge, w) in self.upper_edges_deci_c.iter().zip(self.windows.iter()) {
            chosen = Some(w);
            if temp_deci_c <= *edge {
                break;
            }
        }
        chosen.map_or(Verdict::Unexplained, |w| w.classify(ticks))
    }
}
