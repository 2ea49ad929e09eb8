//! Timing the flyback on real pins with `embedded-hal` 1.0.
//!
//! [`measure_flyback`] switches the coil off through an output pin (drive low = off), then polls a
//! sense input (high while the switch node is above the comparator's threshold) every `step_ns`
//! with a delay source, until the input falls or the timeout expires. The result is the number of
//! polling steps the input stayed high (the caller's tick unit for [`super::Windows::classify`]
//! when `step_ns` is the tick period). Polling resolution is one step; the pin-read time adds to
//! each step, so calibrate `step_ns` on the target or use a timer-capture peripheral where one
//! exists.

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
    /// `step_ns` was zero.
    ZeroStep,
}

impl<O: fmt::Debug, I: fmt::Debug> fmt::Display for MeasureError<O, I> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MeasureError::Output(e) => write!(f, "coil drive pin error: {e:?}"),
            MeasureError::Input(e) => write!(f, "sense pin error: {e:?}"),
            MeasureError::Timeout => f.write_str("flyback did not end before the timeout"),
            MeasureError::ZeroStep => f.write_str("polling step must be greater than zero"),
        }
    }
}

impl<O: fmt::Debug, I: fmt::Debug> core::error::Error for MeasureError<O, I> {}

/// Switches the coil off and counts the steps of `step_ns` during which `sense` stays high, up to
/// `timeout_steps`. A sense input already low right after switch-off returns 0 (no flyback seen:
/// an open coil, or a decay shorter than one step).
///
/// # Errors
/// [`MeasureError::Output`] / [`MeasureError::Input`] with the pin's own error;
/// [`MeasureError::Timeout`] when the input is still high after `timeout_steps` steps;
/// [`MeasureError::ZeroStep`] for `step_ns` = 0.
pub fn measure_flyback<O, I, D>(
    drive: &mut O,
    sense: &mut I,
    delay: &mut D,
    step_ns: u32,
    timeout_steps: u32,
) -> Result<u32, MeasureError<O::Error, I::Error>>
where
    O: OutputPin,
    I: InputPin,
    D: DelayNs,
{
    if step_ns == 0 {
        return Err(MeasureError::ZeroStep);
    }
    drive.set_low().map_err(MeasureError::Output)?;
    let mut steps = 0u32;
    while sense.is_high().map_err(MeasureError::Input)? {
        if steps >= timeout_steps {
            return Err(MeasureError::Timeout);
        }
        delay.delay_ns(step_ns);
        // steps < timeout_steps ≤ u32::MAX here: cannot saturate.
        steps = steps.saturating_add(1);
    }
    Ok(steps)
}
