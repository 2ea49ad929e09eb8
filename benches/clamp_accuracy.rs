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
use kickguard::clamp::{ActiveClamp, Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams, Ideality};
use kickguard::varistor::Varistor;
use kickguard::{Amps, Henries, Ohms, PerKelvin, Temperature, Volts};

const TK: f64 = 298.15;
const VS: f64 = 24.0;

/// The f64 Simpson reference of tests/common with 20 000 intervals: [t, Q, ∫i²dt].
fn reference(l: f64, i0: f64, i1: f64, g: &dyn Fn(f64) -> f64) -> [f64; 3] {
    common::simpson_decay(l, i0, i1, 20_000, g)
}

fn main() {
    let t = Temperature::from_celsius(25.0).unwrap();
    let si = DiodeParams::SILICON;
    let spice = |bv: f32, nbv: f32, rs: f32| {
        Breakdown::new(
            BreakdownLaw::Spice {
                bv: Volts::new(bv).unwrap(),
                ibv: Amps::new(1e-3).unwrap(),
                nbv: Ideality::new(nbv).unwrap(),
                rs: Ohms::new(rs).unwrap(),
            },
            PerKelvin::ZERO,
            t,
        )
        .unwrap()
    };
    let z = spice(18.0, 2.0, 2.0);
    let tvs = spice(40.0, 3.0, 0.5);
    let mov = Varistor::new(
        Volts::new(39.0).unwrap(),
        Amps::new(1e-3).unwrap(),
        30.0,
        PerKelvin::ZERO,
        t,
    )
    .unwrap();
    let active = ActiveClamp {
        zener: Breakdown::ideal(Volts::new(36.0).unwrap()).unwrap(),
        zener_current: Amps::new(1e-3).unwrap(),
        gate_threshold: Volts::new(3.0).unwrap(),
        transconductance_a_per_v2: Some(5.0),
    };
    println!("clamp engine accuracy: worst relative error against an f64 reference");
    println!(
        "grid: τ = 10 µs … 1 s (R = 1 … 1000 Ω), I₀ = 1 mA … 20 A, end current I₀/10 and I₀/1000"
    );
    println!(
        "{:<24} {:>12} {:>12} {:>14} {:>16}",
        "topology", "time", "charge", "coil R energy", "energy balance"
    );
    let names = [
        "freewheel diode",
        "resistor + diode",
        "zener (SPICE) + diode",
        "TVS (SPICE) across coil",
        "varistor across coil",
        "TVS (SPICE) across sw.",
        "active clamp",
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
                        Coil::fixed(Henries::new(l).unwrap(), Ohms::new(r).unwrap()).unwrap();
                    let (l64, r64) = (l as f64, r as f64);
                    let d = |i: f64| v64(&si, i, TK);
                    // SPICE's exact breakdown, BV + NBV·Vt·ln(I/IBV) + RS·I (Nagel 1975).
                    let zv = |i: f64| 18.0 + 2.0 * vt64(TK) * (i / 1e-3).ln() + 2.0 * i;
                    let tv = |i: f64| 40.0 + 3.0 * vt64(TK) * (i / 1e-3).ln() + 0.5 * i;
                    // Varistor I = I₁·(V/V₁)^α (common practice), solved for V.
                    let mv = |i: f64| 39.0 * (i / 1e-3).powf(1.0 / 30.0);
                    // Active clamp V_Z + V_th + √(I/K) (square-law MOSFET, Sedra & Smith).
                    let av = |i: f64| 39.0 + (i / 5.0).sqrt();
                    let law = Diode::Law(si);
                    let (clamp, g): (Clamp, Box<dyn Fn(f64) -> f64>) = match k {
                        0 => (
                            Clamp::FreewheelDiode(law),
                            Box::new(move |i| r64 * i + d(i)),
                        ),
                        1 => (
                            Clamp::ResistorDiode {
                                resistor: Ohms::new(r).unwrap(),
                                diode: law,
                            },
                            Box::new(move |i| 2.0 * r64 * i + d(i)),
                        ),
                        2 => (
                            Clamp::ZenerDiode {
                                zener: z,
                                diode: law,
                            },
                            Box::new(move |i| r64 * i + zv(i) + d(i)),
                        ),
                        3 => (
                            Clamp::TvsAcrossCoil(tvs),
                            Box::new(move |i| r64 * i + tv(i)),
                        ),
                        4 => (Clamp::Varistor(mov), Box::new(move |i| r64 * i + mv(i))),
                        5 => (
                            Clamp::AcrossSwitch(tvs),
                            Box::new(move |i| r64 * i + tv(i) - VS),
                        ),
                        6 => (
                            Clamp::ActiveClamp(active),
                            Box::new(move |i| r64 * i + av(i) - VS),
                        ),
                        _ => (
                            Clamp::HBridgeFastDecay(law),
                            Box::new(move |i| r64 * i + 2.0 * d(i) + VS),
                        ),
                    };
                    let op = Operating::uniform(
                        Volts::new(VS as f32).unwrap(),
                        Amps::new(i0).unwrap(),
                        t,
                    );
                    let off = SwitchOff::new(&coil, &clamp, Side::Low, &op).unwrap();
                    let got = off.decay_to(Amps::new(i1).unwrap()).unwrap();
                    let want = reference(l64, i0 as f64, i1 as f64, &*g);
                    let e = got.energy;
                    let lhs = e.released_by_coil.value() as f64 + e.from_supply.value() as f64;
                    let rhs: f64 = [
                        e.coil_resistance,
                        e.resistor,
                        e.diodes,
                        e.zener,
                        e.varistor,
                        e.switch,
                    ]
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
            "{:<24} {:>12.2e} {:>12.2e} {:>14.2e} {:>16.2e}",
            name, worst[0], worst[1], worst[2], worst[3]
        );
    }
    println!("requirement: times and energies within 5e-4 (0.05 %), energy balance within 1e-3");
}
