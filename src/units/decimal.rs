//! A small, panic-free decimal printer for `f32` quantities.
//!
//! Core's float formatting (`{}` on an `f32`) carries panic paths of its own into a firmware
//! image; this printer does not: it scales the value once in `f64`, rounds it to an integer, and
//! writes the digits with integer arithmetic into a fixed buffer (no allocation, no indexing that
//! can fail, no arithmetic that can overflow: every integer is below 10¹⁶). The link-time proof
//! (`cortex-m/src/bin/panic_check.rs`) writes quantities and errors into a `heapless::String`.
//!
//! Output, as Rust's float `Display` and `LowerExp` would give for the same digits:
//! - 1e-3 ≤ |x| < 1e6 (and 0) in plain form; other magnitudes in exponent form (`2e-9`);
//! - without a precision, six significant digits with trailing zeros removed (`24`, `0.4286`);
//! - with a precision p ≤ 9, exactly p decimals (`{:.2}` → `0.43`; `{:.2}` in exponent form →
//!   `2.00e-9`); a larger precision is taken as 9 (f32 carries about 7 digits);
//! - a width pads on the left (or as `<`, `^`, `>` ask), with the formatter's fill character.
//!
//! Rounding is to nearest, ties to even (as Rust's own float formatting does), on the f64 product
//! of the value and 10ᵖ; that product is exact for every f32 and p ≤ 8, and within one f64
//! rounding for p = 9.

use core::fmt::{self, Alignment, Write};

/// Largest number of decimals printed.
const MAX_DECIMALS: usize = 9;
/// Significant digits without an explicit precision.
const AUTO_SIGNIFICANT: i32 = 6;
/// 10ᵏ for k = 0…10.
const POW10: [u64; 11] = [
    1,
    10,
    100,
    1_000,
    10_000,
    100_000,
    1_000_000,
    10_000_000,
    100_000_000,
    1_000_000_000,
    10_000_000_000,
];

fn pow10(k: usize) -> u64 {
    POW10.get(k).copied().unwrap_or(1)
}

/// A fixed buffer that refuses, rather than truncates, what does not fit.
struct Buf {
    bytes: [u8; 64],
    len: usize,
}

impl Buf {
    const fn new() -> Self {
        Buf {
            bytes: [0; 64],
            len: 0,
        }
    }

    fn push(&mut self, b: u8) -> fmt::Result {
        let slot = self.bytes.get_mut(self.len).ok_or(fmt::Error)?;
        *slot = b;
        // len < 64 here (the slot existed): cannot saturate.
        self.len = self.len.saturating_add(1);
        Ok(())
    }

    fn as_str(&self) -> Result<&str, fmt::Error> {
        let used = self.bytes.get(..self.len).ok_or(fmt::Error)?;
        core::str::from_utf8(used).map_err(|_| fmt::Error)
    }

    /// The last byte, if any.
    fn last(&self) -> Option<u8> {
        self.len
            .checked_sub(1)
            .and_then(|k| self.bytes.get(k))
            .copied()
    }

    fn pop(&mut self) {
        self.len = self.len.saturating_sub(1);
    }
}

impl Write for Buf {
    fn write_str(&mut self, s: &str) -> fmt::Result {
        s.bytes().try_for_each(|b| self.push(b))
    }
}

/// Writes the decimal digits of `n` (no sign, at least `min_digits` digits, zero-padded).
fn write_digits(buf: &mut Buf, mut n: u64, min_digits: usize) -> fmt::Result {
    let mut rev = [0u8; 20];
    let mut k = 0usize;
    loop {
        if let Some(slot) = rev.get_mut(k) {
            // n % 10 < 10: the cast cannot truncate, and b'0' + 9 fits a byte.
            *slot = b'0'.saturating_add((n % 10) as u8);
        }
        // k ≤ 20: cannot saturate.
        k = k.saturating_add(1);
        n /= 10;
        if (n == 0 && k >= min_digits) || k >= rev.len() {
            break;
        }
    }
    for d in rev.iter().take(k).rev() {
        buf.push(*d)?;
    }
    Ok(())
}

/// Writes `int.frac` with `decimals` digits after the point; removes trailing zeros (and the
/// point) when `trim` is set.
fn write_fixed(buf: &mut Buf, scaled: u64, decimals: usize, trim: bool) -> fmt::Result {
    let p = pow10(decimals);
    write_digits(buf, scaled / p, 1)?;
    if decimals > 0 {
        buf.push(b'.')?;
        write_digits(buf, scaled % p, decimals)?;
        if trim {
            while buf.last() == Some(b'0') {
                buf.pop();
            }
            if buf.last() == Some(b'.') {
                buf.pop();
            }
        }
    }
    Ok(())
}

/// Rounds a non-negative f64 below 1e16 to an integer, ties to even (saturating casts cannot
/// panic).
fn round_u64(x: f64) -> u64 {
    libm::rint(x) as u64
}

/// Writes a finite, non-negative magnitude `a` in plain form.
fn plain(buf: &mut Buf, a: f64, precision: Option<usize>) -> fmt::Result {
    let (decimals, trim) = match precision {
        Some(p) => (p.min(MAX_DECIMALS), false),
        None => {
            // Position of the leading digit: 10^lead ≤ a < 10^(lead+1), lead in −3…5 here.
            let lead = if a > 0.0 {
                libm::floor(libm::log10(a)) as i32
            } else {
                0
            };
            // lead is −3…5 here; saturating keeps any value in range.
            let d = (AUTO_SIGNIFICANT - 1)
                .saturating_sub(lead)
                .clamp(0, MAX_DECIMALS as i32);
            (d as usize, true)
        }
    };
    // a < 1e6 and decimals ≤ 9: the scaled value is below 1e15.
    let scaled = round_u64(a * pow10(decimals) as f64);
    write_fixed(buf, scaled, decimals, trim)
}

/// Writes a finite, positive magnitude `a` in exponent form, `m.mmmme±x`.
fn exponent(buf: &mut Buf, a: f64, precision: Option<usize>) -> fmt::Result {
    let (decimals, trim) = match precision {
        Some(p) => (p.min(MAX_DECIMALS), false),
        None => ((AUTO_SIGNIFICANT - 1) as usize, true),
    };
    let mut e = libm::floor(libm::log10(a)) as i32;
    let mut m = a / libm::pow(10.0, e as f64);
    // log10 may be off by one ulp at exact powers of ten.
    if m >= 10.0 {
        m /= 10.0;
        e = e.saturating_add(1);
    } else if m < 1.0 {
        m *= 10.0;
        e = e.saturating_sub(1);
    }
    let mut scaled = round_u64(m * pow10(decimals) as f64);
    if scaled >= pow10(decimals.saturating_add(1)) {
        // Rounded up to 10.000…: carry into the exponent (|e| ≤ 46 for an f32).
        scaled = pow10(decimals);
        e = e.saturating_add(1);
    }
    write_fixed(buf, scaled, decimals, trim)?;
    buf.push(b'e')?;
    if e < 0 {
        buf.push(b'-')?;
    }
    write_digits(buf, e.unsigned_abs() as u64, 1)
}

/// Writes `x` (any f32) as a number, per the module rules.
fn number(buf: &mut Buf, x: f32, precision: Option<usize>) -> fmt::Result {
    if x.is_nan() {
        return buf.write_str("NaN");
    }
    // −0 prints as 0; a negative nonzero value gets its sign.
    if x < 0.0 {
        buf.push(b'-')?;
    }
    if x.is_infinite() {
        return buf.write_str("inf");
    }
    let a = (x as f64).abs();
    if a == 0.0 || (1e-3..1e6).contains(&a) {
        plain(buf, a, precision)
    } else {
        exponent(buf, a, precision)
    }
}

/// Writes `x` and its unit (`"V"`, `"°C"` …) through the formatter, honouring precision and
/// width (see the module docs).
///
/// # Errors
/// The formatter's own error, or [`fmt::Error`] if the text would not fit in 64 bytes (it
/// always fits: at most 30 bytes are written).
pub fn write_quantity(f: &mut fmt::Formatter<'_>, x: f32, unit: &str) -> fmt::Result {
    let mut buf = Buf::new();
    number(&mut buf, x, f.precision())?;
    if !unit.is_empty() {
        buf.push(b' ')?;
        buf.write_str(unit)?;
    }
    let text = buf.as_str()?;
    // The text is at most 64 bytes, so at most 64 characters.
    let shown = text.chars().fold(0usize, |n, _| n.saturating_add(1));
    let pad = f.width().map_or(0, |w| w.saturating_sub(shown));
    let (before, after) = match f.align() {
        Some(Alignment::Left) => (0, pad),
        Some(Alignment::Center) => (pad / 2, pad.saturating_sub(pad / 2)),
        Some(Alignment::Right) | None => (pad, 0),
    };
    let fill = f.fill();
    for _ in 0..before {
        f.write_char(fill)?;
    }
    f.write_str(text)?;
    for _ in 0..after {
        f.write_char(fill)?;
    }
    Ok(())
}

/// Writes `x` with `decimals` decimals (at most 9) into any [`fmt::Write`], without a unit:
/// the same panic-free printer, for firmware that logs raw numbers.
///
/// # Errors
/// The writer's own error.
///
/// ```
/// use kickguard::units::decimal::write_fixed_point;
/// let mut s = heapless::String::<16>::new();
/// write_fixed_point(&mut s, 0.43571, 3).unwrap();
/// assert_eq!(s.as_str(), "0.436");
/// ```
pub fn write_fixed_point(w: &mut impl Write, x: f32, decimals: usize) -> fmt::Result {
    let mut buf = Buf::new();
    number(&mut buf, x, Some(decimals))?;
    w.write_str(buf.as_str()?)
}

#[cfg(test)]
mod tests {
    extern crate std;
    use super::*;
    use std::format;
    use std::string::String;

    struct Shown(f32, &'static str);
    impl fmt::Display for Shown {
        fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
            write_quantity(f, self.0, self.1)
        }
    }

    #[test]
    fn matches_rusts_own_float_display_digits() {
        // Reference: Rust's standard float formatting, on the same f32 values.
        for &x in &[
            24.0f32, 0.4286, 1.0, 0.001, 999_999.0, 123.456, 0.0123, 56.0, 0.35, 7.5, 100.0,
        ] {
            let ours = format!("{:.3}", Shown(x, ""));
            assert_eq!(ours, format!("{x:.3}"), "{x}");
        }
        for &x in &[2e-9f32, 1.5e-9, 3.3e7, 1e12, 1e-30, 6.02e23] {
            assert_eq!(format!("{:.2}", Shown(x, "")), format!("{x:.2e}"), "{x:e}");
        }
        assert_eq!(format!("{}", Shown(2e-9, "A")), "2e-9 A");
        assert_eq!(format!("{}", Shown(1.5e-9, "")), "1.5e-9");
        assert_eq!(format!("{}", Shown(24.0, "V")), "24 V");
        assert_eq!(format!("{}", Shown(0.4286, "A")), "0.4286 A");
        assert_eq!(format!("{}", Shown(-0.0, "")), "0");
        assert_eq!(format!("{}", Shown(-12.5, "")), "-12.5");
        assert_eq!(format!("{:.1}", Shown(9.96, "")), "10.0");
        assert_eq!(format!("{:.0}", Shown(9.99e5, "")), "999000");
        assert_eq!(format!("{}", Shown(f32::NAN, "")), "NaN");
        assert_eq!(format!("{}", Shown(f32::NEG_INFINITY, "")), "-inf");
        assert_eq!(format!("{:<7}|", Shown(1.0, "V")), "1 V    |");
        assert_eq!(format!("{:^7}|", Shown(1.0, "V")), "  1 V  |");
        // Rounding that carries into the exponent: 9.9999e5 to two decimals is 1.00e6.
        assert_eq!(format!("{:.2}", Shown(9.999_99e6, "")), "1.00e7");
    }

    #[test]
    fn every_bit_pattern_formats_without_panic() {
        // Sweep a coarse grid of all f32 bit patterns (every 2^20-th), including specials.
        let mut s = String::new();
        let mut bits = 0u32;
        loop {
            let x = f32::from_bits(bits);
            s.clear();
            let _ = fmt::write(&mut s, format_args!("{:.4}", Shown(x, "Ω")));
            let _ = fmt::write(&mut s, format_args!("{}", Shown(x, "Ω")));
            assert!(!s.is_empty());
            match bits.checked_add(1 << 20) {
                Some(b) => bits = b,
                None => break,
            }
        }
    }
}
