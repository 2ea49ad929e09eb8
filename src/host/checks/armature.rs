//! The moving armature: does it pull in at every corner, when is it seated, does the hold wait
//! for it, and can the ADC see it move — with the detector's thresholds emitted.
//!
//! The corners are the library's ([`crate::armature::sizing`]): eleven axes, the mechanics and
//! both inductances over their tolerances, the driver's supply range, and the coil's resistance
//! from its coldest winding at the low tolerance to its hottest at the high one.

use super::{ticks_up, Check, Constant, Corner, Outcome, Status, Unit};
use crate::armature::sizing::{
    confirm_amps, detector_for, pull_in_window_keeping, run_for, sampled_dip_min_at, Adc,
    CornerTurns, DriveRange, NotDetectable, PullInWindow,
};
use crate::host::board::{ArmatureBoard, Board, DriverBoard};
use crate::host::corners::Axis;
use crate::host::engine::DriverRun;
use crate::host::HostError;
use crate::units::{Hertz, Ohms, Seconds, Temperature};
use std::format;
use std::string::String;
use std::vec::Vec;

/// The armature's checks and constants, if the driver has an armature section.
///
/// # Errors
/// A model refusal (a corner the integrator cannot finish), located at the section.
pub fn checks(board: &Board, run: &DriverRun, out: &mut Outcome) -> Result<(), HostError> {
    let d = &run.d;
    let Some(a) = d.armature.as_ref() else {
        return Ok(());
    };
    let field = format!("{}.armature", d.field);
    let fault = |e: crate::Error| board.fault(&field, format!("{e}"));
    let drive = drive_range(run).map_err(fault)?;
    let duration = Seconds::new(
        30.0 * a.nominal.inductance.seat.value() * (1.0 + a.tol.l_seat)
            / drive.resistance_min.value(),
    )
    .map_err(fault)?;
    let run_a = run_for(&a.adc, duration).map_err(fault)?;
    let confirm = confirm_amps(&a.adc).map_err(fault)?;
    let mut turns = std::vec![CornerTurns::default(); 2048];
    let (w, kept) = pull_in_window_keeping(&a.nominal, &a.tol, &drive, &run_a, confirm, &mut turns)
        .map_err(fault)?;
    turns.truncate(kept);
    pulls_in(board, d, &w, duration, out)?;
    hold_waits(board, d, &w, &drive, out);
    let slower = least_rate(a, &drive, duration, &w, &turns).map_err(fault)?;
    detectable(d, a, &w, &slower, out).map_err(fault)?;
    super::armature_release::checks(board, run, a, out)
}

/// Supply range and coil resistance from the coldest winding at −tolerance to the hottest at
/// +tolerance.
fn drive_range(run: &DriverRun) -> Result<DriveRange, crate::Error> {
    let d = &run.d;
    let (t_lo, t_hi) = run.space.range(Axis::Winding);
    let r = |t: f32, k: f32| -> Result<Ohms, crate::Error> {
        Ohms::new(d.coil.resistance(Temperature::from_celsius(t)?)?.value() * k)
    };
    Ok(DriveRange {
        supply_min: d.supply.min,
        supply_max: d.supply.max,
        resistance_min: r(t_lo, 1.0 - d.r_tol)?,
        resistance_max: r(t_hi, 1.0 + d.r_tol)?,
    })
}

/// The nine mechanical axes of a corner index in words (bits 0 … 8).
pub fn mechanical_words(k: u32) -> String {
    axes_words(k, 9)
}

/// The axes of a corner index in words.
fn corner_words(k: u32) -> String {
    axes_words(k, 11)
}

/// The first `n` axes of a corner index in words.
fn axes_words(k: u32, n: usize) -> String {
    const AXES: [(&str, &str, &str); 11] = [
        ("mass", "light", "heavy"),
        ("stroke", "short", "long"),
        ("preload", "low", "high"),
        ("spring rate", "low", "high"),
        ("load", "low", "high"),
        ("damping", "low", "high"),
        ("seated L", "low", "high"),
        ("open L", "low", "high"),
        ("fringe g0", "short", "long"),
        ("supply", "lowest", "highest"),
        ("coil", "cold, low R", "hot, high R"),
    ];
    let parts: Vec<String> = AXES
        .iter()
        .take(n)
        .enumerate()
        .map(|(b, (name, lo, hi))| format!("{name} {}", if k & (1 << b) == 0 { lo } else { hi }))
        .collect();
    parts.join(", ")
}

/// Pull-in at every corner, and the slowest seating.
fn pulls_in(
    board: &Board,
    d: &DriverBoard,
    w: &PullInWindow,
    duration: Seconds,
    out: &mut Outcome,
) -> Result<(), HostError> {
    if let Some(k) = w.not_seated {
        out.checks.push(
            Check::worded(&d.name, "armature_pull_in", "armature pull-in at every corner", Status::Fail, "does not seat", Corner::Stated(corner_words(k)))
                .noted(format!("at this corner the armature does not reach its seat within {:.0} ms of switch-on (30 seated time constants at the cold coil): the valve or relay does not operate; a stronger coil, a higher supply or a weaker spring", duration.value() * 1e3)),
        );
        return Ok(());
    }
    out.checks.push(
        Check::valued(&d.name, "armature_pull_in", "armature seated after switch-on (slowest corner)", w.seated.hi, Unit::Second, None, Corner::Stated("the slowest of 2048 corners".into()))
            .noted(format!(
                "moves {:.2} … {:.2} ms after switch-on, seated {:.2} … {:.2} ms; the dip {:.1} … {:.1} mA (a dynamic pull-in: the current the coil reaches while the armature moves, not only the static operate current)",
                w.motion_start.lo * 1e3, w.motion_start.hi * 1e3, w.seated.lo * 1e3, w.seated.hi * 1e3, w.dip.lo * 1e3, w.dip.hi * 1e3
            )),
    );
    out.constants.push(Constant::new(
        &d.module,
        "ARMATURE_SEATED_TICKS",
        ticks_up(board, w.seated.hi)?,
        "the armature is seated this long after switch-on at every corner (rounded up)",
    ));
    Ok(())
}

/// The hold must not start before the slowest armature seats; and what switching to hold at
/// the detected seat would save.
fn hold_waits(
    board: &Board,
    d: &DriverBoard,
    w: &PullInWindow,
    drive: &DriveRange,
    out: &mut Outcome,
) {
    let Some(pull_in) = out.constant(&d.module, "PULL_IN_TICKS") else {
        return;
    };
    if w.not_seated.is_some() {
        return;
    }
    let t_hold = pull_in as f32 / board.tick.value();
    let ok = t_hold >= w.seated.hi;
    out.checks.push(
        Check::worded(
            &d.name,
            "armature_before_hold",
            "full drive lasts until the armature seats",
            if ok { Status::Pass } else { Status::Fail },
            if ok { "seated first" } else { "hold starts too early" },
            Corner::Stated("the slowest corner".into()),
        )
        .noted(format!(
            "full drive for {:.2} ms (PULL_IN_TICKS); the slowest armature seats at {:.2} ms{}{}",
            t_hold * 1e3,
            w.seated.hi * 1e3,
            if ok {
                String::new()
            } else {
                String::from(": the hold current may not pull it in — drive fully until ARMATURE_SEATED_TICKS, or until the detector sees the seat")
            },
            adaptive(d, w, drive, t_hold)
        )),
    );
}

/// What a firmware that switches to hold when the detector sees the seat saves against the
/// fixed full drive: (t_hold − seated) of full drive, at most (V_max²/R_min − I_hold²·R_min)
/// times the longest of it per switch-on (each factor at its own extreme: an upper bound).
fn adaptive(d: &DriverBoard, w: &PullInWindow, drive: &DriveRange, t_hold: f32) -> String {
    let Some(h) = d.hold.as_ref() else {
        return String::new();
    };
    let (lo, hi) = (
        (t_hold - w.seated.hi).max(0.0),
        (t_hold - w.seated.lo).max(0.0),
    );
    let r = drive.resistance_min.value();
    let v = drive.supply_max.value();
    let p = v * v / r - h.hold.value() * h.hold.value() * r;
    let e = p.max(0.0) * hi;
    let rate = d.switching_rate.map_or(String::new(), |f| {
        format!(", {:.1} mW at {} Hz", e * f.value() * 1e3, f.value())
    });
    format!("; switching to hold when the detector sees the seat (Motion::Moved) instead saves up to {:.2} … {:.2} ms of full drive per switch-on (less the samples the detector takes to confirm the valley), at most {:.1} mJ of winding heat{rate}", lo * 1e3, hi * 1e3, e * 1e3)
}

/// Whether the ADC sees the motion, with the detector's constants.
fn detectable(
    d: &DriverBoard,
    a: &ArmatureBoard,
    w: &PullInWindow,
    slower: &str,
    out: &mut Outcome,
) -> Result<(), crate::Error> {
    let adc = &a.adc;
    let dip_counts = w.sampled_dip_min * adc.counts_per_amp;
    // The least gain that sees the smallest sampled dip at this rate: 4·(n + 1) + 1 counts.
    let need = 4 * (u32::from(adc.noise_counts) + 1) + 1;
    let least_gain = if w.sampled_dip_min > 0.0 {
        format!(
            "; the least gain that sees it at this rate and noise: {:.0} counts/A",
            need as f32 / w.sampled_dip_min
        )
    } else {
        String::new()
    };
    let least_gain = format!(
        "{least_gain}{slower}{}",
        slowest_rate(w.dip_duration_min, "dip", "peak to valley")
    );
    match detector_for(w, adc)? {
        Ok(cfg) => {
            out.checks.push(
                Check::worded(&d.name, "armature_detectable", "armature motion seen by the ADC", Status::Pass, "detectable", Corner::Stated("every corner".into()))
                    .noted(format!(
                        "the smallest dip as sampled at {:.0} Hz at any phase: {:.1} mA = {:.0} counts; with ±{} counts of noise the detector confirms a turn {} counts deep and calls a dip of {} counts motion; a stuck armature's plain rise never turns that far; verdict within {} samples (kickguard::armature::detect){least_gain}",
                        adc.rate.value(), w.sampled_dip_min * 1e3, dip_counts, adc.noise_counts, cfg.hysteresis, cfg.min_dip, cfg.window
                    )),
            );
            for (name, value, doc) in [
                ("ARMATURE_RISE_COUNTS", u32::from(cfg.rise), "DipConfig::rise: counts the current must rise before a turn counts"),
                ("ARMATURE_HYSTERESIS_COUNTS", u32::from(cfg.hysteresis), "DipConfig::hysteresis: the turn that confirms a peak or valley (above twice the noise)"),
                ("ARMATURE_MIN_DIP_COUNTS", u32::from(cfg.min_dip), "DipConfig::min_dip: the dip that means the armature moved"),
                ("ARMATURE_WINDOW_SAMPLES", cfg.window, "DipConfig::window: samples from switch-on to the verdict"),
                ("ARMATURE_FULL_SCALE_COUNTS", u32::from(cfg.full_scale), "DipConfig::full_scale: the first saturated count"),
            ] {
                out.constants.push(Constant::new(&d.module, name, value, doc));
            }
        }
        Err(why) => {
            let reason = match why {
                NotDetectable::DoesNotPullIn => String::from("some corner does not pull in (see armature_pull_in)"),
                NotDetectable::Saturates => format!("the largest current, {:.0} mA, reaches the ADC's full scale", w.current_max * 1e3),
                NotDetectable::DipTooSmall => format!("the smallest sampled dip is {:.0} counts; with ±{} counts of noise it needs {need} (more gain, a faster ADC, less noise){least_gain}", dip_counts, adc.noise_counts),
                NotDetectable::NoClimb => String::from("some corner's current does not climb far enough after its valley to confirm it"),
            };
            out.checks.push(
                Check::worded(
                    &d.name,
                    "armature_detectable",
                    "armature motion seen by the ADC",
                    Status::Warn,
                    "not detectable",
                    Corner::Stated("the worst corner".into()),
                )
                .noted(format!(
                    "{reason}; a stuck armature cannot be told from a moving one with this ADC"
                )),
            );
        }
    }
    Ok(())
}

/// The rate below which no ADC is sure to sample near both turning points: 1/(the shortest
/// time between them); empty when no corner shows them.
pub fn slowest_rate(duration_min: f32, what: &str, between: &str) -> String {
    if duration_min.is_finite() && duration_min > 0.0 {
        format!(
            "; the {what} lasts at least {:.2} ms {between} at every corner: an ADC below {:.0} Hz cannot be sure to sample near both (necessary, not sufficient: the detectability above is judged at the design's rate)",
            duration_min * 1e3,
            1.0 / duration_min
        )
    } else {
        String::new()
    }
}

/// The bisection's steps on the rate (in log space between the necessary bound and the
/// design's rate: at most a ratio of 5^(1/64) ≈ 1.03 left from a factor of 5).
const RATE_STEPS: u32 = 6;

/// The least ADC rate that still sees the motion at every corner, where the design's rate
/// does: bisection in log space between the rate the dip's duration requires (1/(t_v − t_p),
/// necessary) and the design's rate, each rate judged over every corner from the turning
/// points the design's search kept (their times do not depend on the rate; one short run per
/// corner and rate). Assumes the sampled dip shrinks as the rate falls (it does as each
/// sample's distance from the turning points grows); the rate reported is one judged
/// detectable, never interpolated. Empty where the design's rate does not see it. Work: at
/// most [`RATE_STEPS`] + 1 passes of one short run per seated corner.
fn least_rate(
    a: &ArmatureBoard,
    drive: &DriveRange,
    duration: Seconds,
    w: &PullInWindow,
    turns: &[CornerTurns],
) -> Result<String, crate::Error> {
    if detector_for(w, &a.adc)?.is_err() {
        return Ok(String::new());
    }
    let design = a.adc.rate.value();
    let sees = |rate: f32| -> Result<bool, crate::Error> {
        let adc = Adc {
            rate: Hertz::new(rate)?,
            ..a.adc
        };
        let run = run_for(&adc, duration)?;
        let sampled = sampled_dip_min_at(&a.nominal, &a.tol, drive, &run, turns)?;
        // The confirmation instant carries one sample period of the design's rate.
        let by = w.confirmed_by.map(|b| b - 1.0 / design + 1.0 / rate);
        let mut at = *w;
        at.sampled_dip_min = sampled;
        at.confirmed_by = by;
        Ok(detector_for(&at, &adc)?.is_ok())
    };
    let floor = 1.0 / w.dip_duration_min;
    if !(floor < design) {
        return Ok(String::new());
    }
    if sees(floor)? {
        return Ok(format!(
            "; the least ADC rate that sees it: {floor:.0} Hz, the bound the dip's duration sets (every corner judged at it)"
        ));
    }
    let (mut lo, mut hi) = (floor, design);
    for _ in 0..RATE_STEPS {
        let mid = crate::math::sqrt(lo * hi);
        if sees(mid)? {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    Ok(format!(
        "; the least ADC rate that sees it: {hi:.0} Hz (every corner judged at it; {lo:.0} Hz does not)"
    ))
}
