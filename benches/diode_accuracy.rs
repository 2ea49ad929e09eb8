//! Prints the measured accuracy of the diode model against an f64 evaluation of the same law.
//!
//! Run: `cargo bench --bench diode_accuracy`. Reference: the Shockley equation with series
//! resistance and the SPICE2 temperature law (Nagel 1975), evaluated here in f64 with the exact
//! SI 2019 constants. This is a measurement, not a test: the tests assert the bounds.

#[path = "../tests/common/mod.rs"]
mod common;

use common::v64;
use kickguard::diode::DiodeParams;
use kickguard::{Amps, Ohms, Temperature, Volts};

fn main() {
    println!("diode model accuracy, f32 against f64 evaluation of the same law");
    println!(
        "{:<10} {:>22} {:>26}",
        "preset", "max |ΔV| (−40…150 °C,", "max |ΔT| thermometer (K)"
    );
    println!("{:<10} {:>22}", "", "1 µA…10 A) (µV)");
    for (name, d) in [
        ("silicon", DiodeParams::SILICON),
        ("schottky", DiodeParams::SCHOTTKY),
    ] {
        let mut worst_v = 0.0f64;
        let mut worst_t = 0.0f64;
        for c in -40..=150 {
            let tk = c as f64 + 273.15;
            let t = Temperature::from_celsius(c as f32).unwrap();
            for k in 0..=140 {
                let i = (1e-6f64 * 10f64.powf(k as f64 / 20.0)) as f32;
                let got = d.forward_drop(Amps::new(i).unwrap(), t).unwrap().value() as f64;
                worst_v = worst_v.max((got - v64(&d, i as f64, tk)).abs());
                if k % 20 == 0 && i < 1.0 {
                    let v = v64(&d, i as f64, tk) as f32;
                    let back = d
                        .junction_temperature(Amps::new(i).unwrap(), Volts::new(v).unwrap())
                        .unwrap();
                    worst_t = worst_t.max((back.kelvin() as f64 - tk).abs());
                }
            }
        }
        println!("{:<10} {:>22.2} {:>26.4}", name, worst_v * 1e6, worst_t);
    }
    // Series solve residual: how well the returned current satisfies the circuit equation.
    let mut worst_rel = 0.0f64;
    let d = DiodeParams::SILICON;
    for c in [-40.0f32, 25.0, 150.0] {
        let t = Temperature::from_celsius(c).unwrap();
        for v in [0.3f32, 0.7, 3.3, 5.0, 24.0, 60.0] {
            for r in [10.0f32, 1e3, 1e5] {
                let i = d
                    .series_current(Volts::new(v).unwrap(), Ohms::new(r).unwrap(), t)
                    .unwrap()
                    .value() as f64;
                let rt = r as f64 + 0.05;
                let resid = i * rt + v64(&d, i, c as f64 + 273.15) - i * 0.05 - v as f64;
                worst_rel = worst_rel.max(resid.abs() / v as f64);
            }
        }
    }
    println!("series solve: worst residual |ΔV|/V = {worst_rel:.2e} (silicon, −40/25/150 °C, 0.3…60 V, 10 Ω…100 kΩ)");
}
