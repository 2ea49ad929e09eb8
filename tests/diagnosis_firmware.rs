//! Diagnosis as the firmware lives it: separations in ticks, compensation by the measured
//! supply and on-current, learning a unit's own window, the fit with the clamp's slope, and the
//! flyback timed by a hardware counter.
//!
//! Sources named beside each check:
//! - The constant-clamp RL decay i(t) = (I₀ + V_c/R)·e^(−t/τ) − V_c/R (Horowitz & Hill, The Art
//!   of Electronics, 3rd ed.; the textbook first-order solution), for hand-computed windows.
//! - Robust statistics: the median absolute deviation scaled by 1.4826 estimates σ for normal
//!   data (common practice; from memory).
//! - `embedded-hal-mock` (crates.io) for the pins.

use kickguard::breakdown::{Breakdown, BreakdownLaw};
use kickguard::clamp::{Clamp, Side};
use kickguard::coil::Coil;
use kickguard::diagnosis::compensate::MeasuredAccuracy;
use kickguard::diagnosis::fit::fit_decay;
use kickguard::diagnosis::hal::{time_current_window, time_flyback, MeasureError, TickCounter};
use kickguard::diagnosis::learn::{LearnedWindow, Learner, Reading};
use kickguard::diagnosis::unit::{UnitLearner, UnitReading, UnitTable};
use kickguard::diagnosis::{
    Candidates, Condition, Design, Measurement, ShortedTurns, Timing, Verdict, Windows,
};
use kickguard::diode::Diode;
use kickguard::{Amps, Duty, Henries, Hertz, Ohms, PerKelvin, Seconds, Temperature, Volts};

fn tc(c: f32) -> Temperature {
    Temperature::from_celsius(c).unwrap()
}

/// A valve on a fixed-drop diode with a datasheet-line zener (affine loop: closed forms), fixed
/// resistance (no copper coefficient) so the hand calculation has one resistance per corner.
fn design(l_tol: f32, r_tol: f32) -> Design {
    let z = Breakdown::new(
        BreakdownLaw::Datasheet {
            vz: Volts::new(18.0).unwrap(),
            izt: Amps::new(0.01).unwrap(),
            rz: Ohms::new(0.0).unwrap(),
        },
        PerKelvin::ZERO,
        tc(25.0),
    )
    .unwrap();
    Design {
        coil: Coil::fixed(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap()).unwrap(),
        inductance_tolerance: l_tol,
        resistance_tolerance: r_tol,
        v_supply_min: Volts::new(24.0).unwrap(),
        v_supply_max: Volts::new(24.0).unwrap(),
        t_winding_min: tc(20.0),
        t_winding_max: tc(60.0),
        t_winding_fault_max: tc(100.0),
        t_clamp_min: tc(20.0),
        t_clamp_max: tc(60.0),
        clamp: Clamp::ZenerDiode {
            zener: z,
            diode: Diode::FixedDrop(Volts::new(0.8).unwrap()),
        },
        clamp_tolerance: 0.0,
        switch_avalanche: Breakdown::ideal(Volts::new(66.0).unwrap()).unwrap(),
        avalanche_tolerance: 0.0,
        shorted: ShortedTurns::Fraction(0.2),
        side: Side::Low,
    }
}

/// Closed-form time for the current to fall from i0 to i1 with constant clamp vc on L, R.
fn t_fall(l: f64, r: f64, vc: f64, i0: f64, i1: f64) -> f64 {
    (l / r) * ((i0 + vc / r) / (i1 + vc / r)).ln()
}

#[test]
fn tick_separations_count_rounding_and_jitter() {
    // Exact design (no tolerances): every window is a single time; healthy and open clamp by
    // hand for the current window 300 → 100 mA. Healthy clamp 18.8 V, open clamp 66 − 24 V.
    let d = design(0.0, 0.0);
    let m = Measurement::BetweenCurrents {
        upper: Amps::new(0.3).unwrap(),
        lower: Amps::new(0.1).unwrap(),
    };
    let (l, r) = (0.35, 56.0);
    let t_h = t_fall(l, r, 18.8, 0.3, 0.1);
    let t_o = t_fall(l, r, 42.0, 0.3, 0.1);
    for (f, jitter) in [(32_768.0f32, 2u32), (1.0e6, 2)] {
        let timing = Timing {
            tick: Hertz::new(f).unwrap(),
            guard: Duty::new(0.0).unwrap(),
            jitter_ticks: jitter,
        };
        let rep = d.tick_separations(&m, &timing).unwrap();
        let win = |t: f64| {
            (
                (t * f as f64).floor() as u32 - jitter,
                (t * f as f64).ceil() as u32 + jitter,
            )
        };
        assert_eq!((rep.healthy.lo, rep.healthy.hi), win(t_h), "{f} Hz");
        let open = rep
            .faults
            .iter()
            .find(|s| s.condition == Condition::ClampOpen)
            .unwrap();
        assert_eq!((open.window.lo, open.window.hi), win(t_o));
        assert_eq!(open.detectable, win(t_o).1 < win(t_h).0);
        assert_eq!(open.gap_ticks, win(t_h).0 as i64 - win(t_o).1 as i64 - 1);
    }
    // At 32.768 kHz the healthy decay (≈ 3.4 ms) and the open clamp (≈ 1.7 ms) are far apart;
    // make the ticks coarse enough and the jitter large enough and they meet.
    let coarse = Timing {
        tick: Hertz::new(1000.0).unwrap(),
        guard: Duty::new(0.0).unwrap(),
        jitter_ticks: 1,
    };
    let rep = d.tick_separations(&m, &coarse).unwrap();
    let open = rep
        .faults
        .iter()
        .find(|s| s.condition == Condition::ClampOpen)
        .unwrap();
    assert!(!open.detectable, "{open:?}");
}

#[test]
fn ambiguous_verdicts_name_their_candidates() {
    let rows = [[100, 200, 0], [10, 60, 1], [40, 90, 4]];
    let w = Windows::from_rows(&rows);
    match w.classify(50) {
        Verdict::Ambiguous(c) => {
            assert!(c.contains(Condition::ClampOpen) && c.contains(Condition::ShortedTurns));
            assert_eq!(c.count(), 2);
            assert_eq!(
                c,
                Candidates::NONE
                    .with(Condition::ClampOpen)
                    .with(Condition::ShortedTurns)
            );
        }
        v => panic!("{v:?}"),
    }
    // The fault-against-fault overlap is known before run time.
    let d = design(0.1, 0.07);
    let m = Measurement::BetweenCurrents {
        upper: Amps::new(0.3).unwrap(),
        lower: Amps::new(0.1).unwrap(),
    };
    let rep = d
        .tick_separations(
            &m,
            &Timing {
                tick: Hertz::new(10_000.0).unwrap(),
                guard: Duty::new(0.05).unwrap(),
                jitter_ticks: 2,
            },
        )
        .unwrap();
    for s in rep.faults.iter() {
        for o in rep.faults.iter().filter(|o| o.condition != s.condition) {
            assert_eq!(
                s.confused_with.contains(o.condition),
                s.window.overlaps(&o.window)
            );
        }
    }
}

/// The valve on a 20 … 28 V supply with R ± 20 %, L ± `l_tol` and a fixed 0.8 V freewheeling
/// diode, timed from 300 to 50 mA.
fn wide_valve(l_tol: f32) -> (Design, Measurement) {
    let mut d = design(l_tol, 0.2);
    d.v_supply_min = Volts::new(20.0).unwrap();
    d.v_supply_max = Volts::new(28.0).unwrap();
    d.clamp = Clamp::FreewheelDiode(Diode::FixedDrop(Volts::new(0.8).unwrap()));
    let m = Measurement::BetweenCurrents {
        upper: Amps::new(0.3).unwrap(),
        lower: Amps::new(0.05).unwrap(),
    };
    (d, m)
}

#[test]
fn compensation_narrows_the_healthy_window_and_shows_the_open_clamp() {
    // Supply 20 … 28 V and R ± 20 % spread the healthy decay so wide that the open clamp's
    // window overlaps it; measuring the supply and the on-current narrows each cell to what
    // those readings leave open.
    let (d, m) = wide_valve(0.05);
    let timing = Timing {
        tick: Hertz::new(32_768.0).unwrap(),
        guard: Duty::new(0.02).unwrap(),
        jitter_ticks: 2,
    };
    let plain = d.tick_separations(&m, &timing).unwrap();
    let acc = MeasuredAccuracy {
        supply: 0.01,
        current: 0.01,
        supply_step: 0.0,
        current_step: 0.0,
    };
    let supply = [22.0f32, 24.0, 26.0, 28.0].map(|v| Volts::new(v).unwrap());
    let current = [0.36f32, 0.40, 0.44, 0.48, 0.52, 0.56, 0.60].map(|a| Amps::new(a).unwrap());
    let comp = d
        .compensated_tick_windows(&m, &timing, &acc, supply, current)
        .unwrap();
    let width = |w: &Windows| w.healthy().map(|(lo, hi)| hi - lo);
    let full = plain.healthy.hi - plain.healthy.lo;
    let mut cells = 0;
    for row in &comp.windows {
        for w in row {
            if let Some(wd) = width(w) {
                cells += 1;
                assert!(
                    wd < full,
                    "a cell's healthy window ({wd}) is not narrower than the design's ({full})"
                );
            }
        }
    }
    assert!(cells >= 8, "{cells}");
    // A reading: 24 V, 0.43 A (R = 55.8 Ω), healthy decay by hand, and the open clamp's.
    let (l, r) = (0.35f64, 24.0 / 0.43);
    let healthy = t_fall(l, r, 0.8, 0.3, 0.05);
    let open = t_fall(l, r, 42.0, 0.3, 0.05);
    let tick = |t: f64| (t * 32_768.0).round() as u32;
    assert_eq!(
        comp.classify(24_000, 430_000, tick(healthy)),
        Verdict::Healthy
    );
    assert_eq!(
        comp.classify(24_000, 430_000, tick(open)),
        Verdict::Fault(Condition::ClampOpen)
    );
    // The resistance limit: no healthy winding reads above
    // R_max·(1 + ε_V + h_V/V_min)/(1 − ε_I − h_I/I_min) (arithmetic on V = I·R with each
    // reading off by its relative error and half its step): R_max = 56·1.2 Ω, V_min = 20 V,
    // I_min = V_min/R_max, half steps of the integer inputs 0.5 mV and 0.5 µA.
    let lim = d.resistance_limit(&acc).unwrap();
    let r_max = 56.0f64 * 1.2;
    let want = r_max * (1.01 + 0.0005 / 20.0) / (0.99 - 0.5e-6 / (20.0 / r_max));
    assert!(
        (lim.max_healthy_mohm as f64 - (want * 1000.0).ceil()).abs() <= 1.0,
        "{} vs {}",
        lim.max_healthy_mohm,
        want * 1000.0
    );
    assert!(lim.exceeded(24_000, 300_000) && !lim.exceeded(24_000, 400_000));
}

/// The unit learner's table on the compensation test's valve: supply 20 … 28 V, R ± 20 %,
/// L ± `l_tol`, a fixed-drop freewheeling diode, the current window 300 → 50 mA at 1 MHz.
fn unit_valve(l_tol: f32, guard: f32) -> UnitTable<8, 15> {
    let (d, m) = wide_valve(l_tol);
    let timing = Timing {
        tick: Hertz::new(1.0e6).unwrap(),
        guard: Duty::new(guard).unwrap(),
        jitter_ticks: 2,
    };
    let acc = MeasuredAccuracy {
        supply: 0.01,
        current: 0.01,
        supply_step: 0.0,
        current_step: 0.0,
    };
    // Supply bins of 1 V, current bins of 20 mA: narrow cells, a tight unit window.
    let supply: [Volts; 8] = core::array::from_fn(|k| Volts::new(21.0 + k as f32).unwrap());
    let current: [Amps; 15] = core::array::from_fn(|k| Amps::new(0.34 + 0.02 * k as f32).unwrap());
    d.unit_table(&m, &timing, &acc, supply, current).unwrap()
}

/// The firmware's readings of a unit of inductance `l` and resistance `r` at supply `v`: the
/// supply in mV, the on-current V/R in µA, and the decay from 300 to 50 mA in 1 µs ticks by the
/// constant-clamp closed form (Horowitz & Hill) with the diode's 0.8 V.
fn unit_reading(l: f64, r: f64, v: f64) -> (u32, u32, u32) {
    let t = t_fall(l, r, 0.8, 0.3, 0.05);
    (
        (v * 1e3).round() as u32,
        (v / r * 1e6).round() as u32,
        (t * 1e6).round() as u32,
    )
}

#[test]
fn a_unit_learned_at_one_supply_holds_at_another() {
    let table = unit_valve(0.1, 0.02);
    assert_eq!(table.scale_ppm, (900_000, 1_100_000));
    assert_eq!(table.reading_halfwidth_ticks, 3);
    // This unit: L 9 % above nominal, R 60 Ω. It learns at 21 V, all eight readings there.
    let (l, r) = (0.35 * 1.09, 60.0);
    let mut u: UnitLearner<8> = UnitLearner::new(&table).unwrap();
    let (mv, ua, ticks) = unit_reading(l, r, 21.0);
    for k in 1..=8u16 {
        let want = if k < 8 {
            UnitReading::Learning { seen: k }
        } else {
            UnitReading::Learned
        };
        assert_eq!(u.observe(&table, mv, ua, ticks + u32::from(k % 2)), want);
    }
    // Judged at 27 V: the same unit, healthy; shorted turns (L·0.64, R·0.8) depart or fault.
    for v in [20.5, 23.0, 25.0, 27.0, 27.9] {
        let (mv, ua, ticks) = unit_reading(l, r, v);
        assert_eq!(
            u.observe(&table, mv, ua, ticks),
            UnitReading::Healthy,
            "{v} V"
        );
        let (mv, ua, ticks) = unit_reading(l * 0.64, r * 0.8, v);
        assert!(
            matches!(
                u.observe(&table, mv, ua, ticks),
                UnitReading::Departure | UnitReading::Fault(_)
            ),
            "shorted turns read healthy at {v} V"
        );
    }
    // A unit 9 % below nominal at 27 V: healthy by the design, not this unit.
    let (mv, ua, ticks) = unit_reading(0.35 * 0.91, r, 27.0);
    assert_eq!(
        table.design.classify(mv, ua, ticks),
        Verdict::Healthy,
        "the design admits it"
    );
    assert_eq!(u.observe(&table, mv, ua, ticks), UnitReading::Departure);

    // Persisted, restored, judged the same.
    let bytes = u.state_bytes().unwrap();
    let mut back: UnitLearner<8> = UnitLearner::resume(&table, &bytes).unwrap();
    assert_eq!(back.state(), u.state());
    let (mv, ua, ticks) = unit_reading(l, r, 24.0);
    assert_eq!(back.observe(&table, mv, ua, ticks), UnitReading::Healthy);
    // Any flipped bit is caught (the checksum, or the version and fingerprint it covers).
    for k in 0..bytes.len() {
        let mut bad = bytes;
        bad[k] ^= 0x10;
        assert!(UnitLearner::<8>::resume(&table, &bad).is_err(), "byte {k}");
    }
    // A state learned against another table (another guard) is refused.
    let other = unit_valve(0.1, 0.05);
    assert_ne!(other.fingerprint(), table.fingerprint());
    assert!(UnitLearner::<8>::resume(&other, &bytes).is_err());
    // Nothing learned, nothing to persist; a learner too small is refused.
    assert!(UnitLearner::<8>::new(&table)
        .unwrap()
        .state_bytes()
        .is_none());
    assert!(UnitLearner::<2>::new(&table).is_err());
}

#[test]
fn a_unit_learner_refuses_faults_and_two_units() {
    let table = unit_valve(0.3, 0.02);
    let mut u: UnitLearner<8> = UnitLearner::new(&table).unwrap();
    let r = 56.0;
    // Learning never starts from a fault: an open clamp (the switch's 66 V less the 24 V
    // supply across the coil) restarts it.
    let (mv, ua, _) = unit_reading(0.35, r, 24.0);
    let open = (t_fall(0.35, r, 42.0, 0.3, 0.05) * 1e6).round() as u32;
    let (_, _, ok) = unit_reading(0.35, r, 24.0);
    assert_eq!(
        u.observe(&table, mv, ua, ok),
        UnitReading::Learning { seen: 1 }
    );
    assert_eq!(
        u.observe(&table, mv, ua, open),
        UnitReading::Refused(Verdict::Fault(Condition::ClampOpen))
    );
    assert_eq!(
        u.observe(&table, mv, ua, ok),
        UnitReading::Learning { seen: 1 }
    );
    // Two readings each healthy for the design (L 25 % above and 25 % below nominal, same
    // conditions) that no single unit gives: refused, learning restarts.
    let (_, _, high) = unit_reading(0.35 * 1.25, r, 24.0);
    let (_, _, low) = unit_reading(0.35 * 0.75, r, 24.0);
    assert_eq!(table.design.classify(mv, ua, high), Verdict::Healthy);
    assert_eq!(table.design.classify(mv, ua, low), Verdict::Healthy);
    // (The nominal reading learned so far is itself 25 % from `high`: no unit gives both.)
    assert_eq!(u.observe(&table, mv, ua, high), UnitReading::NotOneUnit);
    assert_eq!(
        u.observe(&table, mv, ua, high),
        UnitReading::Learning { seen: 1 }
    );
    assert_eq!(u.observe(&table, mv, ua, low), UnitReading::NotOneUnit);
    assert_eq!(
        u.observe(&table, mv, ua, low),
        UnitReading::Learning { seen: 1 }
    );
    // Hostile readings: no panic, a verdict.
    for (mv, ua, t) in [
        (0, 0, 0),
        (u32::MAX, u32::MAX, u32::MAX),
        (24_000, 1, u32::MAX),
    ] {
        let _ = u.observe(&table, mv, ua, t);
    }
}

#[test]
fn learning_a_units_own_window() {
    let design_rows = [[100, 400, 0], [10, 60, 1]];
    let w = Windows::from_rows(&design_rows);
    // Normal-ish readings about 250 ± 3 ticks (a fixed pattern).
    let readings = [
        249u32, 252, 247, 251, 250, 253, 248, 250, 251, 249, 250, 252,
    ];
    let mut l: Learner<12> = Learner::new(w, 2).unwrap();
    // A faulty first reading is refused; learning does not start from it.
    assert_eq!(
        l.observe(30),
        Reading::Refused(Verdict::Fault(Condition::ClampOpen))
    );
    let mut learned = None;
    for (k, r) in readings.iter().enumerate() {
        match l.observe(*r) {
            Reading::Learning { seen } => assert_eq!(seen as usize, k + 1),
            Reading::Learned(win) => learned = Some(win),
            other => panic!("{other:?}"),
        }
    }
    let win = learned.unwrap();
    // Median 250, MAD 1 (|x − 250| sorted: 0,0,0,1,1,1,1,2,2,2,3,3 → lower middle 1): 250 ± (6 + 2).
    assert_eq!((win.lo, win.hi), (242, 258));
    assert_eq!(l.observe(251), Reading::Healthy);
    assert_eq!(l.observe(300), Reading::Departure); // healthy for the design, not for this unit
    assert_eq!(
        l.observe(40),
        Reading::Fault(Verdict::Fault(Condition::ClampOpen))
    );
    // Persisted and restored; a stored window outside the design's healthy one is refused.
    let bytes = win.to_bytes();
    assert_eq!(LearnedWindow::from_bytes(&bytes, &w).unwrap(), win);
    let wide = LearnedWindow { lo: 50, hi: 300 }.to_bytes();
    assert!(LearnedWindow::from_bytes(&wide, &w).is_err());
    let mut r: Learner<12> = Learner::resume(w, 2, win).unwrap();
    assert_eq!(r.observe(245), Reading::Healthy);
    // A learner too small to learn anything is refused.
    assert!(Learner::<2>::new(w, 2).is_err());
}

#[test]
fn fit_recovers_l_with_the_clamps_slope() {
    // Samples of an affine-loop decay L·di/dt = −(V₀ + (R + r_s)·i): τ = L/(R + r_s). With the
    // slope left out, L = τ·R is off by r_s/(R + r_s); with it, exact.
    let (l, r, rs, v0) = (0.35f64, 56.0f64, 20.0f64, 18.6f64);
    let rt = r + rs;
    let tau = l / rt;
    let i0 = 0.43f64;
    let s: Vec<Amps> = (0..40)
        .map(|k| {
            let t = k as f64 * 1e-4;
            Amps::new(((i0 + v0 / rt) * (-t / tau).exp() - v0 / rt) as f32).unwrap()
        })
        .collect();
    let f = fit_decay(&s, Seconds::new(1e-4).unwrap()).unwrap();
    let rec = f
        .recover(Ohms::new(r as f32).unwrap(), Ohms::new(rs as f32).unwrap())
        .unwrap();
    assert!(
        (rec.inductance.value() as f64 - l).abs() < 1e-3 * l,
        "{rec:?}"
    );
    assert!(
        (rec.clamp_voltage.value() as f64 - v0).abs() < 1e-2 * v0,
        "{rec:?}"
    );
    let naive = f.inductance(Ohms::new(r as f32).unwrap()).unwrap().value() as f64;
    assert!((naive / l - r / rt).abs() < 1e-3);
}

/// A counter the test steps: each read advances by a fixed number of ticks.
struct Steps {
    now: u32,
    per_read: u32,
}
impl TickCounter for Steps {
    fn ticks(&mut self) -> u32 {
        let t = self.now;
        self.now = self.now.wrapping_add(self.per_read);
        t
    }
}

#[test]
fn flyback_timed_by_a_hardware_counter() {
    use embedded_hal_mock::eh1::digital::{Mock as PinMock, State, Transaction as PinTx};
    // Drain comparator: high for three polls, each 7 ticks apart; the counter wraps on the way.
    let mut drive = PinMock::new(&[PinTx::set(State::Low)]);
    let mut sense = PinMock::new(&[
        PinTx::get(State::High),
        PinTx::get(State::High),
        PinTx::get(State::High),
        PinTx::get(State::Low),
    ]);
    let mut counter = Steps {
        now: u32::MAX - 10,
        per_read: 7,
    };
    // start read, then one read per poll: the low read sees 4 × 7 = 28 ticks elapsed.
    assert_eq!(
        time_flyback(&mut drive, &mut sense, &mut counter, 1000),
        Ok(28)
    );
    drive.done();
    sense.done();
    // Current window: upper falls at the 2nd poll, lower at the 3rd of its own.
    let mut drive = PinMock::new(&[PinTx::set(State::Low)]);
    let mut both = PinMock::new(&[
        PinTx::get(State::High),
        PinTx::get(State::Low),
        PinTx::get(State::High),
        PinTx::get(State::High),
        PinTx::get(State::Low),
    ]);
    let mut upper = both.clone();
    let mut counter = Steps {
        now: 0,
        per_read: 5,
    };
    assert_eq!(
        time_current_window(&mut drive, &mut upper, &mut both, &mut counter, 1000),
        Ok(15)
    );
    drive.done();
    both.done();
    // A counter that does not advance is reported as stalled after STALL_POLLS reads, whatever
    // the timeout (the largest one included): no hang.
    for timeout in [0u32, 1000, u32::MAX] {
        let mut drive = PinMock::new(&[PinTx::set(State::Low)]);
        let mut sense = AlwaysHigh(0);
        let mut stuck = Steps {
            now: 5,
            per_read: 0,
        };
        assert_eq!(
            time_flyback(&mut drive, &mut sense, &mut stuck, timeout),
            Err(MeasureError::Stalled)
        );
        assert_eq!(
            sense.0,
            u64::from(kickguard::diagnosis::hal::STALL_POLLS),
            "{timeout}"
        );
        drive.done();
    }
}

/// A comparator stuck high, counting its reads.
struct AlwaysHigh(u64);
impl embedded_hal::digital::ErrorType for AlwaysHigh {
    type Error = core::convert::Infallible;
}
impl embedded_hal::digital::InputPin for AlwaysHigh {
    fn is_high(&mut self) -> Result<bool, Self::Error> {
        self.0 += 1;
        Ok(true)
    }
    fn is_low(&mut self) -> Result<bool, Self::Error> {
        Ok(false)
    }
}

#[test]
fn proposed_comparator_by_hand() {
    // Healthy peak across the switch: 24 + 18 + 0.8 = 42.8 V; open clamp: the 66 V avalanche.
    // Midpoint 54.4 V, inside both with ±2 %. The open clamp reads the whole avalanche, to zero
    // current with 66 − 24 = 42 V across the coil: τ·ln(1 + I₀R/V) (the closed form of
    // `t_fall`); with jitter j and no guard the slowest separating timer is (2j + 1)/t.
    let d = design(0.0, 0.0);
    let timing = Timing {
        tick: Hertz::new(10_000.0).unwrap(),
        guard: Duty::new(0.0).unwrap(),
        jitter_ticks: 2,
    };
    let p = d
        .propose_comparator(&timing, 0.02)
        .unwrap()
        .expect("a threshold fits");
    assert!((p.healthy_peak_max.value() - 42.8).abs() < 1e-4, "{p:?}");
    assert!((p.open_peak_min.value() - 66.0).abs() < 1e-4, "{p:?}");
    assert!((p.threshold.value() - 54.4).abs() < 1e-4, "{p:?}");
    let t = t_fall(0.35, 56.0, 42.0, 24.0 / 56.0, 0.0);
    assert!(
        (p.open_reading.min.value() as f64 - t).abs() < 1e-4 * t,
        "{p:?} vs {t}"
    );
    assert_eq!(p.slowest_tick.value(), (5.0 / t).ceil() as f32);
    // At that timer the windows agree: healthy [0, 2], the open clamp clear of it.
    let slow = Timing {
        tick: p.slowest_tick,
        ..timing
    };
    let rep = d.tick_separations(&p.measurement(), &slow).unwrap();
    assert!(rep
        .faults
        .iter()
        .any(|f| f.condition == Condition::ClampOpen && f.detectable));
    // A switch avalanching at 46 V leaves 44.4 V ± 2 % room, not ± 5 %: none then; a bad
    // tolerance is a typed error naming it.
    let close = Design {
        switch_avalanche: Breakdown::ideal(Volts::new(46.0).unwrap()).unwrap(),
        ..d
    };
    let fits = close
        .propose_comparator(&timing, 0.02)
        .unwrap()
        .map(|p| p.threshold.value());
    assert!(fits.is_some_and(|v| (v - 44.4).abs() < 1e-4), "{fits:?}");
    assert_eq!(
        close
            .propose_comparator(&timing, 0.05)
            .unwrap()
            .map(|p| p.threshold),
        None
    );
    assert_eq!(
        d.propose_comparator(&timing, f32::NAN).unwrap_err().input,
        "comparator tolerance"
    );
    assert_eq!(
        d.propose_comparator(&timing, 0.5).unwrap_err().input,
        "comparator tolerance"
    );
}
