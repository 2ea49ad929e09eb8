//! How many avalanche switch-offs in a row a switch survives.
//!
//! Model (common practice for avalanche-rated MOSFETs): the single-pulse rating E_AS holds
//! for a pulse that starts at a 25 °C junction and falls linearly to zero for a start at the
//! maximum junction temperature, E_allowed(T) = E_AS·(T_jmax − T)/(T_jmax − 25 °C), and E_AS
//! itself below 25 °C. A pulse of energy E is survivable from a start temperature up to
//! T_lim = T_jmax − (E/E_AS)·(T_jmax − 25 °C). A second pulse and every one after it needs a
//! repetitive rating E_AR ≥ E (without one, the datasheet allows one pulse), and starts hotter:
//!
//! - with a lumped thermal capacitance C (J/K), each pulse raises the junction by E/C at once
//!   (the pulse is short against R_th·C) and the junction cools with τ = R_th·C between pulses
//!   at interval T = 1/f, so before pulse k it is at
//!   T_k = T₀ + (E/C)·a·(1 − a^(k−1))/(1 − a), a = e^(−T/τ) (a = 1, no cooling, without a rate);
//!   the count is the largest k with T_k ≤ T_lim, in closed form;
//! - without C, the start of every pulse is bounded by the average-heating level
//!   T₀ + E·f·R_th (in any linear thermal network the temperature just before a pulse is below
//!   the average of its periodic steady state), so the switch survives repetitively when that
//!   is within T_lim, and one pulse otherwise.
//!
//! Work: constant (one logarithm).

use crate::host::board::SwitchBoard;
use crate::units::Hertz;
use std::format;
use std::string::String;

/// The count that stands for "any number, within the thermal limits".
pub const REPETITIVE: f32 = 1.0e6;

/// Pulses survived in a row by a switch whose junction starts at `start_c` (°C), for pulses of
/// `energy` J at `rate` (if known); None without a single-pulse rating.
pub fn survivable(sw: &SwitchBoard, rate: Option<Hertz>, energy: f32, start_c: f32) -> Option<f32> {
    let e_as = sw.energy_single?.value();
    let tj_max = sw.junction_max?.celsius();
    let span = tj_max - 25.0;
    if !(energy <= allowed(sw, start_c)?) {
        return Some(0.0);
    }
    let Some(e_ar) = sw.energy_repetitive.map(|e| e.value()) else {
        return Some(1.0);
    };
    if !(energy <= e_ar) {
        return Some(1.0);
    }
    // energy ≤ allowed(start) ≤ E_AS here, so T_lim ≥ 25 °C.
    let t_lim = tj_max - energy / e_as * span;
    let headroom = t_lim - start_c;
    match (sw.thermal_capacitance, rate, sw.thermal_resistance) {
        (Some(c), Some(f), Some(r)) => Some(count_cooling(
            energy / c,
            -1.0 / (f.value() * r * c),
            headroom,
        )),
        (Some(c), _, _) => Some(count_adiabatic(energy / c, headroom)),
        (None, Some(f), Some(r)) => Some(if energy * f.value() * r <= headroom {
            REPETITIVE
        } else {
            1.0
        }),
        _ => Some(1.0),
    }
}

/// Pulses with no cooling between them: T₀ + (k − 1)·ΔT ≤ T_lim.
fn count_adiabatic(dt: f32, headroom: f32) -> f32 {
    if !(dt > 0.0) {
        return REPETITIVE;
    }
    (libm::floorf(headroom / dt) + 1.0).min(REPETITIVE)
}

/// Pulses with first-order cooling, `ln_a` = −T/τ = ln a (< 0).
fn count_cooling(dt: f32, ln_a: f32, headroom: f32) -> f32 {
    let a = libm::expf(ln_a);
    // Steady state before a pulse: ΔT·a/(1 − a).
    let one_minus_a = -libm::expm1f(ln_a);
    if !(one_minus_a > 0.0) {
        return count_adiabatic(dt, headroom);
    }
    if dt * a / one_minus_a <= headroom {
        return REPETITIVE;
    }
    // ΔT·a·(1 − a^m)/(1 − a) ≤ headroom ⇔ a^m ≥ 1 − headroom·(1 − a)/(ΔT·a) = x, m = k − 1.
    let x = 1.0 - headroom * one_minus_a / (dt * a);
    if !(x > 0.0) {
        return REPETITIVE;
    }
    let m = libm::floorf(libm::logf(x) / ln_a);
    // Bounds are constants in order and m is finite (x > 0, ln a < 0): clamp cannot panic.
    (m + 1.0).clamp(1.0, REPETITIVE)
}

/// The single-pulse allowance from a start at `start_c` (°C): E_AS derated linearly to zero at
/// T_jmax, E_AS itself at or below 25 °C; None without the rating.
pub fn allowed(sw: &SwitchBoard, start_c: f32) -> Option<f32> {
    let e_as = sw.energy_single?.value();
    let tj_max = sw.junction_max?.celsius();
    Some(if start_c <= 25.0 {
        e_as
    } else {
        e_as * (tj_max - start_c) / (tj_max - 25.0)
    })
}

/// Why [`survivable`] gives the count it gives, in words: the pulse energy, the single-pulse
/// rating derated to the start temperature, and the rule that set the count (no repetitive
/// rating, above it, the thermal recursion, the average heating, or no thermal data).
pub fn reason(sw: &SwitchBoard, rate: Option<Hertz>, energy: f32, start_c: f32) -> String {
    let (Some(e_as), Some(tj)) = (sw.energy_single, sw.junction_max) else {
        return "no single-pulse avalanche energy rating (switch.avalanche_energy with junction_max)".into();
    };
    let (e_as, tj_max) = (e_as.value(), tj.celsius());
    let span = tj_max - 25.0;
    let allowed = allowed(sw, start_c).unwrap_or(e_as);
    let head = format!(
        "{} per switch-off against the single-pulse rating {} derated to {} from a {start_c:.1} °C start",
        mj(energy),
        mj(e_as),
        mj(allowed)
    );
    if !(energy <= allowed) {
        return format!("{head}: one pulse already exceeds it");
    }
    let Some(e_ar) = sw.energy_repetitive.map(|e| e.value()) else {
        return format!(
            "{head}; no repetitive rating given (switch.avalanche_energy_repetitive), so one pulse"
        );
    };
    if !(energy <= e_ar) {
        return format!(
            "{head}; above the repetitive rating {}, so one pulse",
            mj(e_ar)
        );
    }
    let t_lim = tj_max - energy / e_as * span;
    let thermal = match (sw.thermal_capacitance, rate, sw.thermal_resistance) {
        (Some(c), Some(f), Some(r)) => format!(
            "each pulse heats the junction {:.2} K (E/C), cooling with τ = R_th·C = {:.3} s between pulses at {} Hz",
            energy / c,
            r * c,
            f.value()
        ),
        (Some(c), _, _) => format!(
            "each pulse heats the junction {:.2} K (E/C), no cooling counted (switching_rate and thermal_resistance not both given)",
            energy / c
        ),
        (None, Some(f), Some(r)) => format!(
            "average heating E·f·R_th = {:.2} K against {:.1} K of headroom",
            energy * f.value() * r,
            t_lim - start_c
        ),
        _ => {
            return format!("{head}; within the repetitive rating {}, but no thermal data to count pulses (switch.thermal_capacitance, or switching_rate with thermal_resistance), so one pulse", mj(e_ar))
        }
    };
    format!(
        "{head}; within the repetitive rating {}; later pulses start hotter: {thermal}, until the junction passes {t_lim:.1} °C (where the derated rating equals the pulse)",
        mj(e_ar)
    )
}

/// An energy in millijoules, for the words.
fn mj(e: f32) -> String {
    format!("{:.3} mJ", e * 1e3)
}
