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
//! χₙ is evaluated by its power series Σₖ (−x)ᵏ/(n + k + 1) for x < 0.25 (14 terms, truncation
//! below 0.25¹⁴/15 ≈ 2.5e-10) and by the closed expressions above otherwise, where their
//! cancellation costs at most ≈ 1e-5 relative at x = 0.25. Every result is therefore within
//! about 2e-5 relative of the exact model, R → 0 included.

use crate::math;

/// Terms of the power series used below the switch-over point.
const SERIES_TERMS: u32 = 14;
/// Below this x the series is used.
const SERIES_BELOW: f32 = 0.25;

/// χₙ(x) for n = 0, 1, 2 and x ≥ 0 (see the module docs).
pub(crate) fn chi(x: f32) -> [f32; 3] {
    if x < SERIES_BELOW {
        let mut out = [0.0f32; 3];
        for (n, slot) in out.iter_mut().enumerate() {
            // Horner from the last term: Σ (−x)^k/(n+k+1).
            let mut acc = 0.0f32;
            let mut k = SERIES_TERMS;
            while k > 0 {
                k -= 1;
                acc = 1.0 / (n as f32 + k as f32 + 1.0) - x * acc;
            }
            *slot = acc;
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

/// Current at time `t` after switch-off, exact: (I₀ + Vc/R)·e^(−t·R/L) − Vc/R, or I₀ − Vc·t/L
/// for R = 0, written as I₀ − (Vc/R + I₀)·(1 − e^(−tR/L)) to keep R → 0 accurate.
pub(crate) fn current_at(l: f32, vc: f32, r: f32, i0: f32, t: f32) -> f32 {
    let z = t * r / l;
    // (1 − e^(−z))/z → 1 as z → 0; written with exp_m1 to keep accuracy.
    let frac = if z > 1e-6 {
        -math::exp_m1(-z) / z
    } else {
        1.0 - 0.5 * z
    };
    i0 - (vc + r * i0) * (t / l) * frac
}

#[cfg(test)]
mod tests {
    use super::*;

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
