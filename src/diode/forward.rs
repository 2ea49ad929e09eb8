//! Forward drop, saturation current and reverse leakage versus temperature.
//!
//! Model (SPICE2 diode, Nagel 1975, DC part):
//!
//! ```text
//! V(I, T)  = N·Vt(T)·ln(1 + I/IS(T)) + I·RS                       (Shockley equation + RS)
//! IS(T)    = IS·(T/TNOM)^(XTI/N)·exp((T/TNOM − 1)·EG/(N·Vt(T)))     (SPICE temperature law)
//! Vt(T)    = k·T/q
//! ```
//!
//! Everything is evaluated in the log domain: ln IS(T) = ln IS + (XTI/N)·ln(T/TNOM) +
//! (T/TNOM − 1)·EG/(N·Vt(T)), and ln(1 + I/IS) = softplus(ln I − ln IS(T)), so neither IS(T)
//! (which can be 1e-25 A when cold) nor I/IS (1e15 at high current) is ever formed where it
//! could underflow or overflow.

use super::params::{checked_t, DiodeParams};
use crate::error::{self, Error, Reason};
use crate::math;
use crate::physics::vt_at;
use crate::units::{Amps, Temperature, Volts, MIN_MAGNITUDE};

/// A computed physical magnitude that must be strictly positive: one that underflowed below the
/// quantity bounds is [`Reason::TooSmall`] (never a silent 0), one above them
/// [`Reason::TooLarge`].
pub(crate) fn positive_result(what: &'static str, x: f32) -> Result<f32, Error> {
    if !(x >= MIN_MAGNITUDE) {
        return Err(Error::new(
            what,
            if x.is_nan() {
                Reason::NotFinite
            } else {
                Reason::TooSmall
            },
        ));
    }
    error::finite(what, x)
}

impl DiodeParams {
    /// ln(IS(T)/A) at `t_k` kelvin (already validated).
    #[inline]
    pub(crate) fn ln_is_at(&self, t_k: f32) -> f32 {
        let ratio = t_k / self.tnom_k;
        self.ln_is
            + (self.xti / self.n) * math::ln(ratio)
            + (ratio - 1.0) * self.eg_ev / (self.n * vt_at(t_k))
    }

    /// Junction part of the drop, N·Vt·ln(1 + I/IS(T)), for I > 0 (internal, validated inputs).
    #[inline]
    pub(crate) fn junction_drop(&self, i_a: f32, t_k: f32) -> f32 {
        let nvt = self.n * vt_at(t_k);
        nvt * math::ln_1p_exp(math::ln(i_a) - self.ln_is_at(t_k))
    }

    /// Saturation current IS(T) from the SPICE temperature law, in amperes.
    ///
    /// Valid for 173.15 K ≤ T ≤ 523.15 K. Accuracy: relative error below 2e-5 against an f64
    /// evaluation of the same law for the presets over −40…150 °C (the exponent, up to ≈ 30 in
    /// magnitude, carries a few f32 ulps).
    ///
    /// # Errors
    /// `t` outside the validated range → [`Reason::OutsideValidatedRange`] on `"temperature"`;
    /// IS(T) below [`crate::units::MIN_MAGNITUDE`] (a very cold, very good diode: it would
    /// underflow) → [`Reason::TooSmall`] on `"saturation current"`; above 1e12 A →
    /// [`Reason::TooLarge`].
    ///
    /// ```
    /// use kickguard::{diode::DiodeParams, Temperature};
    /// let si = DiodeParams::SILICON;
    /// let cold = si.saturation_current(Temperature::from_celsius(25.0).unwrap()).unwrap();
    /// let hot = si.saturation_current(Temperature::from_celsius(35.0).unwrap()).unwrap();
    /// assert!(hot.value() / cold.value() > 2.0);
    /// ```
    pub fn saturation_current(&self, t: Temperature) -> Result<Amps, Error> {
        let t_k = checked_t("temperature", t)?;
        positive_result("saturation current", math::exp(self.ln_is_at(t_k))).map(Amps::raw)
    }

    /// Forward drop V(I, T) = N·Vt·ln(1 + I/IS(T)) + I·RS, in volts.
    ///
    /// Valid for I > 0 and 173.15 K ≤ T ≤ 523.15 K. Accuracy: within 1 mV of an f64 evaluation of
    /// the same law from −40 to 150 °C and 1 µA to 10 A for the presets and for parameters in
    /// the ranges of [`DiodeParams::new`] (measured: `cargo bench --bench diode_accuracy`).
    ///
    /// # Errors
    /// `i` ≤ 0 → [`Reason::NotPositive`] on `"forward current"`; `t` out of range →
    /// [`Reason::OutsideValidatedRange`] on `"temperature"`; a drop that would underflow to zero
    /// (a current far below IS(T), so small the drop is under 1e-30 V) → [`Reason::TooSmall`]
    /// on `"forward drop"`.
    ///
    /// Work: constant (one logarithm, one exponential, one ln(1 + x)).
    ///
    /// ```
    /// use kickguard::{diode::DiodeParams, Amps, Temperature};
    /// let v = DiodeParams::SILICON
    ///     .forward_drop(Amps::new(0.01).unwrap(), Temperature::from_celsius(25.0).unwrap())
    ///     .unwrap();
    /// assert!(v.value() > 0.6 && v.value() < 0.8);
    /// ```
    pub fn forward_drop(&self, i: Amps, t: Temperature) -> Result<Volts, Error> {
        let i_a = i.value();
        if i_a <= 0.0 {
            return Err(Error::new("forward current", Reason::NotPositive));
        }
        let t_k = checked_t("temperature", t)?;
        let v = self.junction_drop(i_a, t_k) + i_a * self.rs_ohm;
        positive_result("forward drop", v).map(Volts::raw)
    }

    /// Temperature coefficient of the forward drop at constant current, dV/dT, in volts per kelvin.
    ///
    /// Exact derivative of the model: with x = I/IS(T) and Vj the junction drop,
    /// dV/dT = Vj/T − x/(1 + x)·(XTI·Vt + EG)/T. Near 0.6 V for silicon this is the familiar
    /// −2 mV/K; it is smaller in magnitude at higher current (larger Vj).
    ///
    /// # Errors
    /// As [`DiodeParams::forward_drop`].
    ///
    /// ```
    /// use kickguard::{diode::DiodeParams, Amps, Temperature};
    /// let tc = DiodeParams::SILICON
    ///     .forward_tempco_v_per_k(Amps::new(1e-3).unwrap(), Temperature::from_celsius(25.0).unwrap())
    ///     .unwrap();
    /// assert!(tc < -1.5e-3 && tc > -2.5e-3);
    /// ```
    pub fn forward_tempco_v_per_k(&self, i: Amps, t: Temperature) -> Result<f32, Error> {
        let i_a = i.value();
        if i_a <= 0.0 {
            return Err(Error::new("forward current", Reason::NotPositive));
        }
        let t_k = checked_t("temperature", t)?;
        let a = math::ln(i_a) - self.ln_is_at(t_k);
        // x/(1 + x) with x = I/IS(T) = eᵃ.
        let frac = math::logistic(a);
        let vt = vt_at(t_k);
        let vj = self.n * vt * math::ln_1p_exp(a);
        error::result(
            "forward tempco",
            (vj - frac * (self.xti * vt + self.eg_ev)) / t_k,
        )
    }

    /// Reverse current at reverse voltage `v_r` (> 0 blocks), in amperes (a positive number):
    /// I_R = IS(T)·(1 − exp(−V_R/(N·Vt))).
    ///
    /// This is the saturation part of the leakage that the SPICE DC model carries; it follows the
    /// temperature law of IS (roughly doubling every 8 K for the presets). Real junctions add a
    /// generation current and surface leakage, and breakdown near the rated voltage, none of which
    /// is modelled here: use a measured leakage where it matters.
    ///
    /// # Errors
    /// `v_r` < 0 → [`Reason::Negative`] on `"reverse voltage"`; temperature as
    /// [`DiodeParams::saturation_current`]; a leakage that underflows (below 1e-30 A: a very cold
    /// junction) → [`Reason::TooSmall`] on `"reverse current"`.
    pub fn reverse_leakage(&self, v_r: Volts, t: Temperature) -> Result<Amps, Error> {
        let vr = v_r.value();
        if vr < 0.0 {
            return Err(Error::new("reverse voltage", Reason::Negative));
        }
        let t_k = checked_t("temperature", t)?;
        let nvt = self.n * vt_at(t_k);
        // 1 − e^(−x) = −expm1(−x), exact for small x.
        let shape = -math::exp_m1(-vr / nvt);
        if vr == 0.0 {
            return Ok(Amps::raw(0.0));
        }
        let i = math::exp(self.ln_is_at(t_k)) * shape;
        positive_result("reverse current", i).map(Amps::raw)
    }
}
