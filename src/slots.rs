//! [`Slots`]: a fixed-capacity list of `Copy` items, for the few places the library itself
//! collects results (a board's inputs, a design's separations).
//!
//! It exists beside `heapless::Vec` (which the crate uses for buffers the caller fills) because
//! its bookkeeping is provably overflow-free: the link-time proof with overflow checks on covers
//! every public function, and a generic `push` instantiated inside the library is part of that.
//! Storage is `[Option<T>; N]` (no `unsafe`, no uninitialised memory); work is constant per
//! operation, and iteration visits at most N slots.

/// Up to `N` items of `T`, in insertion order.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Slots<T: Copy, const N: usize> {
    items: [Option<T>; N],
    len: usize,
}

impl<T: Copy, const N: usize> Default for Slots<T, N> {
    fn default() -> Self {
        Slots {
            items: [None; N],
            len: 0,
        }
    }
}

impl<T: Copy, const N: usize> Slots<T, N> {
    /// An empty list.
    pub fn new() -> Self {
        Self::default()
    }

    /// Appends `item`; when the list is full the item is handed back (no panic, no loss).
    ///
    /// # Errors
    /// The list already holds `N` items: `Err(item)`.
    pub fn push(&mut self, item: T) -> Result<(), T> {
        match self.items.get_mut(self.len) {
            Some(slot) => {
                *slot = Some(item);
                // len < N here (the slot existed): cannot saturate.
                self.len = self.len.saturating_add(1);
                Ok(())
            }
            None => Err(item),
        }
    }

    /// Number of items.
    pub fn len(&self) -> usize {
        self.len
    }

    /// True when there are no items.
    pub fn is_empty(&self) -> bool {
        self.len == 0
    }

    /// The k-th item, if there is one.
    pub fn get(&self, k: usize) -> Option<&T> {
        self.items.get(k).and_then(Option::as_ref)
    }

    /// The items in insertion order.
    pub fn iter(&self) -> impl Iterator<Item = &T> + '_ {
        self.items.iter().take(self.len).flatten()
    }
}

impl<'a, T: Copy, const N: usize> IntoIterator for &'a Slots<T, N> {
    type Item = &'a T;
    type IntoIter = core::iter::Flatten<core::iter::Take<core::slice::Iter<'a, Option<T>>>>;
    fn into_iter(self) -> Self::IntoIter {
        self.items.iter().take(self.len).flatten()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fills_then_hands_items_back() {
        let mut s: Slots<u8, 2> = Slots::new();
        assert!(s.is_empty());
        assert_eq!((s.push(1), s.push(2), s.push(3)), (Ok(()), Ok(()), Err(3)));
        assert_eq!(
            s.iter()
                .copied()
                .collect::<heapless::Vec<u8, 4>>()
                .as_slice(),
            &[1, 2]
        );
        assert_eq!((s.len(), s.get(1), s.get(2)), (2, Some(&2), None));
        let mut none: Slots<u8, 0> = Slots::new();
        assert_eq!(none.push(7), Err(7));
    }
}
