//! One integration per circuit: the times to any set of currents and the whole decay's
//! energies, from the library's one-pass [`SwitchOff::profile`].

use crate::clamp::{Decay, SwitchOff};
use crate::error::{Error, Reason};
use crate::units::{Amps, Seconds};

/// Most currents one profile takes (release, off, and two per measurement, plus the end).
pub const MAX_CURRENTS: usize = 12;

/// The times to each of `wanted` (any order; a current at or above the start current reads
/// zero) and the decay down to the lowest of them, or (`to_end`) on to the engine's end
/// current (zero where the loop reaches zero) when that is lower, from one integration.
///
/// Work: one profile over at most [`MAX_CURRENTS`] currents.
///
/// # Errors
/// More than [`MAX_CURRENTS`] − 1 currents → [`Reason::TooLarge`] on `"profile currents"`; a
/// loop that settles at a steady current too large to call the decay ended →
/// [`Reason::Unreachable`] on `"end current"`; the errors of [`SwitchOff::profile`] (a wanted
/// current at or below the steady current, or beyond the integration's span).
pub fn run(
    off: &SwitchOff,
    wanted: &[f32],
    to_end: bool,
    times: &mut [f32],
) -> Result<Decay, Error> {
    let end = off
        .end_current()
        .ok_or(Error::new("end current", Reason::Unreachable))?
        .value();
    let i0 = off.start_current().value();
    let mut list = [0.0f32; MAX_CURRENTS];
    let mut n = 0usize;
    fn push(list: &mut [f32], n: &mut usize, x: f32) -> Result<(), Error> {
        let slot = list
            .get_mut(*n)
            .ok_or(Error::new("profile currents", Reason::TooLarge))?;
        *slot = x;
        *n += 1;
        Ok(())
    }
    for &w in wanted {
        if w < i0 {
            push(&mut list, &mut n, w)?;
        }
    }
    if to_end || n == 0 {
        push(&mut list, &mut n, end)?;
    }
    let used = list
        .get_mut(..n)
        .ok_or(Error::new("profile currents", Reason::TooLarge))?;
    // Insertion sort, descending: at most MAX_CURRENTS items.
    for k in 1..used.len() {
        let mut j = k;
        while j > 0 && used.get(j - 1) < used.get(j) {
            used.swap(j - 1, j);
            j -= 1;
        }
    }
    let mut m = 0usize;
    for k in 0..used.len() {
        if m == 0 || used.get(k) != used.get(m - 1) {
            used.swap(m, k);
            m += 1;
        }
    }
    let sorted = used
        .get(..m)
        .ok_or(Error::new("profile currents", Reason::TooLarge))?;
    let (t, decay) = profile_of(off, sorted)?;
    for (slot, &w) in times.iter_mut().zip(wanted) {
        *slot = if w >= i0 {
            0.0
        } else {
            sorted
                .iter()
                .position(|&x| x == w)
                .and_then(|k| t.get(k))
                .copied()
                .unwrap_or(0.0)
        };
    }
    Ok(decay)
}

/// The profile over a strictly decreasing list of 1 … [`MAX_CURRENTS`] currents.
fn profile_of(off: &SwitchOff, c: &[f32]) -> Result<([f32; MAX_CURRENTS], Decay), Error> {
    let mut amps = [Amps::raw(0.0); MAX_CURRENTS];
    for (a, &x) in amps.iter_mut().zip(c) {
        *a = Amps::new(x)?;
    }
    let mut out = [0.0f32; MAX_CURRENTS];
    let mut copy = |times: &[Seconds]| {
        for (o, t) in out.iter_mut().zip(times) {
            *o = t.value();
        }
    };
    macro_rules! arm {
        ($n:literal) => {{
            let mut a = [Amps::raw(0.0); $n];
            a.copy_from_slice(
                amps.get(..$n)
                    .ok_or(Error::new("profile currents", Reason::TooLarge))?,
            );
            let p = off.profile(&a)?;
            copy(&p.times);
            p.decay
        }};
    }
    let decay = match c.len() {
        1 => arm!(1),
        2 => arm!(2),
        3 => arm!(3),
        4 => arm!(4),
        5 => arm!(5),
        6 => arm!(6),
        7 => arm!(7),
        8 => arm!(8),
        9 => arm!(9),
        10 => arm!(10),
        11 => arm!(11),
        12 => arm!(12),
        _ => return Err(Error::new("profile currents", Reason::TooLarge)),
    };
    Ok((out, decay))
}
