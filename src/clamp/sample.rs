//! Samples of a decay for plots: i(t) and the switch and output voltages every `dt`, into the
//! caller's buffer.
//!
//! Affine paths use the exact i(t) ([`super::closed_form`]). Other paths march s = ln(i − i_f)
//! down in steps of at most [`STEP`] (4-point Gauss–Legendre on each step) and interpolate s
//! linearly in time between the step ends, which places each sample's current within about
//! 0.01 % of the exact solution (enough for plots; use [`SwitchOff::time_to`] for figures). A
//! decay to zero finishes with its closed-form tail (the last 1e-6 of the start current), over
//! which the current is drawn as falling linearly to zero.
//!
//! Bounded work: at most ⌈48/0.02⌉ = 2400 steps, and one evaluation per sample written.

use super::{Sample, SwitchOff};
use crate::error::{Error, Reason};
use crate::math;
use crate::units::{Amps, Seconds, Volts};

/// Largest step in s = ln(i − i_f) of the marching sampler.
const STEP: f32 = 0.02;

/// Writes samples into the caller's buffer until it is full.
struct Writer<'a> {
    off: &'a SwitchOff,
    out: &'a mut [Sample],
    n: usize,
}

impl Writer<'_> {
    /// Writes one sample; false when the buffer is full.
    fn push(&mut self, t: f32, i: f32) -> bool {
        match self.out.get_mut(self.n) {
            Some(slot) => {
                *slot = Sample {
                    time: Seconds::raw(t),
                    current: Amps::raw(i),
                    switch_voltage: Volts::raw(self.off.switch_voltage_raw(i)),
                    output_voltage: Volts::raw(self.off.output_voltage_raw(i)),
                };
                // n < out.len() here (the slot existed): cannot saturate.
                self.n = self.n.saturating_add(1);
                true
            }
            None => false,
        }
    }
}

impl SwitchOff {
    /// Samples i(t), the switch voltage and the output voltage every `dt` from switch-off into
    /// `out`, until the current falls to `i_end` (0 allowed where the decay reaches zero) or
    /// `out` is full; returns the number of samples written. No allocation: the caller owns the
    /// buffer. When the current reaches `i_end` between two sample times, a last sample is
    /// written at that instant; a sample at zero current shows the off state (the supply across
    /// the switch; a high-side output at 0 V), the end of every clamp's decay.
    ///
    /// Accuracy: exact on affine paths; each sample's current within about 0.01 % otherwise
    /// (see the module docs). Work: one integration of the whole decay (its time, checked), at
    /// most 2400 marching steps, and one evaluation per sample.
    ///
    /// # Errors
    /// `dt` = 0 → [`Reason::NotPositive`] on `"sample interval"`; `i_end` as
    /// [`SwitchOff::time_to`]; a decay longer than the quantities' range →
    /// [`Reason::TooLarge`] on `"decay time"`.
    ///
    /// ```
    /// use kickguard::clamp::{Clamp, Operating, Sample, Side, SwitchOff};
    /// use kickguard::{coil::Coil, diode::{Diode, DiodeParams}, Amps, Henries, Ohms, Seconds, Temperature, Volts};
    /// let t = Temperature::from_celsius(20.0)?;
    /// let relay = Coil::copper(Henries::new(0.9)?, Ohms::new(160.0)?, t)?;
    /// let op = Operating::uniform(Volts::new(12.0)?, Amps::new(0.075)?, t);
    /// let off = SwitchOff::new(&relay, &Clamp::FreewheelDiode(Diode::Law(DiodeParams::SILICON)),
    ///                          Side::Low, &op)?;
    /// let mut buf = [Sample::default(); 64];
    /// let n = off.sample(Seconds::new(1e-3)?, Amps::new(1e-3)?, &mut buf)?;
    /// assert!(n > 12 && n < 20); // about 15 ms to reach 1 mA, one sample per ms
    /// assert!(buf[1].current < buf[0].current);
    /// # Ok::<(), kickguard::Error>(())
    /// ```
    pub fn sample(&self, dt: Seconds, i_end: Amps, out: &mut [Sample]) -> Result<usize, Error> {
        let dt_s = dt.value();
        if !(dt_s > 0.0) {
            return Err(Error::new("sample interval", Reason::NotPositive));
        }
        let i1 = self.check_end(i_end)?;
        // Every sample time lies within the decay's: a decay longer than the quantities' range
        // is refused before any sample is written.
        Seconds::new(self.law.integrate(self.i0, i1).t).map_err(|e| e.on("decay time"))?;
        let mut w = Writer {
            off: self,
            out,
            n: 0,
        };
        if w.push(0.0, self.i0) {
            if self.law.is_affine() {
                self.sample_affine(dt_s, i1, &mut w);
            } else {
                self.sample_marched(dt_s, i1, &mut w);
            }
        }
        Ok(w.n)
    }

    fn sample_affine(&self, dt: f32, i1: f32, w: &mut Writer<'_>) {
        let law = &self.law;
        let t_end = law.integrate(self.i0, i1).t;
        let (vc, r) = (law.c(), law.r_total());
        let mut k = 1usize;
        loop {
            let t = k as f32 * dt;
            if !(t < t_end) {
                w.push(t_end, i1);
                return;
            }
            // i(t) ≥ i₁ before t_end; the max only guards the last bit of rounding.
            let i = super::closed_form::current_at(law.l, vc, r, self.i0, t).max(i1);
            if !w.push(t, i) {
                return;
            }
            k = k.saturating_add(1);
        }
    }

    fn sample_marched(&self, dt: f32, i1: f32, w: &mut Writer<'_>) {
        let law = &self.law;
        let f = law.floor;
        let s_start = math::ln(self.i0 - f);
        let s_end = math::ln(if i1 > 0.0 { i1 - f } else { law.tail_at });
        // The span is at most 48 (checked with the end current): at most 2400 steps.
        let steps = libm::ceilf((s_start - s_end) / STEP).clamp(1.0, 2401.0) as u32;
        let h = (s_start - s_end) / steps as f32;
        let (mut s_prev, mut t_prev) = (s_start, 0.0f32);
        let mut k = 1usize;
        for j in 1..=steps {
            let s = s_start - j as f32 * h;
            let seg = law.quadrature(s, s_prev - s).t;
            let t_now = t_prev + seg;
            while (k as f32) * dt <= t_now {
                let tk = k as f32 * dt;
                let sk = s_prev + (s - s_prev) * ((tk - t_prev) / seg);
                if !w.push(tk, f + math::exp(sk)) {
                    return;
                }
                k = k.saturating_add(1);
            }
            s_prev = s;
            t_prev = t_now;
        }
        if i1 > 0.0 {
            if (k as f32 - 1.0) * dt < t_prev {
                w.push(t_prev, i1);
            }
            return;
        }
        // The tail to zero: drawn as a straight line from `tail_at` to zero.
        let lower = law.tail_at;
        let tail = law.tail(lower).t;
        let t_end = t_prev + tail;
        while (k as f32) * dt < t_end {
            let tk = k as f32 * dt;
            if !w.push(tk, lower * (1.0 - (tk - t_prev) / tail)) {
                return;
            }
            k = k.saturating_add(1);
        }
        w.push(t_end, 0.0);
    }
}
