//! Measurement sizing: the drain comparator that separates an open clamp best, and the slowest
//! timer that still sees it.
//!
//! The idea (common practice for switch-side fault detection): a threshold on the drain
//! divider above every voltage a healthy switch-off reaches and below every voltage the switch
//! avalanches at. A healthy switch-off then never trips it and reads 0 ticks at every corner;
//! an open clamp trips it for as long as the switch avalanches. The separation no longer rests
//! on the decay time, so L, R and supply tolerances cannot swallow it.
//!
//! - Highest healthy voltage: the peak switch voltage at switch-off, maximised over the 512
//!   corners of [`Design::window`] (the peak rises with the start current, the clamp's
//!   tolerance and its temperature coefficient: monotone in each axis, so the vertex search is
//!   exact).
//! - Lowest open-clamp voltage: the avalanche's peak, minimised over the same corners.
//! - Threshold: their midpoint. It is accepted only if the comparator's own relative accuracy
//!   `tolerance` (divider resistors and the comparator's reference, both ways) keeps it strictly
//!   between them: V_h < V_th·(1 − tol) and V_th·(1 + tol) < V_a.
//! - Open-clamp reading: the time the switch stays above the threshold, over every corner
//!   ([`Design::window`] with [`Measurement::SwitchAbove`]).
//! - Slowest timer: the healthy window is [0, j] ticks (0 s, then the jitter j); the open
//!   window starts at ⌊t_min·(1 − g)·f⌋ − j. They share no tick when ⌊t_min·(1 − g)·f⌋ ≥ 2j + 1,
//!   which holds for every f ≥ (2j + 1)/(t_min·(1 − g)). Rounded up to a whole hertz.

use super::windows::{Design, Measurement, TimeWindow, Timing};
use super::Condition;
use crate::error::{self, Error, Reason};
use crate::units::{Hertz, Volts};

/// The proposed drain comparator of a design.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ComparatorProposal {
    /// The highest switch voltage any healthy switch-off reaches, over every corner.
    pub healthy_peak_max: Volts,
    /// The lowest voltage the switch avalanches at with the clamp open, over every corner.
    pub open_peak_min: Volts,
    /// The proposed threshold across the switch (the midpoint).
    pub threshold: Volts,
    /// What the open clamp reads at the threshold, over every corner.
    pub open_reading: TimeWindow,
    /// The slowest timer at which the stated guard and jitter still separate the open clamp
    /// from health.
    pub slowest_tick: Hertz,
}

impl ComparatorProposal {
    /// The measurement to pass to [`Design::tick_windows`].
    pub const fn measurement(&self) -> Measurement {
        Measurement::SwitchAbove {
            threshold: self.threshold,
        }
    }
}

impl Design {
    /// The drain comparator that a healthy switch-off never trips and an open clamp always
    /// does, or `None` when no threshold fits between them with the comparator's relative
    /// `tolerance` (0 … 0.2), or the clamp is the switch's own avalanche (nothing can open).
    /// See the module docs for the model.
    ///
    /// Work: 2 × 512 switch-off set-ups, then one [`Design::window`] (512 more and their decay
    /// integrations).
    ///
    /// # Errors
    /// `tolerance` outside 0 … 0.2 → [`Reason::OutsideValidatedRange`] on `"comparator
    /// tolerance"`; as [`Design::window`] and [`Timing::validate`].
    pub fn propose_comparator(
        &self,
        timing: &Timing,
        tolerance: f32,
    ) -> Result<Option<ComparatorProposal>, Error> {
        self.check()?;
        timing.validate()?;
        let tol = error::non_negative("comparator tolerance", tolerance)?;
        if !(tol <= 0.2) {
            return Err(Error::new(
                "comparator tolerance",
                Reason::OutsideValidatedRange,
            ));
        }
        let (Some(h), Some(a)) = (
            self.peak_range(Condition::Healthy)?,
            self.peak_range(Condition::ClampOpen)?,
        ) else {
            return Ok(None);
        };
        let (v_h, v_a) = (h.1, a.0);
        let th = 0.5 * (v_h + v_a);
        if !(v_h < th * (1.0 - tol) && th * (1.0 + tol) < v_a) {
            return Ok(None);
        }
        let threshold = Volts::new(th)?;
        let m = Measurement::SwitchAbove { threshold };
        let open = self
            .window(Condition::ClampOpen, &m)?
            .ok_or(Error::new("clamp", Reason::Inconsistent))?;
        let usable = open.min.value() * (1.0 - timing.guard.value());
        if !(usable > 0.0) {
            return Ok(None);
        }
        // (2j + 1) in f32: j ≤ 10⁶ (validated), exact.
        let need = (2.0 * timing.jitter_ticks as f32 + 1.0) / usable;
        // One part in 10⁶ above, against the f32 rounding of the division, then whole hertz.
        let f = libm::ceilf(error::result("slowest tick", need * (1.0 + 1e-6))?);
        Ok(Some(ComparatorProposal {
            healthy_peak_max: Volts::new(v_h)?,
            open_peak_min: Volts::new(v_a)?,
            threshold,
            open_reading: open,
            slowest_tick: Hertz::new(f)?,
        }))
    }

    /// (lowest, highest) peak switch voltage of `cond` over every corner; None where the
    /// condition does not apply.
    fn peak_range(&self, cond: Condition) -> Result<Option<(f32, f32)>, Error> {
        let Some(circuit) = self.circuit(cond)? else {
            return Ok(None);
        };
        let mut acc = (f32::INFINITY, f32::NEG_INFINITY);
        for k in 0..super::windows::Corner::COUNT {
            let v = self
                .corner_off(circuit, super::windows::Corner(k))?
                .peak_switch_voltage()
                .value();
            acc = (acc.0.min(v), acc.1.max(v));
        }
        Ok(Some(acc))
    }
}
