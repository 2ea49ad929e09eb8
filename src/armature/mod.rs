//! The moving armature: a coil whose inductance depends on the air gap, pulled shut by the
//! magnetic force against a spring, a load and damping, and what its motion does to the coil
//! current — the dip at pull-in and the bump at release that tell the firmware whether the
//! armature really moved.
//!
//! # Model
//!
//! - **Gap and inductance.** x is the air gap: 0 with the armature on its seat (closed), the
//!   stroke s when fully open. The air-gap law L(x) = L∞ + (L_seat − L∞)·g₀/(g₀ + x) (a
//!   reluctance in series with the gap: the gap's reluctance grows linearly with x), given by
//!   L_seat = L(0), L_open = L(s) and the fringing length g₀, which fix
//!   L∞ = (L_open·(g₀ + s) − L_seat·g₀)/s. Linear magnetics (no saturation): λ = L(x)·i.
//! - **Force.** From the co-energy W′ = ½·L(x)·i² at constant current (textbook
//!   electromechanics, e.g. Fitzgerald & Kingsley, *Electric Machinery*, ch. 3; from memory):
//!   F_x = ∂W′/∂x = ½·i²·dL/dx, with dL/dx = −(L_seat − L∞)·g₀/(g₀ + x)² < 0 — a pull toward the
//!   seat of ½·i²·|dL/dx|.
//! - **Mechanics** (positive = opening): m·ẍ = F_spring + F_load − ½·i²·|dL/dx| − c·ẋ, with the
//!   spring F_spring = F₀ + k·(s − x) (its preload F₀ at the open position, compressed further
//!   as the armature closes) and a constant load F_load (pressure or gravity holding the valve
//!   open; negative if it helps close). End stops at x = 0 and x = s are **inelastic**: the
//!   armature stops dead there (its kinetic energy is lost in the impact, counted) and stays
//!   until the net force pulls it away.
//! - **Electrical loop.** Driven: V = R·i + dλ/dt. Switched off: dλ/dt = −g(i), the loop law of
//!   any clamp the decay engine has ([`crate::clamp::SwitchOff::loop_voltage_at`]: the coil's
//!   R·i, the clamp's voltage, less the supply for a clamp across the switch).
//!
//! The state (λ, x, v) is integrated by [`motion`] with an embedded Runge–Kutta pair and event
//! location (the armature starting to move, reaching a stop, the current's turning points);
//! [`sizing`] and [`release_sizing`] search the corners of the tolerances at pull-in and at
//! release and size the detector; [`detect`] finds the dip or the bump in ADC samples at run
//! time, integer only.

pub mod detect;
pub mod motion;
pub mod release_sizing;
pub mod shape;
pub mod sizing;

use crate::error::{self, Error, Reason};
use crate::units::Henries;
pub use shape::GapShape;

/// The inductance against the gap: the air-gap law L(x) = L∞ + (L_seat − L∞)·g₀/(g₀ + x), or,
/// with a [`GapShape`] from a measured table, L(x) = L_open + (L_seat − L_open)·h(x/s).
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct GapInductance {
    /// Inductance with the armature seated (x = 0).
    pub seat: Henries,
    /// Inductance with the armature fully open (x = stroke); ≤ `seat`.
    pub open: Henries,
    /// The fringing length g₀, m (> 0): the gap at which the gap-dependent part has halved
    /// (the law's; unused, though still checked, when `shape` is given).
    pub g0_m: f32,
    /// The shape of a measured table of L against the gap (None: the air-gap law). The table's
    /// ends give `seat` and `open` ([`shape::TableEnds`]); its gaps stretch with the stroke.
    pub shape: Option<GapShape>,
}

/// The armature's mechanics. Every field in SI units.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Armature {
    /// Moving mass, kg (> 0).
    pub mass_kg: f32,
    /// Stroke s, m (≥ 0; 0: the armature cannot move).
    pub stroke_m: f32,
    /// Spring force at the open position, N (≥ 0), pushing open.
    pub preload_n: f32,
    /// Spring rate, N/m (≥ 0).
    pub spring_n_per_m: f32,
    /// Constant load force, N, pushing open (negative: helping close).
    pub load_n: f32,
    /// Viscous damping, N·s/m (≥ 0).
    pub damping_n_s_per_m: f32,
    /// The inductance against the gap.
    pub inductance: GapInductance,
}

/// The largest stroke and fringing length the model takes, m (1 m: far beyond any coil).
pub const MAX_LENGTH_M: f32 = 1.0;

/// x limited to 0 … s (`f32::clamp` would carry a panic path for an unchecked s; a NaN reads
/// as 0).
fn gap(x: f32, s: f32) -> f32 {
    x.min(s).max(0.0)
}

impl Armature {
    /// Checks every field.
    ///
    /// # Errors
    /// A non-finite field → [`Reason::NotFinite`] naming it; `mass` or `g0` ≤ 0 →
    /// [`Reason::NotPositive`]; a negative stroke, preload, spring rate or damping →
    /// [`Reason::Negative`]; a stroke or g₀ above [`MAX_LENGTH_M`] →
    /// [`Reason::OutsideValidatedRange`]; `open inductance` above `seat inductance` →
    /// [`Reason::Inconsistent`] on `"open inductance"`.
    pub fn validate(&self) -> Result<(), Error> {
        error::positive("mass", self.mass_kg)?;
        error::within("stroke", self.stroke_m, 0.0, MAX_LENGTH_M)?;
        error::non_negative("spring preload", self.preload_n)?;
        error::non_negative("spring rate", self.spring_n_per_m)?;
        error::finite("load force", self.load_n)?;
        error::non_negative("damping", self.damping_n_s_per_m)?;
        let g0 = error::positive("g0", self.inductance.g0_m)?;
        error::within("g0", g0, 0.0, MAX_LENGTH_M)?;
        if !(self.inductance.open <= self.inductance.seat) {
            return Err(Error::new("open inductance", Reason::Inconsistent));
        }
        Ok(())
    }

    /// L∞ of the law, H (may be negative: only 0 … s is used, where L stays ≥ L_open > 0).
    fn l_inf(&self) -> f32 {
        let (ls, lo) = (self.inductance.seat.value(), self.inductance.open.value());
        let (g0, s) = (self.inductance.g0_m, self.stroke_m);
        if !(s > 0.0) {
            return lo;
        }
        (lo * (g0 + s) - ls * g0) / s
    }

    /// L(x), H, for a gap x in 0 … s (clipped to it).
    pub fn inductance_at(&self, x_m: f32) -> f32 {
        let x = gap(x_m, self.stroke_m);
        if let Some(h) = &self.inductance.shape {
            let (ls, lo) = (self.inductance.seat.value(), self.inductance.open.value());
            let u = if self.stroke_m > 0.0 {
                x / self.stroke_m
            } else {
                0.0
            };
            return lo + (ls - lo) * h.value(u);
        }
        let l_inf = self.l_inf();
        let g0 = self.inductance.g0_m;
        l_inf + (self.inductance.seat.value() - l_inf) * g0 / (g0 + x)
    }

    /// |dL/dx|, H/m, at a gap x in 0 … s (clipped to it): with a table's shape,
    /// (L_seat − L_open)·|h′(x/s)|/s (0 for a zero stroke).
    pub fn inductance_slope_at(&self, x_m: f32) -> f32 {
        let x = gap(x_m, self.stroke_m);
        if let Some(h) = &self.inductance.shape {
            let (ls, lo) = (self.inductance.seat.value(), self.inductance.open.value());
            if !(self.stroke_m > 0.0) {
                return 0.0;
            }
            return (ls - lo) * h.fall_rate(x / self.stroke_m) / self.stroke_m;
        }
        let g0 = self.inductance.g0_m;
        (self.inductance.seat.value() - self.l_inf()) * g0 / ((g0 + x) * (g0 + x))
    }

    /// The magnetic pull toward the seat, N: ½·i²·|dL/dx| at gap x (co-energy at constant
    /// current).
    pub fn magnetic_force(&self, i_a: f32, x_m: f32) -> f32 {
        0.5 * i_a * i_a * self.inductance_slope_at(x_m)
    }

    /// The forces pushing open at gap x, N: spring F₀ + k·(s − x) plus the load.
    pub fn opening_force(&self, x_m: f32) -> f32 {
        let x = gap(x_m, self.stroke_m);
        self.preload_n + self.spring_n_per_m * (self.stroke_m - x) + self.load_n
    }

    /// The current at which the magnetic pull at gap x equals the opening force there, A:
    /// i = √(2·F_open(x)/|dL/dx|) — at x = s the static pull-in current, at x = 0 the current
    /// below which a seated armature lets go. 0 when nothing holds it open (closed) there;
    /// None when no current pulls it (L_open = L_seat or a zero stroke).
    pub fn balance_current(&self, x_m: f32) -> Option<f32> {
        let slope = self.inductance_slope_at(x_m);
        if !(self.stroke_m > 0.0) || !(slope > 0.0) {
            return None;
        }
        let f = self.opening_force(x_m).max(0.0);
        let i = crate::math::sqrt(2.0 * f / slope);
        i.is_finite().then_some(i)
    }
}
