//! Independent f64 references shared by the integration tests.
//!
//! Everything here is written from published formulas, in f64, without calling the crate's f32
//! model code: the exact SI 2019 constants (CODATA 2018) and the SPICE2 diode equations
//! (L. W. Nagel, "SPICE2: A computer program to simulate semiconductor circuits",
//! UC Berkeley ERL-M520, 1975). Also the one strict C compile the generated-header tests share.
#![allow(dead_code)]

pub mod armature;
pub mod detect_box;
pub mod ode;

/// The decay of a coil from `i0` to zero through a constant clamp voltage `vc` in a loop of
/// resistance `r` (the textbook first-order RL solution, any circuit-analysis text, e.g. Hayt &
/// Kemmerly, source-free RL circuits — from memory): i(t) = (I₀ + a)·e^(−t/τ) − a with
/// τ = L/R, a = V_c/R. Returns (charge Q = τ·[I₀ − a·ln(1 + I₀/a)], ∫i²dt, time to zero
/// T = τ·ln(1 + I₀/a)), with ∫i²dt = (I₀ + a)²·τ/2·(1 − e^(−2T/τ)) − 2a(I₀ + a)·τ·(1 − e^(−T/τ))
/// + a²·T.
pub fn rl_decay_to_zero(l: f64, r: f64, vc: f64, i0: f64) -> (f64, f64, f64) {
    let (tau, a) = (l / r, vc / r);
    let t_end = tau * (1.0 + i0 / a).ln();
    let q = tau * (i0 - a * (1.0 + i0 / a).ln());
    let i2 = (i0 + a).powi(2) * tau / 2.0 * (1.0 - (-2.0 * t_end / tau).exp())
        - 2.0 * a * (i0 + a) * tau * (1.0 - (-t_end / tau).exp())
        + a * a * t_end;
    (q, i2, t_end)
}

/// A one-driver design file for the configuration step (feature `host`); `extra` goes into
/// the driver's table, `switch` and `clamp` into theirs.
pub fn design(
    supply: (&str, &str, &str),
    ambient: (&str, &str, &str),
    coil: &str,
    switch: &str,
    clamp: &str,
    extra: &str,
) -> String {
    format!(
        "title = \"t\"\ntick_rate = \"1 MHz\"\npwm_timer_clock = \"10 MHz\"\n\
         [environment]\nambient_min = \"{}\"\nambient_max = \"{}\"\ncoil_self_heating = \"{}\"\n\
         [[supply]]\nname = \"s\"\nnominal = \"{}\"\nmin = \"{}\"\nmax = \"{}\"\n\
         [[driver]]\nname = \"coil\"\nsupply = \"s\"\n{extra}\n\
         [driver.coil]\n{coil}\n[driver.switch]\n{switch}\n[driver.clamp]\n{clamp}\n",
        ambient.0, ambient.1, ambient.2, supply.0, supply.1, supply.2
    )
}

use kickguard::diode::DiodeParams;

/// Boltzmann constant, J/K (exact, SI 2019 / CODATA 2018).
pub const K_B: f64 = 1.380649e-23;
/// Elementary charge, C (exact, SI 2019 / CODATA 2018).
pub const Q_E: f64 = 1.602176634e-19;

/// Thermal voltage kT/q.
pub fn vt64(t_k: f64) -> f64 {
    K_B * t_k / Q_E
}

/// ln IS(T) from the SPICE2 temperature law (Nagel 1975).
pub fn ln_is64(d: &DiodeParams, t_k: f64) -> f64 {
    let n = d.n().value() as f64;
    let tnom = d.tnom().kelvin() as f64;
    let r = t_k / tnom;
    (d.is().value() as f64).ln()
        + (d.xti().value() as f64 / n) * r.ln()
        + (r - 1.0) * d.eg().value_ev() as f64 / (n * vt64(t_k))
}

/// Forward drop N·Vt·ln(1 + I/IS(T)) + I·RS (Shockley equation with RS, SPICE2).
pub fn v64(d: &DiodeParams, i: f64, t_k: f64) -> f64 {
    let n = d.n().value() as f64;
    let x = (i.ln() - ln_is64(d, t_k)).exp();
    n * vt64(t_k) * x.ln_1p() + i * d.rs().value() as f64
}

/// Decay integrals of L·di/dt = −g(i) from `i0` down to `i1` by composite Simpson's rule in
/// u = ln i with `n` (even) intervals, f64: returns [t, Q, ∫i²dt].
pub fn simpson_decay(l: f64, i0: f64, i1: f64, n: usize, g: &dyn Fn(f64) -> f64) -> [f64; 3] {
    let (u0, u1) = (i0.ln(), i1.ln());
    let h = (u0 - u1) / n as f64;
    let mut acc = [0.0f64; 3];
    for k in 0..=n {
        let w = if k == 0 || k == n {
            1.0
        } else if k % 2 == 1 {
            4.0
        } else {
            2.0
        };
        let i = (u1 + k as f64 * h).exp();
        let dt = l * i / g(i) * w * h / 3.0;
        acc[0] += dt;
        acc[1] += dt * i;
        acc[2] += dt * i * i;
    }
    acc
}

pub mod spice;

/// A small fixed-seed generator (SplitMix64, Steele, Lea & Flood 2014), shared by the field
/// tests so their draws are reproducible.
pub struct Rng(pub u64);

impl Rng {
    /// A uniform number in [0, 1).
    pub fn unit(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }

    /// A standard normal number (Box–Muller).
    pub fn normal(&mut self) -> f64 {
        let (a, b) = (self.unit().max(1e-300), self.unit());
        (-2.0 * a.ln()).sqrt() * (2.0 * std::f64::consts::PI * b).cos()
    }
}

/// Compiles `use.c` in `dir` to `use.o` with the machine's C compiler (`cc`) under `std`
/// (e.g. `-std=c99`), pedantic with every warning an error, plus the `extra` flags.
pub fn cc_strict(
    dir: &std::path::Path,
    std: &str,
    extra: &[&std::ffi::OsStr],
) -> std::process::Output {
    std::process::Command::new("cc")
        .args([std, "-Wall", "-Wextra", "-pedantic", "-Werror"])
        .args(extra)
        .args(["-c", "use.c", "-o", "use.o"])
        .current_dir(dir)
        .output()
        .expect("the machine's C compiler (cc)")
}
