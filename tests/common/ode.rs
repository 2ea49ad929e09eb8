//! The time a coil current takes to fall, from a general-purpose ODE solver (`ode_solvers`,
//! Dormand–Prince 5(4), f64): dt/di = L/g(i) for a loop law g (the voltage driving the current
//! down), integrated over the normalised fall σ = (I₀ − i)/(I₀ − I₁), dt/dσ = (I₀ − I₁)·L/g(i).

use ode_solvers::{Dopri5, SVector, System};

struct Fall<'a> {
    l: f64,
    i0: f64,
    span: f64,
    g: &'a dyn Fn(f64) -> f64,
}

impl System<f64, SVector<f64, 1>> for Fall<'_> {
    fn system(&self, s: f64, _y: &SVector<f64, 1>, dy: &mut SVector<f64, 1>) {
        dy[0] = self.span * self.l / (self.g)(self.i0 - s * self.span);
    }
}

/// Seconds for the current to fall from `i0` to `i1` (A) in inductance `l` (H) under loop law
/// `g` (V), with the solver's first step `h0` (of the unit fall) and its relative and absolute
/// tolerances. Zero when `i1 ≥ i0`.
pub fn fall_time(
    l: f64,
    i0: f64,
    i1: f64,
    g: &dyn Fn(f64) -> f64,
    h0: f64,
    rtol: f64,
    atol: f64,
) -> f64 {
    if i1 >= i0 {
        return 0.0;
    }
    let f = Fall {
        l,
        i0,
        span: i0 - i1,
        g,
    };
    let mut s = Dopri5::new(f, 0.0, 1.0, h0, SVector::<f64, 1>::zeros(), rtol, atol);
    s.integrate().unwrap();
    s.y_out().last().unwrap()[0]
}
