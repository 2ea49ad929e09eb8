#![doc = include_str!("../README.md")]
#![no_std]
#![forbid(unsafe_code)]
#![deny(missing_docs)]
#![warn(
    clippy::float_cmp_const,
    clippy::indexing_slicing,
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::panic,
    clippy::missing_errors_doc
)]
// Guards are written `if !(x > 0.0)` on purpose: that form is also true for NaN.
#![allow(clippy::neg_cmp_op_on_partial_ord)]
#![cfg_attr(test, allow(clippy::unwrap_used, clippy::indexing_slicing))]

//! # Tour, in the order the data flows
//!
//! 1. [`units`]: typed quantities ([`Volts`], [`Amps`], [`Ohms`], [`Henries`], [`Seconds`],
//!    [`Joules`], [`Watts`], [`Farads`], [`Coulombs`], a [`Temperature`] point and a
//!    [`TempDelta`] interval) and [`physics`] constants.
//! 2. Device models: [`diode`] (forward drop over temperature, its inverse, fitting), [`coil`]
//!    (L, R(T), winding temperature, pull-in margin) and [`breakdown`] (zener, TVS, avalanche).
//!    [`varistor`] is the power-law clamp device.
//! 3. Circuit behaviour: [`clamp`] (the decay after switch-off for every suppression topology,
//!    low side or high side: times to any currents in one pass, charge, energy per device, peak
//!    switch and output voltages, samples for plots, zener sizing) and [`rating`] (single-pulse
//!    energy, average power, junction temperature, repetition rate).
//! 4. Input protection: [`input`] (a pin's clamp diodes fed through a series resistor: injection,
//!    the resistor window, rail back-powering on and off, an external clamp, a whole board).
//! 5. Timing: [`timing`] (release time, off-time, reversal wait, repetition rate, timer ticks) and
//!    [`pwm`] (peak-and-hold: pull-in time, hold duty, exact ripple, freewheel power, hysteretic).
//! 6. Diagnosis: [`diagnosis`] (healthy and fault windows of a measured decay over the tolerances,
//!    their separability, an integer-only run-time verdict, a history of verdicts, a
//!    least-squares fit of τ and the clamp voltage, an `embedded-hal` flyback timer).
//! 7. The configuration step (feature `host`, std): [`host`](crate#features) reads a design file,
//!    checks it over its corners, sizes open values and writes a report, plots and constants.
//! 8. Errors: every fallible call returns [`Error`], naming the input and the [`Reason`].

// The host tool needs std; the no_std build never sees it.
#[cfg(feature = "host")]
extern crate std;

pub mod armature;
pub mod breakdown;
pub mod clamp;
pub mod coil;
pub mod diagnosis;
pub mod diode;
pub mod error;
#[cfg(feature = "micromath")]
pub mod fast;
#[cfg(feature = "host")]
pub mod host;
pub mod input;
mod math;
pub mod physics;
pub mod pwm;
pub mod rating;
pub mod slots;
mod solve;
pub mod supply;
pub mod timing;
pub mod units;
pub mod varistor;

pub use error::{Error, Reason};
pub use units::{
    Amps, Coulombs, Duty, Farads, Henries, Hertz, Joules, Ohms, PerKelvin, Seconds, TempDelta,
    Temperature, Volts, Watts,
};
