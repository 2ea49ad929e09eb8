//! Diagnosis from a measured decay: is the suppression healthy, has the freewheeling diode gone
//! open, is the zener shorted, the coil open, turns shorted, the winding too hot?
//!
//! Two halves, as in the rest of the crate:
//!
//! - **Configuration time** ([`windows`]): from a design and its tolerances ([`Design`]), the
//!   window of measurements a healthy circuit can show and the window of each fault, found by
//!   evaluating the clamp engine at every corner of the tolerances; whether the windows can be
//!   told apart at all, with the gap; and the windows in timer ticks, per temperature band.
//! - **Measurement sizing** ([`propose`]): the drain comparator a healthy switch-off never
//!   trips and an open clamp always does, and the slowest timer that still sees it;
//!   [`compensate`] narrows the windows with the measured supply and on-current; [`ticks`]
//!   says in ticks what each measurement tells apart.
//! - **Run time** ([`classify`]): the verdict on a measured tick count is integer comparisons
//!   against those windows (no floating point, so it runs in an interrupt on a core without an
//!   FPU); [`history`] requires N consecutive faults before the firmware acts; [`fit`] estimates
//!   τ and the clamp voltage from a buffer of current samples; [`learn`] learns one unit's own
//!   healthy window at fixed conditions, [`mod@unit`] one unit's inductance wherever it runs;
//!   [`hal`] times the flyback with an output pin, a sense input and a delay (`embedded-hal`
//!   1.0).
//!
//! Fault models (each replaces one part of the healthy circuit, all else equal):
//!
//! | condition | model |
//! |---|---|
//! | clamp path open (freewheeling diode, zener or TVS) | the switch avalanches at its breakdown |
//! | zener shorted | a zener + diode clamp becomes a plain freewheeling diode: slower |
//! | coil open | no current, nothing to measure: a zero reading |
//! | shorted turns | a fraction f of the turns shorted: L·(1 − f)², R·(1 − f) |
//! | coil too hot | the winding above its allowed temperature (R higher, current lower) |
//!
//! The on-current also tells the winding's temperature directly: see
//! [`windows::winding_temperature_from_current`].

pub mod classify;
pub mod compensate;
pub mod fit;
pub mod hal;
#[cfg(feature = "async")]
pub mod hal_async;
pub mod history;
pub mod learn;
pub mod propose;
pub mod ticks;
pub mod unit;
pub mod windows;

pub use classify::{Candidates, Verdict, Windows};
pub use windows::{Design, Measurement, ShortedTurns, Timing};

/// What state of the circuit a measurement window belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Condition {
    /// Everything as designed, within tolerances.
    Healthy,
    /// The clamp path has failed open: the freewheeling diode, or the zener or TVS (in a zener +
    /// diode clamp either part opening breaks the same series path; a TVS alone is the path),
    /// so the switch avalanches.
    ClampOpen,
    /// The zener of a zener + diode clamp has failed short.
    ZenerShorted,
    /// The coil winding is open: no current.
    CoilOpen,
    /// Part of the winding is shorted.
    ShortedTurns,
    /// The winding is hotter than allowed.
    CoilTooHot,
    /// The armature did not move at switch-on (a valve stuck shut by dirt, ice or missing
    /// pressure; a relay that does not pull in): seen by the armature's dip detector
    /// ([`crate::armature::detect`], [`crate::armature::detect::Motion::as_verdict`]), not by the
    /// flyback windows.
    ArmatureStuckOpen,
    /// The armature did not leave its seat at switch-off (a welded contact, residual
    /// magnetism, a jammed plunger): seen by the release detector, not by the flyback windows.
    ArmatureStuckClosed,
}

impl Condition {
    /// The condition's code in generated tables (0 healthy, 1 clamp path open, 2 zener shorted,
    /// 3 coil open, 4 shorted turns, 5 coil too hot, 6 armature stuck open, 7 armature stuck
    /// closed).
    pub const fn code(self) -> u32 {
        match self {
            Condition::Healthy => 0,
            Condition::ClampOpen => 1,
            Condition::ZenerShorted => 2,
            Condition::CoilOpen => 3,
            Condition::ShortedTurns => 4,
            Condition::CoilTooHot => 5,
            Condition::ArmatureStuckOpen => 6,
            Condition::ArmatureStuckClosed => 7,
        }
    }

    /// The condition of a code from a generated table, if the code is known.
    pub const fn from_code(code: u32) -> Option<Condition> {
        Some(match code {
            0 => Condition::Healthy,
            1 => Condition::ClampOpen,
            2 => Condition::ZenerShorted,
            3 => Condition::CoilOpen,
            4 => Condition::ShortedTurns,
            5 => Condition::CoilTooHot,
            6 => Condition::ArmatureStuckOpen,
            7 => Condition::ArmatureStuckClosed,
            _ => return None,
        })
    }

    /// The conditions the flyback windows separate, healthy first (the armature's two are
    /// judged by the armature's detectors: [`Condition::ARMATURE`]).
    pub const ALL: [Condition; 6] = [
        Condition::Healthy,
        Condition::ClampOpen,
        Condition::ZenerShorted,
        Condition::CoilOpen,
        Condition::ShortedTurns,
        Condition::CoilTooHot,
    ];

    /// The armature's conditions, judged from the coil current by [`crate::armature::detect`].
    pub const ARMATURE: [Condition; 2] =
        [Condition::ArmatureStuckOpen, Condition::ArmatureStuckClosed];
}
