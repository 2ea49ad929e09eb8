//! Timing the flyback on real pins with `embedded-hal` 1.0, in real time.
//!
//! Two ways to keep time, both in the firmware's timer ticks (the unit of the windows):
//! - [`time_flyback`] and [`time_current_window`] read a free-running hardware counter through
//!   [`TickCounter`], which the firmware implements on a timer; the elapsed time is a wrapping
//!   difference of two reads, exact to one tick however long each pin read takes;
//! - [`measure_flyback`] polls with a delay and counts each poll as a stated number of ticks,
//!   the poll period measured on the target once (its pin reads and loop included), for a
//!   firmware without a free timer.
//!
//! The drain comparator (a sense input high while the voltage across the switch is above its
//! threshold) and the current-sense window (two comparators, high while the current is above
//! the upper and above the lower threshold) are both supported.

use core::fmt;
use embedded_hal::delay::DelayNs;
use embedded_hal::digital::{InputPin, OutputPin};

/// Why a flyback measurement failed.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum MeasureError<O, I> {
    /// The output pin failed to switch the coil off.
    Output(O),
    /// The sense input could not be read.
    Input(I),
    /// The input was still high after the timeout (the flyback never ended: a stuck comparator,
    /// or a decay far longer than any window).
    Timeout,
    /// A poll period (`poll_ns` or `poll_ticks`) was zero.
    ZeroStep,
    /// The counter did not advance for [`STALL_POLLS`] polls in a row (a stopped timer), or the
    /// wait reached [`MAX_POLLS`] polls: the elapsed time cannot be known.
    Stalled,
}

impl<O: fmt::Debug, I: fmt::Debug> fmt::Display for MeasureError<O, I> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MeasureError::Output(e) => write!(f, "coil drive pin error: {e:?}"),
            MeasureError::Input(e) => write!(f, "sense pin error: {e:?}"),
            MeasureError::Timeout => f.write_str("flyback did not end before the timeout"),
            MeasureError::ZeroStep => f.write_str("poll period must be greater than zero"),
            MeasureError::Stalled => f.write_str("the tick counter stopped advancing"),
        }
    }
}

impl<O: fmt::Debug, I: fmt::Debug> core::error::Error for MeasureError<O, I> {}

/// A free-running hardware counter in the firmware's timer ticks (wrapping at 2³²): the
/// firmware implements it on a timer peripheral.
pub trait TickCounter {
    /// The counter now.
    fn ticks(&mut self) -> u32;
}

/// Waits while `pin` is high, at most `timeout` ticks after `start`; returns the elapsed ticks
/// at the first low read.
///
/// Bounded whatever the counter does and whatever the timeout: at most [`STALL_POLLS`] polls
/// in a row without the counter moving, and at most [`MAX_POLLS`] polls in all
/// ([`MeasureError::Stalled`] either way); a counter that advances ends it within `timeout`
/// ticks of real time.
fn wait_low<I: InputPin, C: TickCounter, OE>(
    pin: &mut I,
    counter: &mut C,
    start: u32,
    timeout: u32,
) -> Result<u32, MeasureError<OE, I::Error>> {
    let mut last = start;
    let mut still = 0u32;
    for _ in 0..MAX_POLLS {
        let high = pin.is_high().map_err(MeasureError::Input)?;
        let now = counter.ticks();
        // Wrapping difference: exact across one wrap of the counter.
        let elapsed = now.wrapping_sub(start);
        if !high {
            return Ok(elapsed);
        }
        if elapsed > timeout {
            return Err(MeasureError::Timeout);
        }
        if now == last {
            // still < STALL_POLLS ≤ u32::MAX here: cannot saturate.
            still = still.saturating_add(1);
            if still >= STALL_POLLS {
                return Err(MeasureError::Stalled);
            }
        } else {
            (last, still) = (now, 0);
        }
    }
    Err(MeasureError::Stalled)
}

/// Polls in a row without the counter advancing after which it counts as stopped: 2²⁰ (a
/// 1 GHz core polling a 32 kHz timer makes about 3·10⁴ polls a tick).
pub const STALL_POLLS: u32 = 1 << 20;

/// Polls at most in one wait, whatever the timeout: 2³² (about 4 s of a 1 GHz core doing
/// nothing else; far beyond any flyback).
pub const MAX_POLLS: u64 = 1 << 32;

/// Switches the coil off (drive low) and returns the ticks until the drain comparator `sense`
/// falls, read from `counter`. A sense input already low returns about 0 (no flyback seen: an
/// open coil, or a decay shorter than one tick).
///
/// Work: one counter read and one pin read per loop, until the input falls or `timeout_ticks`
/// have elapsed on the counter; at most [`STALL_POLLS`] loops without the counter moving and
/// [`MAX_POLLS`] in all, whatever the timeout.
///
/// # Errors
/// [`MeasureError::Output`] / [`MeasureError::Input`] with the pin's own error;
/// [`MeasureError::Timeout`] when the input is still high after `timeout_ticks`;
/// [`MeasureError::Stalled`] for a counter that stopped (or a wait beyond [`MAX_POLLS`]).
pub fn time_flyback<O, I, C>(
    drive: &mut O,
    sense: &mut I,
    counter: &mut C,
    timeout_ticks: u32,
) -> Result<u32, MeasureError<O::Error, I::Error>>
where
    O: OutputPin,
    I: InputPin,
    C: TickCounter,
{
    drive.set_low().map_err(MeasureError::Output)?;
    let start = counter.ticks();
    wait_low(sense, counter, start, timeout_ticks)
}

/// Switches the coil off and returns the ticks from the upper current comparator falling to the
/// lower one falling (both high while the current is above their thresholds): the
/// current-sense measurement [`super::Measurement::BetweenCurrents`]. If the current starts
/// below the upper threshold, timing starts at switch-off.
///
/// # Errors
/// As [`time_flyback`]; the timeout counts from switch-off.
pub fn time_current_window<O, I, C>(
    drive: &mut O,
    upper: &mut I,
    lower: &mut I,
    counter: &mut C,
    timeout_ticks: u32,
) -> Result<u32, MeasureError<O::Error, I::Error>>
where
    O: OutputPin,
    I: InputPin,
    C: TickCounter,
{
    drive.set_low().map_err(MeasureError::Output)?;
    let start = counter.ticks();
    let t_up = wait_low(upper, counter, start, timeout_ticks)?;
    let t_lo = wait_low(lower, counter, start, timeout_ticks)?;
    Ok(t_lo.saturating_sub(t_up))
}

/// Switches the coil off and polls `sense` with `delay`, counting each poll as `poll_ticks`
/// ticks: the poll period measured once on the target (delay, pin read and loop together), in
/// ticks. Returns the ticks during which the input stayed high, at most `timeout_ticks`.
///
/// # Errors
/// As [`time_flyback`]; [`MeasureError::ZeroStep`] for `poll_ns` or `poll_ticks` = 0.
pub fn measure_flyback<O, I, D>(
    drive: &mut O,
    sense: &mut I,
    delay: &mut D,
    poll_ns: u32,
    poll_ticks: u32,
    timeout_ticks: u32,
) -> Result<u32, MeasureError<O::Error, I::Error>>
where
    O: OutputPin,
    I: InputPin,
    D: DelayNs,
{
    if poll_ns == 0 || poll_ticks == 0 {
        return Err(MeasureError::ZeroStep);
    }
    drive.set_low().map_err(MeasureError::Output)?;
    let mut ticks = 0u32;
    while sense.is_high().map_err(MeasureError::Input)? {
        if ticks >= timeout_ticks {
            return Err(MeasureError::Timeout);
        }
        delay.delay_ns(poll_ns);
        ticks = ticks.saturating_add(poll_ticks);
    }
    Ok(ticks)
}
