//! Values the design file asks kickguard to choose ("auto"), chosen against the worst corner:
//! the zener of a zener + diode clamp or a switched freewheel, and the PWM hold's frequency
//! and compare counts.
//!
//! - **Zener** (E24 series, IEC 60063): the largest standard voltage whose worst peak switch
//!   voltage over every vertex stays a margin (`voltage_margin`, default 10 %) below the
//!   switch's derated rating, so the coil releases as fast as the switch allows with room for
//!   what the model leaves out; when no value keeps that margin, the largest within the rating
//!   itself, said so; the window of values that also meet the release time is reported
//!   beside it. The peak switch voltage rises with V_Z at every vertex, so the
//!   feasible values are one interval and a scan from the top finds its upper end.
//! - **Hold duty**: the largest duty any vertex needs (lowest supply, hottest winding, highest
//!   R, highest freewheel drop: D = (I·R + V_f)/(V + V_f) rises with R and V_f and falls with
//!   V), rounded **up** to whole timer counts, so the current held is at least the target at
//!   every corner.
//! - **Hold frequency** ("auto"): the highest frequency any vertex needs to keep the ripple
//!   within its target at that duty, the timer period rounded **down** to whole counts so the
//!   frequency only rises.
//!
//! Work: the zener scan evaluates at most 24 × 4 candidates (1 V … 10 kV) at every vertex
//! (peak voltages only: no integration), plus one release sweep per candidate inside the
//! rating; the hold takes two sweeps of the vertices.

use super::board::{ClampBoard, DriverBoard};
use super::corners::Point;
use super::figures::hold::{duty_needed_at, frequency_for_ripple_at};
use super::figures::HoldPlan;
use super::parts;
use crate::error::Error;
use crate::units::{Duty, Hertz, Volts};

/// The E24 series of preferred values (IEC 60063), one decade.
pub const E24: [f32; 24] = [
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6,
    6.2, 6.8, 7.5, 8.2, 9.1,
];

/// The E24 values from 1 V up to 9.1 kV, ascending.
pub fn e24_values() -> impl Iterator<Item = f32> {
    [1.0f32, 10.0, 100.0, 1000.0]
        .into_iter()
        .flat_map(|d| E24.iter().map(move |m| m * d))
}

/// The smallest E24 value at or above `x` (for resistors: ohms, any decade from 1 Ω).
pub fn e24_at_least(x: f32) -> Option<f32> {
    let mut decade = 1.0f32;
    for _ in 0..12 {
        if let Some(v) = E24
            .iter()
            .map(|m| m * decade)
            .find(|v| *v >= x * (1.0 - 1e-6))
        {
            return Some(v);
        }
        decade *= 10.0;
    }
    None
}

/// The zener the sizing chose.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ZenerChoice {
    /// The chosen value (the largest that keeps the switch within its derated rating), or the
    /// smallest E24 value when none does.
    pub chosen: Volts,
    /// Whether any value keeps the switch within its derated rating.
    pub fits_rating: bool,
    /// Whether the chosen value also keeps the margin target below it.
    pub keeps_margin: bool,
    /// The chosen value's worst peak switch voltage, V.
    pub worst_peak: f32,
    /// The smallest E24 value that still meets the release time (None without a release
    /// requirement, or when even the chosen value misses it).
    pub smallest_for_release: Option<Volts>,
}

/// The driver with its zener set to `v`.
pub fn with_zener(d: &DriverBoard, v: Volts) -> DriverBoard {
    let mut out = d.clone();
    match &mut out.clamp {
        ClampBoard::ZenerDiode { zener, .. } | ClampBoard::SwitchedFreewheel { zener, .. } => {
            zener.voltage = Some(v)
        }
        _ => {}
    }
    out
}

/// Whether the driver's zener is to be sized.
pub fn zener_is_auto(d: &DriverBoard) -> bool {
    matches!(&d.clamp, ClampBoard::ZenerDiode { zener, .. } | ClampBoard::SwitchedFreewheel { zener, .. } if zener.voltage.is_none())
}

/// The worst peak switch voltage of `d` over `points`.
fn worst_peak(d: &DriverBoard, points: &[Point]) -> Result<f32, Error> {
    let mut worst = 0.0f32;
    for p in points {
        if let parts::Off::Engine(off) = parts::circuit_at(d, p)?.switch_off()? {
            worst = worst.max(off.peak_switch_voltage().value());
        }
    }
    Ok(worst)
}

/// Sizes the zener of `d` over `points`; `release_ok` tells whether a candidate driver meets
/// the release requirement at every point (always true without one).
///
/// # Errors
/// The library's refusals at a vertex.
pub fn size_zener(
    d: &DriverBoard,
    points: &[Point],
    release_ok: &dyn Fn(&DriverBoard) -> Result<bool, Error>,
) -> Result<ZenerChoice, Error> {
    let limit = d.switch.rating.value() * d.switch.derating.value();
    // Only values whose law holds at the bottom of the tolerance (rz·Izt below V_Z there).
    let valid = |v: f32| {
        d.clamp.breakdown().is_some_and(|p| {
            Volts::new(v * (1.0 - p.tol))
                .and_then(|low| p.device_at(low))
                .is_ok()
        })
    };
    let candidates: std::vec::Vec<f32> = e24_values().filter(|v| *v < limit && valid(*v)).collect();
    let target = limit * (1.0 - d.clamp.breakdown().map_or(0.0, |p| p.auto_margin));
    // The peak rises with V_Z, so from the top the first value within the target is the
    // largest; the first within the rating itself is the fallback.
    let (mut chosen, mut fallback) = (None, None);
    for v in candidates.iter().rev() {
        let peak = worst_peak(&with_zener(d, Volts::new(*v)?), points)?;
        if fallback.is_none() && peak <= limit {
            fallback = Some((*v, peak));
        }
        if peak <= target {
            chosen = Some((*v, peak));
            break;
        }
    }
    let keeps_margin = chosen.is_some();
    let Some((top, peak)) = chosen.or(fallback) else {
        return Ok(ZenerChoice {
            chosen: Volts::new(1.0)?,
            fits_rating: false,
            keeps_margin: false,
            worst_peak: 0.0,
            smallest_for_release: None,
        });
    };
    let mut smallest = None;
    for v in candidates.iter().rev().filter(|v| **v <= top) {
        if release_ok(&with_zener(d, Volts::new(*v)?))? {
            smallest = Some(Volts::new(*v)?);
        } else {
            break;
        }
    }
    Ok(ZenerChoice {
        chosen: Volts::new(top)?,
        fits_rating: true,
        keeps_margin,
        worst_peak: peak,
        smallest_for_release: smallest,
    })
}

/// The hold as the firmware will run it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HoldChoice {
    /// The largest duty any vertex needs; None when some vertex cannot hold even at 100 %.
    pub duty_needed: Option<f32>,
    /// The lowest frequency meeting the ripple target at every vertex, if "auto".
    pub frequency_needed: Option<f32>,
    /// The timer period in PWM-clock counts, with a PWM clock.
    pub period_counts: Option<u32>,
    /// The on-time in counts (with a PWM clock) or in parts per million of the period.
    pub on: u32,
    /// The plan, when the hold is feasible.
    pub plan: Option<HoldPlan>,
}

/// Sizes the hold of `d` over `points` with the timer clock `clock`.
///
/// # Errors
/// The library's refusals at a vertex.
pub fn size_hold(
    d: &DriverBoard,
    points: &[Point],
    clock: Option<Hertz>,
) -> Result<Option<HoldChoice>, Error> {
    let Some(h) = d.hold.as_ref() else {
        return Ok(None);
    };
    let mut duty = Some(0.0f32);
    for p in points {
        duty = match (duty, duty_needed_at(d, p)?) {
            (Some(a), Some(b)) => Some(a.max(b)),
            _ => None,
        };
    }
    let Some(dmax) = duty.filter(|x| *x < 1.0) else {
        return Ok(Some(HoldChoice {
            duty_needed: None,
            frequency_needed: None,
            period_counts: None,
            on: 0,
            plan: None,
        }));
    };
    let frequency_needed = match (h.frequency, h.max_ripple) {
        (None, Some(ripple)) => {
            let mut f = 0.0f32;
            for p in points {
                f = f.max(frequency_for_ripple_at(d, Duty::new(dmax)?, ripple, p)?);
            }
            Some(f)
        }
        _ => None,
    };
    let f_target = h
        .frequency
        .map_or(frequency_needed.unwrap_or(1e3), |f| f.value());
    Ok(Some(timer(
        dmax,
        f_target,
        h.frequency.is_none(),
        frequency_needed,
        clock,
    )?))
}

/// Whole timer counts for a duty and a frequency.
fn timer(
    dmax: f32,
    f: f32,
    auto: bool,
    frequency_needed: Option<f32>,
    clock: Option<Hertz>,
) -> Result<HoldChoice, Error> {
    let (period, on, duty, freq) = match clock {
        Some(c) => {
            let ratio = c.value() / f;
            let top = if auto {
                libm::floorf(ratio)
            } else {
                libm::roundf(ratio)
            }
            .max(1.0) as u32;
            let on = crate::pwm::compare_value(Duty::new(dmax)?, top)?;
            (
                Some(top),
                on,
                on as f32 / top as f32,
                c.value() / top as f32,
            )
        }
        None => {
            let ppm = libm::ceilf(dmax * 1e6) as u32;
            (None, ppm, ppm as f32 / 1e6, f)
        }
    };
    let plan = if duty > 0.0 && duty < 1.0 {
        Some(HoldPlan {
            frequency: Hertz::new(freq)?,
            duty: Duty::new(duty)?,
        })
    } else {
        None
    };
    Ok(HoldChoice {
        duty_needed: Some(dmax),
        frequency_needed,
        period_counts: period,
        on,
        plan,
    })
}
