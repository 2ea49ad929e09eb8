//! Sizing: the window of zener voltages that keeps the switch below a fraction of its rating and
//! still brings the coil current down to the release current within a required time.
//!
//! For a zener + diode clamp across the coil the switch peaks at V_s + V_Z(I₀) + V_D(I₀) (see
//! [`super`]), with V_Z(I) = Vz + r_z·(I − I_zt) (datasheet form). Hence the largest zener voltage
//! is, in closed form,
//!
//! ```text
//! Vz_max = k·V_rating − V_s − V_D(I₀) − r_z·(I₀ − I_zt)
//! ```
//!
//! The decay time to the release current falls monotonically as Vz rises (a larger clamp voltage
//! opposes the current harder at every instant), so the smallest zener voltage that meets the
//! required time is the root of t(Vz) = t_required, found by bracketed Illinois iteration between
//! the smallest valid Vz and Vz_max (at most 60 steps, tolerance 1 mV).

use super::{Clamp, Operating, Side, SwitchOff};
use crate::breakdown::{Breakdown, BreakdownLaw};
use crate::coil::Coil;
use crate::diode::Diode;
use crate::error::{Error, Reason};
use crate::solve::illinois;
use crate::units::{Amps, Duty, Ohms, PerKelvin, Seconds, Temperature, Volts};

/// What a zener + diode clamp across a coil must achieve, and the parts it is built from.
/// Fields are public for readable literals; [`ZenerSizing::window`] validates them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ZenerSizing {
    /// The coil.
    pub coil: Coil,
    /// The blocking diode in series with the zener.
    pub diode: Diode,
    /// Zener dynamic resistance r_z of the family considered.
    pub zener_rz: Ohms,
    /// Zener test current I_zt at which Vz is specified.
    pub zener_izt: Amps,
    /// Highest supply voltage (the worst case for the switch).
    pub v_supply: Volts,
    /// Coil current at switch-off.
    pub i_start: Amps,
    /// Winding temperature.
    pub t_coil: Temperature,
    /// Clamp parts' temperature.
    pub t_clamp: Temperature,
    /// The switch's voltage rating (for example V(BR)DSS).
    pub switch_rating: Volts,
    /// Fraction of the rating the peak may reach (for example 0.8), above 0.
    pub rating_fraction: Duty,
    /// Current below which the relay or valve has released.
    pub release_current: Amps,
    /// Longest acceptable time from switch-off to the release current.
    pub max_release_time: Seconds,
}

/// A window of zener voltages (at the test current) that meets both requirements.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ZenerWindow {
    /// Smallest Vz that still meets the release time.
    pub min: Volts,
    /// Largest Vz that keeps the switch within its derated rating.
    pub max: Volts,
}

impl ZenerSizing {
    fn decay_time(&self, vz: f32) -> Result<f32, Error> {
        let law = BreakdownLaw::Datasheet {
            vz: Volts::new(vz)?,
            izt: self.zener_izt,
            rz: self.zener_rz,
        };
        let zener = Breakdown::new(law, PerKelvin::ZERO, self.t_clamp)?;
        let clamp = Clamp::ZenerDiode {
            zener,
            diode: self.diode,
        };
        let op = Operating {
            supply: self.v_supply,
            start_current: self.i_start,
            winding: self.t_coil,
            diodes: self.t_clamp,
            breakdown: self.t_clamp,
        };
        let off = SwitchOff::new(&self.coil, &clamp, Side::Low, &op)?;
        Ok(off.time_to(self.release_current)?.value())
    }

    /// The window of zener voltages meeting both requirements.
    ///
    /// Work: at most 62 switch-off integrations (the bracketed solve's 60 steps and its two
    /// ends).
    ///
    /// # Errors
    /// `rating_fraction` of 0 → [`Reason::OutsideValidatedRange`] on `"rating fraction"`; no zener fits under the derated rating → [`Reason::Inconsistent`] on
    /// `"switch rating"`; even the largest allowed zener is too slow → [`Reason::Inconsistent`]
    /// on `"max release time"` (the requirements conflict); errors of [`SwitchOff::new`] and
    /// [`SwitchOff::time_to`].
    ///
    /// ```
    /// use kickguard::clamp::sizing::ZenerSizing;
    /// use kickguard::{coil::Coil, diode::{Diode, DiodeParams}, Amps, Duty, Henries, Ohms, Seconds, Temperature, Volts};
    /// let t = Temperature::from_celsius(20.0)?;
    /// let s = ZenerSizing {
    ///     coil: Coil::copper(Henries::new(0.35)?, Ohms::new(56.0)?, t)?,
    ///     diode: Diode::Law(DiodeParams::SILICON),
    ///     zener_rz: Ohms::new(10.0)?, zener_izt: Amps::new(0.01)?,
    ///     v_supply: Volts::new(26.4)?, i_start: Amps::new(0.47)?,
    ///     t_coil: t, t_clamp: t,
    ///     switch_rating: Volts::new(60.0)?, rating_fraction: Duty::new(0.8)?,
    ///     release_current: Amps::new(0.05)?, max_release_time: Seconds::new(5e-3)?,
    /// };
    /// let w = s.window()?;
    /// assert!(w.min < w.max && w.max.value() < 48.0 - 26.4);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn window(&self) -> Result<ZenerWindow, Error> {
        let k = self.rating_fraction.value();
        if !(k > 0.0) {
            return Err(Error::new("rating fraction", Reason::OutsideValidatedRange));
        }
        let i0 = self.i_start.value();
        let vd = self.diode.forward_drop(self.i_start, self.t_clamp)?.value();
        let rz = self.zener_rz.value();
        let izt = self.zener_izt.value();
        let vz_max = k * self.switch_rating.value() - self.v_supply.value() - vd - rz * (i0 - izt);
        // Smallest valid datasheet zener: its line must stay above 0 V at zero current.
        let vz_floor = rz * izt + 1e-3;
        if !(vz_max > vz_floor) {
            return Err(Error::new("switch rating", Reason::Inconsistent));
        }
        let t_req = self.max_release_time.value();
        if self.decay_time(vz_max)? > t_req {
            return Err(Error::new("max release time", Reason::Inconsistent));
        }
        let vz_min = if self.decay_time(vz_floor)? <= t_req {
            vz_floor
        } else {
            // t(Vz) − t_req changes sign in [floor, max]; errors inside map to NaN → no root.
            let f = |vz: f32| self.decay_time(vz).map(|t| t - t_req).unwrap_or(f32::NAN);
            illinois(f, vz_floor, vz_max, 1e-3, 60)
                .ok_or(Error::new("max release time", Reason::Inconsistent))?
        };
        Ok(ZenerWindow {
            min: Volts::new(vz_min)?,
            max: Volts::new(vz_max)?,
        })
    }
}
