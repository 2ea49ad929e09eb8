//! What the firmware does with the generated constants: integer waits and an integer-only
//! diagnosis verdict. (On the target this code runs in the coil-switching task; here it prints.)

#[allow(dead_code)] // the firmware uses only some of the generated constants
mod config {
    include!(concat!(env!("OUT_DIR"), "/kickguard_config.rs"));
}

use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::{Condition, Verdict, Windows};

fn main() {
    // After switching a valve off, wait this many ticks before re-energising it.
    println!(
        "valve: wait {} ticks of {} Hz before re-energising",
        config::valve::RELEASE_WAIT_TICKS,
        config::TICK_HZ
    );
    println!(
        "valve: hold compare {} of {}",
        config::valve::HOLD_COMPARE,
        config::valve::PWM_TOP
    );

    // Diagnosis: the 55 V comparator's windows; three switch-offs in a row must agree.
    let windows = Windows::from_rows(&config::valve::DIAG_1_WINDOWS);
    let mut history: VerdictHistory<8> = VerdictHistory::new();
    for measured_ticks in [0u32, 0, 31, 30, 29] {
        let v = windows.classify(measured_ticks);
        history.push(v);
        println!("measured {measured_ticks:>3} ticks above 55 V → {v:?}");
    }
    let open = Verdict::Fault(Condition::FreewheelOpen);
    if history.confirmed(open, 3) {
        println!(
            "freewheeling diode open confirmed three times: disable the valve driver and report"
        );
    }
}
