//! The PWM peak-and-hold at one point: the duty this point needs, and what the firmware's
//! emitted duty does here (the current it holds, the ripple, the power in the freewheel parts).
//!
//! Models (library [`crate::pwm`]): volt-second balance for the duty and the mean current,
//! D = (I·R + V_f)/(V + V_f), exact in periodic steady state; the exact two-exponential
//! ripple; the freewheel path's voltage V_f is the diode's drop at the hold current (plus the
//! zener's voltage in a zener + diode clamp, which therefore burns power in every PWM cycle,
//! plus a resistor's drop at the hold current, plus the bypass switch's for a switched
//! freewheel). The time to the pull-in current is the coil's first-order rise at full drive.

use crate::clamp::SwitchedFreewheel;
use crate::error::{Error, Reason};
use crate::host::board::{ClampBoard, DriverBoard};
use crate::host::corners::{Axis, Point};
use crate::host::parts;
use crate::pwm::{self, Freewheel, HoldOperatingPoint};
use crate::units::{Amps, Duty, Hertz, Volts};

/// The hold as the firmware runs it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HoldPlan {
    /// The PWM frequency the timer produces.
    pub frequency: Hertz,
    /// The duty the emitted counts produce (0 < D < 1).
    pub duty: Duty,
}

/// The hold's figures at one point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HoldFigures {
    /// Duty this point needs to hold the target current; None when even 100 % cannot.
    pub duty_needed: Option<f32>,
    /// Mean current held with the emitted duty, A.
    pub held: f32,
    /// Peak-to-peak ripple with the emitted duty and frequency, A.
    pub ripple: f32,
    /// Power in the freewheel diode while holding, W.
    pub diode_power: f32,
    /// Power in the zener while holding (zero unless the zener is in the freewheel path), W.
    pub zener_power: f32,
    /// For a switched freewheel: what the zener would burn if it were not bypassed (at the
    /// duty that path would need for the same current), W.
    pub unbypassed_zener_power: Option<f32>,
    /// Time to the pull-in current at full drive, s; None when the supply cannot reach it.
    pub pull_in_time: Option<f32>,
    /// Power in the winding while holding, I²·R, W.
    pub coil_power: f32,
}

/// The freewheel path while holding at `p`.
///
/// # Errors
/// A clamp without a freewheel path across the coil → [`Reason::Inconsistent`] on `"clamp"`
/// (the board refuses such a hold); the library's refusals of the parts.
pub fn freewheel_at(d: &DriverBoard, i_hold: Amps, p: &Point) -> Result<Freewheel, Error> {
    let t_d = p.temperature(Axis::DiodeTemp)?;
    let t_b = p.temperature(Axis::BreakdownTemp)?;
    match &d.clamp {
        ClampBoard::Diode(dp) => {
            Freewheel::diode(parts::diode_at(dp, p)?.forward_drop(i_hold, t_d)?)
        }
        ClampBoard::ResistorDiode { resistor, diode } => {
            let v = parts::diode_at(diode, p)?
                .forward_drop(i_hold, t_d)?
                .value()
                + resistor.value() * i_hold.value();
            Freewheel::diode(Volts::new(v)?)
        }
        ClampBoard::ZenerDiode { zener, diode } => Freewheel::new(
            parts::diode_at(diode, p)?.forward_drop(i_hold, t_d)?,
            parts::breakdown_at(zener, p)?.voltage(i_hold, t_b)?,
        ),
        ClampBoard::SwitchedFreewheel {
            zener,
            diode,
            bypass,
        } => {
            let sw = SwitchedFreewheel {
                diode: parts::diode_at(diode, p)?,
                zener: parts::breakdown_at(zener, p)?,
                bypass: *bypass,
            };
            sw.hold_freewheel(i_hold, t_d)
        }
        _ => Err(Error::new("clamp", Reason::Inconsistent)),
    }
}

/// The duty `fw` needs at `p` to hold `i_hold`, None when more than 100 %.
fn needed(
    coil: &crate::coil::Coil,
    v: Volts,
    p: &Point,
    fw: &Freewheel,
    i_hold: Amps,
) -> Result<Option<f32>, Error> {
    match pwm::hold_duty(coil, v, p.temperature(Axis::Winding)?, fw, i_hold) {
        Ok(d) => Ok(Some(d.value())),
        Err(e) if e.reason == Reason::Unreachable => Ok(None),
        Err(e) => Err(e),
    }
}

/// The zener's power if the switched freewheel's zener stayed in the hold path.
fn unbypassed(
    d: &DriverBoard,
    coil: &crate::coil::Coil,
    v: Volts,
    i_hold: Amps,
    plan: &HoldPlan,
    p: &Point,
) -> Result<Option<f32>, Error> {
    let ClampBoard::SwitchedFreewheel { zener, diode, .. } = &d.clamp else {
        return Ok(None);
    };
    let t_d = p.temperature(Axis::DiodeTemp)?;
    let fw = Freewheel::new(
        parts::diode_at(diode, p)?.forward_drop(i_hold, t_d)?,
        parts::breakdown_at(zener, p)?.voltage(i_hold, p.temperature(Axis::BreakdownTemp)?)?,
    )?;
    let Some(duty) = needed(coil, v, p, &fw, i_hold)? else {
        return Ok(None);
    };
    let op = HoldOperatingPoint::new(
        coil,
        v,
        p.temperature(Axis::Winding)?,
        &fw,
        plan.frequency,
        Duty::new(duty)?,
    )?;
    Ok(Some(op.freewheel_power()?.zener.value()))
}

/// The hold's figures of driver `d` at `p` with the firmware's `plan`.
///
/// # Errors
/// The library's refusals at this point.
pub fn hold_at(d: &DriverBoard, plan: &HoldPlan, p: &Point) -> Result<HoldFigures, Error> {
    let Some(h) = d.hold.as_ref() else {
        return Err(Error::new("hold", Reason::Inconsistent));
    };
    let coil = parts::coil_at(d, p)?;
    let v = Volts::new(p.at(Axis::Supply))?;
    let t_w = p.temperature(Axis::Winding)?;
    let fw = freewheel_at(d, h.hold, p)?;
    let op = HoldOperatingPoint::new(&coil, v, t_w, &fw, plan.frequency, plan.duty)?;
    let held = op.mean_current()?.value();
    let power = op.freewheel_power()?;
    let pull_in_time = match pwm::time_to_current(&coil, v, t_w, h.pull_in) {
        Ok(t) => Some(t.value()),
        Err(e) if e.reason == Reason::Unreachable => None,
        Err(e) => return Err(e),
    };
    Ok(HoldFigures {
        duty_needed: needed(&coil, v, p, &fw, h.hold)?,
        held,
        ripple: op.ripple()?.peak_to_peak.value(),
        diode_power: power.diode.value(),
        zener_power: power.zener.value(),
        unbypassed_zener_power: unbypassed(d, &coil, v, h.hold, plan, p)?,
        pull_in_time,
        coil_power: held * held * coil.resistance(t_w)?.value(),
    })
}

/// The duty needed at `p` alone (for sizing, before the plan exists).
///
/// # Errors
/// The library's refusals at this point.
pub fn duty_needed_at(d: &DriverBoard, p: &Point) -> Result<Option<f32>, Error> {
    let Some(h) = d.hold.as_ref() else {
        return Ok(None);
    };
    let coil = parts::coil_at(d, p)?;
    let fw = freewheel_at(d, h.hold, p)?;
    needed(&coil, Volts::new(p.at(Axis::Supply))?, p, &fw, h.hold)
}

/// The lowest frequency that keeps the ripple within `max_ripple` at `p` with `duty`.
///
/// # Errors
/// The library's refusals at this point.
pub fn frequency_for_ripple_at(
    d: &DriverBoard,
    duty: Duty,
    max_ripple: Amps,
    p: &Point,
) -> Result<f32, Error> {
    let Some(h) = d.hold.as_ref() else {
        return Ok(0.0);
    };
    let coil = parts::coil_at(d, p)?;
    let fw = freewheel_at(d, h.hold, p)?;
    let op = HoldOperatingPoint::new(
        &coil,
        Volts::new(p.at(Axis::Supply))?,
        p.temperature(Axis::Winding)?,
        &fw,
        Hertz::new(1e3)?,
        duty,
    )?;
    Ok(op.frequency_for_ripple(max_ripple)?.value())
}
