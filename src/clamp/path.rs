//! The decay loop's voltage law and its integration (closed form, or quadrature in the log of
//! the current).
//!
//! After switch-off the coil current i > 0 flows through the clamp path and L·di/dt = −g(i),
//! where g(i) is the sum of every voltage around the loop except the coil's EMF. Every topology
//! of [`super::Clamp`] is one instance of
//!
//! ```text
//! g(i) = c + r·i + n_d·N·Vt·ln(1 + i/IS(T)) + a_z·L(ln i − ln I_b) + p·(i/I_p)^β
//! ```
//!
//! - c: the constant part: ±V_supply (a clamp across the switch lets the supply keep driving;
//!   an H-bridge returns the current to it), fixed diode drops, a breakdown's V₀, an active
//!   clamp's V_Z + V_th;
//! - r: every linear resistance: coil, external resistor, diodes' RS, a breakdown's RS or rz;
//! - the diode law of n_d diodes ([`crate::diode`]);
//! - a breakdown's logarithmic term, L(x) = x (SPICE's exact law) or ln(1 + eˣ) (floored);
//! - a power law, p·(i/I_p)^β: a varistor (β = 1/α) or an active clamp's V_GS overdrive
//!   √(i/K) (β = ½).
//!
//! Each term is non-decreasing in i, so g is monotone: the clamp voltage, and with it the
//! switch voltage, is highest at switch-off.
//!
//! **Where the decay ends.** g(i) → c as i → 0 (or → −∞ with SPICE's exact law). If g stays
//! positive down to zero current and the integral of L/g converges there, the current reaches
//! zero in finite time: any positive constant part c, a power law with β < 1, or the exact law
//! whose root lies below 1e-21·I₀ (a residual current that small is neglected, and said so).
//! A plain diode path (c = 0, g ∝ i near zero) only tends to zero, exponentially. If instead g
//! has a root at a current i_f > 0 (SPICE's law on a clamp across the switch whose BV is near
//! the supply), the loop settles at that steady current, and every current at or below it is
//! unreachable. i_f is found once, by bracketed Illinois iteration on g in ln i (≤ 60 steps).
//!
//! **Integration.** Any quantity accumulated during the decay is ∫ f(i) dt = L·∫ f(i)/g(i) di.
//! Without logarithmic or power terms g is affine and the integrals are closed forms
//! ([`super::closed_form`]). Otherwise the integral is taken in s = ln(i − i_f) (di = (i − i_f)·ds),
//! where the integrand L·f(i)·(i − i_f)/g(i) is smooth and slowly varying over many decades of
//! current, and stays smooth at a steady current i_f (g vanishes linearly there, as i − i_f
//! does): composite 4-point Gauss–Legendre on panels of width ≤ [`PANEL_WIDTH`] in s. The
//! 4-point rule is exact for polynomials of degree 7; its error on a panel of width h is
//! h⁹·(4!)⁴/(9·(8!)³)·f⁽⁸⁾ ≈ 5.6e-10·h⁹·f⁽⁸⁾, and the integrands here (eˢ times slowly varying
//! ratios of affine, logarithmic and power terms) have f⁽⁸⁾ of the order of kⁿ·f for an
//! integrand growing like e^(k·s) (k = 1 for the time, up to 3 for ∫i²dt), so with h = 1 the
//! bound is ≈ 5.6e-10·3⁸ ≈ 4e-6 relative per panel for the resistive energy and far less for the
//! time, at f32's summation floor in practice (measured against f64 references in
//! `tests/clamp_reference.rs` and `benches/clamp_accuracy.rs`; h = 2 would put the energies'
//! bound near 2e-3). A decay to zero
//! is integrated to [`TAIL_FRACTION`] of the start current and finished by a closed-form tail
//! that treats g as a power of i over the last interval (its share of the whole is below 1e-6).
//!
//! **Bounded work.** At most [`MAX_SPAN`] e-folds of current (a ratio of e⁴⁸ ≈ 7e20), so at most
//! 48 panels of 4 nodes per integration, plus one partial panel per profile boundary.

use super::closed_form;
use crate::breakdown::{BreakdownAt, LogTerm};
use crate::math;
use crate::solve::illinois;
use crate::varistor::PowerAt;

/// Gauss–Legendre 4-point rule on [−1, 1], symmetric (Abramowitz & Stegun, Table 25.4): the
/// outer nodes ±0.861136… with weight 0.347854…, the inner ones ±0.339981… with 0.652145….
const GL_OUTER: (f32, f32) = (0.861_136_3, 0.347_854_84);
/// The inner node and its weight (Abramowitz & Stegun, Table 25.4).
const GL_INNER: (f32, f32) = (0.339_981_04, 0.652_145_5);
/// Widest panel in s = ln(i − i_f).
pub const PANEL_WIDTH: f32 = 1.0;
/// Largest span of an integration in s, in e-folds of current (bounded work).
pub const MAX_SPAN: f32 = 48.0;
/// A decay to exactly zero is integrated down to this fraction of the start current, then
/// finished by the closed-form tail.
pub const TAIL_FRACTION: f32 = 1.0e-6;
/// A decay that only tends to zero "ends" when the current is this fraction of its start
/// value (its remaining stored energy is then 1e-12 of the start).
pub const END_FRACTION: f32 = 1.0e-6;

/// A forward diode evaluated at one temperature: the law's N·Vt, ln IS(T) and RS, or a fixed
/// drop (a = 0).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub(crate) struct DiodeAt {
    /// N·Vt(T) (0 for a fixed drop).
    pub a: f32,
    /// ln IS(T).
    pub ln_is: f32,
    /// RS.
    pub rs: f32,
    /// Fixed drop (0 for the law).
    pub vf: f32,
}

impl DiodeAt {
    /// No diode.
    pub(crate) const NONE: DiodeAt = DiodeAt {
        a: 0.0,
        ln_is: 0.0,
        rs: 0.0,
        vf: 0.0,
    };

    /// ln(1 + i/IS) for ln i = `u` (zero for a fixed drop).
    #[inline]
    pub(crate) fn log_part_u(&self, u: f32) -> f32 {
        if self.a == 0.0 {
            0.0
        } else {
            math::ln_1p_exp(u - self.ln_is)
        }
    }

    /// The diode's drop at current i > 0.
    #[inline]
    pub(crate) fn drop(&self, i: f32) -> f32 {
        if i > 0.0 {
            let log = if self.a == 0.0 {
                0.0
            } else {
                self.a * self.log_part_u(math::ln(i))
            };
            self.vf + log + self.rs * i
        } else {
            self.vf
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
    /// −V_supply (clamp across the switch), +V_supply (H-bridge), or 0.
    pub vs_term: f32,
    pub n_diodes: f32,
    pub diode: DiodeAt,
    pub bd: BreakdownAt,
    pub power: PowerAt,
    /// The steady current the loop settles at (0: none above 1e-21 of the start).
    pub floor: f32,
    /// Where a decay to zero hands over from the quadrature to the tail: [`TAIL_FRACTION`] of
    /// the start current.
    pub tail_at: f32,
    /// 1/IS(T), when i/IS stays far inside f32's range up to the start current (so
    /// ln(1 + i/IS) can be taken as ln_1p(i·(1/IS)), one exponential fewer per node); else 0.
    pub inv_is: f32,
}

/// Time-domain integrals of a decay between two currents.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub(crate) struct Integrals {
    /// ∫dt (s)
    pub t: f32,
    /// ∫i dt (C)
    pub q: f32,
    /// ∫i² dt (A²·s)
    pub i2: f32,
    /// ∫ln(1 + i/IS)·i dt (A·s): the diode law's logarithmic part.
    pub d_log: f32,
    /// ∫L(ln i − ln I_b)·i dt (A·s): the breakdown law's logarithmic part.
    pub z_log: f32,
    /// ∫(i/I_p)^β·p·i dt (J): the power-law device's energy.
    pub pw: f32,
}

impl core::ops::AddAssign for Integrals {
    fn add_assign(&mut self, o: Integrals) {
        self.t += o.t;
        self.q += o.q;
        self.i2 += o.i2;
        self.d_log += o.d_log;
        self.z_log += o.z_log;
        self.pw += o.pw;
    }
}

impl LoopLaw {
    /// Constant part of g (the loop voltage at zero current, without the logarithmic terms).
    pub(crate) fn c(&self) -> f32 {
        self.vs_term + self.n_diodes * self.diode.vf + self.bd.v0
    }

    /// Total linear resistance in the loop.
    pub(crate) fn r_total(&self) -> f32 {
        self.r_coil + self.r_ext + self.n_diodes * self.diode.rs + self.bd.r
    }

    /// True when g has no logarithmic or power term, so the closed forms apply.
    pub(crate) fn is_affine(&self) -> bool {
        (self.n_diodes == 0.0 || self.diode.a == 0.0)
            && self.bd.log == LogTerm::None
            && self.power.p == 0.0
    }

    /// The terms of g at ln i = `u`, i = `i`: (g, diode log part, breakdown log part, power
    /// term).
    #[inline]
    fn terms(&self, u: f32, i: f32) -> (f32, f32, f32, f32) {
        let d = if self.n_diodes > 0.0 {
            self.diode.log_part_u(u)
        } else {
            0.0
        };
        let z = self.bd.log_part_u(u);
        let pw = self.power.at_u(u);
        let g =
            self.c() + self.r_total() * i + self.n_diodes * self.diode.a * d + self.bd.a * z + pw;
        (g, d, z, pw)
    }

    /// g(i) for i > 0.
    #[inline]
    pub(crate) fn g(&self, i: f32) -> f32 {
        self.terms(math::ln(i), i).0
    }

    /// The clamp's voltage across the coil terminals (g minus the coil's own resistance and
    /// the supply term).
    #[inline]
    pub(crate) fn v_clamp(&self, i: f32) -> f32 {
        self.g(i) - self.r_coil * i - self.vs_term
    }

    /// Finds the steady current the loop settles at, given g(i₀) > 0: 0 when g stays positive
    /// down to i₀·e^(−48) (any root below is a residual current neglected as zero), else the
    /// root of g in ln i (bracketed Illinois, ≤ 60 steps, tolerance 1e-6 in ln i).
    pub(crate) fn find_floor(&self, i0: f32) -> f32 {
        if self.is_affine() {
            // Every affine topology has c > 0 (checked when it is built): no root.
            return 0.0;
        }
        let u0 = math::ln(i0);
        let u_low = u0 - MAX_SPAN;
        let g_u = |u: f32| self.terms(u, math::exp(u)).0;
        if g_u(u_low) > 0.0 {
            return 0.0;
        }
        match illinois(g_u, u_low, u0, 1e-6, 60) {
            // The root, nudged up to where g ≥ 0 so that every current above it decays.
            Some(u) => math::exp(u) * (1.0 + 1e-6),
            None => i0,
        }
    }

    /// True when the current reaches exactly zero in finite time (see the module docs).
    pub(crate) fn reaches_zero(&self) -> bool {
        self.floor == 0.0
            && (self.c() > 0.0
                || self.bd.log == LogTerm::Exact
                || (self.power.p > 0.0 && self.power.beta < 1.0 && self.c() >= 0.0))
    }

    /// s = ln(i − i_f) of a current above the floor (internal; one logarithm).
    #[inline]
    pub(crate) fn s_of(&self, i: f32) -> f32 {
        math::ln(i - self.floor)
    }

    /// Integrals from `i_hi` down to `i_lo` (floor < i_lo < i_hi, or i_lo = 0 when the decay
    /// reaches zero). The caller checks the span against [`MAX_SPAN`].
    pub(crate) fn integrate(&self, i_hi: f32, i_lo: f32) -> Integrals {
        if self.is_affine() {
            return self.integrate_between(i_hi, 0.0, i_lo, 0.0);
        }
        let s_lo = if i_lo > 0.0 { self.s_of(i_lo) } else { 0.0 };
        self.integrate_between(i_hi, self.s_of(i_hi), i_lo, s_lo)
    }

    /// [`LoopLaw::integrate`] with the s-values of the two ends already known (`s_lo` unused
    /// when `i_lo` = 0, both unused on an affine path), so a profile takes each logarithm once.
    pub(crate) fn integrate_between(
        &self,
        i_hi: f32,
        s_hi: f32,
        i_lo: f32,
        s_lo: f32,
    ) -> Integrals {
        if self.is_affine() {
            let [t, q, i2] = closed_form::integrals(self.l, self.c(), self.r_total(), i_hi, i_lo);
            return Integrals {
                t,
                q,
                i2,
                ..Integrals::default()
            };
        }
        if i_lo > 0.0 {
            return self.quadrature(s_lo, self.span(i_hi, i_lo, s_hi - s_lo));
        }
        let lower = i_hi.min(self.tail_at);
        let mut acc = if lower < i_hi {
            let s_lower = math::ln(lower);
            self.quadrature(s_lower, self.span(i_hi, lower, s_hi - s_lower))
        } else {
            Integrals::default()
        };
        acc += self.tail(lower);
        acc
    }

    /// The lowest current an integration from the start current `i0` may reach within
    /// [`MAX_SPAN`] (a comparison replaces a logarithm in every check).
    pub(crate) fn lowest_reachable(&self, i0: f32) -> f32 {
        self.floor + (i0 - self.floor) * math::exp(-MAX_SPAN)
    }

    /// 1/IS(T) for the fast form of the diode term, or 0 where it could overflow (see
    /// [`LoopLaw::inv_is`]).
    pub(crate) fn inverse_is(&self, i0: f32) -> f32 {
        let use_d = self.n_diodes > 0.0 && self.diode.a > 0.0;
        if use_d && math::ln(i0) - self.diode.ln_is < 85.0 {
            math::exp(-self.diode.ln_is)
        } else {
            0.0
        }
    }

    /// Number of panels for a span in s.
    fn panels(span: f32) -> u32 {
        let n = libm::ceilf(span / PANEL_WIDTH);
        if n < 1.0 {
            1
        } else if n > MAX_SPAN / PANEL_WIDTH + 1.0 {
            // Unreachable for a checked span; the cap keeps the work bounded regardless.
            (MAX_SPAN / PANEL_WIDTH) as u32 + 1
        } else {
            n as u32
        }
    }

    /// The span in s = ln(i − floor) from `i_lo` up to `i_hi` (> `i_lo`), to full relative
    /// accuracy even for two close currents: ln(1 + (i_hi − i_lo)/(i_lo − floor)), where the
    /// difference of two currents is exact (Sterbenz) and the difference of two rounded
    /// logarithms is not (for currents 1 ppm apart it would carry a few per cent of error).
    /// `diff` is that difference of logarithms, used where the currents are far apart.
    fn span(&self, i_hi: f32, i_lo: f32, diff: f32) -> f32 {
        let ratio = (i_hi - i_lo) / (i_lo - self.floor);
        if ratio > 0.0 && ratio < 1.0 {
            math::ln_1p(ratio)
        } else {
            diff
        }
    }

    /// Composite Gauss–Legendre over s from `s_lo` to `s_lo + span` (span > 0).
    ///
    /// Per node: one ln(1 + i/IS) for a diode law, one logarithm only when a steady current
    /// shifts the variable, one exponential for a power law. The current e = exp(s) at the four
    /// nodes of a panel comes from one exponential at its middle times e^(±h·x/2) (the nodes are
    /// symmetric: two exponentials per call), which adds at most two roundings to each node's
    /// current. The loop-invariant sums are taken once.
    pub(crate) fn quadrature(&self, s_lo: f32, span: f32) -> Integrals {
        let n = Self::panels(span);
        let h = span / n as f32;
        let half = 0.5 * h;
        // Node offsets ±h·x/2 and their exponentials, and the weights with L and h/2 folded in.
        let (x_out, x_in) = (half * GL_OUTER.0, half * GL_INNER.0);
        let (e_out, e_in) = (math::exp(x_out), math::exp(x_in));
        let (w_out, w_in) = (self.l * half * GL_OUTER.1, self.l * half * GL_INNER.1);
        let nodes = [
            (-x_out, 1.0 / e_out, w_out),
            (-x_in, 1.0 / e_in, w_in),
            (x_in, e_in, w_in),
            (x_out, e_out, w_out),
        ];
        let f = self.floor;
        let c = self.c();
        let r = self.r_total();
        let use_d = self.n_diodes > 0.0 && self.diode.a > 0.0;
        let na = self.n_diodes * self.diode.a;
        let use_p = self.power.p > 0.0;
        let mut acc = Integrals::default();
        for p in 0..n {
            let mid = s_lo + (p as f32 + 0.5) * h;
            let e_mid = math::exp(mid);
            for &(dx, scale, lw) in &nodes {
                let e = e_mid * scale;
                let i = f + e;
                // ln i: s itself without a steady current (no logarithm per node).
                let u = if f > 0.0 { math::ln(i) } else { mid + dx };
                let d = if !use_d {
                    0.0
                } else if self.inv_is > 0.0 {
                    math::ln_1p(i * self.inv_is)
                } else {
                    math::ln_1p_exp(u - self.diode.ln_is)
                };
                let z = self.bd.log_part_u(u);
                let pw = if use_p { self.power.at_u(u) } else { 0.0 };
                let g = c + r * i + na * d + self.bd.a * z + pw;
                // dt = L·(i − i_f)/g(i)·ds; the weight carries L and the panel's half-width.
                let dt = lw * e / g;
                let dq = dt * i;
                acc.t += dt;
                acc.q += dq;
                acc.i2 += dq * i;
                acc.d_log += dq * d;
                acc.z_log += dq * z;
                acc.pw += dq * pw;
            }
        }
        acc
    }

    /// The decay from `lower` to zero, in closed form with g taken as g(lower)·(i/lower)^γ
    /// (γ from g at lower and lower/2, 0 ≤ γ < 1; γ ≈ 0 for a constant-dominated g, 1/α for a
    /// varistor). Used only for the last 1e-6 of the start current.
    pub(crate) fn tail(&self, lower: f32) -> Integrals {
        let g_l = self.g(lower);
        let g_h = self.g(0.5 * lower);
        let gamma = if g_h > 0.0 && g_l > g_h {
            (math::ln(g_l / g_h) * core::f32::consts::LOG2_E).clamp(0.0, 0.99)
        } else {
            0.0
        };
        let k = self.l / g_l;
        let t = k * lower / (1.0 - gamma);
        let q = k * lower * lower / (2.0 - gamma);
        let i2 = k * lower * lower * lower / (3.0 - gamma);
        // The device terms at `lower` times the charge: upper bounds of tiny numbers.
        let u = math::ln(lower);
        let (_, d, z, pw) = self.terms(u, lower);
        Integrals {
            t,
            q,
            i2,
            d_log: d * q,
            z_log: z * q,
            pw: pw * q,
        }
    }
}
