//! Fuzz target: any text as a quantity with a unit, for every unit. Never panics; a value that
//! parses is finite.
#![no_main]

use kickguard::host::file::quantity::{parse, Unit};
use libfuzzer_sys::fuzz_target;

const UNITS: [Unit; 18] = [
    Unit::Volt,
    Unit::Amp,
    Unit::Ohm,
    Unit::Henry,
    Unit::Farad,
    Unit::Second,
    Unit::Joule,
    Unit::Watt,
    Unit::Hertz,
    Unit::Celsius,
    Unit::Kelvin,
    Unit::Percent,
    Unit::PercentPerKelvin,
    Unit::KelvinPerWatt,
    Unit::JoulePerKelvin,
    Unit::Ticks,
    Unit::AmpsPerVoltSquared,
    Unit::Number,
];

fuzz_target!(|data: &[u8]| {
    let text = String::from_utf8_lossy(data);
    for u in UNITS {
        if let Ok(v) = parse(&text, u) {
            assert!(v.is_finite());
        }
    }
});
