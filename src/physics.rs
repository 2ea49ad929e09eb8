//! Physical constants and the thermal voltage.
//!
//! The Boltzmann constant and the elementary charge are exact by definition of the SI since 2019
//! (CODATA 2018 recommended values): k = 1.380649e-23 J/K, q = 1.602176634e-19 C.

use crate::units::{Temperature, Volts};

/// Boltzmann constant k, in J/K (exact, SI 2019).
pub const BOLTZMANN_J_PER_K: f64 = 1.380649e-23;
/// Elementary charge q, in C (exact, SI 2019).
pub const ELEMENTARY_CHARGE_C: f64 = 1.602176634e-19;
/// k/q in V/K, rounded to f32 (8.617333e-5 V/K).
pub const K_OVER_Q_V_PER_K: f32 = (BOLTZMANN_J_PER_K / ELEMENTARY_CHARGE_C) as f32;

/// Thermal voltage Vt = k·T/q, in volts.
///
/// Accuracy: within 1 ulp of f32 of the exact SI value (k/q is rounded once to f32, then one
/// multiplication).
///
/// # Errors
/// A temperature so close to absolute zero (below about 1.2e-26 K) that Vt falls below the
/// quantities' smallest magnitude → [`crate::Reason::TooSmall`] on `"thermal voltage"`.
///
/// ```
/// use kickguard::{physics::thermal_voltage, Temperature};
/// let vt = thermal_voltage(Temperature::from_kelvin(300.0)?)?;
/// assert!((vt.value() - 0.025852).abs() < 1e-6);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn thermal_voltage(t: Temperature) -> Result<Volts, crate::Error> {
    Volts::new(K_OVER_Q_V_PER_K * t.kelvin()).map_err(|e| e.on("thermal voltage"))
}

/// Thermal voltage at a raw kelvin value (internal; `t_k` already validated).
#[inline]
pub(crate) fn vt_at(t_k: f32) -> f32 {
    K_OVER_Q_V_PER_K * t_k
}
