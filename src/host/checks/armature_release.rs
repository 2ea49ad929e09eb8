//! The moving armature at switch-off: does it let go and reach its open stop at every corner,
//! when (the release time from the model, which sets `RELEASE_WAIT_TICKS` when it is the
//! longer), and can the ADC see the bump its departure puts on the decaying current — with the
//! release detector's thresholds emitted.
//!
//! The corners are the library's ([`crate::armature::release_sizing`]): the nine mechanical
//! axes at their ends crossed with two switch-offs of the driver's own corner box, the vertex
//! where the decay is slowest and the one where it is fastest (by the time to the datasheet's
//! release current where the coil has one, else by the time to 1 % of the on-current).

use super::{ticks_up, Bound, Check, Constant, Corner, Limit, Outcome, Status, Unit};
use crate::armature::release_sizing::{release_detector_for, release_window, ReleaseWindow};
use crate::armature::sizing::{confirm_amps, run_for, NotDetectable};
use crate::clamp::SwitchOff;
use crate::host::board::{ArmatureBoard, Board, DriverBoard};
use crate::host::engine::DriverRun;
use crate::host::parts::{circuit_at, Off};
use crate::host::HostError;
use crate::units::Seconds;
use std::format;
use std::string::String;
use std::vec::Vec;

/// The release checks and constants of a driver with an armature section.
///
/// # Errors
/// A model refusal (a corner the integrator cannot finish), located at the section; a wait
/// beyond the timer's range.
pub fn checks(
    board: &Board,
    run: &DriverRun,
    a: &ArmatureBoard,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let d = &run.d;
    let field = format!("{}.armature", d.field);
    let fault = |e: crate::Error| board.fault(&field, format!("{e}"));
    let Some(offs) = bounding_switch_offs(run).map_err(fault)? else {
        out.checks.push(
            Check::worded(&d.name, "armature_release", "armature release", Status::Warn, "not modelled", Corner::Stated("every corner".into()))
                .noted("the armature's release is modelled through a clamp's loop law; an RC snubber's switch-off is not: the release time and its detection are not judged"),
        );
        return Ok(());
    };
    let duration = Seconds::new(run_length(run, a)).map_err(fault)?;
    let run_a = run_for(&a.adc, duration).map_err(fault)?;
    let confirm = confirm_amps(&a.adc).map_err(fault)?;
    let w = release_window(&a.nominal, &a.tol, &offs, &run_a, confirm).map_err(fault)?;
    if let Some((k, j)) = w.not_opened {
        out.checks.push(
            Check::worded(&d.name, "armature_release", "armature opens after switch-off at every corner", Status::Fail, "does not open", Corner::Stated(format!("{}, the {} decay", super::armature::mechanical_words(k), if j == 0 { "slowest" } else { "fastest" })))
                .noted(format!("at this corner the armature does not reach its open stop within {:.0} ms of switch-off: the spring and load do not overcome what holds it, or the run ends first; the valve or relay may stay operated (a stronger spring, less load toward the seat, or check the model)", duration.value() * 1e3)),
        );
        return Ok(());
    }
    release_time(board, d, &w, out)?;
    detectable(d, a, &w, out).map_err(fault)?;
    Ok(())
}

/// The switch-offs at the vertices where the decay is slowest and fastest (None for a
/// snubber).
fn bounding_switch_offs(run: &DriverRun) -> Result<Option<Vec<SwitchOff>>, crate::Error> {
    let key = |k: usize| -> f32 {
        run.figures
            .get(k)
            .map_or(0.0, |f| f.release.unwrap_or(f.off_time))
    };
    let n = run.points.len().min(run.figures.len());
    let (mut slow, mut fast) = (0usize, 0usize);
    for k in 1..n {
        if key(k) > key(slow) {
            slow = k;
        }
        if key(k) < key(fast) {
            fast = k;
        }
    }
    let mut offs = Vec::new();
    let both = [slow, fast];
    let picked = if slow == fast { &both[..1] } else { &both[..] };
    for &k in picked {
        let Some(p) = run.points.get(k) else {
            continue;
        };
        match circuit_at(&run.d, p)?.switch_off()? {
            Off::Engine(off) => offs.push(off),
            Off::Snubber(_) => return Ok(None),
        }
    }
    Ok(Some(offs))
}

/// How long to integrate each release, s: three times the slowest decay to 1 % of the
/// on-current (the current that holds the armature falls within it, unless the armature holds
/// at a tiny current: then it rightly fails to open), plus three times a bound on the flight
/// over the stroke under the weakest opening force F (spring preload and load at their low
/// ends): √(2·m·s/F) without damping, plus c·s/F at the damping's terminal speed.
fn run_length(run: &DriverRun, a: &ArmatureBoard) -> f32 {
    let decay = run
        .figures
        .iter()
        .map(|f| f.off_time)
        .fold(0.0f32, f32::max);
    let (n, t) = (&a.nominal, &a.tol);
    let load_lo = n.load_n - n.load_n.abs() * t.load;
    let force = (n.preload_n * (1.0 - t.preload) + load_lo).max(1e-3);
    let mass = n.mass_kg * (1.0 + t.mass);
    let stroke = n.stroke_m * (1.0 + t.stroke);
    let damping = n.damping_n_s_per_m * (1.0 + t.damping);
    let flight = crate::math::sqrt(2.0 * mass * stroke / force) + damping * stroke / force;
    3.0 * decay + 3.0 * flight
}

/// The release time from the model, against the required release time; `RELEASE_WAIT_TICKS`
/// (and `REENERGISE_WAIT_TICKS`) raised to it when the datasheet's figure is shorter.
fn release_time(
    board: &Board,
    d: &DriverBoard,
    w: &ReleaseWindow,
    out: &mut Outcome,
) -> Result<(), HostError> {
    let limit = d.max_release_time.map(|t| Limit {
        value: t.value(),
        bound: Bound::AtMost,
        source: "required release time".into(),
    });
    let model = ticks_up(board, w.opened.hi)?;
    let datasheet = out.constant(&d.module, "RELEASE_WAIT_TICKS");
    let governs = match datasheet {
        Some(t) if t > model => format!("RELEASE_WAIT_TICKS stays at the datasheet-based {t} ticks (decay to the must-release current plus the mechanical release time), longer than the model's {model}: the longer wait is kept"),
        Some(t) => format!("RELEASE_WAIT_TICKS is the model's {model} ticks, replacing the datasheet-based {t}"),
        None => format!("RELEASE_WAIT_TICKS is the model's {model} ticks"),
    };
    out.set_constant(&d.module, "RELEASE_WAIT_TICKS", datasheet.unwrap_or(0).max(model), "wait from switch-off until the contacts are open (the armature at its open stop), worst corner, rounded up");
    let decay = out.constant(&d.module, "DECAY_WAIT_TICKS").unwrap_or(0);
    out.set_constant(&d.module, "REENERGISE_WAIT_TICKS", decay.max(datasheet.unwrap_or(0)).max(model), "wait from switch-off before re-energising or reversing: the longer of RELEASE_WAIT_TICKS and DECAY_WAIT_TICKS");
    out.checks.push(
        Check::valued(
            &d.name,
            "armature_release",
            "switch-off to armature open (model, slowest corner)",
            w.opened.hi,
            Unit::Second,
            limit,
            Corner::Stated(format!("the slowest of {} corners", w.corners)),
        )
        .noted(format!(
            "leaves its seat {:.2} … {:.2} ms after switch-off, open {:.2} … {:.2} ms; {governs}",
            w.release_start.lo * 1e3,
            w.release_start.hi * 1e3,
            w.opened.lo * 1e3,
            w.opened.hi * 1e3
        )),
    );
    Ok(())
}

/// Whether the ADC sees the release, with the release detector's constants.
fn detectable(
    d: &DriverBoard,
    a: &ArmatureBoard,
    w: &ReleaseWindow,
    out: &mut Outcome,
) -> Result<(), crate::Error> {
    let adc = &a.adc;
    let bump_counts = w.sampled_bump_min * adc.counts_per_amp;
    let rate = super::armature::slowest_rate(w.bump_duration_min, "bump", "valley to top");
    match release_detector_for(w, adc)? {
        Ok(cfg) => {
            out.checks.push(
                Check::worded(&d.name, "armature_release_detectable", "armature release seen by the ADC", Status::Pass, "detectable", Corner::Stated("every corner".into()))
                    .noted(format!(
                        "the smallest bump as sampled at {:.0} Hz at any phase: {:.1} mA = {:.0} counts (bump {:.1} … {:.1} mA); with ±{} counts of noise the detector (Polarity::Falling) calls a bump of {} counts release; a welded or stuck-closed armature's plain decay never turns that far; verdict within {} samples{rate}; this needs the ADC to see the coil's current after switch-off, a shunt in series with the coil (or in the clamp's return): a shunt that only the switch's current passes reads zero once it is off",
                        adc.rate.value(), w.sampled_bump_min * 1e3, bump_counts, w.bump.lo * 1e3, w.bump.hi * 1e3, adc.noise_counts, cfg.min_dip, cfg.window
                    )),
            );
            for (name, value, doc) in [
                ("ARMATURE_RELEASE_HYSTERESIS_COUNTS", u32::from(cfg.hysteresis), "release DipConfig::hysteresis and ::rise (Polarity::Falling): the turn that confirms the valley or the bump's top"),
                ("ARMATURE_RELEASE_MIN_BUMP_COUNTS", u32::from(cfg.min_dip), "release DipConfig::min_dip: the bump that means the armature left its seat"),
                ("ARMATURE_RELEASE_WINDOW_SAMPLES", cfg.window, "release DipConfig::window: samples from switch-off to the verdict"),
            ] {
                out.constants.push(Constant::new(&d.module, name, value, doc));
            }
        }
        Err(why) => {
            let reason = match why {
                NotDetectable::DoesNotPullIn => String::from("some corner does not open (see armature_release)"),
                NotDetectable::Saturates => format!("the start current, up to {:.0} mA, reaches the ADC's full scale", w.current_max * 1e3),
                NotDetectable::DipTooSmall => format!("the smallest sampled bump is {bump_counts:.0} counts (bump {:.1} … {:.1} mA): with ±{} counts of noise it needs {}; at some corner the current falls through the whole flight (the clamp's decay outpaces the inductance's drop: a fast clamp, or a flight slow against the coil's L/R); a slower clamp, or more gain and a faster ADC where a bump exists, would show it", w.bump.lo * 1e3, w.bump.hi * 1e3, adc.noise_counts, 4 * (u32::from(adc.noise_counts) + 1) + 1),
                NotDetectable::NoClimb => String::from("some corner's current does not fall far enough below its bump's top to confirm it"),
            };
            out.checks.push(
                Check::worded(&d.name, "armature_release_detectable", "armature release seen by the ADC", Status::Warn, "not detectable", Corner::Stated("the worst corner".into()))
                    .noted(format!("{reason}; a welded or stuck-closed armature cannot be told from a released one with this ADC at switch-off{rate}")),
            );
        }
    }
    Ok(())
}
