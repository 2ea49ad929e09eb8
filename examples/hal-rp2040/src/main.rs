//! The greenhouse valve's firmware on an RP2040 (Cortex-M0+), written against rp2040-hal.
//!
//! - GPIO2 drives the valve's low-side switch, GPIO3 reads the 55 V drain comparator, GPIO4
//!   enables the zone's pump; GPIO26 (ADC0) reads the coil-current shunt amplifier.
//! - The HAL's 1 MHz timer (its low word, wrapping at 2³²) is kickguard's tick counter.
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

use embedded_hal_0_2::adc::OneShot;
use kickguard::diagnosis::hal::TickCounter;
use rp2040_hal::adc::{Adc, AdcPin};
use rp2040_hal::gpio::bank0::Gpio26;
use rp2040_hal::gpio::{FunctionSioInput, Pin, PullNone};
use rp2040_hal::{clocks, pac, Sio, Timer, Watchdog};
use valve::{halt, CoilAdc, Valve};

/// The second-stage boot loader for the board's W25Q080-type QSPI flash.
#[link_section = ".boot2"]
#[used]
pub static BOOT2: [u8; 256] = rp2040_boot2::BOOT_LOADER_W25Q080;

/// The board's crystal, Hz.
const XOSC_HZ: u32 = 12_000_000;

/// The HAL's timer as kickguard's counter: 1 MHz, its low 32 bits.
struct Micros(Timer);

impl TickCounter for Micros {
    fn ticks(&mut self) -> u32 {
        self.0.get_counter_low()
    }
}

/// ADC0 on GPIO26 as the coil-current channel.
struct ShuntAdc {
    adc: Adc,
    pin: AdcPin<Pin<Gpio26, FunctionSioInput, PullNone>>,
}

impl CoilAdc for ShuntAdc {
    fn read_counts(&mut self) -> u16 {
        // The HAL's one-shot read converts and returns at once (its error type is
        // Infallible); a "would block" cannot happen, and would read as saturated, which the
        // detector reports as Unclear rather than a verdict.
        let r: nb::Result<u16, _> = self.adc.read(&mut self.pin);
        r.unwrap_or(u16::MAX)
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
    let Some(mut p) = pac::Peripherals::take() else {
        halt()
    };
    let mut watchdog = Watchdog::new(p.WATCHDOG);
    let Ok(clocks) = clocks::init_clocks_and_plls(
        XOSC_HZ,
        p.XOSC,
        p.CLOCKS,
        p.PLL_SYS,
        p.PLL_USB,
        &mut p.RESETS,
        &mut watchdog,
    ) else {
        halt()
    };
    let sio = Sio::new(p.SIO);
    let pins = rp2040_hal::gpio::Pins::new(p.IO_BANK0, p.PADS_BANK0, sio.gpio_bank0, &mut p.RESETS);
    let timer = Timer::new(p.TIMER, &mut p.RESETS, &clocks);
    let Ok(adc_pin) = AdcPin::new(pins.gpio26.into_floating_input()) else {
        halt()
    };
    let adc = ShuntAdc {
        adc: Adc::new(p.ADC, &mut p.RESETS),
        pin: adc_pin,
    };
    let pump = pins.gpio4.into_push_pull_output();
    let gate = pins.gpio2.into_push_pull_output();
    let sense = pins.gpio3.into_floating_input();
    let valve = Valve::new(gate, sense, Micros(timer), adc);
    valve::run(valve, pump)
}
