//! The greenhouse valve's firmware loop, written once against `embedded-hal` 1.0 and kickguard's
//! [`TickCounter`]; each HAL example (`examples/hal-rp2040`, `examples/hal-nrf52840`) supplies
//! its own GPIO pins, its timer and its ADC, and calls [`Valve::cycle`] from its main loop.
//!
//! One cycle: drive the coil and sample its current at the design's ADC rate into the
//! armature's dip detector (did the plunger open?), hold for the on-time, switch off and time
//! the 55 V drain comparator's high time (`time_flyback`), judge it against the generated
//! windows, keep the verdict history, and wait out the re-energise wait. Blocking style: the
//! core does nothing else meanwhile (see the crate README for the interrupt and async styles).
//!
//! Bounded: every wait is a busy wait on the timer of at most [`MAX_WAIT_POLLS`] polls, so a
//! stopped timer ends it (as [`Action::TimerStopped`]) instead of hanging the loop.

use embedded_hal::digital::{InputPin, OutputPin};
use kickguard::armature::detect::{DipConfig, DipDetector, Motion, Polarity};
use kickguard::diagnosis::hal::{time_flyback, MeasureError, TickCounter};
use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::{Condition, Verdict, Windows};

use crate::config;

/// The timer's ticks per design tick: the examples run their counter at 1 MHz, the design's
/// windows are in ticks of `config::TICK_HZ` (10 kHz).
pub const US_PER_TICK: u32 = 1_000_000 / config::TICK_HZ;
/// The coil's on-time, µs (full drive, then hold: the hold's PWM is left out here).
pub const ON_US: u32 = 50_000;
/// Polls of the timer after which a wait gives up (a stopped timer); far above any wait here
/// on a core of at most a few hundred MHz.
pub const MAX_WAIT_POLLS: u32 = 1 << 26;
/// ADC samples per switch-on: the detector's window and a margin.
pub const SAMPLES: u32 = config::valve::ARMATURE_WINDOW_SAMPLES + 8;

// Build-time checks of the generated constants this loop narrows or multiplies: a design
// outside them fails the build here instead of wrapping at run time.
const _: () = assert!(config::TICK_HZ > 0 && 1_000_000 % config::TICK_HZ == 0);
const _: () = assert!(
    config::valve::ARMATURE_RISE_COUNTS <= u16::MAX as u32
        && config::valve::ARMATURE_HYSTERESIS_COUNTS <= u16::MAX as u32
        && config::valve::ARMATURE_MIN_DIP_COUNTS <= u16::MAX as u32
        && config::valve::ARMATURE_FULL_SCALE_COUNTS <= u16::MAX as u32
);
const _: () = assert!(
    config::valve::REENERGISE_WAIT_TICKS <= u32::MAX / US_PER_TICK
        && config::valve::DECAY_WAIT_TICKS <= u32::MAX / US_PER_TICK
        && SAMPLES <= u32::MAX / US_PER_TICK
);

/// The coil-current ADC, one conversion per call, counts (the design's counts per ampere).
pub trait CoilAdc {
    /// One conversion of the coil-current channel.
    fn read_counts(&mut self) -> u16;
}

/// What the firmware does after a cycle.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Action {
    /// Healthy: carry on.
    Carry,
    /// The plunger did not move: stop the pump of this zone and report.
    StopPump,
    /// The clamp path is open, or the plunger stayed shut, confirmed `FAULT_CONFIRMATIONS`
    /// times in a row: disable the driver.
    DisableValve,
    /// The flyback did not end within the decay wait, or a pin failed: report, retry once.
    Report,
    /// A wait saw the timer stop: the timing cannot be trusted.
    TimerStopped,
}

/// One valve: its gate, its 55 V comparator input, the 1 MHz counter, the ADC.
pub struct Valve<G, S, C, A> {
    /// The low-side switch's gate (high: coil energised).
    pub gate: G,
    /// The 55 V drain comparator (high while the drain is above 55 V).
    pub sense: S,
    /// A free-running 1 MHz counter, wrapping at 2³².
    pub clock: C,
    /// The coil-current ADC.
    pub adc: A,
    windows: Windows,
    history: VerdictHistory<8>,
    /// The armature's verdicts, kept apart from the flyback's so that each history's
    /// confirmations count its own readings in a row.
    armature: VerdictHistory<8>,
}

impl<G: OutputPin, S: InputPin, C: TickCounter, A: CoilAdc> Valve<G, S, C, A> {
    /// A valve with the generated windows of its 55 V comparator and an empty history.
    pub fn new(gate: G, sense: S, clock: C, adc: A) -> Self {
        Valve {
            gate,
            sense,
            clock,
            adc,
            windows: Windows::from_rows(&config::valve::DIAG_1_WINDOWS),
            history: VerdictHistory::new(),
            armature: VerdictHistory::new(),
        }
    }

    /// One switch-on, switch-off and rest; what to do next.
    ///
    /// Work: [`SAMPLES`] conversions, then four bounded waits (each ≤ [`MAX_WAIT_POLLS`]
    /// polls) and one flyback timing (bounded by its timeout and by the library's poll
    /// limits).
    pub fn cycle(&mut self) -> Action {
        let on_at = self.clock.ticks();
        if self.gate.set_high().is_err() {
            return Action::Report;
        }
        let motion = match self.sample_pull_in(on_at) {
            Some(m) => m,
            None => return Action::TimerStopped,
        };
        if !self.wait_until(on_at, ON_US) {
            return Action::TimerStopped;
        }
        let off_at = self.clock.ticks();
        let timeout_us = config::valve::DECAY_WAIT_TICKS * US_PER_TICK;
        let verdict =
            match time_flyback(&mut self.gate, &mut self.sense, &mut self.clock, timeout_us) {
                Ok(us) => self.windows.classify(us / US_PER_TICK),
                Err(MeasureError::Stalled) => return Action::TimerStopped,
                Err(_) => return Action::Report,
            };
        self.history.push(verdict);
        if !self.wait_until(off_at, config::valve::REENERGISE_WAIT_TICKS * US_PER_TICK) {
            return Action::TimerStopped;
        }
        if let Some(v) = motion.as_verdict(Polarity::Rising) {
            self.armature.push(v);
        }
        let needed = config::valve::FAULT_CONFIRMATIONS as usize;
        let stuck = Verdict::Fault(Condition::ArmatureStuckOpen);
        if self
            .history
            .confirmed(Verdict::Fault(Condition::ClampOpen), needed)
            || self.armature.confirmed(stuck, needed)
        {
            // An open clamp, or a plunger that stayed shut switch-on after switch-on.
            Action::DisableValve
        } else if motion == Motion::NotMoved {
            // At once, before any confirmation: the pump must not push against a shut valve.
            Action::StopPump
        } else {
            Action::Carry
        }
    }

    /// Samples the coil current every design tick from `on_at` into the dip detector; its
    /// verdict, or None if the timer stopped.
    fn sample_pull_in(&mut self, on_at: u32) -> Option<Motion> {
        let mut detector = DipDetector::new(dip_config());
        for k in 0..SAMPLES {
            if !self.wait_until(on_at, k * US_PER_TICK) {
                return None;
            }
            if let Some(m) = detector.push(self.adc.read_counts()) {
                return Some(m);
            }
        }
        Some(detector.finish())
    }

    /// Busy-waits until `us` µs after `from` on the counter; false if the counter stopped
    /// (no progress within [`MAX_WAIT_POLLS`] polls).
    fn wait_until(&mut self, from: u32, us: u32) -> bool {
        for _ in 0..MAX_WAIT_POLLS {
            if self.clock.ticks().wrapping_sub(from) >= us {
                return true;
            }
        }
        false
    }
}

/// The pull-in detector's thresholds from the configuration step's constants (each fits a
/// `u16`: checked at build time above).
pub fn dip_config() -> DipConfig {
    DipConfig {
        polarity: Polarity::Rising,
        rise: config::valve::ARMATURE_RISE_COUNTS as u16,
        hysteresis: config::valve::ARMATURE_HYSTERESIS_COUNTS as u16,
        min_dip: config::valve::ARMATURE_MIN_DIP_COUNTS as u16,
        window: config::valve::ARMATURE_WINDOW_SAMPLES,
        full_scale: config::valve::ARMATURE_FULL_SCALE_COUNTS as u16,
    }
}

/// The firmware's main loop: switches the zone's pump on, cycles the valve, and acts on each
/// cycle's [`Action`]; returns only by halting. The pins' errors are ignored: on the HALs
/// here they are `Infallible`.
pub fn run<G, S, C, A, P>(mut valve: Valve<G, S, C, A>, mut pump: P) -> !
where
    G: OutputPin,
    S: InputPin,
    C: TickCounter,
    A: CoilAdc,
    P: OutputPin,
{
    let _ = pump.set_high();
    loop {
        match valve.cycle() {
            Action::Carry | Action::Report => {}
            Action::StopPump => {
                let _ = pump.set_low();
            }
            Action::DisableValve | Action::TimerStopped => {
                let _ = pump.set_low();
                halt()
            }
        }
    }
}

/// Stops here (a real firmware would report first); waits for interrupts, forever.
pub fn halt() -> ! {
    loop {
        cortex_m::asm::wfi();
    }
}
