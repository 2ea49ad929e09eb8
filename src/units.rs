//! Typed quantities: SI newtypes over `f32` with validating constructors.
//!
//! Each quantity holds one `f32` in its SI base unit (volts, amperes, ohms, henries, seconds, joules,
//! watts, farads, coulombs; kelvin for temperatures). The field is private; the only way in is a
//! validating constructor, so every value in the crate is finite and, per type, of the allowed sign:
//!
//! | type | unit | allowed values |
//! |---|---|---|
//! | [`Volts`], [`Amps`], [`Joules`], [`Watts`], [`Coulombs`] | V, A, J, W, C | any sign |
//! | [`Ohms`], [`Seconds`] | Ω, s | zero or positive |
//! | [`Henries`], [`Farads`] | H, F | strictly positive |
//! | [`Temperature`] (a point) | K (°C accessors) | above 0 K |
//! | [`TempDelta`] (an interval) | K | any sign |
//!
//! Magnitudes are limited to [`MIN_MAGNITUDE`] ≤ |x| ≤ [`MAX_MAGNITUDE`] (or exactly zero): with
//! those bounds any product of three quantities is a finite `f32`, which is what lets the
//! cross-unit product operators below be infallible. Quotients are methods that check their result.
//!
//! Only the physically meaningful operations exist (`Ohms * Amps -> Volts`,
//! `Volts * Amps -> Watts`, `Watts * Seconds -> Joules`, `Amps * Seconds -> Coulombs`,
//! `Coulombs * Volts -> Joules`, `Ohms * Farads -> Seconds`). A temperature point and a
//! temperature interval are different types, so adding two temperatures does not compile:
//!
//! ```compile_fail
//! use kickguard::Temperature;
//! let a = Temperature::from_celsius(20.0).unwrap();
//! let b = Temperature::from_celsius(30.0).unwrap();
//! let _ = a + b; // a point plus a point is meaningless
//! ```
//!
//! ```compile_fail
//! use kickguard::{Volts, Amps};
//! let v = Volts::new(1.0).unwrap();
//! let i = Amps::new(1.0).unwrap();
//! let _ = v + i; // volts plus amps is meaningless
//! ```

use crate::error::{self, Error, Reason};
use core::fmt;
use core::ops::{Add, Mul, Sub};

/// Largest magnitude any quantity may hold (1e12 in its SI unit).
pub const MAX_MAGNITUDE: f32 = 1.0e12;
/// Smallest nonzero magnitude any quantity may hold (1e-30 in its SI unit); smaller nonzero
/// values (subnormals included) are rejected with [`Reason::TooSmall`].
pub const MIN_MAGNITUDE: f32 = 1.0e-30;

/// Defines a newtype quantity with a validating `const` constructor.
macro_rules! quantity {
    ($(#[$doc:meta])* $name:ident, $unit:literal, $input:literal, $check:ident) => {
        $(#[$doc])*
        #[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Default)]
        #[cfg_attr(feature = "defmt", derive(defmt::Format))]
        pub struct $name(f32);

        impl $name {
            /// Builds the quantity from a value in its SI unit (see the module table for the
            /// allowed range).
            ///
            /// # Errors
            /// NaN or ±∞ → [`Reason::NotFinite`]; magnitude out of bounds → [`Reason::TooLarge`]
            /// or [`Reason::TooSmall`]; wrong sign for this quantity → [`Reason::NotPositive`]
            /// or [`Reason::Negative`]. The error's `input` is the quantity's name with its unit.
            pub const fn new(value: f32) -> Result<Self, Error> {
                match error::$check($input, value) {
                    Ok(v) => Ok($name(v)),
                    Err(e) => Err(e),
                }
            }

            /// Wraps a value the crate has already validated or computed within bounds.
            #[allow(dead_code)]
            pub(crate) const fn raw(value: f32) -> Self {
                $name(value)
            }

            /// The value in its SI unit.
            pub const fn value(self) -> f32 {
                self.0
            }
        }

        impl fmt::Display for $name {
            /// The value and its unit symbol; very small or large magnitudes in exponent form.
            fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                write_value(f, self.0)?;
                f.write_str(concat!(" ", $unit))
            }
        }
    };
}

/// Writes `x` plainly in 1e-3 ≤ |x| < 1e6 (or 0), in exponent form elsewhere, honouring the
/// caller's precision.
fn write_value(f: &mut fmt::Formatter<'_>, x: f32) -> fmt::Result {
    let plain = x == 0.0 || (1e-3..1e6).contains(&x.abs());
    match (plain, f.precision()) {
        (true, Some(p)) => write!(f, "{x:.p$}"),
        (true, None) => write!(f, "{x}"),
        (false, Some(p)) => write!(f, "{x:.p$e}"),
        (false, None) => write!(f, "{x:e}"),
    }
}

/// Defines `A * B -> C` in both orders.
macro_rules! product {
    ($a:ident * $b:ident => $c:ident) => {
        impl Mul<$b> for $a {
            type Output = $c;
            fn mul(self, rhs: $b) -> $c {
                $c(self.0 * rhs.0)
            }
        }
        impl Mul<$a> for $b {
            type Output = $c;
            fn mul(self, rhs: $a) -> $c {
                $c(self.0 * rhs.0)
            }
        }
    };
}

/// Defines `+` and `-` within one signed quantity.
macro_rules! additive {
    ($($t:ident),*) => {$(
        impl Add for $t {
            type Output = $t;
            fn add(self, rhs: $t) -> $t {
                $t(self.0 + rhs.0)
            }
        }
        impl Sub for $t {
            type Output = $t;
            fn sub(self, rhs: $t) -> $t {
                $t(self.0 - rhs.0)
            }
        }
    )*};
}

quantity!(
    /// Electric potential difference in volts (V). Any sign.
    Volts, "V", "voltage (V)", finite
);
quantity!(
    /// Electric current in amperes (A). Any sign.
    Amps, "A", "current (A)", finite
);
quantity!(
    /// Resistance in ohms (Ω). Zero or positive.
    Ohms, "Ω", "resistance (Ω)", non_negative
);
quantity!(
    /// Inductance in henries (H). Strictly positive.
    Henries, "H", "inductance (H)", positive
);
quantity!(
    /// Capacitance in farads (F). Strictly positive.
    Farads, "F", "capacitance (F)", positive
);
quantity!(
    /// A duration in seconds (s). Zero or positive.
    Seconds, "s", "time (s)", non_negative
);
quantity!(
    /// Energy in joules (J). Any sign (an energy balance may carry negative terms).
    Joules, "J", "energy (J)", finite
);
quantity!(
    /// Power in watts (W). Any sign.
    Watts, "W", "power (W)", finite
);
quantity!(
    /// Electric charge in coulombs (C). Any sign.
    Coulombs, "C", "charge (C)", finite
);

product!(Ohms * Amps => Volts);
product!(Volts * Amps => Watts);
product!(Watts * Seconds => Joules);
product!(Amps * Seconds => Coulombs);
product!(Coulombs * Volts => Joules);
product!(Ohms * Farads => Seconds);
additive!(Volts, Amps, Joules, Watts, Coulombs);

impl Henries {
    /// Time constant τ = L / R of an R–L circuit, in seconds.
    ///
    /// # Errors
    /// `R` = 0 gives an infinite τ: [`Reason::NotPositive`] on `"R"`; a τ beyond the bounds →
    /// [`Reason::Overflow`] on `"time constant"`.
    ///
    /// ```
    /// use kickguard::{Henries, Ohms};
    /// let tau = Henries::new(0.35).unwrap().time_constant(Ohms::new(56.0).unwrap()).unwrap();
    /// assert!((tau.value() - 0.00625).abs() < 1e-7);
    /// ```
    pub fn time_constant(self, r: Ohms) -> Result<Seconds, Error> {
        if r.0 > 0.0 {
            Seconds::new(self.0 / r.0).map_err(|_| Error::new("time constant", Reason::Overflow))
        } else {
            Err(Error::new("R", Reason::NotPositive))
        }
    }

    /// Energy stored in the inductance at current `i`: E = ½·L·I², in joules.
    ///
    /// ```
    /// use kickguard::{Henries, Amps};
    /// let e = Henries::new(2.0).unwrap().stored_energy(Amps::new(3.0).unwrap());
    /// assert_eq!(e.value(), 9.0);
    /// ```
    pub fn stored_energy(self, i: Amps) -> Joules {
        Joules(0.5 * self.0 * i.0 * i.0)
    }
}

impl Volts {
    /// Current through a resistance at this voltage, I = V / R, in amperes.
    ///
    /// # Errors
    /// `R` = 0 → [`Reason::NotPositive`] on `"R"`; a quotient beyond the bounds →
    /// [`Reason::Overflow`] on `"current"`.
    pub fn over(self, r: Ohms) -> Result<Amps, Error> {
        if r.0 > 0.0 {
            Amps::new(self.0 / r.0).map_err(|_| Error::new("current", Reason::Overflow))
        } else {
            Err(Error::new("R", Reason::NotPositive))
        }
    }
}

/// Offset between absolute zero and 0 °C, in kelvin (exact, by definition of the Celsius scale).
pub const ZERO_CELSIUS_IN_KELVIN: f32 = 273.15;

/// A temperature (a point on the thermodynamic scale), stored in kelvin, above 0 K.
///
/// A point is not an interval: the difference of two points is a [`TempDelta`], and only a delta
/// can be added to a point.
///
/// ```
/// use kickguard::{Temperature, TempDelta};
/// let t = Temperature::from_celsius(25.0).unwrap();
/// assert!((t.kelvin() - 298.15).abs() < 1e-4);
/// let hot = t.offset(TempDelta::from_kelvin(30.0).unwrap()).unwrap();
/// assert!((hot.celsius() - 55.0).abs() < 1e-4);
/// assert!(((hot - t).kelvin() - 30.0).abs() < 1e-4);
/// ```
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Temperature(f32);

impl Temperature {
    /// From kelvin.
    ///
    /// # Errors
    /// Non-finite → [`Reason::NotFinite`] on `"temperature (K)"`; at or below 0 K →
    /// [`Reason::BelowAbsoluteZero`]; above 1e12 K → [`Reason::TooLarge`].
    pub const fn from_kelvin(k: f32) -> Result<Self, Error> {
        match error::finite("temperature (K)", k) {
            Ok(k) if k > 0.0 => Ok(Temperature(k)),
            Ok(_) => Err(Error::new("temperature (K)", Reason::BelowAbsoluteZero)),
            Err(e) => Err(e),
        }
    }

    /// From degrees Celsius (T/K = t/°C + 273.15).
    ///
    /// # Errors
    /// As [`Temperature::from_kelvin`], with input name `"temperature (°C)"`.
    pub const fn from_celsius(c: f32) -> Result<Self, Error> {
        // Non-finite input stays non-finite after the shift, so one check serves both scales.
        match Temperature::from_kelvin(c + ZERO_CELSIUS_IN_KELVIN) {
            Ok(t) => Ok(t),
            Err(e) => Err(Error::new("temperature (°C)", e.reason)),
        }
    }

    /// The temperature in kelvin.
    pub const fn kelvin(self) -> f32 {
        self.0
    }

    /// The temperature in degrees Celsius.
    pub const fn celsius(self) -> f32 {
        self.0 - ZERO_CELSIUS_IN_KELVIN
    }

    /// This temperature moved by an interval.
    ///
    /// # Errors
    /// A result at or below 0 K → [`Reason::BelowAbsoluteZero`] on `"temperature offset"`.
    pub fn offset(self, d: TempDelta) -> Result<Temperature, Error> {
        let k = self.0 + d.0;
        if k > 0.0 && k.is_finite() {
            Ok(Temperature(k))
        } else {
            Err(Error::new("temperature offset", Reason::BelowAbsoluteZero))
        }
    }

    pub(crate) const fn raw_kelvin(k: f32) -> Self {
        Temperature(k)
    }
}

impl Sub for Temperature {
    type Output = TempDelta;
    fn sub(self, rhs: Temperature) -> TempDelta {
        TempDelta(self.0 - rhs.0)
    }
}

impl fmt::Display for Temperature {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        fmt::Display::fmt(&self.celsius(), f)?;
        f.write_str(" °C")
    }
}

/// A temperature interval (a difference of two temperatures), in kelvin. Any sign.
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TempDelta(f32);

impl TempDelta {
    /// From kelvin (equal to a difference in degrees Celsius).
    ///
    /// # Errors
    /// Non-finite or out of bounds → the errors of [`Volts::new`], on `"temperature interval (K)"`.
    pub const fn from_kelvin(k: f32) -> Result<Self, Error> {
        match error::finite("temperature interval (K)", k) {
            Ok(k) => Ok(TempDelta(k)),
            Err(e) => Err(e),
        }
    }

    /// The interval in kelvin.
    pub const fn kelvin(self) -> f32 {
        self.0
    }
}

impl fmt::Display for TempDelta {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        fmt::Display::fmt(&self.0, f)?;
        f.write_str(" K")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn constructors_reject_by_domain() {
        assert_eq!(Ohms::new(-1.0).unwrap_err().reason, Reason::Negative);
        assert_eq!(Henries::new(0.0).unwrap_err().reason, Reason::NotPositive);
        assert_eq!(Seconds::new(-0.1).unwrap_err().reason, Reason::Negative);
        assert_eq!(
            Farads::new(f32::INFINITY).unwrap_err().reason,
            Reason::NotFinite
        );
        assert_eq!(Volts::new(1e13).unwrap_err().reason, Reason::TooLarge);
        assert_eq!(Amps::new(1e-35).unwrap_err().reason, Reason::TooSmall);
        assert!(Volts::new(-24.0).is_ok());
        assert!(Ohms::new(0.0).is_ok());
        assert_eq!(
            Temperature::from_celsius(-273.15).unwrap_err().reason,
            Reason::BelowAbsoluteZero
        );
        assert_eq!(
            Temperature::from_kelvin(0.0).unwrap_err().reason,
            Reason::BelowAbsoluteZero
        );
    }

    #[test]
    fn display_carries_the_unit() {
        extern crate std;
        use std::format;
        assert_eq!(format!("{}", Volts::new(24.0).unwrap()), "24 V");
        assert_eq!(format!("{:.2}", Amps::new(0.4286).unwrap()), "0.43 A");
        assert_eq!(format!("{}", Amps::new(2e-9).unwrap()), "2e-9 A");
        assert_eq!(
            format!("{}", Temperature::from_celsius(25.0).unwrap()),
            "25 °C"
        );
    }

    #[test]
    fn cross_unit_products() {
        // Ohm's law and P = V·I, E = P·t, Q = I·t (SI definitions).
        let v = Ohms::new(56.0).unwrap() * Amps::new(0.5).unwrap();
        assert_eq!(v.value(), 28.0);
        let p = v * Amps::new(0.5).unwrap();
        assert_eq!(p.value(), 14.0);
        let e = p * Seconds::new(2.0).unwrap();
        assert_eq!(e.value(), 28.0);
        let q = Amps::new(2.0).unwrap() * Seconds::new(3.0).unwrap();
        assert_eq!((q * Volts::new(4.0).unwrap()).value(), 24.0);
        let tau = Ohms::new(1e3).unwrap() * Farads::new(1e-6).unwrap();
        assert!((tau.value() - 1e-3).abs() < 1e-9);
        assert_eq!(
            Volts::new(24.0)
                .unwrap()
                .over(Ohms::new(0.0).unwrap())
                .unwrap_err()
                .input,
            "R"
        );
    }

    #[test]
    fn extreme_products_stay_finite() {
        let big = Amps::new(MAX_MAGNITUDE).unwrap();
        let r = Ohms::new(MAX_MAGNITUDE).unwrap();
        let p = (r * big) * big;
        assert!(p.value().is_finite());
        let l = Henries::new(MIN_MAGNITUDE).unwrap();
        let slow = Henries::new(MAX_MAGNITUDE)
            .unwrap()
            .time_constant(Ohms::new(MIN_MAGNITUDE).unwrap());
        assert_eq!(slow.unwrap_err().reason, Reason::Overflow);
        assert!(l.stored_energy(big).value().is_finite());
    }
}
