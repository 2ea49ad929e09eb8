//! Reverse-breakdown devices: zener diodes, TVS diodes and a MOSFET's own avalanche.
//!
//! Two ways to describe the breakdown voltage V(I) at a reference temperature:
//!
//! - **SPICE breakdown parameters** BV, IBV, NBV, RS. SPICE's reverse-breakdown branch,
//!   I = IBV·exp((V − BV)/(NBV·Vt)), solved for V, is V = BV + NBV·Vt·ln(I/IBV). It is used here as
//!   V(I) = BV + NBV·Vt·ln(1 + I/IBV) + RS·I, which equals SPICE's law for I ≫ IBV and stays at BV
//!   (instead of falling without bound) as I → 0, where the device stops conducting in practice.
//! - **Datasheet pair**: Vz at a test current Izt and a dynamic resistance rz, linear about the test
//!   point: V(I) = Vz + rz·(I − Izt).
//!
//! Either is shifted with temperature by a relative coefficient (as datasheets state it, in %/K,
//! here per kelvin): BV(T) = BV·(1 + TC·(T − T_ref)), applied to BV or to Vz. (SPICE's TBV1 is the
//! same first-order law.) A switch's avalanche is the datasheet form with rz = 0 or small.
//!
//! In the decay loop a breakdown device contributes V(I) = V₀ + r·I + a·ln(1 + I/I_b), with
//! (V₀, r, a, I_b) = (BV(T), RS, NBV·Vt, IBV) or (Vz(T) − rz·Izt, rz, 0, –).

use crate::error::{self, Error, Reason};
use crate::physics::vt_at;
use crate::units::{Amps, Ohms, Temperature, Volts};

/// How the breakdown voltage depends on current (at the reference temperature).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum BreakdownLaw {
    /// SPICE-class parameters: BV (V), IBV (A), NBV (dimensionless), RS (Ω).
    Spice {
        /// Breakdown voltage BV at current IBV.
        bv: Volts,
        /// Current IBV at which the voltage is BV.
        ibv: Amps,
        /// Breakdown emission coefficient NBV.
        nbv: f32,
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

/// A zener, TVS or switch-avalanche breakdown with its temperature coefficient.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Breakdown {
    law: BreakdownLaw,
    tc_per_k: f32,
    t_ref_k: f32,
}

/// The breakdown law evaluated at one temperature: V(I) = v0 + r·I + a·ln(1 + I/ib).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct BreakdownAt {
    pub v0: f32,
    pub r: f32,
    pub a: f32,
    pub ln_ib: f32,
}

impl Breakdown {
    /// A breakdown device from its law, a relative temperature coefficient `tc_per_k`
    /// (for example 0.0009 for +0.09 %/K), and the temperature the law is given at.
    ///
    /// # Errors
    /// BV or Vz ≤ 0 → [`Reason::NotPositive`] on `"breakdown voltage"`; IBV or Izt ≤ 0 →
    /// [`Reason::NotPositive`] on `"breakdown current"`; NBV ≤ 0 → on `"NBV"`; a datasheet pair whose
    /// line reaches zero volts at zero current (rz·Izt ≥ Vz) → [`Reason::Inconsistent`] on `"rz"`;
    /// |TC| > 0.01 /K → [`Reason::OutsideValidatedRange`] on `"breakdown tempco"`.
    ///
    /// ```
    /// use kickguard::breakdown::{Breakdown, BreakdownLaw};
    /// use kickguard::{Amps, Ohms, Temperature, Volts};
    /// let z18 = Breakdown::new(
    ///     BreakdownLaw::Datasheet { vz: Volts::new(18.0).unwrap(), izt: Amps::new(0.005).unwrap(),
    ///                               rz: Ohms::new(20.0).unwrap() },
    ///     0.0009, Temperature::from_celsius(25.0).unwrap()).unwrap();
    /// let v = z18.voltage(Amps::new(0.4).unwrap(), Temperature::from_celsius(25.0).unwrap()).unwrap();
    /// assert!((v.value() - (18.0 + 20.0 * 0.395)).abs() < 1e-3);
    /// ```
    pub fn new(law: BreakdownLaw, tc_per_k: f32, t_ref: Temperature) -> Result<Self, Error> {
        match law {
            BreakdownLaw::Spice { bv, ibv, nbv, .. } => {
                if !(bv.value() > 0.0) {
                    return Err(Error::new("breakdown voltage", Reason::NotPositive));
                }
                if !(ibv.value() > 0.0) {
                    return Err(Error::new("breakdown current", Reason::NotPositive));
                }
                let nbv = error::positive("NBV", nbv)?;
                if nbv > 100.0 {
                    return Err(Error::new("NBV", Reason::OutsideValidatedRange));
                }
            }
            BreakdownLaw::Datasheet { vz, izt, rz } => {
                if !(vz.value() > 0.0) {
                    return Err(Error::new("breakdown voltage", Reason::NotPositive));
                }
                if !(izt.value() > 0.0) {
                    return Err(Error::new("breakdown current", Reason::NotPositive));
                }
                if !(rz.value() * izt.value() < vz.value()) {
                    return Err(Error::new("rz", Reason::Inconsistent));
                }
            }
        }
        let tc = error::finite("breakdown tempco", tc_per_k)?;
        if !(tc.abs() <= 0.01) {
            return Err(Error::new(
                "breakdown tempco",
                Reason::OutsideValidatedRange,
            ));
        }
        Ok(Breakdown {
            law,
            tc_per_k: tc,
            t_ref_k: t_ref.kelvin(),
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
        Breakdown::new(law, 0.0, Temperature::raw_kelvin(298.15))
    }

    /// The law this device was built from.
    pub fn law(&self) -> BreakdownLaw {
        self.law
    }

    /// Relative temperature coefficient, per kelvin.
    pub fn tc_per_k(&self) -> f32 {
        self.tc_per_k
    }

    /// Evaluated law at `t_k` kelvin (validated temperature).
    pub(crate) fn at(&self, t_k: f32) -> BreakdownAt {
        let scale = 1.0 + self.tc_per_k * (t_k - self.t_ref_k);
        match self.law {
            BreakdownLaw::Spice { bv, ibv, nbv, rs } => BreakdownAt {
                v0: bv.value() * scale,
                r: rs.value(),
                a: nbv * vt_at(t_k),
                ln_ib: crate::math::ln(ibv.value()),
            },
            BreakdownLaw::Datasheet { vz, izt, rz } => BreakdownAt {
                v0: vz.value() * scale - rz.value() * izt.value(),
                r: rz.value(),
                a: 0.0,
                ln_ib: 0.0,
            },
        }
    }

    /// Breakdown voltage at current `i` (≥ 0) and temperature `t`, in volts.
    ///
    /// # Errors
    /// `i` < 0 → [`Reason::Negative`] on `"breakdown current"`; a temperature at which the
    /// coefficient drives the voltage to zero or below → [`Reason::OutsideValidatedRange`] on
    /// `"temperature"`.
    pub fn voltage(&self, i: Amps, t: Temperature) -> Result<Volts, Error> {
        let i_a = i.value();
        if i_a < 0.0 {
            return Err(Error::new("breakdown current", Reason::Negative));
        }
        let b = self.at_checked(t)?;
        Volts::new(b.eval(i_a))
    }

    pub(crate) fn at_checked(&self, t: Temperature) -> Result<BreakdownAt, Error> {
        let b = self.at(t.kelvin());
        if b.v0 > 0.0 && b.v0.is_finite() {
            Ok(b)
        } else {
            Err(Error::new("temperature", Reason::OutsideValidatedRange))
        }
    }
}

impl BreakdownAt {
    /// The ln(1 + I/I_b) part, zero when the law has none.
    #[inline]
    pub(crate) fn log_part(&self, i_a: f32) -> f32 {
        if self.a == 0.0 {
            0.0
        } else {
            crate::math::ln_1p_exp(crate::math::ln(i_a) - self.ln_ib)
        }
    }

    #[inline]
    pub(crate) fn eval(&self, i_a: f32) -> f32 {
        if i_a > 0.0 {
            self.v0 + self.r * i_a + self.a * self.log_part(i_a)
        } else {
            self.v0
        }
    }
}
