//! Coil model: inductance, copper resistance over temperature, steady current, stored energy and
//! pull-in margin.
//!
//! Resistance convention (stated wherever R(T) appears): linear in temperature about a reference,
//!
//! ```text
//! R(T) = R_ref·(1 + α·(T − T_ref))
//! ```
//!
//! with α the resistance temperature coefficient *at T_ref*. The default is annealed copper at
//! 20 °C, α₂₀ = 0.00393 /K (IEC 60028, the international standard of resistance for copper). If
//! the coil's resistance is given at another reference temperature, α must be the coefficient at
//! that temperature (for copper α_T = 1/(1/α₂₀ + T − 20 K), e.g. 0.00385 /K at 25 °C). α = 0 is
//! allowed, for a coil characterised at its operating temperature. The inductance is taken as
//! constant (an air-gap-dominated magnetic circuit; iron saturation and armature position are not
//! modelled).

use crate::error::{self, Error, Reason};
use crate::units::{Amps, Henries, Joules, Ohms, Temperature, Volts};

/// Annealed copper's resistance temperature coefficient at 20 °C, 0.00393 /K (IEC 60028).
pub const COPPER_ALPHA_20C_PER_K: f32 = 0.00393;

/// Temperature at which [`COPPER_ALPHA_20C_PER_K`] is defined: 20 °C.
pub const COPPER_ALPHA_REFERENCE: Temperature = match Temperature::from_celsius(20.0) {
    Ok(t) => t,
    Err(_) => Temperature::raw_kelvin(293.15),
};

/// An inductive coil: inductance L, resistance R_ref at T_ref and a resistance temperature
/// coefficient α (per kelvin, at T_ref).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Coil {
    l_h: f32,
    r_ref_ohm: f32,
    t_ref_k: f32,
    alpha_per_k: f32,
}

impl Coil {
    /// A copper coil: L, R at `t_ref`, with α for annealed copper referred to `t_ref` from
    /// α₂₀ = 0.00393 /K (IEC 60028) by α_T = 1/(1/α₂₀ + (T_ref − 20 °C)).
    ///
    /// # Errors
    /// `r_ref` = 0 → [`Reason::NotPositive`] on `"coil resistance"`.
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature};
    /// let valve = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(),
    ///                          Temperature::from_celsius(20.0).unwrap()).unwrap();
    /// let hot = valve.resistance(Temperature::from_celsius(80.0).unwrap()).unwrap();
    /// assert!((hot.value() - 56.0 * (1.0 + 0.00393 * 60.0)).abs() < 1e-3);
    /// ```
    pub fn copper(l: Henries, r_ref: Ohms, t_ref: Temperature) -> Result<Self, Error> {
        let shift = t_ref.kelvin() - COPPER_ALPHA_REFERENCE.kelvin();
        let alpha = 1.0 / (1.0 / COPPER_ALPHA_20C_PER_K + shift);
        Coil::new(l, r_ref, t_ref, alpha)
    }

    /// A coil with an explicit coefficient `alpha_per_k` at `t_ref` (0 for a coil characterised
    /// at its operating temperature).
    ///
    /// # Errors
    /// `r_ref` = 0 → [`Reason::NotPositive`] on `"coil resistance"`; α non-finite →
    /// [`Reason::NotFinite`] on `"alpha"`; α outside −0.01…0.02 /K (no winding metal is outside
    /// that) → [`Reason::OutsideValidatedRange`] on `"alpha"`.
    pub fn new(
        l: Henries,
        r_ref: Ohms,
        t_ref: Temperature,
        alpha_per_k: f32,
    ) -> Result<Self, Error> {
        let r = r_ref.value();
        if !(r > 0.0) {
            return Err(Error::new("coil resistance", Reason::NotPositive));
        }
        let alpha = error::finite("alpha", alpha_per_k)?;
        if !(-0.01..=0.02).contains(&alpha) {
            return Err(Error::new("alpha", Reason::OutsideValidatedRange));
        }
        Ok(Coil {
            l_h: l.value(),
            r_ref_ohm: r,
            t_ref_k: t_ref.kelvin(),
            alpha_per_k: alpha,
        })
    }

    /// Inductance L.
    pub fn inductance(&self) -> Henries {
        Henries::raw(self.l_h)
    }

    /// Resistance at the reference temperature.
    pub fn resistance_ref(&self) -> Ohms {
        Ohms::raw(self.r_ref_ohm)
    }

    /// Reference temperature of the resistance.
    pub fn reference_temperature(&self) -> Temperature {
        Temperature::raw_kelvin(self.t_ref_k)
    }

    /// Resistance temperature coefficient α at the reference temperature, per kelvin.
    pub fn alpha_per_k(&self) -> f32 {
        self.alpha_per_k
    }

    /// R(T) = R_ref·(1 + α·(T − T_ref)), in ohms (linear convention, see the module docs).
    ///
    /// # Errors
    /// A temperature where the linear law gives R ≤ 0 (far below the reference for a copper
    /// coil: below about −234 °C) → [`Reason::OutsideValidatedRange`] on `"winding temperature"`.
    pub fn resistance(&self, t: Temperature) -> Result<Ohms, Error> {
        let r = self.r_ref_ohm * (1.0 + self.alpha_per_k * (t.kelvin() - self.t_ref_k));
        if r > 0.0 && r.is_finite() {
            Ohms::new(r).map_err(|e| Error::new("winding temperature", e.reason))
        } else {
            Err(Error::new(
                "winding temperature",
                Reason::OutsideValidatedRange,
            ))
        }
    }

    /// Winding temperature from a measured resistance: T = T_ref + (R/R_ref − 1)/α (the
    /// resistance method of winding thermometry, the inverse of [`Coil::resistance`]).
    ///
    /// # Errors
    /// α = 0 (the coil carries no temperature information) → [`Reason::Inconsistent`] on
    /// `"alpha"`; `r_measured` = 0 → [`Reason::NotPositive`] on `"measured resistance"`; a result
    /// at or below 0 K → [`Reason::BelowAbsoluteZero`] on `"measured resistance"`.
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature};
    /// let valve = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(),
    ///                          Temperature::from_celsius(20.0).unwrap()).unwrap();
    /// let t = valve.winding_temperature(Ohms::new(64.8).unwrap()).unwrap();
    /// assert!((t.celsius() - 60.0).abs() < 0.1);
    /// ```
    pub fn winding_temperature(&self, r_measured: Ohms) -> Result<Temperature, Error> {
        if self.alpha_per_k == 0.0 {
            return Err(Error::new("alpha", Reason::Inconsistent));
        }
        let r = r_measured.value();
        if !(r > 0.0) {
            return Err(Error::new("measured resistance", Reason::NotPositive));
        }
        let t_k = self.t_ref_k + (r / self.r_ref_ohm - 1.0) / self.alpha_per_k;
        Temperature::from_kelvin(t_k).map_err(|e| Error::new("measured resistance", e.reason))
    }

    /// Steady on-current I = V/R(T) at supply `v` (less any switch drop the caller subtracts).
    ///
    /// # Errors
    /// As [`Coil::resistance`].
    pub fn steady_current(&self, v: Volts, t: Temperature) -> Result<Amps, Error> {
        v.over(self.resistance(t)?)
    }

    /// Energy stored at current `i`: ½·L·I², in joules.
    pub fn stored_energy(&self, i: Amps) -> Joules {
        self.inductance().stored_energy(i)
    }

    /// Pull-in margin when hot and at low supply.
    ///
    /// A relay or valve operates at a given ampere-turn level, so its must-operate voltage,
    /// rated at the reference temperature, scales with R(T): V_op(T) = V_op,ref·R(T)/R_ref.
    /// The margin is the ratio of the lowest supply to that voltage at the hottest winding,
    /// minus one (≥ 0: it pulls in; < 0: it may not).
    ///
    /// # Errors
    /// `must_operate_ref` ≤ 0 → [`Reason::NotPositive`] on `"must-operate voltage"`;
    /// `v_supply_min` ≤ 0 → [`Reason::NotPositive`] on `"minimum supply"`; temperature as
    /// [`Coil::resistance`].
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature, Volts};
    /// let valve = Coil::copper(Henries::new(0.35).unwrap(), Ohms::new(56.0).unwrap(),
    ///                          Temperature::from_celsius(20.0).unwrap()).unwrap();
    /// // Must operate at 80 % of 24 V when cold; supply can sag to 21.6 V; winding up to 80 °C.
    /// let m = valve.pull_in_margin(Volts::new(19.2).unwrap(), Volts::new(21.6).unwrap(),
    ///                              Temperature::from_celsius(80.0).unwrap()).unwrap();
    /// assert!(m.margin < 0.0); // 21.6 V < 19.2 V · 1.236: it may not pull in when hot
    /// ```
    pub fn pull_in_margin(
        &self,
        must_operate_ref: Volts,
        v_supply_min: Volts,
        t_hot: Temperature,
    ) -> Result<PullIn, Error> {
        let v_op = must_operate_ref.value();
        if !(v_op > 0.0) {
            return Err(Error::new("must-operate voltage", Reason::NotPositive));
        }
        let v_min = v_supply_min.value();
        if !(v_min > 0.0) {
            return Err(Error::new("minimum supply", Reason::NotPositive));
        }
        let r_hot = self.resistance(t_hot)?.value();
        let v_needed = v_op * r_hot / self.r_ref_ohm;
        let margin = error::result("pull-in margin", v_min / v_needed - 1.0)?;
        Ok(PullIn {
            must_operate_hot: Volts::new(v_needed)?,
            margin,
        })
    }
}

/// Result of [`Coil::pull_in_margin`].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct PullIn {
    /// Must-operate voltage at the hot winding temperature.
    pub must_operate_hot: Volts,
    /// V_supply,min / V_op(T_hot) − 1: positive means it pulls in with that much to spare.
    pub margin: f32,
}
