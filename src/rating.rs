//! Ratings and thermal checks: single-pulse energy, average power at a switching rate, junction
//! temperature rise, and the fastest safe repetition rate.
//!
//! Models (steady-state, first order):
//! - single pulse: the energy of one decay against the device's single-pulse rating (a zener or
//!   TVS pulse energy, a MOSFET's single-pulse avalanche energy E_AS);
//! - average power at a repetition rate f: P = E·f (each switch-off deposits E);
//! - junction temperature: T_j = T_a + P·R_th(j-a), with R_th the junction-to-ambient thermal
//!   resistance. This ignores the transient thermal impedance of a single pulse, which a
//!   datasheet's Z_th curve covers: a single-pulse rating already includes it.
//!
//! Every verdict carries a margin: capacity / demand − 1 (≥ 0 passes).

use crate::error::{self, Error, Reason};
use crate::units::{Hertz, Joules, Seconds, TempDelta, Temperature, Watts};

/// A pass/fail verdict with its margin, capacity/demand − 1 (0.25 = 25 % to spare; negative fails).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Verdict {
    /// True when the demand is within the capacity.
    pub pass: bool,
    /// capacity / demand − 1 (at most 1e12, for a zero demand).
    pub margin: f32,
}

impl Verdict {
    /// Compares a demand against a capacity (both ≥ 0, same unit).
    pub(crate) fn of(
        demand: f32,
        capacity: f32,
        capacity_name: &'static str,
    ) -> Result<Self, Error> {
        if !(capacity > 0.0 && capacity.is_finite()) {
            return Err(Error::new(capacity_name, Reason::NotPositive));
        }
        if !(demand >= 0.0 && demand.is_finite()) {
            return Err(Error::new("demand", Reason::Negative));
        }
        // A zero demand is an infinite margin; report the largest finite quantity instead.
        let margin = if demand > 0.0 {
            capacity / demand - 1.0
        } else {
            crate::units::MAX_MAGNITUDE
        };
        Ok(Verdict {
            pass: demand <= capacity,
            margin: error::result("margin", margin.min(crate::units::MAX_MAGNITUDE))?,
        })
    }
}

/// A device's single-pulse energy rating (for example a MOSFET's E_AS, a TVS's pulse energy).
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PulseRating(Joules);

impl PulseRating {
    /// A rating of `e` (> 0).
    ///
    /// # Errors
    /// `e` ≤ 0 → [`Reason::NotPositive`] on `"pulse energy rating"`.
    pub fn new(e: Joules) -> Result<Self, Error> {
        if e.value() > 0.0 {
            Ok(PulseRating(e))
        } else {
            Err(Error::new("pulse energy rating", Reason::NotPositive))
        }
    }

    /// The rated energy.
    pub fn energy(&self) -> Joules {
        self.0
    }
}

/// One decay's energy against a single-pulse rating.
///
/// # Errors
/// A negative energy → [`Reason::Negative`] on `"demand"`.
///
/// ```
/// use kickguard::{rating::{single_pulse, PulseRating}, Joules};
/// let v = single_pulse(Joules::new(0.03)?, PulseRating::new(Joules::new(0.1)?)?)?;
/// assert!(v.pass && (v.margin - 2.333).abs() < 1e-3);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn single_pulse(energy: Joules, rating: PulseRating) -> Result<Verdict, Error> {
    Verdict::of(energy.value(), rating.0.value(), "pulse energy rating")
}

/// Average power of `energy` deposited `rate` times a second: P = E·f.
///
/// # Errors
/// A product outside the quantity bounds → [`Reason::TooLarge`] / [`Reason::TooSmall`] on
/// `"product"`.
pub fn average_power(energy: Joules, rate: Hertz) -> Result<Watts, Error> {
    energy * rate
}

/// Lowest and highest temperature of a thermal path, °C (−100 … 400 °C: ambient to a silicon
/// carbide junction's limit with room to spare).
const PATH_RANGE_K: (f32, f32) = (173.15, 673.15);

/// A junction-to-ambient thermal path and the junction's limit. Fields are public for readable
/// literals; every method validates them first (the two temperatures are named, so they cannot
/// be swapped silently).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ThermalPath {
    /// R_th(j-a), K/W (1e-3 … 1e5).
    pub resistance_k_per_w: f32,
    /// The ambient the path ends at (−100 … 400 °C).
    pub ambient: Temperature,
    /// The junction's limit, above the ambient (−100 … 400 °C).
    pub junction_max: Temperature,
}

/// Result of a thermal check.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ThermalCheck {
    /// Junction temperature T_a + P·R_th.
    pub junction: Temperature,
    /// T_j,max − T_j (negative fails).
    pub headroom: TempDelta,
    /// Verdict with margin = allowed rise / actual rise − 1.
    pub verdict: Verdict,
}

impl ThermalPath {
    /// Validates the path: (R_th, T_a, T_j,max) in kelvin units.
    fn checked(&self) -> Result<(f32, f32, f32), Error> {
        let rth = error::within("thermal resistance", self.resistance_k_per_w, 1e-3, 1e5)?;
        let ta = error::within(
            "ambient",
            self.ambient.kelvin(),
            PATH_RANGE_K.0,
            PATH_RANGE_K.1,
        )?;
        let tj = error::within(
            "maximum junction temperature",
            self.junction_max.kelvin(),
            PATH_RANGE_K.0,
            PATH_RANGE_K.1,
        )?;
        if !(tj > ta) {
            return Err(Error::new(
                "maximum junction temperature",
                Reason::Inconsistent,
            ));
        }
        Ok((rth, ta, tj))
    }

    /// Largest continuous power: (T_j,max − T_a)/R_th (at most 5e5 W within the ranges).
    ///
    /// # Errors
    /// A field outside its range → [`Reason::OutsideValidatedRange`] naming it
    /// (`"thermal resistance"`, `"ambient"`, `"maximum junction temperature"`); T_j,max at or
    /// below the ambient → [`Reason::Inconsistent`] on `"maximum junction temperature"`.
    pub fn max_power(&self) -> Result<Watts, Error> {
        let (rth, ta, tj) = self.checked()?;
        Watts::new((tj - ta) / rth)
    }

    /// Junction temperature and verdict at average power `p`.
    ///
    /// # Errors
    /// As [`ThermalPath::max_power`]; `p` < 0 → [`Reason::Negative`] on `"power"`; a junction
    /// temperature beyond the quantity bounds → [`Reason::TooLarge`] on `"temperature (K)"`.
    ///
    /// ```
    /// use kickguard::rating::ThermalPath;
    /// use kickguard::{Temperature, Watts};
    /// let path = ThermalPath { resistance_k_per_w: 250.0, ambient: Temperature::from_celsius(55.0)?,
    ///                          junction_max: Temperature::from_celsius(150.0)? };
    /// let c = path.check(Watts::new(0.2)?)?;
    /// assert!((c.junction.celsius() - 105.0).abs() < 1e-3);
    /// assert!(c.verdict.pass);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn check(&self, p: Watts) -> Result<ThermalCheck, Error> {
        let (rth, ta, tj) = self.checked()?;
        let pw = p.value();
        if !(pw >= 0.0) {
            return Err(Error::new("power", Reason::Negative));
        }
        let rise = pw * rth;
        let junction = Temperature::from_kelvin(ta + rise)?;
        Ok(ThermalCheck {
            junction,
            headroom: TempDelta::from_kelvin(tj - junction.kelvin())?,
            verdict: Verdict::of(rise, tj - ta, "maximum junction temperature")?,
        })
    }

    /// Fastest safe repetition rate for pulses of `energy` that each need `decay` to die out:
    /// the smaller of the thermal limit P_max/E and 1/decay (the current must be gone before
    /// the next switch-off can start another full decay; the on-time is extra).
    ///
    /// # Errors
    /// As [`ThermalPath::max_power`]; `energy` ≤ 0 → [`Reason::NotPositive`] on
    /// `"pulse energy"`; `decay` = 0 → [`Reason::NotPositive`] on `"decay time"`; a rate beyond
    /// the quantity bounds → the errors of [`Hertz::new`] on `"repetition rate"`.
    pub fn max_repetition_rate(&self, energy: Joules, decay: Seconds) -> Result<Hertz, Error> {
        let e = energy.value();
        if !(e > 0.0) {
            return Err(Error::new("pulse energy", Reason::NotPositive));
        }
        let td = decay.value();
        if !(td > 0.0) {
            return Err(Error::new("decay time", Reason::NotPositive));
        }
        let thermal = self.max_power()?.value() / e;
        Hertz::new(thermal.min(1.0 / td)).map_err(|err| err.on("repetition rate"))
    }
}
