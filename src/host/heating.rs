//! Self-heating of the clamp parts and the switch: the power each dissipates, and the
//! temperature rise it causes above the hottest ambient (P·R_th, steady state).
//!
//! Powers, each the worst case over a sweep, summed as if everything happened at once (a safe
//! upper bound): a part's energy per switch-off × the switching rate, plus its power while
//! PWM-holding (the freewheel diode, and a zener that sits in the freewheel path), plus for
//! the switch its conduction loss I_on²·R_on as if it were on all the time.
//!
//! The rises feed back into the corner box (a hotter zener holds a higher voltage, a hotter
//! diode a lower drop), so the analysis iterates: box → powers → rises → box, at most
//! [`MAX_PASSES`] times, until no rise moves by more than [`SETTLED_K`].

use super::board::DriverBoard;
use super::corners::Rises;
use super::figures::Figures;

/// Most passes of the self-heating iteration.
pub const MAX_PASSES: usize = 6;

/// A rise that moves by less than this between passes has settled, K.
pub const SETTLED_K: f32 = 0.05;

/// The average power of each part at one point, W.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Powers {
    /// The clamp diode.
    pub diode: f32,
    /// The zener, TVS or varistor.
    pub breakdown: f32,
    /// The switch.
    pub switch: f32,
}

/// The powers at one point's figures.
pub fn powers(d: &DriverBoard, f: &Figures) -> Powers {
    let rate = d.switching_rate.map_or(0.0, |r| r.value());
    let conduction = d
        .switch
        .on_resistance
        .map_or(0.0, |r| f.on_current * f.on_current * r.value());
    Powers {
        diode: f.energy.diode * rate + f.hold.map_or(0.0, |h| h.diode_power),
        breakdown: f.energy.breakdown * rate + f.hold.map_or(0.0, |h| h.zener_power),
        switch: f.energy.switch * rate + conduction,
    }
}

/// The worst power of each part over `figures`.
pub fn worst_powers(d: &DriverBoard, figures: &[Figures]) -> Powers {
    figures
        .iter()
        .map(|f| powers(d, f))
        .fold(Powers::default(), |a, p| Powers {
            diode: a.diode.max(p.diode),
            breakdown: a.breakdown.max(p.breakdown),
            switch: a.switch.max(p.switch),
        })
}

/// The rises the worst powers cause (zero for a part without a thermal resistance).
pub fn rises(d: &DriverBoard, figures: &[Figures]) -> Rises {
    let p = worst_powers(d, figures);
    let rth_diode = d.clamp.diode().and_then(|x| x.rth).unwrap_or(0.0);
    let rth_bd = d.clamp.breakdown().and_then(|x| x.rth).unwrap_or(0.0);
    let rth_sw = d.switch.thermal_resistance.unwrap_or(0.0);
    Rises {
        diode: p.diode * rth_diode,
        breakdown: p.breakdown * rth_bd,
        switch: p.switch * rth_sw,
    }
}

/// True when no rise moved by more than [`SETTLED_K`].
pub fn settled(a: &Rises, b: &Rises) -> bool {
    (a.diode - b.diode).abs() <= SETTLED_K
        && (a.breakdown - b.breakdown).abs() <= SETTLED_K
        && (a.switch - b.switch).abs() <= SETTLED_K
}
