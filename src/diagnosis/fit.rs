//! τ and the clamp voltage from a buffer of current samples, by least squares.
//!
//! For a constant clamp voltage the decay obeys L·di/dt = −(R·i + Vc), whose exact solution
//! sampled every h seconds satisfies the linear recurrence
//!
//! ```text
//! i[k+1] = α·i[k] + β,    α = e^(−h/τ),   β = −(Vc/R)·(1 − α)
//! ```
//!
//! (substitute t + h into i(t) = (I₀ + Vc/R)·e^(−t/τ) − Vc/R). Ordinary least squares of i[k+1]
//! on `i[k]` estimates α and β with no derivative approximation; then τ = −h/ln α and
//! Vc/R = −β/(1 − α). With R known (from the on-current), L = τ·R and Vc = R·(Vc/R), and the
//! clamp kind is the candidate whose voltage is closest ([`DecayFit::closest_clamp`]). For a diode
//! clamp, whose voltage is not constant, the fit returns the effective values over the samples.
//! Sums are taken about the means (two passes) for f32 stability; work is fixed: two passes over
//! the buffer.

use crate::error::{Error, Reason};
use crate::math;
use crate::units::{Amps, Henries, Ohms, Seconds, Volts};

/// Result of [`fit_decay`].
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DecayFit {
    /// Time constant τ.
    pub tau: Seconds,
    /// V_c/R_loop: the clamp voltage (extrapolated to zero current) divided by the loop
    /// resistance R + r_s (a current; ≥ 0 for a clamp).
    pub clamp_over_r: f32,
}

impl DecayFit {
    /// Inductance L = τ·R for a loop resistance `r` (the whole loop: coil plus the clamp's slope;
    /// see [`DecayFit::recover`]).
    ///
    /// # Errors
    /// A product beyond the quantity bounds → the errors of [`Henries::new`].
    pub fn inductance(&self, r: Ohms) -> Result<Henries, Error> {
        Henries::new(self.tau.value() * r.value())
    }

    /// Clamp voltage Vc = R·(Vc/R) for a loop resistance `r`.
    ///
    /// # Errors
    /// A product beyond the quantity bounds → the errors of [`Volts::new`].
    pub fn clamp_voltage(&self, r: Ohms) -> Result<Volts, Error> {
        Volts::new(self.clamp_over_r * r.value())
    }
}

impl DecayFit {
    /// Which of the clamp voltages in `candidates` (what each possible clamp would put across
    /// the coil: for example a diode's ≈ 0.8 V, the zener clamp's Vz + V_F, an avalanche's
    /// V_BR − V_supply) the fitted clamp voltage is closest to, with `r` the loop resistance.
    /// Returns the index, or None for an empty list.
    ///
    /// # Errors
    /// As [`DecayFit::clamp_voltage`].
    pub fn closest_clamp(&self, r: Ohms, candidates: &[Volts]) -> Result<Option<usize>, Error> {
        let vc = self.clamp_voltage(r)?.value();
        let mut best: Option<(usize, f32)> = None;
        for (k, c) in (0..candidates.len()).zip(candidates.iter()) {
            let d = (c.value() - vc).abs();
            if best.is_none_or(|(_, b)| d < b) {
                best = Some((k, d));
            }
        }
        Ok(best.map(|(k, _)| k))
    }
}

/// Fits τ and V_c/R to `samples` (coil current every `interval`, falling overall; noise that
/// makes some pairs rise is fine).
///
/// τ is L/(R + r_s) and V_c the clamp's voltage extrapolated to zero current, where R is the
/// coil's resistance and r_s the clamp's slope resistance (a zener's dynamic resistance, a
/// series resistor): recover L and V_c with [`DecayFit::recover`] and both resistances, not
/// with τ·R (off by r_s/R).
///
/// Accuracy: exact for noise-free samples of a constant-clamp decay, to f32 rounding (the tests
/// measure ~1e-4 relative on τ); noise adds the usual least-squares scatter.
///
/// # Errors
/// Fewer than 3 samples → [`Reason::TooFew`] on `"samples"`; `interval` = 0 →
/// [`Reason::NotPositive`] on `"sample interval"`; a last sample not below the first →
/// [`Reason::NotDecreasing`] on `"samples"`; all pairs alike (no spread to fit) or a fit with α
/// outside (0, 1) → [`Reason::Inconsistent`] on `"samples"`.
///
/// ```
/// use kickguard::diagnosis::fit::fit_decay;
/// use kickguard::{Amps, Seconds};
/// // i(t) = (0.4 + 0.5)·e^(−t/5 ms) − 0.5, sampled every 0.5 ms.
/// let s: Vec<Amps> = (0..8).map(|k| {
///     let t = k as f32 * 0.5e-3;
///     Amps::new(0.9 * (-t / 5e-3f32).exp() - 0.5).unwrap()
/// }).collect();
/// let f = fit_decay(&s, Seconds::new(0.5e-3).unwrap()).unwrap();
/// assert!((f.tau.value() - 5e-3).abs() < 5e-6);
/// assert!((f.clamp_over_r - 0.5).abs() < 2e-3);
/// ```
pub fn fit_decay(samples: &[Amps], interval: Seconds) -> Result<DecayFit, Error> {
    let h = interval.value();
    if !(h > 0.0) {
        return Err(Error::new("sample interval", Reason::NotPositive));
    }
    let (Some(first), Some(last)) = (samples.first(), samples.last()) else {
        return Err(Error::new("samples", Reason::TooFew));
    };
    if samples.len() < 3 {
        return Err(Error::new("samples", Reason::TooFew));
    }
    if !(last.value() < first.value()) {
        return Err(Error::new("samples", Reason::NotDecreasing));
    }
    // Consecutive pairs (i[k], i[k+1]).
    let pairs = || {
        samples
            .iter()
            .zip(samples.iter().skip(1))
            .map(|(a, b)| (a.value(), b.value()))
    };
    let mut n = 0.0f32;
    let (mut mx, mut my) = (0.0f32, 0.0f32);
    for (a, b) in pairs() {
        mx += a;
        my += b;
        n += 1.0;
    }
    mx /= n;
    my /= n;
    let (mut sxx, mut sxy) = (0.0f32, 0.0f32);
    for (a, b) in pairs() {
        let (dx, dy) = (a - mx, b - my);
        sxx += dx * dx;
        sxy += dx * dy;
    }
    if !(sxx > 0.0 && sxx.is_finite()) {
        return Err(Error::new("samples", Reason::Inconsistent));
    }
    let alpha = sxy / sxx;
    if !(alpha > 0.0 && alpha < 1.0) {
        return Err(Error::new("samples", Reason::Inconsistent));
    }
    let beta = my - alpha * mx;
    let tau = -h / math::ln(alpha);
    let clamp_over_r = -beta / (1.0 - alpha);
    Ok(DecayFit {
        tau: Seconds::new(tau)?,
        clamp_over_r: crate::error::result("clamp voltage over R", clamp_over_r)?,
    })
}

/// L and the clamp's voltage recovered from a fit with the loop's resistances known.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Recovered {
    /// L = τ·(R + r_s).
    pub inductance: Henries,
    /// V_c = (V_c/R_loop)·(R + r_s), the clamp's voltage extrapolated to zero current.
    pub clamp_voltage: Volts,
}

impl DecayFit {
    /// L and V_c from the fit, the coil's resistance `coil` (from the on-current: V/I) and the
    /// clamp's slope resistance `clamp_slope` (the zener's dynamic resistance, a series
    /// resistor; a diode's N·Vt/I is small beside a coil's R): the loop is
    /// L·di/dt = −(V_c + (R + r_s)·i), so τ = L/(R + r_s).
    ///
    /// # Errors
    /// A loop resistance of zero → [`Reason::NotPositive`] on `"loop resistance"`; results
    /// beyond the quantity bounds → the errors of [`Henries::new`] / [`Volts::new`].
    pub fn recover(&self, coil: Ohms, clamp_slope: Ohms) -> Result<Recovered, Error> {
        let r = coil.value() + clamp_slope.value();
        if !(r > 0.0) {
            return Err(Error::new("loop resistance", Reason::NotPositive));
        }
        Ok(Recovered {
            inductance: Henries::new(self.tau.value() * r)?,
            clamp_voltage: Volts::new(self.clamp_over_r * r)?,
        })
    }
}

/// A fixed-capacity sample buffer the firmware fills from its ADC interrupt.
pub type SampleBuffer<const N: usize> = heapless::Vec<Amps, N>;
