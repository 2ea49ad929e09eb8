//! The clamp engine against ngspice on 48 switch-off circuits: accuracy, where the remaining
//! difference comes from, and speed.
//!
//! Run: `cargo bench --bench spice_compare` (needs ngspice; prints a note and exits otherwise).
//! For each topology it prints the worst relative difference over its scenarios of
//! - the engine (f32, one-pass profile) against ngspice,
//! - the engine against the same model integrated in f64 by composite Simpson's rule in ln i
//!   with 200 000 intervals (tests/common), on the times, the charge and the coil's energy: the
//!   engine's own numerical error,
//! - that f64 reference against ngspice on the same figures: what the simulator's integration
//!   (its time steps, the trapezoidal `INTEG` of v·i) and its device code (gmin, the saturation
//!   current in the reverse branch) add.
//!
//! It also prints the time of one profile against one ngspice run (its own reported analysis
//! time, and the wall time of the process). A measurement, not a test: tests/spice_reference.rs
//! asserts 0.05 %.

#[path = "../tests/spice_reference.rs"]
#[allow(dead_code)]
mod reference;

use common::spice::{self, Topology, TVS_NBV_RS, ZENER};
use common::{v64, vt64};
use kickguard::diode::DiodeParams;
use reference::common;
use std::time::Instant;

/// g(i) of a scenario in f64, written from the published laws (Nagel 1975).
fn g64(s: &spice::Scenario) -> Box<dyn Fn(f64) -> f64> {
    let tk = s.temp_c + 273.15;
    let si = DiodeParams::SILICON;
    let (r, vs) = (s.r, s.vs);
    let vd = move |i: f64| v64(&si, i, tk);
    match s.topology {
        Topology::Freewheel => Box::new(move |i| r * i + vd(i)),
        Topology::ResistorDiode => Box::new(move |i| 2.0 * r * i + vd(i)),
        Topology::ZenerDiode => {
            let (bv, ibv, n, rs) = ZENER;
            Box::new(move |i| r * i + vd(i) + bv + n * vt64(tk) * (i / ibv).ln() + rs * i)
        }
        Topology::TvsAcrossSwitch => {
            let (n, rs) = TVS_NBV_RS;
            let bv = spice::tvs_bv(vs);
            Box::new(move |i| r * i + bv + n * vt64(tk) * (i / 1e-3).ln() + rs * i - vs)
        }
    }
}

fn main() {
    if !spice::available() {
        println!("ngspice is not installed: nothing to compare (apt-get install ngspice)");
        return;
    }
    let scratch =
        std::env::temp_dir().join(format!("kickguard-spice-bench-{}", std::process::id()));
    std::fs::create_dir_all(&scratch).unwrap();
    let mut rows: Vec<(Topology, [f64; 3])> = Vec::new();
    let (mut ratio_min, mut ratio_max) = (f64::INFINITY, 0.0f64);
    let (mut wall_min, mut wall_max) = (f64::INFINITY, 0.0f64);
    let mut profile_max = 0.0f64;
    for s in spice::scenarios() {
        let (off, p) = reference::engine(&s);
        let t_stop = 1.02 * p.times[2].value() as f64;
        let start = Instant::now();
        let r = spice::run(
            &s,
            t_stop,
            off.clamp_voltage_at_start().value() as f64,
            &scratch,
        );
        let wall = start.elapsed().as_secs_f64();
        // The engine's time for one profile (construction prepared, as in the firmware).
        let reps = 20_000;
        let start = Instant::now();
        for _ in 0..reps {
            std::hint::black_box(reference::engine_profile(std::hint::black_box(&off), s.i0));
        }
        let per = start.elapsed().as_secs_f64() / reps as f64;
        profile_max = profile_max.max(per);
        ratio_min = ratio_min.min(r.analysis_s / per);
        ratio_max = ratio_max.max(r.analysis_s / per);
        wall_min = wall_min.min(wall / per);
        wall_max = wall_max.max(wall / per);
        // f64 reference of the same model: times to 50/10/1 %, the charge and the coil's energy
        // to 1 %, by Simpson in ln i.
        let g = g64(&s);
        let at = |frac: f64| common::simpson_decay(s.l, s.i0, frac * s.i0, 200_000, &*g);
        let to1 = at(0.01);
        let model = [at(0.5)[0], at(0.1)[0], to1[0], to1[1], s.r * to1[2]];
        let e = p.decay.energy;
        let engine = [
            p.times[0].value() as f64,
            p.times[1].value() as f64,
            p.times[2].value() as f64,
            p.decay.charge.value() as f64,
            e.coil_resistance.value() as f64,
        ];
        let simulator = [r.t50, r.t10, r.t01, r.charge, r.e_coil];
        let mut worst = [0.0f64; 3];
        for k in 0..5 {
            let rel = |a: f64, b: f64| (a - b).abs() / b.abs();
            worst[0] = worst[0].max(rel(engine[k], simulator[k]));
            worst[1] = worst[1].max(rel(engine[k], model[k]));
            worst[2] = worst[2].max(rel(model[k], simulator[k]));
        }
        for (what, got, want) in reference::figures(&p, &r) {
            if what.ends_with("energy") || what == "charge" {
                let scale = 1e-4 * 0.5 * s.l * s.i0 * s.i0;
                worst[0] = worst[0].max((got - want).abs() / want.abs().max(scale).max(1e-30));
            }
        }
        match rows.iter_mut().find(|(t, _)| *t == s.topology) {
            Some((_, w)) => (0..3).for_each(|k| w[k] = w[k].max(worst[k])),
            None => rows.push((s.topology, worst)),
        }
    }
    let _ = std::fs::remove_dir_all(&scratch);
    println!("clamp engine against ngspice, 48 scenarios (3 coils × 4 clamps × −40/25/85/125 °C)");
    println!(
        "worst relative difference per topology: engine–ngspice over every figure (three times,"
    );
    println!(
        "charge, each device's energy); the f64 reference over the times, charge and coil energy"
    );
    println!(
        "{:<18} {:>16} {:>16} {:>16}",
        "topology", "engine–ngspice", "engine–f64 ref", "f64 ref–ngspice"
    );
    for (t, w) in &rows {
        println!(
            "{:<18} {:>16.2e} {:>16.2e} {:>16.2e}",
            format!("{t:?}"),
            w[0],
            w[1],
            w[2]
        );
    }
    println!(
        "speed: one profile ≤ {:.2} µs; ngspice analysis time / profile = {:.1e} … {:.1e}; \
         ngspice wall time (with process start) / profile = {:.1e} … {:.1e}",
        profile_max * 1e6,
        ratio_min,
        ratio_max,
        wall_min,
        wall_max
    );
}
