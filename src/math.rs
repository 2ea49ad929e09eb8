//! The crate's elementary functions, in one place so the backend can be chosen here.
//!
//! Backend: [`libm`], a port of musl's libm. Its `logf`, `expf`, `log1pf` and `powf` are within
//! 1 ulp of the correctly rounded result (musl's stated bound), which is the accuracy the error
//! budgets in this crate assume. All functions here are total: they never panic.

/// Natural logarithm.
#[inline]
pub(crate) fn ln(x: f32) -> f32 {
    libm::logf(x)
}

/// ln(1 + x), accurate for small x.
#[inline]
pub(crate) fn ln_1p(x: f32) -> f32 {
    libm::log1pf(x)
}

/// Exponential.
#[inline]
pub(crate) fn exp(x: f32) -> f32 {
    libm::expf(x)
}

/// eˣ − 1, accurate for small x.
#[inline]
pub(crate) fn exp_m1(x: f32) -> f32 {
    libm::expm1f(x)
}

/// Square root.
#[inline]
#[allow(dead_code)]
pub(crate) fn sqrt(x: f32) -> f32 {
    libm::sqrtf(x)
}

/// ln(1 + eˣ) without overflow for any finite x ("softplus").
///
/// For x > 0: ln(1 + eˣ) = x + ln(1 + e⁻ˣ); otherwise ln(1 + eˣ) directly. Both branches keep the
/// exponent's argument ≤ 0, so nothing overflows, and `ln_1p` keeps full relative accuracy when
/// eˣ is tiny.
#[inline]
pub(crate) fn ln_1p_exp(x: f32) -> f32 {
    if x > 0.0 {
        x + ln_1p(exp(-x))
    } else {
        ln_1p(exp(x))
    }
}

/// The logistic function 1/(1 + e⁻ˣ) = eˣ/(1 + eˣ), evaluated on the side whose exponential
/// cannot overflow.
#[inline]
pub(crate) fn logistic(x: f32) -> f32 {
    if x >= 0.0 {
        1.0 / (1.0 + exp(-x))
    } else {
        let e = exp(x);
        e / (1.0 + e)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn softplus_matches_f64_reference() {
        // Reference: ln(1 + e^x) evaluated in f64 by the Rust standard library's ln_1p and exp
        // (the identity ln(1 + e^x) = x + ln(1 + e^−x) is exact; f64 keeps 1e-16 relative).
        for &x in &[-80.0f32, -20.0, -1.0, 0.0, 0.5, 3.0, 20.0, 80.0] {
            let x64 = x as f64;
            let r = if x64 > 0.0 {
                x64 + (-x64).exp().ln_1p()
            } else {
                x64.exp().ln_1p()
            };
            let got = ln_1p_exp(x) as f64;
            assert!(
                (got - r).abs() <= 1e-6 * r.abs().max(1e-30),
                "x={x}: {got} vs {r}"
            );
        }
    }
}
