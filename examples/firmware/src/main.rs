//! What the firmware does with the generated constants: integer waits, the hold's timer counts
//! and an integer-only diagnosis verdict that acts after the confirmations the configuration
//! step has checked against what the switch survives. (On the target this code runs in the
//! coil-switching task; here it prints.)

mod config {
    include!(concat!(env!("OUT_DIR"), "/kickguard_config.rs"));
}

use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::learn::{LearnedWindow, Learner, Reading};
use kickguard::diagnosis::{Condition, Verdict, Windows};

fn main() {
    // After switching a valve off: the valve is closed after RELEASE_WAIT_TICKS; before
    // re-energising (or reversing) it the firmware waits REENERGISE_WAIT_TICKS, the longer of
    // that and the decay of the current (DECAY_WAIT_TICKS).
    println!(
        "valve: closed {} ticks of {} Hz after switch-off; current decayed after {}; re-energise after {}",
        config::valve::RELEASE_WAIT_TICKS,
        config::TICK_HZ,
        config::valve::DECAY_WAIT_TICKS,
        config::valve::REENERGISE_WAIT_TICKS
    );
    println!(
        "valve: full drive for {} ticks, then hold with {} of {} PWM counts on",
        config::valve::PULL_IN_TICKS,
        config::valve::HOLD_ON_COUNTS,
        config::valve::PWM_PERIOD_COUNTS
    );

    // Diagnosis: the 55 V comparator's windows. A healthy switch-off never trips it; an open
    // clamp does. Act after the confirmations the configuration step accepted: it has checked
    // that the switch survives that many open-clamp switch-offs (OPEN_CLAMP_SURVIVABLE).
    let windows = Windows::from_rows(&config::valve::DIAG_1_WINDOWS);
    let needed = config::valve::FAULT_CONFIRMATIONS as usize;
    let mut history: VerdictHistory<8> = VerdictHistory::new();
    let open = Verdict::Fault(Condition::ClampOpen);
    for measured_ticks in [0u32, 0, 31, 30, 29] {
        let v = windows.classify(measured_ticks);
        history.push(v);
        println!("measured {measured_ticks:>3} ticks above 55 V → {v:?}");
        if history.confirmed(open, needed) {
            println!(
                "clamp path open confirmed {needed} times in a row (the switch survives {}): disable the valve driver and report",
                if config::valve::OPEN_CLAMP_SURVIVABLE == u32::MAX { "it repetitively".to_string() } else { format!("{}", config::valve::OPEN_CLAMP_SURVIVABLE) }
            );
            break;
        }
    }

    learn_persist_restore();
    did_the_valve_open();
}

/// The coil-current ADC at switch-on, fed to the detector the configuration step sized: a
/// valve whose plunger moved, and one stuck shut (the plunger held open by dirt: a plain rise).
/// On the target the samples come from the ADC's DMA half-buffers at the configured rate; here
/// the library's armature model stands in for the hardware (nominal plunger, 24 V, 56 Ω).
fn did_the_valve_open() {
    use kickguard::armature::detect::{DipConfig, DipDetector, Motion, Polarity};
    use kickguard::armature::motion::{pull_in, Run};
    use kickguard::armature::{Armature, GapInductance};
    use kickguard::{Henries, Ohms, Seconds, Volts};
    let cfg = DipConfig {
        polarity: Polarity::Rising,
        rise: config::valve::ARMATURE_RISE_COUNTS as u16,
        hysteresis: config::valve::ARMATURE_HYSTERESIS_COUNTS as u16,
        min_dip: config::valve::ARMATURE_MIN_DIP_COUNTS as u16,
        window: config::valve::ARMATURE_WINDOW_SAMPLES,
        full_scale: config::valve::ARMATURE_FULL_SCALE_COUNTS as u16,
    };
    // The demo's plunger (examples/greenhouse.toml), nominal; stuck: no stroke to travel.
    let plunger = |stroke_m: f32| Armature {
        mass_kg: 0.005,
        stroke_m,
        preload_n: 0.3,
        spring_n_per_m: 300.0,
        load_n: 0.2,
        damping_n_s_per_m: 1.0,
        inductance: GapInductance {
            seat: Henries::new(if stroke_m > 0.0 { 0.35 } else { 0.22 }).unwrap(),
            open: Henries::new(0.22).unwrap(),
            g0_m: 0.4e-3,
            shape: None,
        },
    };
    let run = Run {
        duration: Seconds::new(0.02).unwrap(),
        sample_period: Seconds::new(1e-4).unwrap(), // the 10 kHz ADC
        tolerance: 1e-5,
    };
    for (what, stroke) in [("a valve that opens", 0.8e-3), ("a valve stuck shut", 0.0)] {
        let mut amps = [0f32; 200];
        pull_in(
            &plunger(stroke),
            Ohms::new(56.0).unwrap(),
            Volts::new(24.0).unwrap(),
            &run,
            &mut amps,
        )
        .expect("the model runs");
        // 5000 counts per ampere, as the design file says.
        let counts: Vec<u16> = amps.iter().map(|a| (a * 5000.0).round() as u16).collect();
        let mut d = DipDetector::new(cfg);
        let verdict = d.push_slice(&counts).unwrap_or_else(|| d.finish());
        println!("{what}: {verdict:?}");
        match verdict {
            Motion::Moved { at, dip } => println!(
                "  the plunger seated at sample {at} ({} ms), dip {dip} counts: switch to the hold current now",
                at as f32 / 10.0
            ),
            Motion::NotMoved => println!(
                "  the plunger did not move: the valve did not open — stop the pump, report the zone"
            ),
            Motion::Unclear(why) => println!("  no verdict ({why:?}): retry once, then report"),
        }
    }
}

/// This unit's own healthy window, learned from its first switch-offs on the 30 V comparator,
/// persisted (in flash on the target), restored after a reset, then a departure: a reading the
/// design still calls healthy but this unit has never shown (an early warning).
fn learn_persist_restore() {
    let design = Windows::from_rows(&config::valve::DIAG_0_WINDOWS);
    let margin = config::valve::LEARN_MARGIN_TICKS;
    let mut learner: Learner<{ config::valve::LEARN_READINGS as usize }> =
        Learner::new(design, margin).expect("the generated windows have a healthy row");
    let mut stored = [0u8; config::valve::LEARNED_WINDOW_BYTES as usize];
    // A unit that reads 50 … 53 ticks, switch-off after switch-off.
    for k in 0..config::valve::LEARN_READINGS {
        if let Reading::Learned(w) = learner.observe(50 + k % 4) {
            println!("learned this valve's window: {} … {} ticks", w.lo, w.hi);
            stored = w.to_bytes();
        }
    }
    // After a reset: the stored window, checked against the design before it is trusted.
    let restored = LearnedWindow::from_bytes(&stored, &design).expect("a stored window");
    let mut again: Learner<{ config::valve::LEARN_READINGS as usize }> =
        Learner::resume(design, margin, restored).expect("restored");
    for ticks in [51u32, 52, 70] {
        let r = again.observe(ticks);
        println!("reading {ticks} ticks → {r:?}");
        if r == Reading::Departure {
            println!(
                "departure: healthy by the design, new for this valve: log it and watch the clamp"
            );
        }
    }
}
