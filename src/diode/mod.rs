//! Diode model: forward drop, its inverse, leakage and fitting, over temperature.
//!
//! Read in this order:
//! 1. [`params`]: the SPICE-class parameters (IS, N, RS, EG, XTI, TNOM) with their own types
//!    ([`Ideality`], [`BandGap`], [`Xti`]), the generic [`DiodeParams::SILICON`] and
//!    [`DiodeParams::SCHOTTKY`] presets, and [`Diode`]: a diode in a circuit, by its law or a
//!    fixed drop.
//! 2. [`forward`]: the Shockley equation with series resistance and the SPICE2 temperature law
//!    for IS: [`DiodeParams::forward_drop`], [`DiodeParams::saturation_current`],
//!    [`DiodeParams::forward_tempco_v_per_k`], [`DiodeParams::reverse_leakage`].
//! 3. [`series`]: the current through a diode and a resistance in series
//!    ([`DiodeParams::series_current`]), the input-clamp case.
//! 4. [`thermometer`]: the junction temperature from a measured drop
//!    ([`DiodeParams::junction_temperature`]).
//! 5. [`fit`]: parameters from datasheet points ([`fit_two_points`], [`fit_three_points`],
//!    [`DiodeParams::with_eg_from_point`], [`DiodeParams::with_eg_from_tempco`]).
//!
//! Every function validates its arguments and returns [`crate::Error`] naming the bad one; the
//! parameters themselves are validated once, at construction.

pub mod fit;
pub mod forward;
pub mod params;
pub mod series;
pub mod thermometer;

pub use fit::{fit_three_points, fit_two_points, DropPoint, FIT_PASSES, FIT_TOLERANCE_V};
pub use params::{BandGap, Diode, DiodeParams, Ideality, Xti, T_MAX_K, T_MIN_K};
