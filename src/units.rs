//! Typed quantities: SI newtypes over `f32` with validating constructors and checked arithmetic.
//!
//! Each quantity holds one `f32` in its SI base unit (volts, amperes, ohms, henries, seconds, joules,
//! watts, farads, coulombs, hertz; kelvin for temperatures). The field is private; the only way in
//! is a validating constructor, so every value in the crate is finite and, per type, of the
//! allowed sign:
//!
//! | type | unit | allowed values |
//! |---|---|---|
//! | [`Volts`], [`Amps`], [`Joules`], [`Watts`], [`Coulombs`] | V, A, J, W, C | any sign |
//! | [`Ohms`], [`Seconds`] | Ω, s | zero or positive |
//! | [`Henries`], [`Farads`], [`Hertz`] | H, F, Hz | strictly positive |
//! | [`Duty`] | – (a fraction) | 0 … 1 |
//! | [`PerKelvin`] (a relative temperature coefficient) | 1/K | −0.1 … 0.1 |
//! | [`Temperature`] (a point) | K (°C accessors) | above 0 K |
//! | [`TempDelta`] (an interval) | K | any sign |
//!
//! Magnitudes are limited to [`MIN_MAGNITUDE`] ≤ |x| ≤ [`MAX_MAGNITUDE`] (or exactly zero).
//!
//! **Formatting on a target.** `Display` (`{}`) goes through the crate's own decimal writer and
//! has no panic path (the link-time proof formats every quantity and error through it). The
//! derived `Debug` (`{:?}`) uses core's float formatting, which keeps a panic path: log with
//! `Display` (or `defmt`) in firmware that must be provably panic-free.
//!
//! **Arithmetic is checked.** Only the physically meaningful operations exist (`Ohms * Amps ->
//! Volts`, `Volts * Amps -> Watts`, `Watts * Seconds -> Joules`, `Amps * Seconds -> Coulombs`,
//! `Coulombs * Volts -> Joules`, `Ohms * Farads -> Seconds`, and `+`/`-` within one signed
//! quantity), and each returns `Result<_, Error>`: a product of two values inside the bounds can
//! leave them (1e12 · 1e12 = 1e24), and a chain of such products would reach ∞, so every result
//! goes through the same validating constructor as any other value ([`Reason::TooLarge`] or
//! [`Reason::TooSmall`] on `"product"`, `"sum"` or `"difference"`). Quotients are methods that
//! check their result the same way.
//!
//! ```
//! use kickguard::{Amps, Ohms};
//! let v = (Ohms::new(56.0)? * Amps::new(0.5)?)?;
//! assert_eq!(v.value(), 28.0);
//! let huge = Ohms::new(1e12)? * Amps::new(1e12)?;
//! assert!(huge.is_err()); // 1e24 V is outside the quantity bounds: an error, never ∞ later
//! # Ok::<(), kickguard::Error>(())
//! ```
//!
//! A temperature point and a temperature interval are different types, so adding two
//! temperatures does not compile:
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
//!
//! **Formatting** (`{}`, `{:.3}`, a width) goes through [`decimal`], the crate's own integer-only
//! float printer, not core's float formatting: writing a quantity into a fixed buffer on the
//! target has no panic path (the link-time proof covers it).

pub mod decimal;

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
            /// The value and its unit symbol; magnitudes below 1e-3 or from 1e6 up in exponent
            /// form. Honours a precision (decimals) and a width; panic-free (see [`decimal`]).
            fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                decimal::write_quantity(f, self.0, $unit)
            }
        }
    };
}

/// Defines `A * B -> Result<C, Error>` in both orders.
macro_rules! product {
    ($a:ident * $b:ident => $c:ident) => {
        impl Mul<$b> for $a {
            type Output = Result<$c, Error>;
            fn mul(self, rhs: $b) -> Result<$c, Error> {
                product_of(self.0, rhs.0).map($c)
            }
        }
        impl Mul<$a> for $b {
            type Output = Result<$c, Error>;
            fn mul(self, rhs: $a) -> Result<$c, Error> {
                product_of(self.0, rhs.0).map($c)
            }
        }
    };
}

/// Defines checked `+` and `-` within one signed quantity.
macro_rules! additive {
    ($($t:ident),*) => {$(
        impl Add for $t {
            type Output = Result<$t, Error>;
            fn add(self, rhs: $t) -> Result<$t, Error> {
                checked("sum", self.0 + rhs.0).map($t)
            }
        }
        impl Sub for $t {
            type Output = Result<$t, Error>;
            fn sub(self, rhs: $t) -> Result<$t, Error> {
                checked("difference", self.0 - rhs.0).map($t)
            }
        }
    )*};
}

/// A computed value must stay inside the quantity bounds (never ∞, never a subnormal).
fn checked(what: &'static str, x: f32) -> Result<f32, Error> {
    error::finite(what, x)
}

/// The product `a·b` inside the bounds: a product of two nonzero factors that underflows to
/// zero is [`Reason::TooSmall`] on `"product"`, never a silent zero.
fn product_of(a: f32, b: f32) -> Result<f32, Error> {
    nonzero_result("product", a * b, a != 0.0 && b != 0.0)
}

/// `x` inside the bounds, and not zero when `nonzero` says it cannot be (an underflow).
fn nonzero_result(what: &'static str, x: f32, nonzero: bool) -> Result<f32, Error> {
    if nonzero && x == 0.0 {
        return Err(Error::new(what, Reason::TooSmall));
    }
    checked(what, x)
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
quantity!(
    /// A frequency or rate in hertz (Hz): PWM frequency, switching rate, timer tick rate.
    /// Strictly positive.
    Hertz, "Hz", "frequency (Hz)", positive
);

product!(Ohms * Amps => Volts);
product!(Volts * Amps => Watts);
product!(Watts * Seconds => Joules);
product!(Amps * Seconds => Coulombs);
product!(Coulombs * Volts => Joules);
product!(Ohms * Farads => Seconds);
product!(Joules * Hertz => Watts);
additive!(Volts, Amps, Joules, Watts, Coulombs);

impl Hertz {
    /// The period 1/f, in seconds.
    ///
    /// # Errors
    /// A period beyond the quantity bounds (f below 1e-12 Hz) → [`Reason::TooLarge`] on
    /// `"period"`.
    pub fn period(self) -> Result<Seconds, Error> {
        Seconds::new(1.0 / self.0).map_err(|e| Error::new("period", e.reason))
    }
}

impl Henries {
    /// Time constant τ = L / R of an R–L circuit, in seconds.
    ///
    /// # Errors
    /// `R` = 0 gives an infinite τ: [`Reason::NotPositive`] on `"R"`; a τ beyond the bounds →
    /// [`Reason::Overflow`] on `"time constant"`.
    ///
    /// ```
    /// use kickguard::{Henries, Ohms};
    /// let tau = Henries::new(0.35)?.time_constant(Ohms::new(56.0)?)?;
    /// assert!((tau.value() - 0.00625).abs() < 1e-7);
    /// # Ok::<(), kickguard::Error>(())
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
    /// # Errors
    /// An energy beyond the quantity bounds → [`Reason::TooLarge`] / [`Reason::TooSmall`] on
    /// `"stored energy"`.
    ///
    /// ```
    /// use kickguard::{Henries, Amps};
    /// let e = Henries::new(2.0)?.stored_energy(Amps::new(3.0)?)?;
    /// assert_eq!(e.value(), 9.0);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn stored_energy(self, i: Amps) -> Result<Joules, Error> {
        // L ≤ 1e12 and I² ≤ 1e24: the f32 product is finite; the bound check does the rest,
        // and a nonzero current whose energy underflows to zero is TooSmall.
        nonzero_result("stored energy", 0.5 * self.0 * i.0 * i.0, i.0 != 0.0).map(Joules)
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

/// A duty cycle or any other fraction of a whole, 0 ≤ D ≤ 1 (dimensionless).
///
/// ```
/// use kickguard::Duty;
/// assert_eq!(Duty::new(0.25)?.value(), 0.25);
/// assert!(Duty::new(1.5).is_err());
/// assert!(Duty::percent(40.0)?.value() - 0.4 < 1e-7);
/// # Ok::<(), kickguard::Error>(())
/// ```
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Duty(f32);

impl Duty {
    /// A fraction from 0 to 1: zero, or from [`MIN_MAGNITUDE`] up, like every quantity.
    ///
    /// # Errors
    /// Non-finite → [`Reason::NotFinite`]; outside 0…1 → [`Reason::OutsideValidatedRange`];
    /// nonzero below [`MIN_MAGNITUDE`] → [`Reason::TooSmall`]; all on `"duty"`.
    pub const fn new(d: f32) -> Result<Self, Error> {
        if !d.is_finite() {
            Err(Error::new("duty", Reason::NotFinite))
        } else if d != 0.0 && d.abs() < MIN_MAGNITUDE {
            Err(Error::new("duty", Reason::TooSmall))
        } else if d >= 0.0 && d <= 1.0 {
            Ok(Duty(d))
        } else {
            Err(Error::new("duty", Reason::OutsideValidatedRange))
        }
    }

    /// A fraction from a percentage (0…100 %).
    ///
    /// # Errors
    /// As [`Duty::new`].
    pub const fn percent(p: f32) -> Result<Self, Error> {
        Duty::new(p / 100.0)
    }

    /// The fraction (0…1).
    pub const fn value(self) -> f32 {
        self.0
    }

    pub(crate) const fn raw(d: f32) -> Self {
        Duty(d)
    }
}

impl fmt::Display for Duty {
    /// As a percentage, for example `69.5 %`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        decimal::write_quantity(f, self.0 * 100.0, "%")
    }
}

/// A relative temperature coefficient, per kelvin: x(T) = x(T_ref)·(1 + c·(T − T_ref)). A copper
/// winding's resistance has +0.00393 /K at 20 °C (IEC 60028); a datasheet's "+0.08 %/K" for a
/// zener is 0.0008 /K. Limited to |c| ≤ 0.1 /K (no material used here comes near).
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PerKelvin(f32);

impl PerKelvin {
    /// A coefficient in 1/K: zero, or of magnitude from [`MIN_MAGNITUDE`] up.
    ///
    /// # Errors
    /// Non-finite → [`Reason::NotFinite`]; |c| > 0.1 /K → [`Reason::OutsideValidatedRange`];
    /// nonzero below [`MIN_MAGNITUDE`] → [`Reason::TooSmall`]; all on
    /// `"temperature coefficient"`.
    pub const fn new(c: f32) -> Result<Self, Error> {
        if !c.is_finite() {
            Err(Error::new("temperature coefficient", Reason::NotFinite))
        } else if c != 0.0 && c.abs() < MIN_MAGNITUDE {
            Err(Error::new("temperature coefficient", Reason::TooSmall))
        } else if c >= -0.1 && c <= 0.1 {
            Ok(PerKelvin(c))
        } else {
            Err(Error::new(
                "temperature coefficient",
                Reason::OutsideValidatedRange,
            ))
        }
    }

    /// A coefficient from a datasheet's %/K (for example 0.08 for +0.08 %/K).
    ///
    /// # Errors
    /// As [`PerKelvin::new`].
    pub const fn percent_per_kelvin(p: f32) -> Result<Self, Error> {
        PerKelvin::new(p / 100.0)
    }

    /// No temperature dependence.
    pub const ZERO: PerKelvin = PerKelvin(0.0);

    /// The coefficient in 1/K.
    pub const fn value(self) -> f32 {
        self.0
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
/// let t = Temperature::from_celsius(25.0)?;
/// assert!((t.kelvin() - 298.15).abs() < 1e-4);
/// let hot = t.offset(TempDelta::from_kelvin(30.0)?)?;
/// assert!((hot.celsius() - 55.0).abs() < 1e-4);
/// assert!(((hot - t).kelvin() - 30.0).abs() < 1e-4);
/// # Ok::<(), kickguard::Error>(())
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
    /// A result at or below 0 K → [`Reason::BelowAbsoluteZero`], beyond 1e12 K →
    /// [`Reason::TooLarge`], on `"temperature offset"`.
    pub fn offset(self, d: TempDelta) -> Result<Temperature, Error> {
        Temperature::from_kelvin(self.0 + d.0)
            .map_err(|e| Error::new("temperature offset", e.reason))
    }

    pub(crate) const fn raw_kelvin(k: f32) -> Self {
        Temperature(k)
    }
}

impl Sub for Temperature {
    type Output = TempDelta;
    /// The interval between two points (always finite: both lie in (0, 1e12] K).
    fn sub(self, rhs: Temperature) -> TempDelta {
        TempDelta(self.0 - rhs.0)
    }
}

impl fmt::Display for Temperature {
    /// In degrees Celsius, for example `25 °C`.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        decimal::write_quantity(f, self.celsius(), "°C")
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
        decimal::write_quantity(f, self.0, "K")
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
        assert_eq!(Hertz::new(0.0).unwrap_err().reason, Reason::NotPositive);
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
        assert_eq!(
            Duty::new(-0.01).unwrap_err().reason,
            Reason::OutsideValidatedRange
        );
        assert_eq!(Duty::new(f32::NAN).unwrap_err().reason, Reason::NotFinite);
        assert!(PerKelvin::new(0.2).is_err());
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
        assert_eq!(format!("{}", Duty::new(0.695).unwrap()), "69.5 %");
        assert_eq!(format!("{:>8.1}", Volts::new(-3.25).unwrap()), "  -3.2 V");
    }

    #[test]
    fn cross_unit_products() {
        // Ohm's law and P = V·I, E = P·t, Q = I·t (SI definitions).
        let v = (Ohms::new(56.0).unwrap() * Amps::new(0.5).unwrap()).unwrap();
        assert_eq!(v.value(), 28.0);
        let p = (v * Amps::new(0.5).unwrap()).unwrap();
        assert_eq!(p.value(), 14.0);
        let e = (p * Seconds::new(2.0).unwrap()).unwrap();
        assert_eq!(e.value(), 28.0);
        let q = (Amps::new(2.0).unwrap() * Seconds::new(3.0).unwrap()).unwrap();
        assert_eq!((q * Volts::new(4.0).unwrap()).unwrap().value(), 24.0);
        let tau = (Ohms::new(1e3).unwrap() * Farads::new(1e-6).unwrap()).unwrap();
        assert!((tau.value() - 1e-3).abs() < 1e-9);
        let w = (Joules::new(0.06).unwrap() * Hertz::new(0.5).unwrap()).unwrap();
        assert!((w.value() - 0.03).abs() < 1e-9);
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
    fn extreme_products_are_errors_not_infinities() {
        // Issue: a chain of products of valid extremes reached +∞. Every product is now checked.
        let big = Amps::new(MAX_MAGNITUDE).unwrap();
        let r = Ohms::new(MAX_MAGNITUDE).unwrap();
        let e = (r * big).unwrap_err();
        assert_eq!((e.input, e.reason), ("product", Reason::TooLarge));
        let tiny = (Ohms::new(MIN_MAGNITUDE).unwrap() * Amps::new(1e-3).unwrap()).unwrap_err();
        assert_eq!(tiny.reason, Reason::TooSmall);
        let sum = Volts::new(MAX_MAGNITUDE).unwrap() + Volts::new(MAX_MAGNITUDE).unwrap();
        assert_eq!(sum.unwrap_err().input, "sum");
        let slow = Henries::new(MAX_MAGNITUDE)
            .unwrap()
            .time_constant(Ohms::new(MIN_MAGNITUDE).unwrap());
        assert_eq!(slow.unwrap_err().reason, Reason::Overflow);
        let l = Henries::new(MIN_MAGNITUDE).unwrap();
        assert_eq!(
            l.stored_energy(Amps::new(1e-3).unwrap())
                .unwrap_err()
                .reason,
            Reason::TooSmall
        );
        assert!(Henries::new(MAX_MAGNITUDE)
            .unwrap()
            .stored_energy(big)
            .is_err());
    }
}
