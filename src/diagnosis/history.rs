//! A fixed-capacity history of verdicts, so the firmware acts only on N consecutive faults.

use super::classify::Verdict;

/// The last `N` verdicts, oldest dropped first: a ring buffer of `N` slots, no allocation.
///
/// `N` = 0 is allowed and stores nothing: [`VerdictHistory::consecutive`] is then always 0 and
/// [`VerdictHistory::confirmed`] always false (a firmware that wants no confirmation should not
/// ask for one).
///
/// ```
/// use kickguard::diagnosis::history::VerdictHistory;
/// use kickguard::diagnosis::Verdict;
/// let mut none: VerdictHistory<0> = VerdictHistory::new();
/// none.push(Verdict::Healthy);
/// assert_eq!(none.latest(), None);
/// ```
#[derive(Debug, Clone, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct VerdictHistory<const N: usize> {
    slots: [Verdict; N],
    /// Index of the next slot to write.
    next: usize,
    /// Number of slots in use (≤ N).
    len: usize,
}

impl<const N: usize> Default for VerdictHistory<N> {
    fn default() -> Self {
        VerdictHistory {
            slots: [Verdict::Unexplained; N],
            next: 0,
            len: 0,
        }
    }
}

impl<const N: usize> VerdictHistory<N> {
    /// An empty history.
    pub fn new() -> Self {
        Self::default()
    }

    /// Records a verdict, dropping the oldest when full. Work: constant.
    pub fn push(&mut self, v: Verdict) {
        if let Some(slot) = self.slots.get_mut(self.next) {
            *slot = v;
            // next < N ≤ usize::MAX, so the saturating steps never saturate.
            let after = self.next.saturating_add(1);
            self.next = if after == N { 0 } else { after };
            self.len = self.len.saturating_add(1).min(N);
        }
    }

    /// The verdicts, newest first.
    fn newest_first(&self) -> impl Iterator<Item = Verdict> + '_ {
        // Slot of the k-th newest: next − 1 − k, modulo N (k < len ≤ N; nothing for N = 0).
        // With next < N and back ≤ N, `next + N − back` is below 2·N: written as
        // N − (back − next) so no intermediate exceeds N.
        (0..self.len).filter_map(move |k| {
            let back = k.saturating_add(1);
            let idx = match self.next.checked_sub(back) {
                Some(i) => i,
                None => N.saturating_sub(back - self.next),
            };
            self.slots.get(idx).copied()
        })
    }

    /// How many of the newest verdicts in a row equal `v`. Work: at most N comparisons.
    pub fn consecutive(&self, v: Verdict) -> usize {
        let mut n = 0usize;
        for x in self.newest_first() {
            if x != v {
                break;
            }
            // At most len ≤ N steps: cannot saturate.
            n = n.saturating_add(1);
        }
        n
    }

    /// True when the newest `n` verdicts (n ≥ 1) are all `v`.
    ///
    /// ```
    /// use kickguard::diagnosis::history::VerdictHistory;
    /// use kickguard::diagnosis::{Condition, Verdict};
    /// let mut h: VerdictHistory<8> = VerdictHistory::new();
    /// let open = Verdict::Fault(Condition::ClampOpen);
    /// h.push(open);
    /// h.push(Verdict::Healthy);
    /// h.push(open);
    /// h.push(open);
    /// assert!(h.confirmed(open, 2) && !h.confirmed(open, 3));
    /// ```
    pub fn confirmed(&self, v: Verdict, n: usize) -> bool {
        n >= 1 && self.consecutive(v) >= n
    }

    /// The newest verdict, if any.
    pub fn latest(&self) -> Option<Verdict> {
        self.newest_first().next()
    }

    /// Forgets everything (for example after the fault was handled).
    pub fn clear(&mut self) {
        self.next = 0;
        self.len = 0;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagnosis::Condition;

    #[test]
    fn ring_buffer_keeps_the_newest_n() {
        let open = Verdict::Fault(Condition::ClampOpen);
        let mut h: VerdictHistory<3> = VerdictHistory::new();
        for v in [open, open, Verdict::Healthy, open, open] {
            h.push(v);
        }
        assert_eq!(h.consecutive(open), 2);
        assert_eq!(h.latest(), Some(open));
        h.push(open);
        assert_eq!(h.consecutive(open), 3);
        assert!(h.confirmed(open, 3) && !h.confirmed(open, 4));
        h.clear();
        assert_eq!(h.latest(), None);
        let mut one: VerdictHistory<1> = VerdictHistory::new();
        one.push(Verdict::Healthy);
        one.push(open);
        assert_eq!((one.latest(), one.consecutive(open)), (Some(open), 1));
    }
}
