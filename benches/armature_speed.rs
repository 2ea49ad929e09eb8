//! The moving-armature model against the independent integration, for speed: each of the six
//! invented designs' pull-in (switch-on to the end of the seated rise) and release (switch-off
//! through a silicon freewheeling diode to the open stop), by the library (f32,
//! Bogacki–Shampine, local tolerance 10⁻⁶) and by `ode_solvers`' Dormand–Prince (f64, 10⁻⁸),
//! each repeated and timed; the ratio (reference time over the library's) printed. The library
//! runs without a sample buffer, as the sizing does; with 400 samples every step is cut to land
//! on them (shown apart): the reference interpolates its dense output instead. Wall-clock figures depend on the machine; the
//! ratio is the measure.
//!
//! Run: `cargo bench --bench armature_speed`.

#[allow(dead_code)]
#[path = "../tests/common/armature.rs"]
mod armature;

use armature::{specs, Spec, V3};
use kickguard::armature::motion::{pull_in, release, Run};
use kickguard::clamp::{Clamp, Operating, Side, SwitchOff};
use kickguard::coil::Coil;
use kickguard::diode::{Diode, DiodeParams};
use kickguard::{Amps, Henries, Ohms, Seconds, Temperature, Volts};
use ode_solvers::Dopri5;
use std::hint::black_box;
use std::time::Instant;

const REPS: u32 = 50;

fn run(t: f64) -> Run {
    Run {
        duration: Seconds::new(t as f32).unwrap(),
        sample_period: Seconds::new((t / 400.0) as f32).unwrap(),
        tolerance: 1e-6,
    }
}

/// The reference's free flight over the whole span, dense at 400 points (the same output the
/// library gives), with the given drive.
fn reference(s: &Spec, drive: &dyn Fn(f64) -> f64, y0: V3, span: f64) -> usize {
    let mut solver = Dopri5::new(s.free(drive), 0.0, span, span / 400.0, y0, 1e-8, 1e-12);
    // The reference flies past the stops (its output there would be discarded).
    let _ = solver.integrate();
    solver.y_out().len()
}

fn time(f: &mut dyn FnMut()) -> f64 {
    let t0 = Instant::now();
    for _ in 0..REPS {
        f();
    }
    t0.elapsed().as_secs_f64() / f64::from(REPS)
}

fn main() {
    println!(
        "{:<22} {:>12} {:>12} {:>7} {:>12} {:>12} {:>7}",
        "design", "pull-in lib", "reference", "ratio", "release lib", "reference", "ratio"
    );
    for s in specs() {
        let span = 30.0 * s.lo / s.r;
        let (v, r) = (s.v, s.r);
        let on = move |i: f64| v - r * i;
        let a = s.armature();
        let mut buf = [0f32; 401];
        let lib_on = time(&mut || {
            black_box(
                pull_in(
                    &a,
                    Ohms::new(r as f32).unwrap(),
                    Volts::new(v as f32).unwrap(),
                    &run(span),
                    &mut [],
                )
                .unwrap(),
            );
        });
        let lib_on_sampled = time(&mut || {
            black_box(
                pull_in(
                    &a,
                    Ohms::new(r as f32).unwrap(),
                    Volts::new(v as f32).unwrap(),
                    &run(span),
                    &mut buf,
                )
                .unwrap(),
            );
        });
        let ref_on = time(&mut || {
            black_box(reference(&s, &on, V3::new(0.0, s.s, 0.0), span));
        });
        let i0 = v / r;
        let t = Temperature::from_celsius(25.0).unwrap();
        let coil = Coil::fixed(
            Henries::new(s.ls as f32).unwrap(),
            Ohms::new(r as f32).unwrap(),
        )
        .unwrap();
        let op = Operating::uniform(
            Volts::new(v as f32).unwrap(),
            Amps::new(i0 as f32).unwrap(),
            t,
        );
        let p = DiodeParams::SILICON;
        let off =
            SwitchOff::new(&coil, &Clamp::FreewheelDiode(Diode::Law(p)), Side::Low, &op).unwrap();
        let g = move |i: f64| if i > 0.0 { -(r * i + 0.7) } else { 0.0 };
        let span_off = 8.0 * s.ls / r;
        let lib_off = time(&mut || {
            black_box(release(&a, &off, &run(span_off), &mut []).unwrap());
        });
        let ref_off = time(&mut || {
            black_box(reference(&s, &g, V3::new(s.ls * i0, 0.0, 0.0), span_off));
        });
        println!(
            "{:<22} {:>9.1} µs {:>9.1} µs {:>6.1}× {:>9.1} µs {:>9.1} µs {:>6.1}×   (pull-in with 400 samples landed: {:.1} µs)",
            s.name, lib_on * 1e6, ref_on * 1e6, ref_on / lib_on, lib_off * 1e6, ref_off * 1e6, ref_off / lib_off, lib_on_sampled * 1e6
        );
    }
    println!("(the reference's release uses a fixed 0.7 V diode and flies without stops: a speed comparison of the integrators, not of the answers)");
}
