//! Safe timing: relay release, minimum off-time, wait before reversing, repetition rate, and the
//! conversion of times into timer ticks for the firmware.
//!
//! Definitions (as in the relay standards, IEC 61810 series; from memory): the *release time* is
//! the time from de-energising the coil to the opening of the contacts. Here it is modelled as
//! the electrical decay of the coil current from its on-value to the release current plus the
//! mechanical release time the designer gives (armature travel and contact bounce are in the
//! latter).
//!
//! The release current belongs to the magnetic circuit: the relay drops out when its ampere-turns
//! fall below a fixed level, so the datasheet's must-release voltage, stated at the datasheet's
//! reference temperature, is the current V_release/R_ref ([`Coil::magnetic_current`]) at every
//! winding temperature. (Taking V_release/R(T) instead would let a cold coil "release" at a
//! higher current, an optimistic error.) The slowest release is then the one that starts from the
//! largest on-current: cold winding, high supply, low R.
//!
//! Every wait is rounded *up* when converted to ticks, so the firmware never waits too short.

use crate::clamp::SwitchOff;
use crate::coil::Coil;
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Hertz, Joules, Seconds, Volts, Watts};

/// Release current of a relay whose must-release voltage (at the datasheet's reference
/// temperature) is `v_release`: I = V_release/R_ref, the same at every winding temperature.
///
/// # Errors
/// `v_release` ≤ 0 → [`Reason::NotPositive`] on `"must-release voltage"`.
///
/// ```
/// use kickguard::{coil::Coil, timing::release_current, Henries, Ohms, Temperature, Volts};
/// let relay = Coil::copper(Henries::new(0.9)?, Ohms::new(160.0)?, Temperature::from_celsius(20.0)?)?;
/// let i = release_current(&relay, Volts::new(1.2)?)?;
/// assert!((i.value() - 0.0075).abs() < 1e-6);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn release_current(coil: &Coil, v_release: Volts) -> Result<Amps, Error> {
    coil.magnetic_current(v_release)
        .map_err(|e| e.on("must-release voltage"))
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
/// relay would not hold); other errors of [`SwitchOff::time_to`]; a total beyond the quantity
/// bounds → [`Reason::TooLarge`] on `"sum"`.
///
/// ```
/// use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
/// use kickguard::timing::{release_current, release_time};
/// use kickguard::{coil::Coil, diode::{Diode, DiodeParams}, Henries, Ohms, Seconds, Temperature, Volts};
/// let t = Temperature::from_celsius(20.0)?;
/// let relay = Coil::copper(Henries::new(0.9)?, Ohms::new(160.0)?, t)?;
/// let v = Volts::new(12.0)?;
/// let op = Operating::uniform(v, relay.steady_current(v, t)?, t);
/// let off = SwitchOff::new(&relay, &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)), Side::Low, &op)?;
/// let i_rel = release_current(&relay, Volts::new(1.2)?)?;
/// let r = release_time(&off, i_rel, Seconds::new(8e-3)?)?;
/// assert!(r.total.value() > 0.008 + 0.009);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn release_time(
    off: &SwitchOff,
    i_release: Amps,
    mechanical: Seconds,
) -> Result<ReleaseTime, Error> {
    let electrical = off.time_to(i_release)?;
    Ok(ReleaseTime {
        electrical,
        mechanical,
        total: Seconds::new(electrical.value() + mechanical.value()).map_err(|e| e.on("sum"))?,
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

/// Fastest safe repetition rate of on/off cycles: each cycle lasts at least `min_period` (its
/// on-time plus the release time, or whatever decay the cycle must wait for), and the energy
/// each switch-off puts into a device must not exceed what its thermal path can remove:
/// f = min(1/T_min, P_max/E).
///
/// # Errors
/// `min_period` = 0 → [`Reason::NotPositive`] on `"cycle time"`; `energy` ≤ 0 or `max_power` ≤ 0
/// → [`Reason::NotPositive`] on `"energy per cycle"` / `"maximum power"`; a rate beyond the
/// quantity bounds → the errors of [`Hertz::new`] on `"repetition rate"`.
///
/// ```
/// use kickguard::timing::max_repetition_rate;
/// use kickguard::{Joules, Seconds, Watts};
/// // 60 ms cycles, 36 mJ per switch-off into a part that may take 0.5 W: the cycle limits.
/// let f = max_repetition_rate(Seconds::new(0.06)?, Joules::new(0.036)?, Watts::new(0.5)?)?;
/// assert!((f.value() - 1.0 / 0.072).abs() < 1e-3);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn max_repetition_rate(
    min_period: Seconds,
    energy: Joules,
    max_power: Watts,
) -> Result<Hertz, Error> {
    let period = error::positive("cycle time", min_period.value())?;
    let e = error::positive("energy per cycle", energy.value())?;
    let p = error::positive("maximum power", max_power.value())?;
    Hertz::new((1.0 / period).min(p / e)).map_err(|err| err.on("repetition rate"))
}

/// A time as a whole number of timer ticks at `tick`, rounded **up** (a wait is never short),
/// except that a product within f32 rounding of a whole number (1.2e-7 relative, at most 0.001
/// tick) counts as that number.
///
/// Integer result for firmware that has no FPU at run time: compute once, compare counters.
///
/// # Errors
/// More than `u32::MAX` ticks → [`Reason::TooLarge`] on `"ticks"`.
///
/// ```
/// use kickguard::{timing::to_ticks, Hertz, Seconds};
/// let khz = Hertz::new(1000.0)?;
/// assert_eq!(to_ticks(Seconds::new(16.74e-3)?, khz)?, 17);
/// assert_eq!(to_ticks(Seconds::new(0.002)?, khz)?, 2);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn to_ticks(t: Seconds, tick: Hertz) -> Result<u32, Error> {
    // f64 for the product: 32-bit tick counts exceed f32's 24-bit mantissa. A product within
    // f32's own rounding (2⁻²³ relative) of a whole number is that number: 2 ms at 1 kHz is
    // 2.0000000949 ticks only because 0.002 is not exact in f32.
    let x = t.value() as f64 * tick.value() as f64;
    let nearest = libm::round(x);
    let tol = (x * 1.2e-7).min(1e-3);
    let ticks = if (x - nearest).abs() <= tol {
        nearest
    } else {
        libm::ceil(x)
    };
    if !(ticks <= u32::MAX as f64) {
        return Err(Error::new("ticks", Reason::TooLarge));
    }
    // 0 ≤ ticks ≤ u32::MAX: the cast is exact.
    Ok(ticks as u32)
}

/// A time as whole ticks rounded **down** (for the lower edge of a window: never narrower than
/// the model), with the same f32-rounding tolerance as [`to_ticks`].
///
/// # Errors
/// As [`to_ticks`].
pub fn to_ticks_floor(t: Seconds, tick: Hertz) -> Result<u32, Error> {
    let x = t.value() as f64 * tick.value() as f64;
    let nearest = libm::round(x);
    let tol = (x * 1.2e-7).min(1e-3);
    let ticks = if (x - nearest).abs() <= tol {
        nearest
    } else {
        libm::floor(x)
    };
    if !(ticks <= u32::MAX as f64) {
        return Err(Error::new("ticks", Reason::TooLarge));
    }
    Ok(ticks as u32)
}
