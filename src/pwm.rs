//! PWM peak-and-hold for valves and solenoids: pull-in time, hold duty, exact ripple, freewheel
//! dissipation, the frequency for a ripple target, the hysteretic variant, and the drift of the
//! hold current as the copper heats.
//!
//! Model: the coil (L, R) is driven from V during the on-time and freewheels through a path of
//! constant voltage V_f during the off-time (a diode's drop at the hold current, plus a zener's
//! voltage if one sits in the freewheel path). With τ = L/R:
//!
//! ```text
//! on:  L·di/dt = V − R·i      →  i → V/R       with time constant τ
//! off: L·di/dt = −(V_f + R·i)  →  i → −V_f/R   with time constant τ
//! ```
//!
//! In periodic steady state at duty D and period T, with a = e^(−DT/τ) and b = e^(−(1−D)T/τ)
//! (derived by matching the two exponential segments at their ends):
//!
//! ```text
//! I_max = [V·(1 − a) − V_f·a·(1 − b)] / (R·(1 − a·b))
//! I_min = [V·b·(1 − a) − V_f·(1 − b)] / (R·(1 − a·b))
//! ΔI    = (V + V_f)·(1 − a)·(1 − b) / (R·(1 − a·b))          (exact)
//! ΔI   ≈ (V + V_f)·D·(1 − D)·T / L                          (small ripple, T ≪ τ)
//! mean  = (D·V − (1 − D)·V_f) / R                             (exact: volt-second balance)
//! ```
//!
//! The constant-V_f model is exact for a zener-dominated path and, for a plain diode, uses the
//! diode law's drop at the hold current (the drop changes by N·Vt·ln(I_max/I_min) across the
//! ripple, a few mV for ripples of tens of percent).
//!
//! A zener or TVS in the freewheel path dissipates V_z·Q_off every PWM cycle: at 20 kHz that is
//! continuous power, not the single pulse of a switch-off. [`HoldOperatingPoint::freewheel_power`]
//! reports it, split between the diode and the zener. A switched freewheel
//! ([`crate::clamp::SwitchedFreewheel`]) bypasses the zener while holding and lets it clamp only
//! at the final turn-off.
//!
//! Every function takes its arguments in one order: the coil, the supply, the winding
//! temperature, the freewheel path, then the operating values (currents, frequency, duty).

use crate::coil::Coil;
use crate::diode::Diode;
use crate::error::{self, Error, Reason};
use crate::math;
use crate::solve::illinois;
use crate::units::{Amps, Duty, Hertz, Seconds, Temperature, Volts, Watts};

/// Time for the coil current to rise from zero to `i_target` when `supply` is applied: the RL
/// step response i(t) = (V/R)·(1 − e^(−t/τ)), so t = τ·ln(I∞/(I∞ − I)), with I∞ = V/R(T).
///
/// # Errors
/// `supply` ≤ 0 → [`Reason::NotPositive`] on `"supply voltage"`; `i_target` ≤ 0 →
/// [`Reason::NotPositive`] on `"pull-in current"`; `i_target` ≥ V/R(T) →
/// [`Reason::Unreachable`] on `"pull-in current"` (the supply cannot drive it); errors of
/// [`Coil::resistance`].
///
/// ```
/// use kickguard::{coil::Coil, pwm::time_to_current, Amps, Henries, Ohms, Temperature, Volts};
/// let t = Temperature::from_celsius(20.0)?;
/// let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t)?;
/// let ms = time_to_current(&valve, Volts::new(24.0)?, t, Amps::new(0.3)?)?;
/// assert!((ms.value() - 0.00625 * (0.42857f32 / (0.42857 - 0.3)).ln()).abs() < 1e-5);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn time_to_current(
    coil: &Coil,
    supply: Volts,
    t: Temperature,
    i_target: Amps,
) -> Result<Seconds, Error> {
    let vs = error::positive("supply voltage", supply.value())?;
    let i = i_target.value();
    if !(i > 0.0) {
        return Err(Error::new("pull-in current", Reason::NotPositive));
    }
    let r = coil.resistance(t)?.value();
    let i_inf = vs / r;
    if !(i < i_inf) {
        return Err(Error::new("pull-in current", Reason::Unreachable));
    }
    let tau = coil.inductance().value() / r;
    // ln(I∞/(I∞ − I)) = −ln(1 − I/I∞), accurate for small I/I∞ with ln_1p.
    Seconds::new(-tau * math::ln_1p(-i / i_inf))
}

/// The freewheel path during the PWM off-time: a diode's drop (plus a bypass switch's, if any)
/// and, optionally, a zener in series. Built only through [`Freewheel::new`], so both voltages
/// are always physical.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Freewheel {
    diode_drop: Volts,
    zener: Volts,
}

impl Freewheel {
    /// A freewheel path of a diode dropping `diode_drop` at the hold current (0 < V_D ≤ 10 V),
    /// in series with a zener or TVS at `zener` (0 V if none, at most 10 kV).
    ///
    /// # Errors
    /// `diode_drop` ≤ 0 → [`Reason::NotPositive`], above 10 V → [`Reason::OutsideValidatedRange`],
    /// on `"diode drop"`; `zener` < 0 → [`Reason::Negative`], above 10 kV →
    /// [`Reason::OutsideValidatedRange`], on `"freewheel zener"`.
    pub fn new(diode_drop: Volts, zener: Volts) -> Result<Self, Error> {
        let vd = diode_drop.value();
        if !(vd > 0.0) {
            return Err(Error::new("diode drop", Reason::NotPositive));
        }
        if vd > Diode::MAX_FIXED_DROP_V {
            return Err(Error::new("diode drop", Reason::OutsideValidatedRange));
        }
        let vz = zener.value();
        if !(vz >= 0.0) {
            return Err(Error::new("freewheel zener", Reason::Negative));
        }
        if vz > crate::breakdown::MAX_BREAKDOWN_V {
            return Err(Error::new("freewheel zener", Reason::OutsideValidatedRange));
        }
        Ok(Freewheel { diode_drop, zener })
    }

    /// A plain diode path.
    ///
    /// # Errors
    /// As [`Freewheel::new`].
    pub fn diode(diode_drop: Volts) -> Result<Self, Error> {
        Freewheel::new(diode_drop, Volts::raw(0.0))
    }

    /// The diode's drop.
    pub fn diode_drop(&self) -> Volts {
        self.diode_drop
    }

    /// The zener's voltage (0 V without one).
    pub fn zener(&self) -> Volts {
        self.zener
    }

    fn v_f(&self) -> f32 {
        self.diode_drop.value() + self.zener.value()
    }
}

/// A PWM hold: supply, coil at a temperature, freewheel path, frequency and duty.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct HoldOperatingPoint {
    v: f32,
    r: f32,
    l: f32,
    fw: Freewheel,
    period: f32,
    duty: f32,
}

/// Ripple and extremes of a hold operating point.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Ripple {
    /// Peak current, at the end of the on-time.
    pub i_max: Amps,
    /// Valley current, at the end of the off-time.
    pub i_min: Amps,
    /// I_max − I_min, exact.
    pub peak_to_peak: Amps,
    /// The small-ripple approximation (V + V_f)·D·(1 − D)·T/L, for comparison.
    pub small_ripple_estimate: Amps,
}

/// Power dissipated in the freewheel path, averaged over a PWM period.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FreewheelPower {
    /// In the diode: V_D·Q_off/T.
    pub diode: Watts,
    /// In the zener (zero without one): V_z·Q_off/T, every cycle.
    pub zener: Watts,
}

/// Duty that holds a mean current of `i_hold` at `supply` with the winding at `t`, from
/// volt-second balance: D = (I·R + V_f)/(V + V_f).
///
/// # Errors
/// `supply` ≤ 0 → [`Reason::NotPositive`] on `"supply voltage"`; `i_hold` ≤ 0 →
/// [`Reason::NotPositive`] on `"hold current"`; a duty above 1 → [`Reason::Unreachable`] on
/// `"hold current"` (above what the supply can drive); errors of [`Coil::resistance`].
///
/// ```
/// use kickguard::pwm::{hold_duty, Freewheel};
/// use kickguard::{coil::Coil, Amps, Henries, Ohms, Temperature, Volts};
/// let t = Temperature::from_celsius(20.0)?;
/// let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t)?;
/// let fw = Freewheel::diode(Volts::new(0.8)?)?;
/// let d = hold_duty(&valve, Volts::new(24.0)?, t, &fw, Amps::new(0.15)?)?;
/// assert!((d.value() - (0.15 * 56.0 + 0.8) / 24.8).abs() < 1e-6);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn hold_duty(
    coil: &Coil,
    supply: Volts,
    t: Temperature,
    fw: &Freewheel,
    i_hold: Amps,
) -> Result<Duty, Error> {
    let vs = error::positive("supply voltage", supply.value())?;
    let i = i_hold.value();
    if !(i > 0.0) {
        return Err(Error::new("hold current", Reason::NotPositive));
    }
    let r = coil.resistance(t)?.value();
    let d = (i * r + fw.v_f()) / (vs + fw.v_f());
    if !(d <= 1.0) {
        return Err(Error::new("hold current", Reason::Unreachable));
    }
    Duty::new(d)
}

/// Mean coil current of a voltage-mode hold at a fixed `duty`, exact in periodic steady state:
/// (D·V − (1 − D)·V_f)/R(T) (volt-second balance; it does not depend on the frequency).
///
/// # Errors
/// As [`HoldOperatingPoint::new`] and [`HoldOperatingPoint::mean_current`].
pub fn mean_hold_current(
    coil: &Coil,
    supply: Volts,
    t: Temperature,
    fw: &Freewheel,
    duty: Duty,
) -> Result<Amps, Error> {
    // The mean does not depend on the frequency: any valid one will do.
    HoldOperatingPoint::new(coil, supply, t, fw, Hertz::raw(1.0), duty)?.mean_current()
}

impl HoldOperatingPoint {
    /// A hold at `supply`, coil winding at `t`, freewheel path `fw`, PWM `frequency`, `duty`
    /// (0 < D < 1).
    ///
    /// # Errors
    /// `supply` ≤ 0 → [`Reason::NotPositive`] on `"supply voltage"`; `duty` of 0 or 1 →
    /// [`Reason::OutsideValidatedRange`] on `"duty"`; a period beyond the quantity bounds →
    /// [`Reason::TooLarge`] on `"period"`; errors of [`Coil::resistance`].
    pub fn new(
        coil: &Coil,
        supply: Volts,
        t: Temperature,
        fw: &Freewheel,
        frequency: Hertz,
        duty: Duty,
    ) -> Result<Self, Error> {
        let vs = error::positive("supply voltage", supply.value())?;
        let d = duty.value();
        if !(d > 0.0 && d < 1.0) {
            return Err(Error::new("duty", Reason::OutsideValidatedRange));
        }
        Ok(HoldOperatingPoint {
            v: vs,
            r: coil.resistance(t)?.value(),
            l: coil.inductance().value(),
            fw: *fw,
            period: frequency.period()?.value(),
            duty: d,
        })
    }

    /// Mean coil current, exact: (D·V − (1 − D)·V_f)/R.
    ///
    /// # Errors
    /// A mean at or below zero (duty too low to sustain any current: the model's assumption of
    /// continuous conduction fails) → [`Reason::OutsideValidatedRange`] on `"duty"`.
    pub fn mean_current(&self) -> Result<Amps, Error> {
        let m = (self.duty * self.v - (1.0 - self.duty) * self.fw.v_f()) / self.r;
        if !(m > 0.0) {
            return Err(Error::new("duty", Reason::OutsideValidatedRange));
        }
        Amps::new(m)
    }

    /// (1 − a, 1 − b, 1 − a·b), computed with expm1 so a short period stays accurate.
    fn factors(&self) -> (f32, f32, f32) {
        let tau = self.l / self.r;
        let on = self.duty * self.period / tau;
        let off = (1.0 - self.duty) * self.period / tau;
        (
            -math::exp_m1(-on),
            -math::exp_m1(-off),
            -math::exp_m1(-(on + off)),
        )
    }

    /// Exact periodic-steady-state ripple, and the small-ripple estimate beside it.
    ///
    /// # Errors
    /// A valley current below zero (discontinuous conduction, outside the model) →
    /// [`Reason::OutsideValidatedRange`] on `"duty"`; figures beyond the quantity bounds → the
    /// errors of [`Amps::new`].
    pub fn ripple(&self) -> Result<Ripple, Error> {
        let (one_a, one_b, one_ab) = self.factors();
        let (a, vf) = (1.0 - one_a, self.fw.v_f());
        let den = self.r * one_ab;
        let i_max = (self.v * one_a - vf * a * one_b) / den;
        let pp = (self.v + vf) * one_a * one_b / den;
        let i_min = i_max - pp;
        if !(i_min >= 0.0) {
            return Err(Error::new("duty", Reason::OutsideValidatedRange));
        }
        let small = (self.v + vf) * self.duty * (1.0 - self.duty) * self.period / self.l;
        Ok(Ripple {
            i_max: Amps::new(i_max)?,
            i_min: Amps::new(i_min)?,
            peak_to_peak: Amps::new(pp)?,
            small_ripple_estimate: Amps::new(small)?,
        })
    }

    /// Power in the freewheel path, averaged over a period: V·Q_off/T for the diode and the
    /// zener, with Q_off = −(V_f/R)·t_off + (I_max + V_f/R)·τ·(1 − b) the charge of the off-time.
    ///
    /// # Errors
    /// As [`HoldOperatingPoint::ripple`].
    pub fn freewheel_power(&self) -> Result<FreewheelPower, Error> {
        let rp = self.ripple()?;
        let (_, one_b, _) = self.factors();
        let vf = self.fw.v_f();
        let tau = self.l / self.r;
        let t_off = (1.0 - self.duty) * self.period;
        let q_off = -(vf / self.r) * t_off + (rp.i_max.value() + vf / self.r) * tau * one_b;
        // Q_off ≥ 0 in continuous conduction (the current is ≥ 0 through the off-time).
        let per_volt = q_off.max(0.0) / self.period;
        Ok(FreewheelPower {
            diode: Watts::new(self.fw.diode_drop.value() * per_volt)?,
            zener: Watts::new(self.fw.zener.value() * per_volt)?,
        })
    }

    /// Lowest PWM frequency at which the exact peak-to-peak ripple is at most `max_ripple`, at
    /// this duty. The ripple falls monotonically with frequency; the small-ripple estimate
    /// f ≈ (V + V_f)·D·(1 − D)/(L·ΔI) over-states the exact ripple, so it bounds the answer from
    /// above, and a bracketed solve (Illinois, ≤ 60 steps, 1e-5 relative) finds the exact one.
    ///
    /// # Errors
    /// `max_ripple` ≤ 0 → [`Reason::NotPositive`] on `"ripple target"`; a frequency outside the
    /// quantity bounds → the errors of [`Hertz::new`] on `"PWM frequency"`.
    pub fn frequency_for_ripple(&self, max_ripple: Amps) -> Result<Hertz, Error> {
        let target = max_ripple.value();
        if !(target > 0.0) {
            return Err(Error::new("ripple target", Reason::NotPositive));
        }
        let vf = self.fw.v_f();
        let f_hi = (self.v + vf) * self.duty * (1.0 - self.duty) / (self.l * target);
        let pp = |f: f32| -> f32 {
            let p = HoldOperatingPoint {
                period: 1.0 / f,
                ..*self
            };
            let (one_a, one_b, one_ab) = p.factors();
            (p.v + vf) * one_a * one_b / (p.r * one_ab) - target
        };
        // The exact ripple is below the estimate: search down to 1e-6 of the estimate.
        let f = illinois(
            |lf| pp(math::exp(lf)),
            math::ln(f_hi * 1e-6),
            math::ln(f_hi),
            1e-5,
            60,
        )
        .map(math::exp)
        .unwrap_or(f_hi * 1e-6);
        Hertz::new(f).map_err(|e| e.on("PWM frequency"))
    }

    /// Duty as a timer compare value for a counter period of `top` ticks, rounded **up** so the
    /// mean current is never below the target.
    ///
    /// # Errors
    /// `top` = 0 → [`Reason::NotPositive`] on `"timer period"`.
    pub fn compare_value(&self, top: u32) -> Result<u32, Error> {
        compare_value(Duty::raw(self.duty), top)
    }
}

/// Mean hold current at a fixed duty, with the winding cold and hot: the drift of a voltage-mode
/// PWM hold as the copper heats (R rises, so the current falls). `cold` and `hot` are each the
/// winding temperature and the freewheel path there (a diode's drop falls as it heats).
/// Returns (cold, hot).
///
/// # Errors
/// As [`mean_hold_current`].
///
/// ```
/// use kickguard::pwm::{hold_current_drift, Freewheel};
/// use kickguard::{coil::Coil, Duty, Henries, Ohms, Temperature, Volts};
/// let t20 = Temperature::from_celsius(20.0)?;
/// let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t20)?;
/// let fw = Freewheel::diode(Volts::new(0.8)?)?;
/// let (cold, hot) = hold_current_drift(&valve, Volts::new(24.0)?,
///     (Temperature::from_celsius(-10.0)?, fw), (Temperature::from_celsius(80.0)?, fw),
///     Duty::new(0.4)?)?;
/// assert!(hot < cold);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn hold_current_drift(
    coil: &Coil,
    supply: Volts,
    cold: (Temperature, Freewheel),
    hot: (Temperature, Freewheel),
    duty: Duty,
) -> Result<(Amps, Amps), Error> {
    Ok((
        mean_hold_current(coil, supply, cold.0, &cold.1, duty)?,
        mean_hold_current(coil, supply, hot.0, &hot.1, duty)?,
    ))
}

/// `duty` as a compare value for a counter of period `top` ticks, rounded up.
///
/// # Errors
/// `top` = 0 → [`Reason::NotPositive`] on `"timer period"`.
///
/// ```
/// use kickguard::{pwm::compare_value, Duty};
/// assert_eq!(compare_value(Duty::new(0.3783)?, 1600)?, 606);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn compare_value(duty: Duty, top: u32) -> Result<u32, Error> {
    if top == 0 {
        return Err(Error::new("timer period", Reason::NotPositive));
    }
    // D ≤ 1: the product is at most `top`, and the cast cannot overflow.
    let c = libm::ceil(duty.value() as f64 * top as f64);
    Ok(if c > top as f64 { top } else { c as u32 })
}

/// A hysteretic (comparator) hold between `i_low` and `i_high`: on until I_high, off until I_low.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Hysteretic {
    /// On-time per cycle: τ·ln((V/R − I_low)/(V/R − I_high)).
    pub on_time: Seconds,
    /// Off-time per cycle: τ·ln((I_high + V_f/R)/(I_low + V_f/R)).
    pub off_time: Seconds,
    /// Resulting switching frequency 1/(t_on + t_off).
    pub frequency: Hertz,
    /// Resulting duty t_on/(t_on + t_off).
    pub duty: Duty,
    /// Mean current over a cycle (exact for the model).
    pub mean_current: Amps,
}

/// The hysteretic (comparator) variant: the frequency and duty that result from holding the
/// current between `i_low` and `i_high`.
///
/// Exact for the model: each phase is one exponential segment, and the charge of a segment is
/// (asymptote)·t ∓ τ·ΔI, so the mean is ((V/R)·t_on − (V_f/R)·t_off)/(t_on + t_off).
///
/// # Errors
/// `supply` ≤ 0 → [`Reason::NotPositive`] on `"supply voltage"`; `i_low` ≤ 0 →
/// [`Reason::NotPositive`] on `"lower threshold"`; `i_high` ≤ `i_low` →
/// [`Reason::NotIncreasing`] on `"upper threshold"`; `i_high` ≥ V/R(T) →
/// [`Reason::Unreachable`] on `"upper threshold"`; figures beyond the quantity bounds → the
/// constructors' errors.
pub fn hysteretic(
    coil: &Coil,
    supply: Volts,
    t: Temperature,
    fw: &Freewheel,
    i_low: Amps,
    i_high: Amps,
) -> Result<Hysteretic, Error> {
    let vs = error::positive("supply voltage", supply.value())?;
    let (lo, hi) = (i_low.value(), i_high.value());
    if !(lo > 0.0) {
        return Err(Error::new("lower threshold", Reason::NotPositive));
    }
    if !(hi > lo) {
        return Err(Error::new("upper threshold", Reason::NotIncreasing));
    }
    let r = coil.resistance(t)?.value();
    let i_inf = vs / r;
    if !(hi < i_inf) {
        return Err(Error::new("upper threshold", Reason::Unreachable));
    }
    let tau = coil.inductance().value() / r;
    let vf_r = fw.v_f() / r;
    let t_on = tau * math::ln((i_inf - lo) / (i_inf - hi));
    let t_off = tau * math::ln((hi + vf_r) / (lo + vf_r));
    let period = t_on + t_off;
    let mean = (i_inf * t_on - vf_r * t_off) / period;
    Ok(Hysteretic {
        on_time: Seconds::new(t_on)?,
        off_time: Seconds::new(t_off)?,
        frequency: Hertz::new(1.0 / period).map_err(|e| e.on("frequency"))?,
        duty: Duty::new(t_on / period)?,
        mean_current: Amps::new(mean)?,
    })
}
