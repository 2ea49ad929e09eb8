//! The series resistor: the smallest that keeps injection within limits, the largest the input
//! can take, and the power it dissipates.
//!
//! Smallest resistor, closed form: at the limit current I_lim the clamp diode drops V_D(I_lim),
//! so the resistor must take the rest of the overvoltage,
//!
//! ```text
//! R_min,+ = (V_s,max − V_DD,min − V_D(I_lim,+)) / I_lim,+        (into the rail)
//! R_min,− = (−V_s,min − V_D(I_lim,−)) / I_lim,−                 (out of ground)
//! ```
//!
//! with V_D at the *hottest* pin temperature (the drop is lowest there, so the current is highest
//! for a given resistor) and the *lowest* V_DD (the rail off, V_DD = 0, is the worst case of all
//! and belongs to [`super::rail`]). Injection rises monotonically with the signal and falls with
//! R, so these are exact bounds of the model.
//!
//! Largest resistor: the smallest of the limits the caller states (each optional):
//! - an ADC's maximum source impedance (from its datasheet);
//! - the pin's leakage current I_lk times R within an allowed error voltage: R ≤ V_err/I_lk;
//! - a logic input still reaching V_IH at the lowest "high" signal despite the leakage:
//!   R ≤ (V_high,min − V_IH)/I_lk;
//! - the sampling capacitor C_s charging to within half an LSB of an N-bit ADC in the sampling
//!   time t_s: (R + R_in)·C_s·ln(2^(N+1)) ≤ t_s, first-order RC settling.

use super::{Pin, SignalRange};
use crate::error::{self, Error, Reason};
use crate::units::{Amps, Farads, Joules, Ohms, Seconds, Volts, Watts};

/// Injection limits of a pin (both positive numbers; the negative limit is a magnitude).
/// Fields are public for readable literals; every function that takes limits validates them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct InjectionLimits {
    /// Largest current into the pin's rail.
    pub positive: Amps,
    /// Largest current out of ground (magnitude).
    pub negative: Amps,
}

impl InjectionLimits {
    /// Checks both limits: (positive, negative) in amperes.
    ///
    /// # Errors
    /// A limit ≤ 0 → [`Reason::NotPositive`] on `"positive injection limit"` /
    /// `"negative injection limit"`.
    pub fn validate(&self) -> Result<(f32, f32), Error> {
        Ok((
            error::positive("positive injection limit", self.positive.value())?,
            error::positive("negative injection limit", self.negative.value())?,
        ))
    }
}

/// A logic input's upper limit: the pin's leakage across the resistor must leave the lowest
/// "high" signal above the pin's V_IH.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LogicHigh {
    /// Pin leakage current (magnitude).
    pub leakage: Amps,
    /// The lowest voltage the outside line gives for "high".
    pub signal_high_min: Volts,
    /// The pin's V_IH.
    pub v_ih: Volts,
}

/// Limits on the largest resistor; `None` means the limit does not apply.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UpperLimits {
    /// The ADC's maximum source impedance.
    pub adc_max_source: Option<Ohms>,
    /// Pin leakage current (magnitude) and the error voltage it may cause across R.
    pub leakage: Option<(Amps, Volts)>,
    /// Pin leakage against a logic input's threshold.
    pub logic_high: Option<LogicHigh>,
    /// Sampling capacitor, sampling time, ADC resolution in bits, ADC internal resistance.
    pub sampling: Option<(Farads, Seconds, u8, Ohms)>,
}

/// Which limit set the largest resistor.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum UpperLimit {
    /// No upper limit was given.
    None,
    /// The ADC's maximum source impedance.
    AdcSource,
    /// Leakage error voltage.
    Leakage,
    /// Logic-high threshold.
    LogicHigh,
    /// ADC sampling-capacitor settling.
    Sampling,
}

/// The acceptable series-resistor window.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ResistorWindow {
    /// Smallest resistor that keeps injection within limits (0 when the signal never injects).
    pub min: Ohms,
    /// Largest resistor allowed by the upper limits (None when no limit was given).
    pub max: Option<Ohms>,
    /// What set `max`.
    pub max_set_by: UpperLimit,
}

/// Smallest series resistor keeping the injection within `limits` over `signal`'s whole range
/// (transients included), with the pin at its hottest (`pin.temperature`) and lowest supply
/// (`pin.vdd`).
///
/// Work: constant (two diode drops).
///
/// # Errors
/// Errors of [`InjectionLimits::validate`], [`SignalRange::validate`] and [`Pin::validate`];
/// errors of the diode model.
///
/// ```
/// use kickguard::input::{resistor::{min_resistor, InjectionLimits}, Pin, SignalRange};
/// use kickguard::{diode::{Diode, DiodeParams}, Amps, Seconds, Temperature, Volts};
/// let pin = Pin::new(Volts::new(3.0)?, Diode::Law(DiodeParams::SILICON),
///                    Temperature::from_celsius(85.0)?)?;
/// let rain = SignalRange { steady_min: Volts::new(0.0)?, steady_max: Volts::new(24.0)?,
///     transient_min: Volts::new(-2.0)?, transient_max: Volts::new(30.0)?,
///     transient_width: Seconds::new(1e-3)? };
/// let lim = InjectionLimits { positive: Amps::new(5e-3)?, negative: Amps::new(5e-3)? };
/// let r = min_resistor(&pin, &rain, lim)?;
/// assert!(r.value() > 5000.0 && r.value() < 5500.0); // (30 − 3 − ~0.7 V)/5 mA
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn min_resistor(
    pin: &Pin,
    signal: &SignalRange,
    limits: InjectionLimits,
) -> Result<Ohms, Error> {
    let (lp, ln) = limits.validate()?;
    signal.validate()?;
    pin.validate()?;
    let over_pos = signal.transient_max.value() - pin.vdd.value() - pin.drop_at(limits.positive)?;
    let over_neg = -signal.transient_min.value() - pin.drop_at(limits.negative)?;
    let r = (over_pos / lp).max(over_neg / ln).max(0.0);
    Ohms::new(r)
}

/// Largest series resistor allowed by `upper` (None if no limit is given), and which limit set it.
///
/// # Errors
/// A zero leakage, capacitance or sampling time, or a logic-high signal at or below V_IH →
/// [`Reason::NotPositive`] / [`Reason::Inconsistent`] naming it; an internal ADC resistance that
/// alone exceeds the settling budget → [`Reason::Inconsistent`] on `"sampling time"`.
pub fn max_resistor(upper: &UpperLimits) -> Result<(Option<Ohms>, UpperLimit), Error> {
    let mut best: Option<(f32, UpperLimit)> = None;
    let mut take = |r: f32, which: UpperLimit| {
        if best.is_none_or(|(b, _)| r < b) {
            best = Some((r, which));
        }
    };
    if let Some(r) = upper.adc_max_source {
        take(
            error::positive("ADC source impedance", r.value())?,
            UpperLimit::AdcSource,
        );
    }
    if let Some((i_lk, v_err)) = upper.leakage {
        let i = error::positive("leakage current", i_lk.value().abs())?;
        take(
            error::positive("leakage error voltage", v_err.value())? / i,
            UpperLimit::Leakage,
        );
    }
    if let Some(lh) = upper.logic_high {
        let i = error::positive("leakage current", lh.leakage.value().abs())?;
        let headroom = lh.signal_high_min.value() - lh.v_ih.value();
        if !(headroom > 0.0) {
            return Err(Error::new("logic high", Reason::Inconsistent));
        }
        take(headroom / i, UpperLimit::LogicHigh);
    }
    if let Some((c, t_s, bits, r_in)) = upper.sampling {
        let ts = error::positive("sampling time", t_s.value())?;
        if !(1..=32).contains(&bits) {
            return Err(Error::new("ADC resolution", Reason::OutsideValidatedRange));
        }
        // ln(2^(N+1)) = (N + 1)·ln 2: settle to half an LSB.
        let n_tau = (bits as f32 + 1.0) * core::f32::consts::LN_2;
        let r = ts / (c.value() * n_tau) - r_in.value();
        if !(r > 0.0) {
            return Err(Error::new("sampling time", Reason::Inconsistent));
        }
        take(r, UpperLimit::Sampling);
    }
    match best {
        Some((r, which)) => Ok((Some(Ohms::new(r)?), which)),
        None => Ok((None, UpperLimit::None)),
    }
}

/// The acceptable window [min, max] of the series resistor.
///
/// # Errors
/// Errors of [`min_resistor`] and [`max_resistor`]; a minimum above the maximum →
/// [`Reason::Inconsistent`] on `"series resistor"` (the injection limit and the upper limit
/// conflict: add an external clamp, see [`super::rail::shared_clamp`], or relax a requirement).
pub fn resistor_window(
    pin: &Pin,
    signal: &SignalRange,
    limits: InjectionLimits,
    upper: &UpperLimits,
) -> Result<ResistorWindow, Error> {
    let min = min_resistor(pin, signal, limits)?;
    let (max, max_set_by) = max_resistor(upper)?;
    if let Some(m) = max {
        if min > m {
            return Err(Error::new("series resistor", Reason::Inconsistent));
        }
    }
    Ok(ResistorWindow {
        min,
        max,
        max_set_by,
    })
}

/// Power in the series resistor at signal `v_signal`: (V_s − V_pin)²/R, with the pin voltage
/// from the clamp model.
///
/// # Errors
/// `r` = 0 → [`Reason::NotPositive`] on `"series resistor"`; errors of [`Pin::injection`]; a
/// power beyond the quantity bounds → the errors of [`Watts::new`].
pub fn resistor_power(pin: &Pin, v_signal: Volts, r: Ohms) -> Result<Watts, Error> {
    if !(r.value() > 0.0) {
        return Err(Error::new("series resistor", Reason::NotPositive));
    }
    let vp = pin.pin_voltage(v_signal, r)?.value();
    let dv = v_signal.value() - vp;
    Watts::new(dv * dv / r.value())
}

/// Energy the resistor takes in the worst transient of `signal` (the larger of the two extremes,
/// held for the transient width): a rectangular pulse.
///
/// # Errors
/// As [`resistor_power`] and [`SignalRange::validate`].
pub fn transient_energy(pin: &Pin, signal: &SignalRange, r: Ohms) -> Result<Joules, Error> {
    signal.validate()?;
    let hi = resistor_power(pin, signal.transient_max, r)?.value();
    let lo = resistor_power(pin, signal.transient_min, r)?.value();
    Joules::new(hi.max(lo) * signal.transient_width.value())
}
