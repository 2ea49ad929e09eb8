//! Prints the micromath backend's largest difference from libm for each function that uses it.
//!
//! Run: `cargo bench --bench fast_math --features micromath`. Instruction counts of both are in
//! `cargo bench --bench instructions --features micromath`.

use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::diode::DiodeParams;
use kickguard::{fast, Amps, Henries, Ohms, Temperature, Volts};

fn main() {
    let mut worst_drop = 0.0f32;
    for d in [DiodeParams::SILICON, DiodeParams::SCHOTTKY] {
        for c in -40..=150 {
            let t = Temperature::from_celsius(c as f32).unwrap();
            for k in 0..=140 {
                let i = Amps::new(1e-6 * 10f32.powf(k as f32 / 20.0)).unwrap();
                let a = d.forward_drop(i, t).unwrap().value();
                let b = fast::forward_drop(&d, i, t).unwrap().value();
                worst_drop = worst_drop.max((a - b).abs());
            }
        }
    }
    let mut worst_time = 0.0f32;
    for &(l, r, vc) in &[
        (0.35f32, 56.0f32, 42.0f32),
        (0.9, 160.0, 1.0),
        (1e-3, 0.1, 30.0),
        (1.0, 1000.0, 0.5),
    ] {
        for k in 0..=60 {
            let i0 = Amps::new(1e-3 * 10f32.powf(k as f32 / 20.0)).unwrap();
            let c = ConstantClamp::new(
                Henries::new(l).unwrap(),
                Ohms::new(r).unwrap(),
                Volts::new(vc).unwrap(),
                i0,
            )
            .unwrap();
            for frac in [0.0f32, 0.01, 0.1, 0.5] {
                let i1 = Amps::new(i0.value() * frac).unwrap();
                let a = c.time_to(i1).unwrap().value();
                let b = fast::constant_clamp_time(&c, i1).unwrap().value();
                worst_time = worst_time.max(((a - b) / a).abs());
            }
        }
    }
    println!("micromath backend against libm (largest difference over the grids)");
    println!(
        "{:<28} {:>18} {:>12}",
        "function", "max difference", "budget"
    );
    println!(
        "{:<28} {:>15.1} µV {:>12}",
        "fast::forward_drop",
        worst_drop * 1e6,
        "10 mV"
    );
    println!(
        "{:<28} {:>16.4} % {:>12}",
        "fast::constant_clamp_time",
        worst_time * 100.0,
        "0.2 %"
    );
}
