//! Did the armature move? The run-time detector of the current's dip at pull-in (or its bump at
//! release) in ADC samples: integer only, fixed memory, constant work per sample.
//!
//! # Method
//!
//! A stuck armature gives a plain RL rise (or fall): monotonic. A moving one makes the current
//! turn: at pull-in a peak, then a valley, then the climb on to V/R; at release a valley, then
//! a bump. The detector follows the running extreme with hysteresis in counts:
//!
//! - **Rising** (for a release, everything mirrored): the running maximum. A sample
//!   `hysteresis` counts below it confirms a peak (once the signal has risen `rise` counts
//!   above its first sample: the drive really started).
//! - **Falling**: the running minimum after that peak. A sample `hysteresis` counts above it
//!   confirms a valley; the dip is peak − valley. A dip of at least `min_dip` is
//!   [`Motion::Moved`]; a smaller one is noise: back to Rising (more than
//!   [`MAX_WIGGLES`] such wiggles → [`Motion::Unclear`] with [`Unclear::Noisy`]).
//! - After `window` samples with no motion found: [`Motion::NotMoved`] if the signal rose at
//!   least `rise` counts, else [`Motion::Unclear`] ([`Unclear::NoRise`]). A sample at or above
//!   `full_scale` is [`Unclear::Saturated`] (the dip may be hidden).
//!
//! # Why a stuck armature is never called moved
//!
//! If the true current is monotonic and each sample is within ±n counts of it (noise and
//! quantisation together), a sample can fall below an earlier one by at most 2n. With
//! `hysteresis` > 2n no peak is ever confirmed on a monotonic signal, so no dip is ever seen.
//! The configuration step chooses `hysteresis` above the stated noise and `min_dip` below the
//! smallest sampled dip over the tolerances less 2n: then a moving armature is always seen
//! (if the climb after the valley also exceeds `hysteresis` + 2n within the window).
//!
//! Work: constant per sample (a dozen comparisons); memory: this struct (40 bytes on a 64-bit
//! host).

use crate::diagnosis::{Condition, Verdict};

/// Sub-threshold wiggles (a confirmed peak and valley with a dip below `min_dip`) tolerated
/// before the signal is called too noisy.
pub const MAX_WIGGLES: u8 = 2;

/// Which way the signal goes when nothing moves.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Polarity {
    /// Pull-in: the current rises; motion shows as a dip.
    Rising,
    /// Release: the current falls; motion shows as a bump.
    Falling,
}

/// The detector's thresholds, in ADC counts and samples (from the configuration step).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DipConfig {
    /// Pull-in or release.
    pub polarity: Polarity,
    /// How far the signal must move from its first sample before a turn counts (the drive
    /// really started), counts.
    pub rise: u16,
    /// The turn a peak or valley needs to be confirmed, counts: above twice the noise.
    pub hysteresis: u16,
    /// The smallest dip (or bump) that means motion, counts: ≥ `hysteresis`.
    pub min_dip: u16,
    /// Samples after which, without motion, the verdict is given.
    pub window: u32,
    /// A sample at or above this is saturated, counts.
    pub full_scale: u16,
}

/// Why the detector cannot say.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Unclear {
    /// A sample at or above full scale.
    Saturated,
    /// The signal never moved `rise` counts from its first sample (no drive, an open coil).
    NoRise,
    /// More than [`MAX_WIGGLES`] turns too small to be motion: noise above the stated bound.
    Noisy,
    /// The samples ended before the window.
    TooFewSamples,
    /// The configuration contradicts itself (`min_dip` below `hysteresis`, a zero window).
    BadConfig,
}

/// The verdict.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Motion {
    /// The armature moved: the valley (pull-in) or the bump's top (release) at sample `at`,
    /// the dip or bump `dip` counts deep.
    Moved {
        /// Sample index of the valley (or the bump's top).
        at: u32,
        /// Peak − valley (or bump top − valley), counts.
        dip: u16,
    },
    /// A plain rise (or fall) through the window: the armature did not move.
    NotMoved,
    /// No verdict can be trusted.
    Unclear(Unclear),
}

impl Motion {
    /// The diagnosis verdict of this motion, for the verdict history and its confirmations
    /// ([`crate::diagnosis::history::VerdictHistory`]): moved → healthy; not moved → the
    /// armature stuck open (at pull-in, [`Polarity::Rising`]) or stuck closed (at release,
    /// [`Polarity::Falling`]); unclear → None (no verdict to keep: retry, then report).
    ///
    /// ```
    /// use kickguard::armature::detect::{Motion, Polarity};
    /// use kickguard::diagnosis::{Condition, Verdict};
    /// assert_eq!(
    ///     Motion::NotMoved.as_verdict(Polarity::Rising),
    ///     Some(Verdict::Fault(Condition::ArmatureStuckOpen))
    /// );
    /// assert_eq!(Motion::Moved { at: 40, dip: 120 }.as_verdict(Polarity::Falling), Some(Verdict::Healthy));
    /// ```
    pub const fn as_verdict(self, polarity: Polarity) -> Option<Verdict> {
        match (self, polarity) {
            (Motion::Moved { .. }, _) => Some(Verdict::Healthy),
            (Motion::NotMoved, Polarity::Rising) => {
                Some(Verdict::Fault(Condition::ArmatureStuckOpen))
            }
            (Motion::NotMoved, Polarity::Falling) => {
                Some(Verdict::Fault(Condition::ArmatureStuckClosed))
            }
            (Motion::Unclear(_), _) => None,
        }
    }
}

/// A detector's progress as plain numbers, for a caller that keeps it across calls outside
/// Rust (the C interface): see [`DipDetector::progress`] and [`DipDetector::resume`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DipProgress {
    /// Samples taken.
    pub n: u32,
    /// The first sample (mirrored for a release), counts.
    pub first: u16,
    /// The running maximum, counts.
    pub top: u16,
    /// The running minimum after the peak, counts.
    pub bottom: u16,
    /// Where the minimum was.
    pub bottom_at: u32,
    /// Sub-threshold turns seen.
    pub wiggles: u8,
    /// Past a confirmed peak.
    pub falling: bool,
}

/// The detector: feed samples, read the verdict.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct DipDetector {
    cfg: DipConfig,
    n: u32,
    first: u16,
    top: u16,
    bottom: u16,
    bottom_at: u32,
    wiggles: u8,
    falling: bool,
    verdict: Option<Motion>,
}

impl DipDetector {
    /// A detector with `cfg`; a contradictory one answers every sample with
    /// [`Unclear::BadConfig`].
    pub const fn new(cfg: DipConfig) -> Self {
        let bad = cfg.min_dip < cfg.hysteresis || cfg.hysteresis == 0 || cfg.window == 0;
        DipDetector {
            cfg,
            n: 0,
            first: 0,
            top: 0,
            bottom: 0,
            bottom_at: 0,
            wiggles: 0,
            falling: false,
            verdict: if bad {
                Some(Motion::Unclear(Unclear::BadConfig))
            } else {
                None
            },
        }
    }

    /// Its progress (while no verdict is given), to keep outside Rust.
    pub fn progress(&self) -> DipProgress {
        DipProgress {
            n: self.n,
            first: self.first,
            top: self.top,
            bottom: self.bottom,
            bottom_at: self.bottom_at,
            wiggles: self.wiggles,
            falling: self.falling,
        }
    }

    /// A detector with `cfg` that goes on from `p` (no verdict yet). Any numbers are safe: the
    /// detector only compares them.
    pub const fn resume(cfg: DipConfig, p: DipProgress) -> Self {
        let mut d = DipDetector::new(cfg);
        if d.verdict.is_none() {
            d.n = p.n;
            d.first = p.first;
            d.top = p.top;
            d.bottom = p.bottom;
            d.bottom_at = p.bottom_at;
            d.wiggles = p.wiggles;
            d.falling = p.falling;
        }
        d
    }

    /// Starts again for the next switching.
    pub fn reset(&mut self) {
        *self = DipDetector::new(self.cfg);
    }

    /// The verdict, once given.
    pub fn verdict(&self) -> Option<Motion> {
        self.verdict
    }

    /// Takes one sample (counts); returns the verdict once it is known (and keeps returning
    /// it). Work: constant (a dozen comparisons).
    pub fn push(&mut self, raw: u16) -> Option<Motion> {
        if self.verdict.is_some() {
            return self.verdict;
        }
        let cfg = self.cfg;
        if raw >= cfg.full_scale {
            return self.done(Motion::Unclear(Unclear::Saturated));
        }
        // Mirrored for a release: the falling signal rises, its bump becomes a dip
        // (raw < full scale here: no wrap).
        let x = match cfg.polarity {
            Polarity::Rising => raw,
            Polarity::Falling => cfg.full_scale.saturating_sub(raw),
        };
        let k = self.n;
        self.n = k.saturating_add(1);
        if k == 0 {
            self.first = x;
            self.top = x;
        }
        if self.falling {
            if x < self.bottom {
                self.bottom = x;
                self.bottom_at = k;
            } else if x.saturating_sub(self.bottom) >= cfg.hysteresis {
                // bottom ≤ top (it started below it and only fell): no saturation.
                let dip = self.top.saturating_sub(self.bottom);
                if dip >= cfg.min_dip {
                    return self.done(Motion::Moved {
                        at: self.bottom_at,
                        dip,
                    });
                }
                self.wiggles = self.wiggles.saturating_add(1);
                if self.wiggles > MAX_WIGGLES {
                    return self.done(Motion::Unclear(Unclear::Noisy));
                }
                self.falling = false;
                self.top = self.top.max(x);
            }
        } else if x > self.top {
            self.top = x;
        } else if self.top.saturating_sub(x) >= cfg.hysteresis
            && self.top.saturating_sub(self.first) >= cfg.rise
        {
            self.falling = true;
            self.bottom = x;
            self.bottom_at = k;
        }
        if self.n >= cfg.window {
            let risen = self.top.saturating_sub(self.first) >= cfg.rise;
            return self.done(if risen {
                Motion::NotMoved
            } else {
                Motion::Unclear(Unclear::NoRise)
            });
        }
        None
    }

    /// Takes a slice of samples (a DMA half-buffer); returns the verdict once known. Work: at
    /// most one [`DipDetector::push`] per sample, stopping at the verdict.
    pub fn push_slice(&mut self, samples: &[u16]) -> Option<Motion> {
        for s in samples {
            if let Some(m) = self.push(*s) {
                return Some(m);
            }
        }
        None
    }

    /// The samples have ended: the verdict, or [`Unclear::TooFewSamples`] if the window was not
    /// reached.
    pub fn finish(&mut self) -> Motion {
        let m = self
            .verdict
            .unwrap_or(Motion::Unclear(Unclear::TooFewSamples));
        self.verdict = Some(m);
        m
    }

    fn done(&mut self, m: Motion) -> Option<Motion> {
        self.verdict = Some(m);
        self.verdict
    }
}
