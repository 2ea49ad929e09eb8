//! The run-time calls measured by the timing and instruction-count benches (shared by both).
//! Every input passes through `black_box` so nothing is folded at compile time.
#![allow(dead_code)]

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::closed_form::ConstantClamp;
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams, Ideality};
use kickguard::{Amps, Henries, Ohms, PerKelvin, Temperature, Volts};
use std::hint::black_box as bb;
use std::sync::LazyLock;

/// Prepared once, outside the measured calls: the firmware builds these at start-up.
static CLAMP: LazyLock<ConstantClamp> = LazyLock::new(|| {
    ConstantClamp::new(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        Volts::new(42.0).unwrap(),
        Amps::new(0.43).unwrap(),
    )
    .unwrap()
});
fn prepared(clamp: Clamp) -> SwitchOff {
    let op = Operating::uniform(Volts::new(24.0).unwrap(), Amps::new(0.43).unwrap(), t25());
    SwitchOff::new(&valve(), &clamp, Side::Low, &op).unwrap()
}
static DIODE_OFF: LazyLock<SwitchOff> =
    LazyLock::new(|| prepared(Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON))));
/// The valve's diode + 18 V zener, the zener on SPICE's exact breakdown law.
static ZENER_OFF: LazyLock<SwitchOff> = LazyLock::new(|| {
    let zener = Breakdown::new(
        BreakdownLaw::Spice {
            bv: Volts::new(18.0).unwrap(),
            ibv: Amps::new(1e-3).unwrap(),
            nbv: Ideality::new(2.0).unwrap(),
            rs: Ohms::new(2.0).unwrap(),
        },
        PerKelvin::ZERO,
        t25(),
    )
    .unwrap();
    prepared(Clamp::ZenerDiode {
        zener,
        diode: Diode::Law(DiodeParams::SILICON),
    })
});

/// A measured call: its name, the instruction target it must meet (None: report only), and the
/// call itself (returns an f32 so the work cannot be discarded).
pub struct Case {
    pub name: &'static str,
    pub target: Option<u64>,
    pub run: fn() -> f32,
}

fn t25() -> Temperature {
    Temperature::from_celsius(bb(25.0)).unwrap()
}

fn valve() -> Coil {
    Coil::copper(
        Henries::new(bb(0.35)).unwrap(),
        Ohms::new(bb(56.0)).unwrap(),
        t25(),
    )
    .unwrap()
}

fn constant_time() -> f32 {
    bb(&*CLAMP)
        .time_to(Amps::new(bb(0.0)).unwrap())
        .unwrap()
        .value()
}

fn constant_energy() -> f32 {
    bb(&*CLAMP)
        .decay_to(Amps::new(bb(0.0)).unwrap())
        .unwrap()
        .clamp_energy
        .value()
}

fn switch_off_avalanche() -> f32 {
    let clamp = Clamp::Avalanche(Breakdown::ideal(Volts::new(bb(66.0)).unwrap()).unwrap());
    let op = Operating::uniform(
        Volts::new(bb(24.0)).unwrap(),
        Amps::new(bb(0.43)).unwrap(),
        t25(),
    );
    let off = SwitchOff::new(&valve(), &clamp, Side::Low, &op).unwrap();
    off.decay_to(Amps::new(bb(0.0)).unwrap())
        .unwrap()
        .energy
        .switch
        .value()
}

fn diode_law_decay() -> f32 {
    bb(&*DIODE_OFF)
        .decay_to(Amps::new(bb(0.0043)).unwrap())
        .unwrap()
        .time
        .value()
}

fn diode_law_decay_deep() -> f32 {
    bb(&*DIODE_OFF)
        .decay_to(Amps::new(bb(4.3e-6)).unwrap())
        .unwrap()
        .time
        .value()
}

/// Times to 50, 10 and 1 % of the start current and every energy, in one pass.
fn profile_of(off: &SwitchOff) -> f32 {
    let i0 = 0.43f32;
    let p = bb(off)
        .profile(&[
            Amps::new(bb(0.5 * i0)).unwrap(),
            Amps::new(bb(0.1 * i0)).unwrap(),
            Amps::new(bb(0.01 * i0)).unwrap(),
        ])
        .unwrap();
    p.times[0].value() + p.times[1].value() + p.decay.energy.clamp_total.value()
}

fn profile_diode() -> f32 {
    profile_of(&DIODE_OFF)
}

fn profile_zener() -> f32 {
    profile_of(&ZENER_OFF)
}

fn forward_drop() -> f32 {
    DiodeParams::SILICON
        .forward_drop(Amps::new(bb(0.43)).unwrap(), t25())
        .unwrap()
        .value()
}

fn thermometer() -> f32 {
    DiodeParams::SILICON
        .junction_temperature(Amps::new(bb(1e-3)).unwrap(), Volts::new(bb(0.575)).unwrap())
        .unwrap()
        .kelvin()
}

fn winding_temperature() -> f32 {
    valve()
        .winding_temperature(Ohms::new(bb(64.8)).unwrap())
        .unwrap()
        .kelvin()
}

#[cfg(feature = "micromath")]
fn fast_forward_drop() -> f32 {
    kickguard::fast::forward_drop(&DiodeParams::SILICON, Amps::new(bb(0.43)).unwrap(), t25())
        .unwrap()
        .value()
}

#[cfg(feature = "micromath")]
fn fast_constant_time() -> f32 {
    kickguard::fast::constant_clamp_time(bb(&*CLAMP), Amps::new(bb(0.0)).unwrap())
        .unwrap()
        .value()
}

/// Seven windows, built at compile time as a firmware would from generated constants.
static WINDOWS: kickguard::diagnosis::Windows = {
    use kickguard::diagnosis::classify::{Entry, Windows};
    use kickguard::diagnosis::Condition::*;
    const fn e(lo: u32, condition: kickguard::diagnosis::Condition) -> Entry {
        Entry {
            lo,
            hi: lo + 50,
            condition,
        }
    }
    Windows::from_entries(
        [
            e(10, Healthy),
            e(110, ClampOpen),
            e(210, ZenerShorted),
            e(410, CoilOpen),
            e(510, ShortedTurns),
            e(610, CoilTooHot),
        ],
        6,
    )
};

/// The harness alone: a call through the case table with one black-boxed input. Its count is
/// subtracted from every other case (the "net" column).
fn empty() -> f32 {
    bb(1.0f32)
}

/// Worst case for the verdict: a reading outside every window scans all seven.
fn verdict() -> f32 {
    match bb(&WINDOWS).classify(bb(95u32)) {
        kickguard::diagnosis::Verdict::Unexplained => 1.0,
        _ => 0.0,
    }
}

/// Every measured call.
pub const CASES: &[Case] = &[
    Case {
        name: "harness overhead (empty call)",
        target: None,
        run: empty,
    },
    Case {
        name: "verdict on a measured decay (6 windows, worst case)",
        target: Some(50),
        run: verdict,
    },
    Case {
        name: "closed-form decay time (ConstantClamp::time_to)",
        target: Some(300),
        run: constant_time,
    },
    Case {
        name: "closed-form clamp energy (ConstantClamp::decay_to)",
        target: Some(300),
        run: constant_energy,
    },
    Case {
        name: "SwitchOff::new + decay_to, avalanche (closed form)",
        target: None,
        run: switch_off_avalanche,
    },
    Case {
        name: "full diode-law decay_to, I0 to I0/100",
        target: Some(20_000),
        run: diode_law_decay,
    },
    Case {
        name: "full diode-law decay_to, I0 to I0/1e5",
        target: Some(20_000),
        run: diode_law_decay_deep,
    },
    Case {
        name: "one-pass profile, diode law: 3 times + energies",
        target: Some(6_000),
        run: profile_diode,
    },
    Case {
        name: "one-pass profile, zener (SPICE) + diode: 3 times + energies",
        target: Some(6_000),
        run: profile_zener,
    },
    Case {
        name: "diode forward drop",
        target: None,
        run: forward_drop,
    },
    Case {
        name: "junction temperature from drop",
        target: None,
        run: thermometer,
    },
    Case {
        name: "winding temperature from R",
        target: None,
        run: winding_temperature,
    },
    #[cfg(feature = "micromath")]
    Case {
        name: "fast::forward_drop (micromath)",
        target: None,
        run: fast_forward_drop,
    },
    #[cfg(feature = "micromath")]
    Case {
        name: "fast::constant_clamp_time (micromath)",
        target: None,
        run: fast_constant_time,
    },
];
