//! The greenhouse valve's firmware, interrupt-driven (RTIC 2), on the nRF51 (Cortex-M0) of the
//! micro:bit board as QEMU emulates it.
//!
//! - **TIMER1** (priority 2) runs the valve's schedule: switch on, full drive then hold, switch
//!   off, wait `DECAY_WAIT_TICKS` for the flyback to end and judge it, wait out
//!   `REENERGISE_WAIT_TICKS` from the switch-off, switch on again.
//! - **TIMER2** (priority 3, the highest) stands in for the drain comparators' falling edges
//!   (QEMU has no comparator): each compare event is one comparator ending its high time. Its
//!   interrupt only timestamps the edge on the free-running capture clock, **TIMER0** (1 MHz).
//! - **`judge`** (software task, priority 1) turns the high times into ticks of the design's
//!   10 kHz timer and runs the diagnosis: the 55 V comparator's windows and the confirmations
//!   (`FAULT_CONFIRMATIONS`), the 30 V comparator's learner (this valve's own window, stored in
//!   flash once learned and restored after a reset).
//! - **`pull_in`** (software task, priority 1) runs the armature detector on the coil-current
//!   ADC buffer of each switch-on (standing in: the model's waveform; on the board the ADC's
//!   DMA half-buffer): the plunger moved, or the valve did not open and the pump stops.
//!
//! Everything the firmware decides goes out by semihosting; `.ci/cross` checks the lines.
#![no_std]
#![no_main]

mod config {
    include!(concat!(env!("OUT_DIR"), "/kickguard_config.rs"));
}
mod stimulus;
mod store;

use cortex_m_semihosting::{debug, hprintln};

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    hprintln!("PANIC");
    debug::exit(debug::EXIT_FAILURE);
    loop {}
}

/// The drain comparators' high times after one switch-off, µs (None: never ended yet).
#[derive(Clone, Copy)]
pub struct Flyback {
    /// The capture clock at the switch-off.
    start: u32,
    /// The 30 V and the 55 V comparator.
    high_us: [Option<u32>; 2],
}

/// Where the valve's schedule is.
#[derive(Clone, Copy, PartialEq)]
pub enum Phase {
    /// Energised.
    On,
    /// Switched off; the flyback is being timed.
    Decaying,
    /// Judged; waiting out the re-energise wait.
    Resting,
}

/// The valve's on-time, µs: full drive (PULL_IN_TICKS) then hold.
const ON_US: u32 = 50_000;
/// Switch-ons after which the demo gives up (it ends at the confirmed fault long before).
const MAX_CYCLES: u32 = 40;

/// One design tick in the 1 MHz timers' counts.
const US_PER_TICK: u32 = stimulus::US_PER_TICK;
/// The rest after the judgement, µs: the re-energise wait from the switch-off, plus 1 ms.
const REST_US: u32 =
    (config::valve::REENERGISE_WAIT_TICKS - config::valve::DECAY_WAIT_TICKS) * US_PER_TICK + 1_000;

// TIMER1 and TIMER2 are 16-bit on the nRF51: every interval must fit (a build-time check; a
// design whose waits outgrow it needs the prescaler raised).
const _: () = assert!(ON_US < 0x1_0000 && REST_US < 0x1_0000);
const _: () = assert!(config::valve::DECAY_WAIT_TICKS * US_PER_TICK < 0x1_0000);
const _: () = assert!(config::valve::REENERGISE_WAIT_TICKS >= config::valve::DECAY_WAIT_TICKS);

#[rtic::app(device = nrf51_pac, dispatchers = [SWI0, SWI1])]
mod app {
    use super::*;
    use kickguard::armature::detect::{DipConfig, DipDetector, Motion, Polarity};
    use kickguard::diagnosis::history::VerdictHistory;
    use kickguard::diagnosis::learn::{LearnedWindow, Learner, Reading};
    use kickguard::diagnosis::{Condition, Verdict, Windows};
    use nrf51_pac::{GPIO, NVMC, TIMER0, TIMER1, TIMER2};
    // Whole-register writes (`w.bits(..)`) are `unsafe` in the generated PAC; every value
    // written here is a documented value of that register (a task trigger, a compare value,
    // a pin mask).

    /// The learner of the 30 V comparator: LEARN_READINGS healthy readings.
    type ValveLearner = Learner<{ config::valve::LEARN_READINGS as usize }>;

    #[shared]
    struct Shared {
        /// The capture clock (free-running, 1 MHz, 32 bits).
        clock: TIMER0,
        /// The comparators' stand-in (its channels armed by the schedule, its events cleared by
        /// the edge handler).
        comparators: TIMER2,
        /// The flyback being timed.
        flyback: Flyback,
        /// The pins: valve drive P0.0, pump enable P0.1.
        gpio: GPIO,
        /// The valve driver may switch (false after a confirmed fault).
        valve_enabled: bool,
    }

    #[local]
    struct Local {
        schedule: TIMER1,
        nvmc: NVMC,
        phase: Phase,
        cycle: u32,
        restored: bool,
        learner: ValveLearner,
        history: VerdictHistory<8>,
        windows_55v: Windows,
    }

    #[init]
    fn init(cx: init::Context) -> (Shared, Local) {
        let p = cx.device;
        // Valve drive on P0.0, pump enable on P0.1.
        p.GPIO.dirset.write(|w| unsafe { w.bits(0b11) });
        p.GPIO.outset.write(|w| unsafe { w.bits(0b10) });
        for t in [&*p.TIMER0, &*p.TIMER1, &*p.TIMER2] {
            t.mode.write(|w| w.mode().timer());
            t.prescaler.write(|w| unsafe { w.prescaler().bits(4) }); // 16 MHz / 2⁴ = 1 MHz
        }
        // TIMER0 is the only 32-bit timer of the nRF51: the capture clock.
        p.TIMER0.bitmode.write(|w| w.bitmode()._32bit());
        p.TIMER0.tasks_start.write(|w| unsafe { w.bits(1) });
        // TIMER1: one-shot schedule; TIMER2: the comparators' stand-in, one event per channel.
        p.TIMER1.bitmode.write(|w| w.bitmode()._16bit());
        p.TIMER1
            .shorts
            .write(|w| w.compare0_clear().enabled().compare0_stop().enabled());
        p.TIMER1.intenset.write(|w| w.compare0().set());
        p.TIMER2.bitmode.write(|w| w.bitmode()._16bit());
        p.TIMER2
            .intenset
            .write(|w| w.compare0().set().compare1().set());

        let design_30v = Windows::from_rows(&config::valve::DIAG_0_WINDOWS);
        let margin = config::valve::LEARN_MARGIN_TICKS;
        let (learner, restored) = match LearnedWindow::from_bytes(&store::load(), &design_30v) {
            Ok(w) => {
                hprintln!(
                    "boot: restored this valve's window from flash: {} … {} ticks",
                    w.lo,
                    w.hi
                );
                (ValveLearner::resume(design_30v, margin, w), true)
            }
            Err(_) => {
                hprintln!("boot: nothing learned yet (the flash page holds no valid window)");
                (ValveLearner::new(design_30v, margin), false)
            }
        };
        let Ok(learner) = learner else {
            hprintln!("the generated windows have no healthy row");
            debug::exit(debug::EXIT_FAILURE);
            loop {}
        };
        start_one_shot(&p.TIMER1, 1_000);
        (
            Shared {
                clock: p.TIMER0,
                comparators: p.TIMER2,
                gpio: p.GPIO,
                flyback: Flyback {
                    start: 0,
                    high_us: [None; 2],
                },
                valve_enabled: true,
            },
            Local {
                schedule: p.TIMER1,
                nvmc: p.NVMC,
                phase: Phase::Resting,
                cycle: 0,
                restored,
                learner,
                history: VerdictHistory::new(),
                windows_55v: Windows::from_rows(&config::valve::DIAG_1_WINDOWS),
            },
        )
    }

    /// The valve's schedule.
    #[task(binds = TIMER1, priority = 2,
           local = [schedule, phase, cycle, restored],
           shared = [clock, comparators, flyback, gpio, valve_enabled])]
    fn schedule(mut cx: schedule::Context) {
        let l = cx.local;
        l.schedule.events_compare[0].write(|w| unsafe { w.bits(0) });
        match *l.phase {
            Phase::Resting => {
                if !cx.shared.valve_enabled.lock(|e| *e) {
                    return; // disabled: the schedule stops
                }
                *l.cycle += 1;
                if *l.cycle > MAX_CYCLES {
                    hprintln!("no verdict after {} switch-ons", MAX_CYCLES);
                    debug::exit(debug::EXIT_FAILURE);
                }
                cx.shared
                    .gpio
                    .lock(|g| g.outset.write(|w| unsafe { w.bits(0b01) }));
                pull_in::spawn(stimulus::pull_in_samples(*l.restored, *l.cycle)).ok();
                *l.phase = Phase::On;
                start_one_shot(l.schedule, ON_US);
            }
            Phase::On => {
                cx.shared
                    .gpio
                    .lock(|g| g.outclr.write(|w| unsafe { w.bits(0b01) }));
                let start = cx.shared.clock.lock(|c| now(c));
                cx.shared.flyback.lock(|f| {
                    *f = Flyback {
                        start,
                        high_us: [None; 2],
                    }
                });
                // The stand-in comparators: each channel fires when its comparator would fall.
                let (t30, t55) = stimulus::flyback_us(*l.restored, *l.cycle);
                cx.shared.comparators.lock(|c| {
                    c.tasks_stop.write(|w| unsafe { w.bits(1) });
                    c.tasks_clear.write(|w| unsafe { w.bits(1) });
                    for (k, t) in [(0usize, t30), (1, t55)] {
                        // 0: that comparator never trips; park its event beyond the flyback.
                        let at = if t == 0 { 0xFFFF } else { t };
                        c.cc[k].write(|w| unsafe { w.bits(at) });
                    }
                    c.tasks_start.write(|w| unsafe { w.bits(1) });
                });
                *l.phase = Phase::Decaying;
                start_one_shot(l.schedule, config::valve::DECAY_WAIT_TICKS * US_PER_TICK);
            }
            Phase::Decaying => {
                cx.shared
                    .comparators
                    .lock(|c| c.tasks_stop.write(|w| unsafe { w.bits(1) }));
                let f = cx.shared.flyback.lock(|f| *f);
                judge::spawn(f.high_us.map(|h| h.unwrap_or(0) / US_PER_TICK)).ok();
                *l.phase = Phase::Resting;
                start_one_shot(l.schedule, REST_US);
            }
        }
    }

    /// A comparator's falling edge (stand-in): timestamp it, nothing more.
    #[task(binds = TIMER2, priority = 3, shared = [clock, comparators, flyback])]
    fn comparator_edge(cx: comparator_edge::Context) {
        (cx.shared.clock, cx.shared.comparators, cx.shared.flyback).lock(|clock, timer, f| {
            let t = now(clock);
            for k in 0..2 {
                if timer.events_compare[k].read().bits() != 0 {
                    timer.events_compare[k].write(|w| unsafe { w.bits(0) });
                    f.high_us[k].get_or_insert(t.wrapping_sub(f.start));
                }
            }
        });
    }

    /// The diagnosis of one switch-off, in the design's ticks.
    #[task(priority = 1, local = [learner, history, windows_55v, nvmc], shared = [valve_enabled])]
    async fn judge(mut cx: judge::Context, ticks: [u32; 2]) {
        let l = cx.local;
        let [t30, t55] = ticks;
        let reading = l.learner.observe(t30);
        let v55 = l.windows_55v.classify(t55);
        // The 55 V comparator separates the open clamp; the 30 V one judges the rest.
        let verdict = match (v55, reading) {
            (Verdict::Healthy, Reading::Refused(v) | Reading::Fault(v)) => v,
            (v, _) => v,
        };
        l.history.push(verdict);
        hprintln!(
            "switch-off: 30 V comparator {} ticks, 55 V {} ticks → {:?}, {:?}",
            t30,
            t55,
            verdict,
            reading
        );
        if let Reading::Learned(w) = reading {
            let ok = store::save(l.nvmc, &w);
            hprintln!(
                "learned this valve's window {} … {} ticks; stored in flash: {}",
                w.lo,
                w.hi,
                ok
            );
            hprintln!("reset (as a brown-out or an update would)");
            cortex_m::peripheral::SCB::sys_reset();
        }
        if verdict == Verdict::Healthy && reading == Reading::Departure {
            hprintln!("departure: healthy by the design, never seen on this valve: log it, watch the clamp");
        }
        let needed = config::valve::FAULT_CONFIRMATIONS as usize;
        if l.history
            .confirmed(Verdict::Fault(Condition::ClampOpen), needed)
        {
            cx.shared.valve_enabled.lock(|e| *e = false);
            hprintln!("clamp path open, confirmed {} times in a row: valve driver disabled, fault reported", needed);
            debug::exit(debug::EXIT_SUCCESS);
        }
    }

    /// The armature detector on one switch-on's ADC buffer.
    #[task(priority = 1, shared = [gpio])]
    async fn pull_in(mut cx: pull_in::Context, samples: &'static [u16]) {
        let cfg = DipConfig {
            polarity: Polarity::Rising,
            rise: config::valve::ARMATURE_RISE_COUNTS as u16,
            hysteresis: config::valve::ARMATURE_HYSTERESIS_COUNTS as u16,
            min_dip: config::valve::ARMATURE_MIN_DIP_COUNTS as u16,
            window: config::valve::ARMATURE_WINDOW_SAMPLES,
            full_scale: config::valve::ARMATURE_FULL_SCALE_COUNTS as u16,
        };
        let mut d = DipDetector::new(cfg);
        match d.push_slice(samples).unwrap_or_else(|| d.finish()) {
            Motion::Moved { at, dip } => hprintln!(
                "switch-on: plunger seated at sample {} (dip {} counts): hold now",
                at,
                dip
            ),
            Motion::NotMoved => {
                cx.shared
                    .gpio
                    .lock(|g| g.outclr.write(|w| unsafe { w.bits(0b10) }));
                hprintln!("switch-on: plunger did not move, the valve did not open: pump stopped, zone reported");
            }
            Motion::Unclear(why) => {
                hprintln!("switch-on: no verdict ({:?}): retry once, then report", why)
            }
        }
    }

    /// Starts `t` (one-shot, clears and stops itself at CC0) to fire after `us` µs (every
    /// interval fits the 16-bit timer: checked at compile time below).
    fn start_one_shot(t: &nrf51_pac::timer0::RegisterBlock, us: u32) {
        t.tasks_clear.write(|w| unsafe { w.bits(1) });
        t.cc[0].write(|w| unsafe { w.bits(us) });
        t.tasks_start.write(|w| unsafe { w.bits(1) });
    }

    /// The capture clock now, µs (wrapping at 2³²).
    fn now(clock: &mut TIMER0) -> u32 {
        clock.tasks_capture[3].write(|w| unsafe { w.bits(1) });
        clock.cc[3].read().bits()
    }
}
