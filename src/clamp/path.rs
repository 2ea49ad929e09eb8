//! The decay loop's voltage law and its integration (closed form or quadrature in u = ln i).
//!
//! After switch-off the coil current i > 0 flows through the clamp path and
//! L·di/dt = −g(i), where g(i) is the sum of every voltage around the loop except the coil's EMF:
//!
//! ```text
//! g(i) = Vs_term + (R_coil + R_ext)·i + n_d·(N·Vt·ln(1 + i/IS(T)) + RS·i) + V_b(i)
//! ```
//!
//! with n_d ∈ {0, 1, 2} forward diodes, V_b(i) = V₀ + r·i + a·ln(1 + i/I_b) a breakdown device
//! (zener, TVS, avalanche), and Vs_term = −V_supply when the clamp sits from the switch node to
//! ground (the supply keeps driving the coil), +V_supply when an H-bridge returns the current to
//! the supply, 0 for clamps across the coil.
//!
//! Any quantity accumulated during the decay is ∫ f(i) dt = L·∫ f(i)/g(i) di. Without logarithmic
//! terms g is affine and the integrals are closed forms ([`super::closed_form`]). With them there
//! is no closed form, and the integral is taken in u = ln i (di = i·du), where the integrand
//! f(i)·i/g(i) is smooth and slowly varying over many decades of current:
//! composite 4-point Gauss–Legendre on panels of width ≤ 1 in u (one e-fold of current). The
//! 4-point rule is exact for polynomials of degree 7; its error term is
//! h⁹·(4!)⁴/(9·(8!)³)·f⁽⁸⁾ ≈ 5.6e-10·h⁹·f⁽⁸⁾, and the integrands here (eᵘ times slowly varying
//! ratios of affine and logarithmic terms) have f⁽⁸⁾ of the order of f itself, so the error is
//! far below f32 resolution (measured against an f64 Dormand–Prince integration in
//! `tests/clamp_reference.rs` and an f64 Simpson reference in `benches/clamp_accuracy.rs`: worst
//! relative error ≈ 1e-6, the f32 summation floor). The work is bounded and proportional to
//! ln(I₀/I₁): at most [`MAX_PANELS`] panels (a current ratio of e⁴⁸ ≈ 7e20).

use super::closed_form;
use crate::math;

/// Gauss–Legendre 4-point nodes on [−1, 1] (Abramowitz & Stegun, Table 25.4).
const GL_X: [f32; 4] = [-0.861_136_3, -0.339_981_04, 0.339_981_04, 0.861_136_3];
/// Gauss–Legendre 4-point weights (Abramowitz & Stegun, Table 25.4).
const GL_W: [f32; 4] = [0.347_854_84, 0.652_145_5, 0.652_145_5, 0.347_854_84];
/// Widest panel in u = ln i.
pub(crate) const PANEL_WIDTH: f32 = 1.0;
/// Largest number of panels (bounded work).
pub const MAX_PANELS: u32 = 48;
/// A decay to exactly zero (possible only with a positive constant clamp voltage) is integrated
/// down to this fraction of the start current and finished by a one-step tail estimate.
const TAIL_FRACTION: f32 = 1.0e-6;

/// A diode evaluated at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct DiodeAt {
    /// N·Vt(T)
    pub a: f32,
    /// ln IS(T)
    pub ln_is: f32,
    /// RS
    pub rs: f32,
}

impl DiodeAt {
    #[inline]
    pub(crate) fn log_part(&self, i: f32) -> f32 {
        math::ln_1p_exp(math::ln(i) - self.ln_is)
    }
    #[inline]
    pub(crate) fn drop(&self, i: f32) -> f32 {
        if i > 0.0 {
            self.a * self.log_part(i) + self.rs * i
        } else {
            0.0
        }
    }
}

/// The loop law g(i), with every parameter at its temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct LoopLaw {
    pub l: f32,
    pub r_coil: f32,
    pub r_ext: f32,
    pub diode: DiodeAt,
    pub n_diodes: f32,
    pub bd: crate::breakdown::BreakdownAt,
    pub has_bd: bool,
    pub vs_term: f32,
}

/// Time-domain integrals of a decay from I₀ to I₁.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub(crate) struct Integrals {
    /// ∫dt (s)
    pub t: f32,
    /// ∫i dt (C)
    pub q: f32,
    /// ∫i² dt (A²·s)
    pub i2: f32,
    /// ∫ln(1 + i/IS)·i dt (A·s): the diode's logarithmic part
    pub d_log: f32,
    /// ∫ln(1 + i/I_b)·i dt (A·s): the breakdown device's logarithmic part
    pub z_log: f32,
}

impl LoopLaw {
    /// Constant part of g (the clamp voltage at zero current).
    pub(crate) fn v_const(&self) -> f32 {
        self.vs_term + if self.has_bd { self.bd.v0 } else { 0.0 }
    }

    /// Total linear resistance in the loop.
    pub(crate) fn r_total(&self) -> f32 {
        self.r_coil
            + self.r_ext
            + self.n_diodes * self.diode.rs
            + if self.has_bd { self.bd.r } else { 0.0 }
    }

    /// True when g has no logarithmic term, so the closed forms apply.
    pub(crate) fn is_affine(&self) -> bool {
        self.n_diodes == 0.0 && (!self.has_bd || self.bd.a == 0.0)
    }

    /// g(i) for i > 0.
    #[inline]
    pub(crate) fn g(&self, i: f32) -> f32 {
        let mut g = self.vs_term + (self.r_coil + self.r_ext) * i;
        if self.n_diodes > 0.0 {
            g += self.n_diodes * self.diode.drop(i);
        }
        if self.has_bd {
            g += self.bd.eval(i);
        }
        g
    }

    /// The clamp's voltage across the coil terminals (g minus the coil's own resistance).
    #[inline]
    pub(crate) fn v_clamp(&self, i: f32) -> f32 {
        self.g(i) - self.r_coil * i
    }

    /// Integrals from `i0` down to `i1` (0 ≤ i1 < i0). `i1` = 0 needs a positive constant
    /// clamp voltage; the caller checks that, and the panel budget ([`Self::panels`]).
    pub(crate) fn integrate(&self, i0: f32, i1: f32) -> Integrals {
        if self.is_affine() {
            let [t, q, i2] = closed_form::integrals(self.l, self.v_const(), self.r_total(), i0, i1);
            return Integrals {
                t,
                q,
                i2,
                d_log: 0.0,
                z_log: 0.0,
            };
        }
        let lower = if i1 > 0.0 { i1 } else { i0 * TAIL_FRACTION };
        let mut acc = self.quadrature(math::ln(i0), math::ln(lower));
        if i1 < lower {
            // Tail from `lower` down to zero (only with a positive constant clamp voltage V₀):
            // it lasts at most L·lower/V₀, a fraction ≤ 1e-6·g(I₀)/V₀ of the whole decay, so a
            // single midpoint step leaves no visible error in the total.
            let mid = 0.5 * lower;
            let dt = self.l * lower / self.g(mid);
            acc.t += dt;
            acc.q += dt * mid;
            acc.i2 += dt * mid * mid;
            acc.d_log += dt
                * mid
                * if self.n_diodes > 0.0 {
                    self.diode.log_part(mid)
                } else {
                    0.0
                };
            acc.z_log += dt
                * mid
                * if self.has_bd {
                    self.bd.log_part(mid)
                } else {
                    0.0
                };
        }
        acc
    }

    /// Number of panels needed between two currents.
    pub(crate) fn panels(u0: f32, u1: f32) -> u32 {
        let n = libm::ceilf((u0 - u1) / PANEL_WIDTH);
        if n < 1.0 {
            1
        } else if n > MAX_PANELS as f32 {
            MAX_PANELS + 1
        } else {
            n as u32
        }
    }

    /// Composite Gauss–Legendre over u from u1 to u0 (u0 > u1).
    fn quadrature(&self, u0: f32, u1: f32) -> Integrals {
        let n = Self::panels(u0, u1).min(MAX_PANELS);
        let h = (u0 - u1) / n as f32;
        let r_lin = self.r_coil + self.r_ext + self.n_diodes * self.diode.rs;
        let use_d = self.n_diodes > 0.0;
        let use_z = self.has_bd && self.bd.a != 0.0;
        let v_const = self.v_const();
        let r_bd = if self.has_bd { self.bd.r } else { 0.0 };
        let mut acc = Integrals::default();
        for p in 0..n {
            let mid = u1 + (p as f32 + 0.5) * h;
            for (x, w) in GL_X.iter().zip(GL_W.iter()) {
                let u = mid + 0.5 * h * x;
                let i = math::exp(u);
                // The logarithmic parts straight from u = ln i (no ln per node), each computed
                // once and used for both g and the energy integrals.
                let d_lp = if use_d {
                    math::ln_1p_exp(u - self.diode.ln_is)
                } else {
                    0.0
                };
                let z_lp = if use_z {
                    math::ln_1p_exp(u - self.bd.ln_ib)
                } else {
                    0.0
                };
                let g = v_const
                    + (r_lin + r_bd) * i
                    + self.n_diodes * self.diode.a * d_lp
                    + self.bd.a * z_lp;
                // dt = L·i/g(i)·du; the weight carries the panel's half-width.
                let dt = self.l * i / g * (0.5 * h * w);
                acc.t += dt;
                acc.q += dt * i;
                acc.i2 += dt * i * i;
                acc.d_log += dt * i * d_lp;
                acc.z_log += dt * i * z_lp;
            }
        }
        acc
    }
}
