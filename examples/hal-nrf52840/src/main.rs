//! The greenhouse valve's firmware on an nRF52840 (Cortex-M4F), written against nrf52840-hal.
//!
//! - P0.13 drives the valve's low-side switch, P0.14 reads the 55 V drain comparator, P0.15
//!   enables the zone's pump; P0.02 (SAADC input 0) reads the coil-current shunt amplifier.
//! - TIMER0 counts at 1 MHz from the 32 MHz crystal (the HAL's timer: prescaler 16, 32 bits):
//!   kickguard's tick counter.
//! - The loop (`hal-common/valve.rs`, the same on every HAL) drives the valve, runs the
//!   armature's dip detector on the ADC at the design's rate, times the flyback, judges it and
//!   acts.
#![no_std]
#![no_main]

mod config {
    include!(concat!(env!("OUT_DIR"), "/kickguard_config.rs"));
}
#[path = "../../hal-common/valve.rs"]
mod valve;
include!("../../hal-common/panic_proof.rs");

use kickguard::diagnosis::hal::TickCounter;
use nrf52840_hal::clocks::Clocks;
use nrf52840_hal::gpio::{p0, Floating, Input, Level};
use nrf52840_hal::pac::{self, saadc, TIMER0};
use nrf52840_hal::saadc::{Saadc, SaadcConfig};
use nrf52840_hal::timer::{Periodic, Timer};
use valve::{halt, CoilAdc, Valve};

/// TIMER0 at 1 MHz as kickguard's counter. The HAL's periodic mode clears the counter when it
/// reaches the compare value; with the compare at 2³² − 1 a span across that wrap (once every
/// 71.6 minutes) reads 1 µs short, far inside the design's timing jitter (2 ticks, 200 µs).
struct Micros(Timer<TIMER0, Periodic>);

impl TickCounter for Micros {
    fn ticks(&mut self) -> u32 {
        self.0.read()
    }
}

/// SAADC input 0 on P0.02 as the coil-current channel, 12 bits single-ended.
struct ShuntAdc {
    adc: Saadc,
    pin: p0::P0_02<Input<Floating>>,
}

impl CoilAdc for ShuntAdc {
    fn read_counts(&mut self) -> u16 {
        match self.adc.read_channel(&mut self.pin) {
            // Single-ended, the SAADC reads a few counts below zero at zero current (its
            // offset): that is zero current.
            Ok(counts) => u16::try_from(counts).unwrap_or(0),
            // The HAL's only error is a second channel enabled, which this firmware never
            // does; it would read as saturated, which the detector reports as Unclear.
            Err(()) => u16::MAX,
        }
    }
}

/// 12 bits (the design's 4096 counts full scale), no oversampling, 10 µs acquisition: one
/// conversion in about 12 µs, well inside the design's 100 µs sample period. The gain and
/// reference set the shunt amplifier's range (the design's counts per ampere).
fn adc_config() -> SaadcConfig {
    SaadcConfig {
        resolution: saadc::resolution::VAL_A::_12BIT,
        oversample: saadc::oversample::OVERSAMPLE_A::BYPASS,
        time: saadc::ch::config::TACQ_A::_10US,
        ..SaadcConfig::default()
    }
}

#[cortex_m_rt::entry]
fn main() -> ! {
    // The negative control of the link-time panic proof (`.ci/cross`): a panic the optimiser
    // cannot remove must make the link fail.
    #[cfg(feature = "force-panic")]
    if core::hint::black_box(true) {
        panic!()
    }
    let Some(p) = pac::Peripherals::take() else {
        halt()
    };
    // The crystal, not the RC oscillator, clocks the timer: the windows assume its accuracy.
    let _clocks = Clocks::new(p.CLOCK).enable_ext_hfosc();
    let port0 = p0::Parts::new(p.P0);
    let mut timer = Timer::periodic(p.TIMER0);
    timer.start(u32::MAX);
    let adc = ShuntAdc {
        adc: Saadc::new(p.SAADC, adc_config()),
        pin: port0.p0_02.into_floating_input(),
    };
    let pump = port0.p0_15.into_push_pull_output(Level::Low);
    let gate = port0.p0_13.into_push_pull_output(Level::Low);
    let sense = port0.p0_14.into_floating_input();
    let valve = Valve::new(gate, sense, Micros(timer), adc);
    valve::run(valve, pump)
}
