//! The run-time API a firmware links: what runs on the controller after configuration. Its flash
//! size, less `size_baseline`'s, is checked against the budget by `.ci/cross`.
//!
//! Run-time API (what the controller computes while running: a few multiplications and at most a
//! logarithm or a short bounded solve): diode drop at a measured temperature, the diode as a
//! thermometer, coil R(T), winding temperature from a measured resistance and steady
//! current, the closed-form constant-clamp decay (wait time, charge, energies), the thermal check,
//! the diagnosis verdict on a tick count (plain and compensated by the measured supply and
//! on-current), the hot-coil resistance check, the verdict history, learning a unit's own
//! window with its persisted form, and the sample-buffer fit.
//! Configuration-time functions (fits, the full `SwitchOff` engine with its diode-law
//! quadrature, sizing, the snubber, sampling for plots, the series-resistor solve) are measured
//! separately as "whole public API".
#![no_std]
#![no_main]

use core::hint::black_box as bb;
use cortex_m_rt::entry;
use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::coil::Coil;
use kickguard::diode::DiodeParams;
use kickguard::rating::ThermalPath;
use kickguard::{Amps, Error, Henries, Ohms, Temperature, Volts, Watts};

use kickguard::armature::detect::{DipConfig, DipDetector, Motion, Polarity};
use kickguard::diagnosis::classify::{Entry, Windows, MAX_WINDOWS};
use kickguard::diagnosis::compensate::{CompensatedWindows, ResistanceLimit};
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::history::VerdictHistory;
use kickguard::diagnosis::learn::{LearnedWindow, Learner, Reading};
use kickguard::diagnosis::unit::{UnitCell, UnitLearner, UnitReading, UnitTable, SEGMENTS};
use kickguard::diagnosis::{Condition, Verdict};

/// Diagnosis windows as a firmware holds them: generated constants, built at compile time.
static WINDOWS: Windows = {
    let mut e = [Entry::EMPTY; MAX_WINDOWS];
    e[0] = Entry {
        lo: 400,
        hi: 600,
        condition: Condition::Healthy,
    };
    e[1] = Entry {
        lo: 100,
        hi: 300,
        condition: Condition::ClampOpen,
    };
    Windows::from_entries(e, 2)
};

/// Compensated windows as generated constants: 2 supply bins × 3 on-current bins.
static COMPENSATED: CompensatedWindows<2, 3> = CompensatedWindows {
    supply_edges_mv: [24_000, 26_400],
    current_edges_ua: [400_000, 450_000, 500_000],
    windows: [[WINDOWS; 3]; 2],
};

/// The unit learner's table as generated constants, on the compensated table's cells.
static UNIT: UnitTable<2, 3> = UnitTable {
    design: COMPENSATED,
    cells: [[UnitCell {
        lo: [7_000; SEGMENTS],
        hi: [8_000; SEGMENTS],
    }; 3]; 2],
    scale_ppm: (900_000, 1_100_000),
    reading_halfwidth_ticks: 3,
};

/// A sample buffer as the ADC interrupt would have filled it.
static SAMPLES: [Amps; 8] = {
    const fn a(x: f32) -> Amps {
        match Amps::new(x) {
            Ok(a) => a,
            Err(_) => panic!("bad constant"),
        }
    }
    [
        a(0.40),
        a(0.35),
        a(0.31),
        a(0.27),
        a(0.24),
        a(0.21),
        a(0.19),
        a(0.17),
    ]
};

fn run() -> Result<f32, Error> {
    let t = Temperature::from_celsius(bb(25.0))?;
    let d = bb(DiodeParams::SILICON);
    let mut acc = d.forward_drop(Amps::new(bb(0.4))?, t)?.value();
    acc += d
        .junction_temperature(Amps::new(bb(1e-3))?, Volts::new(bb(0.6))?)?
        .kelvin();
    let coil = Coil::copper(Henries::new(bb(0.35))?, Ohms::new(bb(56.0))?, t)?;
    acc += coil.resistance(t)?.value() + coil.winding_temperature(Ohms::new(bb(60.0))?)?.kelvin();
    acc += coil.steady_current(Volts::new(bb(24.0))?, t)?.value();
    let decay = ConstantClamp::new(
        coil.inductance(),
        coil.resistance(t)?,
        Volts::new(bb(42.0))?,
        Amps::new(bb(0.4))?,
    )?;
    let i1 = Amps::new(bb(0.0))?;
    let dec = decay.decay_to(i1)?;
    acc += decay.time_to(i1)?.value() + dec.clamp_energy.value() + dec.resistive_energy.value();
    let path = ThermalPath {
        resistance_k_per_w: bb(200.0),
        ambient: t,
        junction_max: Temperature::from_celsius(bb(150.0))?,
    };
    acc += path.check(Watts::new(bb(0.1))?)?.junction.kelvin();
    let w = bb(&WINDOWS);
    let mut h: VerdictHistory<4> = VerdictHistory::new();
    h.push(w.classify(bb(250)));
    acc += h.confirmed(Verdict::Fault(Condition::ClampOpen), bb(3)) as u32 as f32;
    acc += fit_decay(bb(&SAMPLES[..]), kickguard::Seconds::new(bb(1e-4))?)?
        .tau
        .value();
    // Compensated windows (by measured supply and on-current), the hot-coil resistance check,
    // and learning the unit's own window with its persisted form.
    let comp = bb(&COMPENSATED);
    acc += (comp.classify(bb(24_000), bb(420_000), bb(250)) == Verdict::Healthy) as u32 as f32;
    acc += ResistanceLimit {
        max_healthy_mohm: bb(80_000),
    }
    .exceeded(bb(24_000), bb(300_000)) as u32 as f32;
    let mut learner: Learner<16> = Learner::new(*w, bb(2))?;
    for k in 0..20u32 {
        if let Reading::Departure = learner.observe(bb(450 + (k & 3))) {
            acc += 1.0;
        }
    }
    if let Some(lw) = learner.learned() {
        acc += LearnedWindow::from_bytes(&lw.to_bytes(), w).is_ok() as u32 as f32;
    }
    // The unit learner: learning across conditions, persisting, restoring, judging.
    let unit = bb(&UNIT);
    let mut u: UnitLearner<8> = UnitLearner::new(unit)?;
    for k in 0..12u32 {
        if let UnitReading::Departure = u.observe(unit, bb(24_000), bb(420_000), bb(450 + k)) {
            acc += 1.0;
        }
    }
    if let Some(b) = u.state_bytes() {
        acc += UnitLearner::<8>::resume(unit, &b).is_ok() as u32 as f32;
    }
    // The armature's dip detector, fed a DMA half-buffer.
    let mut d = DipDetector::new(bb(DipConfig {
        polarity: Polarity::Rising,
        rise: 11,
        hysteresis: 11,
        min_dip: 11,
        window: 1000,
        full_scale: 4096,
    }));
    if let Some(Motion::Moved { dip, .. }) =
        d.push_slice(bb(&[0u16, 900, 1800, 1500, 1300, 1700, 2000]))
    {
        acc += f32::from(dip);
    }
    Ok(acc)
}

#[entry]
fn main() -> ! {
    let _ = bb(run());
    cortex_m_semihosting::debug::exit(cortex_m_semihosting::debug::EXIT_SUCCESS);
    loop {}
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    loop {}
}
