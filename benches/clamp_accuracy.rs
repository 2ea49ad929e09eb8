//! Prints the measured accuracy of the clamp engine against an f64 reference.
//!
//! Run: `cargo bench --bench clamp_accuracy`. Reference: the same loop law L·di/dt = −g(i),
//! integrated in f64 by composite Simpson's rule in u = ln i with 20 000 intervals, with the diode
//! law written independently from the SPICE2 equations (Nagel 1975) in tests/common. This is a
//! measurement, not a test: tests/clamp_reference.rs asserts the bounds.

#[path = "../tests/common/mod.rs"]
mod common;

use common::{v64, vt64};
use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::{Clamp, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::DiodeParams;
use kickguard::{Amps, Henries, Ohms, Temperature, Volts};

const TK: f64 = 298.15;
const VS: f64 = 24.0;

/// The f64 Simpson reference of tests/common with 20 000 intervals: [t, Q, ∫i²dt].
fn reference(l: f64, i0: f64, i1: f64, g: &dyn Fn(f64) -> f64) -> [f64; 3] {
    common::simpson_decay(l, i0, i1, 20_000, g)
}

fn main() {
    let t = Temperature::from_celsius(25.0).unwrap();
    let si = DiodeParams::SILICON;
    let z = Breakdown::new(
        BreakdownLaw::Spice {
            bv: Volts::new(18.0).unwrap(),
            ibv: Amps::new(1e-3).unwrap(),
            nbv: 2.0,
            rs: Ohms::new(2.0).unwrap(),
        },
        0.0,
        t,
    )
    .unwrap();
    let tvs = Breakdown::ideal(Volts::new(40.0).unwrap()).unwrap();
    println!("clamp engine accuracy: worst relative error against an f64 reference");
    println!(
        "grid: τ = 10 µs … 1 s (R = 1 … 1000 Ω), I₀ = 1 mA … 20 A, end current I₀/10 and I₀/1000"
    );
    println!(
        "{:<22} {:>12} {:>12} {:>14} {:>16}",
        "topology", "time", "charge", "coil R energy", "energy balance"
    );
    let names = [
        "freewheel diode",
        "resistor + diode",
        "zener + diode",
        "TVS switch to ground",
        "H-bridge fast decay",
    ];
    for (k, name) in names.iter().enumerate() {
        let mut worst = [0.0f64; 4];
        for &(l, r) in &[
            (1e-5f32, 1.0f32),
            (1e-3, 1.0),
            (0.35, 56.0),
            (1.0, 1.0),
            (1000.0, 1000.0),
        ] {
            for &i0 in &[1e-3f32, 0.1, 1.0, 20.0] {
                for &frac in &[0.1f32, 1e-3] {
                    let i1 = i0 * frac;
                    let coil =
                        Coil::new(Henries::new(l).unwrap(), Ohms::new(r).unwrap(), t, 0.0).unwrap();
                    let (l64, r64) = (l as f64, r as f64);
                    let d = |i: f64| v64(&si, i, TK);
                    let zv = |i: f64| 18.0 + 2.0 * vt64(TK) * (i / 1e-3).ln_1p() + 2.0 * i;
                    let (clamp, g): (Clamp, Box<dyn Fn(f64) -> f64>) = match k {
                        0 => (Clamp::FreewheelDiode(si), Box::new(move |i| r64 * i + d(i))),
                        1 => (
                            Clamp::ResistorDiode {
                                resistor: Ohms::new(r).unwrap(),
                                diode: si,
                            },
                            Box::new(move |i| 2.0 * r64 * i + d(i)),
                        ),
                        2 => (
                            Clamp::ZenerDiode {
                                zener: z,
                                diode: si,
                            },
                            Box::new(move |i| r64 * i + zv(i) + d(i)),
                        ),
                        3 => (
                            Clamp::SwitchZener(tvs),
                            Box::new(move |i| r64 * i + 40.0 - VS),
                        ),
                        _ => (
                            Clamp::HBridgeFastDecay(si),
                            Box::new(move |i| r64 * i + 2.0 * d(i) + VS),
                        ),
                    };
                    let off = SwitchOff::new(
                        &coil,
                        &clamp,
                        Volts::new(VS as f32).unwrap(),
                        Amps::new(i0).unwrap(),
                        t,
                        t,
                    )
                    .unwrap();
                    let got = off.decay_to(Amps::new(i1).unwrap()).unwrap();
                    let want = reference(l64, i0 as f64, i1 as f64, &*g);
                    let e = got.energy;
                    let lhs = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
                    let rhs: f64 = [e.coil_resistance, e.resistor, e.diodes, e.zener, e.switch]
                        .iter()
                        .map(|x| x.value() as f64)
                        .sum();
                    let errs = [
                        (got.time.value() as f64 - want[0]).abs() / want[0],
                        (got.charge.value() as f64 - want[1]).abs() / want[1],
                        (e.coil_resistance.value() as f64 - r64 * want[2]).abs() / (r64 * want[2]),
                        (lhs - rhs).abs() / lhs.abs(),
                    ];
                    for (w, e) in worst.iter_mut().zip(errs) {
                        *w = w.max(e);
                    }
                }
            }
        }
        println!(
            "{:<22} {:>12.2e} {:>12.2e} {:>14.2e} {:>16.2e}",
            name, worst[0], worst[1], worst[2], worst[3]
        );
    }
    println!("requirement: times and energies within 5e-3, energy balance within 1e-3");
}
