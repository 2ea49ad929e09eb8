//! What the emulator lacks, standing in for the hardware: the drain comparators' high times
//! after each switch-off (played back by a second timer, see `main.rs`) and the coil-current
//! ADC's buffer at each switch-on (QEMU's nRF51 has no comparator and no ADC). Nothing here is
//! firmware: on the board these numbers come from the coil.

include!(concat!(env!("OUT_DIR"), "/stimulus.rs"));

/// Timer ticks of the design (10 kHz) in the capture timer's microseconds.
pub const US_PER_TICK: u32 = 1_000_000 / crate::config::TICK_HZ;

/// How long the 30 V and the 55 V comparator stay high after the `n`-th switch-off (from 1), µs
/// (0: it never trips), and whether the plunger moves at the `n`-th switch-on.
///
/// First boot (nothing learned yet): a healthy valve reading 50 … 53 ticks on the 30 V
/// comparator. After the reset (the window restored from flash): healthy, then a reading the
/// design calls healthy but this unit never showed, a plunger stuck shut, then the clamp path
/// open (the switch's avalanche: both comparators high about 30 ticks).
pub fn flyback_us(restored: bool, n: u32) -> (u32, u32) {
    let ticks = |t: u32| t * US_PER_TICK + US_PER_TICK / 2;
    match (restored, n) {
        (false, _) => (ticks(50 + n % 4), 0),
        (true, 1..=3) => (ticks(51 + n % 2), 0),
        (true, 4) => (ticks(70), 0),
        (true, _) => (ticks(31), ticks(30)),
    }
}

/// The ADC buffer at the `n`-th switch-on: the plunger moves, but sticks shut at the fifth
/// switch-on after the reset.
pub fn pull_in_samples(restored: bool, n: u32) -> &'static [u16] {
    if restored && n == 5 {
        &STUCK
    } else {
        &MOVING
    }
}
