//! The crate's error type: which input was wrong, and why.
//!
//! Every fallible function in kickguard returns [`Error`]. It is small, `Copy` and `PartialEq`, so a
//! firmware can match on it, log it with `defmt`, or compare it in a test. The `input` field is the
//! name of the offending input exactly as the function's documentation spells it (for example
//! `"forward current"` or `"IS"`), and [`Reason`] says what is wrong with it.

use core::fmt;

/// What is wrong with an input, or why a computation could not give a finite, validated answer.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Reason {
    /// The value is NaN or ±∞.
    NotFinite,
    /// The value must be strictly greater than zero.
    NotPositive,
    /// The value must be zero or greater.
    Negative,
    /// The magnitude exceeds [`crate::units::MAX_MAGNITUDE`], the bound that keeps products finite.
    TooLarge,
    /// A nonzero magnitude below [`crate::units::MIN_MAGNITUDE`] (subnormal or meaningless).
    TooSmall,
    /// A temperature at or below absolute zero.
    BelowAbsoluteZero,
    /// The value lies outside the range over which the model is validated (stated in the docs).
    OutsideValidatedRange,
    /// A set of points is not ordered as the model requires (for example currents not increasing).
    NotIncreasing,
    /// A sequence that must fall (a decay's samples) does not.
    NotDecreasing,
    /// A list has fewer entries than the method needs.
    TooFew,
    /// The inputs contradict the model (for example a diode drop that falls as current rises,
    /// or a fit whose result is unphysical).
    Inconsistent,
    /// A clamp or limit voltage is too low to do its job (for example a switch-side clamp at or
    /// below the supply voltage, which could never stop the current).
    CannotClamp,
    /// The requested target is not reached by the model (for example a time to a current the
    /// decay never gets down to).
    Unreachable,
    /// The result would not be a finite `f32` (overflow).
    Overflow,
}

/// A typed error naming the offending input and the reason.
///
/// ```
/// use kickguard::{Error, Reason, Amps};
/// let e = Amps::new(f32::NAN).unwrap_err();
/// assert_eq!(e.reason, Reason::NotFinite);
/// assert_eq!(e.input, "current (A)");
/// ```
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Error {
    /// Name of the input (as spelled in the function's docs) or of the quantity that failed.
    pub input: &'static str,
    /// Why it failed.
    pub reason: Reason,
}

impl Error {
    /// Builds an error for `input` with `reason`.
    pub const fn new(input: &'static str, reason: Reason) -> Self {
        Error { input, reason }
    }

    /// The same reason, blamed on `input` (for errors of an inner call that the caller knows
    /// came from one of its own arguments).
    pub const fn on(self, input: &'static str) -> Self {
        Error {
            input,
            reason: self.reason,
        }
    }
}

impl fmt::Display for Reason {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let s = match self {
            Reason::NotFinite => "is NaN or infinite",
            Reason::NotPositive => "must be greater than zero",
            Reason::Negative => "must not be negative",
            Reason::TooLarge => "is too large in magnitude (limit 1e12)",
            Reason::TooSmall => "is too small in magnitude (nonzero values start at 1e-30)",
            Reason::BelowAbsoluteZero => "is at or below absolute zero",
            Reason::OutsideValidatedRange => "is outside the validated range of the model",
            Reason::NotIncreasing => "is not strictly increasing",
            Reason::NotDecreasing => "is not strictly decreasing",
            Reason::TooFew => "has too few entries",
            Reason::Inconsistent => "contradicts the model",
            Reason::CannotClamp => "is too low to clamp",
            Reason::Unreachable => "is never reached",
            Reason::Overflow => "would overflow f32",
        };
        f.write_str(s)
    }
}

impl Reason {
    /// A stable small code for this reason (1…14), for logs and the C interface; never 0.
    pub const fn code(self) -> u8 {
        match self {
            Reason::NotFinite => 1,
            Reason::NotPositive => 2,
            Reason::Negative => 3,
            Reason::TooLarge => 4,
            Reason::TooSmall => 5,
            Reason::BelowAbsoluteZero => 6,
            Reason::OutsideValidatedRange => 7,
            Reason::NotIncreasing => 8,
            Reason::NotDecreasing => 9,
            Reason::TooFew => 10,
            Reason::Inconsistent => 11,
            Reason::CannotClamp => 12,
            Reason::Unreachable => 13,
            Reason::Overflow => 14,
        }
    }
}

impl fmt::Display for Error {
    /// "`input` `reason`", for example "forward current must be greater than zero". Written with
    /// `write_str` only, so it has no panic path on the target.
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.input)?;
        f.write_str(" ")?;
        fmt::Display::fmt(&self.reason, f)
    }
}

impl core::error::Error for Error {}

/// Checks a raw `f32` input: finite, and within [`crate::units::MAX_MAGNITUDE`].
pub(crate) const fn finite(input: &'static str, x: f32) -> Result<f32, Error> {
    if !x.is_finite() {
        Err(Error::new(input, Reason::NotFinite))
    } else if x.abs() > crate::units::MAX_MAGNITUDE {
        Err(Error::new(input, Reason::TooLarge))
    } else if x != 0.0 && x.abs() < crate::units::MIN_MAGNITUDE {
        Err(Error::new(input, Reason::TooSmall))
    } else {
        Ok(x)
    }
}

/// Checks that `x` is finite and strictly positive.
pub(crate) const fn positive(input: &'static str, x: f32) -> Result<f32, Error> {
    match finite(input, x) {
        Ok(x) if x > 0.0 => Ok(x),
        Ok(_) => Err(Error::new(input, Reason::NotPositive)),
        Err(e) => Err(e),
    }
}

/// Checks that `x` is finite and zero or positive.
pub(crate) const fn non_negative(input: &'static str, x: f32) -> Result<f32, Error> {
    match finite(input, x) {
        Ok(x) if x >= 0.0 => Ok(x),
        Ok(_) => Err(Error::new(input, Reason::Negative)),
        Err(e) => Err(e),
    }
}

/// Checks that `x` is finite and within `lo ..= hi` (the range a model is validated for).
pub(crate) const fn within(input: &'static str, x: f32, lo: f32, hi: f32) -> Result<f32, Error> {
    if !x.is_finite() {
        Err(Error::new(input, Reason::NotFinite))
    } else if x >= lo && x <= hi {
        Ok(x)
    } else {
        Err(Error::new(input, Reason::OutsideValidatedRange))
    }
}

/// Checks a computed result: it must be a finite `f32`, else [`Reason::Overflow`] on `what`.
pub(crate) fn result(what: &'static str, x: f32) -> Result<f32, Error> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(Error::new(what, Reason::Overflow))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn guards_name_the_input_and_reason() {
        assert_eq!(
            finite("x", f32::INFINITY),
            Err(Error::new("x", Reason::NotFinite))
        );
        assert_eq!(finite("x", 2e12), Err(Error::new("x", Reason::TooLarge)));
        assert_eq!(finite("x", 1e-35), Err(Error::new("x", Reason::TooSmall)));
        assert_eq!(
            positive("y", 0.0),
            Err(Error::new("y", Reason::NotPositive))
        );
        assert_eq!(
            positive("y", f32::NAN),
            Err(Error::new("y", Reason::NotFinite))
        );
        assert_eq!(
            non_negative("z", -1e-30),
            Err(Error::new("z", Reason::Negative))
        );
        assert_eq!(non_negative("z", 0.0), Ok(0.0));
        assert_eq!(
            result("r", f32::NEG_INFINITY),
            Err(Error::new("r", Reason::Overflow))
        );
    }
}
