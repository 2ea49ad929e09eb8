//! The worst case is the worst: for the demo and the test designs in tests/designs/ (every
//! clamp kind between them, both switch sides, a sized zener, a sized PWM frequency, comparator
//! and current-sense diagnosis), fixed-seed Monte Carlo samples drawn uniformly inside each
//! driver's corner box never pass the vertex search's worst value of any figure any check holds
//! (every figure, the diagnosis windows' both ends included) beyond the stated numerical
//! tolerance, `kickguard::host::checks::MC_TOLERANCE` (1e-4 relative: both sides come from the
//! same f32 engine, so anything larger is a missed corner, not noise).
//!
//! This is a property of the corner engine against sampling, not a check of the physics
//! (that is in the reference tests). CI draws `KICKGUARD_WORST_CASE_SAMPLES` samples per driver
//! (default 10 000); the long run, 10⁵ per driver, is
//! `KICKGUARD_WORST_CASE_SAMPLES=100000 cargo test --release --features host --test worst_case`.
//!
//! The microcontroller inputs have two axes (pin supply, microcontroller temperature): a dense
//! grid over both never beats the reported worst injection either.

use kickguard::host::checks::inputs;
use kickguard::host::corners::{Axis, Rng, Sense};
use kickguard::host::engine::run_driver;
use kickguard::host::montecarlo::{all_metrics, beyond, spreads, Distribution, Request};
use kickguard::host::{analyse_text, read_board, Options};
use kickguard::input::Pin;
use kickguard::units::{Ohms, Temperature, Volts};

const DESIGNS: [&str; 4] = [
    "examples/greenhouse.toml",
    "tests/designs/door_lock.toml",
    "tests/designs/contactor.toml",
    "tests/designs/pump_station.toml",
];

fn samples() -> u32 {
    std::env::var("KICKGUARD_WORST_CASE_SAMPLES")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(10_000)
}

#[test]
fn the_designs_cover_every_clamp_kind_and_both_sides() {
    let mut kinds = std::collections::BTreeSet::new();
    let mut sides = std::collections::BTreeSet::new();
    let mut drivers = 0;
    for path in DESIGNS {
        let board = read_board(&std::fs::read_to_string(path).unwrap(), path).unwrap();
        for d in &board.drivers {
            kinds.insert(d.clamp.kind());
            sides.insert(format!("{:?}", d.side));
            drivers += 1;
        }
    }
    let all = [
        "diode",
        "resistor+diode",
        "zener+diode",
        "switched-freewheel",
        "tvs-across-coil",
        "varistor",
        "tvs-across-switch",
        "switch-clamp",
        "avalanche",
        "h-bridge",
        "rc-snubber",
    ];
    for k in all {
        assert!(kinds.contains(k), "no test design uses {k}");
    }
    assert_eq!(sides.len(), 2);
    // The demo and at least six more drivers.
    assert!(drivers >= 9, "{drivers}");
}

#[test]
fn monte_carlo_never_beats_the_vertex_search() {
    let n = samples();
    let mut compared = 0usize;
    let mut failures = Vec::new();
    for path in DESIGNS {
        let board = read_board(&std::fs::read_to_string(path).unwrap(), path).unwrap();
        for (k, d) in board.drivers.iter().enumerate() {
            let run = run_driver(&board, d).unwrap();
            let metrics = all_metrics(&run);
            let found = spreads(
                &board,
                &run,
                k,
                Request {
                    samples: n,
                    seed: 0x5eed + k as u64,
                    distribution: Distribution::Uniform,
                },
                &metrics,
            )
            .unwrap();
            for (m, s) in metrics.iter().zip(found) {
                let Some(s) = s else { continue };
                compared += 1;
                if s.beyond > 0 {
                    let w = m.worst(&run.d, &run.points, &run.figures).unwrap();
                    failures.push(format!("{path}: {}: {m:?}: vertex worst {} at {}, samples min {} max {} ({} beyond)", d.name, w.value, run.space.describe(&w.at), s.min, s.max, s.beyond));
                }
            }
        }
    }
    assert!(
        failures.is_empty(),
        "{} of {compared} figures beaten by sampling:\n{}",
        failures.len(),
        failures.join("\n")
    );
    // Every driver has its figures compared: a test that compares nothing cannot fail.
    assert!(compared > 150, "only {compared} figures compared");
}

#[test]
fn the_reported_checks_carry_the_same_worst_values() {
    // The report's Monte Carlo spread (the figures its checks hold) agrees: nothing beyond.
    for path in DESIGNS {
        let opts = Options {
            // Normal (±range = 3σ, truncated): the report's other distribution.
            monte_carlo: Some(Request {
                samples: 300,
                seed: 11,
                distribution: Distribution::Normal { sigmas: 3 },
            }),
        };
        let r = analyse_text(&std::fs::read_to_string(path).unwrap(), path, &opts).unwrap();
        let with_spread: Vec<_> = r.checks().filter(|c| c.spread.is_some()).collect();
        assert!(with_spread.len() > 5, "{path}");
        for c in with_spread {
            assert_eq!(
                c.spread.unwrap().beyond,
                0,
                "{path}: {} {}",
                c.subject,
                c.title
            );
        }
    }
}

#[test]
fn input_injection_is_worst_at_a_pin_corner() {
    let path = DESIGNS[0];
    let text = std::fs::read_to_string(path).unwrap();
    let board = read_board(&text, path).unwrap();
    let report = analyse_text(&text, path, &Options::default()).unwrap();
    let runs: Vec<_> = board
        .drivers
        .iter()
        .map(|d| run_driver(&board, d).unwrap())
        .collect();
    let pins = board.inputs.as_ref().unwrap();
    let mut grid_points = 0;
    for inp in &pins.inputs {
        let sig = inputs::signal(&board, &runs, inp).unwrap();
        let r = report
            .constants()
            .find(|c| c.scope == inp.module && c.name == "SERIES_RESISTOR_OHM")
            .unwrap()
            .value as f32;
        let worst = report
            .board
            .checks
            .iter()
            .find(|c| c.subject == inp.name && c.id == "injection_in")
            .unwrap()
            .value
            .unwrap();
        let (v_lo, v_hi) = (pins.supply.1.value(), pins.supply.0.value());
        let (t_lo, t_hi) = (board.ambient.0.celsius(), pins.max_temperature.celsius());
        for a in 0..=20 {
            for b in 0..=20 {
                let vdd = v_lo + (v_hi - v_lo) * a as f32 / 20.0;
                let t = t_lo + (t_hi - t_lo) * b as f32 / 20.0;
                let pin = Pin::new(
                    Volts::new(vdd).unwrap(),
                    pins.clamp,
                    Temperature::from_celsius(t).unwrap(),
                )
                .unwrap();
                let i = pin
                    .injection(sig.transient_max, Ohms::new(r).unwrap())
                    .unwrap()
                    .value();
                assert!(
                    !beyond(Sense::Max, i, worst),
                    "{}: {i} A at {vdd} V, {t} °C beats {worst}",
                    inp.name
                );
                grid_points += 1;
            }
        }
    }
    assert!(grid_points > 800);
}

#[test]
fn normal_samples_stay_in_the_box_with_the_truncated_spread() {
    // The variance of a normal truncated to ±kσ is σ²·(1 − 2k·φ(k)/(2Φ(k) − 1)) (truncated
    // normal distribution, e.g. Johnson, Kotz & Balakrishnan, "Continuous Univariate
    // Distributions", vol. 1 — from memory): for k = 3, φ(3) = 0.0044318, 2Φ(3) − 1 = 0.9973,
    // so the standard deviation is σ·0.98658; for k = 1, 0.53956 (φ(1) = 0.24197,
    // 2Φ(1) − 1 = 0.68269).
    let board = read_board(&std::fs::read_to_string(DESIGNS[0]).unwrap(), DESIGNS[0]).unwrap();
    let run = run_driver(&board, &board.drivers[0]).unwrap();
    let (lo, hi) = run.space.range(Axis::Supply);
    let half = (hi - lo) as f64 / 2.0;
    for (k, factor) in [(3u8, 0.98658f64), (1, 0.53956)] {
        let mut rng = Rng::new(7);
        let n = 40_000;
        let xs: Vec<f64> = (0..n)
            .map(|_| run.space.sample_normal(&mut rng, k).at(Axis::Supply) as f64)
            .collect();
        assert!(xs.iter().all(|x| *x >= lo as f64 && *x <= hi as f64));
        let mean = xs.iter().sum::<f64>() / n as f64;
        let sd = (xs.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / n as f64).sqrt();
        let want = half / k as f64 * factor;
        assert!((sd - want).abs() < 0.02 * want, "k {k}: sd {sd} vs {want}");
        assert!(
            (mean - (lo + hi) as f64 / 2.0).abs() < 0.02 * half,
            "k {k}: mean {mean}"
        );
    }
}
