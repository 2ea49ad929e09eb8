//! Fitting the diode model to what a datasheet gives.
//!
//! Since ln(1 + I/IS) = ln(I + IS) − ln IS exactly, the drop is *linear* in three unknowns once
//! the small IS inside ln(I + IS) is known:
//!
//! ```text
//! V = a·ln(I + IS) − b + RS·I,   a = N·Vt(T),   b = N·Vt(T)·ln IS
//! ```
//!
//! The fits start from IS = 0 inside the logarithm and repeat the linear solve with the IS just
//! found ([`FIT_PASSES`] passes in all). IS is far below every datasheet current (nA against mA),
//! so the correction is tiny and each pass shrinks it by about IS/I: two passes already reach
//! f32 resolution; the extra ones cost nothing that matters at configuration time.
//!
//! Two points at one temperature (RS given) fix a and b; three fix a, b and RS (a 3×3 linear
//! system, reduced to 2×2 by differences and solved by Cramer's rule). The temperature
//! behaviour then follows from the SPICE law: a drop at a second temperature gives EG in closed
//! form, and so does a stated tempco dV/dT at a current, from dVj/dT = (Vj − XTI·Vt − EG)/T.
//!
//! Every fit is checked afterwards: the result must lie in the accepted box of
//! [`DiodeParams::new`] (IS 1e-20…1e-2 A, N 0.5…5, RS 0…100 Ω, EG 0.4…3.6 eV, TNOM −55…150 °C)
//! and the fitted law must reproduce each given point within 1 mV. Points that contradict the
//! model are an error, never a silent fit.
//!
//! Work: fixed, [`FIT_PASSES`] linear solves of size 2 or 3; the EG fits are closed forms.

use super::params::{
    checked_t, BandGap, DiodeParams, Xti, IS_RANGE, N_RANGE, RS_MAX_OHM, TNOM_RANGE_K,
};
use crate::error::{Error, Reason};
use crate::math;
use crate::physics::vt_at;
use crate::units::{Amps, Ohms, Temperature, Volts};

/// Number of linear solves per fit (the first with IS = 0 inside ln(I + IS)).
pub const FIT_PASSES: u32 = 4;

/// Largest disagreement, in volts, between a fitted law and a point it was fitted to.
pub const FIT_TOLERANCE_V: f32 = 1.0e-3;

/// One (current, forward voltage) point read from a datasheet curve or table.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DropPoint {
    /// Forward current (must be > 0).
    pub current: Amps,
    /// Forward voltage at that current (must be > 0).
    pub voltage: Volts,
}

impl DropPoint {
    /// A point from raw amperes and volts.
    ///
    /// # Errors
    /// The errors of [`Amps::new`] and [`Volts::new`]; a current or voltage ≤ 0 →
    /// [`Reason::NotPositive`] on `"point current"` / `"point voltage"`.
    pub fn new(current_a: f32, voltage_v: f32) -> Result<Self, Error> {
        let current = Amps::new(crate::error::positive("point current", current_a)?)?;
        let voltage = Volts::new(crate::error::positive("point voltage", voltage_v)?)?;
        Ok(DropPoint { current, voltage })
    }
}

fn check_point(p: &DropPoint) -> Result<(f32, f32), Error> {
    let (i, v) = (p.current.value(), p.voltage.value());
    if i <= 0.0 {
        return Err(Error::new("point current", Reason::NotPositive));
    }
    if v <= 0.0 {
        return Err(Error::new("point voltage", Reason::NotPositive));
    }
    Ok((i, v))
}

/// Builds parameters from a = N·Vt and ln IS, then verifies them against the points.
fn finish(
    a: f32,
    ln_is: f32,
    rs: f32,
    t_k: f32,
    eg: BandGap,
    xti: Xti,
    points: &[DropPoint],
) -> Result<DiodeParams, Error> {
    let inconsistent = Err(Error::new("points", Reason::Inconsistent));
    if !(a.is_finite() && ln_is.is_finite() && rs.is_finite()) {
        return inconsistent;
    }
    if !(0.0..=RS_MAX_OHM).contains(&rs) {
        return inconsistent;
    }
    let n = a / vt_at(t_k);
    if !(N_RANGE.0..=N_RANGE.1).contains(&n) {
        return inconsistent;
    }
    let is_a = math::exp(ln_is);
    if !(IS_RANGE.0..=IS_RANGE.1).contains(&is_a) {
        return inconsistent;
    }
    let p = DiodeParams {
        is_a,
        ln_is,
        n,
        rs_ohm: rs,
        eg_ev: eg.value_ev(),
        xti: xti.value(),
        tnom_k: t_k,
    };
    verify(&p, t_k, points)?;
    Ok(p)
}

/// The fitted law must reproduce each point within [`FIT_TOLERANCE_V`].
fn verify(p: &DiodeParams, t_k: f32, points: &[DropPoint]) -> Result<(), Error> {
    for pt in points {
        let (i, v) = (pt.current.value(), pt.voltage.value());
        let model = p.junction_drop(i, t_k) + i * p.rs_ohm;
        if !((model - v).abs() <= FIT_TOLERANCE_V) {
            return Err(Error::new("points", Reason::Inconsistent));
        }
    }
    Ok(())
}

/// Fits IS and N to two (I, V) points measured at temperature `t`, with RS, EG and XTI given.
/// TNOM of the result is `t`.
///
/// Model: a = N·Vt = (Vj₂ − Vj₁)/(ln(I₂ + IS) − ln(I₁ + IS)) with Vj = V − I·RS, then
/// ln IS = ln(I₁ + IS) − Vj₁/a, repeated [`FIT_PASSES`] times from IS = 0.
///
/// # Errors
/// Currents not strictly increasing → [`Reason::NotIncreasing`] on `"point current"`; junction
/// drops not strictly increasing → [`Reason::Inconsistent`] on `"point voltage"`; an unphysical
/// result or a point off the fitted law by more than 1 mV → [`Reason::Inconsistent`] on
/// `"points"`; `t` outside TNOM's range of [`DiodeParams::new`] (−55…150 °C) →
/// [`Reason::OutsideValidatedRange`] on `"temperature"`.
///
/// ```
/// use kickguard::diode::{fit_two_points, BandGap, DiodeParams, DropPoint, Xti};
/// use kickguard::{Ohms, Temperature};
/// let t = Temperature::from_celsius(25.0)?;
/// let d = fit_two_points(
///     [DropPoint::new(0.001, 0.60)?, DropPoint::new(0.1, 0.80)?],
///     t, Ohms::new(0.0)?, BandGap::SILICON, Xti::PN,
/// )?;
/// assert!((d.n().value() - 1.690).abs() < 0.005);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn fit_two_points(
    points: [DropPoint; 2],
    t: Temperature,
    rs: Ohms,
    eg: BandGap,
    xti: Xti,
) -> Result<DiodeParams, Error> {
    let t_k = fit_temperature(t)?;
    let (i1, v1) = check_point(&points[0])?;
    let (i2, v2) = check_point(&points[1])?;
    if !(i2 > i1) {
        return Err(Error::new("point current", Reason::NotIncreasing));
    }
    let r = rs.value();
    let (vj1, vj2) = (v1 - i1 * r, v2 - i2 * r);
    if !(vj2 > vj1) {
        return Err(Error::new("point voltage", Reason::Inconsistent));
    }
    let mut is_a = 0.0f32;
    let (mut a, mut ln_is) = (0.0f32, 0.0f32);
    for _ in 0..FIT_PASSES {
        let (l1, l2) = (math::ln(i1 + is_a), math::ln(i2 + is_a));
        a = (vj2 - vj1) / (l2 - l1);
        ln_is = l1 - vj1 / a;
        is_a = math::exp(ln_is);
        if !(is_a < i1) {
            return Err(Error::new("points", Reason::Inconsistent));
        }
    }
    finish(a, ln_is, r, t_k, eg, xti, &points)
}

/// The fit's temperature becomes TNOM: it must lie in TNOM's accepted range.
fn fit_temperature(t: Temperature) -> Result<f32, Error> {
    let t_k = checked_t("temperature", t)?;
    if !(TNOM_RANGE_K.0..=TNOM_RANGE_K.1).contains(&t_k) {
        return Err(Error::new("temperature", Reason::OutsideValidatedRange));
    }
    Ok(t_k)
}

/// Fits IS, N and RS to three (I, V) points measured at temperature `t`, with EG and XTI given.
/// TNOM of the result is `t`.
///
/// Model: Vₖ = a·ln(Iₖ + IS) − b + RS·Iₖ for k = 1, 2, 3, repeated [`FIT_PASSES`] times from IS = 0. Subtracting the first equation from the
/// others leaves two equations in (a, RS), solved by Cramer's rule; b follows from the first.
/// The points are best spread over at least two decades, the last where RS shows (high current).
///
/// # Errors
/// As [`fit_two_points`]; additionally a negative RS (the curve bends the wrong way) or a
/// singular system (points on a pure exponential with no RS to tell apart) →
/// [`Reason::Inconsistent`] on `"points"`.
///
/// ```
/// use kickguard::diode::{fit_three_points, BandGap, DiodeParams, DropPoint, Xti};
/// use kickguard::{Amps, Temperature};
/// // Three points generated from the silicon preset at its TNOM:
/// let si = DiodeParams::SILICON;
/// let t = si.tnom();
/// let pt = |i: f32| -> Result<DropPoint, kickguard::Error> {
///     Ok(DropPoint { current: Amps::new(i)?, voltage: si.forward_drop(Amps::new(i)?, t)? })
/// };
/// let d = fit_three_points([pt(0.001)?, pt(0.1)?, pt(3.0)?], t, BandGap::SILICON, Xti::PN)?;
/// assert!((d.rs().value() - 0.05).abs() < 0.005);
/// assert!((d.n().value() - 1.8).abs() < 0.01);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn fit_three_points(
    points: [DropPoint; 3],
    t: Temperature,
    eg: BandGap,
    xti: Xti,
) -> Result<DiodeParams, Error> {
    let t_k = fit_temperature(t)?;
    let (i1, v1) = check_point(&points[0])?;
    let (i2, v2) = check_point(&points[1])?;
    let (i3, v3) = check_point(&points[2])?;
    if !(i2 > i1 && i3 > i2) {
        return Err(Error::new("point current", Reason::NotIncreasing));
    }
    if !(v2 > v1 && v3 > v2) {
        return Err(Error::new("point voltage", Reason::Inconsistent));
    }
    let (di2, di3) = (i2 - i1, i3 - i1);
    let (dv2, dv3) = (v2 - v1, v3 - v1);
    let mut is_a = 0.0f32;
    let (mut a, mut rs, mut ln_is) = (0.0f32, 0.0f32, 0.0f32);
    for _ in 0..FIT_PASSES {
        // Differences from point 1: dV = a·dL + RS·dI, with L = ln(I + IS).
        let l1 = math::ln(i1 + is_a);
        let (dl2, dl3) = (math::ln(i2 + is_a) - l1, math::ln(i3 + is_a) - l1);
        let det = dl2 * di3 - dl3 * di2;
        // Relative singularity test: |det| small against the size of its terms.
        if !(det.abs() > 1e-6 * (dl2 * di3).abs().max((dl3 * di2).abs())) {
            return Err(Error::new("points", Reason::Inconsistent));
        }
        a = (dv2 * di3 - dv3 * di2) / det;
        rs = (dl2 * dv3 - dl3 * dv2) / det;
        if !(a > 0.0) {
            return Err(Error::new("points", Reason::Inconsistent));
        }
        ln_is = l1 - (v1 - rs * i1) / a;
        is_a = math::exp(ln_is);
        if !(is_a < i1) {
            return Err(Error::new("points", Reason::Inconsistent));
        }
    }
    finish(a, ln_is, rs, t_k, eg, xti, &points)
}

impl DiodeParams {
    /// The same diode with EG fitted to a drop measured at a second temperature `t2` (XTI kept).
    ///
    /// Model: from the point, exactly, I/IS(T₂) = exp((V − I·RS)/(N·Vt(T₂))) − 1; the SPICE law
    /// then gives
    /// EG = [ln IS(T₂) − ln IS − (XTI/N)·ln(T₂/TNOM)]·N·Vt(T₂)/(T₂/TNOM − 1), closed form.
    ///
    /// # Errors
    /// `t2` within 1 K of TNOM → [`Reason::Inconsistent`] on `"second temperature"`; `t2` outside
    /// the validated range → [`Reason::OutsideValidatedRange`] on `"second temperature"`; a
    /// resulting EG outside 0.4…3.6 eV (the drop moved the wrong way or far too much) →
    /// [`Reason::Inconsistent`] on `"second point"`.
    ///
    /// ```
    /// use kickguard::diode::{DiodeParams, DropPoint};
    /// use kickguard::Temperature;
    /// let si = DiodeParams::SILICON;
    /// // 0.55 V at 1 mA and 55 °C: a junction that moves about −2.1 mV/K.
    /// let d = si.with_eg_from_point(DropPoint::new(1e-3, 0.55)?, Temperature::from_celsius(55.0)?)?;
    /// assert!(d.eg().value_ev() > 1.0 && d.eg().value_ev() < 1.3);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn with_eg_from_point(self, point: DropPoint, t2: Temperature) -> Result<Self, Error> {
        let t2_k = checked_t("second temperature", t2)?;
        if !((t2_k - self.tnom_k).abs() >= 1.0) {
            return Err(Error::new("second temperature", Reason::Inconsistent));
        }
        let (i, v) = check_point(&point)?;
        let nvt2 = self.n * vt_at(t2_k);
        let vj = v - i * self.rs_ohm;
        if !(vj > 0.0) {
            return Err(Error::new("second point", Reason::Inconsistent));
        }
        // Exactly: I/IS(T₂) = exp(Vj/(N·Vt)) − 1, and ln(eˣ − 1) = x + ln(1 − e⁻ˣ).
        let x = vj / nvt2;
        let ln_is2 = math::ln(i) - (x + math::ln_1p(-math::exp(-x)));
        let ratio = t2_k / self.tnom_k;
        let eg =
            (ln_is2 - self.ln_is - (self.xti / self.n) * math::ln(ratio)) * nvt2 / (ratio - 1.0);
        self.with_fitted_eg(eg, "second point")
    }

    /// The same diode with EG fitted to a stated tempco `dv_dt_v_per_k` (V/K, typically about
    /// −0.002) of the drop at current `i` and temperature TNOM (XTI kept).
    ///
    /// Model: at constant current, exactly, dV/dT = Vj/T − x/(1 + x)·(XTI·Vt + EG)/T with
    /// x = I/IS (see [`DiodeParams::forward_tempco_v_per_k`]), so
    /// EG = (Vj − T·dV/dT)·(1 + x)/x − XTI·Vt, closed form, with Vj the junction drop at (I, TNOM).
    /// For I ≫ IS this is the familiar EG = Vj − XTI·Vt − T·dV/dT.
    ///
    /// # Errors
    /// `i` ≤ 0 → [`Reason::NotPositive`] on `"forward current"`; a non-finite tempco →
    /// [`Reason::NotFinite`] on `"tempco"`; a resulting EG outside 0.4…3.6 eV →
    /// [`Reason::Inconsistent`] on `"tempco"`.
    ///
    /// ```
    /// use kickguard::diode::DiodeParams;
    /// use kickguard::Amps;
    /// let d = DiodeParams::SILICON.with_eg_from_tempco(Amps::new(1e-3)?, -2.0e-3)?;
    /// assert!((d.eg().value_ev() - 1.133).abs() < 0.01);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn with_eg_from_tempco(self, i: Amps, dv_dt_v_per_k: f32) -> Result<Self, Error> {
        let i_a = i.value();
        if i_a <= 0.0 {
            return Err(Error::new("forward current", Reason::NotPositive));
        }
        let tc = crate::error::finite("tempco", dv_dt_v_per_k)?;
        let t_k = self.tnom_k;
        let a = math::ln(i_a) - self.ln_is;
        let vj = self.n * vt_at(t_k) * math::ln_1p_exp(a);
        // x/(1 + x) with x = I/IS(T) = eᵃ.
        let frac = math::logistic(a);
        let eg = (vj - t_k * tc) / frac - self.xti * vt_at(t_k);
        self.with_fitted_eg(eg, "tempco")
    }

    fn with_fitted_eg(self, eg: f32, input: &'static str) -> Result<Self, Error> {
        match BandGap::ev(eg) {
            Ok(b) => Ok(DiodeParams {
                eg_ev: b.value_ev(),
                ..self
            }),
            Err(_) => Err(Error::new(input, Reason::Inconsistent)),
        }
    }
}
