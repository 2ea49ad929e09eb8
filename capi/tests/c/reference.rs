// The Rust library's own results for the good calls the C programs make (capi/tests/c/smoke.c
// on the host, cortex-m/c/selftest.c on the cores), on the same inputs: what their results are
// compared with. Included by capi/tests/c_program.rs and by cortex-m/build.rs.

/// Reference results, one per good call of the C programs.
pub struct CReference {
    /// The silicon preset's IS, A.
    pub preset_is: f32,
    /// Drop at 0.4 A, 25 °C, V.
    pub drop: f32,
    /// Junction temperature from 0.6 V at 1 mA, °C.
    pub thermometer: f32,
    /// Coil R at 85 °C, Ω.
    pub r85: f32,
    /// Winding temperature at 64.8 Ω, °C.
    pub winding: f32,
    /// Steady current at 24 V, 25 °C, A.
    pub current: f32,
    /// Closed-form decay to zero: time, s.
    pub decay_time: f32,
    /// Closed-form decay to zero: clamp energy, J.
    pub decay_clamp_j: f32,
    /// Fitted τ of the eight samples, s.
    pub fit_tau: f32,
}

/// Computes [`CReference`] with the kickguard library.
pub fn c_reference() -> CReference {
    use kickguard::clamp::closed_form::ConstantClamp;
    use kickguard::coil::Coil;
    use kickguard::diagnosis::fit::fit_decay;
    use kickguard::diode::DiodeParams;
    use kickguard::{Amps, Henries, Ohms, PerKelvin, Seconds, Temperature, Volts};
    let t = |c: f32| Temperature::from_celsius(c).unwrap();
    let p = DiodeParams::SILICON;
    // The C side carries the parameters as plain data and rebuilds them (ln IS recomputed).
    let d = DiodeParams::new(p.is(), p.n(), p.rs(), p.eg(), p.xti(), p.tnom()).unwrap();
    let coil = Coil::new(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        t(20.0),
        PerKelvin::new(0.00393).unwrap(),
    )
    .unwrap();
    let dec = ConstantClamp::new(
        Henries::new(0.35).unwrap(),
        Ohms::new(56.0).unwrap(),
        Volts::new(42.0).unwrap(),
        Amps::new(0.43).unwrap(),
    )
    .unwrap()
    .decay_to(Amps::new(0.0).unwrap())
    .unwrap();
    // The C programs' samples: 0.43 A, each 0.984127 of the one before.
    let mut s = [Amps::new(0.0).unwrap(); 8];
    let mut x = 0.43f32;
    for a in s.iter_mut() {
        *a = Amps::new(x).unwrap();
        x *= 0.984127;
    }
    CReference {
        preset_is: p.is().value(),
        drop: d.forward_drop(Amps::new(0.4).unwrap(), t(25.0)).unwrap().value(),
        thermometer: d
            .junction_temperature(Amps::new(1e-3).unwrap(), Volts::new(0.6).unwrap())
            .unwrap()
            .celsius(),
        r85: coil.resistance(t(85.0)).unwrap().value(),
        winding: coil.winding_temperature(Ohms::new(64.8).unwrap()).unwrap().celsius(),
        current: coil.steady_current(Volts::new(24.0).unwrap(), t(25.0)).unwrap().value(),
        decay_time: dec.time.value(),
        decay_clamp_j: dec.clamp_energy.value(),
        fit_tau: fit_decay(&s, Seconds::new(1e-4).unwrap()).unwrap().tau.value(),
    }
}
