//! The PWM hold section of a driver, read and checked against the clamp it freewheels through.

use super::read::{range, ReadQ};
use super::{ClampBoard, HoldBoard};
use crate::host::file::quantity::Unit;
use crate::host::file::{self, Reader};
use crate::host::HostError;
use crate::units::{Amps, Hertz};
use std::format;

/// Converts a driver's hold section.
///
/// # Errors
/// A located error for a missing or out-of-range value, a hold current not below the pull-in
/// current, "auto" without a ripple target, a clamp without a freewheel path across the coil.
pub fn convert(
    r: &Reader<'_>,
    field: &str,
    d: &file::Driver,
    clamp: &ClampBoard,
) -> Result<Option<HoldBoard>, HostError> {
    let Some(h) = &d.hold else { return Ok(None) };
    let at = |x: &str| format!("{field}.hold.{x}");
    if !matches!(
        clamp,
        ClampBoard::Diode(_)
            | ClampBoard::ResistorDiode { .. }
            | ClampBoard::ZenerDiode { .. }
            | ClampBoard::SwitchedFreewheel { .. }
    ) {
        return Err(r.at(
            &format!("{field}.hold"),
            format!("a PWM hold needs a freewheel path across the coil (diode, resistor+diode, zener+diode or switched-freewheel), not {}", clamp.kind()),
        ));
    }
    let amp = range(1e-6, 100.0, "1 µA … 100 A");
    let pull_in = r.q(&h.pull_in_current, &at("pull_in_current"), Unit::Amp, amp)?;
    let held = r.q(&h.hold_current, &at("hold_current"), Unit::Amp, amp)?;
    if !(held < pull_in) {
        return Err(r.at(&at("hold_current"), "must be below pull_in_current"));
    }
    let frequency = if file::is_auto(&h.frequency) {
        None
    } else {
        Some(r.q(
            &h.frequency,
            &at("frequency"),
            Unit::Hertz,
            range(1.0, 1e6, "1 Hz … 1 MHz"),
        )?)
    };
    let ripple = r.oq(&h.max_ripple, &at("max_ripple"), Unit::Amp, amp)?;
    if frequency.is_none() && ripple.is_none() {
        return Err(r.at(
            &at("max_ripple"),
            "missing; \"auto\" frequency needs a ripple target",
        ));
    }
    let amps = |x: f32, w: &str| Amps::new(x).map_err(|e| r.model(&at(w), e));
    Ok(Some(HoldBoard {
        pull_in: amps(pull_in, "pull_in_current")?,
        hold: amps(held, "hold_current")?,
        frequency: frequency
            .map(Hertz::new)
            .transpose()
            .map_err(|e| r.model(&at("frequency"), e))?,
        max_ripple: ripple.map(|x| amps(x, "max_ripple")).transpose()?,
    }))
}
