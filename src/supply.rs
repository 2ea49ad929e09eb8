//! The supply rail seen from the coil drivers: the energy a decay returns to it.
//!
//! A freewheel across the coil keeps the decay's current in a local loop, and a clamp across
//! the switch draws from the supply (the supply adds V_s·Q); but a fast decay through an
//! H-bridge's diodes drives the coil's current back into the supply's positive node, returning
//! energy to it ([`crate::clamp::EnergySplit::from_supply`] is negative there). A battery or a
//! supply that can sink current takes it; behind a series diode, or from a regulator that only
//! sources current, it charges the rail's bulk capacitor.
//!
//! Model (energy balance of a capacitor, any circuit text: a capacitor holds ½·C·V²): the
//! returned energy E, less what the rail's loads draw meanwhile, raises the capacitor from V₁
//! to V₂ with ½·C·(V₂² − V₁²) = E − E_loads, so V₂ = √(V₁² + 2·(E − E_loads)/C). The loads draw
//! at least V₁·I_load·t over a decay of t seconds (the rail never falls below V₁ meanwhile), so
//! taking E_loads = V₁·I_load·t can only overstate the rise. Closed form.

use crate::error::{self, Error};
use crate::units::{Amps, Farads, Joules, Seconds, Volts};

/// The rail's voltage after it takes back `returned` joules into `bulk` capacitance from
/// `v_rail`, while loads draw at least `load` amperes for `during` seconds (see the module
/// docs); never below `v_rail` (loads that draw more than is returned leave the rail where the
/// supply holds it).
///
/// Work: constant (one square root).
///
/// # Errors
/// `bulk` (positive by its type) is always valid; `v_rail` ≤ 0 → [`crate::Reason::NotPositive`]
/// on `"rail voltage"`; `returned`, `load` or `during` negative → [`crate::Reason::Negative`]
/// on `"returned energy"`, `"rail load"` or `"decay time"`; a rise beyond the quantities'
/// range → on `"rail voltage"`.
///
/// ```
/// use kickguard::supply::rail_rise;
/// use kickguard::{Amps, Farads, Joules, Seconds, Volts};
/// // 50 mJ into 470 µF at 24 V with no load: √(24² + 2·0.05/470e-6) = √788.77 = 28.085 V.
/// let v = rail_rise(Farads::new(470e-6)?, Volts::new(24.0)?, Joules::new(0.05)?,
///                   Amps::new(0.0)?, Seconds::new(0.0)?)?;
/// assert!((v.value() - 28.085).abs() < 0.001);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn rail_rise(
    bulk: Farads,
    v_rail: Volts,
    returned: Joules,
    load: Amps,
    during: Seconds,
) -> Result<Volts, Error> {
    let v1 = error::positive("rail voltage", v_rail.value())?;
    let e = error::non_negative("returned energy", returned.value())?;
    let i = error::non_negative("rail load", load.value())?;
    let t = error::non_negative("decay time", during.value())?;
    let net = (e - v1 * i * t).max(0.0);
    let v2 = crate::math::sqrt(v1 * v1 + 2.0 * net / bulk.value());
    Volts::new(v2).map_err(|x| x.on("rail voltage"))
}
