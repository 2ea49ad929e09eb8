//! The tolerance box and the ADC both detector tests (tests/armature_detect.rs,
//! tests/armature_release.rs) use: mechanics ±10 %, inductances ±5 %, supply ±10 %, the coil
//! from −7 % cold to +7 % and 15 % hot; 12 bits, 80 % of full scale at the largest current,
//! ±4 counts of noise (an ADC's noise bound of our choosing).

use super::armature::{perturbed, Spec};
use super::Rng;
use kickguard::armature::detect::{DipConfig, DipDetector, Motion};
use kickguard::armature::sizing::{Adc, Tolerances};
use kickguard::Hertz;

pub const MECH: f64 = 0.1;
pub const INDUCT: f64 = 0.05;
pub const NOISE: u16 = 4;

pub fn tolerances() -> Tolerances {
    let (m, l) = (MECH as f32, INDUCT as f32);
    Tolerances {
        mass: m,
        stroke: m,
        preload: m,
        spring: m,
        load: m,
        damping: m,
        l_seat: l,
        l_open: l,
        g0: m,
    }
}

pub fn supply(s: &Spec) -> (f64, f64) {
    (0.9 * s.v, 1.1 * s.v)
}

pub fn resistance(s: &Spec) -> (f64, f64) {
    (0.93 * s.r, 1.07 * 1.15 * s.r)
}

pub fn adc(s: &Spec, rate: f64) -> Adc {
    let i_max = supply(s).1 / resistance(s).0;
    Adc {
        rate: Hertz::new(rate as f32).unwrap(),
        counts_per_amp: (0.8 * 4096.0 / i_max) as f32,
        full_scale: 4096,
        noise_counts: NOISE,
    }
}

/// The ADC's counts of a waveform: rounded, with clipped Gaussian noise.
pub fn counts(wave: &[f64], a: &Adc, rng: &mut Rng) -> Vec<u16> {
    let bound = f64::from(a.noise_counts);
    wave.iter()
        .map(|i| {
            let n = (rng.normal() * bound / 3.0).clamp(-bound, bound);
            (i * a.counts_per_amp as f64 + n)
                .round()
                .clamp(0.0, 65535.0) as u16
        })
        .collect()
}

pub fn verdict(cfg: DipConfig, samples: &[u16]) -> Motion {
    let mut d = DipDetector::new(cfg);
    d.push_slice(samples).unwrap_or_else(|| d.finish())
}

/// `s` at a random point of the box (eleven draws of `rng`, in `perturbed`'s order).
pub fn random_point(s: &Spec, rng: &mut Rng) -> Spec {
    let mut u = [0.0f64; 11];
    for x in u.iter_mut() {
        *x = rng.unit();
    }
    perturbed(s, MECH, INDUCT, supply(s), resistance(s), &u)
}
