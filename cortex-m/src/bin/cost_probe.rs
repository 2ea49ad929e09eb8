//! On-core cost of each run-time function: one exported `extern "C"` probe per function and
//! input (typical and worst case), each calling the function once on inputs hidden from the
//! optimiser. `cortex-m/oncore.py` loads this ELF into a CPU emulator, calls every probe from
//! a fresh, painted stack and counts the instructions executed and the stack bytes touched; the
//! empty probe's counts are the call's own overhead and are subtracted.
//!
//! Typical and worst inputs, per function:
//! - verdict: a reading inside the healthy window (returns after one comparison) / outside
//!   every window of six (scans all);
//! - compensated verdict: first cell, healthy / last cell of a 4 × 6 table, outside every window;
//! - diode drop: 10 mA / 3 A (the series resistance's share differs; the report shows which
//!   costs more);
//! - thermometer: 1 mA at 0.6 V / 10 µA at 0.25 V (hot: the bounded solve walks further);
//! - closed-form decay: to 10 % of the start current / to zero;
//! - fit: 8 / 64 samples;
//! - learner: one reading while learning (the 15th) / the reading that completes 16 (sort,
//!   median, MAD), each the difference of two probes fed one reading apart; the stack includes
//!   the `Learner<16>` the probe holds;
//! - unit learner: one reading while learning (the 7th of 8, difference of two probes) / one
//!   judged reading once learned (learning and judging both narrow every segment: the same
//!   work, first cell / last cell of a 4 × 6 table); the stack includes the `UnitLearner<8>`;
//! - armature dip detector: one sample while the current rises (the 21st of a synthetic
//!   pull-in, difference of two probes) / the sample that confirms the motion (the valley's
//!   climb), each one `DipDetector::push`.
#![no_std]
#![no_main]

use core::hint::black_box as bb;
use cortex_m_rt::entry;
use kickguard::armature::detect::{DipConfig, DipDetector, Polarity};
use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::coil::Coil;
use kickguard::diagnosis::classify::{Entry, Windows, MAX_WINDOWS};
use kickguard::diagnosis::compensate::{CompensatedWindows, ResistanceLimit};
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::learn::{LearnedWindow, Learner};
use kickguard::diagnosis::unit::{UnitCell, UnitLearner, UnitTable};
use kickguard::diagnosis::{Condition, Verdict};
use kickguard::diode::DiodeParams;
use kickguard::rating::ThermalPath;
use kickguard::{Amps, Henries, Ohms, Seconds, Temperature, Volts, Watts};

const fn entry(lo: u32, condition: Condition) -> Entry {
    Entry {
        lo,
        hi: lo + 50,
        condition,
    }
}

/// Six windows, as generated constants.
static WINDOWS: Windows = Windows::from_entries(
    [
        entry(10, Condition::Healthy),
        entry(110, Condition::ClampOpen),
        entry(210, Condition::ZenerShorted),
        entry(410, Condition::CoilOpen),
        entry(510, Condition::ShortedTurns),
        entry(610, Condition::CoilTooHot),
    ],
    MAX_WINDOWS,
);

/// A 4 × 6 compensated table.
static COMPENSATED: CompensatedWindows<4, 6> = CompensatedWindows {
    supply_edges_mv: [21_600, 24_000, 25_200, 26_400],
    current_edges_ua: [300_000, 340_000, 380_000, 420_000, 460_000, 500_000],
    windows: [[WINDOWS; 6]; 4],
};

const fn amps(x: f32) -> Amps {
    match Amps::new(x) {
        Ok(a) => a,
        Err(_) => panic!("bad constant"),
    }
}

/// 64 samples of a decay with τ = 6.25 ms at 0.1 ms intervals (e^(−0.016) per step).
static SAMPLES: [Amps; 64] = {
    let mut s = [amps(0.0); 64];
    let mut x = 0.43f32;
    let mut k = 0;
    while k < 64 {
        s[k] = amps(x);
        x *= 0.984_127;
        k += 1;
    }
    s
};

fn t25() -> Option<Temperature> {
    Temperature::from_celsius(bb(25.0)).ok()
}

fn clamp() -> Option<ConstantClamp> {
    ConstantClamp::new(
        Henries::new(bb(0.35)).ok()?,
        Ohms::new(bb(56.0)).ok()?,
        Volts::new(bb(42.0)).ok()?,
        Amps::new(bb(0.43)).ok()?,
    )
    .ok()
}

fn coil() -> Option<Coil> {
    Coil::copper(
        Henries::new(bb(0.35)).ok()?,
        Ohms::new(bb(56.0)).ok()?,
        Temperature::from_celsius(bb(20.0)).ok()?,
    )
    .ok()
}

/// A probe's result folded into a word, so that nothing is optimised away.
fn word<T>(x: T) -> u32 {
    bb(x);
    1
}

macro_rules! probe {
    ($name:ident, $body:expr) => {
        #[no_mangle]
        pub extern "C" fn $name() -> u32 {
            word($body)
        }
    };
}

probe!(probe_empty, bb(0u32));
probe!(probe_verdict_typical, bb(&WINDOWS).classify(bb(30)));
probe!(probe_verdict_worst, bb(&WINDOWS).classify(bb(95)));
probe!(
    probe_compensated_typical,
    bb(&COMPENSATED).classify(bb(20_000), bb(250_000), bb(30))
);
probe!(
    probe_compensated_worst,
    bb(&COMPENSATED).classify(bb(30_000), bb(600_000), bb(95))
);
probe!(
    probe_resistance_limit,
    ResistanceLimit {
        max_healthy_mohm: bb(80_000)
    }
    .exceeded(bb(24_000), bb(300_000))
);
probe!(probe_history, {
    let mut h: VerdictHistory<4> = VerdictHistory::new();
    h.push(bb(Verdict::Fault(Condition::ClampOpen)));
    h.confirmed(Verdict::Fault(Condition::ClampOpen), bb(3))
});
probe!(
    probe_drop_typical,
    (|| bb(DiodeParams::SILICON)
        .forward_drop(Amps::new(bb(0.01)).ok()?, t25()?)
        .ok())()
);
probe!(
    probe_drop_worst,
    (|| bb(DiodeParams::SILICON)
        .forward_drop(Amps::new(bb(3.0)).ok()?, t25()?)
        .ok())()
);
probe!(
    probe_thermometer_typical,
    (|| bb(DiodeParams::SILICON)
        .junction_temperature(Amps::new(bb(1e-3)).ok()?, Volts::new(bb(0.6)).ok()?)
        .ok())()
);
probe!(
    probe_thermometer_worst,
    (|| bb(DiodeParams::SILICON)
        .junction_temperature(Amps::new(bb(1e-5)).ok()?, Volts::new(bb(0.25)).ok()?)
        .ok())()
);
probe!(
    probe_coil_resistance,
    (|| coil()?.resistance(t25()?).ok())()
);
probe!(
    probe_winding_temperature,
    (|| coil()?.winding_temperature(Ohms::new(bb(64.8)).ok()?).ok())()
);
probe!(
    probe_steady_current,
    (|| coil()?
        .steady_current(Volts::new(bb(24.0)).ok()?, t25()?)
        .ok())()
);
probe!(probe_clamp_new, clamp());
probe!(
    probe_clamp_time_typical,
    (|| clamp()?.time_to(Amps::new(bb(0.043)).ok()?).ok())()
);
probe!(
    probe_clamp_time_worst,
    (|| clamp()?.time_to(Amps::new(bb(0.0)).ok()?).ok())()
);
probe!(
    probe_clamp_energy,
    (|| clamp()?.decay_to(Amps::new(bb(0.0)).ok()?).ok())()
);
probe!(
    probe_thermal_check,
    (|| ThermalPath {
        resistance_k_per_w: bb(200.0),
        ambient: t25()?,
        junction_max: Temperature::from_celsius(bb(150.0)).ok()?,
    }
    .check(Watts::new(bb(0.1)).ok()?)
    .ok())()
);
probe!(
    probe_fit_typical,
    (|| fit_decay(bb(&SAMPLES[..8]), Seconds::new(bb(1e-4)).ok()?).ok())()
);
probe!(
    probe_fit_worst,
    (|| fit_decay(bb(&SAMPLES[..]), Seconds::new(bb(1e-4)).ok()?).ok())()
);
/// A learner fed `n` readings (healthy, spread over 30 ticks); the last reading's result.
fn learn(n: u32) -> Option<kickguard::diagnosis::learn::Reading> {
    let mut l = Learner::<16>::new(WINDOWS, bb(2)).ok()?;
    let mut last = None;
    for k in 0..bb(n) {
        last = Some(l.observe(bb(20 + (k * 7) % 30)));
    }
    last
}
probe!(probe_learn_new, Learner::<16>::new(WINDOWS, bb(2)).is_ok());
probe!(probe_learn_14, learn(14));
probe!(probe_learn_15, learn(15));
probe!(probe_learn_16, learn(16));
probe!(
    probe_learned_from_bytes,
    LearnedWindow::from_bytes(bb(&[1, 20, 0, 0, 0, 50, 0, 0, 0]), &WINDOWS)
);
/// The unit learner's table on the compensated table's cells (segment windows of 25 … 41
/// ticks, in sixteenths, inside the healthy window 10 … 60).
static UNIT: UnitTable<4, 6> = UnitTable {
    design: COMPENSATED,
    cells: [[UnitCell {
        lo: [400, 420, 440, 460],
        hi: [600, 620, 640, 660],
    }; 6]; 4],
    scale_ppm: (900_000, 1_100_000),
    reading_halfwidth_ticks: 3,
};
/// A unit learner fed `n` healthy readings: the first 8 in the first cell (it learns), any
/// later one in the last cell (judged); the last reading's result.
fn unit_learn(n: u32) -> Option<kickguard::diagnosis::unit::UnitReading> {
    let mut l = UnitLearner::<8>::new(&UNIT).ok()?;
    let mut last = None;
    for k in 0..bb(n) {
        let (mv, ua) = if k < 8 {
            (21_000, 290_000)
        } else {
            (30_000, 600_000)
        };
        last = Some(l.observe(&UNIT, bb(mv), bb(ua), bb(30 + k % 3)));
    }
    last
}
probe!(probe_unit_new, UnitLearner::<8>::new(&UNIT).is_ok());
probe!(probe_unit_6, unit_learn(6));
probe!(probe_unit_7, unit_learn(7));
probe!(probe_unit_8, unit_learn(8));
probe!(probe_unit_9, unit_learn(9));
probe!(
    probe_unit_resume,
    UnitLearner::<8>::resume(&UNIT, bb(&[0u8; kickguard::diagnosis::unit::STATE_BYTES])).is_ok()
);
/// A synthetic pull-in in counts: a rise to 2000, a dip to 1500 at sample 60, the climb on.
static PULL_IN: [u16; 96] = {
    let mut s = [0u16; 96];
    let mut k = 0;
    while k < 96 {
        s[k] = if k < 40 {
            (k * 50) as u16
        } else if k < 60 {
            (2000 - (k - 40) * 25) as u16
        } else {
            (1500 + (k - 60) * 20) as u16
        };
        k += 1;
    }
    s
};
const DIP: DipConfig = DipConfig {
    polarity: Polarity::Rising,
    rise: 11,
    hysteresis: 11,
    min_dip: 11,
    window: 1000,
    full_scale: 4096,
};
/// A detector fed the first `n` samples; the last one's answer.
fn dip(n: u32) -> Option<kickguard::armature::detect::Motion> {
    let mut d = DipDetector::new(bb(DIP));
    let mut last = None;
    for s in PULL_IN.iter().take(bb(n) as usize) {
        last = d.push(bb(*s));
    }
    last
}
/// A detector fed the first `n` samples as one slice (a DMA half-buffer): no call per sample.
fn dip_slice(n: usize) -> Option<kickguard::armature::detect::Motion> {
    let mut d = DipDetector::new(bb(DIP));
    d.push_slice(bb(PULL_IN.get(..bb(n)).unwrap_or(&[])))
}
probe!(probe_dip_slice_20, dip_slice(20));
probe!(probe_dip_slice_21, dip_slice(21));
probe!(probe_dip_20, dip(20));
probe!(probe_dip_21, dip(21));
probe!(probe_dip_60, dip(60));
probe!(probe_dip_61, dip(61));
#[cfg(feature = "micromath")]
probe!(
    probe_fast_drop_typical,
    (|| kickguard::fast::forward_drop(
        &bb(DiodeParams::SILICON),
        Amps::new(bb(0.01)).ok()?,
        t25()?
    )
    .ok())()
);
#[cfg(feature = "micromath")]
probe!(
    probe_fast_drop_worst,
    (|| kickguard::fast::forward_drop(&bb(DiodeParams::SILICON), Amps::new(bb(3.0)).ok()?, t25()?)
        .ok())()
);
#[cfg(feature = "micromath")]
probe!(
    probe_fast_clamp_time_typical,
    (|| kickguard::fast::constant_clamp_time(&clamp()?, Amps::new(bb(0.043)).ok()?).ok())()
);
#[cfg(feature = "micromath")]
probe!(
    probe_fast_clamp_time_worst,
    (|| kickguard::fast::constant_clamp_time(&clamp()?, Amps::new(bb(0.0)).ok()?).ok())()
);

/// Every probe, referenced so that the linker keeps them.
#[used]
static PROBES: &[extern "C" fn() -> u32] = &[
    probe_empty,
    probe_verdict_typical,
    probe_verdict_worst,
    probe_compensated_typical,
    probe_compensated_worst,
    probe_resistance_limit,
    probe_history,
    probe_drop_typical,
    probe_drop_worst,
    probe_thermometer_typical,
    probe_thermometer_worst,
    probe_coil_resistance,
    probe_winding_temperature,
    probe_steady_current,
    probe_clamp_new,
    probe_clamp_time_typical,
    probe_clamp_time_worst,
    probe_clamp_energy,
    probe_thermal_check,
    probe_fit_typical,
    probe_fit_worst,
    probe_learn_new,
    probe_learn_14,
    probe_learn_15,
    probe_learn_16,
    probe_learned_from_bytes,
    probe_unit_new,
    probe_unit_6,
    probe_unit_7,
    probe_unit_8,
    probe_unit_9,
    probe_unit_resume,
    probe_dip_slice_20,
    probe_dip_slice_21,
    probe_dip_20,
    probe_dip_21,
    probe_dip_60,
    probe_dip_61,
    #[cfg(feature = "micromath")]
    probe_fast_drop_typical,
    #[cfg(feature = "micromath")]
    probe_fast_drop_worst,
    #[cfg(feature = "micromath")]
    probe_fast_clamp_time_typical,
    #[cfg(feature = "micromath")]
    probe_fast_clamp_time_worst,
];

#[entry]
fn main() -> ! {
    for p in bb(PROBES) {
        bb(p());
    }
    cortex_m_semihosting::debug::exit(cortex_m_semihosting::debug::EXIT_SUCCESS);
    loop {}
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    loop {}
}
