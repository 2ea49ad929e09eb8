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
use crate::diode::DiodeParams;
use crate::error::{self, Error, Reason};
use crate::rating::Verdict;
use crate::solve::illinois;
use crate::units::{Amps, Ohms, Volts};

/// Rail-on back-powering check: total current injected into the rail against the rail's
/// minimum load.
///
/// # Errors
/// `min_load` ≤ 0 → [`Reason::NotPositive`] on `"rail minimum load"`.
///
/// ```
/// use kickguard::{input::rail::rail_on_check, Amps};
/// let v = rail_on_check(Amps::new(6e-3).unwrap(), Amps::new(8e-3).unwrap()).unwrap();
/// assert!(v.pass && (v.margin - 1.0 / 3.0).abs() < 1e-6);
/// ```
pub fn rail_on_check(total_injected: Amps, min_load: Amps) -> Result<Verdict, Error> {
    Verdict::of(
        total_injected.value().max(0.0),
        min_load.value(),
        "rail minimum load",
    )
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

/// Rail-off back-powering: the voltage a signal at `v_signal` through `r` pushes onto the
/// unpowered rail whose loads look like `r_load`, against `allowed`.
///
/// # Errors
/// `r_load` = 0 → [`Reason::NotPositive`] on `"rail load resistance"`; `allowed` ≤ 0 →
/// [`Reason::NotPositive`] on `"allowed rail voltage"`; errors of the diode model.
pub fn rail_off_check(
    pin: &Pin,
    v_signal: Volts,
    r: Ohms,
    r_load: Ohms,
    allowed: Volts,
) -> Result<RailOff, Error> {
    let rl = r_load.value();
    if !(rl > 0.0) {
        return Err(Error::new("rail load resistance", Reason::NotPositive));
    }
    let unpowered = Pin {
        vdd: Volts::raw(0.0),
        ..*pin
    };
    let total = Ohms::new(r.value() + rl)?;
    let i = unpowered.diode_current(v_signal.value(), total)?;
    let v_rail = i * rl;
    Ok(RailOff {
        current: Amps::new(i)?,
        rail_voltage: Volts::new(v_rail)?,
        verdict: Verdict::of(v_rail, allowed.value(), "allowed rail voltage")?,
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

/// Sharing between the internal upper clamp (`internal`, a diode law) and an `external` diode
/// from the pin node to the same rail, for a source `v_signal` through `r`. For a clamp to
/// ground, mirror the voltages (pass −V_s and V_DD = 0).
///
/// Accuracy: node voltage to 1 µV, currents to the diode model's accuracy.
///
/// # Errors
/// `r` = 0 → [`Reason::NotPositive`] on `"series resistor"`; a solve that cannot bracket the
/// node voltage → [`Reason::Inconsistent`] on `"node voltage"`; errors of the diode model.
pub fn shared_clamp(
    vdd: Volts,
    internal: &DiodeParams,
    external: &DiodeParams,
    pin_temperature: crate::units::Temperature,
    v_signal: Volts,
    r: Ohms,
) -> Result<SharedClamp, Error> {
    let rv = r.value();
    if !(rv > 0.0) {
        return Err(Error::new("series resistor", Reason::NotPositive));
    }
    let (vs, vdd) = (v_signal.value(), vdd.value());
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
                .and_then(|v| d.forward_current(v, pin_temperature))
                .map(|i| i.value())
                .unwrap_or(f32::INFINITY)
        } else {
            0.0
        }
    };
    // f(V_n) = (V_s − V_n)/R − I_int − I_ext: positive at V_n = V_DD; at the node voltage where
    // the internal diode alone carries the largest possible current (V_s − V_DD)/R it is ≤ 0.
    let f = |vn: f32| (vs - vn) / rv - current(internal, vn - vdd) - current(external, vn - vdd);
    let i_max = Amps::new((vs - vdd) / rv)?;
    let hi = (vdd + internal.forward_drop(i_max, pin_temperature)?.value()).min(vs);
    let vn =
        illinois(f, vdd, hi, 1e-6, 100).ok_or(Error::new("node voltage", Reason::Inconsistent))?;
    let (ii, ie) = (current(internal, vn - vdd), current(external, vn - vdd));
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
/// `coupling` negative or non-finite → [`Reason::Negative`] / [`Reason::NotFinite`] on
/// `"coupling ratio"`.
///
/// ```
/// use kickguard::{input::rail::neighbour_adc_error, Amps, Ohms};
/// let e = neighbour_adc_error(Amps::new(2e-3).unwrap(), 1e-4, Ohms::new(10_000.0).unwrap()).unwrap();
/// assert!((e.value() - 2e-3).abs() < 1e-9); // 2 mA · 1e-4 · 10 kΩ = 2 mV
/// ```
pub fn neighbour_adc_error(injected: Amps, coupling: f32, r_source: Ohms) -> Result<Volts, Error> {
    let k = error::non_negative("coupling ratio", coupling)?;
    Volts::new(injected.value().abs() * k * r_source.value())
}
