//! Did the armature move? The configuration step's detectability claim and the run-time
//! detector, tested the way they are used: six invented designs, their tolerances (mechanics
//! ±10 %, inductances ±5 %, supply ±10 %, the coil from −7 % cold to +7 % and 15 % hot), an ADC
//! at 10 kHz and at 2 kHz (12 bits, 80 % of full scale at the largest current, ±4 counts of
//! noise), waveforms from the independent reference (Dormand–Prince, f64; tests/common) at
//! random points of the box and random sampling phase, quantised, with Gaussian noise (σ a
//! third of the bound, clipped to it). Moving and stuck (the armature held open: the plain rise
//! with L_open).
//!
//! Counted per design and rate: false "moved" on a stuck armature (target 0 everywhere),
//! missed motion where the step calls it detectable (target 0), and random interior points
//! whose dip, seating or motion start beat the vertex search (Monte Carlo against the corners:
//! target 0). The table prints with
//! `cargo test --release --test armature_detect -- --nocapture`.

mod common;

use common::armature::{pull_in_waveform, specs, Spec};
use common::detect_box::{
    adc, counts, random_point, resistance, supply, tolerances, verdict, NOISE,
};
use common::Rng;
use kickguard::armature::detect::{DipConfig, Motion, Polarity};
use kickguard::armature::motion::pull_in;
use kickguard::armature::sizing::{
    confirm_amps, detector_for, pull_in_window, run_for, Adc, DriveRange,
};
use kickguard::{Hertz, Ohms, Seconds, Volts};

const POINTS: usize = 24;

fn drive(s: &Spec) -> DriveRange {
    let (v, r) = (supply(s), resistance(s));
    DriveRange {
        supply_min: Volts::new(v.0 as f32).unwrap(),
        supply_max: Volts::new(v.1 as f32).unwrap(),
        resistance_min: Ohms::new(r.0 as f32).unwrap(),
        resistance_max: Ohms::new(r.1 as f32).unwrap(),
    }
}

#[derive(Default, Debug)]
struct Tally {
    moving: u32,
    stuck: u32,
    false_moved: u32,
    misses: u32,
    beaten: u32,
}

/// The run's length: long enough for the slowest corner (low supply, hot coil) to seat.
fn duration(s: &Spec) -> f64 {
    60.0 * s.ls / resistance(s).0
}

#[test]
fn detector_never_calls_a_stuck_armature_moved_and_never_misses_where_detectable() {
    let mut all = Tally::default();
    println!(
        "{:<22} {:>6} {:>12} {:>11} {:>8} {:>7} {:>6} {:>6} {:>6}",
        "design", "rate", "verdict", "dip min", "window", "moving", "false", "miss", "beaten"
    );
    for (k, s) in specs().iter().enumerate() {
        for rate in [10_000.0, 2_000.0] {
            let a = adc(s, rate);
            let run = run_for(&a, Seconds::new(duration(s) as f32).unwrap()).unwrap();
            let w = pull_in_window(
                &s.armature(),
                &tolerances(),
                &drive(s),
                &run,
                confirm_amps(&a).unwrap(),
            )
            .unwrap();
            let det = detector_for(&w, &a).unwrap();
            if let Some(c) = w.not_seated {
                println!(
                    "  {}: corner {c:011b} (bit 0 mass … 8 g0, 9 supply, 10 R) does not seat",
                    s.name
                );
            }
            // Without a claim, the detector still runs with the same noise-derived hysteresis
            // (false "moved" is counted everywhere).
            let hyst = 2 * (NOISE + 1) + 1;
            let cfg = det.unwrap_or(DipConfig {
                polarity: Polarity::Rising,
                rise: hyst,
                hysteresis: hyst,
                min_dip: hyst,
                window: (duration(s) * rate) as u32,
                full_scale: 4096,
            });
            let t_end = f64::from(cfg.window) / rate;
            let mut rng = Rng(0xA3A7 + 31 * k as u64 + rate as u64);
            let mut t = Tally::default();
            for _ in 0..POINTS {
                let p = random_point(s, &mut rng);
                let phase = rng.unit();
                let moving = pull_in_waveform(&p, t_end, 1.0 / rate, phase, false);
                let stuck = pull_in_waveform(&p, t_end, 1.0 / rate, phase, true);
                let (vm, vs) = (
                    verdict(cfg, &counts(&moving, &a, &mut rng)),
                    verdict(cfg, &counts(&stuck, &a, &mut rng)),
                );
                t.moving += 1;
                t.stuck += 1;
                if matches!(vs, Motion::Moved { .. }) {
                    t.false_moved += 1;
                }
                if det.is_ok() && !matches!(vm, Motion::Moved { .. }) {
                    t.misses += 1;
                    println!("  miss: {vm:?} at {p:?}");
                }
                // Monte Carlo against the vertices, by the library's own model at the point.
                let lib = pull_in(
                    &p.armature(),
                    Ohms::new(p.r as f32).unwrap(),
                    Volts::new(p.v as f32).unwrap(),
                    &run,
                    &mut [],
                )
                .unwrap();
                // (Only where every corner seats: the windows span the seated corners.)
                if w.not_seated.is_some() {
                    continue;
                }
                if let (Some(ts), Some(ms)) = (lib.seated, lib.motion_start) {
                    let (ts, ms) = (ts.value(), ms.value());
                    let out =
                        |x: f32, lo: f32, hi: f32| x < lo * (1.0 - 1e-4) || x > hi * (1.0 + 1e-4);
                    if out(ts, w.seated.lo, w.seated.hi)
                        || out(ms, w.motion_start.lo, w.motion_start.hi)
                        || out(lib.dip(), w.dip.lo, w.dip.hi)
                    {
                        t.beaten += 1;
                        println!("  beaten: {lib:?} by {p:?} (window {w:?})");
                    }
                } else {
                    t.beaten += 1;
                    println!("  a point that does not seat where every corner does: {p:?}");
                }
            }
            println!(
                "{:<22} {:>6} {:>12} {:>8.1} mA {:>8} {:>7} {:>6} {:>6} {:>6}",
                s.name,
                rate,
                match det {
                    Ok(_) => "detectable".to_string(),
                    Err(e) => format!("{e:?}"),
                },
                w.sampled_dip_min * 1e3,
                cfg.window,
                t.moving,
                t.false_moved,
                t.misses,
                t.beaten
            );
            all.moving += t.moving;
            all.stuck += t.stuck;
            all.false_moved += t.false_moved;
            all.misses += t.misses;
            all.beaten += t.beaten;
        }
    }
    println!("all: {all:?}");
    assert_eq!(all.false_moved, 0, "{all:?}");
    assert_eq!(all.misses, 0, "{all:?}");
    assert_eq!(all.beaten, 0, "{all:?}");
    assert!(all.moving >= 200);
}

/// Each verdict of the detector on hand-made sequences (counts), and the release mirror.
#[test]
fn detector_verdicts_by_hand() {
    let cfg = DipConfig {
        polarity: Polarity::Rising,
        rise: 11,
        hysteresis: 11,
        min_dip: 20,
        window: 12,
        full_scale: 4096,
    };
    // Rise to 1000, fall to 900 (peak confirmed 11 below), bottom 880 at sample 5, climb 12.
    let moved = [0, 400, 800, 1000, 900, 880, 892];
    assert_eq!(verdict(cfg, &moved), Motion::Moved { at: 5, dip: 120 });
    // A plain rise through the window.
    let plain: Vec<u16> = (0..12).map(|k| 100 * k).collect();
    assert_eq!(verdict(cfg, &plain), Motion::NotMoved);
    // A rise with ±5 counts of noise (2n + 1 = 11 = hysteresis): never a confirmed peak.
    let noisy: Vec<u16> = (0..12)
        .map(|k| 1000 + 3 * k + if k % 2 == 0 { 5 } else { 0 })
        .collect();
    assert_eq!(verdict(cfg, &noisy), Motion::NotMoved);
    // No drive: the signal never moves `rise` counts.
    assert_eq!(
        verdict(cfg, &[7; 12]),
        Motion::Unclear(kickguard::armature::detect::Unclear::NoRise)
    );
    // Saturation, too few samples, wiggles below min_dip, a contradictory configuration.
    use kickguard::armature::detect::Unclear;
    assert_eq!(
        verdict(cfg, &[0, 2000, 4096]),
        Motion::Unclear(Unclear::Saturated)
    );
    assert_eq!(
        verdict(cfg, &[0, 100, 200]),
        Motion::Unclear(Unclear::TooFewSamples)
    );
    let wiggle = [0, 500, 485, 497, 486, 498, 487, 499, 488, 500];
    assert_eq!(verdict(cfg, &wiggle), Motion::Unclear(Unclear::Noisy));
    let bad = DipConfig { min_dip: 5, ..cfg };
    assert_eq!(verdict(bad, &moved), Motion::Unclear(Unclear::BadConfig));
    // Release: a fall with a bump (valley 300, top 420) is motion; a plain fall is not.
    let rel = DipConfig {
        polarity: Polarity::Falling,
        ..cfg
    };
    assert_eq!(
        verdict(rel, &[2000, 1500, 1000, 600, 300, 420, 405, 380]),
        Motion::Moved { at: 5, dip: 120 }
    );
    let fall: Vec<u16> = (0..12).map(|k| 2000 - 150 * k).collect();
    assert_eq!(verdict(rel, &fall), Motion::NotMoved);
    // The verdicts for the history: a plain rise is a stuck-open armature, a plain fall a
    // stuck-closed one; three in a row confirm it, a motion in between restarts the count.
    use kickguard::diagnosis::history::VerdictHistory;
    use kickguard::diagnosis::{Condition, Verdict};
    let open = Verdict::Fault(Condition::ArmatureStuckOpen);
    let closed = Verdict::Fault(Condition::ArmatureStuckClosed);
    assert_eq!(
        verdict(cfg, &plain).as_verdict(Polarity::Rising),
        Some(open)
    );
    assert_eq!(
        verdict(rel, &fall).as_verdict(Polarity::Falling),
        Some(closed)
    );
    assert_eq!(
        verdict(cfg, &moved).as_verdict(Polarity::Rising),
        Some(Verdict::Healthy)
    );
    assert_eq!(verdict(cfg, &[7; 12]).as_verdict(Polarity::Rising), None);
    let mut h: VerdictHistory<8> = VerdictHistory::new();
    for v in [open, open, Verdict::Healthy, open, open] {
        h.push(v);
    }
    assert!(!h.confirmed(open, 3));
    h.push(open);
    assert!(h.confirmed(open, 3));
    assert_eq!(
        Condition::from_code(7),
        Some(Condition::ArmatureStuckClosed)
    );
}

/// The least rate the configuration step reports: the turning points kept by the design-rate
/// search give, at any slower rate, the same smallest sampled dip as a whole new search
/// (checked exactly at one rate); bisecting on them finds the least rate judged detectable,
/// and there the detector still sees every motion of the independent reference, with noise,
/// at random points and phases, and never calls a stuck armature moved.
#[test]
fn the_least_rate_still_sees_every_motion() {
    use kickguard::armature::sizing::{pull_in_window_keeping, sampled_dip_min_at, CornerTurns};
    for s in specs().iter().take(2) {
        let a = adc(s, 10_000.0);
        let dur = Seconds::new(duration(s) as f32).unwrap();
        let confirm = confirm_amps(&a).unwrap();
        let mut turns = vec![CornerTurns::default(); 2048];
        let (w, kept) = pull_in_window_keeping(
            &s.armature(),
            &tolerances(),
            &drive(s),
            &run_for(&a, dur).unwrap(),
            confirm,
            &mut turns,
        )
        .unwrap();
        turns.truncate(kept);
        assert!(detector_for(&w, &a).unwrap().is_ok(), "{}", s.name);
        let at = |rate: f32| {
            let ar = Adc {
                rate: Hertz::new(rate).unwrap(),
                ..a
            };
            let run = run_for(&ar, dur).unwrap();
            let sampled =
                sampled_dip_min_at(&s.armature(), &tolerances(), &drive(s), &run, &turns).unwrap();
            (ar, run, sampled)
        };
        // Exact against a whole new search at 4 kHz.
        let (_, run4, s4) = at(4_000.0);
        let whole =
            pull_in_window(&s.armature(), &tolerances(), &drive(s), &run4, confirm).unwrap();
        assert_eq!(s4, whole.sampled_dip_min, "{}", s.name);
        // Bisection (as the host's) between 1/(shortest dip) and 10 kHz.
        let sees = |rate: f32| {
            let (ar, _, sampled) = at(rate);
            let mut wr = w;
            wr.sampled_dip_min = sampled;
            wr.confirmed_by = w.confirmed_by.map(|b| b - 1e-4 + 1.0 / rate);
            detector_for(&wr, &ar).unwrap()
        };
        let (mut lo, mut hi) = (1.0 / w.dip_duration_min, 10_000.0f32);
        for _ in 0..6 {
            let mid = (lo * hi).sqrt();
            if sees(mid).is_ok() {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        let cfg = sees(hi).unwrap();
        let ar = Adc {
            rate: Hertz::new(hi).unwrap(),
            ..a
        };
        let rate = f64::from(hi);
        let t_end = f64::from(cfg.window) / rate;
        let mut rng = Rng(0x1EA5 + s.m.to_bits());
        let (mut misses, mut false_moved) = (0, 0);
        for _ in 0..POINTS {
            let p = random_point(s, &mut rng);
            let phase = rng.unit();
            let moving = pull_in_waveform(&p, t_end, 1.0 / rate, phase, false);
            let stuck = pull_in_waveform(&p, t_end, 1.0 / rate, phase, true);
            if !matches!(
                verdict(cfg, &counts(&moving, &ar, &mut rng)),
                Motion::Moved { .. }
            ) {
                misses += 1;
            }
            if matches!(
                verdict(cfg, &counts(&stuck, &ar, &mut rng)),
                Motion::Moved { .. }
            ) {
                false_moved += 1;
            }
        }
        println!(
            "{}: least rate {hi:.0} Hz ({lo:.0} Hz not), {misses} misses, {false_moved} false",
            s.name
        );
        assert_eq!((misses, false_moved), (0, 0), "{} at {hi} Hz", s.name);
    }
}
