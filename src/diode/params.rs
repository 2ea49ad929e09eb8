//! SPICE-class diode parameters (IS, N, RS, EG, XTI, TNOM) and generic presets.

use crate::error::{Error, Reason};
use crate::units::{Amps, Ohms, Temperature};

/// Lowest temperature at which the diode functions are validated: 173.15 K (−100 °C).
pub const T_MIN_K: f32 = 173.15;
/// Highest temperature at which the diode functions are validated: 523.15 K (250 °C).
pub const T_MAX_K: f32 = 523.15;

/// Parameters of the SPICE diode model (the large-signal DC part of Nagel's SPICE2 diode).
///
/// | name | meaning | unit | accepted range |
/// |---|---|---|---|
/// | IS | saturation current at TNOM | A | > 0, ≤ 1 A |
/// | N | emission coefficient | – | 0.3 … 10 |
/// | RS | ohmic series resistance | Ω | ≥ 0 |
/// | EG | activation energy (band gap) | eV | 0 … 5 |
/// | XTI | saturation-current temperature exponent | – | −20 … 20 |
/// | TNOM | temperature at which IS was measured | K | 173.15 … 523.15 |
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

    /// Builds and validates a parameter set.
    ///
    /// # Errors
    /// Each argument is checked against the range in the table above; the error names it
    /// (`"IS"`, `"N"`, `"EG"`, `"XTI"`, `"TNOM"`). IS ≤ 0 and N ≤ 0 give
    /// [`Reason::NotPositive`]; values outside the accepted range give
    /// [`Reason::OutsideValidatedRange`]. (RS ≥ 0 is guaranteed by [`Ohms`].)
    ///
    /// ```
    /// use kickguard::{diode::DiodeParams, Amps, Ohms, Temperature};
    /// let d = DiodeParams::new(
    ///     Amps::new(1e-14).unwrap(), 1.0, Ohms::new(0.1).unwrap(), 1.11, 3.0,
    ///     Temperature::from_celsius(27.0).unwrap(),
    /// ).unwrap();
    /// assert_eq!(d.n(), 1.0);
    /// let bad = DiodeParams::new(
    ///     Amps::new(-1e-14).unwrap(), 1.0, Ohms::new(0.1).unwrap(), 1.11, 3.0,
    ///     Temperature::from_celsius(27.0).unwrap(),
    /// );
    /// assert_eq!(bad.unwrap_err().input, "IS");
    /// ```
    pub fn new(
        is: Amps,
        n: f32,
        rs: Ohms,
        eg_ev: f32,
        xti: f32,
        tnom: Temperature,
    ) -> Result<Self, Error> {
        let is_a = is.value();
        if is_a <= 0.0 {
            return Err(Error::new("IS", Reason::NotPositive));
        }
        if is_a > 1.0 {
            return Err(Error::new("IS", Reason::OutsideValidatedRange));
        }
        let n = crate::error::positive("N", n)?;
        if !(0.3..=10.0).contains(&n) {
            return Err(Error::new("N", Reason::OutsideValidatedRange));
        }
        check_eg_xti(eg_ev, xti)?;
        let tnom_k = tnom.kelvin();
        if !(T_MIN_K..=T_MAX_K).contains(&tnom_k) {
            return Err(Error::new("TNOM", Reason::OutsideValidatedRange));
        }
        Ok(DiodeParams {
            is_a,
            ln_is: crate::math::ln(is_a),
            n,
            rs_ohm: rs.value(),
            eg_ev,
            xti,
            tnom_k,
        })
    }

    /// The same diode with another series resistance RS.
    pub fn with_rs(self, rs: Ohms) -> Self {
        DiodeParams {
            rs_ohm: rs.value(),
            ..self
        }
    }

    /// IS, the saturation current at TNOM, in amperes.
    pub fn is(&self) -> Amps {
        Amps::raw(self.is_a)
    }
    /// N, the emission coefficient (dimensionless).
    pub fn n(&self) -> f32 {
        self.n
    }
    /// RS, the ohmic series resistance.
    pub fn rs(&self) -> Ohms {
        Ohms::raw(self.rs_ohm)
    }
    /// EG, the activation energy, in electron-volts.
    pub fn eg_ev(&self) -> f32 {
        self.eg_ev
    }
    /// XTI, the saturation-current temperature exponent (dimensionless).
    pub fn xti(&self) -> f32 {
        self.xti
    }
    /// TNOM, the temperature at which IS is given.
    pub fn tnom(&self) -> Temperature {
        Temperature::raw_kelvin(self.tnom_k)
    }
}

/// Checks EG (0…5 eV) and XTI (−20…20) against the accepted ranges of [`DiodeParams::new`];
/// shared with the fits, which take both as given.
pub(crate) fn check_eg_xti(eg_ev: f32, xti: f32) -> Result<(), Error> {
    let eg = crate::error::finite("EG", eg_ev)?;
    if !(0.0..=5.0).contains(&eg) {
        return Err(Error::new("EG", Reason::OutsideValidatedRange));
    }
    let xti = crate::error::finite("XTI", xti)?;
    if !(-20.0..=20.0).contains(&xti) {
        return Err(Error::new("XTI", Reason::OutsideValidatedRange));
    }
    Ok(())
}

/// Checks an evaluation temperature against the validated range and returns it in kelvin.
pub(crate) fn checked_t(input: &'static str, t: Temperature) -> Result<f32, Error> {
    let k = t.kelvin();
    if (T_MIN_K..=T_MAX_K).contains(&k) {
        Ok(k)
    } else {
        Err(Error::new(input, Reason::OutsideValidatedRange))
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
        assert_eq!(
            DiodeParams::new(is, 0.0, rs, 1.1, 3.0, t).unwrap_err(),
            Error::new("N", Reason::NotPositive)
        );
        assert_eq!(
            DiodeParams::new(is, f32::NAN, rs, 1.1, 3.0, t).unwrap_err(),
            Error::new("N", Reason::NotFinite)
        );
        assert_eq!(
            DiodeParams::new(is, 1.0, rs, -0.1, 3.0, t)
                .unwrap_err()
                .input,
            "EG"
        );
        assert_eq!(
            DiodeParams::new(is, 1.0, rs, 1.1, f32::INFINITY, t)
                .unwrap_err()
                .input,
            "XTI"
        );
        let cold = Temperature::from_kelvin(20.0).unwrap();
        assert_eq!(
            DiodeParams::new(is, 1.0, rs, 1.1, 3.0, cold)
                .unwrap_err()
                .input,
            "TNOM"
        );
        assert_eq!(
            DiodeParams::new(Amps::new(0.0).unwrap(), 1.0, rs, 1.1, 3.0, t)
                .unwrap_err()
                .reason,
            Reason::NotPositive
        );
    }
}
