//! Bracketed root finding with bounded work (internal).
//!
//! The Illinois variant of regula falsi (Dowell & Jarratt, 1971): the root stays bracketed at every
//! step, so the method cannot diverge, and halving the retained end's function value when the
//! same end is kept twice gives superlinear convergence (order ≈ 1.44). The iteration cap bounds
//! the work; the caller must supply a bracket with a sign change.

/// Finds x in [lo, hi] with f(x) = 0, given f(lo) and f(hi) of opposite signs (or one zero).
///
/// Stops when the bracket is narrower than `x_tol` or after `max_iter` steps, returning the best
/// estimate. Returns `None` if the bracket has no sign change or a function value is not finite.
pub(crate) fn illinois(
    mut f: impl FnMut(f32) -> f32,
    mut lo: f32,
    mut hi: f32,
    x_tol: f32,
    max_iter: u32,
) -> Option<f32> {
    let mut f_lo = f(lo);
    let mut f_hi = f(hi);
    if !(f_lo.is_finite() && f_hi.is_finite()) {
        return None;
    }
    if f_lo == 0.0 {
        return Some(lo);
    }
    if f_hi == 0.0 {
        return Some(hi);
    }
    if (f_lo > 0.0) == (f_hi > 0.0) {
        return None;
    }
    let mut side = 0i8;
    for _ in 0..max_iter {
        let x = (lo * f_hi - hi * f_lo) / (f_hi - f_lo);
        // Guard against a degenerate secant (rounding): fall back to bisection.
        let x = if x > lo && x < hi { x } else { 0.5 * (lo + hi) };
        let fx = f(x);
        if !fx.is_finite() {
            return None;
        }
        if fx == 0.0 {
            return Some(x);
        }
        if (fx > 0.0) == (f_hi > 0.0) {
            hi = x;
            f_hi = fx;
            if side == 1 {
                f_lo *= 0.5;
            }
            side = 1;
        } else {
            lo = x;
            f_lo = fx;
            if side == -1 {
                f_hi *= 0.5;
            }
            side = -1;
        }
        if hi - lo <= x_tol {
            break;
        }
    }
    Some(if f_lo.abs() < f_hi.abs() { lo } else { hi })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_sqrt2_and_rejects_no_bracket() {
        // √2 = 1.41421356… (any table of square roots).
        let r = illinois(|x| x * x - 2.0, 0.0, 2.0, 1e-6, 60).unwrap();
        assert!((r - core::f32::consts::SQRT_2).abs() < 2e-6, "{r}");
        assert_eq!(illinois(|x| x * x + 1.0, -1.0, 1.0, 1e-6, 60), None);
        assert_eq!(illinois(|_| f32::NAN, -1.0, 1.0, 1e-6, 60), None);
    }
}
