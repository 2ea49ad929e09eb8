//! Quantities with units in design files: `"350 mH"`, `"56 Ω"`, `"4.7 kohm"`, `"-10 °C"`,
//! `"25 K"`, `"10 %"`, `"0.08 %/K"`, `"20 kHz"`, `"62 K/W"`, `"20 mJ/K"`, `"1 µA"`,
//! `"2 ticks"`, `"5 A/V²"`.
//!
//! Grammar: a decimal number, optional spaces, then the unit, optionally preceded by one SI
//! prefix (p, n, u or µ, m, k, M, G). A bare number is refused for any dimensional field, so
//! that "350" meant as millihenries cannot slip through as 350 H; only a dimensionless field
//! ([`Unit::Number`]) takes one.

use std::format;
use std::string::String;

/// The unit a field expects.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Unit {
    /// volts
    Volt,
    /// amperes
    Amp,
    /// ohms
    Ohm,
    /// henries
    Henry,
    /// farads
    Farad,
    /// seconds
    Second,
    /// joules
    Joule,
    /// watts
    Watt,
    /// hertz
    Hertz,
    /// a temperature point in °C
    Celsius,
    /// a temperature interval in K
    Kelvin,
    /// a dimensionless fraction written in %
    Percent,
    /// a relative temperature coefficient in %/K
    PercentPerKelvin,
    /// a thermal resistance in K/W
    KelvinPerWatt,
    /// a thermal capacitance in J/K
    JoulePerKelvin,
    /// timer ticks (a count, for timing jitter)
    Ticks,
    /// a MOSFET's transconductance parameter K in A/V²
    AmpsPerVoltSquared,
    /// a dimensionless number (no unit)
    Number,
    /// newtons
    Newton,
    /// kilograms, written in grams ("12 g", "1.2 kg")
    Kilogram,
    /// metres ("1.5 mm")
    Metre,
    /// a spring rate in N/m
    NewtonPerMetre,
    /// viscous damping in N·s/m
    NewtonSecondPerMetre,
    /// ADC counts
    Counts,
    /// ADC counts per ampere of coil current
    CountsPerAmp,
}

impl Unit {
    /// Accepted spellings of the unit (without prefix), longest first where one ends another.
    fn symbols(self) -> &'static [&'static str] {
        match self {
            Unit::Volt => &["V"],
            Unit::Amp => &["A"],
            Unit::Ohm => &["ohm", "Ω", "Ohm"],
            Unit::Henry => &["H"],
            Unit::Farad => &["F"],
            Unit::Second => &["s"],
            Unit::Joule => &["J"],
            Unit::Watt => &["W"],
            Unit::Hertz => &["Hz"],
            Unit::Celsius => &["°C", "degC"],
            Unit::Kelvin => &["K"],
            Unit::Percent => &["%"],
            Unit::PercentPerKelvin => &["%/K"],
            Unit::KelvinPerWatt => &["K/W"],
            Unit::JoulePerKelvin => &["J/K"],
            Unit::Ticks => &["ticks", "tick"],
            Unit::AmpsPerVoltSquared => &["A/V²", "A/V^2", "A/V2"],
            Unit::Number => &[""],
            Unit::Newton => &["N"],
            Unit::Kilogram => &["g"],
            Unit::Metre => &["m"],
            Unit::NewtonPerMetre => &["N/m"],
            Unit::NewtonSecondPerMetre => &["N·s/m", "N*s/m", "Ns/m"],
            Unit::Counts => &["counts", "count"],
            Unit::CountsPerAmp => &["counts/A"],
        }
    }

    /// Whether SI prefixes are allowed.
    fn prefixable(self) -> bool {
        !matches!(
            self,
            Unit::Celsius
                | Unit::Kelvin
                | Unit::Percent
                | Unit::PercentPerKelvin
                | Unit::KelvinPerWatt
                | Unit::Ticks
                | Unit::Number
                | Unit::Counts
                | Unit::CountsPerAmp
        )
    }

    /// An example for error messages.
    pub fn example(self) -> &'static str {
        match self {
            Unit::Volt => "\"24 V\"",
            Unit::Amp => "\"150 mA\"",
            Unit::Ohm => "\"4.7 kΩ\" or \"4.7 kohm\"",
            Unit::Henry => "\"350 mH\"",
            Unit::Farad => "\"100 nF\"",
            Unit::Second => "\"8 ms\"",
            Unit::Joule => "\"50 mJ\"",
            Unit::Watt => "\"1 W\"",
            Unit::Hertz => "\"20 kHz\"",
            Unit::Celsius => "\"-10 °C\" or \"-10 degC\"",
            Unit::Kelvin => "\"25 K\"",
            Unit::Percent => "\"10 %\"",
            Unit::PercentPerKelvin => "\"0.08 %/K\"",
            Unit::KelvinPerWatt => "\"62 K/W\"",
            Unit::JoulePerKelvin => "\"20 mJ/K\"",
            Unit::Ticks => "\"2 ticks\"",
            Unit::AmpsPerVoltSquared => "\"5 A/V²\"",
            Unit::Number => "\"30\"",
            Unit::Newton => "\"0.3 N\"",
            Unit::Kilogram => "\"12 g\"",
            Unit::Metre => "\"1.5 mm\"",
            Unit::NewtonPerMetre => "\"500 N/m\"",
            Unit::NewtonSecondPerMetre => "\"2 N·s/m\"",
            Unit::Counts => "\"4 counts\"",
            Unit::CountsPerAmp => "\"3000 counts/A\"",
        }
    }
}

fn prefix_factor(c: &str) -> Option<f64> {
    Some(match c {
        "p" => 1e-12,
        "n" => 1e-9,
        "u" | "µ" | "μ" => 1e-6,
        "m" => 1e-3,
        "k" => 1e3,
        "M" => 1e6,
        "G" => 1e9,
        _ => return None,
    })
}

/// Parses `text` as a quantity in `unit`; returns the value in the SI unit (°C stays °C; % and
/// %/K are returned as fractions: "10 %" → 0.1).
///
/// # Errors
/// A message saying what is wrong, with an example of the expected form.
pub fn parse(text: &str, unit: Unit) -> Result<f64, String> {
    let t = text.trim();
    let (num, rest) = t.split_at(number_prefix_len(t));
    let value: f64 = num.parse().map_err(|_| {
        format!(
            "\"{text}\" does not start with a number; expected e.g. {}",
            unit.example()
        )
    })?;
    if !value.is_finite() {
        return Err(format!("\"{text}\" is not a finite number"));
    }
    let rest = rest.trim();
    if rest.is_empty() && unit == Unit::Number {
        return Ok(value);
    }
    if rest.is_empty() {
        return Err(format!(
            "\"{text}\" has no unit; expected e.g. {}",
            unit.example()
        ));
    }
    let finite = |v: f64| {
        if v.is_finite() {
            Ok(v)
        } else {
            Err(format!("\"{text}\" is too large"))
        }
    };
    for sym in unit.symbols() {
        if rest == *sym {
            return finite(scale(value, unit));
        }
        if unit.prefixable() {
            if let Some(p) = rest.strip_suffix(sym) {
                if let Some(f) = prefix_factor(p) {
                    // A prefix can push a finite number past f64's range ("4e307 kΩ").
                    return finite(scale(value * f, unit));
                }
            }
        }
    }
    Err(format!(
        "unit \"{rest}\" in \"{text}\" is not a unit of this field; expected e.g. {}",
        unit.example()
    ))
}

/// Length in bytes of the leading decimal number: sign, digits and point, and an exponent only
/// when digits follow the `e` (so "5 e" is not misread).
fn number_prefix_len(t: &str) -> usize {
    let b = t.as_bytes();
    let at = |i: usize| b.get(i).copied().unwrap_or(0);
    let digits = |mut i: usize| {
        while at(i).is_ascii_digit() || at(i) == b'.' {
            i += 1;
        }
        i
    };
    let mut i = if at(0) == b'+' || at(0) == b'-' { 1 } else { 0 };
    i = digits(i);
    if at(i) == b'e' || at(i) == b'E' {
        let mut j = i + 1;
        if at(j) == b'+' || at(j) == b'-' {
            j += 1;
        }
        if at(j).is_ascii_digit() {
            i = digits(j);
        }
    }
    i
}

fn scale(v: f64, unit: Unit) -> f64 {
    match unit {
        Unit::Percent | Unit::PercentPerKelvin => v / 100.0,
        // Written in grams, kept in kilograms.
        Unit::Kilogram => v / 1000.0,
        _ => v,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_prefixes_and_units() {
        assert!((parse("350 mH", Unit::Henry).unwrap() - 0.35).abs() < 1e-15);
        assert!((parse("4.7 kΩ", Unit::Ohm).unwrap() - 4700.0).abs() < 1e-9);
        assert!((parse("4.7kohm", Unit::Ohm).unwrap() - 4700.0).abs() < 1e-9);
        assert_eq!(parse("-10 °C", Unit::Celsius), Ok(-10.0));
        assert_eq!(parse("10 %", Unit::Percent), Ok(0.1));
        assert!((parse("0.08 %/K", Unit::PercentPerKelvin).unwrap() - 0.0008).abs() < 1e-12);
        assert!((parse("20 kHz", Unit::Hertz).unwrap() - 20_000.0).abs() < 1e-9);
        assert!((parse("1 µA", Unit::Amp).unwrap() - 1e-6).abs() < 1e-15);
        assert!((parse("1e-3 s", Unit::Second).unwrap() - 1e-3).abs() < 1e-18);
        assert_eq!(parse("62 K/W", Unit::KelvinPerWatt), Ok(62.0));
        assert!(parse("350", Unit::Henry).unwrap_err().contains("no unit"));
        assert!(parse("350 mHz", Unit::Henry).unwrap_err().contains("mHz"));
        assert!(parse("abc V", Unit::Volt).unwrap_err().contains("number"));
        assert!(parse("5 mK", Unit::Kelvin).is_err());
        assert!((parse("12 g", Unit::Kilogram).unwrap() - 0.012).abs() < 1e-15);
        assert!((parse("1.2 kg", Unit::Kilogram).unwrap() - 1.2).abs() < 1e-12);
        assert!((parse("1.5 mm", Unit::Metre).unwrap() - 1.5e-3).abs() < 1e-15);
        assert!((parse("2 N·s/m", Unit::NewtonSecondPerMetre).unwrap() - 2.0).abs() < 1e-15);
        assert!((parse("1 kN/m", Unit::NewtonPerMetre).unwrap() - 1e3).abs() < 1e-9);
        assert!(parse("3 kcounts", Unit::Counts).is_err());
        // Found by fuzzing: a prefix that overflows f64.
        assert!(parse("4.e307kΩ", Unit::Ohm)
            .unwrap_err()
            .contains("too large"));
    }
}
