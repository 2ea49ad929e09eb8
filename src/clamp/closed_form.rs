//! Closed forms for a constant clamp voltage plus a resistance.
//!
//! During the decay the coil loop obeys L·di/dt = −(Vc + R·i), with Vc > 0 the clamp voltage (all
//! constant terms of the loop) and R ≥ 0 every resistance in it (coil, external resistor, dynamic
//! resistances). With w = Vc + R·i, the solution is the textbook exponential
//! i(t) = (I₀ + Vc/R)·e^(−t/τ) − Vc/R, τ = L/R, and the time from I₀ to I₁ is
//! τ·ln((Vc + R·I₀)/(Vc + R·I₁)), which tends to L·(I₀ − I₁)/Vc (a linear ramp) as R → 0.
//!
//! To stay accurate in f32 for every ratio of R·I to Vc, all integrals are written with
//! Δ = I₀ − I₁, w₁ = Vc + R·I₁ and x = R·Δ/w₁ ≥ 0 through the functions
//!
//! ```text
//! χₙ(x) = ∫₀¹ yⁿ/(1 + x·y) dy,   χ₀ = ln(1+x)/x,  χ₁ = (x − ln(1+x))/x²,  χ₂ = (x²/2 − x + ln(1+x))/x³
//! ```
//!
//! (substitute i = I₁ + Δ·y): with dt = L·di/w,
//!
//! ```text
//! t     = ∫dt     = (L·Δ/w₁)·χ₀
//! Q     = ∫i dt   = (L·Δ/w₁)·(I₁·χ₀ + Δ·χ₁)
//! ∫i²dt           = (L·Δ/w₁)·(I₁²·χ₀ + 2·I₁·Δ·χ₁ + Δ²·χ₂)
//! ```
//!
//! χₙ is evaluated by its power series Σₖ (−x)ᵏ/(n + k + 1) for x < 0.25 (11 terms, truncation
//! below 0.25¹¹/12 ≈ 2e-8, under f32's 6e-8 resolution) and by the closed expressions above otherwise, where their
//! cancellation costs at most ≈ 1e-5 relative at x = 0.25. Every result is therefore within
//! about 2e-5 relative of the exact model, R → 0 included.

use crate::error::{Error, Reason};
use crate::math;
use crate::units::{Amps, Coulombs, Henries, Joules, Ohms, Seconds, Volts};

/// Terms of the power series used below the switch-over point.
const SERIES_TERMS: u32 = 11;
/// Below this x the series is used.
const SERIES_BELOW: f32 = 0.25;

/// χₙ(x) for n = 0, 1, 2 and x ≥ 0 (see the module docs).
pub(crate) fn chi(x: f32) -> [f32; 3] {
    if x < SERIES_BELOW {
        // One pass over k: (−x)ᵏ is shared by the three series.
        let mut out = [0.0f32; 3];
        let mut power = 1.0f32;
        for k in 0..SERIES_TERMS {
            let kf = k as f32;
            out[0] += power / (kf + 1.0);
            out[1] += power / (kf + 2.0);
            out[2] += power / (kf + 3.0);
            power *= -x;
        }
        out
    } else {
        let l = math::ln_1p(x);
        [
            l / x,
            (x - l) / (x * x),
            (0.5 * x * x - x + l) / (x * x * x),
        ]
    }
}

/// Time, charge and ∫i²dt of the decay from `i0` to `i1` with clamp `vc` and resistance `r`.
///
/// Preconditions (checked by the caller): l > 0, vc > 0, r ≥ 0, 0 ≤ i1 < i0.
pub(crate) fn integrals(l: f32, vc: f32, r: f32, i0: f32, i1: f32) -> [f32; 3] {
    let d = i0 - i1;
    let w1 = vc + r * i1;
    let x = r * d / w1;
    let [c0, c1, c2] = chi(x);
    let k = l * d / w1;
    [
        k * c0,
        k * (i1 * c0 + d * c1),
        k * (i1 * i1 * c0 + 2.0 * i1 * d * c1 + d * d * c2),
    ]
}

/// Current at time `t` after switch-off, exact: (I₀ + Vc/R)·e^(−z) − Vc/R with z = t·R/L, or
/// I₀ − Vc·t/L for R = 0.
///
/// Written as I₀·e^(−z) − (Vc·t/L)·φ(z), φ(z) = (1 − e^(−z))/z: both terms are computed to
/// full relative accuracy for every z ≥ 0 (φ → 1 as R → 0, no division by R), and they cancel
/// only where the current itself reaches zero. The form I₀ − (I₀ + Vc/R)·(1 − e^(−z)) loses
/// everything once e^(−z) is below f32's resolution (a long decay with R·I₀ ≫ Vc).
pub(crate) fn current_at(l: f32, vc: f32, r: f32, i0: f32, t: f32) -> f32 {
    let z = t * r / l;
    let phi = if z > 1e-6 {
        -math::exp_m1(-z) / z
    } else {
        1.0 - 0.5 * z
    };
    i0 * math::exp(-z) - vc * (t / l) * phi
}

/// Single-pulse avalanche energy of a switch that clamps an inductive load at V_BR (its own
/// avalanche, or any clamp across the switch) with the supply V_s still connected, in the
/// R → 0 limit: E = ½·L·I²·V_BR/(V_BR − V_s).
///
/// Derivation: with R = 0 the current falls linearly at (V_BR − V_s)/L, so it lasts
/// t = L·I/(V_BR − V_s) and carries Q = ½·I·t; the switch absorbs V_BR·Q, of which the coil
/// gives ½·L·I² and the supply V_s·Q (the standard unclamped-inductive-switching formula of
/// power-MOSFET practice). A winding resistance only shortens the decay, so this is an upper
/// bound of the energy [`super::SwitchOff`] computes with R > 0.
///
/// # Errors
/// `v_breakdown` ≤ `v_supply` → [`Reason::CannotClamp`] on `"breakdown voltage"`;
/// `v_supply` < 0 → [`Reason::Negative`] on `"supply voltage"`; a result outside the quantity
/// bounds → [`Reason::TooLarge`] / [`Reason::TooSmall`] on `"avalanche energy"`.
///
/// ```
/// use kickguard::clamp::closed_form::single_pulse_avalanche_energy;
/// use kickguard::{Amps, Henries, Volts};
/// // 0.35 H at 0.5 A into a 66 V avalanche from 26.4 V: ½·0.35·0.25·66/39.6 = 72.9 mJ.
/// let e = single_pulse_avalanche_energy(Henries::new(0.35)?, Amps::new(0.5)?,
///                                       Volts::new(66.0)?, Volts::new(26.4)?)?;
/// assert!((e.value() - 0.072917).abs() < 1e-5);
/// # Ok::<(), kickguard::Error>(())
/// ```
pub fn single_pulse_avalanche_energy(
    l: Henries,
    i: Amps,
    v_breakdown: Volts,
    v_supply: Volts,
) -> Result<Joules, Error> {
    let (vbr, vs) = (v_breakdown.value(), v_supply.value());
    if !(vs >= 0.0) {
        return Err(Error::new("supply voltage", Reason::Negative));
    }
    if !(vbr > vs) {
        return Err(Error::new("breakdown voltage", Reason::CannotClamp));
    }
    let stored = l
        .stored_energy(i)
        .map_err(|e| e.on("avalanche energy"))?
        .value();
    Joules::new(stored * (vbr / (vbr - vs))).map_err(|e| e.on("avalanche energy"))
}

/// A coil decaying into a constant clamp voltage from a start current: the lean run-time form
/// of the closed-form decay, for firmware that needs a wait time or an energy on the
/// controller.
///
/// Loop law L·di/dt = −(Vc + R·i), with Vc the constant clamp voltage seen by the coil (for a
/// clamp across the switch or an avalanche at V_BR, Vc = V_BR − V_supply; for an ideal zener +
/// diode across the coil, Vc = Vz + V_F) and R every resistance in the loop. Same formulas and
/// accuracy as [`super::SwitchOff`] on an affine path (within about 2e-5 relative of the exact
/// solution), without its topology dispatch. Work: constant for every call.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ConstantClamp {
    l: f32,
    r: f32,
    vc: f32,
    i0: f32,
}

/// Result of [`ConstantClamp::decay_to`].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ConstantDecay {
    /// Time from the start to the end current.
    pub time: Seconds,
    /// Charge through the clamp.
    pub charge: Coulombs,
    /// Energy into the clamp voltage, Vc·Q (for a clamp across the switch the device takes
    /// V_BR·Q: add V_supply·Q from the supply).
    pub clamp_energy: Joules,
    /// Energy into the loop resistance, R·∫i²dt.
    pub resistive_energy: Joules,
}

impl ConstantClamp {
    /// A decay of inductance `l` through loop resistance `r` (≥ 0) into clamp voltage `vc`,
    /// starting from current `i_start`.
    ///
    /// Work: constant (comparisons only).
    ///
    /// # Errors
    /// `vc` ≤ 0 → [`Reason::CannotClamp`] on `"clamp voltage"`; `i_start` ≤ 0 →
    /// [`Reason::NotPositive`] on `"start current"`.
    ///
    /// ```
    /// use kickguard::clamp::closed_form::ConstantClamp;
    /// use kickguard::{Amps, Henries, Ohms, Volts};
    /// // A 60 V avalanche on a 24 V valve coil: Vc = 36 V.
    /// let c = ConstantClamp::new(Henries::new(0.35)?, Ohms::new(56.0)?, Volts::new(36.0)?,
    ///                            Amps::new(0.43)?)?;
    /// let t = c.time_to(Amps::new(0.0)?)?;
    /// let tau = 0.35f32 / 56.0;
    /// assert!((t.value() - tau * (1.0f32 + 0.43 * 56.0 / 36.0).ln()).abs() < 1e-7);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn new(l: Henries, r: Ohms, vc: Volts, i_start: Amps) -> Result<Self, Error> {
        if !(vc.value() > 0.0) {
            return Err(Error::new("clamp voltage", Reason::CannotClamp));
        }
        if !(i_start.value() > 0.0) {
            return Err(Error::new("start current", Reason::NotPositive));
        }
        Ok(ConstantClamp {
            l: l.value(),
            r: r.value(),
            vc: vc.value(),
            i0: i_start.value(),
        })
    }

    fn check(&self, i_end: Amps) -> Result<f32, Error> {
        let b = i_end.value();
        if b < 0.0 {
            return Err(Error::new("end current", Reason::Negative));
        }
        if !(b < self.i0) {
            return Err(Error::new("end current", Reason::Unreachable));
        }
        Ok(b)
    }

    /// Time for the current to fall from the start current to `i_end` (0 allowed: the time to
    /// zero).
    ///
    /// Work: constant (one ln(1 + x) or an 11-term series).
    ///
    /// # Errors
    /// `i_end` < 0 → [`Reason::Negative`], `i_end` ≥ the start current →
    /// [`Reason::Unreachable`], on `"end current"`; a time beyond the quantity bounds →
    /// [`Reason::TooLarge`].
    pub fn time_to(&self, i_end: Amps) -> Result<Seconds, Error> {
        self.time_to_with(i_end, |x| Ok(math::ln_1p(x)))
    }

    /// [`ConstantClamp::time_to`] with the ln(1 + x) of the caller's backend (x ≥ 0.25 only).
    pub(crate) fn time_to_with(
        &self,
        i_end: Amps,
        ln_1p: impl Fn(f32) -> Result<f32, Error>,
    ) -> Result<Seconds, Error> {
        let b = self.check(i_end)?;
        let d = self.i0 - b;
        let w1 = self.vc + self.r * b;
        let x = self.r * d / w1;
        let c0 = if x < SERIES_BELOW {
            chi(x)[0]
        } else {
            ln_1p(x)? / x
        };
        Seconds::new(self.l * d / w1 * c0)
    }

    /// Time, charge and energies of the decay from the start current to `i_end`.
    ///
    /// Work: constant.
    ///
    /// # Errors
    /// As [`ConstantClamp::time_to`].
    pub fn decay_to(&self, i_end: Amps) -> Result<ConstantDecay, Error> {
        let b = self.check(i_end)?;
        let [t, q, i2] = integrals(self.l, self.vc, self.r, self.i0, b);
        Ok(ConstantDecay {
            time: Seconds::new(t)?,
            charge: Coulombs::new(q)?,
            clamp_energy: Joules::new(self.vc * q)?,
            resistive_energy: Joules::new(self.r * i2)?,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn constant_clamp_matches_the_textbook_decay() {
        // Source: constant-clamp RL decay (Horowitz & Hill, AoE 3rd ed.): time to zero
        // τ·ln(1 + I₀R/Vc), energy balance ½·L·I₀² = Vc·Q + R·∫i²dt.
        let i0 = Amps::new(0.075).unwrap();
        let c = ConstantClamp::new(
            Henries::new(0.9).unwrap(),
            Ohms::new(160.0).unwrap(),
            Volts::new(18.7).unwrap(),
            i0,
        )
        .unwrap();
        let zero = Amps::new(0.0).unwrap();
        let d = c.decay_to(zero).unwrap();
        let want = 0.9f64 / 160.0 * (1.0 + 0.075 * 160.0 / 18.7f64).ln();
        assert!(
            ((d.time.value() as f64 - want) / want).abs() < 2e-6,
            "{:?} vs {want}",
            d.time
        );
        assert_eq!(c.time_to(zero).unwrap(), d.time);
        let stored = 0.5 * 0.9 * 0.075f32 * 0.075;
        let sum = d.clamp_energy.value() + d.resistive_energy.value();
        assert!(((sum - stored) / stored).abs() < 1e-5);
        assert_eq!(c.time_to(i0).unwrap_err().reason, Reason::Unreachable);
        let e = ConstantClamp::new(
            Henries::new(1.0).unwrap(),
            Ohms::new(1.0).unwrap(),
            Volts::new(0.0).unwrap(),
            i0,
        );
        assert_eq!(e.unwrap_err().reason, Reason::CannotClamp);
    }

    #[test]
    fn chi_series_and_closed_agree_at_the_switch_over() {
        // Both branches evaluate the same integral; compare against f64 closed forms.
        for &x in &[0.0f32, 1e-6, 0.01, 0.2499, 0.25, 0.5, 3.0, 100.0] {
            let got = chi(x);
            let x64 = x as f64;
            let want = if x64 == 0.0 {
                [1.0, 0.5, 1.0 / 3.0]
            } else {
                let l = x64.ln_1p();
                [
                    l / x64,
                    (x64 - l) / (x64 * x64),
                    (0.5 * x64 * x64 - x64 + l) / (x64 * x64 * x64),
                ]
            };
            for n in 0..3 {
                let rel = ((got[n] as f64 - want[n]) / want[n]).abs();
                // f64 closed forms themselves lose precision below x ≈ 1e-4 for χ₂.
                let tol = if x64 > 0.0 && x64 < 1e-3 { 1e-3 } else { 2e-5 };
                assert!(
                    rel < tol,
                    "χ{n}({x}) = {} vs {} (rel {rel:e})",
                    got[n],
                    want[n]
                );
            }
        }
    }
}
