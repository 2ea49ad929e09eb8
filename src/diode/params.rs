//! SPICE-class diode parameters (IS, N, RS, EG, XTI, TNOM), their typed forms, and generic
//! presets; [`Diode`], a diode in a circuit: its law, or a stated fixed drop.

use crate::error::{self, Error, Reason};
use crate::units::{Amps, Ohms, Temperature, Volts};

/// Lowest temperature at which the diode functions are evaluated: 173.15 K (−100 °C).
pub const T_MIN_K: f32 = 173.15;
/// Highest temperature at which the diode functions are evaluated: 523.15 K (250 °C).
pub const T_MAX_K: f32 = 523.15;

/// An emission coefficient (ideality factor): N of a forward junction, NBV of a breakdown.
/// Dimensionless, 0.1 … 100 here; each model narrows it further (N: 0.5 … 5).
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Ideality(f32);

impl Ideality {
    /// An emission coefficient.
    ///
    /// # Errors
    /// Non-finite → [`Reason::NotFinite`]; outside 0.1 … 100 → [`Reason::OutsideValidatedRange`];
    /// both on `"emission coefficient"`.
    pub const fn new(n: f32) -> Result<Self, Error> {
        match error::within("emission coefficient", n, 0.1, 100.0) {
            Ok(n) => Ok(Ideality(n)),
            Err(e) => Err(e),
        }
    }
    /// The coefficient.
    pub const fn value(self) -> f32 {
        self.0
    }
}

/// EG, the activation energy of the saturation current (the band gap for a pn junction, the
/// barrier height for a Schottky), in electron-volts: 0.4 … 3.6 eV (germanium-class Schottky
/// barriers to silicon carbide).
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BandGap(f32);

impl BandGap {
    /// Silicon, 1.11 eV (the SPICE default).
    pub const SILICON: BandGap = BandGap(1.11);
    /// A silicon Schottky barrier, 0.69 eV (the usual SPICE choice).
    pub const SCHOTTKY: BandGap = BandGap(0.69);

    /// EG in eV.
    ///
    /// # Errors
    /// Non-finite → [`Reason::NotFinite`]; outside 0.4 … 3.6 eV →
    /// [`Reason::OutsideValidatedRange`]; both on `"EG"`.
    pub const fn ev(eg: f32) -> Result<Self, Error> {
        match error::within("EG", eg, 0.4, 3.6) {
            Ok(e) => Ok(BandGap(e)),
            Err(e) => Err(e),
        }
    }
    /// EG in eV.
    pub const fn value_ev(self) -> f32 {
        self.0
    }
}

/// XTI, the exponent of the saturation current's temperature law (3 for a pn junction, 2 for a
/// Schottky barrier in SPICE practice): 0 … 10.
#[derive(Debug, Clone, Copy, PartialEq, PartialOrd)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Xti(f32);

impl Xti {
    /// A pn junction's 3.
    pub const PN: Xti = Xti(3.0);
    /// A Schottky barrier's 2.
    pub const SCHOTTKY: Xti = Xti(2.0);

    /// XTI.
    ///
    /// # Errors
    /// Non-finite → [`Reason::NotFinite`]; outside 0 … 10 → [`Reason::OutsideValidatedRange`];
    /// both on `"XTI"`.
    pub const fn new(xti: f32) -> Result<Self, Error> {
        match error::within("XTI", xti, 0.0, 10.0) {
            Ok(x) => Ok(Xti(x)),
            Err(e) => Err(e),
        }
    }
    /// XTI.
    pub const fn value(self) -> f32 {
        self.0
    }
}

/// Parameters of the SPICE diode model (the large-signal DC part of Nagel's SPICE2 diode).
///
/// Accepted ranges (the ranges over which the tests validate the model: drop within 1 mV of an
/// f64 evaluation of the same law at every corner of this box, −40 … 150 °C, 1 µA … 10 A):
///
/// | name | meaning | unit | accepted range |
/// |---|---|---|---|
/// | IS | saturation current at TNOM | A | 1e-20 … 1e-2 |
/// | N | emission coefficient | – | 0.5 … 5 |
/// | RS | ohmic series resistance | Ω | 0 … 100 |
/// | EG | activation energy ([`BandGap`]) | eV | 0.4 … 3.6 |
/// | XTI | saturation-current temperature exponent ([`Xti`]) | – | 0 … 10 |
/// | TNOM | temperature at which IS was measured | °C | −55 … 150 |
///
/// Evaluation temperatures: −100 … 250 °C ([`T_MIN_K`], [`T_MAX_K`]).
///
/// The fields are private: construction validates them, so every method can be infallible on
/// the parameters and only check its own arguments.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DiodeParams {
    pub(crate) is_a: f32,
    /// ln(IS/A), precomputed: every evaluation works in the log domain.
    pub(crate) ln_is: f32,
    pub(crate) n: f32,
    pub(crate) rs_ohm: f32,
    pub(crate) eg_ev: f32,
    pub(crate) xti: f32,
    pub(crate) tnom_k: f32,
}

/// Accepted IS range, A.
pub(crate) const IS_RANGE: (f32, f32) = (1e-20, 1e-2);
/// Accepted N range.
pub(crate) const N_RANGE: (f32, f32) = (0.5, 5.0);
/// Accepted RS range, Ω.
pub(crate) const RS_MAX_OHM: f32 = 100.0;
/// Accepted TNOM range, K (−55 … 150 °C).
pub(crate) const TNOM_RANGE_K: (f32, f32) = (218.15, 423.15);

impl DiodeParams {
    /// Generic small silicon rectifier (1 A class) at TNOM = 27 °C: IS = 2 nA, N = 1.8,
    /// RS = 50 mΩ, EG = 1.11 eV, XTI = 3 (the SPICE defaults for silicon junctions).
    ///
    /// Typical, not any particular part: about 0.61 V at 1 mA, 0.72 V at 10 mA and 0.98 V at 1 A,
    /// 25 °C.
    pub const SILICON: DiodeParams = DiodeParams::preset(2.0e-9, -20.030_12, 1.8, 0.05, 1.11, 3.0);

    /// Generic Schottky rectifier (1 A class) at TNOM = 27 °C: IS = 1 µA, N = 1.1, RS = 50 mΩ,
    /// EG = 0.69 eV, XTI = 2 (the usual SPICE choice for metal–silicon barriers).
    ///
    /// Typical, not any particular part: about 0.20 V at 1 mA and 0.44 V at 1 A, 25 °C.
    pub const SCHOTTKY: DiodeParams = DiodeParams::preset(1.0e-6, -13.815_51, 1.1, 0.05, 0.69, 2.0);

    const fn preset(is_a: f32, ln_is: f32, n: f32, rs_ohm: f32, eg_ev: f32, xti: f32) -> Self {
        DiodeParams {
            is_a,
            ln_is,
            n,
            rs_ohm,
            eg_ev,
            xti,
            tnom_k: 300.15,
        }
    }

    /// Builds and validates a parameter set. Every argument has its own type, so no two can be
    /// swapped.
    ///
    /// # Errors
    /// Each argument is checked against the range in the table above and the error names it
    /// (`"IS"`, `"N"`, `"RS"`, `"TNOM"`; EG and XTI are checked by their types): IS ≤ 0 →
    /// [`Reason::NotPositive`]; outside the range → [`Reason::OutsideValidatedRange`].
    ///
    /// ```
    /// use kickguard::diode::{BandGap, DiodeParams, Ideality, Xti};
    /// use kickguard::{Amps, Ohms, Temperature};
    /// let d = DiodeParams::new(
    ///     Amps::new(1e-14)?, Ideality::new(1.0)?, Ohms::new(0.1)?, BandGap::SILICON, Xti::PN,
    ///     Temperature::from_celsius(27.0)?,
    /// )?;
    /// assert_eq!(d.n().value(), 1.0);
    /// let bad = DiodeParams::new(
    ///     Amps::new(-1e-14)?, Ideality::new(1.0)?, Ohms::new(0.1)?, BandGap::SILICON, Xti::PN,
    ///     Temperature::from_celsius(27.0)?,
    /// );
    /// assert_eq!(bad.unwrap_err().input, "IS");
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn new(
        is: Amps,
        n: Ideality,
        rs: Ohms,
        eg: BandGap,
        xti: Xti,
        tnom: Temperature,
    ) -> Result<Self, Error> {
        let is_a = is.value();
        if !(is_a > 0.0) {
            return Err(Error::new("IS", Reason::NotPositive));
        }
        if !(IS_RANGE.0..=IS_RANGE.1).contains(&is_a) {
            return Err(Error::new("IS", Reason::OutsideValidatedRange));
        }
        let n = error::within("N", n.value(), N_RANGE.0, N_RANGE.1)?;
        let rs_ohm = error::within("RS", rs.value(), 0.0, RS_MAX_OHM)?;
        let tnom_k = error::within("TNOM", tnom.kelvin(), TNOM_RANGE_K.0, TNOM_RANGE_K.1)?;
        Ok(DiodeParams {
            is_a,
            ln_is: crate::math::ln(is_a),
            n,
            rs_ohm,
            eg_ev: eg.value_ev(),
            xti: xti.value(),
            tnom_k,
        })
    }

    /// The same diode with another series resistance RS.
    ///
    /// # Errors
    /// RS above 100 Ω → [`Reason::OutsideValidatedRange`] on `"RS"`.
    pub fn with_rs(self, rs: Ohms) -> Result<Self, Error> {
        let rs_ohm = error::within("RS", rs.value(), 0.0, RS_MAX_OHM)?;
        Ok(DiodeParams { rs_ohm, ..self })
    }

    /// IS, the saturation current at TNOM, in amperes.
    pub fn is(&self) -> Amps {
        Amps::raw(self.is_a)
    }
    /// N, the emission coefficient.
    pub fn n(&self) -> Ideality {
        Ideality(self.n)
    }
    /// RS, the ohmic series resistance.
    pub fn rs(&self) -> Ohms {
        Ohms::raw(self.rs_ohm)
    }
    /// EG, the activation energy.
    pub fn eg(&self) -> BandGap {
        BandGap(self.eg_ev)
    }
    /// XTI, the saturation-current temperature exponent.
    pub fn xti(&self) -> Xti {
        Xti(self.xti)
    }
    /// TNOM, the temperature at which IS is given.
    pub fn tnom(&self) -> Temperature {
        Temperature::raw_kelvin(self.tnom_k)
    }
}

/// Checks an evaluation temperature against the validated range and returns it in kelvin.
pub(crate) fn checked_t(input: &'static str, t: Temperature) -> Result<f32, Error> {
    error::within(input, t.kelvin(), T_MIN_K, T_MAX_K)
}

/// A diode as it sits in a circuit: either the full diode law, or a stated forward drop that is
/// the same at every current and temperature (a datasheet's "V_F = 0.7 V" style, or a quick
/// estimate).
///
/// A fixed drop is a constant voltage in the loop: with it a freewheeling-diode decay has a
/// closed form and reaches zero current in finite time (which the full law never does).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Diode {
    /// The SPICE-class diode law at the part's temperature.
    Law(DiodeParams),
    /// A constant forward drop (0 < V_F ≤ 10 V).
    FixedDrop(Volts),
}

impl Diode {
    /// Largest fixed drop accepted, in volts.
    pub const MAX_FIXED_DROP_V: f32 = 10.0;

    /// Checks a fixed drop (the law is valid by construction) and returns it, or 0 for a law.
    pub(crate) fn checked_fixed_drop(&self) -> Result<f32, Error> {
        match self {
            Diode::Law(_) => Ok(0.0),
            Diode::FixedDrop(v) => {
                let x = v.value();
                if !(x > 0.0) {
                    Err(Error::new("diode drop", Reason::NotPositive))
                } else if x > Self::MAX_FIXED_DROP_V {
                    Err(Error::new("diode drop", Reason::OutsideValidatedRange))
                } else {
                    Ok(x)
                }
            }
        }
    }

    /// The same diode with its forward drop moved by `dv` at its nominal temperature: a
    /// part-to-part spread of ±`dv` (datasheets give V_F as typical and maximum).
    ///
    /// Model: a fixed drop becomes V_F + dv. For the law, IS is scaled by
    /// exp(−dv/(N·Vt(TNOM))), which moves N·Vt·ln(I/IS) by exactly +dv at TNOM for every
    /// current where I ≫ IS (the RS term is unchanged), and by dv·T/TNOM at another temperature
    /// (the spread of IS is a spread of the junction's area or doping, so it scales with the
    /// thermal voltage). A larger drop means more clamp voltage at every current and
    /// temperature, so every decay quantity stays monotone in `dv`.
    ///
    /// Work: one exponential.
    ///
    /// # Errors
    /// `dv` outside ±1 V → [`Reason::OutsideValidatedRange`] on `"drop shift"`; a fixed drop that
    /// would leave 0 … 10 V → [`Reason::OutsideValidatedRange`] on `"diode drop"`; a scaled IS
    /// outside 1e-20 … 1e-2 A → [`Reason::OutsideValidatedRange`] on `"IS"`.
    ///
    /// ```
    /// use kickguard::diode::{Diode, DiodeParams};
    /// use kickguard::{Amps, Temperature, Volts};
    /// let d = Diode::Law(DiodeParams::SILICON);
    /// let t = DiodeParams::SILICON.tnom();
    /// let i = Amps::new(0.3)?;
    /// let up = d.shifted(Volts::new(0.05)?)?;
    /// let dv = up.forward_drop(i, t)?.value() - d.forward_drop(i, t)?.value();
    /// assert!((dv - 0.05).abs() < 1e-4);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn shifted(&self, dv: Volts) -> Result<Diode, Error> {
        let dv = error::within("drop shift", dv.value(), -1.0, 1.0)?;
        match self {
            Diode::FixedDrop(_) => {
                let x = self.checked_fixed_drop()? + dv;
                if !(x > 0.0 && x <= Self::MAX_FIXED_DROP_V) {
                    return Err(Error::new("diode drop", Reason::OutsideValidatedRange));
                }
                Ok(Diode::FixedDrop(Volts::raw(x)))
            }
            Diode::Law(p) => {
                let nvt = p.n * crate::physics::vt_at(p.tnom_k);
                let ln_is = p.ln_is - dv / nvt;
                let is_a = crate::math::exp(ln_is);
                if !(is_a >= IS_RANGE.0 && is_a <= IS_RANGE.1) {
                    return Err(Error::new("IS", Reason::OutsideValidatedRange));
                }
                Ok(Diode::Law(DiodeParams { is_a, ln_is, ..*p }))
            }
        }
    }

    /// The forward drop at current `i` (> 0) and temperature `t`: the law's
    /// [`DiodeParams::forward_drop`], or the fixed drop.
    ///
    /// # Errors
    /// Errors of [`DiodeParams::forward_drop`]; a fixed drop ≤ 0 or above 10 V →
    /// [`Reason::NotPositive`] / [`Reason::OutsideValidatedRange`] on `"diode drop"`.
    pub fn forward_drop(&self, i: Amps, t: Temperature) -> Result<Volts, Error> {
        match self {
            Diode::Law(d) => d.forward_drop(i, t),
            Diode::FixedDrop(v) => {
                self.checked_fixed_drop()?;
                if !(i.value() > 0.0) {
                    return Err(Error::new("forward current", Reason::NotPositive));
                }
                Ok(*v)
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn preset_logs_match_their_is() {
        // The presets carry ln(IS) as a literal so they can be `const`; it must agree with IS.
        for p in [DiodeParams::SILICON, DiodeParams::SCHOTTKY] {
            assert!((crate::math::ln(p.is_a) - p.ln_is).abs() < 2e-6, "{p:?}");
        }
    }

    #[test]
    fn new_names_each_bad_input() {
        let t = Temperature::from_celsius(27.0).unwrap();
        let is = Amps::new(1e-14).unwrap();
        let rs = Ohms::new(0.0).unwrap();
        let n1 = Ideality::new(1.0).unwrap();
        let (eg, xti) = (BandGap::SILICON, Xti::PN);
        assert_eq!(
            DiodeParams::new(is, Ideality::new(0.3).unwrap(), rs, eg, xti, t).unwrap_err(),
            Error::new("N", Reason::OutsideValidatedRange)
        );
        assert_eq!(
            Ideality::new(f32::NAN).unwrap_err(),
            Error::new("emission coefficient", Reason::NotFinite)
        );
        assert_eq!(BandGap::ev(0.0).unwrap_err().input, "EG");
        assert_eq!(BandGap::ev(5.0).unwrap_err().input, "EG");
        assert_eq!(Xti::new(-20.0).unwrap_err().input, "XTI");
        assert_eq!(Xti::new(f32::INFINITY).unwrap_err().input, "XTI");
        let cold = Temperature::from_celsius(-100.0).unwrap();
        assert_eq!(
            DiodeParams::new(is, n1, rs, eg, xti, cold)
                .unwrap_err()
                .input,
            "TNOM"
        );
        assert_eq!(
            DiodeParams::new(Amps::new(0.0).unwrap(), n1, rs, eg, xti, t)
                .unwrap_err()
                .reason,
            Reason::NotPositive
        );
        assert_eq!(
            DiodeParams::new(Amps::new(1e-30).unwrap(), n1, rs, eg, xti, t).unwrap_err(),
            Error::new("IS", Reason::OutsideValidatedRange)
        );
        assert_eq!(
            DiodeParams::new(is, n1, Ohms::new(1e3).unwrap(), eg, xti, t).unwrap_err(),
            Error::new("RS", Reason::OutsideValidatedRange)
        );
    }

    #[test]
    fn fixed_drop_diode_is_checked_at_use() {
        let t = Temperature::from_celsius(25.0).unwrap();
        let i = Amps::new(0.1).unwrap();
        let bad = Diode::FixedDrop(Volts::new(-1.0).unwrap());
        assert_eq!(
            bad.forward_drop(i, t).unwrap_err(),
            Error::new("diode drop", Reason::NotPositive)
        );
        let ok = Diode::FixedDrop(Volts::new(0.7).unwrap());
        assert_eq!(ok.forward_drop(i, t).unwrap().value(), 0.7);
    }
}
