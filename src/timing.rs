//! Safe timing: relay release, minimum off-time, wait before reversing, repetition rate, and the
//! conversion of times into timer ticks for the firmware.
//!
//! Definitions (as in the relay standards, IEC 61810 series; from memory): the *release time* is
//! the time from de-energising the coil to the opening of the contacts. Here it is modelled as
//! the electrical decay of the coil current from its on-value to the release current plus the
//! mechanical release time the designer gives (armature travel and contact bounce are in the
//! latter). The release current follows from the must-release voltage: a relay releases when its
//! coil current falls below V_release/R(T), so a hot coil (higher R) releases at a *lower*
//! current, which makes the decay longer.
//!
//! Every wait is rounded *up* when converted to ticks, so the firmware never waits too short.

use crate::clamp::SwitchOff;
use crate::coil::Coil;
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Seconds, Temperature, Volts};

/// Release current of a relay whose must-release voltage is `v_release` (the coil voltage below
/// which it is guaranteed to drop out), with the winding at `t`: I = V_release/R(T).
///
/// # Errors
/// `v_release` ≤ 0 → [`Reason::NotPositive`] on `"must-release voltage"`; errors of
/// [`Coil::resistance`].
///
/// ```
/// use kickguard::{coil::Coil, timing::release_current, Henries, Ohms, Temperature, Volts};
/// let t20 = Temperature::from_celsius(20.0).unwrap();
/// let relay = Coil::copper(Henries::new(0.9).unwrap(), Ohms::new(160.0).unwrap(), t20).unwrap();
/// let i = release_current(&relay, Volts::new(1.2).unwrap(), t20).unwrap();
/// assert!((i.value() - 0.0075).abs() < 1e-6);
/// ```
pub fn release_current(coil: &Coil, v_release: Volts, t: Temperature) -> Result<Amps, Error> {
    if !(v_release.value() > 0.0) {
        return Err(Error::new("must-release voltage", Reason::NotPositive));
    }
    v_release.over(coil.resistance(t)?)
}

/// The parts of a release time.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ReleaseTime {
    /// Decay of the coil current from switch-off to the release current.
    pub electrical: Seconds,
    /// The mechanical release time given by the designer.
    pub mechanical: Seconds,
    /// Their sum: the earliest time the contacts are guaranteed open, and so the minimum off-time
    /// before the coil may be re-energised with the relay really released.
    pub total: Seconds,
}

/// Release time of a relay: the electrical decay of `off` down to `i_release` plus `mechanical`.
///
/// Accuracy: that of [`SwitchOff::time_to`] for the electrical part (0.05 % of the model).
///
/// # Errors
/// `i_release` at or above the start current → [`Reason::Unreachable`] on `"end current"` (the
/// relay would not hold); other errors of [`SwitchOff::time_to`].
///
/// ```
/// use kickguard::clamp::{Clamp, SwitchOff};
/// use kickguard::timing::{release_current, release_time};
/// use kickguard::{coil::Coil, diode::DiodeParams, Henries, Ohms, Seconds, Temperature, Volts};
/// let t = Temperature::from_celsius(20.0).unwrap();
/// let relay = Coil::copper(Henries::new(0.9).unwrap(), Ohms::new(160.0).unwrap(), t).unwrap();
/// let v = Volts::new(12.0).unwrap();
/// let off = SwitchOff::new(&relay, &Clamp::FreewheelDiode(DiodeParams::SILICON), v,
///                          relay.steady_current(v, t).unwrap(), t, t).unwrap();
/// let i_rel = release_current(&relay, Volts::new(1.2).unwrap(), t).unwrap();
/// let r = release_time(&off, i_rel, Seconds::new(8e-3).unwrap()).unwrap();
/// assert!(r.total.value() > 0.008 + 0.009);
/// ```
pub fn release_time(
    off: &SwitchOff,
    i_release: Amps,
    mechanical: Seconds,
) -> Result<ReleaseTime, Error> {
    let electrical = off.time_to(i_release)?;
    let total = error::result("release time", electrical.value() + mechanical.value())?;
    Ok(ReleaseTime {
        electrical,
        mechanical,
        total: Seconds::new(total)?,
    })
}

/// Wait before reversing a polarised coil or an H-bridge: the time until the coil current of
/// `off` has fallen to `threshold` (choose a threshold at which reversal stresses nothing, for
/// example the current the opposite switch can take while the diodes still conduct).
///
/// # Errors
/// As [`SwitchOff::time_to`].
pub fn reversal_wait(off: &SwitchOff, threshold: Amps) -> Result<Seconds, Error> {
    off.time_to(threshold)
}

/// Fastest safe repetition rate of on/off cycles, in hertz: each cycle needs `on_time` plus the
/// release time (or any decay the cycle must wait for), and the energy each switch-off puts into
/// a device must not exceed what its thermal path can remove (`max_power_w / energy_per_cycle`).
///
/// # Errors
/// `on_time` + `cycle_wait` = 0 → [`Reason::NotPositive`] on `"cycle time"`; `energy_j` ≤ 0 or
/// `max_power_w` ≤ 0 → [`Reason::NotPositive`] naming them.
pub fn max_repetition_rate_hz(
    on_time: Seconds,
    cycle_wait: Seconds,
    energy_j: f32,
    max_power_w: f32,
) -> Result<f32, Error> {
    let period = on_time.value() + cycle_wait.value();
    if !(period > 0.0) {
        return Err(Error::new("cycle time", Reason::NotPositive));
    }
    let e = error::positive("energy per cycle", energy_j)?;
    let p = error::positive("maximum power", max_power_w)?;
    error::result("repetition rate", (1.0 / period).min(p / e))
}

/// A time as a whole number of timer ticks at `tick_hz`, rounded **up** (a wait is never short),
/// except that a product within f32 rounding of a whole number (1.2e-7 relative, at most 0.001
/// tick) counts as that number.
///
/// Integer result for firmware that has no FPU at run time: compute once, compare counters.
///
/// # Errors
/// `tick_hz` ≤ 0 → [`Reason::NotPositive`] on `"tick rate"`; more than `u32::MAX` ticks →
/// [`Reason::TooLarge`] on `"ticks"`.
///
/// ```
/// use kickguard::{timing::to_ticks, Seconds};
/// assert_eq!(to_ticks(Seconds::new(16.74e-3).unwrap(), 1000.0).unwrap(), 17);
/// assert_eq!(to_ticks(Seconds::new(0.002).unwrap(), 1000.0).unwrap(), 2);
/// ```
pub fn to_ticks(t: Seconds, tick_hz: f32) -> Result<u32, Error> {
    let f = error::positive("tick rate", tick_hz)?;
    // f64 for the product: 32-bit tick counts exceed f32's 24-bit mantissa. A product within
    // f32's own rounding (2⁻²³ relative) of a whole number is that number: 2 ms at 1 kHz is
    // 2.0000000949 ticks only because 0.002 is not exact in f32.
    let x = t.value() as f64 * f as f64;
    let nearest = libm::round(x);
    let tol = (x * 1.2e-7).min(1e-3);
    let ticks = if (x - nearest).abs() <= tol {
        nearest
    } else {
        libm::ceil(x)
    };
    if ticks > u32::MAX as f64 {
        return Err(Error::new("ticks", Reason::TooLarge));
    }
    Ok(if ticks < 0.0 { 0 } else { ticks as u32 })
}
