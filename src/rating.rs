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
use crate::units::{Joules, Seconds, TempDelta, Temperature, Watts};

/// A pass/fail verdict with its margin, capacity/demand − 1 (0.25 = 25 % to spare; negative fails).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Verdict {
    /// True when the demand is within the capacity.
    pub pass: bool,
    /// capacity / demand − 1.
    pub margin: f32,
}

impl Verdict {
    /// Compares a demand against a capacity (both ≥ 0, same unit).
    ///
    /// # Errors
    /// A capacity ≤ 0 → [`Reason::NotPositive`] on `capacity_name`; a negative demand →
    /// [`Reason::Negative`] on `"demand"`.
    pub fn of(demand: f32, capacity: f32, capacity_name: &'static str) -> Result<Self, Error> {
        if !(capacity > 0.0) {
            return Err(Error::new(capacity_name, Reason::NotPositive));
        }
        if !(demand >= 0.0) {
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

/// One decay's energy against a single-pulse rating.
///
/// # Errors
/// As [`Verdict::of`], capacity named `"pulse energy rating"`.
///
/// ```
/// use kickguard::{rating::single_pulse, Joules};
/// let v = single_pulse(Joules::new(0.03).unwrap(), Joules::new(0.1).unwrap()).unwrap();
/// assert!(v.pass && (v.margin - 2.333).abs() < 1e-3);
/// ```
pub fn single_pulse(energy: Joules, rating: Joules) -> Result<Verdict, Error> {
    Verdict::of(energy.value(), rating.value(), "pulse energy rating")
}

/// Average power of `energy` deposited `rate_hz` times a second: P = E·f.
///
/// # Errors
/// A negative or non-finite rate → [`Reason::Negative`] / [`Reason::NotFinite`] on
/// `"repetition rate"`.
pub fn average_power(energy: Joules, rate_hz: f32) -> Result<Watts, Error> {
    let f = error::non_negative("repetition rate", rate_hz)?;
    Watts::new(energy.value() * f)
}

/// A junction-to-ambient thermal path and the junction's limit.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ThermalPath {
    rth_k_per_w: f32,
    ambient: Temperature,
    tj_max: Temperature,
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
    /// A path of `rth_k_per_w` (K/W) from junction to an ambient at `ambient`, with the junction
    /// allowed up to `tj_max`.
    ///
    /// # Errors
    /// R_th ≤ 0 → [`Reason::NotPositive`] on `"thermal resistance"`; `tj_max` ≤ `ambient` →
    /// [`Reason::Inconsistent`] on `"maximum junction temperature"`.
    pub fn new(rth_k_per_w: f32, ambient: Temperature, tj_max: Temperature) -> Result<Self, Error> {
        let rth = error::positive("thermal resistance", rth_k_per_w)?;
        if !(tj_max.kelvin() > ambient.kelvin()) {
            return Err(Error::new(
                "maximum junction temperature",
                Reason::Inconsistent,
            ));
        }
        Ok(ThermalPath {
            rth_k_per_w: rth,
            ambient,
            tj_max,
        })
    }

    /// Largest continuous power: (T_j,max − T_a)/R_th.
    pub fn max_power(&self) -> Watts {
        Watts::raw((self.tj_max.kelvin() - self.ambient.kelvin()) / self.rth_k_per_w)
    }

    /// Junction temperature and verdict at average power `p`.
    ///
    /// # Errors
    /// `p` < 0 → [`Reason::Negative`] on `"power"`.
    ///
    /// ```
    /// use kickguard::rating::ThermalPath;
    /// use kickguard::{Temperature, Watts};
    /// let path = ThermalPath::new(250.0, Temperature::from_celsius(55.0).unwrap(),
    ///                             Temperature::from_celsius(150.0).unwrap()).unwrap();
    /// let c = path.check(Watts::new(0.2).unwrap()).unwrap();
    /// assert!((c.junction.celsius() - 105.0).abs() < 1e-3);
    /// assert!(c.verdict.pass);
    /// ```
    pub fn check(&self, p: Watts) -> Result<ThermalCheck, Error> {
        let pw = p.value();
        if !(pw >= 0.0) {
            return Err(Error::new("power", Reason::Negative));
        }
        let rise = pw * self.rth_k_per_w;
        let junction = Temperature::from_kelvin(self.ambient.kelvin() + rise)?;
        let allowed = self.tj_max.kelvin() - self.ambient.kelvin();
        Ok(ThermalCheck {
            junction,
            headroom: TempDelta::from_kelvin(self.tj_max.kelvin() - junction.kelvin())?,
            verdict: Verdict::of(rise, allowed, "maximum junction temperature")?,
        })
    }

    /// Fastest safe repetition rate, in hertz, for pulses of `energy` that each need `decay`
    /// to die out: the smaller of the thermal limit P_max/E and 1/decay (the current must be gone
    /// before the next switch-off can start another full decay; the on-time is extra).
    ///
    /// # Errors
    /// `energy` ≤ 0 → [`Reason::NotPositive`] on `"pulse energy"`; `decay` = 0 →
    /// [`Reason::NotPositive`] on `"decay time"`.
    pub fn max_repetition_rate_hz(&self, energy: Joules, decay: Seconds) -> Result<f32, Error> {
        let e = energy.value();
        if !(e > 0.0) {
            return Err(Error::new("pulse energy", Reason::NotPositive));
        }
        let td = decay.value();
        if !(td > 0.0) {
            return Err(Error::new("decay time", Reason::NotPositive));
        }
        let thermal = self.max_power().value() / e;
        error::result("repetition rate", thermal.min(1.0 / td))
    }
}
