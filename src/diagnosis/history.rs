//! A fixed-capacity history of verdicts, so the firmware acts only on N consecutive faults.

use super::classify::Verdict;
use heapless::Deque;

/// The last `N` verdicts, oldest dropped first.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct VerdictHistory<const N: usize> {
    recent: Deque<Verdict, N>,
}

impl<const N: usize> Default for VerdictHistory<N> {
    fn default() -> Self {
        VerdictHistory {
            recent: Deque::new(),
        }
    }
}

impl<const N: usize> VerdictHistory<N> {
    /// An empty history.
    pub fn new() -> Self {
        Self::default()
    }

    /// Records a verdict, dropping the oldest when full.
    pub fn push(&mut self, v: Verdict) {
        if self.recent.is_full() {
            let _ = self.recent.pop_front();
        }
        // Cannot fail: a slot was just freed if needed (and N = 0 stores nothing).
        let _ = self.recent.push_back(v);
    }

    /// How many of the newest verdicts in a row equal `v`.
    pub fn consecutive(&self, v: Verdict) -> usize {
        self.recent.iter().rev().take_while(|x| **x == v).count()
    }

    /// True when the newest `n` verdicts (n ≥ 1) are all `v`.
    ///
    /// ```
    /// use kickguard::diagnosis::history::VerdictHistory;
    /// use kickguard::diagnosis::{Condition, Verdict};
    /// let mut h: VerdictHistory<8> = VerdictHistory::new();
    /// let open = Verdict::Fault(Condition::FreewheelOpen);
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
        self.recent.back().copied()
    }

    /// Forgets everything (for example after the fault was handled).
    pub fn clear(&mut self) {
        self.recent.clear();
    }
}
