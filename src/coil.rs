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
//! that temperature (for copper α_T = 1/(1/α₂₀ + T − 20 K), e.g. 0.00385 /K at 25 °C). A coil
//! can also have no temperature coefficient at all ([`Coil::fixed`]): its resistance is the
//! same at every temperature, and it has no reference temperature. The inductance is taken as
//! constant (an air-gap-dominated magnetic circuit; iron saturation and armature position are not
//! modelled).
//!
//! Validated range of the linear law: reference and winding temperatures from −100 to 250 °C
//! (beyond that, copper's resistivity bends away from a straight line and insulation classes
//! end long before).

use crate::error::{self, Error, Reason};
use crate::units::{Amps, Henries, Joules, Ohms, PerKelvin, Temperature, Volts};

/// Annealed copper's resistance temperature coefficient at 20 °C, 0.00393 /K (IEC 60028).
pub const COPPER_ALPHA_20C_PER_K: f32 = 0.00393;

/// Temperature at which [`COPPER_ALPHA_20C_PER_K`] is defined: 20 °C.
pub const COPPER_ALPHA_REFERENCE: Temperature = match Temperature::from_celsius(20.0) {
    Ok(t) => t,
    Err(_) => Temperature::raw_kelvin(293.15),
};

/// Lowest winding or reference temperature of the linear law, K (−100 °C).
pub const T_MIN_K: f32 = 173.15;
/// Highest winding or reference temperature of the linear law, K (250 °C).
pub const T_MAX_K: f32 = 523.15;

/// How a coil's resistance depends on temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
enum Tempco {
    /// Linear about a reference: R(T) = R_ref·(1 + α·(T − T_ref)).
    Linear { t_ref_k: f32, alpha: PerKelvin },
    /// No dependence: R is the same at every temperature.
    None,
}

/// An inductive coil: inductance L, resistance R_ref (at T_ref, if it has a temperature
/// coefficient) and a resistance temperature coefficient α (per kelvin, at T_ref).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Coil {
    l_h: f32,
    r_ref_ohm: f32,
    tempco: Tempco,
}

impl Coil {
    /// A copper coil: L, R at `t_ref`, with α for annealed copper referred to `t_ref` from
    /// α₂₀ = 0.00393 /K (IEC 60028) by α_T = 1/(1/α₂₀ + (T_ref − 20 °C)).
    ///
    /// # Errors
    /// `r_ref` = 0 → [`Reason::NotPositive`] on `"coil resistance"`; `t_ref` outside −100…250 °C
    /// → [`Reason::OutsideValidatedRange`] on `"reference temperature"`.
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature};
    /// let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, Temperature::from_celsius(20.0)?)?;
    /// let hot = valve.resistance(Temperature::from_celsius(80.0)?)?;
    /// assert!((hot.value() - 56.0 * (1.0 + 0.00393 * 60.0)).abs() < 1e-3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn copper(l: Henries, r_ref: Ohms, t_ref: Temperature) -> Result<Self, Error> {
        let t = checked_reference(t_ref)?;
        let shift = t - COPPER_ALPHA_REFERENCE.kelvin();
        // 1/α₂₀ = 254.5 K and the shift is −120…230 K here: the denominator stays within 134…485 K.
        let alpha = 1.0 / (1.0 / COPPER_ALPHA_20C_PER_K + shift);
        Coil::new(l, r_ref, t_ref, PerKelvin::new(alpha)?)
    }

    /// A coil with an explicit coefficient `alpha` at `t_ref`.
    ///
    /// # Errors
    /// `r_ref` = 0 → [`Reason::NotPositive`] on `"coil resistance"`; `t_ref` outside −100…250 °C
    /// → [`Reason::OutsideValidatedRange`] on `"reference temperature"`; α outside −0.01…0.02 /K
    /// (no winding metal is outside that) → [`Reason::OutsideValidatedRange`] on `"alpha"`.
    pub fn new(
        l: Henries,
        r_ref: Ohms,
        t_ref: Temperature,
        alpha: PerKelvin,
    ) -> Result<Self, Error> {
        let r = positive_resistance(r_ref)?;
        let t_ref_k = checked_reference(t_ref)?;
        let alpha_per_k = error::within("alpha", alpha.value(), -0.01, 0.02)?;
        Ok(Coil {
            l_h: l.value(),
            r_ref_ohm: r,
            tempco: Tempco::Linear {
                t_ref_k,
                alpha: PerKelvin::new(alpha_per_k)?,
            },
        })
    }

    /// A coil whose resistance does not depend on temperature (characterised at its operating
    /// temperature, or a resistive load where the winding's heating does not matter). It has no
    /// reference temperature and cannot serve as a thermometer.
    ///
    /// # Errors
    /// `r` = 0 → [`Reason::NotPositive`] on `"coil resistance"`.
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature};
    /// let c = Coil::fixed(Henries::new(0.1)?, Ohms::new(20.0)?)?;
    /// assert_eq!(c.resistance(Temperature::from_celsius(100.0)?)?.value(), 20.0);
    /// assert!(c.reference_temperature().is_none());
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn fixed(l: Henries, r: Ohms) -> Result<Self, Error> {
        Ok(Coil {
            l_h: l.value(),
            r_ref_ohm: positive_resistance(r)?,
            tempco: Tempco::None,
        })
    }

    /// The same coil with L and R scaled (for tolerance corners: 0.9 is −10 %).
    ///
    /// # Errors
    /// A scale ≤ 0 or non-finite → [`Reason::NotPositive`] / [`Reason::NotFinite`] on
    /// `"inductance scale"` / `"resistance scale"`; scaled values outside the quantity bounds →
    /// the errors of [`Henries::new`] / [`Ohms::new`].
    pub fn scaled(&self, l_scale: f32, r_scale: f32) -> Result<Self, Error> {
        let ls = error::positive("inductance scale", l_scale)?;
        let rs = error::positive("resistance scale", r_scale)?;
        let l = Henries::new(self.l_h * ls)?;
        let r = Ohms::new(self.r_ref_ohm * rs)?;
        Ok(Coil {
            l_h: l.value(),
            r_ref_ohm: positive_resistance(r)?,
            tempco: self.tempco,
        })
    }

    /// Inductance L.
    pub fn inductance(&self) -> Henries {
        Henries::raw(self.l_h)
    }

    /// Resistance at the reference temperature (for a coil without a temperature coefficient,
    /// its resistance).
    pub fn resistance_ref(&self) -> Ohms {
        Ohms::raw(self.r_ref_ohm)
    }

    /// Reference temperature of the resistance, if the coil has a temperature coefficient.
    pub fn reference_temperature(&self) -> Option<Temperature> {
        match self.tempco {
            Tempco::Linear { t_ref_k, .. } => Some(Temperature::raw_kelvin(t_ref_k)),
            Tempco::None => None,
        }
    }

    /// Resistance temperature coefficient α at the reference temperature, per kelvin (zero for a
    /// coil without one).
    pub fn alpha(&self) -> PerKelvin {
        match self.tempco {
            Tempco::Linear { alpha, .. } => alpha,
            Tempco::None => PerKelvin::ZERO,
        }
    }

    /// R(T) = R_ref·(1 + α·(T − T_ref)), in ohms (linear convention, see the module docs); R for
    /// a coil without a temperature coefficient.
    ///
    /// # Errors
    /// `t` outside −100…250 °C → [`Reason::OutsideValidatedRange`] on `"winding temperature"`
    /// (also where the law would give R ≤ 0, possible only with a negative α).
    pub fn resistance(&self, t: Temperature) -> Result<Ohms, Error> {
        let t_k = error::within("winding temperature", t.kelvin(), T_MIN_K, T_MAX_K)?;
        let r = match self.tempco {
            Tempco::Linear { t_ref_k, alpha } => {
                self.r_ref_ohm * (1.0 + alpha.value() * (t_k - t_ref_k))
            }
            Tempco::None => self.r_ref_ohm,
        };
        if r > 0.0 {
            Ohms::new(r).map_err(|e| e.on("winding temperature"))
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
    /// No temperature coefficient, or α = 0 (the coil carries no temperature information) →
    /// [`Reason::Inconsistent`] on `"coil temperature coefficient"`; `r_measured` = 0 →
    /// [`Reason::NotPositive`] on `"measured resistance"`; a result outside −100…250 °C →
    /// [`Reason::OutsideValidatedRange`] on `"measured resistance"`.
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature};
    /// let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, Temperature::from_celsius(20.0)?)?;
    /// let t = valve.winding_temperature(Ohms::new(64.8)?)?;
    /// assert!((t.celsius() - 60.0).abs() < 0.1);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn winding_temperature(&self, r_measured: Ohms) -> Result<Temperature, Error> {
        let (t_ref_k, alpha) = match self.tempco {
            Tempco::Linear { t_ref_k, alpha } if alpha.value() != 0.0 => (t_ref_k, alpha.value()),
            _ => {
                return Err(Error::new(
                    "coil temperature coefficient",
                    Reason::Inconsistent,
                ))
            }
        };
        let r = r_measured.value();
        if !(r > 0.0) {
            return Err(Error::new("measured resistance", Reason::NotPositive));
        }
        let t_k = t_ref_k + (r / self.r_ref_ohm - 1.0) / alpha;
        let t_k = error::within("measured resistance", t_k, T_MIN_K, T_MAX_K)?;
        Ok(Temperature::raw_kelvin(t_k))
    }

    /// Steady on-current I = V/R(T) at supply `v` (less any switch drop the caller subtracts).
    ///
    /// # Errors
    /// `v` ≤ 0 → [`Reason::NotPositive`] on `"supply voltage"`; errors of [`Coil::resistance`].
    pub fn steady_current(&self, v: Volts, t: Temperature) -> Result<Amps, Error> {
        if !(v.value() > 0.0) {
            return Err(Error::new("supply voltage", Reason::NotPositive));
        }
        v.over(self.resistance(t)?)
    }

    /// Energy stored at current `i`: ½·L·I², in joules.
    ///
    /// # Errors
    /// As [`Henries::stored_energy`].
    pub fn stored_energy(&self, i: Amps) -> Result<Joules, Error> {
        self.inductance().stored_energy(i)
    }

    /// The current at which the magnetic circuit acts, from a datasheet voltage: a relay or
    /// valve operates (and releases) at a given ampere-turn level, so its must-operate or
    /// must-release voltage, stated at the datasheet's reference temperature, corresponds to the
    /// current V/R_ref, the same at every winding temperature.
    ///
    /// # Errors
    /// `v_datasheet` ≤ 0 → [`Reason::NotPositive`] on `"datasheet voltage"`.
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature, Volts};
    /// let relay = Coil::copper(Henries::new(0.9)?, Ohms::new(160.0)?, Temperature::from_celsius(20.0)?)?;
    /// // Must release at 10 % of 12 V: 1.2 V / 160 Ω = 7.5 mA, hot or cold.
    /// assert!((relay.magnetic_current(Volts::new(1.2)?)?.value() - 0.0075).abs() < 1e-7);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn magnetic_current(&self, v_datasheet: Volts) -> Result<Amps, Error> {
        if !(v_datasheet.value() > 0.0) {
            return Err(Error::new("datasheet voltage", Reason::NotPositive));
        }
        v_datasheet.over(self.resistance_ref())
    }

    /// Pull-in margin when hot and at low supply.
    ///
    /// The coil operates at the current `operate_current` (from the datasheet's must-operate
    /// voltage by [`Coil::magnetic_current`]), so with the winding at `t_hot` it needs
    /// V_op(T) = I_op·R(T) = V_op,ref·R(T)/R_ref. The margin is the ratio of the lowest supply to
    /// that voltage, minus one (≥ 0: it pulls in; < 0: it may not).
    ///
    /// # Errors
    /// `operate_current` ≤ 0 → [`Reason::NotPositive`] on `"operate current"`;
    /// `v_supply_min` ≤ 0 → [`Reason::NotPositive`] on `"minimum supply"`; temperature as
    /// [`Coil::resistance`].
    ///
    /// ```
    /// use kickguard::{coil::Coil, Henries, Ohms, Temperature, Volts};
    /// let valve = Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, Temperature::from_celsius(20.0)?)?;
    /// // Must operate at 80 % of 24 V when cold; supply can sag to 21.6 V; winding up to 80 °C.
    /// let i_op = valve.magnetic_current(Volts::new(19.2)?)?;
    /// let m = valve.pull_in_margin(i_op, Volts::new(21.6)?, Temperature::from_celsius(80.0)?)?;
    /// assert!(m.margin < 0.0); // 21.6 V < 19.2 V · 1.236: it may not pull in when hot
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn pull_in_margin(
        &self,
        operate_current: Amps,
        v_supply_min: Volts,
        t_hot: Temperature,
    ) -> Result<PullIn, Error> {
        let i_op = operate_current.value();
        if !(i_op > 0.0) {
            return Err(Error::new("operate current", Reason::NotPositive));
        }
        let v_min = v_supply_min.value();
        if !(v_min > 0.0) {
            return Err(Error::new("minimum supply", Reason::NotPositive));
        }
        let r_hot = self.resistance(t_hot)?.value();
        let v_needed = Volts::new(i_op * r_hot).map_err(|e| e.on("operate current"))?;
        let margin = error::result("pull-in margin", v_min / v_needed.value() - 1.0)?;
        Ok(PullIn {
            must_operate_hot: v_needed,
            margin,
        })
    }
}

fn positive_resistance(r: Ohms) -> Result<f32, Error> {
    let r = r.value();
    if r > 0.0 {
        Ok(r)
    } else {
        Err(Error::new("coil resistance", Reason::NotPositive))
    }
}

fn checked_reference(t_ref: Temperature) -> Result<f32, Error> {
    error::within("reference temperature", t_ref.kelvin(), T_MIN_K, T_MAX_K)
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn errors_name_the_input_at_fault() {
        // Issue: a 1 K reference temperature was blamed on "alpha".
        let l = Henries::new(0.1).unwrap();
        let r = Ohms::new(10.0).unwrap();
        let e = Coil::copper(l, r, Temperature::from_kelvin(1.0).unwrap()).unwrap_err();
        assert_eq!(
            e,
            Error::new("reference temperature", Reason::OutsideValidatedRange)
        );
        let c = Coil::fixed(l, r).unwrap();
        assert_eq!(
            c.winding_temperature(r).unwrap_err().input,
            "coil temperature coefficient"
        );
        assert_eq!(
            c.steady_current(Volts::new(-1.0).unwrap(), COPPER_ALPHA_REFERENCE)
                .unwrap_err()
                .input,
            "supply voltage"
        );
    }
}
