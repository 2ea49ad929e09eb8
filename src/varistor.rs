//! A metal-oxide varistor across the coil: a symmetric power-law clamp.
//!
//! Model (the usual empirical varistor law, common practice): I = I₁·(V/V₁)^α, with V₁ the
//! varistor voltage at the reference current I₁ (datasheets state V₁ at 1 mA) and α the
//! nonlinearity exponent (typically 20…50 for metal-oxide parts). Solved for the voltage,
//!
//! ```text
//! V(I) = V₁·(I/I₁)^(1/α) = V₁·exp((ln I − ln I₁)/α)
//! ```
//!
//! which rises steeply with current but tends to zero as I → 0, slowly enough (as I^(1/α),
//! 1/α < 1) that a coil decaying into it reaches zero current in finite time. V₁ moves with
//! temperature by a relative coefficient (metal-oxide varistors: about −0.05 %/K, from memory).

use crate::diode::params::checked_t;
use crate::error::{self, Error, Reason};
use crate::math;
use crate::units::{Amps, PerKelvin, Temperature, Volts};

/// A varistor: V₁ at I₁, exponent α, temperature coefficient of V₁.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Varistor {
    v1: f32,
    i1: f32,
    alpha: f32,
    tc: PerKelvin,
    t_ref_k: f32,
}

/// The power law at one temperature: V(i) = p·exp(β·(ln i − l)).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct PowerAt {
    /// p, volts.
    pub p: f32,
    /// β = 1/α.
    pub beta: f32,
    /// l = ln(reference current).
    pub l: f32,
}

impl PowerAt {
    /// No power-law term.
    pub(crate) const NONE: PowerAt = PowerAt {
        p: 0.0,
        beta: 1.0,
        l: 0.0,
    };

    /// p·exp(β·(u − l)) for ln i = `u`.
    #[inline]
    pub(crate) fn at_u(&self, u: f32) -> f32 {
        if self.p == 0.0 {
            0.0
        } else {
            self.p * math::exp(self.beta * (u - self.l))
        }
    }
}

impl Varistor {
    /// A varistor with voltage `v1` at current `i1`, nonlinearity exponent `alpha`, and a
    /// temperature coefficient `tc` of V₁ about `t_ref`.
    ///
    /// # Errors
    /// `v1` ≤ 0 → [`Reason::NotPositive`] on `"varistor voltage"`; `i1` ≤ 0 →
    /// [`Reason::NotPositive`] on `"varistor current"`; α outside 2…100 →
    /// [`Reason::OutsideValidatedRange`] on `"varistor exponent"`; |TC| > 0.01 /K →
    /// [`Reason::OutsideValidatedRange`] on `"varistor tempco"`; `t_ref` outside −100…250 °C →
    /// [`Reason::OutsideValidatedRange`] on `"reference temperature"`.
    ///
    /// ```
    /// use kickguard::varistor::Varistor;
    /// use kickguard::{Amps, PerKelvin, Temperature, Volts};
    /// let t = Temperature::from_celsius(25.0)?;
    /// let mov = Varistor::new(Volts::new(39.0)?, Amps::new(1e-3)?, 30.0, PerKelvin::ZERO, t)?;
    /// // Ten times the reference current raises the voltage by 10^(1/30), about 8 %.
    /// let v = mov.voltage(Amps::new(1e-2)?, t)?;
    /// assert!((v.value() - 39.0 * 10f32.powf(1.0 / 30.0)).abs() < 1e-3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn new(
        v1: Volts,
        i1: Amps,
        alpha: f32,
        tc: PerKelvin,
        t_ref: Temperature,
    ) -> Result<Self, Error> {
        if !(v1.value() > 0.0) {
            return Err(Error::new("varistor voltage", Reason::NotPositive));
        }
        if !(i1.value() > 0.0) {
            return Err(Error::new("varistor current", Reason::NotPositive));
        }
        let alpha = error::within("varistor exponent", alpha, 2.0, 100.0)?;
        if !(tc.value().abs() <= 0.01) {
            return Err(Error::new("varistor tempco", Reason::OutsideValidatedRange));
        }
        Ok(Varistor {
            v1: v1.value(),
            i1: i1.value(),
            alpha,
            tc,
            t_ref_k: checked_t("reference temperature", t_ref)?,
        })
    }

    /// The same varistor with V₁ scaled by `k`: a part-to-part tolerance (datasheets give V₁
    /// at 1 mA as nominal ± 10 %, common practice).
    ///
    /// # Errors
    /// `k` outside 0.5…1.5 → [`Reason::OutsideValidatedRange`] on `"varistor tolerance"`.
    ///
    /// ```
    /// use kickguard::varistor::Varistor;
    /// use kickguard::{Amps, PerKelvin, Temperature, Volts};
    /// let t = Temperature::from_celsius(25.0)?;
    /// let mov = Varistor::new(Volts::new(39.0)?, Amps::new(1e-3)?, 30.0, PerKelvin::ZERO, t)?;
    /// let v = mov.scaled(1.1)?.voltage(Amps::new(1e-3)?, t)?;
    /// assert!((v.value() - 42.9).abs() < 1e-3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn scaled(&self, k: f32) -> Result<Self, Error> {
        let k = error::within("varistor tolerance", k, 0.5, 1.5)?;
        Ok(Varistor {
            v1: self.v1 * k,
            ..*self
        })
    }

    /// V₁, the voltage at the reference current at the reference temperature.
    pub fn reference_voltage(&self) -> Volts {
        Volts::raw(self.v1)
    }

    /// The nonlinearity exponent α.
    pub fn alpha(&self) -> f32 {
        self.alpha
    }

    /// The law at `t_k` kelvin (validated), or an error if V₁ would not be positive there.
    pub(crate) fn at_checked(&self, t: Temperature) -> Result<PowerAt, Error> {
        let t_k = checked_t("temperature", t)?;
        let p = self.v1 * (1.0 + self.tc.value() * (t_k - self.t_ref_k));
        if !(p > 0.0) {
            return Err(Error::new("temperature", Reason::OutsideValidatedRange));
        }
        Ok(PowerAt {
            p,
            beta: 1.0 / self.alpha,
            l: math::ln(self.i1),
        })
    }

    /// Voltage at current `i` (≥ 0) and temperature `t`: V₁(T)·(I/I₁)^(1/α).
    ///
    /// # Errors
    /// `i` < 0 → [`Reason::Negative`] on `"varistor current"`; `t` as in [`Varistor::new`].
    pub fn voltage(&self, i: Amps, t: Temperature) -> Result<Volts, Error> {
        let i_a = i.value();
        if i_a < 0.0 {
            return Err(Error::new("varistor current", Reason::Negative));
        }
        let law = self.at_checked(t)?;
        if i_a == 0.0 {
            return Ok(Volts::raw(0.0));
        }
        Volts::new(law.at_u(math::ln(i_a)))
    }
}
