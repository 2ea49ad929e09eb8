//! Reverse-breakdown devices: zener diodes, TVS diodes and a MOSFET's own avalanche.
//!
//! Three ways to describe the breakdown voltage V(I) at a reference temperature:
//!
//! - [`BreakdownLaw::Spice`], **SPICE's reverse breakdown**: the junction's reverse current is
//!   I = IBV·exp((V_j − BV)/(NBV·Vt)) and the terminal voltage adds the ohmic drop, so
//!
//!   ```text
//!   V(I) = BV + NBV·Vt·ln(I/IBV) + RS·I        (exact, every I > 0)
//!   ```
//!
//!   continuous through the knee at IBV; below it the current falls off exponentially with the
//!   voltage (the voltage falls logarithmically with the current, without bound as I → 0). In a
//!   decay the clamp therefore never quite stops conducting: the loop settles where the law's
//!   voltage meets what drives it, which for a clamp across the switch is a steady current
//!   IBV·exp(−(BV − V_supply)/(NBV·Vt)) (see [`crate::clamp::SwitchOff::steady_current`]).
//! - [`BreakdownLaw::FlooredAtBv`]: the same exponential above the knee, but held at BV below
//!   it, V(I) = BV + NBV·Vt·ln(1 + I/IBV) + RS·I. It agrees with SPICE's law for I ≫ IBV and
//!   parts from it near and below IBV (71 mV at 0.14·IBV with NBV·Vt = 52 mV). It is *not*
//!   SPICE's law; it models a clamp that stops conducting sharply at BV.
//! - [`BreakdownLaw::Datasheet`]: Vz at a test current Izt and a dynamic resistance rz, linear
//!   about the test point: V(I) = Vz + rz·(I − Izt).
//!
//! Each is shifted with temperature by a relative coefficient (as datasheets state it, in %/K,
//! here per kelvin): BV(T) = BV·(1 + TC·(T − T_ref)), applied to BV or to Vz (SPICE's TBV1 is the
//! same first-order law). A part-to-part tolerance scales BV or Vz ([`Breakdown::scaled`]), for
//! worst-case corners. A switch's avalanche is the datasheet form with rz = 0 or small.
//!
//! In the decay loop a breakdown device contributes V(I) = V₀ + r·I + a·L(ln I − ln I_b), with
//! L(x) = x (SPICE), L(x) = ln(1 + eˣ) (floored), or no logarithmic term (datasheet).

use crate::diode::params::checked_t;
use crate::diode::Ideality;
use crate::error::{self, Error, Reason};
use crate::math;
use crate::physics::vt_at;
use crate::units::{Amps, Ohms, PerKelvin, Temperature, Volts};

/// How the breakdown voltage depends on current (at the reference temperature).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum BreakdownLaw {
    /// SPICE's reverse breakdown, exact: V = BV + NBV·Vt·ln(I/IBV) + RS·I.
    Spice {
        /// Breakdown voltage BV at current IBV.
        bv: Volts,
        /// Current IBV at which the junction voltage is BV.
        ibv: Amps,
        /// Breakdown emission coefficient NBV (0.5 … 100).
        nbv: Ideality,
        /// Series resistance RS.
        rs: Ohms,
    },
    /// The exponential law held at BV below the knee (not SPICE's): V = BV + NBV·Vt·ln(1 +
    /// I/IBV) + RS·I.
    FlooredAtBv {
        /// Breakdown voltage BV, the floor.
        bv: Volts,
        /// Knee current IBV.
        ibv: Amps,
        /// Emission coefficient NBV (0.5 … 100).
        nbv: Ideality,
        /// Series resistance RS.
        rs: Ohms,
    },
    /// Datasheet pair: Vz at the test current Izt, and the dynamic resistance rz.
    Datasheet {
        /// Breakdown voltage Vz at the test current.
        vz: Volts,
        /// Test current Izt.
        izt: Amps,
        /// Dynamic (differential) resistance rz.
        rz: Ohms,
    },
}

/// The logarithmic term of an evaluated breakdown law.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) enum LogTerm {
    /// No logarithmic term.
    None,
    /// a·(ln I − ln I_b): SPICE's exact law.
    Exact,
    /// a·ln(1 + I/I_b): the floored law.
    Floored,
}

/// A zener, TVS or switch-avalanche breakdown with its temperature coefficient.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Breakdown {
    law: BreakdownLaw,
    tc: PerKelvin,
    t_ref_k: f32,
    /// Part-to-part scale of BV or Vz (1 nominal).
    scale: f32,
}

/// The breakdown law evaluated at one temperature: V(I) = v0 + r·I + a·L(ln I − ln_ib).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct BreakdownAt {
    pub v0: f32,
    pub r: f32,
    pub a: f32,
    pub ln_ib: f32,
    pub log: LogTerm,
}

impl BreakdownAt {
    /// No breakdown device in the loop.
    pub(crate) const NONE: BreakdownAt = BreakdownAt {
        v0: 0.0,
        r: 0.0,
        a: 0.0,
        ln_ib: 0.0,
        log: LogTerm::None,
    };
}

/// Largest breakdown voltage accepted, in volts.
pub const MAX_BREAKDOWN_V: f32 = 10_000.0;

fn check_voltage(v: Volts) -> Result<f32, Error> {
    let x = v.value();
    if !(x > 0.0) {
        return Err(Error::new("breakdown voltage", Reason::NotPositive));
    }
    if x > MAX_BREAKDOWN_V {
        return Err(Error::new(
            "breakdown voltage",
            Reason::OutsideValidatedRange,
        ));
    }
    Ok(x)
}

fn check_current(i: Amps) -> Result<f32, Error> {
    if i.value() > 0.0 {
        Ok(i.value())
    } else {
        Err(Error::new("breakdown current", Reason::NotPositive))
    }
}

fn check_nbv(nbv: Ideality) -> Result<f32, Error> {
    error::within("NBV", nbv.value(), 0.5, 100.0)
}

impl Breakdown {
    /// A breakdown device from its law, a relative temperature coefficient `tc` (for example
    /// +0.09 %/K), and the temperature `t_ref` the law is given at.
    ///
    /// # Errors
    /// BV or Vz ≤ 0 → [`Reason::NotPositive`], above 10 kV → [`Reason::OutsideValidatedRange`],
    /// on `"breakdown voltage"`; IBV or Izt ≤ 0 → [`Reason::NotPositive`] on
    /// `"breakdown current"`; NBV outside 0.5…100 → [`Reason::OutsideValidatedRange`] on
    /// `"NBV"`; a datasheet pair whose line reaches zero volts at zero current (rz·Izt ≥ Vz) →
    /// [`Reason::Inconsistent`] on `"rz"`; |TC| > 0.01 /K → [`Reason::OutsideValidatedRange`] on
    /// `"breakdown tempco"`; `t_ref` outside −100…250 °C → [`Reason::OutsideValidatedRange`] on
    /// `"reference temperature"`.
    ///
    /// ```
    /// use kickguard::breakdown::{Breakdown, BreakdownLaw};
    /// use kickguard::{Amps, Ohms, PerKelvin, Temperature, Volts};
    /// let t25 = Temperature::from_celsius(25.0)?;
    /// let z18 = Breakdown::new(
    ///     BreakdownLaw::Datasheet { vz: Volts::new(18.0)?, izt: Amps::new(0.005)?, rz: Ohms::new(20.0)? },
    ///     PerKelvin::percent_per_kelvin(0.09)?, t25)?;
    /// let v = z18.voltage(Amps::new(0.4)?, t25)?;
    /// assert!((v.value() - (18.0 + 20.0 * 0.395)).abs() < 1e-3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn new(law: BreakdownLaw, tc: PerKelvin, t_ref: Temperature) -> Result<Self, Error> {
        match law {
            BreakdownLaw::Spice { bv, ibv, nbv, .. }
            | BreakdownLaw::FlooredAtBv { bv, ibv, nbv, .. } => {
                check_voltage(bv)?;
                check_current(ibv)?;
                check_nbv(nbv)?;
            }
            BreakdownLaw::Datasheet { vz, izt, rz } => {
                let v = check_voltage(vz)?;
                let i = check_current(izt)?;
                if !(rz.value() * i < v) {
                    return Err(Error::new("rz", Reason::Inconsistent));
                }
            }
        }
        let c = tc.value();
        if !(c.abs() <= 0.01) {
            return Err(Error::new(
                "breakdown tempco",
                Reason::OutsideValidatedRange,
            ));
        }
        let t_ref_k = checked_t("reference temperature", t_ref)?;
        Ok(Breakdown {
            law,
            tc,
            t_ref_k,
            scale: 1.0,
        })
    }

    /// A fixed breakdown voltage with no current or temperature dependence (an ideal clamp, or
    /// a switch's avalanche where only the rated V(BR)DSS is known).
    ///
    /// # Errors
    /// `v` ≤ 0 → [`Reason::NotPositive`] on `"breakdown voltage"`.
    pub fn ideal(v: Volts) -> Result<Self, Error> {
        let law = BreakdownLaw::Datasheet {
            vz: v,
            izt: Amps::raw(1.0),
            rz: Ohms::raw(0.0),
        };
        Breakdown::new(law, PerKelvin::ZERO, Temperature::raw_kelvin(298.15))
    }

    /// The same device with its breakdown voltage (BV or Vz) scaled by `k`: a part-to-part
    /// tolerance corner (1.05 for +5 %). The dynamic resistance, the emission coefficient and
    /// the temperature coefficient are kept.
    ///
    /// # Errors
    /// `k` outside 0.5…1.5 → [`Reason::OutsideValidatedRange`] on `"breakdown tolerance"`; a
    /// datasheet pair whose scaled line would reach zero volts at zero current →
    /// [`Reason::Inconsistent`] on `"rz"`.
    ///
    /// ```
    /// use kickguard::breakdown::Breakdown;
    /// use kickguard::{Amps, Temperature, Volts};
    /// let av = Breakdown::ideal(Volts::new(66.0)?)?.scaled(1.15)?;
    /// let v = av.voltage(Amps::new(0.4)?, Temperature::from_celsius(25.0)?)?;
    /// assert!((v.value() - 75.9).abs() < 1e-3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn scaled(&self, k: f32) -> Result<Self, Error> {
        let k = error::within("breakdown tolerance", k, 0.5, 1.5)?;
        let scale = self.scale * k;
        if let BreakdownLaw::Datasheet { vz, izt, rz } = self.law {
            if !(rz.value() * izt.value() < vz.value() * scale) {
                return Err(Error::new("rz", Reason::Inconsistent));
            }
        }
        Ok(Breakdown { scale, ..*self })
    }

    /// The law this device was built from (before any tolerance scaling).
    pub fn law(&self) -> BreakdownLaw {
        self.law
    }

    /// Relative temperature coefficient.
    pub fn tc(&self) -> PerKelvin {
        self.tc
    }

    /// The breakdown voltage named by the law (BV or Vz, scaled, at the reference temperature).
    pub fn nominal_voltage(&self) -> Volts {
        let v = match self.law {
            BreakdownLaw::Spice { bv, .. } | BreakdownLaw::FlooredAtBv { bv, .. } => bv,
            BreakdownLaw::Datasheet { vz, .. } => vz,
        };
        Volts::raw(v.value() * self.scale)
    }

    /// Evaluated law at `t_k` kelvin (validated temperature).
    pub(crate) fn at(&self, t_k: f32) -> BreakdownAt {
        let shift = self.scale * (1.0 + self.tc.value() * (t_k - self.t_ref_k));
        match self.law {
            BreakdownLaw::Spice { bv, ibv, nbv, rs }
            | BreakdownLaw::FlooredAtBv { bv, ibv, nbv, rs } => BreakdownAt {
                v0: bv.value() * shift,
                r: rs.value(),
                a: nbv.value() * vt_at(t_k),
                ln_ib: math::ln(ibv.value()),
                log: if matches!(self.law, BreakdownLaw::Spice { .. }) {
                    LogTerm::Exact
                } else {
                    LogTerm::Floored
                },
            },
            BreakdownLaw::Datasheet { vz, izt, rz } => BreakdownAt {
                v0: vz.value() * shift - rz.value() * izt.value(),
                r: rz.value(),
                a: 0.0,
                ln_ib: 0.0,
                log: LogTerm::None,
            },
        }
    }

    /// Breakdown voltage at current `i` and temperature `t`, in volts.
    ///
    /// Work: constant (at most one logarithm).
    ///
    /// # Errors
    /// `i` < 0 → [`Reason::Negative`] on `"breakdown current"`; `i` = 0 on SPICE's exact law
    /// (its voltage falls without bound there) → [`Reason::NotPositive`] on
    /// `"breakdown current"`; `t` outside −100…250 °C, or a temperature at which the
    /// coefficient drives the voltage to zero or below → [`Reason::OutsideValidatedRange`] on
    /// `"temperature"`.
    pub fn voltage(&self, i: Amps, t: Temperature) -> Result<Volts, Error> {
        let i_a = i.value();
        if i_a < 0.0 {
            return Err(Error::new("breakdown current", Reason::Negative));
        }
        let b = self.at_checked(t)?;
        if i_a == 0.0 && b.log == LogTerm::Exact {
            return Err(Error::new("breakdown current", Reason::NotPositive));
        }
        Volts::new(b.eval(i_a))
    }

    /// The law at temperature `t`, checked: the voltage at the knee must stay positive.
    pub(crate) fn at_checked(&self, t: Temperature) -> Result<BreakdownAt, Error> {
        let t_k = checked_t("temperature", t)?;
        let b = self.at(t_k);
        if b.v0 > 0.0 && b.v0.is_finite() {
            Ok(b)
        } else {
            Err(Error::new("temperature", Reason::OutsideValidatedRange))
        }
    }
}

impl BreakdownAt {
    /// L(ln i − ln I_b) for ln i = `u`: the logarithmic part, zero when the law has none.
    #[inline]
    pub(crate) fn log_part_u(&self, u: f32) -> f32 {
        match self.log {
            LogTerm::None => 0.0,
            LogTerm::Exact => u - self.ln_ib,
            LogTerm::Floored => math::ln_1p_exp(u - self.ln_ib),
        }
    }

    /// V(i) for i > 0 (for i = 0: V₀, the floor of the floored and datasheet laws).
    #[inline]
    pub(crate) fn eval(&self, i_a: f32) -> f32 {
        if i_a > 0.0 {
            let log = if self.log == LogTerm::None {
                0.0
            } else {
                self.log_part_u(math::ln(i_a))
            };
            self.v0 + self.r * i_a + self.a * log
        } else {
            self.v0
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn spice_law_falls_below_the_knee_floored_law_does_not() {
        // Source: SPICE reverse breakdown, I = IBV·exp((V − BV)/(NBV·Vt)) (Nagel 1975):
        // at I = IBV/e the voltage is one NBV·Vt below BV; the floored law stays above BV.
        let t = Temperature::from_celsius(25.0).unwrap();
        let nbv = Ideality::new(2.0).unwrap();
        let (bv, ibv, rs) = (
            Volts::new(18.0).unwrap(),
            Amps::new(1e-3).unwrap(),
            Ohms::raw(0.0),
        );
        let spice =
            Breakdown::new(BreakdownLaw::Spice { bv, ibv, nbv, rs }, PerKelvin::ZERO, t).unwrap();
        let floored = Breakdown::new(
            BreakdownLaw::FlooredAtBv { bv, ibv, nbv, rs },
            PerKelvin::ZERO,
            t,
        )
        .unwrap();
        let i = Amps::new(1e-3 / core::f32::consts::E).unwrap();
        let a = 2.0 * vt_at(298.15);
        let vs = spice.voltage(i, t).unwrap().value();
        assert!((vs - (18.0 - a)).abs() < 1e-5, "{vs}");
        assert!(floored.voltage(i, t).unwrap().value() > 18.0);
        assert_eq!(
            spice.voltage(Amps::raw(0.0), t).unwrap_err().reason,
            Reason::NotPositive
        );
    }
}
