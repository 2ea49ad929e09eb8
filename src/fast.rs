//! Faster, approximate variants of run-time functions, on the `micromath` backend.
//!
//! Enabled by the `micromath` feature. The choice is explicit at the call site: these functions
//! have their own names, and turning the feature on (by this crate or any other in the build)
//! never changes what the rest of kickguard computes, which always uses `libm`.
//!
//! Backend: micromath 2's `ln` and `exp` are polynomial approximations with a maximum relative
//! error of 1e-3 each (micromath's own stated bound, `MAX_ERROR` in its tests). Its `ln` of a
//! negative number panics in debug builds and returns garbage in release builds, so every
//! argument is checked here before the call (a failed check is a typed error, never a call).
//!
//! Measured cost (host instruction counts, `cargo bench --bench instructions --features
//! micromath`): on an x86-64 host the micromath versions are *not* cheaper than libm (365 against
//! 296 instructions for the drop); the backend is meant for cores without an FPU, where that
//! comparison has not been made yet. Prefer the libm functions unless a target measurement
//! shows a gain.
//!
//! Error budget of each function (measured by `cargo bench --bench fast_math --features
//! micromath` against the libm versions, and asserted in `tests/fast_math.rs`):
//!
//! | function | libm version | bound on the difference |
//! |---|---|---|
//! | [`forward_drop`] | [`DiodeParams::forward_drop`] | 10 mV over −40…150 °C, 1 µA…10 A (presets; measured 7.6 mV) |
//! | [`constant_clamp_time`] | [`ConstantClamp::time_to`] | 0.2 % (measured 0.023 %) |

use crate::clamp::closed_form::ConstantClamp;
use crate::diode::params::checked_t;
use crate::diode::DiodeParams;
use crate::error::{Error, Reason};
use crate::physics::vt_at;
use crate::units::{Amps, Seconds, Temperature, Volts};
use micromath::F32Ext;

/// ln(x) on micromath, after checking that x is positive and finite.
fn ln(x: f32, input: &'static str) -> Result<f32, Error> {
    if x > 0.0 && x.is_finite() {
        Ok(F32Ext::ln(x))
    } else {
        Err(Error::new(input, Reason::OutsideValidatedRange))
    }
}

/// eˣ on micromath, after checking that x is finite and in a range where eˣ is a normal f32.
fn exp(x: f32, input: &'static str) -> Result<f32, Error> {
    if x.is_finite() && (-80.0..=80.0).contains(&x) {
        Ok(F32Ext::exp(x))
    } else if x < -80.0 {
        Ok(0.0)
    } else {
        Err(Error::new(input, Reason::Overflow))
    }
}

/// ln(1 + eˣ) on micromath (see `math::ln_1p_exp`; here ln(1 + y) for small y is taken as y,
/// exact to 2e-5 relative for y < 1e-4 since the next series term is y²/2).
fn ln_1p_exp(x: f32) -> Result<f32, Error> {
    let (base, z) = if x > 0.0 { (x, -x) } else { (0.0, x) };
    let y = exp(z, "fast softplus")?;
    let l = if y < 1e-4 {
        y
    } else {
        ln(1.0 + y, "fast softplus")?
    };
    Ok(base + l)
}

/// Forward drop V(I, T) of [`DiodeParams::forward_drop`] on the micromath backend.
///
/// Same model, validation and errors; the result differs from the libm version by at most 10 mV
/// (see the module table).
///
/// # Errors
/// As [`DiodeParams::forward_drop`]; an argument the approximation cannot take →
/// [`Reason::OutsideValidatedRange`] or [`Reason::Overflow`] naming the step.
///
/// ```
/// use kickguard::{diode::DiodeParams, fast, Amps, Temperature};
/// let (i, t) = (Amps::new(0.43).unwrap(), Temperature::from_celsius(25.0).unwrap());
/// let exact = DiodeParams::SILICON.forward_drop(i, t).unwrap().value();
/// let quick = fast::forward_drop(&DiodeParams::SILICON, i, t).unwrap().value();
/// assert!((exact - quick).abs() < 1e-2);
/// ```
pub fn forward_drop(d: &DiodeParams, i: Amps, t: Temperature) -> Result<Volts, Error> {
    let i_a = i.value();
    if i_a <= 0.0 {
        return Err(Error::new("forward current", Reason::NotPositive));
    }
    let t_k = checked_t("temperature", t)?;
    let ratio = t_k / d.tnom_k;
    let ln_is_t = d.ln_is
        + (d.xti / d.n) * ln(ratio, "temperature")?
        + (ratio - 1.0) * d.eg_ev / (d.n * vt_at(t_k));
    let a = ln(i_a, "forward current")? - ln_is_t;
    let v = d.n * vt_at(t_k) * ln_1p_exp(a)? + i_a * d.rs_ohm;
    crate::diode::forward::positive_result("forward drop", v).map(Volts::raw)
}

/// Time of [`ConstantClamp::time_to`] on the micromath backend: within 0.2 % of the libm result.
///
/// # Errors
/// As [`ConstantClamp::time_to`].
pub fn constant_clamp_time(c: &ConstantClamp, i_end: Amps) -> Result<Seconds, Error> {
    c.time_to_with(i_end, |x| ln(1.0 + x, "fast ln"))
}
