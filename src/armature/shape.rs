//! L against the gap from a measured table: the shape of the fall from L_seat to L_open,
//! interpolated by a monotone cubic.
//!
//! # Model
//!
//! A table of (gap x_k, inductance L_k), x from 0 (seated) up to the stroke, L strictly
//! falling, is kept as its shape h(u) = (L(u·s) − L_open)/(L_seat − L_open) over the relative
//! gap u = x/s: h(0) = 1, h(1) = 0. With the shape, the armature's inductance is
//! L(x) = L_open + (L_seat − L_open)·h(x/s), so L_seat and L_open keep their meaning (and their
//! tolerances) whether the law or a table gives the shape, and a stroke tolerance stretches the
//! table with the stroke.
//!
//! Between the points h is a monotone piecewise-cubic Hermite interpolant (F. N. Fritsch,
//! R. E. Carlson, "Monotone Piecewise Cubic Interpolation", SIAM J. Numer. Anal. 17 (1980)
//! 238–246; the tangents as the shape-preserving "pchip" computes them; both from memory): it
//! passes through every point and falls monotonically between them (α² + β² ≤ 9 on every
//! interval). Its slope is continuous, so the force ½·i²·|dL/dx| has no steps for the
//! integrator to trip on.
//!
//! Memory: [`MAX_POINTS`] points of three f32 each; work per evaluation: a scan of at most
//! [`MAX_POINTS`] points and one cubic.

use crate::error::{self, Error, Reason};

/// The most points a table may have.
pub const MAX_POINTS: usize = 12;

/// The normalised shape of a table of L against the gap (see the module docs). Built only by
/// [`GapShape::from_table`], so every shape is valid.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct GapShape {
    len: u8,
    /// Relative gaps, 0 … 1, strictly increasing.
    u: [f32; MAX_POINTS],
    /// Shape values, 1 … 0, strictly falling.
    h: [f32; MAX_POINTS],
    /// Tangents dh/du at the points (≤ 0).
    m: [f32; MAX_POINTS],
}

/// A table's ends, as the armature takes them.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TableEnds {
    /// L at the first point (gap 0), H.
    pub seat_h: f32,
    /// L at the last point, H.
    pub open_h: f32,
    /// The last point's gap, m: the stroke the table was measured over.
    pub stroke_m: f32,
}

impl GapShape {
    /// The shape of `points` (gap in m, L in H): 2 … [`MAX_POINTS`] points, the first at gap 0,
    /// gaps strictly increasing, L finite, positive and strictly falling. Returns the shape and
    /// the table's ends (the armature's L_seat, L_open and stroke).
    ///
    /// # Errors
    /// Too few or too many points → [`Reason::OutsideValidatedRange`] on `"inductance table"`;
    /// a non-finite or non-positive L, a negative or non-finite gap → [`Reason::NotFinite`],
    /// [`Reason::NotPositive`] or [`Reason::Negative`] on `"table inductance"` / `"table gap"`; a first gap other than
    /// 0, gaps not increasing or L not falling → [`Reason::NotIncreasing`] on
    /// `"inductance table"`.
    ///
    /// ```
    /// use kickguard::armature::shape::GapShape;
    /// let (shape, ends) = GapShape::from_table(&[(0.0, 0.35), (0.4e-3, 0.26), (0.8e-3, 0.22)])?;
    /// assert_eq!((ends.seat_h, ends.open_h), (0.35, 0.22));
    /// assert!((shape.value(0.5) - (0.26 - 0.22) / (0.35 - 0.22)).abs() < 1e-6);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn from_table(points: &[(f32, f32)]) -> Result<(GapShape, TableEnds), Error> {
        let n = points.len();
        if !(2..=MAX_POINTS).contains(&n) {
            return Err(Error::new(
                "inductance table",
                Reason::OutsideValidatedRange,
            ));
        }
        for &(x, l) in points {
            error::non_negative("table gap", x)?;
            error::positive("table inductance", l)?;
        }
        let (Some(&first), Some(&last)) = (points.first(), points.last()) else {
            return Err(Error::new(
                "inductance table",
                Reason::OutsideValidatedRange,
            ));
        };
        let (stroke, span) = (last.0, first.1 - last.1);
        let mut s = GapShape {
            len: n as u8,
            u: [0.0; MAX_POINTS],
            h: [0.0; MAX_POINTS],
            m: [0.0; MAX_POINTS],
        };
        // x/x and (L − L_last)/(L_first − L_last) are exactly 1 and 0 at the ends (IEEE).
        for ((u, h), &(x, l)) in s.u.iter_mut().zip(s.h.iter_mut()).zip(points) {
            *u = x / stroke;
            *h = (l - last.1) / span;
        }
        // Ordered after the normalisation too (points closer than f32 resolves are refused).
        let ordered = s.u[..].windows(2).zip(s.h[..].windows(2)).take(n - 1).all(|p| {
            matches!(p, ([u0, u1], [h0, h1]) if u1 > u0 && h1 < h0 && u1.is_finite() && h0.is_finite())
        });
        let raw = points
            .windows(2)
            .all(|w| matches!(w, [(x0, l0), (x1, l1)] if x1 > x0 && l1 < l0));
        if first.0 != 0.0 || !ordered || !raw {
            return Err(Error::new("inductance table", Reason::NotIncreasing));
        }
        s.tangents();
        let ends = TableEnds {
            seat_h: first.1,
            open_h: last.1,
            stroke_m: stroke,
        };
        Ok((s, ends))
    }

    /// The tangents of the monotone cubic, as the shape-preserving piecewise-cubic Hermite
    /// interpolant computes them (Fritsch & Butland's weighted harmonic mean of the secants
    /// inside, a three-point one-sided formula at the ends, each limited so that the cubic
    /// stays monotonic: C. Moler, *Numerical Computing with MATLAB*, §3.4 "pchip"; from
    /// memory), then the Fritsch–Carlson bound α² + β² ≤ 9 per interval as a last guard.
    fn tangents(&mut self) {
        let n = usize::from(self.len).min(MAX_POINTS);
        let mut d = [0.0f32; MAX_POINTS];
        let mut w = [0.0f32; MAX_POINTS];
        for ((dk, wk), (u, h)) in d
            .iter_mut()
            .zip(w.iter_mut())
            .zip(self.u.windows(2).zip(self.h.windows(2)))
            .take(n.saturating_sub(1))
        {
            if let ([u0, u1], [h0, h1]) = (u, h) {
                *wk = u1 - u0;
                *dk = (h1 - h0) / *wk;
            }
        }
        // Inside: all secants fall (the table is checked), so the harmonic mean applies.
        for (mk, (dd, ww)) in self
            .m
            .iter_mut()
            .skip(1)
            .zip(d.windows(2).zip(w.windows(2)))
            .take(n.saturating_sub(2))
        {
            if let ([d0, d1], [w0, w1]) = (dd, ww) {
                let (a, b) = (2.0 * w1 + w0, w1 + 2.0 * w0);
                *mk = (a + b) / (a / d0 + b / d1);
            }
        }
        self.m[0] = end_tangent(w[0], w[1], d[0], d[1], n);
        let last = n.saturating_sub(1);
        let at = |a: &[f32; MAX_POINTS], j: usize| a.get(j).copied().unwrap_or(0.0);
        let m_last = end_tangent(
            at(&w, last.saturating_sub(1)),
            at(&w, last.saturating_sub(2)),
            at(&d, last.saturating_sub(1)),
            at(&d, last.saturating_sub(2)),
            n,
        );
        if let Some(ml) = self.m.get_mut(last) {
            *ml = m_last;
        }
        for k in 0..n.saturating_sub(1) {
            let (Some(&dk), Some(&m0), Some(&m1)) = (d.get(k), self.m.get(k), self.m.get(k + 1))
            else {
                break;
            };
            let (a, b) = (m0 / dk, m1 / dk);
            let r = a * a + b * b;
            if r > 9.0 {
                let t = 3.0 / crate::math::sqrt(r);
                if let Some(x) = self.m.get_mut(k) {
                    *x = t * a * dk;
                }
                if let Some(x) = self.m.get_mut(k + 1) {
                    *x = t * b * dk;
                }
            }
        }
    }

    /// The interval of u (clipped to 0 … 1): (u at its ends, h at its ends, tangents at its
    /// ends, position t in it, its width).
    fn locate(&self, u: f32) -> ([f32; 2], [f32; 2], [f32; 2], f32, f32) {
        let n = usize::from(self.len).min(MAX_POINTS);
        // Not `f32::clamp`: a NaN must land inside too (min/max return the number).
        #[allow(clippy::manual_clamp)]
        let u = u.min(1.0).max(0.0);
        let mut k = 0;
        while k + 2 < n && self.u.get(k + 1).is_some_and(|&x| u > x) {
            k += 1;
        }
        let at = |a: &[f32; MAX_POINTS], j: usize| a.get(j).copied().unwrap_or(0.0);
        let (u0, u1) = (at(&self.u, k), at(&self.u, k + 1));
        let du = u1 - u0;
        (
            [u0, u1],
            [at(&self.h, k), at(&self.h, k + 1)],
            [at(&self.m, k), at(&self.m, k + 1)],
            (u - u0) / du,
            du,
        )
    }

    /// h(u), 1 at the seat … 0 open (u clipped to 0 … 1; a NaN reads as 1).
    pub fn value(&self, u: f32) -> f32 {
        let (_, [h0, h1], [m0, m1], t, du) = self.locate(u);
        let (t2, t3) = (t * t, t * t * t);
        (2.0 * t3 - 3.0 * t2 + 1.0) * h0
            + (t3 - 2.0 * t2 + t) * du * m0
            + (-2.0 * t3 + 3.0 * t2) * h1
            + (t3 - t2) * du * m1
    }

    /// −dh/du (≥ 0) at u (clipped to 0 … 1).
    pub fn fall_rate(&self, u: f32) -> f32 {
        let (_, [h0, h1], [m0, m1], t, du) = self.locate(u);
        let t2 = t * t;
        let dh = ((6.0 * t2 - 6.0 * t) * h0
            + (3.0 * t2 - 4.0 * t + 1.0) * du * m0
            + (-6.0 * t2 + 6.0 * t) * h1
            + (3.0 * t2 - 2.0 * t) * du * m1)
            / du;
        (-dh).max(0.0)
    }
}

/// The end tangent from the end interval (width `w0`, secant `d0`) and its neighbour (`w1`,
/// `d1`): ((2·w0 + w1)·d0 − w0·d1)/(w0 + w1), set to 0 if it turns against d0 and limited to
/// 3·d0 (pchip's end condition); the secant itself with only two points.
fn end_tangent(w0: f32, w1: f32, d0: f32, d1: f32, n: usize) -> f32 {
    if n < 3 {
        return d0;
    }
    let m = ((2.0 * w0 + w1) * d0 - w0 * d1) / (w0 + w1);
    if m * d0 <= 0.0 {
        0.0
    } else if m.abs() > 3.0 * d0.abs() {
        3.0 * d0
    } else {
        m
    }
}
