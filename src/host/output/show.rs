//! Numbers for people: four significant digits and the SI prefix that keeps them readable
//! (current in mA below 1 A, times in ms below 1 s, energies in mJ below 1 J).

use crate::host::checks::Unit;
use std::format;
use std::string::String;

/// `x` with four significant digits (no exponent for the ranges a report shows).
pub fn sig4(x: f32) -> String {
    let a = x.abs();
    if a == 0.0 {
        return "0".into();
    }
    let digits = if a >= 1000.0 {
        0
    } else if a >= 100.0 {
        1
    } else if a >= 10.0 {
        2
    } else if a >= 1.0 {
        3
    } else {
        4
    };
    format!("{x:.digits$}")
}

/// A value in a unit, with a prefix.
pub fn value(x: f32, unit: Unit) -> String {
    let prefixed = |x: f32, base: &str| -> String {
        let a = x.abs();
        if a == 0.0 {
            format!("0 {base}")
        } else if a < 1e-6 {
            format!("{} n{base}", sig4(x * 1e9))
        } else if a < 1e-3 {
            format!("{} µ{base}", sig4(x * 1e6))
        } else if a < 1.0 {
            format!("{} m{base}", sig4(x * 1e3))
        } else if a >= 1e6 {
            format!("{} M{base}", sig4(x * 1e-6))
        } else if a >= 1e3 && base != "V" && base != "A" {
            format!("{} k{base}", sig4(x * 1e-3))
        } else {
            format!("{} {base}", sig4(x))
        }
    };
    match unit {
        Unit::Volt => format!("{} V", sig4(x)),
        Unit::Ampere => prefixed(x, "A"),
        Unit::Second => prefixed(x, "s"),
        Unit::Joule => prefixed(x, "J"),
        Unit::Watt => prefixed(x, "W"),
        Unit::Hertz => prefixed(x, "Hz"),
        Unit::Ohm => prefixed(x, "Ω"),
        Unit::Celsius => format!("{x:.1} °C"),
        Unit::Kelvin => format!("{x:.1} K"),
        Unit::Fraction => format!("{} %", sig4(x * 100.0)),
        Unit::Count => format!("{x:.0}"),
    }
}
