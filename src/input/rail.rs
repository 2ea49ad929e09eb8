//! Where the injected current goes: back-powering the pin's supply rail, an external clamp
//! sharing the current with the internal diode, and the error induced on a neighbouring ADC
//! channel.
//!
//! **Rail on.** Current injected through the upper clamps flows into V_DD. A linear regulator
//! can only source current, so if the total injected exceeds what the rail's loads draw at their
//! minimum, the excess charges the rail and its voltage rises: the margin is
//! I_load,min / ΣI_injected − 1.
//!
//! **Rail off.** With the rail unpowered, the pin's upper diode feeds the rail and its loads, seen
//! as a resistance R_load to ground: the source drives R, the diode and R_load in series,
//! I = series current with R + R_load, and the rail sits at V_rail = I·R_load. Parts on that rail
//! may half-power and misbehave; the check compares V_rail with an allowed level.
//!
//! **External clamp.** A Schottky from the pin node to the rail (or to ground) in parallel with
//! the internal diode: both see the same node voltage V_n, so
//! (V_s − V_n)/R = I_int(V_n − V_DD) + I_ext(V_n − V_DD), two diode laws in parallel. The node
//! equation is monotone in V_n and is solved by bracketed Illinois iteration (≤ 100 steps,
//! 1 µV). A Schottky's lower drop takes most of the current, which is how it protects.

use super::Pin;
use crate::diode::{Diode, DiodeParams};
use crate::error::{self, Error, Reason};
use crate::rating::Verdict;
use crate::solve::illinois;
use crate::units::{Amps, Ohms, Volts};

/// The powered rail's minimum load: the current its loads always draw, which is all the
/// injected current the regulator can absorb.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct RailLoad {
    min_load: Amps,
}

impl RailLoad {
    /// A rail that never draws less than `min_load` (> 0).
    ///
    /// # Errors
    /// `min_load` ≤ 0 → [`Reason::NotPositive`] on `"rail minimum load"`.
    pub fn new(min_load: Amps) -> Result<Self, Error> {
        error::positive("rail minimum load", min_load.value())?;
        Ok(RailLoad { min_load })
    }

    /// The minimum load.
    pub fn min_load(&self) -> Amps {
        self.min_load
    }

    /// Rail-on back-powering check: the total current injected into the rail against its
    /// minimum load.
    ///
    /// # Errors
    /// A negative injection is counted as zero; none otherwise (the rail was validated).
    ///
    /// ```
    /// use kickguard::{input::rail::RailLoad, Amps};
    /// let v = RailLoad::new(Amps::new(8e-3)?)?.check(Amps::new(6e-3)?)?;
    /// assert!(v.pass && (v.margin - 1.0 / 3.0).abs() < 1e-6);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn check(&self, total_injected: Amps) -> Result<Verdict, Error> {
        Verdict::of(
            total_injected.value().max(0.0),
            self.min_load.value(),
            "rail minimum load",
        )
    }
}

/// The unpowered rail: its loads, seen as one resistance to ground, and the voltage it may be
/// pushed to before parts on it half-power. Fields are public for readable literals;
/// [`rail_off_check`] validates them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct UnpoweredRail {
    /// The rail's load resistance (> 0).
    pub load: Ohms,
    /// The highest rail voltage allowed (> 0).
    pub allowed: Volts,
}

/// Result of the rail-off check.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct RailOff {
    /// Current the pin feeds into the unpowered rail.
    pub current: Amps,
    /// The rail's voltage, I·R_load.
    pub rail_voltage: Volts,
    /// Verdict against the allowed rail voltage.
    pub verdict: Verdict,
}

/// Rail-off back-powering: the voltage a signal at `v_signal` through `r_series` pushes onto
/// the unpowered `rail`, against what it allows.
///
/// # Errors
/// `rail.load` = 0 → [`Reason::NotPositive`] on `"rail load resistance"`; `rail.allowed` ≤ 0 →
/// [`Reason::NotPositive`] on `"allowed rail voltage"`; errors of [`Pin::validate`] and of the
/// diode model.
pub fn rail_off_check(
    pin: &Pin,
    v_signal: Volts,
    r_series: Ohms,
    rail: &UnpoweredRail,
) -> Result<RailOff, Error> {
    pin.validate()?;
    let rl = rail.load.value();
    if !(rl > 0.0) {
        return Err(Error::new("rail load resistance", Reason::NotPositive));
    }
    let allowed = error::positive("allowed rail voltage", rail.allowed.value())?;
    let unpowered = Pin {
        vdd: Volts::raw(0.0),
        ..*pin
    };
    let total = Ohms::new(r_series.value() + rl).map_err(|e| e.on("series resistor"))?;
    let i = unpowered.diode_current(v_signal.value(), total)?;
    let v_rail = i * rl;
    Ok(RailOff {
        current: Amps::new(i)?,
        rail_voltage: Volts::new(v_rail)?,
        verdict: Verdict::of(v_rail, allowed, "allowed rail voltage")?,
    })
}

/// Identical inputs feeding an unpowered rail together: `count` lines at `v_signal` through
/// `r_series` each. Fields are public for readable literals; [`rail_off_together`] validates
/// them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct RailSource {
    /// The steady signal, V (≥ 0; at or below the rail it feeds nothing).
    pub v_signal: Volts,
    /// The series resistor of each line (> 0).
    pub r_series: Ohms,
    /// How many identical lines.
    pub count: u32,
}

/// Rail-off back-powering by every input at once: the voltage `sources` push onto the
/// unpowered `rail` together, against what it allows.
///
/// Model: every line's upper clamp diode feeds the one rail node, whose loads are `rail.load`
/// to ground, so the rail voltage V solves Σ nₖ·Iₖ(V) = V/R_load, where Iₖ(V) is the current of
/// the diode law (or fixed drop) in series with Rₖ for the excess Vₖ − V (the same law as
/// [`rail_off_check`], which is the one-line case). The left side falls and the right side
/// rises with V, so the root is unique in [0, max Vₖ]; it is found by bracketed Illinois
/// iteration to 1 µV. Lines judged one at a time understate the rail when several are high
/// at once (a board whose signals stay up while its own supply is off).
///
/// Work: at most 100 iterations, each one diode-and-resistor solve per entry of `sources`.
///
/// # Errors
/// `rail.load` = 0 → [`Reason::NotPositive`] on `"rail load resistance"`; `rail.allowed` ≤ 0 →
/// [`Reason::NotPositive`] on `"allowed rail voltage"`; a signal that is negative or not
/// finite → on `"signal voltage"`; a series resistor of 0 → [`Reason::NotPositive`] on
/// `"series resistor"`; a total current beyond the quantities' range → on `"rail current"`;
/// errors of [`Pin::validate`] and of the diode model.
pub fn rail_off_together(
    pin: &Pin,
    sources: &[RailSource],
    rail: &UnpoweredRail,
) -> Result<RailOff, Error> {
    pin.validate()?;
    let rl = error::positive("rail load resistance", rail.load.value())?;
    let allowed = error::positive("allowed rail voltage", rail.allowed.value())?;
    let mut top = 0.0f32;
    for s in sources {
        top = top.max(error::non_negative("signal voltage", s.v_signal.value())?);
        error::positive("series resistor", s.r_series.value())?;
    }
    // Σ nₖ·Iₖ(V) at rail voltage V; a diode-model refusal poisons the sum (NaN) and is
    // reported after the search by evaluating once more.
    let fed = |v: f32| -> Result<f32, Error> {
        let at = Pin {
            vdd: Volts::raw(v),
            ..*pin
        };
        let mut sum = 0.0f32;
        for s in sources {
            sum += s.count as f32 * at.diode_current(s.v_signal.value() - v, s.r_series)?;
        }
        Ok(sum)
    };
    let balance = |v: f32| fed(v).map_or(f32::NAN, |i| i - v / rl);
    let v = if top > 0.0 && balance(0.0) > 0.0 {
        match crate::solve::illinois(balance, 0.0, top, 1e-6, 100) {
            Some(v) => v,
            None => {
                // The model's own refusal where there is one, else the search's.
                fed(0.0)?;
                fed(top)?;
                return Err(Error::new("rail voltage", Reason::Unreachable));
            }
        }
    } else {
        0.0
    };
    let i = error::result("rail current", fed(v)?)?;
    Ok(RailOff {
        current: Amps::new(i)?,
        rail_voltage: Volts::new(v)?,
        verdict: Verdict::of(v, allowed, "allowed rail voltage")?,
    })
}

/// How an injected current shares between the internal clamp and an external one.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SharedClamp {
    /// Current through the pin's internal diode.
    pub internal: Amps,
    /// Current through the external diode.
    pub external: Amps,
    /// Pin node voltage.
    pub node: Volts,
}

/// Sharing between the pin's internal upper clamp (its diode law) and an `external` diode
/// from the pin node to the same rail, for a source `v_signal` through `r`. For a clamp to
/// ground, mirror the voltages (pass −V_s and a pin at V_DD = 0).
///
/// Accuracy: node voltage to 1 µV, currents to the diode model's accuracy. Work: at most 100
/// bracketed iterations, each two bounded Newton solves.
///
/// # Errors
/// A pin whose clamp is a fixed drop (a sharing needs both laws) → [`Reason::Inconsistent`] on
/// `"pin clamp"`; `r` = 0 → [`Reason::NotPositive`] on `"series resistor"`; a solve that cannot
/// bracket the node voltage → [`Reason::Inconsistent`] on `"node voltage"`; errors of
/// [`Pin::validate`] and of the diode model.
pub fn shared_clamp(
    pin: &Pin,
    external: &DiodeParams,
    v_signal: Volts,
    r: Ohms,
) -> Result<SharedClamp, Error> {
    pin.validate()?;
    let Diode::Law(internal) = pin.clamp else {
        return Err(Error::new("pin clamp", Reason::Inconsistent));
    };
    let t = pin.temperature;
    let rv = r.value();
    if !(rv > 0.0) {
        return Err(Error::new("series resistor", Reason::NotPositive));
    }
    let (vs, vdd) = (v_signal.value(), pin.vdd.value());
    if !(vs > vdd) {
        let node = Volts::new(vs)?;
        return Ok(SharedClamp {
            internal: Amps::raw(0.0),
            external: Amps::raw(0.0),
            node,
        });
    }
    let current = |d: &DiodeParams, v: f32| -> f32 {
        if v > 0.0 {
            Volts::new(v)
                .and_then(|v| d.forward_current(v, t))
                .map(|i| i.value())
                .unwrap_or(f32::INFINITY)
        } else {
            0.0
        }
    };
    // f(V_n) = (V_s − V_n)/R − I_int − I_ext: positive at V_n = V_DD; at the node voltage where
    // the internal diode alone carries the largest possible current (V_s − V_DD)/R it is ≤ 0.
    let f = |vn: f32| (vs - vn) / rv - current(&internal, vn - vdd) - current(external, vn - vdd);
    let i_max = Amps::new((vs - vdd) / rv)?;
    let hi = (vdd + internal.forward_drop(i_max, t)?.value()).min(vs);
    let vn =
        illinois(f, vdd, hi, 1e-6, 100).ok_or(Error::new("node voltage", Reason::Inconsistent))?;
    let (ii, ie) = (current(&internal, vn - vdd), current(external, vn - vdd));
    Ok(SharedClamp {
        internal: Amps::new(error::result("internal current", ii)?)?,
        external: Amps::new(error::result("external current", ie)?)?,
        node: Volts::new(vn)?,
    })
}

/// Error induced on a neighbouring ADC input by injection on this pin: a fraction `coupling`
/// (the datasheet's injection coupling ratio, dimensionless) of the injected current flows
/// into the neighbour, whose source impedance `r_source` turns it into a voltage error.
///
/// # Errors
/// `coupling` outside 0…1 or non-finite → [`Reason::OutsideValidatedRange`] /
/// [`Reason::NotFinite`] on `"coupling ratio"`; a voltage beyond the quantity bounds → the
/// errors of [`Volts::new`].
///
/// ```
/// use kickguard::{input::rail::neighbour_adc_error, Amps, Ohms};
/// let e = neighbour_adc_error(Amps::new(2e-3)?, 1e-4, Ohms::new(10_000.0)?)?;
/// assert!((e.value() - 2e-3).abs() < 1e-9); // 2 mA · 1e-4 · 10 kΩ = 2 mV
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn neighbour_adc_error(injected: Amps, coupling: f32, r_source: Ohms) -> Result<Volts, Error> {
    let k = error::within("coupling ratio", coupling, 0.0, 1.0)?;
    Volts::new(injected.value().abs() * k * r_source.value())
}
